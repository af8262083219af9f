//! Hints computed from the data of two groups: each a rule with its source, and what it
//! suggests. Hints never change the analysis; the report lists them and the reader decides.
//!
//! The unequal-spread rule (Janssen 1997; Chung & Romano 2013) and small samples are among
//! the cautions ([`super::Caution`]); these are the others.

use serde::{Deserialize, Serialize};

use crate::base::{IntervalMethod, Note};
use crate::input::columns::Layout;
use crate::num::stats;
use crate::resample::two_groups::Statistic;

/// |skewness| above this in a group counts as strong skew (common practice, e.g. Bulmer
/// 1979, "Principles of Statistics": beyond 1 "highly skewed"; from memory).
pub const SKEW_LIMIT: f64 = 1.0;
/// Tukey's far-out fences: beyond this many interquartile ranges outside the quartiles
/// (Tukey 1977, "Exploratory Data Analysis").
pub const FAR_OUT: f64 = 3.0;
/// Row-by-row correlation of two equally long columns above which they look paired
/// (common practice).
pub const PAIRED_R: f64 = 0.5;

/// One hint from the data.
#[derive(Clone, Debug, PartialEq, Serialize, Deserialize)]
#[serde(tag = "kind", rename_all = "kebab-case")]
pub enum Hint {
    /// A group is strongly skewed (adjusted Fisher–Pearson skewness G1 beyond
    /// ±[`SKEW_LIMIT`]) while a mean is compared.
    Skewed {
        group: String,
        skewness: f64,
        /// Whether the headline interval is the percentile one (BCa corrects for skew).
        percentile: bool,
    },
    /// Values beyond Tukey's far-out fences while a mean is compared.
    FarOut {
        group: String,
        count: usize,
        low_fence: f64,
        high_fence: f64,
    },
    /// Few distinct values: a discrete null distribution.
    FewDistinct { distinct: usize, values: usize },
    /// Two equally long columns that rise and fall together row by row.
    LooksPaired { r: f64, rows: usize },
}

/// The adjusted Fisher–Pearson skewness G1 (as scipy.stats.skew with bias=False), None
/// below three values or without spread.
pub fn skewness(x: &[f64]) -> Option<f64> {
    let n = x.len() as f64;
    if x.len() < 3 {
        return None;
    }
    let m = stats::mean(x);
    let (m2, m3) = x.iter().fold((0.0, 0.0), |(s2, s3), v| {
        let d = v - m;
        (s2 + d * d, s3 + d * d * d)
    });
    let (m2, m3) = (m2 / n, m3 / n);
    if m2 <= 0.0 {
        return None;
    }
    let g1 = m3 / m2.powf(1.5);
    Some(g1 * (n * (n - 1.0)).sqrt() / (n - 2.0))
}

/// Tukey's far-out fences of a group (quartiles by linear interpolation, as numpy's default)
/// and how many values lie beyond them.
pub fn far_out(x: &[f64]) -> (f64, f64, usize) {
    let s = stats::sorted(x);
    let (q1, q3) = (
        stats::quantile_sorted(&s, 0.25),
        stats::quantile_sorted(&s, 0.75),
    );
    let iqr = q3 - q1;
    let (lo, hi) = (q1 - FAR_OUT * iqr, q3 + FAR_OUT * iqr);
    (lo, hi, x.iter().filter(|v| **v < lo || **v > hi).count())
}

/// Pearson's r of two equally long lists (None without spread).
fn correlation(a: &[f64], b: &[f64]) -> Option<f64> {
    let (ma, mb) = (stats::mean(a), stats::mean(b));
    let (mut sab, mut saa, mut sbb) = (0.0, 0.0, 0.0);
    for (x, y) in a.iter().zip(b) {
        let (dx, dy) = (x - ma, y - mb);
        sab += dx * dy;
        saa += dx * dx;
        sbb += dy * dy;
    }
    (saa > 0.0 && sbb > 0.0).then(|| sab / (saa * sbb).sqrt())
}

/// The hints for two groups compared by `st`, with the headline interval `interval` (`shift`:
/// the offset taken off the values, added back to the fences reported).
#[allow(clippy::too_many_arguments)]
pub fn two_groups(
    st: Statistic,
    interval: IntervalMethod,
    names: &[String; 2],
    a: &[f64],
    b: &[f64],
    layout: &Layout,
    notes: &[Note],
    shift: f64,
) -> Vec<Hint> {
    let mut out = Vec::new();
    let on_means = matches!(st, Statistic::MeanDifference | Statistic::WelchT);
    if on_means {
        for (name, x) in names.iter().zip([a, b]) {
            if let Some(g1) = skewness(x).filter(|g| g.abs() > SKEW_LIMIT) {
                out.push(Hint::Skewed {
                    group: name.clone(),
                    skewness: g1,
                    percentile: interval == IntervalMethod::Percentile,
                });
            }
        }
        for (name, x) in names.iter().zip([a, b]) {
            let (low_fence, high_fence, count) = far_out(x);
            // No spread between the quartiles (many equal values): no fences to read.
            if count > 0 && high_fence > low_fence {
                out.push(Hint::FarOut {
                    group: name.clone(),
                    count,
                    low_fence: low_fence + shift,
                    high_fence: high_fence + shift,
                });
            }
        }
    }
    let mut pooled: Vec<f64> = a.iter().chain(b).copied().collect();
    pooled.sort_by(f64::total_cmp);
    pooled.dedup();
    let values = a.len() + b.len();
    if pooled.len() < 10 || pooled.len() * 2 < values {
        out.push(Hint::FewDistinct {
            distinct: pooled.len(),
            values,
        });
    }
    // Columns side by side, as long as each other and with no cell left out, keep their rows.
    let whole = !notes.iter().any(|n| matches!(n, Note::MissingCells { .. }));
    if matches!(layout, Layout::Wide { .. }) && a.len() == b.len() && a.len() >= 4 && whole {
        if let Some(r) = correlation(a, b).filter(|r| *r > PAIRED_R) {
            out.push(Hint::LooksPaired { r, rows: a.len() });
        }
    }
    out
}

#[cfg(test)]
mod tests {
    use super::*;

    /// G1 of a small skewed list against scipy.stats.skew(x, bias=False), scipy 1.17.1
    /// (computed for this list: 2.3900692160219474).
    #[test]
    fn skewness_matches_scipy_unbiased_skew() {
        let x = [1.0, 1.2, 1.1, 1.3, 1.0, 4.8, 1.4, 2.2];
        let g = skewness(&x).unwrap();
        assert!((g - 2.3900692160219474).abs() < 1e-12, "{g}");
        assert_eq!(skewness(&[2.0, 2.0, 2.0]), None);
    }

    /// Quartiles as numpy.percentile's default (numpy 2.4.6: [1.5, 4.5] and [2.25, 4.75]
    /// for these lists), fences three IQRs beyond them.
    #[test]
    fn far_out_fences_follow_the_quartiles() {
        let (lo, hi, count) = far_out(&[1.0, 2.0, 3.0, 4.0, 5.0, 11.0, -5.0]);
        assert_eq!((lo, hi, count), (1.5 - 9.0, 4.5 + 9.0, 0));
        let (lo, hi, count) = far_out(&[1.0, 2.0, 3.0, 4.0, 5.0, 30.0]);
        assert_eq!((lo, hi, count), (2.25 - 7.5, 4.75 + 7.5, 1));
    }
}

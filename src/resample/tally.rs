//! Counting relabellings at least as extreme as the observed one, and the p-value with its
//! Monte Carlo error.

use crate::base::{Alternative, PInterval, TwoSidedRule};
use crate::num::binomial::clopper_pearson;

/// p-value and its Monte Carlo error.
pub struct PResult {
    pub p: f64,
    pub extreme: u64,
    pub mc_se: Option<f64>,
    pub interval: Option<PInterval>,
}

pub fn p_value(c: &Counts, exact: bool, alt: Alternative, rule: TwoSidedRule) -> PResult {
    let m = c.total;
    let one = |b: u64| -> (f64, Option<f64>, Option<(f64, f64)>) {
        if exact {
            (b as f64 / m as f64, None, None)
        } else {
            let p = (b + 1) as f64 / (m + 1) as f64;
            let se = (p * (1.0 - p) / m as f64).sqrt();
            (p, Some(se), Some(clopper_pearson(b, m, 0.99)))
        }
    };
    let (b, doubled) = match (alt, rule) {
        (Alternative::Greater, _) => (c.ge, false),
        (Alternative::Less, _) => (c.le, false),
        (Alternative::TwoSided, TwoSidedRule::Absolute) => (c.abs_ge, false),
        (Alternative::TwoSided, TwoSidedRule::DoubledTail) => (c.ge.min(c.le), true),
    };
    let (p, se, iv) = one(b);
    let f = if doubled { 2.0 } else { 1.0 };
    PResult {
        p: (f * p).min(1.0),
        extreme: b,
        mc_se: se.map(|s| f * s),
        interval: iv.map(|(lo, hi)| PInterval {
            low: (f * lo).min(1.0),
            high: (f * hi).min(1.0),
            level: 0.99,
        }),
    }
}

/// Relative tolerance for counting ties with the observed statistic: rounding in a sum of a
/// different order must not move a tied relabelling out of the tail.
pub const TIE_TOLERANCE: f64 = 1e-9;

/// Tolerance for ties of weighted sums over strata, relative to the largest magnitude among
/// the (centred) values: 2^-38, about 3.6e-12 (see [`sum_tolerance`] for the reasoning).
pub const SUM_TIE_TOLERANCE: f64 = 3.637978807091713e-12;

/// Tolerance for ties of a statistic `factor · (sum of `terms` values) + constant` (a
/// difference in means: factor 1/n1 + 1/n2; a mean of signed differences: 1/n) whose
/// values are at most `max_abs` in magnitude: twice the worst-case rounding error of a sum
/// kept by incremental updates and re-summed every 1024 of them, 1024 · (terms + 2) · 2^-53
/// · max_abs per sum (Higham, "Accuracy and Stability of Numerical Algorithms", 2nd ed.,
/// ch. 4). It follows the data's scale, not the statistic's size: a tolerance relative to
/// the statistic (or to 1e-9 of the largest value) merged distinct relabellings into ties
/// when one value was huge.
pub fn sum_tolerance(max_abs: f64, terms: usize, factor: f64) -> f64 {
    2.0 * 1024.0 * (terms as f64 + 2.0) * f64::EPSILON / 2.0 * max_abs * factor
}

/// The limits [`Counts::record`] compares with, made once per block.
#[derive(Clone, Copy, Debug)]
pub(crate) struct Thresholds {
    ge: f64,
    le: f64,
    abs_ge: f64,
}

impl Thresholds {
    pub(crate) fn new(obs: f64, tol: f64) -> Thresholds {
        let tol = if tol.is_finite() { tol } else { 0.0 };
        Thresholds {
            ge: obs - tol,
            le: obs + tol,
            abs_ge: obs.abs() - tol,
        }
    }
}

/// Counts of relabellings at least as extreme as the observed one, in each direction.
#[derive(Clone, Copy, Debug, Default, PartialEq, Eq)]
pub struct Counts {
    /// T >= t
    pub ge: u64,
    /// T <= t
    pub le: u64,
    /// |T| >= |t|
    pub abs_ge: u64,
    pub total: u64,
}

impl crate::resample::share::Portable for Counts {
    fn put(&self, out: &mut Vec<u8>) {
        for x in [self.ge, self.le, self.abs_ge, self.total] {
            x.put(out);
        }
    }
    fn get(input: &mut &[u8]) -> Option<Counts> {
        Some(Counts {
            ge: u64::get(input)?,
            le: u64::get(input)?,
            abs_ge: u64::get(input)?,
            total: u64::get(input)?,
        })
    }
}

impl Counts {
    pub fn add(&mut self, other: &Counts) {
        self.ge += other.ge;
        self.le += other.le;
        self.abs_ge += other.abs_ge;
        self.total += other.total;
    }

    /// Adds one relabelling's statistic against thresholds made once by [`Thresholds::new`]
    /// (the same comparisons as [`Counts::record`], for the hottest loops).
    #[inline(always)]
    pub(crate) fn record_at(&mut self, t: f64, th: &Thresholds) {
        self.total += 1;
        self.ge += u64::from(t >= th.ge);
        self.le += u64::from(t <= th.le);
        self.abs_ge += u64::from(t.abs() >= th.abs_ge);
    }

    #[inline]
    pub(crate) fn record(&mut self, t: f64, obs: f64, tol: f64) {
        // An infinite observed statistic would make a relative tolerance infinite, and
        // inf − inf is NaN, which counts nothing: ties are then exact.
        let tol = if tol.is_finite() { tol } else { 0.0 };
        // Branch-free: the comparisons are unpredictable.
        self.total += 1;
        self.ge += u64::from(t >= obs - tol);
        self.le += u64::from(t <= obs + tol);
        self.abs_ge += u64::from(t.abs() >= obs.abs() - tol);
    }
}

//! Direct values of the two-group statistics and effects that need no relabelling kernel:
//! Welch's t from its parts, mid-ranks and the probability of superiority, the median
//! absolute deviation, log ratios of spreads and the Kolmogorov–Smirnov distance.

use crate::num::stats;

/// Welch t from a difference in means and the squared standard error; a zero standard
/// error gives 0 for no difference and an infinite t otherwise.
pub fn welch_t_from(diff: f64, se2: f64) -> f64 {
    if se2 > 0.0 {
        diff / se2.sqrt()
    } else if diff == 0.0 {
        0.0
    } else {
        diff.signum() * f64::INFINITY
    }
}

/// The mid-ranks of `a` and of `b` among the pooled values (ties share the mean of their
/// ranks).
pub fn joint_ranks(a: &[f64], b: &[f64]) -> (Vec<f64>, Vec<f64>) {
    let pooled: Vec<f64> = a.iter().chain(b).copied().collect();
    let mut r = stats::ranks(&pooled);
    let rb = r.split_off(a.len());
    (r, rb)
}

/// The probability of superiority of `a` over `b`, P(X > Y) + P(X = Y)/2 for X from `a` and
/// Y from `b` (the common-language effect size; the area under the ROC curve): the first
/// group's Mann–Whitney U over n1·n2, from the mid-ranks.
pub fn superiority(a: &[f64], b: &[f64]) -> f64 {
    let (n1, n2) = (a.len() as f64, b.len() as f64);
    let (ra, _) = joint_ranks(a, b);
    (ra.iter().sum::<f64>() - n1 * (n1 + 1.0) / 2.0) / (n1 * n2)
}

/// The median absolute deviation from the median (without a scale factor).
pub fn mad(x: &[f64]) -> f64 {
    mad_sorted(&stats::sorted(x))
}

/// [`mad`] of values in ascending order.
///
/// Without a list of deviations: those below the median, read downwards, and those from it
/// upwards are both ascending, so the middle ones are found by merging the two (the same
/// numbers as the median of the list |v − m|).
pub(crate) fn mad_sorted(s: &[f64]) -> f64 {
    let n = s.len();
    if n == 0 {
        return f64::NAN;
    }
    let m = stats::median_sorted(s);
    let split = s.partition_point(|&v| v < m);
    let (mut below, mut above) = (split, split);
    let mut next = || {
        if below > 0 && (above >= n || m - s[below - 1] <= s[above] - m) {
            below -= 1;
            m - s[below]
        } else {
            above += 1;
            s[above - 1] - m
        }
    };
    let mut low = f64::NAN;
    for _ in 0..n / 2 {
        low = next();
    }
    let high = next();
    if n % 2 == 1 {
        high
    } else {
        0.5 * (low + high)
    }
}

/// log(a / b) for two non-negative spreads: 0 when both are 0, ±∞ when one is.
pub fn log_ratio(a: f64, b: f64) -> f64 {
    match (a > 0.0, b > 0.0) {
        (true, true) => (a / b).ln(),
        (false, false) => 0.0,
        (true, false) => f64::INFINITY,
        (false, true) => f64::NEG_INFINITY,
    }
}

/// The log ratio of two SDs from the variances: 0 when both are 0, ±∞ when one is.
pub fn log_sd_ratio_from(v1: f64, v2: f64) -> f64 {
    match (v1 > 0.0, v2 > 0.0) {
        (true, true) => 0.5 * (v1 / v2).ln(),
        (false, false) => 0.0,
        (true, false) => f64::INFINITY,
        (false, true) => f64::NEG_INFINITY,
    }
}

/// The two-sample Kolmogorov–Smirnov distance sup |F_a − F_b| (as scipy.stats.ks_2samp's
/// statistic): both groups sorted and merged, the gap read after each run of equal values.
pub fn ks_distance(a: &[f64], b: &[f64]) -> f64 {
    let (sa, sb) = (stats::sorted(a), stats::sorted(b));
    let (na, nb) = (a.len() as f64, b.len() as f64);
    let (mut i, mut j) = (0, 0);
    let mut gap = 0.0f64;
    while i < sa.len() || j < sb.len() {
        let v = match (sa.get(i), sb.get(j)) {
            (Some(&x), Some(&y)) => x.min(y),
            (Some(&x), None) => x,
            (None, Some(&y)) => y,
            (None, None) => break,
        };
        while i < sa.len() && sa[i] == v {
            i += 1;
        }
        while j < sb.len() && sb[j] == v {
            j += 1;
        }
        gap = gap.max((i as f64 / na - j as f64 / nb).abs());
    }
    gap
}

#[cfg(test)]
mod tests {
    use super::*;

    /// The merged deviations give the median of the list |v − m| (its definition), to the
    /// bit, with and without ties, for odd and even sizes.
    #[test]
    fn mad_by_merging_equals_the_median_of_the_deviations() {
        let mut x: Vec<f64> = Vec::new();
        for i in 0..40u64 {
            x.push(((i * 7919) % 23) as f64 * 0.37 - 2.0);
            let s = stats::sorted(&x);
            let m = stats::median_sorted(&s);
            let mut dev: Vec<f64> = s.iter().map(|v| (v - m).abs()).collect();
            assert_eq!(mad_sorted(&s), stats::median_select(&mut dev), "{s:?}");
        }
        assert!(mad_sorted(&[]).is_nan());
    }
}

//! Bootstrap for two independent groups: each group is resampled with replacement from
//! itself, and percentile or BCa intervals are read from the resampled statistics.

use super::normal;
use super::protocol::{Interval, IntervalMethod};
use super::rng::Stream;
use super::stats;

/// A two-sample statistic computed from two groups. The slices may be reordered.
pub type TwoSampleFn = fn(&mut [f64], &mut [f64]) -> f64;

/// Bootstrap statistics for one block (with that block's stream): for each resample, the value of each statistic.
pub fn block(
    a: &[f64],
    b: &[f64],
    statistics: &[TwoSampleFn],
    mut stream: Stream,
    len: u64,
) -> Vec<Vec<f64>> {
    let mut out: Vec<Vec<f64>> = statistics
        .iter()
        .map(|_| Vec::with_capacity(len as usize))
        .collect();
    let (mut ra, mut rb) = (vec![0.0; a.len()], vec![0.0; b.len()]);
    for _ in 0..len {
        for x in ra.iter_mut() {
            *x = a[stream.below(a.len() as u64) as usize];
        }
        for x in rb.iter_mut() {
            *x = b[stream.below(b.len() as u64) as usize];
        }
        for (f, o) in statistics.iter().zip(out.iter_mut()) {
            o.push(f(&mut ra, &mut rb));
        }
    }
    out
}

/// Jackknife acceleration for two or more samples, as scipy.stats.bootstrap computes it
/// (scipy 1.x, `_bca_interval`): for each sample j, the leave-one-out values θ_(j,i) are
/// centred on their own mean, U_ji = (n_j - 1)(θ̄_j - θ_(j,i)), and
/// a = Σ_j Σ_i U_ji³ / n_j³ / (6 (Σ_j Σ_i U_ji² / n_j²)^(3/2)).
/// For one sample this is Efron's (1987) a = Σ d³ / (6 (Σ d²)^(3/2)).
/// Returns None when every leave-one-out value is the same (acceleration undefined).
pub fn acceleration(samples: &[&[f64]], statistic: TwoSampleFn) -> Option<f64> {
    assert_eq!(samples.len(), 2);
    let (mut num, mut den) = (0.0, 0.0);
    for j in 0..2 {
        let nj = samples[j].len();
        let mut theta = Vec::with_capacity(nj);
        for i in 0..nj {
            let mut left: Vec<f64> = samples[j]
                .iter()
                .enumerate()
                .filter(|(k, _)| *k != i)
                .map(|(_, v)| *v)
                .collect();
            let mut other = samples[1 - j].to_vec();
            let v = if j == 0 {
                statistic(&mut left, &mut other)
            } else {
                statistic(&mut other, &mut left)
            };
            theta.push(v);
        }
        let m = stats::mean(&theta);
        let n = nj as f64;
        for t in theta {
            let u = (n - 1.0) * (m - t);
            num += u * u * u / (n * n * n);
            den += u * u / (n * n);
        }
    }
    if den <= 0.0 || !den.is_finite() {
        return None;
    }
    Some(num / (6.0 * (den * den.sqrt())))
}

/// The same acceleration from precomputed leave-one-out values of the two-sample statistic:
/// `loo[j][i]` is the statistic with observation i of sample j left out.
pub fn acceleration_from_loo(loo: &[Vec<f64>]) -> Option<f64> {
    let (mut num, mut den) = (0.0, 0.0);
    for theta in loo {
        let n = theta.len() as f64;
        let m = stats::mean(theta);
        for t in theta {
            let u = (n - 1.0) * (m - t);
            num += u * u * u / (n * n * n);
            den += u * u / (n * n);
        }
    }
    if den <= 0.0 || !den.is_finite() {
        return None;
    }
    Some(num / (6.0 * (den * den.sqrt())))
}

/// A confidence interval from bootstrap statistics (non-finite values already removed).
pub fn interval(
    method: IntervalMethod,
    level: f64,
    estimate: f64,
    boot: &[f64],
    accel: impl FnOnce() -> Option<f64>,
) -> Interval {
    let mut iv = Interval {
        low: None,
        high: None,
        level,
        method: method.key().to_string(),
        note: None,
    };
    if boot.is_empty() {
        iv.note = Some("No bootstrap resample gave a defined value.".into());
        return iv;
    }
    let sorted = stats::sorted(boot);
    let alpha = (1.0 - level) / 2.0;
    let (first, last) = (sorted[0], sorted[sorted.len() - 1]);
    if first == last {
        iv.low = Some(first);
        iv.high = Some(first);
        iv.note = Some(
            "Every bootstrap resample gave the same value, so the interval has zero width: \
             the data show too little variation to express uncertainty this way."
                .into(),
        );
        return iv;
    }
    match method {
        IntervalMethod::Percentile => {
            iv.low = Some(stats::quantile_sorted(&sorted, alpha));
            iv.high = Some(stats::quantile_sorted(&sorted, 1.0 - alpha));
        }
        IntervalMethod::Bca => {
            let b = sorted.len() as f64;
            let below = sorted.partition_point(|&v| v < estimate) as f64;
            let equal = sorted.partition_point(|&v| v <= estimate) as f64 - below;
            let share = (below + 0.5 * equal) / b;
            if share <= 0.0 || share >= 1.0 {
                iv.note = Some(
                    "BCa is undefined here: every bootstrap value lies on one side of the \
                     estimate. The percentile interval is shown instead."
                        .into(),
                );
                iv.method = IntervalMethod::Percentile.key().into();
                iv.low = Some(stats::quantile_sorted(&sorted, alpha));
                iv.high = Some(stats::quantile_sorted(&sorted, 1.0 - alpha));
                return iv;
            }
            let z0 = normal::quantile(share);
            let a = match accel() {
                Some(a) => a,
                None => {
                    iv.note = Some(
                        "The jackknife values did not vary, so the acceleration was taken as \
                         0 (a bias-corrected percentile interval)."
                            .into(),
                    );
                    0.0
                }
            };
            let adj = |z: f64| {
                let w = z0 + z;
                normal::cdf(z0 + w / (1.0 - a * w))
            };
            let lo = adj(normal::quantile(alpha));
            let hi = adj(normal::quantile(1.0 - alpha));
            iv.low = Some(stats::quantile_sorted(&sorted, lo));
            iv.high = Some(stats::quantile_sorted(&sorted, hi));
            let tiny = 1.0 / b;
            if lo < tiny || hi > 1.0 - tiny {
                iv.note = Some(
                    "The BCa limits fell in the outermost bootstrap values; use more resamples \
                     before relying on this interval."
                        .into(),
                );
            }
        }
    }
    iv
}

/// Bootstrap standard error: SD of the bootstrap statistics.
pub fn standard_error(boot: &[f64]) -> Option<f64> {
    (boot.len() > 1).then(|| stats::sd(boot))
}

#[cfg(test)]
mod tests {
    use super::*;

    fn mean_diff(a: &mut [f64], b: &mut [f64]) -> f64 {
        stats::mean(a) - stats::mean(b)
    }

    #[test]
    fn acceleration_of_a_mean_difference_matches_closed_form() {
        // For the mean, leave-one-out deviations are proportional to the data's deviations,
        // so a = Σ_j Σ (x - x̄_j)³ / n_j³ / (6 (Σ_j Σ (x - x̄_j)² / n_j²)^(3/2)) with the sign
        // of the second group reversed (it enters the statistic negatively).
        let a = [1.0, 2.0, 7.0, 3.0];
        let b = [2.0, 9.0, 4.0, 4.0, 1.0];
        let got = acceleration(&[&a, &b], mean_diff).unwrap();
        let (mut num, mut den) = (0.0, 0.0);
        for (x, sign) in [(&a[..], 1.0), (&b[..], -1.0)] {
            let n = x.len() as f64;
            let m = stats::mean(x);
            for v in x {
                // U = (n-1)(θ̄ - θ_i) = sign * (x_i - x̄) for the mean.
                let u = sign * (v - m);
                num += u * u * u / (n * n * n);
                den += u * u / (n * n);
            }
        }
        let want = num / (6.0 * (den * den.sqrt()));
        assert!((got - want).abs() < 1e-12, "{got} vs {want}");
    }

    #[test]
    fn zero_width_interval_has_a_note() {
        let iv = interval(IntervalMethod::Bca, 0.95, 1.0, &[1.0; 50], || Some(0.0));
        assert_eq!(iv.low, Some(1.0));
        assert!(iv.note.is_some());
    }
}

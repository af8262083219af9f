//! Discrete distributions: exact binomial confidence limits, and probabilities built from
//! the ratios of successive terms (the same numbers on every machine).

use statrs::distribution::{Beta, ContinuousCDF};

/// Clopper–Pearson interval for a binomial proportion, x successes in n trials.
pub fn clopper_pearson(x: u64, n: u64, level: f64) -> (f64, f64) {
    let alpha = 1.0 - level;
    let lo = if x == 0 {
        0.0
    } else {
        Beta::new(x as f64, (n - x + 1) as f64)
            .map(|d| d.inverse_cdf(alpha / 2.0))
            .unwrap_or(0.0)
    };
    let hi = if x == n {
        1.0
    } else {
        Beta::new((x + 1) as f64, (n - x) as f64)
            .map(|d| d.inverse_cdf(1.0 - alpha / 2.0))
            .unwrap_or(1.0)
    };
    (lo, hi)
}

/// Probabilities of a discrete distribution on lo..=hi from the ratio of successive
/// probabilities, computed outward from the mode and normalised: only +, ×, ÷, so the
/// numbers are the same on every machine.
pub fn pmf_from_ratios(lo: u64, hi: u64, mode: u64, ratio: impl Fn(u64) -> f64) -> Vec<f64> {
    let len = (hi - lo + 1) as usize;
    let mut p = vec![0.0; len];
    let m = (mode - lo) as usize;
    p[m] = 1.0;
    for i in m + 1..len {
        p[i] = p[i - 1] * ratio(lo + i as u64 - 1);
    }
    for i in (0..m).rev() {
        p[i] = p[i + 1] / ratio(lo + i as u64);
    }
    let total: f64 = p.iter().sum();
    p.iter_mut().for_each(|v| *v /= total);
    p
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn clopper_pearson_edges() {
        // x = 0: upper limit is 1 - (alpha/2)^(1/n) (closed form).
        let (lo, hi) = clopper_pearson(0, 10, 0.95);
        assert_eq!(lo, 0.0);
        assert!((hi - (1.0 - 0.025f64.powf(0.1))).abs() < 1e-9, "{hi}");
        let (lo, hi) = clopper_pearson(10, 10, 0.95);
        assert!((lo - 0.025f64.powf(0.1)).abs() < 1e-9);
        assert_eq!(hi, 1.0);
    }
}

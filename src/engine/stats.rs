//! Descriptive statistics used throughout the engine.

/// Arithmetic mean (NaN for an empty slice; callers check sizes first).
pub fn mean(x: &[f64]) -> f64 {
    x.iter().sum::<f64>() / x.len() as f64
}

/// Sample variance with divisor n - 1, computed in two passes for accuracy.
pub fn variance(x: &[f64]) -> f64 {
    let n = x.len();
    if n < 2 {
        return f64::NAN;
    }
    let m = mean(x);
    x.iter().map(|v| (v - m) * (v - m)).sum::<f64>() / (n - 1) as f64
}

pub fn sd(x: &[f64]) -> f64 {
    variance(x).sqrt()
}

/// Sorted copy of the data.
pub fn sorted(x: &[f64]) -> Vec<f64> {
    let mut v = x.to_vec();
    v.sort_by(f64::total_cmp);
    v
}

/// Median of already sorted data (mean of the two middle values for even n).
pub fn median_sorted(s: &[f64]) -> f64 {
    let n = s.len();
    if n == 0 {
        return f64::NAN;
    }
    if n % 2 == 1 {
        s[n / 2]
    } else {
        0.5 * (s[n / 2 - 1] + s[n / 2])
    }
}

pub fn median(x: &[f64]) -> f64 {
    median_sorted(&sorted(x))
}

/// Proportion cut from each end by the trimmed mean.
pub const TRIM: f64 = 0.2;

/// How many values a 20% trimmed mean cuts from each end of n values: floor(0.2 n), the
/// convention of scipy.stats.trim_mean and of Wilcox, "Introduction to Robust Estimation
/// and Hypothesis Testing" (3rd ed., section 3.3).
pub fn trim_count(n: usize) -> usize {
    ((TRIM * n as f64) + 1e-9).floor() as usize
}

/// 20% trimmed mean of sorted data.
pub fn trimmed_mean_sorted(s: &[f64]) -> f64 {
    let g = trim_count(s.len());
    let kept = &s[g..s.len() - g];
    mean(kept)
}

pub fn trimmed_mean(x: &[f64]) -> f64 {
    trimmed_mean_sorted(&sorted(x))
}

/// Quantile by linear interpolation between order statistics (Hyndman & Fan 1996 type 7,
/// the default of numpy.percentile and R's quantile), of sorted data.
pub fn quantile_sorted(s: &[f64], p: f64) -> f64 {
    let n = s.len();
    if n == 0 {
        return f64::NAN;
    }
    let p = p.clamp(0.0, 1.0);
    let h = (n - 1) as f64 * p;
    let lo = h.floor() as usize;
    let hi = (lo + 1).min(n - 1);
    s[lo] + (h - lo as f64) * (s[hi] - s[lo])
}

/// Hedges' g: difference in means over the pooled SD, times the exact small-sample
/// correction J(df) = Γ(df/2) / (sqrt(df/2) Γ((df-1)/2)), df = n1 + n2 - 2
/// (Hedges & Olkin 1985, "Statistical Methods for Meta-Analysis", ch. 5).
pub fn hedges_g(a: &[f64], b: &[f64]) -> f64 {
    let (n1, n2) = (a.len() as f64, b.len() as f64);
    let df = n1 + n2 - 2.0;
    let pooled = (((n1 - 1.0) * variance(a) + (n2 - 1.0) * variance(b)) / df).sqrt();
    let d = (mean(a) - mean(b)) / pooled;
    d * hedges_j(df)
}

pub fn hedges_j(df: f64) -> f64 {
    use statrs::function::gamma::ln_gamma;
    (ln_gamma(df / 2.0) - ln_gamma((df - 1.0) / 2.0)).exp() / (df / 2.0).sqrt()
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn basic_values() {
        let x = [2.0, 4.0, 4.0, 4.0, 5.0, 5.0, 7.0, 9.0];
        assert_eq!(mean(&x), 5.0);
        // Population SD of this classic example is 2; sample variance is 32/7.
        assert!((variance(&x) - 32.0 / 7.0).abs() < 1e-12);
        assert_eq!(median(&x), 4.5);
        assert_eq!(median(&[3.0, 1.0, 2.0]), 2.0);
    }

    #[test]
    fn trimmed_mean_matches_definition() {
        // n = 10: floor(0.2 * 10) = 2 cut from each end.
        let x = [1.0, 2.0, 3.0, 4.0, 5.0, 6.0, 7.0, 8.0, 9.0, 100.0];
        assert_eq!(trim_count(10), 2);
        assert_eq!(trimmed_mean(&x), (3.0 + 4.0 + 5.0 + 6.0 + 7.0 + 8.0) / 6.0);
        assert_eq!(trim_count(4), 0);
        assert_eq!(trim_count(5), 1);
    }

    #[test]
    fn quantile_type7() {
        let s = [1.0, 2.0, 3.0, 4.0];
        assert_eq!(quantile_sorted(&s, 0.0), 1.0);
        assert_eq!(quantile_sorted(&s, 1.0), 4.0);
        assert!((quantile_sorted(&s, 0.5) - 2.5).abs() < 1e-12);
        assert!((quantile_sorted(&s, 0.25) - 1.75).abs() < 1e-12);
    }

    #[test]
    fn hedges_j_approximation() {
        // The common approximation J ≈ 1 - 3 / (4 df - 1) (Hedges & Olkin 1985) agrees to
        // about 1e-4 at df = 20.
        let df = 20.0;
        assert!((hedges_j(df) - (1.0 - 3.0 / (4.0 * df - 1.0))).abs() < 2e-4);
    }
}

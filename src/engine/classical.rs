//! Classical cross-checks, with distribution functions from statrs.

use statrs::distribution::{Beta, ContinuousCDF, StudentsT};

use super::protocol::{Alternative, Interval, Welch};
use super::stats;

/// Welch's t-test with Welch–Satterthwaite degrees of freedom, and the two-sided
/// confidence interval for the difference in means at `level`.
pub fn welch(a: &[f64], b: &[f64], alternative: Alternative, level: f64) -> Welch {
    let (n1, n2) = (a.len() as f64, b.len() as f64);
    let diff = stats::mean(a) - stats::mean(b);
    let (w1, w2) = (stats::variance(a) / n1, stats::variance(b) / n2);
    let se2 = w1 + w2;
    let mut ci = Interval {
        low: None,
        high: None,
        level,
        method: "Welch t".into(),
        side: super::protocol::Side::TwoSided,
        note: None,
    };
    if se2 <= 0.0 || !se2.is_finite() {
        ci.note = Some("Both groups have no spread, so Welch's t-test is undefined.".into());
        return Welch {
            mean_difference: diff,
            t: None,
            df: None,
            p_value: None,
            ci,
        };
    }
    let se = se2.sqrt();
    let t = diff / se;
    let df = se2 * se2 / (w1 * w1 / (n1 - 1.0) + w2 * w2 / (n2 - 1.0));
    let dist = StudentsT::new(0.0, 1.0, df).expect("df > 0");
    let p = match alternative {
        Alternative::TwoSided => 2.0 * dist.sf(t.abs()),
        Alternative::Greater => dist.sf(t),
        Alternative::Less => dist.cdf(t),
    }
    .min(1.0);
    let q = dist.inverse_cdf(1.0 - (1.0 - level) / 2.0);
    ci.low = Some(diff - q * se);
    ci.high = Some(diff + q * se);
    Welch {
        mean_difference: diff,
        t: Some(t),
        df: Some(df),
        p_value: Some(p),
        ci,
    }
}

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

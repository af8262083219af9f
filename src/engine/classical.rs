//! Classical cross-checks, with distribution functions from statrs.

use serde::{Deserialize, Serialize};
use statrs::distribution::{Beta, ChiSquared, ContinuousCDF, FisherSnedecor, StudentsT};

use super::protocol::{Alternative, Interval, Welch};
use super::stats;

/// An F test: the statistic, its degrees of freedom and the upper-tail p-value. `f` and
/// `p_value` are None when the test is undefined (no spread within the groups).
#[derive(Clone, Debug, PartialEq, Serialize, Deserialize)]
pub struct FTest {
    pub f: Option<f64>,
    pub df1: f64,
    pub df2: f64,
    pub p_value: Option<f64>,
}

/// A chi-square test: statistic, degrees of freedom, upper-tail p-value.
#[derive(Clone, Debug, PartialEq, Serialize, Deserialize)]
pub struct ChiSquareTest {
    pub statistic: Option<f64>,
    pub df: f64,
    pub p_value: Option<f64>,
}

fn f_test(f: f64, df1: f64, df2: f64) -> FTest {
    let p = FisherSnedecor::new(df1, df2)
        .ok()
        .filter(|_| f.is_finite())
        .map(|d| d.sf(f));
    FTest {
        f: f.is_finite().then_some(f),
        df1,
        df2,
        p_value: p,
    }
}

/// One-way analysis of variance: F = (SS between / (k − 1)) / (SS within / (N − k)).
pub fn one_way_anova(groups: &[Vec<f64>]) -> FTest {
    let k = groups.len() as f64;
    let n: f64 = groups.iter().map(|g| g.len() as f64).sum();
    let grand = groups.iter().flatten().sum::<f64>() / n;
    let ssb: f64 = groups
        .iter()
        .map(|g| g.len() as f64 * (stats::mean(g) - grand).powi(2))
        .sum();
    let ssw: f64 = groups
        .iter()
        .map(|g| {
            let m = stats::mean(g);
            g.iter().map(|v| (v - m) * (v - m)).sum::<f64>()
        })
        .sum();
    let (df1, df2) = (k - 1.0, n - k);
    let f = if ssw > 0.0 {
        (ssb / df1) / (ssw / df2)
    } else {
        f64::NAN
    };
    f_test(f, df1, df2)
}

/// Welch's (1951) heteroscedastic one-way test: weights w_i = n_i / s_i²,
/// F = [Σ w_i (m_i − m_w)² / (k − 1)] / [1 + 2(k − 2)/(k² − 1) · Λ], with
/// Λ = Σ (1 − w_i/W)² / (n_i − 1) and denominator degrees of freedom (k² − 1) / (3Λ).
pub fn welch_anova(groups: &[Vec<f64>]) -> FTest {
    let k = groups.len() as f64;
    let df1 = k - 1.0;
    let undefined = FTest {
        f: None,
        df1,
        df2: f64::NAN,
        p_value: None,
    };
    let mut w = Vec::new();
    for g in groups {
        let v = stats::variance(g);
        if v <= 0.0 || !v.is_finite() {
            return undefined;
        }
        w.push(g.len() as f64 / v);
    }
    let big_w: f64 = w.iter().sum();
    let means: Vec<f64> = groups.iter().map(|g| stats::mean(g)).collect();
    let mw = w.iter().zip(&means).map(|(w, m)| w * m).sum::<f64>() / big_w;
    let a = w
        .iter()
        .zip(&means)
        .map(|(w, m)| w * (m - mw) * (m - mw))
        .sum::<f64>()
        / df1;
    let lambda: f64 = w
        .iter()
        .zip(groups)
        .map(|(w, g)| (1.0 - w / big_w).powi(2) / (g.len() as f64 - 1.0))
        .sum();
    let b = 1.0 + 2.0 * (k - 2.0) / (k * k - 1.0) * lambda;
    let df2 = (k * k - 1.0) / (3.0 * lambda);
    f_test(a / b, df1, df2)
}

/// Kruskal–Wallis H with the correction for ties, referred to chi-square with k − 1 df.
pub fn kruskal_wallis(groups: &[Vec<f64>]) -> ChiSquareTest {
    let pooled: Vec<f64> = groups.iter().flatten().copied().collect();
    let n = pooled.len() as f64;
    let r = super::estimate::ranks(&pooled);
    let mut at = 0;
    let mut sum = 0.0;
    for g in groups {
        let rs: f64 = r[at..at + g.len()].iter().sum();
        sum += rs * rs / g.len() as f64;
        at += g.len();
    }
    let h = 12.0 / (n * (n + 1.0)) * sum - 3.0 * (n + 1.0);
    let mut sorted = pooled;
    sorted.sort_by(f64::total_cmp);
    let mut ties = 0.0;
    let mut i = 0;
    while i < sorted.len() {
        let mut j = i;
        while j + 1 < sorted.len() && sorted[j + 1] == sorted[i] {
            j += 1;
        }
        let t = (j - i + 1) as f64;
        ties += t * t * t - t;
        i = j + 1;
    }
    let c = 1.0 - ties / (n * n * n - n);
    let df = groups.len() as f64 - 1.0;
    if c <= 0.0 {
        return ChiSquareTest {
            statistic: None,
            df,
            p_value: None,
        };
    }
    let h = h / c;
    ChiSquareTest {
        statistic: Some(h),
        df,
        p_value: ChiSquared::new(df).ok().map(|d| d.sf(h)),
    }
}

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

//! One-way ANOVA, Welch's ANOVA and the Kruskal–Wallis test.

use serde::{Deserialize, Serialize};
use statrs::distribution::{ChiSquared, ContinuousCDF, FisherSnedecor};

use crate::num::stats;

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
    let r = stats::ranks(&pooled);
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
    let ties = crate::num::stats::tie_cubes(&sorted);
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

//! t-tests: Welch's for two groups, and the paired or one-sample t-test (statrs distributions).

use serde::{Deserialize, Serialize};
use statrs::distribution::{ContinuousCDF, StudentsT};

use crate::base::{Alternative, Interval, Method, Note, Side};
use crate::num::stats;

/// Welch's t-test of a difference in means, with its confidence interval.
#[derive(Clone, Debug, PartialEq, Serialize, Deserialize)]
pub struct Welch {
    pub mean_difference: f64,
    pub t: Option<f64>,
    pub df: Option<f64>,
    pub p_value: Option<f64>,
    pub ci: Interval,
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
        method: Method::WelchT,
        side: crate::base::Side::TwoSided,
        notes: Vec::new(),
    };
    if se2 <= 0.0 || !se2.is_finite() {
        ci.notes.push(Note::WelchUndefined);
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

#[derive(Clone, Debug, PartialEq, Serialize, Deserialize)]
pub struct TTest {
    pub t: Option<f64>,
    pub df: f64,
    pub p_value: Option<f64>,
    pub ci: Interval,
}

/// t-test of the mean difference against zero.
pub fn t_test(d: &[f64], alternative: Alternative, level: f64) -> TTest {
    let n = d.len() as f64;
    let m = stats::mean(d);
    let se = stats::sd(d) / n.sqrt();
    let df = n - 1.0;
    let mut ci = Interval {
        low: None,
        high: None,
        level,
        method: Method::T,
        side: Side::TwoSided,
        notes: Vec::new(),
    };
    let Some(dist) = StudentsT::new(0.0, 1.0, df).ok().filter(|_| se > 0.0) else {
        ci.notes.push(Note::TTestUndefined);
        return TTest {
            t: None,
            df,
            p_value: None,
            ci,
        };
    };
    let t = m / se;
    let p = match alternative {
        Alternative::TwoSided => 2.0 * dist.sf(t.abs()),
        Alternative::Greater => dist.sf(t),
        Alternative::Less => dist.cdf(t),
    };
    let q = dist.inverse_cdf(1.0 - (1.0 - level) / 2.0);
    ci.low = Some(m - q * se);
    ci.high = Some(m + q * se);
    TTest {
        t: Some(t),
        df,
        p_value: Some(p.min(1.0)),
        ci,
    }
}

//! The linear model y ~ group + stratum as a classical cross-check.

use serde::{Deserialize, Serialize};
use statrs::distribution::{ContinuousCDF, StudentsT};

use crate::base::{Alternative, Interval, Method, Note, Side};

/// The t-test of the group effect in a linear model with the stratum as a factor
/// (y ~ group + stratum, no interaction).
#[derive(Clone, Debug, PartialEq, Serialize, Deserialize)]
pub struct LinearModelCheck {
    pub estimate: f64,
    pub t: Option<f64>,
    pub df: f64,
    pub p_value: Option<f64>,
    pub ci: Interval,
}

/// y ~ group + stratum by least squares, through the within-stratum deviations
/// (Frisch–Waugh–Lovell): the group coefficient, its t-test with N − S − 1 df and interval.
/// `strata` holds each stratum's two groups.
pub fn linear_model(
    strata: &[(&[f64], &[f64])],
    alternative: Alternative,
    level: f64,
) -> LinearModelCheck {
    let (mut sxy, mut sxx) = (0.0, 0.0);
    let mut centred: Vec<(f64, f64)> = Vec::new();
    for &(a, b) in strata {
        let n = (a.len() + b.len()) as f64;
        let gbar = a.len() as f64 / n;
        let ybar = (a.iter().sum::<f64>() + b.iter().sum::<f64>()) / n;
        for (&y, g) in a.iter().map(|y| (y, 1.0)).chain(b.iter().map(|y| (y, 0.0))) {
            let (gc, yc) = (g - gbar, y - ybar);
            sxy += gc * yc;
            sxx += gc * gc;
            centred.push((gc, yc));
        }
    }
    let n = centred.len() as f64;
    let df = n - strata.len() as f64 - 1.0;
    let beta = sxy / sxx;
    let sse: f64 = centred
        .iter()
        .map(|(g, y)| (y - beta * g) * (y - beta * g))
        .sum();
    let mut ci = Interval {
        low: None,
        high: None,
        level,
        method: Method::LinearModelT,
        side: Side::TwoSided,
        notes: Vec::new(),
    };
    let se = (sse / df / sxx).sqrt();
    let dist = StudentsT::new(0.0, 1.0, df).ok();
    match dist.filter(|_| se > 0.0 && se.is_finite()) {
        Some(d) => {
            let t = beta / se;
            let p = match alternative {
                Alternative::TwoSided => (2.0 * d.sf(t.abs())).min(1.0),
                Alternative::Greater => d.sf(t),
                Alternative::Less => d.cdf(t),
            };
            let q = d.inverse_cdf(1.0 - (1.0 - level) / 2.0);
            ci.low = Some(beta - q * se);
            ci.high = Some(beta + q * se);
            LinearModelCheck {
                estimate: beta,
                t: Some(t),
                df,
                p_value: Some(p),
                ci,
            }
        }
        None => {
            ci.notes.push(Note::LinearModelUndefined);
            LinearModelCheck {
                estimate: beta,
                t: None,
                df,
                p_value: None,
                ci,
            }
        }
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn linear_model_matches_the_normal_equations() {
        // Check against an explicit least-squares fit with dummy columns for the strata.
        let cells: [(&[f64], &[f64]); 2] = [
            (&[5.0, 6.5, 7.0], &[4.0, 4.5]),
            (&[9.0, 8.0], &[6.0, 7.5, 7.0]),
        ];
        let lm = linear_model(&cells, Alternative::TwoSided, 0.95);
        // Columns: group, stratum a, stratum b (no intercept); normal equations solved by
        // hand for this small case.
        let rows: Vec<(f64, f64, f64, f64)> = vec![
            (1.0, 1.0, 0.0, 5.0),
            (1.0, 1.0, 0.0, 6.5),
            (1.0, 1.0, 0.0, 7.0),
            (0.0, 1.0, 0.0, 4.0),
            (0.0, 1.0, 0.0, 4.5),
            (1.0, 0.0, 1.0, 9.0),
            (1.0, 0.0, 1.0, 8.0),
            (0.0, 0.0, 1.0, 6.0),
            (0.0, 0.0, 1.0, 7.5),
            (0.0, 0.0, 1.0, 7.0),
        ];
        let mut a = [[0.0f64; 4]; 3];
        for (g, s1, s2, y) in &rows {
            let x = [*g, *s1, *s2];
            for i in 0..3 {
                for j in 0..3 {
                    a[i][j] += x[i] * x[j];
                }
                a[i][3] += x[i] * y;
            }
        }
        // Gaussian elimination.
        for i in 0..3 {
            for r in 0..3 {
                if r != i {
                    let f = a[r][i] / a[i][i];
                    let pivot = a[i];
                    for (x, p) in a[r].iter_mut().zip(pivot) {
                        *x -= f * p;
                    }
                }
            }
        }
        let beta = a[0][3] / a[0][0];
        assert!(
            (lm.estimate - beta).abs() < 1e-12,
            "{} vs {beta}",
            lm.estimate
        );
        assert_eq!(lm.df, 7.0);
    }
}

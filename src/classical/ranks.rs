//! Rank tests used as classical cross-checks.

use serde::{Deserialize, Serialize};

use crate::base::Alternative;
use crate::num::normal;
use crate::num::stats::ranks;

/// The Wilcoxon signed-rank test of paired differences.
#[derive(Clone, Debug, PartialEq, Serialize, Deserialize)]
pub struct SignedRank {
    /// Sum of the ranks of the positive differences (zeros left out).
    pub w_plus: f64,
    pub p_value: Option<f64>,
    /// How the p-value was found.
    pub method: RankMethod,
    pub zeros: usize,
}

/// How a signed-rank p-value was found.
#[derive(Clone, Copy, Debug, PartialEq, Eq, Serialize, Deserialize)]
#[serde(rename_all = "kebab-case")]
pub enum RankMethod {
    /// Exact null distribution (no ties or zeros, at most 50 differences).
    Exact,
    /// Exact over all sign patterns (ties or zeros present, at most 13 differences).
    ExactWithTies,
    /// Normal approximation with the tie correction, no continuity correction.
    Normal,
    /// Undefined: all differences are zero.
    Undefined,
}

/// Wilcoxon signed-rank test as scipy.stats.wilcoxon 1.17 computes it by default: zeros left
/// out; exact null distribution when there are no ties or zeros and at most 50 differences;
/// with ties or zeros and at most 13 differences, exact over all sign patterns; otherwise the
/// normal approximation with the tie correction and no continuity correction.
pub fn signed_rank(d: &[f64], alternative: Alternative) -> SignedRank {
    let nz: Vec<f64> = d.iter().copied().filter(|v| *v != 0.0).collect();
    let zeros = d.len() - nz.len();
    let n = nz.len();
    if n == 0 {
        return SignedRank {
            w_plus: 0.0,
            p_value: None,
            method: RankMethod::Undefined,
            zeros,
        };
    }
    let abs: Vec<f64> = nz.iter().map(|v| v.abs()).collect();
    let r = ranks(&abs);
    let w_plus: f64 = nz
        .iter()
        .zip(&r)
        .filter(|(v, _)| **v > 0.0)
        .map(|(_, r)| r)
        .sum();
    let mut sorted = abs.clone();
    sorted.sort_by(f64::total_cmp);
    let ties = sorted.windows(2).any(|w| w[0] == w[1]);
    if (ties || zeros > 0) && d.len() <= 13 {
        // Exact over all sign patterns of the non-zero differences (scipy's permutation
        // branch for small samples with ties or zeros).
        let patterns = 1u32 << n;
        let (mut ge, mut le) = (0u32, 0u32);
        let tol = 1e-9 * w_plus.max(1.0);
        for m in 0..patterns {
            let w: f64 = (0..n).filter(|i| m >> i & 1 == 1).map(|i| r[i]).sum();
            ge += u32::from(w >= w_plus - tol);
            le += u32::from(w <= w_plus + tol);
        }
        let (pg, pl) = (ge as f64 / patterns as f64, le as f64 / patterns as f64);
        let p = match alternative {
            Alternative::Greater => pg,
            Alternative::Less => pl,
            Alternative::TwoSided => (2.0 * pg.min(pl)).min(1.0),
        };
        return SignedRank {
            w_plus,
            p_value: Some(p),
            method: RankMethod::ExactWithTies,
            zeros,
        };
    }
    if !ties && zeros == 0 && n <= 50 {
        // Counts of rank sums over all 2^n sign patterns.
        let max = n * (n + 1) / 2;
        let mut c = vec![0f64; max + 1];
        c[0] = 1.0;
        for k in 1..=n {
            for w in (k..=max).rev() {
                c[w] += c[w - k];
            }
        }
        let total: f64 = c.iter().sum();
        let w = w_plus.round() as usize;
        let le: f64 = c[..=w].iter().sum::<f64>() / total;
        let ge: f64 = c[w..].iter().sum::<f64>() / total;
        let p = match alternative {
            Alternative::Greater => ge,
            Alternative::Less => le,
            Alternative::TwoSided => (2.0 * le.min(ge)).min(1.0),
        };
        return SignedRank {
            w_plus,
            p_value: Some(p),
            method: RankMethod::Exact,
            zeros,
        };
    }
    let nf = n as f64;
    let mean = nf * (nf + 1.0) / 4.0;
    let mut tie_term = 0.0;
    let mut i = 0;
    while i < n {
        let mut j = i;
        while j + 1 < n && sorted[j + 1] == sorted[i] {
            j += 1;
        }
        let t = (j - i + 1) as f64;
        tie_term += t * t * t - t;
        i = j + 1;
    }
    let var = nf * (nf + 1.0) * (2.0 * nf + 1.0) / 24.0 - tie_term / 48.0;
    let z = (w_plus - mean) / var.sqrt();
    let p = match alternative {
        Alternative::Greater => 1.0 - normal::cdf(z),
        Alternative::Less => normal::cdf(z),
        Alternative::TwoSided => (2.0 * normal::cdf(-z.abs())).min(1.0),
    };
    SignedRank {
        w_plus,
        p_value: Some(p),
        method: RankMethod::Normal,
        zeros,
    }
}
/// The Wilcoxon–Mann–Whitney rank-sum test by its normal approximation: the classical
/// cross-check of a relabelling test of the rank-sum statistic.
#[derive(Clone, Debug, PartialEq, Serialize, Deserialize)]
pub struct RankSum {
    /// The first group's Mann–Whitney U: its rank sum minus n1(n1 + 1)/2.
    pub u: f64,
    /// The standard normal deviate, with the continuity correction.
    pub z: f64,
    pub p_value: f64,
    /// Whether any values are tied (the variance is then corrected for the ties).
    pub ties: bool,
}

/// The rank-sum test as scipy.stats.mannwhitneyu 1.17 computes it with
/// `method="asymptotic"` (use_continuity=True): mean n1·n2/2 and variance
/// n1·n2/12 · ((n + 1) − Σ(t³ − t)/(n(n − 1))) over the tie groups t; two-sided from the
/// larger of U1 and U2, one-sided from U1 ("greater") or U2 ("less"), each less 0.5.
pub fn rank_sum(a: &[f64], b: &[f64], alternative: Alternative) -> RankSum {
    let (n1, n2) = (a.len() as f64, b.len() as f64);
    let n = n1 + n2;
    let pooled: Vec<f64> = a.iter().chain(b).copied().collect();
    let r = ranks(&pooled);
    let u1 = r[..a.len()].iter().sum::<f64>() - n1 * (n1 + 1.0) / 2.0;
    let u2 = n1 * n2 - u1;
    let mut sorted = pooled.clone();
    sorted.sort_by(f64::total_cmp);
    let tie_sum = crate::num::stats::tie_cubes(&sorted);
    let mu = n1 * n2 / 2.0;
    let var = n1 * n2 / 12.0 * ((n + 1.0) - tie_sum / (n * (n - 1.0)));
    let sd = var.max(0.0).sqrt();
    let u = match alternative {
        Alternative::TwoSided => u1.max(u2),
        Alternative::Greater => u1,
        Alternative::Less => u2,
    };
    let z = if sd > 0.0 { (u - mu - 0.5) / sd } else { 0.0 };
    let tail = normal::cdf(-z);
    let p = match alternative {
        Alternative::TwoSided => (2.0 * tail).min(1.0),
        _ => tail,
    };
    RankSum {
        u: u1,
        z,
        p_value: if sd > 0.0 { p } else { 1.0 },
        ties: tie_sum > 0.0,
    }
}

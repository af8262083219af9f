//! Re-pairing y with x: every pairing in Heap's order (one swap and an O(1) update per
//! step) or random pairings. Every statistic here is linear in S = Σ a_i b_π(i).

use serde::{Deserialize, Serialize};

use crate::num::stats::{self, ranks};
use crate::resample::rng::Stream;
use crate::resample::tally::Counts;

#[derive(Clone, Copy, Debug, PartialEq, Eq, Serialize, Deserialize)]
#[serde(rename_all = "kebab-case")]
pub enum AssocStatistic {
    Pearson,
    Spearman,
    Slope,
    /// Kendall's tau-b (computed by the kendall module); the only one not linear in S.
    Kendall,
}

impl AssocStatistic {
    pub fn key(self) -> &'static str {
        match self {
            AssocStatistic::Pearson => "pearson",
            AssocStatistic::Spearman => "spearman",
            AssocStatistic::Slope => "slope",
            AssocStatistic::Kendall => "kendall",
        }
    }
    pub fn from_key(s: &str) -> Option<AssocStatistic> {
        [
            AssocStatistic::Pearson,
            AssocStatistic::Spearman,
            AssocStatistic::Slope,
            AssocStatistic::Kendall,
        ]
        .into_iter()
        .find(|x| x.key() == s)
    }
    pub fn label(self) -> &'static str {
        match self {
            AssocStatistic::Pearson => "Pearson correlation r",
            AssocStatistic::Spearman => "Spearman correlation rho",
            AssocStatistic::Slope => "least-squares slope",
            AssocStatistic::Kendall => "Kendall tau-b",
        }
    }
}

/// The permutation statistic as a function of S = Σ a_i b_π(i), with a and b the (centred)
/// values or ranks: every statistic here is linear in S once x is fixed.
pub struct Kernel {
    pub a: Vec<f64>,
    pub b: Vec<f64>,
    /// statistic = (S − shift) × scale
    pub scale: f64,
}

impl Kernel {
    pub fn new(st: AssocStatistic, x: &[f64], y: &[f64]) -> Kernel {
        let (a, b) = match st {
            AssocStatistic::Spearman => (ranks(x), ranks(y)),
            _ => (x.to_vec(), y.to_vec()),
        };
        let (ma, mb) = (stats::mean(&a), stats::mean(&b));
        let a: Vec<f64> = a.iter().map(|v| v - ma).collect();
        let b: Vec<f64> = b.iter().map(|v| v - mb).collect();
        let saa: f64 = a.iter().map(|v| v * v).sum();
        let sbb: f64 = b.iter().map(|v| v * v).sum();
        let scale = match st {
            AssocStatistic::Slope => 1.0 / saa,
            _ => 1.0 / (saa * sbb).sqrt(),
        };
        Kernel { a, b, scale }
    }
}

/// How far two computations of the same S (summed afresh, or kept by Heap's O(1) updates and
/// re-summed every 4096 of them) can lie apart by rounding alone, in the statistic's units.
/// Σ|a_i b_π(i)| ≤ sqrt(Σa² Σb²) for every π (Cauchy–Schwarz), and so is each update
/// |(a_i − a_j)(b_j − b_i)| ≤ 2·sqrt(Σa² Σb²); a fresh sum errs by at most (n + 2)·ε and
/// 4096 updates by 4096·4·ε of that bound (Higham, "Accuracy and Stability of Numerical
/// Algorithms", 2nd ed., ch. 3-4, ε for the unit roundoff to spare); twice that, as both the
/// observed S and a relabelled one err. It follows the data's scale: 10^-9 of the statistic
/// merged distinct pairings when one value was huge.
pub fn tie_tolerance(k: &Kernel) -> f64 {
    let saa: f64 = k.a.iter().map(|v| v * v).sum();
    let sbb: f64 = k.b.iter().map(|v| v * v).sum();
    let bound = (saa * sbb).sqrt() * k.scale.abs();
    2.0 * (4.0 * 4096.0 + k.a.len() as f64 + 2.0) * f64::EPSILON * bound
}

pub fn heap_enumerate(
    k: &Kernel,
    obs: f64,
    tol: f64,
    progress: &mut dyn FnMut(u64) -> bool,
) -> Option<(Counts, Vec<f64>)> {
    let n = k.a.len();
    let mut b = k.b.clone();
    let mut s: f64 = k.a.iter().zip(&b).map(|(x, y)| x * y).sum();
    let mut counts = Counts::default();
    let mut values = Vec::new();
    let mut c = vec![0usize; n];
    let record = |s: f64, counts: &mut Counts, values: &mut Vec<f64>| {
        let t = s * k.scale;
        counts.record(t, obs, tol);
        values.push(t);
    };
    record(s, &mut counts, &mut values);
    let mut i = 1;
    let mut steps: u64 = 1;
    while i < n {
        if c[i] < i {
            let j = if i % 2 == 0 { 0 } else { c[i] };
            // Swapping b_j and b_i changes S by (a_i − a_j)(b_j − b_i).
            s += (k.a[i] - k.a[j]) * (b[j] - b[i]);
            b.swap(i, j);
            steps += 1;
            if steps % 4096 == 0 {
                s = k.a.iter().zip(&b).map(|(x, y)| x * y).sum();
                if !progress(steps) {
                    return None;
                }
            }
            record(s, &mut counts, &mut values);
            c[i] += 1;
            i = 1;
        } else {
            c[i] = 0;
            i += 1;
        }
    }
    Some((counts, values))
}

pub fn random_block(
    k: &Kernel,
    obs: f64,
    tol: f64,
    mut stream: Stream,
    len: u64,
) -> (Counts, Vec<f64>) {
    let n = k.b.len();
    let mut b = k.b.clone();
    let mut counts = Counts::default();
    let mut values = Vec::with_capacity(len as usize);
    for _ in 0..len {
        for i in (1..n).rev() {
            let j = stream.below(i as u64 + 1) as usize;
            b.swap(i, j);
        }
        let t = k.a.iter().zip(&b).map(|(x, y)| x * y).sum::<f64>() * k.scale;
        counts.record(t, obs, tol);
        values.push(t);
    }
    (counts, values)
}

pub fn factorial(n: usize) -> u64 {
    (1..=n as u64)
        .try_fold(1u64, |acc, k| acc.checked_mul(k))
        .unwrap_or(u64::MAX)
}

pub fn kernel_r(x: &[f64], y: &[f64]) -> f64 {
    let k = Kernel::new(AssocStatistic::Pearson, x, y);
    k.a.iter().zip(&k.b).map(|(p, q)| p * q).sum::<f64>() * k.scale
}

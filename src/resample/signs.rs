//! Sign-flip permutation test for paired differences (or one sample against a reference
//! value): under no effect each difference is as likely to have either sign, so the null
//! distribution comes from flipping signs. Exact over all 2^n sign patterns in Gray-code
//! order (one sign changes per step, O(1) update for the mean), or Monte Carlo.

use crate::num::stats;
use crate::resample::rng::Stream;
use crate::resample::tally::{sum_tolerance, Counts};

#[derive(Clone, Copy, Debug, PartialEq, Eq, serde::Serialize, serde::Deserialize)]
#[serde(rename_all = "kebab-case")]
pub enum FlipStatistic {
    Mean,
    Median,
    /// Wilcoxon's signed-rank statistic, as the mean signed rank: each difference's rank
    /// among the absolute differences (ties given their mean rank; zero differences left out
    /// of the ranking and counting 0, as Wilcoxon and scipy.stats.wilcoxon's default do),
    /// with the difference's sign. Flipping signs keeps the ranks, so the sign-flip test of
    /// it is the signed-rank test, exact over the mid-ranks when enumerated.
    SignedRank,
}

/// The signed ranks of `d` (see [`FlipStatistic::SignedRank`]).
pub fn signed_ranks(d: &[f64]) -> Vec<f64> {
    let nonzero: Vec<f64> = d.iter().filter(|v| **v != 0.0).map(|v| v.abs()).collect();
    let ranks = stats::ranks(&nonzero);
    let mut r = ranks.into_iter();
    d.iter()
        .map(|&v| {
            if v == 0.0 {
                0.0
            } else {
                v.signum() * r.next().unwrap_or(0.0)
            }
        })
        .collect()
}

/// The matched-pairs rank-biserial correlation (Kerby 2014): the sum of the signed ranks
/// over the sum of their absolute values, from −1 (every difference negative) to 1; NaN when
/// every difference is zero.
pub fn rank_biserial(d: &[f64]) -> f64 {
    let s = signed_ranks(d);
    let total: f64 = s.iter().map(|v| v.abs()).sum();
    if total > 0.0 {
        s.iter().sum::<f64>() / total
    } else {
        f64::NAN
    }
}

impl FlipStatistic {
    pub fn key(self) -> &'static str {
        match self {
            FlipStatistic::Mean => "mean",
            FlipStatistic::Median => "median",
            FlipStatistic::SignedRank => "signed-rank",
        }
    }
    pub const ALL: [FlipStatistic; 3] = [
        FlipStatistic::Mean,
        FlipStatistic::Median,
        FlipStatistic::SignedRank,
    ];
    pub fn from_key(s: &str) -> Option<FlipStatistic> {
        FlipStatistic::ALL.into_iter().find(|x| x.key() == s)
    }
    /// The statistic of the differences `x` (their order may change).
    pub fn of(self, x: &mut [f64]) -> f64 {
        match self {
            FlipStatistic::Mean => stats::mean(x),
            FlipStatistic::Median => stats::median_select(x),
            FlipStatistic::SignedRank => stats::mean(&signed_ranks(x)),
        }
    }
}

pub struct FlipSetup {
    pub statistic: FlipStatistic,
    /// What the kernel flips and averages: the differences, or for the signed-rank
    /// statistic their signed ranks (whose mean it then is).
    pub d: Vec<f64>,
    kernel: FlipStatistic,
    pub observed: f64,
    pub tolerance: f64,
}

impl FlipSetup {
    pub fn new(statistic: FlipStatistic, d: &[f64]) -> FlipSetup {
        let (d, kernel) = match statistic {
            FlipStatistic::SignedRank => (signed_ranks(d), FlipStatistic::Mean),
            s => (d.to_vec(), s),
        };
        let observed = kernel.of(&mut d.clone());
        let scale = d.iter().fold(0.0f64, |m, v| m.max(v.abs()));
        let tolerance = sum_tolerance(scale, d.len(), 1.0 / d.len().max(1) as f64);
        FlipSetup {
            statistic,
            kernel,
            d,
            observed,
            tolerance,
        }
    }

    /// Random sign patterns for one block.
    pub fn random_block(&self, mut stream: Stream, len: u64) -> (Counts, Vec<f64>) {
        let n = self.d.len();
        let mut counts = Counts::default();
        let mut values = Vec::with_capacity(len as usize);
        let mut buf = vec![0.0; n];
        for _ in 0..len {
            let mut bits = 0u64;
            for (i, (b, &v)) in buf.iter_mut().zip(&self.d).enumerate() {
                if i % 64 == 0 {
                    bits = stream.next_u64();
                }
                *b = if bits & 1 == 1 { -v } else { v };
                bits >>= 1;
            }
            let t = self.kernel.of(&mut buf);
            counts.record(t, self.observed, self.tolerance);
            values.push(t);
        }
        (counts, values)
    }

    /// All 2^n sign patterns in binary-reflected Gray-code order; `progress(done)` every
    /// `every` patterns may return false to stop (then None).
    pub fn enumerate(
        &self,
        every: u64,
        progress: &mut dyn FnMut(u64) -> bool,
    ) -> Option<(Counts, Vec<f64>)> {
        let n = self.d.len();
        let total: u64 = 1u64 << n;
        let mut signs = vec![1.0f64; n];
        let mut sum: f64 = self.d.iter().sum();
        let mut counts = Counts::default();
        let mut values = Vec::with_capacity(total as usize);
        let mut buf = vec![0.0; n];
        for k in 0..total {
            if k > 0 {
                // Gray code: the bit that changes between k-1 and k is the lowest set bit of k.
                let i = k.trailing_zeros() as usize;
                signs[i] = -signs[i];
                sum += 2.0 * signs[i] * self.d[i];
                if k % 1024 == 0 {
                    sum = self.d.iter().zip(&signs).map(|(v, s)| v * s).sum();
                }
            }
            let t = match self.kernel {
                FlipStatistic::Mean | FlipStatistic::SignedRank => sum / n as f64,
                FlipStatistic::Median => {
                    for ((b, v), s) in buf.iter_mut().zip(&self.d).zip(&signs) {
                        *b = v * s;
                    }
                    stats::median_select(&mut buf)
                }
            };
            counts.record(t, self.observed, self.tolerance);
            values.push(t);
            if (k + 1) % every == 0 && !progress(k + 1) {
                return None;
            }
        }
        Some((counts, values))
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::resample::rng::Purpose;

    #[test]
    fn enumeration_matches_brute_force() {
        let d = [1.5, -0.3, 2.2, 0.8, -1.1, 0.0, 3.0, 0.4];
        for st in FlipStatistic::ALL {
            let s = FlipSetup::new(st, &d);
            let (c, mut v) = s.enumerate(u64::MAX, &mut |_| true).unwrap();
            assert_eq!(c.total, 256);
            let mut brute = Vec::new();
            for m in 0u32..256 {
                let mut x: Vec<f64> = d
                    .iter()
                    .enumerate()
                    .map(|(i, v)| if m >> i & 1 == 1 { -v } else { *v })
                    .collect();
                brute.push(st.of(&mut x));
            }
            v.sort_by(f64::total_cmp);
            brute.sort_by(f64::total_cmp);
            for (a, b) in v.iter().zip(&brute) {
                assert!((a - b).abs() < 1e-12, "{st:?}");
            }
        }
    }

    #[test]
    fn random_signs_are_reproducible_and_roughly_fair() {
        let d = vec![1.0; 100];
        let s = FlipSetup::new(FlipStatistic::Mean, &d);
        let (c1, v1) = s.random_block(Stream::new(3, Purpose::Permutation, 0), 2000);
        let (c2, v2) = s.random_block(Stream::new(3, Purpose::Permutation, 0), 2000);
        assert_eq!((c1, &v1), (c2, &v2));
        // The mean of ±1 signs over 100 values has SD 0.1; the average over 2000 draws is ~0.
        let m = stats::mean(&v1);
        assert!(m.abs() < 0.01, "{m}");
    }
}

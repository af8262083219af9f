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
}

impl FlipStatistic {
    pub fn key(self) -> &'static str {
        match self {
            FlipStatistic::Mean => "mean",
            FlipStatistic::Median => "median",
        }
    }
    pub fn from_key(s: &str) -> Option<FlipStatistic> {
        [FlipStatistic::Mean, FlipStatistic::Median]
            .into_iter()
            .find(|x| x.key() == s)
    }
    fn of(self, x: &mut [f64]) -> f64 {
        match self {
            FlipStatistic::Mean => stats::mean(x),
            FlipStatistic::Median => stats::median_select(x),
        }
    }
}

pub struct FlipSetup {
    pub statistic: FlipStatistic,
    pub d: Vec<f64>,
    pub observed: f64,
    pub tolerance: f64,
}

impl FlipSetup {
    pub fn new(statistic: FlipStatistic, d: &[f64]) -> FlipSetup {
        let observed = statistic.of(&mut d.to_vec());
        let scale = d.iter().fold(0.0f64, |m, v| m.max(v.abs()));
        FlipSetup {
            statistic,
            d: d.to_vec(),
            observed,
            tolerance: sum_tolerance(scale, d.len(), 1.0 / d.len().max(1) as f64),
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
            let t = self.statistic.of(&mut buf);
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
            let t = match self.statistic {
                FlipStatistic::Mean => sum / n as f64,
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
        for st in [FlipStatistic::Mean, FlipStatistic::Median] {
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

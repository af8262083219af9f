//! Two-group permutation test: random relabelling (Monte Carlo) or full enumeration.
//!
//! The pooled values are sorted once. A relabelling is the set of positions (in sorted
//! order) that form the smaller group. Sum-based statistics (difference in means, Welch t)
//! need only the sum and sum of squares of that set, so a random relabelling draws the
//! smaller group by a partial Fisher–Yates shuffle and sums it, and enumeration walks the
//! subsets in revolving-door order with one value out and one in per step. Order-based
//! statistics (medians, trimmed means) mark the set in a mask and read each group's order
//! statistics in one pass over the sorted pool, with no sorting per relabelling.

use serde::{Deserialize, Serialize};

use crate::base::{Error, ProgressFn, Stage};
use crate::num::stats;
use crate::resample::combin::{choose, RevolvingDoor};
use crate::resample::driver;
#[cfg(test)]
use crate::resample::rng::Purpose;
use crate::resample::rng::{self, Stream};
use crate::resample::tally::{sum_tolerance, Counts, Thresholds, TIE_TOLERANCE};

#[derive(Clone, Copy, Debug, PartialEq, Eq, Serialize, Deserialize)]
#[serde(rename_all = "kebab-case")]
pub enum Statistic {
    MeanDifference,
    MedianDifference,
    TrimmedMeanDifference,
    WelchT,
}

impl Statistic {
    pub const ALL: [Statistic; 4] = [
        Statistic::MeanDifference,
        Statistic::MedianDifference,
        Statistic::TrimmedMeanDifference,
        Statistic::WelchT,
    ];

    pub fn key(self) -> &'static str {
        match self {
            Statistic::MeanDifference => "mean-difference",
            Statistic::MedianDifference => "median-difference",
            Statistic::TrimmedMeanDifference => "trimmed-mean-difference",
            Statistic::WelchT => "welch-t",
        }
    }

    pub fn from_key(s: &str) -> Option<Statistic> {
        Statistic::ALL.into_iter().find(|x| x.key() == s)
    }

    pub fn label(self) -> &'static str {
        match self {
            Statistic::MeanDifference => "difference in means",
            Statistic::MedianDifference => "difference in medians",
            Statistic::TrimmedMeanDifference => "difference in 20% trimmed means",
            Statistic::WelchT => "Welch t statistic",
        }
    }

    /// The effect the confidence interval is for. For the Welch t statistic (a test
    /// statistic, not an effect) the interval is for the difference in means.
    pub fn effect(self) -> Statistic {
        match self {
            Statistic::WelchT => Statistic::MeanDifference,
            s => s,
        }
    }
}

/// Everything a relabelling needs, prepared once.
#[derive(Clone, Debug)]
pub struct Setup {
    pub statistic: Statistic,
    /// Pooled values, centred at the pooled mean (all statistics here are shift-invariant;
    /// centring keeps sums of squares accurate), sorted ascending.
    pub pool: Vec<f64>,
    pub n1: usize,
    pub n2: usize,
    /// Size of the smaller group, which is the one drawn or enumerated.
    pub k: usize,
    /// Whether the drawn set is the first group (n1 <= n2) or the second.
    pub drawn_is_first: bool,
    total: f64,
    total_sq: f64,
    /// Positions (in `pool`) of the observed first group... stored as the drawn group.
    pub observed_set: Vec<usize>,
    /// The statistic of the observed labelling, computed by the same kernel.
    pub observed: f64,
    /// Absolute tolerance for ties.
    pub tolerance: f64,
}

impl Setup {
    pub fn new(statistic: Statistic, a: &[f64], b: &[f64]) -> Setup {
        let (n1, n2) = (a.len(), b.len());
        let n = n1 + n2;
        let centre = (a.iter().sum::<f64>() + b.iter().sum::<f64>()) / n as f64;
        // Tag each value with its group so the observed set can be found after sorting.
        let mut tagged: Vec<(f64, bool)> = a
            .iter()
            .map(|&v| (v - centre, true))
            .chain(b.iter().map(|&v| (v - centre, false)))
            .collect();
        tagged.sort_by(|x, y| x.0.total_cmp(&y.0));
        let pool: Vec<f64> = tagged.iter().map(|t| t.0).collect();
        let drawn_is_first = n1 <= n2;
        let k = n1.min(n2);
        let observed_set: Vec<usize> = tagged
            .iter()
            .enumerate()
            .filter(|(_, t)| t.1 == drawn_is_first)
            .map(|(i, _)| i)
            .collect();
        let total = pool.iter().sum();
        let total_sq = pool.iter().map(|v| v * v).sum();
        let spread = pool.iter().fold(0.0f64, |m, v| m.max(v.abs()));
        let mut s = Setup {
            statistic,
            pool,
            n1,
            n2,
            k,
            drawn_is_first,
            total,
            total_sq,
            observed_set,
            observed: 0.0,
            tolerance: 0.0,
        };
        let mut mask = vec![false; n];
        for &i in &s.observed_set {
            mask[i] = true;
        }
        s.observed = match statistic {
            Statistic::MeanDifference | Statistic::WelchT => {
                let (sum, sq) = s.observed_set.iter().fold((0.0, 0.0), |(x, y), &i| {
                    (x + s.pool[i], y + s.pool[i] * s.pool[i])
                });
                s.stat_from_sums(sum, sq)
            }
            _ => s.stat_from_mask(&mask),
        };
        s.tolerance = match statistic {
            Statistic::WelchT => TIE_TOLERANCE * 1.0f64.max(s.observed.abs()),
            _ => sum_tolerance(spread, k, 1.0 / n1 as f64 + 1.0 / n2 as f64),
        };
        s
    }

    fn is_sum_based(&self) -> bool {
        matches!(
            self.statistic,
            Statistic::MeanDifference | Statistic::WelchT
        )
    }

    /// Statistic from the sum and sum of squares of the drawn set.
    #[inline]
    fn stat_from_sums(&self, drawn_sum: f64, drawn_sq: f64) -> f64 {
        let (s1, q1) = if self.drawn_is_first {
            (drawn_sum, drawn_sq)
        } else {
            (self.total - drawn_sum, self.total_sq - drawn_sq)
        };
        let (n1, n2) = (self.n1 as f64, self.n2 as f64);
        let m1 = s1 / n1;
        let m2 = (self.total - s1) / n2;
        match self.statistic {
            Statistic::MeanDifference => m1 - m2,
            _ => {
                let q2 = self.total_sq - q1;
                let v1 = ((q1 - s1 * m1) / (n1 - 1.0)).max(0.0);
                let v2 = ((q2 - (self.total - s1) * m2) / (n2 - 1.0)).max(0.0);
                welch_t_from(m1 - m2, v1 / n1 + v2 / n2)
            }
        }
    }

    /// The mean-difference relabellings, with the same arithmetic as [`Self::stat_from_sums`]
    /// (so the same numbers, to the bit) and its branches taken outside the loop.
    #[inline(always)]
    fn mean_difference_loop<const DRAWN_FIRST: bool>(
        &self,
        vals: &mut [f64],
        stream: &mut Stream,
        counts: &mut Counts,
        values: &mut [f64],
    ) {
        let (n, k) = (vals.len(), self.k);
        let (n1, n2, total) = (self.n1 as f64, self.n2 as f64, self.total);
        let th = Thresholds::new(self.observed, self.tolerance);
        for slot in values.iter_mut() {
            let mut s = 0.0;
            for i in 0..k {
                let j = i + stream.below((n - i) as u64) as usize;
                vals.swap(i, j);
                s += vals[i];
            }
            let s1 = if DRAWN_FIRST { s } else { total - s };
            let t = s1 / n1 - (total - s1) / n2;
            counts.record_at(t, &th);
            *slot = t;
        }
    }

    /// Statistic from a mask over the sorted pool marking the drawn set.
    fn stat_from_mask(&self, drawn: &[bool]) -> f64 {
        let (n1, n2) = (self.n1, self.n2);
        let (want1, want2) = match self.statistic {
            Statistic::MedianDifference => ((n1 - 1) / 2..=n1 / 2, (n2 - 1) / 2..=n2 / 2),
            _ => {
                let (g1, g2) = (stats::trim_count(n1), stats::trim_count(n2));
                (g1..=n1 - g1 - 1, g2..=n2 - g2 - 1)
            }
        };
        let (mut r1, mut r2) = (0usize, 0usize);
        let (mut acc1, mut acc2) = (0.0, 0.0);
        for (i, &v) in self.pool.iter().enumerate() {
            let first = drawn[i] == self.drawn_is_first;
            if first {
                if want1.contains(&r1) {
                    acc1 += v;
                }
                r1 += 1;
            } else {
                if want2.contains(&r2) {
                    acc2 += v;
                }
                r2 += 1;
            }
        }
        let c1 = (want1.end() - want1.start() + 1) as f64;
        let c2 = (want2.end() - want2.start() + 1) as f64;
        acc1 / c1 - acc2 / c2
    }

    /// Runs one block of random relabellings with the block's stream.
    pub fn random_block(&self, mut stream: Stream, len: u64) -> (Counts, Vec<f64>) {
        let n = self.pool.len();
        let k = self.k;
        let mut counts = Counts::default();
        let mut values = Vec::with_capacity(len as usize);
        let (obs, tol) = (self.observed, self.tolerance);
        if self.is_sum_based() {
            // Shuffle the values themselves and sum the drawn part as it is drawn.
            let mut vals = self.pool.clone();
            let vals = &mut vals[..n];
            if self.statistic == Statistic::WelchT {
                for _ in 0..len {
                    let (mut s, mut q) = (0.0, 0.0);
                    for i in 0..k {
                        let j = i + stream.below((n - i) as u64) as usize;
                        vals.swap(i, j);
                        let v = vals[i];
                        s += v;
                        q += v * v;
                    }
                    let t = self.stat_from_sums(s, q);
                    counts.record(t, obs, tol);
                    values.push(t);
                }
            } else {
                values.resize(len as usize, 0.0);
                if self.drawn_is_first {
                    self.mean_difference_loop::<true>(vals, &mut stream, &mut counts, &mut values);
                } else {
                    self.mean_difference_loop::<false>(vals, &mut stream, &mut counts, &mut values);
                }
            }
        } else {
            let mut perm: Vec<usize> = (0..n).collect();
            let mut mask = vec![false; n];
            for _ in 0..len {
                // Partial Fisher–Yates: the first k entries become a uniform random k-subset.
                for i in 0..k {
                    let j = i + stream.below((n - i) as u64) as usize;
                    perm.swap(i, j);
                    mask[perm[i]] = true;
                }
                let t = self.stat_from_mask(&mask);
                for &i in &perm[..k] {
                    mask[i] = false;
                }
                counts.record(t, obs, tol);
                values.push(t);
            }
        }
        (counts, values)
    }

    /// Enumerates every relabelling (C(n, k) of them). `progress(done)` is called every
    /// `every` relabellings and may return false to stop early (then None is returned).
    pub fn enumerate(
        &self,
        every: u64,
        progress: &mut dyn FnMut(u64) -> bool,
    ) -> Option<(Counts, Vec<f64>)> {
        let n = self.pool.len();
        let mut door = RevolvingDoor::new(n, self.k);
        let mut counts = Counts::default();
        let mut values = Vec::new();
        let (obs, tol) = (self.observed, self.tolerance);
        let mut mask = vec![false; n];
        let (mut s, mut q) = (0.0, 0.0);
        let resum = |set: &[usize]| {
            set.iter().fold((0.0, 0.0), |(x, y), &i| {
                (x + self.pool[i], y + self.pool[i] * self.pool[i])
            })
        };
        if self.is_sum_based() {
            (s, q) = resum(door.current());
        } else {
            for &i in door.current() {
                mask[i] = true;
            }
        }
        let mut step: u64 = 0;
        loop {
            let t = if self.is_sum_based() {
                self.stat_from_sums(s, q)
            } else {
                self.stat_from_mask(&mask)
            };
            counts.record(t, obs, tol);
            values.push(t);
            step += 1;
            if step % every == 0 && !progress(step) {
                return None;
            }
            match door.advance() {
                None => break,
                Some((out, inn)) => {
                    if self.is_sum_based() {
                        if step % 1024 == 0 {
                            // Re-sum now and then so rounding cannot drift.
                            (s, q) = resum(door.current());
                        } else {
                            let (vo, vi) = (self.pool[out], self.pool[inn]);
                            s += vi - vo;
                            q += vi * vi - vo * vo;
                        }
                    } else {
                        mask[out] = false;
                        mask[inn] = true;
                    }
                }
            }
        }
        Some((counts, values))
    }
}

/// Welch t from a difference in means and the squared standard error; a zero standard
/// error gives 0 for no difference and an infinite t otherwise.
pub fn welch_t_from(diff: f64, se2: f64) -> f64 {
    if se2 > 0.0 {
        diff / se2.sqrt()
    } else if diff == 0.0 {
        0.0
    } else {
        diff.signum() * f64::INFINITY
    }
}

/// Direct (non-kernel) value of a statistic, for display and the bootstrap.
pub fn statistic_value(statistic: Statistic, a: &[f64], b: &[f64]) -> f64 {
    match statistic {
        Statistic::MeanDifference => stats::mean(a) - stats::mean(b),
        Statistic::MedianDifference => stats::median(a) - stats::median(b),
        Statistic::TrimmedMeanDifference => stats::trimmed_mean(a) - stats::trimmed_mean(b),
        Statistic::WelchT => {
            let se2 = stats::variance(a) / a.len() as f64 + stats::variance(b) / b.len() as f64;
            welch_t_from(stats::mean(a) - stats::mean(b), se2)
        }
    }
}

/// Runs random relabelling blocks `blocks` (a range of block indices) and merges them in
/// order. Any partition of the blocks into ranges, merged in order, gives the same result.
pub fn random_blocks(
    setup: &Setup,
    seed: u64,
    total: u64,
    blocks: std::ops::Range<u64>,
    progress: ProgressFn,
) -> Result<(Counts, Vec<f64>), Error> {
    driver::random_range(
        seed,
        total,
        blocks,
        None,
        Stage::Relabelling,
        progress,
        &|s, len| setup.random_block(s, len),
    )
    .map(|(c, v, _)| (c, v))
}

/// Every split when there are at most `exact_limit`, otherwise `resamples` random ones drawn
/// from `seed`'s streams (until `stop`, if given).
pub fn null_distribution(
    setup: &Setup,
    exact_limit: u64,
    resamples: u64,
    seed: u64,
    stop: Option<driver::Stop>,
    progress: ProgressFn,
) -> Result<driver::Null, Error> {
    let n = (setup.n1 + setup.n2) as u64;
    driver::Relabelling {
        count: choose(n, setup.k as u64),
        exact_limit,
        resamples,
        seed,
        stage: Stage::Relabelling,
        stop,
    }
    .run(
        progress,
        &mut |cb| setup.enumerate(rng::BLOCK, cb),
        &|s, len| setup.random_block(s, len),
    )
}

#[cfg(test)]
mod tests {
    use super::*;

    const A: [f64; 5] = [3.1, 4.7, 2.2, 5.9, 4.0];
    const B: [f64; 6] = [1.8, 2.9, 3.3, 2.1, 0.7, 2.6];

    #[test]
    fn kernel_observed_matches_direct_value() {
        for st in Statistic::ALL {
            let s = Setup::new(st, &A, &B);
            let direct = statistic_value(st, &A, &B);
            assert!(
                (s.observed - direct).abs() < 1e-12,
                "{st:?} {} {}",
                s.observed,
                direct
            );
            // Drawn set the other way round.
            let s2 = Setup::new(st, &B, &A);
            assert!((s2.observed + direct).abs() < 1e-12, "{st:?}");
        }
    }

    #[test]
    fn enumeration_counts_every_split_once() {
        // The enumerated statistics are exactly the statistics of all C(11, 5) splits,
        // computed here by brute force over bit masks.
        for st in Statistic::ALL {
            let s = Setup::new(st, &A, &B);
            let (counts, mut values) = s.enumerate(u64::MAX, &mut |_| true).unwrap();
            assert_eq!(counts.total, 462);
            let pooled: Vec<f64> = A.iter().chain(B.iter()).copied().collect();
            let mut brute = Vec::new();
            for m in 0u32..(1 << 11) {
                if m.count_ones() != 5 {
                    continue;
                }
                let g1: Vec<f64> = (0..11)
                    .filter(|i| m >> i & 1 == 1)
                    .map(|i| pooled[i])
                    .collect();
                let g2: Vec<f64> = (0..11)
                    .filter(|i| m >> i & 1 == 0)
                    .map(|i| pooled[i])
                    .collect();
                brute.push(statistic_value(st, &g1, &g2));
            }
            values.sort_by(f64::total_cmp);
            brute.sort_by(f64::total_cmp);
            for (x, y) in values.iter().zip(&brute) {
                assert!((x - y).abs() < 1e-9, "{st:?}: {x} vs {y}");
            }
        }
    }

    #[test]
    fn random_relabelling_is_reproducible_per_block() {
        let s = Setup::new(Statistic::MedianDifference, &A, &B);
        let block = |b| Stream::new(42, Purpose::Permutation, b);
        let (c1, v1) = s.random_block(block(3), 500);
        let (c2, v2) = s.random_block(block(3), 500);
        assert_eq!(c1, c2);
        assert_eq!(v1, v2);
        let (_, v3) = s.random_block(block(4), 500);
        assert_ne!(v1, v3);
    }
}

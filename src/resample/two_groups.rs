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
use crate::resample::effects::mad_sorted;
pub use crate::resample::effects::{
    joint_ranks, ks_distance, log_ratio, log_sd_ratio_from, mad, superiority, welch_t_from,
};
use crate::resample::large::{self, Splitter, Subset};
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
    /// The Wilcoxon–Mann–Whitney rank-sum statistic, as the difference in mean ranks (ranks
    /// of the pooled values, ties given their mid-rank): a relabelling test of it is the
    /// rank-sum test, exact over the mid-ranks when enumerated.
    RankSum,
    /// The two-sample Kolmogorov–Smirnov distance: the largest gap between the groups'
    /// empirical distribution functions, read after each run of tied values. It has no
    /// sign, so it answers a two-sided question only.
    KsDistance,
    /// The log of the ratio of the groups' standard deviations, a statistic of spread. The
    /// two-group design relabels the groups aligned at their medians (each value's deviation
    /// from its group's median), so that a difference in location does not enter the test.
    LogSdRatio,
    /// The log of the ratio of the groups' median absolute deviations (from each group's
    /// median; the 1.4826 scale factor cancels): a statistic of spread that outliers move
    /// little, relabelled like [`Statistic::LogSdRatio`] on the groups aligned at their
    /// medians.
    LogMadRatio,
}

impl Statistic {
    pub const ALL: [Statistic; 8] = [
        Statistic::MeanDifference,
        Statistic::MedianDifference,
        Statistic::TrimmedMeanDifference,
        Statistic::WelchT,
        Statistic::RankSum,
        Statistic::KsDistance,
        Statistic::LogSdRatio,
        Statistic::LogMadRatio,
    ];

    pub fn key(self) -> &'static str {
        match self {
            Statistic::MeanDifference => "mean-difference",
            Statistic::MedianDifference => "median-difference",
            Statistic::TrimmedMeanDifference => "trimmed-mean-difference",
            Statistic::WelchT => "welch-t",
            Statistic::RankSum => "rank-sum",
            Statistic::KsDistance => "ks-distance",
            Statistic::LogSdRatio => "log-sd-ratio",
            Statistic::LogMadRatio => "log-mad-ratio",
        }
    }

    /// Whether relabelling it needs the sums of squares as well as the sums.
    pub fn needs_squares(self) -> bool {
        matches!(self, Statistic::WelchT | Statistic::LogSdRatio)
    }

    /// Whether the statistic measures spread (tested on the groups aligned at their
    /// medians).
    pub fn on_spread(self) -> bool {
        matches!(self, Statistic::LogSdRatio | Statistic::LogMadRatio)
    }

    /// Whether the statistic is computed from the pooled values' ranks.
    pub fn on_ranks(self) -> bool {
        self == Statistic::RankSum
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
            Statistic::RankSum => "Wilcoxon–Mann–Whitney difference in mean ranks",
            Statistic::KsDistance => "Kolmogorov–Smirnov distance",
            Statistic::LogSdRatio => "log ratio of the SDs",
            Statistic::LogMadRatio => "log ratio of the median absolute deviations",
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
    /// The streaming kernel for large pools (kernel generation 2), when it is used.
    large: Option<Large>,
}

/// What the streaming relabelling of a large pool needs: the splitter and, for the trimmed
/// mean, the sum of the pooled values of every word of 64.
#[derive(Clone, Debug)]
struct Large {
    split: Splitter,
    totals: Vec<f64>,
}

impl Setup {
    /// The setup a run of kernel generation `kernels` uses: from generation 2 on, random
    /// relabellings of a pool of at least [`large::LARGE`] values (too many splits to list
    /// within `exact_limit`) stream through it ([`large`]); otherwise as [`Setup::new`].
    pub fn for_run(
        statistic: Statistic,
        a: &[f64],
        b: &[f64],
        kernels: u32,
        exact_limit: u64,
    ) -> Setup {
        let n = a.len() + b.len();
        let k = a.len().min(b.len()) as u64;
        if kernels >= 2 && n >= large::LARGE && choose(n as u64, k) > exact_limit {
            Setup::streaming(statistic, a, b)
        } else {
            Setup::new(statistic, a, b)
        }
    }

    /// A large pool for the streaming kernel: each group is centred and sorted on its own and
    /// the two merged (the pool in sorted order, the observed groups as a bit set), so no
    /// tagged copy or list of positions is made.
    fn streaming(statistic: Statistic, a: &[f64], b: &[f64]) -> Setup {
        if statistic.on_ranks() {
            let (ra, rb) = joint_ranks(a, b);
            return Setup::streaming_values(statistic, &ra, &rb);
        }
        Setup::streaming_values(statistic, a, b)
    }

    fn streaming_values(statistic: Statistic, a: &[f64], b: &[f64]) -> Setup {
        let (n1, n2) = (a.len(), b.len());
        let n = n1 + n2;
        let centre = (a.iter().sum::<f64>() + b.iter().sum::<f64>()) / n as f64;
        let prep = |x: &[f64]| {
            let mut v: Vec<f64> = x.iter().map(|v| v - centre).collect();
            v.sort_by(f64::total_cmp);
            v
        };
        let (sa, sb) = (prep(a), prep(b));
        let drawn_is_first = n1 <= n2;
        let k = n1.min(n2);
        let mut pool = Vec::with_capacity(n);
        let mut first = Vec::with_capacity(n.div_ceil(64));
        let (mut i, mut j) = (0, 0);
        let mut word = 0u64;
        while i < n1 || j < n2 {
            let take_a = j >= n2 || (i < n1 && sa[i].total_cmp(&sb[j]).is_le());
            let pos = pool.len();
            if take_a {
                pool.push(sa[i]);
                i += 1;
            } else {
                pool.push(sb[j]);
                j += 1;
            }
            word |= u64::from(take_a == drawn_is_first) << (pos % 64);
            if pos % 64 == 63 {
                first.push(word);
                word = 0;
            }
        }
        if n % 64 != 0 {
            first.push(word);
        }
        drop((sa, sb));
        let total = pool.iter().sum();
        let total_sq = pool.iter().map(|v| v * v).sum();
        let spread = pool.iter().fold(0.0f64, |m, v| m.max(v.abs()));
        let totals = pool.chunks(64).map(|c| c.iter().sum()).collect();
        let mut s = Setup {
            statistic,
            pool,
            n1,
            n2,
            k,
            drawn_is_first,
            total,
            total_sq,
            observed_set: Vec::new(),
            observed: 0.0,
            tolerance: 0.0,
            large: Some(Large {
                split: Splitter::new(n, k),
                totals,
            }),
        };
        let observed = Subset::from_members(
            &s.pool,
            |p| (first[p / 64] >> (p % 64)) & 1 == 1,
            statistic.needs_squares(),
        );
        s.observed = s.stat_from_subset(&observed);
        // Sums here run over every value of the pool (members and not), in words.
        s.tolerance = match statistic {
            Statistic::WelchT | Statistic::LogSdRatio | Statistic::LogMadRatio => {
                TIE_TOLERANCE * 1.0f64.max(s.observed.abs())
            }
            // Distinct distances differ by at least 1/(n1 n2).
            Statistic::KsDistance => 0.25 / (n1 as f64 * n2 as f64),
            _ => sum_tolerance(spread, n, 1.0 / n1 as f64 + 1.0 / n2 as f64),
        };
        s
    }

    /// The statistic of a relabelling held as a [`Subset`] of the pool (the drawn group).
    fn stat_from_subset(&self, sub: &Subset) -> f64 {
        let Some(lg) = &self.large else {
            return f64::NAN;
        };
        let n = self.pool.len();
        let (n1, n2) = (self.n1, self.n2);
        // Group 1 is the members when the drawn group is the first.
        let first = self.drawn_is_first;
        match self.statistic {
            Statistic::MeanDifference
            | Statistic::WelchT
            | Statistic::RankSum
            | Statistic::LogSdRatio => self.stat_from_sums(sub.sum(), sub.sum_sq()),
            Statistic::MedianDifference => {
                let med = |size: usize, members: bool| {
                    let (lo, hi) = ((size - 1) / 2, size / 2);
                    let v = self.pool[sub.select(n, lo, members)];
                    if hi == lo {
                        v
                    } else {
                        (v + self.pool[sub.select(n, hi, members)]) / 2.0
                    }
                };
                med(n1, first) - med(n2, !first)
            }
            Statistic::TrimmedMeanDifference => {
                let tm = |size: usize, members: bool| {
                    let g = stats::trim_count(size);
                    sub.rank_sum(&self.pool, &lg.totals, g, size - g, members)
                        / (size - 2 * g) as f64
                };
                tm(n1, first) - tm(n2, !first)
            }
            Statistic::KsDistance => self.ks_from_mask(&sub.words),
            Statistic::LogMadRatio => self.mad_from_mask(&sub.words),
        }
    }

    /// The log MAD ratio of the split marked by the bit set `drawn` over the sorted pool:
    /// each group read out in sorted order, its median, then the median of the absolute
    /// deviations by selection.
    fn mad_from_mask(&self, drawn: &[u64]) -> f64 {
        // The two groups are read into buffers kept per thread, so a relabelling allocates
        // nothing once they have grown.
        thread_local! {
            static GROUPS: std::cell::RefCell<(Vec<f64>, Vec<f64>)> =
                const { std::cell::RefCell::new((Vec::new(), Vec::new())) };
        }
        let (m_d, m_o) = GROUPS.with(|g| {
            let (d, o) = &mut *g.borrow_mut();
            d.clear();
            o.clear();
            for (i, &v) in self.pool.iter().enumerate() {
                if (drawn[i / 64] >> (i % 64)) & 1 == 1 {
                    d.push(v);
                } else {
                    o.push(v);
                }
            }
            (mad_sorted(d), mad_sorted(o))
        });
        if self.drawn_is_first {
            log_ratio(m_d, m_o)
        } else {
            log_ratio(m_o, m_d)
        }
    }

    /// The Kolmogorov–Smirnov distance of the split marked by the bit set `drawn` over the
    /// sorted pool: one pass, the gap read where the next value differs.
    fn ks_from_mask(&self, drawn: &[u64]) -> f64 {
        let n = self.pool.len();
        let (nd, no) = if self.drawn_is_first {
            (self.n1 as f64, self.n2 as f64)
        } else {
            (self.n2 as f64, self.n1 as f64)
        };
        let (mut cd, mut co) = (0.0f64, 0.0f64);
        let mut gap = 0.0f64;
        for i in 0..n {
            if (drawn[i / 64] >> (i % 64)) & 1 == 1 {
                cd += 1.0;
            } else {
                co += 1.0;
            }
            if i + 1 == n || self.pool[i + 1] != self.pool[i] {
                gap = gap.max((cd / nd - co / no).abs());
            }
        }
        gap
    }

    /// Whether random relabellings stream through the pool (kernel generation 2, large).
    pub fn is_streaming(&self) -> bool {
        self.large.is_some()
    }

    pub fn new(statistic: Statistic, a: &[f64], b: &[f64]) -> Setup {
        if statistic.on_ranks() {
            let (ra, rb) = joint_ranks(a, b);
            return Setup::of_values(statistic, &ra, &rb);
        }
        Setup::of_values(statistic, a, b)
    }

    fn of_values(statistic: Statistic, a: &[f64], b: &[f64]) -> Setup {
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
            large: None,
        };
        let mut mask = vec![0u64; n.div_ceil(64)];
        for &i in &s.observed_set {
            mask[i / 64] |= 1 << (i % 64);
        }
        s.observed = match statistic {
            Statistic::MeanDifference
            | Statistic::WelchT
            | Statistic::RankSum
            | Statistic::LogSdRatio => {
                let (sum, sq) = s.observed_set.iter().fold((0.0, 0.0), |(x, y), &i| {
                    (x + s.pool[i], y + s.pool[i] * s.pool[i])
                });
                s.stat_from_sums(sum, sq)
            }
            _ => s.stat_from_mask(&mask),
        };
        s.tolerance = match statistic {
            Statistic::WelchT | Statistic::LogSdRatio | Statistic::LogMadRatio => {
                TIE_TOLERANCE * 1.0f64.max(s.observed.abs())
            }
            Statistic::KsDistance => 0.25 / (n1 as f64 * n2 as f64),
            _ => sum_tolerance(spread, k, 1.0 / n1 as f64 + 1.0 / n2 as f64),
        };
        s
    }

    fn is_sum_based(&self) -> bool {
        matches!(
            self.statistic,
            Statistic::MeanDifference
                | Statistic::WelchT
                | Statistic::RankSum
                | Statistic::LogSdRatio
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
            Statistic::MeanDifference | Statistic::RankSum => m1 - m2,
            _ => {
                let q2 = self.total_sq - q1;
                let v1 = ((q1 - s1 * m1) / (n1 - 1.0)).max(0.0);
                let v2 = ((q2 - (self.total - s1) * m2) / (n2 - 1.0)).max(0.0);
                if self.statistic == Statistic::LogSdRatio {
                    log_sd_ratio_from(v1, v2)
                } else {
                    welch_t_from(m1 - m2, v1 / n1 + v2 / n2)
                }
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

    /// Statistic from a bit set over the sorted pool marking the drawn set (bit i of word
    /// i / 64): each group's middle values (median) or values between the trimmed ends
    /// (trimmed mean), added from zero in rank order, the words' bit counts skipping whole
    /// words outside the ranks wanted.
    fn stat_from_mask(&self, drawn: &[u64]) -> f64 {
        match self.statistic {
            Statistic::KsDistance => return self.ks_from_mask(drawn),
            Statistic::LogMadRatio => return self.mad_from_mask(drawn),
            _ => {}
        }
        let (n1, n2) = (self.n1, self.n2);
        let ((lo1, hi1), (lo2, hi2)) = match self.statistic {
            Statistic::MedianDifference => (((n1 - 1) / 2, n1 / 2), ((n2 - 1) / 2, n2 / 2)),
            _ => {
                let (g1, g2) = (stats::trim_count(n1), stats::trim_count(n2));
                ((g1, n1 - g1 - 1), (g2, n2 - g2 - 1))
            }
        };
        let acc1 = self.rank_sum(drawn, lo1, hi1 + 1, self.drawn_is_first);
        let acc2 = self.rank_sum(drawn, lo2, hi2 + 1, !self.drawn_is_first);
        let c1 = (hi1 - lo1 + 1) as f64;
        let c2 = (hi2 - lo2 + 1) as f64;
        acc1 / c1 - acc2 / c2
    }

    /// The sum, from zero in rank order, of the values of ranks `lo..hi` among the members
    /// of the bit set `drawn` (or among the others).
    fn rank_sum(&self, drawn: &[u64], lo: usize, hi: usize, members: bool) -> f64 {
        let n = self.pool.len();
        let mut acc = 0.0;
        let mut before = 0usize;
        for (wi, &w) in drawn.iter().enumerate() {
            if before >= hi {
                break;
            }
            let valid = if n - wi * 64 >= 64 {
                !0
            } else {
                (1u64 << (n - wi * 64)) - 1
            };
            let mut bits = if members { w } else { !w & valid };
            let c = bits.count_ones() as usize;
            if before + c <= lo {
                before += c;
                continue;
            }
            let mut r = before;
            while bits != 0 && r < hi {
                if r >= lo {
                    acc += self.pool[wi * 64 + bits.trailing_zeros() as usize];
                }
                r += 1;
                bits &= bits - 1;
            }
            before += c;
        }
        acc
    }

    /// A block of random relabellings of a large pool by the streaming kernel.
    #[inline(never)]
    fn streaming_block(&self, lg: &Large, mut stream: Stream, len: u64) -> (Counts, Vec<f64>) {
        let mut counts = Counts::default();
        let mut values = Vec::with_capacity(len as usize);
        let mut sub = Subset::new(self.pool.len(), self.statistic.needs_squares());
        for _ in 0..len {
            lg.split.draw(&self.pool, &mut stream, &mut sub);
            let t = self.stat_from_subset(&sub);
            counts.record(t, self.observed, self.tolerance);
            values.push(t);
        }
        (counts, values)
    }

    /// Runs one block of random relabellings with the block's stream.
    pub fn random_block(&self, mut stream: Stream, len: u64) -> (Counts, Vec<f64>) {
        let n = self.pool.len();
        let k = self.k;
        let mut counts = Counts::default();
        let mut values = Vec::with_capacity(len as usize);
        let (obs, tol) = (self.observed, self.tolerance);
        if let Some(lg) = &self.large {
            return self.streaming_block(lg, stream, len);
        }
        if self.is_sum_based() {
            // Shuffle the values themselves and sum the drawn part as it is drawn.
            let mut vals = self.pool.clone();
            let vals = &mut vals[..n];
            if self.statistic.needs_squares() {
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
            return self.order_block(stream, len);
        }
        (counts, values)
    }

    /// A block of random relabellings for an order statistic (median, trimmed mean): the
    /// drawn set marked in a bit set over the sorted pool.
    #[inline(never)]
    fn order_block(&self, mut stream: Stream, len: u64) -> (Counts, Vec<f64>) {
        let (n, k) = (self.pool.len(), self.k);
        let mut counts = Counts::default();
        let mut values = Vec::with_capacity(len as usize);
        let mut perm: Vec<usize> = (0..n).collect();
        let mut mask = vec![0u64; n.div_ceil(64)];
        for _ in 0..len {
            // Partial Fisher–Yates: the first k entries become a uniform random k-subset.
            for i in 0..k {
                let j = i + stream.below((n - i) as u64) as usize;
                perm.swap(i, j);
                mask[perm[i] / 64] |= 1 << (perm[i] % 64);
            }
            let t = self.stat_from_mask(&mask);
            mask.fill(0);
            counts.record(t, self.observed, self.tolerance);
            values.push(t);
        }
        (counts, values)
    }

    /// [`Setup::enumerate`] for the difference in means: the same sums, statistics and
    /// comparisons (so the same numbers, to the bit), with the statistic's branches taken
    /// outside the loop, the list made at its final size and the checks counted down.
    fn enumerate_means<const DRAWN_FIRST: bool>(
        &self,
        every: u64,
        progress: &mut dyn FnMut(u64) -> bool,
    ) -> Option<(Counts, Vec<f64>)> {
        let n = self.pool.len();
        let mut door = RevolvingDoor::new(n, self.k);
        let mut counts = Counts::default();
        let size = choose(n as u64, self.k as u64);
        let mut values = Vec::with_capacity(size.min(driver::MAX_KEPT as u64 * 16) as usize);
        let th = Thresholds::new(self.observed, self.tolerance);
        let (n1, n2, total) = (self.n1 as f64, self.n2 as f64, self.total);
        let pool = &self.pool[..];
        let resum = |set: &[usize]| set.iter().fold(0.0, |x, &i| x + pool[i]);
        let mut s = resum(door.current());
        let mut step: u64 = 0;
        let (mut to_progress, mut to_resum) = (every, 1024u32);
        loop {
            let s1 = if DRAWN_FIRST { s } else { total - s };
            let t = s1 / n1 - (total - s1) / n2;
            counts.record_at(t, &th);
            values.push(t);
            step += 1;
            to_progress -= 1;
            if to_progress == 0 {
                if !progress(step) {
                    return None;
                }
                to_progress = every;
            }
            match door.advance() {
                None => break,
                Some((out, inn)) => {
                    to_resum -= 1;
                    if to_resum == 0 {
                        // Re-sum now and then so rounding cannot drift.
                        s = resum(door.current());
                        to_resum = 1024;
                    } else {
                        s += pool[inn] - pool[out];
                    }
                }
            }
        }
        Some((counts, values))
    }

    /// Enumerates every relabelling (C(n, k) of them). `progress(done)` is called every
    /// `every` relabellings and may return false to stop early (then None is returned).
    pub fn enumerate(
        &self,
        every: u64,
        progress: &mut dyn FnMut(u64) -> bool,
    ) -> Option<(Counts, Vec<f64>)> {
        if matches!(
            self.statistic,
            Statistic::MeanDifference | Statistic::RankSum
        ) {
            return if self.drawn_is_first {
                self.enumerate_means::<true>(every, progress)
            } else {
                self.enumerate_means::<false>(every, progress)
            };
        }
        let n = self.pool.len();
        let mut door = RevolvingDoor::new(n, self.k);
        let mut counts = Counts::default();
        let mut values = Vec::new();
        let (obs, tol) = (self.observed, self.tolerance);
        let mut mask = vec![0u64; n.div_ceil(64)];
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
                mask[i / 64] |= 1 << (i % 64);
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
                        mask[out / 64] &= !(1 << (out % 64));
                        mask[inn / 64] |= 1 << (inn % 64);
                    }
                }
            }
        }
        Some((counts, values))
    }
}

/// Direct (non-kernel) value of a statistic, for display and the bootstrap.
pub fn statistic_value(statistic: Statistic, a: &[f64], b: &[f64]) -> f64 {
    match statistic {
        Statistic::RankSum => {
            let (ra, rb) = joint_ranks(a, b);
            stats::mean(&ra) - stats::mean(&rb)
        }
        Statistic::MeanDifference => stats::mean(a) - stats::mean(b),
        Statistic::MedianDifference => stats::median(a) - stats::median(b),
        Statistic::TrimmedMeanDifference => stats::trimmed_mean(a) - stats::trimmed_mean(b),
        Statistic::WelchT => {
            let se2 = stats::variance(a) / a.len() as f64 + stats::variance(b) / b.len() as f64;
            welch_t_from(stats::mean(a) - stats::mean(b), se2)
        }
        Statistic::KsDistance => ks_distance(a, b),
        Statistic::LogSdRatio => log_sd_ratio_from(stats::variance(a), stats::variance(b)),
        Statistic::LogMadRatio => log_ratio(mad(a), mad(b)),
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
        block: if setup.is_streaming() {
            rng::LARGE_BLOCK
        } else {
            rng::BLOCK
        },
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
            // Drawn set the other way round (the distance has no sign).
            let s2 = Setup::new(st, &B, &A);
            let want = if st == Statistic::KsDistance {
                direct
            } else {
                -direct
            };
            assert!((s2.observed - want).abs() < 1e-12, "{st:?}");
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

    /// The streaming kernel's statistic of each relabelling equals the statistic computed
    /// directly from the two groups the relabelling forms, for every statistic, with the
    /// groups of unequal size both ways round; the observed one equals the direct value.
    #[test]
    fn streaming_statistics_equal_the_direct_values() {
        let a: Vec<f64> = (0..301)
            .map(|i| ((i * 37) % 101) as f64 * 0.3 + 2.0)
            .collect();
        let b: Vec<f64> = (0..180).map(|i| ((i * 53) % 89) as f64 * 0.25).collect();
        for st in Statistic::ALL {
            for (x, y) in [(&a, &b), (&b, &a)] {
                let s = Setup::streaming(st, x, y);
                let direct = statistic_value(st, x, y);
                assert!((s.observed - direct).abs() < 1e-9, "{st:?}: observed");
                let lg = s.large.as_ref().unwrap();
                let mut sub = Subset::new(s.pool.len(), st.needs_squares());
                let mut stream = Stream::new(4, Purpose::Permutation, 0);
                for _ in 0..50 {
                    lg.split.draw(&s.pool, &mut stream, &mut sub);
                    let drawn: Vec<f64> = (0..s.pool.len())
                        .filter(|&i| (sub.words[i / 64] >> (i % 64)) & 1 == 1)
                        .map(|i| s.pool[i])
                        .collect();
                    let rest: Vec<f64> = (0..s.pool.len())
                        .filter(|&i| (sub.words[i / 64] >> (i % 64)) & 1 == 0)
                        .map(|i| s.pool[i])
                        .collect();
                    let (g1, g2) = if s.drawn_is_first {
                        (&drawn, &rest)
                    } else {
                        (&rest, &drawn)
                    };
                    assert_eq!((g1.len(), g2.len()), (x.len(), y.len()));
                    let want = statistic_value(st, g1, g2);
                    let got = s.stat_from_subset(&sub);
                    assert!((got - want).abs() < 1e-9, "{st:?}: {got} vs {want}");
                }
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

//! Relabelling values across k groups: random shuffles of the labels, or every distinct
//! labelling (multiset permutations in lexicographic order).

use serde::{Deserialize, Serialize};

use crate::num::stats;
use crate::resample::combin::choose;
use crate::resample::rng::Stream;
use crate::resample::tally::{Counts, TIE_TOLERANCE};
use crate::resample::two_groups::Statistic;

/// What measures the differences between k groups.
#[derive(Clone, Copy, Debug, PartialEq, Eq, Serialize, Deserialize)]
#[serde(rename_all = "kebab-case")]
pub enum KStatistic {
    /// The one-way ANOVA F statistic: spread of the group means relative to the spread
    /// within the groups.
    F,
    /// Welch's heteroscedastic F: each group weighted by n / s², so unequal spreads do not
    /// pass for a difference in centre.
    WelchF,
    /// Spread of the group medians: Σ n_i |median_i − pooled median| / N.
    MedianSpread,
}

impl KStatistic {
    pub const ALL: [KStatistic; 3] = [KStatistic::F, KStatistic::WelchF, KStatistic::MedianSpread];

    pub fn key(self) -> &'static str {
        match self {
            KStatistic::F => "f",
            KStatistic::WelchF => "welch-f",
            KStatistic::MedianSpread => "median-spread",
        }
    }
    pub fn from_key(s: &str) -> Option<KStatistic> {
        KStatistic::ALL.into_iter().find(|x| x.key() == s)
    }
    pub fn label(self) -> &'static str {
        match self {
            KStatistic::F => "F statistic",
            KStatistic::WelchF => "Welch F statistic",
            KStatistic::MedianSpread => "spread of the group medians",
        }
    }
    /// The two-group statistic of the follow-up comparisons.
    pub fn pairwise(self) -> Statistic {
        match self {
            KStatistic::F => Statistic::MeanDifference,
            KStatistic::WelchF => Statistic::WelchT,
            KStatistic::MedianSpread => Statistic::MedianDifference,
        }
    }
}

/// Per-relabelling scratch space.
pub struct Scratch {
    pub sum: Vec<f64>,
    pub sq: Vec<f64>,
    pub rank: Vec<usize>,
    pub acc: Vec<f64>,
}

/// Everything a relabelling needs, prepared once.
pub struct KSetup {
    pub statistic: KStatistic,
    /// Pooled values centred at the pooled mean, sorted ascending.
    pub pool: Vec<f64>,
    /// The observed group of each pooled value.
    pub labels: Vec<u16>,
    pub sizes: Vec<usize>,
    /// Σ x and Σ x² of the pool (x centred).
    pub total: f64,
    pub total_sq: f64,
    pub pooled_median: f64,
    pub observed: f64,
    pub tolerance: f64,
}

impl KSetup {
    pub fn new(statistic: KStatistic, groups: &[Vec<f64>]) -> KSetup {
        let n: usize = groups.iter().map(Vec::len).sum();
        let centre = groups.iter().flatten().sum::<f64>() / n as f64;
        let mut tagged: Vec<(f64, u16)> = groups
            .iter()
            .enumerate()
            .flat_map(|(g, v)| v.iter().map(move |x| (x - centre, g as u16)))
            .collect();
        tagged.sort_by(|a, b| a.0.total_cmp(&b.0));
        let pool: Vec<f64> = tagged.iter().map(|t| t.0).collect();
        let labels: Vec<u16> = tagged.iter().map(|t| t.1).collect();
        let mut s = KSetup {
            statistic,
            total: pool.iter().sum(),
            total_sq: pool.iter().map(|v| v * v).sum(),
            pooled_median: stats::median_sorted(&pool),
            pool,
            labels,
            sizes: groups.iter().map(Vec::len).collect(),
            observed: 0.0,
            tolerance: 0.0,
        };
        let mut scratch = s.scratch();
        s.observed = s.stat(&s.labels, &mut scratch);
        s.tolerance = s.tie_tolerance();
        s
    }

    /// How far two computations of the same statistic (the observed labelling's and a
    /// relabelling's, summed in other orders) can lie apart by rounding alone: twice a
    /// worst-case bound on each (Higham, "Accuracy and Stability of Numerical Algorithms",
    /// 2nd ed., ch. 3-4, with ε for the unit roundoff to spare). It follows the data's
    /// scale, not the statistic's size: a tolerance of 10^-9 of the statistic merged
    /// distinct labellings when one value was huge.
    ///
    /// - F: with centred values v, Q = Σ_g (Σ_g v)²/n_g is off by at most (3n + k + 4)·ε·Σv²
    ///   (Cauchy–Schwarz bounds (Σ_g |v|)²/n_g by Σ_g v²); F = (SSB/df1)/(SSW/df2) with
    ///   SSB = Q − const and SSW = SST − SSB moves by (df2/df1)·SST/SSW² per unit of Q, plus
    ///   a few roundings of F itself.
    /// - Welch's F: its group variances can cancel without bound, so it keeps the relative
    ///   [`TIE_TOLERANCE`] (10^-9 of max(1, F)).
    /// - The median spread: k terms m_g·|median_g − M|/n whose medians can only be values at
    ///   pool positions a group median can reach, so the bound follows the largest of those
    ///   (not an outlier at either end).
    fn tie_tolerance(&self) -> f64 {
        let eps = f64::EPSILON;
        let k = self.sizes.len();
        let n = self.pool.len();
        let obs = self.observed;
        match self.statistic {
            KStatistic::F => {
                let sst = self.total_sq - self.total * self.total / n as f64;
                let (df1, df2) = ((k - 1) as f64, (n - k) as f64);
                let ssw = sst / (1.0 + obs * df1 / df2);
                let e_q = (3 * n + k + 4) as f64 * eps * self.total_sq;
                2.0 * ((df2 / df1) * e_q * sst / (ssw * ssw) + 4.0 * eps * obs.abs())
            }
            KStatistic::WelchF => TIE_TOLERANCE * 1.0f64.max(obs.abs()),
            KStatistic::MedianSpread => {
                let lo = self.sizes.iter().map(|m| (m - 1) / 2).min().unwrap_or(0);
                let hi = self
                    .sizes
                    .iter()
                    .map(|m| n - m + m / 2)
                    .max()
                    .unwrap_or(0)
                    .min(n - 1);
                let m = self.pooled_median;
                let scale = self.pool[lo..=hi]
                    .iter()
                    .fold(m.abs(), |acc, v| acc.max(v.abs()).max((v - m).abs()));
                2.0 * (k + 6) as f64 * eps * scale
            }
        }
    }

    pub fn scratch(&self) -> Scratch {
        let k = self.sizes.len();
        Scratch {
            sum: vec![0.0; k],
            sq: vec![0.0; k],
            rank: vec![0; k],
            acc: vec![0.0; k],
        }
    }

    /// The statistic of a labelling of the sorted pool.
    pub fn stat(&self, labels: &[u16], s: &mut Scratch) -> f64 {
        let k = self.sizes.len();
        let n = self.pool.len() as f64;
        match self.statistic {
            KStatistic::F | KStatistic::WelchF => {
                s.sum.iter_mut().for_each(|v| *v = 0.0);
                s.sq.iter_mut().for_each(|v| *v = 0.0);
                let welch = self.statistic == KStatistic::WelchF;
                for (&v, &g) in self.pool.iter().zip(labels) {
                    s.sum[g as usize] += v;
                    if welch {
                        s.sq[g as usize] += v * v;
                    }
                }
                if welch {
                    welch_f_from(&self.sizes, &s.sum, &s.sq)
                } else {
                    let ssb = (0..k)
                        .map(|g| s.sum[g] * s.sum[g] / self.sizes[g] as f64)
                        .sum::<f64>()
                        - self.total * self.total / n;
                    let sst = self.total_sq - self.total * self.total / n;
                    let ssw = sst - ssb;
                    let (df1, df2) = (k as f64 - 1.0, n - k as f64);
                    if ssw > 1e-12 * sst.max(f64::MIN_POSITIVE) {
                        (ssb / df1) / (ssw / df2)
                    } else if ssb > 0.0 {
                        f64::INFINITY
                    } else {
                        0.0
                    }
                }
            }
            KStatistic::MedianSpread => {
                s.rank.iter_mut().for_each(|v| *v = 0);
                s.acc.iter_mut().for_each(|v| *v = 0.0);
                for (&v, &g) in self.pool.iter().zip(labels) {
                    let g = g as usize;
                    let (r, m) = (s.rank[g], self.sizes[g]);
                    if r == (m - 1) / 2 || r == m / 2 {
                        s.acc[g] += v;
                    }
                    s.rank[g] += 1;
                }
                let mut spread = 0.0;
                for g in 0..k {
                    let m = self.sizes[g];
                    let count = if m % 2 == 1 { 1.0 } else { 2.0 };
                    spread += m as f64 * (s.acc[g] / count - self.pooled_median).abs();
                }
                spread / n
            }
        }
    }

    /// One block of random relabellings (a full Fisher–Yates shuffle of the labels each).
    pub fn random_block(&self, mut stream: Stream, len: u64) -> (Counts, Vec<f64>) {
        let mut labels = self.labels.clone();
        let mut scratch = self.scratch();
        let mut counts = Counts::default();
        let mut values = Vec::with_capacity(len as usize);
        for _ in 0..len {
            for i in (1..labels.len()).rev() {
                let j = stream.below(i as u64 + 1) as usize;
                labels.swap(i, j);
            }
            let t = self.stat(&labels, &mut scratch);
            counts.record(t, self.observed, self.tolerance);
            values.push(t);
        }
        (counts, values)
    }

    /// Every distinct labelling (the multiset permutations of the labels, in lexicographic
    /// order). `progress(done)` every `every` labellings; false stops (None).
    pub fn enumerate(
        &self,
        every: u64,
        progress: &mut dyn FnMut(u64) -> bool,
    ) -> Option<(Counts, Vec<f64>)> {
        let mut labels = self.labels.clone();
        labels.sort_unstable();
        let mut scratch = self.scratch();
        let mut counts = Counts::default();
        let mut values = Vec::new();
        let mut step = 0u64;
        loop {
            let t = self.stat(&labels, &mut scratch);
            counts.record(t, self.observed, self.tolerance);
            values.push(t);
            step += 1;
            if step % every == 0 && !progress(step) {
                return None;
            }
            if !next_permutation(&mut labels) {
                break;
            }
        }
        Some((counts, values))
    }
}

/// Welch's F from group sizes, sums and sums of squares; degenerate spreads give 0 when
/// the means agree and an infinite F otherwise.
pub fn welch_f_from(sizes: &[usize], sum: &[f64], sq: &[f64]) -> f64 {
    let k = sizes.len() as f64;
    let mut w = Vec::with_capacity(sizes.len());
    let mut means = Vec::with_capacity(sizes.len());
    let mut degenerate = false;
    for g in 0..sizes.len() {
        let n = sizes[g] as f64;
        let m = sum[g] / n;
        let v = ((sq[g] - sum[g] * m) / (n - 1.0)).max(0.0);
        means.push(m);
        if v <= 0.0 {
            degenerate = true;
        }
        w.push(n / v);
    }
    if degenerate {
        let same = means
            .iter()
            .all(|m| (m - means[0]).abs() <= 1e-12 * (1.0 + means[0].abs()));
        return if same { 0.0 } else { f64::INFINITY };
    }
    let big_w: f64 = w.iter().sum();
    let mw = w.iter().zip(&means).map(|(w, m)| w * m).sum::<f64>() / big_w;
    let a = w
        .iter()
        .zip(&means)
        .map(|(w, m)| w * (m - mw) * (m - mw))
        .sum::<f64>()
        / (k - 1.0);
    let lambda: f64 = w
        .iter()
        .zip(sizes)
        .map(|(w, &n)| (1.0 - w / big_w).powi(2) / (n as f64 - 1.0))
        .sum();
    a / (1.0 + 2.0 * (k - 2.0) / (k * k - 1.0) * lambda)
}

/// The next permutation of a multiset in lexicographic order; false after the last.
pub fn next_permutation(a: &mut [u16]) -> bool {
    if a.len() < 2 {
        return false;
    }
    let mut i = a.len() - 1;
    while i > 0 && a[i - 1] >= a[i] {
        i -= 1;
    }
    if i == 0 {
        return false;
    }
    let mut j = a.len() - 1;
    while a[j] <= a[i - 1] {
        j -= 1;
    }
    a.swap(i - 1, j);
    a[i..].reverse();
    true
}

/// N! / (n_1! ⋯ n_k!), the number of distinct labellings, saturating at u64::MAX.
pub fn labellings(sizes: &[usize]) -> u64 {
    let mut acc: u64 = 1;
    let mut seen = 0u64;
    for &n in sizes {
        seen += n as u64;
        acc = acc.saturating_mul(choose(seen, n as u64));
    }
    acc
}

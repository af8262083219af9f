//! Relabelling kernels for large samples (kernel generation 2, from [`LARGE`] pooled values):
//! they stream through the values in order instead of jumping around memory.
//!
//! A random relabelling of N pooled values puts a uniformly random k-subset in the drawn
//! group. Drawing it by a partial Fisher–Yates shuffle touches k random places of an array
//! far larger than the processor's caches, and each touch waits for memory. Here each value
//! is instead put in the drawn set with probability m/256 (m/256 the nearest such fraction
//! to k/N), 64 values at a time from a few random words ([`bernoulli64`]); the set then holds
//! K values, about k. If K > k, K − k members chosen uniformly at random are taken out again;
//! if K < k, k − K non-members chosen uniformly at random are put in (each by rejection:
//! a uniformly random position, kept only if it is on the right side). The result is an
//! exactly uniform k-subset: every step treats the N positions alike (the procedure is
//! unchanged by any permutation of them), so every k-subset is equally likely, and the
//! final size is k. Only the corrections (about √N of them) touch random places.
//!
//! The set is kept as one bit per value, with the sum (and sum of squares) of the members
//! of every word of 64 values. Sums come from those word sums; order statistics of either
//! group come from counting bits over the sorted pool (a rank is found by word popcounts,
//! O(N/64)), so nothing is sorted per relabelling.

use crate::resample::rng::Stream;

/// Pooled values from which generation-2 requests use these kernels for random
/// relabellings (2^15 values, 256 KB: beyond it the partial shuffle waits on memory).
pub const LARGE: usize = 1 << 15;

/// 64 independent Bernoulli(m/256) bits (0 < m < 256): lane i is 1 when the 8-bit number
/// formed by bit i of successive random words (most significant first) is below m. The
/// comparison stops at m's lowest set bit or once every lane is decided, so p = 1/2 takes
/// one word and any p at most 8.
#[inline]
pub fn bernoulli64(s: &mut Stream, m: u32) -> u64 {
    debug_assert!(m > 0 && m < 256);
    let mut less = 0u64;
    let mut equal = !0u64;
    let low = m.trailing_zeros();
    let mut j = 8;
    while j > low {
        j -= 1;
        let w = s.next_u64();
        if (m >> j) & 1 == 1 {
            less |= equal & !w;
            equal &= w;
        } else {
            equal &= !w;
        }
        if equal == 0 {
            break;
        }
    }
    less
}

/// The sum of the values of `x` (at most 64) whose bit is set in `w`, in a fixed order
/// (value i goes to running sum i mod 4; the four are then combined), without branches.
#[inline(always)]
fn masked_sum(x: &[f64], w: u64) -> f64 {
    masked(x, w, |v| v)
}

/// The same for the squares of the values.
#[inline(always)]
fn masked_sum_sq(x: &[f64], w: u64) -> f64 {
    masked(x, w, |v| v * v)
}

/// For each 4-bit pattern, the lane masks it selects (all ones or all zeros).
const NIBBLE: [[u64; 4]; 16] = {
    let mut t = [[0u64; 4]; 16];
    let mut b = 0;
    while b < 16 {
        let mut l = 0;
        while l < 4 {
            t[b][l] = if (b >> l) & 1 == 1 { !0 } else { 0 };
            l += 1;
        }
        b += 1;
    }
    t
};

#[inline(always)]
fn masked(x: &[f64], w: u64, f: impl Fn(f64) -> f64) -> f64 {
    let mut acc = [0.0f64; 4];
    let mut quads = x.chunks_exact(4);
    let mut shift = 0;
    for q in &mut quads {
        let m = &NIBBLE[((w >> shift) & 15) as usize];
        for l in 0..4 {
            acc[l] += f64::from_bits(f(q[l]).to_bits() & m[l]);
        }
        shift += 4;
    }
    let m = &NIBBLE[((w.checked_shr(shift).unwrap_or(0)) & 15) as usize];
    for (l, v) in quads.remainder().iter().enumerate() {
        acc[l] += f64::from_bits(f(*v).to_bits() & m[l]);
    }
    (acc[0] + acc[1]) + (acc[2] + acc[3])
}

/// The valid lanes of word `i` of `n` values.
#[inline]
fn lanes(n: usize, i: usize) -> u64 {
    let left = n - i * 64;
    if left >= 64 {
        !0
    } else {
        (1u64 << left) - 1
    }
}

/// A subset of the pooled values: one bit per value, and per word of 64 values the sum (and,
/// when asked, the sum of squares) of its members.
#[derive(Clone, Debug)]
pub struct Subset {
    pub words: Vec<u64>,
    pub sums: Vec<f64>,
    pub squares: Vec<f64>,
    /// Whether `squares` is kept.
    with_squares: bool,
    /// How many values are members.
    pub count: usize,
}

impl Subset {
    /// The empty subset of `n` values.
    pub fn new(n: usize, with_squares: bool) -> Subset {
        let w = n.div_ceil(64);
        Subset {
            words: vec![0; w],
            sums: vec![0.0; w],
            squares: if with_squares {
                vec![0.0; w]
            } else {
                Vec::new()
            },
            with_squares,
            count: 0,
        }
    }

    /// The subset of the positions marked in `member`, with its sums.
    pub fn from_members(
        pool: &[f64],
        member: impl Fn(usize) -> bool,
        with_squares: bool,
    ) -> Subset {
        let mut s = Subset::new(pool.len(), with_squares);
        for (wi, chunk) in pool.chunks(64).enumerate() {
            let mut w = 0u64;
            for j in 0..chunk.len() {
                w |= u64::from(member(wi * 64 + j)) << j;
            }
            s.set_word(pool, wi, w);
        }
        s
    }

    #[inline(always)]
    fn set_word(&mut self, pool: &[f64], wi: usize, w: u64) {
        let chunk = &pool[wi * 64..(wi * 64 + 64).min(pool.len())];
        self.words[wi] = w;
        self.sums[wi] = masked_sum(chunk, w);
        if self.with_squares {
            self.squares[wi] = masked_sum_sq(chunk, w);
        }
        self.count += w.count_ones() as usize;
    }

    /// Puts position i in (`on`) or takes it out, keeping the word's sums.
    #[inline]
    fn flip(&mut self, pool: &[f64], i: usize, on: bool) {
        let (wi, bit) = (i / 64, 1u64 << (i % 64));
        let v = pool[i];
        if on {
            self.words[wi] |= bit;
            self.sums[wi] += v;
            if self.with_squares {
                self.squares[wi] += v * v;
            }
            self.count += 1;
        } else {
            self.words[wi] &= !bit;
            self.sums[wi] -= v;
            if self.with_squares {
                self.squares[wi] -= v * v;
            }
            self.count -= 1;
        }
    }

    #[inline]
    fn has(&self, i: usize) -> bool {
        (self.words[i / 64] >> (i % 64)) & 1 == 1
    }

    /// The sum of the members (word sums added in order).
    pub fn sum(&self) -> f64 {
        self.sums.iter().sum()
    }

    /// The sum of the squares of the members.
    pub fn sum_sq(&self) -> f64 {
        self.squares.iter().sum()
    }

    /// The word of members (`members`) or of non-members, restricted to valid lanes.
    #[inline]
    fn side(&self, n: usize, wi: usize, members: bool) -> u64 {
        if members {
            self.words[wi]
        } else {
            !self.words[wi] & lanes(n, wi)
        }
    }

    /// The position of the r-th (from 0) member, or non-member, in pool order.
    pub fn select(&self, n: usize, r: usize, members: bool) -> usize {
        let mut left = r;
        for wi in 0..self.words.len() {
            let mut w = self.side(n, wi, members);
            let c = w.count_ones() as usize;
            if left < c {
                for _ in 0..left {
                    w &= w - 1;
                }
                return wi * 64 + w.trailing_zeros() as usize;
            }
            left -= c;
        }
        debug_assert!(false, "rank {r} beyond the group");
        n - 1
    }

    /// The sum of the members (or non-members) whose rank among them is in `lo..hi`, the
    /// pool being sorted. Whole words come from the word sums (`totals[wi]` is the sum of
    /// all values of word wi, for the non-members).
    pub fn rank_sum(
        &self,
        pool: &[f64],
        totals: &[f64],
        lo: usize,
        hi: usize,
        members: bool,
    ) -> f64 {
        let n = pool.len();
        let mut acc = 0.0;
        let mut before = 0usize;
        for wi in 0..self.words.len() {
            if before >= hi {
                break;
            }
            let w = self.side(n, wi, members);
            let c = w.count_ones() as usize;
            if before + c <= lo {
                before += c;
                continue;
            }
            if before >= lo && before + c <= hi {
                acc += if members {
                    self.sums[wi]
                } else {
                    totals[wi] - self.sums[wi]
                };
            } else {
                let mut bits = w;
                let mut rank = before;
                while bits != 0 {
                    let j = bits.trailing_zeros() as usize;
                    if rank >= lo && rank < hi {
                        acc += pool[wi * 64 + j];
                    }
                    rank += 1;
                    bits &= bits - 1;
                }
            }
            before += c;
        }
        acc
    }
}

/// Random k-subsets of `n` pooled values by the streaming method of this module.
#[derive(Clone, Copy, Debug)]
pub struct Splitter {
    pub n: usize,
    pub k: usize,
    /// The numerator of the membership probability m/256 (0: none, every member is put in
    /// by the corrections).
    pub m: u32,
}

impl Splitter {
    pub fn new(n: usize, k: usize) -> Splitter {
        let m = ((k as f64 / n as f64) * 256.0).round().clamp(0.0, 255.0) as u32;
        Splitter { n, k, m }
    }

    /// Draws a uniformly random k-subset of `pool` into `out` from `s`.
    pub fn draw(&self, pool: &[f64], s: &mut Stream, out: &mut Subset) {
        let n = self.n;
        out.count = 0;
        for wi in 0..out.words.len() {
            let w = if self.m == 0 {
                0
            } else {
                bernoulli64(s, self.m) & lanes(n, wi)
            };
            out.set_word(pool, wi, w);
        }
        // The corrections, each a uniformly random position on the right side.
        while out.count > self.k {
            let i = s.below(n as u64) as usize;
            if out.has(i) {
                out.flip(pool, i, false);
            }
        }
        while out.count < self.k {
            let i = s.below(n as u64) as usize;
            if !out.has(i) {
                out.flip(pool, i, true);
            }
        }
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::resample::rng::Purpose;

    /// Each lane is 1 with probability m/256: over 2,000 words (128,000 lanes) the share is
    /// within 4.5 binomial standard errors of m/256, and every lane position gets its share
    /// (no lane is stuck), for several m including the one-word case m = 128.
    #[test]
    fn bernoulli_lanes_have_the_asked_probability() {
        for m in [1u32, 3, 64, 100, 128, 200, 255] {
            let mut s = Stream::new(11, Purpose::Permutation, m as u64);
            let mut ones = 0u64;
            let mut per_lane = [0u32; 64];
            let words = 2000;
            for _ in 0..words {
                let w = bernoulli64(&mut s, m);
                ones += w.count_ones() as u64;
                for (i, c) in per_lane.iter_mut().enumerate() {
                    *c += ((w >> i) & 1) as u32;
                }
            }
            let p = m as f64 / 256.0;
            let total = (words * 64) as f64;
            let se = (p * (1.0 - p) / total).sqrt();
            let got = ones as f64 / total;
            assert!((got - p).abs() < 4.5 * se, "m = {m}: {got} vs {p}");
            let lane_se = (p * (1.0 - p) / words as f64).sqrt();
            for (i, c) in per_lane.iter().enumerate() {
                let share = *c as f64 / words as f64;
                assert!(
                    (share - p).abs() < 5.5 * lane_se,
                    "m = {m}, lane {i}: {share}"
                );
            }
        }
    }

    /// Every k-subset is equally likely: all C(7, 3) = 35 subsets of 7 values, counted over
    /// 70,000 draws, pass a chi-square goodness-of-fit test against the uniform at the 0.1%
    /// level (critical value of chi-square with 34 df at 0.999: 65.25, from scipy.stats.chi2
    /// 1.17 `ppf(0.999, 34)`); likewise for subsets of 2 of 9 values (m rounds to 57) and of 1
    /// of 300 (m rounds to 1, nearly every draw is corrected).
    #[test]
    fn subsets_are_uniform() {
        for (n, k, crit) in [(7usize, 3usize, 65.25), (9, 2, 66.62), (300, 1, 380.30)] {
            let pool: Vec<f64> = (0..n).map(|i| i as f64).collect();
            let sp = Splitter::new(n, k);
            let mut s = Stream::new(5, Purpose::Permutation, n as u64);
            let mut out = Subset::new(n, false);
            let mut counts = std::collections::HashMap::<Vec<u64>, u64>::new();
            let cells = crate::resample::combin::choose(n as u64, k as u64);
            let draws = 2000 * cells.min(35);
            for _ in 0..draws {
                sp.draw(&pool, &mut s, &mut out);
                assert_eq!(out.count, k);
                assert_eq!(
                    out.words
                        .iter()
                        .map(|w| w.count_ones() as usize)
                        .sum::<usize>(),
                    k
                );
                *counts.entry(out.words.clone()).or_default() += 1;
            }
            assert_eq!(counts.len() as u64, cells, "n = {n}, k = {k}");
            let expect = draws as f64 / cells as f64;
            let chi2: f64 = counts
                .values()
                .map(|&c| (c as f64 - expect).powi(2) / expect)
                .sum();
            assert!(chi2 < crit, "n = {n}, k = {k}: chi-square {chi2}");
        }
    }

    /// The word sums, selections and rank sums equal the same quantities computed directly
    /// from the list of members.
    #[test]
    fn sums_selections_and_rank_sums_match_the_members() {
        let n = 1000;
        let pool: Vec<f64> = (0..n).map(|i| (i as f64) * 0.5 - 7.0).collect();
        let totals: Vec<f64> = pool.chunks(64).map(|c| c.iter().sum()).collect();
        let sp = Splitter::new(n, 380);
        let mut s = Stream::new(2, Purpose::Permutation, 0);
        let mut out = Subset::new(n, true);
        for _ in 0..20 {
            sp.draw(&pool, &mut s, &mut out);
            let members: Vec<usize> = (0..n).filter(|&i| out.has(i)).collect();
            let others: Vec<usize> = (0..n).filter(|&i| !out.has(i)).collect();
            assert_eq!(members.len(), 380);
            let sum: f64 = members.iter().map(|&i| pool[i]).sum();
            let sq: f64 = members.iter().map(|&i| pool[i] * pool[i]).sum();
            assert!((out.sum() - sum).abs() < 1e-9);
            assert!((out.sum_sq() - sq).abs() < 1e-6);
            for r in [0, 1, 189, 190, 379] {
                assert_eq!(out.select(n, r, true), members[r]);
            }
            for r in [0, 310, 619] {
                assert_eq!(out.select(n, r, false), others[r]);
            }
            for (lo, hi) in [(0, 380), (76, 304), (100, 101), (5, 5)] {
                let want: f64 = members[lo..hi].iter().map(|&i| pool[i]).sum();
                let got = out.rank_sum(&pool, &totals, lo, hi, true);
                assert!((got - want).abs() < 1e-9, "{lo}..{hi}: {got} vs {want}");
            }
            for (lo, hi) in [(0, 620), (124, 496)] {
                let want: f64 = others[lo..hi].iter().map(|&i| pool[i]).sum();
                let got = out.rank_sum(&pool, &totals, lo, hi, false);
                assert!(
                    (got - want).abs() < 1e-9,
                    "rest {lo}..{hi}: {got} vs {want}"
                );
            }
        }
    }
}

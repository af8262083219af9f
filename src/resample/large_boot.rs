//! Bootstrap resamples of large samples (kernel generation 2) as counts over the sorted
//! values, drawn by streaming through them in order.
//!
//! A bootstrap resample of n values is n draws with replacement: the number of times each
//! value is drawn is multinomial (n; 1/n, …, 1/n). Drawing n random positions touches random
//! places of an array far larger than the caches. Instead each value gets a Poisson(1)
//! count, in order; the counts then total T, about n. Poisson counts are the counts of a
//! Poisson number T of draws that, given T, are independent and uniform over the values; so
//! taking T − n of those draws back out, each uniformly among the draws left (when T > n), or
//! adding n − T uniform draws (when T < n), leaves exactly n independent uniform draws: a
//! multinomial resample. Only the corrections (about √n) touch random places.
//!
//! The Poisson(1) counts come by inversion of a uniform number against the distribution
//! function F(j) = e^-1 Σ_{i ≤ j} 1/i!, held to 64 bits (the first 32 random bits decide
//! all but a 2^-32 share of draws, which take 32 more); the error is below 2^-64 per count.
//!
//! With the values sorted once, a resample is held as its counts, with the number of draws,
//! their sum and sum of squares for every word of 64 values, so means and spreads come from
//! the word sums and order statistics (medians, trimmed means) from counting draws through
//! the words, with nothing sorted per resample.

use crate::base::{Error, Progress, ProgressFn, Stage};
use crate::resample::parallel;
use crate::resample::rng::{self, Stream};
use crate::resample::share::Rounds;

/// F(j) of Poisson(1) for j = 0..=13, times 2^64, rounded down (computed with Python's
/// decimal module at 60 digits: e^-1 · Σ_{i ≤ j} 1/i!).
const POISSON_CDF: [u64; 14] = [
    0x5e2d58d8b3bcdf1a,
    0xbc5ab1b16779be35,
    0xeb715e1dc1582dc2,
    0xfb23979734a252f1,
    0xff1025f59174dc3d,
    0xffd90f3ba4055e19,
    0xfffa8b71fc72c913,
    0xffff540c0914b3c9,
    0xffffed1f4aa8f120,
    0xfffffe216e641462,
    0xffffffd4d85d3183,
    0xfffffffc6da262b4,
    0xffffffffba12d178,
    0xfffffffffb07c64c,
];

/// For each value of the top 12 bits of a uniform number: the count it gives when no
/// threshold falls in that range (all but 14 of the 4,096), or [`MIXED`].
const MIXED: u8 = u8::MAX;
const TOP_BITS: u32 = 12;
const BY_TOP: [u8; 1 << TOP_BITS] = {
    let mut t = [0u8; 1 << TOP_BITS];
    let mut b = 0;
    while b < (1 << TOP_BITS) {
        let lo = (b as u64) << (64 - TOP_BITS);
        let hi = lo | ((1u64 << (64 - TOP_BITS)) - 1);
        let mut count = 0u8;
        let mut mixed = false;
        let mut j = 0;
        while j < 14 {
            let th = POISSON_CDF[j];
            if th <= lo {
                count += 1;
            } else if th <= hi {
                mixed = true;
            }
            j += 1;
        }
        t[b] = if mixed || count as usize == 14 {
            MIXED
        } else {
            count
        };
        b += 1;
    }
    t
};

/// The largest count a value may hold (a Poisson(1) count above it has a probability below
/// 10^-500; the corrections never add beyond it).
const MAX_COUNT: u8 = 254;

/// A Poisson(1) count whose first 16 random bits are `u`, when its top 12 bits do not
/// decide: the uniform number U is completed to 64 bits with 48 more from the stream, and the
/// count is the number of thresholds U is at or above.
#[cold]
fn poisson_slow(u: u16, s: &mut Stream) -> u8 {
    let big = (u64::from(u) << 48) | (s.next_u64() >> 16);
    let mut count = 0u8;
    for &th in &POISSON_CDF {
        if big < th {
            return count;
        }
        count += 1;
    }
    // Beyond F(13) (probability 4.5e-12): continue the inversion in floating point, where
    // F(j) for j ≥ 14 is within 10^-16 of one.
    let v = big as f64 / 18446744073709551616.0;
    let mut p = (-1.0f64).exp() / 87178291200.0; // P(14) = e^-1 / 14!
    let mut f = POISSON_CDF[13] as f64 / 18446744073709551616.0;
    while count < MAX_COUNT {
        f += p;
        if v < f {
            return count;
        }
        count += 1;
        p /= f64::from(count);
        if p == 0.0 {
            break;
        }
    }
    count
}

/// The Poisson(1) count of the 16-bit uniform `u` (its top 12 bits decide all but 14 of
/// the 4,096 cases; the rest draw 48 more bits).
#[inline(always)]
fn poisson(u: u16, s: &mut Stream) -> u8 {
    let k = BY_TOP[usize::from(u >> (16 - TOP_BITS))];
    if k == MIXED {
        poisson_slow(u, s)
    } else {
        k
    }
}

/// A resample as counts over sorted values, with per-word totals.
#[derive(Clone, Debug)]
pub struct Weights {
    pub counts: Vec<u8>,
    /// Draws in each word of 64 values.
    pub word_n: Vec<u32>,
    /// Sum of count × value in each word.
    pub word_sum: Vec<f64>,
    /// Sum of count × value² in each word.
    pub word_sq: Vec<f64>,
}

impl Weights {
    pub fn new(n: usize) -> Weights {
        let w = n.div_ceil(64);
        Weights {
            counts: vec![0; n],
            word_n: vec![0; w],
            word_sum: vec![0.0; w],
            word_sq: vec![0.0; w],
        }
    }

    /// Draws a bootstrap resample of `x` (the values, sorted for order statistics). Values
    /// are taken four at a time, from one 64-bit random word (16 bits each).
    pub fn draw(&mut self, x: &[f64], s: &mut Stream) {
        let n = x.len();
        let mut total: u64 = 0;
        // An upper bound of the largest count (the bitwise or of all of them).
        let mut bound = 0u8;
        for (wi, chunk) in x.chunks(64).enumerate() {
            let counts = &mut self.counts[wi * 64..wi * 64 + chunk.len()];
            let (mut cs, mut cq) = ([0.0f64; 4], [0.0f64; 4]);
            let mut cn = 0u32;
            let mut xq = chunk.chunks_exact(4);
            let mut cq4 = counts.chunks_exact_mut(4);
            for (xv, cv) in (&mut xq).zip(&mut cq4) {
                let w = s.next_u64();
                let us = [
                    (w >> 48) as u16,
                    (w >> 32) as u16,
                    (w >> 16) as u16,
                    w as u16,
                ];
                let mut ks = us.map(|u| BY_TOP[usize::from(u >> (16 - TOP_BITS))]);
                if ks.contains(&MIXED) {
                    for (k, &u) in ks.iter_mut().zip(&us) {
                        if *k == MIXED {
                            *k = poisson_slow(u, s);
                        }
                    }
                }
                for l in 0..4 {
                    cv[l] = ks[l];
                    bound |= ks[l];
                    cn += u32::from(ks[l]);
                    let kv = f64::from(ks[l]) * xv[l];
                    cs[l] += kv;
                    cq[l] += kv * xv[l];
                }
            }
            // The last word's remaining values, one random word each.
            for (l, (c, &v)) in cq4
                .into_remainder()
                .iter_mut()
                .zip(xq.remainder())
                .enumerate()
            {
                let k = poisson((s.next_u64() >> 48) as u16, s);
                *c = k;
                bound |= k;
                cn += u32::from(k);
                let kv = f64::from(k) * v;
                cs[l] += kv;
                cq[l] += kv * v;
            }
            self.word_n[wi] = cn;
            self.word_sum[wi] = (cs[0] + cs[1]) + (cs[2] + cs[3]);
            self.word_sq[wi] = (cq[0] + cq[1]) + (cq[2] + cq[3]);
            total += u64::from(cn);
        }
        let n64 = n as u64;
        // Take draws out, each uniformly among the draws: a uniform position accepted with
        // probability count / bound (rejection), until n are left.
        while total > n64 {
            let i = s.below(n64) as usize;
            if s.below(u64::from(bound)) < u64::from(self.counts[i]) {
                self.change(x, i, false);
                total -= 1;
            }
        }
        // Add uniform draws until there are n.
        while total < n64 {
            let i = s.below(n64) as usize;
            if self.counts[i] < MAX_COUNT {
                self.change(x, i, true);
                total += 1;
            }
        }
    }

    #[inline]
    fn change(&mut self, x: &[f64], i: usize, add: bool) {
        let (wi, v) = (i / 64, x[i]);
        if add {
            self.counts[i] += 1;
            self.word_n[wi] += 1;
            self.word_sum[wi] += v;
            self.word_sq[wi] += v * v;
        } else {
            self.counts[i] -= 1;
            self.word_n[wi] -= 1;
            self.word_sum[wi] -= v;
            self.word_sq[wi] -= v * v;
        }
    }

    /// The sum of the drawn values (word sums in order).
    pub fn sum(&self) -> f64 {
        self.word_sum.iter().sum()
    }

    /// The sum of the squares of the drawn values.
    pub fn sum_sq(&self) -> f64 {
        self.word_sq.iter().sum()
    }

    /// The value of the draw of rank r (from 0) in sorted order.
    pub fn select(&self, x: &[f64], r: u64) -> f64 {
        let mut before = 0u64;
        for (wi, &c) in self.word_n.iter().enumerate() {
            let c = u64::from(c);
            if r < before + c {
                let start = wi * 64;
                for (j, &k) in self.counts[start..(start + 64).min(x.len())]
                    .iter()
                    .enumerate()
                {
                    before += u64::from(k);
                    if r < before {
                        return x[start + j];
                    }
                }
            }
            before += c;
        }
        x[x.len() - 1]
    }

    /// The sum of the draws of ranks `lo..hi` in sorted order: whole words from the word
    /// sums, the two partial words value by value.
    pub fn rank_sum(&self, x: &[f64], lo: u64, hi: u64) -> f64 {
        let mut acc = 0.0;
        let mut before = 0u64;
        for (wi, &c) in self.word_n.iter().enumerate() {
            let c = u64::from(c);
            if before >= hi {
                break;
            }
            if before + c <= lo {
                before += c;
                continue;
            }
            if before >= lo && before + c <= hi {
                acc += self.word_sum[wi];
                before += c;
                continue;
            }
            let start = wi * 64;
            for (j, &k) in self.counts[start..(start + 64).min(x.len())]
                .iter()
                .enumerate()
            {
                let k = u64::from(k);
                // Draws before..before + k hold this value; those inside lo..hi count.
                let inside = (before + k).min(hi).saturating_sub(before.max(lo));
                acc += inside as f64 * x[start + j];
                before += k;
            }
        }
        acc
    }
}

/// The probability of superiority of resample `wa` of the sorted values `xa` over resample
/// `wb` of the sorted values `xb` (values comparable between the two): Σ over a's draws of
/// b's draws below it plus half of those equal, over n_a·n_b, by one merge of the two.
pub fn superiority(wa: &Weights, xa: &[f64], wb: &Weights, xb: &[f64]) -> f64 {
    let (mut j, mut below) = (0usize, 0u64);
    let mut acc: u128 = 0;
    let mut i = 0;
    while i < xa.len() {
        let v = xa[i];
        while j < xb.len() && xb[j] < v {
            below += u64::from(wb.counts[j]);
            j += 1;
        }
        let mut equal = 0u64;
        let mut k = j;
        while k < xb.len() && xb[k] == v {
            equal += u64::from(wb.counts[k]);
            k += 1;
        }
        // Every draw of a at this value (all a's equal values together).
        let mut draws = 0u64;
        while i < xa.len() && xa[i] == v {
            draws += u64::from(wa.counts[i]);
            i += 1;
        }
        acc += u128::from(draws) * u128::from(2 * below + equal);
    }
    let (na, nb) = (xa.len() as f64, xb.len() as f64);
    acc as f64 / 2.0 / (na * nb)
}

/// Runs `total` bootstrap resamples of two samples `a` and `b` (each sorted when order
/// statistics are read) as counts: block b of [`rng::LARGE_BLOCK`] resamples draws from the
/// stream (seed, bootstrap, b), a's counts then b's for each resample, on the run's threads, merged in
/// block order. `f` turns each pair of resamples into `K` numbers; the result holds every
/// resample's numbers in order, one list per number. Progress carries a sketch of the first
/// number so far, marked at `mark`.
pub fn resample_two<const K: usize>(
    a: &[f64],
    b: &[f64],
    seed: u64,
    total: u64,
    mark: f64,
    progress: ProgressFn,
    f: &(dyn Fn(&Weights, &Weights) -> [f64; K] + Sync),
) -> Result<[Vec<f64>; K], Error> {
    let mut out: [Vec<f64>; K] = std::array::from_fn(|_| Vec::with_capacity(total as usize));
    let size = rng::LARGE_BLOCK;
    let count = rng::block_count_of(total, size);
    let streams = rng::streams_for(seed, rng::Purpose::Bootstrap, 0, count);
    let work = |blk: u64| {
        let mut s = streams[blk as usize].clone();
        let (mut wa, mut wb) = (Weights::new(a.len()), Weights::new(b.len()));
        (0..rng::block_len_of(total, blk, size))
            .map(|_| {
                wa.draw(a, &mut s);
                wb.draw(b, &mut s);
                f(&wa, &wb)
            })
            .collect::<Vec<[f64; K]>>()
    };
    let mut done = 0;
    let mut sketcher = crate::resample::summary::Sketcher::new(Some(mark));
    let described = |blocks: u64| Progress {
        stage: Stage::Bootstrap,
        done: (blocks * size).min(total),
        total,
        running: None,
        sketch: None,
    };
    let finished = parallel::in_order(
        count,
        Rounds::All,
        &work,
        &mut |blk, rows| {
            let firsts: Vec<f64> = rows.iter().map(|r| r[0]).collect();
            sketcher.add(&firsts);
            for r in rows {
                for (list, v) in out.iter_mut().zip(r) {
                    list.push(v);
                }
            }
            done += rng::block_len_of(total, blk, size);
            progress(&Progress {
                stage: Stage::Bootstrap,
                done,
                total,
                running: None,
                sketch: sketcher.get(),
            })
        },
        &described,
    );
    if !finished {
        return Err(Error::cancelled());
    }
    Ok(out)
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::resample::rng::Purpose;

    /// The inversion table: F(j) matches e^-1 Σ 1/i! in double precision (statrs 0.19
    /// Poisson(1) `cdf` as the outside reference), and is increasing.
    #[test]
    fn the_poisson_table_is_the_distribution_function() {
        use statrs::distribution::{DiscreteCDF, Poisson};
        let d = Poisson::new(1.0).unwrap();
        for (j, &th) in POISSON_CDF.iter().enumerate() {
            let f = th as f64 / 18446744073709551616.0;
            assert!(
                (f - d.cdf(j as u64)).abs() < 1e-15,
                "j = {j}: {f} vs {}",
                d.cdf(j as u64)
            );
            if j > 0 {
                assert!(th > POISSON_CDF[j - 1]);
            }
        }
    }

    /// Counts drawn for 400,000 values follow Poisson(1) before the corrections: the shares of
    /// 0, 1, 2, 3 and 4 or more are within 4.5 standard errors of the Poisson probabilities
    /// (statrs 0.19 `pmf`), counted by drawing one resample of a sample that large and
    /// undoing nothing (n = total is not asked for here: the counts are read from a draw
    /// whose corrections are few next to 400,000).
    #[test]
    fn counts_follow_poisson_one_and_total_n() {
        use statrs::distribution::{Discrete, Poisson};
        let n = 400_000;
        let x: Vec<f64> = (0..n).map(|i| i as f64).collect();
        let mut w = Weights::new(n);
        let mut s = Stream::new(8, Purpose::Bootstrap, 0);
        w.draw(&x, &mut s);
        assert_eq!(
            w.counts.iter().map(|&c| u64::from(c)).sum::<u64>(),
            n as u64
        );
        assert_eq!(
            w.word_n.iter().map(|&c| u64::from(c)).sum::<u64>(),
            n as u64
        );
        let d = Poisson::new(1.0).unwrap();
        let mut share = [0u64; 5];
        for &c in &w.counts {
            share[(c as usize).min(4)] += 1;
        }
        for (j, &got) in share.iter().enumerate() {
            let p = if j < 4 {
                d.pmf(j as u64)
            } else {
                1.0 - (0..4).map(|i| d.pmf(i)).sum::<f64>()
            };
            let se = (p * (1.0 - p) / n as f64).sqrt();
            let f = got as f64 / n as f64;
            // The corrections move about √n = 632 draws: 0.16% of the values at most.
            assert!((f - p).abs() < 4.5 * se + 0.0016, "count {j}: {f} vs {p}");
        }
    }

    /// Resamples are multinomial: over many resamples of 5 values, each value's count has mean
    /// 1 and variance (1 − 1/5) = 0.8 (the multinomial's), and the counts of two values have
    /// covariance −1/5; the totals are always 5. Also the word sums, selections and rank sums
    /// equal those of the resample written out in sorted order.
    #[test]
    fn resamples_are_multinomial_and_their_summaries_match() {
        let x = [1.0, 2.5, 4.0, 4.5, 9.0];
        let mut w = Weights::new(5);
        let mut s = Stream::new(3, Purpose::Bootstrap, 1);
        let reps = 200_000;
        let (mut sum, mut sq, mut cross) = ([0.0f64; 5], [0.0f64; 5], 0.0);
        for r in 0..reps {
            w.draw(&x, &mut s);
            assert_eq!(w.counts.iter().map(|&c| u32::from(c)).sum::<u32>(), 5);
            for i in 0..5 {
                let c = f64::from(w.counts[i]);
                sum[i] += c;
                sq[i] += c * c;
            }
            cross += f64::from(w.counts[0]) * f64::from(w.counts[3]);
            if r < 200 {
                let mut out = Vec::new();
                for (i, &c) in w.counts.iter().enumerate() {
                    for _ in 0..c {
                        out.push(x[i]);
                    }
                }
                assert!((w.sum() - out.iter().sum::<f64>()).abs() < 1e-12);
                assert!((w.sum_sq() - out.iter().map(|v| v * v).sum::<f64>()).abs() < 1e-9);
                for rank in 0..5 {
                    assert_eq!(w.select(&x, rank), out[rank as usize]);
                }
                for (lo, hi) in [(0u64, 5u64), (1, 4), (2, 3), (0, 1)] {
                    let want: f64 = out[lo as usize..hi as usize].iter().sum();
                    assert!((w.rank_sum(&x, lo, hi) - want).abs() < 1e-12);
                }
            }
        }
        let m = reps as f64;
        for i in 0..5 {
            let mean = sum[i] / m;
            let var = sq[i] / m - mean * mean;
            // Standard errors: of the mean sqrt(0.8/m) = 0.002; of the variance about
            // sqrt(Var(c²)/m) < 0.006.
            assert!((mean - 1.0).abs() < 0.01, "value {i}: mean count {mean}");
            assert!((var - 0.8).abs() < 0.03, "value {i}: variance {var}");
        }
        let cov = cross / m - (sum[0] / m) * (sum[3] / m);
        assert!((cov + 0.2).abs() < 0.02, "covariance {cov}");
    }
}

//! Kendall's tau-b as a re-pairing statistic, in O(n log n) per pairing by Knight's method
//! (Knight 1966, "A computer method for calculating Kendall's tau with ungrouped data"):
//! with the pairs in x order and each run of tied x sorted by y, the discordant pairs are the
//! strict inversions of the y sequence (counted by a merge sort), and
//! S = C − D = n0 − n1 − n2 + n3 − 2·D, where n0 = n(n − 1)/2, n1 and n2 count the pairs tied
//! in x and in y and n3 those tied in both. tau-b = S / sqrt((n0 − n1)(n0 − n2)).
//!
//! Re-pairing keeps n1 and n2, so S is the statistic; it is a whole number, so ties with the
//! observed value are exact.

use crate::num::stats;
use crate::resample::rng::Stream;
use crate::resample::tally::Counts;

/// Pairs within runs of equal values of a sorted list: Σ t(t − 1)/2.
fn tied_pairs(sorted: &[f64]) -> f64 {
    stats::tie_sizes(sorted).into_iter().fold(0.0, |acc, t| {
        let t = t as f64;
        acc + t * (t - 1.0) / 2.0
    })
}

/// Strict inversions (i < j with v[i] > v[j]) of `v`, which it sorts; `buf` as long as `v`.
fn inversions(v: &mut [f64], buf: &mut [f64]) -> u64 {
    let n = v.len();
    let mut count = 0u64;
    let mut width = 1;
    while width < n {
        let mut lo = 0;
        while lo < n {
            let mid = (lo + width).min(n);
            let hi = (lo + 2 * width).min(n);
            let (mut i, mut j, mut k) = (lo, mid, lo);
            while i < mid && j < hi {
                // Equal values are taken from the left: they are no inversion.
                if v[j] < v[i] {
                    buf[k] = v[j];
                    count += (mid - i) as u64;
                    j += 1;
                } else {
                    buf[k] = v[i];
                    i += 1;
                }
                k += 1;
            }
            buf[k..k + (mid - i)].copy_from_slice(&v[i..mid]);
            k += mid - i;
            buf[k..k + (hi - j)].copy_from_slice(&v[j..hi]);
            v[lo..hi].copy_from_slice(&buf[lo..hi]);
            lo = hi;
        }
        width *= 2;
    }
    count
}

/// What every pairing of one x column with the y values needs, prepared once.
#[derive(Clone, Debug)]
pub struct Kendall {
    /// Row indices in ascending x order.
    order: Vec<usize>,
    /// Runs of tied x in that order, as ranges.
    x_runs: Vec<(usize, usize)>,
    /// The y values in row order.
    pub y: Vec<f64>,
    n0: f64,
    n1: f64,
    n2: f64,
    /// sqrt((n0 − n1)(n0 − n2)); 0 when either column is constant.
    pub denominator: f64,
}

impl Kendall {
    pub fn new(x: &[f64], y: &[f64]) -> Kendall {
        let n = x.len();
        let mut order: Vec<usize> = (0..n).collect();
        order.sort_by(|&i, &j| x[i].total_cmp(&x[j]));
        let mut x_runs = Vec::new();
        let mut i = 0;
        while i < n {
            let mut j = i + 1;
            while j < n && x[order[j]] == x[order[i]] {
                j += 1;
            }
            if j - i > 1 {
                x_runs.push((i, j));
            }
            i = j;
        }
        let xs: Vec<f64> = order.iter().map(|&i| x[i]).collect();
        let mut ys = y.to_vec();
        ys.sort_by(f64::total_cmp);
        let n0 = (n * n.saturating_sub(1)) as f64 / 2.0;
        let (n1, n2) = (tied_pairs(&xs), tied_pairs(&ys));
        Kendall {
            order,
            x_runs,
            y: y.to_vec(),
            n0,
            n1,
            n2,
            denominator: ((n0 - n1) * (n0 - n2)).sqrt(),
        }
    }

    /// S = C − D of x paired with `y` (in row order); `seq` and `buf` are work space as long
    /// as the data.
    pub fn s_of(&self, y: &[f64], seq: &mut [f64], buf: &mut [f64]) -> f64 {
        for (s, &i) in seq.iter_mut().zip(&self.order) {
            *s = y[i];
        }
        let mut n3 = 0.0;
        for &(a, b) in &self.x_runs {
            seq[a..b].sort_by(f64::total_cmp);
            n3 += tied_pairs(&seq[a..b]);
        }
        let d = inversions(seq, buf) as f64;
        self.n0 - self.n1 - self.n2 + n3 - 2.0 * d
    }

    /// tau-b of x paired with `y` (NaN when a column is constant).
    pub fn tau_of(&self, y: &[f64], seq: &mut [f64], buf: &mut [f64]) -> f64 {
        if self.denominator > 0.0 {
            self.s_of(y, seq, buf) / self.denominator
        } else {
            f64::NAN
        }
    }

    /// Half a step of S in tau's units: ties with the observed tau within it are exact ties.
    pub fn tolerance(&self) -> f64 {
        if self.denominator > 0.0 {
            0.5 / self.denominator
        } else {
            0.0
        }
    }

    /// A block of random pairings, drawn as [`crate::resample::pairings::random_block`]
    /// draws them (the same shuffles of y for the same stream).
    pub fn random_block(
        &self,
        obs: f64,
        tol: f64,
        mut stream: Stream,
        len: u64,
    ) -> (Counts, Vec<f64>) {
        let n = self.y.len();
        let mut b = self.y.clone();
        let (mut seq, mut buf) = (vec![0.0; n], vec![0.0; n]);
        let mut counts = Counts::default();
        let mut values = Vec::with_capacity(len as usize);
        for _ in 0..len {
            for i in (1..n).rev() {
                let j = stream.below(i as u64 + 1) as usize;
                b.swap(i, j);
            }
            let t = self.tau_of(&b, &mut seq, &mut buf);
            counts.record(t, obs, tol);
            values.push(t);
        }
        (counts, values)
    }

    /// Every pairing, in Heap's order as [`crate::resample::pairings::heap_enumerate`]
    /// visits them, each computed afresh; `progress(done)` every 4,096 may stop it (None).
    pub fn enumerate(
        &self,
        obs: f64,
        tol: f64,
        progress: &mut dyn FnMut(u64) -> bool,
    ) -> Option<(Counts, Vec<f64>)> {
        let n = self.y.len();
        let mut b = self.y.clone();
        let (mut seq, mut buf) = (vec![0.0; n], vec![0.0; n]);
        let mut counts = Counts::default();
        let mut values = Vec::new();
        let mut record = |b: &[f64], counts: &mut Counts, values: &mut Vec<f64>| {
            let t = self.tau_of(b, &mut seq, &mut buf);
            counts.record(t, obs, tol);
            values.push(t);
        };
        record(&b, &mut counts, &mut values);
        let mut c = vec![0usize; n];
        let (mut i, mut steps) = (1, 1u64);
        while i < n {
            if c[i] < i {
                let j = if i % 2 == 0 { 0 } else { c[i] };
                b.swap(i, j);
                steps += 1;
                if steps % 4096 == 0 && !progress(steps) {
                    return None;
                }
                record(&b, &mut counts, &mut values);
                c[i] += 1;
                i = 1;
            } else {
                c[i] = 0;
                i += 1;
            }
        }
        Some((counts, values))
    }
}

/// tau-b of x and y (NaN when a column is constant).
pub fn tau_b(x: &[f64], y: &[f64]) -> f64 {
    let k = Kendall::new(x, y);
    let n = x.len();
    k.tau_of(y, &mut vec![0.0; n], &mut vec![0.0; n])
}

/// The normal approximation of Kendall's test as scipy.stats.kendalltau's asymptotic method
/// computes it (the variance of S with ties, Kendall 1970, ch. 4): (S, z).
pub fn normal_z(x: &[f64], y: &[f64]) -> (f64, f64) {
    let n = x.len() as f64;
    let k = Kendall::new(x, y);
    let s = k.s_of(y, &mut vec![0.0; x.len()], &mut vec![0.0; x.len()]);
    let runs = |v: &[f64]| -> Vec<f64> {
        stats::tie_sizes(&stats::sorted(v))
            .into_iter()
            .map(|t| t as f64)
            .collect()
    };
    let (tx, ty) = (runs(x), runs(y));
    let sum = |t: &[f64], f: &dyn Fn(f64) -> f64| t.iter().map(|&v| f(v)).sum::<f64>();
    let v0 = n * (n - 1.0) * (2.0 * n + 5.0);
    let vt = sum(&tx, &|t| t * (t - 1.0) * (2.0 * t + 5.0));
    let vu = sum(&ty, &|t| t * (t - 1.0) * (2.0 * t + 5.0));
    let v1 = sum(&tx, &|t| t * (t - 1.0)) * sum(&ty, &|t| t * (t - 1.0)) / (2.0 * n * (n - 1.0));
    let v2 = sum(&tx, &|t| t * (t - 1.0) * (t - 2.0)) * sum(&ty, &|t| t * (t - 1.0) * (t - 2.0))
        / (9.0 * n * (n - 1.0) * (n - 2.0));
    let var = (v0 - vt - vu) / 18.0 + v1 + v2;
    (s, if var > 0.0 { s / var.sqrt() } else { f64::NAN })
}

#[cfg(test)]
mod tests {
    use super::*;

    /// S by the definition: the sum over all pairs of sign(Δx)·sign(Δy).
    fn brute_s(x: &[f64], y: &[f64]) -> f64 {
        let mut s = 0.0;
        for i in 0..x.len() {
            for j in i + 1..x.len() {
                s += (x[i] - x[j]).signum()
                    * (y[i] - y[j]).signum()
                    * f64::from(x[i] != x[j] && y[i] != y[j]);
            }
        }
        s
    }

    #[test]
    fn knight_s_equals_the_pairwise_definition_with_and_without_ties() {
        let x = [3.0, 1.0, 4.0, 1.0, 5.0, 9.0, 2.0, 6.0, 5.0, 3.0, 5.0];
        let y = [2.0, 7.0, 1.0, 8.0, 2.0, 8.0, 1.0, 8.0, 2.0, 8.0, 4.0];
        let k = Kendall::new(&x, &y);
        let (mut seq, mut buf) = (vec![0.0; 11], vec![0.0; 11]);
        assert_eq!(k.s_of(&y, &mut seq, &mut buf), brute_s(&x, &y));
        let mut yy = y;
        for r in 0..30 {
            yy.rotate_left(1 + r % 3);
            yy.swap(r % 11, (r * 7) % 11);
            assert_eq!(k.s_of(&yy, &mut seq, &mut buf), brute_s(&x, &yy));
        }
        let z: Vec<f64> = (0..11).map(|i| (i * 7 % 11) as f64).collect();
        assert_eq!(
            tau_b(&x[..], &z) * Kendall::new(&x, &z).denominator,
            brute_s(&x, &z)
        );
    }

    #[test]
    fn enumeration_visits_every_pairing_once() {
        let x = [1.0, 2.0, 2.0, 4.0, 5.0];
        let y = [3.0, 1.0, 2.0, 2.0, 6.0];
        let k = Kendall::new(&x, &y);
        let (c, _) = k.enumerate(0.0, k.tolerance(), &mut |_| true).unwrap();
        assert_eq!(c.total, 120);
    }
}

//! Discrete distributions: exact binomial confidence limits, and probabilities built from
//! the ratios of successive terms (the same numbers on every machine).

use statrs::distribution::{Beta, ContinuousCDF};

/// Clopper–Pearson interval for a binomial proportion, x successes in n trials.
pub fn clopper_pearson(x: u64, n: u64, level: f64) -> (f64, f64) {
    let alpha = 1.0 - level;
    let lo = if x == 0 {
        0.0
    } else {
        Beta::new(x as f64, (n - x + 1) as f64)
            .map(|d| d.inverse_cdf(alpha / 2.0))
            .unwrap_or(0.0)
    };
    let hi = if x == n {
        1.0
    } else {
        Beta::new((x + 1) as f64, (n - x) as f64)
            .map(|d| d.inverse_cdf(1.0 - alpha / 2.0))
            .unwrap_or(1.0)
    };
    (lo, hi)
}

/// Probabilities of a discrete distribution on lo..=hi from the ratio of successive
/// probabilities, computed outward from the mode and normalised: only +, ×, ÷, so the
/// numbers are the same on every machine.
pub fn pmf_from_ratios(lo: u64, hi: u64, mode: u64, ratio: impl Fn(u64) -> f64) -> Vec<f64> {
    let len = (hi - lo + 1) as usize;
    let mut p = vec![0.0; len];
    let m = (mode - lo) as usize;
    p[m] = 1.0;
    for i in m + 1..len {
        p[i] = p[i - 1] * ratio(lo + i as u64 - 1);
    }
    for i in (0..m).rev() {
        p[i] = p[i + 1] / ratio(lo + i as u64);
    }
    let total: f64 = p.iter().sum();
    p.iter_mut().for_each(|v| *v /= total);
    p
}

/// Terms below this fraction of the mode's probability are left out of a window. (Waiting
/// for an exact zero is not enough: a slowly decaying term can stay at the smallest
/// subnormal number forever.)
const NEGLIGIBLE: f64 = 1e-300;

/// Like [`pmf_from_ratios`], but only over the window around the mode where the
/// probabilities are at least 1e-300 of the mode's: (first value of the window,
/// probabilities). The values kept are the same, bit for bit, as in the full vector (the
/// dropped terms are far below the last bit of the normalising sum); the window of a
/// distribution with billions of possible values holds about 75 standard deviations, not
/// billions of terms.
pub fn pmf_window(lo: u64, hi: u64, mode: u64, ratio: impl Fn(u64) -> f64) -> (u64, Vec<f64>) {
    let mut up = vec![1.0];
    let mut k = mode;
    while k < hi {
        let next = up[up.len() - 1] * ratio(k);
        if next < NEGLIGIBLE {
            break;
        }
        up.push(next);
        k += 1;
    }
    let mut down = Vec::new();
    let (mut k, mut last) = (mode, 1.0);
    while k > lo {
        let next = last / ratio(k - 1);
        if next < NEGLIGIBLE {
            break;
        }
        down.push(next);
        last = next;
        k -= 1;
    }
    let start = mode - down.len() as u64;
    let mut p: Vec<f64> = down.into_iter().rev().chain(up).collect();
    // Summed from the lowest value up, as the full vector was.
    let total: f64 = p.iter().sum();
    p.iter_mut().for_each(|v| *v /= total);
    (start, p)
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn clopper_pearson_edges() {
        // x = 0: upper limit is 1 - (alpha/2)^(1/n) (closed form).
        let (lo, hi) = clopper_pearson(0, 10, 0.95);
        assert_eq!(lo, 0.0);
        assert!((hi - (1.0 - 0.025f64.powf(0.1))).abs() < 1e-9, "{hi}");
        let (lo, hi) = clopper_pearson(10, 10, 0.95);
        assert!((lo - 0.025f64.powf(0.1)).abs() < 1e-9);
        assert_eq!(hi, 1.0);
    }

    /// The window keeps exactly the full vector's non-zero values (bit for bit).
    #[test]
    fn the_window_keeps_the_full_vectors_values() {
        // Hypergeometric: 3000 of 10000 yes, 5000 drawn.
        let (n1, n2, m) = (5000u64, 5000u64, 3000u64);
        let ratio = |a: u64| {
            ((n1 - a) as f64 * (m - a) as f64) / ((a + 1) as f64 * (n2 + a + 1 - m) as f64)
        };
        let full = pmf_from_ratios(0, 3000, 1500, ratio);
        let (start, w) = pmf_window(0, 3000, 1500, ratio);
        assert!(w.len() < full.len());
        let start = start as usize;
        for (j, x) in w.iter().enumerate() {
            assert_eq!(full[start + j].to_bits(), x.to_bits(), "{j}");
        }
        let mut outside = full[..start].iter().chain(&full[start + w.len()..]);
        assert!(outside.all(|&v| v < 1e-298));
    }
}

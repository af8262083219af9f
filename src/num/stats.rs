//! Descriptive statistics used throughout the engine.

/// Arithmetic mean (NaN for an empty slice; callers check sizes first), accurate when the
/// values share a large offset (timestamps, serial numbers, 1e15 + small differences): the
/// plain mean is corrected by the mean of the deviations from it (a second pass, as in
/// Higham, "Accuracy and Stability of Numerical Algorithms", 2nd ed., section 4.2), and an
/// overflowing sum is avoided by scaling.
pub fn mean(x: &[f64]) -> f64 {
    let n = x.len() as f64;
    let m0 = x.iter().sum::<f64>() / n;
    if !m0.is_finite() {
        // The sum overflowed (values near the largest double): average scaled values.
        let big = x.iter().fold(0.0f64, |m, v| m.max(v.abs()));
        if !big.is_finite() || big == 0.0 {
            return m0;
        }
        return x.iter().map(|v| v / big).sum::<f64>() / n * big;
    }
    // The second pass measures the plain mean's error against the values' spread. The
    // correction is applied only when that error is visible at the spread's scale (offsets
    // over about 10^6 times the spread), so that ordinary data keep the plain mean bit for
    // bit, as earlier reports and share links pinned it.
    let (dev, abs_dev) = x
        .iter()
        .fold((0.0, 0.0), |(d, a), v| (d + (v - m0), a + (v - m0).abs()));
    let correction = dev / n;
    let spread = abs_dev / n;
    if m0.abs() > 1e6 * spread && correction.abs() > 1e-10 * spread {
        m0 + correction
    } else {
        m0
    }
}

/// Sample variance with divisor n - 1, computed in two passes for accuracy.
pub fn variance(x: &[f64]) -> f64 {
    let n = x.len();
    if n < 2 {
        return f64::NAN;
    }
    let m = mean(x);
    let ss = x.iter().map(|v| (v - m) * (v - m)).sum::<f64>();
    // Squares of deviations below about 1e-154 underflow and above about 1e154 overflow:
    // then scale by the largest deviation first (values near 1e-300 keep their SD).
    if ss.is_finite() && ss > 1e-290 || ss == 0.0 && x.iter().all(|&v| v == m) {
        return ss / (n - 1) as f64;
    }
    let big = x.iter().fold(0.0f64, |b, v| b.max((v - m).abs()));
    if big == 0.0 || !big.is_finite() {
        return ss / (n - 1) as f64;
    }
    let scaled = x.iter().map(|v| ((v - m) / big).powi(2)).sum::<f64>();
    scaled / (n - 1) as f64 * big * big
}

/// Sample standard deviation, scaled so that it neither underflows (values near 1e-300)
/// nor overflows (values near 1e200) where the variance would.
pub fn sd(x: &[f64]) -> f64 {
    let n = x.len();
    if n < 2 {
        return f64::NAN;
    }
    let v = variance(x);
    if v.is_finite() && v > 1e-290 || v == 0.0 && x.iter().all(|&y| y == x[0]) {
        return v.sqrt();
    }
    let m = mean(x);
    let big = x.iter().fold(0.0f64, |b, y| b.max((y - m).abs()));
    if big == 0.0 || !big.is_finite() {
        return v.sqrt();
    }
    let scaled = x.iter().map(|y| ((y - m) / big).powi(2)).sum::<f64>();
    (scaled / (n - 1) as f64).sqrt() * big
}

/// The offset all values share when it dwarfs their spread (timestamps, serial numbers,
/// 1e15 plus small differences): the smallest value, when every value's magnitude exceeds
/// 10^6 times the range; otherwise 0. Differences from a value this close are exact in
/// floating point (Sterbenz's lemma), so the data can be analysed as differences from it.
pub fn common_offset<'a>(values: impl IntoIterator<Item = &'a f64>) -> f64 {
    let (mut lo, mut hi) = (f64::INFINITY, f64::NEG_INFINITY);
    for &v in values {
        lo = lo.min(v);
        hi = hi.max(v);
    }
    let range = hi - lo;
    if range.is_nan() || range <= 0.0 || !range.is_finite() {
        return 0.0;
    }
    if lo.abs().min(hi.abs()) > 1e6 * range && lo.signum() == hi.signum() {
        lo
    } else {
        0.0
    }
}

/// Sorted copy of the data.
pub fn sorted(x: &[f64]) -> Vec<f64> {
    let mut v = x.to_vec();
    v.sort_by(f64::total_cmp);
    v
}

/// Median of already sorted data (mean of the two middle values for even n).
/// The sizes of the runs of equal values in a sorted list, in order (1 for a value that
/// no other shares): what tie corrections sum over.
pub fn tie_sizes(sorted: &[f64]) -> Vec<usize> {
    let mut out = Vec::new();
    let mut i = 0;
    while i < sorted.len() {
        let mut j = i + 1;
        while j < sorted.len() && sorted[j] == sorted[i] {
            j += 1;
        }
        out.push(j - i);
        i = j;
    }
    out
}

/// Σ (t³ − t) over the runs of equal values of a sorted list (the tie correction of rank
/// tests), summed in order from zero.
pub fn tie_cubes(sorted: &[f64]) -> f64 {
    tie_sizes(sorted).into_iter().fold(0.0, |acc, t| {
        let t = t as f64;
        acc + (t * t * t - t)
    })
}

pub fn median_sorted(s: &[f64]) -> f64 {
    let n = s.len();
    if n == 0 {
        return f64::NAN;
    }
    if n % 2 == 1 {
        s[n / 2]
    } else {
        0.5 * (s[n / 2 - 1] + s[n / 2])
    }
}

pub fn median(x: &[f64]) -> f64 {
    median_sorted(&sorted(x))
}

/// Proportion cut from each end by the trimmed mean.
pub const TRIM: f64 = 0.2;

/// How many values a 20% trimmed mean cuts from each end of n values: floor(0.2 n), the
/// convention of scipy.stats.trim_mean and of Wilcox, "Introduction to Robust Estimation
/// and Hypothesis Testing" (3rd ed., section 3.3).
pub fn trim_count(n: usize) -> usize {
    ((TRIM * n as f64) + 1e-9).floor() as usize
}

/// 20% trimmed mean of sorted data.
pub fn trimmed_mean_sorted(s: &[f64]) -> f64 {
    let g = trim_count(s.len());
    let kept = &s[g..s.len() - g];
    mean(kept)
}

pub fn trimmed_mean(x: &[f64]) -> f64 {
    trimmed_mean_sorted(&sorted(x))
}

/// Quantile by linear interpolation between order statistics (Hyndman & Fan 1996 type 7,
/// the default of numpy.percentile and R's quantile), of sorted data.
pub fn quantile_sorted(s: &[f64], p: f64) -> f64 {
    let n = s.len();
    if n == 0 {
        return f64::NAN;
    }
    let p = p.clamp(0.0, 1.0);
    let h = (n - 1) as f64 * p;
    let lo = h.floor() as usize;
    let hi = (lo + 1).min(n - 1);
    s[lo] + (h - lo as f64) * (s[hi] - s[lo])
}

/// Hedges' g: difference in means over the pooled SD, times the exact small-sample
/// correction J(df) = Γ(df/2) / (sqrt(df/2) Γ((df-1)/2)), df = n1 + n2 - 2
/// (Hedges & Olkin 1985, "Statistical Methods for Meta-Analysis", ch. 5).
pub fn hedges_g(a: &[f64], b: &[f64]) -> f64 {
    let (n1, n2) = (a.len() as f64, b.len() as f64);
    let df = n1 + n2 - 2.0;
    let pooled = (((n1 - 1.0) * variance(a) + (n2 - 1.0) * variance(b)) / df).sqrt();
    let d = (mean(a) - mean(b)) / pooled;
    d * hedges_j(df)
}

pub fn hedges_j(df: f64) -> f64 {
    use crate::num::normal::ln_gamma;
    libm::exp(ln_gamma(df / 2.0) - ln_gamma((df - 1.0) / 2.0)) / (df / 2.0).sqrt()
}

/// Ranks with ties given their average rank.
pub fn ranks(x: &[f64]) -> Vec<f64> {
    let mut idx: Vec<usize> = (0..x.len()).collect();
    idx.sort_by(|&i, &j| x[i].total_cmp(&x[j]));
    let mut r = vec![0.0; x.len()];
    let mut i = 0;
    while i < idx.len() {
        let mut j = i;
        while j + 1 < idx.len() && x[idx[j + 1]] == x[idx[i]] {
            j += 1;
        }
        let avg = (i + j) as f64 / 2.0 + 1.0;
        for &k in &idx[i..=j] {
            r[k] = avg;
        }
        i = j + 1;
    }
    r
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn basic_values() {
        let x = [2.0, 4.0, 4.0, 4.0, 5.0, 5.0, 7.0, 9.0];
        assert_eq!(mean(&x), 5.0);
        // Population SD of this classic example is 2; sample variance is 32/7.
        assert!((variance(&x) - 32.0 / 7.0).abs() < 1e-12);
        assert_eq!(median(&x), 4.5);
        assert_eq!(median(&[3.0, 1.0, 2.0]), 2.0);
    }

    #[test]
    fn trimmed_mean_matches_definition() {
        // n = 10: floor(0.2 * 10) = 2 cut from each end.
        let x = [1.0, 2.0, 3.0, 4.0, 5.0, 6.0, 7.0, 8.0, 9.0, 100.0];
        assert_eq!(trim_count(10), 2);
        assert_eq!(trimmed_mean(&x), (3.0 + 4.0 + 5.0 + 6.0 + 7.0 + 8.0) / 6.0);
        assert_eq!(trim_count(4), 0);
        assert_eq!(trim_count(5), 1);
    }

    #[test]
    fn quantile_type7() {
        let s = [1.0, 2.0, 3.0, 4.0];
        assert_eq!(quantile_sorted(&s, 0.0), 1.0);
        assert_eq!(quantile_sorted(&s, 1.0), 4.0);
        assert!((quantile_sorted(&s, 0.5) - 2.5).abs() < 1e-12);
        assert!((quantile_sorted(&s, 0.25) - 1.75).abs() < 1e-12);
    }

    #[test]
    fn hedges_j_approximation() {
        // The common approximation J ≈ 1 - 3 / (4 df - 1) (Hedges & Olkin 1985) agrees to
        // about 1e-4 at df = 20.
        let df = 20.0;
        assert!((hedges_j(df) - (1.0 - 3.0 / (4.0 * df - 1.0))).abs() < 2e-4);
    }
}

/// Median without a full sort (reorders the slice), O(n).
pub fn median_select(x: &mut [f64]) -> f64 {
    let n = x.len();
    if n == 0 {
        return f64::NAN;
    }
    let (_, &mut hi, _) = x.select_nth_unstable_by(n / 2, f64::total_cmp);
    if n % 2 == 1 {
        hi
    } else {
        // The largest value below position n/2.
        let lo = x[..n / 2].iter().copied().fold(f64::NEG_INFINITY, f64::max);
        0.5 * (lo + hi)
    }
}

/// 20% trimmed mean without a full sort (reorders the slice), O(n).
pub fn trimmed_mean_select(x: &mut [f64]) -> f64 {
    let n = x.len();
    let g = trim_count(n);
    if g == 0 {
        return mean(x);
    }
    x.select_nth_unstable_by(g, f64::total_cmp);
    let rest = &mut x[g..];
    let keep = n - 2 * g;
    rest.select_nth_unstable_by(keep - 1, f64::total_cmp);
    mean(&rest[..keep])
}

/// Leave-one-out values of a one-sample statistic, in the original order of `x`, in
/// O(n log n): for the mean from the total, for the median and trimmed mean from the sorted
/// data and prefix sums.
pub fn leave_one_out(kind: LooKind, x: &[f64]) -> Vec<f64> {
    let n = x.len();
    let m = n - 1;
    match kind {
        LooKind::Mean => {
            let s: f64 = x.iter().sum();
            x.iter().map(|v| (s - v) / m as f64).collect()
        }
        LooKind::Median | LooKind::TrimmedMean => {
            let mut idx: Vec<usize> = (0..n).collect();
            idx.sort_by(|&i, &j| x[i].total_cmp(&x[j]));
            let s: Vec<f64> = idx.iter().map(|&i| x[i]).collect();
            let mut prefix = vec![0.0; n + 1];
            for i in 0..n {
                prefix[i + 1] = prefix[i] + s[i];
            }
            // Element k of the sorted data without rank r.
            let at = |k: usize, r: usize| if k < r { s[k] } else { s[k + 1] };
            // Sum of elements lo..hi of the sorted data without rank r.
            let sum = |lo: usize, hi: usize, r: usize| {
                if r < lo {
                    prefix[hi + 1] - prefix[lo + 1]
                } else if r >= hi {
                    prefix[hi] - prefix[lo]
                } else {
                    prefix[hi + 1] - prefix[lo] - s[r]
                }
            };
            let mut out = vec![0.0; n];
            for (r, &i) in idx.iter().enumerate() {
                out[i] = match kind {
                    LooKind::Median => {
                        if m % 2 == 1 {
                            at(m / 2, r)
                        } else {
                            0.5 * (at(m / 2 - 1, r) + at(m / 2, r))
                        }
                    }
                    _ => {
                        let g = trim_count(m);
                        sum(g, m - g, r) / (m - 2 * g) as f64
                    }
                };
            }
            out
        }
    }
}

/// Which one-sample statistic [`leave_one_out`] computes.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum LooKind {
    Mean,
    Median,
    TrimmedMean,
}

#[cfg(test)]
mod fast_tests {
    use super::*;

    fn data(n: usize, seed: u64) -> Vec<f64> {
        let mut s =
            crate::resample::rng::Stream::new(seed, crate::resample::rng::Purpose::Bootstrap, 0);
        // Rounded so that ties occur.
        (0..n).map(|_| (s.unit() * 20.0).round() / 2.0).collect()
    }

    #[test]
    fn selection_statistics_equal_sorted_ones() {
        for n in 2..40 {
            let x = data(n, n as u64);
            let mut y = x.clone();
            assert_eq!(median_select(&mut y), median(&x), "n={n}");
            let mut y = x.clone();
            assert!(
                (trimmed_mean_select(&mut y) - trimmed_mean(&x)).abs() < 1e-12,
                "n={n}"
            );
        }
    }

    #[test]
    fn fast_leave_one_out_equals_brute_force() {
        for n in 3..30 {
            let x = data(n, 100 + n as u64);
            for (kind, f) in [
                (LooKind::Mean, mean as fn(&[f64]) -> f64),
                (LooKind::Median, median),
                (LooKind::TrimmedMean, trimmed_mean),
            ] {
                let fast = leave_one_out(kind, &x);
                for (i, got) in fast.iter().enumerate() {
                    let rest: Vec<f64> = x
                        .iter()
                        .enumerate()
                        .filter(|(k, _)| *k != i)
                        .map(|(_, v)| *v)
                        .collect();
                    assert!((got - f(&rest)).abs() < 1e-9, "{kind:?} n={n} i={i}");
                }
            }
        }
    }
}

/// Winsorized variance for the 20% trimmed mean: the g = floor(0.2 n) smallest values are
/// set to the (g+1)-th smallest and the g largest to the (g+1)-th largest, then the sample
/// variance is taken (Wilcox, "Introduction to Robust Estimation and Hypothesis Testing",
/// 3rd ed., section 3.3).
pub fn winsorized_variance(x: &[f64]) -> f64 {
    let s = sorted(x);
    let n = s.len();
    let g = trim_count(n);
    let (lo, hi) = (s[g], s[n - 1 - g]);
    let w: Vec<f64> = s.iter().map(|v| v.clamp(lo, hi)).collect();
    variance(&w)
}

/// Squared standard error of a 20% trimmed mean, (n − 1) s_w² / (h (h − 1)) with
/// h = n − 2g: Yuen's d term (Wilcox, 3rd ed., section 5.3).
pub fn trimmed_mean_se2(x: &[f64]) -> f64 {
    let n = x.len();
    let h = (n - 2 * trim_count(n)) as f64;
    (n as f64 - 1.0) * winsorized_variance(x) / (h * (h - 1.0))
}

//! Binomial draws from a prepared cumulative distribution, for the bootstrap of 0/1 data.

use crate::num::binomial::pmf_from_ratios;
use crate::resample::rng::Stream;

/// Draws Binomial(n, p) by inverting its cumulative distribution (a table prepared once).
pub struct Binomial {
    pub lo: u64,
    pub cdf: Vec<f64>,
}

impl Binomial {
    /// The distribution of the yes count when resampling `n` units of which `yes` said yes.
    pub fn new(n: u64, yes: u64) -> Binomial {
        Binomial::with_rate(n, yes as f64 / n as f64)
    }

    /// Binomial(n, p).
    pub fn with_rate(n: u64, p: f64) -> Binomial {
        if p <= 0.0 || p >= 1.0 {
            return Binomial {
                lo: if p <= 0.0 { 0 } else { n },
                cdf: vec![1.0],
            };
        }
        let sd = (n as f64 * p * (1.0 - p)).sqrt();
        // The mode, and beyond 40 standard deviations the probabilities are far below 2^-53.
        let mode = (((n + 1) as f64 * p).floor() as u64).min(n);
        let reach = (40.0 * sd + 40.0) as u64;
        let lo = mode.saturating_sub(reach);
        let hi = (mode + reach).min(n);
        let odds = p / (1.0 - p);
        let pmf = pmf_from_ratios(lo, hi, mode, |k| (n - k) as f64 / (k + 1) as f64 * odds);
        let mut acc = 0.0;
        let cdf = pmf
            .iter()
            .map(|v| {
                acc += v;
                acc
            })
            .collect();
        Binomial { lo, cdf }
    }

    #[inline]
    pub fn draw(&self, s: &mut Stream) -> u64 {
        let u = s.unit();
        let i = self
            .cdf
            .partition_point(|&c| c <= u)
            .min(self.cdf.len() - 1);
        self.lo + i as u64
    }
}

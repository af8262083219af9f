//! Summaries of a resampled distribution for its figure: an equal-width histogram and the
//! region counted toward the p-value.

use crate::base::{Alternative, Histogram, Sketch, Tail, TwoSidedRule};
use crate::resample::tally::Counts;

/// Bins of a live sketch.
pub const SKETCH_BINS: usize = 40;

/// The statistics of a run so far for a live figure: the range is fixed by the first values
/// seen (their range and the mark, widened by a quarter on each side), later values beyond
/// it fall in the end bins. Costs one comparison and one add per value.
#[derive(Clone, Debug)]
pub struct Sketcher {
    sketch: Option<Sketch>,
    mark: Option<f64>,
}

impl Sketcher {
    pub fn new(mark: Option<f64>) -> Sketcher {
        Sketcher {
            sketch: None,
            mark: mark.filter(|m| m.is_finite()),
        }
    }

    /// Adds values.
    pub fn add(&mut self, values: &[f64]) {
        if self.sketch.is_none() {
            let (mut lo, mut hi) = values
                .iter()
                .filter(|v| v.is_finite())
                .fold((f64::INFINITY, f64::NEG_INFINITY), |(l, h), &v| {
                    (l.min(v), h.max(v))
                });
            if let Some(m) = self.mark {
                lo = lo.min(m);
                hi = hi.max(m);
            }
            if !lo.is_finite() || !hi.is_finite() {
                return;
            }
            let pad = if hi > lo {
                (hi - lo) / 4.0
            } else {
                lo.abs().max(1.0) * 0.01
            };
            self.sketch = Some(Sketch {
                low: lo - pad,
                high: hi + pad,
                counts: vec![0; SKETCH_BINS],
                mark: self.mark,
            });
        }
        if let Some(sk) = self.sketch.as_mut() {
            let width = (sk.high - sk.low) / SKETCH_BINS as f64;
            for &v in values.iter().filter(|v| v.is_finite()) {
                let b = ((v - sk.low) / width)
                    .floor()
                    .clamp(0.0, (SKETCH_BINS - 1) as f64);
                sk.counts[b as usize] += 1;
            }
        }
    }

    /// The sketch so far (none before any finite value).
    pub fn get(&self) -> Option<Sketch> {
        self.sketch.clone()
    }
}

/// Equal-width histogram over the finite values, widened to include `mark` values.
pub fn histogram(values: &[f64], marks: &[f64], bins: usize) -> Histogram {
    let finite = values.iter().copied().filter(|v| v.is_finite());
    let (mut lo, mut hi) = finite
        .clone()
        .fold((f64::INFINITY, f64::NEG_INFINITY), |(l, h), v| {
            (l.min(v), h.max(v))
        });
    for &m in marks.iter().filter(|m| m.is_finite()) {
        lo = lo.min(m);
        hi = hi.max(m);
    }
    if !lo.is_finite() {
        return Histogram {
            edges: vec![],
            counts: vec![],
            weights: None,
        };
    }
    if hi - lo <= 0.0 {
        let w = if lo == 0.0 { 1.0 } else { lo.abs() * 0.01 };
        lo -= w;
        hi += w;
    }
    let mut width = (hi - lo) / bins as f64;
    let mut bins = bins;
    // Put the first mark (the observed value) on a bin edge, so that no bar straddles the
    // boundary of the region counted toward p.
    if let Some(&m) = marks.first().filter(|m| m.is_finite()) {
        let below = ((m - lo) / width).ceil();
        let start = m - below * width;
        let above = ((hi - m) / width).ceil().max(1.0);
        lo = start;
        bins = (below + above) as usize;
        hi = lo + width * bins as f64;
        width = (hi - lo) / bins as f64;
    }
    let edges: Vec<f64> = (0..=bins).map(|i| lo + width * i as f64).collect();
    let mut counts = vec![0u64; bins];
    for v in finite {
        let i = (((v - lo) / width).max(0.0) as usize).min(bins - 1);
        counts[i] += 1;
    }
    Histogram {
        edges,
        counts,
        weights: None,
    }
}

/// The part of the null distribution counted toward the p-value, for the plot: the side of
/// the observed value for a doubled tail, both sides beyond |t| for the absolute rule.
pub fn tail_region(alt: Alternative, rule: TwoSidedRule, counts: &Counts, observed: f64) -> Tail {
    let upper = Tail {
        low: None,
        high: Some(observed),
    };
    let lower = Tail {
        low: Some(observed),
        high: None,
    };
    match (alt, rule) {
        (Alternative::Greater, _) => upper,
        (Alternative::Less, _) => lower,
        (Alternative::TwoSided, TwoSidedRule::Absolute) => Tail {
            low: Some(-observed.abs()),
            high: Some(observed.abs()),
        },
        (Alternative::TwoSided, TwoSidedRule::DoubledTail) => {
            if counts.ge <= counts.le {
                upper
            } else {
                lower
            }
        }
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn histogram_puts_the_observed_value_on_an_edge() {
        let values: Vec<f64> = (0..1000).map(|i| (i as f64 * 0.37).sin()).collect();
        let h = histogram(&values, &[0.4321], 40);
        assert!(h.edges.iter().any(|e| (e - 0.4321).abs() < 1e-12));
        assert_eq!(h.counts.iter().sum::<u64>(), 1000);
        assert_eq!(h.edges.len(), h.counts.len() + 1);
        assert!(h.edges[0] <= -1.0 + 1e-9 && *h.edges.last().unwrap() >= 1.0 - 1e-9);
    }
}

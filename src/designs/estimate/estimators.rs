//! Each estimate as a function of one or two resampled samples.

use super::kinds::*;
use crate::num::stats;
use crate::num::stats::ranks;
use crate::resample::boot::BoxedStat;

fn cliffs_counts(a: &[f64], b: &mut [f64]) -> (f64, f64) {
    // (share of pairs with a > b, share with a == b)
    b.sort_unstable_by(f64::total_cmp);
    let (mut gt, mut eq) = (0usize, 0usize);
    for &x in a.iter() {
        let lo = b.partition_point(|&v| v < x);
        let hi = b.partition_point(|&v| v <= x);
        gt += lo;
        eq += hi - lo;
    }
    let total = (a.len() * b.len()) as f64;
    (gt as f64 / total, eq as f64 / total)
}

fn pearson(x: &[f64], y: &[f64]) -> f64 {
    let (mx, my) = (stats::mean(x), stats::mean(y));
    let (mut sxy, mut sxx, mut syy) = (0.0, 0.0, 0.0);
    for (a, b) in x.iter().zip(y) {
        sxy += (a - mx) * (b - my);
        sxx += (a - mx) * (a - mx);
        syy += (b - my) * (b - my);
    }
    sxy / (sxx * syy).sqrt()
}

fn slope(x: &[f64], y: &[f64]) -> f64 {
    let (mx, my) = (stats::mean(x), stats::mean(y));
    let (mut sxy, mut sxx) = (0.0, 0.0);
    for (a, b) in x.iter().zip(y) {
        sxy += (a - mx) * (b - my);
        sxx += (a - mx) * (a - mx);
    }
    sxy / sxx
}

/// The estimate as a two-slice function (second slice empty for one sample).
pub(crate) fn estimator(e: Estimate, q: f64) -> BoxedStat {
    match e {
        Estimate::Mean | Estimate::Proportion => Box::new(|a, _| stats::mean(a)),
        Estimate::Median => Box::new(|a, _| stats::median_select(a)),
        Estimate::TrimmedMean => Box::new(|a, _| stats::trimmed_mean_select(a)),
        Estimate::Sd => Box::new(|a, _| stats::sd(a)),
        Estimate::Cv => Box::new(|a, _| stats::sd(a) / stats::mean(a)),
        Estimate::Quantile => Box::new(move |a, _| {
            a.sort_unstable_by(f64::total_cmp);
            stats::quantile_sorted(a, q)
        }),
        Estimate::MeanDifference => Box::new(|a, b| stats::mean(a) - stats::mean(b)),
        Estimate::MedianDifference => {
            Box::new(|a, b| stats::median_select(a) - stats::median_select(b))
        }
        Estimate::TrimmedMeanDifference => {
            Box::new(|a, b| stats::trimmed_mean_select(a) - stats::trimmed_mean_select(b))
        }
        Estimate::MeanRatio => Box::new(|a, b| stats::mean(a) / stats::mean(b)),
        Estimate::MedianRatio => Box::new(|a, b| stats::median_select(a) / stats::median_select(b)),
        Estimate::HedgesG => Box::new(|a, b| stats::hedges_g(a, b)),
        Estimate::CliffsDelta => Box::new(|a, b| {
            let (gt, eq) = cliffs_counts(a, b);
            gt - (1.0 - gt - eq)
        }),
        Estimate::Superiority => Box::new(|a, b| {
            let (gt, eq) = cliffs_counts(a, b);
            gt + 0.5 * eq
        }),
        Estimate::Pearson => Box::new(|x, y| pearson(x, y)),
        Estimate::Spearman => Box::new(|x, y| pearson(&ranks(x), &ranks(y))),
        Estimate::Slope => Box::new(|x, y| slope(x, y)),
    }
}

/// A standard-error formula for the studentized interval, where one exists.
pub(crate) fn se_formula(e: Estimate, paired: bool) -> Option<BoxedStat> {
    match e {
        Estimate::Mean | Estimate::Proportion => Some(Box::new(|a, _| {
            (stats::variance(a) / a.len() as f64).sqrt()
        })),
        Estimate::TrimmedMean => Some(Box::new(|a, _| stats::trimmed_mean_se2(a).sqrt())),
        Estimate::MeanDifference if paired => Some(Box::new(|a, b| {
            let d: Vec<f64> = a.iter().zip(b.iter()).map(|(x, y)| x - y).collect();
            (stats::variance(&d) / d.len() as f64).sqrt()
        })),
        Estimate::MeanDifference => Some(Box::new(|a, b| {
            (stats::variance(a) / a.len() as f64 + stats::variance(b) / b.len() as f64).sqrt()
        })),
        Estimate::TrimmedMeanDifference if !paired => Some(Box::new(|a, b| {
            (stats::trimmed_mean_se2(a) + stats::trimmed_mean_se2(b)).sqrt()
        })),
        Estimate::Slope => Some(Box::new(|x, y| {
            let n = x.len() as f64;
            let b = slope(x, y);
            let (mx, my) = (stats::mean(x), stats::mean(y));
            let sxx: f64 = x.iter().map(|v| (v - mx) * (v - mx)).sum();
            let rss: f64 = x
                .iter()
                .zip(y.iter())
                .map(|(a, c)| {
                    let r = c - my - b * (a - mx);
                    r * r
                })
                .sum();
            (rss / (n - 2.0) / sxx).sqrt()
        })),
        _ => None,
    }
}

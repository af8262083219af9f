//! Coverage study of the bootstrap intervals for a mean (fixed seed, deterministic).
//!
//! For normal and for exponential samples of n = 15 and n = 60, the share of nominal 95%
//! intervals that contain the true mean, per method. 1,000 replications per setting give a
//! Monte Carlo standard error of about 0.7% for a coverage near 95%. Only what the literature
//! supports is asserted: for small skewed samples the percentile interval under-covers, the
//! studentized interval comes closer to 95%, and BCa is no worse than percentile
//! (Efron & Tibshirani 1993, ch. 12–14; Hesterberg 2015, "What teachers should know about the
//! bootstrap", The American Statistician 69(4) — figure numbers from memory). The table is
//! printed (cargo test -- --show-output).

use reshuffle::base::IntervalMethod;
use reshuffle::designs::estimate::{run, Estimate, EstimateLayout, EstimateRequest};
use reshuffle::resample::rng::{Purpose, Stream};

const REPS: usize = 1000;
const BOOT: u64 = 999;

fn sample(s: &mut Stream, n: usize, skewed: bool) -> Vec<f64> {
    (0..n)
        .map(|_| {
            if skewed {
                -(1.0 - s.unit()).ln()
            } else {
                // Box–Muller
                let (u, v) = (1.0 - s.unit(), s.unit());
                (-2.0 * u.ln()).sqrt() * (2.0 * std::f64::consts::PI * v).cos()
            }
        })
        .collect()
}

fn coverage(n: usize, skewed: bool) -> Vec<f64> {
    let truth = if skewed { 1.0 } else { 0.0 };
    let mut s = Stream::new(2026, Purpose::Permutation, (n as u64) * 2 + skewed as u64);
    let mut hits = [0usize; 5];
    for rep in 0..REPS {
        let x = sample(&mut s, n, skewed);
        let data: String = std::iter::once("x".to_string())
            .chain(x.iter().map(|v| format!("{v:?}")))
            .collect::<Vec<_>>()
            .join("\n");
        let mut r = EstimateRequest::new(
            data,
            EstimateLayout::One {
                value: "x".into(),
                strata: None,
            },
            Estimate::Mean,
            rep as u64,
        );
        r.resamples = BOOT;
        r.methods = IntervalMethod::ALL.to_vec();
        let out = run(&r, &mut |_| true).unwrap();
        for (k, iv) in out.intervals.iter().enumerate() {
            if let (Some(l), Some(h)) = (iv.low, iv.high) {
                if l <= truth && truth <= h {
                    hits[k] += 1;
                }
            }
        }
    }
    hits.iter().map(|&h| h as f64 / REPS as f64).collect()
}

#[test]
fn coverage_of_95_percent_intervals_for_a_mean() {
    let names: Vec<&str> = IntervalMethod::ALL.iter().map(|m| m.key()).collect();
    let idx = |k: &str| names.iter().position(|n| *n == k).unwrap();
    println!("coverage of nominal 95% intervals for the mean, {REPS} replications, {BOOT} resamples each");
    println!(
        "{:<18} {}",
        "sample",
        names.iter().map(|n| format!("{n:>12}")).collect::<String>()
    );
    let mut table = Vec::new();
    for (skewed, n) in [(false, 15), (false, 60), (true, 15), (true, 60)] {
        let c = coverage(n, skewed);
        let label = format!("{} n={n}", if skewed { "exponential" } else { "normal" });
        println!(
            "{label:<18} {}",
            c.iter().map(|v| format!("{:>12.3}", v)).collect::<String>()
        );
        table.push((skewed, n, c));
    }
    let gap = |c: &[f64], k: &str| (c[idx(k)] - 0.95).abs();
    let (_, _, exp15) = &table[2];
    // Small skewed samples: percentile under-covers; BCa and studentized do better.
    assert!(exp15[idx("percentile")] < 0.935, "{exp15:?}");
    assert!(
        gap(exp15, "studentized") < gap(exp15, "percentile"),
        "{exp15:?}"
    );
    // BCa's gain over the percentile interval for the mean of a small skewed sample is
    // small in published studies (Hesterberg 2015, fig. 21), so only "not worse beyond
    // Monte Carlo noise" is asserted; paired on the same samples, 0.5 points is ample.
    assert!(
        gap(exp15, "bca") <= gap(exp15, "percentile") + 0.005,
        "{exp15:?}"
    );
    // Normal samples of 60: every method within 3 points of 95% (about 4 Monte Carlo SEs).
    let (_, _, norm60) = &table[1];
    for (k, v) in norm60.iter().enumerate() {
        assert!((v - 0.95).abs() < 0.03, "{}: {v}", names[k]);
    }
}

//! `reshuffle bench`: the speed of the relabelling kernels, as ratios measured in one run.

use crate::base::format as fmt;
use crate::base::Error;
use crate::resample::rng;
use crate::resample::two_groups::{self as perm, Statistic};

/// Speed of the relabelling kernels, side by side in one run (ratios, not absolute targets).
pub fn run(out: &mut dyn std::io::Write) -> Result<(), Error> {
    use std::time::Instant;
    let mut s = rng::Stream::new(1, rng::Purpose::Permutation, 0);
    let a: Vec<f64> = (0..24).map(|_| 10.0 + s.unit() * 3.0).collect();
    let b: Vec<f64> = (0..20).map(|_| 9.5 + s.unit() * 3.0).collect();
    let total: u64 = 1_000_000;
    let mut lines = Vec::new();
    let mut rates = Vec::new();
    for st in [
        Statistic::MeanDifference,
        Statistic::WelchT,
        Statistic::MedianDifference,
    ] {
        let setup = perm::Setup::new(st, &a, &b);
        let t0 = Instant::now();
        let (c, _) =
            perm::random_blocks(&setup, 7, total, 0..rng::block_count(total), &mut |_| true)?;
        let secs = t0.elapsed().as_secs_f64();
        rates.push(c.total as f64 / secs);
        lines.push(format!(
            "{:<28} {:>14.0} relabellings/s",
            format!("kernel, {}", st.key()),
            c.total as f64 / secs
        ));
    }
    // Baseline: shuffle all 44 values and recompute both means, per relabelling.
    let pooled: Vec<f64> = a.iter().chain(&b).copied().collect();
    let t0 = Instant::now();
    let mut x = pooled.clone();
    let mut acc = 0.0;
    let mut st = rng::Stream::new(7, rng::Purpose::Permutation, 0);
    // Like the kernel, it keeps every statistic and counts the extreme ones.
    let mut kept = Vec::with_capacity(total as usize);
    let mut extreme = 0u64;
    for _ in 0..total {
        for i in (1..x.len()).rev() {
            let j = st.below(i as u64 + 1) as usize;
            x.swap(i, j);
        }
        let m1 = x[..24].iter().sum::<f64>() / 24.0;
        let m2 = x[24..].iter().sum::<f64>() / 20.0;
        let t = m1 - m2;
        extreme += u64::from(t.abs() >= 0.25);
        kept.push(t);
        acc += t;
    }
    acc += extreme as f64 * 0.0 + kept.len() as f64 * 0.0;
    let base = total as f64 / t0.elapsed().as_secs_f64();
    lines.push(format!(
        "{:<28} {:>14.0} relabellings/s   (checksum {:.3})",
        "full shuffle, mean (baseline)",
        base,
        acc / total as f64
    ));
    // Exact enumeration rate: C(20, 10) = 184,756 splits.
    let setup = perm::Setup::new(Statistic::MeanDifference, &a[..10], &b[..10]);
    let t0 = Instant::now();
    let (c, _) = setup
        .enumerate(u64::MAX, &mut |_| true)
        .ok_or_else(Error::cancelled)?;
    let exact = c.total as f64 / t0.elapsed().as_secs_f64();
    lines.push(format!(
        "{:<28} {:>14.0} splits/s",
        "enumeration, mean-difference", exact
    ));
    writeln!(
        out,
        "n = 24 + 20, {} relabellings per kernel\n",
        fmt::count(total)
    )
    .map_err(super::io)?;
    for l in lines {
        writeln!(out, "{l}").map_err(super::io)?;
    }
    writeln!(
        out,
        "\nratio, partial-shuffle mean kernel / full-shuffle baseline: {:.2}",
        rates[0] / base
    )
    .map_err(super::io)?;
    Ok(())
}

//! `reshuffle bench`: speed as ratios measured side by side in one run (kernel against a
//! bare loop of the same draws, all threads against one), never as absolute targets. The
//! script `tests/bench/against_scipy.py` adds Reshuffle against scipy.stats on the same work.

use std::hint::black_box;
use std::time::Instant;

use crate::base::format as fmt;
use crate::base::Error;
use crate::designs::estimate::{self, Estimate, EstimateLayout, EstimateRequest};
use crate::designs::two_groups::{self, TwoGroupsRequest};
use crate::resample::parallel;
use crate::resample::rng::{self, Stream};
use crate::resample::two_groups::{self as perm, Statistic};

/// Values drawn from a fixed stream, so that every run benchmarks the same numbers.
fn values(n: usize, centre: f64, stream: &mut Stream) -> Vec<f64> {
    (0..n).map(|_| centre + stream.unit() * 3.0).collect()
}

fn csv_two(a: &[f64], b: &[f64]) -> String {
    let mut t = String::from("y,g\n");
    for v in a {
        t.push_str(&format!("{v},a\n"));
    }
    for v in b {
        t.push_str(&format!("{v},b\n"));
    }
    t
}

/// The best of `reps` timings of `f`, in seconds (the least disturbed by other work).
fn best(reps: usize, f: &mut dyn FnMut()) -> f64 {
    (0..reps)
        .map(|_| {
            let t0 = Instant::now();
            f();
            t0.elapsed().as_secs_f64()
        })
        .fold(f64::INFINITY, f64::min)
}

/// The bare loop the mean-difference kernel is held against: per relabelling the same k
/// bounded draws, swaps and adds of a partial Fisher–Yates shuffle, and nothing else (no
/// statistic, no counting, no keeping).
fn bare_loop(pool: &[f64], k: usize, total: u64) -> f64 {
    let mut vals = pool.to_vec();
    let n = vals.len();
    let mut checksum = 0.0;
    let mut s = Stream::new(7, rng::Purpose::Permutation, 0);
    for _ in 0..total {
        let mut sum = 0.0;
        for i in 0..k {
            let j = i + s.below((n - i) as u64) as usize;
            vals.swap(i, j);
            sum += vals[i];
        }
        checksum += black_box(sum);
    }
    checksum
}

/// Large samples, one thread: the partial shuffle and the index-drawing bootstrap (kernel
/// generation 1) against the streaming kernels (generation 2), and both against a plain sum
/// over the same values (the speed of reading them from memory).
fn large_samples(lines: &mut Vec<String>) {
    use crate::resample::boot;
    use crate::resample::large_boot::Weights;
    let n = 1_000_000;
    let mut s = Stream::new(3, rng::Purpose::Permutation, 0);
    let a = values(n, 10.0, &mut s);
    let b = values(n, 10.1, &mut s);
    parallel::set_threads(1);
    lines.push(format!(
        "Large samples on one thread, {} + {} values, time per resample",
        fmt::count(n as u64),
        fmt::count(n as u64)
    ));
    // Four running sums, so that the adds keep pace with reading memory.
    let sum4 = |x: &[f64]| {
        let mut acc = [0.0f64; 4];
        for q in x.chunks_exact(4) {
            for l in 0..4 {
                acc[l] += q[l];
            }
        }
        acc.iter().sum::<f64>()
    };
    let plain = best(3, &mut || {
        black_box(sum4(&a) + sum4(&b));
    });
    lines.push(format!(
        "  {:<44} {:>8.2} ms",
        "plain sum over the values (reading them once)",
        plain * 1e3
    ));
    let rows: [(&str, u32, u64); 2] = [
        ("relabelling, partial shuffle (generation 1)", 1, 4),
        ("relabelling, streaming (generation 2)", 2, 64),
    ];
    for (name, kernels, len) in rows {
        let setup = perm::Setup::for_run(Statistic::MeanDifference, &a, &b, kernels, 0);
        let secs = best(3, &mut || {
            black_box(setup.random_block(Stream::new(7, rng::Purpose::Permutation, 0), len));
        }) / len as f64;
        lines.push(format!(
            "  {:<44} {:>8.2} ms   {:.2}× the plain sum",
            name,
            secs * 1e3,
            secs / plain
        ));
    }
    let mean_diff =
        |x: &mut [f64], y: &mut [f64]| crate::num::stats::mean(x) - crate::num::stats::mean(y);
    let stat = boot::Stat {
        f: &mean_diff,
        estimate: 0.0,
        se: boot::SeMethod::None,
    };
    let design = boot::Design::Two { a: &a, b: &b };
    let drawn = best(2, &mut || {
        black_box(boot::block(
            &design,
            &[stat],
            Stream::new(7, rng::Purpose::Bootstrap, 0),
            4,
        ));
    }) / 4.0;
    let (mut wa, mut wb) = (Weights::new(n), Weights::new(n));
    let counted = best(3, &mut || {
        let mut st = Stream::new(7, rng::Purpose::Bootstrap, 0);
        for _ in 0..16 {
            wa.draw(&a, &mut st);
            wb.draw(&b, &mut st);
            black_box(wa.sum() / n as f64 - wb.sum() / n as f64);
        }
    }) / 16.0;
    for (name, secs) in [
        ("bootstrap, drawn positions (generation 1)", drawn),
        ("bootstrap, Poisson counts (generation 2)", counted),
    ] {
        lines.push(format!(
            "  {:<44} {:>8.2} ms   {:.2}× the plain sum",
            name,
            secs * 1e3,
            secs / plain
        ));
    }
    parallel::set_threads(0);
}

/// Speed, side by side in one run.
pub fn run(out: &mut dyn std::io::Write) -> Result<(), Error> {
    let mut lines: Vec<String> = Vec::new();
    let mut s = Stream::new(1, rng::Purpose::Permutation, 0);
    let a = values(24, 10.0, &mut s);
    let b = values(20, 9.5, &mut s);
    let total: u64 = 1_000_000;
    let cores = parallel::threads();

    // 1. Kernels against the bare loop, on one thread.
    parallel::set_threads(1);
    let pool: Vec<f64> = a.iter().chain(&b).copied().collect();
    let bare = best(3, &mut || {
        black_box(bare_loop(&pool, 20, total));
    });
    lines.push(format!(
        "Kernels on one thread, 24 + 20 values, {} random relabellings",
        fmt::count(total)
    ));
    lines.push(format!(
        "  {:<44} {:>8.1} M/s",
        "bare loop (the same draws and adds only)",
        total as f64 / bare / 1e6
    ));
    for st in [
        Statistic::MeanDifference,
        Statistic::WelchT,
        Statistic::MedianDifference,
        Statistic::TrimmedMeanDifference,
    ] {
        let setup = perm::Setup::new(st, &a, &b);
        let secs = best(3, &mut || {
            let r =
                perm::random_blocks(&setup, 7, total, 0..rng::block_count(total), &mut |_| true);
            black_box(r.ok());
        });
        lines.push(format!(
            "  {:<44} {:>8.1} M/s   {:.2}× the bare loop",
            format!("{} kernel", st.key()),
            total as f64 / secs / 1e6,
            bare / secs
        ));
    }
    // 2. Exact enumeration: C(24, 12) = 2,704,156 splits.
    let setup = perm::Setup::new(Statistic::MeanDifference, &a[..12], &b[..12]);
    let mut splits = 0;
    let secs = best(3, &mut || {
        if let Some((c, v)) = setup.enumerate(u64::MAX, &mut |_| true) {
            splits = c.total;
            black_box(v);
        }
    });
    lines.push(format!(
        "  {:<44} {:>8.1} M/s",
        format!("exact enumeration, {} splits", fmt::count(splits)),
        splits as f64 / secs / 1e6
    ));

    // 3. All threads against one, end to end (the request as the command runs it).
    let test_job = {
        let mut r = TwoGroupsRequest::new(csv_two(&a, &b), 7);
        r.settings.exact_limit = 0;
        r.settings.resamples = total;
        r.settings.bootstrap_resamples = 1000;
        r
    };
    let mut big = Stream::new(2, rng::Purpose::Permutation, 0);
    let one_col: String = std::iter::once("y\n".to_string())
        .chain(values(1000, 5.0, &mut big).iter().map(|v| format!("{v}\n")))
        .collect();
    let mut bca_job = EstimateRequest::new(
        one_col,
        EstimateLayout::One {
            value: "y".into(),
            strata: None,
        },
        Estimate::Mean,
        7,
    );
    bca_job.resamples = 100_000;
    lines.push(String::new());
    lines.push(format!(
        "End to end, all {cores} threads against one (the numbers are identical)"
    ));
    let jobs: [(&str, &mut dyn FnMut()); 2] = [
        ("10^6 relabellings, 24 + 20 values", &mut || {
            black_box(two_groups::run(&test_job, &mut |_| true).ok());
        }),
        (
            "BCa interval of a mean, n = 1000, 10^5 resamples",
            &mut || {
                black_box(estimate::run(&bca_job, &mut |_| true).ok());
            },
        ),
    ];
    for (name, f) in jobs {
        parallel::set_threads(1);
        let one = best(3, f);
        parallel::set_threads(cores);
        let all = best(3, f);
        lines.push(format!(
            "  {name:<50} 1 thread {one:>7.3} s, {cores} threads {all:>7.3} s: {:.2}×",
            one / all
        ));
    }
    parallel::set_threads(0);
    lines.push(String::new());
    large_samples(&mut lines);
    for l in lines {
        writeln!(out, "{l}").map_err(super::io)?;
    }
    Ok(())
}

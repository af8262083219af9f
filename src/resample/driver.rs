//! The one driver for exact-or-random null distributions: every relabelling when there are
//! few enough, otherwise random ones in blocks of the seed's streams.

use serde::{Deserialize, Serialize};

use crate::base::{Alternative, Error, Progress, ProgressFn, Running, Stage, TwoSidedRule};
use crate::resample::parallel;
use crate::resample::rng::{self, Stream};
use crate::resample::share::Rounds;
use crate::resample::tally::Counts;

/// The most resampled statistics a report carries.
pub const MAX_KEPT: usize = 1_000_000;

/// A kernel's random block: the counts and statistics of `len` relabellings drawn from one
/// stream. Shared by the threads, so it only reads the kernel's prepared data.
pub type RandomBlock<'a> = &'a (dyn Fn(Stream, u64) -> (Counts, Vec<f64>) + Sync);

/// Runs `total` random relabellings in blocks of [`rng::BLOCK`], block b drawing from the
/// stream (seed, permutation, b), on the run's threads ([`parallel::in_order`]); merges the
/// blocks in order, reporting progress after each.
pub fn random_null(
    seed: u64,
    total: u64,
    stage: Stage,
    progress: ProgressFn,
    block: RandomBlock,
) -> Result<(Counts, Vec<f64>), Error> {
    let (c, v, _) = random_range(
        seed,
        total,
        0..rng::block_count(total),
        None,
        stage,
        progress,
        block,
    )?;
    Ok((c, v))
}

/// Which count a sequential stop watches: the one the p-value is made from.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum StopTail {
    /// T ≥ t (greater, and the k-group spreads).
    Ge,
    /// T ≤ t.
    Le,
    /// |T| ≥ |t| (two-sided by absolute value).
    AbsGe,
}

/// The chance, over all the checks of a run, that a settling rule puts the p-value on the
/// wrong side of its level: [`Stop::settle`] spends SETTLE_RISK / (c(c + 1)) at the c-th
/// check, and these add up to SETTLE_RISK.
pub const SETTLE_RISK: f64 = 1e-3;

/// Sequential Monte Carlo rules for random relabellings: stop once `after` relabellings are
/// at least as extreme as the observed one (Besag and Clifford 1991, "Sequential Monte Carlo
/// p-values", Biometrika 78(2)), or once the p-value is settled below or above the level
/// `settle` (checked after each block), or when all of the resamples asked for are drawn.
#[derive(Clone, Copy, Debug)]
pub struct Stop {
    pub after: Option<u64>,
    pub settle: Option<f64>,
    pub tail: StopTail,
    /// The test's direction and two-sided rule (for the running p-value).
    pub alternative: Alternative,
    pub rule: TwoSidedRule,
    /// The observed statistic and the kernel's tie tolerance (the counts' comparisons).
    pub observed: f64,
    pub tolerance: f64,
}

impl Stop {
    /// The rules for a test in `alternative`'s direction with `rule` for two sides; with
    /// neither rule the run only reports its running p-value.
    pub fn new(
        after: Option<u64>,
        settle: Option<f64>,
        alternative: Alternative,
        rule: TwoSidedRule,
        observed: f64,
        tolerance: f64,
    ) -> Stop {
        Stop {
            after,
            settle,
            alternative,
            rule,
            tail: match alternative {
                Alternative::Greater => StopTail::Ge,
                Alternative::Less => StopTail::Le,
                Alternative::TwoSided => StopTail::AbsGe,
            },
            observed,
            tolerance,
        }
    }

    /// Whether a stopping rule is on (not only the running p-value).
    pub fn is_rule(&self) -> bool {
        self.after.is_some() || self.settle.is_some()
    }

    /// The p-value so far.
    fn running(&self, c: &Counts) -> Running {
        let pr = crate::resample::tally::p_value(c, false, self.alternative, self.rule);
        let (low, high) = pr.interval.map_or((0.0, 1.0), |i| (i.low, i.high));
        Running {
            extreme: pr.extreme,
            p: pr.p,
            low,
            high,
        }
    }

    fn extreme(&self, c: &Counts) -> u64 {
        match self.tail {
            StopTail::Ge => c.ge,
            StopTail::Le => c.le,
            StopTail::AbsGe => c.abs_ge,
        }
    }
}

/// Which side of the level a settled p-value is on.
#[derive(Clone, Copy, Debug, PartialEq, Eq, Serialize, Deserialize)]
#[serde(rename_all = "kebab-case")]
pub enum Side {
    Below,
    Above,
}

/// Whether `b` extreme relabellings in `m` settle the p-value below or above `level` at the
/// c-th check (c ≥ 1): below when P(X ≤ b) < ε_c/2 for X ~ Binomial(m, level), above when
/// P(X ≥ b) < ε_c/2, with ε_c = SETTLE_RISK / (c(c + 1)). Each is the one-sided
/// Clopper–Pearson bound at ε_c/2 lying beyond the level, so by the union bound the chance
/// that any check of a run settles on the wrong side is at most SETTLE_RISK (a
/// Bonferroni-spent form of the procedures in Gandy 2009, JASA 104(488)). The binomial
/// probabilities come from the ratios of successive terms (only +, ×, ÷), so the decision is
/// the same on every machine.
pub fn settle_check(b: u64, m: u64, level: f64, c: u64) -> Option<Side> {
    settle_check_with(b, m, level, c, SETTLE_RISK)
}

/// [`settle_check`] with another total risk (for tests of the rule's guarantee).
pub fn settle_check_with(b: u64, m: u64, level: f64, c: u64, risk: f64) -> Option<Side> {
    if m == 0 || c == 0 || !(level > 0.0 && level < 1.0) {
        return None;
    }
    let eps = risk / (c as f64 * (c as f64 + 1.0)) / 2.0;
    let odds = level / (1.0 - level);
    let mode = (((m + 1) as f64 * level).floor() as u64).min(m);
    let (start, p) =
        crate::num::binomial::pmf_window(0, m, mode, |x| (m - x) as f64 / (x + 1) as f64 * odds);
    let end = start + p.len() as u64;
    // P(X ≤ b) and P(X ≥ b) over the window (terms outside it are below 1e-300 of the mode's).
    let below: f64 = if b < start {
        0.0
    } else {
        p[..((b.min(end - 1) - start) as usize + 1)].iter().sum()
    };
    let above: f64 = if b >= end {
        0.0
    } else {
        p[(b.max(start) - start) as usize..].iter().sum()
    };
    if below < eps {
        Some(Side::Below)
    } else if above < eps {
        Some(Side::Above)
    } else {
        None
    }
}

/// How a sequential run ended, for the report.
#[derive(Clone, Copy, Debug, PartialEq, Serialize, Deserialize)]
pub struct Stopped {
    /// The number of relabellings at least as extreme that stops the run (if that rule is on).
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub after: Option<u64>,
    /// The level the p-value is settled against (if that rule is on).
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub settle: Option<f64>,
    /// The most relabellings the run would draw.
    pub limit: u64,
    /// Whether it stopped before the limit.
    pub early: bool,
    /// Why it stopped early: the p-value was settled on this side of the level (none: the
    /// count was reached, then p = after / drawn, or it did not stop early).
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub settled: Option<Side>,
}

/// How a random run ended early.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum Ended {
    /// The count of extreme relabellings reached `after`.
    Count,
    /// The p-value was settled on this side of the level.
    Settled(Side),
}

/// [`random_null`] over the blocks `blocks` only: any partition of the blocks into ranges,
/// merged in order, gives the same counts and statistics as the whole. With a `stop`, the
/// run ends at the relabelling that brings the watched count to `stop.after`, or after the
/// block whose end settles the p-value; both are found after the blocks are merged in order
/// (the settling checks count the blocks from the first of the run, `blocks.start` = 0), so
/// the point does not depend on the threads.
pub fn random_range(
    seed: u64,
    total: u64,
    blocks: std::ops::Range<u64>,
    stop: Option<Stop>,
    stage: Stage,
    progress: ProgressFn,
    block: RandomBlock,
) -> Result<(Counts, Vec<f64>, Option<Ended>), Error> {
    random_range_in(
        rng::BLOCK,
        seed,
        total,
        blocks,
        stop,
        stage,
        progress,
        block,
    )
}

/// [`random_range`] in blocks of `size` relabellings (a divisor of [`rng::BLOCK`]); the
/// settling checks still come after every [`rng::BLOCK`] relabellings of the run.
#[allow(clippy::too_many_arguments)]
pub fn random_range_in(
    size: u64,
    seed: u64,
    total: u64,
    blocks: std::ops::Range<u64>,
    stop: Option<Stop>,
    stage: Stage,
    progress: ProgressFn,
    block: RandomBlock,
) -> Result<(Counts, Vec<f64>, Option<Ended>), Error> {
    debug_assert!(size > 0 && rng::BLOCK % size == 0);
    let mut counts = Counts::default();
    let len = (blocks.end - blocks.start).saturating_mul(size).min(total);
    let mut values = Vec::with_capacity(len.min(MAX_KEPT as u64) as usize);
    let first = blocks.start;
    let streams = rng::streams_for(seed, rng::Purpose::Permutation, first, blocks.end - first);
    let work = |i: u64| {
        block(
            streams[i as usize].clone(),
            rng::block_len_of(total, first + i, size),
        )
    };
    let mut ended = None;
    // The statistics so far for a live figure, marked at the observed one.
    let mut sketcher = crate::resample::summary::Sketcher::new(stop.map(|st| st.observed));
    let mut sketched = 0;
    // Shared among workers, a run that may stop early goes in rounds of one settling check's
    // worth of relabellings, doubling.
    let rounds = match stop.filter(Stop::is_rule) {
        Some(_) => Rounds::Doubling(rng::BLOCK / size),
        None => Rounds::All,
    };
    let described = |done: u64| Progress {
        stage: stage.clone(),
        done: ((first + done) * size).min(total),
        total,
        running: None,
        sketch: None,
    };
    let finished = parallel::in_order(
        blocks.end - first,
        rounds,
        &work,
        &mut |i, (c, v)| {
            let count_stop = stop.and_then(|st| st.after.map(|after| (st, after)));
            match count_stop {
                Some((st, after)) if st.extreme(&counts) + st.extreme(&c) >= after => {
                    // The relabelling that reaches the count ends the run.
                    for t in v {
                        counts.record(t, st.observed, st.tolerance);
                        values.push(t);
                        if st.extreme(&counts) >= after {
                            break;
                        }
                    }
                    if counts.total < total {
                        ended = Some(Ended::Count);
                    }
                }
                _ => {
                    counts.add(&c);
                    values.extend(v);
                }
            }
            if let Some((st, level)) = stop.and_then(|st| st.settle.map(|l| (st, l))) {
                let drawn = ((first + i + 1) * size).min(total);
                if ended.is_none() && counts.total < total && drawn % rng::BLOCK == 0 {
                    let check = drawn / rng::BLOCK;
                    if let Some(side) =
                        settle_check(st.extreme(&counts), counts.total, level, check)
                    {
                        ended = Some(Ended::Settled(side));
                    }
                }
            }
            sketcher.add(&values[sketched..]);
            sketched = values.len();
            let go_on = progress(&Progress {
                stage: stage.clone(),
                done: counts.total,
                total,
                running: stop
                    .filter(|_| counts.total > 0)
                    .map(|st| st.running(&counts)),
                sketch: sketcher.get(),
            });
            if ended.is_some() {
                return false;
            }
            go_on
        },
        &described,
    );
    if !finished && ended.is_none() {
        return Err(Error::cancelled());
    }
    Ok((counts, values, ended))
}

/// How a design's null distribution is made: every relabelling when there are `count` of
/// them and that is at most `exact_limit`, otherwise `resamples` random ones from `seed`.
pub struct Relabelling {
    pub count: u64,
    pub exact_limit: u64,
    pub resamples: u64,
    pub seed: u64,
    /// What the progress display calls the work.
    pub stage: Stage,
    /// A sequential stop for the random relabellings (none: draw all of them).
    pub stop: Option<Stop>,
    /// Random relabellings per block ([`rng::BLOCK`], or [`rng::LARGE_BLOCK`] for the
    /// streaming kernels).
    pub block: u64,
}

/// A null distribution: the counts and statistics of the relabellings, whether they are all
/// of them, and how a sequential run ended.
pub struct Null {
    pub counts: Counts,
    pub values: Vec<f64>,
    pub exact: bool,
    pub stopped: Option<Stopped>,
}

/// Enumerates every relabelling, calling its argument with the number done now and then
/// (false stops it: then None).
pub type Enumerate<'a> =
    &'a mut dyn FnMut(&mut dyn FnMut(u64) -> bool) -> Option<(Counts, Vec<f64>)>;

impl Relabelling {
    /// The counts and statistics of the relabellings, and whether they are all of them.
    pub fn run(
        &self,
        progress: ProgressFn,
        enumerate: Enumerate,
        random: RandomBlock,
    ) -> Result<Null, Error> {
        if self.count <= self.exact_limit {
            let mut cb = |done: u64| {
                progress(&Progress {
                    stage: self.stage.clone(),
                    done,
                    total: self.count,
                    running: None,
                    sketch: None,
                })
            };
            let (counts, values) = enumerate(&mut cb).ok_or(Error::cancelled())?;
            Ok(Null {
                counts,
                values,
                exact: true,
                stopped: None,
            })
        } else {
            let total = self.resamples;
            let (counts, values, ended) = random_range_in(
                self.block,
                self.seed,
                total,
                0..rng::block_count_of(total, self.block),
                self.stop,
                self.stage.clone(),
                progress,
                random,
            )?;
            Ok(Null {
                counts,
                values,
                exact: false,
                stopped: self.stop.filter(Stop::is_rule).map(|s| Stopped {
                    after: s.after,
                    settle: s.settle,
                    limit: total,
                    early: ended.is_some(),
                    settled: match ended {
                        Some(Ended::Settled(side)) => Some(side),
                        _ => None,
                    },
                }),
            })
        }
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::resample::two_groups::{Setup, Statistic};

    /// A whole random run of `total` mean-difference relabellings of `setup` from `seed`.
    fn run(
        setup: &Setup,
        seed: u64,
        total: u64,
        stop: Option<Stop>,
    ) -> (Counts, Vec<f64>, Option<Ended>) {
        let block = |s, len| setup.random_block(s, len);
        random_range(
            seed,
            total,
            0..rng::block_count(total),
            stop,
            Stage::Relabelling,
            &mut |_| true,
            &block,
        )
        .expect("no cancel")
    }

    /// The rules `after` and `settle` for a two-sided test of `setup`'s statistic.
    fn rules(setup: &Setup, after: Option<u64>, settle: Option<f64>) -> Stop {
        Stop::new(
            after,
            settle,
            Alternative::TwoSided,
            TwoSidedRule::Absolute,
            setup.observed,
            setup.tolerance,
        )
    }

    /// The sequential stop ends at the relabelling that brings the count to h, found here
    /// independently by scanning the statistics of a run of all of them (the definition in
    /// Besag and Clifford 1991), and the result is the same on 1, 2 and 3 threads.
    #[test]
    fn a_sequential_run_stops_where_the_definition_says() {
        let a = [4.1, 5.0, 3.9, 6.2, 5.5, 4.8, 5.1, 4.4];
        let b = [4.0, 4.6, 3.1, 5.2, 4.9, 3.8, 4.3, 4.5];
        let setup = Setup::new(Statistic::MeanDifference, &a, &b);
        let total = 50_000;
        let (all, values, _) = run(&setup, 9, total, None);
        assert_eq!(all.total, total);
        for h in [1, 7, 40] {
            let stop = rules(&setup, Some(h), None);
            // The definition: the first L with h statistics at least as extreme among the
            // first L.
            let mut c = Counts::default();
            let mut want = None;
            for (i, t) in values.iter().enumerate() {
                c.record(*t, setup.observed, setup.tolerance);
                if c.abs_ge == h {
                    want = Some(i as u64 + 1);
                    break;
                }
            }
            let want = want.expect("reached h");
            for threads in [1, 2, 3] {
                parallel::set_threads(threads);
                let (got, vals, ended) = run(&setup, 9, total, Some(stop));
                assert_eq!(ended, Some(Ended::Count));
                assert_eq!(
                    (got.total, got.abs_ge),
                    (want, h),
                    "h = {h}, {threads} threads"
                );
                assert_eq!(vals[..], values[..want as usize]);
            }
        }
        parallel::set_threads(0);
    }

    /// The decision against the binomial tails computed by statrs (a general-purpose
    /// library; statrs 0.19 `Binomial::cdf`/`sf`), on every count b of runs of several sizes,
    /// levels and check numbers; counts whose tail lies within 1e-9 (relative) of the
    /// threshold are skipped, as the two computations may round differently there.
    #[test]
    fn settling_agrees_with_the_binomial_tails_of_statrs() {
        use statrs::distribution::{Binomial, DiscreteCDF};
        let mut decided = [0u32; 2];
        for &m in &[50u64, 4096, 3 * 4096, 40_000, 250_000] {
            for &level in &[0.0001, 0.01, 0.05, 0.2, 0.5] {
                for &c in &[1u64, 3, 30] {
                    let eps = SETTLE_RISK / (c as f64 * (c as f64 + 1.0)) / 2.0;
                    let d = Binomial::new(level, m).unwrap();
                    let step = (m / 400).max(1);
                    for b in (0..=m).step_by(step as usize) {
                        let below = d.cdf(b);
                        let above = if b == 0 { 1.0 } else { d.sf(b - 1) };
                        let near = |x: f64| (x - eps).abs() <= 1e-9 * eps;
                        if near(below) || near(above) {
                            continue;
                        }
                        let want = if below < eps {
                            Some(Side::Below)
                        } else if above < eps {
                            Some(Side::Above)
                        } else {
                            None
                        };
                        let got = settle_check(b, m, level, c);
                        assert_eq!(got, want, "b = {b}, m = {m}, level = {level}, c = {c}");
                        match got {
                            Some(Side::Below) => decided[0] += 1,
                            Some(Side::Above) => decided[1] += 1,
                            None => {}
                        }
                    }
                }
            }
        }
        // Both decisions were exercised.
        assert!(decided[0] > 100 && decided[1] > 100, "{decided:?}");
    }

    /// The rule's guarantee, simulated with a larger total risk (0.1) so that it can be seen:
    /// with the true p-value exactly at the level, a run settles below it at most risk/2 of
    /// the time, and with the true p-value at a tenth (or ten times) the level it settles on
    /// the right side, early. Extreme relabellings are drawn as Bernoulli(p) in blocks of
    /// 256, checked after each block as the driver does.
    #[test]
    fn settling_rarely_lands_on_the_wrong_side() {
        let risk = 0.1;
        let level = 0.05;
        let run = |p: f64, seed: u64| -> (Option<Side>, u64) {
            let mut s = Stream::new(seed, rng::Purpose::Permutation, 0);
            let (mut b, mut m) = (0u64, 0u64);
            for c in 1..=60 {
                for _ in 0..256 {
                    b += u64::from(s.unit() < p);
                }
                m += 256;
                if let Some(side) = settle_check_with(b, m, level, c, risk) {
                    return (Some(side), m);
                }
            }
            (None, m)
        };
        let reps = 3000;
        let mut below = 0;
        for r in 0..reps {
            below += u32::from(run(level, r).0 == Some(Side::Below));
        }
        let rate = below as f64 / reps as f64;
        // At most risk/2 = 0.05, with four standard errors of a 3,000-run estimate to spare.
        assert!(
            rate <= 0.05 + 4.0 * (0.05f64 * 0.95 / 3000.0).sqrt(),
            "{rate}"
        );
        for r in 0..50 {
            let (side, m) = run(level / 10.0, 10_000 + r);
            assert_eq!(side, Some(Side::Below), "small p, run {r}");
            assert!(m <= 4 * 256, "small p settled only after {m}");
            let (side, _) = run(level * 10.0, 20_000 + r);
            assert_eq!(side, Some(Side::Above), "large p, run {r}");
        }
    }

    /// A run of real relabellings settles after its first block when the groups differ
    /// clearly (below 0.05) or not at all (above 0.05), at the same point and with the same
    /// counts on 1, 2 and 3 threads; the counts are those of the first blocks of the run with
    /// no stop (same seed).
    #[test]
    fn a_settled_run_is_the_start_of_the_full_run_on_any_thread_count() {
        let a = [4.1, 5.0, 3.9, 6.2, 5.5, 4.8, 5.1, 4.4, 5.9, 6.0, 5.2, 5.7];
        let b = [4.0, 3.6, 3.1, 4.2, 3.9, 3.8, 4.3, 3.5, 4.4, 3.7, 4.1, 3.3];
        let c = [4.0, 5.6, 3.1, 6.1, 4.9, 4.8, 5.3, 4.5, 5.8, 5.9, 5.0, 5.6];
        for (other, want) in [(&b, Side::Below), (&c, Side::Above)] {
            let setup = Setup::new(Statistic::MeanDifference, &a, other);
            let total = 100_000;
            let (_, full, _) = run(&setup, 5, total, None);
            let stop = Some(rules(&setup, None, Some(0.05)));
            let mut first = None;
            for threads in [1, 2, 3] {
                parallel::set_threads(threads);
                let (got, vals, ended) = run(&setup, 5, total, stop);
                assert_eq!(ended, Some(Ended::Settled(want)));
                assert!(got.total < total && got.total % rng::BLOCK == 0);
                assert_eq!(vals[..], full[..got.total as usize]);
                let key = (got.total, got.abs_ge);
                assert_eq!(*first.get_or_insert(key), key, "{threads} threads");
            }
        }
        parallel::set_threads(0);
    }

    /// The running p-value each progress report carries is (b + 1)/(m + 1) of the
    /// relabellings drawn so far, b counted here afresh from the statistics of the whole run
    /// (its first m), and the last one is the run's p-value.
    #[test]
    fn the_running_p_value_is_that_of_the_relabellings_so_far() {
        let a = [4.1, 5.0, 3.9, 6.2, 5.5, 4.8, 5.1, 4.4];
        let b = [4.0, 4.6, 3.1, 5.2, 4.9, 3.8, 4.3, 4.5];
        let setup = Setup::new(Statistic::MeanDifference, &a, &b);
        let block = |s, len| setup.random_block(s, len);
        let total = 30_000;
        let watch = rules(&setup, None, None);
        let mut seen = Vec::new();
        let (counts, values, ended) = random_range(
            4,
            total,
            0..rng::block_count(total),
            Some(watch),
            Stage::Relabelling,
            &mut |p| {
                seen.push((p.done, p.running.expect("a running p-value")));
                true
            },
            &block,
        )
        .unwrap();
        assert_eq!(ended, None);
        assert_eq!(seen.len() as u64, rng::block_count(total));
        for (m, r) in &seen {
            let mut c = Counts::default();
            for t in &values[..*m as usize] {
                c.record(*t, setup.observed, setup.tolerance);
            }
            assert_eq!(r.extreme, c.abs_ge, "m = {m}");
            assert_eq!(r.p, (c.abs_ge + 1) as f64 / (*m + 1) as f64, "m = {m}");
            assert!(r.low <= r.p && r.p <= r.high);
        }
        let last = seen.last().unwrap().1;
        let pr = crate::resample::tally::p_value(
            &counts,
            false,
            Alternative::TwoSided,
            TwoSidedRule::Absolute,
        );
        assert_eq!((last.p, last.extreme), (pr.p, pr.extreme));
    }
}

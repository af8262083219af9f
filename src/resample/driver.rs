//! The one driver for exact-or-random null distributions: every relabelling when there are
//! few enough, otherwise random ones in blocks of the seed's streams.

use serde::{Deserialize, Serialize};

use crate::base::{Alternative, Error, Progress, ProgressFn, Stage};
use crate::resample::parallel;
use crate::resample::rng::{self, Stream};
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

/// A sequential Monte Carlo test (Besag and Clifford 1991, "Sequential Monte Carlo
/// p-values", Biometrika 78(2)): draw until `after` relabellings are at least as extreme as
/// the observed one, or all of the resamples asked for have been drawn.
#[derive(Clone, Copy, Debug)]
pub struct Stop {
    pub after: u64,
    pub tail: StopTail,
    /// The observed statistic and the kernel's tie tolerance (the counts' comparisons).
    pub observed: f64,
    pub tolerance: f64,
}

impl Stop {
    /// The stop for a test in `alternative`'s direction (None without `after`).
    pub fn new(
        after: Option<u64>,
        alternative: Alternative,
        observed: f64,
        tolerance: f64,
    ) -> Option<Stop> {
        after.map(|after| Stop {
            after,
            tail: match alternative {
                Alternative::Greater => StopTail::Ge,
                Alternative::Less => StopTail::Le,
                Alternative::TwoSided => StopTail::AbsGe,
            },
            observed,
            tolerance,
        })
    }

    fn extreme(&self, c: &Counts) -> u64 {
        match self.tail {
            StopTail::Ge => c.ge,
            StopTail::Le => c.le,
            StopTail::AbsGe => c.abs_ge,
        }
    }
}

/// How a sequential run ended, for the report.
#[derive(Clone, Copy, Debug, PartialEq, Eq, Serialize, Deserialize)]
pub struct Stopped {
    /// The number of relabellings at least as extreme that stops the run.
    pub after: u64,
    /// The most relabellings the run would draw.
    pub limit: u64,
    /// Whether it stopped before the limit (then p = after / drawn).
    pub early: bool,
}

/// [`random_null`] over the blocks `blocks` only: any partition of the blocks into ranges,
/// merged in order, gives the same counts and statistics as the whole. With a `stop`, the
/// run ends at the relabelling that brings the watched count to `stop.after` (found in its
/// block after the blocks are merged in order, so the point does not depend on the threads).
pub fn random_range(
    seed: u64,
    total: u64,
    blocks: std::ops::Range<u64>,
    stop: Option<Stop>,
    stage: Stage,
    progress: ProgressFn,
    block: RandomBlock,
) -> Result<(Counts, Vec<f64>, bool), Error> {
    let mut counts = Counts::default();
    let len = (blocks.end - blocks.start)
        .saturating_mul(rng::BLOCK)
        .min(total);
    let mut values = Vec::with_capacity(len.min(MAX_KEPT as u64) as usize);
    let first = blocks.start;
    let streams = rng::streams_for(seed, rng::Purpose::Permutation, first, blocks.end - first);
    let work = |i: u64| {
        block(
            streams[i as usize].clone(),
            rng::block_len(total, first + i),
        )
    };
    let mut early = false;
    let finished = parallel::in_order(blocks.end - first, &work, &mut |_, (c, v)| {
        match stop {
            Some(st) if st.extreme(&counts) + st.extreme(&c) >= st.after => {
                // The relabelling that reaches the count ends the run.
                for t in v {
                    counts.record(t, st.observed, st.tolerance);
                    values.push(t);
                    if st.extreme(&counts) >= st.after {
                        break;
                    }
                }
                early = counts.total < total;
            }
            _ => {
                counts.add(&c);
                values.extend(v);
            }
        }
        let go_on = progress(&Progress {
            stage: stage.clone(),
            done: counts.total,
            total,
        });
        if early {
            return false;
        }
        go_on
    });
    if !finished && !early {
        return Err(Error::cancelled());
    }
    Ok((counts, values, early))
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
            let (counts, values, early) = random_range(
                self.seed,
                total,
                0..rng::block_count(total),
                self.stop,
                self.stage.clone(),
                progress,
                random,
            )?;
            Ok(Null {
                counts,
                values,
                exact: false,
                stopped: self.stop.map(|s| Stopped {
                    after: s.after,
                    limit: total,
                    early,
                }),
            })
        }
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::resample::two_groups::{Setup, Statistic};

    /// The sequential stop ends at the relabelling that brings the count to h, found here
    /// independently by scanning the statistics of a run of all of them (the definition in
    /// Besag and Clifford 1991), and the result is the same on 1, 2 and 3 threads.
    #[test]
    fn a_sequential_run_stops_where_the_definition_says() {
        let a = [4.1, 5.0, 3.9, 6.2, 5.5, 4.8, 5.1, 4.4];
        let b = [4.0, 4.6, 3.1, 5.2, 4.9, 3.8, 4.3, 4.5];
        let setup = Setup::new(Statistic::MeanDifference, &a, &b);
        let block = |s, len| setup.random_block(s, len);
        let total = 50_000;
        let (all, values, _) = random_range(
            9,
            total,
            0..rng::block_count(total),
            None,
            Stage::Relabelling,
            &mut |_| true,
            &block,
        )
        .unwrap();
        assert_eq!(all.total, total);
        for h in [1, 7, 40] {
            let stop = Stop::new(
                Some(h),
                Alternative::TwoSided,
                setup.observed,
                setup.tolerance,
            )
            .unwrap();
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
                let (got, vals, early) = random_range(
                    9,
                    total,
                    0..rng::block_count(total),
                    Some(stop),
                    Stage::Relabelling,
                    &mut |_| true,
                    &block,
                )
                .unwrap();
                assert!(early);
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
}

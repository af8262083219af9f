//! The one driver for exact-or-random null distributions: every relabelling when there are
//! few enough, otherwise random ones in blocks of the seed's streams.

use crate::base::{Error, Progress, ProgressFn, Stage};
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
    random_range(
        seed,
        total,
        0..rng::block_count(total),
        stage,
        progress,
        block,
    )
}

/// [`random_null`] over the blocks `blocks` only: any partition of the blocks into ranges,
/// merged in order, gives the same counts and statistics as the whole.
pub fn random_range(
    seed: u64,
    total: u64,
    blocks: std::ops::Range<u64>,
    stage: Stage,
    progress: ProgressFn,
    block: RandomBlock,
) -> Result<(Counts, Vec<f64>), Error> {
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
    let finished = parallel::in_order(blocks.end - first, &work, &mut |_, (c, v)| {
        counts.add(&c);
        values.extend(v);
        progress(&Progress {
            stage: stage.clone(),
            done: counts.total,
            total,
        })
    });
    if !finished {
        return Err(Error::cancelled());
    }
    Ok((counts, values))
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
    ) -> Result<(Counts, Vec<f64>, bool), Error> {
        if self.count <= self.exact_limit {
            let mut cb = |done: u64| {
                progress(&Progress {
                    stage: self.stage.clone(),
                    done,
                    total: self.count,
                })
            };
            let (c, v) = enumerate(&mut cb).ok_or(Error::cancelled())?;
            Ok((c, v, true))
        } else {
            let (c, v) = random_null(
                self.seed,
                self.resamples,
                self.stage.clone(),
                progress,
                random,
            )?;
            Ok((c, v, false))
        }
    }
}

//! The one driver for exact-or-random null distributions: every relabelling when there are
//! few enough, otherwise random ones in blocks of the seed's streams.

use crate::base::{Error, Progress, ProgressFn, Stage};
use crate::resample::rng::{self, Stream};
use crate::resample::tally::Counts;

/// The most resampled statistics a report carries.
pub const MAX_KEPT: usize = 1_000_000;

/// Runs `total` random relabellings in blocks of [`rng::BLOCK`], block b drawing from the
/// stream (seed, permutation, b); merges the blocks in order, reporting progress after each.
pub fn random_null(
    seed: u64,
    total: u64,
    stage: Stage,
    progress: ProgressFn,
    block: &mut dyn FnMut(Stream, u64) -> (Counts, Vec<f64>),
) -> Result<(Counts, Vec<f64>), Error> {
    let mut counts = Counts::default();
    let mut values = Vec::with_capacity(total.min(MAX_KEPT as u64) as usize);
    let streams = rng::Streams::new(seed, rng::Purpose::Permutation, 0);
    for (b, stream) in (0..rng::block_count(total)).zip(streams) {
        let (c, v) = block(stream, rng::block_len(total, b));
        counts.add(&c);
        values.extend(v);
        if !progress(&Progress {
            stage: stage.clone(),
            done: counts.total,
            total,
        }) {
            return Err(Error::cancelled());
        }
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
        random: &mut dyn FnMut(Stream, u64) -> (Counts, Vec<f64>),
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

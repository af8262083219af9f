//! Whole blocks of the random streams on several threads, merged in block order on the
//! calling thread, so that the numbers do not depend on how many threads ran.
//!
//! Every random block b draws only from its own stream (seed, purpose, b), so a block's
//! result is the same whichever thread computes it; the caller receives the results in
//! block order, as a single thread would produce them. In the browser (wasm32) there are no
//! threads: the page runs several workers instead, each given whole blocks.

use std::sync::atomic::{AtomicBool, AtomicU64, AtomicUsize, Ordering};

use crate::base::Progress;
use crate::resample::share::{self, Portable, Rounds};

/// Threads asked for: 0 means one per core.
static THREADS: AtomicUsize = AtomicUsize::new(0);

/// The most threads one run uses, whatever is asked (the blocks are too few to share among
/// more, and each thread keeps a copy of the kernel's working data).
pub const MAX_THREADS: usize = 64;

/// Sets the number of threads for the runs that follow (0: one per core).
pub fn set_threads(n: usize) {
    THREADS.store(n.min(MAX_THREADS), Ordering::Relaxed);
}

/// The number of threads a run uses now.
pub fn threads() -> usize {
    if cfg!(target_arch = "wasm32") {
        return 1;
    }
    match THREADS.load(Ordering::Relaxed) {
        0 => std::thread::available_parallelism()
            .map(|n| n.get())
            .unwrap_or(1)
            .min(MAX_THREADS),
        n => n,
    }
}

/// Computes `work(b)` for every block b in `0..count`, on up to [`threads`] threads, and
/// hands the results to `each` in block order on the calling thread. `each` returning false
/// stops the run (the threads finish the block they are on and take no more); then the
/// result is false.
///
/// In a run shared among workers ([`share`]) the known blocks are replayed instead and this
/// worker computes its share of the next round of `rounds` (the run then pauses, and the
/// result is false); `progress(done)` describes the call after `done` blocks.
pub fn in_order<R: Send + Portable>(
    count: u64,
    rounds: Rounds,
    work: &(dyn Fn(u64) -> R + Sync),
    each: &mut dyn FnMut(u64, R) -> bool,
    progress: &dyn Fn(u64) -> Progress,
) -> bool {
    if share::active() {
        return share::in_order(count, rounds, work, each, progress);
    }
    let threads = threads().min(count as usize);
    if threads <= 1 {
        return (0..count).all(|b| each(b, work(b)));
    }
    let next = AtomicU64::new(0);
    let stop = AtomicBool::new(false);
    std::thread::scope(|scope| {
        let (tx, rx) = std::sync::mpsc::channel::<(u64, R)>();
        for _ in 0..threads {
            let tx = tx.clone();
            let (next, stop) = (&next, &stop);
            scope.spawn(move || {
                while !stop.load(Ordering::Relaxed) {
                    let b = next.fetch_add(1, Ordering::Relaxed);
                    if b >= count || tx.send((b, work(b))).is_err() {
                        break;
                    }
                }
            });
        }
        drop(tx);
        // Results arrive in any order; hold the early ones until their turn.
        let mut waiting = std::collections::BTreeMap::new();
        let mut turn = 0u64;
        for (b, r) in rx.iter() {
            waiting.insert(b, r);
            while let Some(r) = waiting.remove(&turn) {
                if !each(turn, r) {
                    stop.store(true, Ordering::Relaxed);
                    return false;
                }
                turn += 1;
            }
        }
        turn == count
    })
}

#[cfg(test)]
mod tests {
    use super::*;

    /// Results reach the caller in block order for any number of threads, and a stop takes
    /// effect (the caller sees no block after the one it stopped at).
    fn no_progress(done: u64) -> Progress {
        Progress {
            stage: crate::base::Stage::Relabelling,
            done,
            total: 100,
            running: None,
            sketch: None,
        }
    }

    #[test]
    fn blocks_arrive_in_order_and_stop() {
        for t in [1, 2, 3, 8] {
            set_threads(t);
            let mut seen = Vec::new();
            let all = in_order(
                100,
                Rounds::All,
                &|b| {
                    // Uneven work, so that threads finish out of order.
                    std::thread::sleep(std::time::Duration::from_micros((b * 37 % 11) * 50));
                    b * b
                },
                &mut |b, r| {
                    seen.push((b, r));
                    true
                },
                &no_progress,
            );
            assert!(all);
            assert_eq!(seen, (0..100).map(|b| (b, b * b)).collect::<Vec<_>>());
            let mut last = 0;
            let all = in_order(
                100,
                Rounds::All,
                &|b| b,
                &mut |b, _| {
                    last = b;
                    b < 10
                },
                &no_progress,
            );
            assert!(!all);
            assert_eq!(last, 10);
        }
        set_threads(0);
    }
}

//! Sharing one run's blocks among several workers that cannot wait for each other (the
//! page's web workers: without cross-origin isolation they share no memory and a running
//! worker reads no messages).
//!
//! Every worker runs the same job from the start. Each call of the parallel module's `in_order`
//! is numbered in the order the job makes them (the same in every worker, since the job is
//! deterministic), and its blocks are numbered as always. Blocks whose results are known
//! (from any worker) are replayed in order, exactly as if computed here. At the first block
//! not known, the run pauses: this worker computes its share of a round of blocks (block b
//! belongs to worker b mod workers), records their results as bytes and stops the job. The
//! coordinator (the page) gathers every worker's share, hands all of them to every worker,
//! and the workers run the job again from the start; it then replays further, until a run
//! finishes without pausing. The numbers are those of one worker alone: every block is
//! computed from its own stream and replayed in block order.
//!
//! A call whose caller may stop early (a sequential rule, a plan's early stop) is done in
//! rounds that start small and double, so that little is computed beyond the stop; other
//! calls are done in one round.

use std::cell::RefCell;
use std::collections::HashMap;

use crate::base::Progress;

/// A block's result as bytes another worker reads back bit for bit.
pub trait Portable: Sized {
    fn put(&self, out: &mut Vec<u8>);
    fn get(input: &mut &[u8]) -> Option<Self>;
}

fn take<'a>(input: &mut &'a [u8], n: usize) -> Option<&'a [u8]> {
    if input.len() < n {
        return None;
    }
    let (head, rest) = input.split_at(n);
    *input = rest;
    Some(head)
}

impl Portable for u64 {
    fn put(&self, out: &mut Vec<u8>) {
        out.extend_from_slice(&self.to_le_bytes());
    }
    fn get(input: &mut &[u8]) -> Option<u64> {
        take(input, 8).map(|b| u64::from_le_bytes(b.try_into().unwrap_or([0; 8])))
    }
}

impl Portable for f64 {
    fn put(&self, out: &mut Vec<u8>) {
        self.to_bits().put(out);
    }
    fn get(input: &mut &[u8]) -> Option<f64> {
        u64::get(input).map(f64::from_bits)
    }
}

impl<T: Portable> Portable for Vec<T> {
    fn put(&self, out: &mut Vec<u8>) {
        (self.len() as u64).put(out);
        for x in self {
            x.put(out);
        }
    }
    fn get(input: &mut &[u8]) -> Option<Vec<T>> {
        let n = u64::get(input)? as usize;
        // Never trust a length beyond what the bytes could hold.
        let mut v = Vec::with_capacity(n.min(input.len()));
        for _ in 0..n {
            v.push(T::get(input)?);
        }
        Some(v)
    }
}

impl<const K: usize> Portable for [f64; K] {
    fn put(&self, out: &mut Vec<u8>) {
        for x in self {
            x.put(out);
        }
    }
    fn get(input: &mut &[u8]) -> Option<[f64; K]> {
        let mut a = [0.0; K];
        for x in a.iter_mut() {
            *x = f64::get(input)?;
        }
        Some(a)
    }
}

impl<A: Portable, B: Portable> Portable for (A, B) {
    fn put(&self, out: &mut Vec<u8>) {
        self.0.put(out);
        self.1.put(out);
    }
    fn get(input: &mut &[u8]) -> Option<(A, B)> {
        Some((A::get(input)?, B::get(input)?))
    }
}

/// How a call's blocks are shared out in rounds.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum Rounds {
    /// Every block left in one round (the caller takes them all).
    All,
    /// The first round has this many blocks and each further one twice as many (the caller
    /// may stop early).
    Doubling(u64),
}

/// A block: (the call's number in the run, the block's number in the call).
pub type BlockId = (u64, u64);

/// This worker's part in a shared run.
#[derive(Clone, Debug, Default)]
pub struct Sharing {
    /// This worker (0-based) and how many share the run.
    pub worker: u64,
    pub workers: u64,
    /// Every block result known so far, from any worker.
    pub known: HashMap<BlockId, Vec<u8>>,
    /// What this worker computed in the run that paused.
    pub made: Vec<(BlockId, Vec<u8>)>,
    /// Where the run paused: the call and its round of blocks (first, end).
    pub paused: Option<(u64, u64, u64)>,
    /// Calls made so far in the current run.
    calls: u64,
    /// Rounds already done per call (for the doubling).
    rounds: HashMap<u64, u32>,
    /// The progress of this worker's share of a round, reported after each block it
    /// computes (how the worker shows it is up to the worker).
    pub last_progress: Option<Progress>,
}

impl Sharing {
    pub fn new(worker: u64, workers: u64) -> Sharing {
        Sharing {
            worker,
            workers: workers.max(1),
            ..Sharing::default()
        }
    }
}

/// What a worker calls with the progress after each block it computes in a round.
pub type BlockHook = Box<dyn FnMut(&Progress)>;

thread_local! {
    static SHARING: RefCell<Option<Sharing>> = const { RefCell::new(None) };
    /// Called with the progress after each block this worker computes in a round.
    static ON_BLOCK: RefCell<Option<BlockHook>> = const { RefCell::new(None) };
}

/// Starts a run (from the start) as `sharing` says; the results it knows are kept.
pub fn begin(mut sharing: Sharing) {
    sharing.calls = 0;
    sharing.made.clear();
    sharing.paused = None;
    SHARING.with(|s| *s.borrow_mut() = Some(sharing));
}

/// Ends a run and returns the sharing state: what it made and where it paused.
pub fn end() -> Option<Sharing> {
    SHARING.with(|s| s.borrow_mut().take())
}

/// Whether the current run is shared.
pub fn active() -> bool {
    SHARING.with(|s| s.borrow().is_some())
}

/// Sets what to call after each block this worker computes in a round.
pub fn on_block(f: Option<BlockHook>) {
    ON_BLOCK.with(|o| *o.borrow_mut() = f);
}

/// The shared form of the parallel module's `in_order`: replays known blocks in order through
/// `each`; at the first unknown block computes this worker's share of a round with `work`,
/// records it and returns false with the run marked paused. `progress(done)` describes the
/// call's progress after `done` blocks.
pub(crate) fn in_order<R: Portable>(
    count: u64,
    rounds: Rounds,
    work: &(dyn Fn(u64) -> R + Sync),
    each: &mut dyn FnMut(u64, R) -> bool,
    progress: &dyn Fn(u64) -> Progress,
) -> bool {
    let call = SHARING.with(|s| {
        let mut s = s.borrow_mut();
        let sh = s.as_mut().expect("a shared run");
        sh.calls += 1;
        sh.calls - 1
    });
    let mut b = 0;
    while b < count {
        let known = SHARING.with(|s| {
            s.borrow().as_ref().and_then(|sh| {
                sh.known
                    .get(&(call, b))
                    .map(|bytes| R::get(&mut &bytes[..]))
            })
        });
        match known {
            Some(Some(r)) => {
                if !each(b, r) {
                    return false;
                }
                b += 1;
            }
            // Unreadable bytes are computed afresh here (they never are, between workers of
            // one build).
            Some(None) => {
                if !each(b, work(b)) {
                    return false;
                }
                b += 1;
            }
            None => break,
        }
    }
    if b == count {
        return true;
    }
    let (worker, workers, round) = SHARING.with(|s| {
        let mut s = s.borrow_mut();
        let sh = s.as_mut().expect("a shared run");
        let r = sh.rounds.entry(call).or_insert(0);
        *r += 1;
        (sh.worker, sh.workers, *r - 1)
    });
    let end = match rounds {
        Rounds::All => count,
        Rounds::Doubling(first) => {
            let len = first.max(1).saturating_mul(1u64 << round.min(40));
            b.saturating_add(len).min(count)
        }
    };
    let mut made = Vec::new();
    let mine: Vec<u64> = (b..end).filter(|x| x % workers == worker).collect();
    for (i, &blk) in mine.iter().enumerate() {
        let r = work(blk);
        let mut bytes = Vec::new();
        r.put(&mut bytes);
        made.push(((call, blk), bytes));
        // Progress of the whole round, estimated from this worker's share.
        let done = b + ((i as u64 + 1) * workers).min(end - b);
        let p = progress(done);
        ON_BLOCK.with(|o| {
            if let Some(f) = o.borrow_mut().as_mut() {
                f(&p);
            }
        });
    }
    SHARING.with(|s| {
        if let Some(sh) = s.borrow_mut().as_mut() {
            sh.made.extend(made);
            sh.paused = Some((call, b, end));
        }
    });
    false
}

#[cfg(test)]
mod tests {
    use super::*;

    /// Every portable result reads back bit for bit, and cut bytes are refused.
    #[test]
    fn results_read_back_bit_for_bit() {
        let v: (u64, Vec<f64>) = (7, vec![0.1, -0.0, f64::INFINITY, f64::MIN_POSITIVE, 1e300]);
        let mut bytes = Vec::new();
        v.put(&mut bytes);
        let back = <(u64, Vec<f64>)>::get(&mut &bytes[..]).unwrap();
        assert_eq!(back.0, 7);
        let bits = |x: &[f64]| x.iter().map(|f| f.to_bits()).collect::<Vec<_>>();
        assert_eq!(bits(&back.1), bits(&v.1));
        let nan = f64::NAN;
        let mut b2 = Vec::new();
        vec![[nan, 1.5, 2.5]].put(&mut b2);
        let back: Vec<[f64; 3]> = Portable::get(&mut &b2[..]).unwrap();
        assert_eq!(back[0][0].to_bits(), nan.to_bits());
        assert!(<(u64, Vec<f64>)>::get(&mut &bytes[..bytes.len() - 1]).is_none());
    }
}

//! Seeded, portable random streams.
//!
//! Every resampling run is split into fixed blocks of [`BLOCK`] resamples. Block `b` of a
//! run draws from its own Xoshiro256++ stream: the base state is derived from the seed with
//! SplitMix64 (as documented by `rand_xoshiro`), then advanced by `b` jumps of 2^128 steps,
//! so the streams never overlap. Permutation blocks use the base state; bootstrap blocks use
//! the base state after one long jump (2^192 steps). Because a block's numbers depend only
//! on (seed, purpose, block index), results are bit-identical however the blocks are shared
//! out between workers.
//!
//! Integers in a range are drawn with Lemire's multiply-and-reject method written here, so
//! no library's range-sampling algorithm (which may change between versions) is involved.
//!
//! A [`Stream`] is a generator on rand's traits (`rand::Rng`, the trait that rand 0.10
//! calls what earlier versions called `RngCore`, and `rand::SeedableRng`), so any rand-based
//! code can draw from it; the engine itself uses only [`Stream::below`] and [`Stream::unit`],
//! whose outputs `tests/fixtures/streams.json` pins for ever. Fresh seeds come from the
//! operating system or the browser through getrandom ([`fresh_seed`]).

use std::convert::Infallible;

use rand::{Rng, SeedableRng, TryRng};
use rand_xoshiro::Xoshiro256PlusPlus;

/// Resamples per block.
pub const BLOCK: u64 = 4096;

/// Human-readable description of the generator, reported with every result.
pub const RNG_NAME: &str = "xoshiro256++ (SplitMix64 seeding, one 2^128 jump per block of 4096)";

/// The same for a run whose streaming kernels for large samples draw in blocks of
/// [`LARGE_BLOCK`].
pub const RNG_NAME_LARGE: &str = "xoshiro256++ (SplitMix64 seeding, one 2^128 jump per block \
     of 4096, or of 64 for the streaming kernels for large samples)";

/// What a stream is used for; each purpose has its own family of streams.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum Purpose {
    Permutation,
    Bootstrap,
}

/// A stream of random numbers for one block.
#[derive(Clone, Debug)]
pub struct Stream {
    rng: Xoshiro256PlusPlus,
}

impl TryRng for Stream {
    type Error = Infallible;

    #[inline]
    fn try_next_u32(&mut self) -> Result<u32, Infallible> {
        Ok((self.rng.next_u64() >> 32) as u32)
    }

    #[inline]
    fn try_next_u64(&mut self) -> Result<u64, Infallible> {
        Ok(self.rng.next_u64())
    }

    fn try_fill_bytes(&mut self, dst: &mut [u8]) -> Result<(), Infallible> {
        self.rng.fill_bytes(dst);
        Ok(())
    }
}

impl SeedableRng for Stream {
    type Seed = [u8; 32];

    /// The xoshiro256++ state itself (four little-endian words).
    fn from_seed(seed: [u8; 32]) -> Stream {
        Stream {
            rng: Xoshiro256PlusPlus::from_seed(seed),
        }
    }

    /// The first permutation block of `seed`, as [`Stream::new`] makes it.
    fn seed_from_u64(seed: u64) -> Stream {
        Stream::new(seed, Purpose::Permutation, 0)
    }
}

impl Stream {
    /// The stream for block `block` of the given purpose under `seed`.
    pub fn new(seed: u64, purpose: Purpose, block: u64) -> Stream {
        let mut rng = Xoshiro256PlusPlus::seed_from_u64(seed);
        if purpose == Purpose::Bootstrap {
            rng.long_jump();
        }
        if block > 0 {
            // Jump by block * 2^128 steps in one call.
            rng.jump_ce(block, 128);
        }
        Stream { rng }
    }

    #[inline]
    pub fn next_u64(&mut self) -> u64 {
        self.rng.next_u64()
    }

    /// Uniform integer in `0..n` (n > 0), Lemire (2019) "Fast random integer generation in
    /// an interval", ACM TOMACS 29(1), with rejection so the result is exactly uniform.
    #[inline]
    pub fn below(&mut self, n: u64) -> u64 {
        debug_assert!(n > 0);
        let mut m = (self.next_u64() as u128) * (n as u128);
        let mut low = m as u64;
        if low < n {
            let threshold = n.wrapping_neg() % n;
            while low < threshold {
                m = (self.next_u64() as u128) * (n as u128);
                low = m as u64;
            }
        }
        (m >> 64) as u64
    }

    /// Uniform double in [0, 1) with 53 random bits.
    #[inline]
    pub fn unit(&mut self) -> f64 {
        (self.next_u64() >> 11) as f64 * (1.0 / (1u64 << 53) as f64)
    }
}

/// The streams of consecutive blocks, starting at `first`: one 2^128 jump per block after
/// the first (the arbitrary jump that `Stream::new` makes is far slower than a plain jump).
pub struct Streams {
    next: Xoshiro256PlusPlus,
}

impl Streams {
    pub fn new(seed: u64, purpose: Purpose, first: u64) -> Streams {
        Streams {
            next: Stream::new(seed, purpose, first).rng,
        }
    }
}

impl Iterator for Streams {
    type Item = Stream;
    fn next(&mut self) -> Option<Stream> {
        let rng = self.next.clone();
        self.next.jump();
        Some(Stream { rng })
    }
}

/// Number of blocks needed for `total` resamples, and the size of block `b`.
/// The streams of blocks `first..first + count`, made by one jump each from the first (a
/// direct jump to block b costs about half a millisecond, a step to the next one a tenth of
/// a microsecond), so that threads can take any block.
pub fn streams_for(seed: u64, purpose: Purpose, first: u64, count: u64) -> Vec<Stream> {
    Streams::new(seed, purpose, first)
        .take(count as usize)
        .collect()
}

pub fn block_count(total: u64) -> u64 {
    block_count_of(total, BLOCK)
}

pub fn block_len(total: u64, b: u64) -> u64 {
    block_len_of(total, b, BLOCK)
}

/// Resamples per block of the streaming kernels for large samples (kernel generation 2):
/// each of their resamples costs milliseconds, so smaller blocks keep every core busy and
/// progress frequent.
pub const LARGE_BLOCK: u64 = 64;

/// [`block_count`] for blocks of `size` resamples.
pub fn block_count_of(total: u64, size: u64) -> u64 {
    total.div_ceil(size)
}

/// [`block_len`] for blocks of `size` resamples.
pub fn block_len_of(total: u64, b: u64, size: u64) -> u64 {
    size.min(total.saturating_sub(b.saturating_mul(size)))
}

/// The seed of sub-analysis `index` of a run (a pairwise comparison, say): SplitMix64's
/// finaliser applied to the seed and the index, so that every sub-analysis draws from its
/// own streams and the whole run still depends on the one seed alone.
pub fn sub_seed(seed: u64, index: u64) -> u64 {
    let mut z = seed ^ index.wrapping_mul(0x9E37_79B9_7F4A_7C15);
    z = z.wrapping_add(0x9E37_79B9_7F4A_7C15);
    z = (z ^ (z >> 30)).wrapping_mul(0xBF58_476D_1CE4_E5B9);
    z = (z ^ (z >> 27)).wrapping_mul(0x94D0_49BB_1331_11EB);
    z ^ (z >> 31)
}

/// A seed for when the user gives none: below 2^53 so that it survives any JSON tool.
pub fn seed_from_entropy(entropy: u64) -> u64 {
    let mut s = Xoshiro256PlusPlus::seed_from_u64(entropy);
    s.next_u64() >> 11
}

/// A fresh seed from the operating system's (or the browser's) secure randomness, below
/// 2^53.
pub fn fresh_seed() -> u64 {
    // getrandom reads the operating system's generator (crypto.getRandomValues in a
    // browser). Should it ever fail, a clock (natively) or a per-session counter (in a
    // browser, where the standard clock is missing) still gives distinct seeds.
    static CALLS: std::sync::atomic::AtomicU64 = std::sync::atomic::AtomicU64::new(0);
    let entropy = getrandom::u64().unwrap_or_else(|_| {
        let n = CALLS.fetch_add(1, std::sync::atomic::Ordering::Relaxed);
        #[cfg(not(target_arch = "wasm32"))]
        let t = std::time::SystemTime::now()
            .duration_since(std::time::UNIX_EPOCH)
            .map(|d| d.as_nanos() as u64)
            .unwrap_or(0x5EED);
        #[cfg(target_arch = "wasm32")]
        let t = 0x5EED_u64;
        t ^ n.wrapping_mul(0x9E37_79B9_7F4A_7C15)
    });
    seed_from_entropy(entropy)
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn jump_ce_equals_repeated_jumps() {
        let mut a = Xoshiro256PlusPlus::seed_from_u64(7);
        for _ in 0..5 {
            a.jump();
        }
        let mut b = Stream::new(7, Purpose::Permutation, 5);
        assert_eq!(a.next_u64(), b.next_u64());
    }

    #[test]
    fn consecutive_streams_equal_direct_ones() {
        let mut fam = Streams::new(11, Purpose::Bootstrap, 3);
        for b in 3..8 {
            let mut a = fam.next().unwrap();
            let mut d = Stream::new(11, Purpose::Bootstrap, b);
            assert_eq!(a.next_u64(), d.next_u64(), "block {b}");
        }
    }

    #[test]
    fn below_is_in_range_and_roughly_uniform() {
        let mut s = Stream::new(1, Purpose::Permutation, 0);
        let mut counts = [0u32; 7];
        for _ in 0..70_000 {
            let v = s.below(7);
            counts[v as usize] += 1;
        }
        // Each cell expects 10,000; SD is about 93, so 600 is over six SDs.
        for c in counts {
            assert!((c as i64 - 10_000).abs() < 600, "{counts:?}");
        }
    }

    #[test]
    fn streams_differ_by_block_and_purpose() {
        let a = Stream::new(3, Purpose::Permutation, 0).next_u64();
        let b = Stream::new(3, Purpose::Permutation, 1).next_u64();
        let c = Stream::new(3, Purpose::Bootstrap, 0).next_u64();
        assert_ne!(a, b);
        assert_ne!(a, c);
        assert_ne!(b, c);
    }

    #[test]
    fn sub_seeds_differ_and_are_stable() {
        let s: Vec<u64> = (0..50).map(|i| sub_seed(42, i)).collect();
        let mut d = s.clone();
        d.sort_unstable();
        d.dedup();
        assert_eq!(d.len(), 50);
        assert_eq!(sub_seed(42, 3), s[3]);
        assert_ne!(sub_seed(43, 3), s[3]);
    }

    #[test]
    fn a_stream_serves_rand_s_traits_with_the_same_numbers() {
        // Through rand's `Rng` (formerly `RngCore`) the stream gives the words it gives
        // directly; `seed_from_u64` is the seed's first permutation block.
        let mut a = Stream::new(9, Purpose::Permutation, 0);
        let mut b = <Stream as SeedableRng>::seed_from_u64(9);
        let direct: Vec<u64> = (0..4).map(|_| a.next_u64()).collect();
        let via: Vec<u64> = (0..4).map(|_| Rng::next_u64(&mut b)).collect();
        assert_eq!(direct, via);
        let mut bytes = [0u8; 8];
        let mut c = Stream::new(9, Purpose::Permutation, 0);
        c.fill_bytes(&mut bytes);
        assert_eq!(u64::from_le_bytes(bytes), direct[0]);
        assert!(fresh_seed() < 1 << 53);
    }

    #[test]
    fn block_sizes_cover_total() {
        let total = 10_000;
        let n = block_count(total);
        assert_eq!(n, 3);
        let sum: u64 = (0..n).map(|b| block_len(total, b)).sum();
        assert_eq!(sum, total);
    }
}

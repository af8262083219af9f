//! Relabelling within strata: each stratum's labels shuffled on their own, or every
//! combination of within-stratum relabellings (per-stratum lists combined like an odometer).

use crate::resample::combin::{choose, RevolvingDoor};
use crate::resample::rng::Stream;
use crate::resample::tally::Counts;

/// One stratum, ready for relabelling.
pub struct Stratum {
    /// Both groups' values, centred at the stratum mean.
    pub pool: Vec<f64>,
    pub n1: usize,
    pub n2: usize,
    /// Normalised weight.
    pub w: f64,
    pub total: f64,
}

impl Stratum {
    /// The weighted difference contributed when the first group's values sum to `s1`.
    #[inline]
    pub fn contribution(&self, s1: f64) -> f64 {
        self.w * (s1 / self.n1 as f64 - (self.total - s1) / self.n2 as f64)
    }

    /// The size of the smaller group, the one drawn or enumerated.
    pub fn k(&self) -> usize {
        self.n1.min(self.n2)
    }

    /// The first group's sum when the drawn (smaller) group sums to `drawn`.
    #[inline]
    pub fn first_sum(&self, drawn: f64) -> f64 {
        if self.n1 <= self.n2 {
            drawn
        } else {
            self.total - drawn
        }
    }

    /// Every contribution over the C(n, k) relabellings of this stratum.
    pub fn all_contributions(&self) -> Vec<f64> {
        let n = self.pool.len();
        let k = self.k();
        let mut door = RevolvingDoor::new(n, k);
        let resum = |set: &[usize]| set.iter().map(|&i| self.pool[i]).sum::<f64>();
        let mut s = resum(door.current());
        let mut out = Vec::with_capacity(choose(n as u64, k as u64) as usize);
        let mut step = 0u64;
        loop {
            out.push(self.contribution(self.first_sum(s)));
            step += 1;
            match door.advance() {
                None => break,
                Some((o, i)) => {
                    if step % 1024 == 0 {
                        s = resum(door.current());
                    } else {
                        s += self.pool[i] - self.pool[o];
                    }
                }
            }
        }
        out
    }
}

pub struct SSetup {
    pub strata: Vec<Stratum>,
    pub observed: f64,
    pub tolerance: f64,
}

impl SSetup {
    pub fn random_block(&self, mut stream: Stream, len: u64) -> (Counts, Vec<f64>) {
        let mut pools: Vec<Vec<f64>> = self.strata.iter().map(|s| s.pool.clone()).collect();
        let mut counts = Counts::default();
        let mut values = Vec::with_capacity(len as usize);
        for _ in 0..len {
            let mut t = 0.0;
            for (s, vals) in self.strata.iter().zip(pools.iter_mut()) {
                let n = vals.len();
                let mut drawn = 0.0;
                for i in 0..s.k() {
                    let j = i + stream.below((n - i) as u64) as usize;
                    vals.swap(i, j);
                    drawn += vals[i];
                }
                t += s.contribution(s.first_sum(drawn));
            }
            counts.record(t, self.observed, self.tolerance);
            values.push(t);
        }
        (counts, values)
    }

    /// Every combination of within-stratum relabellings: the strata's contribution lists,
    /// combined like an odometer (the last list turns fastest).
    pub fn enumerate(
        &self,
        every: u64,
        progress: &mut dyn FnMut(u64) -> bool,
    ) -> Option<(Counts, Vec<f64>)> {
        let mut lists: Vec<Vec<f64>> = self.strata.iter().map(Stratum::all_contributions).collect();
        lists.sort_by_key(Vec::len);
        let m = lists.len();
        let mut idx = vec![0usize; m];
        // prefix[s] = sum of the chosen contributions of lists 0..s.
        let mut prefix = vec![0.0; m + 1];
        for s in 0..m {
            prefix[s + 1] = prefix[s] + lists[s][0];
        }
        let mut counts = Counts::default();
        let mut values = Vec::new();
        let last = &lists[m - 1];
        let mut step = 0u64;
        loop {
            let base = prefix[m - 1];
            for &c in last {
                let t = base + c;
                counts.record(t, self.observed, self.tolerance);
                values.push(t);
                step += 1;
                if step % every == 0 && !progress(step) {
                    return None;
                }
            }
            // Advance the outer lists.
            let mut s = m - 1;
            loop {
                if s == 0 {
                    return Some((counts, values));
                }
                s -= 1;
                idx[s] += 1;
                if idx[s] < lists[s].len() {
                    break;
                }
                idx[s] = 0;
            }
            for t in s..m - 1 {
                prefix[t + 1] = prefix[t] + lists[t][idx[t]];
            }
        }
    }
}

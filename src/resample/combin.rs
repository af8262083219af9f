//! Counting and enumerating k-subsets.

/// C(n, k), saturating at u64::MAX.
pub fn choose(n: u64, k: u64) -> u64 {
    if k > n {
        return 0;
    }
    let k = k.min(n - k);
    let mut acc: u128 = 1;
    for i in 0..k {
        acc = acc * (n - i) as u128 / (i + 1) as u128;
        if acc > u64::MAX as u128 {
            return u64::MAX;
        }
    }
    acc as u64
}

/// All k-subsets of {0, …, n-1} in revolving-door order: each subset after the first
/// differs from the one before by one element out and one element in, so statistics built
/// from sums update in O(1). Knuth, TAOCP vol. 4A, section 7.2.1.3, Algorithm R.
pub struct RevolvingDoor {
    /// c[1..=t] are the elements (c[0] unused), c[t+1] = n as a sentinel.
    c: Vec<usize>,
    t: usize,
    done: bool,
}

impl RevolvingDoor {
    /// Requires 1 <= k < n.
    pub fn new(n: usize, k: usize) -> RevolvingDoor {
        assert!(k >= 1 && k < n);
        let mut c = vec![0; k + 2];
        for (j, cj) in c.iter_mut().enumerate().take(k + 1).skip(1) {
            *cj = j - 1;
        }
        c[k + 1] = n;
        RevolvingDoor {
            c,
            t: k,
            done: false,
        }
    }

    /// The current subset.
    pub fn current(&self) -> &[usize] {
        &self.c[1..=self.t]
    }

    /// Moves to the next subset; returns (element removed, element added), or None at the end.
    pub fn advance(&mut self) -> Option<(usize, usize)> {
        if self.done {
            return None;
        }
        let t = self.t;
        let c = &mut self.c;
        // R3: easy cases.
        let mut j;
        let mut try_increase;
        if t % 2 == 1 {
            if c[1] + 1 < c[2] {
                let old = c[1];
                c[1] += 1;
                return Some((old, old + 1));
            }
            j = 2;
            try_increase = false;
        } else {
            if c[1] > 0 {
                let old = c[1];
                c[1] -= 1;
                return Some((old, old - 1));
            }
            j = 2;
            try_increase = true;
        }
        loop {
            if j > t {
                self.done = true;
                return None;
            }
            if !try_increase {
                // R4: try to decrease c[j] (here c[j] = c[j-1] + 1).
                if c[j] >= j {
                    let out = c[j];
                    let inn = j - 2;
                    c[j] = c[j - 1];
                    c[j - 1] = inn;
                    return Some((out, inn));
                }
                j += 1;
                try_increase = true;
            } else {
                // R5: try to increase c[j] (here c[j-1] = j - 2).
                if c[j] + 1 < c[j + 1] {
                    let out = c[j - 1];
                    let inn = c[j] + 1;
                    c[j - 1] = c[j];
                    c[j] += 1;
                    return Some((out, inn));
                }
                j += 1;
                try_increase = false;
            }
        }
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use std::collections::BTreeSet;

    #[test]
    fn choose_values() {
        assert_eq!(choose(44, 20), 1_761_039_350_070); // Python math.comb(44, 20)
        assert_eq!(choose(20, 10), 184_756);
        assert_eq!(choose(5, 0), 1);
        assert_eq!(choose(3, 4), 0);
        assert_eq!(choose(200, 100), u64::MAX);
    }

    #[test]
    fn revolving_door_visits_every_subset_once_with_single_swaps() {
        for n in 2..=11 {
            for k in 1..n {
                let mut rd = RevolvingDoor::new(n, k);
                let mut seen = BTreeSet::new();
                let mut cur: BTreeSet<usize> = rd.current().iter().copied().collect();
                seen.insert(cur.iter().copied().collect::<Vec<_>>());
                while let Some((out, inn)) = rd.advance() {
                    assert!(cur.remove(&out), "n={n} k={k}: {out} was not in the subset");
                    assert!(cur.insert(inn), "n={n} k={k}: {inn} was already in");
                    let now: BTreeSet<usize> = rd.current().iter().copied().collect();
                    assert_eq!(now, cur, "n={n} k={k}");
                    assert!(seen.insert(cur.iter().copied().collect::<Vec<_>>()));
                }
                assert_eq!(seen.len() as u64, choose(n as u64, k as u64), "n={n} k={k}");
            }
        }
    }
}

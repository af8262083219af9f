//! Two-by-two tables: the hypergeometric distribution of a table with fixed margins, exact
//! p-values, Fisher's two-sided rule, the chi-square test, and the Newcombe, Katz and Woolf
//! intervals.

use serde::{Deserialize, Serialize};
use statrs::distribution::{ChiSquared, ContinuousCDF};

use crate::base::{float, Alternative, Interval, Method, Note, Side};
use crate::classical::anova::ChiSquareTest;
use crate::num::binomial::pmf_window;
use crate::num::normal;

/// The 2×2 table: a yes of n1 in the first group, c yes of n2 in the second.
#[derive(Clone, Copy, Debug)]
pub struct Table2 {
    pub a: u64,
    pub n1: u64,
    pub c: u64,
    pub n2: u64,
}

impl Table2 {
    /// The total number of yes answers.
    pub fn m(&self) -> u64 {
        self.a + self.c
    }
}

/// The hypergeometric distribution of the first group's yes count with both margins
/// fixed: (lo, probabilities of lo, lo + 1, …), over the values whose probability does not
/// underflow to zero (so that counts in the billions need megabytes, not gigabytes).
pub fn hypergeometric(t: &Table2) -> (u64, Vec<f64>) {
    let (n1, n2, m) = (t.n1, t.n2, t.m());
    let lo = m.saturating_sub(n2);
    let hi = n1.min(m);
    // The mode: floor((m + 1)(n1 + 1) / (N + 2)).
    let mode = (((m + 1) as u128 * (n1 + 1) as u128) / (n1 + n2 + 2) as u128) as u64;
    let mode = mode.clamp(lo, hi);
    let ratio = |a: u64| {
        // P(a + 1) / P(a)
        ((n1 - a) as f64 * (m - a) as f64) / ((a + 1) as f64 * (n2 + a + 1 - m) as f64)
    };
    pmf_window(lo, hi, mode, ratio)
}

/// The exact permutation p-value of a 2×2 table (a yes of n1 against c yes of n2) for the
/// difference in proportions, two-sided by |difference| or one-sided, from the
/// hypergeometric distribution with both margins fixed.
pub fn exact_p(a: u64, n1: u64, c: u64, n2: u64, alternative: Alternative) -> f64 {
    let t = Table2 { a, n1, c, n2 };
    let (lo, pmf) = hypergeometric(&t);
    // (The window's nearest end stands for an observed count whose probability underflows.)
    let obs = (a.saturating_sub(lo) as usize).min(pmf.len() - 1);
    let big_n = (n1 + n2) as i128;
    let dist = |i: usize| ((lo + i as u64) as i128 * big_n - t.m() as i128 * n1 as i128).abs();
    let p: f64 = match alternative {
        Alternative::Greater => pmf[obs..].iter().sum(),
        Alternative::Less => pmf[..=obs].iter().sum(),
        Alternative::TwoSided => {
            let d0 = dist(obs);
            pmf.iter()
                .enumerate()
                .filter(|(i, _)| dist(*i) >= d0)
                .map(|(_, p)| p)
                .sum()
        }
    };
    p.min(1.0)
}

/// Wilson score interval for a proportion.
pub fn wilson(x: f64, n: f64, z: f64) -> (f64, f64) {
    let p = x / n;
    let centre = (p + z * z / (2.0 * n)) / (1.0 + z * z / n);
    let half = z / (1.0 + z * z / n) * (p * (1.0 - p) / n + z * z / (4.0 * n * n)).sqrt();
    ((centre - half).max(0.0), (centre + half).min(1.0))
}

pub fn classical_measures(t: &Table2, level: f64) -> (Measure, Measure, Measure) {
    let z = normal::quantile(1.0 - (1.0 - level) / 2.0);
    let (a, n1, c, n2) = (t.a as f64, t.n1 as f64, t.c as f64, t.n2 as f64);
    let (b, d) = (n1 - a, n2 - c);
    let (p1, p2) = (a / n1, c / n2);
    let iv = |low: Option<f64>, high: Option<f64>, method: Method, note: Option<Note>| Interval {
        low,
        high,
        level,
        method,
        side: Side::TwoSided,
        notes: note.into_iter().collect(),
    };
    // Newcombe (1998), method 10: hybrid score interval from the two Wilson intervals.
    let (l1, u1) = wilson(a, n1, z);
    let (l2, u2) = wilson(c, n2, z);
    let delta = p1 - p2;
    let diff = Measure {
        estimate: delta,
        ci: iv(
            Some(delta - ((p1 - l1).powi(2) + (u2 - p2).powi(2)).sqrt()),
            Some(delta + ((u1 - p1).powi(2) + (p2 - l2).powi(2)).sqrt()),
            Method::Newcombe,
            None,
        ),
    };
    let zero_note = || Some(Note::ZeroCount);
    // Katz et al. (1978): log risk ratio ± z·sqrt(1/a − 1/n1 + 1/c − 1/n2).
    let rr = p1 / p2;
    let risk_ratio = if a > 0.0 && c > 0.0 {
        let se = (1.0 / a - 1.0 / n1 + 1.0 / c - 1.0 / n2).sqrt();
        Measure {
            estimate: rr,
            ci: iv(
                Some((rr.ln() - z * se).exp()),
                Some((rr.ln() + z * se).exp()),
                Method::Katz,
                None,
            ),
        }
    } else {
        Measure {
            estimate: rr,
            ci: iv(None, None, Method::Katz, zero_note()),
        }
    };
    // Woolf (1955): log odds ratio ± z·sqrt(1/a + 1/b + 1/c + 1/d).
    let or = (a * d) / (b * c);
    let odds_ratio = if a > 0.0 && b > 0.0 && c > 0.0 && d > 0.0 {
        let se = (1.0 / a + 1.0 / b + 1.0 / c + 1.0 / d).sqrt();
        Measure {
            estimate: or,
            ci: iv(
                Some((or.ln() - z * se).exp()),
                Some((or.ln() + z * se).exp()),
                Method::Woolf,
                None,
            ),
        }
    } else {
        Measure {
            estimate: or,
            ci: iv(None, None, Method::Woolf, zero_note()),
        }
    };
    (diff, risk_ratio, odds_ratio)
}

/// Pearson's chi-square for the 2×2 table; with `yates`, each |observed − expected| is
/// reduced by at most 0.5 (as scipy.stats.chi2_contingency does).
pub fn chi_square(t: &Table2, yates: bool) -> (ChiSquareTest, f64) {
    let (a, n1, c, n2) = (t.a as f64, t.n1 as f64, t.c as f64, t.n2 as f64);
    let n = n1 + n2;
    let m = a + c;
    let observed = [a, n1 - a, c, n2 - c];
    let expected = [n1 * m / n, n1 * (n - m) / n, n2 * m / n, n2 * (n - m) / n];
    let smallest = expected.iter().copied().fold(f64::INFINITY, f64::min);
    if smallest <= 0.0 {
        return (
            ChiSquareTest {
                statistic: None,
                df: 1.0,
                p_value: None,
            },
            smallest,
        );
    }
    let x2: f64 = observed
        .iter()
        .zip(&expected)
        .map(|(o, e)| {
            let d = (o - e).abs();
            let d = if yates { d - d.min(0.5) } else { d };
            d * d / e
        })
        .sum();
    (
        ChiSquareTest {
            statistic: Some(x2),
            df: 1.0,
            p_value: ChiSquared::new(1.0).ok().map(|d| d.sf(x2)),
        },
        smallest,
    )
}

/// A measure of the difference with its classical interval.
#[derive(Clone, Debug, PartialEq, Serialize, Deserialize)]
pub struct Measure {
    /// The estimate.
    #[serde(with = "float")]
    pub estimate: f64,
    /// Its classical interval.
    pub ci: Interval,
}

/// Fisher's exact test as commonly computed: one-sided tails of the hypergeometric
/// distribution, or two-sided by summing the tables no more likely than the observed one.
#[derive(Clone, Debug, PartialEq, Serialize, Deserialize)]
pub struct FisherExact {
    /// The p-value.
    pub p_value: f64,
    /// Its direction (two-sided: Fisher's rule).
    pub alternative: Alternative,
}

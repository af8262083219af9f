//! The robustness table of two groups: the same question answered with the other reasonable
//! statistics (the same seed, so the same random relabellings, and the same settings), read
//! beside the chosen effect's interval methods and the classical Welch t-test, with what
//! falls on the other side of the level 1 − confidence than the chosen analysis.
//!
//! It shows how much a conclusion hangs on a choice made before the analysis; it is not a
//! menu to pick the smallest p-value from (the cautions say so).

use serde::{Deserialize, Serialize};

use super::TestOutcome;
use crate::base::*;
use crate::classical::Welch;
use crate::resample::driver::Stopped;
use crate::resample::two_groups::{null_distribution, Setup, Statistic};

/// The statistics a two-group question is answered with in the table, in this order.
pub const STATISTICS: [Statistic; 5] = [
    Statistic::MeanDifference,
    Statistic::MedianDifference,
    Statistic::TrimmedMeanDifference,
    Statistic::WelchT,
    Statistic::RankSum,
];

/// One other statistic's permutation test.
#[derive(Clone, Debug, PartialEq, Serialize, Deserialize)]
pub struct OtherStatistic {
    /// The statistic.
    pub statistic: Statistic,
    /// Its observed value.
    #[serde(with = "float")]
    pub observed: f64,
    /// Its p-value, with the chosen alternative and two-sided rule.
    pub p_value: f64,
    /// Whether every relabelling was enumerated.
    pub exact: bool,
    /// Relabellings drawn or enumerated.
    pub resamples: u64,
    /// Monte Carlo standard error of the p-value (None when exact).
    pub mc_se: Option<f64>,
    /// How a sequential run ended, when the settings ask for a sequential stop.
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub sequential: Option<Stopped>,
}

impl OtherStatistic {
    fn from_outcome(statistic: Statistic, t: &TestOutcome) -> OtherStatistic {
        OtherStatistic {
            statistic,
            observed: t.observed,
            p_value: t.p_value,
            exact: t.exact,
            resamples: t.resamples,
            mc_se: t.mc_se,
            sequential: t.sequential,
        }
    }
}

/// What reads differently from the chosen analysis at the table's level.
#[derive(Clone, Debug, PartialEq, Serialize, Deserialize)]
pub struct Verdict {
    /// Whether the chosen analysis's p-value is at most the level.
    pub chosen_below: bool,
    /// The other statistics whose p-value falls on the other side of the level.
    pub statistics_differ: Vec<Statistic>,
    /// Interval methods of the chosen effect whose interval disagrees with the chosen
    /// p-value (it includes the effect of no difference while p ≤ level, or excludes it
    /// while p > level); read only for a two-sided test and two-sided intervals.
    pub intervals_differ: Vec<Method>,
    /// Whether the classical Welch t-test's p-value falls on the other side.
    pub welch_differs: bool,
}

impl Verdict {
    /// Whether every answer in the table reads the same as the chosen one.
    pub fn same(&self) -> bool {
        self.statistics_differ.is_empty() && self.intervals_differ.is_empty() && !self.welch_differs
    }
}

/// The robustness table of a two-group report.
#[derive(Clone, Debug, PartialEq, Serialize, Deserialize)]
pub struct Robustness {
    /// The level the answers are read at: 1 − the confidence level of the intervals.
    pub level: f64,
    /// The effect of no difference, which an interval agreeing with a small p-value
    /// excludes: 0 for a difference, 1/2 for the probability of superiority.
    pub null_effect: f64,
    /// Whether the intervals enter the verdict (a two-sided test).
    pub intervals_read: bool,
    /// The other statistics' tests, in the order of [`STATISTICS`].
    pub statistics: Vec<OtherStatistic>,
    /// What reads differently from the chosen analysis.
    pub verdict: Verdict,
}

/// The tests of every statistic of [`STATISTICS`] other than `chosen`, each with the same
/// settings and seed as the chosen one (so the same streams of random numbers).
pub fn other_tests(
    chosen: Statistic,
    a: &[f64],
    b: &[f64],
    set: &super::TestSettings,
    progress: ProgressFn,
) -> Result<Vec<OtherStatistic>, Error> {
    let mut out = Vec::new();
    for st in STATISTICS.into_iter().filter(|s| *s != chosen) {
        let setup = Setup::for_run(st, a, b, set.kernels, set.exact_limit);
        let stop = set.stop(set.alternative, setup.observed, setup.tolerance);
        let null = null_distribution(
            &setup,
            set.exact_limit,
            set.resamples,
            set.seed,
            stop,
            progress,
        )?;
        let observed = crate::resample::two_groups::statistic_value(st, a, b);
        let t = TestOutcome::from_null(&null, set.alternative, set.two_sided, observed, set.seed);
        out.push(OtherStatistic::from_outcome(st, &t));
    }
    Ok(out)
}

/// Whether an interval excludes `null` (None: it has no limits to read).
fn excludes(iv: &Interval, null: f64) -> Option<bool> {
    match (iv.low, iv.high) {
        (Some(l), Some(h)) => Some(l > null || h < null),
        _ => None,
    }
}

/// The table from the other statistics' tests and the chosen analysis: its p-value, its
/// effect's intervals (read when `intervals_read`: a two-sided test of an effect with a value
/// of no difference) and the Welch t-test.
#[allow(clippy::too_many_arguments)]
pub fn table(
    statistics: Vec<OtherStatistic>,
    chosen_p: f64,
    intervals_read: bool,
    confidence: f64,
    null_effect: f64,
    intervals: &[Interval],
    welch: &Welch,
) -> Robustness {
    let level = 1.0 - confidence;
    let chosen_below = chosen_p <= level;
    let statistics_differ = statistics
        .iter()
        .filter(|o| (o.p_value <= level) != chosen_below)
        .map(|o| o.statistic)
        .collect();
    let intervals_differ = if intervals_read {
        intervals
            .iter()
            .filter(|iv| iv.side == Side::TwoSided)
            .filter(|iv| excludes(iv, null_effect).is_some_and(|x| x != chosen_below))
            .map(|iv| iv.method)
            .collect()
    } else {
        Vec::new()
    };
    let welch_differs = welch.p_value.is_some_and(|p| (p <= level) != chosen_below);
    Robustness {
        level,
        null_effect,
        intervals_read,
        statistics,
        verdict: Verdict {
            chosen_below,
            statistics_differ,
            intervals_differ,
            welch_differs,
        },
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    fn iv(low: f64, high: f64, method: Method) -> Interval {
        Interval {
            low: Some(low),
            high: Some(high),
            level: 0.95,
            method,
            side: Side::TwoSided,
            notes: Vec::new(),
        }
    }

    fn other(statistic: Statistic, p_value: f64) -> OtherStatistic {
        OtherStatistic {
            statistic,
            observed: 1.0,
            p_value,
            exact: true,
            resamples: 10,
            mc_se: None,
            sequential: None,
        }
    }

    fn welch(p: f64) -> Welch {
        Welch {
            mean_difference: 1.0,
            t: Some(2.0),
            df: Some(10.0),
            p_value: Some(p),
            ci: iv(0.1, 2.0, Method::WelchT),
        }
    }

    /// The verdict names exactly the answers on the other side of the level (a p-value
    /// equal to the level counts as below it, as in the tests themselves).
    #[test]
    fn the_verdict_names_what_reads_differently() {
        let others = vec![
            other(Statistic::MedianDifference, 0.12),
            other(Statistic::WelchT, 0.05),
            other(Statistic::RankSum, 0.03),
        ];
        let ivs = [iv(0.2, 1.4, Method::Bca), iv(-0.1, 1.5, Method::Percentile)];
        let r = table(others, 0.04, true, 0.95, 0.0, &ivs, &welch(0.2));
        assert!(r.verdict.chosen_below);
        assert_eq!(
            r.verdict.statistics_differ,
            vec![Statistic::MedianDifference]
        );
        assert_eq!(r.verdict.intervals_differ, vec![Method::Percentile]);
        assert!(r.verdict.welch_differs);
        assert!(!r.verdict.same());
        // All on one side: the same conclusion; one-sided tests leave the intervals out.
        let all = vec![other(Statistic::MedianDifference, 0.01)];
        let r = table(all, 0.2, false, 0.95, 0.0, &ivs, &welch(0.3));
        assert!(!r.verdict.chosen_below);
        assert!(r.verdict.statistics_differ.len() == 1 && !r.intervals_read);
        let r = table(Vec::new(), 0.2, true, 0.95, 0.5, &[], &welch(0.3));
        assert!(r.verdict.same());
    }
}

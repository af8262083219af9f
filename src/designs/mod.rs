//! The designs: one module per design, each implementing one contract ([`Design`]): its
//! request, its validation before any work starts, its run and its report. This module holds
//! the contract, the registry of design keys, and what the designs share: the settings block
//! of a permutation test, the outcome of a test (p-value, Monte Carlo error, the null
//! histogram and the tail counted toward p), the summary of a bootstrap run, group summaries,
//! and the cautions as typed codes.

pub mod association;
pub mod estimate;
pub mod hints;
pub mod k_groups;
pub mod one_sample;
pub mod paired;
pub mod plan;
pub mod robustness;
pub mod stratified;
pub mod two_groups;
pub mod yes_no;

use serde::de::DeserializeOwned;
use serde::{Deserialize, Serialize};

use crate::base::format as fmt;
use crate::base::*;
use crate::num::binomial::clopper_pearson;
use crate::num::stats;
use crate::resample::boot;
use crate::resample::driver::{Null, Stop, Stopped};
use crate::resample::rng::RNG_NAME;
use crate::resample::summary::{histogram, tail_region};
use crate::resample::tally::{p_value, Counts};

/// What every design provides. Each design is a unit struct implementing this; the wire
/// layer registers it (one line), the renderer words its report (one module of the same
/// name), and the page gives it a form.
pub trait Design {
    /// The design's key in requests, reports, links and the command.
    const KEY: DesignKey;
    /// What the user asks: the data, the columns and the choices.
    type Request: Clone + std::fmt::Debug + PartialEq + Serialize + DeserializeOwned;
    /// What the run finds: numbers and typed codes, no words.
    type Report: Clone + std::fmt::Debug + PartialEq + Serialize + DeserializeOwned;
    /// Checks the request before any work starts: every setting in range, the work bounded.
    fn check(request: &Self::Request) -> Result<(), Error>;
    /// Runs the request (after [`Design::check`]), reporting progress; false from the
    /// callback stops it.
    fn run(request: &Self::Request, progress: ProgressFn) -> Result<Self::Report, Error>;
    /// The pasted table the request reads ("" when it reads none).
    fn data(request: &Self::Request) -> &str;
    /// Removes the data (and typed counts), keeping the settings: for a settings-only link.
    fn clear_data(request: &mut Self::Request);
    /// Whether the request carries what it analyses (a settings-only link does not).
    fn has_data(request: &Self::Request) -> bool {
        !Self::data(request).trim().is_empty()
    }
    /// The seed of the request's random streams.
    fn seed(request: &Self::Request) -> u64;
    /// The test settings, for designs with a permutation test (to continue a run with more
    /// relabellings or resamples); none for estimates and plans.
    fn test_settings(_request: &mut Self::Request) -> Option<&mut TestSettings> {
        None
    }
    /// The permutation test of a report, for designs with one.
    fn test_outcome(_report: &Self::Report) -> Option<&TestOutcome> {
        None
    }
}

/// The designs, as requests, reports, links and the command name them.
#[derive(Clone, Copy, Debug, PartialEq, Eq, Hash, Serialize, Deserialize)]
#[serde(rename_all = "kebab-case")]
pub enum DesignKey {
    /// Two independent groups.
    TwoGroups,
    /// Paired measurements: each unit measured twice.
    Paired,
    /// One sample against a reference value.
    OneSample,
    /// An association between two numeric columns.
    Association,
    /// Three or more independent groups.
    KGroups,
    /// Two groups compared within strata.
    Stratified,
    /// Yes/no outcomes in two groups.
    YesNo,
    /// Bootstrap intervals for an estimate, without a test.
    Estimate,
    /// Planning a study: power and sample size by simulation.
    Plan,
}

impl DesignKey {
    /// Every design, in the order the page offers them.
    pub const ALL: [DesignKey; 9] = [
        DesignKey::TwoGroups,
        DesignKey::Paired,
        DesignKey::OneSample,
        DesignKey::Association,
        DesignKey::KGroups,
        DesignKey::Stratified,
        DesignKey::YesNo,
        DesignKey::Estimate,
        DesignKey::Plan,
    ];

    /// The key as written in requests and on the command line.
    pub fn key(self) -> &'static str {
        match self {
            DesignKey::TwoGroups => "two-groups",
            DesignKey::Paired => "paired",
            DesignKey::OneSample => "one-sample",
            DesignKey::Association => "association",
            DesignKey::KGroups => "k-groups",
            DesignKey::Stratified => "stratified",
            DesignKey::YesNo => "yes-no",
            DesignKey::Estimate => "estimate",
            DesignKey::Plan => "plan",
        }
    }

    /// The design with this key.
    pub fn from_key(s: &str) -> Option<DesignKey> {
        DesignKey::ALL.into_iter().find(|d| d.key() == s)
    }
}

/// Upper limit of random relabellings, keeping a run inside a browser tab's memory.
pub const MAX_RESAMPLES: u64 = 10_000_000;
/// Upper limit of the exact-enumeration threshold.
pub const MAX_EXACT_LIMIT: u64 = 10_000_000;
/// Upper limit of the sequential stop's count.
pub const MAX_STOP_AFTER: u64 = 10_000;
/// Upper limit of bootstrap resamples.
pub const MAX_BOOTSTRAP: u64 = 1_000_000;

/// The most value draws one request may make (values × resamples, summed over the tests and
/// bootstraps it runs): about 5·10^11, some minutes on one core of a laptop; more would run
/// for hours, so it is refused before any work starts, with the numbers named.
pub const MAX_WORK: f64 = 5e11;

/// The most follow-up comparisons of every pair of groups (50 groups); beyond it, compare
/// each group with a control group instead.
pub const MAX_PAIRS: usize = 1225;

/// Refuses a request whose work (`n` values, each run of `runs` resampling passes of
/// `settings`) is above [`MAX_WORK`], saying how much it would be and what to lower.
pub fn check_work(n: usize, runs: usize, settings: &TestSettings) -> Result<(), Error> {
    check_work_sorted(n, runs, false, settings)
}

/// [`check_work`] for a statistic that sorts or merge-counts its `n` values per resample
/// (Kendall's tau-b, the Kolmogorov–Smirnov distance): each value then costs about log2 n
/// steps, which the bound counts.
pub fn check_work_sorted(
    n: usize,
    runs: usize,
    sorts: bool,
    settings: &TestSettings,
) -> Result<(), Error> {
    let per_value = (settings.resamples + settings.bootstrap_resamples) as f64;
    let steps = if sorts {
        (n.max(2) as f64).log2().ceil()
    } else {
        1.0
    };
    let work = n as f64 * per_value * runs as f64 * steps;
    if work <= MAX_WORK {
        return Ok(());
    }
    let fit = (MAX_WORK / (n as f64 * runs as f64 * steps)).floor();
    Err(over_work_limit(
        format!(
            "This analysis would draw about {} values ({} values × ({} relabellings + {} \
             bootstrap resamples){})",
            fmt::sig(work),
            fmt::count(n as u64),
            fmt::count(settings.resamples),
            fmt::count(settings.bootstrap_resamples),
            if runs > 1 {
                format!(" × {} tests", fmt::count(runs as u64))
            } else {
                String::new()
            } + &if sorts {
                format!(" × {steps} steps per value for this statistic, which sorts its values")
            } else {
                String::new()
            },
        ),
        format!(
            "Lower the relabellings and bootstrap resamples to about {} in total, or analyse \
             fewer values.",
            fmt::count(fit.max(0.0) as u64)
        ),
    ))
}

/// The refusal of work above [`MAX_WORK`]: `what` says how much it would be, `lower` what
/// to lower. The one wording of the limit for tests, estimates and plans.
pub fn over_work_limit(what: String, lower: String) -> Error {
    Error::new(
        ErrorKind::Limit,
        format!(
            "{what}, more than the {} one run may draw (it would take hours). {lower}",
            fmt::sig(MAX_WORK)
        ),
    )
}

/// Size, centre and spread of one group.
#[derive(Clone, Debug, PartialEq, Serialize, Deserialize)]
pub struct GroupSummary {
    /// The group's name (its label, or its column).
    pub name: String,
    /// Number of values.
    pub n: usize,
    /// Mean.
    pub mean: f64,
    /// Median.
    pub median: f64,
    /// Standard deviation (n − 1).
    pub sd: f64,
    /// 20% trimmed mean.
    pub trimmed_mean: f64,
    /// Smallest value.
    pub min: f64,
    /// Largest value.
    pub max: f64,
}

/// A standardized effect size with its bootstrap interval (None when undefined).
#[derive(Clone, Debug, PartialEq, Serialize, Deserialize)]
pub struct EffectSize {
    /// The estimate, if defined.
    pub estimate: Option<f64>,
    /// Its bootstrap interval.
    pub ci: Interval,
}

/// Settings of a permutation test with a bootstrap interval, shared by every test design.
#[derive(Clone, Debug, PartialEq, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct TestSettings {
    /// The direction of the test.
    pub alternative: Alternative,
    /// How a two-sided p-value is defined.
    #[serde(default)]
    pub two_sided: TwoSidedRule,
    /// Random relabellings when enumeration is not feasible.
    pub resamples: u64,
    /// Enumerate every relabelling when there are at most this many.
    pub exact_limit: u64,
    /// Bootstrap resamples.
    pub bootstrap_resamples: u64,
    /// The confidence level of the intervals.
    pub confidence: f64,
    /// Interval methods of the effect: the first is the headline, the others are reported
    /// beside it.
    pub intervals: Vec<IntervalMethod>,
    /// The seed of every random stream of the run.
    pub seed: u64,
    /// Return every relabelled and bootstrap statistic (for a CSV download); up to
    /// [`crate::resample::driver::MAX_KEPT`] of each.
    #[serde(default)]
    pub keep_resamples: bool,
    /// Sequential Monte Carlo: stop drawing random relabellings once this many are at least as
    /// extreme as the observed one (Besag and Clifford 1991); none: draw all of them.
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub stop_after: Option<u64>,
    /// Sequential Monte Carlo: stop drawing random relabellings once the p-value is settled
    /// below or above this level (checked after each block, with a total risk of a wrong side
    /// of [`crate::resample::driver::SETTLE_RISK`]); none: no such check.
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub settle_at: Option<f64>,
    /// The generation of the resampling kernels that computes the run (see [`KERNELS`]):
    /// a request keeps the generation it was made with, so that its link or file gives the
    /// same numbers in later versions. Requests that do not say (made before generation 2)
    /// are generation 1.
    #[serde(default = "first_kernels")]
    pub kernels: u32,
}

/// The newest generation of the resampling kernels, the one new requests use:
/// 1. the kernels of Reshuffle 0.1;
/// 2. as 1, except that samples of at least [`crate::resample::large::LARGE`] values are
///    relabelled and bootstrapped by streaming kernels ([`crate::resample::large`],
///    [`crate::resample::large_boot`]), which draw different (equally valid) resamples.
pub const KERNELS: u32 = 2;

fn first_kernels() -> u32 {
    1
}

/// Refuses a kernel generation this version does not know (a request from a newer version).
pub fn check_kernels(kernels: u32) -> Result<(), Error> {
    if (1..=KERNELS).contains(&kernels) {
        Ok(())
    } else {
        Err(Error::new(
            ErrorKind::Version,
            format!(
                "This request asks for resampling kernels of generation {kernels}; this version \
                 of Reshuffle knows generations 1 to {KERNELS}. Open it with a newer version."
            ),
        ))
    }
}

impl TestSettings {
    /// Continues a run: `relabellings` more random relabellings and `bootstrap` more
    /// bootstrap resamples. Blocks are drawn from streams numbered from the seed, so a run of
    /// the new totals repeats the earlier draws and adds the next ones: its numbers are those
    /// the earlier run would have reached had it gone on.
    pub fn continue_with(&mut self, relabellings: u64, bootstrap: u64) -> Result<(), Error> {
        let add = |total: u64, more: u64, what: &str| {
            total.checked_add(more).ok_or_else(|| {
                Error::settings(format!(
                    "{total} {what} and {more} more are more than can be counted; ask for fewer."
                ))
            })
        };
        self.resamples = add(self.resamples, relabellings, "relabellings")?;
        self.bootstrap_resamples = add(self.bootstrap_resamples, bootstrap, "bootstrap resamples")?;
        Ok(())
    }

    /// The defaults the page and the command start from.
    pub fn new(seed: u64) -> TestSettings {
        TestSettings {
            alternative: Alternative::TwoSided,
            two_sided: TwoSidedRule::Absolute,
            resamples: 100_000,
            exact_limit: 1_000_000,
            bootstrap_resamples: 10_000,
            confidence: 0.95,
            intervals: vec![IntervalMethod::Bca],
            seed,
            keep_resamples: false,
            stop_after: None,
            settle_at: None,
            kernels: KERNELS,
        }
    }

    /// The sequential stop of a test with this observed statistic and tie tolerance, in the
    /// direction of `alternative` (the k-group spreads pass Greater).
    pub fn stop(&self, alternative: Alternative, observed: f64, tolerance: f64) -> Option<Stop> {
        Some(Stop::new(
            self.stop_after,
            self.settle_at,
            alternative,
            self.two_sided,
            observed,
            tolerance,
        ))
    }

    /// The headline interval method.
    pub fn interval(&self) -> IntervalMethod {
        self.intervals
            .first()
            .copied()
            .unwrap_or(IntervalMethod::Bca)
    }

    /// Checks the numbers; `unit` names a random resample ("relabellings").
    pub fn check(&self, unit: &str) -> Result<(), Error> {
        check_kernels(self.kernels)?;
        check_confidence(self.confidence)?;
        if !(99..=MAX_RESAMPLES).contains(&self.resamples)
            || !(200..=MAX_BOOTSTRAP).contains(&self.bootstrap_resamples)
        {
            return Err(Error::settings(format!(
                "Use 99 to {} random {unit} and 200 to {} bootstrap resamples.",
                fmt::count(MAX_RESAMPLES),
                fmt::count(MAX_BOOTSTRAP)
            )));
        }
        if self.exact_limit > MAX_EXACT_LIMIT {
            return Err(Error::settings(format!(
                "The limit for exact enumeration can be at most {} (it is {}).",
                fmt::count(MAX_EXACT_LIMIT),
                fmt::count(self.exact_limit)
            )));
        }
        if self.intervals.is_empty() {
            return Err(Error::settings(
                "Choose at least one interval method (for example BCa).",
            ));
        }
        if let Some(h) = self.stop_after {
            if !(1..=MAX_STOP_AFTER).contains(&h) || h >= self.resamples {
                return Err(Error::settings(format!(
                    "Stop after 1 to {} {unit} at least as extreme as the observed one, fewer \
                     than the {} {unit} drawn at most (it is {}); 10 to 50 is usual.",
                    fmt::count(MAX_STOP_AFTER),
                    fmt::count(self.resamples),
                    fmt::count(h)
                )));
            }
        }
        if let Some(level) = self.settle_at {
            if !(0.0001..=0.5).contains(&level) {
                return Err(Error::settings(format!(
                    "Settle the p-value against a level from 0.0001 to 0.5 (it is {level}); \
                     0.05 or 0.01 is usual."
                )));
            }
        }
        if (self.stop_after.is_some() || self.settle_at.is_some())
            && self.two_sided == TwoSidedRule::DoubledTail
            && self.alternative == Alternative::TwoSided
        {
            return Err(Error::settings(
                "A sequential stop watches one count, so it needs the two-sided p-value by \
                 absolute value (or a one-sided test), not twice the smaller tail.",
            ));
        }
        Ok(())
    }

    /// The interval methods without repeats, headline first.
    pub fn methods(&self) -> Vec<IntervalMethod> {
        let mut out: Vec<IntervalMethod> = Vec::new();
        for m in &self.intervals {
            if !out.contains(m) {
                out.push(*m);
            }
        }
        if out.is_empty() {
            out.push(IntervalMethod::Bca);
        }
        out
    }
}

/// The confidence level must be in (0.5, 0.9999].
pub fn check_confidence(confidence: f64) -> Result<(), Error> {
    if !(confidence > 0.5 && confidence <= 0.9999) {
        return Err(Error::settings(format!(
            "The confidence level must be between 0.5 and 0.9999, for example 0.95 (it is \
             {confidence})."
        )));
    }
    Ok(())
}

/// A caution that comes with a report, as a typed code; `render::words` words it.
#[derive(Clone, Debug, PartialEq, Serialize, Deserialize)]
#[serde(tag = "code", rename_all = "kebab-case")]
pub enum Caution {
    /// What the test assumes (worded for the design).
    Assumptions,
    /// A small sample: little power, intervals too narrow.
    SmallSample {
        /// The size of the smallest group (or the number of pairs).
        smallest: usize,
    },
    /// Unequal spreads with unequal group sizes: the relabelling test of a mean reacts to
    /// the spread; Welch's statistic is safer.
    UnequalSpreads {
        /// Largest SD over smallest.
        ratio: f64,
    },
    /// Unequal spreads with unequal group sizes under a rank statistic: the rank-sum test
    /// then reacts to the spread as well as to a shift.
    UnequalSpreadsRanks {
        /// Largest SD over smallest.
        ratio: f64,
    },
    /// Correlation is not causation.
    NotCausation,
    /// The omnibus test says whether, the follow-ups say where; Holm against BH.
    FollowUps,
    /// Eta squared overstates the population share.
    EtaOverstates,
    /// Why the strata matter (Simpson's paradox).
    StrataMatter,
    /// The weighting of the stratum differences.
    StrataWeighting {
        /// The weights used.
        weights: stratified::StrataWeights,
    },
    /// Strata with few values in a group.
    SmallStrata {
        /// The fewest values of a group in a stratum.
        smallest: usize,
    },
    /// A small expected count makes the chi-square p-value unreliable.
    SmallExpected {
        /// The smallest expected count.
        smallest: f64,
    },
    /// Small groups for proportions.
    SmallGroupsForProportions {
        /// The smaller group's size.
        smallest: u64,
    },
    /// Difference, risk ratio and odds ratio answer different questions.
    MeasuresDiffer,
    /// Several intervals read together do not all hold at once.
    SimultaneousIntervals,
    /// A p-value is not the size of an effect.
    PValueNotEffect,
    /// Several tests on the same data need adjustment.
    Multiplicity,
    /// Clinical, safety or regulatory decisions need a statistician.
    Decisions,
    /// Planning: a pilot's values are noisy guesses.
    PilotIsNoisy,
    /// Planning: the plan rests on the assumed effect and spread.
    AssumedEffect,
    /// Planning: the study must be run as planned.
    RunAsPlanned,
    /// Planning: several primary outcomes lower the power of each.
    PlanMultiplicity,
    /// Planning: sample sizes of regulated studies need a statistician.
    PlanDecisions,
}

/// The cautions that close every test design's list.
pub fn closing_cautions(c: &mut Vec<Caution>) {
    c.push(Caution::PValueNotEffect);
    c.push(Caution::Multiplicity);
    c.push(Caution::Decisions);
}

/// The outcome of a permutation test, as every test design reports it (flattened into the
/// report, so `observed`, `p_value`, `exact`, … are top-level fields).
#[derive(Clone, Debug, PartialEq, Serialize, Deserialize)]
pub struct TestOutcome {
    /// The observed statistic.
    #[serde(with = "float")]
    pub observed: f64,
    /// The p-value.
    pub p_value: f64,
    /// Whether every relabelling was enumerated.
    pub exact: bool,
    /// Relabellings drawn (Monte Carlo) or enumerated (exact).
    pub resamples: u64,
    /// Relabellings at least as extreme as the observed one.
    pub extreme_count: u64,
    /// Monte Carlo standard error of the p-value (None when exact).
    pub mc_se: Option<f64>,
    /// 99% Clopper–Pearson interval for the p-value unlimited relabellings would give.
    pub p_interval: Option<PInterval>,
    /// The seed.
    pub seed: u64,
    /// The generator.
    pub rng: String,
    /// The relabelled statistics, binned.
    pub null_histogram: Histogram,
    /// The part of the null distribution counted toward the p-value.
    pub tail: Tail,
    /// How a sequential Monte Carlo run ended (none: a fixed number was drawn, or exact).
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub sequential: Option<Stopped>,
}

impl TestOutcome {
    /// The outcome from the counts and the statistics of every relabelling.
    pub fn new(
        counts: &Counts,
        values: &[f64],
        exact: bool,
        alternative: Alternative,
        rule: TwoSidedRule,
        observed: f64,
        seed: u64,
    ) -> TestOutcome {
        let pr = p_value(counts, exact, alternative, rule);
        let tail = tail_region(alternative, rule, counts, observed);
        let mut marks = vec![observed];
        marks.extend(tail.low);
        marks.extend(tail.high);
        TestOutcome {
            observed,
            p_value: pr.p,
            exact,
            resamples: counts.total,
            extreme_count: pr.extreme,
            mc_se: pr.mc_se,
            p_interval: pr.interval,
            seed,
            rng: RNG_NAME.into(),
            null_histogram: histogram(values, &marks, 48),
            tail,
            sequential: None,
        }
    }

    /// The outcome of a null distribution made by [`driver::Relabelling`]. A sequential run
    /// that stopped early at the relabelling bringing the watched count to h, after L drawn,
    /// has p = h/L (Besag and Clifford 1991), a standard error of about p·sqrt((1 − p)/h)
    /// (the negative binomial's, by the delta method) and a 99% interval from the
    /// Clopper–Pearson interval of h in L (approximate: L is the random part here). A run
    /// stopped because the p-value was settled keeps the usual (b + 1)/(m + 1) and its Monte
    /// Carlo interval; the guarantee is about the side of the level, not the estimate.
    pub fn from_null(
        null: &Null,
        alternative: Alternative,
        rule: TwoSidedRule,
        observed: f64,
        seed: u64,
    ) -> TestOutcome {
        let mut t = TestOutcome::new(
            &null.counts,
            &null.values,
            null.exact,
            alternative,
            rule,
            observed,
            seed,
        );
        t.sequential = null.stopped;
        if let Some(s) = null.stopped.filter(|s| s.early && s.settled.is_none()) {
            let (h, l) = (t.extreme_count, t.resamples);
            let p = h as f64 / l as f64;
            t.p_value = p;
            t.mc_se = Some(p * ((1.0 - p) / h as f64).sqrt());
            let (low, high) = clopper_pearson(h, l, 0.99);
            t.p_interval = Some(PInterval {
                low,
                high,
                level: 0.99,
            });
            debug_assert_eq!(Some(h), s.after);
        }
        t
    }
}

/// The summary of a bootstrap run for one estimate.
pub struct BootSummary {
    /// One interval per method asked for, the headline first.
    pub intervals: Vec<Interval>,
    /// Bootstrap standard error.
    pub se: Option<f64>,
    /// Mean of the bootstrap values minus the estimate.
    pub bias: Option<f64>,
    /// The bootstrap values, binned.
    pub histogram: Histogram,
}

impl BootSummary {
    /// The headline interval.
    pub fn ci(&self) -> Interval {
        self.intervals[0].clone()
    }
}

/// Intervals (one per method, the headline first), standard error, bias and histogram from
/// the bootstrap values of an estimate. Non-finite values are left out (and counted in each
/// interval's notes). `t` holds the studentized values and the standard error of the
/// estimate, when a method needs them. The acceleration is computed at most once.
pub fn summarise_bootstrap(
    methods: &[IntervalMethod],
    level: f64,
    estimate: f64,
    values: &[f64],
    t: Option<(&[f64], f64)>,
    bounds: Option<(f64, f64)>,
    accel: &mut dyn FnMut() -> (Option<f64>, bool),
) -> BootSummary {
    let finite: Vec<f64> = values.iter().copied().filter(|v| v.is_finite()).collect();
    let t_finite: Option<(Vec<f64>, f64)> =
        t.map(|(tv, se)| (tv.iter().copied().filter(|v| v.is_finite()).collect(), se));
    let summary = boot::Summary {
        estimate,
        boot: &finite,
        t: t_finite.as_ref().map(|(tv, se)| (&tv[..], *se)),
        bounds,
    };
    let mut cached: Option<(Option<f64>, bool)> = None;
    let mut once = || *cached.get_or_insert_with(&mut *accel);
    let dropped = values.len() - finite.len();
    let intervals: Vec<Interval> = methods
        .iter()
        .map(|&method| {
            let mut ci = if estimate.is_finite() {
                boot::interval_by(method, level, Side::TwoSided, &summary, &mut once)
            } else {
                Interval::none(
                    method.into(),
                    level,
                    Side::TwoSided,
                    Note::EstimateNotFinite,
                )
            };
            if dropped > 0 {
                ci.notes.push(Note::UndefinedResamples {
                    count: dropped as u64,
                    total: values.len() as u64,
                });
            }
            ci
        })
        .collect();
    let mut marks = vec![estimate];
    marks.extend(intervals[0].low);
    marks.extend(intervals[0].high);
    BootSummary {
        se: boot::standard_error(&finite),
        bias: (!finite.is_empty() && estimate.is_finite()).then(|| stats::mean(&finite) - estimate),
        histogram: histogram(&finite, &marks, 48),
        intervals,
    }
}

/// The common note on BCa with few resamples.
pub fn few_resamples_note(settings: &TestSettings, notes: &mut Vec<Note>) {
    if settings.bootstrap_resamples < 2000 && settings.interval() == IntervalMethod::Bca {
        notes.push(Note::FewResamplesForBca);
    }
}

/// Size, centre and spread of one group (at least one value) whose values are differences
/// from `shift` (0 when they were not shifted): the centres and the range add it back.
pub fn group_summary(name: &str, x: &[f64], shift: f64) -> GroupSummary {
    let s = stats::sorted(x);
    GroupSummary {
        name: name.to_string(),
        n: x.len(),
        mean: stats::mean(x) + shift,
        median: stats::median_sorted(&s) + shift,
        sd: stats::sd(x),
        trimmed_mean: stats::trimmed_mean_sorted(&s) + shift,
        min: s[0] + shift,
        max: s[s.len() - 1] + shift,
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    /// A statistic that sorts its values per resample counts log2 n steps a value: 300,000
    /// pairs pass the plain bound with the default settings and fail the sorted one, which
    /// names the steps.
    #[test]
    fn sorting_statistics_count_their_steps() {
        let set = TestSettings::new(1);
        assert!(check_work(600_000, 1, &set).is_ok());
        let e = check_work_sorted(600_000, 1, true, &set).unwrap_err();
        assert!(e.message.contains("× 20 steps per value"), "{}", e.message);
        assert!(check_work_sorted(20_000, 1, true, &set).is_ok());
    }
    use crate::resample::driver::random_range;
    use crate::resample::rng::{self, Stream};

    /// The sequential p-value is valid: under the null, P(p ≤ α) ≤ α (Besag and Clifford
    /// 1991, section 2). Observed and relabelled statistics are here independent uniform
    /// draws (the null exactly); 20,000 tests with h = 10 reject at α = 0.05 at most at
    /// 0.05 + 4 standard errors (0.0015 each); 0.052 with this seed. A p-value one count too
    /// small (p = (h − 1)/L) rejected 0.058 of them, and fails this.
    #[test]
    fn the_sequential_p_value_is_valid_under_the_null() {
        let mut obs_stream = Stream::new(77, rng::Purpose::Bootstrap, 0);
        let mut rejected = 0;
        let reps = 20_000;
        for r in 0..reps {
            let obs = obs_stream.unit();
            let block = |mut s: Stream, len: u64| {
                let mut c = Counts::default();
                let v: Vec<f64> = (0..len).map(|_| s.unit()).collect();
                for t in &v {
                    c.record(*t, obs, 0.0);
                }
                (c, v)
            };
            let stop = Some(Stop::new(
                Some(10),
                None,
                Alternative::Greater,
                TwoSidedRule::Absolute,
                obs,
                0.0,
            ));
            let (counts, values, ended) = random_range(
                r,
                999,
                0..1,
                stop,
                Stage::Relabelling,
                &mut |_| true,
                &block,
            )
            .unwrap();
            let null = Null {
                counts,
                values,
                exact: false,
                stopped: Some(Stopped {
                    after: Some(10),
                    settle: None,
                    limit: 999,
                    early: ended.is_some(),
                    settled: None,
                }),
            };
            let t =
                TestOutcome::from_null(&null, Alternative::Greater, TwoSidedRule::Absolute, obs, r);
            rejected += u32::from(t.p_value <= 0.05);
        }
        let rate = rejected as f64 / reps as f64;
        assert!(rate <= 0.05 + 4.0 * 0.0015, "{rate}");
        assert!(rate > 0.03, "{rate}");
    }
}

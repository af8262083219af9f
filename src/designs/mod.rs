//! The designs: one module per design, each with its request, its validation, its run and
//! its report. This module holds what they share: the settings block of a permutation test,
//! the outcome of a test (p-value, Monte Carlo error, the null histogram and the tail counted
//! toward p), the summary of a bootstrap run, group summaries and the common checks.

pub mod association;
pub mod estimate;
pub mod k_groups;
pub mod paired;
pub mod plan;
pub mod stratified;
pub mod two_groups;
pub mod yes_no;

use serde::{Deserialize, Serialize};

use crate::base::format as fmt;
use crate::base::*;
use crate::num::stats;
use crate::resample::boot;
use crate::resample::rng::RNG_NAME;
use crate::resample::summary::{histogram, tail_region};
use crate::resample::tally::{p_value, Counts};

/// Upper limits that keep a run inside a browser tab's memory.
pub const MAX_RESAMPLES: u64 = 10_000_000;
pub const MAX_EXACT_LIMIT: u64 = 10_000_000;
pub const MAX_BOOTSTRAP: u64 = 1_000_000;

#[derive(Clone, Debug, PartialEq, Serialize, Deserialize)]
pub struct GroupSummary {
    pub name: String,
    pub n: usize,
    pub mean: f64,
    pub median: f64,
    pub sd: f64,
    pub trimmed_mean: f64,
    pub min: f64,
    pub max: f64,
}

#[derive(Clone, Debug, PartialEq, Serialize, Deserialize)]
pub struct EffectSize {
    pub name: String,
    pub estimate: Option<f64>,
    pub ci: Interval,
}

/// Settings of a permutation test with a bootstrap interval.
#[derive(Clone, Debug, PartialEq, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct TestSettings {
    pub alternative: Alternative,
    #[serde(default)]
    pub two_sided: TwoSidedRule,
    /// Random relabellings when enumeration is not feasible.
    pub resamples: u64,
    /// Enumerate every relabelling when there are at most this many.
    pub exact_limit: u64,
    pub bootstrap_resamples: u64,
    pub confidence: f64,
    /// The method of the reported intervals.
    pub interval: IntervalMethod,
    pub seed: u64,
}

impl TestSettings {
    /// The defaults the page and the command start from.
    pub fn new(seed: u64) -> TestSettings {
        TestSettings {
            alternative: Alternative::TwoSided,
            two_sided: TwoSidedRule::Absolute,
            resamples: 100_000,
            exact_limit: 1_000_000,
            bootstrap_resamples: 10_000,
            confidence: 0.95,
            interval: IntervalMethod::Bca,
            seed,
        }
    }

    /// Checks the format version and the numbers; `unit` names a random resample.
    pub fn check(&self, version: u32, unit: &str) -> Result<(), RunError> {
        check_common(
            version,
            self.confidence,
            self.resamples,
            self.bootstrap_resamples,
            unit,
        )?;
        if self.exact_limit > MAX_EXACT_LIMIT {
            return Err(RunError::Input(format!(
                "The limit for exact enumeration can be at most {} (it is {}).",
                fmt::count(MAX_EXACT_LIMIT),
                fmt::count(self.exact_limit)
            )));
        }
        Ok(())
    }
}

/// The outcome of a permutation test, as every design reports it.
#[derive(Clone, Debug, PartialEq, Serialize, Deserialize)]
pub struct TestOutcome {
    #[serde(with = "float")]
    pub observed: f64,
    pub p_value: f64,
    pub exact: bool,
    /// Relabellings drawn (Monte Carlo) or enumerated (exact).
    pub resamples: u64,
    /// Relabellings at least as extreme as the observed one.
    pub extreme_count: u64,
    /// Monte Carlo standard error of the p-value (None when exact).
    pub mc_se: Option<f64>,
    /// 99% Clopper–Pearson interval for the p-value unlimited relabellings would give.
    pub p_interval: Option<PInterval>,
    pub seed: u64,
    pub rng: String,
    pub null_histogram: Histogram,
    /// The part of the null distribution counted toward the p-value.
    pub tail: Tail,
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
        }
    }

    /// How the p-value was found, in a few words: "exact, all 34,650 relabellings" or
    /// "Monte Carlo, 100,000 random relabellings, standard error 0.0012".
    pub fn how(&self, unit: &str) -> String {
        if self.exact {
            format!("exact, all {} {unit}", fmt::count(self.resamples))
        } else {
            let pi = self
                .p_interval
                .as_ref()
                .map(|p| format!("; 99% interval {:.4} to {:.4}", p.low, p.high))
                .unwrap_or_default();
            format!(
                "Monte Carlo, {} random {unit}, p = (b + 1)/(m + 1), standard error {:.4}{pi}",
                fmt::count(self.resamples),
                self.mc_se.unwrap_or(0.0)
            )
        }
    }

    /// "p = .012 (exact, …)" for reports.
    pub fn p_line(&self, unit: &str) -> String {
        format!("{} ({})", fmt::p_value(self.p_value), self.how(unit))
    }
}

/// The summary of a bootstrap run for one estimate.
pub struct BootSummary {
    pub ci: Interval,
    pub se: Option<f64>,
    pub bias: Option<f64>,
    pub histogram: Histogram,
}

/// Interval, standard error, bias and histogram from the bootstrap values of an estimate.
/// Non-finite values are left out (and counted in the interval's note). `t` holds the
/// studentized values and the standard error of the estimate, when the method needs them.
pub fn summarise_bootstrap(
    method: IntervalMethod,
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
    let mut ci = if estimate.is_finite() {
        boot::interval_by(method, level, Side::TwoSided, &summary, accel)
    } else {
        Interval::none(
            method.into(),
            level,
            Side::TwoSided,
            Note::EstimateNotFinite,
        )
    };
    let dropped = values.len() - finite.len();
    if dropped > 0 {
        let extra = Note::UndefinedResamples {
            count: dropped as u64,
            total: values.len() as u64,
        };
        ci.notes.push(extra);
    }
    let mut marks = vec![estimate];
    marks.extend(ci.low);
    marks.extend(ci.high);
    BootSummary {
        se: boot::standard_error(&finite),
        bias: (!finite.is_empty() && estimate.is_finite()).then(|| stats::mean(&finite) - estimate),
        histogram: histogram(&finite, &marks, 48),
        ci,
    }
}

/// The common note on BCa with few resamples.
pub fn few_resamples_note(settings: &TestSettings, notes: &mut Vec<Note>) {
    if settings.bootstrap_resamples < 2000 && settings.interval == IntervalMethod::Bca {
        notes.push(Note::FewResamplesForBca);
    }
}

/// The closing cautions every design shares.
pub fn closing_cautions(c: &mut Vec<String>) {
    c.push(
        "A p-value says how unusual the observed result would be if there were no effect; it \
         is not the size or the importance of the effect. Read it together with the interval."
            .into(),
    );
    c.push(
        "Clinical, safety or regulatory decisions need a qualified statistician and the \
         guidelines that apply to them; this result alone is not enough."
            .into(),
    );
}

/// Settings every permutation design checks: format version, confidence level, and the
/// numbers of random resamples (called `unit`, e.g. "sign patterns") and bootstrap resamples.
pub fn check_common(
    version: u32,
    confidence: f64,
    resamples: u64,
    bootstrap: u64,
    unit: &str,
) -> Result<(), RunError> {
    if version != FORMAT_VERSION {
        return Err(RunError::Input(format!(
            "Format version {version} cannot be read by this version (reads {FORMAT_VERSION})."
        )));
    }
    if !(confidence > 0.5 && confidence <= 0.9999) {
        return Err(RunError::Input(format!(
            "The confidence level must be between 0.5 and 0.9999 (it is {confidence})."
        )));
    }
    if !(99..=MAX_RESAMPLES).contains(&resamples) || !(200..=MAX_BOOTSTRAP).contains(&bootstrap) {
        return Err(RunError::Input(format!(
            "Use 99 to {} random {unit} and 200 to {} bootstrap resamples.",
            fmt::count(MAX_RESAMPLES),
            fmt::count(MAX_BOOTSTRAP)
        )));
    }
    Ok(())
}

/// Size, centre and spread of one group (at least one value).
pub fn group_summary(name: &str, x: &[f64]) -> GroupSummary {
    let s = stats::sorted(x);
    GroupSummary {
        name: name.to_string(),
        n: x.len(),
        mean: stats::mean(x),
        median: stats::median_sorted(&s),
        sd: stats::sd(x),
        trimmed_mean: stats::trimmed_mean_sorted(&s),
        min: s[0],
        max: s[s.len() - 1],
    }
}

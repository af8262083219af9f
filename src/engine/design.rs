//! What the permutation designs share: their settings block, the outcome of a permutation
//! test (p-value, Monte Carlo error, the null histogram and the tail counted toward p), the
//! driver for random blocks, and the summary of a bootstrap run. The k-groups, stratified
//! and yes/no designs are built on these; a new design should be too.

use serde::{Deserialize, Serialize};

use super::analysis::{self, histogram, tail_region, ProgressFn, RunError};
use super::boot;
use super::format as fmt;
use super::perm::Counts;
use super::protocol::*;
use super::rng::{self, Stream, RNG_NAME};
use super::stats;

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

    /// The same settings as a two-group request.
    pub fn from_request(r: &Request) -> TestSettings {
        TestSettings {
            alternative: r.alternative,
            two_sided: r.two_sided,
            resamples: r.resamples,
            exact_limit: r.exact_limit,
            bootstrap_resamples: r.bootstrap_resamples,
            confidence: r.confidence,
            interval: r.interval,
            seed: r.seed,
        }
    }

    /// Checks the format version and the numbers; `unit` names a random resample.
    pub fn check(&self, version: u32, unit: &str) -> Result<(), RunError> {
        analysis::check_common(
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
    /// The figure of this null distribution: `label` names the statistic, `unit` a
    /// relabelling, `how` says how the null is made.
    pub fn null_figure<'a>(
        &'a self,
        label: &'a str,
        unit: &'a str,
        how: &'a str,
    ) -> super::plot::NullFigure<'a> {
        super::plot::NullFigure {
            label,
            unit,
            how,
            observed: self.observed,
            exact: self.exact,
            resamples: self.resamples,
            extreme: self.extreme_count,
            p_value: self.p_value,
            tail: &self.tail,
            histogram: &self.null_histogram,
        }
    }

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
        let pr = analysis::p_value(counts, exact, alternative, rule);
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

/// Runs `total` random relabellings in blocks of [`rng::BLOCK`], block b drawing from the
/// stream (seed, permutation, b); merges the blocks in order, reporting progress after each.
pub fn random_null(
    seed: u64,
    total: u64,
    stage: &str,
    progress: ProgressFn,
    block: &mut dyn FnMut(Stream, u64) -> (Counts, Vec<f64>),
) -> Result<(Counts, Vec<f64>), RunError> {
    let mut counts = Counts::default();
    let mut values = Vec::with_capacity(total.min(MAX_KEPT as u64) as usize);
    let streams = rng::Streams::new(seed, rng::Purpose::Permutation, 0);
    for (b, stream) in (0..rng::block_count(total)).zip(streams) {
        let (c, v) = block(stream, rng::block_len(total, b));
        counts.add(&c);
        values.extend(v);
        if !progress(&Progress {
            stage: stage.into(),
            done: counts.total,
            total,
        }) {
            return Err(RunError::Cancelled);
        }
    }
    Ok((counts, values))
}

/// How a design's null distribution is made: every relabelling when there are `count` of
/// them and that is at most `exact_limit`, otherwise `resamples` random ones from `seed`.
pub struct Relabelling<'a> {
    pub count: u64,
    pub exact_limit: u64,
    pub resamples: u64,
    pub seed: u64,
    /// What the progress display calls the work, e.g. "relabelling" or "sign patterns".
    pub stage: &'a str,
}

/// Enumerates every relabelling, calling its argument with the number done now and then
/// (false stops it: then None).
pub type Enumerate<'a> =
    &'a mut dyn FnMut(&mut dyn FnMut(u64) -> bool) -> Option<(Counts, Vec<f64>)>;

impl Relabelling<'_> {
    /// The counts and statistics of the relabellings, and whether they are all of them.
    pub fn run(
        &self,
        progress: ProgressFn,
        enumerate: Enumerate,
        random: &mut dyn FnMut(Stream, u64) -> (Counts, Vec<f64>),
    ) -> Result<(Counts, Vec<f64>, bool), RunError> {
        if self.count <= self.exact_limit {
            let mut cb = |done: u64| {
                progress(&Progress {
                    stage: self.stage.into(),
                    done,
                    total: self.count,
                })
            };
            let (c, v) = enumerate(&mut cb).ok_or(RunError::Cancelled)?;
            Ok((c, v, true))
        } else {
            let (c, v) = random_null(self.seed, self.resamples, self.stage, progress, random)?;
            Ok((c, v, false))
        }
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
        Interval {
            low: None,
            high: None,
            level,
            method: method.key().into(),
            side: Side::TwoSided,
            note: Some("Undefined: the estimate itself is not a finite number.".into()),
        }
    };
    let dropped = values.len() - finite.len();
    if dropped > 0 {
        let extra = format!(
            "{} of {} bootstrap resamples gave no finite value and {} left out.",
            fmt::count(dropped as u64),
            fmt::count(values.len() as u64),
            if dropped == 1 { "was" } else { "were" }
        );
        ci.note = Some(match ci.note {
            Some(n) => format!("{n} {extra}"),
            None => extra,
        });
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
pub fn few_resamples_note(settings: &TestSettings, notes: &mut Vec<String>) {
    if settings.bootstrap_resamples < 2000 && settings.interval == IntervalMethod::Bca {
        notes.push(
            "BCa limits rest on the outer bootstrap values; 2,000 or more bootstrap resamples \
             are commonly recommended (common practice)."
                .into(),
        );
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

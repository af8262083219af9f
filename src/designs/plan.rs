//! Planning a study by simulation: the power of the analysis at a sample size, the smallest
//! sample size reaching a target power, and the smallest effect detectable at a given size.
//!
//! A simulated study draws data from an assumed model (normal values with a given SD, values
//! resampled from pilot data with an assumed effect added, or yes/no outcomes with given
//! rates), runs the same test the analysis runs (a permutation test with a modest number of
//! random relabellings, p = (b + 1)/(m + 1), or the exact test for yes/no outcomes), and
//! counts a rejection when p ≤ α. Power is the share of rejections, with its Monte Carlo
//! error. To keep this affordable the search starts from a normal-approximation guess of the
//! sample size, evaluates a few sizes around it, stops a size early once a 99.9% interval for
//! its power lies clearly above or below the target, and bisects between the sizes that
//! bracket the target.

use serde::{Deserialize, Serialize};

use crate::base::format as fmt;
use crate::base::*;
use crate::classical::tables;
use crate::input::table::{self, HeaderChoice};
use crate::num::binomial::clopper_pearson;
use crate::num::{normal, stats};
use crate::resample::binomial::Binomial;
use crate::resample::k_groups::{KSetup, KStatistic};
use crate::resample::rng;
use crate::resample::rng::{Stream, RNG_NAME};
use crate::resample::signs::{FlipSetup, FlipStatistic};
use crate::resample::tally::{p_value, Counts};
use crate::resample::two_groups::Setup;
use crate::resample::two_groups::Statistic;

#[derive(Clone, Copy, Debug, PartialEq, Eq, Serialize, Deserialize)]
#[serde(rename_all = "kebab-case")]
pub enum PlanDesign {
    TwoGroups,
    Paired,
    KGroups,
    YesNo,
}

impl PlanDesign {
    pub fn key(self) -> &'static str {
        match self {
            PlanDesign::TwoGroups => "two-groups",
            PlanDesign::Paired => "paired",
            PlanDesign::KGroups => "k-groups",
            PlanDesign::YesNo => "yes-no",
        }
    }
    pub fn from_key(s: &str) -> Option<PlanDesign> {
        [
            PlanDesign::TwoGroups,
            PlanDesign::Paired,
            PlanDesign::KGroups,
            PlanDesign::YesNo,
        ]
        .into_iter()
        .find(|d| d.key() == s)
    }
    /// What one unit of the sample size counts.
    fn per(self) -> &'static str {
        match self {
            PlanDesign::Paired => "pairs",
            _ => "per group",
        }
    }
}

/// Where the simulated data come from.
#[derive(Clone, Debug, PartialEq, Serialize, Deserialize)]
#[serde(tag = "kind", rename_all = "kebab-case")]
pub enum PlanModel {
    /// Normally distributed values with this standard deviation (of the differences, for
    /// paired data).
    Normal { sd: f64 },
    /// Values resampled from a pilot column (centred at its mean; for two or more groups the
    /// same values serve every group), with the assumed effect added, or multiplying the
    /// values when `multiply` is set (positive data).
    Pilot {
        data: String,
        #[serde(default)]
        header: HeaderChoice,
        value: String,
        #[serde(default)]
        multiply: bool,
    },
    /// Yes/no outcomes: the share of yes in the reference group.
    Rates { baseline: f64 },
}

#[derive(Clone, Debug, PartialEq, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct PlanRequest {
    pub format_version: u32,
    pub design: PlanDesign,
    pub model: PlanModel,
    /// The assumed effect: the difference in means of the treated group minus the reference
    /// (the mean difference for pairs); the ratio treated / reference with a multiplicative
    /// pilot model; the yes rate of the treated group minus the baseline; for k groups, a
    /// factor on `means`.
    pub effect: f64,
    /// k groups: the assumed group means (shifts), e.g. [0, 0, 0.5].
    #[serde(default)]
    pub means: Vec<f64>,
    /// The test statistic, as in the analysis ("mean-difference", "welch-t", "median", "f",
    /// …); empty for the design's default.
    #[serde(default)]
    pub statistic: String,
    pub alpha: f64,
    pub alternative: Alternative,
    pub target_power: f64,
    /// Simulated studies per evaluated sample size (at most; fewer when stopped early).
    pub studies: u64,
    /// Random relabellings per simulated study.
    pub relabellings: u64,
    /// The largest sample size the search may try.
    pub max_n: u64,
    /// Also find the smallest detectable effect at this sample size.
    #[serde(default)]
    pub mde_n: Option<u64>,
    pub seed: u64,
}

impl PlanRequest {
    pub fn new(design: PlanDesign, model: PlanModel, effect: f64, seed: u64) -> PlanRequest {
        PlanRequest {
            format_version: FORMAT_VERSION,
            design,
            model,
            effect,
            means: Vec::new(),
            statistic: String::new(),
            alpha: 0.05,
            alternative: Alternative::TwoSided,
            target_power: 0.8,
            studies: 1000,
            relabellings: 199,
            max_n: 2000,
            mde_n: None,
            seed,
        }
    }
}

/// Power at one sample size and effect.
#[derive(Clone, Debug, PartialEq, Serialize, Deserialize)]
pub struct PowerPoint {
    /// Per group (pairs for a paired design).
    pub n: u64,
    pub effect: f64,
    pub power: f64,
    /// Monte Carlo standard error of the power.
    pub se: f64,
    /// 95% Clopper–Pearson interval for the power.
    pub low: f64,
    pub high: f64,
    pub studies: u64,
    /// Stopped before all studies were simulated, because the power was clearly above or
    /// below the target.
    pub stopped_early: bool,
}

/// The sample size at the target power read off a curve fitted through every simulated
/// point: probit(power) = a + b·√n, by weighted least squares (weights from each point's
/// binomial variance on the probit scale), with a delta-method standard error.
#[derive(Clone, Debug, PartialEq, Serialize, Deserialize)]
pub struct Smoothed {
    pub n: f64,
    pub se: f64,
    /// The points the fit used.
    pub points: usize,
}

#[derive(Clone, Debug, PartialEq, Serialize, Deserialize)]
pub struct Detectable {
    pub n: u64,
    /// The smallest effect found to reach the target power at `n`.
    pub effect: f64,
    pub power: PowerPoint,
    /// The bisection's last bracket: below `low` the power was below the target.
    pub bracket: (f64, f64),
}

#[derive(Clone, Debug, PartialEq, Serialize, Deserialize)]
pub struct PlanReport {
    pub format_version: u32,
    pub engine_version: String,
    pub design: PlanDesign,
    pub model_label: String,
    pub statistic_label: String,
    pub test_label: String,
    pub effect: f64,
    pub effect_label: String,
    /// k groups: the assumed group means.
    #[serde(default)]
    pub means: Vec<f64>,
    pub alpha: f64,
    pub alternative: Alternative,
    pub target_power: f64,
    /// The normal-approximation first guess of the sample size.
    pub first_guess: Option<f64>,
    /// Every evaluated sample size at the assumed effect, in order of n.
    pub curve: Vec<PowerPoint>,
    /// The smallest evaluated n whose estimated power reached the target.
    pub required: Option<PowerPoint>,
    /// The sample size at the target power from a curve fitted through all points.
    pub smoothed: Option<Smoothed>,
    pub detectable: Option<Detectable>,
    pub studies: u64,
    pub relabellings: u64,
    pub seed: u64,
    pub rng: String,
    pub notes: Vec<Note>,
    /// Sentences for a proposal.
    pub sentences: Vec<String>,
    /// What was traded for speed.
    pub tradeoffs: Vec<String>,
    pub cautions: Vec<String>,
}

/// The statistic of the simulated test.
#[derive(Clone, Copy, Debug)]
enum Test {
    Two(Statistic),
    Flip(FlipStatistic),
    K(KStatistic),
    Exact,
}

impl Test {
    fn label(self) -> String {
        match self {
            Test::Two(s) => s.label().to_string(),
            Test::Flip(FlipStatistic::Mean) => "mean of the differences".into(),
            Test::Flip(FlipStatistic::Median) => "median of the differences".into(),
            Test::K(k) => k.label().to_string(),
            Test::Exact => "difference in proportions (exact test)".into(),
        }
    }
}

/// Data generation for one design and model, prepared once.
struct Sim {
    design: PlanDesign,
    test: Test,
    /// Pilot values centred at their mean, and that mean (for multiplicative effects).
    pilot: Option<(Vec<f64>, f64)>,
    sd: f64,
    multiply: bool,
    baseline: f64,
    means: Vec<f64>,
    alternative: Alternative,
    alpha: f64,
    relabellings: u64,
}

/// A standard normal draw by inversion (pure-Rust quantile, so the same on every machine).
#[inline]
fn gauss(s: &mut Stream) -> f64 {
    let u = ((s.next_u64() >> 11) as f64 + 0.5) * (1.0 / (1u64 << 53) as f64);
    normal::quantile(u)
}

impl Sim {
    /// One value of a group whose shift (or ratio) is `shift`.
    fn value(&self, s: &mut Stream, shift: f64) -> f64 {
        match &self.pilot {
            Some((r, m)) => {
                let v = m + r[s.below(r.len() as u64) as usize];
                if self.multiply {
                    v * shift
                } else {
                    v + shift
                }
            }
            None => shift + self.sd * gauss(s),
        }
    }

    /// The no-effect value of `shift` (0, or 1 for a ratio).
    fn null_shift(&self) -> f64 {
        if self.multiply {
            1.0
        } else {
            0.0
        }
    }

    /// One simulated study with `n` per group at `effect`: whether the test rejects. For
    /// yes/no outcomes, `rates` holds the treated and the baseline yes counts' distributions.
    fn study(
        &self,
        mut s: Stream,
        n: u64,
        effect: f64,
        rates: Option<&(Binomial, Binomial)>,
    ) -> bool {
        let n_us = n as usize;
        let p = match (self.design, self.test) {
            (PlanDesign::YesNo, _) => match rates {
                Some((b1, b0)) => {
                    let (a, c) = (b1.draw(&mut s), b0.draw(&mut s));
                    tables::exact_p(a, n, c, n, self.alternative)
                }
                None => 1.0,
            },
            (PlanDesign::TwoGroups, Test::Two(st)) => {
                let treated: Vec<f64> = (0..n_us).map(|_| self.value(&mut s, effect)).collect();
                let reference: Vec<f64> = (0..n_us)
                    .map(|_| self.value(&mut s, self.null_shift()))
                    .collect();
                let setup = Setup::new(st, &treated, &reference);
                let (c, _) = setup.random_block(s, self.relabellings);
                self.p_of(&c)
            }
            (PlanDesign::Paired, Test::Flip(st)) => {
                let d: Vec<f64> = (0..n_us).map(|_| self.value(&mut s, effect)).collect();
                let setup = FlipSetup::new(st, &d);
                let (c, _) = setup.random_block(s, self.relabellings);
                self.p_of(&c)
            }
            (PlanDesign::KGroups, Test::K(st)) => {
                let groups: Vec<Vec<f64>> = self
                    .means
                    .iter()
                    .map(|m| (0..n_us).map(|_| self.value(&mut s, m * effect)).collect())
                    .collect();
                let setup = KSetup::new(st, &groups);
                let (c, _) = setup.random_block(s, self.relabellings);
                let b = c.ge;
                (b + 1) as f64 / (c.total + 1) as f64
            }
            _ => 1.0,
        };
        p <= self.alpha
    }

    fn p_of(&self, c: &Counts) -> f64 {
        p_value(c, false, self.alternative, TwoSidedRule::Absolute).p
    }

    /// Power at `n` and `effect` from up to `studies` simulated studies. With `early`, stops
    /// after a batch once a 99.9% interval for the power excludes `target`.
    #[allow(clippy::too_many_arguments)]
    fn power(
        &self,
        n: u64,
        effect: f64,
        studies: u64,
        early: Option<f64>,
        seed: u64,
        progress: ProgressFn,
        stage: &str,
    ) -> Result<PowerPoint, RunError> {
        const BATCH: u64 = 100;
        let streams = rng::Streams::new(seed, rng::Purpose::Bootstrap, 0);
        let mut hits = 0u64;
        let mut done = 0u64;
        let mut stopped_early = false;
        let rates = (self.design == PlanDesign::YesNo).then(|| {
            (
                Binomial::with_rate(n, (self.baseline + effect).clamp(0.0, 1.0)),
                Binomial::with_rate(n, self.baseline),
            )
        });
        for stream in streams.take(studies as usize) {
            hits += u64::from(self.study(stream, n, effect, rates.as_ref()));
            done += 1;
            if done % BATCH == 0 {
                if !progress(&Progress {
                    stage: stage.into(),
                    done,
                    total: studies,
                }) {
                    return Err(RunError::Cancelled);
                }
                if let Some(target) = early {
                    if done >= 2 * BATCH && done < studies {
                        let (lo, hi) = clopper_pearson(hits, done, 0.999);
                        if hi < target || lo > target {
                            stopped_early = true;
                            break;
                        }
                    }
                }
            }
        }
        let power = hits as f64 / done as f64;
        let (low, high) = clopper_pearson(hits, done, 0.95);
        Ok(PowerPoint {
            n,
            effect,
            power,
            se: (power * (1.0 - power) / done as f64).sqrt(),
            low,
            high,
            studies: done,
            stopped_early,
        })
    }
}

/// The seed of the simulated studies at one (n, effect): derived from the run's seed, so a
/// point's numbers do not depend on which other points were evaluated before it.
fn point_seed(seed: u64, n: u64, effect: f64) -> u64 {
    rng::sub_seed(rng::sub_seed(seed, n), effect.to_bits())
}

fn check(req: &PlanRequest) -> Result<(Sim, String, f64, f64), RunError> {
    let bad = |m: String| Err(RunError::Input(m));
    if req.format_version != FORMAT_VERSION {
        return bad(format!(
            "Format version {} cannot be read by this version (reads {FORMAT_VERSION}).",
            req.format_version
        ));
    }
    if !(req.alpha > 0.0 && req.alpha < 0.5) {
        return bad(format!(
            "The significance level must be between 0 and 0.5, for example 0.05 (it is {}).",
            req.alpha
        ));
    }
    if !(req.target_power > 0.05 && req.target_power < 1.0) {
        return bad(format!(
            "The target power must be between 0.05 and 1, for example 0.8 (it is {}).",
            req.target_power
        ));
    }
    if !(200..=100_000).contains(&req.studies) {
        return bad(format!(
            "Use 200 to 100,000 simulated studies per sample size (it is {}).",
            fmt::count(req.studies)
        ));
    }
    if !(19..=9_999).contains(&req.relabellings) {
        return bad(format!(
            "Use 19 to 9,999 random relabellings per simulated study (it is {}); with fewer \
             than 1/α − 1 the test can never reject.",
            fmt::count(req.relabellings)
        ));
    }
    if ((req.relabellings + 1) as f64) * req.alpha < 1.0 && req.design != PlanDesign::YesNo {
        return bad(format!(
            "With {} relabellings per study the smallest possible p-value is {}, above the \
             significance level {}: no study could reject. Use at least {} relabellings.",
            req.relabellings,
            fmt::sig(1.0 / (req.relabellings + 1) as f64),
            req.alpha,
            (1.0 / req.alpha).ceil() as u64 - 1
        ));
    }
    if !(4..=1_000_000).contains(&req.max_n) {
        return bad("The largest sample size to try must be between 4 and 1,000,000.".into());
    }
    if !req.effect.is_finite() {
        return bad("The assumed effect must be a number.".into());
    }
    let test = match (req.design, req.statistic.as_str()) {
        (PlanDesign::TwoGroups, "") => Test::Two(Statistic::MeanDifference),
        (PlanDesign::TwoGroups, k) => Test::Two(Statistic::from_key(k).ok_or_else(|| {
            RunError::Input(format!(
                "For two groups the statistic is one of {} (not \"{k}\").",
                Statistic::ALL.map(|s| s.key()).join(", ")
            ))
        })?),
        (PlanDesign::Paired, "") => Test::Flip(FlipStatistic::Mean),
        (PlanDesign::Paired, k) => Test::Flip(FlipStatistic::from_key(k).ok_or_else(|| {
            RunError::Input(format!(
                "For paired data the statistic is mean or median (not \"{k}\")."
            ))
        })?),
        (PlanDesign::KGroups, "") => Test::K(KStatistic::F),
        (PlanDesign::KGroups, k) => Test::K(KStatistic::from_key(k).ok_or_else(|| {
            RunError::Input(format!(
                "For k groups the statistic is f, welch-f or median-spread (not \"{k}\")."
            ))
        })?),
        (PlanDesign::YesNo, "" | "proportion-difference") => Test::Exact,
        (PlanDesign::YesNo, k) => {
            return bad(format!(
                "Yes/no outcomes are planned with the exact test of the difference in \
                 proportions (not \"{k}\")."
            ))
        }
    };
    let mut sim = Sim {
        design: req.design,
        test,
        pilot: None,
        sd: 1.0,
        multiply: false,
        baseline: 0.0,
        means: req.means.clone(),
        alternative: req.alternative,
        alpha: req.alpha,
        relabellings: req.relabellings,
    };
    if req.design == PlanDesign::KGroups {
        if req.means.len() < 3 || req.means.iter().any(|m| !m.is_finite()) {
            return bad(
                "For k groups give the assumed mean of each of 3 or more groups, for example \
                 0, 0, 0.5 (only their differences matter)."
                    .into(),
            );
        }
        if req.means.iter().all(|m| *m == req.means[0]) {
            return bad(
                "The assumed group means are all equal: there is no effect to detect.".into(),
            );
        }
        if req.alternative != Alternative::TwoSided {
            return bad("The k-group test has no direction; plan it as two-sided.".into());
        }
    }
    let (model_label, spread, centre) = match (&req.model, req.design) {
        (PlanModel::Rates { .. }, d) if d != PlanDesign::YesNo => {
            return bad("Rates describe yes/no outcomes; choose the yes/no design.".into())
        }
        (_, PlanDesign::YesNo) if !matches!(req.model, PlanModel::Rates { .. }) => {
            return bad("Yes/no outcomes are planned from rates: give the baseline rate.".into())
        }
        (PlanModel::Rates { baseline }, _) => {
            if !(*baseline > 0.0 && *baseline < 1.0) {
                return bad(format!(
                    "The baseline rate must be between 0 and 1, for example 0.14 (it is {baseline})."
                ));
            }
            let other = baseline + req.effect;
            if !(0.0..=1.0).contains(&other) {
                return bad(format!(
                    "A baseline rate of {baseline} and a difference of {} give a rate of {}, \
                     outside 0 to 1.",
                    req.effect,
                    fmt::sig(other)
                ));
            }
            sim.baseline = *baseline;
            (
                format!("yes/no outcomes, baseline rate {}", fmt::plain(*baseline)),
                (baseline * (1.0 - baseline)).sqrt(),
                *baseline,
            )
        }
        (PlanModel::Normal { sd }, _) => {
            if !(*sd > 0.0 && sd.is_finite()) {
                return bad(format!(
                    "The standard deviation must be a positive number (it is {sd})."
                ));
            }
            sim.sd = *sd;
            (
                format!(
                    "normal values with standard deviation {}{}",
                    fmt::plain(*sd),
                    if req.design == PlanDesign::Paired {
                        " (of the differences)"
                    } else {
                        ""
                    }
                ),
                *sd,
                0.0,
            )
        }
        (
            PlanModel::Pilot {
                data,
                header,
                value,
                multiply,
            },
            _,
        ) => {
            let t = table::parse(data, *header)?;
            let nums = t.column(value)?.numbers(t.decimal_comma)?;
            let v: Vec<f64> = nums.values.iter().map(|x| x.1).collect();
            if v.len() < 5 {
                return bad(format!(
                    "Column \"{value}\" has {} values; a pilot needs at least 5 to say anything \
                     about the spread.",
                    v.len()
                ));
            }
            let m = stats::mean(&v);
            if *multiply {
                if req.design == PlanDesign::Paired {
                    return bad(
                        "A multiplicative effect does not apply to paired differences; use a \
                         shift."
                            .into(),
                    );
                }
                if let Some(x) = v.iter().find(|x| **x <= 0.0) {
                    return bad(format!(
                        "A multiplicative effect needs positive values, but column \"{value}\" \
                         holds {x}."
                    ));
                }
                if req.effect <= 0.0 {
                    return bad(
                        "A multiplicative effect is a ratio above 0, e.g. 1.2 for 20% more.".into(),
                    );
                }
            }
            sim.multiply = *multiply;
            sim.pilot = Some((v.iter().map(|x| x - m).collect(), m));
            (
                format!(
                    "values resampled from the {} pilot values of column \"{value}\"{}",
                    v.len(),
                    if *multiply {
                        ", the effect multiplying them"
                    } else {
                        ", the effect added to them"
                    }
                ),
                stats::sd(&v),
                m,
            )
        }
    };
    Ok((sim, model_label, spread, centre))
}

/// z for a one- or two-sided test at `alpha`.
fn z_alpha(alpha: f64, alt: Alternative) -> f64 {
    match alt {
        Alternative::TwoSided => normal::quantile(1.0 - alpha / 2.0),
        _ => normal::quantile(1.0 - alpha),
    }
}

/// The normal-approximation sample size that centres the search (None for no effect).
fn first_guess(req: &PlanRequest, sim: &Sim, spread: f64, centre: f64) -> Option<f64> {
    let z = z_alpha(req.alpha, req.alternative) + normal::quantile(req.target_power);
    let delta = match req.design {
        PlanDesign::YesNo => {
            let (p0, p1) = (sim.baseline, sim.baseline + req.effect);
            let pbar = (p0 + p1) / 2.0;
            let num = z_alpha(req.alpha, req.alternative) * (2.0 * pbar * (1.0 - pbar)).sqrt()
                + normal::quantile(req.target_power) * (p0 * (1.0 - p0) + p1 * (1.0 - p1)).sqrt();
            let d = p1 - p0;
            return (d != 0.0).then(|| (num / d).powi(2));
        }
        PlanDesign::KGroups => {
            let m: Vec<f64> = req.means.iter().map(|x| x * req.effect).collect();
            let (lo, hi) = m
                .iter()
                .fold((f64::INFINITY, f64::NEG_INFINITY), |(l, h), x| {
                    (l.min(*x), h.max(*x))
                });
            hi - lo
        }
        _ if sim.multiply => (req.effect - 1.0) * centre,
        _ => req.effect,
    };
    if delta == 0.0 || !delta.is_finite() {
        return None;
    }
    let factor = if req.design == PlanDesign::Paired {
        1.0
    } else {
        2.0
    };
    Some(factor * (z * spread / delta).powi(2) + 1.0)
}

pub fn run(req: &PlanRequest, progress: ProgressFn) -> Result<PlanReport, RunError> {
    let (sim, model_label, spread, centre) = check(req)?;
    let mut notes = Vec::new();
    let target = req.target_power;
    let guess = first_guess(req, &sim, spread, centre);
    let min_n: u64 = if req.design == PlanDesign::Paired {
        4
    } else {
        3
    };
    let no_effect = match req.design {
        PlanDesign::KGroups => req.effect == 0.0,
        _ if sim.multiply => req.effect == 1.0,
        _ => req.effect == 0.0,
    };
    let mut curve: Vec<PowerPoint> = Vec::new();
    let mut evaluated = 0u64;
    let mut eval = |n: u64,
                    full: bool,
                    curve: &mut Vec<PowerPoint>,
                    progress: ProgressFn|
     -> Result<PowerPoint, RunError> {
        if let Some(p) = curve
            .iter()
            .find(|p| p.n == n && (!full || !p.stopped_early))
        {
            return Ok(p.clone());
        }
        evaluated += 1;
        let stage = format!("simulating n = {n} ({evaluated} sizes so far)");
        let p = sim.power(
            n,
            req.effect,
            req.studies,
            (!full).then_some(target),
            point_seed(req.seed, n, req.effect),
            progress,
            &stage,
        )?;
        curve.retain(|q| q.n != n);
        curve.push(p.clone());
        Ok(p)
    };
    let mut required = None;
    if no_effect {
        notes.push(Note::NoEffectAssumed);
        eval(min_n.max(10).min(req.max_n), true, &mut curve, progress)?;
    } else {
        let g = guess.unwrap_or(20.0).clamp(min_n as f64, req.max_n as f64);
        let mut grid: Vec<u64> = [0.4, 0.6, 0.8, 1.0, 1.25, 1.6, 2.2]
            .iter()
            .map(|f| ((g * f).round() as u64).clamp(min_n, req.max_n))
            .collect();
        grid.dedup();
        for &n in &grid {
            eval(n, false, &mut curve, progress)?;
        }
        // Bracket the target, then bisect: each step adds a size or re-runs an
        // early-stopped one in full, so the loop ends.
        loop {
            let above = curve
                .iter()
                .filter(|p| p.power >= target)
                .map(|p| p.n)
                .min();
            let Some(hi) = above else {
                let top = curve.iter().map(|p| p.n).max().unwrap_or(min_n);
                if top >= req.max_n {
                    break;
                }
                eval((top * 2).min(req.max_n), false, &mut curve, progress)?;
                continue;
            };
            let hi_point = curve.iter().find(|p| p.n == hi).cloned();
            if hi_point.as_ref().is_some_and(|p| p.stopped_early) {
                eval(hi, true, &mut curve, progress)?;
                continue;
            }
            let lo = curve
                .iter()
                .filter(|p| p.power < target && p.n < hi)
                .map(|p| p.n)
                .max();
            match lo {
                None => {
                    let bottom = curve.iter().map(|p| p.n).min().unwrap_or(min_n);
                    if bottom <= min_n {
                        required = hi_point;
                        break;
                    }
                    eval((bottom / 2).max(min_n), false, &mut curve, progress)?;
                }
                Some(lo) if hi - lo > 1 => {
                    eval(lo + (hi - lo) / 2, false, &mut curve, progress)?;
                }
                _ => {
                    required = hi_point;
                    break;
                }
            }
        }
        if required.is_none() {
            notes.push(Note::TargetNotReached {
                max_n: req.max_n,
                pairs: req.design == PlanDesign::Paired,
                target,
            });
        }
    }
    curve.sort_by_key(|p| p.n);
    let smoothed = if no_effect {
        None
    } else {
        smooth(&curve, target)
    };

    // The smallest detectable effect at a given size, by bisection on the effect.
    let detectable = match req.mde_n {
        Some(n) if n >= min_n => Some(detectable_effect(req, &sim, n, spread, centre, progress)?),
        Some(n) => {
            notes.push(Note::TooFewForDetectable {
                min_n,
                n,
                pairs: req.design == PlanDesign::Paired,
            });
            None
        }
        None => None,
    };

    let effect_label = effect_label(req, &sim);
    let test_label = match sim.test {
        Test::Exact => "the exact test of the 2×2 table (Fisher's, both margins fixed)".to_string(),
        t => format!(
            "a permutation test of the {} with {} random relabellings per study",
            t.label(),
            fmt::count(req.relabellings)
        ),
    };
    let mut report = PlanReport {
        format_version: FORMAT_VERSION,
        engine_version: ENGINE_VERSION.into(),
        design: req.design,
        model_label,
        statistic_label: sim.test.label(),
        test_label,
        effect: req.effect,
        effect_label,
        means: req.means.clone(),
        alpha: req.alpha,
        alternative: req.alternative,
        target_power: target,
        first_guess: guess,
        curve,
        required,
        smoothed,
        detectable,
        studies: req.studies,
        relabellings: req.relabellings,
        seed: req.seed,
        rng: RNG_NAME.into(),
        notes,
        sentences: Vec::new(),
        tradeoffs: Vec::new(),
        cautions: Vec::new(),
    };
    report.sentences = sentences(&report);
    report.tradeoffs = tradeoffs(&report);
    report.cautions = cautions(req);
    Ok(report)
}

/// The power at one sample size and the assumed effect, from all `studies` simulated studies.
pub fn power_at(req: &PlanRequest, n: u64, progress: ProgressFn) -> Result<PowerPoint, RunError> {
    let (sim, ..) = check(req)?;
    sim.power(
        n,
        req.effect,
        req.studies,
        None,
        point_seed(req.seed, n, req.effect),
        progress,
        &format!("simulating n = {n}"),
    )
}

/// Fits probit(power) = a + b·√n through the points with power strictly between 0 and 1
/// and solves for the target; None when fewer than 3 points qualify or the fit does not rise.
pub fn smooth(curve: &[PowerPoint], target: f64) -> Option<Smoothed> {
    let pts: Vec<(f64, f64, f64)> = curve
        .iter()
        .filter(|p| p.power > 0.0 && p.power < 1.0)
        .map(|p| {
            let z = normal::quantile(p.power);
            let dens = (-0.5 * z * z).exp() / (2.0 * std::f64::consts::PI).sqrt();
            // Var(probit(p̂)) ≈ p(1 − p) / (S φ(z)²).
            let var = p.power * (1.0 - p.power) / (p.studies as f64 * dens * dens);
            ((p.n as f64).sqrt(), z, 1.0 / var)
        })
        .collect();
    if pts.len() < 3 {
        return None;
    }
    let sw: f64 = pts.iter().map(|p| p.2).sum();
    let mx = pts.iter().map(|p| p.2 * p.0).sum::<f64>() / sw;
    let my = pts.iter().map(|p| p.2 * p.1).sum::<f64>() / sw;
    let sxx: f64 = pts.iter().map(|p| p.2 * (p.0 - mx).powi(2)).sum();
    let sxy: f64 = pts.iter().map(|p| p.2 * (p.0 - mx) * (p.1 - my)).sum();
    if sxx <= 0.0 {
        return None;
    }
    let b = sxy / sxx;
    if b <= 0.0 {
        return None;
    }
    let a = my - b * mx;
    let zt = normal::quantile(target);
    let root = (zt - a) / b;
    if root <= 0.0 {
        return None;
    }
    // Var(a) = 1/Σw + x̄²/Sxx, Var(b) = 1/Sxx, Cov(a, b) = −x̄/Sxx; root = (zt − a)/b.
    let (va, vb, cab) = (1.0 / sw + mx * mx / sxx, 1.0 / sxx, -mx / sxx);
    let (da, db) = (-1.0 / b, -root / b);
    let v_root = da * da * va + db * db * vb + 2.0 * da * db * cab;
    let n = root * root;
    Some(Smoothed {
        n,
        se: 2.0 * root * v_root.max(0.0).sqrt(),
        points: pts.len(),
    })
}

fn detectable_effect(
    req: &PlanRequest,
    sim: &Sim,
    n: u64,
    spread: f64,
    centre: f64,
    progress: ProgressFn,
) -> Result<Detectable, RunError> {
    let target = req.target_power;
    let sign = if req.alternative == Alternative::Less || req.effect < 0.0 {
        -1.0
    } else {
        1.0
    };
    // The effect as a distance from no effect, and back.
    let (null, limit) = match req.design {
        PlanDesign::YesNo => {
            let room = if sign > 0.0 {
                1.0 - sim.baseline
            } else {
                sim.baseline
            };
            (0.0, room)
        }
        _ if sim.multiply => (1.0, f64::INFINITY),
        _ => (0.0, f64::INFINITY),
    };
    let at = |d: f64| null + sign * d;
    let z = z_alpha(req.alpha, req.alternative) + normal::quantile(target);
    let factor = if req.design == PlanDesign::Paired {
        1.0
    } else {
        2.0
    };
    // A first guess of the distance, from the normal approximation.
    let scale = match req.design {
        PlanDesign::KGroups => {
            let (lo, hi) = req
                .means
                .iter()
                .fold((f64::INFINITY, f64::NEG_INFINITY), |(l, h), x| {
                    (l.min(*x), h.max(*x))
                });
            hi - lo
        }
        _ if sim.multiply => centre,
        _ => 1.0,
    };
    let mut hi = (z * spread * (factor / n as f64).sqrt() / scale).min(limit);
    let stage = |d: f64| format!("detectable effect at n = {n}: trying {}", fmt::sig(d));
    let eval = |d: f64, full: bool, progress: ProgressFn| {
        let e = at(d);
        sim.power(
            n,
            e,
            req.studies,
            (!full).then_some(target),
            point_seed(req.seed, n, e),
            progress,
            &stage(d),
        )
    };
    // Grow the upper end until it reaches the target.
    let mut hi_point = eval(hi, false, progress)?;
    let mut grow = 0;
    while hi_point.power < target && grow < 12 && hi < limit {
        hi = (hi * 1.6).min(limit);
        hi_point = eval(hi, false, progress)?;
        grow += 1;
    }
    let mut lo = 0.0;
    for _ in 0..12 {
        if hi - lo <= 0.01 * hi {
            break;
        }
        let mid = 0.5 * (lo + hi);
        let p = eval(mid, false, progress)?;
        if p.power >= target {
            hi = mid;
            hi_point = p;
        } else {
            lo = mid;
        }
    }
    if hi_point.stopped_early {
        hi_point = eval(hi, true, progress)?;
    }
    Ok(Detectable {
        n,
        effect: at(hi),
        power: hi_point,
        bracket: (at(lo), at(hi)),
    })
}

fn effect_label(req: &PlanRequest, sim: &Sim) -> String {
    match req.design {
        PlanDesign::YesNo => "difference in yes rates (treated − baseline)".into(),
        PlanDesign::KGroups => "factor on the assumed group means".into(),
        PlanDesign::Paired => "mean difference within pairs".into(),
        PlanDesign::TwoGroups if sim.multiply => "ratio of treated to reference values".into(),
        PlanDesign::TwoGroups => "difference in means (treated − reference)".into(),
    }
}

fn alt_words(a: Alternative) -> &'static str {
    match a {
        Alternative::TwoSided => "two-sided",
        _ => "one-sided",
    }
}

/// The assumed effect in words: "a difference in means (treated − reference) of 0.5", or for
/// k groups "group means of 20, 20, 22".
fn effect_phrase(r: &PlanReport) -> String {
    if r.design == PlanDesign::KGroups {
        let m: Vec<String> = r.means.iter().map(|m| fmt::plain(m * r.effect)).collect();
        format!("group means of {}", m.join(", "))
    } else {
        format!("a {} of {}", r.effect_label, fmt::plain(r.effect))
    }
}

/// Sentences that can go into a proposal.
fn sentences(r: &PlanReport) -> Vec<String> {
    let mut s = Vec::new();
    let how = format!(
        "{}, at a {} significance level of {}",
        r.test_label,
        alt_words(r.alternative),
        fmt::plain(r.alpha)
    );
    if let Some(sm) = &r.smoothed {
        s.push(format!(
            "About {} {} are needed for {} power to detect {}, assuming {}, with {how} \
             (simulation estimate {} ± {}, from a curve fitted through {} simulated sample sizes).",
            fmt::count(sm.n.ceil() as u64),
            r.design.per(),
            fmt::percent(r.target_power),
            effect_phrase(r),
            r.model_label,
            fmt::fixed(sm.n, 1),
            fmt::fixed(sm.se, 1),
            sm.points
        ));
    }
    if let Some(p) = &r.required {
        s.push(format!(
            "The smallest simulated size that reached the target: {} {} had an estimated power of {} (95% simulation interval {} to {}, \
             from {} simulated studies) to detect {}, assuming {}, with {how}.",
            fmt::count(p.n),
            r.design.per(),
            fmt::fixed(p.power, 2),
            fmt::fixed(p.low, 2),
            fmt::fixed(p.high, 2),
            fmt::count(p.studies),
            effect_phrase(r),
            r.model_label
        ));
    }
    if let Some(d) = &r.detectable {
        s.push(format!(
            "With {} {}, the smallest {} detectable with {} power is about {} (estimated power \
             {} ± {} there; simulation bracket {} to {}).",
            fmt::count(d.n),
            r.design.per(),
            r.effect_label,
            fmt::percent(r.target_power),
            fmt::plain(d.effect),
            fmt::fixed(d.power.power, 2),
            fmt::fixed(d.power.se, 2),
            fmt::sig(d.bracket.0),
            fmt::sig(d.bracket.1)
        ));
    }
    s
}

fn tradeoffs(r: &PlanReport) -> Vec<String> {
    let mut t = vec![format!(
        "Each sample size was evaluated with up to {} simulated studies: the power estimates \
         carry a simulation error (shown as ± one standard error and a 95% interval), so \
         neighbouring sample sizes cannot be told apart within it.",
        fmt::count(r.studies)
    )];
    if r.design != PlanDesign::YesNo {
        t.push(format!(
            "Each simulated study ran {} random relabellings instead of a full permutation test \
             (p = (b + 1)/(m + 1), smallest possible p {}). The test stays valid but loses a \
             little power, so the sample sizes here err slightly on the large side; raise the \
             number of relabellings to reduce that.",
            fmt::count(r.relabellings),
            fmt::sig(1.0 / (r.relabellings + 1) as f64)
        ));
    }
    if r.curve.iter().any(|p| p.stopped_early) {
        t.push(
            "Sample sizes whose power was clearly above or below the target (a 99.9% interval \
             excluding it) were stopped early, after at least 200 studies; their bands are wider."
                .into(),
        );
    }
    t.push(
        "The search started from a normal-approximation guess of the sample size and bisected \
         between the sizes that bracket the target power."
            .into(),
    );
    t
}

fn cautions(req: &PlanRequest) -> Vec<String> {
    let mut c = Vec::new();
    if matches!(req.model, PlanModel::Pilot { .. }) {
        c.push(
            "A pilot's spread and any effect read from a pilot are noisy guesses from a small \
             sample; planning on them often overstates power. Consider a smaller effect that \
             would still matter, and plan for that."
                .into(),
        );
    } else {
        c.push(
            "The plan is only as good as the assumed effect and spread: take them from earlier \
             studies or from the smallest effect that would matter, not from the hoped-for \
             result."
                .into(),
        );
    }
    c.push(
        "The plan holds only if the study is run as assumed: the same design, test and \
         significance level, independent units, and no losses. Add units for expected dropout \
         or missing outcomes."
            .into(),
    );
    c.push(
        "Several primary outcomes or comparisons need adjustment for multiple testing, which \
         lowers the power of each; plan for the adjusted level."
            .into(),
    );
    c.push(
        "Sample sizes for clinical, safety or regulatory studies must be set with a qualified \
         statistician and the guidelines that apply to them."
            .into(),
    );
    c
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn no_effect_gives_the_significance_level_and_runs_repeat() {
        let mut r = PlanRequest::new(PlanDesign::TwoGroups, PlanModel::Normal { sd: 1.0 }, 0.0, 3);
        r.studies = 2000;
        let rep = run(&r, &mut |_| true).unwrap();
        assert!(rep.required.is_none());
        let p = &rep.curve[0];
        // Under no effect the rejection rate is at most α (the Monte Carlo test is valid).
        assert!(p.power <= 0.05 + 3.0 * p.se, "{p:?}");
        assert_eq!(rep, run(&r, &mut |_| true).unwrap());
    }

    #[test]
    fn search_brackets_and_settings_are_checked() {
        let mut r = PlanRequest::new(PlanDesign::TwoGroups, PlanModel::Normal { sd: 1.0 }, 1.0, 5);
        r.studies = 400;
        r.mde_n = Some(20);
        let rep = run(&r, &mut |_| true).unwrap();
        let req = rep.required.as_ref().unwrap();
        assert!(req.power >= 0.8);
        // The size just below was found below the target.
        assert!(rep.curve.iter().any(|p| p.n < req.n && p.power < 0.8));
        let d = rep.detectable.as_ref().unwrap();
        assert!(d.effect > 0.5 && d.effect < 1.5, "{d:?}");
        assert!(!rep.sentences.is_empty());
        r.relabellings = 10;
        assert!(run(&r, &mut |_| true)
            .unwrap_err()
            .to_string()
            .contains("19 to 9,999"));
        r.relabellings = 19;
        r.alpha = 0.01;
        assert!(run(&r, &mut |_| true)
            .unwrap_err()
            .to_string()
            .contains("no study could reject"));
        let mut y = PlanRequest::new(
            PlanDesign::YesNo,
            PlanModel::Rates { baseline: 0.9 },
            0.2,
            1,
        );
        y.studies = 400;
        assert!(run(&y, &mut |_| true)
            .unwrap_err()
            .to_string()
            .contains("outside 0 to 1"));
    }

    #[test]
    fn pilot_models_and_cancel() {
        let data = "y\n3.1\n4.2\n2.8\n5.0\n3.9\n4.4\n3.3\n".to_string();
        let mut r = PlanRequest::new(
            PlanDesign::TwoGroups,
            PlanModel::Pilot {
                data: data.clone(),
                header: HeaderChoice::Detect,
                value: "y".into(),
                multiply: true,
            },
            1.5,
            9,
        );
        r.studies = 300;
        let rep = run(&r, &mut |_| true).unwrap();
        assert!(rep.required.is_some());
        let mut calls = 0;
        assert_eq!(
            run(&r, &mut |_| {
                calls += 1;
                calls < 3
            }),
            Err(RunError::Cancelled)
        );
        r.model = PlanModel::Pilot {
            data: "y\n3\n-1\n2\n4\n5\n".into(),
            header: HeaderChoice::Detect,
            value: "y".into(),
            multiply: true,
        };
        assert!(run(&r, &mut |_| true)
            .unwrap_err()
            .to_string()
            .contains("needs positive values"));
    }
}

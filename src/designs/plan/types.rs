//! What a plan asks and what it reports.

use serde::{Deserialize, Serialize};

use crate::base::*;
use crate::designs::Caution;
use crate::input::table::HeaderChoice;
use crate::resample::k_groups::KStatistic;
use crate::resample::signs::FlipStatistic;
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

/// What the plan found.
#[derive(Clone, Debug, PartialEq, Serialize, Deserialize)]
pub struct PlanReport {
    /// The design planned.
    pub design: PlanDesign,
    /// The data model.
    pub model: ModelSummary,
    /// The test of each simulated study.
    pub test: Test,
    /// The assumed effect.
    pub effect: f64,
    /// k groups: the assumed group means.
    #[serde(default)]
    pub means: Vec<f64>,
    /// The significance level.
    pub alpha: f64,
    /// The direction of the test.
    pub alternative: Alternative,
    /// The target power.
    pub target_power: f64,
    /// The normal-approximation first guess of the sample size.
    pub first_guess: Option<f64>,
    /// Every evaluated sample size at the assumed effect, in order of n.
    pub curve: Vec<PowerPoint>,
    /// The smallest evaluated n whose estimated power reached the target.
    pub required: Option<PowerPoint>,
    /// The sample size at the target power from a curve fitted through all points.
    pub smoothed: Option<Smoothed>,
    /// The smallest detectable effect at the size asked for.
    pub detectable: Option<Detectable>,
    /// Simulated studies per size (at most).
    pub studies: u64,
    /// Random relabellings per simulated study.
    pub relabellings: u64,
    /// The seed.
    pub seed: u64,
    /// The generator.
    pub rng: String,
    /// What needs care.
    pub notes: Vec<Note>,
    /// What to keep in mind.
    pub cautions: Vec<Caution>,
}

/// The test each simulated study runs.
#[derive(Clone, Copy, Debug, PartialEq, Serialize, Deserialize)]
#[serde(tag = "kind", content = "statistic", rename_all = "kebab-case")]
pub enum Test {
    /// A two-group permutation test of this statistic.
    Two(Statistic),
    /// A sign-flip test of this statistic of the differences.
    Flip(FlipStatistic),
    /// A k-group permutation test of this statistic.
    K(KStatistic),
    /// The exact test of the 2×2 table.
    Exact,
}

/// The data model the studies were drawn from.
#[derive(Clone, Debug, PartialEq, Serialize, Deserialize)]
#[serde(tag = "kind", rename_all = "kebab-case")]
pub enum ModelSummary {
    /// Normal values with this standard deviation.
    Normal {
        /// The standard deviation.
        sd: f64,
    },
    /// Values resampled from a pilot column.
    Pilot {
        /// The column.
        value: String,
        /// How many pilot values.
        n: usize,
        /// Whether the effect multiplies the values (otherwise it is added).
        multiply: bool,
    },
    /// Yes/no outcomes with this baseline rate.
    Rates {
        /// The baseline rate.
        baseline: f64,
    },
}

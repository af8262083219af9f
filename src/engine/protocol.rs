//! The one typed request/report protocol spoken by the page, the web worker and the native
//! command. Everything the engine computes goes through [`crate::engine::run`].

use serde::{Deserialize, Serialize};

use super::table::HeaderChoice;

/// Version of the request/report format. Bump on any incompatible change.
pub const FORMAT_VERSION: u32 = 1;

/// Engine version, reported with every result.
pub const ENGINE_VERSION: &str = env!("CARGO_PKG_VERSION");

/// Serde for numbers that may be infinite or undefined (a t statistic of groups without
/// spread, a ratio with a zero count): JSON has no such numbers and serde_json would write
/// `null`, which cannot be read back as a number. They are written as the strings "inf",
/// "-inf" and "NaN"; finite numbers stay numbers. Use with `#[serde(with = "float")]`.
pub mod float {
    use serde::{Deserialize, Deserializer, Serializer};

    pub fn serialize<S: Serializer>(v: &f64, s: S) -> Result<S::Ok, S::Error> {
        if v.is_finite() {
            s.serialize_f64(*v)
        } else if v.is_nan() {
            s.serialize_str("NaN")
        } else if *v > 0.0 {
            s.serialize_str("inf")
        } else {
            s.serialize_str("-inf")
        }
    }

    #[derive(Deserialize)]
    #[serde(untagged)]
    enum Num {
        F(f64),
        S(String),
    }

    pub fn deserialize<'de, D: Deserializer<'de>>(d: D) -> Result<f64, D::Error> {
        match Num::deserialize(d)? {
            Num::F(v) => Ok(v),
            Num::S(s) => match s.as_str() {
                "inf" => Ok(f64::INFINITY),
                "-inf" => Ok(f64::NEG_INFINITY),
                "NaN" => Ok(f64::NAN),
                other => Err(serde::de::Error::custom(format!(
                    "\"{other}\" is not a number"
                ))),
            },
        }
    }
}

/// [`float`] for optional numbers (None stays `null`).
pub mod float_opt {
    use serde::{Deserialize, Deserializer, Serialize, Serializer};

    #[derive(Serialize, Deserialize)]
    struct W(#[serde(with = "super::float")] f64);

    pub fn serialize<S: Serializer>(v: &Option<f64>, s: S) -> Result<S::Ok, S::Error> {
        v.map(W).serialize(s)
    }

    pub fn deserialize<'de, D: Deserializer<'de>>(d: D) -> Result<Option<f64>, D::Error> {
        Ok(Option::<W>::deserialize(d)?.map(|w| w.0))
    }
}

/// Where the two groups are in the table.
#[derive(Clone, Debug, PartialEq, Serialize, Deserialize)]
#[serde(tag = "kind", rename_all = "kebab-case")]
pub enum Layout {
    /// Decide from the column types.
    Detect,
    /// One numeric column and one column of group labels.
    Long { value: String, group: String },
    /// One column per group.
    Wide { columns: Vec<String> },
}

#[derive(Clone, Copy, Debug, PartialEq, Eq, Serialize, Deserialize)]
#[serde(rename_all = "kebab-case")]
pub enum Statistic {
    MeanDifference,
    MedianDifference,
    TrimmedMeanDifference,
    WelchT,
}

impl Statistic {
    pub const ALL: [Statistic; 4] = [
        Statistic::MeanDifference,
        Statistic::MedianDifference,
        Statistic::TrimmedMeanDifference,
        Statistic::WelchT,
    ];

    pub fn key(self) -> &'static str {
        match self {
            Statistic::MeanDifference => "mean-difference",
            Statistic::MedianDifference => "median-difference",
            Statistic::TrimmedMeanDifference => "trimmed-mean-difference",
            Statistic::WelchT => "welch-t",
        }
    }

    pub fn from_key(s: &str) -> Option<Statistic> {
        Statistic::ALL.into_iter().find(|x| x.key() == s)
    }

    pub fn label(self) -> &'static str {
        match self {
            Statistic::MeanDifference => "difference in means",
            Statistic::MedianDifference => "difference in medians",
            Statistic::TrimmedMeanDifference => "difference in 20% trimmed means",
            Statistic::WelchT => "Welch t statistic",
        }
    }

    /// The effect the confidence interval is for. For the Welch t statistic (a test
    /// statistic, not an effect) the interval is for the difference in means.
    pub fn effect(self) -> Statistic {
        match self {
            Statistic::WelchT => Statistic::MeanDifference,
            s => s,
        }
    }
}

#[derive(Clone, Copy, Debug, PartialEq, Eq, Serialize, Deserialize)]
#[serde(rename_all = "kebab-case")]
pub enum Alternative {
    TwoSided,
    /// First group minus second group is positive.
    Greater,
    /// First group minus second group is negative.
    Less,
}

impl Alternative {
    pub fn key(self) -> &'static str {
        match self {
            Alternative::TwoSided => "two-sided",
            Alternative::Greater => "greater",
            Alternative::Less => "less",
        }
    }
    pub fn from_key(s: &str) -> Option<Alternative> {
        [
            Alternative::TwoSided,
            Alternative::Greater,
            Alternative::Less,
        ]
        .into_iter()
        .find(|x| x.key() == s)
    }
}

/// How a two-sided p-value is defined.
#[derive(Clone, Copy, Debug, Default, PartialEq, Eq, Serialize, Deserialize)]
#[serde(rename_all = "kebab-case")]
pub enum TwoSidedRule {
    /// Count relabellings whose statistic is at least as far from zero as the observed one:
    /// |T| >= |t|. The permutation null of each statistic here is centred at zero.
    #[default]
    Absolute,
    /// Twice the smaller one-sided p-value, capped at 1.
    DoubledTail,
}

impl TwoSidedRule {
    pub fn key(self) -> &'static str {
        match self {
            TwoSidedRule::Absolute => "absolute",
            TwoSidedRule::DoubledTail => "doubled-tail",
        }
    }
    pub fn from_key(s: &str) -> Option<TwoSidedRule> {
        [TwoSidedRule::Absolute, TwoSidedRule::DoubledTail]
            .into_iter()
            .find(|x| x.key() == s)
    }
}

#[derive(Clone, Copy, Debug, PartialEq, Eq, Serialize, Deserialize)]
#[serde(rename_all = "kebab-case")]
pub enum IntervalMethod {
    Percentile,
    Basic,
    Normal,
    Bca,
    Studentized,
}

impl IntervalMethod {
    pub const ALL: [IntervalMethod; 5] = [
        IntervalMethod::Percentile,
        IntervalMethod::Basic,
        IntervalMethod::Normal,
        IntervalMethod::Bca,
        IntervalMethod::Studentized,
    ];
    pub fn key(self) -> &'static str {
        match self {
            IntervalMethod::Percentile => "percentile",
            IntervalMethod::Basic => "basic",
            IntervalMethod::Normal => "normal",
            IntervalMethod::Bca => "bca",
            IntervalMethod::Studentized => "studentized",
        }
    }
    pub fn from_key(s: &str) -> Option<IntervalMethod> {
        IntervalMethod::ALL.into_iter().find(|x| x.key() == s)
    }
    pub fn label(self) -> &'static str {
        match self {
            IntervalMethod::Percentile => "percentile",
            IntervalMethod::Basic => "basic (reverse percentile)",
            IntervalMethod::Normal => "normal, bootstrap SE",
            IntervalMethod::Bca => "BCa",
            IntervalMethod::Studentized => "studentized (bootstrap-t)",
        }
    }
}

/// Which bound(s) an interval gives.
#[derive(Clone, Copy, Debug, Default, PartialEq, Eq, Serialize, Deserialize)]
#[serde(rename_all = "kebab-case")]
pub enum Side {
    /// [low, high]
    #[default]
    TwoSided,
    /// [low, ∞): a lower confidence bound.
    Lower,
    /// (−∞, high]: an upper confidence bound.
    Upper,
}

impl Side {
    pub fn key(self) -> &'static str {
        match self {
            Side::TwoSided => "two-sided",
            Side::Lower => "lower",
            Side::Upper => "upper",
        }
    }
    pub fn from_key(s: &str) -> Option<Side> {
        [Side::TwoSided, Side::Lower, Side::Upper]
            .into_iter()
            .find(|x| x.key() == s)
    }
}

/// Everything needed to reproduce an analysis.
#[derive(Clone, Debug, PartialEq, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct Request {
    pub format_version: u32,
    /// The table exactly as pasted or read from the file.
    pub data: String,
    #[serde(default)]
    pub header: HeaderChoice,
    pub layout: Layout,
    /// The group that comes first (the statistic is first minus second). With a label
    /// column of more than two groups, `first` and `second` pick the two to compare.
    #[serde(default)]
    pub first: Option<String>,
    #[serde(default)]
    pub second: Option<String>,
    pub statistic: Statistic,
    pub alternative: Alternative,
    #[serde(default)]
    pub two_sided: TwoSidedRule,
    /// Random relabellings when enumeration is not feasible.
    pub resamples: u64,
    /// Enumerate every relabelling when there are at most this many.
    pub exact_limit: u64,
    pub bootstrap_resamples: u64,
    pub confidence: f64,
    /// The interval method of the headline interval.
    pub interval: IntervalMethod,
    /// Further interval methods to report beside it.
    #[serde(default)]
    pub more_intervals: Vec<IntervalMethod>,
    pub seed: u64,
    /// Return every relabelled and bootstrap statistic (for a CSV download); up to
    /// [`MAX_KEPT`] of each.
    #[serde(default)]
    pub keep_resamples: bool,
}

/// The most resampled statistics a report carries.
pub const MAX_KEPT: usize = 1_000_000;

impl Request {
    /// The defaults the page and the command start from.
    pub fn new(data: String, seed: u64) -> Request {
        Request {
            format_version: FORMAT_VERSION,
            data,
            header: HeaderChoice::Detect,
            layout: Layout::Detect,
            first: None,
            second: None,
            statistic: Statistic::MeanDifference,
            alternative: Alternative::TwoSided,
            two_sided: TwoSidedRule::Absolute,
            resamples: 100_000,
            exact_limit: 1_000_000,
            bootstrap_resamples: 10_000,
            confidence: 0.95,
            interval: IntervalMethod::Bca,
            more_intervals: Vec::new(),
            seed,
            keep_resamples: false,
        }
    }
}

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
pub struct Interval {
    pub low: Option<f64>,
    pub high: Option<f64>,
    pub level: f64,
    pub method: String,
    /// Two-sided, or a one-sided bound (then the other end is open and null).
    #[serde(default)]
    pub side: Side,
    /// Why the interval is missing or should be read with care.
    pub note: Option<String>,
}

#[derive(Clone, Debug, PartialEq, Serialize, Deserialize)]
pub struct PInterval {
    pub low: f64,
    pub high: f64,
    pub level: f64,
}

#[derive(Clone, Debug, PartialEq, Serialize, Deserialize)]
pub struct Welch {
    pub mean_difference: f64,
    pub t: Option<f64>,
    pub df: Option<f64>,
    pub p_value: Option<f64>,
    pub ci: Interval,
}

#[derive(Clone, Debug, PartialEq, Serialize, Deserialize)]
pub struct EffectSize {
    pub name: String,
    pub estimate: Option<f64>,
    pub ci: Interval,
}

/// Equal-width histogram.
#[derive(Clone, Debug, PartialEq, Serialize, Deserialize)]
pub struct Histogram {
    /// Bin edges, one more than the counts.
    pub edges: Vec<f64>,
    pub counts: Vec<u64>,
    /// Probabilities instead of counts, for an exact distribution given as probabilities
    /// (the tables of a yes/no comparison); None when the bars are counts.
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub weights: Option<Vec<f64>>,
}

impl Histogram {
    /// The height of each bar: its probability, or its count.
    pub fn heights(&self) -> Vec<f64> {
        match &self.weights {
            Some(w) => w.clone(),
            None => self.counts.iter().map(|&c| c as f64).collect(),
        }
    }
}

/// The part of the null distribution counted toward the p-value: values <= `low` and/or
/// values >= `high`.
#[derive(Clone, Debug, PartialEq, Serialize, Deserialize)]
pub struct Tail {
    #[serde(default, with = "float_opt")]
    pub low: Option<f64>,
    #[serde(default, with = "float_opt")]
    pub high: Option<f64>,
}

#[derive(Clone, Debug, PartialEq, Serialize, Deserialize)]
pub struct Report {
    pub format_version: u32,
    pub engine_version: String,
    pub design: String,
    /// The layout actually used (after detection).
    pub layout: Layout,
    pub value_label: String,
    pub groups: Vec<GroupSummary>,
    /// What was left out or read specially (blank cells, decimal commas, other groups).
    pub notes: Vec<String>,
    pub statistic: Statistic,
    pub statistic_label: String,
    pub alternative: Alternative,
    pub two_sided: TwoSidedRule,
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
    /// 99% Clopper–Pearson interval for the p-value that unlimited relabellings would give.
    pub p_interval: Option<PInterval>,
    pub seed: u64,
    pub rng: String,
    pub effect_label: String,
    pub effect: f64,
    pub ci: Interval,
    /// The headline interval and any further methods asked for, side by side.
    pub intervals: Vec<Interval>,
    pub bootstrap_resamples: u64,
    pub bootstrap_se: Option<f64>,
    /// Mean of the bootstrap effects minus the effect.
    pub bootstrap_bias: Option<f64>,
    pub welch: Welch,
    pub hedges_g: EffectSize,
    pub null_histogram: Histogram,
    pub tail: Tail,
    pub bootstrap_histogram: Histogram,
    pub finding: String,
    pub cautions: Vec<String>,
    /// Every relabelled statistic, in order (only when asked for).
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub null_values: Option<Vec<f64>>,
    /// Every bootstrap effect, in order (only when asked for).
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub bootstrap_values: Option<Vec<f64>>,
}

/// A step of a long run, for progress display.
#[derive(Clone, Debug, PartialEq, Serialize, Deserialize)]
pub struct Progress {
    pub stage: String,
    pub done: u64,
    pub total: u64,
}

/// A unit of work for the worker (and the command's `--request` files).
#[derive(Clone, Debug, PartialEq, Serialize, Deserialize)]
#[serde(tag = "job", content = "request", rename_all = "kebab-case")]
pub enum Job {
    Compare(Request),
    Estimate(super::estimate::EstimateRequest),
    Paired(super::paired::PairedRequest),
    Association(super::assoc::AssocRequest),
    KGroups(super::kgroups::KGroupsRequest),
    Stratified(super::strata::StrataRequest),
    YesNo(super::binary::YesNoRequest),
    Plan(super::plan::PlanRequest),
}

/// The report of any job.
#[derive(Clone, Debug, PartialEq, Serialize, Deserialize)]
#[serde(tag = "job", content = "report", rename_all = "kebab-case")]
pub enum AnyReport {
    Compare(Report),
    Estimate(super::estimate::EstimateReport),
    Paired(super::paired::PairedReport),
    Association(super::assoc::AssocReport),
    KGroups(super::kgroups::KGroupsReport),
    Stratified(super::strata::StrataReport),
    YesNo(super::binary::YesNoReport),
    Plan(super::plan::PlanReport),
}

impl Job {
    /// Runs the job with the engine.
    pub fn run(
        &self,
        progress: super::analysis::ProgressFn,
    ) -> Result<AnyReport, super::analysis::RunError> {
        Ok(match self {
            Job::Compare(r) => AnyReport::Compare(super::analysis::run(r, progress)?),
            Job::Estimate(r) => AnyReport::Estimate(super::estimate::run(r, progress)?),
            Job::Paired(r) => AnyReport::Paired(super::paired::run(r, progress)?),
            Job::Association(r) => AnyReport::Association(super::assoc::run(r, progress)?),
            Job::KGroups(r) => AnyReport::KGroups(super::kgroups::run(r, progress)?),
            Job::Stratified(r) => AnyReport::Stratified(super::strata::run(r, progress)?),
            Job::YesNo(r) => AnyReport::YesNo(super::binary::run(r, progress)?),
            Job::Plan(r) => AnyReport::Plan(super::plan::run(r, progress)?),
        })
    }

    pub fn format_version(&self) -> u32 {
        match self {
            Job::Compare(r) => r.format_version,
            Job::Estimate(r) => r.format_version,
            Job::Paired(r) => r.format_version,
            Job::Association(r) => r.format_version,
            Job::KGroups(r) => r.format_version,
            Job::Stratified(r) => r.format_version,
            Job::YesNo(r) => r.format_version,
            Job::Plan(r) => r.format_version,
        }
    }

    pub fn seed(&self) -> u64 {
        match self {
            Job::Compare(r) => r.seed,
            Job::Estimate(r) => r.seed,
            Job::Paired(r) => r.seed,
            Job::Association(r) => r.seed,
            Job::KGroups(r) => r.settings.seed,
            Job::Stratified(r) => r.settings.seed,
            Job::YesNo(r) => r.settings.seed,
            Job::Plan(r) => r.seed,
        }
    }

    /// The pasted table the job reads ("" when it reads none).
    pub fn data(&self) -> &str {
        match self {
            Job::Compare(r) => &r.data,
            Job::Estimate(r) => &r.data,
            Job::Paired(r) => &r.data,
            Job::Association(r) => &r.data,
            Job::KGroups(r) => &r.data,
            Job::Stratified(r) => &r.data,
            Job::YesNo(r) => &r.data,
            Job::Plan(r) => match &r.model {
                super::plan::PlanModel::Pilot { data, .. } => data,
                _ => "",
            },
        }
    }

    /// Removes the data (and typed counts), keeping the settings: for a settings-only link.
    pub fn clear_data(&mut self) {
        match self {
            Job::Compare(r) => r.data.clear(),
            Job::Estimate(r) => r.data.clear(),
            Job::Paired(r) => r.data.clear(),
            Job::Association(r) => r.data.clear(),
            Job::KGroups(r) => r.data.clear(),
            Job::Stratified(r) => r.data.clear(),
            Job::YesNo(r) => {
                r.data.clear();
                if let super::binary::YesNoInput::Counts { groups } = &mut r.input {
                    for g in groups {
                        (g.yes, g.n) = (0, 0);
                    }
                }
            }
            Job::Plan(r) => {
                if let super::plan::PlanModel::Pilot { data, .. } = &mut r.model {
                    data.clear();
                }
            }
        }
    }

    /// Whether the job carries what it analyses (a settings-only link does not).
    pub fn has_data(&self) -> bool {
        match self {
            Job::YesNo(r) => match &r.input {
                super::binary::YesNoInput::Counts { groups } => groups.iter().all(|g| g.n > 0),
                _ => !r.data.trim().is_empty(),
            },
            Job::Plan(r) => {
                !matches!(r.model, super::plan::PlanModel::Pilot { .. })
                    || !self.data().trim().is_empty()
            }
            j => !j.data().trim().is_empty(),
        }
    }
}

/// Messages from the worker to the page.
#[derive(Clone, Debug, Serialize, Deserialize)]
#[serde(tag = "type", rename_all = "kebab-case")]
pub enum WorkerMessage {
    /// The worker has loaded and takes requests.
    Ready,
    Progress(Progress),
    Done {
        report: Box<AnyReport>,
    },
    Failed {
        message: String,
    },
}

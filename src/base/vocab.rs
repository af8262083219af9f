//! The vocabulary every layer shares: the direction of a test, interval methods and sides,
//! intervals, histograms, the region counted toward a p-value, and JSON numbers that may be
//! infinite. Nothing here computes anything.

use serde::{Deserialize, Serialize};

use super::note::Note;

pub use super::floats::{float, float_opt};

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

#[derive(Clone, Debug, PartialEq, Serialize, Deserialize)]
pub struct Interval {
    /// The lower limit (None: open, or no interval).
    pub low: Option<f64>,
    /// The upper limit (None: open, or no interval).
    pub high: Option<f64>,
    /// The confidence level, e.g. 0.95.
    pub level: f64,
    /// How the interval was computed.
    pub method: Method,
    /// Two-sided, or a one-sided bound (then the other end is open and null).
    #[serde(default)]
    pub side: Side,
    /// Why the interval is missing or should be read with care.
    #[serde(default)]
    pub notes: Vec<Note>,
}

impl Interval {
    /// No interval (yet): both limits missing, with the reason.
    pub fn none(method: Method, level: f64, side: Side, note: Note) -> Interval {
        Interval {
            low: None,
            high: None,
            level,
            method,
            side,
            notes: vec![note],
        }
    }
}

/// How an interval was computed: a bootstrap method, or a classical formula.
#[derive(Clone, Copy, Debug, PartialEq, Eq, Serialize, Deserialize)]
#[serde(rename_all = "kebab-case")]
pub enum Method {
    /// Bootstrap percentile interval.
    Percentile,
    /// Basic (reverse percentile) bootstrap interval.
    Basic,
    /// Normal interval with the bootstrap standard error and bias.
    Normal,
    /// Bias-corrected and accelerated bootstrap interval.
    Bca,
    /// Studentized (bootstrap-t) interval.
    Studentized,
    /// Welch's t interval for a difference in means.
    WelchT,
    /// The one-sample t interval for a mean.
    OneSampleT,
    /// The paired t interval for a mean difference.
    PairedT,
    /// The t interval of a mean difference (paired or one-sample t-test).
    T,
    /// The t interval for a least-squares slope.
    SlopeT,
    /// The t interval of a coefficient in a linear model.
    LinearModelT,
    /// The exact (Clopper–Pearson) interval for a proportion.
    ClopperPearson,
    /// Fisher's z interval for a correlation.
    FisherZ,
    /// Newcombe's hybrid score interval for a difference in proportions.
    Newcombe,
    /// Katz's log interval for a risk ratio.
    Katz,
    /// Woolf's logit interval for an odds ratio.
    Woolf,
}

impl From<IntervalMethod> for Method {
    fn from(m: IntervalMethod) -> Method {
        match m {
            IntervalMethod::Percentile => Method::Percentile,
            IntervalMethod::Basic => Method::Basic,
            IntervalMethod::Normal => Method::Normal,
            IntervalMethod::Bca => Method::Bca,
            IntervalMethod::Studentized => Method::Studentized,
        }
    }
}

impl Method {
    /// The bootstrap method, if this is one.
    pub fn bootstrap(self) -> Option<IntervalMethod> {
        IntervalMethod::ALL
            .into_iter()
            .find(|m| Method::from(*m) == self)
    }
}

#[derive(Clone, Debug, PartialEq, Serialize, Deserialize)]
pub struct PInterval {
    pub low: f64,
    pub high: f64,
    pub level: f64,
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

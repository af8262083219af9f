//! What can be estimated, and in which kind of data.

use serde::{Deserialize, Serialize};

use crate::base::format as fmt;

#[derive(Clone, Copy, Debug, PartialEq, Eq, Serialize, Deserialize)]
#[serde(rename_all = "kebab-case")]
pub enum Estimate {
    // One sample
    Mean,
    Median,
    TrimmedMean,
    Sd,
    Cv,
    Quantile,
    Proportion,
    // Two groups (first vs second)
    MeanDifference,
    MedianDifference,
    TrimmedMeanDifference,
    MeanRatio,
    MedianRatio,
    HedgesG,
    CliffsDelta,
    Superiority,
    // Association
    Pearson,
    Spearman,
    Slope,
}

/// What kind of data an estimate needs.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum Kind {
    One,
    Two,
    Association,
}

impl Estimate {
    pub const ALL: [Estimate; 18] = [
        Estimate::Mean,
        Estimate::Median,
        Estimate::TrimmedMean,
        Estimate::Sd,
        Estimate::Cv,
        Estimate::Quantile,
        Estimate::Proportion,
        Estimate::MeanDifference,
        Estimate::MedianDifference,
        Estimate::TrimmedMeanDifference,
        Estimate::MeanRatio,
        Estimate::MedianRatio,
        Estimate::HedgesG,
        Estimate::CliffsDelta,
        Estimate::Superiority,
        Estimate::Pearson,
        Estimate::Spearman,
        Estimate::Slope,
    ];

    pub fn key(self) -> &'static str {
        match self {
            Estimate::Mean => "mean",
            Estimate::Median => "median",
            Estimate::TrimmedMean => "trimmed-mean",
            Estimate::Sd => "sd",
            Estimate::Cv => "cv",
            Estimate::Quantile => "quantile",
            Estimate::Proportion => "proportion",
            Estimate::MeanDifference => "mean-difference",
            Estimate::MedianDifference => "median-difference",
            Estimate::TrimmedMeanDifference => "trimmed-mean-difference",
            Estimate::MeanRatio => "mean-ratio",
            Estimate::MedianRatio => "median-ratio",
            Estimate::HedgesG => "hedges-g",
            Estimate::CliffsDelta => "cliffs-delta",
            Estimate::Superiority => "superiority",
            Estimate::Pearson => "pearson",
            Estimate::Spearman => "spearman",
            Estimate::Slope => "slope",
        }
    }

    pub fn from_key(s: &str) -> Option<Estimate> {
        Estimate::ALL.into_iter().find(|e| e.key() == s)
    }

    pub fn kind(self) -> Kind {
        use Estimate::*;
        match self {
            Mean | Median | TrimmedMean | Sd | Cv | Quantile | Proportion => Kind::One,
            Pearson | Spearman | Slope => Kind::Association,
            _ => Kind::Two,
        }
    }

    pub fn label(self, q: f64) -> String {
        match self {
            Estimate::Mean => "mean".into(),
            Estimate::Median => "median".into(),
            Estimate::TrimmedMean => "20% trimmed mean".into(),
            Estimate::Sd => "standard deviation".into(),
            Estimate::Cv => "coefficient of variation".into(),
            Estimate::Quantile => format!("{} percentile", ordinal(q * 100.0)),
            Estimate::Proportion => "proportion".into(),
            Estimate::MeanDifference => "difference in means".into(),
            Estimate::MedianDifference => "difference in medians".into(),
            Estimate::TrimmedMeanDifference => "difference in 20% trimmed means".into(),
            Estimate::MeanRatio => "ratio of means".into(),
            Estimate::MedianRatio => "ratio of medians".into(),
            Estimate::HedgesG => "Hedges' g".into(),
            Estimate::CliffsDelta => "Cliff's delta".into(),
            Estimate::Superiority => "probability of superiority".into(),
            Estimate::Pearson => "Pearson correlation r".into(),
            Estimate::Spearman => "Spearman correlation rho".into(),
            Estimate::Slope => "least-squares slope".into(),
        }
    }

    /// The range of possible values, for estimates that have one.
    pub(crate) fn bounds(self) -> Option<(f64, f64)> {
        match self {
            Estimate::Proportion | Estimate::Superiority => Some((0.0, 1.0)),
            Estimate::Pearson | Estimate::Spearman | Estimate::CliffsDelta => Some((-1.0, 1.0)),
            Estimate::Sd => Some((0.0, f64::INFINITY)),
            _ => None,
        }
    }
}

fn ordinal(p: f64) -> String {
    let s = if (p - p.round()).abs() < 1e-9 {
        format!("{}", p.round() as i64)
    } else {
        fmt::sig(p)
    };
    let suffix = if s.contains('.') {
        "th"
    } else {
        match (p.round() as i64 % 100, p.round() as i64 % 10) {
            (11..=13, _) => "th",
            (_, 1) => "st",
            (_, 2) => "nd",
            (_, 3) => "rd",
            _ => "th",
        }
    };
    format!("{s}{suffix}")
}

//! The command's options, declared once with clap and shared by the subcommands, with value
//! parsers that say what a value must be ("a whole number from 99 to 10,000,000, not -1000").

use clap::{Args, ValueEnum};

use crate::base::format as fmt;
use crate::base::{Alternative, IntervalMethod, Side, TwoSidedRule};
use crate::designs::{MAX_BOOTSTRAP, MAX_EXACT_LIMIT, MAX_RESAMPLES};
use crate::input::table::HeaderChoice;

/// A whole number in a range, or a message that says which.
fn whole(s: &str, lo: u64, hi: u64) -> Result<u64, String> {
    let t = s.trim().replace('_', "");
    match t.parse::<u64>() {
        Ok(v) if (lo..=hi).contains(&v) => Ok(v),
        _ => Err(format!(
            "a whole number from {} to {}, not {s}",
            fmt::count(lo),
            fmt::count(hi)
        )),
    }
}

/// Random relabellings: 99 to 10^7.
pub fn resamples(s: &str) -> Result<u64, String> {
    whole(s, 99, MAX_RESAMPLES)
}

/// More relabellings or resamples to continue a run with: 1 to 10^7 (the totals are then
/// checked as every run's are).
pub fn more(s: &str) -> Result<u64, String> {
    whole(s, 1, MAX_RESAMPLES)
}

/// Bootstrap resamples: 200 to 10^6.
pub fn bootstrap(s: &str) -> Result<u64, String> {
    whole(s, 200, MAX_BOOTSTRAP)
}

/// The sequential stop's count: 1 to 10^4.
pub fn stop_after(s: &str) -> Result<u64, String> {
    whole(s, 1, crate::designs::MAX_STOP_AFTER)
}

/// The level a sequential run settles its p-value against: 0.0001 to 0.5.
pub fn settle_at(s: &str) -> Result<f64, String> {
    let v: f64 = s
        .trim()
        .parse()
        .map_err(|_| format!("a significance level such as 0.05, not {s}"))?;
    if (0.0001..=0.5).contains(&v) {
        Ok(v)
    } else {
        Err(format!(
            "a significance level from 0.0001 to 0.5 (such as 0.05), not {s}"
        ))
    }
}

/// Threads: 1 to 64.
pub fn threads(s: &str) -> Result<usize, String> {
    whole(s, 1, crate::resample::parallel::MAX_THREADS as u64).map(|v| v as usize)
}

/// The exact-enumeration limit: 0 to 10^7.
pub fn exact_limit(s: &str) -> Result<u64, String> {
    whole(s, 0, MAX_EXACT_LIMIT)
}

/// A seed: any whole number up to 2^64 − 1.
pub fn seed(s: &str) -> Result<u64, String> {
    s.trim()
        .replace('_', "")
        .parse::<u64>()
        .map_err(|_| format!("a whole number from 0 to 18,446,744,073,709,551,615, not {s}"))
}

/// A confidence level: more than 0.5 and at most 0.9999 (95 is read as 0.95).
pub fn confidence(s: &str) -> Result<f64, String> {
    let v: f64 = s
        .trim()
        .trim_end_matches('%')
        .parse()
        .map_err(|_| format!("a level such as 0.95, not {s}"))?;
    let v = if v > 1.0 && v < 100.0 { v / 100.0 } else { v };
    if v > 0.5 && v <= 0.9999 {
        Ok(v)
    } else {
        Err(format!(
            "a level above 0.5 and at most 0.9999 (such as 0.95), not {s}"
        ))
    }
}

/// A finite number.
pub fn number(s: &str) -> Result<f64, String> {
    match s.trim().parse::<f64>() {
        Ok(v) if v.is_finite() => Ok(v),
        _ => Err(format!("a number, not {s}")),
    }
}

/// One or more interval methods: a comma-separated list (the first is the headline) or
/// `all` (BCa first, then the others).
pub fn intervals(s: &str) -> Result<Vec<IntervalMethod>, String> {
    if s.trim() == "all" {
        let mut v = vec![IntervalMethod::Bca];
        v.extend(
            IntervalMethod::ALL
                .into_iter()
                .filter(|m| *m != IntervalMethod::Bca),
        );
        return Ok(v);
    }
    let mut list = Vec::new();
    for part in s.split(',') {
        let m = IntervalMethod::from_key(part.trim()).ok_or_else(|| {
            format!(
                "{} or all, not \"{}\"",
                IntervalMethod::ALL.map(|m| m.key()).join(", "),
                part.trim()
            )
        })?;
        if !list.contains(&m) {
            list.push(m);
        }
    }
    Ok(list)
}

/// A comma-separated list of names.
pub fn names(s: &str) -> Result<Vec<String>, String> {
    let v: Vec<String> = s
        .split(',')
        .map(|x| x.trim().to_string())
        .filter(|x| !x.is_empty())
        .collect();
    if v.is_empty() {
        Err("one or more column names, separated by commas".into())
    } else {
        Ok(v)
    }
}

/// A comma-separated list of numbers.
pub fn numbers(s: &str) -> Result<Vec<f64>, String> {
    s.split([',', ';', ' '])
        .filter(|x| !x.trim().is_empty())
        .map(number)
        .collect()
}

/// The direction of a test.
#[derive(Clone, Copy, Debug, PartialEq, Eq, ValueEnum)]
pub enum AltArg {
    /// Either direction.
    TwoSided,
    /// First minus second is positive.
    Greater,
    /// First minus second is negative.
    Less,
}

impl From<AltArg> for Alternative {
    fn from(a: AltArg) -> Alternative {
        match a {
            AltArg::TwoSided => Alternative::TwoSided,
            AltArg::Greater => Alternative::Greater,
            AltArg::Less => Alternative::Less,
        }
    }
}

/// How a two-sided p-value is defined.
#[derive(Clone, Copy, Debug, PartialEq, Eq, ValueEnum)]
pub enum TwoSidedArg {
    /// Count relabellings with |T| ≥ |t|.
    Absolute,
    /// Twice the smaller one-sided p-value.
    DoubledTail,
}

impl From<TwoSidedArg> for TwoSidedRule {
    fn from(a: TwoSidedArg) -> TwoSidedRule {
        match a {
            TwoSidedArg::Absolute => TwoSidedRule::Absolute,
            TwoSidedArg::DoubledTail => TwoSidedRule::DoubledTail,
        }
    }
}

/// Whether the first row holds column names.
#[derive(Clone, Copy, Debug, Default, PartialEq, Eq, ValueEnum)]
pub enum HeaderArg {
    /// Decide from the first row.
    #[default]
    Detect,
    /// The first row names the columns.
    Names,
    /// The first row is data.
    Data,
}

impl From<HeaderArg> for HeaderChoice {
    fn from(a: HeaderArg) -> HeaderChoice {
        match a {
            HeaderArg::Detect => HeaderChoice::Detect,
            HeaderArg::Names => HeaderChoice::Names,
            HeaderArg::Data => HeaderChoice::Data,
        }
    }
}

/// A two-sided interval or a one-sided bound.
#[derive(Clone, Copy, Debug, PartialEq, Eq, ValueEnum)]
pub enum SideArg {
    /// [low, high].
    TwoSided,
    /// A lower confidence bound.
    Lower,
    /// An upper confidence bound.
    Upper,
}

impl From<SideArg> for Side {
    fn from(a: SideArg) -> Side {
        match a {
            SideArg::TwoSided => Side::TwoSided,
            SideArg::Lower => Side::Lower,
            SideArg::Upper => Side::Upper,
        }
    }
}

/// Where the findings go besides standard output.
#[derive(Args, Clone, Debug, Default)]
pub struct Outputs {
    /// Print the report as one JSON object (numbers and typed codes).
    #[arg(long)]
    pub json: bool,
    /// Print the findings as Markdown.
    #[arg(long, conflicts_with = "json")]
    pub markdown: bool,
    /// Also write a self-contained HTML report to this file.
    #[arg(long, value_name = "FILE")]
    pub html: Option<String>,
    /// Threads to compute on (default: one per core, at most 64). The numbers are the same
    /// for any count.
    #[arg(long, value_name = "N", value_parser = threads)]
    pub threads: Option<usize>,
}

/// The settings of a permutation test with a bootstrap interval.
#[derive(Args, Clone, Debug, Default)]
pub struct TestArgs {
    /// two-sided (default), greater (first minus second positive) or less.
    #[arg(long, value_enum)]
    pub alternative: Option<AltArg>,
    /// How a two-sided p-value is defined.
    #[arg(long = "two-sided", value_enum, value_name = "RULE")]
    pub two_sided: Option<TwoSidedArg>,
    /// Random relabellings when enumeration is not feasible (default 100000).
    #[arg(long, value_name = "N", value_parser = resamples)]
    pub resamples: Option<u64>,
    /// Enumerate every relabelling when there are at most N (default 1000000; 2^20 for
    /// sign flips).
    #[arg(long = "exact-limit", value_name = "N", value_parser = exact_limit)]
    pub exact_limit: Option<u64>,
    /// Sequential Monte Carlo: stop drawing once H random relabellings are at least as
    /// extreme as the observed one (Besag and Clifford 1991; 10 to 50 is usual), or after
    /// --resamples of them; p = H / drawn when it stops early.
    #[arg(long = "stop-after", value_name = "H", value_parser = stop_after)]
    pub stop_after: Option<u64>,
    /// Sequential Monte Carlo: stop drawing once the p-value is settled below or above the
    /// level ALPHA (checked after each block of 4096, with at most a 0.1% chance over all
    /// checks of settling on the wrong side), or after --resamples of them.
    #[arg(long = "settle-at", value_name = "ALPHA", value_parser = settle_at)]
    pub settle_at: Option<f64>,
    /// Bootstrap resamples (default 10000).
    #[arg(long, value_name = "N", value_parser = bootstrap)]
    pub bootstrap: Option<u64>,
    /// percentile, basic, normal, bca (default), studentized, a comma-separated list (the
    /// first is the headline), or all.
    #[arg(long, value_name = "METHODS", value_parser = intervals)]
    pub interval: Option<::std::vec::Vec<IntervalMethod>>,
    /// Confidence level (default 0.95).
    #[arg(long, value_name = "C", value_parser = confidence)]
    pub confidence: Option<f64>,
    /// Seed (default: a fresh one, printed with the result).
    #[arg(long, value_name = "S", value_parser = seed)]
    pub seed: Option<u64>,
    /// Whether the first row holds column names.
    #[arg(long, value_enum, default_value = "detect")]
    pub header: HeaderArg,
}

impl TestArgs {
    /// These options over `s`.
    pub fn apply(&self, s: &mut crate::designs::TestSettings, fresh: u64) {
        s.seed = self.seed.unwrap_or(fresh);
        if let Some(a) = self.alternative {
            s.alternative = a.into();
        }
        if let Some(r) = self.two_sided {
            s.two_sided = r.into();
        }
        if let Some(v) = &self.interval {
            s.intervals = v.clone();
        }
        s.resamples = self.resamples.unwrap_or(s.resamples);
        s.bootstrap_resamples = self.bootstrap.unwrap_or(s.bootstrap_resamples);
        s.exact_limit = self.exact_limit.unwrap_or(s.exact_limit);
        s.confidence = self.confidence.unwrap_or(s.confidence);
        if self.stop_after.is_some() {
            s.stop_after = self.stop_after;
        }
        if self.settle_at.is_some() {
            s.settle_at = self.settle_at;
        }
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn values_out_of_range_say_what_they_must_be() {
        assert_eq!(
            resamples("-1000").unwrap_err(),
            "a whole number from 99 to 10,000,000, not -1000"
        );
        assert_eq!(resamples("1_000").unwrap(), 1000);
        assert!(bootstrap("100")
            .unwrap_err()
            .contains("from 200 to 1,000,000"));
        assert_eq!(confidence("95").unwrap(), 0.95);
        assert!(confidence("1.5").is_err());
        assert_eq!(intervals("all").unwrap().len(), 5);
        assert!(intervals("bca,wild").unwrap_err().contains("not \"wild\""));
    }
}

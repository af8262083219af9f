//! The wording of every typed code in one place: notes, interval methods, and the common
//! phrases of the findings. The page, the command and the reports all word them here.

use crate::base::format as fmt;
use crate::base::{InfiniteCause, IntervalMethod, Method, Note};

fn plural(n: usize) -> &'static str {
    if n == 1 {
        ""
    } else {
        "s"
    }
}

fn were(n: usize) -> &'static str {
    if n == 1 {
        "was"
    } else {
        "were"
    }
}

fn quoted(items: &[String]) -> String {
    items
        .iter()
        .map(|s| format!("\"{s}\""))
        .collect::<Vec<_>>()
        .join(", ")
}

fn lines(lines: &[u64]) -> String {
    let shown: Vec<String> = lines.iter().take(5).map(|l| l.to_string()).collect();
    let more = if lines.len() > 5 { ", …" } else { "" };
    format!("line{} {}{more}", plural(lines.len()), shown.join(", "))
}

/// The sentence for a note.
pub fn note(n: &Note) -> String {
    match n {
        Note::MissingCells { column, count } => format!(
            "{count} blank or NA cell{} in column \"{column}\" {} left out.",
            plural(*count),
            were(*count)
        ),
        Note::DecimalCommas { column, count } => format!(
            "{count} value{} in column \"{column}\" had a decimal comma, read as a decimal point.",
            plural(*count)
        ),
        Note::Unlabelled {
            column,
            count,
            lines: at,
        } => {
            let at = if at.is_empty() {
                String::new()
            } else {
                format!(" ({})", lines(at))
            };
            format!(
                "{count} value{} with no group label in column \"{column}\" {} left out{at}.",
                plural(*count),
                were(*count)
            )
        }
        Note::OtherGroupsLeftOut {
            first,
            second,
            others,
        } => format!(
            "Only \"{first}\" and \"{second}\" are compared; the other group{} ({}) {} left out.",
            plural(others.len()),
            quoted(others),
            were(others.len())
        ),
        Note::IncompleteRows {
            first,
            second,
            count,
        } => format!(
            "{count} row{} with a value in only one of \"{first}\" and \"{second}\" {} left out.",
            plural(*count),
            were(*count)
        ),
        Note::IncompletePairs { count, lengths } => {
            let lengths = match lengths {
                Some((a, na, b, nb)) => {
                    format!(" (column \"{a}\" has {na} values, \"{b}\" has {nb})")
                }
                None => String::new(),
            };
            format!(
                "{count} pair{} with a missing member {} left out{lengths}.",
                plural(*count),
                were(*count)
            )
        }
        Note::NoUnit { column, count } => format!(
            "{count} row{} with no unit in column \"{column}\" {} left out.",
            plural(*count),
            were(*count)
        ),
        Note::IncompleteUnits { count } => format!(
            "{count} unit{} with only one of the two measurements {} left out.",
            plural(*count),
            were(*count)
        ),
        Note::NoStratum {
            column,
            count,
            lines: at,
        } => format!(
            "{count} row{} with no stratum in column \"{column}\" {} left out ({}).",
            plural(*count),
            were(*count),
            lines(at)
        ),
        Note::PartialStrata { names, rows } => format!(
            "{} {} with only one of the two groups ({}) {} left out, with {rows} row{}: a \
             stratum without both groups says nothing about their difference.",
            names.len(),
            if names.len() == 1 {
                "stratum"
            } else {
                "strata"
            },
            quoted(names),
            were(names.len()),
            plural(*rows)
        ),
        Note::WithinStrata { column, strata } => format!(
            "Resampled within each of the {strata} strata of \"{column}\", keeping their sizes."
        ),
        Note::InfiniteStatistics { count, cause } => {
            let c = *count as usize;
            match cause {
                InfiniteCause::IdenticalValues => format!(
                    "{} relabelling{} put only identical values in both groups, giving an \
                     infinite t; {} counted but not plotted.",
                    fmt::count(*count),
                    plural(c),
                    if c == 1 { "it is" } else { "they are" }
                ),
                InfiniteCause::NoSpreadInAGroup => format!(
                    "{} relabelling{} left a group with no spread, giving an infinite \
                     statistic; {} counted but not plotted.",
                    fmt::count(*count),
                    plural(c),
                    if c == 1 { "it is" } else { "they are" }
                ),
            }
        }
        Note::RatioAtLimit { statistic, value } => format!(
            "The {} is {} because a group has no yes (or no no) answers; the exact test still \
             applies, but the ratio and its intervals cannot describe the size of the effect.",
            statistic.replace('-', " "),
            fmt::fixed(*value, 2)
        ),
        Note::KeptValuesCapped { kept } => format!(
            "Only the first {} relabelled statistics are kept for download.",
            fmt::count(*kept)
        ),
        Note::FewResamplesForBca => "BCa limits rest on the outer bootstrap values; 2,000 or \
             more bootstrap resamples are commonly recommended (common practice)."
            .into(),
        Note::ResamplesCapped {
            asked,
            used,
            nested,
        } => format!(
            "{} resamples were asked for; {} were used, the most this page keeps in memory{}.",
            fmt::count(*asked),
            fmt::count(*used),
            if *nested {
                " with a nested bootstrap"
            } else {
                ""
            }
        ),
        Note::NestedBootstrap { inner } => format!(
            "The studentized interval uses a nested bootstrap ({inner} inner resamples per \
             resample) for the standard error, as this estimate has no simple formula; it is \
             slower."
        ),
        Note::UndefinedResamples { count, total } => {
            let c = *count as usize;
            if *total > 0 {
                format!(
                    "{} of {} bootstrap resamples gave no finite value and {} left out.",
                    fmt::count(*count),
                    fmt::count(*total),
                    were(c)
                )
            } else {
                format!(
                    "{} resample{} gave no defined value (for example no spread) and {} left \
                     out.",
                    fmt::count(*count),
                    plural(c),
                    were(c)
                )
            }
        }
        Note::NoSpreadResamples { count } => format!(
            "{} bootstrap resample{} had no spread in either group and {} left out.",
            fmt::count(*count),
            plural(*count as usize),
            were(*count as usize)
        ),
        Note::EstimateAtEdge { estimate } => format!(
            "The estimate is at the edge of its possible range ({}); bootstrap intervals cannot \
             reach beyond the data and are unreliable here.",
            fmt::sig(*estimate)
        ),
        Note::FewBeyondQuantile { tail, q, distinct } => format!(
            "Only about {tail} observation{} lie beyond the {} ({distinct} distinct values in \
             all): too few for a trustworthy interval of this quantile.",
            if *tail == 1.0 { "" } else { "s" },
            percentile(*q)
        ),
        Note::UnstableRatio => "The bootstrap SE exceeds the estimate: the denominator is close \
             to zero in some resamples, so this ratio is unstable."
            .into(),
        Note::EstimateNotFinite => "Undefined: the estimate itself is not a finite number.".into(),
        Note::NoDefinedResample => "No bootstrap resample gave a defined value.".into(),
        Note::NoVariation => "Undefined: every bootstrap resample gave the same value (no \
             variation to work with)."
            .into(),
        Note::ZeroWidth => "Every bootstrap resample gave the same value, so the interval has \
             zero width: the data show too little variation to express uncertainty this way."
            .into(),
        Note::AllOnOneSide => {
            "Undefined: every bootstrap value lies on one side of the estimate.".into()
        }
        Note::AccelerationZero => "The jackknife values did not vary, so the acceleration was \
             taken as 0 (a bias-corrected percentile interval)."
            .into(),
        Note::GroupedJackknife { groups } => format!(
            "Acceleration from a grouped jackknife ({groups} groups), as the sample is large."
        ),
        Note::BcaAtExtremes => "The BCa limits fell in the outermost bootstrap values; use more \
             resamples before relying on this interval."
            .into(),
        Note::NoStandardError => "No standard error is available for this estimate.".into(),
        Note::TooFewStandardErrors => {
            "Undefined: too few resamples had a positive standard error.".into()
        }
        Note::ZeroStandardErrors { count } => format!(
            "{count} resample{} with zero standard error {} left out of the t values.",
            plural(*count),
            were(*count)
        ),
        Note::Clipped { low, high } => format!(
            "Clipped to the possible range [{}, {}].",
            fmt::sig(*low),
            fmt::sig(*high)
        ),
        Note::HedgesUndefined => "Hedges' g is undefined: neither group varies.".into(),
        Note::DifferencesConstant => "Undefined: the differences do not vary.".into(),
        Note::FisherZNeedsMore => "Needs at least 4 pairs and |r| < 1.".into(),
        Note::WelchUndefined => {
            "Both groups have no spread, so Welch's t-test is undefined.".into()
        }
        Note::TTestUndefined => "The differences do not vary, so the t-test is undefined.".into(),
        Note::LinearModelUndefined => "Undefined: too few observations beyond one per cell, or \
             no spread within cells."
            .into(),
        Note::ZeroCount => {
            "Undefined with a zero count in the table; see the exact test instead.".into()
        }
        Note::NoEffectAssumed => "The assumed effect is no effect at all: the power is then the \
             significance level, whatever the sample size."
            .into(),
        Note::TargetNotReached {
            max_n,
            pairs,
            target,
        } => format!(
            "Even {} {} did not reach the target power of {}: the assumed effect is too small \
             for a study of at most this size.",
            fmt::count(*max_n),
            per(*pairs),
            fmt::percent(*target)
        ),
        Note::TooFewForDetectable { min_n, n, pairs } => format!(
            "A detectable effect needs at least {min_n} {}; {n} is too few.",
            per(*pairs)
        ),
    }
}

/// The notes of an interval, as one sentence list ("" when there are none).
pub fn notes(ns: &[Note]) -> String {
    ns.iter().map(note).collect::<Vec<_>>().join(" ")
}

/// "pairs" or "per group".
pub fn per(pairs: bool) -> &'static str {
    if pairs {
        "pairs"
    } else {
        "per group"
    }
}

/// "90th percentile" for q = 0.9.
pub fn percentile(q: f64) -> String {
    let p = q * 100.0;
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
    format!("{s}{suffix} percentile")
}

/// The name of an interval method, as the reports write it.
pub fn method(m: Method) -> &'static str {
    match m {
        Method::Percentile => "percentile",
        Method::Basic => "basic (reverse percentile)",
        Method::Normal => "normal, bootstrap SE",
        Method::Bca => "BCa",
        Method::Studentized => "studentized (bootstrap-t)",
        Method::WelchT => "Welch t",
        Method::OneSampleT => "one-sample t",
        Method::PairedT => "paired t",
        Method::T => "t",
        Method::SlopeT => "t interval for the slope",
        Method::LinearModelT => "t (linear model)",
        Method::ClopperPearson => "Clopper–Pearson (exact binomial)",
        Method::FisherZ => "Fisher z",
        Method::Newcombe => "Newcombe hybrid score",
        Method::Katz => "Katz log",
        Method::Woolf => "Woolf (logit)",
    }
}

/// The name of a bootstrap method.
pub fn bootstrap_method(m: IntervalMethod) -> &'static str {
    method(m.into())
}

/// The short key of a method, as the v1 reports wrote it (CSV columns, file names).
pub fn method_key(m: Method) -> &'static str {
    match m.bootstrap() {
        Some(b) => b.key(),
        None => method(m),
    }
}

/// How a signed-rank p-value was found, in words.
pub fn rank_method(m: crate::classical::ranks::RankMethod) -> &'static str {
    use crate::classical::ranks::RankMethod;
    match m {
        RankMethod::Exact => "exact",
        RankMethod::ExactWithTies => "exact (all sign patterns; ties or zeros present)",
        RankMethod::Normal => "normal approximation",
        RankMethod::Undefined => "undefined (all differences are zero)",
    }
}

/// Which rule Fisher's exact test used.
pub fn fisher_rule(a: crate::base::Alternative) -> &'static str {
    match a {
        crate::base::Alternative::Greater => "one-sided (first group more often yes)",
        crate::base::Alternative::Less => "one-sided (first group less often yes)",
        crate::base::Alternative::TwoSided => {
            "two-sided (tables no more likely than the observed one)"
        }
    }
}

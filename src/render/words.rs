//! The wording of every typed code in one place: notes, interval methods, and the common
//! phrases of the findings. The page, the command and the reports all word them here.

use crate::base::format as fmt;
use crate::base::{InfiniteCause, IntervalMethod, Method, Note};

pub(crate) fn plural(n: usize) -> &'static str {
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
/// Names in a list: "a", "a and b", "a, b and c".
pub fn listed(items: &[String]) -> String {
    match items {
        [] => String::new(),
        [one] => one.clone(),
        [init @ .., last] => format!("{} and {last}", init.join(", ")),
    }
}

pub fn note(n: &Note) -> String {
    match n {
        Note::MissingCells { column, count } => format!(
            "{count} blank or NA cell{} in column \"{column}\" {} left out.",
            plural(*count),
            were(*count)
        ),
        Note::SpreadsheetErrors {
            column,
            count,
            cells,
        } => {
            let shown: Vec<String> = cells
                .iter()
                .map(|(line, text)| format!("line {line}: {text}"))
                .collect();
            format!(
                "{count} cell{} in column \"{column}\" {} a spreadsheet error value ({}{}), left out as missing. Check the formulas that produced {}.",
                plural(*count),
                if *count == 1 { "holds" } else { "hold" },
                shown.join(", "),
                if *count > cells.len() { ", …" } else { "" },
                if *count == 1 { "it" } else { "them" }
            )
        }
        Note::ValuesShifted { by } => format!(
            "All values share an offset much larger than their spread; they were analysed as \
             differences from {by} (added back to the means, medians and ranges shown), so that \
             no digits were lost."
        ),
        Note::DigitsBeyondDouble {
            column,
            count,
            line,
            text,
        } => format!(
            "{count} value{} in column \"{column}\" {} more significant digits than the 17 a \
             double-precision number keeps (the first on line {line}: {text}); {} rounded to \
             the nearest double. If the last digits matter (long identifiers, timestamps in \
             nanoseconds), subtract a common offset before pasting.",
            plural(*count),
            if *count == 1 { "has" } else { "have" },
            if *count == 1 { "it was" } else { "they were" }
        ),
        Note::CommentLinesSkipped { count } => format!(
            "The {count} comment line{} starting with '#' before the table {} skipped.",
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
        Note::TiedRanks { values, groups } => format!(
            "{} values share their value with another ({} group{} of ties) and were given the \
             mean of their ranks; the relabellings then follow these mid-ranks, so the exact \
             null distribution differs from the tables for tie-free data, which do not apply.",
            fmt::count(*values as u64),
            fmt::count(*groups as u64),
            if *groups == 1 { "" } else { "s" }
        ),
        Note::StreamingKernels {
            values,
            relabelling,
            bootstrap,
        } => {
            let mut parts = Vec::new();
            if *relabelling {
                parts.push(
                    "each random relabelling put every value in the first group with one fixed \
                     probability and then moved a few values chosen uniformly at random until \
                     the group had its size",
                );
            }
            if *bootstrap {
                parts.push(
                    "each bootstrap resample gave every value a Poisson(1) count and then added \
                     or removed a few draws chosen uniformly at random until the group had its \
                     size",
                );
            }
            format!(
                "With {} values, the streaming kernels for large samples were used: {}. These \
                 give exactly uniform relabellings and exact bootstrap resamples, drawn in a \
                 different way from the kernels for small samples.",
                fmt::count(*values as u64),
                parts.join("; ")
            )
        }
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

/// How stratum differences are weighted, in words.
pub fn strata_weights(w: crate::designs::stratified::StrataWeights) -> &'static str {
    use crate::designs::stratified::StrataWeights;
    match w {
        StrataWeights::Size => "weighted by stratum size",
        StrataWeights::Precision => "weighted by n1·n2/(n1 + n2) in each stratum",
    }
}

/// An error with where it points, as every face shows it: "… [line 4, column \"dose\"]".
pub fn error(e: &crate::base::Error) -> String {
    // The place is added only where the sentence does not already name it.
    let m = &e.message;
    let line = e
        .line
        .filter(|l| !m.contains(&format!("Line {l} ")) && !m.contains(&format!("line {l} ")));
    let column = e
        .column
        .as_ref()
        .filter(|c| !m.contains(&format!("\"{c}\"")));
    let place = match (line, column) {
        (Some(l), Some(c)) => format!(" [line {l}, column \"{c}\"]"),
        (Some(l), None) => format!(" [line {l}]"),
        (None, Some(c)) => format!(" [column \"{c}\"]"),
        (None, None) => String::new(),
    };
    format!("{}{place}", e.message)
}

/// What a long run is doing, for the progress display.
pub fn stage(s: &crate::base::Stage) -> String {
    use crate::base::Stage;
    match s {
        Stage::Reading { characters } => {
            format!("Reading the table ({} characters)", fmt::count(*characters))
        }
        Stage::Relabelling => "Relabellings".into(),
        Stage::SignPatterns => "Sign patterns".into(),
        Stage::Pairings => "Pairings".into(),
        Stage::ExactTest => "Exact test".into(),
        Stage::Bootstrap => "Bootstrap resamples".into(),
        Stage::Comparison { index, of } => format!("Follow-up comparison {index} of {of}"),
        Stage::Simulation { n, sizes } => {
            format!("Simulating studies of n = {n} ({sizes} sizes so far)")
        }
        Stage::Detectable { n, effect } => {
            format!("Detectable effect at n = {n}: trying {}", fmt::sig(*effect))
        }
    }
}

/// The p-value so far of a run of random relabellings, for a progress display: "so far
/// p ≈ 0.04312 (b = 431 of 9,999; 99% interval 0.03836 to 0.04826)".
pub fn running(p: &crate::base::Progress) -> Option<String> {
    let r = p.running?;
    Some(format!(
        "so far p ≈ {} (b = {} of {}; 99% interval {} to {})",
        small(r.p),
        fmt::count(r.extreme),
        fmt::count(p.done),
        small(r.low),
        small(r.high)
    ))
}

/// How a test's p-value was found: "exact, all 34,650 relabellings" or "Monte Carlo, 100,000
/// random relabellings, p = (b + 1)/(m + 1) = 0.01201, standard error 0.00034, 99% interval …".
pub fn how(t: &crate::designs::TestOutcome, unit: &str) -> String {
    if t.exact {
        return format!("exact, all {} {unit}", fmt::count(t.resamples));
    }
    let interval = |lead: &str| {
        t.p_interval
            .as_ref()
            .map(|p| format!(", {lead}99% interval {} to {}", small(p.low), small(p.high)))
            .unwrap_or_default()
    };
    let (p, se) = (small(t.p_value), small(t.mc_se.unwrap_or(0.0)));
    let m = fmt::count(t.resamples);
    match t.sequential {
        Some(s) if s.early => match (s.settled, s.settle) {
            (Some(side), Some(level)) => format!(
                "sequential Monte Carlo: stopped after {m} random {unit}, once the p-value was \
                 settled {} {} (checked after each block of {}, with at most a {} chance over \
                 all checks of settling on the wrong side; at most {} would have been drawn); \
                 p = (b + 1)/(m + 1) = {p}, standard error {se}{}",
                match side {
                    crate::resample::driver::Side::Below => "below",
                    crate::resample::driver::Side::Above => "above",
                },
                fmt::plain(level),
                fmt::count(crate::resample::rng::BLOCK),
                fmt::percent(crate::resample::driver::SETTLE_RISK),
                fmt::count(s.limit),
                interval("")
            ),
            _ => format!(
                "sequential Monte Carlo: stopped after {m} random {unit}, when {} were at \
                 least as extreme as the observed one (at most {} would have been drawn); \
                 p = h/L = {p} (Besag and Clifford 1991), standard error about {se}{}",
                fmt::count(s.after.unwrap_or(t.extreme_count)),
                fmt::count(s.limit),
                interval("approximate ")
            ),
        },
        Some(s) => {
            let why = match (s.after, s.settle) {
                (Some(h), Some(level)) => format!(
                    "fewer than {} were at least as extreme as the observed one and the p-value \
                     was not settled against {}",
                    fmt::count(h),
                    fmt::plain(level)
                ),
                (Some(h), None) => format!(
                    "fewer than {} were at least as extreme as the observed one",
                    fmt::count(h)
                ),
                (None, Some(level)) => format!(
                    "the p-value was not settled against {} before",
                    fmt::plain(level)
                ),
                (None, None) => "no stopping rule was met".into(),
            };
            format!(
                "sequential Monte Carlo: all {m} random {unit} drawn, as {why}; p = (b + 1)/(m \
                 + 1) = {p}, standard error {se}{}",
                interval("")
            )
        }
        None => format!(
            "Monte Carlo, {m} random {unit}, p = (b + 1)/(m + 1) = {p}, standard error {se}{}",
            interval("")
        ),
    }
}

/// A probability or its error to five decimals, or in scientific notation when that would
/// show only zeros.
fn small(x: f64) -> String {
    if x == 0.0 || x >= 1e-4 {
        format!("{x:.5}")
    } else {
        format!("{x:.2e}")
    }
}

/// "p = .012 (exact, …)".
pub fn p_line(t: &crate::designs::TestOutcome, unit: &str) -> String {
    format!("{} ({})", fmt::p_value(t.p_value), how(t, unit))
}

/// The direction of a test in words, for a methods paragraph.
pub fn alternative(
    alt: crate::base::Alternative,
    rule: crate::base::TwoSidedRule,
    first_minus_second: &str,
) -> String {
    use crate::base::{Alternative, TwoSidedRule};
    match (alt, rule) {
        (Alternative::TwoSided, TwoSidedRule::Absolute) => {
            "two-sided, counting relabellings at least as far from no difference as the \
             observed one"
                .into()
        }
        (Alternative::TwoSided, TwoSidedRule::DoubledTail) => {
            "two-sided, as twice the smaller one-sided p-value".into()
        }
        (Alternative::Greater, _) => format!("one-sided: {first_minus_second} greater"),
        (Alternative::Less, _) => format!("one-sided: {first_minus_second} smaller"),
    }
}

/// "percentile: 95% CI [0.10, 0.92]" or the reason there is none.
pub fn interval_line(iv: &crate::base::Interval, d: usize) -> String {
    use crate::base::Side;
    let name = method(iv.method);
    let body = match (iv.side, iv.low, iv.high) {
        (Side::TwoSided, Some(l), Some(h)) => fmt::ci(iv.level, l, h, d),
        (Side::Lower, Some(l), _) => format!(
            "{} lower bound {}",
            fmt::percent(iv.level),
            fmt::fixed(l, d)
        ),
        (Side::Upper, _, Some(h)) => format!(
            "{} upper bound {}",
            fmt::percent(iv.level),
            fmt::fixed(h, d)
        ),
        _ => "no interval".to_string(),
    };
    if iv.notes.is_empty() {
        format!("{name}: {body}")
    } else {
        format!("{name}: {body} ({})", notes(&iv.notes))
    }
}

/// "[0.10, 0.92]" or "—".
pub fn cell_interval(iv: &crate::base::Interval, d: usize) -> String {
    match (iv.low, iv.high) {
        (Some(l), Some(h)) => format!("[{}, {}]", fmt::fixed(l, d), fmt::fixed(h, d)),
        _ => "—".into(),
    }
}

/// Degrees of freedom: whole numbers as such, others with one decimal.
pub fn df(v: f64) -> String {
    if (v - v.round()).abs() < 1e-9 {
        format!("{}", v.round() as i64)
    } else {
        fmt::fixed(v, 1)
    }
}

/// A p-value, or "undefined".
pub fn opt_p(p: Option<f64>) -> String {
    p.map_or("undefined".into(), fmt::p_value)
}

/// Decimals for an estimate from its interval's width (or a fallback scale).
pub fn decimals(iv: &crate::base::Interval, fallback: f64) -> usize {
    match (iv.low, iv.high) {
        (Some(l), Some(h)) if h > l => fmt::decimals_for(h - l),
        _ => fmt::decimals_for(if fallback > 0.0 && fallback.is_finite() {
            fallback
        } else {
            1.0
        }),
    }
}

/// The full name of a design, as the page and the reports name it.
pub fn design_name(d: crate::designs::DesignKey) -> &'static str {
    use crate::designs::DesignKey;
    match d {
        DesignKey::TwoGroups => "two independent groups",
        DesignKey::Paired => "paired measurements",
        DesignKey::OneSample => "one sample against a reference value",
        DesignKey::Association => "association between two numeric columns",
        DesignKey::KGroups => "three or more groups",
        DesignKey::Stratified => "two groups within strata",
        DesignKey::YesNo => "yes/no outcomes in two groups",
        DesignKey::Estimate => "an estimate with bootstrap intervals",
        DesignKey::Plan => "planning a study",
    }
}

/// What the page and the command say when a link of the first format (which carries no
/// integrity check) is opened.
pub const UNCHECKED_LINK: &str = "This link is of the first link format, which carries no \
    integrity check: Reshuffle cannot tell whether it was changed or cut. It was opened and \
    run; ask the sender for a new link if the numbers must be confirmed.";

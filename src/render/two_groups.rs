//! The two-group report in words: the finding, the results, the groups table, the figures,
//! the methods paragraph and the cautions.

use super::doc::{full, row, Doc, Figure, Headline};
use super::plot::{self, BootFigure, NullFigure};
use super::words;
use crate::base::format as fmt;
use crate::base::{Alternative, TwoSidedRule};
use crate::designs::two_groups::{Statistic, TwoGroupsReport};
use crate::designs::DesignKey;
use crate::wire::ENGINE_VERSION;

/// "mean", "median" or "20% trimmed mean": what the effect compares.
fn effect_word(st: Statistic) -> &'static str {
    match st.effect() {
        Statistic::MedianDifference => "median",
        Statistic::TrimmedMeanDifference => "20% trimmed mean",
        _ => "mean",
    }
}

/// What the interval is for: the statistic's effect, or for the rank-sum statistic the
/// probability of superiority.
pub fn effect_label(st: Statistic) -> &'static str {
    if st.on_ranks() {
        "probability of superiority"
    } else {
        st.effect().label()
    }
}

/// Decimals for the effect and its interval.
pub fn effect_decimals(r: &TwoGroupsReport) -> usize {
    let scale = match (r.ci.low, r.ci.high) {
        (Some(l), Some(h)) if h > l => h - l,
        _ => {
            let s = r.groups.iter().map(|g| g.sd).fold(0.0, f64::max);
            if s > 0.0 {
                s
            } else {
                r.effect.abs()
            }
        }
    };
    fmt::decimals_for(scale)
}

/// One sentence: the effect with its interval and the p-value with what it counts.
pub fn finding(r: &TwoGroupsReport) -> String {
    let (first, second) = (&r.groups[0].name, &r.groups[1].name);
    let what = effect_word(r.statistic);
    let of = if r.value_label == "value" {
        String::new()
    } else {
        format!(" {}", r.value_label)
    };
    let d = effect_decimals(r);
    let size = fmt::fixed(r.effect.abs(), d);
    let mut s = if r.statistic.on_spread() {
        let ratio = |x: f64| fmt::sig(x.exp());
        let mut s = format!(
            "The {} of{} in {first} was {} times that in {second} (log ratio {}",
            if r.statistic == Statistic::LogSdRatio {
                "SD"
            } else {
                "median absolute deviation"
            },
            if of.is_empty() { " the values" } else { &of },
            ratio(r.effect),
            fmt::fixed(r.effect, d.max(2))
        );
        if let (Some(lo), Some(hi)) = (r.ci.low, r.ci.high) {
            s.push_str(&format!(
                ", {}: a ratio from {} to {}",
                fmt::ci(r.ci.level, lo, hi, d.max(2)),
                ratio(lo),
                ratio(hi)
            ));
        }
        s.push(')');
        s
    } else if r.statistic == Statistic::KsDistance {
        format!(
            "The largest gap between the cumulative distributions of{} in {first} and \
             {second} (Kolmogorov–Smirnov distance) was {}",
            if of.is_empty() { " the values" } else { &of },
            fmt::fixed(r.effect, d.max(2))
        )
    } else if r.statistic.on_ranks() {
        let what = if of.is_empty() {
            " the value".to_string()
        } else {
            of.clone()
        };
        format!(
            "In pairs of one value from each group,{what} was higher in {first} than in \
             {second} in {} of pairs (probability of superiority {}, ties counting half",
            fmt::percent(r.effect),
            fmt::fixed(r.effect, d.max(2))
        )
    } else if fmt::fixed(r.effect, d)
        .trim_start_matches('-')
        .chars()
        .all(|c| c == '0' || c == '.')
    {
        format!("The {what}{of} was practically the same in {first} and {second}")
    } else {
        let dir = if r.effect > 0.0 { "higher" } else { "lower" };
        format!("The {what}{of} was {size} {dir} in {first} than in {second}")
    };
    if r.statistic.on_spread() {
        // The interval is in the sentence already.
    } else if r.statistic.on_ranks() {
        if let (Some(lo), Some(hi)) = (r.ci.low, r.ci.high) {
            s.push_str(&format!("; {}", fmt::ci(r.ci.level, lo, hi, d.max(2))));
        }
        s.push(')');
    } else if let (Some(lo), Some(hi)) = (r.ci.low, r.ci.high) {
        s.push_str(&format!(" ({})", fmt::ci(r.ci.level, lo, hi, d)));
    }
    let stat_words = match r.statistic {
        Statistic::WelchT => "a Welch t".to_string(),
        Statistic::KsDistance => "a distance".to_string(),
        Statistic::LogSdRatio => "a log SD ratio".to_string(),
        Statistic::LogMadRatio => "a log MAD ratio".to_string(),
        Statistic::RankSum => "a difference in mean ranks".to_string(),
        _ => format!("a difference in {what}s"),
    };
    let how = match (r.alternative, r.two_sided) {
        (Alternative::TwoSided, TwoSidedRule::Absolute) if r.statistic == Statistic::KsDistance => {
            format!("{stat_words} at least this large")
        }
        (Alternative::TwoSided, TwoSidedRule::Absolute) => {
            format!("{stat_words} at least this large in either direction")
        }
        (Alternative::TwoSided, TwoSidedRule::DoubledTail) => {
            format!("{stat_words} at least this large in the observed direction")
        }
        (Alternative::Greater, _) => format!("{stat_words} at least this far in favour of {first}"),
        (Alternative::Less, _) => format!("{stat_words} at least this far in favour of {second}"),
    };
    let doubled =
        r.alternative == Alternative::TwoSided && r.two_sided == TwoSidedRule::DoubledTail;
    let t = &r.test;
    if t.exact {
        s.push_str(&format!(
            "; {how} arose in {} of all {} possible relabellings of the groups (exact {}{}).",
            fmt::count(t.extreme_count),
            fmt::count(t.resamples),
            fmt::p_value(t.p_value),
            if doubled { ", doubled" } else { "" }
        ));
    } else {
        s.push_str(&format!(
            "; {how} arose in {} of {} random relabellings of the groups ({}{}).",
            fmt::count(t.extreme_count),
            fmt::count(t.resamples),
            fmt::p_value(t.p_value),
            if doubled { ", doubled" } else { "" }
        ));
    }
    s
}

/// A paragraph with everything needed to reproduce the analysis.
fn methods(r: &TwoGroupsReport, date: &str) -> String {
    let (a, b) = (&r.groups[0].name, &r.groups[1].name);
    let alt = match (r.alternative, r.two_sided) {
        (Alternative::TwoSided, TwoSidedRule::Absolute) => {
            "two-sided, counting relabellings whose statistic is at least as far from zero as \
             the observed one (|T| ≥ |t|)"
                .to_string()
        }
        (Alternative::TwoSided, TwoSidedRule::DoubledTail) => {
            "two-sided, as twice the smaller one-sided p-value (capped at 1)".to_string()
        }
        (Alternative::Greater, _) => format!("one-sided: {a} minus {b} greater than zero"),
        (Alternative::Less, _) => format!("one-sided: {a} minus {b} less than zero"),
    };
    format!(
        "Design: two independent groups ({a} with n = {}, {b} with n = {}). Test statistic: \
         the {} ({a} {} {b}). Alternative: {alt}. Null distribution: {}; ties with the \
         observed value counted as at least as extreme (within the rounding error of the statistic's arithmetic). Effect: the \
         {} with a {} {} bootstrap interval from {} resamples drawn within each group; Hedges' \
         g with its bootstrap interval; Welch's t-test with Welch–Satterthwaite degrees of \
         freedom as a classical cross-check{}.{}{} Random numbers: {}, seed {}. Computed with \
         Reshuffle {ENGINE_VERSION} on {date}.",
        r.groups[0].n,
        r.groups[1].n,
        r.statistic.label(),
        if r.statistic.on_spread() { "over" } else { "minus" },
        words::how(&r.test, "relabellings"),
        effect_label(r.statistic),
        fmt::percent(r.ci.level),
        words::method(r.ci.method),
        fmt::count(r.bootstrap_resamples),
        if r.statistic.on_ranks() {
            "; the ranks are those of the pooled values, ties given their mean rank; the \
             bootstrap resamples are drawn as each value's count (Poisson counts corrected to \
             the group's size, an exact multinomial resample); Cliff's delta is 2 × the \
             probability of superiority − 1, its interval mapped the same way; the rank-sum \
             test by its normal approximation (continuity and tie corrections) as a further \
             cross-check"
        } else {
            ""
        },
        if r.statistic.on_spread() {
            " The relabellings are of each value's deviation from its group's median (the \
             groups aligned, so that a difference in location does not enter this test of \
             spread; the test is then approximate, exact only when the groups' shapes agree \
             apart from their spread); the bootstrap resamples the values themselves."
        } else {
            ""
        },
        r.robustness.as_ref().map_or(String::new(), |rb| format!(
            " Robustness: the same test with {}, with the same seed (so the same random \
             relabellings) and settings, each p-value read at the level 1 − confidence = {}, \
             beside the percentile and BCa intervals and the Welch t-test.",
            words::listed(
                &rb.statistics
                    .iter()
                    .map(|o| format!("the {}", o.statistic.label()))
                    .collect::<Vec<_>>()
            ),
            fmt::plain(rb.level)
        )),
        r.test.rng,
        r.test.seed,
    )
}

/// The figures: the relabelling distribution and the bootstrap distribution.
pub fn figures(r: &TwoGroupsReport) -> Vec<Figure> {
    let nf = NullFigure::of(
        &r.test,
        r.statistic.label(),
        "relabellings",
        "when group labels are shuffled",
    );
    let bf = BootFigure {
        label: effect_label(r.statistic),
        estimate: r.effect,
        interval: &r.ci,
        histogram: &r.bootstrap_histogram,
        resamples: r.bootstrap_resamples,
    };
    plot::test_figures(&nf, &bf, "tg", "relabelling")
}

/// The two-group report as a document.
pub fn doc(r: &TwoGroupsReport, date: &str) -> Doc {
    let d = effect_decimals(r);
    let effect_label = effect_label(r.statistic);
    let mut lines = vec![
        (
            format!("observed {}", r.statistic.label()),
            fmt::sig(r.test.observed),
        ),
        (
            "p-value".to_string(),
            words::p_line(&r.test, "relabellings"),
        ),
    ];
    for iv in &r.intervals {
        lines.push((
            format!("{effect_label} interval"),
            words::interval_line(iv, d),
        ));
    }
    // Welch's interval is for the difference in means, in the values' units (decimals
    // from the SDs where the effect has no units).
    let unitless =
        r.statistic.on_ranks() || r.statistic.on_spread() || r.statistic == Statistic::KsDistance;
    let dw = if !unitless {
        d
    } else {
        let sd = r.groups.iter().map(|g| g.sd).fold(0.0, f64::max);
        if sd > 0.0 {
            fmt::decimals_for(sd)
        } else {
            d
        }
    };
    lines.push((
        "Welch t-test (cross-check)".into(),
        match (r.welch.t, r.welch.df, r.welch.p_value) {
            (Some(t), Some(df), Some(p)) => {
                let ci = match (r.welch.ci.low, r.welch.ci.high) {
                    (Some(l), Some(h)) => format!(", {}", fmt::ci(r.welch.ci.level, l, h, dw)),
                    _ => String::new(),
                };
                format!("t = {t:.3}, df = {df:.2}, p = {p:.5}{ci}")
            }
            _ => "undefined (no spread)".into(),
        },
    ));
    lines.push((
        "Hedges' g".into(),
        match r.hedges_g.estimate {
            Some(g) => match (r.hedges_g.ci.low, r.hedges_g.ci.high) {
                (Some(l), Some(h)) => format!("{g:.3}, {}", fmt::ci(r.hedges_g.ci.level, l, h, 3)),
                _ => format!("{g:.3} ({})", words::notes(&r.hedges_g.ci.notes)),
            },
            None => "undefined (no spread)".into(),
        },
    ));
    if let Some(cd) = &r.cliffs_delta {
        lines.push((
            "Cliff's delta".into(),
            match (cd.estimate, cd.ci.low, cd.ci.high) {
                (Some(e), Some(l), Some(h)) => {
                    format!("{e:.3}, {}", fmt::ci(cd.ci.level, l, h, 3))
                }
                (Some(e), _, _) => format!("{e:.3}"),
                _ => "undefined".into(),
            },
        ));
    }
    if let Some(rs) = &r.rank_sum {
        lines.push((
            "rank-sum test (cross-check)".into(),
            format!(
                "U = {}, z = {:.3}, p = {:.5} (normal approximation{})",
                fmt::sig(rs.u),
                rs.z,
                rs.p_value,
                if rs.ties { ", corrected for ties" } else { "" }
            ),
        ));
    }
    lines.push((
        "Seed and generator".into(),
        format!("{} · {}", r.test.seed, r.test.rng),
    ));
    let groups = super::group_table(
        "groups-table",
        format!("The two groups ({})", r.value_label),
        &r.groups,
        d + 1,
        true,
    );
    let mut tables = vec![groups];
    if r.intervals.len() > 1 {
        tables.push(super::interval_table(
            "interval-table",
            &format!(
                "{} intervals for the {effect_label}, by method",
                fmt::percent(r.ci.level)
            ),
            &r.intervals,
            d,
        ));
    }
    let mut sections = Vec::new();
    if !r.hints.is_empty() {
        sections.push((
            super::hints::HEADING.to_string(),
            super::hints::hints(&r.hints),
        ));
    }
    if let Some(rb) = &r.robustness {
        tables.push(super::robustness::table(r, rb, d, effect_label));
        sections.push((
            "Would another reasonable choice change the answer?".to_string(),
            vec![
                super::robustness::sentence(r, rb),
                super::robustness::NOT_A_MENU.to_string(),
            ],
        ));
    }
    let mut results = Vec::new();
    for g in &r.groups {
        for (k, v) in [
            ("n", g.n as f64),
            ("mean", g.mean),
            ("median", g.median),
            ("sd", g.sd),
            ("trimmed_mean", g.trimmed_mean),
        ] {
            results.push(row(&format!("group:{}", g.name), k, format!("{v:?}")));
        }
    }
    results.extend(super::test_rows(&r.test));
    results.push(row("effect", "estimate", format!("{:?}", r.effect)));
    results.extend(super::interval_rows(&r.intervals));
    results.push(row("welch", "t", full(r.welch.t)));
    results.push(row("welch", "df", full(r.welch.df)));
    results.push(row("welch", "p_value", full(r.welch.p_value)));
    results.push(row("hedges_g", "estimate", full(r.hedges_g.estimate)));
    results.push(row("hedges_g", "ci_low", full(r.hedges_g.ci.low)));
    results.push(row("hedges_g", "ci_high", full(r.hedges_g.ci.high)));
    if let Some(cd) = &r.cliffs_delta {
        results.push(row("cliffs_delta", "estimate", full(cd.estimate)));
        results.push(row("cliffs_delta", "ci_low", full(cd.ci.low)));
        results.push(row("cliffs_delta", "ci_high", full(cd.ci.high)));
    }
    if let Some(rs) = &r.rank_sum {
        results.push(row("rank_sum", "u", format!("{:?}", rs.u)));
        results.push(row("rank_sum", "z", format!("{:?}", rs.z)));
        results.push(row("rank_sum", "p_value", format!("{:?}", rs.p_value)));
    }
    if let Some(rb) = &r.robustness {
        results.extend(super::robustness::results(rb));
    }
    Doc {
        design: DesignKey::TwoGroups,
        finding: finding(r),
        notes: r.notes.iter().map(words::note).collect(),
        lines,
        tables,
        figures: figures(r),
        sections,
        methods: methods(r, date),
        cautions: super::cautions::cautions(&r.cautions, DesignKey::TwoGroups),
        results,
        headline: Headline {
            p_value: Some(r.test.p_value),
            estimate: Some(r.effect),
            low: r.ci.low,
            high: r.ci.high,
        },
    }
}

//! The k-group report in words: the omnibus test, eta and omega squared, the classical
//! cross-checks, and the follow-up comparisons with Holm and Benjamini–Hochberg adjustments.

use super::doc::{full, row, Doc, DocTable, Figure, Headline};
use super::plot::{self, NullFigure};
use super::words;
use crate::base::format as fmt;
use crate::designs::k_groups::{KGroupsReport, KStatistic};
use crate::designs::DesignKey;
use crate::input::columns::plural;
use crate::wire::ENGINE_VERSION;

/// The plain-language finding.
pub fn finding(r: &KGroupsReport) -> String {
    let n: usize = r.groups.iter().map(|g| g.n).sum();
    let what = match r.statistic {
        KStatistic::MedianSpread => "group medians",
        _ => "group means",
    };
    let how = if r.test.exact {
        format!("all {} possible relabellings", fmt::count(r.test.resamples))
    } else {
        format!("{} random relabellings", fmt::count(r.test.resamples))
    };
    let share = r.test.extreme_count as f64 / r.test.resamples.max(1) as f64;
    let mut s = format!(
        "Across {} groups ({} values), the {what} were spread apart at least as much as \
         observed in {} of {how} ({}, {})",
        r.groups.len(),
        n,
        fmt::percent_share(share),
        fmt::p_value(r.test.p_value),
        match r.statistic {
            KStatistic::MedianSpread => format!("median spread {}", fmt::sig(r.test.observed)),
            KStatistic::F => format!("F = {}", fmt::fixed(r.test.observed, 2)),
            KStatistic::WelchF => format!("Welch F = {}", fmt::fixed(r.test.observed, 2)),
        }
    );
    s.push_str(if r.test.p_value < 0.05 {
        ": so differences this large would be unusual if all groups were alike."
    } else {
        ": differences this large arise often when all groups are alike."
    });
    s.push_str(&format!(
        " The groups account for {} of the variation (eta squared",
        fmt::percent_share(r.effect)
    ));
    if let (Some(l), Some(h)) = (r.ci.low, r.ci.high) {
        s.push_str(&format!(", {}", fmt::ci(r.ci.level, l, h, 2)));
    }
    s.push_str(").");
    if !r.pairwise.is_empty() {
        let below: Vec<String> = r
            .pairwise
            .iter()
            .filter(|c| c.holm < 0.05)
            .map(|c| format!("{} vs {}", c.first, c.second))
            .collect();
        s.push_str(&format!(
            " {} of {} follow-up comparison{} {} below .05 after Holm's adjustment{}",
            below.len(),
            r.pairwise.len(),
            plural(r.pairwise.len()),
            if below.len() == 1 { "stays" } else { "stay" },
            if below.is_empty() {
                ".".to_string()
            } else {
                format!(" ({}).", below.join("; "))
            }
        ));
    }
    s
}

/// The k-group report as a document.
pub fn doc(r: &KGroupsReport, date: &str) -> Doc {
    let n: usize = r.groups.iter().map(|g| g.n).sum();
    let spread = r
        .groups
        .iter()
        .map(|g| g.sd)
        .filter(|v| *v > 0.0)
        .fold(f64::INFINITY, f64::min);
    let d = fmt::decimals_for(if spread.is_finite() { spread } else { 1.0 });
    let level = fmt::percent(r.ci.level);
    let pairwise_label = r.statistic.pairwise().effect().label();
    let f_line = |t: &crate::classical::FTest| match (t.f, t.p_value) {
        (Some(f), Some(p)) => format!(
            "F({}, {}) = {}, {}",
            words::df(t.df1),
            words::df(t.df2),
            fmt::fixed(f, 3),
            fmt::p_value(p)
        ),
        _ => "undefined (no spread within the groups)".into(),
    };
    let mut lines = vec![
        (
            "Design".into(),
            format!(
                "k independent groups: {} groups, {n} values of {}",
                r.groups.len(),
                r.value_label
            ),
        ),
        (
            format!("Omnibus test ({})", r.statistic.label()),
            format!(
                "{} = {}, {}",
                match r.statistic {
                    KStatistic::F => "F",
                    KStatistic::WelchF => "Welch F",
                    KStatistic::MedianSpread => "spread",
                },
                fmt::sig(r.test.observed),
                words::p_line(&r.test, "relabellings")
            ),
        ),
        (
            format!("Eta squared with {level} CI"),
            format!(
                "{} ({})",
                fmt::fixed(r.effect, 3),
                words::interval_line(&r.ci, 3)
            ),
        ),
        (
            "Omega squared".into(),
            r.omega_squared
                .map_or("undefined".into(), |w| fmt::fixed(w, 3)),
        ),
        ("One-way ANOVA (cross-check)".into(), f_line(&r.anova)),
        ("Welch's ANOVA (cross-check)".into(), f_line(&r.welch_anova)),
        (
            "Kruskal–Wallis (cross-check)".into(),
            match (r.kruskal_wallis.statistic, r.kruskal_wallis.p_value) {
                (Some(h), Some(p)) => format!(
                    "H = {}, df = {}, {}",
                    fmt::fixed(h, 3),
                    words::df(r.kruskal_wallis.df),
                    fmt::p_value(p)
                ),
                _ => "undefined (all values tied)".into(),
            },
        ),
    ];
    lines.push((
        "Seed and generator".into(),
        format!("{} · {}", r.test.seed, r.test.rng),
    ));
    let groups = super::group_table("k-groups-table", "Groups".into(), &r.groups, d + 1, false);
    let pd = r
        .pairwise
        .iter()
        .filter_map(|c| match (c.ci.low, c.ci.high) {
            (Some(l), Some(h)) if h > l => Some(fmt::decimals_for(h - l)),
            _ => None,
        })
        .max()
        .unwrap_or(d);
    let comparisons = DocTable {
        id: "pairwise-table",
        caption: format!(
            "Follow-up comparisons: {} ({} {} bootstrap intervals, not adjusted), each by its \
             own permutation test{}",
            pairwise_label,
            level,
            r.pairwise
                .first()
                .map_or("", |c| words::method(c.ci.method)),
            match &r.control {
                Some(c) => format!(", each group against {c}"),
                None => ", every pair".into(),
            }
        ),
        header: [
            "comparison",
            "difference",
            "interval",
            "p",
            "Holm p",
            "BH p",
            "Welch t p",
        ]
        .map(String::from)
        .to_vec(),
        rows: r
            .pairwise
            .iter()
            .map(|c| {
                vec![
                    format!("{} − {}", c.first, c.second),
                    fmt::fixed(c.difference, pd),
                    words::cell_interval(&c.ci, pd),
                    fmt::p_number(c.p_value),
                    fmt::p_number(c.holm),
                    fmt::p_number(c.bh),
                    c.welch_p.map_or("—".into(), fmt::p_number),
                ]
            })
            .collect(),
    };
    let methods = format!(
        "Design: {} independent groups ({}). Test statistic: the {}, larger values counted as \
         more extreme. Null distribution: {}; ties with the observed value counted as at least \
         as extreme (within the rounding error of the statistic's arithmetic). Effect: eta squared with a {level} {} bootstrap \
         interval from {} resamples drawn within each group, and omega squared. Follow-up \
         comparisons: the {} of {}, each tested by relabelling the two groups' values ({}), with \
         Holm (1979) and Benjamini–Hochberg (1995) adjusted p-values and unadjusted {} bootstrap \
         intervals; each comparison draws from its own seed derived from the run's seed. \
         Cross-checks: one-way ANOVA, Welch's (1951) ANOVA, Kruskal–Wallis with the tie \
         correction. Random numbers: {}, seed {}. Computed with Reshuffle {} on {date}.",
        r.groups.len(),
        r.groups
            .iter()
            .map(|g| format!("{} n = {}", g.name, g.n))
            .collect::<Vec<_>>()
            .join(", "),
        r.statistic.label(),
        words::how(&r.test, "relabellings"),
        words::method(r.ci.method),
        fmt::count(r.bootstrap_resamples),
        pairwise_label,
        match &r.control {
            Some(c) => format!("each group against {c}"),
            None => "every pair of groups".into(),
        },
        words::alternative(
            r.alternative,
            r.two_sided,
            "the first group minus the second"
        ),
        r.pairwise
            .first()
            .map_or("", |c| words::method(c.ci.method)),
        r.test.rng,
        r.test.seed,
        ENGINE_VERSION
    );
    let mut tables = vec![groups, comparisons];
    if r.intervals.len() > 1 {
        tables.push(super::interval_table(
            "interval-table",
            &format!("{level} intervals for eta squared, by method"),
            &r.intervals,
            3,
        ));
    }
    let mut results = super::test_rows(&r.test);
    results.push(row("effect", "eta_squared", format!("{:?}", r.effect)));
    results.extend(super::interval_rows(&r.intervals));
    results.push(row("effect", "omega_squared", full(r.omega_squared)));
    results.push(row("anova", "f", full(r.anova.f)));
    results.push(row("anova", "p_value", full(r.anova.p_value)));
    results.push(row("welch_anova", "f", full(r.welch_anova.f)));
    results.push(row("welch_anova", "p_value", full(r.welch_anova.p_value)));
    results.push(row("kruskal_wallis", "h", full(r.kruskal_wallis.statistic)));
    results.push(row(
        "kruskal_wallis",
        "p_value",
        full(r.kruskal_wallis.p_value),
    ));
    for c in &r.pairwise {
        let part = format!("pair:{} - {}", c.first, c.second);
        results.push(row(&part, "difference", format!("{:?}", c.difference)));
        results.push(row(&part, "ci_low", full(c.ci.low)));
        results.push(row(&part, "ci_high", full(c.ci.high)));
        results.push(row(&part, "p_value", format!("{:?}", c.p_value)));
        results.push(row(&part, "holm", format!("{:?}", c.holm)));
        results.push(row(&part, "bh", format!("{:?}", c.bh)));
    }
    Doc {
        design: DesignKey::KGroups,
        finding: finding(r),
        notes: r.notes.iter().map(words::note).collect(),
        lines,
        tables,
        figures: figures(r),
        sections: Vec::new(),
        methods,
        cautions: super::cautions::cautions(&r.cautions, DesignKey::KGroups),
        results,
        headline: Headline {
            p_value: Some(r.test.p_value),
            estimate: Some(r.effect),
            low: r.ci.low,
            high: r.ci.high,
        },
    }
}

/// The groups, the relabelling distribution and the bootstrap distribution of eta squared.
pub fn figures(r: &KGroupsReport) -> Vec<Figure> {
    let nf = NullFigure::of(
        &r.test,
        r.statistic.label(),
        "relabellings",
        "when the group labels are shuffled across all groups",
    );
    let bf = plot::BootFigure {
        label: "eta squared",
        estimate: r.effect,
        interval: &r.ci,
        histogram: &r.bootstrap_histogram,
        resamples: r.bootstrap_resamples,
    };
    vec![Figure {
        name: "groups",
        svg: super::rows::groups_svg(&r.groups, &r.value_label, "k-strip"),
        caption: super::rows::describe_groups(&r.groups, &r.value_label),
    }]
    .into_iter()
    .chain(plot::test_figures(&nf, &bf, "k", "relabelling"))
    .collect()
}

//! The stratified report in words: the weighted within-strata difference, the per-stratum
//! table, the linear model cross-check and, for contrast, the difference with the strata
//! ignored.

use super::doc::{full, row, Doc, DocTable, Figure, Headline};
use super::plot::{self, NullFigure};
use super::words;
use crate::base::format as fmt;
use crate::base::{Alternative, TwoSidedRule};
use crate::designs::stratified::StrataReport;
use crate::designs::DesignKey;
use crate::wire::ENGINE_VERSION;

/// Decimals for the weighted difference.
pub fn decimals(r: &StrataReport) -> usize {
    match (r.ci.low, r.ci.high) {
        (Some(l), Some(h)) if h > l => fmt::decimals_for(h - l),
        _ => 2,
    }
}

/// The finding in sentences.
pub fn finding(r: &StrataReport) -> String {
    let d = decimals(r);
    let [a, b] = &r.names;
    let dir = if r.effect >= 0.0 { "higher" } else { "lower" };
    let mut s = format!(
        "Within strata of {}, the mean {} was {} {dir} in {a} than in {b} (average of {} \
         stratum differences, {}",
        r.strata_label,
        r.value_label,
        fmt::fixed(r.effect.abs(), d),
        r.strata.len(),
        words::strata_weights(r.weights)
    );
    if let (Some(l), Some(h)) = (r.ci.low, r.ci.high) {
        s.push_str(&format!("; {}", fmt::ci(r.ci.level, l, h, d)));
    }
    let how = match (r.alternative, r.two_sided) {
        (Alternative::TwoSided, TwoSidedRule::Absolute) => {
            "at least this far from zero in either direction"
        }
        (Alternative::TwoSided, TwoSidedRule::DoubledTail) => {
            "at least this far from zero in the observed direction"
        }
        (Alternative::Greater, _) => "at least this large",
        (Alternative::Less, _) => "at least this small",
    };
    let pool = if r.test.exact {
        format!(
            "all {} relabellings within strata",
            fmt::count(r.test.resamples)
        )
    } else {
        format!(
            "{} random relabellings within strata",
            fmt::count(r.test.resamples)
        )
    };
    s.push_str(&format!(
        "). A difference {how} arose in {} of {} ({}).",
        fmt::count(r.test.extreme_count),
        pool,
        fmt::p_value(r.test.p_value)
    ));
    let naive = r.unstratified.mean_difference;
    s.push_str(&format!(
        " With the strata ignored, the difference would be {}.",
        fmt::fixed(naive, d)
    ));
    s
}

/// The stratified report as a document.
pub fn doc(r: &StrataReport, date: &str) -> Doc {
    let d = decimals(r);
    let level = fmt::percent(r.ci.level);
    let [a, b] = &r.names;
    let lm = &r.linear_model;
    let lines = vec![
        (
            "Design".into(),
            format!(
                "two groups ({a}, {b}) compared within {} strata of {}",
                r.strata.len(),
                r.strata_label
            ),
        ),
        (
            "p-value".into(),
            words::p_line(&r.test, "relabellings within strata"),
        ),
        (
            format!("difference in means within strata ({a} − {b})"),
            format!(
                "{} ({})",
                fmt::fixed(r.effect, d),
                words::interval_line(&r.ci, d)
            ),
        ),
        (
            format!("standardized difference (over the pooled within-cell SD) with {level} CI"),
            match r.standardized.estimate {
                Some(g) => format!(
                    "{} ({})",
                    fmt::fixed(g, 2),
                    words::interval_line(&r.standardized.ci, 2)
                ),
                None => "undefined".into(),
            },
        ),
        (
            "Linear model with strata as a factor (cross-check)".into(),
            match (lm.t, lm.p_value) {
                (Some(t), Some(p)) => format!(
                    "{a} − {b} = {}, t = {}, df = {}, {}, {}",
                    fmt::fixed(lm.estimate, d),
                    fmt::fixed(t, 3),
                    words::df(lm.df),
                    fmt::p_value(p),
                    fmt::ci(
                        lm.ci.level,
                        lm.ci.low.unwrap_or(f64::NAN),
                        lm.ci.high.unwrap_or(f64::NAN),
                        d
                    )
                ),
                _ => {
                    if lm.ci.notes.is_empty() {
                        "undefined".into()
                    } else {
                        words::notes(&lm.ci.notes)
                    }
                }
            },
        ),
        (
            "Strata ignored (for contrast)".into(),
            format!(
                "difference in means {}, Welch {}",
                fmt::fixed(r.unstratified.mean_difference, d),
                words::opt_p(r.unstratified.p_value)
            ),
        ),
        (
            "Seed and generator".into(),
            format!("{} · {}", r.test.seed, r.test.rng),
        ),
    ];
    let table = DocTable {
        id: "strata-table",
        caption: format!("Differences within each stratum of {}", r.strata_label),
        header: vec![
            "stratum".into(),
            format!("n {a}"),
            format!("n {b}"),
            format!("mean {a}"),
            format!("mean {b}"),
            "difference".into(),
            "weight".into(),
        ],
        rows: r
            .strata
            .iter()
            .map(|s| {
                vec![
                    s.name.clone(),
                    s.n1.to_string(),
                    s.n2.to_string(),
                    fmt::fixed(s.mean1, d + 1),
                    fmt::fixed(s.mean2, d + 1),
                    fmt::fixed(s.difference, d),
                    fmt::fixed(s.weight, 3),
                ]
            })
            .collect(),
    };
    let methods = format!(
        "Design: two groups ({a}, {b}) within {} strata of {}{}. Test statistic: the weighted \
         average of the per-stratum differences in means ({a} minus {b}), {}. Alternative: {}. \
         Null distribution: {}, group labels relabelled only within each stratum; ties counted \
         as at least as extreme (within the rounding error of the statistic's arithmetic). Interval: {level} {} bootstrap from \
         {} resamples drawn within each stratum and group. Cross-check: least-squares fit of \
         {} on group and stratum (no interaction), t-test of the group coefficient with N − S − 1 \
         degrees of freedom. Random numbers: {}, seed {}. Computed with Reshuffle {} on {date}.",
        r.strata.len(),
        r.strata_label,
        if r.left_out.is_empty() {
            String::new()
        } else {
            format!(
                " ({} left out: only one group present)",
                r.left_out.join(", ")
            )
        },
        words::strata_weights(r.weights),
        words::alternative(r.alternative, r.two_sided, &format!("{a} minus {b}")),
        words::how(&r.test, "relabellings"),
        words::method(r.ci.method),
        fmt::count(r.bootstrap_resamples),
        r.value_label,
        r.test.rng,
        r.test.seed,
        ENGINE_VERSION
    );
    let mut tables = vec![table];
    if r.intervals.len() > 1 {
        tables.push(super::interval_table(
            "interval-table",
            &format!("{level} intervals for the weighted difference, by method"),
            &r.intervals,
            d,
        ));
    }
    let mut results = super::test_rows(&r.test);
    results.push(row("effect", "difference", format!("{:?}", r.effect)));
    results.extend(super::interval_rows(&r.intervals));
    results.push(row(
        "linear_model",
        "estimate",
        format!("{:?}", r.linear_model.estimate),
    ));
    results.push(row("linear_model", "p_value", full(r.linear_model.p_value)));
    for s in &r.strata {
        let part = format!("stratum:{}", s.name);
        results.push(row(&part, "difference", format!("{:?}", s.difference)));
        results.push(row(&part, "weight", format!("{:?}", s.weight)));
    }
    Doc {
        design: DesignKey::Stratified,
        finding: finding(r),
        notes: r.notes.iter().map(words::note).collect(),
        lines,
        tables,
        figures: figures(r),
        sections: Vec::new(),
        methods,
        cautions: super::cautions::cautions(&r.cautions, DesignKey::Stratified),
        results,
        headline: Headline {
            p_value: Some(r.test.p_value),
            estimate: Some(r.effect),
            low: r.ci.low,
            high: r.ci.high,
        },
    }
}

/// The per-stratum differences, the relabelling distribution and the bootstrap distribution.
pub fn figures(r: &StrataReport) -> Vec<Figure> {
    let nf = NullFigure::of(
        &r.test,
        "weighted difference",
        "relabellings",
        "when labels are shuffled within each stratum",
    );
    let bf = plot::BootFigure {
        label: "weighted difference",
        estimate: r.effect,
        interval: &r.ci,
        histogram: &r.bootstrap_histogram,
        resamples: r.bootstrap_resamples,
    };
    vec![Figure {
        name: "strata",
        svg: super::rows::strata_svg(r, "s-strata"),
        caption: super::rows::describe_strata(r),
    }]
    .into_iter()
    .chain(plot::test_figures(&nf, &bf, "s", "relabelling"))
    .collect()
}

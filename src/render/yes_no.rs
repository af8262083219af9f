//! The yes/no report in words: the 2×2 table, the exact test, the bootstrap interval, the
//! classical intervals of the three measures, and Fisher's and the chi-square tests.

use super::doc::{full, row, Doc, DocTable, Figure, Headline};
use super::plot::{self, NullFigure};
use super::words;
use crate::base::format as fmt;
use crate::base::{Alternative, TwoSidedRule};
use crate::designs::yes_no::YesNoReport;
use crate::designs::DesignKey;
use crate::wire::ENGINE_VERSION;

/// "14.0%".
pub fn pct(x: f64) -> String {
    format!("{}%", fmt::fixed(100.0 * x, 1))
}

/// "42 of 300 (14.0%)"
pub fn share(yes: u64, n: u64) -> String {
    format!(
        "{} of {} ({})",
        fmt::count(yes),
        fmt::count(n),
        pct(yes as f64 / n as f64)
    )
}

/// The effect and its interval as a sentence fragment: "−5.7 percentage points (95% CI
/// [−11.6, 0.3])" or "0.71 (95% CI [0.49, 1.02])".
pub fn effect_text(r: &YesNoReport) -> String {
    let (scale, d, unit) = if r.statistic.is_ratio() {
        (1.0, 2, "")
    } else {
        (100.0, 1, " percentage points")
    };
    let mut s = format!("{}{unit}", fmt::fixed(r.effect * scale, d));
    if let (Some(l), Some(h)) = (r.ci.low, r.ci.high) {
        s.push_str(&format!(
            " ({})",
            fmt::ci(r.ci.level, l * scale, h * scale, d)
        ));
    }
    s
}

/// The finding in sentences.
pub fn finding(r: &YesNoReport) -> String {
    let [a, b] = &r.names;

    let how = match (r.alternative, r.two_sided) {
        (Alternative::TwoSided, TwoSidedRule::Absolute) => "at least this far from no difference",
        (Alternative::TwoSided, TwoSidedRule::DoubledTail) => {
            "at least this far from no difference in the observed direction (doubled)"
        }
        (Alternative::Greater, _) => "at least this large",
        (Alternative::Less, _) => "at least this small",
    };
    let head = if r.outcome_label == "yes" {
        format!(
            "In {a}, {} answered yes; in {b}, {}.",
            share(r.yes[0], r.n[0]),
            share(r.yes[1], r.n[1])
        )
    } else {
        format!(
            "In {a}, {} was yes for {}; in {b}, for {}.",
            r.outcome_label,
            share(r.yes[0], r.n[0]),
            share(r.yes[1], r.n[1])
        )
    };
    format!(
        "{head} The {} is {}. With the group sizes and the total \
         number of yes answers fixed, a {} {how} has probability {} over all relabellings of \
         the units (exact, {}).",
        r.statistic.label(),
        effect_text(r),
        r.statistic.label(),
        fmt::percent_share(r.test.p_value),
        fmt::p_value(r.test.p_value)
    )
}

/// The yes/no report as a document.
pub fn doc(r: &YesNoReport, date: &str) -> Doc {
    let [a, b] = &r.names;
    let level = fmt::percent(r.ci.level);
    let measure = |m: &crate::classical::tables::Measure, pct: bool| {
        let (scale, d) = if pct { (100.0, 1) } else { (1.0, 3) };
        let est = fmt::fixed(m.estimate * scale, d);
        match (m.ci.low, m.ci.high) {
            (Some(l), Some(h)) => format!(
                "{est}{} ({}: {})",
                if pct { " points" } else { "" },
                words::method(m.ci.method),
                fmt::ci(m.ci.level, l * scale, h * scale, d)
            ),
            _ => format!(
                "{est} ({})",
                if m.ci.notes.is_empty() {
                    "no interval".into()
                } else {
                    words::notes(&m.ci.notes)
                }
            ),
        }
    };
    let chi = |c: &crate::classical::ChiSquareTest| match (c.statistic, c.p_value) {
        (Some(x), Some(p)) => format!("X² = {}, df = 1, {}", fmt::fixed(x, 3), fmt::p_value(p)),
        _ => "undefined (a margin is zero)".into(),
    };
    let lines = vec![
        (
            "Design".into(),
            format!(
                "yes/no outcome ({}) in two groups: {a} {}, {b} {}",
                r.outcome_label,
                share(r.yes[0], r.n[0]),
                share(r.yes[1], r.n[1])
            ),
        ),
        (
            "p-value".into(),
            format!(
                "{} (exact: hypergeometric over all C({}, {}) ≈ 10^{} relabellings, grouped into \
                 {} possible tables)",
                fmt::p_value(r.test.p_value),
                r.n[0] + r.n[1],
                r.n[0],
                fmt::fixed(r.relabellings_log10, 1),
                fmt::count(r.test.resamples)
            ),
        ),
        (
            format!("{} with {level} bootstrap CI", r.statistic.label()),
            format!("{}; {}", effect_text(r), words::method(r.ci.method)),
        ),
        (
            "Difference in proportions".into(),
            measure(&r.difference, true),
        ),
        ("Risk ratio".into(), measure(&r.risk_ratio, false)),
        ("Odds ratio".into(), measure(&r.odds_ratio, false)),
        (
            "Fisher's exact test (cross-check)".into(),
            format!(
                "{}, {}",
                fmt::p_value(r.fisher_exact.p_value),
                words::fisher_rule(r.fisher_exact.alternative)
            ),
        ),
        ("Chi-square test (cross-check)".into(), chi(&r.chi_square)),
        (
            "Chi-square with Yates' correction".into(),
            format!(
                "{}; smallest expected count {}",
                chi(&r.chi_square_yates),
                fmt::sig(r.smallest_expected)
            ),
        ),
        (
            "Seed and generator".into(),
            format!("{} · {}", r.test.seed, r.test.rng),
        ),
    ];
    let table = DocTable {
        id: "yes-no-table",
        caption: format!("The 2×2 table ({})", r.outcome_label),
        header: ["group", "yes", "no", "total", "share yes"]
            .map(String::from)
            .to_vec(),
        rows: (0..2)
            .map(|i| {
                vec![
                    r.names[i].clone(),
                    fmt::count(r.yes[i]),
                    fmt::count(r.n[i] - r.yes[i]),
                    fmt::count(r.n[i]),
                    pct(r.yes[i] as f64 / r.n[i] as f64),
                ]
            })
            .collect(),
    };
    let methods = format!(
        "Design: a yes/no outcome in two groups ({a}: {} of {}; {b}: {} of {}). Test: the \
         permutation test of the 2×2 table with both margins fixed (Fisher's exact test), \
         computed exactly from the hypergeometric distribution of the yes count in {a}; the \
         statistic is the {}. Alternative: {}. Interval: {level} {} bootstrap from {} resamples \
         (binomial draws within each group){}. Classical intervals: Newcombe's hybrid score \
         interval for the difference (Newcombe 1998, method 10), Katz's log interval for the \
         risk ratio, Woolf's logit interval for the odds ratio. Cross-checks: Fisher's exact \
         test with its usual two-sided rule, Pearson's chi-square test with and without Yates' \
         correction. Random numbers: {}, seed {}. Computed with Reshuffle {} on {date}.",
        r.yes[0],
        r.n[0],
        r.yes[1],
        r.n[1],
        r.statistic.label(),
        words::alternative(r.alternative, r.two_sided, &format!("{a} versus {b}")),
        words::method(r.ci.method),
        fmt::count(r.bootstrap_resamples),
        if r.statistic == crate::designs::yes_no::YesNoStatistic::ProportionDifference {
            ""
        } else {
            ", on the log scale"
        },
        r.test.rng,
        r.test.seed,
        ENGINE_VERSION
    );
    let mut tables = vec![table];
    if r.intervals.len() > 1 {
        tables.push(super::interval_table(
            "interval-table",
            &format!(
                "{level} bootstrap intervals for the {}, by method",
                r.statistic.label()
            ),
            &r.intervals,
            3,
        ));
    }
    let mut results = super::test_rows(&r.test);
    results.push(row(
        "effect",
        &r.statistic.key().replace('-', "_"),
        format!("{:?}", r.effect),
    ));
    results.extend(super::interval_rows(&r.intervals));
    results.push(row(
        "fisher_exact",
        "p_value",
        format!("{:?}", r.fisher_exact.p_value),
    ));
    results.push(row("chi_square", "p_value", full(r.chi_square.p_value)));
    for (i, name) in r.names.iter().enumerate() {
        results.push(row(&format!("group:{name}"), "yes", r.yes[i].to_string()));
        results.push(row(&format!("group:{name}"), "n", r.n[i].to_string()));
    }
    Doc {
        design: DesignKey::YesNo,
        finding: finding(r),
        notes: r.notes.iter().map(words::note).collect(),
        lines,
        tables,
        figures: figures(r),
        sections: Vec::new(),
        methods,
        cautions: super::cautions::cautions(&r.cautions, DesignKey::YesNo),
        results,
        headline: Headline {
            p_value: Some(r.test.p_value),
            estimate: Some(r.effect),
            low: r.ci.low,
            high: r.ci.high,
        },
    }
}

/// The exact distribution of the yes count and the bootstrap distribution.
pub fn figures(r: &YesNoReport) -> Vec<Figure> {
    let label = format!("number of yes in {}", r.names[0]);
    let obs_count = r.yes[0] as f64;
    let mut nf = NullFigure::of(&r.test, &label, "tables", "with the margins fixed (exact)");
    nf.observed = obs_count;
    let bf = plot::BootFigure {
        label: r.statistic.label(),
        estimate: r.effect,
        interval: &r.ci,
        histogram: &r.bootstrap_histogram,
        resamples: r.bootstrap_resamples,
    };
    vec![
        Figure {
            name: "tables",
            svg: plot::null_figure_svg(&nf, "yn-null"),
            caption: plot::describe_null(&nf),
        },
        Figure {
            name: "bootstrap",
            svg: plot::bootstrap_figure_svg(&bf, "yn-boot"),
            caption: plot::describe_bootstrap(&bf),
        },
    ]
}

//! The association report in words: the finding, the scatter plot with the least-squares
//! line, the re-pairing and bootstrap figures, the classical cross-checks.

use super::doc::{full, row, Doc, Figure, Headline};
use super::plot::{self, BootFigure, NullFigure};
use super::words;
use crate::base::format as fmt;
use crate::base::{Alternative, TwoSidedRule};
use crate::designs::association::{AssocReport, AssocStatistic};
use crate::designs::DesignKey;
use crate::wire::ENGINE_VERSION;

fn decimals(r: &AssocReport, fallback: usize) -> usize {
    match (r.ci.low, r.ci.high) {
        (Some(l), Some(h)) if h > l => fmt::decimals_for(h - l),
        _ => fallback,
    }
}

/// The finding in one sentence.
pub fn finding(r: &AssocReport) -> String {
    let d = decimals(r, 2);
    let t = &r.test;
    let mut s = match r.statistic {
        AssocStatistic::Slope => format!(
            "{} rose by {} per unit of {} (least-squares slope",
            r.y,
            fmt::fixed(t.observed, d),
            r.x
        ),
        _ => format!(
            "The {} between {} and {} was {}",
            r.statistic.label(),
            r.x,
            r.y,
            fmt::fixed(t.observed, d)
        ),
    };
    if let (Some(l), Some(h)) = (r.ci.low, r.ci.high) {
        let sep = if r.statistic == AssocStatistic::Slope {
            "; "
        } else {
            " ("
        };
        s.push_str(&format!("{sep}{}", fmt::ci(r.ci.level, l, h, d)));
    }
    s.push(')');
    if r.statistic != AssocStatistic::Slope && r.ci.low.is_none() {
        s.pop();
    }
    let how = match (r.alternative, r.two_sided) {
        (Alternative::TwoSided, TwoSidedRule::Absolute) => {
            "at least this strong in either direction"
        }
        (Alternative::TwoSided, TwoSidedRule::DoubledTail) => {
            "at least this strong in the observed direction"
        }
        (Alternative::Greater, _) => "at least this large",
        (Alternative::Less, _) => "at least this small",
    };
    let kind = if t.exact { "of all" } else { "of" };
    let which = if t.exact {
        "possible pairings"
    } else {
        "random pairings"
    };
    s.push_str(&format!(
        "; an association {how} arose in {} {kind} {} {which} of the two columns ({}{}).",
        fmt::count(t.extreme_count),
        fmt::count(t.resamples),
        if t.exact { "exact " } else { "" },
        fmt::p_value(t.p_value)
    ));
    s
}

/// The scatter plot, the re-pairing distribution and the bootstrap distribution.
pub fn figures(r: &AssocReport) -> Vec<Figure> {
    let label = r.statistic.label();
    let nf = NullFigure::of(
        &r.test,
        label,
        "pairings",
        "when y is re-paired with x at random",
    );
    let bf = BootFigure {
        label,
        estimate: r.test.observed,
        interval: &r.ci,
        histogram: &r.bootstrap_histogram,
        resamples: r.bootstrap_resamples,
    };
    let mut out = vec![Figure {
        name: "scatter",
        svg: plot::scatter_svg(&r.points, r.slope, r.intercept, &r.x, &r.y, "as-scatter"),
        caption: format!("{} against {}, with the least-squares line.", r.y, r.x),
    }];
    out.extend(plot::test_figures(&nf, &bf, "as", "pairings"));
    out
}

/// The association report as a document.
pub fn doc(r: &AssocReport, date: &str) -> Doc {
    let d = decimals(r, 3);
    let t = &r.test;
    let p_line = words::p_line(t, "pairings");
    let mut lines = vec![
        (
            "Design".to_string(),
            format!(
                "association, {} (x, y) pairs (x = {}, y = {})",
                r.n, r.x, r.y
            ),
        ),
        ("p-value".into(), p_line),
    ];
    for iv in &r.intervals {
        lines.push((
            format!("{} {}", r.statistic.label(), fmt::fixed(t.observed, d)),
            words::interval_line(iv, d),
        ));
    }
    let kendall = r.statistic == AssocStatistic::Kendall;
    lines.push(if kendall {
        (
            "Kendall's normal approximation (cross-check)".into(),
            match (r.t, r.t_p_value) {
                (Some(z), Some(p)) => format!("z = {z:.3}, p = {p:.3e} (tie-corrected variance)"),
                _ => "undefined".into(),
            },
        )
    } else {
        (
            "t-test (cross-check)".into(),
            match (r.t, r.t_p_value) {
                (Some(tv), Some(p)) => format!("t = {tv:.3}, df = {}, p = {p:.3e}", r.n - 2),
                _ => "undefined".into(),
            },
        )
    });
    lines.push((
        "Classical interval".into(),
        words::interval_line(&r.classical_ci, d),
    ));
    lines.push((
        "Least-squares line".into(),
        format!(
            "{} = {} + {} × {}",
            r.y,
            fmt::sig(r.intercept),
            fmt::sig(r.slope),
            r.x
        ),
    ));
    lines.push((
        "Seed and generator".into(),
        format!("{} · {}", t.seed, t.rng),
    ));
    let mut tables = Vec::new();
    if r.intervals.len() > 1 {
        tables.push(super::interval_table(
            "interval-table",
            &format!(
                "{} intervals for the {}, by method",
                fmt::percent(r.ci.level),
                r.statistic.label()
            ),
            &r.intervals,
            d,
        ));
    }
    let methods = format!(
        "Permutation test re-pairing y with x ({}); {} bootstrap interval from {} resampled \
         pairs; {} and {} as cross-checks. Random numbers: {}, seed {}. Computed with \
         Reshuffle {ENGINE_VERSION} on {date}.",
        if t.exact {
            format!("exact, all {} pairings", fmt::count(t.resamples))
        } else {
            format!("{} random pairings", fmt::count(t.resamples))
        },
        words::method(r.ci.method),
        fmt::count(r.bootstrap_resamples),
        if kendall {
            "Kendall's normal approximation of S = C − D with the tie-corrected variance \
             (Kendall 1970), tau-b by Knight's O(n log n) method"
        } else {
            "t-test with n − 2 df"
        },
        if kendall {
            "the Fisher z interval of tau-b with variance 0.437/(n − 4) (Fieller, Hartley & \
             Pearson 1957)"
        } else {
            words::method(r.classical_ci.method)
        },
        t.rng,
        t.seed,
    );
    let mut results = super::test_rows(t);
    results.extend(super::interval_rows(&r.intervals));
    results.push(row("t_test", "t", full(r.t)));
    results.push(row("t_test", "p_value", full(r.t_p_value)));
    results.push(row("line", "slope", format!("{:?}", r.slope)));
    results.push(row("line", "intercept", format!("{:?}", r.intercept)));
    Doc {
        design: DesignKey::Association,
        finding: finding(r),
        notes: r.notes.iter().map(words::note).collect(),
        lines,
        tables,
        figures: figures(r),
        sections: Vec::new(),
        methods,
        cautions: super::cautions::cautions(&r.cautions, DesignKey::Association),
        results,
        headline: Headline {
            p_value: Some(t.p_value),
            estimate: Some(t.observed),
            low: r.ci.low,
            high: r.ci.high,
        },
    }
}

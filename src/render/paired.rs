//! The paired and one-sample reports in words (both are sign-flip analyses of differences).

use super::doc::{full, row, Doc, Figure, Headline};
use super::plot::{self, BootFigure, NullFigure};
use super::words;
use crate::base::format as fmt;
use crate::base::{Alternative, TwoSidedRule};
use crate::designs::paired::{Differences, FlipStatistic, SignFlipReport};
use crate::designs::DesignKey;
use crate::wire::ENGINE_VERSION;

/// "drug2 − drug1" or "hours − 50".
pub fn difference_label(r: &SignFlipReport) -> String {
    match &r.differences {
        Differences::Pairs { first, second } => format!("{first} − {second}"),
        Differences::Reference { value, reference } if *reference < 0.0 => {
            format!("{value} − (−{})", -reference)
        }
        Differences::Reference { value, reference } => format!("{value} − {reference}"),
    }
}

fn design(r: &SignFlipReport) -> DesignKey {
    match r.differences {
        Differences::Pairs { .. } => DesignKey::Paired,
        Differences::Reference { .. } => DesignKey::OneSample,
    }
}

fn effect_label(r: &SignFlipReport) -> String {
    let what = match r.statistic {
        FlipStatistic::Mean => "mean",
        FlipStatistic::Median => "median",
        FlipStatistic::SignedRank => "rank-biserial correlation",
    };
    format!("{what} of the differences ({})", difference_label(r))
}

/// What the test flips: the statistic of the differences in words.
fn test_label(r: &SignFlipReport) -> String {
    match r.statistic {
        FlipStatistic::SignedRank => format!(
            "mean signed rank of the differences ({}; ranks of the absolute differences, ties \
             given their mean rank, zero differences left out of the ranking)",
            difference_label(r)
        ),
        _ => effect_label(r),
    }
}

/// The estimate the interval is for: the statistic, or the rank-biserial correlation.
fn estimate(r: &SignFlipReport) -> f64 {
    r.rank_biserial.unwrap_or(r.test.observed)
}

fn decimals(r: &SignFlipReport) -> usize {
    match (r.ci.low, r.ci.high) {
        (Some(l), Some(h)) if h > l => fmt::decimals_for(h - l),
        _ => 2,
    }
}

/// The finding in one sentence.
pub fn finding(r: &SignFlipReport) -> String {
    let d = decimals(r);
    let t = &r.test;
    let mut s = format!("The {} was {}", effect_label(r), fmt::fixed(estimate(r), d));
    if let (Some(l), Some(h)) = (r.ci.low, r.ci.high) {
        s.push_str(&format!(" ({})", fmt::ci(r.ci.level, l, h, d)));
    }
    let what = match r.statistic {
        FlipStatistic::Mean => "a mean difference",
        FlipStatistic::Median => "a median difference",
        FlipStatistic::SignedRank => "a mean signed rank",
    };
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
    if t.exact {
        s.push_str(&format!(
            "; {what} {how} arose in {} of all {} sign patterns (exact {}).",
            fmt::count(t.extreme_count),
            fmt::count(t.resamples),
            fmt::p_value(t.p_value)
        ));
    } else {
        s.push_str(&format!(
            "; {what} {how} arose in {} of {} random sign patterns ({}).",
            fmt::count(t.extreme_count),
            fmt::count(t.resamples),
            fmt::p_value(t.p_value)
        ));
    }
    s
}

/// The sign-flip and bootstrap figures.
pub fn figures(r: &SignFlipReport) -> Vec<Figure> {
    let nf = NullFigure::of(
        &r.test,
        match r.statistic {
            FlipStatistic::Mean => "mean difference",
            FlipStatistic::Median => "median difference",
            FlipStatistic::SignedRank => "mean signed rank",
        },
        "sign patterns",
        "when the signs of the differences are flipped",
    );
    let label = effect_label(r);
    let bf = BootFigure {
        label: &label,
        estimate: estimate(r),
        interval: &r.ci,
        histogram: &r.bootstrap_histogram,
        resamples: r.bootstrap_resamples,
    };
    plot::test_figures(&nf, &bf, "sf", "sign-flips")
}

/// The paired or one-sample report as a document.
pub fn doc(r: &SignFlipReport, date: &str) -> Doc {
    let d = decimals(r);
    let key = design(r);
    let t = &r.test;
    let paired = key == DesignKey::Paired;
    let p_line = words::p_line(t, "sign patterns");
    let mut lines = vec![
        (
            "Design".to_string(),
            format!(
                "{}, {} differences ({})",
                key.key(),
                r.n,
                difference_label(r)
            ),
        ),
        ("p-value".into(), p_line),
    ];
    if r.statistic == FlipStatistic::SignedRank {
        lines.insert(
            1,
            ("observed mean signed rank".into(), fmt::sig(t.observed)),
        );
    }
    for iv in &r.intervals {
        lines.push((effect_label(r), words::interval_line(iv, d)));
    }
    lines.push((
        format!(
            "{} t-test (cross-check)",
            if paired { "Paired" } else { "One-sample" }
        ),
        match (r.t_test.t, r.t_test.p_value) {
            (Some(tv), Some(p)) => format!("t = {tv:.3}, df = {}, p = {p:.5}", r.t_test.df),
            _ => "undefined (no spread)".into(),
        },
    ));
    lines.push((
        "Wilcoxon signed-rank (cross-check)".into(),
        match r.wilcoxon.p_value {
            Some(p) => format!(
                "W+ = {}, p = {p:.5} ({}; {} zero difference{} left out)",
                fmt::sig(r.wilcoxon.w_plus),
                words::rank_method(r.wilcoxon.method),
                r.wilcoxon.zeros,
                if r.wilcoxon.zeros == 1 { "" } else { "s" }
            ),
            None => words::rank_method(r.wilcoxon.method).to_string(),
        },
    ));
    lines.push((
        "d_z (mean difference / SD of differences)".into(),
        match r.dz.estimate {
            Some(dz) => format!("{dz:.3}, {}", words::interval_line(&r.dz.ci, 3)),
            None => "undefined (the differences do not vary)".into(),
        },
    ));
    lines.push((
        "Seed and generator".into(),
        format!("{} · {}", t.seed, t.rng),
    ));
    let mut tables = Vec::new();
    if r.intervals.len() > 1 {
        tables.push(super::interval_table(
            "interval-table",
            &format!("{} intervals, by method", fmt::percent(r.ci.level)),
            &r.intervals,
            d,
        ));
    }
    let methods = format!(
        "Design: {} ({} differences, {}). Test: sign-flip permutation test of the {} ({}). \
         Interval: {} bootstrap of the {} from {} resamples of the differences. Cross-checks: {} t-test; \
         Wilcoxon signed-rank test ({}). Random numbers: {}, seed {}. Computed with Reshuffle \
         {ENGINE_VERSION} on {date}.",
        key.key(),
        r.n,
        difference_label(r),
        test_label(r),
        if t.exact {
            format!("exact, all {} sign patterns", fmt::count(t.resamples))
        } else {
            format!(
                "{} random sign patterns, p = (b + 1)/(m + 1)",
                fmt::count(t.resamples)
            )
        },
        words::method(r.ci.method),
        effect_label(r),
        fmt::count(r.bootstrap_resamples),
        if paired { "paired" } else { "one-sample" },
        words::rank_method(r.wilcoxon.method),
        t.rng,
        t.seed,
    );
    let mut results = super::test_rows(t);
    results.push(row("effect", "estimate", format!("{:?}", estimate(r))));
    results.extend(super::interval_rows(&r.intervals));
    results.push(row("t_test", "t", full(r.t_test.t)));
    results.push(row("t_test", "p_value", full(r.t_test.p_value)));
    results.push(row(
        "wilcoxon",
        "w_plus",
        format!("{:?}", r.wilcoxon.w_plus),
    ));
    results.push(row("wilcoxon", "p_value", full(r.wilcoxon.p_value)));
    results.push(row("dz", "estimate", full(r.dz.estimate)));
    Doc {
        design: key,
        finding: finding(r),
        notes: r.notes.iter().map(words::note).collect(),
        lines,
        tables,
        figures: figures(r),
        sections: Vec::new(),
        methods,
        cautions: super::cautions::cautions(&r.cautions, key),
        results,
        headline: Headline {
            p_value: Some(t.p_value),
            estimate: Some(estimate(r)),
            low: r.ci.low,
            high: r.ci.high,
        },
    }
}

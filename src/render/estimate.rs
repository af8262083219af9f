//! The estimate-only report in words: the estimate, its intervals by every method asked for,
//! the bootstrap standard error and bias, and a classical interval where one exists.

use super::doc::{full, row, Doc, Figure, Headline};
use super::plot::{self, BootFigure};
use super::words;
use crate::base::format as fmt;
use crate::base::{IntervalMethod, Side};
use crate::designs::estimate::{Estimate, EstimateReport};
use crate::designs::DesignKey;
use crate::wire::ENGINE_VERSION;

/// The estimate's name ("90th percentile", "difference in means").
pub fn label(r: &EstimateReport) -> String {
    r.estimate_key.label(r.q.unwrap_or(0.5))
}

/// Decimals for the estimate and its intervals.
pub fn decimals(r: &EstimateReport) -> usize {
    r.intervals
        .first()
        .and_then(|iv| Some(iv.high? - iv.low?))
        .filter(|w| *w > 0.0)
        .map_or_else(|| fmt::decimals_for(r.se.unwrap_or(1.0)), fmt::decimals_for)
}

/// The finding in one sentence.
pub fn finding(r: &EstimateReport) -> String {
    let iv = &r.intervals[0];
    let scale = match (iv.low, iv.high) {
        (Some(l), Some(h)) if h > l => h - l,
        _ => r.se.unwrap_or(r.estimate.abs()).max(1e-12),
    };
    let d = fmt::decimals_for(scale);
    let who = match r.samples.as_slice() {
        [one] => format!(" of {}", one.name),
        [a, b] => format!(" ({} vs {})", a.name, b.name),
        _ => String::new(),
    };
    let bound = match (iv.side, iv.low, iv.high) {
        (Side::TwoSided, Some(l), Some(h)) => format!(
            "{} CI [{}, {}]",
            fmt::percent(iv.level),
            fmt::fixed(l, d),
            fmt::fixed(h, d)
        ),
        (Side::Lower, Some(l), _) => format!(
            "{} lower confidence bound {}",
            fmt::percent(iv.level),
            fmt::fixed(l, d)
        ),
        (Side::Upper, _, Some(h)) => format!(
            "{} upper confidence bound {}",
            fmt::percent(iv.level),
            fmt::fixed(h, d)
        ),
        _ => "no interval could be formed".to_string(),
    };
    // Names of their own ("Hedges' g", "Cliff's delta") take no article.
    let the = match r.estimate_key {
        Estimate::HedgesG | Estimate::CliffsDelta => "",
        _ => "The ",
    };
    format!(
        "{the}{}{who} is {} ({bound}, {} bootstrap, {} resamples; bootstrap SE {}).",
        label(r),
        fmt::fixed(r.estimate, d),
        words::method(iv.method),
        fmt::count(r.resamples),
        r.se.map_or("undefined".into(), fmt::sig)
    )
}

/// Why the headline method comes first.
fn method_reason(r: &EstimateReport) -> String {
    match r.intervals[0].method.bootstrap() {
        Some(IntervalMethod::Bca) => "BCa is the default: it corrects the percentile interval \
             for bias and skewness and is second-order accurate (Efron 1987; DiCiccio & Efron \
             1996)."
            .to_string(),
        _ => format!(
            "{} chosen by the user.",
            words::method(r.intervals[0].method)
        ),
    }
}

/// The bootstrap distribution with the headline interval.
pub fn figures(r: &EstimateReport) -> Vec<Figure> {
    let label = label(r);
    let fig = BootFigure {
        label: &label,
        estimate: r.estimate,
        interval: &r.intervals[0],
        histogram: &r.histogram,
        resamples: r.resamples,
    };
    vec![Figure {
        name: "bootstrap",
        svg: plot::bootstrap_figure_svg(&fig, "est-boot"),
        caption: plot::describe_bootstrap(&fig),
    }]
}

/// The estimate as a document.
pub fn doc(r: &EstimateReport, date: &str) -> Doc {
    let d = decimals(r);
    let sizes = r
        .samples
        .iter()
        .map(|s| format!("{}: n = {}", s.name, s.n))
        .collect::<Vec<_>>()
        .join("; ");
    let lines = vec![
        ("Estimate".to_string(), fmt::fixed(r.estimate, d + 1)),
        (
            "Bootstrap standard error".into(),
            r.se.map_or("undefined".into(), fmt::sig),
        ),
        (
            "Bootstrap bias estimate".into(),
            r.bias.map_or("undefined".into(), fmt::sig),
        ),
        ("Sample".into(), sizes),
        ("Why this method first".into(), method_reason(r)),
        (
            "Seed and generator".into(),
            format!("{} · {}", r.seed, r.rng),
        ),
    ];
    let mut shown = r.intervals.clone();
    shown.extend(r.classical.iter().cloned());
    let table = super::interval_table(
        "interval-table",
        &format!(
            "{} intervals for the {}{}",
            fmt::percent(r.intervals[0].level),
            label(r),
            if r.classical.is_some() {
                " (the last is the classical cross-check)"
            } else {
                ""
            }
        ),
        &shown,
        d + 1,
    );
    let sizes = r
        .samples
        .iter()
        .map(|s| format!("{} (n = {})", s.name, s.n))
        .collect::<Vec<_>>()
        .join(", ");
    let methods_used = r
        .intervals
        .iter()
        .map(|iv| words::method(iv.method))
        .collect::<Vec<_>>()
        .join(", ");
    let methods = format!(
        "Estimate: the {} of {sizes}. Bootstrap: {} resamples ({methods_used}; {} level{}). {} \
         Random numbers: {}, seed {}. Computed with Reshuffle {ENGINE_VERSION} on {date}.",
        label(r),
        fmt::count(r.resamples),
        fmt::percent(r.intervals[0].level),
        match r.intervals[0].side {
            Side::Lower => ", lower bounds",
            Side::Upper => ", upper bounds",
            Side::TwoSided => ", two-sided",
        },
        method_reason(r),
        r.rng,
        r.seed,
    );
    let mut results = vec![
        row("estimate", "value", format!("{:?}", r.estimate)),
        row("estimate", "se", full(r.se)),
        row("estimate", "bias", full(r.bias)),
    ];
    results.extend(super::interval_rows(&r.intervals));
    if let Some(c) = &r.classical {
        results.push(row("classical", "low", full(c.low)));
        results.push(row("classical", "high", full(c.high)));
    }
    results.push(row("run", "seed", r.seed.to_string()));
    Doc {
        design: DesignKey::Estimate,
        finding: finding(r),
        notes: r.notes.iter().map(words::note).collect(),
        lines,
        tables: vec![table],
        figures: figures(r),
        sections: Vec::new(),
        methods,
        cautions: super::cautions::cautions(&r.cautions, DesignKey::Estimate),
        results,
        headline: Headline {
            p_value: None,
            estimate: Some(r.estimate),
            low: r.intervals[0].low,
            high: r.intervals[0].high,
        },
    }
}

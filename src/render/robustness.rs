//! The robustness table of two groups in words: one row per statistic (the chosen one
//! first), one per interval method of the chosen effect and one for the Welch t-test, then
//! one sentence on whether the conclusion at the level is the same under all of them.

use super::doc::{row, DocTable};
use super::words;
use crate::base::format as fmt;
use crate::designs::robustness::Robustness;
use crate::designs::two_groups::TwoGroupsReport;

/// The side of the level a p-value falls on, in a cell.
fn side(p: f64, level: f64) -> String {
    if p <= level {
        format!("p ≤ {}", fmt::plain(level))
    } else {
        format!("p > {}", fmt::plain(level))
    }
}

/// "exact", or the Monte Carlo count with the p-value's standard error.
fn how(exact: bool, resamples: u64, se: Option<f64>) -> String {
    if exact {
        format!("exact, {} splits", fmt::count(resamples))
    } else {
        match se {
            Some(se) => {
                // Two significant digits, as the Monte Carlo error deserves.
                let d = if se > 0.0 {
                    (1.0 - se.log10().floor()).clamp(0.0, 12.0) as usize
                } else {
                    1
                };
                format!(
                    "{} relabellings, standard error {}",
                    fmt::count(resamples),
                    fmt::fixed(se, d)
                )
            }
            None => format!("{} relabellings", fmt::count(resamples)),
        }
    }
}

/// The table's rows: the chosen statistic, the others, the interval methods, Welch.
/// `effect`: what the chosen analysis's interval is for.
pub fn table(r: &TwoGroupsReport, rb: &Robustness, d: usize, effect: &str) -> DocTable {
    let level = rb.level;
    let mut rows = vec![vec![
        format!("{} (chosen)", r.statistic.label()),
        fmt::sig(r.test.observed),
        fmt::p_value(r.test.p_value),
        how(r.test.exact, r.test.resamples, r.test.mc_se),
        side(r.test.p_value, level),
    ]];
    for o in &rb.statistics {
        rows.push(vec![
            o.statistic.label().to_string(),
            fmt::sig(o.observed),
            fmt::p_value(o.p_value),
            how(o.exact, o.resamples, o.mc_se),
            side(o.p_value, level),
        ]);
    }
    let null = fmt::plain(rb.null_effect);
    for iv in &r.intervals {
        let (cell, reads) = match (iv.low, iv.high) {
            (Some(l), Some(h)) => (
                fmt::ci(iv.level, l, h, d),
                if !rb.intervals_read {
                    "not read (one-sided test, or a distance)".to_string()
                } else if l > rb.null_effect || h < rb.null_effect {
                    format!("excludes {null}")
                } else {
                    format!("includes {null}")
                },
            ),
            _ => (words::interval_line(iv, d), "no interval".to_string()),
        };
        rows.push(vec![
            format!("{} interval of the {effect}", words::method(iv.method)),
            cell,
            String::new(),
            format!("{} bootstrap resamples", fmt::count(r.bootstrap_resamples)),
            reads,
        ]);
    }
    let w = &r.welch;
    rows.push(vec![
        "Welch t-test (classical)".into(),
        w.t.map_or("—".into(), fmt::sig),
        w.p_value.map_or("—".into(), fmt::p_value),
        w.df.map_or("undefined (no spread)".into(), |df| {
            format!("t distribution, df = {}", words::df(df))
        }),
        w.p_value.map_or("—".into(), |p| side(p, level)),
    ]);
    DocTable {
        id: "robustness-table",
        caption: format!(
            "The same question under other statistics and interval methods, read at the {} level",
            fmt::plain(level)
        ),
        header: [
            "answered with",
            "value or interval",
            "p-value",
            "how",
            "reading",
        ]
        .map(String::from)
        .to_vec(),
        rows,
    }
}

/// The one sentence on whether the conclusion holds under every choice in the table.
pub fn sentence(r: &TwoGroupsReport, rb: &Robustness) -> String {
    let v = &rb.verdict;
    let level = fmt::plain(rb.level);
    let n_stats = rb.statistics.len() + 1;
    let reading = if v.chosen_below {
        format!("p ≤ {level}")
    } else {
        format!("p > {level}")
    };
    if v.same() {
        let ivs = if rb.intervals_read {
            " and every interval method"
        } else {
            ""
        };
        return format!(
            "At the {level} level the conclusion is the same under all {n_stats} statistics, \
             the Welch t-test{ivs} ({reading} with the chosen {}).",
            r.statistic.label()
        );
    }
    let mut differ: Vec<String> = v
        .statistics_differ
        .iter()
        .map(|s| {
            let p = rb
                .statistics
                .iter()
                .find(|o| o.statistic == *s)
                .map_or(f64::NAN, |o| o.p_value);
            format!("the {} (p = {})", s.label(), fmt::p_number(p))
        })
        .collect();
    if v.welch_differs {
        let p = r.welch.p_value.unwrap_or(f64::NAN);
        differ.push(format!("the Welch t-test (p = {})", fmt::p_number(p)));
    }
    for m in &v.intervals_differ {
        differ.push(format!("the {} interval", words::method(*m)));
    }
    format!(
        "The conclusion at the {level} level depends on the choice: the chosen {} gives \
         {reading}, but {} {} on the other side. Read the result as fragile, and report the \
         analysis chosen before seeing the data.",
        r.statistic.label(),
        words::listed(&differ),
        if differ.len() == 1 { "falls" } else { "fall" }
    )
}

/// What the table is and is not for.
pub const NOT_A_MENU: &str = "This table shows how much the conclusion hangs on reasonable \
     choices; it is not a menu. Picking the statistic with the smallest p-value after seeing \
     them makes that p-value too small.";

/// The table's numbers for the results CSV.
pub fn results(rb: &Robustness) -> Vec<[String; 3]> {
    let mut out = vec![row("robustness", "level", format!("{:?}", rb.level))];
    for o in &rb.statistics {
        let part = format!("robustness:{}", o.statistic.key());
        out.push(row(&part, "observed", format!("{:?}", o.observed)));
        out.push(row(&part, "p_value", format!("{:?}", o.p_value)));
        out.push(row(&part, "exact", o.exact.to_string()));
    }
    out.push(row(
        "robustness",
        "same_conclusion",
        rb.verdict.same().to_string(),
    ));
    out
}

//! Findings for people and for other programs: plain text, Markdown, a self-contained HTML
//! report with the figures inline, and CSV tables. Every text from the data is escaped in
//! HTML; nothing here runs anything.

use crate::base::format as fmt;
use crate::base::*;
use crate::designs::estimate::EstimateReport;
use crate::designs::two_groups;
use crate::designs::two_groups::Report;
use crate::render::plot::{self, escape};
use crate::render::words;

/// "percentile: 95% CI [0.10, 0.92]" or the reason there is none.
pub fn interval_line(iv: &Interval, d: usize) -> String {
    let name = words::method(iv.method);
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
    match &(!iv.notes.is_empty()).then(|| words::notes(&iv.notes)) {
        Some(n) => format!("{name}: {body} ({n})"),
        None => format!("{name}: {body}"),
    }
}

/// The findings in words, as on the page.
pub fn report_text(r: &Report) -> String {
    let d = two_groups::effect_decimals(r);
    let mut s = String::new();
    s.push_str(&r.finding);
    s.push_str("\n\n");
    for n in r.notes.iter().map(words::note) {
        s.push_str(&format!("Note: {n}\n"));
    }
    if !r.notes.is_empty() {
        s.push('\n');
    }
    s.push_str(&format!(
        "{:<12} {:>6} {:>12} {:>12} {:>12} {:>12}\n",
        "group", "n", "mean", "median", "SD", "trim. mean"
    ));
    for g in &r.groups {
        s.push_str(&format!(
            "{:<12} {:>6} {:>12} {:>12} {:>12} {:>12}\n",
            g.name,
            g.n,
            fmt::fixed(g.mean, d + 1),
            fmt::fixed(g.median, d + 1),
            fmt::fixed(g.sd, d + 1),
            fmt::fixed(g.trimmed_mean, d + 1)
        ));
    }
    s.push('\n');
    s.push_str(&format!(
        "Statistic: {} = {}\n",
        r.statistic_label,
        fmt::sig(r.observed)
    ));
    if r.exact {
        s.push_str(&format!(
            "p-value: {} (exact, all {} relabellings enumerated)\n",
            fmt::p_number(r.p_value),
            fmt::count(r.resamples)
        ));
    } else {
        s.push_str(&format!(
            "p-value: {:.5} (Monte Carlo, {} relabellings; MC standard error {:.5}",
            r.p_value,
            fmt::count(r.resamples),
            r.mc_se.unwrap_or(0.0)
        ));
        if let Some(pi) = &r.p_interval {
            s.push_str(&format!("; 99% interval {:.5} to {:.5}", pi.low, pi.high));
        }
        s.push_str(")\n");
    }
    match (r.ci.low, r.ci.high) {
        (Some(l), Some(h)) => s.push_str(&format!(
            "{} {}: {} {} ({}, {} resamples)\n",
            r.effect_label,
            fmt::fixed(r.effect, d),
            fmt::percent(r.ci.level),
            format_args!("CI [{}, {}]", fmt::fixed(l, d), fmt::fixed(h, d)),
            words::method_key(r.ci.method),
            fmt::count(r.bootstrap_resamples)
        )),
        _ => s.push_str(&format!(
            "{} {}: no interval\n",
            r.effect_label,
            fmt::fixed(r.effect, d)
        )),
    }
    if let Some(n) = (!r.ci.notes.is_empty()).then(|| words::notes(&r.ci.notes)) {
        s.push_str(&format!("  ({n})\n"));
    }
    if r.intervals.len() > 1 {
        for iv in &r.intervals[1..] {
            s.push_str(&format!("  {}\n", interval_line(iv, d)));
        }
    }
    match (r.welch.t, r.welch.df, r.welch.p_value) {
        (Some(t), Some(df), Some(p)) => {
            s.push_str(&format!(
                "Welch t-test (cross-check): t = {:.3}, df = {:.2}, p = {:.5}",
                t, df, p
            ));
            if let (Some(l), Some(h)) = (r.welch.ci.low, r.welch.ci.high) {
                s.push_str(&format!(", {}", fmt::ci(r.welch.ci.level, l, h, d)));
            }
            s.push('\n');
        }
        _ => s.push_str("Welch t-test (cross-check): undefined (no spread)\n"),
    }
    match r.hedges_g.estimate {
        Some(g) => {
            s.push_str(&format!("Hedges' g: {:.3}", g));
            if let (Some(l), Some(h)) = (r.hedges_g.ci.low, r.hedges_g.ci.high) {
                s.push_str(&format!(", {}", fmt::ci(r.hedges_g.ci.level, l, h, 3)));
            }
            s.push('\n');
        }
        None => s.push_str("Hedges' g: undefined (no spread)\n"),
    }
    s.push_str(&format!("Seed: {} ({})\n\n", r.seed, r.rng));
    for c in &r.cautions {
        s.push_str(&format!("- {c}\n"));
    }
    s
}

/// Estimate-only findings in words.
pub fn estimate_text(rep: &EstimateReport) -> String {
    let d = estimate_decimals(rep);
    let mut s = format!("{}\n\n", rep.finding);
    for n in rep.notes.iter().map(words::note) {
        s.push_str(&format!("Note: {n}\n"));
    }
    s.push_str(&format!(
        "Estimate {}; bootstrap SE {}; bias {}\n",
        fmt::sig(rep.estimate),
        rep.se.map_or("undefined".into(), fmt::sig),
        rep.bias.map_or("undefined".into(), fmt::sig)
    ));
    for iv in &rep.intervals {
        s.push_str(&format!("  {}\n", interval_line(iv, d)));
    }
    if let Some(c) = &rep.classical {
        s.push_str(&format!(
            "  classical cross-check, {}\n",
            interval_line(c, d)
        ));
    }
    s.push_str(&format!(
        "{}\nSeed: {} ({})\n\n",
        rep.method_reason, rep.seed, rep.rng
    ));
    for c in &rep.cautions {
        s.push_str(&format!("- {c}\n"));
    }
    s
}

pub fn estimate_decimals(rep: &EstimateReport) -> usize {
    rep.intervals
        .first()
        .and_then(|iv| Some(iv.high? - iv.low?))
        .filter(|w| *w > 0.0)
        .map_or_else(
            || fmt::decimals_for(rep.se.unwrap_or(1.0)),
            fmt::decimals_for,
        )
}

pub(crate) fn md_escape(s: &str) -> String {
    let mut out = String::with_capacity(s.len());
    for c in s.chars() {
        if matches!(
            c,
            '\\' | '`' | '*' | '_' | '[' | ']' | '<' | '>' | '|' | '#'
        ) {
            out.push('\\');
        }
        out.push(c);
    }
    out
}

fn p_detail(r: &Report) -> String {
    if r.exact {
        format!(
            "exact (all {} relabellings enumerated)",
            fmt::count(r.resamples)
        )
    } else {
        let mut s = format!(
            "Monte Carlo, {} random relabellings, p = (b + 1)/(m + 1) = {:.5}, standard error {:.5}",
            fmt::count(r.resamples),
            r.p_value,
            r.mc_se.unwrap_or(0.0)
        );
        if let Some(pi) = &r.p_interval {
            s.push_str(&format!(", 99% interval {:.5} to {:.5}", pi.low, pi.high));
        }
        s
    }
}

/// A paragraph with everything needed to reproduce the analysis.
pub fn methods_paragraph(r: &Report, date: &str) -> String {
    let alt = match (r.alternative, r.two_sided) {
        (Alternative::TwoSided, TwoSidedRule::Absolute) => {
            "two-sided, counting relabellings whose statistic is at least as far from zero as the observed one (|T| ≥ |t|)".to_string()
        }
        (Alternative::TwoSided, TwoSidedRule::DoubledTail) => {
            "two-sided, as twice the smaller one-sided p-value (capped at 1)".to_string()
        }
        (Alternative::Greater, _) => format!("one-sided: {} minus {} greater than zero", r.groups[0].name, r.groups[1].name),
        (Alternative::Less, _) => format!("one-sided: {} minus {} less than zero", r.groups[0].name, r.groups[1].name),
    };
    let method = words::method(r.ci.method).to_string();
    format!(
        "Design: two independent groups ({} with n = {}, {} with n = {}). Test statistic: the {} ({} minus {}). \
         Alternative: {alt}. Null distribution: {}; ties with the observed value counted as at least as extreme \
         (relative tolerance 1e-9). Effect: the {} with a {} {} bootstrap interval from {} resamples drawn within \
         each group; Hedges' g with its bootstrap interval; Welch's t-test with Welch–Satterthwaite degrees of freedom \
         as a classical cross-check. Random numbers: {}, seed {}. Computed with Reshuffle {} on {date}.",
        r.groups[0].name,
        r.groups[0].n,
        r.groups[1].name,
        r.groups[1].n,
        r.statistic_label,
        r.groups[0].name,
        r.groups[1].name,
        p_detail(r),
        r.effect_label,
        fmt::percent(r.ci.level),
        method,
        fmt::count(r.bootstrap_resamples),
        r.rng,
        r.seed,
        r.engine_version,
    )
}

/// The findings as Markdown (for a lab notebook, a ticket or a manuscript draft).
pub fn markdown(r: &Report, date: &str) -> String {
    let d = two_groups::effect_decimals(r);
    let mut s = format!("## Findings\n\n{}\n\n", md_escape(&r.finding));
    for n in r.notes.iter().map(words::note) {
        s.push_str(&format!("- Note: {}\n", md_escape(&n)));
    }
    s.push_str("\n| group | n | mean | median | SD |\n| --- | ---: | ---: | ---: | ---: |\n");
    for g in &r.groups {
        s.push_str(&format!(
            "| {} | {} | {} | {} | {} |\n",
            md_escape(&g.name),
            g.n,
            fmt::fixed(g.mean, d + 1),
            fmt::fixed(g.median, d + 1),
            fmt::fixed(g.sd, d + 1)
        ));
    }
    s.push_str("\n| result | value |\n| --- | --- |\n");
    for (k, v) in result_rows(r) {
        s.push_str(&format!("| {} | {} |\n", md_escape(&k), md_escape(&v)));
    }
    s.push_str("\n### Methods\n\n");
    s.push_str(&md_escape(&methods_paragraph(r, date)));
    s.push_str("\n\n### Cautions\n\n");
    for c in &r.cautions {
        s.push_str(&format!("- {}\n", md_escape(c)));
    }
    s
}

/// (label, value) rows of the results table.
pub fn result_rows(r: &Report) -> Vec<(String, String)> {
    let d = two_groups::effect_decimals(r);
    let mut rows = vec![
        (
            format!("observed {}", r.statistic_label),
            fmt::sig(r.observed),
        ),
        (
            "p-value".to_string(),
            format!("{} ({})", fmt::p_number(r.p_value), p_detail(r)),
        ),
    ];
    for iv in &r.intervals {
        rows.push((format!("{} interval", r.effect_label), interval_line(iv, d)));
    }
    rows.push((
        "Welch t-test".into(),
        match (r.welch.t, r.welch.df, r.welch.p_value) {
            (Some(t), Some(df), Some(p)) => {
                let ci = match (r.welch.ci.low, r.welch.ci.high) {
                    (Some(l), Some(h)) => format!(", {}", fmt::ci(r.welch.ci.level, l, h, d)),
                    _ => String::new(),
                };
                format!("t = {t:.3}, df = {df:.2}, p = {p:.5}{ci}")
            }
            _ => "undefined (no spread)".into(),
        },
    ));
    rows.push((
        "Hedges' g".into(),
        match r.hedges_g.estimate {
            Some(g) => match (r.hedges_g.ci.low, r.hedges_g.ci.high) {
                (Some(l), Some(h)) => format!("{g:.3}, {}", fmt::ci(r.hedges_g.ci.level, l, h, 3)),
                _ => format!("{g:.3}"),
            },
            None => "undefined".into(),
        },
    ));
    rows.push(("seed".into(), format!("{} ({})", r.seed, r.rng)));
    rows
}

const REPORT_STYLE: &str = "body{font-family:system-ui,sans-serif;color:#1f2328;max-width:60rem;margin:2rem auto;padding:0 1rem;line-height:1.5}\
h1{color:#1d5c63;font-size:1.5rem}table{border-collapse:collapse;margin:1rem 0}td,th{border-bottom:1px solid #d5d9de;padding:.25rem .8rem .25rem 0;text-align:left}\
figure{margin:1rem 0;break-inside:avoid}figcaption{color:#4a5058;font-size:.9rem}.cautions{border:1px solid #c9b458;background:#fff8e1;padding:.5rem 1rem}\
.headline{font-weight:600;font-size:1.1rem}@media print{body{margin:0}}";

pub(crate) fn html_page(title: &str, body: &str) -> String {
    format!(
        "<!doctype html>\n<html lang=\"en\"><head><meta charset=\"utf-8\"><meta http-equiv=\"Content-Security-Policy\" content=\"default-src 'none'; style-src 'unsafe-inline'; img-src data:\"><title>{}</title><style>{REPORT_STYLE}</style></head><body>{body}</body></html>\n",
        escape(title)
    )
}

/// A self-contained HTML report: no script, no external file, figures inline as SVG.
pub fn html(r: &Report, date: &str) -> String {
    let d = two_groups::effect_decimals(r);
    let mut b = String::new();
    b.push_str("<h1>Reshuffle findings</h1>");
    b.push_str(&format!("<p class=\"headline\">{}</p>", escape(&r.finding)));
    if !r.notes.is_empty() {
        b.push_str("<ul>");
        for n in r.notes.iter().map(words::note) {
            b.push_str(&format!("<li>{}</li>", escape(&n)));
        }
        b.push_str("</ul>");
    }
    b.push_str("<table><thead><tr><th>group</th><th>n</th><th>mean</th><th>median</th><th>SD</th></tr></thead><tbody>");
    for g in &r.groups {
        b.push_str(&format!(
            "<tr><td>{}</td><td>{}</td><td>{}</td><td>{}</td><td>{}</td></tr>",
            escape(&g.name),
            g.n,
            fmt::fixed(g.mean, d + 1),
            fmt::fixed(g.median, d + 1),
            fmt::fixed(g.sd, d + 1)
        ));
    }
    b.push_str("</tbody></table><table><tbody>");
    for (k, v) in result_rows(r) {
        b.push_str(&format!(
            "<tr><th>{}</th><td>{}</td></tr>",
            escape(&k),
            escape(&v)
        ));
    }
    b.push_str("</tbody></table>");
    b.push_str(&format!(
        "<figure>{}<figcaption>{}</figcaption></figure>",
        plot::null_svg(r, "rep-null"),
        escape(&plot::null_description(r))
    ));
    b.push_str(&format!(
        "<figure>{}<figcaption>{}</figcaption></figure>",
        plot::bootstrap_svg(r, "rep-boot"),
        escape(&plot::bootstrap_description(r))
    ));
    b.push_str(&format!(
        "<h2>Methods</h2><p>{}</p>",
        escape(&methods_paragraph(r, date))
    ));
    b.push_str("<div class=\"cautions\"><h2>Cautions</h2><ul>");
    for c in &r.cautions {
        b.push_str(&format!("<li>{}</li>", escape(c)));
    }
    b.push_str("</ul></div>");
    html_page("Reshuffle findings", &b)
}

/// Methods paragraph for an estimate.
pub fn estimate_methods(rep: &EstimateReport, date: &str) -> String {
    let sizes = rep
        .samples
        .iter()
        .map(|s| format!("{} (n = {})", s.name, s.n))
        .collect::<Vec<_>>()
        .join(", ");
    let methods = rep
        .intervals
        .iter()
        .map(|iv| words::method(iv.method).to_string())
        .collect::<Vec<_>>()
        .join(", ");
    format!(
        "Estimate: the {} of {sizes}. Bootstrap: {} resamples ({methods}; {} level{}). {} Random numbers: {}, \
         seed {}. Computed with Reshuffle {} on {date}.",
        rep.estimate_label,
        fmt::count(rep.resamples),
        fmt::percent(rep.intervals.first().map_or(0.95, |i| i.level)),
        match rep.intervals.first().map(|i| i.side) {
            Some(Side::Lower) => ", lower bounds",
            Some(Side::Upper) => ", upper bounds",
            _ => ", two-sided",
        },
        rep.method_reason,
        rep.rng,
        rep.seed,
        rep.engine_version
    )
}

pub fn estimate_markdown(rep: &EstimateReport, date: &str) -> String {
    let d = estimate_decimals(rep);
    let mut s = format!("## Estimate\n\n{}\n\n", md_escape(&rep.finding));
    for n in rep.notes.iter().map(words::note) {
        s.push_str(&format!("- Note: {}\n", md_escape(&n)));
    }
    s.push_str("\n| method | interval |\n| --- | --- |\n");
    for iv in rep.intervals.iter().chain(rep.classical.iter()) {
        s.push_str(&format!(
            "| {} | {} |\n",
            md_escape(words::method_key(iv.method)),
            md_escape(&interval_line(iv, d))
        ));
    }
    s.push_str(&format!(
        "\n### Methods\n\n{}\n\n### Cautions\n\n",
        md_escape(&estimate_methods(rep, date))
    ));
    for c in &rep.cautions {
        s.push_str(&format!("- {}\n", md_escape(c)));
    }
    s
}

pub fn estimate_html(rep: &EstimateReport, date: &str) -> String {
    let d = estimate_decimals(rep);
    let mut b = format!(
        "<h1>Reshuffle estimate</h1><p class=\"headline\">{}</p>",
        escape(&rep.finding)
    );
    if !rep.notes.is_empty() {
        b.push_str("<ul>");
        for n in rep.notes.iter().map(words::note) {
            b.push_str(&format!("<li>{}</li>", escape(&n)));
        }
        b.push_str("</ul>");
    }
    b.push_str("<table><tbody>");
    for iv in rep.intervals.iter().chain(rep.classical.iter()) {
        b.push_str(&format!(
            "<tr><td>{}</td></tr>",
            escape(&interval_line(iv, d))
        ));
    }
    b.push_str(&format!(
        "<tr><td>bootstrap SE {}; bias {}</td></tr></tbody></table>",
        rep.se.map_or("undefined".into(), fmt::sig),
        rep.bias.map_or("undefined".into(), fmt::sig)
    ));
    let fig = plot::BootFigure {
        label: &rep.estimate_label,
        estimate: rep.estimate,
        interval: &rep.intervals[0],
        histogram: &rep.histogram,
        resamples: rep.resamples,
    };
    b.push_str(&format!(
        "<figure>{}<figcaption>{}</figcaption></figure>",
        plot::bootstrap_figure_svg(&fig, "rep-est"),
        escape(&plot::describe_bootstrap(&fig))
    ));
    b.push_str(&format!(
        "<h2>Methods</h2><p>{}</p><div class=\"cautions\"><h2>Cautions</h2><ul>",
        escape(&estimate_methods(rep, date))
    ));
    for c in &rep.cautions {
        b.push_str(&format!("<li>{}</li>", escape(c)));
    }
    b.push_str("</ul></div>");
    html_page("Reshuffle estimate", &b)
}

/// A CSV table (csv crate) from rows of cells.
pub fn csv_table(header: &[&str], rows: &[Vec<String>]) -> String {
    let mut w = csv::Writer::from_writer(Vec::new());
    let _ = w.write_record(header);
    for r in rows {
        let _ = w.write_record(r);
    }
    String::from_utf8(w.into_inner().unwrap_or_default()).unwrap_or_default()
}

/// The results table as CSV (full precision).
pub fn results_csv(r: &Report) -> String {
    let mut rows: Vec<Vec<String>> = Vec::new();
    for g in &r.groups {
        for (k, v) in [
            ("n", g.n as f64),
            ("mean", g.mean),
            ("median", g.median),
            ("sd", g.sd),
            ("trimmed_mean", g.trimmed_mean),
        ] {
            rows.push(vec![
                format!("group:{}", g.name),
                k.into(),
                format!("{v:?}"),
            ]);
        }
    }
    let opt = |v: Option<f64>| v.map_or(String::new(), |x| format!("{x:?}"));
    rows.push(vec![
        "test".into(),
        "observed".into(),
        format!("{:?}", r.observed),
    ]);
    rows.push(vec![
        "test".into(),
        "p_value".into(),
        format!("{:?}", r.p_value),
    ]);
    rows.push(vec!["test".into(), "exact".into(), r.exact.to_string()]);
    rows.push(vec![
        "test".into(),
        "relabellings".into(),
        r.resamples.to_string(),
    ]);
    rows.push(vec!["test".into(), "mc_se".into(), opt(r.mc_se)]);
    for iv in &r.intervals {
        rows.push(vec![
            format!("interval:{}", words::method_key(iv.method)),
            "low".into(),
            opt(iv.low),
        ]);
        rows.push(vec![
            format!("interval:{}", words::method_key(iv.method)),
            "high".into(),
            opt(iv.high),
        ]);
    }
    rows.push(vec!["welch".into(), "t".into(), opt(r.welch.t)]);
    rows.push(vec!["welch".into(), "df".into(), opt(r.welch.df)]);
    rows.push(vec!["welch".into(), "p_value".into(), opt(r.welch.p_value)]);
    rows.push(vec![
        "hedges_g".into(),
        "estimate".into(),
        opt(r.hedges_g.estimate),
    ]);
    rows.push(vec!["run".into(), "seed".into(), r.seed.to_string()]);
    csv_table(&["part", "quantity", "value"], &rows)
}

/// Resampled statistics as CSV: one column per list, blank where a list is shorter.
pub fn values_csv(columns: &[(&str, &[f64])]) -> String {
    let header: Vec<&str> = std::iter::once("index")
        .chain(columns.iter().map(|c| c.0))
        .collect();
    let n = columns.iter().map(|c| c.1.len()).max().unwrap_or(0);
    let rows: Vec<Vec<String>> = (0..n)
        .map(|i| {
            std::iter::once((i + 1).to_string())
                .chain(
                    columns
                        .iter()
                        .map(|c| c.1.get(i).map_or(String::new(), |v| format!("{v:?}"))),
                )
                .collect()
        })
        .collect();
    csv_table(&header, &rows)
}

/// Today's date (UTC) from seconds since 1970, as YYYY-MM-DD (civil-from-days, H. Hinnant).
pub fn iso_date(unix_seconds: i64) -> String {
    let z = unix_seconds.div_euclid(86_400) + 719_468;
    let era = z.div_euclid(146_097);
    let doe = z - era * 146_097;
    let yoe = (doe - doe / 1460 + doe / 36_524 - doe / 146_096) / 365;
    let doy = doe - (365 * yoe + yoe / 4 - yoe / 100);
    let mp = (5 * doy + 2) / 153;
    let d = doy - (153 * mp + 2) / 5 + 1;
    let m = if mp < 10 { mp + 3 } else { mp - 9 };
    let y = yoe + era * 400 + i64::from(m <= 2);
    format!("{y:04}-{m:02}-{d:02}")
}

/// Paired or one-sample findings in words.
pub fn paired_text(r: &crate::designs::paired::PairedReport) -> String {
    let d = match (r.ci.low, r.ci.high) {
        (Some(l), Some(h)) if h > l => fmt::decimals_for(h - l),
        _ => 2,
    };
    let mut s = format!("{}\n\n", r.finding);
    for n in r.notes.iter().map(words::note) {
        s.push_str(&format!("Note: {n}\n"));
    }
    s.push_str(&format!(
        "Design: {}, {} differences ({})\n",
        r.design, r.n, r.difference_label
    ));
    if r.exact {
        s.push_str(&format!(
            "p-value: {} (exact, all {} sign patterns)\n",
            fmt::p_number(r.p_value),
            fmt::count(r.resamples)
        ));
    } else {
        s.push_str(&format!(
            "p-value: {:.5} (Monte Carlo, {} sign patterns; MC standard error {:.5})\n",
            r.p_value,
            fmt::count(r.resamples),
            r.mc_se.unwrap_or(0.0)
        ));
    }
    s.push_str(&format!(
        "{}: {}\n",
        r.effect_label,
        interval_line(&r.ci, d)
    ));
    match (r.t_test.t, r.t_test.p_value) {
        (Some(t), Some(p)) => s.push_str(&format!(
            "{} t-test (cross-check): t = {t:.3}, df = {}, p = {p:.5}\n",
            if r.design == "paired" {
                "Paired"
            } else {
                "One-sample"
            },
            r.t_test.df
        )),
        _ => s.push_str("t-test (cross-check): undefined (no spread)\n"),
    }
    match r.wilcoxon.p_value {
        Some(p) => s.push_str(&format!(
            "Wilcoxon signed-rank (cross-check): W+ = {}, p = {p:.5} ({}; {} zero difference{} left out)\n",
            fmt::sig(r.wilcoxon.w_plus),
            words::rank_method(r.wilcoxon.method),
            r.wilcoxon.zeros,
            if r.wilcoxon.zeros == 1 { "" } else { "s" }
        )),
        None => s.push_str(&format!("Wilcoxon signed-rank: {}\n", words::rank_method(r.wilcoxon.method))),
    }
    if let Some(dz) = r.dz.estimate {
        s.push_str(&format!(
            "{}: {dz:.3}, {}\n",
            r.dz.name,
            interval_line(&r.dz.ci, 3)
        ));
    }
    s.push_str(&format!("Seed: {} ({})\n\n", r.seed, r.rng));
    for c in &r.cautions {
        s.push_str(&format!("- {c}\n"));
    }
    s
}

/// Null and bootstrap figures of a paired or one-sample report.
pub fn paired_figures(
    r: &crate::designs::paired::PairedReport,
) -> (plot::NullFigure<'_>, plot::BootFigure<'_>) {
    (
        plot::NullFigure {
            label: if r.statistic == crate::resample::signs::FlipStatistic::Mean {
                "mean difference"
            } else {
                "median difference"
            },
            unit: "sign patterns",
            how: "when the signs of the differences are flipped",
            observed: r.observed,
            exact: r.exact,
            resamples: r.resamples,
            extreme: r.extreme_count,
            p_value: r.p_value,
            tail: &r.tail,
            histogram: &r.null_histogram,
        },
        plot::BootFigure {
            label: &r.effect_label,
            estimate: r.observed,
            interval: &r.ci,
            histogram: &r.bootstrap_histogram,
            resamples: r.bootstrap_resamples,
        },
    )
}

pub fn paired_markdown(r: &crate::designs::paired::PairedReport, date: &str) -> String {
    let mut s = format!("## Findings\n\n{}\n\n", md_escape(&r.finding));
    for line in paired_text(r)
        .lines()
        .skip(2)
        .filter(|l| !l.is_empty() && !l.starts_with("- "))
    {
        s.push_str(&format!("- {}\n", md_escape(line)));
    }
    s.push_str(&format!(
        "\n### Methods\n\n{}\n\n### Cautions\n\n",
        md_escape(&paired_methods(r, date))
    ));
    for c in &r.cautions {
        s.push_str(&format!("- {}\n", md_escape(c)));
    }
    s
}

pub fn paired_methods(r: &crate::designs::paired::PairedReport, date: &str) -> String {
    format!(
        "Design: {} ({} differences, {}). Test: sign-flip permutation test of the {} ({}). \
         Interval: {} bootstrap from {} resamples of the differences. Cross-checks: {} t-test; \
         Wilcoxon signed-rank test ({}). Random numbers: {}, seed {}. Computed with Reshuffle {} on {date}.",
        r.design,
        r.n,
        r.difference_label,
        r.effect_label,
        if r.exact {
            format!("exact, all {} sign patterns", fmt::count(r.resamples))
        } else {
            format!("{} random sign patterns, p = (b + 1)/(m + 1)", fmt::count(r.resamples))
        },
        words::method(r.ci.method),
        fmt::count(r.bootstrap_resamples),
        if r.design == "paired" { "paired" } else { "one-sample" },
        words::rank_method(r.wilcoxon.method),
        r.rng,
        r.seed,
        r.engine_version
    )
}

pub fn paired_html(r: &crate::designs::paired::PairedReport, date: &str) -> String {
    let (nf, bf) = paired_figures(r);
    let figures = [
        (
            plot::null_figure_svg(&nf, "rep-null"),
            plot::describe_null(&nf),
        ),
        (
            plot::bootstrap_figure_svg(&bf, "rep-boot"),
            plot::describe_bootstrap(&bf),
        ),
    ];
    design_page(
        &r.finding,
        &paired_text(r),
        &figures,
        &paired_methods(r, date),
        &r.cautions,
    )
}

/// A report page for a design: the finding, the lines of its text summary, figures with
/// captions, the methods paragraph and the cautions; everything escaped.
fn design_page(
    finding: &str,
    text: &str,
    figures: &[(String, String)],
    methods: &str,
    cautions: &[String],
) -> String {
    let mut b = format!(
        "<h1>Reshuffle findings</h1><p class=\"headline\">{}</p><ul>",
        escape(finding)
    );
    for line in text
        .lines()
        .skip(2)
        .filter(|l| !l.is_empty() && !l.starts_with("- "))
    {
        b.push_str(&format!("<li>{}</li>", escape(line.trim())));
    }
    b.push_str("</ul>");
    for (svg, caption) in figures {
        b.push_str(&format!(
            "<figure>{svg}<figcaption>{}</figcaption></figure>",
            escape(caption)
        ));
    }
    b.push_str(&format!(
        "<h2>Methods</h2><p>{}</p><div class=\"cautions\"><h2>Cautions</h2><ul>",
        escape(methods)
    ));
    for c in cautions {
        b.push_str(&format!("<li>{}</li>", escape(c)));
    }
    b.push_str("</ul></div>");
    html_page("Reshuffle findings", &b)
}

/// Association findings in words.
pub fn assoc_text(r: &crate::designs::association::AssocReport) -> String {
    let d = match (r.ci.low, r.ci.high) {
        (Some(l), Some(h)) if h > l => fmt::decimals_for(h - l),
        _ => 3,
    };
    let mut s = format!("{}\n\n", r.finding);
    for n in r.notes.iter().map(words::note) {
        s.push_str(&format!("Note: {n}\n"));
    }
    s.push_str(&format!(
        "Design: association, {} (x, y) pairs (x = {}, y = {})\n",
        r.n, r.x, r.y
    ));
    if r.exact {
        s.push_str(&format!(
            "p-value: {} (exact, all {} pairings)\n",
            fmt::p_number(r.p_value),
            fmt::count(r.resamples)
        ));
    } else {
        s.push_str(&format!(
            "p-value: {:.5} (Monte Carlo, {} random pairings; MC standard error {:.5})\n",
            r.p_value,
            fmt::count(r.resamples),
            r.mc_se.unwrap_or(0.0)
        ));
    }
    s.push_str(&format!(
        "{} {}: {}\n",
        r.statistic_label,
        fmt::fixed(r.observed, d),
        interval_line(&r.ci, d)
    ));
    match (r.t, r.t_p_value) {
        (Some(t), Some(p)) => s.push_str(&format!(
            "t-test (cross-check): t = {t:.3}, df = {}, p = {p:.3e}\n",
            r.n - 2
        )),
        _ => s.push_str("t-test (cross-check): undefined\n"),
    }
    s.push_str(&format!(
        "  classical interval: {}\n",
        interval_line(&r.classical_ci, d)
    ));
    s.push_str(&format!(
        "Least-squares line: {} = {} + {} × {}\n",
        r.y,
        fmt::sig(r.intercept),
        fmt::sig(r.slope),
        r.x
    ));
    s.push_str(&format!("Seed: {} ({})\n\n", r.seed, r.rng));
    for c in &r.cautions {
        s.push_str(&format!("- {c}\n"));
    }
    s
}

/// Null, bootstrap and scatter figures of an association report.
pub fn assoc_figures(
    r: &crate::designs::association::AssocReport,
) -> (plot::NullFigure<'_>, plot::BootFigure<'_>, String) {
    (
        plot::NullFigure {
            label: &r.statistic_label,
            unit: "pairings",
            how: "when y is re-paired with x at random",
            observed: r.observed,
            exact: r.exact,
            resamples: r.resamples,
            extreme: r.extreme_count,
            p_value: r.p_value,
            tail: &r.tail,
            histogram: &r.null_histogram,
        },
        plot::BootFigure {
            label: &r.statistic_label,
            estimate: r.observed,
            interval: &r.ci,
            histogram: &r.bootstrap_histogram,
            resamples: r.bootstrap_resamples,
        },
        plot::scatter_svg(&r.points, r.slope, r.intercept, &r.x, &r.y, "scatter"),
    )
}

pub fn assoc_markdown(r: &crate::designs::association::AssocReport, _date: &str) -> String {
    let mut s = format!("## Findings\n\n{}\n\n", md_escape(&r.finding));
    for line in assoc_text(r).lines().skip(2).filter(|l| !l.is_empty()) {
        s.push_str(&format!("- {}\n", md_escape(line.trim_start_matches("- "))));
    }
    s
}

pub fn assoc_html(r: &crate::designs::association::AssocReport, date: &str) -> String {
    let (nf, bf, scatter) = assoc_figures(r);
    let figures = [
        (
            scatter,
            format!("{} against {}, with the least-squares line.", r.y, r.x),
        ),
        (
            plot::null_figure_svg(&nf, "rep-null"),
            plot::describe_null(&nf),
        ),
        (
            plot::bootstrap_figure_svg(&bf, "rep-boot"),
            plot::describe_bootstrap(&bf),
        ),
    ];
    let methods = format!(
        "Permutation test re-pairing y with x ({}); {} bootstrap interval from {} resampled pairs; t-test with n − 2 df and {} as cross-checks. Random numbers: {}, seed {}. Computed with Reshuffle {} on {date}.",
        if r.exact { format!("exact, all {} pairings", fmt::count(r.resamples)) } else { format!("{} random pairings", fmt::count(r.resamples)) },
        words::method_key(r.ci.method),
        fmt::count(r.bootstrap_resamples),
        words::method(r.classical_ci.method),
        r.rng,
        r.seed,
        r.engine_version
    );
    design_page(&r.finding, &assoc_text(r), &figures, &methods, &r.cautions)
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::designs::two_groups::Request;

    fn report() -> Report {
        let mut r = Request::new(
            "y,g\n1,<b>x</b>\n2,<b>x</b>\n3,<b>x</b>\n4,y|z\n5,y|z\n7,y|z\n".into(),
            3,
        );
        r.resamples = 999;
        r.bootstrap_resamples = 500;
        crate::designs::two_groups::run(&r, &mut |_| true).unwrap()
    }

    #[test]
    fn html_report_is_self_contained_and_escaped() {
        let h = html(&report(), "2026-12-01");
        assert!(!h.contains("<b>x</b>"));
        assert!(h.contains("&lt;b&gt;x&lt;/b&gt;"));
        assert!(!h.contains("<script"));
        assert!(!h.contains("src=\"http"));
        assert!(h.contains("<svg"));
        assert!(h.contains("seed 3"));
        assert!(h.contains("2026-12-01"));
    }

    #[test]
    fn markdown_escapes_table_characters() {
        let m = markdown(&report(), "2026-12-01");
        assert!(m.contains("y\\|z"));
        assert!(m.contains("### Methods"));
    }

    #[test]
    fn csv_quotes_what_needs_quoting() {
        let c = csv_table(&["a", "b"], &[vec!["x,y".into(), "plain".into()]]);
        assert_eq!(c, "a,b\n\"x,y\",plain\n");
        let v = values_csv(&[("null", &[1.5, 2.0]), ("boot", &[3.0])]);
        assert_eq!(v, "index,null,boot\n1,1.5,3.0\n2,2.0,\n");
    }

    #[test]
    fn dates() {
        assert_eq!(iso_date(0), "1970-01-01");
        assert_eq!(iso_date(1_796_083_200), "2026-12-01");
        assert_eq!(iso_date(951_782_400), "2000-02-29");
    }
}

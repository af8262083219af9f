//! Charts with one row per group or stratum on a shared axis: ranges, medians, means, and
//! differences with their intervals.

use super::plot::*;
use crate::base::format as fmt;

/// A point drawn in a row chart.
struct RowMark {
    x: f64,
    /// Dot radius; 0 draws a vertical tick instead.
    r: f64,
    fill: &'static str,
}

/// One labelled row of a row chart: an optional range line and marks.
struct Row {
    label: String,
    range: Option<(f64, f64)>,
    marks: Vec<RowMark>,
}

/// Rows of marks on a shared horizontal axis, with vertical reference lines (value, label,
/// dashed). Shared by the group summary and the stratum chart.
fn row_chart(
    id: &str,
    title: &str,
    desc: &str,
    rows: &[Row],
    refs: &[(f64, String, bool)],
    legend_items: &[(&str, &str)],
    xlabel: &str,
) -> String {
    const L: f64 = 150.0;
    const ROW: f64 = 30.0;
    let h = TOP + ROW * rows.len() as f64 + 50.0;
    let mut out = String::new();
    out.push_str(&format!(
        r#"<svg xmlns="http://www.w3.org/2000/svg" viewBox="0 0 {W} {h}" width="100%" role="img" aria-labelledby="{id}-title {id}-desc" font-family="system-ui, sans-serif"><title id="{id}-title">{}</title><desc id="{id}-desc">{}</desc><rect width="{W}" height="{h}" fill="white"/>"#,
        escape(title),
        escape(desc)
    ));
    let mut lo = f64::INFINITY;
    let mut hi = f64::NEG_INFINITY;
    for r in rows {
        if let Some((a, b)) = r.range {
            lo = lo.min(a);
            hi = hi.max(b);
        }
        for m in &r.marks {
            lo = lo.min(m.x);
            hi = hi.max(m.x);
        }
    }
    for (v, _, _) in refs {
        lo = lo.min(*v);
        hi = hi.max(*v);
    }
    if !lo.is_finite() || !hi.is_finite() {
        out.push_str("</svg>");
        return out;
    }
    let pad = if hi > lo { (hi - lo) * 0.06 } else { 1.0 };
    let (lo, hi) = (lo - pad, hi + pad);
    let px = |v: f64| L + (v - lo) / (hi - lo) * (W - L - RIGHT);
    let y_axis = TOP + ROW * rows.len() as f64;
    let ticks = nice_ticks(lo, hi, 6);
    let step = if ticks.len() > 1 {
        ticks[1] - ticks[0]
    } else {
        1.0
    };
    for t in ticks {
        let x = px(t);
        out.push_str(&format!(
            r#"<line x1="{x:.1}" x2="{x:.1}" y1="{TOP}" y2="{y_axis:.1}" stroke="{GRID}"/><text x="{x:.1}" y="{:.1}" font-size="11" fill="{INK}" text-anchor="middle">{}</text>"#,
            y_axis + 16.0,
            tick_label(t, step)
        ));
    }
    out.push_str(&format!(
        r#"<line x1="{L}" x2="{:.1}" y1="{y_axis:.1}" y2="{y_axis:.1}" stroke="{INK}"/><text x="{:.1}" y="{:.1}" font-size="12" fill="{INK}" text-anchor="middle">{}</text>"#,
        W - RIGHT,
        (L + W - RIGHT) / 2.0,
        y_axis + 36.0,
        escape(xlabel)
    ));
    legend(&mut out, legend_items);
    for (v, label, dashed) in refs {
        let x = px(*v);
        out.push_str(&format!(
            r#"<line x1="{x:.1}" x2="{x:.1}" y1="{:.1}" y2="{y_axis:.1}" stroke="{INK}" stroke-width="1.5"{}/><text x="{x:.1}" y="{:.1}" font-size="11" fill="{INK}" text-anchor="middle">{}</text>"#,
            TOP - 14.0,
            if *dashed { r#" stroke-dasharray="4 3""# } else { "" },
            TOP - 18.0,
            escape(label)
        ));
    }
    for (i, r) in rows.iter().enumerate() {
        let y = TOP + ROW * (i as f64 + 0.5);
        let label: String = if r.label.chars().count() > 22 {
            r.label
                .chars()
                .take(21)
                .chain(std::iter::once('…'))
                .collect()
        } else {
            r.label.clone()
        };
        out.push_str(&format!(
            r#"<text x="{:.1}" y="{:.1}" font-size="12" fill="{INK}" text-anchor="end">{}</text>"#,
            L - 8.0,
            y + 4.0,
            escape(&label)
        ));
        if let Some((a, b)) = r.range {
            out.push_str(&format!(
                r#"<line x1="{:.1}" x2="{:.1}" y1="{y:.1}" y2="{y:.1}" stroke="{OUTSIDE}" stroke-width="2"/>"#,
                px(a),
                px(b)
            ));
        }
        for m in &r.marks {
            let x = px(m.x);
            if m.r > 0.0 {
                out.push_str(&format!(
                    r#"<circle cx="{x:.1}" cy="{y:.1}" r="{:.1}" fill="{}" stroke="white" stroke-width="1"/>"#,
                    m.r, m.fill
                ));
            } else {
                out.push_str(&format!(
                    r#"<line x1="{x:.1}" x2="{x:.1}" y1="{:.1}" y2="{:.1}" stroke="{}" stroke-width="3"/>"#,
                    y - 9.0,
                    y + 9.0,
                    m.fill
                ));
            }
        }
    }
    out.push_str("</svg>");
    out
}

/// Each group's range, median and mean on one axis.
pub fn groups_svg(groups: &[crate::designs::GroupSummary], value: &str, id: &str) -> String {
    let rows: Vec<Row> = groups
        .iter()
        .map(|g| Row {
            label: format!("{} (n = {})", g.name, g.n),
            range: Some((g.min, g.max)),
            marks: vec![
                RowMark {
                    x: g.median,
                    r: 0.0,
                    fill: TAIL,
                },
                RowMark {
                    x: g.mean,
                    r: 5.0,
                    fill: BODY,
                },
            ],
        })
        .collect();
    row_chart(
        id,
        &format!("{value} by group"),
        &describe_groups(groups, value),
        &rows,
        &[],
        &[("mean", BODY), ("median", TAIL), ("range", OUTSIDE)],
        value,
    )
}

pub fn describe_groups(groups: &[crate::designs::GroupSummary], value: &str) -> String {
    let parts: Vec<String> = groups
        .iter()
        .map(|g| {
            format!(
                "{}: n = {}, mean {}, median {}, range {} to {}",
                g.name,
                g.n,
                fmt::sig(g.mean),
                fmt::sig(g.median),
                fmt::sig(g.min),
                fmt::sig(g.max)
            )
        })
        .collect();
    format!(
        "{value} in each group: the line spans the smallest to the largest value, the dot is \
         the mean and the bar the median. {}.",
        parts.join("; ")
    )
}

/// The difference in each stratum (dot area by weight), zero and the weighted average.
pub fn strata_svg(r: &crate::designs::stratified::StrataReport, id: &str) -> String {
    let wmax = r.strata.iter().map(|s| s.weight).fold(0.0, f64::max);
    let rows: Vec<Row> = r
        .strata
        .iter()
        .map(|s| Row {
            label: format!("{} ({} + {})", s.name, s.n1, s.n2),
            range: None,
            marks: vec![RowMark {
                x: s.difference,
                r: 3.0 + 5.0 * (s.weight / wmax.max(1e-12)).sqrt(),
                fill: BODY,
            }],
        })
        .collect();
    let [a, b] = &r.names;
    row_chart(
        id,
        &format!("Difference {a} − {b} in each stratum of {}", r.strata_label),
        &describe_strata(r),
        &rows,
        &[
            (0.0, "0".into(), true),
            (r.effect, format!("average {}", fmt::sig(r.effect)), false),
        ],
        &[("stratum difference (area: weight)", BODY)],
        &format!("{} − {} ({})", a, b, r.value_label),
    )
}

pub fn describe_strata(r: &crate::designs::stratified::StrataReport) -> String {
    let parts: Vec<String> = r
        .strata
        .iter()
        .map(|s| {
            format!(
                "{}: {} (weight {})",
                s.name,
                fmt::sig(s.difference),
                fmt::fixed(s.weight, 2)
            )
        })
        .collect();
    format!(
        "The difference in means between {} and {} within each stratum, as dots sized by the \
         stratum's weight, with a dashed line at zero and a solid line at the weighted average \
         ({}). {}.",
        r.names[0],
        r.names[1],
        fmt::sig(r.effect),
        parts.join("; ")
    )
}

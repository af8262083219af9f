//! SVG figures as text: the relabelling (null) distribution and the bootstrap distribution.
//! Plain Rust, so the page, a saved report and the tests all draw the same figure. Every
//! piece of text from the data (group and column names) is XML-escaped.

use crate::base::format as fmt;
use crate::base::{Histogram, Interval, Tail};

/// Bars of the part not counted toward p / outside the interval.
pub const BODY: &str = "#3f5f8f";
/// Bars counted toward p (also hatched, so colour is not the only cue).
pub const TAIL: &str = "#b3461f";
/// Lines and text.
pub const INK: &str = "#1f2328";
pub const GRID: &str = "#d0d4da";
/// Bars outside the bootstrap interval (3.6:1 against white).
pub const OUTSIDE: &str = "#7b8494";

pub(super) const W: f64 = 640.0;
pub(super) const H: f64 = 300.0;
pub(super) const LEFT: f64 = 64.0;
pub(super) const RIGHT: f64 = 20.0;
pub(super) const TOP: f64 = 50.0;
pub(super) const BOTTOM: f64 = 58.0;

/// A figure: a short name (for file names), the SVG and its text alternative.
#[derive(Clone, Debug, PartialEq)]
pub struct Figure {
    /// Short name, e.g. "relabelling".
    pub name: &'static str,
    /// The SVG, every text in it escaped.
    pub svg: String,
    /// What the figure shows, in words.
    pub caption: String,
}

/// Width and height of a figure from its viewBox (640 × 300 if it has none).
pub fn svg_size(svg: &str) -> (u32, u32) {
    let parse = || -> Option<(u32, u32)> {
        let start = svg.find("viewBox=\"")? + 9;
        let end = start + svg[start..].find('"')?;
        let v: Vec<f64> = svg[start..end]
            .split_whitespace()
            .filter_map(|x| x.parse().ok())
            .collect();
        (v.len() == 4).then(|| (v[2].round() as u32, v[3].round() as u32))
    };
    parse().unwrap_or((640, 300))
}

/// Escapes text for XML content and attribute values.
pub fn escape(s: &str) -> String {
    let mut out = String::with_capacity(s.len());
    for c in s.chars() {
        match c {
            '&' => out.push_str("&amp;"),
            '<' => out.push_str("&lt;"),
            '>' => out.push_str("&gt;"),
            '"' => out.push_str("&quot;"),
            '\'' => out.push_str("&#39;"),
            c if (c as u32) < 0x20 && c != '\n' && c != '\t' => {}
            c => out.push(c),
        }
    }
    out
}

/// Round tick positions covering [lo, hi] with about `target` steps of 1, 2 or 5 × 10^k.
pub fn nice_ticks(lo: f64, hi: f64, target: usize) -> Vec<f64> {
    if hi <= lo || !lo.is_finite() || !hi.is_finite() {
        return vec![lo];
    }
    let raw = (hi - lo) / target.max(1) as f64;
    let mag = libm::pow(10.0, libm::log10(raw).floor());
    let step = [1.0, 2.0, 5.0, 10.0]
        .iter()
        .map(|m| m * mag)
        .find(|s| *s >= raw)
        .unwrap_or(10.0 * mag);
    let start = (lo / step).ceil() as i64;
    let end = (hi / step).floor() as i64;
    (start..=end).map(|i| i as f64 * step).collect()
}

pub(super) fn tick_label(v: f64, step: f64) -> String {
    let dec = if step >= 1.0 {
        0
    } else {
        (-libm::log10(step).floor()) as usize
    };
    fmt::fixed(v, dec)
}

struct Frame {
    lo: f64,
    hi: f64,
    ymax: f64,
    /// Heights are probabilities (tick labels with decimals), not counts.
    probability: bool,
}

impl Frame {
    fn x(&self, v: f64) -> f64 {
        LEFT + (v - self.lo) / (self.hi - self.lo) * (W - LEFT - RIGHT)
    }
    fn y(&self, c: f64) -> f64 {
        H - BOTTOM - c / self.ymax * (H - TOP - BOTTOM)
    }
}

/// A vertical marker line with a label above the plot area.
fn marker(out: &mut String, f: &Frame, v: f64, label: &str, dashed: bool, anchor_right: bool) {
    if !v.is_finite() {
        return;
    }
    let x = f.x(v.clamp(f.lo, f.hi));
    out.push_str(&format!(
        r#"<line x1="{x:.1}" x2="{x:.1}" y1="{:.1}" y2="{:.1}" stroke="{INK}" stroke-width="2"{}/>"#,
        TOP - 6.0,
        H - BOTTOM,
        if dashed { r#" stroke-dasharray="5 3""# } else { "" }
    ));
    out.push_str(&format!(
        r#"<text x="{:.1}" y="{:.1}" font-size="12" fill="{INK}" text-anchor="{}">{}</text>"#,
        if anchor_right { x - 4.0 } else { x + 4.0 },
        TOP - 10.0,
        if anchor_right { "end" } else { "start" },
        escape(label)
    ));
}

fn axes(out: &mut String, f: &Frame, xlabel: &str, ylabel: &str) {
    let (x0, x1, y0) = (LEFT, W - RIGHT, H - BOTTOM);
    // y grid and labels
    let yticks = nice_ticks(0.0, f.ymax, 4);
    let ystep = if yticks.len() > 1 {
        yticks[1] - yticks[0]
    } else {
        1.0
    };
    for t in yticks {
        let y = f.y(t);
        let label = if f.probability {
            tick_label(t, ystep)
        } else {
            fmt::count(t.round() as u64)
        };
        out.push_str(&format!(
            r#"<line x1="{x0}" x2="{x1}" y1="{y:.1}" y2="{y:.1}" stroke="{GRID}" stroke-width="1"/><text x="{:.1}" y="{:.1}" font-size="11" fill="{INK}" text-anchor="end">{}</text>"#,
            x0 - 6.0,
            y + 4.0,
            label
        ));
    }
    out.push_str(&format!(
        r#"<line x1="{x0}" x2="{x1}" y1="{y0}" y2="{y0}" stroke="{INK}" stroke-width="1"/>"#
    ));
    let ticks = nice_ticks(f.lo, f.hi, 6);
    let step = if ticks.len() > 1 {
        ticks[1] - ticks[0]
    } else {
        1.0
    };
    for t in ticks {
        let x = f.x(t);
        out.push_str(&format!(
            r#"<line x1="{x:.1}" x2="{x:.1}" y1="{y0}" y2="{:.1}" stroke="{INK}"/><text x="{x:.1}" y="{:.1}" font-size="11" fill="{INK}" text-anchor="middle">{}</text>"#,
            y0 + 5.0,
            y0 + 18.0,
            tick_label(t, step)
        ));
    }
    out.push_str(&format!(
        r#"<text x="{:.1}" y="{:.1}" font-size="12" fill="{INK}" text-anchor="middle">{}</text>"#,
        (x0 + x1) / 2.0,
        H - 14.0,
        escape(xlabel)
    ));
    out.push_str(&format!(
        r#"<text transform="translate(14 {:.1}) rotate(-90)" font-size="12" fill="{INK}" text-anchor="middle">{}</text>"#,
        (TOP + y0) / 2.0,
        escape(ylabel)
    ));
}

pub(super) fn open(out: &mut String, id: &str, title: &str, desc: &str) {
    out.push_str(&format!(
        r#"<svg xmlns="http://www.w3.org/2000/svg" viewBox="0 0 {W} {H}" width="100%" role="img" aria-labelledby="{id}-title {id}-desc" font-family="system-ui, sans-serif"><title id="{id}-title">{}</title><desc id="{id}-desc">{}</desc><defs><pattern id="{id}-hatch" patternUnits="userSpaceOnUse" width="6" height="6" patternTransform="rotate(45)"><rect width="6" height="6" fill="{TAIL}"/><line x1="0" y1="0" x2="0" y2="6" stroke="white" stroke-width="1.5" stroke-opacity="0.55"/></pattern></defs><rect width="{W}" height="{H}" fill="white"/>"#,
        escape(title),
        escape(desc)
    ));
}

fn bars(
    out: &mut String,
    f: &Frame,
    h: &Histogram,
    fills: (&str, &str),
    highlighted: &dyn Fn(f64) -> bool,
) {
    for (i, c) in h.heights().into_iter().enumerate() {
        if c <= 0.0 {
            continue;
        }
        let (a, b) = (h.edges[i], h.edges[i + 1]);
        let mid = 0.5 * (a + b);
        let (x0, x1) = (f.x(a), f.x(b));
        let y = f.y(c);
        let fill = if highlighted(mid) { fills.0 } else { fills.1 };
        out.push_str(&format!(
            r#"<rect x="{:.2}" y="{y:.2}" width="{:.2}" height="{:.2}" fill="{fill}"/>"#,
            x0 + 0.5,
            (x1 - x0 - 1.0).max(0.5),
            (H - BOTTOM - y).max(0.0)
        ));
    }
}

pub(super) fn legend(out: &mut String, items: &[(&str, &str)]) {
    let mut x = LEFT;
    let y = 6.0;
    for (label, fill) in items {
        out.push_str(&format!(
            r#"<rect x="{x:.1}" y="{y}" width="12" height="12" fill="{fill}"/><text x="{:.1}" y="{:.1}" font-size="12" fill="{INK}">{}</text>"#,
            x + 16.0,
            y + 10.5,
            escape(label)
        ));
        x += 28.0 + 6.6 * label.chars().count() as f64;
    }
}

fn frame(h: &Histogram) -> Option<Frame> {
    if h.counts.is_empty() {
        return None;
    }
    let probability = h.weights.is_some();
    let top = h.heights().into_iter().fold(0.0f64, f64::max);
    let top = if probability {
        if top > 0.0 {
            top
        } else {
            1.0
        }
    } else {
        top.max(1.0)
    };
    Some(Frame {
        lo: h.edges[0],
        hi: h.edges[h.edges.len() - 1],
        ymax: top * 1.08,
        probability,
    })
}

/// The figure of a run's statistics so far (a progress sketch): bars of the resampled values
/// drawn, the observed value or estimate marked; `what` names the resamples
/// ("relabellings", "bootstrap resamples"). Returns the SVG and its text alternative.
pub fn sketch_svg(sk: &crate::base::Sketch, what: &str, id: &str) -> (String, String) {
    let bins = sk.counts.len().max(1);
    let width = (sk.high - sk.low) / bins as f64;
    let h = Histogram {
        edges: (0..=bins).map(|i| sk.low + width * i as f64).collect(),
        counts: sk.counts.clone(),
        weights: None,
    };
    let drawn: u64 = sk.counts.iter().sum();
    let desc = format!(
        "The statistics of the {} {what} drawn so far, in {bins} bars from {} to {}{}; the \
         figure fills in while the run goes.",
        fmt::count(drawn),
        fmt::sig(sk.low),
        fmt::sig(sk.high),
        sk.mark
            .map(|m| format!(", the observed value {} marked", fmt::sig(m)))
            .unwrap_or_default()
    );
    let mut out = String::new();
    open(&mut out, id, &format!("The {what} so far"), &desc);
    if let Some(f) = frame(&h) {
        axes(&mut out, &f, "statistic", what);
        bars(&mut out, &f, &h, (BODY, BODY), &|_| false);
        if let Some(m) = sk.mark {
            marker(&mut out, &f, m, "observed", false, m > 0.5 * (f.lo + f.hi));
        }
    }
    out.push_str("</svg>");
    (out, desc)
}

/// What a null-distribution figure shows.
pub struct NullFigure<'a> {
    /// The statistic, e.g. "difference in means".
    pub label: &'a str,
    /// What one resample is called, e.g. "relabellings" or "sign patterns".
    pub unit: &'a str,
    /// How the null is made, e.g. "when group labels are shuffled".
    pub how: &'a str,
    pub observed: f64,
    pub exact: bool,
    pub resamples: u64,
    pub extreme: u64,
    pub p_value: f64,
    pub tail: &'a Tail,
    pub histogram: &'a Histogram,
}

impl<'a> NullFigure<'a> {
    /// The figure of a test's null distribution: `label` names the statistic, `unit` a
    /// relabelling, `how` says how the null is made.
    pub fn of(
        t: &'a crate::designs::TestOutcome,
        label: &'a str,
        unit: &'a str,
        how: &'a str,
    ) -> NullFigure<'a> {
        NullFigure {
            label,
            unit,
            how,
            observed: t.observed,
            exact: t.exact,
            resamples: t.resamples,
            extreme: t.extreme_count,
            p_value: t.p_value,
            tail: &t.tail,
            histogram: &t.null_histogram,
        }
    }
}

/// The null and bootstrap figures every test design shows, with ids from `prefix`; `name`
/// names the null figure's download ("relabelling", "sign-flips", "pairings").
pub fn test_figures(
    nf: &NullFigure,
    bf: &BootFigure,
    prefix: &str,
    name: &'static str,
) -> Vec<Figure> {
    vec![
        Figure {
            name,
            svg: null_figure_svg(nf, &format!("{prefix}-null")),
            caption: describe_null(nf),
        },
        Figure {
            name: "bootstrap",
            svg: bootstrap_figure_svg(bf, &format!("{prefix}-boot")),
            caption: describe_bootstrap(bf),
        },
    ]
}

pub fn describe_null(n: &NullFigure) -> String {
    let head = if n.histogram.weights.is_some() {
        format!(
            "Bar chart of the probability of each {} over all {} possible {}",
            n.label,
            fmt::count(n.resamples),
            n.unit
        )
    } else if n.exact {
        format!(
            "Histogram of the {} over all {} possible {}",
            n.label,
            fmt::count(n.resamples),
            n.unit
        )
    } else {
        format!(
            "Histogram of the {} over {} random {}",
            n.label,
            fmt::count(n.resamples),
            n.unit
        )
    };
    format!(
        "{head}. The observed value, {}, is marked with a dashed line; the hatched bars are the \
         {} counted toward the p-value ({} of {}, {}).",
        fmt::sig(n.observed),
        n.unit,
        fmt::count(n.extreme),
        fmt::count(n.resamples),
        fmt::p_value(n.p_value)
    )
}

/// The null distribution with the observed value and the tail counted toward p.
pub fn null_figure_svg(n: &NullFigure, id: &str) -> String {
    let mut out = String::new();
    let title = format!("The {} {}", n.label, n.how);
    open(&mut out, id, &title, &describe_null(n));
    if let Some(f) = frame(n.histogram) {
        let hatch = format!("url(#{id}-hatch)");
        let other = format!("other {}", n.unit);
        legend(&mut out, &[("counted toward p", &hatch), (&other, BODY)]);
        let (lo, hi) = (n.tail.low, n.tail.high);
        let hl = move |m: f64| lo.is_some_and(|l| m <= l) || hi.is_some_and(|h| m >= h);
        bars(&mut out, &f, n.histogram, (&hatch, BODY), &hl);
        axes(
            &mut out,
            &f,
            &format!("{} over {}", n.label, n.unit),
            if f.probability { "probability" } else { n.unit },
        );
        // Counts (the yes answers of an exact table distribution) are whole numbers.
        let shown = if n.histogram.weights.is_some() {
            fmt::fixed(n.observed, 0)
        } else {
            fmt::sig(n.observed)
        };
        marker(
            &mut out,
            &f,
            n.observed,
            &format!("observed {shown}"),
            true,
            n.observed > 0.5 * (f.lo + f.hi),
        );
    }
    out.push_str("</svg>");
    out
}

/// What a bootstrap figure shows.
pub struct BootFigure<'a> {
    pub label: &'a str,
    pub estimate: f64,
    pub interval: &'a Interval,
    pub histogram: &'a Histogram,
    pub resamples: u64,
}

pub fn describe_bootstrap(b: &BootFigure) -> String {
    let iv = b.interval;
    let range = match (iv.low, iv.high) {
        (Some(l), Some(h)) => Some(format!("runs from {} to {}", fmt::sig(l), fmt::sig(h))),
        (Some(l), None) => Some(format!("is the lower bound {}", fmt::sig(l))),
        (None, Some(h)) => Some(format!("is the upper bound {}", fmt::sig(h))),
        _ => None,
    };
    match range {
        Some(r) => format!(
            "Histogram of the {} over {} bootstrap resamples. The estimate, {}, is marked with a \
             solid line; the {} interval {r} (dark bars, dashed lines).",
            b.label,
            fmt::count(b.resamples),
            fmt::sig(b.estimate),
            fmt::percent(iv.level),
        ),
        None => format!(
            "Histogram of the {} over {} bootstrap resamples; no interval could be formed.",
            b.label,
            fmt::count(b.resamples)
        ),
    }
}

/// A bootstrap distribution with the estimate and an interval (or one-sided bound) marked.
pub fn bootstrap_figure_svg(b: &BootFigure, id: &str) -> String {
    let mut out = String::new();
    let title = format!("Bootstrap distribution of the {}", b.label);
    open(&mut out, id, &title, &describe_bootstrap(b));
    if let Some(f) = frame(b.histogram) {
        let inside_label = format!("inside the {} interval", fmt::percent(b.interval.level));
        legend(&mut out, &[(&inside_label, BODY), ("outside", OUTSIDE)]);
        let (lo, hi) = (b.interval.low, b.interval.high);
        let any = lo.is_some() || hi.is_some();
        let inside = move |m: f64| any && lo.is_none_or(|l| m >= l) && hi.is_none_or(|h| m <= h);
        bars(&mut out, &f, b.histogram, (BODY, OUTSIDE), &inside);
        axes(
            &mut out,
            &f,
            &format!("{} in bootstrap resamples", b.label),
            "resamples",
        );
        if let Some(l) = lo {
            marker(&mut out, &f, l, &format!("{} low", fmt::sig(l)), true, true);
        }
        if let Some(h) = hi {
            marker(
                &mut out,
                &f,
                h,
                &format!("{} high", fmt::sig(h)),
                true,
                false,
            );
        }
        let x = f.x(b.estimate.clamp(f.lo, f.hi));
        out.push_str(&format!(
            r#"<line x1="{x:.1}" x2="{x:.1}" y1="{TOP}" y2="{:.1}" stroke="{INK}" stroke-width="2.5"/>"#,
            H - BOTTOM
        ));
    }
    out.push_str("</svg>");
    out
}

/// A scatter plot with the least-squares line.
pub fn scatter_svg(
    points: &[(f64, f64)],
    slope: f64,
    intercept: f64,
    xlabel: &str,
    ylabel: &str,
    id: &str,
) -> String {
    let mut out = String::new();
    let desc = format!(
        "Scatter plot of {} (vertical) against {} (horizontal), {} points, with the least-squares line y = {} + {} x.",
        ylabel,
        xlabel,
        fmt::count(points.len() as u64),
        fmt::sig(intercept),
        fmt::sig(slope)
    );
    open(&mut out, id, &format!("{ylabel} against {xlabel}"), &desc);
    let (xs, ys): (Vec<f64>, Vec<f64>) = points.iter().copied().unzip();
    let range = |v: &[f64]| {
        let (lo, hi) = v
            .iter()
            .fold((f64::INFINITY, f64::NEG_INFINITY), |(l, h), x| {
                (l.min(*x), h.max(*x))
            });
        let pad = if hi > lo { (hi - lo) * 0.05 } else { 1.0 };
        (lo - pad, hi + pad)
    };
    let ((x0, x1), (y0, y1)) = (range(&xs), range(&ys));
    if points.is_empty() || !x0.is_finite() {
        out.push_str("</svg>");
        return out;
    }
    let px = |x: f64| LEFT + (x - x0) / (x1 - x0) * (W - LEFT - RIGHT);
    let py = |y: f64| H - BOTTOM - (y - y0) / (y1 - y0) * (H - TOP - BOTTOM);
    let step_of = |t: &[f64]| if t.len() > 1 { t[1] - t[0] } else { 1.0 };
    let yt = nice_ticks(y0, y1, 4);
    let ys_step = step_of(&yt);
    for t in yt {
        let y = py(t);
        out.push_str(&format!(
            r#"<line x1="{LEFT}" x2="{:.1}" y1="{y:.1}" y2="{y:.1}" stroke="{GRID}"/><text x="{:.1}" y="{:.1}" font-size="11" fill="{INK}" text-anchor="end">{}</text>"#,
            W - RIGHT,
            LEFT - 6.0,
            y + 4.0,
            tick_label(t, ys_step)
        ));
    }
    let xt = nice_ticks(x0, x1, 6);
    let xs_step = step_of(&xt);
    for t in xt {
        let x = px(t);
        out.push_str(&format!(
            r#"<line x1="{x:.1}" x2="{x:.1}" y1="{:.1}" y2="{:.1}" stroke="{INK}"/><text x="{x:.1}" y="{:.1}" font-size="11" fill="{INK}" text-anchor="middle">{}</text>"#,
            H - BOTTOM,
            H - BOTTOM + 5.0,
            H - BOTTOM + 18.0,
            tick_label(t, xs_step)
        ));
    }
    out.push_str(&format!(
        r#"<line x1="{LEFT}" x2="{:.1}" y1="{:.1}" y2="{:.1}" stroke="{INK}"/>"#,
        W - RIGHT,
        H - BOTTOM,
        H - BOTTOM
    ));
    for &(x, y) in points {
        out.push_str(&format!(
            r#"<circle cx="{:.1}" cy="{:.1}" r="3.5" fill="{BODY}" stroke="white" stroke-width="0.8"/>"#,
            px(x),
            py(y)
        ));
    }
    let (la, lb) = (intercept + slope * x0, intercept + slope * x1);
    out.push_str(&format!(
        r#"<line x1="{:.1}" y1="{:.1}" x2="{:.1}" y2="{:.1}" stroke="{TAIL}" stroke-width="2"/>"#,
        px(x0),
        py(la).clamp(TOP, H - BOTTOM),
        px(x1),
        py(lb).clamp(TOP, H - BOTTOM)
    ));
    out.push_str(&format!(
        r#"<text x="{:.1}" y="{:.1}" font-size="12" fill="{INK}" text-anchor="middle">{}</text><text transform="translate(14 {:.1}) rotate(-90)" font-size="12" fill="{INK}" text-anchor="middle">{}</text>"#,
        (LEFT + W - RIGHT) / 2.0,
        H - 14.0,
        escape(xlabel),
        (TOP + H - BOTTOM) / 2.0,
        escape(ylabel)
    ));
    out.push_str("</svg>");
    out
}

/// A power curve: the estimated power at each sample size with its 95% simulation interval,
/// the target as a dashed line and the required size marked.
pub fn power_svg(r: &crate::designs::plan::PlanReport, id: &str) -> String {
    let mut out = String::new();
    let desc = describe_power(r);
    open(
        &mut out,
        id,
        &format!("Estimated power by sample size ({})", r.design.key()),
        &desc,
    );
    if r.curve.is_empty() {
        out.push_str("</svg>");
        return out;
    }
    let xs: Vec<f64> = r.curve.iter().map(|p| p.n as f64).collect();
    let (lo, hi) = xs
        .iter()
        .fold((f64::INFINITY, f64::NEG_INFINITY), |(l, h), x| {
            (l.min(*x), h.max(*x))
        });
    let pad = if hi > lo { (hi - lo) * 0.05 } else { 1.0 };
    let f = Frame {
        lo: (lo - pad).max(0.0),
        hi: hi + pad,
        ymax: 1.0,
        probability: true,
    };
    legend(
        &mut out,
        &[
            ("estimated power (bar: 95% interval)", BODY),
            ("target", INK),
        ],
    );
    axes(&mut out, &f, "sample size (per group, or pairs)", "power");
    let yt = f.y(r.target_power);
    out.push_str(&format!(
        r#"<line x1="{LEFT}" x2="{:.1}" y1="{yt:.1}" y2="{yt:.1}" stroke="{INK}" stroke-width="1.5" stroke-dasharray="5 3"/><text x="{:.1}" y="{:.1}" font-size="11" fill="{INK}" text-anchor="end">target {}</text>"#,
        W - RIGHT,
        W - RIGHT,
        yt - 4.0,
        fmt::percent(r.target_power)
    ));
    let mut pts: Vec<(f64, f64)> = Vec::new();
    for p in &r.curve {
        let x = f.x(p.n as f64);
        out.push_str(&format!(
            r#"<line x1="{x:.1}" x2="{x:.1}" y1="{:.1}" y2="{:.1}" stroke="{OUTSIDE}" stroke-width="2"/>"#,
            f.y(p.low),
            f.y(p.high)
        ));
        pts.push((x, f.y(p.power)));
    }
    let path: Vec<String> = pts.iter().map(|(x, y)| format!("{x:.1},{y:.1}")).collect();
    out.push_str(&format!(
        r#"<polyline points="{}" fill="none" stroke="{BODY}" stroke-width="1.5"/>"#,
        path.join(" ")
    ));
    for (x, y) in &pts {
        out.push_str(&format!(
            r#"<circle cx="{x:.1}" cy="{y:.1}" r="4" fill="{BODY}" stroke="white" stroke-width="1"/>"#
        ));
    }
    if let Some(req) = &r.required {
        marker(
            &mut out,
            &f,
            req.n as f64,
            &format!("reached at n = {}", req.n),
            true,
            req.n as f64 > 0.5 * (f.lo + f.hi),
        );
    }
    out.push_str("</svg>");
    out
}

pub fn describe_power(r: &crate::designs::plan::PlanReport) -> String {
    let pts: Vec<String> = r
        .curve
        .iter()
        .map(|p| format!("n = {}: {}", p.n, fmt::fixed(p.power, 2)))
        .collect();
    format!(
        "Estimated power (vertical, 0 to 1) against the sample size (horizontal), each point \
         from up to {} simulated studies with its 95% interval as a bar; the dashed line is the \
         target power {}{}. {}.",
        fmt::count(r.studies),
        fmt::percent(r.target_power),
        r.required
            .as_ref()
            .map_or(String::new(), |p| format!(", first reached at n = {}", p.n)),
        pts.join("; ")
    )
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn ticks_are_round() {
        assert_eq!(
            nice_ticks(0.0, 10.0, 5),
            vec![0.0, 2.0, 4.0, 6.0, 8.0, 10.0]
        );
        let t = nice_ticks(-0.93, 0.87, 6);
        assert!(t.contains(&0.0) || t.iter().any(|v| v.abs() < 1e-12));
    }

    #[test]
    fn scatter_labels_are_escaped_and_points_drawn() {
        let svg = scatter_svg(
            &[(1.0, 2.0), (2.0, 3.5), (3.0, 3.9)],
            0.95,
            1.2,
            "<x>",
            "y&z",
            "s",
        );
        assert!(svg.contains("&lt;x&gt;") && svg.contains("y&amp;z"));
        assert_eq!(svg.matches("<circle").count(), 3);
    }

    #[test]
    fn hostile_text_is_escaped() {
        assert_eq!(escape("<script>&\"'"), "&lt;script&gt;&amp;&quot;&#39;");
    }
}

//! The findings of a design as one document (finding, notes, result lines, tables, methods,
//! cautions) rendered three ways from the same source: plain text, Markdown and a
//! self-contained HTML page. The k-groups, stratified and yes/no designs are written this
//! way; the page shows the same document. All text from the data is escaped in Markdown and
//! HTML.

use crate::base::format as fmt;
use crate::base::*;
use crate::designs::k_groups::{KGroupsReport, KStatistic};
use crate::designs::stratified::{self, StrataReport};
use crate::designs::yes_no::{self, YesNoReport};
use crate::render::plot::{self, escape};
use crate::render::report::{self, interval_line};
use crate::render::words;
use crate::wire::AnyReport;

/// A table of a document.
#[derive(Clone, Debug, PartialEq)]
pub struct DocTable {
    pub id: &'static str,
    pub caption: String,
    pub header: Vec<String>,
    pub rows: Vec<Vec<String>>,
}

/// A figure: a short name (for file names), the SVG and its text alternative.
#[derive(Clone, Debug, PartialEq)]
pub struct Figure {
    pub name: &'static str,
    pub svg: String,
    pub caption: String,
}

#[derive(Clone, Debug, PartialEq)]
pub struct Doc {
    pub finding: String,
    pub notes: Vec<String>,
    /// "label: value" lines of results.
    pub lines: Vec<(String, String)>,
    pub tables: Vec<DocTable>,
    /// Further headed lists (e.g. what a simulation traded for speed).
    pub sections: Vec<(String, Vec<String>)>,
    pub methods: String,
    pub cautions: Vec<String>,
}

use crate::render::report::md_escape;

/// The null and bootstrap figures every test design shows, with ids from `prefix`.
fn test_figures(nf: &plot::NullFigure, bf: &plot::BootFigure, prefix: &str) -> [Figure; 2] {
    [
        Figure {
            name: "relabelling",
            svg: plot::null_figure_svg(nf, &format!("{prefix}-null")),
            caption: plot::describe_null(nf),
        },
        Figure {
            name: "bootstrap",
            svg: plot::bootstrap_figure_svg(bf, &format!("{prefix}-boot")),
            caption: plot::describe_bootstrap(bf),
        },
    ]
}

impl Doc {
    pub fn text(&self) -> String {
        let mut s = format!("{}\n\n", self.finding);
        for n in &self.notes {
            s.push_str(&format!("Note: {n}\n"));
        }
        if !self.notes.is_empty() {
            s.push('\n');
        }
        for (k, v) in &self.lines {
            s.push_str(&format!("{k}: {v}\n"));
        }
        for t in &self.tables {
            s.push_str(&format!("\n{}\n", t.caption));
            let cols = t.header.len();
            let width: Vec<usize> = (0..cols)
                .map(|c| {
                    std::iter::once(&t.header[c])
                        .chain(t.rows.iter().map(|r| &r[c]))
                        .map(|x| x.chars().count())
                        .max()
                        .unwrap_or(0)
                })
                .collect();
            let line = |cells: &[String]| {
                cells
                    .iter()
                    .zip(&width)
                    .enumerate()
                    .map(|(i, (c, w))| {
                        let pad = w - c.chars().count();
                        if i == 0 {
                            format!("{c}{}", " ".repeat(pad))
                        } else {
                            format!("{}{c}", " ".repeat(pad))
                        }
                    })
                    .collect::<Vec<_>>()
                    .join("  ")
            };
            s.push_str(&format!("{}\n", line(&t.header)));
            for r in &t.rows {
                s.push_str(&format!("{}\n", line(r)));
            }
        }
        for (head, items) in &self.sections {
            s.push_str(&format!("\n{head}\n"));
            for i in items {
                s.push_str(&format!("- {i}\n"));
            }
        }
        s.push_str(&format!("\nMethods: {}\n\n", self.methods));
        for c in &self.cautions {
            s.push_str(&format!("- {c}\n"));
        }
        s
    }

    pub fn markdown(&self) -> String {
        let mut s = format!("## Findings\n\n{}\n\n", md_escape(&self.finding));
        for n in &self.notes {
            s.push_str(&format!("- Note: {}\n", md_escape(n)));
        }
        if !self.notes.is_empty() {
            s.push('\n');
        }
        s.push_str("| result | value |\n| --- | --- |\n");
        for (k, v) in &self.lines {
            s.push_str(&format!("| {} | {} |\n", md_escape(k), md_escape(v)));
        }
        for t in &self.tables {
            s.push_str(&format!("\n{}\n\n", md_escape(&t.caption)));
            s.push_str(&format!(
                "| {} |\n|{}\n",
                t.header
                    .iter()
                    .map(|h| md_escape(h))
                    .collect::<Vec<_>>()
                    .join(" | "),
                " --- |".repeat(t.header.len())
            ));
            for r in &t.rows {
                s.push_str(&format!(
                    "| {} |\n",
                    r.iter()
                        .map(|c| md_escape(c))
                        .collect::<Vec<_>>()
                        .join(" | ")
                ));
            }
        }
        for (head, items) in &self.sections {
            s.push_str(&format!("\n### {}\n\n", md_escape(head)));
            for i in items {
                s.push_str(&format!("- {}\n", md_escape(i)));
            }
        }
        s.push_str(&format!(
            "\n### Methods\n\n{}\n\n### Cautions\n\n",
            md_escape(&self.methods)
        ));
        for c in &self.cautions {
            s.push_str(&format!("- {}\n", md_escape(c)));
        }
        s
    }

    pub fn html(&self, figures: &[Figure]) -> String {
        let mut b = format!(
            "<h1>Reshuffle findings</h1><p class=\"headline\">{}</p>",
            escape(&self.finding)
        );
        if !self.notes.is_empty() {
            b.push_str("<ul>");
            for n in &self.notes {
                b.push_str(&format!("<li>{}</li>", escape(n)));
            }
            b.push_str("</ul>");
        }
        b.push_str("<table><tbody>");
        for (k, v) in &self.lines {
            b.push_str(&format!(
                "<tr><th scope=\"row\">{}</th><td>{}</td></tr>",
                escape(k),
                escape(v)
            ));
        }
        b.push_str("</tbody></table>");
        for t in &self.tables {
            b.push_str(&format!(
                "<table><caption>{}</caption><thead><tr>",
                escape(&t.caption)
            ));
            for h in &t.header {
                b.push_str(&format!("<th scope=\"col\">{}</th>", escape(h)));
            }
            b.push_str("</tr></thead><tbody>");
            for r in &t.rows {
                b.push_str("<tr>");
                for (i, c) in r.iter().enumerate() {
                    if i == 0 {
                        b.push_str(&format!("<th scope=\"row\">{}</th>", escape(c)));
                    } else {
                        b.push_str(&format!("<td>{}</td>", escape(c)));
                    }
                }
                b.push_str("</tr>");
            }
            b.push_str("</tbody></table>");
        }
        for f in figures {
            b.push_str(&format!(
                "<figure>{}<figcaption>{}</figcaption></figure>",
                f.svg,
                escape(&f.caption)
            ));
        }
        for (head, items) in &self.sections {
            b.push_str(&format!("<h2>{}</h2><ul>", escape(head)));
            for i in items {
                b.push_str(&format!("<li>{}</li>", escape(i)));
            }
            b.push_str("</ul>");
        }
        b.push_str(&format!(
            "<h2>Methods</h2><p>{}</p><div class=\"cautions\"><h2>Cautions</h2><ul>",
            escape(&self.methods)
        ));
        for c in &self.cautions {
            b.push_str(&format!("<li>{}</li>", escape(c)));
        }
        b.push_str("</ul></div>");
        report::html_page("Reshuffle findings", &b)
    }
}

/// Degrees of freedom: whole numbers as such, others with one decimal.
fn df(v: f64) -> String {
    if (v - v.round()).abs() < 1e-9 {
        format!("{}", v.round() as i64)
    } else {
        fmt::fixed(v, 1)
    }
}

fn opt_p(p: Option<f64>) -> String {
    p.map_or("undefined".into(), fmt::p_value)
}

fn interval_method(iv: &Interval) -> String {
    words::method(iv.method).to_string()
}

fn cell_interval(iv: &Interval, d: usize) -> String {
    match (iv.low, iv.high) {
        (Some(l), Some(h)) => format!("[{}, {}]", fmt::fixed(l, d), fmt::fixed(h, d)),
        _ => "—".into(),
    }
}

fn alternative_words(alt: Alternative, rule: TwoSidedRule, first_minus_second: &str) -> String {
    match (alt, rule) {
        (Alternative::TwoSided, TwoSidedRule::Absolute) => {
            "two-sided, counting relabellings at least as far from no difference as the \
             observed one"
                .into()
        }
        (Alternative::TwoSided, TwoSidedRule::DoubledTail) => {
            "two-sided, as twice the smaller one-sided p-value".into()
        }
        (Alternative::Greater, _) => format!("one-sided: {first_minus_second} greater"),
        (Alternative::Less, _) => format!("one-sided: {first_minus_second} smaller"),
    }
}

// ----- k groups -------------------------------------------------------------------------

pub fn kgroups_doc(r: &KGroupsReport, date: &str) -> Doc {
    let n: usize = r.groups.iter().map(|g| g.n).sum();
    let spread = r
        .groups
        .iter()
        .map(|g| g.sd)
        .filter(|v| *v > 0.0)
        .fold(f64::INFINITY, f64::min);
    let d = fmt::decimals_for(if spread.is_finite() { spread } else { 1.0 });
    let level = fmt::percent(r.ci.level);
    let f_line = |t: &crate::classical::FTest| match (t.f, t.p_value) {
        (Some(f), Some(p)) => format!(
            "F({}, {}) = {}, {}",
            df(t.df1),
            df(t.df2),
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
            format!("Omnibus test ({})", r.statistic_label),
            format!(
                "{} = {}, {}",
                match r.statistic {
                    KStatistic::F => "F",
                    KStatistic::WelchF => "Welch F",
                    KStatistic::MedianSpread => "spread",
                },
                fmt::sig(r.test.observed),
                r.test.p_line("relabellings")
            ),
        ),
        (
            format!("Eta squared with {level} CI"),
            format!("{} ({})", fmt::fixed(r.effect, 3), interval_line(&r.ci, 3)),
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
                    df(r.kruskal_wallis.df),
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
    let groups = DocTable {
        id: "k-groups-table",
        caption: "Groups".into(),
        header: ["group", "n", "mean", "median", "SD"]
            .map(String::from)
            .to_vec(),
        rows: r
            .groups
            .iter()
            .map(|g| {
                vec![
                    g.name.clone(),
                    g.n.to_string(),
                    fmt::fixed(g.mean, d + 1),
                    fmt::fixed(g.median, d + 1),
                    fmt::fixed(g.sd, d + 1),
                ]
            })
            .collect(),
    };
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
            r.pairwise_label,
            level,
            r.pairwise
                .first()
                .map_or("".into(), |c| interval_method(&c.ci)),
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
                    cell_interval(&c.ci, pd),
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
         as extreme (relative tolerance 1e-9). Effect: eta squared with a {level} {} bootstrap \
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
        r.statistic_label,
        r.test.how("relabellings"),
        interval_method(&r.ci),
        fmt::count(r.bootstrap_resamples),
        r.pairwise_label,
        match &r.control {
            Some(c) => format!("each group against {c}"),
            None => "every pair of groups".into(),
        },
        alternative_words(
            r.alternative,
            r.two_sided,
            "the first group minus the second"
        ),
        r.pairwise
            .first()
            .map_or("".into(), |c| interval_method(&c.ci)),
        r.test.rng,
        r.test.seed,
        r.engine_version
    );
    Doc {
        finding: r.finding.clone(),
        notes: r.notes.iter().map(words::note).collect(),
        lines,
        tables: vec![groups, comparisons],
        sections: Vec::new(),
        methods,
        cautions: r.cautions.clone(),
    }
}

pub fn kgroups_figures(r: &KGroupsReport) -> Vec<Figure> {
    let nf = plot::test_null_figure(
        &r.test,
        &r.statistic_label,
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
        svg: plot::groups_svg(&r.groups, &r.value_label, "k-strip"),
        caption: plot::describe_groups(&r.groups, &r.value_label),
    }]
    .into_iter()
    .chain(test_figures(&nf, &bf, "k"))
    .collect()
}

// ----- stratified -----------------------------------------------------------------------

pub fn strata_doc(r: &StrataReport, date: &str) -> Doc {
    let d = stratified::decimals(r);
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
            r.test.p_line("relabellings within strata"),
        ),
        (
            format!("{} ({a} − {b})", r.effect_label),
            format!("{} ({})", fmt::fixed(r.effect, d), interval_line(&r.ci, d)),
        ),
        (
            format!("{} with {level} CI", r.standardized.name),
            match r.standardized.estimate {
                Some(g) => format!(
                    "{} ({})",
                    fmt::fixed(g, 2),
                    interval_line(&r.standardized.ci, 2)
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
                    df(lm.df),
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
                opt_p(r.unstratified.p_value)
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
         as at least as extreme (relative tolerance 1e-9). Interval: {level} {} bootstrap from \
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
        r.weights.describe(),
        alternative_words(r.alternative, r.two_sided, &format!("{a} minus {b}")),
        r.test.how("relabellings"),
        interval_method(&r.ci),
        fmt::count(r.bootstrap_resamples),
        r.value_label,
        r.test.rng,
        r.test.seed,
        r.engine_version
    );
    Doc {
        finding: r.finding.clone(),
        notes: r.notes.iter().map(words::note).collect(),
        lines,
        tables: vec![table],
        sections: Vec::new(),
        methods,
        cautions: r.cautions.clone(),
    }
}

pub fn strata_figures(r: &StrataReport) -> Vec<Figure> {
    let nf = plot::test_null_figure(
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
        svg: plot::strata_svg(r, "s-strata"),
        caption: plot::describe_strata(r),
    }]
    .into_iter()
    .chain(test_figures(&nf, &bf, "s"))
    .collect()
}

// ----- yes/no ---------------------------------------------------------------------------

pub fn yesno_doc(r: &YesNoReport, date: &str) -> Doc {
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
                yes_no::share(r.yes[0], r.n[0]),
                yes_no::share(r.yes[1], r.n[1])
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
            format!("{} with {level} bootstrap CI", r.effect_label),
            format!("{}; {}", yes_no::effect_text(r), interval_method(&r.ci)),
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
                    yes_no::pct(r.yes[i] as f64 / r.n[i] as f64),
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
        r.statistic_label,
        alternative_words(r.alternative, r.two_sided, &format!("{a} versus {b}")),
        interval_method(&r.ci),
        fmt::count(r.bootstrap_resamples),
        if r.statistic == crate::designs::yes_no::YesNoStatistic::ProportionDifference {
            ""
        } else {
            ", on the log scale"
        },
        r.test.rng,
        r.test.seed,
        r.engine_version
    );
    Doc {
        finding: r.finding.clone(),
        notes: r.notes.iter().map(words::note).collect(),
        lines,
        tables: vec![table],
        sections: Vec::new(),
        methods,
        cautions: r.cautions.clone(),
    }
}

pub fn yesno_figures(r: &YesNoReport) -> Vec<Figure> {
    let label = format!("number of yes in {}", r.names[0]);
    let obs_count = r.yes[0] as f64;
    let mut nf =
        plot::test_null_figure(&r.test, &label, "tables", "with the margins fixed (exact)");
    nf.observed = obs_count;
    let bf = plot::BootFigure {
        label: &r.effect_label,
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

// ----- planning -------------------------------------------------------------------------

pub fn plan_doc(r: &crate::designs::plan::PlanReport, date: &str) -> Doc {
    let per = match r.design {
        crate::designs::plan::PlanDesign::Paired => "pairs",
        _ => "per group",
    };
    let finding = r.sentences.first().cloned().unwrap_or_else(|| {
        r.notes
            .first()
            .map(words::note)
            .unwrap_or_else(|| "No sample size reached the target power.".into())
    });
    let mut lines = vec![
        ("Design".into(), r.design.key().to_string()),
        ("Data model".into(), r.model_label.clone()),
        ("Test".into(), r.test_label.clone()),
        (format!("Assumed {}", r.effect_label), fmt::plain(r.effect)),
        (
            "Significance level".into(),
            format!(
                "{} ({})",
                fmt::plain(r.alpha),
                match r.alternative {
                    Alternative::TwoSided => "two-sided",
                    Alternative::Greater => "one-sided, treated higher",
                    Alternative::Less => "one-sided, treated lower",
                }
            ),
        ),
        ("Target power".into(), fmt::percent(r.target_power)),
    ];
    if let Some(g) = r.first_guess {
        lines.push((
            "Normal-approximation first guess".into(),
            format!("{} {per}", fmt::fixed(g, 1)),
        ));
    }
    if let Some(sm) = &r.smoothed {
        lines.push((
            "Sample size at the target (fitted curve)".into(),
            format!(
                "{} {per} (estimate {} ± {}, probit fit through {} sizes)",
                fmt::count(sm.n.ceil() as u64),
                fmt::fixed(sm.n, 1),
                fmt::fixed(sm.se, 1),
                sm.points
            ),
        ));
    }
    lines.push((
        "Smallest simulated size reaching the target".into(),
        match &r.required {
            Some(p) => format!(
                "{} {per}: power {} ± {} (95% interval {} to {}, {} studies)",
                fmt::count(p.n),
                fmt::fixed(p.power, 3),
                fmt::fixed(p.se, 3),
                fmt::fixed(p.low, 3),
                fmt::fixed(p.high, 3),
                fmt::count(p.studies)
            ),
            None => "not reached within the largest size tried".into(),
        },
    ));
    if let Some(d) = &r.detectable {
        lines.push((
            format!("Smallest detectable effect at {} {per}", d.n),
            format!(
                "{} (power {} ± {}; bracket {} to {})",
                fmt::sig(d.effect),
                fmt::fixed(d.power.power, 3),
                fmt::fixed(d.power.se, 3),
                fmt::sig(d.bracket.0),
                fmt::sig(d.bracket.1)
            ),
        ));
    }
    lines.push((
        "Seed and generator".into(),
        format!("{} · {}", r.seed, r.rng),
    ));
    let table = DocTable {
        id: "power-table",
        caption: format!("Estimated power at the assumed {}", r.effect_label),
        header: [
            "n",
            "power",
            "± SE",
            "95% interval",
            "studies",
            "stopped early",
        ]
        .map(String::from)
        .to_vec(),
        rows: r
            .curve
            .iter()
            .map(|p| {
                vec![
                    fmt::count(p.n),
                    fmt::fixed(p.power, 3),
                    fmt::fixed(p.se, 3),
                    format!("[{}, {}]", fmt::fixed(p.low, 3), fmt::fixed(p.high, 3)),
                    fmt::count(p.studies),
                    if p.stopped_early { "yes" } else { "no" }.into(),
                ]
            })
            .collect(),
    };
    let mut notes: Vec<String> = r.notes.iter().map(words::note).collect();
    notes.extend(r.sentences.iter().skip(1).cloned());
    Doc {
        finding,
        notes,
        lines,
        tables: vec![table],
        sections: vec![("What was traded for speed".into(), r.tradeoffs.clone())],
        methods: format!(
            "Power by simulation: each simulated study draws data from {}, runs {}, and rejects \
             when p ≤ {}. The sample size at the target is read off a curve fitted through \
             every simulated size (probit of the power linear in √n, weighted by each point's \
             simulation variance), with a delta-method error that covers the simulation only, \
             not the fit's own shape. Random numbers: {}, seed {}; the studies at each sample size and \
             effect draw from a seed derived from it. Computed with Reshuffle {} on {date}.",
            r.model_label,
            r.test_label,
            fmt::plain(r.alpha),
            r.rng,
            r.seed,
            r.engine_version
        ),
        cautions: r.cautions.clone(),
    }
}

/// (quantity, value) pairs at full precision, for the results CSV of the new designs.
fn results_rows(rep: &AnyReport) -> Vec<Vec<String>> {
    let opt = |v: Option<f64>| v.map_or(String::new(), |x| format!("{x:?}"));
    let row = |part: &str, q: &str, v: String| vec![part.to_string(), q.to_string(), v];
    let test_rows = |t: &crate::designs::TestOutcome| {
        vec![
            row("test", "observed", format!("{:?}", t.observed)),
            row("test", "p_value", format!("{:?}", t.p_value)),
            row("test", "exact", t.exact.to_string()),
            row("test", "resamples", t.resamples.to_string()),
            row("test", "mc_se", opt(t.mc_se)),
            row("run", "seed", t.seed.to_string()),
        ]
    };
    let mut rows = Vec::new();
    match rep {
        AnyReport::KGroups(r) => {
            rows.extend(test_rows(&r.test));
            rows.push(row("effect", "eta_squared", format!("{:?}", r.effect)));
            rows.push(row("effect", "ci_low", opt(r.ci.low)));
            rows.push(row("effect", "ci_high", opt(r.ci.high)));
            rows.push(row("effect", "omega_squared", opt(r.omega_squared)));
            rows.push(row("anova", "f", opt(r.anova.f)));
            rows.push(row("anova", "p_value", opt(r.anova.p_value)));
            rows.push(row("welch_anova", "f", opt(r.welch_anova.f)));
            rows.push(row("welch_anova", "p_value", opt(r.welch_anova.p_value)));
            rows.push(row("kruskal_wallis", "h", opt(r.kruskal_wallis.statistic)));
            rows.push(row(
                "kruskal_wallis",
                "p_value",
                opt(r.kruskal_wallis.p_value),
            ));
            for c in &r.pairwise {
                let part = format!("pair:{} - {}", c.first, c.second);
                rows.push(row(&part, "difference", format!("{:?}", c.difference)));
                rows.push(row(&part, "ci_low", opt(c.ci.low)));
                rows.push(row(&part, "ci_high", opt(c.ci.high)));
                rows.push(row(&part, "p_value", format!("{:?}", c.p_value)));
                rows.push(row(&part, "holm", format!("{:?}", c.holm)));
                rows.push(row(&part, "bh", format!("{:?}", c.bh)));
            }
        }
        AnyReport::Stratified(r) => {
            rows.extend(test_rows(&r.test));
            rows.push(row("effect", "difference", format!("{:?}", r.effect)));
            rows.push(row("effect", "ci_low", opt(r.ci.low)));
            rows.push(row("effect", "ci_high", opt(r.ci.high)));
            rows.push(row(
                "linear_model",
                "estimate",
                format!("{:?}", r.linear_model.estimate),
            ));
            rows.push(row("linear_model", "p_value", opt(r.linear_model.p_value)));
            for s in &r.strata {
                let part = format!("stratum:{}", s.name);
                rows.push(row(&part, "difference", format!("{:?}", s.difference)));
                rows.push(row(&part, "weight", format!("{:?}", s.weight)));
            }
        }
        AnyReport::YesNo(r) => {
            rows.extend(test_rows(&r.test));
            rows.push(row(
                "effect",
                &r.statistic.key().replace('-', "_"),
                format!("{:?}", r.effect),
            ));
            rows.push(row("effect", "ci_low", opt(r.ci.low)));
            rows.push(row("effect", "ci_high", opt(r.ci.high)));
            rows.push(row(
                "fisher_exact",
                "p_value",
                format!("{:?}", r.fisher_exact.p_value),
            ));
            rows.push(row("chi_square", "p_value", opt(r.chi_square.p_value)));
            for (i, name) in r.names.iter().enumerate() {
                rows.push(row(&format!("group:{name}"), "yes", r.yes[i].to_string()));
                rows.push(row(&format!("group:{name}"), "n", r.n[i].to_string()));
            }
        }
        AnyReport::Plan(r) => {
            for p in &r.curve {
                let part = format!("n:{}", p.n);
                rows.push(row(&part, "power", format!("{:?}", p.power)));
                rows.push(row(&part, "se", format!("{:?}", p.se)));
                rows.push(row(&part, "studies", p.studies.to_string()));
            }
            if let Some(p) = &r.required {
                rows.push(row("required", "n", p.n.to_string()));
            }
            if let Some(d) = &r.detectable {
                rows.push(row("detectable", "effect", format!("{:?}", d.effect)));
            }
            rows.push(row("run", "seed", r.seed.to_string()));
        }
        _ => {}
    }
    rows
}

impl AnyReport {
    /// The document of a design written with [`Doc`]; None for the earlier designs, which
    /// have their own renderers in `report`.
    pub fn doc(&self, date: &str) -> Option<Doc> {
        match self {
            AnyReport::KGroups(r) => Some(kgroups_doc(r, date)),
            AnyReport::Stratified(r) => Some(strata_doc(r, date)),
            AnyReport::YesNo(r) => Some(yesno_doc(r, date)),
            AnyReport::Plan(r) => Some(plan_doc(r, date)),
            _ => None,
        }
    }

    /// The report alone (without the job tag) as pretty JSON, as the command prints it.
    pub fn json(&self) -> serde_json::Result<String> {
        match self {
            AnyReport::Compare(r) => serde_json::to_string_pretty(r),
            AnyReport::Estimate(r) => serde_json::to_string_pretty(r),
            AnyReport::Paired(r) => serde_json::to_string_pretty(r),
            AnyReport::Association(r) => serde_json::to_string_pretty(r),
            AnyReport::KGroups(r) => serde_json::to_string_pretty(r),
            AnyReport::Stratified(r) => serde_json::to_string_pretty(r),
            AnyReport::YesNo(r) => serde_json::to_string_pretty(r),
            AnyReport::Plan(r) => serde_json::to_string_pretty(r),
        }
    }

    /// The findings in words.
    pub fn text(&self, date: &str) -> String {
        match self {
            AnyReport::Compare(r) => report::report_text(r),
            AnyReport::Estimate(r) => report::estimate_text(r),
            AnyReport::Paired(r) => report::paired_text(r),
            AnyReport::Association(r) => report::assoc_text(r),
            other => other.doc(date).map(|d| d.text()).unwrap_or_default(),
        }
    }

    pub fn markdown(&self, date: &str) -> String {
        match self {
            AnyReport::Compare(r) => report::markdown(r, date),
            AnyReport::Estimate(r) => report::estimate_markdown(r, date),
            AnyReport::Paired(r) => report::paired_markdown(r, date),
            AnyReport::Association(r) => report::assoc_markdown(r, date),
            other => other.doc(date).map(|d| d.markdown()).unwrap_or_default(),
        }
    }

    /// A self-contained HTML report.
    pub fn html(&self, date: &str) -> String {
        match self {
            AnyReport::Compare(r) => report::html(r, date),
            AnyReport::Estimate(r) => report::estimate_html(r, date),
            AnyReport::Paired(r) => report::paired_html(r, date),
            AnyReport::Association(r) => report::assoc_html(r, date),
            other => other
                .doc(date)
                .map(|d| d.html(&other.figures()))
                .unwrap_or_default(),
        }
    }

    /// The figures, as the page shows them and the downloads write them.
    pub fn figures(&self) -> Vec<Figure> {
        match self {
            AnyReport::Compare(r) => vec![
                Figure {
                    name: "relabelling",
                    svg: plot::null_svg(r, "null-plot"),
                    caption: plot::null_description(r),
                },
                Figure {
                    name: "bootstrap",
                    svg: plot::bootstrap_svg(r, "boot-plot"),
                    caption: plot::bootstrap_description(r),
                },
            ],
            AnyReport::Estimate(e) => {
                let fig = plot::BootFigure {
                    label: &e.estimate_label,
                    estimate: e.estimate,
                    interval: &e.intervals[0],
                    histogram: &e.histogram,
                    resamples: e.resamples,
                };
                vec![Figure {
                    name: "bootstrap",
                    svg: plot::bootstrap_figure_svg(&fig, "est-plot"),
                    caption: plot::describe_bootstrap(&fig),
                }]
            }
            AnyReport::Paired(p) => {
                let (nf, bf) = report::paired_figures(p);
                vec![
                    Figure {
                        name: "sign-flips",
                        svg: plot::null_figure_svg(&nf, "flip-plot"),
                        caption: plot::describe_null(&nf),
                    },
                    Figure {
                        name: "bootstrap",
                        svg: plot::bootstrap_figure_svg(&bf, "pboot-plot"),
                        caption: plot::describe_bootstrap(&bf),
                    },
                ]
            }
            AnyReport::Association(a) => {
                let (nf, bf, scatter) = report::assoc_figures(a);
                vec![
                    Figure {
                        name: "scatter",
                        svg: scatter,
                        caption: format!("{} against {}, with the least-squares line.", a.y, a.x),
                    },
                    Figure {
                        name: "pairings",
                        svg: plot::null_figure_svg(&nf, "pair-plot"),
                        caption: plot::describe_null(&nf),
                    },
                    Figure {
                        name: "bootstrap",
                        svg: plot::bootstrap_figure_svg(&bf, "aboot-plot"),
                        caption: plot::describe_bootstrap(&bf),
                    },
                ]
            }
            AnyReport::KGroups(r) => kgroups_figures(r),
            AnyReport::Stratified(r) => strata_figures(r),
            AnyReport::YesNo(r) => yesno_figures(r),
            AnyReport::Plan(r) => vec![Figure {
                name: "power",
                svg: plot::power_svg(r, "plan-power"),
                caption: plot::describe_power(r),
            }],
        }
    }

    /// The results as CSV at full precision.
    pub fn results_csv(&self) -> String {
        match self {
            AnyReport::Compare(r) => report::results_csv(r),
            AnyReport::Estimate(e) => {
                let rows: Vec<Vec<String>> = e
                    .intervals
                    .iter()
                    .map(|iv| {
                        vec![
                            words::method_key(iv.method).to_string(),
                            iv.low.map_or(String::new(), |v| format!("{v:?}")),
                            iv.high.map_or(String::new(), |v| format!("{v:?}")),
                            words::notes(&iv.notes),
                        ]
                    })
                    .collect();
                report::csv_table(&["method", "low", "high", "note"], &rows)
            }
            AnyReport::Paired(p) => {
                let opt = |v: Option<f64>| v.map_or(String::new(), |x| format!("{x:?}"));
                let rows = vec![
                    vec!["observed".into(), format!("{:?}", p.observed)],
                    vec!["p_value".into(), format!("{:?}", p.p_value)],
                    vec!["ci_low".into(), opt(p.ci.low)],
                    vec!["ci_high".into(), opt(p.ci.high)],
                    vec!["t".into(), opt(p.t_test.t)],
                    vec!["t_p_value".into(), opt(p.t_test.p_value)],
                    vec!["wilcoxon_p_value".into(), opt(p.wilcoxon.p_value)],
                    vec!["dz".into(), opt(p.dz.estimate)],
                    vec!["seed".into(), p.seed.to_string()],
                ];
                report::csv_table(&["quantity", "value"], &rows)
            }
            AnyReport::Association(a) => {
                let opt = |v: Option<f64>| v.map_or(String::new(), |x| format!("{x:?}"));
                let rows = vec![
                    vec!["observed".into(), format!("{:?}", a.observed)],
                    vec!["p_value".into(), format!("{:?}", a.p_value)],
                    vec!["ci_low".into(), opt(a.ci.low)],
                    vec!["ci_high".into(), opt(a.ci.high)],
                    vec!["t".into(), opt(a.t)],
                    vec!["t_p_value".into(), opt(a.t_p_value)],
                    vec!["slope".into(), format!("{:?}", a.slope)],
                    vec!["intercept".into(), format!("{:?}", a.intercept)],
                    vec!["seed".into(), a.seed.to_string()],
                ];
                report::csv_table(&["quantity", "value"], &rows)
            }
            other => report::csv_table(&["part", "quantity", "value"], &results_rows(other)),
        }
    }

    /// Short name of the design, for file names and the page.
    pub fn design(&self) -> &'static str {
        match self {
            AnyReport::Compare(_) => "two-groups",
            AnyReport::Estimate(_) => "estimate",
            AnyReport::Paired(p) if p.design == "one-sample" => "one-sample",
            AnyReport::Paired(_) => "paired",
            AnyReport::Association(_) => "association",
            AnyReport::KGroups(_) => "k-groups",
            AnyReport::Stratified(_) => "stratified",
            AnyReport::YesNo(_) => "yes-no",
            AnyReport::Plan(_) => "plan",
        }
    }

    /// The finding sentence.
    pub fn finding(&self) -> &str {
        match self {
            AnyReport::Compare(r) => &r.finding,
            AnyReport::Estimate(r) => &r.finding,
            AnyReport::Paired(r) => &r.finding,
            AnyReport::Association(r) => &r.finding,
            AnyReport::KGroups(r) => &r.finding,
            AnyReport::Stratified(r) => &r.finding,
            AnyReport::YesNo(r) => &r.finding,
            AnyReport::Plan(r) => r.sentences.first().map_or("", String::as_str),
        }
    }
}

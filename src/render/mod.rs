//! Words and pictures: every report worded into one document model ([`Doc`]) — the same for
//! the page, the command and the HTML, Markdown, text and CSV reports — and its figures as
//! SVG. One module per design, of the same name as the design's; [`document`] registers them.

pub mod association;
pub mod cautions;
pub mod doc;
pub mod estimate;
pub mod hints;
pub mod k_groups;
pub mod paired;
pub mod plan;
pub mod plot;
pub mod robustness;
pub mod rows;
pub mod stratified;
pub mod two_groups;
pub mod words;
pub mod yes_no;

pub use doc::{Doc, DocTable, Figure, Headline};

use crate::base::format as fmt;
use crate::base::Interval;
use crate::designs::TestOutcome;
use crate::wire::Report;
use doc::{full, row};

/// Adds to the methods paragraph how many threads (the command) or workers (the page) the run
/// used, and that the numbers do not depend on it.
pub fn add_threads(doc: &mut Doc, threads: usize) {
    doc.methods.push_str(&format!(
        " It ran on {} thread{}; the numbers are the same for any number.",
        threads,
        if threads == 1 { "" } else { "s" }
    ));
}

/// Adds to the methods paragraph how many web workers of the page computed the run, and
/// that the numbers do not depend on it.
pub fn add_workers(doc: &mut Doc, workers: usize) {
    doc.methods.push_str(&format!(
        " It ran in {} web worker{} of the browser tab; the numbers are the same for any number.",
        workers,
        if workers == 1 { "" } else { "s" }
    ));
}

/// The report as a document, dated `date` (YYYY-MM-DD) in its methods paragraph.
pub fn document(report: &Report, date: &str) -> Doc {
    match report {
        Report::TwoGroups(r) => two_groups::doc(r, date),
        Report::Paired(r) | Report::OneSample(r) => paired::doc(r, date),
        Report::Association(r) => association::doc(r, date),
        Report::KGroups(r) => k_groups::doc(r, date),
        Report::Stratified(r) => stratified::doc(r, date),
        Report::YesNo(r) => yes_no::doc(r, date),
        Report::Estimate(r) => estimate::doc(r, date),
        Report::Plan(r) => plan::doc(r, date),
    }
}

/// Every resampled statistic the report kept, as CSV (None when it kept none).
pub fn values_csv(report: &Report) -> Option<String> {
    match report {
        Report::TwoGroups(r) => Some(doc::values_csv(&[
            ("relabelled", r.null_values.as_deref()?),
            ("bootstrap", r.bootstrap_values.as_deref().unwrap_or(&[])),
        ])),
        Report::Estimate(r) => Some(doc::values_csv(&[("bootstrap", r.values.as_deref()?)])),
        _ => None,
    }
}

/// The table of group sizes, centres and spreads the group designs show, with `decimals`
/// decimals (and the 20% trimmed mean when `trimmed`).
pub fn group_table(
    id: &'static str,
    caption: String,
    groups: &[crate::designs::GroupSummary],
    decimals: usize,
    trimmed: bool,
) -> DocTable {
    let mut header: Vec<String> = ["group", "n", "mean", "median", "SD"]
        .map(String::from)
        .to_vec();
    if trimmed {
        header.push("20% trimmed mean".into());
    }
    let rows = groups
        .iter()
        .map(|g| {
            let mut row = vec![
                g.name.clone(),
                g.n.to_string(),
                fmt::fixed(g.mean, decimals),
                fmt::fixed(g.median, decimals),
                fmt::fixed(g.sd, decimals),
            ];
            if trimmed {
                row.push(fmt::fixed(g.trimmed_mean, decimals));
            }
            row
        })
        .collect();
    DocTable {
        id,
        caption,
        header,
        rows,
    }
}

/// A table of intervals by method: method, low, high, note.
pub fn interval_table(id: &'static str, caption: &str, ivs: &[Interval], d: usize) -> DocTable {
    let cell = |v: Option<f64>, open: &str| v.map_or(open.to_string(), |x| fmt::fixed(x, d));
    DocTable {
        id,
        caption: caption.to_string(),
        header: ["method", "low", "high", "note"].map(String::from).to_vec(),
        rows: ivs
            .iter()
            .map(|iv| {
                let (lo_open, hi_open) = match iv.side {
                    crate::base::Side::Upper => ("−∞", "—"),
                    crate::base::Side::Lower => ("—", "∞"),
                    crate::base::Side::TwoSided => ("—", "—"),
                };
                vec![
                    words::method(iv.method).to_string(),
                    cell(iv.low, lo_open),
                    cell(iv.high, hi_open),
                    words::notes(&iv.notes),
                ]
            })
            .collect(),
    }
}

/// The test's numbers for the results CSV.
pub fn test_rows(t: &TestOutcome) -> Vec<[String; 3]> {
    vec![
        row("test", "observed", format!("{:?}", t.observed)),
        row("test", "p_value", format!("{:?}", t.p_value)),
        row("test", "exact", t.exact.to_string()),
        row("test", "resamples", t.resamples.to_string()),
        row("test", "extreme_count", t.extreme_count.to_string()),
        row("test", "mc_se", full(t.mc_se)),
        row("run", "seed", t.seed.to_string()),
    ]
}

/// The intervals' limits for the results CSV.
pub fn interval_rows(ivs: &[Interval]) -> Vec<[String; 3]> {
    ivs.iter()
        .flat_map(|iv| {
            let part = format!("interval:{}", words::method_key(iv.method));
            [
                row(&part, "low", full(iv.low)),
                row(&part, "high", full(iv.high)),
            ]
        })
        .collect()
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::designs::two_groups::TwoGroupsRequest;
    use crate::wire::Job;

    fn report() -> Report {
        let mut r = TwoGroupsRequest::new(
            "y,g\n1,<b>x</b>\n2,<b>x</b>\n3,<b>x</b>\n4,y|z\n5,y|z\n7,y|z\n".into(),
            3,
        );
        r.settings.resamples = 999;
        r.settings.bootstrap_resamples = 500;
        Job::TwoGroups(r).run(&mut |_| true).unwrap()
    }

    #[test]
    fn html_report_is_self_contained_and_escaped() {
        let h = document(&report(), "2026-12-01").html();
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
        let m = document(&report(), "2026-12-01").markdown();
        assert!(m.contains("y\\|z"));
        assert!(m.contains("### Methods"));
    }

    fn words(job: Job) -> String {
        let rep = job.run(&mut |_| true).unwrap();
        let d = document(&rep, "2026-01-01");
        let (t, m, h) = (d.text(), d.markdown(), d.html());
        for w in [&t, &m, &h] {
            assert!(!w.contains("NaN") && !w.contains("inf "), "{w}");
        }
        t
    }

    #[test]
    fn no_finding_says_nan_when_nothing_varies() {
        use crate::designs::estimate::{Estimate, EstimateLayout, EstimateRequest};
        use crate::designs::k_groups::{KGroupsRequest, KStatistic};
        use crate::designs::paired::{PairedLayout, PairedRequest};
        use crate::designs::yes_no::{CountGroup, YesNoInput, YesNoRequest, YesNoStatistic};
        use crate::input::columns::Layout;

        let mut r = TwoGroupsRequest::new("y,g\n3,a\n3,a\n3,a\n3,b\n3,b\n3,b\n".into(), 1);
        r.settings.bootstrap_resamples = 200;
        words(Job::TwoGroups(r));

        let mut p = PairedRequest::new(
            "a,b\n1,1\n2,2\n".into(),
            PairedLayout::Columns {
                first: "a".into(),
                second: "b".into(),
            },
            1,
        );
        p.settings.bootstrap_resamples = 200;
        words(Job::Paired(p));

        let mut k = KGroupsRequest::new(
            "y,g\n3,a\n3,a\n3,b\n3,b\n3,c\n3,c\n".into(),
            Layout::Detect,
            1,
        );
        k.settings.bootstrap_resamples = 200;
        for st in KStatistic::ALL {
            k.statistic = st;
            words(Job::KGroups(k.clone()));
        }

        // A zero count: the risk ratio is 0 and its logarithm is minus infinity.
        let group = |name: &str, yes, n| CountGroup {
            name: name.into(),
            yes,
            n,
        };
        let mut y = YesNoRequest::new(
            String::new(),
            YesNoInput::Counts {
                groups: vec![group("old", 0, 15), group("new", 6, 15)],
            },
            1,
        );
        y.statistic = YesNoStatistic::RiskRatio;
        y.settings.bootstrap_resamples = 200;
        words(Job::YesNo(y));

        let data = "x\n3.1\n4.7\n2.2\n5.9\n4.0\n4.0\n7.5\n1.8\n2.9\n3.3\n";
        let mut e = EstimateRequest::new(
            data.into(),
            EstimateLayout::One {
                value: "x".into(),
                strata: None,
            },
            Estimate::Mean,
            1,
        );
        e.resamples = 1000;
        e.side = crate::base::Side::Lower;
        let t = words(Job::Estimate(e));
        assert!(t.contains("lower confidence bound"), "{t}");
    }
}

//! The one document model every report is worded into — finding, notes, result lines,
//! tables, figures, further sections, methods, cautions and the results at full precision —
//! and its renderings: plain text, Markdown, a self-contained HTML page and CSV. All text
//! from the data is escaped in Markdown and HTML. The page shows the same document.

use super::plot::escape;
pub use super::plot::Figure;
use crate::designs::DesignKey;

/// A table of a document.
#[derive(Clone, Debug, PartialEq)]
pub struct DocTable {
    /// A stable id (the page and the tests find the table by it).
    pub id: &'static str,
    /// What the table shows.
    pub caption: String,
    /// Column headings.
    pub header: Vec<String>,
    /// Rows; the first cell of each names the row.
    pub rows: Vec<Vec<String>>,
}

/// The headline numbers at full precision, for the page's data attributes.
#[derive(Clone, Debug, Default, PartialEq)]
pub struct Headline {
    /// The p-value of the test, if there is one.
    pub p_value: Option<f64>,
    /// The estimate the headline interval is for.
    pub estimate: Option<f64>,
    /// The headline interval's lower limit.
    pub low: Option<f64>,
    /// The headline interval's upper limit.
    pub high: Option<f64>,
}

/// A report in words and pictures.
#[derive(Clone, Debug, PartialEq)]
pub struct Doc {
    /// The design it reports.
    pub design: DesignKey,
    /// The plain-language finding.
    pub finding: String,
    /// What was left out, read specially or needs care.
    pub notes: Vec<String>,
    /// "label: value" lines of results.
    pub lines: Vec<(String, String)>,
    /// Tables.
    pub tables: Vec<DocTable>,
    /// Figures.
    pub figures: Vec<Figure>,
    /// Further headed lists (e.g. what a simulation traded for speed).
    pub sections: Vec<(String, Vec<String>)>,
    /// Everything needed to reproduce the analysis, as a paragraph.
    pub methods: String,
    /// What to keep in mind.
    pub cautions: Vec<String>,
    /// (part, quantity, value) at full precision, for the results CSV.
    pub results: Vec<[String; 3]>,
    /// The headline numbers.
    pub headline: Headline,
}

/// Escapes Markdown's special characters.
pub fn md_escape(s: &str) -> String {
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

impl Doc {
    /// The findings as plain text.
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

    /// The findings as Markdown (for a lab notebook, a ticket or a manuscript draft).
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

    /// A self-contained HTML report: no script, no external file, figures inline as SVG.
    pub fn html(&self) -> String {
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
        for f in &self.figures {
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
        html_page("Reshuffle findings", &b)
    }

    /// The results at full precision as CSV.
    pub fn results_csv(&self) -> String {
        let rows: Vec<Vec<String>> = self.results.iter().map(|r| r.to_vec()).collect();
        csv_table(&["part", "quantity", "value"], &rows)
    }
}

const REPORT_STYLE: &str = "body{font-family:system-ui,sans-serif;color:#1f2328;max-width:60rem;margin:2rem auto;padding:0 1rem;line-height:1.5}\
h1{color:#1d5c63;font-size:1.5rem}table{border-collapse:collapse;margin:1rem 0}td,th{border-bottom:1px solid #d5d9de;padding:.25rem .8rem .25rem 0;text-align:left}\
figure{margin:1rem 0;break-inside:avoid}figcaption{color:#4a5058;font-size:.9rem}.cautions{border:1px solid #c9b458;background:#fff8e1;padding:.5rem 1rem}\
.headline{font-weight:600;font-size:1.1rem}@media print{body{margin:0}}";

/// A self-contained HTML page: no script, no external file (pinned by its own CSP).
pub fn html_page(title: &str, body: &str) -> String {
    format!(
        "<!doctype html>\n<html lang=\"en\"><head><meta charset=\"utf-8\"><meta http-equiv=\"Content-Security-Policy\" content=\"default-src 'none'; style-src 'unsafe-inline'; img-src data:\"><title>{}</title><style>{REPORT_STYLE}</style></head><body>{body}</body></html>\n",
        escape(title)
    )
}

/// A CSV table (the csv crate quotes what needs quoting).
pub fn csv_table(header: &[&str], rows: &[Vec<String>]) -> String {
    let mut w = csv::Writer::from_writer(Vec::new());
    let _ = w.write_record(header);
    for r in rows {
        let _ = w.write_record(r);
    }
    String::from_utf8(w.into_inner().unwrap_or_default()).unwrap_or_default()
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

/// A date (UTC) from seconds since 1970, as YYYY-MM-DD (civil-from-days, H. Hinnant).
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

/// Full precision for the results CSV ("" when missing).
pub fn full(v: Option<f64>) -> String {
    v.map_or(String::new(), |x| format!("{x:?}"))
}

/// A (part, quantity, value) row of the results CSV.
pub fn row(part: &str, quantity: &str, value: String) -> [String; 3] {
    [part.to_string(), quantity.to_string(), value]
}

#[cfg(test)]
mod tests {
    use super::*;

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

    #[test]
    fn markdown_escapes_table_characters() {
        assert_eq!(md_escape("y|z <b>"), "y\\|z \\<b\\>");
    }
}

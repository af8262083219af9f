//! What the page shows and chooses from a table before any analysis: its columns and their
//! kinds, the first rows, the number of rows, each column's first labels, the layout found
//! and the design its shape suggests. Made in one reading of the table, so that the page can
//! have it made in a worker for a large table and stay responsive, and quickly from the
//! table's first lines while the rest is read.

use serde::{Deserialize, Serialize};

use crate::base::Error;
use crate::input::columns::{self, Layout};
use crate::input::suggest::{self, Suggestion};
use crate::input::table::{self, ColumnKind, HeaderChoice};

/// Rows the preview shows.
pub const PREVIEW_ROWS: usize = 6;

/// Distinct labels kept per column (the page offers the first 51 as groups).
pub const LABELS_KEPT: usize = 51;

/// A table as the page needs it before an analysis.
#[derive(Clone, Debug, PartialEq, Serialize, Deserialize)]
pub struct Outline {
    /// Column names and kinds.
    pub columns: Vec<(String, ColumnKind)>,
    /// The first rows, as typed.
    pub preview: Vec<Vec<String>>,
    /// Data rows.
    pub rows: usize,
    /// The separator found ("comma", "tab", "semicolon").
    pub delimiter: String,
    /// Whether the first row named the columns.
    pub header: bool,
    /// Each column's first distinct labels (trimmed, blanks left out), in order.
    pub labels: Vec<Vec<String>>,
    /// Where two groups are, as detected (none: no layout fits).
    pub layout: Option<Layout>,
    /// The design the table's shape suggests.
    pub suggestion: Option<Suggestion>,
    /// Whether this outline is of the table's first lines only (the rest being read).
    #[serde(default)]
    pub partial: bool,
}

impl Outline {
    /// The table's shape (column names and kinds), to notice when a different table arrives.
    pub fn shape(&self) -> String {
        self.columns
            .iter()
            .map(|(name, kind)| format!("{name}:{}", kind_key(kind)))
            .collect::<Vec<_>>()
            .join("|")
    }

    /// The first labels of column `name` (empty for an unknown column).
    pub fn labels_of(&self, name: &str) -> &[String] {
        self.columns
            .iter()
            .position(|c| c.0 == name)
            .and_then(|i| self.labels.get(i))
            .map_or(&[], |v| &v[..])
    }
}

/// A short key for a column kind.
pub fn kind_key(kind: &ColumnKind) -> &'static str {
    match kind {
        ColumnKind::Number => "numbers",
        ColumnKind::NumberWithText => "numbers (some text)",
        ColumnKind::Label => "labels",
        ColumnKind::Empty => "empty",
    }
}

/// The outline of a table.
pub fn outline(text: &str, header: HeaderChoice) -> Result<Outline, Error> {
    let t = table::parse(text, header)?;
    let labels = t
        .columns
        .iter()
        .map(|col| {
            let mut out: Vec<String> = Vec::new();
            for c in col.cells() {
                let l = c.text.trim();
                if !l.is_empty() && !out.iter().any(|o| o == l) {
                    out.push(l.to_string());
                    if out.len() >= LABELS_KEPT {
                        break;
                    }
                }
            }
            out
        })
        .collect();
    Ok(Outline {
        columns: t
            .columns
            .iter()
            .map(|c| (c.name.clone(), c.kind.clone()))
            .collect(),
        preview: (0..t.rows.min(PREVIEW_ROWS))
            .map(|r| {
                t.columns
                    .iter()
                    .map(|c| c.cell(r).text.to_string())
                    .collect()
            })
            .collect(),
        rows: t.rows,
        delimiter: table::delimiter_name(t.delimiter).to_string(),
        header: t.header,
        labels,
        layout: columns::detect_layout(&t).ok(),
        suggestion: suggest::suggest(&t),
        partial: false,
    })
}

/// The outline of a text's first `bytes` bytes, cut at a line's end (the whole text when it
/// is that short): what the page shows at once of a large paste while the rest is read.
pub fn outline_of_head(text: &str, header: HeaderChoice, bytes: usize) -> Result<Outline, Error> {
    if text.len() <= bytes {
        return outline(text, header);
    }
    let mut cut = bytes;
    while !text.is_char_boundary(cut) {
        cut -= 1;
    }
    let head = match text[..cut].rfind('\n') {
        Some(i) => &text[..=i],
        None => &text[..cut],
    };
    let mut o = outline(head, header)?;
    o.partial = true;
    Ok(o)
}

#[cfg(test)]
mod tests {
    use super::*;

    /// The outline says what the table holds: columns and kinds, first rows, row count,
    /// labels, layout and suggestion; a head outline of a longer text says it is partial and
    /// agrees on the columns.
    #[test]
    fn an_outline_holds_what_the_page_needs() {
        let mut text = String::from("yield,plot\n");
        for i in 0..200 {
            text.push_str(&format!(
                "{}.5,{}\n",
                10 + i % 7,
                if i % 2 == 0 { "east" } else { "west" }
            ));
        }
        let o = outline(&text, HeaderChoice::Detect).unwrap();
        assert_eq!(o.rows, 200);
        assert_eq!(
            o.columns,
            vec![
                ("yield".to_string(), ColumnKind::Number),
                ("plot".to_string(), ColumnKind::Label)
            ]
        );
        assert_eq!(o.preview.len(), PREVIEW_ROWS);
        assert_eq!(o.preview[1], vec!["11.5".to_string(), "west".to_string()]);
        assert_eq!(
            o.labels_of("plot"),
            ["east".to_string(), "west".to_string()]
        );
        assert_eq!(
            o.layout,
            Some(Layout::Long {
                value: "yield".into(),
                group: "plot".into()
            })
        );
        assert_eq!(
            o.suggestion.as_ref().map(|s| s.design.as_str()),
            Some("two-groups")
        );
        assert!(!o.partial);
        let head = outline_of_head(&text, HeaderChoice::Detect, 100).unwrap();
        assert!(head.partial && head.rows < 200);
        assert_eq!(head.columns, o.columns);
        assert_eq!(head.shape(), o.shape());
        // A cut inside a multi-byte character or without a line end still reads.
        let odd = "größe,gruppe\n1,ä\n2,ö\n";
        for b in 1..odd.len() {
            let _ = outline_of_head(odd, HeaderChoice::Detect, b);
        }
    }
}

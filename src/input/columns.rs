//! Finding the two groups in a table, with specific messages for every way it can fail.

use serde::{Deserialize, Serialize};

use crate::base::Note;

use crate::base::{Error, ErrorKind};
use crate::input::table::{self, Column, ColumnKind, Table};
use crate::num::stats;

/// Where the two groups are in the table.
#[derive(Clone, Debug, PartialEq, Serialize, Deserialize)]
#[serde(tag = "kind", rename_all = "kebab-case")]
pub enum Layout {
    /// Decide from the column types.
    Detect,
    /// One numeric column and one column of group labels.
    Long { value: String, group: String },
    /// One column per group.
    Wide { columns: Vec<String> },
}

/// Two groups of numbers ready for analysis.
#[derive(Clone, Debug)]
pub struct TwoGroups {
    pub names: [String; 2],
    pub a: Vec<f64>,
    pub b: Vec<f64>,
    pub layout: Layout,
    /// What the values are (the value column's name in long format).
    pub value_label: String,
    pub notes: Vec<Note>,
    /// The offset subtracted from every value (0 when none was): see [`shift_values`].
    pub shift: f64,
}

/// Subtracts the offset the values share when it dwarfs their spread
/// ([`stats::common_offset`]), so that sums, means and SDs lose no digits; notes it. The
/// designs add the offset back to the centres and ranges they report; differences,
/// statistics and intervals of differences are unchanged by it.
pub fn shift_values(groups: &mut [&mut Vec<f64>], notes: &mut Vec<Note>) -> f64 {
    let c = stats::common_offset(groups.iter().flat_map(|g| g.iter()));
    if c != 0.0 {
        for g in groups.iter_mut() {
            for v in g.iter_mut() {
                *v -= c;
            }
        }
        notes.push(Note::ValuesShifted { by: c });
    }
    c
}

fn err<T>(s: String) -> Result<T, Error> {
    Err(Error::data(s))
}

fn quoted_list(items: &[String]) -> String {
    items
        .iter()
        .map(|s| format!("\"{s}\""))
        .collect::<Vec<_>>()
        .join(", ")
}

/// Guesses the layout from the column types.
pub fn detect_layout(table: &Table) -> Result<Layout, Error> {
    let numeric: Vec<&Column> = table
        .columns
        .iter()
        .filter(|c| matches!(c.kind, ColumnKind::Number | ColumnKind::NumberWithText))
        .collect();
    let labels: Vec<&Column> = table
        .columns
        .iter()
        .filter(|c| c.kind == ColumnKind::Label)
        .collect();
    match (numeric.len(), labels.len()) {
        (0, _) => err(
            "No column holds numbers. Paste the measurements themselves, one value per cell."
                .into(),
        ),
        (1, 0) => err(format!(
            "Only one column of numbers (\"{}\") and no column saying which group each row \
             belongs to. Add a column of group labels, or put each group in its own column.",
            numeric[0].name
        )),
        (_, 0) => Ok(Layout::Wide {
            columns: vec![numeric[0].name.clone(), numeric[1].name.clone()],
        }),
        _ => Ok(Layout::Long {
            value: numeric[0].name.clone(),
            group: labels[0].name.clone(),
        }),
    }
}

/// Values of a numeric column with the group label of each row; the levels in order of
/// first appearance.
pub struct Labelled {
    pub levels: Vec<String>,
    /// (row index in the table, level index, value) for every row with both (16 bytes a
    /// row: tables hold at most 2^32 rows).
    pub rows: Vec<(u32, u32, f64)>,
}

impl Labelled {
    /// The values of each level, in level order (each list made at its final size).
    pub fn by_level(&self) -> Vec<Vec<f64>> {
        let mut sizes = vec![0usize; self.levels.len()];
        for &(_, l, _) in &self.rows {
            sizes[l as usize] += 1;
        }
        let mut out: Vec<Vec<f64>> = sizes.into_iter().map(Vec::with_capacity).collect();
        for &(_, l, v) in &self.rows {
            out[l as usize].push(v);
        }
        out
    }
}

/// Reads a value column and a label column (long format), noting blank cells, decimal
/// commas and values without a label.
pub fn labelled_values(
    table: &Table,
    value: &str,
    group: &str,
    notes: &mut Vec<Note>,
) -> Result<Labelled, Error> {
    if value == group {
        return err(format!(
            "The same column (\"{value}\") was chosen for the values and the groups. \
             Choose a different column for each."
        ));
    }
    let vcol = table.column(value)?;
    let gcol = table.column(group)?;
    let nums = vcol.numbers(table.decimal_comma)?;
    nums.push_notes(value, notes);
    if nums.decimal_commas > 0 {
        notes.push(Note::DecimalCommas {
            column: value.to_string(),
            count: nums.decimal_commas,
        });
    }
    let mut levels: Vec<String> = Vec::new();
    // Label → its index, so that thousands of labels are found in linear time.
    let mut index: std::collections::HashMap<&str, usize> = std::collections::HashMap::new();
    let mut unlabelled: Vec<u64> = Vec::new();
    // Made in the numbers' own memory (an in-place collect: same size and alignment).
    let rows: Vec<(u32, u32, f64)> = nums
        .values
        .into_iter()
        .filter_map(|(i, v)| {
            let label = gcol.cell(i).text.trim();
            if label.is_empty() || table::is_spreadsheet_error(label) {
                unlabelled.push(gcol.cell(i).line);
                return None;
            }
            let li = *index.entry(label).or_insert_with(|| {
                levels.push(label.to_string());
                levels.len() - 1
            });
            Some((i as u32, li as u32, v))
        })
        .collect();
    if !unlabelled.is_empty() {
        notes.push(Note::Unlabelled {
            column: group.to_string(),
            count: unlabelled.len(),
            lines: unlabelled.iter().take(5).copied().collect(),
        });
    }
    if levels.is_empty() {
        return err(format!(
            "Column \"{group}\" has no group labels next to the values in \"{value}\"."
        ));
    }
    Ok(Labelled { levels, rows })
}

/// The values of a numeric column split by the label column (long format), as
/// [`labelled_values`] reads them but straight into one list per level, each made at its
/// final size (no list of rows: 8 bytes a value, for large tables); the levels in order of
/// first appearance.
pub fn labelled_groups(
    table: &Table,
    value: &str,
    group: &str,
    notes: &mut Vec<Note>,
) -> Result<(Vec<String>, Vec<Vec<f64>>), Error> {
    if value == group {
        return labelled_values(table, value, group, notes).map(|l| (l.levels, Vec::new()));
    }
    let vcol = table.column(value)?;
    let gcol = table.column(group)?;
    let mut levels: Vec<String> = Vec::new();
    let mut index: std::collections::HashMap<&str, usize> = std::collections::HashMap::new();
    // Row → level (u32::MAX: no label), and the rows of each level, from the label column.
    let mut level_of: Vec<u32> = Vec::with_capacity(gcol.len());
    let mut sizes: Vec<usize> = Vec::new();
    for c in gcol.cells() {
        let label = c.text.trim();
        if label.is_empty() || table::is_spreadsheet_error(label) {
            level_of.push(u32::MAX);
            continue;
        }
        let li = *index.entry(label).or_insert_with(|| {
            levels.push(label.to_string());
            sizes.push(0);
            levels.len() - 1
        });
        sizes[li] += 1;
        level_of.push(li as u32);
    }
    let mut out: Vec<Vec<f64>> = sizes.iter().map(|&n| Vec::with_capacity(n)).collect();
    // The first row of each level that holds a value: the levels' order.
    let mut first_row = vec![usize::MAX; levels.len()];
    let mut unlabelled: Vec<u64> = Vec::new();
    let mut unlabelled_count = 0usize;
    let nums = vcol.numbers_each(table.decimal_comma, &mut |i, v| match level_of[i] {
        u32::MAX => {
            unlabelled_count += 1;
            if unlabelled.len() < 5 {
                unlabelled.push(gcol.cell(i).line);
            }
        }
        li => {
            let li = li as usize;
            first_row[li] = first_row[li].min(i);
            out[li].push(v);
        }
    })?;
    drop(level_of);
    nums.push_notes(value, notes);
    if nums.decimal_commas > 0 {
        notes.push(Note::DecimalCommas {
            column: value.to_string(),
            count: nums.decimal_commas,
        });
    }
    if unlabelled_count > 0 {
        notes.push(Note::Unlabelled {
            column: group.to_string(),
            count: unlabelled_count,
            lines: unlabelled,
        });
    }
    // Levels in the order of their first row with a value; a level whose every row lacks a
    // value is not a group of values.
    let mut order: Vec<usize> = (0..levels.len())
        .filter(|&l| first_row[l] != usize::MAX)
        .collect();
    order.sort_by_key(|&l| first_row[l]);
    let mut named: Vec<Option<String>> = levels.into_iter().map(Some).collect();
    let mut lists: Vec<Option<Vec<f64>>> = out.into_iter().map(Some).collect();
    let levels: Vec<String> = order.iter().filter_map(|&l| named[l].take()).collect();
    let out: Vec<Vec<f64>> = order.iter().filter_map(|&l| lists[l].take()).collect();
    if levels.is_empty() {
        return err(format!(
            "Column \"{group}\" has no group labels next to the values in \"{value}\"."
        ));
    }
    Ok((levels, out))
}

/// Reads one column per group (wide format), noting blank cells inside a column and
/// decimal commas.
pub fn wide_values(
    table: &Table,
    columns: &[String],
    notes: &mut Vec<Note>,
) -> Result<Vec<Vec<f64>>, Error> {
    for (i, c) in columns.iter().enumerate() {
        if columns[..i].contains(c) {
            return err(format!(
                "The same column (\"{c}\") was chosen for {} groups.",
                if columns.len() == 2 { "both" } else { "two" }
            ));
        }
    }
    let mut groups = Vec::new();
    for name in columns {
        let col = table.column(name)?;
        let nums = col.numbers(table.decimal_comma)?;
        // Blank cells below a shorter column's last value are expected in wide format and
        // not worth a note.
        let last = nums.values.last().map_or(0, |v| v.0 + 1);
        let inner = nums.missing - (col.len() - last);
        let blank = inner.saturating_sub(nums.spreadsheet_errors);
        if blank > 0 {
            notes.push(Note::MissingCells {
                column: col.name.clone(),
                count: blank,
            });
        }
        notes.extend(nums.spreadsheet_note(&col.name));
        notes.extend(nums.precision_note(&col.name));
        if nums.decimal_commas > 0 {
            notes.push(Note::DecimalCommas {
                column: col.name.clone(),
                count: nums.decimal_commas,
            });
        }
        groups.push(nums.values.into_iter().map(|v| v.1).collect::<Vec<f64>>());
    }
    Ok(groups)
}

/// Every group needs at least 2 values.
fn check_sizes(names: &[String], groups: &[Vec<f64>]) -> Result<(), Error> {
    for (name, g) in names.iter().zip(groups) {
        if g.len() < 2 {
            return err(format!(
                "Group \"{name}\" has {} value{}; each group needs at least 2 (at least 5 or so \
                 for a permutation test to be able to show anything).",
                g.len(),
                plural(g.len())
            ));
        }
    }
    Ok(())
}

/// Extracts the two groups the request asks for.
pub fn two_groups(
    table: &Table,
    layout: &Layout,
    first: Option<&str>,
    second: Option<&str>,
) -> Result<TwoGroups, Error> {
    let layout = match layout {
        Layout::Detect => detect_layout(table)?,
        l => l.clone(),
    };
    let mut notes = table.notes();
    let (names, a, b, value_label) = match &layout {
        Layout::Detect => unreachable!("resolved above"),
        Layout::Long { value, group } => {
            let (levels, mut by) = labelled_groups(table, value, group, &mut notes)?;
            let levels = &levels;
            let (first, second) = match levels.len() {
                1 => {
                    return err(format!(
                        "Column \"{group}\" names only one group (\"{}\"); a comparison needs two.",
                        levels[0]
                    ))
                }
                2 => {
                    let first = match first {
                        Some(f) => find_level(levels, f, group)?,
                        None => 0,
                    };
                    if let Some(s) = second {
                        let s = find_level(levels, s, group)?;
                        if s == first {
                            return err(format!(
                                "\"{}\" was chosen as both the first and the second group.",
                                levels[s]
                            ));
                        }
                    }
                    (first, 1 - first)
                }
                _ => match (first, second) {
                    (Some(f), Some(s)) => {
                        let (f, s) = (find_level(levels, f, group)?, find_level(levels, s, group)?);
                        if f == s {
                            return err(format!(
                                "\"{}\" was chosen as both the first and the second group.",
                                levels[f]
                            ));
                        }
                        let others: Vec<String> = levels
                            .iter()
                            .enumerate()
                            .filter(|(i, _)| *i != f && *i != s)
                            .map(|(_, l)| l.clone())
                            .collect();
                        notes.push(Note::OtherGroupsLeftOut {
                            first: levels[f].clone(),
                            second: levels[s].clone(),
                            others,
                        });
                        (f, s)
                    }
                    _ => {
                        return err(format!(
                            "Column \"{group}\" names {} groups ({}); this analysis compares two. \
                             Choose the first and the second group to compare.",
                            levels.len(),
                            quoted_list(levels)
                        ))
                    }
                },
            };
            let b = std::mem::take(&mut by[second]);
            let a = std::mem::take(&mut by[first]);
            (
                [levels[first].clone(), levels[second].clone()],
                a,
                b,
                value.clone(),
            )
        }
        Layout::Wide { columns } => {
            if columns.len() != 2 {
                return err(format!(
                    "This analysis compares two groups, but {} columns were chosen ({}). Choose two.",
                    columns.len(),
                    quoted_list(columns)
                ));
            }
            let mut order = [0usize, 1];
            if let Some(f) = first {
                match columns.iter().position(|c| c == f) {
                    Some(0) => {}
                    Some(_) => order = [1, 0],
                    None => {
                        return err(format!(
                            "\"{f}\" is not one of the chosen columns ({}).",
                            quoted_list(columns)
                        ))
                    }
                }
            }
            let ordered = [columns[order[0]].clone(), columns[order[1]].clone()];
            let mut groups = wide_values(table, &ordered, &mut notes)?;
            let b = groups.pop().unwrap_or_default();
            let a = groups.pop().unwrap_or_default();
            (ordered, a, b, "value".to_string())
        }
    };
    let ab = [a, b];
    check_sizes(&names, &ab)?;
    let [mut a, mut b] = ab;
    let shift = shift_values(&mut [&mut a, &mut b], &mut notes);
    Ok(TwoGroups {
        names,
        a,
        b,
        layout,
        value_label,
        notes,
        shift,
    })
}

/// Three or more groups of numbers.
#[derive(Clone, Debug)]
pub struct KGroups {
    pub names: Vec<String>,
    pub values: Vec<Vec<f64>>,
    pub layout: Layout,
    pub value_label: String,
    pub notes: Vec<Note>,
    /// The offset subtracted from every value (0 when none was): see [`shift_values`].
    pub shift: f64,
}

/// Extracts every group of a table for a k-group comparison: all labels of the group column
/// (long format) or every chosen column (wide format). With `Layout::Detect`, a label column
/// beside a numeric one means long format, otherwise every numeric column is a group.
pub fn k_groups(table: &Table, layout: &Layout) -> Result<KGroups, Error> {
    let layout = match layout {
        Layout::Detect => match detect_layout(table)? {
            Layout::Wide { .. } => Layout::Wide {
                columns: table
                    .columns
                    .iter()
                    .filter(|c| matches!(c.kind, ColumnKind::Number | ColumnKind::NumberWithText))
                    .map(|c| c.name.clone())
                    .collect(),
            },
            l => l,
        },
        l => l.clone(),
    };
    let mut notes = table.notes();
    let (names, values, value_label) = match &layout {
        Layout::Detect => unreachable!("resolved above"),
        Layout::Long { value, group } => {
            let (levels, values) = labelled_groups(table, value, group, &mut notes)?;
            (levels, values, value.clone())
        }
        Layout::Wide { columns } => {
            let values = wide_values(table, columns, &mut notes)?;
            (columns.clone(), values, "value".to_string())
        }
    };
    if names.len() < 3 {
        let (what, how) = match &layout {
            Layout::Long { group, .. } => (
                format!(
                    "Column \"{group}\" names {} group{}",
                    names.len(),
                    plural(names.len())
                ),
                "",
            ),
            _ => (
                format!(
                    "{} column{} {} chosen",
                    names.len(),
                    plural(names.len()),
                    were(names.len())
                ),
                " Choose three or more columns.",
            ),
        };
        return err(format!(
            "{what} ({}); a k-group comparison needs 3 or more.{how} For two groups use the \
             two-groups design.",
            quoted_list(&names)
        ));
    }
    check_sizes(&names, &values)?;
    let mut values = values;
    let shift = shift_values(&mut values.iter_mut().collect::<Vec<_>>(), &mut notes);
    Ok(KGroups {
        names,
        values,
        layout,
        value_label,
        notes,
        shift,
    })
}

fn find_level(levels: &[String], wanted: &str, group: &str) -> Result<usize, Error> {
    levels.iter().position(|l| l == wanted).ok_or_else(|| {
        Error::new(
            ErrorKind::Data,
            format!(
                "There is no group \"{wanted}\" in column \"{group}\"; its groups are {}.",
                quoted_list(levels)
            ),
        )
    })
}

pub fn plural(n: usize) -> &'static str {
    if n == 1 {
        ""
    } else {
        "s"
    }
}

fn were(n: usize) -> &'static str {
    if n == 1 {
        "was"
    } else {
        "were"
    }
}

/// Two numeric columns read row by row; rows missing either value are left out.
pub(crate) fn paired_columns(
    t: &Table,
    a: &str,
    b: &str,
    notes: &mut Vec<Note>,
) -> Result<(Vec<f64>, Vec<f64>), Error> {
    if a == b {
        return Err(Error::data(format!(
            "The same column (\"{a}\") was chosen twice."
        )));
    }
    let (ca, cb) = (t.column(a)?, t.column(b)?);
    let (na, nb) = (ca.numbers(t.decimal_comma)?, cb.numbers(t.decimal_comma)?);
    let mut vb = vec![None; t.rows];
    for &(i, v) in &nb.values {
        vb[i] = Some(v);
    }
    let mut va = vec![None; t.rows];
    for &(i, v) in &na.values {
        va[i] = Some(v);
    }
    let (mut xs, mut ys, mut incomplete) = (Vec::new(), Vec::new(), 0);
    for r in 0..t.rows {
        match (va[r], vb[r]) {
            (Some(x), Some(y)) => {
                xs.push(x);
                ys.push(y);
            }
            (None, None) => {}
            _ => incomplete += 1,
        }
    }
    if incomplete > 0 {
        notes.push(Note::IncompleteRows {
            first: a.to_string(),
            second: b.to_string(),
            count: incomplete,
        });
    }
    if xs.len() < 2 {
        return Err(Error::data(format!(
            "Fewer than 2 rows have values in both \"{a}\" and \"{b}\"."
        )));
    }
    Ok((xs, ys))
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::input::table::{parse, HeaderChoice};

    /// The per-level reader gives what the row list gives (levels in the order of their first
    /// row with a value, values in row order, the same notes), on a table where a level's
    /// first row has no value, rows lack labels, a cell holds a spreadsheet error and a
    /// level has no value at all.
    #[test]
    fn per_level_reading_equals_the_row_list() {
        let text = "y,g\n,B\n1.5,A\n2.5,\n3.5,B\n#N/A,C\n4.5,A\n5.5,#N/A\n6.5,B\n,D\n";
        let t = parse(text, HeaderChoice::Detect).unwrap();
        let (mut n1, mut n2) = (Vec::new(), Vec::new());
        let lab = labelled_values(&t, "y", "g", &mut n1).unwrap();
        let (levels, by) = labelled_groups(&t, "y", "g", &mut n2).unwrap();
        assert_eq!(levels, lab.levels);
        assert_eq!(levels, vec!["A".to_string(), "B".to_string()]);
        assert_eq!(by, lab.by_level());
        assert_eq!(by, vec![vec![1.5, 4.5], vec![3.5, 6.5]]);
        assert_eq!(n2, n1);
        assert!(n1
            .iter()
            .any(|n| matches!(n, Note::Unlabelled { count: 2, .. })));
    }

    /// What the two-group design asks of a table when the user picked nothing.
    struct Ask {
        layout: Layout,
        first: Option<String>,
        second: Option<String>,
    }

    fn req(text: &str) -> (Table, Ask) {
        (
            parse(text, HeaderChoice::Detect).unwrap(),
            Ask {
                layout: Layout::Detect,
                first: None,
                second: None,
            },
        )
    }

    #[test]
    fn long_format_is_detected_with_blanks_noted() {
        let (t, r) = req("yield,schedule\n4.1,drip\n3.9,drip\n,drip\n3.0,flood\n2.8,flood\n2.5,\n");
        let g = two_groups(&t, &r.layout, r.first.as_deref(), r.second.as_deref()).unwrap();
        assert_eq!(g.names, ["drip".to_string(), "flood".to_string()]);
        assert_eq!(g.a, vec![4.1, 3.9]);
        assert_eq!(g.b, vec![3.0, 2.8]);
        assert!(
            g.notes.contains(&Note::MissingCells {
                column: "yield".into(),
                count: 1
            }),
            "{:?}",
            g.notes
        );
        assert!(
            g.notes.contains(&Note::Unlabelled {
                column: "schedule".into(),
                count: 1,
                lines: vec![7]
            }),
            "{:?}",
            g.notes
        );
    }

    #[test]
    fn wide_format_with_unequal_lengths() {
        let (t, mut r) = req("north,south\n1,2\n3,4\n5,\n");
        r.first = Some("south".into());
        let g = two_groups(&t, &r.layout, r.first.as_deref(), r.second.as_deref()).unwrap();
        assert_eq!(g.names[0], "south");
        assert_eq!(g.a, vec![2.0, 4.0]);
        assert_eq!(g.b, vec![1.0, 3.0, 5.0]);
    }

    #[test]
    fn three_groups_need_a_choice() {
        let (t, mut r) = req("y,g\n1,a\n2,a\n3,b\n4,b\n5,c\n6,c\n");
        let e = two_groups(&t, &r.layout, r.first.as_deref(), r.second.as_deref())
            .err()
            .unwrap();
        assert!(e.message.contains("3 groups (\"a\", \"b\", \"c\")"), "{e}");
        r.first = Some("c".into());
        r.second = Some("a".into());
        let g = two_groups(&t, &r.layout, r.first.as_deref(), r.second.as_deref()).unwrap();
        assert_eq!(g.a, vec![5.0, 6.0]);
        assert_eq!(
            g.notes[0],
            Note::OtherGroupsLeftOut {
                first: "c".into(),
                second: "a".into(),
                others: vec!["b".into()]
            }
        );
    }

    #[test]
    fn single_group_and_tiny_group_messages() {
        let (t, r) = req("y,g\n1,a\n2,a\n");
        assert!(
            two_groups(&t, &r.layout, r.first.as_deref(), r.second.as_deref())
                .err()
                .unwrap()
                .message
                .contains("only one group (\"a\")")
        );
        let (t, r) = req("y,g\n1,a\n2,a\n3,b\n");
        let e = two_groups(&t, &r.layout, r.first.as_deref(), r.second.as_deref())
            .err()
            .unwrap();
        assert!(e.message.contains("Group \"b\" has 1 value;"), "{e}");
    }

    #[test]
    fn one_numeric_column_only() {
        let (t, r) = req("y\n1\n2\n3\n");
        assert!(
            two_groups(&t, &r.layout, r.first.as_deref(), r.second.as_deref())
                .err()
                .unwrap()
                .message
                .contains("Only one column of numbers (\"y\")")
        );
    }

    #[test]
    fn k_groups_long_and_wide() {
        let t = parse(
            "y,g\n1,a\n2,a\n3,b\n4,b\n5,c\n6,c\n,c\n",
            HeaderChoice::Detect,
        )
        .unwrap();
        let g = k_groups(&t, &Layout::Detect).unwrap();
        assert_eq!(g.names, vec!["a", "b", "c"]);
        assert_eq!(g.values[2], vec![5.0, 6.0]);
        assert!(
            matches!(&g.notes[0], Note::MissingCells { count: 1, .. }),
            "{:?}",
            g.notes
        );
        let t = parse("p,q,r\n1,2,3\n4,5,6\n", HeaderChoice::Detect).unwrap();
        let g = k_groups(&t, &Layout::Detect).unwrap();
        assert_eq!(g.names, vec!["p", "q", "r"]);
        let e = k_groups(
            &t,
            &Layout::Wide {
                columns: vec!["p".into(), "q".into()],
            },
        )
        .err()
        .unwrap();
        assert!(
            e.message.contains("2 columns were chosen (\"p\", \"q\")"),
            "{e}"
        );
        let e = k_groups(
            &t,
            &Layout::Wide {
                columns: vec!["p".into(), "q".into(), "p".into()],
            },
        )
        .err()
        .unwrap();
        assert!(
            e.message
                .contains("The same column (\"p\") was chosen for two groups"),
            "{e}"
        );
        let t = parse("y,g\n1,a\n2,a\n3,b\n4,b\n", HeaderChoice::Detect).unwrap();
        let e = k_groups(&t, &Layout::Detect).err().unwrap();
        assert!(e.message.contains("names 2 groups"), "{e}");
        assert!(e.message.contains("two-groups design"), "{e}");
    }

    #[test]
    fn unknown_first_group() {
        let (t, mut r) = req("y,g\n1,a\n2,a\n3,b\n4,b\n");
        r.first = Some("z".into());
        let e = two_groups(&t, &r.layout, r.first.as_deref(), r.second.as_deref())
            .err()
            .unwrap();
        assert!(e.message.contains("no group \"z\""), "{e}");
    }
}

//! Suggesting a design from the shape of a table, so the page can start from a sensible
//! choice and say why. The user can always change it; where the shape fits several designs
//! equally (two numeric columns of equal length), the suggestion lists the others and the
//! page asks.

use serde::{Deserialize, Serialize};

use crate::input::table::{self, Column, ColumnKind, Table};

#[derive(Clone, Debug, PartialEq, Serialize, Deserialize)]
pub struct Suggestion {
    /// The suggested design: "two-groups", "paired", "one-sample", "k-groups",
    /// "association", "stratified" or "yes-no".
    pub design: String,
    /// Other designs that fit this shape just as well; the page asks which is meant.
    pub alternatives: Vec<String>,
    /// Why, in one sentence.
    pub reason: String,
    /// Suggested columns: values (or outcome), group labels, strata.
    pub value: Option<String>,
    pub group: Option<String>,
    pub strata: Option<String>,
    /// The column naming the unit of paired measurements in long format.
    #[serde(default)]
    pub unit: Option<String>,
    /// Suggested columns for wide layouts (one per group, or x and y).
    pub columns: Vec<String>,
}

/// Distinct non-blank labels of a column, in order of first appearance (at most `cap`).
fn levels(col: &Column, cap: usize) -> Vec<String> {
    let mut out: Vec<String> = Vec::new();
    for c in col.cells() {
        let l = c.text.trim();
        if !l.is_empty() && !out.iter().any(|o| o == l) {
            out.push(l.to_string());
            if out.len() >= cap {
                break;
            }
        }
    }
    out
}

fn quoted(names: &[String]) -> String {
    names
        .iter()
        .map(|n| format!("\"{n}\""))
        .collect::<Vec<_>>()
        .join(", ")
}

/// Whether some level of `strata` holds rows of both levels of `group`, and more than one
/// row of at least one of them (a unit id column holds exactly one row per group).
fn crosses(t: &Table, group: &Column, strata: &Column) -> bool {
    let g = levels(group, 3);
    if g.len() != 2 {
        return false;
    }
    let mut counts: Vec<(String, usize, usize)> = Vec::new();
    for r in 0..t.rows {
        let (gl, sl) = (group.cell(r).text.trim(), strata.cell(r).text.trim());
        if gl.is_empty() || sl.is_empty() {
            continue;
        }
        let i = match counts.iter().position(|c| c.0 == sl) {
            Some(i) => i,
            None => {
                counts.push((sl.to_string(), 0, 0));
                counts.len() - 1
            }
        };
        if gl == g[0] {
            counts[i].1 += 1;
        } else {
            counts[i].2 += 1;
        }
    }
    counts.len() >= 2
        && counts.len() < t.rows
        && counts.iter().any(|c| c.1 > 0 && c.2 > 0)
        && counts.iter().any(|c| c.1 + c.2 > 2)
}

/// Whether `unit` names units measured once under each of the two levels of `group`: no
/// unit has two rows of the same level, and most units have both.
fn is_unit_column(t: &Table, group: &Column, unit: &Column) -> bool {
    let g = levels(group, 3);
    if g.len() != 2 {
        return false;
    }
    let mut counts: Vec<(String, usize, usize)> = Vec::new();
    for r in 0..t.rows {
        let (gl, ul) = (group.cell(r).text.trim(), unit.cell(r).text.trim());
        if gl.is_empty() || ul.is_empty() {
            continue;
        }
        let i = match counts.iter().position(|c| c.0 == ul) {
            Some(i) => i,
            None => {
                counts.push((ul.to_string(), 0, 0));
                counts.len() - 1
            }
        };
        if gl == g[0] {
            counts[i].1 += 1;
        } else {
            counts[i].2 += 1;
        }
    }
    let complete = counts.iter().filter(|c| c.1 == 1 && c.2 == 1).count();
    counts.iter().all(|c| c.1 <= 1 && c.2 <= 1) && complete >= 2 && 2 * complete >= counts.len()
}

/// The design the table's shape suggests, or None when nothing fits (no numbers at all).
pub fn suggest(t: &Table) -> Option<Suggestion> {
    let numeric: Vec<&Column> = t
        .columns
        .iter()
        .filter(|c| matches!(c.kind, ColumnKind::Number | ColumnKind::NumberWithText))
        .collect();
    let labels: Vec<&Column> = t
        .columns
        .iter()
        .filter(|c| c.kind == ColumnKind::Label && !table::is_yes_no(c))
        .collect();
    let yes_no: Vec<&Column> = t.columns.iter().filter(|c| table::is_yes_no(c)).collect();
    let base = |design: &str, reason: String| Suggestion {
        design: design.into(),
        alternatives: Vec::new(),
        reason,
        value: None,
        group: None,
        strata: None,
        unit: None,
        columns: Vec::new(),
    };
    // A yes/no outcome beside a column of group labels.
    if let (Some(out), Some(group)) = (yes_no.first(), labels.first()) {
        let lv = levels(group, 51);
        if lv.len() >= 2 {
            let mut s = base(
                "yes-no",
                format!(
                    "Column \"{}\" holds yes/no outcomes and column \"{}\" names the groups ({}).",
                    out.name,
                    group.name,
                    quoted(&lv[..lv.len().min(6)])
                ),
            );
            s.value = Some(out.name.clone());
            s.group = Some(group.name.clone());
            return Some(s);
        }
    }
    let measures: Vec<&Column> = numeric
        .iter()
        .copied()
        .filter(|c| !table::is_yes_no(c) || labels.is_empty())
        .collect();
    if let (Some(value), Some(group)) = (measures.first(), labels.first()) {
        let lv = levels(group, 51);
        let listed = quoted(&lv[..lv.len().min(6)]);
        if lv.len() >= 3 {
            let mut s = base(
                "k-groups",
                format!(
                    "Column \"{}\" names {}{} groups ({listed}{}).",
                    group.name,
                    if lv.len() > 50 { "more than " } else { "" },
                    lv.len().min(50),
                    if lv.len() > 6 { ", …" } else { "" }
                ),
            );
            s.value = Some(value.name.clone());
            s.group = Some(group.name.clone());
            return Some(s);
        }
        if lv.len() == 1 {
            // Probably part of the data: keep the comparison, whose message says so.
            let mut s = base(
                "two-groups",
                format!(
                    "Column \"{}\" names only one group ({listed}); a comparison needs two.",
                    group.name
                ),
            );
            s.alternatives = vec!["one-sample".into()];
            s.value = Some(value.name.clone());
            s.group = Some(group.name.clone());
            return Some(s);
        }
        if lv.len() == 2 {
            if let Some(strata) = labels[1..].iter().find(|s| crosses(t, group, s)) {
                let mut s = base(
                    "stratified",
                    format!(
                        "Column \"{}\" names two groups ({listed}) and column \"{}\" looks like \
                         strata (site, batch, day) holding both groups.",
                        group.name, strata.name
                    ),
                );
                s.alternatives = vec!["two-groups".into()];
                s.value = Some(value.name.clone());
                s.group = Some(group.name.clone());
                s.strata = Some(strata.name.clone());
                return Some(s);
            }
            if let Some(unit) = labels[1..].iter().find(|u| is_unit_column(t, group, u)) {
                let mut s = base(
                    "paired",
                    format!(
                        "Column \"{}\" names two measurements ({listed}) and column \"{}\" \
                         names units measured once under each.",
                        group.name, unit.name
                    ),
                );
                s.alternatives = vec!["two-groups".into()];
                s.value = Some(value.name.clone());
                s.group = Some(group.name.clone());
                s.unit = Some(unit.name.clone());
                return Some(s);
            }
            let mut s = base(
                "two-groups",
                format!("Column \"{}\" names two groups ({listed}).", group.name),
            );
            s.value = Some(value.name.clone());
            s.group = Some(group.name.clone());
            return Some(s);
        }
    }
    match measures.len() {
        0 => None,
        1 => {
            let mut s = base(
                "one-sample",
                format!(
                    "There is one column of numbers (\"{}\") and no column of group labels.",
                    measures[0].name
                ),
            );
            s.value = Some(measures[0].name.clone());
            Some(s)
        }
        2 => {
            let filled = |c: &Column| -> Vec<bool> {
                c.cells().map(|x| !x.text.trim().is_empty()).collect()
            };
            let names = vec![measures[0].name.clone(), measures[1].name.clone()];
            if filled(measures[0]) == filled(measures[1]) {
                let mut s = base(
                    "paired",
                    format!(
                        "Two numeric columns of equal length ({}): the same units measured \
                         twice (paired), two variables measured on each unit (association), \
                         or two independent groups?",
                        quoted(&names)
                    ),
                );
                s.alternatives = vec!["association".into(), "two-groups".into()];
                s.columns = names;
                Some(s)
            } else {
                let mut s = base(
                    "two-groups",
                    format!(
                        "Two numeric columns of different lengths ({}): one group in each.",
                        quoted(&names)
                    ),
                );
                s.columns = names;
                Some(s)
            }
        }
        k => {
            let names: Vec<String> = measures.iter().map(|c| c.name.clone()).collect();
            let mut s = base(
                "k-groups",
                format!(
                    "{k} numeric columns ({}{}): one group in each.",
                    quoted(&names[..k.min(6)]),
                    if k > 6 { ", …" } else { "" }
                ),
            );
            s.columns = names;
            Some(s)
        }
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::input::table::{parse, HeaderChoice};

    fn s(text: &str) -> Suggestion {
        suggest(&parse(text, HeaderChoice::Detect).unwrap()).unwrap()
    }

    #[test]
    fn shapes_and_their_designs() {
        let k = s("y,blend\n1,a\n2,b\n3,c\n4,a\n");
        assert_eq!(k.design, "k-groups");
        assert_eq!(k.group.as_deref(), Some("blend"));
        let two = s("y,g\n1,a\n2,b\n3,a\n");
        assert_eq!(two.design, "two-groups");
        let yn = s("germinated,storage\nyes,cold\nno,warm\nyes,warm\n");
        assert_eq!(yn.design, "yes-no");
        assert_eq!(yn.value.as_deref(), Some("germinated"));
        let yn01 = s("bought,page\n1,old\n0,new\n1,new\n0,old\n");
        assert_eq!(yn01.design, "yes-no");
        let paired = s("before,after\n1,2\n3,4\n5,7\n");
        assert_eq!(paired.design, "paired");
        assert_eq!(paired.alternatives, vec!["association", "two-groups"]);
        let wide = s("north,south\n1,2\n3,4\n5,\n");
        assert_eq!(wide.design, "two-groups");
        let three = s("p,q,r\n1,2,3\n4,5,6\n");
        assert_eq!(three.design, "k-groups");
        assert_eq!(three.columns, vec!["p", "q", "r"]);
        let partial = s("y,g\n1,a\n2,a\n3,a\n");
        assert_eq!(partial.design, "two-groups");
        assert_eq!(partial.alternatives, vec!["one-sample"]);
        let one = s("weight\n1\n2\n3\n");
        assert_eq!(one.design, "one-sample");
        assert!(suggest(&parse("a,b\nx,y\nz,w\n", HeaderChoice::Detect).unwrap()).is_none());
    }

    #[test]
    fn strata_are_recognised_but_unit_ids_are_not() {
        let st = s("y,coat,batch\n1,new,A\n2,old,A\n3,old,A\n4,new,B\n5,old,B\n6,new,B\n");
        assert_eq!(st.design, "stratified");
        assert_eq!(st.strata.as_deref(), Some("batch"));
        // One row per unit and group: a unit id, not a stratum; paired in long format.
        let ids = s("y,time,unit\n1,pre,u1\n2,post,u1\n3,pre,u2\n4,post,u2\n");
        assert_eq!(ids.design, "paired");
        assert_eq!(ids.unit.as_deref(), Some("unit"));
    }
}

//! The page's form as plain data, tested natively: every field the page shows ([`Fields`]),
//! the job the fields describe ([`Fields::job`]), the fields a job (from a share link or a
//! saved analysis file) puts back ([`Fields::restore`]), and what a table read suggests
//! ([`Fields::apply_detected`], [`Fields::apply_suggestion`]). The page's components only
//! bind signals to these fields (`web::form`); the round trip job → fields → job is tested
//! for every design.

use crate::base::{Alternative, IntervalMethod, Side, TwoSidedRule};
use crate::designs::association::AssocStatistic;
use crate::designs::estimate::Estimate;
use crate::designs::k_groups::KStatistic;
use crate::designs::paired::FlipStatistic;
use crate::designs::stratified::StrataWeights;
use crate::designs::two_groups::Statistic;
use crate::designs::yes_no::YesNoStatistic;
use crate::designs::TestSettings;
use crate::input::columns::Layout;
use crate::input::suggest::Suggestion;
use crate::input::table::{ColumnKind, HeaderChoice};

mod job;
mod restore;
#[cfg(test)]
mod tests;

/// What `shape_seen` holds after a restored job: the next table read keeps the job's design
/// (no suggestion) and records its shape.
pub const RESTORED_SHAPE: &str = "(restored)";

/// Tables of this many rows or more start with the sequential rules filled in (stop after
/// 20 at least as extreme; settle against 0.05).
pub const LARGE_TABLE: usize = 20_000;

/// Tables of this many rows or more start with [`HUGE_TABLE_BOOTSTRAP`] bootstrap resamples
/// instead of 10,000 (each resample reads every value; 2,000 is the usual least for BCa
/// limits).
pub const HUGE_TABLE: usize = 500_000;
pub const HUGE_TABLE_BOOTSTRAP: u64 = 2_000;

/// Data texts longer than this (bytes) are left out of the link kept in the address bar,
/// which then holds the settings only: rewriting a multi-megabyte address on every change
/// would slow the page and the browser's history.
pub const ADDRESS_DATA_LIMIT: usize = 256 * 1024;

/// Invented example tables, built into the page so it works without fetching anything.
pub const EXAMPLES: [(&str, &str, &str); 5] = [
    (
        "tomato",
        "Tomato yield, drip vs sprinkler irrigation (invented)",
        include_str!("../../demo-data/tomato-irrigation.csv"),
    ),
    (
        "desks",
        "Minutes per ticket at two service desks (invented)",
        include_str!("../../demo-data/service-desk-minutes.tsv"),
    ),
    (
        "adhesives",
        "Shear strength of joints with four adhesives (invented)",
        include_str!("../../demo-data/adhesive-shear-strength.csv"),
    ),
    (
        "coatings",
        "Coating wear on four production lines (invented)",
        include_str!("../../demo-data/coating-wear-by-line.csv"),
    ),
    (
        "seeds",
        "Seed germination after two kinds of storage (invented)",
        include_str!("../../demo-data/seed-germination.csv"),
    ),
];

/// Every field of the page's form, as the page shows it (numbers as typed).
#[derive(Clone, Debug, PartialEq)]
pub struct Fields {
    // Step 1: the data.
    pub data: String,
    pub example: String,
    pub header: HeaderChoice,
    pub file_note: String,
    pub layout_kind: String,
    pub value_col: String,
    pub group_col: String,
    pub col_a: String,
    pub col_b: String,
    // Step 2: the question.
    pub mode: String,
    pub design: String,
    pub first: String,
    pub second: String,
    pub statistic: Statistic,
    /// Two groups: also answer with the other statistics (the robustness table).
    pub robustness: bool,
    pub alternative: Alternative,
    pub two_sided: TwoSidedRule,
    pub resamples: String,
    pub exact_limit: String,
    /// The sequential stop (blank: draw every relabelling asked for).
    pub stop_after: String,
    /// The level the p-value is settled against (blank: no such check).
    pub settle_at: String,
    /// Whether the user (or a restored link) set either sequential rule, so that the
    /// large-table default leaves them alone.
    pub stop_set: bool,
    /// Whether the user (or a restored link) set the bootstrap resamples, so that the
    /// huge-table default leaves them alone.
    pub boot_set: bool,
    pub bootstrap: String,
    /// The kernel generation of a restored job made before the newest ([`KERNELS`]), with a
    /// fingerprint of the data it came with: the job keeps that generation (and so its
    /// numbers) while those data stay in the data box.
    pub old_kernels: Option<(u32, u64)>,
    pub confidence: String,
    pub interval_choice: String,
    pub seed: String,
    // Paired, one sample, association.
    pub reference: String,
    pub flip_stat: FlipStatistic,
    pub assoc_stat: AssocStatistic,
    pub unit_col: String,
    // k groups, strata, yes/no.
    pub k_columns: Vec<String>,
    pub control: String,
    pub k_stat: KStatistic,
    pub strata_col: String,
    pub weights: StrataWeights,
    pub yn_source: String,
    pub counts_text: String,
    pub yn_stat: YesNoStatistic,
    // Estimates.
    pub est_kind: Estimate,
    pub est_q: String,
    pub est_value: String,
    pub est_strata: String,
    pub est_x: String,
    pub est_y: String,
    pub paired: bool,
    pub side: Side,
    pub est_methods: String,
    // Planning a study.
    pub plan: PlanFields,
    // The shape (column names and kinds) of the table last seen, to notice a new table, and
    // what the page suggested from it.
    pub shape_seen: String,
    pub suggestion_note: String,
    pub suggestion_alternatives: Vec<String>,
}

/// The fields of a study plan.
#[derive(Clone, Debug, PartialEq)]
pub struct PlanFields {
    pub design: String,
    pub model: String,
    pub sd: String,
    pub value: String,
    pub multiply: bool,
    pub effect: String,
    pub means: String,
    pub baseline: String,
    pub rate: String,
    pub stat: String,
    pub alpha: String,
    pub power: String,
    pub alt: Alternative,
    pub mde_n: String,
    pub studies: String,
    pub relabellings: String,
    pub max_n: String,
}

fn text(s: &str) -> String {
    s.to_string()
}

/// A whole number typed in a field ("10,000" and "10_000" allowed).
pub fn parse_count(label: &str, text: &str) -> Result<u64, String> {
    let cleaned: String = text
        .chars()
        .filter(|c| !matches!(c, ',' | '_' | ' '))
        .collect();
    cleaned
        .parse::<u64>()
        .map_err(|_| format!("{label}: \"{text}\" is not a whole number."))
}

/// A number typed in a field (a decimal comma allowed, a trailing % ignored).
pub fn parse_number(label: &str, text: &str) -> Result<f64, String> {
    text.trim()
        .trim_end_matches('%')
        .replace(',', ".")
        .parse::<f64>()
        .ok()
        .filter(|x| x.is_finite())
        .ok_or_else(|| format!("{label}: \"{text}\" is not a number."))
}

/// A share typed as a percentage (95) or a fraction (0.95).
pub fn share(label: &str, text: &str) -> Result<f64, String> {
    let v = parse_number(label, text)?;
    Ok(if v > 1.0 { v / 100.0 } else { v })
}

/// The interval methods a choice stands for, the headline first.
pub fn methods_from(choice: &str) -> Vec<IntervalMethod> {
    if choice == "all" {
        let mut v = vec![IntervalMethod::Bca];
        v.extend(
            IntervalMethod::ALL
                .into_iter()
                .filter(|m| *m != IntervalMethod::Bca),
        );
        v
    } else {
        vec![IntervalMethod::from_key(choice).unwrap_or(IntervalMethod::Bca)]
    }
}

/// The choice that stands for these interval methods.
pub fn method_choice(ms: &[IntervalMethod]) -> String {
    if ms.len() == IntervalMethod::ALL.len() {
        "all".to_string()
    } else {
        ms.first()
            .copied()
            .unwrap_or(IntervalMethod::Bca)
            .key()
            .to_string()
    }
}

/// A share as the percentage the form shows (0.95 → "95").
pub fn percent_text(x: f64) -> String {
    format!("{}", (x * 1e6).round() / 1e4)
}

/// How a column's kind is named in the page's lists.
pub fn kind_label(k: &ColumnKind) -> &'static str {
    match k {
        ColumnKind::Number => "numbers",
        ColumnKind::NumberWithText => "numbers, some text",
        ColumnKind::Label => "labels",
        ColumnKind::Empty => "empty",
    }
}

impl Fields {
    /// The form as the page opens: the first example and the defaults of the engine.
    pub fn new() -> Fields {
        let d = TestSettings::new(0);
        Fields {
            data: text(EXAMPLES[0].2),
            example: text(EXAMPLES[0].0),
            header: HeaderChoice::Detect,
            file_note: text(""),
            layout_kind: text("long"),
            value_col: text(""),
            group_col: text(""),
            col_a: text(""),
            col_b: text(""),
            mode: text("compare"),
            design: text("two-groups"),
            first: text(""),
            second: text(""),
            statistic: Statistic::MeanDifference,
            robustness: false,
            alternative: Alternative::TwoSided,
            two_sided: TwoSidedRule::Absolute,
            resamples: text(&d.resamples.to_string()),
            // Blank: the design's own limit (all splits up to 1,000,000; all sign patterns
            // up to 2^20), as the command does without --exact-limit.
            exact_limit: text(""),
            stop_after: text(""),
            settle_at: text(""),
            stop_set: false,
            boot_set: false,
            bootstrap: text(&d.bootstrap_resamples.to_string()),
            old_kernels: None,
            confidence: text(&percent_text(d.confidence)),
            interval_choice: text("bca"),
            seed: text(""),
            reference: text("0"),
            flip_stat: FlipStatistic::Mean,
            assoc_stat: AssocStatistic::Pearson,
            unit_col: text(""),
            k_columns: Vec::new(),
            control: text(""),
            k_stat: KStatistic::F,
            strata_col: text(""),
            weights: StrataWeights::Size,
            yn_source: text("table"),
            counts_text: text("control: 42/300, new: 61/310"),
            yn_stat: YesNoStatistic::ProportionDifference,
            est_kind: Estimate::Median,
            est_q: text("0.9"),
            est_value: text(""),
            est_strata: text(""),
            est_x: text(""),
            est_y: text(""),
            paired: false,
            side: Side::TwoSided,
            est_methods: text("all"),
            plan: PlanFields {
                design: text("two-groups"),
                model: text("normal"),
                sd: text("1"),
                value: text(""),
                multiply: false,
                effect: text("0.5"),
                means: text("0, 0, 0.5"),
                baseline: text("0.14"),
                rate: text("0.20"),
                stat: text(""),
                alpha: text("0.05"),
                power: text("80"),
                alt: Alternative::TwoSided,
                mde_n: text(""),
                studies: text("1000"),
                relabellings: text("199"),
                max_n: text("2000"),
            },
            shape_seen: text(""),
            suggestion_note: text(""),
            suggestion_alternatives: Vec::new(),
        }
    }

    /// The design the form's question is about ("estimate" and "plan" for those modes).
    pub fn wanted(&self) -> String {
        match self.mode.as_str() {
            "estimate" => "estimate".into(),
            "plan" => "plan".into(),
            _ => self.design.clone(),
        }
    }

    /// Sets the columns from the layout detected in the table read (`detected`); false when
    /// none was detected.
    pub fn apply_detected(&mut self, detected: &Option<Layout>) -> bool {
        match detected.clone() {
            Some(Layout::Long { value, group }) => {
                self.layout_kind = "long".into();
                self.value_col = value;
                self.group_col = group;
                true
            }
            Some(Layout::Wide { columns }) if columns.len() >= 2 => {
                self.layout_kind = "wide".into();
                self.col_a = columns[0].clone();
                self.col_b = columns[1].clone();
                true
            }
            _ => false,
        }
    }

    /// Sets the design and its columns as a suggestion from the table's shape says.
    pub fn apply_suggestion(&mut self, sg: &Suggestion, label: &str) {
        self.design = sg.design.clone();
        if let (Some(v), Some(g)) = (&sg.value, &sg.group) {
            self.layout_kind = "long".into();
            self.value_col = v.clone();
            self.group_col = g.clone();
        }
        if let Some(st) = &sg.strata {
            self.strata_col = st.clone();
        }
        if let Some(u) = &sg.unit {
            self.unit_col = u.clone();
        }
        if sg.design == "yes-no" {
            self.yn_source = "table".into();
        }
        if sg.design == "one-sample" {
            if let Some(v) = &sg.value {
                self.est_value = v.clone();
            }
        }
        if sg.columns.len() >= 2 && sg.group.is_none() {
            self.layout_kind = "wide".into();
            self.col_a = sg.columns[0].clone();
            self.col_b = sg.columns[1].clone();
            self.est_x = sg.columns[0].clone();
            self.est_y = sg.columns[1].clone();
            self.k_columns = sg.columns.clone();
        }
        self.suggestion_note = format!(
            "Design set to {label} from the table's shape: {}",
            sg.reason
        );
        self.suggestion_alternatives = sg.alternatives.clone();
    }
}

impl Default for Fields {
    fn default() -> Fields {
        Fields::new()
    }
}

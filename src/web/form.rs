//! What the page's form holds, and the two ways between it and a job: [`Form::job`] builds
//! the job the settings on screen describe, [`Form::restore`] puts a job (from a link or a
//! saved file) back on screen. Every field is a signal, so the views bind to them directly.

use leptos::prelude::*;

use crate::base::{Alternative, IntervalMethod, Side, TwoSidedRule};
use crate::designs::association::{AssocRequest, AssocStatistic};
use crate::designs::estimate::{Estimate, EstimateLayout, EstimateRequest, Kind};
use crate::designs::k_groups::{KGroupsRequest, KStatistic};
use crate::designs::one_sample::OneSampleRequest;
use crate::designs::paired::{sign_flip_settings, FlipStatistic, PairedLayout, PairedRequest};
use crate::designs::plan::{PlanDesign, PlanModel, PlanRequest};
use crate::designs::stratified::{StrataRequest, StrataWeights};
use crate::designs::two_groups::{Statistic, TwoGroupsRequest};
use crate::designs::yes_no::{parse_counts, YesNoInput, YesNoRequest, YesNoStatistic};
use crate::designs::{TestSettings, KERNELS};
use crate::input::columns::Layout;
use crate::input::suggest::Suggestion;
use crate::input::table::{ColumnKind, HeaderChoice};
use crate::input::text::fingerprint;
use crate::wire::Job;

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

/// Every field of the form.
#[derive(Clone, Copy)]
pub struct Form {
    // Step 1: the data.
    pub data: RwSignal<String>,
    pub example: RwSignal<String>,
    pub header: RwSignal<HeaderChoice>,
    pub file_note: RwSignal<String>,
    pub layout_kind: RwSignal<String>,
    pub value_col: RwSignal<String>,
    pub group_col: RwSignal<String>,
    pub col_a: RwSignal<String>,
    pub col_b: RwSignal<String>,
    // Step 2: the question.
    pub mode: RwSignal<String>,
    pub design: RwSignal<String>,
    pub first: RwSignal<String>,
    pub second: RwSignal<String>,
    pub statistic: RwSignal<Statistic>,
    pub alternative: RwSignal<Alternative>,
    pub two_sided: RwSignal<TwoSidedRule>,
    pub resamples: RwSignal<String>,
    pub exact_limit: RwSignal<String>,
    /// The sequential stop (blank: draw every relabelling asked for).
    pub stop_after: RwSignal<String>,
    /// The level the p-value is settled against (blank: no such check).
    pub settle_at: RwSignal<String>,
    /// Whether the user (or a restored link) set either sequential rule, so that the
    /// large-table default leaves them alone.
    pub stop_set: RwSignal<bool>,
    /// Whether the user (or a restored link) set the bootstrap resamples, so that the
    /// huge-table default leaves them alone.
    pub boot_set: RwSignal<bool>,
    pub bootstrap: RwSignal<String>,
    /// The kernel generation of a restored job made before the newest ([`KERNELS`]), with a
    /// fingerprint of the data it came with: the job keeps that generation (and so its
    /// numbers) while those data stay in the data box.
    pub old_kernels: RwSignal<Option<(u32, u64)>>,
    pub confidence: RwSignal<String>,
    pub interval_choice: RwSignal<String>,
    pub seed: RwSignal<String>,
    // Paired, one sample, association.
    pub reference: RwSignal<String>,
    pub flip_stat: RwSignal<FlipStatistic>,
    pub assoc_stat: RwSignal<AssocStatistic>,
    pub unit_col: RwSignal<String>,
    // k groups, strata, yes/no.
    pub k_columns: RwSignal<Vec<String>>,
    pub control: RwSignal<String>,
    pub k_stat: RwSignal<KStatistic>,
    pub strata_col: RwSignal<String>,
    pub weights: RwSignal<StrataWeights>,
    pub yn_source: RwSignal<String>,
    pub counts_text: RwSignal<String>,
    pub yn_stat: RwSignal<YesNoStatistic>,
    // Estimates.
    pub est_kind: RwSignal<Estimate>,
    pub est_q: RwSignal<String>,
    pub est_value: RwSignal<String>,
    pub est_strata: RwSignal<String>,
    pub est_x: RwSignal<String>,
    pub est_y: RwSignal<String>,
    pub paired: RwSignal<bool>,
    pub side: RwSignal<Side>,
    pub est_methods: RwSignal<String>,
    // Planning a study.
    pub plan: PlanForm,
    // The shape (column names and kinds) of the table last seen, to notice a new table, and
    // what the page suggested from it.
    pub shape_seen: RwSignal<String>,
    pub suggestion_note: RwSignal<String>,
    pub suggestion_alternatives: RwSignal<Vec<String>>,
}

/// The fields of a study plan.
#[derive(Clone, Copy)]
pub struct PlanForm {
    pub design: RwSignal<String>,
    pub model: RwSignal<String>,
    pub sd: RwSignal<String>,
    pub value: RwSignal<String>,
    pub multiply: RwSignal<bool>,
    pub effect: RwSignal<String>,
    pub means: RwSignal<String>,
    pub baseline: RwSignal<String>,
    pub rate: RwSignal<String>,
    pub stat: RwSignal<String>,
    pub alpha: RwSignal<String>,
    pub power: RwSignal<String>,
    pub alt: RwSignal<Alternative>,
    pub mde_n: RwSignal<String>,
    pub studies: RwSignal<String>,
    pub relabellings: RwSignal<String>,
    pub max_n: RwSignal<String>,
}

fn text(s: &str) -> RwSignal<String> {
    RwSignal::new(s.to_string())
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
fn share(label: &str, text: &str) -> Result<f64, String> {
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
pub(super) fn method_choice(ms: &[IntervalMethod]) -> String {
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
pub(super) fn percent_text(x: f64) -> String {
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

/// What `shape_seen` holds after a restored job: the next table read keeps the job's design
/// (no suggestion) and records its shape.
pub const RESTORED_SHAPE: &str = "(restored)";

impl Form {
    /// The form as the page opens: the first example and the defaults of the engine.
    pub fn new() -> Form {
        let d = TestSettings::new(0);
        Form {
            data: text(EXAMPLES[0].2),
            example: text(EXAMPLES[0].0),
            header: RwSignal::new(HeaderChoice::Detect),
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
            statistic: RwSignal::new(Statistic::MeanDifference),
            alternative: RwSignal::new(Alternative::TwoSided),
            two_sided: RwSignal::new(TwoSidedRule::Absolute),
            resamples: text(&d.resamples.to_string()),
            // Blank: the design's own limit (all splits up to 1,000,000; all sign patterns
            // up to 2^20), as the command does without --exact-limit.
            exact_limit: text(""),
            stop_after: text(""),
            settle_at: text(""),
            stop_set: RwSignal::new(false),
            boot_set: RwSignal::new(false),
            bootstrap: text(&d.bootstrap_resamples.to_string()),
            old_kernels: RwSignal::new(None),
            confidence: text(&percent_text(d.confidence)),
            interval_choice: text("bca"),
            seed: text(""),
            reference: text("0"),
            flip_stat: RwSignal::new(FlipStatistic::Mean),
            assoc_stat: RwSignal::new(AssocStatistic::Pearson),
            unit_col: text(""),
            k_columns: RwSignal::new(Vec::new()),
            control: text(""),
            k_stat: RwSignal::new(KStatistic::F),
            strata_col: text(""),
            weights: RwSignal::new(StrataWeights::Size),
            yn_source: text("table"),
            counts_text: text("control: 42/300, new: 61/310"),
            yn_stat: RwSignal::new(YesNoStatistic::ProportionDifference),
            est_kind: RwSignal::new(Estimate::Median),
            est_q: text("0.9"),
            est_value: text(""),
            est_strata: text(""),
            est_x: text(""),
            est_y: text(""),
            paired: RwSignal::new(false),
            side: RwSignal::new(Side::TwoSided),
            est_methods: text("all"),
            plan: PlanForm {
                design: text("two-groups"),
                model: text("normal"),
                sd: text("1"),
                value: text(""),
                multiply: RwSignal::new(false),
                effect: text("0.5"),
                means: text("0, 0, 0.5"),
                baseline: text("0.14"),
                rate: text("0.20"),
                stat: text(""),
                alpha: text("0.05"),
                power: text("80"),
                alt: RwSignal::new(Alternative::TwoSided),
                mde_n: text(""),
                studies: text("1000"),
                relabellings: text("199"),
                max_n: text("2000"),
            },
            shape_seen: text(""),
            suggestion_note: text(""),
            suggestion_alternatives: RwSignal::new(Vec::new()),
        }
    }

    /// Reads every field, so that a memo calling this reruns when any of them changes.
    pub fn track(&self) {
        let _ = (
            self.data.get(),
            self.header.get(),
            self.layout_kind.get(),
            self.value_col.get(),
            self.group_col.get(),
            self.col_a.get(),
            self.col_b.get(),
            self.mode.get(),
            self.design.get(),
            self.first.get(),
            self.second.get(),
            self.statistic.get(),
            self.alternative.get(),
            self.two_sided.get(),
            self.resamples.get(),
            self.exact_limit.get(),
            self.stop_after.get(),
            self.settle_at.get(),
        );
        let _ = (
            self.bootstrap.get(),
            self.confidence.get(),
            self.interval_choice.get(),
            self.seed.get(),
            self.reference.get(),
            self.flip_stat.get(),
            self.assoc_stat.get(),
            self.unit_col.get(),
            self.k_columns.get(),
            self.control.get(),
            self.k_stat.get(),
            self.strata_col.get(),
            self.weights.get(),
            self.yn_source.get(),
            self.counts_text.get(),
            self.yn_stat.get(),
        );
        let _ = (
            self.est_kind.get(),
            self.est_q.get(),
            self.est_value.get(),
            self.est_strata.get(),
            self.est_x.get(),
            self.est_y.get(),
            self.paired.get(),
            self.side.get(),
            self.est_methods.get(),
        );
        let p = self.plan;
        let _ = (
            p.design.get(),
            p.model.get(),
            p.sd.get(),
            p.value.get(),
            p.multiply.get(),
            p.effect.get(),
            p.means.get(),
            p.baseline.get(),
            p.rate.get(),
            p.stat.get(),
            p.alpha.get(),
            p.power.get(),
            p.alt.get(),
            p.mde_n.get(),
            p.studies.get(),
            p.relabellings.get(),
        );
        let _ = p.max_n.get();
    }

    /// The design the form's question is about ("estimate" and "plan" for those modes).
    pub fn wanted(&self) -> String {
        match self.mode.get().as_str() {
            "estimate" => "estimate".into(),
            "plan" => "plan".into(),
            _ => self.design.get(),
        }
    }

    /// The test settings shared by the comparison designs; `base` holds the design's own
    /// defaults (the exact limit, when the field is blank).
    fn settings(&self, base: TestSettings) -> Result<TestSettings, String> {
        let mut s = base;
        s.alternative = self.alternative.get_untracked();
        s.two_sided = self.two_sided.get_untracked();
        s.resamples = parse_count("Random relabellings", &self.resamples.get_untracked())?;
        let limit = self.exact_limit.get_untracked();
        if !limit.trim().is_empty() {
            s.exact_limit = parse_count("Enumerate every possibility up to", &limit)?;
        }
        let stop = self.stop_after.get_untracked();
        s.stop_after = if stop.trim().is_empty() {
            None
        } else {
            Some(parse_count("Stop early once this many", &stop)?)
        };
        let settle = self.settle_at.get_untracked();
        s.settle_at = if settle.trim().is_empty() {
            None
        } else {
            Some(parse_number(
                "Stop once the p-value is settled against",
                &settle,
            )?)
        };
        s.bootstrap_resamples =
            parse_count("Bootstrap resamples", &self.bootstrap.get_untracked())?;
        s.confidence = share("Confidence level", &self.confidence.get_untracked())?;
        s.intervals = methods_from(&self.interval_choice.get_untracked());
        s.keep_resamples = true;
        s.kernels = match self.old_kernels.get_untracked() {
            Some((k, print)) if self.data.with_untracked(|d| fingerprint(d)) == print => k,
            _ => KERNELS,
        };
        Ok(s)
    }

    /// The two-group layout chosen in step 1.
    fn layout(&self) -> Layout {
        if self.layout_kind.get_untracked() == "long" {
            Layout::Long {
                value: self.value_col.get_untracked(),
                group: self.group_col.get_untracked(),
            }
        } else {
            Layout::Wide {
                columns: vec![self.col_a.get_untracked(), self.col_b.get_untracked()],
            }
        }
    }

    fn chosen(s: RwSignal<String>) -> Option<String> {
        Some(s.get_untracked()).filter(|x| !x.is_empty())
    }

    /// The job the settings on screen describe.
    pub fn job(&self, seed: u64) -> Result<Job, String> {
        match self.mode.get_untracked().as_str() {
            "plan" => self.plan_job(seed),
            "estimate" => self.estimate_job(seed),
            _ => self.compare_job(seed),
        }
    }

    fn compare_job(&self, seed: u64) -> Result<Job, String> {
        let data = self.data.get_untracked();
        let header = self.header.get_untracked();
        let long = self.layout_kind.get_untracked() == "long";
        let settings = self.settings(TestSettings::new(seed))?;
        let first = Self::chosen(self.first);
        // With more than two labels in a column, the second group is chosen too; two
        // columns are the two groups.
        let second = Self::chosen(self.second).filter(|_| long);
        Ok(match self.design.get_untracked().as_str() {
            "association" => Job::Association(AssocRequest {
                header,
                statistic: self.assoc_stat.get_untracked(),
                settings,
                ..AssocRequest::new(
                    data,
                    self.est_x.get_untracked(),
                    self.est_y.get_untracked(),
                    seed,
                )
            }),
            "k-groups" => {
                let layout = if long {
                    self.layout()
                } else {
                    Layout::Wide {
                        columns: self.k_columns.get_untracked(),
                    }
                };
                Job::KGroups(KGroupsRequest {
                    header,
                    statistic: self.k_stat.get_untracked(),
                    control: Self::chosen(self.control),
                    settings,
                    ..KGroupsRequest::new(data, layout, seed)
                })
            }
            "stratified" => {
                if !long {
                    return Err("A stratified comparison needs one column of values, one naming each row's group and one naming its stratum: in step 1 choose \"One column of values and one column naming each row's group\".".into());
                }
                if self.strata_col.get_untracked().is_empty() {
                    return Err("Choose the column that names each row's stratum (site, batch or day), under Design.".into());
                }
                Job::Stratified(StrataRequest {
                    header,
                    first,
                    second,
                    weights: self.weights.get_untracked(),
                    settings,
                    ..StrataRequest::new(
                        data,
                        self.value_col.get_untracked(),
                        self.group_col.get_untracked(),
                        self.strata_col.get_untracked(),
                        seed,
                    )
                })
            }
            "yes-no" => {
                let (input, data) = if self.yn_source.get_untracked() == "counts" {
                    let groups = parse_counts(&self.counts_text.get_untracked())?;
                    (YesNoInput::Counts { groups }, String::new())
                } else {
                    if !long {
                        return Err("Yes/no outcomes in a table need one column of outcomes and one naming each row's group: in step 1 choose \"One column of values and one column naming each row's group\", or type the counts instead.".into());
                    }
                    let input = YesNoInput::Table {
                        value: self.value_col.get_untracked(),
                        group: self.group_col.get_untracked(),
                        first,
                        second,
                    };
                    (input, data)
                };
                Job::YesNo(YesNoRequest {
                    header,
                    statistic: self.yn_stat.get_untracked(),
                    settings,
                    ..YesNoRequest::new(data, input, seed)
                })
            }
            "paired" => {
                let layout = if long {
                    if self.unit_col.get_untracked().is_empty() {
                        return Err("Paired data in long format need a column naming each unit (plant, patient, machine): choose it under Design, or put each measurement in its own column in step 1.".into());
                    }
                    PairedLayout::Long {
                        value: self.value_col.get_untracked(),
                        group: self.group_col.get_untracked(),
                        unit: self.unit_col.get_untracked(),
                        first: self.first.get_untracked(),
                        second: self.second.get_untracked(),
                    }
                } else {
                    PairedLayout::Columns {
                        first: self.first.get_untracked(),
                        second: self.second.get_untracked(),
                    }
                };
                Job::Paired(PairedRequest {
                    header,
                    statistic: self.flip_stat.get_untracked(),
                    settings: self.settings(sign_flip_settings(seed))?,
                    ..PairedRequest::new(data, layout, seed)
                })
            }
            "one-sample" => {
                let reference = parse_number("Reference value", &self.reference.get_untracked())?;
                Job::OneSample(OneSampleRequest {
                    header,
                    statistic: self.flip_stat.get_untracked(),
                    settings: self.settings(sign_flip_settings(seed))?,
                    ..OneSampleRequest::new(data, self.est_value.get_untracked(), reference, seed)
                })
            }
            _ => Job::TwoGroups(TwoGroupsRequest {
                header,
                layout: self.layout(),
                first,
                second,
                statistic: self.statistic.get_untracked(),
                settings,
                ..TwoGroupsRequest::new(data, seed)
            }),
        })
    }

    fn estimate_job(&self, seed: u64) -> Result<Job, String> {
        let e = self.est_kind.get_untracked();
        let long = self.layout_kind.get_untracked() == "long";
        let layout = match e.kind() {
            Kind::One => EstimateLayout::One {
                value: self.est_value.get_untracked(),
                strata: Self::chosen(self.est_strata),
            },
            Kind::Two => EstimateLayout::Groups {
                layout: self.layout(),
                first: Self::chosen(self.first),
                second: Self::chosen(self.second).filter(|_| long),
                paired: self.paired.get_untracked() && !long,
            },
            Kind::Association => EstimateLayout::Pairs {
                x: self.est_x.get_untracked(),
                y: self.est_y.get_untracked(),
            },
        };
        let mut r = EstimateRequest::new(self.data.get_untracked(), layout, e, seed);
        r.header = self.header.get_untracked();
        r.confidence = share("Confidence level", &self.confidence.get_untracked())?;
        r.resamples = parse_count("Bootstrap resamples", &self.bootstrap.get_untracked())?;
        r.methods = methods_from(&self.est_methods.get_untracked());
        r.side = self.side.get_untracked();
        r.keep_resamples = true;
        if e == Estimate::Quantile {
            let t = self.est_q.get_untracked();
            let v = parse_number("Quantile", &t)
                .map_err(|m| format!("{m} Write 0.9 for the 90th percentile."))?;
            r.q = Some(if v > 1.0 { v / 100.0 } else { v });
        }
        Ok(Job::Estimate(r))
    }

    fn plan_job(&self, seed: u64) -> Result<Job, String> {
        let p = self.plan;
        let num = |label: &str, s: RwSignal<String>| parse_number(label, &s.get_untracked());
        let d = PlanDesign::from_key(&p.design.get_untracked()).unwrap_or(PlanDesign::TwoGroups);
        let model = if d == PlanDesign::YesNo {
            PlanModel::Rates {
                baseline: num("Baseline rate", p.baseline)?,
            }
        } else if p.model.get_untracked() == "pilot" {
            PlanModel::Pilot {
                data: self.data.get_untracked(),
                header: self.header.get_untracked(),
                value: p.value.get_untracked(),
                multiply: p.multiply.get_untracked() && d == PlanDesign::TwoGroups,
            }
        } else {
            PlanModel::Normal {
                sd: num("Standard deviation", p.sd)?,
            }
        };
        let effect = match d {
            PlanDesign::YesNo => {
                num("Yes rate in the treated group", p.rate)? - num("Baseline rate", p.baseline)?
            }
            PlanDesign::KGroups => 1.0,
            _ => num("Effect to detect", p.effect)?,
        };
        let mut r = PlanRequest::new(d, model, effect, seed);
        if d == PlanDesign::KGroups {
            r.means = p
                .means
                .get_untracked()
                .split([',', ';', ' '])
                .filter(|t| !t.trim().is_empty())
                .map(|t| parse_number("Group means", t))
                .collect::<Result<Vec<f64>, String>>()?;
        }
        r.statistic = p.stat.get_untracked();
        r.alpha = num("Significance level", p.alpha)?;
        r.target_power = share("Target power", &p.power.get_untracked())?;
        r.alternative = p.alt.get_untracked();
        r.studies = parse_count("Simulated studies per size", &p.studies.get_untracked())?;
        r.relabellings = parse_count("Relabellings per study", &p.relabellings.get_untracked())?;
        r.max_n = parse_count("Largest size to try", &p.max_n.get_untracked())?;
        let m = p.mde_n.get_untracked();
        r.mde_n = if m.trim().is_empty() {
            None
        } else {
            Some(parse_count("Size for the detectable effect", &m)?)
        };
        Ok(Job::Plan(r))
    }

    /// Sets the columns from the layout detected in the table read (`detected`); false when
    /// none was detected.
    pub fn apply_detected(&self, detected: &Option<Layout>) -> bool {
        match detected.clone() {
            Some(Layout::Long { value, group }) => {
                self.layout_kind.set("long".into());
                self.value_col.set(value);
                self.group_col.set(group);
                true
            }
            Some(Layout::Wide { columns }) if columns.len() >= 2 => {
                self.layout_kind.set("wide".into());
                self.col_a.set(columns[0].clone());
                self.col_b.set(columns[1].clone());
                true
            }
            _ => false,
        }
    }

    /// Sets the design and its columns as a suggestion from the table's shape says.
    pub fn apply_suggestion(&self, sg: &Suggestion, label: &str) {
        self.design.set(sg.design.clone());
        if let (Some(v), Some(g)) = (&sg.value, &sg.group) {
            self.layout_kind.set("long".into());
            self.value_col.set(v.clone());
            self.group_col.set(g.clone());
        }
        if let Some(st) = &sg.strata {
            self.strata_col.set(st.clone());
        }
        if let Some(u) = &sg.unit {
            self.unit_col.set(u.clone());
        }
        if sg.design == "yes-no" {
            self.yn_source.set("table".into());
        }
        if sg.design == "one-sample" {
            if let Some(v) = &sg.value {
                self.est_value.set(v.clone());
            }
        }
        if sg.columns.len() >= 2 && sg.group.is_none() {
            self.layout_kind.set("wide".into());
            self.col_a.set(sg.columns[0].clone());
            self.col_b.set(sg.columns[1].clone());
            self.est_x.set(sg.columns[0].clone());
            self.est_y.set(sg.columns[1].clone());
            self.k_columns.set(sg.columns.clone());
        }
        self.suggestion_note.set(format!(
            "Design set to {label} from the table's shape: {}",
            sg.reason
        ));
        self.suggestion_alternatives.set(sg.alternatives.clone());
    }
}

impl Default for Form {
    fn default() -> Form {
        Form::new()
    }
}

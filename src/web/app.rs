//! The page: three steps (the data, the question, the findings). It parses the pasted table
//! for the preview with the engine's own reader, builds a protocol request, hands it to the
//! web worker, and renders the report. Nothing is computed here that the engine computes.

use std::cell::RefCell;

use leptos::prelude::*;
use wasm_bindgen::prelude::*;
use wasm_bindgen::JsCast;

use crate::base::format as fmt;
use crate::base::*;
use crate::designs::association::{AssocReport, AssocRequest, AssocStatistic};
use crate::designs::estimate::{Estimate, EstimateLayout, EstimateReport, EstimateRequest, Kind};
use crate::designs::k_groups::{KGroupsRequest, KStatistic};
use crate::designs::paired::{PairedLayout, PairedReport, PairedRequest};
use crate::designs::plan::{PlanDesign, PlanModel, PlanRequest};
use crate::designs::stratified::{StrataRequest, StrataWeights};
use crate::designs::two_groups;
use crate::designs::two_groups::{Report, Request, Statistic};
use crate::designs::yes_no::{parse_counts, YesNoInput, YesNoRequest, YesNoStatistic};
use crate::designs::TestSettings;
use crate::input::columns;
use crate::input::columns::Layout;
use crate::input::suggest;
use crate::input::table::{self, ColumnKind, HeaderChoice};
use crate::render::doc::Doc;
use crate::render::plot;
use crate::render::report;
use crate::render::words;
use crate::resample::signs::FlipStatistic;
use crate::web::share;
use crate::wire::link;
use crate::wire::{AnyReport, Job, WorkerMessage};

/// Invented example tables, built into the page so it works without fetching anything.
const EXAMPLES: [(&str, &str, &str); 5] = [
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

/// Script that starts the worker (written by Trunk's loader shim for the `worker` program).
const WORKER_URL: &str = "./worker_loader.js";

const MAX_FILE_BYTES: f64 = 20.0 * 1024.0 * 1024.0;

#[derive(Clone, Debug, PartialEq)]
enum Status {
    Idle,
    Starting,
    Running {
        stage: String,
        done: u64,
        total: u64,
    },
    Failed(String),
    Stopped,
    Done,
}

/// Signals the worker callbacks write to.
#[derive(Clone, Copy)]
struct Sinks {
    status: RwSignal<Status>,
    result: RwSignal<Option<AnyReport>>,
}

struct WorkerHandle {
    worker: web_sys::Worker,
    ready: bool,
    pending: Option<String>,
    _on_message: Closure<dyn FnMut(web_sys::MessageEvent)>,
    _on_error: Closure<dyn FnMut(web_sys::Event)>,
}

thread_local! {
    static WORKER: RefCell<Option<WorkerHandle>> = const { RefCell::new(None) };
}

fn spawn_worker(sinks: Sinks) -> Result<(), String> {
    let opts = web_sys::WorkerOptions::new();
    opts.set_type(web_sys::WorkerType::Classic);
    // The single-file offline build starts the worker from a Blob URL it sets here.
    let url = web_sys::window()
        .and_then(|w| js_sys::Reflect::get(&w, &JsValue::from_str("RESHUFFLE_WORKER_URL")).ok())
        .and_then(|v| v.as_string())
        .unwrap_or_else(|| WORKER_URL.to_string());
    let worker = web_sys::Worker::new_with_options(&url, &opts)
        .map_err(|e| format!("The computing worker could not be started ({e:?})."))?;
    let on_message =
        Closure::<dyn FnMut(web_sys::MessageEvent)>::new(move |ev: web_sys::MessageEvent| {
            let text = ev.data().as_string().unwrap_or_default();
            match serde_json::from_str::<WorkerMessage>(&text) {
                Ok(WorkerMessage::Ready) => {
                    let pending = WORKER.with(|w| {
                        let mut w = w.borrow_mut();
                        w.as_mut().and_then(|h| {
                            h.ready = true;
                            h.pending.take().map(|p| (h.worker.clone(), p))
                        })
                    });
                    if let Some((worker, p)) = pending {
                        let _ = worker.post_message(&JsValue::from_str(&p));
                    }
                }
                Ok(WorkerMessage::Progress(p)) => sinks.status.set(Status::Running {
                    stage: p.stage,
                    done: p.done,
                    total: p.total,
                }),
                Ok(WorkerMessage::Done { report }) => {
                    sinks.result.set(Some(*report));
                    sinks.status.set(Status::Done);
                }
                Ok(WorkerMessage::Failed { message }) => sinks.status.set(Status::Failed(message)),
                Err(e) => sinks.status.set(Status::Failed(format!(
                    "The worker sent a message that could not be read ({e})."
                ))),
            }
        });
    let on_error = Closure::<dyn FnMut(web_sys::Event)>::new(move |ev: web_sys::Event| {
        ev.prevent_default();
        let detail = ev
            .dyn_ref::<web_sys::ErrorEvent>()
            .map(|e| e.message())
            .unwrap_or_default();
        sinks.status.set(Status::Failed(format!(
            "The computation stopped unexpectedly{}. Your data and settings are unchanged; \
             try again, or with fewer resamples.",
            if detail.is_empty() {
                String::new()
            } else {
                format!(" ({detail})")
            }
        )));
        // A crashed worker cannot be reused.
        WORKER.with(|w| {
            if let Some(h) = w.borrow_mut().take() {
                h.worker.terminate();
            }
        });
    });
    worker.set_onmessage(Some(on_message.as_ref().unchecked_ref()));
    worker.set_onerror(Some(on_error.as_ref().unchecked_ref()));
    WORKER.with(|w| {
        *w.borrow_mut() = Some(WorkerHandle {
            worker,
            ready: false,
            pending: None,
            _on_message: on_message,
            _on_error: on_error,
        })
    });
    Ok(())
}

fn send_to_worker(sinks: Sinks, text: String) -> Result<(), String> {
    if WORKER.with(|w| w.borrow().is_none()) {
        spawn_worker(sinks)?;
    }
    WORKER.with(|w| {
        let mut w = w.borrow_mut();
        if let Some(h) = w.as_mut() {
            if h.ready {
                let _ = h.worker.post_message(&JsValue::from_str(&text));
            } else {
                h.pending = Some(text);
            }
        }
    });
    Ok(())
}

fn stop_worker() {
    WORKER.with(|w| {
        if let Some(h) = w.borrow_mut().take() {
            h.worker.terminate();
        }
    });
}

/// A fresh seed from the browser's cryptographic generator, below 2^53.
fn fresh_seed() -> u64 {
    let mut bytes = [0u8; 8];
    let ok = web_sys::window()
        .and_then(|w| w.crypto().ok())
        .map(|c| c.get_random_values_with_u8_array(&mut bytes).is_ok())
        .unwrap_or(false);
    let raw = if ok {
        u64::from_le_bytes(bytes)
    } else {
        (js_sys::Math::random() * 9007199254740992.0) as u64
    };
    crate::resample::rng::seed_from_entropy(raw)
}

/// What the preview shows of a parsed table.
#[derive(Clone, Debug, PartialEq)]
struct TableView {
    columns: Vec<(String, ColumnKind)>,
    preview: Vec<Vec<String>>,
    rows: usize,
    delimiter: &'static str,
    header: bool,
}

fn kind_label(k: &ColumnKind) -> &'static str {
    match k {
        ColumnKind::Number => "numbers",
        ColumnKind::NumberWithText => "numbers, some text",
        ColumnKind::Label => "labels",
        ColumnKind::Empty => "empty",
    }
}

fn parse_count(label: &str, text: &str) -> Result<u64, String> {
    let cleaned: String = text
        .chars()
        .filter(|c| !matches!(c, ',' | '_' | ' '))
        .collect();
    cleaned
        .parse::<u64>()
        .map_err(|_| format!("{label}: \"{text}\" is not a whole number."))
}

/// A two-group request carrying a design's shared settings, for restoring the page.
fn settings_request(data: &str, header: HeaderChoice, st: &TestSettings) -> Request {
    let mut b = Request::new(data.to_string(), st.seed);
    b.header = header;
    b.confidence = st.confidence;
    b.bootstrap_resamples = st.bootstrap_resamples;
    b.resamples = st.resamples;
    b.exact_limit = st.exact_limit;
    b
}

/// The shape of a table (column names and kinds), to notice when a different table arrives.
fn shape_of(data: &str, header: HeaderChoice) -> String {
    match table::parse(data, header) {
        Ok(t) => t
            .columns
            .iter()
            .map(|c| format!("{}:{}", c.name, kind_label(&c.kind)))
            .collect::<Vec<_>>()
            .join("|"),
        Err(_) => String::new(),
    }
}

/// The design names as the page shows them.
fn design_label(key: &str) -> &'static str {
    match key {
        "two-groups" => "two independent groups",
        "paired" => "paired measurements",
        "one-sample" => "one sample against a reference value",
        "k-groups" => "three or more groups",
        "association" => "association between two numeric columns",
        "stratified" => "two groups within strata",
        "yes-no" => "yes/no outcomes in two groups",
        _ => "another design",
    }
}

#[component]
fn App() -> impl IntoView {
    // Step 1: the data.
    let data = RwSignal::new(EXAMPLES[0].2.to_string());
    let example = RwSignal::new(EXAMPLES[0].0.to_string());
    let header = RwSignal::new(HeaderChoice::Detect);
    let file_note = RwSignal::new(String::new());
    let layout_kind = RwSignal::new("long".to_string());
    let value_col = RwSignal::new(String::new());
    let group_col = RwSignal::new(String::new());
    let col_a = RwSignal::new(String::new());
    let col_b = RwSignal::new(String::new());
    // Step 2: the question.
    let first = RwSignal::new(String::new());
    let second = RwSignal::new(String::new());
    let statistic = RwSignal::new(Statistic::MeanDifference);
    let alternative = RwSignal::new(Alternative::TwoSided);
    let two_sided = RwSignal::new(TwoSidedRule::Absolute);
    let resamples = RwSignal::new("100000".to_string());
    let exact_limit = RwSignal::new("1000000".to_string());
    let bootstrap = RwSignal::new("10000".to_string());
    let confidence = RwSignal::new("95".to_string());
    let seed = RwSignal::new(String::new());
    let settings_error = RwSignal::new(String::new());
    // Estimate-only mode.
    let mode = RwSignal::new("compare".to_string());
    let est_kind = RwSignal::new(Estimate::Median);
    let est_q = RwSignal::new("0.9".to_string());
    let est_value = RwSignal::new(String::new());
    let est_strata = RwSignal::new(String::new());
    let est_x = RwSignal::new(String::new());
    let est_y = RwSignal::new(String::new());
    let paired = RwSignal::new(false);
    let side = RwSignal::new(Side::TwoSided);
    let est_methods = RwSignal::new("all".to_string());
    // Step 3: the findings.
    let status = RwSignal::new(Status::Idle);
    let result = RwSignal::new(None::<AnyReport>);
    let last_job = RwSignal::new(None::<Job>);
    let sinks = Sinks { status, result };
    // Designs of the comparison: two independent groups, paired columns, one sample.
    let design = RwSignal::new("two-groups".to_string());
    let reference = RwSignal::new("0".to_string());
    let flip_stat = RwSignal::new(FlipStatistic::Mean);
    let assoc_stat = RwSignal::new(AssocStatistic::Pearson);
    // k groups, stratified and yes/no designs.
    let k_columns = RwSignal::new(Vec::<String>::new());
    let control = RwSignal::new(String::new());
    let k_stat = RwSignal::new(KStatistic::F);
    let strata_col = RwSignal::new(String::new());
    let unit_col = RwSignal::new(String::new());
    let weights = RwSignal::new(StrataWeights::Size);
    let yn_source = RwSignal::new("table".to_string());
    let counts_text = RwSignal::new("control: 42/300, new: 61/310".to_string());
    let yn_stat = RwSignal::new(YesNoStatistic::ProportionDifference);
    // Planning a study.
    let plan_design = RwSignal::new("two-groups".to_string());
    let plan_model = RwSignal::new("normal".to_string());
    let plan_sd = RwSignal::new("1".to_string());
    let plan_value = RwSignal::new(String::new());
    let plan_multiply = RwSignal::new(false);
    let plan_effect = RwSignal::new("0.5".to_string());
    let plan_means = RwSignal::new("0, 0, 0.5".to_string());
    let plan_baseline = RwSignal::new("0.14".to_string());
    let plan_rate = RwSignal::new("0.20".to_string());
    let plan_stat = RwSignal::new(String::new());
    let plan_alpha = RwSignal::new("0.05".to_string());
    let plan_power = RwSignal::new("80".to_string());
    let plan_alt = RwSignal::new(Alternative::TwoSided);
    let plan_mde_n = RwSignal::new(String::new());
    let plan_studies = RwSignal::new("1000".to_string());
    let plan_relabellings = RwSignal::new("199".to_string());
    let plan_max_n = RwSignal::new("2000".to_string());
    // The shape (column names and kinds) of the table last seen, to notice a new table.
    let shape_seen = RwSignal::new(String::new());
    let suggestion_note = RwSignal::new(String::new());
    let suggestion_alternatives = RwSignal::new(Vec::<String>::new());
    // The result on screen: the last one, if it belongs to the question now chosen.
    let shown = Memo::new(move |_| -> Option<AnyReport> {
        let r = result.get()?;
        let wanted = match mode.get().as_str() {
            "estimate" => "estimate".to_string(),
            "plan" => "plan".to_string(),
            _ => design.get(),
        };
        (r.design() == wanted).then_some(r)
    });

    let parsed = Memo::new(move |_| {
        table::parse(&data.get(), header.get())
            .map(|t| TableView {
                columns: t
                    .columns
                    .iter()
                    .map(|c| (c.name.clone(), c.kind.clone()))
                    .collect(),
                preview: (0..t.rows.min(6))
                    .map(|r| t.columns.iter().map(|c| c.cells[r].text.clone()).collect())
                    .collect(),
                rows: t.rows,
                delimiter: table::delimiter_name(t.delimiter),
                header: t.header,
            })
            .map_err(|e| e.0)
    });

    // Sets the columns from the detected layout of the table in the data box; false when
    // no layout could be detected.
    let apply_detected = move || -> bool {
        let Ok(t) = table::parse(&data.get_untracked(), header.get_untracked()) else {
            return false;
        };
        match columns::detect_layout(&t) {
            Ok(Layout::Long { value, group }) => {
                layout_kind.set("long".into());
                value_col.set(value);
                group_col.set(group);
                true
            }
            Ok(Layout::Wide { columns }) => {
                layout_kind.set("wide".into());
                col_a.set(columns[0].clone());
                col_b.set(columns[1].clone());
                true
            }
            _ => false,
        }
    };
    // Sets the design and its columns as a suggestion from the table's shape says.
    let apply_suggestion = move |sg: &suggest::Suggestion| {
        design.set(sg.design.clone());
        if let (Some(v), Some(g)) = (&sg.value, &sg.group) {
            layout_kind.set("long".into());
            value_col.set(v.clone());
            group_col.set(g.clone());
        }
        if let Some(st) = &sg.strata {
            strata_col.set(st.clone());
        }
        if let Some(u) = &sg.unit {
            unit_col.set(u.clone());
        }
        if sg.design == "yes-no" {
            yn_source.set("table".into());
        }
        if sg.design == "one-sample" {
            if let Some(v) = &sg.value {
                est_value.set(v.clone());
            }
        }
        if sg.columns.len() >= 2 && sg.group.is_none() {
            layout_kind.set("wide".into());
            col_a.set(sg.columns[0].clone());
            col_b.set(sg.columns[1].clone());
            est_x.set(sg.columns[0].clone());
            est_y.set(sg.columns[1].clone());
            k_columns.set(sg.columns.clone());
        }
        suggestion_note.set(format!(
            "Design set to {} from the table's shape: {}",
            design_label(&sg.design),
            sg.reason
        ));
        suggestion_alternatives.set(sg.alternatives.clone());
    };
    // Choose sensible columns whenever the table changes and the choice no longer fits.
    Effect::new(move |_| {
        let Ok(view) = parsed.get() else { return };
        let names: Vec<String> = view.columns.iter().map(|c| c.0.clone()).collect();
        let numeric: Vec<String> = view
            .columns
            .iter()
            .filter(|c| matches!(c.1, ColumnKind::Number | ColumnKind::NumberWithText))
            .map(|c| c.0.clone())
            .collect();
        let pick = |i: usize| numeric.get(i).or(names.get(i)).cloned().unwrap_or_default();
        if !names.contains(&est_value.get_untracked()) {
            est_value.set(pick(0));
        }
        if !names.contains(&plan_value.get_untracked()) {
            plan_value.set(pick(0));
        }
        if !names.contains(&est_x.get_untracked()) || !names.contains(&est_y.get_untracked()) {
            est_x.set(pick(0));
            est_y.set(pick(1));
        }
        if !est_strata.get_untracked().is_empty() && !names.contains(&est_strata.get_untracked()) {
            est_strata.set(String::new());
        }
        // A different table: suggest a design from its shape (a restored analysis has set
        // `shape_seen` already and keeps its own design).
        let shape = shape_of(&data.get_untracked(), header.get_untracked());
        if shape != shape_seen.get_untracked() {
            shape_seen.set(shape);
            if let Ok(t) = table::parse(&data.get_untracked(), header.get_untracked()) {
                if let Some(sg) = suggest::suggest(&t) {
                    apply_suggestion(&sg);
                    return;
                }
            }
        }
        let kc = k_columns.get_untracked();
        if kc.len() < 3 || kc.iter().any(|c| !names.contains(c)) {
            k_columns.set(numeric.clone());
        }
        if !strata_col.get_untracked().is_empty() && !names.contains(&strata_col.get_untracked()) {
            strata_col.set(String::new());
        }
        if !unit_col.get_untracked().is_empty() && !names.contains(&unit_col.get_untracked()) {
            unit_col.set(String::new());
        }
        let fits = match layout_kind.get_untracked().as_str() {
            "long" => {
                names.contains(&value_col.get_untracked())
                    && names.contains(&group_col.get_untracked())
            }
            _ => names.contains(&col_a.get_untracked()) && names.contains(&col_b.get_untracked()),
        };
        if fits {
            return;
        }
        if !apply_detected() {
            // Leave the choice to the user; pre-fill with the first columns.
            value_col.set(names.first().cloned().unwrap_or_default());
            group_col.set(names.get(1).cloned().unwrap_or_default());
            col_a.set(names.first().cloned().unwrap_or_default());
            col_b.set(names.get(1).cloned().unwrap_or_default());
        }
    });

    // The groups on offer: labels of the group column, or the two chosen columns.
    let levels = Memo::new(move |_| -> Vec<String> {
        if mode.get() == "compare" && design.get() == "yes-no" && yn_source.get() == "counts" {
            return parse_counts(&counts_text.get())
                .map(|g| g.into_iter().map(|c| c.name).collect())
                .unwrap_or_default();
        }
        if layout_kind.get() == "wide" {
            if mode.get() == "compare" && design.get() == "k-groups" {
                return k_columns.get();
            }
            return vec![col_a.get(), col_b.get()];
        }
        let Ok(t) = table::parse(&data.get(), header.get()) else {
            return vec![];
        };
        let Some(col) = t.columns.iter().find(|c| c.name == group_col.get()) else {
            return vec![];
        };
        let mut out: Vec<String> = Vec::new();
        for c in &col.cells {
            let l = c.text.trim();
            if !l.is_empty() && !out.iter().any(|o| o == l) {
                out.push(l.to_string());
            }
            if out.len() > 50 {
                break;
            }
        }
        out
    });
    Effect::new(move |_| {
        let lv = levels.get();
        if lv.is_empty() {
            return;
        }
        if !lv.contains(&first.get_untracked()) {
            first.set(lv[0].clone());
        }
        let f = first.get_untracked();
        let s = second.get_untracked();
        if !lv.contains(&s) || s == f {
            if let Some(other) = lv.iter().find(|l| **l != f) {
                second.set(other.clone());
            }
        }
    });

    // One-sided k-group comparisons need a control group.
    Effect::new(move |_| {
        if design.get() == "k-groups" && control.get().is_empty() {
            alternative.set(Alternative::TwoSided);
        }
    });
    let interval_choice = RwSignal::new("bca".to_string());
    let methods_from = |choice: &str| -> Vec<IntervalMethod> {
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
    };
    let build_request = move |seed_value: u64| -> Result<Request, String> {
        let mut r = Request::new(data.get_untracked(), seed_value);
        r.header = header.get_untracked();
        r.layout = if layout_kind.get_untracked() == "long" {
            Layout::Long {
                value: value_col.get_untracked(),
                group: group_col.get_untracked(),
            }
        } else {
            Layout::Wide {
                columns: vec![col_a.get_untracked(), col_b.get_untracked()],
            }
        };
        r.first = Some(first.get_untracked()).filter(|s| !s.is_empty());
        r.second = Some(second.get_untracked())
            .filter(|s| !s.is_empty() && layout_kind.get_untracked() == "long");
        r.statistic = statistic.get_untracked();
        r.alternative = alternative.get_untracked();
        r.two_sided = two_sided.get_untracked();
        r.keep_resamples = true;
        let ms = methods_from(&interval_choice.get_untracked());
        r.interval = ms[0];
        r.more_intervals = ms[1..].to_vec();
        r.resamples = parse_count("Random relabellings", &resamples.get_untracked())?;
        r.exact_limit = parse_count("Enumerate all splits up to", &exact_limit.get_untracked())?;
        r.bootstrap_resamples = parse_count("Bootstrap resamples", &bootstrap.get_untracked())?;
        let c = confidence.get_untracked();
        let level: f64 = c
            .trim()
            .trim_end_matches('%')
            .replace(',', ".")
            .parse()
            .map_err(|_| {
                format!(
                    "Confidence level: \"{c}\" is not a number; write it as a percentage, e.g. 95."
                )
            })?;
        r.confidence = if level > 1.0 { level / 100.0 } else { level };
        Ok(r)
    };
    let build_plan = move |seed_value: u64| -> Result<Job, String> {
        let num = |label: &str, text: String| -> Result<f64, String> {
            text.trim()
                .trim_end_matches('%')
                .replace(',', ".")
                .parse::<f64>()
                .map_err(|_| format!("{label}: \"{text}\" is not a number."))
        };
        let d = PlanDesign::from_key(&plan_design.get_untracked()).unwrap_or(PlanDesign::TwoGroups);
        let model = if d == PlanDesign::YesNo {
            PlanModel::Rates {
                baseline: num("Baseline rate", plan_baseline.get_untracked())?,
            }
        } else if plan_model.get_untracked() == "pilot" {
            PlanModel::Pilot {
                data: data.get_untracked(),
                header: header.get_untracked(),
                value: plan_value.get_untracked(),
                multiply: plan_multiply.get_untracked() && d == PlanDesign::TwoGroups,
            }
        } else {
            PlanModel::Normal {
                sd: num("Standard deviation", plan_sd.get_untracked())?,
            }
        };
        let effect = match d {
            PlanDesign::YesNo => {
                num("Yes rate in the treated group", plan_rate.get_untracked())?
                    - num("Baseline rate", plan_baseline.get_untracked())?
            }
            PlanDesign::KGroups => 1.0,
            _ => num("Effect to detect", plan_effect.get_untracked())?,
        };
        let mut r = PlanRequest::new(d, model, effect, seed_value);
        if d == PlanDesign::KGroups {
            r.means = plan_means
                .get_untracked()
                .split([',', ';', ' '])
                .filter(|t| !t.trim().is_empty())
                .map(|t| num("Group means", t.to_string()))
                .collect::<Result<Vec<f64>, String>>()?;
        }
        r.statistic = plan_stat.get_untracked();
        r.alpha = num("Significance level", plan_alpha.get_untracked())?;
        let pw = num("Target power", plan_power.get_untracked())?;
        r.target_power = if pw > 1.0 { pw / 100.0 } else { pw };
        r.alternative = plan_alt.get_untracked();
        r.studies = parse_count("Simulated studies per size", &plan_studies.get_untracked())?;
        r.relabellings = parse_count("Relabellings per study", &plan_relabellings.get_untracked())?;
        r.max_n = parse_count("Largest size to try", &plan_max_n.get_untracked())?;
        let m = plan_mde_n.get_untracked();
        r.mde_n = if m.trim().is_empty() {
            None
        } else {
            Some(parse_count("Size for the detectable effect", &m)?)
        };
        Ok(Job::Plan(r))
    };
    let build_job = move |seed_value: u64| -> Result<Job, String> {
        if mode.get_untracked() == "plan" {
            return build_plan(seed_value);
        }
        let base = build_request(seed_value)?;
        if mode.get_untracked() == "compare" {
            let d = design.get_untracked();
            if d == "two-groups" {
                return Ok(Job::Compare(base));
            }
            if d == "association" {
                let mut r = AssocRequest::new(
                    base.data,
                    est_x.get_untracked(),
                    est_y.get_untracked(),
                    seed_value,
                );
                r.header = base.header;
                r.statistic = assoc_stat.get_untracked();
                r.alternative = base.alternative;
                r.two_sided = base.two_sided;
                r.resamples = base.resamples;
                r.exact_limit = base.exact_limit;
                r.bootstrap_resamples = base.bootstrap_resamples;
                r.confidence = base.confidence;
                r.interval = base.interval;
                return Ok(Job::Association(r));
            }
            let settings = base.settings();
            if d == "k-groups" {
                let layout = if layout_kind.get_untracked() == "long" {
                    base.layout.clone()
                } else {
                    Layout::Wide {
                        columns: k_columns.get_untracked(),
                    }
                };
                let mut r = KGroupsRequest::new(base.data, layout, seed_value);
                r.header = base.header;
                r.statistic = k_stat.get_untracked();
                r.control = Some(control.get_untracked()).filter(|c| !c.is_empty());
                r.settings = settings;
                return Ok(Job::KGroups(r));
            }
            if d == "stratified" {
                if layout_kind.get_untracked() != "long" {
                    return Err("A stratified comparison needs one column of values, one naming each row's group and one naming its stratum: in step 1 choose \"One column of values and one column naming each row's group\".".into());
                }
                if strata_col.get_untracked().is_empty() {
                    return Err("Choose the column that names each row's stratum (site, batch or day), under Design.".into());
                }
                let mut r = StrataRequest::new(
                    base.data,
                    value_col.get_untracked(),
                    group_col.get_untracked(),
                    strata_col.get_untracked(),
                    seed_value,
                );
                r.header = base.header;
                r.first = base.first;
                r.second = base.second;
                r.weights = weights.get_untracked();
                r.settings = settings;
                return Ok(Job::Stratified(r));
            }
            if d == "yes-no" {
                let input = if yn_source.get_untracked() == "counts" {
                    YesNoInput::Counts {
                        groups: parse_counts(&counts_text.get_untracked())?,
                    }
                } else {
                    if layout_kind.get_untracked() != "long" {
                        return Err("Yes/no outcomes in a table need one column of outcomes and one naming each row's group: in step 1 choose \"One column of values and one column naming each row's group\", or type the counts instead.".into());
                    }
                    YesNoInput::Table {
                        value: value_col.get_untracked(),
                        group: group_col.get_untracked(),
                        first: base.first.clone(),
                        second: base.second.clone(),
                    }
                };
                let data = if matches!(input, YesNoInput::Counts { .. }) {
                    String::new()
                } else {
                    base.data
                };
                let mut r = YesNoRequest::new(data, input, seed_value);
                r.header = base.header;
                r.statistic = yn_stat.get_untracked();
                r.settings = settings;
                return Ok(Job::YesNo(r));
            }
            let layout = if d == "paired" {
                if layout_kind.get_untracked() == "wide" {
                    PairedLayout::Paired {
                        first: first.get_untracked(),
                        second: second.get_untracked(),
                    }
                } else {
                    if unit_col.get_untracked().is_empty() {
                        return Err("Paired data in long format need a column naming each unit (plant, patient, machine): choose it under Design, or put each measurement in its own column in step 1.".into());
                    }
                    PairedLayout::Long {
                        value: value_col.get_untracked(),
                        group: group_col.get_untracked(),
                        unit: unit_col.get_untracked(),
                        first: first.get_untracked(),
                        second: second.get_untracked(),
                    }
                }
            } else {
                let t = reference.get_untracked();
                let r: f64 = t
                    .trim()
                    .replace(',', ".")
                    .parse()
                    .map_err(|_| format!("Reference value: \"{t}\" is not a number."))?;
                PairedLayout::OneSample {
                    value: est_value.get_untracked(),
                    reference: r,
                }
            };
            let mut r = PairedRequest::new(base.data, layout, seed_value);
            r.header = base.header;
            r.statistic = flip_stat.get_untracked();
            r.alternative = base.alternative;
            r.two_sided = base.two_sided;
            r.resamples = base.resamples;
            r.bootstrap_resamples = base.bootstrap_resamples;
            r.confidence = base.confidence;
            r.interval = base.interval;
            return Ok(Job::Paired(r));
        }
        let e = est_kind.get_untracked();
        let layout = match e.kind() {
            Kind::One => EstimateLayout::One {
                value: est_value.get_untracked(),
                strata: Some(est_strata.get_untracked()).filter(|s| !s.is_empty()),
            },
            Kind::Two => EstimateLayout::Groups {
                layout: base.layout.clone(),
                first: base.first.clone(),
                second: base.second.clone(),
                paired: paired.get_untracked() && layout_kind.get_untracked() == "wide",
            },
            Kind::Association => EstimateLayout::Pairs {
                x: est_x.get_untracked(),
                y: est_y.get_untracked(),
            },
        };
        let mut r = EstimateRequest::new(base.data, layout, e, seed_value);
        r.header = base.header;
        r.confidence = base.confidence;
        r.resamples = base.bootstrap_resamples;
        r.methods = methods_from(&est_methods.get_untracked());
        r.side = side.get_untracked();
        r.keep_resamples = true;
        if e == Estimate::Quantile {
            let t = est_q.get_untracked();
            let v: f64 = t.trim().replace(',', ".").parse().map_err(|_| {
                format!("Quantile: \"{t}\" is not a number; write 0.9 for the 90th percentile.")
            })?;
            r.q = Some(if v > 1.0 { v / 100.0 } else { v });
        }
        Ok(Job::Estimate(r))
    };

    let run = move || {
        settings_error.set(String::new());
        let seed_text = seed.get_untracked();
        let seed_value = if seed_text.trim().is_empty() {
            let s = fresh_seed();
            seed.set(s.to_string());
            s
        } else {
            match parse_count("Seed", &seed_text) {
                Ok(s) => s,
                Err(e) => {
                    settings_error.set(e);
                    return;
                }
            }
        };
        let job = match build_job(seed_value) {
            Ok(r) => r,
            Err(e) => {
                settings_error.set(e);
                return;
            }
        };
        let text = match serde_json::to_string(&job) {
            Ok(t) => t,
            Err(e) => {
                settings_error.set(format!("The settings could not be encoded ({e})."));
                return;
            }
        };
        last_job.set(Some(job));
        status.set(Status::Starting);
        if let Err(e) = send_to_worker(sinks, text) {
            status.set(Status::Failed(e));
        }
    };
    let stop = move || {
        stop_worker();
        status.set(Status::Stopped);
    };

    let running =
        Memo::new(move |_| matches!(status.get(), Status::Starting | Status::Running { .. }));
    // Whether the shown result still matches the settings on screen.
    let stale = Memo::new(move |_| {
        let Some(last) = last_job.get() else {
            return false;
        };
        let _ = (
            data.get(),
            header.get(),
            layout_kind.get(),
            value_col.get(),
            group_col.get(),
            col_a.get(),
            col_b.get(),
            first.get(),
            second.get(),
            statistic.get(),
            alternative.get(),
            two_sided.get(),
            interval_choice.get(),
            resamples.get(),
            exact_limit.get(),
            bootstrap.get(),
            confidence.get(),
        );
        let _ = (
            mode.get(),
            est_kind.get(),
            est_q.get(),
            est_value.get(),
            est_strata.get(),
            est_x.get(),
            est_y.get(),
            paired.get(),
            side.get(),
            est_methods.get(),
        );
        let _ = (
            design.get(),
            reference.get(),
            flip_stat.get(),
            assoc_stat.get(),
        );
        let _ = (
            k_columns.get(),
            control.get(),
            k_stat.get(),
            strata_col.get(),
            unit_col.get(),
            weights.get(),
            yn_source.get(),
            counts_text.get(),
            yn_stat.get(),
        );
        let _ = (
            plan_design.get(),
            plan_model.get(),
            plan_sd.get(),
            plan_value.get(),
            plan_multiply.get(),
            plan_effect.get(),
            plan_means.get(),
            plan_baseline.get(),
            plan_rate.get(),
            plan_stat.get(),
            plan_alpha.get(),
            plan_power.get(),
            plan_alt.get(),
            plan_mde_n.get(),
        );
        let _ = (
            plan_studies.get(),
            plan_relabellings.get(),
            plan_max_n.get(),
        );
        let s = parse_count("Seed", &seed.get()).unwrap_or(last.seed());
        match build_job(s) {
            Ok(now) => now != last,
            Err(_) => true,
        }
    });

    // Share links, saved analysis files and the address bar.
    let link_error = RwSignal::new(String::new());
    let share_link = RwSignal::new(String::new());
    let share_note = RwSignal::new(String::new());
    let restore = move |job: Job| {
        let (base, seed_value) = match &job {
            Job::Compare(r) => (r.clone(), r.seed),
            Job::Estimate(r) => {
                let mut b = Request::new(r.data.clone(), r.seed);
                b.header = r.header;
                b.confidence = r.confidence;
                b.bootstrap_resamples = r.resamples;
                (b, r.seed)
            }
            Job::Paired(r) => {
                let mut b = Request::new(r.data.clone(), r.seed);
                b.header = r.header;
                b.confidence = r.confidence;
                b.bootstrap_resamples = r.bootstrap_resamples;
                b.resamples = r.resamples;
                (b, r.seed)
            }
            Job::Association(r) => {
                let mut b = Request::new(r.data.clone(), r.seed);
                b.header = r.header;
                b.confidence = r.confidence;
                b.bootstrap_resamples = r.bootstrap_resamples;
                b.resamples = r.resamples;
                (b, r.seed)
            }
            Job::KGroups(r) => (
                settings_request(&r.data, r.header, &r.settings),
                r.settings.seed,
            ),
            Job::Stratified(r) => (
                settings_request(&r.data, r.header, &r.settings),
                r.settings.seed,
            ),
            Job::YesNo(r) => (
                settings_request(&r.data, r.header, &r.settings),
                r.settings.seed,
            ),
            Job::Plan(r) => {
                // A plan from a pilot carries its table; otherwise the data box stays.
                let (d, h) = match &r.model {
                    PlanModel::Pilot { data, header, .. } => (data.clone(), *header),
                    _ => (data.get_untracked(), header.get_untracked()),
                };
                let mut b = Request::new(d, r.seed);
                b.header = h;
                (b, r.seed)
            }
        };
        // The restored table's shape is not a new table: keep the design the job names.
        shape_seen.set(shape_of(&base.data, base.header));
        data.set(base.data.clone());
        example.set(String::new());
        header.set(base.header);
        let set_layout = |l: &Layout| match l {
            Layout::Long { value, group } => {
                layout_kind.set("long".into());
                value_col.set(value.clone());
                group_col.set(group.clone());
            }
            Layout::Wide { columns } => {
                layout_kind.set("wide".into());
                col_a.set(columns.first().cloned().unwrap_or_default());
                col_b.set(columns.get(1).cloned().unwrap_or_default());
            }
            Layout::Detect => {
                // Resolve now, so that a run straight after restoring has its columns.
                apply_detected();
            }
        };
        let method_choice = |ms: &[IntervalMethod]| {
            if ms.len() == IntervalMethod::ALL.len() {
                "all".to_string()
            } else {
                ms.first()
                    .copied()
                    .unwrap_or(IntervalMethod::Bca)
                    .key()
                    .to_string()
            }
        };
        let apply_settings = |st: &TestSettings| {
            alternative.set(st.alternative);
            two_sided.set(st.two_sided);
            interval_choice.set(st.interval.key().to_string());
            resamples.set(st.resamples.to_string());
            exact_limit.set(st.exact_limit.to_string());
            bootstrap.set(st.bootstrap_resamples.to_string());
        };
        match &job {
            Job::Association(r) => {
                mode.set("compare".into());
                design.set("association".into());
                est_x.set(r.x.clone());
                est_y.set(r.y.clone());
                assoc_stat.set(r.statistic);
                alternative.set(r.alternative);
                two_sided.set(r.two_sided);
                interval_choice.set(r.interval.key().to_string());
                resamples.set(r.resamples.to_string());
                exact_limit.set(r.exact_limit.to_string());
                bootstrap.set(r.bootstrap_resamples.to_string());
            }
            Job::Paired(r) => {
                mode.set("compare".into());
                flip_stat.set(r.statistic);
                alternative.set(r.alternative);
                two_sided.set(r.two_sided);
                interval_choice.set(r.interval.key().to_string());
                resamples.set(r.resamples.to_string());
                bootstrap.set(r.bootstrap_resamples.to_string());
                match &r.layout {
                    PairedLayout::Paired {
                        first: f,
                        second: s2,
                    } => {
                        design.set("paired".into());
                        layout_kind.set("wide".into());
                        col_a.set(f.clone());
                        col_b.set(s2.clone());
                        first.set(f.clone());
                        second.set(s2.clone());
                    }
                    PairedLayout::Long {
                        value,
                        group,
                        unit,
                        first: f,
                        second: s2,
                    } => {
                        design.set("paired".into());
                        layout_kind.set("long".into());
                        value_col.set(value.clone());
                        group_col.set(group.clone());
                        unit_col.set(unit.clone());
                        first.set(f.clone());
                        second.set(s2.clone());
                    }
                    PairedLayout::OneSample {
                        value,
                        reference: rv,
                    } => {
                        design.set("one-sample".into());
                        est_value.set(value.clone());
                        reference.set(format!("{rv}"));
                    }
                }
            }
            Job::Compare(r) => {
                mode.set("compare".into());
                design.set("two-groups".into());
                set_layout(&r.layout);
                if let Some(f) = &r.first {
                    first.set(f.clone());
                }
                if let Some(s2) = &r.second {
                    second.set(s2.clone());
                }
                statistic.set(r.statistic);
                alternative.set(r.alternative);
                two_sided.set(r.two_sided);
                let ms: Vec<IntervalMethod> = std::iter::once(r.interval)
                    .chain(r.more_intervals.iter().copied())
                    .collect();
                interval_choice.set(method_choice(&ms));
                resamples.set(r.resamples.to_string());
                exact_limit.set(r.exact_limit.to_string());
                bootstrap.set(r.bootstrap_resamples.to_string());
            }
            Job::KGroups(r) => {
                mode.set("compare".into());
                design.set("k-groups".into());
                apply_settings(&r.settings);
                k_stat.set(r.statistic);
                control.set(r.control.clone().unwrap_or_default());
                match &r.layout {
                    Layout::Wide { columns } => {
                        layout_kind.set("wide".into());
                        k_columns.set(columns.clone());
                    }
                    l => set_layout(l),
                }
            }
            Job::Stratified(r) => {
                mode.set("compare".into());
                design.set("stratified".into());
                apply_settings(&r.settings);
                layout_kind.set("long".into());
                value_col.set(r.value.clone());
                group_col.set(r.group.clone());
                strata_col.set(r.strata.clone());
                weights.set(r.weights);
                if let Some(f) = &r.first {
                    first.set(f.clone());
                }
                if let Some(s2) = &r.second {
                    second.set(s2.clone());
                }
            }
            Job::YesNo(r) => {
                mode.set("compare".into());
                design.set("yes-no".into());
                apply_settings(&r.settings);
                yn_stat.set(r.statistic);
                match &r.input {
                    YesNoInput::Table {
                        value,
                        group,
                        first: f,
                        second: s2,
                    } => {
                        yn_source.set("table".into());
                        layout_kind.set("long".into());
                        value_col.set(value.clone());
                        group_col.set(group.clone());
                        if let Some(f) = f {
                            first.set(f.clone());
                        }
                        if let Some(s2) = s2 {
                            second.set(s2.clone());
                        }
                    }
                    YesNoInput::Counts { groups } => {
                        yn_source.set("counts".into());
                        counts_text.set(
                            groups
                                .iter()
                                .map(|g| format!("{}: {}/{}", g.name, g.yes, g.n))
                                .collect::<Vec<_>>()
                                .join(", "),
                        );
                    }
                }
            }
            Job::Plan(r) => {
                mode.set("plan".into());
                plan_design.set(r.design.key().into());
                match &r.model {
                    PlanModel::Normal { sd } => {
                        plan_model.set("normal".into());
                        plan_sd.set(format!("{sd}"));
                    }
                    PlanModel::Pilot {
                        value, multiply, ..
                    } => {
                        plan_model.set("pilot".into());
                        plan_value.set(value.clone());
                        plan_multiply.set(*multiply);
                    }
                    PlanModel::Rates { baseline } => {
                        plan_baseline.set(format!("{baseline}"));
                        plan_rate.set(format!("{}", baseline + r.effect));
                    }
                }
                if r.design != PlanDesign::YesNo && r.design != PlanDesign::KGroups {
                    plan_effect.set(format!("{}", r.effect));
                }
                if !r.means.is_empty() {
                    plan_means.set(
                        r.means
                            .iter()
                            .map(|m| format!("{}", m * r.effect))
                            .collect::<Vec<_>>()
                            .join(", "),
                    );
                }
                plan_stat.set(r.statistic.clone());
                plan_alpha.set(format!("{}", r.alpha));
                plan_power.set(format!("{}", (r.target_power * 1e6).round() / 1e4));
                plan_alt.set(r.alternative);
                plan_studies.set(r.studies.to_string());
                plan_relabellings.set(r.relabellings.to_string());
                plan_max_n.set(r.max_n.to_string());
                plan_mde_n.set(r.mde_n.map(|n| n.to_string()).unwrap_or_default());
            }
            Job::Estimate(r) => {
                mode.set("estimate".into());
                est_kind.set(r.estimate);
                if let Some(q) = r.q {
                    est_q.set(format!("{q}"));
                }
                match &r.layout {
                    EstimateLayout::One { value, strata } => {
                        est_value.set(value.clone());
                        est_strata.set(strata.clone().unwrap_or_default());
                    }
                    EstimateLayout::Groups {
                        layout,
                        first: f,
                        second: s2,
                        paired: p,
                    } => {
                        set_layout(layout);
                        if let Some(f) = f {
                            first.set(f.clone());
                        }
                        if let Some(s2) = s2 {
                            second.set(s2.clone());
                        }
                        paired.set(*p);
                    }
                    EstimateLayout::Pairs { x, y } => {
                        est_x.set(x.clone());
                        est_y.set(y.clone());
                    }
                }
                est_methods.set(method_choice(&r.methods));
                side.set(r.side);
                bootstrap.set(r.resamples.to_string());
            }
        }
        confidence.set(format!("{}", (base.confidence * 1e6).round() / 1e4));
        seed.set(seed_value.to_string());
    };
    let has_data = move |job: &Job| job.has_data();
    // Open the analysis in the address, if any.
    let opened_from_link = {
        let frag = share::fragment();
        if frag.is_empty() {
            false
        } else {
            match link::decode(&frag) {
                Ok(job) => {
                    let full = has_data(&job);
                    restore(job);
                    if !full {
                        link_error.set("This link holds the settings only: paste the data in step 1, then run the analysis.".into());
                    }
                    full
                }
                Err(e) => {
                    link_error.set(format!(
                        "{e} The page has opened with the example data instead."
                    ));
                    false
                }
            }
        }
    };
    if opened_from_link {
        run();
    } else if seed.get_untracked().is_empty() {
        // A seed from the start, so the address bar is a working link at once.
        seed.set(fresh_seed().to_string());
    }
    // Keep the address bar a working link once a seed is set.
    Effect::new(move |_| {
        let _ = (stale.get(), seed.get(), data.get());
        if seed.get().trim().is_empty() {
            return;
        }
        if let Ok(s2) = parse_count("Seed", &seed.get()) {
            if let Ok(job) = build_job(s2) {
                share::set_fragment(&link::encode(&job));
            }
        }
    });
    let job_for_sharing = move || -> Option<Job> { last_job.get_untracked() };
    let copy_link = move |settings_only: bool| {
        let Some(job) = job_for_sharing() else { return };
        let job = if settings_only {
            link::without_data(&job)
        } else {
            job
        };
        let l = link::link(&share::base_url(), &job);
        share::copy(&l);
        share_note.set(if settings_only {
            "Settings-only link copied (the collaborator pastes the data). It is also shown below.".into()
        } else if l.len() > link::LONG_LINK {
            format!(
                "This link is {} characters long; chat and mail programs often cut links over {}. Copy a settings-only link, or save the analysis as a file and send that.",
                fmt::count(l.len() as u64),
                fmt::count(link::LONG_LINK as u64)
            )
        } else {
            "Link copied. It contains the data itself: share it only with people who may see the data.".into()
        });
        share_link.set(l);
    };
    let save_job = move || {
        if let Some(job) = job_for_sharing() {
            let text = serde_json::to_string_pretty(&job).unwrap_or_default();
            let _ = share::download("reshuffle-analysis.json", "application/json", &text);
        }
    };
    let open_job_file = move |file: web_sys::File| {
        let name = file.name();
        let promise = file.text();
        leptos::task::spawn_local(async move {
            let Ok(v) = wasm_bindgen_futures::JsFuture::from(promise).await else {
                link_error.set(format!("\"{name}\" could not be read."));
                return;
            };
            let text = v.as_string().unwrap_or_default();
            match serde_json::from_str::<Job>(&text) {
                Ok(job) => {
                    link_error.set(String::new());
                    restore(job);
                    file_note.set(format!(
                        "Opened the analysis saved in \"{name}\"; run it to see the findings."
                    ));
                }
                Err(e) => link_error.set(format!(
                    "\"{name}\" is not a saved Reshuffle analysis ({e}). Nothing was changed."
                )),
            }
        });
    };

    let load_text = move |text: String, note: String| {
        data.set(text);
        file_note.set(note);
        example.set(String::new());
    };

    let on_drop = move |ev: web_sys::DragEvent| {
        ev.prevent_default();
        let Some(dt) = ev.data_transfer() else { return };
        let Some(files) = dt.files() else { return };
        if let Some(file) = files.get(0) {
            read_file(file, load_text, file_note);
        }
    };

    let column_options = move || parsed.get().map(|v| v.columns).unwrap_or_default();

    view! {
        <header class="masthead">
            <h1>"Reshuffle"</h1>
            <p class="tagline">"Compare groups, pairs and yes/no outcomes by relabelling and resampling — computed in this browser tab."</p>
        </header>
        <main>
            <section class="step" aria-labelledby="step-data">
                <h2 id="step-data"><span class="step-no">"1"</span>" The data"</h2>
                <p class="error" role="alert" id="link-error">{move || link_error.get()}</p>
                <p class="privacy">
                    "Your data stays on this computer: it is read and analysed inside this page, and nothing is uploaded. "
                    "A share link carries the data itself (in the part after #, which browsers do not send to servers): treat a link like the data."
                </p>
                <div class="data-inputs">
                    <label for="example">"Start from an example"</label>
                    <select id="example" on:change=move |ev| {
                        let key = event_target_value(&ev);
                        if let Some(ex) = EXAMPLES.iter().find(|e| e.0 == key) {
                            data.set(ex.2.to_string());
                            file_note.set(String::new());
                        }
                        example.set(key);
                    }>
                        <option value="" selected=move || example.get().is_empty()>"(your own data)"</option>
                        {EXAMPLES.iter().map(|(key, label, _)| {
                            let key = key.to_string();
                            let k2 = key.clone();
                            view! { <option value=key selected=move || example.get() == k2>{*label}</option> }
                        }).collect_view()}
                    </select>
                    <label class="file-pick">
                        "Open a file (.csv, .tsv, .txt)"
                        <input type="file" accept=".csv,.tsv,.txt,text/csv,text/plain,text/tab-separated-values"
                            on:change=move |ev| {
                                let input: web_sys::HtmlInputElement = event_target(&ev);
                                if let Some(file) = input.files().and_then(|f| f.get(0)) {
                                    read_file(file, load_text, file_note);
                                }
                                input.set_value("");
                            }/>
                    </label>
                </div>
                <label class="file-pick">
                    "Open a saved analysis (.json)"
                    <input type="file" id="open-analysis" accept=".json,application/json"
                        on:change=move |ev| {
                            let input: web_sys::HtmlInputElement = event_target(&ev);
                            if let Some(file) = input.files().and_then(|f| f.get(0)) {
                                open_job_file(file);
                            }
                            input.set_value("");
                        }/>
                </label>
                <label for="data" class="block-label">"Paste a table here (from a spreadsheet, or comma-, semicolon- or tab-separated text), or drop a file on it"</label>
                <textarea id="data" rows="10" spellcheck="false"
                    prop:value=move || data.get()
                    on:input=move |ev| { data.set(event_target_value(&ev)); example.set(String::new()); }
                    on:dragover=move |ev: web_sys::DragEvent| ev.prevent_default()
                    on:drop=on_drop></textarea>
                <p class="file-note" aria-live="polite">{move || file_note.get()}</p>
                <div class="row">
                    <label for="header">"First row"</label>
                    <select id="header" on:change=move |ev| header.set(match event_target_value(&ev).as_str() {
                        "names" => HeaderChoice::Names,
                        "data" => HeaderChoice::Data,
                        _ => HeaderChoice::Detect,
                    })>
                        <option value="detect">"decide from the data"</option>
                        <option value="names">"holds column names"</option>
                        <option value="data">"holds data"</option>
                    </select>
                </div>
                {move || match parsed.get() {
                    Err(e) => view! { <p class="error" role="alert" id="data-error">{e}</p> }.into_any(),
                    Ok(v) => view! {
                        <div class="preview" id="preview">
                            <p class="meta">{format!("{} rows, {} columns, {}-separated{}.", v.rows, v.columns.len(), v.delimiter,
                                if v.header { ", names from the first row" } else { "" })}</p>
                            <div class="table-scroll" tabindex="0" role="region" aria-label="Preview of the table">
                            <table>
                                <thead>
                                    <tr>{v.columns.iter().map(|(n, _)| view! { <th scope="col">{n.clone()}</th> }).collect_view()}</tr>
                                    <tr class="kinds">{v.columns.iter().map(|(_, k)| view! { <td>{kind_label(k)}</td> }).collect_view()}</tr>
                                </thead>
                                <tbody>
                                    {v.preview.iter().map(|r| view! {
                                        <tr>{r.iter().map(|c| view! { <td>{c.clone()}</td> }).collect_view()}</tr>
                                    }).collect_view()}
                                </tbody>
                            </table>
                            </div>
                        </div>
                    }.into_any(),
                }}
                <fieldset class="layout">
                    <legend>"Where are the groups?"</legend>
                    <label class="choice">
                        <input type="radio" name="layout" value="long" prop:checked=move || layout_kind.get() == "long"
                            on:change=move |_| layout_kind.set("long".into())/>
                        "One column of values and one column naming each row's group"
                    </label>
                    <label class="choice">
                        <input type="radio" name="layout" value="wide" prop:checked=move || layout_kind.get() == "wide"
                            on:change=move |_| layout_kind.set("wide".into())/>
                        "Each group in its own column"
                    </label>
                    {move || if layout_kind.get() == "long" {
                        view! {
                            <div class="row">
                                <label for="value-col">"Values"</label>
                                <ColumnSelect id="value-col" options=Signal::derive(column_options) chosen=value_col/>
                                <label for="group-col">"Groups"</label>
                                <ColumnSelect id="group-col" options=Signal::derive(column_options) chosen=group_col/>
                            </div>
                        }.into_any()
                    } else {
                        view! {
                            <div class="row">
                                <label for="col-a">"Group column"</label>
                                <ColumnSelect id="col-a" options=Signal::derive(column_options) chosen=col_a/>
                                <label for="col-b">"and"</label>
                                <ColumnSelect id="col-b" options=Signal::derive(column_options) chosen=col_b/>
                            </div>
                        }.into_any()
                    }}
                </fieldset>
            </section>

            <section class="step" aria-labelledby="step-question">
                <h2 id="step-question"><span class="step-no">"2"</span>" The question"</h2>
                <fieldset>
                    <legend>"What do you want to know?"</legend>
                    <label class="choice">
                        <input type="radio" name="mode" value="compare" prop:checked=move || mode.get() == "compare"
                            on:change=move |_| mode.set("compare".into())/>
                        "Whether groups differ or two variables are associated, and by how much (permutation test and interval)"
                    </label>
                    <label class="choice">
                        <input type="radio" name="mode" id="mode-estimate" value="estimate" prop:checked=move || mode.get() == "estimate"
                            on:change=move |_| mode.set("estimate".into())/>
                        "How large something is, with a confidence interval (bootstrap only, no test)"
                    </label>
                    <label class="choice">
                        <input type="radio" name="mode" id="mode-plan" value="plan" prop:checked=move || mode.get() == "plan"
                            on:change=move |_| mode.set("plan".into())/>
                        "How many units a new study needs, or what it could detect (power by simulation)"
                    </label>
                </fieldset>
                <div class="plan-options" id="plan-options" style:display=move || if mode.get() == "plan" { "block" } else { "none" }>
                    <div class="row">
                        <label for="plan-design">"The study will compare"</label>
                        <select id="plan-design" on:change=move |ev| { plan_design.set(event_target_value(&ev)); plan_stat.set(String::new()); }>
                            <option value="two-groups" selected=move || plan_design.get() == "two-groups">"two independent groups"</option>
                            <option value="paired" selected=move || plan_design.get() == "paired">"paired measurements"</option>
                            <option value="k-groups" selected=move || plan_design.get() == "k-groups">"three or more groups"</option>
                            <option value="yes-no" selected=move || plan_design.get() == "yes-no">"yes/no outcomes in two groups"</option>
                        </select>
                        <label for="plan-stat">"measured by"</label>
                        <select id="plan-stat" on:change=move |ev| plan_stat.set(event_target_value(&ev))>
                            {move || {
                                let opts: Vec<(&str, &str)> = match plan_design.get().as_str() {
                                    "paired" => vec![("mean", "the mean difference"), ("median", "the median difference")],
                                    "k-groups" => vec![("f", "F statistic"), ("welch-f", "Welch F"), ("median-spread", "spread of the medians")],
                                    "yes-no" => vec![("proportion-difference", "difference in proportions (exact test)")],
                                    _ => vec![("mean-difference", "difference in means"), ("welch-t", "Welch t"), ("median-difference", "difference in medians"), ("trimmed-mean-difference", "difference in 20% trimmed means")],
                                };
                                opts.into_iter().map(|(k, l)| view! {
                                    <option value=k selected=move || plan_stat.get() == k>{l}</option>
                                }).collect_view()
                            }}
                        </select>
                    </div>
                    <fieldset style:display=move || if plan_design.get() == "yes-no" { "none" } else { "block" }>
                        <legend>"What the data will look like"</legend>
                        <label class="choice">
                            <input type="radio" name="plan-model" value="normal" prop:checked=move || plan_model.get() == "normal"
                                on:change=move |_| plan_model.set("normal".into())/>
                            "Normal values with a standard deviation of "
                            <input id="plan-sd" inputmode="decimal" size="6" aria-label="Standard deviation" prop:value=move || plan_sd.get()
                                on:input=move |ev| plan_sd.set(event_target_value(&ev))/>
                            {move || if plan_design.get() == "paired" { " (of the differences)" } else { "" }}
                        </label>
                        <label class="choice">
                            <input type="radio" name="plan-model" value="pilot" id="plan-pilot-choice" prop:checked=move || plan_model.get() == "pilot"
                                on:change=move |_| plan_model.set("pilot".into())/>
                            "Like the pilot values in column "
                        </label>
                        <div class="row" style:display=move || if plan_model.get() == "pilot" { "flex" } else { "none" }>
                            <ColumnSelect id="plan-value" options=Signal::derive(column_options) chosen=plan_value/>
                            <label class="choice inline" style:display=move || if plan_design.get() == "two-groups" { "inline" } else { "none" }>
                                <input type="checkbox" id="plan-multiply" prop:checked=move || plan_multiply.get()
                                    on:change=move |ev| plan_multiply.set(event_target_checked(&ev))/>
                                " the effect multiplies the values (a ratio; positive data)"
                            </label>
                        </div>
                        <p class="hint" style:display=move || if plan_model.get() == "pilot" { "block" } else { "none" }>
                            "Each simulated group is drawn from these values (centred at their mean), with the assumed effect added to (or multiplying) the treated group's values. For paired data the column holds pilot differences."
                        </p>
                    </fieldset>
                    <div class="row" style:display=move || if matches!(plan_design.get().as_str(), "two-groups" | "paired") { "flex" } else { "none" }>
                        <label for="plan-effect">{move || if plan_multiply.get() && plan_model.get() == "pilot" && plan_design.get() == "two-groups" { "Ratio to detect (treated / reference)" } else if plan_design.get() == "paired" { "Mean difference to detect" } else { "Difference in means to detect (treated − reference)" }}</label>
                        <input id="plan-effect" inputmode="decimal" size="8" prop:value=move || plan_effect.get()
                            on:input=move |ev| plan_effect.set(event_target_value(&ev))/>
                    </div>
                    <div class="row" style:display=move || if plan_design.get() == "k-groups" { "flex" } else { "none" }>
                        <label for="plan-means">"Assumed group means"</label>
                        <input id="plan-means" size="24" prop:value=move || plan_means.get()
                            on:input=move |ev| plan_means.set(event_target_value(&ev))/>
                        <span class="hint">"one per group, e.g. 0, 0, 0.5"</span>
                    </div>
                    <div class="row" style:display=move || if plan_design.get() == "yes-no" { "flex" } else { "none" }>
                        <label for="plan-baseline">"Yes rate in the reference group"</label>
                        <input id="plan-baseline" inputmode="decimal" size="6" prop:value=move || plan_baseline.get()
                            on:input=move |ev| plan_baseline.set(event_target_value(&ev))/>
                        <label for="plan-rate">"and in the treated group"</label>
                        <input id="plan-rate" inputmode="decimal" size="6" prop:value=move || plan_rate.get()
                            on:input=move |ev| plan_rate.set(event_target_value(&ev))/>
                    </div>
                    <div class="row">
                        <label for="plan-alpha">"Significance level"</label>
                        <input id="plan-alpha" inputmode="decimal" size="6" prop:value=move || plan_alpha.get()
                            on:input=move |ev| plan_alpha.set(event_target_value(&ev))/>
                        <label for="plan-alt">"test"</label>
                        <select id="plan-alt" on:change=move |ev| {
                            if let Some(a) = Alternative::from_key(&event_target_value(&ev)) { plan_alt.set(a) }
                        }>
                            <option value="two-sided" selected=move || plan_alt.get() == Alternative::TwoSided>"two-sided"</option>
                            <option value="greater" selected=move || plan_alt.get() == Alternative::Greater>"one-sided: treated higher"</option>
                            <option value="less" selected=move || plan_alt.get() == Alternative::Less>"one-sided: treated lower"</option>
                        </select>
                        <label for="plan-power">"Target power (%)"</label>
                        <input id="plan-power" inputmode="decimal" size="5" prop:value=move || plan_power.get()
                            on:input=move |ev| plan_power.set(event_target_value(&ev))/>
                    </div>
                    <div class="row">
                        <label for="plan-mde-n">"Also: the smallest effect detectable with this many units per group"</label>
                        <input id="plan-mde-n" inputmode="numeric" size="7" placeholder="(optional)" prop:value=move || plan_mde_n.get()
                            on:input=move |ev| plan_mde_n.set(event_target_value(&ev))/>
                    </div>
                    <details class="settings">
                        <summary>"Simulation settings"</summary>
                        <div class="grid">
                            <label for="plan-studies">"Simulated studies per sample size"</label>
                            <input id="plan-studies" inputmode="numeric" prop:value=move || plan_studies.get()
                                on:input=move |ev| plan_studies.set(event_target_value(&ev))/>
                            <label for="plan-relabellings">"Random relabellings per simulated study"</label>
                            <input id="plan-relabellings" inputmode="numeric" prop:value=move || plan_relabellings.get()
                                on:input=move |ev| plan_relabellings.set(event_target_value(&ev))/>
                            <label for="plan-max-n">"Largest sample size to try"</label>
                            <input id="plan-max-n" inputmode="numeric" prop:value=move || plan_max_n.get()
                                on:input=move |ev| plan_max_n.set(event_target_value(&ev))/>
                        </div>
                        <p class="hint">"Power is estimated from simulated studies, each analysed with a modest number of relabellings: fewer relabellings and studies run faster but add simulation error and lose a little power. The findings say what was traded."</p>
                    </details>
                </div>
                <div class="estimate-options" style:display=move || if mode.get() == "estimate" { "block" } else { "none" }>
                    <div class="row">
                        <label for="est-kind">"Estimate"</label>
                        <select id="est-kind" on:change=move |ev| {
                            if let Some(e) = Estimate::from_key(&event_target_value(&ev)) { est_kind.set(e) }
                        }>
                            {[("One column", Kind::One), ("Two groups", Kind::Two), ("Two columns as pairs (association)", Kind::Association)]
                                .into_iter().map(|(group_label, kind)| view! {
                                    <optgroup label=group_label>
                                        {Estimate::ALL.into_iter().filter(|e| e.kind() == kind).map(|e| {
                                            let label = if e == Estimate::Quantile { "quantile (percentile)".to_string() } else { e.label(0.5) };
                                            view! { <option value=e.key() selected=move || est_kind.get() == e>{label}</option> }
                                        }).collect_view()}
                                    </optgroup>
                                }).collect_view()}
                        </select>
                        <span style:display=move || if est_kind.get() == Estimate::Quantile { "inline" } else { "none" }>
                            <label for="est-q">" at "</label>
                            <input id="est-q" inputmode="decimal" size="5" prop:value=move || est_q.get()
                                on:input=move |ev| est_q.set(event_target_value(&ev))/>
                            " (0.9 = 90th percentile)"
                        </span>
                    </div>
                    <div class="row" style:display=move || if est_kind.get().kind() == Kind::One { "flex" } else { "none" }>
                        <label for="est-value">"Values"</label>
                        <ColumnSelect id="est-value" options=Signal::derive(column_options) chosen=est_value/>
                        <label for="est-strata">"Resample within strata of"</label>
                        <select id="est-strata" on:change=move |ev| est_strata.set(event_target_value(&ev))>
                            <option value="" selected=move || est_strata.get().is_empty()>"(no strata)"</option>
                            {move || column_options().into_iter().map(|(name, _)| {
                                let (n2, n3) = (name.clone(), name.clone());
                                view! { <option value=n3 selected=move || est_strata.get() == n2>{name}</option> }
                            }).collect_view()}
                        </select>
                    </div>
                    <p class="hint" style:display=move || if est_kind.get().kind() == Kind::One && layout_kind.get() == "long" { "block" } else { "none" }>
                        "Every value in this column is used, whatever its group. To estimate within one group, paste only that group's rows."
                    </p>
                    <div class="row" style:display=move || if est_kind.get().kind() == Kind::Association { "flex" } else { "none" }>
                        <label for="est-x">"x"</label>
                        <ColumnSelect id="est-x" options=Signal::derive(column_options) chosen=est_x/>
                        <label for="est-y">"y"</label>
                        <ColumnSelect id="est-y" options=Signal::derive(column_options) chosen=est_y/>
                    </div>
                    <div class="row" style:display=move || if est_kind.get().kind() == Kind::Two && layout_kind.get() == "wide" { "flex" } else { "none" }>
                        <label class="choice">
                            <input type="checkbox" id="paired" prop:checked=move || paired.get()
                                on:change=move |ev| paired.set(event_target_checked(&ev))/>
                            " Paired: each row is one unit measured in both columns (resample whole rows)"
                        </label>
                    </div>
                    <div class="row">
                        <label for="est-methods">"Interval method"</label>
                        <select id="est-methods" on:change=move |ev| est_methods.set(event_target_value(&ev))>
                            <option value="all" selected=true>"all five, side by side (BCa first)"</option>
                            <option value="bca">"BCa (bias-corrected and accelerated)"</option>
                            <option value="percentile">"percentile"</option>
                            <option value="basic">"basic (reverse percentile)"</option>
                            <option value="normal">"normal, with bootstrap SE"</option>
                            <option value="studentized">"studentized (bootstrap-t)"</option>
                        </select>
                        <label for="side">"Give"</label>
                        <select id="side" on:change=move |ev| {
                            if let Some(x) = Side::from_key(&event_target_value(&ev)) { side.set(x) }
                        }>
                            <option value="two-sided">"a two-sided interval"</option>
                            <option value="lower">"a lower bound only"</option>
                            <option value="upper">"an upper bound only"</option>
                        </select>
                    </div>
                </div>
                <div class="row" style:display=move || if mode.get() == "compare" { "flex" } else { "none" }>
                    <label for="design">"Design"</label>
                    <select id="design" on:change=move |ev| design.set(event_target_value(&ev))>
                        <option value="two-groups" selected=move || design.get() == "two-groups">"two independent groups"</option>
                        <option value="paired" selected=move || design.get() == "paired">"paired: each unit measured twice (one column per measurement)"</option>
                        <option value="one-sample" selected=move || design.get() == "one-sample">"one sample against a reference value"</option>
                        <option value="association" selected=move || design.get() == "association">"association between two numeric columns"</option>
                        <option value="k-groups" selected=move || design.get() == "k-groups">"three or more independent groups"</option>
                        <option value="stratified" selected=move || design.get() == "stratified">"two groups compared within strata (site, batch, day)"</option>
                        <option value="yes-no" selected=move || design.get() == "yes-no">"yes/no outcomes in two groups"</option>
                    </select>
                </div>
                <div class="suggestion" id="suggestion" aria-live="polite" style:display=move || if mode.get() == "compare" && !suggestion_note.get().is_empty() { "block" } else { "none" }>
                    <p class="hint">{move || suggestion_note.get()}</p>
                    {move || {
                        let alts = suggestion_alternatives.get();
                        (!alts.is_empty()).then(|| view! {
                            <div class="share-buttons" role="group" aria-label="Other designs that fit this table">
                                <span class="hint">"Or is it: "</span>
                                {alts.into_iter().map(|a| {
                                    let a2 = a.clone();
                                    view! {
                                        <button type="button" class="secondary" data-design=a.clone()
                                            on:click=move |_| design.set(a2.clone())>{design_label(&a)}</button>
                                    }
                                }).collect_view()}
                            </div>
                        })
                    }}
                </div>
                <div class="design-options" id="k-options" style:display=move || if mode.get() == "compare" && design.get() == "k-groups" { "block" } else { "none" }>
                    <fieldset style:display=move || if layout_kind.get() == "wide" { "block" } else { "none" }>
                        <legend>"Groups (one column each)"</legend>
                        {move || column_options().into_iter().filter(|(_, k)| matches!(k, ColumnKind::Number | ColumnKind::NumberWithText)).map(|(name, _)| {
                            let (n2, n3) = (name.clone(), name.clone());
                            view! {
                                <label class="choice inline">
                                    <input type="checkbox" value=name.clone()
                                        prop:checked=move || k_columns.get().contains(&n2)
                                        on:change=move |ev| {
                                            let on = event_target_checked(&ev);
                                            k_columns.update(|v| {
                                                v.retain(|c| *c != n3);
                                                if on { v.push(n3.clone()) }
                                            });
                                        }/>
                                    {name}
                                </label>
                            }
                        }).collect_view()}
                    </fieldset>
                    <div class="row">
                        <label for="k-stat">"Measure the differences by"</label>
                        <select id="k-stat" on:change=move |ev| {
                            if let Some(x) = KStatistic::from_key(&event_target_value(&ev)) { k_stat.set(x) }
                        }>
                            <option value="f" selected=move || k_stat.get() == KStatistic::F>"F statistic (spread of the group means)"</option>
                            <option value="welch-f" selected=move || k_stat.get() == KStatistic::WelchF>"Welch F (allows unequal spreads)"</option>
                            <option value="median-spread" selected=move || k_stat.get() == KStatistic::MedianSpread>"spread of the group medians"</option>
                        </select>
                        <label for="control">"Follow-up comparisons"</label>
                        <select id="control" on:change=move |ev| control.set(event_target_value(&ev))>
                            <option value="" selected=move || control.get().is_empty()>"every pair of groups"</option>
                            {move || levels.get().into_iter().map(|l| {
                                let (l2, l3) = (l.clone(), l.clone());
                                view! { <option value=l3 selected=move || control.get() == l2>{format!("each group against {l}")}</option> }
                            }).collect_view()}
                        </select>
                    </div>
                </div>
                <div class="design-options" id="strata-options" style:display=move || if mode.get() == "compare" && design.get() == "stratified" { "block" } else { "none" }>
                    <div class="row">
                        <label for="strata-col">"Strata (site, batch, day) in column"</label>
                        <select id="strata-col" on:change=move |ev| strata_col.set(event_target_value(&ev))>
                            <option value="" selected=move || strata_col.get().is_empty()>"(choose a column)"</option>
                            {move || column_options().into_iter().map(|(name, kind)| {
                                let (n2, n3) = (name.clone(), name.clone());
                                let label = format!("{name} ({})", kind_label(&kind));
                                view! { <option value=n3 selected=move || strata_col.get() == n2>{label}</option> }
                            }).collect_view()}
                        </select>
                        <label for="weights">"Average the stratum differences"</label>
                        <select id="weights" on:change=move |ev| {
                            if let Some(w) = StrataWeights::from_key(&event_target_value(&ev)) { weights.set(w) }
                        }>
                            <option value="size" selected=move || weights.get() == StrataWeights::Size>"weighted by stratum size"</option>
                            <option value="precision" selected=move || weights.get() == StrataWeights::Precision>"weighted for precision: n1·n2/(n1 + n2)"</option>
                        </select>
                    </div>
                    <p class="hint">"Labels are shuffled only within each stratum. When the strata differ in level and the groups are spread unevenly over them, ignoring the strata mixes the strata's difference into the groups' difference and can even reverse its sign; comparing within strata removes it. The findings show the difference with the strata ignored, for contrast."</p>
                </div>
                <div class="design-options" id="yes-no-options" style:display=move || if mode.get() == "compare" && design.get() == "yes-no" { "block" } else { "none" }>
                    <fieldset>
                        <legend>"Where are the outcomes?"</legend>
                        <label class="choice">
                            <input type="radio" name="yn-source" value="table" prop:checked=move || yn_source.get() == "table"
                                on:change=move |_| yn_source.set("table".into())/>
                            "In the table: the values column holds 1/0, yes/no, true/false or pass/fail, the groups column names each row's group"
                        </label>
                        <label class="choice">
                            <input type="radio" name="yn-source" value="counts" id="yn-counts-choice" prop:checked=move || yn_source.get() == "counts"
                                on:change=move |_| yn_source.set("counts".into())/>
                            "As counts: yes answers out of each group's size"
                        </label>
                    </fieldset>
                    <div class="row" style:display=move || if yn_source.get() == "counts" { "flex" } else { "none" }>
                        <label for="counts">"Counts"</label>
                        <input id="counts" size="36" prop:value=move || counts_text.get()
                            on:input=move |ev| counts_text.set(event_target_value(&ev))/>
                        <span class="hint">"e.g. control: 42/300, new: 61/310"</span>
                    </div>
                    <p class="error" role="alert" id="counts-error">{move || {
                        if design.get() == "yes-no" && yn_source.get() == "counts" {
                            parse_counts(&counts_text.get()).err().unwrap_or_default()
                        } else {
                            String::new()
                        }
                    }}</p>
                    <div class="row">
                        <label for="yn-stat">"Measure the difference by"</label>
                        <select id="yn-stat" on:change=move |ev| {
                            if let Some(x) = YesNoStatistic::from_key(&event_target_value(&ev)) { yn_stat.set(x) }
                        }>
                            <option value="proportion-difference" selected=move || yn_stat.get() == YesNoStatistic::ProportionDifference>"difference in proportions"</option>
                            <option value="risk-ratio" selected=move || yn_stat.get() == YesNoStatistic::RiskRatio>"risk ratio"</option>
                            <option value="odds-ratio" selected=move || yn_stat.get() == YesNoStatistic::OddsRatio>"odds ratio"</option>
                        </select>
                    </div>
                </div>
                <div class="row" style:display=move || if mode.get() == "compare" && design.get() == "association" { "flex" } else { "none" }>
                    <label for="assoc-x">"x"</label>
                    <ColumnSelect id="assoc-x" options=Signal::derive(column_options) chosen=est_x/>
                    <label for="assoc-y">"y"</label>
                    <ColumnSelect id="assoc-y" options=Signal::derive(column_options) chosen=est_y/>
                    <label for="assoc-stat">"measured by"</label>
                    <select id="assoc-stat" on:change=move |ev| {
                        if let Some(x) = AssocStatistic::from_key(&event_target_value(&ev)) { assoc_stat.set(x) }
                    }>
                        <option value="pearson">"Pearson correlation r"</option>
                        <option value="spearman">"Spearman rank correlation rho"</option>
                        <option value="slope">"least-squares slope of y on x"</option>
                    </select>
                </div>
                <div class="row" style:display=move || if mode.get() == "compare" && design.get() == "one-sample" { "flex" } else { "none" }>
                    <label for="one-value">"Values"</label>
                    <ColumnSelect id="one-value" options=Signal::derive(column_options) chosen=est_value/>
                    <label for="reference">"reference value"</label>
                    <input id="reference" inputmode="decimal" size="8" prop:value=move || reference.get()
                        on:input=move |ev| reference.set(event_target_value(&ev))/>
                </div>
                <p class="hint" style:display=move || if mode.get() == "compare" && design.get() == "paired" && layout_kind.get() == "wide" { "block" } else { "none" }>
                    "Each measurement in its own column, one row per unit; the difference is the first minus the second."
                </p>
                <div class="row" style:display=move || if mode.get() == "compare" && design.get() == "paired" && layout_kind.get() == "long" { "flex" } else { "none" }>
                    <label for="unit-col">"Units (plant, patient, machine) in column"</label>
                    <select id="unit-col" on:change=move |ev| unit_col.set(event_target_value(&ev))>
                        <option value="" selected=move || unit_col.get().is_empty()>"(choose a column)"</option>
                        {move || column_options().into_iter().map(|(name, kind)| {
                            let (n2, n3) = (name.clone(), name.clone());
                            let label = format!("{name} ({})", kind_label(&kind));
                            view! { <option value=n3 selected=move || unit_col.get() == n2>{label}</option> }
                        }).collect_view()}
                    </select>
                    <span class="hint">"the difference is the first measurement minus the second, unit by unit"</span>
                </div>
                <div class="row" style:display=move || if mode.get() == "compare" && (design.get() == "paired" || design.get() == "one-sample") { "flex" } else { "none" }>
                    <label for="flip-stat">"Summarise the differences by their"</label>
                    <select id="flip-stat" on:change=move |ev| {
                        if let Some(x) = FlipStatistic::from_key(&event_target_value(&ev)) { flip_stat.set(x) }
                    }>
                        <option value="mean">"mean"</option>
                        <option value="median">"median"</option>
                    </select>
                </div>
                <div class="row" style:display=move || if (mode.get() == "compare" && (matches!(design.get().as_str(), "two-groups" | "paired" | "stratified") || (design.get() == "yes-no" && yn_source.get() == "table"))) || (mode.get() == "estimate" && est_kind.get().kind() == Kind::Two) { "flex" } else { "none" }>
                    <label for="first">"Compare"</label>
                    <select id="first" on:change=move |ev| first.set(event_target_value(&ev))>
                        {move || levels.get().into_iter().map(|l| {
                            let (l2, l3) = (l.clone(), l.clone());
                            view! { <option value=l3 selected=move || first.get() == l2>{l}</option> }
                        }).collect_view()}
                    </select>
                    <label for="second">"with"</label>
                    <select id="second" on:change=move |ev| second.set(event_target_value(&ev))>
                        {move || levels.get().into_iter().filter(|l| *l != first.get()).map(|l| {
                            let (l2, l3) = (l.clone(), l.clone());
                            view! { <option value=l3 selected=move || second.get() == l2>{l}</option> }
                        }).collect_view()}
                    </select>
                </div>
                <div class="compare-options" style:display=move || if mode.get() == "compare" { "block" } else { "none" }>
                <div class="row" style:display=move || if design.get() == "two-groups" { "flex" } else { "none" }>
                    <label for="statistic">"Measure the difference by"</label>
                    <select id="statistic" on:change=move |ev| {
                        if let Some(s) = Statistic::from_key(&event_target_value(&ev)) { statistic.set(s) }
                    }>
                        <option value="mean-difference">"difference in means"</option>
                        <option value="median-difference">"difference in medians"</option>
                        <option value="trimmed-mean-difference">"difference in 20% trimmed means"</option>
                        <option value="welch-t">"Welch t (allows unequal spreads)"</option>
                    </select>
                </div>
                <fieldset>
                    <legend>"Which answer are you after?"</legend>
                    {move || {
                        let (f, s) = (first.get(), second.get());
                        let questions: Vec<(Alternative, String)> = match design.get().as_str() {
                            "k-groups" => match Some(control.get()).filter(|c| !c.is_empty()) {
                                None => vec![(Alternative::TwoSided, "Do the groups differ, and which pairs differ, in either direction?".to_string())],
                                Some(c) => vec![
                                    (Alternative::TwoSided, format!("Do the groups differ, and which differ from {c}, in either direction?")),
                                    (Alternative::Greater, format!("Which groups are higher than {c}?")),
                                    (Alternative::Less, format!("Which groups are lower than {c}?")),
                                ],
                            },
                            "stratified" => {
                                let st = strata_col.get();
                                vec![
                                    (Alternative::TwoSided, format!("Do {f} and {s} differ within strata of {st}, in either direction?")),
                                    (Alternative::Greater, format!("Is {f} higher than {s} within strata of {st}?")),
                                    (Alternative::Less, format!("Is {f} lower than {s} within strata of {st}?")),
                                ]
                            }
                            "yes-no" => {
                                let lv = levels.get();
                                let (f, s) = if yn_source.get() == "counts" && lv.len() == 2 {
                                    (lv[0].clone(), lv[1].clone())
                                } else {
                                    (f.clone(), s.clone())
                                };
                                vec![
                                    (Alternative::TwoSided, format!("Is a yes more or less common in {f} than in {s}?")),
                                    (Alternative::Greater, format!("Is a yes more common in {f} than in {s}?")),
                                    (Alternative::Less, format!("Is a yes less common in {f} than in {s}?")),
                                ]
                            }
                            "one-sample" => {
                                let (v, r) = (est_value.get(), reference.get());
                                vec![
                                    (Alternative::TwoSided, format!("Is the centre of {v} different from {r}, in either direction?")),
                                    (Alternative::Greater, format!("Is the centre of {v} above {r}?")),
                                    (Alternative::Less, format!("Is the centre of {v} below {r}?")),
                                ]
                            }
                            "association" => {
                                let (x, y) = (est_x.get(), est_y.get());
                                vec![
                                    (Alternative::TwoSided, format!("Are {x} and {y} associated, in either direction?")),
                                    (Alternative::Greater, format!("Does {y} tend to rise with {x}?")),
                                    (Alternative::Less, format!("Does {y} tend to fall as {x} rises?")),
                                ]
                            }
                            "paired" => vec![
                                (Alternative::TwoSided, format!("Do {f} and {s} differ within units, in either direction?")),
                                (Alternative::Greater, format!("Is {f} higher than {s} within units?")),
                                (Alternative::Less, format!("Is {f} lower than {s} within units?")),
                            ],
                            _ => vec![
                                (Alternative::TwoSided, format!("Do {f} and {s} differ, in either direction?")),
                                (Alternative::Greater, format!("Is {f} higher than {s}?")),
                                (Alternative::Less, format!("Is {f} lower than {s}?")),
                            ],
                        };
                        questions.into_iter().map(|(alt, text)| view! {
                            <label class="choice">
                                <input type="radio" name="alternative" value=alt.key()
                                    prop:checked=move || alternative.get() == alt
                                    on:change=move |_| alternative.set(alt)/>
                                {text}
                            </label>
                        }).collect_view()
                    }}
                </fieldset>
                </div>
                <details class="settings">
                    <summary>{move || if mode.get() == "plan" { "Seed" } else { "Resampling settings" }}</summary>
                    <div class="grid" class:estimating=move || mode.get() == "estimate" class:planning=move || mode.get() == "plan">
                        <label class="compare-only" for="resamples">"Random relabellings (or sign patterns)"</label>
                        <input class="compare-only" id="resamples" inputmode="numeric" prop:value=move || resamples.get()
                            on:input=move |ev| resamples.set(event_target_value(&ev))/>
                        <label class="compare-only" for="exact-limit">"Enumerate every split when there are at most"</label>
                        <input class="compare-only" id="exact-limit" inputmode="numeric" prop:value=move || exact_limit.get()
                            on:input=move |ev| exact_limit.set(event_target_value(&ev))/>
                        <label for="bootstrap">"Bootstrap resamples"</label>
                        <input id="bootstrap" inputmode="numeric" prop:value=move || bootstrap.get()
                            on:input=move |ev| bootstrap.set(event_target_value(&ev))/>
                        <label for="confidence">"Confidence level (%)"</label>
                        <input id="confidence" inputmode="decimal" prop:value=move || confidence.get()
                            on:input=move |ev| confidence.set(event_target_value(&ev))/>
                        <label class="compare-only" for="interval">"Interval method"</label>
                        <select class="compare-only" id="interval" on:change=move |ev| interval_choice.set(event_target_value(&ev))>
                            <option value="bca">"BCa (bias-corrected and accelerated)"</option>
                            <option value="percentile">"percentile"</option>
                            <option value="basic">"basic (reverse percentile)"</option>
                            <option value="normal">"normal, with bootstrap SE"</option>
                            <option value="studentized">"studentized (bootstrap-t)"</option>
                            <option value="all">"all five, side by side"</option>
                        </select>
                        <label class="compare-only" for="two-sided">"Two-sided p-value"</label>
                        <select class="compare-only" id="two-sided" on:change=move |ev| {
                            if let Some(m) = TwoSidedRule::from_key(&event_target_value(&ev)) { two_sided.set(m) }
                        }>
                            <option value="absolute">"count |relabelled| ≥ |observed|"</option>
                            <option value="doubled-tail">"twice the smaller one-sided p"</option>
                        </select>
                        <label class="seed-field" for="seed">"Seed (blank: a new one)"</label>
                        <div class="seed-row seed-field">
                            <input id="seed" inputmode="numeric" prop:value=move || seed.get()
                                on:input=move |ev| seed.set(event_target_value(&ev))/>
                            <button type="button" class="secondary" on:click=move |_| seed.set(fresh_seed().to_string())>"New seed"</button>
                        </div>
                    </div>
                </details>
                <div class="actions">
                    <button type="button" id="run" class="primary" disabled=move || running.get() || parsed.get().is_err()
                        on:click=move |_| run()>{move || if mode.get() == "plan" { "Run the simulation" } else { "Run analysis" }}</button>
                    <button type="button" id="stop" class="secondary" disabled=move || !running.get()
                        on:click=move |_| stop()>"Stop"</button>
                </div>
                <p class="error" role="alert">{move || settings_error.get()}</p>
            </section>

            <section class="step" aria-labelledby="step-findings">
                <h2 id="step-findings"><span class="step-no">"3"</span>" The findings"</h2>
                <div aria-live="polite" id="status">
                    {move || match status.get() {
                        Status::Idle => view! { <p class="hint">"Run the analysis to see the findings here."</p> }.into_any(),
                        Status::Starting => view! { <p class="hint">"Starting…"</p> }.into_any(),
                        Status::Running { stage, done, total } => {
                            let pct = if total > 0 { done as f64 / total as f64 * 100.0 } else { 0.0 };
                            let what = match stage.as_str() {
                                "bootstrap" => "Bootstrap resamples".to_string(),
                                "relabelling" => "Relabellings".to_string(),
                                "sign patterns" => "Sign patterns".to_string(),
                                "pairings" => "Pairings".to_string(),
                                other => {
                                    let mut c = other.chars();
                                    c.next().map(|f| f.to_uppercase().chain(c).collect()).unwrap_or_default()
                                }
                            };
                            view! {
                                <div class="progress">
                                    <label for="progress">{format!("{what}: {} of {}", fmt::count(done), fmt::count(total))}</label>
                                    <progress id="progress" max="100" value=format!("{pct:.0}")></progress>
                                </div>
                            }.into_any()
                        }
                        Status::Failed(m) => view! { <p class="error" role="alert" id="run-error">{m}</p> }.into_any(),
                        Status::Stopped => view! { <p class="hint">"Stopped. The settings and data are unchanged."</p> }.into_any(),
                        Status::Done => view! { <span></span> }.into_any(),
                    }}
                </div>
                {move || stale.get().then(|| view! {
                    <p class="stale">"The settings have changed since these findings were computed; run the analysis again to update them."</p>
                })}
                {move || shown.get().map(|sh| match sh {
                    AnyReport::Compare(r) => view! { <Findings report=r/> }.into_any(),
                    AnyReport::Estimate(r) => view! { <EstimateFindings report=r/> }.into_any(),
                    AnyReport::Paired(r) => view! { <PairedFindings report=r/> }.into_any(),
                    AnyReport::Association(r) => view! { <AssocFindings report=r/> }.into_any(),
                    other => view! { <DocFindings report=other/> }.into_any(),
                })}
                {move || shown.get().is_some().then(|| view! {
                    <div class="share" id="share">
                        <h3>"Share and save"</h3>
                        <div class="share-buttons">
                            <button type="button" class="secondary" id="copy-link" on:click=move |_| copy_link(false)>"Copy link"</button>
                            <button type="button" class="secondary" id="copy-settings-link" on:click=move |_| copy_link(true)>"Copy settings-only link"</button>
                            <button type="button" class="secondary" id="save-analysis" on:click=move |_| save_job()>"Save analysis file"</button>
                            <button type="button" class="secondary" id="copy-text" on:click=move |_| {
                                let t = current_text(shown.get_untracked(), false);
                                share::copy(&t);
                                share_note.set("Findings copied as plain text.".into());
                            }>"Copy as text"</button>
                            <button type="button" class="secondary" id="copy-markdown" on:click=move |_| {
                                let t = current_text(shown.get_untracked(), true);
                                share::copy(&t);
                                share_note.set("Findings copied as Markdown.".into());
                            }>"Copy as Markdown"</button>
                            <button type="button" class="secondary" id="download-report" on:click=move |_| {
                                if let Some(r) = shown.get_untracked() {
                                    let _ = share::download("reshuffle-report.html", "text/html", &r.html(&share::today()));
                                }
                            }>"Download report (HTML)"</button>
                            <button type="button" class="secondary" id="download-csv" on:click=move |_| {
                                if let Some(r) = shown.get_untracked() {
                                    let _ = share::download("reshuffle-results.csv", "text/csv", &r.results_csv());
                                }
                            }>"Results (CSV)"</button>
                            <button type="button" class="secondary" id="download-values" on:click=move |_| {
                                let csv = match shown.get_untracked() {
                                    Some(AnyReport::Compare(r)) => Some(report::values_csv(&[
                                        ("relabelled", r.null_values.as_deref().unwrap_or(&[])),
                                        ("bootstrap", r.bootstrap_values.as_deref().unwrap_or(&[])),
                                    ])),
                                    Some(AnyReport::Estimate(e)) => Some(report::values_csv(&[("bootstrap", e.values.as_deref().unwrap_or(&[]))])),
                                    _ => None,
                                };
                                if let Some(c) = csv {
                                    let _ = share::download("reshuffle-resampled.csv", "text/csv", &c);
                                }
                            }>"Resampled statistics (CSV)"</button>
                        </div>
                        <div class="share-buttons">
                            {move || shown.get().map(|r| r.figures()).unwrap_or_default().into_iter().map(|fig| {
                                let (name, svg) = (fig.name.to_string(), fig.svg);
                                let (svg2, name2) = (svg.clone(), name.clone());
                                view! {
                                    <button type="button" class="secondary" on:click=move |_| {
                                        let _ = share::download(&format!("reshuffle-{name}.svg"), "image/svg+xml", &svg);
                                    }>{format!("Figure: {name} (SVG)")}</button>
                                    <button type="button" class="secondary" on:click=move |_| {
                                        let (w, h) = plot::svg_size(&svg2);
                                        let sized = svg2.replacen("width=\"100%\"", &format!("width=\"{w}\" height=\"{h}\""), 1);
                                        let _ = share::download_png(&format!("reshuffle-{name2}.png"), &sized, w, h);
                                    }>{format!("Figure: {name2} (PNG)")}</button>
                                }
                            }).collect_view()}
                        </div>
                        <p class="hint" aria-live="polite" id="share-note">{move || share_note.get()}</p>
                        {move || (!share_link.get().is_empty()).then(|| view! {
                            <label for="share-link" class="block-label">"Link"</label>
                            <input id="share-link" class="share-link" readonly=true prop:value=move || share_link.get()/>
                        })}
                    </div>
                })}
            </section>
        </main>
        <footer>
            <p>{format!("Reshuffle {ENGINE_VERSION} · computed in your browser · generator: {}", crate::resample::rng::RNG_NAME)}</p>
            {(!is_offline()).then(|| view! {
                <p><a href="./reshuffle-offline.html" download="reshuffle-offline.html" id="offline-download">
                    "Download Reshuffle as one file"</a>" to use without a server or network (open it from disk in a current browser)."</p>
            })}
        </footer>
    }
}

/// Whether this is the single-file offline build.
fn is_offline() -> bool {
    web_sys::window()
        .and_then(|w| js_sys::Reflect::get(&w, &JsValue::from_str("RESHUFFLE_OFFLINE")).ok())
        .is_some_and(|v| v.is_truthy())
}

/// The findings on screen as plain text or Markdown.
fn current_text(shown: Option<AnyReport>, markdown: bool) -> String {
    let date = share::today();
    match shown {
        Some(r) if markdown => r.markdown(&date),
        Some(r) => r.text(&date),
        None => String::new(),
    }
}

/// Reads a dropped or chosen file as text into the data box.
fn read_file(file: web_sys::File, load: impl Fn(String, String) + 'static, note: RwSignal<String>) {
    let name = file.name();
    if file.size() > MAX_FILE_BYTES {
        note.set(format!(
            "\"{name}\" is {:.1} MB; files up to 20 MB can be opened here. The data box was left as it was.",
            file.size() / 1_048_576.0
        ));
        return;
    }
    let promise = file.text();
    leptos::task::spawn_local(async move {
        match wasm_bindgen_futures::JsFuture::from(promise).await {
            Ok(v) => {
                let text = v.as_string().unwrap_or_default();
                let warn = if text.contains('\u{FFFD}') {
                    " Some characters could not be read as UTF-8; save the file as UTF-8 text (\"CSV UTF-8\") if names look wrong."
                } else {
                    ""
                };
                load(text, format!("Read \"{name}\".{warn}"));
            }
            Err(_) => note.set(format!(
                "\"{name}\" could not be read. The data box was left as it was."
            )),
        }
    });
}

#[component]
fn ColumnSelect(
    id: &'static str,
    options: Signal<Vec<(String, ColumnKind)>>,
    chosen: RwSignal<String>,
) -> impl IntoView {
    view! {
        <select id=id on:change=move |ev| chosen.set(event_target_value(&ev))>
            {move || options.get().into_iter().map(|(name, kind)| {
                let n2 = name.clone();
                let label = format!("{name} ({})", kind_label(&kind));
                view! { <option value=name selected=move || chosen.get() == n2>{label}</option> }
            }).collect_view()}
        </select>
    }
}

#[component]
fn Findings(report: Report) -> impl IntoView {
    let r = report;
    let d = two_groups::effect_decimals(&r);
    let null_svg = plot::null_svg(&r, "null-plot");
    let boot_svg = plot::bootstrap_svg(&r, "boot-plot");
    let p_detail = if r.exact {
        format!(
            "exact: all {} possible relabellings enumerated",
            fmt::count(r.resamples)
        )
    } else {
        let se = r.mc_se.unwrap_or(0.0);
        let pi = r
            .p_interval
            .as_ref()
            .map(|p| {
                format!(
                    "; 99% interval for the p-value {:.4} to {:.4}",
                    p.low, p.high
                )
            })
            .unwrap_or_default();
        format!(
            "Monte Carlo: {} random relabellings, p = {:.4} with standard error {:.4}{pi}",
            fmt::count(r.resamples),
            r.p_value,
            se
        )
    };
    let ci_text = match (r.ci.low, r.ci.high) {
        (Some(l), Some(h)) => format!(
            "[{}, {}] ({}, {} resamples)",
            fmt::fixed(l, d),
            fmt::fixed(h, d),
            words::method(r.ci.method),
            fmt::count(r.bootstrap_resamples)
        ),
        _ => "not available".into(),
    };
    let welch_text = match (r.welch.t, r.welch.df, r.welch.p_value) {
        (Some(t), Some(df), Some(p)) => {
            format!("t = {:.3}, df = {:.1}, {}", t, df, fmt::p_value(p))
        }
        _ => "undefined (no spread in either group)".into(),
    };
    let welch_ci = match (r.welch.ci.low, r.welch.ci.high) {
        (Some(l), Some(h)) => format!("[{}, {}]", fmt::fixed(l, d), fmt::fixed(h, d)),
        _ => "—".into(),
    };
    let g_text = match r.hedges_g.estimate {
        Some(g) => match (r.hedges_g.ci.low, r.hedges_g.ci.high) {
            (Some(l), Some(h)) => format!("{:.2} [{:.2}, {:.2}]", g, l, h),
            _ => format!("{:.2}", g),
        },
        None => "undefined".into(),
    };
    let level = fmt::percent(r.ci.level);
    let notes: Vec<String> = r.notes.iter().map(words::note).collect();
    let ci_note = (!r.ci.notes.is_empty()).then(|| words::notes(&r.ci.notes));
    let g_note = (!r.hedges_g.ci.notes.is_empty()).then(|| words::notes(&r.hedges_g.ci.notes));
    let null_caption = plot::null_description(&r);
    let boot_caption = plot::bootstrap_description(&r);
    let groups = r.groups.clone();
    view! {
        // Full-precision numbers for checking against the native command.
        <div class="findings" id="findings"
            data-observed=format!("{:?}", r.observed)
            data-p-value=format!("{:?}", r.p_value)
            data-ci-low=format!("{:?}", r.ci.low)
            data-ci-high=format!("{:?}", r.ci.high)
            data-hedges-g=format!("{:?}", r.hedges_g.estimate)
            data-g-low=format!("{:?}", r.hedges_g.ci.low)>
            <p class="headline" id="finding">{r.finding.clone()}</p>
            {(!notes.is_empty()).then(|| view! {
                <ul class="notes">{notes.into_iter().map(|n| view! { <li>{n}</li> }).collect_view()}</ul>
            })}
            <div class="plots">
                <Figure id="null-figure" svg=null_svg caption=null_caption/>
                <Figure id="boot-figure" svg=boot_svg caption=boot_caption/>
            </div>
            <table class="results" id="results">
                <caption>"Results"</caption>
                <thead><tr><th scope="col">"group"</th><th scope="col">"n"</th><th scope="col">"mean"</th><th scope="col">"median"</th><th scope="col">"SD"</th></tr></thead>
                <tbody>
                    {groups.into_iter().map(|g| view! {
                        <tr><th scope="row">{g.name}</th><td>{g.n}</td><td>{fmt::fixed(g.mean, d + 1)}</td><td>{fmt::fixed(g.median, d + 1)}</td><td>{fmt::fixed(g.sd, d + 1)}</td></tr>
                    }).collect_view()}
                </tbody>
            </table>
            <dl class="numbers">
                <dt>{format!("Observed {}", r.statistic_label)}</dt><dd>{fmt::sig(r.observed)}</dd>
                <dt>"p-value"</dt><dd>{format!("{} — {}", fmt::p_number(r.p_value), p_detail)}</dd>
                <dt>{format!("{} with {level} CI", r.effect_label)}</dt>
                <dd>{format!("{} {}", fmt::fixed(r.effect, d), ci_text)}
                    {ci_note.map(|n| view! { <span class="note">{format!(" {n}")}</span> })}</dd>
                <dt>"Welch t-test (classical cross-check)"</dt><dd>{format!("{welch_text}; {level} CI for the difference in means {welch_ci}")}</dd>
                <dt>{format!("Hedges' g with {level} CI")}</dt><dd>{g_text}
                    {g_note.map(|n| view! { <span class="note">{format!(" {n}")}</span> })}</dd>
                <dt>"Seed and generator"</dt><dd>{format!("{} · {}", r.seed, r.rng)}</dd>
            </dl>
            {(r.intervals.len() > 1).then(|| view! {
                <table class="results" id="compare-intervals">
                    <caption>{format!("{level} intervals for the {}, by method", r.effect_label)}</caption>
                    <thead><tr><th scope="col">"method"</th><th scope="col">"low"</th><th scope="col">"high"</th><th scope="col">"note"</th></tr></thead>
                    <tbody>
                        {r.intervals.iter().map(|iv| {
                            let name = words::method(iv.method).to_string();
                            let cell = |v: Option<f64>| v.map_or("—".to_string(), |x| fmt::fixed(x, d));
                            view! { <tr><th scope="row">{name}</th><td>{cell(iv.low)}</td><td>{cell(iv.high)}</td><td class="note-cell">{words::notes(&iv.notes)}</td></tr> }
                        }).collect_view()}
                    </tbody>
                </table>
            })}
            <Cautions id="cautions" items=r.cautions.clone()/>
        </div>
    }
}

#[component]
fn EstimateFindings(report: EstimateReport) -> impl IntoView {
    let r = report;
    let headline = r.intervals[0].clone();
    let d = match (headline.low, headline.high) {
        (Some(l), Some(h)) if h > l => fmt::decimals_for(h - l),
        _ => fmt::decimals_for(r.se.unwrap_or(1.0)),
    };
    let fig = plot::BootFigure {
        label: &r.estimate_label,
        estimate: r.estimate,
        interval: &headline,
        histogram: &r.histogram,
        resamples: r.resamples,
    };
    let svg = plot::bootstrap_figure_svg(&fig, "est-plot");
    let caption = plot::describe_bootstrap(&fig);
    let cell = |v: Option<f64>, open: &str| v.map_or(open.to_string(), |x| fmt::fixed(x, d + 1));
    let rows: Vec<(String, String, String, String)> = r
        .intervals
        .iter()
        .map(|iv| {
            let name = words::method(iv.method).to_string();
            (
                name,
                cell(iv.low, "−∞"),
                cell(iv.high, "∞"),
                words::notes(&iv.notes),
            )
        })
        .chain(r.classical.iter().map(|c| {
            (
                format!("{} (classical cross-check)", words::method(c.method)),
                cell(c.low, "—"),
                cell(c.high, "—"),
                String::new(),
            )
        }))
        .collect();
    let sizes = r
        .samples
        .iter()
        .map(|s| format!("{}: n = {}", s.name, s.n))
        .collect::<Vec<_>>()
        .join("; ");
    view! {
        <div class="findings" id="estimate-findings"
            data-estimate=format!("{:?}", r.estimate)
            data-low=format!("{:?}", headline.low)
            data-high=format!("{:?}", headline.high)>
            <p class="headline" id="estimate-finding">{r.finding.clone()}</p>
            {(!r.notes.is_empty()).then(|| view! {
                <ul class="notes">{r.notes.iter().map(|n| view! { <li>{words::note(n)}</li> }).collect_view()}</ul>
            })}
            <div class="plots">
                <Figure id="est-figure" svg=svg caption=caption/>
            </div>
            <table class="results" id="interval-table">
                <caption>{format!("{} intervals for the {}", fmt::percent(headline.level), r.estimate_label)}</caption>
                <thead><tr><th scope="col">"method"</th><th scope="col">"low"</th><th scope="col">"high"</th><th scope="col">"note"</th></tr></thead>
                <tbody>
                    {rows.into_iter().map(|(m, l, h, n)| view! {
                        <tr><th scope="row">{m}</th><td>{l}</td><td>{h}</td><td class="note-cell">{n}</td></tr>
                    }).collect_view()}
                </tbody>
            </table>
            <dl class="numbers">
                <dt>"Estimate"</dt><dd>{fmt::fixed(r.estimate, d + 1)}</dd>
                <dt>"Bootstrap standard error"</dt><dd>{r.se.map_or("undefined".into(), fmt::sig)}</dd>
                <dt>"Bootstrap bias estimate"</dt><dd>{r.bias.map_or("undefined".into(), fmt::sig)}</dd>
                <dt>"Sample"</dt><dd>{sizes}</dd>
                <dt>"Why this method first"</dt><dd>{r.method_reason.clone()}</dd>
                <dt>"Seed and generator"</dt><dd>{format!("{} · {}", r.seed, r.rng)}</dd>
            </dl>
            <Cautions id="est-cautions" items=r.cautions.clone()/>
        </div>
    }
}

#[component]
fn PairedFindings(report: PairedReport) -> impl IntoView {
    let r = report;
    let (nf, bf) = report::paired_figures(&r);
    let null_svg = plot::null_figure_svg(&nf, "flip-plot");
    let boot_svg = plot::bootstrap_figure_svg(&bf, "pboot-plot");
    let (null_caption, boot_caption) = (plot::describe_null(&nf), plot::describe_bootstrap(&bf));
    let d = match (r.ci.low, r.ci.high) {
        (Some(l), Some(h)) if h > l => fmt::decimals_for(h - l),
        _ => 2,
    };
    let p_detail = if r.exact {
        format!(
            "exact: all {} sign patterns enumerated",
            fmt::count(r.resamples)
        )
    } else {
        format!(
            "Monte Carlo: {} random sign patterns, standard error {:.4}",
            fmt::count(r.resamples),
            r.mc_se.unwrap_or(0.0)
        )
    };
    let ci_text = match (r.ci.low, r.ci.high) {
        (Some(l), Some(h)) => format!(
            "{} [{}, {}]",
            fmt::fixed(r.observed, d),
            fmt::fixed(l, d),
            fmt::fixed(h, d)
        ),
        _ => format!(
            "{} (no interval: {})",
            fmt::fixed(r.observed, d),
            words::notes(&r.ci.notes)
        ),
    };
    let t_text = match (r.t_test.t, r.t_test.p_value) {
        (Some(t), Some(p)) => format!("t = {t:.3}, df = {}, {}", r.t_test.df, fmt::p_value(p)),
        _ => "undefined (no spread)".into(),
    };
    let w_text = match r.wilcoxon.p_value {
        Some(p) => format!(
            "W+ = {}, {} ({}; {} zero difference{} left out)",
            fmt::sig(r.wilcoxon.w_plus),
            fmt::p_value(p),
            words::rank_method(r.wilcoxon.method),
            r.wilcoxon.zeros,
            if r.wilcoxon.zeros == 1 { "" } else { "s" }
        ),
        None => words::rank_method(r.wilcoxon.method).to_string(),
    };
    let dz_text = match (r.dz.estimate, r.dz.ci.low, r.dz.ci.high) {
        (Some(g), Some(l), Some(h)) => format!("{g:.2} [{l:.2}, {h:.2}]"),
        (Some(g), _, _) => format!("{g:.2}"),
        _ => "undefined".into(),
    };
    let level = fmt::percent(r.ci.level);
    view! {
        <div class="findings" id="paired-findings" data-p-value=format!("{:?}", r.p_value)
            data-ci-low=format!("{:?}", r.ci.low) data-ci-high=format!("{:?}", r.ci.high)>
            <p class="headline" id="paired-finding">{r.finding.clone()}</p>
            {(!r.notes.is_empty()).then(|| view! {
                <ul class="notes">{r.notes.iter().map(|n| view! { <li>{words::note(n)}</li> }).collect_view()}</ul>
            })}
            <div class="plots">
                <Figure id="flip-figure" svg=null_svg caption=null_caption/>
                <Figure id="pboot-figure" svg=boot_svg caption=boot_caption/>
            </div>
            <dl class="numbers" id="paired-results">
                <dt>"Design"</dt><dd>{format!("{}, {} differences ({})", r.design, r.n, r.difference_label)}</dd>
                <dt>"p-value"</dt><dd>{format!("{} — {}", fmt::p_number(r.p_value), p_detail)}</dd>
                <dt>{format!("{} with {level} CI", r.effect_label)}</dt><dd>{ci_text}</dd>
                <dt>{if r.design == "paired" { "Paired t-test (cross-check)" } else { "One-sample t-test (cross-check)" }}</dt><dd>{t_text}</dd>
                <dt>"Wilcoxon signed-rank (cross-check)"</dt><dd>{w_text}</dd>
                <dt>{format!("{} with {level} CI", r.dz.name)}</dt><dd>{dz_text}</dd>
                <dt>"Seed and generator"</dt><dd>{format!("{} · {}", r.seed, r.rng)}</dd>
            </dl>
            <Cautions id="paired-cautions" items=r.cautions.clone()/>
        </div>
    }
}

#[component]
fn AssocFindings(report: AssocReport) -> impl IntoView {
    let r = report;
    let (nf, bf, scatter) = report::assoc_figures(&r);
    let null_svg = plot::null_figure_svg(&nf, "pair-plot");
    let boot_svg = plot::bootstrap_figure_svg(&bf, "aboot-plot");
    let (null_caption, boot_caption) = (plot::describe_null(&nf), plot::describe_bootstrap(&bf));
    let text = report::assoc_text(&r);
    let lines: Vec<String> = text
        .lines()
        .skip(2)
        .filter(|l| !l.is_empty() && !l.starts_with("- "))
        .map(String::from)
        .collect();
    view! {
        <div class="findings" id="assoc-findings" data-p-value=format!("{:?}", r.p_value)
            data-ci-low=format!("{:?}", r.ci.low) data-ci-high=format!("{:?}", r.ci.high)>
            <p class="headline" id="assoc-finding">{r.finding.clone()}</p>
            <div class="plots">
                <figure>
                    <div class="svg" inner_html=scatter id="scatter-figure"></div>
                    <figcaption>{format!("{} against {}, with the least-squares line.", r.y, r.x)}</figcaption>
                </figure>
                <Figure id="pair-figure" svg=null_svg caption=null_caption/>
                <Figure id="aboot-figure" svg=boot_svg caption=boot_caption/>
            </div>
            <ul class="plain" id="assoc-results">{lines.into_iter().map(|l| view! { <li>{l}</li> }).collect_view()}</ul>
            <Cautions id="assoc-cautions" items=r.cautions.clone()/>
        </div>
    }
}

/// Findings of a design written as a document (k groups, strata, yes/no): the finding,
/// notes, figures, result lines, tables and cautions, exactly as the reports write them.
#[component]
fn DocFindings(report: AnyReport) -> impl IntoView {
    let Some(doc): Option<Doc> = report.doc(&share::today()) else {
        return view! { <p class="error">"These findings cannot be shown."</p> }.into_any();
    };
    let figures = report.figures();
    let (p, low, high) = match &report {
        AnyReport::KGroups(r) => (r.test.p_value, r.ci.low, r.ci.high),
        AnyReport::Stratified(r) => (r.test.p_value, r.ci.low, r.ci.high),
        AnyReport::YesNo(r) => (r.test.p_value, r.ci.low, r.ci.high),
        // For a plan: the fitted sample size and its simulation error.
        AnyReport::Plan(r) => (
            f64::NAN,
            r.smoothed.as_ref().map(|s| s.n),
            r.smoothed.as_ref().map(|s| s.se),
        ),
        _ => (f64::NAN, None, None),
    };
    let id = match report.design() {
        "k-groups" => "k-findings",
        "stratified" => "strata-findings",
        "plan" => "plan-findings",
        _ => "yes-no-findings",
    };
    view! {
        <div class="findings" id=id data-p-value=format!("{p:?}")
            data-ci-low=format!("{low:?}") data-ci-high=format!("{high:?}")>
            <p class="headline" id="doc-finding">{doc.finding.clone()}</p>
            {(!doc.notes.is_empty()).then(|| view! {
                <ul class="notes">{doc.notes.iter().map(|n| view! { <li>{n.clone()}</li> }).collect_view()}</ul>
            })}
            <div class="plots">
                {figures.into_iter().enumerate().map(|(i, f)| {
                    let fid = ["doc-figure-1", "doc-figure-2", "doc-figure-3", "doc-figure-4"][i.min(3)];
                    view! { <Figure id=fid svg=f.svg caption=f.caption/> }
                }).collect_view()}
            </div>
            <dl class="numbers" id="doc-results">
                {doc.lines.iter().map(|(k, v)| view! { <dt>{k.clone()}</dt><dd>{v.clone()}</dd> }).collect_view()}
            </dl>
            {doc.tables.iter().map(|t| view! {
                <div class="table-scroll" tabindex="0" role="region" aria-label=t.caption.clone()>
                <table class="results" id=t.id>
                    <caption>{t.caption.clone()}</caption>
                    <thead><tr>{t.header.iter().map(|h| view! { <th scope="col">{h.clone()}</th> }).collect_view()}</tr></thead>
                    <tbody>
                        {t.rows.iter().map(|r| view! {
                            <tr>{r.iter().enumerate().map(|(i, c)| if i == 0 {
                                view! { <th scope="row">{c.clone()}</th> }.into_any()
                            } else {
                                view! { <td>{c.clone()}</td> }.into_any()
                            }).collect_view()}</tr>
                        }).collect_view()}
                    </tbody>
                </table>
                </div>
            }).collect_view()}
            {doc.sections.iter().map(|(head, items)| view! {
                <section class="doc-section">
                    <h3>{head.clone()}</h3>
                    <ul>{items.iter().map(|i| view! { <li>{i.clone()}</li> }).collect_view()}</ul>
                </section>
            }).collect_view()}
            <details class="methods">
                <summary>"Methods (for a report)"</summary>
                <p>{doc.methods.clone()}</p>
            </details>
            <Cautions id="doc-cautions" items=doc.cautions.clone()/>
        </div>
    }
    .into_any()
}

/// The cautions box that closes every set of findings.
#[component]
fn Cautions(id: &'static str, items: Vec<String>) -> impl IntoView {
    let (labelled_by, title) = (format!("{id}-title"), format!("{id}-title"));
    view! {
        <aside class="cautions" aria-labelledby=labelled_by>
            <h3 id=title>"Before you rely on this"</h3>
            <ul>{items.into_iter().map(|c| view! { <li>{c}</li> }).collect_view()}</ul>
        </aside>
    }
}

/// A figure: SVG drawn by the engine (all data text escaped there) and its text alternative.
#[component]
fn Figure(id: &'static str, svg: String, caption: String) -> impl IntoView {
    view! {
        <figure>
            <div class="svg" inner_html=svg id=id></div>
            <figcaption>{caption}</figcaption>
        </figure>
    }
}

/// Entry point of the page program.
pub fn start() {
    console_error_panic_hook::set_once();
    leptos::mount::mount_to_body(App);
}

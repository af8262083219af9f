//! The page: three steps (the data, the question, the findings). It reads the pasted table
//! for the preview with the engine's own reader, builds a job from the form, hands it to the
//! web worker, and shows the report through the same document the command prints. Nothing
//! is computed here that the engine computes.

use leptos::prelude::*;
use wasm_bindgen::prelude::*;

use super::data_step::{watch_table, DataStep, TableState};
use super::findings::{Findings, RunStatus, SharePanel};
use super::form::{parse_count, Form, RESTORED_SHAPE};
use super::plan_step::PlanOptions;
use super::question::{design_label, CompareOptions, EstimateOptions, Settings};
use super::runner::{self, Sinks, Status};
use super::share;
use crate::base::Alternative;
use crate::designs::yes_no::parse_counts;
use crate::input::outline::Outline;
use crate::input::table::ColumnKind;
use crate::render;
use crate::resample::rng::fresh_seed;
use crate::wire::{self, link, Job, Report, ENGINE_VERSION};

#[component]
fn App() -> impl IntoView {
    let fm = Form::new();
    let settings_error = RwSignal::new(String::new());
    let link_error = RwSignal::new(String::new());
    let status = RwSignal::new(Status::Idle);
    let result = RwSignal::new(None::<Report>);
    let sent = RwSignal::new(None::<Job>);
    // The job the findings on screen were computed from.
    let last_job = RwSignal::new(None::<Job>);
    // How many workers computed the findings on screen.
    let result_workers = RwSignal::new(1usize);
    let sinks = Sinks {
        status,
        result,
        sent,
        result_job: last_job,
        result_workers,
    };
    // The result on screen: the last one, if it belongs to the question now chosen.
    let shown = Memo::new(move |_| -> Option<Report> {
        let r = result.get()?;
        (r.key().key() == fm.wanted()).then_some(r)
    });
    // The table in the data box: read here when small, in a worker when large.
    let table = watch_table(fm);
    let columns = Signal::derive(move || {
        table.with(|t| t.shown().map(|o| o.columns.clone()).unwrap_or_default())
    });

    // Choose sensible columns whenever the table changes and the choice no longer fits.
    Effect::new(move |_| {
        let Some(view) = table.with(|t| t.ready().cloned()) else {
            return;
        };
        choose_columns(fm, &view);
        // Large tables stop early by default (the sequential rules), unless a rule was
        // set by hand or by a link.
        if !fm.stop_set.get_untracked() {
            let large = view.rows >= super::form::LARGE_TABLE;
            let fill = |v: &str| if large { v.to_string() } else { String::new() };
            fm.stop_after.set(fill("20"));
            fm.settle_at.set(fill("0.05"));
        }
        // Huge tables start with fewer bootstrap resamples, unless set by hand or a link.
        if !fm.boot_set.get_untracked() {
            let huge = view.rows >= super::form::HUGE_TABLE;
            let b = if huge {
                super::form::HUGE_TABLE_BOOTSTRAP
            } else {
                crate::designs::TestSettings::new(0).bootstrap_resamples
            };
            fm.bootstrap.set(b.to_string());
        }
    });

    // The groups on offer: labels of the group column, the chosen columns, or typed counts.
    let levels = Memo::new(move |_| levels_of(fm, table));
    Effect::new(move |_| {
        let lv = levels.get();
        if lv.is_empty() {
            return;
        }
        if !lv.contains(&fm.first.get_untracked()) {
            fm.first.set(lv[0].clone());
        }
        let f = fm.first.get_untracked();
        let s = fm.second.get_untracked();
        if !lv.contains(&s) || s == f {
            if let Some(other) = lv.iter().find(|l| **l != f) {
                fm.second.set(other.clone());
            }
        }
    });
    // One-sided k-group comparisons need a control group.
    Effect::new(move |_| {
        if fm.design.get() == "k-groups" && fm.control.get().is_empty() {
            fm.alternative.set(Alternative::TwoSided);
        }
    });

    let run = move || {
        settings_error.set(String::new());
        let seed_text = fm.seed.get_untracked();
        let seed = if seed_text.trim().is_empty() {
            let s = fresh_seed();
            fm.seed.set(s.to_string());
            s
        } else {
            match parse_count("Seed", &seed_text) {
                Ok(s) => s,
                Err(e) => return settings_error.set(e),
            }
        };
        let job = match fm.job(seed) {
            Ok(j) => j,
            Err(e) => return settings_error.set(e),
        };
        // Checked here too, so that a setting out of range is named before the worker starts.
        if let Err(e) = job.check() {
            return settings_error.set(render::words::error(&e));
        }
        let text = wire::write_job(&job);
        sent.set(Some(job));
        status.set(Status::Starting);
        if let Err(e) = runner::send(sinks, text) {
            status.set(Status::Failed(e));
        }
    };
    let stop = move || {
        runner::stop();
        status.set(Status::Stopped);
    };
    let running = Memo::new(move |_| matches!(status.get(), Status::Starting | Status::Running(_)));
    // Whether the shown result still matches the data and settings on screen (the job it
    // was computed from against the job the form makes now; a table that no longer reads
    // counts as changed).
    let stale = Memo::new(move |_| {
        let Some(last) = last_job.get() else {
            return false;
        };
        fm.track();
        let s = parse_count("Seed", &fm.seed.get()).unwrap_or(last.seed());
        match fm.job(s) {
            Ok(now) => now != last,
            Err(_) => true,
        }
    });

    // Open the analysis in the address, if any.
    let opened_from_link = {
        let frag = share::fragment();
        if frag.is_empty() {
            false
        } else {
            match link::decode(&frag) {
                Ok(d) => {
                    let full = d.job.has_data();
                    fm.restore(&d.job);
                    if !d.checked {
                        link_error.set(render::words::UNCHECKED_LINK.into());
                    }
                    if !full {
                        link_error.set("This link holds the settings only: paste the data in step 1, then run the analysis.".into());
                    }
                    full
                }
                Err(e) => {
                    link_error.set(format!(
                        "{} The page has opened with the example data instead.",
                        render::words::error(&e)
                    ));
                    false
                }
            }
        }
    };
    if opened_from_link {
        run();
    } else if fm.seed.get_untracked().is_empty() {
        // A seed from the start, so the address bar is a working link at once.
        fm.seed.set(fresh_seed().to_string());
    }
    // A message about the opened link belongs to that link's data: it goes once the data
    // are changed (the user pasted or chose other data).
    let opened_data = fm.data.get_untracked();
    Effect::new(move |_| {
        if fm.data.get() != opened_data {
            link_error.set(String::new());
        }
    });
    // Keep the address bar a working link once a seed is set.
    Effect::new(move |_| {
        fm.track();
        let Ok(seed) = parse_count("Seed", &fm.seed.get()) else {
            return;
        };
        if let Ok(job) = fm.job(seed) {
            let large = fm.data.with_untracked(|d| d.len()) > super::form::ADDRESS_DATA_LIMIT;
            let job = if large { link::without_data(&job) } else { job };
            share::set_fragment(&link::encode(&job));
        }
    });

    view! {
        <header class="masthead">
            <h1>"Reshuffle"</h1>
            <p class="tagline">"Compare groups, pairs and yes/no outcomes by relabelling and resampling — computed in this browser tab."</p>
        </header>
        <main>
            <DataStep fm=fm table=table link_error=link_error/>
            <section class="step" aria-labelledby="step-question">
                <h2 id="step-question"><span class="step-no">"2"</span>" The question"</h2>
                <fieldset>
                    <legend>"What do you want to know?"</legend>
                    <label class="choice">
                        <input type="radio" name="mode" value="compare" prop:checked=move || fm.mode.get() == "compare"
                            on:change=move |_| fm.mode.set("compare".into())/>
                        "Whether groups differ or two variables are associated, and by how much (permutation test and interval)"
                    </label>
                    <label class="choice">
                        <input type="radio" name="mode" id="mode-estimate" value="estimate" prop:checked=move || fm.mode.get() == "estimate"
                            on:change=move |_| fm.mode.set("estimate".into())/>
                        "How large something is, with a confidence interval (bootstrap only, no test)"
                    </label>
                    <label class="choice">
                        <input type="radio" name="mode" id="mode-plan" value="plan" prop:checked=move || fm.mode.get() == "plan"
                            on:change=move |_| fm.mode.set("plan".into())/>
                        "How many units a new study needs, or what it could detect (power by simulation)"
                    </label>
                </fieldset>

                <PlanOptions fm=fm columns=columns/>
                <EstimateOptions fm=fm columns=columns/>
                <CompareOptions fm=fm levels=levels columns=columns/>
                <Settings fm=fm/>
                <div class="actions">
                    <button type="button" id="run" class="primary" disabled=move || running.get() || table.with(|t| t.ready().is_none())
                        on:click=move |_| run()>{move || if fm.mode.get() == "plan" { "Run the simulation" } else { "Run analysis" }}</button>
                    <button type="button" id="stop" class="secondary" disabled=move || !running.get()
                        on:click=move |_| stop()>"Stop"</button>
                </div>
                <p class="error" role="alert" id="settings-error">{move || settings_error.get()}</p>
            </section>

            <section class="step" aria-labelledby="step-findings">
                <h2 id="step-findings"><span class="step-no">"3"</span>" The findings"</h2>
                <RunStatus status=status/>
                {move || (stale.get() && shown.get().is_some()).then(|| view! {
                    <p class="stale" id="stale-note" role="status">"These findings belong to an earlier input: the data or the settings have changed since they were computed. Run the analysis again to update them."</p>
                })}
                <div class="findings-wrap" class:is-stale=move || stale.get() aria-describedby=move || stale.get().then_some("stale-note")>
                    {move || shown.get().map(|r| view! { <Findings doc=super::findings::page_doc(&r, result_workers.get())/> })}
                </div>
                {move || {
                    // Continue a Monte Carlo result: as many random draws again, the next
                    // blocks of the same seed (the earlier ones are drawn again, unchanged).
                    let mc = shown.with(|r| r.as_ref().and_then(|r| r.test_outcome()).is_some_and(|t| !t.exact));
                    (mc && !stale.get() && !running.get()).then(|| {
                        let n = shown.with(|r| r.as_ref().and_then(|r| r.test_outcome()).map_or(0, |t| t.resamples));
                        let unit = match fm.design.get_untracked().as_str() {
                            "paired" | "one-sample" => "sign patterns",
                            "association" => "pairings",
                            _ => "relabellings",
                        };
                        let label = format!("Add {} more {unit}", crate::base::format::count(n));
                        view! {
                            <div class="actions continue-run">
                                <button type="button" id="continue-run" class="secondary" on:click=move |_| {
                                    let total = fm.resamples.get_untracked().trim().replace([',', '_', ' '], "").parse::<u64>().unwrap_or(n);
                                    fm.resamples.set((total.max(n) + n).to_string());
                                    run();
                                }>{label}</button>
                                <span class="hint">"The same seed: the first "{crate::base::format::count(n)}" are drawn again unchanged, the p-value sharpens, and the link records the total."</span>
                            </div>
                        }
                    })
                }}
                {move || shown.get().is_some().then(|| view! { <SharePanel shown=shown last_job=last_job workers=result_workers/> })}
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

/// Keeps the chosen columns valid for the table in the data box, and suggests a design when
/// a table of a new shape arrives.
fn choose_columns(fm: Form, outline: &Outline) {
    let columns = &outline.columns;
    let names: Vec<String> = columns.iter().map(|c| c.0.clone()).collect();
    let numeric: Vec<String> = columns
        .iter()
        .filter(|c| matches!(c.1, ColumnKind::Number | ColumnKind::NumberWithText))
        .map(|c| c.0.clone())
        .collect();
    let pick = |i: usize| numeric.get(i).or(names.get(i)).cloned().unwrap_or_default();
    let has = |s: RwSignal<String>| names.contains(&s.get_untracked());
    if !has(fm.est_value) {
        fm.est_value.set(pick(0));
    }
    if !has(fm.plan.value) {
        fm.plan.value.set(pick(0));
    }
    if !has(fm.est_x) || !has(fm.est_y) {
        fm.est_x.set(pick(0));
        fm.est_y.set(pick(1));
    }
    for optional in [fm.est_strata, fm.strata_col, fm.unit_col] {
        if !optional.get_untracked().is_empty() && !has(optional) {
            optional.set(String::new());
        }
    }
    // A different table: suggest a design from its shape (a restored analysis keeps its
    // own design).
    let shape = outline.shape();
    let seen = fm.shape_seen.get_untracked();
    if shape != seen {
        fm.shape_seen.set(shape);
        if seen != RESTORED_SHAPE {
            if let Some(sg) = &outline.suggestion {
                fm.apply_suggestion(sg, design_label(&sg.design));
                return;
            }
        }
    }
    let kc = fm.k_columns.get_untracked();
    if kc.len() < 3 || kc.iter().any(|c| !names.contains(c)) {
        fm.k_columns.set(numeric.clone());
    }
    let fits = match fm.layout_kind.get_untracked().as_str() {
        "long" => has(fm.value_col) && has(fm.group_col),
        _ => has(fm.col_a) && has(fm.col_b),
    };
    if fits {
        return;
    }
    if !fm.apply_detected(&outline.layout) {
        // Leave the choice to the user; pre-fill with the first columns.
        let first = names.first().cloned().unwrap_or_default();
        let second = names.get(1).cloned().unwrap_or_default();
        fm.value_col.set(first.clone());
        fm.group_col.set(second.clone());
        fm.col_a.set(first);
        fm.col_b.set(second);
    }
}

/// The groups the form can compare: typed counts' names, the chosen columns, or the labels
/// of the group column (the first 51).
fn levels_of(fm: Form, table: RwSignal<TableState>) -> Vec<String> {
    let compare = fm.mode.get() == "compare";
    if compare && fm.design.get() == "yes-no" && fm.yn_source.get() == "counts" {
        return parse_counts(&fm.counts_text.get())
            .map(|g| g.into_iter().map(|c| c.name).collect())
            .unwrap_or_default();
    }
    if fm.layout_kind.get() == "wide" {
        if compare && fm.design.get() == "k-groups" {
            return fm.k_columns.get();
        }
        return vec![fm.col_a.get(), fm.col_b.get()];
    }
    let group = fm.group_col.get();
    table.with(|t| {
        t.ready()
            .map(|o| o.labels_of(&group).to_vec())
            .unwrap_or_default()
    })
}

/// Whether this is the single-file offline build.
fn is_offline() -> bool {
    web_sys::window()
        .and_then(|w| js_sys::Reflect::get(&w, &JsValue::from_str("RESHUFFLE_OFFLINE")).ok())
        .is_some_and(|v| v.is_truthy())
}

/// Entry point of the page program.
pub fn start() {
    console_error_panic_hook::set_once();
    leptos::mount::mount_to_body(App);
}

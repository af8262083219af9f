//! Step 3 of the page: the run's status, the findings of any design — shown from the same
//! document ([`crate::render::document`]) the command and the reports word — and the ways to
//! share and save them.

use leptos::prelude::*;

use super::runner::Status;
use super::share;
use crate::base::format as fmt;
use crate::render::doc::{full, Doc};
use crate::render::{self, plot, words};
use crate::wire::{self, link, Job, Report};

/// The findings of any design.
/// A report as the page words it: its document, with how many workers computed it.
pub fn page_doc(report: &Report, workers: usize) -> Doc {
    let mut doc = render::document(report, &share::today());
    render::add_workers(&mut doc, workers);
    doc
}

#[component]
pub fn Findings(doc: Doc) -> impl IntoView {
    let h = doc.headline.clone();
    view! {
        // Full-precision numbers, for checking against the native command.
        <div class="findings" id="findings"
            data-design=doc.design.key()
            data-p-value=full(h.p_value)
            data-estimate=full(h.estimate)
            data-ci-low=full(h.low)
            data-ci-high=full(h.high)>
            <p class="headline" id="finding">{doc.finding.clone()}</p>
            {(!doc.notes.is_empty()).then(|| view! {
                <ul class="notes" id="notes">{doc.notes.iter().map(|n| view! { <li>{n.clone()}</li> }).collect_view()}</ul>
            })}
            <div class="plots">
                {doc.figures.iter().map(|f| view! {
                    <Figure id=format!("figure-{}", f.name) svg=f.svg.clone() caption=f.caption.clone()/>
                }).collect_view()}
            </div>
            <dl class="numbers" id="results">
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
                <p id="methods">{doc.methods.clone()}</p>
            </details>
            <aside class="cautions" aria-labelledby="cautions-title" id="cautions">
                <h3 id="cautions-title">"Before you rely on this"</h3>
                <ul>{doc.cautions.iter().map(|c| view! { <li>{c.clone()}</li> }).collect_view()}</ul>
            </aside>
        </div>
    }
}

/// A figure: SVG drawn by the engine (all data text escaped there) and its text alternative.
#[component]
fn Figure(id: String, svg: String, caption: String) -> impl IntoView {
    view! {
        <figure>
            <div class="svg" inner_html=svg id=id></div>
            <figcaption>{caption}</figcaption>
        </figure>
    }
}

/// Where the run is: progress with a bar, the error, or a hint.
#[component]
pub fn RunStatus(status: RwSignal<Status>) -> impl IntoView {
    view! {
        <div aria-live="polite" id="status">
            {move || match status.get() {
                Status::Idle => view! { <p class="hint">"Run the analysis to see the findings here."</p> }.into_any(),
                Status::Starting => view! { <p class="hint">"Starting…"</p> }.into_any(),
                Status::Running(p) if p.total == 0 => view! {
                    // A step without a count (reading a large table): a bar without a value.
                    <div class="progress">
                        <label for="progress">{format!("{}…", words::stage(&p.stage))}</label>
                        <progress id="progress" max="100"></progress>
                    </div>
                }.into_any(),
                Status::Running(p) => {
                    let pct = p.done as f64 / p.total as f64 * 100.0;
                    view! {
                        <div class="progress">
                            <label for="progress">{format!("{}: {} of {}", words::stage(&p.stage), fmt::count(p.done), fmt::count(p.total))}</label>
                            <progress id="progress" max="100" value=format!("{pct:.0}")></progress>
                        </div>
                        {words::running(&p).map(|r| view! { <p class="hint" id="running-p">{r}</p> })}
                        {p.sketch.as_ref().map(|sk| {
                            let what = if matches!(p.stage, crate::base::Stage::Bootstrap) { "bootstrap resamples" } else { "relabellings" };
                            let (svg, desc) = crate::render::plot::sketch_svg(sk, what, "live");
                            view! {
                                <figure class="live-figure" id="live-figure">
                                    <div class="svg" inner_html=svg></div>
                                    <figcaption class="hint">{desc}</figcaption>
                                </figure>
                            }
                        })}
                    }.into_any()
                }
                Status::Failed(e) => view! {
                    <p class="error" role="alert" id="run-error"
                        data-kind=format!("{:?}", e.kind)
                        data-line=e.line.map(|l| l.to_string()).unwrap_or_default()
                        data-column=e.column.clone().unwrap_or_default()>{words::error(&e)}</p>
                }.into_any(),
                Status::Stopped => view! { <p class="hint">"Stopped. The settings and data are unchanged."</p> }.into_any(),
                Status::Done => view! { <span></span> }.into_any(),
            }}
        </div>
    }
}

/// Links, files and copies of the findings on screen.
#[component]
pub fn SharePanel(
    shown: Memo<Option<Report>>,
    last_job: RwSignal<Option<Job>>,
    workers: RwSignal<usize>,
) -> impl IntoView {
    let share_link = RwSignal::new(String::new());
    let share_note = RwSignal::new(String::new());
    let doc = move || {
        shown
            .get_untracked()
            .map(|r| page_doc(&r, workers.get_untracked()))
    };
    let copy_link = move |settings_only: bool| {
        let Some(mut job) = last_job.get_untracked() else {
            return;
        };
        if settings_only {
            job = link::without_data(&job);
        }
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
        if let Some(job) = last_job.get_untracked() {
            let text = wire::write_job_pretty(&job);
            let _ = share::download("reshuffle-analysis.json", "application/json", &text);
        }
    };
    let copy_doc = move |markdown: bool| {
        if let Some(d) = doc() {
            share::copy(&if markdown { d.markdown() } else { d.text() });
            share_note.set(if markdown {
                "Findings copied as Markdown.".into()
            } else {
                "Findings copied as plain text.".into()
            });
        }
    };
    view! {
        <div class="share" id="share">
            <h3>"Share and save"</h3>
            <div class="share-buttons">
                <button type="button" class="secondary" id="copy-link" on:click=move |_| copy_link(false)>"Copy link"</button>
                <button type="button" class="secondary" id="copy-settings-link" on:click=move |_| copy_link(true)>"Copy settings-only link"</button>
                <button type="button" class="secondary" id="save-analysis" on:click=move |_| save_job()>"Save analysis file"</button>
                <button type="button" class="secondary" id="copy-text" on:click=move |_| copy_doc(false)>"Copy as text"</button>
                <button type="button" class="secondary" id="copy-markdown" on:click=move |_| copy_doc(true)>"Copy as Markdown"</button>
                <button type="button" class="secondary" id="download-report" on:click=move |_| {
                    if let Some(d) = doc() {
                        let _ = share::download("reshuffle-report.html", "text/html", &d.html());
                    }
                }>"Download report (HTML)"</button>
                <button type="button" class="secondary" id="download-csv" on:click=move |_| {
                    if let Some(d) = doc() {
                        let _ = share::download("reshuffle-results.csv", "text/csv", &d.results_csv());
                    }
                }>"Results (CSV)"</button>
                <button type="button" class="secondary" id="download-json" on:click=move |_| {
                    if let Some(r) = shown.get_untracked() {
                        let _ = share::download("reshuffle-report.json", "application/json", &wire::report_json(&r));
                    }
                }>"Report data (JSON)"</button>
                {move || shown.get().and_then(|r| render::values_csv(&r)).map(|csv| view! {
                    <button type="button" class="secondary" id="download-values" on:click=move |_| {
                        let _ = share::download("reshuffle-resampled.csv", "text/csv", &csv);
                    }>"Resampled statistics (CSV)"</button>
                })}
            </div>
            <div class="share-buttons">
                {move || shown.get().map(|r| page_doc(&r, workers.get()).figures).unwrap_or_default().into_iter().map(|fig| {
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
    }
}

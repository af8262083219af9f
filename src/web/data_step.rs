//! Step 1 of the page: the data — an example, a file, a paste or a drop — its preview with
//! each column's kind, and where the groups are. Files are read here, in the page; nothing is
//! uploaded.

use leptos::prelude::*;

use super::form::{kind_label, Form, EXAMPLES};
use super::widgets::ColumnSelect;
use crate::input::outline::{self, Outline};
use crate::input::table::HeaderChoice;
use crate::render::words;
use crate::wire;

/// The largest data file the page opens.
const MAX_FILE_BYTES: f64 = 20.0 * 1024.0 * 1024.0;

/// Texts of this many bytes or more are not shown whole in the data box: a browser takes
/// tens of seconds to lay out a text box of millions of lines. The box then shows the first
/// [`SHOWN_LINES`] lines, read-only, and the data are held in the page.
pub const SHOWN_LIMIT: usize = 1 << 20;
pub const SHOWN_LINES: usize = 200;

/// What the data box shows of `data`: all of it, or its first lines when it is large.
pub fn shown_text(data: &str) -> std::borrow::Cow<'_, str> {
    if data.len() <= SHOWN_LIMIT {
        return std::borrow::Cow::Borrowed(data);
    }
    let end = data
        .match_indices('\n')
        .nth(SHOWN_LINES - 1)
        .map_or(data.len().min(64 * 1024), |(i, _)| i + 1);
    let mut end = end.min(64 * 1024);
    while !data.is_char_boundary(end) {
        end -= 1;
    }
    std::borrow::Cow::Borrowed(&data[..end])
}

/// Texts of this many bytes or more are read in a worker, so that the page stays responsive;
/// their first [`HEAD_BYTES`] are read at once for the preview.
pub const READ_IN_WORKER: usize = 256 * 1024;
pub const HEAD_BYTES: usize = 64 * 1024;

/// The table in the data box as the page knows it.
#[derive(Clone, Debug, PartialEq)]
pub enum TableState {
    /// Being read in a worker; the outline of its first lines, when they read.
    Reading(Option<Outline>),
    /// Read.
    Ready(Outline),
    /// Not a table the page can use: why.
    Bad(String),
}

impl TableState {
    /// The outline of the whole table, once read.
    pub fn ready(&self) -> Option<&Outline> {
        match self {
            TableState::Ready(o) => Some(o),
            _ => None,
        }
    }

    /// What the preview can show: the whole table's outline, or its first lines'.
    pub fn shown(&self) -> Option<&Outline> {
        match self {
            TableState::Ready(o) | TableState::Reading(Some(o)) => Some(o),
            _ => None,
        }
    }
}

fn state_of(read: Result<Outline, crate::base::Error>) -> TableState {
    match read {
        Ok(o) => TableState::Ready(o),
        Err(e) => TableState::Bad(words::error(&e)),
    }
}

/// Keeps the table state of the data box: small texts read here, large ones in the reading
/// worker (with the first lines read here at once); only the latest text's answer counts.
pub fn watch_table(fm: Form) -> RwSignal<TableState> {
    let state = RwSignal::new(TableState::Reading(None));
    let latest = StoredValue::new(0u64);
    Effect::new(move |_| {
        let header = fm.header.get();
        let len = fm.data.with(|d| d.len());
        latest.update_value(|v| *v += 1);
        let id = latest.get_value();
        if len < READ_IN_WORKER {
            state.set(
                fm.data
                    .with_untracked(|d| state_of(outline::outline(d, header))),
            );
            return;
        }
        let head = fm
            .data
            .with_untracked(|d| outline::outline_of_head(d, header, HEAD_BYTES).ok());
        state.set(TableState::Reading(head));
        let sent =
            super::runner::read_outline(id, fm.data.get_untracked(), header, move |rid, read| {
                if rid == latest.get_value() || rid == u64::MAX {
                    state.set(state_of(read));
                }
            });
        if sent.is_err() {
            // No worker: read it here.
            state.set(
                fm.data
                    .with_untracked(|d| state_of(outline::outline(d, header))),
            );
        }
    });
    state
}

/// Step 1.
#[component]
pub fn DataStep(
    fm: Form,
    table: RwSignal<TableState>,
    link_error: RwSignal<String>,
) -> impl IntoView {
    // The box shows the data; its text is written only when it differs from what the box
    // holds (an example, a file, a link), not after every keystroke or paste: writing a
    // large text back makes the browser lay the whole box out again.
    let area = NodeRef::<leptos::html::Textarea>::new();
    Effect::new(move |_| {
        fm.data.with(|data| {
            let shown = shown_text(data);
            if let Some(el) = area.get() {
                if el.value() != *shown {
                    el.set_value(&shown);
                }
            }
        });
    });
    let large = Memo::new(move |_| fm.data.with(|d| d.len() > SHOWN_LIMIT));
    // A large paste is held in the page and the box shows its first lines at once, before
    // the browser lays out the whole text.
    let on_input = move |ev: leptos::ev::Event| {
        let text = event_target_value(&ev);
        if text.len() > SHOWN_LIMIT {
            if let Some(el) = area.get_untracked() {
                el.set_value(&shown_text(&text));
            }
        }
        fm.data.set(text);
        fm.example.set(String::new());
    };
    let load_text = move |text: String, note: String| {
        fm.data.set(text);
        fm.file_note.set(note);
        fm.example.set(String::new());
    };
    let on_drop = move |ev: web_sys::DragEvent| {
        ev.prevent_default();
        let Some(dt) = ev.data_transfer() else { return };
        let Some(files) = dt.files() else { return };
        if let Some(file) = files.get(0) {
            read_file(file, load_text, fm.file_note);
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
            match wire::read_job(&v.as_string().unwrap_or_default()) {
                Ok(read) => {
                    link_error.set(String::new());
                    fm.restore(&read.job);
                    fm.file_note.set(format!(
                        "Opened the analysis saved in \"{name}\"; run it to see the findings."
                    ));
                }
                Err(e) => link_error.set(format!(
                    "\"{name}\" is not a saved Reshuffle analysis: {} Nothing was changed.",
                    words::error(&e)
                )),
            }
        });
    };
    let column_options =
        move || table.with(|t| t.shown().map(|o| o.columns.clone()).unwrap_or_default());
    view! {
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
                            fm.data.set(ex.2.to_string());
                            fm.file_note.set(String::new());
                        }
                        fm.example.set(key);
                    }>
                        <option value="" selected=move || fm.example.get().is_empty()>"(your own data)"</option>
                        {EXAMPLES.iter().map(|(key, label, _)| {
                            let key = key.to_string();
                            let k2 = key.clone();
                            view! { <option value=key selected=move || fm.example.get() == k2>{*label}</option> }
                        }).collect_view()}
                    </select>
                    <label class="file-pick">
                        "Open a file (.csv, .tsv, .txt)"
                        <input type="file" accept=".csv,.tsv,.txt,text/csv,text/plain,text/tab-separated-values"
                            on:change=move |ev| {
                                let input: web_sys::HtmlInputElement = event_target(&ev);
                                if let Some(file) = input.files().and_then(|f| f.get(0)) {
                                    read_file(file, load_text, fm.file_note);
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
                <textarea id="data" rows="10" spellcheck="false" node_ref=area
                    prop:readOnly=move || large.get()
                    data-chars=move || fm.data.with(|d| d.len().to_string())
                    aria-describedby=move || large.get().then_some("large-box-note")
                    on:input=on_input
                    on:dragover=move |ev: web_sys::DragEvent| ev.prevent_default()
                    on:drop=on_drop></textarea>
                {move || large.get().then(|| view! {
                    <p class="hint" id="large-box-note">
                        {move || fm.data.with(|d| format!(
                            "The box shows the first {} lines of this table ({} lines, {} characters), which is held in the page: showing it all would slow the page down for a long time. To change the data, edit them where they came from and paste or open them again. ",
                            SHOWN_LINES,
                            crate::base::format::count(d.lines().count() as u64),
                            crate::base::format::count(d.len() as u64)
                        ))}
                        <button type="button" class="secondary" id="clear-data" on:click=move |_| {
                            fm.data.set(String::new());
                            fm.example.set(String::new());
                            fm.file_note.set(String::new());
                        }>"Clear the data box"</button>
                    </p>
                })}
                <p class="file-note" aria-live="polite">{move || fm.file_note.get()}</p>
                <div class="row">
                    <label for="header">"First row"</label>
                    <select id="header" on:change=move |ev| fm.header.set(match event_target_value(&ev).as_str() {
                        "names" => HeaderChoice::Names,
                        "data" => HeaderChoice::Data,
                        _ => HeaderChoice::Detect,
                    })>
                        <option value="detect">"decide from the data"</option>
                        <option value="names">"holds column names"</option>
                        <option value="data">"holds data"</option>
                    </select>
                </div>
                {move || match table.get() {
                    TableState::Bad(e) => view! { <p class="error" role="alert" id="data-error">{e}</p> }.into_any(),
                    TableState::Reading(None) => view! { <p class="hint" id="reading-note" role="status">"Reading the table…"</p> }.into_any(),
                    TableState::Reading(Some(v)) | TableState::Ready(v) => view! {
                        <div class="preview" id="preview">
                            <p class="meta" aria-live="polite">{if v.partial {
                                format!("Reading the table… its first {} rows: {} columns, {}-separated{}.", crate::base::format::count(v.rows as u64), v.columns.len(), v.delimiter,
                                    if v.header { ", names from the first row" } else { "" })
                            } else {
                                format!("{} rows, {} columns, {}-separated{}.", crate::base::format::count(v.rows as u64), v.columns.len(), v.delimiter,
                                    if v.header { ", names from the first row" } else { "" })
                            }}</p>
                            {(fm.data.with_untracked(|d| d.len()) > super::form::ADDRESS_DATA_LIMIT).then(|| view! {
                                <p class="hint" id="large-data-note">"A table this large is not kept in the address bar (it holds the settings only): to keep the data with the analysis, use \"Copy link\" or \"Save analysis file\" with the findings."</p>
                            })}
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
                        <input type="radio" name="layout" value="long" prop:checked=move || fm.layout_kind.get() == "long"
                            on:change=move |_| fm.layout_kind.set("long".into())/>
                        "One column of values and one column naming each row's group"
                    </label>
                    <label class="choice">
                        <input type="radio" name="layout" value="wide" prop:checked=move || fm.layout_kind.get() == "wide"
                            on:change=move |_| fm.layout_kind.set("wide".into())/>
                        "Each group in its own column"
                    </label>
                    {move || if fm.layout_kind.get() == "long" {
                        view! {
                            <div class="row">
                                <label for="value-col">"Values"</label>
                                <ColumnSelect id="value-col" options=Signal::derive(column_options) chosen=fm.value_col/>
                                <label for="group-col">"Groups"</label>
                                <ColumnSelect id="group-col" options=Signal::derive(column_options) chosen=fm.group_col/>
                            </div>
                        }.into_any()
                    } else {
                        view! {
                            <div class="row">
                                <label for="col-a">"Group column"</label>
                                <ColumnSelect id="col-a" options=Signal::derive(column_options) chosen=fm.col_a/>
                                <label for="col-b">"and"</label>
                                <ColumnSelect id="col-b" options=Signal::derive(column_options) chosen=fm.col_b/>
                            </div>
                        }.into_any()
                    }}
                </fieldset>
            </section>
    }
}

/// Reads a dropped or chosen file into the data box: UTF-8 (with or without a byte-order
/// mark) or UTF-16 with a mark; anything else is refused with where reading stopped.
fn read_file(file: web_sys::File, load: impl Fn(String, String) + 'static, note: RwSignal<String>) {
    let name = file.name();
    if file.size() > MAX_FILE_BYTES {
        note.set(format!(
            "\"{name}\" is {:.1} MB; files up to 20 MB can be opened here. The data box was left as it was.",
            file.size() / 1_048_576.0
        ));
        return;
    }
    let promise = file.array_buffer();
    leptos::task::spawn_local(async move {
        match wasm_bindgen_futures::JsFuture::from(promise).await {
            Ok(buf) => {
                let bytes = js_sys::Uint8Array::new(&buf).to_vec();
                match crate::input::text::decode(&bytes, &name) {
                    Ok(text) => load(text, format!("Read \"{name}\".")),
                    Err(e) => note.set(format!(
                        "{} The data box was left as it was.",
                        words::error(&e)
                    )),
                }
            }
            Err(_) => note.set(format!(
                "\"{name}\" could not be read. The data box was left as it was."
            )),
        }
    });
}

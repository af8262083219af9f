//! Step 1 of the page: the data — an example, a file, a paste or a drop — its preview with
//! each column's kind, and where the groups are. Files are read here, in the page; nothing is
//! uploaded.

use leptos::prelude::*;

use super::form::{kind_label, Form, EXAMPLES};
use crate::input::table::{self, ColumnKind, HeaderChoice};
use crate::render::words;
use crate::wire;

/// The largest data file the page opens.
const MAX_FILE_BYTES: f64 = 20.0 * 1024.0 * 1024.0;

/// What the preview shows of a parsed table.
#[derive(Clone, Debug, PartialEq)]
pub struct TableView {
    /// Column names and kinds.
    pub columns: Vec<(String, ColumnKind)>,
    /// The first rows, as typed.
    pub preview: Vec<Vec<String>>,
    /// Number of data rows.
    pub rows: usize,
    /// The separator found.
    pub delimiter: &'static str,
    /// Whether the first row named the columns.
    pub header: bool,
}

/// The table in the data box as the preview shows it, or what is wrong with it.
pub fn table_view(data: &str, header: HeaderChoice) -> Result<TableView, String> {
    super::form::read_table(data, header)
        .map(|t| TableView {
            columns: t
                .columns
                .iter()
                .map(|c| (c.name.clone(), c.kind.clone()))
                .collect(),
            preview: (0..t.rows.min(6))
                .map(|r| {
                    t.columns
                        .iter()
                        .map(|c| c.cell(r).text.to_string())
                        .collect()
                })
                .collect(),
            rows: t.rows,
            delimiter: table::delimiter_name(t.delimiter),
            header: t.header,
        })
        .map_err(|e| words::error(&e))
}

/// Step 1.
#[component]
pub fn DataStep(
    fm: Form,
    parsed: Memo<Result<TableView, String>>,
    link_error: RwSignal<String>,
) -> impl IntoView {
    // The box shows the data; its text is written only when it differs from what the box
    // holds (an example, a file, a link), not after every keystroke or paste: writing a
    // large text back makes the browser lay the whole box out again.
    let area = NodeRef::<leptos::html::Textarea>::new();
    Effect::new(move |_| {
        let data = fm.data.get();
        if let Some(el) = area.get() {
            if el.value() != data {
                el.set_value(&data);
            }
        }
    });
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
    let column_options = move || parsed.get().map(|v| v.columns).unwrap_or_default();
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
                    on:input=move |ev| { fm.data.set(event_target_value(&ev)); fm.example.set(String::new()); }
                    on:dragover=move |ev: web_sys::DragEvent| ev.prevent_default()
                    on:drop=on_drop></textarea>
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
                {move || match parsed.get() {
                    Err(e) => view! { <p class="error" role="alert" id="data-error">{e}</p> }.into_any(),
                    Ok(v) => view! {
                        <div class="preview" id="preview">
                            <p class="meta">{format!("{} rows, {} columns, {}-separated{}.", crate::base::format::count(v.rows as u64), v.columns.len(), v.delimiter,
                                if v.header { ", names from the first row" } else { "" })}</p>
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

/// A list of the table's columns, each with its kind.
#[component]
pub fn ColumnSelect(
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

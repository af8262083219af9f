//! The controls every step and design shares: a column choice (with or without a blank
//! option), a choice among typed values or among keys, a choice among the groups, and how a
//! part of the form is shown or hidden.

use leptos::prelude::*;

use super::form::kind_label;
use crate::input::table::ColumnKind;

/// The CSS display of a part of the form: `how` when shown, "none" when hidden.
pub fn display(shown: bool, how: &'static str) -> &'static str {
    if shown {
        how
    } else {
        "none"
    }
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

/// A list of the table's columns that may be left blank (`blank` names the blank choice);
/// `kinds` adds each column's kind to its name.
#[component]
pub fn OptionalColumnSelect(
    id: &'static str,
    options: Signal<Vec<(String, ColumnKind)>>,
    chosen: RwSignal<String>,
    blank: &'static str,
    #[prop(default = true)] kinds: bool,
) -> impl IntoView {
    view! {
        <select id=id on:change=move |ev| chosen.set(event_target_value(&ev))>
            <option value="" selected=move || chosen.get().is_empty()>{blank}</option>
            {move || options.get().into_iter().map(|(name, kind)| {
                let n2 = name.clone();
                let label = if kinds { format!("{name} ({})", kind_label(&kind)) } else { name.clone() };
                view! { <option value=name selected=move || chosen.get() == n2>{label}</option> }
            }).collect_view()}
        </select>
    }
}

/// A choice among typed values (a statistic, a direction), each shown by its label and
/// written in the page by its key.
#[component]
pub fn TypedSelect<T>(
    id: &'static str,
    choices: Vec<(T, &'static str)>,
    chosen: RwSignal<T>,
    key: fn(T) -> &'static str,
    #[prop(optional)] class: &'static str,
) -> impl IntoView
where
    T: Copy + PartialEq + Send + Sync + 'static,
{
    let keyed: Vec<(T, &'static str)> = choices.iter().map(|(v, _)| (*v, key(*v))).collect();
    view! {
        <select class=class id=id on:change=move |ev| {
            let picked = event_target_value(&ev);
            if let Some((v, _)) = keyed.iter().find(|(_, k)| *k == picked) {
                chosen.set(*v);
            }
        }>
            {choices.into_iter().map(|(v, label)| view! {
                <option value=key(v) selected=move || chosen.get() == v>{label}</option>
            }).collect_view()}
        </select>
    }
}

/// A choice among fixed keys held as text (an interval method, a source).
#[component]
pub fn KeySelect(
    id: &'static str,
    choices: Vec<(&'static str, &'static str)>,
    chosen: RwSignal<String>,
    #[prop(optional)] class: &'static str,
) -> impl IntoView {
    view! {
        <select class=class id=id on:change=move |ev| chosen.set(event_target_value(&ev))>
            {choices.into_iter().map(|(k, label)| view! {
                <option value=k selected=move || chosen.get() == k>{label}</option>
            }).collect_view()}
        </select>
    }
}

/// A choice among the groups on offer, leaving out the one in `other` (if given).
#[component]
pub fn GroupSelect(
    id: &'static str,
    levels: Memo<Vec<String>>,
    chosen: RwSignal<String>,
    #[prop(optional)] other: Option<RwSignal<String>>,
) -> impl IntoView {
    view! {
        <select id=id on:change=move |ev| chosen.set(event_target_value(&ev))>
            {move || levels.get().into_iter()
                .filter(|l| other.is_none_or(|o| *l != o.get()))
                .map(|l| {
                    let (l2, l3) = (l.clone(), l.clone());
                    view! { <option value=l3 selected=move || chosen.get() == l2>{l}</option> }
                }).collect_view()}
        </select>
    }
}

/// The interval methods a test can headline, by key.
pub const INTERVAL_CHOICES: [(&str, &str); 6] = [
    ("bca", "BCa (bias-corrected and accelerated)"),
    ("percentile", "percentile"),
    ("basic", "basic (reverse percentile)"),
    ("normal", "normal, with bootstrap SE"),
    ("studentized", "studentized (bootstrap-t)"),
    ("all", "all five, side by side"),
];

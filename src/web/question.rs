//! Step 2 of the page: the question — which design and statistic, which direction, an
//! estimate instead of a test, or a study to plan — and the resampling settings.

use leptos::prelude::*;

use super::design_options::{
    AssociationOptions, GroupPair, KGroupsOptions, OneSampleOptions, PairedOptions, StrataOptions,
    TwoGroupsOptions, YesNoOptions,
};
use super::form::Form;
use super::widgets::{
    display, ColumnSelect, KeySelect, OptionalColumnSelect, TypedSelect, INTERVAL_CHOICES,
};
use crate::base::{Alternative, Side, TwoSidedRule};
use crate::designs::estimate::{Estimate, Kind};
use crate::input::table::ColumnKind;

/// The design names as the page shows them.
pub fn design_label(key: &str) -> &'static str {
    crate::designs::DesignKey::from_key(key)
        .map(crate::render::words::design_name)
        .unwrap_or("another design")
}

/// The design and what it compares, for a test with an interval: the design, the
/// suggestion from the table, each design's options, the groups and the question.
#[component]
pub fn CompareOptions(
    fm: Form,
    levels: Memo<Vec<String>>,
    columns: Signal<Vec<(String, ColumnKind)>>,
) -> impl IntoView {
    view! {
        <DesignChoice fm=fm/>
        <DesignSuggestion fm=fm/>
        <KGroupsOptions fm=fm levels=levels columns=columns/>
        <StrataOptions fm=fm columns=columns/>
        <YesNoOptions fm=fm/>
        <AssociationOptions fm=fm columns=columns/>
        <OneSampleOptions fm=fm columns=columns/>
        <PairedOptions fm=fm columns=columns/>
        <GroupPair fm=fm levels=levels/>
        <div class="compare-options" style:display=move || display(fm.mode.get() == "compare", "block")>
            <TwoGroupsOptions fm=fm/>
            <Questions fm=fm levels=levels/>
        </div>
    }
}

/// The design of a comparison.
#[component]
fn DesignChoice(fm: Form) -> impl IntoView {
    view! {
        <div class="row" style:display=move || display(fm.mode.get() == "compare", "flex")>
            <label for="design">"Design"</label>
            <KeySelect id="design" chosen=fm.design choices=vec![
                ("two-groups", "two independent groups"),
                ("paired", "paired: each unit measured twice (one column per measurement)"),
                ("one-sample", "one sample against a reference value"),
                ("association", "association between two numeric columns"),
                ("k-groups", "three or more independent groups"),
                ("stratified", "two groups compared within strata (site, batch, day)"),
                ("yes-no", "yes/no outcomes in two groups"),
            ]/>
        </div>
    }
}

/// The design the table's shape suggested, with the others that fit it as well.
#[component]
fn DesignSuggestion(fm: Form) -> impl IntoView {
    view! {
                <div class="suggestion" id="suggestion" aria-live="polite" style:display=move || if fm.mode.get() == "compare" && !fm.suggestion_note.get().is_empty() { "block" } else { "none" }>
                    <p class="hint">{move || fm.suggestion_note.get()}</p>
                    {move || {
                        let alts = fm.suggestion_alternatives.get();
                        (!alts.is_empty()).then(|| view! {
                            <div class="share-buttons" role="group" aria-label="Other designs that fit this table">
                                <span class="hint">"Or is it: "</span>
                                {alts.into_iter().map(|a| {
                                    let a2 = a.clone();
                                    view! {
                                        <button type="button" class="secondary" data-design=a.clone()
                                            on:click=move |_| fm.design.set(a2.clone())>{design_label(&a)}</button>
                                    }
                                }).collect_view()}
                            </div>
                        })
                    }}
                </div>
    }
}

/// Which answer the test is after: the direction, worded for the design.
#[component]
fn Questions(fm: Form, levels: Memo<Vec<String>>) -> impl IntoView {
    view! {
                <fieldset>
                    <legend>"Which answer are you after?"</legend>
                    {move || {
                        let (f, s) = (fm.first.get(), fm.second.get());
                        let questions: Vec<(Alternative, String)> = match fm.design.get().as_str() {
                            "k-groups" => match Some(fm.control.get()).filter(|c| !c.is_empty()) {
                                None => vec![(Alternative::TwoSided, "Do the groups differ, and which pairs differ, in either direction?".to_string())],
                                Some(c) => vec![
                                    (Alternative::TwoSided, format!("Do the groups differ, and which differ from {c}, in either direction?")),
                                    (Alternative::Greater, format!("Which groups are higher than {c}?")),
                                    (Alternative::Less, format!("Which groups are lower than {c}?")),
                                ],
                            },
                            "stratified" => {
                                let st = fm.strata_col.get();
                                vec![
                                    (Alternative::TwoSided, format!("Do {f} and {s} differ within strata of {st}, in either direction?")),
                                    (Alternative::Greater, format!("Is {f} higher than {s} within strata of {st}?")),
                                    (Alternative::Less, format!("Is {f} lower than {s} within strata of {st}?")),
                                ]
                            }
                            "yes-no" => {
                                let lv = levels.get();
                                let (f, s) = if fm.yn_source.get() == "counts" && lv.len() == 2 {
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
                                let (v, r) = (fm.est_value.get(), fm.reference.get());
                                vec![
                                    (Alternative::TwoSided, format!("Is the centre of {v} different from {r}, in either direction?")),
                                    (Alternative::Greater, format!("Is the centre of {v} above {r}?")),
                                    (Alternative::Less, format!("Is the centre of {v} below {r}?")),
                                ]
                            }
                            "association" => {
                                let (x, y) = (fm.est_x.get(), fm.est_y.get());
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
                                    prop:checked=move || fm.alternative.get() == alt
                                    on:change=move |_| fm.alternative.set(alt)/>
                                {text}
                            </label>
                        }).collect_view()
                    }}
                </fieldset>
    }
}

/// What to estimate, from which columns, with which intervals.
#[component]
pub fn EstimateOptions(fm: Form, columns: Signal<Vec<(String, ColumnKind)>>) -> impl IntoView {
    view! {
                <div class="estimate-options" style:display=move || if fm.mode.get() == "estimate" { "block" } else { "none" }>
                    <div class="row">
                        <label for="est-kind">"Estimate"</label>
                        <select id="est-kind" on:change=move |ev| {
                            if let Some(e) = Estimate::from_key(&event_target_value(&ev)) { fm.est_kind.set(e) }
                        }>
                            {[("One column", Kind::One), ("Two groups", Kind::Two), ("Two columns as pairs (association)", Kind::Association)]
                                .into_iter().map(|(group_label, kind)| view! {
                                    <optgroup label=group_label>
                                        {Estimate::ALL.into_iter().filter(|e| e.kind() == kind).map(|e| {
                                            let label = if e == Estimate::Quantile { "quantile (percentile)".to_string() } else { e.label(0.5) };
                                            view! { <option value=e.key() selected=move || fm.est_kind.get() == e>{label}</option> }
                                        }).collect_view()}
                                    </optgroup>
                                }).collect_view()}
                        </select>
                        <span style:display=move || if fm.est_kind.get() == Estimate::Quantile { "inline" } else { "none" }>
                            <label for="est-q">" at "</label>
                            <input id="est-q" inputmode="decimal" size="5" prop:value=move || fm.est_q.get()
                                on:input=move |ev| fm.est_q.set(event_target_value(&ev))/>
                            " (0.9 = 90th percentile)"
                        </span>
                    </div>
                    <div class="row" style:display=move || if fm.est_kind.get().kind() == Kind::One { "flex" } else { "none" }>
                        <label for="est-value">"Values"</label>
                        <ColumnSelect id="est-value" options=columns chosen=fm.est_value/>
                        <label for="est-strata">"Resample within strata of"</label>
                        <OptionalColumnSelect id="est-strata" options=columns chosen=fm.est_strata blank="(no strata)" kinds=false/>
                    </div>
                    <p class="hint" style:display=move || if fm.est_kind.get().kind() == Kind::One && fm.layout_kind.get() == "long" { "block" } else { "none" }>
                        "Every value in this column is used, whatever its group. To estimate within one group, paste only that group's rows."
                    </p>
                    <div class="row" style:display=move || if fm.est_kind.get().kind() == Kind::Association { "flex" } else { "none" }>
                        <label for="est-x">"x"</label>
                        <ColumnSelect id="est-x" options=columns chosen=fm.est_x/>
                        <label for="est-y">"y"</label>
                        <ColumnSelect id="est-y" options=columns chosen=fm.est_y/>
                    </div>
                    <div class="row" style:display=move || if fm.est_kind.get().kind() == Kind::Two && fm.layout_kind.get() == "wide" { "flex" } else { "none" }>
                        <label class="choice">
                            <input type="checkbox" id="paired" prop:checked=move || fm.paired.get()
                                on:change=move |ev| fm.paired.set(event_target_checked(&ev))/>
                            " Paired: each row is one unit measured in both columns (resample whole rows)"
                        </label>
                    </div>
                    <div class="row">
                        <label for="est-methods">"Interval method"</label>
                        <KeySelect id="est-methods" chosen=fm.est_methods choices=std::iter::once(("all", "all five, side by side (BCa first)")).chain(INTERVAL_CHOICES[..5].iter().copied()).collect()/>
                        <label for="side">"Give"</label>
                        <TypedSelect id="side" chosen=fm.side key=Side::key choices=vec![
                            (Side::TwoSided, "a two-sided interval"),
                            (Side::Lower, "a lower bound only"),
                            (Side::Upper, "an upper bound only"),
                        ]/>
                    </div>
                </div>
    }
}

/// The resampling settings and the seed.
#[component]
pub fn Settings(fm: Form) -> impl IntoView {
    view! {
                <details class="settings">
                    <summary>{move || if fm.mode.get() == "plan" { "Seed" } else { "Resampling settings" }}</summary>
                    <div class="grid" class:estimating=move || fm.mode.get() == "estimate" class:planning=move || fm.mode.get() == "plan">
                        <label class="compare-only" for="resamples">"Random relabellings (or sign patterns)"</label>
                        <input class="compare-only" id="resamples" inputmode="numeric" prop:value=move || fm.resamples.get()
                            on:input=move |ev| fm.resamples.set(event_target_value(&ev))/>
                        <label class="compare-only" for="exact-limit">"Enumerate every possible relabelling when there are at most (blank: the design's default)"</label>
                        <input class="compare-only" id="exact-limit" inputmode="numeric" prop:value=move || fm.exact_limit.get()
                            on:input=move |ev| fm.exact_limit.set(event_target_value(&ev))/>
                        <label class="compare-only" for="stop-after">{format!("Stop early once this many relabellings are at least as extreme as the observed one (blank: draw them all; 20 is filled in for tables of {} rows or more)", crate::base::format::count(super::form::LARGE_TABLE as u64))}</label>
                        <input class="compare-only" id="stop-after" inputmode="numeric" prop:value=move || fm.stop_after.get()
                            on:input=move |ev| { fm.stop_set.set(true); fm.stop_after.set(event_target_value(&ev)) }/>
                        <label class="compare-only" for="settle-at">{format!("Stop early once the p-value is settled below or above this level, checked after each block of 4,096 with at most a 0.1% chance of the wrong side (blank: no such check; 0.05 is filled in for tables of {} rows or more)", crate::base::format::count(super::form::LARGE_TABLE as u64))}</label>
                        <input class="compare-only" id="settle-at" inputmode="decimal" prop:value=move || fm.settle_at.get()
                            on:input=move |ev| { fm.stop_set.set(true); fm.settle_at.set(event_target_value(&ev)) }/>
                        <label for="bootstrap">{format!("Bootstrap resamples ({} is filled in for tables of {} rows or more)", crate::base::format::count(super::form::HUGE_TABLE_BOOTSTRAP), crate::base::format::count(super::form::HUGE_TABLE as u64))}</label>
                        <input id="bootstrap" inputmode="numeric" prop:value=move || fm.bootstrap.get()
                            on:input=move |ev| { fm.boot_set.set(true); fm.bootstrap.set(event_target_value(&ev)) }/>
                        <label for="confidence">"Confidence level (%)"</label>
                        <input id="confidence" inputmode="decimal" prop:value=move || fm.confidence.get()
                            on:input=move |ev| fm.confidence.set(event_target_value(&ev))/>
                        <label class="compare-only" for="interval">"Interval method"</label>
                        <KeySelect class="compare-only" id="interval" chosen=fm.interval_choice choices=INTERVAL_CHOICES.to_vec()/>
                        <label class="compare-only" for="two-sided">"Two-sided p-value"</label>
                        <TypedSelect class="compare-only" id="two-sided" chosen=fm.two_sided key=TwoSidedRule::key choices=vec![
                            (TwoSidedRule::Absolute, "count |relabelled| ≥ |observed|"),
                            (TwoSidedRule::DoubledTail, "twice the smaller one-sided p"),
                        ]/>
                        <label class="seed-field" for="seed">"Seed (blank: a new one)"</label>
                        <div class="seed-row seed-field">
                            <input id="seed" inputmode="numeric" prop:value=move || fm.seed.get()
                                on:input=move |ev| fm.seed.set(event_target_value(&ev))/>
                            <button type="button" class="secondary" on:click=move |_| fm.seed.set(crate::resample::rng::fresh_seed().to_string())>"New seed"</button>
                        </div>
                    </div>
                </details>
    }
}

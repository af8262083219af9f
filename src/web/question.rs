//! Step 2 of the page: the question — which design and statistic, which direction, an
//! estimate instead of a test, or a study to plan — and the resampling settings.

use leptos::prelude::*;

use super::data_step::ColumnSelect;
use super::form::{kind_label, Form};
use crate::base::{Alternative, Side, TwoSidedRule};
use crate::designs::association::AssocStatistic;
use crate::designs::estimate::{Estimate, Kind};
use crate::designs::k_groups::KStatistic;
use crate::designs::paired::FlipStatistic;
use crate::designs::stratified::StrataWeights;
use crate::designs::two_groups::Statistic;
use crate::designs::yes_no::{parse_counts, YesNoStatistic};
use crate::input::table::ColumnKind;

/// The design names as the page shows them.
pub fn design_label(key: &str) -> &'static str {
    crate::designs::DesignKey::from_key(key)
        .map(crate::render::words::design_name)
        .unwrap_or("another design")
}

/// The design and what it compares, for a test with an interval.
#[component]
pub fn CompareOptions(
    fm: Form,
    levels: Memo<Vec<String>>,
    columns: Signal<Vec<(String, ColumnKind)>>,
) -> impl IntoView {
    let column_options = move || columns.get();
    view! {
                <div class="row" style:display=move || if fm.mode.get() == "compare" { "flex" } else { "none" }>
                    <label for="design">"Design"</label>
                    <select id="design" on:change=move |ev| fm.design.set(event_target_value(&ev))>
                        <option value="two-groups" selected=move || fm.design.get() == "two-groups">"two independent groups"</option>
                        <option value="paired" selected=move || fm.design.get() == "paired">"paired: each unit measured twice (one column per measurement)"</option>
                        <option value="one-sample" selected=move || fm.design.get() == "one-sample">"one sample against a reference value"</option>
                        <option value="association" selected=move || fm.design.get() == "association">"association between two numeric columns"</option>
                        <option value="k-groups" selected=move || fm.design.get() == "k-groups">"three or more independent groups"</option>
                        <option value="stratified" selected=move || fm.design.get() == "stratified">"two groups compared within strata (site, batch, day)"</option>
                        <option value="yes-no" selected=move || fm.design.get() == "yes-no">"yes/no outcomes in two groups"</option>
                    </select>
                </div>
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
                                        <button type="button" class="secondary" fm.data-fm.design=a.clone()
                                            on:click=move |_| fm.design.set(a2.clone())>{design_label(&a)}</button>
                                    }
                                }).collect_view()}
                            </div>
                        })
                    }}
                </div>
                <div class="design-options" id="k-options" style:display=move || if fm.mode.get() == "compare" && fm.design.get() == "k-groups" { "block" } else { "none" }>
                    <fieldset style:display=move || if fm.layout_kind.get() == "wide" { "block" } else { "none" }>
                        <legend>"Groups (one column each)"</legend>
                        {move || column_options().into_iter().filter(|(_, k)| matches!(k, ColumnKind::Number | ColumnKind::NumberWithText)).map(|(name, _)| {
                            let (n2, n3) = (name.clone(), name.clone());
                            view! {
                                <label class="choice inline">
                                    <input type="checkbox" value=name.clone()
                                        prop:checked=move || fm.k_columns.get().contains(&n2)
                                        on:change=move |ev| {
                                            let on = event_target_checked(&ev);
                                            fm.k_columns.update(|v| {
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
                            if let Some(x) = KStatistic::from_key(&event_target_value(&ev)) { fm.k_stat.set(x) }
                        }>
                            <option value="f" selected=move || fm.k_stat.get() == KStatistic::F>"F statistic (spread of the group means)"</option>
                            <option value="welch-f" selected=move || fm.k_stat.get() == KStatistic::WelchF>"Welch F (allows unequal spreads)"</option>
                            <option value="median-spread" selected=move || fm.k_stat.get() == KStatistic::MedianSpread>"spread of the group medians"</option>
                        </select>
                        <label for="control">"Follow-up comparisons"</label>
                        <select id="control" on:change=move |ev| fm.control.set(event_target_value(&ev))>
                            <option value="" selected=move || fm.control.get().is_empty()>"every pair of groups"</option>
                            {move || levels.get().into_iter().map(|l| {
                                let (l2, l3) = (l.clone(), l.clone());
                                view! { <option value=l3 selected=move || fm.control.get() == l2>{format!("each group against {l}")}</option> }
                            }).collect_view()}
                        </select>
                    </div>
                </div>
                <div class="design-options" id="strata-options" style:display=move || if fm.mode.get() == "compare" && fm.design.get() == "stratified" { "block" } else { "none" }>
                    <div class="row">
                        <label for="strata-col">"Strata (site, batch, day) in column"</label>
                        <select id="strata-col" on:change=move |ev| fm.strata_col.set(event_target_value(&ev))>
                            <option value="" selected=move || fm.strata_col.get().is_empty()>"(choose a column)"</option>
                            {move || column_options().into_iter().map(|(name, kind)| {
                                let (n2, n3) = (name.clone(), name.clone());
                                let label = format!("{name} ({})", kind_label(&kind));
                                view! { <option value=n3 selected=move || fm.strata_col.get() == n2>{label}</option> }
                            }).collect_view()}
                        </select>
                        <label for="weights">"Average the stratum differences"</label>
                        <select id="weights" on:change=move |ev| {
                            if let Some(w) = StrataWeights::from_key(&event_target_value(&ev)) { fm.weights.set(w) }
                        }>
                            <option value="size" selected=move || fm.weights.get() == StrataWeights::Size>"weighted by stratum size"</option>
                            <option value="precision" selected=move || fm.weights.get() == StrataWeights::Precision>"weighted for precision: n1·n2/(n1 + n2)"</option>
                        </select>
                    </div>
                    <p class="hint">"Labels are shuffled only within each stratum. When the strata differ in level and the groups are spread unevenly over them, ignoring the strata mixes the strata's difference into the groups' difference and can even reverse its sign; comparing within strata removes it. The findings show the difference with the strata ignored, for contrast."</p>
                </div>
                <div class="design-options" id="yes-no-options" style:display=move || if fm.mode.get() == "compare" && fm.design.get() == "yes-no" { "block" } else { "none" }>
                    <fieldset>
                        <legend>"Where are the outcomes?"</legend>
                        <label class="choice">
                            <input type="radio" name="yn-source" value="table" prop:checked=move || fm.yn_source.get() == "table"
                                on:change=move |_| fm.yn_source.set("table".into())/>
                            "In the table: the values column holds 1/0, yes/no, true/false or pass/fail, the groups column names each row's group"
                        </label>
                        <label class="choice">
                            <input type="radio" name="yn-source" value="counts" id="yn-counts-choice" prop:checked=move || fm.yn_source.get() == "counts"
                                on:change=move |_| fm.yn_source.set("counts".into())/>
                            "As counts: yes answers out of each group's size"
                        </label>
                    </fieldset>
                    <div class="row" style:display=move || if fm.yn_source.get() == "counts" { "flex" } else { "none" }>
                        <label for="counts">"Counts"</label>
                        <input id="counts" size="36" prop:value=move || fm.counts_text.get()
                            on:input=move |ev| fm.counts_text.set(event_target_value(&ev))/>
                        <span class="hint">"e.g. control: 42/300, new: 61/310"</span>
                    </div>
                    <p class="error" role="alert" id="counts-error">{move || {
                        if fm.design.get() == "yes-no" && fm.yn_source.get() == "counts" {
                            parse_counts(&fm.counts_text.get()).err().unwrap_or_default()
                        } else {
                            String::new()
                        }
                    }}</p>
                    <div class="row">
                        <label for="yn-stat">"Measure the difference by"</label>
                        <select id="yn-stat" on:change=move |ev| {
                            if let Some(x) = YesNoStatistic::from_key(&event_target_value(&ev)) { fm.yn_stat.set(x) }
                        }>
                            <option value="proportion-difference" selected=move || fm.yn_stat.get() == YesNoStatistic::ProportionDifference>"difference in proportions"</option>
                            <option value="risk-ratio" selected=move || fm.yn_stat.get() == YesNoStatistic::RiskRatio>"risk ratio"</option>
                            <option value="odds-ratio" selected=move || fm.yn_stat.get() == YesNoStatistic::OddsRatio>"odds ratio"</option>
                        </select>
                    </div>
                </div>
                <div class="row" style:display=move || if fm.mode.get() == "compare" && fm.design.get() == "association" { "flex" } else { "none" }>
                    <label for="assoc-x">"x"</label>
                    <ColumnSelect id="assoc-x" options=Signal::derive(column_options) chosen=fm.est_x/>
                    <label for="assoc-y">"y"</label>
                    <ColumnSelect id="assoc-y" options=Signal::derive(column_options) chosen=fm.est_y/>
                    <label for="assoc-stat">"measured by"</label>
                    <select id="assoc-stat" on:change=move |ev| {
                        if let Some(x) = AssocStatistic::from_key(&event_target_value(&ev)) { fm.assoc_stat.set(x) }
                    }>
                        <option value="pearson" selected=move || fm.assoc_stat.get().key() == "pearson">"Pearson correlation r"</option>
                        <option value="spearman" selected=move || fm.assoc_stat.get().key() == "spearman">"Spearman rank correlation rho"</option>
                        <option value="slope" selected=move || fm.assoc_stat.get().key() == "slope">"least-squares slope of y on x"</option>
                    </select>
                </div>
                <div class="row" style:display=move || if fm.mode.get() == "compare" && fm.design.get() == "one-sample" { "flex" } else { "none" }>
                    <label for="one-value">"Values"</label>
                    <ColumnSelect id="one-value" options=Signal::derive(column_options) chosen=fm.est_value/>
                    <label for="reference">"reference value"</label>
                    <input id="reference" inputmode="decimal" size="8" prop:value=move || fm.reference.get()
                        on:input=move |ev| fm.reference.set(event_target_value(&ev))/>
                </div>
                <p class="hint" style:display=move || if fm.mode.get() == "compare" && fm.design.get() == "paired" && fm.layout_kind.get() == "wide" { "block" } else { "none" }>
                    "Each measurement in its own column, one row per unit; the difference is the first minus the second."
                </p>
                <div class="row" style:display=move || if fm.mode.get() == "compare" && fm.design.get() == "paired" && fm.layout_kind.get() == "long" { "flex" } else { "none" }>
                    <label for="unit-col">"Units (plant, patient, machine) in column"</label>
                    <select id="unit-col" on:change=move |ev| fm.unit_col.set(event_target_value(&ev))>
                        <option value="" selected=move || fm.unit_col.get().is_empty()>"(choose a column)"</option>
                        {move || column_options().into_iter().map(|(name, kind)| {
                            let (n2, n3) = (name.clone(), name.clone());
                            let label = format!("{name} ({})", kind_label(&kind));
                            view! { <option value=n3 selected=move || fm.unit_col.get() == n2>{label}</option> }
                        }).collect_view()}
                    </select>
                    <span class="hint">"the difference is the first measurement minus the second, unit by unit"</span>
                </div>
                <div class="row" style:display=move || if fm.mode.get() == "compare" && (fm.design.get() == "paired" || fm.design.get() == "one-sample") { "flex" } else { "none" }>
                    <label for="flip-stat">"Summarise the differences by their"</label>
                    <select id="flip-stat" on:change=move |ev| {
                        if let Some(x) = FlipStatistic::from_key(&event_target_value(&ev)) { fm.flip_stat.set(x) }
                    }>
                        <option value="mean" selected=move || fm.flip_stat.get().key() == "mean">"mean"</option>
                        <option value="median" selected=move || fm.flip_stat.get().key() == "median">"median"</option>
                    </select>
                </div>
                <div class="row" style:display=move || if (fm.mode.get() == "compare" && (matches!(fm.design.get().as_str(), "two-groups" | "paired" | "stratified") || (fm.design.get() == "yes-no" && fm.yn_source.get() == "table"))) || (fm.mode.get() == "estimate" && fm.est_kind.get().kind() == Kind::Two) { "flex" } else { "none" }>
                    <label for="first">"Compare"</label>
                    <select id="first" on:change=move |ev| fm.first.set(event_target_value(&ev))>
                        {move || levels.get().into_iter().map(|l| {
                            let (l2, l3) = (l.clone(), l.clone());
                            view! { <option value=l3 selected=move || fm.first.get() == l2>{l}</option> }
                        }).collect_view()}
                    </select>
                    <label for="second">"with"</label>
                    <select id="second" on:change=move |ev| fm.second.set(event_target_value(&ev))>
                        {move || levels.get().into_iter().filter(|l| *l != fm.first.get()).map(|l| {
                            let (l2, l3) = (l.clone(), l.clone());
                            view! { <option value=l3 selected=move || fm.second.get() == l2>{l}</option> }
                        }).collect_view()}
                    </select>
                </div>
                <div class="compare-options" style:display=move || if fm.mode.get() == "compare" { "block" } else { "none" }>
                <div class="row" style:display=move || if fm.design.get() == "two-groups" { "flex" } else { "none" }>
                    <label for="statistic">"Measure the difference by"</label>
                    <select id="statistic" on:change=move |ev| {
                        if let Some(s) = Statistic::from_key(&event_target_value(&ev)) { fm.statistic.set(s) }
                    }>
                        <option value="mean-difference" selected=move || fm.statistic.get().key() == "mean-difference">"difference in means"</option>
                        <option value="median-difference" selected=move || fm.statistic.get().key() == "median-difference">"difference in medians"</option>
                        <option value="trimmed-mean-difference" selected=move || fm.statistic.get().key() == "trimmed-mean-difference">"difference in 20% trimmed means"</option>
                        <option value="welch-t" selected=move || fm.statistic.get().key() == "welch-t">"Welch t (allows unequal spreads)"</option>
                    </select>
                </div>
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
                </div>
    }
}

/// What to estimate, from which columns, with which intervals.
#[component]
pub fn EstimateOptions(fm: Form, columns: Signal<Vec<(String, ColumnKind)>>) -> impl IntoView {
    let column_options = move || columns.get();
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
                        <ColumnSelect id="est-value" options=Signal::derive(column_options) chosen=fm.est_value/>
                        <label for="est-strata">"Resample within strata of"</label>
                        <select id="est-strata" on:change=move |ev| fm.est_strata.set(event_target_value(&ev))>
                            <option value="" selected=move || fm.est_strata.get().is_empty()>"(no strata)"</option>
                            {move || column_options().into_iter().map(|(name, _)| {
                                let (n2, n3) = (name.clone(), name.clone());
                                view! { <option value=n3 selected=move || fm.est_strata.get() == n2>{name}</option> }
                            }).collect_view()}
                        </select>
                    </div>
                    <p class="hint" style:display=move || if fm.est_kind.get().kind() == Kind::One && fm.layout_kind.get() == "long" { "block" } else { "none" }>
                        "Every value in this column is used, whatever its group. To estimate within one group, paste only that group's rows."
                    </p>
                    <div class="row" style:display=move || if fm.est_kind.get().kind() == Kind::Association { "flex" } else { "none" }>
                        <label for="est-x">"x"</label>
                        <ColumnSelect id="est-x" options=Signal::derive(column_options) chosen=fm.est_x/>
                        <label for="est-y">"y"</label>
                        <ColumnSelect id="est-y" options=Signal::derive(column_options) chosen=fm.est_y/>
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
                        <select id="est-methods" on:change=move |ev| fm.est_methods.set(event_target_value(&ev))>
                            <option value="all" selected=move || fm.est_methods.get() == "all">"all five, side by side (BCa first)"</option>
                            <option value="bca" selected=move || fm.est_methods.get() == "bca">"BCa (bias-corrected and accelerated)"</option>
                            <option value="percentile" selected=move || fm.est_methods.get() == "percentile">"percentile"</option>
                            <option value="basic" selected=move || fm.est_methods.get() == "basic">"basic (reverse percentile)"</option>
                            <option value="normal" selected=move || fm.est_methods.get() == "normal">"normal, with bootstrap SE"</option>
                            <option value="studentized" selected=move || fm.est_methods.get() == "studentized">"studentized (bootstrap-t)"</option>
                        </select>
                        <label for="side">"Give"</label>
                        <select id="side" on:change=move |ev| {
                            if let Some(x) = Side::from_key(&event_target_value(&ev)) { fm.side.set(x) }
                        }>
                            <option value="two-sided" selected=move || fm.side.get().key() == "two-sided">"a two-sided interval"</option>
                            <option value="lower" selected=move || fm.side.get().key() == "lower">"a lower bound only"</option>
                            <option value="upper" selected=move || fm.side.get().key() == "upper">"an upper bound only"</option>
                        </select>
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
                        <select class="compare-only" id="interval" on:change=move |ev| fm.interval_choice.set(event_target_value(&ev))>
                            <option value="bca" selected=move || fm.interval_choice.get() == "bca">"BCa (bias-corrected and accelerated)"</option>
                            <option value="percentile" selected=move || fm.interval_choice.get() == "percentile">"percentile"</option>
                            <option value="basic" selected=move || fm.interval_choice.get() == "basic">"basic (reverse percentile)"</option>
                            <option value="normal" selected=move || fm.interval_choice.get() == "normal">"normal, with bootstrap SE"</option>
                            <option value="studentized" selected=move || fm.interval_choice.get() == "studentized">"studentized (bootstrap-t)"</option>
                            <option value="all" selected=move || fm.interval_choice.get() == "all">"all five, side by side"</option>
                        </select>
                        <label class="compare-only" for="two-sided">"Two-sided p-value"</label>
                        <select class="compare-only" id="two-sided" on:change=move |ev| {
                            if let Some(m) = TwoSidedRule::from_key(&event_target_value(&ev)) { fm.two_sided.set(m) }
                        }>
                            <option value="absolute" selected=move || fm.two_sided.get().key() == "absolute">"count |relabelled| ≥ |observed|"</option>
                            <option value="doubled-tail" selected=move || fm.two_sided.get().key() == "doubled-tail">"twice the smaller one-sided p"</option>
                        </select>
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

//! The options of each design in step 2, one component per design (shown while that design
//! is chosen), built from the shared controls of [`super::widgets`].

use leptos::prelude::*;

use super::form::Form;
use super::widgets::{display, ColumnSelect, GroupSelect, OptionalColumnSelect, TypedSelect};
use crate::designs::association::AssocStatistic;
use crate::designs::k_groups::KStatistic;
use crate::designs::paired::FlipStatistic;
use crate::designs::stratified::StrataWeights;
use crate::designs::two_groups::Statistic;
use crate::designs::yes_no::{parse_counts, YesNoStatistic};
use crate::input::table::ColumnKind;

/// Whether the comparison design `design` is the one chosen.
fn chosen(fm: Form, design: &str) -> bool {
    fm.mode.get() == "compare" && fm.design.get() == design
}

/// Two groups: the statistic.
#[component]
pub fn TwoGroupsOptions(fm: Form) -> impl IntoView {
    view! {
        <div class="row" style:display=move || display(fm.design.get() == "two-groups", "flex")>
            <label for="statistic">"Measure the difference by"</label>
            <TypedSelect id="statistic" chosen=fm.statistic key=Statistic::key choices=vec![
                (Statistic::MeanDifference, "difference in means"),
                (Statistic::MedianDifference, "difference in medians"),
                (Statistic::TrimmedMeanDifference, "difference in 20% trimmed means"),
                (Statistic::WelchT, "Welch t (allows unequal spreads)"),
                (Statistic::RankSum, "ranks: Wilcoxon–Mann–Whitney (with the probability of superiority)"),
                (Statistic::KsDistance, "whole distributions: Kolmogorov–Smirnov distance (two-sided only)"),
                (Statistic::LogSdRatio, "spread: log ratio of the SDs (groups aligned at their medians)"),
                (Statistic::LogMadRatio, "spread, robust to outliers: log ratio of the median absolute deviations"),
            ]/>
        </div>
        <div class="row" style:display=move || display(fm.design.get() == "two-groups", "flex")>
            <label class="choice">
                <input type="checkbox" id="robustness" prop:checked=move || fm.robustness.get()
                    on:change=move |ev| fm.robustness.set(event_target_checked(&ev))/>
                " Also answer with the other four statistics, and read the percentile and BCa intervals beside each other (a robustness table)"
            </label>
        </div>
    }
}

/// k groups: the group columns (wide), the statistic and the follow-up comparisons.
#[component]
pub fn KGroupsOptions(
    fm: Form,
    levels: Memo<Vec<String>>,
    columns: Signal<Vec<(String, ColumnKind)>>,
) -> impl IntoView {
    view! {
        <div class="design-options" id="k-options" style:display=move || display(chosen(fm, "k-groups"), "block")>
            <fieldset style:display=move || display(fm.layout_kind.get() == "wide", "block")>
                <legend>"Groups (one column each)"</legend>
                {move || columns.get().into_iter().filter(|(_, k)| matches!(k, ColumnKind::Number | ColumnKind::NumberWithText)).map(|(name, _)| {
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
                <TypedSelect id="k-stat" chosen=fm.k_stat key=KStatistic::key choices=vec![
                    (KStatistic::F, "F statistic (spread of the group means)"),
                    (KStatistic::WelchF, "Welch F (allows unequal spreads)"),
                    (KStatistic::MedianSpread, "spread of the group medians"),
                ]/>
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
    }
}

/// Two groups within strata: the strata column and the weights.
#[component]
pub fn StrataOptions(fm: Form, columns: Signal<Vec<(String, ColumnKind)>>) -> impl IntoView {
    view! {
        <div class="design-options" id="strata-options" style:display=move || display(chosen(fm, "stratified"), "block")>
            <div class="row">
                <label for="strata-col">"Strata (site, batch, day) in column"</label>
                <OptionalColumnSelect id="strata-col" options=columns chosen=fm.strata_col blank="(choose a column)"/>
                <label for="weights">"Average the stratum differences"</label>
                <TypedSelect id="weights" chosen=fm.weights key=StrataWeights::key choices=vec![
                    (StrataWeights::Size, "weighted by stratum size"),
                    (StrataWeights::Precision, "weighted for precision: n1·n2/(n1 + n2)"),
                ]/>
            </div>
            <p class="hint">"Labels are shuffled only within each stratum. When the strata differ in level and the groups are spread unevenly over them, ignoring the strata mixes the strata's difference into the groups' difference and can even reverse its sign; comparing within strata removes it. The findings show the difference with the strata ignored, for contrast."</p>
        </div>
    }
}

/// Yes/no outcomes: from the table or typed counts, and the measure of the difference.
#[component]
pub fn YesNoOptions(fm: Form) -> impl IntoView {
    view! {
        <div class="design-options" id="yes-no-options" style:display=move || display(chosen(fm, "yes-no"), "block")>
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
            <div class="row" style:display=move || display(fm.yn_source.get() == "counts", "flex")>
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
                <TypedSelect id="yn-stat" chosen=fm.yn_stat key=YesNoStatistic::key choices=vec![
                    (YesNoStatistic::ProportionDifference, "difference in proportions"),
                    (YesNoStatistic::RiskRatio, "risk ratio"),
                    (YesNoStatistic::OddsRatio, "odds ratio"),
                ]/>
            </div>
        </div>
    }
}

/// An association: the two columns and the statistic.
#[component]
pub fn AssociationOptions(fm: Form, columns: Signal<Vec<(String, ColumnKind)>>) -> impl IntoView {
    view! {
        <div class="row" style:display=move || display(chosen(fm, "association"), "flex")>
            <label for="assoc-x">"x"</label>
            <ColumnSelect id="assoc-x" options=columns chosen=fm.est_x/>
            <label for="assoc-y">"y"</label>
            <ColumnSelect id="assoc-y" options=columns chosen=fm.est_y/>
            <label for="assoc-stat">"measured by"</label>
            <TypedSelect id="assoc-stat" chosen=fm.assoc_stat key=AssocStatistic::key choices=vec![
                (AssocStatistic::Pearson, "Pearson correlation r"),
                (AssocStatistic::Spearman, "Spearman rank correlation rho"),
                (AssocStatistic::Slope, "least-squares slope of y on x"),
                (AssocStatistic::Kendall, "Kendall rank correlation tau-b"),
            ]/>
        </div>
    }
}

/// One sample: the column and the reference value.
#[component]
pub fn OneSampleOptions(fm: Form, columns: Signal<Vec<(String, ColumnKind)>>) -> impl IntoView {
    view! {
        <div class="row" style:display=move || display(chosen(fm, "one-sample"), "flex")>
            <label for="one-value">"Values"</label>
            <ColumnSelect id="one-value" options=columns chosen=fm.est_value/>
            <label for="reference">"reference value"</label>
            <input id="reference" inputmode="decimal" size="8" prop:value=move || fm.reference.get()
                on:input=move |ev| fm.reference.set(event_target_value(&ev))/>
        </div>
    }
}

/// Paired measurements: how the table holds them (and the unit column in long format); with
/// one sample, the summary of the differences.
#[component]
pub fn PairedOptions(fm: Form, columns: Signal<Vec<(String, ColumnKind)>>) -> impl IntoView {
    let paired = move || chosen(fm, "paired");
    view! {
        <p class="hint" style:display=move || display(paired() && fm.layout_kind.get() == "wide", "block")>
            "Each measurement in its own column, one row per unit; the difference is the first minus the second."
        </p>
        <div class="row" style:display=move || display(paired() && fm.layout_kind.get() == "long", "flex")>
            <label for="unit-col">"Units (plant, patient, machine) in column"</label>
            <OptionalColumnSelect id="unit-col" options=columns chosen=fm.unit_col blank="(choose a column)"/>
            <span class="hint">"the difference is the first measurement minus the second, unit by unit"</span>
        </div>
        <div class="row" style:display=move || display(paired() || chosen(fm, "one-sample"), "flex")>
            <label for="flip-stat">"Summarise the differences by their"</label>
            <TypedSelect id="flip-stat" chosen=fm.flip_stat key=FlipStatistic::key choices=vec![
                (FlipStatistic::Mean, "mean"),
                (FlipStatistic::Median, "median"),
                (FlipStatistic::SignedRank, "signed ranks: Wilcoxon (with the rank-biserial correlation)"),
            ]/>
        </div>
    }
}

/// The two groups to compare (designs and estimates of two groups).
#[component]
pub fn GroupPair(fm: Form, levels: Memo<Vec<String>>) -> impl IntoView {
    use crate::designs::estimate::Kind;
    let shown = move || {
        let compare = fm.mode.get() == "compare"
            && (matches!(
                fm.design.get().as_str(),
                "two-groups" | "paired" | "stratified"
            ) || (fm.design.get() == "yes-no" && fm.yn_source.get() == "table"));
        compare || (fm.mode.get() == "estimate" && fm.est_kind.get().kind() == Kind::Two)
    };
    view! {
        <div class="row" style:display=move || display(shown(), "flex")>
            <label for="first">"Compare"</label>
            <GroupSelect id="first" levels=levels chosen=fm.first/>
            <label for="second">"with"</label>
            <GroupSelect id="second" levels=levels chosen=fm.second other=fm.first/>
        </div>
    }
}

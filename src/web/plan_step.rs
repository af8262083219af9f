//! The page's form for planning a study: the design, the data model, the effect to detect,
//! the significance level and target power, and the simulation's size.

use leptos::prelude::*;

use super::form::Form;
use super::widgets::ColumnSelect;
use crate::base::Alternative;
use crate::input::table::ColumnKind;

/// The fields of a study plan.
#[component]
pub fn PlanOptions(fm: Form, columns: Signal<Vec<(String, ColumnKind)>>) -> impl IntoView {
    let column_options = move || columns.get();
    view! {
                <div class="plan-options" id="plan-options" style:display=move || if fm.mode.get() == "plan" { "block" } else { "none" }>
                    <div class="row">
                        <label for="plan-design">"The study will compare"</label>
                        <select id="plan-design" on:change=move |ev| { fm.plan.design.set(event_target_value(&ev)); fm.plan.stat.set(String::new()); }>
                            <option value="two-groups" selected=move || fm.plan.design.get() == "two-groups">"two independent groups"</option>
                            <option value="paired" selected=move || fm.plan.design.get() == "paired">"paired measurements"</option>
                            <option value="k-groups" selected=move || fm.plan.design.get() == "k-groups">"three or more groups"</option>
                            <option value="yes-no" selected=move || fm.plan.design.get() == "yes-no">"yes/no outcomes in two groups"</option>
                        </select>
                        <label for="plan-stat">"measured by"</label>
                        <select id="plan-stat" on:change=move |ev| fm.plan.stat.set(event_target_value(&ev))>
                            {move || {
                                let opts: Vec<(&str, &str)> = match fm.plan.design.get().as_str() {
                                    "paired" => vec![("mean", "the mean difference"), ("median", "the median difference"), ("signed-rank", "the signed ranks (Wilcoxon)")],
                                    "k-groups" => vec![("f", "F statistic"), ("welch-f", "Welch F"), ("median-spread", "spread of the medians")],
                                    "yes-no" => vec![("proportion-difference", "difference in proportions (exact test)")],
                                    _ => vec![("mean-difference", "difference in means"), ("welch-t", "Welch t"), ("median-difference", "difference in medians"), ("trimmed-mean-difference", "difference in 20% trimmed means"), ("rank-sum", "Wilcoxon–Mann–Whitney (ranks)")],
                                };
                                opts.into_iter().map(|(k, l)| view! {
                                    <option value=k selected=move || fm.plan.stat.get() == k>{l}</option>
                                }).collect_view()
                            }}
                        </select>
                    </div>
                    <fieldset style:display=move || if fm.plan.design.get() == "yes-no" { "none" } else { "block" }>
                        <legend>"What the data will look like"</legend>
                        <label class="choice">
                            <input type="radio" name="plan-model" value="normal" prop:checked=move || fm.plan.model.get() == "normal"
                                on:change=move |_| fm.plan.model.set("normal".into())/>
                            "Normal values with a standard deviation of "
                            <input id="plan-sd" inputmode="decimal" size="6" aria-label="Standard deviation" prop:value=move || fm.plan.sd.get()
                                on:input=move |ev| fm.plan.sd.set(event_target_value(&ev))/>
                            {move || if fm.plan.design.get() == "paired" { " (of the differences)" } else { "" }}
                        </label>
                        <label class="choice">
                            <input type="radio" name="plan-model" value="pilot" id="plan-pilot-choice" prop:checked=move || fm.plan.model.get() == "pilot"
                                on:change=move |_| fm.plan.model.set("pilot".into())/>
                            "Like the pilot values in column "
                        </label>
                        <div class="row" style:display=move || if fm.plan.model.get() == "pilot" { "flex" } else { "none" }>
                            <ColumnSelect id="plan-value" options=Signal::derive(column_options) chosen=fm.plan.value/>
                            <label class="choice inline" style:display=move || if fm.plan.design.get() == "two-groups" { "inline" } else { "none" }>
                                <input type="checkbox" id="plan-multiply" prop:checked=move || fm.plan.multiply.get()
                                    on:change=move |ev| fm.plan.multiply.set(event_target_checked(&ev))/>
                                " the effect multiplies the values (a ratio; positive data)"
                            </label>
                        </div>
                        <p class="hint" style:display=move || if fm.plan.model.get() == "pilot" { "block" } else { "none" }>
                            "Each simulated group is drawn from these values (centred at their mean), with the assumed effect added to (or multiplying) the treated group's values. For paired data the column holds pilot differences."
                        </p>
                    </fieldset>
                    <div class="row" style:display=move || if matches!(fm.plan.design.get().as_str(), "two-groups" | "paired") { "flex" } else { "none" }>
                        <label for="plan-effect">{move || if fm.plan.multiply.get() && fm.plan.model.get() == "pilot" && fm.plan.design.get() == "two-groups" { "Ratio to detect (treated / reference)" } else if fm.plan.design.get() == "paired" { "Mean difference to detect" } else { "Difference in means to detect (treated − reference)" }}</label>
                        <input id="plan-effect" inputmode="decimal" size="8" prop:value=move || fm.plan.effect.get()
                            on:input=move |ev| fm.plan.effect.set(event_target_value(&ev))/>
                    </div>
                    <div class="row" style:display=move || if fm.plan.design.get() == "k-groups" { "flex" } else { "none" }>
                        <label for="plan-means">"Assumed group means"</label>
                        <input id="plan-means" size="24" prop:value=move || fm.plan.means.get()
                            on:input=move |ev| fm.plan.means.set(event_target_value(&ev))/>
                        <span class="hint">"one per group, e.g. 0, 0, 0.5"</span>
                    </div>
                    <div class="row" style:display=move || if fm.plan.design.get() == "yes-no" { "flex" } else { "none" }>
                        <label for="plan-baseline">"Yes rate in the reference group"</label>
                        <input id="plan-baseline" inputmode="decimal" size="6" prop:value=move || fm.plan.baseline.get()
                            on:input=move |ev| fm.plan.baseline.set(event_target_value(&ev))/>
                        <label for="plan-rate">"and in the treated group"</label>
                        <input id="plan-rate" inputmode="decimal" size="6" prop:value=move || fm.plan.rate.get()
                            on:input=move |ev| fm.plan.rate.set(event_target_value(&ev))/>
                    </div>
                    <div class="row">
                        <label for="plan-alpha">"Significance level"</label>
                        <input id="plan-alpha" inputmode="decimal" size="6" prop:value=move || fm.plan.alpha.get()
                            on:input=move |ev| fm.plan.alpha.set(event_target_value(&ev))/>
                        <label for="plan-alt">"test"</label>
                        <select id="plan-alt" on:change=move |ev| {
                            if let Some(a) = Alternative::from_key(&event_target_value(&ev)) { fm.plan.alt.set(a) }
                        }>
                            <option value="two-sided" selected=move || fm.plan.alt.get() == Alternative::TwoSided>"two-sided"</option>
                            <option value="greater" selected=move || fm.plan.alt.get() == Alternative::Greater>"one-sided: treated higher"</option>
                            <option value="less" selected=move || fm.plan.alt.get() == Alternative::Less>"one-sided: treated lower"</option>
                        </select>
                        <label for="plan-power">"Target power (%)"</label>
                        <input id="plan-power" inputmode="decimal" size="5" prop:value=move || fm.plan.power.get()
                            on:input=move |ev| fm.plan.power.set(event_target_value(&ev))/>
                    </div>
                    <div class="row">
                        <label for="plan-mde-n">"Also: the smallest effect detectable with this many units per group"</label>
                        <input id="plan-mde-n" inputmode="numeric" size="7" placeholder="(optional)" prop:value=move || fm.plan.mde_n.get()
                            on:input=move |ev| fm.plan.mde_n.set(event_target_value(&ev))/>
                    </div>
                    <details class="settings">
                        <summary>"Simulation settings"</summary>
                        <div class="grid">
                            <label for="plan-studies">"Simulated studies per sample size"</label>
                            <input id="plan-studies" inputmode="numeric" prop:value=move || fm.plan.studies.get()
                                on:input=move |ev| fm.plan.studies.set(event_target_value(&ev))/>
                            <label for="plan-relabellings">"Random relabellings per simulated study"</label>
                            <input id="plan-relabellings" inputmode="numeric" prop:value=move || fm.plan.relabellings.get()
                                on:input=move |ev| fm.plan.relabellings.set(event_target_value(&ev))/>
                            <label for="plan-max-n">"Largest sample size to try"</label>
                            <input id="plan-max-n" inputmode="numeric" prop:value=move || fm.plan.max_n.get()
                                on:input=move |ev| fm.plan.max_n.set(event_target_value(&ev))/>
                        </div>
                        <p class="hint">"Power is estimated from simulated studies, each analysed with a modest number of relabellings: fewer relabellings and studies run faster but add simulation error and lose a little power. The findings say what was traded."</p>
                    </details>
                </div>
    }
}

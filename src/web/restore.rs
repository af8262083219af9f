//! Putting a job (from a share link or a saved analysis file) back on the page's form: the
//! inverse of [`Form::job`].

use leptos::prelude::*;

use super::form::{method_choice, percent_text, Form, RESTORED_SHAPE};
use crate::designs::estimate::EstimateLayout;
use crate::designs::paired::{sign_flip_settings, PairedLayout};
use crate::designs::plan::{PlanDesign, PlanModel, PlanRequest};
use crate::designs::yes_no::YesNoInput;
use crate::designs::TestSettings;
use crate::input::columns::Layout;
use crate::wire::Job;

impl Form {
    fn set_layout(&self, l: &Layout) {
        match l {
            Layout::Long { value, group } => {
                self.layout_kind.set("long".into());
                self.value_col.set(value.clone());
                self.group_col.set(group.clone());
            }
            Layout::Wide { columns } => {
                self.layout_kind.set("wide".into());
                self.col_a.set(columns.first().cloned().unwrap_or_default());
                self.col_b.set(columns.get(1).cloned().unwrap_or_default());
            }
            Layout::Detect => {
                // Resolve now (reading the table here, even a large one), so that a run
                // straight after restoring has its columns.
                let detected = self.data.with_untracked(|d| {
                    crate::input::outline::outline(d, self.header.get_untracked())
                        .ok()
                        .and_then(|o| o.layout)
                });
                self.apply_detected(&detected);
            }
        }
    }

    fn set_pair(&self, first: &Option<String>, second: &Option<String>) {
        if let Some(f) = first {
            self.first.set(f.clone());
        }
        if let Some(s) = second {
            self.second.set(s.clone());
        }
    }

    fn set_settings(&self, st: &TestSettings, default_limit: u64) {
        self.alternative.set(st.alternative);
        self.two_sided.set(st.two_sided);
        self.interval_choice.set(method_choice(&st.intervals));
        self.resamples.set(st.resamples.to_string());
        self.exact_limit.set(if st.exact_limit == default_limit {
            String::new()
        } else {
            st.exact_limit.to_string()
        });
        self.stop_after
            .set(st.stop_after.map(|h| h.to_string()).unwrap_or_default());
        self.settle_at
            .set(st.settle_at.map(|v| v.to_string()).unwrap_or_default());
        self.stop_set.set(true);
        self.boot_set.set(true);
        self.bootstrap.set(st.bootstrap_resamples.to_string());
        // Called after the data are restored: an older job keeps its kernels with them.
        self.old_kernels
            .set((st.kernels != crate::designs::KERNELS).then(|| {
                (
                    st.kernels,
                    self.data
                        .with_untracked(|d| crate::input::text::fingerprint(d)),
                )
            }));
        self.confidence.set(percent_text(st.confidence));
        self.seed.set(st.seed.to_string());
        self.mode.set("compare".into());
    }

    /// Puts a job (from a link or a saved file) on screen.
    pub fn restore(&self, job: &Job) {
        let (data, header) = match job {
            Job::TwoGroups(r) => (r.data.clone(), r.header),
            Job::Paired(r) => (r.data.clone(), r.header),
            Job::OneSample(r) => (r.data.clone(), r.header),
            Job::Association(r) => (r.data.clone(), r.header),
            Job::KGroups(r) => (r.data.clone(), r.header),
            Job::Stratified(r) => (r.data.clone(), r.header),
            Job::YesNo(r) => (r.data.clone(), r.header),
            Job::Estimate(r) => (r.data.clone(), r.header),
            Job::Plan(r) => match &r.model {
                // A plan from a pilot carries its table; otherwise the data box stays.
                PlanModel::Pilot { data, header, .. } => (data.clone(), *header),
                _ => (self.data.get_untracked(), self.header.get_untracked()),
            },
        };
        // Typed counts carry no table: keep the data box as it is.
        let (data, header) = if matches!(job, Job::YesNo(r) if matches!(r.input, YesNoInput::Counts { .. }))
        {
            (self.data.get_untracked(), self.header.get_untracked())
        } else {
            (data, header)
        };
        // The restored table's shape is not a new table: keep the design the job names.
        self.shape_seen.set(RESTORED_SHAPE.into());
        self.data.set(data);
        self.example.set(String::new());
        self.header.set(header);
        let splits = TestSettings::new(0).exact_limit;
        let patterns = sign_flip_settings(0).exact_limit;
        match job {
            Job::TwoGroups(r) => {
                self.set_settings(&r.settings, splits);
                self.design.set("two-groups".into());
                self.set_layout(&r.layout);
                self.set_pair(&r.first, &r.second);
                self.statistic.set(r.statistic);
            }
            Job::Paired(r) => {
                self.set_settings(&r.settings, patterns);
                self.design.set("paired".into());
                self.flip_stat.set(r.statistic);
                match &r.layout {
                    PairedLayout::Columns { first, second } => {
                        self.layout_kind.set("wide".into());
                        self.col_a.set(first.clone());
                        self.col_b.set(second.clone());
                        self.first.set(first.clone());
                        self.second.set(second.clone());
                    }
                    PairedLayout::Long {
                        value,
                        group,
                        unit,
                        first,
                        second,
                    } => {
                        self.layout_kind.set("long".into());
                        self.value_col.set(value.clone());
                        self.group_col.set(group.clone());
                        self.unit_col.set(unit.clone());
                        self.first.set(first.clone());
                        self.second.set(second.clone());
                    }
                }
            }
            Job::OneSample(r) => {
                self.set_settings(&r.settings, patterns);
                self.design.set("one-sample".into());
                self.flip_stat.set(r.statistic);
                self.est_value.set(r.value.clone());
                self.reference.set(format!("{}", r.reference));
            }
            Job::Association(r) => {
                self.set_settings(&r.settings, splits);
                self.design.set("association".into());
                self.est_x.set(r.x.clone());
                self.est_y.set(r.y.clone());
                self.assoc_stat.set(r.statistic);
            }
            Job::KGroups(r) => {
                self.set_settings(&r.settings, splits);
                self.design.set("k-groups".into());
                self.k_stat.set(r.statistic);
                self.control.set(r.control.clone().unwrap_or_default());
                match &r.layout {
                    Layout::Wide { columns } => {
                        self.layout_kind.set("wide".into());
                        self.k_columns.set(columns.clone());
                    }
                    l => self.set_layout(l),
                }
            }
            Job::Stratified(r) => {
                self.set_settings(&r.settings, splits);
                self.design.set("stratified".into());
                self.layout_kind.set("long".into());
                self.value_col.set(r.value.clone());
                self.group_col.set(r.group.clone());
                self.strata_col.set(r.strata.clone());
                self.weights.set(r.weights);
                self.set_pair(&r.first, &r.second);
            }
            Job::YesNo(r) => {
                self.set_settings(&r.settings, splits);
                self.design.set("yes-no".into());
                self.yn_stat.set(r.statistic);
                match &r.input {
                    YesNoInput::Table {
                        value,
                        group,
                        first,
                        second,
                    } => {
                        self.yn_source.set("table".into());
                        self.layout_kind.set("long".into());
                        self.value_col.set(value.clone());
                        self.group_col.set(group.clone());
                        self.set_pair(first, second);
                    }
                    YesNoInput::Counts { groups } => {
                        self.yn_source.set("counts".into());
                        self.counts_text.set(
                            groups
                                .iter()
                                .map(|g| format!("{}: {}/{}", g.name, g.yes, g.n))
                                .collect::<Vec<_>>()
                                .join(", "),
                        );
                    }
                }
            }
            Job::Estimate(r) => {
                self.mode.set("estimate".into());
                self.est_kind.set(r.estimate);
                if let Some(q) = r.q {
                    self.est_q.set(format!("{q}"));
                }
                match &r.layout {
                    EstimateLayout::One { value, strata } => {
                        self.est_value.set(value.clone());
                        self.est_strata.set(strata.clone().unwrap_or_default());
                    }
                    EstimateLayout::Groups {
                        layout,
                        first,
                        second,
                        paired,
                    } => {
                        self.set_layout(layout);
                        self.set_pair(first, second);
                        self.paired.set(*paired);
                    }
                    EstimateLayout::Pairs { x, y } => {
                        self.est_x.set(x.clone());
                        self.est_y.set(y.clone());
                    }
                }
                self.est_methods.set(method_choice(&r.methods));
                self.side.set(r.side);
                self.bootstrap.set(r.resamples.to_string());
                self.confidence.set(percent_text(r.confidence));
                self.seed.set(r.seed.to_string());
            }
            Job::Plan(r) => self.restore_plan(r),
        }
    }

    fn restore_plan(&self, r: &PlanRequest) {
        let p = self.plan;
        self.mode.set("plan".into());
        p.design.set(r.design.key().into());
        match &r.model {
            PlanModel::Normal { sd } => {
                p.model.set("normal".into());
                p.sd.set(format!("{sd}"));
            }
            PlanModel::Pilot {
                value, multiply, ..
            } => {
                p.model.set("pilot".into());
                p.value.set(value.clone());
                p.multiply.set(*multiply);
            }
            PlanModel::Rates { baseline } => {
                p.baseline.set(format!("{baseline}"));
                p.rate.set(format!("{}", baseline + r.effect));
            }
        }
        if r.design != PlanDesign::YesNo && r.design != PlanDesign::KGroups {
            p.effect.set(format!("{}", r.effect));
        }
        if !r.means.is_empty() {
            p.means.set(
                r.means
                    .iter()
                    .map(|m| format!("{}", m * r.effect))
                    .collect::<Vec<_>>()
                    .join(", "),
            );
        }
        p.stat.set(r.statistic.clone());
        p.alpha.set(format!("{}", r.alpha));
        p.power.set(percent_text(r.target_power));
        p.alt.set(r.alternative);
        p.studies.set(r.studies.to_string());
        p.relabellings.set(r.relabellings.to_string());
        p.max_n.set(r.max_n.to_string());
        p.mde_n
            .set(r.mde_n.map(|n| n.to_string()).unwrap_or_default());
        self.seed.set(r.seed.to_string());
    }
}

//! Putting a job (from a share link or a saved analysis file) back on the page's fields:
//! the inverse of [`Fields::job`].

use crate::designs::estimate::EstimateLayout;
use crate::designs::paired::{sign_flip_settings, PairedLayout};
use crate::designs::plan::{PlanDesign, PlanModel, PlanRequest};
use crate::designs::yes_no::YesNoInput;
use crate::designs::{TestSettings, KERNELS};
use crate::input::columns::Layout;
use crate::input::text::fingerprint;
use crate::wire::Job;

use super::{method_choice, percent_text, Fields, RESTORED_SHAPE};

impl Fields {
    fn set_layout(&mut self, l: &Layout) {
        match l {
            Layout::Long { value, group } => {
                self.layout_kind = "long".into();
                self.value_col = value.clone();
                self.group_col = group.clone();
            }
            Layout::Wide { columns } => {
                self.layout_kind = "wide".into();
                self.col_a = columns.first().cloned().unwrap_or_default();
                self.col_b = columns.get(1).cloned().unwrap_or_default();
            }
            Layout::Detect => {
                // Resolve now (reading the table here, even a large one), so that a run
                // straight after restoring has its columns.
                let detected = crate::input::outline::outline(&self.data, self.header)
                    .ok()
                    .and_then(|o| o.layout);
                self.apply_detected(&detected);
            }
        }
    }

    fn set_pair(&mut self, first: &Option<String>, second: &Option<String>) {
        if let Some(f) = first {
            self.first = f.clone();
        }
        if let Some(s) = second {
            self.second = s.clone();
        }
    }

    fn set_settings(&mut self, st: &TestSettings, default_limit: u64) {
        self.alternative = st.alternative;
        self.two_sided = st.two_sided;
        self.interval_choice = method_choice(&st.intervals);
        self.resamples = st.resamples.to_string();
        self.exact_limit = if st.exact_limit == default_limit {
            String::new()
        } else {
            st.exact_limit.to_string()
        };
        self.stop_after = st.stop_after.map(|h| h.to_string()).unwrap_or_default();
        self.settle_at = st.settle_at.map(|v| v.to_string()).unwrap_or_default();
        self.stop_set = true;
        self.boot_set = true;
        self.bootstrap = st.bootstrap_resamples.to_string();
        // Called after the data are restored: an older job keeps its kernels with them.
        self.old_kernels = (st.kernels != KERNELS).then(|| (st.kernels, fingerprint(&self.data)));
        self.confidence = percent_text(st.confidence);
        self.seed = st.seed.to_string();
        self.mode = "compare".into();
    }

    /// Puts a job (from a link or a saved file) on screen.
    pub fn restore(&mut self, job: &Job) {
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
                _ => (self.data.clone(), self.header),
            },
        };
        // Typed counts carry no table: keep the data box as it is.
        let (data, header) = if matches!(job, Job::YesNo(r) if matches!(r.input, YesNoInput::Counts { .. }))
        {
            (self.data.clone(), self.header)
        } else {
            (data, header)
        };
        // The restored table's shape is not a new table: keep the design the job names.
        self.shape_seen = RESTORED_SHAPE.into();
        self.data = data;
        self.example = String::new();
        self.header = header;
        let splits = TestSettings::new(0).exact_limit;
        let patterns = sign_flip_settings(0).exact_limit;
        match job {
            Job::TwoGroups(r) => {
                self.set_settings(&r.settings, splits);
                self.design = "two-groups".into();
                self.set_layout(&r.layout);
                self.set_pair(&r.first, &r.second);
                self.statistic = r.statistic;
                self.robustness = r.robustness;
            }
            Job::Paired(r) => {
                self.set_settings(&r.settings, patterns);
                self.design = "paired".into();
                self.flip_stat = r.statistic;
                match &r.layout {
                    PairedLayout::Columns { first, second } => {
                        self.layout_kind = "wide".into();
                        self.col_a = first.clone();
                        self.col_b = second.clone();
                        self.first = first.clone();
                        self.second = second.clone();
                    }
                    PairedLayout::Long {
                        value,
                        group,
                        unit,
                        first,
                        second,
                    } => {
                        self.layout_kind = "long".into();
                        self.value_col = value.clone();
                        self.group_col = group.clone();
                        self.unit_col = unit.clone();
                        self.first = first.clone();
                        self.second = second.clone();
                    }
                }
            }
            Job::OneSample(r) => {
                self.set_settings(&r.settings, patterns);
                self.design = "one-sample".into();
                self.flip_stat = r.statistic;
                self.est_value = r.value.clone();
                self.reference = format!("{}", r.reference);
            }
            Job::Association(r) => {
                self.set_settings(&r.settings, splits);
                self.design = "association".into();
                self.est_x = r.x.clone();
                self.est_y = r.y.clone();
                self.assoc_stat = r.statistic;
            }
            Job::KGroups(r) => {
                self.set_settings(&r.settings, splits);
                self.design = "k-groups".into();
                self.k_stat = r.statistic;
                self.control = r.control.clone().unwrap_or_default();
                match &r.layout {
                    Layout::Wide { columns } => {
                        self.layout_kind = "wide".into();
                        self.k_columns = columns.clone();
                    }
                    l => self.set_layout(l),
                }
            }
            Job::Stratified(r) => {
                self.set_settings(&r.settings, splits);
                self.design = "stratified".into();
                self.layout_kind = "long".into();
                self.value_col = r.value.clone();
                self.group_col = r.group.clone();
                self.strata_col = r.strata.clone();
                self.weights = r.weights;
                self.set_pair(&r.first, &r.second);
            }
            Job::YesNo(r) => {
                self.set_settings(&r.settings, splits);
                self.design = "yes-no".into();
                self.yn_stat = r.statistic;
                match &r.input {
                    YesNoInput::Table {
                        value,
                        group,
                        first,
                        second,
                    } => {
                        self.yn_source = "table".into();
                        self.layout_kind = "long".into();
                        self.value_col = value.clone();
                        self.group_col = group.clone();
                        self.set_pair(first, second);
                    }
                    YesNoInput::Counts { groups } => {
                        self.yn_source = "counts".into();
                        self.counts_text = groups
                            .iter()
                            .map(|g| format!("{}: {}/{}", g.name, g.yes, g.n))
                            .collect::<Vec<_>>()
                            .join(", ");
                    }
                }
            }
            Job::Estimate(r) => {
                self.mode = "estimate".into();
                self.est_kind = r.estimate;
                if let Some(q) = r.q {
                    self.est_q = format!("{q}");
                }
                match &r.layout {
                    EstimateLayout::One { value, strata } => {
                        self.est_value = value.clone();
                        self.est_strata = strata.clone().unwrap_or_default();
                    }
                    EstimateLayout::Groups {
                        layout,
                        first,
                        second,
                        paired,
                    } => {
                        self.set_layout(layout);
                        self.set_pair(first, second);
                        self.paired = *paired;
                    }
                    EstimateLayout::Pairs { x, y } => {
                        self.est_x = x.clone();
                        self.est_y = y.clone();
                    }
                }
                self.est_methods = method_choice(&r.methods);
                self.side = r.side;
                self.bootstrap = r.resamples.to_string();
                self.confidence = percent_text(r.confidence);
                self.seed = r.seed.to_string();
            }
            Job::Plan(r) => self.restore_plan(r),
        }
    }

    fn restore_plan(&mut self, r: &PlanRequest) {
        let p = &mut self.plan;
        self.mode = "plan".into();
        p.design = r.design.key().into();
        match &r.model {
            PlanModel::Normal { sd } => {
                p.model = "normal".into();
                p.sd = format!("{sd}");
            }
            PlanModel::Pilot {
                value, multiply, ..
            } => {
                p.model = "pilot".into();
                p.value = value.clone();
                p.multiply = *multiply;
            }
            PlanModel::Rates { baseline } => {
                p.baseline = format!("{baseline}");
                p.rate = format!("{}", baseline + r.effect);
            }
        }
        if r.design != PlanDesign::YesNo && r.design != PlanDesign::KGroups {
            p.effect = format!("{}", r.effect);
        }
        if !r.means.is_empty() {
            p.means = r
                .means
                .iter()
                .map(|m| format!("{}", m * r.effect))
                .collect::<Vec<_>>()
                .join(", ");
        }
        p.stat = r.statistic.clone();
        p.alpha = format!("{}", r.alpha);
        p.power = percent_text(r.target_power);
        p.alt = r.alternative;
        p.studies = r.studies.to_string();
        p.relabellings = r.relabellings.to_string();
        p.max_n = r.max_n.to_string();
        p.mde_n = r.mde_n.map(|n| n.to_string()).unwrap_or_default();
        self.seed = r.seed.to_string();
    }
}

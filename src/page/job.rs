//! The job the page's fields describe.

use crate::designs::association::AssocRequest;
use crate::designs::estimate::{Estimate, EstimateLayout, EstimateRequest, Kind};
use crate::designs::k_groups::KGroupsRequest;
use crate::designs::one_sample::OneSampleRequest;
use crate::designs::paired::{sign_flip_settings, PairedLayout, PairedRequest};
use crate::designs::plan::{PlanDesign, PlanModel, PlanRequest};
use crate::designs::stratified::StrataRequest;
use crate::designs::two_groups::TwoGroupsRequest;
use crate::designs::yes_no::{parse_counts, YesNoInput, YesNoRequest};
use crate::designs::{TestSettings, KERNELS};
use crate::input::columns::Layout;
use crate::input::text::fingerprint;
use crate::wire::Job;

use super::{methods_from, parse_count, parse_number, share, Fields};

impl Fields {
    /// The test settings shared by the comparison designs; `base` holds the design's own
    /// defaults (the exact limit, when the field is blank).
    fn settings(&self, base: TestSettings) -> Result<TestSettings, String> {
        let mut s = base;
        s.alternative = self.alternative;
        s.two_sided = self.two_sided;
        s.resamples = parse_count("Random relabellings", &self.resamples)?;
        let limit = self.exact_limit.clone();
        if !limit.trim().is_empty() {
            s.exact_limit = parse_count("Enumerate every possibility up to", &limit)?;
        }
        let stop = self.stop_after.clone();
        s.stop_after = if stop.trim().is_empty() {
            None
        } else {
            Some(parse_count("Stop early once this many", &stop)?)
        };
        let settle = self.settle_at.clone();
        s.settle_at = if settle.trim().is_empty() {
            None
        } else {
            Some(parse_number(
                "Stop once the p-value is settled against",
                &settle,
            )?)
        };
        s.bootstrap_resamples = parse_count("Bootstrap resamples", &self.bootstrap)?;
        s.confidence = share("Confidence level", &self.confidence)?;
        s.intervals = methods_from(&self.interval_choice);
        s.keep_resamples = true;
        s.kernels = match self.old_kernels {
            Some((k, print)) if fingerprint(&self.data) == print => k,
            _ => KERNELS,
        };
        Ok(s)
    }

    /// The two-group layout chosen in step 1.
    fn layout(&self) -> Layout {
        if self.layout_kind == "long" {
            Layout::Long {
                value: self.value_col.clone(),
                group: self.group_col.clone(),
            }
        } else {
            Layout::Wide {
                columns: vec![self.col_a.clone(), self.col_b.clone()],
            }
        }
    }

    fn chosen(s: &str) -> Option<String> {
        Some(s.to_string()).filter(|x| !x.is_empty())
    }

    /// The job the settings on screen describe.
    pub fn job(&self, seed: u64) -> Result<Job, String> {
        match self.mode.as_str() {
            "plan" => self.plan_job(seed),
            "estimate" => self.estimate_job(seed),
            _ => self.compare_job(seed),
        }
    }

    fn compare_job(&self, seed: u64) -> Result<Job, String> {
        let data = self.data.clone();
        let header = self.header;
        let long = self.layout_kind == "long";
        let settings = self.settings(TestSettings::new(seed))?;
        let first = Self::chosen(&self.first);
        // With more than two labels in a column, the second group is chosen too; two
        // columns are the two groups.
        let second = Self::chosen(&self.second).filter(|_| long);
        Ok(match self.design.as_str() {
            "association" => Job::Association(AssocRequest {
                header,
                statistic: self.assoc_stat,
                settings,
                ..AssocRequest::new(data, self.est_x.clone(), self.est_y.clone(), seed)
            }),
            "k-groups" => {
                let layout = if long {
                    self.layout()
                } else {
                    Layout::Wide {
                        columns: self.k_columns.clone(),
                    }
                };
                Job::KGroups(KGroupsRequest {
                    header,
                    statistic: self.k_stat,
                    control: Self::chosen(&self.control),
                    settings,
                    ..KGroupsRequest::new(data, layout, seed)
                })
            }
            "stratified" => {
                if !long {
                    return Err("A stratified comparison needs one column of values, one naming each row's group and one naming its stratum: in step 1 choose \"One column of values and one column naming each row's group\".".into());
                }
                if self.strata_col.is_empty() {
                    return Err("Choose the column that names each row's stratum (site, batch or day), under Design.".into());
                }
                Job::Stratified(StrataRequest {
                    header,
                    first,
                    second,
                    weights: self.weights,
                    settings,
                    ..StrataRequest::new(
                        data,
                        self.value_col.clone(),
                        self.group_col.clone(),
                        self.strata_col.clone(),
                        seed,
                    )
                })
            }
            "yes-no" => {
                let (input, data) = if self.yn_source == "counts" {
                    let groups = parse_counts(&self.counts_text)?;
                    (YesNoInput::Counts { groups }, String::new())
                } else {
                    if !long {
                        return Err("Yes/no outcomes in a table need one column of outcomes and one naming each row's group: in step 1 choose \"One column of values and one column naming each row's group\", or type the counts instead.".into());
                    }
                    let input = YesNoInput::Table {
                        value: self.value_col.clone(),
                        group: self.group_col.clone(),
                        first,
                        second,
                    };
                    (input, data)
                };
                Job::YesNo(YesNoRequest {
                    header,
                    statistic: self.yn_stat,
                    settings,
                    ..YesNoRequest::new(data, input, seed)
                })
            }
            "paired" => {
                let layout = if long {
                    if self.unit_col.is_empty() {
                        return Err("Paired data in long format need a column naming each unit (plant, patient, machine): choose it under Design, or put each measurement in its own column in step 1.".into());
                    }
                    PairedLayout::Long {
                        value: self.value_col.clone(),
                        group: self.group_col.clone(),
                        unit: self.unit_col.clone(),
                        first: self.first.clone(),
                        second: self.second.clone(),
                    }
                } else {
                    PairedLayout::Columns {
                        first: self.first.clone(),
                        second: self.second.clone(),
                    }
                };
                Job::Paired(PairedRequest {
                    header,
                    statistic: self.flip_stat,
                    settings: self.settings(sign_flip_settings(seed))?,
                    ..PairedRequest::new(data, layout, seed)
                })
            }
            "one-sample" => {
                let reference = parse_number("Reference value", &self.reference)?;
                Job::OneSample(OneSampleRequest {
                    header,
                    statistic: self.flip_stat,
                    settings: self.settings(sign_flip_settings(seed))?,
                    ..OneSampleRequest::new(data, self.est_value.clone(), reference, seed)
                })
            }
            _ => Job::TwoGroups(TwoGroupsRequest {
                header,
                layout: self.layout(),
                first,
                second,
                statistic: self.statistic,
                robustness: self.robustness,
                settings,
                ..TwoGroupsRequest::new(data, seed)
            }),
        })
    }

    fn estimate_job(&self, seed: u64) -> Result<Job, String> {
        let e = self.est_kind;
        let long = self.layout_kind == "long";
        let layout = match e.kind() {
            Kind::One => EstimateLayout::One {
                value: self.est_value.clone(),
                strata: Self::chosen(&self.est_strata),
            },
            Kind::Two => EstimateLayout::Groups {
                layout: self.layout(),
                first: Self::chosen(&self.first),
                second: Self::chosen(&self.second).filter(|_| long),
                paired: self.paired && !long,
            },
            Kind::Association => EstimateLayout::Pairs {
                x: self.est_x.clone(),
                y: self.est_y.clone(),
            },
        };
        let mut r = EstimateRequest::new(self.data.clone(), layout, e, seed);
        r.header = self.header;
        r.confidence = share("Confidence level", &self.confidence)?;
        r.resamples = parse_count("Bootstrap resamples", &self.bootstrap)?;
        r.methods = methods_from(&self.est_methods);
        r.side = self.side;
        r.keep_resamples = true;
        if e == Estimate::Quantile {
            let t = self.est_q.clone();
            let v = parse_number("Quantile", &t)
                .map_err(|m| format!("{m} Write 0.9 for the 90th percentile."))?;
            r.q = Some(if v > 1.0 { v / 100.0 } else { v });
        }
        Ok(Job::Estimate(r))
    }

    fn plan_job(&self, seed: u64) -> Result<Job, String> {
        let p = &self.plan;
        let num = |label: &str, s: &String| parse_number(label, s);
        let d = PlanDesign::from_key(&p.design).unwrap_or(PlanDesign::TwoGroups);
        let model = if d == PlanDesign::YesNo {
            PlanModel::Rates {
                baseline: num("Baseline rate", &p.baseline)?,
            }
        } else if p.model == "pilot" {
            PlanModel::Pilot {
                data: self.data.clone(),
                header: self.header,
                value: p.value.clone(),
                multiply: p.multiply && d == PlanDesign::TwoGroups,
            }
        } else {
            PlanModel::Normal {
                sd: num("Standard deviation", &p.sd)?,
            }
        };
        let effect = match d {
            PlanDesign::YesNo => {
                num("Yes rate in the treated group", &p.rate)? - num("Baseline rate", &p.baseline)?
            }
            PlanDesign::KGroups => 1.0,
            _ => num("Effect to detect", &p.effect)?,
        };
        let mut r = PlanRequest::new(d, model, effect, seed);
        if d == PlanDesign::KGroups {
            r.means = p
                .means
                .clone()
                .split([',', ';', ' '])
                .filter(|t| !t.trim().is_empty())
                .map(|t| parse_number("Group means", t))
                .collect::<Result<Vec<f64>, String>>()?;
        }
        r.statistic = p.stat.clone();
        r.alpha = num("Significance level", &p.alpha)?;
        r.target_power = share("Target power", &p.power)?;
        r.alternative = p.alt;
        r.studies = parse_count("Simulated studies per size", &p.studies)?;
        r.relabellings = parse_count("Relabellings per study", &p.relabellings)?;
        r.max_n = parse_count("Largest size to try", &p.max_n)?;
        let m = p.mde_n.clone();
        r.mde_n = if m.trim().is_empty() {
            None
        } else {
            Some(parse_count("Size for the detectable effect", &m)?)
        };
        Ok(Job::Plan(r))
    }
}

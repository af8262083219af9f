//! The wire protocol: the jobs the page, the web worker and the command exchange, the report
//! of any job, and the messages of the worker. Share links are in [`link`].

use serde::{Deserialize, Serialize};

use crate::base::{Progress, ProgressFn, RunError};
use crate::designs;

pub mod link;

/// A unit of work for the worker (and the command's `--request` files).
#[derive(Clone, Debug, PartialEq, Serialize, Deserialize)]
#[serde(tag = "job", content = "request", rename_all = "kebab-case")]
pub enum Job {
    Compare(designs::two_groups::Request),
    Estimate(crate::designs::estimate::EstimateRequest),
    Paired(crate::designs::paired::PairedRequest),
    Association(crate::designs::association::AssocRequest),
    KGroups(crate::designs::k_groups::KGroupsRequest),
    Stratified(crate::designs::stratified::StrataRequest),
    YesNo(crate::designs::yes_no::YesNoRequest),
    Plan(crate::designs::plan::PlanRequest),
}

/// The report of any job.
#[derive(Clone, Debug, PartialEq, Serialize, Deserialize)]
#[serde(tag = "job", content = "report", rename_all = "kebab-case")]
pub enum AnyReport {
    Compare(designs::two_groups::Report),
    Estimate(crate::designs::estimate::EstimateReport),
    Paired(crate::designs::paired::PairedReport),
    Association(crate::designs::association::AssocReport),
    KGroups(crate::designs::k_groups::KGroupsReport),
    Stratified(crate::designs::stratified::StrataReport),
    YesNo(crate::designs::yes_no::YesNoReport),
    Plan(crate::designs::plan::PlanReport),
}

impl Job {
    /// Runs the job with the engine.
    pub fn run(&self, progress: ProgressFn) -> Result<AnyReport, RunError> {
        Ok(match self {
            Job::Compare(r) => AnyReport::Compare(crate::designs::two_groups::run(r, progress)?),
            Job::Estimate(r) => AnyReport::Estimate(crate::designs::estimate::run(r, progress)?),
            Job::Paired(r) => AnyReport::Paired(crate::designs::paired::run(r, progress)?),
            Job::Association(r) => {
                AnyReport::Association(crate::designs::association::run(r, progress)?)
            }
            Job::KGroups(r) => AnyReport::KGroups(crate::designs::k_groups::run(r, progress)?),
            Job::Stratified(r) => {
                AnyReport::Stratified(crate::designs::stratified::run(r, progress)?)
            }
            Job::YesNo(r) => AnyReport::YesNo(crate::designs::yes_no::run(r, progress)?),
            Job::Plan(r) => AnyReport::Plan(crate::designs::plan::run(r, progress)?),
        })
    }

    pub fn format_version(&self) -> u32 {
        match self {
            Job::Compare(r) => r.format_version,
            Job::Estimate(r) => r.format_version,
            Job::Paired(r) => r.format_version,
            Job::Association(r) => r.format_version,
            Job::KGroups(r) => r.format_version,
            Job::Stratified(r) => r.format_version,
            Job::YesNo(r) => r.format_version,
            Job::Plan(r) => r.format_version,
        }
    }

    pub fn seed(&self) -> u64 {
        match self {
            Job::Compare(r) => r.seed,
            Job::Estimate(r) => r.seed,
            Job::Paired(r) => r.seed,
            Job::Association(r) => r.seed,
            Job::KGroups(r) => r.settings.seed,
            Job::Stratified(r) => r.settings.seed,
            Job::YesNo(r) => r.settings.seed,
            Job::Plan(r) => r.seed,
        }
    }

    /// The pasted table the job reads ("" when it reads none).
    pub fn data(&self) -> &str {
        match self {
            Job::Compare(r) => &r.data,
            Job::Estimate(r) => &r.data,
            Job::Paired(r) => &r.data,
            Job::Association(r) => &r.data,
            Job::KGroups(r) => &r.data,
            Job::Stratified(r) => &r.data,
            Job::YesNo(r) => &r.data,
            Job::Plan(r) => match &r.model {
                crate::designs::plan::PlanModel::Pilot { data, .. } => data,
                _ => "",
            },
        }
    }

    /// Removes the data (and typed counts), keeping the settings: for a settings-only link.
    pub fn clear_data(&mut self) {
        match self {
            Job::Compare(r) => r.data.clear(),
            Job::Estimate(r) => r.data.clear(),
            Job::Paired(r) => r.data.clear(),
            Job::Association(r) => r.data.clear(),
            Job::KGroups(r) => r.data.clear(),
            Job::Stratified(r) => r.data.clear(),
            Job::YesNo(r) => {
                r.data.clear();
                if let crate::designs::yes_no::YesNoInput::Counts { groups } = &mut r.input {
                    for g in groups {
                        (g.yes, g.n) = (0, 0);
                    }
                }
            }
            Job::Plan(r) => {
                if let crate::designs::plan::PlanModel::Pilot { data, .. } = &mut r.model {
                    data.clear();
                }
            }
        }
    }

    /// Whether the job carries what it analyses (a settings-only link does not).
    pub fn has_data(&self) -> bool {
        match self {
            Job::YesNo(r) => match &r.input {
                crate::designs::yes_no::YesNoInput::Counts { groups } => {
                    groups.iter().all(|g| g.n > 0)
                }
                _ => !r.data.trim().is_empty(),
            },
            Job::Plan(r) => {
                !matches!(r.model, crate::designs::plan::PlanModel::Pilot { .. })
                    || !self.data().trim().is_empty()
            }
            j => !j.data().trim().is_empty(),
        }
    }
}

/// Messages from the worker to the page.
#[derive(Clone, Debug, Serialize, Deserialize)]
#[serde(tag = "type", rename_all = "kebab-case")]
pub enum WorkerMessage {
    /// The worker has loaded and takes requests.
    Ready,
    Progress(Progress),
    Done {
        report: Box<AnyReport>,
    },
    Failed {
        message: String,
    },
}

//! The wire protocol: the jobs the page, the web worker and the command exchange, the report
//! of any job, the messages of the worker, and the format versions of saved analyses and
//! share links ([`link`]; version 1 is read by [`v1`]).
//!
//! A saved analysis (format version 2) is one JSON object:
//! `{"format_version": 2, "design": "two-groups", "request": {…}}`; a report as the command
//! prints it: `{"format_version": 2, "engine_version": "…", "design": "…", "report": {…}}`.

use serde::{Deserialize, Serialize};
use serde_json::Value;

use crate::base::{Error, ErrorKind, Progress, ProgressFn};
use crate::designs::{self, Design, DesignKey};

pub mod link;
pub mod v1;

/// Version of the saved-analysis, link and report format this build writes.
pub const FORMAT_VERSION: u32 = 2;

/// Engine version, reported with every result.
pub const ENGINE_VERSION: &str = env!("CARGO_PKG_VERSION");

/// Declares the jobs and reports of the registered designs: one line per design.
macro_rules! registry {
    ($($variant:ident => $design:ty),* $(,)?) => {
        /// A unit of work: one design's request.
        #[derive(Clone, Debug, PartialEq, Serialize, Deserialize)]
        #[serde(tag = "design", content = "request", rename_all = "kebab-case")]
        pub enum Job {
            $(
                #[allow(missing_docs)]
                $variant(<$design as Design>::Request),
            )*
        }

        /// The report of any job.
        #[derive(Clone, Debug, PartialEq, Serialize, Deserialize)]
        #[serde(tag = "design", content = "report", rename_all = "kebab-case")]
        pub enum Report {
            $(
                #[allow(missing_docs)]
                $variant(<$design as Design>::Report),
            )*
        }

        impl Job {
            /// The design of the job.
            pub fn key(&self) -> DesignKey {
                match self {
                    $(Job::$variant(_) => <$design as Design>::KEY,)*
                }
            }

            /// Checks the job before any work starts.
            pub fn check(&self) -> Result<(), Error> {
                match self {
                    $(Job::$variant(r) => <$design as Design>::check(r),)*
                }
            }

            /// Runs the job (a table of [`READING_SHOWN`] characters or more is announced as
            /// being read first: reading it takes seconds).
            pub fn run(&self, progress: ProgressFn) -> Result<Report, Error> {
                let characters = self.data().len() as u64;
                if characters >= READING_SHOWN
                    && !progress(&crate::base::Progress {
                        stage: crate::base::Stage::Reading { characters },
                        done: 0,
                        total: 0,
                        running: None,
                        sketch: None,
                    })
                {
                    return Err(Error::cancelled());
                }
                Ok(match self {
                    $(Job::$variant(r) => Report::$variant(<$design as Design>::run(r, progress)?),)*
                })
            }

            /// The pasted table the job reads ("" when it reads none).
            pub fn data(&self) -> &str {
                match self {
                    $(Job::$variant(r) => <$design as Design>::data(r),)*
                }
            }

            /// Removes the data (and typed counts), keeping the settings.
            pub fn clear_data(&mut self) {
                match self {
                    $(Job::$variant(r) => <$design as Design>::clear_data(r),)*
                }
            }

            /// Whether the job carries what it analyses (a settings-only link does not).
            pub fn has_data(&self) -> bool {
                match self {
                    $(Job::$variant(r) => <$design as Design>::has_data(r),)*
                }
            }

            /// The seed of the job's random streams.
            pub fn seed(&self) -> u64 {
                match self {
                    $(Job::$variant(r) => <$design as Design>::seed(r),)*
                }
            }

            /// The test settings of a job with a permutation test (none for estimates and
            /// plans).
            pub fn test_settings(&mut self) -> Option<&mut crate::designs::TestSettings> {
                match self {
                    $(Job::$variant(r) => <$design as Design>::test_settings(r),)*
                }
            }
        }

        impl Report {
            /// The permutation test of the report, for designs with one.
            pub fn test_outcome(&self) -> Option<&crate::designs::TestOutcome> {
                match self {
                    $(Report::$variant(r) => <$design as Design>::test_outcome(r),)*
                }
            }

            /// The design of the report.
            pub fn key(&self) -> DesignKey {
                match self {
                    $(Report::$variant(_) => <$design as Design>::KEY,)*
                }
            }
        }
    };
}

registry! {
    TwoGroups => designs::two_groups::TwoGroupsDesign,
    Paired => designs::paired::PairedDesign,
    OneSample => designs::one_sample::OneSampleDesign,
    Association => designs::association::AssociationDesign,
    KGroups => designs::k_groups::KGroupsDesign,
    Stratified => designs::stratified::StratifiedDesign,
    YesNo => designs::yes_no::YesNoDesign,
    Estimate => designs::estimate::EstimateDesign,
    Plan => designs::plan::PlanningDesign,
}

/// A job as saved and linked: the format version beside the design and its request.
#[derive(Serialize)]
struct SavedRef<'a> {
    format_version: u32,
    #[serde(flatten)]
    job: &'a Job,
}

/// The job as a saved analysis (compact JSON).
pub fn write_job(job: &Job) -> String {
    serde_json::to_string(&SavedRef {
        format_version: FORMAT_VERSION,
        job,
    })
    .unwrap_or_default()
}

/// The job as a saved analysis file (indented JSON).
pub fn write_job_pretty(job: &Job) -> String {
    serde_json::to_string_pretty(&SavedRef {
        format_version: FORMAT_VERSION,
        job,
    })
    .unwrap_or_default()
}

/// A job read from a saved analysis, with the format version it was written in.
#[derive(Clone, Debug, PartialEq)]
pub struct Read {
    /// The job.
    pub job: Job,
    /// The format version it was written in (1 or 2).
    pub version: u32,
}

/// Reads a saved analysis of format version 2 or 1 (also a bare version-1 two-group request,
/// as early versions of the command read them).
pub fn read_job(text: &str) -> Result<Read, Error> {
    let value: Value = serde_json::from_str(text).map_err(|e| {
        Error::new(
            ErrorKind::Link,
            format!("This is not a saved Reshuffle analysis: it is not valid JSON ({e})."),
        )
    })?;
    read_value(value)
}

/// Reads a saved analysis already parsed as JSON.
pub fn read_value(value: Value) -> Result<Read, Error> {
    let top = value.get("format_version").and_then(Value::as_u64);
    let inner = value
        .get("request")
        .and_then(|r| r.get("format_version"))
        .and_then(Value::as_u64);
    match (top, inner) {
        (Some(2), _) => {
            let mut v = value;
            if let Some(m) = v.as_object_mut() {
                m.remove("format_version");
            }
            let job: Job = serde_json::from_value(v).map_err(|e| {
                Error::new(
                    ErrorKind::Link,
                    format!("The analysis could not be read ({e})."),
                )
            })?;
            Ok(Read { job, version: 2 })
        }
        (Some(1), None) | (None, Some(1)) => Ok(Read {
            job: v1::read(value)?,
            version: 1,
        }),
        (Some(v), _) | (None, Some(v)) => Err(Error::new(
            ErrorKind::Version,
            format!(
                "This analysis was saved in format version {v}; this version of Reshuffle \
                 reads versions 1 and {FORMAT_VERSION}. Open it with a newer Reshuffle, or \
                 enter the settings again."
            ),
        )),
        (None, None) => Err(Error::new(
            ErrorKind::Link,
            "This is not a saved Reshuffle analysis (it names no format version).",
        )),
    }
}

/// A report as the command prints it: format and engine version, design, report.
pub fn report_json(report: &Report) -> String {
    report_json_on(report, None)
}

/// [`report_json`] with the number of threads (or workers) the run used, when known: it
/// never changes a number, so it sits in the envelope, not in the report.
pub fn report_json_on(report: &Report, threads: Option<usize>) -> String {
    #[derive(Serialize)]
    struct Out<'a> {
        format_version: u32,
        engine_version: &'a str,
        #[serde(skip_serializing_if = "Option::is_none")]
        threads: Option<usize>,
        #[serde(flatten)]
        report: &'a Report,
    }
    serde_json::to_string_pretty(&Out {
        format_version: FORMAT_VERSION,
        engine_version: ENGINE_VERSION,
        threads,
        report,
    })
    .unwrap_or_default()
}

/// Tables of this many characters or more are announced as being read when a job starts.
pub const READING_SHOWN: u64 = 1 << 20;

/// Messages from the worker to the page.
#[derive(Clone, Debug, Serialize, Deserialize)]
#[serde(tag = "type", rename_all = "kebab-case")]
pub enum WorkerMessage {
    /// The worker has loaded and takes requests.
    Ready,
    /// A step of the run.
    Progress(Progress),
    /// The report.
    Done {
        /// The report.
        report: Box<Report>,
    },
    /// The run stopped with an error.
    Failed {
        /// What went wrong.
        error: Error,
    },
    /// The outline of a table the page asked to have read.
    Outline {
        /// The page's number of the request.
        id: u64,
        /// The outline, or what is wrong with the table.
        outline: Box<Result<crate::input::outline::Outline, Error>>,
    },
    /// A shared run paused: this worker's share of the round (see
    /// [`crate::resample::share`]).
    Paused {
        /// The run it belongs to (the page's number).
        run: u64,
        /// The blocks this worker computed.
        blocks: Vec<SharedBlock>,
    },
}

/// Messages from the page to a worker that shares a run with others.
#[derive(Clone, Debug, Serialize, Deserialize)]
#[serde(tag = "type", rename_all = "kebab-case")]
pub enum PageMessage {
    /// Run (or run again) a job shared among `workers` workers, as worker `worker`.
    Share {
        /// The page's number of the run (answers carry it, so that late answers of an
        /// earlier run are recognised).
        run: u64,
        worker: u64,
        workers: u64,
        /// The job as saved-file JSON: in the first round only (later rounds reuse it).
        #[serde(default, skip_serializing_if = "Option::is_none")]
        job: Option<String>,
        /// Blocks computed in the last round, by every worker.
        blocks: Vec<SharedBlock>,
    },
    /// Read a table and answer with its outline.
    Outline {
        /// The page's number of the request.
        id: u64,
        /// The table's text.
        data: String,
        header: crate::input::table::HeaderChoice,
    },
}

/// One block's result crossing between workers: the call and block it belongs to and its
/// bytes in base64.
#[derive(Clone, Debug, Serialize, Deserialize)]
pub struct SharedBlock {
    pub call: u64,
    pub block: u64,
    pub bytes: String,
}

impl SharedBlock {
    /// A block and its bytes.
    pub fn new(id: crate::resample::share::BlockId, bytes: &[u8]) -> SharedBlock {
        use base64::Engine;
        SharedBlock {
            call: id.0,
            block: id.1,
            bytes: base64::engine::general_purpose::STANDARD_NO_PAD.encode(bytes),
        }
    }

    /// The block and its bytes (None if the text is not base64).
    pub fn read(&self) -> Option<(crate::resample::share::BlockId, Vec<u8>)> {
        use base64::Engine;
        base64::engine::general_purpose::STANDARD_NO_PAD
            .decode(&self.bytes)
            .ok()
            .map(|b| ((self.call, self.block), b))
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::designs::two_groups::TwoGroupsRequest;

    #[test]
    fn saved_jobs_round_trip_and_name_their_version() {
        let job = Job::TwoGroups(TwoGroupsRequest::new("y,g\n1,a\n2,b\n".into(), 5));
        let text = write_job(&job);
        assert!(
            text.starts_with("{\"format_version\":2,\"design\":\"two-groups\""),
            "{text}"
        );
        let back = read_job(&text).unwrap();
        assert_eq!(back.job, job);
        assert_eq!(back.version, 2);
        assert_eq!(read_job(&write_job_pretty(&job)).unwrap().job, job);
    }

    #[test]
    fn unknown_versions_and_foreign_json_are_refused_with_a_reason() {
        let e = read_job("{\"format_version\":7,\"design\":\"two-groups\"}").unwrap_err();
        assert_eq!(e.kind, ErrorKind::Version);
        assert!(e.message.contains("format version 7"), "{e}");
        let e = read_job("[1, 2, 3]").unwrap_err();
        assert_eq!(e.kind, ErrorKind::Link);
        let e = read_job("not json").unwrap_err();
        assert!(e.message.contains("not valid JSON"), "{e}");
    }
}

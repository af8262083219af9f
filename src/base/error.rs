//! Why a run produced no report, and the progress of a long run.

use serde::{Deserialize, Serialize};

/// Why a run produced no report.
#[derive(Clone, Debug, PartialEq)]
pub enum RunError {
    /// Something about the data or the settings; the message says what and what to do.
    Input(String),
    /// The caller asked to stop.
    Cancelled,
}

impl std::fmt::Display for RunError {
    fn fmt(&self, f: &mut std::fmt::Formatter<'_>) -> std::fmt::Result {
        match self {
            RunError::Input(m) => f.write_str(m),
            RunError::Cancelled => f.write_str("The analysis was stopped."),
        }
    }
}

/// A step of a long run, for progress display.
#[derive(Clone, Debug, PartialEq, Serialize, Deserialize)]
pub struct Progress {
    pub stage: String,
    pub done: u64,
    pub total: u64,
}

/// Callback for progress; return false to stop the run.
pub type ProgressFn<'a> = &'a mut dyn FnMut(&Progress) -> bool;

//! The one error type of the engine, and the progress of a long run.
//!
//! An error carries a kind, a message that says what is wrong and what to do, and, where it
//! applies, the line and the column of the table, so that each face can point at the cell.

use serde::{Deserialize, Serialize};

/// What kind of problem stopped a run.
#[derive(Clone, Copy, Debug, PartialEq, Eq, Serialize, Deserialize)]
#[serde(rename_all = "kebab-case")]
pub enum ErrorKind {
    /// The text cannot be read as a table (empty, ragged, an unterminated quote).
    Table,
    /// A column is missing, or of the wrong kind for its role.
    Column,
    /// A cell holds something the analysis cannot use.
    Value,
    /// The data do not fit the design (too few values, one group only, no variation).
    Data,
    /// A setting is out of range or the settings contradict each other.
    Settings,
    /// The request or file is in a format version this build does not read.
    Version,
    /// A share link or a saved file is damaged or is not an analysis.
    Link,
    /// The work or memory the request needs is more than the bound.
    Limit,
    /// The caller asked to stop.
    Cancelled,
}

/// Why a run produced no report.
#[derive(Clone, Debug, PartialEq, Serialize, Deserialize)]
pub struct Error {
    /// What kind of problem.
    pub kind: ErrorKind,
    /// What is wrong and what to do, in a sentence or two.
    pub message: String,
    /// The line of the pasted text, where one cell or row is at fault (1-based).
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub line: Option<u64>,
    /// The column, where one column is at fault.
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub column: Option<String>,
}

impl Error {
    /// An error of this kind with this message.
    pub fn new(kind: ErrorKind, message: impl Into<String>) -> Error {
        Error {
            kind,
            message: message.into(),
            line: None,
            column: None,
        }
    }

    /// A problem with the data.
    pub fn data(message: impl Into<String>) -> Error {
        Error::new(ErrorKind::Data, message)
    }

    /// A problem with the settings.
    pub fn settings(message: impl Into<String>) -> Error {
        Error::new(ErrorKind::Settings, message)
    }

    /// The run was stopped.
    pub fn cancelled() -> Error {
        Error::new(ErrorKind::Cancelled, "The analysis was stopped.")
    }

    /// The same error, pointing at a line of the table.
    pub fn at_line(mut self, line: u64) -> Error {
        self.line = Some(line);
        self
    }

    /// The same error, pointing at a column of the table.
    pub fn in_column(mut self, column: impl Into<String>) -> Error {
        self.column = Some(column.into());
        self
    }

    /// Whether the run was stopped rather than failed.
    pub fn is_cancelled(&self) -> bool {
        self.kind == ErrorKind::Cancelled
    }
}

impl std::fmt::Display for Error {
    fn fmt(&self, f: &mut std::fmt::Formatter<'_>) -> std::fmt::Result {
        f.write_str(&self.message)
    }
}

impl std::error::Error for Error {}

/// What a long run is doing.
#[derive(Clone, Debug, PartialEq, Serialize, Deserialize)]
#[serde(tag = "stage", rename_all = "kebab-case")]
pub enum Stage {
    /// Reading and checking a large table (no count of done: `done` and `total` are 0).
    Reading {
        /// Characters of the table.
        characters: u64,
    },
    /// Relabelling the values (two groups, k groups, strata).
    Relabelling,
    /// Flipping the signs of differences (paired, one sample).
    SignPatterns,
    /// Re-pairing y with x (association).
    Pairings,
    /// Summing the exact distribution of a 2×2 table.
    ExactTest,
    /// Bootstrap resampling.
    Bootstrap,
    /// A follow-up comparison of k groups.
    Comparison {
        /// Which one (1-based).
        index: usize,
        /// Of how many.
        of: usize,
    },
    /// Simulated studies at one sample size (planning).
    Simulation {
        /// The sample size.
        n: u64,
        /// Sizes evaluated so far.
        sizes: usize,
    },
    /// Simulated studies while searching for the smallest detectable effect (planning).
    Detectable {
        /// The sample size.
        n: u64,
        /// The effect tried.
        effect: f64,
    },
}

/// A step of a long run, for progress display.
#[derive(Clone, Debug, PartialEq, Serialize, Deserialize)]
pub struct Progress {
    /// What is being done.
    #[serde(flatten)]
    pub stage: Stage,
    /// How much of it is done.
    pub done: u64,
    /// How much there is.
    pub total: u64,
    /// The p-value so far, in a run of random relabellings.
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub running: Option<Running>,
    /// The statistics so far, binned, for a figure that fills in while the run goes.
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub sketch: Option<Sketch>,
}

/// The resampled statistics of a run so far, in equal bins over a range fixed by the first
/// block (values beyond it fall in the end bins), with the observed value or estimate.
#[derive(Clone, Debug, PartialEq, Serialize, Deserialize)]
pub struct Sketch {
    pub low: f64,
    pub high: f64,
    pub counts: Vec<u64>,
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub mark: Option<f64>,
}

/// The Monte Carlo p-value of the relabellings drawn so far, (b + 1)/(m + 1), with its 99%
/// interval: what a run would report if it ended here.
#[derive(Clone, Copy, Debug, PartialEq, Serialize, Deserialize)]
pub struct Running {
    /// Relabellings at least as extreme as the observed one so far (b).
    pub extreme: u64,
    pub p: f64,
    pub low: f64,
    pub high: f64,
}

/// Callback for progress; return false to stop the run.
pub type ProgressFn<'a> = &'a mut dyn FnMut(&Progress) -> bool;

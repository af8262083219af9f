//! The base every layer stands on: the shared vocabulary, the error and progress types, and
//! how numbers are written in messages and reports.

pub mod error;
pub mod format;
pub mod note;
pub mod vocab;

pub use error::{Progress, ProgressFn, RunError};
pub use note::{InfiniteCause, Note};
pub use vocab::*;

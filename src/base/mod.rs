//! The base every layer stands on: the shared vocabulary, the error and progress types, and
//! how numbers are written in messages and reports.

pub mod error;
pub mod floats;
pub mod format;
pub mod note;
pub mod vocab;

pub use error::{Error, ErrorKind, Progress, ProgressFn, Running, Sketch, Stage};
pub use note::{InfiniteCause, Note};
pub use vocab::*;

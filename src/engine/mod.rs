//! The resampling engine: plain Rust, no web dependency.

pub mod analysis;
pub mod assoc;
pub mod binary;
pub mod boot;
pub mod classical;
pub mod combin;
pub mod design;
pub mod document;
pub mod estimate;
pub mod finding;
pub mod format;
pub mod groups;
pub mod kgroups;
pub mod link;
pub mod multiple;
pub mod normal;
pub mod paired;
pub mod perm;
pub mod plan;
pub mod plot;
pub mod protocol;
pub mod report;
pub mod rng;
pub mod signflip;
pub mod stats;
pub mod strata;
pub mod suggest;
pub mod table;

pub use analysis::{run, RunError};
pub use protocol::{Report, Request};

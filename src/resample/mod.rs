//! Resampling: seeded block streams, the relabelling kernels of each design, the one
//! exact-or-random driver, the p-value with its Monte Carlo error, and the bootstrap.

pub mod binomial;
pub mod boot;
pub mod combin;
pub mod driver;
pub mod effects;
pub mod k_groups;
pub mod kendall;
pub mod large;
pub mod large_boot;
pub mod pairings;
pub mod parallel;
pub mod rng;
pub mod share;
pub mod signs;
pub mod strata;
pub mod summary;
pub mod tally;
pub mod two_groups;

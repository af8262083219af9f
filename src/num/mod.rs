//! Numerical building blocks: descriptive statistics, selection, ranks, the normal
//! distribution and log-gamma (pure-Rust libm, so browser and native builds agree).

pub mod binomial;
pub mod normal;
pub mod stats;

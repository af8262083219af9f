//! Reshuffle: resampling inference that runs in the browser.
//!
//! The engine is plain Rust with no web dependency, in layers that import downward only:
//!
//! - [`base`]: the shared vocabulary (alternatives, intervals, histograms), errors, progress;
//! - [`num`]: descriptive statistics and the normal distribution;
//! - [`input`]: reading tables, finding columns and groups, suggesting a design;
//! - [`resample`]: random streams, the relabelling kernels, the exact-or-random driver with
//!   the p-value and its Monte Carlo error, and the bootstrap;
//! - [`classical`]: t-tests, rank tests, ANOVA, 2×2 tables, the linear model, multiplicity;
//! - [`designs`]: one module per design (its request, validation, run and report);
//! - [`wire`]: the jobs and reports the faces exchange, format versions, share links;
//! - [`render`]: findings as text, Markdown, HTML and CSV, and the figures as SVG.
//!
//! - [`page`]: the page's form as plain data, and its round trip with jobs.
//!
//! The faces sit on top: the native command ([`cli`]) and the page and its web worker
//! (`web`, wasm only).

pub mod base;
pub mod classical;
pub mod designs;
pub mod input;
pub mod num;
pub mod page;
pub mod render;
pub mod resample;
pub mod wire;

#[cfg(not(target_arch = "wasm32"))]
pub mod cli;

#[cfg(target_arch = "wasm32")]
pub mod web;

//! Reshuffle: resampling inference that runs in the browser.
//!
//! `engine` is plain Rust with no web dependency; the page (`web`, wasm only), the web
//! worker and the native command (`cli`) are thin layers over its request/report protocol.

pub mod engine;

#[cfg(not(target_arch = "wasm32"))]
pub mod cli;

#[cfg(target_arch = "wasm32")]
pub mod web;

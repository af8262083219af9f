//! Browser layers (wasm only): the page and the web worker. Both are thin: the page builds
//! a [`crate::base::Request`], the worker runs [`crate::engine::run`] on it and
//! posts back progress and the [`crate::base::Report`].

pub mod app;
pub mod share;
pub mod worker;

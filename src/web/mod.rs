//! Browser faces (wasm only): the page and the web worker. Both are thin: the page builds a
//! [`crate::wire::Job`] from its form, the worker runs it and posts back progress and the
//! [`crate::wire::Report`], and the page shows it through [`crate::render::document`].

pub mod app;
pub mod data_step;
pub mod design_options;
pub mod findings;
pub mod form;
pub mod plan_step;
mod question;
pub mod runner;
pub mod share;
pub mod widgets;
pub mod worker;

//! The page's side of the web worker: starts it, hands it a job, turns its messages into the
//! run's status and report, and stops it (a stopped worker is terminated and started afresh
//! for the next run, so stopping is immediate however long the run would have taken).

use std::cell::RefCell;

use leptos::prelude::*;
use wasm_bindgen::prelude::*;
use wasm_bindgen::JsCast;

use crate::base::{Error, Progress};
use crate::wire::{Job, Report, WorkerMessage};

/// Script that starts the worker (written by Trunk's loader shim for the `worker` program).
const WORKER_URL: &str = "./worker_loader.js";

/// Where a run is.
#[derive(Clone, Debug, PartialEq)]
pub enum Status {
    /// Nothing run yet.
    Idle,
    /// Handed to the worker, no progress yet.
    Starting,
    /// Working.
    Running(Progress),
    /// Stopped with an error.
    Failed(Error),
    /// Stopped by the user.
    Stopped,
    /// The report is in.
    Done,
}

/// The signals the worker's messages write to.
#[derive(Clone, Copy)]
pub struct Sinks {
    /// Where the run is.
    pub status: RwSignal<Status>,
    /// The last report.
    pub result: RwSignal<Option<Report>>,
    /// The job handed to the worker last.
    pub sent: RwSignal<Option<Job>>,
    /// The job of the last report (set when the report arrives, so a run that fails or is
    /// stopped leaves it with the findings it belongs to).
    pub result_job: RwSignal<Option<Job>>,
}

struct WorkerHandle {
    worker: web_sys::Worker,
    ready: bool,
    pending: Option<String>,
    _on_message: Closure<dyn FnMut(web_sys::MessageEvent)>,
    _on_error: Closure<dyn FnMut(web_sys::Event)>,
}

thread_local! {
    static WORKER: RefCell<Option<WorkerHandle>> = const { RefCell::new(None) };
}

fn on_message(sinks: Sinks, text: &str) {
    match serde_json::from_str::<WorkerMessage>(text) {
        Ok(WorkerMessage::Ready) => {
            let pending = WORKER.with(|w| {
                let mut w = w.borrow_mut();
                w.as_mut().and_then(|h| {
                    h.ready = true;
                    h.pending.take().map(|p| (h.worker.clone(), p))
                })
            });
            if let Some((worker, p)) = pending {
                let _ = worker.post_message(&JsValue::from_str(&p));
            }
        }
        Ok(WorkerMessage::Progress(p)) => sinks.status.set(Status::Running(p)),
        Ok(WorkerMessage::Done { report }) => {
            sinks.result_job.set(sinks.sent.get_untracked());
            sinks.result.set(Some(*report));
            sinks.status.set(Status::Done);
        }
        Ok(WorkerMessage::Failed { error }) => sinks.status.set(Status::Failed(error)),
        Err(e) => sinks.status.set(Status::Failed(Error::settings(format!(
            "The worker sent a message that could not be read ({e})."
        )))),
    }
}

fn spawn(sinks: Sinks) -> Result<(), Error> {
    let opts = web_sys::WorkerOptions::new();
    opts.set_type(web_sys::WorkerType::Classic);
    // The single-file offline build starts the worker from a Blob URL it sets here.
    let url = web_sys::window()
        .and_then(|w| js_sys::Reflect::get(&w, &JsValue::from_str("RESHUFFLE_WORKER_URL")).ok())
        .and_then(|v| v.as_string())
        .unwrap_or_else(|| WORKER_URL.to_string());
    let worker = web_sys::Worker::new_with_options(&url, &opts).map_err(|e| {
        Error::settings(format!(
            "The computing worker could not be started ({e:?})."
        ))
    })?;
    let on_msg =
        Closure::<dyn FnMut(web_sys::MessageEvent)>::new(move |ev: web_sys::MessageEvent| {
            on_message(sinks, &ev.data().as_string().unwrap_or_default());
        });
    let on_error = Closure::<dyn FnMut(web_sys::Event)>::new(move |ev: web_sys::Event| {
        ev.prevent_default();
        let detail = ev
            .dyn_ref::<web_sys::ErrorEvent>()
            .map(|e| e.message())
            .filter(|m| !m.is_empty())
            .map(|m| format!(" ({m})"))
            .unwrap_or_default();
        sinks.status.set(Status::Failed(Error::settings(format!(
            "The computation stopped unexpectedly{detail}. Your data and settings are unchanged; \
             try again, or with fewer resamples."
        ))));
        // A crashed worker cannot be reused.
        stop();
    });
    worker.set_onmessage(Some(on_msg.as_ref().unchecked_ref()));
    worker.set_onerror(Some(on_error.as_ref().unchecked_ref()));
    WORKER.with(|w| {
        *w.borrow_mut() = Some(WorkerHandle {
            worker,
            ready: false,
            pending: None,
            _on_message: on_msg,
            _on_error: on_error,
        })
    });
    Ok(())
}

/// Hands a job (as saved-file JSON) to the worker, starting it if needed.
pub fn send(sinks: Sinks, text: String) -> Result<(), Error> {
    if WORKER.with(|w| w.borrow().is_none()) {
        spawn(sinks)?;
    }
    WORKER.with(|w| {
        if let Some(h) = w.borrow_mut().as_mut() {
            if h.ready {
                let _ = h.worker.post_message(&JsValue::from_str(&text));
            } else {
                h.pending = Some(text);
            }
        }
    });
    Ok(())
}

/// Stops the worker at once.
pub fn stop() {
    WORKER.with(|w| {
        if let Some(h) = w.borrow_mut().take() {
            h.worker.terminate();
        }
    });
}

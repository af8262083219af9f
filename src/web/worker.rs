//! The web worker: receives a job as saved-file JSON, runs the engine, posts progress at most
//! every 100 ms and then the report (or the error, with its line and column).

use wasm_bindgen::prelude::*;
use wasm_bindgen::JsCast;
use web_sys::{DedicatedWorkerGlobalScope, MessageEvent};

use crate::base::{Error, Progress};
use crate::wire::{self, WorkerMessage};

fn post(scope: &DedicatedWorkerGlobalScope, msg: &WorkerMessage) {
    let text = serde_json::to_string(msg).unwrap_or_else(|e| {
        let failed = WorkerMessage::Failed {
            error: Error::settings(format!("The result could not be encoded: {e}")),
        };
        serde_json::to_string(&failed).unwrap_or_default()
    });
    let _ = scope.post_message(&JsValue::from_str(&text));
}

/// Handles one job.
fn handle(scope: &DedicatedWorkerGlobalScope, text: &str) {
    let job = match wire::read_job(text) {
        Ok(r) => r.job,
        Err(error) => return post(scope, &WorkerMessage::Failed { error }),
    };
    let mut last = js_sys::Date::now();
    let mut progress = |p: &Progress| {
        let now = js_sys::Date::now();
        if now - last >= 100.0 {
            last = now;
            post(scope, &WorkerMessage::Progress(p.clone()));
        }
        true
    };
    let msg = match job.run(&mut progress) {
        Ok(report) => WorkerMessage::Done {
            report: Box::new(report),
        },
        Err(error) => WorkerMessage::Failed { error },
    };
    post(scope, &msg);
}

/// Entry point of the worker program.
pub fn start() {
    console_error_panic_hook::set_once();
    let scope: DedicatedWorkerGlobalScope = js_sys::global().unchecked_into();
    let inner = scope.clone();
    let onmessage = Closure::<dyn FnMut(MessageEvent)>::new(move |ev: MessageEvent| {
        let text = ev.data().as_string().unwrap_or_default();
        handle(&inner, &text);
    });
    scope.set_onmessage(Some(onmessage.as_ref().unchecked_ref()));
    onmessage.forget();
    // Tell the page the worker is ready to take jobs.
    post(&scope, &WorkerMessage::Ready);
}

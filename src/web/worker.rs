//! The web worker: receives a request as JSON text, runs the engine, posts progress at most
//! every 100 ms and then the report (or a message saying what went wrong).

use wasm_bindgen::prelude::*;
use wasm_bindgen::JsCast;
use web_sys::{DedicatedWorkerGlobalScope, MessageEvent};

use crate::base::{Progress, RunError};
use crate::wire::{Job, WorkerMessage};

fn post(scope: &DedicatedWorkerGlobalScope, msg: &WorkerMessage) {
    let text = serde_json::to_string(msg).unwrap_or_else(|e| {
        format!(r#"{{"type":"failed","message":"The result could not be encoded: {e}"}}"#)
    });
    let _ = scope.post_message(&JsValue::from_str(&text));
}

/// Handles one request text.
fn handle(scope: &DedicatedWorkerGlobalScope, text: &str) {
    let job: Job = match serde_json::from_str(text) {
        Ok(r) => r,
        Err(e) => {
            post(
                scope,
                &WorkerMessage::Failed {
                    message: format!("The analysis settings could not be read ({e})."),
                },
            );
            return;
        }
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
    let result = job.run(&mut progress).map(|report| WorkerMessage::Done {
        report: Box::new(report),
    });
    let msg = match result {
        Ok(m) => m,
        Err(RunError::Input(message)) => WorkerMessage::Failed { message },
        Err(RunError::Cancelled) => WorkerMessage::Failed {
            message: "The analysis was stopped.".into(),
        },
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
    // Tell the page the worker is ready to take requests.
    post(&scope, &WorkerMessage::Ready);
}

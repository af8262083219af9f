//! The web worker: receives a job as saved-file JSON, runs the engine, posts progress at most
//! every 100 ms and then the report (or the error, with its line and column).

use wasm_bindgen::prelude::*;
use wasm_bindgen::JsCast;
use web_sys::{DedicatedWorkerGlobalScope, MessageEvent};

use std::cell::RefCell;

use crate::base::{Error, Progress};
use crate::resample::share::{self, Sharing};
use crate::wire::{self, Job, PageMessage, SharedBlock, WorkerMessage};

thread_local! {
    /// The job of a shared run and this worker's part in it, kept between its rounds.
    static SHARED: RefCell<Option<(u64, Job, Sharing)>> = const { RefCell::new(None) };
    /// The furthest progress shown in a shared run: each round replays the run from the
    /// start, and the page should not see its progress go back.
    static SHOWN: RefCell<Option<(crate::base::Stage, u64)>> = const { RefCell::new(None) };
}

/// Whether progress `p` of a shared run goes beyond what was shown (and notes it if so).
fn beyond_shown(p: &Progress) -> bool {
    SHOWN.with(|s| {
        let mut s = s.borrow_mut();
        let ahead = match s.as_ref() {
            Some((stage, done)) => *stage != p.stage || p.done > *done,
            None => true,
        };
        if ahead {
            *s = Some((p.stage.clone(), p.done));
        }
        ahead
    })
}

fn post(scope: &DedicatedWorkerGlobalScope, msg: &WorkerMessage) {
    let text = serde_json::to_string(msg).unwrap_or_else(|e| {
        let failed = WorkerMessage::Failed {
            error: Error::settings(format!("The result could not be encoded: {e}")),
        };
        serde_json::to_string(&failed).unwrap_or_default()
    });
    let _ = scope.post_message(&JsValue::from_str(&text));
}

/// Handles one message: a job to run alone (its saved-file JSON), or a round of a shared run.
fn handle(scope: &DedicatedWorkerGlobalScope, text: &str) {
    match serde_json::from_str::<PageMessage>(text) {
        Ok(PageMessage::Share {
            run,
            worker,
            workers,
            job,
            blocks,
        }) => return shared_round(scope, run, worker, workers, job, blocks),
        Ok(PageMessage::Outline { id, data, header }) => {
            let outline = Box::new(crate::input::outline::outline(&data, header));
            return post(scope, &WorkerMessage::Outline { id, outline });
        }
        Err(_) => {}
    }
    // A job on its own: no table is kept for a next round.
    crate::input::table::keep_last_table(false);
    SHARED.with(|s| *s.borrow_mut() = None);
    let job = match wire::read_job(text) {
        Ok(r) => r.job,
        Err(error) => return post(scope, &WorkerMessage::Failed { error }),
    };
    run_job(scope, &job);
}

/// One round of a shared run: the job from the start, replaying the blocks known, until it
/// finishes (the report) or pauses (this worker's share of the next round).
fn shared_round(
    scope: &DedicatedWorkerGlobalScope,
    run: u64,
    worker: u64,
    workers: u64,
    job: Option<String>,
    blocks: Vec<SharedBlock>,
) {
    if let Some(text) = job {
        SHOWN.with(|s| *s.borrow_mut() = None);
        match wire::read_job(&text) {
            Ok(r) => SHARED.with(|s| {
                *s.borrow_mut() = Some((run, r.job, Sharing::new(worker, workers)));
            }),
            Err(error) => return post(scope, &WorkerMessage::Failed { error }),
        }
    }
    let Some((kept_run, job, mut sharing)) = SHARED.with(|s| s.borrow_mut().take()) else {
        return post(
            scope,
            &WorkerMessage::Failed {
                error: Error::settings("A shared run's next round came without its job."),
            },
        );
    };
    if kept_run != run {
        return;
    }
    for b in &blocks {
        if let Some((id, bytes)) = b.read() {
            sharing.known.insert(id, bytes);
        }
    }
    crate::input::table::keep_last_table(true);
    let mut last = js_sys::Date::now();
    let progress_scope = scope.clone();
    share::on_block(Some(Box::new(move |p: &Progress| {
        let now = js_sys::Date::now();
        if now - last >= 100.0 && beyond_shown(p) {
            last = now;
            post(&progress_scope, &WorkerMessage::Progress(p.clone()));
        }
    })));
    share::begin(sharing);
    let mut last_replay = js_sys::Date::now();
    let mut progress = |p: &Progress| {
        let now = js_sys::Date::now();
        if now - last_replay >= 100.0 && beyond_shown(p) {
            last_replay = now;
            post(scope, &WorkerMessage::Progress(p.clone()));
        }
        true
    };
    let result = job.run(&mut progress);
    share::on_block(None);
    let Some(mut sharing) = share::end() else {
        return;
    };
    match (result, sharing.paused) {
        (Err(_), Some(_)) => {
            let made = std::mem::take(&mut sharing.made);
            let blocks = made
                .iter()
                .map(|(id, b)| SharedBlock::new(*id, b))
                .collect();
            SHARED.with(|s| *s.borrow_mut() = Some((run, job, sharing)));
            post(scope, &WorkerMessage::Paused { run, blocks });
        }
        (Ok(report), _) => post(
            scope,
            &WorkerMessage::Done {
                report: Box::new(report),
            },
        ),
        (Err(error), None) => post(scope, &WorkerMessage::Failed { error }),
    }
}

/// Runs a job alone, posting progress at most every 100 ms and then the report or error.
fn run_job(scope: &DedicatedWorkerGlobalScope, job: &Job) {
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

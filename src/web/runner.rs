//! The page's side of the web workers: starts them, hands them a job, turns their messages
//! into the run's status and report, and stops them (a stopped worker is terminated and
//! started afresh for the next run, so stopping is immediate however long the run would have
//! taken).
//!
//! A large job is shared among several workers (up to one per core, at most
//! [`MAX_WORKERS`]): every worker runs it, computing its share of each round of blocks, and
//! the page hands each round's blocks to all of them for the next round
//! ([`crate::resample::share`]); the first worker's report is the run's. The numbers are those
//! of one worker alone.

use std::cell::RefCell;

use leptos::prelude::*;
use wasm_bindgen::prelude::*;
use wasm_bindgen::JsCast;

use crate::base::{Error, Progress};
use crate::wire::{Job, PageMessage, Report, SharedBlock, WorkerMessage};

/// Script that starts the worker (written by Trunk's loader shim for the `worker` program).
const WORKER_URL: &str = "./worker_loader.js";

/// The most workers one run uses.
pub const MAX_WORKERS: usize = 4;

/// Jobs whose saved-file text is at least this long (bytes) are shared among workers:
/// smaller ones finish in a worker alone before a second would have started.
pub const SHARE_FROM: usize = 512 * 1024;

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

/// The signals the workers' messages write to.
#[derive(Clone, Copy)]
pub struct Sinks {
    /// Where the run is.
    pub status: RwSignal<Status>,
    /// The last report.
    pub result: RwSignal<Option<Report>>,
    /// The job handed to the workers last.
    pub sent: RwSignal<Option<Job>>,
    /// The job of the last report (set when the report arrives, so a run that fails or is
    /// stopped leaves it with the findings it belongs to).
    pub result_job: RwSignal<Option<Job>>,
    /// How many workers computed the last report.
    pub result_workers: RwSignal<usize>,
}

struct WorkerHandle {
    worker: web_sys::Worker,
    ready: bool,
    pending: Vec<String>,
    _on_message: Closure<dyn FnMut(web_sys::MessageEvent)>,
    _on_error: Closure<dyn FnMut(web_sys::Event)>,
}

/// The run under way, when shared: its number, how many workers share it, how many have not
/// answered this round, and the blocks gathered this round.
struct SharedRun {
    run: u64,
    workers: usize,
    waiting: usize,
    gathered: Vec<SharedBlock>,
}

#[derive(Default)]
struct Pool {
    workers: Vec<WorkerHandle>,
    shared: Option<SharedRun>,
    runs: u64,
    /// Workers of the run under way (1 when not shared).
    in_use: usize,
}

thread_local! {
    static POOL: RefCell<Pool> = RefCell::new(Pool::default());
}

/// How many workers a job of `len` bytes gets: one per core up to [`MAX_WORKERS`] from
/// [`SHARE_FROM`] bytes, or as the page's address asks (`?workers=N`, for tests).
fn workers_for(len: usize) -> usize {
    let window = web_sys::window();
    let asked = window
        .as_ref()
        .and_then(|w| w.location().search().ok())
        .and_then(|q| {
            q.trim_start_matches('?')
                .split('&')
                .find_map(|kv| kv.strip_prefix("workers=").map(str::to_string))
        })
        .and_then(|v| v.parse::<usize>().ok());
    if let Some(n) = asked {
        return n.clamp(1, MAX_WORKERS);
    }
    if len < SHARE_FROM {
        return 1;
    }
    let cores = window
        .map(|w| w.navigator().hardware_concurrency() as usize)
        .unwrap_or(1);
    cores.clamp(1, MAX_WORKERS)
}

fn post_to(index: usize, text: String) {
    POOL.with(|p| {
        if let Some(h) = p.borrow_mut().workers.get_mut(index) {
            if h.ready {
                let _ = h.worker.post_message(&JsValue::from_str(&text));
            } else {
                h.pending.push(text);
            }
        }
    });
}

fn share_message(
    run: u64,
    worker: usize,
    workers: usize,
    job: Option<String>,
    blocks: Vec<SharedBlock>,
) -> String {
    serde_json::to_string(&PageMessage::Share {
        run,
        worker: worker as u64,
        workers: workers as u64,
        job,
        blocks,
    })
    .unwrap_or_default()
}

fn on_message(sinks: Sinks, index: usize, text: &str) {
    let lead = index == 0;
    match serde_json::from_str::<WorkerMessage>(text) {
        Ok(WorkerMessage::Ready) => {
            let pending = POOL.with(|p| {
                let mut p = p.borrow_mut();
                p.workers.get_mut(index).map(|h| {
                    h.ready = true;
                    (h.worker.clone(), std::mem::take(&mut h.pending))
                })
            });
            if let Some((worker, pending)) = pending {
                for m in pending {
                    let _ = worker.post_message(&JsValue::from_str(&m));
                }
            }
        }
        // The first worker's progress stands for the run's (the others do as much).
        Ok(WorkerMessage::Progress(p)) if lead => sinks.status.set(Status::Running(p)),
        Ok(WorkerMessage::Progress(_)) => {}
        Ok(WorkerMessage::Done { report }) if lead => {
            let workers = POOL.with(|p| {
                let mut p = p.borrow_mut();
                p.shared = None;
                p.in_use
            });
            sinks.result_job.set(sinks.sent.get_untracked());
            sinks.result_workers.set(workers);
            sinks.result.set(Some(*report));
            sinks.status.set(Status::Done);
        }
        // Late answers of an earlier run, and outlines (the reading worker's).
        Ok(WorkerMessage::Done { .. } | WorkerMessage::Outline { .. }) => {}
        Ok(WorkerMessage::Paused { run, blocks }) => {
            // Gather the round; when every worker has answered, hand it to all of them.
            let next = POOL.with(|p| {
                let mut p = p.borrow_mut();
                let sh = p.shared.as_mut().filter(|s| s.run == run)?;
                sh.gathered.extend(blocks);
                sh.waiting = sh.waiting.saturating_sub(1);
                if sh.waiting > 0 {
                    return None;
                }
                sh.waiting = sh.workers;
                Some((sh.run, sh.workers, std::mem::take(&mut sh.gathered)))
            });
            if let Some((run, workers, gathered)) = next {
                for w in 0..workers {
                    post_to(w, share_message(run, w, workers, None, gathered.clone()));
                }
            }
        }
        Ok(WorkerMessage::Failed { error }) => {
            sinks.status.set(Status::Failed(error));
            if !lead {
                stop();
            }
        }
        Err(e) => sinks.status.set(Status::Failed(Error::settings(format!(
            "The worker sent a message that could not be read ({e})."
        )))),
    }
}

fn spawn(sinks: Sinks, index: usize) -> Result<WorkerHandle, Error> {
    spawn_with(
        move |text| on_message(sinks, index, &text),
        move |detail| {
            sinks.status.set(Status::Failed(Error::settings(format!(
                "The computation stopped unexpectedly{detail}. Your data and settings are \
                 unchanged; try again, or with fewer resamples."
            ))));
            // A crashed worker cannot be reused.
            stop();
        },
    )
}

/// Starts a worker whose messages go to `on_text` and whose crash (with its detail) to
/// `on_crash`.
fn spawn_with(
    mut on_text: impl FnMut(String) + 'static,
    mut on_crash: impl FnMut(String) + 'static,
) -> Result<WorkerHandle, Error> {
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
            on_text(ev.data().as_string().unwrap_or_default());
        });
    let on_error = Closure::<dyn FnMut(web_sys::Event)>::new(move |ev: web_sys::Event| {
        ev.prevent_default();
        let detail = ev
            .dyn_ref::<web_sys::ErrorEvent>()
            .map(|e| e.message())
            .filter(|m| !m.is_empty())
            .map(|m| format!(" ({m})"))
            .unwrap_or_default();
        on_crash(detail);
    });
    worker.set_onmessage(Some(on_msg.as_ref().unchecked_ref()));
    worker.set_onerror(Some(on_error.as_ref().unchecked_ref()));
    Ok(WorkerHandle {
        worker,
        ready: false,
        pending: Vec::new(),
        _on_message: on_msg,
        _on_error: on_error,
    })
}

/// The worker that reads large tables for the page (apart from the ones that compute, so
/// that reading never waits for a run), with the request it is on and the latest one
/// waiting.
/// Where the reading worker's answers go.
type OutlineSink = std::rc::Rc<dyn Fn(u64, Result<crate::input::outline::Outline, Error>)>;

#[derive(Default)]
struct Reader {
    handle: Option<WorkerHandle>,
    busy: bool,
    waiting: Option<String>,
    done: Option<OutlineSink>,
}

thread_local! {
    static READER: RefCell<Reader> = RefCell::new(Reader::default());
}

fn reader_post(text: String) {
    READER.with(|r| {
        let mut r = r.borrow_mut();
        if r.busy {
            // Only the latest table matters: an earlier one waiting is dropped.
            r.waiting = Some(text);
            return;
        }
        r.busy = true;
        if let Some(h) = r.handle.as_mut() {
            if h.ready {
                let _ = h.worker.post_message(&JsValue::from_str(&text));
            } else {
                h.pending.push(text);
            }
        }
    });
}

/// Asks the reading worker for the outline of a table; `done` gets (request number,
/// outline or error) for each answer (the caller keeps only its latest request's; a crash
/// of the worker answers with number u64::MAX).
pub fn read_outline(
    id: u64,
    data: String,
    header: crate::input::table::HeaderChoice,
    done: impl Fn(u64, Result<crate::input::outline::Outline, Error>) + 'static,
) -> Result<(), Error> {
    READER.with(|r| r.borrow_mut().done = Some(std::rc::Rc::new(done)));
    let sink = || READER.with(|r| r.borrow().done.clone());
    let spawned = READER.with(|r| r.borrow().handle.is_some());
    if !spawned {
        let h = spawn_with(
            move |text| match serde_json::from_str::<WorkerMessage>(&text) {
                Ok(WorkerMessage::Ready) => READER.with(|r| {
                    let mut r = r.borrow_mut();
                    if let Some(h) = r.handle.as_mut() {
                        h.ready = true;
                        for m in std::mem::take(&mut h.pending) {
                            let _ = h.worker.post_message(&JsValue::from_str(&m));
                        }
                    }
                }),
                Ok(WorkerMessage::Outline { id, outline }) => {
                    let next = READER.with(|r| {
                        let mut r = r.borrow_mut();
                        r.busy = false;
                        r.waiting.take()
                    });
                    if let Some(next) = next {
                        reader_post(next);
                    }
                    if let Some(done) = sink() {
                        done(id, *outline);
                    }
                }
                _ => {}
            },
            move |detail| {
                let done = sink();
                READER.with(|r| {
                    let mut r = r.borrow_mut();
                    if let Some(h) = r.handle.take() {
                        h.worker.terminate();
                    }
                    r.busy = false;
                    r.waiting = None;
                });
                if let Some(done) = done {
                    done(
                        u64::MAX,
                        Err(Error::settings(format!(
                            "Reading the table stopped unexpectedly{detail}. The data box is \
                             unchanged."
                        ))),
                    );
                }
            },
        )?;
        READER.with(|r| r.borrow_mut().handle = Some(h));
    }
    let text = serde_json::to_string(&PageMessage::Outline { id, data, header })
        .map_err(|e| Error::settings(format!("The table could not be handed over: {e}")))?;
    reader_post(text);
    Ok(())
}

/// Hands a job (as saved-file JSON) to the workers, starting them if needed: to one worker
/// alone, or shared among several for a large job.
pub fn send(sinks: Sinks, text: String) -> Result<(), Error> {
    let workers = workers_for(text.len());
    let have = POOL.with(|p| p.borrow().workers.len());
    for index in have..workers {
        let h = spawn(sinks, index)?;
        POOL.with(|p| p.borrow_mut().workers.push(h));
    }
    let run = POOL.with(|p| {
        let mut p = p.borrow_mut();
        p.runs += 1;
        p.in_use = workers;
        p.shared = (workers > 1).then(|| SharedRun {
            run: p.runs,
            workers,
            waiting: workers,
            gathered: Vec::new(),
        });
        p.runs
    });
    if workers == 1 {
        post_to(0, text);
    } else {
        for w in 0..workers {
            post_to(
                w,
                share_message(run, w, workers, Some(text.clone()), Vec::new()),
            );
        }
    }
    Ok(())
}

/// Stops every worker at once.
pub fn stop() {
    POOL.with(|p| {
        let mut p = p.borrow_mut();
        for h in p.workers.drain(..) {
            h.worker.terminate();
        }
        p.shared = None;
    });
}

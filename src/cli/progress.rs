//! Progress on standard error for work over about a second (indicatif, drawn only when
//! standard error is a terminal), and Ctrl-C stopping the run cleanly: the engine's
//! progress callback returns false, the run ends with a "stopped" error, nothing is printed
//! on standard output, and the exit code is 130 (the shell convention for SIGINT).

use std::sync::atomic::{AtomicBool, Ordering};
use std::sync::Once;
use std::time::{Duration, Instant};

use indicatif::{ProgressBar, ProgressDrawTarget, ProgressStyle};

use crate::base::Progress;
use crate::render::words;

static STOP: AtomicBool = AtomicBool::new(false);
static HANDLER: Once = Once::new();

/// How long work runs before a progress bar appears.
const QUIET: Duration = Duration::from_secs(1);

/// Installs the Ctrl-C handler (once per process).
pub fn catch_interrupt() {
    HANDLER.call_once(|| {
        // A second Ctrl-C while stopping ends the process the ordinary way.
        let _ = ctrlc::set_handler(|| {
            if STOP.swap(true, Ordering::SeqCst) {
                std::process::exit(130);
            }
        });
    });
}

/// The progress shown for one run.
pub struct Meter {
    start: Instant,
    bar: Option<ProgressBar>,
}

impl Default for Meter {
    fn default() -> Self {
        Meter::new()
    }
}

impl Meter {
    /// A meter that shows nothing during the first second.
    pub fn new() -> Meter {
        Meter {
            start: Instant::now(),
            bar: None,
        }
    }

    /// The engine's progress callback: updates the bar, and returns false once Ctrl-C was
    /// pressed.
    pub fn update(&mut self, p: &Progress) -> bool {
        if STOP.load(Ordering::SeqCst) {
            return false;
        }
        if self.bar.is_none() && self.start.elapsed() >= QUIET {
            let bar = ProgressBar::with_draw_target(Some(p.total), ProgressDrawTarget::stderr());
            bar.set_style(
                ProgressStyle::with_template(
                    "{msg} [{bar:30}] {percent}% · {eta} left (Ctrl-C stops)",
                )
                .unwrap_or_else(|_| ProgressStyle::default_bar())
                .progress_chars("=> "),
            );
            self.bar = Some(bar);
        }
        if let Some(bar) = &self.bar {
            bar.set_length(p.total.max(1));
            bar.set_position(p.done.min(p.total));
            bar.set_message(match words::running(p) {
                Some(r) => format!("{} ({r})", words::stage(&p.stage)),
                None => words::stage(&p.stage),
            });
        }
        true
    }

    /// Removes the bar.
    pub fn finish(&mut self) {
        if let Some(bar) = self.bar.take() {
            bar.finish_and_clear();
        }
    }
}

/// Whether Ctrl-C was pressed.
pub fn stopped() -> bool {
    STOP.load(Ordering::SeqCst)
}

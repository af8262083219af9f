//! The native `reshuffle` command: the same jobs and reports as the page, for scripting and
//! checking numbers. Arguments are parsed with clap (`--help` on every subcommand,
//! `--version`, shell completions, clear messages for unknown, repeated or out-of-range
//! options); the findings are worded by the same renderer as the page.

mod args;
mod bench;
mod jobs;
mod progress;

use std::io::{Read, Write};

use clap::{CommandFactory, Parser, Subcommand};

use crate::base::Error;
use crate::render;
use crate::wire::{self, Job};
use args::Outputs;
pub use jobs::{AnalyzeArgs, EstimateArgs, PlanArgs};

/// Permutation tests, bootstrap intervals and study planning for your data, computed on
/// this machine.
#[derive(Parser, Debug)]
#[command(name = "reshuffle", version, about, long_about = None)]
pub struct Cli {
    /// What to do.
    #[command(subcommand)]
    pub command: Command,
}

/// The subcommands.
#[derive(Subcommand, Debug)]
pub enum Command {
    /// Test and estimate: two groups (default), paired, one sample, association, k groups,
    /// strata or yes/no outcomes; or re-run a share link or a saved analysis.
    #[command(visible_alias = "analyse", allow_negative_numbers = true)]
    Analyze(Box<AnalyzeArgs>),
    /// Bootstrap confidence intervals for an estimate, without a test.
    #[command(allow_negative_numbers = true)]
    Estimate(Box<EstimateArgs>),
    /// Power, sample size and detectable effect by simulation.
    #[command(allow_negative_numbers = true)]
    Plan(Box<PlanArgs>),
    /// Print the share link of an analysis (the same options as analyze).
    #[command(allow_negative_numbers = true)]
    Link {
        /// The analysis.
        #[command(flatten)]
        analysis: Box<AnalyzeArgs>,
        /// The page's address the link opens.
        #[arg(long, value_name = "URL", default_value = "http://127.0.0.1:8080/")]
        base: String,
    },
    /// Compare the speed of the relabelling kernels (ratios within one run).
    Bench,
    /// Print a shell completion script (bash, zsh, fish, powershell, elvish).
    Completions {
        /// The shell.
        shell: clap_complete::Shell,
    },
}

/// Runs the command with its arguments (without the program name); returns the exit code.
pub fn main_with(
    args: &[String],
    out: &mut dyn std::io::Write,
    err: &mut dyn std::io::Write,
) -> i32 {
    let cli = match Cli::try_parse_from(
        std::iter::once("reshuffle".to_string()).chain(args.iter().cloned()),
    ) {
        Ok(c) => c,
        Err(e) => {
            use clap::error::ErrorKind;
            let text = e.render().to_string();
            return match e.kind() {
                ErrorKind::DisplayHelp
                | ErrorKind::DisplayVersion
                | ErrorKind::DisplayHelpOnMissingArgumentOrSubcommand => {
                    let _ = out.write_all(text.as_bytes());
                    if e.kind() == ErrorKind::DisplayHelpOnMissingArgumentOrSubcommand {
                        2
                    } else {
                        0
                    }
                }
                _ => {
                    let _ = err.write_all(text.as_bytes());
                    2
                }
            };
        }
    };
    match run(cli, out) {
        Ok(()) => 0,
        Err(e) if e.is_cancelled() && progress::stopped() => {
            let _ = writeln!(err, "reshuffle: stopped (Ctrl-C); nothing was printed.");
            130
        }
        Err(e) => {
            let _ = writeln!(err, "reshuffle: {}", render::words::error(&e));
            2
        }
    }
}

fn run(cli: Cli, out: &mut dyn std::io::Write) -> Result<(), Error> {
    match cli.command {
        Command::Analyze(a) => {
            let outputs = a.outputs.clone();
            let job = a.job()?;
            run_job(&job, &outputs, out)
        }
        Command::Estimate(a) => {
            let outputs = a.outputs.clone();
            run_job(&a.job()?, &outputs, out)
        }
        Command::Plan(a) => {
            let outputs = a.outputs.clone();
            run_job(&a.job()?, &outputs, out)
        }
        Command::Link { analysis, base } => {
            let job = analysis.job()?;
            let l = wire::link::link(&base, &job);
            if l.len() > wire::link::LONG_LINK {
                let _ = writeln!(
                    std::io::stderr(),
                    "reshuffle: note: the link is {} characters long; some chat and mail \
                     programs cut links over {}.",
                    l.len(),
                    wire::link::LONG_LINK
                );
            }
            writeln!(out, "{l}").map_err(io)
        }
        Command::Bench => bench::run(out),
        Command::Completions { shell } => {
            let mut buf = Vec::new();
            clap_complete::generate(shell, &mut Cli::command(), "reshuffle", &mut buf);
            out.write_all(&buf).map_err(io)
        }
    }
}

fn io(e: std::io::Error) -> Error {
    Error::settings(format!("Could not write the output: {e}"))
}

/// A seed from the operating system's randomness (getrandom), below 2^53.
pub fn fresh_seed() -> u64 {
    crate::resample::rng::fresh_seed()
}

/// Reads a data file (`-` for standard input) as text.
pub fn read_data(file: &str) -> Result<String, Error> {
    let bytes = if file == "-" {
        let mut b = Vec::new();
        std::io::stdin()
            .read_to_end(&mut b)
            .map_err(|e| Error::settings(format!("Could not read standard input: {e}")))?;
        b
    } else {
        std::fs::read(file)
            .map_err(|e| Error::settings(format!("Could not read \"{file}\": {e}")))?
    };
    crate::input::text::decode(&bytes, file)
}

fn today() -> String {
    let secs = std::time::SystemTime::now()
        .duration_since(std::time::UNIX_EPOCH)
        .map(|d| d.as_secs() as i64)
        .unwrap_or(0);
    render::doc::iso_date(secs)
}

/// Runs a job and prints its findings as asked.
fn run_job(job: &Job, o: &Outputs, out: &mut dyn std::io::Write) -> Result<(), Error> {
    let date = today();
    crate::resample::parallel::set_threads(o.threads.unwrap_or(0));
    let threads = crate::resample::parallel::threads();
    progress::catch_interrupt();
    let mut meter = progress::Meter::new();
    let report = job.run(&mut |p| meter.update(p));
    meter.finish();
    let report = report?;
    let mut doc = render::document(&report, &date);
    render::add_threads(&mut doc, threads);
    let text = if o.json {
        wire::report_json_on(&report, Some(threads)) + "\n"
    } else if o.markdown {
        doc.markdown()
    } else {
        doc.text()
    };
    if let Some(path) = &o.html {
        std::fs::write(path, doc.html())
            .map_err(|e| Error::settings(format!("Could not write \"{path}\": {e}")))?;
    }
    out.write_all(text.as_bytes()).map_err(io)
}

#[cfg(test)]
mod tests {
    use super::*;
    use clap::CommandFactory;

    /// clap's own consistency check of the option definitions (common practice with clap).
    #[test]
    fn options_are_consistent() {
        Cli::command().debug_assert();
    }

    /// Lists given with commas arrive as one list each (not one value per occurrence).
    #[test]
    fn comma_lists_parse_as_lists() {
        let cli = Cli::try_parse_from([
            "reshuffle",
            "analyze",
            "x.csv",
            "--columns",
            "a, b",
            "--interval",
            "bca,percentile",
        ])
        .unwrap();
        let Command::Analyze(a) = cli.command else {
            panic!("not analyze")
        };
        assert_eq!(a.columns, Some(vec!["a".to_string(), "b".to_string()]));
        assert_eq!(a.test.interval.map(|v| v.len()), Some(2));
    }
}

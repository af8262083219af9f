//! The native `reshuffle` command: the same request/report protocol as the page, for
//! scripting and checking.

use std::io::{Read, Write};

use crate::base::format as fmt;
use crate::base::*;
use crate::designs::two_groups::Request;
use crate::input::columns::Layout;
use crate::input::table::HeaderChoice;
use crate::resample::rng;
use crate::resample::two_groups::{self as perm, Statistic};
use crate::wire::Job;

const USAGE: &str = "\
reshuffle: permutation tests and bootstrap intervals for study data

Usage:
  reshuffle analyze FILE [options]     test and estimate a two-group difference (FILE may be -)
  reshuffle estimate FILE [options]    bootstrap confidence intervals only, no test
  reshuffle analyze --link URL [--json]      re-run the analysis in a share link
  reshuffle analyze --request FILE.json      re-run a saved analysis file
  reshuffle link FILE [options] [--base URL] print the share link of an analysis
  reshuffle analyze FILE --design paired --columns FIRST,SECOND [--statistic mean|median]
  reshuffle analyze FILE --design paired --value COL --group COL --unit COL [--first A --second B]
  reshuffle analyze FILE --design one-sample --value COL --reference VALUE
  reshuffle analyze FILE --design association --x COL --y COL [--statistic pearson|spearman|slope]
  reshuffle analyze FILE --design k-groups [--value COL --group COL | --columns A,B,C]
                       [--control LEVEL] [--statistic f|welch-f|median-spread]
  reshuffle analyze FILE --design stratified --value COL --group COL --strata COL
                       [--weights size|precision]
  reshuffle analyze FILE --design yes-no --value COL --group COL
  reshuffle analyze --design yes-no --counts 42/300,61/310
                       [--statistic proportion-difference|risk-ratio|odds-ratio]
  reshuffle plan [FILE] --design D ... power, sample size and detectable effect by simulation
  reshuffle bench                      compare the speed of the relabelling kernels
  reshuffle help                       show this text

Where the groups are (default: detected from the column types):
  --value COL --group COL              long format: a numeric column and a label column
  --columns A,B                        wide format: one column per group
  --first LEVEL                        the group that comes first (statistic = first - second)
  --second LEVEL                       with more than two labels: the other group to compare
  --header detect|names|data           whether the first row holds column names

The question:
  --statistic mean-difference|median-difference|trimmed-mean-difference|welch-t
  --alternative two-sided|greater|less (greater: first minus second is positive)
  --two-sided absolute|doubled-tail    two-sided p: |T| >= |t| (default), or twice the smaller tail
  --resamples N                        random relabellings (default 100000)
  --exact-limit N                      enumerate all splits when there are at most N (default 1000000)
  --bootstrap N                        bootstrap resamples (default 10000)
  --interval METHOD                    percentile, basic, normal, bca (default), studentized,
                                       a comma-separated list, or all
  --confidence C                       confidence level (default 0.95)
  --seed S                             seed (default: a fresh one, printed with the result)
  --json                               print the report as one JSON object
  --markdown                           print the findings as Markdown
  --html FILE                          also write a self-contained HTML report

Planning (reshuffle plan):
  --design two-groups|paired|k-groups|yes-no
  --sd SD                              assumed normal model (SD of the differences for pairs)
  FILE --value COL [--multiply]        resample a pilot column; the effect is added (or, with
                                       --multiply, a ratio multiplying the values)
  --baseline RATE                      yes/no: the yes rate of the reference group
  --effect E                           difference in means (or ratio, or rate difference; for
                                       k groups a factor on --means)
  --means 0,0,0.5                      k groups: the assumed group means
  --statistic KEY  --alpha 0.05  --alternative two-sided|greater|less  --power 0.8
  --studies 1000 (per sample size)  --relabellings 199 (per study)  --max-n 2000
  --mde-n N                            also the smallest detectable effect at N per group
  --seed S  --json  --markdown  --html FILE

Estimate only (reshuffle estimate):
  --value COL --estimate mean|median|trimmed-mean|sd|cv|quantile|proportion [--q 0.9]
      [--strata COL]                   one column; resample within strata if given
  --value COL --group COL | --columns A,B [--paired]
      --estimate mean-difference|median-difference|trimmed-mean-difference|mean-ratio|
                 median-ratio|hedges-g|cliffs-delta|superiority
  --x COL --y COL --estimate pearson|spearman|slope
  --interval percentile|basic|normal|bca|studentized|all (or a comma-separated list)
  --side two-sided|lower|upper         a two-sided interval or a one-sided bound
  --confidence C  --resamples N  --seed S  --json  --header ...  --first/--second LEVEL
";

/// Runs the command with its arguments (without the program name); returns the exit code.
pub fn main_with(
    args: &[String],
    out: &mut dyn std::io::Write,
    err: &mut dyn std::io::Write,
) -> i32 {
    let r = match args.first().map(String::as_str) {
        Some("analyze") | Some("analyse") => analyze(&args[1..], out),
        Some("estimate") => estimate(&args[1..], out),
        Some("link") => link_command(&args[1..], out),
        Some("plan") => plan_command(&args[1..], out),
        Some("bench") => bench(out),
        Some("help") | Some("--help") | Some("-h") | None => {
            let _ = out.write_all(USAGE.as_bytes());
            Ok(())
        }
        Some("--version") => {
            let _ = writeln!(out, "reshuffle {ENGINE_VERSION}");
            Ok(())
        }
        Some(other) => Err(format!("Unknown command \"{other}\". Try: reshuffle help")),
    };
    match r {
        Ok(()) => 0,
        Err(m) => {
            let _ = writeln!(err, "reshuffle: {m}");
            2
        }
    }
}

/// `--interval`: one method, a comma-separated list (the first is the headline), or `all`
/// (BCa first, then the others).
pub fn parse_intervals(v: &str) -> Result<(IntervalMethod, Vec<IntervalMethod>), String> {
    if v == "all" {
        let more = IntervalMethod::ALL
            .into_iter()
            .filter(|m| *m != IntervalMethod::Bca)
            .collect();
        return Ok((IntervalMethod::Bca, more));
    }
    let mut list = Vec::new();
    for part in v.split(',') {
        let m = IntervalMethod::from_key(part.trim()).ok_or_else(|| {
            format!(
                "--interval takes {} or all, not \"{part}\".",
                IntervalMethod::ALL.map(|m| m.key()).join(", ")
            )
        })?;
        if !list.contains(&m) {
            list.push(m);
        }
    }
    let head = list.remove(0);
    Ok((head, list))
}

fn parse_num<T: std::str::FromStr>(flag: &str, v: &str) -> Result<T, String> {
    v.trim()
        .replace('_', "")
        .parse()
        .map_err(|_| format!("{flag} needs a number, not \"{v}\"."))
}

/// Command-line options, read once: the data file, switches and `--flag value` pairs.
/// Each command takes the options it knows; whatever is left is an error.
pub struct Opts {
    file: Option<String>,
    values: Vec<(String, String)>,
    switches: Vec<String>,
}

/// Options that take no value.
const SWITCHES: [&str; 4] = ["--json", "--paired", "--markdown", "--multiply"];

impl Opts {
    pub fn parse(args: &[String]) -> Result<Opts, String> {
        let mut o = Opts {
            file: None,
            values: Vec::new(),
            switches: Vec::new(),
        };
        let mut it = args.iter();
        while let Some(a) = it.next() {
            if SWITCHES.contains(&a.as_str()) {
                o.switches.push(a.clone());
            } else if a.starts_with("--") {
                let v = it.next().ok_or_else(|| format!("{a} needs a value."))?;
                o.values.push((a.clone(), v.clone()));
            } else if let Some(f) = &o.file {
                return Err(format!(
                    "Only one data file can be given (got \"{f}\" and \"{a}\")."
                ));
            } else {
                o.file = Some(a.clone());
            }
        }
        Ok(o)
    }

    fn take(&mut self, flag: &str) -> Option<String> {
        let i = self.values.iter().position(|(f, _)| f == flag)?;
        Some(self.values.remove(i).1)
    }

    fn switch(&mut self, flag: &str) -> bool {
        let had = self.switches.iter().any(|s| s == flag);
        self.switches.retain(|s| s != flag);
        had
    }

    fn num<T: std::str::FromStr>(&mut self, flag: &str) -> Result<Option<T>, String> {
        self.take(flag).map(|v| parse_num(flag, &v)).transpose()
    }

    fn list(&mut self, flag: &str) -> Option<Vec<String>> {
        self.take(flag)
            .map(|v| v.split(',').map(|s| s.trim().to_string()).collect())
    }

    fn choice<T>(
        &mut self,
        flag: &str,
        from: impl Fn(&str) -> Option<T>,
        allowed: &str,
    ) -> Result<Option<T>, String> {
        self.take(flag)
            .map(|v| from(&v).ok_or_else(|| format!("{flag} takes {allowed}, not \"{v}\".")))
            .transpose()
    }

    fn header(&mut self) -> Result<HeaderChoice, String> {
        let h = self.choice(
            "--header",
            |v| match v {
                "detect" => Some(HeaderChoice::Detect),
                "names" => Some(HeaderChoice::Names),
                "data" => Some(HeaderChoice::Data),
                _ => None,
            },
            "detect, names or data",
        )?;
        Ok(h.unwrap_or_default())
    }

    fn alternative(&mut self) -> Result<Option<Alternative>, String> {
        self.choice(
            "--alternative",
            Alternative::from_key,
            "two-sided, greater or less",
        )
    }

    fn two_sided(&mut self) -> Result<Option<TwoSidedRule>, String> {
        self.choice(
            "--two-sided",
            TwoSidedRule::from_key,
            "absolute or doubled-tail",
        )
    }

    fn data(&mut self) -> Result<String, String> {
        let f = self
            .file
            .take()
            .ok_or("Name the data file (or - for standard input).")?;
        read_data(&f)
    }

    fn seed(&mut self) -> Result<u64, String> {
        Ok(self.num("--seed")?.unwrap_or_else(fresh_seed))
    }

    /// Errors on any option no one took.
    fn finish(self) -> Result<(), String> {
        if let Some((f, _)) = self.values.first() {
            return Err(format!("Unknown option {f} here. Try: reshuffle help"));
        }
        if let Some(f) = self.switches.first() {
            return Err(format!("Unknown option {f} here. Try: reshuffle help"));
        }
        Ok(())
    }
}

/// The options of the paired, one-sample and association designs besides their columns.
struct TestOpts {
    header: HeaderChoice,
    seed: u64,
    alternative: Option<Alternative>,
    two_sided: Option<TwoSidedRule>,
    interval: Option<IntervalMethod>,
    resamples: Option<u64>,
    bootstrap: Option<u64>,
    exact_limit: Option<u64>,
    confidence: Option<f64>,
}

impl TestOpts {
    fn read(p: &mut Opts) -> Result<TestOpts, String> {
        Ok(TestOpts {
            header: p.header()?,
            seed: p.seed()?,
            alternative: p.alternative()?,
            two_sided: p.two_sided()?,
            interval: p.choice(
                "--interval",
                IntervalMethod::from_key,
                &IntervalMethod::ALL.map(|m| m.key()).join(", "),
            )?,
            resamples: p.num("--resamples")?,
            bootstrap: p.num("--bootstrap")?,
            exact_limit: p.num("--exact-limit")?,
            confidence: p.num("--confidence")?,
        })
    }
}

/// Builds a two-group request from the command line; `data_from` reads the table text.
pub fn request_from_args(
    args: &[String],
    data_from: &mut dyn FnMut(&str) -> Result<String, String>,
) -> Result<(Request, bool), String> {
    let mut o = Opts::parse(args)?;
    let mut req = Request::new(String::new(), 0);
    let json = o.switch("--json");
    let (value, group, columns) = (o.take("--value"), o.take("--group"), o.list("--columns"));
    req.first = o.take("--first");
    req.second = o.take("--second");
    req.header = o.header()?;
    if let Some(st) = o.choice(
        "--statistic",
        Statistic::from_key,
        &Statistic::ALL.map(|s| s.key()).join(", "),
    )? {
        req.statistic = st;
    }
    if let Some(a) = o.alternative()? {
        req.alternative = a;
    }
    if let Some(r) = o.two_sided()? {
        req.two_sided = r;
    }
    if let Some(v) = o.take("--interval") {
        let (head, more) = parse_intervals(&v)?;
        req.interval = head;
        req.more_intervals = more;
    }
    req.resamples = o.num("--resamples")?.unwrap_or(req.resamples);
    req.bootstrap_resamples = o.num("--bootstrap")?.unwrap_or(req.bootstrap_resamples);
    req.exact_limit = o.num("--exact-limit")?.unwrap_or(req.exact_limit);
    req.confidence = o.num("--confidence")?.unwrap_or(req.confidence);
    req.seed = o.seed()?;
    let file = o
        .file
        .take()
        .ok_or("Name the data file (or - for standard input).")?;
    o.finish()?;
    req.data = data_from(&file)?;
    req.layout = match (value, group, columns) {
        (None, None, None) => Layout::Detect,
        (Some(value), Some(group), None) => Layout::Long { value, group },
        (None, None, Some(columns)) => Layout::Wide { columns },
        (Some(_), None, None) | (None, Some(_), None) => {
            return Err("Long format needs both --value and --group.".into())
        }
        _ => return Err(
            "Use either --value with --group (long format) or --columns (wide format), not both."
                .into(),
        ),
    };
    Ok((req, json))
}

/// A seed from the operating system's randomness (via std's hasher keys) and the clock.
pub fn fresh_seed() -> u64 {
    use std::hash::{BuildHasher, Hasher};
    let mut h = std::collections::hash_map::RandomState::new().build_hasher();
    h.write_u128(
        std::time::SystemTime::now()
            .duration_since(std::time::UNIX_EPOCH)
            .map(|d| d.as_nanos())
            .unwrap_or(0),
    );
    rng::seed_from_entropy(h.finish())
}

fn read_data(file: &str) -> Result<String, String> {
    if file == "-" {
        let mut s = String::new();
        std::io::stdin()
            .read_to_string(&mut s)
            .map_err(|e| format!("Could not read standard input: {e}"))?;
        return Ok(s);
    }
    let bytes = std::fs::read(file).map_err(|e| format!("Could not read \"{file}\": {e}"))?;
    String::from_utf8(bytes).map_err(|e| {
        format!(
            "\"{file}\" is not UTF-8 text (first bad byte at offset {}). Save it as UTF-8 (CSV UTF-8 in a spreadsheet).",
            e.utf8_error().valid_up_to()
        )
    })
}

/// Options every command that prints findings shares: where else to write them.
struct Outputs {
    json: bool,
    markdown: bool,
    html: Option<String>,
}

/// Takes `--markdown` and `--html FILE` out of the arguments.
fn take_outputs(args: &[String]) -> Result<(Vec<String>, Outputs), String> {
    let mut rest = Vec::new();
    let mut o = Outputs {
        json: false,
        markdown: false,
        html: None,
    };
    let mut i = 0;
    while i < args.len() {
        match args[i].as_str() {
            "--markdown" => o.markdown = true,
            "--html" => {
                i += 1;
                o.html = Some(args.get(i).cloned().ok_or("--html needs a file name.")?);
            }
            _ => rest.push(args[i].clone()),
        }
        i += 1;
    }
    Ok((rest, o))
}

fn today() -> String {
    let secs = std::time::SystemTime::now()
        .duration_since(std::time::UNIX_EPOCH)
        .map(|d| d.as_secs() as i64)
        .unwrap_or(0);
    crate::render::report::iso_date(secs)
}

/// Runs a job and prints its findings as asked.
fn run_job(job: &Job, o: &Outputs, out: &mut dyn std::io::Write) -> Result<(), String> {
    let date = today();
    let rep = job.run(&mut |_| true).map_err(|e| match e {
        RunError::Input(m) => m,
        RunError::Cancelled => "stopped".into(),
    })?;
    let text = if o.json {
        rep.json().map_err(|e| e.to_string())? + "\n"
    } else if o.markdown {
        rep.markdown(&date)
    } else {
        rep.text(&date)
    };
    if let Some(path) = &o.html {
        std::fs::write(path, rep.html(&date))
            .map_err(|e| format!("Could not write \"{path}\": {e}"))?;
    }
    out.write_all(text.as_bytes()).map_err(|e| e.to_string())
}

/// Reads an analysis file: a job (as the page saves it) or a bare two-group request.
pub fn read_job(text: &str, name: &str) -> Result<Job, String> {
    match serde_json::from_str::<Job>(text) {
        Ok(j) => Ok(j),
        Err(e1) => serde_json::from_str::<Request>(text)
            .map(Job::Compare)
            .map_err(|_| format!("\"{name}\" is not a Reshuffle analysis file ({e1}).")),
    }
}

fn analyze(args: &[String], out: &mut dyn std::io::Write) -> Result<(), String> {
    let (args, mut o) = take_outputs(args)?;
    // A saved analysis or a share link replaces the data file and the settings.
    let pos = |flag: &str| args.iter().position(|a| a == flag);
    if let Some(i) = pos("--link").or_else(|| pos("--request")) {
        let value = args
            .get(i + 1)
            .ok_or_else(|| format!("{} needs a value.", args[i]))?;
        let others: Vec<&String> = args
            .iter()
            .enumerate()
            .filter(|(k, _)| *k != i && *k != i + 1)
            .map(|(_, a)| a)
            .collect();
        for a in &others {
            if a.as_str() != "--json" {
                return Err(format!(
                    "{} takes the whole analysis from the {}; {a} cannot be combined with it.",
                    args[i],
                    if args[i] == "--link" { "link" } else { "file" }
                ));
            }
        }
        o.json = !others.is_empty();
        let job = if args[i] == "--link" {
            crate::wire::link::decode(value)?
        } else {
            read_job(&read_data(value)?, value)?
        };
        return run_job(&job, &o, out);
    }
    let (job, json) = job_from_args(&args)?;
    o.json = o.json || json;
    run_job(&job, &o, out)
}

/// Builds the job an `analyze` (or `link`) command line describes, with whether `--json`
/// was given.
pub fn job_from_args(args: &[String]) -> Result<(Job, bool), String> {
    let Some(i) = args.iter().position(|a| a == "--design") else {
        let (req, json) = request_from_args(args, &mut |f| read_data(f))?;
        return Ok((Job::Compare(req), json));
    };
    let design = args.get(i + 1).ok_or("--design needs a value.")?.clone();
    let rest: Vec<String> = args
        .iter()
        .enumerate()
        .filter(|(k, _)| *k != i && *k != i + 1)
        .map(|(_, a)| a.clone())
        .collect();
    match design.as_str() {
        "two-groups" => {
            let (req, json) = request_from_args(&rest, &mut |f| read_data(f))?;
            Ok((Job::Compare(req), json))
        }
        "paired" | "one-sample" => paired_job(&design, &rest),
        "association" => assoc_job(&rest),
        "k-groups" => kgroups_job(&rest),
        "stratified" => strata_job(&rest),
        "yes-no" => yesno_job(&rest),
        other => Err(format!(
            "--design takes two-groups, paired, one-sample, k-groups, association, stratified \
             or yes-no (not \"{other}\")."
        )),
    }
}

impl TestOpts {
    /// The options as the shared settings block of the later designs.
    fn apply(&self, s: &mut crate::designs::TestSettings) {
        s.seed = self.seed;
        s.alternative = self.alternative.unwrap_or(s.alternative);
        s.two_sided = self.two_sided.unwrap_or(s.two_sided);
        s.interval = self.interval.unwrap_or(s.interval);
        s.resamples = self.resamples.unwrap_or(s.resamples);
        s.bootstrap_resamples = self.bootstrap.unwrap_or(s.bootstrap_resamples);
        s.exact_limit = self.exact_limit.unwrap_or(s.exact_limit);
        s.confidence = self.confidence.unwrap_or(s.confidence);
    }
}

/// `--design paired --columns FIRST,SECOND` or `--design one-sample --value COL --reference VALUE`.
fn paired_job(design: &str, args: &[String]) -> Result<(Job, bool), String> {
    use crate::designs::paired::{PairedLayout, PairedRequest};
    use crate::resample::signs::FlipStatistic;
    let mut p = Opts::parse(args)?;
    let json = p.switch("--json");
    let mut req = PairedRequest::new(
        String::new(),
        PairedLayout::OneSample {
            value: String::new(),
            reference: 0.0,
        },
        0,
    );
    let (columns, value, reference) = (
        p.list("--columns"),
        p.take("--value"),
        p.num::<f64>("--reference")?,
    );
    let (group, unit) = (p.take("--group"), p.take("--unit"));
    let (first, second) = (p.take("--first"), p.take("--second"));
    if let Some(st) = p.choice(
        "--statistic",
        FlipStatistic::from_key,
        "mean or median for this design",
    )? {
        req.statistic = st;
    }
    let t = TestOpts::read(&mut p)?;
    (req.header, req.seed) = (t.header, t.seed);
    req.alternative = t.alternative.unwrap_or(req.alternative);
    req.two_sided = t.two_sided.unwrap_or(req.two_sided);
    req.interval = t.interval.unwrap_or(req.interval);
    req.resamples = t.resamples.unwrap_or(req.resamples);
    req.bootstrap_resamples = t.bootstrap.unwrap_or(req.bootstrap_resamples);
    req.exact_limit = t.exact_limit.unwrap_or(req.exact_limit);
    req.confidence = t.confidence.unwrap_or(req.confidence);
    req.layout = match (design, columns, value, reference) {
        ("paired", Some(c), None, None) if c.len() == 2 => PairedLayout::Paired { first: c[0].clone(), second: c[1].clone() },
        ("paired", None, Some(v), None) if group.is_some() && unit.is_some() => PairedLayout::Long {
            value: v,
            group: group.unwrap_or_default(),
            unit: unit.unwrap_or_default(),
            first: first.unwrap_or_default(),
            second: second.unwrap_or_default(),
        },
        ("paired", _, _, _) => return Err("The paired design needs --columns FIRST,SECOND (the difference is first minus second), or --value COL --group COL --unit COL in long format.".into()),
        ("one-sample", None, Some(v), Some(r)) => PairedLayout::OneSample { value: v, reference: r },
        _ => return Err("The one-sample design needs --value COL and --reference VALUE.".into()),
    };
    req.data = p.data()?;
    p.finish()?;
    Ok((Job::Paired(req), json))
}

/// `--design association --x COL --y COL [--statistic pearson|spearman|slope]`.
fn assoc_job(args: &[String]) -> Result<(Job, bool), String> {
    use crate::designs::association::{AssocRequest, AssocStatistic};
    let mut p = Opts::parse(args)?;
    let json = p.switch("--json");
    let (x, y) = match (p.take("--x"), p.take("--y")) {
        (Some(x), Some(y)) => (x, y),
        _ => return Err("The association design needs --x COL and --y COL.".into()),
    };
    let mut req = AssocRequest::new(String::new(), x, y, 0);
    if let Some(st) = p.choice(
        "--statistic",
        AssocStatistic::from_key,
        "pearson, spearman or slope for this design",
    )? {
        req.statistic = st;
    }
    let t = TestOpts::read(&mut p)?;
    (req.header, req.seed) = (t.header, t.seed);
    req.alternative = t.alternative.unwrap_or(req.alternative);
    req.two_sided = t.two_sided.unwrap_or(req.two_sided);
    req.interval = t.interval.unwrap_or(req.interval);
    req.resamples = t.resamples.unwrap_or(req.resamples);
    req.bootstrap_resamples = t.bootstrap.unwrap_or(req.bootstrap_resamples);
    req.exact_limit = t.exact_limit.unwrap_or(req.exact_limit);
    req.confidence = t.confidence.unwrap_or(req.confidence);
    req.data = p.data()?;
    p.finish()?;
    Ok((Job::Association(req), json))
}

/// `--design k-groups [--value COL --group COL | --columns A,B,C] [--control LEVEL]
/// [--statistic f|welch-f|median-spread]`.
fn kgroups_job(args: &[String]) -> Result<(Job, bool), String> {
    use crate::designs::k_groups::{KGroupsRequest, KStatistic};
    let mut p = Opts::parse(args)?;
    let json = p.switch("--json");
    let layout = match (p.take("--value"), p.take("--group"), p.list("--columns")) {
        (None, None, None) => Layout::Detect,
        (Some(value), Some(group), None) => Layout::Long { value, group },
        (None, None, Some(columns)) => Layout::Wide { columns },
        _ => {
            return Err(
                "k groups are read from --value COL with --group COL (long format) or from \
                 --columns A,B,C (one column per group)."
                    .into(),
            )
        }
    };
    let mut req = KGroupsRequest::new(String::new(), layout, 0);
    req.control = p.take("--control");
    if let Some(st) = p.choice(
        "--statistic",
        KStatistic::from_key,
        "f, welch-f or median-spread for this design",
    )? {
        req.statistic = st;
    }
    let t = TestOpts::read(&mut p)?;
    req.header = t.header;
    t.apply(&mut req.settings);
    req.data = p.data()?;
    p.finish()?;
    Ok((Job::KGroups(req), json))
}

/// `--design stratified --value COL --group COL --strata COL [--weights size|precision]`.
fn strata_job(args: &[String]) -> Result<(Job, bool), String> {
    use crate::designs::stratified::{StrataRequest, StrataWeights};
    let mut p = Opts::parse(args)?;
    let json = p.switch("--json");
    let (value, group, strata) = match (p.take("--value"), p.take("--group"), p.take("--strata")) {
        (Some(v), Some(g), Some(s)) => (v, g, s),
        _ => {
            return Err(
                "The stratified design needs --value COL, --group COL and --strata COL (the \
                 column naming each row's site, batch or day)."
                    .into(),
            )
        }
    };
    let mut req = StrataRequest::new(String::new(), value, group, strata, 0);
    req.first = p.take("--first");
    req.second = p.take("--second");
    if let Some(w) = p.choice("--weights", StrataWeights::from_key, "size or precision")? {
        req.weights = w;
    }
    if let Some(st) = p.take("--statistic") {
        if st != "mean-difference" {
            return Err(format!(
                "The stratified design measures the difference in means within strata \
                 (--statistic mean-difference), not \"{st}\"."
            ));
        }
    }
    let t = TestOpts::read(&mut p)?;
    req.header = t.header;
    t.apply(&mut req.settings);
    req.data = p.data()?;
    p.finish()?;
    Ok((Job::Stratified(req), json))
}

/// `--design yes-no --value COL --group COL` or `--counts 42/300,61/310` (no file needed).
fn yesno_job(args: &[String]) -> Result<(Job, bool), String> {
    use crate::designs::yes_no::{parse_counts, YesNoInput, YesNoRequest, YesNoStatistic};
    let mut p = Opts::parse(args)?;
    let json = p.switch("--json");
    let counts = p.take("--counts");
    let (value, group) = (p.take("--value"), p.take("--group"));
    let (first, second) = (p.take("--first"), p.take("--second"));
    let input = match (counts, value, group) {
        (Some(c), None, None) => YesNoInput::Counts {
            groups: parse_counts(&c)?,
        },
        (None, Some(value), Some(group)) => YesNoInput::Table {
            value,
            group,
            first,
            second,
        },
        _ => {
            return Err(
                "The yes-no design needs --value COL --group COL (a column of yes/no outcomes \
                 and a column of group labels) or --counts 42/300,61/310."
                    .into(),
            )
        }
    };
    let from_counts = matches!(input, YesNoInput::Counts { .. });
    let mut req = YesNoRequest::new(String::new(), input, 0);
    if let Some(st) = p.choice(
        "--statistic",
        YesNoStatistic::from_key,
        "proportion-difference, risk-ratio or odds-ratio for this design",
    )? {
        req.statistic = st;
    }
    let t = TestOpts::read(&mut p)?;
    req.header = t.header;
    t.apply(&mut req.settings);
    if !from_counts || p.file.is_some() {
        req.data = p.data()?;
    }
    p.finish()?;
    Ok((Job::YesNo(req), json))
}

/// `reshuffle plan [FILE] --design D ...`: power, sample size and detectable effect.
fn plan_command(args: &[String], out: &mut dyn std::io::Write) -> Result<(), String> {
    let (args, mut o) = take_outputs(args)?;
    let (job, json) = plan_job(&args)?;
    o.json = json;
    run_job(&job, &o, out)
}

/// Builds a planning job from the command line.
pub fn plan_job(args: &[String]) -> Result<(Job, bool), String> {
    use crate::designs::plan::{PlanDesign, PlanModel, PlanRequest};
    let mut p = Opts::parse(args)?;
    let json = p.switch("--json");
    let multiply = p.switch("--multiply");
    let design = p
        .choice(
            "--design",
            PlanDesign::from_key,
            "two-groups, paired, k-groups or yes-no",
        )?
        .ok_or("Say which design to plan with --design two-groups, paired, k-groups or yes-no.")?;
    let effect: f64 = p
        .num("--effect")?
        .ok_or("Give the assumed effect with --effect (for example --effect 0.5).")?;
    let header = p.header()?;
    let (sd, baseline, value) = (
        p.num::<f64>("--sd")?,
        p.num::<f64>("--baseline")?,
        p.take("--value"),
    );
    let model = match (sd, baseline, value) {
        (Some(sd), None, None) => PlanModel::Normal { sd },
        (None, Some(baseline), None) => PlanModel::Rates { baseline },
        (None, None, Some(value)) => PlanModel::Pilot {
            data: p.data()?,
            header,
            value,
            multiply,
        },
        _ => {
            return Err(
                "Give one data model: --sd SD (normal values), FILE --value COL (a pilot \
                 column), or --baseline RATE (yes/no outcomes)."
                    .into(),
            )
        }
    };
    let mut req = PlanRequest::new(design, model, effect, 0);
    if let Some(m) = p.list("--means") {
        req.means = m
            .iter()
            .map(|v| parse_num("--means", v))
            .collect::<Result<Vec<f64>, String>>()?;
    }
    req.statistic = p.take("--statistic").unwrap_or_default();
    req.alpha = p.num("--alpha")?.unwrap_or(req.alpha);
    req.alternative = p.alternative()?.unwrap_or(req.alternative);
    req.target_power = p.num("--power")?.unwrap_or(req.target_power);
    req.studies = p.num("--studies")?.unwrap_or(req.studies);
    req.relabellings = p.num("--relabellings")?.unwrap_or(req.relabellings);
    req.max_n = p.num("--max-n")?.unwrap_or(req.max_n);
    req.mde_n = p.num("--mde-n")?;
    req.seed = p.seed()?;
    p.finish()?;
    Ok((Job::Plan(req), json))
}

/// `reshuffle link FILE [analyze options] [--base URL]`: the share link of an analysis.
fn link_command(args: &[String], out: &mut dyn std::io::Write) -> Result<(), String> {
    let mut base = "http://127.0.0.1:8080/".to_string();
    let mut rest = Vec::new();
    let mut i = 0;
    while i < args.len() {
        if args[i] == "--base" {
            i += 1;
            base = args
                .get(i)
                .cloned()
                .ok_or("--base needs the page's address.")?;
        } else {
            rest.push(args[i].clone());
        }
        i += 1;
    }
    let (job, _) = job_from_args(&rest)?;
    let l = crate::wire::link::link(&base, &job);
    if l.len() > crate::wire::link::LONG_LINK {
        let _ = writeln!(
            std::io::stderr(),
            "reshuffle: note: the link is {} characters long; some chat and mail programs cut links over {}.",
            l.len(),
            crate::wire::link::LONG_LINK
        );
    }
    writeln!(out, "{l}").map_err(|e| e.to_string())
}

fn estimate(args: &[String], out: &mut dyn std::io::Write) -> Result<(), String> {
    use crate::designs::estimate::{self as est, Estimate, EstimateLayout, EstimateRequest};
    let mut o = Opts::parse(args)?;
    let json = o.switch("--json");
    let paired = o.switch("--paired");
    let (value, group, columns) = (o.take("--value"), o.take("--group"), o.list("--columns"));
    let (x, y, strata) = (o.take("--x"), o.take("--y"), o.take("--strata"));
    let (first, second) = (o.take("--first"), o.take("--second"));
    let which = o
        .choice(
            "--estimate",
            Estimate::from_key,
            &Estimate::ALL.map(|e| e.key()).join(", "),
        )?
        .ok_or("Say what to estimate with --estimate (for example --estimate median).")?;
    let layout = match (value, group, columns, x, y) {
        (Some(v), None, None, None, None) => EstimateLayout::One { value: v, strata },
        (Some(v), Some(g), None, None, None) => EstimateLayout::Groups {
            layout: Layout::Long { value: v, group: g },
            first,
            second,
            paired,
        },
        (None, None, Some(c), None, None) => EstimateLayout::Groups { layout: Layout::Wide { columns: c }, first, second, paired },
        (None, None, None, Some(x), Some(y)) => EstimateLayout::Pairs { x, y },
        _ => {
            return Err(
                "Give the data as --value COL (one sample), --value COL --group COL or --columns A,B (two groups), or --x COL --y COL (association).".into(),
            )
        }
    };
    let mut req = EstimateRequest::new(String::new(), layout, which, 0);
    req.header = o.header()?;
    req.q = o.num("--q")?;
    if let Some(v) = o.take("--interval") {
        let (h, more) = parse_intervals(&v)?;
        req.methods = std::iter::once(h).chain(more).collect();
    }
    if let Some(side) = o.choice("--side", Side::from_key, "two-sided, lower or upper")? {
        req.side = side;
    }
    req.confidence = o.num("--confidence")?.unwrap_or(req.confidence);
    req.resamples = o.num("--resamples")?.unwrap_or(req.resamples);
    req.seed = o.seed()?;
    req.data = o.data()?;
    o.finish()?;
    let rep = est::run(&req, &mut |_| true).map_err(|e| e.to_string())?;
    let text = if json {
        serde_json::to_string_pretty(&rep).map_err(|e| e.to_string())? + "\n"
    } else {
        crate::render::report::estimate_text(&rep)
    };
    out.write_all(text.as_bytes()).map_err(|e| e.to_string())
}

/// Speed of the relabelling kernels, side by side in one run (ratios, not absolute targets).
fn bench(out: &mut dyn std::io::Write) -> Result<(), String> {
    use std::time::Instant;
    let mut s = rng::Stream::new(1, rng::Purpose::Permutation, 0);
    let a: Vec<f64> = (0..24).map(|_| 10.0 + s.unit() * 3.0).collect();
    let b: Vec<f64> = (0..20).map(|_| 9.5 + s.unit() * 3.0).collect();
    let total: u64 = 1_000_000;
    let mut lines = Vec::new();
    let mut rates = Vec::new();
    for st in [
        Statistic::MeanDifference,
        Statistic::WelchT,
        Statistic::MedianDifference,
    ] {
        let setup = perm::Setup::new(st, &a, &b);
        let t0 = Instant::now();
        let (c, _) =
            perm::random_blocks(&setup, 7, total, 0..rng::block_count(total), &mut |_| true)
                .map_err(|e| e.to_string())?;
        let secs = t0.elapsed().as_secs_f64();
        rates.push(c.total as f64 / secs);
        lines.push(format!(
            "{:<28} {:>14.0} relabellings/s",
            format!("kernel, {}", st.key()),
            c.total as f64 / secs
        ));
    }
    // Baseline: shuffle all 44 values and recompute both means, per relabelling.
    let pooled: Vec<f64> = a.iter().chain(&b).copied().collect();
    let t0 = Instant::now();
    let mut x = pooled.clone();
    let mut acc = 0.0;
    let mut st = rng::Stream::new(7, rng::Purpose::Permutation, 0);
    // Like the kernel, it keeps every statistic and counts the extreme ones.
    let mut kept = Vec::with_capacity(total as usize);
    let mut extreme = 0u64;
    for _ in 0..total {
        for i in (1..x.len()).rev() {
            let j = st.below(i as u64 + 1) as usize;
            x.swap(i, j);
        }
        let m1 = x[..24].iter().sum::<f64>() / 24.0;
        let m2 = x[24..].iter().sum::<f64>() / 20.0;
        let t = m1 - m2;
        extreme += u64::from(t.abs() >= 0.25);
        kept.push(t);
        acc += t;
    }
    acc += extreme as f64 * 0.0 + kept.len() as f64 * 0.0;
    let base = total as f64 / t0.elapsed().as_secs_f64();
    lines.push(format!(
        "{:<28} {:>14.0} relabellings/s   (checksum {:.3})",
        "full shuffle, mean (baseline)",
        base,
        acc / total as f64
    ));
    // Exact enumeration rate: C(20, 10) = 184,756 splits.
    let setup = perm::Setup::new(Statistic::MeanDifference, &a[..10], &b[..10]);
    let t0 = Instant::now();
    let (c, _) = setup.enumerate(u64::MAX, &mut |_| true).ok_or("stopped")?;
    let exact = c.total as f64 / t0.elapsed().as_secs_f64();
    lines.push(format!(
        "{:<28} {:>14.0} splits/s",
        "enumeration, mean-difference", exact
    ));
    writeln!(
        out,
        "n = 24 + 20, {} relabellings per kernel\n",
        fmt::count(total)
    )
    .map_err(|e| e.to_string())?;
    for l in lines {
        writeln!(out, "{l}").map_err(|e| e.to_string())?;
    }
    writeln!(
        out,
        "\nratio, partial-shuffle mean kernel / full-shuffle baseline: {:.2}",
        rates[0] / base
    )
    .map_err(|e| e.to_string())?;
    Ok(())
}

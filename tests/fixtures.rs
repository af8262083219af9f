//! Pinned behaviour: every number the engine gives today, checked bit for bit.
//!
//! - `tests/fixtures/streams.json`: the first outputs of the random streams for fixed seeds,
//!   purposes and blocks, computed independently from the published algorithms
//!   (`tests/fixtures/make_streams.py`: SplitMix64, xoshiro256++ with its jumps, Lemire's
//!   bounded integers).
//! - `tests/fixtures/v1/`: saved analysis files and share links of format version 1, one per
//!   design and statistic, with the full report each gave when it was pinned
//!   (`tests/fixtures/v1/make_v1_fixtures.py`). Old files and links must keep opening and
//!   keep giving these numbers.
//!
//! A deliberate change of a pinned number updates the fixture in the same commit and says why.

use std::path::{Path, PathBuf};

use reshuffle::resample::rng::{self, Purpose, Stream};
use serde_json::Value;

fn fixtures() -> PathBuf {
    Path::new(env!("CARGO_MANIFEST_DIR")).join("tests/fixtures")
}

fn read(p: &Path) -> String {
    std::fs::read_to_string(p).unwrap_or_else(|e| panic!("{}: {e}", p.display()))
}

fn u64_of(v: &Value) -> u64 {
    v.as_u64().unwrap_or_else(|| panic!("not a u64: {v}"))
}

#[test]
fn streams_match_the_published_algorithms() {
    let f: Value = serde_json::from_str(&read(&fixtures().join("streams.json"))).unwrap();
    let cases = f["streams"].as_array().unwrap();
    assert!(cases.len() >= 30);
    for c in cases {
        let purpose = match c["purpose"].as_str().unwrap() {
            "permutation" => Purpose::Permutation,
            _ => Purpose::Bootstrap,
        };
        let (seed, block) = (u64_of(&c["seed"]), u64_of(&c["block"]));
        let mut s = Stream::new(seed, purpose, block);
        let words: Vec<u64> = (0..4).map(|_| s.next_u64()).collect();
        let want: Vec<u64> = c["next_u64"]
            .as_array()
            .unwrap()
            .iter()
            .map(u64_of)
            .collect();
        assert_eq!(words, want, "seed {seed}, {purpose:?}, block {block}");
        // The bounded integers continue the same stream, in the fixture's order of n.
        for b in c["below"].as_array().unwrap() {
            let n = u64_of(&b["n"]);
            for v in b["values"].as_array().unwrap() {
                assert_eq!(
                    s.below(n),
                    u64_of(v),
                    "below({n}), seed {seed}, block {block}"
                );
            }
        }
        for u in c["unit"].as_array().unwrap() {
            assert_eq!(s.unit().to_bits(), u.as_f64().unwrap().to_bits());
        }
        // The same stream reached through the consecutive-block iterator.
        if block > 0 {
            let mut it = rng::Streams::new(seed, purpose, block - 1);
            it.next();
            let mut t = it.next().unwrap();
            assert_eq!(t.next_u64(), want[0], "Streams, seed {seed}, block {block}");
        }
    }
    for c in f["sub_seeds"].as_array().unwrap() {
        let (seed, i) = (u64_of(&c["seed"]), u64_of(&c["index"]));
        assert_eq!(rng::sub_seed(seed, i), u64_of(&c["sub_seed"]));
    }
    for c in f["seeds_from_entropy"].as_array().unwrap() {
        assert_eq!(
            rng::seed_from_entropy(u64_of(&c["entropy"])),
            u64_of(&c["seed"])
        );
    }
}

/// Keys whose string values are data (names of groups, columns, levels), compared like
/// numbers. Every other string is wording, pinned by the renderings instead.
const DATA_KEYS: [&str; 11] = [
    "name",
    "names",
    "first",
    "second",
    "x",
    "y",
    "value_label",
    "control",
    "strata_label",
    "outcome_label",
    "left_out",
];

/// Every number, boolean and data string of a report, by path (`.groups[0].mean`).
fn leaves(path: &str, v: &Value, key: &str, out: &mut Vec<(String, Value)>) {
    match v {
        Value::Object(m) => {
            for (k, x) in m {
                leaves(&format!("{path}.{k}"), x, k, out);
            }
        }
        Value::Array(a) => {
            for (i, x) in a.iter().enumerate() {
                leaves(&format!("{path}[{i}]"), x, key, out);
            }
        }
        Value::String(_) if !DATA_KEYS.contains(&key) => {}
        // Notes are wording (now typed codes); they are pinned by the renderings.
        _ if key == "note" || key == "notes" => {}
        other => out.push((path.to_string(), other.clone())),
    }
}

/// Where a version-1 report's value is found in today's report: the paths that moved when
/// the report was reshaped (the numbers themselves never change). `None`: not a number of the
/// analysis any more, for a stated reason.
fn moved(path: &str) -> Option<String> {
    // The format version now sits in the file's envelope, and is 2 (checked in
    // `report_value`).
    if path == ".format_version" {
        return None;
    }
    // Effect sizes carried their display name ("Hedges' g", "risk ratio"); the name is now
    // wording, given by the renderer from the field, and pinned by the renderings.
    for effect in [
        ".hedges_g",
        ".dz",
        ".standardized",
        ".difference",
        ".odds_ratio",
        ".risk_ratio",
    ] {
        if path == format!("{effect}.name") {
            return None;
        }
    }
    Some(path.to_string())
}

fn value_at<'a>(v: &'a Value, path: &str) -> Option<&'a Value> {
    let mut cur = v;
    for part in path.split('.').filter(|p| !p.is_empty()) {
        let (name, idx) = match part.find('[') {
            Some(i) => (&part[..i], Some(&part[i..])),
            None => (part, None),
        };
        if !name.is_empty() {
            cur = cur.get(name)?;
        }
        if let Some(idx) = idx {
            for i in idx.split(['[', ']']).filter(|x| !x.is_empty()) {
                cur = cur.get(i.parse::<usize>().ok()?)?;
            }
        }
    }
    Some(cur)
}

fn same(a: &Value, b: &Value) -> bool {
    match (a, b) {
        (Value::Number(x), Value::Number(y)) => match (x.as_u64(), y.as_u64()) {
            (Some(p), Some(q)) => p == q,
            _ => x.as_f64().map(f64::to_bits) == y.as_f64().map(f64::to_bits),
        },
        (x, y) => x == y,
    }
}

/// The pinned values the new report does not reproduce, bit for bit.
fn differences(want: &Value, got: &Value) -> Vec<String> {
    let mut pinned = Vec::new();
    leaves("", want, "", &mut pinned);
    assert!(pinned.len() > 20, "only {} pinned values", pinned.len());
    let mut out = Vec::new();
    for (path, w) in pinned {
        let Some(to) = moved(&path) else { continue };
        match value_at(got, &to) {
            Some(g) if same(&w, g) => {}
            Some(g) => out.push(format!("{path}: {g}, pinned {w}")),
            None => out.push(format!("{path}: missing (looked at {to})")),
        }
    }
    out
}

fn cases() -> Vec<String> {
    let mut names: Vec<String> = std::fs::read_dir(fixtures().join("v1/jobs"))
        .unwrap()
        .map(|e| e.unwrap().file_name().to_string_lossy().into_owned())
        .filter_map(|n| n.strip_suffix(".json").map(String::from))
        .collect();
    names.sort();
    assert!(names.len() >= 30, "fixture jobs missing");
    names
}

/// The report inside a version-2 report file (`{"format_version": 2, "engine_version": …,
/// "design": …, "report": {…}}`), checked for its envelope.
fn report_value(text: &str) -> Value {
    let mut v: Value = serde_json::from_str(text).unwrap();
    assert_eq!(v["format_version"], 2, "{text}");
    assert!(v["engine_version"].is_string() && v["design"].is_string());
    v["report"].take()
}

fn check(name: &str, job: &reshuffle::wire::Job, how: &str) -> Vec<String> {
    let report = job
        .run(&mut |_| true)
        .unwrap_or_else(|e| panic!("{name} ({how}): {e}"));
    let got = report_value(&reshuffle::wire::report_json(&report));
    let want: Value =
        serde_json::from_str(&read(&fixtures().join(format!("v1/reports/{name}.json")))).unwrap();
    differences(&want, &got)
        .into_iter()
        .map(|x| format!("{name} ({how}) {x}"))
        .collect()
}

#[test]
fn version_1_files_reproduce_their_reports() {
    let mut bad = Vec::new();
    for name in cases() {
        let text = read(&fixtures().join(format!("v1/jobs/{name}.json")));
        let read = reshuffle::wire::read_job(&text).unwrap();
        assert_eq!(read.version, 1, "{name}");
        bad.extend(check(&name, &read.job, "file"));
    }
    assert!(bad.is_empty(), "{}", bad.join("\n"));
}

#[test]
fn version_1_links_reproduce_their_reports() {
    let mut bad = Vec::new();
    for name in cases() {
        let link = read(&fixtures().join(format!("v1/links/{name}.txt")));
        let d = reshuffle::wire::link::decode(link.trim()).unwrap();
        assert_eq!((d.version, d.checked), (1, false), "{name}");
        bad.extend(check(&name, &d.job, "link"));
    }
    assert!(bad.is_empty(), "{}", bad.join("\n"));
}

#[test]
fn the_command_reads_version_1_files_and_links() {
    for (flag, name, path) in [
        (
            "--request",
            "k-groups-adhesive",
            "jobs/k-groups-adhesive.json",
        ),
        (
            "--link",
            "paired-sleep-exact",
            "links/paired-sleep-exact.txt",
        ),
    ] {
        let p = fixtures().join("v1").join(path);
        let arg = if flag == "--link" {
            read(&p).trim().to_string()
        } else {
            p.display().to_string()
        };
        let out = std::process::Command::new(env!("CARGO_BIN_EXE_reshuffle"))
            .args(["analyze", flag, &arg, "--json"])
            .output()
            .unwrap();
        assert!(
            out.status.success(),
            "{}",
            String::from_utf8_lossy(&out.stderr)
        );
        let got = report_value(&String::from_utf8(out.stdout).unwrap());
        let want: Value =
            serde_json::from_str(&read(&fixtures().join(format!("v1/reports/{name}.json"))))
                .unwrap();
        let d = differences(&want, &got);
        assert!(d.is_empty(), "{name}: {}", d.join("\n"));
    }
}

/// The words as well as the numbers: each fixture's findings rendered as text, Markdown,
/// HTML (with its figures) and CSV, on a fixed date. These pin the renderers while the
/// engine is reshaped; a deliberate change of wording rewrites them
/// (`RESHUFFLE_PIN_WORDS=write cargo test --test fixtures`) in the same commit, saying why.
#[test]
fn version_1_fixtures_are_worded_as_pinned() {
    let write = std::env::var("RESHUFFLE_PIN_WORDS").as_deref() == Ok("write");
    let dir = fixtures().join("v1/words");
    let mut bad = Vec::new();
    for name in cases() {
        let text = read(&fixtures().join(format!("v1/jobs/{name}.json")));
        let job = reshuffle::wire::read_job(&text).unwrap().job;
        let rep = job.run(&mut |_| true).unwrap();
        let doc = reshuffle::render::document(&rep, "2026-01-02");
        for (ext, body) in [
            ("txt", doc.text()),
            ("md", doc.markdown()),
            ("html.pinned", doc.html()),
            ("csv", doc.results_csv()),
        ] {
            let p = dir.join(format!("{name}.{ext}"));
            if write {
                std::fs::create_dir_all(&dir).unwrap();
                std::fs::write(&p, &body).unwrap();
            } else if read(&p) != body {
                bad.push(format!("{name}.{ext}"));
            }
        }
    }
    assert!(bad.is_empty(), "worded differently: {}", bad.join(", "));
}

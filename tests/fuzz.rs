//! Property-based fuzzing (proptest) of what reads untrusted input: the table reader, the
//! share-link decoder and the request reader with its validator. Properties: no panic, a
//! specific error instead, and bounded memory (a counting allocator fails a case whose peak
//! allocation passes 256 MB). CI runs a short slice; the full run is documented in README.md:
//!
//!     RESHUFFLE_FUZZ_CASES=1000000 cargo test --release --test fuzz
//!
//! (one million cases for each of the three targets).

use std::alloc::{GlobalAlloc, Layout, System};
use std::sync::atomic::{AtomicUsize, Ordering};

use proptest::prelude::*;
use proptest::test_runner::{Config, TestRunner};
use reshuffle::input::table::{self, HeaderChoice};
use reshuffle::wire::{self, link};

/// Counts live and peak bytes, to bound every case's memory.
struct Counting;

static LIVE: AtomicUsize = AtomicUsize::new(0);
static PEAK: AtomicUsize = AtomicUsize::new(0);

unsafe impl GlobalAlloc for Counting {
    unsafe fn alloc(&self, layout: Layout) -> *mut u8 {
        let p = unsafe { System.alloc(layout) };
        if !p.is_null() {
            let now = LIVE.fetch_add(layout.size(), Ordering::Relaxed) + layout.size();
            PEAK.fetch_max(now, Ordering::Relaxed);
        }
        p
    }
    unsafe fn dealloc(&self, ptr: *mut u8, layout: Layout) {
        unsafe { System.dealloc(ptr, layout) };
        LIVE.fetch_sub(layout.size(), Ordering::Relaxed);
    }
}

#[global_allocator]
static ALLOC: Counting = Counting;

const MEMORY_BOUND: usize = 256 << 20;

fn cases(default: u32) -> u32 {
    std::env::var("RESHUFFLE_FUZZ_CASES")
        .ok()
        .and_then(|v| v.parse().ok())
        .unwrap_or(default)
}

fn runner(default: u32) -> TestRunner {
    TestRunner::new(Config {
        cases: cases(default),
        failure_persistence: None,
        ..Config::default()
    })
}

/// Runs `f` and fails when its peak allocation above the live bytes at the start passes
/// the bound. (Tests of this file run one at a time: see `fuzz_all`.)
fn bounded<T>(f: impl FnOnce() -> T) -> Result<T, TestCaseError> {
    let base = LIVE.load(Ordering::Relaxed);
    PEAK.store(base, Ordering::Relaxed);
    let out = f();
    let used = PEAK.load(Ordering::Relaxed).saturating_sub(base);
    if used > MEMORY_BOUND {
        return Err(TestCaseError::fail(format!("{used} bytes allocated")));
    }
    Ok(out)
}

/// Table-like text: cells of digits, signs, decimal marks, quotes, '#', spreadsheet errors,
/// NA markers and odd Unicode, joined by any delimiter and line ending.
fn table_text() -> impl Strategy<Value = String> {
    let cell = prop_oneof![
        "[0-9]{1,6}",
        "-?[0-9]{1,4}[.,][0-9]{0,4}",
        "[0-9]e[+-]?[0-9]{1,3}",
        Just("#N/A".to_string()),
        Just("#DIV/0!".to_string()),
        Just("NA".to_string()),
        Just("".to_string()),
        Just("\"".to_string()),
        Just("\"a,b\"".to_string()),
        "#[a-z0-9]{0,3}",
        "[a-zA-Z_ ]{1,8}",
        "\\PC{1,4}",
        Just("1e308".to_string()),
        Just("1e-320".to_string()),
        Just("\u{feff}".to_string()),
    ];
    let delim = prop_oneof![Just(","), Just(";"), Just("\t"), Just(" ")];
    let eol = prop_oneof![Just("\n"), Just("\r\n"), Just("\r")];
    (
        prop::collection::vec(prop::collection::vec(cell, 0..6), 0..12),
        delim,
        eol,
    )
        .prop_map(|(rows, d, e)| rows.iter().map(|r| r.join(d)).collect::<Vec<_>>().join(e))
}

fn fuzz_table_reader() {
    runner(3000)
        .run(&(table_text(), 0..3u8), |(text, h)| {
            let header = [
                HeaderChoice::Detect,
                HeaderChoice::Names,
                HeaderChoice::Data,
            ][h as usize];
            bounded(|| {
                if let Ok(t) = table::parse(&text, header) {
                    for c in &t.columns {
                        match c.numbers(t.decimal_comma) {
                            Ok(n) => assert!(n.values.iter().all(|v| v.1.is_finite())),
                            Err(e) => assert!(!e.message.is_empty()),
                        }
                    }
                }
            })
        })
        .unwrap();
}

/// Valid links of every design, from the pinned jobs, with their jobs.
fn valid_links() -> Vec<(String, wire::Job)> {
    let dir = concat!(env!("CARGO_MANIFEST_DIR"), "/tests/fixtures/v1/jobs");
    let mut out = Vec::new();
    for e in std::fs::read_dir(dir).unwrap() {
        let text = std::fs::read_to_string(e.unwrap().path()).unwrap();
        let job = wire::read_job(&text).unwrap().job;
        out.push((link::link("http://x/", &job), job));
    }
    out.sort_by(|a, b| a.0.cmp(&b.0));
    out
}

fn fuzz_link_decoder() {
    let links = valid_links();
    let n = links.len();
    let strategy = (
        0..n,
        prop::collection::vec((any::<prop::sample::Index>(), any::<char>()), 0..4),
        any::<prop::sample::Index>(),
        "\\PC{0,60}",
        0..4u8,
    );
    runner(3000)
        .run(&strategy, |(i, edits, cut, junk, mode)| {
            let (l, original) = &links[i];
            let text: String = match mode {
                // Characters replaced.
                0 => {
                    let mut chars: Vec<char> = l.chars().collect();
                    for (at, c) in &edits {
                        let k = at.index(chars.len());
                        chars[k] = *c;
                    }
                    chars.into_iter().collect()
                }
                // Cut short.
                1 => l.chars().take(cut.index(l.len())).collect(),
                // Junk after a version tag.
                2 => format!("http://x/#r2.{junk}"),
                _ => format!("http://x/#r1.{junk}"),
            };
            bounded(|| match link::decode(&text) {
                Ok(d) => {
                    // An edited or cut link that still decodes must give the very job it was
                    // made from (the edit fell outside the payload): the integrity check lets
                    // no altered analysis through. Its job then validates cleanly.
                    if mode < 2 {
                        assert_eq!(&d.job, original, "an altered link was accepted: {text}");
                    }
                    let _ = d.job.check();
                }
                Err(e) => assert!(!e.message.is_empty()),
            })
        })
        .unwrap();
}

fn fuzz_request_reader() {
    let dir = concat!(env!("CARGO_MANIFEST_DIR"), "/tests/fixtures/v1/jobs");
    let mut jobs: Vec<String> = std::fs::read_dir(dir)
        .unwrap()
        .map(|e| std::fs::read_to_string(e.unwrap().path()).unwrap())
        .collect();
    jobs.sort();
    let n = jobs.len();
    let values = prop_oneof![
        Just("-1".to_string()),
        Just("0".to_string()),
        Just("1e300".to_string()),
        Just("18446744073709551616".to_string()),
        Just("null".to_string()),
        Just("\"\"".to_string()),
        Just("[]".to_string()),
        Just("{}".to_string()),
        Just("1.5".to_string()),
        Just("\"two-sided\"".to_string()),
        "-?[0-9]{1,25}",
    ];
    runner(3000)
        .run(
            &(0..n, any::<prop::sample::Index>(), values),
            |(i, at, v)| {
                // Replace one JSON number, string, boolean or null of a valid request.
                let text = &jobs[i];
                let spots: Vec<(usize, usize)> = value_spans(text);
                let (s, e) = spots[at.index(spots.len())];
                let edited = format!("{}{}{}", &text[..s], v, &text[e..]);
                bounded(|| match wire::read_job(&edited) {
                    Ok(r) => {
                        let _ = r.job.check();
                    }
                    Err(e) => assert!(!e.message.is_empty()),
                })
            },
        )
        .unwrap();
}

/// Byte spans of the scalar values after ':' in a JSON text (numbers, strings, true, false,
/// null), for targeted edits.
fn value_spans(text: &str) -> Vec<(usize, usize)> {
    let b = text.as_bytes();
    let mut out = Vec::new();
    let mut i = 0;
    while i < b.len() {
        if b[i] == b':' {
            let mut s = i + 1;
            while s < b.len() && b[s] == b' ' {
                s += 1;
            }
            let mut e = s;
            if s < b.len() && b[s] == b'"' {
                e += 1;
                while e < b.len() && b[e] != b'"' {
                    if b[e] == b'\\' {
                        e += 1;
                    }
                    e += 1;
                }
                e = (e + 1).min(b.len());
            } else {
                while e < b.len() && !matches!(b[e], b',' | b'}' | b']' | b'\n' | b'{' | b'[') {
                    e += 1;
                }
            }
            if e > s {
                out.push((s, e));
            }
            i = e.max(i + 1);
        } else {
            i += 1;
        }
    }
    out
}

/// One test, so that the memory count of one target is not disturbed by another running
/// on a second thread.
#[test]
fn fuzz_all() {
    fuzz_table_reader();
    fuzz_link_decoder();
    fuzz_request_reader();
}

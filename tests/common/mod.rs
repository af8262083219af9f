//! Helpers shared by the checks against outside references (tests/*_checks.rs): reading the
//! JSON a script in tests/reference/ wrote, the datasets beside it, a tolerance check that
//! names what it compares, and the comparison of bootstrap bounds with scipy's over seeds.
#![allow(dead_code)]

use reshuffle::base::{Interval, Method};
use reshuffle::designs::two_groups::{Statistic, TwoGroupsRequest};
use reshuffle::input::columns::Layout;
use serde_json::Value;

/// tests/reference/NAME, as JSON.
pub fn reference(name: &str) -> Value {
    let p = format!("{}/tests/reference/{name}", env!("CARGO_MANIFEST_DIR"));
    let text = std::fs::read_to_string(&p).unwrap_or_else(|e| panic!("{p}: {e}"));
    serde_json::from_str(&text).unwrap_or_else(|e| panic!("{p}: {e}"))
}

/// tests/reference/data/FILE, as text.
pub fn data(file: &str) -> String {
    let p = format!("{}/tests/reference/data/{file}", env!("CARGO_MANIFEST_DIR"));
    std::fs::read_to_string(&p).unwrap_or_else(|e| panic!("{p}: {e}"))
}

/// Fails, naming `what`, unless `got` is within `tol` of `want`.
pub fn close(got: f64, want: f64, tol: f64, what: &str) {
    assert!((got - want).abs() <= tol, "{what}: {got} vs {want}");
}

/// A two-group request for a reference case (its "file", "value", "group", "first" and
/// "second" keys) with the statistic and seed.
pub fn two_groups(c: &Value, statistic: Statistic, seed: u64) -> TwoGroupsRequest {
    let mut r = TwoGroupsRequest::new(data(c["file"].as_str().unwrap()), seed);
    r.layout = Layout::Long {
        value: c["value"].as_str().unwrap().into(),
        group: c["group"].as_str().unwrap().into(),
    };
    r.first = Some(c["first"].as_str().unwrap().into());
    r.second = Some(c["second"].as_str().unwrap().into());
    r.statistic = statistic;
    r
}

/// Each percentile or BCa interval's ends lie within 4.5 Monte Carlo SDs of the mean bounds
/// scipy.stats.bootstrap gave over its seeds (keys "{BCa|percentile}_{low|high}_{mean|sd}"),
/// plus `slack` (a step of a discrete statistic, or a small allowance).
pub fn bounds_agree(name: &str, c: &Value, intervals: &[Interval], slack: f64) {
    for iv in intervals {
        let key = if iv.method == Method::Bca {
            "BCa"
        } else {
            "percentile"
        };
        for (end, got) in [("low", iv.low), ("high", iv.high)] {
            let mean = c[format!("{key}_{end}_mean")].as_f64().unwrap();
            let sd = c[format!("{key}_{end}_sd")].as_f64().unwrap();
            let got = got.unwrap_or_else(|| panic!("{name} {key} {end}: no bound"));
            close(got, mean, 4.5 * sd + slack, &format!("{name} {key} {end}"));
        }
    }
}

//! Planning by simulation checked against power computed outside the project.
//!
//! Expected values: the "plan" part of tests/reference/expected_designs.json, written by
//! tests/reference/make_reference_designs.py (statsmodels 0.15.0 TTestIndPower, TTestPower,
//! FTestAnovaPower, NormalIndPower; scipy 1.17.1 binom and hypergeom for the exact power of the
//! yes/no test). Each simulated power has a Monte Carlo standard error; checks allow four of
//! them. A relabelling test and the t or F test have the same power only for large samples,
//! and a test with a finite number of relabellings loses a little more: where the reference
//! is a t or F test, an allowance of 0.015 is added for that (our choice, not a published
//! bound; the observed gaps are smaller).

use reshuffle::designs::plan::{self, PlanDesign, PlanModel, PlanRequest};
use serde_json::Value;

fn expected() -> Value {
    let text = std::fs::read_to_string(concat!(
        env!("CARGO_MANIFEST_DIR"),
        "/tests/reference/expected_designs.json"
    ))
    .unwrap();
    serde_json::from_str::<Value>(&text).unwrap()["plan"].clone()
}

fn f(v: &Value) -> f64 {
    v.as_f64().unwrap()
}

fn check(got: &plan::PowerPoint, want: f64, allowance: f64, what: &str) {
    let tol = 4.0 * got.se + allowance;
    assert!(
        (got.power - want).abs() <= tol,
        "{what}: simulated {} ± {} vs {want} (tolerance {tol})",
        got.power,
        got.se
    );
}

/// Two groups, d = 0.5, 64 per group: statsmodels TTestIndPower gives 0.8015; and the
/// sample size for 80% power, read off the fitted curve, is near its 63.8 (64 per group in
/// Cohen 1988, Table 2.4.1, from memory; statsmodels' 63.77 rounds up to it).
#[test]
fn two_group_power_matches_the_t_test() {
    let e = &expected()["two_groups"];
    assert_eq!(f(&e["n_for_80"]).ceil(), 64.0);
    let mut r = PlanRequest::new(
        PlanDesign::TwoGroups,
        PlanModel::Normal { sd: 1.0 },
        0.5,
        2026,
    );
    r.studies = 4000;
    r.relabellings = 999;
    let p = plan::power_at(&r, 64, &mut |_| true).unwrap();
    check(&p, f(&e["power"]), 0.015, "two groups at n = 64");
    r.studies = 2000;
    let rep = plan::run(&r, &mut |_| true).unwrap();
    let sm = rep.smoothed.unwrap();
    assert!(
        (sm.n - f(&e["n_for_80"])).abs() <= 4.0 * sm.se + 3.0,
        "fitted n {} ± {} vs {}",
        sm.n,
        sm.se,
        f(&e["n_for_80"])
    );
}

/// Paired, 30 pairs, mean difference 0.5 SD: statsmodels TTestPower (one-sample t) 0.754.
#[test]
fn paired_power_matches_the_one_sample_t_test() {
    let e = &expected()["paired"];
    let mut r = PlanRequest::new(PlanDesign::Paired, PlanModel::Normal { sd: 1.0 }, 0.5, 7);
    r.studies = 4000;
    r.relabellings = 999;
    let p = plan::power_at(&r, 30, &mut |_| true).unwrap();
    check(&p, f(&e["power"]), 0.015, "paired at n = 30");
}

/// Three groups with means 0, 0, 0.5 (SD 1), 50 per group: statsmodels FTestAnovaPower with
/// Cohen's f = 0.2357 gives 0.727.
#[test]
fn k_group_power_matches_the_f_test() {
    let e = &expected()["k_groups"];
    let mut r = PlanRequest::new(PlanDesign::KGroups, PlanModel::Normal { sd: 1.0 }, 1.0, 8);
    r.means = vec![0.0, 0.0, 0.5];
    r.studies = 3000;
    r.relabellings = 499;
    let p = plan::power_at(&r, 50, &mut |_| true).unwrap();
    check(&p, f(&e["power"]), 0.015, "k groups at n = 50");
}

/// Yes/no, 14% against 30% with 60 per group: the exact power of the two-sided test (summed
/// over every 2×2 table, scipy) is 0.478; the simulation must match it with no allowance, and
/// stay below the normal approximation's 0.575 (statsmodels NormalIndPower), which ignores
/// that the exact test is conservative.
#[test]
fn yes_no_power_matches_the_exact_sum_over_tables() {
    let e = &expected()["yes_no"];
    let mut r = PlanRequest::new(
        PlanDesign::YesNo,
        PlanModel::Rates {
            baseline: f(&e["baseline"]),
        },
        f(&e["rate"]) - f(&e["baseline"]),
        9,
    );
    r.studies = 5000;
    let p = plan::power_at(&r, 60, &mut |_| true).unwrap();
    check(&p, f(&e["exact_power"]), 0.0, "yes/no at n = 60");
    assert!(p.power < f(&e["normal_power"]) - 0.05);
}

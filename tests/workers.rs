//! Several workers, same numbers: a run shared among 1, 2, 3 or 4 workers that cannot wait
//! for each other (the page's web workers), by the replay protocol of
//! `reshuffle::resample::share`, gives exactly the report of one run on its own. The
//! workers are simulated here in one process: each round every worker runs the job from the
//! start with the blocks known so far, computes its share of the next round and pauses;
//! the shares are handed to all, until a run finishes. The expected value is the plain run
//! itself; the check is exact equality of the JSON.

use std::collections::HashMap;

use reshuffle::designs::estimate::{Estimate, EstimateLayout, EstimateRequest};
use reshuffle::designs::k_groups::KGroupsRequest;
use reshuffle::designs::plan::{PlanDesign, PlanModel, PlanRequest};
use reshuffle::designs::two_groups::TwoGroupsRequest;
use reshuffle::input::columns::Layout;
use reshuffle::resample::share::{self, Sharing};
use reshuffle::wire::Job;

fn demo(name: &str) -> String {
    std::fs::read_to_string(format!("{}/demo-data/{name}", env!("CARGO_MANIFEST_DIR"))).unwrap()
}

/// The job shared among `workers`; returns the report and the number of rounds.
fn shared(job: &Job, workers: u64) -> (String, usize) {
    let mut known = HashMap::new();
    let mut states: Vec<Sharing> = (0..workers).map(|w| Sharing::new(w, workers)).collect();
    for round in 1..=200 {
        let mut reports = Vec::new();
        let mut made = Vec::new();
        for state in states.iter_mut() {
            let mut sh = state.clone();
            sh.known = known.clone();
            share::begin(sh);
            let result = job.run(&mut |_| true);
            let sh = share::end().expect("the run was shared");
            match (result, sh.paused) {
                (Ok(report), None) => reports.push(serde_json::to_string(&report).unwrap()),
                (Err(_), Some(_)) => made.extend(sh.made.iter().cloned()),
                (r, p) => panic!("round {round}: {:?} with pause {p:?}", r.err()),
            }
            *state = sh;
        }
        if !reports.is_empty() {
            // Every worker finishes in the same round, with the same report.
            assert_eq!(reports.len() as u64, workers, "round {round}");
            assert!(reports.windows(2).all(|w| w[0] == w[1]));
            return (reports.swap_remove(0), round);
        }
        assert!(!made.is_empty(), "a paused round computes something");
        known.extend(made);
    }
    panic!("no report after 200 rounds");
}

fn alone(job: &Job) -> String {
    serde_json::to_string(&job.run(&mut |_| true).unwrap()).unwrap()
}

fn check(name: &str, job: Job) {
    let want = alone(&job);
    for workers in [1, 2, 3, 4] {
        let (got, rounds) = shared(&job, workers);
        assert_eq!(got, want, "{name}: {workers} workers");
        assert!(rounds >= 2, "{name}: the run was shared in rounds");
    }
}

#[test]
fn two_groups_with_random_relabellings_and_a_sequential_stop() {
    let mut r = TwoGroupsRequest::new(demo("tomato-irrigation.csv"), 11);
    r.settings.exact_limit = 0;
    r.settings.resamples = 30_000;
    r.settings.bootstrap_resamples = 5_000;
    check("two groups", Job::TwoGroups(r.clone()));
    r.settings.stop_after = Some(15);
    check("two groups, stop after 15", Job::TwoGroups(r.clone()));
    r.settings.stop_after = None;
    r.settings.settle_at = Some(0.05);
    check("two groups, settled", Job::TwoGroups(r.clone()));
    // The robustness table: four more relabelling runs after the chosen one.
    r.robustness = true;
    check("two groups, settled, robustness table", Job::TwoGroups(r));
}

#[test]
fn large_groups_with_the_streaming_kernels() {
    let mut t = String::from("y,g\n");
    for i in 0..17_000u64 {
        let v = (i * 7919 % 1000) as f64 / 100.0;
        t.push_str(&format!("{v},a\n{},b\n", v + 0.08));
    }
    let mut r = TwoGroupsRequest::new(t, 5);
    r.settings.resamples = 9_000;
    r.settings.bootstrap_resamples = 700;
    r.settings.settle_at = Some(0.05);
    check("large two groups", Job::TwoGroups(r));
}

#[test]
fn k_groups_with_follow_up_comparisons() {
    let mut r = KGroupsRequest::new(demo("adhesive-shear-strength.csv"), Layout::Detect, 3);
    r.settings.exact_limit = 0;
    r.settings.resamples = 9_000;
    r.settings.bootstrap_resamples = 2_000;
    check("k groups", Job::KGroups(r));
}

#[test]
fn an_estimate_and_a_plan() {
    let mut e = EstimateRequest::new(
        demo("tomato-irrigation.csv"),
        EstimateLayout::One {
            value: "yield_kg".into(),
            strata: None,
        },
        Estimate::Median,
        8,
    );
    e.resamples = 20_000;
    check("estimate", Job::Estimate(e));
    let mut p = PlanRequest::new(PlanDesign::TwoGroups, PlanModel::Normal { sd: 1.0 }, 0.8, 9);
    p.studies = 400;
    p.max_n = 60;
    check("plan", Job::Plan(p));
}

//! The page's form against its jobs: for every design, the job the fields describe, put
//! back on a fresh form ([`Fields::restore`]), describes the same job again, bit for bit;
//! and the rules around it (kernel generations, restored designs, bad fields).

use super::*;
use crate::base::{Alternative, Side, TwoSidedRule};
use crate::designs::association::AssocStatistic;
use crate::designs::estimate::Estimate;
use crate::designs::k_groups::KStatistic;
use crate::designs::paired::FlipStatistic;
use crate::designs::stratified::StrataWeights;
use crate::designs::two_groups::Statistic;
use crate::designs::yes_no::YesNoStatistic;
use crate::wire::Job;

const SEED: u64 = 20261205;

/// A form holding `data`, with settings away from the defaults.
fn form(data: &str) -> Fields {
    let mut f = Fields::new();
    f.data = data.to_string();
    f.example.clear();
    f.alternative = Alternative::Greater;
    f.two_sided = TwoSidedRule::DoubledTail;
    f.resamples = "20,000".into();
    f.exact_limit = "5000".into();
    f.stop_after = "15".into();
    f.settle_at = "0.01".into();
    f.bootstrap = "3000".into();
    f.confidence = "90".into();
    f.interval_choice = "percentile".into();
    f
}

/// The job of `f`, put back on a fresh form, gives the same job; the form it gives also
/// holds the same settings as text.
fn round_trip(name: &str, f: &Fields) -> Job {
    let job = f.job(SEED).unwrap_or_else(|e| panic!("{name}: {e}"));
    let mut back = Fields::new();
    back.restore(&job);
    let again = back
        .job(SEED)
        .unwrap_or_else(|e| panic!("{name}, restored: {e}"));
    assert_eq!(again, job, "{name}");
    assert_eq!(back.seed, SEED.to_string(), "{name}: the seed");
    job
}

const LONG: &str = "y,g\n1.5,a\n2.5,b\n3.5,a\n4.5,b\n5.5,c\n";
const WIDE: &str = "before,after\n1,2\n3,5\n4,4\n6,9\n";

#[test]
fn every_comparison_design_round_trips() {
    let mut f = form(LONG);
    f.value_col = "y".into();
    f.group_col = "g".into();
    for st in Statistic::ALL {
        f.statistic = st;
        f.first = "b".into();
        f.second = "c".into();
        round_trip(&format!("two groups, {st:?}"), &f);
    }
    f.robustness = true;
    let job = round_trip("two groups with the robustness table", &f);
    assert!(matches!(job, Job::TwoGroups(ref r) if r.robustness));
    f.robustness = false;
    f.design = "k-groups".into();
    for st in [KStatistic::F, KStatistic::WelchF, KStatistic::MedianSpread] {
        f.k_stat = st;
        f.control = "a".into();
        round_trip("k groups", &f);
    }
    f.design = "stratified".into();
    f.strata_col = "g".into();
    f.weights = StrataWeights::Precision;
    f.first = "a".into();
    f.second = "b".into();
    round_trip("stratified", &f);
    f.design = "yes-no".into();
    f.yn_stat = YesNoStatistic::OddsRatio;
    round_trip("yes/no from the table", &f);
    f.yn_source = "counts".into();
    f.counts_text = "old: 42/300, new: 61/310".into();
    round_trip("yes/no from counts", &f);

    let mut w = form(WIDE);
    w.layout_kind = "wide".into();
    w.col_a = "before".into();
    w.col_b = "after".into();
    w.first = "after".into();
    w.second = "before".into();
    round_trip("two groups, wide", &w);
    w.design = "paired".into();
    for st in FlipStatistic::ALL {
        w.flip_stat = st;
        round_trip("paired", &w);
    }
    w.design = "one-sample".into();
    w.est_value = "after".into();
    w.reference = "2.5".into();
    round_trip("one sample", &w);
    w.design = "association".into();
    w.est_x = "before".into();
    w.est_y = "after".into();
    for st in [
        AssocStatistic::Pearson,
        AssocStatistic::Spearman,
        AssocStatistic::Slope,
        AssocStatistic::Kendall,
    ] {
        w.assoc_stat = st;
        round_trip("association", &w);
    }
    w.design = "k-groups".into();
    w.k_columns = vec!["before".into(), "after".into()];
    round_trip("k groups, wide", &w);
    w.interval_choice = "all".into();
    let job = round_trip("all interval methods", &w);
    let Job::KGroups(r) = job else {
        panic!("a k-group job")
    };
    assert_eq!(r.settings.intervals.len(), 5);
}

#[test]
fn paired_data_in_long_format_round_trip() {
    let mut f = form("plant,time,height\np1,before,3\np1,after,4\np2,before,5\np2,after,7\n");
    f.design = "paired".into();
    f.value_col = "height".into();
    f.group_col = "time".into();
    f.unit_col = "plant".into();
    f.first = "after".into();
    f.second = "before".into();
    round_trip("paired, long", &f);
    f.unit_col.clear();
    assert!(f.job(SEED).unwrap_err().contains("column naming each unit"));
}

#[test]
fn estimates_and_plans_round_trip() {
    let mut f = form(LONG);
    f.mode = "estimate".into();
    f.est_methods = "all".into();
    f.side = Side::Lower;
    for e in [Estimate::Mean, Estimate::Median, Estimate::Quantile] {
        f.est_kind = e;
        f.est_value = "y".into();
        f.est_q = "0.75".into();
        round_trip(&format!("estimate {e:?}"), &f);
    }
    f.est_strata = "g".into();
    round_trip("estimate within strata", &f);
    f.mode = "plan".into();
    f.plan.effect = "0.8".into();
    f.plan.max_n = "300".into();
    f.plan.mde_n = "40".into();
    f.plan.alt = Alternative::Greater;
    round_trip("plan, normal model", &f);
    f.plan.model = "pilot".into();
    f.plan.value = "y".into();
    f.plan.multiply = true;
    f.plan.effect = "1.2".into();
    round_trip("plan, pilot values", &f);
    f.plan.design = "yes-no".into();
    f.plan.baseline = "0.2".into();
    f.plan.rate = "0.3".into();
    round_trip("plan, rates", &f);
    f.plan.design = "k-groups".into();
    f.plan.model = "normal".into();
    f.plan.means = "0, 1, 3".into();
    round_trip("plan, k groups", &f);
}

/// A job of kernel generation 1 (a link made before generation 2) keeps its generation
/// while the data box holds its data, and new data get the newest generation.
#[test]
fn an_older_job_keeps_its_kernels_while_its_data_stay() {
    let mut f = form(LONG);
    f.value_col = "y".into();
    f.group_col = "g".into();
    let Job::TwoGroups(mut r) = f.job(SEED).unwrap() else {
        panic!("a two-group job")
    };
    r.settings.kernels = 1;
    let mut back = Fields::new();
    back.restore(&Job::TwoGroups(r.clone()));
    assert_eq!(back.job(SEED).unwrap(), Job::TwoGroups(r));
    back.data.push_str("6.5,a\n");
    let Job::TwoGroups(now) = back.job(SEED).unwrap() else {
        panic!("a two-group job")
    };
    assert_eq!(now.settings.kernels, crate::designs::KERNELS);
}

/// Restoring marks the shape so that the table's suggestion does not replace the job's
/// design, sets both "set by hand" marks, and resolves a detected layout at once.
#[test]
fn restoring_keeps_the_design_and_resolves_a_detected_layout() {
    let job = Job::TwoGroups(crate::designs::two_groups::TwoGroupsRequest::new(
        LONG.into(),
        3,
    ));
    let mut f = Fields::new();
    f.restore(&job);
    assert_eq!(f.shape_seen, RESTORED_SHAPE);
    assert!(f.stop_set && f.boot_set);
    assert_eq!((f.value_col.as_str(), f.group_col.as_str()), ("y", "g"));
}

/// Fields that do not read say which field and what was typed.
#[test]
fn bad_fields_are_named() {
    let mut f = form(LONG);
    f.resamples = "lots".into();
    assert_eq!(
        f.job(SEED).unwrap_err(),
        "Random relabellings: \"lots\" is not a whole number."
    );
    let mut f = form(LONG);
    f.confidence = "ninety".into();
    assert!(f
        .job(SEED)
        .unwrap_err()
        .starts_with("Confidence level: \"ninety\""));
    let mut f = form(LONG);
    f.design = "stratified".into();
    f.value_col = "y".into();
    f.group_col = "g".into();
    assert!(f.job(SEED).unwrap_err().contains("stratum"));
}

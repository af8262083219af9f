//! The Kolmogorov–Smirnov distance of two groups against scipy (values in
//! tests/reference/expected_ks.json from make_reference_ks.py; numpy 2.4.6, scipy 1.17.1):
//! the distance as scipy.stats.ks_2samp's statistic; the exact permutation p-value by
//! scipy.stats.permutation_test over every split on R's sleep data (ties) and PlantGrowth
//! ctrl against trt2 (no ties, where scipy.stats.ks_2samp's exact test agrees too); and the
//! percentile and BCa bounds against scipy.stats.bootstrap's over 30 seeds.

use reshuffle::base::*;
use reshuffle::designs::two_groups::{run, Statistic, TwoGroupsReport, TwoGroupsRequest};
use serde_json::Value;

mod common;
use common::close;

fn expected() -> Value {
    common::reference("expected_ks.json")
}

fn analyse(c: &Value, f: impl Fn(&mut TwoGroupsRequest)) -> TwoGroupsReport {
    let mut r = common::two_groups(c, Statistic::KsDistance, 23);
    f(&mut r);
    run(&r, &mut |_| true).expect("runs")
}

#[test]
fn exact_distance_p_values_equal_scipy() {
    let e = expected();
    for (name, c) in e["cases"].as_object().unwrap() {
        let r = analyse(c, |_| {});
        assert!(r.test.exact, "{name}");
        close(
            r.test.observed,
            c["distance"].as_f64().unwrap(),
            1e-12,
            name,
        );
        close(r.effect, c["distance"].as_f64().unwrap(), 1e-12, name);
        let want = c["permutation"].as_f64().unwrap();
        close(r.test.p_value, want, 1e-12, &format!("{name}: permutation"));
        if let Some(x) = c["exact_ks_2samp"].as_f64() {
            close(r.test.p_value, x, 1e-12, &format!("{name}: ks_2samp exact"));
        }
        // Random relabellings estimate it within four standard errors.
        let mc = analyse(c, |r| {
            r.settings.exact_limit = 0;
            r.settings.resamples = 100_000;
        });
        let se = (want * (1.0 - want) / 100_000.0f64).sqrt();
        close(mc.test.p_value, want, 4.0 * se, &format!("{name}: random"));
    }
}

/// Percentile and BCa bounds within 4.5 Monte Carlo SDs of scipy's mean bounds over 30
/// seeds, plus one step of the distance (1/10 here: the bounds sit on its few values, where
/// two quantile conventions may pick neighbouring ones).
#[test]
fn distance_intervals_agree_with_scipy_bootstrap() {
    let e = expected();
    for (name, c) in e["cases"].as_object().unwrap() {
        let r = analyse(c, |r| {
            r.settings.intervals = vec![IntervalMethod::Bca, IntervalMethod::Percentile];
        });
        common::bounds_agree(name, c, &r.intervals, 0.1);
    }
}

/// A one-sided question is refused with the reason (the distance has no sign).
#[test]
fn one_sided_distance_is_refused() {
    let e = expected();
    let c = &e["cases"]["sleep"];
    let mut r = TwoGroupsRequest::new(common::data(c["file"].as_str().unwrap()), 1);
    r.statistic = Statistic::KsDistance;
    r.settings.alternative = Alternative::Less;
    let err = run(&r, &mut |_| true).unwrap_err();
    assert!(err.message.contains("has no direction"), "{}", err.message);
}

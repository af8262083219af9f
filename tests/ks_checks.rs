//! The Kolmogorov–Smirnov distance of two groups against scipy (values in
//! tests/reference/expected_ks.json from make_reference_ks.py; numpy 2.4.6, scipy 1.17.1):
//! the distance as scipy.stats.ks_2samp's statistic; the exact permutation p-value by
//! scipy.stats.permutation_test over every split on R's sleep data (ties) and PlantGrowth
//! ctrl against trt2 (no ties, where scipy.stats.ks_2samp's exact test agrees too); and the
//! percentile and BCa bounds against scipy.stats.bootstrap's over 30 seeds.

use reshuffle::base::*;
use reshuffle::designs::two_groups::{run, Statistic, TwoGroupsReport, TwoGroupsRequest};
use reshuffle::input::columns::Layout;
use serde_json::Value;

fn expected() -> Value {
    let p = concat!(
        env!("CARGO_MANIFEST_DIR"),
        "/tests/reference/expected_ks.json"
    );
    serde_json::from_str(&std::fs::read_to_string(p).unwrap()).unwrap()
}

fn analyse(c: &Value, f: impl Fn(&mut TwoGroupsRequest)) -> TwoGroupsReport {
    let file = c["file"].as_str().unwrap();
    let p = format!("{}/tests/reference/data/{file}", env!("CARGO_MANIFEST_DIR"));
    let mut r = TwoGroupsRequest::new(std::fs::read_to_string(p).unwrap(), 23);
    r.layout = Layout::Long {
        value: c["value"].as_str().unwrap().into(),
        group: c["group"].as_str().unwrap().into(),
    };
    r.first = Some(c["first"].as_str().unwrap().into());
    r.second = Some(c["second"].as_str().unwrap().into());
    r.statistic = Statistic::KsDistance;
    f(&mut r);
    run(&r, &mut |_| true).expect("runs")
}

fn close(got: f64, want: f64, tol: f64, what: &str) {
    assert!((got - want).abs() <= tol, "{what}: {got} vs {want}");
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
        for iv in &r.intervals {
            let key = if iv.method == Method::Bca {
                "BCa"
            } else {
                "percentile"
            };
            for (end, got) in [("low", iv.low.unwrap()), ("high", iv.high.unwrap())] {
                let mean = c[format!("{key}_{end}_mean")].as_f64().unwrap();
                let sd = c[format!("{key}_{end}_sd")].as_f64().unwrap();
                close(got, mean, 4.5 * sd + 0.1, &format!("{name} {key} {end}"));
            }
        }
    }
}

/// A one-sided question is refused with the reason (the distance has no sign).
#[test]
fn one_sided_distance_is_refused() {
    let e = expected();
    let c = &e["cases"]["sleep"];
    let file = c["file"].as_str().unwrap();
    let p = format!("{}/tests/reference/data/{file}", env!("CARGO_MANIFEST_DIR"));
    let mut r = TwoGroupsRequest::new(std::fs::read_to_string(p).unwrap(), 1);
    r.statistic = Statistic::KsDistance;
    r.settings.alternative = Alternative::Less;
    let err = run(&r, &mut |_| true).unwrap_err();
    assert!(err.message.contains("has no direction"), "{}", err.message);
}

//! Kendall's tau-b as an association statistic against scipy (values in
//! tests/reference/expected_kendall.json from make_reference_kendall.py; numpy 2.4.6,
//! scipy 1.17.1): tau-b as scipy.stats.kendalltau; exact re-pairing p-values by
//! scipy.stats.permutation_test over every pairing on R's mtcars (first 8 rows, ties in mpg)
//! and the first 9 law schools (no ties, where scipy's exact Kendall test agrees too); random
//! pairings against scipy's exact test on all 15 law schools; the normal approximation; and
//! percentile and BCa bounds against scipy.stats.bootstrap's over 30 seeds.

use reshuffle::base::*;
use reshuffle::designs::association::{run, AssocReport, AssocRequest, AssocStatistic};
use serde_json::Value;

mod common;
use common::close;

fn expected() -> Value {
    common::reference("expected_kendall.json")
}

/// The case's x and y as a two-column table, analysed with Kendall's tau-b.
fn analyse(c: &Value, f: impl Fn(&mut AssocRequest)) -> AssocReport {
    let xs = c["x"].as_array().unwrap();
    let ys = c["y"].as_array().unwrap();
    let mut t = String::from("x,y\n");
    for (x, y) in xs.iter().zip(ys) {
        t.push_str(&format!(
            "{},{}\n",
            x.as_f64().unwrap(),
            y.as_f64().unwrap()
        ));
    }
    let mut r = AssocRequest::new(t, "x".into(), "y".into(), 20261206);
    r.statistic = AssocStatistic::Kendall;
    f(&mut r);
    run(&r, &mut |_| true).unwrap()
}

/// Exact p-values equal scipy's enumeration of every pairing for each alternative (the
/// two-sided one by the doubled rule, scipy's), and scipy's exact test where there are no
/// ties; tau-b and the normal approximation equal scipy.stats.kendalltau's.
#[test]
fn exact_kendall_p_values_equal_scipy() {
    let e = expected();
    for (name, c) in e["cases"].as_object().unwrap() {
        for (alt, key) in [
            (Alternative::Greater, "greater"),
            (Alternative::Less, "less"),
            (Alternative::TwoSided, "two-sided"),
        ] {
            let r = analyse(c, |r| {
                r.settings.alternative = alt;
                r.settings.two_sided = TwoSidedRule::DoubledTail;
            });
            close(r.test.observed, c["tau"].as_f64().unwrap(), 1e-12, name);
            let asym = c[format!("asymptotic_{key}")].as_f64().unwrap();
            close(
                r.t_p_value.unwrap(),
                asym,
                1e-9,
                &format!("{name} {key}: normal"),
            );
            if let Some(want) = c[format!("permutation_{key}")].as_f64() {
                assert!(r.test.exact, "{name}");
                close(r.test.p_value, want, 1e-12, &format!("{name} {key}"));
                if let Some(x) = c[format!("exact_{key}")].as_f64() {
                    close(
                        r.test.p_value,
                        x,
                        1e-9,
                        &format!("{name} {key}: kendalltau exact"),
                    );
                }
            } else {
                // 15! pairings: random ones, within four standard errors of the exact test.
                assert!(!r.test.exact);
                let want = c[format!("exact_{key}")].as_f64().unwrap();
                let se = (want * (1.0 - want) / r.test.resamples as f64).sqrt();
                close(
                    r.test.p_value,
                    want,
                    4.0 * se + 1e-5,
                    &format!("{name} {key}: random"),
                );
            }
        }
    }
}

/// Percentile and BCa bounds of tau-b fall within 4.5 Monte Carlo standard deviations (plus
/// 0.02) of scipy.stats.bootstrap's mean bounds over 30 seeds, with 10,000 resamples.
#[test]
fn kendall_intervals_agree_with_scipy_bootstrap() {
    let e = expected();
    for (name, c) in e["cases"].as_object().unwrap() {
        for (method, key) in [
            (IntervalMethod::Percentile, "percentile"),
            (IntervalMethod::Bca, "BCa"),
        ] {
            let r = analyse(c, |r| {
                r.settings.intervals = vec![method];
                r.settings.exact_limit = 1;
                r.settings.resamples = 1000;
            });
            for (end, got) in [("low", r.ci.low), ("high", r.ci.high)] {
                let mean = c[format!("{key}_{end}_mean")].as_f64().unwrap();
                let sd = c[format!("{key}_{end}_sd")].as_f64().unwrap();
                close(
                    got.unwrap(),
                    mean,
                    4.5 * sd + 0.02,
                    &format!("{name} {key} {end}"),
                );
            }
        }
    }
}

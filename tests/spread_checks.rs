//! The log ratios of two groups' SDs and of their median absolute deviations against scipy
//! (values in tests/reference/expected_spread.json from make_reference_spread.py; numpy
//! 2.4.6, scipy 1.17.1, MADs by scipy.stats.median_abs_deviation): the statistic; the exact permutation p-values over every split of the
//! groups aligned at their medians by scipy.stats.permutation_test, for each alternative, on
//! R's sleep data (ties) and PlantGrowth ctrl against trt2; and the percentile and BCa bounds
//! against scipy.stats.bootstrap's over 30 seeds.

use reshuffle::base::*;
use reshuffle::designs::two_groups::{run, Statistic, TwoGroupsReport, TwoGroupsRequest};
use serde_json::Value;

mod common;
use common::close;

fn expected() -> Value {
    common::reference("expected_spread.json")
}

fn analyse(c: &Value, f: impl Fn(&mut TwoGroupsRequest)) -> TwoGroupsReport {
    let mut r = common::two_groups(
        c,
        Statistic::from_key(c["statistic"].as_str().unwrap()).unwrap(),
        29,
    );
    f(&mut r);
    run(&r, &mut |_| true).expect("runs")
}

/// Exact p-values over the aligned groups equal scipy's (two-sided by the doubled rule,
/// scipy's); random relabellings agree within four standard errors.
#[test]
fn exact_spread_p_values_equal_scipy() {
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
            assert!(r.test.exact);
            close(
                r.test.observed,
                c["observed"].as_f64().unwrap(),
                1e-12,
                name,
            );
            let want = c[format!("permutation_{key}")].as_f64().unwrap();
            close(r.test.p_value, want, 1e-12, &format!("{name} {key}"));
        }
        let want = c["permutation_two-sided"].as_f64().unwrap();
        let mc = analyse(c, |r| {
            r.settings.two_sided = TwoSidedRule::DoubledTail;
            r.settings.exact_limit = 0;
            r.settings.resamples = 100_000;
        });
        let se = 2.0 * (want / 2.0 * (1.0 - want / 2.0) / 100_000.0f64).sqrt();
        close(mc.test.p_value, want, 4.0 * se, &format!("{name}: random"));
    }
}

/// Percentile and BCa bounds of the SD ratio within 4.5 Monte Carlo SDs (plus 0.01) of
/// scipy's mean bounds (the script leaves the MAD ratio's out: see its notes).
#[test]
fn spread_intervals_agree_with_scipy_bootstrap() {
    let e = expected();
    for (name, c) in e["cases"].as_object().unwrap() {
        if c["BCa_low_mean"].is_null() {
            continue;
        }
        let r = analyse(c, |r| {
            r.settings.intervals = vec![IntervalMethod::Bca, IntervalMethod::Percentile];
        });
        common::bounds_agree(name, c, &r.intervals, 0.01);
    }
}

/// The robustness table (statistics of location) is refused with a statistic of spread.
#[test]
fn robustness_is_refused_for_spread() {
    let e = expected();
    let c = &e["cases"]["sleep log-sd-ratio"];
    let mut r = TwoGroupsRequest::new(common::data(c["file"].as_str().unwrap()), 1);
    r.statistic = Statistic::LogSdRatio;
    r.robustness = true;
    let err = run(&r, &mut |_| true).unwrap_err();
    assert!(
        err.message.contains("statistics of location"),
        "{}",
        err.message
    );
}

/// Relabellings whose groups have no spread give infinite log ratios; a report that keeps
/// them (as the page asks, for its CSV download) and an infinite effect survive the JSON the
/// worker sends to the page. (Found in the page: such a report could not be read.)
#[test]
fn infinite_ratios_survive_the_worker_message() {
    use reshuffle::wire::{Report, WorkerMessage};
    let mut r = TwoGroupsRequest::new("g,y\na,1\na,1\na,1\na,2\nb,1\nb,3\nb,4\nb,6\n".into(), 3);
    r.statistic = Statistic::LogMadRatio;
    r.settings.keep_resamples = true;
    r.settings.bootstrap_resamples = 500;
    let rep = run(&r, &mut |_| true).unwrap();
    assert_eq!(rep.effect, f64::NEG_INFINITY, "group a has a MAD of 0");
    let kept = rep.null_values.as_ref().unwrap();
    assert!(kept.iter().any(|v| v.is_infinite()));
    let msg = WorkerMessage::Done {
        report: Box::new(Report::TwoGroups(rep.clone())),
    };
    let text = serde_json::to_string(&msg).unwrap();
    match serde_json::from_str::<WorkerMessage>(&text).expect("the page can read it") {
        WorkerMessage::Done { report } => match *report {
            Report::TwoGroups(back) => {
                assert_eq!(back.null_values, rep.null_values);
                assert_eq!(back.effect, rep.effect);
            }
            _ => panic!("another design"),
        },
        _ => panic!("another message"),
    }
}

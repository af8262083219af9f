//! The rank-sum statistic of two groups against scipy (values in
//! tests/reference/expected_ranks.json from make_reference_ranks.py; numpy 2.4.6, scipy
//! 1.17.1): the exact permutation p-values by scipy.stats.permutation_test over every split,
//! on R's sleep data (ties) and PlantGrowth ctrl against trt2 (no ties, where they also equal
//! scipy.stats.mannwhitneyu's exact test); the normal approximation of
//! scipy.stats.mannwhitneyu; the probability of superiority; and its percentile and BCa
//! bounds against scipy.stats.bootstrap's over 30 seeds.

use reshuffle::base::{Alternative, IntervalMethod, Note, TwoSidedRule};
use reshuffle::designs::two_groups::{run, Statistic, TwoGroupsReport};
use serde_json::Value;

mod common;
use common::close;

fn expected() -> Value {
    common::reference("expected_ranks.json")
}

fn analyse(
    c: &Value,
    alternative: Alternative,
    rule: TwoSidedRule,
    exact: bool,
) -> TwoGroupsReport {
    let mut r = common::two_groups(c, Statistic::RankSum, 17);
    r.settings.alternative = alternative;
    r.settings.two_sided = rule;
    r.settings.intervals = vec![IntervalMethod::Bca, IntervalMethod::Percentile];
    if !exact {
        r.settings.exact_limit = 0;
        r.settings.resamples = 100_000;
    }
    run(&r, &mut |_| true).expect("runs")
}

/// Exact p-values equal scipy's enumeration (and its exact rank-sum test without ties), for
/// every alternative; the absolute two-sided rule equals the doubled one here, the null of
/// the rank statistic being symmetric.
#[test]
fn exact_rank_sum_p_values_equal_scipy() {
    let e = expected();
    for (name, c) in e["cases"].as_object().unwrap() {
        for (alt, key) in [
            (Alternative::TwoSided, "two-sided"),
            (Alternative::Greater, "greater"),
            (Alternative::Less, "less"),
        ] {
            for rule in [TwoSidedRule::DoubledTail, TwoSidedRule::Absolute] {
                let r = analyse(c, alt, rule, true);
                assert!(r.test.exact, "{name}: enumerated");
                let want = c[format!("permutation_{key}")].as_f64().unwrap();
                close(
                    r.test.p_value,
                    want,
                    1e-12,
                    &format!("{name} {key} {rule:?}"),
                );
                if let Some(x) = c.get(format!("exact_{key}")).and_then(Value::as_f64) {
                    close(
                        r.test.p_value,
                        x,
                        1e-12,
                        &format!("{name} {key}: mannwhitneyu exact"),
                    );
                }
                close(
                    r.test.observed,
                    c["observed"].as_f64().unwrap(),
                    1e-12,
                    name,
                );
            }
        }
    }
}

/// The normal approximation, U, the probability of superiority and Cliff's delta equal
/// scipy's; ties are noted exactly where the data have them.
#[test]
fn cross_check_and_effect_sizes_equal_scipy() {
    let e = expected();
    for (name, c) in e["cases"].as_object().unwrap() {
        for (alt, key) in [
            (Alternative::TwoSided, "two-sided"),
            (Alternative::Greater, "greater"),
            (Alternative::Less, "less"),
        ] {
            let r = analyse(c, alt, TwoSidedRule::Absolute, true);
            let rs = r.rank_sum.as_ref().expect("the rank-sum cross-check");
            let want = c[format!("asymptotic_{key}")].as_f64().unwrap();
            close(rs.p_value, want, 1e-9, &format!("{name} {key}: asymptotic"));
            close(rs.u, c["u"].as_f64().unwrap(), 1e-9, &format!("{name}: U"));
        }
        let r = analyse(c, Alternative::TwoSided, TwoSidedRule::Absolute, true);
        let s = c["superiority"].as_f64().unwrap();
        close(r.effect, s, 1e-12, &format!("{name}: superiority"));
        let cd = r.cliffs_delta.as_ref().unwrap();
        close(
            cd.estimate.unwrap(),
            2.0 * s - 1.0,
            1e-12,
            &format!("{name}: Cliff's delta"),
        );
        close(
            cd.ci.low.unwrap(),
            2.0 * r.ci.low.unwrap() - 1.0,
            1e-12,
            name,
        );
        let tied = r.notes.iter().any(|n| matches!(n, Note::TiedRanks { .. }));
        assert_eq!(tied, c["ties"].as_bool().unwrap(), "{name}: ties noted");
    }
}

/// Percentile and BCa bounds of the probability of superiority fall within 4.5 Monte Carlo
/// standard deviations (plus one resample's step, 1/(n1 n2)) of scipy.stats.bootstrap's mean
/// bounds over 30 seeds, with the same 10,000 resamples.
#[test]
fn superiority_intervals_agree_with_scipy_bootstrap() {
    let e = expected();
    for (name, c) in e["cases"].as_object().unwrap() {
        let r = analyse(c, Alternative::TwoSided, TwoSidedRule::Absolute, true);
        common::bounds_agree(name, c, &r.intervals, 0.01);
    }
}

/// Random relabellings of the rank statistic estimate the exact p-value within their
/// Monte Carlo error (four standard errors of 100,000 relabellings).
#[test]
fn random_relabellings_agree_with_the_exact_p_value() {
    let e = expected();
    for (name, c) in e["cases"].as_object().unwrap() {
        let r = analyse(c, Alternative::TwoSided, TwoSidedRule::Absolute, false);
        assert!(!r.test.exact);
        let want = c["permutation_two-sided"].as_f64().unwrap();
        let se = (want * (1.0 - want) / 100_000.0f64).sqrt();
        close(r.test.p_value, want, 4.0 * se, &format!("{name}: random"));
    }
}

/// Value stability: the bootstrap bounds of the probability of superiority for the sleep
/// data with seed 17 and 10,000 resamples are pinned (BCa, then percentile), so that a
/// change of the resampling fails here (they come from this engine, not from outside).
#[test]
fn the_sleep_intervals_are_pinned() {
    let e = expected();
    let r = analyse(
        &e["cases"]["sleep"],
        Alternative::TwoSided,
        TwoSidedRule::Absolute,
        true,
    );
    let ends: Vec<(f64, f64)> = r
        .intervals
        .iter()
        .map(|iv| (iv.low.unwrap(), iv.high.unwrap()))
        .collect();
    assert_eq!(ends, vec![(0.08, 0.55), (0.06, 0.5)]);
}

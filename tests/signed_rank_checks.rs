//! The signed-rank statistic of paired differences and of one sample against a reference,
//! against scipy (values in tests/reference/expected_signed.json from
//! make_reference_signed.py; numpy 2.4.6, scipy 1.17.1): exact sign-flip p-values by
//! scipy.stats.permutation_test over every sign pattern, on R's sleep data (ties and a zero
//! difference), aircondit − 100 (a zero) and aircondit − 90 (neither, where they also equal
//! scipy.stats.wilcoxon's exact test); the rank-biserial correlation; and its percentile and
//! BCa bounds against scipy.stats.bootstrap's over 30 seeds.

use reshuffle::base::*;
use reshuffle::designs::one_sample::{self, OneSampleRequest};
use reshuffle::designs::paired::{
    self, FlipStatistic, PairedLayout, PairedRequest, SignFlipReport,
};
use serde_json::Value;

mod common;
use common::{close, data};

fn expected() -> Value {
    common::reference("expected_signed.json")
}

/// The case's analysis with the signed-rank statistic (exact, or random patterns).
fn analyse(name: &str, alt: Alternative, rule: TwoSidedRule, exact: bool) -> SignFlipReport {
    let mut set = paired::sign_flip_settings(20261205);
    set.alternative = alt;
    set.two_sided = rule;
    if !exact {
        set.exact_limit = 0;
        set.resamples = 100_000;
    }
    run_case(name, set)
}

/// Exact p-values equal scipy's enumeration for every alternative (the two-sided one by
/// both rules: the null of the signed ranks is symmetric, so they agree), and scipy's exact
/// signed-rank test where there are neither ties nor zeros.
#[test]
fn exact_signed_rank_p_values_equal_scipy() {
    let e = expected();
    for (name, c) in e["cases"].as_object().unwrap() {
        for (alt, rule, key) in [
            (Alternative::Greater, TwoSidedRule::Absolute, "greater"),
            (Alternative::Less, TwoSidedRule::Absolute, "less"),
            (Alternative::TwoSided, TwoSidedRule::Absolute, "two-sided"),
            (
                Alternative::TwoSided,
                TwoSidedRule::DoubledTail,
                "two-sided",
            ),
        ] {
            let r = analyse(name, alt, rule, true);
            assert!(r.test.exact);
            close(
                r.test.observed,
                c["observed"].as_f64().unwrap(),
                1e-12,
                name,
            );
            let want = c[format!("permutation_{key}")].as_f64().unwrap();
            close(
                r.test.p_value,
                want,
                1e-12,
                &format!("{name} {key} {rule:?}"),
            );
            if let Some(x) = c[format!("exact_{key}")].as_f64() {
                close(
                    r.test.p_value,
                    x,
                    1e-12,
                    &format!("{name} {key}: wilcoxon exact"),
                );
            }
        }
        let r = analyse(name, Alternative::TwoSided, TwoSidedRule::Absolute, true);
        close(
            r.rank_biserial.unwrap(),
            c["rank_biserial"].as_f64().unwrap(),
            1e-12,
            &format!("{name}: rank-biserial"),
        );
    }
}

/// Percentile and BCa bounds of the rank-biserial correlation fall within 4.5 Monte Carlo
/// standard deviations (plus 0.03, about one step of the statistic here) of scipy's mean
/// bounds over 30 seeds; where scipy gives no BCa interval (every resample the same), neither
/// does this engine.
#[test]
fn rank_biserial_intervals_agree_with_scipy_bootstrap() {
    let e = expected();
    for (name, c) in e["cases"].as_object().unwrap() {
        for (method, key) in [
            (IntervalMethod::Percentile, "percentile"),
            (IntervalMethod::Bca, "BCa"),
        ] {
            let mut set = paired::sign_flip_settings(20261205);
            set.intervals = vec![method];
            let r = run_case(name, set);
            for (end, got) in [("low", r.ci.low), ("high", r.ci.high)] {
                match c[format!("{key}_{end}_mean")].as_f64() {
                    Some(mean) => {
                        let sd = c[format!("{key}_{end}_sd")].as_f64().unwrap();
                        close(
                            got.unwrap(),
                            mean,
                            4.5 * sd + 0.03,
                            &format!("{name} {key} {end}"),
                        );
                    }
                    None => assert!(got.is_none(), "{name} {key} {end}: scipy has none"),
                }
            }
        }
    }
}

/// Runs a case (sleep pairs, or aircondit against 100 or 90) with these settings.
fn run_case(name: &str, set: reshuffle::designs::TestSettings) -> SignFlipReport {
    if name.starts_with("sleep") {
        let mut r = PairedRequest::new(
            data("sleep-paired.csv"),
            PairedLayout::Columns {
                first: "drug2".into(),
                second: "drug1".into(),
            },
            1,
        );
        r.statistic = FlipStatistic::SignedRank;
        r.settings = set;
        paired::run(&r, &mut |_| true).unwrap()
    } else {
        let reference = if name.ends_with("100") { 100.0 } else { 90.0 };
        let mut r = OneSampleRequest::new(data("aircondit.csv"), "hours".into(), reference, 1);
        r.statistic = FlipStatistic::SignedRank;
        r.settings = set;
        one_sample::run(&r, &mut |_| true).unwrap()
    }
}

/// Random sign patterns estimate the exact p-value within four Monte Carlo standard errors.
#[test]
fn random_sign_patterns_agree_with_the_exact_p_value() {
    let e = expected();
    for (name, c) in e["cases"].as_object().unwrap() {
        let r = analyse(name, Alternative::TwoSided, TwoSidedRule::Absolute, false);
        assert!(!r.test.exact);
        let want = c["permutation_two-sided"].as_f64().unwrap();
        let se = (want * (1.0 - want) / 100_000.0f64).sqrt();
        close(
            r.test.p_value,
            want,
            4.0 * se + 1e-5,
            &format!("{name}: random"),
        );
    }
}

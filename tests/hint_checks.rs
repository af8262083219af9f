//! Hints from the data of two groups: which rule fires on which data, with the numbers the
//! rules read checked against general-purpose libraries (scipy.stats.skew with bias=False and
//! numpy.percentile, scipy 1.17.1 and numpy 2.4.6, computed for these lists); hints never
//! change the analysis.

use reshuffle::designs::hints::Hint;
use reshuffle::designs::two_groups::{run, Statistic, TwoGroupsRequest};
use reshuffle::input::columns::Layout;

/// Two columns of ten rows: one large value in each, measured on the same units.
const SKEWED_PAIRS: &str = "before,after\n12.1,13.0\n15.3,16.2\n11.0,11.9\n19.8,21.0\n14.2,14.8\n\
13.3,14.1\n16.0,17.2\n12.9,13.5\n55.0,58.0\n14.8,15.9\n";

fn hints(data: &str, st: Statistic) -> Vec<Hint> {
    let mut r = TwoGroupsRequest::new(data.into(), 3);
    r.statistic = st;
    r.settings.bootstrap_resamples = 500;
    run(&r, &mut |_| true).unwrap().hints
}

#[test]
fn skew_far_out_values_and_pairing_are_seen() {
    let h = hints(SKEWED_PAIRS, Statistic::MeanDifference);
    // scipy.stats.skew(before, bias=False) = 2.966788735552614 (scipy 1.17.1).
    let skews: Vec<f64> = h
        .iter()
        .filter_map(|x| match x {
            Hint::Skewed { skewness, .. } => Some(*skewness),
            _ => None,
        })
        .collect();
    assert_eq!(skews.len(), 2);
    assert!((skews[0] - 2.966_788_735_552_614).abs() < 1e-9, "{skews:?}");
    // numpy.percentile(before, [25, 75]) = [13.0, 15.825]: fences 4.525 and 24.3.
    assert!(h.iter().any(|x| matches!(x, Hint::FarOut { group, count: 1, low_fence, high_fence }
        if group == "before" && (low_fence - 4.525).abs() < 1e-9 && (high_fence - 24.3).abs() < 1e-9)));
    assert!(h
        .iter()
        .any(|x| matches!(x, Hint::LooksPaired { r, rows: 10 } if *r > 0.99)));
    // A median difference is not moved by the tail: no skew or fence hints, still paired.
    let h = hints(SKEWED_PAIRS, Statistic::MedianDifference);
    assert_eq!(h.len(), 1, "{h:?}");
}

#[test]
fn few_distinct_values_and_long_tables() {
    let data = "g,y\na,1\na,2\na,2\na,3\nb,2\nb,3\nb,3\nb,4\nb,3\na,1\n";
    let h = hints(data, Statistic::MeanDifference);
    assert!(h.contains(&Hint::FewDistinct {
        distinct: 4,
        values: 10
    }));
    // No fences where the quartiles coincide, and a long table is never read as paired.
    assert!(h
        .iter()
        .all(|x| !matches!(x, Hint::FarOut { .. } | Hint::LooksPaired { .. })));
    let mut r = TwoGroupsRequest::new(SKEWED_PAIRS.into(), 3);
    r.layout = Layout::Wide {
        columns: vec!["before".into(), "after".into()],
    };
    r.settings.bootstrap_resamples = 500;
    let with = run(&r, &mut |_| true).unwrap();
    assert!(!with.hints.is_empty());
    // The demo data of two groups draw no hint.
    let demo = std::fs::read_to_string(concat!(
        env!("CARGO_MANIFEST_DIR"),
        "/demo-data/tomato-irrigation.csv"
    ))
    .unwrap();
    assert!(hints(&demo, Statistic::MeanDifference).is_empty());
}

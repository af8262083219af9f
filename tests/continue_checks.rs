//! Continuing a run: more relabellings or resamples are the next draws of the same seed, so
//! a run of the larger total begins with exactly the earlier run's relabellings and bootstrap
//! resamples (kept values compared one by one), for the streams of every block size.

use reshuffle::designs::two_groups::{run, Statistic, TwoGroupsRequest};

fn demo() -> String {
    std::fs::read_to_string(concat!(
        env!("CARGO_MANIFEST_DIR"),
        "/demo-data/tomato-irrigation.csv"
    ))
    .unwrap()
}

#[test]
fn a_longer_run_begins_with_the_shorter_one() {
    for (st, resamples) in [
        (Statistic::MeanDifference, 10_000),
        (Statistic::MedianDifference, 5_000),
        (Statistic::RankSum, 4_096 + 17),
    ] {
        let mut r = TwoGroupsRequest::new(demo(), 77);
        r.statistic = st;
        r.settings.exact_limit = 0;
        r.settings.resamples = resamples;
        r.settings.bootstrap_resamples = 1_000;
        r.settings.keep_resamples = true;
        let before = run(&r, &mut |_| true).unwrap();
        r.settings.continue_with(resamples + 3, 777).unwrap();
        let after = run(&r, &mut |_| true).unwrap();
        let (n1, n2) = (before.null_values.unwrap(), after.null_values.unwrap());
        assert_eq!(n2.len(), 2 * resamples as usize + 3);
        assert_eq!(&n2[..n1.len()], &n1[..], "{st:?}: the relabellings kept");
        let (b1, b2) = (
            before.bootstrap_values.unwrap(),
            after.bootstrap_values.unwrap(),
        );
        assert_eq!(b2.len(), 1_777);
        assert_eq!(&b2[..b1.len()], &b1[..], "{st:?}: the resamples kept");
        // The counts only grow.
        assert!(after.test.extreme_count >= before.test.extreme_count);
    }
    let mut s = reshuffle::designs::TestSettings::new(1);
    assert!(s.continue_with(u64::MAX, 0).is_err());
}

//! The streaming kernels for large samples (kernel generation 2): relabellings and bootstrap
//! resamples of two groups of 20,000 values each, checked against outside values and
//! textbook results, and their numbers pinned for both kernel generations.

use reshuffle::base::Note;
use reshuffle::designs::two_groups::{run, Statistic, TwoGroupsReport, TwoGroupsRequest};
use reshuffle::num::normal::quantile;

/// Group sizes: 40,000 pooled values, beyond the 32,768 from which generation 2 streams.
const N: usize = 20_000;

/// a_i = 10 + 2 z_i and b_i = 9.955 + 2.2 z_i with z_i the normal quantile at (i + 0.5)/N:
/// the same numbers tests/large.rs's references were computed from in Python
/// (scipy.stats.norm.ppf).
fn groups() -> (Vec<f64>, Vec<f64>) {
    let z: Vec<f64> = (0..N)
        .map(|i| quantile((i as f64 + 0.5) / N as f64))
        .collect();
    (
        z.iter().map(|z| 10.0 + 2.0 * z).collect(),
        z.iter().map(|z| 9.955 + 2.2 * z).collect(),
    )
}

fn table(a: &[f64], b: &[f64]) -> String {
    let mut t = String::from("y,g\n");
    for v in a {
        t.push_str(&format!("{v},a\n"));
    }
    for v in b {
        t.push_str(&format!("{v},b\n"));
    }
    t
}

fn request(kernels: u32, resamples: u64, bootstrap: u64) -> TwoGroupsRequest {
    let (a, b) = groups();
    let mut r = TwoGroupsRequest::new(table(&a, &b), 20261205);
    r.settings.kernels = kernels;
    r.settings.resamples = resamples;
    r.settings.bootstrap_resamples = bootstrap;
    r.settings.keep_resamples = true;
    r
}

fn analyse(r: &TwoGroupsRequest) -> TwoGroupsReport {
    run(r, &mut |_| true).expect("runs")
}

fn mean_var(x: &[f64]) -> (f64, f64) {
    let m = x.iter().sum::<f64>() / x.len() as f64;
    let v = x.iter().map(|v| (v - m) * (v - m)).sum::<f64>() / (x.len() - 1) as f64;
    (m, v)
}

/// The permutation p-value of the difference in means, from 20,000 streaming relabellings,
/// agrees with the pooled two-sample t-test's p-value, to which it is asymptotically equal
/// (reference: scipy.stats.ttest_ind 1.17.1, equal_var=True, on the same data: p =
/// 0.0323245). Allowed: four Monte Carlo standard errors.
#[test]
fn the_streaming_p_value_agrees_with_the_t_test_of_scipy() {
    let r = analyse(&request(2, 20_000, 200));
    assert!(r.notes.iter().any(|n| matches!(
        n,
        Note::StreamingKernels {
            values: 40_000,
            relabelling: true,
            ..
        }
    )));
    let want = 0.03232452565987739;
    let se = (want * (1.0 - want) / 20_000.0f64).sqrt();
    let p = r.test.p_value;
    assert!(
        (p - want).abs() < 4.0 * se,
        "p = {p}, scipy's t-test {want}"
    );
    assert!((r.effect - 0.045).abs() < 1e-9, "effect {}", r.effect);
}

/// The relabelled differences in means have the permutation distribution's exact moments:
/// mean 0 and variance s²·N/(N − 1)·(1/n1 + 1/n2), s² the pooled values' variance with
/// divisor N (sampling without replacement, Cochran 1977 "Sampling Techniques" theorem 2.2,
/// from memory; 0.000442032 here, computed with numpy 2.4 on the same data). 20,000
/// relabellings estimate the variance within 1% (standard error of a variance estimate
/// √(2/m)): allowed 4.5%.
#[test]
fn streaming_relabellings_have_the_permutation_moments() {
    let r = analyse(&request(2, 20_000, 200));
    let null = r.null_values.expect("kept");
    let (m, v) = mean_var(&null);
    let want = 0.00044203243340565;
    assert!(
        m.abs() < 4.0 * (want / null.len() as f64).sqrt(),
        "mean {m}"
    );
    assert!((v / want - 1.0).abs() < 0.045, "variance {v} vs {want}");
}

/// The bootstrap differences in means have the ideal bootstrap variance, the sum over the
/// groups of Σ(x − x̄)²/n² (Efron and Tibshirani 1993, "An Introduction to the Bootstrap",
/// section 5.2, from memory; 2 · 0.014141668² + ... computed with numpy 2.4 below), within
/// the error of 4,000 resamples (about 2.2%; allowed 9%); the BCa interval of a nearly
/// symmetric effect lies within 10% of its width of Welch's interval (common practice as a
/// sanity check, not an identity).
#[test]
fn streaming_bootstrap_resamples_have_the_ideal_bootstrap_variance() {
    let r = analyse(&request(2, 999, 4_000));
    assert!(r.notes.iter().any(|n| matches!(
        n,
        Note::StreamingKernels {
            bootstrap: true,
            ..
        }
    )));
    let boot = r.bootstrap_values.expect("kept");
    let (_, v) = mean_var(&boot);
    // numpy: ((a - a.mean())**2).sum()/n**2 + ((b - b.mean())**2).sum()/n**2
    let want = 0.014141667799183029f64.powi(2) * (1.0 + 1.1f64.powi(2));
    assert!((v / want - 1.0).abs() < 0.09, "variance {v} vs {want}");
    let (lo, hi) = (r.ci.low.unwrap(), r.ci.high.unwrap());
    let (wl, wh) = (r.welch.ci.low.unwrap(), r.welch.ci.high.unwrap());
    let width = wh - wl;
    assert!((lo - wl).abs() < 0.1 * width && (hi - wh).abs() < 0.1 * width);
}

/// Kernel generations give their own numbers, pinned here (value-stability: a change to
/// either fails): generation 1 (and a request that does not say) keeps the partial
/// shuffle, generation 2 streams; and a request written before generation 2 reads as 1.
#[test]
fn each_kernel_generation_keeps_its_numbers() {
    let old = analyse(&request(1, 999, 200));
    let new = analyse(&request(2, 999, 200));
    assert!(!old
        .notes
        .iter()
        .any(|n| matches!(n, Note::StreamingKernels { .. })));
    let pin = |r: &TwoGroupsReport| {
        (
            r.test.extreme_count,
            r.test.observed,
            r.ci.low.unwrap(),
            r.ci.high.unwrap(),
            r.hedges_g.ci.low.unwrap(),
        )
    };
    let (o, n) = (pin(&old), pin(&new));
    assert_ne!(o, n, "the generations draw differently");
    assert_eq!(o, PIN_1, "generation 1");
    assert_eq!(n, PIN_2, "generation 2");
    // A request without the field is generation 1.
    let mut json = serde_json::to_value(request(2, 999, 200)).unwrap();
    json["settings"].as_object_mut().unwrap().remove("kernels");
    let read: TwoGroupsRequest = serde_json::from_value(json).unwrap();
    assert_eq!(read.settings.kernels, 1);
}

/// The pinned numbers of [`each_kernel_generation_keeps_its_numbers`] (extreme count,
/// observed difference, BCa ends, Hedges' g lower end).
const PIN_1: (u64, f64, f64, f64, f64) = (
    37,
    0.04500000000003013,
    0.0049285087403593475,
    0.0864631442790664,
    0.0023422374343433187,
);
const PIN_2: (u64, f64, f64, f64, f64) = (
    33,
    0.04500000000003013,
    0.003317120770362459,
    0.07730075057495675,
    0.0015792074041654479,
);

/// The streaming kernels give the same report on 1, 2 and 3 threads.
#[test]
fn streaming_runs_are_the_same_on_any_number_of_threads() {
    use reshuffle::resample::parallel::set_threads;
    let r = request(2, 600, 300);
    let mut first = None;
    for t in [1, 2, 3] {
        set_threads(t);
        let rep = serde_json::to_string(&analyse(&r)).unwrap();
        assert_eq!(first.get_or_insert(rep.clone()), &rep, "{t} threads");
    }
    set_threads(0);
}

/// A median, a trimmed-mean and a rank-sum difference stream as well, and agree with the
/// partial-shuffle kernel's p-value within Monte Carlo error (both estimate the same
/// permutation p-value).
#[test]
fn order_statistics_stream_and_agree_with_generation_one() {
    for st in [
        Statistic::MedianDifference,
        Statistic::TrimmedMeanDifference,
    ] {
        let mut a = request(1, 4_000, 200);
        a.statistic = st;
        let mut b = request(2, 4_000, 200);
        b.statistic = st;
        let (ra, rb) = (analyse(&a), analyse(&b));
        assert_eq!(
            ra.test.observed, rb.test.observed,
            "{st:?}: the same observed value"
        );
        let p = (ra.test.p_value + rb.test.p_value) / 2.0;
        let se = (2.0 * p * (1.0 - p) / 4_000.0f64).sqrt();
        assert!(
            (ra.test.p_value - rb.test.p_value).abs() < 4.5 * se,
            "{st:?}: {} vs {}",
            ra.test.p_value,
            rb.test.p_value
        );
    }
}

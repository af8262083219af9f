//! No silent wrong answer: one test per class of input that used to give a wrong number or a
//! crash (numbers near 1e15 with small differences, values near 1e-300, values whose squares
//! overflow, undefined statistics, p-values that could not occur, links of the first format).
//! Expected values come from exact rational arithmetic (Python's fractions module, by hand
//! where noted) on the doubles the files hold.

use std::process::Command;

fn reshuffle(args: &[&str], input: &str) -> (i32, String, String) {
    let dir = std::env::temp_dir().join(format!("reshuffle-hardening-{}", std::process::id()));
    std::fs::create_dir_all(&dir).unwrap();
    let file = dir.join(format!("t{}.csv", input.len()));
    std::fs::write(&file, input).unwrap();
    let mut all = vec!["analyze", file.to_str().unwrap()];
    all.extend_from_slice(args);
    let out = Command::new(env!("CARGO_BIN_EXE_reshuffle"))
        .args(&all)
        .output()
        .expect("run reshuffle");
    (
        out.status.code().unwrap_or(-1),
        String::from_utf8_lossy(&out.stdout).into_owned(),
        String::from_utf8_lossy(&out.stderr).into_owned(),
    )
}

fn report(args: &[&str], input: &str) -> serde_json::Value {
    let mut a = args.to_vec();
    a.push("--json");
    let (code, out, err) = reshuffle(&a, input);
    assert_eq!(code, 0, "{err}");
    let mut v: serde_json::Value = serde_json::from_str(&out).unwrap();
    v["report"].take()
}

const QUICK: [&str; 6] = ["--seed", "5", "--resamples", "999", "--bootstrap", "500"];

fn close(got: f64, want: f64, rel: f64) -> bool {
    (got - want).abs() <= rel * want.abs().max(f64::MIN_POSITIVE)
}

/// Class: large offsets. 10^15 + {1, 2, 3, 4} against 10^15 + {5, 6, 7, 8} (all exact
/// doubles): the difference in means is exactly −4, each SD is sqrt(5/3), each mean is
/// 10^15 + 2.5 or 10^15 + 6.5 (by hand). Plain summation gave −4.25-ish answers before.
#[test]
fn values_with_a_large_offset_keep_their_small_differences() {
    let mut t = String::from("y,g\n");
    for v in [1, 2, 3, 4] {
        t.push_str(&format!("{},a\n", 1_000_000_000_000_000u64 + v));
    }
    for v in [5, 6, 7, 8] {
        t.push_str(&format!("{},b\n", 1_000_000_000_000_000u64 + v));
    }
    let r = report(&QUICK, &t);
    assert_eq!(r["observed"].as_f64().unwrap(), -4.0);
    assert_eq!(r["effect"].as_f64().unwrap(), -4.0);
    let sd = (5.0f64 / 3.0).sqrt();
    for (g, mean) in [(0, 1e15 + 2.5), (1, 1e15 + 6.5)] {
        assert_eq!(r["groups"][g]["mean"].as_f64().unwrap(), mean);
        assert!(close(r["groups"][g]["sd"].as_f64().unwrap(), sd, 1e-12));
    }
    // Welch t = −4 / sqrt(2 · (5/3) / 4) (by hand).
    let t_want = -4.0 / (2.0 * 5.0 / 3.0 / 4.0f64).sqrt();
    assert!(
        close(r["welch"]["t"].as_f64().unwrap(), t_want, 1e-12),
        "{}",
        r["welch"]
    );
    assert!(r["notes"]
        .as_array()
        .unwrap()
        .iter()
        .any(|n| n["code"] == "values-shifted"));
    // The exact test: the observed split is the most extreme of C(8, 4) = 70, with its
    // mirror image: p = 2/70.
    assert!(close(r["p_value"].as_f64().unwrap(), 2.0 / 70.0, 1e-12));
}

/// Class: tiny magnitudes. {1, 2, 3}·1e-300 has SD 1e-300 and {2, 4, 6}·1e-300 has SD
/// 2e-300 (by hand); squares of such values underflow to 0, which gave an SD of 0 before.
#[test]
fn values_near_1e_minus_300_keep_their_spread() {
    let t = "y,g\n1e-300,a\n2e-300,a\n3e-300,a\n2e-300,b\n4e-300,b\n6e-300,b\n";
    let r = report(&QUICK, t);
    assert!(close(r["groups"][0]["sd"].as_f64().unwrap(), 1e-300, 1e-12));
    assert!(close(r["groups"][1]["sd"].as_f64().unwrap(), 2e-300, 1e-12));
    assert!(close(r["effect"].as_f64().unwrap(), -2e-300, 1e-12));
    // The words do not round the difference to zero.
    let (_, text, _) = reshuffle(&QUICK, t);
    assert!(text.contains("2.000e-300 lower"), "{text}");
}

/// Class: overflow never becomes an answer. Values whose squares overflow are refused with
/// the line and column, instead of an infinite statistic with p = 0.
#[test]
fn values_whose_squares_overflow_are_refused_with_their_cell() {
    let t = "y,g\n1,a\n2,a\n3e200,a\n2,b\n4,b\n6,b\n";
    let (code, out, err) = reshuffle(&QUICK, t);
    assert_eq!(code, 2, "{out}");
    assert!(err.contains("Line 4 of column \"y\" holds 3e200"), "{err}");
    assert!(err.contains("Rescale"), "{err}");
}

/// Class: an undefined statistic is never p = 0. No yes answers in either group under the
/// risk ratio: the ratio is undefined and the only possible table is the observed one, so
/// p = 1 (by hand), with the note that the ratio is undefined.
#[test]
fn an_undefined_ratio_is_not_reported_as_p_zero() {
    let out = Command::new(env!("CARGO_BIN_EXE_reshuffle"))
        .args([
            "analyze",
            "--design",
            "yes-no",
            "--counts",
            "a: 0/30, b: 0/40",
            "--statistic",
            "risk-ratio",
            "--seed",
            "1",
            "--json",
        ])
        .output()
        .unwrap();
    let v: serde_json::Value = serde_json::from_slice(&out.stdout).unwrap();
    let r = &v["report"];
    assert_eq!(r["p_value"].as_f64().unwrap(), 1.0, "{r}");
    assert!(r["notes"]
        .as_array()
        .unwrap()
        .iter()
        .any(|n| n["code"] == "ratio-at-limit"));
}

/// Class: a p-value is never impossible. Completely separated groups by random relabelling
/// (enumeration switched off): the observed arrangement counts, so p ≥ 1/(m + 1)
/// (Phipson & Smyth 2010, "Permutation p-values should never be zero").
#[test]
fn a_random_relabelling_p_value_is_at_least_one_over_m_plus_one() {
    let mut t = String::from("y,g\n");
    for i in 0..30 {
        t.push_str(&format!("{},a\n{},b\n", i, 1000 + i));
    }
    let mut args = QUICK.to_vec();
    args.extend(["--exact-limit", "0"]);
    let r = report(&args, &t);
    assert_eq!(r["exact"], false);
    let p = r["p_value"].as_f64().unwrap();
    assert!(p >= 1.0 / 1000.0 - 1e-15, "{p}");
    assert_eq!(r["extreme_count"], 0);
}

/// Class: links of the first format carry no integrity check; they keep opening, with a
/// note saying so.
#[test]
fn a_version_1_link_opens_with_a_note_that_it_carries_no_check() {
    let link = std::fs::read_to_string(concat!(
        env!("CARGO_MANIFEST_DIR"),
        "/tests/fixtures/v1/links/two-groups-desks-welch-less.txt"
    ))
    .unwrap();
    let out = Command::new(env!("CARGO_BIN_EXE_reshuffle"))
        .args(["analyze", "--link", link.trim(), "--json"])
        .output()
        .unwrap();
    assert!(out.status.success());
    let err = String::from_utf8_lossy(&out.stderr);
    assert!(err.contains("carries no integrity check"), "{err}");
}

/// Class: the tie tolerance must not hide real differences. One value of 10^10 among values
/// from 1.0 to 2.0 (one decimal): the exact count of relabellings whose |difference in
/// means| is at least the observed one, by brute force over all C(12, 6) = 924 splits in
/// integer arithmetic (tenths), against the engine's exact enumeration. A tolerance relative
/// to the largest value (1e-9 × 10^10 = 10) counted every split with the outlier on the
/// observed side as a tie.
#[test]
fn one_huge_value_does_not_turn_distinct_relabellings_into_ties() {
    let a: [i128; 6] = [16, 17, 18, 19, 20, 100_000_000_000];
    let b: [i128; 6] = [10, 11, 12, 13, 14, 15];
    let pool: Vec<i128> = a.iter().chain(&b).copied().collect();
    let total: i128 = pool.iter().sum();
    let obs = (2 * a.iter().sum::<i128>() - total).abs();
    let mut count = 0u64;
    for mask in 0u32..(1 << 12) {
        if mask.count_ones() != 6 {
            continue;
        }
        let s: i128 = (0..12)
            .filter(|i| mask >> i & 1 == 1)
            .map(|i| pool[i])
            .sum();
        if (2 * s - total).abs() >= obs {
            count += 1;
        }
    }
    let mut t = String::from("y,g\n");
    for v in a {
        t.push_str(&format!("{},a\n", v as f64 / 10.0));
    }
    for v in b {
        t.push_str(&format!("{},b\n", v as f64 / 10.0));
    }
    let r = report(&QUICK, &t);
    assert_eq!(r["exact"], true);
    assert_eq!(r["resamples"], 924);
    assert_eq!(r["extreme_count"].as_u64().unwrap(), count, "{r}");
    // Only the observed split and its mirror image are as extreme (the largest small values
    // beside the outlier).
    assert_eq!(count, 2);
}

/// Class: bounded memory. Counts in the billions are computed from the counts (the exact
/// distribution over the window of non-negligible probabilities, about 10^6 terms here),
/// not from billions of units (72 GB before). The p-value of a small difference matches the
/// chi-square test's (the normal approximation is excellent at these sizes; common practice).
#[test]
fn yes_no_counts_in_the_billions_are_computed_from_the_counts() {
    let run = |counts: &str| {
        let out = Command::new(env!("CARGO_BIN_EXE_reshuffle"))
            .args([
                "analyze",
                "--design",
                "yes-no",
                "--counts",
                counts,
                "--seed",
                "1",
                "--bootstrap",
                "1000",
                "--json",
            ])
            .output()
            .unwrap();
        assert!(
            out.status.success(),
            "{}",
            String::from_utf8_lossy(&out.stderr)
        );
        let mut v: serde_json::Value = serde_json::from_slice(&out.stdout).unwrap();
        v["report"].take()
    };
    let r = run("a: 2000000000/5000000000, b: 2000010000/5000000000");
    let (p, chi) = (
        r["p_value"].as_f64().unwrap(),
        r["chi_square"]["p_value"].as_f64().unwrap(),
    );
    assert!((p - chi).abs() < 2e-3, "exact {p} vs chi-square {chi}");
    // Far apart: a p-value below 1e-290, but never 0.
    let r = run("a: 2000000000/5000000000, b: 2100000000/5000000000");
    let p = r["p_value"].as_f64().unwrap();
    assert!(p > 0.0 && p < 1e-290, "{p}");
}

/// Class: bounded work. Every pair of 60 groups (1,770 comparisons, each with its own test
/// and bootstrap) is refused before any work starts, naming the limit and the way out.
#[test]
fn thousands_of_comparisons_are_refused_before_any_work() {
    let mut t = String::from("y,g\n");
    for g in 0..60 {
        for i in 0..3 {
            t.push_str(&format!("{},g{g}\n", g * 3 + i));
        }
    }
    let (code, _, err) = reshuffle(&["--design", "k-groups", "--seed", "1"], &t);
    assert_eq!(code, 2);
    assert!(err.contains("60 groups make 1,770 pairs"), "{err}");
    assert!(err.contains("Choose a control group"), "{err}");
}

/// Class: bounded work. Settings that would draw more than 5·10^11 values are refused with
/// the amount and what to lower, before any work starts.
#[test]
fn settings_that_would_run_for_hours_are_refused_with_the_limit() {
    let mut t = String::from("y,g\n");
    for i in 0..100_000 {
        t.push_str(&format!(
            "{},{}\n",
            i % 977,
            if i % 2 == 0 { "a" } else { "b" }
        ));
    }
    let (code, _, err) = reshuffle(&["--resamples", "10000000", "--seed", "1"], &t);
    assert_eq!(code, 2);
    assert!(
        err.contains("100,000 values × (10,000,000 relabellings"),
        "{err}"
    );
    assert!(err.contains("Lower the relabellings"), "{err}");
}

/// Class: large offsets, stratified. 10^15 plus quarters, two strata (exact doubles): in
/// stratum "s1" the means are 10^15 + 7/12 and 10^15 + 25/12, a difference of −1.5; in
/// "s2" 10^15 + 3.25 and 10^15 + 4.5, −1.25; weighted by stratum size (6 and 4) the
/// difference is −1.4 (by hand). Sums of six values near 10^15 round to whole numbers, so the
/// bootstrap's plain sums lost the quarters before the offset was taken out.
#[test]
fn stratified_values_with_a_large_offset_keep_their_small_differences() {
    let rows = [
        ("s1", "a", 0.25),
        ("s1", "a", 0.5),
        ("s1", "a", 1.0),
        ("s1", "b", 1.75),
        ("s1", "b", 2.0),
        ("s1", "b", 2.5),
        ("s2", "a", 3.0),
        ("s2", "a", 3.5),
        ("s2", "b", 4.25),
        ("s2", "b", 4.75),
    ];
    let mut t = String::from("y,g,site\n");
    for (s, g, v) in rows {
        t.push_str(&format!("{},{g},{s}\n", 1e15 + v));
    }
    let mut args = vec![
        "--design",
        "stratified",
        "--value",
        "y",
        "--group",
        "g",
        "--strata",
        "site",
    ];
    args.extend_from_slice(&QUICK);
    let r = report(&args, &t);
    assert!(close(r["effect"].as_f64().unwrap(), -1.4, 1e-12), "{r}");
    assert!(close(r["observed"].as_f64().unwrap(), -1.4, 1e-12), "{r}");
    let s1 = &r["strata"][0];
    assert_eq!(s1["difference"].as_f64().unwrap(), -1.5);
    assert!(close(
        s1["mean1"].as_f64().unwrap(),
        1e15 + 7.0 / 12.0,
        1e-15
    ));
    assert_eq!(r["strata"][1]["difference"].as_f64().unwrap(), -1.25);
    // Unstratified, the means are 10^15 + 1.65 and 10^15 + 3.05 (by hand): −1.4 again.
    let plain = r["unstratified"]["mean_difference"].as_f64().unwrap();
    assert!(close(plain, -1.4, 1e-12), "{plain}");
    // Every bootstrap resample's difference is a weighted difference of quarter-valued
    // cell means, so the interval stays within the range of those (−3 to 0 here), and
    // is not the rounding noise of sums near 6·10^15.
    let ci = &r["ci"];
    let (lo, hi) = (ci["low"].as_f64().unwrap(), ci["high"].as_f64().unwrap());
    assert!(lo >= -3.0 && hi <= 0.0 && lo < hi, "{ci}");
    assert!(r["notes"]
        .as_array()
        .unwrap()
        .iter()
        .any(|n| n["code"] == "values-shifted"));
}

/// Every way to deal `items` into groups of the given sizes (multiset permutations of the
/// group labels), for brute-force counts.
fn labellings(sizes: &[usize]) -> Vec<Vec<usize>> {
    fn go(left: &mut Vec<usize>, cur: &mut Vec<usize>, n: usize, out: &mut Vec<Vec<usize>>) {
        if cur.len() == n {
            out.push(cur.clone());
            return;
        }
        for g in 0..left.len() {
            if left[g] > 0 {
                left[g] -= 1;
                cur.push(g);
                go(left, cur, n, out);
                cur.pop();
                left[g] += 1;
            }
        }
    }
    let mut out = Vec::new();
    let n = sizes.iter().sum();
    go(&mut sizes.to_vec(), &mut Vec::new(), n, &mut out);
    out
}

/// Class: the tie tolerance of the k-group F. One value of 10^5 among values from 1.0 to
/// 1.8 (tenths), three groups of three: the exact count of the 9!/(3!·3!·3!) = 1,680
/// labellings whose F is at least the observed one, by brute force in integer arithmetic
/// (with equal sizes F increases with Σ_g S_g², S_g the group sums in tenths). The labellings
/// that keep the outlier's partners but split the small values differently differ in F by
/// about 2·10^-11 of it: a tolerance of 10^-9 of F counted them as ties. (Far larger outliers
/// push such differences below what a double can hold at all, about 10^-16 of F; a rank
/// statistic is the remedy there.)
#[test]
fn one_huge_value_does_not_turn_distinct_k_group_labellings_into_ties() {
    let groups: [[i128; 3]; 3] = [[18, 17, 1_000_000], [10, 11, 12], [13, 14, 15]];
    let pool: Vec<i128> = groups.iter().flatten().copied().collect();
    let q = |lab: &[usize]| -> i128 {
        let mut s = [0i128; 3];
        for (v, g) in pool.iter().zip(lab) {
            s[*g] += v;
        }
        s.iter().map(|v| v * v).sum()
    };
    let observed: Vec<usize> = (0..9).map(|i| i / 3).collect();
    let q_obs = q(&observed);
    let all = labellings(&[3, 3, 3]);
    assert_eq!(all.len(), 1680);
    let count = all.iter().filter(|l| q(l) >= q_obs).count() as u64;
    let mut t = String::from("y,g\n");
    for (g, vals) in groups.iter().enumerate() {
        for v in vals {
            t.push_str(&format!("{},g{g}\n", *v as f64 / 10.0));
        }
    }
    let mut args = vec!["--design", "k-groups", "--statistic", "f"];
    args.extend_from_slice(&QUICK);
    let r = report(&args, &t);
    assert_eq!(r["exact"], true);
    assert_eq!(r["resamples"], 1680);
    assert_eq!(
        r["extreme_count"].as_u64().unwrap(),
        count,
        "{}",
        r["p_value"]
    );
    // The outlier's group holds the two largest small values: only the 3! = 6 relabellings
    // that permute the group names are as extreme.
    assert_eq!(count, 6);
}

/// Class: the tie tolerance of the association test. One x of 10^8 among x from 0.1 to
/// 0.6: the exact count of the 7! = 5,040 pairings with |r| at least the observed one, by
/// brute force in integer arithmetic (|r| increases with |n·Σ x·y_π − Σx·Σy|, in tenths).
/// Pairings that keep the outlier's partner differ in r by about 10^-10: a tolerance of
/// 10^-9 of r merged them.
#[test]
fn one_huge_value_does_not_turn_distinct_pairings_into_ties() {
    let x: [i128; 7] = [1, 2, 3, 4, 5, 6, 1_000_000_000];
    let y: [i128; 7] = [3, 1, 2, 5, 4, 6, 7];
    let (sx, sy): (i128, i128) = (x.iter().sum(), y.iter().sum());
    let stat = |p: &[usize]| -> i128 {
        let s: i128 = (0..7).map(|i| x[i] * y[p[i]]).sum();
        (7 * s - sx * sy).abs()
    };
    let obs = stat(&[0, 1, 2, 3, 4, 5, 6]);
    let ones = [1usize; 7];
    let count = labellings(&ones).iter().filter(|p| stat(p) >= obs).count() as u64;
    let mut t = String::from("x,y\n");
    for i in 0..7 {
        t.push_str(&format!("{},{}\n", x[i] as f64 / 10.0, y[i] as f64 / 10.0));
    }
    let mut args = vec!["--design", "association", "--x", "x", "--y", "y"];
    args.extend_from_slice(&QUICK);
    let r = report(&args, &t);
    assert_eq!(r["exact"], true);
    assert_eq!(r["resamples"], 5040);
    assert_eq!(
        r["extreme_count"].as_u64().unwrap(),
        count,
        "{}",
        r["p_value"]
    );
    assert!(count < 100, "{count}");
}

/// Class: bounded work for estimates. A studentized interval of a median (no formula SE, so
/// each of the 100,000 resamples nests 50 more) over 100,000 values would draw 5.1·10^11
/// values: refused before any work, with what to lower.
#[test]
fn estimates_that_would_run_for_hours_are_refused_with_the_limit() {
    let mut t = String::from("y\n");
    for i in 0..100_000 {
        t.push_str(&format!("{}\n", i % 977));
    }
    let dir = std::env::temp_dir().join(format!("reshuffle-hardening-e{}", std::process::id()));
    std::fs::create_dir_all(&dir).unwrap();
    let file = dir.join("e.csv");
    std::fs::write(&file, &t).unwrap();
    let out = Command::new(env!("CARGO_BIN_EXE_reshuffle"))
        .args([
            "estimate",
            file.to_str().unwrap(),
            "--value",
            "y",
            "--estimate",
            "median",
        ])
        .args([
            "--interval",
            "studentized",
            "--resamples",
            "100000",
            "--seed",
            "1",
        ])
        .output()
        .unwrap();
    let err = String::from_utf8_lossy(&out.stderr);
    assert_eq!(out.status.code(), Some(2), "{err}");
    assert!(
        err.contains("100,000 values × 100,000 resamples × 51"),
        "{err}"
    );
    assert!(err.contains("Lower the resamples"), "{err}");
}

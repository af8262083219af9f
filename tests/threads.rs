//! All cores, same numbers: every design's report is bit-identical whether it ran on 1, 2,
//! 3 or 8 threads (random relabelling blocks and bootstrap blocks are shared out among the
//! threads and merged in block order). The expected value is the one-thread run itself; the
//! check is exact equality of the JSON, every float written with round-trip precision.
//! Plans share batches of simulated studies the same way.

use std::process::Command;

fn run(args: &[&str], threads: usize) -> serde_json::Value {
    let t = threads.to_string();
    let out = Command::new(env!("CARGO_BIN_EXE_reshuffle"))
        .args(args)
        .args(["--json", "--threads", &t])
        .current_dir(env!("CARGO_MANIFEST_DIR"))
        .output()
        .expect("run reshuffle");
    assert!(
        out.status.success(),
        "{args:?}: {}",
        String::from_utf8_lossy(&out.stderr)
    );
    let mut v: serde_json::Value = serde_json::from_slice(&out.stdout).unwrap();
    assert_eq!(v["threads"], threads, "the envelope says how many ran");
    v["report"].take()
}

#[test]
fn every_design_gives_the_same_numbers_on_any_number_of_threads() {
    // Random relabellings (exact limit 0) in many blocks, and bootstrap blocks.
    let common = [
        "--seed",
        "20261203",
        "--exact-limit",
        "0",
        "--resamples",
        "40000",
        "--bootstrap",
        "9000",
    ];
    let jobs: Vec<Vec<&str>> = vec![
        vec!["analyze", "demo-data/tomato-irrigation.csv"],
        vec![
            "analyze",
            "demo-data/tomato-irrigation.csv",
            "--statistic",
            "median-difference",
            "--interval",
            "all",
        ],
        vec![
            "analyze",
            "demo-data/adhesive-shear-strength.csv",
            "--design",
            "k-groups",
        ],
        vec![
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
        ],
        vec![
            "analyze",
            "demo-data/seed-germination.csv",
            "--design",
            "yes-no",
            "--value",
            "germinated",
            "--group",
            "storage",
        ],
        vec![
            "analyze",
            "tests/reference/data/sleep-paired.csv",
            "--design",
            "paired",
            "--columns",
            "drug1,drug2",
            "--interval",
            "studentized",
        ],
        vec![
            "analyze",
            "tests/reference/data/cars.csv",
            "--design",
            "association",
            "--x",
            "speed",
            "--y",
            "dist",
        ],
    ];
    // Sequential stops land on the same relabelling whatever the thread count.
    let mut jobs = jobs;
    jobs.push(vec![
        "analyze",
        "demo-data/tomato-irrigation.csv",
        "--stop-after",
        "25",
    ]);
    jobs.push(vec![
        "analyze",
        "demo-data/adhesive-shear-strength.csv",
        "--design",
        "k-groups",
        "--stop-after",
        "5",
    ]);
    // Settled against a level after whole blocks, checked in order.
    jobs.push(vec![
        "analyze",
        "demo-data/tomato-irrigation.csv",
        "--settle-at",
        "0.05",
    ]);
    jobs.push(vec![
        "analyze",
        "demo-data/adhesive-shear-strength.csv",
        "--design",
        "k-groups",
        "--settle-at",
        "0.01",
    ]);
    for job in jobs {
        let mut args = job.clone();
        args.extend_from_slice(&common);
        let one = run(&args, 1);
        for t in [2, 3, 8] {
            assert!(run(&args, t) == one, "{job:?} differs on {t} threads");
        }
    }
    // An estimate (bootstrap only, studentized by a nested bootstrap) and a plan.
    let est = [
        "estimate",
        "demo-data/service-desk-minutes.tsv",
        "--columns",
        "north_desk,harbour_desk",
        "--estimate",
        "median-difference",
        "--interval",
        "all",
        "--resamples",
        "5000",
        "--seed",
        "7",
    ];
    let one = run(&est, 1);
    for t in [2, 3, 8] {
        assert!(run(&est, t) == one, "estimate differs on {t} threads");
    }
    // A plan: batches of simulated studies on the threads, with the early stop of a size
    // decided on whole batches in order.
    let plan = [
        "plan",
        "--design",
        "two-groups",
        "--effect",
        "0.7",
        "--sd",
        "1",
        "--studies",
        "1000",
        "--seed",
        "11",
    ];
    let one = run(&plan, 1);
    assert!(one["curve"].as_array().unwrap().len() > 3, "{one}");
    for t in [2, 3, 8] {
        assert!(run(&plan, t) == one, "plan differs on {t} threads");
    }
}

//! Paired (before–after) and one-sample designs: a sign-flip permutation test of the
//! differences (or of the values minus a reference), a bootstrap interval for the mean or
//! median difference, d_z with its interval, and the paired (or one-sample) t-test and the
//! Wilcoxon signed-rank test as classical cross-checks.

use serde::{Deserialize, Serialize};

use super::EffectSize;
use crate::base::format as fmt;
use crate::base::*;
use crate::classical::ranks::{signed_rank, SignedRank};
use crate::classical::{t_test, TTest};
use crate::input::columns::plural;
use crate::input::table::{self, HeaderChoice};
use crate::num::stats;
use crate::resample::boot::{Design, SeMethod, Stat};
use crate::resample::rng::RNG_NAME;
use crate::resample::signs::FlipSetup;
pub use crate::resample::signs::FlipStatistic;
use crate::resample::summary::{histogram, tail_region};
use crate::resample::tally::p_value;
use crate::resample::{boot, driver, rng};

#[derive(Clone, Debug, PartialEq, Serialize, Deserialize)]
#[serde(tag = "kind", rename_all = "kebab-case")]
pub enum PairedLayout {
    /// Two columns measured on the same units; the difference is first − second.
    Paired { first: String, second: String },
    /// One column compared with a reference value; the difference is value − reference.
    OneSample { value: String, reference: f64 },
    /// Long format: a value column, a column naming the measurement (e.g. before/after) and
    /// a column naming the unit; the difference is the `first` measurement minus the
    /// `second` of each unit.
    Long {
        value: String,
        group: String,
        unit: String,
        first: String,
        second: String,
    },
}

#[derive(Clone, Debug, PartialEq, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct PairedRequest {
    pub format_version: u32,
    pub data: String,
    #[serde(default)]
    pub header: HeaderChoice,
    pub layout: PairedLayout,
    pub statistic: FlipStatistic,
    pub alternative: Alternative,
    #[serde(default)]
    pub two_sided: TwoSidedRule,
    pub resamples: u64,
    /// Enumerate all 2^n sign patterns when there are at most this many.
    pub exact_limit: u64,
    pub bootstrap_resamples: u64,
    pub confidence: f64,
    pub interval: IntervalMethod,
    pub seed: u64,
}

impl PairedRequest {
    pub fn new(data: String, layout: PairedLayout, seed: u64) -> PairedRequest {
        PairedRequest {
            format_version: FORMAT_VERSION,
            data,
            header: HeaderChoice::Detect,
            layout,
            statistic: FlipStatistic::Mean,
            alternative: Alternative::TwoSided,
            two_sided: TwoSidedRule::Absolute,
            resamples: 100_000,
            exact_limit: 1 << 20,
            bootstrap_resamples: 10_000,
            confidence: 0.95,
            interval: IntervalMethod::Bca,
            seed,
        }
    }
}

#[derive(Clone, Debug, PartialEq, Serialize, Deserialize)]
pub struct PairedReport {
    pub format_version: u32,
    pub engine_version: String,
    pub design: String,
    /// What the differences are, e.g. "after − before" or "yield − 4".
    pub difference_label: String,
    pub n: usize,
    pub notes: Vec<Note>,
    pub statistic: FlipStatistic,
    pub alternative: Alternative,
    pub two_sided: TwoSidedRule,
    pub observed: f64,
    pub p_value: f64,
    pub exact: bool,
    pub resamples: u64,
    pub extreme_count: u64,
    pub mc_se: Option<f64>,
    pub p_interval: Option<PInterval>,
    pub seed: u64,
    pub rng: String,
    pub effect_label: String,
    pub ci: Interval,
    pub bootstrap_resamples: u64,
    pub bootstrap_se: Option<f64>,
    /// Paired or one-sample t-test.
    pub t_test: TTest,
    pub wilcoxon: SignedRank,
    /// Mean difference over the SD of the differences, with a bootstrap interval.
    pub dz: EffectSize,
    pub null_histogram: Histogram,
    pub tail: Tail,
    pub bootstrap_histogram: Histogram,
    pub finding: String,
    pub cautions: Vec<String>,
}

fn differences(
    req: &PairedRequest,
    notes: &mut Vec<Note>,
) -> Result<(Vec<f64>, String, String), RunError> {
    let t = table::parse(&req.data, req.header)?;
    match &req.layout {
        PairedLayout::Paired { first, second } => {
            if first == second {
                return Err(RunError::Input(format!(
                    "The same column (\"{first}\") was chosen twice."
                )));
            }
            let (ca, cb) = (t.column(first)?, t.column(second)?);
            let (na, nb) = (ca.numbers(t.decimal_comma)?, cb.numbers(t.decimal_comma)?);
            let mut vb = vec![None; t.rows];
            for &(i, v) in &nb.values {
                vb[i] = Some(v);
            }
            let mut d = Vec::new();
            let mut incomplete = 0;
            let mut va = vec![None; t.rows];
            for &(i, v) in &na.values {
                va[i] = Some(v);
            }
            for r in 0..t.rows {
                match (va[r], vb[r]) {
                    (Some(a), Some(b)) => d.push(a - b),
                    (None, None) => {}
                    _ => incomplete += 1,
                }
            }
            if incomplete > 0 {
                let lengths = (na.values.len() != nb.values.len()).then(|| {
                    (
                        first.clone(),
                        na.values.len(),
                        second.clone(),
                        nb.values.len(),
                    )
                });
                notes.push(Note::IncompletePairs {
                    count: incomplete,
                    lengths,
                });
            }
            if na.values.len() != nb.values.len() && incomplete == 0 {
                // Unreachable in practice (rows align), kept for a clear message.
                return Err(RunError::Input(format!(
                    "Column \"{first}\" has {} values and \"{second}\" has {}; paired data need one of each per row.",
                    na.values.len(),
                    nb.values.len()
                )));
            }
            Ok((d, format!("{first} − {second}"), "paired".into()))
        }
        PairedLayout::Long {
            value,
            group,
            unit,
            first,
            second,
        } => {
            if unit == value || unit == group {
                return Err(RunError::Input(format!(
                    "The column \"{unit}\" was chosen both for the units and for the {}; \
                     choose the column that names each unit (plant, patient, machine).",
                    if unit == value {
                        "values"
                    } else {
                        "measurements"
                    }
                )));
            }
            let lab = crate::input::columns::labelled_values(&t, value, group, notes)?;
            // Unnamed measurements: the two of the column, in order of appearance.
            let (first, second) = match (first.is_empty() && second.is_empty(), &lab.levels[..]) {
                (true, [a, b]) => (a, b),
                (true, _) => {
                    return Err(RunError::Input(format!(
                        "Column \"{group}\" holds {} measurements; say which two to compare \
                         (first minus second).",
                        lab.levels.len()
                    )))
                }
                (false, _) => (first, second),
            };
            if first == second {
                return Err(RunError::Input(format!(
                    "\"{first}\" was chosen as both measurements; choose two different ones."
                )));
            }
            let level = |name: &str| {
                lab.levels.iter().position(|l| l == name).ok_or_else(|| {
                    RunError::Input(format!(
                        "There is no measurement \"{name}\" in column \"{group}\"; it holds {}.",
                        lab.levels
                            .iter()
                            .map(|l| format!("\"{l}\""))
                            .collect::<Vec<_>>()
                            .join(", ")
                    ))
                })
            };
            let (lf, ls) = (level(first)?, level(second)?);
            let ucol = t.column(unit)?;
            // unit -> (first value, its line), (second value, its line)
            type Slot = Option<(f64, u64)>;
            let mut units: Vec<(String, Slot, Slot)> = Vec::new();
            let mut no_unit = 0;
            for &(row, l, v) in &lab.rows {
                if l != lf && l != ls {
                    continue;
                }
                let cell = &ucol.cells[row];
                let id = cell.text.trim();
                if id.is_empty() {
                    no_unit += 1;
                    continue;
                }
                let i = match units.iter().position(|u| u.0 == id) {
                    Some(i) => i,
                    None => {
                        units.push((id.to_string(), None, None));
                        units.len() - 1
                    }
                };
                let slot = if l == lf {
                    &mut units[i].1
                } else {
                    &mut units[i].2
                };
                if let Some((_, line)) = slot {
                    return Err(RunError::Input(format!(
                        "Unit \"{id}\" has two \"{}\" measurements (lines {line} and {}); each \
                         unit needs one of each. Correct the unit column or remove the repeat.",
                        lab.levels[l], cell.line
                    )));
                }
                *slot = Some((v, cell.line));
            }
            if no_unit > 0 {
                notes.push(Note::NoUnit {
                    column: unit.clone(),
                    count: no_unit,
                });
            }
            let mut d = Vec::new();
            let mut incomplete = 0;
            for (_, a, b) in &units {
                match (a, b) {
                    (Some((x, _)), Some((y, _))) => d.push(x - y),
                    _ => incomplete += 1,
                }
            }
            if incomplete > 0 {
                notes.push(Note::IncompleteUnits { count: incomplete });
            }
            Ok((d, format!("{first} − {second}"), "paired".into()))
        }
        PairedLayout::OneSample { value, reference } => {
            if !reference.is_finite() {
                return Err(RunError::Input(
                    "The reference value must be a number.".into(),
                ));
            }
            let c = t.column(value)?;
            let nums = c.numbers(t.decimal_comma)?;
            if nums.missing > 0 {
                notes.push(Note::MissingCells {
                    column: value.clone(),
                    count: nums.missing,
                });
            }
            let d = nums.values.iter().map(|v| v.1 - reference).collect();
            Ok((d, format!("{value} − {reference}"), "one-sample".into()))
        }
    }
}

pub fn run(req: &PairedRequest, progress: ProgressFn) -> Result<PairedReport, RunError> {
    super::check_common(
        req.format_version,
        req.confidence,
        req.resamples,
        req.bootstrap_resamples,
        "sign patterns",
    )?;
    let mut notes = Vec::new();
    let (d, label, design) = differences(req, &mut notes)?;
    let n = d.len();
    if n < 2 {
        return Err(RunError::Input(format!(
            "Only {n} complete pair{}; at least 2 are needed (and 6 or more for a sign-flip test to be able to reach p < .05).",
            plural(n)
        )));
    }
    let setup = FlipSetup::new(req.statistic, &d);
    let patterns: u64 = if n < 63 { 1u64 << n } else { u64::MAX };
    let (counts, values, exact) = driver::Relabelling {
        count: patterns,
        exact_limit: req.exact_limit,
        resamples: req.resamples,
        seed: req.seed,
        stage: "sign patterns",
    }
    .run(
        progress,
        &mut |cb| setup.enumerate(rng::BLOCK, cb),
        &mut |s, len| setup.random_block(s, len),
    )?;
    let pr = p_value(&counts, exact, req.alternative, req.two_sided);
    let observed = setup.observed;

    // Bootstrap the differences as one sample.
    let f_effect: boot::BoxedStat = match req.statistic {
        FlipStatistic::Mean => Box::new(|x, _| stats::mean(x)),
        FlipStatistic::Median => Box::new(|x, _| stats::median_select(x)),
    };
    let f_dz = |x: &mut [f64], _: &mut [f64]| stats::mean(x) / stats::sd(x);
    let se_mean = |x: &mut [f64], _: &mut [f64]| stats::sd(x) / (x.len() as f64).sqrt();
    let studentize = req.interval == IntervalMethod::Studentized;
    let se = match (studentize, req.statistic) {
        (false, _) => SeMethod::None,
        (true, FlipStatistic::Mean) => SeMethod::Formula(&se_mean),
        (true, FlipStatistic::Median) => SeMethod::Nested(boot::NESTED),
    };
    let dz_est = f_dz(&mut d.clone(), &mut []);
    let design_b = Design::One {
        x: &d,
        strata: None,
    };
    let stats_ = [
        Stat {
            f: f_effect.as_ref(),
            estimate: observed,
            se,
        },
        Stat {
            f: &f_dz,
            estimate: dz_est,
            se: SeMethod::None,
        },
    ];
    let (bvals, tvals) = boot::resample(
        &design_b,
        &stats_,
        req.seed,
        req.bootstrap_resamples,
        progress,
    )?;
    let finite: Vec<f64> = bvals[0].iter().copied().filter(|v| v.is_finite()).collect();
    let t_finite: Vec<f64> = tvals[0].iter().copied().filter(|v| v.is_finite()).collect();
    let se_hat = match se {
        SeMethod::Formula(g) => g(&mut d.clone(), &mut []),
        SeMethod::Nested(_) => boot::standard_error(&finite).unwrap_or(f64::NAN),
        SeMethod::None => f64::NAN,
    };
    let summary = boot::Summary {
        estimate: observed,
        boot: &finite,
        t: studentize.then_some((&t_finite[..], se_hat)),
        bounds: None,
    };
    let f_ref = f_effect.as_ref();
    let mut accel = || boot::acceleration(&design_b, f_ref);
    let ci = boot::interval_by(
        req.interval,
        req.confidence,
        Side::TwoSided,
        &summary,
        &mut accel,
    );
    let dz_finite: Vec<f64> = bvals[1].iter().copied().filter(|v| v.is_finite()).collect();
    let dz_method = if studentize {
        IntervalMethod::Bca
    } else {
        req.interval
    };
    let dz = EffectSize {
        name: "d_z (mean difference / SD of differences)".into(),
        estimate: dz_est.is_finite().then_some(dz_est),
        ci: if dz_est.is_finite() {
            let s = boot::Summary {
                estimate: dz_est,
                boot: &dz_finite,
                t: None,
                bounds: None,
            };
            boot::interval_by(dz_method, req.confidence, Side::TwoSided, &s, &mut || {
                boot::acceleration(&design_b, &f_dz)
            })
        } else {
            Interval::none(
                dz_method.into(),
                req.confidence,
                Side::TwoSided,
                Note::DifferencesConstant,
            )
        },
    };
    let t_test = t_test(&d, req.alternative, req.confidence);
    let wilcoxon = signed_rank(&d, req.alternative);
    let tail = tail_region(req.alternative, req.two_sided, &counts, observed);
    let null_histogram = histogram(&values, &[observed], 48);
    let mut bm = vec![observed];
    bm.extend(ci.low);
    bm.extend(ci.high);
    let bootstrap_histogram = histogram(&finite, &bm, 48);
    let what = match req.statistic {
        FlipStatistic::Mean => "mean",
        FlipStatistic::Median => "median",
    };
    let effect_label = format!("{what} of the differences ({label})");
    let mut report = PairedReport {
        format_version: FORMAT_VERSION,
        engine_version: ENGINE_VERSION.into(),
        design,
        difference_label: label,
        n,
        notes,
        statistic: req.statistic,
        alternative: req.alternative,
        two_sided: req.two_sided,
        observed,
        p_value: pr.p,
        exact,
        resamples: counts.total,
        extreme_count: pr.extreme,
        mc_se: pr.mc_se,
        p_interval: pr.interval,
        seed: req.seed,
        rng: RNG_NAME.into(),
        effect_label,
        ci,
        bootstrap_resamples: req.bootstrap_resamples,
        bootstrap_se: boot::standard_error(&finite),
        t_test,
        wilcoxon,
        dz,
        null_histogram,
        tail,
        bootstrap_histogram,
        finding: String::new(),
        cautions: Vec::new(),
    };
    report.finding = finding(&report);
    report.cautions = cautions(&report);
    Ok(report)
}

fn finding(r: &PairedReport) -> String {
    let d = match (r.ci.low, r.ci.high) {
        (Some(l), Some(h)) if h > l => fmt::decimals_for(h - l),
        _ => 2,
    };
    let mut s = format!("The {} was {}", r.effect_label, fmt::fixed(r.observed, d));
    if let (Some(l), Some(h)) = (r.ci.low, r.ci.high) {
        s.push_str(&format!(" ({})", fmt::ci(r.ci.level, l, h, d)));
    }
    let what = if r.statistic == FlipStatistic::Mean {
        "a mean difference"
    } else {
        "a median difference"
    };
    let how = match (r.alternative, r.two_sided) {
        (Alternative::TwoSided, TwoSidedRule::Absolute) => {
            "at least this far from zero in either direction"
        }
        (Alternative::TwoSided, TwoSidedRule::DoubledTail) => {
            "at least this far from zero in the observed direction"
        }
        (Alternative::Greater, _) => "at least this large",
        (Alternative::Less, _) => "at least this small",
    };
    if r.exact {
        s.push_str(&format!(
            "; {what} {how} arose in {} of all {} sign patterns (exact {}).",
            fmt::count(r.extreme_count),
            fmt::count(r.resamples),
            fmt::p_value(r.p_value)
        ));
    } else {
        s.push_str(&format!(
            "; {what} {how} arose in {} of {} random sign patterns ({}).",
            fmt::count(r.extreme_count),
            fmt::count(r.resamples),
            fmt::p_value(r.p_value)
        ));
    }
    s
}

fn cautions(r: &PairedReport) -> Vec<String> {
    let mut c = vec![if r.design == "paired" {
        "What the test assumes: the pairs are independent of each other, and if there were no \
         effect each difference would be as likely positive as negative (the two measurements \
         of a unit are exchangeable)."
            .to_string()
    } else {
        "What the test assumes: the values are independent, and if the true centre were the \
         reference value their distribution would be symmetric about it. Skewed data can make \
         a sign-flip test mislead; the bootstrap interval does not need symmetry."
            .to_string()
    }];
    if r.n < 10 {
        c.push(format!(
            "Small sample ({} differences): the test has little power, and bootstrap intervals \
             tend to be too narrow for samples this small (Hesterberg 2015).",
            r.n
        ));
    }
    c.push("A p-value is not the size of an effect; read it with the interval.".into());
    c.push(
        "Several tests on the same data: adjust for their number (for example Holm's method)."
            .into(),
    );
    c.push("Clinical, safety or regulatory decisions need a qualified statistician and the guidelines that apply to them.".into());
    c
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn zero_differences_and_tiny_samples() {
        let mut r = PairedRequest::new(
            "a,b\n1,1\n2,2\n".into(),
            PairedLayout::Paired {
                first: "a".into(),
                second: "b".into(),
            },
            1,
        );
        r.bootstrap_resamples = 200;
        let rep = run(&r, &mut |_| true).unwrap();
        assert_eq!(rep.p_value, 1.0);
        assert!(rep.t_test.t.is_none());
        assert!(rep.wilcoxon.p_value.is_none());
        assert!(!rep.finding.contains("NaN"));
        let r1 = PairedRequest::new(
            "a,b\n1,2\n".into(),
            PairedLayout::Paired {
                first: "a".into(),
                second: "b".into(),
            },
            1,
        );
        assert!(run(&r1, &mut |_| true)
            .unwrap_err()
            .to_string()
            .contains("Only 1 complete pair"));
    }

    #[test]
    fn long_format_with_unit_ids_equals_two_columns() {
        let wide = "before,after\n5.1,5.9\n4.8,5.2\n6.0,6.1\n5.5,6.4\n4.9,5.0\n";
        let long = "y,time,plot\n5.9,after,p1\n5.1,before,p1\n4.8,before,p2\n5.2,after,p2\n\
                    6.0,before,p3\n6.1,after,p3\n5.5,before,p4\n6.4,after,p4\n4.9,before,p5\n\
                    5.0,after,p5\n7.0,before,p6\n";
        let mut w = PairedRequest::new(
            wide.into(),
            PairedLayout::Paired {
                first: "after".into(),
                second: "before".into(),
            },
            4,
        );
        w.bootstrap_resamples = 300;
        let mut l = w.clone();
        l.data = long.into();
        l.layout = PairedLayout::Long {
            value: "y".into(),
            group: "time".into(),
            unit: "plot".into(),
            first: "after".into(),
            second: "before".into(),
        };
        let (a, b) = (
            run(&w, &mut |_| true).unwrap(),
            run(&l, &mut |_| true).unwrap(),
        );
        assert_eq!(a.p_value, b.p_value);
        assert_eq!(a.ci, b.ci);
        assert!(
            b.notes[0] == Note::IncompleteUnits { count: 1 },
            "{:?}",
            b.notes
        );
        // A unit measured twice at the same time is named with both lines.
        l.data = format!("{long}5.3,after,p1\n");
        let e = run(&l, &mut |_| true).unwrap_err().to_string();
        assert!(
            e.contains("Unit \"p1\" has two \"after\" measurements (lines 2 and 13)"),
            "{e}"
        );
    }

    #[test]
    fn missing_members_are_counted() {
        let data = "a,b\n1,2\n3,\n4,5.5\n2,1\n6,4\n,3\n";
        let mut r = PairedRequest::new(
            data.into(),
            PairedLayout::Paired {
                first: "a".into(),
                second: "b".into(),
            },
            1,
        );
        r.bootstrap_resamples = 200;
        let rep = run(&r, &mut |_| true).unwrap();
        assert_eq!(rep.n, 4);
        assert!(
            rep.notes[0]
                == Note::IncompletePairs {
                    count: 2,
                    lengths: None
                },
            "{:?}",
            rep.notes
        );
        // Columns of unequal length: both lengths are named.
        let mut r = r.clone();
        r.data = "a,b\n1,2\n3,4\n5,\n7,\n2,1\n".into();
        let rep = run(&r, &mut |_| true).unwrap();
        assert!(
            rep.notes[0]
                == Note::IncompletePairs {
                    count: 2,
                    lengths: Some(("a".into(), 5, "b".into(), 3))
                },
            "{:?}",
            rep.notes
        );
    }
}

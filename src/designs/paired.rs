//! Paired measurements (each unit measured twice): a sign-flip permutation test of the
//! differences, a bootstrap interval for their mean or median, d_z with its interval, and
//! the paired t-test and the Wilcoxon signed-rank test as classical cross-checks. The
//! one-sample design (module `one_sample`) runs the same analysis on values minus a
//! reference value.

use serde::{Deserialize, Serialize};

use super::{closing_cautions, Caution, Design, DesignKey, EffectSize, TestOutcome, TestSettings};
use crate::base::*;
use crate::classical::ranks::{signed_rank, SignedRank};
use crate::classical::{t_test, TTest};
use crate::input::columns::plural;
use crate::input::table::{self, HeaderChoice};
use crate::num::stats;
use crate::resample::boot::{self, Design as Resampling, SeMethod, Stat};
pub use crate::resample::signs::FlipStatistic;
use crate::resample::signs::{self, FlipSetup};
use crate::resample::summary::histogram;
use crate::resample::{driver, rng};

/// The paired design.
pub struct PairedDesign;

/// Where the two measurements of each unit are.
#[derive(Clone, Debug, PartialEq, Serialize, Deserialize)]
#[serde(tag = "kind", rename_all = "kebab-case")]
pub enum PairedLayout {
    /// Two columns measured on the same units (one row per unit); the difference is
    /// first − second.
    Columns {
        /// The first measurement's column.
        first: String,
        /// The second measurement's column.
        second: String,
    },
    /// Long format: a value column, a column naming the measurement (e.g. before/after) and
    /// a column naming the unit; the difference is the `first` measurement minus the
    /// `second` of each unit.
    Long {
        /// The values.
        value: String,
        /// The column naming each row's measurement.
        group: String,
        /// The column naming each row's unit.
        unit: String,
        /// The measurement that comes first (empty: the first of two, in order).
        first: String,
        /// The measurement that comes second.
        second: String,
    },
}

/// Paired measurements: the layout, the statistic of the differences and the settings.
#[derive(Clone, Debug, PartialEq, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct PairedRequest {
    /// The table as pasted.
    pub data: String,
    /// Whether the first row holds column names.
    #[serde(default)]
    pub header: HeaderChoice,
    /// Where the measurements are.
    pub layout: PairedLayout,
    /// Mean or median of the differences.
    pub statistic: FlipStatistic,
    /// The test and interval settings (enumerate all 2^n sign patterns up to the limit).
    pub settings: TestSettings,
}

impl PairedRequest {
    /// The defaults the page and the command start from.
    pub fn new(data: String, layout: PairedLayout, seed: u64) -> PairedRequest {
        PairedRequest {
            data,
            header: HeaderChoice::Detect,
            layout,
            statistic: FlipStatistic::Mean,
            settings: sign_flip_settings(seed),
        }
    }
}

/// The settings a sign-flip design starts from: every sign pattern enumerated up to 2^20.
pub fn sign_flip_settings(seed: u64) -> TestSettings {
    TestSettings {
        exact_limit: 1 << 20,
        ..TestSettings::new(seed)
    }
}

/// What the differences are.
#[derive(Clone, Debug, PartialEq, Serialize, Deserialize)]
#[serde(tag = "kind", rename_all = "kebab-case")]
pub enum Differences {
    /// The first measurement minus the second, unit by unit.
    Pairs {
        /// The first measurement.
        first: String,
        /// The second measurement.
        second: String,
    },
    /// Each value minus a reference value.
    Reference {
        /// The values' column.
        value: String,
        /// The reference value.
        reference: f64,
    },
}

/// What a sign-flip analysis (paired or one sample) found.
#[derive(Clone, Debug, PartialEq, Serialize, Deserialize)]
pub struct SignFlipReport {
    /// What the differences are.
    pub differences: Differences,
    /// Number of differences.
    pub n: usize,
    /// What was left out.
    pub notes: Vec<Note>,
    /// Mean or median of the differences.
    pub statistic: FlipStatistic,
    /// The direction of the test.
    pub alternative: Alternative,
    /// How the two-sided p-value is defined.
    pub two_sided: TwoSidedRule,
    /// The sign-flip test.
    #[serde(flatten)]
    pub test: TestOutcome,
    /// The headline interval of the mean (or median) difference.
    pub ci: Interval,
    /// The headline interval and any further methods, side by side.
    pub intervals: Vec<Interval>,
    /// Bootstrap resamples.
    pub bootstrap_resamples: u64,
    /// Bootstrap standard error.
    pub bootstrap_se: Option<f64>,
    /// Mean of the bootstrap values minus the estimate.
    pub bootstrap_bias: Option<f64>,
    /// The bootstrap values, binned.
    pub bootstrap_histogram: Histogram,
    /// The paired (or one-sample) t-test.
    pub t_test: TTest,
    /// The Wilcoxon signed-rank test.
    pub wilcoxon: SignedRank,
    /// For the signed-rank statistic: the matched-pairs rank-biserial correlation, the
    /// effect its interval is for (the observed statistic is the mean signed rank).
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub rank_biserial: Option<f64>,
    /// Mean difference over the SD of the differences, with a bootstrap interval.
    pub dz: EffectSize,
    /// What to keep in mind.
    pub cautions: Vec<Caution>,
}

impl Design for PairedDesign {
    const KEY: DesignKey = DesignKey::Paired;
    type Request = PairedRequest;
    type Report = SignFlipReport;

    fn check(req: &PairedRequest) -> Result<(), Error> {
        req.settings.check("sign patterns")
    }

    fn run(req: &PairedRequest, progress: ProgressFn) -> Result<SignFlipReport, Error> {
        Self::check(req)?;
        let mut notes = Vec::new();
        let (d, first, second) = differences(req, &mut notes)?;
        sign_flip(
            &d,
            Differences::Pairs { first, second },
            notes,
            req.statistic,
            &req.settings,
            progress,
        )
    }

    fn data(req: &PairedRequest) -> &str {
        &req.data
    }

    fn clear_data(req: &mut PairedRequest) {
        req.data.clear();
    }

    fn seed(req: &PairedRequest) -> u64 {
        req.settings.seed
    }

    fn test_settings(req: &mut PairedRequest) -> Option<&mut TestSettings> {
        Some(&mut req.settings)
    }

    fn test_outcome(report: &SignFlipReport) -> Option<&TestOutcome> {
        Some(&report.test)
    }
}

/// Runs a paired request.
pub fn run(req: &PairedRequest, progress: ProgressFn) -> Result<SignFlipReport, Error> {
    PairedDesign::run(req, progress)
}

/// The differences first − second of each unit, and the names of the two measurements.
fn differences(
    req: &PairedRequest,
    notes: &mut Vec<Note>,
) -> Result<(Vec<f64>, String, String), Error> {
    let t = table::parse(&req.data, req.header)?;
    notes.extend(t.notes());
    match &req.layout {
        PairedLayout::Columns { first, second } => {
            if first == second {
                return Err(Error::data(format!(
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
                return Err(Error::data(format!(
                    "Column \"{first}\" has {} values and \"{second}\" has {}; paired data need one of each per row.",
                    na.values.len(),
                    nb.values.len()
                )));
            }
            Ok((d, first.clone(), second.clone()))
        }
        PairedLayout::Long {
            value,
            group,
            unit,
            first,
            second,
        } => {
            if unit == value || unit == group {
                return Err(Error::data(format!(
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
                    return Err(Error::data(format!(
                        "Column \"{group}\" holds {} measurements; say which two to compare \
                         (first minus second).",
                        lab.levels.len()
                    )))
                }
                (false, _) => (first, second),
            };
            if first == second {
                return Err(Error::data(format!(
                    "\"{first}\" was chosen as both measurements; choose two different ones."
                )));
            }
            let level = |name: &str| {
                lab.levels.iter().position(|l| l == name).ok_or_else(|| {
                    Error::data(format!(
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
                let (row, l) = (row as usize, l as usize);
                if l != lf && l != ls {
                    continue;
                }
                let cell = ucol.cell(row);
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
                    return Err(Error::data(format!(
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
            Ok((d, first.clone(), second.clone()))
        }
    }
}

/// The sign-flip analysis of differences `d`: the test (exact over all 2^n sign patterns up
/// to the limit, otherwise random patterns), the bootstrap of the differences as one sample,
/// d_z, the t-test and the signed-rank test.
pub(crate) fn sign_flip(
    d: &[f64],
    differences: Differences,
    notes: Vec<Note>,
    statistic: FlipStatistic,
    set: &TestSettings,
    progress: ProgressFn,
) -> Result<SignFlipReport, Error> {
    let n = d.len();
    super::check_work(n, 1, set)?;
    if n < 2 {
        return Err(Error::data(format!(
            "Only {n} complete pair{}; at least 2 are needed (and 6 or more for a sign-flip \
             test to be able to reach p < .05).",
            plural(n)
        )));
    }
    let setup = FlipSetup::new(statistic, d);
    let patterns: u64 = if n < 63 { 1u64 << n } else { u64::MAX };
    let null = driver::Relabelling {
        count: patterns,
        exact_limit: set.exact_limit,
        resamples: set.resamples,
        seed: set.seed,
        stage: Stage::SignPatterns,
        stop: set.stop(set.alternative, setup.observed, setup.tolerance),
        block: crate::resample::rng::BLOCK,
    }
    .run(
        progress,
        &mut |cb| setup.enumerate(rng::BLOCK, cb),
        &|s, len| setup.random_block(s, len),
    )?;
    let observed = setup.observed;
    let mut test =
        TestOutcome::from_null(&null, set.alternative, set.two_sided, observed, set.seed);
    let values = &null.values[..];
    // The figure's range is set by the relabelled values and the observed one.
    test.null_histogram = histogram(values, &[observed], 48);

    // Bootstrap the differences as one sample.
    let f_effect: boot::BoxedStat = match statistic {
        FlipStatistic::Mean => Box::new(|x, _| stats::mean(x)),
        FlipStatistic::Median => Box::new(|x, _| stats::median_select(x)),
        FlipStatistic::SignedRank => Box::new(|x, _| signs::rank_biserial(x)),
    };
    // The effect the interval is for: the statistic itself, or for the signed-rank
    // statistic the rank-biserial correlation.
    let rank_biserial = (statistic == FlipStatistic::SignedRank).then(|| signs::rank_biserial(d));
    let estimate = rank_biserial.unwrap_or(observed);
    let f_dz = |x: &mut [f64], _: &mut [f64]| stats::mean(x) / stats::sd(x);
    let se_mean = |x: &mut [f64], _: &mut [f64]| stats::sd(x) / (x.len() as f64).sqrt();
    let methods = set.methods();
    let studentize = methods.contains(&IntervalMethod::Studentized);
    let se = match (studentize, statistic) {
        (false, _) => SeMethod::None,
        (true, FlipStatistic::Mean) => SeMethod::Formula(&se_mean),
        (true, FlipStatistic::Median | FlipStatistic::SignedRank) => SeMethod::Nested(boot::NESTED),
    };
    let dz_est = f_dz(&mut d.to_vec(), &mut []);
    let design_b = Resampling::One { x: d, strata: None };
    let stats_ = [
        Stat {
            f: f_effect.as_ref(),
            estimate,
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
        set.seed,
        set.bootstrap_resamples,
        progress,
    )?;
    let se_hat = match se {
        SeMethod::Formula(g) => g(&mut d.to_vec(), &mut []),
        SeMethod::Nested(_) => {
            let finite: Vec<f64> = bvals[0].iter().copied().filter(|v| v.is_finite()).collect();
            boot::standard_error(&finite).unwrap_or(f64::NAN)
        }
        SeMethod::None => f64::NAN,
    };
    let f_ref = f_effect.as_ref();
    let effect = super::summarise_bootstrap(
        &methods,
        set.confidence,
        estimate,
        &bvals[0],
        studentize.then_some((&tvals[0][..], se_hat)),
        None,
        &mut || boot::acceleration(&design_b, f_ref),
    );
    let dz_finite: Vec<f64> = bvals[1].iter().copied().filter(|v| v.is_finite()).collect();
    let dz_method = if set.interval() == IntervalMethod::Studentized {
        IntervalMethod::Bca
    } else {
        set.interval()
    };
    let dz = EffectSize {
        estimate: dz_est.is_finite().then_some(dz_est),
        ci: if dz_est.is_finite() {
            let s = boot::Summary {
                estimate: dz_est,
                boot: &dz_finite,
                t: None,
                bounds: None,
            };
            boot::interval_by(dz_method, set.confidence, Side::TwoSided, &s, &mut || {
                boot::acceleration(&design_b, &f_dz)
            })
        } else {
            Interval::none(
                dz_method.into(),
                set.confidence,
                Side::TwoSided,
                Note::DifferencesConstant,
            )
        },
    };
    let mut cautions = vec![Caution::Assumptions];
    if n < 10 {
        cautions.push(Caution::SmallSample { smallest: n });
    }
    closing_cautions(&mut cautions);
    Ok(SignFlipReport {
        differences,
        n,
        notes,
        statistic,
        alternative: set.alternative,
        two_sided: set.two_sided,
        test,
        ci: effect.ci(),
        intervals: effect.intervals,
        bootstrap_resamples: set.bootstrap_resamples,
        bootstrap_se: effect.se,
        bootstrap_bias: effect.bias,
        bootstrap_histogram: effect.histogram,
        t_test: t_test(d, set.alternative, set.confidence),
        wilcoxon: signed_rank(d, set.alternative),
        rank_biserial,
        dz,
        cautions,
    })
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn zero_differences_and_tiny_samples() {
        let mut r = PairedRequest::new(
            "a,b\n1,1\n2,2\n".into(),
            PairedLayout::Columns {
                first: "a".into(),
                second: "b".into(),
            },
            1,
        );
        r.settings.bootstrap_resamples = 200;
        let rep = run(&r, &mut |_| true).unwrap();
        assert_eq!(rep.test.p_value, 1.0);
        assert!(rep.t_test.t.is_none());
        assert!(rep.wilcoxon.p_value.is_none());
        let r1 = PairedRequest::new(
            "a,b\n1,2\n".into(),
            PairedLayout::Columns {
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
            PairedLayout::Columns {
                first: "after".into(),
                second: "before".into(),
            },
            4,
        );
        w.settings.bootstrap_resamples = 300;
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
        assert_eq!(a.test.p_value, b.test.p_value);
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
            PairedLayout::Columns {
                first: "a".into(),
                second: "b".into(),
            },
            1,
        );
        r.settings.bootstrap_resamples = 200;
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

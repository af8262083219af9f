//! Estimation only: a bootstrap confidence interval (by one or all methods) for a one-sample
//! estimate, a two-group effect (independent or paired) or an association, with the
//! bootstrap standard error and bias. No test is run.

mod estimators;
mod kinds;

use serde::{Deserialize, Serialize};

use crate::base::format as fmt;
use crate::base::*;
use crate::classical;
use crate::designs::{Caution, Design, DesignKey, MAX_BOOTSTRAP};
use crate::input::columns::paired_columns;
use crate::input::columns::Layout;
use crate::input::columns::{self as groups};
use crate::input::table::Table;
use crate::input::table::{self, HeaderChoice};
use crate::num::binomial::clopper_pearson;
use crate::num::stats;
use crate::resample::boot;
use crate::resample::boot::{Design as Resampling, SeMethod, Stat, StatFn};
use crate::resample::rng::RNG_NAME;
use crate::resample::summary::histogram;
pub(crate) use estimators::{estimator, se_formula};
pub use kinds::*;

/// Where the data for an estimate are.
#[derive(Clone, Debug, PartialEq, Serialize, Deserialize)]
#[serde(tag = "kind", rename_all = "kebab-case")]
pub enum EstimateLayout {
    /// One column of values; with `strata`, resampling stays within each stratum.
    One {
        value: String,
        #[serde(default)]
        strata: Option<String>,
    },
    /// Two groups in long or wide format; `paired` resamples whole rows (wide format).
    Groups {
        layout: Layout,
        #[serde(default)]
        first: Option<String>,
        #[serde(default)]
        second: Option<String>,
        #[serde(default)]
        paired: bool,
    },
    /// Two numeric columns, resampled as pairs.
    Pairs { x: String, y: String },
}

/// The estimate-only design.
pub struct EstimateDesign;

/// An estimate with bootstrap intervals, without a test.
#[derive(Clone, Debug, PartialEq, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct EstimateRequest {
    /// The table as pasted.
    pub data: String,
    /// Whether the first row holds column names.
    #[serde(default)]
    pub header: HeaderChoice,
    /// Where the data are.
    pub layout: EstimateLayout,
    /// What to estimate.
    pub estimate: Estimate,
    /// The quantile for `quantile`, in (0, 1).
    #[serde(default)]
    pub q: Option<f64>,
    /// Interval methods; the first is the headline. Empty: the default (BCa).
    #[serde(default)]
    pub methods: Vec<IntervalMethod>,
    /// A two-sided interval or a one-sided bound.
    #[serde(default)]
    pub side: Side,
    /// The confidence level.
    pub confidence: f64,
    /// Bootstrap resamples.
    pub resamples: u64,
    /// The seed.
    pub seed: u64,
    /// Return every bootstrap value (for a CSV download).
    #[serde(default)]
    pub keep_resamples: bool,
}

impl EstimateRequest {
    /// The defaults the page and the command start from.
    pub fn new(
        data: String,
        layout: EstimateLayout,
        estimate: Estimate,
        seed: u64,
    ) -> EstimateRequest {
        EstimateRequest {
            data,
            header: HeaderChoice::Detect,
            layout,
            estimate,
            q: None,
            methods: vec![IntervalMethod::Bca],
            side: Side::TwoSided,
            confidence: 0.95,
            resamples: 10_000,
            seed,
            keep_resamples: false,
        }
    }
}

/// A sample and its size.
#[derive(Clone, Debug, PartialEq, Serialize, Deserialize)]
pub struct SampleSize {
    /// Its name (the column, the group, or "x and y").
    pub name: String,
    /// Its size.
    pub n: usize,
}

/// What the estimate-only analysis found.
#[derive(Clone, Debug, PartialEq, Serialize, Deserialize)]
pub struct EstimateReport {
    /// What was estimated.
    pub estimate_key: Estimate,
    /// The quantile, for a quantile.
    #[serde(default)]
    pub q: Option<f64>,
    /// The samples.
    pub samples: Vec<SampleSize>,
    /// What was left out or needs care.
    pub notes: Vec<Note>,
    /// The estimate.
    pub estimate: f64,
    /// Bootstrap standard error.
    pub se: Option<f64>,
    /// Bootstrap estimate of bias (mean of the resampled estimates minus the estimate).
    pub bias: Option<f64>,
    /// Bootstrap resamples.
    pub resamples: u64,
    /// The seed.
    pub seed: u64,
    /// The generator.
    pub rng: String,
    /// One interval per method, the headline first.
    pub intervals: Vec<Interval>,
    /// A classical interval as a cross-check, where a standard one exists.
    pub classical: Option<Interval>,
    /// The bootstrap values, binned.
    pub histogram: Histogram,
    /// What to keep in mind.
    pub cautions: Vec<Caution>,
    /// Every bootstrap value, in order (only when asked for).
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub values: Option<Vec<f64>>,
}

impl Design for EstimateDesign {
    const KEY: DesignKey = DesignKey::Estimate;
    type Request = EstimateRequest;
    type Report = EstimateReport;

    fn check(req: &EstimateRequest) -> Result<(), Error> {
        check(req, &mut Vec::new()).map(|_| ())
    }

    fn run(req: &EstimateRequest, progress: ProgressFn) -> Result<EstimateReport, Error> {
        run(req, progress)
    }

    fn data(req: &EstimateRequest) -> &str {
        &req.data
    }

    fn clear_data(req: &mut EstimateRequest) {
        req.data.clear();
    }

    fn seed(req: &EstimateRequest) -> u64 {
        req.seed
    }
}

// ----- statistics -------------------------------------------------------------------

fn numbers(t: &Table, col: &str, notes: &mut Vec<Note>) -> Result<Vec<(usize, f64)>, Error> {
    let c = t.column(col)?;
    let nums = c.numbers(t.decimal_comma)?;
    nums.push_notes(col, notes);
    Ok(nums.values)
}

/// Reads yes/no style values as 1/0 for a proportion.
fn zero_one(t: &Table, col: &str, notes: &mut Vec<Note>) -> Result<Vec<f64>, Error> {
    let c = t.column(col)?;
    let mut out = Vec::new();
    let mut missing = Vec::new();
    for cell in c.cells() {
        let v = match table::read_yes_no(cell.text) {
            Some(None) => {
                missing.push(cell);
                continue;
            }
            Some(Some(yes)) => f64::from(u8::from(yes)),
            None => {
                return Err(Error::new(
                    ErrorKind::Value,
                    format!(
                        "Line {} of column \"{col}\" holds \"{}\"; a proportion needs 0/1, \
                         yes/no, true/false or pass/fail values.",
                        cell.line,
                        crate::base::format::brief(cell.text)
                    ),
                )
                .at_line(cell.line)
                .in_column(col))
            }
        };
        out.push(v);
    }
    notes.extend(table::left_out_notes(col, &missing));
    Ok(out)
}

enum Prepared {
    One {
        x: Vec<f64>,
        strata: Option<Vec<Vec<usize>>>,
        name: String,
    },
    Two {
        a: Vec<f64>,
        b: Vec<f64>,
        names: [String; 2],
        paired: bool,
    },
    Pairs {
        x: Vec<f64>,
        y: Vec<f64>,
        names: [String; 2],
    },
}

fn prepare(req: &EstimateRequest, t: &Table, notes: &mut Vec<Note>) -> Result<Prepared, Error> {
    let kind = req.estimate.kind();
    let wrong = |what: &str| {
        Error::data(format!(
            "The {} needs {what}.",
            req.estimate.label(req.q.unwrap_or(0.5))
        ))
    };
    match (&req.layout, kind) {
        (EstimateLayout::One { value, strata }, Kind::One) => {
            let (x, rows): (Vec<f64>, Vec<usize>) = if req.estimate == Estimate::Proportion {
                let v = zero_one(t, value, notes)?;
                let rows = (0..v.len()).collect();
                (v, rows)
            } else {
                let v = numbers(t, value, notes)?;
                (
                    v.iter().map(|p| p.1).collect(),
                    v.iter().map(|p| p.0).collect(),
                )
            };
            if x.len() < 2 {
                return Err(Error::data(format!(
                    "Column \"{value}\" has {} value{}; an interval needs at least 2.",
                    x.len(),
                    groups::plural(x.len())
                )));
            }
            let strata = match strata {
                None => None,
                Some(sc) => {
                    if req.estimate == Estimate::Proportion {
                        return Err(Error::data(
                            "Strata are not yet supported for a proportion.",
                        ));
                    }
                    let col = t.column(sc)?;
                    let mut labels: Vec<String> = Vec::new();
                    let mut groups_: Vec<Vec<usize>> = Vec::new();
                    let mut xs = Vec::new();
                    for (k, &r) in rows.iter().enumerate() {
                        let l = col.cell(r).text.trim().to_string();
                        if l.is_empty() {
                            return Err(Error::data(format!(
                                "Line {} has a value but no stratum in column \"{sc}\".",
                                col.cell(r).line
                            )));
                        }
                        let i = match labels.iter().position(|x| *x == l) {
                            Some(i) => i,
                            None => {
                                labels.push(l);
                                groups_.push(Vec::new());
                                labels.len() - 1
                            }
                        };
                        groups_[i].push(k);
                        xs.push(x[k]);
                    }
                    if labels.len() < 2 {
                        return Err(Error::data(format!(
                            "Column \"{sc}\" names only one stratum; drop the strata or choose another column."
                        )));
                    }
                    notes.push(Note::WithinStrata {
                        column: sc.clone(),
                        strata: labels.len(),
                    });
                    Some(groups_)
                }
            };
            Ok(Prepared::One {
                x,
                strata,
                name: value.clone(),
            })
        }
        (EstimateLayout::One { .. }, _) => Err(wrong(if kind == Kind::Two {
            "two groups"
        } else {
            "two columns (x and y)"
        })),
        (
            EstimateLayout::Groups {
                layout,
                first,
                second,
                paired,
            },
            Kind::Two,
        ) => {
            if *paired {
                let Layout::Wide { columns } = layout else {
                    return Err(Error::data(
                        "Paired data need one column per condition (wide format), with each row one unit.",
                    ));
                };
                if columns.len() != 2 {
                    return Err(Error::data("Paired data need exactly two columns."));
                }
                let mut cols = columns.clone();
                if first.as_deref() == Some(columns[1].as_str()) {
                    cols.swap(0, 1);
                }
                let (a, b) = paired_columns(t, &cols[0], &cols[1], notes)?;
                Ok(Prepared::Two {
                    a,
                    b,
                    names: [cols[0].clone(), cols[1].clone()],
                    paired: true,
                })
            } else {
                let g = groups::two_groups(t, layout, first.as_deref(), second.as_deref())?;
                notes.extend(g.notes);
                Ok(Prepared::Two {
                    a: g.a,
                    b: g.b,
                    names: g.names,
                    paired: false,
                })
            }
        }
        (EstimateLayout::Groups { .. }, _) => Err(wrong(if kind == Kind::One {
            "one column of values"
        } else {
            "two columns (x and y)"
        })),
        (EstimateLayout::Pairs { x, y }, Kind::Association) => {
            let (xs, ys) = paired_columns(t, x, y, notes)?;
            if xs.len() < 3 {
                return Err(Error::data(format!(
                    "Only {} complete (x, y) row{}; an association needs at least 3.",
                    xs.len(),
                    groups::plural(xs.len())
                )));
            }
            Ok(Prepared::Pairs {
                x: xs,
                y: ys,
                names: [x.clone(), y.clone()],
            })
        }
        (EstimateLayout::Pairs { .. }, _) => Err(wrong(if kind == Kind::One {
            "one column of values"
        } else {
            "two groups"
        })),
    }
}

// ----- running ------------------------------------------------------------------------

fn check(req: &EstimateRequest, notes: &mut Vec<Note>) -> Result<u64, Error> {
    super::check_confidence(req.confidence)?;
    if req.estimate == Estimate::Quantile {
        match req.q {
            Some(q) if q > 0.0 && q < 1.0 => {}
            Some(q) => {
                return Err(Error::data(format!(
                    "The quantile must be between 0 and 1, for example 0.9 for the 90th percentile (it is {q})."
                )))
            }
            None => return Err(Error::data("Say which quantile, for example 0.9 for the 90th percentile.")),
        }
    }
    if req.resamples < 200 {
        return Err(Error::data(format!(
            "Use at least 200 bootstrap resamples (it is {}); 10,000 is a good default.",
            req.resamples
        )));
    }
    let mut b = req.resamples;
    let nested = req.methods.contains(&IntervalMethod::Studentized)
        && se_formula(req.estimate, false).is_none();
    let cap = if nested {
        MAX_BOOTSTRAP / 10
    } else {
        MAX_BOOTSTRAP
    };
    if b > cap {
        notes.push(Note::ResamplesCapped {
            asked: b,
            used: cap,
            nested,
        });
        b = cap;
    }
    Ok(b)
}

/// Refuses a bootstrap whose draws (values × resamples, × the inner resamples of a nested
/// studentized interval) are above [`MAX_WORK`](crate::designs::MAX_WORK), before any work.
fn check_work(prepared: &Prepared, req: &EstimateRequest, total: u64) -> Result<(), Error> {
    let n = match prepared {
        Prepared::One { x, .. } => x.len(),
        Prepared::Two { a, b, .. } => a.len() + b.len(),
        Prepared::Pairs { x, y, .. } => x.len() + y.len(),
    };
    let nested = req.methods.contains(&IntervalMethod::Studentized)
        && se_formula(
            req.estimate,
            matches!(prepared, Prepared::Two { paired: true, .. }),
        )
        .is_none();
    let inner = if nested {
        boot::NESTED as f64 + 1.0
    } else {
        1.0
    };
    let work = n as f64 * total as f64 * inner;
    let limit = crate::designs::MAX_WORK;
    if work <= limit {
        return Ok(());
    }
    Err(crate::designs::over_work_limit(
        format!(
            "This estimate would draw about {} values ({} values × {} resamples{})",
            fmt::sig(work),
            fmt::count(n as u64),
            fmt::count(total),
            if nested {
                format!(
                    " × {} inner resamples for the studentized interval",
                    boot::NESTED + 1
                )
            } else {
                String::new()
            },
        ),
        format!(
            "Lower the resamples to about {}{}.",
            fmt::count((limit / (n as f64 * inner)).floor() as u64),
            if nested {
                ", or choose another interval than the studentized one"
            } else {
                ""
            }
        ),
    ))
}

/// Runs an estimate request.
pub fn run(req: &EstimateRequest, progress: ProgressFn) -> Result<EstimateReport, Error> {
    let mut notes = Vec::new();
    let total = check(req, &mut notes)?;
    let t = table::parse(&req.data, req.header)?;
    notes.extend(t.notes());
    let prepared = prepare(req, &t, &mut notes)?;
    drop(t); // before the resampling (memory on large tables)
    check_work(&prepared, req, total)?;
    let q = req.q.unwrap_or(0.5);
    let e = req.estimate;
    let f = estimator(e, q);
    let mut methods = req.methods.clone();
    if methods.is_empty() {
        methods.push(IntervalMethod::Bca);
    }
    methods.dedup();
    let studentize = methods.contains(&IntervalMethod::Studentized);
    let paired = matches!(prepared, Prepared::Two { paired: true, .. });
    let se_f = se_formula(e, paired);
    let (design, samples, estimate) = match &prepared {
        Prepared::One { x, strata, name } => (
            Resampling::One {
                x,
                strata: strata.as_deref(),
            },
            vec![SampleSize {
                name: name.clone(),
                n: x.len(),
            }],
            f(&mut x.clone(), &mut []),
        ),
        Prepared::Two {
            a,
            b,
            names,
            paired,
        } => (
            if *paired {
                Resampling::Pairs { x: a, y: b }
            } else {
                Resampling::Two { a, b }
            },
            vec![
                SampleSize {
                    name: names[0].clone(),
                    n: a.len(),
                },
                SampleSize {
                    name: names[1].clone(),
                    n: b.len(),
                },
            ],
            f(&mut a.clone(), &mut b.clone()),
        ),
        Prepared::Pairs { x, y, names } => (
            Resampling::Pairs { x, y },
            vec![SampleSize {
                name: format!("{} and {}", names[0], names[1]),
                n: x.len(),
            }],
            f(&mut x.clone(), &mut y.clone()),
        ),
    };
    if !estimate.is_finite() {
        return Err(Error::data(format!(
            "The {} cannot be computed from these data (for example a ratio with a zero \
             denominator, or a correlation of a column with no variation).",
            e.label(q)
        )));
    }
    let se_method = if !studentize {
        SeMethod::None
    } else if let Some(g) = &se_f {
        SeMethod::Formula(g.as_ref())
    } else {
        notes.push(Note::NestedBootstrap {
            inner: boot::NESTED,
        });
        SeMethod::Nested(boot::NESTED)
    };
    let f_ref: StatFn = f.as_ref();
    let stat = Stat {
        f: f_ref,
        estimate,
        se: se_method,
    };
    let (values, tvals) = boot::resample(&design, &[stat], req.seed, total, progress)?;
    let finite: Vec<f64> = values[0]
        .iter()
        .copied()
        .filter(|v| v.is_finite())
        .collect();
    let dropped = values[0].len() - finite.len();
    if dropped > 0 {
        notes.push(Note::UndefinedResamples {
            count: dropped as u64,
            total: 0,
        });
    }
    let t_finite: Vec<f64> = tvals[0].iter().copied().filter(|v| v.is_finite()).collect();
    let se_hat = match &se_method {
        SeMethod::Formula(g) => {
            let (mut a, mut b) = design.original();
            g(&mut a, &mut b)
        }
        SeMethod::Nested(_) => boot::standard_error(&finite).unwrap_or(f64::NAN),
        SeMethod::None => f64::NAN,
    };
    let summary = boot::Summary {
        estimate,
        boot: &finite,
        t: studentize.then_some((&t_finite[..], se_hat)),
        bounds: e.bounds(),
    };
    let mut accel_cache: Option<(Option<f64>, bool)> = None;
    let mut accel = || *accel_cache.get_or_insert_with(|| boot::acceleration(&design, f_ref));
    let intervals: Vec<Interval> = methods
        .iter()
        .map(|&m| boot::interval_by(m, req.confidence, req.side, &summary, &mut accel))
        .collect();
    let se = boot::standard_error(&finite);
    let bias = (!finite.is_empty()).then(|| stats::mean(&finite) - estimate);

    // Hard cases worth a sentence.
    let n_min = samples.iter().map(|s| s.n).min().unwrap_or(0);
    if let Some((lo, hi)) = e.bounds() {
        if estimate <= lo || estimate >= hi {
            notes.push(Note::EstimateAtEdge { estimate });
        }
    }
    if e == Estimate::Quantile {
        if let Prepared::One { x, .. } = &prepared {
            let tail = (x.len() as f64 * q.min(1.0 - q)).floor();
            let mut distinct = stats::sorted(x);
            distinct.dedup();
            if tail < 5.0 || distinct.len() < 10 {
                notes.push(Note::FewBeyondQuantile {
                    tail,
                    q,
                    distinct: distinct.len(),
                });
            }
        }
    }
    if e == Estimate::Cv || e == Estimate::MeanRatio || e == Estimate::MedianRatio {
        if let Some(se) = se {
            if se > estimate.abs() {
                notes.push(Note::UnstableRatio);
            }
        }
    }
    let classical = classical_interval(e, &prepared, req.confidence);
    let mut marks = vec![estimate];
    marks.extend(intervals[0].low);
    marks.extend(intervals[0].high);
    let histogram = histogram(&finite, &marks, 48);
    let mut cautions = vec![Caution::Assumptions];
    if n_min < 20 {
        cautions.push(Caution::SmallSample { smallest: n_min });
    }
    if e.kind() == Kind::Association {
        cautions.push(Caution::NotCausation);
    }
    cautions.push(Caution::SimultaneousIntervals);
    cautions.push(Caution::Decisions);
    Ok(EstimateReport {
        estimate_key: e,
        q: req.q,
        samples,
        notes,
        estimate,
        se,
        bias,
        resamples: values[0].len() as u64,
        seed: req.seed,
        rng: RNG_NAME.into(),
        intervals,
        classical,
        histogram,
        cautions,
        values: req.keep_resamples.then(|| values[0].clone()),
    })
}

/// The t interval for a mean or a mean difference and Clopper–Pearson for a proportion.
fn classical_interval(e: Estimate, p: &Prepared, level: f64) -> Option<Interval> {
    use statrs::distribution::{ContinuousCDF, StudentsT};
    let t_iv = |m: f64, se: f64, df: f64, name: Method| -> Option<Interval> {
        let q = StudentsT::new(0.0, 1.0, df)
            .ok()?
            .inverse_cdf(1.0 - (1.0 - level) / 2.0);
        Some(Interval {
            low: Some(m - q * se),
            high: Some(m + q * se),
            level,
            method: name,
            side: Side::TwoSided,
            notes: Vec::new(),
        })
    };
    match (e, p) {
        (
            Estimate::Mean,
            Prepared::One {
                x, strata: None, ..
            },
        ) => {
            let n = x.len() as f64;
            t_iv(
                stats::mean(x),
                (stats::variance(x) / n).sqrt(),
                n - 1.0,
                Method::OneSampleT,
            )
        }
        (Estimate::Proportion, Prepared::One { x, .. }) => {
            let k = x.iter().filter(|v| **v == 1.0).count() as u64;
            let (lo, hi) = clopper_pearson(k, x.len() as u64, level);
            Some(Interval {
                low: Some(lo),
                high: Some(hi),
                level,
                method: Method::ClopperPearson,
                side: Side::TwoSided,
                notes: Vec::new(),
            })
        }
        (
            Estimate::MeanDifference,
            Prepared::Two {
                a,
                b,
                paired: false,
                ..
            },
        ) => {
            let w = classical::welch(a, b, Alternative::TwoSided, level);
            Some(Interval {
                method: Method::WelchT,
                ..w.ci
            })
        }
        (
            Estimate::MeanDifference,
            Prepared::Two {
                a, b, paired: true, ..
            },
        ) => {
            let d: Vec<f64> = a.iter().zip(b).map(|(x, y)| x - y).collect();
            let n = d.len() as f64;
            t_iv(
                stats::mean(&d),
                (stats::variance(&d) / n).sqrt(),
                n - 1.0,
                Method::PairedT,
            )
        }
        _ => None,
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::num::stats::ranks;

    fn one(data: &str, e: Estimate) -> EstimateRequest {
        let mut r = EstimateRequest::new(
            data.into(),
            EstimateLayout::One {
                value: "x".into(),
                strata: None,
            },
            e,
            99,
        );
        r.resamples = 2000;
        r
    }

    #[test]
    fn ranks_average_ties() {
        assert_eq!(ranks(&[10.0, 20.0, 10.0, 5.0]), vec![2.5, 4.0, 2.5, 1.0]);
    }

    #[test]
    fn every_one_sample_estimate_runs_with_every_method() {
        let data = "x\n3.1\n4.7\n2.2\n5.9\n4.0\n4.0\n7.5\n1.8\n2.9\n3.3\n2.1\n0.7\n2.6\n9.0\n1.1\n";
        for e in [
            Estimate::Mean,
            Estimate::Median,
            Estimate::TrimmedMean,
            Estimate::Sd,
            Estimate::Cv,
            Estimate::Quantile,
        ] {
            let mut r = one(data, e);
            r.q = Some(0.75);
            r.methods = IntervalMethod::ALL.to_vec();
            let rep = run(&r, &mut |_| true).unwrap();
            assert_eq!(rep.intervals.len(), 5);
            for iv in &rep.intervals {
                assert!(
                    iv.low.is_some() && iv.high.is_some(),
                    "{e:?} {:?}: {:?}",
                    iv.method,
                    iv.notes
                );
                assert!(iv.low <= iv.high);
            }
            assert!(rep.se.unwrap() > 0.0);
        }
    }

    #[test]
    fn proportion_reads_yes_no_and_is_clipped() {
        let data = "x\nyes\nno\nyes\nyes\nno\nyes\nyes\nyes\nno\nyes\n";
        let mut r = one(data, Estimate::Proportion);
        r.methods = IntervalMethod::ALL.to_vec();
        let rep = run(&r, &mut |_| true).unwrap();
        assert!((rep.estimate - 0.7).abs() < 1e-12);
        for iv in &rep.intervals {
            if let (Some(l), Some(h)) = (iv.low, iv.high) {
                assert!(
                    (0.0..=1.0).contains(&l) && (0.0..=1.0).contains(&h),
                    "{iv:?}"
                );
            }
        }
        assert_eq!(rep.classical.unwrap().method, Method::ClopperPearson);
        let bad = run(&one("x\nyes\nmaybe\n", Estimate::Proportion), &mut |_| true)
            .err()
            .unwrap();
        assert!(bad.to_string().contains("\"maybe\""), "{bad}");
    }

    #[test]
    fn degenerate_data_get_notes_not_nans() {
        let rep = run(&one("x\n5\n5\n5\n5\n", Estimate::Mean), &mut |_| true).unwrap();
        let iv = &rep.intervals[0];
        assert!(iv.low.is_none() && iv.notes == vec![Note::NoVariation]);
        let mut r = one("x\n5\n5\n5\n5\n", Estimate::Mean);
        r.methods = vec![IntervalMethod::Percentile];
        let rep = run(&r, &mut |_| true).unwrap();
        assert_eq!(rep.intervals[0].low, Some(5.0));
        assert_eq!(rep.intervals[0].notes, vec![Note::ZeroWidth]);
        let r = one("x\n1\n2\n3\n", Estimate::Quantile);
        assert!(run(&r, &mut |_| true)
            .err()
            .unwrap()
            .to_string()
            .contains("Say which quantile"));
        let mut r = one("x\n1\n2\n3\n4\n5\n6\n7\n", Estimate::Quantile);
        r.q = Some(0.95);
        let rep = run(&r, &mut |_| true).unwrap();
        assert!(
            rep.notes
                .iter()
                .any(|n| matches!(n, Note::FewBeyondQuantile { .. })),
            "{:?}",
            rep.notes
        );
    }

    #[test]
    fn paired_and_association_resample_pairs() {
        let data = "before,after\n10,12\n11,12.5\n9,10.2\n13,15\n12,12.9\n10.5,12.1\n";
        let mut r = EstimateRequest::new(
            data.into(),
            EstimateLayout::Groups {
                layout: Layout::Wide {
                    columns: vec!["after".into(), "before".into()],
                },
                first: None,
                second: None,
                paired: true,
            },
            Estimate::MeanDifference,
            1,
        );
        r.methods = vec![IntervalMethod::Studentized, IntervalMethod::Percentile];
        let rep = run(&r, &mut |_| true).unwrap();
        assert!((rep.estimate - (74.7 - 65.5) / 6.0).abs() < 1e-12);
        // Differences all positive: every resampled mean difference is positive.
        assert!(rep.intervals[1].low.unwrap() > 0.0);
        assert_eq!(rep.classical.as_ref().unwrap().method, Method::PairedT);
        let mut r = EstimateRequest::new(
            data.into(),
            EstimateLayout::Pairs {
                x: "before".into(),
                y: "after".into(),
            },
            Estimate::Pearson,
            1,
        );
        r.methods = IntervalMethod::ALL.to_vec();
        let rep = run(&r, &mut |_| true).unwrap();
        assert!(rep.estimate > 0.9);
        for iv in &rep.intervals {
            if let Some(h) = iv.high {
                assert!(h <= 1.0);
            }
        }
    }

    #[test]
    fn wrong_layout_for_the_estimate_says_what_it_needs() {
        let r = one("x\n1\n2\n3\n", Estimate::Pearson);
        let e = run(&r, &mut |_| true).err().unwrap().to_string();
        assert!(e.contains("needs two columns (x and y)"), "{e}");
    }

    #[test]
    fn cliffs_delta_and_superiority_by_definition() {
        // a = [1, 2, 3], b = [2, 4]: pairs a>b: (3,2) = 1; ties: (2,2) = 1; of 6.
        let f = estimator(Estimate::CliffsDelta, 0.5);
        let g = estimator(Estimate::Superiority, 0.5);
        let d = f(&mut [1.0, 2.0, 3.0], &mut [2.0, 4.0]);
        assert!((d - (1.0 / 6.0 - 4.0 / 6.0)).abs() < 1e-12);
        let s = g(&mut [1.0, 2.0, 3.0], &mut [2.0, 4.0]);
        assert!((s - (1.0 / 6.0 + 0.5 / 6.0)).abs() < 1e-12);
    }

    #[test]
    fn one_sided_bounds_and_same_seed_same_result() {
        let data = "x\n3.1\n4.7\n2.2\n5.9\n4.0\n4.0\n7.5\n1.8\n2.9\n3.3\n";
        let mut r = one(data, Estimate::Mean);
        r.side = Side::Lower;
        let a = run(&r, &mut |_| true).unwrap();
        let b = run(&r, &mut |_| true).unwrap();
        assert_eq!(a, b);
        assert!(a.intervals[0].high.is_none() && a.intervals[0].low.is_some());
    }
}

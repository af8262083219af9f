//! Association between two numeric variables: a permutation test that re-pairs y with x
//! (exact over all n! pairings when feasible, in Heap's order with one swap and an O(1) update
//! per step; otherwise random pairings), a bootstrap interval from resampled pairs, and the
//! t-test for r (Fisher z interval) or for the slope as the classical cross-check.

use serde::{Deserialize, Serialize};
use statrs::distribution::{ContinuousCDF, StudentsT};

use super::{Caution, Design, DesignKey, TestOutcome, TestSettings};
use crate::base::*;
use crate::designs::estimate::{self, Estimate};
use crate::input::columns::{self as groups, plural};
use crate::input::table::{self, HeaderChoice};
use crate::num::{normal, stats};
use crate::resample::boot::{Design as Resampling, SeMethod, Stat};
use crate::resample::kendall::{self, Kendall};
pub use crate::resample::pairings::AssocStatistic;
use crate::resample::pairings::{factorial, heap_enumerate, kernel_r, random_block, Kernel};
use crate::resample::summary::histogram;
use crate::resample::{boot, driver};

/// The association design.
pub struct AssociationDesign;

/// Two numeric columns, the statistic and the settings.
#[derive(Clone, Debug, PartialEq, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct AssocRequest {
    /// The table as pasted.
    pub data: String,
    /// Whether the first row holds column names.
    #[serde(default)]
    pub header: HeaderChoice,
    /// The x column.
    pub x: String,
    /// The y column.
    pub y: String,
    /// Pearson's r, Spearman's rho or the least-squares slope.
    pub statistic: AssocStatistic,
    /// The test and interval settings (enumerate all n! pairings up to the limit).
    pub settings: TestSettings,
}

impl AssocRequest {
    /// The defaults the page and the command start from.
    pub fn new(data: String, x: String, y: String, seed: u64) -> AssocRequest {
        AssocRequest {
            data,
            header: HeaderChoice::Detect,
            x,
            y,
            statistic: AssocStatistic::Pearson,
            settings: TestSettings::new(seed),
        }
    }
}

/// What the association analysis found.
#[derive(Clone, Debug, PartialEq, Serialize, Deserialize)]
pub struct AssocReport {
    /// The x column.
    pub x: String,
    /// The y column.
    pub y: String,
    /// Complete (x, y) rows.
    pub n: usize,
    /// What was left out.
    pub notes: Vec<Note>,
    /// The statistic.
    pub statistic: AssocStatistic,
    /// The direction of the test.
    pub alternative: Alternative,
    /// How the two-sided p-value is defined.
    pub two_sided: TwoSidedRule,
    /// The re-pairing test.
    #[serde(flatten)]
    pub test: TestOutcome,
    /// The headline bootstrap interval of the statistic.
    pub ci: Interval,
    /// The headline interval and any further methods.
    pub intervals: Vec<Interval>,
    /// Bootstrap resamples.
    pub bootstrap_resamples: u64,
    /// Bootstrap standard error.
    pub bootstrap_se: Option<f64>,
    /// Mean of the bootstrap values minus the estimate.
    pub bootstrap_bias: Option<f64>,
    /// The bootstrap values, binned.
    pub bootstrap_histogram: Histogram,
    /// The t-test for r (or rho, or the slope): t, df = n − 2.
    pub t: Option<f64>,
    /// Its p-value.
    pub t_p_value: Option<f64>,
    /// Fisher z interval for r (or rho), or the t interval for the slope.
    pub classical_ci: Interval,
    /// Intercept of the least-squares line.
    pub intercept: f64,
    /// Slope of the least-squares line.
    pub slope: f64,
    /// The data, for the scatter plot.
    pub points: Vec<(f64, f64)>,
    /// What to keep in mind.
    pub cautions: Vec<Caution>,
}

impl Design for AssociationDesign {
    const KEY: DesignKey = DesignKey::Association;
    type Request = AssocRequest;
    type Report = AssocReport;

    fn check(req: &AssocRequest) -> Result<(), Error> {
        req.settings.check("pairings")
    }

    fn run(req: &AssocRequest, progress: ProgressFn) -> Result<AssocReport, Error> {
        run(req, progress)
    }

    fn data(req: &AssocRequest) -> &str {
        &req.data
    }

    fn clear_data(req: &mut AssocRequest) {
        req.data.clear();
    }

    fn seed(req: &AssocRequest) -> u64 {
        req.settings.seed
    }

    fn test_settings(req: &mut AssocRequest) -> Option<&mut TestSettings> {
        Some(&mut req.settings)
    }

    fn test_outcome(report: &AssocReport) -> Option<&TestOutcome> {
        Some(&report.test)
    }
}

/// The estimate whose bootstrap the statistic's interval uses (Kendall's tau-b has its own).
fn estimate_of(st: AssocStatistic) -> Option<Estimate> {
    match st {
        AssocStatistic::Pearson => Some(Estimate::Pearson),
        AssocStatistic::Spearman => Some(Estimate::Spearman),
        AssocStatistic::Slope => Some(Estimate::Slope),
        AssocStatistic::Kendall => None,
    }
}

/// Runs an association request.
pub fn run(req: &AssocRequest, progress: ProgressFn) -> Result<AssocReport, Error> {
    AssociationDesign::check(req)?;
    let set = &req.settings;
    let t = table::parse(&req.data, req.header)?;
    let mut notes = t.notes();
    let (x, y) = groups::paired_columns(&t, &req.x, &req.y, &mut notes)?;
    drop(t); // before the resampling (memory on large tables)
    let n = x.len();
    super::check_work_sorted(2 * n, 1, req.statistic == AssocStatistic::Kendall, set)?;
    if n < 3 {
        return Err(Error::data(format!(
            "Only {n} complete (x, y) row{}; an association needs at least 3.",
            plural(n)
        )));
    }
    let vary = |v: &[f64]| v.iter().any(|a| *a != v[0]);
    if !vary(&x) || !vary(&y) {
        return Err(Error::data(format!(
            "Column \"{}\" has the same value in every row, so no association can be measured.",
            if vary(&x) { &req.y } else { &req.x }
        )));
    }
    // Kendall's tau-b is not linear in S: its own kernel (the linear one then serves r).
    let kendall = (req.statistic == AssocStatistic::Kendall).then(|| Kendall::new(&x, &y));
    let linear = match req.statistic {
        AssocStatistic::Kendall => AssocStatistic::Pearson,
        st => st,
    };
    let kernel = Kernel::new(linear, &x, &y);
    let (observed, tol) = match &kendall {
        Some(k) => (
            k.tau_of(&y, &mut vec![0.0; n], &mut vec![0.0; n]),
            k.tolerance(),
        ),
        None => (
            kernel
                .a
                .iter()
                .zip(&kernel.b)
                .map(|(p, q)| p * q)
                .sum::<f64>()
                * kernel.scale,
            crate::resample::pairings::tie_tolerance(&kernel),
        ),
    };
    let pairings = factorial(n);
    let null = driver::Relabelling {
        count: pairings,
        exact_limit: set.exact_limit,
        resamples: set.resamples,
        seed: set.seed,
        stage: Stage::Pairings,
        stop: set.stop(set.alternative, observed, tol),
        block: crate::resample::rng::BLOCK,
    }
    .run(
        progress,
        &mut |cb| match &kendall {
            Some(k) => k.enumerate(observed, tol, cb),
            None => heap_enumerate(&kernel, observed, tol, cb),
        },
        &|s, len| match &kendall {
            Some(k) => k.random_block(observed, tol, s, len),
            None => random_block(&kernel, observed, tol, s, len),
        },
    )?;
    let mut test =
        TestOutcome::from_null(&null, set.alternative, set.two_sided, observed, set.seed);
    let values = &null.values[..];
    // The figure's range is set by the relabelled values and the observed one.
    test.null_histogram = histogram(values, &[observed], 48);

    // Bootstrap of pairs.
    let f: boot::BoxedStat = match estimate_of(req.statistic) {
        Some(e) => estimate::estimator(e, 0.5),
        None => Box::new(|a, b| kendall::tau_b(a, b)),
    };
    let design = Resampling::Pairs { x: &x, y: &y };
    let stat = Stat {
        f: f.as_ref(),
        estimate: observed,
        se: SeMethod::None,
    };
    let methods = set.methods();
    let studentize = methods.contains(&IntervalMethod::Studentized);
    let se_f = estimate_of(req.statistic).and_then(|e| estimate::se_formula(e, false));
    let stat = if studentize {
        Stat {
            se: se_f.as_ref().map_or(SeMethod::Nested(boot::NESTED), |g| {
                SeMethod::Formula(g.as_ref())
            }),
            ..stat
        }
    } else {
        stat
    };
    let (bv, tv) = boot::resample(
        &design,
        &[stat],
        set.seed,
        set.bootstrap_resamples,
        progress,
    )?;
    let finite: Vec<f64> = bv[0].iter().copied().filter(|v| v.is_finite()).collect();
    let se_hat = match stat.se {
        SeMethod::Formula(g) => g(&mut x.clone(), &mut y.clone()),
        SeMethod::Nested(_) => boot::standard_error(&finite).unwrap_or(f64::NAN),
        SeMethod::None => f64::NAN,
    };
    let bounds = match req.statistic {
        AssocStatistic::Slope => None,
        _ => Some((-1.0, 1.0)),
    };
    let f_ref = f.as_ref();
    let effect = super::summarise_bootstrap(
        &methods,
        set.confidence,
        observed,
        &bv[0],
        studentize.then_some((&tv[0][..], se_hat)),
        bounds,
        &mut || boot::acceleration(&design, f_ref),
    );

    // Classical cross-check: t-test with n − 2 df; Fisher z interval for r and rho.
    let nf = n as f64;
    let df = nf - 2.0;
    let r_for_t = match req.statistic {
        AssocStatistic::Slope => kernel_r(&x, &y),
        _ => observed,
    };
    let (tstat, tp) = if req.statistic == AssocStatistic::Kendall {
        // Kendall's normal approximation with the tie-corrected variance of S.
        let (_, z) = kendall::normal_z(&x, &y);
        let p = z.is_finite().then(|| match set.alternative {
            Alternative::TwoSided => (2.0 * normal::cdf(-z.abs())).min(1.0),
            Alternative::Greater => normal::cdf(-z),
            Alternative::Less => normal::cdf(z),
        });
        (z.is_finite().then_some(z), p)
    } else if df > 0.0 && r_for_t.abs() < 1.0 {
        let t = r_for_t * (df / (1.0 - r_for_t * r_for_t)).sqrt();
        let d = StudentsT::new(0.0, 1.0, df).ok();
        let p = d.map(|d| match set.alternative {
            Alternative::TwoSided => (2.0 * d.sf(t.abs())).min(1.0),
            Alternative::Greater => d.sf(t),
            Alternative::Less => d.cdf(t),
        });
        (Some(t), p)
    } else {
        (None, None)
    };
    let mut classical_ci = Interval {
        low: None,
        high: None,
        level: set.confidence,
        method: Method::FisherZ,
        side: Side::TwoSided,
        notes: Vec::new(),
    };
    let zq = normal::quantile(1.0 - (1.0 - set.confidence) / 2.0);
    match req.statistic {
        AssocStatistic::Slope => {
            classical_ci.method = Method::SlopeT;
            if let (Some(g), Ok(d)) = (
                estimate::se_formula(Estimate::Slope, false),
                StudentsT::new(0.0, 1.0, df),
            ) {
                let se = g(&mut x.clone(), &mut y.clone());
                let q = d.inverse_cdf(1.0 - (1.0 - set.confidence) / 2.0);
                if se.is_finite() {
                    classical_ci.low = Some(observed - q * se);
                    classical_ci.high = Some(observed + q * se);
                }
            }
        }
        _ => {
            classical_ci.method = Method::FisherZ;
            // Fisher z of tau-b with variance 0.437/(n − 4) (Fieller, Hartley & Pearson
            // 1957); of r and rho, 1/(n − 3).
            let (var, least) = if req.statistic == AssocStatistic::Kendall {
                (0.437 / (nf - 4.0), 5)
            } else {
                (1.0 / (nf - 3.0), 4)
            };
            if n >= least && observed.abs() < 1.0 {
                let z = observed.atanh();
                let h = zq * var.sqrt();
                classical_ci.low = Some((z - h).tanh());
                classical_ci.high = Some((z + h).tanh());
            } else {
                classical_ci.notes.push(Note::FisherZNeedsMore);
            }
        }
    }
    let (mx, my) = (stats::mean(&x), stats::mean(&y));
    let b = {
        let sxy: f64 = x.iter().zip(&y).map(|(a, c)| (a - mx) * (c - my)).sum();
        let sxx: f64 = x.iter().map(|a| (a - mx) * (a - mx)).sum();
        sxy / sxx
    };
    let mut cautions = vec![Caution::Assumptions, Caution::NotCausation];
    if n < 10 {
        cautions.push(Caution::SmallSample { smallest: n });
    }
    super::closing_cautions(&mut cautions);
    Ok(AssocReport {
        x: req.x.clone(),
        y: req.y.clone(),
        n,
        notes,
        statistic: req.statistic,
        alternative: set.alternative,
        two_sided: set.two_sided,
        test,
        ci: effect.ci(),
        intervals: effect.intervals,
        bootstrap_resamples: set.bootstrap_resamples,
        bootstrap_se: effect.se,
        bootstrap_bias: effect.bias,
        bootstrap_histogram: effect.histogram,
        t: tstat,
        t_p_value: tp,
        classical_ci,
        intercept: my - b * mx,
        slope: b,
        points: x.iter().copied().zip(y.iter().copied()).collect(),
        cautions,
    })
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn heap_enumeration_visits_every_pairing() {
        let x = [1.0, 2.0, 3.5, 4.0, 6.0];
        let y = [2.0, 1.0, 4.0, 3.0, 7.0];
        let k = Kernel::new(AssocStatistic::Pearson, &x, &y);
        let (c, mut v) = heap_enumerate(&k, 0.5, 1e-12, &mut |_| true).unwrap();
        assert_eq!(c.total, 120);
        // Brute force over the 120 permutations of y.
        let mut brute = Vec::new();
        let mut idx = [0usize, 1, 2, 3, 4];
        fn permute(k: usize, idx: &mut [usize; 5], out: &mut Vec<[usize; 5]>) {
            if k == 5 {
                out.push(*idx);
                return;
            }
            for i in k..5 {
                idx.swap(k, i);
                permute(k + 1, idx, out);
                idx.swap(k, i);
            }
        }
        let mut perms = Vec::new();
        permute(0, &mut idx, &mut perms);
        for p in perms {
            let yp: Vec<f64> = p.iter().map(|&i| y[i]).collect();
            brute.push(kernel_r(&x, &yp));
        }
        v.sort_by(f64::total_cmp);
        brute.sort_by(f64::total_cmp);
        for (a, b) in v.iter().zip(&brute) {
            assert!((a - b).abs() < 1e-12);
        }
    }

    #[test]
    fn constant_column_is_a_clear_error() {
        let r = AssocRequest::new("x,y\n1,2\n1,3\n1,4\n".into(), "x".into(), "y".into(), 1);
        assert!(run(&r, &mut |_| true)
            .unwrap_err()
            .to_string()
            .contains("same value in every row"));
    }
}

//! Association between two numeric variables: a permutation test that re-pairs y with x
//! (exact over all n! pairings when feasible, in Heap's order with one swap and an O(1) update
//! per step; otherwise random pairings), a bootstrap interval from resampled pairs, and the
//! t-test for r (Fisher z interval) or for the slope as the classical cross-check.

use serde::{Deserialize, Serialize};
use statrs::distribution::{ContinuousCDF, StudentsT};

use crate::base::format as fmt;
use crate::base::*;
use crate::designs::estimate::{self, Estimate};
use crate::input::columns::{self as groups, plural};
use crate::input::table::{self, HeaderChoice};
use crate::num::{normal, stats};
use crate::resample::boot::{Design, SeMethod, Stat};
pub use crate::resample::pairings::AssocStatistic;
use crate::resample::pairings::{factorial, heap_enumerate, kernel_r, random_block, Kernel};
use crate::resample::rng::RNG_NAME;
use crate::resample::summary::{histogram, tail_region};
use crate::resample::tally::{p_value, TIE_TOLERANCE};
use crate::resample::{boot, driver};

#[derive(Clone, Debug, PartialEq, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct AssocRequest {
    pub format_version: u32,
    pub data: String,
    #[serde(default)]
    pub header: HeaderChoice,
    pub x: String,
    pub y: String,
    pub statistic: AssocStatistic,
    pub alternative: Alternative,
    #[serde(default)]
    pub two_sided: TwoSidedRule,
    pub resamples: u64,
    /// Enumerate all n! pairings when there are at most this many.
    pub exact_limit: u64,
    pub bootstrap_resamples: u64,
    pub confidence: f64,
    pub interval: IntervalMethod,
    pub seed: u64,
}

impl AssocRequest {
    pub fn new(data: String, x: String, y: String, seed: u64) -> AssocRequest {
        AssocRequest {
            format_version: FORMAT_VERSION,
            data,
            header: HeaderChoice::Detect,
            x,
            y,
            statistic: AssocStatistic::Pearson,
            alternative: Alternative::TwoSided,
            two_sided: TwoSidedRule::Absolute,
            resamples: 100_000,
            exact_limit: 1_000_000,
            bootstrap_resamples: 10_000,
            confidence: 0.95,
            interval: IntervalMethod::Bca,
            seed,
        }
    }
}

#[derive(Clone, Debug, PartialEq, Serialize, Deserialize)]
pub struct AssocReport {
    pub format_version: u32,
    pub engine_version: String,
    pub x: String,
    pub y: String,
    pub n: usize,
    pub notes: Vec<Note>,
    pub statistic: AssocStatistic,
    pub statistic_label: String,
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
    pub ci: Interval,
    pub bootstrap_resamples: u64,
    pub bootstrap_se: Option<f64>,
    /// The t-test for r (or rho, or the slope): t, df = n − 2, p.
    pub t: Option<f64>,
    pub t_p_value: Option<f64>,
    /// Fisher z interval for r (or rho), or the t interval for the slope.
    pub classical_ci: Interval,
    pub intercept: f64,
    pub slope: f64,
    /// The data, for the scatter plot.
    pub points: Vec<(f64, f64)>,
    pub null_histogram: Histogram,
    pub tail: Tail,
    pub bootstrap_histogram: Histogram,
    pub finding: String,
    pub cautions: Vec<String>,
}

/// The estimate whose bootstrap the statistic's interval uses.
fn estimate_of(st: AssocStatistic) -> Estimate {
    match st {
        AssocStatistic::Pearson => Estimate::Pearson,
        AssocStatistic::Spearman => Estimate::Spearman,
        AssocStatistic::Slope => Estimate::Slope,
    }
}

pub fn run(req: &AssocRequest, progress: ProgressFn) -> Result<AssocReport, RunError> {
    super::check_common(
        req.format_version,
        req.confidence,
        req.resamples,
        req.bootstrap_resamples,
        "pairings",
    )?;
    let t = table::parse(&req.data, req.header)?;
    let mut notes = Vec::new();
    let (x, y) = groups::paired_columns(&t, &req.x, &req.y, &mut notes)?;
    let n = x.len();
    if n < 3 {
        return Err(RunError::Input(format!(
            "Only {n} complete (x, y) row{}; an association needs at least 3.",
            plural(n)
        )));
    }
    let vary = |v: &[f64]| v.iter().any(|a| *a != v[0]);
    if !vary(&x) || !vary(&y) {
        return Err(RunError::Input(format!(
            "Column \"{}\" has the same value in every row, so no association can be measured.",
            if vary(&x) { &req.y } else { &req.x }
        )));
    }
    let kernel = Kernel::new(req.statistic, &x, &y);
    let observed = kernel
        .a
        .iter()
        .zip(&kernel.b)
        .map(|(p, q)| p * q)
        .sum::<f64>()
        * kernel.scale;
    // Ties: relative to the largest value the statistic can take (1 for r and rho; for the
    // slope sqrt(Σb²/Σa²), the slope of a perfect fit).
    let most = match req.statistic {
        AssocStatistic::Slope => (kernel.b.iter().map(|v| v * v).sum::<f64>()
            / kernel.a.iter().map(|v| v * v).sum::<f64>())
        .sqrt(),
        _ => 1.0,
    };
    let tol = TIE_TOLERANCE * most.max(observed.abs());
    let pairings = factorial(n);
    let (counts, values, exact) = driver::Relabelling {
        count: pairings,
        exact_limit: req.exact_limit,
        resamples: req.resamples,
        seed: req.seed,
        stage: "pairings",
    }
    .run(
        progress,
        &mut |cb| heap_enumerate(&kernel, observed, tol, cb),
        &mut |s, len| random_block(&kernel, observed, tol, s, len),
    )?;
    let pr = p_value(&counts, exact, req.alternative, req.two_sided);

    // Bootstrap of pairs.
    let f = estimate::estimator(estimate_of(req.statistic), 0.5);
    let design = Design::Pairs { x: &x, y: &y };
    let stat = Stat {
        f: f.as_ref(),
        estimate: observed,
        se: SeMethod::None,
    };
    let studentize = req.interval == IntervalMethod::Studentized;
    let se_f = estimate::se_formula(estimate_of(req.statistic), false);
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
        req.seed,
        req.bootstrap_resamples,
        progress,
    )?;
    let finite: Vec<f64> = bv[0].iter().copied().filter(|v| v.is_finite()).collect();
    let t_finite: Vec<f64> = tv[0].iter().copied().filter(|v| v.is_finite()).collect();
    let se_hat = match stat.se {
        SeMethod::Formula(g) => g(&mut x.clone(), &mut y.clone()),
        SeMethod::Nested(_) => boot::standard_error(&finite).unwrap_or(f64::NAN),
        SeMethod::None => f64::NAN,
    };
    let bounds = match req.statistic {
        AssocStatistic::Slope => None,
        _ => Some((-1.0, 1.0)),
    };
    let summary = boot::Summary {
        estimate: observed,
        boot: &finite,
        t: studentize.then_some((&t_finite[..], se_hat)),
        bounds,
    };
    let f_ref = f.as_ref();
    let ci = boot::interval_by(
        req.interval,
        req.confidence,
        Side::TwoSided,
        &summary,
        &mut || boot::acceleration(&design, f_ref),
    );

    // Classical cross-check: t-test with n − 2 df; Fisher z interval for r and rho.
    let nf = n as f64;
    let df = nf - 2.0;
    let r_for_t = match req.statistic {
        AssocStatistic::Slope => kernel_r(&x, &y),
        _ => observed,
    };
    let (tstat, tp) = if df > 0.0 && r_for_t.abs() < 1.0 {
        let t = r_for_t * (df / (1.0 - r_for_t * r_for_t)).sqrt();
        let d = StudentsT::new(0.0, 1.0, df).ok();
        let p = d.map(|d| match req.alternative {
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
        level: req.confidence,
        method: Method::FisherZ,
        side: Side::TwoSided,
        notes: Vec::new(),
    };
    let zq = normal::quantile(1.0 - (1.0 - req.confidence) / 2.0);
    match req.statistic {
        AssocStatistic::Slope => {
            classical_ci.method = Method::SlopeT;
            if let (Some(g), Ok(d)) = (
                estimate::se_formula(Estimate::Slope, false),
                StudentsT::new(0.0, 1.0, df),
            ) {
                let se = g(&mut x.clone(), &mut y.clone());
                let q = d.inverse_cdf(1.0 - (1.0 - req.confidence) / 2.0);
                if se.is_finite() {
                    classical_ci.low = Some(observed - q * se);
                    classical_ci.high = Some(observed + q * se);
                }
            }
        }
        _ => {
            classical_ci.method = Method::FisherZ;
            if n > 3 && observed.abs() < 1.0 {
                let z = observed.atanh();
                let h = zq / (nf - 3.0).sqrt();
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
    let tail = tail_region(req.alternative, req.two_sided, &counts, observed);
    let null_histogram = histogram(&values, &[observed], 48);
    let mut bm = vec![observed];
    bm.extend(ci.low);
    bm.extend(ci.high);
    let bootstrap_histogram = histogram(&finite, &bm, 48);
    let mut report = AssocReport {
        format_version: FORMAT_VERSION,
        engine_version: ENGINE_VERSION.into(),
        x: req.x.clone(),
        y: req.y.clone(),
        n,
        notes,
        statistic: req.statistic,
        statistic_label: req.statistic.label().into(),
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
        ci,
        bootstrap_resamples: req.bootstrap_resamples,
        bootstrap_se: boot::standard_error(&finite),
        t: tstat,
        t_p_value: tp,
        classical_ci,
        intercept: my - b * mx,
        slope: b,
        points: x.iter().copied().zip(y.iter().copied()).collect(),
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

fn finding(r: &AssocReport) -> String {
    let d = match (r.ci.low, r.ci.high) {
        (Some(l), Some(h)) if h > l => fmt::decimals_for(h - l),
        _ => 2,
    };
    let mut s = match r.statistic {
        AssocStatistic::Slope => format!(
            "{} rose by {} per unit of {} (least-squares slope",
            r.y,
            fmt::fixed(r.observed, d),
            r.x
        ),
        _ => format!(
            "The {} between {} and {} was {}",
            r.statistic_label,
            r.x,
            r.y,
            fmt::fixed(r.observed, d)
        ),
    };
    if let (Some(l), Some(h)) = (r.ci.low, r.ci.high) {
        let sep = if r.statistic == AssocStatistic::Slope {
            "; "
        } else {
            " ("
        };
        s.push_str(&format!("{sep}{}", fmt::ci(r.ci.level, l, h, d)));
    }
    s.push(')');
    if r.statistic != AssocStatistic::Slope && r.ci.low.is_none() {
        s.pop();
    }
    let how = match (r.alternative, r.two_sided) {
        (Alternative::TwoSided, TwoSidedRule::Absolute) => {
            "at least this strong in either direction"
        }
        (Alternative::TwoSided, TwoSidedRule::DoubledTail) => {
            "at least this strong in the observed direction"
        }
        (Alternative::Greater, _) => "at least this large",
        (Alternative::Less, _) => "at least this small",
    };
    let kind = if r.exact { "of all" } else { "of" };
    let which = if r.exact {
        "possible pairings"
    } else {
        "random pairings"
    };
    s.push_str(&format!(
        "; an association {how} arose in {} {kind} {} {which} of the two columns ({}{}).",
        fmt::count(r.extreme_count),
        fmt::count(r.resamples),
        if r.exact { "exact " } else { "" },
        fmt::p_value(r.p_value)
    ));
    s
}

fn cautions(r: &AssocReport) -> Vec<String> {
    let mut c = vec![
        "What the test assumes: the (x, y) rows are independent of each other, and if there were no association every re-pairing of y with x would have been as likely as the observed one.".to_string(),
        "Correlation is not causation: a third variable, or the way the units were chosen, can produce an association. r and the slope describe only the straight-line part of a relation; look at the scatter plot.".to_string(),
    ];
    if r.n < 10 {
        c.push(format!("Small sample ({} pairs): the estimate is unstable and bootstrap intervals tend to be too narrow (Hesterberg 2015).", r.n));
    }
    c.push("A p-value is not the strength of an association; read it with the interval. With several tests on the same data, adjust for their number.".into());
    c.push("Clinical, safety or regulatory decisions need a qualified statistician and the guidelines that apply to them.".into());
    c
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

//! Running a request: the two-group analysis from table to report.

use super::boot::{self, TwoSampleFn};
use super::classical;
use super::combin::choose;
use super::format as fmt;
use super::groups::{self, TwoGroups};
use super::perm::{self, Counts, Setup};
use super::protocol::Side;
use super::protocol::*;
use super::rng::{self, RNG_NAME};
use super::stats;
use super::table;

/// Why a run produced no report.
#[derive(Clone, Debug, PartialEq)]
pub enum RunError {
    /// Something about the data or the settings; the message says what and what to do.
    Input(String),
    /// The caller asked to stop.
    Cancelled,
}

impl std::fmt::Display for RunError {
    fn fmt(&self, f: &mut std::fmt::Formatter<'_>) -> std::fmt::Result {
        match self {
            RunError::Input(m) => f.write_str(m),
            RunError::Cancelled => f.write_str("The analysis was stopped."),
        }
    }
}

impl From<table::TableError> for RunError {
    fn from(e: table::TableError) -> Self {
        RunError::Input(e.0)
    }
}

/// Callback for progress; return false to stop the run.
pub type ProgressFn<'a> = &'a mut dyn FnMut(&Progress) -> bool;

fn check_settings(req: &Request) -> Result<(), RunError> {
    let bad = |m: String| Err(RunError::Input(m));
    if req.format_version != FORMAT_VERSION {
        return bad(format!(
            "This analysis was saved in format version {}, but this version of Reshuffle reads \
             version {FORMAT_VERSION}. Open it with a matching version, or re-enter the settings.",
            req.format_version
        ));
    }
    if req.resamples < 99 || req.resamples > MAX_RESAMPLES {
        return bad(format!(
            "The number of random relabellings must be between 99 and {} (it is {}).",
            fmt::count(MAX_RESAMPLES),
            fmt::count(req.resamples)
        ));
    }
    if req.bootstrap_resamples < 200 || req.bootstrap_resamples > MAX_BOOTSTRAP {
        return bad(format!(
            "The number of bootstrap resamples must be between 200 and {} (it is {}).",
            fmt::count(MAX_BOOTSTRAP),
            fmt::count(req.bootstrap_resamples)
        ));
    }
    if req.exact_limit > MAX_EXACT_LIMIT {
        return bad(format!(
            "The limit for exact enumeration can be at most {} (it is {}).",
            fmt::count(MAX_EXACT_LIMIT),
            fmt::count(req.exact_limit)
        ));
    }
    if !(req.confidence > 0.5 && req.confidence < 1.0) || req.confidence > 0.9999 {
        return bad(format!(
            "The confidence level must be between 0.5 and 0.9999, for example 0.95 (it is {}).",
            req.confidence
        ));
    }
    Ok(())
}

/// Settings every permutation design checks: format version, confidence level, and the
/// numbers of random resamples (called `unit`, e.g. "sign patterns") and bootstrap resamples.
pub fn check_common(
    version: u32,
    confidence: f64,
    resamples: u64,
    bootstrap: u64,
    unit: &str,
) -> Result<(), RunError> {
    if version != FORMAT_VERSION {
        return Err(RunError::Input(format!(
            "Format version {version} cannot be read by this version (reads {FORMAT_VERSION})."
        )));
    }
    if !(confidence > 0.5 && confidence <= 0.9999) {
        return Err(RunError::Input(format!(
            "The confidence level must be between 0.5 and 0.9999 (it is {confidence})."
        )));
    }
    if !(99..=MAX_RESAMPLES).contains(&resamples) || !(200..=MAX_BOOTSTRAP).contains(&bootstrap) {
        return Err(RunError::Input(format!(
            "Use 99 to {} random {unit} and 200 to {} bootstrap resamples.",
            fmt::count(MAX_RESAMPLES),
            fmt::count(MAX_BOOTSTRAP)
        )));
    }
    Ok(())
}

/// The relabelling part: counts and all statistics, exact or by random blocks.
pub struct NullDistribution {
    pub counts: Counts,
    pub values: Vec<f64>,
    pub exact: bool,
}

/// Runs random relabelling blocks `blocks` (a range of block indices) and merges them in
/// order. Any partition of the blocks into ranges, merged in order, gives the same result.
pub fn random_blocks(
    setup: &Setup,
    seed: u64,
    total: u64,
    blocks: std::ops::Range<u64>,
    progress: ProgressFn,
) -> Result<(Counts, Vec<f64>), RunError> {
    let mut counts = Counts::default();
    let mut values = Vec::new();
    let streams = rng::Streams::new(seed, rng::Purpose::Permutation, blocks.start);
    for (b, stream) in blocks.zip(streams) {
        let (c, v) = setup.random_block(stream, rng::block_len(total, b));
        counts.add(&c);
        values.extend_from_slice(&v);
        let p = Progress {
            stage: "relabelling".into(),
            done: counts.total,
            total,
        };
        if !progress(&p) {
            return Err(RunError::Cancelled);
        }
    }
    Ok((counts, values))
}

pub fn null_distribution(
    setup: &Setup,
    req: &Request,
    progress: ProgressFn,
) -> Result<NullDistribution, RunError> {
    let n = (setup.n1 + setup.n2) as u64;
    let splits = choose(n, setup.k as u64);
    if splits <= req.exact_limit {
        let mut cb = |done: u64| {
            progress(&Progress {
                stage: "relabelling".into(),
                done,
                total: splits,
            })
        };
        let (counts, values) = setup
            .enumerate(rng::BLOCK, &mut cb)
            .ok_or(RunError::Cancelled)?;
        Ok(NullDistribution {
            counts,
            values,
            exact: true,
        })
    } else {
        let total = req.resamples;
        let (counts, values) =
            random_blocks(setup, req.seed, total, 0..rng::block_count(total), progress)?;
        Ok(NullDistribution {
            counts,
            values,
            exact: false,
        })
    }
}

/// p-value and its Monte Carlo error.
pub struct PResult {
    pub p: f64,
    pub extreme: u64,
    pub mc_se: Option<f64>,
    pub interval: Option<PInterval>,
}

pub fn p_value(c: &Counts, exact: bool, alt: Alternative, rule: TwoSidedRule) -> PResult {
    let m = c.total;
    let one = |b: u64| -> (f64, Option<f64>, Option<(f64, f64)>) {
        if exact {
            (b as f64 / m as f64, None, None)
        } else {
            let p = (b + 1) as f64 / (m + 1) as f64;
            let se = (p * (1.0 - p) / m as f64).sqrt();
            (p, Some(se), Some(classical::clopper_pearson(b, m, 0.99)))
        }
    };
    let (b, doubled) = match (alt, rule) {
        (Alternative::Greater, _) => (c.ge, false),
        (Alternative::Less, _) => (c.le, false),
        (Alternative::TwoSided, TwoSidedRule::Absolute) => (c.abs_ge, false),
        (Alternative::TwoSided, TwoSidedRule::DoubledTail) => (c.ge.min(c.le), true),
    };
    let (p, se, iv) = one(b);
    let f = if doubled { 2.0 } else { 1.0 };
    PResult {
        p: (f * p).min(1.0),
        extreme: b,
        mc_se: se.map(|s| f * s),
        interval: iv.map(|(lo, hi)| PInterval {
            low: (f * lo).min(1.0),
            high: (f * hi).min(1.0),
            level: 0.99,
        }),
    }
}

fn effect_fn(st: Statistic) -> TwoSampleFn {
    match st.effect() {
        Statistic::MedianDifference => |a, b| stats::median_select(a) - stats::median_select(b),
        Statistic::TrimmedMeanDifference => {
            |a, b| stats::trimmed_mean_select(a) - stats::trimmed_mean_select(b)
        }
        _ => |a, b| stats::mean(a) - stats::mean(b),
    }
}

/// Leave-one-out values of the effect for each group, in O(n log n).
fn effect_leave_one_out(st: Statistic, a: &[f64], b: &[f64]) -> [Vec<f64>; 2] {
    use stats::LooKind;
    let kind = match st.effect() {
        Statistic::MedianDifference => LooKind::Median,
        Statistic::TrimmedMeanDifference => LooKind::TrimmedMean,
        _ => LooKind::Mean,
    };
    let full = |x: &[f64]| match kind {
        LooKind::Median => stats::median(x),
        LooKind::TrimmedMean => stats::trimmed_mean(x),
        LooKind::Mean => stats::mean(x),
    };
    let (fa, fb) = (full(a), full(b));
    [
        stats::leave_one_out(kind, a)
            .into_iter()
            .map(|v| v - fb)
            .collect(),
        stats::leave_one_out(kind, b)
            .into_iter()
            .map(|v| fa - v)
            .collect(),
    ]
}

/// Leave-one-out values of Hedges' g for each group, in O(n) from running sums.
fn hedges_leave_one_out(a: &[f64], b: &[f64]) -> [Vec<f64>; 2] {
    // Centre each group at its mean so the sums of squares stay accurate.
    let moments = |x: &[f64]| {
        let m = stats::mean(x);
        let s: f64 = x.iter().map(|v| v - m).sum();
        let q: f64 = x.iter().map(|v| (v - m) * (v - m)).sum();
        (m, s, q, x.len() as f64)
    };
    let g_from = |(ma, sa, qa, na): (f64, f64, f64, f64),
                  (mb, sb, qb, nb): (f64, f64, f64, f64)| {
        let (ca, cb) = (sa / na, sb / nb);
        let ssa = qa - sa * ca;
        let ssb = qb - sb * cb;
        let df = na + nb - 2.0;
        let sp = ((ssa + ssb) / df).sqrt();
        (ma + ca - mb - cb) / sp * stats::hedges_j(df)
    };
    let (ma, mb) = (moments(a), moments(b));
    let loo = |x: &[f64], mom: (f64, f64, f64, f64)| -> Vec<(f64, f64, f64, f64)> {
        x.iter()
            .map(|v| {
                let d = v - mom.0;
                (mom.0, mom.1 - d, mom.2 - d * d, mom.3 - 1.0)
            })
            .collect()
    };
    [
        loo(a, ma).into_iter().map(|m| g_from(m, mb)).collect(),
        loo(b, mb).into_iter().map(|m| g_from(ma, m)).collect(),
    ]
}

/// Standard error of the effect for the studentized interval: Welch's for a difference in
/// means, Yuen's for a difference in trimmed means, a nested bootstrap for medians.
fn effect_se(st: Statistic) -> boot::SeMethod<'static> {
    match st.effect() {
        Statistic::MedianDifference => boot::SeMethod::Nested(boot::NESTED),
        Statistic::TrimmedMeanDifference => boot::SeMethod::Formula(&|a, b| {
            (stats::trimmed_mean_se2(a) + stats::trimmed_mean_se2(b)).sqrt()
        }),
        _ => boot::SeMethod::Formula(&|a, b| {
            (stats::variance(a) / a.len() as f64 + stats::variance(b) / b.len() as f64).sqrt()
        }),
    }
}

/// Bootstrap values and studentized t values, one list per statistic.
pub type Resampled = (Vec<Vec<f64>>, Vec<Vec<f64>>);

/// Runs the bootstrap in blocks with progress; returns values and t values per statistic.
pub fn resample(
    design: &boot::Design,
    stats_: &[boot::Stat],
    seed: u64,
    total: u64,
    progress: ProgressFn,
) -> Result<Resampled, RunError> {
    let mut values: Vec<Vec<f64>> = stats_
        .iter()
        .map(|_| Vec::with_capacity(total as usize))
        .collect();
    let mut tvals: Vec<Vec<f64>> = stats_.iter().map(|_| Vec::new()).collect();
    let streams = rng::Streams::new(seed, rng::Purpose::Bootstrap, 0);
    let mut done = 0;
    for (blk, stream) in (0..rng::block_count(total)).zip(streams) {
        let out = boot::block(design, stats_, stream, rng::block_len(total, blk));
        for (k, (v, t)) in out.values.into_iter().zip(out.t).enumerate() {
            values[k].extend(v);
            tvals[k].extend(t);
        }
        done += rng::block_len(total, blk);
        let p = Progress {
            stage: "bootstrap".into(),
            done,
            total,
        };
        if !progress(&p) {
            return Err(RunError::Cancelled);
        }
    }
    Ok((values, tvals))
}

fn hedges_fn(a: &mut [f64], b: &mut [f64]) -> f64 {
    stats::hedges_g(a, b)
}

/// Equal-width histogram over the finite values, widened to include `mark` values.
pub fn histogram(values: &[f64], marks: &[f64], bins: usize) -> Histogram {
    let finite = values.iter().copied().filter(|v| v.is_finite());
    let (mut lo, mut hi) = finite
        .clone()
        .fold((f64::INFINITY, f64::NEG_INFINITY), |(l, h), v| {
            (l.min(v), h.max(v))
        });
    for &m in marks.iter().filter(|m| m.is_finite()) {
        lo = lo.min(m);
        hi = hi.max(m);
    }
    if !lo.is_finite() {
        return Histogram {
            edges: vec![],
            counts: vec![],
            weights: None,
        };
    }
    if hi - lo <= 0.0 {
        let w = if lo == 0.0 { 1.0 } else { lo.abs() * 0.01 };
        lo -= w;
        hi += w;
    }
    let mut width = (hi - lo) / bins as f64;
    let mut bins = bins;
    // Put the first mark (the observed value) on a bin edge, so that no bar straddles the
    // boundary of the region counted toward p.
    if let Some(&m) = marks.first().filter(|m| m.is_finite()) {
        let below = ((m - lo) / width).ceil();
        let start = m - below * width;
        let above = ((hi - m) / width).ceil().max(1.0);
        lo = start;
        bins = (below + above) as usize;
        hi = lo + width * bins as f64;
        width = (hi - lo) / bins as f64;
    }
    let edges: Vec<f64> = (0..=bins).map(|i| lo + width * i as f64).collect();
    let mut counts = vec![0u64; bins];
    for v in finite {
        let i = (((v - lo) / width).max(0.0) as usize).min(bins - 1);
        counts[i] += 1;
    }
    Histogram {
        edges,
        counts,
        weights: None,
    }
}

/// The part of the null distribution counted toward the p-value, for the plot: the side of
/// the observed value for a doubled tail, both sides beyond |t| for the absolute rule.
pub fn tail_region(alt: Alternative, rule: TwoSidedRule, counts: &Counts, observed: f64) -> Tail {
    let upper = Tail {
        low: None,
        high: Some(observed),
    };
    let lower = Tail {
        low: Some(observed),
        high: None,
    };
    match (alt, rule) {
        (Alternative::Greater, _) => upper,
        (Alternative::Less, _) => lower,
        (Alternative::TwoSided, TwoSidedRule::Absolute) => Tail {
            low: Some(-observed.abs()),
            high: Some(observed.abs()),
        },
        (Alternative::TwoSided, TwoSidedRule::DoubledTail) => {
            if counts.ge <= counts.le {
                upper
            } else {
                lower
            }
        }
    }
}

/// Size, centre and spread of one group (at least one value).
pub fn group_summary(name: &str, x: &[f64]) -> GroupSummary {
    let s = stats::sorted(x);
    GroupSummary {
        name: name.to_string(),
        n: x.len(),
        mean: stats::mean(x),
        median: stats::median_sorted(&s),
        sd: stats::sd(x),
        trimmed_mean: stats::trimmed_mean_sorted(&s),
        min: s[0],
        max: s[s.len() - 1],
    }
}

/// Runs the analysis a request describes.
pub fn run(req: &Request, progress: ProgressFn) -> Result<Report, RunError> {
    check_settings(req)?;
    let table = table::parse(&req.data, req.header)?;
    let g = groups::two_groups(&table, req)?;
    two_group_report(req, g, progress)
}

fn two_group_report(req: &Request, g: TwoGroups, progress: ProgressFn) -> Result<Report, RunError> {
    let (a, b) = (&g.a, &g.b);
    let mut notes = g.notes.clone();
    let st = req.statistic;
    let setup = Setup::new(st, a, b);
    let null = null_distribution(&setup, req, progress)?;
    let pr = p_value(&null.counts, null.exact, req.alternative, req.two_sided);
    let observed = perm::statistic_value(st, a, b);

    // Bootstrap, within each group.
    let effect_st = st.effect();
    let effect = perm::statistic_value(effect_st, a, b);
    let g_est = stats::hedges_g(a, b);
    let mut methods = vec![req.interval];
    for m in &req.more_intervals {
        if !methods.contains(m) {
            methods.push(*m);
        }
    }
    let studentize = methods.contains(&IntervalMethod::Studentized);
    let design = boot::Design::Two { a, b };
    let effect_f = effect_fn(st);
    let effect_stat = boot::Stat {
        f: &effect_f,
        estimate: effect,
        se: if studentize {
            effect_se(st)
        } else {
            boot::SeMethod::None
        },
    };
    let g_stat = boot::Stat {
        f: &hedges_fn,
        estimate: g_est,
        se: boot::SeMethod::None,
    };
    let total_b = req.bootstrap_resamples;
    let (values, tvals) = resample(&design, &[effect_stat, g_stat], req.seed, total_b, progress)?;
    let (boot_effect, boot_g) = (&values[0], &values[1]);
    let t_finite: Vec<f64> = tvals[0].iter().copied().filter(|v| v.is_finite()).collect();
    let se_hat = match effect_stat.se {
        boot::SeMethod::Formula(f) => f(&mut a.clone(), &mut b.clone()),
        boot::SeMethod::Nested(_) => boot::standard_error(boot_effect).unwrap_or(f64::NAN),
        boot::SeMethod::None => f64::NAN,
    };
    let summary = boot::Summary {
        estimate: effect,
        boot: boot_effect,
        t: studentize.then_some((&t_finite[..], se_hat)),
        bounds: None,
    };
    let mut effect_accel = || {
        (
            boot::acceleration_from_loo(&effect_leave_one_out(st, a, b)),
            false,
        )
    };
    let intervals: Vec<Interval> = methods
        .iter()
        .map(|&m| {
            boot::interval_by(
                m,
                req.confidence,
                Side::TwoSided,
                &summary,
                &mut effect_accel,
            )
        })
        .collect();
    let ci = intervals[0].clone();
    let g_finite: Vec<f64> = boot_g.iter().copied().filter(|v| v.is_finite()).collect();
    // Hedges' g has no simple standard error here: a studentized headline uses BCa for g.
    let g_method = if req.interval == IntervalMethod::Studentized {
        IntervalMethod::Bca
    } else {
        req.interval
    };
    let g_ci = if g_est.is_finite() {
        let gs = boot::Summary {
            estimate: g_est,
            boot: &g_finite,
            t: None,
            bounds: None,
        };
        let mut g_accel = || {
            (
                boot::acceleration_from_loo(&hedges_leave_one_out(a, b)),
                false,
            )
        };
        let mut iv = boot::interval_by(g_method, req.confidence, Side::TwoSided, &gs, &mut g_accel);
        let dropped = boot_g.len() - g_finite.len();
        if dropped > 0 {
            let extra = format!(
                "{} bootstrap resample{} had no spread in either group and {} left out.",
                fmt::count(dropped as u64),
                groups::plural(dropped),
                if dropped == 1 { "was" } else { "were" }
            );
            iv.note = Some(match iv.note {
                Some(n) => format!("{n} {extra}"),
                None => extra,
            });
        }
        iv
    } else {
        Interval {
            low: None,
            high: None,
            level: req.confidence,
            method: g_method.key().into(),
            side: Side::TwoSided,
            note: Some("Hedges' g is undefined: neither group varies.".into()),
        }
    };
    let welch = classical::welch(a, b, req.alternative, req.confidence);

    let groups_out = vec![group_summary(&g.names[0], a), group_summary(&g.names[1], b)];

    let tail = tail_region(req.alternative, req.two_sided, &null.counts, observed);
    let mut marks = vec![observed];
    if let Some(l) = tail.low {
        marks.push(l);
    }
    if let Some(h) = tail.high {
        marks.push(h);
    }
    let null_histogram = histogram(&null.values, &marks, 48);
    let mut bmarks = vec![effect];
    bmarks.extend(ci.low);
    bmarks.extend(ci.high);
    let bootstrap_histogram = histogram(boot_effect, &bmarks, 48);
    let infinite = null.values.iter().filter(|v| !v.is_finite()).count();
    if infinite > 0 {
        notes.push(format!(
            "{} relabelling{} put only identical values in both groups, giving an infinite t; \
             {} counted but not plotted.",
            fmt::count(infinite as u64),
            groups::plural(infinite),
            if infinite == 1 { "it is" } else { "they are" }
        ));
    }
    if req.bootstrap_resamples < 2000 && req.interval == IntervalMethod::Bca {
        notes.push(
            "BCa limits rest on the outer bootstrap values; 2,000 or more bootstrap resamples \
             are commonly recommended (common practice)."
                .into(),
        );
    }

    let mut report = Report {
        format_version: FORMAT_VERSION,
        engine_version: ENGINE_VERSION.into(),
        design: "two-groups".into(),
        layout: g.layout.clone(),
        value_label: g.value_label.clone(),
        groups: groups_out,
        notes,
        statistic: st,
        statistic_label: st.label().into(),
        alternative: req.alternative,
        two_sided: req.two_sided,
        observed,
        p_value: pr.p,
        exact: null.exact,
        resamples: null.counts.total,
        extreme_count: pr.extreme,
        mc_se: pr.mc_se,
        p_interval: pr.interval,
        seed: req.seed,
        rng: RNG_NAME.into(),
        effect_label: effect_st.label().into(),
        effect,
        ci,
        intervals,
        bootstrap_resamples: total_b,
        bootstrap_se: boot::standard_error(boot_effect),
        bootstrap_bias: (!boot_effect.is_empty()).then(|| stats::mean(boot_effect) - effect),
        welch,
        hedges_g: EffectSize {
            name: "Hedges' g".into(),
            estimate: g_est.is_finite().then_some(g_est),
            ci: g_ci,
        },
        null_histogram,
        tail,
        bootstrap_histogram,
        finding: String::new(),
        cautions: Vec::new(),
        null_values: None,
        bootstrap_values: None,
    };
    if req.keep_resamples {
        let keep = |v: &[f64]| v[..v.len().min(MAX_KEPT)].to_vec();
        report.null_values = Some(keep(&null.values));
        report.bootstrap_values = Some(keep(boot_effect));
        if null.values.len() > MAX_KEPT {
            report.notes.push(format!(
                "Only the first {} relabelled statistics are kept for download.",
                fmt::count(MAX_KEPT as u64)
            ));
        }
    }
    report.finding = super::finding::sentence(&report);
    report.cautions = super::finding::cautions(&report);
    Ok(report)
}

#[cfg(test)]
mod tests {
    use super::*;

    fn demo_request() -> Request {
        let data = "y,g\n5.1,a\n4.8,a\n6.0,a\n5.6,a\n5.9,a\n6.3,a\n5.2,a\n4.9,a\n6.1,a\n5.5,a\n5.8,a\n6.4,a\n\
                    4.2,b\n4.9,b\n5.0,b\n4.4,b\n4.7,b\n5.3,b\n4.1,b\n4.6,b\n5.1,b\n4.3,b\n4.8,b\n5.4,b\n";
        let mut r = Request::new(data.into(), 2024);
        r.resamples = 20_000;
        r.bootstrap_resamples = 2_000;
        r
    }

    #[test]
    fn partitions_of_blocks_give_identical_results() {
        let r = demo_request();
        let t = table::parse(&r.data, r.header).unwrap();
        let g = groups::two_groups(&t, &r).unwrap();
        for st in Statistic::ALL {
            let s = Setup::new(st, &g.a, &g.b);
            let total = 20_000;
            let nb = rng::block_count(total);
            let all = random_blocks(&s, 9, total, 0..nb, &mut |_| true).unwrap();
            // Three workers taking uneven shares, merged in block order.
            let mut counts = Counts::default();
            let mut values = Vec::new();
            for range in [0..1, 1..4, 4..nb] {
                let (c, v) = random_blocks(&s, 9, total, range, &mut |_| true).unwrap();
                counts.add(&c);
                values.extend(v);
            }
            assert_eq!(counts, all.0);
            assert_eq!(values, all.1);
        }
    }

    #[test]
    fn same_seed_same_report_and_cancel_works() {
        let r = demo_request();
        let a = run(&r, &mut |_| true).unwrap();
        let b = run(&r, &mut |_| true).unwrap();
        assert_eq!(a, b);
        let mut calls = 0;
        let c = run(&r, &mut |_| {
            calls += 1;
            calls < 2
        });
        assert_eq!(c, Err(RunError::Cancelled));
    }

    #[test]
    fn p_value_is_in_unit_interval_and_groups_swap() {
        // 8 + 8 values: C(16, 8) = 12,870 splits, enumerated exactly, so swapping the groups
        // and the direction must give exactly the same p-value.
        let mut r = demo_request();
        r.data = "y,g\n5.1,a\n4.8,a\n6.0,a\n5.6,a\n5.9,a\n6.3,a\n5.2,a\n4.9,a\n\
                  4.2,b\n4.9,b\n5.0,b\n4.4,b\n4.7,b\n5.3,b\n4.1,b\n4.6,b\n"
            .into();
        for st in Statistic::ALL {
            r.statistic = st;
            r.first = None;
            r.alternative = Alternative::Greater;
            let ab = run(&r, &mut |_| true).unwrap();
            assert!(ab.exact);
            r.first = Some("b".into());
            r.alternative = Alternative::Less;
            let ba = run(&r, &mut |_| true).unwrap();
            assert!(ab.p_value > 0.0 && ab.p_value <= 1.0);
            assert!((ab.observed + ba.observed).abs() < 1e-12, "{st:?}");
            assert_eq!(ab.extreme_count, ba.extreme_count, "{st:?}");
            assert_eq!(ab.p_value, ba.p_value, "{st:?}");
            r.alternative = Alternative::Greater;
            let ba_g = run(&r, &mut |_| true).unwrap();
            assert!(ba_g.p_value > 0.5, "{st:?}: {}", ba_g.p_value);
            // Monte Carlo with the groups swapped agrees within its error.
            r.exact_limit = 0;
            r.first = None;
            let mc_ab = run(&r, &mut |_| true).unwrap();
            r.first = Some("b".into());
            r.alternative = Alternative::Less;
            let mc_ba = run(&r, &mut |_| true).unwrap();
            let se = mc_ab.mc_se.unwrap().hypot(mc_ba.mc_se.unwrap());
            assert!(
                (mc_ab.p_value - mc_ba.p_value).abs() < 4.0 * se + 1e-4,
                "{st:?}"
            );
            r.exact_limit = 1_000_000;
        }
    }

    #[test]
    fn fast_jackknife_equals_the_generic_one() {
        let a = [3.1, 4.7, 2.2, 5.9, 4.0, 4.0, 7.5];
        let b = [1.8, 2.9, 3.3, 2.1, 0.7, 2.6, 2.6, 9.0, 1.1];
        for st in Statistic::ALL {
            let fast = boot::acceleration_from_loo(&effect_leave_one_out(st, &a, &b)).unwrap();
            let slow = boot::acceleration(&boot::Design::Two { a: &a, b: &b }, &effect_fn(st))
                .0
                .unwrap();
            assert!((fast - slow).abs() < 1e-12, "{st:?}: {fast} vs {slow}");
        }
        let fast = boot::acceleration_from_loo(&hedges_leave_one_out(&a, &b)).unwrap();
        let slow = boot::acceleration(&boot::Design::Two { a: &a, b: &b }, &hedges_fn)
            .0
            .unwrap();
        assert!((fast - slow).abs() < 1e-12, "g: {fast} vs {slow}");
    }

    #[test]
    fn histogram_puts_the_observed_value_on_an_edge() {
        let values: Vec<f64> = (0..1000).map(|i| (i as f64 * 0.37).sin()).collect();
        let h = histogram(&values, &[0.4321], 40);
        assert!(h.edges.iter().any(|e| (e - 0.4321).abs() < 1e-12));
        assert_eq!(h.counts.iter().sum::<u64>(), 1000);
        assert_eq!(h.edges.len(), h.counts.len() + 1);
        assert!(h.edges[0] <= -1.0 + 1e-9 && *h.edges.last().unwrap() >= 1.0 - 1e-9);
    }

    #[test]
    fn settings_are_checked() {
        let mut r = demo_request();
        r.confidence = 95.0;
        let e = run(&r, &mut |_| true).err().unwrap();
        assert!(e.to_string().contains("between 0.5 and 0.9999"), "{e}");
        let mut r = demo_request();
        r.format_version = 99;
        assert!(run(&r, &mut |_| true)
            .err()
            .unwrap()
            .to_string()
            .contains("version 99"));
    }

    #[test]
    fn identical_values_give_a_clear_note() {
        let mut r = demo_request();
        r.data = "y,g\n3,a\n3,a\n3,a\n3,b\n3,b\n3,b\n".into();
        let rep = run(&r, &mut |_| true).unwrap();
        assert_eq!(rep.p_value, 1.0);
        assert!(rep.exact);
        assert!(rep.ci.note.is_some());
        assert!(rep.hedges_g.estimate.is_none());
        assert!(rep.welch.t.is_none());
        assert!(!rep.finding.contains("NaN"));
    }

    #[test]
    fn infinite_statistics_survive_the_json_the_worker_sends() {
        // Groups without spread but different means: the Welch t is infinite. JSON has no
        // infinity; the report must still read back (the page parses the worker's JSON).
        let mut r = demo_request();
        r.data = "y,g\n1,a\n1,a\n1,a\n2,b\n2,b\n2,b\n".into();
        r.statistic = Statistic::WelchT;
        let rep = run(&r, &mut |_| true).unwrap();
        assert_eq!(rep.observed, f64::NEG_INFINITY);
        // The two splits that separate the values completely are the observed one and its
        // mirror image: p = 2/20, not 0 (an infinite tolerance once counted nothing).
        assert_eq!(rep.extreme_count, 2);
        assert_eq!(rep.p_value, 0.1);
        let text = serde_json::to_string(&rep).unwrap();
        assert!(text.contains("\"observed\":\"-inf\""), "{text}");
        let back: Report = serde_json::from_str(&text).unwrap();
        assert_eq!(back, rep);
    }
}

//! Two independent groups: the permutation test of their difference (every split when few
//! enough, otherwise random relabellings), bootstrap intervals for the effect and Hedges' g,
//! and Welch's t-test as the classical cross-check.

use serde::{Deserialize, Serialize};

use super::{
    group_summary, EffectSize, GroupSummary, TestSettings, MAX_BOOTSTRAP, MAX_EXACT_LIMIT,
    MAX_RESAMPLES,
};
use crate::base::format as fmt;
use crate::base::*;
use crate::classical;
use crate::classical::Welch;
use crate::input::columns::{self as groups};
use crate::input::columns::{Layout, TwoGroups};
use crate::input::table::{self, HeaderChoice};
use crate::num::stats;
use crate::resample::boot;
use crate::resample::boot::resample;
use crate::resample::boot::TwoSampleFn;
pub use crate::resample::driver::MAX_KEPT;
use crate::resample::rng::RNG_NAME;
use crate::resample::summary::{histogram, tail_region};
use crate::resample::tally::p_value;
use crate::resample::two_groups::null_distribution;
use crate::resample::two_groups::Setup;
pub use crate::resample::two_groups::Statistic;
use crate::resample::two_groups::{self as perm};

/// Everything needed to reproduce an analysis.
#[derive(Clone, Debug, PartialEq, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct Request {
    pub format_version: u32,
    /// The table exactly as pasted or read from the file.
    pub data: String,
    #[serde(default)]
    pub header: HeaderChoice,
    pub layout: Layout,
    /// The group that comes first (the statistic is first minus second). With a label
    /// column of more than two groups, `first` and `second` pick the two to compare.
    #[serde(default)]
    pub first: Option<String>,
    #[serde(default)]
    pub second: Option<String>,
    pub statistic: Statistic,
    pub alternative: Alternative,
    #[serde(default)]
    pub two_sided: TwoSidedRule,
    /// Random relabellings when enumeration is not feasible.
    pub resamples: u64,
    /// Enumerate every relabelling when there are at most this many.
    pub exact_limit: u64,
    pub bootstrap_resamples: u64,
    pub confidence: f64,
    /// The interval method of the headline interval.
    pub interval: IntervalMethod,
    /// Further interval methods to report beside it.
    #[serde(default)]
    pub more_intervals: Vec<IntervalMethod>,
    pub seed: u64,
    /// Return every relabelled and bootstrap statistic (for a CSV download); up to
    /// [`MAX_KEPT`] of each.
    #[serde(default)]
    pub keep_resamples: bool,
}

impl Request {
    /// The settings block of the later designs, with this request's values.
    pub fn settings(&self) -> TestSettings {
        TestSettings {
            alternative: self.alternative,
            two_sided: self.two_sided,
            resamples: self.resamples,
            exact_limit: self.exact_limit,
            bootstrap_resamples: self.bootstrap_resamples,
            confidence: self.confidence,
            interval: self.interval,
            seed: self.seed,
        }
    }

    /// The defaults the page and the command start from.
    pub fn new(data: String, seed: u64) -> Request {
        Request {
            format_version: FORMAT_VERSION,
            data,
            header: HeaderChoice::Detect,
            layout: Layout::Detect,
            first: None,
            second: None,
            statistic: Statistic::MeanDifference,
            alternative: Alternative::TwoSided,
            two_sided: TwoSidedRule::Absolute,
            resamples: 100_000,
            exact_limit: 1_000_000,
            bootstrap_resamples: 10_000,
            confidence: 0.95,
            interval: IntervalMethod::Bca,
            more_intervals: Vec::new(),
            seed,
            keep_resamples: false,
        }
    }
}

#[derive(Clone, Debug, PartialEq, Serialize, Deserialize)]
pub struct Report {
    pub format_version: u32,
    pub engine_version: String,
    pub design: String,
    /// The layout actually used (after detection).
    pub layout: Layout,
    pub value_label: String,
    pub groups: Vec<GroupSummary>,
    /// What was left out or read specially (blank cells, decimal commas, other groups).
    pub notes: Vec<Note>,
    pub statistic: Statistic,
    pub statistic_label: String,
    pub alternative: Alternative,
    pub two_sided: TwoSidedRule,
    #[serde(with = "float")]
    pub observed: f64,
    pub p_value: f64,
    pub exact: bool,
    /// Relabellings drawn (Monte Carlo) or enumerated (exact).
    pub resamples: u64,
    /// Relabellings at least as extreme as the observed one.
    pub extreme_count: u64,
    /// Monte Carlo standard error of the p-value (None when exact).
    pub mc_se: Option<f64>,
    /// 99% Clopper–Pearson interval for the p-value that unlimited relabellings would give.
    pub p_interval: Option<PInterval>,
    pub seed: u64,
    pub rng: String,
    pub effect_label: String,
    pub effect: f64,
    pub ci: Interval,
    /// The headline interval and any further methods asked for, side by side.
    pub intervals: Vec<Interval>,
    pub bootstrap_resamples: u64,
    pub bootstrap_se: Option<f64>,
    /// Mean of the bootstrap effects minus the effect.
    pub bootstrap_bias: Option<f64>,
    pub welch: Welch,
    pub hedges_g: EffectSize,
    pub null_histogram: Histogram,
    pub tail: Tail,
    pub bootstrap_histogram: Histogram,
    pub finding: String,
    pub cautions: Vec<String>,
    /// Every relabelled statistic, in order (only when asked for).
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub null_values: Option<Vec<f64>>,
    /// Every bootstrap effect, in order (only when asked for).
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub bootstrap_values: Option<Vec<f64>>,
}

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

fn hedges_fn(a: &mut [f64], b: &mut [f64]) -> f64 {
    stats::hedges_g(a, b)
}

/// Runs the analysis a request describes.
pub fn run(req: &Request, progress: ProgressFn) -> Result<Report, RunError> {
    check_settings(req)?;
    let table = table::parse(&req.data, req.header)?;
    let g = groups::two_groups(
        &table,
        &req.layout,
        req.first.as_deref(),
        req.second.as_deref(),
    )?;
    two_group_report(req, g, progress)
}

fn two_group_report(req: &Request, g: TwoGroups, progress: ProgressFn) -> Result<Report, RunError> {
    let (a, b) = (&g.a, &g.b);
    let mut notes = g.notes.clone();
    let st = req.statistic;
    let setup = Setup::new(st, a, b);
    let null = null_distribution(&setup, req.exact_limit, req.resamples, req.seed, progress)?;
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
            let extra = Note::NoSpreadResamples {
                count: dropped as u64,
            };
            iv.notes.push(extra);
        }
        iv
    } else {
        Interval::none(
            g_method.into(),
            req.confidence,
            Side::TwoSided,
            Note::HedgesUndefined,
        )
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
        notes.push(Note::InfiniteStatistics {
            count: infinite as u64,
            cause: InfiniteCause::IdenticalValues,
        });
    }
    if req.bootstrap_resamples < 2000 && req.interval == IntervalMethod::Bca {
        notes.push(Note::FewResamplesForBca);
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
            report.notes.push(Note::KeptValuesCapped {
                kept: MAX_KEPT as u64,
            });
        }
    }
    report.finding = sentence(&report);
    report.cautions = cautions(&report);
    Ok(report)
}

// ----- words (the finding and the cautions) --------------------------------------

fn effect_phrase(st: Statistic) -> &'static str {
    match st.effect() {
        Statistic::MedianDifference => "median",
        Statistic::TrimmedMeanDifference => "20% trimmed mean",
        _ => "mean",
    }
}

/// Decimals for the effect and its interval.
pub fn effect_decimals(r: &Report) -> usize {
    let scale = match (r.ci.low, r.ci.high) {
        (Some(l), Some(h)) if h > l => h - l,
        _ => {
            let s = r.groups.iter().map(|g| g.sd).fold(0.0, f64::max);
            if s > 0.0 {
                s
            } else {
                r.effect.abs()
            }
        }
    };
    fmt::decimals_for(scale)
}

/// One sentence: the effect with its interval and the p-value with what it counts.
pub fn sentence(r: &Report) -> String {
    let (first, second) = (&r.groups[0].name, &r.groups[1].name);
    let what = effect_phrase(r.statistic);
    let of = if r.value_label == "value" {
        String::new()
    } else {
        format!(" {}", r.value_label)
    };
    let d = effect_decimals(r);
    let size = fmt::fixed(r.effect.abs(), d);
    let mut s = if fmt::fixed(r.effect, d)
        .trim_start_matches('-')
        .chars()
        .all(|c| c == '0' || c == '.')
    {
        format!("The {what}{of} was practically the same in {first} and {second}")
    } else {
        let dir = if r.effect > 0.0 { "higher" } else { "lower" };
        format!("The {what}{of} was {size} {dir} in {first} than in {second}")
    };
    if let (Some(lo), Some(hi)) = (r.ci.low, r.ci.high) {
        s.push_str(&format!(" ({})", fmt::ci(r.ci.level, lo, hi, d)));
    }
    let stat_words = match r.statistic {
        Statistic::WelchT => "a Welch t".to_string(),
        _ => format!("a difference in {what}s"),
    };
    let how = match (r.alternative, r.two_sided) {
        (Alternative::TwoSided, TwoSidedRule::Absolute) => {
            format!("{stat_words} at least this large in either direction")
        }
        (Alternative::TwoSided, TwoSidedRule::DoubledTail) => {
            format!("{stat_words} at least this large in the observed direction")
        }
        (Alternative::Greater, _) => format!("{stat_words} at least this far in favour of {first}"),
        (Alternative::Less, _) => format!("{stat_words} at least this far in favour of {second}"),
    };
    let doubled =
        r.alternative == Alternative::TwoSided && r.two_sided == TwoSidedRule::DoubledTail;
    if r.exact {
        s.push_str(&format!(
            "; {how} arose in {} of all {} possible relabellings of the groups (exact {}{}).",
            fmt::count(r.extreme_count),
            fmt::count(r.resamples),
            fmt::p_value(r.p_value),
            if doubled { ", doubled" } else { "" }
        ));
    } else {
        s.push_str(&format!(
            "; {how} arose in {} of {} random relabellings of the groups ({}{}).",
            fmt::count(r.extreme_count),
            fmt::count(r.resamples),
            fmt::p_value(r.p_value),
            if doubled { ", doubled" } else { "" }
        ));
    }
    s
}

/// Cautions that fit this result.
pub fn cautions(r: &Report) -> Vec<String> {
    let mut c = vec![
        "What the test assumes: if the groups did not differ, every relabelling of the values \
         would have been as likely as the one observed (exchangeability, as under random \
         assignment), and the observations are independent of each other (no repeated \
         measurements of the same unit, no clusters)."
            .to_string(),
        "A p-value says how unusual the observed difference would be if there were none; it \
         is not the size or the importance of the difference. Read it together with the interval."
            .to_string(),
    ];
    let smallest = r.groups.iter().map(|g| g.n).min().unwrap_or(0);
    if smallest < 10 {
        c.push(format!(
            "Small sample: the smallest group has {smallest} values. Bootstrap intervals tend \
             to be too narrow for samples this small (percentile intervals most of all; \
             Hesterberg 2015), and a permutation test has little power."
        ));
    }
    if r.statistic != Statistic::WelchT && r.statistic != Statistic::MedianDifference {
        let (s1, s2) = (r.groups[0].sd, r.groups[1].sd);
        let ratio = if s1.min(s2) > 0.0 {
            s1.max(s2) / s1.min(s2)
        } else {
            1.0
        };
        if ratio > 2.0 && r.groups[0].n != r.groups[1].n {
            c.push(format!(
                "The spreads differ (SD ratio {}) and the groups have different sizes: a \
                 relabelling test of a difference in means then also reacts to the unequal \
                 spread. The Welch t statistic is the safer choice here (Chung & Romano 2013).",
                fmt::sig(ratio)
            ));
        }
    }
    c.push(
        "Several tests on the same data: some small p-values arise by chance alone. If this is \
         one of several comparisons, adjust for their number (for example Holm's method)."
            .to_string(),
    );
    c.push(
        "Clinical, safety or regulatory decisions need a qualified statistician and the \
         guidelines that apply to them; this result alone is not enough."
            .to_string(),
    );
    c
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::resample::rng;
    use crate::resample::tally::Counts;
    use crate::resample::two_groups::random_blocks;

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
        let g = groups::two_groups(&t, &r.layout, r.first.as_deref(), r.second.as_deref()).unwrap();
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
        assert_eq!(rep.ci.notes, vec![Note::NoVariation]);
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

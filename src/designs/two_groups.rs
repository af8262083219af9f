//! Two independent groups: the permutation test of their difference (every split when few
//! enough, otherwise random relabellings), bootstrap intervals for the effect and Hedges' g,
//! and Welch's t-test as the classical cross-check.

use serde::{Deserialize, Serialize};

use super::hints::{self, Hint};
use super::robustness::{self, Robustness};
use super::{
    closing_cautions, group_summary, Caution, Design, DesignKey, EffectSize, GroupSummary,
    TestOutcome, TestSettings,
};
use crate::base::*;
use crate::classical;
use crate::classical::Welch;
use crate::input::columns::{self as groups, Layout, TwoGroups};
use crate::input::table::{self, HeaderChoice};
use crate::num::stats;
use crate::resample::boot::{self, resample, TwoSampleFn};
pub use crate::resample::driver::MAX_KEPT;
use crate::resample::large::LARGE;
use crate::resample::large_boot::{self, Weights};
pub use crate::resample::two_groups::Statistic;
use crate::resample::two_groups::{self as perm, null_distribution, Setup};

/// The two-group design.
pub struct TwoGroupsDesign;

/// Two independent groups: where they are in the table, which comes first, the statistic
/// and the settings.
#[derive(Clone, Debug, PartialEq, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct TwoGroupsRequest {
    /// The table exactly as pasted or read from the file.
    pub data: String,
    /// Whether the first row holds column names.
    #[serde(default)]
    pub header: HeaderChoice,
    /// Where the groups are.
    pub layout: Layout,
    /// The group that comes first (the statistic is first minus second). With a label
    /// column of more than two groups, `first` and `second` pick the two to compare.
    #[serde(default)]
    pub first: Option<String>,
    /// The second group, when the label column names more than two.
    #[serde(default)]
    pub second: Option<String>,
    /// The test statistic.
    pub statistic: Statistic,
    /// Also answer with the other statistics of [`robustness::STATISTICS`] and read the
    /// percentile and BCa intervals beside the chosen ones (the robustness table).
    #[serde(default, skip_serializing_if = "std::ops::Not::not")]
    pub robustness: bool,
    /// The test and interval settings.
    pub settings: TestSettings,
}

impl TwoGroupsRequest {
    /// The defaults the page and the command start from.
    pub fn new(data: String, seed: u64) -> TwoGroupsRequest {
        TwoGroupsRequest {
            data,
            header: HeaderChoice::Detect,
            layout: Layout::Detect,
            first: None,
            second: None,
            statistic: Statistic::MeanDifference,
            robustness: false,
            settings: TestSettings::new(seed),
        }
    }
}

/// What the two-group analysis found.
#[derive(Clone, Debug, PartialEq, Serialize, Deserialize)]
pub struct TwoGroupsReport {
    /// The layout actually used (after detection).
    pub layout: Layout,
    /// What the values are (the value column's name in long format).
    pub value_label: String,
    /// The first and the second group.
    pub groups: Vec<GroupSummary>,
    /// What was left out or read specially (blank cells, decimal commas, other groups).
    pub notes: Vec<Note>,
    /// The test statistic.
    pub statistic: Statistic,
    /// The direction of the test.
    pub alternative: Alternative,
    /// How the two-sided p-value is defined.
    pub two_sided: TwoSidedRule,
    /// The permutation test.
    #[serde(flatten)]
    pub test: TestOutcome,
    /// The effect the interval is for (the statistic's effect: a Welch t gives the
    /// difference in means), first minus second; a log ratio of spreads may be infinite.
    #[serde(with = "crate::base::floats::float")]
    pub effect: f64,
    /// The headline interval.
    pub ci: Interval,
    /// The headline interval and any further methods asked for, side by side.
    pub intervals: Vec<Interval>,
    /// Bootstrap resamples.
    pub bootstrap_resamples: u64,
    /// Bootstrap standard error of the effect.
    pub bootstrap_se: Option<f64>,
    /// Mean of the bootstrap effects minus the effect.
    pub bootstrap_bias: Option<f64>,
    /// The bootstrap effects, binned.
    pub bootstrap_histogram: Histogram,
    /// Welch's t-test (classical cross-check).
    pub welch: Welch,
    /// Hedges' g with its bootstrap interval.
    pub hedges_g: EffectSize,
    /// For the rank-sum statistic: Cliff's delta, 2 × the probability of superiority − 1,
    /// with its interval (the superiority interval's ends mapped the same way).
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub cliffs_delta: Option<EffectSize>,
    /// For the rank-sum statistic: the classical rank-sum test (normal approximation).
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub rank_sum: Option<classical::RankSum>,
    /// What the data suggest (rules with their sources); they never change the analysis.
    #[serde(default, skip_serializing_if = "Vec::is_empty")]
    pub hints: Vec<Hint>,
    /// The same question answered with the other statistics (when asked for).
    #[serde(default, skip_serializing_if = "Option::is_none")]
    pub robustness: Option<Robustness>,
    /// What to keep in mind when reading the result.
    pub cautions: Vec<Caution>,
    /// Every relabelled statistic, in order (only when asked for); infinite ones as "inf".
    #[serde(
        default,
        skip_serializing_if = "Option::is_none",
        with = "crate::base::floats::float_vec_opt"
    )]
    pub null_values: Option<Vec<f64>>,
    /// Every bootstrap effect, in order (only when asked for); infinite ones as "inf".
    #[serde(
        default,
        skip_serializing_if = "Option::is_none",
        with = "crate::base::floats::float_vec_opt"
    )]
    pub bootstrap_values: Option<Vec<f64>>,
}

impl Design for TwoGroupsDesign {
    const KEY: DesignKey = DesignKey::TwoGroups;
    type Request = TwoGroupsRequest;
    type Report = TwoGroupsReport;

    fn check(req: &TwoGroupsRequest) -> Result<(), Error> {
        if req.statistic == Statistic::KsDistance
            && (req.settings.alternative != Alternative::TwoSided
                || req.settings.two_sided != TwoSidedRule::Absolute)
        {
            return Err(Error::settings(
                "The Kolmogorov–Smirnov distance has no direction: it answers the two-sided \
                 question only (alternative two-sided, two-sided rule absolute). For a \
                 one-sided question, compare means, medians or ranks.",
            ));
        }
        if req.statistic.on_spread() && req.robustness {
            return Err(Error::settings(
                "The robustness table compares statistics of location (means, medians, ranks); \
                 for the log ratio of the SDs, leave it out.",
            ));
        }
        req.settings.check("relabellings")
    }

    fn run(req: &TwoGroupsRequest, progress: ProgressFn) -> Result<TwoGroupsReport, Error> {
        Self::check(req)?;
        // The parsed table is dropped before the resampling (memory on large tables).
        let g = {
            let table = table::parse(&req.data, req.header)?;
            groups::two_groups(
                &table,
                &req.layout,
                req.first.as_deref(),
                req.second.as_deref(),
            )?
        };
        two_group_report(req, g, progress)
    }

    fn data(req: &TwoGroupsRequest) -> &str {
        &req.data
    }

    fn clear_data(req: &mut TwoGroupsRequest) {
        req.data.clear();
    }

    fn seed(req: &TwoGroupsRequest) -> u64 {
        req.settings.seed
    }

    fn test_settings(req: &mut TwoGroupsRequest) -> Option<&mut TestSettings> {
        Some(&mut req.settings)
    }

    fn test_outcome(report: &TwoGroupsReport) -> Option<&TestOutcome> {
        Some(&report.test)
    }
}

/// Runs a two-group request.
pub fn run(req: &TwoGroupsRequest, progress: ProgressFn) -> Result<TwoGroupsReport, Error> {
    TwoGroupsDesign::run(req, progress)
}

fn effect_fn(st: Statistic) -> TwoSampleFn {
    match st.effect() {
        Statistic::RankSum => |a, b| perm::superiority(a, b),
        Statistic::KsDistance => |a, b| perm::ks_distance(a, b),
        Statistic::LogMadRatio => |a, b| perm::log_ratio(perm::mad(a), perm::mad(b)),
        Statistic::LogSdRatio => {
            |a, b| perm::log_sd_ratio_from(stats::variance(a), stats::variance(b))
        }
        Statistic::MedianDifference => |a, b| stats::median_select(a) - stats::median_select(b),
        Statistic::TrimmedMeanDifference => {
            |a, b| stats::trimmed_mean_select(a) - stats::trimmed_mean_select(b)
        }
        _ => |a, b| stats::mean(a) - stats::mean(b),
    }
}

/// Leave-one-out values of the probability of superiority for each group, in O(n log n):
/// value i of `a` counts u_i = (its mid-rank among all) − (its mid-rank within `a`) of `b`'s
/// values below it (ties half), so without it the probability is (U − u_i)/((n1 − 1) n2);
/// likewise for `b` with n1 − u_j.
fn superiority_leave_one_out(a: &[f64], b: &[f64]) -> [Vec<f64>; 2] {
    let (n1, n2) = (a.len() as f64, b.len() as f64);
    let (pa, pb) = perm::joint_ranks(a, b);
    let (wa, wb) = (stats::ranks(a), stats::ranks(b));
    let u: Vec<f64> = pa.iter().zip(&wa).map(|(p, w)| p - w).collect();
    let total: f64 = u.iter().sum();
    let v: Vec<f64> = pb.iter().zip(&wb).map(|(p, w)| n1 - (p - w)).collect();
    [
        u.iter()
            .map(|ui| (total - ui) / ((n1 - 1.0) * n2))
            .collect(),
        v.iter()
            .map(|vj| (total - vj) / (n1 * (n2 - 1.0)))
            .collect(),
    ]
}

/// Leave-one-out values of the effect for each group, in O(n log n).
fn effect_leave_one_out(st: Statistic, a: &[f64], b: &[f64]) -> [Vec<f64>; 2] {
    if st.on_ranks() {
        return superiority_leave_one_out(a, b);
    }
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
    // Each value's leave-one-out moments, turned into g at once (no list of moments).
    let drop = |mom: (f64, f64, f64, f64), v: f64| {
        let d = v - mom.0;
        (mom.0, mom.1 - d, mom.2 - d * d, mom.3 - 1.0)
    };
    [
        a.iter().map(|&v| g_from(drop(ma, v), mb)).collect(),
        b.iter().map(|&v| g_from(ma, drop(mb, v))).collect(),
    ]
}

/// Standard error of the effect for the studentized interval: Welch's for a difference in
/// means, Yuen's for a difference in trimmed means, a nested bootstrap for medians.
fn effect_se(st: Statistic) -> boot::SeMethod<'static> {
    match st.effect() {
        // Bootstrapped by counts, with no studentized interval.
        Statistic::RankSum => boot::SeMethod::None,
        Statistic::KsDistance | Statistic::LogSdRatio | Statistic::LogMadRatio => {
            boot::SeMethod::Nested(boot::NESTED)
        }
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

/// The bootstrap of two large groups by counts over their sorted values (kernel generation
/// 2, [`large_boot`]): per resample the effect, Hedges' g and (for a studentized interval of
/// a difference in means) the t value with Welch's standard error, in the shapes
/// [`resample`] returns.
#[allow(clippy::too_many_arguments)]
fn streaming_bootstrap(
    st: Statistic,
    a: &[f64],
    b: &[f64],
    effect: f64,
    seed: u64,
    total: u64,
    studentize: bool,
    progress: ProgressFn,
) -> Result<boot::Resampled, Error> {
    let kind = st.effect();
    // Each group as deviations from its mean (accurate sums of squares), sorted when order
    // statistics are read; for the probability of superiority both from one centre, so that
    // the groups' values stay comparable.
    let pooled = (kind == Statistic::RankSum)
        .then(|| stats::mean(&a.iter().chain(b).copied().collect::<Vec<f64>>()));
    let prep = |x: &[f64]| {
        let m = pooled.unwrap_or_else(|| stats::mean(x));
        let mut d: Vec<f64> = x.iter().map(|v| v - m).collect();
        if kind != Statistic::MeanDifference {
            d.sort_by(f64::total_cmp);
        }
        (m, d)
    };
    let ((ma, xa), (mb, xb)) = (prep(a), prep(b));
    let (na, nb) = (a.len() as f64, b.len() as f64);
    let df = na + nb - 2.0;
    let j = stats::hedges_j(df);
    let centre = |w: &Weights, x: &[f64]| -> f64 {
        let n = x.len() as u64;
        match kind {
            Statistic::MedianDifference => {
                let lo = w.select(x, (n - 1) / 2);
                if n % 2 == 1 {
                    lo
                } else {
                    (lo + w.select(x, n / 2)) / 2.0
                }
            }
            Statistic::TrimmedMeanDifference => {
                let g = stats::trim_count(n as usize) as u64;
                w.rank_sum(x, g, n - g) / (n - 2 * g) as f64
            }
            _ => w.sum() / n as f64,
        }
    };
    let f = |wa: &Weights, wb: &Weights| -> [f64; 3] {
        let (sa, sb) = (wa.sum(), wb.sum());
        let va = ((wa.sum_sq() - sa * sa / na) / (na - 1.0)).max(0.0);
        let vb = ((wb.sum_sq() - sb * sb / nb) / (nb - 1.0)).max(0.0);
        let mean_diff = (ma - mb) + (sa / na - sb / nb);
        let e = match kind {
            Statistic::MeanDifference => mean_diff,
            Statistic::RankSum => large_boot::superiority(wa, &xa, wb, &xb),
            _ => (ma + centre(wa, &xa)) - (mb + centre(wb, &xb)),
        };
        let t = if studentize {
            let se = (va / na + vb / nb).sqrt();
            if se > 0.0 && se.is_finite() {
                (e - effect) / se
            } else {
                f64::NAN
            }
        } else {
            f64::NAN
        };
        let sp = (((na - 1.0) * va + (nb - 1.0) * vb) / df).sqrt();
        [e, t, mean_diff / sp * j]
    };
    let [e, t, g] = large_boot::resample_two(&xa, &xb, seed, total, effect, progress, &f)?;
    let t = if studentize { t } else { Vec::new() };
    Ok((vec![e, g], vec![t, Vec::new()]))
}

/// How many of the pooled values share their value with another, and in how many groups
/// (none when no two are equal).
fn tied_values(a: &[f64], b: &[f64]) -> Option<(usize, usize)> {
    let pooled: Vec<f64> = a.iter().chain(b).copied().collect();
    let tied: Vec<usize> = stats::tie_sizes(&stats::sorted(&pooled))
        .into_iter()
        .filter(|&t| t > 1)
        .collect();
    let values: usize = tied.iter().sum();
    (values > 0).then_some((values, tied.len()))
}

fn two_group_report(
    req: &TwoGroupsRequest,
    g: TwoGroups,
    progress: ProgressFn,
) -> Result<TwoGroupsReport, Error> {
    let set = &req.settings;
    let (a, b) = (&g.a, &g.b);
    // The robustness table runs four more relabelling tests (its bound counts five of all).
    super::check_work_sorted(
        a.len() + b.len(),
        if req.robustness { 5 } else { 1 },
        req.statistic == Statistic::KsDistance,
        set,
    )?;
    let mut notes = g.notes.clone();
    let st = req.statistic;
    // A statistic of spread is relabelled on the groups aligned at their medians, so that a
    // difference in location does not enter the test (its observed value is unchanged).
    let aligned = st.on_spread().then(|| {
        let align = |x: &[f64]| {
            let m = stats::median(x);
            x.iter().map(|v| v - m).collect::<Vec<f64>>()
        };
        (align(a), align(b))
    });
    let (ta, tb) = aligned
        .as_ref()
        .map_or((&a[..], &b[..]), |(x, y)| (&x[..], &y[..]));
    let setup = Setup::for_run(st, ta, tb, set.kernels, set.exact_limit);
    let streaming_null = setup.is_streaming();
    let stop = set.stop(set.alternative, setup.observed, setup.tolerance);
    let null = null_distribution(
        &setup,
        set.exact_limit,
        set.resamples,
        set.seed,
        stop,
        progress,
    )?;
    drop(setup); // its pooled copy of the values, before the bootstrap
    drop(aligned);
    let others = if req.robustness {
        Some(robustness::other_tests(st, a, b, set, progress)?)
    } else {
        None
    };
    let observed = perm::statistic_value(st, a, b);
    let mut test =
        TestOutcome::from_null(&null, set.alternative, set.two_sided, observed, set.seed);

    // Bootstrap, within each group: the effect and Hedges' g from the same resamples.
    // The effect the interval is for: for the rank-sum statistic, the probability of
    // superiority.
    let effect = if st.on_ranks() {
        perm::superiority(a, b)
    } else {
        perm::statistic_value(st.effect(), a, b)
    };
    let g_est = stats::hedges_g(a, b);
    let mut methods = set.methods();
    if req.robustness {
        for m in [IntervalMethod::Percentile, IntervalMethod::Bca] {
            if !methods.contains(&m) {
                methods.push(m);
            }
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
    let total_b = set.bootstrap_resamples;
    // Generation 2 bootstraps large groups by counts, except a studentized interval of a
    // median or trimmed-mean difference (its standard error needs the values themselves).
    // The probability of superiority is always bootstrapped by counts (a merge of the two
    // groups per resample instead of a sort), without a studentized interval.
    // The Kolmogorov–Smirnov distance is bootstrapped from the values themselves.
    let streaming_boot = st.on_ranks()
        || !matches!(
            st,
            Statistic::KsDistance | Statistic::LogSdRatio | Statistic::LogMadRatio
        ) && set.kernels >= 2
            && a.len() + b.len() >= LARGE
            && !(studentize && st.effect() != Statistic::MeanDifference);
    let (values, tvals) = if streaming_boot {
        streaming_bootstrap(st, a, b, effect, set.seed, total_b, studentize, progress)?
    } else {
        resample(&design, &[effect_stat, g_stat], set.seed, total_b, progress)?
    };
    let (boot_effect, boot_g) = (&values[0], &values[1]);
    let se_hat = match effect_stat.se {
        boot::SeMethod::Formula(f) => f(&mut a.clone(), &mut b.clone()),
        boot::SeMethod::Nested(_) => boot::standard_error(boot_effect).unwrap_or(f64::NAN),
        boot::SeMethod::None => f64::NAN,
    };
    let effect_boot = super::summarise_bootstrap(
        &methods,
        set.confidence,
        effect,
        boot_effect,
        studentize.then_some((&tvals[0][..], se_hat)),
        None,
        &mut || {
            if matches!(
                st,
                Statistic::KsDistance | Statistic::LogSdRatio | Statistic::LogMadRatio
            ) {
                // No leave-one-out shortcut: the jackknife itself (grouped when large).
                boot::acceleration(&design, &effect_f)
            } else {
                (
                    boot::acceleration_from_loo(&effect_leave_one_out(st, a, b)),
                    false,
                )
            }
        },
    );
    let g_finite: Vec<f64> = boot_g.iter().copied().filter(|v| v.is_finite()).collect();
    // Hedges' g has no simple standard error here: a studentized headline uses BCa for g.
    let g_method = if set.interval() == IntervalMethod::Studentized {
        IntervalMethod::Bca
    } else {
        set.interval()
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
        let mut iv = boot::interval_by(g_method, set.confidence, Side::TwoSided, &gs, &mut g_accel);
        let dropped = boot_g.len() - g_finite.len();
        if dropped > 0 {
            iv.notes.push(Note::NoSpreadResamples {
                count: dropped as u64,
            });
        }
        iv
    } else {
        Interval::none(
            g_method.into(),
            set.confidence,
            Side::TwoSided,
            Note::HedgesUndefined,
        )
    };
    let infinite = null.values.iter().filter(|v| !v.is_finite()).count();
    if infinite > 0 {
        notes.push(Note::InfiniteStatistics {
            count: infinite as u64,
            // A ratio of spreads is infinite when a group has none; a t when both have none.
            cause: if st.on_spread() {
                InfiniteCause::NoSpreadInAGroup
            } else {
                InfiniteCause::IdenticalValues
            },
        });
    }
    super::few_resamples_note(set, &mut notes);
    if st.on_ranks() {
        if let Some((values, groups)) = tied_values(a, b) {
            notes.push(Note::TiedRanks { values, groups });
        }
    }
    if streaming_null || streaming_boot {
        test.rng = crate::resample::rng::RNG_NAME_LARGE.into();
    }
    // The streaming kernels are worth a note for large samples (the rank-sum statistic's
    // bootstrap always counts; the methods paragraph says so).
    if streaming_null || streaming_boot && a.len() + b.len() >= LARGE {
        notes.push(Note::StreamingKernels {
            values: a.len() + b.len(),
            relabelling: streaming_null,
            bootstrap: streaming_boot,
        });
    }
    let groups_out = vec![
        group_summary(&g.names[0], a, g.shift),
        group_summary(&g.names[1], b, g.shift),
    ];
    let cautions = cautions(st, &groups_out);
    let mut report = TwoGroupsReport {
        layout: g.layout.clone(),
        value_label: g.value_label.clone(),
        groups: groups_out,
        notes,
        statistic: st,
        alternative: set.alternative,
        two_sided: set.two_sided,
        test,
        effect,
        ci: effect_boot.ci(),
        intervals: effect_boot.intervals,
        bootstrap_resamples: total_b,
        bootstrap_se: effect_boot.se,
        bootstrap_bias: effect_boot.bias,
        bootstrap_histogram: effect_boot.histogram,
        welch: classical::welch(a, b, set.alternative, set.confidence),
        hedges_g: EffectSize {
            estimate: g_est.is_finite().then_some(g_est),
            ci: g_ci,
        },
        cautions,
        null_values: None,
        bootstrap_values: None,
        cliffs_delta: None,
        rank_sum: None,
        robustness: None,
        hints: hints::two_groups(
            st,
            set.interval(),
            &g.names,
            a,
            b,
            &g.layout,
            &g.notes,
            g.shift,
        ),
    };
    if let Some(others) = others {
        report.robustness = Some(robustness::table(
            others,
            report.test.p_value,
            // A distance has no value of no difference to read its interval against.
            set.alternative == Alternative::TwoSided && st != Statistic::KsDistance,
            set.confidence,
            if st.on_ranks() { 0.5 } else { 0.0 },
            &report.intervals,
            &report.welch,
        ));
    }
    if st.on_ranks() {
        let map = |v: Option<f64>| v.map(|x| 2.0 * x - 1.0);
        let mut ci = report.ci.clone();
        (ci.low, ci.high) = (map(ci.low), map(ci.high));
        report.cliffs_delta = Some(EffectSize {
            estimate: Some(2.0 * effect - 1.0),
            ci,
        });
        report.rank_sum = Some(classical::rank_sum(a, b, set.alternative));
    }
    if set.keep_resamples {
        let keep = |v: &[f64]| v[..v.len().min(MAX_KEPT)].to_vec();
        report.null_values = Some(keep(&null.values));
        report.bootstrap_values = Some(keep(boot_effect));
        if null.values.len() > MAX_KEPT {
            report.notes.push(Note::KeptValuesCapped {
                kept: MAX_KEPT as u64,
            });
        }
    }
    Ok(report)
}

/// Which cautions apply: the assumptions, small groups, unequal spreads with unequal sizes
/// (where the statistic is not robust to them), and the closing ones.
fn cautions(st: Statistic, groups: &[GroupSummary]) -> Vec<Caution> {
    let mut c = vec![Caution::Assumptions];
    let smallest = groups.iter().map(|g| g.n).min().unwrap_or(0);
    if smallest < 10 {
        c.push(Caution::SmallSample { smallest });
    }
    if !matches!(
        st,
        Statistic::WelchT
            | Statistic::MedianDifference
            | Statistic::KsDistance
            | Statistic::LogSdRatio
            | Statistic::LogMadRatio
    ) {
        let (s1, s2) = (groups[0].sd, groups[1].sd);
        let ratio = if s1.min(s2) > 0.0 {
            s1.max(s2) / s1.min(s2)
        } else {
            1.0
        };
        if ratio > 2.0 && groups[0].n != groups[1].n {
            c.push(if st.on_ranks() {
                Caution::UnequalSpreadsRanks { ratio }
            } else {
                Caution::UnequalSpreads { ratio }
            });
        }
    }
    closing_cautions(&mut c);
    c
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::resample::rng;
    use crate::resample::tally::Counts;
    use crate::resample::two_groups::random_blocks;

    fn demo_request() -> TwoGroupsRequest {
        let data = "y,g\n5.1,a\n4.8,a\n6.0,a\n5.6,a\n5.9,a\n6.3,a\n5.2,a\n4.9,a\n6.1,a\n5.5,a\n5.8,a\n6.4,a\n\
                    4.2,b\n4.9,b\n5.0,b\n4.4,b\n4.7,b\n5.3,b\n4.1,b\n4.6,b\n5.1,b\n4.3,b\n4.8,b\n5.4,b\n";
        let mut r = TwoGroupsRequest::new(data.into(), 2024);
        r.settings.resamples = 20_000;
        r.settings.bootstrap_resamples = 2_000;
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
        assert!(c.unwrap_err().is_cancelled());
    }

    #[test]
    fn p_value_is_in_unit_interval_and_groups_swap() {
        // 8 + 8 values: C(16, 8) = 12,870 splits, enumerated exactly, so swapping the groups
        // and the direction must give exactly the same p-value.
        let mut r = demo_request();
        r.data = "y,g\n5.1,a\n4.8,a\n6.0,a\n5.6,a\n5.9,a\n6.3,a\n5.2,a\n4.9,a\n\
                  4.2,b\n4.9,b\n5.0,b\n4.4,b\n4.7,b\n5.3,b\n4.1,b\n4.6,b\n"
            .into();
        // The distance has no sign: swapping the groups gives the same distance and p-value.
        r.statistic = Statistic::KsDistance;
        let ab = run(&r, &mut |_| true).unwrap();
        r.first = Some("b".into());
        let ba = run(&r, &mut |_| true).unwrap();
        assert!(ab.test.exact && ab.test.observed > 0.0);
        assert_eq!(
            (ab.test.observed, ab.test.p_value),
            (ba.test.observed, ba.test.p_value)
        );
        r.settings.alternative = Alternative::Greater;
        assert!(
            run(&r, &mut |_| true).is_err(),
            "one-sided distance refused"
        );
        r.settings.alternative = Alternative::TwoSided;
        for st in Statistic::ALL
            .into_iter()
            .filter(|s| *s != Statistic::KsDistance)
        {
            r.statistic = st;
            r.first = None;
            r.settings.alternative = Alternative::Greater;
            let ab = run(&r, &mut |_| true).unwrap();
            assert!(ab.test.exact);
            r.first = Some("b".into());
            r.settings.alternative = Alternative::Less;
            let ba = run(&r, &mut |_| true).unwrap();
            assert!(ab.test.p_value > 0.0 && ab.test.p_value <= 1.0);
            assert!(
                (ab.test.observed + ba.test.observed).abs() < 1e-12,
                "{st:?}"
            );
            assert_eq!(ab.test.extreme_count, ba.test.extreme_count, "{st:?}");
            assert_eq!(ab.test.p_value, ba.test.p_value, "{st:?}");
            r.settings.alternative = Alternative::Greater;
            let ba_g = run(&r, &mut |_| true).unwrap();
            assert!(ba_g.test.p_value > 0.5, "{st:?}: {}", ba_g.test.p_value);
            // Monte Carlo with the groups swapped agrees within its error.
            r.settings.exact_limit = 0;
            r.first = None;
            let mc_ab = run(&r, &mut |_| true).unwrap();
            r.first = Some("b".into());
            r.settings.alternative = Alternative::Less;
            let mc_ba = run(&r, &mut |_| true).unwrap();
            let se = mc_ab.test.mc_se.unwrap().hypot(mc_ba.test.mc_se.unwrap());
            assert!(
                (mc_ab.test.p_value - mc_ba.test.p_value).abs() < 4.0 * se + 1e-4,
                "{st:?}"
            );
            r.settings.exact_limit = 1_000_000;
        }
    }

    #[test]
    fn fast_jackknife_equals_the_generic_one() {
        let a = [3.1, 4.7, 2.2, 5.9, 4.0, 4.0, 7.5];
        let b = [1.8, 2.9, 3.3, 2.1, 0.7, 2.6, 2.6, 9.0, 1.1];
        // The distance and the SD ratio have no leave-one-out shortcut (the design
        // jackknifes them directly).
        for st in Statistic::ALL.into_iter().filter(|s| {
            !matches!(
                s,
                Statistic::KsDistance | Statistic::LogSdRatio | Statistic::LogMadRatio
            )
        }) {
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
    fn settings_are_checked() {
        let mut r = demo_request();
        r.settings.confidence = 95.0;
        let e = run(&r, &mut |_| true).err().unwrap();
        assert!(e.to_string().contains("between 0.5 and 0.9999"), "{e}");
    }

    #[test]
    fn identical_values_give_a_clear_note() {
        let mut r = demo_request();
        r.data = "y,g\n3,a\n3,a\n3,a\n3,b\n3,b\n3,b\n".into();
        let rep = run(&r, &mut |_| true).unwrap();
        assert_eq!(rep.test.p_value, 1.0);
        assert!(rep.test.exact);
        assert_eq!(rep.ci.notes, vec![Note::NoVariation]);
        assert!(rep.hedges_g.estimate.is_none());
        assert!(rep.welch.t.is_none());
    }

    #[test]
    fn infinite_statistics_survive_the_json_the_worker_sends() {
        // Groups without spread but different means: the Welch t is infinite. JSON has no
        // infinity; the report must still read back (the page parses the worker's JSON).
        let mut r = demo_request();
        r.data = "y,g\n1,a\n1,a\n1,a\n2,b\n2,b\n2,b\n".into();
        r.statistic = Statistic::WelchT;
        let rep = run(&r, &mut |_| true).unwrap();
        assert_eq!(rep.test.observed, f64::NEG_INFINITY);
        // The two splits that separate the values completely are the observed one and its
        // mirror image: p = 2/20, not 0 (an infinite tolerance once counted nothing).
        assert_eq!(rep.test.extreme_count, 2);
        assert_eq!(rep.test.p_value, 0.1);
        let text = serde_json::to_string(&rep).unwrap();
        assert!(text.contains("\"observed\":\"-inf\""), "{text}");
        let back: TwoGroupsReport = serde_json::from_str(&text).unwrap();
        assert_eq!(back, rep);
    }
}

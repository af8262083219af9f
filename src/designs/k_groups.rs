//! k independent groups (three or more): a permutation test that relabels the values across
//! all groups (exact over every distinct labelling when their multinomial count is small,
//! otherwise random relabellings), eta squared with a bootstrap interval (each group
//! resampled within itself), one-way ANOVA, Welch's ANOVA and Kruskal–Wallis as classical
//! cross-checks, and follow-up comparisons of every pair (or of each group with a control),
//! each by its own permutation test, with Holm and Benjamini–Hochberg adjusted p-values.

use serde::{Deserialize, Serialize};

use super::{group_summary, Caution, Design, DesignKey, GroupSummary, TestOutcome, TestSettings};
use crate::base::*;
use crate::classical;
use crate::classical::multiple;
use crate::classical::{ChiSquareTest, FTest};
use crate::input::columns::Layout;
use crate::input::columns::{self as groups};
use crate::input::table::{self, HeaderChoice};
use crate::num::stats;
use crate::resample::boot::{Design as Resampling, SeMethod, Stat};
pub use crate::resample::k_groups::KStatistic;
use crate::resample::k_groups::{labellings, KSetup};
use crate::resample::tally::p_value;
use crate::resample::two_groups::Setup;
use crate::resample::two_groups::{self as perm, Statistic};
use crate::resample::{boot, driver, rng};

/// The k-group design.
pub struct KGroupsDesign;

/// Three or more groups: where they are, the statistic, an optional control group and the
/// settings.
#[derive(Clone, Debug, PartialEq, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct KGroupsRequest {
    /// The table exactly as pasted or read from the file.
    pub data: String,
    #[serde(default)]
    pub header: HeaderChoice,
    /// Long format (values and a label column with 3+ labels) or one column per group.
    pub layout: Layout,
    /// Compare each group with this one only; None compares every pair.
    #[serde(default)]
    pub control: Option<String>,
    pub statistic: KStatistic,
    pub settings: TestSettings,
}

impl KGroupsRequest {
    pub fn new(data: String, layout: Layout, seed: u64) -> KGroupsRequest {
        KGroupsRequest {
            data,
            header: HeaderChoice::Detect,
            layout,
            control: None,
            statistic: KStatistic::F,
            settings: TestSettings::new(seed),
        }
    }
}

/// One follow-up comparison between two groups.
#[derive(Clone, Debug, PartialEq, Serialize, Deserialize)]
pub struct Comparison {
    pub first: String,
    pub second: String,
    /// First minus second (means or medians, as `pairwise_label` says).
    pub difference: f64,
    pub ci: Interval,
    /// The permutation p-value of this comparison alone.
    pub p_value: f64,
    pub exact: bool,
    pub resamples: u64,
    pub mc_se: Option<f64>,
    /// Holm-adjusted p-value (family-wise error rate).
    pub holm: f64,
    /// Benjamini–Hochberg adjusted p-value (false discovery rate).
    pub bh: f64,
    /// Welch's t-test p-value, as a classical cross-check.
    pub welch_p: Option<f64>,
}

/// What the k-group analysis found.
#[derive(Clone, Debug, PartialEq, Serialize, Deserialize)]
pub struct KGroupsReport {
    /// The layout actually used.
    pub layout: Layout,
    /// What the values are.
    pub value_label: String,
    /// The groups.
    pub groups: Vec<GroupSummary>,
    /// What was left out.
    pub notes: Vec<Note>,
    /// The omnibus statistic.
    pub statistic: KStatistic,
    /// The omnibus test (upper tail: larger values mean more spread between groups).
    #[serde(flatten)]
    pub test: TestOutcome,
    /// The effect: eta squared (between-group share of the total sum of squares).
    #[serde(with = "float")]
    pub effect: f64,
    /// Its headline bootstrap interval.
    pub ci: Interval,
    /// The headline interval and any further methods.
    pub intervals: Vec<Interval>,
    /// Omega squared.
    pub omega_squared: Option<f64>,
    /// Bootstrap resamples.
    pub bootstrap_resamples: u64,
    /// Bootstrap standard error of eta squared.
    pub bootstrap_se: Option<f64>,
    /// The bootstrap values of eta squared, binned.
    pub bootstrap_histogram: Histogram,
    /// One-way ANOVA (classical cross-check).
    pub anova: FTest,
    /// Welch's ANOVA (classical cross-check).
    pub welch_anova: FTest,
    /// Kruskal–Wallis test (classical cross-check).
    pub kruskal_wallis: ChiSquareTest,
    /// The control group, when each group is compared with it.
    pub control: Option<String>,
    /// The direction of the follow-up comparisons.
    pub alternative: Alternative,
    /// How their two-sided p-values are defined.
    pub two_sided: TwoSidedRule,
    /// The follow-up comparisons.
    pub pairwise: Vec<Comparison>,
    /// What to keep in mind.
    pub cautions: Vec<Caution>,
}

impl Design for KGroupsDesign {
    const KEY: DesignKey = DesignKey::KGroups;
    type Request = KGroupsRequest;
    type Report = KGroupsReport;

    fn check(req: &KGroupsRequest) -> Result<(), Error> {
        req.settings.check("relabellings")
    }

    fn run(req: &KGroupsRequest, progress: ProgressFn) -> Result<KGroupsReport, Error> {
        run(req, progress)
    }

    fn data(req: &KGroupsRequest) -> &str {
        &req.data
    }

    fn clear_data(req: &mut KGroupsRequest) {
        req.data.clear();
    }

    fn seed(req: &KGroupsRequest) -> u64 {
        req.settings.seed
    }

    fn test_settings(req: &mut KGroupsRequest) -> Option<&mut TestSettings> {
        Some(&mut req.settings)
    }

    fn test_outcome(report: &KGroupsReport) -> Option<&TestOutcome> {
        Some(&report.test)
    }
}

/// Eta squared of groups given as values with cell labels (the bootstrap's form).
fn eta_squared_cells(x: &[f64], labels: &[f64], k: usize) -> f64 {
    let mut sum = vec![0.0; k];
    let mut cnt = vec![0.0; k];
    for (&v, &l) in x.iter().zip(labels) {
        sum[l as usize] += v;
        cnt[l as usize] += 1.0;
    }
    let n: f64 = cnt.iter().sum();
    let grand = sum.iter().sum::<f64>() / n;
    let sst: f64 = x.iter().map(|v| (v - grand) * (v - grand)).sum();
    let ssb: f64 = (0..k)
        .filter(|&g| cnt[g] > 0.0)
        .map(|g| cnt[g] * (sum[g] / cnt[g] - grand).powi(2))
        .sum();
    if sst > 0.0 {
        ssb / sst
    } else {
        f64::NAN
    }
}

/// Eta and omega squared of the groups.
fn effect_sizes(groups: &[Vec<f64>]) -> (f64, Option<f64>) {
    let k = groups.len();
    let x: Vec<f64> = groups.iter().flatten().copied().collect();
    let labels: Vec<f64> = groups
        .iter()
        .enumerate()
        .flat_map(|(g, v)| std::iter::repeat_n(g as f64, v.len()))
        .collect();
    let eta = eta_squared_cells(&x, &labels, k);
    let n = x.len() as f64;
    let grand = stats::mean(&x);
    let sst: f64 = x.iter().map(|v| (v - grand) * (v - grand)).sum();
    let ssb = eta * sst;
    let msw = (sst - ssb) / (n - k as f64);
    let omega = (sst + msw > 0.0).then(|| (ssb - (k as f64 - 1.0) * msw) / (sst + msw));
    (eta, omega.filter(|v| v.is_finite()))
}

/// Runs a k-group request.
pub fn run(req: &KGroupsRequest, progress: ProgressFn) -> Result<KGroupsReport, Error> {
    KGroupsDesign::check(req)?;
    let st = &req.settings;
    let t = table::parse(&req.data, req.header)?;
    let g = groups::k_groups(&t, &req.layout)?;
    drop(t); // before the resampling (memory on large tables)
    let k = g.names.len();
    if k > u16::MAX as usize {
        return Err(Error::data(format!(
            "{k} groups are more than this analysis can take; compare fewer groups."
        )));
    }
    let control = match &req.control {
        Some(c) => Some(g.names.iter().position(|n| n == c).ok_or_else(|| {
            Error::data(format!(
                "The control group \"{c}\" is not one of the groups ({}).",
                g.names
                    .iter()
                    .map(|n| format!("\"{n}\""))
                    .collect::<Vec<_>>()
                    .join(", ")
            ))
        })?),
        None => None,
    };
    if control.is_none() && st.alternative != Alternative::TwoSided {
        return Err(Error::data(
            "One-sided follow-up comparisons need a control group (each group is then compared \
             with it in the direction chosen). Choose a control group, or ask a two-sided question.",
        ));
    }
    // Bound the work before any starts: the omnibus test and every follow-up comparison.
    let sizes: Vec<usize> = g.values.iter().map(Vec::len).collect();
    let big_n: usize = sizes.iter().sum();
    let pair_values = match control {
        Some(c) => big_n - sizes[c] + (k - 1) * sizes[c],
        None => {
            if k * (k - 1) / 2 > super::MAX_PAIRS {
                return Err(Error::new(
                    ErrorKind::Limit,
                    format!(
                        "{k} groups make {} pairs, more follow-up comparisons than the {} one \
                         analysis runs. Choose a control group (then each group is compared \
                         with it: {} comparisons), or compare fewer groups.",
                        crate::base::format::count((k * (k - 1) / 2) as u64),
                        crate::base::format::count(super::MAX_PAIRS as u64),
                        crate::base::format::count(k as u64 - 1)
                    ),
                ));
            }
            (k - 1) * big_n
        }
    };
    super::check_work(big_n + pair_values, 1, st)?;
    let mut notes = g.notes.clone();

    // The omnibus test.
    let setup = KSetup::new(req.statistic, &g.values);
    let count = labellings(&setup.sizes);
    let null = driver::Relabelling {
        count,
        exact_limit: st.exact_limit,
        resamples: st.resamples,
        seed: st.seed,
        stage: Stage::Relabelling,
        stop: st.stop(Alternative::Greater, setup.observed, setup.tolerance),
        block: crate::resample::rng::BLOCK,
    }
    .run(
        progress,
        &mut |cb| setup.enumerate(rng::BLOCK, cb),
        &|s, len| setup.random_block(s, len),
    )?;
    let test = TestOutcome::from_null(
        &null,
        Alternative::Greater,
        TwoSidedRule::Absolute,
        setup.observed,
        st.seed,
    );
    let values = &null.values[..];
    let infinite = values.iter().filter(|v| !v.is_finite()).count();
    if infinite > 0 {
        notes.push(Note::InfiniteStatistics {
            count: infinite as u64,
            cause: InfiniteCause::NoSpreadInAGroup,
        });
    }

    // Eta squared with a bootstrap interval, each group resampled within itself.
    let (eta, omega) = effect_sizes(&g.values);
    let x: Vec<f64> = g.values.iter().flatten().copied().collect();
    let labels: Vec<f64> = g
        .values
        .iter()
        .enumerate()
        .flat_map(|(i, v)| std::iter::repeat_n(i as f64, v.len()))
        .collect();
    let mut cells: Vec<Vec<usize>> = Vec::new();
    let mut at = 0;
    for v in &g.values {
        cells.push((at..at + v.len()).collect());
        at += v.len();
    }
    let cell_design = Resampling::Cells {
        x: &x,
        labels: &labels,
        cells: &cells,
    };
    let eta_f = move |a: &mut [f64], l: &mut [f64]| eta_squared_cells(a, l, k);
    let eta_stat = Stat {
        f: &eta_f,
        estimate: eta,
        se: SeMethod::None,
    };
    let (bv, _) = boot::resample(
        &cell_design,
        &[eta_stat],
        st.seed,
        st.bootstrap_resamples,
        progress,
    )?;
    // No standard error formula for eta squared: a studentized choice gives BCa here.
    let mut eta_methods: Vec<IntervalMethod> = Vec::new();
    for m in st.methods() {
        let m = if m == IntervalMethod::Studentized {
            IntervalMethod::Bca
        } else {
            m
        };
        if !eta_methods.contains(&m) {
            eta_methods.push(m);
        }
    }
    let eta_boot = super::summarise_bootstrap(
        &eta_methods,
        st.confidence,
        eta,
        &bv[0],
        None,
        Some((0.0, 1.0)),
        &mut || boot::acceleration(&cell_design, &eta_f),
    );
    super::few_resamples_note(st, &mut notes);

    // Follow-up comparisons, each with its own seed.
    let pair_st = req.statistic.pairwise();
    let pairs: Vec<(usize, usize)> = match control {
        Some(c) => (0..k).filter(|&i| i != c).map(|i| (i, c)).collect(),
        None => (0..k)
            .flat_map(|i| (i + 1..k).map(move |j| (i, j)))
            .collect(),
    };
    let pair_alt = if control.is_some() {
        st.alternative
    } else {
        Alternative::TwoSided
    };
    let mut pairwise = Vec::with_capacity(pairs.len());
    let total_pairs = pairs.len();
    for (idx, &(i, j)) in pairs.iter().enumerate() {
        let (a, b) = (&g.values[i], &g.values[j]);
        let seed = rng::sub_seed(st.seed, 1 + idx as u64);
        let stage = Stage::Comparison {
            index: idx + 1,
            of: total_pairs,
        };
        let setup2 = Setup::new(pair_st, a, b);
        let mut relabel_progress = |p: &Progress| {
            progress(&Progress {
                stage: stage.clone(),
                ..p.clone()
            })
        };
        let null = perm::null_distribution(
            &setup2,
            st.exact_limit,
            st.resamples,
            seed,
            None,
            &mut relabel_progress,
        )?;
        let pr = p_value(&null.counts, null.exact, pair_alt, st.two_sided);
        // The bootstrap interval of the difference (means, or medians for the median spread).
        let effect_st = pair_st.effect();
        let diff = perm::statistic_value(effect_st, a, b);
        let f: boot::TwoSampleFn = match effect_st {
            Statistic::MedianDifference => |a, b| stats::median_select(a) - stats::median_select(b),
            _ => |a, b| stats::mean(a) - stats::mean(b),
        };
        let welch_se = |a: &mut [f64], b: &mut [f64]| {
            (stats::variance(a) / a.len() as f64 + stats::variance(b) / b.len() as f64).sqrt()
        };
        let studentize = st.interval() == IntervalMethod::Studentized;
        let se = match (studentize, effect_st) {
            (false, _) => SeMethod::None,
            (true, Statistic::MedianDifference) => SeMethod::Nested(boot::NESTED),
            (true, _) => SeMethod::Formula(&welch_se),
        };
        let two = Resampling::Two { a, b };
        let (bv2, tv2) = boot::resample(
            &two,
            &[Stat {
                f: &f,
                estimate: diff,
                se,
            }],
            seed,
            st.bootstrap_resamples,
            &mut relabel_progress,
        )?;
        let se_hat = match se {
            SeMethod::Formula(h) => h(&mut a.clone(), &mut b.clone()),
            SeMethod::Nested(_) => boot::standard_error(&bv2[0]).unwrap_or(f64::NAN),
            SeMethod::None => f64::NAN,
        };
        let summary = super::summarise_bootstrap(
            &[st.interval()],
            st.confidence,
            diff,
            &bv2[0],
            studentize.then_some((&tv2[0][..], se_hat)),
            None,
            &mut || boot::acceleration(&two, &f),
        );
        pairwise.push(Comparison {
            first: g.names[i].clone(),
            second: g.names[j].clone(),
            difference: diff,
            ci: summary.ci(),
            p_value: pr.p,
            exact: null.exact,
            resamples: null.counts.total,
            mc_se: pr.mc_se,
            holm: 0.0,
            bh: 0.0,
            welch_p: classical::welch(a, b, pair_alt, st.confidence).p_value,
        });
    }
    let raw: Vec<f64> = pairwise.iter().map(|c| c.p_value).collect();
    for ((c, h), b) in pairwise
        .iter_mut()
        .zip(multiple::holm(&raw))
        .zip(multiple::benjamini_hochberg(&raw))
    {
        c.holm = h;
        c.bh = b;
    }

    let groups: Vec<GroupSummary> = g
        .names
        .iter()
        .zip(&g.values)
        .map(|(n, v)| group_summary(n, v, g.shift))
        .collect();
    let cautions = cautions(req.statistic, &groups);
    Ok(KGroupsReport {
        layout: g.layout.clone(),
        value_label: g.value_label.clone(),
        groups,
        notes,
        statistic: req.statistic,
        test,
        effect: eta,
        ci: eta_boot.ci(),
        intervals: eta_boot.intervals,
        omega_squared: omega,
        bootstrap_resamples: st.bootstrap_resamples,
        bootstrap_se: eta_boot.se,
        bootstrap_histogram: eta_boot.histogram,
        anova: classical::one_way_anova(&g.values),
        welch_anova: classical::welch_anova(&g.values),
        kruskal_wallis: classical::kruskal_wallis(&g.values),
        control: control.map(|c| g.names[c].clone()),
        alternative: pair_alt,
        two_sided: st.two_sided,
        pairwise,
        cautions,
    })
}

/// Which cautions apply.
fn cautions(statistic: KStatistic, groups: &[GroupSummary]) -> Vec<Caution> {
    let mut c = vec![Caution::Assumptions, Caution::FollowUps];
    let smallest = groups.iter().map(|g| g.n).min().unwrap_or(0);
    if smallest < 10 {
        c.push(Caution::SmallSample { smallest });
    }
    let (lo, hi) = groups.iter().fold((f64::INFINITY, 0.0f64), |(l, h), g| {
        (l.min(g.sd), h.max(g.sd))
    });
    let sizes_differ = groups.iter().any(|g| g.n != groups[0].n);
    if statistic == KStatistic::F && lo > 0.0 && hi / lo > 2.0 && sizes_differ {
        c.push(Caution::UnequalSpreads { ratio: hi / lo });
    }
    c.push(Caution::EtaOverstates);
    super::closing_cautions(&mut c);
    c
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::resample::k_groups::next_permutation;

    #[test]
    fn next_permutation_visits_every_distinct_labelling_once() {
        let mut a = vec![0u16, 0, 1, 1, 2];
        let mut seen = std::collections::HashSet::new();
        seen.insert(a.clone());
        while next_permutation(&mut a) {
            assert!(seen.insert(a.clone()), "repeated {a:?}");
        }
        assert_eq!(seen.len() as u64, labellings(&[2, 2, 1]));
        assert_eq!(seen.len(), 30);
        assert_eq!(labellings(&[4, 4, 4]), 34_650);
    }

    #[test]
    fn kernel_matches_the_classical_statistics() {
        let g = vec![
            vec![4.1, 5.3, 3.8, 6.0, 5.1],
            vec![6.2, 7.1, 6.8, 5.9],
            vec![3.1, 2.7, 4.4, 3.9, 3.3, 2.2],
        ];
        let f = KSetup::new(KStatistic::F, &g).observed;
        assert!((f - classical::one_way_anova(&g).f.unwrap()).abs() < 1e-9);
        let w = KSetup::new(KStatistic::WelchF, &g).observed;
        assert!((w - classical::welch_anova(&g).f.unwrap()).abs() < 1e-9);
        let m = KSetup::new(KStatistic::MedianSpread, &g).observed;
        let pooled: Vec<f64> = g.iter().flatten().copied().collect();
        let pm = stats::median(&pooled);
        let direct = g
            .iter()
            .map(|v| v.len() as f64 * (stats::median(v) - pm).abs())
            .sum::<f64>()
            / pooled.len() as f64;
        assert!((m - direct).abs() < 1e-9, "{m} vs {direct}");
    }

    fn data() -> String {
        "y,g\n4.1,a\n5.3,a\n3.8,a\n6.0,a\n6.2,b\n7.1,b\n6.8,b\n5.9,b\n3.1,c\n2.7,c\n4.4,c\n3.9,c\n"
            .into()
    }

    #[test]
    fn exact_and_monte_carlo_agree_and_runs_repeat() {
        let mut r = KGroupsRequest::new(data(), Layout::Detect, 9);
        r.settings.bootstrap_resamples = 500;
        let ex = run(&r, &mut |_| true).unwrap();
        assert!(ex.test.exact);
        assert_eq!(ex.test.resamples, 34_650);
        assert_eq!(ex.pairwise.len(), 3);
        assert!(ex.pairwise.iter().all(|c| c.exact && c.holm >= c.p_value));
        r.settings.exact_limit = 0;
        r.settings.resamples = 20_000;
        let mc = run(&r, &mut |_| true).unwrap();
        assert!(!mc.test.exact);
        let se = mc.test.mc_se.unwrap();
        assert!(
            (mc.test.p_value - ex.test.p_value).abs() < 4.0 * se + 2e-4,
            "{} vs {}",
            mc.test.p_value,
            ex.test.p_value
        );
        assert_eq!(mc, run(&r, &mut |_| true).unwrap());
    }

    #[test]
    fn control_comparisons_and_messages() {
        let mut r = KGroupsRequest::new(data(), Layout::Detect, 9);
        r.settings.bootstrap_resamples = 300;
        r.control = Some("c".into());
        r.settings.alternative = Alternative::Greater;
        let rep = run(&r, &mut |_| true).unwrap();
        assert_eq!(rep.pairwise.len(), 2);
        assert!(rep
            .pairwise
            .iter()
            .all(|c| c.second == "c" && c.difference > 0.0));
        r.control = Some("z".into());
        let e = run(&r, &mut |_| true).unwrap_err().to_string();
        assert!(e.contains("\"z\" is not one of the groups"), "{e}");
        r.control = None;
        let e = run(&r, &mut |_| true).unwrap_err().to_string();
        assert!(e.contains("need a control group"), "{e}");
    }

    #[test]
    fn identical_values_do_not_break_anything() {
        let mut r = KGroupsRequest::new(
            "y,g\n3,a\n3,a\n3,b\n3,b\n3,c\n3,c\n".into(),
            Layout::Detect,
            1,
        );
        r.settings.bootstrap_resamples = 200;
        for st in KStatistic::ALL {
            r.statistic = st;
            let rep = run(&r, &mut |_| true).unwrap();
            assert_eq!(rep.test.p_value, 1.0, "{st:?}");
            assert!(rep.anova.f.is_none());
        }
    }
}

//! Yes/no outcomes in two groups (conversion, germination, pass/fail), from a column of
//! yes/no values or from counts typed in ("42/300, 61/310").
//!
//! The permutation test of a 2×2 table keeps both margins (the group sizes and the total
//! number of yes answers) and relabels the units: the number of yes answers in the first
//! group then follows the hypergeometric distribution. Every statistic here (difference in
//! proportions, risk ratio, odds ratio) increases with that number, so the exact p-value is
//! a sum of hypergeometric probabilities: no resamples are drawn, whatever the size. This is
//! Fisher's exact test; the report also gives Fisher's own two-sided rule (tables no more
//! likely than the observed one) and the chi-square test as cross-checks, the Newcombe,
//! Katz and Woolf intervals, and a bootstrap interval (each group resampled within itself,
//! which for 0/1 data is a binomial draw).

use serde::{Deserialize, Serialize};

use super::{Caution, Design, DesignKey, TestOutcome, TestSettings};
use crate::base::*;
use crate::classical::tables::{
    chi_square, classical_measures, hypergeometric, FisherExact, Measure, Table2,
};
use crate::classical::ChiSquareTest;
pub use crate::input::counts::{parse_counts, CountGroup};
use crate::input::table::{self, HeaderChoice};
use crate::num::normal;
use crate::resample::binomial::Binomial;
use crate::resample::rng::RNG_NAME;
use crate::resample::summary::histogram;
use crate::resample::{boot, rng};

/// The yes/no design.
pub struct YesNoDesign;

/// What measures the difference between two groups' yes rates.
#[derive(Clone, Copy, Debug, PartialEq, Eq, Serialize, Deserialize)]
#[serde(rename_all = "kebab-case")]
pub enum YesNoStatistic {
    /// First group's share of yes minus the second's.
    ProportionDifference,
    /// First group's share of yes over the second's.
    RiskRatio,
    /// First group's odds of yes over the second's.
    OddsRatio,
}

impl YesNoStatistic {
    /// Every statistic.
    pub const ALL: [YesNoStatistic; 3] = [
        YesNoStatistic::ProportionDifference,
        YesNoStatistic::RiskRatio,
        YesNoStatistic::OddsRatio,
    ];
    /// The key in requests and on the command line.
    pub fn key(self) -> &'static str {
        match self {
            YesNoStatistic::ProportionDifference => "proportion-difference",
            YesNoStatistic::RiskRatio => "risk-ratio",
            YesNoStatistic::OddsRatio => "odds-ratio",
        }
    }
    /// The statistic with this key.
    pub fn from_key(s: &str) -> Option<YesNoStatistic> {
        YesNoStatistic::ALL.into_iter().find(|x| x.key() == s)
    }
    /// The statistic's name.
    pub fn label(self) -> &'static str {
        match self {
            YesNoStatistic::ProportionDifference => "difference in proportions",
            YesNoStatistic::RiskRatio => "risk ratio",
            YesNoStatistic::OddsRatio => "odds ratio",
        }
    }
    /// Whether the statistic is a ratio (compared and bootstrapped on the log scale).
    pub fn is_ratio(self) -> bool {
        self != YesNoStatistic::ProportionDifference
    }
}

/// Where the outcomes are.
#[derive(Clone, Debug, PartialEq, Serialize, Deserialize)]
#[serde(tag = "kind", rename_all = "kebab-case")]
pub enum YesNoInput {
    /// A column of yes/no values (1/0, yes/no, true/false, pass/fail) and a column naming
    /// each row's group. With more than two groups, `first` and `second` pick two.
    Table {
        /// The outcome column.
        value: String,
        /// The group column.
        group: String,
        /// The group that comes first.
        #[serde(default)]
        first: Option<String>,
        /// The group that comes second.
        #[serde(default)]
        second: Option<String>,
    },
    /// Counts typed in: yes answers out of each group's size (exactly two groups).
    Counts {
        /// The two groups' counts.
        groups: Vec<CountGroup>,
    },
}

/// Yes/no outcomes in two groups: where they are, the statistic and the settings.
#[derive(Clone, Debug, PartialEq, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct YesNoRequest {
    /// The table as pasted (empty when the counts are typed in).
    #[serde(default)]
    pub data: String,
    /// Whether the first row holds column names.
    #[serde(default)]
    pub header: HeaderChoice,
    /// Where the outcomes are.
    pub input: YesNoInput,
    /// The statistic.
    pub statistic: YesNoStatistic,
    /// The test and interval settings.
    pub settings: TestSettings,
}

impl YesNoRequest {
    /// The defaults the page and the command start from.
    pub fn new(data: String, input: YesNoInput, seed: u64) -> YesNoRequest {
        YesNoRequest {
            data,
            header: HeaderChoice::Detect,
            input,
            statistic: YesNoStatistic::ProportionDifference,
            settings: TestSettings::new(seed),
        }
    }
}

/// What the yes/no analysis found.
#[derive(Clone, Debug, PartialEq, Serialize, Deserialize)]
pub struct YesNoReport {
    /// What a yes is (the outcome column's name, or "yes" for typed counts).
    pub outcome_label: String,
    /// The two groups, first and second.
    pub names: [String; 2],
    /// Yes answers in each group.
    pub yes: [u64; 2],
    /// Size of each group.
    pub n: [u64; 2],
    /// What was left out or needs care.
    pub notes: Vec<Note>,
    /// The statistic.
    pub statistic: YesNoStatistic,
    /// The direction of the test.
    pub alternative: Alternative,
    /// How the two-sided p-value is defined.
    pub two_sided: TwoSidedRule,
    /// The test: exact over all relabellings, grouped into the possible tables (so
    /// `resamples` counts tables and `extreme_count` the tables in the tail).
    #[serde(flatten)]
    pub test: TestOutcome,
    /// log10 of the number of relabellings, C(N, n1).
    pub relabellings_log10: f64,
    /// The statistic's value.
    #[serde(with = "float")]
    pub effect: f64,
    /// Its headline bootstrap interval.
    pub ci: Interval,
    /// The headline interval and any further methods.
    pub intervals: Vec<Interval>,
    /// Bootstrap resamples.
    pub bootstrap_resamples: u64,
    /// Bootstrap standard error.
    pub bootstrap_se: Option<f64>,
    /// The bootstrap values, binned.
    pub bootstrap_histogram: Histogram,
    /// Difference in proportions with the Newcombe hybrid score interval.
    pub difference: Measure,
    /// Risk ratio with the Katz log interval.
    pub risk_ratio: Measure,
    /// Odds ratio with the Woolf (logit) interval.
    pub odds_ratio: Measure,
    /// Fisher's exact test as commonly computed.
    pub fisher_exact: FisherExact,
    /// Pearson's chi-square test without Yates' continuity correction.
    pub chi_square: ChiSquareTest,
    /// Pearson's chi-square test with Yates' continuity correction.
    pub chi_square_yates: ChiSquareTest,
    /// The smallest expected count of the table.
    pub smallest_expected: f64,
    /// What to keep in mind.
    pub cautions: Vec<Caution>,
}

impl Design for YesNoDesign {
    const KEY: DesignKey = DesignKey::YesNo;
    type Request = YesNoRequest;
    type Report = YesNoReport;

    fn check(req: &YesNoRequest) -> Result<(), Error> {
        req.settings.check("relabellings")
    }

    fn run(req: &YesNoRequest, progress: ProgressFn) -> Result<YesNoReport, Error> {
        run(req, progress)
    }

    fn data(req: &YesNoRequest) -> &str {
        &req.data
    }

    fn clear_data(req: &mut YesNoRequest) {
        req.data.clear();
        if let YesNoInput::Counts { groups } = &mut req.input {
            for g in groups {
                (g.yes, g.n) = (0, 0);
            }
        }
    }

    fn has_data(req: &YesNoRequest) -> bool {
        match &req.input {
            YesNoInput::Counts { groups } => groups.iter().all(|g| g.n > 0),
            _ => !req.data.trim().is_empty(),
        }
    }

    fn seed(req: &YesNoRequest) -> u64 {
        req.settings.seed
    }

    fn test_settings(req: &mut YesNoRequest) -> Option<&mut TestSettings> {
        Some(&mut req.settings)
    }

    fn test_outcome(report: &YesNoReport) -> Option<&TestOutcome> {
        Some(&report.test)
    }
}

/// The statistic when the first group has `a` yes answers and the margins are fixed.
fn stat_at(st: YesNoStatistic, a: f64, n1: f64, m: f64, n2: f64) -> f64 {
    let c = m - a;
    match st {
        YesNoStatistic::ProportionDifference => a / n1 - c / n2,
        YesNoStatistic::RiskRatio => (a / n1) / (c / n2),
        YesNoStatistic::OddsRatio => (a * (n2 - c)) / ((n1 - a) * c),
    }
}

/// The value compared between tables: the statistic, on the log scale for ratios (so that
/// "at least as far from no difference" is symmetric).
fn comparable(st: YesNoStatistic, v: f64) -> f64 {
    if st.is_ratio() {
        v.ln()
    } else {
        v
    }
}

/// Reads the 2×2 table the request describes.
fn read(req: &YesNoRequest, notes: &mut Vec<Note>) -> Result<([String; 2], Table2, String), Error> {
    match &req.input {
        YesNoInput::Counts { groups } => {
            if groups.len() != 2 {
                return Err(Error::data(format!(
                    "{} groups of counts were given; this comparison needs exactly two.",
                    groups.len()
                )));
            }
            for g in groups {
                if g.n == 0 || g.yes > g.n {
                    return Err(Error::data(format!(
                        "Group \"{}\" has {} yes answers out of {}; the total must be at least 1 \
                         and at least the number of yes answers.",
                        g.name, g.yes, g.n
                    )));
                }
            }
            Ok((
                [groups[0].name.clone(), groups[1].name.clone()],
                Table2 {
                    a: groups[0].yes,
                    n1: groups[0].n,
                    c: groups[1].yes,
                    n2: groups[1].n,
                },
                "yes".into(),
            ))
        }
        YesNoInput::Table {
            value,
            group,
            first,
            second,
        } => {
            if value == group {
                return Err(Error::data(format!(
                    "The same column (\"{value}\") was chosen for the outcome and the groups. \
                     Choose a different column for each."
                )));
            }
            let t = table::parse(&req.data, req.header)?;
            let vcol = t.column(value)?;
            let gcol = t.column(group)?;
            let mut levels: Vec<String> = Vec::new();
            let mut counts: Vec<(u64, u64)> = Vec::new();
            notes.extend(t.notes());
            let (mut missing, mut unlabelled) = (Vec::new(), 0usize);
            let mut index: std::collections::HashMap<&str, usize> = Default::default();
            for (cell, gcell) in vcol.cells().zip(gcol.cells()) {
                let yes = match table::read_yes_no(cell.text) {
                    Some(Some(y)) => y,
                    Some(None) => {
                        missing.push(cell);
                        continue;
                    }
                    None => {
                        return Err(Error::new(
                            ErrorKind::Value,
                            format!(
                                "Line {} of column \"{value}\" holds \"{}\"; a yes/no outcome \
                                 needs 1/0, yes/no, true/false or pass/fail in every cell. \
                                 Correct it, or clear the cell to leave the row out.",
                                cell.line,
                                crate::base::format::brief(cell.text.trim())
                            ),
                        )
                        .at_line(cell.line)
                        .in_column(value.clone()))
                    }
                };
                let label = gcell.text.trim();
                if label.is_empty() || table::is_spreadsheet_error(label) {
                    unlabelled += 1;
                    continue;
                }
                let li = *index.entry(label).or_insert_with(|| {
                    levels.push(label.to_string());
                    counts.push((0, 0));
                    levels.len() - 1
                });
                counts[li].0 += u64::from(yes);
                counts[li].1 += 1;
            }
            notes.extend(table::left_out_notes(value, &missing));
            if unlabelled > 0 {
                notes.push(Note::Unlabelled {
                    column: group.clone(),
                    count: unlabelled,
                    lines: Vec::new(),
                });
            }
            let find = |name: &str| {
                levels.iter().position(|l| l == name).ok_or_else(|| {
                    Error::data(format!(
                        "There is no group \"{name}\" in column \"{group}\"; its groups are {}.",
                        levels
                            .iter()
                            .map(|l| format!("\"{l}\""))
                            .collect::<Vec<_>>()
                            .join(", ")
                    ))
                })
            };
            let (f, s) = match (levels.len(), first, second) {
                (0, _, _) => {
                    return Err(Error::data(format!(
                        "Column \"{group}\" has no group labels next to the outcomes."
                    )))
                }
                (1, _, _) => {
                    return Err(Error::data(format!(
                        "Column \"{group}\" names only one group (\"{}\"); a comparison needs two.",
                        levels[0]
                    )))
                }
                (_, Some(f), Some(s)) => (find(f)?, find(s)?),
                (2, Some(f), None) => {
                    let f = find(f)?;
                    (f, 1 - f)
                }
                (2, None, _) => (0, 1),
                (k, _, _) => {
                    return Err(Error::data(format!(
                        "Column \"{group}\" names {k} groups; choose the first and the second \
                         group to compare."
                    )))
                }
            };
            if f == s {
                return Err(Error::data(format!(
                    "\"{}\" was chosen as both the first and the second group.",
                    levels[f]
                )));
            }
            if levels.len() > 2 {
                notes.push(Note::OtherGroupsLeftOut {
                    first: levels[f].clone(),
                    second: levels[s].clone(),
                    others: levels
                        .iter()
                        .enumerate()
                        .filter(|(i, _)| *i != f && *i != s)
                        .map(|(_, l)| l.clone())
                        .collect(),
                });
            }
            Ok((
                [levels[f].clone(), levels[s].clone()],
                Table2 {
                    a: counts[f].0,
                    n1: counts[f].1,
                    c: counts[s].0,
                    n2: counts[s].1,
                },
                value.clone(),
            ))
        }
    }
}

/// The bootstrap values of the statistic (on the log scale for ratios) and, for the
/// studentized interval, their t values.
fn bootstrap(
    st: YesNoStatistic,
    t: &Table2,
    estimate: f64,
    settings: &TestSettings,
    progress: ProgressFn,
) -> Result<(Vec<f64>, Vec<f64>), Error> {
    let (b1, b2) = (Binomial::new(t.n1, t.a), Binomial::new(t.n2, t.c));
    let (n1, n2) = (t.n1 as f64, t.n2 as f64);
    let studentize = settings.methods().contains(&IntervalMethod::Studentized);
    let total = settings.bootstrap_resamples;
    let mut values = Vec::with_capacity(total as usize);
    let mut tvals = Vec::new();
    let streams = rng::Streams::new(settings.seed, rng::Purpose::Bootstrap, 0);
    for (blk, mut stream) in (0..rng::block_count(total)).zip(streams) {
        for _ in 0..rng::block_len(total, blk) {
            let (a, c) = (b1.draw(&mut stream) as f64, b2.draw(&mut stream) as f64);
            let v = comparable(st, stat_at(st, a, n1, a + c, n2));
            values.push(v);
            if studentize {
                let se = log_scale_se(st, a, n1, c, n2);
                tvals.push(if se > 0.0 && se.is_finite() {
                    (v - estimate) / se
                } else {
                    f64::NAN
                });
            }
        }
        if !progress(&Progress {
            stage: Stage::Bootstrap,
            done: values.len() as u64,
            total,
            running: None,
            sketch: None,
        }) {
            return Err(Error::cancelled());
        }
    }
    Ok((values, tvals))
}

/// Standard error of the statistic on its comparison scale (the difference itself, or the
/// log of the ratio): Wald, Katz and Woolf formulas.
fn log_scale_se(st: YesNoStatistic, a: f64, n1: f64, c: f64, n2: f64) -> f64 {
    match st {
        YesNoStatistic::ProportionDifference => {
            let (p1, p2) = (a / n1, c / n2);
            (p1 * (1.0 - p1) / n1 + p2 * (1.0 - p2) / n2).sqrt()
        }
        YesNoStatistic::RiskRatio => (1.0 / a - 1.0 / n1 + 1.0 / c - 1.0 / n2).sqrt(),
        YesNoStatistic::OddsRatio => (1.0 / a + 1.0 / (n1 - a) + 1.0 / c + 1.0 / (n2 - c)).sqrt(),
    }
}

/// Jackknife acceleration for two groups of 0/1 values in closed form: leaving out a yes
/// or a no of a group gives one of two values, each repeated as often as there are such
/// units (the form of [`boot::acceleration_from_loo`]).
fn acceleration(st: YesNoStatistic, t: &Table2) -> Option<f64> {
    let (a, n1, c, n2) = (t.a as f64, t.n1 as f64, t.c as f64, t.n2 as f64);
    let f = |a: f64, n1: f64, c: f64, n2: f64| comparable(st, stat_at(st, a, n1, a + c, n2));
    let groups = [
        // (value without one yes, count of yes, value without one no, count of no, n)
        (
            f(a - 1.0, n1 - 1.0, c, n2),
            a,
            f(a, n1 - 1.0, c, n2),
            n1 - a,
            n1,
        ),
        (
            f(a, n1, c - 1.0, n2 - 1.0),
            c,
            f(a, n1, c, n2 - 1.0),
            n2 - c,
            n2,
        ),
    ];
    let (mut num, mut den) = (0.0, 0.0);
    for (v_yes, k_yes, v_no, k_no, n) in groups {
        let terms = [(v_yes, k_yes), (v_no, k_no)];
        if terms.iter().any(|(v, k)| *k > 0.0 && !v.is_finite()) {
            return None;
        }
        let mean = terms
            .iter()
            .filter(|(_, k)| *k > 0.0)
            .map(|(v, k)| v * k)
            .sum::<f64>()
            / n;
        for (v, k) in terms.into_iter().filter(|(_, k)| *k > 0.0) {
            let u = (n - 1.0) * (mean - v);
            num += k * u * u * u / (n * n * n);
            den += k * u * u / (n * n);
        }
    }
    (den > 0.0 && den.is_finite()).then(|| num / (6.0 * (den * den.sqrt())))
}

/// Runs a yes/no request.
pub fn run(req: &YesNoRequest, progress: ProgressFn) -> Result<YesNoReport, Error> {
    YesNoDesign::check(req)?;
    let st = &req.settings;
    let mut notes = Vec::new();
    let (names, t, outcome_label) = read(req, &mut notes)?;
    if t.n1 < 1 || t.n2 < 1 {
        return Err(Error::data(
            "Each group needs at least one unit with a yes/no outcome.",
        ));
    }
    let stat = req.statistic;
    let (n1, n2, m) = (t.n1 as f64, t.n2 as f64, t.m() as f64);
    let observed = stat_at(stat, t.a as f64, n1, m, n2);

    // The exact test over the hypergeometric distribution of the first group's yes count.
    let (lo, pmf) = hypergeometric(&t);
    // The observed count lies in the window of non-negligible probabilities unless its own
    // probability underflows (counts in the millions far from the expected ones); then the
    // window's nearest end stands for it, which gives an upper bound of the p-value below
    // 1e-300 instead of an impossible p = 0.
    let obs_i = (t.a.saturating_sub(lo) as usize).min(pmf.len() - 1);
    let key = |i: usize| comparable(stat, stat_at(stat, (lo + i as u64) as f64, n1, m, n2));
    let obs_key = key(obs_i);
    let big_n = (t.n1 + t.n2) as i128;
    // |a·N − m·n1| is N·n1·n2 times |difference in proportions|: exact in integers.
    let dist_diff =
        |i: usize| ((lo + i as u64) as i128 * big_n - t.m() as i128 * t.n1 as i128).abs();
    // The observed table always counts (so p is never below its own probability, and never
    // 0), also when its statistic is undefined (no yes, or no no, in both groups).
    let counted_abs = |i: usize| -> bool {
        if i == obs_i {
            true
        } else if stat == YesNoStatistic::ProportionDifference {
            dist_diff(i) >= dist_diff(obs_i)
        } else {
            let (k, o) = (key(i).abs(), obs_key.abs());
            if o.is_infinite() {
                k.is_infinite()
            } else {
                k >= o - 1e-9 * o.max(1.0)
            }
        }
    };
    let upper: f64 = pmf[obs_i..].iter().sum();
    let lower: f64 = pmf[..=obs_i].iter().sum();
    let len = pmf.len();
    let counted: Vec<bool> = match (st.alternative, st.two_sided) {
        (Alternative::Greater, _) => (0..len).map(|i| i >= obs_i).collect(),
        (Alternative::Less, _) => (0..len).map(|i| i <= obs_i).collect(),
        (Alternative::TwoSided, TwoSidedRule::Absolute) => (0..len).map(counted_abs).collect(),
        (Alternative::TwoSided, TwoSidedRule::DoubledTail) => {
            if upper <= lower {
                (0..len).map(|i| i >= obs_i).collect()
            } else {
                (0..len).map(|i| i <= obs_i).collect()
            }
        }
    };
    let mut p: f64 = pmf
        .iter()
        .zip(&counted)
        .filter(|(_, c)| **c)
        .map(|(p, _)| p)
        .sum();
    if st.alternative == Alternative::TwoSided && st.two_sided == TwoSidedRule::DoubledTail {
        p *= 2.0;
    }
    let p = p.min(1.0);
    let extreme = counted.iter().filter(|c| **c).count() as u64;
    // Tail region in units of the first group's yes count, for the figure.
    let prefix = counted.iter().take_while(|c| **c).count();
    let suffix = counted.iter().rev().take_while(|c| **c).count();
    let tail = Tail {
        low: (prefix > 0 && prefix < len).then(|| (lo + prefix as u64 - 1) as f64),
        high: (suffix > 0).then(|| (lo + (len - suffix) as u64) as f64),
    };
    let tail = if prefix == len {
        Tail {
            low: Some((lo + len as u64 - 1) as f64),
            high: None,
        }
    } else {
        tail
    };
    // Fisher's two-sided rule: tables no more likely than the observed one (relative
    // tolerance 1e-7, as scipy.stats.fisher_exact).
    let fisher = match st.alternative {
        Alternative::Greater => FisherExact {
            p_value: upper.min(1.0),
            alternative: Alternative::Greater,
        },
        Alternative::Less => FisherExact {
            p_value: lower.min(1.0),
            alternative: Alternative::Less,
        },
        Alternative::TwoSided => FisherExact {
            p_value: pmf
                .iter()
                .filter(|v| **v <= pmf[obs_i] * (1.0 + 1e-7))
                .sum::<f64>()
                .min(1.0),
            alternative: Alternative::TwoSided,
        },
    };
    // The figure: probabilities of the yes counts near the bulk of the distribution.
    let top = pmf.iter().copied().fold(0.0, f64::max);
    let first_shown = pmf
        .iter()
        .position(|v| *v >= 1e-6 * top)
        .unwrap_or(0)
        .min(obs_i);
    let last_shown =
        (len - 1 - pmf.iter().rev().position(|v| *v >= 1e-6 * top).unwrap_or(0)).max(obs_i);
    let shown = last_shown - first_shown + 1;
    let width = shown.div_ceil(200).max(1);
    let bins = shown.div_ceil(width);
    let start = (lo + first_shown as u64) as f64 - 0.5;
    let edges: Vec<f64> = (0..=bins).map(|b| start + (b * width) as f64).collect();
    let mut weights = vec![0.0; bins];
    for (i, w) in pmf
        .iter()
        .enumerate()
        .take(last_shown + 1)
        .skip(first_shown)
    {
        weights[(i - first_shown) / width] += w;
    }
    let null_histogram = Histogram {
        edges,
        counts: vec![0; bins],
        weights: Some(weights),
    };
    let test = TestOutcome {
        observed,
        p_value: p,
        exact: true,
        resamples: len as u64,
        extreme_count: extreme,
        mc_se: None,
        p_interval: None,
        seed: st.seed,
        rng: RNG_NAME.into(),
        null_histogram,
        tail,
        sequential: None,
    };
    if !progress(&Progress {
        stage: Stage::ExactTest,
        done: 1,
        total: 1,
        running: None,
        sketch: None,
    }) {
        return Err(Error::cancelled());
    }

    // Bootstrap interval (computed on the log scale for ratios, then transformed back).
    let est_cmp = comparable(stat, observed);
    let (bv, tv) = bootstrap(stat, &t, est_cmp, st, progress)?;
    let se_hat = log_scale_se(stat, t.a as f64, n1, t.c as f64, n2);
    let methods = st.methods();
    let studentize = methods.contains(&IntervalMethod::Studentized);
    let summary = super::summarise_bootstrap(
        &methods,
        st.confidence,
        est_cmp,
        &bv,
        studentize.then_some((&tv[..], se_hat)),
        (!stat.is_ratio()).then_some((-1.0, 1.0)),
        &mut || (acceleration(stat, &t), false),
    );
    let mut intervals = summary.intervals.clone();
    if stat.is_ratio() {
        for iv in &mut intervals {
            iv.low = iv.low.map(f64::exp);
            iv.high = iv.high.map(f64::exp);
        }
    }
    let ci = intervals[0].clone();
    let (boot_se, boot_hist) = if stat.is_ratio() {
        let natural: Vec<f64> = bv
            .iter()
            .map(|v| v.exp())
            .filter(|v| v.is_finite())
            .collect();
        let mut marks = vec![observed];
        marks.extend(ci.low);
        marks.extend(ci.high);
        (
            boot::standard_error(&natural),
            histogram(&natural, &marks, 48),
        )
    } else {
        (summary.se, summary.histogram)
    };
    if stat.is_ratio() && !observed.is_finite() || observed == 0.0 && stat.is_ratio() {
        notes.push(Note::RatioAtLimit {
            statistic: stat.key().to_string(),
            value: observed,
        });
    }
    super::few_resamples_note(st, &mut notes);
    let (difference, risk_ratio, odds_ratio) = classical_measures(&t, st.confidence);
    let (chi, smallest) = chi_square(&t, false);
    let (chi_y, _) = chi_square(&t, true);
    let relabellings_log10 =
        (normal::ln_gamma(n1 + n2 + 1.0) - normal::ln_gamma(n1 + 1.0) - normal::ln_gamma(n2 + 1.0))
            / std::f64::consts::LN_10;
    let mut cautions = vec![Caution::Assumptions];
    if smallest < 5.0 {
        cautions.push(Caution::SmallExpected { smallest });
    }
    if t.n1.min(t.n2) < 20 {
        cautions.push(Caution::SmallGroupsForProportions {
            smallest: t.n1.min(t.n2),
        });
    }
    cautions.push(Caution::MeasuresDiffer);
    super::closing_cautions(&mut cautions);
    Ok(YesNoReport {
        outcome_label,
        names,
        yes: [t.a, t.c],
        n: [t.n1, t.n2],
        notes,
        statistic: stat,
        alternative: st.alternative,
        two_sided: st.two_sided,
        test,
        relabellings_log10,
        effect: observed,
        ci,
        intervals,
        bootstrap_resamples: st.bootstrap_resamples,
        bootstrap_se: boot_se,
        bootstrap_histogram: boot_hist,
        difference,
        risk_ratio,
        odds_ratio,
        fisher_exact: fisher,
        chi_square: chi,
        chi_square_yates: chi_y,
        smallest_expected: smallest,
        cautions,
    })
}

/// A proportion as a percentage with one decimal.
#[cfg(test)]
mod tests {
    use super::*;
    use crate::classical::tables::exact_p;
    use crate::resample::rng::{self, Stream};

    fn counts(a: u64, n1: u64, c: u64, n2: u64) -> YesNoRequest {
        let mut r = YesNoRequest::new(
            String::new(),
            YesNoInput::Counts {
                groups: vec![
                    CountGroup {
                        name: "old".into(),
                        yes: a,
                        n: n1,
                    },
                    CountGroup {
                        name: "new".into(),
                        yes: c,
                        n: n2,
                    },
                ],
            },
            5,
        );
        r.settings.bootstrap_resamples = 2000;
        r
    }

    fn choose_f(n: u64, k: u64) -> f64 {
        (0..k).fold(1.0, |acc, i| acc * (n - i) as f64 / (i + 1) as f64)
    }

    #[test]
    fn hypergeometric_matches_binomial_coefficients() {
        let t = Table2 {
            a: 3,
            n1: 8,
            c: 6,
            n2: 9,
        };
        let (lo, p) = hypergeometric(&t);
        assert_eq!(lo, 0);
        assert_eq!(p.len(), 9);
        for (i, v) in p.iter().enumerate() {
            let a = i as u64;
            let want = choose_f(8, a) * choose_f(9, 9 - a) / choose_f(17, 9);
            assert!((v - want).abs() < 1e-14, "{a}: {v} vs {want}");
        }
    }

    #[test]
    fn exact_p_equals_a_brute_force_relabelling_count() {
        // 5 of 9 yes vs 1 of 7: enumerate all C(16, 9) relabellings of the units directly.
        let (a, n1, c, n2) = (5u64, 9u64, 1u64, 7u64);
        let units: Vec<u8> = (0..16).map(|i| u8::from(i < 6)).collect();
        for st in YesNoStatistic::ALL {
            for (alt, rule) in [
                (Alternative::TwoSided, TwoSidedRule::Absolute),
                (Alternative::Greater, TwoSidedRule::Absolute),
                (Alternative::Less, TwoSidedRule::Absolute),
                (Alternative::TwoSided, TwoSidedRule::DoubledTail),
            ] {
                let mut r = counts(a, n1, c, n2);
                r.statistic = st;
                r.settings.alternative = alt;
                r.settings.two_sided = rule;
                let rep = run(&r, &mut |_| true).unwrap();
                let f = |x: f64| comparable(st, stat_at(st, x, 9.0, 6.0, 7.0));
                let obs = f(a as f64);
                let (mut ge, mut le, mut ab, mut total) = (0u64, 0u64, 0u64, 0u64);
                for mask in 0u32..(1 << 16) {
                    if mask.count_ones() != 9 {
                        continue;
                    }
                    let yes = (0..16)
                        .filter(|i| mask >> i & 1 == 1 && units[*i] == 1)
                        .count();
                    let v = f(yes as f64);
                    total += 1;
                    ge += u64::from(v >= obs - 1e-12);
                    le += u64::from(v <= obs + 1e-12);
                    let far = if obs.is_infinite() {
                        v.is_infinite()
                    } else {
                        v.abs() >= obs.abs() - 1e-12
                    };
                    ab += u64::from(far);
                }
                let want = match (alt, rule) {
                    (Alternative::Greater, _) => ge as f64 / total as f64,
                    (Alternative::Less, _) => le as f64 / total as f64,
                    (_, TwoSidedRule::Absolute) => ab as f64 / total as f64,
                    (_, TwoSidedRule::DoubledTail) => {
                        (2.0 * ge.min(le) as f64 / total as f64).min(1.0)
                    }
                };
                assert!(
                    (rep.test.p_value - want).abs() < 1e-12,
                    "{st:?} {alt:?} {rule:?}: {} vs {want}",
                    rep.test.p_value
                );
            }
        }
    }

    #[test]
    fn exact_p_equals_the_design_p() {
        for (a, n1, c, n2) in [(5, 9, 1, 7), (37, 48, 22, 48), (0, 15, 6, 15)] {
            for alt in [
                Alternative::TwoSided,
                Alternative::Greater,
                Alternative::Less,
            ] {
                let mut r = counts(a, n1, c, n2);
                r.settings.alternative = alt;
                r.settings.bootstrap_resamples = 200;
                let rep = run(&r, &mut |_| true).unwrap();
                assert_eq!(
                    exact_p(a, n1, c, n2, alt),
                    rep.test.p_value,
                    "{a}/{n1} {c}/{n2} {alt:?}"
                );
            }
        }
    }

    #[test]
    fn counts_are_parsed_in_several_forms() {
        let g = parse_counts("42/300, 61/310").unwrap();
        assert_eq!((g[0].yes, g[0].n, g[1].name.as_str()), (42, 300, "group 2"));
        let g = parse_counts("dose=10mg: 3/20; dose=20mg: 9/21").unwrap();
        assert_eq!((g[0].name.as_str(), g[1].yes), ("dose=10mg", 9));
        let g = parse_counts("control: 42 of 300 vs new page: 61 of 310").unwrap();
        assert_eq!(g[1].name, "new page");
        assert_eq!(g[1].n, 310);
        let e = parse_counts("42/300").unwrap_err();
        assert!(e.contains("1 group was given"), "{e}");
        let e = parse_counts("42/30, 61/310").unwrap_err();
        assert!(e.contains("cannot outnumber"), "{e}");
        let e = parse_counts("a/300, 61/310").unwrap_err();
        assert!(e.contains("\"a/300\""), "{e}");
    }

    #[test]
    fn a_column_holding_2_5_names_its_line() {
        let r = YesNoRequest::new(
            "germinated,storage\nyes,cold\nno,cold\n2.5,warm\nyes,warm\n".into(),
            YesNoInput::Table {
                value: "germinated".into(),
                group: "storage".into(),
                first: None,
                second: None,
            },
            1,
        );
        let e = run(&r, &mut |_| true).unwrap_err().to_string();
        assert!(
            e.contains("Line 4 of column \"germinated\" holds \"2.5\""),
            "{e}"
        );
    }

    #[test]
    fn table_and_counts_agree_and_zero_cells_are_handled() {
        let mut text = "ok,line\n".to_string();
        for (g, yes, n) in [("A", 7, 20), ("B", 2, 22)] {
            for i in 0..n {
                text.push_str(&format!("{},{g}\n", if i < yes { "pass" } else { "fail" }));
            }
        }
        let mut t = YesNoRequest::new(
            text,
            YesNoInput::Table {
                value: "ok".into(),
                group: "line".into(),
                first: None,
                second: None,
            },
            8,
        );
        t.settings.bootstrap_resamples = 1000;
        let a = run(&t, &mut |_| true).unwrap();
        let mut c = counts(7, 20, 2, 22);
        c.settings.bootstrap_resamples = 1000;
        c.settings.seed = 8;
        let b = run(&c, &mut |_| true).unwrap();
        assert_eq!(a.test.p_value, b.test.p_value);
        assert_eq!(a.ci, b.ci);
        // A zero count: the risk ratio is 0, its log −∞; nothing panics and JSON survives.
        let mut z = counts(0, 15, 6, 15);
        z.statistic = YesNoStatistic::RiskRatio;
        let rep = run(&z, &mut |_| true).unwrap();
        assert_eq!(rep.effect, 0.0);
        assert!(rep.test.p_value > 0.0 && rep.test.p_value < 0.05);
        let text = serde_json::to_string(&rep).unwrap();
        let back: YesNoReport = serde_json::from_str(&text).unwrap();
        assert_eq!(serde_json::to_string(&back).unwrap(), text);
    }

    #[test]
    fn binomial_draws_have_the_right_mean_and_large_counts_are_fast() {
        let b = Binomial::new(1_000_000, 123_456);
        let mut s = Stream::new(3, rng::Purpose::Bootstrap, 0);
        let draws: Vec<f64> = (0..20_000).map(|_| b.draw(&mut s) as f64).collect();
        let m = draws.iter().sum::<f64>() / draws.len() as f64;
        // SD of one draw is about 329; of the mean of 20,000 about 2.3.
        assert!((m - 123_456.0).abs() < 12.0, "{m}");
        // A large table runs at once (no resampling of a million units).
        let mut r = counts(42_000, 300_000, 61_000, 310_000);
        r.settings.bootstrap_resamples = 2000;
        let rep = run(&r, &mut |_| true).unwrap();
        assert!(rep.test.p_value < 1e-10);
    }
}

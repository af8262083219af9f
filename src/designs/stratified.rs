//! Stratified (blocked) two-group comparison: a third column names the stratum (site,
//! batch, day). Labels are relabelled only within each stratum; the statistic is a weighted
//! average of the per-stratum differences in means, weighted by stratum size or by
//! n1·n2/(n1 + n2) (the weight that is most precise when the difference is the same in
//! every stratum). Exact over every within-stratum relabelling when their product is small
//! (each stratum's differences listed once, then combined like an odometer, O(1) per
//! relabelling); otherwise random relabellings. Bootstrap within each stratum × group cell;
//! a linear model with the stratum as a factor as the classical cross-check.

use serde::{Deserialize, Serialize};

use super::{Caution, Design, DesignKey, EffectSize, TestOutcome, TestSettings};
use crate::base::*;
use crate::classical;
use crate::classical::linear::{linear_model, LinearModelCheck};
use crate::classical::Welch;
use crate::input::columns::{self as groups, plural};
use crate::input::table::{self, HeaderChoice};
use crate::num::stats;
use crate::resample::boot::{Design as Resampling, SeMethod, Stat};
use crate::resample::combin::choose;
use crate::resample::strata::{SSetup, Stratum};
use crate::resample::tally::SUM_TIE_TOLERANCE;
use crate::resample::{boot, driver, rng};

/// How the per-stratum differences are averaged.
#[derive(Clone, Copy, Debug, Default, PartialEq, Eq, Serialize, Deserialize)]
#[serde(rename_all = "kebab-case")]
pub enum StrataWeights {
    /// By the number of observations in the stratum: the average difference over the
    /// strata as the sample represents them.
    #[default]
    Size,
    /// By n1·n2/(n1 + n2): the most precise average when the difference is the same in
    /// every stratum (the weighting of the Cochran–Mantel–Haenszel and van Elteren tests).
    Precision,
}

impl StrataWeights {
    /// The key in requests and on the command line.
    pub fn key(self) -> &'static str {
        match self {
            StrataWeights::Size => "size",
            StrataWeights::Precision => "precision",
        }
    }
    /// The weights with this key.
    pub fn from_key(s: &str) -> Option<StrataWeights> {
        [StrataWeights::Size, StrataWeights::Precision]
            .into_iter()
            .find(|w| w.key() == s)
    }
    /// The weight of a stratum with these group sizes (before normalising).
    pub fn weight(self, n1: f64, n2: f64) -> f64 {
        match self {
            StrataWeights::Size => n1 + n2,
            StrataWeights::Precision => n1 * n2 / (n1 + n2),
        }
    }
}

/// The stratified design.
pub struct StratifiedDesign;

/// Two groups within strata: the columns, which group comes first, the weights and the
/// settings.
#[derive(Clone, Debug, PartialEq, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct StrataRequest {
    /// The table as pasted.
    pub data: String,
    /// Whether the first row holds column names.
    #[serde(default)]
    pub header: HeaderChoice,
    /// The numeric column.
    pub value: String,
    /// The column naming each row's group.
    pub group: String,
    /// The column naming each row's stratum.
    pub strata: String,
    /// The group that comes first (the difference is first minus second); with more than
    /// two labels, `first` and `second` pick the two to compare.
    #[serde(default)]
    pub first: Option<String>,
    /// The second group, when the label column names more than two.
    #[serde(default)]
    pub second: Option<String>,
    /// How the stratum differences are averaged.
    #[serde(default)]
    pub weights: StrataWeights,
    /// The test and interval settings.
    pub settings: TestSettings,
}

impl StrataRequest {
    /// The defaults the page and the command start from.
    pub fn new(data: String, value: String, group: String, strata: String, seed: u64) -> Self {
        StrataRequest {
            data,
            header: HeaderChoice::Detect,
            value,
            group,
            strata,
            first: None,
            second: None,
            weights: StrataWeights::Size,
            settings: TestSettings::new(seed),
        }
    }
}

/// One stratum of the comparison.
#[derive(Clone, Debug, PartialEq, Serialize, Deserialize)]
pub struct StratumSummary {
    /// The stratum's name.
    pub name: String,
    /// Values of the first group.
    pub n1: usize,
    /// Values of the second group.
    pub n2: usize,
    /// Mean of the first group.
    pub mean1: f64,
    /// Mean of the second group.
    pub mean2: f64,
    /// mean1 − mean2
    pub difference: f64,
    /// The share of this stratum in the weighted average (the weights sum to 1).
    pub weight: f64,
}

/// What the stratified analysis found.
#[derive(Clone, Debug, PartialEq, Serialize, Deserialize)]
pub struct StrataReport {
    /// The values' column.
    pub value_label: String,
    /// The strata's column.
    pub strata_label: String,
    /// The two groups, first and second.
    pub names: [String; 2],
    /// The usable strata.
    pub strata: Vec<StratumSummary>,
    /// Strata left out because only one of the two groups is present in them.
    pub left_out: Vec<String>,
    /// What was left out or read specially.
    pub notes: Vec<Note>,
    /// How the stratum differences were averaged.
    pub weights: StrataWeights,
    /// The direction of the test.
    pub alternative: Alternative,
    /// How the two-sided p-value is defined.
    pub two_sided: TwoSidedRule,
    /// The within-strata relabelling test.
    #[serde(flatten)]
    pub test: TestOutcome,
    /// The weighted difference in means, first minus second.
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
    /// The weighted difference over the pooled within-cell standard deviation.
    pub standardized: EffectSize,
    /// The linear model y ~ group + stratum (cross-check).
    pub linear_model: LinearModelCheck,
    /// The same two groups with the strata ignored, for contrast.
    pub unstratified: Welch,
    /// What to keep in mind.
    pub cautions: Vec<Caution>,
}

impl Design for StratifiedDesign {
    const KEY: DesignKey = DesignKey::Stratified;
    type Request = StrataRequest;
    type Report = StrataReport;

    fn check(req: &StrataRequest) -> Result<(), Error> {
        req.settings.check("relabellings")
    }

    fn run(req: &StrataRequest, progress: ProgressFn) -> Result<StrataReport, Error> {
        run(req, progress)
    }

    fn data(req: &StrataRequest) -> &str {
        &req.data
    }

    fn clear_data(req: &mut StrataRequest) {
        req.data.clear();
    }

    fn seed(req: &StrataRequest) -> u64 {
        req.settings.seed
    }

    fn test_settings(req: &mut StrataRequest) -> Option<&mut TestSettings> {
        Some(&mut req.settings)
    }

    fn test_outcome(report: &StrataReport) -> Option<&TestOutcome> {
        Some(&report.test)
    }
}

/// The data of one usable stratum.
struct StratumData {
    name: String,
    a: Vec<f64>,
    b: Vec<f64>,
}

/// The two groups' names, the usable strata, and the names of the strata left out.
type ReadStrata = ([String; 2], Vec<StratumData>, Vec<String>);

fn read(req: &StrataRequest, notes: &mut Vec<Note>) -> Result<ReadStrata, Error> {
    let bad = |m: String| Err(Error::data(m));
    if req.strata == req.value || req.strata == req.group {
        return bad(format!(
            "The column \"{}\" was chosen both for the strata and for the {}. Choose a \
             separate column that names each row's stratum (site, batch, day).",
            req.strata,
            if req.strata == req.value {
                "values"
            } else {
                "groups"
            }
        ));
    }
    let t = table::parse(&req.data, req.header)?;
    notes.extend(t.notes());
    let scol = t.column(&req.strata)?;
    let lab = groups::labelled_values(&t, &req.value, &req.group, notes)?;
    let levels = &lab.levels;
    let find = |name: &str| {
        levels.iter().position(|l| l == name).ok_or_else(|| {
            Error::data(format!(
                "There is no group \"{name}\" in column \"{}\"; its groups are {}.",
                req.group,
                levels
                    .iter()
                    .map(|l| format!("\"{l}\""))
                    .collect::<Vec<_>>()
                    .join(", ")
            ))
        })
    };
    let (first, second) = match (levels.len(), &req.first, &req.second) {
        (1, _, _) => {
            return bad(format!(
                "Column \"{}\" names only one group (\"{}\"); a comparison needs two.",
                req.group, levels[0]
            ))
        }
        (_, Some(f), Some(s)) => (find(f)?, find(s)?),
        (2, Some(f), None) => {
            let f = find(f)?;
            (f, 1 - f)
        }
        (2, None, _) => (0, 1),
        (n, _, _) => {
            return bad(format!(
                "Column \"{}\" names {n} groups; choose the first and the second group to compare.",
                req.group
            ))
        }
    };
    if first == second {
        return bad(format!(
            "\"{}\" was chosen as both the first and the second group.",
            levels[first]
        ));
    }
    if levels.len() > 2 {
        notes.push(Note::OtherGroupsLeftOut {
            first: levels[first].clone(),
            second: levels[second].clone(),
            others: levels
                .iter()
                .enumerate()
                .filter(|(i, _)| *i != first && *i != second)
                .map(|(_, l)| l.clone())
                .collect(),
        });
    }
    // Strata in order of first appearance.
    let mut strata: Vec<StratumData> = Vec::new();
    let mut no_stratum: Vec<u64> = Vec::new();
    for &(row, level, v) in &lab.rows {
        let (row, level) = (row as usize, level as usize);
        if level != first && level != second {
            continue;
        }
        let cell = scol.cell(row);
        let name = cell.text.trim();
        if name.is_empty() {
            no_stratum.push(cell.line);
            continue;
        }
        let s = match strata.iter().position(|s| s.name == name) {
            Some(s) => s,
            None => {
                strata.push(StratumData {
                    name: name.to_string(),
                    a: Vec::new(),
                    b: Vec::new(),
                });
                strata.len() - 1
            }
        };
        if level == first {
            strata[s].a.push(v);
        } else {
            strata[s].b.push(v);
        }
    }
    if !no_stratum.is_empty() {
        notes.push(Note::NoStratum {
            column: req.strata.clone(),
            count: no_stratum.len(),
            lines: no_stratum.iter().take(5).copied().collect(),
        });
    }
    if strata.len() == 1 {
        return bad(format!(
            "Column \"{}\" names only one stratum (\"{}\"), so there is nothing to stratify \
             by. Choose the column that names the site, batch or day, or use the two-groups design.",
            req.strata, strata[0].name
        ));
    }
    let (usable, partial): (Vec<StratumData>, Vec<StratumData>) = strata
        .into_iter()
        .partition(|s| !s.a.is_empty() && !s.b.is_empty());
    let left_out: Vec<String> = partial.iter().map(|s| s.name.clone()).collect();
    if !partial.is_empty() {
        let rows: usize = partial.iter().map(|s| s.a.len() + s.b.len()).sum();
        notes.push(Note::PartialStrata {
            names: left_out.clone(),
            rows,
        });
    }
    if usable.is_empty() {
        return bad(format!(
            "No stratum in column \"{}\" holds both \"{}\" and \"{}\", so the groups cannot be \
             compared within strata.",
            req.strata, levels[first], levels[second]
        ));
    }
    let (n1, n2): (usize, usize) = usable
        .iter()
        .fold((0, 0), |(x, y), s| (x + s.a.len(), y + s.b.len()));
    if n1 < 2 || n2 < 2 {
        return bad(format!(
            "Across the usable strata, \"{}\" has {n1} value{} and \"{}\" has {n2}; each group \
             needs at least 2.",
            levels[first],
            plural(n1),
            levels[second]
        ));
    }
    Ok((
        [levels[first].clone(), levels[second].clone()],
        usable,
        left_out,
    ))
}

/// The weighted difference (and its pieces) from cell values given as values with cell
/// labels: cell 2s is stratum s's first group, cell 2s + 1 its second. Strata with an empty
/// cell are left out and the weights renormalised, as the estimate itself does.
fn weighted_from_cells(
    x: &[f64],
    labels: &[f64],
    strata: usize,
    weights: StrataWeights,
    standardize: bool,
) -> f64 {
    let mut sum = vec![0.0; 2 * strata];
    let mut cnt = vec![0.0; 2 * strata];
    for (&v, &l) in x.iter().zip(labels) {
        sum[l as usize] += v;
        cnt[l as usize] += 1.0;
    }
    let (mut num, mut wsum) = (0.0, 0.0);
    for s in 0..strata {
        let (n1, n2) = (cnt[2 * s], cnt[2 * s + 1]);
        if n1 == 0.0 || n2 == 0.0 {
            continue;
        }
        let w = weights.weight(n1, n2);
        num += w * (sum[2 * s] / n1 - sum[2 * s + 1] / n2);
        wsum += w;
    }
    let diff = num / wsum;
    if !standardize {
        return diff;
    }
    let mut ss = 0.0;
    for (&v, &l) in x.iter().zip(labels) {
        let c = l as usize;
        let m = sum[c] / cnt[c];
        ss += (v - m) * (v - m);
    }
    let cells = cnt.iter().filter(|c| **c > 0.0).count() as f64;
    let df = x.len() as f64 - cells;
    if df <= 0.0 || ss <= 0.0 {
        return f64::NAN;
    }
    diff / (ss / df).sqrt()
}

/// Runs a stratified request.
pub fn run(req: &StrataRequest, progress: ProgressFn) -> Result<StrataReport, Error> {
    StratifiedDesign::check(req)?;
    let st = &req.settings;
    let mut notes = Vec::new();
    let (names, mut data, left_out) = read(req, &mut notes)?;
    // One offset for every stratum (it cancels from every difference); the reported stratum
    // means add it back.
    let shift = groups::shift_values(
        &mut data
            .iter_mut()
            .flat_map(|s| [&mut s.a, &mut s.b])
            .collect::<Vec<_>>(),
        &mut notes,
    );
    let total: usize = data.iter().map(|s| s.a.len() + s.b.len()).sum();
    super::check_work(total, 1, st)?;
    let wraw: Vec<f64> = data
        .iter()
        .map(|s| req.weights.weight(s.a.len() as f64, s.b.len() as f64))
        .collect();
    let wsum: f64 = wraw.iter().sum();
    let strata: Vec<Stratum> = data
        .iter()
        .zip(&wraw)
        .map(|(s, w)| {
            let pooled: Vec<f64> = s.a.iter().chain(&s.b).copied().collect();
            let m = stats::mean(&pooled);
            let pool: Vec<f64> = pooled.iter().map(|v| v - m).collect();
            Stratum {
                total: pool.iter().sum(),
                pool,
                n1: s.a.len(),
                n2: s.b.len(),
                w: w / wsum,
            }
        })
        .collect();
    // The observed statistic by the same arithmetic as the relabellings (centred sums).
    let observed_kernel: f64 = strata
        .iter()
        .map(|s| s.contribution(s.pool[..s.n1].iter().sum()))
        .sum();
    let spread = strata
        .iter()
        .flat_map(|s| s.pool.iter())
        .fold(0.0f64, |m, v| m.max(v.abs()));
    let setup = SSetup {
        tolerance: SUM_TIE_TOLERANCE * spread,
        observed: observed_kernel,
        strata,
    };
    let count = setup.strata.iter().fold(1u64, |acc, s| {
        acc.saturating_mul(choose(s.pool.len() as u64, s.k() as u64))
    });
    let null = driver::Relabelling {
        count,
        exact_limit: st.exact_limit,
        resamples: st.resamples,
        seed: st.seed,
        stage: Stage::Relabelling,
        stop: st.stop(st.alternative, setup.observed, setup.tolerance),
        block: crate::resample::rng::BLOCK,
    }
    .run(
        progress,
        &mut |cb| setup.enumerate(rng::BLOCK, cb),
        &|s, len| setup.random_block(s, len),
    )?;
    let test = TestOutcome::from_null(&null, st.alternative, st.two_sided, setup.observed, st.seed);

    // Bootstrap within each stratum × group cell.
    let s_count = data.len();
    let mut x = Vec::new();
    let mut labels = Vec::new();
    let mut cells = Vec::new();
    for (s, d) in data.iter().enumerate() {
        for (g, vals) in [&d.a, &d.b].into_iter().enumerate() {
            let start = x.len();
            x.extend_from_slice(vals);
            labels.extend(std::iter::repeat_n((2 * s + g) as f64, vals.len()));
            cells.push((start..x.len()).collect::<Vec<usize>>());
        }
    }
    let weights = req.weights;
    let effect = weighted_from_cells(&x, &labels, s_count, weights, false);
    let std_effect = weighted_from_cells(&x, &labels, s_count, weights, true);
    let f_effect =
        move |a: &mut [f64], l: &mut [f64]| weighted_from_cells(a, l, s_count, weights, false);
    let f_std =
        move |a: &mut [f64], l: &mut [f64]| weighted_from_cells(a, l, s_count, weights, true);
    // Standard error of the weighted difference with the weights held fixed.
    let se_formula = move |a: &mut [f64], l: &mut [f64]| {
        let mut sum = vec![0.0; 2 * s_count];
        let mut sq = vec![0.0; 2 * s_count];
        let mut cnt = vec![0.0; 2 * s_count];
        for (&v, &c) in a.iter().zip(l.iter()) {
            sum[c as usize] += v;
            sq[c as usize] += v * v;
            cnt[c as usize] += 1.0;
        }
        let ws: Vec<f64> = (0..s_count)
            .map(|s| weights.weight(cnt[2 * s], cnt[2 * s + 1]))
            .collect();
        let wsum: f64 = ws.iter().sum();
        let mut v = 0.0;
        for (s, w) in ws.iter().enumerate() {
            let mut part = 0.0;
            for c in [2 * s, 2 * s + 1] {
                let m = sum[c] / cnt[c];
                let var = (sq[c] - sum[c] * m) / (cnt[c] - 1.0);
                part += var / cnt[c];
            }
            v += (w / wsum).powi(2) * part;
        }
        v.sqrt()
    };
    let methods = st.methods();
    let studentize = methods.contains(&IntervalMethod::Studentized);
    let cell_design = Resampling::Cells {
        x: &x,
        labels: &labels,
        cells: &cells,
    };
    let se = if studentize {
        SeMethod::Formula(&se_formula)
    } else {
        SeMethod::None
    };
    let (bv, tv) = boot::resample(
        &cell_design,
        &[
            Stat {
                f: &f_effect,
                estimate: effect,
                se,
            },
            Stat {
                f: &f_std,
                estimate: std_effect,
                se: SeMethod::None,
            },
        ],
        st.seed,
        st.bootstrap_resamples,
        progress,
    )?;
    let se_hat = se_formula(&mut x.clone(), &mut labels.clone());
    let main = super::summarise_bootstrap(
        &methods,
        st.confidence,
        effect,
        &bv[0],
        studentize.then_some((&tv[0][..], se_hat)),
        None,
        &mut || boot::acceleration(&cell_design, &f_effect),
    );
    let std_method = if st.interval() == IntervalMethod::Studentized {
        IntervalMethod::Bca
    } else {
        st.interval()
    };
    let std_boot = super::summarise_bootstrap(
        &[std_method],
        st.confidence,
        std_effect,
        &bv[1],
        None,
        None,
        &mut || boot::acceleration(&cell_design, &f_std),
    );
    super::few_resamples_note(st, &mut notes);

    let all_a: Vec<f64> = data.iter().flat_map(|s| s.a.iter().copied()).collect();
    let all_b: Vec<f64> = data.iter().flat_map(|s| s.b.iter().copied()).collect();
    let summaries: Vec<StratumSummary> = data
        .iter()
        .zip(&wraw)
        .map(|(s, w)| {
            let (m1, m2) = (stats::mean(&s.a), stats::mean(&s.b));
            StratumSummary {
                name: s.name.clone(),
                n1: s.a.len(),
                n2: s.b.len(),
                mean1: m1 + shift,
                mean2: m2 + shift,
                difference: m1 - m2,
                weight: w / wsum,
            }
        })
        .collect();
    let mut cautions = vec![
        Caution::Assumptions,
        Caution::StrataMatter,
        Caution::StrataWeighting { weights },
    ];
    let smallest = summaries.iter().map(|s| s.n1.min(s.n2)).min().unwrap_or(0);
    if smallest < 3 {
        cautions.push(Caution::SmallStrata { smallest });
    }
    super::closing_cautions(&mut cautions);
    Ok(StrataReport {
        value_label: req.value.clone(),
        strata_label: req.strata.clone(),
        names,
        strata: summaries,
        left_out,
        notes,
        weights,
        alternative: st.alternative,
        two_sided: st.two_sided,
        test,
        effect,
        ci: main.ci(),
        intervals: main.intervals,
        bootstrap_resamples: st.bootstrap_resamples,
        bootstrap_se: main.se,
        bootstrap_histogram: main.histogram,
        standardized: EffectSize {
            estimate: std_effect.is_finite().then_some(std_effect),
            ci: std_boot.ci(),
        },
        linear_model: linear_model(
            &data
                .iter()
                .map(|s| (&s.a[..], &s.b[..]))
                .collect::<Vec<_>>(),
            st.alternative,
            st.confidence,
        ),
        unstratified: classical::welch(&all_a, &all_b, st.alternative, st.confidence),
        cautions,
    })
}

/// Decimals for the differences of a report.
#[cfg(test)]
mod tests {
    use super::*;

    fn data() -> String {
        // Batch A runs high, batch C low; coating "new" is mostly in the low batch.
        "strength,coating,batch\n\
         52,new,A\n55,old,A\n54,old,A\n56,old,A\n\
         44,new,B\n41,old,B\n45,new,B\n40,old,B\n\
         31,new,C\n33,new,C\n30,new,C\n28,old,C\n"
            .into()
    }

    #[test]
    fn exact_enumeration_equals_brute_force_over_within_stratum_splits() {
        let mut r = StrataRequest::new(
            data(),
            "strength".into(),
            "coating".into(),
            "batch".into(),
            3,
        );
        r.settings.bootstrap_resamples = 300;
        for w in [StrataWeights::Size, StrataWeights::Precision] {
            r.weights = w;
            let rep = run(&r, &mut |_| true).unwrap();
            // C(4,1) × C(4,2) × C(4,1) = 4 × 6 × 4 relabellings.
            assert!(rep.test.exact);
            assert_eq!(rep.test.resamples, 96);
            // Brute force: every within-stratum split by bit masks.
            let strata: Vec<(Vec<f64>, usize)> = vec![
                (vec![52.0, 55.0, 54.0, 56.0], 1),
                (vec![44.0, 45.0, 41.0, 40.0], 2),
                (vec![31.0, 33.0, 30.0, 28.0], 3),
            ];
            let wts: Vec<f64> = strata
                .iter()
                .map(|(v, k)| w.weight(*k as f64, (v.len() - k) as f64))
                .collect();
            let wsum: f64 = wts.iter().sum();
            let stat = |masks: &[u32]| -> f64 {
                strata
                    .iter()
                    .zip(masks)
                    .zip(&wts)
                    .map(|(((v, _), m), wt)| {
                        let a: Vec<f64> =
                            (0..4).filter(|i| m >> i & 1 == 1).map(|i| v[i]).collect();
                        let b: Vec<f64> =
                            (0..4).filter(|i| m >> i & 1 == 0).map(|i| v[i]).collect();
                        wt / wsum * (stats::mean(&a) - stats::mean(&b))
                    })
                    .sum()
            };
            let obs = stat(&[0b0001, 0b0011, 0b0111]);
            assert!((rep.test.observed - obs).abs() < 1e-9);
            assert!((rep.effect - obs).abs() < 1e-9);
            let mut ge = 0;
            let mut total = 0;
            let masks = |k: u32| (0u32..16).filter(move |m| m.count_ones() == k);
            for m0 in masks(1) {
                for m1 in masks(2) {
                    for m2 in masks(3) {
                        total += 1;
                        ge += u64::from(stat(&[m0, m1, m2]).abs() >= obs.abs() - 1e-9);
                    }
                }
            }
            assert_eq!(total, 96);
            assert_eq!(rep.test.extreme_count, ge, "{w:?}");
            // Monte Carlo agrees within its error.
            let mut mc = r.clone();
            mc.settings.exact_limit = 0;
            mc.settings.resamples = 20_000;
            let m = run(&mc, &mut |_| true).unwrap();
            assert!((m.test.p_value - rep.test.p_value).abs() < 4.0 * m.test.mc_se.unwrap() + 1e-3);
        }
    }

    #[test]
    fn strata_with_one_group_are_left_out_and_named() {
        let text = format!("{}61,old,D\n62,old,D\n", data());
        let mut r =
            StrataRequest::new(text, "strength".into(), "coating".into(), "batch".into(), 3);
        r.settings.bootstrap_resamples = 200;
        let rep = run(&r, &mut |_| true).unwrap();
        assert_eq!(rep.left_out, vec!["D".to_string()]);
        assert!(
            rep.notes.contains(&Note::PartialStrata {
                names: vec!["D".into()],
                rows: 2
            }),
            "{:?}",
            rep.notes
        );
        assert_eq!(rep.strata.len(), 3);
        // The unstratified difference points the other way here (Simpson's paradox).
        assert!(
            rep.effect > 0.0 && rep.unstratified.mean_difference < 0.0,
            "{rep:?}"
        );
    }

    #[test]
    fn one_stratum_and_bad_columns_have_messages() {
        let mut r = StrataRequest::new(
            "y,g,s\n1,a,x\n2,a,x\n3,b,x\n4,b,x\n".into(),
            "y".into(),
            "g".into(),
            "s".into(),
            1,
        );
        let e = run(&r, &mut |_| true).unwrap_err().to_string();
        assert!(e.contains("only one stratum (\"x\")"), "{e}");
        r.strata = "g".into();
        let e = run(&r, &mut |_| true).unwrap_err().to_string();
        assert!(e.contains("both for the strata and for the groups"), "{e}");
        r.strata = "q".into();
        let e = run(&r, &mut |_| true).unwrap_err().to_string();
        assert!(e.contains("no column named \"q\""), "{e}");
    }
}

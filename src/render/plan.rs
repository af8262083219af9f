//! The plan in words: the sample size for the target power, the power curve, the smallest
//! detectable effect, sentences for a proposal and what the simulation traded for speed.

use super::doc::{row, Doc, DocTable, Figure, Headline};
use super::plot;
use super::words;
use crate::base::format as fmt;
use crate::base::Alternative;
use crate::designs::paired::FlipStatistic;
use crate::designs::plan::{ModelSummary, PlanDesign, PlanReport, Test};
use crate::designs::DesignKey;
use crate::wire::ENGINE_VERSION;

/// What one unit of the sample size counts.
fn per(d: PlanDesign) -> &'static str {
    words::per(d == PlanDesign::Paired)
}

/// What the assumed effect is.
pub fn effect_label(r: &PlanReport) -> &'static str {
    let multiply = matches!(r.model, ModelSummary::Pilot { multiply: true, .. });
    match r.design {
        PlanDesign::YesNo => "difference in yes rates (treated − baseline)",
        PlanDesign::KGroups => "factor on the assumed group means",
        PlanDesign::Paired => "mean difference within pairs",
        PlanDesign::TwoGroups if multiply => "ratio of treated to reference values",
        PlanDesign::TwoGroups => "difference in means (treated − reference)",
    }
}

/// The data model in words.
pub fn model_label(r: &PlanReport) -> String {
    match &r.model {
        ModelSummary::Rates { baseline } => {
            format!("yes/no outcomes, baseline rate {}", fmt::plain(*baseline))
        }
        ModelSummary::Normal { sd } => format!(
            "normal values with standard deviation {}{}",
            fmt::plain(*sd),
            if r.design == PlanDesign::Paired {
                " (of the differences)"
            } else {
                ""
            }
        ),
        ModelSummary::Pilot { value, n, multiply } => format!(
            "values resampled from the {n} pilot values of column \"{value}\"{}",
            if *multiply {
                ", the effect multiplying them"
            } else {
                ", the effect added to them"
            }
        ),
    }
}

/// The statistic of the simulated test.
fn statistic_label(t: Test) -> String {
    match t {
        Test::Two(s) => s.label().to_string(),
        Test::Flip(FlipStatistic::Mean) => "mean of the differences".into(),
        Test::Flip(FlipStatistic::Median) => "median of the differences".into(),
        Test::Flip(FlipStatistic::SignedRank) => "mean signed rank of the differences".into(),
        Test::K(k) => k.label().to_string(),
        Test::Exact => "difference in proportions (exact test)".into(),
    }
}

/// The test of each simulated study in words.
pub fn test_label(r: &PlanReport) -> String {
    match r.test {
        Test::Exact => "the exact test of the 2×2 table (Fisher's, both margins fixed)".into(),
        t => format!(
            "a permutation test of the {} with {} random relabellings per study",
            statistic_label(t),
            fmt::count(r.relabellings)
        ),
    }
}

fn alt_words(a: Alternative) -> &'static str {
    match a {
        Alternative::TwoSided => "two-sided",
        _ => "one-sided",
    }
}

/// The assumed effect in words: "a difference in means (treated − reference) of 0.5", or for
/// k groups "group means of 20, 20, 22".
fn effect_phrase(r: &PlanReport) -> String {
    let label = effect_label(r);
    if r.design == PlanDesign::KGroups {
        let m: Vec<String> = r.means.iter().map(|m| fmt::plain(m * r.effect)).collect();
        format!("group means of {}", m.join(", "))
    } else {
        format!("a {label} of {}", fmt::plain(r.effect))
    }
}

/// Sentences that can go into a proposal.
/// Sentences that can go into a proposal (the first is the finding).
pub fn sentences(r: &PlanReport) -> Vec<String> {
    let mut s = Vec::new();
    let how = format!(
        "{}, at a {} significance level of {}",
        test_label(r),
        alt_words(r.alternative),
        fmt::plain(r.alpha)
    );
    if let Some(sm) = &r.smoothed {
        s.push(format!(
            "About {} {} are needed for {} power to detect {}, assuming {}, with {how} \
             (simulation estimate {} ± {}, from a curve fitted through {} simulated sample sizes).",
            fmt::count(sm.n.ceil() as u64),
            per(r.design),
            fmt::percent(r.target_power),
            effect_phrase(r),
            model_label(r),
            fmt::fixed(sm.n, 1),
            fmt::fixed(sm.se, 1),
            sm.points
        ));
    }
    if let Some(p) = &r.required {
        s.push(format!(
            "The smallest simulated size that reached the target: {} {} had an estimated power of {} (95% simulation interval {} to {}, \
             from {} simulated studies) to detect {}, assuming {}, with {how}.",
            fmt::count(p.n),
            per(r.design),
            fmt::fixed(p.power, 2),
            fmt::fixed(p.low, 2),
            fmt::fixed(p.high, 2),
            fmt::count(p.studies),
            effect_phrase(r),
            model_label(r)
        ));
    }
    if let Some(d) = &r.detectable {
        s.push(format!(
            "With {} {}, the smallest {} detectable with {} power is about {} (estimated power \
             {} ± {} there; simulation bracket {} to {}).",
            fmt::count(d.n),
            per(r.design),
            effect_label(r),
            fmt::percent(r.target_power),
            fmt::plain(d.effect),
            fmt::fixed(d.power.power, 2),
            fmt::fixed(d.power.se, 2),
            fmt::sig(d.bracket.0),
            fmt::sig(d.bracket.1)
        ));
    }
    s
}

/// What was traded for speed.
pub fn tradeoffs(r: &PlanReport) -> Vec<String> {
    let mut t = vec![format!(
        "Each sample size was evaluated with up to {} simulated studies: the power estimates \
         carry a simulation error (shown as ± one standard error and a 95% interval), so \
         neighbouring sample sizes cannot be told apart within it.",
        fmt::count(r.studies)
    )];
    if r.design != PlanDesign::YesNo {
        t.push(format!(
            "Each simulated study ran {} random relabellings instead of a full permutation test \
             (p = (b + 1)/(m + 1), smallest possible p {}). The test stays valid but loses a \
             little power, so the sample sizes here err slightly on the large side; raise the \
             number of relabellings to reduce that.",
            fmt::count(r.relabellings),
            fmt::sig(1.0 / (r.relabellings + 1) as f64)
        ));
    }
    if r.curve.iter().any(|p| p.stopped_early) {
        t.push(
            "Sample sizes whose power was clearly above or below the target (a 99.9% interval \
             excluding it) were stopped early, after at least 200 studies; their bands are wider."
                .into(),
        );
    }
    t.push(
        "The search started from a normal-approximation guess of the sample size and bisected \
         between the sizes that bracket the target power."
            .into(),
    );
    t
}

/// The plan as a document.
pub fn doc(r: &PlanReport, date: &str) -> Doc {
    let sentences = sentences(r);
    let per = per(r.design);
    let finding = sentences.first().cloned().unwrap_or_else(|| {
        r.notes
            .first()
            .map(words::note)
            .unwrap_or_else(|| "No sample size reached the target power.".into())
    });
    let mut lines = vec![
        (
            "Design planned".into(),
            planned_design(r.design).to_string(),
        ),
        ("Data model".into(), model_label(r)),
        ("Test".into(), test_label(r)),
        (format!("Assumed {}", effect_label(r)), fmt::plain(r.effect)),
        (
            "Significance level".into(),
            format!(
                "{} ({})",
                fmt::plain(r.alpha),
                match r.alternative {
                    Alternative::TwoSided => "two-sided",
                    Alternative::Greater => "one-sided, treated higher",
                    Alternative::Less => "one-sided, treated lower",
                }
            ),
        ),
        ("Target power".into(), fmt::percent(r.target_power)),
    ];
    if let Some(g) = r.first_guess {
        lines.push((
            "Normal-approximation first guess".into(),
            format!("{} {per}", fmt::fixed(g, 1)),
        ));
    }
    if let Some(sm) = &r.smoothed {
        lines.push((
            "Sample size at the target (fitted curve)".into(),
            format!(
                "{} {per} (estimate {} ± {}, probit fit through {} sizes)",
                fmt::count(sm.n.ceil() as u64),
                fmt::fixed(sm.n, 1),
                fmt::fixed(sm.se, 1),
                sm.points
            ),
        ));
    }
    lines.push((
        "Smallest simulated size reaching the target".into(),
        match &r.required {
            Some(p) => format!(
                "{} {per}: power {} ± {} (95% interval {} to {}, {} studies)",
                fmt::count(p.n),
                fmt::fixed(p.power, 3),
                fmt::fixed(p.se, 3),
                fmt::fixed(p.low, 3),
                fmt::fixed(p.high, 3),
                fmt::count(p.studies)
            ),
            None => "not reached within the largest size tried".into(),
        },
    ));
    if let Some(d) = &r.detectable {
        lines.push((
            format!("Smallest detectable effect at {} {per}", d.n),
            format!(
                "{} (power {} ± {}; bracket {} to {})",
                fmt::sig(d.effect),
                fmt::fixed(d.power.power, 3),
                fmt::fixed(d.power.se, 3),
                fmt::sig(d.bracket.0),
                fmt::sig(d.bracket.1)
            ),
        ));
    }
    lines.push((
        "Seed and generator".into(),
        format!("{} · {}", r.seed, r.rng),
    ));
    let table = DocTable {
        id: "power-table",
        caption: format!("Estimated power at the assumed {}", effect_label(r)),
        header: [
            "n",
            "power",
            "± SE",
            "95% interval",
            "studies",
            "stopped early",
        ]
        .map(String::from)
        .to_vec(),
        rows: r
            .curve
            .iter()
            .map(|p| {
                vec![
                    fmt::count(p.n),
                    fmt::fixed(p.power, 3),
                    fmt::fixed(p.se, 3),
                    format!("[{}, {}]", fmt::fixed(p.low, 3), fmt::fixed(p.high, 3)),
                    fmt::count(p.studies),
                    if p.stopped_early { "yes" } else { "no" }.into(),
                ]
            })
            .collect(),
    };
    let mut notes: Vec<String> = r.notes.iter().map(words::note).collect();
    notes.extend(sentences.iter().skip(1).cloned());
    let mut results = Vec::new();
    for p in &r.curve {
        let part = format!("n:{}", p.n);
        results.push(row(&part, "power", format!("{:?}", p.power)));
        results.push(row(&part, "se", format!("{:?}", p.se)));
        results.push(row(&part, "studies", p.studies.to_string()));
    }
    if let Some(p) = &r.required {
        results.push(row("required", "n", p.n.to_string()));
    }
    if let Some(s) = &r.smoothed {
        results.push(row("smoothed", "n", format!("{:?}", s.n)));
        results.push(row("smoothed", "se", format!("{:?}", s.se)));
    }
    if let Some(d) = &r.detectable {
        results.push(row("detectable", "effect", format!("{:?}", d.effect)));
    }
    results.push(row("run", "seed", r.seed.to_string()));
    Doc {
        design: DesignKey::Plan,
        finding,
        notes,
        lines,
        tables: vec![table],
        figures: vec![Figure {
            name: "power",
            svg: plot::power_svg(r, "plan-power"),
            caption: plot::describe_power(r),
        }],
        sections: vec![("What was traded for speed".into(), tradeoffs(r))],
        methods: format!(
            "Power by simulation: each simulated study draws data from {}, runs {}, and rejects \
             when p ≤ {}. The sample size at the target is read off a curve fitted through \
             every simulated size (probit of the power linear in √n, weighted by each point's \
             simulation variance), with a delta-method error that covers the simulation only, \
             not the fit's own shape. Random numbers: {}, seed {}; the studies at each sample size and \
             effect draw from a seed derived from it. Computed with Reshuffle {} on {date}.",
            model_label(r),
            test_label(r),
            fmt::plain(r.alpha),
            r.rng,
            r.seed,
            ENGINE_VERSION
        ),
        cautions: super::cautions::cautions(&r.cautions, DesignKey::Plan),
        results,
        headline: Headline {
            p_value: None,
            estimate: None,
            low: r.smoothed.as_ref().map(|s| s.n),
            high: r.smoothed.as_ref().map(|s| s.se),
        },
    }
}

/// The design a plan is for, in words.
fn planned_design(d: PlanDesign) -> &'static str {
    match d {
        PlanDesign::TwoGroups => "two independent groups",
        PlanDesign::Paired => "paired measurements",
        PlanDesign::KGroups => "three or more groups",
        PlanDesign::YesNo => "yes/no outcomes in two groups",
    }
}

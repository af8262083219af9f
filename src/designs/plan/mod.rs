//! Planning a study by simulation: the power of the analysis at a sample size, the smallest
//! sample size reaching a target power, and the smallest effect detectable at a given size.
//!
//! A simulated study draws data from an assumed model (normal values with a given SD, values
//! resampled from pilot data with an assumed effect added, or yes/no outcomes with given
//! rates), runs the same test the analysis runs (a permutation test with a modest number of
//! random relabellings, p = (b + 1)/(m + 1), or the exact test for yes/no outcomes), and
//! counts a rejection when p ≤ α. Power is the share of rejections, with its Monte Carlo
//! error. To keep this affordable the search starts from a normal-approximation guess of the
//! sample size, evaluates a few sizes around it, stops a size early once a 99.9% interval for
//! its power lies clearly above or below the target, and bisects between the sizes that
//! bracket the target.

mod search;
mod sim;
mod types;

use crate::base::format as fmt;
use crate::base::*;
use crate::designs::{Caution, Design, DesignKey};
use crate::input::table::{self};
use crate::num::stats;
use crate::resample::k_groups::KStatistic;
use crate::resample::rng::RNG_NAME;
use crate::resample::signs::FlipStatistic;
use crate::resample::two_groups::Statistic;
pub use search::smooth;
use search::{detectable_effect, first_guess};
use sim::{point_seed, Sim};
pub use types::*;

/// The planning design.
pub struct PlanningDesign;

impl Design for PlanningDesign {
    const KEY: DesignKey = DesignKey::Plan;
    type Request = PlanRequest;
    type Report = PlanReport;

    fn check(req: &PlanRequest) -> Result<(), Error> {
        check(req).map(|_| ())
    }

    fn run(req: &PlanRequest, progress: ProgressFn) -> Result<PlanReport, Error> {
        run(req, progress)
    }

    fn data(req: &PlanRequest) -> &str {
        match &req.model {
            PlanModel::Pilot { data, .. } => data,
            _ => "",
        }
    }

    fn clear_data(req: &mut PlanRequest) {
        if let PlanModel::Pilot { data, .. } = &mut req.model {
            data.clear();
        }
    }

    fn has_data(req: &PlanRequest) -> bool {
        !matches!(req.model, PlanModel::Pilot { .. }) || !Self::data(req).trim().is_empty()
    }

    fn seed(req: &PlanRequest) -> u64 {
        req.seed
    }
}

fn check(req: &PlanRequest) -> Result<(Sim, ModelSummary, f64, f64), Error> {
    let bad = |m: String| Err(Error::settings(m));
    if !(req.alpha > 0.0 && req.alpha < 0.5) {
        return bad(format!(
            "The significance level must be between 0 and 0.5, for example 0.05 (it is {}).",
            req.alpha
        ));
    }
    if !(req.target_power > 0.05 && req.target_power < 1.0) {
        return bad(format!(
            "The target power must be between 0.05 and 1, for example 0.8 (it is {}).",
            req.target_power
        ));
    }
    if !(200..=100_000).contains(&req.studies) {
        return bad(format!(
            "Use 200 to 100,000 simulated studies per sample size (it is {}).",
            fmt::count(req.studies)
        ));
    }
    if !(19..=9_999).contains(&req.relabellings) {
        return bad(format!(
            "Use 19 to 9,999 random relabellings per simulated study (it is {}); with fewer \
             than 1/α − 1 the test can never reject.",
            fmt::count(req.relabellings)
        ));
    }
    if ((req.relabellings + 1) as f64) * req.alpha < 1.0 && req.design != PlanDesign::YesNo {
        return bad(format!(
            "With {} relabellings per study the smallest possible p-value is {}, above the \
             significance level {}: no study could reject. Use at least {} relabellings.",
            req.relabellings,
            fmt::sig(1.0 / (req.relabellings + 1) as f64),
            req.alpha,
            (1.0 / req.alpha).ceil() as u64 - 1
        ));
    }
    if !(4..=1_000_000).contains(&req.max_n) {
        return bad("The largest sample size to try must be between 4 and 1,000,000.".into());
    }
    if !req.effect.is_finite() {
        return bad("The assumed effect must be a number.".into());
    }
    if Statistic::from_key(&req.statistic).is_some_and(|s| s.on_spread()) {
        return bad(
            "Plans simulate a shift between the groups; a log ratio of spreads measures \
             spread, not a shift. Plan with a statistic of location."
                .into(),
        );
    }
    if req.statistic == Statistic::KsDistance.key() && req.alternative != Alternative::TwoSided {
        return bad(
            "The Kolmogorov–Smirnov distance has no direction: plan a two-sided test with it."
                .into(),
        );
    }
    let test = match (req.design, req.statistic.as_str()) {
        (PlanDesign::TwoGroups, "") => Test::Two(Statistic::MeanDifference),
        (PlanDesign::TwoGroups, k) => Test::Two(Statistic::from_key(k).ok_or_else(|| {
            Error::settings(format!(
                "For two groups the statistic is one of {} (not \"{k}\").",
                Statistic::ALL.map(|s| s.key()).join(", ")
            ))
        })?),
        (PlanDesign::Paired, "") => Test::Flip(FlipStatistic::Mean),
        (PlanDesign::Paired, k) => Test::Flip(FlipStatistic::from_key(k).ok_or_else(|| {
            Error::settings(format!(
                "For paired data the statistic is mean, median or signed-rank (not \"{k}\")."
            ))
        })?),
        (PlanDesign::KGroups, "") => Test::K(KStatistic::F),
        (PlanDesign::KGroups, k) => Test::K(KStatistic::from_key(k).ok_or_else(|| {
            Error::settings(format!(
                "For k groups the statistic is f, welch-f or median-spread (not \"{k}\")."
            ))
        })?),
        (PlanDesign::YesNo, "" | "proportion-difference") => Test::Exact,
        (PlanDesign::YesNo, k) => {
            return bad(format!(
                "Yes/no outcomes are planned with the exact test of the difference in \
                 proportions (not \"{k}\")."
            ))
        }
    };
    let mut sim = Sim {
        design: req.design,
        test,
        pilot: None,
        sd: 1.0,
        multiply: false,
        baseline: 0.0,
        means: req.means.clone(),
        alternative: req.alternative,
        alpha: req.alpha,
        relabellings: req.relabellings,
        spent: Default::default(),
    };
    if req.design == PlanDesign::KGroups {
        if req.means.len() < 3 || req.means.iter().any(|m| !m.is_finite()) {
            return bad(
                "For k groups give the assumed mean of each of 3 or more groups, for example \
                 0, 0, 0.5 (only their differences matter)."
                    .into(),
            );
        }
        if req.means.iter().all(|m| *m == req.means[0]) {
            return bad(
                "The assumed group means are all equal: there is no effect to detect.".into(),
            );
        }
        if req.alternative != Alternative::TwoSided {
            return bad("The k-group test has no direction; plan it as two-sided.".into());
        }
    }
    let (model, spread, centre) = match (&req.model, req.design) {
        (PlanModel::Rates { .. }, d) if d != PlanDesign::YesNo => {
            return bad("Rates describe yes/no outcomes; choose the yes/no design.".into())
        }
        (_, PlanDesign::YesNo) if !matches!(req.model, PlanModel::Rates { .. }) => {
            return bad("Yes/no outcomes are planned from rates: give the baseline rate.".into())
        }
        (PlanModel::Rates { baseline }, _) => {
            if !(*baseline > 0.0 && *baseline < 1.0) {
                return bad(format!(
                    "The baseline rate must be between 0 and 1, for example 0.14 (it is {baseline})."
                ));
            }
            let other = baseline + req.effect;
            if !(0.0..=1.0).contains(&other) {
                return bad(format!(
                    "A baseline rate of {baseline} and a difference of {} give a rate of {}, \
                     outside 0 to 1.",
                    req.effect,
                    fmt::sig(other)
                ));
            }
            sim.baseline = *baseline;
            (
                ModelSummary::Rates {
                    baseline: *baseline,
                },
                (baseline * (1.0 - baseline)).sqrt(),
                *baseline,
            )
        }
        (PlanModel::Normal { sd }, _) => {
            if !(*sd > 0.0 && sd.is_finite()) {
                return bad(format!(
                    "The standard deviation must be a positive number (it is {sd})."
                ));
            }
            sim.sd = *sd;
            (ModelSummary::Normal { sd: *sd }, *sd, 0.0)
        }
        (
            PlanModel::Pilot {
                data,
                header,
                value,
                multiply,
            },
            _,
        ) => {
            let t = table::parse(data, *header)?;
            let nums = t.column(value)?.numbers(t.decimal_comma)?;
            let v: Vec<f64> = nums.values.iter().map(|x| x.1).collect();
            if v.len() < 5 {
                return bad(format!(
                    "Column \"{value}\" has {} values; a pilot needs at least 5 to say anything \
                     about the spread.",
                    v.len()
                ));
            }
            let m = stats::mean(&v);
            if *multiply {
                if req.design == PlanDesign::Paired {
                    return bad(
                        "A multiplicative effect does not apply to paired differences; use a \
                         shift."
                            .into(),
                    );
                }
                if let Some(x) = v.iter().find(|x| **x <= 0.0) {
                    return bad(format!(
                        "A multiplicative effect needs positive values, but column \"{value}\" \
                         holds {x}."
                    ));
                }
                if req.effect <= 0.0 {
                    return bad(
                        "A multiplicative effect is a ratio above 0, e.g. 1.2 for 20% more.".into(),
                    );
                }
            }
            sim.multiply = *multiply;
            sim.pilot = Some((v.iter().map(|x| x - m).collect(), m));
            (
                ModelSummary::Pilot {
                    value: value.clone(),
                    n: v.len(),
                    multiply: *multiply,
                },
                stats::sd(&v),
                m,
            )
        }
    };
    // One size's studies at the largest size the search may try must fit the work limit on
    // their own (the search as a whole is held to it as it goes: Sim::power).
    for (n, what) in [(req.max_n, "the largest sample size to try")]
        .into_iter()
        .chain(req.mde_n.map(|n| (n, "the size for the detectable effect")))
    {
        let cost = sim.study_cost(n) * req.studies as f64;
        if cost > super::MAX_WORK {
            return Err(super::over_work_limit(
                format!(
                    "Simulating {} studies at {what} ({}) would draw about {} values",
                    fmt::count(req.studies),
                    fmt::count(n),
                    fmt::sig(cost),
                ),
                format!(
                    "Lower the simulated studies, the relabellings per study ({}) or {what}.",
                    fmt::count(req.relabellings),
                ),
            ));
        }
    }
    Ok((sim, model, spread, centre))
}

/// Plans a study: the power curve, the sample size at the target and, if asked, the
/// smallest detectable effect.
pub fn run(req: &PlanRequest, progress: ProgressFn) -> Result<PlanReport, Error> {
    let (sim, model, spread, centre) = check(req)?;
    let mut notes = Vec::new();
    let target = req.target_power;
    let guess = first_guess(req, &sim, spread, centre);
    let min_n: u64 = if req.design == PlanDesign::Paired {
        4
    } else {
        3
    };
    let no_effect = match req.design {
        PlanDesign::KGroups => req.effect == 0.0,
        _ if sim.multiply => req.effect == 1.0,
        _ => req.effect == 0.0,
    };
    let mut curve: Vec<PowerPoint> = Vec::new();
    let mut evaluated = 0u64;
    let mut eval = |n: u64,
                    full: bool,
                    curve: &mut Vec<PowerPoint>,
                    progress: ProgressFn|
     -> Result<PowerPoint, Error> {
        if let Some(p) = curve
            .iter()
            .find(|p| p.n == n && (!full || !p.stopped_early))
        {
            return Ok(p.clone());
        }
        evaluated += 1;
        let stage = Stage::Simulation {
            n,
            sizes: evaluated as usize,
        };
        let p = sim.power(
            n,
            req.effect,
            req.studies,
            (!full).then_some(target),
            point_seed(req.seed, n, req.effect),
            progress,
            stage,
        )?;
        curve.retain(|q| q.n != n);
        curve.push(p.clone());
        Ok(p)
    };
    let mut required = None;
    if no_effect {
        notes.push(Note::NoEffectAssumed);
        eval(min_n.max(10).min(req.max_n), true, &mut curve, progress)?;
    } else {
        let g = guess.unwrap_or(20.0).clamp(min_n as f64, req.max_n as f64);
        let mut grid: Vec<u64> = [0.4, 0.6, 0.8, 1.0, 1.25, 1.6, 2.2]
            .iter()
            .map(|f| ((g * f).round() as u64).clamp(min_n, req.max_n))
            .collect();
        grid.dedup();
        for &n in &grid {
            eval(n, false, &mut curve, progress)?;
        }
        // Bracket the target, then bisect: each step adds a size or re-runs an
        // early-stopped one in full, so the loop ends.
        loop {
            let above = curve
                .iter()
                .filter(|p| p.power >= target)
                .map(|p| p.n)
                .min();
            let Some(hi) = above else {
                let top = curve.iter().map(|p| p.n).max().unwrap_or(min_n);
                if top >= req.max_n {
                    break;
                }
                eval((top * 2).min(req.max_n), false, &mut curve, progress)?;
                continue;
            };
            let hi_point = curve.iter().find(|p| p.n == hi).cloned();
            if hi_point.as_ref().is_some_and(|p| p.stopped_early) {
                eval(hi, true, &mut curve, progress)?;
                continue;
            }
            let lo = curve
                .iter()
                .filter(|p| p.power < target && p.n < hi)
                .map(|p| p.n)
                .max();
            match lo {
                None => {
                    let bottom = curve.iter().map(|p| p.n).min().unwrap_or(min_n);
                    if bottom <= min_n {
                        required = hi_point;
                        break;
                    }
                    eval((bottom / 2).max(min_n), false, &mut curve, progress)?;
                }
                Some(lo) if hi - lo > 1 => {
                    eval(lo + (hi - lo) / 2, false, &mut curve, progress)?;
                }
                _ => {
                    required = hi_point;
                    break;
                }
            }
        }
        if required.is_none() {
            notes.push(Note::TargetNotReached {
                max_n: req.max_n,
                pairs: req.design == PlanDesign::Paired,
                target,
            });
        }
    }
    curve.sort_by_key(|p| p.n);
    let smoothed = if no_effect {
        None
    } else {
        smooth(&curve, target)
    };

    // The smallest detectable effect at a given size, by bisection on the effect.
    let detectable = match req.mde_n {
        Some(n) if n >= min_n => Some(detectable_effect(req, &sim, n, spread, centre, progress)?),
        Some(n) => {
            notes.push(Note::TooFewForDetectable {
                min_n,
                n,
                pairs: req.design == PlanDesign::Paired,
            });
            None
        }
        None => None,
    };

    let mut cautions = vec![if matches!(req.model, PlanModel::Pilot { .. }) {
        Caution::PilotIsNoisy
    } else {
        Caution::AssumedEffect
    }];
    cautions.extend([
        Caution::RunAsPlanned,
        Caution::PlanMultiplicity,
        Caution::PlanDecisions,
    ]);
    Ok(PlanReport {
        design: req.design,
        model,
        test: sim.test,
        effect: req.effect,
        means: req.means.clone(),
        alpha: req.alpha,
        alternative: req.alternative,
        target_power: target,
        first_guess: guess,
        curve,
        required,
        smoothed,
        detectable,
        studies: req.studies,
        relabellings: req.relabellings,
        seed: req.seed,
        rng: RNG_NAME.into(),
        notes,
        cautions,
    })
}

/// The power at one sample size and the assumed effect, from all `studies` simulated studies.
pub fn power_at(req: &PlanRequest, n: u64, progress: ProgressFn) -> Result<PowerPoint, Error> {
    let (sim, ..) = check(req)?;
    sim.power(
        n,
        req.effect,
        req.studies,
        None,
        point_seed(req.seed, n, req.effect),
        progress,
        Stage::Simulation { n, sizes: 1 },
    )
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::input::table::HeaderChoice;

    /// Sizes whose work does not fit a u64 (a hostile link or file; the fuzz test found one)
    /// get the work-limit message, not an overflow.
    #[test]
    fn sizes_beyond_any_count_are_refused_by_the_work_limit() {
        for design in [PlanDesign::TwoGroups, PlanDesign::Paired] {
            let mut r = PlanRequest::new(design, PlanModel::Normal { sd: 1.0 }, 0.5, 5);
            r.mde_n = Some(u64::MAX);
            match run(&r, &mut |_| panic!("no study may run")) {
                Err(e) => {
                    assert_eq!(e.kind, ErrorKind::Limit, "{design:?}: {e:?}");
                    assert!(
                        e.message.contains("the size for the detectable effect"),
                        "{e:?}"
                    );
                }
                Ok(_) => panic!("{design:?}: a plan at 2^64 - 1 per group ran"),
            }
        }
    }

    /// Bounded work: one size that would draw more than the limit is refused before any
    /// study runs, and the search as a whole stops at the limit instead of running on.
    #[test]
    fn plans_are_held_to_the_work_limit() {
        let mut r = PlanRequest::new(PlanDesign::TwoGroups, PlanModel::Normal { sd: 1.0 }, 0.1, 5);
        r.max_n = 1_000_000;
        r.studies = 100_000;
        r.relabellings = 9_999;
        let e = run(&r, &mut |_| panic!("no study may run")).unwrap_err();
        assert_eq!(e.kind, ErrorKind::Limit);
        assert!(e.message.contains("1,000,000"), "{}", e.message);
        assert!(
            e.message.contains("Lower the simulated studies"),
            "{}",
            e.message
        );

        let r = PlanRequest::new(PlanDesign::TwoGroups, PlanModel::Normal { sd: 1.0 }, 1.0, 5);
        let (sim, ..) = check(&r).unwrap();
        // 20 values × 200 draws each × 1,000 studies = 4·10^6 draws for n = 10.
        assert_eq!(sim.study_cost(10) * r.studies as f64, 4e6);
        sim.spent.set(super::super::MAX_WORK - 1e6);
        let stage = Stage::Simulation { n: 10, sizes: 1 };
        let e = sim
            .power(10, 1.0, r.studies, None, 1, &mut |_| true, stage)
            .unwrap_err();
        assert_eq!(e.kind, ErrorKind::Limit);
        assert!(e.message.contains("next size (10)"), "{}", e.message);
    }

    #[test]
    fn no_effect_gives_the_significance_level_and_runs_repeat() {
        let mut r = PlanRequest::new(PlanDesign::TwoGroups, PlanModel::Normal { sd: 1.0 }, 0.0, 3);
        r.studies = 2000;
        let rep = run(&r, &mut |_| true).unwrap();
        assert!(rep.required.is_none());
        let p = &rep.curve[0];
        // Under no effect the rejection rate is at most α (the Monte Carlo test is valid).
        assert!(p.power <= 0.05 + 3.0 * p.se, "{p:?}");
        assert_eq!(rep, run(&r, &mut |_| true).unwrap());
    }

    #[test]
    fn search_brackets_and_settings_are_checked() {
        let mut r = PlanRequest::new(PlanDesign::TwoGroups, PlanModel::Normal { sd: 1.0 }, 1.0, 5);
        r.studies = 400;
        r.mde_n = Some(20);
        let rep = run(&r, &mut |_| true).unwrap();
        let req = rep.required.as_ref().unwrap();
        assert!(req.power >= 0.8);
        // The size just below was found below the target.
        assert!(rep.curve.iter().any(|p| p.n < req.n && p.power < 0.8));
        let d = rep.detectable.as_ref().unwrap();
        assert!(d.effect > 0.5 && d.effect < 1.5, "{d:?}");
        r.relabellings = 10;
        assert!(run(&r, &mut |_| true)
            .unwrap_err()
            .to_string()
            .contains("19 to 9,999"));
        r.relabellings = 19;
        r.alpha = 0.01;
        assert!(run(&r, &mut |_| true)
            .unwrap_err()
            .to_string()
            .contains("no study could reject"));
        let mut y = PlanRequest::new(
            PlanDesign::YesNo,
            PlanModel::Rates { baseline: 0.9 },
            0.2,
            1,
        );
        y.studies = 400;
        assert!(run(&y, &mut |_| true)
            .unwrap_err()
            .to_string()
            .contains("outside 0 to 1"));
    }

    #[test]
    fn pilot_models_and_cancel() {
        let data = "y\n3.1\n4.2\n2.8\n5.0\n3.9\n4.4\n3.3\n".to_string();
        let mut r = PlanRequest::new(
            PlanDesign::TwoGroups,
            PlanModel::Pilot {
                data: data.clone(),
                header: HeaderChoice::Detect,
                value: "y".into(),
                multiply: true,
            },
            1.5,
            9,
        );
        r.studies = 300;
        let rep = run(&r, &mut |_| true).unwrap();
        assert!(rep.required.is_some());
        let mut calls = 0;
        assert_eq!(
            run(&r, &mut |_| {
                calls += 1;
                calls < 3
            }),
            Err(Error::cancelled())
        );
        r.model = PlanModel::Pilot {
            data: "y\n3\n-1\n2\n4\n5\n".into(),
            header: HeaderChoice::Detect,
            value: "y".into(),
            multiply: true,
        };
        assert!(run(&r, &mut |_| true)
            .unwrap_err()
            .to_string()
            .contains("needs positive values"));
    }
}

//! Where to look: the normal-approximation first guess, the curve fitted through the
//! simulated sizes, and the search for the smallest detectable effect.

use super::sim::{point_seed, Sim};
use super::types::*;
use crate::base::*;
use crate::num::normal;

/// z for a one- or two-sided test at `alpha`.
pub(super) fn z_alpha(alpha: f64, alt: Alternative) -> f64 {
    match alt {
        Alternative::TwoSided => normal::quantile(1.0 - alpha / 2.0),
        _ => normal::quantile(1.0 - alpha),
    }
}

/// The normal-approximation sample size that centres the search (None for no effect).
pub(super) fn first_guess(req: &PlanRequest, sim: &Sim, spread: f64, centre: f64) -> Option<f64> {
    let z = z_alpha(req.alpha, req.alternative) + normal::quantile(req.target_power);
    let delta = match req.design {
        PlanDesign::YesNo => {
            let (p0, p1) = (sim.baseline, sim.baseline + req.effect);
            let pbar = (p0 + p1) / 2.0;
            let num = z_alpha(req.alpha, req.alternative) * (2.0 * pbar * (1.0 - pbar)).sqrt()
                + normal::quantile(req.target_power) * (p0 * (1.0 - p0) + p1 * (1.0 - p1)).sqrt();
            let d = p1 - p0;
            return (d != 0.0).then(|| (num / d).powi(2));
        }
        PlanDesign::KGroups => {
            let m: Vec<f64> = req.means.iter().map(|x| x * req.effect).collect();
            let (lo, hi) = m
                .iter()
                .fold((f64::INFINITY, f64::NEG_INFINITY), |(l, h), x| {
                    (l.min(*x), h.max(*x))
                });
            hi - lo
        }
        _ if sim.multiply => (req.effect - 1.0) * centre,
        _ => req.effect,
    };
    if delta == 0.0 || !delta.is_finite() {
        return None;
    }
    let factor = if req.design == PlanDesign::Paired {
        1.0
    } else {
        2.0
    };
    Some(factor * (z * spread / delta).powi(2) + 1.0)
}

/// Fits probit(power) = a + b·√n through the points with power strictly between 0 and 1
/// and solves for the target; None when fewer than 3 points qualify or the fit does not rise.
pub fn smooth(curve: &[PowerPoint], target: f64) -> Option<Smoothed> {
    let pts: Vec<(f64, f64, f64)> = curve
        .iter()
        .filter(|p| p.power > 0.0 && p.power < 1.0)
        .map(|p| {
            let z = normal::quantile(p.power);
            let dens = (-0.5 * z * z).exp() / (2.0 * std::f64::consts::PI).sqrt();
            // Var(probit(p̂)) ≈ p(1 − p) / (S φ(z)²).
            let var = p.power * (1.0 - p.power) / (p.studies as f64 * dens * dens);
            ((p.n as f64).sqrt(), z, 1.0 / var)
        })
        .collect();
    if pts.len() < 3 {
        return None;
    }
    let sw: f64 = pts.iter().map(|p| p.2).sum();
    let mx = pts.iter().map(|p| p.2 * p.0).sum::<f64>() / sw;
    let my = pts.iter().map(|p| p.2 * p.1).sum::<f64>() / sw;
    let sxx: f64 = pts.iter().map(|p| p.2 * (p.0 - mx).powi(2)).sum();
    let sxy: f64 = pts.iter().map(|p| p.2 * (p.0 - mx) * (p.1 - my)).sum();
    if sxx <= 0.0 {
        return None;
    }
    let b = sxy / sxx;
    if b <= 0.0 {
        return None;
    }
    let a = my - b * mx;
    let zt = normal::quantile(target);
    let root = (zt - a) / b;
    if root <= 0.0 {
        return None;
    }
    // Var(a) = 1/Σw + x̄²/Sxx, Var(b) = 1/Sxx, Cov(a, b) = −x̄/Sxx; root = (zt − a)/b.
    let (va, vb, cab) = (1.0 / sw + mx * mx / sxx, 1.0 / sxx, -mx / sxx);
    let (da, db) = (-1.0 / b, -root / b);
    let v_root = da * da * va + db * db * vb + 2.0 * da * db * cab;
    let n = root * root;
    Some(Smoothed {
        n,
        se: 2.0 * root * v_root.max(0.0).sqrt(),
        points: pts.len(),
    })
}

pub(super) fn detectable_effect(
    req: &PlanRequest,
    sim: &Sim,
    n: u64,
    spread: f64,
    centre: f64,
    progress: ProgressFn,
) -> Result<Detectable, Error> {
    let target = req.target_power;
    let sign = if req.alternative == Alternative::Less || req.effect < 0.0 {
        -1.0
    } else {
        1.0
    };
    // The effect as a distance from no effect, and back.
    let (null, limit) = match req.design {
        PlanDesign::YesNo => {
            let room = if sign > 0.0 {
                1.0 - sim.baseline
            } else {
                sim.baseline
            };
            (0.0, room)
        }
        _ if sim.multiply => (1.0, f64::INFINITY),
        _ => (0.0, f64::INFINITY),
    };
    let at = |d: f64| null + sign * d;
    let z = z_alpha(req.alpha, req.alternative) + normal::quantile(target);
    let factor = if req.design == PlanDesign::Paired {
        1.0
    } else {
        2.0
    };
    // A first guess of the distance, from the normal approximation.
    let scale = match req.design {
        PlanDesign::KGroups => {
            let (lo, hi) = req
                .means
                .iter()
                .fold((f64::INFINITY, f64::NEG_INFINITY), |(l, h), x| {
                    (l.min(*x), h.max(*x))
                });
            hi - lo
        }
        _ if sim.multiply => centre,
        _ => 1.0,
    };
    let mut hi = (z * spread * (factor / n as f64).sqrt() / scale).min(limit);
    let stage = |d: f64| Stage::Detectable { n, effect: d };
    let eval = |d: f64, full: bool, progress: ProgressFn| {
        let e = at(d);
        sim.power(
            n,
            e,
            req.studies,
            (!full).then_some(target),
            point_seed(req.seed, n, e),
            progress,
            stage(d),
        )
    };
    // Grow the upper end until it reaches the target.
    let mut hi_point = eval(hi, false, progress)?;
    let mut grow = 0;
    while hi_point.power < target && grow < 12 && hi < limit {
        hi = (hi * 1.6).min(limit);
        hi_point = eval(hi, false, progress)?;
        grow += 1;
    }
    let mut lo = 0.0;
    for _ in 0..12 {
        if hi - lo <= 0.01 * hi {
            break;
        }
        let mid = 0.5 * (lo + hi);
        let p = eval(mid, false, progress)?;
        if p.power >= target {
            hi = mid;
            hi_point = p;
        } else {
            lo = mid;
        }
    }
    if hi_point.stopped_early {
        hi_point = eval(hi, true, progress)?;
    }
    Ok(Detectable {
        n,
        effect: at(hi),
        power: hi_point,
        bracket: (at(lo), at(hi)),
    })
}

//! The simulated studies: data drawn from the assumed model, analysed by the test the
//! analysis runs, and the share of rejections.

use super::types::*;
use crate::base::format as fmt;
use crate::base::*;
use crate::classical::tables;
use crate::num::binomial::clopper_pearson;
use crate::num::normal;
use crate::resample::binomial::Binomial;
use crate::resample::k_groups::KSetup;
use crate::resample::parallel;
use crate::resample::rng;
use crate::resample::rng::Stream;
use crate::resample::share::Rounds;
use crate::resample::signs::FlipSetup;
use crate::resample::tally::{p_value, Counts};
use crate::resample::two_groups::Setup;

/// Data generation for one design and model, prepared once.
pub(super) struct Sim {
    pub(super) design: PlanDesign,
    pub(super) test: Test,
    /// Pilot values centred at their mean, and that mean (for multiplicative effects).
    pub(super) pilot: Option<(Vec<f64>, f64)>,
    pub(super) sd: f64,
    pub(super) multiply: bool,
    pub(super) baseline: f64,
    pub(super) means: Vec<f64>,
    pub(super) alternative: Alternative,
    pub(super) alpha: f64,
    pub(super) relabellings: u64,
    /// Values drawn so far by this plan's simulated studies, held to
    /// [`MAX_WORK`](crate::designs::MAX_WORK) before each size starts.
    pub(super) spent: Spent,
}

/// Values drawn so far (an f64 kept as its bits, so that the threads may share the Sim).
#[derive(Default)]
pub(super) struct Spent(std::sync::atomic::AtomicU64);

impl Spent {
    pub(super) fn get(&self) -> f64 {
        f64::from_bits(self.0.load(std::sync::atomic::Ordering::Relaxed))
    }
    pub(super) fn set(&self, v: f64) {
        self.0
            .store(v.to_bits(), std::sync::atomic::Ordering::Relaxed)
    }
}

/// A standard normal draw by inversion (pure-Rust quantile, so the same on every machine).
#[inline]
pub(super) fn gauss(s: &mut Stream) -> f64 {
    let u = ((s.next_u64() >> 11) as f64 + 0.5) * (1.0 / (1u64 << 53) as f64);
    normal::quantile(u)
}

impl Sim {
    /// Values one simulated study of `n` per group draws: its data, and each relabelling
    /// draws one per value (the yes/no exact test computes from the two counts).
    pub(super) fn study_cost(&self, n: u64) -> f64 {
        // In floating point: a hostile request's sizes may not fit a u64 product.
        let n = n as f64;
        let values = match self.design {
            PlanDesign::TwoGroups | PlanDesign::YesNo => 2.0 * n,
            PlanDesign::Paired => n,
            PlanDesign::KGroups => self.means.len() as f64 * n,
        };
        match self.design {
            PlanDesign::YesNo => values,
            _ => values * (self.relabellings + 1) as f64,
        }
    }

    /// One value of a group whose shift (or ratio) is `shift`.
    pub(super) fn value(&self, s: &mut Stream, shift: f64) -> f64 {
        match &self.pilot {
            Some((r, m)) => {
                let v = m + r[s.below(r.len() as u64) as usize];
                if self.multiply {
                    v * shift
                } else {
                    v + shift
                }
            }
            None => shift + self.sd * gauss(s),
        }
    }

    /// The no-effect value of `shift` (0, or 1 for a ratio).
    pub(super) fn null_shift(&self) -> f64 {
        if self.multiply {
            1.0
        } else {
            0.0
        }
    }

    /// One simulated study with `n` per group at `effect`: whether the test rejects. For
    /// yes/no outcomes, `rates` holds the treated and the baseline yes counts' distributions.
    pub(super) fn study(
        &self,
        mut s: Stream,
        n: u64,
        effect: f64,
        rates: Option<&(Binomial, Binomial)>,
    ) -> bool {
        let n_us = n as usize;
        let p = match (self.design, self.test) {
            (PlanDesign::YesNo, _) => match rates {
                Some((b1, b0)) => {
                    let (a, c) = (b1.draw(&mut s), b0.draw(&mut s));
                    tables::exact_p(a, n, c, n, self.alternative)
                }
                None => 1.0,
            },
            (PlanDesign::TwoGroups, Test::Two(st)) => {
                let treated: Vec<f64> = (0..n_us).map(|_| self.value(&mut s, effect)).collect();
                let reference: Vec<f64> = (0..n_us)
                    .map(|_| self.value(&mut s, self.null_shift()))
                    .collect();
                let setup = Setup::new(st, &treated, &reference);
                let (c, _) = setup.random_block(s, self.relabellings);
                self.p_of(&c)
            }
            (PlanDesign::Paired, Test::Flip(st)) => {
                let d: Vec<f64> = (0..n_us).map(|_| self.value(&mut s, effect)).collect();
                let setup = FlipSetup::new(st, &d);
                let (c, _) = setup.random_block(s, self.relabellings);
                self.p_of(&c)
            }
            (PlanDesign::KGroups, Test::K(st)) => {
                let groups: Vec<Vec<f64>> = self
                    .means
                    .iter()
                    .map(|m| (0..n_us).map(|_| self.value(&mut s, m * effect)).collect())
                    .collect();
                let setup = KSetup::new(st, &groups);
                let (c, _) = setup.random_block(s, self.relabellings);
                let b = c.ge;
                (b + 1) as f64 / (c.total + 1) as f64
            }
            _ => 1.0,
        };
        p <= self.alpha
    }

    pub(super) fn p_of(&self, c: &Counts) -> f64 {
        p_value(c, false, self.alternative, TwoSidedRule::Absolute).p
    }

    /// Power at `n` and `effect` from up to `studies` simulated studies. With `early`, stops
    /// after a batch once a 99.9% interval for the power excludes `target`.
    #[allow(clippy::too_many_arguments)]
    pub(super) fn power(
        &self,
        n: u64,
        effect: f64,
        studies: u64,
        early: Option<f64>,
        seed: u64,
        progress: ProgressFn,
        stage: Stage,
    ) -> Result<PowerPoint, Error> {
        const BATCH: u64 = 100;
        let cost = self.study_cost(n);
        let limit = crate::designs::MAX_WORK;
        if self.spent.get() + cost * studies as f64 > limit {
            return Err(crate::designs::over_work_limit(
                format!(
                    "This plan has drawn about {} values in its simulated studies, and with the \
                     next size ({}) it would draw {}",
                    fmt::sig(self.spent.get()),
                    fmt::count(n),
                    fmt::sig(self.spent.get() + cost * studies as f64),
                ),
                format!(
                    "Lower the simulated studies ({}), the relabellings per study ({}) or the \
                     largest sample size to try.",
                    fmt::count(studies),
                    fmt::count(self.relabellings),
                ),
            ));
        }
        let mut hits = 0u64;
        let mut done = 0u64;
        let mut stopped_early = false;
        let mut cancelled = false;
        let rates = (self.design == PlanDesign::YesNo).then(|| {
            (
                Binomial::with_rate(n, (self.baseline + effect).clamp(0.0, 1.0)),
                Binomial::with_rate(n, self.baseline),
            )
        });
        // Batches of studies on the run's threads, taken in order: study i draws from
        // stream i whichever thread runs it, and the early stop looks only at whole batches
        // in order, so the numbers do not depend on the thread count.
        let batches = studies.div_ceil(BATCH);
        let streams = rng::streams_for(seed, rng::Purpose::Bootstrap, 0, studies);
        let work = |b: u64| {
            let first = b * BATCH;
            let last = (first + BATCH).min(studies);
            let hits: u64 = streams[first as usize..last as usize]
                .iter()
                .map(|st| u64::from(self.study(st.clone(), n, effect, rates.as_ref())))
                .sum();
            (hits, last - first)
        };
        // Shared among workers: the early stop looks after two batches, so rounds start there.
        let described = |b: u64| Progress {
            stage: stage.clone(),
            done: (b * BATCH).min(studies),
            total: studies,
            running: None,
            sketch: None,
        };
        let shared_rounds = if early.is_some() {
            Rounds::Doubling(2)
        } else {
            Rounds::All
        };
        let finished = parallel::in_order(
            batches,
            shared_rounds,
            &work,
            &mut |_, (h, m)| {
                hits += h;
                done += m;
                if !progress(&Progress {
                    stage: stage.clone(),
                    done,
                    total: studies,
                    running: None,
                    sketch: None,
                }) {
                    cancelled = true;
                    return false;
                }
                if let Some(target) = early {
                    if done >= 2 * BATCH && done < studies {
                        let (lo, hi) = clopper_pearson(hits, done, 0.999);
                        if hi < target || lo > target {
                            stopped_early = true;
                            return false;
                        }
                    }
                }
                true
            },
            &described,
        );
        // Stopped neither by the user nor by the early stop: a shared run paused.
        if cancelled || !finished && !stopped_early {
            return Err(Error::cancelled());
        }
        self.spent.set(self.spent.get() + cost * done as f64);
        let power = hits as f64 / done as f64;
        let (low, high) = clopper_pearson(hits, done, 0.95);
        Ok(PowerPoint {
            n,
            effect,
            power,
            se: (power * (1.0 - power) / done as f64).sqrt(),
            low,
            high,
            studies: done,
            stopped_early,
        })
    }
}

/// The seed of the simulated studies at one (n, effect): derived from the run's seed, so a
/// point's numbers do not depend on which other points were evaluated before it.
pub(super) fn point_seed(seed: u64, n: u64, effect: f64) -> u64 {
    rng::sub_seed(rng::sub_seed(seed, n), effect.to_bits())
}

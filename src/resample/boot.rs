//! The bootstrap: resampling that respects the design (one sample, within strata, within
//! each of two groups, or whole pairs), and percentile, basic, normal, BCa and studentized
//! intervals read from the resampled statistics.

use crate::base::{Error, Progress, ProgressFn, Stage};
use crate::base::{Interval, IntervalMethod, Note, Side};
use crate::num::normal;
use crate::num::stats;
use crate::resample::parallel;
use crate::resample::rng::{self, Stream};
use crate::resample::share::{Portable, Rounds};

/// A statistic of one or two samples. For one sample the second slice is empty; for pairs
/// the two slices are aligned. The slices may be reordered.
pub type TwoSampleFn = fn(&mut [f64], &mut [f64]) -> f64;

/// The same as a reference to a closure (for statistics with a parameter, like a quantile).
pub type StatFn<'a> = &'a (dyn Fn(&mut [f64], &mut [f64]) -> f64 + Sync);

/// An owned statistic closure.
pub type BoxedStat = Box<dyn Fn(&mut [f64], &mut [f64]) -> f64 + Sync>;

/// How resamples are drawn.
#[derive(Clone, Copy, Debug)]
pub enum Design<'a> {
    /// One sample; with strata, each stratum (a list of indices) is resampled within itself.
    One {
        x: &'a [f64],
        strata: Option<&'a [Vec<usize>]>,
    },
    /// Two independent groups, each resampled within itself.
    Two { a: &'a [f64], b: &'a [f64] },
    /// Pairs (x_i, y_i) resampled whole: paired measurements or association.
    Pairs { x: &'a [f64], y: &'a [f64] },
    /// Observations in cells (k groups, or stratum × group cells), each cell resampled
    /// within itself. `labels[i]` is the cell of observation i, as a number; it is passed
    /// to the statistic as the second slice, aligned with the values.
    Cells {
        x: &'a [f64],
        labels: &'a [f64],
        cells: &'a [Vec<usize>],
    },
}

/// `out[i] = x[stream.below(len)]` in order: the indices of a chunk are drawn first and then
/// read, so that the reads of a large sample (random places in memory) overlap instead of
/// waiting one by one (for samples beyond the core's cache). The same draws in the same order as the plain loop, so the same values.
fn gather(stream: &mut Stream, x: &[f64], out: &mut [f64]) {
    const CHUNK: usize = 64;
    let n = x.len() as u64;
    if x.len() < 1 << 15 {
        // In cache: the plain loop is as fast.
        for v in out.iter_mut() {
            *v = x[stream.below(n) as usize];
        }
        return;
    }
    let mut idx = [0usize; CHUNK];
    for part in out.chunks_mut(CHUNK) {
        for j in idx[..part.len()].iter_mut() {
            *j = stream.below(n) as usize;
        }
        for (v, &j) in part.iter_mut().zip(&idx) {
            *v = x[j];
        }
    }
}

impl Design<'_> {
    /// The original data as the statistic receives it (first and second slice).
    pub fn original(&self) -> (Vec<f64>, Vec<f64>) {
        match self {
            Design::One { x, .. } => (x.to_vec(), Vec::new()),
            Design::Two { a, b } => (a.to_vec(), b.to_vec()),
            Design::Pairs { x, y } => (x.to_vec(), y.to_vec()),
            Design::Cells { x, labels, .. } => (x.to_vec(), labels.to_vec()),
        }
    }

    fn sizes(&self) -> (usize, usize) {
        match self {
            Design::One { x, .. } => (x.len(), 0),
            Design::Two { a, b } => (a.len(), b.len()),
            Design::Pairs { x, y } => (x.len(), y.len()),
            Design::Cells { x, .. } => (x.len(), x.len()),
        }
    }

    /// Draws one resample into the buffers.
    fn draw(&self, stream: &mut Stream, ra: &mut [f64], rb: &mut [f64]) {
        match self {
            Design::One { x, strata: None } => gather(stream, x, ra),
            Design::One {
                x,
                strata: Some(strata),
            } => {
                let mut k = 0;
                for s in strata.iter() {
                    for _ in 0..s.len() {
                        ra[k] = x[s[stream.below(s.len() as u64) as usize]];
                        k += 1;
                    }
                }
            }
            Design::Two { a, b } => {
                gather(stream, a, ra);
                gather(stream, b, rb);
            }
            Design::Pairs { x, y } => {
                for i in 0..ra.len() {
                    let j = stream.below(x.len() as u64) as usize;
                    ra[i] = x[j];
                    rb[i] = y[j];
                }
            }
            Design::Cells { x, labels, cells } => {
                rb.copy_from_slice(labels);
                for cell in cells.iter() {
                    for &p in cell {
                        ra[p] = x[cell[stream.below(cell.len() as u64) as usize]];
                    }
                }
            }
        }
    }
}

/// A statistic to bootstrap, with what the studentized interval needs.
#[derive(Clone, Copy)]
pub struct Stat<'a> {
    pub f: StatFn<'a>,
    /// Estimate on the original data (for the studentized t values).
    pub estimate: f64,
    /// How to get the standard error of a resample's statistic, when the studentized
    /// interval is wanted.
    pub se: SeMethod<'a>,
}

#[derive(Clone, Copy)]
pub enum SeMethod<'a> {
    /// No studentized interval.
    None,
    /// A formula for the standard error.
    Formula(StatFn<'a>),
    /// A nested bootstrap of this many inner resamples per resample (slower).
    Nested(usize),
}

/// Inner resamples per resample for a nested-bootstrap standard error.
pub const NESTED: usize = 50;

/// Bootstrap values of each statistic for one block, and (where asked) t values
/// (θ* − θ̂) / se*.
pub struct BlockOut {
    pub values: Vec<Vec<f64>>,
    pub t: Vec<Vec<f64>>,
}

impl Portable for BlockOut {
    fn put(&self, out: &mut Vec<u8>) {
        self.values.put(out);
        self.t.put(out);
    }
    fn get(input: &mut &[u8]) -> Option<BlockOut> {
        Some(BlockOut {
            values: Portable::get(input)?,
            t: Portable::get(input)?,
        })
    }
}

pub fn block(design: &Design, stats_: &[Stat], mut stream: Stream, len: u64) -> BlockOut {
    let (na, nb) = design.sizes();
    let mut values: Vec<Vec<f64>> = stats_
        .iter()
        .map(|_| Vec::with_capacity(len as usize))
        .collect();
    let mut t: Vec<Vec<f64>> = stats_.iter().map(|_| Vec::new()).collect();
    let (mut ra, mut rb) = (vec![0.0; na], vec![0.0; nb]);
    let (mut wa, mut wb) = (vec![0.0; na], vec![0.0; nb]);
    let (mut ia, mut ib) = (vec![0.0; na], vec![0.0; nb]);
    for _ in 0..len {
        design.draw(&mut stream, &mut ra, &mut rb);
        for (k, st) in stats_.iter().enumerate() {
            wa.copy_from_slice(&ra);
            wb.copy_from_slice(&rb);
            let v = (st.f)(&mut wa, &mut wb);
            values[k].push(v);
            let se = match st.se {
                SeMethod::None => continue,
                SeMethod::Formula(g) => {
                    wa.copy_from_slice(&ra);
                    wb.copy_from_slice(&rb);
                    g(&mut wa, &mut wb)
                }
                SeMethod::Nested(m) => {
                    // Resample the resample with the same design.
                    let inner = match design {
                        Design::One { strata, .. } => Design::One {
                            x: &ra,
                            strata: *strata,
                        },
                        Design::Two { .. } => Design::Two { a: &ra, b: &rb },
                        Design::Pairs { .. } => Design::Pairs { x: &ra, y: &rb },
                        Design::Cells { labels, cells, .. } => Design::Cells {
                            x: &ra,
                            labels,
                            cells,
                        },
                    };
                    let mut inner_vals = Vec::with_capacity(m);
                    for _ in 0..m {
                        inner.draw(&mut stream, &mut ia, &mut ib);
                        inner_vals.push((st.f)(&mut ia, &mut ib));
                    }
                    stats::sd(&inner_vals)
                }
            };
            t[k].push(if se > 0.0 && se.is_finite() {
                (v - st.estimate) / se
            } else {
                f64::NAN
            });
        }
    }
    BlockOut { values, t }
}

/// Jackknife acceleration from precomputed leave-one-out values: `loo[j][i]` is the
/// statistic with observation i of sample j left out. For two samples this is the form of
/// scipy.stats.bootstrap (scipy 1.17, `_bca_interval`): per sample j,
/// U_ji = (n_j − 1)(θ̄_j − θ_(j,i)) and a = Σ U³/n_j³ / (6 (Σ U²/n_j²)^(3/2)); for one sample it
/// reduces to Efron's (1987) a = Σ d³ / (6 (Σ d²)^(3/2)).
/// None when every leave-one-out value is the same (acceleration undefined).
pub fn acceleration_from_loo(loo: &[Vec<f64>]) -> Option<f64> {
    let (mut num, mut den) = (0.0, 0.0);
    for theta in loo {
        let n = theta.len() as f64;
        let m = stats::mean(theta);
        for t in theta {
            let u = (n - 1.0) * (m - t);
            num += u * u * u / (n * n * n);
            den += u * u / (n * n);
        }
    }
    if den <= 0.0 || !den.is_finite() {
        return None;
    }
    Some(num / (6.0 * (den * den.sqrt())))
}

/// Leave-one-out values by recomputing the statistic n times (O(n) evaluations). The
/// design decides what "one" is: an observation, an observation of one group, a pair.
pub fn leave_one_out_generic(design: &Design, f: StatFn) -> Vec<Vec<f64>> {
    let drop = |x: &[f64], i: usize| -> Vec<f64> {
        x.iter()
            .enumerate()
            .filter(|(k, _)| *k != i)
            .map(|(_, v)| *v)
            .collect()
    };
    match design {
        Design::One { x, .. } => vec![(0..x.len()).map(|i| f(&mut drop(x, i), &mut [])).collect()],
        Design::Two { a, b } => vec![
            (0..a.len())
                .map(|i| f(&mut drop(a, i), &mut b.to_vec()))
                .collect(),
            (0..b.len())
                .map(|i| f(&mut a.to_vec(), &mut drop(b, i)))
                .collect(),
        ],
        Design::Pairs { x, y } => {
            vec![(0..x.len())
                .map(|i| f(&mut drop(x, i), &mut drop(y, i)))
                .collect()]
        }
        // One jackknife sample per cell, as for two groups.
        Design::Cells { x, labels, cells } => cells
            .iter()
            .map(|cell| {
                cell.iter()
                    .map(|&i| f(&mut drop(x, i), &mut drop(labels, i)))
                    .collect()
            })
            .collect(),
    }
}

/// Jackknife acceleration computed from the statistic itself. Beyond `MAX_EXACT_JACKKNIFE`
/// observations it leaves out groups of observations (every G-th observation in turn, with
/// G = `JACKKNIFE_GROUPS` groups), a grouped jackknife; the second value says so.
pub const MAX_EXACT_JACKKNIFE: usize = 1500;
pub const JACKKNIFE_GROUPS: usize = 500;

pub fn acceleration(design: &Design, f: StatFn) -> (Option<f64>, bool) {
    let (na, nb) = design.sizes();
    if na + nb <= MAX_EXACT_JACKKNIFE {
        return (
            acceleration_from_loo(&leave_one_out_generic(design, f)),
            false,
        );
    }
    let g = JACKKNIFE_GROUPS;
    let keep = |x: &[f64], grp: usize| -> Vec<f64> {
        x.iter()
            .enumerate()
            .filter(|(k, _)| k % g != grp)
            .map(|(_, v)| *v)
            .collect()
    };
    let loo = match design {
        Design::One { x, .. } => vec![(0..g.min(x.len()))
            .map(|j| f(&mut keep(x, j), &mut []))
            .collect()],
        Design::Two { a, b } => vec![
            (0..g.min(a.len()))
                .map(|j| f(&mut keep(a, j), &mut b.to_vec()))
                .collect(),
            (0..g.min(b.len()))
                .map(|j| f(&mut a.to_vec(), &mut keep(b, j)))
                .collect(),
        ],
        Design::Pairs { x, y } => {
            vec![(0..g.min(x.len()))
                .map(|j| f(&mut keep(x, j), &mut keep(y, j)))
                .collect()]
        }
        Design::Cells { x, labels, cells } => cells
            .iter()
            .map(|cell| {
                // Leave out every G-th member of this cell in turn.
                let mut out_of_cell = vec![usize::MAX; x.len()];
                for (pos, &i) in cell.iter().enumerate() {
                    out_of_cell[i] = pos;
                }
                (0..g.min(cell.len()))
                    .map(|j| {
                        let kept = |v: &[f64]| -> Vec<f64> {
                            v.iter()
                                .enumerate()
                                .filter(|(i, _)| {
                                    out_of_cell[*i] == usize::MAX || out_of_cell[*i] % g != j
                                })
                                .map(|(_, v)| *v)
                                .collect()
                        };
                        f(&mut kept(x), &mut kept(labels))
                    })
                    .collect()
            })
            .collect(),
    };
    (acceleration_from_loo(&loo), true)
}

/// What the interval methods need from a bootstrap run.
pub struct Summary<'a> {
    pub estimate: f64,
    /// Finite bootstrap values.
    pub boot: &'a [f64],
    /// Finite studentized t values, and the standard error of the estimate, if available.
    pub t: Option<(&'a [f64], f64)>,
    /// Range of possible values of the estimate (e.g. [0, 1] for a proportion).
    pub bounds: Option<(f64, f64)>,
}

fn empty(method: IntervalMethod, level: f64, side: Side, note: Note) -> Interval {
    Interval::none(method.into(), level, side, note)
}

/// One interval by one method. `accel` is only called for BCa.
pub fn interval_by(
    method: IntervalMethod,
    level: f64,
    side: Side,
    s: &Summary,
    accel: &mut dyn FnMut() -> (Option<f64>, bool),
) -> Interval {
    if s.boot.is_empty() {
        return empty(method, level, side, Note::NoDefinedResample);
    }
    let sorted = stats::sorted(s.boot);
    let b = sorted.len() as f64;
    let (first, last) = (sorted[0], sorted[sorted.len() - 1]);
    // Quantile levels of the two ends (an open end gets None).
    let (pa, pb) = match side {
        Side::TwoSided => (Some((1.0 - level) / 2.0), Some(1.0 - (1.0 - level) / 2.0)),
        Side::Lower => (Some(1.0 - level), None),
        Side::Upper => (None, Some(level)),
    };
    // The reflected methods (basic, studentized) take each end from the opposite quantile:
    // the lower end from the upper quantile at `ra`, the upper end from the lower one at `rb`.
    let (ra, rb) = match side {
        Side::TwoSided => (pb, pa),
        Side::Lower => (Some(level), None),
        Side::Upper => (None, Some(1.0 - level)),
    };
    let mut iv = Interval {
        low: None,
        high: None,
        level,
        method: method.into(),
        side,
        notes: Vec::new(),
    };
    if first == last {
        if method == IntervalMethod::Bca || method == IntervalMethod::Studentized {
            return empty(method, level, side, Note::NoVariation);
        }
        iv.low = pa.map(|_| first);
        iv.high = pb.map(|_| first);
        iv.notes.push(Note::ZeroWidth);
        return iv;
    }
    let q = |p: f64| stats::quantile_sorted(&sorted, p);
    let mut notes: Vec<Note> = Vec::new();
    match method {
        IntervalMethod::Percentile => {
            iv.low = pa.map(q);
            iv.high = pb.map(q);
        }
        IntervalMethod::Basic => {
            iv.low = ra.map(|p| 2.0 * s.estimate - q(p));
            iv.high = rb.map(|p| 2.0 * s.estimate - q(p));
        }
        IntervalMethod::Normal => {
            let se = stats::sd(&sorted);
            let bias = stats::mean(&sorted) - s.estimate;
            let centre = s.estimate - bias;
            iv.low = pa.map(|p| centre + normal::quantile(p) * se);
            iv.high = pb.map(|p| centre + normal::quantile(p) * se);
        }
        IntervalMethod::Bca => {
            let below = sorted.partition_point(|&v| v < s.estimate) as f64;
            let equal = sorted.partition_point(|&v| v <= s.estimate) as f64 - below;
            let share = (below + 0.5 * equal) / b;
            if share <= 0.0 || share >= 1.0 {
                return empty(method, level, side, Note::AllOnOneSide);
            }
            let z0 = normal::quantile(share);
            let (a, grouped) = accel();
            let a = match a {
                Some(a) => a,
                None => {
                    notes.push(Note::AccelerationZero);
                    0.0
                }
            };
            if grouped {
                notes.push(Note::GroupedJackknife {
                    groups: JACKKNIFE_GROUPS,
                });
            }
            let adj = |p: f64| {
                let w = z0 + normal::quantile(p);
                normal::cdf(z0 + w / (1.0 - a * w))
            };
            let (la, lb) = (pa.map(adj), pb.map(adj));
            iv.low = la.map(q);
            iv.high = lb.map(q);
            let tiny = 1.0 / b;
            if la.is_some_and(|p| p < tiny) || lb.is_some_and(|p| p > 1.0 - tiny) {
                notes.push(Note::BcaAtExtremes);
            }
        }
        IntervalMethod::Studentized => {
            let Some((t, se)) = s.t else {
                return empty(method, level, side, Note::NoStandardError);
            };
            if t.len() < 10 || se.is_nan() || se <= 0.0 {
                return empty(method, level, side, Note::TooFewStandardErrors);
            }
            let ts = stats::sorted(t);
            let qt = |p: f64| stats::quantile_sorted(&ts, p);
            iv.low = ra.map(|p| s.estimate - qt(p) * se);
            iv.high = rb.map(|p| s.estimate - qt(p) * se);
            let dropped = s.boot.len() - t.len();
            if dropped > 0 {
                notes.push(Note::ZeroStandardErrors { count: dropped });
            }
        }
    }
    if let Some((lo, hi)) = s.bounds {
        let clip = |v: Option<f64>| v.map(|x| x.clamp(lo, hi));
        let (cl, ch) = (clip(iv.low), clip(iv.high));
        if cl != iv.low || ch != iv.high {
            notes.push(Note::Clipped { low: lo, high: hi });
            iv.low = cl;
            iv.high = ch;
        }
    }
    iv.notes.extend(notes);
    iv
}

/// Two-sided interval from bootstrap values (percentile or BCa), with the acceleration
/// supplied by the caller.
pub fn interval(
    method: IntervalMethod,
    level: f64,
    estimate: f64,
    boot: &[f64],
    accel: impl FnOnce() -> Option<f64>,
) -> Interval {
    let mut accel = Some(accel);
    let s = Summary {
        estimate,
        boot,
        t: None,
        bounds: None,
    };
    interval_by(method, level, Side::TwoSided, &s, &mut || {
        (accel.take().and_then(|f| f()), false)
    })
}

/// Bootstrap standard error: SD of the bootstrap statistics.
pub fn standard_error(boot: &[f64]) -> Option<f64> {
    (boot.len() > 1).then(|| stats::sd(boot))
}

/// Bootstrap values and studentized t values, one list per statistic.
pub type Resampled = (Vec<Vec<f64>>, Vec<Vec<f64>>);

/// Runs the bootstrap in blocks with progress; returns values and t values per statistic.
pub fn resample(
    design: &Design,
    stats_: &[Stat],
    seed: u64,
    total: u64,
    progress: ProgressFn,
) -> Result<Resampled, Error> {
    let mut values: Vec<Vec<f64>> = stats_
        .iter()
        .map(|_| Vec::with_capacity(total as usize))
        .collect();
    let mut tvals: Vec<Vec<f64>> = stats_.iter().map(|_| Vec::new()).collect();
    let mut done = 0;
    let streams = rng::streams_for(seed, rng::Purpose::Bootstrap, 0, rng::block_count(total));
    let work = |b: u64| {
        block(
            design,
            stats_,
            streams[b as usize].clone(),
            rng::block_len(total, b),
        )
    };
    // The first statistic's resamples so far, for a live figure marked at its estimate.
    let mut sketcher = crate::resample::summary::Sketcher::new(stats_.first().map(|s| s.estimate));
    let described = |blocks: u64| Progress {
        stage: Stage::Bootstrap,
        done: (blocks * rng::BLOCK).min(total),
        total,
        running: None,
        sketch: None,
    };
    let finished = parallel::in_order(
        rng::block_count(total),
        Rounds::All,
        &work,
        &mut |b, out| {
            if let Some(first) = out.values.first() {
                sketcher.add(first);
            }
            for (k, (v, t)) in out.values.into_iter().zip(out.t).enumerate() {
                values[k].extend(v);
                tvals[k].extend(t);
            }
            done += rng::block_len(total, b);
            progress(&Progress {
                stage: Stage::Bootstrap,
                done,
                total,
                running: None,
                sketch: sketcher.get(),
            })
        },
        &described,
    );
    if !finished {
        return Err(Error::cancelled());
    }
    Ok((values, tvals))
}

#[cfg(test)]
mod tests {
    use super::*;

    /// The chunked gather draws what the plain loop `out[i] = x[below(n)]` draws, for samples
    /// below and above the chunking size and lengths that are not a multiple of the chunk.
    #[test]
    fn the_chunked_gather_equals_the_plain_loop() {
        for (n, len) in [
            (10usize, 7usize),
            (40_000, 40_000),
            (70_001, 1_000),
            (50_000, 129),
        ] {
            let x: Vec<f64> = (0..n).map(|i| (i * 7 % 1013) as f64).collect();
            let mut s1 = Stream::new(3, rng::Purpose::Bootstrap, 5);
            let mut s2 = s1.clone();
            let mut got = vec![0.0; len];
            gather(&mut s1, &x, &mut got);
            let want: Vec<f64> = (0..len).map(|_| x[s2.below(n as u64) as usize]).collect();
            assert_eq!(got, want, "n = {n}");
            assert_eq!(s1.below(1 << 40), s2.below(1 << 40), "streams in step");
        }
    }

    fn mean_diff(a: &mut [f64], b: &mut [f64]) -> f64 {
        stats::mean(a) - stats::mean(b)
    }

    /// Class: one-sided bounds on the side asked for. For every interval method, a one-sided
    /// lower bound at level L is the lower end of the two-sided interval at 2L − 1 (and the
    /// same for upper bounds): the definition of a one-sided bound (Davison & Hinkley 1997,
    /// ch. 5, common practice). The basic and studentized bounds came out on the opposite side
    /// before this test.
    #[test]
    fn one_sided_bounds_land_on_the_side_asked_for() {
        // A skewed bootstrap distribution, so that the sides differ.
        let boot: Vec<f64> = (1..=999)
            .map(|i| (i as f64 / 1000.0).powi(3) * 10.0)
            .collect();
        let t: Vec<f64> = (1..=999).map(|i| (i as f64 / 1000.0 - 0.4) * 4.0).collect();
        let s = Summary {
            estimate: 2.0,
            boot: &boot,
            t: Some((&t, 0.5)),
            bounds: None,
        };
        for method in IntervalMethod::ALL {
            let two = interval_by(method, 0.90, Side::TwoSided, &s, &mut || {
                (Some(0.05), false)
            });
            let lower = interval_by(method, 0.95, Side::Lower, &s, &mut || (Some(0.05), false));
            let upper = interval_by(method, 0.95, Side::Upper, &s, &mut || (Some(0.05), false));
            let (lo2, hi2) = (two.low.unwrap(), two.high.unwrap());
            assert!(lo2 < hi2, "{method:?}");
            assert_eq!(
                lower.high, None,
                "{method:?}: a lower bound has an open upper end"
            );
            assert_eq!(
                upper.low, None,
                "{method:?}: an upper bound has an open lower end"
            );
            let lo1 = lower.low.expect("lower bound");
            let hi1 = upper.high.expect("upper bound");
            assert!((lo1 - lo2).abs() < 1e-9, "{method:?}: lower {lo1} vs {lo2}");
            assert!((hi1 - hi2).abs() < 1e-9, "{method:?}: upper {hi1} vs {hi2}");
        }
    }

    #[test]
    fn acceleration_of_a_mean_difference_matches_closed_form() {
        // For the mean, leave-one-out deviations are proportional to the data's deviations,
        // so a = Σ_j Σ (x - x̄_j)³ / n_j³ / (6 (Σ_j Σ (x - x̄_j)² / n_j²)^(3/2)) with the sign
        // of the second group reversed (it enters the statistic negatively).
        let a = [1.0, 2.0, 7.0, 3.0];
        let b = [2.0, 9.0, 4.0, 4.0, 1.0];
        let got = acceleration(&Design::Two { a: &a, b: &b }, &mean_diff)
            .0
            .unwrap();
        let (mut num, mut den) = (0.0, 0.0);
        for (x, sign) in [(&a[..], 1.0), (&b[..], -1.0)] {
            let n = x.len() as f64;
            let m = stats::mean(x);
            for v in x {
                // U = (n-1)(θ̄ - θ_i) = sign * (x_i - x̄) for the mean.
                let u = sign * (v - m);
                num += u * u * u / (n * n * n);
                den += u * u / (n * n);
            }
        }
        let want = num / (6.0 * den.powf(1.5));
        assert!((got - want).abs() < 1e-12, "{got} vs {want}");
    }

    #[test]
    fn zero_width_interval_has_a_note() {
        let iv = interval(IntervalMethod::Percentile, 0.95, 1.0, &[1.0; 50], || {
            Some(0.0)
        });
        assert_eq!(iv.low, Some(1.0));
        assert_eq!(iv.notes, vec![Note::ZeroWidth]);
        let iv = interval(IntervalMethod::Bca, 0.95, 1.0, &[1.0; 50], || Some(0.0));
        assert_eq!(iv.low, None);
        assert_eq!(iv.notes, vec![Note::NoVariation]);
    }

    #[test]
    fn basic_is_the_percentile_reflected_and_one_sided_bounds_are_open() {
        let boot: Vec<f64> = (0..1001).map(|i| (i as f64 / 1000.0).powi(2)).collect();
        let s = Summary {
            estimate: 0.3,
            boot: &boot,
            t: None,
            bounds: None,
        };
        let mut no = || (None, false);
        let p = interval_by(IntervalMethod::Percentile, 0.9, Side::TwoSided, &s, &mut no);
        let b = interval_by(IntervalMethod::Basic, 0.9, Side::TwoSided, &s, &mut no);
        assert!((b.low.unwrap() - (0.6 - p.high.unwrap())).abs() < 1e-12);
        assert!((b.high.unwrap() - (0.6 - p.low.unwrap())).abs() < 1e-12);
        let lower = interval_by(IntervalMethod::Percentile, 0.9, Side::Lower, &s, &mut no);
        assert!(lower.high.is_none());
        // The 90% lower bound is the 10th percentile, the 5th for a two-sided 90% interval.
        assert!((lower.low.unwrap() - stats::quantile_sorted(&boot, 0.1)).abs() < 1e-12);
        let upper = interval_by(IntervalMethod::Percentile, 0.9, Side::Upper, &s, &mut no);
        assert!(upper.low.is_none());
    }

    #[test]
    fn cell_resamples_keep_each_cell_and_its_labels() {
        // Cells {0, 2} and {1, 3, 4}: every resample keeps the labels and draws each cell's
        // values from that cell only.
        let x = [1.0, 10.0, 2.0, 20.0, 30.0];
        let labels = [0.0, 1.0, 0.0, 1.0, 1.0];
        let cells = vec![vec![0, 2], vec![1, 3, 4]];
        let d = Design::Cells {
            x: &x,
            labels: &labels,
            cells: &cells,
        };
        let check = |a: &mut [f64], l: &mut [f64]| -> f64 {
            let ok = a
                .iter()
                .zip(l.iter())
                .all(|(v, c)| if *c == 0.0 { *v < 5.0 } else { *v >= 10.0 });
            f64::from(u8::from(ok && l == [0.0, 1.0, 0.0, 1.0, 1.0]))
        };
        let st = Stat {
            f: &check,
            estimate: 1.0,
            se: SeMethod::None,
        };
        let out = block(
            &d,
            &[st],
            Stream::new(5, crate::resample::rng::Purpose::Bootstrap, 0),
            300,
        );
        assert!(out.values[0].iter().all(|&v| v == 1.0));
        // The jackknife of a mean difference over cells equals the two-group jackknife.
        let by_cells = |a: &mut [f64], l: &mut [f64]| {
            let m = |c: f64| {
                let v: Vec<f64> = a
                    .iter()
                    .zip(l.iter())
                    .filter(|p| *p.1 == c)
                    .map(|p| *p.0)
                    .collect();
                stats::mean(&v)
            };
            m(0.0) - m(1.0)
        };
        let (ac, _) = acceleration(&d, &by_cells);
        let (at, _) = acceleration(
            &Design::Two {
                a: &[1.0, 2.0],
                b: &[10.0, 20.0, 30.0],
            },
            &mean_diff,
        );
        assert!((ac.unwrap() - at.unwrap()).abs() < 1e-12);
    }

    #[test]
    fn stratified_resamples_stay_within_strata() {
        let x = [1.0, 1.0, 1.0, 100.0, 100.0];
        let strata = vec![vec![0, 1, 2], vec![3, 4]];
        let d = Design::One {
            x: &x,
            strata: Some(&strata),
        };
        let st = Stat {
            f: &|a, _| a.iter().sum(),
            estimate: 203.0,
            se: SeMethod::None,
        };
        let out = block(
            &d,
            &[st],
            Stream::new(1, crate::resample::rng::Purpose::Bootstrap, 0),
            200,
        );
        // Every resample keeps 3 values from the first stratum and 2 from the second.
        assert!(out.values[0].iter().all(|&s| s == 203.0));
    }
}

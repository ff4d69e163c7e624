//! The search space and the candidates drawn from it.
//!
//! A [`SearchSpace`] states the design freedom in SI units: the hub layouts to try (rings
//! of `n` fingers, opposed pairs with a spread), the mount radius, tilt and azimuth offset
//! as ranges or lists, and the actuators (by index into the scene's list). It expands to
//! [`Candidate`]s, each a [`HubPattern`] with one actuator, numbered from 0 in a fixed
//! order:
//!
//! - [`Sampling::Grid`]: the Cartesian product of every axis (a range gives `steps`
//!   evenly spaced values, both ends included; one step gives the middle), in the order
//!   layout, finger count, actuator, radius, tilt, azimuth offset, spread.
//! - [`Sampling::LatinHypercube`]: `samples` points of a Latin hypercube (M. D. McKay,
//!   R. J. Beckman and W. J. Conover, "A comparison of three methods for selecting values
//!   of input variables in the analysis of output from a computer code",
//!   Technometrics 21(2), 1979): every axis is cut into `samples` equal strata and each
//!   stratum holds exactly one point, placed at random inside it. Lists and the layout
//!   and actuator choices are axes too, each option taking an equal share of the strata.
//!   The generator is seeded ([`super::random`]), so a seed gives the same candidates
//!   everywhere.
//! - [`refine`]: a further round around the best candidates so far: for each parent, a
//!   Latin hypercube in a box around its parameters (`shrink^round` of each range,
//!   clipped to the range), with its layout, finger count and actuator kept.

use super::SweepError;
use super::random::{SplitMix64, derive_seed};
use crate::geometry::HubPattern;
use crate::geometry::hub::MAX_PATTERN_FINGERS;

/// Largest number of candidates one round may hold.
pub const MAX_CANDIDATES: usize = 1_000_000;

/// The values one parameter may take (SI: m or rad).
#[derive(Debug, Clone, PartialEq)]
pub enum Axis {
    /// Any value in `from..=to` (`from <= to`).
    Range {
        /// Lower end.
        from: f64,
        /// Upper end.
        to: f64,
    },
    /// One of these values (at least one).
    Values(Vec<f64>),
}

impl Axis {
    /// The grid values of this axis: `steps` evenly spaced values of a range (both ends;
    /// one step = the middle), or the list.
    fn grid(&self, steps: usize) -> Vec<f64> {
        match self {
            Self::Range { from, to } if steps <= 1 || from == to => vec![0.5 * (from + to)],
            Self::Range { from, to } => {
                (0..steps).map(|k| lerp(*from, *to, k as f64 / (steps - 1) as f64)).collect()
            }
            Self::Values(v) => v.clone(),
        }
    }

    /// The value at unit coordinate `u` in `[0, 1)`: linear along a range, the
    /// `floor(u m)`-th of `m` listed values.
    fn at(&self, u: f64) -> f64 {
        match self {
            Self::Range { from, to } => lerp(*from, *to, u),
            Self::Values(v) => v[pick(u, v.len())],
        }
    }

    /// The range `[lo, hi]` of half-width `half` (a fraction of the range's width)
    /// around `centre`, clipped to the range; `None` for a list (kept fixed).
    fn around(&self, centre: f64, half: f64) -> Option<Self> {
        match self {
            Self::Range { from, to } => {
                let h = half * (to - from);
                Some(Self::Range { from: (centre - h).max(*from), to: (centre + h).min(*to) })
            }
            Self::Values(_) => None,
        }
    }

    fn validate(&self, what: &'static str) -> Result<(), SweepError> {
        let ok = match self {
            Self::Range { from, to } => from.is_finite() && to.is_finite() && from <= to,
            Self::Values(v) => !v.is_empty() && v.iter().all(|x| x.is_finite()),
        };
        if ok { Ok(()) } else { Err(SweepError::BadAxis(what)) }
    }
}

/// `from` at `t = 0`, `to` at `t = 1` (both exactly), linear in between.
fn lerp(from: f64, to: f64, t: f64) -> f64 {
    from * (1.0 - t) + to * t
}

/// Index `floor(u m)` of `m` options, kept inside `0..m`.
fn pick(u: f64, m: usize) -> usize {
    ((u * m as f64) as usize).min(m.saturating_sub(1))
}

/// A family of hub layouts (see [`HubPattern`]).
#[derive(Debug, Clone, PartialEq)]
pub enum LayoutFamily {
    /// Evenly spaced rings with these finger counts.
    Ring {
        /// Finger counts (each 1 to 64).
        fingers: Vec<usize>,
    },
    /// Opposed pairs with these pair counts and fan spreads.
    OpposedPairs {
        /// Pair counts (each 1 to 32).
        pairs: Vec<usize>,
        /// Azimuth between neighbours of one fan (rad).
        spread: Axis,
    },
}

impl LayoutFamily {
    fn counts(&self) -> &[usize] {
        match self {
            Self::Ring { fingers } => fingers,
            Self::OpposedPairs { pairs, .. } => pairs,
        }
    }
}

/// How the first round is drawn.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Sampling {
    /// Every combination; each range gives `steps` values.
    Grid {
        /// Values per range (>= 1).
        steps: usize,
    },
    /// A Latin hypercube of `samples` points.
    LatinHypercube {
        /// Number of candidates (>= 1).
        samples: usize,
    },
}

/// Rounds of refinement around the best candidates.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Refinement {
    /// Number of refinement rounds after the first (>= 1).
    pub rounds: usize,
    /// Parents per round: the best this many candidates of all earlier rounds (>= 1).
    pub best: usize,
    /// Candidates per parent (>= 1).
    pub samples: usize,
    /// Width of the box around a parent in round `r`, as a fraction of each range:
    /// `shrink^r` (in `(0, 1]`).
    pub shrink: f64,
}

/// The design freedom of a sweep (SI units).
#[derive(Debug, Clone, PartialEq)]
pub struct SearchSpace {
    /// Layout families (at least one).
    pub layouts: Vec<LayoutFamily>,
    /// Mount radius (m, > 0).
    pub radius: Axis,
    /// Tilt (rad, in `(-pi/2, pi/2)`).
    pub tilt: Axis,
    /// Azimuth of the first finger (rad).
    pub azimuth_offset: Axis,
    /// Actuators to try, as indices into the scene's actuators (at least one).
    pub actuators: Vec<usize>,
    /// How the first round is drawn.
    pub sampling: Sampling,
    /// Refinement rounds, if any.
    pub refine: Option<Refinement>,
    /// Seed of the Latin hypercubes (first round and refinements).
    pub seed: u64,
}

/// One candidate gripper layout.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Candidate {
    /// Position in the sweep (0-based, over all rounds).
    pub index: usize,
    /// Round: 0 for the first, `r` for the `r`-th refinement.
    pub round: usize,
    /// Index of the actuator in the scene's list.
    pub actuator: usize,
    /// The hub layout (m, rad).
    pub layout: HubPattern,
}

impl Candidate {
    /// Number of fingers of the layout.
    pub fn fingers(&self) -> usize {
        match self.layout {
            HubPattern::Ring { fingers, .. } => fingers,
            HubPattern::OpposedPairs { pairs, .. } => 2 * pairs,
        }
    }
}

/// The continuous parameters of a layout, in axis order: radius, tilt, azimuth offset,
/// spread (0 for a ring).
fn parameters(p: &HubPattern) -> [f64; 4] {
    match *p {
        HubPattern::Ring { radius, tilt, azimuth_offset, .. } => [radius, tilt, azimuth_offset, 0.0],
        HubPattern::OpposedPairs { spread, radius, tilt, azimuth_offset, .. } => {
            [radius, tilt, azimuth_offset, spread]
        }
    }
}

fn pattern(
    family: &LayoutFamily,
    count: usize,
    [radius, tilt, azimuth_offset, spread]: [f64; 4],
) -> HubPattern {
    match family {
        LayoutFamily::Ring { .. } => HubPattern::Ring { fingers: count, radius, tilt, azimuth_offset },
        LayoutFamily::OpposedPairs { .. } => {
            HubPattern::OpposedPairs { pairs: count, spread, radius, tilt, azimuth_offset }
        }
    }
}

/// Latin hypercube of `n` points in `[0, 1)^D`, seeded: point `i`'s coordinate along
/// axis `d` is `(perm_d[i] + jitter) / n`.
fn latin_hypercube<const D: usize>(n: usize, seed: u64) -> Vec<[f64; D]> {
    let mut rng = SplitMix64::new(seed);
    let mut columns: Vec<Vec<usize>> = Vec::with_capacity(D);
    for _ in 0..D {
        let mut perm: Vec<usize> = (0..n).collect();
        rng.shuffle(&mut perm);
        columns.push(perm);
    }
    (0..n)
        .map(|i| {
            let mut p = [0.0; D];
            for (d, x) in p.iter_mut().enumerate() {
                *x = (columns[d][i] as f64 + rng.next_f64()) / n as f64;
            }
            p
        })
        .collect()
}

impl SearchSpace {
    /// Checks the space: non-empty lists, finite ranges in order, counts in range.
    ///
    /// # Errors
    /// [`SweepError`] naming the first bad part.
    pub fn validate(&self) -> Result<(), SweepError> {
        if self.layouts.is_empty() {
            return Err(SweepError::Empty("layouts"));
        }
        if self.actuators.is_empty() {
            return Err(SweepError::Empty("actuators"));
        }
        for f in &self.layouts {
            if f.counts().is_empty() {
                return Err(SweepError::Empty("finger counts of a layout"));
            }
            let max = match f {
                LayoutFamily::Ring { .. } => MAX_PATTERN_FINGERS,
                LayoutFamily::OpposedPairs { spread, .. } => {
                    spread.validate("spread")?;
                    MAX_PATTERN_FINGERS / 2
                }
            };
            if f.counts().iter().any(|&c| c == 0 || c > max) {
                return Err(SweepError::BadCount { max });
            }
        }
        self.radius.validate("radius")?;
        self.tilt.validate("tilt")?;
        self.azimuth_offset.validate("azimuth offset")?;
        match self.sampling {
            Sampling::Grid { steps: 0 } | Sampling::LatinHypercube { samples: 0 } => {
                return Err(SweepError::Empty("sampling"));
            }
            _ => {}
        }
        if let Some(r) = self.refine
            && (r.rounds == 0 || r.best == 0 || r.samples == 0 || !(r.shrink > 0.0 && r.shrink <= 1.0))
        {
            return Err(SweepError::BadRefinement);
        }
        Ok(())
    }

    /// The (family, count) options in order.
    fn options(&self) -> Vec<(&LayoutFamily, usize)> {
        self.layouts.iter().flat_map(|f| f.counts().iter().map(move |&c| (f, c))).collect()
    }

    /// Number of candidates of the first round.
    ///
    /// # Errors
    /// As [`SearchSpace::validate`]; [`SweepError::TooMany`] past [`MAX_CANDIDATES`].
    pub fn first_round_len(&self) -> Result<usize, SweepError> {
        self.validate()?;
        let n = match self.sampling {
            Sampling::LatinHypercube { samples } => samples as u128,
            Sampling::Grid { steps } => {
                let common = [&self.radius, &self.tilt, &self.azimuth_offset]
                    .iter()
                    .map(|a| a.grid(steps).len() as u128)
                    .product::<u128>()
                    * self.actuators.len() as u128;
                self.options()
                    .iter()
                    .map(|(f, _)| match f {
                        LayoutFamily::Ring { .. } => common,
                        LayoutFamily::OpposedPairs { spread, .. } => {
                            common * spread.grid(steps).len() as u128
                        }
                    })
                    .sum()
            }
        };
        if n > MAX_CANDIDATES as u128 {
            return Err(SweepError::TooMany { count: n });
        }
        Ok(n as usize)
    }

    /// The candidates of the first round, numbered from 0.
    ///
    /// # Errors
    /// As [`SearchSpace::first_round_len`].
    pub fn first_round(&self) -> Result<Vec<Candidate>, SweepError> {
        let n = self.first_round_len()?;
        let options = self.options();
        let mut out = Vec::with_capacity(n);
        match self.sampling {
            Sampling::Grid { steps } => {
                for (family, count) in options {
                    let spreads = match family {
                        LayoutFamily::Ring { .. } => vec![0.0],
                        LayoutFamily::OpposedPairs { spread, .. } => spread.grid(steps),
                    };
                    for &actuator in &self.actuators {
                        for r in self.radius.grid(steps) {
                            for t in self.tilt.grid(steps) {
                                for a in self.azimuth_offset.grid(steps) {
                                    for &s in &spreads {
                                        out.push(Candidate {
                                            index: out.len(),
                                            round: 0,
                                            actuator,
                                            layout: pattern(family, count, [r, t, a, s]),
                                        });
                                    }
                                }
                            }
                        }
                    }
                }
            }
            Sampling::LatinHypercube { samples } => {
                for (i, u) in latin_hypercube::<6>(samples, self.seed).into_iter().enumerate() {
                    let (family, count) = options[pick(u[0], options.len())];
                    let actuator = self.actuators[pick(u[1], self.actuators.len())];
                    let spread = match family {
                        LayoutFamily::Ring { .. } => 0.0,
                        LayoutFamily::OpposedPairs { spread, .. } => spread.at(u[5]),
                    };
                    let params =
                        [self.radius.at(u[2]), self.tilt.at(u[3]), self.azimuth_offset.at(u[4]), spread];
                    out.push(Candidate {
                        index: i,
                        round: 0,
                        actuator,
                        layout: pattern(family, count, params),
                    });
                }
            }
        }
        Ok(out)
    }
}

/// The candidates of refinement round `round` (>= 1) around `parents` (best first),
/// numbered from `first_index`. Empty when the space has no refinement or `round` is past
/// its last round.
///
/// Parent `k` gets `samples` candidates from a Latin hypercube seeded with the space's
/// seed, the round and `k`, in the box of half-width `shrink^round / 2` of each range
/// around its parameters (clipped to the range); a listed axis keeps the parent's value.
/// Only the first `best` parents are used.
///
/// # Errors
/// As [`SearchSpace::validate`].
pub fn refine(
    space: &SearchSpace,
    parents: &[Candidate],
    round: usize,
    first_index: usize,
) -> Result<Vec<Candidate>, SweepError> {
    space.validate()?;
    let Some(r) = space.refine else { return Ok(Vec::new()) };
    if round == 0 || round > r.rounds {
        return Ok(Vec::new());
    }
    let half = 0.5 * r.shrink.powi(round as i32);
    let mut out = Vec::new();
    for (k, parent) in parents.iter().take(r.best).enumerate() {
        let p = parameters(&parent.layout);
        let spread_axis = space.layouts.iter().find_map(|f| match (f, parent.layout) {
            (LayoutFamily::OpposedPairs { pairs, spread }, HubPattern::OpposedPairs { pairs: n, .. })
                if pairs.contains(&n) =>
            {
                Some(spread)
            }
            _ => None,
        });
        let axes: [Option<Axis>; 4] = [
            space.radius.around(p[0], half),
            space.tilt.around(p[1], half),
            space.azimuth_offset.around(p[2], half),
            spread_axis.and_then(|a| a.around(p[3], half)),
        ];
        let seed = derive_seed(space.seed, ((round as u64) << 32) | k as u64);
        for u in latin_hypercube::<4>(r.samples, seed) {
            let mut q = p;
            for d in 0..4 {
                if let Some(a) = &axes[d] {
                    q[d] = a.at(u[d]);
                }
            }
            let layout = match parent.layout {
                HubPattern::Ring { fingers, .. } => {
                    HubPattern::Ring { fingers, radius: q[0], tilt: q[1], azimuth_offset: q[2] }
                }
                HubPattern::OpposedPairs { pairs, .. } => HubPattern::OpposedPairs {
                    pairs,
                    spread: q[3],
                    radius: q[0],
                    tilt: q[1],
                    azimuth_offset: q[2],
                },
            };
            out.push(Candidate { index: first_index + out.len(), round, actuator: parent.actuator, layout });
        }
    }
    Ok(out)
}

#[cfg(test)]
mod tests {
    use super::*;

    fn space(sampling: Sampling) -> SearchSpace {
        SearchSpace {
            layouts: vec![
                LayoutFamily::Ring { fingers: vec![3, 4] },
                LayoutFamily::OpposedPairs { pairs: vec![2], spread: Axis::Range { from: 0.3, to: 0.9 } },
            ],
            radius: Axis::Range { from: 0.04, to: 0.07 },
            tilt: Axis::Range { from: -0.1, to: 0.2 },
            azimuth_offset: Axis::Values(vec![0.0, 0.5]),
            actuators: vec![0, 1],
            sampling,
            refine: Some(Refinement { rounds: 2, best: 3, samples: 4, shrink: 0.5 }),
            seed: 7,
        }
    }

    /// The defining property of a Latin hypercube (McKay, Beckman & Conover 1979): along
    /// every axis each of the n strata [k/n, (k+1)/n) holds exactly one point.
    #[test]
    fn latin_hypercube_fills_every_stratum_once() {
        for n in [1, 2, 7, 50] {
            let pts = latin_hypercube::<6>(n, 99);
            assert_eq!(pts.len(), n);
            for d in 0..6 {
                let mut strata: Vec<usize> = pts.iter().map(|p| (p[d] * n as f64).floor() as usize).collect();
                strata.sort_unstable();
                assert_eq!(strata, (0..n).collect::<Vec<_>>(), "axis {d}, n {n}");
            }
        }
        assert_ne!(latin_hypercube::<2>(10, 1), latin_hypercube::<2>(10, 2));
    }

    /// Grid: the count is the product of the axes, the ends of each range are included,
    /// and the order is fixed (layout, count, actuator, radius, tilt, azimuth, spread).
    #[test]
    fn grid_is_the_full_product_with_range_ends() {
        let s = space(Sampling::Grid { steps: 3 });
        let c = s.first_round().unwrap();
        // rings: 2 counts x 2 actuators x 3 x 3 x 2; pairs: 1 x 2 x 3 x 3 x 2 x 3 spreads
        assert_eq!(c.len(), 2 * 2 * 3 * 3 * 2 + 2 * 3 * 3 * 2 * 3);
        assert_eq!(c.len(), s.first_round_len().unwrap());
        assert!(c.iter().enumerate().all(|(i, x)| x.index == i && x.round == 0));
        assert_eq!(
            c[0].layout,
            HubPattern::Ring { fingers: 3, radius: 0.04, tilt: -0.1, azimuth_offset: 0.0 }
        );
        assert_eq!(
            c[1].layout,
            HubPattern::Ring { fingers: 3, radius: 0.04, tilt: -0.1, azimuth_offset: 0.5 }
        );
        let radii: Vec<f64> = c.iter().map(|x| parameters(&x.layout)[0]).collect();
        assert!(
            radii.contains(&0.04) && radii.contains(&0.07) && radii.iter().any(|r| (r - 0.055).abs() < 1e-15)
        );
        let last = c.last().unwrap();
        assert_eq!(
            last.layout,
            HubPattern::OpposedPairs { pairs: 2, spread: 0.9, radius: 0.07, tilt: 0.2, azimuth_offset: 0.5 }
        );
        assert_eq!(last.actuator, 1);
        assert_eq!(last.fingers(), 4);
        // one step: the middle of each range
        let one = space(Sampling::Grid { steps: 1 }).first_round().unwrap();
        assert!((parameters(&one[0].layout)[0] - 0.055).abs() < 1e-15);
    }

    /// Latin hypercube: seeded and repeatable, values inside their ranges, listed values
    /// only, and each layout option (and actuator) drawn in equal shares.
    #[test]
    fn latin_hypercube_candidates_are_seeded_balanced_and_in_range() {
        let s = space(Sampling::LatinHypercube { samples: 30 });
        let a = s.first_round().unwrap();
        assert_eq!(a, s.first_round().unwrap());
        let other = SearchSpace { seed: 8, ..s.clone() }.first_round().unwrap();
        assert_ne!(a, other);
        let mut per_option = [0usize; 3];
        for c in &a {
            let p = parameters(&c.layout);
            assert!((0.04..=0.07).contains(&p[0]) && (-0.1..=0.2).contains(&p[1]));
            assert!(p[2] == 0.0 || p[2] == 0.5);
            match c.layout {
                HubPattern::Ring { fingers: 3, .. } => per_option[0] += 1,
                HubPattern::Ring { fingers: 4, .. } => per_option[1] += 1,
                HubPattern::OpposedPairs { pairs: 2, spread, .. } => {
                    assert!((0.3..=0.9).contains(&spread));
                    per_option[2] += 1;
                }
                _ => panic!("unexpected layout {:?}", c.layout),
            }
        }
        assert_eq!(per_option, [10, 10, 10]);
        assert_eq!(a.iter().filter(|c| c.actuator == 0).count(), 15);
    }

    /// Refinement stays in the shrunk box around each parent, keeps its discrete choices,
    /// numbers on from `first_index`, and uses only the `best` first parents.
    #[test]
    fn refinement_samples_around_the_parents() {
        let s = space(Sampling::LatinHypercube { samples: 12 });
        let first = s.first_round().unwrap();
        let parents: Vec<Candidate> = first.iter().rev().copied().collect();
        let r1 = refine(&s, &parents, 1, 12).unwrap();
        assert_eq!(r1.len(), 3 * 4);
        for (k, chunk) in r1.chunks(4).enumerate() {
            let parent = parents[k];
            let pp = parameters(&parent.layout);
            for (j, c) in chunk.iter().enumerate() {
                assert_eq!(
                    (c.index, c.round, c.actuator, c.fingers()),
                    (12 + 4 * k + j, 1, parent.actuator, parent.fingers())
                );
                let q = parameters(&c.layout);
                // half-width 0.5^1 / 2 = 0.25 of the range
                assert!((q[0] - pp[0]).abs() <= 0.25 * 0.03 + 1e-15);
                assert!((q[1] - pp[1]).abs() <= 0.25 * 0.3 + 1e-15);
                assert!((0.04..=0.07).contains(&q[0]));
                assert_eq!(q[2], pp[2], "a listed axis keeps the parent's value");
            }
        }
        let r2 = refine(&s, &parents, 2, 24).unwrap();
        assert_ne!(parameters(&r2[0].layout), parameters(&r1[0].layout));
        assert!(refine(&s, &parents, 3, 36).unwrap().is_empty());
        assert!(refine(&s, &parents, 0, 36).unwrap().is_empty());
    }

    #[test]
    fn bad_spaces_are_refused() {
        let good = space(Sampling::Grid { steps: 2 });
        let bad = |f: &dyn Fn(&mut SearchSpace)| {
            let mut s = good.clone();
            f(&mut s);
            s.first_round().unwrap_err()
        };
        assert_eq!(bad(&|s| s.layouts.clear()), SweepError::Empty("layouts"));
        assert_eq!(bad(&|s| s.actuators.clear()), SweepError::Empty("actuators"));
        assert_eq!(bad(&|s| s.radius = Axis::Range { from: 0.07, to: 0.04 }), SweepError::BadAxis("radius"));
        assert_eq!(bad(&|s| s.tilt = Axis::Values(vec![])), SweepError::BadAxis("tilt"));
        assert_eq!(
            bad(&|s| s.layouts[0] = LayoutFamily::Ring { fingers: vec![0] }),
            SweepError::BadCount { max: 64 }
        );
        assert_eq!(
            bad(&|s| s.sampling = Sampling::LatinHypercube { samples: 0 }),
            SweepError::Empty("sampling")
        );
        assert_eq!(
            bad(&|s| s.refine = Some(Refinement { rounds: 1, best: 1, samples: 1, shrink: 0.0 })),
            SweepError::BadRefinement
        );
        assert!(matches!(bad(&|s| s.sampling = Sampling::Grid { steps: 1000 }), SweepError::TooMany { .. }));
    }
}

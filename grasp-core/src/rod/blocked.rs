//! The blocked tip force (DESIGN 3.3).
//!
//! Base clamped, chamber pressurised, the tip end held on the unbent axis (zero lateral
//! displacement `u`, free to rotate and to slide along `w`) by a force normal to that
//! axis: the force needed. It is the multiplier of the constraint `u(tip) = 0`.

use super::{MaterialPoint, PointConstraint, Rod, RodError, RodSolution, SolveReport, solve};
use crate::math::Vec2;
use crate::section::SectionLaw;

/// The blocked-force result.
#[derive(Debug, Clone, PartialEq)]
pub struct BlockedForce {
    /// Force the holder applies, along `-u` (N); positive when the finger pushes toward
    /// `+u`, the side it bends to.
    pub force: f64,
    /// The held rod.
    pub solution: RodSolution,
}

/// Pressure levels tried, as fractions of the target, when the direct solve from the
/// initial guess fails (pressure continuation).
const CONTINUATION: [f64; 4] = [0.25, 0.5, 0.75, 1.0];

/// Solves the blocked configuration of `rod` under `law` (at the law's pressure).
///
/// `initial` is a starting configuration (e.g. the blocked state at a nearby pressure);
/// default straight, which already satisfies the constraint. If the direct solve fails,
/// the pressure is ramped from a quarter of its value.
///
/// # Errors
/// As [`solve`].
pub fn blocked_tip_force(
    rod: &Rod,
    law: &SectionLaw,
    initial: Option<&[f64]>,
) -> Result<BlockedForce, RodError> {
    let hold = [PointConstraint {
        point: MaterialPoint { s: rod.length(), y: 0.0 },
        direction: Vec2::X,
        target: 0.0,
    }];
    let mut sol = solve(rod, law, &[], &hold, initial)?;
    if !sol.report.converged() {
        let mut guess: Option<Vec<f64>> = None;
        let mut iterations = sol.report.iterations;
        for frac in CONTINUATION {
            let l = law.at_pressure(law.pressure() * frac);
            sol = solve(rod, &l, &[], &hold, guess.as_deref())?;
            iterations += sol.report.iterations;
            if !sol.report.converged() {
                break;
            }
            guess = Some(sol.angles.clone());
        }
        sol.report.iterations = iterations;
    }
    Ok(BlockedForce { force: sol.multipliers[0], solution: sol })
}

/// The blocked force at one pressure of a curve.
#[derive(Debug, Clone, PartialEq)]
pub enum BlockedOutcome {
    /// The tip is held on the axis.
    Held {
        /// Blocked tip force (N).
        force: f64,
        /// Convergence record of the solve at this pressure.
        report: SolveReport,
    },
    /// Past a limit point of the held branch: the held configuration stops existing (the
    /// tip curls past the holder and would slip off it), so no blocked force exists here.
    BeyondLimit {
        /// Highest pressure at which the held branch was found (Pa).
        limit_pressure: f64,
        /// Blocked force there, the largest the finger holds on the axis (N).
        limit_force: f64,
    },
    /// The solve failed and the failure does not look like a limit point.
    NotConverged(SolveReport),
}

/// Sub-steps allowed when continuing from one pressure of a curve to the next.
const MAX_SUBSTEPS: usize = 60;
/// A stall counts as a limit point when the force-pressure slope at the last held
/// state exceeds the mean slope `F/p` by this factor (the curve turning vertical).
const LIMIT_SLOPE_FACTOR: f64 = 3.0;

/// The blocked force over `pressures` (Pa, ascending), following the held branch from
/// the straight finger at zero pressure by pressure continuation: each pressure starts
/// from the previous one's solution, and a failed step is retried in halving sub-steps.
/// When the sub-steps close in on a pressure beyond which no held state exists and the
/// force there rises ever more steeply with pressure, the branch has a limit point
/// (a fold, where `dF/dp` becomes unbounded) and later pressures are
/// [`BlockedOutcome::BeyondLimit`].
///
/// # Errors
/// As [`solve`].
pub fn blocked_force_curve(
    rod: &Rod,
    law: &SectionLaw,
    pressures: &[f64],
) -> Result<Vec<BlockedOutcome>, RodError> {
    // (pressure, force, angles) of the last held state, and the one before it
    let mut last: (f64, f64, Vec<f64>) = (0.0, 0.0, vec![0.0; rod.dofs()]);
    let mut before: Option<(f64, f64)> = None;
    let mut limit: Option<(f64, f64)> = None;
    let mut out = Vec::with_capacity(pressures.len());
    for &p in pressures {
        if let Some((lp, lf)) = limit
            && p > lp
        {
            out.push(BlockedOutcome::BeyondLimit { limit_pressure: lp, limit_force: lf });
            continue;
        }
        let first = blocked_tip_force(rod, &law.at_pressure(p), Some(&last.2))?;
        if first.solution.report.converged() {
            before = Some((last.0, last.1));
            last = (p, first.force, first.solution.angles);
            out.push(BlockedOutcome::Held { force: first.force, report: first.solution.report });
            continue;
        }
        let mut step = 0.5 * (p - last.0);
        let mut reached = false;
        let mut failed_report = first.solution.report;
        for _ in 0..MAX_SUBSTEPS {
            let target = (last.0 + step).min(p);
            let b = blocked_tip_force(rod, &law.at_pressure(target), Some(&last.2))?;
            if b.solution.report.converged() {
                before = Some((last.0, last.1));
                last = (target, b.force, b.solution.angles);
                if target >= p {
                    reached = true;
                    out.push(BlockedOutcome::Held { force: b.force, report: b.solution.report });
                    break;
                }
            } else {
                failed_report = b.solution.report;
                step *= 0.5;
                if step <= 1e-6 * p.abs().max(1.0) {
                    break;
                }
            }
        }
        if reached {
            continue;
        }
        let steep = before.is_some_and(|(p0, f0)| {
            let end_slope = (last.1 - f0) / (last.0 - p0);
            let mean_slope = last.1 / last.0;
            last.0 > 0.0 && end_slope > LIMIT_SLOPE_FACTOR * mean_slope
        });
        if steep {
            limit = Some((last.0, last.1));
            out.push(BlockedOutcome::BeyondLimit { limit_pressure: last.0, limit_force: last.1 });
        } else {
            out.push(BlockedOutcome::NotConverged(failed_report));
        }
    }
    Ok(out)
}

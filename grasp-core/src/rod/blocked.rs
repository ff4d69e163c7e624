//! The blocked tip force (DESIGN 3.3).
//!
//! Base clamped, chamber pressurised, the tip end held on the unbent axis (zero lateral
//! displacement `u`, free to rotate and to slide along `w`) by a force normal to that
//! axis: the force needed. It is the multiplier of the constraint `u(tip) = 0`.

use super::{MaterialPoint, PointConstraint, Rod, RodError, RodSolution, solve};
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
pub fn blocked_tip_force(rod: &Rod, law: &SectionLaw, initial: Option<&[f64]>) -> Result<BlockedForce, RodError> {
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

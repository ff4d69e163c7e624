//! Unilateral (contact) constraints on the rod: gaps that may open but not close.
//!
//! A gap is `g(psi) = n . x(point) - c >= 0` for a material point, an in-plane unit
//! normal `n` (the direction in which the gap opens) and an offset `c`. Complementarity:
//! `g >= 0`, contact force `f >= 0` pushing the rod along `+n`, `f g = 0`.
//!
//! Solved by a primal active-set method around the equality-constrained Newton solve
//! ([`super::solve`]): the active gaps are held closed as equalities; an active gap whose
//! force comes out tensile is released (the most tensile first), an inactive gap that
//! comes out closed beyond the tolerance is activated (the most violated first), until
//! neither happens (Nocedal & Wright, "Numerical Optimization", 2nd ed., 2006, ch. 16.5,
//! applied to the nonlinear equilibrium). The number of rounds is bounded; running out
//! of them is a reported status, never a pass.

use super::{
    MaterialPoint, MomentLaw, PointConstraint, PointLoad, Rod, RodError, RodSolution, SolveStatus,
    solve_within,
};
use crate::math::Vec2;

/// Largest closure allowed on an inactive gap (m): 1 µm, well inside DESIGN 3.3's 0.01 mm.
pub const GAP_TOLERANCE: f64 = 1e-6;
/// Newton iterations allowed per active-set round: a round starts from the previous
/// round's equilibrium and converges in a handful; one that needs more is holding an
/// infeasible set of gaps and is better given up early.
pub const ROUND_ITERATIONS: usize = 25;

/// A unilateral constraint `n . x(point) - offset >= 0`.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct PointGap {
    /// The material point.
    pub point: MaterialPoint,
    /// In-plane unit normal along which the gap opens (the contact force pushes the rod
    /// along it).
    pub normal: Vec2,
    /// Offset `c` (m): the gap is `normal . x - offset`.
    pub offset: f64,
}

/// The rod solved with gaps.
#[derive(Debug, Clone, PartialEq)]
pub struct ContactSolution {
    /// The rod solution (equality multipliers first, then the active gaps').
    pub solution: RodSolution,
    /// Per gap: the compressive contact force (N, >= 0; 0 on an open gap).
    pub gap_forces: Vec<f64>,
    /// Per gap: the gap at the solution (m).
    pub gaps: Vec<f64>,
    /// Per gap: whether it is held closed.
    pub active: Vec<bool>,
    /// Active-set rounds taken.
    pub rounds: usize,
}

/// Solves the rod with equality `constraints` and unilateral `gaps`.
///
/// `initial_active` seeds the active set (e.g. from a previous pressure); by default the
/// gaps closed at the initial configuration start active.
///
/// # Errors
/// As [`solve`]; also a gap normal that is not a finite unit vector.
pub fn solve_with_gaps(
    rod: &Rod,
    law: &dyn MomentLaw,
    loads: &[PointLoad],
    constraints: &[PointConstraint],
    gaps: &[PointGap],
    initial: Option<&[f64]>,
    initial_active: Option<&[bool]>,
) -> Result<ContactSolution, RodError> {
    for g in gaps {
        if !(g.normal.is_finite() && g.offset.is_finite() && (g.normal.length() - 1.0).abs() < 1e-9) {
            return Err(RodError::BadInput("gap normal must be a finite unit vector"));
        }
        rod.segment(g.point.s)?;
    }
    let gap_values = |angles: &[f64]| -> Result<Vec<f64>, RodError> {
        gaps.iter().map(|g| Ok(g.normal.dot(rod.position(angles, g.point)?) - g.offset)).collect()
    };
    let mut angles: Vec<f64> = initial.map_or_else(|| vec![0.0; rod.dofs()], <[f64]>::to_vec);
    let mut active: Vec<bool> = match initial_active {
        Some(a) if a.len() == gaps.len() => a.to_vec(),
        _ => gap_values(&angles)?.iter().map(|&g| g <= GAP_TOLERANCE).collect(),
    };
    let max_rounds = 4 * gaps.len() + 8;
    let mut last: Option<RodSolution> = None;
    for round in 1..=max_rounds {
        let mut all: Vec<PointConstraint> = constraints.to_vec();
        let mut which: Vec<usize> = Vec::new();
        for (i, g) in gaps.iter().enumerate() {
            if active[i] {
                all.push(PointConstraint { point: g.point, direction: g.normal, target: g.offset });
                which.push(i);
            }
        }
        let sol = solve_within(rod, law, loads, &all, Some(&angles), ROUND_ITERATIONS)?;
        if !sol.report.converged() {
            return Ok(finish(sol, gaps, &active, &which, constraints.len(), gap_values, round));
        }
        angles.clone_from(&sol.angles);
        // the constraint applies -lambda n; a compressive contact pushes +n: f = -lambda
        let forces: Vec<f64> =
            which.iter().enumerate().map(|(k, _)| -sol.multipliers[constraints.len() + k]).collect();
        let force_scale = forces.iter().fold(0.0f64, |a, f| a.max(f.abs())).max(1e-12);
        let tensile = forces
            .iter()
            .enumerate()
            .filter(|(_, f)| **f < -1e-9 * force_scale)
            .min_by(|a, b| a.1.total_cmp(b.1));
        if let Some((k, _)) = tensile {
            active[which[k]] = false;
            last = Some(sol);
            continue;
        }
        let values = gap_values(&angles)?;
        let violated = values
            .iter()
            .enumerate()
            .filter(|(i, g)| !active[*i] && **g < -GAP_TOLERANCE)
            .min_by(|a, b| a.1.total_cmp(b.1));
        if let Some((i, _)) = violated {
            active[i] = true;
            last = Some(sol);
            continue;
        }
        return Ok(finish(sol, gaps, &active, &which, constraints.len(), gap_values, round));
    }
    // out of rounds: report the last state as not converged
    let mut sol = last.ok_or(RodError::BadInput("no gaps to solve"))?;
    sol.report.status = SolveStatus::IterationLimit;
    let which: Vec<usize> = (0..gaps.len()).filter(|&i| active[i]).collect();
    let n_eq = constraints.len();
    // multipliers of `sol` belong to the previous active set; report forces only if they match
    let forces_ok = sol.multipliers.len() == n_eq + which.len();
    let mut out = finish(sol, gaps, &active, &which, n_eq, gap_values, max_rounds);
    if !forces_ok {
        out.gap_forces.iter_mut().for_each(|f| *f = f64::NAN);
    }
    Ok(out)
}

fn finish(
    sol: RodSolution,
    gaps: &[PointGap],
    active: &[bool],
    which: &[usize],
    n_eq: usize,
    gap_values: impl Fn(&[f64]) -> Result<Vec<f64>, RodError>,
    rounds: usize,
) -> ContactSolution {
    let mut gap_forces = vec![0.0; gaps.len()];
    for (k, &i) in which.iter().enumerate() {
        if let Some(l) = sol.multipliers.get(n_eq + k) {
            gap_forces[i] = -l;
        }
    }
    let values = gap_values(&sol.angles).unwrap_or_else(|_| vec![f64::NAN; gaps.len()]);
    ContactSolution { gap_forces, gaps: values, active: active.to_vec(), rounds, solution: sol }
}

//! Unilateral contact by sequential quadratic programming: one Newton step of the rod's
//! equilibrium and its contact forces together.
//!
//! At angles `psi` the rod's potential `Pi` (elements and dead loads, [`super::solve`])
//! has the gradient `r` and a tridiagonal Hessian; each gap `g_c(psi) = n_c . x_c(psi) -
//! offset_c >= 0` has the gradient row `G_c`. The step `d` and the compressive forces
//! `f >= 0` solve the quadratic program
//!
//! `min 1/2 d^T H d + r^T d  subject to  g + G d >= 0`,
//!
//! with `H` the Hessian of the Lagrangian `Pi - f^T g` at the previous forces (exact
//! second derivatives of the material points; Nocedal & Wright, "Numerical Optimization",
//! 2nd ed., 2006, ch. 18, the local SQP method). `H` is tridiagonal, so `H^-1` costs
//! `O(n)` per right-hand side, and the program reduces to a linear complementarity
//! problem in the few contact forces, `w = M f + q >= 0`, `f >= 0`, `f^T w = 0`, with `M
//! = G H^-1 G^T` and `q = g - G H^-1 r`; it is solved by principal pivoting with the
//! least-index rule, which is finite for a positive definite `M` (Murty, "Note on a
//! Bard-type scheme for solving the complementarity problem", Opsearch 11, 1974).
//! Then `d = -H^-1 (r - G^T f)`.
//!
//! Where `H` is not positive definite (a load or contact term outweighs the bending
//! stiffness) a multiple of the identity is added, the usual Levenberg safeguard; the
//! step then only descends, and the outer iteration continues.
//!
//! The closing stage re-linearises the contact geometry between steps (the gaps change
//! with the configuration); [`solve_with_gaps_sqp`] iterates the step on fixed gaps.
//! [`contact_step`] is the one-rod case of [`super::coupled_step`], which takes several
//! rods at once with gaps shared between two of them (fingers touching each other).

use super::coupled::{RodBlock, SharedGap, coupled_step};
use super::solve::Placement;
use super::{
    Chain, ContactSolution, MomentLaw, PointGap, PointLoad, Rod, RodError, RodSolution, SolveReport,
    SolveStatus,
};
use super::{GAP_TOLERANCE, solve::RESIDUAL_TOLERANCE};
use crate::math::Vec2;

/// Largest change of any angle in one step (rad).
pub const MAX_STEP_RAD: f64 = 0.5;

/// One step of the contact problem at a configuration.
#[derive(Debug, Clone, PartialEq)]
pub struct ContactStep {
    /// The step of the angles (rad), `rod.dofs()` values.
    pub step: Vec<f64>,
    /// Per gap: the compressive force of the step (N, >= 0).
    pub forces: Vec<f64>,
    /// Per gap: held closed in the step's program.
    pub active: Vec<bool>,
    /// Equilibrium residual at the current angles with these forces,
    /// `max |r - G^T f|` over the moment scale.
    pub residual: f64,
    /// Per gap: its value at the current angles (m).
    pub gaps: Vec<f64>,
    /// The Hessian needed a shift to be positive definite.
    pub regularised: bool,
}

/// A tridiagonal `L D L^T` factorisation: `H = L D L^T`, `L` unit lower bidiagonal with
/// `lower[k] = L[k+1][k]`.
pub(super) struct Tridiagonal {
    d: Vec<f64>,
    lower: Vec<f64>,
}

impl Tridiagonal {
    /// Factors `H` (`diagonal`, `upper`) plus `shift` on the diagonal; `None` unless every
    /// pivot is positive beyond round-off.
    pub(super) fn factor(diagonal: &[f64], upper: &[f64], shift: f64) -> Option<Self> {
        Self::factor_with(diagonal, upper, shift, true)
    }

    /// Factors an indefinite `H`: `None` only if a pivot vanishes (to round-off).
    pub(super) fn factor_indefinite(diagonal: &[f64], upper: &[f64]) -> Option<Self> {
        Self::factor_with(diagonal, upper, 0.0, false)
    }

    fn factor_with(diagonal: &[f64], upper: &[f64], shift: f64, definite: bool) -> Option<Self> {
        let n = diagonal.len();
        let scale = diagonal.iter().fold(0.0f64, |a, v| a.max(v.abs())).max(f64::MIN_POSITIVE);
        let mut d = Vec::with_capacity(n);
        let mut lower = Vec::with_capacity(n.saturating_sub(1));
        for k in 0..n {
            let mut dk = diagonal[k] + shift;
            if k > 0 {
                dk -= lower[k - 1] * upper[k - 1];
            }
            let ok = if definite { dk > 1e-12 * scale } else { dk.abs() > 1e-12 * scale };
            if !ok {
                return None;
            }
            d.push(dk);
            if k + 1 < n {
                lower.push(upper[k] / dk);
            }
        }
        Some(Self { d, lower })
    }

    /// Negative pivots: `H`'s negative eigenvalues (Sylvester's law of inertia).
    pub(super) fn negative_pivots(&self) -> usize {
        self.d.iter().filter(|p| **p < 0.0).count()
    }

    pub(super) fn solve(&self, b: &mut [f64]) {
        let n = b.len();
        for k in 1..n {
            b[k] -= self.lower[k - 1] * b[k - 1];
        }
        for (v, d) in b.iter_mut().zip(&self.d) {
            *v /= d;
        }
        for k in (0..n.saturating_sub(1)).rev() {
            b[k] -= self.lower[k] * b[k + 1];
        }
    }
}

/// Second derivatives `(k, l, value)` of a gap (`l in {k, k+1}`).
type Second = Vec<(usize, usize, f64)>;

/// Value, gradient row (dense) and second derivatives of one gap.
pub(super) fn gap_terms(placed: &Placement<'_>, gap: &PointGap) -> Result<(f64, Vec<f64>, Second), RodError> {
    let value = gap.normal.dot(placed.position(gap.point)?) - gap.offset;
    let d = placed.derivatives(gap.point)?;
    let mut row = vec![0.0; placed.angles().len()];
    for (k, d1) in d.first {
        row[k] += gap.normal.dot(d1);
    }
    let second = d
        .second
        .into_iter()
        .filter(|&(k, l, _)| l == k || l == k + 1)
        .map(|(k, l, d2)| (k, l, gap.normal.dot(d2)))
        .collect();
    Ok((value, row, second))
}

/// Solves the linear complementarity problem `w = M f + q >= 0, f >= 0, f^T w = 0`
/// (`M` row-major, `m x m`) by principal pivoting from the active set `seed`; `None` if
/// the pivoting runs out of its bounded number of pivots or a principal block is
/// singular.
pub(super) fn complementarity(m: &[f64], q: &[f64], seed: &[bool]) -> Option<(Vec<f64>, Vec<bool>)> {
    let size = q.len();
    let mut active = seed.to_vec();
    let f_scale = m.iter().fold(0.0f64, |a, v| a.max(v.abs())).max(f64::MIN_POSITIVE);
    let w_scale = q.iter().fold(0.0f64, |a, v| a.max(v.abs())).max(f64::MIN_POSITIVE);
    for _ in 0..(50 + 10 * size) {
        let idx: Vec<usize> = (0..size).filter(|&i| active[i]).collect();
        let mut f = vec![0.0; size];
        if !idx.is_empty() {
            let k = idx.len();
            // M_AA f_A = -q_A, with a tiny diagonal against duplicate rows
            let block = nalgebra::DMatrix::from_fn(k, k, |a, b| {
                m[idx[a] * size + idx[b]] + if a == b { 1e-13 * f_scale } else { 0.0 }
            });
            let rhs = nalgebra::DVector::from_fn(k, |a, _| -q[idx[a]]);
            let sol = block.lu().solve(&rhs)?;
            for (a, &i) in idx.iter().enumerate() {
                f[i] = sol[a];
            }
        }
        let f_max = f.iter().fold(0.0f64, |a, v| a.max(v.abs()));
        let violating = (0..size).find(|&i| {
            if active[i] {
                f[i] < -1e-12 * f_max.max(1e-30)
            } else {
                let w: f64 = q[i] + (0..size).map(|j| m[i * size + j] * f[j]).sum::<f64>();
                w < -1e-12 * w_scale
            }
        });
        match violating {
            None => {
                for v in &mut f {
                    *v = v.max(0.0);
                }
                return Some((f, active));
            }
            Some(i) => active[i] = !active[i],
        }
    }
    None
}

/// The moment scale of relative residuals with contact forces: the largest of `|m(0)|`,
/// `L sum |F|` over the dead loads and contact forces, and the moment of a 1 mrad bend.
pub(super) fn moment_scale(
    rod: &Rod,
    law: &dyn MomentLaw,
    loads: &[PointLoad],
    forces: &[f64],
) -> Result<f64, RodError> {
    let (m0, dm0) =
        law.moment(0.0).map_err(|_| RodError::BadInput("the moment law is undefined at zero curvature"))?;
    let load_sum: f64 =
        loads.iter().map(|l| l.force.length()).sum::<f64>() + forces.iter().map(|f| f.abs()).sum::<f64>();
    Ok(m0
        .abs()
        .max(rod.length() * load_sum)
        .max(dm0.abs() * 1e-3 / rod.chamber_length)
        .max(f64::MIN_POSITIVE))
}

/// One SQP step of the rod with dead `loads` and unilateral `gaps` at the angles of
/// `chain`.
///
/// `curvature_forces` (one per gap, N) weight the gaps' second derivatives in the
/// Hessian of the Lagrangian: the forces of the previous step (zeros at the start).
/// `seed` starts the principal pivoting (default: the gaps closed now).
///
/// # Errors
/// [`RodError`] for a point off the rod, mismatched lengths, or a law that cannot be
/// evaluated at `angles` (a curvature outside its range).
pub fn contact_step(
    chain: &Chain<'_>,
    law: &dyn MomentLaw,
    loads: &[PointLoad],
    gaps: &[PointGap],
    curvature_forces: &[f64],
    seed: Option<&[bool]>,
) -> Result<ContactStep, RodError> {
    let block = RodBlock { rod: chain.rod(), law, loads, angles: chain.angles(), nodes: Some(chain.nodes()) };
    let shared: Vec<SharedGap> = gaps.iter().map(|g| SharedGap { parts: vec![(0, *g)] }).collect();
    let s = coupled_step(&[block], &shared, curvature_forces, seed)?;
    let step = s.steps.into_iter().next().ok_or(RodError::BadInput("no rod"))?;
    Ok(ContactStep {
        step,
        forces: s.forces,
        active: s.active,
        residual: s.residual,
        gaps: s.gaps,
        regularised: s.regularised,
    })
}

/// Limits a step from the angles of `chain` so that no angle changes by more than [`MAX_STEP_RAD`] and no node of
/// the rod moves farther than `max_move` (m): the contact geometry is only linearised
/// that far. Returns the factor applied (1 = the whole step).
pub fn limit_step(chain: &Chain<'_>, step: &mut [f64], max_move: f64) -> f64 {
    limit_step_with_nodes(chain, step, max_move).0
}

/// [`limit_step`], and the rod's nodes at the angles plus the limited step when the
/// limit found them (the step is then exactly the trial it accepted), for the next
/// [`Chain`] ([`Chain::with_nodes`]).
pub fn limit_step_with_nodes(chain: &Chain<'_>, step: &mut [f64], max_move: f64) -> (f64, Option<Vec<Vec2>>) {
    let (rod, angles, before) = (chain.rod(), chain.angles(), chain.nodes());
    let big = step.iter().fold(0.0f64, |a, v| a.max(v.abs()));
    let mut alpha = if big > MAX_STEP_RAD { MAX_STEP_RAD / big } else { 1.0 };
    let mut accepted = None;
    for _ in 0..30 {
        let trial: Vec<f64> = angles.iter().zip(step.iter()).map(|(a, d)| a + alpha * d).collect();
        let nodes = rod.nodes(&trial);
        let moved = nodes.iter().zip(before).map(|(a, b)| (*a - *b).length()).fold(0.0, f64::max);
        if moved <= max_move {
            accepted = Some(nodes);
            break;
        }
        // moves are nearly linear in the factor for small steps
        alpha *= (0.9 * max_move / moved).min(0.5);
    }
    for v in step.iter_mut() {
        *v *= alpha;
    }
    (alpha, accepted)
}

/// Iterations of [`solve_with_gaps_sqp`].
pub const SQP_ITERATIONS: usize = 200;

/// Solves the rod with dead `loads` and fixed unilateral `gaps` by iterated
/// [`contact_step`]s from `initial` (default straight), each limited by [`limit_step`]
/// to moves of `max_move` (m). Converged when the residual is below
/// [`RESIDUAL_TOLERANCE`], the step below 1e-10 rad and no gap is closed beyond
/// [`GAP_TOLERANCE`].
///
/// # Errors
/// As [`contact_step`].
pub fn solve_with_gaps_sqp(
    rod: &Rod,
    law: &dyn MomentLaw,
    loads: &[PointLoad],
    gaps: &[PointGap],
    initial: Option<&[f64]>,
    max_move: f64,
) -> Result<ContactSolution, RodError> {
    let mut angles: Vec<f64> = initial.map_or_else(|| vec![0.0; rod.dofs()], <[f64]>::to_vec);
    let mut forces = vec![0.0; gaps.len()];
    let mut seed: Option<Vec<bool>> = None;
    let mut status = SolveStatus::IterationLimit;
    let mut last = None;
    let mut iterations = 0;
    for _ in 0..SQP_ITERATIONS {
        iterations += 1;
        let chain = Chain::new(rod, &angles)?;
        let mut s = contact_step(&chain, law, loads, gaps, &forces, seed.as_deref())?;
        let step_size = s.step.iter().fold(0.0f64, |a, v| a.max(v.abs()));
        let violation = s.gaps.iter().fold(0.0f64, |a, g| a.max(-g));
        if s.residual <= RESIDUAL_TOLERANCE && step_size <= 1e-10 && violation <= GAP_TOLERANCE {
            status = SolveStatus::Converged;
            last = Some(s);
            break;
        }
        limit_step(&chain, &mut s.step, max_move);
        for (a, d) in angles.iter_mut().zip(&s.step) {
            *a += d;
        }
        forces.clone_from(&s.forces);
        seed = Some(s.active.clone());
        last = Some(s);
    }
    let last = last.ok_or(RodError::BadInput("no iteration"))?;
    let gap_values: Vec<f64> = gaps
        .iter()
        .map(|g| rod.position(&angles, g.point).map(|x| g.normal.dot(x) - g.offset))
        .collect::<Result<_, _>>()?;
    let constraint_residual = gap_values
        .iter()
        .zip(&last.forces)
        .map(|(g, f)| if *f > 0.0 { g.abs() } else { (-g).max(0.0) })
        .fold(0.0, f64::max)
        / rod.length();
    let solution = RodSolution {
        nodes: rod.nodes(&angles),
        curvatures: rod.curvatures(&angles),
        multipliers: last.forces.iter().zip(&last.active).filter(|(_, a)| **a).map(|(f, _)| -f).collect(),
        angles,
        report: SolveReport {
            status,
            iterations,
            residual: last.residual,
            constraint_residual,
            load_steps: 1,
        },
    };
    Ok(ContactSolution {
        solution,
        gap_forces: last.forces,
        gaps: gap_values,
        active: last.active,
        rounds: iterations,
    })
}

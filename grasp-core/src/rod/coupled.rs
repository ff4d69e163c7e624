//! One SQP step of several rods that touch each other: the step of
//! [`super::contact_step`] over the stacked angles of all rods.
//!
//! The potential is the sum of the rods' potentials, so its Hessian is block diagonal,
//! one tridiagonal block `H_b` per rod. A gap belongs to one rod (against a rigid
//! obstacle) or to two (rod against rod): `g = sum over its parts (n_p . x_p - c_p)`, one
//! part per rod, and its gradient row has a block for each rod it touches. The
//! complementarity problem in the contact forces is the one of the single rod with
//! `M = sum_b G_b H_b^-1 G_b^T` and `q = g - sum_b G_b H_b^-1 r_b`; the steps are
//! `d_b = -H_b^-1 (r_b - G_b^T f)`. A force between two rods enters both blocks with the
//! signs of its parts, so it acts equally and oppositely on the two (Newton's third law
//! holds by construction where the parts' normals are the in-plane shares of one world
//! normal and its negative).

use super::solve::Placement;
use super::sqp::{Tridiagonal, complementarity, gap_terms, moment_scale};
use super::{GAP_TOLERANCE, MomentLaw, PointGap, PointLoad, Rod, RodError};
use crate::math::Vec2;

/// One rod of a coupled step at its current angles.
#[derive(Clone, Copy)]
pub struct RodBlock<'a> {
    /// The rod.
    pub rod: &'a Rod,
    /// Its section law.
    pub law: &'a dyn MomentLaw,
    /// Its dead loads.
    pub loads: &'a [PointLoad],
    /// Its current element-end angles (rad).
    pub angles: &'a [f64],
    /// Its [`Rod::nodes`] at `angles` when already evaluated ([`super::Chain::nodes`]),
    /// else `None`.
    pub nodes: Option<&'a [Vec2]>,
}

/// A gap over one or more rods: `sum (normal . x(point) - offset)` over `parts`, each
/// part `(rod index, gap term)`.
#[derive(Debug, Clone, PartialEq)]
pub struct SharedGap {
    /// The parts, at most one per rod.
    pub parts: Vec<(usize, PointGap)>,
}

/// One step of the coupled contact problem.
#[derive(Debug, Clone, PartialEq)]
pub struct CoupledStep {
    /// Per rod: the step of its angles (rad).
    pub steps: Vec<Vec<f64>>,
    /// Per gap: the compressive force of the step (N, >= 0).
    pub forces: Vec<f64>,
    /// Per gap: held closed in the step's program.
    pub active: Vec<bool>,
    /// Largest over the rods of the relative equilibrium residual `max |r - G^T f|` over
    /// the rod's moment scale.
    pub residual: f64,
    /// Per gap: its value at the current angles (m).
    pub gaps: Vec<f64>,
    /// Some rod's Hessian needed a shift to be positive definite.
    pub regularised: bool,
}

/// Gradient row of one gap: `(rod, dense row over the rod's angles)` per part.
type Row = Vec<(usize, Vec<f64>)>;

fn dot(a: &[f64], b: &[f64]) -> f64 {
    a.iter().zip(b).map(|(x, z)| x * z).sum::<f64>()
}

/// `sum_b row_b . v_b` over the parts of a row.
fn row_dot(row: &Row, v: &[Vec<f64>]) -> f64 {
    let mut parts = row.iter().map(|(b, r)| dot(r, &v[*b]));
    let first = parts.next().unwrap_or(0.0);
    parts.fold(first, |a, x| a + x)
}

/// `sum_b row_i,b . col_j,b` over the rods both rows touch.
fn rows_dot(row: &Row, col: &Row) -> f64 {
    let mut parts = row.iter().filter_map(|(b, r)| col.iter().find(|(c, _)| c == b).map(|(_, x)| dot(r, x)));
    let first = parts.next().unwrap_or(0.0);
    parts.fold(first, |a, x| a + x)
}

/// One SQP step of the rods `blocks` with the unilateral `gaps`.
///
/// `curvature_forces` (one per gap, N) weight the gaps' second derivatives in the
/// Hessian of the Lagrangian (the previous step's forces); `seed` starts the principal
/// pivoting (default: the gaps closed now). With one rod this is exactly
/// [`super::contact_step`].
///
/// # Errors
/// As [`super::contact_step`]; also a gap part naming a rod that is not in `blocks`.
pub fn coupled_step(
    blocks: &[RodBlock<'_>],
    gaps: &[SharedGap],
    curvature_forces: &[f64],
    seed: Option<&[bool]>,
) -> Result<CoupledStep, RodError> {
    if curvature_forces.len() != gaps.len() || seed.is_some_and(|s| s.len() != gaps.len()) {
        return Err(RodError::BadInput("one curvature force and seed flag per gap"));
    }
    let placements: Vec<Placement<'_>> =
        blocks.iter().map(|b| Placement::new(b.rod, b.angles, b.nodes)).collect::<Result<_, _>>()?;
    let mut tangents = Vec::with_capacity(blocks.len());
    for (b, placed) in blocks.iter().zip(&placements) {
        let t = super::solve::potential_tangent(b.rod, b.law, b.loads, b.angles, 1.0, true, Some(placed))
            .ok_or(RodError::BadInput("the moment law cannot be evaluated at these angles"))?;
        tangents.push(t);
    }
    let mut diagonals: Vec<Vec<f64>> = tangents.iter().map(|t| t.diagonal.clone()).collect();
    let mut uppers: Vec<Vec<f64>> = tangents.iter().map(|t| t.upper.clone()).collect();
    let mut values = Vec::with_capacity(gaps.len());
    let mut rows: Vec<Row> = Vec::with_capacity(gaps.len());
    for (gap, &fc) in gaps.iter().zip(curvature_forces) {
        let mut value: Option<f64> = None;
        let mut row = Vec::with_capacity(gap.parts.len());
        for (b, part) in &gap.parts {
            let placed =
                placements.get(*b).ok_or(RodError::BadInput("a gap part names no rod of the step"))?;
            let (v, r, second) = gap_terms(placed, part)?;
            for (k, l, s) in second {
                if k == l {
                    diagonals[*b][k] -= fc * s;
                } else {
                    uppers[*b][k] -= fc * s;
                }
            }
            value = Some(value.map_or(v, |a| a + v));
            row.push((*b, r));
        }
        values.push(value.ok_or(RodError::BadInput("a gap with no part"))?);
        rows.push(row);
    }
    // each block positive definite, shifted if need be
    let mut factors = Vec::with_capacity(blocks.len());
    let mut regularised = false;
    for (diagonal, upper) in diagonals.iter().zip(&uppers) {
        let stiffness = diagonal.iter().fold(0.0f64, |a, v| a.max(v.abs())).max(f64::MIN_POSITIVE);
        let mut shift = 0.0;
        let factor = loop {
            if let Some(f) = Tridiagonal::factor(diagonal, upper, shift) {
                break f;
            }
            regularised = true;
            shift = if shift == 0.0 { 1e-6 * stiffness } else { 10.0 * shift };
            if shift > 1e6 * stiffness {
                return Err(RodError::BadInput(
                    "the rod's stiffness matrix cannot be made positive definite",
                ));
            }
        };
        factors.push(factor);
    }
    let solve = |b: usize, v: &[f64]| {
        let mut c = v.to_vec();
        factors[b].solve(&mut c);
        c
    };
    // X = H^-1 G^T (per gap, per part), y = H^-1 r
    let columns: Vec<Row> =
        rows.iter().map(|row| row.iter().map(|(b, r)| (*b, solve(*b, r))).collect()).collect();
    let y: Vec<Vec<f64>> = tangents.iter().enumerate().map(|(b, t)| solve(b, &t.gradient)).collect();
    let m = gaps.len();
    let mut mm = vec![0.0; m * m];
    let mut q = vec![0.0; m];
    for i in 0..m {
        q[i] = values[i] - row_dot(&rows[i], &y);
        for j in 0..m {
            mm[i * m + j] = rows_dot(&rows[i], &columns[j]);
        }
    }
    let seed: Vec<bool> = match seed {
        Some(s) => s.to_vec(),
        None => values.iter().map(|&g| g <= GAP_TOLERANCE).collect(),
    };
    let (mut forces, active) = complementarity(&mm, &q, &seed)
        .ok_or(RodError::BadInput("the contact program has no solution (degenerate contacts)"))?;
    // d = -H^-1 (r - G^T f) = -y + X f
    let mut steps: Vec<Vec<f64>> = y.iter().map(|yb| yb.iter().map(|v| -v).collect()).collect();
    for (c, &f) in forces.iter().enumerate() {
        if f != 0.0 {
            for (b, col) in &columns[c] {
                for (d, x) in steps[*b].iter_mut().zip(col) {
                    *d += x * f;
                }
            }
        }
    }
    // with a shifted Hessian the step above only descends; on its active set, the
    // exact Hessian's Newton step converges quadratically where it is a minimum's
    if regularised {
        let gradients: Vec<&[f64]> = tangents.iter().map(|t| t.gradient.as_slice()).collect();
        if let Some((f, d)) = exact_step(&diagonals, &uppers, &gradients, &rows, &values, &active) {
            forces = f;
            steps = d;
        }
    }
    // residual r - G^T f at the current angles, per rod over its own moment scale
    let mut residual = 0.0f64;
    for (b, block) in blocks.iter().enumerate() {
        let mut stationarity = tangents[b].gradient.clone();
        let mut own = Vec::new();
        for (c, &f) in forces.iter().enumerate() {
            for (_, r) in rows[c].iter().filter(|(rb, _)| *rb == b) {
                own.push(f);
                for (s, g) in stationarity.iter_mut().zip(r) {
                    *s -= g * f;
                }
            }
        }
        let scale = moment_scale(block.rod, block.law, block.loads, &own)?;
        residual = residual.max(stationarity.iter().fold(0.0f64, |a, v| a.max(v.abs())) / scale);
    }
    Ok(CoupledStep { steps, forces, active, residual, gaps: values, regularised })
}

/// The Newton step of the program with the gaps of `active` held closed as equalities,
/// with the exact block Hessian (tridiagonal blocks, possibly indefinite): `(f_A, d)`
/// from `S f_A = G_A H^-1 r - g_A`, `S = G_A H^-1 G_A^T`, `d = H^-1 (G_A^T f_A - r)`.
/// Accepted only if it is a minimum's step — `S` has as many negative eigenvalues as `H`
/// (Haynsworth's inertia additivity; the inertia test of Nocedal & Wright, "Numerical
/// Optimization", 2nd ed., 2006, section 16.2) — with compressive forces and no inactive
/// gap crossed; `None` otherwise.
fn exact_step(
    diagonals: &[Vec<f64>],
    uppers: &[Vec<f64>],
    gradients: &[&[f64]],
    rows: &[Row],
    values: &[f64],
    active: &[bool],
) -> Option<(Vec<f64>, Vec<Vec<f64>>)> {
    let mut factors = Vec::with_capacity(diagonals.len());
    for (d, u) in diagonals.iter().zip(uppers) {
        factors.push(Tridiagonal::factor_indefinite(d, u)?);
    }
    let negative: usize = factors.iter().map(|f| f.negative_pivots()).sum();
    let solve = |b: usize, v: &[f64]| {
        let mut c = v.to_vec();
        factors[b].solve(&mut c);
        c
    };
    let idx: Vec<usize> = (0..active.len()).filter(|&i| active[i]).collect();
    let y: Vec<Vec<f64>> = gradients.iter().enumerate().map(|(b, g)| solve(b, g)).collect();
    let cols: Vec<Row> =
        idx.iter().map(|&c| rows[c].iter().map(|(b, r)| (*b, solve(*b, r))).collect()).collect();
    let k = idx.len();
    let mut forces = vec![0.0; values.len()];
    let mut steps: Vec<Vec<f64>> = y.iter().map(|yb| yb.iter().map(|v| -v).collect()).collect();
    if k == 0 {
        if negative > 0 {
            return None;
        }
    } else {
        let s = nalgebra::DMatrix::from_fn(k, k, |a, b| {
            0.5 * (rows_dot(&rows[idx[a]], &cols[b]) + rows_dot(&rows[idx[b]], &cols[a]))
        });
        let negative_s = s.clone().symmetric_eigenvalues().iter().filter(|e| **e < 0.0).count();
        if negative_s != negative {
            return None;
        }
        let rhs = nalgebra::DVector::from_fn(k, |a, _| row_dot(&rows[idx[a]], &y) - values[idx[a]]);
        let f_a = s.lu().solve(&rhs)?;
        let f_max = f_a.iter().fold(0.0f64, |m, v| m.max(v.abs()));
        if f_a.iter().any(|f| !f.is_finite() || *f < -1e-12 * f_max) {
            return None;
        }
        for (a, &c) in idx.iter().enumerate() {
            forces[c] = f_a[a].max(0.0);
            for (b, x) in &cols[a] {
                for (d, v) in steps[*b].iter_mut().zip(x) {
                    *d += v * f_a[a];
                }
            }
        }
    }
    let crossed = (0..values.len())
        .any(|i| !active[i] && values[i] + row_dot(&rows[i], &steps) < -1e-3 * GAP_TOLERANCE);
    (!crossed && steps.iter().flatten().all(|v| v.is_finite())).then_some((forces, steps))
}

//! Newton's method on the rod's equilibrium (KKT) equations.
//!
//! Unknowns: the angles `psi` (`n`) and one multiplier per constraint. Residual:
//! `r_psi = dE/dpsi - Q(psi) + sum_c lambda_c dg_c/dpsi` and `r_c = g_c(psi)`, with
//! `dE/dpsi_k = m_{k-1} - m_k` (element moments), `Q` the generalised forces of the dead
//! loads and `g_c = d_c . x_c - target_c`. The Jacobian is assembled exactly (the law's
//! tangent on the elements, the loads' and constraints' second derivatives through the
//! arc chords) and solved densely by LU. Each Newton step is limited to 0.5 rad and
//! backtracked on the squared scaled residual (Nocedal & Wright, "Numerical
//! Optimization", 2nd ed., 2006, section 11.2). When a load level cannot be reached, the
//! load factor is stepped adaptively (halved on failure, doubled on success, at most 10
//! halvings); the total number of Newton iterations is capped.

use nalgebra::{DMatrix, DVector};

use super::{
    MaterialPoint, MomentLaw, PointConstraint, PointLoad, Rod, RodError, Segment, direction, section_up,
};
use crate::math::Vec2;

/// Relative equilibrium residual required (DESIGN 3.3).
pub const RESIDUAL_TOLERANCE: f64 = 1e-8;
/// Constraint residual required, relative to the rod length.
pub const CONSTRAINT_TOLERANCE: f64 = 1e-11;
const MAX_NEWTON_PER_STEP: usize = 40;
const MAX_TOTAL_ITERATIONS: usize = 2000;
const MAX_STEP_RAD: f64 = 0.5;
const MIN_LOAD_STEP: f64 = 1.0 / 1024.0;

/// How a solve ended.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum SolveStatus {
    /// Equilibrium and constraints within tolerance.
    Converged,
    /// The iteration cap was reached first.
    IterationLimit,
    /// Load stepping could not advance: no step reduced the residual.
    Stalled,
    /// The Newton matrix was singular.
    Singular,
}

impl SolveStatus {
    /// A short name for reports.
    pub fn name(self) -> &'static str {
        match self {
            Self::Converged => "converged",
            Self::IterationLimit => "iteration limit",
            Self::Stalled => "stalled",
            Self::Singular => "singular",
        }
    }
}

/// The convergence record of a solve.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct SolveReport {
    /// How it ended.
    pub status: SolveStatus,
    /// Newton iterations taken, all load steps together.
    pub iterations: usize,
    /// Final equilibrium residual, `max |r_phi|` over the moment scale.
    pub residual: f64,
    /// Final constraint residual over the rod length.
    pub constraint_residual: f64,
    /// Load steps taken.
    pub load_steps: usize,
}

impl SolveReport {
    /// True when converged.
    pub fn converged(&self) -> bool {
        self.status == SolveStatus::Converged
    }
}

/// A solved (or last-tried) rod configuration.
#[derive(Debug, Clone, PartialEq)]
pub struct RodSolution {
    /// Tangent angles `psi_1..psi_n` at the element ends (rad); the cap has `psi_n`.
    pub angles: Vec<f64>,
    /// One multiplier per constraint (N): the constraint pushes with `-lambda * direction`.
    pub multipliers: Vec<f64>,
    /// Clamp, chamber start, element ends and tip end (m), see [`Rod::nodes`].
    pub nodes: Vec<Vec2>,
    /// Element curvatures (1/m), `n` values.
    pub curvatures: Vec<f64>,
    /// Convergence record.
    pub report: SolveReport,
}

/// First and second derivatives of a material point's position with respect to the
/// unknown angles: `first[(k, dx/dpsi_k)]`, `second[(k, l, d2x/dpsi_k dpsi_l)]`
/// (dof `k` is `psi_{k+1}`).
#[derive(Debug, Default)]
pub(crate) struct PointDerivatives {
    pub first: Vec<(usize, Vec2)>,
    pub second: Vec<(usize, usize, Vec2)>,
}

impl PointDerivatives {
    fn with_capacity(first: usize, second: usize) -> Self {
        Self { first: Vec::with_capacity(first), second: Vec::with_capacity(second) }
    }

    /// Adds the terms of a sub-arc of length `a` (fraction `f = a/h` of element `j`) from
    /// angle `A = psi_j` to `A + f (B - A)`, `B = psi_{j+1}`, with an offset `y` along the
    /// section's up direction at its end.
    ///
    /// With `u = f (B - A)/2`, `v = A + u`, `w = A + 2u`: `D = a sinc(u) d(v)`,
    /// `O = y e(w)`; the derivatives follow by the chain rule, `u, v, w` being linear in
    /// `(A, B)`.
    fn add_arc(&mut self, j: usize, a: f64, f: f64, angle_a: f64, angle_b: f64, y: f64) {
        let u = 0.5 * f * (angle_b - angle_a);
        let v = angle_a + u;
        let w = angle_a + 2.0 * u;
        let (s0, s1, s2) = sinc_derivatives(u);
        let (dv, nv) = (direction(v), normal(v));
        let d_u = a * s1 * dv;
        let d_v = a * s0 * nv;
        let d_uu = a * s2 * dv;
        let d_uv = a * s1 * nv;
        let d_vv = -a * s0 * dv;
        // the offset along the section's up direction (none for a chord of the layer)
        let (o_w, o_ww) =
            if y == 0.0 { (Vec2::ZERO, Vec2::ZERO) } else { (y * direction(w), -y * section_up(w)) };
        // partials of (u, v, w) with respect to (A, B)
        let du = [-0.5 * f, 0.5 * f];
        let dvv = [1.0 - 0.5 * f, 0.5 * f];
        let dw = [1.0 - f, f];
        // dof of A is j - 1 (none for j = 0: psi_0 is clamped), of B is j
        let dofs = [j.checked_sub(1), Some(j)];
        for x in 0..2 {
            let Some(kx) = dofs[x] else { continue };
            self.first.push((kx, d_u * du[x] + d_v * dvv[x] + o_w * dw[x]));
            for yy in 0..2 {
                let Some(ky) = dofs[yy] else { continue };
                let second = d_uu * (du[x] * du[yy])
                    + d_uv * (du[x] * dvv[yy] + dvv[x] * du[yy])
                    + d_vv * (dvv[x] * dvv[yy])
                    + o_ww * (dw[x] * dw[yy]);
                self.second.push((kx, ky, second));
            }
        }
    }
}

/// `(S, S', S'')` of `S(u) = sin u / u`, by series near 0.
fn sinc_derivatives(u: f64) -> (f64, f64, f64) {
    if u.abs() < 1e-3 {
        let u2 = u * u;
        (1.0 - u2 / 6.0 + u2 * u2 / 120.0, -u / 3.0 + u * u2 / 30.0, -1.0 / 3.0 + u2 / 10.0)
    } else {
        let (sn, cs) = u.sin_cos();
        (sn / u, (u * cs - sn) / (u * u), (-u * u * sn - 2.0 * u * cs + 2.0 * sn) / (u * u * u))
    }
}

pub(crate) fn point_derivatives(
    rod: &Rod,
    angles: &[f64],
    p: MaterialPoint,
) -> Result<PointDerivatives, RodError> {
    let h = rod.element_length();
    let mut out = PointDerivatives::default();
    let angle = |j: usize| if j == 0 { 0.0 } else { angles[j - 1] };
    let full_elements = |out: &mut PointDerivatives, upto: usize| {
        for j in 0..upto {
            out.add_arc(j, h, 1.0, angle(j), angle(j + 1), 0.0);
        }
    };
    match rod.segment(p.s)? {
        Segment::Base => {}
        Segment::Element(i, a) => {
            full_elements(&mut out, i);
            out.add_arc(i, a, a / h, angle(i), angle(i + 1), p.y);
        }
        Segment::Cap(a) => {
            let n = rod.elements;
            full_elements(&mut out, n);
            let psi = angles[n - 1];
            // x = x_n + a d(psi) + y e(psi)
            out.first.push((n - 1, a * normal(psi) + p.y * direction(psi)));
            out.second.push((n - 1, n - 1, -a * direction(psi) - p.y * section_up(psi)));
        }
    }
    Ok(out)
}

/// A rod at fixed angles with its chain of element chords evaluated once: the element
/// ends and each full chord's derivative terms. Positions of material points then cost
/// O(1) and their derivatives O(i) additions with no trigonometry, where
/// [`Rod::position`] and [`point_derivatives`] walk the chain again for every point. The
/// values are the same floating-point numbers (the same terms, summed in the same
/// order).
pub(crate) struct Placement<'a> {
    rod: &'a Rod,
    angles: &'a [f64],
    /// The start of element `j` (`j = 0..n`; `j = n` is the cap's start) (m).
    starts: Vec<Vec2>,
    /// The derivative terms of the full chords, one after the other: chord `j`'s are
    /// `first[first_end(j - 1)..first_end(j)]` and likewise for `second`.
    chords: PointDerivatives,
}

/// The derivative terms (first, second) of one chord, borrowed.
type ChordTerms<'t> = (&'t [(usize, Vec2)], &'t [(usize, usize, Vec2)]);

/// The number of first-derivative terms of full chords `0..=j` (chord 0 has one, the
/// clamped angle having no dof; every later chord two).
fn first_end(j: usize) -> usize {
    2 * j + 1
}

/// The number of second-derivative terms of full chords `0..=j` (one, then four each).
fn second_end(j: usize) -> usize {
    4 * j + 1
}

impl<'a> Placement<'a> {
    /// The placement of `rod` at `angles` (one per dof), with the rod's [`Rod::nodes`]
    /// at these angles when already evaluated (the element starts are nodes `1..=n + 1`).
    pub(crate) fn new(rod: &'a Rod, angles: &'a [f64], nodes: Option<&[Vec2]>) -> Result<Self, RodError> {
        let n = rod.elements;
        if angles.len() != rod.dofs() {
            return Err(RodError::BadInitialGuess { got: angles.len(), expected: rod.dofs() });
        }
        if nodes.is_some_and(|v| v.len() != n + 3) {
            return Err(RodError::BadInput("the rod's nodes do not match its elements"));
        }
        let h = rod.element_length();
        let mut chords = PointDerivatives::with_capacity(first_end(n), second_end(n));
        let mut prev = 0.0;
        for (j, &psi) in angles.iter().enumerate() {
            chords.add_arc(j, h, 1.0, prev, psi, 0.0);
            prev = psi;
        }
        let starts = match nodes {
            Some(v) => v[1..=n + 1].to_vec(),
            None => rod.nodes(angles)[1..=n + 1].to_vec(),
        };
        Ok(Self { rod, angles, starts, chords })
    }

    /// The derivative terms (first, second) of full chord `j`.
    fn chord(&self, j: usize) -> Option<ChordTerms<'_>> {
        let (f0, s0) = if j == 0 { (0, 0) } else { (first_end(j - 1), second_end(j - 1)) };
        Some((self.chords.first.get(f0..first_end(j))?, self.chords.second.get(s0..second_end(j))?))
    }

    /// The rod's angles.
    pub(crate) fn angles(&self) -> &'a [f64] {
        self.angles
    }

    /// Position of a material point (m); equals [`Rod::position`].
    pub(crate) fn position(&self, p: MaterialPoint) -> Result<Vec2, RodError> {
        self.rod.position_from(self.angles, p, |i| self.starts[i])
    }

    /// Derivatives of a material point's position; equals [`point_derivatives`].
    pub(crate) fn derivatives(&self, p: MaterialPoint) -> Result<PointDerivatives, RodError> {
        let rod = self.rod;
        let h = rod.element_length();
        let angle = |j: usize| if j == 0 { 0.0 } else { self.angles[j - 1] };
        let upto = |i: usize| {
            let (f, s) = if i == 0 { (0, 0) } else { (first_end(i - 1), second_end(i - 1)) };
            let mut out = PointDerivatives::with_capacity(f + 2, s + 4);
            out.first.extend_from_slice(&self.chords.first[..f]);
            out.second.extend_from_slice(&self.chords.second[..s]);
            out
        };
        Ok(match rod.segment(p.s)? {
            Segment::Base => PointDerivatives::default(),
            Segment::Element(i, a) => {
                let mut out = upto(i);
                out.add_arc(i, a, a / h, angle(i), angle(i + 1), p.y);
                out
            }
            Segment::Cap(a) => {
                let n = rod.elements;
                let mut out = upto(n);
                let psi = self.angles[n - 1];
                out.first.push((n - 1, a * normal(psi) + p.y * direction(psi)));
                out.second.push((n - 1, n - 1, -a * direction(psi) - p.y * section_up(psi)));
                out
            }
        })
    }
}

/// `d direction / d phi = (cos phi, -sin phi)`.
fn normal(phi: f64) -> Vec2 {
    Vec2::new(phi.cos(), -phi.sin())
}

/// Gradient and tridiagonal Hessian of the rod's potential
/// `Pi(psi) = sum_i h Psi(kappa_i) - t sum_j F_j . x_j(psi)` (`Psi' = m`, dead loads
/// scaled by `t`). Every term couples at most the two angles of one element (a load's
/// position is a chain of chords, each a function of its own element's two angles), so
/// the Hessian is tridiagonal: `diagonal[k] = d2 Pi / d psi_k^2`, `upper[k] = d2 Pi / d
/// psi_k d psi_{k+1}`.
pub(crate) struct Tangent {
    pub gradient: Vec<f64>,
    pub diagonal: Vec<f64>,
    pub upper: Vec<f64>,
}

/// [`Tangent`] at `angles`; `None` when the law cannot be evaluated there (or a load is
/// off the rod). With `with_hessian` false the Hessian is left zero. `placed`, the rod's
/// placement at these angles when the caller has it, saves differentiating the chords
/// again (the same numbers).
pub(crate) fn potential_tangent(
    rod: &Rod,
    law: &dyn MomentLaw,
    loads: &[PointLoad],
    angles: &[f64],
    t: f64,
    with_hessian: bool,
    placed: Option<&Placement<'_>>,
) -> Option<Tangent> {
    let nd = rod.dofs();
    let n = rod.elements;
    let h = rod.element_length();
    let mut out =
        Tangent { gradient: vec![0.0; nd], diagonal: vec![0.0; nd], upper: vec![0.0; nd.max(1) - 1] };
    // element j couples psi_j (dof j-1, or the clamp) and psi_{j+1} (dof j):
    // d(h Psi)/d psi_{j+1} = m_j, d(h Psi)/d psi_j = -m_j
    for (j, &kappa) in rod.curvatures(angles).iter().enumerate() {
        let (m, dm) = law.moment(kappa).ok()?;
        out.gradient[j] += m;
        if j > 0 {
            out.gradient[j - 1] -= m;
        }
        if with_hessian {
            let k = dm / h;
            out.diagonal[j] += k;
            if j > 0 {
                out.diagonal[j - 1] += k;
                out.upper[j - 1] -= k;
            }
        }
    }
    // Dead loads. A load's position is the chain of full element chords before it plus
    // its own partial arc, so the chords' terms are shared: each full chord j is
    // differentiated once and weighted by the sum of the loads beyond it (O(n) in all
    // instead of O(n) per load).
    let angle = |j: usize| if j == 0 { 0.0 } else { angles[j - 1] };
    let apply = |(first, second): ChordTerms<'_>, f: Vec2, out: &mut Tangent| {
        for &(k, d1) in first {
            out.gradient[k] -= f.dot(d1);
        }
        if with_hessian {
            for &(k, l, d2) in second {
                if k == l {
                    out.diagonal[k] -= f.dot(d2);
                } else if l == k + 1 {
                    out.upper[k] -= f.dot(d2);
                }
            }
        }
    };
    // on[j]: loads whose own arc is on element j (j < n), or on the cap (j = n)
    let mut on = vec![Vec2::ZERO; n + 1];
    let mut scratch = PointDerivatives::default();
    for load in loads {
        let f = t * load.force;
        scratch.first.clear();
        scratch.second.clear();
        match rod.segment(load.point.s).ok()? {
            Segment::Base => continue,
            Segment::Element(i, a) => {
                on[i] += f;
                scratch.add_arc(i, a, a / h, angle(i), angle(i + 1), load.point.y);
            }
            Segment::Cap(a) => {
                on[n] += f;
                let psi = angles[n - 1];
                scratch.first.push((n - 1, a * normal(psi) + load.point.y * direction(psi)));
                scratch.second.push((n - 1, n - 1, -a * direction(psi) - load.point.y * section_up(psi)));
            }
        }
        apply((&scratch.first, &scratch.second), f, &mut out);
    }
    let mut beyond = Vec2::ZERO;
    for j in (0..n).rev() {
        beyond += on[j + 1];
        if beyond != Vec2::ZERO {
            match placed.and_then(|p| p.chord(j)) {
                Some(chord) => apply(chord, beyond, &mut out),
                None => {
                    scratch.first.clear();
                    scratch.second.clear();
                    scratch.add_arc(j, h, 1.0, angle(j), angle(j + 1), 0.0);
                    apply((&scratch.first, &scratch.second), beyond, &mut out);
                }
            }
        }
    }
    Some(out)
}

struct Problem<'a> {
    rod: &'a Rod,
    law: &'a dyn MomentLaw,
    loads: &'a [PointLoad],
    constraints: &'a [PointConstraint],
    moment_scale: f64,
}

struct Evaluation {
    residual: DVector<f64>,
    jacobian: Option<DMatrix<f64>>,
    eq_norm: f64,
    con_norm: f64,
}

impl Problem<'_> {
    fn dofs(&self) -> usize {
        self.rod.dofs()
    }

    /// Residual (and Jacobian if asked) at `z = [angles, multipliers]`, loads scaled by `t`.
    fn evaluate(&self, z: &DVector<f64>, t: f64, with_jacobian: bool) -> Option<Evaluation> {
        let nd = self.dofs();
        let nc = self.constraints.len();
        let angles = &z.as_slice()[..nd];
        let lambda = &z.as_slice()[nd..];
        let mut r = DVector::zeros(nd + nc);
        let mut jac = with_jacobian.then(|| DMatrix::zeros(nd + nc, nd + nc));
        let tangent = potential_tangent(self.rod, self.law, self.loads, angles, t, with_jacobian, None)?;
        for (k, g) in tangent.gradient.iter().enumerate() {
            r[k] = *g;
        }
        if let Some(jm) = jac.as_mut() {
            for k in 0..nd {
                jm[(k, k)] += tangent.diagonal[k];
                if k + 1 < nd {
                    jm[(k, k + 1)] += tangent.upper[k];
                    jm[(k + 1, k)] += tangent.upper[k];
                }
            }
        }
        for (c, con) in self.constraints.iter().enumerate() {
            let x = self.rod.position(angles, con.point).ok()?;
            r[nd + c] = con.direction.dot(x) - con.target;
            let d = point_derivatives(self.rod, angles, con.point).ok()?;
            for (k, d1) in d.first {
                let g1 = con.direction.dot(d1);
                r[k] += lambda[c] * g1;
                if let Some(jm) = jac.as_mut() {
                    jm[(k, nd + c)] += g1;
                    jm[(nd + c, k)] += g1;
                }
            }
            if let Some(jm) = jac.as_mut() {
                for (k, l, d2) in d.second {
                    jm[(k, l)] += lambda[c] * con.direction.dot(d2);
                }
            }
        }
        let eq_norm = r.rows(0, nd).amax() / self.moment_scale;
        let con_norm = if nc > 0 { r.rows(nd, nc).amax() / self.rod.length() } else { 0.0 };
        Some(Evaluation { residual: r, jacobian: jac, eq_norm, con_norm })
    }

    fn merit(&self, e: &Evaluation) -> f64 {
        let nd = self.dofs();
        let l = self.rod.length();
        let mut s = 0.0;
        for (i, v) in e.residual.iter().enumerate() {
            let scaled = if i < nd { v / self.moment_scale } else { v / l };
            s += scaled * scaled;
        }
        s
    }

    fn converged(&self, e: &Evaluation) -> bool {
        e.eq_norm <= RESIDUAL_TOLERANCE && e.con_norm <= CONSTRAINT_TOLERANCE
    }

    /// Newton at load factor `t` from `z`; returns the iterations used and whether it
    /// converged (z updated in place to the last accepted iterate).
    fn newton(&self, z: &mut DVector<f64>, t: f64, budget: usize) -> (usize, Result<(), SolveStatus>) {
        let nd = self.dofs();
        let Some(mut e) = self.evaluate(z, t, true) else { return (0, Err(SolveStatus::Stalled)) };
        for it in 0..budget.min(MAX_NEWTON_PER_STEP) {
            if self.converged(&e) {
                return (it, Ok(()));
            }
            let Some(jm) = e.jacobian.take() else { return (it, Err(SolveStatus::Singular)) };
            let Some(mut dz) = kkt_solve(jm, &e.residual, nd) else {
                return (it + 1, Err(SolveStatus::Singular));
            };
            let big = dz.rows(0, nd).amax();
            if !big.is_finite() {
                return (it + 1, Err(SolveStatus::Singular));
            }
            if big > MAX_STEP_RAD {
                dz *= MAX_STEP_RAD / big;
            }
            let m0 = self.merit(&e);
            let mut alpha = 1.0;
            let mut accepted = None;
            while alpha >= 1.0 / 1024.0 {
                let trial = &*z + alpha * &dz;
                if let Some(et) = self.evaluate(&trial, t, true)
                    && self.merit(&et) < (1.0 - 1e-4 * alpha) * m0
                {
                    accepted = Some((trial, et));
                    break;
                }
                alpha *= 0.5;
            }
            match accepted {
                Some((trial, et)) => {
                    *z = trial;
                    e = et;
                }
                None => return (it + 1, Err(SolveStatus::Stalled)),
            }
        }
        if self.converged(&e) {
            (budget.min(MAX_NEWTON_PER_STEP), Ok(()))
        } else {
            (budget.min(MAX_NEWTON_PER_STEP), Err(SolveStatus::IterationLimit))
        }
    }
}

/// Solves the Newton system `J dz = -r`. When constraints are linearly dependent (two
/// gaps on the same material point, say) the KKT matrix is singular although the step is
/// well defined; the retry adds a tiny negative diagonal to the multiplier block, which
/// picks the least-norm multipliers (a standard regularisation of degenerate KKT systems;
/// Nocedal & Wright 2006, section 16.2).
fn kkt_solve(jm: DMatrix<f64>, residual: &DVector<f64>, nd: usize) -> Option<DVector<f64>> {
    let rhs = -residual;
    if let Some(dz) = jm.clone().lu().solve(&rhs)
        && dz.iter().all(|v| v.is_finite())
    {
        return Some(dz);
    }
    let n = jm.nrows();
    if n == nd {
        return None;
    }
    let scale = (0..nd).map(|i| jm[(i, i)].abs()).fold(0.0, f64::max).max(f64::MIN_POSITIVE);
    let mut reg = jm;
    for i in nd..n {
        reg[(i, i)] -= 1e-12 * scale;
    }
    reg.lu().solve(&rhs).filter(|dz| dz.iter().all(|v| v.is_finite()))
}

/// Solves the rod's equilibrium under dead point loads and point constraints.
///
/// `initial` gives starting angles (`rod.dofs()` values; default straight). The
/// moment scale of the relative residual is the largest of `|m(0)|`, `L sum |F_i|`, and
/// the moment of a 1 mrad bend over the chamber, `m'(0) 1e-3 / L`.
///
/// # Errors
/// [`RodError`] for non-finite loads, points off the rod, a wrong initial guess, or a
/// law that cannot be evaluated on the straight rod. Non-convergence is not an error: see
/// the solution's [`SolveReport`].
pub fn solve(
    rod: &Rod,
    law: &dyn MomentLaw,
    loads: &[PointLoad],
    constraints: &[PointConstraint],
    initial: Option<&[f64]>,
) -> Result<RodSolution, RodError> {
    solve_within(rod, law, loads, constraints, initial, MAX_TOTAL_ITERATIONS)
}

/// [`solve`] with at most `max_iterations` Newton iterations in all (capped at the
/// default budget of [`solve`]): for callers that retry a failed solve another way (a
/// smaller pressure step, another active set), so that a hopeless attempt costs little.
///
/// # Errors
/// As [`solve`].
pub fn solve_within(
    rod: &Rod,
    law: &dyn MomentLaw,
    loads: &[PointLoad],
    constraints: &[PointConstraint],
    initial: Option<&[f64]>,
    max_iterations: usize,
) -> Result<RodSolution, RodError> {
    let budget = max_iterations.min(MAX_TOTAL_ITERATIONS);
    let nd = rod.dofs();
    for l in loads {
        if !(l.force.is_finite() && l.point.y.is_finite()) {
            return Err(RodError::BadInput("load not finite"));
        }
        rod.segment(l.point.s)?;
    }
    for c in constraints {
        if !(c.direction.is_finite() && c.target.is_finite() && (c.direction.length() - 1.0).abs() < 1e-9) {
            return Err(RodError::BadInput("constraint direction must be a finite unit vector"));
        }
        rod.segment(c.point.s)?;
    }
    let mut z = DVector::zeros(nd + constraints.len());
    if let Some(init) = initial {
        if init.len() != nd {
            return Err(RodError::BadInitialGuess { got: init.len(), expected: nd });
        }
        if init.iter().any(|v| !v.is_finite()) {
            return Err(RodError::BadInput("initial angles not finite"));
        }
        z.rows_mut(0, nd).copy_from_slice(init);
    }
    let (m0, dm0) =
        law.moment(0.0).map_err(|_| RodError::BadInput("the moment law is undefined at zero curvature"))?;
    let force_sum: f64 = loads.iter().map(|l| l.force.length()).sum();
    let moment_scale = m0
        .abs()
        .max(rod.length() * force_sum)
        .max(dm0.abs() * 1e-3 / rod.chamber_length)
        .max(f64::MIN_POSITIVE);
    let problem = Problem { rod, law, loads, constraints, moment_scale };

    let mut t_done: f64 = 0.0;
    let mut dt: f64 = 1.0;
    let mut iterations = 0;
    let mut steps = 0;
    let mut status = SolveStatus::Converged;
    while t_done < 1.0 {
        let t = (t_done + dt).min(1.0);
        let mut trial = z.clone();
        let (used, result) = problem.newton(&mut trial, t, budget - iterations);
        iterations += used;
        match result {
            Ok(()) => {
                z = trial;
                t_done = t;
                steps += 1;
                dt = (2.0 * dt).min(1.0);
            }
            Err(s) => {
                status = s;
                dt *= 0.5;
                if dt < MIN_LOAD_STEP || loads.is_empty() {
                    break;
                }
            }
        }
        if iterations >= budget {
            status = SolveStatus::IterationLimit;
            break;
        }
    }
    if t_done >= 1.0 {
        status = SolveStatus::Converged;
    }
    // final report at full load (or the last accepted state if not reached)
    let e = problem.evaluate(&z, 1.0, false);
    let (residual, constraint_residual) =
        e.as_ref().map_or((f64::INFINITY, f64::INFINITY), |e| (e.eq_norm, e.con_norm));
    if status == SolveStatus::Converged && !e.as_ref().is_some_and(|e| problem.converged(e)) {
        status = SolveStatus::Stalled;
    }
    let angles: Vec<f64> = z.as_slice()[..nd].to_vec();
    Ok(RodSolution {
        nodes: rod.nodes(&angles),
        curvatures: rod.curvatures(&angles),
        multipliers: z.as_slice()[nd..].to_vec(),
        angles,
        report: SolveReport { status, iterations, residual, constraint_residual, load_steps: steps },
    })
}

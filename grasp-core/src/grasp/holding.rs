//! Holding margins: the largest multiple of a load that the contacts can balance
//! (DESIGN 3.4, stage 2).
//!
//! # Formulation
//! Contacts `i = 1..n` at points `p_i` with unit normals `n_i` pointing into the object,
//! tangents `t1_i, t2_i`, friction `mu_i` and closing-stage normal forces `N_i`
//! ([`GraspContact`]). A load case is a wrench per unit scale acting on the object: a
//! force `F` (N) and a torque `T` (N m) about the object's centre of mass `c`. The
//! holding margin is the optimum of the second-order cone program
//!
//! ```text
//! maximise    s
//! over        s, and per contact (f_n_i, a_i, b_i)
//! subject to  sum_i f_i + s F = 0                       (force balance)
//!             sum_i (p_i - c) x f_i + s T = 0           (torque balance about c)
//!             f_i = f_n_i n_i + a_i t1_i + b_i t2_i
//!             sqrt(a_i^2 + b_i^2) <= mu_i f_n_i         (Coulomb cone)
//!             0 <= f_n_i <= N_i
//! ```
//!
//! `f_i` is the force the finger applies to the object. `s = 0` with all forces zero is
//! always feasible, so the optimum is `>= 0`; with a non-zero load it is finite, because
//! every contact force is bounded (`|f_i| <= N_i sqrt(1 + mu_i^2)`). The grasp holds the
//! load case with margin `s`: it passes at `s >= safety_factor`.
//!
//! # Solution
//! Solved with the interior-point conic solver clarabel (Goulart & Chen, "Clarabel: An
//! interior-point solver for conic programs with quadratic objectives", arXiv,
//! 2024), in its form
//! `minimise q'x s.t. A x + z = b, z in K` with `K` = zero cone (6 balance rows) x
//! non-negative cone (normal-force bounds) x one `SecondOrderConeT(3)` per contact with
//! friction, on `z = (mu f_n, a, b)`. Before the solve the problem is made dimensionless:
//! forces are divided by `max_i N_i`, lever arms by the largest contact distance from `c`,
//! and the load wrench by its norm, so that every coefficient is of order one whatever
//! the object's size and weight; the answer is scaled back exactly. Contacts without
//! friction carry only a normal force (no cone), and contacts with `N_i = 0` carry
//! nothing and are left out of the program. The solver is bounded by an iteration cap
//! ([`HoldingSettings`]); it has no clock limit, so the same input gives bit-identical
//! output.
//!
//! Load cases for the scene's criteria come from [`load_cases`] (lift and 8 lateral
//! directions); [`holding_margins`] evaluates a list of them.

use clarabel::algebra::CscMatrix;
use clarabel::solver::{
    DefaultSettings, DefaultSolver, IPSolver, NonnegativeConeT, SecondOrderConeT,
    SolverStatus as ClarabelStatus, SupportedConeT, ZeroConeT,
};

use super::contact::{ContactError, GraspContact, validate_contacts};
use crate::math::Vec3;

/// Standard acceleration of gravity (m/s²), acting along `-z` of the gripper frame.
pub const STANDARD_GRAVITY: f64 = 9.80665;

/// The largest load scale ever reported.
///
/// A load so small against the contact forces that it could be multiplied by more than
/// this (or no load at all) is reported as held with exactly this margin, with status
/// [`HoldingStatus::Capped`] or [`HoldingStatus::NoLoad`]: no real criterion asks for a
/// safety factor anywhere near it, and it keeps the output finite.
pub const MAX_LOAD_SCALE: f64 = 1e6;

/// A margin below `-NEGATIVE_SCALE_TOLERANCE` (in the dimensionless problem) cannot be
/// interior-point round-off around the true optimum `>= 0`; it is reported as a numerical
/// failure. Values in `[-tol, 0)` are reported as 0.
const NEGATIVE_SCALE_TOLERANCE: f64 = 1e-6;

/// What kind of motion a [`LoadCase`] stands for.
#[derive(Debug, Clone, Copy, PartialEq)]
#[non_exhaustive]
pub enum LoadKind {
    /// Gravity plus an upward acceleration of the gripper.
    Lift,
    /// Gravity plus a horizontal acceleration of the gripper.
    Lateral {
        /// Direction of the gripper's acceleration, rad from `+x` about `+z`. The
        /// inertial load on the object points the opposite way.
        direction: f64,
    },
    /// Any other wrench, built with [`LoadCase::new`].
    Other,
}

/// A load on the held object per unit load scale.
///
/// # Coordinate systems / sign convention
/// Gripper frame (`+z` up, gravity along `-z`). `force` (N) and `torque` (N m, about the
/// object's centre of mass) are what the environment and the object's inertia apply to
/// the object; the contact forces must cancel `s` times them. For a gripper accelerating
/// at `a` (m/s²) with an object of mass `m` held still relative to it, the load is the
/// weight plus the d'Alembert force: `force = m (g - a)`, `g = (0, 0, -9.80665)`, and
/// `torque = 0` (both act at the centre of mass).
#[derive(Debug, Clone, PartialEq)]
pub struct LoadCase {
    /// A short name for reports, e.g. `"lift"` or `"lateral-045deg"`.
    pub name: String,
    /// What motion it stands for.
    pub kind: LoadKind,
    /// Force on the object per unit scale (N).
    pub force: Vec3,
    /// Torque on the object about its centre of mass per unit scale (N m).
    pub torque: Vec3,
}

impl LoadCase {
    /// A custom load case (kind [`LoadKind::Other`]).
    ///
    /// # Errors
    /// [`HoldingError::InvalidLoad`] when a component is not finite.
    pub fn new(name: impl Into<String>, force: Vec3, torque: Vec3) -> Result<Self, HoldingError> {
        let name = name.into();
        if !(force.is_finite() && torque.is_finite()) {
            return Err(HoldingError::InvalidLoad { name });
        }
        Ok(Self { name, kind: LoadKind::Other, force, torque })
    }
}

/// The scene's load cases for an object of `mass` (kg): `"lift"` (gravity plus an upward
/// acceleration `lift_accel`, m/s²) and eight lateral cases (gravity plus a horizontal
/// acceleration `lateral_accel`, m/s², toward 0°, 45°, ..., 315° from `+x` about `+z`),
/// named `"lateral-000deg"` ... `"lateral-315deg"`, in that order.
///
/// Lift: `force = (0, 0, -m (g + a_lift))`. Lateral at angle `theta`:
/// `force = (-m a cos(theta), -m a sin(theta), -m g)`. All torques are zero.
///
/// # Errors
/// [`HoldingError::InvalidMass`] unless `mass` is finite and `> 0`;
/// [`HoldingError::InvalidAcceleration`] unless both accelerations are finite and `>= 0`.
pub fn load_cases(mass: f64, lift_accel: f64, lateral_accel: f64) -> Result<Vec<LoadCase>, HoldingError> {
    if !(mass > 0.0 && mass.is_finite()) {
        return Err(HoldingError::InvalidMass { value: mass });
    }
    for (what, value) in [("lift", lift_accel), ("lateral", lateral_accel)] {
        if !(value >= 0.0 && value.is_finite()) {
            return Err(HoldingError::InvalidAcceleration { what, value });
        }
    }
    let g = STANDARD_GRAVITY;
    let mut cases = Vec::with_capacity(9);
    cases.push(LoadCase {
        name: "lift".to_owned(),
        kind: LoadKind::Lift,
        force: Vec3::new(0.0, 0.0, -mass * (g + lift_accel)),
        torque: Vec3::ZERO,
    });
    for k in 0..8u32 {
        let degrees = 45 * k;
        let direction = f64::from(degrees).to_radians();
        let (sin, cos) = direction.sin_cos();
        cases.push(LoadCase {
            name: format!("lateral-{degrees:03}deg"),
            kind: LoadKind::Lateral { direction },
            force: Vec3::new(-mass * lateral_accel * cos, -mass * lateral_accel * sin, -mass * g),
            torque: Vec3::ZERO,
        });
    }
    Ok(cases)
}

/// Solver knobs for the holding program.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct HoldingSettings {
    max_iterations: u32,
    tolerance: f64,
}

impl Default for HoldingSettings {
    /// At most 100 interior-point iterations (the solves in the tests take 6–13), and a relative
    /// gap and feasibility tolerance of `1e-9`.
    fn default() -> Self {
        Self { max_iterations: 100, tolerance: 1e-9 }
    }
}

impl HoldingSettings {
    /// Sets the iteration cap.
    ///
    /// # Errors
    /// [`HoldingError::InvalidSettings`] for 0.
    pub fn with_max_iterations(mut self, max_iterations: u32) -> Result<Self, HoldingError> {
        if max_iterations == 0 {
            return Err(HoldingError::InvalidSettings { reason: "max_iterations must be >= 1" });
        }
        self.max_iterations = max_iterations;
        Ok(self)
    }

    /// Sets the solver's relative gap and feasibility tolerance.
    ///
    /// # Errors
    /// [`HoldingError::InvalidSettings`] unless `1e-14 <= tolerance <= 1e-3`.
    pub fn with_tolerance(mut self, tolerance: f64) -> Result<Self, HoldingError> {
        if !((1e-14..=1e-3).contains(&tolerance)) {
            return Err(HoldingError::InvalidSettings { reason: "tolerance must be in [1e-14, 1e-3]" });
        }
        self.tolerance = tolerance;
        Ok(self)
    }

    /// The iteration cap.
    pub fn max_iterations(&self) -> u32 {
        self.max_iterations
    }

    /// The solver tolerance.
    pub fn tolerance(&self) -> f64 {
        self.tolerance
    }
}

/// Why the conic solver did not deliver a margin.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
#[non_exhaustive]
pub enum SolverFailure {
    /// The iteration cap was reached.
    MaxIterations,
    /// The solver stopped on a numerical error or made no progress.
    Numerical,
    /// The solver claimed infeasibility or unboundedness, which this program cannot have
    /// (a sign of badly scaled data).
    Inconsistent,
    /// The solver refused the problem data (an internal error).
    Setup,
}

/// How a holding solve ended.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
#[non_exhaustive]
pub enum HoldingStatus {
    /// Solved to the tolerance; `scale` is the margin.
    Solved,
    /// The solver stopped at reduced accuracy (clarabel's "almost solved"); `scale` is its
    /// estimate. Treat it as a warning.
    ReducedAccuracy,
    /// No contact carries a positive normal force (none given, or every `N_i = 0`):
    /// nothing can hold, `scale = 0`.
    NoContacts,
    /// The load case is exactly zero: any scale is held; `scale = MAX_LOAD_SCALE`.
    NoLoad,
    /// The load is so small that the margin reached [`MAX_LOAD_SCALE`]; `scale` is that cap.
    Capped,
    /// The solver did not deliver a margin; `scale = 0` (cannot certify holding).
    SolverFailed(SolverFailure),
}

impl HoldingStatus {
    /// A short name for reports.
    pub fn name(self) -> &'static str {
        match self {
            Self::Solved => "solved",
            Self::ReducedAccuracy => "reduced accuracy",
            Self::NoContacts => "no contacts",
            Self::NoLoad => "no load",
            Self::Capped => "capped",
            Self::SolverFailed(SolverFailure::MaxIterations) => "iteration limit",
            Self::SolverFailed(SolverFailure::Numerical) => "numerical failure",
            Self::SolverFailed(SolverFailure::Inconsistent) => "inconsistent solver status",
            Self::SolverFailed(SolverFailure::Setup) => "solver setup failed",
        }
    }

    /// True when `scale` is a computed answer (everything except a solver failure).
    pub fn is_answer(self) -> bool {
        !matches!(self, Self::SolverFailed(_))
    }
}

/// The holding margin of one load case.
#[derive(Debug, Clone, PartialEq)]
pub struct HoldingResult {
    /// The margin `s` (dimensionless, `0 <= s <= MAX_LOAD_SCALE`): the contacts balance `s`
    /// times the load case. 0 when the status is a failure.
    pub scale: f64,
    /// How the solve ended.
    pub status: HoldingStatus,
    /// Interior-point iterations (0 when no solve was needed).
    pub iterations: u32,
    /// The contact forces on the object at the optimum (N, gripper frame), one per input
    /// contact in input order; zero for contacts left out and when the status is a failure.
    pub contact_forces: Vec<Vec3>,
    /// Balance residual of the returned forces,
    /// `max(|sum f_i + s F|, |sum (p_i - c) x f_i + s T| / L) / max_i N_i` with `L` the
    /// largest contact distance from the centre of mass (dimensionless; 0 when no solve
    /// was needed).
    pub residual: f64,
}

impl HoldingResult {
    /// True when the status is a computed answer and the margin reaches `safety_factor`.
    pub fn passes(&self, safety_factor: f64) -> bool {
        self.status.is_answer() && self.scale >= safety_factor
    }

    fn trivial(n: usize, scale: f64, status: HoldingStatus) -> Self {
        Self { scale, status, iterations: 0, contact_forces: vec![Vec3::ZERO; n], residual: 0.0 }
    }
}

/// The largest scale of `load` that the contacts can hold, with torques about `com`.
///
/// # Errors
/// [`HoldingError::Contact`] for an invalid contact; [`HoldingError::InvalidCentre`] for a
/// non-finite centre of mass; [`HoldingError::InvalidLoad`] for a non-finite load.
/// Solver trouble is not an error: it is the result's status.
///
/// # Example
/// Two antipodal horizontal contacts squeezing with 2 N at friction 0.5 hold
/// `2 mu N = 2 N` of weight:
/// ```
/// use grasp_core::grasp::{GraspContact, HoldingSettings, HoldingStatus, LoadCase, holding_scale};
/// use grasp_core::math::Vec3;
/// let pinch = |x: f64, finger| GraspContact {
///     point: Vec3::new(x, 0.0, 0.0),
///     normal: Vec3::new(-x.signum(), 0.0, 0.0),
///     normal_force: 2.0,
///     friction: 0.5,
///     finger,
/// };
/// let weight = LoadCase::new("1 N down", Vec3::new(0.0, 0.0, -1.0), Vec3::ZERO)?;
/// let grasp = [pinch(0.03, 0), pinch(-0.03, 1)];
/// let r = holding_scale(&grasp, Vec3::ZERO, &weight, &HoldingSettings::default())?;
/// assert_eq!(r.status, HoldingStatus::Solved);
/// assert!((r.scale - 2.0).abs() < 1e-6);
/// # Ok::<(), grasp_core::grasp::HoldingError>(())
/// ```
pub fn holding_scale(
    contacts: &[GraspContact],
    com: Vec3,
    load: &LoadCase,
    settings: &HoldingSettings,
) -> Result<HoldingResult, HoldingError> {
    validate_contacts(contacts)?;
    if !com.is_finite() {
        return Err(HoldingError::InvalidCentre);
    }
    if !(load.force.is_finite() && load.torque.is_finite()) {
        return Err(HoldingError::InvalidLoad { name: load.name.clone() });
    }
    let n = contacts.len();
    let active: Vec<usize> = (0..n).filter(|&i| contacts[i].normal_force > 0.0).collect();
    if active.is_empty() {
        return Ok(HoldingResult::trivial(n, 0.0, HoldingStatus::NoContacts));
    }
    if load.force == Vec3::ZERO && load.torque == Vec3::ZERO {
        return Ok(HoldingResult::trivial(n, MAX_LOAD_SCALE, HoldingStatus::NoLoad));
    }

    // Reference values that make the program dimensionless.
    let force_ref = active.iter().map(|&i| contacts[i].normal_force).fold(0.0, f64::max);
    let arm = active.iter().map(|&i| (contacts[i].point - com).length()).fold(0.0, f64::max);
    let length_ref = if arm > 0.0 { arm } else { 1.0 };
    let load_force = load.force;
    let load_torque = load.torque / length_ref;
    let load_norm = (load_force.length_squared() + load_torque.length_squared()).sqrt();
    if !(load_norm > 0.0 && load_norm.is_finite()) {
        // A subnormal load whose square underflows, or one that overflows: treat as no load
        // or refuse, rather than divide by it.
        return if load_norm == 0.0 {
            Ok(HoldingResult::trivial(n, MAX_LOAD_SCALE, HoldingStatus::NoLoad))
        } else {
            Err(HoldingError::InvalidLoad { name: load.name.clone() })
        };
    }
    let w_force = load_force / load_norm;
    let w_torque = load_torque / load_norm;
    // Dimensionless scale s~ = s * load_norm / force_ref.
    let to_scale = force_ref / load_norm;
    // Upper bound on s~ from the force bounds: |sum f_i~| <= sum N_i~ sqrt(1 + mu^2), and
    // likewise for the torques (arms <= 1). The cap row is added only when this bound does
    // not already keep s below MAX_LOAD_SCALE.
    let bound: f64 = active
        .iter()
        .map(|&i| contacts[i].normal_force / force_ref * (1.0 + contacts[i].friction.powi(2)).sqrt())
        .sum();
    let bound_scale = bound / w_force.length().max(w_torque.length());
    let cap = MAX_LOAD_SCALE / to_scale;
    let needs_cap = !(bound_scale * to_scale <= MAX_LOAD_SCALE);

    // Variable layout: x[0] = s~, then per active contact f_n~ and, with friction, a~, b~.
    let mut columns = Vec::with_capacity(active.len());
    let mut nvar = 1;
    for &i in &active {
        let width = if contacts[i].friction > 0.0 { 3 } else { 1 };
        columns.push(nvar);
        nvar += width;
    }

    let mut rows = Vec::new();
    let mut cols = Vec::new();
    let mut vals = Vec::new();
    let mut push = |r: usize, c: usize, v: f64| {
        if v != 0.0 {
            rows.push(r);
            cols.push(c);
            vals.push(v);
        }
    };
    // Balance rows 0..6: sum_i f_i~ + s~ w = 0 (force), sum_i r_i~ x f_i~ + s~ w_t = 0.
    for k in 0..3 {
        push(k, 0, w_force[k]);
        push(3 + k, 0, w_torque[k]);
    }
    for (slot, &i) in active.iter().enumerate() {
        let c = &contacts[i];
        let (nrm, t1, t2) = c.frame();
        let r = (c.point - com) / length_ref;
        let directions: &[Vec3] = if c.friction > 0.0 { &[nrm, t1, t2] } else { &[nrm] };
        for (j, d) in directions.iter().enumerate() {
            let moment = r.cross(*d);
            for k in 0..3 {
                push(k, columns[slot] + j, d[k]);
                push(3 + k, columns[slot] + j, moment[k]);
            }
        }
    }
    let mut b = vec![0.0; 6];
    let mut cones: Vec<SupportedConeT<f64>> = vec![ZeroConeT(6)];
    // Non-negative rows: f_n~ <= N_i~ for every contact, f_n~ >= 0 for frictionless ones
    // (the cone implies it otherwise), and the optional cap.
    let mut row = 6;
    let first_nonneg = row;
    for (slot, &i) in active.iter().enumerate() {
        let c = &contacts[i];
        push(row, columns[slot], 1.0);
        b.push(c.normal_force / force_ref);
        row += 1;
        if c.friction == 0.0 {
            push(row, columns[slot], -1.0);
            b.push(0.0);
            row += 1;
        }
    }
    if needs_cap {
        push(row, 0, 1.0);
        b.push(cap);
        row += 1;
    }
    cones.push(NonnegativeConeT(row - first_nonneg));
    // Coulomb cones: z = (mu f_n~, a~, b~) in SOC(3), i.e. A = -diag(mu, 1, 1), b = 0.
    for (slot, &i) in active.iter().enumerate() {
        let c = &contacts[i];
        if c.friction > 0.0 {
            push(row, columns[slot], -c.friction);
            push(row + 1, columns[slot] + 1, -1.0);
            push(row + 2, columns[slot] + 2, -1.0);
            b.extend([0.0, 0.0, 0.0]);
            cones.push(SecondOrderConeT(3));
            row += 3;
        }
    }
    let a = CscMatrix::new_from_triplets(row, nvar, rows, cols, vals);
    let p = CscMatrix::zeros((nvar, nvar));
    let mut q = vec![0.0; nvar];
    q[0] = -1.0;

    let solver_settings = DefaultSettings::<f64> {
        verbose: false,
        max_iter: settings.max_iterations,
        tol_gap_abs: settings.tolerance,
        tol_gap_rel: settings.tolerance,
        tol_feas: settings.tolerance,
        ..DefaultSettings::default()
    };
    let Ok(mut solver) = DefaultSolver::new(&p, &q, &a, &b, &cones, solver_settings) else {
        return Ok(HoldingResult::trivial(n, 0.0, HoldingStatus::SolverFailed(SolverFailure::Setup)));
    };
    solver.solve();
    let iterations = solver.info.iterations;
    let status = match solver.solution.status {
        ClarabelStatus::Solved => HoldingStatus::Solved,
        ClarabelStatus::AlmostSolved => HoldingStatus::ReducedAccuracy,
        ClarabelStatus::MaxIterations | ClarabelStatus::MaxTime => {
            HoldingStatus::SolverFailed(SolverFailure::MaxIterations)
        }
        ClarabelStatus::PrimalInfeasible
        | ClarabelStatus::DualInfeasible
        | ClarabelStatus::AlmostPrimalInfeasible
        | ClarabelStatus::AlmostDualInfeasible => HoldingStatus::SolverFailed(SolverFailure::Inconsistent),
        _ => HoldingStatus::SolverFailed(SolverFailure::Numerical),
    };
    let x = &solver.solution.x;
    let s_tilde = x[0];
    let status = if status.is_answer() && !(s_tilde >= -NEGATIVE_SCALE_TOLERANCE && s_tilde.is_finite()) {
        HoldingStatus::SolverFailed(SolverFailure::Numerical)
    } else {
        status
    };
    if !status.is_answer() {
        return Ok(HoldingResult { iterations, ..HoldingResult::trivial(n, 0.0, status) });
    }

    let s_tilde = s_tilde.max(0.0);
    let mut forces = vec![Vec3::ZERO; n];
    let mut force_sum = s_tilde * w_force;
    let mut torque_sum = s_tilde * w_torque;
    for (slot, &i) in active.iter().enumerate() {
        let c = &contacts[i];
        let (nrm, t1, t2) = c.frame();
        let col = columns[slot];
        let f =
            if c.friction > 0.0 { x[col] * nrm + x[col + 1] * t1 + x[col + 2] * t2 } else { x[col] * nrm };
        force_sum += f;
        torque_sum += ((c.point - com) / length_ref).cross(f);
        forces[i] = f * force_ref;
    }
    let residual = force_sum.length().max(torque_sum.length());
    let mut scale = s_tilde * to_scale;
    let mut status = status;
    if scale >= MAX_LOAD_SCALE * (1.0 - 1e-6) {
        scale = MAX_LOAD_SCALE;
        status = HoldingStatus::Capped;
    }
    Ok(HoldingResult { scale, status, iterations, contact_forces: forces, residual })
}

/// One load case and its holding result.
#[derive(Debug, Clone, PartialEq)]
pub struct CaseMargin {
    /// The load case.
    pub case: LoadCase,
    /// Its holding result.
    pub result: HoldingResult,
}

/// The holding margins of an object over a list of load cases.
#[derive(Debug, Clone, PartialEq)]
pub struct HoldingMargins {
    /// The smallest margin over the [`LoadKind::Lift`] cases; `None` when there are none.
    pub lift: Option<f64>,
    /// The smallest margin over the [`LoadKind::Lateral`] cases; `None` when there are none.
    pub lateral_min: Option<f64>,
    /// Every case with its result, in input order.
    pub cases: Vec<CaseMargin>,
    /// True when every case's status is a computed answer (no solver failure). A failed
    /// case counts with margin 0 in `lift` and `lateral_min`.
    pub all_answered: bool,
}

/// Evaluates [`holding_scale`] for every case and summarises lift and lateral margins.
///
/// # Errors
/// As [`holding_scale`].
pub fn holding_margins(
    contacts: &[GraspContact],
    com: Vec3,
    cases: &[LoadCase],
    settings: &HoldingSettings,
) -> Result<HoldingMargins, HoldingError> {
    let mut out = Vec::with_capacity(cases.len());
    for case in cases {
        let result = holding_scale(contacts, com, case, settings)?;
        out.push(CaseMargin { case: case.clone(), result });
    }
    let min_of = |want: fn(&LoadKind) -> bool| {
        out.iter().filter(|m| want(&m.case.kind)).map(|m| m.result.scale).reduce(f64::min)
    };
    let lift = min_of(|k| matches!(k, LoadKind::Lift));
    let lateral_min = min_of(|k| matches!(k, LoadKind::Lateral { .. }));
    let all_answered = out.iter().all(|m| m.result.status.is_answer());
    Ok(HoldingMargins { lift, lateral_min, cases: out, all_answered })
}

/// Why a holding computation could not start.
#[derive(Debug, Clone, PartialEq, thiserror::Error)]
#[non_exhaustive]
pub enum HoldingError {
    /// A contact is invalid.
    #[error(transparent)]
    Contact(#[from] ContactError),
    /// The centre of mass is not finite.
    #[error("the centre of mass is not finite")]
    InvalidCentre,
    /// A load case has a non-finite component (or overflows when normalised).
    #[error("load case {name:?} is not finite")]
    InvalidLoad {
        /// The case's name.
        name: String,
    },
    /// The object mass given to [`load_cases`] is not finite and positive.
    #[error("mass must be finite and > 0 kg, got {value}")]
    InvalidMass {
        /// The value given (kg).
        value: f64,
    },
    /// An acceleration given to [`load_cases`] is negative or not finite.
    #[error("{what} acceleration must be finite and >= 0 m/s², got {value}")]
    InvalidAcceleration {
        /// `"lift"` or `"lateral"`.
        what: &'static str,
        /// The value given (m/s²).
        value: f64,
    },
    /// A [`HoldingSettings`] setter got a value out of range.
    #[error("invalid holding settings: {reason}")]
    InvalidSettings {
        /// What is wrong.
        reason: &'static str,
    },
}

#[cfg(test)]
mod tests;

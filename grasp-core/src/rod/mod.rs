//! The finger as a discretised planar rod.
//!
//! # Model
//! An inextensible planar rod in the finger plane (coordinates `(u, w)`, origin at the
//! clamp, `w` along the unbent axis, `u` toward the side the finger bends to). The
//! passive base `[0, b]` is clamped and straight; the chamber `[b, b + L]` is cut into
//! `n` elements of length `h = L/n`, **each a constant-curvature arc**; the tip cap
//! `[b + L, b + L + t]` is rigid, straight and tangent to the chamber's end. The
//! unknowns are the tangent angles `psi_1..psi_n` at the element ends (rad, from `+w`
//! toward `+u`; `psi_0 = 0` at the clamped base). Element `i` has the curvature
//! `kappa_i = (psi_i - psi_{i-1}) / h` and carries the moment `m(kappa_i)` of the
//! section's moment–curvature law ([`MomentLaw`]).
//!
//! This is piecewise-constant-curvature kinematics (Webster & Jones, IJRR 29(13),
//! 2010): an arc of length `h` between tangent angles `a` and `b` spans the chord
//! `h sinc((b - a)/2) (sin m, cos m)`, `m = (a + b)/2`. With a uniform curvature the rod
//! *is* the arc of [`crate::kinematics::FingerShape`], so with no load it reproduces the
//! free bending of [`crate::actuator`] exactly; under load the scheme converges at second
//! order in `h` (see the tests against Bisshopp & Drucker 1945).
//!
//! Equilibrium is the stationarity of `sum_i h Psi(kappa_i) - sum_j F_j . x_j` with
//! `Psi' = m`, under equality constraints on material points ([`PointConstraint`]),
//! solved by Newton's method on the KKT system with a backtracking line search and
//! adaptive load stepping ([`solve`]). Non-convergence is reported in the
//! [`SolveReport`], never hidden.
//!
//! Sign conventions: a material point is `(s, y)`: arc length `s` from the clamp along
//! the reference line (the strain-limiting layer) and height `y` above the layer
//! (negative = the inner face, the side that touches objects). The section's `+y` points
//! away from the centre of curvature of a finger bent by pressure. A force is in N in
//! `(u, w)`. A constraint's multiplier `lambda` is such that the constraint applies the
//! force `-lambda * direction` to the rod.

mod blocked;
mod coupled;
mod solve;
mod sqp;
mod unilateral;

pub use blocked::{BlockedForce, BlockedOutcome, blocked_force_curve, blocked_tip_force};
pub use coupled::{CoupledStep, RodBlock, SharedGap, coupled_step};
pub use solve::{RESIDUAL_TOLERANCE, RodSolution, SolveReport, SolveStatus, solve, solve_within};
pub use sqp::{
    ContactStep, MAX_STEP_RAD, SQP_ITERATIONS, contact_step, limit_step, limit_step_with_nodes,
    solve_with_gaps_sqp,
};
pub use unilateral::{ContactSolution, GAP_TOLERANCE, PointGap, solve_with_gaps};

use crate::math::Vec2;
use crate::section::{LawError, SectionLaw};

/// A moment–curvature law `m(kappa)` and its derivative (N m, N m²).
pub trait MomentLaw {
    /// `(m, dm/dkappa)` at curvature `kappa` (1/m).
    ///
    /// # Errors
    /// When `kappa` is outside the law's range.
    fn moment(&self, kappa: f64) -> Result<(f64, f64), LawError>;
}

impl MomentLaw for SectionLaw {
    fn moment(&self, kappa: f64) -> Result<(f64, f64), LawError> {
        SectionLaw::moment(self, kappa)
    }
}

/// The linear law `m = EI (kappa - kappa0)`.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct LinearLaw {
    /// Bending stiffness `EI` (N m²).
    pub stiffness: f64,
    /// Intrinsic (rest) curvature `kappa0` (1/m).
    pub rest_curvature: f64,
}

impl MomentLaw for LinearLaw {
    fn moment(&self, kappa: f64) -> Result<(f64, f64), LawError> {
        Ok((self.stiffness * (kappa - self.rest_curvature), self.stiffness))
    }
}

/// The rod's geometry and discretisation.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Rod {
    /// Clamped straight base (m).
    pub base_length: f64,
    /// Chamber length (m).
    pub chamber_length: f64,
    /// Rigid tip cap (m).
    pub tip_length: f64,
    /// Elements along the chamber.
    pub elements: usize,
}

/// Why a rod problem was refused before solving.
#[derive(Debug, Clone, PartialEq, thiserror::Error)]
#[non_exhaustive]
pub enum RodError {
    /// Geometry not finite or not positive, or fewer than one element.
    #[error("invalid rod: {0}")]
    BadGeometry(&'static str),
    /// A load, point or constraint is not finite or lies off the rod.
    #[error("invalid load or constraint: {0}")]
    BadInput(&'static str),
    /// An initial guess of the wrong length.
    #[error("initial angles have length {got}, expected {expected}")]
    BadInitialGuess {
        /// Length given.
        got: usize,
        /// Length expected (`elements + 1`).
        expected: usize,
    },
}

/// A point of the rod's body: arc length `s` from the clamp (m) and height `y` above
/// the layer (m, negative = inner face).
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct MaterialPoint {
    /// Arc length from the clamp along the reference line (m).
    pub s: f64,
    /// Height above the strain-limiting layer (m).
    pub y: f64,
}

/// A dead point force on a material point.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct PointLoad {
    /// Where it acts.
    pub point: MaterialPoint,
    /// The force (N) in `(u, w)`.
    pub force: Vec2,
}

/// The constraint `direction . x(point) = target` (`direction` a unit vector, `target` in m).
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct PointConstraint {
    /// The constrained material point.
    pub point: MaterialPoint,
    /// Unit direction of the constrained displacement component.
    pub direction: Vec2,
    /// Prescribed value of `direction . x` (m).
    pub target: f64,
}

/// Which segment a material point lies on.
#[derive(Debug, Clone, Copy, PartialEq)]
pub(crate) enum Segment {
    /// On the clamped base: fixed.
    Base,
    /// On chamber element `i` (0-based), at distance `a` from its start.
    Element(usize, f64),
    /// On the tip cap, at distance `a` from its start.
    Cap(f64),
}

impl Rod {
    /// A validated rod.
    ///
    /// # Errors
    /// Non-finite or negative lengths, a non-positive chamber, or no elements.
    pub fn new(
        base_length: f64,
        chamber_length: f64,
        tip_length: f64,
        elements: usize,
    ) -> Result<Self, RodError> {
        if !(base_length.is_finite() && base_length >= 0.0 && tip_length.is_finite() && tip_length >= 0.0) {
            return Err(RodError::BadGeometry("base and tip lengths must be finite and >= 0"));
        }
        if !(chamber_length.is_finite() && chamber_length > 0.0) {
            return Err(RodError::BadGeometry("the chamber length must be finite and > 0"));
        }
        if elements == 0 {
            return Err(RodError::BadGeometry("at least one element"));
        }
        Ok(Self { base_length, chamber_length, tip_length, elements })
    }

    /// The rod of an actuator with `elements` chamber elements.
    ///
    /// # Errors
    /// As [`Rod::new`].
    pub fn of_actuator(a: &crate::actuator::Actuator, elements: usize) -> Result<Self, RodError> {
        Self::new(a.base_length, a.chamber_length, a.tip_length, elements)
    }

    /// Element length `h` (m).
    pub fn element_length(&self) -> f64 {
        self.chamber_length / self.elements as f64
    }
    /// Total length (m).
    pub fn length(&self) -> f64 {
        self.base_length + self.chamber_length + self.tip_length
    }
    /// Number of unknown angles, one per element.
    pub fn dofs(&self) -> usize {
        self.elements
    }
    /// The material point at the tip end on the reference line.
    pub fn tip_point(&self) -> MaterialPoint {
        MaterialPoint { s: self.length(), y: 0.0 }
    }
    /// Element curvatures `kappa_i = (psi_i - psi_{i-1}) / h` (1/m).
    pub fn curvatures(&self, angles: &[f64]) -> Vec<f64> {
        let h = self.element_length();
        (0..self.elements).map(|i| (angles[i] - if i == 0 { 0.0 } else { angles[i - 1] }) / h).collect()
    }

    pub(crate) fn segment(&self, s: f64) -> Result<Segment, RodError> {
        if !s.is_finite() || s < 0.0 || s > self.length() * (1.0 + 1e-12) {
            return Err(RodError::BadInput("material point off the rod"));
        }
        let sc = s - self.base_length;
        if sc <= 0.0 {
            return Ok(Segment::Base);
        }
        if sc < self.chamber_length || self.tip_length == 0.0 {
            let h = self.element_length();
            let i = ((sc / h).floor() as usize).min(self.elements - 1);
            return Ok(Segment::Element(i, sc - h * i as f64));
        }
        Ok(Segment::Cap((sc - self.chamber_length).min(self.tip_length)))
    }

    /// The clamp, the chamber's start, the element ends `x_1..x_n` and the tip end (m).
    pub fn nodes(&self, angles: &[f64]) -> Vec<Vec2> {
        let h = self.element_length();
        let mut x = Vec2::new(0.0, self.base_length);
        let mut out = Vec::with_capacity(self.elements + 3);
        out.push(Vec2::ZERO);
        out.push(x);
        let mut prev = 0.0;
        for &psi in &angles[..self.elements] {
            x += chord(h, prev, psi);
            out.push(x);
            prev = psi;
        }
        out.push(x + self.tip_length * direction(prev));
        out
    }

    /// Position of a material point (m).
    ///
    /// # Errors
    /// A point off the rod.
    pub fn position(&self, angles: &[f64], p: MaterialPoint) -> Result<Vec2, RodError> {
        let h = self.element_length();
        // the start of element `i` (`i = n`: of the cap), walking the chords up to it
        let start_of = |i: usize| {
            let mut x = Vec2::new(0.0, self.base_length);
            let mut prev = 0.0;
            for &psi in &angles[..i] {
                x += chord(h, prev, psi);
                prev = psi;
            }
            x
        };
        self.position_from(angles, p, start_of)
    }

    /// Position of material point `p` at `angles`, given the start of each element
    /// (`start_of(n)`: the cap's start).
    pub(crate) fn position_from(
        &self,
        angles: &[f64],
        p: MaterialPoint,
        start_of: impl FnOnce(usize) -> Vec2,
    ) -> Result<Vec2, RodError> {
        let h = self.element_length();
        let angle = |j: usize| if j == 0 { 0.0 } else { angles[j - 1] };
        Ok(match self.segment(p.s)? {
            Segment::Base => Vec2::new(0.0, p.s) + p.y * section_up(0.0),
            Segment::Element(i, a) => {
                let prev = angle(i);
                let end = prev + (angles[i] - prev) * a / h;
                start_of(i) + chord(a, prev, end) + p.y * section_up(end)
            }
            Segment::Cap(a) => {
                let prev = angle(self.elements);
                start_of(self.elements) + a * direction(prev) + p.y * section_up(prev)
            }
        })
    }
}

/// A rod at fixed angles with its [`Rod::nodes`] evaluated once, for the positions of
/// many material points at one configuration (the gaps of a contact linearisation):
/// each then costs one partial chord, where [`Rod::position`] walks the chain of chords
/// up to the point again. The positions are the same floating-point numbers (the nodes
/// are the same sums of the same chords).
pub struct Chain<'a> {
    rod: &'a Rod,
    angles: &'a [f64],
    nodes: Vec<Vec2>,
}

impl<'a> Chain<'a> {
    /// The chain of `rod` at `angles` (one per dof).
    ///
    /// # Errors
    /// Angles of the wrong length.
    pub fn new(rod: &'a Rod, angles: &'a [f64]) -> Result<Self, RodError> {
        if angles.len() != rod.dofs() {
            return Err(RodError::BadInitialGuess { got: angles.len(), expected: rod.dofs() });
        }
        Ok(Self { rod, angles, nodes: rod.nodes(angles) })
    }

    /// The chain of `rod` at `angles` with their nodes already evaluated: `nodes` must be
    /// `rod.nodes(angles)` (as [`limit_step_with_nodes`] returns them for the angles
    /// after its step), which debug builds check.
    ///
    /// # Errors
    /// Angles or nodes of the wrong length.
    pub fn with_nodes(rod: &'a Rod, angles: &'a [f64], nodes: Vec<Vec2>) -> Result<Self, RodError> {
        if angles.len() != rod.dofs() {
            return Err(RodError::BadInitialGuess { got: angles.len(), expected: rod.dofs() });
        }
        if nodes.len() != rod.elements + 3 {
            return Err(RodError::BadInput("the rod's nodes do not match its elements"));
        }
        debug_assert!(nodes == rod.nodes(angles), "nodes given for other angles");
        Ok(Self { rod, angles, nodes })
    }

    /// The rod.
    pub fn rod(&self) -> &'a Rod {
        self.rod
    }

    /// The angles (rad), one per dof.
    pub fn angles(&self) -> &'a [f64] {
        self.angles
    }

    /// The rod's [`Rod::nodes`] at these angles.
    pub fn nodes(&self) -> &[Vec2] {
        &self.nodes
    }

    /// Position of a material point (m); equals [`Rod::position`].
    ///
    /// # Errors
    /// A point off the rod.
    pub fn position(&self, p: MaterialPoint) -> Result<Vec2, RodError> {
        // element i starts at node i + 1 (node 0 is the clamp); the cap at node n + 1
        self.rod.position_from(self.angles, p, |i| self.nodes[i + 1])
    }
}

/// The chord of an arc of length `len` from tangent angle `a` to `b`:
/// `len sinc((b - a)/2) (sin m, cos m)`, `m = (a + b)/2` (m).
pub fn chord(len: f64, a: f64, b: f64) -> Vec2 {
    len * sinc((b - a) * 0.5) * direction(0.5 * (a + b))
}

/// `sin x / x`, `1` at 0.
pub(crate) fn sinc(x: f64) -> f64 {
    if x.abs() < 1e-4 { 1.0 - x * x / 6.0 + x.powi(4) / 120.0 } else { x.sin() / x }
}

/// Unit tangent at angle `phi` from `+w` toward `+u`: `(sin phi, cos phi)`.
pub fn direction(phi: f64) -> Vec2 {
    Vec2::new(phi.sin(), phi.cos())
}

/// Unit vector of the section's `+y` (away from the layer, to the outer side) at tangent
/// angle `phi`: `(-cos phi, sin phi)`.
pub fn section_up(phi: f64) -> Vec2 {
    Vec2::new(-phi.cos(), phi.sin())
}

#[cfg(test)]
mod tests;

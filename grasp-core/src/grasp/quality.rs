//! The Ferrari–Canny epsilon quality of a grasp (DESIGN 3.4).
//!
//! After C. Ferrari and J. Canny, "Planning optimal grasps", Proc. IEEE ICRA 1992
//! (pp. 2290–2295, from memory): the quality of a set of contacts is the radius of the
//! largest ball, centred at the origin of wrench space, inside the set of wrenches the
//! contacts can apply with a unit budget of normal force. It is the magnitude of the smallest
//! disturbance wrench, over all directions, that the grasp can just resist with that
//! budget; 0 when the origin is not strictly inside (no force closure).
//!
//! # Formulation
//! Contact `i` at `p_i` with unit normal `n_i` into the object, tangents `t1_i, t2_i` and
//! friction `mu_i`. Its Coulomb cone is replaced by the pyramid of `k` edges
//!
//! ```text
//! f_ij = n_i + mu_i (cos(phi_j) t1_i + sin(phi_j) t2_i),   phi_j = 2 pi j / k,  j = 0..k-1
//! ```
//!
//! (a single edge `n_i` when `mu_i = 0`). Each edge has unit normal component. Its
//! primitive wrench is
//!
//! ```text
//! w_ij = (f_ij, (p_i - c) x f_ij / r)        in R^6 (force N, torque N m / r)
//! ```
//!
//! with torques about the object's centre of mass `c`, scaled by the characteristic
//! length `r` so that forces and torques are commensurable; use the object's bounding
//! radius (the largest distance from `c` to the object's surface), which makes the
//! quality independent of the object's size for geometrically similar grasps.
//!
//! The L1 quality (the sum of the normal forces is at most 1) is the radius of the largest
//! origin-centred ball inside `W_L1 = ConvexHull(union_ij {w_ij})`; it equals the smallest
//! distance from the origin to a facet hyperplane of that hull, when the origin is inside.
//!
//! # Linearisation error
//! The pyramid's edges lie on the cone, so the pyramid is inscribed in it: the quality
//! computed is a lower bound of the exact-cone quality. The exact-cone hull lies between
//! the inscribed pyramid's hull and the circumscribed pyramid's (faces tangent to the cone,
//! edges `mu / cos(pi/k)` long, rotated by half a step), whose qualities bracket the exact
//! value. Doubling `k` nests both pyramids, so the bracket only narrows. For three
//! fingers at 120° with `mu = 0.5` (tested) the relative width of the bracket is 0.20,
//! 0.068, 0.022 and 0.0043 at `k` = 4, 8, 16 and 32, below the cone bracket's own
//! `1/cos(pi/k) - cos(pi/k) ~ pi^2 / k^2`. So the default `k = 8`
//! ([`DEFAULT_CONE_EDGES`]) reads about 6 % low there (0.269 against 0.2865–0.2878);
//! pass 16 or 32 where that matters (the hull grows quickly, see below).
//!
//! # Algorithm
//! Exact for the linearised cones: the convex hull of the primitive wrenches by an
//! incremental Quickhull in 6-D (see `quality/hull.rs`), then the minimum facet distance.
//! Cost grows with the number of hull facets, at worst like `(n k)^3` in 6-D: for three
//! contacts the hull has 456, 2 640 and 16 224 simplicial facets at `k` = 8, 16 and 32.
//! The number of primitive wrenches is limited to [`MAX_PRIMITIVE_WRENCHES`]. The hull is
//! checked (every wrench below every facet, closed surface); a failed check is the status
//! [`QualityStatus::HullFailed`], never a silent number.
//!
//! # Planar grasps
//! [`planar_epsilon`] does the same in the plane, wrench `(fx, fy, tau / r)` in R^3. A
//! planar Coulomb cone is a sector with exactly two edges `n +- mu t`, so there is no
//! linearisation: the planar quality is exact. It also offers the L-infinity quality (each
//! normal force at most 1), whose wrench set is the Minkowski sum over the contacts of
//! `ConvexHull({0} union {w_ij})`, limited to [`MAX_LINF_CONTACTS`] contacts (the sum has
//! `3^n` candidate points).
//!
//! The quality ignores the contacts' closing forces `N_i`: it rates the contact geometry
//! and friction with a unit force budget, as Ferrari and Canny define it. Every contact
//! given counts; leave out those that should not.

mod hull;
#[cfg(test)]
mod tests;

use hull::{Hull, convex_hull};

use super::contact::{ContactError, GraspContact, validate_contacts};
use crate::math::{Vec2, Vec3};

/// Default number of edges of a linearised friction cone.
pub const DEFAULT_CONE_EDGES: usize = 8;
/// Largest number of cone edges accepted.
pub const MAX_CONE_EDGES: usize = 256;
/// Largest number of primitive wrenches (contacts times edges) accepted in 6-D.
pub const MAX_PRIMITIVE_WRENCHES: usize = 256;
/// Largest number of contacts for the planar L-infinity quality.
pub const MAX_LINF_CONTACTS: usize = 10;

/// Which budget on the normal forces the quality uses.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum WrenchNorm {
    /// The sum of the normal forces is at most 1.
    L1,
    /// Each normal force is at most 1 (planar only).
    LInf,
}

/// What the quality computation found.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
#[non_exhaustive]
pub enum QualityStatus {
    /// The origin is strictly inside the wrench set: force closure, `epsilon > 0`.
    ForceClosure,
    /// The origin is on the boundary or outside (or the wrenches do not span wrench
    /// space): no force closure, `epsilon = 0`.
    NoForceClosure,
    /// No contacts: `epsilon = 0`.
    NoContacts,
    /// The hull construction failed its own consistency check: `epsilon = 0`, not a pass.
    HullFailed,
}

/// The epsilon quality of a grasp in a `D`-dimensional wrench space (6 in space, 3 in the
/// plane).
///
/// # Coordinate systems / sign convention
/// Wrench coordinates are `(force, torque / r)`: force components in the gripper frame
/// (N per unit normal-force budget), torque about the object's centre of mass divided by
/// the characteristic length `r`.
#[derive(Debug, Clone, PartialEq)]
pub struct EpsilonQuality<const D: usize> {
    /// The quality: radius of the largest origin-centred ball inside the wrench set
    /// (dimensionless, per unit normal-force budget); 0 without force closure.
    pub epsilon: f64,
    /// What was found.
    pub status: QualityStatus,
    /// The unit wrench direction of the nearest facet: the disturbance direction the grasp
    /// resists worst (`Some` only with force closure).
    pub weakest_direction: Option<[f64; D]>,
    /// Number of primitive wrenches used.
    pub wrench_count: usize,
    /// Number of (simplicial) hull facets.
    pub facet_count: usize,
}

impl<const D: usize> EpsilonQuality<D> {
    /// A result without force closure: epsilon 0, no weakest direction, no facets.
    fn without_closure(status: QualityStatus, wrench_count: usize) -> Self {
        Self { epsilon: 0.0, status, weakest_direction: None, wrench_count, facet_count: 0 }
    }
}

fn quality_from_points<const D: usize>(points: &[[f64; D]]) -> EpsilonQuality<D> {
    let wrench_count = points.len();
    let none = |status| EpsilonQuality::without_closure(status, wrench_count);
    match convex_hull(points) {
        Hull::Flat { .. } => none(QualityStatus::NoForceClosure),
        Hull::Failed => none(QualityStatus::HullFailed),
        Hull::Full(facets) => {
            let scale = points.iter().flat_map(|p| p.iter()).fold(0.0_f64, |m, x| m.max(x.abs()));
            let mut nearest = &facets[0];
            for f in &facets[1..] {
                if f.offset < nearest.offset {
                    nearest = f;
                }
            }
            if nearest.offset > hull::DISTANCE_TOLERANCE * scale {
                EpsilonQuality {
                    epsilon: nearest.offset,
                    status: QualityStatus::ForceClosure,
                    weakest_direction: Some(nearest.normal),
                    wrench_count,
                    facet_count: facets.len(),
                }
            } else {
                EpsilonQuality { facet_count: facets.len(), ..none(QualityStatus::NoForceClosure) }
            }
        }
    }
}

fn check_common(torque_length: f64, centre_finite: bool) -> Result<(), QualityError> {
    if !(torque_length > 0.0 && torque_length.is_finite()) {
        return Err(QualityError::InvalidTorqueLength { value: torque_length });
    }
    if !centre_finite {
        return Err(QualityError::InvalidCentre);
    }
    Ok(())
}

/// How a friction cone is replaced by a `k`-edge pyramid.
#[derive(Debug, Clone, Copy, PartialEq)]
enum Pyramid {
    /// Edges on the cone at `phi_j = 2 pi j / k`.
    Inscribed,
    /// Faces tangent to the cone at `phi_j`: edges of length `mu / cos(pi/k)` at
    /// `phi_j + pi/k`. Doubling `k` keeps the tangent directions, so the pyramids nest.
    #[cfg_attr(not(test), expect(dead_code, reason = "used to measure the linearisation error in tests"))]
    Circumscribed,
}

/// The primitive wrenches of the contacts with `k`-edge pyramids.
fn primitive_wrenches(
    contacts: &[GraspContact],
    com: Vec3,
    torque_length: f64,
    k: usize,
    pyramid: Pyramid,
) -> Vec<[f64; 6]> {
    let step = std::f64::consts::TAU / k as f64;
    let (edge_factor, phase) = match pyramid {
        Pyramid::Inscribed => (1.0, 0.0),
        Pyramid::Circumscribed => (1.0 / (0.5 * step).cos(), 0.5 * step),
    };
    let mut out = Vec::with_capacity(contacts.len() * k);
    for c in contacts {
        let (n, t1, t2) = c.frame();
        let arm = c.point - com;
        let edges = if c.friction > 0.0 { k } else { 1 };
        for j in 0..edges {
            let phi = step * j as f64 + phase;
            let f = n + c.friction * edge_factor * (phi.cos() * t1 + phi.sin() * t2);
            let tau = arm.cross(f) / torque_length;
            out.push([f.x, f.y, f.z, tau.x, tau.y, tau.z]);
        }
    }
    out
}

fn epsilon_with_edges(
    contacts: &[GraspContact],
    com: Vec3,
    torque_length: f64,
    cone_edges: usize,
    pyramid: Pyramid,
) -> Result<EpsilonQuality<6>, QualityError> {
    validate_contacts(contacts)?;
    check_common(torque_length, com.is_finite())?;
    if !(3..=MAX_CONE_EDGES).contains(&cone_edges) {
        return Err(QualityError::InvalidConeEdges { value: cone_edges });
    }
    let count: usize = contacts.iter().map(|c| if c.friction > 0.0 { cone_edges } else { 1 }).sum();
    if count > MAX_PRIMITIVE_WRENCHES {
        return Err(QualityError::TooManyWrenches { count, max: MAX_PRIMITIVE_WRENCHES });
    }
    if contacts.is_empty() {
        return Ok(EpsilonQuality::without_closure(QualityStatus::NoContacts, 0));
    }
    Ok(quality_from_points(&primitive_wrenches(contacts, com, torque_length, cone_edges, pyramid)))
}

/// The L1 epsilon quality of a spatial grasp, friction cones linearised into
/// `cone_edges` edges (inscribed pyramids; [`DEFAULT_CONE_EDGES`] is a good default).
///
/// `com` is the object's centre of mass (torques are taken about it) and `torque_length`
/// the characteristic length `r` (m) that scales torques, normally the object's bounding
/// radius. Each contact's `normal_force` is not used (see the module docs).
///
/// # Errors
/// [`QualityError`] for an invalid contact, a non-finite centre, `torque_length` not
/// finite and `> 0`, `cone_edges` outside `3..=MAX_CONE_EDGES`, or more than
/// [`MAX_PRIMITIVE_WRENCHES`] primitive wrenches.
pub fn epsilon_quality(
    contacts: &[GraspContact],
    com: Vec3,
    torque_length: f64,
    cone_edges: usize,
) -> Result<EpsilonQuality<6>, QualityError> {
    epsilon_with_edges(contacts, com, torque_length, cone_edges, Pyramid::Inscribed)
}

/// A point contact in the plane.
///
/// # Coordinate systems / sign convention
/// Any fixed planar frame (m). `normal` is the unit normal pointing into the object;
/// torques are counter-clockwise positive (`tau = rx fy - ry fx`).
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct PlanarContact {
    /// Contact point (m).
    pub point: Vec2,
    /// Unit normal pointing into the object.
    pub normal: Vec2,
    /// Coulomb friction coefficient, `>= 0`.
    pub friction: f64,
}

impl PlanarContact {
    fn validate(&self, index: usize) -> Result<(), ContactError> {
        if !self.point.is_finite() {
            return Err(ContactError::NonFinitePoint { index });
        }
        let length = self.normal.length();
        if !((length - 1.0).abs() <= super::contact::NORMAL_LENGTH_TOLERANCE) {
            return Err(ContactError::NotUnitNormal { index, length });
        }
        if !(self.friction >= 0.0 && self.friction.is_finite()) {
            return Err(ContactError::InvalidFriction { index, value: self.friction });
        }
        Ok(())
    }

    /// The primitive wrenches `(fx, fy, tau / r)` of the cone's edges `n +- mu t`.
    fn wrenches(&self, com: Vec2, torque_length: f64) -> Vec<[f64; 3]> {
        let n = self.normal.normalize();
        let t = n.perp();
        let arm = self.point - com;
        let edges =
            if self.friction > 0.0 { vec![n + self.friction * t, n - self.friction * t] } else { vec![n] };
        edges.into_iter().map(|f| [f.x, f.y, arm.perp_dot(f) / torque_length]).collect()
    }
}

/// The epsilon quality of a planar grasp in the wrench space `(fx, fy, tau / r)`, exact
/// (a planar friction cone has two edges), for the L1 or L-infinity budget.
///
/// # Errors
/// [`QualityError`] for an invalid contact, a non-finite centre, `torque_length` not
/// finite and `> 0`, or more than [`MAX_LINF_CONTACTS`] contacts with
/// [`WrenchNorm::LInf`].
///
/// # Example
/// Ferrari and Canny's disk of radius `r` held by two antipodal contacts at friction 0.5:
/// ```
/// use grasp_core::grasp::{PlanarContact, WrenchNorm, planar_epsilon};
/// use grasp_core::math::Vec2;
/// let r = 0.04;
/// let grasp = [
///     PlanarContact { point: Vec2::new(r, 0.0), normal: Vec2::new(-1.0, 0.0), friction: 0.5 },
///     PlanarContact { point: Vec2::new(-r, 0.0), normal: Vec2::new(1.0, 0.0), friction: 0.5 },
/// ];
/// let q = planar_epsilon(&grasp, Vec2::ZERO, r, WrenchNorm::L1)?;
/// assert!((q.epsilon - 1.0 / 3.0).abs() < 1e-12);
/// # Ok::<(), grasp_core::grasp::QualityError>(())
/// ```
pub fn planar_epsilon(
    contacts: &[PlanarContact],
    com: Vec2,
    torque_length: f64,
    norm: WrenchNorm,
) -> Result<EpsilonQuality<3>, QualityError> {
    contacts.iter().enumerate().try_for_each(|(i, c)| c.validate(i))?;
    check_common(torque_length, com.is_finite())?;
    if norm == WrenchNorm::LInf && contacts.len() > MAX_LINF_CONTACTS {
        return Err(QualityError::TooManyContacts { count: contacts.len(), max: MAX_LINF_CONTACTS });
    }
    if contacts.is_empty() {
        return Ok(EpsilonQuality::without_closure(QualityStatus::NoContacts, 0));
    }
    let per_contact: Vec<Vec<[f64; 3]>> = contacts.iter().map(|c| c.wrenches(com, torque_length)).collect();
    let points = match norm {
        WrenchNorm::L1 => per_contact.concat(),
        WrenchNorm::LInf => {
            // Minkowski sum of conv({0} u edges_i): every sum of one choice per contact.
            let mut sums = vec![[0.0; 3]];
            for set in &per_contact {
                let mut next = Vec::with_capacity(sums.len() * (set.len() + 1));
                for s in &sums {
                    next.push(*s);
                    for w in set {
                        next.push([s[0] + w[0], s[1] + w[1], s[2] + w[2]]);
                    }
                }
                sums = next;
            }
            sums
        }
    };
    Ok(quality_from_points(&points))
}

/// Why a quality computation could not start.
#[derive(Debug, Clone, PartialEq, thiserror::Error)]
#[non_exhaustive]
pub enum QualityError {
    /// A contact is invalid.
    #[error(transparent)]
    Contact(#[from] ContactError),
    /// The centre of mass is not finite.
    #[error("the centre of mass is not finite")]
    InvalidCentre,
    /// The torque scaling length is not finite and positive.
    #[error("the torque scaling length must be finite and > 0 m, got {value}")]
    InvalidTorqueLength {
        /// The value given (m).
        value: f64,
    },
    /// The number of cone edges is outside `3..=MAX_CONE_EDGES`.
    #[error("a linearised friction cone needs 3 to {MAX_CONE_EDGES} edges, got {value}")]
    InvalidConeEdges {
        /// The value given.
        value: usize,
    },
    /// Too many primitive wrenches for the hull.
    #[error("{count} primitive wrenches, at most {max} are supported")]
    TooManyWrenches {
        /// Contacts times edges.
        count: usize,
        /// The limit.
        max: usize,
    },
    /// Too many contacts for the L-infinity quality.
    #[error("{count} contacts, the L-infinity quality supports at most {max}")]
    TooManyContacts {
        /// The number given.
        count: usize,
        /// The limit.
        max: usize,
    },
}

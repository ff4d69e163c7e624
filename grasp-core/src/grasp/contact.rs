//! The finger–object contact that the closing stage hands to the holding and quality
//! checks.

use crate::math::Vec3;

/// How far a contact normal's length may be from 1 before it is refused.
///
/// The closing stage produces normals from a geometry library to round-off, so anything
/// further from unit length than this is a caller's bug, not noise. Accepted normals are
/// renormalised before use.
pub const NORMAL_LENGTH_TOLERANCE: f64 = 1e-6;

/// One point contact between a finger and a held object.
///
/// # Coordinate systems / sign convention
/// * `point` is in the gripper frame (DESIGN section 2: origin at the centre of the palm's
///   lower face, `+z` up, gravity along `-z`), in m.
/// * `normal` is the unit contact normal pointing **into the object**: the direction in
///   which the finger pushes. A contact force on the object is
///   `f = f_n * normal + f_t` with `f_n >= 0` and `f_t` perpendicular to `normal`.
/// * `normal_force` is `N_i`, the normal force (N) the finger presses with at the end of
///   the closing stage (frictionless there). The holding stage lets the normal force take
///   any value in `[0, N_i]`.
/// * `friction` is the Coulomb coefficient `mu` between this finger and the object
///   (dimensionless): the tangential force obeys `|f_t| <= mu f_n`.
/// * `finger` is the index of the finger in the gripper's finger list.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct GraspContact {
    /// Contact point, gripper frame (m).
    pub point: Vec3,
    /// Unit normal pointing into the object.
    pub normal: Vec3,
    /// Normal force `N_i` from the closing stage (N), `>= 0`.
    pub normal_force: f64,
    /// Coulomb friction coefficient `mu`, `>= 0`.
    pub friction: f64,
    /// Index of the finger that makes this contact.
    pub finger: usize,
}

impl GraspContact {
    /// Checks that every field is usable; `index` is the contact's position in its list
    /// and is only used to name the contact in the error.
    ///
    /// # Errors
    /// [`ContactError`] for a non-finite point, a normal whose length differs from 1 by more
    /// than [`NORMAL_LENGTH_TOLERANCE`], a negative or non-finite normal force or friction
    /// coefficient.
    pub fn validate(&self, index: usize) -> Result<(), ContactError> {
        if !self.point.is_finite() {
            return Err(ContactError::NonFinitePoint { index });
        }
        let length = self.normal.length();
        if !((length - 1.0).abs() <= NORMAL_LENGTH_TOLERANCE) {
            return Err(ContactError::NotUnitNormal { index, length });
        }
        if !(self.normal_force >= 0.0 && self.normal_force.is_finite()) {
            return Err(ContactError::InvalidNormalForce { index, value: self.normal_force });
        }
        if !(self.friction >= 0.0 && self.friction.is_finite()) {
            return Err(ContactError::InvalidFriction { index, value: self.friction });
        }
        Ok(())
    }

    /// The contact frame `(n, t1, t2)`: the renormalised normal and two unit tangents, a
    /// right-handed orthonormal triple (`t1 x t2 = n`).
    ///
    /// The tangents are a fixed function of the normal (glam's `any_orthonormal_pair`), so
    /// results built on them are reproducible; the holding margin and the epsilon quality
    /// do not depend on the choice except through the orientation of a linearised cone's
    /// edges.
    pub fn frame(&self) -> (Vec3, Vec3, Vec3) {
        let n = self.normal.normalize();
        let (t1, t2) = n.any_orthonormal_pair();
        // any_orthonormal_pair is right-handed for glam 0.33; enforce it regardless.
        let t2 = if t1.cross(t2).dot(n) < 0.0 { -t2 } else { t2 };
        (n, t1, t2)
    }
}

/// Checks a whole contact list.
///
/// # Errors
/// The first invalid contact's [`ContactError`].
pub fn validate_contacts(contacts: &[GraspContact]) -> Result<(), ContactError> {
    contacts.iter().enumerate().try_for_each(|(i, c)| c.validate(i))
}

/// Why a [`GraspContact`] was refused.
#[derive(Debug, Clone, Copy, PartialEq, thiserror::Error)]
#[non_exhaustive]
pub enum ContactError {
    /// The contact point has a NaN or infinite coordinate.
    #[error("contact {index}: the point is not finite")]
    NonFinitePoint {
        /// Position of the contact in its list.
        index: usize,
    },
    /// The normal is not a unit vector (or is not finite).
    #[error("contact {index}: the normal has length {length}, expected 1")]
    NotUnitNormal {
        /// Position of the contact in its list.
        index: usize,
        /// Its length.
        length: f64,
    },
    /// The normal force is negative or not finite.
    #[error("contact {index}: normal force must be finite and >= 0 N, got {value}")]
    InvalidNormalForce {
        /// Position of the contact in its list.
        index: usize,
        /// The value given (N).
        value: f64,
    },
    /// The friction coefficient is negative or not finite.
    #[error("contact {index}: friction coefficient must be finite and >= 0, got {value}")]
    InvalidFriction {
        /// Position of the contact in its list.
        index: usize,
        /// The value given.
        value: f64,
    },
}

#[cfg(test)]
mod tests {
    use approx::assert_relative_eq;

    use super::*;

    fn contact(normal: Vec3) -> GraspContact {
        GraspContact { point: Vec3::ZERO, normal, normal_force: 1.0, friction: 0.5, finger: 0 }
    }

    /// The frame is orthonormal and right-handed for normals along and off the axes
    /// (definition of an orthonormal right-handed basis).
    #[test]
    fn frame_is_right_handed_orthonormal() {
        for n in [Vec3::X, Vec3::NEG_Y, Vec3::Z, Vec3::NEG_Z, Vec3::new(1.0, -2.0, 0.5).normalize()] {
            let (n1, t1, t2) = contact(n).frame();
            assert_relative_eq!(n1.dot(t1), 0.0, epsilon = 1e-15);
            assert_relative_eq!(n1.dot(t2), 0.0, epsilon = 1e-15);
            assert_relative_eq!(t1.dot(t2), 0.0, epsilon = 1e-15);
            assert_relative_eq!(t1.length(), 1.0, epsilon = 1e-15);
            assert_relative_eq!(t2.length(), 1.0, epsilon = 1e-15);
            assert_relative_eq!(t1.cross(t2).dot(n1), 1.0, epsilon = 1e-15);
        }
    }

    #[test]
    fn invalid_fields_are_refused_with_the_index() {
        let good = contact(Vec3::X);
        assert_eq!(good.validate(3), Ok(()));
        let mut c = good;
        c.normal = Vec3::new(2.0, 0.0, 0.0);
        assert_eq!(c.validate(3), Err(ContactError::NotUnitNormal { index: 3, length: 2.0 }));
        c = good;
        c.normal = Vec3::new(f64::NAN, 0.0, 0.0);
        assert!(matches!(c.validate(0), Err(ContactError::NotUnitNormal { .. })));
        c = good;
        c.point.y = f64::INFINITY;
        assert_eq!(c.validate(1), Err(ContactError::NonFinitePoint { index: 1 }));
        c = good;
        c.normal_force = -1.0;
        assert_eq!(c.validate(2), Err(ContactError::InvalidNormalForce { index: 2, value: -1.0 }));
        c = good;
        c.friction = f64::NAN;
        assert!(matches!(c.validate(2), Err(ContactError::InvalidFriction { index: 2, .. })));
        assert!(matches!(
            validate_contacts(&[good, good, c]),
            Err(ContactError::InvalidFriction { index: 2, .. })
        ));
    }
}

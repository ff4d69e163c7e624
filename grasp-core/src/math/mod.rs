//! Numeric types and small numerical tools shared by every module.
//!
//! One precision (`f64`) and one vector library (glam, the one parry3d-f64 uses) for
//! the whole crate. The finger-plane coordinates `(u, w)` of a finger are stored in a
//! [`Vec2`] as `x = u` (toward the side the finger bends to) and `y = w` (along the
//! unbent axis, toward the tip).

/// The scalar type of the crate.
pub type Real = f64;
/// A 2-D vector or point (finger-plane coordinates `(u, w)`, in m).
pub type Vec2 = glam::DVec2;
/// A 3-D vector or point (m).
pub type Vec3 = glam::DVec3;
/// A 3×3 matrix (rotations).
pub type Mat3 = glam::DMat3;
/// A 4×4 homogeneous transform.
pub type Mat4 = glam::DMat4;
/// A rigid transform (rotation then translation) as used by parry3d: `pose * local_point`
/// is the point in the outer frame (m).
pub type Pose = parry3d_f64::math::Pose;
/// A rotation (unit quaternion), the rotation part of a [`Pose`].
pub type Rotation = parry3d_f64::math::Rotation;

pub mod gauss_legendre;

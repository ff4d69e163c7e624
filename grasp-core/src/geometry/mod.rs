//! Geometry of the gripper and its objects in the gripper frame, as parry3d shapes.
//!
//! Responsibilities, one concept per file:
//! - [`hub`]: where each finger sits on the hub, the rigid map from a finger's plane
//!   coordinates `(u, w)` to the gripper frame ([`FingerFrame`]), and layout patterns that
//!   expand to [`FingerMount`](crate::scene::FingerMount)s ([`HubPattern`]).
//! - [`shapes`]: collision shapes of the target objects ([`ObjectGeometry`]).
//! - [`finger_body`]: the finger's body as one convex piece per rod element, plus the
//!   palm ([`FingerBody`], [`palm_body`]).
//!
//! Start at [`FingerFrame`]: everything else is placed with it.
//!
//! # Coordinate systems
//! All results are in the gripper frame of DESIGN 2: origin at the centre of the palm's
//! lower face, `+z` up (away from the objects), gravity along `-z`, SI units (m). Poses
//! are parry [`Pose`]s: `pose * local_point` gives the gripper-frame point.
//! Shape-local quantities carry a `local_` prefix.

pub mod ellipsoid;
pub mod finger_body;
pub mod hub;
pub mod mesh_hull;
pub mod point_hull;
pub mod shapes;

pub use ellipsoid::EllipsoidHull;
pub use finger_body::{BodyPiece, FingerBody, PieceKind, free_angles, palm_body};
pub use hub::{FingerFrame, HubPattern, finger_frames};
pub use mesh_hull::MeshHull;
pub use point_hull::PointHull;
pub use shapes::{ObjectGeometry, bounding_radius, object_geometry};

pub use crate::math::Pose;

/// Why a geometric model could not be built.
#[derive(Debug, Clone, PartialEq, thiserror::Error)]
#[non_exhaustive]
pub enum GeometryError {
    /// An input quantity is NaN or infinite.
    #[error("{what} is not finite")]
    NonFinite {
        /// What was not finite.
        what: &'static str,
    },
    /// A dimension is outside its range (e.g. a radius that is not > 0).
    #[error("{field} must be {expected}, got {value}")]
    BadDimension {
        /// Field name (without unit).
        field: &'static str,
        /// What was expected, e.g. "> 0".
        expected: &'static str,
        /// The value given (SI).
        value: f64,
    },
    /// A hub pattern that cannot be laid out (no fingers, fingers on top of each other).
    #[error("invalid hub pattern: {0}")]
    BadPattern(&'static str),
    /// Rod angles of the wrong length (one angle per chamber element is expected).
    #[error("finger angles have length {got}, expected {expected}")]
    AngleCount {
        /// Length given.
        got: usize,
        /// Length expected (the rod's element count).
        expected: usize,
    },
    /// The convex hull of a point set could not be built (fewer than four points not in
    /// one plane, e.g. a flat mesh).
    #[error("no convex hull for {what}: the points are degenerate (flat or too few)")]
    Hull {
        /// Which shape.
        what: &'static str,
    },
    /// A triangle mesh was refused by the collision library.
    #[error("invalid triangle mesh: {0}")]
    Mesh(#[from] parry3d_f64::shape::TriMeshBuilderError),
    /// A mesh triangle names a vertex that does not exist.
    #[error("mesh triangle {triangle} names vertex {index}, but the mesh has {vertices} vertices")]
    MeshIndex {
        /// Triangle number (0-based).
        triangle: usize,
        /// The vertex index named.
        index: u32,
        /// Number of vertices.
        vertices: usize,
    },
    /// A piece index that the body does not have.
    #[error("no body piece {index} (the body has {pieces})")]
    NoPiece {
        /// Index asked for.
        index: usize,
        /// Number of pieces.
        pieces: usize,
    },
}

pub(crate) fn finite(what: &'static str, v: f64) -> Result<f64, GeometryError> {
    if v.is_finite() { Ok(v) } else { Err(GeometryError::NonFinite { what }) }
}

pub(crate) fn positive(field: &'static str, value: f64) -> Result<f64, GeometryError> {
    if value.is_finite() && value > 0.0 {
        Ok(value)
    } else {
        Err(GeometryError::BadDimension { field, expected: "> 0 and finite", value })
    }
}

pub(crate) fn finite_vec(
    what: &'static str,
    v: crate::math::Vec3,
) -> Result<crate::math::Vec3, GeometryError> {
    if v.is_finite() { Ok(v) } else { Err(GeometryError::NonFinite { what }) }
}

//! Collision shapes of the target objects.
//!
//! Every [`ObjectShape`] becomes one convex parry shape, used for contact and for the
//! enclosure shape cast:
//!
//! | scene shape | parry shape |
//! | --- | --- |
//! | `Sphere` | `Ball` |
//! | `Box` | `Cuboid` with half the edge lengths |
//! | `Cylinder` (axis z) | `Cylinder` (parry's axis is y), turned by +90° about x |
//! | `Capsule` (axis z) | `Capsule` from `-length/2` to `+length/2` on z |
//! | `Ellipsoid` | convex hull of a latitude/longitude point set ([`ellipsoid_points`], [`super::EllipsoidHull`]) |
//! | `Mesh` | convex hull of the mesh's vertices; the mesh itself is kept as a `TriMesh` |
//!
//! A mesh object is represented by its **convex hull** for contact: concave pockets of
//! the surface (a pepper's folds) are bridged over. The triangle mesh is kept in
//! [`ObjectGeometry::mesh`] for callers that want the true surface (parry casts and
//! distances work with it, at a higher cost).
//!
//! The ellipsoid hull uses [`ELLIPSOID_LATITUDE_BANDS`] = 24 bands between the poles and
//! [`ELLIPSOID_LONGITUDES`] = 48 meridians (1106 points). Because the point set is the
//! image of the same set on the unit sphere under `diag(a, b, c)`, its volume error is the
//! same for every ellipsoid: the hull is a stack of frustums of regular 48-gons whose
//! volume is `0.712 %` below `4/3 pi a b c` (closed form in the tests), and the hull lies
//! between the ellipsoid scaled by `0.99573` and the ellipsoid itself (at most `0.43 %` of
//! a semi-axis inside the true surface).

use super::{GeometryError, finite_vec, positive};
use crate::math::{Pose, Rotation, Vec3};
use crate::scene::{ObjectShape, TargetObject, TriangleMesh};
use parry3d_f64::shape::{SharedShape, TriMeshFlags};
use std::f64::consts::{FRAC_PI_2, PI, TAU};

/// Latitude bands of the ellipsoid hull, pole to pole (the equator is a ring of points).
pub const ELLIPSOID_LATITUDE_BANDS: usize = 24;
/// Meridians of the ellipsoid hull (a multiple of 4, so the x and y axes carry points).
pub const ELLIPSOID_LONGITUDES: usize = 48;

/// An object's collision geometry in the gripper frame.
///
/// # Coordinate systems
/// `shape` and `mesh` are described in their own local frames; `pose` places them in the
/// gripper frame (m). The object's frame is centred on its scene `position` and not
/// rotated; `local_pose` is the pose of the parry shape inside the object's frame (the
/// identity for every shape except `Cylinder`, whose parry axis `y` is turned onto the
/// object's `z`). So `pose = translation(position) * local_pose`. The mesh, when there is
/// one, is in the object's frame: its pose is [`ObjectGeometry::mesh_pose`]. Parry's
/// contact normals on these shapes point outward.
#[derive(Clone)]
pub struct ObjectGeometry {
    /// The convex shape used for contact and enclosure.
    pub shape: SharedShape,
    /// For `Mesh` objects: the triangle mesh itself (object frame).
    pub mesh: Option<SharedShape>,
    /// Pose of `shape` in the object's frame.
    pub local_pose: Pose,
    /// Pose of `shape` in the gripper frame.
    pub pose: Pose,
    /// The object's centre in the gripper frame (m): its scene position.
    pub position: Vec3,
    /// Radius of the smallest ball about `position` that holds the object (m); see
    /// [`bounding_radius`].
    pub bounding_radius: f64,
}

impl std::fmt::Debug for ObjectGeometry {
    fn fmt(&self, f: &mut std::fmt::Formatter<'_>) -> std::fmt::Result {
        f.debug_struct("ObjectGeometry")
            .field("shape", &self.shape.shape_type())
            .field("mesh", &self.mesh.is_some())
            .field("pose", &self.pose)
            .field("bounding_radius", &self.bounding_radius)
            .finish()
    }
}

impl ObjectGeometry {
    /// The geometry of a shape centred at `position` (gripper frame, m).
    ///
    /// # Errors
    /// A non-positive or non-finite dimension, a non-finite position, a mesh with a bad
    /// vertex index or non-finite vertex, or a mesh whose vertices span no volume.
    pub fn new(shape: &ObjectShape, position: Vec3) -> Result<Self, GeometryError> {
        let position = finite_vec("object position", position)?;
        let (shape_, local_pose, mesh) = local_shape(shape)?;
        Ok(Self {
            shape: shape_,
            mesh,
            local_pose,
            pose: Pose::from_translation(position) * local_pose,
            position,
            bounding_radius: bounding_radius(shape),
        })
    }

    /// The geometry of a scene object at its position.
    ///
    /// # Errors
    /// As [`ObjectGeometry::new`].
    pub fn of_object(object: &TargetObject) -> Result<Self, GeometryError> {
        Self::new(&object.shape, object.position)
    }

    /// The gripper-frame pose of [`ObjectGeometry::mesh`]: a translation to `position`.
    pub fn mesh_pose(&self) -> Pose {
        Pose::from_translation(self.position)
    }

    /// Volume of the convex shape (m³).
    pub fn volume(&self) -> f64 {
        self.shape.mass_properties(1.0).mass()
    }
}

/// The geometry of a scene object; see [`ObjectGeometry::of_object`].
///
/// # Errors
/// As [`ObjectGeometry::new`].
pub fn object_geometry(object: &TargetObject) -> Result<ObjectGeometry, GeometryError> {
    ObjectGeometry::of_object(object)
}

/// Radius (m) of the smallest ball about the object's centre that contains it, in closed
/// form: `r` (sphere), `|size|/2` (box), `sqrt(r² + (h/2)²)` (cylinder), `length/2 + r`
/// (capsule), the largest semi-axis (ellipsoid), the farthest mesh vertex used by a
/// triangle (mesh; 0 for an empty mesh). Used for the enclosure's cast distance and to
/// scale torques.
pub fn bounding_radius(shape: &ObjectShape) -> f64 {
    match shape {
        ObjectShape::Sphere { radius } => *radius,
        ObjectShape::Box { size } => 0.5 * size.length(),
        ObjectShape::Cylinder { radius, height } => radius.hypot(0.5 * height),
        ObjectShape::Capsule { radius, length } => 0.5 * length + radius,
        ObjectShape::Ellipsoid { semi_axes } => semi_axes.max_element(),
        ObjectShape::Mesh { mesh, .. } => {
            used_vertices(mesh).map(|v| v.map(Vec3::length).fold(0.0, f64::max)).unwrap_or(0.0)
        }
    }
}

/// The points of the ellipsoid hull (m, object frame): both poles and
/// `ELLIPSOID_LATITUDE_BANDS - 1` rings of `ELLIPSOID_LONGITUDES` points at the latitudes
/// `-pi/2 + j pi / 24` and longitudes `2 pi k / 48`, mapped by `diag(a, b, c)`.
pub fn ellipsoid_points(semi_axes: Vec3) -> Vec<Vec3> {
    let (nj, nk) = (ELLIPSOID_LATITUDE_BANDS, ELLIPSOID_LONGITUDES);
    let mut pts = Vec::with_capacity(2 + (nj - 1) * nk);
    pts.push(Vec3::new(0.0, 0.0, -semi_axes.z));
    for j in 1..nj {
        let lat = -FRAC_PI_2 + PI * j as f64 / nj as f64;
        let (sl, cl) = lat.sin_cos();
        for k in 0..nk {
            let lon = TAU * k as f64 / nk as f64;
            let (so, co) = lon.sin_cos();
            pts.push(semi_axes * Vec3::new(cl * co, cl * so, sl));
        }
    }
    pts.push(Vec3::new(0.0, 0.0, semi_axes.z));
    pts
}

/// The vertices a mesh's triangles use, or the first bad index.
fn used_vertices(mesh: &TriangleMesh) -> Result<impl Iterator<Item = Vec3> + '_, GeometryError> {
    let n = mesh.vertices.len();
    let mut used = vec![false; n];
    for (t, tri) in mesh.triangles.iter().enumerate() {
        for &i in tri {
            match used.get_mut(i as usize) {
                Some(u) => *u = true,
                None => return Err(GeometryError::MeshIndex { triangle: t, index: i, vertices: n }),
            }
        }
    }
    Ok(mesh.vertices.iter().zip(used).filter(|(_, u)| *u).map(|(v, _)| *v))
}

/// The parry shape, its pose in the object frame, and the mesh if any.
fn local_shape(shape: &ObjectShape) -> Result<(SharedShape, Pose, Option<SharedShape>), GeometryError> {
    Ok(match shape {
        ObjectShape::Sphere { radius } => {
            (SharedShape::ball(positive("radius", *radius)?), Pose::IDENTITY, None)
        }
        ObjectShape::Box { size } => {
            let h = 0.5
                * Vec3::new(
                    positive("size.x", size.x)?,
                    positive("size.y", size.y)?,
                    positive("size.z", size.z)?,
                );
            (SharedShape::cuboid(h.x, h.y, h.z), Pose::IDENTITY, None)
        }
        ObjectShape::Cylinder { radius, height } => {
            let r = positive("radius", *radius)?;
            let h = positive("height", *height)?;
            // parry's cylinder axis is local y; +90° about x takes y to z
            (
                SharedShape::cylinder(0.5 * h, r),
                Pose::from_rotation(Rotation::from_rotation_x(FRAC_PI_2)),
                None,
            )
        }
        ObjectShape::Capsule { radius, length } => {
            let r = positive("radius", *radius)?;
            let l = positive("length", *length)?;
            (SharedShape::capsule_z(0.5 * l, r), Pose::IDENTITY, None)
        }
        ObjectShape::Ellipsoid { semi_axes } => {
            let s = semi_axes;
            let s = Vec3::new(
                positive("semi_axes.x", s.x)?,
                positive("semi_axes.y", s.y)?,
                positive("semi_axes.z", s.z)?,
            );
            let hull = super::EllipsoidHull::new(s).ok_or(GeometryError::Hull { what: "ellipsoid" })?;
            (SharedShape::new(hull), Pose::IDENTITY, None)
        }
        ObjectShape::Mesh { mesh, .. } => {
            let pts: Vec<Vec3> = used_vertices(mesh)?.collect();
            if pts.iter().any(|p| !p.is_finite()) {
                return Err(GeometryError::NonFinite { what: "mesh vertex" });
            }
            let hull =
                SharedShape::new(super::MeshHull::new(&pts).ok_or(GeometryError::Hull { what: "mesh" })?);
            // parry returns a flat hull for coplanar points: refuse what spans no volume
            let extent = hull.compute_local_aabb().extents();
            if !(hull.mass_properties(1.0).mass() > 1e-9 * extent.max_element().powi(3)) {
                return Err(GeometryError::Hull { what: "mesh" });
            }
            let flags = TriMeshFlags::MERGE_DUPLICATE_VERTICES
                | TriMeshFlags::DELETE_DEGENERATE_TRIANGLES
                | TriMeshFlags::DELETE_DUPLICATE_TRIANGLES;
            let tri = parry3d_f64::shape::TriMesh::with_flags(
                mesh.vertices.clone(),
                mesh.triangles.clone(),
                flags,
            )?;
            (hull, Pose::IDENTITY, Some(SharedShape::new(tri)))
        }
    })
}

#[cfg(test)]
mod tests {
    use super::*;
    use approx::assert_relative_eq;

    fn geo(shape: ObjectShape) -> ObjectGeometry {
        ObjectGeometry::new(&shape, Vec3::new(0.01, -0.02, -0.07)).unwrap()
    }

    /// Largest distance from the object's centre to parry's support points over 2000
    /// spread directions plus `extreme` (the direction of the farthest point, where the
    /// distance equals the bounding radius): the parry-side counterpart of
    /// `bounding_radius`. It must never exceed it.
    fn support_radius(g: &ObjectGeometry, extreme: Vec3) -> f64 {
        let sm = g.shape.as_support_map().unwrap();
        let at =
            |d: Vec3| (g.pose * sm.local_support_point(g.pose.rotation.inverse() * d) - g.position).length();
        let mut best = at(extreme.normalize());
        for i in 0..2000 {
            let z = 1.0 - (2 * i + 1) as f64 / 2000.0;
            let phi = i as f64 * PI * (3.0 - 5f64.sqrt());
            let r = (1.0 - z * z).sqrt();
            let far = at(Vec3::new(r * phi.cos(), r * phi.sin(), z));
            assert!(far <= g.bounding_radius * (1.0 + 1e-12), "{far} beyond {}", g.bounding_radius);
            best = best.max(far);
        }
        best
    }

    /// Closed forms: V = 4/3 pi r³; the farthest point is at r.
    #[test]
    fn sphere_volume_and_bounding_radius() {
        let g = geo(ObjectShape::Sphere { radius: 0.025 });
        assert_relative_eq!(g.volume(), 4.0 / 3.0 * PI * 0.025f64.powi(3), max_relative = 1e-12);
        assert_relative_eq!(g.bounding_radius, 0.025);
        assert_relative_eq!(support_radius(&g, Vec3::X), 0.025, max_relative = 1e-12);
        assert_relative_eq!(g.pose.translation.z, -0.07);
    }

    /// Closed forms: V = xyz; the corner (x, y, z)/2 is the support point along (1, 1, 1)
    /// and lies at |size|/2.
    #[test]
    fn box_half_extents_volume_and_corner() {
        let size = Vec3::new(0.04, 0.03, 0.02);
        let g = geo(ObjectShape::Box { size });
        assert_relative_eq!(g.volume(), 0.04 * 0.03 * 0.02, max_relative = 1e-12);
        let aabb = g.shape.compute_aabb(&g.pose);
        assert_relative_eq!(aabb.maxs.x - g.position.x, 0.02, epsilon = 1e-15);
        assert_relative_eq!(aabb.maxs.y - g.position.y, 0.015, epsilon = 1e-15);
        assert_relative_eq!(aabb.maxs.z - g.position.z, 0.01, epsilon = 1e-15);
        assert_relative_eq!(g.bounding_radius, 0.5 * size.length());
        assert_relative_eq!(support_radius(&g, size), g.bounding_radius, max_relative = 1e-12);
    }

    /// Closed forms: V = pi r² h; the axis is z, so the box around it is r × r × h/2
    /// (this fails if the turn from parry's y axis is missing).
    #[test]
    fn cylinder_is_turned_onto_z() {
        let g = geo(ObjectShape::Cylinder { radius: 0.02, height: 0.06 });
        assert_relative_eq!(g.volume(), PI * 0.02 * 0.02 * 0.06, max_relative = 1e-12);
        let he = g.shape.compute_aabb(&g.pose).half_extents();
        assert_relative_eq!(he.x, 0.02, epsilon = 1e-12);
        assert_relative_eq!(he.y, 0.02, epsilon = 1e-12);
        assert_relative_eq!(he.z, 0.03, epsilon = 1e-12);
        assert_relative_eq!(g.bounding_radius, (0.02f64.powi(2) + 0.03f64.powi(2)).sqrt());
        let rim = Vec3::new(0.02, 0.0, 0.03);
        assert_relative_eq!(support_radius(&g, rim), g.bounding_radius, max_relative = 1e-12);
    }

    /// Closed forms: V = pi r² L + 4/3 pi r³; half-height along z is L/2 + r.
    #[test]
    fn capsule_volume_and_axis() {
        let (r, l) = (0.015, 0.04);
        let g = geo(ObjectShape::Capsule { radius: r, length: l });
        assert_relative_eq!(g.volume(), PI * r * r * l + 4.0 / 3.0 * PI * r.powi(3), max_relative = 1e-12);
        let he = g.shape.compute_aabb(&g.pose).half_extents();
        assert_relative_eq!(he.z, 0.5 * l + r, epsilon = 1e-12);
        assert_relative_eq!(he.x, r, epsilon = 1e-12);
        assert_relative_eq!(support_radius(&g, Vec3::Z), g.bounding_radius, max_relative = 1e-12);
    }

    /// Closed form of the hull: the lat/long points lie on parallel rings of aligned
    /// regular M-gons, so the hull is a stack of frustums (cones at the poles),
    /// `V = abc sum_j h_j/3 (A_j + A_j+1 + sqrt(A_j A_j+1))` with
    /// `A_j = M/2 cos² lat_j sin(2 pi/M)`. parry's volume of the hull must equal it, and
    /// the deficit against the ellipsoid `4/3 pi abc` is the 0.712 % stated in the module
    /// doc, the same for every `(a, b, c)` (affine invariance of volume ratios).
    #[test]
    fn ellipsoid_hull_matches_frustum_stack_closed_form() {
        let (nj, m) = (ELLIPSOID_LATITUDE_BANDS, ELLIPSOID_LONGITUDES as f64);
        let mut unit = 0.0;
        for j in 0..nj {
            let l1 = -FRAC_PI_2 + PI * j as f64 / nj as f64;
            let l2 = l1 + PI / nj as f64;
            let a1 = 0.5 * m * l1.cos().powi(2) * (TAU / m).sin();
            let a2 = 0.5 * m * l2.cos().powi(2) * (TAU / m).sin();
            unit += (l2.sin() - l1.sin()) / 3.0 * (a1 + a2 + (a1 * a2).sqrt());
        }
        let deficit = 1.0 - unit / (4.0 / 3.0 * PI);
        assert_relative_eq!(deficit, 0.007119, epsilon = 1e-6);
        for s in [Vec3::splat(0.02), Vec3::new(0.03, 0.022, 0.022), Vec3::new(0.01, 0.04, 0.025)] {
            let g = geo(ObjectShape::Ellipsoid { semi_axes: s });
            let abc = s.x * s.y * s.z;
            assert_relative_eq!(g.volume(), unit * abc, max_relative = 1e-10);
            // poles and the equator's axis points are vertices: the box is exact
            let he = g.shape.compute_aabb(&g.pose).half_extents();
            assert_relative_eq!(he.x, s.x, max_relative = 1e-12);
            assert_relative_eq!(he.y, s.y, max_relative = 1e-12);
            assert_relative_eq!(he.z, s.z, max_relative = 1e-12);
            let longest = if s.x >= s.y.max(s.z) {
                Vec3::X
            } else if s.y >= s.z {
                Vec3::Y
            } else {
                Vec3::Z
            };
            assert_relative_eq!(support_radius(&g, longest), g.bounding_radius, max_relative = 1e-12);
        }
    }

    fn unit_cube_mesh(scale: f64, offset: Vec3) -> TriangleMesh {
        let mut vertices = Vec::new();
        for i in 0..8 {
            let c = Vec3::new((i & 1) as f64, ((i >> 1) & 1) as f64, ((i >> 2) & 1) as f64);
            vertices.push((c - Vec3::splat(0.5)) * scale + offset);
        }
        // two triangles per face, outward
        let faces = [[0, 2, 3, 1], [4, 5, 7, 6], [0, 1, 5, 4], [2, 6, 7, 3], [0, 4, 6, 2], [1, 3, 7, 5]];
        let triangles = faces.iter().flat_map(|f| [[f[0], f[1], f[2]], [f[0], f[2], f[3]]]).collect();
        TriangleMesh { vertices, triangles }
    }

    /// Closed form: the hull of a cube mesh is the cube (V = s³, farthest vertex at
    /// s sqrt(3)/2); an L-shaped prism (a cube with a notch cut from one edge) has as its
    /// hull the cube minus the triangular prism `s (s/2)² / 2` cut by the diagonal plane.
    #[test]
    fn mesh_contact_shape_is_its_convex_hull() {
        let s = 0.03;
        let mesh = unit_cube_mesh(s, Vec3::ZERO);
        let shape = ObjectShape::Mesh { mesh: mesh.clone(), source: "cube".into() };
        let g = geo(shape.clone());
        assert_relative_eq!(g.volume(), s * s * s, max_relative = 1e-12);
        assert_relative_eq!(bounding_radius(&shape), s * 3f64.sqrt() / 2.0, max_relative = 1e-12);
        assert!(g.mesh.is_some());

        // L-shaped cross-section in (x, z), extruded along y: the unit square minus the
        // quarter [0.5, 1]² notch; its hull cuts the corner diagonally.
        let l = [(0.0, 0.0), (1.0, 0.0), (1.0, 0.5), (0.5, 0.5), (0.5, 1.0), (0.0, 1.0)];
        let mut vertices = Vec::new();
        for y in [0.0, 1.0] {
            for &(x, z) in &l {
                vertices.push(Vec3::new(x, y, z) * s);
            }
        }
        let mut triangles = Vec::new();
        for i in 0..6u32 {
            let j = (i + 1) % 6;
            triangles.push([i, j, j + 6]);
            triangles.push([i, j + 6, i + 6]);
        }
        // caps by a fan from vertex 0 (the L is star-shaped from (0, 0))
        for i in 1..5u32 {
            triangles.push([0, i + 1, i]);
            triangles.push([6, 6 + i, 6 + i + 1]);
        }
        let g = geo(ObjectShape::Mesh { mesh: TriangleMesh { vertices, triangles }, source: "L".into() });
        let hull_area = 1.0 - 0.5 * 0.5 * 0.5; // unit square minus the half notch
        assert_relative_eq!(g.volume(), hull_area * s.powi(3), max_relative = 1e-12);
    }

    #[test]
    fn bad_shapes_are_refused() {
        let p = Vec3::ZERO;
        assert!(ObjectGeometry::new(&ObjectShape::Sphere { radius: 0.0 }, p).is_err());
        assert!(ObjectGeometry::new(&ObjectShape::Sphere { radius: f64::NAN }, p).is_err());
        assert!(ObjectGeometry::new(&ObjectShape::Box { size: Vec3::new(0.01, -0.01, 0.01) }, p).is_err());
        assert!(
            ObjectGeometry::new(&ObjectShape::Sphere { radius: 0.01 }, Vec3::new(f64::INFINITY, 0.0, 0.0))
                .is_err()
        );
        let mut mesh = unit_cube_mesh(0.01, Vec3::ZERO);
        mesh.triangles.push([0, 1, 99]);
        assert!(matches!(
            ObjectGeometry::new(&ObjectShape::Mesh { mesh, source: String::new() }, p),
            Err(GeometryError::MeshIndex { index: 99, .. })
        ));
        // a flat mesh spans no volume
        let flat = TriangleMesh {
            vertices: vec![Vec3::ZERO, Vec3::X * 0.01, Vec3::Y * 0.01, Vec3::new(0.01, 0.01, 0.0)],
            triangles: vec![[0, 1, 2], [1, 3, 2]],
        };
        assert!(matches!(
            ObjectGeometry::new(&ObjectShape::Mesh { mesh: flat, source: String::new() }, p),
            Err(GeometryError::Hull { .. })
        ));
        let empty = TriangleMesh { vertices: vec![], triangles: vec![] };
        assert!(ObjectGeometry::new(&ObjectShape::Mesh { mesh: empty, source: String::new() }, p).is_err());
    }
}

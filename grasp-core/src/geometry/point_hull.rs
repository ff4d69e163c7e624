//! A convex shape given by its points only: the convex hull of a point set, known to
//! parry through its support function (the point farthest along a direction).
//!
//! A finger body piece is the hull of two section outlines, rebuilt at every step of the
//! closing. Building its facets (quickhull, then the face and edge adjacency of a convex
//! polyhedron) costs tens of microseconds per piece and was most of the time of a grasp
//! check; parry's contact, distance, intersection and shape-cast queries on convex shapes
//! need only the support function (GJK and EPA; Gilbert, Johnson & Keerthi, IEEE J.
//! Robotics and Automation 4(2), 1988; van den Bergen, "Collision Detection in
//! Interactive 3D Environments", 2003), which a point set gives directly. Point
//! projection and ray casts go through parry's own support-map algorithms. The facets are
//! built only if someone asks for mass properties.

use parry3d_f64::bounding_volume::{Aabb, BoundingSphere};
use parry3d_f64::mass_properties::MassProperties;
use parry3d_f64::math::Vector;
use parry3d_f64::shape::{ConvexPolyhedron, Shape, SupportMap};

/// The convex hull of a set of points, as a parry shape (local coordinates).
#[derive(Debug, Clone)]
pub struct PointHull {
    points: Vec<Vector>,
    aabb: Aabb,
}

impl PointHull {
    /// The hull of `points`; `None` for fewer than 4 points or a non-finite one, or points
    /// that span no volume (all within 1e-9 of the largest extent of a plane through
    /// three of them).
    pub fn new(points: Vec<Vector>) -> Option<Self> {
        if points.len() < 4 || points.iter().any(|p| !p.is_finite()) {
            return None;
        }
        let aabb = Aabb::from_points(points.iter().copied());
        let extent = aabb.extents().max_element();
        if !(extent > 0.0) {
            return None;
        }
        // a volume: some point off the plane through p0, the farthest point from it and
        // the point farthest from that line (one pass each, no square roots)
        let p0 = points[0];
        let mut far = p0;
        for p in &points {
            if (*p - p0).length_squared() > (far - p0).length_squared() {
                far = *p;
            }
        }
        let mut normal = Vector::ZERO;
        for p in &points {
            let c = (far - p0).cross(*p - p0);
            if c.length_squared() > normal.length_squared() {
                normal = c;
            }
        }
        if !(normal.length() > 1e-9 * extent * extent) {
            return None;
        }
        let n = normal.normalize();
        if !points.iter().any(|p| (*p - p0).dot(n).abs() > 1e-9 * extent) {
            return None;
        }
        Some(Self { points, aabb })
    }

    /// The hull of `points` known to span a volume (a finger piece: two non-degenerate
    /// section outlines a positive element length apart), skipping the volume test of
    /// [`Self::new`] (the pieces are rebuilt at every step of a closing); `None` for
    /// fewer than 4 points or a non-finite one.
    pub fn of_volume(points: Vec<Vector>) -> Option<Self> {
        if points.len() < 4 || points.iter().any(|p| !p.is_finite()) {
            return None;
        }
        let aabb = Aabb::from_points(points.iter().copied());
        Some(Self { points, aabb })
    }

    /// The points (local coordinates).
    pub fn points(&self) -> &[Vector] {
        &self.points
    }
}

impl SupportMap for PointHull {
    fn local_support_point(&self, dir: Vector) -> Vector {
        let mut best = self.points[0];
        let mut best_dot = best.dot(dir);
        for p in &self.points[1..] {
            let d = p.dot(dir);
            if d > best_dot {
                best = *p;
                best_dot = d;
            }
        }
        best
    }
}

/// Implements parry's `PointQuery`, `RayCast` and `Shape` for a convex shape known by
/// its `SupportMap`, through parry's support-map algorithms (GJK). The type provides the
/// inherent methods `local_aabb`, `bounding_sphere`, `scaled` and `mass`.
macro_rules! support_map_shape {
    ($ty:ty) => {
        impl parry3d_f64::query::PointQuery for $ty {
            fn project_local_point(
                &self,
                point: parry3d_f64::math::Vector,
                solid: bool,
            ) -> parry3d_f64::query::PointProjection {
                parry3d_f64::query::point::local_point_projection_on_support_map(
                    self,
                    &mut parry3d_f64::query::gjk::VoronoiSimplex::new(),
                    point,
                    solid,
                )
            }

            fn project_local_point_and_get_feature(
                &self,
                point: parry3d_f64::math::Vector,
            ) -> (parry3d_f64::query::PointProjection, parry3d_f64::shape::FeatureId) {
                (self.project_local_point(point, false), parry3d_f64::shape::FeatureId::Unknown)
            }
        }

        impl parry3d_f64::query::RayCast for $ty {
            fn cast_local_ray_and_get_normal(
                &self,
                ray: &parry3d_f64::query::Ray,
                max_time_of_impact: f64,
                solid: bool,
            ) -> Option<parry3d_f64::query::RayIntersection> {
                parry3d_f64::query::details::local_ray_intersection_with_support_map_with_params(
                    self,
                    &mut parry3d_f64::query::gjk::VoronoiSimplex::new(),
                    ray,
                    max_time_of_impact,
                    solid,
                )
            }
        }

        impl parry3d_f64::shape::Shape for $ty {
            fn compute_local_aabb(&self) -> parry3d_f64::bounding_volume::Aabb {
                self.local_aabb()
            }

            fn compute_local_bounding_sphere(&self) -> parry3d_f64::bounding_volume::BoundingSphere {
                self.bounding_sphere()
            }

            fn clone_dyn(&self) -> Box<dyn parry3d_f64::shape::Shape> {
                Box::new(self.clone())
            }

            fn scale_dyn(
                &self,
                scale: parry3d_f64::math::Vector,
                _num_subdivisions: u32,
            ) -> Option<Box<dyn parry3d_f64::shape::Shape>> {
                Some(Box::new(self.scaled(scale)?))
            }

            fn mass_properties(&self, density: f64) -> parry3d_f64::mass_properties::MassProperties {
                self.mass(density)
            }

            fn is_convex(&self) -> bool {
                true
            }

            fn shape_type(&self) -> parry3d_f64::shape::ShapeType {
                parry3d_f64::shape::ShapeType::Custom
            }

            fn as_typed_shape(&self) -> parry3d_f64::shape::TypedShape<'_> {
                parry3d_f64::shape::TypedShape::Custom(self)
            }

            fn ccd_thickness(&self) -> f64 {
                self.local_aabb().half_extents().min_element()
            }

            fn ccd_angular_thickness(&self) -> f64 {
                std::f64::consts::FRAC_PI_4
            }

            fn as_support_map(&self) -> Option<&dyn parry3d_f64::shape::SupportMap> {
                Some(self as &dyn parry3d_f64::shape::SupportMap)
            }
        }
    };
}
pub(crate) use support_map_shape;

/// The sphere centred on a point set's box that holds every point.
pub(crate) fn sphere_around(aabb: &Aabb, points: &[Vector]) -> BoundingSphere {
    let centre = aabb.center();
    let radius = points.iter().map(|p| (*p - centre).length()).fold(0.0, f64::max);
    BoundingSphere::new(centre, radius)
}

impl PointHull {
    fn local_aabb(&self) -> Aabb {
        self.aabb
    }

    fn bounding_sphere(&self) -> BoundingSphere {
        sphere_around(&self.aabb, &self.points)
    }

    fn scaled(&self, scale: Vector) -> Option<Self> {
        Self::new(self.points.iter().map(|p| *p * scale).collect())
    }

    /// From the facets of the hull (computed here, on demand).
    fn mass(&self, density: f64) -> MassProperties {
        match ConvexPolyhedron::from_convex_hull(&self.points) {
            Some(poly) => poly.mass_properties(density),
            None => MassProperties::new(self.aabb.center(), 0.0, Vector::ZERO),
        }
    }
}

support_map_shape!(PointHull);

#[cfg(test)]
mod tests {
    use super::*;
    use parry3d_f64::math::Pose;
    use parry3d_f64::query;
    use parry3d_f64::query::Ray;
    use parry3d_f64::shape::{Ball, Cuboid, SharedShape};

    /// The corners of a box as a point hull answer every query parry's own cuboid
    /// answers (the cuboid is the reference: its queries are closed forms in parry):
    /// contact with a ball and with a rotated box, distance, ray cast, point projection,
    /// and the volume from the on-demand facets (exactly `8 a b c`).
    #[test]
    fn box_corners_answer_like_a_cuboid() {
        let half = Vector::new(0.02, 0.01, 0.005);
        let corners: Vec<Vector> = (0..8)
            .map(|i| {
                Vector::new(
                    if i & 1 == 0 { -half.x } else { half.x },
                    if i & 2 == 0 { -half.y } else { half.y },
                    if i & 4 == 0 { -half.z } else { half.z },
                )
            })
            .collect();
        let hull = SharedShape::new(PointHull::new(corners).unwrap());
        let cuboid = SharedShape::new(Cuboid::new(half));
        let at = Pose::from_translation(Vector::new(0.001, -0.002, 0.0005));
        let others = [
            (Pose::from_translation(Vector::new(0.0, 0.0, 0.012)), SharedShape::new(Ball::new(0.008))),
            (Pose::from_translation(Vector::new(0.03, 0.0, 0.0)), SharedShape::new(Ball::new(0.0125))),
            (
                Pose::new(Vector::new(0.0, 0.02, 0.0), Vector::new(0.3, 0.2, 0.1)),
                SharedShape::new(Cuboid::new(Vector::new(0.01, 0.01, 0.01))),
            ),
        ];
        for (pose, other) in &others {
            let a = query::contact(&at, hull.as_ref(), pose, other.as_ref(), 0.01).unwrap().unwrap();
            let b = query::contact(&at, cuboid.as_ref(), pose, other.as_ref(), 0.01).unwrap().unwrap();
            assert!((a.dist - b.dist).abs() < 1e-9, "{} vs {}", a.dist, b.dist);
            assert!((a.normal1 - b.normal1).length() < 1e-6);
            let da = query::distance(&at, hull.as_ref(), pose, other.as_ref()).unwrap();
            let db = query::distance(&at, cuboid.as_ref(), pose, other.as_ref()).unwrap();
            assert!((da.distance - db.distance).abs() < 1e-9);
        }
        let ray = Ray::new(Vector::new(0.1, 0.0, 0.0), Vector::new(-1.0, 0.0, 0.0));
        let ta = hull.cast_local_ray(&ray, 1.0, true).unwrap();
        assert!((ta - (0.1 - half.x)).abs() < 1e-9);
        let p = hull.project_local_point(Vector::new(0.0, 0.0, 0.1), true);
        assert!((p.point - Vector::new(0.0, 0.0, half.z)).length() < 1e-9);
        let v = hull.mass_properties(1.0).mass();
        assert!((v - 8.0 * half.x * half.y * half.z).abs() < 1e-12);
    }

    #[test]
    fn flat_or_short_point_sets_are_refused() {
        let flat: Vec<Vector> = (0..6).map(|i| Vector::new(i as f64, (i * i) as f64, 0.0)).collect();
        assert!(PointHull::new(flat).is_none());
        assert!(PointHull::new(vec![Vector::ZERO; 3]).is_none());
        let mut nan: Vec<Vector> = (0..4).map(|i| Vector::new(i as f64, 0.0, (i % 2) as f64)).collect();
        nan[0].x = f64::NAN;
        assert!(PointHull::new(nan).is_none());
    }
}

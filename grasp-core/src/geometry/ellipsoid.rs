//! The ellipsoid of a scene object as a parry shape: the convex hull of the
//! latitude/longitude point set of [`ellipsoid_points`], with a support function that
//! finds the hull's farthest point in constant time instead of scanning all 1106 points.
//!
//! The point set is the image under `A = diag(a, b, c)` of a grid `u_jk` on the unit
//! sphere, so the farthest point along `d` is `A u*` with `u*` the grid point farthest
//! along `e = A d / |A d|` (support functions commute with linear maps; e.g. Boyd &
//! Vandenberghe, "Convex Optimization", 2004, section 3.2.2 and ex. 3.37). On the unit
//! sphere the farthest grid point is the one angularly nearest to `e`: within a ring of
//! constant latitude it is the one of nearest longitude (the spherical distance grows
//! with the longitude difference), and along a meridian the distance grows away from
//! the foot of `e`, so only the rings bracketing `e`'s latitude (one more each side, and
//! the poles near them) and the two nearest longitudes are candidates. The test compares it with the full scan.
//!
//! Contacts and casts then see exactly the polyhedron a full convex hull would give
//! (GJK on a polytope terminates exactly), at the cost of a ball's.

use super::shapes::{ELLIPSOID_LATITUDE_BANDS, ELLIPSOID_LONGITUDES, ellipsoid_points};
use parry3d_f64::bounding_volume::{Aabb, BoundingSphere};
use parry3d_f64::mass_properties::MassProperties;
use parry3d_f64::math::Vector;
use parry3d_f64::shape::{ConvexPolyhedron, Shape, SupportMap};
use std::f64::consts::{FRAC_PI_2, PI, TAU};

/// The hull of [`ellipsoid_points`] for `semi_axes`, centred on its local origin.
#[derive(Debug, Clone, PartialEq)]
pub struct EllipsoidHull {
    /// Semi-axes along local x, y, z (m).
    pub semi_axes: Vector,
    points: Vec<Vector>,
}

impl EllipsoidHull {
    /// The hull for `semi_axes` (all finite and > 0, else `None`).
    pub fn new(semi_axes: Vector) -> Option<Self> {
        (semi_axes.is_finite() && semi_axes.min_element() > 0.0)
            .then(|| Self { semi_axes, points: ellipsoid_points(semi_axes) })
    }

    /// The hull's points ([`ellipsoid_points`]).
    pub fn points(&self) -> &[Vector] {
        &self.points
    }

    /// The farthest point along `dir` by scanning every point (the reference).
    pub fn support_by_scan(&self, dir: Vector) -> Vector {
        farthest(self.points.iter().copied(), dir)
    }
}

fn farthest(points: impl Iterator<Item = Vector>, dir: Vector) -> Vector {
    let mut best = Vector::ZERO;
    let mut best_dot = f64::NEG_INFINITY;
    for p in points {
        let d = p.dot(dir);
        if d > best_dot {
            best = p;
            best_dot = d;
        }
    }
    best
}

impl SupportMap for EllipsoidHull {
    fn local_support_point(&self, dir: Vector) -> Vector {
        let (nj, nk) = (ELLIPSOID_LATITUDE_BANDS as isize, ELLIPSOID_LONGITUDES as isize);
        let e = self.semi_axes * dir;
        let len = e.length();
        if !(len > 0.0) {
            return self.points[0];
        }
        let e = e / len;
        let lat = e.z.clamp(-1.0, 1.0).asin();
        let lon = e.y.atan2(e.x);
        // ring j (1..nj-1) at latitude -pi/2 + pi j / nj; j = 0 and nj are the poles
        let jf = ((lat + FRAC_PI_2) / (PI / nj as f64)).floor() as isize;
        let kf = (lon / (TAU / nk as f64)).floor() as isize;
        let last = self.points.len() - 1;
        let mut best = self.points[0];
        let mut best_dot = f64::NEG_INFINITY;
        let mut consider = |i: usize| {
            let p = self.points[i];
            let d = p.dot(dir);
            if d > best_dot {
                best = p;
                best_dot = d;
            }
        };
        for j in jf - 1..=jf + 2 {
            if j <= 0 {
                consider(0);
            } else if j >= nj {
                consider(last);
            } else {
                for k in kf..=kf + 1 {
                    consider(1 + ((j - 1) * nk + k.rem_euclid(nk)) as usize);
                }
            }
        }
        best
    }
}

impl EllipsoidHull {
    fn local_aabb(&self) -> Aabb {
        Aabb::new(-self.semi_axes, self.semi_axes)
    }

    fn bounding_sphere(&self) -> BoundingSphere {
        BoundingSphere::new(Vector::ZERO, self.semi_axes.max_element())
    }

    fn scaled(&self, scale: Vector) -> Option<Self> {
        Self::new(self.semi_axes * scale.abs())
    }

    /// From the hull's facets, built here on demand.
    fn mass(&self, density: f64) -> MassProperties {
        match ConvexPolyhedron::from_convex_hull(&self.points) {
            Some(poly) => poly.mass_properties(density),
            None => MassProperties::new(Vector::ZERO, 0.0, Vector::ZERO),
        }
    }
}

super::point_hull::support_map_shape!(EllipsoidHull);

#[cfg(test)]
mod tests {
    use super::*;
    use parry3d_f64::math::Pose;
    use parry3d_f64::query;
    use parry3d_f64::shape::{Ball, SharedShape};

    /// The windowed support equals the full scan of the hull's points for 20 000 spread
    /// directions (a Fibonacci sphere, plus the axes and near-pole directions) on three
    /// ellipsoids; contact distances and the volume equal those of parry's own convex
    /// hull of the same points.
    #[test]
    fn windowed_support_equals_the_full_scan() {
        for s in [Vector::splat(0.02), Vector::new(0.0285, 0.022, 0.022), Vector::new(0.01, 0.04, 0.025)] {
            let e = EllipsoidHull::new(s).unwrap();
            let mut dirs: Vec<Vector> = (0..20_000)
                .map(|i| {
                    let z = 1.0 - (2 * i + 1) as f64 / 20_000.0;
                    let phi = i as f64 * 2.399_963_229_728_653;
                    Vector::new((1.0 - z * z).sqrt() * phi.cos(), (1.0 - z * z).sqrt() * phi.sin(), z)
                })
                .collect();
            dirs.extend([Vector::X, -Vector::X, Vector::Y, -Vector::Y, Vector::Z, -Vector::Z]);
            dirs.extend([Vector::new(1e-9, 2e-9, 1.0), Vector::new(-3e-4, 1e-4, -1.0)]);
            for d in dirs {
                let w = e.local_support_point(d);
                let scan = e.support_by_scan(d);
                assert!(w.dot(d) >= scan.dot(d) - 1e-15 * s.max_element(), "{d:?}: {w:?} vs {scan:?}");
            }
            let ours = SharedShape::new(e.clone());
            let hull = SharedShape::convex_hull(e.points()).unwrap();
            let rel = (ours.mass_properties(1.0).mass() / hull.mass_properties(1.0).mass() - 1.0).abs();
            assert!(rel < 1e-12);
            let ball = Ball::new(0.01);
            for centre in [
                Vector::new(0.03, 0.025, 0.01),
                Vector::new(-0.01, 0.02, -0.035),
                Vector::new(0.0, 0.0, 0.05),
            ] {
                let at = Pose::from_translation(centre);
                let a = query::contact(&Pose::IDENTITY, ours.as_ref(), &at, &ball, 0.2).unwrap().unwrap();
                let b = query::contact(&Pose::IDENTITY, hull.as_ref(), &at, &ball, 0.2).unwrap().unwrap();
                assert!((a.dist - b.dist).abs() < 1e-12, "{} vs {}", a.dist, b.dist);
            }
        }
        assert!(EllipsoidHull::new(Vector::new(0.01, 0.0, 0.01)).is_none());
    }
}

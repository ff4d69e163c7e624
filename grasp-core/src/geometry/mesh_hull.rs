//! The convex hull of a mesh object as a parry shape whose support function climbs the
//! hull's vertex graph instead of scanning every vertex.
//!
//! A linear function over a convex polytope has no local maximum on the vertex graph
//! other than the global one (the fact the simplex method rests on; e.g. Ziegler,
//! "Lectures on Polytopes", 1995, ch. 3), so moving to a strictly better neighbour until
//! none is better ends at the farthest vertex. Each climb starts from the best of 14
//! precomputed vertices (the farthest along the axes and the diagonals), so it takes a
//! few steps; the start depends only on the direction, so the answer is the same
//! whichever thread asks (deterministic output). The test compares it with the full scan.

use parry3d_f64::bounding_volume::{Aabb, BoundingSphere};
use parry3d_f64::mass_properties::MassProperties;
use parry3d_f64::math::Vector;
use parry3d_f64::shape::{ConvexPolyhedron, Shape, SupportMap};

/// The convex hull of a point set with its vertex adjacency (local coordinates).
#[derive(Debug, Clone)]
pub struct MeshHull {
    points: Vec<Vector>,
    /// Neighbours of vertex `i`: `neighbours[offsets[i]..offsets[i + 1]]`.
    offsets: Vec<usize>,
    neighbours: Vec<u32>,
    /// Start directions and their farthest vertices.
    starts: Vec<(Vector, u32)>,
    aabb: Aabb,
    /// The facets, for mass properties.
    polyhedron: ConvexPolyhedron,
}

impl MeshHull {
    /// The hull of `points` (quickhull, parry's); `None` if it cannot be built or spans no
    /// volume.
    pub fn new(points: &[Vector]) -> Option<Self> {
        let poly = ConvexPolyhedron::from_convex_hull(points)?;
        let (vertices, triangles) = poly.to_trimesh();
        if vertices.len() < 4 || !(poly.mass_properties(1.0).mass() > 0.0) {
            return None;
        }
        let mut adjacency: Vec<Vec<u32>> = vec![Vec::new(); vertices.len()];
        for t in &triangles {
            for (a, b) in [(t[0], t[1]), (t[1], t[2]), (t[2], t[0])] {
                adjacency[a as usize].push(b);
                adjacency[b as usize].push(a);
            }
        }
        let mut offsets = Vec::with_capacity(vertices.len() + 1);
        let mut neighbours = Vec::new();
        offsets.push(0);
        for mut adj in adjacency {
            adj.sort_unstable();
            adj.dedup();
            neighbours.extend(adj);
            offsets.push(neighbours.len());
        }
        let scan = |d: Vector| {
            let mut best = 0;
            for (i, p) in vertices.iter().enumerate() {
                if p.dot(d) > vertices[best].dot(d) {
                    best = i;
                }
            }
            best as u32
        };
        let mut starts = Vec::with_capacity(14);
        for d in [Vector::X, Vector::Y, Vector::Z] {
            starts.push((d, scan(d)));
            starts.push((-d, scan(-d)));
        }
        for sx in [-1.0, 1.0] {
            for sy in [-1.0, 1.0] {
                for sz in [-1.0, 1.0] {
                    let d = Vector::new(sx, sy, sz).normalize();
                    starts.push((d, scan(d)));
                }
            }
        }
        let aabb = Aabb::from_points(vertices.iter().copied());
        Some(Self { points: vertices, offsets, neighbours, starts, aabb, polyhedron: poly })
    }

    /// The hull's vertices.
    pub fn points(&self) -> &[Vector] {
        &self.points
    }

    /// The farthest vertex along `dir` by scanning every vertex (the reference).
    pub fn support_by_scan(&self, dir: Vector) -> Vector {
        let mut best = self.points[0];
        for p in &self.points[1..] {
            if p.dot(dir) > best.dot(dir) {
                best = *p;
            }
        }
        best
    }

    fn local_aabb(&self) -> Aabb {
        self.aabb
    }

    fn bounding_sphere(&self) -> BoundingSphere {
        super::point_hull::sphere_around(&self.aabb, &self.points)
    }

    fn scaled(&self, scale: Vector) -> Option<Self> {
        let pts: Vec<Vector> = self.points.iter().map(|p| *p * scale).collect();
        Self::new(&pts)
    }

    fn mass(&self, density: f64) -> MassProperties {
        self.polyhedron.mass_properties(density)
    }
}

impl SupportMap for MeshHull {
    fn local_support_point(&self, dir: Vector) -> Vector {
        let mut best = self.starts[0].1 as usize;
        let mut best_start = self.starts[0].0.dot(dir);
        for &(d, v) in &self.starts[1..] {
            let a = d.dot(dir);
            if a > best_start {
                best_start = a;
                best = v as usize;
            }
        }
        let mut value = self.points[best].dot(dir);
        // each move strictly increases the value: at most one visit per vertex
        for _ in 0..self.points.len() {
            let mut moved = false;
            for &n in &self.neighbours[self.offsets[best]..self.offsets[best + 1]] {
                let v = self.points[n as usize].dot(dir);
                if v > value {
                    value = v;
                    best = n as usize;
                    moved = true;
                }
            }
            if !moved {
                break;
            }
        }
        self.points[best]
    }
}

super::point_hull::support_map_shape!(MeshHull);

#[cfg(test)]
mod tests {
    use super::*;
    use parry3d_f64::math::Pose;
    use parry3d_f64::query;
    use parry3d_f64::shape::{Ball, SharedShape};

    /// A lumpy closed point cloud (a sphere with bumps and dents, 2000 points, many of
    /// them inside the hull): the climbing support reaches the scan's value for 20 000
    /// spread directions, and volume and contact distances equal those of parry's own
    /// convex polyhedron of the same points.
    #[test]
    fn climbing_support_equals_the_full_scan() {
        let pts: Vec<Vector> = (0..2000)
            .map(|i| {
                let z = 1.0 - (2 * i + 1) as f64 / 2000.0;
                let phi = i as f64 * 2.399_963_229_728_653;
                let r =
                    0.03 * (1.0 + 0.15 * (5.0 * phi).sin() * (3.0 * z).cos() + 0.05 * (i % 7) as f64 / 7.0);
                r * Vector::new((1.0 - z * z).sqrt() * phi.cos(), (1.0 - z * z).sqrt() * phi.sin(), z)
            })
            .collect();
        let hull = MeshHull::new(&pts).unwrap();
        for i in 0..20_000 {
            let z = 1.0 - (2 * i + 1) as f64 / 20_000.0;
            let phi = i as f64 * 2.399_963_229_728_653 + 0.1;
            let d = Vector::new((1.0 - z * z).sqrt() * phi.cos(), (1.0 - z * z).sqrt() * phi.sin(), z);
            let a = hull.local_support_point(d).dot(d);
            let b = hull.support_by_scan(d).dot(d);
            assert!(a >= b - 1e-15, "{d:?}: {a} < {b}");
        }
        let ours = SharedShape::new(hull);
        let theirs = SharedShape::convex_hull(&pts).unwrap();
        let rel = (ours.mass_properties(1.0).mass() / theirs.mass_properties(1.0).mass() - 1.0).abs();
        assert!(rel < 1e-12);
        let ball = Ball::new(0.01);
        for centre in
            [Vector::new(0.03, 0.025, 0.01), Vector::new(-0.01, 0.02, -0.045), Vector::new(0.0, 0.0, 0.04)]
        {
            let at = Pose::from_translation(centre);
            let a = query::contact(&Pose::IDENTITY, ours.as_ref(), &at, &ball, 0.2).unwrap().unwrap();
            let b = query::contact(&Pose::IDENTITY, theirs.as_ref(), &at, &ball, 0.2).unwrap().unwrap();
            assert!((a.dist - b.dist).abs() < 1e-12, "{} vs {}", a.dist, b.dist);
        }
        assert!(MeshHull::new(&[Vector::ZERO, Vector::X, Vector::Y]).is_none());
    }
}

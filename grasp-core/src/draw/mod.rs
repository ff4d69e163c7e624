//! Drawing geometry: triangle surfaces of the palm, the fingers (bent as solved) with
//! their fiber winding, every object shape and contact-force arrows, for a renderer.
//!
//! Nothing here computes physics: the surfaces are built from what the rest of the core
//! returns (a solved rod's angles, a finger's frame, a scene's shapes, a check's
//! contacts). A renderer only copies them into its own mesh type.
//!
//! Responsibilities, one concept per file:
//! - [`shapes`]: objects (sphere, box, cylinder, capsule, ellipsoid, mesh), the palm and
//!   arrows.
//! - [`finger`]: a finger's outer section swept along its reference line, and the double
//!   helix of its fiber as thin ribbons lying on that surface.
//!
//! # Coordinate systems
//! Every surface is in the gripper frame of DESIGN 2 (origin at the centre of the palm's
//! lower face, `+z` up), in metres. Triangles wind counter-clockwise seen from outside, so
//! `(b - a) × (c - a)` points out of the body, and vertex normals point outward: a closed
//! surface has a positive [`Surface::signed_volume`] equal to the volume it bounds.

pub mod finger;
pub mod shapes;

pub use finger::{fiber_ribbons, finger_surface};
pub use shapes::{arrow, object_surface, palm_surface};

use crate::math::Vec3;

/// A triangle surface: positions and outward unit normals per vertex, and triangles as
/// index triples (counter-clockwise seen from outside).
#[derive(Debug, Clone, Default, PartialEq)]
pub struct Surface {
    /// Vertex positions (m, gripper frame).
    pub positions: Vec<Vec3>,
    /// Outward unit normal of each vertex.
    pub normals: Vec<Vec3>,
    /// Triangles, three vertex indices each.
    pub indices: Vec<u32>,
}

impl Surface {
    /// Number of triangles.
    pub fn triangles(&self) -> usize {
        self.indices.len() / 3
    }

    /// The volume enclosed, by the divergence theorem: `sum (a · (b × c)) / 6` over the
    /// triangles (m³). Positive for a closed surface wound outward; for an open one the
    /// value depends on the origin and means nothing.
    pub fn signed_volume(&self) -> f64 {
        self.indices
            .chunks_exact(3)
            .map(|t| {
                let [a, b, c] = [0, 1, 2].map(|k| self.positions[t[k] as usize]);
                a.dot(b.cross(c)) / 6.0
            })
            .sum()
    }

    /// Appends `other` (indices shifted).
    pub fn append(&mut self, other: &Surface) {
        let base = self.positions.len() as u32;
        self.positions.extend_from_slice(&other.positions);
        self.normals.extend_from_slice(&other.normals);
        self.indices.extend(other.indices.iter().map(|i| i + base));
    }

    /// The surface moved by `offset` (m).
    pub fn translated(mut self, offset: Vec3) -> Self {
        for p in &mut self.positions {
            *p += offset;
        }
        self
    }

    /// Smallest and largest corner of the box around the vertices (m); `None` if empty.
    pub fn bounds(&self) -> Option<(Vec3, Vec3)> {
        let first = *self.positions.first()?;
        Some(self.positions.iter().fold((first, first), |(lo, hi), p| (lo.min(*p), hi.max(*p))))
    }

    fn vertex(&mut self, p: Vec3, n: Vec3) -> u32 {
        self.positions.push(p);
        self.normals.push(n);
        (self.positions.len() - 1) as u32
    }

    /// A flat triangle `a, b, c` (counter-clockwise from outside) with its face normal.
    fn flat_triangle(&mut self, a: Vec3, b: Vec3, c: Vec3) {
        let n = (b - a).cross(c - a).normalize_or_zero();
        let i = self.vertex(a, n);
        self.vertex(b, n);
        self.vertex(c, n);
        self.indices.extend([i, i + 1, i + 2]);
    }

    /// A flat quad `a, b, c, d` (counter-clockwise from outside) as two triangles.
    fn flat_quad(&mut self, a: Vec3, b: Vec3, c: Vec3, d: Vec3) {
        self.flat_triangle(a, b, c);
        self.flat_triangle(a, c, d);
    }

    /// A smooth grid of `rows x cols` vertices (row-major, each with its normal), joined
    /// into quads between neighbouring rows and columns; `wrap` joins the last column to
    /// the first. Counter-clockwise from outside when the rows advance along `d/dv` and
    /// the columns along `d/du` with `d/du × d/dv` outward.
    fn grid(&mut self, rows: usize, cols: usize, wrap: bool, points: impl Fn(usize, usize) -> (Vec3, Vec3)) {
        let base = self.positions.len() as u32;
        for r in 0..rows {
            for c in 0..cols {
                let (p, n) = points(r, c);
                self.vertex(p, n);
            }
        }
        let at = |r: usize, c: usize| base + (r * cols + c % cols) as u32;
        let last_col = if wrap { cols } else { cols - 1 };
        for r in 0..rows - 1 {
            for c in 0..last_col {
                let (a, b, cc, d) = (at(r, c), at(r, c + 1), at(r + 1, c + 1), at(r + 1, c));
                self.indices.extend([a, b, cc, a, cc, d]);
            }
        }
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use approx::assert_relative_eq;

    #[test]
    fn a_reversed_surface_has_the_negative_volume() {
        // the unit tetrahedron (volume 1/6), wound outward, then reversed
        let (o, x, y, z) = (Vec3::ZERO, Vec3::X, Vec3::Y, Vec3::Z);
        let mut s = Surface::default();
        s.flat_triangle(o, y, x);
        s.flat_triangle(o, x, z);
        s.flat_triangle(o, z, y);
        s.flat_triangle(x, y, z);
        assert_relative_eq!(s.signed_volume(), 1.0 / 6.0, epsilon = 1e-15);
        // shifting the origin does not change the volume of a closed surface
        assert_relative_eq!(
            s.clone().translated(Vec3::new(3.0, -2.0, 7.0)).signed_volume(),
            1.0 / 6.0,
            epsilon = 1e-12
        );
        for t in s.indices.chunks_exact_mut(3) {
            t.swap(1, 2);
        }
        assert_relative_eq!(s.signed_volume(), -1.0 / 6.0, epsilon = 1e-15);
    }
}

//! Surfaces of the object shapes, the palm and contact-force arrows.
//!
//! Round shapes are surfaces of revolution ([`revolve`]): a meridian profile of
//! `(radius, height)` rows with their normals, turned about an axis in [`SEGMENTS`]
//! steps. The sphere, the capsule's caps and the ellipsoid use [`LATITUDE_BANDS`]
//! bands; their polygons are inscribed in the true surface, so the enclosed volume is a
//! little smaller (under 1 % at these counts). Boxes and meshes are flat-shaded.
//!
//! Shapes sit in the object frame of [`crate::geometry::ObjectGeometry`]: centred on
//! the object's position, not rotated; cylinders and capsules have their axis on `z`.

use super::Surface;
use crate::math::Vec3;
use crate::scene::{ObjectShape, Palm, TriangleMesh};
use std::f64::consts::{FRAC_PI_2, PI, TAU};

/// Steps around every surface of revolution.
pub const SEGMENTS: usize = 48;
/// Latitude bands of spheres and ellipsoids (half of them on a capsule cap).
pub const LATITUDE_BANDS: usize = 24;

/// One meridian row of a surface of revolution: radius from the axis and height along
/// it (m), and the outward normal in the meridian plane as `(radial, axial)` parts.
#[derive(Debug, Clone, Copy)]
struct Row {
    r: f64,
    z: f64,
    n_r: f64,
    n_z: f64,
}

/// The rows of a sphere of radius `radius` whose lower half is shifted by `-half_gap`
/// and upper half by `+half_gap` along the axis (a capsule; 0 gives the sphere).
fn sphere_rows(radius: f64, half_gap: f64) -> Vec<Row> {
    let mut rows = Vec::with_capacity(LATITUDE_BANDS + 2);
    for j in 0..=LATITUDE_BANDS {
        let lat = -FRAC_PI_2 + PI * j as f64 / LATITUDE_BANDS as f64;
        let (s, c) = lat.sin_cos();
        let row = |shift: f64| Row { r: radius * c, z: radius * s + shift, n_r: c, n_z: s };
        if 2 * j == LATITUDE_BANDS {
            // the equator twice, once per half: the band between is the capsule's side
            rows.push(row(-half_gap));
            rows.push(row(half_gap));
        } else {
            rows.push(row(if 2 * j < LATITUDE_BANDS { -half_gap } else { half_gap }));
        }
    }
    rows
}

/// The rows of a closed cylinder of radius `r` from height `z0` to `z1` (flat caps with
/// sharp edges: the edge rows are doubled with the two normals).
fn cylinder_rows(r: f64, z0: f64, z1: f64) -> Vec<Row> {
    vec![
        Row { r: 0.0, z: z0, n_r: 0.0, n_z: -1.0 },
        Row { r, z: z0, n_r: 0.0, n_z: -1.0 },
        Row { r, z: z0, n_r: 1.0, n_z: 0.0 },
        Row { r, z: z1, n_r: 1.0, n_z: 0.0 },
        Row { r, z: z1, n_r: 0.0, n_z: 1.0 },
        Row { r: 0.0, z: z1, n_r: 0.0, n_z: 1.0 },
    ]
}

/// Turns `rows` (bottom to top, first and last on the axis for a closed surface) about
/// `axis` through `origin`; `e1 × e2 = axis`, all unit vectors.
fn revolve(rows: &[Row], origin: Vec3, [e1, e2, axis]: [Vec3; 3]) -> Surface {
    let mut s = Surface::default();
    s.grid(rows.len(), SEGMENTS, true, |i, k| {
        let th = TAU * k as f64 / SEGMENTS as f64;
        let radial = th.cos() * e1 + th.sin() * e2;
        let row = rows[i];
        (origin + row.r * radial + row.z * axis, (row.n_r * radial + row.n_z * axis).normalize())
    });
    s
}

const Z_BASIS: [Vec3; 3] = [Vec3::X, Vec3::Y, Vec3::Z];

/// A sphere of radius `radius` (m) about the origin.
pub fn sphere(radius: f64) -> Surface {
    revolve(&sphere_rows(radius, 0.0), Vec3::ZERO, Z_BASIS)
}

/// A closed cylinder of radius `radius` and height `height` (m), axis `z`, centred.
pub fn cylinder(radius: f64, height: f64) -> Surface {
    revolve(&cylinder_rows(radius, -0.5 * height, 0.5 * height), Vec3::ZERO, Z_BASIS)
}

/// A capsule: the segment of length `length` on the `z` axis (centred) swept by a ball
/// of radius `radius` (m), as the scene's `Capsule`.
pub fn capsule(radius: f64, length: f64) -> Surface {
    revolve(&sphere_rows(radius, 0.5 * length), Vec3::ZERO, Z_BASIS)
}

/// An ellipsoid with semi-axes `semi_axes` along `x, y, z` (m): the unit sphere mapped by
/// `diag(semi_axes)`, normals by the inverse transpose.
pub fn ellipsoid(semi_axes: Vec3) -> Surface {
    let mut s = sphere(1.0);
    for (p, n) in s.positions.iter_mut().zip(&mut s.normals) {
        *p *= semi_axes;
        *n = (*n / semi_axes).normalize();
    }
    s
}

/// A box of edge lengths `size` (m), centred, flat faces.
pub fn cuboid(size: Vec3) -> Surface {
    let h = 0.5 * size;
    let axes = [Vec3::X, Vec3::Y, Vec3::Z];
    let mut s = Surface::default();
    for i in 0..3 {
        let (a, b, c) = (axes[i], axes[(i + 1) % 3], axes[(i + 2) % 3]);
        // b × c = a: counter-clockwise seen from +a; swapped for the -a face
        for (sign, u, v) in [(1.0, b, c), (-1.0, c, b)] {
            let centre = sign * a * h;
            let (u, v) = (u * h, v * h);
            s.flat_quad(centre - u - v, centre + u - v, centre + u + v, centre - u + v);
        }
    }
    s
}

/// A triangle mesh as given (object frame, m), flat-shaded. The scene loader accepts
/// only closed meshes; their triangles are taken as wound outward.
pub fn mesh(mesh: &TriangleMesh) -> Surface {
    let mut s = Surface::default();
    for t in &mesh.triangles {
        let [a, b, c] = t.map(|i| mesh.vertices.get(i as usize).copied().unwrap_or(Vec3::ZERO));
        s.flat_triangle(a, b, c);
    }
    s
}

/// The surface of an object shape in its object frame (centred on the object's
/// position; see the module doc).
pub fn object_shape_surface(shape: &ObjectShape) -> Surface {
    match shape {
        ObjectShape::Sphere { radius } => sphere(*radius),
        ObjectShape::Box { size } => cuboid(*size),
        ObjectShape::Cylinder { radius, height } => cylinder(*radius, *height),
        ObjectShape::Capsule { radius, length } => capsule(*radius, *length),
        ObjectShape::Ellipsoid { semi_axes } => ellipsoid(*semi_axes),
        ObjectShape::Mesh { mesh: m, .. } => mesh(m),
    }
}

/// The surface of a scene object at its position (gripper frame, m).
pub fn object_surface(object: &crate::scene::TargetObject) -> Surface {
    object_shape_surface(&object.shape).translated(object.position)
}

/// The palm: a `Disk` is the cylinder from `z = 0` to `z = thickness` of
/// [`crate::geometry::palm_body`] (gripper frame, m).
pub fn palm_surface(palm: &Palm) -> Surface {
    match *palm {
        Palm::Disk { radius, thickness } => {
            revolve(&cylinder_rows(radius, 0.0, thickness), Vec3::ZERO, Z_BASIS)
        }
    }
}

/// An arrow from `tail` to `tip` (m): a shaft of radius `radius` and a cone head of
/// twice that radius, `min(6 radius, 0.4 length)` long, ending at `tip`. Empty if the
/// two points coincide.
pub fn arrow(tail: Vec3, tip: Vec3, radius: f64) -> Surface {
    let d = tip - tail;
    let len = d.length();
    if !(len > 0.0 && radius > 0.0) {
        return Surface::default();
    }
    let axis = d / len;
    let e1 = axis.any_orthonormal_vector();
    let e2 = axis.cross(e1);
    let head = (6.0 * radius).min(0.4 * len);
    let neck = len - head;
    let rh = 2.0 * radius;
    // the cone's side normal: (head, rh) normalised in (radial, axial)
    let (cr, cz) = (head / head.hypot(rh), rh / head.hypot(rh));
    let rows = [
        Row { r: 0.0, z: 0.0, n_r: 0.0, n_z: -1.0 },
        Row { r: radius, z: 0.0, n_r: 0.0, n_z: -1.0 },
        Row { r: radius, z: 0.0, n_r: 1.0, n_z: 0.0 },
        Row { r: radius, z: neck, n_r: 1.0, n_z: 0.0 },
        Row { r: radius, z: neck, n_r: 0.0, n_z: -1.0 },
        Row { r: rh, z: neck, n_r: 0.0, n_z: -1.0 },
        Row { r: rh, z: neck, n_r: cr, n_z: cz },
        Row { r: 0.0, z: len, n_r: cr, n_z: cz },
    ];
    revolve(&rows, tail, [e1, e2, axis])
}

#[cfg(test)]
mod tests {
    use super::*;
    use approx::assert_relative_eq;

    /// Area factor of the regular `n`-gon inscribed in the unit circle against the
    /// circle: `n sin(2 pi / n) / (2 pi)` (elementary geometry).
    fn polygon_factor() -> f64 {
        let n = SEGMENTS as f64;
        n * (TAU / n).sin() / TAU
    }

    /// Every vertex normal points away from `centre` along the surface's outward side:
    /// for the convex shapes here, `n · (p - centre) > 0`.
    fn normals_point_outward(s: &Surface, centre: Vec3) {
        for (p, n) in s.positions.iter().zip(&s.normals) {
            assert_relative_eq!(n.length(), 1.0, epsilon = 1e-12);
            assert!(n.dot(*p - centre) > 0.0, "normal {n} at {p} points inward");
        }
        // and the face normals agree with the vertex normals of their corners
        for t in s.indices.chunks_exact(3) {
            let [a, b, c] = [0, 1, 2].map(|k| s.positions[t[k] as usize]);
            let face = (b - a).cross(c - a);
            if face.length() < 1e-18 {
                continue; // the zero-area triangles at a pole
            }
            let n = s.normals[t[0] as usize] + s.normals[t[1] as usize] + s.normals[t[2] as usize];
            assert!(face.dot(n) > 0.0, "triangle {t:?} is wound inward");
        }
    }

    #[test]
    fn cylinder_volume_is_the_prism_on_the_inscribed_polygon() {
        // exact for the polygonal prism; within the polygon factor of pi r^2 h
        let (r, h) = (0.02, 0.06);
        let s = cylinder(r, h);
        assert_relative_eq!(s.signed_volume(), polygon_factor() * PI * r * r * h, max_relative = 1e-12);
        assert_relative_eq!(s.signed_volume(), PI * r * r * h, max_relative = 3e-3);
        normals_point_outward(&s, Vec3::ZERO);
        let palm = palm_surface(&Palm::Disk { radius: 0.035, thickness: 0.01 });
        assert_relative_eq!(
            palm.signed_volume(),
            polygon_factor() * PI * 0.035 * 0.035 * 0.01,
            max_relative = 1e-12
        );
        let (lo, hi) = palm.bounds().unwrap();
        assert_relative_eq!(lo.z, 0.0);
        assert_relative_eq!(hi.z, 0.01);
    }

    #[test]
    fn box_volume_and_normals_are_exact() {
        let size = Vec3::new(0.04, 0.03, 0.02);
        let s = cuboid(size);
        assert_relative_eq!(s.signed_volume(), size.x * size.y * size.z, max_relative = 1e-12);
        normals_point_outward(&s, Vec3::ZERO);
        // moving the box does not change its volume (closed surface)
        let moved = s.translated(Vec3::new(0.1, -0.2, -0.07));
        assert_relative_eq!(moved.signed_volume(), size.x * size.y * size.z, max_relative = 1e-9);
    }

    #[test]
    fn round_shapes_enclose_their_closed_form_volume_from_inside() {
        // closed forms: sphere 4/3 pi r^3, capsule pi r^2 l + 4/3 pi r^3, ellipsoid
        // 4/3 pi abc; the inscribed polygons stay below by less than 1 %
        let r = 0.025;
        let cases = [
            (sphere(r), 4.0 / 3.0 * PI * r.powi(3)),
            (capsule(0.015, 0.04), PI * 0.015f64.powi(2) * 0.04 + 4.0 / 3.0 * PI * 0.015f64.powi(3)),
            (ellipsoid(Vec3::new(0.03, 0.022, 0.018)), 4.0 / 3.0 * PI * 0.03 * 0.022 * 0.018),
        ];
        for (s, exact) in cases {
            let v = s.signed_volume();
            assert!(v < exact && v > 0.99 * exact, "volume {v} against {exact}");
            normals_point_outward(&s, Vec3::ZERO);
        }
    }

    #[test]
    fn capsule_spans_its_length_plus_two_radii() {
        let (lo, hi) = capsule(0.015, 0.04).bounds().unwrap();
        assert_relative_eq!(hi.z - lo.z, 0.04 + 0.03, epsilon = 1e-12);
        assert_relative_eq!(hi.x, 0.015, epsilon = 1e-12);
    }

    #[test]
    fn a_closed_mesh_keeps_its_volume() {
        // a regular octahedron with vertices at distance a: volume 4/3 a^3
        let a = 0.02;
        let v = vec![
            Vec3::new(a, 0.0, 0.0),
            Vec3::new(-a, 0.0, 0.0),
            Vec3::new(0.0, a, 0.0),
            Vec3::new(0.0, -a, 0.0),
            Vec3::new(0.0, 0.0, a),
            Vec3::new(0.0, 0.0, -a),
        ];
        let t = vec![[0, 2, 4], [2, 1, 4], [1, 3, 4], [3, 0, 4], [2, 0, 5], [1, 2, 5], [3, 1, 5], [0, 3, 5]];
        let s = mesh(&TriangleMesh { vertices: v, triangles: t });
        assert_relative_eq!(s.signed_volume(), 4.0 / 3.0 * a.powi(3), max_relative = 1e-12);
        normals_point_outward(&s, Vec3::ZERO);
    }

    #[test]
    fn arrow_ends_at_its_tip_and_encloses_shaft_and_cone() {
        let (tail, tip, r) = (Vec3::new(0.01, 0.0, -0.05), Vec3::new(0.01, 0.03, -0.05), 0.001);
        let s = arrow(tail, tip, r);
        let far = s.positions.iter().map(|p| (*p - tail).dot(Vec3::Y)).fold(f64::MIN, f64::max);
        assert_relative_eq!(far, 0.03, epsilon = 1e-12);
        // polygonal shaft (cylinder) and head (cone, a third of its prism)
        let head = (6.0 * r).min(0.4 * 0.03);
        let exact = polygon_factor() * PI * (r * r * (0.03 - head) + (2.0 * r).powi(2) * head / 3.0);
        assert_relative_eq!(s.signed_volume(), exact, max_relative = 1e-9);
        assert!(arrow(tail, tail, r).positions.is_empty());
    }
}

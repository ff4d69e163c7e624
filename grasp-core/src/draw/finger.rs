//! A finger as drawn: its outer section swept along the solved reference line, and the
//! double helix of its fiber on that surface.
//!
//! The section outline is [`section_outline`] (the one the contact body uses). Every
//! outline point `(x, y)` at arc length `s` is placed exactly where the rod puts the
//! material point `(s, y)` ([`Rod::position`]), `x` along the frame's lateral axis, so
//! the surface follows the solved angles element by element. Chamber elements are
//! sampled [`SUBSTEPS`] times; the straight base and tip cap once. Faces are flat (the
//! `Box` outline has sharp edges); the ends are closed by flat caps, so the surface is
//! closed and its volume is that of the swept section (Pappus).
//!
//! The fiber: two helices of the actuator's pitch, wound in opposite directions around
//! the outline over the chamber (the base and tip are not wound), each drawn as a ribbon
//! of the fiber's width lying [`FIBER_LIFT`] outside the surface. The ribbon's width is
//! taken along the finger's axis, which is close to across the thread when the pitch is
//! small against the perimeter.

use super::Surface;
use crate::actuator::Fiber;
use crate::geometry::finger_body::section_outline;
use crate::geometry::{FingerFrame, GeometryError};
use crate::math::{Vec2, Vec3};
use crate::rod::{MaterialPoint, Rod};
use crate::section::SectionProfile;

/// Samples per chamber element along the reference line.
pub const SUBSTEPS: usize = 2;
/// Height of the fiber ribbons above the finger's surface (m): 0.3 mm, enough to stay
/// in front of the surface in a depth buffer.
pub const FIBER_LIFT: f64 = 3e-4;
/// Samples per helix turn between the outline's corners (at least).
const SAMPLES_PER_TURN: usize = 32;

/// The arc lengths of the rings: clamp, chamber start, the element sub-samples, the
/// chamber end and the tip end (m), without repeats.
fn ring_positions(rod: &Rod) -> Vec<f64> {
    let b = rod.base_length;
    let h = rod.element_length();
    let mut s = vec![0.0];
    if b > 0.0 {
        s.push(b);
    }
    for i in 0..rod.elements {
        for k in 1..=SUBSTEPS {
            s.push(if i + 1 == rod.elements && k == SUBSTEPS {
                b + rod.chamber_length
            } else {
                b + h * (i as f64 + k as f64 / SUBSTEPS as f64)
            });
        }
    }
    if rod.tip_length > 0.0 {
        s.push(rod.length());
    }
    s
}

fn check_angles(rod: &Rod, angles: &[f64]) -> Result<(), GeometryError> {
    if angles.len() != rod.elements {
        return Err(GeometryError::AngleCount { got: angles.len(), expected: rod.elements });
    }
    for &a in angles {
        crate::geometry::finite("finger angle", a)?;
    }
    Ok(())
}

/// The gripper-frame point of section point `q = (x, y)` at arc length `s` (m).
fn place(rod: &Rod, angles: &[f64], frame: &FingerFrame, s: f64, q: Vec2) -> Vec3 {
    // `s` is on the rod by construction, so `position` cannot refuse it
    let p = rod.position(angles, MaterialPoint { s: s.min(rod.length()), y: q.y }).unwrap_or(Vec2::ZERO);
    frame.to_world_offset(p, q.x)
}

/// The closed surface of a finger with rod geometry `rod` at element-end tangent angles
/// `angles` (rad, as solved), section `section`, mounted at `frame` (gripper frame, m).
///
/// # Errors
/// `angles` of the wrong length or not finite.
pub fn finger_surface(
    rod: &Rod,
    angles: &[f64],
    section: &SectionProfile,
    frame: &FingerFrame,
) -> Result<Surface, GeometryError> {
    check_angles(rod, angles)?;
    let outline = section_outline(section);
    let rings: Vec<Vec<Vec3>> = ring_positions(rod)
        .into_iter()
        .map(|s| outline.iter().map(|q| place(rod, angles, frame, s, *q)).collect())
        .collect();
    let n = outline.len();
    let mut out = Surface::default();
    // with the outline counter-clockwise in (x, y), x × y points back along the line, so
    // (ring k, ring k+1) in this order winds outward
    for w in rings.windows(2) {
        let (r0, r1) = (&w[0], &w[1]);
        for j in 0..n {
            let k = (j + 1) % n;
            out.flat_quad(r0[j], r1[j], r1[k], r0[k]);
        }
    }
    let cap = |ring: &Vec<Vec3>| ring.iter().copied().sum::<Vec3>() / n as f64;
    let (first, last) = (&rings[0], &rings[rings.len() - 1]);
    let (c0, c1) = (cap(first), cap(last));
    for j in 0..n {
        let k = (j + 1) % n;
        out.flat_triangle(c0, first[j], first[k]);
        out.flat_triangle(c1, last[k], last[j]);
    }
    Ok(out)
}

/// A point of the outline at perimeter distance `t` from its first vertex (counter-
/// clockwise, m), lifted by `lift` (m) along the outward normal (the corners' normal is
/// the mean of their two edges'): the point and the unit normal, section coordinates.
fn outline_at(outline: &[Vec2], t: f64, lift: f64) -> (Vec2, Vec2) {
    let n = outline.len();
    let edge_normal = |j: usize| {
        let d = (outline[(j + 1) % n] - outline[j]).normalize();
        Vec2::new(d.y, -d.x)
    };
    let mut rest = t;
    for j in 0..n {
        let (a, b) = (outline[j], outline[(j + 1) % n]);
        let len = (b - a).length();
        if rest <= len || j + 1 == n {
            let f = (rest / len).clamp(0.0, 1.0);
            let normal = if f <= 1e-9 {
                (edge_normal(j) + edge_normal((j + n - 1) % n)).normalize()
            } else if f >= 1.0 - 1e-9 {
                (edge_normal(j) + edge_normal((j + 1) % n)).normalize()
            } else {
                edge_normal(j)
            };
            return (a + f * (b - a) + lift * normal, normal);
        }
        rest -= len;
    }
    (outline[0], Vec2::ZERO)
}

/// The fiber of a finger as two ribbons (the double helix, wound in opposite
/// directions) on the chamber part of [`finger_surface`] (same inputs; gripper frame, m).
/// The ribbons are one-sided, facing outward.
///
/// # Errors
/// As [`finger_surface`], and a pitch or width that is not positive.
pub fn fiber_ribbons(
    rod: &Rod,
    angles: &[f64],
    section: &SectionProfile,
    frame: &FingerFrame,
    fiber: &Fiber,
) -> Result<Surface, GeometryError> {
    check_angles(rod, angles)?;
    let pitch = crate::geometry::positive("fiber pitch", fiber.pitch)?;
    let width = crate::geometry::positive("fiber width", fiber.width)?;
    let outline = section_outline(section);
    let n = outline.len();
    let perimeter: f64 = (0..n).map(|j| (outline[(j + 1) % n] - outline[j]).length()).sum();
    // the corners' perimeter distances, for samples that turn exactly there
    let mut corners = vec![0.0];
    for j in 0..n - 1 {
        corners.push(corners[j] + (outline[j + 1] - outline[j]).length());
    }
    let (s0, s1) = (rod.base_length, rod.base_length + rod.chamber_length);
    let turns = (s1 - s0) / pitch;
    let mut out = Surface::default();
    for sense in [1.0, -1.0] {
        // unwrapped perimeter distance d along the helix: s = s0 + pitch d / perimeter;
        // the reverse helix runs the outline backwards, t = -d (mod perimeter)
        let mut breaks: Vec<f64> =
            corners.iter().map(|&c| if sense > 0.0 { c } else { (perimeter - c) % perimeter }).collect();
        breaks.push(perimeter);
        breaks.sort_by(f64::total_cmp);
        breaks.dedup();
        let step = perimeter / SAMPLES_PER_TURN as f64;
        let mut ds = Vec::new();
        for m in 0..turns.ceil() as usize {
            for w in breaks.windows(2) {
                let k = ((w[1] - w[0]) / step).ceil().max(1.0) as usize;
                ds.extend((0..k).map(|i| m as f64 * perimeter + w[0] + (w[1] - w[0]) * i as f64 / k as f64));
            }
        }
        ds.retain(|&d| d < turns * perimeter);
        ds.push(turns * perimeter);
        let sample = |d: f64| {
            let t = (sense * d).rem_euclid(perimeter);
            let s = s0 + pitch * d / perimeter;
            let (q, normal) = outline_at(&outline, t, FIBER_LIFT);
            let lo = (s - 0.5 * width).max(s0);
            let hi = (s + 0.5 * width).min(s1);
            let outward = (place(rod, angles, frame, s, q + 1e-4 * normal) - place(rod, angles, frame, s, q))
                .normalize_or_zero();
            (place(rod, angles, frame, lo, q), place(rod, angles, frame, hi, q), outward)
        };
        let pts: Vec<(Vec3, Vec3, Vec3)> = ds.iter().map(|&d| sample(d)).collect();
        for w in pts.windows(2) {
            let ((a0, a1, n0), (b0, b1, n1)) = (w[0], w[1]);
            let toward = n0 + n1;
            for (p, q, r) in [(a0, b0, b1), (a0, b1, a1)] {
                if (q - p).cross(r - p).dot(toward) >= 0.0 {
                    out.flat_triangle(p, q, r);
                } else {
                    out.flat_triangle(p, r, q);
                }
            }
        }
    }
    Ok(out)
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::geometry::free_angles;
    use crate::section::BoxSection;
    use approx::assert_relative_eq;

    fn box_section() -> (BoxSection, SectionProfile) {
        let b = BoxSection {
            chamber_width: 0.012,
            chamber_height: 0.010,
            side_wall: 0.003,
            top_wall: 0.003,
            floor: 0.003,
            under_layer: 0.001,
        };
        (b, SectionProfile::Box(b))
    }

    fn rod() -> Rod {
        Rod::new(0.005, 0.09, 0.005, 40).unwrap()
    }

    #[test]
    fn straight_finger_is_a_prism_of_section_area_times_length() {
        let (b, section) = box_section();
        let rod = rod();
        let frame = FingerFrame::new(0.7, 0.03, 0.1).unwrap();
        let s = finger_surface(&rod, &vec![0.0; 40], &section, &frame).unwrap();
        let width = b.chamber_width + 2.0 * b.side_wall;
        let height = b.under_layer + b.floor + b.chamber_height + b.top_wall;
        assert_relative_eq!(s.signed_volume(), width * height * rod.length(), max_relative = 1e-9);
    }

    #[test]
    fn bent_finger_volume_follows_pappus() {
        // Pappus's second centroid theorem: a section swept along an arc encloses
        // A * (length of the arc its centroid travels) = A L (1 + kappa ybar) on the
        // chamber (the layer at y = 0 keeps its length), plus the straight base and tip
        let (b, section) = box_section();
        let rod = rod();
        let frame = FingerFrame::new(0.0, 0.03, 0.0).unwrap();
        let kappa = 12.0; // 1/m: a bend of about 62 degrees over 90 mm
        let s = finger_surface(&rod, &free_angles(&rod, kappa), &section, &frame).unwrap();
        let width = b.chamber_width + 2.0 * b.side_wall;
        let (bottom, top) = (-b.under_layer, b.floor + b.chamber_height + b.top_wall);
        let area = width * (top - bottom);
        let ybar = 0.5 * (top + bottom);
        let exact =
            area * (rod.base_length + rod.tip_length) + area * rod.chamber_length * (1.0 + kappa * ybar);
        // the chords of 80 sub-steps are within 1e-4 of the arcs' volume
        assert_relative_eq!(s.signed_volume(), exact, max_relative = 1e-4);
        // the tip of the layer is where the rod puts it
        let tip = frame.to_world(rod.position(&free_angles(&rod, kappa), rod.tip_point()).unwrap());
        let nearest = s.positions.iter().map(|p| (*p - tip).length()).fold(f64::MAX, f64::min);
        assert!(nearest < 0.5 * width + 1e-9, "no vertex near the tip: {nearest}");
    }

    #[test]
    fn half_round_finger_is_closed_and_outward() {
        let section = SectionProfile::HalfRound(crate::section::HalfRoundSection {
            radius: 0.006,
            wall: 0.002,
            floor: 0.002,
            under_layer: 0.001,
        });
        let rod = rod();
        let frame = FingerFrame::new(2.0, 0.025, 0.0).unwrap();
        let s = finger_surface(&rod, &vec![0.0; 40], &section, &frame).unwrap();
        // straight: area of the outline polygon (shoelace) times the length
        let o = section_outline(&section);
        let area: f64 = 0.5 * (0..o.len()).map(|j| o[j].perp_dot(o[(j + 1) % o.len()])).sum::<f64>();
        assert!(area > 0.0, "outline is not counter-clockwise");
        assert_relative_eq!(s.signed_volume(), area * rod.length(), max_relative = 1e-9);
    }

    #[test]
    fn fiber_ribbons_lie_just_outside_the_surface_and_face_out() {
        let (b, section) = box_section();
        let rod = rod();
        let frame = FingerFrame::new(0.0, 0.03, 0.0).unwrap();
        let fiber = Fiber { pitch: 0.004, width: 0.0015 };
        let r = fiber_ribbons(&rod, &vec![0.0; 40], &section, &frame, &fiber).unwrap();
        assert!(r.triangles() > 0);
        // the straight finger at azimuth 0 hangs along -z from (0.03, 0, 0): section
        // x (across) is world -y, section y (above the layer) is world +x
        let hw = 0.5 * (b.chamber_width + 2.0 * b.side_wall);
        let (bottom, top) = (-b.under_layer, b.floor + b.chamber_height + b.top_wall);
        let y_c = 0.5 * (top + bottom);
        for (p, n) in r.positions.iter().zip(&r.normals) {
            let w = -p.z;
            assert!((rod.base_length - 1e-12..=rod.base_length + rod.chamber_length + 1e-12).contains(&w));
            let (x, y) = (-p.y, p.x - 0.03);
            // distance outside the box outline: the lift on a face, lift/sqrt 2 per axis
            // on a corner's bisector
            let outside = (x.abs() - hw).max(y - top).max(bottom - y);
            assert!(
                outside > FIBER_LIFT / 2f64.sqrt() - 1e-9 && outside < FIBER_LIFT + 1e-9,
                "ribbon point {p} is {outside} m outside the surface"
            );
            let (nx, ny) = (-n.y, n.x);
            assert!(nx * x + ny * (y - y_c) > 0.0, "ribbon faces inward at {p}");
        }
        // both helices, at least SAMPLES_PER_TURN samples per turn each
        let turns = rod.chamber_length / fiber.pitch;
        assert!(r.triangles() as f64 > 2.0 * turns * SAMPLES_PER_TURN as f64);
    }
}

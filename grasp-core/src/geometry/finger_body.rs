//! The finger's body and the palm as parry shapes, for contact and enclosure.
//!
//! DESIGN 3.3: the body is the finger's outer section swept along its reference line
//! (the strain-limiting layer). Along a solved rod ([`crate::rod`]) the reference line is
//! a chain of constant-curvature elements; each element becomes **one convex piece**: the
//! convex hull of the section outline placed at the element's two ends (normal to the
//! line there). The straight base and tip cap are one piece each. Neighbouring pieces
//! share their end sections exactly, so the chain has neither gaps nor overlaps.
//!
//! The section outline ([`section_outline`]), in section coordinates `(x across, y above
//! the layer)`:
//! - `Box`: the rectangle `|x| <= outer_width/2`, `-under_layer <= y <= top`;
//! - `HalfRound`: the rectangle `|x| <= R_o`, `-under_layer <= y <= floor` under the
//!   half disk of radius `R_o = radius + wall` centred at `(0, floor)`, the arc inscribed
//!   with [`HALF_ROUND_ARC_SEGMENTS`] = 16 chords (at most `R_o (1 - cos(pi/32))`, 0.48 %
//!   of `R_o`, inside the true surface).
//!
//! On a bent element (tangent turning by `dpsi`, reference radius `1/|kappa|`), a chord
//! piece departs from the true swept surface by at most `(1/|kappa| + max(top,
//! under_layer)) (1 - cos(dpsi/2))` in the middle of the element: the outer face lies
//! inside the true surface, the inner (object-side) face stands proud of it by up to
//! `(1/|kappa| - under_layer) (1 - cos(dpsi/2))`. [`FingerBody::max_deviation`] reports the
//! bound; refining the rod shrinks it as `h² kappa / 8`.
//!
//! The palm ([`palm_body`]) is a `Disk`: a cylinder from `z = 0` to `z = thickness`.

use super::{FingerFrame, GeometryError, finite, positive};
use crate::math::{Pose, Rotation, Vec2, Vec3};
use crate::rod::{Chain, MaterialPoint, Rod, chord, direction, section_up};
use crate::scene::Palm;
use crate::section::SectionProfile;
use parry3d_f64::bounding_volume::{Aabb, BoundingVolume};
use parry3d_f64::shape::SharedShape;
use std::f64::consts::{FRAC_PI_2, PI, TAU};

/// Chords of the `HalfRound` outline's arc (the half circle of radius `R_o`).
pub const HALF_ROUND_ARC_SEGMENTS: usize = 16;

/// Which part of the finger a body piece stands for.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Hash)]
pub enum PieceKind {
    /// The straight passive base held in the hub.
    Base,
    /// Chamber element `i` (0-based, as in [`Rod`]).
    Element(usize),
    /// The straight tip cap.
    Tip,
}

/// One convex piece of a finger's body.
///
/// # Coordinate systems
/// `shape` is in piece-local coordinates: the gripper frame's axes, shifted to the
/// midpoint of the piece's reference chord, which is `pose.translation` (m, gripper
/// frame; `pose` has no rotation). `start`, `end` are reference-line points in the
/// finger-plane coordinates `(u, w)` of the finger's [`FingerFrame`] (m), and the angles
/// are tangent angles there (rad, from `+w` toward `+u`). `s_start..s_end` is the
/// reference-line arc length from the clamp that the piece covers (m): a contact on this
/// piece maps back to a [`MaterialPoint`] with `s` in that range
/// ([`FingerBody::material_point`]). Parry's normals on the piece point out of the body.
#[derive(Clone)]
pub struct BodyPiece {
    /// What the piece stands for.
    pub kind: PieceKind,
    /// Arc length of the piece's first section from the clamp (m).
    pub s_start: f64,
    /// Arc length of the piece's last section from the clamp (m).
    pub s_end: f64,
    /// Reference-line point of the first section, finger plane (m).
    pub start: Vec2,
    /// Reference-line point of the last section, finger plane (m).
    pub end: Vec2,
    /// Tangent angle at the first section (rad).
    pub angle_start: f64,
    /// Tangent angle at the last section (rad).
    pub angle_end: f64,
    /// Pose of `shape` in the gripper frame (a translation).
    pub pose: Pose,
    /// The convex piece (a parry `ConvexPolyhedron`), piece-local coordinates.
    pub shape: SharedShape,
}

impl std::fmt::Debug for BodyPiece {
    fn fmt(&self, f: &mut std::fmt::Formatter<'_>) -> std::fmt::Result {
        f.debug_struct("BodyPiece")
            .field("kind", &self.kind)
            .field("s_start", &self.s_start)
            .field("s_end", &self.s_end)
            .field("angle_start", &self.angle_start)
            .field("angle_end", &self.angle_end)
            .field("pose", &self.pose)
            .finish_non_exhaustive()
    }
}

/// A finger's body in the gripper frame: base, one piece per chamber element, tip cap.
///
/// # Coordinate systems
/// Pieces are placed in the gripper frame through `frame` (see [`BodyPiece`]). Pieces are
/// ordered from the clamp to the tip; a zero-length base or tip cap has no piece.
#[derive(Debug, Clone)]
pub struct FingerBody {
    /// The finger's frame on the hub.
    pub frame: FingerFrame,
    /// The pieces, clamp to tip.
    pub pieces: Vec<BodyPiece>,
    /// Polygonisation error of the section outline (m; 0 for `Box`).
    outline_error: f64,
    /// Farthest reach of the section from the reference line (m).
    section_reach: f64,
}

impl FingerBody {
    /// The body of a finger with rod geometry `rod`, element-end tangent angles `angles`
    /// (`psi_1..psi_n`, rad, as in [`crate::rod::RodSolution::angles`]), section
    /// `section`, mounted at `frame`.
    ///
    /// # Errors
    /// `angles` of the wrong length or not finite, or a piece whose hull cannot be built
    /// (a degenerate section).
    pub fn new(
        rod: &Rod,
        angles: &[f64],
        section: &SectionProfile,
        frame: FingerFrame,
    ) -> Result<Self, GeometryError> {
        Self::new_where(rod, angles, section, frame, |_, _| true)
    }

    /// Like [`Self::new`], but only with the pieces whose bounding sphere (centre in the
    /// gripper frame and radius, m) `keep` accepts: building a piece's hull is the costly
    /// part, and a contact search needs only the pieces near an obstacle. The pieces kept
    /// are exactly those [`Self::new`] builds, in the same order; indices differ.
    ///
    /// # Errors
    /// As [`Self::new`].
    pub fn new_where(
        rod: &Rod,
        angles: &[f64],
        section: &SectionProfile,
        frame: FingerFrame,
        keep: impl Fn(Vec3, f64) -> bool,
    ) -> Result<Self, GeometryError> {
        if angles.len() != rod.elements {
            return Err(GeometryError::AngleCount { got: angles.len(), expected: rod.elements });
        }
        Self::build(rod, angles, &rod.nodes(angles), section, frame, keep)
    }

    /// Like [`Self::new_where`], at the angles of `chain`, whose nodes it reuses.
    ///
    /// # Errors
    /// As [`Self::new`].
    pub fn of_chain_where(
        chain: &Chain<'_>,
        section: &SectionProfile,
        frame: FingerFrame,
        keep: impl Fn(Vec3, f64) -> bool,
    ) -> Result<Self, GeometryError> {
        Self::build(chain.rod(), chain.angles(), chain.nodes(), section, frame, keep)
    }

    /// The body from `angles` of the right length, and the rod's nodes there.
    fn build(
        rod: &Rod,
        angles: &[f64],
        nodes: &[Vec2],
        section: &SectionProfile,
        frame: FingerFrame,
        keep: impl Fn(Vec3, f64) -> bool,
    ) -> Result<Self, GeometryError> {
        for &a in angles {
            finite("finger angle", a)?;
        }
        let outline = section_outline(section);
        let outline_reach = outline.iter().map(|q| q.length()).fold(0.0, f64::max);
        let h = rod.element_length();
        let mut pieces = Vec::with_capacity(rod.elements + 2);
        let mut push = |kind, s0: f64, s1: f64, p0: Vec2, p1: Vec2, a0: f64, a1: f64| {
            let centre = frame.to_world(0.5 * (p0 + p1));
            if !keep(centre, 0.5 * (p1 - p0).length() + outline_reach) {
                return Ok(());
            }
            let mut pts = Vec::with_capacity(2 * outline.len());
            for (p, a) in [(p0, a0), (p1, a1)] {
                let up = section_up(a);
                for q in &outline {
                    pts.push(frame.to_world_offset(p + q.y * up, q.x) - centre);
                }
            }
            let shape = SharedShape::new(
                super::PointHull::of_volume(pts).ok_or(GeometryError::Hull { what: "finger piece" })?,
            );
            pieces.push(BodyPiece {
                kind,
                s_start: s0,
                s_end: s1,
                start: p0,
                end: p1,
                angle_start: a0,
                angle_end: a1,
                pose: Pose::from_translation(centre),
                shape,
            });
            Ok::<(), GeometryError>(())
        };
        let b = rod.base_length;
        if b > 0.0 {
            push(PieceKind::Base, 0.0, b, nodes[0], nodes[1], 0.0, 0.0)?;
        }
        let n = rod.elements;
        // arc length of element end i, exactly b + L at the last one
        let s_at = |i: usize| if i == n { b + rod.chamber_length } else { b + h * i as f64 };
        let mut prev = 0.0;
        for (i, &psi) in angles.iter().enumerate() {
            push(PieceKind::Element(i), s_at(i), s_at(i + 1), nodes[i + 1], nodes[i + 2], prev, psi)?;
            prev = psi;
        }
        if rod.tip_length > 0.0 {
            let s0 = s_at(n);
            push(PieceKind::Tip, s0, rod.length(), nodes[n + 1], nodes[n + 2], prev, prev)?;
        }
        let outline_error = match section {
            SectionProfile::Box(_) => 0.0,
            SectionProfile::HalfRound(s) => {
                s.outer_radius() * (1.0 - (FRAC_PI_2 / HALF_ROUND_ARC_SEGMENTS as f64).cos())
            }
        };
        Ok(Self { frame, pieces, outline_error, section_reach: section.top().max(section.under_layer()) })
    }

    /// The pieces as obstacles for [`crate::grasp::enclosure::enclosure`] or parry queries.
    pub fn obstacles(&self) -> Vec<(Pose, SharedShape)> {
        self.pieces.iter().map(|p| (p.pose, p.shape.clone())).collect()
    }

    /// Axis-aligned box around the whole body (gripper frame, m).
    pub fn aabb(&self) -> Aabb {
        let mut it = self.pieces.iter().map(|p| p.shape.compute_aabb(&p.pose));
        let first = it.next().unwrap_or_else(|| Aabb::new(self.frame.origin, self.frame.origin));
        it.fold(first, |acc, b| acc.merged(&b))
    }

    /// The index of the piece that covers arc length `s` (m); on a shared section, the
    /// earlier piece.
    pub fn piece_at(&self, s: f64) -> Option<usize> {
        self.pieces.iter().position(|p| p.s_start <= s && s <= p.s_end)
    }

    /// Largest distance (m) between the pieces and the true swept body: the chord error
    /// of the most bent element plus the outline's polygonisation error.
    pub fn max_deviation(&self) -> f64 {
        let chord_err = self
            .pieces
            .iter()
            .map(|p| {
                let turn = (p.angle_end - p.angle_start).abs();
                let len = p.s_end - p.s_start;
                if turn < 1e-12 {
                    return 0.0;
                }
                (len / turn + self.section_reach) * (1.0 - (0.5 * turn).cos())
            })
            .fold(0.0, f64::max);
        chord_err + self.outline_error
    }

    /// The material point (and lateral offset along the frame's `lateral_axis`, m) of a
    /// gripper-frame point `point` (m) on or near piece `piece`, e.g. a contact witness.
    /// `s` is found on the piece's reference arc (clamped to `s_start..s_end`) so that the
    /// point lies on the section normal there; `y` is the height above the layer along
    /// that normal. For a point on the body this inverts
    /// [`Rod::position`](crate::rod::Rod::position) placed by the frame.
    ///
    /// # Errors
    /// A piece index out of range or a non-finite point.
    pub fn material_point(&self, piece: usize, point: Vec3) -> Result<(MaterialPoint, f64), GeometryError> {
        let p = self
            .pieces
            .get(piece)
            .ok_or(GeometryError::NoPiece { index: piece, pieces: self.pieces.len() })?;
        super::finite_vec("contact point", point)?;
        let (q, lateral) = self.frame.to_plane(point);
        let (a, b) = (p.angle_start, p.angle_end);
        let len = p.s_end - p.s_start;
        let turn = b - a;
        let sigma = if turn.abs() < 1e-9 {
            ((q - p.start).dot(direction(a))).clamp(0.0, len)
        } else {
            let kappa = turn / len;
            // the centre of curvature is 1/kappa below the layer's normal at the start
            let centre = p.start - section_up(a) / kappa;
            let e = (q - centre) * kappa.signum();
            let mut psi = e.y.atan2(-e.x);
            let mid = 0.5 * (a + b);
            psi += TAU * ((mid - psi) / TAU).round();
            (psi.clamp(a.min(b), a.max(b)) - a) / kappa
        };
        let psi = a + turn * sigma / len;
        let x = p.start + chord(sigma, a, psi);
        let y = (q - x).dot(section_up(psi));
        Ok((MaterialPoint { s: p.s_start + sigma, y }, lateral))
    }
}

/// The tangent angles `psi_i = kappa h i` (`i = 1..n`) of a rod bent to the uniform
/// curvature `kappa` (1/m): the free, unloaded finger of [`crate::kinematics::FingerShape`].
pub fn free_angles(rod: &Rod, curvature: f64) -> Vec<f64> {
    let h = rod.element_length();
    (1..=rod.elements).map(|i| curvature * h * i as f64).collect()
}

/// The outer outline of a section (m), as points `(x across the finger, y above the
/// layer)` in counter-clockwise order; see the module doc.
pub fn section_outline(section: &SectionProfile) -> Vec<Vec2> {
    let yb = -section.under_layer();
    match section {
        SectionProfile::Box(_) => {
            let (hw, top) = (0.5 * section.outer_width(), section.top());
            vec![Vec2::new(-hw, yb), Vec2::new(hw, yb), Vec2::new(hw, top), Vec2::new(-hw, top)]
        }
        SectionProfile::HalfRound(s) => {
            let r = s.outer_radius();
            let mut pts = vec![Vec2::new(-r, yb), Vec2::new(r, yb)];
            let k = HALF_ROUND_ARC_SEGMENTS;
            pts.extend((0..=k).map(|j| {
                let th = PI * j as f64 / k as f64;
                Vec2::new(r * th.cos(), s.floor + r * th.sin())
            }));
            pts
        }
    }
}

/// The palm as an obstacle: a `Disk` is a cylinder of its radius from `z = 0` (the lower
/// face, where the fingers are clamped) to `z = thickness`, axis `z` (gripper frame, m).
///
/// # Errors
/// A radius or thickness that is not positive and finite.
pub fn palm_body(palm: &Palm) -> Result<(Pose, SharedShape), GeometryError> {
    match *palm {
        Palm::Disk { radius, thickness } => {
            let r = positive("palm radius", radius)?;
            let t = positive("palm thickness", thickness)?;
            // parry's cylinder axis is local y: +90° about x takes it to z
            let pose = Pose::from_parts(Vec3::new(0.0, 0.0, 0.5 * t), Rotation::from_rotation_x(FRAC_PI_2));
            Ok((pose, SharedShape::cylinder(0.5 * t, r)))
        }
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::section::{BoxSection, HalfRoundSection};
    use approx::assert_relative_eq;
    use parry3d_f64::query;

    // DESIGN 4.2's example sections
    fn box_section() -> SectionProfile {
        SectionProfile::Box(BoxSection::new(12e-3, 10e-3, 3e-3, 3e-3, 3e-3, 1e-3).unwrap())
    }
    fn half_round() -> SectionProfile {
        SectionProfile::HalfRound(HalfRoundSection::new(6e-3, 2e-3, 2e-3, 1e-3).unwrap())
    }
    fn rod() -> Rod {
        Rod::new(0.005, 0.09, 0.005, 40).unwrap()
    }
    fn volume(body: &FingerBody) -> f64 {
        body.pieces.iter().map(|p| p.shape.mass_properties(1.0).mass()).sum()
    }

    /// Closed form: a straight finger at azimuth 0, radius r, tilt 0 is the section
    /// extruded along -z: x from r - under_layer (inner face, toward the axis) to r + top,
    /// y within half the outer width, z from -(b + L + t) to 0; its volume is the outline
    /// area times the length.
    #[test]
    fn straight_finger_box_closed_form() {
        let r = 0.03;
        let rod = rod();
        for (sec, area) in [
            (box_section(), 18e-3 * 17e-3),
            // rectangle 2 R_o (t_f + t_u) plus the inscribed half of a regular K-gon,
            // K = 2 HALF_ROUND_ARC_SEGMENTS: (K/4) R_o² sin(2 pi/K)
            (half_round(), {
                let k = 2.0 * HALF_ROUND_ARC_SEGMENTS as f64;
                16e-3 * 3e-3 + 0.25 * k * 8e-3f64.powi(2) * (TAU / k).sin()
            }),
        ] {
            let body =
                FingerBody::new(&rod, &vec![0.0; 40], &sec, FingerFrame::new(0.0, r, 0.0).unwrap()).unwrap();
            assert_eq!(body.pieces.len(), 42);
            let bb = body.aabb();
            let hw = 0.5 * sec.outer_width();
            assert_relative_eq!(bb.mins.x, r - sec.under_layer(), epsilon = 1e-15);
            assert_relative_eq!(bb.maxs.x, r + sec.top(), epsilon = 1e-15);
            assert_relative_eq!(bb.mins.y, -hw, epsilon = 1e-15);
            assert_relative_eq!(bb.maxs.y, hw, epsilon = 1e-15);
            assert_relative_eq!(bb.mins.z, -0.1, epsilon = 1e-15);
            assert_relative_eq!(bb.maxs.z, 0.0, epsilon = 1e-15);
            assert_relative_eq!(volume(&body), area * 0.1, max_relative = 1e-10);
            assert_relative_eq!(body.max_deviation(), body.outline_error, epsilon = 1e-18);
        }
    }

    /// Closed form of the chord pieces of a bent Box finger: each element is the hull of two
    /// rectangles in planes through the axis of curvature, a quadrilateral prism of volume
    /// `W (R_o² - R_i²)/2 sin(dpsi)` with `R_o = 1/kappa + top`, `R_i = 1/kappa -
    /// under_layer`; i.e. the exact swept volume (Pappus) times `sinc(dpsi)`.
    #[test]
    fn bent_box_finger_volume_closed_form() {
        let rod = rod();
        let sec = box_section();
        let kappa = 25.0;
        let angles = free_angles(&rod, kappa);
        let body = FingerBody::new(&rod, &angles, &sec, FingerFrame::new(0.7, 0.03, 0.1).unwrap()).unwrap();
        let dpsi = kappa * rod.element_length();
        let (ro, ri) = (1.0 / kappa + sec.top(), 1.0 / kappa - sec.under_layer());
        let w = sec.outer_width();
        let chamber = 40.0 * w * 0.5 * (ro * ro - ri * ri) * dpsi.sin();
        let straight = w * (sec.top() + sec.under_layer()) * (rod.base_length + rod.tip_length);
        assert_relative_eq!(volume(&body), chamber + straight, max_relative = 1e-10);
    }

    /// Neighbouring pieces touch along their shared section and do not overlap (parry's
    /// contact distance is 0 within round-off), for both profiles and a strong bend; and
    /// every piece's end-section corners sit where `Rod::position` puts those material
    /// points.
    #[test]
    fn pieces_are_contiguous_and_follow_the_rod() {
        let rod = rod();
        for sec in [box_section(), half_round()] {
            let angles: Vec<f64> = (1..=40).map(|i| 3.0 * (i as f64 / 40.0).powi(2)).collect();
            let frame = FingerFrame::new(2.1, 0.035, -0.15).unwrap();
            let body = FingerBody::new(&rod, &angles, &sec, frame).unwrap();
            for w in body.pieces.windows(2) {
                assert_eq!(w[0].s_end, w[1].s_start);
                let c = query::contact(&w[0].pose, &*w[0].shape, &w[1].pose, &*w[1].shape, 1e-3)
                    .unwrap()
                    .unwrap();
                assert!(c.dist.abs() < 1e-9, "{:?} to {:?}: dist {:e}", w[0].kind, w[1].kind, c.dist);
            }
            let hw = 0.5 * sec.outer_width();
            for p in &body.pieces {
                for s in [p.s_start, p.s_end] {
                    for y in [-sec.under_layer(), sec.top()] {
                        let q = rod.position(&angles, MaterialPoint { s, y }).unwrap();
                        for x in [-hw, hw] {
                            if matches!(sec, SectionProfile::HalfRound(_)) && y > 0.0 {
                                continue; // the half-round has no corner at the top
                            }
                            let pt = frame.to_world_offset(q, x);
                            let d = p.shape.distance_to_point(&p.pose, pt, false);
                            assert!(d < 1e-12, "corner off the piece by {d:e}");
                        }
                        if y > 0.0 {
                            // the apex of either profile
                            let d = p.shape.distance_to_point(&p.pose, frame.to_world(q), false);
                            assert!(d < 1e-12);
                        }
                    }
                }
            }
        }
    }

    /// Closed form: the true outer surface at an element's mid-arc lies
    /// `R_o (1 - cos(dpsi/2))` outside the chord piece (the sagitta), which
    /// `max_deviation` bounds.
    #[test]
    fn chord_error_is_the_sagitta() {
        let rod = rod();
        let sec = box_section();
        let kappa = 30.0;
        let angles = free_angles(&rod, kappa);
        let frame = FingerFrame::new(0.0, 0.03, 0.0).unwrap();
        let body = FingerBody::new(&rod, &angles, &sec, frame).unwrap();
        let dpsi = kappa * rod.element_length();
        let ro = 1.0 / kappa + sec.top();
        let k = 17;
        let p = &body.pieces[k + 1];
        assert_eq!(p.kind, PieceKind::Element(k));
        let s_mid = 0.5 * (p.s_start + p.s_end);
        let q = rod.position(&angles, MaterialPoint { s: s_mid, y: sec.top() }).unwrap();
        let d = p.shape.distance_to_point(&p.pose, frame.to_world(q), false);
        assert_relative_eq!(d, ro * (1.0 - (0.5 * dpsi).cos()), max_relative = 1e-6);
        // the bound is this sagitta (up to round-off)
        assert_relative_eq!(body.max_deviation(), d, max_relative = 1e-6);
    }

    /// Mapping a body point back gives the material point `Rod::position` started from.
    #[test]
    fn material_points_round_trip() {
        let rod = rod();
        let sec = half_round();
        let angles: Vec<f64> =
            (1..=40).map(|i| 2.5 * i as f64 / 40.0 + 0.2 * (i as f64).sin() / 40.0).collect();
        let frame = FingerFrame::new(4.0, 0.03, 0.2).unwrap();
        let body = FingerBody::new(&rod, &angles, &sec, frame).unwrap();
        for (s, y, lat) in [
            (0.002, -1e-3, 0.0),
            (0.0301, 0.0, 3e-3),
            (0.07777, 9e-3, -2e-3),
            (0.0951, -0.5e-3, 1e-3),
            (0.0993, 5e-3, 0.0),
        ] {
            let pt = frame.to_world_offset(rod.position(&angles, MaterialPoint { s, y }).unwrap(), lat);
            let i = body.piece_at(s).unwrap();
            let (m, l) = body.material_point(i, pt).unwrap();
            assert_relative_eq!(m.s, s, epsilon = 1e-12);
            assert_relative_eq!(m.y, y, epsilon = 1e-12);
            assert_relative_eq!(l, lat, epsilon = 1e-15);
        }
        assert!(matches!(body.material_point(99, Vec3::ZERO), Err(GeometryError::NoPiece { .. })));
    }

    #[test]
    fn bad_angles_are_refused() {
        let frame = FingerFrame::new(0.0, 0.03, 0.0).unwrap();
        assert!(matches!(
            FingerBody::new(&rod(), &[0.0; 39], &box_section(), frame),
            Err(GeometryError::AngleCount { got: 39, expected: 40 })
        ));
        let mut a = vec![0.0; 40];
        a[3] = f64::NAN;
        assert!(FingerBody::new(&rod(), &a, &box_section(), frame).is_err());
    }

    /// Closed form: the disk palm fills [-R, R]² × [0, t] with volume pi R² t.
    #[test]
    fn palm_is_a_disk_above_the_clamps() {
        let (pose, shape) = palm_body(&Palm::Disk { radius: 0.035, thickness: 0.01 }).unwrap();
        let bb = shape.compute_aabb(&pose);
        assert_relative_eq!(bb.mins.z, 0.0, epsilon = 1e-15);
        assert_relative_eq!(bb.maxs.z, 0.01, epsilon = 1e-15);
        assert_relative_eq!(bb.maxs.x, 0.035, epsilon = 1e-15);
        assert_relative_eq!(bb.mins.y, -0.035, epsilon = 1e-15);
        assert_relative_eq!(
            shape.mass_properties(1.0).mass(),
            PI * 0.035 * 0.035 * 0.01,
            max_relative = 1e-12
        );
        assert!(palm_body(&Palm::Disk { radius: 0.035, thickness: 0.0 }).is_err());
    }
}

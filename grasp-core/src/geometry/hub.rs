//! The hub: where each finger sits and how its plane maps into the gripper frame.
//!
//! DESIGN 2: a finger mounted at azimuth `a` (from `+x` about `+z`) and radius `r` has its
//! clamp, the start of its reference line, at `(r cos a, r sin a, 0)`. Unbent, it hangs
//! along `-z`; a tilt `t` turns that axis outward inside the finger's radial plane
//! (positive = splayed away from the gripper's `z` axis). The finger bends toward the
//! gripper axis, so its bend side `+u` points inward.
//!
//! With the outward radial unit vector `e_r = (cos a, sin a, 0)`:
//!
//! ```text
//! w_axis       =  sin t e_r - cos t z     (along the unbent finger, toward the tip)
//! u_axis       = -cos t e_r - sin t z     (the bend side, toward the gripper axis)
//! lateral_axis =  u_axis × w_axis         (= -e_phi, normal to the finger plane)
//! ```
//!
//! [`HubPattern`] lays out common hubs (an evenly spaced ring, opposed pairs) as
//! [`FingerMount`]s.

use super::{GeometryError, finite};
use crate::math::{Mat3, Pose, Rotation, Vec2, Vec3};
use crate::scene::{FingerMount, Gripper};
use std::f64::consts::{FRAC_PI_2, PI, TAU};

/// Largest number of fingers a [`HubPattern`] expands to.
pub const MAX_PATTERN_FINGERS: usize = 64;

/// The rigid map from one finger's plane to the gripper frame.
///
/// # Coordinate systems
/// Finger-plane coordinates `(u, w)` (a [`Vec2`] with `x = u`, `y = w`, in m) have their
/// origin at the clamp, `w` along the unbent axis toward the tip and `u` toward the side
/// the finger bends to (DESIGN 2). The out-of-plane coordinate is measured along
/// `lateral_axis`. All four fields are in the gripper frame (m for `origin`, unit vectors
/// for the axes); `(u_axis, w_axis, lateral_axis)` is a right-handed orthonormal basis.
/// A finger-section point at width offset `x` and height `y` above the strain-limiting
/// layer lies at `(u, w) + y section_up(psi)` in the plane (see [`crate::rod::section_up`])
/// and `x` along `lateral_axis`.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct FingerFrame {
    /// The clamp (start of the reference line) in the gripper frame (m).
    pub origin: Vec3,
    /// Unit vector of `+u`, the bend side (toward the gripper axis).
    pub u_axis: Vec3,
    /// Unit vector of `+w`, along the unbent finger toward its tip.
    pub w_axis: Vec3,
    /// Unit normal of the finger plane, `u_axis × w_axis`.
    pub lateral_axis: Vec3,
}

impl FingerFrame {
    /// The frame of a finger at `azimuth` (rad, from `+x` about `+z`), `radius` (m) and
    /// `tilt` (rad, positive = splayed away from the gripper axis).
    ///
    /// # Errors
    /// A non-finite value, a negative radius, or a tilt of a right angle or more (the
    /// finger would no longer hang below the palm).
    pub fn new(azimuth: f64, radius: f64, tilt: f64) -> Result<Self, GeometryError> {
        let a = finite("finger azimuth", azimuth)?;
        let t = finite("finger tilt", tilt)?;
        let r = finite("finger mount radius", radius)?;
        if r < 0.0 {
            return Err(GeometryError::BadDimension { field: "mount radius", expected: ">= 0", value: r });
        }
        if t.abs() >= FRAC_PI_2 {
            return Err(GeometryError::BadDimension {
                field: "tilt",
                expected: "between -pi/2 and pi/2 (exclusive)",
                value: t,
            });
        }
        let e_r = Vec3::new(a.cos(), a.sin(), 0.0);
        let (st, ct) = t.sin_cos();
        let u_axis = -ct * e_r - st * Vec3::Z;
        let w_axis = st * e_r - ct * Vec3::Z;
        Ok(Self { origin: r * e_r, u_axis, w_axis, lateral_axis: u_axis.cross(w_axis) })
    }

    /// The frame of a scene's finger mount.
    ///
    /// # Errors
    /// As [`FingerFrame::new`].
    pub fn of_mount(mount: &FingerMount) -> Result<Self, GeometryError> {
        Self::new(mount.azimuth, mount.radius, mount.tilt)
    }

    /// The gripper-frame point (m) of finger-plane point `p = (u, w)` (m).
    pub fn to_world(&self, p: Vec2) -> Vec3 {
        self.origin + p.x * self.u_axis + p.y * self.w_axis
    }

    /// The gripper-frame point (m) of finger-plane point `p = (u, w)` offset by `lateral`
    /// (m) out of the plane, along `lateral_axis`.
    pub fn to_world_offset(&self, p: Vec2, lateral: f64) -> Vec3 {
        self.to_world(p) + lateral * self.lateral_axis
    }

    /// The gripper-frame vector of finger-plane vector `v = (v_u, v_w)` (same unit).
    pub fn world_direction(&self, v: Vec2) -> Vec3 {
        v.x * self.u_axis + v.y * self.w_axis
    }

    /// The inverse of [`FingerFrame::to_world_offset`]: a gripper-frame point (m) as its
    /// finger-plane coordinates `(u, w)` and its offset along `lateral_axis` (m).
    pub fn to_plane(&self, point: Vec3) -> (Vec2, f64) {
        let d = point - self.origin;
        (Vec2::new(d.dot(self.u_axis), d.dot(self.w_axis)), d.dot(self.lateral_axis))
    }

    /// A gripper-frame vector split into its in-plane components `(v_u, v_w)` and its
    /// component along `lateral_axis`.
    pub fn plane_direction(&self, v: Vec3) -> (Vec2, f64) {
        (Vec2::new(v.dot(self.u_axis), v.dot(self.w_axis)), v.dot(self.lateral_axis))
    }

    /// The frame as a parry pose: local `x = u`, `y = w`, `z` along `lateral_axis`, so
    /// `pose * Vec3::new(u, w, lateral)` is [`FingerFrame::to_world_offset`].
    pub fn pose(&self) -> Pose {
        let m = Mat3::from_cols(self.u_axis, self.w_axis, self.lateral_axis);
        Pose::from_parts(self.origin, Rotation::from_mat3(&m))
    }
}

/// The frames of all fingers of a gripper, in the gripper's finger order.
///
/// # Errors
/// As [`FingerFrame::new`], for the first bad mount.
pub fn finger_frames(gripper: &Gripper) -> Result<Vec<FingerFrame>, GeometryError> {
    gripper.fingers.iter().map(FingerFrame::of_mount).collect()
}

/// A hub layout that expands to finger mounts.
///
/// Angles in rad, lengths in m. All fingers of a pattern share one actuator, one mount
/// radius and one tilt.
#[derive(Debug, Clone, Copy, PartialEq)]
pub enum HubPattern {
    /// `fingers` fingers evenly spaced around the axis: finger `k` at azimuth
    /// `azimuth_offset + 2 pi k / fingers`.
    Ring {
        /// Number of fingers (1 to [`MAX_PATTERN_FINGERS`]).
        fingers: usize,
        /// Mount radius (m, > 0).
        radius: f64,
        /// Tilt (rad, positive = splayed outward).
        tilt: f64,
        /// Azimuth of the first finger (rad).
        azimuth_offset: f64,
    },
    /// `pairs` pairs of fingers facing each other across the axis. Pair `k` has finger
    /// `2k` at azimuth `azimuth_offset + (k - (pairs - 1)/2) spread` and finger `2k + 1`
    /// opposite it (`+ pi`): two fans of `pairs` fingers, `spread` apart within a fan.
    OpposedPairs {
        /// Number of pairs (1 to [`MAX_PATTERN_FINGERS`]` / 2`).
        pairs: usize,
        /// Azimuth between neighbouring fingers of one fan (rad; > 0 when `pairs > 1`, and
        /// `(pairs - 1) spread < pi` so the two fans do not meet).
        spread: f64,
        /// Mount radius (m, > 0).
        radius: f64,
        /// Tilt (rad, positive = splayed outward).
        tilt: f64,
        /// Azimuth of the middle of the first fan (rad).
        azimuth_offset: f64,
    },
}

impl HubPattern {
    /// The mounts of this pattern, all with actuator index `actuator`; azimuths reduced to
    /// `[0, 2 pi)`.
    ///
    /// # Errors
    /// No fingers or more than [`MAX_PATTERN_FINGERS`], a non-finite angle, a radius that
    /// is not positive, a tilt outside `(-pi/2, pi/2)`, or opposed fans that overlap.
    pub fn mounts(&self, actuator: usize) -> Result<Vec<FingerMount>, GeometryError> {
        let (azimuths, radius, tilt) = match *self {
            Self::Ring { fingers, radius, tilt, azimuth_offset } => {
                if fingers == 0 || fingers > MAX_PATTERN_FINGERS {
                    return Err(GeometryError::BadPattern("a ring needs 1 to 64 fingers"));
                }
                let a0 = finite("ring azimuth offset", azimuth_offset)?;
                let az = (0..fingers).map(|k| a0 + TAU * k as f64 / fingers as f64).collect::<Vec<_>>();
                (az, radius, tilt)
            }
            Self::OpposedPairs { pairs, spread, radius, tilt, azimuth_offset } => {
                if pairs == 0 || 2 * pairs > MAX_PATTERN_FINGERS {
                    return Err(GeometryError::BadPattern("opposed pairs need 1 to 32 pairs"));
                }
                let a0 = finite("pair azimuth offset", azimuth_offset)?;
                let s = finite("pair spread", spread)?;
                if pairs > 1 && !(s > 0.0 && (pairs - 1) as f64 * s < PI) {
                    return Err(GeometryError::BadPattern(
                        "the spread must be > 0 and (pairs - 1) * spread < pi so the fans do not meet",
                    ));
                }
                let mid = 0.5 * (pairs - 1) as f64;
                let mut az = Vec::with_capacity(2 * pairs);
                for k in 0..pairs {
                    let a = a0 + (k as f64 - mid) * s;
                    az.push(a);
                    az.push(a + PI);
                }
                (az, radius, tilt)
            }
        };
        if !(radius.is_finite() && radius > 0.0) {
            return Err(GeometryError::BadDimension {
                field: "pattern radius",
                expected: "> 0",
                value: radius,
            });
        }
        azimuths
            .into_iter()
            .map(|a| {
                let mount = FingerMount { actuator, azimuth: a.rem_euclid(TAU), radius, tilt };
                // the same checks as any mount (tilt range, finiteness)
                FingerFrame::of_mount(&mount).map(|_| mount)
            })
            .collect()
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::kinematics::FingerShape;
    use approx::assert_relative_eq;

    fn assert_vec_eq(a: Vec3, b: Vec3, eps: f64) {
        assert!((a - b).length() <= eps, "{a} != {b} (|diff| = {:e})", (a - b).length());
    }

    /// Closed form: a finger at azimuth 0, radius r, tilt 0, with base b, chamber L and tip
    /// cap t bent by 90 degrees (chamber radius R = 2L/pi). In the plane the tip sits at
    /// u = R + t, w = b + R (quarter circle, then the cap along +u); +u points to -x
    /// (inward) and +w to -z, so the tip is at (r - R - t, 0, -(b + R)).
    #[test]
    fn quarter_bent_finger_tip_closed_form() {
        let (r, b, l, t) = (0.03, 0.005, 0.09, 0.005);
        let big_r = 2.0 * l / PI;
        let shape = FingerShape { base_length: b, chamber_length: l, tip_length: t, curvature: 1.0 / big_r };
        let f = FingerFrame::new(0.0, r, 0.0).unwrap();
        let tip = f.to_world(shape.tip());
        assert_vec_eq(tip, Vec3::new(r - big_r - t, 0.0, -(b + big_r)), 1e-15);
        // the cap points inward, along -x
        let dir = f.world_direction(crate::rod::direction(shape.bend_angle()));
        assert_vec_eq(dir, -Vec3::X, 1e-15);
    }

    /// Closed form: a straight finger of length L tilted by t reaches
    /// base + L (sin t e_r - cos t z): outward by L sin t, up from -L by L (1 - cos t).
    #[test]
    fn tilt_moves_the_straight_tip_outward_by_l_sin_tilt() {
        let (r, l) = (0.03, 0.1);
        for a_deg in [0.0, 30.0, 135.0, 250.0] {
            for t_deg in [-10.0, 0.0, 5.0, 20.0] {
                let (a, t): (f64, f64) = (f64::to_radians(a_deg), f64::to_radians(t_deg));
                let f = FingerFrame::new(a, r, t).unwrap();
                let tip = f.to_world(Vec2::new(0.0, l));
                let e_r = Vec3::new(a.cos(), a.sin(), 0.0);
                let radial = tip.dot(e_r);
                assert_relative_eq!(radial, r + l * t.sin(), epsilon = 1e-15);
                assert_relative_eq!(tip.z, -l * t.cos(), epsilon = 1e-15);
                // stays in the radial plane
                assert_relative_eq!(tip.dot(Vec3::new(-a.sin(), a.cos(), 0.0)), 0.0, epsilon = 1e-15);
            }
        }
    }

    /// The basis is orthonormal and right-handed (det = +1), `+u` points inward at zero
    /// tilt, and the base sits at (r cos a, r sin a, 0) (DESIGN 2).
    #[test]
    fn frame_is_orthonormal_right_handed_and_bends_inward() {
        for a_deg in [0.0, 45.0, 120.0, 240.0, 359.0] {
            for t_deg in [-30.0, 0.0, 15.0, 60.0] {
                let (a, t): (f64, f64) = (f64::to_radians(a_deg), f64::to_radians(t_deg));
                let f = FingerFrame::new(a, 0.04, t).unwrap();
                let m = Mat3::from_cols(f.u_axis, f.w_axis, f.lateral_axis);
                assert!((m.transpose() * m).abs_diff_eq(Mat3::IDENTITY, 1e-15));
                assert_relative_eq!(m.determinant(), 1.0, epsilon = 1e-15);
                assert_vec_eq(f.origin, Vec3::new(0.04 * a.cos(), 0.04 * a.sin(), 0.0), 1e-16);
                // the finger plane contains the gripper axis direction z
                assert_relative_eq!(f.lateral_axis.z, 0.0, epsilon = 1e-16);
                assert_relative_eq!(f.lateral_axis.dot(f.origin), 0.0, epsilon = 1e-16);
                // the bend side points toward the axis: -e_r component is cos t > 0
                let e_r = Vec3::new(a.cos(), a.sin(), 0.0);
                assert_relative_eq!(f.u_axis.dot(-e_r), t.cos(), epsilon = 1e-15);
            }
        }
        let f = FingerFrame::new(0.0, 0.03, 0.0).unwrap();
        assert_vec_eq(f.u_axis, -Vec3::X, 0.0);
        assert_vec_eq(f.w_axis, -Vec3::Z, 0.0);
        assert_vec_eq(f.lateral_axis, -Vec3::Y, 0.0);
    }

    #[test]
    fn plane_coordinates_round_trip_and_pose_agrees() {
        let f = FingerFrame::new(2.0, 0.035, 0.2).unwrap();
        let p = Vec2::new(0.012, 0.07);
        let x = f.to_world_offset(p, -0.004);
        let (q, lat) = f.to_plane(x);
        assert_relative_eq!(q.x, p.x, epsilon = 1e-16);
        assert_relative_eq!(q.y, p.y, epsilon = 1e-16);
        assert_relative_eq!(lat, -0.004, epsilon = 1e-16);
        let via_pose = f.pose() * Vec3::new(p.x, p.y, -0.004);
        assert_vec_eq(via_pose, x, 1e-16);
        let (v, vl) = f.plane_direction(f.world_direction(Vec2::new(0.6, 0.8)));
        assert_relative_eq!(v.x, 0.6, epsilon = 1e-15);
        assert_relative_eq!(v.y, 0.8, epsilon = 1e-15);
        assert_relative_eq!(vl, 0.0, epsilon = 1e-15);
    }

    #[test]
    fn bad_mounts_are_refused() {
        assert!(matches!(FingerFrame::new(f64::NAN, 0.03, 0.0), Err(GeometryError::NonFinite { .. })));
        assert!(matches!(FingerFrame::new(0.0, -0.01, 0.0), Err(GeometryError::BadDimension { .. })));
        assert!(matches!(FingerFrame::new(0.0, 0.03, FRAC_PI_2), Err(GeometryError::BadDimension { .. })));
    }

    #[test]
    fn ring_spaces_fingers_evenly() {
        let p = HubPattern::Ring { fingers: 3, radius: 0.03, tilt: 0.1, azimuth_offset: -0.5 };
        let m = p.mounts(2).unwrap();
        assert_eq!(m.len(), 3);
        for (k, mount) in m.iter().enumerate() {
            assert_eq!(mount.actuator, 2);
            assert_relative_eq!(mount.radius, 0.03);
            assert_relative_eq!(mount.tilt, 0.1);
            let expected = (-0.5 + TAU * k as f64 / 3.0).rem_euclid(TAU);
            assert_relative_eq!(mount.azimuth, expected, epsilon = 1e-15);
        }
        assert!(
            HubPattern::Ring { fingers: 0, radius: 0.03, tilt: 0.0, azimuth_offset: 0.0 }.mounts(0).is_err()
        );
        assert!(
            HubPattern::Ring { fingers: 3, radius: 0.0, tilt: 0.0, azimuth_offset: 0.0 }.mounts(0).is_err()
        );
    }

    /// Each pair is diametrically opposed (the two bases are symmetric about the axis)
    /// and neighbours in a fan are `spread` apart.
    #[test]
    fn opposed_pairs_face_each_other() {
        let spread = 40f64.to_radians();
        let p = HubPattern::OpposedPairs { pairs: 2, spread, radius: 0.03, tilt: 0.0, azimuth_offset: 0.0 };
        let m = p.mounts(0).unwrap();
        assert_eq!(m.len(), 4);
        let deg: Vec<f64> = m.iter().map(|x| x.azimuth.to_degrees()).collect();
        for (got, want) in deg.iter().zip([340.0, 160.0, 20.0, 200.0]) {
            assert_relative_eq!(*got, want, epsilon = 1e-12);
        }
        for pair in m.chunks(2) {
            let a = FingerFrame::of_mount(&pair[0]).unwrap();
            let b = FingerFrame::of_mount(&pair[1]).unwrap();
            assert_vec_eq(a.origin, -b.origin, 1e-15);
            assert_vec_eq(a.u_axis, -b.u_axis, 1e-15);
        }
        let bad =
            HubPattern::OpposedPairs { pairs: 3, spread: 1.6, radius: 0.03, tilt: 0.0, azimuth_offset: 0.0 };
        assert!(matches!(bad.mounts(0), Err(GeometryError::BadPattern(_))));
        let one =
            HubPattern::OpposedPairs { pairs: 1, spread: 0.0, radius: 0.03, tilt: 0.0, azimuth_offset: 1.0 };
        assert_eq!(one.mounts(0).unwrap().len(), 2);
    }
}

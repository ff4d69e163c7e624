//! Piecewise-constant-curvature kinematics of a finger.
//!
//! A finger is a chain of segments, each a circular arc of constant curvature (a
//! straight segment has curvature 0): the passive base held in the hub, the chamber,
//! and the tip cap. [`constant_curvature`] holds the arc transform of Webster & Jones
//! (2010); [`FingerShape`] strings the three segments together in the finger plane.

pub mod constant_curvature;

pub use constant_curvature::{Arc, arc_transform};

use crate::math::Vec2;

/// The three segments of a finger at a uniform chamber curvature (finger-plane
/// coordinates: origin at the clamp, `w` along the unbent axis toward the tip, `u`
/// toward the side the finger bends to; m and 1/m).
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct FingerShape {
    /// Straight passive base length (m).
    pub base_length: f64,
    /// Chamber (bending) length (m).
    pub chamber_length: f64,
    /// Straight tip-cap length (m).
    pub tip_length: f64,
    /// Chamber curvature (1/m), positive toward `+u`.
    pub curvature: f64,
}

impl FingerShape {
    /// Total length along the reference line (m).
    pub fn length(&self) -> f64 {
        self.base_length + self.chamber_length + self.tip_length
    }

    /// Tangent angle (rad, from `+w` toward `+u`) at arc length `s` from the clamp.
    pub fn angle_at(&self, s: f64) -> f64 {
        let sc = (s - self.base_length).clamp(0.0, self.chamber_length);
        self.curvature * sc
    }

    /// Reference-line point at arc length `s` from the clamp (`s` clamped to the finger).
    pub fn point_at(&self, s: f64) -> Vec2 {
        let s = s.clamp(0.0, self.length());
        let b = self.base_length;
        if s <= b {
            return Vec2::new(0.0, s);
        }
        let sc = (s - b).min(self.chamber_length);
        let arc = Arc { curvature: self.curvature, length: sc };
        let p = Vec2::new(0.0, b) + arc.end_point();
        let rest = s - b - sc;
        let th = arc.end_angle();
        p + rest * Vec2::new(th.sin(), th.cos())
    }

    /// Position of the tip (end of the tip cap) (m).
    pub fn tip(&self) -> Vec2 {
        self.point_at(self.length())
    }

    /// Bend angle of the tip relative to the base (rad).
    pub fn bend_angle(&self) -> f64 {
        self.curvature * self.chamber_length
    }

    /// `n + 1` points evenly spaced along the reference line, clamp to tip.
    pub fn polyline(&self, n: usize) -> Vec<Vec2> {
        let n = n.max(1);
        (0..=n).map(|i| self.point_at(self.length() * i as f64 / n as f64)).collect()
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use approx::assert_relative_eq;
    use std::f64::consts::PI;

    #[test]
    fn straight_finger_points_along_w() {
        let f = FingerShape { base_length: 5e-3, chamber_length: 90e-3, tip_length: 5e-3, curvature: 0.0 };
        assert_relative_eq!(f.tip().x, 0.0);
        assert_relative_eq!(f.tip().y, 0.1, max_relative = 1e-14);
    }

    /// A half circle (bend angle pi) with straight ends: tip at u = 2R, w = b (closed form
    /// of a semicircle of radius R = 1/kappa), then the tip cap pointing back along -w.
    #[test]
    fn half_turn_closed_form() {
        let l = 0.09;
        let k = PI / l;
        let f = FingerShape { base_length: 0.005, chamber_length: l, tip_length: 0.01, curvature: k };
        let tip = f.tip();
        assert_relative_eq!(tip.x, 2.0 / k, max_relative = 1e-12);
        assert_relative_eq!(tip.y, 0.005 - 0.01, epsilon = 1e-14);
        assert_relative_eq!(f.bend_angle(), PI, max_relative = 1e-14);
    }

    #[test]
    fn polyline_segments_keep_arc_length() {
        let f = FingerShape { base_length: 0.005, chamber_length: 0.09, tip_length: 0.005, curvature: 25.0 };
        let pts = f.polyline(2000);
        let len: f64 = pts.windows(2).map(|w| (w[1] - w[0]).length()).sum();
        // chords under-estimate an arc by O(h^2)
        assert_relative_eq!(len, f.length(), max_relative = 1e-6);
    }
}

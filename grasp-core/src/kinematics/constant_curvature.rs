//! The constant-curvature arc.
//!
//! R. J. Webster III and B. A. Jones, "Design and kinematic modeling of constant
//! curvature continuum robots: a review", Int. J. Robotics Research 29(13), 1661–1683,
//! 2010, eq. (2): an arc of curvature `k`, bending-plane angle `phi` and arc length `s`,
//! starting at the origin tangent to `+z`, has the transform
//!
//! ```text
//! T = [ R_z(phi) R_y(k s) R_z(-phi) | (cos phi (1 - cos ks)/k, sin phi (1 - cos ks)/k, sin ks / k) ]
//! ```

use crate::math::{Mat3, Mat4, Vec2, Vec3};

/// A planar arc from the origin, tangent to `+w`, bending toward `+u`.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Arc {
    /// Curvature (1/m); 0 = straight.
    pub curvature: f64,
    /// Arc length (m).
    pub length: f64,
}

impl Arc {
    /// End point `(u, w) = ((1 - cos ks)/k, sin ks / k)`, with the straight limit
    /// taken smoothly (series for small `ks`).
    pub fn end_point(&self) -> Vec2 {
        let (k, s) = (self.curvature, self.length);
        let t = k * s;
        if t.abs() < 1e-4 {
            // (1 - cos t)/k = s (t/2 - t^3/24), sin t / k = s (1 - t^2/6 + t^4/120)
            Vec2::new(s * (0.5 * t - t * t * t / 24.0), s * (1.0 - t * t / 6.0 + t.powi(4) / 120.0))
        } else {
            Vec2::new((1.0 - t.cos()) / k, t.sin() / k)
        }
    }
    /// Tangent angle at the end (rad from `+w` toward `+u`).
    pub fn end_angle(&self) -> f64 {
        self.curvature * self.length
    }
}

/// The homogeneous transform of Webster & Jones (2010), eq. (2): curvature `k` (1/m),
/// bending-plane angle `phi` (rad, from `+x` about `+z`), arc length `s` (m).
pub fn arc_transform(k: f64, phi: f64, s: f64) -> Mat4 {
    let e = Arc { curvature: k, length: s }.end_point();
    let p = Vec3::new(phi.cos() * e.x, phi.sin() * e.x, e.y);
    let r = Mat3::from_rotation_z(phi) * Mat3::from_rotation_y(k * s) * Mat3::from_rotation_z(-phi);
    Mat4::from_cols(r.x_axis.extend(0.0), r.y_axis.extend(0.0), r.z_axis.extend(0.0), p.extend(1.0))
}

#[cfg(test)]
mod tests {
    use super::*;
    use approx::assert_relative_eq;

    /// Worked example (shared/references, Webster & Jones 2010 eq. 2): k = 10 1/m,
    /// phi = 30 deg, s = 0.1 m gives (0.039811, 0.022985, 0.084147) m.
    #[test]
    fn webster_jones_example() {
        let t = arc_transform(10.0, 30f64.to_radians(), 0.1);
        let p = t.w_axis.truncate();
        assert_relative_eq!(p.x, 0.039811, epsilon = 5e-7);
        assert_relative_eq!(p.y, 0.022985, epsilon = 5e-7);
        assert_relative_eq!(p.z, 0.084147, epsilon = 5e-7);
    }

    /// The end tangent (third column of R) is `(cos phi sin ks, sin phi sin ks, cos ks)`,
    /// the derivative of the position with respect to `s` (closed form).
    #[test]
    fn end_tangent_is_derivative_of_position() {
        let (k, phi, s) = (7.0, 1.1, 0.2);
        let t = arc_transform(k, phi, s);
        let h = 1e-6;
        let d = (arc_transform(k, phi, s + h).w_axis - arc_transform(k, phi, s - h).w_axis).truncate()
            / (2.0 * h);
        let z = t.z_axis.truncate();
        assert_relative_eq!(z.x, d.x, epsilon = 1e-8);
        assert_relative_eq!(z.y, d.y, epsilon = 1e-8);
        assert_relative_eq!(z.z, d.z, epsilon = 1e-8);
        // rotation part orthonormal
        let r = Mat3::from_mat4(t);
        let rtr = r.transpose() * r;
        assert!(rtr.abs_diff_eq(Mat3::IDENTITY, 1e-14));
    }

    #[test]
    fn small_curvature_series_is_continuous() {
        let s = 0.1;
        for k in [1e-7, 9.99e-4, 1.001e-3] {
            let a = Arc { curvature: k, length: s }.end_point();
            let exact = Vec2::new((1.0 - (k * s).cos()) / k, (k * s).sin() / k);
            assert_relative_eq!(a.y, exact.y, max_relative = 1e-12);
            assert_relative_eq!(a.x, 0.5 * k * s * s, max_relative = 1e-6);
        }
    }
}

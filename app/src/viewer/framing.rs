//! Deterministic camera framing: a view direction and a picture's aspect give the one
//! camera that fits a bounding box (no bevy here, so the render test can check the
//! projection with its own arithmetic).
//!
//! The camera looks at the centre of the box from the chosen side, far enough that the
//! box's circumscribed sphere fits inside both the vertical and the horizontal field of
//! view, with [`MARGIN`] to spare. Gripper frame (DESIGN 2, `+z` up), millimetres.

/// Vertical field of view of every camera (rad): 35 degrees.
pub const FOV_Y: f64 = 35.0 * std::f64::consts::PI / 180.0;
/// Extra room around the fitted sphere (fraction of its radius).
pub const MARGIN: f64 = 0.08;

/// Where a picture is seen from.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum View {
    /// From `-y`, level with the objects.
    Front,
    /// From `+x`, level.
    Side,
    /// From above (`+z`), looking down on the palm.
    Top,
    /// From the front right and a little below the palm's level: the grasp in 3-D.
    Iso,
}

impl View {
    /// Parses `front`, `side`, `top` or `iso`.
    pub fn parse(s: &str) -> Option<Self> {
        Some(match s {
            "front" => Self::Front,
            "side" => Self::Side,
            "top" => Self::Top,
            "iso" => Self::Iso,
            _ => return None,
        })
    }

    /// Unit vector from the target to the eye, and the camera's up vector.
    pub fn direction(self) -> ([f64; 3], [f64; 3]) {
        match self {
            Self::Front => ([0.0, -1.0, 0.0], [0.0, 0.0, 1.0]),
            Self::Side => ([1.0, 0.0, 0.0], [0.0, 0.0, 1.0]),
            Self::Top => ([0.0, 0.0, 1.0], [0.0, 1.0, 0.0]),
            Self::Iso => {
                let v: [f64; 3] = [0.62, -0.74, -0.26];
                let n = (v[0] * v[0] + v[1] * v[1] + v[2] * v[2]).sqrt();
                ([v[0] / n, v[1] / n, v[2] / n], [0.0, 0.0, 1.0])
            }
        }
    }
}

/// A camera placement (mm, gripper frame).
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct CameraPose {
    /// Eye position.
    pub eye: [f64; 3],
    /// Point looked at.
    pub target: [f64; 3],
    /// Up direction (unit).
    pub up: [f64; 3],
    /// Vertical field of view (rad).
    pub fov_y: f64,
    /// Distance from the eye to the target.
    pub distance: f64,
}

/// The camera that fits the box `lo..hi` (mm) seen from `view` in a picture of
/// `aspect` = width / height.
pub fn fit(lo: [f64; 3], hi: [f64; 3], view: View, aspect: f64) -> CameraPose {
    let target = [0.5 * (lo[0] + hi[0]), 0.5 * (lo[1] + hi[1]), 0.5 * (lo[2] + hi[2])];
    let r = 0.5 * ((hi[0] - lo[0]).powi(2) + (hi[1] - lo[1]).powi(2) + (hi[2] - lo[2]).powi(2)).sqrt();
    let r = r.max(1.0) * (1.0 + MARGIN);
    let half_y = 0.5 * FOV_Y;
    let half_x = (aspect.max(1e-3) * half_y.tan()).atan();
    let distance = r / half_y.min(half_x).sin();
    let (d, up) = view.direction();
    let eye = [target[0] + distance * d[0], target[1] + distance * d[1], target[2] + distance * d[2]];
    CameraPose { eye, target, up, fov_y: FOV_Y, distance }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn fitted_sphere_touches_the_narrower_field_of_view() {
        // a sphere of radius r seen from distance d subtends asin(r / d) (elementary
        // geometry): at the fitted distance that is the narrower half-angle
        let (lo, hi) = ([-30.0, -30.0, -120.0], [30.0, 30.0, 10.0]);
        for (aspect, view) in [(4.0 / 3.0, View::Front), (0.5, View::Iso), (1.0, View::Top)] {
            let c = fit(lo, hi, view, aspect);
            let r = 0.5 * (60.0f64.powi(2) * 2.0 + 130.0f64.powi(2)).sqrt() * (1.0 + MARGIN);
            let half_x = (aspect * (0.5 * FOV_Y).tan()).atan();
            let expect = (0.5 * FOV_Y).min(half_x);
            assert!(((r / c.distance).asin() - expect).abs() < 1e-12);
            let e = c.eye;
            let t = c.target;
            let d = ((e[0] - t[0]).powi(2) + (e[1] - t[1]).powi(2) + (e[2] - t[2]).powi(2)).sqrt();
            assert!((d - c.distance).abs() < 1e-9);
            assert_eq!(t, [0.0, 0.0, -55.0]);
        }
        // the same box gives the same camera (deterministic framing)
        assert_eq!(fit(lo, hi, View::Side, 1.5), fit(lo, hi, View::Side, 1.5));
    }

    #[test]
    fn views_parse_and_point_where_named() {
        assert_eq!(View::parse("front"), Some(View::Front));
        assert_eq!(View::parse("back"), None);
        let (d, _) = View::Top.direction();
        assert_eq!(d, [0.0, 0.0, 1.0]);
    }
}

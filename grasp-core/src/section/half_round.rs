//! The semicircular (`HalfRound`) profile.
//!
//! A half-disk chamber of radius `a` sits on a floor of thickness `t_f`, covered by a
//! uniform wall of thickness `t`; floor and under-layer span the full width `2 (a + t)`.
//! The curved wall is integrated in polar coordinates about the chamber's centre,
//! `y = t_f + r sin(theta)`, `dA = r dr dtheta`: this is the strip-width integral with
//! the substitution that removes the square-root end singularity of the strip width
//! `2 sqrt(R^2 - (y - t_f)^2)`, so Gauss–Legendre in `r` and `theta` converges fast.
//! With the wall-pressure refinement `sigma_r` falls linearly along the radius, from `-p`
//! at `r = a` to `0` at `r = a + t`, and linearly through the floor under the chamber.

use super::{SectionError, SectionPoint, SectionQuadrature, non_negative, positive, push_band};
use crate::math::gauss_legendre::GaussLegendre;
use std::f64::consts::PI;

/// A semicircular chamber with a uniform wall (all m).
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct HalfRoundSection {
    /// Chamber radius `a` (m).
    pub radius: f64,
    /// Wall thickness `t` (m).
    pub wall: f64,
    /// Floor thickness between layer and chamber (m).
    pub floor: f64,
    /// Under-layer thickness below the layer (m, may be 0).
    pub under_layer: f64,
}

impl HalfRoundSection {
    /// A validated half-round section.
    ///
    /// # Errors
    /// Any dimension non-finite or not positive (the under-layer may be zero).
    pub fn new(radius: f64, wall: f64, floor: f64, under_layer: f64) -> Result<Self, SectionError> {
        Ok(Self {
            radius: positive("radius", radius)?,
            wall: positive("wall", wall)?,
            floor: positive("floor", floor)?,
            under_layer: non_negative("under_layer", under_layer)?,
        })
    }
    /// Outer radius `a + t` (m).
    pub fn outer_radius(&self) -> f64 {
        self.radius + self.wall
    }
    /// `A_c = pi a^2 / 2` (m²).
    pub fn chamber_area(&self) -> f64 {
        0.5 * PI * self.radius * self.radius
    }
    /// `ybar_c = t_f + 4 a / (3 pi)` (m).
    pub fn chamber_centroid(&self) -> f64 {
        self.floor + 4.0 * self.radius / (3.0 * PI)
    }
    /// Top surface `t_f + a + t` (m).
    pub fn top(&self) -> f64 {
        self.floor + self.outer_radius()
    }
    /// Rubber area (m²).
    pub fn rubber_area(&self) -> f64 {
        let r = self.outer_radius();
        2.0 * r * (self.floor + self.under_layer) + 0.5 * PI * (r * r - self.radius * self.radius)
    }
    /// Second moment of the rubber about the layer (m⁴), closed form.
    pub fn second_moment_about_layer(&self) -> f64 {
        let (a, r, tf, tu) = (self.radius, self.outer_radius(), self.floor, self.under_layer);
        let slab = 2.0 * r * (tf.powi(3) + tu.powi(3)) / 3.0;
        // int over the half annulus of (tf + rho sin th)^2 rho drho dth
        let annulus = tf * tf * PI * (r * r - a * a) / 2.0
            + 2.0 * tf * 2.0 * (r.powi(3) - a.powi(3)) / 3.0
            + PI / 2.0 * (r.powi(4) - a.powi(4)) / 4.0;
        slab + annulus
    }

    /// Bands for the floor and under-layer, a polar tensor rule for the curved wall.
    pub fn quadrature(&self, n: usize) -> SectionQuadrature {
        let rule = GaussLegendre::new(n);
        // the wall is thin: the integrand varies little across it, more along the angle
        let rule_r = GaussLegendre::new(n.div_ceil(2).max(1));
        let rule_theta = GaussLegendre::new((3 * n).div_ceil(2));
        let (a, t, tf) = (self.radius, self.wall, self.floor);
        let r_out = self.outer_radius();
        let mut rubber: Vec<SectionPoint> = Vec::new();
        push_band(&mut rubber, &rule, -self.under_layer, 0.0, 2.0 * r_out, |_| 1.0);
        push_band(&mut rubber, &rule, 0.0, tf, 2.0 * r_out, |_| 1.0);
        let mut pressure = Vec::new();
        push_band(&mut pressure, &rule, 0.0, tf, 2.0 * a, |y| y / tf);
        // theta over [0, pi/2] and doubled by symmetry about the vertical axis
        for (th, wth) in rule_theta.on_interval(0.0, 0.5 * PI) {
            for (r, wr) in rule_r.on_interval(a, r_out) {
                let y = tf + r * th.sin();
                let da = 2.0 * wth * wr * r;
                rubber.push(SectionPoint { y, weight: da });
                pressure.push(SectionPoint { y, weight: da * (r_out - r) / t });
            }
        }
        SectionQuadrature {
            rubber,
            pressure,
            chamber_area: self.chamber_area(),
            chamber_centroid: self.chamber_centroid(),
            y_min: -self.under_layer,
            y_max: self.top(),
        }
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use approx::assert_relative_eq;

    fn example() -> HalfRoundSection {
        // DESIGN 4.2's example: radius 6, wall 2, floor 2, under-layer 1 (mm)
        HalfRoundSection::new(6e-3, 2e-3, 2e-3, 1e-3).unwrap()
    }

    #[test]
    fn quadrature_reproduces_closed_form_area_and_second_moment() {
        let s = example();
        let q = s.quadrature(6);
        assert_relative_eq!(q.rubber_moment(0), s.rubber_area(), max_relative = 1e-12);
        assert_relative_eq!(q.rubber_moment(2), s.second_moment_about_layer(), max_relative = 1e-12);
        // half-annulus first moment about its base: 2 (R^3 - a^3)/3, plus the slabs
        let (a, r, tf, tu) = (6e-3f64, 8e-3f64, 2e-3f64, 1e-3f64);
        let first = 2.0 * r * (tf * tf - tu * tu) / 2.0
            + tf * PI * (r * r - a * a) / 2.0
            + 2.0 * (r.powi(3) - a.powi(3)) / 3.0;
        assert_relative_eq!(q.rubber_moment(1), first, max_relative = 1e-12);
    }

    /// Pressure-profile area `int g dA` over the curved wall: `pi/t int_a^R (R - r) r dr`
    /// `= pi/t (R^3/6 - R a^2/2 + a^3/3)`, plus the floor's `2 a t_f / 2`.
    #[test]
    fn pressure_profile_area_closed_form() {
        let s = example();
        let q = s.quadrature(6);
        let (a, r, t, tf) = (6e-3f64, 8e-3f64, 2e-3f64, 2e-3f64);
        let wall = PI / t * (r.powi(3) / 6.0 - r * a * a / 2.0 + a.powi(3) / 3.0);
        assert_relative_eq!(q.pressure_moment(0), wall + a * tf, max_relative = 1e-12);
    }

    #[test]
    fn chamber_centroid_of_half_disk() {
        // 4a/(3 pi) above the flat face (classical)
        let s = example();
        assert_relative_eq!(s.chamber_centroid(), 2e-3 + 4.0 * 6e-3 / (3.0 * PI), max_relative = 1e-14);
    }
}

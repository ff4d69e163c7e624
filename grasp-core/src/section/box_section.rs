//! The rectangular (`Box`) profile, DESIGN 3.2.
//!
//! ```text
//!  y_top ┌──────────────────┐  top wall t_t
//!        │   ┌──────────┐   │
//!        │ts │ chamber  │ ts│  chamber w_c × h_c
//!        │   └──────────┘   │
//!   t_f  │     floor        │
//!   0    ╞══════════════════╡  strain-limiting layer
//!  -t_u  └──────────────────┘  under-layer
//! ```

use super::{SectionError, SectionPoint, SectionQuadrature, non_negative, positive, push_band};
use crate::math::gauss_legendre::GaussLegendre;

/// A rectangular chamber in a rectangular body (all m).
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct BoxSection {
    /// Chamber width `w_c` (m).
    pub chamber_width: f64,
    /// Chamber height `h_c` (m).
    pub chamber_height: f64,
    /// Side wall thickness `t_s` (m).
    pub side_wall: f64,
    /// Top wall thickness `t_t` (m).
    pub top_wall: f64,
    /// Floor thickness `t_f`, between layer and chamber (m).
    pub floor: f64,
    /// Under-layer thickness `t_u`, below the layer (m, may be 0).
    pub under_layer: f64,
}

impl BoxSection {
    /// A validated box section.
    ///
    /// # Errors
    /// Any dimension non-finite or not positive (the under-layer may be zero).
    pub fn new(
        chamber_width: f64,
        chamber_height: f64,
        side_wall: f64,
        top_wall: f64,
        floor: f64,
        under_layer: f64,
    ) -> Result<Self, SectionError> {
        Ok(Self {
            chamber_width: positive("chamber_width", chamber_width)?,
            chamber_height: positive("chamber_height", chamber_height)?,
            side_wall: positive("side_wall", side_wall)?,
            top_wall: positive("top_wall", top_wall)?,
            floor: positive("floor", floor)?,
            under_layer: non_negative("under_layer", under_layer)?,
        })
    }
    /// `A_c = w_c h_c` (m²).
    pub fn chamber_area(&self) -> f64 {
        self.chamber_width * self.chamber_height
    }
    /// `ybar_c = t_f + h_c/2` (m).
    pub fn chamber_centroid(&self) -> f64 {
        self.floor + 0.5 * self.chamber_height
    }
    /// Top surface `t_f + h_c + t_t` (m).
    pub fn top(&self) -> f64 {
        self.floor + self.chamber_height + self.top_wall
    }
    /// Overall width `w_c + 2 t_s` (m).
    pub fn outer_width(&self) -> f64 {
        self.chamber_width + 2.0 * self.side_wall
    }
    /// Rubber area (m²).
    pub fn rubber_area(&self) -> f64 {
        self.outer_width() * (self.top() + self.under_layer) - self.chamber_area()
    }
    /// Second moment of the rubber about the layer, `int y^2 dA` (m⁴), closed form.
    pub fn second_moment_about_layer(&self) -> f64 {
        let cube = |y: f64| y * y * y / 3.0;
        let y1 = self.floor;
        let y2 = self.floor + self.chamber_height;
        self.outer_width() * (cube(self.top()) + cube(self.under_layer))
            - self.chamber_width * (cube(y2) - cube(y1))
    }

    /// Strip widths per band, Gauss–Legendre with `n` points each.
    pub fn quadrature(&self, n: usize) -> SectionQuadrature {
        let rule = GaussLegendre::new(n);
        let (wc, ts, tt, tf) = (self.chamber_width, self.side_wall, self.top_wall, self.floor);
        let b = self.outer_width();
        let y1 = tf;
        let y2 = tf + self.chamber_height;
        let y3 = self.top();
        let mut rubber: Vec<SectionPoint> = Vec::with_capacity(4 * n);
        push_band(&mut rubber, &rule, -self.under_layer, 0.0, b, |_| 1.0);
        push_band(&mut rubber, &rule, 0.0, y1, b, |_| 1.0);
        push_band(&mut rubber, &rule, y1, y2, 2.0 * ts, |_| 1.0);
        push_band(&mut rubber, &rule, y2, y3, b, |_| 1.0);
        let mut pressure = Vec::with_capacity(3 * n);
        // floor under the chamber: g from 0 at the layer to 1 at the chamber
        push_band(&mut pressure, &rule, 0.0, y1, wc, |y| y / tf);
        // both side walls: g linear across each wall's thickness, mean 1/2, two walls
        push_band(&mut pressure, &rule, y1, y2, ts, |_| 1.0);
        // top wall over the chamber width: g from 1 at the chamber to 0 at the top
        push_band(&mut pressure, &rule, y2, y3, wc, |y| (y3 - y) / tt);
        SectionQuadrature {
            rubber,
            pressure,
            chamber_area: self.chamber_area(),
            chamber_centroid: self.chamber_centroid(),
            y_min: -self.under_layer,
            y_max: y3,
        }
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use approx::assert_relative_eq;

    fn example() -> BoxSection {
        // DESIGN 4.2's example section (mm): 12 × 10 chamber, walls 3, floor 3, under-layer 1.
        BoxSection::new(12e-3, 10e-3, 3e-3, 3e-3, 3e-3, 1e-3).unwrap()
    }

    /// The quadrature integrates the polynomials 1, y, y^2 exactly (closed-form area and
    /// moments of rectangles).
    #[test]
    fn quadrature_reproduces_area_and_moments() {
        let s = example();
        let q = s.quadrature(4);
        assert_relative_eq!(q.rubber_moment(0), s.rubber_area(), max_relative = 1e-13);
        // area: 18 × 17 - 12 × 10 = 186 mm^2
        assert_relative_eq!(q.rubber_moment(0), 186e-6, max_relative = 1e-13);
        assert_relative_eq!(q.rubber_moment(2), s.second_moment_about_layer(), max_relative = 1e-13);
        // first moment: 18 (16^2 - 1^2)/2 - 12 (13^2 - 3^2)/2 = 2295 - 960 = 1335 mm^3
        assert_relative_eq!(q.rubber_moment(1), 1335e-9, max_relative = 1e-13);
    }

    /// Pressure profile moments against the closed form of DESIGN 3.2 at kappa = 0:
    /// `w_c int_top ((y3 - y)/t_t) y dy + t_s int_chamber y dy + w_c int_0^tf (y/tf) y dy`.
    #[test]
    fn pressure_profile_first_moment_closed_form() {
        let s = example();
        let q = s.quadrature(4);
        let (wc, ts, tt, tf, hc) = (12e-3, 3e-3, 3e-3, 3e-3, 10e-3);
        let y2: f64 = tf + hc;
        let y3 = y2 + tt;
        // int_{y2}^{y3} (y3 - y) y dy = y3 (y3^2 - y2^2)/2 - (y3^3 - y2^3)/3
        let top = wc / tt * (y3 * (y3 * y3 - y2 * y2) / 2.0 - (y3.powi(3) - y2.powi(3)) / 3.0);
        let sides = ts * (y2 * y2 - tf * tf) / 2.0;
        let floor = wc / tf * tf.powi(3) / 3.0;
        assert_relative_eq!(q.pressure_moment(1), top + sides + floor, max_relative = 1e-13);
    }

    #[test]
    fn zero_under_layer_is_allowed_negative_is_not() {
        assert!(BoxSection::new(12e-3, 10e-3, 3e-3, 3e-3, 3e-3, 0.0).is_ok());
        let e = BoxSection::new(12e-3, 10e-3, 3e-3, -2e-3, 3e-3, 1e-3).unwrap_err();
        assert!(matches!(e, SectionError::BadDimension { field: "top_wall", .. }));
        assert!(BoxSection::new(f64::NAN, 10e-3, 3e-3, 3e-3, 3e-3, 1e-3).is_err());
    }
}

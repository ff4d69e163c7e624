//! Wrap pitch: the pressure at which the wall between two fiber turns starts to bulge.
//!
//! Between two turns of the winding the wall is a long strip, clamped along both
//! fibers, loaded by the chamber pressure on its inner face. Its free span is
//! `b = pitch - fiber width` (where the two helices cross, the gap is one whole pitch
//! less the fiber's width: the worst place). The strip bends to a cylindrical surface,
//! so it is a clamped plate strip in cylindrical bending, whose mid-span deflection in
//! small-deflection theory is
//!
//! `w = q b^4 / (384 D)`, `D = E t^3 / (12 (1 - nu^2))`
//!
//! (S. Timoshenko and S. Woinowsky-Krieger, "Theory of Plates and Shells", 2nd ed.,
//! McGraw-Hill 1959, ch. 1, "cylindrical bending of uniformly loaded rectangular plates
//! with built-in edges"; the section number is from memory). Rubber is incompressible,
//! `nu = 1/2`, `E = 3 mu`, so `D = mu t^3 / 3`. A wall between tight turns is as thick as
//! its span is wide, so the shear deflection of a Timoshenko beam is added,
//! `q b^2 / (8 k mu t)` with the shear coefficient `k = 5/6` (the same for clamped and
//! simply supported ends, since the shear force is the same); it dominates when
//! `b < 2 t`.
//!
//! **Onset of bulging** (our convention): the pressure at which that deflection reaches
//! [`BULGE_DEFLECTION_RATIO`] (half) of the wall thickness. Below it the strip bends as
//! a plate; beyond it the deflection is no longer small compared with the thickness, the
//! strip stretches as a membrane and the wall balloons between the turns. The linear
//! estimate is conservative: membrane tension makes a clamped strip stiffer than small-
//! deflection theory says (Timoshenko & Woinowsky-Krieger, same chapter). `mu` is the
//! material's small-strain shear modulus; the wall is the thinnest wall that faces the
//! chamber and is not backed by the strain-limiting layer (Box: the thinner of the top
//! and side walls; HalfRound: its wall).
//!
//! The bending model of the actuator treats the fibers only as a constraint that keeps
//! the cross-section (hoop stretch 1); their own bending stiffness and that of the seal
//! coat over them are left out, which a dense wind makes less true. A calibration against
//! a prototype (`crate::calibrate`) takes that stiffening into its modulus scale.

use crate::actuator::Actuator;
use crate::material::StrainEnergy;
use crate::section::SectionProfile;

/// Mid-span deflection, as a fraction of the wall thickness, taken as the onset of bulging.
pub const BULGE_DEFLECTION_RATIO: f64 = 0.5;

/// Timoshenko shear coefficient of a rectangular section (Reissner's 5/6).
pub const SHEAR_COEFFICIENT: f64 = 5.0 / 6.0;

/// The wrap-pitch check of one actuator.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct WrapCheck {
    /// Free span between turns, `pitch - width` (m); `<= 0` when the turns touch.
    pub span: f64,
    /// Wall thickness of the strip (m).
    pub wall: f64,
    /// Pressure at the onset of bulging (Pa); `None` when the turns touch (no free span).
    pub bulge_pressure: Option<f64>,
    /// `bulge_pressure / max_pressure`; `None` when the turns touch.
    pub margin: Option<f64>,
    /// The margin asked for.
    pub required_margin: f64,
    /// Largest pitch whose margin is the required one (m).
    pub max_safe_pitch: f64,
}

impl WrapCheck {
    /// Whether the margin is at least the required one (touching turns always are).
    pub fn ok(&self) -> bool {
        self.margin.is_none_or(|m| m >= self.required_margin)
    }
}

/// Mid-span deflection per unit pressure of a clamped strip of span `span` and
/// thickness `wall` in rubber of shear modulus `mu` (m/Pa): bending plus shear.
pub fn compliance(span: f64, wall: f64, mu: f64) -> f64 {
    let (a, b) = coefficients(wall, mu);
    a * span.powi(4) + b * span * span
}

/// `(1 / (384 D), 1 / (8 k mu t))`.
fn coefficients(wall: f64, mu: f64) -> (f64, f64) {
    let d = mu * wall.powi(3) / 3.0;
    (1.0 / (384.0 * d), 1.0 / (8.0 * SHEAR_COEFFICIENT * mu * wall))
}

/// Pressure at which a clamped strip starts to bulge (Pa); infinite for `span <= 0`.
pub fn bulge_pressure(span: f64, wall: f64, mu: f64) -> f64 {
    if span <= 0.0 {
        return f64::INFINITY;
    }
    BULGE_DEFLECTION_RATIO * wall / compliance(span, wall, mu)
}

/// The largest span that holds `pressure` (Pa) before bulging (m): the positive root of
/// `A b^4 + B b^2 = ratio t / p`, written without cancellation.
pub fn max_span(pressure: f64, wall: f64, mu: f64) -> f64 {
    let (a, b) = coefficients(wall, mu);
    let c = BULGE_DEFLECTION_RATIO * wall / pressure;
    (2.0 * c / (b + (b * b + 4.0 * a * c).sqrt())).sqrt()
}

/// The wall that bulges between turns (m).
pub fn free_wall(section: &SectionProfile) -> f64 {
    match section {
        SectionProfile::Box(s) => s.top_wall.min(s.side_wall),
        SectionProfile::HalfRound(s) => s.wall,
    }
}

/// Checks the wrap pitch of `actuator` against a margin `required_margin` over its
/// rated pressure (e.g. the scene's safety factor).
pub fn wrap_check(actuator: &Actuator, required_margin: f64) -> WrapCheck {
    let mu = actuator.material.model.shear_modulus();
    let wall = free_wall(&actuator.section);
    let span = actuator.fiber.pitch - actuator.fiber.width;
    let bulge = (span > 0.0).then(|| bulge_pressure(span, wall, mu));
    WrapCheck {
        span,
        wall,
        bulge_pressure: bulge,
        margin: bulge.map(|p| p / actuator.max_pressure),
        required_margin,
        max_safe_pitch: max_span(required_margin * actuator.max_pressure, wall, mu) + actuator.fiber.width,
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use approx::assert_relative_eq;

    /// Independent check of the strip's deflection: the Timoshenko beam equations of a
    /// clamped-clamped strip under a uniform load `q` along `+w`, integrated numerically.
    /// With the sagging moment `M = M0 + q (b x - x^2)/2` and shear force `V = dM/dx`,
    /// the rotation follows `psi' = -M / D` and the deflection `w' = psi + V / (k G t)`;
    /// `M0` is fixed by `psi(b) = 0` (the clamped far end) and the mid-span deflection is
    /// a quadrature (composite Simpson; exact here, every integrand being a polynomial of
    /// degree at most 3).
    #[test]
    fn deflection_matches_numerical_timoshenko_beam() {
        let (mu, q) = (40e3, 1.0);
        for (b, t) in [(2.5e-3, 3e-3), (9e-3, 3e-3), (30e-3, 1e-3), (1e-3, 4e-3)] {
            let d = mu * t * t * t / 3.0;
            let kgt = SHEAR_COEFFICIENT * mu * t;
            let simpson = |f: &dyn Fn(f64) -> f64, a: f64, c: f64| {
                let n = 20;
                let h = (c - a) / n as f64;
                let mut s = f(a) + f(c);
                for i in 1..n {
                    s += f(a + i as f64 * h) * if i % 2 == 1 { 4.0 } else { 2.0 };
                }
                s * h / 3.0
            };
            let moment = |m0: f64, x: f64| m0 + q * (b * x - x * x) / 2.0;
            // psi(b) is affine in M0: find its zero from two evaluations
            let psi_end = |m0: f64| simpson(&|x| -moment(m0, x) / d, 0.0, b);
            let m0 = -psi_end(0.0) / (psi_end(1.0) - psi_end(0.0));
            let psi = |x: f64| simpson(&|s| -moment(m0, s) / d, 0.0, x);
            let w_mid = simpson(&|x| psi(x) + q * (b / 2.0 - x) / kgt, 0.0, b / 2.0);
            assert_relative_eq!(m0, -q * b * b / 12.0, max_relative = 1e-9);
            assert_relative_eq!(compliance(b, t, mu) * q, w_mid, max_relative = 1e-9);
        }
    }

    /// Thin-plate limit: with the span a thousand times the thickness the shear part is
    /// negligible (it adds `16 t^2 / (k b^2) = 1.9e-5` of the bending part) and the deflection is Timoshenko & Woinowsky-Krieger's clamped strip,
    /// `w = q b^4 / (384 D)` with `D = E t^3 / (12 (1 - nu^2))`, `E = 3 mu`, `nu = 1/2`.
    #[test]
    fn thin_strip_is_the_clamped_plate_of_timoshenko() {
        let (b, t, mu, q) = (0.1f64, 1e-4f64, 50e3, 10.0);
        let d = 3.0 * mu * t.powi(3) / (12.0 * (1.0 - 0.25));
        assert_relative_eq!(compliance(b, t, mu) * q, q * b.powi(4) / (384.0 * d), max_relative = 2e-5);
    }

    /// The largest safe span holds exactly the asked pressure, and the bulge pressure
    /// falls as the span grows.
    #[test]
    fn max_span_inverts_the_bulge_pressure() {
        let (t, mu) = (3e-3, 39.4e3);
        for p in [10e3, 120e3, 2e6] {
            let b = max_span(p, t, mu);
            assert_relative_eq!(bulge_pressure(b, t, mu), p, max_relative = 1e-12);
        }
        let mut last = f64::INFINITY;
        for i in 1..40 {
            let p = bulge_pressure(i as f64 * 0.5e-3, t, mu);
            assert!(p < last);
            last = p;
        }
        assert_eq!(bulge_pressure(0.0, t, mu), f64::INFINITY);
    }

    /// The example actuator (3 mm walls, pitch 4 mm, fiber 1.5 mm, 60 kPa): the check uses
    /// the thinner free wall and its numbers agree with one another.
    #[test]
    fn example_actuator_check_is_consistent() {
        let a = Actuator::example();
        let w = wrap_check(&a, 2.0);
        assert_relative_eq!(w.span, 2.5e-3, max_relative = 1e-12);
        assert_eq!(w.wall, 3e-3);
        let mu = a.material.model.shear_modulus();
        assert_relative_eq!(
            w.bulge_pressure.unwrap(),
            bulge_pressure(2.5e-3, 3e-3, mu),
            max_relative = 1e-14
        );
        assert_relative_eq!(w.margin.unwrap() * 60e3, w.bulge_pressure.unwrap(), max_relative = 1e-14);
        // the verdict agrees with the largest safe pitch, on both sides of it
        for pitch in [2e-3, 3e-3, 4e-3, 6e-3, 12e-3] {
            let mut b = a.clone();
            b.fiber.pitch = pitch;
            let c = wrap_check(&b, 2.0);
            assert_eq!(c.ok(), pitch <= c.max_safe_pitch, "pitch {pitch}");
            assert_relative_eq!(c.max_safe_pitch, w.max_safe_pitch, max_relative = 1e-14);
        }
        let mut tight = a.clone();
        tight.fiber.pitch = 1.5e-3;
        assert_eq!(wrap_check(&tight, 2.0).bulge_pressure, None);
    }
}

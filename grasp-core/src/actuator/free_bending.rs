//! The free-curvature solve `M_w(kappa; p) = M_p(p)`.
//!
//! `F(kappa) = M_w(kappa; p) - M_p(p)` is strictly increasing (its derivative is
//! `int y^2 s'(l) dA` plus a positive wall-pressure term, positive for a
//! Drucker-stable rubber), so the root is unique when it exists. The solve keeps a
//! bracket `[lo, hi]` with `F(lo) <= 0 <= F(hi)` and takes Newton steps that stay inside
//! it, bisecting otherwise (a safeguarded Newton method: Press et al., "Numerical
//! Recipes", 3rd ed., 2007, section 9.4, `rtsafe`). It never clamps: a root outside the
//! model's range is an error that names the reason.

use super::Actuator;
use crate::kinematics::FingerShape;
use crate::math::Vec2;
use crate::section::{LawError, SectionLaw};

/// Iteration cap of the safeguarded Newton solve; the bracket halves at worst each step,
/// so 200 steps reach machine precision from any bracket.
const MAX_ITERATIONS: usize = 200;

/// Why a free curvature could not be found.
#[derive(Debug, Clone, PartialEq, thiserror::Error)]
#[non_exhaustive]
pub enum BendError {
    /// No balance inside the model's range: the pressure moment exceeds what the walls
    /// can carry before a fibre reaches the smallest stretch the model accepts.
    #[error("no moment balance inside the model's range at {pressure_pa} Pa: {reason}")]
    OutOfRange {
        /// Pressure (Pa).
        pressure_pa: f64,
        /// The limit that was hit.
        reason: LawError,
    },
    /// The top wall would have to stretch beyond any physical rubber.
    #[error("no moment balance below a top-wall stretch of {max_stretch} at {pressure_pa} Pa")]
    Unbounded {
        /// Pressure (Pa).
        pressure_pa: f64,
        /// The stretch searched up to.
        max_stretch: f64,
    },
    /// The pressure is not finite.
    #[error("pressure must be finite, got {0} Pa")]
    BadPressure(f64),
    /// The iteration cap was reached (a bug, or a non-monotone material).
    #[error("the free-curvature solve did not converge in {iterations} iterations (|F| = {residual:e} N m)")]
    NotConverged {
        /// Iterations taken.
        iterations: usize,
        /// Last residual (N m).
        residual: f64,
    },
}

/// The free-curvature root and its convergence record.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct CurvatureRoot {
    /// Chamber curvature (1/m).
    pub curvature: f64,
    /// Iterations taken.
    pub iterations: usize,
    /// `|M_w - M_p|` at the root (N m).
    pub residual: f64,
}

/// Top-wall stretch beyond which the search for a root gives up when the section has
/// no under-layer to bound the curvature (no casting silicone survives it).
const MAX_SEARCH_STRETCH: f64 = 100.0;

/// Solves `law.moment(kappa) = 0` for the free curvature.
///
/// # Errors
/// [`BendError`] when there is no root inside the model's range.
pub fn free_curvature(law: &SectionLaw) -> Result<CurvatureRoot, BendError> {
    let p = law.pressure();
    if !p.is_finite() {
        return Err(BendError::BadPressure(p));
    }
    let f = |k: f64| law.moment(k);
    let (f0, d0) = f(0.0).map_err(|reason| BendError::OutOfRange { pressure_pa: p, reason })?;
    // scale for the convergence test: the larger of the moments in play
    let scale = law.pressure_moment().abs().max(d0 * 1e-3).max(f64::MIN_POSITIVE);
    if f0.abs() <= 1e-14 * scale {
        return Ok(CurvatureRoot { curvature: 0.0, iterations: 0, residual: f0.abs() });
    }
    let (range_lo, range_hi) = law.curvature_range();
    // the root lies on the side where F changes sign
    let positive_side = f0 < 0.0;
    let limit = if positive_side { range_hi } else { range_lo };
    let (mut lo, mut hi) = if positive_side { (0.0, f64::NAN) } else { (f64::NAN, 0.0) };
    // find the far end of the bracket
    let far = if limit.is_finite() {
        let edge = limit * (1.0 - 1e-9);
        match f(edge) {
            Ok((fe, _)) if (fe > 0.0) == positive_side => edge,
            Ok(_) | Err(_) => {
                let reason = law.check_range(limit * (1.0 + 1e-9)).err().unwrap_or(LawError::OutOfRange {
                    curvature_per_m: limit,
                    face: if positive_side { "inner face (under-layer)" } else { "top wall" },
                    stretch: crate::section::MIN_STRETCH,
                });
                return Err(BendError::OutOfRange { pressure_pa: p, reason });
            }
        }
    } else {
        // no under-layer: expand by doubling from the linear estimate up to a top stretch
        // of MAX_SEARCH_STRETCH
        let y_max = law.quadrature().y_max;
        let k_cap = (MAX_SEARCH_STRETCH - 1.0) / y_max;
        let mut k = (-f0 / d0).clamp(1e-6 / y_max, k_cap);
        loop {
            let fk = f(k).map_err(|reason| BendError::OutOfRange { pressure_pa: p, reason })?.0;
            if fk > 0.0 {
                break k;
            }
            if k >= k_cap {
                return Err(BendError::Unbounded { pressure_pa: p, max_stretch: MAX_SEARCH_STRETCH });
            }
            k = (2.0 * k).min(k_cap);
        }
    };
    if positive_side {
        hi = far;
    } else {
        lo = far;
    }
    // Newton from the linear (small-curvature) estimate, kept inside [lo, hi]
    let mut k = (-f0 / d0).clamp(lo.min(hi), hi.max(lo));
    if !(k > lo && k < hi) {
        k = 0.5 * (lo + hi);
    }
    let mut last = f64::INFINITY;
    for it in 1..=MAX_ITERATIONS {
        let (fk, dk) = f(k).map_err(|reason| BendError::OutOfRange { pressure_pa: p, reason })?;
        last = fk.abs();
        if fk.abs() <= 1e-13 * scale {
            return Ok(CurvatureRoot { curvature: k, iterations: it, residual: fk.abs() });
        }
        if fk < 0.0 {
            lo = k;
        } else {
            hi = k;
        }
        let newton = k - fk / dk;
        let next = if dk > 0.0 && newton > lo && newton < hi { newton } else { 0.5 * (lo + hi) };
        if (hi - lo).abs() <= 4.0 * f64::EPSILON * k.abs().max(f64::MIN_POSITIVE) || next == k {
            return Ok(CurvatureRoot { curvature: next, iterations: it, residual: fk.abs() });
        }
        k = next;
    }
    Err(BendError::NotConverged { iterations: MAX_ITERATIONS, residual: last })
}

/// The state of a freely bending actuator at one pressure.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct FreeBending {
    /// Pressure (Pa).
    pub pressure: f64,
    /// Chamber curvature (1/m).
    pub curvature: f64,
    /// Bend angle of the tip, `kappa L` (rad).
    pub bend_angle: f64,
    /// Tip position in finger-plane coordinates `(u, w)` (m).
    pub tip: Vec2,
    /// Largest axial stretch in the wall (the top surface), `1 + kappa y_top`.
    pub max_stretch: f64,
    /// Smallest axial stretch (the inner face), `1 - kappa t_u`.
    pub min_stretch: f64,
    /// `(max_stretch - 1) / (stretch_at_break - 1)`: 0 at rest, 1 at the elongation at break.
    pub break_utilisation: f64,
    /// Convergence record of the root.
    pub iterations: usize,
}

impl FreeBending {
    /// Free bending of `actuator` under `law` (which must be the actuator's own section).
    ///
    /// # Errors
    /// See [`free_curvature`].
    pub fn of(actuator: &Actuator, law: &SectionLaw) -> Result<Self, BendError> {
        let root = free_curvature(law)?;
        let k = root.curvature;
        let shape = FingerShape {
            base_length: actuator.base_length,
            chamber_length: actuator.chamber_length,
            tip_length: actuator.tip_length,
            curvature: k,
        };
        let q = law.quadrature();
        let (a, b) = (SectionLaw::stretch_at(k, q.y_max), SectionLaw::stretch_at(k, q.y_min));
        let max_stretch = a.max(b);
        Ok(Self {
            pressure: law.pressure(),
            curvature: k,
            bend_angle: shape.bend_angle(),
            tip: shape.tip(),
            max_stretch,
            min_stretch: a.min(b),
            break_utilisation: (max_stretch - 1.0) / (actuator.material.stretch_at_break - 1.0),
            iterations: root.iterations,
        })
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::material::{HyperelasticModel, NeoHookean, Yeoh};
    use crate::section::{BoxSection, HalfRoundSection, SectionModel, SectionProfile};
    use approx::assert_relative_eq;

    fn actuator(section: SectionProfile, model: HyperelasticModel) -> Actuator {
        Actuator::example_with(section, model)
    }

    fn example_box() -> BoxSection {
        BoxSection::new(12e-3, 10e-3, 3e-3, 3e-3, 3e-3, 1e-3).unwrap()
    }

    /// Small-pressure limit against Euler–Bernoulli bending with the plane-strain modulus
    /// `4 mu` about the layer: `kappa = p A_c ybar_c / (4 mu I)` (baseline), and
    /// `kappa = p (A_c ybar_c + J) / (4 mu I)` with the wall-pressure refinement, `J` the
    /// closed-form first moment of the pressure profile (DESIGN 3.2).
    #[test]
    fn small_pressure_limit_is_euler_bernoulli() {
        let b = example_box();
        let mu = 20e3;
        let a = actuator(SectionProfile::Box(b), HyperelasticModel::NeoHookean(NeoHookean::new(mu).unwrap()));
        let p = 1.0; // 1 Pa: geometric and material nonlinearity ~ 1e-5
        let i = b.second_moment_about_layer();
        let base = a.free_bending_with(p, SectionModel::Baseline).unwrap();
        let ac_y = 12e-3 * 10e-3 * (3e-3 + 5e-3);
        assert_relative_eq!(base.curvature, p * ac_y / (4.0 * mu * i), max_relative = 1e-4);
        // J = w_c int_top ((y3 - y)/t_t) y dy + t_s int_chamber y dy + w_c int_0^tf (y/tf) y dy
        let (wc, ts, tt, tf, y2, y3) = (12e-3f64, 3e-3f64, 3e-3f64, 3e-3f64, 13e-3f64, 16e-3f64);
        let j = wc / tt * (y3 * (y3 * y3 - y2 * y2) / 2.0 - (y3.powi(3) - y2.powi(3)) / 3.0)
            + ts * (y2 * y2 - tf * tf) / 2.0
            + wc * tf * tf / 3.0;
        let wp = a.free_bending_with(p, SectionModel::WallPressure).unwrap();
        assert_relative_eq!(wp.curvature, p * (ac_y + j) / (4.0 * mu * i), max_relative = 1e-4);
    }

    /// The root satisfies the balance, curvature grows with pressure, and the
    /// wall-pressure refinement bends further than the baseline (DESIGN 3.2).
    #[test]
    fn balance_holds_and_bending_grows_with_pressure() {
        let a = actuator(
            SectionProfile::Box(example_box()),
            HyperelasticModel::Yeoh(Yeoh::new(12e3, 0.4e3, 0.0).unwrap()),
        );
        let mut last = 0.0;
        for kpa in [5.0, 10.0, 20.0, 40.0, 60.0] {
            let p = kpa * 1e3;
            let law = a.law(p, SectionModel::WallPressure);
            let fb = FreeBending::of(&a, &law).unwrap();
            let (m, _) = law.moment(fb.curvature).unwrap();
            assert!(m.abs() < 1e-12 * law.pressure_moment());
            assert!(fb.curvature > last);
            last = fb.curvature;
            let base = a.free_bending_with(p, SectionModel::Baseline).unwrap();
            assert!(fb.bend_angle > base.bend_angle);
            assert_relative_eq!(fb.max_stretch, 1.0 + fb.curvature * 16e-3, max_relative = 1e-14);
        }
    }

    #[test]
    fn zero_pressure_is_straight_and_negative_bends_the_other_way() {
        let a = actuator(
            SectionProfile::Box(example_box()),
            HyperelasticModel::NeoHookean(NeoHookean::new(20e3).unwrap()),
        );
        let fb = a.free_bending(0.0).unwrap();
        assert_eq!(fb.curvature, 0.0);
        assert_relative_eq!(fb.tip.y, 0.1, max_relative = 1e-14);
        let vac = a.free_bending_with(-2e3, SectionModel::Baseline).unwrap();
        assert!(vac.curvature < 0.0);
    }

    /// A pressure the walls cannot balance before the under-layer is crushed below
    /// stretch 0.05 is an error naming that face, not a clamped result.
    #[test]
    fn over_range_pressure_is_an_error_not_a_clamp() {
        let a = actuator(
            SectionProfile::Box(example_box()),
            HyperelasticModel::NeoHookean(NeoHookean::new(20e3).unwrap()),
        );
        let e = a.free_bending_with(5e6, SectionModel::Baseline).unwrap_err();
        assert!(
            matches!(
                e,
                BendError::OutOfRange {
                    reason: LawError::OutOfRange { face: "inner face (under-layer)", .. },
                    ..
                }
            ),
            "{e}"
        );
        assert!(matches!(a.free_bending(f64::NAN), Err(BendError::BadPressure(_))));
    }

    #[test]
    fn half_round_without_under_layer_finds_its_root() {
        let s = SectionProfile::HalfRound(HalfRoundSection::new(6e-3, 2e-3, 2e-3, 0.0).unwrap());
        let a = actuator(s, HyperelasticModel::NeoHookean(NeoHookean::new(20e3).unwrap()));
        let fb = a.free_bending(20e3).unwrap();
        assert!(fb.curvature > 0.0 && fb.iterations < 40);
    }
}

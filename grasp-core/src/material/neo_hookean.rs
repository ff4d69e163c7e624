//! The neo-Hookean solid, `W = mu/2 (I1 - 3)` (Treloar, "The Physics of Rubber
//! Elasticity", 3rd ed., 1975, eq. 4.9).

use super::invariants::{self, InvariantDerivatives};
use super::{MaterialError, StrainEnergy, finite};

/// Neo-Hookean parameters.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct NeoHookean {
    mu: f64,
}

impl NeoHookean {
    /// A neo-Hookean solid of shear modulus `mu` (Pa).
    ///
    /// # Errors
    /// `mu` not finite or not positive.
    pub fn new(mu: f64) -> Result<Self, MaterialError> {
        let mu = finite("mu", mu)?;
        if mu <= 0.0 {
            return Err(MaterialError::NonPositiveModulus { shear_modulus_pa: mu });
        }
        Ok(Self { mu })
    }
    /// Shear modulus (Pa).
    pub fn mu(&self) -> f64 {
        self.mu
    }
    fn derivatives(&self) -> InvariantDerivatives {
        InvariantDerivatives { w1: 0.5 * self.mu, ..Default::default() }
    }
}

impl StrainEnergy for NeoHookean {
    fn strain_energy(&self, l1: f64, l2: f64) -> f64 {
        let (i1, _) = invariants::invariants(l1, l2);
        0.5 * self.mu * (i1 - 3.0)
    }
    fn stress_1(&self, l1: f64, l2: f64) -> f64 {
        invariants::stress_1(self.derivatives(), l1, l2)
    }
    fn stress_1_d1(&self, l1: f64, l2: f64) -> f64 {
        invariants::stress_1_d1(self.derivatives(), l1, l2)
    }
    fn shear_modulus(&self) -> f64 {
        self.mu
    }
    /// `mu (l - l^-3)`, the closed form of the inner loop of the section law.
    fn planar_stress(&self, l: f64) -> f64 {
        let l3 = l * l * l;
        self.mu * (l - 1.0 / l3)
    }
    /// `mu (1 + 3 l^-4)`.
    fn planar_tangent(&self, l: f64) -> f64 {
        let l2 = l * l;
        self.mu * (1.0 + 3.0 / (l2 * l2))
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::material::test_support::check_model;
    use approx::assert_relative_eq;

    #[test]
    fn derivatives_match_finite_differences() {
        check_model(&NeoHookean::new(40e3).unwrap());
    }

    /// Planar tension closed form `mu (l - l^-3)` (DESIGN 3.1; Treloar 1975, ch. 4).
    #[test]
    fn planar_stress_closed_form() {
        let m = NeoHookean::new(23e3).unwrap();
        for l in [0.5f64, 1.2, 2.0, 4.0] {
            assert_relative_eq!(m.planar_stress(l), 23e3 * (l - l.powi(-3)), max_relative = 1e-13);
        }
    }

    #[test]
    fn rejects_non_positive_and_nan_modulus() {
        assert!(NeoHookean::new(0.0).is_err());
        assert!(NeoHookean::new(-1.0).is_err());
        assert!(NeoHookean::new(f64::NAN).is_err());
    }
}

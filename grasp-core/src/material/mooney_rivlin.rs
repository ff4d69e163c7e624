//! The two-parameter Mooney–Rivlin solid, `W = C10 (I1 - 3) + C01 (I2 - 3)` (Mooney,
//! "A theory of large elastic deformation", J. Appl. Phys. 11, 582, 1940; Rivlin 1948).
//! Small-strain shear modulus `mu = 2 (C10 + C01)`.

use super::invariants::{self, InvariantDerivatives};
use super::{MaterialError, StrainEnergy, finite};

/// Mooney–Rivlin parameters (Pa).
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct MooneyRivlin {
    c10: f64,
    c01: f64,
}

impl MooneyRivlin {
    /// A Mooney–Rivlin solid with `C10`, `C01` (Pa).
    ///
    /// # Errors
    /// Non-finite parameters, or `C10 + C01 <= 0`.
    pub fn new(c10: f64, c01: f64) -> Result<Self, MaterialError> {
        let c10 = finite("c10", c10)?;
        let c01 = finite("c01", c01)?;
        if c10 + c01 <= 0.0 {
            return Err(MaterialError::NonPositiveModulus { shear_modulus_pa: 2.0 * (c10 + c01) });
        }
        Ok(Self { c10, c01 })
    }
    /// `(C10, C01)` (Pa).
    pub fn coefficients(&self) -> (f64, f64) {
        (self.c10, self.c01)
    }
    fn derivatives(&self) -> InvariantDerivatives {
        InvariantDerivatives { w1: self.c10, w2: self.c01, ..Default::default() }
    }
}

impl StrainEnergy for MooneyRivlin {
    fn strain_energy(&self, l1: f64, l2: f64) -> f64 {
        let (i1, i2) = invariants::invariants(l1, l2);
        self.c10 * (i1 - 3.0) + self.c01 * (i2 - 3.0)
    }
    fn stress_1(&self, l1: f64, l2: f64) -> f64 {
        invariants::stress_1(self.derivatives(), l1, l2)
    }
    fn stress_1_d1(&self, l1: f64, l2: f64) -> f64 {
        invariants::stress_1_d1(self.derivatives(), l1, l2)
    }
    fn shear_modulus(&self) -> f64 {
        2.0 * (self.c10 + self.c01)
    }
    /// `2 (C10 + C01)(l - l^-3)`.
    fn planar_stress(&self, l: f64) -> f64 {
        2.0 * (self.c10 + self.c01) * (l - 1.0 / (l * l * l))
    }
    /// `2 (C10 + C01)(1 + 3 l^-4)`.
    fn planar_tangent(&self, l: f64) -> f64 {
        let l2 = l * l;
        2.0 * (self.c10 + self.c01) * (1.0 + 3.0 / (l2 * l2))
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::material::test_support::check_model;
    use approx::assert_relative_eq;

    #[test]
    fn derivatives_match_finite_differences() {
        check_model(&MooneyRivlin::new(10e3, 1.5e3).unwrap());
    }

    /// Uniaxial closed form `2 (l - l^-2)(C10 + C01/l)` (the Mooney plot; Treloar 1975,
    /// eq. 10.3) and planar `2 (C10 + C01)(l - l^-3)` (DESIGN 3.1).
    #[test]
    fn closed_forms_uniaxial_and_planar() {
        let (c10, c01) = (10e3, 1.5e3);
        let m = MooneyRivlin::new(c10, c01).unwrap();
        for l in [0.6f64, 1.5, 3.0] {
            let uni = 2.0 * (l - l.powi(-2)) * (c10 + c01 / l);
            assert_relative_eq!(m.uniaxial_stress(l), uni, max_relative = 1e-12);
            let pl = 2.0 * (c10 + c01) * (l - l.powi(-3));
            assert_relative_eq!(m.planar_stress(l), pl, max_relative = 1e-12);
        }
    }
}

//! The Yeoh solid, `W = C10 (I1 - 3) + C20 (I1 - 3)^2 + C30 (I1 - 3)^3` (O. H. Yeoh,
//! "Some forms of the strain energy function for rubber", Rubber Chem. Technol. 66,
//! 754–771, 1993). Small-strain shear modulus `mu = 2 C10`.

use super::invariants::{self, InvariantDerivatives};
use super::{MaterialError, StrainEnergy, finite};

/// Yeoh parameters (Pa).
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Yeoh {
    c: [f64; 3],
}

impl Yeoh {
    /// A Yeoh solid with `C10`, `C20`, `C30` (Pa); `C20` and `C30` may be zero or negative.
    ///
    /// # Errors
    /// Non-finite parameters or `C10 <= 0`.
    pub fn new(c10: f64, c20: f64, c30: f64) -> Result<Self, MaterialError> {
        let c = [finite("c10", c10)?, finite("c20", c20)?, finite("c30", c30)?];
        if c10 <= 0.0 {
            return Err(MaterialError::NonPositiveModulus { shear_modulus_pa: 2.0 * c10 });
        }
        Ok(Self { c })
    }
    /// `[C10, C20, C30]` (Pa).
    pub fn coefficients(&self) -> [f64; 3] {
        self.c
    }
    fn derivatives(&self, l1: f64, l2: f64) -> InvariantDerivatives {
        let (i1, _) = invariants::invariants(l1, l2);
        let x = i1 - 3.0;
        let [c1, c2, c3] = self.c;
        InvariantDerivatives {
            w1: c1 + 2.0 * c2 * x + 3.0 * c3 * x * x,
            w11: 2.0 * c2 + 6.0 * c3 * x,
            ..Default::default()
        }
    }
}

impl StrainEnergy for Yeoh {
    fn strain_energy(&self, l1: f64, l2: f64) -> f64 {
        let (i1, _) = invariants::invariants(l1, l2);
        let x = i1 - 3.0;
        let [c1, c2, c3] = self.c;
        x * (c1 + x * (c2 + x * c3))
    }
    fn stress_1(&self, l1: f64, l2: f64) -> f64 {
        invariants::stress_1(self.derivatives(l1, l2), l1, l2)
    }
    fn stress_1_d1(&self, l1: f64, l2: f64) -> f64 {
        invariants::stress_1_d1(self.derivatives(l1, l2), l1, l2)
    }
    fn shear_modulus(&self) -> f64 {
        2.0 * self.c[0]
    }
    /// `2 (l - l^-3) W1`, `W1 = C10 + 2 C20 x + 3 C30 x^2`, `x = l^2 + l^-2 - 2`.
    fn planar_stress(&self, l: f64) -> f64 {
        let [c1, c2, c3] = self.c;
        let l2 = l * l;
        let x = l2 + 1.0 / l2 - 2.0;
        2.0 * (l - 1.0 / (l2 * l)) * (c1 + x * (2.0 * c2 + 3.0 * c3 * x))
    }
    /// `2 (1 + 3 l^-4) W1 + 2 (l - l^-3) W1' dx/dl`, `dx/dl = 2 (l - l^-3)`.
    fn planar_tangent(&self, l: f64) -> f64 {
        let [c1, c2, c3] = self.c;
        let l2 = l * l;
        let x = l2 + 1.0 / l2 - 2.0;
        let a = l - 1.0 / (l2 * l);
        let w1 = c1 + x * (2.0 * c2 + 3.0 * c3 * x);
        let w11 = 2.0 * c2 + 6.0 * c3 * x;
        2.0 * (1.0 + 3.0 / (l2 * l2)) * w1 + 4.0 * a * a * w11
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::material::test_support::check_model;
    use approx::assert_relative_eq;

    #[test]
    fn derivatives_match_finite_differences() {
        check_model(&Yeoh::new(12e3, 0.4e3, 0.01e3).unwrap());
        check_model(&Yeoh::new(110e3, -2e3, 0.3e3).unwrap());
    }

    /// Planar closed form `2 (l - l^-3) sum_i i Ci0 (I1 - 3)^(i-1)`, `I1 = l^2 + 1 + l^-2`
    /// (DESIGN 3.1; Yeoh 1993).
    #[test]
    fn planar_closed_form() {
        let (c1, c2, c3) = (12e3, 0.4e3, 0.02e3);
        let m = Yeoh::new(c1, c2, c3).unwrap();
        for l in [0.7f64, 1.0, 2.2, 5.0] {
            let x = l * l + 1.0 + l.powi(-2) - 3.0;
            let s = 2.0 * (l - l.powi(-3)) * (c1 + 2.0 * c2 * x + 3.0 * c3 * x * x);
            assert_relative_eq!(m.planar_stress(l), s, max_relative = 1e-12, epsilon = 1e-9);
        }
    }
}

//! The Ogden solid, `W = sum_k mu_k/alpha_k (l1^a_k + l2^a_k + l3^a_k - 3)` (R. W. Ogden,
//! "Large deformation isotropic elasticity – on the correlation of theory and experiment
//! for incompressible rubberlike solids", Proc. R. Soc. Lond. A 326, 565–584, 1972).
//!
//! Convention: this crate (and the scene file) uses Ogden's own form above, with the
//! small-strain shear modulus `mu = 1/2 sum_k mu_k alpha_k`. Several finite-element codes
//! write instead `W = sum_k 2 m_k / alpha_k^2 (...)`, whose `m_k` sum to `mu`; convert
//! with [`Ogden::from_normalised_terms`]: `mu_k = 2 m_k / alpha_k`.

use super::{MaterialError, StrainEnergy, finite};

/// One Ogden term: `mu` (Pa) and the exponent `alpha`.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct OgdenTerm {
    /// Coefficient `mu_k` (Pa), Ogden's own convention.
    pub mu: f64,
    /// Exponent `alpha_k` (non-zero).
    pub alpha: f64,
}

/// Ogden parameters.
#[derive(Debug, Clone, PartialEq)]
pub struct Ogden {
    terms: Vec<OgdenTerm>,
}

impl Ogden {
    /// An Ogden solid from terms in Ogden's convention.
    ///
    /// # Errors
    /// No terms, non-finite values, a zero exponent, or a non-positive shear modulus.
    pub fn new(terms: Vec<OgdenTerm>) -> Result<Self, MaterialError> {
        if terms.is_empty() {
            return Err(MaterialError::NoTerms);
        }
        for (index, t) in terms.iter().enumerate() {
            finite("mu", t.mu)?;
            finite("alpha", t.alpha)?;
            if t.alpha == 0.0 {
                return Err(MaterialError::ZeroExponent { index });
            }
        }
        let m = Self { terms };
        let mu = m.shear_modulus();
        if !(mu > 0.0) {
            return Err(MaterialError::NonPositiveModulus { shear_modulus_pa: mu });
        }
        Ok(m)
    }

    /// From terms `(m_k, alpha_k)` of the form `W = sum 2 m_k/alpha_k^2 (...)`, where
    /// `sum m_k` is the shear modulus.
    ///
    /// # Errors
    /// As [`Ogden::new`].
    pub fn from_normalised_terms(terms: &[(f64, f64)]) -> Result<Self, MaterialError> {
        Self::new(terms.iter().map(|&(m, alpha)| OgdenTerm { mu: 2.0 * m / alpha, alpha }).collect())
    }

    /// The terms, in Ogden's convention.
    pub fn terms(&self) -> &[OgdenTerm] {
        &self.terms
    }
}

impl StrainEnergy for Ogden {
    fn strain_energy(&self, l1: f64, l2: f64) -> f64 {
        let l3 = 1.0 / (l1 * l2);
        self.terms
            .iter()
            .map(|t| t.mu / t.alpha * (l1.powf(t.alpha) + l2.powf(t.alpha) + l3.powf(t.alpha) - 3.0))
            .sum()
    }
    fn stress_1(&self, l1: f64, l2: f64) -> f64 {
        // dW/dl1 = sum mu (l1^(a-1) - l3^a / l1), l3^a/l1 = l1^(-a-1) l2^(-a)
        self.terms
            .iter()
            .map(|t| {
                let a = t.alpha;
                t.mu * (l1.powf(a - 1.0) - l1.powf(-a - 1.0) * l2.powf(-a))
            })
            .sum()
    }
    fn stress_1_d1(&self, l1: f64, l2: f64) -> f64 {
        self.terms
            .iter()
            .map(|t| {
                let a = t.alpha;
                t.mu * ((a - 1.0) * l1.powf(a - 2.0) + (a + 1.0) * l1.powf(-a - 2.0) * l2.powf(-a))
            })
            .sum()
    }
    fn shear_modulus(&self) -> f64 {
        0.5 * self.terms.iter().map(|t| t.mu * t.alpha).sum::<f64>()
    }
    /// `sum mu (l^(a-1) - l^(-a-1)) = l^-1 sum mu (l^a - l^-a)`: one `exp` per term, for
    /// the actuator model's inner loop.
    fn planar_stress(&self, l: f64) -> f64 {
        let ln = l.ln();
        self.terms
            .iter()
            .map(|t| {
                let la = (t.alpha * ln).exp();
                t.mu * (la - 1.0 / la)
            })
            .sum::<f64>()
            / l
    }
    /// `l^-2 sum mu ((a-1) l^a + (a+1) l^-a)`.
    fn planar_tangent(&self, l: f64) -> f64 {
        let ln = l.ln();
        self.terms
            .iter()
            .map(|t| {
                let la = (t.alpha * ln).exp();
                t.mu * ((t.alpha - 1.0) * la + (t.alpha + 1.0) / la)
            })
            .sum::<f64>()
            / (l * l)
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::material::test_support::check_model;
    use crate::material::{MooneyRivlin, NeoHookean};
    use approx::assert_relative_eq;

    /// Ogden (1972)'s three terms for Treloar's rubber (MPa), as quoted in
    /// shared/references (from memory there): mu = (0.63, 0.0012, -0.01), alpha = (1.3, 5, -2).
    fn ogden_1972() -> Ogden {
        Ogden::new(vec![
            OgdenTerm { mu: 0.63e6, alpha: 1.3 },
            OgdenTerm { mu: 0.0012e6, alpha: 5.0 },
            OgdenTerm { mu: -0.01e6, alpha: -2.0 },
        ])
        .unwrap()
    }

    #[test]
    fn derivatives_match_finite_differences() {
        check_model(&ogden_1972());
        check_model(
            &Ogden::new(vec![OgdenTerm { mu: 24e3, alpha: 1.8 }, OgdenTerm { mu: 0.4e3, alpha: 6.0 }])
                .unwrap(),
        );
    }

    /// Ogden's 1972 parameters give mu = 1/2 (0.63·1.3 + 0.0012·5 + 0.01·2) = 0.4225 MPa.
    #[test]
    fn shear_modulus_of_ogden_1972() {
        assert_relative_eq!(ogden_1972().shear_modulus(), 0.4225e6, max_relative = 1e-12);
    }

    /// Special cases: alpha = 2 is neo-Hookean with mu; alpha = (2, -2) is Mooney–Rivlin
    /// with mu1 = 2 C10, mu2 = -2 C01 (Ogden 1984, section 4.3.4).
    #[test]
    fn reduces_to_neo_hookean_and_mooney_rivlin() {
        let og = Ogden::new(vec![OgdenTerm { mu: 30e3, alpha: 2.0 }]).unwrap();
        let nh = NeoHookean::new(30e3).unwrap();
        let og2 = Ogden::new(vec![
            OgdenTerm { mu: 2.0 * 10e3, alpha: 2.0 },
            OgdenTerm { mu: -2.0 * 1.5e3, alpha: -2.0 },
        ])
        .unwrap();
        let mr = MooneyRivlin::new(10e3, 1.5e3).unwrap();
        for l in [0.5, 1.4, 3.0] {
            for l2 in [0.7, 1.0] {
                assert_relative_eq!(og.stress_1(l, l2), nh.stress_1(l, l2), max_relative = 1e-12);
                assert_relative_eq!(og2.stress_1(l, l2), mr.stress_1(l, l2), max_relative = 1e-12);
                assert_relative_eq!(
                    og2.strain_energy(l, l2),
                    mr.strain_energy(l, l2),
                    max_relative = 1e-12,
                    epsilon = 1e-9
                );
            }
        }
    }

    /// The fast planar forms equal the general `stress_1(l, 1)` and its derivative.
    #[test]
    fn planar_shortcuts_equal_the_general_forms() {
        let m = ogden_1972();
        for l in [0.1, 0.6, 1.0, 1.7, 4.0, 9.0] {
            assert_relative_eq!(m.planar_stress(l), m.stress_1(l, 1.0), max_relative = 1e-12, epsilon = 1e-9);
            assert_relative_eq!(m.planar_tangent(l), m.stress_1_d1(l, 1.0), max_relative = 1e-12);
        }
    }

    #[test]
    fn normalised_convention_converts() {
        let a = Ogden::from_normalised_terms(&[(20e3, 1.8), (1e3, 6.0)]).unwrap();
        assert_relative_eq!(a.shear_modulus(), 21e3, max_relative = 1e-12);
        assert_relative_eq!(a.terms()[0].mu, 2.0 * 20e3 / 1.8, max_relative = 1e-12);
    }

    #[test]
    fn rejects_empty_zero_exponent_and_negative_modulus() {
        assert_eq!(Ogden::new(vec![]), Err(MaterialError::NoTerms));
        assert!(matches!(
            Ogden::new(vec![OgdenTerm { mu: 1.0, alpha: 0.0 }]),
            Err(MaterialError::ZeroExponent { index: 0 })
        ));
        assert!(matches!(
            Ogden::new(vec![OgdenTerm { mu: -1.0, alpha: 2.0 }]),
            Err(MaterialError::NonPositiveModulus { .. })
        ));
    }
}

//! Incompressible isotropic hyperelastic materials.
//!
//! Every model is written as a *reduced* strain-energy density `W(l1, l2)` of two
//! principal stretches, the third following from incompressibility, `l3 = 1/(l1 l2)`.
//! With the third principal stress zero (a free surface or a thin sheet), the nominal
//! (first Piola–Kirchhoff) stress along direction 1 is `s1 = dW/dl1` (Ogden,
//! "Non-linear Elastic Deformations", 1984, section 7.2). The three standard tests
//! follow by choosing the lateral stretch `l2`:
//!
//! | test | `l1` | `l2` |
//! | --- | --- | --- |
//! | uniaxial tension | `l` | `l^-1/2` |
//! | equibiaxial tension | `l` | `l` |
//! | planar tension (pure shear) | `l` | `1` |
//!
//! Planar tension is the state used by the actuator model (the fibers hold the
//! cross-section).
//!
//! A model implements [`StrainEnergy`]: the energy, its first and second derivative in
//! `l1`, and the small-strain shear modulus; the stresses of the standard tests are
//! provided methods. [`HyperelasticModel`] is the closed set of models a scene can
//! name. File naming: one model per file (`neo_hookean.rs`, `mooney_rivlin.rs`,
//! `yeoh.rs`, `ogden.rs`); `invariants.rs` holds the shared algebra of models written
//! in `I1`, `I2`; `library.rs` the built-in casting-silicone classes; `fit.rs` the
//! least-squares fit to test data.

mod fit;
mod invariants;
mod library;
mod mooney_rivlin;
mod neo_hookean;
mod ogden;
mod yeoh;

pub use fit::{
    FitError, FitModel, FitReport, FitSettings, OGDEN_MAX_EXPONENT, OGDEN_START_EXPONENTS, TestPoint, fit,
    fit_with,
};
pub use library::{LibraryEntry, library, library_entry};
pub use mooney_rivlin::MooneyRivlin;
pub use neo_hookean::NeoHookean;
pub use ogden::{Ogden, OgdenTerm};
pub use yeoh::Yeoh;

/// A homogeneous deformation of a standard material test.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Hash, PartialOrd, Ord)]
#[cfg_attr(feature = "serde", derive(serde::Serialize, serde::Deserialize))]
#[cfg_attr(feature = "serde", serde(rename_all = "lowercase"))]
pub enum Deformation {
    /// Uniaxial tension: `l2 = l3 = l^-1/2`.
    Uniaxial,
    /// Equibiaxial tension: `l1 = l2 = l`, `l3 = l^-2`.
    Equibiaxial,
    /// Planar tension (pure shear): `l2 = 1`, `l3 = 1/l`.
    Planar,
}

impl Deformation {
    /// All three tests, in a fixed order.
    pub const ALL: [Deformation; 3] = [Self::Uniaxial, Self::Equibiaxial, Self::Planar];

    /// The stretch `l2` that goes with a stretch `l1 = l` in this test.
    pub fn lateral_stretch(self, l: f64) -> f64 {
        match self {
            Self::Uniaxial => 1.0 / l.sqrt(),
            Self::Equibiaxial => l,
            Self::Planar => 1.0,
        }
    }

    /// Lower-case name, as used in test-data files.
    pub fn name(self) -> &'static str {
        match self {
            Self::Uniaxial => "uniaxial",
            Self::Equibiaxial => "equibiaxial",
            Self::Planar => "planar",
        }
    }
}

/// A reduced strain-energy density of an incompressible isotropic solid.
///
/// Implementors give `W(l1, l2)` with `l3 = 1/(l1 l2)`, its derivative `dW/dl1` (the
/// nominal stress along 1 with the third principal stress zero), its second derivative,
/// and the small-strain shear modulus. The stresses of the standard tests are provided.
/// All energies are in J/m³ = Pa, stresses in Pa.
pub trait StrainEnergy {
    /// Strain energy per unit reference volume `W(l1, l2)` (Pa).
    fn strain_energy(&self, l1: f64, l2: f64) -> f64;
    /// Nominal stress along direction 1, `dW/dl1` (Pa).
    fn stress_1(&self, l1: f64, l2: f64) -> f64;
    /// `d^2 W / d l1^2` (Pa).
    fn stress_1_d1(&self, l1: f64, l2: f64) -> f64;
    /// Small-strain shear modulus `mu` (Pa); Young's modulus is `3 mu`.
    fn shear_modulus(&self) -> f64;

    /// Nominal stress in a standard test at stretch `l` (Pa).
    fn nominal_stress(&self, test: Deformation, l: f64) -> f64 {
        self.stress_1(l, test.lateral_stretch(l))
    }
    /// Nominal stress in uniaxial tension (Pa).
    fn uniaxial_stress(&self, l: f64) -> f64 {
        self.nominal_stress(Deformation::Uniaxial, l)
    }
    /// Nominal stress in equibiaxial tension (Pa).
    fn equibiaxial_stress(&self, l: f64) -> f64 {
        self.nominal_stress(Deformation::Equibiaxial, l)
    }
    /// Nominal stress in planar tension (pure shear) (Pa).
    fn planar_stress(&self, l: f64) -> f64 {
        self.stress_1(l, 1.0)
    }
    /// Tangent `ds/dl` of the planar-tension stress (Pa). At `l = 1` it is the
    /// plane-strain modulus `4 mu`.
    fn planar_tangent(&self, l: f64) -> f64 {
        self.stress_1_d1(l, 1.0)
    }
}

/// Why material parameters were refused.
#[derive(Debug, Clone, PartialEq, thiserror::Error)]
#[non_exhaustive]
pub enum MaterialError {
    /// A parameter is NaN or infinite.
    #[error("{name} must be a finite number, got {value}")]
    NotFinite {
        /// Parameter name.
        name: &'static str,
        /// The value given.
        value: f64,
    },
    /// The small-strain shear modulus is not positive.
    #[error("the small-strain shear modulus must be > 0, got {shear_modulus_pa} Pa")]
    NonPositiveModulus {
        /// The modulus these parameters give (Pa).
        shear_modulus_pa: f64,
    },
    /// An Ogden model with no terms.
    #[error("an Ogden model needs at least one term")]
    NoTerms,
    /// An Ogden exponent of zero.
    #[error("Ogden exponent alpha of term {index} must be non-zero")]
    ZeroExponent {
        /// Index of the term (0-based).
        index: usize,
    },
    /// The planar-tension stress stops increasing with stretch: the parameters describe
    /// an unstable material in the range the actuator model uses (Drucker's condition).
    #[error(
        "planar-tension stress stops increasing at stretch {stretch:.3}: the parameters are unstable there"
    )]
    Unstable {
        /// First stretch at which the tangent is not positive.
        stretch: f64,
    },
}

pub(crate) fn finite(name: &'static str, value: f64) -> Result<f64, MaterialError> {
    if value.is_finite() { Ok(value) } else { Err(MaterialError::NotFinite { name, value }) }
}

/// The material models a scene can name.
#[derive(Debug, Clone, PartialEq)]
pub enum HyperelasticModel {
    /// `W = mu/2 (I1 - 3)`.
    NeoHookean(NeoHookean),
    /// `W = C10 (I1 - 3) + C01 (I2 - 3)`.
    MooneyRivlin(MooneyRivlin),
    /// `W = sum_i Ci0 (I1 - 3)^i`, up to three terms.
    Yeoh(Yeoh),
    /// `W = sum_k mu_k/alpha_k (l1^a_k + l2^a_k + l3^a_k - 3)`.
    Ogden(Ogden),
}

impl HyperelasticModel {
    fn inner(&self) -> &dyn StrainEnergy {
        match self {
            Self::NeoHookean(m) => m,
            Self::MooneyRivlin(m) => m,
            Self::Yeoh(m) => m,
            Self::Ogden(m) => m,
        }
    }

    /// Checks Drucker stability in planar tension over `[l_min, l_max]`: the tangent
    /// `ds/dl` must stay positive (checked on 200 points, geometric spacing).
    ///
    /// # Errors
    /// [`MaterialError::Unstable`] at the first stretch where it is not.
    pub fn check_planar_stability(&self, l_min: f64, l_max: f64) -> Result<(), MaterialError> {
        let n = 200;
        let ratio = (l_max / l_min).ln();
        for i in 0..=n {
            let l = l_min * (ratio * i as f64 / n as f64).exp();
            let t = self.planar_tangent(l);
            if !(t > 0.0) {
                return Err(MaterialError::Unstable { stretch: l });
            }
        }
        Ok(())
    }

    /// A short name of the model family.
    pub fn family(&self) -> &'static str {
        match self {
            Self::NeoHookean(_) => "neo-Hookean",
            Self::MooneyRivlin(_) => "Mooney-Rivlin",
            Self::Yeoh(_) => "Yeoh",
            Self::Ogden(_) => "Ogden",
        }
    }
}

impl StrainEnergy for HyperelasticModel {
    fn strain_energy(&self, l1: f64, l2: f64) -> f64 {
        self.inner().strain_energy(l1, l2)
    }
    fn stress_1(&self, l1: f64, l2: f64) -> f64 {
        // A direct match is measurably faster than the dyn call in the section
        // quadrature's inner loop.
        match self {
            Self::NeoHookean(m) => m.stress_1(l1, l2),
            Self::MooneyRivlin(m) => m.stress_1(l1, l2),
            Self::Yeoh(m) => m.stress_1(l1, l2),
            Self::Ogden(m) => m.stress_1(l1, l2),
        }
    }
    fn stress_1_d1(&self, l1: f64, l2: f64) -> f64 {
        match self {
            Self::NeoHookean(m) => m.stress_1_d1(l1, l2),
            Self::MooneyRivlin(m) => m.stress_1_d1(l1, l2),
            Self::Yeoh(m) => m.stress_1_d1(l1, l2),
            Self::Ogden(m) => m.stress_1_d1(l1, l2),
        }
    }
    fn shear_modulus(&self) -> f64 {
        self.inner().shear_modulus()
    }
    fn planar_stress(&self, l: f64) -> f64 {
        match self {
            Self::NeoHookean(m) => m.planar_stress(l),
            Self::MooneyRivlin(m) => m.planar_stress(l),
            Self::Yeoh(m) => m.planar_stress(l),
            Self::Ogden(m) => m.planar_stress(l),
        }
    }
    fn planar_tangent(&self, l: f64) -> f64 {
        match self {
            Self::NeoHookean(m) => m.planar_tangent(l),
            Self::MooneyRivlin(m) => m.planar_tangent(l),
            Self::Yeoh(m) => m.planar_tangent(l),
            Self::Ogden(m) => m.planar_tangent(l),
        }
    }
}

/// A rubber: its constitutive model plus the data a fabrication and a failure check need.
#[derive(Debug, Clone, PartialEq)]
pub struct Material {
    /// Constitutive model.
    pub model: HyperelasticModel,
    /// Density (kg/m³).
    pub density: f64,
    /// Uniaxial stretch at break (`1 + elongation at break`, dimensionless, > 1).
    pub stretch_at_break: f64,
}

#[cfg(test)]
pub(crate) mod test_support {
    //! Checks shared by the per-model tests.
    use super::*;
    use approx::assert_relative_eq;

    /// Central difference of `f` at `x`.
    pub fn central_difference(f: impl Fn(f64) -> f64, x: f64) -> f64 {
        let h = 1e-5 * x.abs().max(1.0);
        (f(x + h) - f(x - h)) / (2.0 * h)
    }

    /// Energy zero at identity, stress zero at identity, `dW/dl1` and `d2W/dl1^2` equal to
    /// central differences, planar tangent at 1 equal to `4 mu`, and `s2 = 0` in uniaxial
    /// tension (`dW/dl2` at the uniaxial state, by the symmetry `W(l1,l2) = W(l2,l1)`), and
    /// the planar shortcuts equal to the general forms at `l2 = 1`.
    pub fn check_model(m: &dyn StrainEnergy) {
        let mu = m.shear_modulus();
        assert_relative_eq!(m.strain_energy(1.0, 1.0), 0.0, epsilon = 1e-12 * mu);
        assert_relative_eq!(m.stress_1(1.0, 1.0), 0.0, epsilon = 1e-12 * mu);
        assert_relative_eq!(m.planar_tangent(1.0), 4.0 * mu, max_relative = 1e-9);
        for &l1 in &[0.4, 0.8, 1.0, 1.3, 2.0, 3.5, 6.0] {
            for &l2 in &[0.5, 1.0, 1.7] {
                let fd = central_difference(|x| m.strain_energy(x, l2), l1);
                assert_relative_eq!(m.stress_1(l1, l2), fd, epsilon = 1e-6 * mu, max_relative = 1e-6);
                let fd2 = central_difference(|x| m.stress_1(x, l2), l1);
                assert_relative_eq!(m.stress_1_d1(l1, l2), fd2, epsilon = 1e-6 * mu, max_relative = 1e-6);
            }
            // the planar shortcuts (closed forms of the section law's inner loop) equal the
            // general reduced-energy derivatives at l2 = 1
            assert_relative_eq!(
                m.planar_stress(l1),
                m.stress_1(l1, 1.0),
                epsilon = 1e-9 * mu,
                max_relative = 1e-12
            );
            assert_relative_eq!(m.planar_tangent(l1), m.stress_1_d1(l1, 1.0), max_relative = 1e-12);
            // lateral stress of uniaxial tension: dW/dl2 at (l, l^-1/2) = stress_1 with roles swapped
            let lat = m.stress_1(l1.powf(-0.5), l1);
            assert_relative_eq!(lat, 0.0, epsilon = 1e-9 * mu.max(m.uniaxial_stress(l1).abs()));
        }
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use approx::assert_relative_eq;

    /// shared/references: neo-Hookean nominal stress at stretch 2, mu = 1: uniaxial 1.75,
    /// equibiaxial 1.96875, planar 1.875 (closed forms `mu (l - l^-2)`, `mu (l - l^-5)`,
    /// `mu (l - l^-3)`; Treloar, "The Physics of Rubber Elasticity", 3rd ed. 1975, ch. 4).
    #[test]
    fn neo_hookean_stresses_at_stretch_two_match_closed_forms() {
        let m = HyperelasticModel::NeoHookean(NeoHookean::new(1.0).unwrap());
        assert_relative_eq!(m.uniaxial_stress(2.0), 1.75, max_relative = 1e-14);
        assert_relative_eq!(m.equibiaxial_stress(2.0), 1.96875, max_relative = 1e-14);
        assert_relative_eq!(m.planar_stress(2.0), 1.875, max_relative = 1e-14);
    }

    #[test]
    fn stability_check_flags_a_softening_yeoh_fit() {
        // C20 strongly negative: the planar tangent turns negative at moderate stretch.
        let m = HyperelasticModel::Yeoh(Yeoh::new(100e3, -20e3, 0.0).unwrap());
        assert!(matches!(m.check_planar_stability(0.3, 4.0), Err(MaterialError::Unstable { .. })));
        let ok = HyperelasticModel::Yeoh(Yeoh::new(100e3, 2e3, 0.0).unwrap());
        assert!(ok.check_planar_stability(0.3, 8.0).is_ok());
    }
}

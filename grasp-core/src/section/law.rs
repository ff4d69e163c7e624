//! The section's moment–curvature law at a pressure.
//!
//! Sign convention: `kappa > 0` bends the finger toward its strain-limiting layer (the
//! way pressure bends it); moments are positive in the same sense. The law the rod uses
//! is `m(kappa) = M_w(kappa; p) - M_p(p)`: the net internal bending moment, zero at the
//! free curvature (DESIGN 3.3).

use super::{SectionModel, SectionPoint, SectionQuadrature};
use crate::material::{HyperelasticModel, StrainEnergy};

/// Smallest axial stretch anywhere in the section that the model accepts (DESIGN 3.2).
pub const MIN_STRETCH: f64 = 0.05;

/// Why the law could not be evaluated.
#[derive(Debug, Clone, Copy, PartialEq, thiserror::Error)]
#[non_exhaustive]
pub enum LawError {
    /// The curvature drives some fibre of the section to a stretch at or below
    /// [`MIN_STRETCH`], outside the model's range.
    #[error(
        "curvature {curvature_per_m:.4} 1/m compresses the {face} to stretch {stretch:.3}, outside the model's range (> {MIN_STRETCH})"
    )]
    OutOfRange {
        /// Curvature asked for (1/m).
        curvature_per_m: f64,
        /// Which face: "inner face (under-layer)" or "top wall".
        face: &'static str,
        /// The stretch it would have there.
        stretch: f64,
    },
}

/// The moment–curvature law of one section, material and pressure.
#[derive(Debug, Clone, PartialEq)]
pub struct SectionLaw {
    quadrature: SectionQuadrature,
    material: HyperelasticModel,
    pressure: f64,
    model: SectionModel,
    /// The rubber's points again, as columns for the inner loop of [`Self::wall_moment`].
    rubber: RubberColumns,
}

/// Heights `y_i`, `w_i y_i` and `w_i y_i^2` of the rubber's quadrature points, each as
/// the same product the loop over [`SectionPoint`]s forms.
#[derive(Debug, Clone, PartialEq)]
struct RubberColumns {
    y: Vec<f64>,
    wy: Vec<f64>,
    wyy: Vec<f64>,
}

impl RubberColumns {
    fn new(points: &[SectionPoint]) -> Self {
        Self {
            y: points.iter().map(|q| q.y).collect(),
            wy: points.iter().map(|q| q.weight * q.y).collect(),
            wyy: points.iter().map(|q| q.weight * q.y * q.y).collect(),
        }
    }
}

impl SectionLaw {
    /// The law of `quadrature` made of `material` at chamber pressure `pressure` (Pa, gauge).
    pub fn new(
        quadrature: SectionQuadrature,
        material: HyperelasticModel,
        pressure: f64,
        model: SectionModel,
    ) -> Self {
        let rubber = RubberColumns::new(&quadrature.rubber);
        Self { quadrature, material, pressure, model, rubber }
    }

    /// The same section and material at another pressure (Pa).
    pub fn at_pressure(&self, pressure: f64) -> Self {
        Self { pressure, ..self.clone() }
    }

    /// Chamber pressure (Pa).
    pub fn pressure(&self) -> f64 {
        self.pressure
    }
    /// The moment balance in use.
    pub fn model(&self) -> SectionModel {
        self.model
    }
    /// The section's quadrature.
    pub fn quadrature(&self) -> &SectionQuadrature {
        &self.quadrature
    }
    /// The material.
    pub fn material(&self) -> &HyperelasticModel {
        &self.material
    }

    /// Pressure moment `M_p = p A_c ybar_c` (N m).
    pub fn pressure_moment(&self) -> f64 {
        self.pressure * self.quadrature.chamber_area * self.quadrature.chamber_centroid
    }

    /// The open interval of curvatures (1/m) inside the model's range: every fibre keeps a
    /// stretch above [`MIN_STRETCH`]. The upper end is infinite without an under-layer.
    pub fn curvature_range(&self) -> (f64, f64) {
        let q = &self.quadrature;
        let hi = if q.y_min < 0.0 { (1.0 - MIN_STRETCH) / -q.y_min } else { f64::INFINITY };
        let lo = -(1.0 - MIN_STRETCH) / q.y_max;
        (lo, hi)
    }

    /// Checks `kappa` against [`Self::curvature_range`].
    ///
    /// # Errors
    /// [`LawError::OutOfRange`] naming the face that would be over-compressed.
    pub fn check_range(&self, kappa: f64) -> Result<(), LawError> {
        let q = &self.quadrature;
        let bottom = 1.0 + kappa * q.y_min;
        let top = 1.0 + kappa * q.y_max;
        if !(bottom > MIN_STRETCH) {
            return Err(LawError::OutOfRange {
                curvature_per_m: kappa,
                face: "inner face (under-layer)",
                stretch: bottom,
            });
        }
        if !(top > MIN_STRETCH) {
            return Err(LawError::OutOfRange { curvature_per_m: kappa, face: "top wall", stretch: top });
        }
        Ok(())
    }

    /// Wall moment `M_w(kappa; p)` and its derivative `dM_w/dkappa` (N m, N m²).
    ///
    /// `M_w = sum_i w_i y_i s(1 + kappa y_i)` over the rubber, and with the wall-pressure
    /// refinement `- p sum_j v_j y_j / (1 + kappa y_j)` over the pressure-loaded walls.
    ///
    /// # Errors
    /// Outside [`Self::curvature_range`].
    pub fn wall_moment(&self, kappa: f64) -> Result<(f64, f64), LawError> {
        self.check_range(kappa)?;
        // one loop per material model, the model's closed forms inlined into it
        let rubber = &self.rubber;
        let (mut m, mut dm) = match &self.material {
            HyperelasticModel::NeoHookean(x) => rubber_sums(x, rubber, kappa),
            HyperelasticModel::MooneyRivlin(x) => rubber_sums(x, rubber, kappa),
            HyperelasticModel::Yeoh(x) => rubber_sums(x, rubber, kappa),
            HyperelasticModel::Ogden(x) => rubber_sums(x, rubber, kappa),
        };
        if self.model == SectionModel::WallPressure && self.pressure != 0.0 {
            let p = self.pressure;
            for q in &self.quadrature.pressure {
                let inv_l = 1.0 / (1.0 + kappa * q.y);
                let vy = q.weight * q.y;
                m -= p * vy * inv_l;
                dm += p * vy * q.y * inv_l * inv_l;
            }
        }
        Ok((m, dm))
    }

    /// Net internal moment `m(kappa) = M_w(kappa; p) - M_p(p)` and `dm/dkappa`.
    ///
    /// # Errors
    /// Outside [`Self::curvature_range`].
    pub fn moment(&self, kappa: f64) -> Result<(f64, f64), LawError> {
        let (m, dm) = self.wall_moment(kappa)?;
        Ok((m - self.pressure_moment(), dm))
    }

    /// Bending stiffness at zero curvature and zero pressure, `4 mu int y^2 dA` (N m²):
    /// Euler–Bernoulli with the plane-strain modulus `E/(1 - nu^2) = 4 mu` (nu = 1/2),
    /// about the strain-limiting layer.
    pub fn small_strain_stiffness(&self) -> f64 {
        4.0 * self.material.shear_modulus() * self.quadrature.rubber_moment(2)
    }

    /// Axial stretch at height `y` for curvature `kappa`: `1 + kappa y`.
    pub fn stretch_at(kappa: f64, y: f64) -> f64 {
        1.0 + kappa * y
    }
}

/// `(sum_i w_i y_i s(1 + kappa y_i), sum_i w_i y_i^2 s'(1 + kappa y_i))` over the rubber's
/// quadrature points, `s` the planar-tension stress of `material`: the stresses of a
/// chunk of points first (independent, so the compiler may vectorise them), then the
/// sums in the points' order.
fn rubber_sums<M: StrainEnergy>(material: &M, rubber: &RubberColumns, kappa: f64) -> (f64, f64) {
    const CHUNK: usize = 16;
    let mut m = 0.0;
    let mut dm = 0.0;
    let chunks = rubber.y.chunks(CHUNK).zip(rubber.wy.chunks(CHUNK)).zip(rubber.wyy.chunks(CHUNK));
    for ((y, wy), wyy) in chunks {
        let k = y.len();
        let mut stress = [0.0; CHUNK];
        let mut tangent = [0.0; CHUNK];
        for ((y, s), t) in y.iter().zip(&mut stress[..k]).zip(&mut tangent[..k]) {
            let l = 1.0 + kappa * y;
            *s = material.planar_stress(l);
            *t = material.planar_tangent(l);
        }
        for (((wy, wyy), s), t) in wy.iter().zip(wyy).zip(&stress[..k]).zip(&tangent[..k]) {
            m += wy * s;
            dm += wyy * t;
        }
    }
    (m, dm)
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::material::{NeoHookean, Ogden, OgdenTerm, Yeoh};
    use crate::section::{BoxSection, HalfRoundSection, SectionProfile};
    use approx::assert_relative_eq;

    fn box_law(model: SectionModel, p: f64) -> SectionLaw {
        let s = SectionProfile::Box(BoxSection::new(12e-3, 10e-3, 3e-3, 3e-3, 3e-3, 1e-3).unwrap());
        let mat = HyperelasticModel::Yeoh(Yeoh::new(12e3, 0.4e3, 0.0).unwrap());
        SectionLaw::new(s.quadrature(8), mat, p, model)
    }

    #[test]
    fn derivative_matches_central_difference() {
        for model in [SectionModel::Baseline, SectionModel::WallPressure] {
            let law = box_law(model, 20e3);
            for kappa in [-20.0, 0.0, 5.0, 30.0, 200.0] {
                let (_, dm) = law.moment(kappa).unwrap();
                let h = 1e-4;
                let fd = (law.moment(kappa + h).unwrap().0 - law.moment(kappa - h).unwrap().0) / (2.0 * h);
                assert_relative_eq!(dm, fd, max_relative = 1e-6);
            }
        }
    }

    /// The Gauss rule converges: 8 points per band agree with 48 to 1e-10 relative for a
    /// strongly nonlinear Ogden rubber at a large curvature.
    #[test]
    fn quadrature_is_converged_at_eight_points() {
        let mat = HyperelasticModel::Ogden(
            Ogden::new(vec![
                OgdenTerm { mu: 0.63e6, alpha: 1.3 },
                OgdenTerm { mu: 0.0012e6, alpha: 5.0 },
                OgdenTerm { mu: -0.01e6, alpha: -2.0 },
            ])
            .unwrap(),
        );
        for s in [
            SectionProfile::Box(BoxSection::new(12e-3, 10e-3, 3e-3, 3e-3, 3e-3, 1e-3).unwrap()),
            SectionProfile::HalfRound(HalfRoundSection::new(6e-3, 2e-3, 2e-3, 1e-3).unwrap()),
        ] {
            for kappa in [-30.0, 40.0, 300.0] {
                let a = SectionLaw::new(s.quadrature(8), mat.clone(), 30e3, SectionModel::WallPressure)
                    .wall_moment(kappa)
                    .unwrap();
                let b = SectionLaw::new(s.quadrature(48), mat.clone(), 30e3, SectionModel::WallPressure)
                    .wall_moment(kappa)
                    .unwrap();
                assert_relative_eq!(a.0, b.0, max_relative = 1e-10);
                assert_relative_eq!(a.1, b.1, max_relative = 1e-10);
            }
        }
    }

    /// At zero pressure and zero curvature the tangent is the Euler–Bernoulli stiffness
    /// with the plane-strain modulus, `4 mu I` about the layer (closed form of I).
    #[test]
    fn small_strain_tangent_is_plane_strain_euler_bernoulli() {
        let b = BoxSection::new(12e-3, 10e-3, 3e-3, 3e-3, 3e-3, 1e-3).unwrap();
        let law = SectionLaw::new(
            SectionProfile::Box(b).quadrature(8),
            HyperelasticModel::NeoHookean(NeoHookean::new(20e3).unwrap()),
            0.0,
            SectionModel::Baseline,
        );
        let (m, dm) = law.moment(0.0).unwrap();
        assert_relative_eq!(m, 0.0, epsilon = 1e-18);
        assert_relative_eq!(dm, 4.0 * 20e3 * b.second_moment_about_layer(), max_relative = 1e-12);
    }

    #[test]
    fn range_limits_name_the_face() {
        let law = box_law(SectionModel::Baseline, 0.0);
        let (lo, hi) = law.curvature_range();
        assert_relative_eq!(hi, 0.95 / 1e-3, max_relative = 1e-12);
        assert_relative_eq!(lo, -0.95 / 16e-3, max_relative = 1e-12);
        assert!(matches!(
            law.moment(hi * 1.01),
            Err(LawError::OutOfRange { face: "inner face (under-layer)", .. })
        ));
        assert!(matches!(law.moment(lo * 1.01), Err(LawError::OutOfRange { face: "top wall", .. })));
    }
}

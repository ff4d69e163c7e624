//! One fiber-reinforced bending actuator and its free bending.
//!
//! Free bending is the quasi-static moment balance of Polygerinos et al., "Modeling of
//! Soft Fiber-Reinforced Bending Actuators", IEEE T-RO 31(3), 2015: the chamber pressure
//! acting on the cavity gives `M_p = p A_c ybar_c`; the stretched walls resist with
//! `M_w(kappa)`; the free curvature solves `M_w(kappa) = M_p` ([`free_curvature`]).
//! The passive base and the tip cap stay straight; the chamber is one constant-curvature
//! arc ([`crate::kinematics::FingerShape`]).

mod free_bending;

pub use free_bending::{BendError, FreeBending, free_curvature};

use crate::material::{HyperelasticModel, Material, Yeoh};
use crate::section::{BoxSection, SectionLaw, SectionModel, SectionProfile, SectionQuadrature};

/// Gauss points per band of the section quadrature (converged to 1e-10, see the
/// section-law tests).
pub const SECTION_GAUSS_POINTS: usize = 8;

/// The fiber winding: a double helix of pitch `pitch` (m) of a thread or ribbon of
/// width `width` (m).
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Fiber {
    /// Axial distance between turns of one helix (m).
    pub pitch: f64,
    /// Thread or ribbon width (m).
    pub width: f64,
}

/// Why an actuator was refused.
#[derive(Debug, Clone, PartialEq, thiserror::Error)]
#[non_exhaustive]
pub enum ActuatorError {
    /// A length is not finite or out of its range.
    #[error("{field} must be {expected}, got {value} m")]
    BadLength {
        /// Field name (without unit).
        field: &'static str,
        /// What was expected.
        expected: &'static str,
        /// Value given (m).
        value: f64,
    },
    /// The rated pressure is not finite or not positive.
    #[error("max_pressure must be > 0, got {value} Pa")]
    BadMaxPressure {
        /// Value given (Pa).
        value: f64,
    },
}

/// An actuator design: material, section, lengths, fiber and rating.
#[derive(Debug, Clone, PartialEq)]
pub struct Actuator {
    /// Name from the scene.
    pub name: String,
    /// Name of its material (scene key or built-in class).
    pub material_name: String,
    /// The rubber.
    pub material: Material,
    /// Chamber profile.
    pub section: SectionProfile,
    /// Bending (chamber) length (m).
    pub chamber_length: f64,
    /// Straight passive base clamped in the hub (m).
    pub base_length: f64,
    /// Straight tip cap (m).
    pub tip_length: f64,
    /// The fiber winding.
    pub fiber: Fiber,
    /// Rated maximum pressure (Pa, gauge).
    pub max_pressure: f64,
    /// The moment balance used by default.
    pub section_model: SectionModel,
    quadrature: SectionQuadrature,
}

impl Actuator {
    /// A validated actuator.
    ///
    /// # Errors
    /// A non-positive chamber length, negative base or tip length, non-positive fiber
    /// pitch or width, or a non-positive rated pressure.
    #[expect(
        clippy::too_many_arguments,
        reason = "one argument per design field; built once, from the scene"
    )]
    pub fn new(
        name: impl Into<String>,
        material_name: impl Into<String>,
        material: Material,
        section: SectionProfile,
        chamber_length: f64,
        base_length: f64,
        tip_length: f64,
        fiber: Fiber,
        max_pressure: f64,
        section_model: SectionModel,
    ) -> Result<Self, ActuatorError> {
        let check = |field, value: f64, strict: bool| {
            let ok = value.is_finite() && if strict { value > 0.0 } else { value >= 0.0 };
            if ok {
                Ok(value)
            } else {
                Err(ActuatorError::BadLength { field, expected: if strict { "> 0" } else { ">= 0" }, value })
            }
        };
        check("chamber_length", chamber_length, true)?;
        check("base_length", base_length, false)?;
        check("tip_length", tip_length, false)?;
        check("fiber.pitch", fiber.pitch, true)?;
        check("fiber.width", fiber.width, true)?;
        if !(max_pressure.is_finite() && max_pressure > 0.0) {
            return Err(ActuatorError::BadMaxPressure { value: max_pressure });
        }
        let quadrature = section.quadrature(SECTION_GAUSS_POINTS);
        Ok(Self {
            name: name.into(),
            material_name: material_name.into(),
            material,
            section,
            chamber_length,
            base_length,
            tip_length,
            fiber,
            max_pressure,
            section_model,
            quadrature,
        })
    }

    /// The example actuator `"f100"` of the scene example in the design notes (values
    /// invented): Yeoh rubber `C10 = 12 kPa`, `C20 = 0.4 kPa`, stretch at break 10; a Box
    /// section with a 12 × 10 mm chamber, 3 mm walls, top and floor and a 1 mm under-layer;
    /// 90 mm chamber, 5 mm base and tip; fiber pitch 4 mm; rated 60 kPa. For examples,
    /// tests and benchmarks.
    pub fn example() -> Self {
        let section =
            BoxSection::new(12e-3, 10e-3, 3e-3, 3e-3, 3e-3, 1e-3).unwrap_or_else(|_| unreachable!());
        let rubber = Yeoh::new(12e3, 0.4e3, 0.0).unwrap_or_else(|_| unreachable!());
        Self::example_with(SectionProfile::Box(section), HyperelasticModel::Yeoh(rubber))
    }

    /// [`Actuator::example`]'s lengths, fiber and rating with another section and rubber.
    pub fn example_with(section: SectionProfile, model: HyperelasticModel) -> Self {
        Self::new(
            "f100",
            "example rubber",
            Material { model, density: 1070.0, stretch_at_break: 10.0 },
            section,
            0.09,
            0.005,
            0.005,
            Fiber { pitch: 4e-3, width: 1.5e-3 },
            60e3,
            SectionModel::WallPressure,
        )
        .unwrap_or_else(|_| unreachable!("the example's lengths are valid"))
    }

    /// Total length clamp to tip (m).
    pub fn length(&self) -> f64 {
        self.base_length + self.chamber_length + self.tip_length
    }

    /// The section law at pressure `p` (Pa) with the given moment balance.
    pub fn law(&self, p: f64, model: SectionModel) -> SectionLaw {
        SectionLaw::new(self.quadrature.clone(), self.material.model.clone(), p, model)
    }

    /// Free bending at pressure `p` (Pa) with the actuator's own moment balance.
    ///
    /// # Errors
    /// See [`free_curvature`].
    pub fn free_bending(&self, p: f64) -> Result<FreeBending, BendError> {
        self.free_bending_with(p, self.section_model)
    }

    /// Free bending at pressure `p` (Pa) with moment balance `model`.
    ///
    /// # Errors
    /// See [`free_curvature`].
    pub fn free_bending_with(&self, p: f64, model: SectionModel) -> Result<FreeBending, BendError> {
        FreeBending::of(self, &self.law(p, model))
    }

    /// Volume of cast rubber in the chamber part of the finger (m³): rubber area times
    /// chamber length. Base and tip caps are solid; see `rubber_volume`.
    pub fn chamber_rubber_volume(&self) -> f64 {
        self.section.rubber_area() * self.chamber_length
    }

    /// Volume of rubber in the whole finger (m³): the chamber part plus solid base and
    /// tip caps of the full outer section.
    pub fn rubber_volume(&self) -> f64 {
        let full = self.section.rubber_area() + self.section.chamber_area();
        self.chamber_rubber_volume() + full * (self.base_length + self.tip_length)
    }
}

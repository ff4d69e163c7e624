//! Actuator cross-sections and the wall moment–curvature law.
//!
//! A section is described in its own frame: `y` is the height above the
//! strain-limiting layer (the inextensible neutral surface, `y = 0`), `x` across the
//! finger. Rubber at height `y` stretches axially by `l(y) = 1 + kappa y` in planar
//! tension (the fibers hold the cross-section; Polygerinos et al., "Modeling of Soft
//! Fiber-Reinforced Bending Actuators", IEEE T-RO 31(3), 778–789, 2015).
//!
//! The wall moment is `M_w(kappa) = int s(1 + kappa y) y dA` over the rubber
//! ([`SectionLaw`]). With the wall-pressure refinement ([`SectionModel::WallPressure`],
//! after Cacucciolo et al., Smart Mater. Struct. 25, 105020, 2016) the chamber pressure
//! also acts through the wall thickness, `sigma_r` falling linearly from `-p` at the
//! chamber face to `0` at the wall's other face; with incompressibility the nominal
//! axial stress becomes `s(l) + sigma_r / l`.
//!
//! Each profile ([`BoxSection`], [`HalfRoundSection`]) turns itself into a
//! [`SectionQuadrature`]: Gauss–Legendre points `(y, dA)` per band of constant strip
//! width, so the law costs one stress evaluation per point. Adding a profile means
//! adding a file here that builds that quadrature (see DEVELOPERS.md).

mod box_section;
mod half_round;
mod law;

pub use box_section::BoxSection;
pub use half_round::HalfRoundSection;
pub use law::{LawError, MIN_STRETCH, SectionLaw};

/// Which moment balance to use (DESIGN 3.2).
#[derive(Debug, Clone, Copy, PartialEq, Eq, Default, Hash)]
#[cfg_attr(feature = "serde", derive(serde::Serialize, serde::Deserialize))]
pub enum SectionModel {
    /// The plain moment balance of Polygerinos et al. (2015).
    Baseline,
    /// The balance plus the through-thickness pressure in the walls (Cacucciolo et al. 2016).
    #[default]
    WallPressure,
}

impl SectionModel {
    /// The name used in reports: `"baseline"` or `"wall-pressure"`.
    pub fn name(self) -> &'static str {
        match self {
            Self::Baseline => "baseline",
            Self::WallPressure => "wall-pressure",
        }
    }
}

/// Why a section was refused.
#[derive(Debug, Clone, PartialEq, thiserror::Error)]
#[non_exhaustive]
pub enum SectionError {
    /// A dimension that must be positive (or, for the under-layer, non-negative) is not,
    /// or is not finite.
    #[error("{field} must be {expected}, got {value} m")]
    BadDimension {
        /// Field name (without unit).
        field: &'static str,
        /// What was expected, e.g. "> 0".
        expected: &'static str,
        /// The value given (m).
        value: f64,
    },
}

pub(crate) fn positive(field: &'static str, value: f64) -> Result<f64, SectionError> {
    if value.is_finite() && value > 0.0 {
        Ok(value)
    } else {
        Err(SectionError::BadDimension { field, expected: "> 0", value })
    }
}

pub(crate) fn non_negative(field: &'static str, value: f64) -> Result<f64, SectionError> {
    if value.is_finite() && value >= 0.0 {
        Ok(value)
    } else {
        Err(SectionError::BadDimension { field, expected: ">= 0", value })
    }
}

/// A chamber profile.
#[derive(Debug, Clone, PartialEq)]
pub enum SectionProfile {
    /// Rectangular chamber (the default profile).
    Box(BoxSection),
    /// Semicircular chamber with a uniform wall.
    HalfRound(HalfRoundSection),
}

impl SectionProfile {
    /// Chamber (cavity) area `A_c` (m²).
    pub fn chamber_area(&self) -> f64 {
        match self {
            Self::Box(s) => s.chamber_area(),
            Self::HalfRound(s) => s.chamber_area(),
        }
    }
    /// Height of the chamber's centroid above the layer, `ybar_c` (m).
    pub fn chamber_centroid(&self) -> f64 {
        match self {
            Self::Box(s) => s.chamber_centroid(),
            Self::HalfRound(s) => s.chamber_centroid(),
        }
    }
    /// Height of the top surface above the layer (m).
    pub fn top(&self) -> f64 {
        match self {
            Self::Box(s) => s.top(),
            Self::HalfRound(s) => s.top(),
        }
    }
    /// Depth of the inner face below the layer, the under-layer thickness (m).
    pub fn under_layer(&self) -> f64 {
        match self {
            Self::Box(s) => s.under_layer,
            Self::HalfRound(s) => s.under_layer,
        }
    }
    /// Overall width of the section (m).
    pub fn outer_width(&self) -> f64 {
        match self {
            Self::Box(s) => s.outer_width(),
            Self::HalfRound(s) => 2.0 * s.outer_radius(),
        }
    }
    /// Rubber area of the section (m²), closed form.
    pub fn rubber_area(&self) -> f64 {
        match self {
            Self::Box(s) => s.rubber_area(),
            Self::HalfRound(s) => s.rubber_area(),
        }
    }
    /// The quadrature of this profile with `n` Gauss points per band (per direction).
    pub fn quadrature(&self, n: usize) -> SectionQuadrature {
        match self {
            Self::Box(s) => s.quadrature(n),
            Self::HalfRound(s) => s.quadrature(n),
        }
    }
    /// Name of the profile as in the scene file.
    pub fn kind(&self) -> &'static str {
        match self {
            Self::Box(_) => "Box",
            Self::HalfRound(_) => "HalfRound",
        }
    }
}

/// A quadrature point of a section integral: height `y` (m) and weight (m²).
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct SectionPoint {
    /// Height above the strain-limiting layer (m).
    pub y: f64,
    /// Weight (m²): the area it stands for, times any profile factor.
    pub weight: f64,
}

/// Quadrature rules for the two integrals of the section law.
///
/// `rubber` integrates over all rubber (`int f(y) dA ≈ sum weight f(y)`); `pressure`
/// integrates the through-thickness pressure profile: `int g(y) f(y) dA` over the walls
/// that face the chamber, where `sigma_r = -p g` (`g = 1` at the chamber face, `0` at
/// the wall's other face).
#[derive(Debug, Clone, PartialEq)]
pub struct SectionQuadrature {
    /// Points over the rubber.
    pub rubber: Vec<SectionPoint>,
    /// Points over the pressure-loaded walls, weights including `g`.
    pub pressure: Vec<SectionPoint>,
    /// Chamber area `A_c` (m²).
    pub chamber_area: f64,
    /// Chamber centroid height `ybar_c` (m).
    pub chamber_centroid: f64,
    /// Lowest rubber height (m), `-under_layer`.
    pub y_min: f64,
    /// Highest rubber height (m), the top surface.
    pub y_max: f64,
}

impl SectionQuadrature {
    /// `sum weight y^k` over the rubber points: the `k`-th area moment about the layer.
    pub fn rubber_moment(&self, k: i32) -> f64 {
        self.rubber.iter().map(|q| q.weight * q.y.powi(k)).sum()
    }
    /// `sum weight y^k` over the pressure points.
    pub fn pressure_moment(&self, k: i32) -> f64 {
        self.pressure.iter().map(|q| q.weight * q.y.powi(k)).sum()
    }
}

/// Appends the points of `n`-point Gauss–Legendre on `[a, b]` with strip width `width`
/// and profile `g(y)` to `out`.
pub(crate) fn push_band(
    out: &mut Vec<SectionPoint>,
    rule: &crate::math::gauss_legendre::GaussLegendre,
    a: f64,
    b: f64,
    width: f64,
    g: impl Fn(f64) -> f64,
) {
    if b <= a || width == 0.0 {
        return;
    }
    out.extend(rule.on_interval(a, b).map(|(y, w)| SectionPoint { y, weight: w * width * g(y) }));
}

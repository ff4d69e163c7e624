//! The grasp check of a whole scene: every object against the gripper at the supply
//! pressure, verdicts with reasons, and pressure windows (DESIGN 3.4).
//!
//! This module owns the result types that reports are written from; the evaluation
//! itself strings together the closing stage (each finger's rod with unilateral contact),
//! the holding margins, enclosure and epsilon quality.
//!
//! Coordinate systems: every point and direction is in the gripper frame (origin at the
//! centre of the palm's lower face, `+z` up, gravity along `-z`; DESIGN 2), SI units.
//! A contact normal points from the finger into the object.

pub mod closing;
pub mod coupled;
mod evaluate;
pub mod robust;
mod single;

pub use evaluate::{INTERFERENCE_TOLERANCE, check_scene};
pub use single::{ObjectAtPressure, check_object};

use crate::math::Vec3;

/// Pass or fail.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Hash)]
pub enum Verdict {
    /// Every criterion holds.
    Pass,
    /// Some criterion fails (or a solve did not converge).
    Fail,
}

impl Verdict {
    /// `"pass"` or `"fail"`.
    pub fn name(self) -> &'static str {
        match self {
            Self::Pass => "pass",
            Self::Fail => "fail",
        }
    }
}

/// One failed criterion and by how much.
#[derive(Debug, Clone, PartialEq)]
pub enum Failure {
    /// Fewer fingers touch the object than required.
    TooFewFingers {
        /// Fingers in contact.
        got: usize,
        /// Required.
        need: usize,
    },
    /// The enclosure fraction is below the minimum.
    Enclosure {
        /// Fraction of escape directions blocked.
        got: f64,
        /// Required.
        need: f64,
    },
    /// A holding margin is below the safety factor.
    Holding {
        /// Load case name (`"lift"`, `"lateral +x"`, ...).
        case: String,
        /// Largest load scale balanced.
        margin: f64,
        /// The safety factor.
        need: f64,
    },
    /// A contact presses harder than the object's limit.
    ContactForce {
        /// Largest normal force at any contact (N).
        peak: f64,
        /// The object's limit (N).
        limit: f64,
    },
    /// With the fingers open (no pressure) the object already overlaps a finger or the
    /// palm at its position: it does not fit into the gripper.
    DoesNotFit {
        /// What it overlaps: `"finger 2"` or `"the palm"`.
        obstacle: String,
        /// Depth of the deepest overlap (m).
        depth: f64,
    },
    /// Fingers interfere with each other.
    Interference {
        /// Pairs of finger indices.
        pairs: Vec<(usize, usize)>,
    },
    /// A solve did not converge: the result is unknown, never a pass.
    NotConverged {
        /// What did not converge.
        what: String,
    },
}

impl Failure {
    /// A short machine name of the criterion: `"too-few-fingers"`, `"enclosure"`,
    /// `"holding"`, `"contact-force"`, `"interference"` or `"not-converged"`.
    pub fn kind(&self) -> &'static str {
        match self {
            Self::TooFewFingers { .. } => "too-few-fingers",
            Self::Enclosure { .. } => "enclosure",
            Self::Holding { .. } => "holding",
            Self::ContactForce { .. } => "contact-force",
            Self::DoesNotFit { .. } => "does-not-fit",
            Self::Interference { .. } => "interference",
            Self::NotConverged { .. } => "not-converged",
        }
    }
}

impl std::fmt::Display for Failure {
    fn fmt(&self, f: &mut std::fmt::Formatter<'_>) -> std::fmt::Result {
        match self {
            Self::TooFewFingers { got, need } => write!(f, "{got} finger(s) in contact, {need} required"),
            Self::Enclosure { got, need } => {
                write!(
                    f,
                    "enclosure {:.0} % of escape directions, {:.0} % required",
                    got * 100.0,
                    need * 100.0
                )
            }
            Self::Holding { case, margin, need } => {
                write!(f, "holding margin {margin:.2} in the {case} case, {need:.2} required")
            }
            Self::ContactForce { peak, limit } => {
                write!(
                    f,
                    "peak contact force {peak:.2} N exceeds the limit of {limit:.2} N by {:.2} N",
                    peak - limit
                )
            }
            Self::DoesNotFit { obstacle, depth } => write!(
                f,
                "does not fit: with the fingers open it overlaps {obstacle} by {:.1} mm",
                depth * 1e3
            ),
            Self::Interference { pairs } => {
                let list: Vec<String> = pairs.iter().map(|(a, b)| format!("{a}-{b}")).collect();
                write!(f, "fingers interfere: {}", list.join(", "))
            }
            Self::NotConverged { what } => write!(f, "solver did not converge: {what}"),
        }
    }
}

/// One finger at the check pressure.
#[derive(Debug, Clone, PartialEq)]
pub struct FingerReport {
    /// Index in the gripper's list.
    pub index: usize,
    /// Actuator name.
    pub actuator: String,
    /// Free bend angle at the pressure, no object (rad).
    pub free_bend: f64,
    /// Free tip position (m, gripper frame).
    pub tip: Vec3,
    /// Largest wall stretch, free.
    pub max_stretch: f64,
    /// Fingers whose free bodies intersect this one's.
    pub interferes_with: Vec<usize>,
}

/// One contact of the closing stage.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct ContactReport {
    /// Finger index.
    pub finger: usize,
    /// Rod element (0-based; the tip cap is `elements`).
    pub element: usize,
    /// Contact point (m, gripper frame), on the object's surface.
    pub point: Vec3,
    /// Unit normal, pointing into the object.
    pub normal: Vec3,
    /// Normal force (N).
    pub normal_force: f64,
}

/// Holding margins of an object.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct HoldingMargins {
    /// Load scale of the lift case.
    pub lift: f64,
    /// Smallest load scale of the lateral cases.
    pub lateral_min: f64,
}

/// One object's result at the check pressure.
#[derive(Debug, Clone, PartialEq)]
pub struct ObjectReport {
    /// Object name.
    pub name: String,
    /// Verdict.
    pub verdict: Verdict,
    /// Every failed criterion.
    pub failures: Vec<Failure>,
    /// Fingers touching it.
    pub fingers_in_contact: usize,
    /// Contacts.
    pub contacts: Vec<ContactReport>,
    /// Fraction of escape directions blocked.
    pub enclosure: f64,
    /// Ferrari–Canny epsilon (L1, torque scaled by the bounding radius).
    pub epsilon: f64,
    /// Holding margins.
    pub holding: HoldingMargins,
    /// Largest contact normal force (N).
    pub peak_contact_force: f64,
    /// Widest contiguous range of sweep pressures where it passes (Pa), if any.
    pub pressure_window: Option<(f64, f64)>,
}

/// The whole check.
#[derive(Debug, Clone, PartialEq)]
pub struct CheckReport {
    /// Scene name.
    pub scene: String,
    /// Supply pressure (Pa).
    pub pressure: f64,
    /// Pass only if every object passes.
    pub verdict: Verdict,
    /// Fingers.
    pub fingers: Vec<FingerReport>,
    /// Objects, in scene order.
    pub objects: Vec<ObjectReport>,
    /// A single sweep pressure at which every object passes (Pa), the middle of the
    /// widest common window; `None` if there is none or no sweep.
    pub recommended_pressure: Option<f64>,
    /// When no single pressure serves all objects: pairs of object names whose windows do
    /// not overlap.
    pub clashes: Vec<(String, String)>,
}

/// Knobs of the check.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct CheckSettings {
    /// Rod elements along each chamber (>= 40, default 40).
    pub elements: usize,
    /// Escape directions of the enclosure test (>= 256, default 256).
    pub enclosure_directions: usize,
    /// Check at this supply pressure instead of the scene's (Pa).
    pub pressure_override: Option<f64>,
    /// Wall-clock deadline of the whole check (`None` = none). The evaluation is to test
    /// it between solver steps and report what it leaves unfinished as
    /// [`Failure::NotConverged`], never as a pass; results must not depend on it while it
    /// is not reached. Callers that need a hard bound also enforce it from outside (the
    /// `arcfinger` binary does).
    pub deadline: Option<std::time::Instant>,
    /// Compute the Ferrari–Canny epsilon at the supply pressure (default true). It is
    /// reported, not a criterion: callers that only rank verdicts and margins (the layout
    /// sweep) turn it off and get 0 in its place.
    pub epsilon: bool,
}

impl Default for CheckSettings {
    fn default() -> Self {
        Self {
            elements: 40,
            enclosure_directions: 256,
            pressure_override: None,
            deadline: None,
            epsilon: true,
        }
    }
}

/// Why a check could not run at all (bad settings or geometry the solvers refuse).
#[derive(Debug, Clone, PartialEq, thiserror::Error)]
#[non_exhaustive]
pub enum CheckError {
    /// A setting is out of range.
    #[error("invalid setting: {0}")]
    BadSetting(String),
    /// The scene cannot be turned into solver input.
    #[error("{0}")]
    Geometry(String),
}

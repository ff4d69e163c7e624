//! The grasp criteria of DESIGN 3.4 at one pressure.
//!
//! - [`enclosure`]: the fraction of escape directions blocked by fingers and palm.
//!
//! The closing stage (finger rods closing on the object) produces a list of
//! [`GraspContact`]s. From them:
//! - [`holding`]: the holding margin per load case, a second-order cone program
//!   ([`holding_scale`], [`holding_margins`], the scene's [`load_cases`]);
//! - [`quality`]: the Ferrari–Canny epsilon quality of the contact set
//!   ([`epsilon_quality`], and [`planar_epsilon`] for planar grasps).
//!
//! File naming: one check per file, named after the criterion; the contact type shared
//! by all checks is in `contact.rs`.

pub mod contact;
pub mod enclosure;
pub mod holding;
pub mod quality;

pub use contact::{ContactError, GraspContact, NORMAL_LENGTH_TOLERANCE, validate_contacts};
pub use holding::{
    CaseMargin, HoldingError, HoldingMargins, HoldingResult, HoldingSettings, HoldingStatus, LoadCase,
    LoadKind, MAX_LOAD_SCALE, STANDARD_GRAVITY, SolverFailure, holding_margins, holding_scale, load_cases,
};
pub use quality::{
    DEFAULT_CONE_EDGES, EpsilonQuality, PlanarContact, QualityError, QualityStatus, WrenchNorm,
    epsilon_quality, planar_epsilon,
};

//! # grasp-core
//!
//! The pure models behind arcfinger: hyperelastic materials, actuator cross-sections,
//! the quasi-static free bending of a fiber-reinforced bending actuator, the
//! constant-curvature kinematics of a finger, and the finger as a planar rod.
//!
//! Everything here takes values and returns values (or typed errors): no file system,
//! no printing, no clock. All quantities are SI and `f64` (m, Pa, N, kg, rad); the
//! scene-file boundary in the `arcfinger` application converts from mm, kPa, g and
//! degrees exactly once.
//!
//! Where to start:
//! - [`material`]: strain-energy functions and their stresses in the standard tests.
//! - [`section`]: chamber profiles and the wall moment–curvature law.
//! - [`actuator`]: free bending of one actuator at a pressure.
//! - [`kinematics`]: constant-curvature arcs and the finger's centreline.
//! - [`rod`]: the finger as a discretised planar rod with point loads and tip constraints.
//! - [`scene`]: the validated scene model (materials, actuators, gripper, objects, criteria).
//! - [`geometry`]: the hub layout, object shapes and finger bodies as parry3d shapes.
//! - [`grasp`]: grasp criteria at a pressure: enclosure, holding margins, epsilon quality.
//! - [`check`]: the grasp check of a whole scene, with verdicts and pressure windows.
//! - [`draw`]: triangle surfaces of palm, fingers (with their fiber), objects and arrows, for a renderer.
//! - [`calibrate`]: fit a modulus scale (and floor thickness) to a measured prototype.
//! - [`fab`]: the fabrication sheet of an actuator (molds, silicone, fiber) and its wrap-pitch check.
//! - [`sweep`]: layout search: search spaces, candidates, ranking, Pareto front, shards.
#![deny(clippy::print_stdout, clippy::print_stderr)]
// errors are values here: no unwrap or expect outside tests
#![cfg_attr(not(test), deny(clippy::unwrap_used, clippy::expect_used))]

pub mod actuator;
pub mod calibrate;
pub mod check;
pub mod draw;
pub mod fab;
pub mod geometry;
pub mod grasp;
pub mod kinematics;
pub mod material;
pub mod math;
pub mod rod;
pub mod scene;
pub mod section;
pub mod sweep;

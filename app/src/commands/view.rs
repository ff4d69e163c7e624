//! `arcfinger view [SCENE] [--pressure KPA] [--object NAME]`: the 3-D viewer.
//!
//! The viewer is compiled only with the cargo feature `viewer` (bevy is large); without
//! it this command exits 2 with the command that builds and runs it. The options are
//! validated here either way, so a bad scene or option gives the same message in both
//! builds.

use std::path::PathBuf;

use grasp_core::scene::Scene;

use crate::cli::ViewArgs;
use crate::commands::bend::{MAX_ELEMENTS, MIN_ELEMENTS};
use crate::commands::check::demo_scene;
use crate::error::{AppError, Outcome};

/// What the viewer opens, validated.
#[cfg_attr(not(feature = "viewer"), expect(dead_code, reason = "read by the viewer, which this build lacks"))]
pub struct ViewConfig {
    /// The scene.
    pub scene: Scene,
    /// Index of the first object shown.
    pub object: usize,
    /// First supply pressure (Pa).
    pub pressure: f64,
    /// Rod elements per chamber.
    pub elements: usize,
    /// Scripted steps (tests and measurements).
    pub script: Option<String>,
}

/// Loads `path` (or the bundled demo) with the mesh rule of `allow_outside`.
///
/// # Errors
/// The scene loader's.
pub fn load_scene(path: Option<&PathBuf>, allow_outside: bool) -> Result<Scene, AppError> {
    match path {
        Some(p) => crate::scene_file::load_with(p, crate::scene_file::MeshAccess::from_flag(allow_outside)),
        None => demo_scene(),
    }
}

/// The index of the object named `name` (default: the first).
///
/// # Errors
/// No such object (the message lists the scene's objects), or a scene without objects.
pub fn pick_object(scene: &Scene, name: Option<&str>) -> Result<usize, AppError> {
    if scene.objects.is_empty() {
        return Err(AppError::input("the scene has no objects to show"));
    }
    let Some(name) = name else { return Ok(0) };
    scene.objects.iter().position(|o| o.name == name).ok_or_else(|| {
        let names: Vec<String> = scene.objects.iter().map(|o| format!("\"{}\"", o.name)).collect();
        AppError::input(format!("--object: no object named \"{name}\"; the scene has {}", names.join(", ")))
    })
}

/// The supply pressure (Pa) of `--pressure KPA`, or the scene's.
///
/// # Errors
/// Not finite, negative, or above the lowest rated pressure of the fingers' actuators.
pub fn pick_pressure(scene: &Scene, kpa: Option<f64>) -> Result<f64, AppError> {
    let Some(kpa) = kpa else { return Ok(scene.criteria.pressure) };
    let rated = scene
        .gripper
        .fingers
        .iter()
        .filter_map(|f| scene.actuators.get(f.actuator))
        .map(|a| a.max_pressure)
        .fold(f64::INFINITY, f64::min);
    if !(kpa.is_finite() && kpa >= 0.0 && kpa * 1e3 <= rated * (1.0 + 1e-12)) {
        return Err(AppError::input(format!(
            "--pressure: expected a pressure from 0 to the rated {:.1} kPa, got {kpa}",
            rated * 1e-3
        )));
    }
    Ok(kpa * 1e3)
}

/// Checks `--elements`.
///
/// # Errors
/// Out of the rod's range.
pub fn check_elements(elements: usize) -> Result<usize, AppError> {
    if !(MIN_ELEMENTS..=MAX_ELEMENTS).contains(&elements) {
        return Err(AppError::input(format!(
            "--elements: must be between {MIN_ELEMENTS} and {MAX_ELEMENTS}, got {elements}"
        )));
    }
    Ok(elements)
}

/// The error of a build without the viewer: the command that builds and runs `command`
/// with the same arguments.
#[cfg(not(feature = "viewer"))]
pub fn not_built(command: &str) -> AppError {
    let args: Vec<String> = std::env::args()
        .skip(2)
        .map(|a| {
            if a.chars().all(|c| c.is_ascii_alphanumeric() || "-_./=:,+".contains(c)) {
                a
            } else {
                format!("'{}'", a.replace('\'', r"'\''"))
            }
        })
        .collect();
    let mut cmd = format!("cargo run --release --features viewer -- {command}");
    for a in args {
        cmd.push(' ');
        cmd.push_str(&a);
    }
    AppError::input(format!(
        "`{command}` is not part of this build (the 3-D viewer is behind the cargo feature `viewer`); \
         build and run it with: {cmd}"
    ))
}

/// Runs `view`.
pub fn run(args: ViewArgs) -> Result<Outcome, AppError> {
    let scene = load_scene(args.scene.as_ref(), args.allow_outside_meshes)?;
    let object = pick_object(&scene, args.object.as_deref())?;
    let pressure = pick_pressure(&scene, args.pressure)?;
    let elements = check_elements(args.elements)?;
    let config = ViewConfig { scene, object, pressure, elements, script: args.script };
    open(config)
}

#[cfg(feature = "viewer")]
fn open(config: ViewConfig) -> Result<Outcome, AppError> {
    crate::viewer::window::run(config)
}

#[cfg(not(feature = "viewer"))]
fn open(_config: ViewConfig) -> Result<Outcome, AppError> {
    Err(not_built("view"))
}

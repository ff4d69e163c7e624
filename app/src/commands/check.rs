//! `arcfinger check [SCENE]`: the grasp check of every object of a scene at the supply
//! pressure (DESIGN 3.4), written as a terminal table and, on request, as JSON, JUnit
//! XML and a Markdown summary.
//!
//! Without SCENE the bundled demo scene (`scenes/packing-line-3f.ron` and its pepper
//! mesh, built into the binary) is checked, so the command works from any folder.
//!
//! Everything is validated before the check runs: the scene, `--pressure` against the
//! lowest rated pressure of the actuators the fingers use, `--elements`, and the output
//! paths (none may be an input, the scene or one of its meshes; no two may be the same;
//! at most one may be `-`). Output files are written atomically. The table goes to
//! stdout, or to stderr when some report is written to stdout.
//!
//! Exit codes: 0 when every object passes, 1 when some object fails, 3 when a solve did
//! not converge for some object (its result is unknown; the reports are still written),
//! 2 for bad input or usage.

use std::path::{Path, PathBuf};
use std::time::{Duration, Instant};

use grasp_core::check::robust::{MAX_SAMPLES, RobustSettings, Spreads, robust_check};
use grasp_core::check::{CheckReport, CheckSettings};
use grasp_core::scene::{ObjectShape, Scene};

use crate::budget;
use crate::cli::CheckArgs;
use crate::commands::bend::{MAX_ELEMENTS, MIN_ELEMENTS};
use crate::error::{AppError, Outcome};
use crate::output::{Sink, refuse_overwrite};
use crate::report::{self, Context, Status};

/// How the bundled demo scene is named in messages and reports.
pub const DEMO_LABEL: &str = "packing-line-3f.ron (bundled demo)";

/// The bundled demo scene's text.
const DEMO_SCENE: &str = include_str!("../../../scenes/packing-line-3f.ron");

/// The demo scene's mesh files, by the path the scene gives them.
const DEMO_MESHES: &[(&str, &[u8])] =
    &[("meshes/bell-pepper.obj", include_bytes!("../../../scenes/meshes/bell-pepper.obj"))];

/// Loads the bundled demo scene through the same validation as a scene file.
///
/// # Errors
/// Only if the bundled scene itself were invalid (a test keeps it valid).
pub fn demo_scene() -> Result<Scene, AppError> {
    crate::scene_file::load_embedded(DEMO_LABEL, DEMO_SCENE, DEMO_MESHES)
}

/// Wrap-pitch warnings for the actuators the fingers use, against the scene's safety
/// factor (the same check as `arcfinger fab` and `bend`).
pub fn wrap_warnings(scene: &Scene) -> Vec<String> {
    scene
        .actuators
        .iter()
        .enumerate()
        .filter(|(i, _)| scene.gripper.fingers.iter().any(|f| f.actuator == *i))
        .filter_map(|(_, a)| {
            let w = grasp_core::fab::wrap::wrap_check(a, scene.criteria.safety_factor);
            crate::commands::fab::wrap_warning(&a.name, &w)
        })
        .collect()
}

/// The one place `check` reaches the physics.
fn run_check(scene: &Scene, settings: &CheckSettings) -> Result<CheckReport, AppError> {
    grasp_core::check::check_scene(scene, settings).map_err(AppError::from)
}

/// [`run_check`] within the configured time limit: the solver gets the deadline, and a
/// check still running after it (plus [`budget::grace`]) is abandoned as unknown (exit 3)
/// before any report is written.
fn run_check_within(cfg: &Config) -> Result<CheckReport, AppError> {
    let limit = cfg.time_limit;
    let scene = cfg.scene.clone();
    let settings = CheckSettings { deadline: Instant::now().checked_add(limit), ..cfg.settings };
    match budget::run_within(limit + budget::grace(limit), move || run_check(&scene, &settings))? {
        Some(result) => result,
        None => Err(AppError::NotConverged(format!(
            "the check did not finish within its time limit of {} s (--time-limit); its result is unknown, \
             and no report was written (earlier report files are left as they were)",
            limit.as_secs_f64()
        ))),
    }
}

/// The validated configuration of one run.
#[derive(Debug)]
struct Config {
    scene: Scene,
    context: Context,
    settings: CheckSettings,
    /// Samples and seed of the robustness study, when asked for.
    robust: Option<(usize, u64)>,
    time_limit: Duration,
    json: Option<Sink>,
    junit: Option<Sink>,
    markdown: Option<Sink>,
}

/// The lowest rated pressure among the actuators the fingers use (Pa), with the
/// actuator's name and the first finger that uses it.
fn rating(scene: &Scene) -> Option<(f64, &str, usize)> {
    let mut best: Option<(f64, &str, usize)> = None;
    for (i, f) in scene.gripper.fingers.iter().enumerate() {
        if let Some(a) = scene.actuators.get(f.actuator)
            && best.is_none_or(|(p, _, _)| a.max_pressure < p)
        {
            best = Some((a.max_pressure, a.name.as_str(), i));
        }
    }
    best
}

/// The files a scene was read from: the scene file and its meshes.
pub fn input_files(scene_file: &Path, scene: &Scene) -> Vec<PathBuf> {
    let dir = crate::scene_file::scene_dir(scene_file);
    let mut files = vec![scene_file.to_path_buf()];
    for o in &scene.objects {
        if let ObjectShape::Mesh { source, .. } = &o.shape {
            files.push(dir.join(source));
        }
    }
    files
}

/// Whether two output paths name the same file (as written, or once resolved).
fn same_file(a: &Path, b: &Path) -> bool {
    if a == b {
        return true;
    }
    // A file that does not exist yet cannot be canonicalised; compare its folder instead.
    let resolve = |p: &Path| -> Option<PathBuf> {
        let dir = crate::scene_file::scene_dir(p);
        Some(std::fs::canonicalize(dir).ok()?.join(p.file_name()?))
    };
    matches!((resolve(a), resolve(b)), (Some(x), Some(y)) if x == y)
}

impl Config {
    fn new(args: CheckArgs, scene: Scene, context: Context, inputs: &[PathBuf]) -> Result<Self, AppError> {
        let pressure_override = match args.pressure {
            None => None,
            Some(kpa) if !(kpa.is_finite() && kpa >= 0.0) => {
                return Err(AppError::input(format!(
                    "--pressure: must be a finite number of kPa, at least 0, got {kpa}"
                )));
            }
            Some(kpa) => {
                if let Some((max, name, finger)) = rating(&scene)
                    && kpa * 1e3 > max * (1.0 + 1e-12)
                {
                    return Err(AppError::input(format!(
                        "--pressure: {kpa} kPa is above the rated maximum of actuator \"{name}\" ({} kPa, \
                         used by gripper.fingers[{finger}]); the model is not a licence to over-pressurise a finger",
                        max / 1e3
                    )));
                }
                Some(kpa * 1e3)
            }
        };
        if !(MIN_ELEMENTS..=MAX_ELEMENTS).contains(&args.elements) {
            return Err(AppError::input(format!(
                "--elements: must be between {MIN_ELEMENTS} and {MAX_ELEMENTS}, got {}",
                args.elements
            )));
        }
        if let Some(n) = args.robust
            && !(1..=MAX_SAMPLES).contains(&n)
        {
            return Err(AppError::input(format!(
                "--robust: must be between 1 and {MAX_SAMPLES} samples, got {n}"
            )));
        }
        let time_limit = budget::time_limit("--time-limit", args.time_limit)?;
        let outputs: Vec<(&str, Sink)> =
            [("--json", &args.json), ("--junit", &args.junit), ("--markdown", &args.markdown)]
                .into_iter()
                .filter_map(|(flag, v)| v.as_deref().map(|s| (flag, Sink::parse(s))))
                .collect();
        let inputs: Vec<&Path> = inputs.iter().map(PathBuf::as_path).collect();
        for (i, (flag, sink)) in outputs.iter().enumerate() {
            match sink {
                Sink::File(p) => {
                    refuse_overwrite(p, &inputs)?;
                    // fail before a long check, not after it
                    let dir = crate::scene_file::scene_dir(p);
                    if !dir.is_dir() {
                        return Err(AppError::input(format!(
                            "{flag} {}: the folder {} does not exist",
                            p.display(),
                            dir.display()
                        )));
                    }
                    for (other, earlier) in &outputs[..i] {
                        if let Sink::File(q) = earlier
                            && same_file(p, q)
                        {
                            return Err(AppError::input(format!(
                                "{flag} {}: {other} already writes to that file; give each report its own file",
                                p.display()
                            )));
                        }
                    }
                }
                Sink::Stdout => {
                    if let Some((other, _)) = outputs[..i].iter().find(|(_, s)| *s == Sink::Stdout) {
                        return Err(AppError::input(format!(
                            "{flag} -: {other} already writes to stdout; only one report can go there"
                        )));
                    }
                }
            }
        }
        let sink = |flag: &str| outputs.iter().find(|(f, _)| *f == flag).map(|(_, s)| s.clone());
        Ok(Self {
            settings: CheckSettings {
                elements: args.elements,
                pressure_override,
                ..CheckSettings::default()
            },
            robust: args.robust.map(|n| (n, args.seed)),
            time_limit,
            json: sink("--json"),
            junit: sink("--junit"),
            markdown: sink("--markdown"),
            scene,
            context,
        })
    }
}

/// The exit code a finished check maps to: a solve that did not converge is exit 3
/// (whatever else failed), any failing object exit 1, otherwise 0.
///
/// # Errors
/// [`AppError::NotConverged`] naming the objects whose result is unknown.
fn outcome(r: &CheckReport) -> Result<Outcome, AppError> {
    match report::overall_status(r) {
        Status::Pass => Ok(Outcome::Pass),
        Status::Fail => Ok(Outcome::Fail),
        Status::Unknown => {
            let names: Vec<String> = r
                .objects
                .iter()
                .filter(|o| report::not_converged(o))
                .map(|o| format!("\"{}\"", o.name))
                .collect();
            Err(AppError::NotConverged(format!(
                "the result for {} is unknown (see the reports)",
                names.join(", ")
            )))
        }
    }
}

/// Writes every requested report, then the table. Each report is rendered in memory
/// first, so a file is only replaced by a complete report.
fn write_reports(r: &CheckReport, cfg: &Config) -> Result<(), AppError> {
    let ctx = &cfg.context;
    let render = |what: &str, f: &dyn Fn(&mut Vec<u8>) -> std::io::Result<()>| {
        let mut buf = Vec::new();
        f(&mut buf).map_err(|e| AppError::io(format!("writing the {what} report"), e))?;
        Ok::<_, AppError>(buf)
    };
    if let Some(sink) = &cfg.json {
        sink.write(&render("JSON", &|w| report::json::write(r, ctx, w))?)?;
    }
    if let Some(sink) = &cfg.junit {
        sink.write(&render("JUnit", &|w| report::junit::write(r, ctx, w))?)?;
    }
    if let Some(sink) = &cfg.markdown {
        sink.write(&render("Markdown", &|w| report::markdown::write(r, ctx, w))?)?;
    }
    let stdout_free = [&cfg.json, &cfg.junit, &cfg.markdown].iter().all(|s| **s != Some(Sink::Stdout));
    if stdout_free {
        let color = report::table::color_for(&std::io::stdout());
        Sink::Stdout.write(&render("table", &|w| report::table::write(r, ctx, color, w))?)
    } else {
        let color = report::table::color_for(&std::io::stderr());
        report::table::write(r, ctx, color, std::io::stderr().lock())
            .map_err(|e| AppError::io("writing to stderr", e))
    }
}

/// Runs `check`.
pub fn run(args: CheckArgs) -> Result<Outcome, AppError> {
    let (scene, context, inputs) = match &args.scene {
        Some(path) => {
            let meshes = crate::scene_file::MeshAccess::from_flag(args.allow_outside_meshes);
            let scene = crate::scene_file::load_with(path, meshes)?;
            let inputs = input_files(path, &scene);
            (scene, Context::new(path.display().to_string()), inputs)
        }
        None => (demo_scene()?, Context::new(DEMO_LABEL), Vec::new()),
    };
    let mut cfg = Config::new(args, scene, context, &inputs)?;
    for w in wrap_warnings(&cfg.scene) {
        eprintln!("arcfinger: warning: {w}");
    }
    let result = run_check_within(&cfg)?;
    if let Some((samples, seed)) = cfg.robust {
        let settings = RobustSettings { samples, seed, spreads: Spreads::default(), check: cfg.settings };
        cfg.context.robust = Some(robust_check(&cfg.scene, &settings)?);
    }
    write_reports(&result, &cfg)?;
    outcome(&result)
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::report::test_support;

    /// The exit codes of DESIGN 4.1 and how they combine: unknown beats fail beats pass.
    #[test]
    fn outcomes_combine_into_the_exit_codes() {
        assert_eq!(outcome(&test_support::passing()).unwrap().exit_code(), 0);
        assert_eq!(outcome(&test_support::report()).unwrap().exit_code(), 1);
        let e = outcome(&test_support::unconverged()).unwrap_err();
        assert_eq!(e.exit_code(), 3);
        assert!(e.to_string().contains(test_support::BAD), "{e}");
    }

    /// The embedded demo is the file in `scenes/`, validated the same way, mesh included.
    #[test]
    fn bundled_demo_equals_the_scene_file() {
        let root = Path::new(env!("CARGO_MANIFEST_DIR")).join("..");
        let from_file = crate::scene_file::load(&root.join("scenes/packing-line-3f.ron")).unwrap();
        let demo = demo_scene().unwrap();
        assert_eq!(demo, from_file);
        assert!(demo.objects.iter().any(|o| matches!(o.shape, ObjectShape::Mesh { .. })));
        let (max, name, finger) = rating(&demo).unwrap();
        assert_eq!((max, name, finger), (150e3, "box-100", 0));
    }

    /// The embedded path goes through the same checks: a mesh path outside the table,
    /// or one the path rules refuse, is reported like a file's.
    #[test]
    fn embedded_scenes_are_validated_like_files() {
        let missing = DEMO_SCENE.replace("meshes/bell-pepper.obj", "meshes/pepper-2.obj");
        let e = crate::scene_file::load_embedded("demo", &missing, DEMO_MESHES).unwrap_err();
        assert_eq!(e.exit_code(), 2);
        let msg = e.to_string();
        assert!(
            msg.contains("demo: objects[2].shape.path: \"meshes/pepper-2.obj\": is not one of the files built into arcfinger")
                && msg.contains("meshes/bell-pepper.obj"),
            "{msg}"
        );
        let up = DEMO_SCENE.replace("meshes/bell-pepper.obj", "../meshes/bell-pepper.obj");
        let msg = crate::scene_file::load_embedded("demo", &up, DEMO_MESHES).unwrap_err().to_string();
        assert!(msg.contains("`..` is refused"), "{msg}");
        let dot = DEMO_SCENE.replace("meshes/bell-pepper.obj", "./meshes/bell-pepper.obj");
        assert!(crate::scene_file::load_embedded("demo", &dot, DEMO_MESHES).is_ok());
        let bad = DEMO_SCENE.replace("mass_g: 150.0", "mass_g: -1.0");
        let msg = crate::scene_file::load_embedded("demo", &bad, DEMO_MESHES).unwrap_err().to_string();
        assert_eq!(msg, "demo: objects[0].mass_g: must be > 0, got -1");
        let garbage = crate::scene_file::load_embedded("demo", "Scene(", DEMO_MESHES).unwrap_err();
        assert!(garbage.to_string().starts_with("demo:1:"), "{garbage}");
    }

    /// A loose wind draws the wrap-pitch warning, the demo's tight one does not.
    #[test]
    fn loose_wind_is_warned_about() {
        let mut scene = demo_scene().unwrap();
        assert!(wrap_warnings(&scene).is_empty());
        scene.actuators[0].fiber.pitch = 12e-3;
        let w = wrap_warnings(&scene);
        assert_eq!(w.len(), 1);
        // Largest safe pitch at twice the rated 150 kPa (q = 300 kPa), Shore 20A class
        // (mu = 338 kPa / 1.75, its 100 % modulus through the neo-Hookean law), 3 mm
        // walls: the span `b` with `q b^4 / (128 mu t^3) + 3 q b^2 / (20 mu t) = t / 2`
        // (clamped strip with Timoshenko shear; Timoshenko & Woinowsky-Krieger 1959,
        // ch. 1), a quadratic in `b^2`, plus the 1 mm ribbon.
        let (q, mu, t) = (300.0f64, 338.0f64 / 1.75, 3.0f64);
        let (a2, a1) = (q / (128.0 * mu * t.powi(3)), 3.0 * q / (20.0 * mu * t));
        let b2 = (-a1 + (a1 * a1 + 2.0 * a2 * t).sqrt()) / (2.0 * a2);
        let pitch = format!("wind at a pitch of at most {:.2} mm", b2.sqrt() + 1.0);
        assert!(w[0].contains("box-100") && w[0].contains(&pitch), "{pitch}: {}", w[0]);
    }

    #[test]
    fn the_mesh_of_a_scene_is_an_input() {
        let scene = demo_scene().unwrap();
        let files = input_files(Path::new("scenes/packing-line-3f.ron"), &scene);
        assert_eq!(
            files,
            [PathBuf::from("scenes/packing-line-3f.ron"), PathBuf::from("scenes/meshes/bell-pepper.obj")]
        );
    }
}

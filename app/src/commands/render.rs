//! `arcfinger render SCENE --out FILE.png [--pressure KPA] [--object NAME|all]
//! [--size WxH] [--view front|side|top|iso] [--json FILE]`: offscreen pictures of the
//! gripper holding an object, with no window and no display.
//!
//! The fingers are closed on the object at the pressure by the grasp check's own
//! evaluation ([`grasp_core::check::check_object`]); the camera framing is fixed by the
//! view and the picture's aspect (the same scene gives the same camera). The PNG is
//! written atomically and never over an input file. `--json` gives each picture's camera
//! (eye, target, up, field of view), so a picture's pixels can be related to the scene.
//!
//! Rendering needs the cargo feature `viewer` and a Vulkan adapter (Mesa's CPU driver
//! is enough); without either, exit 2 with what is missing.

use std::path::{Path, PathBuf};

use crate::cli::RenderArgs;
use crate::commands::view::{check_elements, pick_object, pick_pressure};
use crate::error::{AppError, Outcome};

/// Largest picture side (pixels).
pub const MAX_SIDE: u32 = 8192;

/// Parses `WxH`.
///
/// # Errors
/// Not two integers from 16 to [`MAX_SIDE`] joined by `x`.
pub fn parse_size(s: &str) -> Result<(u32, u32), AppError> {
    let bad =
        || AppError::input(format!("--size: expected WxH in pixels (16 to {MAX_SIDE} each), got \"{s}\""));
    let (w, h) = s.split_once(['x', 'X']).ok_or_else(bad)?;
    let w: u32 = w.trim().parse().map_err(|_| bad())?;
    let h: u32 = h.trim().parse().map_err(|_| bad())?;
    if !(16..=MAX_SIDE).contains(&w) || !(16..=MAX_SIDE).contains(&h) {
        return Err(bad());
    }
    Ok((w, h))
}

/// A file-name-safe form of an object name: ASCII letters, digits and `-`.
pub fn slug(name: &str) -> String {
    let s: String =
        name.chars().map(|c| if c.is_ascii_alphanumeric() { c.to_ascii_lowercase() } else { '-' }).collect();
    let s = s.trim_matches('-').to_string();
    if s.is_empty() { "object".into() } else { s }
}

/// The output file of object `k` (0-based) named `name` for `--object all`.
pub fn per_object_path(out: &Path, k: usize, name: &str) -> PathBuf {
    let stem = out.file_stem().map(|s| s.to_string_lossy().into_owned()).unwrap_or_else(|| "render".into());
    out.with_file_name(format!("{stem}-{}-{}.png", k + 1, slug(name)))
}

/// The validated request.
#[cfg_attr(
    not(feature = "viewer"),
    expect(dead_code, reason = "read by the renderer, which this build lacks")
)]
pub struct RenderConfig {
    /// Objects to picture (indices) with their output files.
    pub shots: Vec<(usize, PathBuf)>,
    /// Supply pressure (Pa).
    pub pressure: f64,
    /// Picture size.
    pub size: (u32, u32),
    /// The view's name as given.
    pub view: String,
    /// Rod elements.
    pub elements: usize,
}

/// Runs `render`.
pub fn run(args: RenderArgs) -> Result<Outcome, AppError> {
    let meshes = crate::scene_file::MeshAccess::from_flag(args.allow_outside_meshes);
    let scene = crate::scene_file::load_with(&args.scene, meshes)?;
    let size = parse_size(&args.size)?;
    if !matches!(args.view.as_str(), "front" | "side" | "top" | "iso") {
        return Err(AppError::input(format!(
            "--view: expected front, side, top or iso, got \"{}\"",
            args.view
        )));
    }
    let pressure = pick_pressure(&scene, args.pressure)?;
    let elements = check_elements(args.elements)?;
    let is_png = args.out.extension().is_some_and(|e| e.eq_ignore_ascii_case("png"));
    if !is_png {
        return Err(AppError::input(format!("--out: {}: expected a .png file name", args.out.display())));
    }
    let shots: Vec<(usize, PathBuf)> = match args.object.as_deref() {
        Some("all") => scene
            .objects
            .iter()
            .enumerate()
            .map(|(k, o)| (k, per_object_path(&args.out, k, &o.name)))
            .collect(),
        name => vec![(pick_object(&scene, name)?, args.out.clone())],
    };
    if shots.is_empty() {
        return Err(AppError::input("the scene has no objects to picture"));
    }
    let inputs = crate::commands::check::input_files(&args.scene, &scene);
    let input_refs: Vec<&Path> = inputs.iter().map(PathBuf::as_path).collect();
    for (_, out) in &shots {
        crate::output::refuse_overwrite(out, &input_refs)?;
    }
    if let Some(json) = &args.json
        && json != "-"
    {
        crate::output::refuse_overwrite(Path::new(json), &input_refs)?;
    }
    let config = RenderConfig { shots, pressure, size, view: args.view, elements };
    draw(scene, config, args.json)
}

#[cfg(feature = "viewer")]
fn draw(
    scene: grasp_core::scene::Scene,
    config: RenderConfig,
    json: Option<String>,
) -> Result<Outcome, AppError> {
    use crate::viewer::framing::View;
    use crate::viewer::offscreen::{Shot, render};
    let view = View::parse(&config.view).unwrap_or(View::Iso);
    let settings = grasp_core::check::CheckSettings { elements: config.elements, ..Default::default() };
    let shots: Vec<Shot> = config
        .shots
        .iter()
        .map(|(k, _)| Shot { scene: 0, object: *k, pressure: config.pressure, view })
        .collect();
    let pictures = render(&[&scene], &settings, &shots, config.size)?;
    let mut docs = Vec::new();
    for ((k, path), pic) in config.shots.iter().zip(&pictures) {
        crate::output::write_atomic(path, &pic.png)?;
        eprintln!("arcfinger: wrote {}", path.display());
        let c = &pic.camera;
        docs.push(serde_json::json!({
            "file": path.display().to_string(),
            "object": scene.objects[*k].name,
            "pressure_kpa": config.pressure * 1e-3,
            "view": config.view,
            "verdict": pic.verdict,
            "camera": {
                "eye_mm": c.eye,
                "target_mm": c.target,
                "up": c.up,
                "fov_y_deg": c.fov_y.to_degrees(),
            },
        }));
    }
    if let Some(json) = json {
        let doc = serde_json::json!({
            "format": "arcfinger/render/1",
            "scene": scene.name,
            "size": [config.size.0, config.size.1],
            "pictures": docs,
        });
        let text = serde_json::to_string_pretty(&doc).map_err(|e| AppError::input(e.to_string()))? + "\n";
        crate::output::Sink::parse(&json).write(text.as_bytes())?;
    }
    Ok(Outcome::Pass)
}

#[cfg(not(feature = "viewer"))]
fn draw(
    _scene: grasp_core::scene::Scene,
    _config: RenderConfig,
    _json: Option<String>,
) -> Result<Outcome, AppError> {
    Err(crate::commands::view::not_built("render"))
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn sizes_parse_within_range() {
        assert_eq!(parse_size("1024x768").unwrap(), (1024, 768));
        assert_eq!(parse_size("64X48").unwrap(), (64, 48));
        for bad in ["1024", "0x10", "10x", "axb", "9000x100", "-5x10"] {
            assert!(parse_size(bad).is_err(), "{bad}");
        }
    }

    #[test]
    fn per_object_files_sit_beside_the_output() {
        let p = per_object_path(Path::new("out/pics/grip.png"), 2, "Ball 50 / soft");
        assert_eq!(p, Path::new("out/pics/grip-3-ball-50---soft.png"));
        assert_eq!(slug("***"), "object");
    }
}

//! `arcfinger review SCENE... [--out DIR]`: a side-by-side review of 1 to 6 candidate
//! grippers, as one self-contained HTML file (`review.html`, charts inlined as SVG) and a
//! Markdown summary for pull requests (`review.md`).
//!
//! Each scene is checked with the grasp check (its own criteria and sweep); the report
//! shows per candidate a picture slot, the verdict matrix over the union of the objects,
//! a pressure-window chart across objects and candidates, the bend and blocked-force
//! curves of each actuator the candidate uses, the margins, and the cautions.
//!
//! Pictures: the slot takes a PNG of the candidate at its recommended pressure (the
//! scene's pressure when it has none) holding its worst object, inlined as a `data:` URI
//! ([`Candidate::picture`]), drawn by the offscreen renderer when the build has the
//! `viewer` feature ([`pictures`]). Without it, or without a Vulkan adapter, the slot
//! says why ([`Candidate::picture_note`]); the layout stays the same.
//! The fabrication summary gives, per actuator a candidate uses, what `arcfinger fab`
//! computes for it (silicone, fiber, wrap-pitch margin), with the same shop values.
//!
//! Exit codes: 0 when some candidate passes every object, 1 when none does, 3 when a
//! solve did not converge for some candidate (the reports are written in all three
//! cases), 2 for bad input or usage.

pub mod charts;
pub mod escape;
mod html;
mod markdown;

use std::path::{Path, PathBuf};

use grasp_core::check::{CheckReport, CheckSettings};
use grasp_core::scene::Scene;

use crate::cli::ReviewArgs;
use crate::commands::bend::{BendDoc, MAX_ELEMENTS, MIN_ELEMENTS};
use crate::commands::fab::FabDoc;
use crate::error::{AppError, Outcome};
use crate::output::{refuse_overwrite, write_atomic};
use crate::report::{Status, overall_status};

/// Most candidates one review compares.
pub const MAX_CANDIDATES: usize = 6;

/// Pressures of the bend curves: 0 to the rated pressure in this many steps.
const BEND_STEPS: usize = 12;

/// One candidate of the review.
pub struct Candidate {
    /// The scene file as given.
    pub file: String,
    /// The scene.
    pub scene: Scene,
    /// Its check.
    pub report: CheckReport,
    /// Bend and blocked-force curves of the actuators its fingers use.
    pub bends: Vec<BendDoc>,
    /// The fabrication sheet's figures for the actuators its fingers use, or why there
    /// are none.
    pub fab: Result<FabDoc, String>,
    /// A PNG picture of the candidate holding its objects, when a renderer provides one.
    pub picture: Option<Vec<u8>>,
    /// What the picture shows, or why there is none.
    pub picture_note: String,
}

/// The slot's text in a build without the renderer.
pub const NO_RENDERER: &str = "No picture: the offscreen renderer is not part of this build \
    (build with --features viewer).";

/// Picture size in the report (pixels).
#[cfg(feature = "viewer")]
pub const PICTURE_SIZE: (u32, u32) = (640, 480);

/// The object a candidate's picture shows: the first that fails, else the one with the
/// smallest holding margin (lift or lateral).
#[cfg(feature = "viewer")]
pub fn worst_object(report: &CheckReport) -> usize {
    if let Some(k) = report.objects.iter().position(|o| o.verdict == grasp_core::check::Verdict::Fail) {
        return k;
    }
    let margin = |o: &grasp_core::check::ObjectReport| o.holding.lift.min(o.holding.lateral_min);
    (0..report.objects.len())
        .min_by(|&a, &b| margin(&report.objects[a]).total_cmp(&margin(&report.objects[b])))
        .unwrap_or(0)
}

/// Fills the picture slots: each candidate at its recommended pressure (else its
/// scene's) holding [`worst_object`], from the offscreen renderer, all in one renderer.
#[cfg(feature = "viewer")]
fn pictures(cands: &mut [Candidate], elements: usize) {
    use crate::viewer::framing::View;
    use crate::viewer::offscreen::{Shot, render};
    let shots: Vec<Shot> = cands
        .iter()
        .enumerate()
        .filter(|(_, c)| !c.scene.objects.is_empty())
        .map(|(k, c)| Shot {
            scene: k,
            object: worst_object(&c.report),
            pressure: c.report.recommended_pressure.unwrap_or(c.scene.criteria.pressure),
            view: View::Iso,
        })
        .collect();
    if shots.is_empty() {
        return;
    }
    let scenes: Vec<&Scene> = cands.iter().map(|c| &c.scene).collect();
    let settings = CheckSettings { elements, ..CheckSettings::default() };
    match render(&scenes, &settings, &shots, PICTURE_SIZE) {
        Ok(pics) => {
            for (shot, pic) in shots.iter().zip(pics) {
                let c = &mut cands[shot.scene];
                c.picture_note = format!(
                    "At {:.1} kPa holding \"{}\" ({}).",
                    shot.pressure * 1e-3,
                    c.scene.objects[shot.object].name,
                    pic.verdict
                );
                c.picture = Some(pic.png);
            }
        }
        Err(e) => {
            eprintln!("arcfinger: warning: no pictures in the review: {e}");
            for c in cands.iter_mut() {
                c.picture_note = format!("No picture: {e}");
            }
        }
    }
}

#[cfg(not(feature = "viewer"))]
fn pictures(_cands: &mut [Candidate], _elements: usize) {}

impl Candidate {
    /// Overall status of its check.
    pub fn status(&self) -> Status {
        overall_status(&self.report)
    }
}

/// A wrap-pitch margin as the review prints it: `"5.96 (2.00 required)"`, or why there is
/// none.
pub fn wrap_margin(w: &crate::commands::fab::WrapDoc) -> String {
    match w.margin {
        Some(m) => format!(
            "{} ({} required){}",
            crate::report::fixed(m, 2),
            crate::report::fixed(w.required_margin, 2),
            if w.ok { "" } else { ", short" }
        ),
        None => "the turns touch: no free span".to_string(),
    }
}

/// The fabrication table's rows: per candidate (index) and actuator it uses, the cells
/// `[actuator, fingers, cast rubber (ml), silicone to mix (g), silicone for the gripper
/// (g), fiber (m), wrap-pitch margin]` as text (not escaped), or why there is no sheet.
pub fn fab_rows(cands: &[Candidate]) -> Vec<(usize, Result<[String; 7], String>)> {
    use crate::report::fixed;
    let mut rows = Vec::new();
    for (k, c) in cands.iter().enumerate() {
        match &c.fab {
            Ok(doc) => rows.extend(doc.actuators.iter().map(|a| {
                let cells = [
                    a.name.clone(),
                    a.fingers.to_string(),
                    fixed(a.rubber_volume_ml, 1),
                    fixed(a.silicone_mass_g.total, 1),
                    fixed(a.silicone_mass_g.total * a.fingers as f64, 1),
                    fixed(a.fiber.total_length_mm * 1e-3, 2),
                    wrap_margin(&a.wrap),
                ];
                (k, Ok(cells))
            })),
            Err(e) => rows.push((k, Err(e.clone()))),
        }
    }
    rows
}

/// Object names over all candidates, in order of first appearance.
pub fn object_names(cands: &[Candidate]) -> Vec<String> {
    let mut names: Vec<String> = Vec::new();
    for c in cands {
        for o in &c.report.objects {
            if !names.contains(&o.name) {
                names.push(o.name.clone());
            }
        }
    }
    names
}

/// The actuators the scene's fingers use, in the scene's order.
fn used_actuators(scene: &Scene) -> Vec<&grasp_core::actuator::Actuator> {
    let mut used: Vec<usize> = scene.gripper.fingers.iter().map(|f| f.actuator).collect();
    used.sort_unstable();
    used.dedup();
    used.into_iter().filter_map(|i| scene.actuators.get(i)).collect()
}

fn bends(scene: &Scene, elements: usize) -> Result<Vec<BendDoc>, AppError> {
    used_actuators(scene)
        .into_iter()
        .map(|a| {
            let top = a.max_pressure * 1e-3;
            let pressures: Vec<f64> = (0..=BEND_STEPS).map(|k| top * k as f64 / BEND_STEPS as f64).collect();
            crate::commands::bend::compute(a, &pressures, a.section_model, elements)
        })
        .collect()
}

/// The fabrication sheet's document for the actuators `scene`'s fingers use, with the
/// sheet's own shop values; the reason when the sheet refuses an actuator.
fn fab(scene: &Scene) -> Result<FabDoc, String> {
    let settings = grasp_core::fab::FabSettings::default();
    crate::commands::fab::compute(scene, &used_actuators(scene), &settings)
        .map(|(doc, _)| doc)
        .map_err(|e| e.to_string())
}

/// Runs `review`.
pub fn run(args: ReviewArgs) -> Result<Outcome, AppError> {
    if args.scenes.is_empty() || args.scenes.len() > MAX_CANDIDATES {
        return Err(AppError::input(format!(
            "review compares 1 to {MAX_CANDIDATES} scenes, got {}",
            args.scenes.len()
        )));
    }
    if !(MIN_ELEMENTS..=MAX_ELEMENTS).contains(&args.elements) {
        return Err(AppError::input(format!(
            "--elements: must be between {MIN_ELEMENTS} and {MAX_ELEMENTS}, got {}",
            args.elements
        )));
    }
    let dir = args.out.unwrap_or_else(|| PathBuf::from("review"));
    let html_path = dir.join("review.html");
    let md_path = dir.join("review.md");
    let mut loaded = Vec::new();
    for path in &args.scenes {
        loaded.push((path.clone(), crate::scene_file::load(path)?));
    }
    let inputs: Vec<&Path> = args.scenes.iter().map(PathBuf::as_path).collect();
    refuse_overwrite(&html_path, &inputs)?;
    refuse_overwrite(&md_path, &inputs)?;
    let settings = CheckSettings { elements: args.elements, ..CheckSettings::default() };
    let mut cands = Vec::new();
    for (path, scene) in loaded {
        let report = grasp_core::check::check_scene(&scene, &settings)?;
        let bends = bends(&scene, args.elements.max(MIN_ELEMENTS))?;
        let fab = fab(&scene);
        cands.push(Candidate {
            file: path.display().to_string(),
            scene,
            report,
            bends,
            fab,
            picture: None,
            picture_note: NO_RENDERER.to_string(),
        });
    }
    pictures(&mut cands, args.elements);
    let page = html::page(&cands)?;
    let summary = markdown::summary(&cands);
    std::fs::create_dir_all(&dir).map_err(|e| AppError::io(format!("creating {}", dir.display()), e))?;
    write_atomic(&html_path, page.as_bytes())?;
    write_atomic(&md_path, summary.as_bytes())?;
    eprintln!("arcfinger: wrote {} and {}", html_path.display(), md_path.display());
    let statuses: Vec<Status> = cands.iter().map(Candidate::status).collect();
    if statuses.contains(&Status::Unknown) {
        return Err(AppError::NotConverged("a candidate's result is unknown (see the report)".into()));
    }
    Ok(if statuses.contains(&Status::Pass) { Outcome::Pass } else { Outcome::Fail })
}

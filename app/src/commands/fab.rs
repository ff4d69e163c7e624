//! `arcfinger fab SCENE`: the fabrication sheet of each actuator of a scene (DESIGN 3.5).
//!
//! For every actuator (or the one named with `--actuator`): the molds and the chamber
//! core with inside dimensions and fill heights, the silicone of each pour and coat with
//! its mass split for a two-part 1:1 mix and the stated waste allowance, the fiber of the
//! double wind, the strain-limiting sheet, the tube, the wrap-pitch check, the process in
//! order, and the cautions of DESIGN 3.6. The numbers come from `grasp_core::fab`.
//!
//! Output: the Markdown sheet on stdout; `--json FILE|-` the `arcfinger/fab/1` document;
//! `--out DIR` writes the sheet (`SCENE-fab.md`), the JSON (`SCENE-fab.json`) and the
//! 1:1 cut templates (`SCENE-ACTUATOR-templates-N.svg`) into DIR, creating it if needed.
//! No output may name an input file. Exit code 0, or 2 for bad input.

use std::fmt::Write as _;
use std::path::{Path, PathBuf};

use grasp_core::actuator::Actuator;
use grasp_core::fab::wrap::{WrapCheck, wrap_check};
use grasp_core::fab::{FabPlan, FabSettings, plan};
use grasp_core::material::library_entry;
use grasp_core::scene::Scene;
use serde::Serialize;

use crate::cli::FabArgs;
use crate::error::{AppError, Outcome};
use crate::output::{Sink, refuse_overwrite, write_atomic};
use crate::report::CAUTIONS;
use crate::report::markdown::escape as md;
use crate::suggest::actuator_named;

/// The `format` value.
pub const FORMAT: &str = "arcfinger/fab/1";

/// The actuators a run covers: the named one, or all of the scene's.
///
/// # Errors
/// An unknown name, with the nearest defined one.
pub fn select_actuators<'a>(
    scene: &'a Scene,
    name: Option<&str>,
    origin: &str,
) -> Result<Vec<&'a Actuator>, AppError> {
    match name {
        None => Ok(scene.actuators.iter().collect()),
        Some(name) => Ok(vec![actuator_named(scene, name, origin)?]),
    }
}

/// Silicone masses (g).
#[derive(Debug, Clone, Copy, Serialize)]
pub struct MassDoc {
    /// Part A (g).
    pub part_a: f64,
    /// Part B (g).
    pub part_b: f64,
    /// Both (g).
    pub total: f64,
}

/// One pour or coat.
#[derive(Debug, Clone, Serialize)]
pub struct CastDoc {
    /// What it is.
    pub name: &'static str,
    /// Rubber volume (ml).
    pub volume_ml: f64,
    /// Part of the finger's cast rubber (`false` for coats).
    pub cast: bool,
}

/// The fiber.
#[derive(Debug, Clone, Copy, Serialize)]
pub struct FiberDoc {
    /// Axial pitch of one helix (mm).
    pub pitch_mm: f64,
    /// Whole turns per helix.
    pub turns_per_helix: usize,
    /// One helix, tie-off excluded (mm).
    pub length_per_helix_mm: f64,
    /// Both helices with tie-offs (mm).
    pub total_length_mm: f64,
    /// Tie-off allowance per helix (mm).
    pub tie_off_per_helix_mm: f64,
    /// Perimeter wound around (mm).
    pub perimeter_mm: f64,
    /// Length wound (mm).
    pub wound_length_mm: f64,
}

/// One pour into a mold.
#[derive(Debug, Clone, Serialize)]
pub struct FillDoc {
    /// Fill height from the mold's bottom (mm).
    pub height_mm: f64,
    /// What is poured.
    pub pour: &'static str,
}

/// A piece of a cut template.
#[derive(Debug, Clone, Serialize)]
pub struct PieceDoc {
    /// Label.
    pub name: String,
    /// How many to cut.
    pub count: usize,
    /// Bounding box `[width, height]` (mm).
    pub size_mm: [f64; 2],
}

/// A mold or the core.
#[derive(Debug, Clone, Serialize)]
pub struct MoldDoc {
    /// Name.
    pub name: &'static str,
    /// Inside (the core: outside) `[length, width, depth]` (mm).
    pub inside_mm: [f64; 3],
    /// Pours in order.
    pub fill: Vec<FillDoc>,
    /// Pieces to cut.
    pub pieces: Vec<PieceDoc>,
    /// How it is made or placed.
    pub note: String,
}

/// The tube.
#[derive(Debug, Clone, Copy, Serialize)]
pub struct TubingDoc {
    /// Largest outer diameter (mm).
    pub max_outer_diameter_mm: f64,
    /// Insertion depth from the base end (mm).
    pub insert_length_mm: f64,
}

/// The wrap-pitch check.
#[derive(Debug, Clone, Copy, Serialize)]
pub struct WrapDoc {
    /// Free span between turns (mm).
    pub span_mm: f64,
    /// Wall of the strip (mm).
    pub wall_mm: f64,
    /// Onset of bulging (kPa); `null` when the turns touch.
    pub bulge_pressure_kpa: Option<f64>,
    /// Bulge pressure over rated pressure; `null` when the turns touch.
    pub margin: Option<f64>,
    /// Margin required (the scene's safety factor).
    pub required_margin: f64,
    /// Largest pitch with the required margin (mm).
    pub max_safe_pitch_mm: f64,
    /// Whether the margin is met.
    pub ok: bool,
}

impl WrapDoc {
    /// From the core's check.
    pub fn of(w: &WrapCheck) -> Self {
        Self {
            span_mm: w.span * 1e3,
            wall_mm: w.wall * 1e3,
            bulge_pressure_kpa: w.bulge_pressure.map(|p| p / 1e3),
            margin: w.margin,
            required_margin: w.required_margin,
            max_safe_pitch_mm: w.max_safe_pitch * 1e3,
            ok: w.ok(),
        }
    }
}

/// One actuator's sheet.
#[derive(Debug, Clone, Serialize)]
pub struct ActuatorFabDoc {
    /// Actuator name.
    pub name: String,
    /// Fingers of the gripper that use it.
    pub fingers: usize,
    /// Material name.
    pub material: String,
    /// Density (g/cm³).
    pub density_g_cm3: f64,
    /// Cast rubber of one finger, no coats, no waste (ml).
    pub rubber_volume_ml: f64,
    /// Coats of one finger (ml).
    pub coat_volume_ml: f64,
    /// Silicone to mix for one finger, coats and waste included (g).
    pub silicone_mass_g: MassDoc,
    /// Waste allowance (fraction).
    pub waste_allowance: f64,
    /// Mix ratio assumed.
    pub mix_ratio: &'static str,
    /// Pours and coats of one finger.
    pub casts: Vec<CastDoc>,
    /// Fiber of one finger.
    pub fiber: FiberDoc,
    /// Strain-limiting sheet `[length, width]` (mm).
    pub strain_layer_mm: [f64; 2],
    /// Molds and core.
    pub molds: Vec<MoldDoc>,
    /// Tube.
    pub tubing: TubingDoc,
    /// Cure before demolding (h).
    pub cure_before_demold_h: f64,
    /// Wrap-pitch check.
    pub wrap: WrapDoc,
}

/// The shop assumptions, as printed.
#[derive(Debug, Clone, Copy, Serialize)]
pub struct SettingsDoc {
    /// Waste allowance (fraction).
    pub waste_allowance: f64,
    /// Coat thickness (mm).
    pub coat_thickness_mm: f64,
    /// Tie-off per helix end (mm).
    pub tie_off_per_end_mm: f64,
    /// Sheet inset (mm).
    pub sheet_inset_mm: f64,
    /// Mold sheet thickness (mm).
    pub mold_wall_mm: f64,
    /// Shortest cure before demolding (h).
    pub min_cure_h: f64,
}

/// The `arcfinger/fab/1` document (DESIGN 4.3), with extra keys.
#[derive(Debug, Clone, Serialize)]
pub struct FabDoc {
    /// `"arcfinger/fab/1"`.
    pub format: &'static str,
    /// Scene name.
    pub scene: String,
    /// One entry per actuator.
    pub actuators: Vec<ActuatorFabDoc>,
    /// Silicone for every finger of the gripper that uses a listed actuator (g).
    pub gripper_silicone_g: f64,
    /// The assumptions.
    pub settings: SettingsDoc,
    /// DESIGN 3.6.
    pub cautions: &'static str,
}

fn ml(v: f64) -> f64 {
    v * 1e6
}

fn actuator_doc(scene: &Scene, a: &Actuator, p: &FabPlan, w: &WrapCheck) -> ActuatorFabDoc {
    let index = scene.actuators.iter().position(|x| x.name == a.name);
    let fingers = scene.gripper.fingers.iter().filter(|f| Some(f.actuator) == index).count();
    let g = |kg: f64| kg * 1e3;
    ActuatorFabDoc {
        name: a.name.clone(),
        fingers,
        material: a.material_name.clone(),
        density_g_cm3: a.material.density / 1e3,
        rubber_volume_ml: ml(p.rubber_volume),
        coat_volume_ml: ml(p.coat_volume),
        silicone_mass_g: MassDoc {
            part_a: g(p.part_mass()),
            part_b: g(p.part_mass()),
            total: g(p.silicone_mass),
        },
        waste_allowance: p.waste_allowance,
        mix_ratio: "1:1 by mass",
        casts: p
            .casts
            .iter()
            .map(|c| CastDoc { name: c.name, volume_ml: ml(c.volume), cast: c.cast })
            .collect(),
        fiber: FiberDoc {
            pitch_mm: p.fiber.pitch * 1e3,
            turns_per_helix: p.fiber.turns_per_helix,
            length_per_helix_mm: p.fiber.length_per_helix * 1e3,
            total_length_mm: p.fiber.total_length * 1e3,
            tie_off_per_helix_mm: p.fiber.tie_off_per_helix * 1e3,
            perimeter_mm: p.fiber.perimeter * 1e3,
            wound_length_mm: p.fiber.wound_length * 1e3,
        },
        strain_layer_mm: [p.strain_layer.0 * 1e3, p.strain_layer.1 * 1e3],
        molds: p
            .molds
            .iter()
            .map(|m| MoldDoc {
                name: m.name,
                inside_mm: m.inside.map(|x| x * 1e3),
                fill: m.fill.iter().map(|&(h, pour)| FillDoc { height_mm: h * 1e3, pour }).collect(),
                pieces: m
                    .pieces
                    .iter()
                    .map(|pc| {
                        let (w, h) = pc.outline.size();
                        PieceDoc { name: pc.name.clone(), count: pc.count, size_mm: [w * 1e3, h * 1e3] }
                    })
                    .collect(),
                note: m.note.clone(),
            })
            .collect(),
        tubing: TubingDoc {
            max_outer_diameter_mm: p.tubing.max_outer_diameter * 1e3,
            insert_length_mm: p.tubing.insert_length * 1e3,
        },
        cure_before_demold_h: p.cure_before_demold_h,
        wrap: WrapDoc::of(w),
    }
}

/// The plans and the document for `actuators` of `scene` (no I/O).
///
/// # Errors
/// A plan the core refuses.
pub fn compute(
    scene: &Scene,
    actuators: &[&Actuator],
    settings: &FabSettings,
) -> Result<(FabDoc, Vec<FabPlan>), AppError> {
    let mut docs = Vec::new();
    let mut plans = Vec::new();
    for a in actuators {
        let cure = library_entry(&a.material_name).map(|e| e.cure_time_h);
        let p =
            plan(a, cure, settings).map_err(|e| AppError::input(format!("actuator \"{}\": {e}", a.name)))?;
        let w = wrap_check(a, scene.criteria.safety_factor);
        docs.push(actuator_doc(scene, a, &p, &w));
        plans.push(p);
    }
    let gripper_silicone_g = docs.iter().map(|d| d.silicone_mass_g.total * d.fingers as f64).sum();
    Ok((
        FabDoc {
            format: FORMAT,
            scene: scene.name.clone(),
            actuators: docs,
            gripper_silicone_g,
            settings: SettingsDoc {
                waste_allowance: settings.waste_allowance,
                coat_thickness_mm: settings.coat_thickness * 1e3,
                tie_off_per_end_mm: settings.tie_off_per_end * 1e3,
                sheet_inset_mm: settings.sheet_inset * 1e3,
                mold_wall_mm: settings.mold_wall * 1e3,
                min_cure_h: settings.min_cure_h,
            },
            cautions: CAUTIONS,
        },
        plans,
    ))
}

/// The wrap-pitch warning for an actuator, when its margin is short.
pub fn wrap_warning(name: &str, w: &WrapCheck) -> Option<String> {
    if w.ok() {
        return None;
    }
    let (p, m) = (w.bulge_pressure?, w.margin?);
    Some(format!(
        "actuator \"{name}\": the wall between fiber turns ({:.1} mm span, {:.1} mm wall) starts to bulge near {:.0} kPa, \
         {m:.2} times the rated pressure, less than the required {:.2}; wind at a pitch of at most {:.2} mm",
        w.span * 1e3,
        w.wall * 1e3,
        p / 1e3,
        w.required_margin,
        w.max_safe_pitch * 1e3
    ))
}

/// The Markdown sheet; `templates` lists the SVG files per actuator when written.
pub fn markdown(doc: &FabDoc, scene_file: &str, templates: &[Vec<String>]) -> String {
    let mut s = String::new();
    let _ = writeln!(s, "# Fabrication sheet: {}\n", md(&doc.scene));
    let _ = writeln!(
        s,
        "Scene file `{}`. Quantities are for one finger unless stated; lengths in mm. Shop values \
         marked *common practice* have no published source: adjust them to your shop.\n",
        scene_file.replace('`', "'")
    );
    for (i, a) in doc.actuators.iter().enumerate() {
        let _ = writeln!(
            s,
            "## Actuator {} (used by {} finger{})\n",
            md(&a.name),
            a.fingers,
            if a.fingers == 1 { "" } else { "s" }
        );
        let _ = writeln!(s, "Material: {} (density {:.2} g/cm³).\n", md(&a.material), a.density_g_cm3);
        let _ = writeln!(s, "### Molds\n");
        let _ =
            writeln!(s, "| part | inside, L × W × D (mm) | pours (height from the mold's bottom) | note |");
        let _ = writeln!(s, "| --- | --- | --- | --- |");
        for m in &a.molds {
            let fill = if m.fill.is_empty() {
                "—".to_string()
            } else {
                m.fill
                    .iter()
                    .map(|f| format!("{:.1} mm: {}", f.height_mm, f.pour))
                    .collect::<Vec<_>>()
                    .join("; ")
            };
            let [l, w, d] = m.inside_mm;
            let _ = writeln!(s, "| {} | {l:.1} × {w:.1} × {d:.1} | {fill} | {} |", m.name, m.note);
        }
        let _ = writeln!(s);
        let pieces: Vec<String> = a
            .molds
            .iter()
            .flat_map(|m| m.pieces.iter())
            .map(|p| format!("{} × {} ({:.1} × {:.1})", p.count, p.name, p.size_mm[0], p.size_mm[1]))
            .collect();
        let _ =
            writeln!(s, "Pieces to cut ({:.0} mm sheet): {}.", doc.settings.mold_wall_mm, pieces.join(", "));
        match templates.get(i) {
            Some(files) if !files.is_empty() => {
                let _ = writeln!(
                    s,
                    "Cut templates at 1:1: {} (print at 100 %, measure the scale bars).\n",
                    files.iter().map(|f| format!("`{f}`")).collect::<Vec<_>>().join(", ")
                );
            }
            _ => s.push_str("Cut templates at 1:1: run with `--out DIR` to write them as SVG.\n\n"),
        }
        let _ = writeln!(s, "### Silicone\n");
        let _ = writeln!(s, "| pour or coat | volume (ml) |");
        let _ = writeln!(s, "| --- | ---: |");
        for c in &a.casts {
            let _ = writeln!(s, "| {} | {:.2} |", c.name, c.volume_ml);
        }
        let m = a.silicone_mass_g;
        let _ = writeln!(
            s,
            "\nCast rubber {:.2} ml, coats {:.2} ml. Mix **{:.1} g**: part A {:.1} g + part B {:.1} g \
             ({}, with a {:.0} % waste allowance, *common practice*; check your kit's ratio).\n",
            a.rubber_volume_ml,
            a.coat_volume_ml,
            m.total,
            m.part_a,
            m.part_b,
            a.mix_ratio,
            a.waste_allowance * 100.0
        );
        if a.fingers > 1 {
            let _ = writeln!(s, "For all {} fingers: {:.0} g.\n", a.fingers, m.total * a.fingers as f64);
        }
        let f = a.fiber;
        let _ = writeln!(s, "### Fiber, sheet and tube\n");
        let _ = writeln!(
            s,
            "- Double helix at a {:.2} mm pitch over the chamber ({:.1} mm): {} turns per helix around a {:.1} mm \
             perimeter, {:.0} mm of fiber per helix plus {:.0} mm to tie off; **{:.2} m ({:.1} ft) in all**. \
             Wind one helix, then the other in the opposite direction.",
            f.pitch_mm,
            f.wound_length_mm,
            f.turns_per_helix,
            f.perimeter_mm,
            f.length_per_helix_mm,
            f.tie_off_per_helix_mm,
            f.total_length_mm / 1e3,
            f.total_length_mm / 304.8
        );
        let _ = writeln!(
            s,
            "- Strain-limiting sheet (paper, woven fabric or mesh that does not stretch): {:.1} × {:.1} mm, {:.0} mm \
             inside the plate's edge.",
            a.strain_layer_mm[0], a.strain_layer_mm[1], doc.settings.sheet_inset_mm
        );
        let _ = writeln!(
            s,
            "- Tube: outer diameter at most {:.1} mm, pushed {:.1} mm in from the base end (through the base cap \
             into the chamber).\n",
            a.tubing.max_outer_diameter_mm, a.tubing.insert_length_mm
        );
        let w = a.wrap;
        let _ = writeln!(s, "### Wrap pitch\n");
        match (w.bulge_pressure_kpa, w.margin) {
            (Some(p), Some(m)) => {
                let _ = writeln!(
                    s,
                    "The {:.1} mm wall between turns ({:.2} mm free span) starts to bulge near {:.0} kPa: {:.2} times \
                     the rated pressure (required {:.2}). Largest pitch with that margin: {:.2} mm. {}\n",
                    w.wall_mm,
                    w.span_mm,
                    p,
                    m,
                    w.required_margin,
                    w.max_safe_pitch_mm,
                    if w.ok { "OK." } else { "**Wind tighter.**" }
                );
            }
            _ => {
                let _ = writeln!(s, "The turns touch: no free wall between them.\n");
            }
        }
        let _ = writeln!(s, "### Process (*common practice*)\n");
        let cure = a.cure_before_demold_h;
        for (k, step) in [
            format!(
                "Body: set the chamber core in the top mold, face flush with the open face; mix, degas and pour to \
                 the brim. Let it cure at least {cure:.0} h at room temperature before demolding."
            ),
            format!(
                "Plate: pour the under-layer, lay the strain-limiting sheet flat on it, pour the floor over it; cure \
                 at least {cure:.0} h."
            ),
            "Coat and bond: brush a thin coat on the body's open face (not into the chamber), press it onto the \
             plate, square and centred; cure."
                .to_string(),
            "Wind: one helix over the chamber, then the other in the opposite direction, turns evenly spaced at \
             the pitch; tie off at both ends."
                .to_string(),
            "Seal: brush a coat over the fibers so they are bonded to the wall; cure.".to_string(),
            "Tube: push the tube through the base cap into the chamber and seal around it. Test the finger \
             behind a shield, ramping up slowly to the rated pressure, never above it."
                .to_string(),
        ]
        .iter()
        .enumerate()
        {
            let _ = writeln!(s, "{}. {step}", k + 1);
        }
        let _ = writeln!(s);
    }
    if doc.actuators.len() > 1 || doc.actuators.first().is_some_and(|a| a.fingers > 1) {
        let _ = writeln!(s, "Silicone for the whole gripper: {:.0} g.\n", doc.gripper_silicone_g);
    }
    let st = doc.settings;
    let _ = writeln!(
        s,
        "## Assumptions (*common practice*)\n\n{:.0} % waste allowance; brushed coats {:.1} mm thick; {:.0} mm of \
         fiber at each end of each helix to tie off; strain-limiting sheet {:.0} mm inside the plate's edge; \
         mold sheet {:.0} mm thick; at least {:.0} h of cure before demolding (longer if the material's datasheet \
         says so); two-part 1:1 mix by mass.\n",
        st.waste_allowance * 100.0,
        st.coat_thickness_mm,
        st.tie_off_per_end_mm,
        st.sheet_inset_mm,
        st.mold_wall_mm,
        st.min_cure_h
    );
    let _ = writeln!(s, "## Cautions\n\n{CAUTIONS}");
    s
}

/// A file-name-safe form of a name.
fn file_part(s: &str) -> String {
    let t: String =
        s.chars().map(|c| if c.is_ascii_alphanumeric() || c == '-' || c == '_' { c } else { '-' }).collect();
    if t.is_empty() { "x".into() } else { t }
}

/// Runs `fab`.
pub fn run(args: FabArgs) -> Result<Outcome, AppError> {
    let scene = crate::scene_file::load(&args.scene)?;
    let origin = args.scene.display().to_string();
    let inputs = crate::commands::check::input_files(&args.scene, &scene);
    let inputs: Vec<&Path> = inputs.iter().map(PathBuf::as_path).collect();
    let json = args.json.as_deref().map(Sink::parse);
    if let Some(Sink::File(p)) = &json {
        refuse_overwrite(p, &inputs)?;
    }
    let actuators = select_actuators(&scene, args.actuator.as_deref(), &origin)?;
    let settings = FabSettings::default();
    let (doc, plans) = compute(&scene, &actuators, &settings)?;
    for a in &actuators {
        if let Some(w) = wrap_warning(&a.name, &wrap_check(a, scene.criteria.safety_factor)) {
            eprintln!("arcfinger: warning: {w}");
        }
    }
    let mut json_text = serde_json::to_string_pretty(&doc).map_err(AppError::input)?;
    json_text.push('\n');
    let mut templates: Vec<Vec<String>> = Vec::new();
    let mut files: Vec<(PathBuf, Vec<u8>)> = Vec::new();
    if let Some(dir) = &args.out {
        let stem = file_part(&scene.name);
        for p in &plans {
            let mut pieces: Vec<grasp_core::fab::Piece> =
                p.molds.iter().flat_map(|m| m.pieces.clone()).collect();
            pieces.push(grasp_core::fab::Piece {
                name: "strain-limiting sheet".into(),
                count: 1,
                outline: grasp_core::fab::Outline::Rect { width: p.strain_layer.0, height: p.strain_layer.1 },
            });
            let title = format!("{} / {}", scene.name, p.name);
            let pages = crate::fab_svg::template_pages(&title, &pieces)
                .map_err(|e| AppError::input(format!("actuator \"{}\": {e}", p.name)))?;
            let mut names = Vec::new();
            for (k, page) in pages.into_iter().enumerate() {
                let name = format!("{stem}-{}-templates-{}.svg", file_part(&p.name), k + 1);
                files.push((dir.join(&name), page.into_bytes()));
                names.push(name);
            }
            templates.push(names);
        }
        files.push((dir.join(format!("{stem}-fab.json")), json_text.clone().into_bytes()));
    }
    let sheet = markdown(&doc, &origin, &templates);
    if let Some(dir) = &args.out {
        files.push((dir.join(format!("{}-fab.md", file_part(&scene.name))), sheet.clone().into_bytes()));
        for (path, _) in &files {
            refuse_overwrite(path, &inputs)?;
        }
        std::fs::create_dir_all(dir).map_err(|e| AppError::io(format!("creating {}", dir.display()), e))?;
        for (path, bytes) in &files {
            write_atomic(path, bytes)?;
        }
    }
    match &json {
        Some(Sink::Stdout) => Sink::Stdout.write(json_text.as_bytes())?,
        Some(sink) => {
            sink.write(json_text.as_bytes())?;
            Sink::Stdout.write(sheet.as_bytes())?;
        }
        None => Sink::Stdout.write(sheet.as_bytes())?,
    }
    if args.out.is_some() {
        for (path, _) in &files {
            eprintln!("arcfinger: wrote {}", path.display());
        }
    }
    Ok(Outcome::Pass)
}

#[cfg(test)]
mod tests {
    use super::*;

    /// The document follows DESIGN 4.3 on the demo scene, with numbers equal to the
    /// core's plan (the physics is checked there), and the sheet names every part.
    #[test]
    fn demo_sheet_follows_the_contract() {
        let scene = crate::commands::check::demo_scene().unwrap();
        let acts = select_actuators(&scene, None, "demo").unwrap();
        let (doc, plans) = compute(&scene, &acts, &FabSettings::default()).unwrap();
        let v = serde_json::to_value(&doc).unwrap();
        assert_eq!(v["format"], "arcfinger/fab/1");
        let a = &v["actuators"][0];
        for key in [
            "name",
            "rubber_volume_ml",
            "silicone_mass_g",
            "waste_allowance",
            "fiber",
            "strain_layer_mm",
            "molds",
        ] {
            assert!(!a[key].is_null(), "{key}");
        }
        for key in ["part_a", "part_b", "total"] {
            assert!(a["silicone_mass_g"][key].as_f64().unwrap() > 0.0);
        }
        for key in ["pitch_mm", "turns_per_helix", "length_per_helix_mm", "total_length_mm"] {
            assert!(a["fiber"][key].as_f64().unwrap() > 0.0);
        }
        assert_eq!(a["fingers"], 3);
        assert!((a["rubber_volume_ml"].as_f64().unwrap() - plans[0].rubber_volume * 1e6).abs() < 1e-12);
        assert!(
            (v["gripper_silicone_g"].as_f64().unwrap() - 3.0 * plans[0].silicone_mass * 1e3).abs() < 1e-9
        );
        let text = markdown(&doc, "demo", &[]);
        for needle in
            ["chamber core", "top mold", "plate mold", "part A", "Double helix", "relief valve", "cure"]
        {
            assert!(text.contains(needle), "{needle}\n{text}");
        }
    }

    #[test]
    fn unknown_actuator_names_the_nearest() {
        let scene = crate::commands::check::demo_scene().unwrap();
        let e = select_actuators(&scene, Some("box-10"), "demo").unwrap_err();
        assert!(e.to_string().contains("did you mean \"box-100\"") && e.exit_code() == 2, "{e}");
    }

    #[test]
    fn file_names_are_safe() {
        assert_eq!(file_part("../x y"), "---x-y");
    }
}

//! `arcfinger calibrate SCENE --actuator NAME MEASURED.csv`: fit the model to a measured
//! prototype and write a calibrated copy of the scene.
//!
//! The CSV has a header row and one row per pressure (columns in any order, `#` starts a
//! comment line):
//!
//! | column | required | meaning |
//! | --- | --- | --- |
//! | `pressure_kpa` | yes | gauge pressure, `0 <` p `<=` the rated pressure |
//! | `bend_deg` | yes | measured bend angle of the free finger's tip |
//! | `blocked_force_n` | no | measured blocked tip force; an empty cell = not measured |
//!
//! The fit is `grasp_core::calibrate`: a modulus scale, and with `--fit-floor` an
//! effective floor thickness. The calibrated scene is written next to the input as
//! `STEM-calibrated.ron` (or to `--out FILE`): the same scene with a new material block
//! (the old one scaled) that the actuator now names, and the fitted floor. The input is
//! never written to. Comments of the input are not carried over; a header comment says
//! where the file came from.
//!
//! Exit codes: 0 = calibrated and written; 2 = bad input; 3 = the fit did not converge
//! (nothing is written).

use std::fmt::Write as _;
use std::path::{Path, PathBuf};

use grasp_core::actuator::Actuator;
use grasp_core::calibrate::{Calibration, CalibrationSettings, Measurement, calibrate, floor_of};
use serde::Serialize;

use crate::cli::CalibrateArgs;
use crate::commands::fit::data::{data_lines, number, record};
use crate::commands::fit::model_doc;
use crate::error::{AppError, Outcome};
use crate::output::{Sink, refuse_overwrite, write_atomic};
use crate::scene_doc::{MaterialDoc, SceneDoc, SectionDoc};
use crate::suggest::actuator_named;

/// The `format` value.
pub const FORMAT: &str = "arcfinger/calibrate/1";

/// Reads measurements from CSV text; `file` names it in messages.
///
/// # Errors
/// [`AppError::Input`] naming `file:line`, the column and what was expected.
pub fn parse_measurements(file: &str, bytes: &[u8]) -> Result<Vec<(u64, Measurement)>, AppError> {
    const COLUMNS: [&str; 3] = ["pressure_kpa", "bend_deg", "blocked_force_n"];
    let lines = data_lines(file, bytes)?;
    let mut lines = lines.into_iter();
    let Some((header_line, header_text)) = lines.next() else {
        return Err(AppError::input(format!(
            "{file}: the file is empty; expected a header row with `pressure_kpa`, `bend_deg` and optionally `blocked_force_n`"
        )));
    };
    let header = record(file, header_line, header_text)?;
    let mut index = [None; 3];
    for (i, raw) in header.iter().enumerate() {
        let name = raw.to_ascii_lowercase();
        let Some(k) = COLUMNS.iter().position(|c| *c == name) else {
            return Err(AppError::input(format!(
                "{file}:{header_line}: unknown column `{raw}`; valid columns are {}",
                COLUMNS.join(", ")
            )));
        };
        if index[k].replace(i).is_some() {
            return Err(AppError::input(format!("{file}:{header_line}: column `{name}` appears twice")));
        }
    }
    let (Some(p_col), Some(b_col)) = (index[0], index[1]) else {
        return Err(AppError::input(format!(
            "{file}:{header_line}: expected the columns `pressure_kpa` and `bend_deg` (and optionally `blocked_force_n`)"
        )));
    };
    let mut rows = Vec::new();
    for (line, raw) in lines {
        let fields = record(file, line, raw)?;
        if fields.len() != header.len() {
            return Err(AppError::input(format!(
                "{file}:{line}: expected {} fields as in the header, found {}",
                header.len(),
                fields.len()
            )));
        }
        let pressure_kpa = number(file, line, "pressure_kpa", &fields[p_col])?;
        if !(pressure_kpa > 0.0) {
            return Err(AppError::input(format!(
                "{file}:{line}: column `pressure_kpa`: expected a pressure > 0 kPa, got `{}`",
                fields[p_col]
            )));
        }
        let bend_deg = number(file, line, "bend_deg", &fields[b_col])?;
        let blocked_force = match index[2] {
            Some(i) if !fields[i].is_empty() => Some(number(file, line, "blocked_force_n", &fields[i])?),
            _ => None,
        };
        rows.push((
            line,
            Measurement { pressure: pressure_kpa * 1e3, bend_angle: bend_deg.to_radians(), blocked_force },
        ));
    }
    if rows.is_empty() {
        return Err(AppError::input(format!("{file}:{header_line}: no data rows after the header")));
    }
    Ok(rows)
}

/// Residuals in report units.
#[derive(Debug, Clone, Copy, Serialize)]
pub struct ResidualDoc {
    /// RMS bend-angle error (deg).
    pub bend_rms_deg: f64,
    /// RMS blocked-force error (N), when forces were measured.
    pub force_rms_n: Option<f64>,
}

/// One measured point with the model before and after.
#[derive(Debug, Clone, Copy, Serialize)]
pub struct PointDoc {
    /// Pressure (kPa).
    pub pressure_kpa: f64,
    /// Measured bend angle (deg).
    pub bend_deg: f64,
    /// Model bend angle before (deg).
    pub bend_before_deg: f64,
    /// Model bend angle after (deg).
    pub bend_after_deg: f64,
    /// Measured blocked force (N).
    pub blocked_force_n: Option<f64>,
    /// Model blocked force before (N).
    pub force_before_n: Option<f64>,
    /// Model blocked force after (N).
    pub force_after_n: Option<f64>,
}

/// The `arcfinger/calibrate/1` document.
#[derive(Debug, Clone, Serialize)]
pub struct CalibrateDoc {
    /// `"arcfinger/calibrate/1"`.
    pub format: &'static str,
    /// Scene name.
    pub scene: String,
    /// Actuator name.
    pub actuator: String,
    /// Fitted modulus scale.
    pub modulus_scale: f64,
    /// Its standard error.
    pub modulus_scale_error: f64,
    /// Floor before (mm).
    pub floor_before_mm: f64,
    /// Floor after (mm).
    pub floor_mm: f64,
    /// Its standard error (mm), when fitted.
    pub floor_error_mm: Option<f64>,
    /// Residuals with the scene's parameters.
    pub residual_before: ResidualDoc,
    /// Residuals with the fitted parameters.
    pub residual_after: ResidualDoc,
    /// Levenberg–Marquardt iterations.
    pub iterations: usize,
    /// Whether the fit converged.
    pub converged: bool,
    /// Name of the calibrated material block.
    pub material: String,
    /// Where the calibrated scene was written (`null` when not written).
    pub calibrated_scene: Option<String>,
    /// The points.
    pub points: Vec<PointDoc>,
}

fn residual_doc(r: &grasp_core::calibrate::Residuals) -> ResidualDoc {
    ResidualDoc { bend_rms_deg: r.bend_rms.to_degrees(), force_rms_n: r.force_rms }
}

/// The document of a calibration (no I/O).
pub fn document(
    scene: &str,
    base: &Actuator,
    data: &[Measurement],
    c: &Calibration,
    material: &str,
    written: Option<&Path>,
) -> CalibrateDoc {
    CalibrateDoc {
        format: FORMAT,
        scene: scene.to_string(),
        actuator: base.name.clone(),
        modulus_scale: c.modulus_scale,
        modulus_scale_error: c.modulus_scale_error,
        floor_before_mm: floor_of(&base.section) * 1e3,
        floor_mm: c.floor * 1e3,
        floor_error_mm: c.floor_error.map(|e| e * 1e3),
        residual_before: residual_doc(&c.before),
        residual_after: residual_doc(&c.after),
        iterations: c.iterations,
        converged: c.converged,
        material: material.to_string(),
        calibrated_scene: written.map(|p| p.display().to_string()),
        points: data
            .iter()
            .enumerate()
            .map(|(i, m)| PointDoc {
                pressure_kpa: m.pressure / 1e3,
                bend_deg: m.bend_angle.to_degrees(),
                bend_before_deg: c.prediction_before.bend_angle[i].to_degrees(),
                bend_after_deg: c.prediction_after.bend_angle[i].to_degrees(),
                blocked_force_n: m.blocked_force,
                force_before_n: c.prediction_before.blocked_force[i],
                force_after_n: c.prediction_after.blocked_force[i],
            })
            .collect(),
    }
}

/// The readable summary.
pub fn table(doc: &CalibrateDoc) -> String {
    let mut s = String::new();
    let _ = writeln!(s, "calibration of actuator \"{}\" (scene \"{}\")", doc.actuator, doc.scene);
    let _ = writeln!(s, "  modulus scale  {:.4} ± {:.4}", doc.modulus_scale, doc.modulus_scale_error);
    match doc.floor_error_mm {
        Some(e) => {
            let _ = writeln!(
                s,
                "  floor          {:.3} ± {:.3} mm (was {:.3} mm)",
                doc.floor_mm, e, doc.floor_before_mm
            );
        }
        None => {
            let _ = writeln!(s, "  floor          {:.3} mm (not fitted)", doc.floor_mm);
        }
    }
    let force =
        |r: &ResidualDoc| r.force_rms_n.map(|f| format!(", blocked force {f:.4} N")).unwrap_or_default();
    let (b, a) = (&doc.residual_before, &doc.residual_after);
    let _ = writeln!(s, "  rms residual   before: bend {:.2}°{}", b.bend_rms_deg, force(b));
    let _ = writeln!(s, "                 after:  bend {:.2}°{}", a.bend_rms_deg, force(a));
    let _ = writeln!(
        s,
        "  {} after {} iterations\n",
        if doc.converged { "converged" } else { "NOT converged" },
        doc.iterations
    );
    let _ = writeln!(
        s,
        "{:>9} {:>10} {:>10} {:>10} {:>10} {:>10} {:>10}",
        "p (kPa)", "bend (°)", "before", "after", "F (N)", "before", "after"
    );
    let o = |v: Option<f64>| v.map_or_else(|| "-".to_string(), |x| format!("{x:.3}"));
    for p in &doc.points {
        let _ = writeln!(
            s,
            "{:>9.2} {:>10.1} {:>10.1} {:>10.1} {:>10} {:>10} {:>10}",
            p.pressure_kpa,
            p.bend_deg,
            p.bend_before_deg,
            p.bend_after_deg,
            o(p.blocked_force_n),
            o(p.force_before_n),
            o(p.force_after_n)
        );
    }
    match &doc.calibrated_scene {
        Some(path) => {
            let _ = writeln!(s, "\nwrote the calibrated scene to {path} (material \"{}\")", doc.material);
        }
        None => s.push_str("\nno scene written\n"),
    }
    s
}

/// A material name not yet used in the scene.
fn fresh_name(doc: &SceneDoc, base: &str) -> String {
    let taken = |n: &str| doc.materials.get(n).is_some() || grasp_core::material::library_entry(n).is_some();
    let first = format!("{base}-calibrated");
    if !taken(&first) {
        return first;
    }
    (2..).map(|k| format!("{base}-calibrated-{k}")).find(|n| !taken(n)).unwrap_or(first)
}

/// The calibrated scene as RON text: `doc` with a new material block for `actuator`
/// and its fitted floor.
///
/// # Errors
/// Serialisation failures (not expected for a parsed scene).
pub fn calibrated_scene_text(
    doc: &SceneDoc,
    actuator: &str,
    c: &Calibration,
    origin: &str,
    data_file: &str,
) -> Result<(String, String), AppError> {
    let mut doc = doc.clone();
    let Some(entry) = doc.actuators.0.iter().position(|(n, _)| n == actuator) else {
        return Err(AppError::input(format!("no actuator \"{actuator}\" in {origin}")));
    };
    let old = doc.actuators.0[entry].1.material.clone();
    let name = fresh_name(&doc, &old);
    let m = &c.actuator.material;
    doc.materials.0.push((
        name.clone(),
        MaterialDoc {
            model: model_doc(&m.model),
            density_g_cm3: m.density / 1e3,
            elongation_at_break: m.stretch_at_break - 1.0,
        },
    ));
    let a = &mut doc.actuators.0[entry].1;
    a.material = name.clone();
    match &mut a.section {
        SectionDoc::Box { floor_mm, .. } | SectionDoc::HalfRound { floor_mm, .. } => {
            *floor_mm = c.floor * 1e3
        }
    }
    doc.name = format!("{}-calibrated", doc.name);
    let body = ron::ser::to_string_pretty(&doc, ron::ser::PrettyConfig::new().indentor("    ".to_string()))
        .map_err(|e| AppError::input(format!("writing the calibrated scene: {e}")))?;
    let mut text = String::new();
    let _ = writeln!(
        text,
        "// Calibrated by `arcfinger calibrate` from {} and the measurements in {}:",
        origin.replace('\n', " "),
        data_file.replace('\n', " ")
    );
    let _ = writeln!(
        text,
        "// actuator \"{actuator}\" now uses material \"{name}\" (\"{old}\" with every stress parameter times {:.4}){}.",
        c.modulus_scale,
        if c.floor_error.is_some() { format!(" and a {:.3} mm floor", c.floor * 1e3) } else { String::new() }
    );
    let _ = writeln!(text, "// Everything else is as in the input; its comments are not carried over.");
    text.push_str("Scene");
    text.push_str(&body);
    text.push('\n');
    Ok((text, name))
}

/// Where the calibrated scene goes by default: `STEM-calibrated.ron` next to the input.
pub fn default_output(scene: &Path) -> PathBuf {
    let stem = scene.file_stem().map_or_else(|| "scene".into(), |s| s.to_string_lossy().into_owned());
    crate::scene_file::scene_dir(scene).join(format!("{stem}-calibrated.ron"))
}

/// Runs `calibrate`.
pub fn run(args: CalibrateArgs) -> Result<Outcome, AppError> {
    let origin = args.scene.display().to_string();
    let text = crate::scene_file::read_source(&args.scene)?;
    let scene_doc = crate::scene_file::parse_doc(&origin, &text)?;
    let scene = crate::scene_file::load(&args.scene)?;
    let actuator = match args.actuator.as_deref() {
        Some(name) => actuator_named(&scene, name, &origin)?,
        None if scene.actuators.len() == 1 => &scene.actuators[0],
        None => {
            return Err(AppError::input(format!(
                "--actuator: {origin} defines {} actuators; name the one the prototype is of",
                scene.actuators.len()
            )));
        }
    };
    let data_file = args.measured.display().to_string();
    let bytes = std::fs::read(&args.measured).map_err(|e| AppError::io(format!("reading {data_file}"), e))?;
    let rows = parse_measurements(&data_file, &bytes)?;
    let rated = actuator.max_pressure / 1e3;
    if let Some((line, m)) = rows.iter().find(|(_, m)| m.pressure > actuator.max_pressure * (1.0 + 1e-12)) {
        return Err(AppError::input(format!(
            "{data_file}:{line}: column `pressure_kpa`: {} kPa is above the rated maximum of actuator \"{}\" ({rated} kPa)",
            m.pressure / 1e3,
            actuator.name
        )));
    }
    let data: Vec<Measurement> = rows.iter().map(|(_, m)| *m).collect();
    let out = args.out.clone().unwrap_or_else(|| default_output(&args.scene));
    let inputs = crate::commands::check::input_files(&args.scene, &scene);
    let mut inputs: Vec<&Path> = inputs.iter().map(PathBuf::as_path).collect();
    inputs.push(&args.measured);
    refuse_overwrite(&out, &inputs)?;
    let json = args.json.as_deref().map(Sink::parse);
    if let Some(Sink::File(p)) = &json {
        refuse_overwrite(p, &inputs)?;
        if *p == out {
            return Err(AppError::input(format!("--json {}: the calibrated scene goes there", p.display())));
        }
    }
    let settings = CalibrationSettings { fit_floor: args.fit_floor, ..CalibrationSettings::default() };
    let c = calibrate(actuator, &data, &settings)
        .map_err(|e| AppError::input(format!("{data_file}: actuator \"{}\": {e}", actuator.name)))?;
    let (scene_text, material) = calibrated_scene_text(&scene_doc, &actuator.name, &c, &origin, &data_file)?;
    let written = if c.converged {
        write_atomic(&out, scene_text.as_bytes())?;
        Some(out.as_path())
    } else {
        None
    };
    let doc = document(&scene.name, actuator, &data, &c, &material, written);
    let summary = table(&doc);
    match &json {
        Some(sink) => {
            let mut t = serde_json::to_string_pretty(&doc).map_err(AppError::input)?;
            t.push('\n');
            sink.write(t.as_bytes())?;
            if *sink == Sink::Stdout {
                eprint!("{summary}");
            } else {
                Sink::Stdout.write(summary.as_bytes())?;
            }
        }
        None => Sink::Stdout.write(summary.as_bytes())?,
    }
    if !c.converged {
        return Err(AppError::NotConverged(format!(
            "the calibration of actuator \"{}\" stopped after {} iterations; no scene written",
            actuator.name, c.iterations
        )));
    }
    Ok(Outcome::Pass)
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn measurements_parse_with_optional_forces_and_clear_errors() {
        let rows = parse_measurements(
            "m.csv",
            b"# bench, 2 June\nbend_deg, pressure_kpa, blocked_force_n\n10.5, 5, 0.05\n20, 10,\n",
        )
        .unwrap();
        assert_eq!(rows.len(), 2);
        assert_eq!(rows[0].0, 3);
        assert!((rows[0].1.pressure - 5e3).abs() < 1e-9);
        assert!((rows[0].1.bend_angle - 10.5f64.to_radians()).abs() < 1e-15);
        assert_eq!(rows[0].1.blocked_force, Some(0.05));
        assert_eq!(rows[1].1.blocked_force, None);
        for (text, needle) in [
            ("", "the file is empty"),
            ("pressure_kpa,bend\n1,2\n", "m.csv:1: unknown column `bend`"),
            ("pressure_kpa\n1\n", "expected the columns"),
            ("pressure_kpa,bend_deg\n0,2\n", "m.csv:2: column `pressure_kpa`: expected a pressure > 0"),
            ("pressure_kpa,bend_deg\n5,x\n", "m.csv:2: column `bend_deg`: expected a number"),
            ("pressure_kpa,bend_deg\n5\n", "m.csv:2: expected 2 fields"),
            ("pressure_kpa,bend_deg\n", "no data rows"),
        ] {
            let e = parse_measurements("m.csv", text.as_bytes()).unwrap_err().to_string();
            assert!(e.contains(needle), "{text:?}: {e}");
        }
    }

    #[test]
    fn default_output_sits_next_to_the_input() {
        assert_eq!(default_output(Path::new("a/b/s.ron")), PathBuf::from("a/b/s-calibrated.ron"));
        assert_eq!(default_output(Path::new("s.ron")), PathBuf::from("./s-calibrated.ron"));
    }
}

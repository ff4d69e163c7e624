//! `arcfinger bend`: the free-bending curve, blocked tip force and wall stretch of one
//! actuator over a range of pressures.
//!
//! For each pressure: the free curvature of the moment balance (DESIGN 3.2), the bend
//! angle and tip position of the constant-curvature finger, the largest wall stretch, and
//! the blocked tip force from the rod solve (DESIGN 3.3), each rod solve warm-started
//! from the previous pressure's. The curve is weightless, as the published model is.
//!
//! Exit codes: 0 when every pressure solved inside the model's range and below the
//! stretch at break; 1 when some pressure is out of the model's range or stretches the
//! wall to its elongation at break; 3 when a rod solve did not converge. A finger that
//! bends so far that its held tip would slip past the holder (the limit point of the
//! blocked-force branch) is a result, not a failure: those pressures have no blocked
//! force and say why.

use std::fmt::Write as _;

use grasp_core::actuator::{Actuator, BendError, FreeBending};
use grasp_core::rod::{BlockedOutcome, Rod, blocked_force_curve};
use grasp_core::scene::Scene;
use grasp_core::section::SectionModel;
use serde::Serialize;

use grasp_core::fab::wrap::wrap_check;

use crate::cli::{BendArgs, SectionModelArg};
use crate::commands::fab::{WrapDoc, wrap_warning};
use crate::error::{AppError, Outcome};
use crate::output::{Sink, refuse_overwrite};
use crate::suggest::actuator_named;

/// Fewest rod elements along the chamber (DESIGN 3.3).
pub const MIN_ELEMENTS: usize = 40;
/// Most rod elements accepted (solve cost grows with the cube).
pub const MAX_ELEMENTS: usize = 400;
/// Most pressures in one run.
pub const MAX_PRESSURES: usize = 10_000;

/// The validated configuration of one `bend` run.
#[derive(Debug)]
struct Config {
    actuator: Actuator,
    pressures_kpa: Vec<f64>,
    model: SectionModel,
    elements: usize,
    json: Option<Sink>,
    plot: Option<std::path::PathBuf>,
    /// The scene's safety factor, the margin the wrap-pitch check asks for.
    safety_factor: f64,
}

/// Parses `A:B:STEP` (kPa) into the list of pressures, `B` included when on the grid.
///
/// # Errors
/// A message saying what was expected.
pub fn parse_pressures(text: &str) -> Result<Vec<f64>, String> {
    let parts: Vec<&str> = text.split(':').collect();
    let [a, b, step] = parts.as_slice() else {
        return Err(format!("--pressures: expected FROM:TO:STEP in kPa (e.g. 0:60:5), got \"{text}\""));
    };
    let num = |s: &str, what: &str| -> Result<f64, String> {
        match s.trim().parse::<f64>() {
            Ok(v) if v.is_finite() => Ok(v),
            _ => Err(format!("--pressures: {what} must be a finite number of kPa, got \"{s}\"")),
        }
    };
    let (a, b, step) = (num(a, "FROM")?, num(b, "TO")?, num(step, "STEP")?);
    if a < 0.0 {
        return Err(format!("--pressures: FROM must be >= 0 kPa, got {a}"));
    }
    if b < a {
        return Err(format!("--pressures: TO must be >= FROM, got {a}:{b}"));
    }
    if !(step > 0.0) {
        return Err(format!("--pressures: STEP must be > 0 kPa, got {step}"));
    }
    let n = ((b - a) / step + 1e-9).floor();
    if n + 1.0 > MAX_PRESSURES as f64 {
        return Err(format!(
            "--pressures: {a}:{b}:{step} gives {} pressures, more than the limit of {MAX_PRESSURES}",
            n + 1.0
        ));
    }
    Ok((0..=n as usize).map(|i| a + step * i as f64).collect())
}

impl Config {
    fn new(args: BendArgs, scene: Scene) -> Result<Self, AppError> {
        let origin = args.scene.display().to_string();
        let names: Vec<&str> = scene.actuators.iter().map(|a| a.name.as_str()).collect();
        let actuator = match &args.actuator {
            Some(name) => actuator_named(&scene, name, &origin)?.clone(),
            None if scene.actuators.len() == 1 => scene.actuators[0].clone(),
            None => {
                return Err(AppError::input(format!(
                    "--actuator: {origin} defines {} actuators; name one of: {}",
                    names.len(),
                    names.join(", ")
                )));
            }
        };
        let rated_kpa = actuator.max_pressure / 1e3;
        let pressures_kpa = match &args.pressures {
            Some(text) => parse_pressures(text).map_err(AppError::Input)?,
            None => {
                parse_pressures(&format!("0:{rated_kpa}:{}", rated_kpa / 20.0)).map_err(AppError::Input)?
            }
        };
        if let Some(top) = pressures_kpa.iter().copied().find(|&p| p > rated_kpa * (1.0 + 1e-12)) {
            return Err(AppError::input(format!(
                "--pressures: {top} kPa is above the rated maximum of actuator \"{}\" ({rated_kpa} kPa); \
                 the model is not a licence to over-pressurise a finger",
                actuator.name
            )));
        }
        if !(MIN_ELEMENTS..=MAX_ELEMENTS).contains(&args.elements) {
            return Err(AppError::input(format!(
                "--elements: must be between {MIN_ELEMENTS} and {MAX_ELEMENTS}, got {}",
                args.elements
            )));
        }
        let json = args.json.as_deref().map(Sink::parse);
        let inputs = [args.scene.as_path()];
        if let Some(Sink::File(p)) = &json {
            refuse_overwrite(p, &inputs)?;
        }
        if let Some(p) = &args.plot {
            refuse_overwrite(p, &inputs)?;
        }
        let model = match args.section_model {
            Some(SectionModelArg::Baseline) => SectionModel::Baseline,
            Some(SectionModelArg::WallPressure) => SectionModel::WallPressure,
            None => actuator.section_model,
        };
        Ok(Self {
            actuator,
            pressures_kpa,
            model,
            elements: args.elements,
            json,
            plot: args.plot,
            safety_factor: scene.criteria.safety_factor,
        })
    }
}

/// One pressure's result.
#[derive(Debug, Clone, Serialize)]
pub struct BendPoint {
    /// Pressure (kPa).
    pub pressure_kpa: f64,
    /// Free chamber curvature (1/mm).
    pub curvature_per_mm: Option<f64>,
    /// Bend angle of the tip (deg).
    pub bend_deg: Option<f64>,
    /// Tip in finger-plane coordinates `[u, w]` (mm).
    pub tip_mm: Option<[f64; 2]>,
    /// Blocked tip force (N).
    pub blocked_force_n: Option<f64>,
    /// Largest axial stretch in the wall (the top surface).
    pub max_stretch: Option<f64>,
    /// `(max_stretch - 1) / (stretch_at_break - 1)`: 1 = at the elongation at break.
    pub break_utilisation: Option<f64>,
    /// `"ok"`, `"over-break"` (stretch at or beyond break), `"out-of-range"` (no balance
    /// inside the model's range), `"beyond-limit"` (free bending fine, but the held
    /// branch of the blocked-force test has ended: no blocked force exists) or
    /// `"not-converged"` (the blocked-force solve failed).
    pub status: &'static str,
    /// Why, when the status is not `"ok"`.
    #[serde(skip_serializing_if = "Option::is_none")]
    pub note: Option<String>,
    /// Newton iterations of the blocked-force rod solve.
    #[serde(skip_serializing_if = "Option::is_none")]
    pub rod_iterations: Option<usize>,
}

/// The JSON document of DESIGN 4.3 (`bend`), with a few extra keys.
#[derive(Debug, Serialize)]
pub struct BendDoc {
    /// `"arcfinger/bend/1"`.
    pub format: &'static str,
    /// Actuator name.
    pub actuator: String,
    /// `"wall-pressure"` or `"baseline"`.
    pub model: &'static str,
    /// Rated maximum pressure (kPa).
    pub max_pressure_kpa: f64,
    /// Rod elements along the chamber.
    pub rod_elements: usize,
    /// Where the held branch of the blocked-force test ends, if it does within the range.
    pub blocked_limit: Option<BlockedLimit>,
    /// The wrap-pitch check against the scene's safety factor (see `arcfinger fab`).
    #[serde(skip_serializing_if = "Option::is_none")]
    pub wrap: Option<WrapDoc>,
    /// One entry per pressure.
    pub points: Vec<BendPoint>,
}

/// The limit point of the held branch.
#[derive(Debug, Clone, Copy, Serialize)]
pub struct BlockedLimit {
    /// Highest pressure with a held state (kPa).
    pub pressure_kpa: f64,
    /// The blocked force there (N).
    pub force_n: f64,
}

/// Computes the curve (no I/O).
pub fn compute(
    actuator: &Actuator,
    pressures_kpa: &[f64],
    model: SectionModel,
    elements: usize,
) -> Result<BendDoc, AppError> {
    let named = |e: &dyn std::fmt::Display| AppError::input(format!("actuator \"{}\": {e}", actuator.name));
    let rod = Rod::of_actuator(actuator, elements).map_err(|e| named(&e))?;
    let mut points = Vec::with_capacity(pressures_kpa.len());
    let mut free_states: Vec<(usize, FreeBending)> = Vec::new();
    for (i, &p_kpa) in pressures_kpa.iter().enumerate() {
        let mut point = BendPoint {
            pressure_kpa: p_kpa,
            curvature_per_mm: None,
            bend_deg: None,
            tip_mm: None,
            blocked_force_n: None,
            max_stretch: None,
            break_utilisation: None,
            status: "ok",
            note: None,
            rod_iterations: None,
        };
        match actuator.free_bending_with(p_kpa * 1e3, model) {
            Ok(free) => {
                point.curvature_per_mm = Some(free.curvature / 1e3);
                point.bend_deg = Some(free.bend_angle.to_degrees());
                point.tip_mm = Some([free.tip.x * 1e3, free.tip.y * 1e3]);
                point.max_stretch = Some(free.max_stretch);
                point.break_utilisation = Some(free.break_utilisation);
                if free.break_utilisation >= 1.0 {
                    point.status = "over-break";
                    point.note =
                        Some(format!("wall stretch {:.3} reaches the stretch at break", free.max_stretch));
                }
                free_states.push((i, free));
            }
            Err(e @ (BendError::OutOfRange { .. } | BendError::Unbounded { .. })) => {
                point.status = "out-of-range";
                point.note = Some(e.to_string());
            }
            Err(e) => {
                return Err(AppError::NotConverged(format!(
                    "actuator \"{}\" at {p_kpa} kPa: {e}",
                    actuator.name
                )));
            }
        }
        points.push(point);
    }
    let solved: Vec<f64> = free_states.iter().map(|(_, f)| f.pressure).collect();
    let curve = blocked_force_curve(&rod, &actuator.law(0.0, model), &solved).map_err(|e| named(&e))?;
    let mut limit = None;
    for ((i, _), outcome) in free_states.iter().zip(curve) {
        let point = &mut points[*i];
        match outcome {
            BlockedOutcome::Held { force, report } => {
                point.blocked_force_n = Some(force);
                point.rod_iterations = Some(report.iterations);
            }
            BlockedOutcome::BeyondLimit { limit_pressure, limit_force } => {
                limit = Some(BlockedLimit { pressure_kpa: limit_pressure / 1e3, force_n: limit_force });
                if point.status == "ok" {
                    point.status = "beyond-limit";
                    point.note = Some(format!(
                        "the held tip slips past the holder above {:.2} kPa (largest held force {:.3} N)",
                        limit_pressure / 1e3,
                        limit_force
                    ));
                }
            }
            BlockedOutcome::NotConverged(report) => {
                point.status = "not-converged";
                point.rod_iterations = Some(report.iterations);
                point.note = Some(format!(
                    "blocked-force solve {} after {} iterations (residual {:.1e})",
                    report.status.name(),
                    report.iterations,
                    report.residual
                ));
            }
        }
    }
    Ok(BendDoc {
        format: "arcfinger/bend/1",
        actuator: actuator.name.clone(),
        model: model.name(),
        max_pressure_kpa: actuator.max_pressure / 1e3,
        rod_elements: elements,
        blocked_limit: limit,
        wrap: None,
        points,
    })
}

fn opt(v: Option<f64>, prec: usize) -> String {
    v.map_or_else(|| "-".to_string(), |x| format!("{x:.prec$}"))
}

/// The readable table.
pub fn table(doc: &BendDoc, actuator: &Actuator) -> String {
    let mut s = String::new();
    let _ = writeln!(
        s,
        "actuator \"{}\" ({}, {} section, {} moment balance), rated {} kPa",
        doc.actuator,
        actuator.material_name,
        actuator.section.kind(),
        doc.model,
        doc.max_pressure_kpa
    );
    let _ = writeln!(
        s,
        "{:>9} {:>11} {:>9} {:>9} {:>9} {:>10} {:>9} {:>7}  status",
        "p (kPa)", "k (1/mm)", "bend (°)", "u (mm)", "w (mm)", "F_blk (N)", "stretch", "break"
    );
    for p in &doc.points {
        let (u, w) = p.tip_mm.map_or((None, None), |t| (Some(t[0]), Some(t[1])));
        let _ = writeln!(
            s,
            "{:>9.2} {:>11} {:>9} {:>9} {:>9} {:>10} {:>9} {:>6}%  {}{}",
            p.pressure_kpa,
            opt(p.curvature_per_mm, 5),
            opt(p.bend_deg, 1),
            opt(u, 2),
            opt(w, 2),
            opt(p.blocked_force_n, 3),
            opt(p.max_stretch, 3),
            opt(p.break_utilisation.map(|b| b * 100.0), 0),
            p.status,
            p.note.as_ref().map(|n| format!(": {n}")).unwrap_or_default()
        );
    }
    if let Some(w) = &doc.wrap {
        let _ = match (w.bulge_pressure_kpa, w.margin) {
            (Some(p), Some(m)) => writeln!(
                s,
                "\nwrap pitch: the wall between fiber turns starts to bulge near {p:.0} kPa, {m:.2} x rated \
                 (required {:.2}; largest safe pitch {:.2} mm){}",
                w.required_margin,
                w.max_safe_pitch_mm,
                if w.ok { "" } else { ": WIND TIGHTER" }
            ),
            _ => writeln!(s, "\nwrap pitch: the fiber turns touch, no free wall between them"),
        };
    }
    s.push_str(
        "\nbreak = wall strain as a share of the elongation at break. Free bending is weightless; the\n\
         blocked force holds the tip on the unbent axis. Estimates for design, not a rating: never\n\
         exceed the rated pressure, and use a regulator, a relief valve and eye protection.\n",
    );
    s
}

/// Runs `bend`.
pub fn run(args: BendArgs) -> Result<Outcome, AppError> {
    let meshes = crate::scene_file::MeshAccess::from_flag(args.allow_outside_meshes);
    let scene = crate::scene_file::load_with(&args.scene, meshes)?;
    let cfg = Config::new(args, scene)?;
    let mut doc = compute(&cfg.actuator, &cfg.pressures_kpa, cfg.model, cfg.elements)?;
    let wrap = wrap_check(&cfg.actuator, cfg.safety_factor);
    if let Some(warning) = wrap_warning(&cfg.actuator.name, &wrap) {
        eprintln!("arcfinger: warning: {warning}");
    }
    doc.wrap = Some(WrapDoc::of(&wrap));
    if let Some(plot) = &cfg.plot {
        let svg = crate::plot::bend_svg(&doc)
            .map_err(|e| AppError::input(format!("drawing {}: {e}", plot.display())))?;
        crate::output::write_atomic(plot, svg.as_bytes())?;
    }
    match &cfg.json {
        Some(sink) => {
            let mut text = serde_json::to_string_pretty(&doc).map_err(AppError::input)?;
            text.push('\n');
            sink.write(text.as_bytes())?;
            if *sink != Sink::Stdout {
                Sink::Stdout.write(table(&doc, &cfg.actuator).as_bytes())?;
            }
        }
        None => Sink::Stdout.write(table(&doc, &cfg.actuator).as_bytes())?,
    }
    if doc.points.iter().any(|p| p.status == "not-converged") {
        return Err(AppError::NotConverged(format!(
            "the blocked-force solve of actuator \"{}\" did not converge at some pressures (status \"not-converged\" above)",
            doc.actuator
        )));
    }
    Ok(if doc.points.iter().all(|p| matches!(p.status, "ok" | "beyond-limit")) {
        Outcome::Pass
    } else {
        Outcome::Fail
    })
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn pressure_ranges_parse_and_include_their_end() {
        assert_eq!(parse_pressures("0:60:20").unwrap(), vec![0.0, 20.0, 40.0, 60.0]);
        assert_eq!(parse_pressures("5:5:1").unwrap(), vec![5.0]);
        assert_eq!(parse_pressures("0:10:3").unwrap(), vec![0.0, 3.0, 6.0, 9.0]);
        assert_eq!(parse_pressures("0:0.3:0.1").unwrap().len(), 4);
    }

    #[test]
    fn bad_pressure_ranges_say_what_is_expected() {
        for (text, needle) in [
            ("0:60", "FROM:TO:STEP"),
            ("a:60:5", "FROM must be a finite"),
            ("0:60:0", "STEP must be > 0"),
            ("0:60:-1", "STEP must be > 0"),
            ("60:0:5", "TO must be >= FROM"),
            ("-5:10:5", "FROM must be >= 0"),
            ("0:NaN:5", "TO must be a finite"),
            ("0:1e9:1", "more than the limit"),
        ] {
            let e = parse_pressures(text).unwrap_err();
            assert!(e.contains(needle), "{text}: {e}");
        }
    }
}

#[cfg(test)]
mod curve_tests {
    use super::*;

    /// The curve is consistent with the core's free bending at every point, bends
    /// monotonically, and the blocked force grows with pressure from zero.
    #[test]
    fn curve_matches_core_free_bending_and_grows() {
        let a = Actuator::example();
        let pressures = parse_pressures("0:50:5").unwrap();
        let doc = compute(&a, &pressures, SectionModel::WallPressure, 48).unwrap();
        assert_eq!(doc.points.len(), 11);
        assert!(doc.blocked_limit.is_none());
        assert_eq!(doc.points[0].blocked_force_n, Some(0.0));
        let mut last = (-1.0, -1.0);
        for p in &doc.points {
            assert_eq!(p.status, "ok", "{p:?}");
            let free = a.free_bending(p.pressure_kpa * 1e3).unwrap();
            assert_eq!(p.bend_deg, Some(free.bend_angle.to_degrees()));
            let (b, f) = (p.bend_deg.unwrap(), p.blocked_force_n.unwrap());
            assert!(b >= last.0 && f >= last.1, "{p:?}");
            last = (b, f);
        }
        let text = table(&doc, &a);
        assert!(text.contains("f100") && text.lines().count() > 13);
    }
}

#[cfg(test)]
mod limit_tests {
    use super::*;

    /// Past the held branch's limit point (about 54 kPa for this actuator, see the core's
    /// blocked-curve test) the points say so and carry no force; the run still passes.
    #[test]
    fn pressures_past_the_limit_point_are_reported_as_such() {
        let doc = compute(
            &Actuator::example(),
            &parse_pressures("40:60:5").unwrap(),
            SectionModel::WallPressure,
            48,
        )
        .unwrap();
        let lim = doc.blocked_limit.expect("a limit point in 40..60 kPa");
        assert!(lim.pressure_kpa > 50.0 && lim.pressure_kpa < 55.0);
        for p in &doc.points {
            if p.pressure_kpa > lim.pressure_kpa {
                assert_eq!(p.status, "beyond-limit");
                assert!(p.blocked_force_n.is_none() && p.bend_deg.is_some());
            } else {
                assert_eq!(p.status, "ok");
                assert!(p.blocked_force_n.unwrap() < lim.force_n);
            }
        }
    }
}

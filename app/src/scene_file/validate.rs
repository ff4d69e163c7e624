//! Validation of a parsed scene with field paths, and conversion to SI.
//!
//! Every rule is checked and every failure collected, so a scene with five mistakes
//! gets five lines, each `PATH: must be ..., got ...` with the path written as in the
//! file (`actuators."f100".section.top_wall_mm`, `objects[2].mass_g`). Values in messages
//! are in the file's units. Once nothing is wrong, the scene is converted once: mm → m,
//! kPa → Pa, g → kg, degrees → radians, g/cm³ → kg/m³ (DESIGN 2), through the core's
//! validating constructors.
//!
//! Bounds beyond the physical ones (a length of more than [`MAX_LENGTH_MM`], a mass of
//! more than [`MAX_MASS_G`], ...) are sanity limits: a value past them is almost
//! certainly a unit slip (metres typed into a `_mm` field), not a design.

use std::fmt;
use std::path::Path;

use grasp_core::actuator::{Actuator, ActuatorError, Fiber};
use grasp_core::material::{
    HyperelasticModel, Material, MaterialError, MooneyRivlin, NeoHookean, Ogden, OgdenTerm, Yeoh, library,
    library_entry,
};
use grasp_core::math::Vec3;
use grasp_core::scene::{
    Criteria, FingerMount, Gripper, ObjectShape, Palm, PressureSweep, Scene, TargetObject,
};
use grasp_core::section::{BoxSection, HalfRoundSection, SectionError, SectionModel, SectionProfile};

use super::mesh::{MeshSource, load_mesh_from};
use crate::scene_doc::{
    ActuatorDoc, CriteriaDoc, MaterialDoc, MaterialModelDoc, ObjectDoc, PalmDoc, SceneDoc, SectionDoc,
    SectionModelDoc, ShapeDoc,
};
use crate::suggest::nearest;

/// Longest length, radius, thickness or coordinate a scene may give (mm): 10 m.
pub const MAX_LENGTH_MM: f64 = 10_000.0;
/// Heaviest object (g): 100 kg.
pub const MAX_MASS_G: f64 = 100_000.0;
/// Highest rated pressure (kPa): 10 MPa, far above what a cast elastomer survives.
pub const MAX_PRESSURE_KPA: f64 = 10_000.0;
/// Densest material (g/cm³): denser than any solid element.
pub const MAX_DENSITY_G_CM3: f64 = 25.0;
/// Largest elongation at break (strain): 10 000 %.
pub const MAX_ELONGATION: f64 = 100.0;
/// Most pressures in a sweep.
pub const MAX_SWEEP_STEPS: f64 = 10_000.0;
/// Smallest stretch at which a material must be stable in planar tension: the
/// under-layer and floor are compressed when the finger bends.
pub const STABLE_FROM_STRETCH: f64 = 0.5;
/// Most fingers on one gripper: each finger is a contact solve per object and pressure.
pub const MAX_FINGERS: usize = 16;
/// Most objects in one scene: each is checked at every sweep pressure.
pub const MAX_OBJECTS: usize = 100;
/// Most actuator designs in one scene.
pub const MAX_ACTUATORS: usize = 64;
/// Most material blocks in one scene.
pub const MAX_MATERIALS: usize = 64;
/// Most terms of an Ogden model (fits offer three; six is generous).
pub const MAX_OGDEN_TERMS: usize = 6;
/// Largest material constant (kPa): 1 GPa, a thousand times the stiffest casting rubber.
pub const MAX_MODULUS_KPA: f64 = 1e6;
/// Largest Ogden exponent in magnitude: powers of a stretch beyond it overflow long
/// before a rubber breaks.
pub const MAX_OGDEN_ALPHA: f64 = 50.0;
/// Largest friction coefficient: a value above it is a percentage or a typo.
pub const MAX_FRICTION: f64 = 10.0;
/// Largest acceleration of a load case (m/s²): 100 g.
pub const MAX_ACCEL_M_S2: f64 = 1000.0;
/// Largest contact force limit (N): 1 MN.
pub const MAX_FORCE_N: f64 = 1e6;
/// Largest mount azimuth in magnitude (degrees): two turns.
pub const MAX_AZIMUTH_DEG: f64 = 720.0;
/// Longest name (characters): names appear in tables, reports and messages.
pub const MAX_NAME_CHARS: usize = 200;

/// One thing wrong with a scene: where, and what.
#[derive(Debug, Clone, PartialEq, Eq)]
pub struct Problem {
    /// Field path as written in the file, e.g. `objects[2].mass_g`.
    pub path: String,
    /// What is expected and what was found.
    pub message: String,
}

impl fmt::Display for Problem {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        if self.path.is_empty() {
            f.write_str(&self.message)
        } else {
            write!(f, "{}: {}", self.path, self.message)
        }
    }
}

/// Checks `doc` and converts it to the SI scene; mesh paths are relative to `scene_dir`.
///
/// # Errors
/// Every problem found, in file order.
pub fn build_scene(doc: &SceneDoc, scene_dir: &Path) -> Result<Scene, Vec<Problem>> {
    build_scene_from(doc, MeshSource::Folder(scene_dir))
}

/// Checks `doc` and converts it to the SI scene, reading meshes from `meshes`.
///
/// # Errors
/// Every problem found, in file order.
pub fn build_scene_from(doc: &SceneDoc, meshes: MeshSource<'_>) -> Result<Scene, Vec<Problem>> {
    let mut c = Checker { problems: Vec::new() };
    if doc.name.trim().is_empty() {
        c.push("name", "must not be empty");
    } else {
        c.name_text("name", &doc.name);
    }
    c.count("materials", doc.materials.iter().count(), MAX_MATERIALS, "material blocks");
    c.count("actuators", doc.actuators.iter().count(), MAX_ACTUATORS, "actuators");
    c.count("gripper.fingers", doc.gripper.fingers.len(), MAX_FINGERS, "fingers");
    c.count("objects", doc.objects.len(), MAX_OBJECTS, "objects");

    let mut materials: Vec<(String, Option<Material>)> = Vec::new();
    for (name, m) in doc.materials.iter() {
        let path = format!("materials.\"{}\"", shown(name));
        c.name_text(&path, name);
        let m = c.material(&path, m);
        materials.push((name.to_string(), m));
    }

    let mut actuators = Vec::new();
    for (name, a) in doc.actuators.iter() {
        c.name_text(&format!("actuators.\"{}\"", shown(name)), name);
        actuators.push(c.actuator(name, a, &materials));
    }

    let gripper = c.gripper(doc);
    let objects = c.objects(&doc.objects, meshes);
    let criteria = c.criteria(doc);

    if !c.problems.is_empty() {
        return Err(c.problems);
    }
    // No problem was recorded, so every part above was built.
    let (Some(gripper), Some(objects), Some(criteria)) = (gripper, objects, criteria) else {
        return Err(vec![Problem { path: String::new(), message: "the scene could not be built".into() }]);
    };
    Ok(Scene {
        name: doc.name.clone(),
        materials: materials.into_iter().filter_map(|(n, m)| Some((n, m?))).collect(),
        actuators: actuators.into_iter().flatten().collect(),
        gripper,
        objects,
        criteria,
    })
}

struct Checker {
    problems: Vec<Problem>,
}

/// A name as it may be shown in a message: control and bidirectional-override
/// characters written as escapes, so a name cannot move the cursor, clear the terminal
/// or reorder the line it is shown in.
pub fn shown(name: &str) -> String {
    let mut out = String::with_capacity(name.len());
    for c in name.chars() {
        if is_hostile(c) {
            out.extend(c.escape_unicode());
        } else {
            out.push(c);
        }
    }
    out
}

/// Characters a name may not hold: control characters and the bidirectional overrides
/// and isolates (which make text read differently from how it is stored).
fn is_hostile(c: char) -> bool {
    c.is_control() || matches!(c, '\u{202a}'..='\u{202e}' | '\u{2066}'..='\u{2069}')
}

/// `"a", "b"` as a list for messages.
fn quoted_list<'a>(names: impl IntoIterator<Item = &'a str>) -> String {
    names.into_iter().map(shown).collect::<Vec<_>>().join(", ")
}

impl Checker {
    fn push(&mut self, path: impl Into<String>, message: impl Into<String>) {
        self.problems.push(Problem { path: path.into(), message: message.into() });
    }

    /// At most `max` entries in a list or map.
    fn count(&mut self, path: &str, n: usize, max: usize, what: &str) {
        if n > max {
            self.push(path, format!("must have at most {max} {what}, got {n}"));
        }
    }

    /// A name: no control or bidirectional-override characters, at most
    /// [`MAX_NAME_CHARS`] characters.
    fn name_text(&mut self, path: &str, name: &str) {
        if let Some((i, c)) = name.chars().enumerate().find(|(_, c)| is_hostile(*c)) {
            self.push(
                path,
                format!(
                    "a name must not contain control or text-direction characters, found {} at character {}",
                    c.escape_unicode(),
                    i + 1
                ),
            );
        }
        let n = name.chars().count();
        if n > MAX_NAME_CHARS {
            self.push(path, format!("a name must have at most {MAX_NAME_CHARS} characters, got {n}"));
        }
    }

    fn finite(&mut self, path: &str, v: f64) -> Option<f64> {
        if v.is_finite() {
            Some(v)
        } else {
            self.push(path, format!("must be a finite number, got {v}"));
            None
        }
    }

    fn positive(&mut self, path: &str, v: f64) -> Option<f64> {
        let v = self.finite(path, v)?;
        if v > 0.0 {
            Some(v)
        } else {
            self.push(path, format!("must be > 0, got {v}"));
            None
        }
    }

    fn non_negative(&mut self, path: &str, v: f64) -> Option<f64> {
        let v = self.finite(path, v)?;
        if v >= 0.0 {
            Some(v)
        } else {
            self.push(path, format!("must be >= 0, got {v}"));
            None
        }
    }

    fn at_most(&mut self, path: &str, v: f64, max: f64, unit: &str, why: &str) -> Option<f64> {
        if v <= max {
            Some(v)
        } else {
            self.push(path, format!("must be at most {max}{unit} ({why}), got {v}"));
            None
        }
    }

    /// A length in mm, `> 0` (or `>= 0` with `allow_zero`) and at most 10 m; in m.
    fn length(&mut self, path: &str, mm: f64, allow_zero: bool) -> Option<f64> {
        let v = if allow_zero { self.non_negative(path, mm)? } else { self.positive(path, mm)? };
        self.at_most(path, v, MAX_LENGTH_MM, " mm", "10 m; is it in mm?")?;
        Some(v * 1e-3)
    }

    /// A coordinate in mm, finite and within 10 m of the origin; in m.
    fn coordinate(&mut self, path: &str, mm: f64) -> Option<f64> {
        let v = self.finite(path, mm)?;
        if v.abs() <= MAX_LENGTH_MM {
            Some(v * 1e-3)
        } else {
            self.push(
                path,
                format!("must be within {MAX_LENGTH_MM} mm of the palm (10 m; is it in mm?), got {v}"),
            );
            None
        }
    }

    fn triple(
        &mut self,
        path: &str,
        t: (f64, f64, f64),
        f: fn(&mut Self, &str, f64) -> Option<f64>,
    ) -> Option<Vec3> {
        let x = f(self, &format!("{path}.x"), t.0);
        let y = f(self, &format!("{path}.y"), t.1);
        let z = f(self, &format!("{path}.z"), t.2);
        Some(Vec3::new(x?, y?, z?))
    }

    // ---- materials ------------------------------------------------------------------

    fn material(&mut self, path: &str, m: &MaterialDoc) -> Option<Material> {
        let model = self.model(&format!("{path}.model"), &m.model);
        let density = self.positive(&format!("{path}.density_g_cm3"), m.density_g_cm3).and_then(|d| {
            self.at_most(
                &format!("{path}.density_g_cm3"),
                d,
                MAX_DENSITY_G_CM3,
                " g/cm³",
                "denser than any solid",
            )
        });
        let elongation =
            self.positive(&format!("{path}.elongation_at_break"), m.elongation_at_break).and_then(|e| {
                self.at_most(
                    &format!("{path}.elongation_at_break"),
                    e,
                    MAX_ELONGATION,
                    "",
                    "a strain: 9.0 means 900 %",
                )
            });
        let (model, density, elongation) = (model?, density?, elongation?);
        let stretch_at_break = 1.0 + elongation;
        if let Err(e) = model.check_planar_stability(STABLE_FROM_STRETCH, stretch_at_break) {
            self.push(
                format!("{path}.model"),
                format!(
                    "{e} (a material must be stable in planar tension from stretch {STABLE_FROM_STRETCH} to its \
                     stretch at break, {stretch_at_break})"
                ),
            );
            return None;
        }
        Some(Material { model, density: density * 1e3, stretch_at_break })
    }

    fn model(&mut self, path: &str, m: &MaterialModelDoc) -> Option<HyperelasticModel> {
        let kpa = |c: &mut Self, name: &str, v: f64| {
            let field = format!("{path}.{name}");
            let v = c.finite(&field, v)?;
            if v.abs() > MAX_MODULUS_KPA {
                c.push(
                    field,
                    format!(
                        "must be at most {MAX_MODULUS_KPA} kPa in magnitude (1 GPa; is it in Pa?), got {v}"
                    ),
                );
                return None;
            }
            Some(v * 1e3)
        };
        match m {
            MaterialModelDoc::NeoHookean { mu_kpa } => {
                let mu = kpa(self, "mu_kpa", *mu_kpa)?;
                match NeoHookean::new(mu) {
                    Ok(m) => Some(HyperelasticModel::NeoHookean(m)),
                    Err(_) => {
                        self.push(format!("{path}.mu_kpa"), format!("must be > 0, got {mu_kpa}"));
                        None
                    }
                }
            }
            MaterialModelDoc::MooneyRivlin { c10_kpa, c01_kpa } => {
                let c10 = kpa(self, "c10_kpa", *c10_kpa);
                let c01 = kpa(self, "c01_kpa", *c01_kpa);
                match MooneyRivlin::new(c10?, c01?) {
                    Ok(m) => Some(HyperelasticModel::MooneyRivlin(m)),
                    Err(e) => {
                        let msg = match e {
                            MaterialError::NonPositiveModulus { .. } => format!(
                                "c10_kpa + c01_kpa must be > 0 (the shear modulus is twice the sum), got {}",
                                c10_kpa + c01_kpa
                            ),
                            other => other.to_string(),
                        };
                        self.push(path, msg);
                        None
                    }
                }
            }
            MaterialModelDoc::Yeoh { c10_kpa, c20_kpa, c30_kpa } => {
                let c10 = kpa(self, "c10_kpa", *c10_kpa);
                let c20 = kpa(self, "c20_kpa", *c20_kpa);
                let c30 = kpa(self, "c30_kpa", *c30_kpa);
                match Yeoh::new(c10?, c20?, c30?) {
                    Ok(m) => Some(HyperelasticModel::Yeoh(m)),
                    Err(e) => {
                        match e {
                            MaterialError::NonPositiveModulus { .. } => self.push(
                                format!("{path}.c10_kpa"),
                                format!("must be > 0 (the shear modulus is 2 c10), got {c10_kpa}"),
                            ),
                            other => self.push(path, other.to_string()),
                        }
                        None
                    }
                }
            }
            MaterialModelDoc::Ogden { terms } => {
                if terms.is_empty() {
                    self.push(format!("{path}.terms"), "must have at least one term, got none");
                    return None;
                }
                if terms.len() > MAX_OGDEN_TERMS {
                    self.push(
                        format!("{path}.terms"),
                        format!("must have at most {MAX_OGDEN_TERMS} terms, got {}", terms.len()),
                    );
                    return None;
                }
                let mut ok = true;
                let mut core_terms = Vec::new();
                for (i, t) in terms.iter().enumerate() {
                    let tp = format!("{path}.terms[{i}]");
                    let mu = kpa(self, &format!("terms[{i}].mu_kpa"), t.mu_kpa);
                    let mut alpha = self.finite(&format!("{tp}.alpha"), t.alpha);
                    if alpha == Some(0.0) {
                        self.push(format!("{tp}.alpha"), "must be non-zero, got 0");
                        ok = false;
                    } else if let Some(a) = alpha
                        && a.abs() > MAX_OGDEN_ALPHA
                    {
                        self.push(
                            format!("{tp}.alpha"),
                            format!("must be at most {MAX_OGDEN_ALPHA} in magnitude, got {a}"),
                        );
                        alpha = None;
                    }
                    match (mu, alpha) {
                        (Some(mu), Some(alpha)) => core_terms.push(OgdenTerm { mu, alpha }),
                        _ => ok = false,
                    }
                }
                if !ok {
                    return None;
                }
                match Ogden::new(core_terms) {
                    Ok(m) => Some(HyperelasticModel::Ogden(m)),
                    Err(e) => {
                        let msg = match e {
                            MaterialError::NonPositiveModulus { shear_modulus_pa } => format!(
                                "the small-strain shear modulus 1/2 sum(mu_kpa * alpha) must be > 0, got {} kPa",
                                shear_modulus_pa / 1e3
                            ),
                            other => other.to_string(),
                        };
                        self.push(path, msg);
                        None
                    }
                }
            }
        }
    }

    /// The material an actuator names: a scene material first (scene names shadow
    /// built-in ones), then a built-in class. `None` when unknown (reported here) or
    /// when the scene's material had problems of its own (reported with it).
    fn resolve_material(
        &mut self,
        path: &str,
        name: &str,
        materials: &[(String, Option<Material>)],
    ) -> Option<Material> {
        if let Some((_, m)) = materials.iter().find(|(n, _)| n == name) {
            return m.clone();
        }
        if let Some(e) = library_entry(name) {
            return Some(e.material);
        }
        let lib = library();
        let scene_names = materials.iter().map(|(n, _)| n.as_str());
        let all: Vec<&str> = scene_names.clone().chain(lib.iter().map(|e| e.name)).collect();
        let mut msg = format!("unknown material \"{}\"", shown(name));
        if let Some(s) = nearest(name, all.iter().copied()) {
            msg.push_str(&format!("; did you mean \"{}\"?", shown(s)));
        }
        let defined = quoted_list(scene_names);
        if defined.is_empty() {
            msg.push_str(" (the scene defines no materials; ");
        } else {
            msg.push_str(&format!(" (defined: {defined}; "));
        }
        msg.push_str("or a built-in class such as \"");
        msg.push_str(lib.first().map_or("", |e| e.name));
        msg.push_str("\", listed by `arcfinger materials`)");
        self.push(path, msg);
        None
    }

    // ---- actuators ------------------------------------------------------------------

    fn actuator(
        &mut self,
        name: &str,
        a: &ActuatorDoc,
        materials: &[(String, Option<Material>)],
    ) -> Option<Actuator> {
        let path = format!("actuators.\"{}\"", shown(name));
        let p = |f: &str| format!("{path}.{f}");
        let material = self.resolve_material(&p("material"), &a.material, materials);
        let chamber = self.length(&p("chamber_length_mm"), a.chamber_length_mm, false);
        let base = self.length(&p("base_length_mm"), a.base_length_mm, true);
        let tip = self.length(&p("tip_length_mm"), a.tip_length_mm, true);
        let section = self.section(&p("section"), &a.section);
        let pitch = self.length(&p("fiber.pitch_mm"), a.fiber.pitch_mm, false);
        let width = self.length(&p("fiber.width_mm"), a.fiber.width_mm, false);
        if let (Some(pitch), Some(width)) = (pitch, width)
            && pitch < width
        {
            self.push(
                p("fiber.pitch_mm"),
                format!(
                    "must be >= fiber.width_mm ({}), or neighbouring turns overlap; got {}",
                    a.fiber.width_mm, a.fiber.pitch_mm
                ),
            );
        }
        let max_pressure = self.positive(&p("max_pressure_kpa"), a.max_pressure_kpa).and_then(|v| {
            self.at_most(
                &p("max_pressure_kpa"),
                v,
                MAX_PRESSURE_KPA,
                " kPa",
                "far above what a cast elastomer survives",
            )
        });
        let model = match a.section_model {
            SectionModelDoc::Baseline => SectionModel::Baseline,
            SectionModelDoc::WallPressure => SectionModel::WallPressure,
        };
        let fiber = Fiber { pitch: pitch?, width: width? };
        if fiber.pitch < fiber.width {
            return None;
        }
        let built = Actuator::new(
            name,
            a.material.clone(),
            material?,
            section?,
            chamber?,
            base?,
            tip?,
            fiber,
            max_pressure? * 1e3,
            model,
        );
        match built {
            Ok(act) => Some(act),
            Err(e) => {
                let (field, msg) = match &e {
                    ActuatorError::BadMaxPressure { .. } => ("max_pressure_kpa".to_string(), e.to_string()),
                    ActuatorError::BadLength { field, expected, value } => {
                        (format!("{field}_mm"), format!("must be {expected}, got {} mm", value * 1e3))
                    }
                    _ => (String::new(), e.to_string()),
                };
                self.push(if field.is_empty() { path } else { p(&field) }, msg);
                None
            }
        }
    }

    fn section(&mut self, path: &str, s: &SectionDoc) -> Option<SectionProfile> {
        let p = |f: &str| format!("{path}.{f}");
        let built = match *s {
            SectionDoc::Box {
                chamber_width_mm,
                chamber_height_mm,
                side_wall_mm,
                top_wall_mm,
                floor_mm,
                under_layer_mm,
            } => {
                let w = self.length(&p("chamber_width_mm"), chamber_width_mm, false);
                let h = self.length(&p("chamber_height_mm"), chamber_height_mm, false);
                let ts = self.length(&p("side_wall_mm"), side_wall_mm, false);
                let tt = self.length(&p("top_wall_mm"), top_wall_mm, false);
                let tf = self.length(&p("floor_mm"), floor_mm, false);
                let tu = self.length(&p("under_layer_mm"), under_layer_mm, true);
                BoxSection::new(w?, h?, ts?, tt?, tf?, tu?).map(SectionProfile::Box)
            }
            SectionDoc::HalfRound { radius_mm, wall_mm, floor_mm, under_layer_mm } => {
                let r = self.length(&p("radius_mm"), radius_mm, false);
                let t = self.length(&p("wall_mm"), wall_mm, false);
                let tf = self.length(&p("floor_mm"), floor_mm, false);
                let tu = self.length(&p("under_layer_mm"), under_layer_mm, true);
                HalfRoundSection::new(r?, t?, tf?, tu?).map(SectionProfile::HalfRound)
            }
        };
        match built {
            Ok(s) => Some(s),
            Err(e) => {
                match &e {
                    SectionError::BadDimension { field, expected, value } => self
                        .push(p(&format!("{field}_mm")), format!("must be {expected}, got {}", value * 1e3)),
                    _ => self.push(path, e.to_string()),
                }
                None
            }
        }
    }

    // ---- gripper --------------------------------------------------------------------

    fn gripper(&mut self, doc: &SceneDoc) -> Option<Gripper> {
        let palm = match doc.gripper.palm {
            PalmDoc::Disk { radius_mm, thickness_mm } => {
                let r = self.length("gripper.palm.radius_mm", radius_mm, false);
                let t = self.length("gripper.palm.thickness_mm", thickness_mm, false);
                // not `?`: the fingers are checked even when the palm is wrong
                match (r, t) {
                    (Some(radius), Some(thickness)) => Some(Palm::Disk { radius, thickness }),
                    _ => None,
                }
            }
        };
        if doc.gripper.fingers.is_empty() {
            self.push("gripper.fingers", "must list at least one finger, got none");
        }
        let names: Vec<&str> = doc.actuators.keys().collect();
        let mut fingers = Vec::new();
        for (i, f) in doc.gripper.fingers.iter().enumerate() {
            let p = |field: &str| format!("gripper.fingers[{i}].{field}");
            let actuator = match names.iter().position(|n| *n == f.actuator) {
                Some(k) => Some(k),
                None => {
                    let mut msg = format!("unknown actuator \"{}\"", shown(&f.actuator));
                    if let Some(s) = nearest(&f.actuator, names.iter().copied()) {
                        msg.push_str(&format!("; did you mean \"{}\"?", shown(s)));
                    }
                    if names.is_empty() {
                        msg.push_str(" (the scene defines no actuators)");
                    } else {
                        msg.push_str(&format!(" (defined: {})", quoted_list(names.iter().copied())));
                    }
                    self.push(p("actuator"), msg);
                    None
                }
            };
            let azimuth = self.finite(&p("azimuth_deg"), f.azimuth_deg).and_then(|a| {
                if a.abs() <= MAX_AZIMUTH_DEG {
                    Some(a)
                } else {
                    self.push(
                        p("azimuth_deg"),
                        format!("must be within {MAX_AZIMUTH_DEG} degrees of 0 (two turns), got {a}"),
                    );
                    None
                }
            });
            let radius = self.length(&p("radius_mm"), f.radius_mm, true);
            let tilt = self.finite(&p("tilt_deg"), f.tilt_deg).and_then(|t| {
                if t > -90.0 && t < 90.0 {
                    Some(t)
                } else {
                    self.push(p("tilt_deg"), format!("must be between -90 and 90 (both excluded), got {t}"));
                    None
                }
            });
            if let (Some(actuator), Some(a), Some(r), Some(t)) = (actuator, azimuth, radius, tilt) {
                fingers.push(FingerMount {
                    actuator,
                    azimuth: a.to_radians(),
                    radius: r,
                    tilt: t.to_radians(),
                });
            }
        }
        Some(Gripper { palm: palm?, fingers })
    }

    // ---- objects --------------------------------------------------------------------

    fn objects(&mut self, objects: &[ObjectDoc], meshes: MeshSource<'_>) -> Option<Vec<TargetObject>> {
        if objects.is_empty() {
            self.push("objects", "must list at least one object, got none");
        }
        let mut out = Vec::new();
        let mut all_ok = true;
        for (i, o) in objects.iter().enumerate() {
            let p = |f: &str| format!("objects[{i}].{f}");
            if o.name.trim().is_empty() {
                self.push(p("name"), "must not be empty");
            } else if o.name.chars().any(is_hostile) || o.name.chars().count() > MAX_NAME_CHARS {
                self.name_text(&p("name"), &o.name);
            } else if let Some(first) = objects[..i].iter().position(|e| e.name == o.name) {
                self.push(
                    p("name"),
                    format!("duplicate name \"{}\": objects[{first}] already uses it", shown(&o.name)),
                );
            }
            let shape = self.shape(&p("shape"), &o.shape, meshes);
            let mass = self
                .positive(&p("mass_g"), o.mass_g)
                .and_then(|m| self.at_most(&p("mass_g"), m, MAX_MASS_G, " g", "100 kg; is it in g?"));
            let friction = self.non_negative(&p("friction"), o.friction).and_then(|f| {
                self.at_most(&p("friction"), f, MAX_FRICTION, "", "a coefficient, not a percentage")
            });
            let position = self.triple(&p("position_mm"), o.position_mm, Self::coordinate);
            let max_force = match o.max_contact_force_n {
                Some(f) => self
                    .positive(&p("max_contact_force_n"), f)
                    .and_then(|f| self.at_most(&p("max_contact_force_n"), f, MAX_FORCE_N, " N", "1 MN"))
                    .map(Some),
                None => Some(None),
            };
            match (shape, mass, friction, position, max_force) {
                (Some(shape), Some(mass), Some(friction), Some(position), Some(max_contact_force)) => out
                    .push(TargetObject {
                        name: o.name.clone(),
                        shape,
                        mass: mass * 1e-3,
                        friction,
                        position,
                        max_contact_force,
                    }),
                _ => all_ok = false,
            }
        }
        all_ok.then_some(out)
    }

    fn shape(&mut self, path: &str, s: &ShapeDoc, meshes: MeshSource<'_>) -> Option<ObjectShape> {
        let p = |f: &str| format!("{path}.{f}");
        let positive_len = |c: &mut Self, path: &str, v: f64| c.length(path, v, false);
        match s {
            ShapeDoc::Sphere { radius_mm } => {
                Some(ObjectShape::Sphere { radius: self.length(&p("radius_mm"), *radius_mm, false)? })
            }
            ShapeDoc::Box { size_mm } => {
                Some(ObjectShape::Box { size: self.triple(&p("size_mm"), *size_mm, positive_len)? })
            }
            ShapeDoc::Cylinder { radius_mm, height_mm } => {
                let r = self.length(&p("radius_mm"), *radius_mm, false);
                let h = self.length(&p("height_mm"), *height_mm, false);
                Some(ObjectShape::Cylinder { radius: r?, height: h? })
            }
            ShapeDoc::Capsule { radius_mm, length_mm } => {
                let r = self.length(&p("radius_mm"), *radius_mm, false);
                let l = self.length(&p("length_mm"), *length_mm, false);
                Some(ObjectShape::Capsule { radius: r?, length: l? })
            }
            ShapeDoc::Ellipsoid { semi_axes_mm } => Some(ObjectShape::Ellipsoid {
                semi_axes: self.triple(&p("semi_axes_mm"), *semi_axes_mm, positive_len)?,
            }),
            ShapeDoc::Mesh { path: file, scale } => {
                let scale = self.positive(&p("scale"), *scale)?;
                match load_mesh_from(meshes, file, scale) {
                    Ok(mesh) => Some(ObjectShape::Mesh { mesh, source: file.clone() }),
                    Err(e) => {
                        self.push(p("path"), e);
                        None
                    }
                }
            }
        }
    }

    // ---- criteria -------------------------------------------------------------------

    fn criteria(&mut self, doc: &SceneDoc) -> Option<Criteria> {
        let c: &CriteriaDoc = &doc.criteria;
        // The most restrictive rating among the actuators the fingers use.
        let mut limit: Option<(f64, &str, usize)> = None;
        for (i, f) in doc.gripper.fingers.iter().enumerate() {
            if let Some(a) = doc.actuators.get(&f.actuator) {
                let r = a.max_pressure_kpa;
                if r.is_finite() && r > 0.0 && limit.is_none_or(|(l, _, _)| r < l) {
                    limit = Some((r, f.actuator.as_str(), i));
                }
            }
        }
        let over_rating = |ch: &mut Self, path: &str, v: f64| {
            if let Some((rating, name, finger)) = limit
                && v > rating
            {
                ch.push(
                    path,
                    format!(
                        "must not exceed {rating} kPa, the max_pressure_kpa of actuator \"{name}\" \
                         (used by gripper.fingers[{finger}]), got {v}"
                    ),
                );
                return None;
            }
            Some(v)
        };
        let pressure = self
            .non_negative("criteria.pressure_kpa", c.pressure_kpa)
            .and_then(|v| over_rating(self, "criteria.pressure_kpa", v));
        let sweep = match c.sweep_kpa {
            None => Some(None),
            Some((from, to, step)) => {
                let from = self.non_negative("criteria.sweep_kpa.from", from);
                let step = self.positive("criteria.sweep_kpa.step", step);
                let to = self.finite("criteria.sweep_kpa.to", to).and_then(|to| match from {
                    Some(f) if to < f => {
                        self.push("criteria.sweep_kpa.to", format!("must be >= from ({f}), got {to}"));
                        None
                    }
                    _ => over_rating(self, "criteria.sweep_kpa.to", to),
                });
                match (from, to, step) {
                    (Some(from), Some(to), Some(step)) => {
                        let steps = ((to - from) / step).floor();
                        if steps > MAX_SWEEP_STEPS {
                            self.push(
                                "criteria.sweep_kpa",
                                format!(
                                    "must have at most {MAX_SWEEP_STEPS} steps, got {steps} (from {from} to {to} \
                                     in steps of {step}); use a larger step"
                                ),
                            );
                            None
                        } else {
                            Some(Some(PressureSweep { from: from * 1e3, to: to * 1e3, step: step * 1e3 }))
                        }
                    }
                    _ => None,
                }
            }
        };
        let safety_factor = self.finite("criteria.safety_factor", c.safety_factor).and_then(|v| {
            if v >= 1.0 {
                Some(v)
            } else {
                self.push(
                    "criteria.safety_factor",
                    format!("must be >= 1 (a margin below 1 cannot hold), got {v}"),
                );
                None
            }
        });
        let accel = |ch: &mut Self, path: &str, v: f64| {
            ch.non_negative(path, v).and_then(|v| ch.at_most(path, v, MAX_ACCEL_M_S2, " m/s²", "100 g"))
        };
        let lift = accel(self, "criteria.lift_accel_m_s2", c.lift_accel_m_s2);
        let lateral = accel(self, "criteria.lateral_accel_m_s2", c.lateral_accel_m_s2);
        let n_fingers = doc.gripper.fingers.len();
        let min_fingers = c.min_fingers_in_contact as usize;
        let min_fingers = if min_fingers >= 1 && min_fingers <= n_fingers {
            Some(min_fingers)
        } else if n_fingers == 0 {
            // already reported at gripper.fingers; no range to give
            None
        } else {
            self.push(
                "criteria.min_fingers_in_contact",
                format!("must be between 1 and {n_fingers} (the number of fingers), got {min_fingers}"),
            );
            None
        };
        let min_enclosure = self.finite("criteria.min_enclosure", c.min_enclosure).and_then(|v| {
            if (0.0..=1.0).contains(&v) {
                Some(v)
            } else {
                self.push("criteria.min_enclosure", format!("must be between 0 and 1 (a fraction), got {v}"));
                None
            }
        });
        Some(Criteria {
            pressure: pressure? * 1e3,
            sweep: sweep?,
            safety_factor: safety_factor?,
            lift_accel: lift?,
            lateral_accel: lateral?,
            min_fingers_in_contact: min_fingers?,
            min_enclosure: min_enclosure?,
        })
    }
}

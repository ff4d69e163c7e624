//! Tests of the whole loader: one table of bad scenes per stage, each asserting that
//! the message names the place (line:column or field path) and what was expected, plus
//! the demo scenes, the conversions to SI and a parse → write → parse round trip.

use std::path::{Path, PathBuf};

use approx::assert_relative_eq;
use grasp_core::scene::ObjectShape;

use super::*;
use crate::scene_doc::SceneDoc;

const EXAMPLE: &str = include_str!("../../../tests/data/design-example.ron");
const FILE: &str = "scenes/bad.ron";

fn repo(rel: &str) -> PathBuf {
    Path::new(env!("CARGO_MANIFEST_DIR")).join("..").join(rel)
}

/// The example with the first occurrence of `from` replaced by `to` (which must exist).
fn edit(from: &str, to: &str) -> String {
    assert!(EXAMPLE.contains(from), "the example has no `{from}`");
    EXAMPLE.replacen(from, to, 1)
}

/// `FILE:LINE:COL` of the first occurrence of `needle` in `text`.
fn position_of(text: &str, needle: &str) -> String {
    let at = text.find(needle).unwrap_or_else(|| panic!("no `{needle}` in the edited text"));
    let before = &text[..at];
    let line = before.matches('\n').count() + 1;
    let col = before.rsplit('\n').next().unwrap_or("").chars().count() + 1;
    format!("{FILE}:{line}:{col}:")
}

fn parse_err(text: &str) -> String {
    match parse_doc(FILE, text) {
        Ok(_) => panic!("parsed, but should not have:\n{text}"),
        Err(e) => {
            assert_eq!(e.exit_code(), 2);
            e.to_string()
        }
    }
}

/// Parse errors: (what, from, to, where the message must point, phrases it must hold).
/// The position is that of the first occurrence of the needle in the edited text, which
/// is where RON reports the error.
#[test]
fn parse_errors_name_the_position_and_the_expectation() {
    let cases: &[(&str, &str, &str, &str, &[&str])] = &[
        (
            "syntax: a missing comma between list entries",
            "tilt_deg: 0.0),\n            (actuator: \"f100\", azimuth_deg: 120.0",
            "tilt_deg: 0.0)\n            (actuator: \"f100\", azimuth_deg: 120.0",
            "(actuator: \"f100\", azimuth_deg: 120.0",
            &["expected `,`", "in gripper.fingers"],
        ),
        (
            "wrong type: a string for a number",
            "mass_g: 60.0",
            "mass_g: \"60\"",
            "\"60\"",
            &["expected a number for objects[0].mass_g", "found the string \"60\""],
        ),
        (
            "wrong type: a negative count",
            "min_fingers_in_contact: 2",
            "min_fingers_in_contact: -2",
            "2,\n        min_enclosure",
            &["whole number", "criteria.min_fingers_in_contact"],
        ),
        (
            "wrong type: a bare number for an option",
            "max_contact_force_n: Some(8.0)",
            "max_contact_force_n: 8.0",
            "8.0, // None",
            &["expected `Some(...)` or `None` for objects[0].max_contact_force_n"],
        ),
        (
            "wrong type: a name where a number belongs, inside a tuple",
            "position_mm: (0.0, 0.0, -70.0)",
            "position_mm: (0.0, 0.0, deep)",
            "deep)",
            &["expected a number for objects[0].position_mm.z", "found `deep`"],
        ),
        (
            "unknown field, with the nearest valid name",
            "top_wall_mm: 3.0",
            "top_wal: 3.0",
            "top_wal",
            &[
                "unknown field `top_wal` in actuators.\"f100\".section (Box); did you mean `top_wall_mm`?",
                "fields of Box: chamber_width_mm",
                "^^^^^^^",
            ],
        ),
        (
            "unknown field in the wrong unit",
            "mass_g: 60.0",
            "mass_kg: 0.06",
            "mass_kg",
            &["unknown field `mass_kg` in objects[0]; did you mean `mass_g`?", "the unit is part"],
        ),
        (
            "unknown variant",
            "section: Box(",
            "section: Bax(",
            "Bax(",
            &[
                "unknown variant `Bax` for actuators.\"f100\".section; did you mean `Box`?",
                "one of: Box, HalfRound",
            ],
        ),
        (
            "unknown variant of the moment balance",
            "max_pressure_kpa: 60.0,",
            "max_pressure_kpa: 60.0, section_model: Wallpressure,",
            "Wallpressure",
            &["unknown variant `Wallpressure`", "did you mean `WallPressure`?"],
        ),
        (
            "missing field: named with its block",
            "floor_mm: 3.0, under_layer_mm: 1.0),",
            "under_layer_mm: 1.0),",
            "),\n            // or HalfRound",
            &["missing field `floor_mm` in actuators.\"f100\".section (Box)", "add `floor_mm: ...`"],
        ),
        (
            "missing field of a material",
            "            elongation_at_break: 9.0, // strain, 9.0 = 900 %\n",
            "",
            "),\n    },\n    actuators",
            &["missing field `elongation_at_break` in materials.\"soft-00-30\""],
        ),
        (
            "a tuple of the wrong length",
            "position_mm: (0.0, 0.0, -70.0)",
            "position_mm: (0.0, 0.0)",
            "),\n            max_contact",
            &["objects[0].position_mm needs 3 values (x, y, z), found 2"],
        ),
        (
            "duplicate map key (caught by the ordered map)",
            "\"soft-00-30\": (",
            "\"soft-00-30\": (model: NeoHookean(mu_kpa: 20.0), density_g_cm3: 1.0, elongation_at_break: 5.0),\n        \"soft-00-30\": (",
            "soft-00-30\": (\n",
            &["materials: duplicate name \"soft-00-30\""],
        ),
        (
            "duplicate field",
            "min_enclosure: 0.5,",
            "min_enclosure: 0.5, min_enclosure: 0.6,",
            "min_enclosure: 0.6",
            &["field `min_enclosure` appears twice in criteria"],
        ),
        (
            "wrong top-level name",
            "Scene(\n",
            "Scen(\n",
            "Scen(",
            &["expected `Scene(...)` here, found `Scen`"],
        ),
        (
            "a block without its variant name",
            "palm: Disk(radius_mm",
            "palm: (radius_mm",
            "(radius_mm: 35.0",
            &["expected a variant name such as `Disk(...)` for gripper.palm", "one of: Disk"],
        ),
        (
            "an unterminated string",
            "name: \"ball-50\",",
            "name: \"ball-50,",
            // the string runs on to the next quote, in a comment four lines down
            "meshes/part.stl",
            &["runs over a line end: is its closing quote missing?"],
        ),
    ];
    for (what, from, to, needle, phrases) in cases {
        let text = edit(from, to);
        let msg = parse_err(&text);
        let at = position_of(&text, needle);
        assert!(msg.starts_with(&at), "{what}: expected the message to start with {at}\n{msg}");
        for p in *phrases {
            assert!(msg.contains(p), "{what}: expected `{p}` in\n{msg}");
        }
        // the excerpt repeats the offending line under the headline
        let line_no: usize = at.split(':').nth(1).and_then(|l| l.parse().ok()).unwrap_or(0);
        let src = text.lines().nth(line_no - 1).unwrap_or("");
        assert!(
            msg.contains(&format!("{line_no:>6} | {src}")),
            "{what}: no excerpt of line {line_no}\n{msg}"
        );
    }
}

#[test]
fn truncated_and_trailing_text_are_reported() {
    let cut = &EXAMPLE[..EXAMPLE.find("shape: Sphere").unwrap()];
    let msg = parse_err(cut);
    assert!(msg.contains("unexpected end of file") && msg.contains("objects[0] is still open"), "{msg}");
    let msg = parse_err(&format!("{EXAMPLE}\nScene()"));
    assert!(msg.contains("unexpected text after the end of the scene"), "{msg}");
    assert!(msg.starts_with(&format!("{FILE}:{}:1:", EXAMPLE.lines().count() + 2)), "{msg}");
}

/// Builds the edited example and returns the problems, formatted as `load` prints them.
fn problems(text: &str, dir: &Path) -> Vec<String> {
    let doc = parse_doc(FILE, text).unwrap_or_else(|e| panic!("should parse: {e}"));
    match build_scene(&doc, dir) {
        Ok(_) => Vec::new(),
        Err(ps) => format_problems(FILE, &ps).lines().map(str::to_string).collect(),
    }
}

fn example_dir() -> PathBuf {
    repo("tests/data")
}

/// Validation errors: each edit of the valid example gives exactly the listed lines
/// (a line matches when it contains the phrase).
#[test]
fn validation_errors_name_the_field_path_and_the_expectation() {
    // (what, edits of the example as (from, to), the lines expected in order)
    type Case<'a> = (&'a str, &'a [(&'a str, &'a str)], &'a [&'a str]);
    let cases: &[Case] = &[
        (
            "negative wall",
            &[("top_wall_mm: 3.0", "top_wall_mm: -2.0")],
            &["actuators.\"f100\".section.top_wall_mm: must be > 0, got -2"],
        ),
        (
            "zero floor",
            &[("floor_mm: 3.0", "floor_mm: 0.0")],
            &["actuators.\"f100\".section.floor_mm: must be > 0, got 0"],
        ),
        (
            "negative under-layer (zero is allowed, see below)",
            &[("under_layer_mm: 1.0", "under_layer_mm: -1.0")],
            &["actuators.\"f100\".section.under_layer_mm: must be >= 0, got -1"],
        ),
        (
            "NaN length",
            &[("chamber_length_mm: 90.0", "chamber_length_mm: NaN")],
            &["actuators.\"f100\".chamber_length_mm: must be a finite number, got NaN"],
        ),
        (
            "absurd length (metres typed as mm)",
            &[("chamber_length_mm: 90.0", "chamber_length_mm: 90000.0")],
            &[
                "actuators.\"f100\".chamber_length_mm: must be at most 10000 mm (10 m; is it in mm?), got 90000",
            ],
        ),
        (
            "fiber pitch below its width",
            &[("pitch_mm: 4.0", "pitch_mm: 1.0")],
            &[
                "actuators.\"f100\".fiber.pitch_mm: must be >= fiber.width_mm (1.5), or neighbouring turns overlap; got 1",
            ],
        ),
        (
            "zero rated pressure",
            &[("max_pressure_kpa: 60.0", "max_pressure_kpa: 0.0")],
            &["actuators.\"f100\".max_pressure_kpa: must be > 0, got 0"],
        ),
        (
            "unknown actuator reference",
            &[("(actuator: \"f100\", azimuth_deg: 120.0", "(actuator: \"f10\", azimuth_deg: 120.0")],
            &[
                "gripper.fingers[1].actuator: unknown actuator \"f10\"; did you mean \"f100\"? (defined: f100)",
            ],
        ),
        (
            "unknown material reference",
            &[("material: \"soft-00-30\"", "material: \"soft-00-3\"")],
            &[
                "actuators.\"f100\".material: unknown material \"soft-00-3\"; did you mean \"soft-00-30\"? (defined: soft-00-30; or a built-in class",
            ],
        ),
        (
            "Yeoh with a non-positive c10",
            &[("c10_kpa: 12.0", "c10_kpa: -1.0")],
            &["materials.\"soft-00-30\".model.c10_kpa: must be > 0 (the shear modulus is 2 c10), got -1"],
        ),
        (
            "unstable material",
            &[("c20_kpa: 0.4", "c20_kpa: -3.0")],
            &["materials.\"soft-00-30\".model: planar-tension stress stops increasing at stretch"],
        ),
        (
            "Ogden with a zero exponent",
            &[(
                "Yeoh(c10_kpa: 12.0, c20_kpa: 0.4, c30_kpa: 0.0)",
                "Ogden(terms: [(mu_kpa: 24.0, alpha: 1.8), (mu_kpa: 0.4, alpha: 0.0)])",
            )],
            &["materials.\"soft-00-30\".model.terms[1].alpha: must be non-zero, got 0"],
        ),
        (
            "Ogden with no terms",
            &[("Yeoh(c10_kpa: 12.0, c20_kpa: 0.4, c30_kpa: 0.0)", "Ogden(terms: [])")],
            &["materials.\"soft-00-30\".model.terms: must have at least one term, got none"],
        ),
        (
            "zero density and elongation",
            &[
                ("density_g_cm3: 1.07", "density_g_cm3: 0.0"),
                ("elongation_at_break: 9.0", "elongation_at_break: 0.0"),
            ],
            &[
                "materials.\"soft-00-30\".density_g_cm3: must be > 0, got 0",
                "materials.\"soft-00-30\".elongation_at_break: must be > 0, got 0",
            ],
        ),
        (
            "tilt out of range, infinite azimuth",
            &[(
                "azimuth_deg: 0.0, radius_mm: 30.0, tilt_deg: 0.0",
                "azimuth_deg: inf, radius_mm: 30.0, tilt_deg: 90.0",
            )],
            &[
                "gripper.fingers[0].azimuth_deg: must be a finite number, got inf",
                "gripper.fingers[0].tilt_deg: must be between -90 and 90 (both excluded), got 90",
            ],
        ),
        (
            "negative mount radius, zero palm",
            &[
                ("radius_mm: 30.0, tilt_deg", "radius_mm: -30.0, tilt_deg"),
                ("thickness_mm: 10.0", "thickness_mm: 0.0"),
            ],
            &[
                "gripper.palm.thickness_mm: must be > 0, got 0",
                "gripper.fingers[0].radius_mm: must be >= 0, got -30",
            ],
        ),
        (
            "no fingers (then min_fingers_in_contact has no range to be checked against)",
            &[(
                "(actuator: \"f100\", azimuth_deg: 0.0, radius_mm: 30.0, tilt_deg: 0.0),\n            (actuator: \"f100\", azimuth_deg: 120.0, radius_mm: 30.0, tilt_deg: 0.0),\n            (actuator: \"f100\", azimuth_deg: 240.0, radius_mm: 30.0, tilt_deg: 0.0),",
                "",
            )],
            &["gripper.fingers: must list at least one finger, got none"],
        ),
        (
            "object values: zero mass, negative friction, zero force limit, NaN position",
            &[
                ("mass_g: 60.0", "mass_g: 0.0"),
                ("friction: 0.8", "friction: -0.1"),
                ("Some(8.0)", "Some(0.0)"),
                ("(0.0, 0.0, -70.0)", "(0.0, NaN, -70.0)"),
            ],
            &[
                "objects[0].mass_g: must be > 0, got 0",
                "objects[0].friction: must be >= 0, got -0.1",
                "objects[0].position_mm.y: must be a finite number, got NaN",
                "objects[0].max_contact_force_n: must be > 0, got 0",
            ],
        ),
        (
            "shape dimensions",
            &[("Sphere(radius_mm: 25.0)", "Box(size_mm: (40.0, -30.0, 20000.0))")],
            &[
                "objects[0].shape.size_mm.y: must be > 0, got -30",
                "objects[0].shape.size_mm.z: must be at most 10000 mm (10 m; is it in mm?), got 20000",
            ],
        ),
        (
            "pressure above the rating",
            &[("pressure_kpa: 35.0", "pressure_kpa: 75.0")],
            &[
                "criteria.pressure_kpa: must not exceed 60 kPa, the max_pressure_kpa of actuator \"f100\" (used by gripper.fingers[0]), got 75",
            ],
        ),
        (
            "sweep: negative start, zero step",
            &[("Some((0.0, 60.0, 2.5))", "Some((-5.0, 60.0, 0.0))")],
            &["criteria.sweep_kpa.from: must be >= 0, got -5", "criteria.sweep_kpa.step: must be > 0, got 0"],
        ),
        (
            "sweep: end before start",
            &[("Some((0.0, 60.0, 2.5))", "Some((30.0, 20.0, 2.5))")],
            &["criteria.sweep_kpa.to: must be >= from (30), got 20"],
        ),
        (
            "sweep: above the rating",
            &[("Some((0.0, 60.0, 2.5))", "Some((0.0, 70.0, 2.5))")],
            &["criteria.sweep_kpa.to: must not exceed 60 kPa, the max_pressure_kpa of actuator \"f100\""],
        ),
        (
            "sweep: too many steps",
            &[("Some((0.0, 60.0, 2.5))", "Some((0.0, 60.0, 0.001))")],
            &["criteria.sweep_kpa: must have at most 10000 steps, got 60000"],
        ),
        (
            "criteria ranges",
            &[
                ("safety_factor: 2.0", "safety_factor: 0.5"),
                ("lift_accel_m_s2: 5.0", "lift_accel_m_s2: -1.0"),
                ("min_fingers_in_contact: 2", "min_fingers_in_contact: 4"),
                ("min_enclosure: 0.5", "min_enclosure: 1.5"),
            ],
            &[
                "criteria.safety_factor: must be >= 1 (a margin below 1 cannot hold), got 0.5",
                "criteria.lift_accel_m_s2: must be >= 0, got -1",
                "criteria.min_fingers_in_contact: must be between 1 and 3 (the number of fingers), got 4",
                "criteria.min_enclosure: must be between 0 and 1 (a fraction), got 1.5",
            ],
        ),
        ("no objects", &[("objects: [\n        (", "objects: [],\n    unused: [\n        (")], &[]),
        ("empty scene name", &[("name: \"example\"", "name: \" \"")], &["name: must not be empty"]),
        (
            "mesh path leaving the folder",
            &[("Sphere(radius_mm: 25.0)", "Mesh(path: \"../secret.stl\", scale: 1.0)")],
            &["objects[0].shape.path: \"../secret.stl\": `..` is refused"],
        ),
        (
            "absolute mesh path",
            &[("Sphere(radius_mm: 25.0)", "Mesh(path: \"/etc/hosts.obj\")")],
            &["objects[0].shape.path: \"/etc/hosts.obj\": absolute paths are refused"],
        ),
        (
            "missing mesh file",
            &[("Sphere(radius_mm: 25.0)", "Mesh(path: \"meshes/none.obj\", scale: 1.0)")],
            &["objects[0].shape.path: \"meshes/none.obj\": cannot read"],
        ),
        (
            "mesh of unknown format",
            &[("Sphere(radius_mm: 25.0)", "Mesh(path: \"part.ply\", scale: 1.0)")],
            &[
                "objects[0].shape.path: \"part.ply\": unknown mesh format `.ply`: expected a .stl or .obj file",
            ],
        ),
        (
            "zero mesh scale (the file is then not read)",
            &[("Sphere(radius_mm: 25.0)", "Mesh(path: \"part.ply\", scale: 0.0)")],
            &["objects[0].shape.scale: must be > 0, got 0"],
        ),
    ];
    let dir = example_dir();
    for (what, edits, expected) in cases {
        let mut text = EXAMPLE.to_string();
        for (from, to) in *edits {
            assert!(text.contains(from), "{what}: no `{from}`");
            text = text.replacen(from, to, 1);
        }
        if *what == "no objects" {
            // `unused` is an unknown field: the parse must say so; then check the
            // empty list itself by removing the object block properly.
            assert!(parse_err(&text).contains("unknown field `unused`"));
            let start = EXAMPLE.find("objects: [").unwrap();
            let end = EXAMPLE.find("    criteria:").unwrap();
            text = format!("{}objects: [],\n{}", &EXAMPLE[..start], &EXAMPLE[end..]);
            let got = problems(&text, &dir);
            assert_eq!(got, vec![format!("{FILE}: objects: must list at least one object, got none")]);
            continue;
        }
        let got = problems(&text, &dir);
        assert_eq!(
            got.len(),
            expected.len(),
            "{what}: expected {} problems, got\n{}",
            expected.len(),
            got.join("\n")
        );
        for (line, phrase) in got.iter().zip(expected.iter()) {
            assert!(line.starts_with(&format!("{FILE}: ")), "{what}: no file prefix: {line}");
            assert!(line.contains(phrase), "{what}: expected `{phrase}` in\n{line}");
        }
    }
}

#[test]
fn duplicate_object_names_are_reported_with_the_first_use() {
    let start = EXAMPLE.find("        (\n            name: \"ball-50\"").unwrap();
    let end = EXAMPLE.find("    ],\n    criteria").unwrap();
    let object = &EXAMPLE[start..end];
    let text = format!("{}{object}{object}{object}{}", &EXAMPLE[..start], &EXAMPLE[end..]);
    let got = problems(&text, &example_dir());
    assert_eq!(
        got,
        vec![
            format!("{FILE}: objects[1].name: duplicate name \"ball-50\": objects[0] already uses it"),
            format!("{FILE}: objects[2].name: duplicate name \"ball-50\": objects[0] already uses it"),
        ]
    );
}

#[test]
fn zero_under_layer_and_builtin_material_names_are_valid() {
    let text = edit("under_layer_mm: 1.0", "under_layer_mm: 0.0");
    assert_eq!(problems(&text, &example_dir()), Vec::<String>::new());
    let text = edit("material: \"soft-00-30\"", "material: \"platinum silicone, Shore 20A\"");
    let doc = parse_doc(FILE, &text).unwrap();
    let scene = build_scene(&doc, &example_dir()).unwrap();
    let lib = grasp_core::material::library_entry("platinum silicone, Shore 20A").unwrap();
    assert_eq!(scene.actuators[0].material, lib.material);
    assert_eq!(scene.actuators[0].material_name, "platinum silicone, Shore 20A");
}

/// A scene's own material shadows a built-in class of the same name.
#[test]
fn scene_materials_shadow_builtin_classes() {
    let name = "platinum silicone, Shore 00-30";
    let text = edit("\"soft-00-30\": (", &format!("\"{name}\": (")).replacen(
        "material: \"soft-00-30\"",
        &format!("material: \"{name}\""),
        1,
    );
    let scene = build_scene(&parse_doc(FILE, &text).unwrap(), &example_dir()).unwrap();
    let builtin = grasp_core::material::library_entry(name).unwrap().material;
    assert_ne!(scene.actuators[0].material, builtin);
    assert_eq!(scene.actuators[0].material, scene.materials[0].1);
}

/// DESIGN 4.2's example converts to SI exactly once: mm → m, kPa → Pa, g → kg,
/// degrees → radians, g/cm³ → kg/m³.
#[test]
fn design_example_loads_and_converts_to_si() {
    let scene = load(&repo("tests/data/design-example.ron")).unwrap();
    assert_eq!(scene.name, "example");
    let a = &scene.actuators[0];
    assert_eq!(a.name, "f100");
    assert_relative_eq!(a.chamber_length, 0.090, max_relative = 1e-12);
    assert_relative_eq!(a.length(), 0.100, max_relative = 1e-12);
    assert_relative_eq!(a.max_pressure, 60e3, max_relative = 1e-12);
    assert_relative_eq!(a.fiber.pitch, 4e-3, max_relative = 1e-12);
    assert_relative_eq!(a.section.chamber_area(), 12e-3 * 10e-3, max_relative = 1e-12);
    assert_eq!(a.section.kind(), "Box");
    assert_eq!(a.section_model, grasp_core::section::SectionModel::WallPressure);
    assert_relative_eq!(a.material.density, 1070.0, max_relative = 1e-12);
    assert_relative_eq!(a.material.stretch_at_break, 10.0, max_relative = 1e-12);
    // Yeoh small-strain shear modulus 2 c10 = 24 kPa
    use grasp_core::material::StrainEnergy;
    assert_relative_eq!(a.material.model.shear_modulus(), 24e3, max_relative = 1e-12);
    let f = &scene.gripper.fingers;
    assert_eq!(f.len(), 3);
    assert_eq!(f[1].actuator, 0);
    assert_relative_eq!(f[1].azimuth, 2.0 * std::f64::consts::PI / 3.0, max_relative = 1e-12);
    assert_relative_eq!(f[1].radius, 0.030, max_relative = 1e-12);
    let o = &scene.objects[0];
    assert_relative_eq!(o.mass, 0.060, max_relative = 1e-12);
    assert_relative_eq!(o.position.z, -0.070, max_relative = 1e-12);
    assert_eq!(o.max_contact_force, Some(8.0));
    assert_eq!(o.shape, ObjectShape::Sphere { radius: 0.025 });
    let c = &scene.criteria;
    assert_relative_eq!(c.pressure, 35e3, max_relative = 1e-12);
    let s = c.sweep.unwrap();
    assert_eq!((s.from, s.to, s.step), (0.0, 60e3, 2.5e3));
    assert_eq!(c.min_fingers_in_contact, 2);
}

#[test]
fn demo_scenes_load_with_their_meshes() {
    let three = ["peach", "hen-egg", "bell-pepper", "plum", "honey-jar"];
    let four = [
        "peach",
        "hen-egg",
        "bell-pepper",
        "apple",
        "tomato",
        "lemon",
        "plum",
        "honey-jar",
        "cherry-tomato",
        "ripe-fig",
    ];
    let mix = [&three[..], &["apricot", "duck-egg", "lemon", "punnet", "cherry-tomato"]].concat();
    for (file, fingers, section, objects) in [
        ("scenes/packing-line-3f.ron", 3, "Box", &three[..]),
        ("scenes/packing-line-4f.ron", 4, "HalfRound", &four[..]),
        ("scenes/packing-line-mix10.ron", 3, "Box", &mix[..]),
    ] {
        let scene = load(&repo(file)).unwrap_or_else(|e| panic!("{file}: {e}"));
        assert_eq!(scene.gripper.fingers.len(), fingers, "{file}");
        assert_eq!(scene.actuators[0].section.kind(), section, "{file}");
        let names: Vec<&str> = scene.objects.iter().map(|o| o.name.as_str()).collect();
        assert_eq!(names, objects, "{file}");
        // the speed benchmark's scene: 4 fingers, at least 8 objects, 25 sweep pressures
        if fingers == 4 {
            let s = scene.criteria.sweep.unwrap();
            assert!(names.len() >= 8);
            assert_eq!(((s.to - s.from) / s.step).round() as usize + 1, 25, "{file}");
        }
        // every object below the palm and within reach of the unbent fingers
        let reach = scene.actuators[0].length();
        for o in &scene.objects {
            assert!(o.position.z < 0.0 && -o.position.z < reach, "{file}: {} at {}", o.name, o.position);
        }
        // Produce and eggs weigh about as much as water (0.7 to 1.2 g/cm³, from memory):
        // the demo's balls and ellipsoids are of a plausible mass for their size.
        for o in &scene.objects {
            let volume = match o.shape {
                ObjectShape::Sphere { radius } => 4.0 / 3.0 * std::f64::consts::PI * radius.powi(3),
                ObjectShape::Ellipsoid { semi_axes } => {
                    4.0 / 3.0 * std::f64::consts::PI * semi_axes.x * semi_axes.y * semi_axes.z
                }
                _ => continue,
            };
            let density = o.mass / volume / 1000.0; // g/cm³
            assert!((0.7..1.2).contains(&density), "{file}: {} at {density:.2} g/cm³", o.name);
        }
        // the rated pressure bounds the criteria
        let rated = scene.actuators[0].max_pressure;
        assert!(scene.criteria.pressure < rated && scene.criteria.sweep.unwrap().to <= rated);
        let ObjectShape::Mesh { mesh, source } = &scene.objects[2].shape else {
            panic!("{file}: the pepper is a mesh");
        };
        assert_eq!(source, "meshes/bell-pepper.obj");
        assert!(mesh.triangles.len() < 2000);
        // closed and consistently oriented: every directed edge once, its reverse once
        let mut edges = std::collections::HashMap::new();
        for t in &mesh.triangles {
            for k in 0..3 {
                *edges.entry((t[k], t[(k + 1) % 3])).or_insert(0) += 1;
            }
        }
        assert!(
            edges.iter().all(|(&(a, b), &n)| n == 1 && edges.get(&(b, a)) == Some(&1)),
            "{file}: open mesh"
        );
        // outward faces: positive enclosed volume (divergence theorem, sum of a . (b x c) / 6)
        let volume: f64 = mesh
            .triangles
            .iter()
            .map(|t| {
                let [a, b, c] = t.map(|i| mesh.vertices[i as usize]);
                a.dot(b.cross(c)) / 6.0
            })
            .sum();
        // a box of 80 mm is 512 cm³, a ball of 80 mm 268 cm³: the pepper lies between
        assert!((2.0e-4..4.0e-4).contains(&volume), "{file}: pepper volume {volume} m³");
        // about 80 mm across, in metres
        let (lo, hi) =
            mesh.vertices.iter().fold((f64::MAX, f64::MIN), |(lo, hi), v| (lo.min(v.x), hi.max(v.x)));
        assert!((0.07..0.09).contains(&(hi - lo)), "{file}: pepper width {} m", hi - lo);
    }
}

/// Parse → write with RON → parse gives the same document (STYLE 12), for every
/// scene the project ships.
#[test]
fn scene_documents_survive_a_round_trip() {
    for file in [
        "tests/data/design-example.ron",
        "scenes/packing-line-3f.ron",
        "scenes/packing-line-4f.ron",
        "scenes/packing-line-mix10.ron",
    ] {
        let text = std::fs::read_to_string(repo(file)).unwrap();
        let doc: SceneDoc = parse_doc(file, &text).unwrap();
        let written = ron::ser::to_string_pretty(&doc, ron::ser::PrettyConfig::default()).unwrap();
        let again = parse_doc("written", &written).unwrap_or_else(|e| panic!("{file}: {e}\n{written}"));
        assert_eq!(doc, again, "{file}");
        // and the written form builds the same scene
        let dir = repo(file).parent().unwrap().to_path_buf();
        assert_eq!(build_scene(&doc, &dir).unwrap(), build_scene(&again, &dir).unwrap(), "{file}");
    }
}

#[test]
fn unreadable_files_name_the_path() {
    let e = load(Path::new("/nonexistent-arcfinger/scene.ron")).unwrap_err();
    assert_eq!(e.exit_code(), 2);
    let msg = e.to_string();
    assert!(msg.contains("cannot read scene file /nonexistent-arcfinger/scene.ron"), "{msg}");
    let e = load(&repo("scenes")).unwrap_err();
    assert!(e.to_string().contains("is a folder, not a scene file"), "{e}");
}

#[test]
fn non_utf8_text_is_reported_with_its_position_and_a_bom_is_ignored() {
    let dir = std::env::temp_dir().join(format!("arcfinger-scene-utf8-{}", std::process::id()));
    std::fs::create_dir_all(&dir).unwrap();
    let bad = dir.join("latin1.ron");
    std::fs::write(&bad, b"Scene(\n  name: \"caf\xe9\",\n)").unwrap();
    let msg = load(&bad).unwrap_err().to_string();
    assert!(msg.contains("latin1.ron:2:13: the file is not UTF-8 text"), "{msg}");
    let bom = dir.join("bom.ron");
    std::fs::write(&bom, format!("\u{feff}{EXAMPLE}")).unwrap();
    assert!(load(&bom).is_ok());
    std::fs::remove_dir_all(&dir).unwrap();
}

/// Several problems at once are all reported, each on its own line with the file.
#[test]
fn all_problems_are_collected_in_file_order() {
    let text = edit("top_wall_mm: 3.0", "top_wall_mm: -2.0")
        .replacen("mass_g: 60.0", "mass_g: -1.0", 1)
        .replacen("min_enclosure: 0.5", "min_enclosure: 2.0", 1);
    let dir = std::env::temp_dir().join(format!("arcfinger-scene-many-{}", std::process::id()));
    std::fs::create_dir_all(&dir).unwrap();
    let path = dir.join("many.ron");
    std::fs::write(&path, &text).unwrap();
    let msg = load(&path).unwrap_err().to_string();
    let file = path.display().to_string();
    let lines: Vec<&str> = msg.lines().collect();
    assert_eq!(
        lines,
        [
            format!("{file}: actuators.\"f100\".section.top_wall_mm: must be > 0, got -2"),
            format!("{file}: objects[0].mass_g: must be > 0, got -1"),
            format!("{file}: criteria.min_enclosure: must be between 0 and 1 (a fraction), got 2"),
        ]
    );
    // the input is left as it was
    assert_eq!(std::fs::read_to_string(&path).unwrap(), text);
    std::fs::remove_dir_all(&dir).unwrap();
}

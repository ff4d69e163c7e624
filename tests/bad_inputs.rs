//! The bad-input suite: one table of hostile or broken inputs, each run through the
//! binary. Every case must end with exit code 2, nothing on stdout, a message on stderr
//! that names the place (the file with line:column, or the field path, or the path of
//! the file that could not be read) and what was expected, no panic, and every input
//! file exactly as it was.
//!
//! The scenes are edits of DESIGN 4.2's example (`tests/data/design-example.ron`), run
//! with `bend`, which loads and validates the whole scene (meshes included) before
//! anything else; `check` shares the loader. What each message says in detail is tested
//! next to the loader; here the point is that every kind of bad input is caught at the
//! door with a message a person can act on.

use crate::util::{TempDir, arcfinger_in, repo};

/// How a case's scene comes about.
enum Scene {
    /// The example with these `(from, to)` replacements (each `from` must occur).
    Edit(&'static [(&'static str, &'static str)]),
    /// This text instead of a scene.
    Text(String),
    /// This text with the example's object list replaced by `objects`.
    Objects(String),
}

/// Where the message must point.
enum Place {
    /// `FILE:LINE:COL:` at the start of the message.
    LineCol,
    /// `FILE: PATH:` with this field path.
    Field(&'static str),
    /// This text (a file path and what happened to it).
    Text(&'static str),
}

struct Case {
    what: &'static str,
    scene: Scene,
    /// Extra files written next to the scene: (path, bytes).
    files: Vec<(&'static str, Vec<u8>)>,
    place: Place,
    /// What is expected, as the message says it.
    expect: &'static str,
}

fn edit(
    what: &'static str,
    edits: &'static [(&'static str, &'static str)],
    place: Place,
    expect: &'static str,
) -> Case {
    Case { what, scene: Scene::Edit(edits), files: Vec::new(), place, expect }
}

fn with_mesh(
    what: &'static str,
    file: &'static str,
    bytes: Vec<u8>,
    place: Place,
    expect: &'static str,
) -> Case {
    let shape: &'static str = Box::leak(format!("Mesh(path: \"{file}\", scale: 1.0)").into_boxed_str());
    let edits: &'static [(&'static str, &'static str)] =
        Box::leak(Box::new([("Sphere(radius_mm: 25.0)", shape)]));
    Case { what, scene: Scene::Edit(edits), files: vec![(file, bytes)], place, expect }
}

/// The example's one object, named `name`.
fn object(name: &str) -> String {
    format!(
        "(name: \"{name}\", shape: Sphere(radius_mm: 25.0), mass_g: 60.0, friction: 0.8, \
         position_mm: (0.0, 0.0, -70.0), max_contact_force_n: None)"
    )
}

/// A tetrahedron with three 10 mm edges at right angles, as OBJ.
const TETRA: &str = "v 0 0 0\nv 10 0 0\nv 0 10 0\nv 0 0 10\nf 1 3 2\nf 1 2 4\nf 1 4 3\nf 2 3 4\n";

fn cases() -> Vec<Case> {
    use Place::{Field, LineCol, Text};
    let finger = "(actuator: \"f100\", azimuth_deg: 0.0, radius_mm: 30.0, tilt_deg: 0.0)";
    let fingers: &'static str = Box::leak(vec![finger; 17].join(", ").into_boxed_str());
    let fingers_edit: &'static [(&'static str, &'static str)] = Box::leak(Box::new([(
        "(actuator: \"f100\", azimuth_deg: 0.0, radius_mm: 30.0, tilt_deg: 0.0),",
        Box::leak(format!("{fingers},").into_boxed_str()) as &str,
    )]));
    let mut huge_stl = vec![0u8; 84];
    huge_stl[80..84].copy_from_slice(&300_000u32.to_le_bytes());
    vec![
        // ---- syntax ---------------------------------------------------------------
        edit(
            "a missing comma",
            &[(
                "tilt_deg: 0.0),\n            (actuator: \"f100\", azimuth_deg: 120.0",
                "tilt_deg: 0.0)\n            (actuator: \"f100\", azimuth_deg: 120.0",
            )],
            LineCol,
            "expected `,`",
        ),
        edit(
            "an unterminated string",
            &[("name: \"ball-50\",", "name: \"ball-50,")],
            LineCol,
            "closing quote missing",
        ),
        edit(
            "a misspelt field",
            &[("top_wall_mm: 3.0", "top_wal: 3.0")],
            LineCol,
            "did you mean `top_wall_mm`?",
        ),
        edit("a misspelt variant", &[("section: Box(", "section: Bx(")], LineCol, "did you mean `Box`?"),
        edit(
            "a missing field",
            &[("            friction: 0.8,\n", "")],
            LineCol,
            "missing field `friction` in objects[0]",
        ),
        Case {
            what: "the file ends early",
            scene: Scene::Text("Scene(\n    name: \"cut\",\n    actuators: {\n".into()),
            files: Vec::new(),
            place: LineCol,
            expect: "found the end of the file",
        },
        Case {
            what: "not a scene at all",
            scene: Scene::Text("{\"name\": \"json\"}".into()),
            files: Vec::new(),
            place: LineCol,
            expect: "expected `(`, found `{`",
        },
        // ---- wrong types ----------------------------------------------------------
        edit(
            "a string for a number",
            &[("mass_g: 60.0", "mass_g: \"60\"")],
            LineCol,
            "expected a number for objects[0].mass_g",
        ),
        edit(
            "a number for a name",
            &[("name: \"example\"", "name: 7")],
            LineCol,
            "expected a quoted string for name, found the number 7",
        ),
        edit(
            "a list for a map",
            &[("materials: {", "materials: [")],
            LineCol,
            "expected a map `{ \"name\": (...), ... }` for materials",
        ),
        edit(
            "a bare number for an option",
            &[("max_contact_force_n: Some(8.0)", "max_contact_force_n: 8.0")],
            LineCol,
            "expected `Some(...)` or `None` for objects[0].max_contact_force_n",
        ),
        edit(
            "a count too large for its type",
            &[("min_fingers_in_contact: 2", "min_fingers_in_contact: 99999999999")],
            LineCol,
            "expected a whole number from 0 to 4294967295 for criteria.min_fingers_in_contact",
        ),
        // ---- negative, zero, NaN, infinite, huge ----------------------------------
        edit(
            "a negative wall",
            &[("top_wall_mm: 3.0", "top_wall_mm: -2.0")],
            Field("actuators.\"f100\".section.top_wall_mm"),
            "must be > 0, got -2",
        ),
        edit(
            "a negative friction",
            &[("friction: 0.8", "friction: -0.1")],
            Field("objects[0].friction"),
            "must be >= 0, got -0.1",
        ),
        edit(
            "a zero chamber",
            &[("chamber_length_mm: 90.0", "chamber_length_mm: 0.0")],
            Field("actuators.\"f100\".chamber_length_mm"),
            "must be > 0, got 0",
        ),
        edit(
            "a zero density",
            &[("density_g_cm3: 1.07", "density_g_cm3: 0.0")],
            Field("materials.\"soft-00-30\".density_g_cm3"),
            "must be > 0, got 0",
        ),
        edit(
            "a zero sweep step",
            &[("Some((0.0, 60.0, 2.5))", "Some((0.0, 60.0, 0.0))")],
            Field("criteria.sweep_kpa.step"),
            "must be > 0, got 0",
        ),
        edit(
            "a NaN mass",
            &[("mass_g: 60.0", "mass_g: NaN")],
            Field("objects[0].mass_g"),
            "must be a finite number, got NaN",
        ),
        edit(
            "an infinite coordinate",
            &[("(0.0, 0.0, -70.0)", "(0.0, -inf, -70.0)")],
            Field("objects[0].position_mm.y"),
            "must be a finite number, got -inf",
        ),
        edit(
            "a length in metres read as mm",
            &[("chamber_length_mm: 90.0", "chamber_length_mm: 1e9")],
            Field("actuators.\"f100\".chamber_length_mm"),
            "must be at most 10000 mm",
        ),
        edit(
            "a modulus in Pa read as kPa",
            &[("c10_kpa: 12.0", "c10_kpa: 12e6")],
            Field("materials.\"soft-00-30\".model.c10_kpa"),
            "must be at most 1000000 kPa in magnitude",
        ),
        edit(
            "a friction given as a percentage",
            &[("friction: 0.8", "friction: 80.0")],
            Field("objects[0].friction"),
            "must be at most 10",
        ),
        edit(
            "an absurd acceleration",
            &[("lift_accel_m_s2: 5.0", "lift_accel_m_s2: 1e12")],
            Field("criteria.lift_accel_m_s2"),
            "must be at most 1000 m/s²",
        ),
        edit(
            "an Ogden exponent that overflows",
            &[(
                "Yeoh(c10_kpa: 12.0, c20_kpa: 0.4, c30_kpa: 0.0)",
                "Ogden(terms: [(mu_kpa: 24.0, alpha: 400.0)])",
            )],
            Field("materials.\"soft-00-30\".model.terms[0].alpha"),
            "must be at most 50 in magnitude",
        ),
        edit(
            "a pressure above the rating",
            &[("pressure_kpa: 35.0", "pressure_kpa: 600.0")],
            Field("criteria.pressure_kpa"),
            "must not exceed 60 kPa",
        ),
        // ---- references, empty lists, duplicates, sizes ---------------------------
        edit(
            "an unknown actuator",
            &[("(actuator: \"f100\", azimuth_deg: 120.0", "(actuator: \"f10\", azimuth_deg: 120.0")],
            Field("gripper.fingers[1].actuator"),
            "unknown actuator \"f10\"; did you mean \"f100\"?",
        ),
        edit(
            "an unknown material",
            &[("material: \"soft-00-30\"", "material: \"soft\"")],
            Field("actuators.\"f100\".material"),
            "unknown material \"soft\"",
        ),
        Case {
            what: "no objects",
            scene: Scene::Objects(String::new()),
            files: Vec::new(),
            place: Field("objects"),
            expect: "must list at least one object, got none",
        },
        edit(
            "no Ogden terms",
            &[("Yeoh(c10_kpa: 12.0, c20_kpa: 0.4, c30_kpa: 0.0)", "Ogden(terms: [])")],
            Field("materials.\"soft-00-30\".model.terms"),
            "must have at least one term, got none",
        ),
        Case {
            what: "a duplicated object name",
            scene: Scene::Objects(format!("{}, {}", object("egg"), object("egg"))),
            files: Vec::new(),
            place: Field("objects[1].name"),
            expect: "duplicate name \"egg\": objects[0] already uses it",
        },
        edit(
            "a duplicated material",
            &[(
                "\"soft-00-30\": (",
                "\"soft-00-30\": (model: NeoHookean(mu_kpa: 20.0), density_g_cm3: 1.0, elongation_at_break: 5.0),\n        \"soft-00-30\": (",
            )],
            LineCol,
            "duplicate name \"soft-00-30\"",
        ),
        edit(
            "a duplicated field",
            &[("min_enclosure: 0.5,", "min_enclosure: 0.5, min_enclosure: 0.6,")],
            LineCol,
            "appears twice in criteria",
        ),
        edit(
            "a name with terminal escape codes",
            &[("name: \"ball-50\"", "name: \"ball\u{1b}[2J\"")],
            Field("objects[0].name"),
            "must not contain control or text-direction characters, found \\u{1b} at character 5",
        ),
        edit(
            "a reference with escape codes, shown not sent",
            &[(
                "(actuator: \"f100\", azimuth_deg: 120.0",
                "(actuator: \"\u{1b}[31mf100\", azimuth_deg: 120.0",
            )],
            Field("gripper.fingers[1].actuator"),
            "unknown actuator \"\\u{1b}[31mf100\"",
        ),
        Case {
            what: "too many fingers",
            scene: Scene::Edit(fingers_edit),
            files: Vec::new(),
            place: Field("gripper.fingers"),
            expect: "must have at most 16 fingers, got 19",
        },
        Case {
            what: "too many objects",
            scene: Scene::Objects((0..101).map(|i| object(&format!("o{i}"))).collect::<Vec<_>>().join(", ")),
            files: Vec::new(),
            place: Field("objects"),
            expect: "must have at most 100 objects, got 101",
        },
        edit(
            "too many sweep pressures",
            &[("Some((0.0, 60.0, 2.5))", "Some((0.0, 60.0, 0.0001))")],
            Field("criteria.sweep_kpa"),
            "must have at most 10000 steps",
        ),
        // ---- meshes ---------------------------------------------------------------
        with_mesh(
            "an empty mesh file",
            "m/empty.obj",
            Vec::new(),
            Field("objects[0].shape.path"),
            "\"m/empty.obj\": contains no triangles",
        ),
        with_mesh(
            "an open mesh",
            "m/open.obj",
            TETRA.replace("f 2 3 4\n", "").into_bytes(),
            Field("objects[0].shape.path"),
            "\"m/open.obj\": is not a closed surface",
        ),
        with_mesh(
            "a degenerate mesh",
            "m/line.obj",
            b"v 0 0 0\nv 1 0 0\nv 2 0 0\nf 1 2 3\n".to_vec(),
            Field("objects[0].shape.path"),
            "is degenerate: all its triangles have zero area",
        ),
        with_mesh(
            "a flat mesh",
            "m/flat.obj",
            b"v 0 0 0\nv 9 0 0\nv 0 9 0\nf 1 2 3\nf 1 3 2\n".to_vec(),
            Field("objects[0].shape.path"),
            "is flat: all its vertices lie in one plane",
        ),
        with_mesh(
            "a mesh with too many triangles",
            "m/huge.stl",
            huge_stl,
            Field("objects[0].shape.path"),
            "has 300000 triangles; at most 200000 are supported",
        ),
        Case {
            what: "an enormous mesh",
            scene: Scene::Edit(&[("Sphere(radius_mm: 25.0)", "Mesh(path: \"m/t.obj\", scale: 1e5)")]),
            files: vec![("m/t.obj", TETRA.as_bytes().to_vec())],
            place: Field("objects[0].shape.path"),
            expect: "m across after scaling by 100000; at most 10 m",
        },
        with_mesh(
            "a mesh that is not a mesh",
            "m/text.stl",
            b"hello".to_vec(),
            Field("objects[0].shape.path"),
            "is not an STL file",
        ),
        with_mesh(
            "a mesh with a NaN vertex",
            "m/nan.obj",
            TETRA.replacen("v 10 0 0", "v nan 0 0", 1).into_bytes(),
            Field("objects[0].shape.path"),
            "non-finite coordinate",
        ),
        edit(
            "a mesh outside the scene's folder",
            &[("Sphere(radius_mm: 25.0)", "Mesh(path: \"../../etc/x.obj\", scale: 1.0)")],
            Field("objects[0].shape.path"),
            "`..` is refused",
        ),
        edit(
            "a mesh by absolute path",
            &[("Sphere(radius_mm: 25.0)", "Mesh(path: \"/etc/passwd\", scale: 1.0)")],
            Field("objects[0].shape.path"),
            "absolute paths are refused",
        ),
        edit(
            "a mesh that does not exist",
            &[("Sphere(radius_mm: 25.0)", "Mesh(path: \"m/none.obj\", scale: 1.0)")],
            Field("objects[0].shape.path"),
            "\"m/none.obj\": cannot read",
        ),
        Case {
            what: "a mesh that is a folder",
            scene: Scene::Edit(&[("Sphere(radius_mm: 25.0)", "Mesh(path: \"m/dir.obj\", scale: 1.0)")]),
            files: vec![("m/dir.obj/keep", Vec::new())],
            place: Field("objects[0].shape.path"),
            expect: "is not a regular file",
        },
        // ---- unreadable scene files -----------------------------------------------
        Case {
            what: "a scene that is not UTF-8",
            scene: Scene::Text(String::new()),
            files: vec![("bad.ron", b"Scene(\n  name: \"caf\xe9\",\n)".to_vec())],
            place: Text("bad.ron:2:13:"),
            expect: "the file is not UTF-8 text",
        },
    ]
}

/// Writes the case into a fresh folder, runs `bend bad.ron`, and checks the contract;
/// returns what is wrong (empty when the case behaves).
fn run_case(i: usize, case: &Case, example: &str) -> Vec<String> {
    let dir = TempDir::new(&format!("bad-input-{i}"));
    let text = match &case.scene {
        Scene::Edit(edits) => {
            let mut t = example.to_string();
            for (from, to) in *edits {
                assert!(t.contains(from), "{}: the example has no `{from}`", case.what);
                t = t.replacen(from, to, 1);
            }
            t
        }
        Scene::Text(t) => t.clone(),
        Scene::Objects(list) => {
            let start = example.find("objects: [").expect("objects");
            let end = example.find("    criteria:").expect("criteria");
            format!("{}objects: [{list}],\n{}", &example[..start], &example[end..])
        }
    };
    dir.write("bad.ron", &text);
    for (name, bytes) in &case.files {
        let p = dir.path().join(name);
        std::fs::create_dir_all(p.parent().expect("parent")).expect("folder");
        std::fs::write(&p, bytes).expect("write");
    }
    let before = snapshot(dir.path());
    let run = arcfinger_in(dir.path(), &["bend", "bad.ron", "--actuator", "f100"]);
    let mut wrong = Vec::new();
    if run.code != 2 {
        wrong.push(format!("exit code {}, expected 2", run.code));
    }
    if !run.stdout.is_empty() {
        wrong.push(format!("output on stdout: {}", run.stdout));
    }
    if run.stderr.contains("panicked") {
        wrong.push("a panic".into());
    }
    let first = run.stderr.lines().next().unwrap_or("");
    if !first.starts_with("arcfinger: ") {
        wrong.push("the message does not start with `arcfinger: `".into());
    }
    let place_ok = match case.place {
        Place::LineCol => {
            let rest = first.trim_start_matches("arcfinger: bad.ron:");
            let mut parts = rest.splitn(3, ':');
            let number =
                |s: Option<&str>| s.is_some_and(|s| !s.is_empty() && s.bytes().all(|b| b.is_ascii_digit()));
            rest.len() < first.len() && number(parts.next()) && number(parts.next())
        }
        Place::Field(path) => run.stderr.lines().any(|l| {
            let l = l.trim_start_matches("arcfinger: ");
            l.starts_with(&format!("bad.ron: {path}: ")) && l.contains(case.expect)
        }),
        Place::Text(t) => run.stderr.contains(t),
    };
    if !place_ok {
        wrong.push("the message does not name the place".into());
    }
    if !run.stderr.contains(case.expect) {
        wrong.push(format!("expected `{}` in the message", case.expect));
    }
    if snapshot(dir.path()) != before {
        wrong.push("an input was changed or a file was written".into());
    }
    if wrong.is_empty() {
        return wrong;
    }
    vec![format!("case {i} ({}): {}\n--- stderr\n{}", case.what, wrong.join("; "), run.stderr)]
}

/// Every file under `dir` with its bytes, sorted.
fn snapshot(dir: &std::path::Path) -> Vec<(std::path::PathBuf, Vec<u8>)> {
    let mut out = Vec::new();
    let mut stack = vec![dir.to_path_buf()];
    while let Some(d) = stack.pop() {
        for e in std::fs::read_dir(&d).expect("read dir") {
            let p = e.expect("entry").path();
            if p.is_dir() {
                stack.push(p);
            } else {
                let bytes = std::fs::read(&p).unwrap_or_default();
                out.push((p, bytes));
            }
        }
    }
    out.sort();
    out
}

#[test]
fn every_bad_input_exits_2_naming_the_place_and_the_expectation() {
    let example = std::fs::read_to_string(repo("tests/data/design-example.ron")).expect("example");
    let cases = cases();
    assert!(cases.len() >= 30, "the suite has {} cases", cases.len());
    let wrong: Vec<String> =
        cases.iter().enumerate().flat_map(|(i, case)| run_case(i, case, &example)).collect();
    assert!(wrong.is_empty(), "{} of {} cases misbehave:\n{}", wrong.len(), cases.len(), wrong.join("\n"));
}

/// Scene paths that are not regular readable files: missing, a folder, a pipe (which
/// would block a plain read forever), a dangling link.
#[test]
fn unreadable_scene_paths_exit_2_without_blocking() {
    let dir = TempDir::new("bad-input-paths");
    std::fs::create_dir_all(dir.path().join("folder.ron")).expect("folder");
    let mut cases: Vec<(&str, &str)> = vec![
        ("missing.ron", "cannot read scene file missing.ron"),
        ("folder.ron", "folder.ron: is a folder, not a scene file"),
    ];
    #[cfg(unix)]
    {
        std::os::unix::fs::symlink(dir.path().join("gone.ron"), dir.path().join("dangling.ron"))
            .expect("link");
        cases.push(("dangling.ron", "cannot read scene file dangling.ron"));
        let fifo = dir.path().join("pipe.ron");
        let made = std::process::Command::new("mkfifo").arg(&fifo).status().is_ok_and(|s| s.success());
        if made {
            // Should the tool ever open the pipe, this writer lets the read end (with
            // empty input) instead of blocking the test forever.
            std::thread::spawn(move || {
                std::thread::sleep(std::time::Duration::from_secs(5));
                let _ = std::fs::OpenOptions::new().write(true).open(&fifo);
            });
            cases.push(("pipe.ron", "pipe.ron: is not a regular file"));
        }
    }
    for (name, expect) in cases {
        let run = arcfinger_in(dir.path(), &["bend", name]).expect_code(2);
        assert!(
            run.stderr.starts_with("arcfinger: ") && run.stderr.contains(expect),
            "{name}: {}",
            run.stderr
        );
    }
}

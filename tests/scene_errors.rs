//! Bad scene files through the binary: exit code 2, the message on stderr, no panic,
//! and the input left untouched. `bend` loads the scene before anything else, so it
//! serves as the entry point here; what `bend` computes is tested elsewhere.

use crate::util::{TempDir, arcfinger_in, repo};

/// The example scene of DESIGN 4.2 with `from` replaced by `to`.
fn example_with(from: &str, to: &str) -> String {
    let text = std::fs::read_to_string(repo("tests/data/design-example.ron")).expect("example scene");
    assert!(text.contains(from), "the example has no `{from}`");
    text.replacen(from, to, 1)
}

/// Runs `arcfinger bend NAME --actuator f100` on `text` saved as `name` in a temporary
/// folder, expects exit 2 and returns stderr; checks the file is unchanged.
fn bend_fails(dir: &TempDir, name: &str, text: &str) -> String {
    let path = dir.write(name, text);
    let run = arcfinger_in(dir.path(), &["bend", name, "--actuator", "f100"]).expect_code(2);
    assert!(run.stdout.is_empty(), "nothing on stdout expected:\n{}", run.stdout);
    assert_eq!(std::fs::read_to_string(&path).expect("scene still there"), text, "the input was modified");
    run.stderr
}

#[test]
fn syntax_error_gives_line_column_excerpt_and_suggestion() {
    let dir = TempDir::new("scene-syntax");
    let err = bend_fails(&dir, "typo.ron", &example_with("top_wall_mm: 3.0", "top_wal: 3.0"));
    let first = err.lines().next().unwrap_or("");
    assert!(
        first.starts_with(
            "arcfinger: typo.ron:21:26: unknown field `top_wal` in actuators.\"f100\".section (Box)"
        ),
        "{err}"
    );
    assert!(first.ends_with("did you mean `top_wall_mm`?"), "{err}");
    // the offending line and a caret under column 26
    let lines: Vec<&str> = err.lines().collect();
    assert!(lines.len() >= 3, "{err}");
    assert!(lines[1].contains("top_wal: 3.0, floor_mm"), "{err}");
    let caret_col = lines[2].find('^').expect("a caret line");
    let source_col = lines[1].find("top_wal").expect("the source line");
    assert_eq!(caret_col, source_col, "caret not under the field:\n{err}");
}

#[test]
fn validation_errors_are_all_listed_with_the_file_and_field_paths() {
    let dir = TempDir::new("scene-validate");
    let text = example_with("top_wall_mm: 3.0", "top_wall_mm: -2.0")
        .replacen("(actuator: \"f100\", azimuth_deg: 120.0", "(actuator: \"f10\", azimuth_deg: 120.0", 1)
        .replacen("min_fingers_in_contact: 2", "min_fingers_in_contact: 7", 1);
    let err = bend_fails(&dir, "many.ron", &text);
    let lines: Vec<&str> = err.lines().collect();
    assert_eq!(
        lines,
        [
            "arcfinger: many.ron: actuators.\"f100\".section.top_wall_mm: must be > 0, got -2",
            "many.ron: gripper.fingers[1].actuator: unknown actuator \"f10\"; did you mean \"f100\"? (defined: f100)",
            "many.ron: criteria.min_fingers_in_contact: must be between 1 and 3 (the number of fingers), got 7",
        ],
        "{err}"
    );
}

#[test]
fn missing_scene_file_names_the_path() {
    let dir = TempDir::new("scene-missing");
    let run = arcfinger_in(dir.path(), &["bend", "absent.ron", "--actuator", "f100"]).expect_code(2);
    assert!(run.stderr.contains("cannot read scene file absent.ron"), "{}", run.stderr);
}

#[test]
fn mesh_paths_that_leave_the_scene_folder_are_refused() {
    let dir = TempDir::new("scene-mesh-escape");
    // a real mesh one folder up: the scene must still not reach it
    dir.write("outside.obj", "v 0 0 0\nv 1 0 0\nv 0 1 0\nf 1 2 3\n");
    let text = example_with("Sphere(radius_mm: 25.0)", "Mesh(path: \"../outside.obj\", scale: 1.0)");
    dir.write("scenes/escape.ron", &text);
    let run = arcfinger_in(dir.path(), &["bend", "scenes/escape.ron", "--actuator", "f100"]).expect_code(2);
    assert!(
        run.stderr.contains("scenes/escape.ron: objects[0].shape.path: \"../outside.obj\": `..` is refused"),
        "{}",
        run.stderr
    );
}

#[test]
fn broken_mesh_file_is_reported_with_its_path() {
    let dir = TempDir::new("scene-mesh-bad");
    dir.write("meshes/flat.stl", "solid flat\nfacet normal 0 0 1\nouter loop\nvertex 0 0 0\nvertex 1 0 0\nvertex 2 0 0\nendloop\nendfacet\nendsolid flat\n");
    let text = example_with("Sphere(radius_mm: 25.0)", "Mesh(path: \"meshes/flat.stl\", scale: 1.0)");
    let err = bend_fails(&dir, "flat.ron", &text);
    assert!(
        err.contains("flat.ron: objects[0].shape.path: \"meshes/flat.stl\": is degenerate: all its triangles have zero area"),
        "{err}"
    );
}

/// Inputs that are not scenes at all must not panic either.
#[test]
fn garbage_inputs_exit_2_without_panicking() {
    let dir = TempDir::new("scene-garbage");
    for (name, text) in [
        ("empty.ron", ""),
        ("binary.ron", "\u{0}\u{1}\u{2}"),
        ("brackets.ron", "(((((((((("),
        ("deep.ron", &"[".repeat(10_000)),
        ("json.ron", "{\"name\": \"x\"}"),
        ("unit.ron", "Scene()"),
    ] {
        let err = bend_fails(&dir, name, text);
        assert!(err.starts_with(&format!("arcfinger: {name}:")), "{name}: {err}");
    }
}

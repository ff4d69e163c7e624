//! `arcfinger check`: the usage errors that are found before the grasp check runs (bad
//! scene, `--pressure` above the rating, `--elements`, output paths that are inputs or
//! clash). Each is exit code 2 with a message naming the place and what is expected, and
//! no input is touched. The check's results themselves are not exercised here.

use crate::util::{TempDir, arcfinger, arcfinger_in, repo};

const SCENE: &str = "scenes/packing-line-3f.ron";

/// Exit 2 and a message containing `needle`; the message must be the validation's own,
/// not the one of a build without the physics, so a missing check cannot pass here.
fn refused(args: &[&str], needle: &str) -> String {
    let run = arcfinger(args).expect_code(2);
    assert!(run.stderr.contains(needle), "{args:?}: expected \"{needle}\" in:\n{}", run.stderr);
    assert!(!run.stderr.contains("not available in this build"), "{args:?}: {}", run.stderr);
    assert!(run.stderr.starts_with("arcfinger: "), "{}", run.stderr);
    run.stderr
}

#[test]
fn bad_scenes_exit_2_with_the_place() {
    let tmp = TempDir::new("check-bad-scene");
    refused(&["check", "scenes/missing.ron"], "cannot read scene file scenes/missing.ron");
    let text = std::fs::read_to_string(repo(SCENE)).unwrap().replace("mass_g: 150.0", "mass_g: -150.0");
    let bad = tmp.write("bad.ron", &text);
    let bad = bad.display().to_string();
    refused(&["check", &bad], &format!("{bad}: objects[0].mass_g: must be > 0, got -150"));
    // the mesh path is relative to the scene's folder, which has no mesh here
    let lone = tmp.write("lone.ron", &std::fs::read_to_string(repo(SCENE)).unwrap());
    refused(
        &["check", &lone.display().to_string()],
        "objects[2].shape.path: \"meshes/bell-pepper.obj\": cannot read",
    );
    let syntax = tmp.write("syntax.ron", "Scene(\n  name: \"x\",\n  actuators: {\n");
    refused(&["check", &syntax.display().to_string()], "syntax.ron:");
}

#[test]
fn pressure_must_be_within_the_rating() {
    let e = refused(&["check", SCENE, "--pressure", "70"], "--pressure: 70 kPa is above the rated maximum");
    assert!(e.contains("actuator \"box-100\" (60 kPa, used by gripper.fingers[0])"), "{e}");
    refused(
        &["check", SCENE, "--pressure", "-5"],
        "--pressure: must be a finite number of kPa, at least 0, got -5",
    );
    refused(&["check", SCENE, "--pressure", "NaN"], "--pressure: must be a finite number of kPa");
    refused(&["check", SCENE, "--pressure", "inf"], "--pressure: must be a finite number of kPa");
    // not a number at all: clap's own message, still exit 2
    let run = arcfinger(&["check", SCENE, "--pressure", "forty"]).expect_code(2);
    assert!(run.stderr.contains("--pressure"), "{}", run.stderr);
    refused(&["check", SCENE, "--elements", "10"], "--elements: must be between 40 and");
}

/// With no SCENE the bundled demo is used from any folder: its rating (60 kPa) is
/// known in an empty temporary folder, so the scene and its mesh came from the binary.
#[test]
fn bundled_demo_is_loaded_from_any_folder() {
    let tmp = TempDir::new("check-demo-anywhere");
    let run = arcfinger_in(tmp.path(), &["check", "--pressure", "61"]).expect_code(2);
    assert!(
        run.stderr.contains("61 kPa is above the rated maximum of actuator \"box-100\" (60 kPa"),
        "{}",
        run.stderr
    );
    assert_eq!(std::fs::read_dir(tmp.path()).unwrap().count(), 0, "nothing written");
}

#[test]
fn outputs_that_are_inputs_or_collide_are_refused() {
    let before = std::fs::read(repo(SCENE)).unwrap();
    let mesh_before = std::fs::read(repo("scenes/meshes/bell-pepper.obj")).unwrap();
    refused(&["check", SCENE, "--json", SCENE], "refusing to overwrite an input file");
    refused(
        &["check", SCENE, "--junit", "./scenes/packing-line-3f.ron"],
        "refusing to overwrite an input file",
    );
    refused(
        &["check", SCENE, "--markdown", "scenes/meshes/bell-pepper.obj"],
        "refusing to overwrite an input file",
    );
    let tmp = TempDir::new("check-outputs");
    let out = tmp.path().join("report.xml").display().to_string();
    refused(
        &["check", SCENE, "--markdown", &out, "--junit", &out],
        &format!("--markdown {out}: --junit already writes to that file"),
    );
    refused(
        &["check", SCENE, "--json", "-", "--markdown", "-"],
        "--markdown -: --json already writes to stdout",
    );
    let nowhere = tmp.path().join("no-such-folder/report.xml").display().to_string();
    refused(&["check", SCENE, "--junit", &nowhere], "no-such-folder does not exist");
    assert_eq!(std::fs::read(repo(SCENE)).unwrap(), before);
    assert_eq!(std::fs::read(repo("scenes/meshes/bell-pepper.obj")).unwrap(), mesh_before);
    assert_eq!(std::fs::read_dir(tmp.path()).unwrap().count(), 0, "nothing written");
}

//! `arcfinger check`: the usage errors that are found before the grasp check runs (bad
//! scene, `--pressure` above the rating, `--elements`, output paths that are inputs or
//! clash). Each is exit code 2 with a message naming the place and what is expected, and
//! no input is touched. One small scene runs the check itself and tests the JSON
//! contract and the symmetry of the contacts.

use crate::util::{TempDir, arcfinger, arcfinger_env, arcfinger_in, repo};

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
    let e = refused(&["check", SCENE, "--pressure", "160"], "--pressure: 160 kPa is above the rated maximum");
    assert!(e.contains("actuator \"box-100\" (150 kPa, used by gripper.fingers[0])"), "{e}");
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

/// With no SCENE the bundled demo is used from any folder: its rating (150 kPa) is
/// known in an empty temporary folder, so the scene and its mesh came from the binary.
#[test]
fn bundled_demo_is_loaded_from_any_folder() {
    let tmp = TempDir::new("check-demo-anywhere");
    let run = arcfinger_in(tmp.path(), &["check", "--pressure", "151"]).expect_code(2);
    assert!(
        run.stderr.contains("151 kPa is above the rated maximum of actuator \"box-100\" (150 kPa"),
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

/// `check` on the earlier three-finger demo gripper (its soft fingers kept as test data) around one centred
/// ball (tests/data): the JSON has the keys of DESIGN 4.3; the gripper is symmetric under rotations of 120°
/// about z and so is the ball, so every finger touches and the three contacts carry the
/// same normal force and sit at the same height (symmetry, no reference needed); contacts
/// lie on the sphere with unit normals along the radius into it; and the verdict agrees
/// with the reported margins and the scene's criteria.
#[test]
fn symmetric_gripper_on_a_centred_ball_gives_symmetric_contacts() {
    let run = arcfinger(&["check", "tests/data/check-ball-3f.ron", "--json", "-"]);
    assert!(run.code == 0 || run.code == 1, "exit {}: {}", run.code, run.stderr);
    let doc: serde_json::Value = serde_json::from_str(&run.stdout).expect("JSON on stdout");
    assert_eq!(doc["format"], "arcfinger/check/1");
    assert_eq!(doc["pressure_kpa"].as_f64(), Some(40.0));
    for key in ["scene", "verdict", "fingers", "objects", "recommended_pressure_kpa"] {
        assert!(doc.get(key).is_some(), "missing {key}");
    }
    assert_eq!(doc["fingers"].as_array().unwrap().len(), 3);
    let ball = &doc["objects"][0];
    for key in [
        "name",
        "verdict",
        "reasons",
        "fingers_in_contact",
        "contacts",
        "enclosure",
        "epsilon",
        "holding",
        "peak_contact_force_n",
        "pressure_window_kpa",
    ] {
        assert!(ball.get(key).is_some(), "missing objects[0].{key}");
    }
    assert_eq!(ball["fingers_in_contact"].as_u64(), Some(3));
    let contacts = ball["contacts"].as_array().unwrap();
    let centre = [0.0, 0.0, -75.0];
    let mut per_finger = [0.0f64; 3];
    let mut heights = [f64::NAN; 3];
    for c in contacts {
        let p: Vec<f64> = c["point_mm"].as_array().unwrap().iter().map(|v| v.as_f64().unwrap()).collect();
        let n: Vec<f64> = c["normal"].as_array().unwrap().iter().map(|v| v.as_f64().unwrap()).collect();
        let d: Vec<f64> = (0..3).map(|i| p[i] - centre[i]).collect();
        let r = d.iter().map(|x| x * x).sum::<f64>().sqrt();
        assert!((r - 34.0).abs() < 1e-3, "contact {p:?} not on the sphere (r = {r})");
        let dot: f64 = (0..3).map(|i| -d[i] / r * n[i]).sum();
        assert!(dot > 1.0 - 1e-6, "normal {n:?} not along the radius into the ball");
        let f = c["finger"].as_u64().unwrap() as usize;
        per_finger[f] += c["normal_force_n"].as_f64().unwrap();
        heights[f] = p[2];
    }
    for f in 1..3 {
        assert!((per_finger[f] / per_finger[0] - 1.0).abs() < 1e-6, "forces {per_finger:?}");
        assert!((heights[f] - heights[0]).abs() < 1e-6, "heights {heights:?}");
    }
    let lift = ball["holding"]["lift"].as_f64().unwrap();
    let lateral = ball["holding"]["lateral_min"].as_f64().unwrap();
    let peak = ball["peak_contact_force_n"].as_f64().unwrap();
    let enclosure = ball["enclosure"].as_f64().unwrap();
    // criteria of the scene: safety factor 2, 2 fingers, enclosure 0.4, force limit 6 N
    let should_pass = lift >= 2.0 && lateral >= 2.0 && peak <= 6.0 && enclosure >= 0.4;
    assert_eq!(ball["verdict"] == "pass", should_pass, "{ball}");
    assert_eq!(run.code == 0, should_pass);
}

/// The check's JSON is byte-identical whatever the number of threads that evaluate the
/// objects (rayon, objects in parallel, results collected in scene order) and from one
/// run to the next: 1, 2 and 8 threads, two runs each.
#[test]
fn json_is_identical_for_1_2_and_8_threads_and_across_runs() {
    let args = ["check", "tests/data/check-two-3f.ron", "--json", "-"];
    let mut runs = Vec::new();
    for threads in ["1", "2", "8"] {
        for _ in 0..2 {
            let run = arcfinger_env(&crate::util::root(), &args, &[("RAYON_NUM_THREADS", threads)]);
            assert!(run.code == 0 || run.code == 1, "exit {}: {}", run.code, run.stderr);
            runs.push((threads, run));
        }
    }
    let (_, first) = &runs[0];
    assert!(first.stdout.contains("\"egg\"") && first.stdout.contains("\"ball\""));
    for (threads, run) in &runs[1..] {
        assert_eq!(run.code, first.code, "{threads} threads");
        assert!(run.stdout == first.stdout, "{threads} threads: the JSON differs from the first run");
    }
}

/// Symmetric two-finger pinch of a centred ball through the whole pipeline: the lift
/// margin equals the closed form from Coulomb friction and the reported normal forces.
/// Each contact `i` can push with at most `N_i` along its normal `n_i` (into the ball)
/// plus friction up to `mu N_i` in its tangent plane; the most it lifts is
/// `N_i (n_iz + mu sqrt(1 - n_iz^2))` (normal part plus friction along the steepest
/// tangent). With the two fingers mirror images through the ball's vertical axis, the
/// horizontal parts and the torques cancel, so the largest balanced load scale is
/// `s = sum_i N_i (n_iz + mu sqrt(1 - n_iz^2)) / (m (g + a))` (Coulomb's law and statics;
/// cf. Murray, Li & Sastry 1994, ch. 5, for the contact model).
#[test]
fn two_finger_pinch_lift_margin_matches_the_coulomb_closed_form() {
    let run = arcfinger(&["check", "tests/data/pinch-ball-2f.ron", "--json", "-"]);
    assert!(run.code == 0 || run.code == 1, "exit {}: {}", run.code, run.stderr);
    let doc: serde_json::Value = serde_json::from_str(&run.stdout).expect("JSON on stdout");
    let ball = &doc["objects"][0];
    assert_eq!(ball["fingers_in_contact"].as_u64(), Some(2), "{ball}");
    let (mass, mu, g, a) = (0.1, 0.6, 9.806_65, 5.0); // the scene's ball and criteria
    let mut lift = 0.0;
    for c in ball["contacts"].as_array().unwrap() {
        let nz = c["normal"][2].as_f64().unwrap();
        let n = c["normal_force_n"].as_f64().unwrap();
        lift += n * (nz + mu * (1.0 - nz * nz).max(0.0).sqrt());
    }
    let expected = lift / (mass * (g + a));
    let got = ball["holding"]["lift"].as_f64().unwrap();
    assert!((got / expected - 1.0).abs() < 1e-5, "lift margin {got} vs closed form {expected}");
}

/// `--robust N`: the study runs after the check, lands in the JSON (`robust`) and the
/// table, and its numbers are consistent (passes out of samples, failure counts at most
/// the samples). Its statistics and determinism are checked in the core.
#[test]
fn robust_study_lands_in_the_json_and_the_table() {
    let scene = repo("tests/data/pinch-ball-2f.ron").display().to_string();
    let run = arcfinger(&["check", &scene, "--robust", "2", "--seed", "3", "--json", "-"]);
    assert!(run.code == 0 || run.code == 1, "{}", run.stderr);
    let doc: serde_json::Value = serde_json::from_str(&run.stdout).unwrap();
    let r = &doc["robust"];
    assert_eq!((r["samples"].as_u64(), r["seed"].as_u64()), (Some(2), Some(3)));
    let o = &r["objects"][0];
    assert_eq!(o["name"], "ball");
    let passes = o["passes"].as_u64().unwrap();
    assert!(passes <= 2);
    assert!((o["pass_probability"].as_f64().unwrap() - passes as f64 / 2.0).abs() < 1e-15);
    // a passing sample fails nothing, so no criterion fails in more than the failing samples
    let failures = o["failures"].as_array().unwrap();
    for f in failures {
        assert!(f["samples"].as_u64().unwrap() <= 2 - passes, "{f}");
    }
    assert_eq!(o["most_failing"].is_null(), failures.is_empty());
    assert!(run.stderr.contains("robustness: 2 samples, seed 3"), "{}", run.stderr);
}

#[test]
fn robust_sample_counts_are_checked_before_the_check() {
    let scene = repo("tests/data/pinch-ball-2f.ron").display().to_string();
    let run = arcfinger(&["check", &scene, "--robust", "0"]).expect_code(2);
    assert!(run.stderr.contains("--robust: must be between 1 and"), "{}", run.stderr);
    let run = arcfinger(&["check", &scene, "--seed", "3"]).expect_code(2);
    assert!(run.stderr.contains("--robust"), "{}", run.stderr);
}

/// An object that already overlaps the open fingers at its position does not fit into
/// the gripper: it fails for that reason alone, with the depth of the overlap, and has
/// no pressure window. A 70 mm ball on the axis against fingers whose inner face (the
/// 1 mm under-layer below the reference line at the 65 mm mount radius) stands 64 mm
/// from it: 6 mm deep (closed form of the geometry).
#[test]
fn an_object_wider_than_the_open_fingers_does_not_fit() {
    let text = std::fs::read_to_string(repo("tests/data/check-ball-3f.ron")).unwrap();
    assert!(text.contains("Sphere(radius_mm: 34.0)"));
    let tmp = TempDir::new("does-not-fit");
    let scene =
        tmp.write("big-ball.ron", &text.replace("Sphere(radius_mm: 34.0)", "Sphere(radius_mm: 70.0)"));
    let run = arcfinger(&["check", &scene.display().to_string(), "--json", "-"]).expect_code(1);
    let doc: serde_json::Value = serde_json::from_str(&run.stdout).expect("JSON on stdout");
    let ball = &doc["objects"][0];
    assert_eq!(ball["verdict"], "fail");
    assert_eq!(ball["pressure_window_kpa"], serde_json::Value::Null);
    let failures = ball["failures"].as_array().unwrap();
    assert_eq!(failures.len(), 1, "{failures:?}");
    assert_eq!(failures[0]["kind"], "does-not-fit");
    assert!(failures[0]["obstacle"].as_str().unwrap().starts_with("finger "));
    let depth = failures[0]["depth_mm"].as_f64().unwrap();
    assert!((depth - 6.0).abs() < 1e-6, "depth {depth} mm");
    let reason = ball["reasons"][0].as_str().unwrap();
    assert!(reason.contains("does not fit") && reason.contains("6.0 mm"), "{reason}");
}

/// The objects of a check document by name.
fn objects_by_name(doc: &serde_json::Value) -> std::collections::BTreeMap<String, serde_json::Value> {
    doc["objects"]
        .as_array()
        .unwrap()
        .iter()
        .map(|o| (o["name"].as_str().unwrap().to_string(), o.clone()))
        .collect()
}

/// The failure kinds of an object, in report order.
fn kinds(object: &serde_json::Value) -> Vec<String> {
    object["failures"].as_array().unwrap().iter().map(|f| f["kind"].as_str().unwrap().to_string()).collect()
}

/// A jar (a vertical cylinder) held by fingers on its side only: every contact normal is
/// horizontal, so in the lift case each contact lifts with its friction alone, at most
/// `mu N_i` (Coulomb). With the contacts spread evenly around the jar at one height the
/// horizontal forces and the torques cancel, and the largest balanced load scale is
/// `s = mu sum_i N_i / (m (g + a))` (Coulomb's law and statics). Checks that the
/// reported contacts are such side contacts and returns `(reported, closed form)`.
fn side_grip_lift_margin(jar: &serde_json::Value, mass_kg: f64, mu: f64, lift_accel: f64) -> (f64, f64) {
    let mut sum = 0.0;
    for c in jar["contacts"].as_array().unwrap() {
        let nz = c["normal"][2].as_f64().unwrap();
        assert!(nz.abs() < 1e-6, "a contact off the side of the jar: {c}");
        sum += c["normal_force_n"].as_f64().unwrap();
    }
    (jar["holding"]["lift"].as_f64().unwrap(), mu * sum / (mass_kg * (9.806_65 + lift_accel)))
}

/// The bundled demo (no SCENE) at its 100 kPa supply: the produce and the egg pass, and
/// their pressure windows hold the supply pressure; the 540 g honey jar behind glass
/// (friction 0.4) fails on holding margin alone. It is too heavy, not badly gripped: its
/// lift margin is the Coulomb bound of its side contacts, below the safety factor of 2.
#[test]
fn bundled_demo_fails_only_the_heavy_jar_and_on_holding() {
    let tmp = TempDir::new("check-demo-verdicts");
    let run = arcfinger_in(tmp.path(), &["check", "--json", "-"]).expect_code(1);
    let doc: serde_json::Value = serde_json::from_str(&run.stdout).unwrap();
    assert_eq!(doc["pressure_kpa"].as_f64(), Some(100.0));
    let objects = objects_by_name(&doc);
    assert_eq!(objects.len(), 5);
    for (name, o) in &objects {
        if name == "honey-jar" {
            continue;
        }
        assert_eq!(o["verdict"], "pass", "{name}: {o}");
        let w = &o["pressure_window_kpa"];
        assert!(w[0].as_f64().unwrap() <= 100.0 && 100.0 <= w[1].as_f64().unwrap(), "{name}: window {w}");
    }
    let jar = &objects["honey-jar"];
    assert_eq!(jar["verdict"], "fail");
    assert!(kinds(jar).iter().all(|k| k == "holding"), "{:?}", kinds(jar));
    assert_eq!(jar["fingers_in_contact"].as_u64(), Some(3));
    let (got, expected) = side_grip_lift_margin(jar, 0.540, 0.4, 5.0);
    assert!((got / expected - 1.0).abs() < 1e-4, "lift margin {got} vs Coulomb bound {expected}");
    assert!(expected < 2.0, "the jar must be too heavy for the fingers' friction: {expected}");
    // no swept pressure serves the jar, so none serves the whole set
    assert_eq!(doc["recommended_pressure_kpa"], serde_json::Value::Null);
}

/// The four-finger demo scene without its sweep (for speed), written into `tmp` with its
/// mesh.
fn four_finger_demo_without_sweep(tmp: &TempDir) -> std::path::PathBuf {
    let text = std::fs::read_to_string(repo("scenes/packing-line-4f.ron")).unwrap();
    let sweep = "sweep_kpa: Some((0.0, 120.0, 5.0)),";
    assert!(text.contains(sweep), "the demo sweeps 25 pressures, 0 to 120 kPa");
    let scene = tmp.write("4f.ron", &text.replace(sweep, "sweep_kpa: None,"));
    tmp.write(
        "meshes/bell-pepper.obj",
        &std::fs::read_to_string(repo("scenes/meshes/bell-pepper.obj")).unwrap(),
    );
    scene
}

/// Fingers closed together (the four-finger demo's cherry tomato, where all four meet)
/// give byte-identical JSON for 1 and 2 threads: the joint closing of one object runs
/// on one thread, in a fixed order.
#[test]
fn json_with_fingers_closed_together_is_identical_for_1_and_2_threads() {
    let tmp = TempDir::new("check-demo-4f-threads");
    let scene = four_finger_demo_without_sweep(&tmp).display().to_string();
    let args = ["check", scene.as_str(), "--json", "-"];
    let one = arcfinger_env(&crate::util::root(), &args, &[("RAYON_NUM_THREADS", "1")]).expect_code(1);
    let two = arcfinger_env(&crate::util::root(), &args, &[("RAYON_NUM_THREADS", "2")]).expect_code(1);
    assert!(one.stdout.contains("\"cherry-tomato\""));
    assert!(one.stdout == two.stdout, "the JSON differs between 1 and 2 threads");
}

/// The four-finger demo at its 100 kPa supply (checked without its sweep, for speed):
/// seven objects pass; three fail, each for its own physical reason. The honey jar is
/// too heavy (holding margin alone, at the Coulomb bound of its side contacts); the
/// cherry tomato is too small (the fingers meet each other near the axis, and too few get
/// through to it); the ripe fig is too fragile (its only failure
/// is the contact force, above its 1.5 N bruising limit).
#[test]
fn four_finger_demo_fails_the_heavy_the_small_and_the_fragile() {
    let tmp = TempDir::new("check-demo-4f");
    let scene = four_finger_demo_without_sweep(&tmp);
    let run = arcfinger(&["check", &scene.display().to_string(), "--json", "-"]).expect_code(1);
    let doc: serde_json::Value = serde_json::from_str(&run.stdout).unwrap();
    let objects = objects_by_name(&doc);
    assert_eq!(objects.len(), 10);
    let failing: Vec<&str> =
        objects.iter().filter(|(_, o)| o["verdict"] == "fail").map(|(n, _)| n.as_str()).collect();
    assert_eq!(failing, ["cherry-tomato", "honey-jar", "ripe-fig"]);

    let jar = &objects["honey-jar"];
    assert!(kinds(jar).iter().all(|k| k == "holding"), "{:?}", kinds(jar));
    let (got, expected) = side_grip_lift_margin(jar, 0.540, 0.4, 5.0);
    assert!((got / expected - 1.0).abs() < 1e-4, "lift margin {got} vs Coulomb bound {expected}");
    assert!(expected < 2.0);

    // Too small: four fingers 26 mm wide (half-round, outer radius 10 + 3 mm) set 90°
    // apart overlap wherever they come nearer to the axis than their half-width, 13 mm
    // (two slabs |y| <= 13, x >= rho and |x| <= 13, y >= rho meet iff rho <= 13;
    // plane geometry). The tomato is 12 mm in radius, so the fingers run into each other
    // before all four reach it; closed together, each an obstacle of the others, at most
    // two (one opposed pair) get through to it, fewer than the three required, and none
    // overlaps another.
    let tomato = &objects["cherry-tomato"];
    let tk = kinds(tomato);
    let touched = tomato["fingers_in_contact"].as_u64().unwrap();
    assert!(touched < 3, "{touched} fingers touch it");
    assert!(tk.contains(&"too-few-fingers".to_string()), "{tk:?}");
    assert!(!tk.contains(&"interference".to_string()), "{tk:?}");
    let fig = &objects["ripe-fig"];
    assert_eq!(kinds(fig), ["contact-force"]);
    assert!(fig["peak_contact_force_n"].as_f64().unwrap() > 1.5);
}

//! `arcfinger calibrate` on the demo scene and its invented bench data
//! (`scenes/box-100-bench.csv`, generated from the model with the modulus times 0.85, a
//! 3.4 mm floor and noise of 1° and 0.01 N). The recovery of known parameters within
//! the noise is checked in the core (`grasp_core::calibrate`); here the command: the
//! fit, the JSON, the calibrated scene and the refusal to overwrite an input.

use crate::util::{TempDir, arcfinger, repo};

fn demo_copy(tmp: &TempDir) -> std::path::PathBuf {
    let scene = tmp.write("line.ron", &std::fs::read_to_string(repo("scenes/packing-line-3f.ron")).unwrap());
    let mesh = std::fs::read_to_string(repo("scenes/meshes/bell-pepper.obj")).unwrap();
    tmp.write("meshes/bell-pepper.obj", &mesh);
    scene
}

#[test]
fn demo_bench_data_calibrate_into_a_new_scene() {
    let tmp = TempDir::new("calibrate-demo");
    let scene = demo_copy(&tmp);
    let before = std::fs::read(&scene).unwrap();
    let bench = repo("scenes/box-100-bench.csv").display().to_string();
    let run = arcfinger(&[
        "calibrate",
        &scene.display().to_string(),
        &bench,
        "--actuator",
        "box-100",
        "--fit-floor",
        "--json",
        "-",
    ])
    .expect_code(0);
    let doc: serde_json::Value = serde_json::from_str(&run.stdout).unwrap();
    assert_eq!(doc["format"], "arcfinger/calibrate/1");
    let scale = doc["modulus_scale"].as_f64().unwrap();
    let floor = doc["floor_mm"].as_f64().unwrap();
    // the generating values, within three standard errors
    assert!((scale - 0.85).abs() < 3.0 * doc["modulus_scale_error"].as_f64().unwrap(), "{scale}");
    assert!((floor - 3.4).abs() < 3.0 * doc["floor_error_mm"].as_f64().unwrap(), "{floor}");
    let after = doc["residual_after"]["bend_rms_deg"].as_f64().unwrap();
    assert!(after < 1.5 && after < doc["residual_before"]["bend_rms_deg"].as_f64().unwrap() / 10.0);
    assert_eq!(std::fs::read(&scene).unwrap(), before, "the input is never written");
    let out = tmp.path().join("line-calibrated.ron");
    assert_eq!(doc["calibrated_scene"], out.display().to_string());
    // the calibrated scene loads, and bends as the fit says
    let bend = arcfinger(&["bend", &out.display().to_string(), "--pressures", "50:50:1", "--json", "-"])
        .expect_code(0);
    let b: serde_json::Value = serde_json::from_str(&bend.stdout).unwrap();
    let at50 = doc["points"].as_array().unwrap().iter().find(|p| p["pressure_kpa"] == 50.0).unwrap();
    let fitted = at50["bend_after_deg"].as_f64().unwrap();
    assert!((b["points"][0]["bend_deg"].as_f64().unwrap() - fitted).abs() < 1e-9);
    let text = std::fs::read_to_string(&out).unwrap();
    assert!(text.contains("platinum silicone, Shore 20A-calibrated") && text.contains("Calibrated by"));
}

#[test]
fn calibrate_refuses_to_overwrite_its_inputs_and_bad_data() {
    let tmp = TempDir::new("calibrate-refuse");
    let scene = demo_copy(&tmp);
    let s = scene.display().to_string();
    let bench = repo("scenes/box-100-bench.csv").display().to_string();
    let run = arcfinger(&["calibrate", &s, &bench, "--out", &s]).expect_code(2);
    assert!(run.stderr.contains("refusing to overwrite"), "{}", run.stderr);
    let run = arcfinger(&["calibrate", &s, &bench, "--out", &bench]).expect_code(2);
    assert!(run.stderr.contains("refusing to overwrite"), "{}", run.stderr);
    let high = tmp.write("high.csv", "pressure_kpa,bend_deg\n30,100\n160,300\n");
    let run = arcfinger(&["calibrate", &s, &high.display().to_string()]).expect_code(2);
    assert!(
        run.stderr.contains("high.csv:3: column `pressure_kpa`: 160 kPa is above the rated maximum"),
        "{}",
        run.stderr
    );
    assert!(!tmp.path().join("line-calibrated.ron").exists());
}

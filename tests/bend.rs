//! `arcfinger bend` on the demo scenes: the table, the JSON of DESIGN 4.3, the SVG plot,
//! and usage errors. The numbers themselves are checked against closed forms and tables
//! in the core's tests; here the contract and the plumbing are.

use crate::util::{TempDir, arcfinger, repo};

fn json(run: &crate::util::Run) -> serde_json::Value {
    serde_json::from_str(&run.stdout).unwrap_or_else(|e| panic!("not JSON ({e}):\n{}", run.stdout))
}

#[test]
fn every_demo_actuator_gives_table_json_and_plot() {
    let tmp = TempDir::new("bend-demo");
    for (scene, actuator) in
        [("scenes/packing-line-3f.ron", "box-100"), ("scenes/packing-line-4f.ron", "round-100")]
    {
        let svg = tmp.path().join(format!("{actuator}.svg"));
        let table = arcfinger(&[
            "bend",
            &repo(scene).display().to_string(),
            "--actuator",
            actuator,
            "--pressures",
            "0:40:5",
            "--plot",
            &svg.display().to_string(),
        ])
        .expect_code(0);
        assert!(table.stdout.contains(actuator) && table.stdout.contains("F_blk"), "{}", table.stdout);
        assert_eq!(table.stdout.lines().filter(|l| l.trim_end().ends_with("ok")).count(), 9);
        let svg_text = std::fs::read_to_string(&svg).unwrap();
        assert!(svg_text.starts_with("<svg") && svg_text.contains("blocked tip force (N)"));
        assert!(svg_text.matches("<circle").count() >= 18, "one marker per point and panel");

        let run = arcfinger(&["bend", scene, "--actuator", actuator, "--pressures", "0:40:5", "--json", "-"])
            .expect_code(0);
        let doc = json(&run);
        assert_eq!(doc["format"], "arcfinger/bend/1");
        assert_eq!(doc["actuator"], actuator);
        assert_eq!(doc["model"], "wall-pressure");
        let points = doc["points"].as_array().unwrap();
        assert_eq!(points.len(), 9);
        for key in
            ["pressure_kpa", "curvature_per_mm", "bend_deg", "tip_mm", "blocked_force_n", "max_stretch"]
        {
            assert!(points.iter().all(|p| !p[key].is_null()), "{key} missing");
        }
        // at zero pressure the finger is straight: tip on the axis at its full length
        assert_eq!(points[0]["tip_mm"][0].as_f64(), Some(0.0));
        assert_eq!(points[0]["bend_deg"].as_f64(), Some(0.0));
        // bend angle and blocked force rise with pressure
        for w in points.windows(2) {
            assert!(w[1]["bend_deg"].as_f64() > w[0]["bend_deg"].as_f64());
            assert!(w[1]["blocked_force_n"].as_f64() > w[0]["blocked_force_n"].as_f64());
        }
    }
}

#[test]
fn json_is_byte_identical_across_runs() {
    let args = ["bend", "scenes/packing-line-4f.ron", "--pressures", "0:80:10", "--json", "-"];
    let a = arcfinger(&args).expect_code(0);
    let b = arcfinger(&args).expect_code(0);
    assert_eq!(a.stdout, b.stdout);
}

#[test]
fn baseline_model_bends_less_than_the_wall_pressure_refinement() {
    // DESIGN 3.2: the refinement adds wall pressure that bends the finger further
    let get = |model: &str| {
        let run = arcfinger(&[
            "bend",
            "scenes/packing-line-3f.ron",
            "--pressures",
            "30:30:1",
            "--section-model",
            model,
            "--json",
            "-",
        ])
        .expect_code(0);
        let doc = json(&run);
        assert_eq!(doc["model"], model);
        doc["points"][0]["bend_deg"].as_f64().unwrap()
    };
    assert!(get("baseline") < get("wall-pressure"));
}

#[test]
fn usage_errors_exit_2_and_say_what_is_expected() {
    for (args, needle) in [
        (vec!["bend", "scenes/packing-line-3f.ron", "--actuator", "box-10"], "did you mean \"box-100\""),
        (vec!["bend", "scenes/packing-line-3f.ron", "--pressures", "0:160:5"], "above the rated maximum"),
        (vec!["bend", "scenes/packing-line-3f.ron", "--pressures", "0:40"], "FROM:TO:STEP"),
        (vec!["bend", "scenes/packing-line-3f.ron", "--elements", "10"], "between 40 and"),
        (vec!["bend", "scenes/missing.ron"], "missing.ron"),
        (
            vec!["bend", "scenes/packing-line-3f.ron", "--json", "scenes/packing-line-3f.ron"],
            "refusing to overwrite",
        ),
    ] {
        let run = arcfinger(&args).expect_code(2);
        assert!(run.stderr.contains(needle), "{args:?}: {}", run.stderr);
    }
    // the input survived the refused overwrite
    let text = std::fs::read_to_string(repo("scenes/packing-line-3f.ron")).unwrap();
    assert!(text.starts_with("// Demo scene"));
}

/// End to end through the scene file's units (mm, kPa → SI → 1/mm): DESIGN 4.2's example
/// actuator "f100" at 10 Pa bends as Euler–Bernoulli with the plane-strain modulus
/// `4 mu` predicts (closed form, wall-pressure balance of DESIGN 3.2):
/// `kappa = p (A_c ybar_c + J) / (4 mu I)`, with `mu = 2 C10 = 24 kPa`, `I` the second
/// moment of the rubber about the layer and `J` the first moment of the wall-pressure
/// profile. Section (mm): chamber 12 × 10, walls 3, floor 3, under-layer 1.
#[test]
fn example_scene_small_pressure_curvature_matches_euler_bernoulli() {
    let run =
        arcfinger(&["bend", "tests/data/design-example.ron", "--pressures", "0.01:0.01:1", "--json", "-"])
            .expect_code(0);
    let k_per_mm = json(&run)["points"][0]["curvature_per_mm"].as_f64().unwrap();
    let (wc, hc, ts, tt, tf, tu) = (12.0f64, 10.0f64, 3.0f64, 3.0f64, 3.0f64, 1.0f64); // mm
    let (y1, y2, y3) = (tf, tf + hc, tf + hc + tt);
    let b = wc + 2.0 * ts;
    let cube = |y: f64| y.powi(3) / 3.0;
    let i = b * (cube(y3) + cube(tu)) - wc * (cube(y2) - cube(y1)); // mm^4
    let j = wc / tt * (y3 * (y3 * y3 - y2 * y2) / 2.0 - (y3.powi(3) - y2.powi(3)) / 3.0)
        + ts * (y2 * y2 - y1 * y1) / 2.0
        + wc * tf * tf / 3.0; // mm^3
    let ac_y = wc * hc * (tf + hc / 2.0); // mm^3
    let (p, mu) = (0.01e-3, 24e-3); // N/mm^2 (MPa)
    let expected = p * (ac_y + j) / (4.0 * mu * i); // 1/mm
    assert!((k_per_mm / expected - 1.0).abs() < 1e-3, "{k_per_mm} vs {expected}");
}

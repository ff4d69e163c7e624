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
        [("scenes/packing-line-3f.ron", "box-100"), ("scenes/packing-line-4f.ron", "round-90")]
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
        (vec!["bend", "scenes/packing-line-3f.ron", "--pressures", "0:90:5"], "above the rated maximum"),
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

//! `arcfinger fab` on the demo scenes: the sheet, the `arcfinger/fab/1` JSON of DESIGN
//! 4.3 and the 1:1 SVG cut templates. The quantities themselves are checked against
//! closed-form solids, the helix length and common practice in the core's tests.

use crate::util::{TempDir, arcfinger, repo};

#[test]
fn demo_scenes_give_sheet_json_and_templates() {
    for (scene, actuator, stem) in [
        ("scenes/packing-line-3f.ron", "box-100", "packing-line-3f"),
        ("scenes/packing-line-4f.ron", "round-100", "packing-line-4f"),
    ] {
        let tmp = TempDir::new(&format!("fab-{actuator}"));
        let out = tmp.path().join("sheet");
        let run =
            arcfinger(&["fab", &repo(scene).display().to_string(), "--out", &out.display().to_string()])
                .expect_code(0);
        assert!(run.stdout.starts_with("# Fabrication sheet") && run.stdout.contains("relief valve"));
        let md = std::fs::read_to_string(out.join(format!("{stem}-fab.md"))).unwrap();
        assert_eq!(md, run.stdout);
        let doc: serde_json::Value =
            serde_json::from_str(&std::fs::read_to_string(out.join(format!("{stem}-fab.json"))).unwrap())
                .unwrap();
        assert_eq!(doc["format"], "arcfinger/fab/1");
        let a = &doc["actuators"][0];
        assert_eq!(a["name"], actuator);
        let total = a["silicone_mass_g"]["total"].as_f64().unwrap();
        let parts = a["silicone_mass_g"]["part_a"].as_f64().unwrap()
            + a["silicone_mass_g"]["part_b"].as_f64().unwrap();
        assert!((total - parts).abs() < 1e-9 && total > a["rubber_volume_ml"].as_f64().unwrap());
        let f = &a["fiber"];
        assert!(f["total_length_mm"].as_f64().unwrap() > 2.0 * f["length_per_helix_mm"].as_f64().unwrap());
        assert_eq!(a["strain_layer_mm"].as_array().unwrap().len(), 2);
        assert_eq!(a["molds"].as_array().unwrap().len(), 3);
        let svg = std::fs::read_to_string(out.join(format!("{stem}-{actuator}-templates-1.svg"))).unwrap();
        let svg_doc = roxmltree::Document::parse(&svg).unwrap();
        assert_eq!(svg_doc.root_element().attribute("viewBox"), Some("0 0 195 265"));
        assert!(svg.contains("strain-limiting sheet") && svg.contains("scale-bar"));
        // nothing drawn outside the page
        for n in svg_doc.descendants().filter(|n| n.has_tag_name("text")) {
            let x: f64 = n.attribute("x").unwrap().parse().unwrap();
            let chars = n.text().unwrap_or("").chars().count() as f64;
            assert!(x + chars * 1.45 <= 195.0, "{:?} runs off the page", n.text());
        }
        let same = arcfinger(&["fab", scene, "--json", "-"]).expect_code(0);
        let again: serde_json::Value = serde_json::from_str(&same.stdout).unwrap();
        assert_eq!(again, doc, "the JSON is the same on stdout and in the folder");
    }
}

#[test]
fn fab_refuses_bad_actuator_and_overwriting_the_scene() {
    let run = arcfinger(&["fab", "scenes/packing-line-3f.ron", "--actuator", "box-10"]).expect_code(2);
    assert!(run.stderr.contains("did you mean \"box-100\""), "{}", run.stderr);
    let tmp = TempDir::new("fab-overwrite");
    let scene = tmp.write("s.ron", &std::fs::read_to_string(repo("tests/data/design-example.ron")).unwrap());
    let before = std::fs::read(&scene).unwrap();
    let run = arcfinger(&["fab", &scene.display().to_string(), "--json", &scene.display().to_string()])
        .expect_code(2);
    assert!(run.stderr.contains("refusing to overwrite"), "{}", run.stderr);
    assert_eq!(std::fs::read(&scene).unwrap(), before);
}

/// A loose wind (12 mm pitch on 3 mm walls) draws the wrap-pitch warning in `bend` and
/// `fab`, and `bend`'s JSON carries the check; the tight demo wind does not warn.
#[test]
fn loose_wind_is_warned_about_in_bend_and_fab() {
    let tmp = TempDir::new("fab-loose");
    let text = std::fs::read_to_string(repo("tests/data/design-example.ron")).unwrap();
    let loose = text.replace("pitch_mm: 4.0", "pitch_mm: 12.0");
    assert_ne!(loose, text);
    let scene = tmp.write("loose.ron", &loose);
    let scene = scene.display().to_string();
    let run = arcfinger(&["bend", &scene, "--pressures", "0:20:10", "--json", "-"]).expect_code(0);
    assert!(
        run.stderr.contains("warning: actuator \"f100\"") && run.stderr.contains("wind at a pitch"),
        "{}",
        run.stderr
    );
    let doc: serde_json::Value = serde_json::from_str(&run.stdout).unwrap();
    assert_eq!(doc["wrap"]["ok"], false);
    assert!(doc["wrap"]["max_safe_pitch_mm"].as_f64().unwrap() < 12.0);
    let fab = arcfinger(&["fab", &scene]).expect_code(0);
    assert!(fab.stderr.contains("wind at a pitch") && fab.stdout.contains("Wind tighter"), "{}", fab.stderr);
    let tight = arcfinger(&["bend", "scenes/packing-line-3f.ron", "--pressures", "0:20:10"]).expect_code(0);
    assert!(!tight.stderr.contains("warning"), "{}", tight.stderr);
    // The demo's box-100: 3 mm walls, 3.5 mm pitch less 1 mm ribbon = 2.5 mm span, Shore
    // 20A class (mu = 338 kPa / 1.75, its 100 % modulus through the neo-Hookean law).
    // Clamped strip plus Timoshenko shear (Timoshenko & Woinowsky-Krieger 1959, ch. 1):
    // the mid-span deflection `q b^4 / (384 D) + q b^2 / (8 k mu t)`, `D = mu t^3 / 3`,
    // `k = 5/6`, reaches `t / 2` at the pressure `q`:
    let (mu, t, b) = (338.0f64 / 1.75, 3.0f64, 2.5f64); // kPa, mm
    let q = (t / 2.0) / (b.powi(4) / (128.0 * mu * t.powi(3)) + 3.0 * b * b / (20.0 * mu * t));
    let expected = format!("wrap pitch: the wall between fiber turns starts to bulge near {q:.0} kPa");
    assert!(tight.stdout.contains(&expected), "{expected}\n{}", tight.stdout);
}

//! `arcfinger fit` end to end: Treloar's (1944) rubber data through the binary, the JSON
//! contract of DESIGN 4.3, the material block, and refusals of bad data.
//!
//! Reference data: L. R. G. Treloar, "Stress-strain data for vulcanised rubber under
//! various types of deformation", Trans. Faraday Soc. 40, 59–70 (1944), in
//! `tests/data/treloar-1944-*.csv` (see `tests/data/README.md`). Comparison: R. W. Ogden,
//! Proc. R. Soc. Lond. A 326, 565–584 (1972), three terms mu = (0.63, 0.0012, -0.01) MPa,
//! alpha = (1.3, 5.0, -2.0) (as commonly quoted; from memory).

use crate::util::{TempDir, arcfinger, repo};

const OGDEN_1972: [(f64, f64); 3] = [(0.63, 1.3), (0.0012, 5.0), (-0.01, -2.0)];

/// Ogden's nominal stress in MPa for `mu` in MPa, closed forms per test (Ogden 1972):
/// `sum mu_k (l^(a_k-1) - l^(-a_k-1) l2^(-a_k))`, `l2 = l^-1/2` (uniaxial), `l`
/// (equibiaxial), `1` (planar).
fn ogden_stress(terms: &[(f64, f64)], mode: &str, l: f64) -> f64 {
    let l2 = match mode {
        "uniaxial" => l.powf(-0.5),
        "equibiaxial" => l,
        "planar" => 1.0,
        other => panic!("mode {other}"),
    };
    terms.iter().map(|&(mu, a)| mu * (l.powf(a - 1.0) - l.powf(-a - 1.0) * l2.powf(-a))).sum()
}

/// Rms relative error of Ogden 1972 at the JSON document's points.
fn ogden_1972_rms(points: &[serde_json::Value]) -> f64 {
    let sum: f64 = points
        .iter()
        .map(|p| {
            let l = p["stretch"].as_f64().unwrap();
            let measured = p["measured_kpa"].as_f64().unwrap() / 1e3;
            let e = (ogden_stress(&OGDEN_1972, p["mode"].as_str().unwrap(), l) - measured) / measured;
            e * e
        })
        .sum();
    (sum / points.len() as f64).sqrt()
}

fn json_of(stdout: &str) -> serde_json::Value {
    serde_json::from_str(stdout).unwrap_or_else(|e| panic!("not JSON ({e}):\n{stdout}"))
}

/// Treloar's three tests in one file, with a `mode` column and the columns reordered.
fn combined_treloar(dir: &TempDir) -> std::path::PathBuf {
    let mut text = String::from("mode,nominal_stress_mpa,stretch\n");
    for (file, mode) in [("ut", "uniaxial"), ("et", "equibiaxial"), ("ps", "planar")] {
        let src = std::fs::read_to_string(repo(&format!("tests/data/treloar-1944-{file}.csv"))).unwrap();
        for line in src.lines().skip(1).filter(|l| !l.trim().is_empty()) {
            let (l, s) = line.split_once(',').unwrap();
            text.push_str(&format!("{mode},{s},{l}\n"));
        }
    }
    dir.write("treloar-all.csv", &text)
}

#[test]
fn ogden3_on_treloar_uniaxial_writes_the_json_contract_and_beats_ogden_1972() {
    let run = arcfinger(&["fit", "tests/data/treloar-1944-ut.csv", "--model", "ogden3", "--json", "-"])
        .expect_code(0);
    let v = json_of(&run.stdout);
    assert_eq!(v["format"], "arcfinger/fit/1");
    let terms = v["model"]["Ogden"]["terms"].as_array().expect("model as serde writes the scene enum");
    assert_eq!(terms.len(), 3);
    for t in terms {
        assert!(t["mu_kpa"].is_f64() && t["alpha"].is_f64(), "{t}");
    }
    let points = v["points"].as_array().unwrap();
    assert_eq!(points.len(), 24);
    for p in points {
        for key in ["mode", "stretch", "measured_kpa", "fitted_kpa"] {
            assert!(p.get(key).is_some(), "{key} missing in {p}");
        }
        assert_eq!(p["mode"], "uniaxial");
    }
    // the file's MPa arrive as kPa: first row 1.02, 0.0255 MPa
    assert_eq!(points[0]["stretch"], 1.02);
    assert!((points[0]["measured_kpa"].as_f64().unwrap() - 25.5).abs() < 1e-9);
    let rms = v["rms_relative_error"].as_f64().unwrap();
    let reference = ogden_1972_rms(points);
    assert!(rms <= reference, "fit {rms} vs Ogden 1972 {reference}");
    // The shear modulus of the fitted terms, 1/2 sum mu_k alpha_k, is what the document says.
    let mu: f64 =
        terms.iter().map(|t| 0.5 * t["mu_kpa"].as_f64().unwrap() * t["alpha"].as_f64().unwrap()).sum();
    assert!((v["shear_modulus_kpa"].as_f64().unwrap() - mu).abs() < 1e-9 * mu);
    // with `--json -` the summary goes to stderr
    assert!(run.stderr.contains("Material block"), "{}", run.stderr);
}

#[test]
fn ogden3_on_all_three_treloar_tests_beats_ogden_1972() {
    let dir = TempDir::new("fit-treloar-all");
    let data = combined_treloar(&dir);
    let run = arcfinger(&["fit", data.to_str().unwrap(), "--model", "ogden3", "--json", "-"]).expect_code(0);
    let v = json_of(&run.stdout);
    let points = v["points"].as_array().unwrap();
    assert_eq!(points.len(), 24 + 16 + 13);
    let rms = v["rms_relative_error"].as_f64().unwrap();
    let reference = ogden_1972_rms(points);
    assert!(rms <= reference, "fit {rms} vs Ogden 1972 {reference}");
    assert_eq!(v["modes"]["equibiaxial"]["points"], 16);
    assert_eq!(v["modes"]["planar"]["points"], 13);
    assert_eq!(v["converged"], true);
}

#[test]
fn summary_and_material_block_on_stdout_and_out_file() {
    let dir = TempDir::new("fit-out");
    let block = dir.path().join("block.ron");
    let run = arcfinger(&[
        "fit",
        "tests/data/treloar-1944-ut.csv",
        "--model",
        "ogden3",
        "--out",
        block.to_str().unwrap(),
        "--name",
        "co-op rubber",
    ])
    .expect_code(0);
    for needle in
        ["Small-strain shear modulus", "Young's modulus", "RMS relative error", "24 uniaxial", "PLACEHOLDER"]
    {
        assert!(run.stdout.contains(needle), "{needle} missing:\n{}", run.stdout);
    }
    let text = std::fs::read_to_string(&block).unwrap();
    assert!(run.stdout.contains(&text), "the printed block is the written block");
    // The block is one entry of a scene's `materials` map: it parses as a RON map.
    let map: ron::Value = ron::from_str(&format!("{{\n{text}}}")).unwrap_or_else(|e| panic!("{e}\n{text}"));
    let ron::Value::Map(map) = map else { panic!("not a map: {text}") };
    let entry = map.get(&ron::Value::String("co-op rubber".into())).expect("entry under --name");
    let s = format!("{entry:?}");
    assert!(s.contains("density_g_cm3") && s.contains("elongation_at_break"), "{s}");
    // elongation at break: a lower bound, the largest uniaxial stretch 7.6 minus 1
    assert!(text.contains("elongation_at_break: 6.6,"), "{text}");
    assert!(text.contains("LOWER BOUND"), "{text}");
}

#[test]
fn density_given_replaces_the_placeholder() {
    let run = arcfinger(&[
        "fit",
        "tests/data/treloar-1944-ut.csv",
        "--model",
        "neo-hookean",
        "--density-g-cm3",
        "1.13",
    ])
    .expect_code(0);
    assert!(run.stdout.contains("density_g_cm3: 1.13,"), "{}", run.stdout);
    assert!(!run.stdout.contains("PLACEHOLDER"), "{}", run.stdout);
    assert!(run.stdout.contains("model: NeoHookean(mu_kpa: "), "{}", run.stdout);
}

#[test]
fn refuses_to_overwrite_the_input() {
    let dir = TempDir::new("fit-overwrite");
    let original = std::fs::read_to_string(repo("tests/data/treloar-1944-ut.csv")).unwrap();
    let data = dir.write("d.csv", &original);
    let p = data.to_str().unwrap();
    for flag in ["--out", "--json"] {
        let run = arcfinger(&["fit", p, "--model", "yeoh2", flag, p]).expect_code(2);
        assert!(run.stderr.contains("refusing to overwrite"), "{}", run.stderr);
        assert_eq!(std::fs::read_to_string(&data).unwrap(), original);
    }
}

#[test]
fn json_to_a_file_and_yeoh_model_shape() {
    let dir = TempDir::new("fit-json-file");
    let out = dir.path().join("r.json");
    arcfinger(&[
        "fit",
        "tests/data/treloar-1944-ut.csv",
        "--model",
        "yeoh3",
        "--json",
        out.to_str().unwrap(),
    ])
    .expect_code(0);
    let v = json_of(&std::fs::read_to_string(&out).unwrap());
    let y = &v["model"]["Yeoh"];
    for key in ["c10_kpa", "c20_kpa", "c30_kpa"] {
        assert!(y[key].is_f64(), "{key}: {v}");
    }
    // Yeoh's small-strain shear modulus is 2 C10
    assert!((v["shear_modulus_kpa"].as_f64().unwrap() - 2.0 * y["c10_kpa"].as_f64().unwrap()).abs() < 1e-9);
}

/// Every bad file exits 2 with `FILE:LINE` (or `FILE:` for an empty file), the column and
/// the expectation on stderr, and never panics.
#[test]
fn bad_csv_files_exit_2_naming_file_line_and_column() {
    let dir = TempDir::new("fit-bad");
    let cases: [(&str, &str, &str); 9] = [
        ("stretch,nominal_stress_kpa\n1.2,10\nabc,12\n", "bad.csv:3:", "column `stretch`: expected a number"),
        ("stretch,nominal_stress_kpa\n1.2,NaN\n", "bad.csv:2:", "expected a finite number"),
        ("stretch,nominal_stress_kpa\n-0.5,3\n", "bad.csv:2:", "expected a stretch > 0"),
        (
            "stretch,nominal_stress_kpa,mode\n1.5,3,torsion\n",
            "bad.csv:2:",
            "expected one of uniaxial, planar, equibiaxial",
        ),
        ("stretch,mode\n1.5,uniaxial\n", "bad.csv:1:", "missing column `nominal_stress_kpa`"),
        ("", "bad.csv:", "the file is empty"),
        (
            "stretch,nominal_stress_kpa,temperature_c\n1.5,3,20\n",
            "bad.csv:1:",
            "valid columns are stretch, nominal_stress_kpa, nominal_stress_mpa, mode",
        ),
        ("stretch,nominal_stress_kpa\n1.5,3\n2.0,0\n", "bad.csv:3:", "zero stress at stretch 2"),
        ("stretch,nominal_stress_kpa\n1.5,3\n2.0,5,7\n", "bad.csv:3:", "expected 2 fields"),
    ];
    for (text, location, expected) in cases {
        dir.write("bad.csv", text);
        let run = crate::util::arcfinger_in(dir.path(), &["fit", "bad.csv", "--model", "mooney-rivlin"])
            .expect_code(2);
        assert!(run.stderr.contains(location), "{location} not in {}", run.stderr);
        assert!(run.stderr.contains(expected), "{expected} not in {}", run.stderr);
        assert!(run.stdout.is_empty(), "{}", run.stdout);
    }
}

#[test]
fn too_few_points_missing_file_and_unknown_model_exit_2() {
    let dir = TempDir::new("fit-usage");
    let few = dir.write("few.csv", "stretch,nominal_stress_kpa\n1.5,3\n2,5\n");
    let run = arcfinger(&["fit", few.to_str().unwrap(), "--model", "ogden2"]).expect_code(2);
    assert!(run.stderr.contains("ogden2 has 4 parameter(s)"), "{}", run.stderr);
    assert!(run.stderr.contains("few.csv"), "{}", run.stderr);
    let run = arcfinger(&["fit", "tests/data/no-such.csv", "--model", "ogden2"]).expect_code(2);
    assert!(run.stderr.contains("tests/data/no-such.csv"), "{}", run.stderr);
    let run = arcfinger(&["fit", "tests/data/treloar-1944-ut.csv", "--model", "ogden4"]).expect_code(2);
    assert!(run.stderr.contains("ogden3"), "the valid names are listed: {}", run.stderr);
}

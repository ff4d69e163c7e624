//! Hardening end to end: the time limit, interrupted runs, hostile names in the
//! reports, and mesh paths outside the scene's folder on request.

use std::path::Path;
use std::time::Duration;

use crate::util::{TempDir, arcfinger, arcfinger_in, repo};

/// Every file name in `dir`, sorted.
fn names(dir: &Path) -> Vec<String> {
    let mut v: Vec<String> = std::fs::read_dir(dir)
        .expect("dir")
        .map(|e| e.expect("entry").file_name().to_string_lossy().into())
        .collect();
    v.sort();
    v
}

/// A check that cannot finish within `--time-limit` ends with exit 3 and says so; the
/// earlier reports are still there, byte for byte, and no temporary file is left. (The
/// bundled demo sweeps 25 pressures for 5 objects: far more than 1 ms of work.)
#[test]
fn a_check_over_its_time_limit_is_unknown_and_keeps_earlier_reports() {
    let tmp = TempDir::new("time-limit");
    let json = tmp.write("report.json", "{\"earlier\": true}\n");
    let md = tmp.write("summary.md", "earlier summary\n");
    let (json_s, md_s) = (json.display().to_string(), md.display().to_string());
    let start = std::time::Instant::now();
    let run =
        arcfinger(&["check", "--json", &json_s, "--markdown", &md_s, "--time-limit", "0.001"]).expect_code(3);
    // a bound on a hang, not a speed target: the limit is 1 ms, the backstop 10 ms later
    assert!(start.elapsed() < Duration::from_secs(60), "took {:?}", start.elapsed());
    assert!(
        run.stderr
            .contains("solver did not converge: the check did not finish within its time limit of 0.001 s"),
        "{}",
        run.stderr
    );
    assert_eq!(std::fs::read_to_string(&json).unwrap(), "{\"earlier\": true}\n");
    assert_eq!(std::fs::read_to_string(&md).unwrap(), "earlier summary\n");
    assert_eq!(names(tmp.path()), ["report.json", "summary.md"]);
    for bad in ["0", "-1", "NaN", "1e9"] {
        let run = arcfinger(&["check", "--time-limit", bad]).expect_code(2);
        assert!(run.stderr.contains("--time-limit: must be a number of seconds above 0"), "{}", run.stderr);
    }
}

/// A run killed in the middle of its work leaves the previous reports as they were:
/// reports are written only at the end, each through a temporary file and a rename.
/// (The robustness study of 1000 samples keeps a release build busy for seconds; the
/// plain demo check finishes in well under the 0.4 s this test waits.)
#[test]
fn an_interrupted_check_leaves_previous_reports_intact() {
    let tmp = TempDir::new("interrupted");
    let json = tmp.write("report.json", "previous json\n");
    let junit = tmp.write("report.xml", "previous xml\n");
    let mut child = std::process::Command::new(env!("CARGO_BIN_EXE_arcfinger"))
        .args(["check", "--robust", "1000", "--json"])
        .arg(&json)
        .arg("--junit")
        .arg(&junit)
        .current_dir(repo(""))
        .stdout(std::process::Stdio::null())
        .stderr(std::process::Stdio::null())
        .spawn()
        .expect("start arcfinger");
    std::thread::sleep(Duration::from_millis(400));
    let finished_early = child.try_wait().expect("poll").is_some();
    let _ = child.kill();
    let _ = child.wait();
    assert!(!finished_early, "the check finished within 0.4 s; this test needs a longer run");
    assert_eq!(std::fs::read_to_string(&json).unwrap(), "previous json\n");
    assert_eq!(std::fs::read_to_string(&junit).unwrap(), "previous xml\n");
    assert_eq!(names(tmp.path()), ["report.json", "report.xml"]);
}

/// Names from a scene file reach every report escaped for its format: the Markdown table
/// keeps its columns and renders no HTML, link, emphasis or mention; the JUnit XML is
/// well-formed and holds the name as text; the JSON holds it exactly; the terminal table
/// shows it without markup changes. (The ball scene of `check.rs`, renamed.)
#[test]
fn hostile_names_are_escaped_in_every_report() {
    let tmp = TempDir::new("hostile-names");
    let evil_object = "<img src=x onerror=alert(1)>|**x**|[a](http://e)`@team";
    let evil_scene = "</testsuite><script>&amp;";
    let text = std::fs::read_to_string(repo("tests/data/check-ball-3f.ron"))
        .unwrap()
        .replacen("name: \"ball\"", &format!("name: {evil_object:?}"), 1)
        .replacen("name: \"check-ball-3f\"", &format!("name: {evil_scene:?}"), 1);
    let scene = tmp.write("evil.ron", &text);
    let (md, xml, json) = (tmp.path().join("s.md"), tmp.path().join("r.xml"), tmp.path().join("r.json"));
    let run = arcfinger_in(
        tmp.path(),
        &["check", "evil.ron", "--markdown", "s.md", "--junit", "r.xml", "--json", "r.json"],
    );
    assert!(run.code == 0 || run.code == 1, "exit {}: {}", run.code, run.stderr);
    let md = std::fs::read_to_string(md).unwrap();
    assert!(!md.contains("<img") && !md.contains("<script") && !md.replace("\\]", "").contains("]("), "{md}");
    assert!(
        md.contains("&lt;img src=x onerror=alert(1)&gt;\\|\\*\\*x\\*\\*\\|\\[a\\](http://e)\\`\\@team"),
        "{md}"
    );
    // the object's row has as many cell separators as the header
    let header = md.lines().find(|l| l.starts_with("| object |")).expect("table header");
    let row = md.lines().find(|l| l.contains("onerror")).expect("object row");
    let cells = |l: &str| l.replace("\\|", "").matches('|').count();
    assert_eq!(cells(row), cells(header), "{row}");
    let xml = std::fs::read_to_string(xml).unwrap();
    let doc = roxmltree::Document::parse(&xml).expect("well-formed JUnit XML");
    assert!(doc.descendants().any(|n| n.attribute("name") == Some(evil_object)), "{xml}");
    assert!(doc.descendants().any(|n| n.attribute("name").is_some_and(|v| v.contains(evil_scene))), "{xml}");
    let json: serde_json::Value = serde_json::from_str(&std::fs::read_to_string(json).unwrap()).unwrap();
    assert_eq!(json["objects"][0]["name"], evil_object);
    assert_eq!(json["scene"], evil_scene);
    assert_eq!(std::fs::read_to_string(&scene).unwrap(), text, "the input was changed");
}

/// Mesh paths outside the scene's folder are refused unless `--allow-outside-meshes`
/// is given; with it, `..` and absolute paths are read (and checked like any mesh).
#[test]
fn meshes_outside_the_folder_need_the_flag() {
    let tmp = TempDir::new("outside-meshes");
    tmp.write(
        "shared/tetra.obj",
        "v 0 0 0\nv 20 0 0\nv 0 20 0\nv 0 0 20\nf 1 3 2\nf 1 2 4\nf 1 4 3\nf 2 3 4\n",
    );
    let example = std::fs::read_to_string(repo("tests/data/design-example.ron")).unwrap();
    let abs = tmp.path().join("shared/tetra.obj").display().to_string();
    for (name, path) in [("up", "../shared/tetra.obj".to_string()), ("abs", abs)] {
        let text =
            example.replacen("Sphere(radius_mm: 25.0)", &format!("Mesh(path: {path:?}, scale: 1.0)"), 1);
        let file = format!("scenes/{name}.ron");
        tmp.write(&file, &text);
        let args = ["bend", file.as_str(), "--actuator", "f100", "--pressures", "0:20:10"];
        let refused = arcfinger_in(tmp.path(), &args).expect_code(2);
        assert!(refused.stderr.contains("objects[0].shape.path"), "{}", refused.stderr);
        let mut with_flag = args.to_vec();
        with_flag.push("--allow-outside-meshes");
        let run = arcfinger_in(tmp.path(), &with_flag).expect_code(0);
        assert!(run.stdout.contains("f100"), "{}", run.stdout);
    }
    // the flag lifts the folder rule only: a broken mesh is still refused
    tmp.write("shared/open.obj", "v 0 0 0\nv 20 0 0\nv 0 20 0\nf 1 2 3\n");
    let text =
        example.replacen("Sphere(radius_mm: 25.0)", "Mesh(path: \"../shared/open.obj\", scale: 1.0)", 1);
    tmp.write("scenes/open.ron", &text);
    let run = arcfinger_in(
        tmp.path(),
        &["bend", "scenes/open.ron", "--actuator", "f100", "--allow-outside-meshes"],
    )
    .expect_code(2);
    assert!(run.stderr.contains("is not a closed surface"), "{}", run.stderr);
}

/// An exit code of the contract (0 to 3) and no panic.
fn by_contract(input: &Path, run: &crate::util::Run) {
    assert!((0..=3).contains(&run.code), "{}: exit {}\n{}", input.display(), run.code, run.stderr);
    assert!(!run.stderr.contains("panicked"), "{}: {}", input.display(), run.stderr);
}

/// What the fuzz targets found (tests/data/fuzz-regressions/, see its README) runs on
/// every build: each input must end with an exit code of the contract and no panic, a
/// check within its time limit.
#[test]
fn fuzz_findings_end_with_a_contract_exit_code() {
    let root = repo("tests/data/fuzz-regressions");
    let files = |sub: &str| -> Vec<std::path::PathBuf> {
        let Ok(dir) = std::fs::read_dir(root.join(sub)) else { return Vec::new() };
        let mut v: Vec<_> = dir.map(|e| e.expect("entry").path()).filter(|p| p.is_file()).collect();
        v.sort();
        v
    };
    let mut ran = 0;
    for f in files("check") {
        let start = std::time::Instant::now();
        by_contract(&f, &arcfinger(&["check", &f.display().to_string(), "--time-limit", "2"]));
        // a bound on a hang (2 s limit, 0.2 s grace), not a speed target
        assert!(start.elapsed() < Duration::from_secs(30), "{}: {:?}", f.display(), start.elapsed());
        ran += 1;
    }
    let tmp = TempDir::new("fuzz-findings");
    for f in files("scene") {
        std::fs::copy(&f, tmp.path().join("scene.ron")).expect("copy");
        by_contract(&f, &arcfinger_in(tmp.path(), &["bend", "scene.ron"]));
        ran += 1;
    }
    let example = std::fs::read_to_string(repo("tests/data/design-example.ron")).unwrap();
    for f in files("mesh") {
        let bytes = std::fs::read(&f).expect("read");
        let Some((&kind, mesh)) = bytes.split_first() else { continue };
        let name = if kind % 2 == 0 { "m.stl" } else { "m.obj" };
        std::fs::write(tmp.path().join(name), mesh).expect("write");
        let text =
            example.replacen("Sphere(radius_mm: 25.0)", &format!("Mesh(path: \"{name}\", scale: 1.0)"), 1);
        tmp.write("mesh.ron", &text);
        by_contract(&f, &arcfinger_in(tmp.path(), &["bend", "mesh.ron", "--actuator", "f100"]));
        ran += 1;
    }
    assert!(ran > 0, "no fuzz findings to run");
}

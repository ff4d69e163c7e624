//! `arcfinger review`: the HTML report is one well-formed, self-contained file with its
//! charts inlined and user text escaped; the Markdown summary escapes too; bad usage is
//! exit 2. (No browser here: a headless-browser screenshot test needs Chromium in CI.)

use crate::util::{TempDir, arcfinger_in, repo};

#[test]
fn review_of_two_candidates_is_self_contained_and_escaped() {
    let tmp = TempDir::new("review-two");
    let hostile = "ball <script>alert(1)</script> & \"co\"";
    let text = std::fs::read_to_string(repo("tests/data/check-ball-3f.ron"))
        .unwrap()
        .replace("name: \"check-ball-3f\"", &format!("name: \"{}\"", hostile.replace('"', "\\\"")))
        .replace("radius_mm: 65.0, tilt_deg: 0.0", "radius_mm: 60.0, tilt_deg: -3.0");
    let b = tmp.write("b.ron", &text);
    let a = repo("tests/data/check-ball-3f.ron");
    let run = arcfinger_in(
        tmp.path(),
        &["review", &a.display().to_string(), &b.display().to_string(), "--out", "rv"],
    );
    let run = run.expect_code(1); // neither candidate holds the ball with the margin asked
    assert!(run.stderr.contains("wrote rv/review.html and rv/review.md"), "{}", run.stderr);
    let page = std::fs::read_to_string(tmp.path().join("rv/review.html")).unwrap();
    let doc = roxmltree::Document::parse_with_options(
        &page,
        roxmltree::ParsingOptions { allow_dtd: true, ..Default::default() },
    )
    .expect("well-formed markup");
    let count = |tag: &str| doc.descendants().filter(|n| n.tag_name().name() == tag).count();
    assert_eq!(count("script"), 0, "no script, not even from a scene name");
    // the window chart and one bend chart per candidate
    assert_eq!(count("svg"), 3);
    assert!(!page.contains("src=\"http") && !page.contains("href=\"http"), "no external resources");
    let titles: Vec<String> = doc
        .descendants()
        .filter(|n| n.tag_name().name() == "h3")
        .map(|n| n.text().unwrap_or("").to_string())
        .collect();
    assert!(titles.iter().any(|t| t == &format!("C2: {hostile}")), "{titles:?}");
    let verdicts = doc.descendants().find(|n| n.attribute("id") == Some("verdicts")).unwrap();
    let rows: Vec<_> = verdicts.children().filter(|n| n.tag_name().name() == "tr").collect();
    assert_eq!(rows.len(), 2, "a header and the ball");
    assert!(page.contains("Pressurised elastomers can rupture"));
    let md = std::fs::read_to_string(tmp.path().join("rv/review.md")).unwrap();
    assert!(md.contains("ball &lt;script&gt;alert(1)&lt;/script&gt; &amp; \"co\""), "{md}");
    assert!(md.contains("| ball | FAIL | FAIL |"), "{md}");
    // the fabrication table repeats the fabrication sheet's own figures for each
    // candidate's actuator (what `arcfinger fab --json` says for the same scene)
    let fab = arcfinger_in(tmp.path(), &["fab", &a.display().to_string(), "--json", "-"]).expect_code(0);
    let fab: serde_json::Value = serde_json::from_str(&fab.stdout).unwrap();
    let sheet = &fab["actuators"][0];
    let table =
        doc.descendants().find(|n| n.attribute("id") == Some("fabrication")).expect("a fabrication table");
    let cells: Vec<Vec<String>> = table
        .children()
        .filter(|n| n.tag_name().name() == "tr")
        .skip(1)
        .map(|r| {
            r.children().filter(|n| n.is_element()).map(|c| c.text().unwrap_or("").to_string()).collect()
        })
        .collect();
    assert_eq!(cells.len(), 2, "one actuator per candidate: {cells:?}");
    for (k, row) in cells.iter().enumerate() {
        assert_eq!(row[0], format!("C{}", k + 1));
        assert_eq!(row[1], sheet["name"].as_str().unwrap());
        assert_eq!(row[2], "3", "three fingers");
        let number = |i: usize| row[i].parse::<f64>().unwrap();
        assert!((number(3) - sheet["rubber_volume_ml"].as_f64().unwrap()).abs() <= 0.05, "{row:?}");
        let per_finger = sheet["silicone_mass_g"]["total"].as_f64().unwrap();
        assert!((number(4) - per_finger).abs() <= 0.05, "{row:?}");
        assert!((number(5) - 3.0 * per_finger).abs() <= 0.05, "{row:?}");
        assert!((number(6) - sheet["fiber"]["total_length_mm"].as_f64().unwrap() * 1e-3).abs() <= 0.005);
        assert!(row[7].contains("required"), "{row:?}");
    }
    assert!(md.contains("Fabrication, per finger"), "{md}");
}

#[test]
fn review_usage_errors_exit_2() {
    let tmp = TempDir::new("review-bad");
    let a = repo("tests/data/check-ball-3f.ron").display().to_string();
    let seven: Vec<&str> = std::iter::once("review").chain(std::iter::repeat_n(a.as_str(), 7)).collect();
    let run = arcfinger_in(tmp.path(), &seven).expect_code(2);
    assert!(run.stderr.contains("review compares 1 to 6 scenes, got 7"), "{}", run.stderr);
    let run = arcfinger_in(tmp.path(), &["review", "missing.ron"]).expect_code(2);
    assert!(run.stderr.contains("cannot read scene file missing.ron"), "{}", run.stderr);
    assert_eq!(std::fs::read_dir(tmp.path()).unwrap().count(), 0, "nothing written");
}

/// A Chromium-family browser on PATH, if any.
fn browser() -> Option<std::path::PathBuf> {
    let path = std::env::var_os("PATH")?;
    ["chromium", "chromium-browser", "google-chrome"]
        .iter()
        .flat_map(|name| std::env::split_paths(&path).map(move |d| d.join(name)))
        .find(|p| p.is_file())
}

/// Runs the headless browser on `page` with `args`; returns its stderr.
fn headless(
    browser: &std::path::Path,
    dir: &std::path::Path,
    page: &std::path::Path,
    args: &[&str],
) -> (String, String) {
    let out = std::process::Command::new(browser)
        .args([
            "--headless",
            "--no-sandbox",
            "--disable-gpu",
            "--no-first-run",
            "--enable-logging=stderr",
            "--v=0",
        ])
        .arg(format!("--user-data-dir={}", dir.join("profile").display()))
        .args(args)
        .arg(format!("file://{}", page.display()))
        .output()
        .expect("run the browser");
    (String::from_utf8_lossy(&out.stdout).into_owned(), String::from_utf8_lossy(&out.stderr).into_owned())
}

/// Console errors and refused resources in a browser log.
fn console_errors(log: &str) -> Vec<&str> {
    log.lines()
        .filter(|l| {
            (l.contains("CONSOLE") && (l.contains("Uncaught") || l.contains("rror")))
                || l.contains("Refused to")
                || l.contains("Failed to load")
        })
        .collect()
}

/// The report as a reviewer sees it: headless Chromium draws it to a screenshot with no
/// console errors, and the page it built holds the charts. Where no browser is
/// installed the test says so and passes, unless `ARCFINGER_REQUIRE_BROWSER` is set
/// (CI sets it and installs Chromium). The error detector is itself checked on a page
/// with a broken script.
#[test]
fn review_renders_in_headless_chromium_without_console_errors() {
    let Some(browser) = browser() else {
        assert!(
            std::env::var_os("ARCFINGER_REQUIRE_BROWSER").is_none(),
            "ARCFINGER_REQUIRE_BROWSER is set but no chromium is on PATH"
        );
        eprintln!("no chromium on PATH: the browser check of the review did not run");
        return;
    };
    let tmp = TempDir::new("review-browser");
    let a = repo("tests/data/check-ball-3f.ron").display().to_string();
    arcfinger_in(tmp.path(), &["review", &a, "--out", "rv"]).expect_code(1);
    let page = tmp.path().join("rv/review.html");
    let shot = tmp.path().join("shot.png");
    let (_, log) = headless(
        &browser,
        tmp.path(),
        &page,
        &[&format!("--screenshot={}", shot.display()), "--window-size=1280,2000"],
    );
    let png = std::fs::read(&shot).unwrap_or_else(|_| panic!("no screenshot; browser log:\n{log}"));
    assert!(png.starts_with(b"\x89PNG\r\n\x1a\n") && png.len() > 20_000, "{} bytes", png.len());
    assert_eq!(console_errors(&log), Vec::<&str>::new(), "browser log:\n{log}");
    let (dom, _) = headless(&browser, tmp.path(), &page, &["--dump-dom"]);
    assert_eq!(dom.matches("<svg").count(), 2, "the window chart and the bend chart");
    assert!(dom.contains("id=\"verdicts\""));
    // the candidate's picture: a PNG from the offscreen renderer in a viewer build (unless
    // the machine has no Vulkan driver and CI does not require one), else the slot's note
    let images = dom.matches("src=\"data:image/png;base64,iVBORw0KGgo").count();
    let no_vulkan = dom.contains("No picture: no Vulkan adapter");
    if cfg!(feature = "viewer") && !(no_vulkan && std::env::var_os("ARCFINGER_REQUIRE_VIEWER").is_none()) {
        assert_eq!(images, 1, "one rendered picture per candidate");
        assert!(dom.contains("holding \"ball\""), "the caption names the object");
    } else {
        assert_eq!(images, 0);
        assert!(dom.contains("No picture: "), "the slot says why there is no picture");
    }
    // the detector sees a broken page's error
    let broken = tmp.write(
        "broken.html",
        "<!DOCTYPE html><html><body><script>undefined_function()</script></body></html>",
    );
    let (_, log) = headless(&browser, tmp.path(), &broken, &["--dump-dom"]);
    assert!(!console_errors(&log).is_empty(), "a broken script must show up; log:\n{log}");
}

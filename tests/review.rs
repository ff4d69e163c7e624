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

//! JUnit XML (through `quick-junit`), so CI systems list the check's results in their
//! own test panels.
//!
//! One `<testsuites>` named `arcfinger check`, one `<testsuite>` per scene (named after
//! the scene), one `<testcase>` per object (named after the object, `classname` = the
//! scene's name). A failing object carries a `<failure>` whose `message` is its reasons
//! on one line (`; ` between them) and whose `type` is the kind of the first failure; the
//! element's text has one reason per line and the object's numbers. An object whose
//! solve did not converge is an `<error>` of type `not-converged` (its result is
//! unknown, which CI systems show apart from a failure). Every case's `<system-out>`
//! holds its numbers, so a passing case shows its margins too. The suite carries the
//! scene file, pressure and verdict as properties and the recommendation in its
//! `<system-out>`.
//!
//! No timestamps or durations are written: the same report gives the same bytes.
//! Characters that XML 1.0 cannot hold (control characters, U+FFFE, U+FFFF) are dropped
//! from names and messages; the rest is escaped by the serialiser.

use std::io;

use grasp_core::check::{CheckReport, ObjectReport};
use quick_junit::{NonSuccessKind, Property, Report, TestCase, TestCaseStatus, TestSuite};

use super::{Context, Status, failure_kind, fixed, object_status, overall_status, percent, window_kpa};

/// Name of the `<testsuites>` element.
pub const REPORT_NAME: &str = "arcfinger check";

/// Drops characters XML 1.0 cannot contain (quick-junit drops the control characters;
/// U+FFFE and U+FFFF are dropped here).
fn xml_text(s: &str) -> String {
    s.chars().filter(|c| !matches!(c, '\u{fffe}' | '\u{ffff}')).collect()
}

/// The object's numbers, one line.
fn numbers(o: &ObjectReport) -> String {
    format!(
        "fingers in contact {}; enclosure {}; epsilon {}; holding margin lift {}, lateral {}; \
         peak contact force {} N; pressure window {}",
        o.fingers_in_contact,
        percent(o.enclosure),
        fixed(o.epsilon, 3),
        fixed(o.holding.lift, 2),
        fixed(o.holding.lateral_min, 2),
        fixed(o.peak_contact_force, 2),
        match o.pressure_window {
            Some(_) => format!("{} kPa", window_kpa(o.pressure_window, " to ")),
            None => "none".to_string(),
        },
    )
}

fn case(r: &CheckReport, o: &ObjectReport) -> TestCase {
    let status = match object_status(o) {
        Status::Pass => TestCaseStatus::success(),
        st => {
            let kind = if st == Status::Unknown { NonSuccessKind::Error } else { NonSuccessKind::Failure };
            let reasons: Vec<String> = o.failures.iter().map(ToString::to_string).collect();
            let ty = if st == Status::Unknown {
                "not-converged"
            } else {
                o.failures.first().map_or("fail", failure_kind)
            };
            let message = if reasons.is_empty() { "fails".to_string() } else { reasons.join("; ") };
            let mut text = String::new();
            for line in &reasons {
                text.push_str(line);
                text.push('\n');
            }
            text.push_str(&numbers(o));
            let mut status = TestCaseStatus::non_success(kind);
            status.set_message(xml_text(&message)).set_type(ty).set_description(xml_text(&text));
            status
        }
    };
    let mut case = TestCase::new(xml_text(&o.name), status);
    case.set_classname(xml_text(&r.scene)).set_system_out(numbers(o));
    case
}

/// The JUnit report (for callers that want to add to it).
pub fn report(r: &CheckReport, ctx: &Context) -> Report {
    let mut suite = TestSuite::new(xml_text(&r.scene));
    suite.add_properties([
        Property::new("scene_file", xml_text(&ctx.scene_file)),
        Property::new("pressure_kpa", fixed(r.pressure / 1e3, 1)),
        Property::new("verdict", overall_status(r).word().to_ascii_lowercase()),
        Property::new(
            "recommended_pressure_kpa",
            r.recommended_pressure.map_or_else(|| "none".to_string(), |p| fixed(p / 1e3, 1)),
        ),
    ]);
    suite.add_test_cases(r.objects.iter().map(|o| case(r, o)));
    suite.set_system_out(xml_text(&super::recommendation(r, str::to_string)));
    let mut report = Report::new(REPORT_NAME);
    report.add_test_suite(suite);
    report
}

/// The XML text.
///
/// # Errors
/// Only if the serialiser fails, which it does not when writing to memory.
pub fn to_string(r: &CheckReport, ctx: &Context) -> Result<String, quick_junit::SerializeError> {
    report(r, ctx).to_string()
}

/// Writes the XML to `w`.
///
/// # Errors
/// Write failures of `w`.
pub fn write(r: &CheckReport, ctx: &Context, mut w: impl io::Write) -> io::Result<()> {
    let text = to_string(r, ctx).map_err(io::Error::other)?;
    w.write_all(text.as_bytes())
}

#[cfg(test)]
mod tests {
    use super::super::test_support::{self, BAD, SCENE};
    use super::*;

    /// Parses the XML with an independent reader (roxmltree), so well-formedness is not
    /// judged by the library that wrote it.
    fn xml(r: &CheckReport) -> String {
        to_string(r, &Context::new("scenes/<a>&b.ron")).unwrap()
    }

    #[test]
    fn xml_is_well_formed_with_one_suite_and_a_case_per_object() {
        let text = xml(&test_support::report());
        let doc = roxmltree::Document::parse(&text).unwrap_or_else(|e| panic!("{e}\n{text}"));
        let root = doc.root_element();
        assert_eq!(root.tag_name().name(), "testsuites");
        assert_eq!(root.attribute("name"), Some(REPORT_NAME));
        assert_eq!((root.attribute("tests"), root.attribute("failures")), (Some("2"), Some("1")));
        let suites: Vec<_> = root.children().filter(|n| n.has_tag_name("testsuite")).collect();
        assert_eq!(suites.len(), 1);
        assert_eq!(suites[0].attribute("name"), Some(SCENE));
        let prop = |name: &str| {
            suites[0]
                .descendants()
                .find(|n| n.has_tag_name("property") && n.attribute("name") == Some(name))
                .and_then(|n| n.attribute("value"))
        };
        assert_eq!(prop("scene_file"), Some("scenes/<a>&b.ron"));
        assert_eq!(prop("pressure_kpa"), Some("40.0"));
        assert_eq!(prop("verdict"), Some("fail"));
        assert_eq!(prop("recommended_pressure_kpa"), Some("none"));
        let cases: Vec<_> = suites[0].children().filter(|n| n.has_tag_name("testcase")).collect();
        let names: Vec<_> = cases.iter().map(|c| c.attribute("name").unwrap()).collect();
        assert_eq!(names, ["peach", BAD]);
        assert!(cases.iter().all(|c| c.attribute("classname") == Some(SCENE)));
        // the passing case has no failure but shows its numbers
        assert!(!cases[0].children().any(|n| n.has_tag_name("failure") || n.has_tag_name("error")));
        let out = cases[0].children().find(|n| n.has_tag_name("system-out")).unwrap().text().unwrap();
        assert!(out.contains("enclosure 62 %") && out.contains("pressure window 20.0 to 47.5 kPa"), "{out}");
    }

    #[test]
    fn failure_carries_every_reason_with_its_numbers() {
        let text = xml(&test_support::report());
        let doc = roxmltree::Document::parse(&text).unwrap();
        let failure = doc.descendants().find(|n| n.has_tag_name("failure")).unwrap();
        assert_eq!(failure.parent().unwrap().attribute("name"), Some(BAD));
        let message = failure.attribute("message").unwrap();
        assert!(message.starts_with("1 finger(s) in contact, 2 required; enclosure 12 %"), "{message}");
        assert!(
            message.contains("exceeds the limit of 10.00 N by 1.50 N; fingers interfere: 1-2"),
            "{message}"
        );
        assert!(!message.contains('\n'));
        assert_eq!(failure.attribute("type"), Some("too-few-fingers"));
        let body = failure.text().unwrap();
        assert_eq!(body.lines().count(), 6, "{body}");
        assert!(body.contains("holding margin 0.22 in the lateral +y case, 2.00 required\n"), "{body}");
        assert!(body.ends_with("peak contact force 11.50 N; pressure window none"), "{body}");
    }

    #[test]
    fn unconverged_object_is_an_error_not_a_failure() {
        let text = xml(&test_support::unconverged());
        let doc = roxmltree::Document::parse(&text).unwrap();
        assert!(doc.descendants().all(|n| !n.has_tag_name("failure")));
        let error = doc.descendants().find(|n| n.has_tag_name("error")).unwrap();
        assert_eq!(error.attribute("type"), Some("not-converged"));
        assert!(
            error
                .attribute("message")
                .unwrap()
                .ends_with("solver did not converge: the closing solve of finger 2")
        );
        assert_eq!(doc.root_element().attribute("errors"), Some("1"));
    }

    #[test]
    fn characters_xml_cannot_hold_are_dropped_and_the_rest_escaped() {
        let mut r = test_support::report();
        r.objects[0].name = "pe\u{1b}[31mach\u{0}\u{ffff}\u{7}".to_string();
        let text = xml(&r);
        let doc = roxmltree::Document::parse(&text).unwrap_or_else(|e| panic!("{e}\n{text}"));
        let first = doc.descendants().find(|n| n.has_tag_name("testcase")).unwrap();
        assert_eq!(first.attribute("name"), Some("peach"));
        // the raw text never holds a bare markup character from a name
        assert!(!text.contains("<b>") && text.contains("&lt;b&gt;&amp;amp;"), "{text}");
    }

    #[test]
    fn writes_are_byte_identical_and_match_to_string() {
        let r = test_support::report();
        let ctx = Context::new("x.ron");
        let (mut a, mut b) = (Vec::new(), Vec::new());
        write(&r, &ctx, &mut a).unwrap();
        write(&r, &ctx, &mut b).unwrap();
        assert_eq!(a, b);
        assert_eq!(a, to_string(&r, &ctx).unwrap().into_bytes());
        assert!(!String::from_utf8(a).unwrap().contains("timestamp"));
    }
}

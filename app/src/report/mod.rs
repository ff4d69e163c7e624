//! Writers of the grasp check's result (`grasp_core::check::CheckReport`), one module per
//! format:
//!
//! | module | format | for |
//! | --- | --- | --- |
//! | [`json`] | `arcfinger/check/1` (DESIGN 4.3) | programs |
//! | [`junit`] | JUnit XML, one suite per scene, one case per object | CI test panels |
//! | [`markdown`] | a pull-request comment | reviewers |
//! | [`table`] | a compact terminal table, colour on a terminal only | the person at the shell |
//!
//! Every writer takes the report and a [`Context`] (where the scene came from) and
//! writes to any `io::Write` or returns a `String`. Output is deterministic: objects,
//! fingers and contacts in report order, no clock, no map iteration, fixed float
//! formatting in the human-read formats (the JSON keeps full precision, in serde_json's
//! shortest round-trip form). Units are converted from the core's SI here and only here:
//! Pa → kPa, m → mm, rad → degrees.
//!
//! User-supplied text (scene and object names, the scene path) is escaped for each
//! format: JSON and XML by their serialisers, Markdown by [`markdown::escape`], and the
//! terminal by [`table::sanitize`] (control characters are shown, never sent).

pub mod json;
pub mod junit;
pub mod markdown;
pub mod robust;
pub mod table;

use grasp_core::check::{CheckReport, Failure, ObjectReport, Verdict};

/// Where the checked scene came from, shown in every report, and what was studied
/// besides the check itself.
#[derive(Debug, Clone, PartialEq)]
pub struct Context {
    /// The scene file as named on the command line, or a label for the bundled demo.
    pub scene_file: String,
    /// The robustness study of `--robust N`, when run.
    pub robust: Option<grasp_core::check::robust::RobustReport>,
}

impl Context {
    /// A context for the scene file `scene_file`.
    pub fn new(scene_file: impl Into<String>) -> Self {
        Self { scene_file: scene_file.into(), robust: None }
    }
}

/// How an object (or the whole check) came out, as the human-read reports say it.
///
/// The JSON keeps DESIGN 4.3's two verdicts and adds `converged`; the readable formats
/// tell "failed" from "unknown" because the remedies differ (change the design, or
/// change the solver settings).
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Status {
    /// Every criterion holds.
    Pass,
    /// Some criterion fails.
    Fail,
    /// A solve did not converge: the result is unknown (never a pass).
    Unknown,
}

impl Status {
    /// The word shown for it: `PASS`, `FAIL`, `UNKNOWN` (never colour alone).
    pub fn word(self) -> &'static str {
        match self {
            Self::Pass => "PASS",
            Self::Fail => "FAIL",
            Self::Unknown => "UNKNOWN",
        }
    }
}

/// Whether `o` has a failure that says a solve did not converge.
pub fn not_converged(o: &ObjectReport) -> bool {
    o.failures.iter().any(|f| matches!(f, Failure::NotConverged { .. }))
}

/// The status of one object: unknown when a solve did not converge, whatever its verdict.
pub fn object_status(o: &ObjectReport) -> Status {
    if not_converged(o) {
        Status::Unknown
    } else if o.verdict == Verdict::Pass {
        Status::Pass
    } else {
        Status::Fail
    }
}

/// The status of the whole check: unknown if any object is; a pass only when the
/// report's verdict and every object's verdict are a pass.
pub fn overall_status(r: &CheckReport) -> Status {
    let statuses: Vec<Status> = r.objects.iter().map(object_status).collect();
    if statuses.contains(&Status::Unknown) {
        Status::Unknown
    } else if r.verdict == Verdict::Pass && statuses.iter().all(|&s| s == Status::Pass) {
        Status::Pass
    } else {
        Status::Fail
    }
}

/// A short machine name for a failure's kind, used as the JSON `kind` and the JUnit
/// failure `type`.
pub fn failure_kind(f: &Failure) -> &'static str {
    f.kind()
}

/// `x` with `prec` decimals, or `n/a` when it is not finite.
pub fn fixed(x: f64, prec: usize) -> String {
    if x.is_finite() { format!("{x:.prec$}") } else { "n/a".to_string() }
}

/// A fraction as a whole percentage, `62 %`.
pub fn percent(x: f64) -> String {
    if x.is_finite() { format!("{:.0} %", x * 100.0) } else { "n/a".to_string() }
}

/// A pressure window (Pa) in kPa with one decimal, `20.0{sep}47.5`, or `none`.
pub fn window_kpa(w: Option<(f64, f64)>, sep: &str) -> String {
    match w {
        Some((lo, hi)) => format!("{}{sep}{}", fixed(lo / 1e3, 1), fixed(hi / 1e3, 1)),
        None => "none".to_string(),
    }
}

/// What the report says about a single supply pressure for all objects, as one
/// sentence; object names go through `name` (each format escapes its own way).
pub fn recommendation(r: &CheckReport, name: impl Fn(&str) -> String) -> String {
    if let Some(p) = r.recommended_pressure {
        return format!(
            "Recommended supply pressure: {} kPa, the middle of the widest range of swept pressures at which every object passes.",
            fixed(p / 1e3, 1)
        );
    }
    if !r.clashes.is_empty() {
        let pairs: Vec<String> =
            r.clashes.iter().map(|(a, b)| format!("{} and {}", name(a), name(b))).collect();
        return format!(
            "No single supply pressure serves every object: the pressure windows of {} do not overlap.",
            pairs.join("; ")
        );
    }
    let none: Vec<String> =
        r.objects.iter().filter(|o| o.pressure_window.is_none()).map(|o| name(&o.name)).collect();
    if none.is_empty() {
        "No recommended supply pressure.".to_string()
    } else {
        format!(
            "No recommended supply pressure: no swept pressure lets {} pass (or the scene has no sweep).",
            none.join(", ")
        )
    }
}

/// The cautions of DESIGN 3.6, short, for report footers.
pub const CAUTIONS: &str = "Estimates for design, not a certification. Pressurised elastomers can rupture \
without warning: use a regulator and a relief valve set at or below the rated pressure, wear eye protection, \
and never exceed the rated pressure. Food or skin contact needs a material certified for it; grippers working \
near people must meet the applicable robot-safety standards and local codes.";

#[cfg(test)]
pub(crate) mod test_support {
    //! A hand-built report for the writer tests. Its numbers are invented inputs, not
    //! results of the check: the tests check formatting, escaping, schema and
    //! determinism, never physics.

    use grasp_core::check::{
        CheckReport, ContactReport, Failure, FingerReport, HoldingMargins, ObjectReport, Verdict,
    };
    use grasp_core::math::Vec3;

    /// A scene name with every character that needs escaping somewhere.
    pub const SCENE: &str = "co-op | line <3f> & \"trial\"";
    /// The failing object's name, with the same kind of characters and a backtick.
    pub const BAD: &str = "egg | `large` <b>&amp; \"xl\"";

    /// Two objects: "peach" passes; [`BAD`] fails five criteria.
    pub fn report() -> CheckReport {
        let finger = |index: usize, az: f64, interferes_with: Vec<usize>| FingerReport {
            index,
            actuator: "box-100".to_string(),
            free_bend: 1.25,
            tip: Vec3::new(0.041 * az.cos(), 0.041 * az.sin(), -0.082),
            max_stretch: 1.21,
            interferes_with,
        };
        let contact = |finger: usize, element: usize, force: f64| ContactReport {
            finger,
            element,
            point: Vec3::new(0.034, 0.0, -0.075),
            normal: Vec3::new(-1.0, 0.0, 0.0),
            normal_force: force,
        };
        CheckReport {
            scene: SCENE.to_string(),
            pressure: 40_000.0,
            verdict: Verdict::Fail,
            fingers: vec![
                finger(0, 0.0, vec![]),
                finger(1, 2.0943951023931953, vec![2]),
                finger(2, 4.1887902047863905, vec![1]),
            ],
            objects: vec![
                ObjectReport {
                    name: "peach".to_string(),
                    verdict: Verdict::Pass,
                    failures: vec![],
                    fingers_in_contact: 3,
                    contacts: vec![contact(0, 31, 1.5), contact(1, 31, 1.25), contact(2, 40, 2.0)],
                    enclosure: 0.625,
                    epsilon: 0.0412,
                    holding: HoldingMargins { lift: 2.4125, lateral_min: 2.1 },
                    peak_contact_force: 2.0,
                    pressure_window: Some((20_000.0, 47_500.0)),
                },
                ObjectReport {
                    name: BAD.to_string(),
                    verdict: Verdict::Fail,
                    failures: vec![
                        Failure::TooFewFingers { got: 1, need: 2 },
                        Failure::Enclosure { got: 0.125, need: 0.4 },
                        Failure::Holding { case: "lateral +y".to_string(), margin: 0.22, need: 2.0 },
                        Failure::ContactForce { peak: 11.5, limit: 10.0 },
                        Failure::Interference { pairs: vec![(1, 2)] },
                    ],
                    fingers_in_contact: 1,
                    contacts: vec![contact(0, 40, 11.5)],
                    enclosure: 0.125,
                    epsilon: 0.0,
                    holding: HoldingMargins { lift: 0.75, lateral_min: 0.22 },
                    peak_contact_force: 11.5,
                    pressure_window: None,
                },
            ],
            recommended_pressure: None,
            clashes: vec![],
        }
    }

    /// [`report`] with every object passing and a recommended pressure.
    pub fn passing() -> CheckReport {
        let mut r = report();
        r.verdict = Verdict::Pass;
        r.objects.truncate(1);
        r.recommended_pressure = Some(35_000.0);
        r
    }

    /// [`report`] where a solve of the failing object did not converge.
    pub fn unconverged() -> CheckReport {
        let mut r = report();
        r.objects[1].failures.push(Failure::NotConverged { what: "the closing solve of finger 2".into() });
        r
    }
}

#[cfg(test)]
mod tests {
    use super::test_support::*;
    use super::*;

    #[test]
    fn statuses_combine_unknown_over_fail_over_pass() {
        assert_eq!(overall_status(&passing()), Status::Pass);
        assert_eq!(overall_status(&report()), Status::Fail);
        assert_eq!(overall_status(&unconverged()), Status::Unknown);
        assert_eq!(object_status(&unconverged().objects[1]), Status::Unknown);
        assert_eq!(object_status(&unconverged().objects[0]), Status::Pass);
        // a report whose top verdict fails is no pass even if every object passes
        let mut r = passing();
        r.verdict = Verdict::Fail;
        assert_eq!(overall_status(&r), Status::Fail);
        // nor is a top pass with a failing object
        let mut r = report();
        r.verdict = Verdict::Pass;
        assert_eq!(overall_status(&r), Status::Fail);
    }

    #[test]
    fn numbers_are_fixed_and_non_finite_is_not_a_number() {
        assert_eq!(fixed(2.4125, 2), "2.41");
        assert_eq!(fixed(f64::NAN, 2), "n/a");
        assert_eq!(fixed(f64::INFINITY, 1), "n/a");
        assert_eq!(percent(0.625), "62 %");
        assert_eq!(window_kpa(Some((20_000.0, 47_500.0)), "-"), "20.0-47.5");
        assert_eq!(window_kpa(None, "-"), "none");
    }

    #[test]
    fn recommendation_names_the_pressure_the_clashes_or_the_objects_without_a_window() {
        assert!(recommendation(&passing(), str::to_string).contains("35.0 kPa"));
        let mut r = report();
        r.clashes = vec![("peach".into(), "jar".into())];
        let s = recommendation(&r, |n| format!("<{n}>"));
        assert!(s.contains("windows of <peach> and <jar> do not overlap"), "{s}");
        let s = recommendation(&report(), |n| format!("<{n}>"));
        assert!(s.contains(&format!("no swept pressure lets <{BAD}> pass")), "{s}");
    }
}

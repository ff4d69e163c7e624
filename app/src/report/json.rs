//! The `arcfinger/check/1` JSON document of DESIGN 4.3.
//!
//! Keys and their order follow DESIGN 4.3; the extra keys come after them in each
//! object: `scene_file`, `converged` and `clashes` at the top, `converged` and
//! `failures` (structured, with `kind` and the numbers) per object, `element` per
//! contact. Units are the keys' suffixes: `_mm`, `_kpa`, `_deg`, `_n` (newtons);
//! unsuffixed numbers are dimensionless (`normal` is a unit vector into the object,
//! `enclosure` a fraction, `holding.*` load scales). Points are in the gripper frame.
//!
//! Numbers keep full precision (serde_json's shortest round-trip form). A number that
//! is not finite (NaN or infinite, which a solver should never hand over) is written as
//! `null`, by this module and not left to the serialiser, so the document is always
//! valid JSON and a reader can tell "unknown" from a value; `null` for
//! `pressure_window_kpa` or `recommended_pressure_kpa` means "none".

use std::io;

use grasp_core::check::{CheckReport, ContactReport, Failure, FingerReport, ObjectReport};
use grasp_core::math::Vec3;
use serde::Serialize;

use super::{Context, not_converged};

/// The `format` value.
pub const FORMAT: &str = "arcfinger/check/1";

/// A finite number, or `None` (written `null`).
fn num(x: f64) -> Option<f64> {
    x.is_finite().then_some(x)
}

fn mm(v: Vec3) -> [Option<f64>; 3] {
    [num(v.x * 1e3), num(v.y * 1e3), num(v.z * 1e3)]
}

fn unit(v: Vec3) -> [Option<f64>; 3] {
    [num(v.x), num(v.y), num(v.z)]
}

/// The document.
#[derive(Debug, Serialize)]
struct CheckDoc<'a> {
    format: &'static str,
    /// Scene name.
    scene: &'a str,
    pressure_kpa: Option<f64>,
    verdict: &'static str,
    fingers: Vec<FingerDoc<'a>>,
    objects: Vec<ObjectDoc<'a>>,
    recommended_pressure_kpa: Option<f64>,
    /// The scene file as named on the command line (or the bundled demo's label).
    scene_file: &'a str,
    /// `false` when any solve did not converge (exit code 3).
    converged: bool,
    /// Pairs of objects whose pressure windows do not overlap.
    clashes: Vec<[&'a str; 2]>,
    /// The robustness study (`--robust N`), when run.
    #[serde(skip_serializing_if = "Option::is_none")]
    robust: Option<super::robust::RobustDoc>,
}

#[derive(Debug, Serialize)]
struct FingerDoc<'a> {
    index: usize,
    actuator: &'a str,
    free_bend_deg: Option<f64>,
    tip_mm: [Option<f64>; 3],
    max_stretch: Option<f64>,
    interferes_with: &'a [usize],
}

#[derive(Debug, Serialize)]
struct ObjectDoc<'a> {
    name: &'a str,
    verdict: &'static str,
    reasons: Vec<String>,
    fingers_in_contact: usize,
    contacts: Vec<ContactDoc>,
    enclosure: Option<f64>,
    epsilon: Option<f64>,
    holding: HoldingDoc,
    peak_contact_force_n: Option<f64>,
    pressure_window_kpa: Option<[Option<f64>; 2]>,
    converged: bool,
    failures: Vec<FailureDoc<'a>>,
}

#[derive(Debug, Serialize)]
struct ContactDoc {
    finger: usize,
    point_mm: [Option<f64>; 3],
    normal: [Option<f64>; 3],
    normal_force_n: Option<f64>,
    /// Rod element (0-based; the tip cap is the element count).
    element: usize,
}

#[derive(Debug, Serialize)]
struct HoldingDoc {
    lift: Option<f64>,
    lateral_min: Option<f64>,
}

/// One failed criterion with its numbers, `kind` first.
#[derive(Debug, Serialize)]
#[serde(tag = "kind", rename_all = "kebab-case")]
enum FailureDoc<'a> {
    TooFewFingers { got: usize, need: usize },
    Enclosure { got: Option<f64>, need: Option<f64> },
    Holding { case: &'a str, margin: Option<f64>, need: Option<f64> },
    ContactForce { peak_n: Option<f64>, limit_n: Option<f64>, excess_n: Option<f64> },
    DoesNotFit { obstacle: &'a str, depth_mm: Option<f64> },
    Interference { pairs: Vec<[usize; 2]> },
    NotConverged { what: &'a str },
}

impl<'a> FailureDoc<'a> {
    fn new(f: &'a Failure) -> Self {
        match f {
            Failure::TooFewFingers { got, need } => Self::TooFewFingers { got: *got, need: *need },
            Failure::Enclosure { got, need } => Self::Enclosure { got: num(*got), need: num(*need) },
            Failure::Holding { case, margin, need } => {
                Self::Holding { case, margin: num(*margin), need: num(*need) }
            }
            Failure::ContactForce { peak, limit } => {
                Self::ContactForce { peak_n: num(*peak), limit_n: num(*limit), excess_n: num(peak - limit) }
            }
            Failure::DoesNotFit { obstacle, depth } => {
                Self::DoesNotFit { obstacle, depth_mm: num(depth * 1e3) }
            }
            Failure::Interference { pairs } => {
                Self::Interference { pairs: pairs.iter().map(|&(a, b)| [a, b]).collect() }
            }
            Failure::NotConverged { what } => Self::NotConverged { what },
        }
    }
}

fn finger(f: &FingerReport) -> FingerDoc<'_> {
    FingerDoc {
        index: f.index,
        actuator: &f.actuator,
        free_bend_deg: num(f.free_bend.to_degrees()),
        tip_mm: mm(f.tip),
        max_stretch: num(f.max_stretch),
        interferes_with: &f.interferes_with,
    }
}

fn contact(c: &ContactReport) -> ContactDoc {
    ContactDoc {
        finger: c.finger,
        point_mm: mm(c.point),
        normal: unit(c.normal),
        normal_force_n: num(c.normal_force),
        element: c.element,
    }
}

fn object(o: &ObjectReport) -> ObjectDoc<'_> {
    ObjectDoc {
        name: &o.name,
        verdict: o.verdict.name(),
        reasons: o.failures.iter().map(ToString::to_string).collect(),
        fingers_in_contact: o.fingers_in_contact,
        contacts: o.contacts.iter().map(contact).collect(),
        enclosure: num(o.enclosure),
        epsilon: num(o.epsilon),
        holding: HoldingDoc { lift: num(o.holding.lift), lateral_min: num(o.holding.lateral_min) },
        peak_contact_force_n: num(o.peak_contact_force),
        pressure_window_kpa: o.pressure_window.map(|(lo, hi)| [num(lo / 1e3), num(hi / 1e3)]),
        converged: !not_converged(o),
        failures: o.failures.iter().map(FailureDoc::new).collect(),
    }
}

fn document<'a>(r: &'a CheckReport, ctx: &'a Context) -> CheckDoc<'a> {
    CheckDoc {
        format: FORMAT,
        scene: &r.scene,
        pressure_kpa: num(r.pressure / 1e3),
        verdict: r.verdict.name(),
        fingers: r.fingers.iter().map(finger).collect(),
        objects: r.objects.iter().map(object).collect(),
        recommended_pressure_kpa: r.recommended_pressure.and_then(|p| num(p / 1e3)),
        scene_file: &ctx.scene_file,
        converged: !r.objects.iter().any(not_converged),
        clashes: r.clashes.iter().map(|(a, b)| [a.as_str(), b.as_str()]).collect(),
        robust: ctx.robust.as_ref().map(super::robust::RobustDoc::of),
    }
}

/// The document as pretty-printed JSON with a final newline.
///
/// # Errors
/// Only if serde_json fails, which it does not for this document (string keys only).
pub fn to_string(report: &CheckReport, ctx: &Context) -> Result<String, serde_json::Error> {
    let mut text = serde_json::to_string_pretty(&document(report, ctx))?;
    text.push('\n');
    Ok(text)
}

/// Writes the document to `w`.
///
/// # Errors
/// Write failures of `w`.
pub fn write(report: &CheckReport, ctx: &Context, mut w: impl io::Write) -> io::Result<()> {
    let text = to_string(report, ctx).map_err(io::Error::other)?;
    w.write_all(text.as_bytes())
}

#[cfg(test)]
mod tests {
    use super::super::test_support::{self, BAD, SCENE};
    use super::*;
    use serde_json::Value;

    fn parsed(r: &CheckReport) -> Value {
        let text = to_string(r, &Context::new("scenes/a|b.ron")).unwrap();
        serde_json::from_str(&text).unwrap_or_else(|e| panic!("not JSON ({e}):\n{text}"))
    }

    /// A JSON value that keeps its keys in document order (serde_json's `Value` sorts
    /// them) and refuses duplicate keys.
    #[derive(Debug, serde::Deserialize)]
    #[serde(untagged)]
    enum Node {
        Obj(crate::ordered_map::OrderedMap<Node>),
        Arr(Vec<Node>),
        Leaf(#[expect(dead_code, reason = "only the keys are compared")] Value),
    }

    impl std::ops::Index<&str> for Node {
        type Output = Node;
        fn index(&self, key: &str) -> &Node {
            match self {
                Node::Obj(m) => m.get(key).unwrap_or_else(|| panic!("no key {key}")),
                _ => panic!("not an object"),
            }
        }
    }

    impl std::ops::Index<usize> for Node {
        type Output = Node;
        fn index(&self, i: usize) -> &Node {
            match self {
                Node::Arr(v) => &v[i],
                _ => panic!("not an array"),
            }
        }
    }

    fn keys(v: &Node) -> Vec<&str> {
        match v {
            Node::Obj(m) => m.keys().collect(),
            _ => panic!("not an object: {v:?}"),
        }
    }

    fn close(v: &Value, x: f64) -> bool {
        v.as_f64().is_some_and(|y| (y - x).abs() <= 1e-9 * x.abs().max(1.0))
    }

    /// The keys of DESIGN 4.3, in its order, then ours; and nothing else.
    #[test]
    fn keys_are_exactly_design_4_3_plus_the_documented_extras() {
        let text = to_string(&test_support::report(), &Context::new("a.ron")).unwrap();
        let doc: Node = serde_json::from_str(&text).unwrap();
        assert_eq!(
            keys(&doc),
            [
                "format",
                "scene",
                "pressure_kpa",
                "verdict",
                "fingers",
                "objects",
                "recommended_pressure_kpa",
                "scene_file",
                "converged",
                "clashes"
            ]
        );
        assert_eq!(
            keys(&doc["fingers"][0]),
            ["index", "actuator", "free_bend_deg", "tip_mm", "max_stretch", "interferes_with"]
        );
        assert_eq!(
            keys(&doc["objects"][0]),
            [
                "name",
                "verdict",
                "reasons",
                "fingers_in_contact",
                "contacts",
                "enclosure",
                "epsilon",
                "holding",
                "peak_contact_force_n",
                "pressure_window_kpa",
                "converged",
                "failures"
            ]
        );
        assert_eq!(
            keys(&doc["objects"][0]["contacts"][0]),
            ["finger", "point_mm", "normal", "normal_force_n", "element"]
        );
        assert_eq!(keys(&doc["objects"][0]["holding"]), ["lift", "lateral_min"]);
    }

    /// SI in the report, the suffix's unit in the document.
    #[test]
    fn values_are_converted_to_the_units_of_the_key_suffixes() {
        let r = test_support::report();
        let doc = parsed(&r);
        assert_eq!(doc["format"], "arcfinger/check/1");
        assert_eq!(doc["scene"], SCENE);
        assert_eq!(doc["scene_file"], "scenes/a|b.ron");
        assert!(close(&doc["pressure_kpa"], 40.0));
        assert_eq!(doc["verdict"], "fail");
        let f1 = &doc["fingers"][1];
        assert_eq!(f1["index"], 1);
        assert_eq!(f1["actuator"], "box-100");
        assert!(close(&f1["free_bend_deg"], 1.25f64.to_degrees()));
        assert!(close(&f1["tip_mm"][2], -82.0));
        assert!(close(&f1["tip_mm"][0], 41.0 * 2.0943951023931953f64.cos()));
        assert!(close(&f1["max_stretch"], 1.21));
        assert_eq!(f1["interferes_with"], serde_json::json!([2]));
        let peach = &doc["objects"][0];
        assert_eq!(peach["verdict"], "pass");
        assert_eq!(peach["reasons"], serde_json::json!([]));
        assert_eq!(peach["fingers_in_contact"], 3);
        let c = &peach["contacts"][2];
        assert_eq!((c["finger"].as_u64(), c["element"].as_u64()), (Some(2), Some(40)));
        assert!(close(&c["point_mm"][0], 34.0) && close(&c["point_mm"][2], -75.0));
        assert!(close(&c["normal"][0], -1.0) && close(&c["normal_force_n"], 2.0));
        assert!(close(&peach["enclosure"], 0.625) && close(&peach["epsilon"], 0.0412));
        assert!(close(&peach["holding"]["lift"], 2.4125) && close(&peach["holding"]["lateral_min"], 2.1));
        assert!(close(&peach["peak_contact_force_n"], 2.0));
        assert!(
            close(&peach["pressure_window_kpa"][0], 20.0) && close(&peach["pressure_window_kpa"][1], 47.5)
        );
        assert_eq!(doc["recommended_pressure_kpa"], Value::Null);
        let passing = parsed(&test_support::passing());
        assert!(close(&passing["recommended_pressure_kpa"], 35.0));
        assert_eq!(passing["verdict"], "pass");
    }

    /// Reasons are the failures' own sentences (with the amounts); `failures` carries the
    /// same numbers structured.
    #[test]
    fn failing_object_has_reasons_and_structured_failures() {
        let doc = parsed(&test_support::report());
        let bad = &doc["objects"][1];
        assert_eq!(bad["name"], BAD);
        assert_eq!(bad["verdict"], "fail");
        assert_eq!(bad["pressure_window_kpa"], Value::Null);
        let reasons: Vec<&str> =
            bad["reasons"].as_array().unwrap().iter().map(|v| v.as_str().unwrap()).collect();
        assert_eq!(
            reasons,
            [
                "1 finger(s) in contact, 2 required",
                "enclosure 12 % of escape directions, 40 % required",
                "holding margin 0.22 in the lateral +y case, 2.00 required",
                "peak contact force 11.50 N exceeds the limit of 10.00 N by 1.50 N",
                "fingers interfere: 1-2",
            ]
        );
        let f = bad["failures"].as_array().unwrap();
        let kinds: Vec<&str> = f.iter().map(|x| x["kind"].as_str().unwrap()).collect();
        assert_eq!(kinds, ["too-few-fingers", "enclosure", "holding", "contact-force", "interference"]);
        // the same names as the JUnit failure types
        let r = test_support::report();
        let theirs: Vec<&str> = r.objects[1].failures.iter().map(super::super::failure_kind).collect();
        assert_eq!(kinds, theirs);
        assert_eq!((f[0]["got"].as_u64(), f[0]["need"].as_u64()), (Some(1), Some(2)));
        assert_eq!(f[2]["case"], "lateral +y");
        assert!(
            close(&f[3]["peak_n"], 11.5) && close(&f[3]["limit_n"], 10.0) && close(&f[3]["excess_n"], 1.5)
        );
        assert_eq!(f[4]["pairs"], serde_json::json!([[1, 2]]));
        assert_eq!(bad["converged"], true);
        assert_eq!(doc["converged"], true);
        let doc = parsed(&test_support::unconverged());
        assert_eq!(doc["converged"], false);
        assert_eq!(doc["objects"][0]["converged"], true);
        assert_eq!(doc["objects"][1]["converged"], false);
        assert_eq!(doc["objects"][1]["failures"][5]["kind"], "not-converged");
        assert_eq!(doc["objects"][1]["failures"][5]["what"], "the closing solve of finger 2");
    }

    #[test]
    fn non_finite_numbers_become_null_and_the_document_stays_json() {
        let mut r = test_support::report();
        r.objects[0].epsilon = f64::NAN;
        r.objects[0].holding.lift = f64::INFINITY;
        r.fingers[0].tip.x = f64::NEG_INFINITY;
        r.objects[0].pressure_window = Some((f64::NAN, 47_500.0));
        let doc = parsed(&r);
        assert_eq!(doc["objects"][0]["epsilon"], Value::Null);
        assert_eq!(doc["objects"][0]["holding"]["lift"], Value::Null);
        assert_eq!(doc["fingers"][0]["tip_mm"][0], Value::Null);
        assert_eq!(doc["objects"][0]["pressure_window_kpa"][0], Value::Null);
        assert!(close(&doc["objects"][0]["pressure_window_kpa"][1], 47.5));
    }

    #[test]
    fn clashes_are_pairs_of_names() {
        let mut r = test_support::report();
        r.clashes = vec![("peach".into(), BAD.into())];
        assert_eq!(parsed(&r)["clashes"], serde_json::json!([["peach", BAD]]));
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
        assert!(a.ends_with(b"}\n"));
    }
}

//! The search-space file (RON): its schema, parsing and validation against the scene.
//!
//! `docs/search-spaces.md` describes the format for users. Values are in file units (mm,
//! degrees, kPa, with the unit in the field name); [`load`] checks them with field paths
//! in its messages, the way scene files are checked, and converts them to the SI
//! [`SearchSpace`] of `grasp_core::sweep`.

use grasp_core::sweep::{Axis, LayoutFamily, Refinement, Sampling, SearchSpace};
use serde::{Deserialize, Serialize};

use crate::error::AppError;
use crate::scene_doc::SceneDoc;
use crate::suggest::nearest;

/// Most sweep pressures per candidate (the check's cost grows with each).
pub const MAX_PRESSURES: usize = 200;

/// Largest search-space file read (bytes).
const MAX_SPACE_BYTES: u64 = 1024 * 1024;

/// `SearchSpace(...)`, the top level.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
#[serde(rename = "SearchSpace", deny_unknown_fields)]
pub struct SpaceDoc {
    /// A name for reports.
    pub name: String,
    /// Layout families to try.
    pub layouts: Vec<LayoutDoc>,
    /// Mount radius of the fingers (mm).
    pub radius_mm: AxisDoc,
    /// Tilt of the fingers, positive = splayed outward (deg).
    pub tilt_deg: AxisDoc,
    /// Azimuth of the first finger (deg), default `Values([0.0])`.
    #[serde(default = "zero_axis")]
    pub azimuth_offset_deg: AxisDoc,
    /// Actuator names from the scene.
    pub actuators: Vec<String>,
    /// Supply pressures over which the windows are found: `(from, to, step)` (kPa).
    pub pressures_kpa: (f64, f64, f64),
    /// Pressure of the per-object verdicts and margins (kPa); default: the scene's
    /// `criteria.pressure_kpa`.
    #[serde(default)]
    pub check_pressure_kpa: Option<f64>,
    /// How the first round is drawn.
    pub sampling: SamplingDoc,
    /// Refinement rounds around the best candidates.
    #[serde(default)]
    pub refine: Option<RefineDoc>,
    /// Seed of the Latin hypercubes (default 1).
    #[serde(default = "one")]
    pub seed: u64,
}

fn zero_axis() -> AxisDoc {
    AxisDoc::Values(vec![0.0])
}

fn one() -> u64 {
    1
}

/// The values of one parameter.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
pub enum AxisDoc {
    /// `Range(from, to)`: any value in between, both ends included.
    Range(f64, f64),
    /// `Values([a, b, ...])`: one of these.
    Values(Vec<f64>),
}

/// A layout family.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub enum LayoutDoc {
    /// `Ring(fingers: [3, 4])`: evenly spaced fingers.
    Ring {
        /// Finger counts.
        fingers: Vec<usize>,
    },
    /// `OpposedPairs(pairs: [2], spread_deg: Range(20.0, 50.0))`: two fans facing each
    /// other.
    OpposedPairs {
        /// Pair counts.
        pairs: Vec<usize>,
        /// Azimuth between neighbours of a fan (deg).
        spread_deg: AxisDoc,
    },
}

/// How the first round is drawn.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub enum SamplingDoc {
    /// `Grid(steps: 4)`: every combination, each range in `steps` values.
    Grid {
        /// Values per range.
        steps: usize,
    },
    /// `LatinHypercube(samples: 200)`.
    LatinHypercube {
        /// Number of candidates.
        samples: usize,
    },
}

/// Refinement rounds.
#[derive(Debug, Clone, Copy, PartialEq, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct RefineDoc {
    /// Rounds after the first.
    pub rounds: usize,
    /// Parents per round.
    pub best: usize,
    /// Candidates per parent.
    pub samples: usize,
    /// Box around a parent in round r: `shrink^r` of each range.
    pub shrink: f64,
}

/// A validated search space with what the application needs besides the core's part.
#[derive(Debug, Clone, PartialEq)]
pub struct Space {
    /// The space as written.
    pub doc: SpaceDoc,
    /// The SI space of the core.
    pub core: SearchSpace,
    /// Actuator names, by scene index.
    pub actuator_names: Vec<String>,
    /// `(from, to, step)` of the sweep (kPa).
    pub pressures_kpa: (f64, f64, f64),
    /// Pressure of the verdicts and margins (kPa).
    pub check_pressure_kpa: f64,
}

struct Checker {
    problems: Vec<String>,
}

impl Checker {
    fn push(&mut self, path: impl std::fmt::Display, msg: impl std::fmt::Display) {
        self.problems.push(format!("{path}: {msg}"));
    }

    /// An axis in file units, each value passing `ok` (described by `expected`); in SI
    /// after `to_si`.
    fn axis(
        &mut self,
        path: &str,
        a: &AxisDoc,
        ok: impl Fn(f64) -> bool,
        expected: &str,
        to_si: impl Fn(f64) -> f64,
    ) -> Option<Axis> {
        let check = |me: &mut Self, p: String, v: f64| {
            if v.is_finite() && ok(v) {
                true
            } else {
                me.push(p, format!("must be {expected}, got {v}"));
                false
            }
        };
        match a {
            AxisDoc::Range(from, to) => {
                let good =
                    check(self, format!("{path}.from"), *from) & check(self, format!("{path}.to"), *to);
                if good && from > to {
                    self.push(format!("{path}.to"), format!("must be >= from ({from}), got {to}"));
                    return None;
                }
                good.then(|| Axis::Range { from: to_si(*from), to: to_si(*to) })
            }
            AxisDoc::Values(v) => {
                if v.is_empty() {
                    self.push(path, "must list at least one value, got none");
                    return None;
                }
                let mut good = true;
                for (i, x) in v.iter().enumerate() {
                    good &= check(self, format!("{path}[{i}]"), *x);
                }
                good.then(|| Axis::Values(v.iter().map(|x| to_si(*x)).collect()))
            }
        }
    }

    fn counts(&mut self, path: &str, counts: &[usize], max: usize, per: usize, min_fingers: usize) {
        if counts.is_empty() {
            self.push(path, "must list at least one count, got none");
        }
        for (i, &c) in counts.iter().enumerate() {
            if c == 0 || c > max {
                self.push(format!("{path}[{i}]"), format!("must be between 1 and {max}, got {c}"));
            } else if c * per < min_fingers {
                self.push(
                    format!("{path}[{i}]"),
                    format!(
                        "{} finger(s) can never meet the scene's criteria.min_fingers_in_contact of {min_fingers}",
                        c * per
                    ),
                );
            }
        }
    }
}

/// Largest axis extreme of an axis doc.
fn axis_max(a: &AxisDoc) -> f64 {
    match a {
        AxisDoc::Range(f, t) => f.max(*t),
        AxisDoc::Values(v) => v.iter().copied().fold(f64::NEG_INFINITY, f64::max),
    }
}

/// Validates `doc` against the scene and converts it.
///
/// # Errors
/// Every problem, one per line, as `PATH: must be ..., got ...`.
pub fn validate(doc: &SpaceDoc, scene: &SceneDoc) -> Result<Space, Vec<String>> {
    let mut ch = Checker { problems: Vec::new() };
    let min_fingers = scene.criteria.min_fingers_in_contact as usize;
    if doc.layouts.is_empty() {
        ch.push("layouts", "must list at least one layout, got none");
    }
    let mut layouts = Vec::new();
    for (i, l) in doc.layouts.iter().enumerate() {
        match l {
            LayoutDoc::Ring { fingers } => {
                ch.counts(&format!("layouts[{i}].fingers"), fingers, 64, 1, min_fingers);
                layouts.push(LayoutFamily::Ring { fingers: fingers.clone() });
            }
            LayoutDoc::OpposedPairs { pairs, spread_deg } => {
                ch.counts(&format!("layouts[{i}].pairs"), pairs, 32, 2, min_fingers);
                let path = format!("layouts[{i}].spread_deg");
                let spread =
                    ch.axis(&path, spread_deg, |v| v > 0.0 && v < 180.0, "> 0 and < 180", f64::to_radians);
                let most = pairs.iter().copied().max().unwrap_or(1);
                let widest = axis_max(spread_deg);
                if spread.is_some() && most > 1 && (most - 1) as f64 * widest >= 180.0 {
                    ch.push(
                        &path,
                        format!(
                            "(pairs - 1) x spread must be < 180 so the two fans do not meet; \
                             {most} pairs at {widest} deg give {}",
                            (most - 1) as f64 * widest
                        ),
                    );
                }
                if let Some(spread) = spread {
                    layouts.push(LayoutFamily::OpposedPairs { pairs: pairs.clone(), spread });
                }
            }
        }
    }
    let radius = ch.axis(
        "radius_mm",
        &doc.radius_mm,
        |v| v > 0.0 && v <= 10_000.0,
        "> 0 and at most 10000 (mm)",
        |v| v * 1e-3,
    );
    let tilt = ch.axis(
        "tilt_deg",
        &doc.tilt_deg,
        |v| v > -90.0 && v < 90.0,
        "between -90 and 90 (both excluded)",
        f64::to_radians,
    );
    let azimuth =
        ch.axis("azimuth_offset_deg", &doc.azimuth_offset_deg, |_| true, "a finite number", f64::to_radians);
    // actuators: names of the scene, each once
    let names: Vec<&str> = scene.actuators.keys().collect();
    let mut actuators = Vec::new();
    if doc.actuators.is_empty() {
        ch.push("actuators", "must name at least one actuator of the scene, got none");
    }
    let mut rating = f64::INFINITY;
    for (i, a) in doc.actuators.iter().enumerate() {
        match names.iter().position(|n| n == a) {
            Some(k) if actuators.contains(&k) => {
                ch.push(format!("actuators[{i}]"), format!("\"{a}\" is listed twice"))
            }
            Some(k) => {
                actuators.push(k);
                if let Some(d) = scene.actuators.get(a) {
                    rating = rating.min(d.max_pressure_kpa);
                }
            }
            None => {
                let hint = nearest(a, names.iter().copied())
                    .map(|s| format!("did you mean \"{s}\"? "))
                    .unwrap_or_default();
                ch.push(
                    format!("actuators[{i}]"),
                    format!("\"{a}\" is not an actuator of the scene; {hint}(defined: {})", names.join(", ")),
                );
            }
        }
    }
    let (from, to, step) = doc.pressures_kpa;
    let mut pressures_ok = true;
    for (field, v, ok, expected) in [
        ("from", from, from >= 0.0, ">= 0"),
        ("to", to, to >= from, "finite and >= from"),
        ("step", step, step > 0.0, "> 0"),
    ] {
        if !(v.is_finite() && ok) {
            ch.push(format!("pressures_kpa.{field}"), format!("must be {expected}, got {v}"));
            pressures_ok = false;
        }
    }
    if pressures_ok {
        let n = ((to - from) / step + 1e-6).floor() + 1.0;
        if n > MAX_PRESSURES as f64 {
            ch.push(
                "pressures_kpa",
                format!("must give at most {MAX_PRESSURES} pressures, got {n}; use a larger step"),
            );
        }
        if to > rating {
            ch.push(
                "pressures_kpa.to",
                format!("must not exceed {rating} kPa, the lowest max_pressure_kpa of the listed actuators, got {to}"),
            );
        }
    }
    let check_pressure_kpa = doc.check_pressure_kpa.unwrap_or(scene.criteria.pressure_kpa);
    let check_path = if doc.check_pressure_kpa.is_some() {
        "check_pressure_kpa"
    } else {
        "check_pressure_kpa (from the scene's criteria.pressure_kpa)"
    };
    if !(check_pressure_kpa.is_finite() && check_pressure_kpa >= 0.0 && check_pressure_kpa <= rating) {
        ch.push(
            check_path,
            format!("must be between 0 and {rating} kPa (the lowest rating of the listed actuators), got {check_pressure_kpa}"),
        );
    }
    let sampling = match doc.sampling {
        SamplingDoc::Grid { steps } => {
            if steps == 0 {
                ch.push("sampling.steps", "must be >= 1, got 0");
            }
            Sampling::Grid { steps }
        }
        SamplingDoc::LatinHypercube { samples } => {
            if samples == 0 {
                ch.push("sampling.samples", "must be >= 1, got 0");
            }
            Sampling::LatinHypercube { samples }
        }
    };
    let refine = doc.refine.map(|r| {
        for (field, v) in [("rounds", r.rounds), ("best", r.best), ("samples", r.samples)] {
            if v == 0 {
                ch.push(format!("refine.{field}"), "must be >= 1, got 0");
            }
        }
        if !(r.shrink > 0.0 && r.shrink <= 1.0) {
            ch.push("refine.shrink", format!("must be > 0 and <= 1, got {}", r.shrink));
        }
        Refinement { rounds: r.rounds, best: r.best, samples: r.samples, shrink: r.shrink }
    });
    let (Some(radius), Some(tilt), Some(azimuth_offset)) = (radius, tilt, azimuth) else {
        return Err(ch.problems);
    };
    if !ch.problems.is_empty() {
        return Err(ch.problems);
    }
    let core =
        SearchSpace { layouts, radius, tilt, azimuth_offset, actuators, sampling, refine, seed: doc.seed };
    if let Err(e) = core.first_round_len() {
        return Err(vec![format!("the space: {e}")]);
    }
    Ok(Space {
        doc: doc.clone(),
        core,
        actuator_names: names.iter().map(|s| s.to_string()).collect(),
        pressures_kpa: doc.pressures_kpa,
        check_pressure_kpa,
    })
}

/// Reads, parses and validates the space file at `path` against `scene`; returns the
/// space and the file's bytes (for the fingerprint).
///
/// # Errors
/// [`AppError::Io`] when it cannot be read, [`AppError::Input`] with `FILE:LINE:COL` when
/// it does not parse and `FILE: PATH: ...` per problem when it does not validate.
pub fn load(path: &std::path::Path, scene: &SceneDoc) -> Result<(Space, Vec<u8>), AppError> {
    let shown = path.display().to_string();
    let meta = std::fs::metadata(path)
        .map_err(|e| AppError::io(format!("cannot read search-space file {shown}"), e))?;
    if meta.is_dir() || meta.len() > MAX_SPACE_BYTES {
        return Err(AppError::input(format!(
            "{shown}: not a search-space file (a folder, or over {MAX_SPACE_BYTES} bytes)"
        )));
    }
    let bytes =
        std::fs::read(path).map_err(|e| AppError::io(format!("cannot read search-space file {shown}"), e))?;
    let text = std::str::from_utf8(&bytes)
        .map_err(|_| AppError::input(format!("{shown}: the file is not UTF-8 text (save it as UTF-8)")))?;
    let text = text.strip_prefix('\u{feff}').unwrap_or(text);
    let doc: SpaceDoc = ron::from_str(text)
        .map_err(|e| AppError::Input(crate::scene_file::parse_error_message(&shown, text, &e)))?;
    let space = validate(&doc, scene).map_err(|p| {
        AppError::Input(p.iter().map(|m| format!("{shown}: {m}")).collect::<Vec<_>>().join("\n"))
    })?;
    Ok((space, bytes))
}

#[cfg(test)]
mod tests {
    use super::*;

    fn scene() -> SceneDoc {
        ron::from_str(include_str!("../../../../scenes/packing-line-3f.ron")).unwrap()
    }

    const SPACE: &str = include_str!("../../../../scenes/packing-line-space.ron");

    #[test]
    fn the_demo_space_validates_and_converts_to_si() {
        let doc: SpaceDoc = ron::from_str(SPACE).unwrap();
        let s = validate(&doc, &scene()).unwrap();
        assert_eq!(s.actuator_names, ["box-100"]);
        assert!(s.core.first_round_len().unwrap() > 0);
        match &s.core.radius {
            Axis::Range { from, to } => assert!(*from > 0.0 && *to < 0.1, "mm to m"),
            Axis::Values(_) => panic!("the demo radius is a range"),
        }
    }

    /// Each problem is reported with its field path and what was expected.
    #[test]
    fn bad_spaces_name_the_field() {
        let doc: SpaceDoc = ron::from_str(SPACE).unwrap();
        let problems = |f: &dyn Fn(&mut SpaceDoc)| {
            let mut d = doc.clone();
            f(&mut d);
            validate(&d, &scene()).unwrap_err().join("\n")
        };
        let p = problems(&|d| d.actuators = vec!["box-10".into()]);
        assert!(
            p.contains("actuators[0]: \"box-10\" is not an actuator of the scene; did you mean \"box-100\"?"),
            "{p}"
        );
        let p = problems(&|d| d.radius_mm = AxisDoc::Range(80.0, 40.0));
        assert_eq!(p, "radius_mm.to: must be >= from (80), got 40");
        let p = problems(&|d| d.tilt_deg = AxisDoc::Values(vec![0.0, 95.0]));
        assert_eq!(p, "tilt_deg[1]: must be between -90 and 90 (both excluded), got 95");
        let p = problems(&|d| d.pressures_kpa = (0.0, 160.0, 5.0));
        assert!(p.contains("pressures_kpa.to: must not exceed 150 kPa"), "{p}");
        let p = problems(&|d| d.pressures_kpa = (0.0, 60.0, 0.0));
        assert_eq!(p, "pressures_kpa.step: must be > 0, got 0");
        let p = problems(&|d| d.layouts = vec![LayoutDoc::Ring { fingers: vec![1] }]);
        assert!(p.contains("layouts[0].fingers[0]: 1 finger(s) can never meet"), "{p}");
        let p = problems(&|d| {
            d.layouts =
                vec![LayoutDoc::OpposedPairs { pairs: vec![3], spread_deg: AxisDoc::Range(10.0, 95.0) }]
        });
        assert!(p.contains("layouts[0].spread_deg: (pairs - 1) x spread must be < 180"), "{p}");
        let p = problems(&|d| d.refine = Some(RefineDoc { rounds: 0, best: 1, samples: 1, shrink: 2.0 }));
        assert!(
            p.contains("refine.rounds: must be >= 1")
                && p.contains("refine.shrink: must be > 0 and <= 1, got 2"),
            "{p}"
        );
        let p = problems(&|d| d.sampling = SamplingDoc::Grid { steps: 400 });
        assert!(p.contains("candidates, more than"), "{p}");
    }
}

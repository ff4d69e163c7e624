//! The results file: JSON Lines, one self-contained line per candidate
//! (`"format": "arcfinger/sweep/1"`).
//!
//! Each line carries the space fingerprint (so lines of different sweeps are never
//! mixed), the candidate's index and round, its layout, the per-object results of the
//! grasp check (verdict and reasons at the check pressure, pressure window, margins), and
//! the ranking key. Lines are written by one serialiser with fixed key order and
//! serde_json's shortest round-trip numbers, so the same candidate always gives the same
//! bytes. A finished file is sorted by candidate index; the ranking is always computed
//! from the lines as read back ([`Record::score`]), so it is the same for a fresh run, a
//! resumed one and a merge.
//!
//! Units are the keys' suffixes (`_mm`, `_deg`, `_kpa`, `_n`); `lift`, `lateral_min`
//! and `min_margin` are load scales, `enclosure` a fraction. `null` for a number means
//! the solver handed over a value that is not finite.

use std::path::Path;

use grasp_core::sweep::Score;
use serde::{Deserialize, Serialize};

use crate::error::AppError;

/// The `format` value of every line.
pub const FORMAT: &str = "arcfinger/sweep/1";

/// Largest results file read (bytes).
const MAX_RESULTS_BYTES: u64 = 4 * 1024 * 1024 * 1024;

/// One candidate's line.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct Record {
    /// [`FORMAT`].
    pub format: String,
    /// Fingerprint of the scene, its meshes, the space and the settings (16 hex digits).
    pub space: String,
    /// Scene name.
    pub scene: String,
    /// Candidate index (0-based, over all rounds).
    pub index: usize,
    /// Round: 0 first, then refinements.
    pub round: usize,
    /// First index of the round.
    pub round_start: usize,
    /// Number of candidates in the round.
    pub round_size: usize,
    /// The layout.
    pub layout: LayoutRecord,
    /// Pressure of the verdicts and margins (kPa).
    pub check_pressure_kpa: f64,
    /// Per-object results, in scene order (empty when `error` is set).
    pub objects: Vec<ObjectRecord>,
    /// The check's recommended supply pressure for the whole set (kPa), if any.
    pub recommended_pressure_kpa: Option<f64>,
    /// The ranking key (`None` when `error` is set).
    pub score: Option<ScoreRecord>,
    /// Why the candidate could not be checked, if it could not.
    pub error: Option<String>,
}

/// A candidate's layout in file units.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct LayoutRecord {
    /// `"ring"` or `"opposed-pairs"`.
    pub pattern: String,
    /// Number of fingers.
    pub fingers: usize,
    /// Actuator name.
    pub actuator: String,
    /// Mount radius (mm).
    pub radius_mm: f64,
    /// Tilt (deg).
    pub tilt_deg: f64,
    /// Azimuth of the first finger (deg).
    pub azimuth_offset_deg: f64,
    /// Spread of a fan of opposed pairs (deg), `None` for a ring.
    pub spread_deg: Option<f64>,
    /// Each finger's azimuth (deg), as written to the candidate's scene.
    pub azimuths_deg: Vec<f64>,
}

/// One object's result.
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct ObjectRecord {
    /// Object name.
    pub name: String,
    /// `"pass"` or `"fail"` at the check pressure.
    pub verdict: String,
    /// Failed criteria at the check pressure.
    pub reasons: Vec<String>,
    /// `false` when a solve did not converge (the result is unknown, never a pass).
    pub converged: bool,
    /// Widest range of sweep pressures where it passes (kPa).
    pub window_kpa: Option<[f64; 2]>,
    /// Fingers in contact at the check pressure.
    pub fingers_in_contact: usize,
    /// Fraction of escape directions blocked.
    pub enclosure: Option<f64>,
    /// Lift margin (load scale).
    pub lift: Option<f64>,
    /// Smallest lateral margin (load scale).
    pub lateral_min: Option<f64>,
    /// Largest contact normal force (N).
    pub peak_contact_force_n: Option<f64>,
}

/// The ranking key in file units (see `grasp_core::sweep::rank`).
#[derive(Debug, Clone, PartialEq, Serialize, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct ScoreRecord {
    /// Objects with a window.
    pub covered: usize,
    /// Objects in the set.
    pub objects: usize,
    /// A single-pressure window for the whole set exists.
    pub whole_set: bool,
    /// Intersection of the covered objects' windows (kPa).
    pub shared_window_kpa: Option<[f64; 2]>,
    /// Its width (kPa).
    pub window_width_kpa: f64,
    /// Sum of the covered objects' window widths (kPa).
    pub total_window_width_kpa: f64,
    /// Smallest holding margin at the check pressure.
    pub min_margin: f64,
    /// Number of fingers.
    pub fingers: usize,
}

impl ScoreRecord {
    /// The file form of a core score (Pa to kPa).
    pub fn of(s: &Score) -> Self {
        Self {
            covered: s.covered,
            objects: s.objects,
            whole_set: s.whole_set,
            shared_window_kpa: s.shared_window.map(|(a, b)| [a * 1e-3, b * 1e-3]),
            window_width_kpa: s.window_width * 1e-3,
            total_window_width_kpa: s.total_window_width * 1e-3,
            min_margin: s.min_margin,
            fingers: s.fingers,
        }
    }
}

impl Record {
    /// The ranking key, recomputed from the per-object lines (kPa to Pa); `None` for a
    /// candidate that could not be checked.
    pub fn score(&self) -> Option<Score> {
        if self.error.is_some() {
            return None;
        }
        let windows: Vec<Option<(f64, f64)>> =
            self.objects.iter().map(|o| o.window_kpa.map(|[a, b]| (a * 1e3, b * 1e3))).collect();
        let margins: Vec<f64> = self
            .objects
            .iter()
            .map(|o| match (o.lift, o.lateral_min) {
                (Some(a), Some(b)) => a.min(b),
                _ => f64::NAN,
            })
            .collect();
        Some(Score::new(&windows, &margins, self.layout.fingers))
    }

    /// The line (without its newline).
    ///
    /// # Errors
    /// Serialisation failures (none expected: every number is finite or `None`).
    pub fn to_line(&self) -> Result<String, AppError> {
        serde_json::to_string(self).map_err(|e| AppError::input(format!("writing a result line: {e}")))
    }
}

/// A finite number or `None`.
pub fn finite(x: f64) -> Option<f64> {
    x.is_finite().then_some(x)
}

/// FNV-1a, 64 bits (G. Fowler, L. C. Noll, K.-P. Vo; offset basis
/// `0xcbf29ce484222325`, prime `0x100000001b3`).
#[derive(Debug, Clone, Copy)]
pub struct Fnv1a(u64);

impl Default for Fnv1a {
    fn default() -> Self {
        Self(0xcbf2_9ce4_8422_2325)
    }
}

impl Fnv1a {
    /// Feeds `bytes`.
    pub fn write(&mut self, bytes: &[u8]) {
        for &b in bytes {
            self.0 = (self.0 ^ u64::from(b)).wrapping_mul(0x0000_0100_0000_01b3);
        }
    }
    /// Feeds `bytes` followed by its length, so consecutive parts cannot run together.
    pub fn part(&mut self, bytes: &[u8]) {
        self.write(bytes);
        self.write(&(bytes.len() as u64).to_le_bytes());
    }
    /// The hash.
    pub fn finish(&self) -> u64 {
        self.0
    }
}

/// One parsed line with its text and where it came from.
#[derive(Debug, Clone)]
pub struct Line {
    /// The record.
    pub record: Record,
    /// The line's text as read (without newline).
    pub text: String,
    /// 1-based line number in its file.
    pub line: usize,
}

/// What [`read`] found in a results file.
#[derive(Debug, Default)]
pub struct ReadResult {
    /// The complete lines.
    pub lines: Vec<Line>,
    /// Byte length of the complete lines (with their newlines): where an interrupted
    /// write's fragment starts.
    pub complete_len: u64,
    /// Whether a last line without its newline was dropped (an interrupted write).
    pub truncated: bool,
}

/// Reads a results file. A last line without newline that does not parse is an
/// interrupted write: it is dropped and reported in [`ReadResult::truncated`]. Any other
/// line that does not parse is an error with its line number.
///
/// # Errors
/// [`AppError::Io`] when it cannot be read; [`AppError::Input`] naming `FILE:LINE` for a
/// bad line.
pub fn read(path: &Path) -> Result<ReadResult, AppError> {
    let shown = path.display();
    let meta =
        std::fs::metadata(path).map_err(|e| AppError::io(format!("cannot read results file {shown}"), e))?;
    if meta.is_dir() || meta.len() > MAX_RESULTS_BYTES {
        return Err(AppError::input(format!("{shown}: not a results file (a folder, or too large)")));
    }
    let bytes =
        std::fs::read(path).map_err(|e| AppError::io(format!("cannot read results file {shown}"), e))?;
    let mut out = ReadResult::default();
    let mut offset = 0usize;
    for (k, raw) in bytes.split_inclusive(|&b| b == b'\n').enumerate() {
        let line_no = k + 1;
        let ends = raw.last() == Some(&b'\n');
        let body = raw.strip_suffix(b"\n").unwrap_or(raw);
        let body = body.strip_suffix(b"\r").unwrap_or(body);
        let parsed = std::str::from_utf8(body)
            .map_err(|_| "not UTF-8 text".to_string())
            .and_then(|t| serde_json::from_str::<Record>(t).map(|r| (t, r)).map_err(|e| e.to_string()));
        match parsed {
            Ok((text, record)) => {
                if record.format != FORMAT {
                    return Err(AppError::input(format!(
                        "{shown}:{line_no}: format \"{}\" is not {FORMAT}",
                        record.format
                    )));
                }
                out.lines.push(Line { record, text: text.to_string(), line: line_no });
                offset += raw.len();
                out.complete_len = offset as u64;
            }
            Err(_) if body.iter().all(u8::is_ascii_whitespace) && ends => {
                offset += raw.len();
                out.complete_len = offset as u64;
            }
            Err(_) if !ends => out.truncated = true,
            Err(e) => {
                return Err(AppError::input(format!(
                    "{shown}:{line_no}: not a sweep result line ({FORMAT}): {e}"
                )));
            }
        }
    }
    Ok(out)
}

#[cfg(test)]
mod tests {
    use super::*;

    /// Test vectors of the FNV-1a 64-bit hash from its authors' reference test suite
    /// (L. C. Noll, "FNV hash" test vectors: "" , "a", "foobar").
    #[test]
    fn fnv1a_matches_the_reference_vectors() {
        let h = |s: &str| {
            let mut f = Fnv1a::default();
            f.write(s.as_bytes());
            f.finish()
        };
        assert_eq!(h(""), 0xcbf29ce484222325);
        assert_eq!(h("a"), 0xaf63dc4c8601ec8c);
        assert_eq!(h("foobar"), 0x85944171f73967e8);
    }

    pub(crate) fn sample() -> Record {
        Record {
            format: FORMAT.into(),
            space: "0123456789abcdef".into(),
            scene: "s".into(),
            index: 3,
            round: 0,
            round_start: 0,
            round_size: 10,
            layout: LayoutRecord {
                pattern: "ring".into(),
                fingers: 3,
                actuator: "a".into(),
                radius_mm: 60.5,
                tilt_deg: 2.25,
                azimuth_offset_deg: 0.0,
                spread_deg: None,
                azimuths_deg: vec![0.0, 120.0, 240.0],
            },
            check_pressure_kpa: 40.0,
            objects: vec![ObjectRecord {
                name: "ball \"x\"".into(),
                verdict: "pass".into(),
                reasons: vec![],
                converged: true,
                window_kpa: Some([20.0, 45.0]),
                fingers_in_contact: 3,
                enclosure: Some(0.53125),
                lift: Some(2.5),
                lateral_min: Some(2.1),
                peak_contact_force_n: Some(1.0 / 3.0),
            }],
            recommended_pressure_kpa: Some(32.5),
            score: None,
            error: None,
        }
    }

    /// A line parses back into the same record, and its score is recomputed from it.
    #[test]
    fn lines_round_trip_and_carry_their_score() {
        let mut r = sample();
        r.score = r.score().map(|s| ScoreRecord::of(&s));
        let line = r.to_line().unwrap();
        assert!(
            line.starts_with("{\"format\":\"arcfinger/sweep/1\",\"space\":\"0123456789abcdef\""),
            "{line}"
        );
        let back: Record = serde_json::from_str(&line).unwrap();
        assert_eq!(back, r);
        assert_eq!(back.to_line().unwrap(), line);
        let s = back.score().unwrap();
        assert_eq!((s.covered, s.whole_set, s.window_width, s.min_margin), (1, true, 25e3, 2.1));
        let mut e = sample();
        e.error = Some("bad".into());
        assert!(e.score().is_none());
    }

    /// A torn last line is dropped and flagged; a bad line in the middle is an error with
    /// its line number.
    #[test]
    fn reading_tolerates_only_a_torn_last_line() {
        let dir = std::env::temp_dir().join(format!("arcfinger-record-{}", std::process::id()));
        std::fs::create_dir_all(&dir).unwrap();
        let line = sample().to_line().unwrap();
        let p = dir.join("r.jsonl");
        std::fs::write(&p, format!("{line}\n{}", &line[..40])).unwrap();
        let r = read(&p).unwrap();
        assert_eq!((r.lines.len(), r.truncated, r.complete_len), (1, true, line.len() as u64 + 1));
        std::fs::write(&p, format!("{line}\n{}\n{line}\n", &line[..40])).unwrap();
        let e = read(&p).unwrap_err();
        assert!(e.to_string().contains("r.jsonl:2: not a sweep result line"), "{e}");
        assert_eq!(e.exit_code(), 2);
        std::fs::write(&p, format!("{line}\n\n{line}")).unwrap();
        let r = read(&p).unwrap();
        assert_eq!((r.lines.len(), r.truncated), (2, false));
        std::fs::remove_dir_all(&dir).unwrap();
    }
}

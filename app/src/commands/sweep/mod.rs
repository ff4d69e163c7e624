//! `arcfinger sweep SCENE --space SPACE.ron`: search a space of hub layouts for the
//! gripper that holds the most of the scene's objects.
//!
//! The space file ([`space_file`]) expands to numbered candidates (`grasp_core::sweep`);
//! each is checked with the grasp check over the whole object set and the space's
//! pressure sweep, in parallel across candidates (rayon). Each result is appended to the
//! `--out` file as one JSON line ([`record`]) as soon as it is known, so an interrupted
//! run loses only the candidates under way; `--resume` reads the file back (an
//! interrupted last line is dropped) and checks only what is missing. When every round
//! is done the file is rewritten sorted by candidate index, atomically: the same space
//! gives the same bytes whatever the thread count, the order of completion, the number of
//! resumptions, or the shards it was split into ([`super::merge`]).
//!
//! Refinement rounds need the complete results of the rounds before them: an unsharded
//! run does every round; a shard (`--shard I/N`) does its share of every round it can
//! and stops at the first round that needs the other shards' results (merge them, then
//! resume each shard on a copy of the merged file).
//!
//! Exit codes: 0 when the best candidate holds every object at one pressure (and for a
//! shard run whenever its share is done), 1 when the sweep finished and no candidate
//! does, 2 for bad input or usage.

pub mod emit;
pub mod layout;
pub mod record;
pub mod space_file;
pub mod table;

use std::collections::BTreeMap;
use std::io::{IsTerminal, Write};
use std::path::{Path, PathBuf};
use std::sync::Mutex;

use grasp_core::check::{CheckReport, CheckSettings};
use grasp_core::sweep::{Candidate, Score, Shard, pareto_front, rank::rank, refine};
use rayon::prelude::*;

use self::record::{FORMAT, Fnv1a, ObjectRecord, Record, ScoreRecord, finite};
use self::space_file::Space;
use crate::cli::SweepArgs;
use crate::commands::bend::{MAX_ELEMENTS, MIN_ELEMENTS};
use crate::error::{AppError, Outcome};
use crate::output::refuse_overwrite;
use crate::scene_doc::{SceneDoc, ShapeDoc};

/// `I/N` as given to `--shard`.
///
/// # Errors
/// [`AppError::Input`] unless two integers with `1 <= I <= N`.
pub fn parse_shard(s: &str) -> Result<Shard, AppError> {
    let bad =
        || AppError::input(format!("--shard {s}: expected I/N with whole numbers 1 <= I <= N, e.g. 3/16"));
    let (i, n) = s.split_once('/').ok_or_else(bad)?;
    let (i, n) =
        (i.trim().parse::<usize>().map_err(|_| bad())?, n.trim().parse::<usize>().map_err(|_| bad())?);
    Shard::new(i, n).map_err(|_| bad())
}

/// Everything a candidate's evaluation needs.
struct Job<'a> {
    base: &'a SceneDoc,
    space: &'a Space,
    meshes: &'a [(&'a str, &'a [u8])],
    settings: CheckSettings,
    fingerprint: &'a str,
}

impl Job<'_> {
    /// The record of candidate `c` of the round starting at `start` with `size` candidates.
    fn evaluate(&self, c: &Candidate, start: usize, size: usize) -> Record {
        let names = &self.space.actuator_names;
        let mut record = Record {
            format: FORMAT.into(),
            space: self.fingerprint.into(),
            scene: self.base.name.clone(),
            index: c.index,
            round: c.round,
            round_start: start,
            round_size: size,
            layout: layout::layout_record(c, &[], names),
            check_pressure_kpa: self.space.check_pressure_kpa,
            objects: Vec::new(),
            recommended_pressure_kpa: None,
            score: None,
            error: None,
        };
        let fingers = match layout::finger_docs(c, names) {
            Ok(f) => f,
            Err(e) => {
                record.error = Some(format!("layout: {e}"));
                return record;
            }
        };
        record.layout = layout::layout_record(c, &fingers, names);
        let doc = layout::scene_doc(self.base, self.space, fingers, self.space.check_pressure_kpa);
        let result = layout::build(&doc, self.meshes).and_then(|scene| {
            grasp_core::check::check_scene(&scene, &self.settings).map_err(|e| e.to_string())
        });
        match result {
            Ok(report) => fill(&mut record, &report),
            Err(e) => record.error = Some(e),
        }
        record
    }
}

/// Copies a check report into a record and computes the score from the record itself.
fn fill(record: &mut Record, report: &CheckReport) {
    record.objects = report
        .objects
        .iter()
        .map(|o| ObjectRecord {
            name: o.name.clone(),
            verdict: o.verdict.name().into(),
            reasons: o.failures.iter().map(ToString::to_string).collect(),
            converged: !crate::report::not_converged(o),
            window_kpa: o.pressure_window.map(|(a, b)| [a * 1e-3, b * 1e-3]),
            fingers_in_contact: o.fingers_in_contact,
            enclosure: finite(o.enclosure),
            lift: finite(o.holding.lift),
            lateral_min: finite(o.holding.lateral_min),
            peak_contact_force_n: finite(o.peak_contact_force),
        })
        .collect();
    record.recommended_pressure_kpa = report.recommended_pressure.map(|p| p * 1e-3);
    record.score = record.score().map(|s| ScoreRecord::of(&s));
}

/// The record as its line, and the record parsed back from that line: the line is the
/// canonical form everything downstream uses.
fn canonical(record: &Record) -> Result<(Record, String), AppError> {
    let text = record.to_line()?;
    let back =
        serde_json::from_str(&text).map_err(|e| AppError::input(format!("re-reading a result line: {e}")))?;
    Ok((back, text))
}

/// Records ranked best first, and the Pareto front.
pub fn ranking<'a>(records: impl IntoIterator<Item = &'a Record>) -> (Vec<&'a Record>, Vec<usize>) {
    let records: Vec<&Record> = records.into_iter().collect();
    let entries: Vec<(usize, Option<Score>)> = records.iter().map(|r| (r.index, r.score())).collect();
    let by_index: BTreeMap<usize, &Record> = records.iter().map(|r| (r.index, *r)).collect();
    let order = rank(&entries).into_iter().filter_map(|i| by_index.get(&i).copied()).collect();
    (order, pareto_front(&entries))
}

/// Exit outcome of a finished sweep or merge: pass when the best candidate holds every
/// object at one pressure.
pub fn outcome(ranked: &[&Record]) -> Outcome {
    match ranked.first().and_then(|r| r.score.as_ref()) {
        Some(s) if s.whole_set => Outcome::Pass,
        _ => Outcome::Fail,
    }
}

/// The fingerprint of a sweep: FNV-1a over the format and arcfinger's version, the scene
/// file, its meshes, the space file and the settings, as 16 hex digits.
fn fingerprint(scene: &[u8], meshes: &[(String, Vec<u8>)], space: &[u8], elements: usize) -> String {
    let mut h = Fnv1a::default();
    h.part(FORMAT.as_bytes());
    h.part(env!("CARGO_PKG_VERSION").as_bytes());
    h.part(scene);
    for (path, bytes) in meshes {
        h.part(path.as_bytes());
        h.part(bytes);
    }
    h.part(space);
    h.part(elements.to_string().as_bytes());
    format!("{:016x}", h.finish())
}

/// The progress bar on stderr: hidden when stderr is not a terminal or with `--quiet`.
fn progress(len: usize, round: usize, quiet: bool) -> indicatif::ProgressBar {
    if quiet || !std::io::stderr().is_terminal() {
        return indicatif::ProgressBar::hidden();
    }
    let bar = indicatif::ProgressBar::new(len as u64);
    if let Ok(style) = indicatif::ProgressStyle::with_template(
        "round {msg} [{bar:30}] {pos}/{len} candidates, {per_sec}, ETA {eta}",
    ) {
        bar.set_style(style.progress_chars("=> "));
    }
    bar.set_message(round.to_string());
    bar
}

/// The validated options.
struct Config {
    scene_path: PathBuf,
    space_path: PathBuf,
    out: Option<PathBuf>,
    resume: bool,
    shard: Shard,
    top: usize,
    emit: Option<(usize, PathBuf)>,
    quiet: bool,
    elements: usize,
}

impl Config {
    fn new(args: SweepArgs) -> Result<Self, AppError> {
        if !(MIN_ELEMENTS..=MAX_ELEMENTS).contains(&args.elements) {
            return Err(AppError::input(format!(
                "--elements: must be between {MIN_ELEMENTS} and {MAX_ELEMENTS}, got {}",
                args.elements
            )));
        }
        let shard = args.shard.as_deref().map(parse_shard).transpose()?.unwrap_or(Shard::whole());
        if args.out.is_none() && (args.resume || shard.count() > 1) {
            return Err(AppError::input(
                "--resume and --shard need --out FILE.jsonl: the results file to write",
            ));
        }
        let emit = match args.emit_top.as_deref() {
            None => None,
            Some([k, dir]) => {
                let k = k.parse::<usize>().ok().filter(|k| *k >= 1).ok_or_else(|| {
                    AppError::input(format!("--emit-top {k} {dir}: K must be a whole number >= 1"))
                })?;
                if shard.count() > 1 {
                    return Err(AppError::input(
                        "--emit-top needs the whole sweep: merge the shards, then run with --resume on the merged file",
                    ));
                }
                Some((k, PathBuf::from(dir)))
            }
            Some(_) => return Err(AppError::input("--emit-top takes two values: K DIR")),
        };
        Ok(Self {
            scene_path: args.scene,
            space_path: args.space,
            out: args.out,
            resume: args.resume,
            shard,
            top: args.top,
            emit,
            quiet: args.quiet,
            elements: args.elements,
        })
    }
}

/// The mesh files a scene document names, read from its folder once.
fn read_meshes(doc: &SceneDoc, dir: &Path) -> Result<Vec<(String, Vec<u8>)>, AppError> {
    let mut out: Vec<(String, Vec<u8>)> = Vec::new();
    for o in &doc.objects {
        if let ShapeDoc::Mesh { path, .. } = &o.shape
            && !out.iter().any(|(p, _)| p == path)
        {
            let full = dir.join(path);
            let bytes = std::fs::read(&full)
                .map_err(|e| AppError::io(format!("cannot read mesh {}", full.display()), e))?;
            out.push((path.clone(), bytes));
        }
    }
    Ok(out)
}

/// Runs `sweep`.
pub fn run(args: SweepArgs) -> Result<Outcome, AppError> {
    let cfg = Config::new(args)?;
    // the scene: validated in full once, then used as the template of every candidate
    let scene_text = crate::scene_file::read_source(&cfg.scene_path)?;
    let shown = cfg.scene_path.display().to_string();
    let base = crate::scene_file::parse_doc(&shown, &scene_text)?;
    crate::scene_file::load(&cfg.scene_path)?;
    let scene_dir = crate::scene_file::scene_dir(&cfg.scene_path);
    let meshes = read_meshes(&base, &scene_dir)?;
    let mesh_refs: Vec<(&str, &[u8])> = meshes.iter().map(|(p, b)| (p.as_str(), b.as_slice())).collect();
    let (space, space_bytes) = space_file::load(&cfg.space_path, &base)?;
    // outputs: never an input
    let mesh_paths: Vec<PathBuf> = meshes.iter().map(|(p, _)| scene_dir.join(p)).collect();
    let mut inputs: Vec<&Path> = vec![&cfg.scene_path, &cfg.space_path];
    inputs.extend(mesh_paths.iter().map(PathBuf::as_path));
    if let Some(out) = &cfg.out {
        refuse_overwrite(out, &inputs)?;
        if out.exists() && !cfg.resume {
            return Err(AppError::input(format!(
                "{}: exists; pass --resume to continue it, or choose another --out",
                out.display()
            )));
        }
        let dir = crate::scene_file::scene_dir(out);
        if !dir.is_dir() {
            return Err(AppError::input(format!(
                "--out {}: the folder {} does not exist",
                out.display(),
                dir.display()
            )));
        }
    }
    let fingerprint = fingerprint(scene_text.as_bytes(), &meshes, &space_bytes, cfg.elements);
    // results so far
    let mut done: BTreeMap<usize, (Record, String)> = BTreeMap::new();
    let mut resumed = 0usize;
    if let Some(out) = cfg.out.as_ref().filter(|p| cfg.resume && p.exists()) {
        let read = record::read(out)?;
        for l in read.lines {
            if l.record.space != fingerprint {
                return Err(AppError::input(format!(
                    "{}:{}: written for another scene, search space or --elements (fingerprint {}, this sweep {fingerprint}); \
                     use another --out",
                    out.display(),
                    l.line,
                    l.record.space
                )));
            }
            if let Some((_, text)) = done.get(&l.record.index) {
                if *text != l.text {
                    return Err(AppError::input(format!(
                        "{}:{}: candidate {} appears twice with different results",
                        out.display(),
                        l.line,
                        l.record.index
                    )));
                }
                continue;
            }
            done.insert(l.record.index, (l.record, l.text));
        }
        resumed = done.len();
        if read.truncated {
            // drop the interrupted line so appending starts on a fresh line
            let f = std::fs::OpenOptions::new()
                .write(true)
                .open(out)
                .map_err(|e| AppError::io(format!("opening {}", out.display()), e))?;
            f.set_len(read.complete_len)
                .map_err(|e| AppError::io(format!("truncating {}", out.display()), e))?;
            if !cfg.quiet {
                eprintln!("arcfinger: {}: dropped an interrupted last line", out.display());
            }
        }
    }
    let writer = match &cfg.out {
        Some(out) => Some(Mutex::new(
            std::fs::OpenOptions::new()
                .create(true)
                .append(true)
                .open(out)
                .map_err(|e| AppError::io(format!("opening {}", out.display()), e))?,
        )),
        None => None,
    };
    let job = Job {
        base: &base,
        space: &space,
        meshes: &mesh_refs,
        // the sweep's records carry no epsilon (reported by `check`, not a criterion)
        settings: CheckSettings { elements: cfg.elements, epsilon: false, ..CheckSettings::default() },
        fingerprint: &fingerprint,
    };
    // the rounds
    let mut all: Vec<Candidate> =
        space.core.first_round().map_err(|e| AppError::input(format!("the space: {e}")))?;
    let mut round_start = 0usize;
    let mut round = 0usize;
    let mut evaluated = 0usize;
    let mut stopped_for_shards = false;
    loop {
        let this: Vec<Candidate> = all[round_start..].to_vec();
        let size = this.len();
        // resumed lines must be the candidates this space gives
        for c in &this {
            if let Some((r, _)) = done.get(&c.index) {
                let fingers = layout::finger_docs(c, &space.actuator_names).unwrap_or_default();
                let expect = layout::layout_record(c, &fingers, &space.actuator_names);
                if r.round != round
                    || r.round_start != round_start
                    || r.round_size != size
                    || r.layout != expect
                {
                    return Err(AppError::input(format!(
                        "candidate {} in the results file does not match this sweep's candidate (another version?); \
                         use another --out",
                        c.index
                    )));
                }
            }
        }
        let pending: Vec<&Candidate> =
            this.iter().filter(|c| cfg.shard.contains(c.index) && !done.contains_key(&c.index)).collect();
        let bar = progress(pending.len(), round, cfg.quiet);
        let new: Vec<(Record, String)> = pending
            .par_iter()
            .map(|c| {
                let (rec, text) = canonical(&job.evaluate(c, round_start, size))?;
                if let Some(w) = &writer {
                    let mut f = w.lock().map_err(|_| AppError::input("the results writer failed"))?;
                    f.write_all(format!("{text}\n").as_bytes())
                        .map_err(|e| AppError::io("appending to the results file", e))?;
                }
                bar.inc(1);
                Ok((rec, text))
            })
            .collect::<Result<_, AppError>>()?;
        bar.finish_and_clear();
        evaluated += new.len();
        for (r, t) in new {
            done.insert(r.index, (r, t));
        }
        let complete = this.iter().all(|c| done.contains_key(&c.index));
        let more = space.core.refine.is_some_and(|r| round < r.rounds);
        if !complete {
            stopped_for_shards = more;
            break;
        }
        if !more {
            break;
        }
        // the parents: the best of every round so far
        let (ranked, _) = ranking(done.values().map(|(r, _)| r));
        let parents: Vec<Candidate> =
            ranked.iter().filter(|r| r.error.is_none()).filter_map(|r| all.get(r.index).copied()).collect();
        round += 1;
        round_start = all.len();
        let next = refine(&space.core, &parents, round, round_start)
            .map_err(|e| AppError::input(format!("the space: {e}")))?;
        if next.is_empty() {
            break;
        }
        all.extend(next);
    }
    if let Some((&i, _)) = done.range(all.len()..).next() {
        return Err(AppError::input(format!(
            "candidate {i} in the results file is not part of this sweep (another version?); use another --out"
        )));
    }
    drop(writer);
    // the finished file: sorted by index
    if let Some(out) = &cfg.out {
        let mut bytes = Vec::new();
        for (_, text) in done.values() {
            bytes.extend_from_slice(text.as_bytes());
            bytes.push(b'\n');
        }
        crate::output::write_atomic(out, &bytes)?;
    }
    let (ranked, front) = ranking(done.values().map(|(r, _)| r));
    if !cfg.quiet {
        let share = if cfg.shard.count() > 1 {
            format!(" (shard {}/{})", cfg.shard.index(), cfg.shard.count())
        } else {
            String::new()
        };
        eprintln!(
            "arcfinger: sweep{share}: {} of {} candidates have results ({evaluated} checked now, {resumed} from the file)",
            done.len(),
            all.len()
        );
        if stopped_for_shards {
            eprintln!(
                "arcfinger: round {} refines around the best of all shards: merge the shards, copy the merged file \
                 to each shard's --out and run each shard again with --resume",
                round + 1
            );
        }
    }
    if cfg.top > 0 {
        let text = table::render(&ranked, &front, cfg.top, base.objects.len());
        crate::output::Sink::Stdout.write(text.as_bytes())?;
    }
    if let Some((k, dir)) = &cfg.emit {
        let mut emit_inputs = inputs.clone();
        if let Some(out) = &cfg.out {
            emit_inputs.push(out);
        }
        let plan = emit::plan(&ranked, *k, dir, &base, &space, &meshes, &cfg.scene_path, &emit_inputs)?;
        for p in plan.write()? {
            if !cfg.quiet {
                eprintln!("arcfinger: wrote {}", p.display());
            }
        }
    }
    if cfg.shard.count() > 1 { Ok(Outcome::Pass) } else { Ok(outcome(&ranked)) }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn shards_parse_as_i_of_n() {
        assert_eq!(parse_shard("3/16").unwrap(), Shard::new(3, 16).unwrap());
        for bad in ["0/4", "5/4", "1/0", "a/4", "3", "-1/4", "1/4/2"] {
            let e = parse_shard(bad).unwrap_err();
            assert!(e.to_string().contains("expected I/N"), "{bad}: {e}");
        }
    }

    /// Every input of a sweep changes its fingerprint; parts cannot run into each other.
    #[test]
    fn the_fingerprint_covers_every_input() {
        let meshes = vec![("m.obj".to_string(), b"v 0 0 0".to_vec())];
        let base = fingerprint(b"scene", &meshes, b"space", 40);
        assert_eq!(base.len(), 16);
        assert_eq!(base, fingerprint(b"scene", &meshes, b"space", 40));
        assert_ne!(base, fingerprint(b"scene ", &meshes, b"space", 40));
        assert_ne!(base, fingerprint(b"scene", &[], b"space", 40));
        assert_ne!(base, fingerprint(b"scene", &[("n.obj".into(), b"v 0 0 0".to_vec())], b"space", 40));
        assert_ne!(base, fingerprint(b"scene", &meshes, b"space2", 40));
        assert_ne!(base, fingerprint(b"scene", &meshes, b"space", 48));
        assert_ne!(fingerprint(b"ab", &[], b"c", 40), fingerprint(b"a", &[], b"bc", 40));
    }

    /// The scene written for a candidate loads, through the ordinary loader, into the very
    /// scene that was checked.
    #[test]
    fn an_emitted_scene_loads_into_the_checked_scene() {
        let root = Path::new(env!("CARGO_MANIFEST_DIR")).join("..");
        let scene_path = root.join("scenes/packing-line-3f.ron");
        let text = std::fs::read_to_string(&scene_path).unwrap();
        let base = crate::scene_file::parse_doc("s", &text).unwrap();
        let space_path = root.join("scenes/packing-line-space.ron");
        let (space, _) = space_file::load(&space_path, &base).unwrap();
        let meshes = read_meshes(&base, &root.join("scenes")).unwrap();
        let refs: Vec<(&str, &[u8])> = meshes.iter().map(|(p, b)| (p.as_str(), b.as_slice())).collect();
        let dir = std::env::temp_dir().join(format!("arcfinger-emit-{}", std::process::id()));
        let _ = std::fs::remove_dir_all(&dir);
        std::fs::create_dir_all(&dir).unwrap();
        let mut last = None;
        for c in space.core.first_round().unwrap().iter().take(6) {
            let fingers = layout::finger_docs(c, &space.actuator_names).unwrap();
            let mut rec = Record {
                format: FORMAT.into(),
                space: "x".into(),
                scene: base.name.clone(),
                index: c.index,
                round: 0,
                round_start: 0,
                round_size: 6,
                layout: layout::layout_record(c, &fingers, &space.actuator_names),
                check_pressure_kpa: space.check_pressure_kpa,
                objects: Vec::new(),
                recommended_pressure_kpa: None,
                score: None,
                error: None,
            };
            // through the line, as emit sees it after a merge
            rec = canonical(&rec).unwrap().0;
            let checked =
                layout::build(&layout::scene_doc(&base, &space, fingers, space.check_pressure_kpa), &refs)
                    .unwrap();
            let plan =
                emit::plan(&[&rec], 1, &dir, &base, &space, &meshes, &scene_path, &[&scene_path]).unwrap();
            let written = plan.write().unwrap();
            let loaded = crate::scene_file::load(&written[0]).unwrap();
            assert_eq!(loaded.gripper, checked.gripper, "candidate {}", c.index);
            assert_eq!(loaded.criteria, checked.criteria);
            assert_eq!(loaded.objects, checked.objects);
            assert_eq!(loaded.actuators, checked.actuators);
            assert_eq!(loaded.gripper.fingers.len(), c.fingers());
            last = Some(rec);
        }
        // the mesh was copied; a different file in its place is refused
        std::fs::write(dir.join("meshes/bell-pepper.obj"), b"other").unwrap();
        let rec = last.unwrap();
        let e =
            emit::plan(&[&rec], 1, &dir, &base, &space, &meshes, &scene_path, &[&scene_path]).err().unwrap();
        assert!(e.to_string().contains("exists with other contents"), "{e}");
        std::fs::remove_dir_all(&dir).unwrap();
    }
}

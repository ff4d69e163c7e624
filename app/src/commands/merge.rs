//! `arcfinger merge SHARD.jsonl...`: the results files of sweep shards combined into the
//! file the unsharded sweep writes.
//!
//! Merging is parse, check, sort, deduplicate, write: every line must belong to the same
//! sweep (one space fingerprint), a candidate that appears in several files must have the
//! same line in each (shards resumed from a merged copy repeat the earlier rounds), and
//! every round present must be complete (each index from its start to its start plus
//! its size), unless `--partial`. The result is the lines sorted by candidate index, one
//! per candidate, byte for byte what an unsharded run of the same sweep writes.
//!
//! Exit codes as `sweep`: 0 when the best candidate holds every object at one pressure,
//! 1 when none does, 2 for bad input (with `FILE:LINE`).

use std::collections::BTreeMap;
use std::path::Path;

use crate::cli::MergeArgs;
use crate::commands::sweep::{outcome, ranking, record, table};
use crate::error::{AppError, Outcome};
use crate::output::{Sink, refuse_overwrite};

/// Merged lines by candidate index: `(record, text)`.
type Merged = BTreeMap<usize, (record::Record, String)>;

/// Reads and merges `files`.
///
/// # Errors
/// Mixed fingerprints, conflicting duplicates, or bad lines, with `FILE:LINE`.
fn merge(files: &[&Path], quiet: bool) -> Result<Merged, AppError> {
    let mut merged = Merged::new();
    let mut fingerprint: Option<(String, String)> = None;
    for path in files {
        let read = record::read(path)?;
        if read.truncated && !quiet {
            eprintln!("arcfinger: {}: dropped an interrupted last line", path.display());
        }
        for l in read.lines {
            let here = format!("{}:{}", path.display(), l.line);
            match &fingerprint {
                None => fingerprint = Some((l.record.space.clone(), here.clone())),
                Some((f, first)) if *f != l.record.space => {
                    return Err(AppError::input(format!(
                        "{here}: belongs to another sweep (fingerprint {}; {first} has {f}): only shards of one \
                         sweep can be merged",
                        l.record.space
                    )));
                }
                Some(_) => {}
            }
            match merged.get(&l.record.index) {
                Some((_, text)) if *text != l.text => {
                    return Err(AppError::input(format!(
                        "{here}: candidate {} has a different result than in another file; were the shards run \
                         with different builds or machines?",
                        l.record.index
                    )));
                }
                Some(_) => {}
                None => {
                    merged.insert(l.record.index, (l.record, l.text));
                }
            }
        }
    }
    Ok(merged)
}

/// The indices missing from rounds that are present, at most `limit` of them, and how
/// many in all.
fn missing(merged: &Merged, limit: usize) -> (Vec<usize>, usize) {
    let mut rounds: BTreeMap<usize, usize> = BTreeMap::new();
    for (r, _) in merged.values() {
        rounds.insert(r.round_start, r.round_size);
    }
    let mut shown = Vec::new();
    let mut count = 0;
    for (start, size) in rounds {
        for i in start..start + size {
            if !merged.contains_key(&i) {
                count += 1;
                if shown.len() < limit {
                    shown.push(i);
                }
            }
        }
    }
    (shown, count)
}

/// Runs `merge`.
pub fn run(args: MergeArgs) -> Result<Outcome, AppError> {
    let sink = Sink::parse(args.out.as_deref().unwrap_or("-"));
    let inputs: Vec<&Path> = args.files.iter().map(|p| p.as_path()).collect();
    if let Sink::File(p) = &sink {
        refuse_overwrite(p, &inputs)?;
    }
    let merged = merge(&inputs, false)?;
    if merged.is_empty() {
        return Err(AppError::input("no result lines in the files given"));
    }
    let (shown, count) = missing(&merged, 10);
    if count > 0 && !args.partial {
        let list: Vec<String> = shown.iter().map(ToString::to_string).collect();
        return Err(AppError::input(format!(
            "{count} candidate(s) missing, e.g. {}: is a shard's file missing or unfinished? (--partial merges anyway)",
            list.join(", ")
        )));
    }
    let mut bytes = Vec::new();
    for (_, text) in merged.values() {
        bytes.extend_from_slice(text.as_bytes());
        bytes.push(b'\n');
    }
    sink.write(&bytes)?;
    let (ranked, front) = ranking(merged.values().map(|(r, _)| r));
    if let Some(top) = args.top.filter(|n| *n > 0) {
        let objects = ranked.first().map_or(0, |r| r.objects.len());
        let text = table::render(&ranked, &front, top, objects);
        if sink == Sink::Stdout {
            eprint!("{text}");
        } else {
            Sink::Stdout.write(text.as_bytes())?;
        }
    }
    Ok(outcome(&ranked))
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::commands::sweep::record::Record;

    fn line(index: usize, space: &str, size: usize) -> String {
        let mut r: Record = serde_json::from_str(SAMPLE).unwrap();
        r.index = index;
        r.space = space.into();
        r.round_size = size;
        r.to_line().unwrap()
    }

    const SAMPLE: &str = r#"{"format":"arcfinger/sweep/1","space":"a","scene":"s","index":0,"round":0,"round_start":0,"round_size":3,"layout":{"pattern":"ring","fingers":3,"actuator":"a","radius_mm":60.0,"tilt_deg":0.0,"azimuth_offset_deg":0.0,"spread_deg":null,"azimuths_deg":[0.0,120.0,240.0]},"check_pressure_kpa":40.0,"objects":[],"recommended_pressure_kpa":null,"score":null,"error":"x"}"#;

    #[test]
    fn merge_sorts_dedupes_and_checks() {
        let dir = std::env::temp_dir().join(format!("arcfinger-merge-{}", std::process::id()));
        std::fs::create_dir_all(&dir).unwrap();
        let a = dir.join("a.jsonl");
        let b = dir.join("b.jsonl");
        std::fs::write(&a, format!("{}\n{}\n", line(2, "f", 3), line(0, "f", 3))).unwrap();
        std::fs::write(&b, format!("{}\n{}\n", line(1, "f", 3), line(0, "f", 3))).unwrap();
        let m = merge(&[&a, &b], true).unwrap();
        assert_eq!(m.keys().copied().collect::<Vec<_>>(), [0, 1, 2]);
        assert_eq!(missing(&m, 10), (vec![], 0));
        // a missing candidate is found
        let m = merge(&[&a], true).unwrap();
        assert_eq!(missing(&m, 10), (vec![1], 1));
        // another sweep's line is refused with its place
        std::fs::write(&b, format!("{}\n", line(1, "g", 3))).unwrap();
        let e = merge(&[&a, &b], true).unwrap_err().to_string();
        assert!(e.contains("b.jsonl:1: belongs to another sweep"), "{e}");
        // the same candidate with another result is refused
        let mut other: Record = serde_json::from_str(&line(0, "f", 3)).unwrap();
        other.error = Some("y".into());
        std::fs::write(&b, format!("{}\n", other.to_line().unwrap())).unwrap();
        let e = merge(&[&a, &b], true).unwrap_err().to_string();
        assert!(e.contains("candidate 0 has a different result"), "{e}");
        std::fs::remove_dir_all(&dir).unwrap();
    }
}

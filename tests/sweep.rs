//! `arcfinger sweep` and `arcfinger merge`: a small sweep (one ball, two- and three-finger
//! rings, one refinement round, low pressures so a debug build runs it in seconds) gives
//! the same results file byte for byte whether it runs in one go on two threads, in 16
//! shards on one thread each (two stages, because the refinement round needs all of the
//! first), or interrupted and resumed; the scene files it writes check like the sweep
//! said; bad input is refused with the place and exit code 2.

use crate::util::{Run, TempDir, arcfinger_env, repo};

const SCENE: &str = "tests/data/check-ball-3f.ron";

const SPACE: &str = r#"// a small space for the tests
SearchSpace(
    name: "test rings",
    layouts: [Ring(fingers: [2, 3])],
    radius_mm: Range(58.0, 66.0),
    tilt_deg: Range(-5.0, 5.0),
    actuators: ["box-100"],
    pressures_kpa: (10.0, 20.0, 10.0),
    check_pressure_kpa: Some(20.0),
    sampling: LatinHypercube(samples: 12),
    refine: Some((rounds: 1, best: 2, samples: 3, shrink: 0.5)),
    seed: 5,
)
"#;

/// 12 first-round candidates and 2 x 3 refined ones.
const CANDIDATES: usize = 18;

fn sweep(tmp: &TempDir, extra: &[&str], threads: &str) -> Run {
    let space = tmp.path().join("space.ron").display().to_string();
    let scene = repo(SCENE).display().to_string();
    let mut args = vec!["sweep", scene.as_str(), "--space", space.as_str()];
    args.extend_from_slice(extra);
    arcfinger_env(tmp.path(), &args, &[("RAYON_NUM_THREADS", threads)])
}

fn read(tmp: &TempDir, name: &str) -> String {
    std::fs::read_to_string(tmp.path().join(name)).unwrap()
}

fn indices(jsonl: &str) -> Vec<u64> {
    jsonl
        .lines()
        .map(|l| serde_json::from_str::<serde_json::Value>(l).unwrap()["index"].as_u64().unwrap())
        .collect()
}

/// The same sweep run whole, sharded 16 ways and merged, and interrupted and resumed
/// gives byte-identical files; the thread count (2 whole, 1 per shard) does not matter.
#[test]
fn sharded_resumed_and_threaded_runs_give_the_same_file() {
    let tmp = TempDir::new("sweep-shards");
    tmp.write("space.ron", SPACE);
    let whole = sweep(&tmp, &["--out", "whole.jsonl"], "2").expect_code(1);
    let whole_text = read(&tmp, "whole.jsonl");
    assert_eq!(indices(&whole_text), (0..CANDIDATES as u64).collect::<Vec<_>>());
    assert!(whole.stdout.contains("Pareto front over"), "{}", whole.stdout);
    assert!(
        whole.stderr.contains("18 of 18 candidates have results (18 checked now, 0 from the file)"),
        "{}",
        whole.stderr
    );
    // no progress bar when stderr is not a terminal
    assert!(!whole.stderr.contains("ETA") && !whole.stderr.contains('\r'), "{}", whole.stderr);

    // stage 1: each shard checks its share of the first round and stops there
    let shards: Vec<String> = (1..=16).map(|i| format!("shard-{i}.jsonl")).collect();
    for (i, name) in shards.iter().enumerate() {
        let shard = format!("{}/16", i + 1);
        sweep(&tmp, &["--shard", &shard, "--out", name, "--quiet", "--top", "0"], "1").expect_code(0);
    }
    let mut merge_args: Vec<&str> = vec!["merge"];
    merge_args.extend(shards.iter().map(String::as_str));
    merge_args.extend(["--out", "round0.jsonl"]);
    arcfinger_env(tmp.path(), &merge_args, &[]).expect_code(1);
    let round0 = read(&tmp, "round0.jsonl");
    assert_eq!(indices(&round0), (0..12).collect::<Vec<_>>());
    assert!(whole_text.starts_with(&round0), "the first round of the merge is the whole run's");
    // stage 2: each shard resumes a copy of the merged file and checks its share of round 1
    for (i, name) in shards.iter().enumerate() {
        std::fs::write(tmp.path().join(name), &round0).unwrap();
        let shard = format!("{}/16", i + 1);
        sweep(&tmp, &["--shard", &shard, "--out", name, "--resume", "--quiet", "--top", "0"], "1")
            .expect_code(0);
    }
    let mut merge_args: Vec<&str> = vec!["merge"];
    merge_args.extend(shards.iter().map(String::as_str));
    let merged = arcfinger_env(tmp.path(), &merge_args, &[]).expect_code(1);
    assert_eq!(merged.stdout, whole_text, "16 shards merged == the unsharded run, byte for byte");

    // an interrupted run: 7 lines and half of the 8th, then --resume
    let lines: Vec<&str> = whole_text.lines().collect();
    let torn = format!("{}\n{}", lines[..7].join("\n"), &lines[7][..lines[7].len() / 2]);
    tmp.write("torn.jsonl", &torn);
    let resumed = sweep(&tmp, &["--out", "torn.jsonl", "--resume"], "2").expect_code(1);
    assert!(resumed.stderr.contains("dropped an interrupted last line"), "{}", resumed.stderr);
    assert!(resumed.stderr.contains("(11 checked now, 7 from the file)"), "{}", resumed.stderr);
    assert_eq!(read(&tmp, "torn.jsonl"), whole_text);
    assert_eq!(resumed.stdout, whole.stdout, "the same table");

    // an existing results file is never replaced without --resume
    let e = sweep(&tmp, &["--out", "whole.jsonl"], "2").expect_code(2);
    assert!(e.stderr.contains("whole.jsonl: exists; pass --resume"), "{}", e.stderr);
    // merging an unfinished set of shards is refused unless --partial
    let e = arcfinger_env(tmp.path(), &["merge", "shard-1.jsonl"], &[]).expect_code(2);
    assert!(e.stderr.contains("candidate(s) missing"), "{}", e.stderr);
    arcfinger_env(tmp.path(), &["merge", "shard-1.jsonl", "--partial"], &[]).expect_code(1);

    // the best candidates as scene files: the check of each gives the sweep's numbers
    let emit =
        sweep(&tmp, &["--out", "whole.jsonl", "--resume", "--emit-top", "2", "best", "--top", "0"], "2")
            .expect_code(1);
    assert!(emit.stderr.contains("(0 checked now, 18 from the file)"), "{}", emit.stderr);
    let ranked_first = first_ranked(&whole.stdout);
    let file = format!("best/top1-candidate{ranked_first}.ron");
    let check = arcfinger_env(tmp.path(), &["check", &file, "--json", "-"], &[]);
    assert!(check.code == 0 || check.code == 1, "{}", check.stderr);
    let checked: serde_json::Value = serde_json::from_str(&check.stdout).unwrap();
    let record: serde_json::Value = whole_text
        .lines()
        .map(|l| serde_json::from_str::<serde_json::Value>(l).unwrap())
        .find(|r| r["index"].as_u64() == Some(ranked_first))
        .unwrap();
    let (o, r) = (&checked["objects"][0], &record["objects"][0]);
    assert_eq!(o["holding"]["lift"], r["lift"], "the scene file checks as the sweep did");
    assert_eq!(o["holding"]["lateral_min"], r["lateral_min"]);
    assert_eq!(o["enclosure"], r["enclosure"]);
    assert_eq!(o["pressure_window_kpa"], r["window_kpa"]);
    assert_eq!(
        checked["fingers"].as_array().unwrap().len() as u64,
        record["layout"]["fingers"].as_u64().unwrap()
    );
    assert!(tmp.path().join("best").read_dir().unwrap().count() == 2);
}

/// The index of the first row of the ranking table.
fn first_ranked(table: &str) -> u64 {
    let row = table.lines().nth(1).unwrap();
    row.split_whitespace().nth(1).unwrap().parse().unwrap()
}

/// Exit 2 with the place and what is expected; no output file written.
#[test]
fn bad_spaces_and_options_are_refused_with_the_place() {
    let tmp = TempDir::new("sweep-bad");
    tmp.write("space.ron", &SPACE.replace("tilt_deg: Range(-5.0, 5.0)", "tilt_deg: Range(-5.0, 5.0"));
    let e = sweep(&tmp, &[], "1").expect_code(2);
    assert!(e.stderr.contains("space.ron:7:5: expected `,` or `)` in tilt_deg"), "{}", e.stderr);
    tmp.write("space.ron", &SPACE.replace("radius_mm", "radius_m"));
    let e = sweep(&tmp, &[], "1").expect_code(2);
    assert!(e.stderr.contains("space.ron:5:") && e.stderr.contains("radius_mm"), "{}", e.stderr);
    tmp.write("space.ron", &SPACE.replace("\"box-100\"", "\"box-10\""));
    let e = sweep(&tmp, &[], "1").expect_code(2);
    assert!(
        e.stderr.contains(
            "space.ron: actuators[0]: \"box-10\" is not an actuator of the scene; did you mean \"box-100\"?"
        ),
        "{}",
        e.stderr
    );
    tmp.write("space.ron", &SPACE.replace("(10.0, 20.0, 10.0)", "(10.0, 90.0, 10.0)"));
    let e = sweep(&tmp, &[], "1").expect_code(2);
    assert!(e.stderr.contains("pressures_kpa.to: must not exceed 60 kPa"), "{}", e.stderr);
    tmp.write("space.ron", SPACE);
    let e = sweep(&tmp, &["--shard", "17/16", "--out", "x.jsonl"], "1").expect_code(2);
    assert!(e.stderr.contains("--shard 17/16: expected I/N"), "{}", e.stderr);
    let e = sweep(&tmp, &["--resume"], "1").expect_code(2);
    assert!(e.stderr.contains("need --out"), "{}", e.stderr);
    let e = sweep(&tmp, &["--out", "space.ron", "--resume"], "1").expect_code(2);
    assert!(e.stderr.contains("refusing to overwrite an input file"), "{}", e.stderr);
    let e = sweep(&tmp, &["--elements", "10"], "1").expect_code(2);
    assert!(e.stderr.contains("--elements: must be between 40"), "{}", e.stderr);
    tmp.write("junk.jsonl", "{\"format\":\"arcfinger/sweep/1\"}\n");
    let e = arcfinger_env(tmp.path(), &["merge", "junk.jsonl"], &[]).expect_code(2);
    assert!(e.stderr.contains("junk.jsonl:1: not a sweep result line"), "{}", e.stderr);
    let names: Vec<String> = std::fs::read_dir(tmp.path())
        .unwrap()
        .map(|e| e.unwrap().file_name().to_string_lossy().into_owned())
        .collect();
    assert_eq!(names.len(), 2, "nothing but the inputs: {names:?}");
}

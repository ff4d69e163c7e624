//! Speed of `arcfinger check`, whole process, on the bundled demo scenes: every object
//! at the supply pressure and over the scene's sweep of 25 pressures. Run with
//! `cargo bench -p arcfinger --bench check`; `RAYON_NUM_THREADS=1` gives the one-core
//! figure of the README (the target is under 1 s). Each scene runs
//! `ARCFINGER_BENCH_RUNS` times (default 3); the bench prints the median wall time and
//! the mean CPU time (user + system of the child processes).

use std::path::PathBuf;
use std::process::Command;
use std::time::Instant;

#[path = "support/mod.rs"]
mod support;
use support::children_cpu_seconds;

fn main() {
    let runs: usize =
        std::env::var("ARCFINGER_BENCH_RUNS").ok().and_then(|s| s.parse().ok()).unwrap_or(3).max(1);
    let root = PathBuf::from(env!("CARGO_MANIFEST_DIR")).join("..");
    for scene in ["packing-line-3f", "packing-line-4f"] {
        let path = root.join("scenes").join(format!("{scene}.ron"));
        let cpu0 = children_cpu_seconds();
        let mut walls = Vec::with_capacity(runs);
        let mut code = None;
        for _ in 0..runs {
            let t0 = Instant::now();
            let out = Command::new(env!("CARGO_BIN_EXE_arcfinger"))
                .arg("check")
                .arg(&path)
                .output()
                .expect("run arcfinger");
            walls.push(t0.elapsed().as_secs_f64());
            code = out.status.code();
        }
        walls.sort_by(f64::total_cmp);
        let cpu = match (cpu0, children_cpu_seconds()) {
            (Some(a), Some(b)) => format!("{:.2} s", (b - a) / runs as f64),
            _ => "unknown".into(),
        };
        println!(
            "check {scene}: median {:.2} s wall, {cpu} CPU per run over {runs} runs (exit code {})",
            walls[runs / 2],
            code.map_or("none".to_string(), |c| c.to_string())
        );
    }
}

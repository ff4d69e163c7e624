//! Speed of `arcfinger sweep`, whole process: candidates x objects on the machine's
//! cores. Run with `cargo bench -p arcfinger --bench sweep`.
//!
//! The scene is `scenes/packing-line-mix10.ron` (the demo gripper's actuator and ten
//! objects); the space draws `ARCFINGER_BENCH_CANDIDATES` (default 1000) ring layouts of
//! 3 to 5 fingers from a Latin hypercube, with windows over 20..120 kPa in 20 kPa steps
//! and verdicts at the 100 kPa supply, so each candidate is 10 objects x 6 pressures of the grasp
//! check. The bench prints the wall time and CPU time (user + system, of the child
//! process) and the rate, and for a smaller run the time 1000 candidates would take at
//! that rate. `RAYON_NUM_THREADS` is passed through (set it to 2 for the 2-core figure).

use std::path::PathBuf;
use std::process::Command;
use std::time::Instant;

fn space(samples: usize) -> String {
    format!(
        "SearchSpace(
    name: \"bench\",
    layouts: [Ring(fingers: [3, 4, 5])],
    radius_mm: Range(55.0, 75.0),
    tilt_deg: Range(-10.0, 15.0),
    azimuth_offset_deg: Range(0.0, 60.0),
    actuators: [\"box-100\"],
    pressures_kpa: (20.0, 120.0, 20.0),
    check_pressure_kpa: Some(100.0),
    sampling: LatinHypercube(samples: {samples}),
    seed: 1,
)
"
    )
}

#[path = "support/mod.rs"]
mod support;
use support::children_cpu_seconds;

fn main() {
    let samples: usize =
        std::env::var("ARCFINGER_BENCH_CANDIDATES").ok().and_then(|s| s.parse().ok()).unwrap_or(1000);
    let root = PathBuf::from(env!("CARGO_MANIFEST_DIR")).join("..");
    let dir = std::env::temp_dir().join(format!("arcfinger-bench-sweep-{}", std::process::id()));
    std::fs::create_dir_all(&dir).expect("temp dir");
    let space_path = dir.join("space.ron");
    std::fs::write(&space_path, space(samples)).expect("write space");
    let out = dir.join("out.jsonl");
    let cpu0 = children_cpu_seconds();
    let t0 = Instant::now();
    let status = Command::new(env!("CARGO_BIN_EXE_arcfinger"))
        .arg("sweep")
        .arg(root.join("scenes/packing-line-mix10.ron"))
        .arg("--space")
        .arg(&space_path)
        .arg("--out")
        .arg(&out)
        .args(["--quiet", "--top", "3"])
        .status()
        .expect("run arcfinger");
    let wall = t0.elapsed().as_secs_f64();
    let cpu = match (cpu0, children_cpu_seconds()) {
        (Some(a), Some(b)) => format!("{:.1} s", b - a),
        _ => "unknown".into(),
    };
    let lines = std::fs::read_to_string(&out).map(|s| s.lines().count()).unwrap_or(0);
    println!(
        "sweep: {lines} candidates x 10 objects x 6 pressures in {wall:.1} s wall, {cpu} CPU, \
         {:.3} candidates/s (exit code {}); 1000 candidates at this rate: {:.0} s",
        lines as f64 / wall,
        status.code().map_or("none".to_string(), |c| c.to_string()),
        1000.0 * wall / lines.max(1) as f64
    );
    let _ = std::fs::remove_dir_all(&dir);
}

//! Speed of the viewer and the offscreen renderer (feature `viewer`), whole process:
//! - `render` of a 1024x768 picture of each demo scene (median wall time and mean CPU
//!   time over `ARCFINGER_BENCH_RUNS` runs, default 3; the target is under 5 s);
//! - under X (`DISPLAY`, or a fresh `Xvfb` when one is on PATH): the viewer at
//!   1280x720 on the 3-finger demo, scripted: a full orbit of 240 frames with shadows
//!   off (frames/s), four pressure steps and an object step (the core's re-solve time
//!   of each), then 10 s idle after the sweep (CPU time).
//!
//! Run with `cargo bench -p arcfinger --features viewer --bench viewer`; the figures go
//! into the README.

use std::path::PathBuf;
use std::process::{Command, Stdio};
use std::time::{Duration, Instant};

#[path = "support/mod.rs"]
mod support;
use support::children_cpu_seconds;

fn main() {
    let runs: usize =
        std::env::var("ARCFINGER_BENCH_RUNS").ok().and_then(|s| s.parse().ok()).unwrap_or(3).max(1);
    let root = PathBuf::from(env!("CARGO_MANIFEST_DIR")).join("..");
    let out = std::env::temp_dir().join(format!("arcfinger-bench-{}.png", std::process::id()));
    for scene in ["packing-line-3f", "packing-line-4f"] {
        let path = root.join("scenes").join(format!("{scene}.ron"));
        let cpu0 = children_cpu_seconds();
        let mut walls = Vec::with_capacity(runs);
        for _ in 0..runs {
            let t0 = Instant::now();
            let run = Command::new(env!("CARGO_BIN_EXE_arcfinger"))
                .arg("render")
                .arg(&path)
                .args(["--out", &out.display().to_string(), "--size", "1024x768"])
                .output()
                .expect("run arcfinger");
            walls.push(t0.elapsed().as_secs_f64());
            assert!(run.status.success(), "render failed: {}", String::from_utf8_lossy(&run.stderr));
        }
        walls.sort_by(f64::total_cmp);
        let cpu = match (cpu0, children_cpu_seconds()) {
            (Some(a), Some(b)) => format!("{:.2} s", (b - a) / runs as f64),
            _ => "unknown".into(),
        };
        println!(
            "render {scene} 1024x768: median {:.2} s wall, {cpu} CPU per run over {runs} runs",
            walls[runs / 2]
        );
    }
    let _ = std::fs::remove_file(&out);
    let (display, mut server) = match std::env::var("DISPLAY") {
        Ok(d) if !d.is_empty() => (d, None),
        _ => {
            let n = 700 + std::process::id() % 200;
            match Command::new("Xvfb")
                .args([&format!(":{n}"), "-screen", "0", "1280x720x24", "-nolisten", "tcp"])
                .stdout(Stdio::null())
                .stderr(Stdio::null())
                .spawn()
            {
                Ok(c) => {
                    let socket = PathBuf::from(format!("/tmp/.X11-unix/X{n}"));
                    let t0 = Instant::now();
                    while !socket.exists() && t0.elapsed() < Duration::from_secs(20) {
                        std::thread::sleep(Duration::from_millis(100));
                    }
                    (format!(":{n}"), Some(c))
                }
                Err(_) => {
                    println!("viewer: no DISPLAY and no Xvfb: frame rate, re-solve and idle not measured");
                    return;
                }
            }
        }
    };
    let scene = root.join("scenes/packing-line-3f.ron");
    let run = Command::new(env!("CARGO_BIN_EXE_arcfinger"))
        .arg("view")
        .arg(&scene)
        .args(["--script", "orbit:240,up,up,down,down,next,prev,idle:10,quit"])
        .env("DISPLAY", &display)
        .output()
        .expect("run arcfinger view");
    if let Some(s) = server.as_mut() {
        let _ = s.kill();
        let _ = s.wait();
    }
    let stderr = String::from_utf8_lossy(&run.stderr);
    assert!(run.status.success(), "view failed: {stderr}");
    for line in
        stderr.lines().filter(|l| l.contains("orbit of") || l.contains("solved") || l.contains("idle"))
    {
        println!("viewer 1280x720 packing-line-3f: {}", line.trim_start_matches("arcfinger: "));
    }
}

//! Shared helpers: a unique temporary folder and a runner for the binary.

#![allow(dead_code)]

use std::path::{Path, PathBuf};
use std::process::Command;

/// The repository root (the workspace folder).
pub fn root() -> PathBuf {
    Path::new(env!("CARGO_MANIFEST_DIR")).parent().expect("app/ has a parent").to_path_buf()
}

/// A path under the repository root.
pub fn repo(rel: &str) -> PathBuf {
    root().join(rel)
}

/// A fresh, empty temporary folder for one test, removed when dropped.
pub struct TempDir(PathBuf);

impl TempDir {
    /// A new folder named after the test.
    pub fn new(name: &str) -> Self {
        let p = std::env::temp_dir().join(format!("arcfinger-test-{}-{name}", std::process::id()));
        let _ = std::fs::remove_dir_all(&p);
        std::fs::create_dir_all(&p).expect("create temp dir");
        Self(p)
    }
    /// The folder.
    pub fn path(&self) -> &Path {
        &self.0
    }
    /// Writes `text` to `name` inside the folder and returns its path.
    pub fn write(&self, name: &str, text: &str) -> PathBuf {
        let p = self.0.join(name);
        if let Some(d) = p.parent() {
            std::fs::create_dir_all(d).expect("create parent");
        }
        std::fs::write(&p, text).expect("write file");
        p
    }
}

impl Drop for TempDir {
    fn drop(&mut self) {
        let _ = std::fs::remove_dir_all(&self.0);
    }
}

/// What a run of the binary produced.
#[derive(Debug)]
pub struct Run {
    /// Exit code (-1 if killed by a signal).
    pub code: i32,
    /// Standard output.
    pub stdout: String,
    /// Standard error.
    pub stderr: String,
}

impl Run {
    /// Panics with the whole output unless the exit code is `code`; also checks that
    /// nothing panicked.
    pub fn expect_code(self, code: i32) -> Self {
        assert!(
            self.code == code,
            "expected exit code {code}, got {}\n--- stdout\n{}\n--- stderr\n{}",
            self.code,
            self.stdout,
            self.stderr
        );
        assert!(!self.stderr.contains("panicked"), "a panic on stderr:\n{}", self.stderr);
        self
    }
}

/// Runs `arcfinger` with `args` in the repository root.
pub fn arcfinger(args: &[&str]) -> Run {
    arcfinger_in(&root(), args)
}

/// Runs `arcfinger` with `args` in folder `dir`.
pub fn arcfinger_in(dir: &Path, args: &[&str]) -> Run {
    arcfinger_env(dir, args, &[])
}

/// Runs `arcfinger` with `args` in folder `dir` with extra environment variables.
pub fn arcfinger_env(dir: &Path, args: &[&str], env: &[(&str, &str)]) -> Run {
    let mut cmd = Command::new(env!("CARGO_BIN_EXE_arcfinger"));
    cmd.args(args).current_dir(dir).env("NO_COLOR", "1");
    for (k, v) in env {
        cmd.env(k, v);
    }
    let out = cmd.output().expect("run arcfinger");
    Run {
        code: out.status.code().unwrap_or(-1),
        stdout: String::from_utf8_lossy(&out.stdout).into_owned(),
        stderr: String::from_utf8_lossy(&out.stderr).into_owned(),
    }
}

//! Where results go: stdout or files, written atomically.
//!
//! A file is written to a temporary sibling (`.NAME.tmp-PID`) and renamed over the
//! target, so a reader never sees half a file and an interrupted run leaves the previous
//! output intact. `-` means stdout. Output paths that name an input file are refused by
//! the commands before any work is done ([`refuse_overwrite`]).

use std::io::Write;
use std::path::{Path, PathBuf};

use crate::error::AppError;

/// An output destination given on the command line.
#[derive(Debug, Clone, PartialEq, Eq)]
pub enum Sink {
    /// Standard output (`-`).
    Stdout,
    /// A file.
    File(PathBuf),
}

impl Sink {
    /// `-` is stdout, anything else a path.
    pub fn parse(s: &str) -> Self {
        if s == "-" { Self::Stdout } else { Self::File(PathBuf::from(s)) }
    }

    /// Writes `bytes` to the sink.
    ///
    /// # Errors
    /// I/O failures, with the path.
    pub fn write(&self, bytes: &[u8]) -> Result<(), AppError> {
        match self {
            Self::Stdout => {
                let mut out = std::io::stdout().lock();
                out.write_all(bytes)
                    .and_then(|()| out.flush())
                    .map_err(|e| AppError::io("writing to stdout", e))
            }
            Self::File(p) => write_atomic(p, bytes),
        }
    }
}

/// Writes `bytes` to `path` through a temporary file in the same folder and a rename.
///
/// # Errors
/// I/O failures, with the path.
pub fn write_atomic(path: &Path, bytes: &[u8]) -> Result<(), AppError> {
    let dir = match path.parent() {
        Some(d) if !d.as_os_str().is_empty() => d.to_path_buf(),
        _ => PathBuf::from("."),
    };
    let name =
        path.file_name().ok_or_else(|| AppError::input(format!("{}: not a file name", path.display())))?;
    let tmp = dir.join(format!(".{}.tmp-{}", name.to_string_lossy(), std::process::id()));
    let result = (|| {
        // a new file only: a link planted at the temporary name is removed, never followed
        let create = || std::fs::OpenOptions::new().write(true).create_new(true).open(&tmp);
        let mut f = match create() {
            Err(e) if e.kind() == std::io::ErrorKind::AlreadyExists => {
                std::fs::remove_file(&tmp)?;
                create()?
            }
            other => other?,
        };
        f.write_all(bytes)?;
        f.sync_all()?;
        std::fs::rename(&tmp, path)
    })();
    if let Err(e) = result {
        let _ = std::fs::remove_file(&tmp);
        return Err(AppError::io(format!("writing {}", path.display()), e));
    }
    Ok(())
}

/// Refuses an output path that is (or resolves to) one of the inputs.
///
/// # Errors
/// [`AppError::Input`] naming both.
pub fn refuse_overwrite(output: &Path, inputs: &[&Path]) -> Result<(), AppError> {
    let canon = |p: &Path| std::fs::canonicalize(p).ok();
    let out = canon(output);
    for input in inputs {
        if output == *input || (out.is_some() && out == canon(input)) {
            return Err(AppError::input(format!(
                "{}: refusing to overwrite an input file; choose another output path",
                output.display()
            )));
        }
    }
    Ok(())
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn atomic_write_replaces_content_and_leaves_no_temporary() {
        let dir = std::env::temp_dir().join(format!("arcfinger-out-{}", std::process::id()));
        std::fs::create_dir_all(&dir).unwrap();
        let p = dir.join("a.json");
        write_atomic(&p, b"one").unwrap();
        write_atomic(&p, b"two").unwrap();
        assert_eq!(std::fs::read(&p).unwrap(), b"two");
        let names: Vec<_> = std::fs::read_dir(&dir).unwrap().map(|e| e.unwrap().file_name()).collect();
        assert_eq!(names.len(), 1);
        assert!(refuse_overwrite(&p, &[&p]).is_err());
        assert!(refuse_overwrite(&dir.join("b.json"), &[&p]).is_ok());
        std::fs::remove_dir_all(&dir).unwrap();
    }

    /// A symbolic link waiting at the temporary name is not followed: the file it points
    /// to stays as it was, and the output is written.
    #[cfg(unix)]
    #[test]
    fn a_link_at_the_temporary_name_is_not_followed() {
        let dir = std::env::temp_dir().join(format!("arcfinger-out-link-{}", std::process::id()));
        std::fs::create_dir_all(&dir).unwrap();
        let victim = dir.join("victim.txt");
        std::fs::write(&victim, b"keep").unwrap();
        let tmp = dir.join(format!(".a.json.tmp-{}", std::process::id()));
        std::os::unix::fs::symlink(&victim, &tmp).unwrap();
        write_atomic(&dir.join("a.json"), b"new").unwrap();
        assert_eq!(std::fs::read(&victim).unwrap(), b"keep");
        assert_eq!(std::fs::read(dir.join("a.json")).unwrap(), b"new");
        assert!(!tmp.exists() && tmp.symlink_metadata().is_err(), "the temporary name is gone");
        std::fs::remove_dir_all(&dir).unwrap();
    }

    #[test]
    fn writing_into_a_missing_folder_is_an_io_error() {
        let e = write_atomic(Path::new("/nonexistent-folder-arcfinger/x.json"), b"x").unwrap_err();
        assert_eq!(e.exit_code(), 2);
        assert!(e.to_string().contains("/nonexistent-folder-arcfinger/x.json"));
    }
}

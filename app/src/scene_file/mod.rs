//! Scene files (RON, DESIGN 4.2): reading, parsing, validation with field paths, and
//! conversion to the SI model of `grasp_core::scene`.
//!
//! [`load`] is the entry point; it runs three stages, each with its own kind of message:
//!
//! 1. reading ([`read_source`]): the path and the OS error; non-UTF-8 text with its
//!    line and column;
//! 2. parsing ([`parse_doc`]): `FILE:LINE:COL: message`, the source line with a caret,
//!    and notes (valid names, the nearest one) — see [`diagnostics`];
//! 3. validation and conversion ([`validate::build_scene`]): every problem, one per
//!    line, as `FILE: PATH: must be ..., got ...`; mesh objects are read here
//!    ([`mesh`]).
//!
//! [`load_embedded`] does the same for a scene built into the binary (the bundled demo),
//! with its mesh files from an in-memory table: the same parsing, the same validation,
//! the same mesh checks, only no file system.
//!
//! Every failure is an [`AppError::Input`] or [`AppError::Io`] (exit code 2). Input files
//! are only ever read.

mod diagnostics;
mod locate;
mod mesh;
mod validate;

#[cfg(test)]
mod tests;

use std::path::{Path, PathBuf};

use grasp_core::scene::Scene;

use crate::error::AppError;
use crate::scene_doc::SceneDoc;

pub use diagnostics::parse_error_message;
pub use mesh::MeshSource;
pub use validate::{Problem, build_scene, build_scene_from};

/// Largest scene file read (bytes). Scenes are hand-written text of a few kilobytes;
/// meshes live in their own files.
pub const MAX_SCENE_BYTES: u64 = 16 * 1024 * 1024;

/// Loads, validates and converts the scene at `path`.
///
/// # Errors
/// [`AppError::Io`] when the file cannot be read, [`AppError::Input`] when it does not
/// parse or does not validate, with messages as described in the module docs.
#[allow(dead_code, reason = "the plain entry point; the commands with a mesh flag call `load_with`")]
pub fn load(path: &Path) -> Result<Scene, AppError> {
    load_with(path, MeshAccess::SceneFolder)
}

/// Which mesh paths a scene file may give.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum MeshAccess {
    /// Only files inside the scene file's folder (the default: scenes are untrusted).
    SceneFolder,
    /// Any readable regular file: absolute paths, `..`, links out of the folder
    /// (`--allow-outside-meshes`).
    Anywhere,
}

impl MeshAccess {
    /// From the command-line flag.
    pub fn from_flag(allow_outside: bool) -> Self {
        if allow_outside { Self::Anywhere } else { Self::SceneFolder }
    }
}

/// As [`load`], with the mesh paths allowed by `meshes`.
///
/// # Errors
/// As [`load`].
pub fn load_with(path: &Path, meshes: MeshAccess) -> Result<Scene, AppError> {
    let file = path.display().to_string();
    let text = read_source(path)?;
    let doc = parse_doc(&file, &text)?;
    let dir = scene_dir(path);
    let built = match meshes {
        MeshAccess::SceneFolder => build_scene(&doc, &dir),
        MeshAccess::Anywhere => build_scene_from(&doc, MeshSource::Anywhere(&dir)),
    };
    built.map_err(|problems| AppError::Input(format_problems(&file, &problems)))
}

/// Loads, validates and converts a scene given as text, named `name` in messages, whose
/// mesh paths (as written in the scene) are looked up in `meshes`.
///
/// # Errors
/// [`AppError::Input`] when it does not parse or does not validate (a mesh path that is
/// not in `meshes` included), with the same messages as [`load`].
pub fn load_embedded(name: &str, text: &str, meshes: &[(&str, &[u8])]) -> Result<Scene, AppError> {
    let text = text.strip_prefix('\u{feff}').unwrap_or(text);
    let doc = parse_doc(name, text)?;
    build_scene_from(&doc, MeshSource::Embedded(meshes))
        .map_err(|problems| AppError::Input(format_problems(name, &problems)))
}

/// The folder mesh paths of the scene at `path` are relative to.
pub fn scene_dir(path: &Path) -> PathBuf {
    match path.parent() {
        Some(d) if !d.as_os_str().is_empty() => d.to_path_buf(),
        _ => PathBuf::from("."),
    }
}

/// Reads a scene file as UTF-8 text (a leading byte-order mark is dropped).
///
/// # Errors
/// [`AppError::Io`] with the path when it cannot be read; [`AppError::Input`] when it is
/// too large or not UTF-8.
pub fn read_source(path: &Path) -> Result<String, AppError> {
    let shown = path.display();
    let meta =
        std::fs::metadata(path).map_err(|e| AppError::io(format!("cannot read scene file {shown}"), e))?;
    if meta.is_dir() {
        return Err(AppError::input(format!("{shown}: is a folder, not a scene file")));
    }
    if !meta.is_file() {
        // a pipe or a device could block the read forever or never end
        return Err(AppError::input(format!(
            "{shown}: is not a regular file (a pipe, socket or device); give a scene file"
        )));
    }
    if meta.len() > MAX_SCENE_BYTES {
        return Err(AppError::input(format!(
            "{shown}: {} bytes is too large for a scene file (at most {MAX_SCENE_BYTES}); meshes belong in their own files",
            meta.len()
        )));
    }
    let bytes =
        std::fs::read(path).map_err(|e| AppError::io(format!("cannot read scene file {shown}"), e))?;
    match String::from_utf8(bytes) {
        Ok(mut s) => {
            if s.starts_with('\u{feff}') {
                s.drain(..'\u{feff}'.len_utf8());
            }
            Ok(s)
        }
        Err(e) => {
            let valid = &e.as_bytes()[..e.utf8_error().valid_up_to()];
            // the valid prefix is UTF-8 by definition
            let before = String::from_utf8_lossy(valid);
            let line = before.matches('\n').count() + 1;
            let col = before.rsplit('\n').next().map_or(0, |l| l.chars().count()) + 1;
            Err(AppError::input(format!(
                "{shown}:{line}:{col}: the file is not UTF-8 text (save it as UTF-8)"
            )))
        }
    }
}

/// Parses scene text; `file` names it in messages.
///
/// # Errors
/// [`AppError::Input`] with `FILE:LINE:COL: message`, the offending line, a caret, and
/// notes.
pub fn parse_doc(file: &str, text: &str) -> Result<SceneDoc, AppError> {
    ron::from_str::<SceneDoc>(text)
        .map_err(|e| AppError::Input(diagnostics::parse_error_message(file, text, &e)))
}

/// One line per problem, each prefixed with the file name.
pub fn format_problems(file: &str, problems: &[Problem]) -> String {
    problems.iter().map(|p| format!("{file}: {p}")).collect::<Vec<_>>().join("\n")
}

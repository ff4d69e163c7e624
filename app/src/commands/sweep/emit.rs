//! `--emit-top K DIR`: a scene file for each of the best K candidates.
//!
//! Each file is the input scene's document with the candidate's fingers, the space's
//! pressure sweep, and as supply pressure the candidate's recommended pressure (or the
//! check pressure when it has none), written as RON. Mesh files the scene uses are copied
//! into DIR under the same relative paths (scene files may only reach meshes below their
//! own folder); an existing file there is kept if it has the same bytes and refused
//! otherwise. No input file is ever written: every target is checked against the inputs
//! first, and files are written atomically.

use std::path::{Path, PathBuf};

use super::layout;
use super::record::Record;
use super::space_file::Space;
use crate::error::AppError;
use crate::output::{refuse_overwrite, write_atomic};
use crate::scene_doc::SceneDoc;

/// The scene document as RON text, with a header comment.
///
/// # Errors
/// Serialisation failures, as an input error.
pub fn scene_text(doc: &SceneDoc, header: &str) -> Result<String, AppError> {
    let body = ron::ser::to_string_pretty(doc, ron::ser::PrettyConfig::new().indentor("    "))
        .map_err(|e| AppError::input(format!("writing a scene: {e}")))?;
    let mut s = String::new();
    for line in header.lines() {
        s.push_str("// ");
        s.push_str(line);
        s.push('\n');
    }
    // the document's own name is `Scene`; the pretty printer leaves struct names out
    s.push_str("Scene");
    s.push_str(&body);
    s.push('\n');
    Ok(s)
}

/// The file name of rank `rank` (1-based), candidate `index`.
pub fn file_name(rank: usize, index: usize) -> String {
    format!("top{rank}-candidate{index}.ron")
}

/// What to write: the targets and their contents.
pub struct Plan {
    files: Vec<(PathBuf, Vec<u8>)>,
}

/// Prepares the files for the `ranked` records (best first, errors skipped) without
/// writing anything.
///
/// # Errors
/// A target that is an input, a mesh target that exists with other bytes, a candidate
/// whose document does not build.
#[expect(
    clippy::too_many_arguments,
    reason = "the inputs of one step, each used once; a struct would only be built here"
)]
pub fn plan(
    ranked: &[&Record],
    k: usize,
    dir: &Path,
    base: &SceneDoc,
    space: &Space,
    meshes: &[(String, Vec<u8>)],
    scene_file: &Path,
    inputs: &[&Path],
) -> Result<Plan, AppError> {
    let mut files = Vec::new();
    for (rank, r) in ranked.iter().filter(|r| r.error.is_none()).take(k).enumerate() {
        let fingers = r
            .layout
            .azimuths_deg
            .iter()
            .map(|&az| crate::scene_doc::FingerDoc {
                actuator: r.layout.actuator.clone(),
                azimuth_deg: az,
                radius_mm: r.layout.radius_mm,
                tilt_deg: r.layout.tilt_deg,
            })
            .collect();
        let pressure = r.recommended_pressure_kpa.unwrap_or(r.check_pressure_kpa);
        let mut doc = layout::scene_doc(base, space, fingers, pressure);
        doc.name = format!("{}-candidate-{}", base.name, r.index);
        let score = r.score.as_ref();
        let header = format!(
            "Written by `arcfinger sweep` from {} and the search space \"{}\": rank {} of the sweep,\n\
             candidate {} ({} {} fingers), covering {} of {} objects. Supply pressure: {}.\n\
             A design estimate, not a certification; see the cautions in the README.",
            scene_file.display(),
            space.doc.name,
            rank + 1,
            r.index,
            r.layout.pattern,
            r.layout.fingers,
            score.map_or(0, |s| s.covered),
            score.map_or(0, |s| s.objects),
            if r.recommended_pressure_kpa.is_some() {
                "the candidate's recommended pressure"
            } else {
                "the sweep's check pressure (no single pressure holds every object)"
            }
        );
        let target = dir.join(file_name(rank + 1, r.index));
        refuse_overwrite(&target, inputs)?;
        files.push((target, scene_text(&doc, &header)?.into_bytes()));
    }
    let scene_dir = crate::scene_file::scene_dir(scene_file);
    for (rel, bytes) in meshes {
        let target = dir.join(rel);
        let source = scene_dir.join(rel);
        let same_file = matches!(
            (std::fs::canonicalize(&target), std::fs::canonicalize(&source)),
            (Ok(a), Ok(b)) if a == b
        );
        if same_file {
            continue;
        }
        refuse_overwrite(&target, inputs)?;
        match std::fs::read(&target) {
            Ok(existing) if existing == *bytes => continue,
            Ok(_) => {
                return Err(AppError::input(format!(
                    "{}: exists with other contents than the scene's mesh {}; refusing to replace it",
                    target.display(),
                    source.display()
                )));
            }
            Err(_) => files.push((target, bytes.clone())),
        }
    }
    Ok(Plan { files })
}

impl Plan {
    /// Writes the files (folders created as needed); returns the scene files written.
    ///
    /// # Errors
    /// I/O failures, with the path.
    pub fn write(self) -> Result<Vec<PathBuf>, AppError> {
        let mut written = Vec::new();
        for (path, bytes) in self.files {
            if let Some(d) = path.parent() {
                std::fs::create_dir_all(d)
                    .map_err(|e| AppError::io(format!("creating {}", d.display()), e))?;
            }
            write_atomic(&path, &bytes)?;
            written.push(path);
        }
        Ok(written)
    }
}

//! From a core [`Candidate`] to the scene it stands for: finger mounts in file units, the
//! scene document with the candidate's gripper and pressures, and the validated scene.
//!
//! The candidate's scene is built by the scene loader itself from a document, so the
//! scene file written for a candidate (`--emit-top`) loads into exactly the scene that
//! was checked. Mount values are rounded to 1e-6 mm and 1e-6 degrees first, so the file
//! reads well and holds the very numbers that were evaluated.

use grasp_core::geometry::HubPattern;
use grasp_core::scene::Scene;
use grasp_core::sweep::Candidate;

use super::record::LayoutRecord;
use super::space_file::Space;
use crate::scene_doc::{FingerDoc, SceneDoc};
use crate::scene_file::{MeshSource, build_scene_from};

/// `x` rounded to 6 decimals (and `-0` written as `0`).
pub fn round6(x: f64) -> f64 {
    (x * 1e6).round() / 1e6 + 0.0
}

/// The finger mounts of `c` in file units.
///
/// # Errors
/// The pattern's own refusal, as text (the space's validation keeps it from happening).
pub fn finger_docs(c: &Candidate, actuator_names: &[String]) -> Result<Vec<FingerDoc>, String> {
    let name = actuator_names.get(c.actuator).ok_or_else(|| format!("no actuator {}", c.actuator))?;
    let mounts = c.layout.mounts(c.actuator).map_err(|e| e.to_string())?;
    Ok(mounts
        .iter()
        .map(|m| FingerDoc {
            actuator: name.clone(),
            azimuth_deg: round6(m.azimuth.to_degrees()),
            radius_mm: round6(m.radius * 1e3),
            tilt_deg: round6(m.tilt.to_degrees()),
        })
        .collect())
}

/// The layout record of `c` with its fingers `fingers`.
pub fn layout_record(c: &Candidate, fingers: &[FingerDoc], actuator_names: &[String]) -> LayoutRecord {
    let (pattern, radius, tilt, azimuth_offset, spread) = match c.layout {
        HubPattern::Ring { radius, tilt, azimuth_offset, .. } => ("ring", radius, tilt, azimuth_offset, None),
        HubPattern::OpposedPairs { spread, radius, tilt, azimuth_offset, .. } => {
            ("opposed-pairs", radius, tilt, azimuth_offset, Some(spread))
        }
    };
    LayoutRecord {
        pattern: pattern.into(),
        fingers: c.fingers(),
        actuator: actuator_names.get(c.actuator).cloned().unwrap_or_default(),
        radius_mm: round6(radius * 1e3),
        tilt_deg: round6(tilt.to_degrees()),
        azimuth_offset_deg: round6(azimuth_offset.to_degrees()),
        spread_deg: spread.map(|s| round6(s.to_degrees())),
        azimuths_deg: fingers.iter().map(|f| f.azimuth_deg).collect(),
    }
}

/// The scene document of a candidate: the base scene with the candidate's fingers, the
/// space's pressure sweep, and `pressure_kpa` as the supply pressure.
pub fn scene_doc(base: &SceneDoc, space: &Space, fingers: Vec<FingerDoc>, pressure_kpa: f64) -> SceneDoc {
    let mut doc = base.clone();
    doc.gripper.fingers = fingers;
    doc.criteria.sweep_kpa = Some(space.pressures_kpa);
    doc.criteria.pressure_kpa = pressure_kpa;
    doc
}

/// Validates and converts a candidate's document with the scene loader.
///
/// # Errors
/// The loader's problems, one per line.
pub fn build(doc: &SceneDoc, meshes: &[(&str, &[u8])]) -> Result<Scene, String> {
    build_scene_from(doc, MeshSource::Embedded(meshes))
        .map_err(|p| p.iter().map(ToString::to_string).collect::<Vec<_>>().join("; "))
}

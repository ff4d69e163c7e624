//! Scene files (RON, DESIGN 4.2): parsing, validation with field paths, conversion to SI.
//! (Placeholder until the scene loader lands.)

use std::path::Path;

use grasp_core::scene::Scene;

use crate::error::AppError;

/// Loads and validates the scene at `path`.
pub fn load(path: &Path) -> Result<Scene, AppError> {
    Err(AppError::input(format!("{}: scene loading is not built yet", path.display())))
}

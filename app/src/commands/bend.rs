//! `arcfinger bend` (in progress).

use crate::cli::BendArgs;
use crate::error::{AppError, Outcome};

/// Runs `bend`.
pub fn run(args: BendArgs) -> Result<Outcome, AppError> {
    let _scene = crate::scene_file::load(&args.scene)?;
    Err(AppError::input("bend is not built yet"))
}

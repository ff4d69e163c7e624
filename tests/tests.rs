//! End-to-end tests: run the `arcfinger` binary on scene and data files and compare
//! against references outside the project. One module per area.

mod util;
// Bad scene files: messages with line:column or field path, exit code 2, no panic.
mod scene_errors;

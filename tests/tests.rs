//! End-to-end tests: run the `arcfinger` binary on scene and data files and compare
//! against references outside the project. One module per area.

mod util;

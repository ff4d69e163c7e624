//! End-to-end tests: run the `arcfinger` binary on scene and data files and compare
//! against references outside the project. One module per area.

mod util;

// `arcfinger fit`: material fits on Treloar's data, JSON contract, refusals of bad CSV.
mod fit;

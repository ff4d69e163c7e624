//! End-to-end tests: run the `arcfinger` binary on scene and data files and compare
//! against references outside the project. One module per area.

mod util;

// `arcfinger check`: usage errors found before the grasp check runs (exit 2, inputs untouched).
mod check;
// `arcfinger bend`: table, JSON contract, SVG plot on the demo scenes; usage errors.
mod bend;
// Bad scene files: messages with line:column or field path, exit code 2, no panic.
mod scene_errors;
// `arcfinger fit`: material fits on Treloar's data, JSON contract, refusals of bad CSV.
mod fit;
// `arcfinger sweep` and `merge`: shards, resume and thread count give the same file; emitted scenes.
mod sweep;
// `arcfinger review`: one self-contained, well-formed HTML file with charts; Markdown summary; escaping.
mod review;

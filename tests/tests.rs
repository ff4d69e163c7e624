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
// `arcfinger fab`: fabrication sheet, JSON contract, 1:1 SVG templates on the demo scenes.
mod fab;
// `arcfinger calibrate`: fit to the demo bench data, calibrated scene next to the input.
mod calibrate;
// The bad-input suite: a table of hostile and broken inputs, each exit 2 with the place.
mod bad_inputs;
// Time limit, interrupted runs, hostile names in reports, meshes outside the folder.
mod hardening;
// `arcfinger sweep` and `merge`: shards, resume and thread count give the same file; emitted scenes.
mod sweep;
// `arcfinger review`: one self-contained, well-formed HTML file with charts; Markdown summary; escaping.
mod review;
// `arcfinger render` and `view`: offscreen pictures checked against our own projection; builds without the viewer.
mod render;

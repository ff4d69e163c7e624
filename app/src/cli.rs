//! Command-line options (clap derive). Each command's options are turned into a
//! validated configuration inside its module before any work is done.

use std::path::PathBuf;

use clap::{Args, Parser, Subcommand, ValueEnum};

/// Lay out soft pneumatic fingers on a hub and check them against a set of target
/// objects.
///
/// Exit codes: 0 = all checks pass, 1 = a check failed, 2 = bad input or usage,
/// 3 = a solver did not converge.
#[derive(Debug, Parser)]
#[command(name = "arcfinger", version, about, long_about = None)]
pub struct Opts {
    /// What to do.
    #[command(subcommand)]
    pub command: Command,
}

/// The commands.
#[derive(Debug, Subcommand)]
pub enum Command {
    /// Grasp check: does the gripper touch, enclose and hold every object with margin?
    Check(CheckArgs),
    /// Free-bending curve and blocked tip force of one actuator over a pressure range.
    Bend(BendArgs),
    /// List the built-in casting-silicone classes and their parameters.
    Materials(MaterialsArgs),
    /// Fit a hyperelastic model to stress-stretch test data (CSV) and print a material block.
    Fit(FitArgs),
    /// Fabrication sheet: molds, silicone, fiber and cut templates for each actuator.
    Fab(FabArgs),
    /// Fit the model to a measured prototype and write a calibrated copy of the scene.
    Calibrate(CalibrateArgs),
    /// Search a space of hub layouts for the gripper that holds the most objects.
    Sweep(SweepArgs),
    /// Combine the results files of sweep shards into the result of the whole sweep.
    Merge(MergeArgs),
    /// Side-by-side review of 1 to 6 candidate grippers: an HTML report and a Markdown summary.
    Review(ReviewArgs),
    /// 3-D viewer: the gripper at a pressure on each object, re-solved as you step the pressure.
    View(ViewArgs),
    /// Offscreen picture of the gripper holding an object (PNG, no window, no display).
    Render(RenderArgs),
}

/// `arcfinger check`.
#[derive(Debug, Args)]
pub struct CheckArgs {
    /// Scene file (RON) [default: the bundled demo scene, packing-line-3f].
    pub scene: Option<PathBuf>,
    /// Write the JSON result to FILE (`-` = stdout; the table then goes to stderr).
    #[arg(long, value_name = "FILE")]
    pub json: Option<String>,
    /// Write a JUnit XML report (one test case per object) to FILE (`-` = stdout).
    #[arg(long, value_name = "FILE")]
    pub junit: Option<String>,
    /// Write a Markdown summary for a pull-request comment to FILE (`-` = stdout).
    #[arg(long, value_name = "FILE")]
    pub markdown: Option<String>,
    /// Check at this supply pressure (kPa) instead of the scene's; at most the rated maximum.
    #[arg(long, value_name = "KPA", allow_negative_numbers = true)]
    pub pressure: Option<f64>,
    /// Rod elements along each chamber (>= 40).
    #[arg(long, value_name = "N", default_value_t = 40)]
    pub elements: usize,
    /// Also run a robustness study: N Monte Carlo samples of the scene with the shop's
    /// scatter of modulus, wall thicknesses, friction and object size, checked at the
    /// supply pressure; per object the pass probability and the criterion that fails most.
    #[arg(long, value_name = "N")]
    pub robust: Option<usize>,
    /// Seed of the robustness study's random streams.
    #[arg(long, value_name = "S", default_value_t = 1, requires = "robust")]
    pub seed: u64,
    /// Stop the check after this many seconds: its result is then unknown (exit 3).
    #[arg(long, value_name = "SECONDS", allow_negative_numbers = true, default_value_t = crate::budget::DEFAULT_TIME_LIMIT_S)]
    pub time_limit: f64,
    /// Let the scene read mesh files outside its own folder (absolute paths, `..`).
    #[arg(long)]
    pub allow_outside_meshes: bool,
}

/// Which moment balance `bend` uses.
#[derive(Debug, Clone, Copy, PartialEq, Eq, ValueEnum)]
pub enum SectionModelArg {
    /// Plain moment balance.
    Baseline,
    /// Moment balance plus the pressure acting through the wall thickness.
    WallPressure,
}

/// `arcfinger bend`.
#[derive(Debug, Args)]
pub struct BendArgs {
    /// Scene file (RON).
    pub scene: PathBuf,
    /// Actuator name from the scene (may be left out when the scene has only one).
    #[arg(long, value_name = "NAME")]
    pub actuator: Option<String>,
    /// Pressures in kPa as FROM:TO:STEP, e.g. 0:60:5 [default: 0 to the rated pressure in 20 steps].
    #[arg(long, value_name = "A:B:STEP")]
    pub pressures: Option<String>,
    /// Override the actuator's moment balance.
    #[arg(long, value_enum, value_name = "MODEL")]
    pub section_model: Option<SectionModelArg>,
    /// Write the JSON result to FILE (`-` = stdout).
    #[arg(long, value_name = "FILE")]
    pub json: Option<String>,
    /// Draw bend angle and blocked force against pressure into an SVG file.
    #[arg(long, value_name = "FILE.svg")]
    pub plot: Option<PathBuf>,
    /// Rod elements along the chamber for the blocked-force solve (>= 40).
    #[arg(long, value_name = "N", default_value_t = 48)]
    pub elements: usize,
    /// Let the scene read mesh files outside its own folder (absolute paths, `..`).
    #[arg(long)]
    pub allow_outside_meshes: bool,
}

/// `arcfinger materials`.
#[derive(Debug, Args)]
pub struct MaterialsArgs {
    /// Write the list as JSON to FILE (`-` = stdout).
    #[arg(long, value_name = "FILE")]
    pub json: Option<String>,
}

/// Hyperelastic models `fit` can fit (DESIGN 4.3 names).
#[derive(Debug, Clone, Copy, PartialEq, Eq, ValueEnum)]
pub enum FitModelArg {
    /// Neo-Hookean (mu).
    #[value(name = "neo-hookean")]
    NeoHookean,
    /// Mooney-Rivlin (C10, C01).
    #[value(name = "mooney-rivlin")]
    MooneyRivlin,
    /// Yeoh with C10, C20.
    #[value(name = "yeoh2")]
    Yeoh2,
    /// Yeoh with C10, C20, C30.
    #[value(name = "yeoh3")]
    Yeoh3,
    /// One-term Ogden.
    #[value(name = "ogden1")]
    Ogden1,
    /// Two-term Ogden.
    #[value(name = "ogden2")]
    Ogden2,
    /// Three-term Ogden.
    #[value(name = "ogden3")]
    Ogden3,
}

/// `arcfinger fit`.
#[derive(Debug, Args)]
pub struct FitArgs {
    /// Test data (CSV): a header row naming `stretch` and `nominal_stress_kpa` (or
    /// `nominal_stress_mpa`), optionally `mode` (uniaxial, planar, equibiaxial; default
    /// uniaxial); `#` starts a comment line.
    #[arg(value_name = "DATA.csv")]
    pub data: PathBuf,
    /// Model to fit.
    #[arg(long, value_enum, value_name = "MODEL")]
    pub model: FitModelArg,
    /// Write the JSON result to FILE (`-` = stdout; the summary then goes to stderr).
    #[arg(long, value_name = "FILE")]
    pub json: Option<String>,
    /// Name of the material block [default: fitted-MODEL].
    #[arg(long, value_name = "NAME")]
    pub name: Option<String>,
    /// Write the material block alone to this file (a RON fragment for a scene's `materials`).
    #[arg(long, value_name = "BLOCK.ron")]
    pub out: Option<PathBuf>,
    /// Density for the material block (g/cm3) [default: a placeholder, 1.07, marked as such].
    #[arg(long, value_name = "X")]
    pub density_g_cm3: Option<f64>,
}

/// `arcfinger fab`.
#[derive(Debug, Args)]
pub struct FabArgs {
    /// Scene file (RON).
    pub scene: PathBuf,
    /// Only this actuator [default: every actuator of the scene].
    #[arg(long, value_name = "NAME")]
    pub actuator: Option<String>,
    /// Write the sheet (Markdown), the JSON and the 1:1 SVG cut templates into DIR.
    #[arg(long, value_name = "DIR")]
    pub out: Option<PathBuf>,
    /// Write the JSON document to FILE (`-` = stdout; the sheet is then not printed).
    #[arg(long, value_name = "FILE")]
    pub json: Option<String>,
}

/// `arcfinger calibrate`.
#[derive(Debug, Args)]
pub struct CalibrateArgs {
    /// Scene file (RON).
    pub scene: PathBuf,
    /// Measurements (CSV): `pressure_kpa`, `bend_deg`, optionally `blocked_force_n`.
    #[arg(value_name = "MEASURED.csv")]
    pub measured: PathBuf,
    /// Actuator the prototype is of (may be left out when the scene has only one).
    #[arg(long, value_name = "NAME")]
    pub actuator: Option<String>,
    /// Fit the floor thickness as well as the modulus scale.
    #[arg(long)]
    pub fit_floor: bool,
    /// Write the calibrated scene to FILE [default: STEM-calibrated.ron next to the scene].
    #[arg(long, value_name = "FILE.ron")]
    pub out: Option<PathBuf>,
    /// Write the JSON result to FILE (`-` = stdout; the summary then goes to stderr).
    #[arg(long, value_name = "FILE")]
    pub json: Option<String>,
}

/// `arcfinger sweep`.
#[derive(Debug, Args)]
pub struct SweepArgs {
    /// Scene file (RON): the actuators, objects and criteria; its gripper is replaced by
    /// each candidate's.
    pub scene: PathBuf,
    /// Search-space file (RON; see docs/search-spaces.md).
    #[arg(long, value_name = "SPACE.ron")]
    pub space: PathBuf,
    /// Results file (JSON Lines, one line per candidate), written as results come in.
    #[arg(long, value_name = "FILE.jsonl")]
    pub out: Option<PathBuf>,
    /// Continue the --out file: keep its results and check only the missing candidates.
    #[arg(long)]
    pub resume: bool,
    /// Check only shard I of N (1-based) of the candidates, e.g. 3/16.
    #[arg(long, value_name = "I/N")]
    pub shard: Option<String>,
    /// Rows of the ranking table (0 = no table).
    #[arg(long, value_name = "N", default_value_t = 10)]
    pub top: usize,
    /// Write a scene file for each of the best K candidates into DIR.
    #[arg(long, num_args = 2, value_names = ["K", "DIR"])]
    pub emit_top: Option<Vec<String>>,
    /// No progress bar and no notes on stderr.
    #[arg(long)]
    pub quiet: bool,
    /// Rod elements along each chamber (>= 40).
    #[arg(long, value_name = "N", default_value_t = 40)]
    pub elements: usize,
}

/// `arcfinger merge`.
#[derive(Debug, Args)]
pub struct MergeArgs {
    /// Results files of the shards (JSON Lines from `sweep --out`).
    #[arg(required = true, value_name = "SHARD.jsonl")]
    pub files: Vec<PathBuf>,
    /// Write the merged results to FILE (`-` = stdout, the default).
    #[arg(long, value_name = "FILE")]
    pub out: Option<String>,
    /// Print the ranking table of the best N candidates (to stderr when the results go
    /// to stdout).
    #[arg(long, value_name = "N")]
    pub top: Option<usize>,
    /// Accept rounds with missing candidates (otherwise an error listing them).
    #[arg(long)]
    pub partial: bool,
}

/// `arcfinger review`.
#[derive(Debug, Args)]
pub struct ReviewArgs {
    /// Scene files of the candidates (1 to 6).
    #[arg(required = true, value_name = "SCENE")]
    pub scenes: Vec<PathBuf>,
    /// Folder for review.html and review.md [default: review].
    #[arg(long, value_name = "DIR")]
    pub out: Option<PathBuf>,
    /// Rod elements along each chamber (>= 40).
    #[arg(long, value_name = "N", default_value_t = 40)]
    pub elements: usize,
}

/// `arcfinger view`.
#[derive(Debug, Args)]
pub struct ViewArgs {
    /// Scene file (RON) [default: the bundled demo scene, packing-line-3f].
    pub scene: Option<PathBuf>,
    /// Start at this supply pressure (kPa) [default: the scene's].
    #[arg(long, value_name = "KPA", allow_negative_numbers = true)]
    pub pressure: Option<f64>,
    /// Start on this object [default: the first].
    #[arg(long, value_name = "NAME")]
    pub object: Option<String>,
    /// Rod elements along each chamber (>= 40).
    #[arg(long, value_name = "N", default_value_t = 40)]
    pub elements: usize,
    /// Let the scene read mesh files outside its own folder (absolute paths, `..`).
    #[arg(long)]
    pub allow_outside_meshes: bool,
    /// Steps to play after the first frame, comma-separated (for tests and measurements):
    /// `up`, `down`, `next`, `prev`, `forces`, `fibers`, `set`, `shadows`, `msaa`,
    /// `reset`, `orbit:N` (N frames of a full turn, frames/s on stderr), `idle:SECONDS`
    /// (after the sweep, CPU time while nothing changes), `shot:FILE.png`, `quit`.
    #[arg(long, value_name = "STEPS", hide = true)]
    pub script: Option<String>,
}

/// `arcfinger render`.
#[derive(Debug, Args)]
pub struct RenderArgs {
    /// Scene file (RON).
    pub scene: PathBuf,
    /// The PNG to write; with `--object all`, one file per object named
    /// `STEM-<number>-<object>.png` beside it.
    #[arg(long, value_name = "FILE.png")]
    pub out: PathBuf,
    /// Supply pressure (kPa) [default: the scene's].
    #[arg(long, value_name = "KPA", allow_negative_numbers = true)]
    pub pressure: Option<f64>,
    /// The object held, or `all` for one picture per object [default: the first].
    #[arg(long, value_name = "NAME|all")]
    pub object: Option<String>,
    /// Picture size in pixels.
    #[arg(long, value_name = "WxH", default_value = "1024x768")]
    pub size: String,
    /// Where the camera looks from: front, side, top or iso.
    #[arg(long, value_name = "VIEW", default_value = "iso")]
    pub view: String,
    /// Write the pictures' cameras and files as JSON to FILE (`-` = stdout).
    #[arg(long, value_name = "FILE")]
    pub json: Option<String>,
    /// Rod elements along each chamber (>= 40).
    #[arg(long, value_name = "N", default_value_t = 40)]
    pub elements: usize,
    /// Let the scene read mesh files outside its own folder (absolute paths, `..`).
    #[arg(long)]
    pub allow_outside_meshes: bool,
}

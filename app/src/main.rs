//! `arcfinger`: lay out soft pneumatic fingers on a hub and check them against a set
//! of target objects.
//!
//! `main` only turns the result of [`run`] into a process exit code (DESIGN 4.1):
//! 0 = all checks pass, 1 = a check failed, 2 = bad input or usage, 3 = a solver did not
//! converge. Every error goes to stderr prefixed with the program name.
// bad input is an error with exit code 2, never a panic: no unwrap or expect outside tests
#![cfg_attr(not(test), deny(clippy::unwrap_used, clippy::expect_used))]

mod budget;
mod cli;
mod commands;
mod error;
mod escape;
mod fab_svg;
mod ordered_map;
mod output;
mod plot;
mod report;
mod scene_doc;
mod scene_file;
mod suggest;
#[cfg(feature = "viewer")]
mod viewer;

use std::process::ExitCode;

use clap::Parser;

use crate::error::{AppError, Outcome};

/// The allocator: the closings build and drop many small vectors and shapes per solver
/// step, where mimalloc's thread-local free lists beat the system allocator.
#[global_allocator]
static GLOBAL: mimalloc::MiMalloc = mimalloc::MiMalloc;

fn main() -> ExitCode {
    let opts = match cli::Opts::try_parse() {
        Ok(o) => o,
        Err(e) => {
            // clap prints help/version to stdout with exit 0 and usage errors with exit 2
            let code = if e.use_stderr() { 2 } else { 0 };
            let _ = e.print();
            return ExitCode::from(code);
        }
    };
    match run(opts) {
        Ok(outcome) => ExitCode::from(outcome.exit_code()),
        Err(e) => {
            if !e.is_broken_pipe() {
                eprintln!("arcfinger: {e}");
            }
            ExitCode::from(e.exit_code())
        }
    }
}

fn run(opts: cli::Opts) -> Result<Outcome, AppError> {
    match opts.command {
        cli::Command::Check(args) => commands::check::run(args),
        cli::Command::Bend(args) => commands::bend::run(args),
        cli::Command::Materials(args) => commands::materials::run(args),
        cli::Command::Fit(args) => commands::fit::run(args),
        cli::Command::Fab(args) => commands::fab::run(args),
        cli::Command::Calibrate(args) => commands::calibrate::run(args),
        cli::Command::Sweep(args) => commands::sweep::run(args),
        cli::Command::Merge(args) => commands::merge::run(args),
        cli::Command::Review(args) => commands::review::run(args),
        cli::Command::View(args) => commands::view::run(args),
        cli::Command::Render(args) => commands::render::run(args),
    }
}

//! `arcfinger fit DATA.csv --model M`: fit a hyperelastic model to material test data.
//!
//! Reads the CSV ([`data`]), fits with [`grasp_core::material::fit`], and writes three
//! things ([`report`]): a readable summary (stdout, or stderr when `--json -` takes
//! stdout), the machine-readable result (`--json`, DESIGN 4.3 `arcfinger/fit/1`), and a
//! material block ready to paste into a scene's `materials` map (printed in the
//! summary; `--out` writes it alone to a file).
//!
//! Exit codes: 0 = fitted; 2 = bad data, arguments or output path; 3 = the Ogden search
//! stopped at its iteration bound (the result is still written, marked unconverged).

pub(crate) mod data;
mod report;

pub(crate) use report::model_doc;

use std::path::PathBuf;

use grasp_core::material::{FitError, FitModel, FitReport, fit};

use crate::cli::{FitArgs, FitModelArg};
use crate::error::{AppError, Outcome};
use crate::output::{Sink, refuse_overwrite};

/// Density written into the material block when `--density-g-cm3` is not given
/// (g/cm³): a typical cast platinum silicone (datasheet-class value, from memory).
pub const PLACEHOLDER_DENSITY_G_CM3: f64 = 1.07;

/// The validated options of one `fit` run.
#[derive(Debug, Clone, PartialEq)]
struct Config {
    data: PathBuf,
    model: FitModel,
    json: Option<Sink>,
    name: String,
    out: Option<PathBuf>,
    /// `Some` when given on the command line (g/cm³).
    density_g_cm3: Option<f64>,
}

impl FitModelArg {
    /// The core's model.
    pub fn to_core(self) -> FitModel {
        match self {
            Self::NeoHookean => FitModel::NeoHookean,
            Self::MooneyRivlin => FitModel::MooneyRivlin,
            Self::Yeoh2 => FitModel::Yeoh2,
            Self::Yeoh3 => FitModel::Yeoh3,
            Self::Ogden1 => FitModel::Ogden1,
            Self::Ogden2 => FitModel::Ogden2,
            Self::Ogden3 => FitModel::Ogden3,
        }
    }
}

fn config(args: FitArgs) -> Result<Config, AppError> {
    let model = args.model.to_core();
    if let Some(d) = args.density_g_cm3
        && !(d.is_finite() && d > 0.0)
    {
        return Err(AppError::input(format!("--density-g-cm3: expected a density > 0 (g/cm3), got {d}")));
    }
    let name = args.name.unwrap_or_else(|| format!("fitted-{}", model.name()));
    if name.trim().is_empty() {
        return Err(AppError::input("--name: expected a non-empty material name"));
    }
    if name.chars().any(char::is_control) {
        return Err(AppError::input("--name: expected a name without control characters"));
    }
    let json = args.json.as_deref().map(Sink::parse);
    let inputs = [args.data.as_path()];
    if let Some(Sink::File(p)) = &json {
        refuse_overwrite(p, &inputs)?;
    }
    if let Some(out) = &args.out {
        refuse_overwrite(out, &inputs)?;
        if let Some(Sink::File(p)) = &json {
            refuse_overwrite(out, &[p.as_path()])?;
        }
    }
    Ok(Config { data: args.data, model, json, name, out: args.out, density_g_cm3: args.density_g_cm3 })
}

/// Runs `fit`.
///
/// # Errors
/// Bad data or options (exit 2), write failures (exit 2), an unconverged Ogden search
/// (exit 3, after the results are written).
pub fn run(args: FitArgs) -> Result<Outcome, AppError> {
    let config = config(args)?;
    let rows = data::read(&config.data)?;
    let file = config.data.display().to_string();
    let points: Vec<_> = rows.iter().map(|r| r.point).collect();
    let result = fit(config.model, &points).map_err(|e| fit_error(&file, &rows, &e))?;

    let input = report::Input { file: &file, rows: &rows, model: config.model, result: &result };
    let density = config.density_g_cm3.unwrap_or(PLACEHOLDER_DENSITY_G_CM3);
    let block = report::material_block(&input, &config.name, density, config.density_g_cm3.is_some())?;
    if let Some(out) = &config.out {
        Sink::File(out.clone()).write(block.as_bytes())?;
    }
    if let Some(sink) = &config.json {
        sink.write(report::json(&input)?.as_bytes())?;
    }
    let summary = report::summary(&input, &block, config.out.as_deref());
    if config.json == Some(Sink::Stdout) {
        // stdout carries the JSON document alone; a closed stderr is no reason to fail
        let _ = std::io::Write::write_all(&mut std::io::stderr(), summary.as_bytes());
    } else {
        Sink::Stdout.write(summary.as_bytes())?;
    }
    if result.converged { Ok(Outcome::Pass) } else { Err(not_converged(&result)) }
}

fn not_converged(result: &FitReport) -> AppError {
    AppError::NotConverged(format!(
        "the Ogden search stopped at its bound of iterations ({} in the best of {} starts); the parameters above are the best found, not a converged fit",
        result.iterations, result.starts
    ))
}

/// A core fit error as an input error naming the line of the point it concerns.
fn fit_error(file: &str, rows: &[data::DataRow], e: &FitError) -> AppError {
    let line = |index: usize| rows.get(index).map_or(0, |r| r.line);
    match e {
        FitError::ZeroStress { index, stretch } => AppError::input(format!(
            "{file}:{}: zero stress at stretch {stretch}: the fit weighs each point by its relative error, so only the unloaded state (stretch 1) may carry zero stress",
            line(*index)
        )),
        FitError::InvalidStretch { index, stretch } => AppError::input(format!(
            "{file}:{}: column `stretch`: expected a finite stretch > 0, got {stretch}",
            line(*index)
        )),
        FitError::NonFiniteStress { index, .. } => {
            AppError::input(format!("{file}:{}: expected a finite nominal stress", line(*index)))
        }
        _ => AppError::input(format!("{file}: {e}")),
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use clap::ValueEnum;

    fn args(model: FitModelArg) -> FitArgs {
        FitArgs {
            data: PathBuf::from("d.csv"),
            model,
            json: None,
            name: None,
            out: None,
            density_g_cm3: None,
        }
    }

    /// The command-line names are the core's names (DESIGN 4.3 lists them).
    #[test]
    fn model_names_on_the_command_line_are_the_design_names() {
        for arg in FitModelArg::value_variants() {
            let name = arg.to_possible_value().unwrap().get_name().to_string();
            assert_eq!(name, arg.to_core().name());
        }
        assert_eq!(FitModelArg::value_variants().len(), FitModel::ALL.len());
    }

    #[test]
    fn options_are_validated() {
        let c = config(args(FitModelArg::Ogden3)).unwrap();
        assert_eq!(c.name, "fitted-ogden3");
        for bad in [0.0, -1.0, f64::NAN, f64::INFINITY] {
            let e = config(FitArgs { density_g_cm3: Some(bad), ..args(FitModelArg::Yeoh2) }).unwrap_err();
            assert!(e.to_string().starts_with("--density-g-cm3:"), "{e}");
            assert_eq!(e.exit_code(), 2);
        }
        let e = config(FitArgs { name: Some(" ".into()), ..args(FitModelArg::Yeoh2) }).unwrap_err();
        assert!(e.to_string().starts_with("--name:"));
        let e = config(FitArgs { out: Some("d.csv".into()), ..args(FitModelArg::Yeoh2) }).unwrap_err();
        assert!(e.to_string().contains("refusing to overwrite"), "{e}");
        let e = config(FitArgs { json: Some("d.csv".into()), ..args(FitModelArg::Yeoh2) }).unwrap_err();
        assert!(e.to_string().contains("refusing to overwrite"), "{e}");
        let e = config(FitArgs {
            json: Some("r.json".into()),
            out: Some("r.json".into()),
            ..args(FitModelArg::Yeoh2)
        })
        .unwrap_err();
        assert!(e.to_string().contains("refusing to overwrite"), "{e}");
    }

    #[test]
    fn point_errors_name_the_line() {
        let rows = data::parse("d.csv", b"stretch,nominal_stress_kpa\n1.5,2\n# c\n2.0,0\n").unwrap();
        let points: Vec<_> = rows.iter().map(|r| r.point).collect();
        let e = fit(FitModel::NeoHookean, &points).unwrap_err();
        let msg = fit_error("d.csv", &rows, &e).to_string();
        assert!(msg.starts_with("d.csv:4: zero stress at stretch 2:"), "{msg}");
    }
}

//! `arcfinger materials`: the built-in casting-silicone classes.

use grasp_core::material::{StrainEnergy, library};

use crate::cli::MaterialsArgs;
use crate::error::{AppError, Outcome};
use crate::output::Sink;

/// Prints the table, or writes JSON with `--json`.
pub fn run(args: MaterialsArgs) -> Result<Outcome, AppError> {
    let lib = library();
    if let Some(json) = args.json {
        let items: Vec<_> = lib
            .iter()
            .map(|e| {
                serde_json::json!({
                    "name": e.name,
                    "family": e.material.model.family(),
                    "shear_modulus_kpa": e.material.model.shear_modulus() / 1e3,
                    "density_g_cm3": e.material.density / 1e3,
                    "elongation_at_break": e.material.stretch_at_break - 1.0,
                    "cure_time_h": e.cure_time_h,
                    "source": e.source,
                })
            })
            .collect();
        let doc = serde_json::json!({ "format": "arcfinger/materials/1", "materials": items });
        let mut text = serde_json::to_string_pretty(&doc).map_err(AppError::input)?;
        text.push('\n');
        Sink::parse(&json).write(text.as_bytes())?;
        return Ok(Outcome::Pass);
    }
    let mut out = String::new();
    out.push_str(&format!(
        "{:<40} {:>13} {:>9} {:>11} {:>8}\n",
        "class", "model", "mu (kPa)", "density", "break %"
    ));
    for e in &lib {
        out.push_str(&format!(
            "{:<40} {:>13} {:>9.1} {:>7.2} g/cm3 {:>6.0}\n",
            e.name,
            e.material.model.family(),
            e.material.model.shear_modulus() / 1e3,
            e.material.density / 1e3,
            (e.material.stretch_at_break - 1.0) * 100.0
        ));
    }
    out.push_str("\nValues are datasheet-class figures from memory, for a first design only: fit your own batch\nwith `arcfinger fit`. Use a name above as an actuator's `material` when the scene defines none of that name.\n");
    Sink::Stdout.write(out.as_bytes())?;
    Ok(Outcome::Pass)
}

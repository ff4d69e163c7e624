//! What `arcfinger fit` writes: the summary, the JSON document and the material block.
//!
//! Units at this edge: stresses and moduli in kPa (the scene file's unit), stretches
//! and relative errors dimensionless. Floats in the material block are written with
//! Rust's shortest round-trip formatting so the pasted block reproduces the fit to the
//! last bit; the summary rounds for reading.

use std::fmt::Write as _;
use std::path::Path;

use grasp_core::material::{Deformation, FitModel, FitReport, HyperelasticModel};

use super::data::DataRow;
use crate::error::AppError;
use crate::scene_doc::{MaterialModelDoc, OgdenTermDoc};

/// Everything a report is made from.
pub struct Input<'a> {
    /// The data file, as named on the command line.
    pub file: &'a str,
    /// The data rows.
    pub rows: &'a [DataRow],
    /// The model asked for.
    pub model: FitModel,
    /// The fit.
    pub result: &'a FitReport,
}

impl Input<'_> {
    /// Relative error of row `i`, `None` for a point the fit skipped (zero stress at
    /// stretch 1).
    fn relative_error(&self, i: usize) -> Option<f64> {
        let p = self.rows[i].point;
        if p.nominal_stress == 0.0 {
            return None;
        }
        Some((self.result.predicted[i] - p.nominal_stress) / p.nominal_stress)
    }

    /// Points per test, and the rms relative error over the used ones.
    fn per_mode(&self) -> Vec<(Deformation, usize, Option<f64>)> {
        Deformation::ALL
            .into_iter()
            .filter_map(|mode| {
                let idx: Vec<usize> =
                    (0..self.rows.len()).filter(|&i| self.rows[i].point.mode == mode).collect();
                if idx.is_empty() {
                    return None;
                }
                let errs: Vec<f64> = idx.iter().filter_map(|&i| self.relative_error(i)).collect();
                let rms = (!errs.is_empty())
                    .then(|| (errs.iter().map(|e| e * e).sum::<f64>() / errs.len() as f64).sqrt());
                Some((mode, idx.len(), rms))
            })
            .collect()
    }

    /// `(lower bound of the elongation at break, the stretch it comes from, whether that
    /// stretch is uniaxial)`.
    fn elongation_lower_bound(&self) -> (f64, f64, bool) {
        let max_of = |uniaxial_only: bool| {
            self.rows
                .iter()
                .filter(|r| !uniaxial_only || r.point.mode == Deformation::Uniaxial)
                .map(|r| r.point.stretch)
                .fold(None, |m: Option<f64>, l| Some(m.map_or(l, |m| m.max(l))))
        };
        let (stretch, uniaxial) = match max_of(true) {
            Some(l) => (l, true),
            None => (max_of(false).unwrap_or(1.0), false),
        };
        // rounded to 1e-6 so that 7.6 - 1 reads 6.6, not 6.599999999999999
        (((stretch - 1.0).max(0.0) * 1e6).round() / 1e6, stretch, uniaxial)
    }
}

/// The model as the scene file writes it (kPa).
pub fn model_doc(model: &HyperelasticModel) -> MaterialModelDoc {
    match model {
        HyperelasticModel::NeoHookean(m) => MaterialModelDoc::NeoHookean { mu_kpa: m.mu() / 1e3 },
        HyperelasticModel::MooneyRivlin(m) => {
            let (c10, c01) = m.coefficients();
            MaterialModelDoc::MooneyRivlin { c10_kpa: c10 / 1e3, c01_kpa: c01 / 1e3 }
        }
        HyperelasticModel::Yeoh(m) => {
            let [c10, c20, c30] = m.coefficients();
            MaterialModelDoc::Yeoh { c10_kpa: c10 / 1e3, c20_kpa: c20 / 1e3, c30_kpa: c30 / 1e3 }
        }
        HyperelasticModel::Ogden(m) => MaterialModelDoc::Ogden {
            terms: m.terms().iter().map(|t| OgdenTermDoc { mu_kpa: t.mu / 1e3, alpha: t.alpha }).collect(),
        },
    }
}

/// The model in RON, one line (shortest round-trip floats).
fn model_ron(doc: &MaterialModelDoc) -> String {
    match doc {
        MaterialModelDoc::NeoHookean { mu_kpa } => format!("NeoHookean(mu_kpa: {mu_kpa:?})"),
        MaterialModelDoc::MooneyRivlin { c10_kpa, c01_kpa } => {
            format!("MooneyRivlin(c10_kpa: {c10_kpa:?}, c01_kpa: {c01_kpa:?})")
        }
        MaterialModelDoc::Yeoh { c10_kpa, c20_kpa, c30_kpa } => {
            format!("Yeoh(c10_kpa: {c10_kpa:?}, c20_kpa: {c20_kpa:?}, c30_kpa: {c30_kpa:?})")
        }
        MaterialModelDoc::Ogden { terms } => {
            let t: Vec<String> =
                terms.iter().map(|t| format!("(mu_kpa: {:?}, alpha: {:?})", t.mu_kpa, t.alpha)).collect();
            format!("Ogden(terms: [{}])", t.join(", "))
        }
    }
}

/// The material block: one entry of a scene's `materials` map, with a trailing comma.
///
/// # Errors
/// Only if the name cannot be written as a RON string (it always can).
pub fn material_block(
    input: &Input<'_>,
    name: &str,
    density_g_cm3: f64,
    density_given: bool,
) -> Result<String, AppError> {
    let r = input.result;
    let key = ron::to_string(name).map_err(|e| AppError::input(format!("--name: {e}")))?;
    let (elongation, stretch, uniaxial) = input.elongation_lower_bound();
    let mut s = String::new();
    let _ = writeln!(s, "{key}: (");
    let _ = writeln!(
        s,
        "    // {} fitted by `arcfinger fit` to {} ({}): small-strain shear modulus {} kPa, rms relative error {:.2} %{}",
        input.model.name(),
        input.file,
        mode_counts(input),
        round_sig(r.shear_modulus / 1e3, 4),
        100.0 * r.rms_relative_error,
        if r.converged { "" } else { " (NOT CONVERGED)" }
    );
    let _ = writeln!(s, "    model: {},", model_ron(&model_doc(&r.model)));
    if density_given {
        let _ = writeln!(s, "    density_g_cm3: {density_g_cm3:?},");
    } else {
        let _ = writeln!(
            s,
            "    density_g_cm3: {density_g_cm3:?}, // PLACEHOLDER (a typical cast platinum silicone): replace with your material's density"
        );
    }
    let source = if uniaxial {
        format!("the largest uniaxial stretch tested ({stretch}) minus 1")
    } else {
        format!("the largest stretch tested ({stretch}, no uniaxial data) minus 1")
    };
    let _ = writeln!(
        s,
        "    elongation_at_break: {elongation:?}, // LOWER BOUND only: {source}; use the measured break strain"
    );
    s.push_str("),\n");
    Ok(s)
}

fn mode_counts(input: &Input<'_>) -> String {
    let parts: Vec<String> =
        input.per_mode().iter().map(|(mode, n, _)| format!("{n} {}", mode.name())).collect();
    format!("{} point(s): {}", input.rows.len(), parts.join(", "))
}

/// The JSON document, `arcfinger/fit/1` (DESIGN 4.3), pretty-printed with a final newline.
///
/// # Errors
/// Never in practice (serde_json refuses only non-string keys and failing serialisers).
pub fn json(input: &Input<'_>) -> Result<String, AppError> {
    let r = input.result;
    let points: Vec<_> = input
        .rows
        .iter()
        .enumerate()
        .map(|(i, row)| {
            serde_json::json!({
                "mode": row.point.mode.name(),
                "stretch": row.point.stretch,
                "measured_kpa": row.point.nominal_stress / 1e3,
                "fitted_kpa": r.predicted[i] / 1e3,
                "relative_error": input.relative_error(i),
                "line": row.line,
            })
        })
        .collect();
    let per_mode: serde_json::Map<String, serde_json::Value> = input
        .per_mode()
        .into_iter()
        .map(|(mode, n, rms)| {
            (mode.name().to_string(), serde_json::json!({ "points": n, "rms_relative_error": rms }))
        })
        .collect();
    let (elongation, _, _) = input.elongation_lower_bound();
    let doc = serde_json::json!({
        "format": "arcfinger/fit/1",
        "data": input.file,
        "fit_model": input.model.name(),
        "model": model_doc(&r.model),
        "shear_modulus_kpa": r.shear_modulus / 1e3,
        "youngs_modulus_kpa": 3.0 * r.shear_modulus / 1e3,
        "rms_relative_error": r.rms_relative_error,
        "max_relative_error": r.max_relative_error,
        "used_points": r.used_points,
        "modes": per_mode,
        "converged": r.converged,
        "iterations": r.iterations,
        "starts": r.starts,
        "stable_by_term_signs": r.stable_by_term_signs,
        "elongation_at_break_lower_bound": elongation,
        "points": points,
    });
    let mut text = serde_json::to_string_pretty(&doc).map_err(AppError::input)?;
    text.push('\n');
    Ok(text)
}

/// `x` rounded to `digits` significant digits, for reading.
fn round_sig(x: f64, digits: i32) -> f64 {
    if x == 0.0 || !x.is_finite() {
        return x;
    }
    let scale = 10f64.powi(digits - 1 - x.abs().log10().floor() as i32);
    (x * scale).round() / scale
}

/// The readable summary.
pub fn summary(input: &Input<'_>, block: &str, out: Option<&Path>) -> String {
    let r = input.result;
    let mut s = String::new();
    let _ = writeln!(s, "Fit of {} to {}: {}", input.model.name(), input.file, mode_counts(input));
    let skipped = input.rows.len() - r.used_points;
    if skipped > 0 {
        let _ = writeln!(
            s,
            "  ({skipped} point(s) at stretch 1 with zero stress skipped: no model can miss them)"
        );
    }
    s.push('\n');
    match &r.model {
        HyperelasticModel::NeoHookean(m) => {
            let _ = writeln!(s, "Parameters  mu = {} kPa", round_sig(m.mu() / 1e3, 6));
        }
        HyperelasticModel::MooneyRivlin(m) => {
            let (c10, c01) = m.coefficients();
            let _ = writeln!(
                s,
                "Parameters  C10 = {} kPa, C01 = {} kPa",
                round_sig(c10 / 1e3, 6),
                round_sig(c01 / 1e3, 6)
            );
        }
        HyperelasticModel::Yeoh(m) => {
            let [c10, c20, c30] = m.coefficients();
            let _ = writeln!(
                s,
                "Parameters  C10 = {} kPa, C20 = {} kPa, C30 = {} kPa",
                round_sig(c10 / 1e3, 6),
                round_sig(c20 / 1e3, 6),
                round_sig(c30 / 1e3, 6)
            );
        }
        HyperelasticModel::Ogden(m) => {
            let _ =
                writeln!(s, "Parameters  (W = sum mu_k/alpha_k (l1^alpha_k + l2^alpha_k + l3^alpha_k - 3))");
            let _ = writeln!(
                s,
                "  (Ogden's own convention; codes that write 2 m_k/alpha_k^2 (...) take m_k = mu_k alpha_k / 2)"
            );
            let _ = writeln!(s, "  {:>4}  {:>16}  {:>12}", "term", "mu_k (kPa)", "alpha_k");
            for (k, t) in m.terms().iter().enumerate() {
                let _ = writeln!(
                    s,
                    "  {:>4}  {:>16}  {:>12}",
                    k + 1,
                    round_sig(t.mu / 1e3, 6),
                    round_sig(t.alpha, 6)
                );
            }
        }
    }
    let mu = r.shear_modulus / 1e3;
    let _ = writeln!(
        s,
        "Small-strain shear modulus mu = {} kPa (Young's modulus 3 mu = {} kPa)",
        round_sig(mu, 4),
        round_sig(3.0 * mu, 4)
    );
    let _ = writeln!(
        s,
        "RMS relative error {:.2} % over {} point(s), largest {:.2} %",
        100.0 * r.rms_relative_error,
        r.used_points,
        100.0 * r.max_relative_error
    );
    for (mode, n, rms) in input.per_mode() {
        if let Some(rms) = rms {
            let _ = writeln!(s, "  {:<12} {n:>4} point(s), rms {:.2} %", mode.name(), 100.0 * rms);
        }
    }
    if r.starts > 1 {
        let _ = writeln!(
            s,
            "Search: best of {} starting sets, {} after {} Levenberg-Marquardt iterations",
            r.starts,
            if r.converged { "converged" } else { "NOT converged" },
            r.iterations
        );
    }
    let _ = writeln!(s, "{}", stability_note(input));
    s.push('\n');
    let _ = writeln!(
        s,
        "  {:<12} {:>9} {:>14} {:>14} {:>9}",
        "mode", "stretch", "measured kPa", "fitted kPa", "error"
    );
    for (i, row) in input.rows.iter().enumerate() {
        let err =
            input.relative_error(i).map_or_else(|| "skipped".to_string(), |e| format!("{:+.2} %", 100.0 * e));
        let _ = writeln!(
            s,
            "  {:<12} {:>9.4} {:>14.4} {:>14.4} {:>9}",
            row.point.mode.name(),
            row.point.stretch,
            row.point.nominal_stress / 1e3,
            r.predicted[i] / 1e3,
            err
        );
    }
    s.push('\n');
    match out {
        Some(p) => {
            let _ = writeln!(
                s,
                "Material block for a scene's `materials` map (also written to {}):",
                p.display()
            );
        }
        None => {
            let _ = writeln!(s, "Material block for a scene's `materials` map (--out FILE writes it alone):");
        }
    }
    s.push_str(block);
    s
}

/// Whether the terms meet the sufficient sign condition, and if not, where planar
/// tension (the actuator's state) loses stability over the range worth checking.
fn stability_note(input: &Input<'_>) -> String {
    let r = input.result;
    let condition = match input.model {
        FitModel::NeoHookean => "mu > 0",
        FitModel::MooneyRivlin => "C10 > 0, C01 >= 0",
        FitModel::Yeoh2 | FitModel::Yeoh3 => "every Ci0 >= 0",
        FitModel::Ogden1 | FitModel::Ogden2 | FitModel::Ogden3 => "every mu_k alpha_k > 0",
    };
    if r.stable_by_term_signs {
        return format!("Stability: {condition} holds, which is sufficient for stability at every stretch");
    }
    let l_max = input.rows.iter().map(|row| row.point.stretch).fold(1.5, f64::max);
    let planar = match r.model.check_planar_stability(0.5, l_max) {
        Ok(()) => format!("planar tension stays stable over stretch 0.5 to {l_max}"),
        Err(e) => format!("WARNING: {e}"),
    };
    format!("Stability: {condition} does not hold (not sufficient, so not necessarily unstable); {planar}")
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::ordered_map::OrderedMap;
    use crate::scene_doc::MaterialDoc;
    use grasp_core::material::{TestPoint, fit};

    fn rows(table: &[(Deformation, f64, f64)]) -> Vec<DataRow> {
        table
            .iter()
            .enumerate()
            .map(|(i, &(mode, stretch, s))| DataRow {
                line: i as u64 + 2,
                point: TestPoint { mode, stretch, nominal_stress: s },
            })
            .collect()
    }

    /// Two-term Ogden data (closed form, Ogden 1972: uniaxial `sum mu (l^(a-1) - l^(-a/2-1))`,
    /// planar `sum mu (l^(a-1) - l^(-a-1))`).
    fn ogden_rows() -> Vec<DataRow> {
        let terms = [(20e3, 1.7), (0.2e3, 6.0)];
        let mut t = Vec::new();
        for &l in &[1.0f64, 1.1, 1.4, 2.0, 3.0, 4.5] {
            let u: f64 = terms.iter().map(|&(mu, a)| mu * (l.powf(a - 1.0) - l.powf(-0.5 * a - 1.0))).sum();
            t.push((Deformation::Uniaxial, l, u));
            let p: f64 = terms.iter().map(|&(mu, a)| mu * (l.powf(a - 1.0) - l.powf(-a - 1.0))).sum();
            if l > 1.0 {
                t.push((Deformation::Planar, l, p));
            }
        }
        rows(&t)
    }

    /// The block parses back with ron as a `materials` entry and reproduces the model.
    #[test]
    fn material_block_parses_back_as_a_material_doc() {
        let rows = ogden_rows();
        let pts: Vec<_> = rows.iter().map(|r| r.point).collect();
        for model in [FitModel::Ogden2, FitModel::Yeoh3, FitModel::MooneyRivlin, FitModel::NeoHookean] {
            let result = fit(model, &pts).unwrap();
            let input = Input { file: "d.csv", rows: &rows, model, result: &result };
            let block = material_block(&input, "my \"soft\" batch", 1.07, false).unwrap();
            let map: OrderedMap<MaterialDoc> = ron::from_str(&format!("{{\n{block}}}")).unwrap();
            let doc = map.get("my \"soft\" batch").unwrap();
            assert_eq!(doc.model, model_doc(&result.model), "{block}");
            assert_eq!(doc.density_g_cm3, 1.07);
            // the largest uniaxial stretch is 4.5
            assert_eq!(doc.elongation_at_break, 3.5);
            assert!(block.contains("PLACEHOLDER"), "{block}");
            assert!(block.contains("LOWER BOUND"), "{block}");
            let given = material_block(&input, "x", 1.13, true).unwrap();
            assert!(!given.contains("PLACEHOLDER"), "{given}");
            let map: OrderedMap<MaterialDoc> = ron::from_str(&format!("{{{given}}}")).unwrap();
            assert_eq!(map.get("x").unwrap().density_g_cm3, 1.13);
        }
    }

    #[test]
    fn json_has_the_contract_keys_and_skips_the_unloaded_point() {
        let rows = ogden_rows();
        let pts: Vec<_> = rows.iter().map(|r| r.point).collect();
        let result = fit(FitModel::Ogden2, &pts).unwrap();
        let input = Input { file: "d.csv", rows: &rows, model: FitModel::Ogden2, result: &result };
        let v: serde_json::Value = serde_json::from_str(&json(&input).unwrap()).unwrap();
        assert_eq!(v["format"], "arcfinger/fit/1");
        assert!(v["model"]["Ogden"]["terms"].as_array().unwrap().len() == 2);
        assert!(v["shear_modulus_kpa"].as_f64().unwrap() > 0.0);
        assert!(v["rms_relative_error"].as_f64().unwrap() < 1e-6);
        let points = v["points"].as_array().unwrap();
        assert_eq!(points.len(), rows.len());
        assert_eq!(points[0]["stretch"], 1.0);
        assert!(points[0]["relative_error"].is_null());
        for key in ["mode", "stretch", "measured_kpa", "fitted_kpa"] {
            assert!(points[1].get(key).is_some(), "{key}");
        }
        assert_eq!(v["modes"]["uniaxial"]["points"], 6);
        assert_eq!(v["modes"]["planar"]["points"], 5);
        // shear modulus of the closed-form truth: 1/2 (20·1.7 + 0.2·6) kPa
        assert!((v["shear_modulus_kpa"].as_f64().unwrap() - 0.5 * (20.0 * 1.7 + 0.2 * 6.0)).abs() < 1e-6);
    }

    #[test]
    fn elongation_bound_falls_back_to_other_tests_without_uniaxial_data() {
        let rows = rows(&[(Deformation::Planar, 2.0, 10e3), (Deformation::Planar, 3.0, 20e3)]);
        let pts: Vec<_> = rows.iter().map(|r| r.point).collect();
        let result = fit(FitModel::NeoHookean, &pts).unwrap();
        let input = Input { file: "d.csv", rows: &rows, model: FitModel::NeoHookean, result: &result };
        assert_eq!(input.elongation_lower_bound(), (2.0, 3.0, false));
        let block = material_block(&input, "p", 1.07, false).unwrap();
        assert!(block.contains("no uniaxial data"), "{block}");
    }

    #[test]
    fn significant_digit_rounding() {
        assert_eq!(round_sig(412.7353, 4), 412.7);
        assert_eq!(round_sig(-0.000337691, 3), -0.000338);
        assert_eq!(round_sig(0.0, 3), 0.0);
    }
}

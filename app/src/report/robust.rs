//! The robustness study of `check --robust N` in the reports: the `robust` key of the
//! JSON document, a section of the Markdown summary and a terminal table.
//!
//! Per object: the pass probability over the samples, the criterion that fails most
//! often, and how often each failed (a sample can fail several). The spreads and the
//! seed are printed so a run can be repeated exactly.

use std::fmt::Write as _;

use grasp_core::check::robust::RobustReport;
use serde::Serialize;

/// The spreads as written (relative ones as fractions, the wall in mm).
#[derive(Debug, Clone, Copy, Serialize)]
pub struct SpreadsDoc {
    /// Relative modulus spread.
    pub modulus: f64,
    /// Wall-thickness spread (mm).
    pub wall_mm: f64,
    /// Relative friction spread.
    pub friction: f64,
    /// Relative size spread.
    pub size: f64,
}

/// One criterion's count.
#[derive(Debug, Clone, Serialize)]
pub struct CountDoc {
    /// Criterion kind.
    pub kind: &'static str,
    /// Samples in which it failed.
    pub samples: usize,
}

/// One object.
#[derive(Debug, Clone, Serialize)]
pub struct ObjectDoc {
    /// Object name.
    pub name: String,
    /// Share of samples passed.
    pub pass_probability: f64,
    /// Samples passed.
    pub passes: usize,
    /// The criterion that fails most often (`null` if none failed).
    pub most_failing: Option<&'static str>,
    /// Every criterion that failed, most often first.
    pub failures: Vec<CountDoc>,
}

/// The `robust` key.
#[derive(Debug, Clone, Serialize)]
pub struct RobustDoc {
    /// Samples.
    pub samples: usize,
    /// Seed.
    pub seed: u64,
    /// Supply pressure of the samples (kPa).
    pub pressure_kpa: f64,
    /// Spreads (standard deviations, normal, truncated at three).
    pub spreads: SpreadsDoc,
    /// Samples the model could not evaluate.
    pub unevaluated: usize,
    /// Per object.
    pub objects: Vec<ObjectDoc>,
}

impl RobustDoc {
    /// From the core's report.
    pub fn of(r: &RobustReport) -> Self {
        Self {
            samples: r.samples,
            seed: r.seed,
            pressure_kpa: r.pressure / 1e3,
            spreads: SpreadsDoc {
                modulus: r.spreads.modulus,
                wall_mm: r.spreads.wall * 1e3,
                friction: r.spreads.friction,
                size: r.spreads.size,
            },
            unevaluated: r.unevaluated,
            objects: r
                .objects
                .iter()
                .map(|o| ObjectDoc {
                    name: o.name.clone(),
                    pass_probability: o.pass_probability(),
                    passes: o.passes,
                    most_failing: o.most_failing(),
                    failures: o.failures.iter().map(|&(kind, samples)| CountDoc { kind, samples }).collect(),
                })
                .collect(),
        }
    }
}

fn spreads_line(r: &RobustReport) -> String {
    format!(
        "{} samples, seed {}, at {:.1} kPa; spreads (1 sigma, truncated at 3): modulus {:.0} %, walls {:.2} mm, friction {:.0} %, object size {:.0} %",
        r.samples,
        r.seed,
        r.pressure / 1e3,
        r.spreads.modulus * 100.0,
        r.spreads.wall * 1e3,
        r.spreads.friction * 100.0,
        r.spreads.size * 100.0
    )
}

/// The terminal table; `name` escapes object names for the terminal.
pub fn table(r: &RobustReport, name: impl Fn(&str) -> String) -> String {
    let mut s = String::new();
    let _ = writeln!(s, "\nrobustness: {}", spreads_line(r));
    let width = r.objects.iter().map(|o| name(&o.name).chars().count()).max().unwrap_or(6).max(6);
    let _ = writeln!(s, "  {:<width$}  {:>6}  most failing", "object", "pass");
    for o in &r.objects {
        let most = match o.failures.first() {
            Some((k, n)) => format!("{k} ({n} of {})", o.samples),
            None => "-".to_string(),
        };
        let _ = writeln!(s, "  {:<width$}  {:>5.0}%  {most}", name(&o.name), o.pass_probability() * 100.0);
    }
    if r.unevaluated > 0 {
        let _ =
            writeln!(s, "  {} sample(s) fell outside the model's range (counted as failures)", r.unevaluated);
    }
    s
}

/// The Markdown section; `name` escapes object names for Markdown.
pub fn markdown(r: &RobustReport, name: impl Fn(&str) -> String) -> String {
    let mut s = String::new();
    let _ = writeln!(s, "\n**Robustness** ({})\n", spreads_line(r));
    s.push_str("| object | pass probability | most failing criterion |\n| --- | ---: | --- |\n");
    for o in &r.objects {
        let most = match o.failures.first() {
            Some((k, n)) => format!("{k} ({n} of {})", o.samples),
            None => "—".to_string(),
        };
        let _ = writeln!(s, "| {} | {:.0} % | {most} |", name(&o.name), o.pass_probability() * 100.0);
    }
    s
}

//! Material test data in CSV, for `arcfinger fit` (DESIGN 4.3).
//!
//! Format: one header row, then one row per measured point. Columns, in any order
//! (names are matched after trimming spaces, ignoring ASCII case):
//!
//! | column | required | meaning |
//! | --- | --- | --- |
//! | `stretch` | yes | stretch along the load, `0 < l <= 100` (1 = unloaded) |
//! | `nominal_stress_kpa` or `nominal_stress_mpa` | exactly one | force over undeformed area |
//! | `mode` | no | `uniaxial`, `planar` or `equibiaxial`; default `uniaxial` |
//!
//! Any other column is refused with the list of valid names, so a misspelt unit is not
//! silently read as something else. Lines starting with `#` are comments; blank lines
//! are skipped; one record per line. Every error names `FILE:LINE`, the column and what
//! was expected.

use std::path::Path;

use grasp_core::material::{Deformation, TestPoint};

use crate::error::AppError;

/// The column names this reader knows, in the order error messages list them.
pub const COLUMNS: [&str; 4] = ["stretch", "nominal_stress_kpa", "nominal_stress_mpa", "mode"];

/// Largest stretch accepted. Elastomers break well below it (casting silicones near
/// 10, common practice); a larger value is almost always a strain in per cent.
pub const MAX_STRETCH: f64 = 100.0;

/// One data row: its line in the file and the point (SI).
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct DataRow {
    /// 1-based line number in the file.
    pub line: u64,
    /// The point, stress in Pa.
    pub point: TestPoint,
}

/// The stress column's unit.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
enum StressUnit {
    KPa,
    MPa,
}

impl StressUnit {
    fn to_pa(self) -> f64 {
        match self {
            Self::KPa => 1e3,
            Self::MPa => 1e6,
        }
    }
    fn column(self) -> &'static str {
        match self {
            Self::KPa => "nominal_stress_kpa",
            Self::MPa => "nominal_stress_mpa",
        }
    }
}

/// Where each known column sits in the header.
struct Layout {
    width: usize,
    stretch: usize,
    stress: usize,
    unit: StressUnit,
    mode: Option<usize>,
}

/// Reads the data file at `path`.
///
/// # Errors
/// [`AppError::Io`] if it cannot be read, [`AppError::Input`] for any content error.
pub fn read(path: &Path) -> Result<Vec<DataRow>, AppError> {
    let bytes = std::fs::read(path).map_err(|e| AppError::io(format!("reading {}", path.display()), e))?;
    parse(&path.display().to_string(), &bytes)
}

/// Parses CSV text; `file` is the name used in messages.
///
/// Each physical line holds one record (quoted fields may not span lines), so that the
/// line numbers in messages are exact.
///
/// # Errors
/// [`AppError::Input`] naming `file:line`, the column and what was expected.
pub fn parse(file: &str, bytes: &[u8]) -> Result<Vec<DataRow>, AppError> {
    let lines = data_lines(file, bytes)?;
    let mut lines = lines.into_iter();
    let Some((header_line, header_text)) = lines.next() else {
        return Err(AppError::input(format!(
            "{file}: the file is empty; expected a header row naming the columns {}",
            expected_columns()
        )));
    };
    let header = record(file, header_line, header_text)?;
    let layout = layout(file, header_line, &header)?;
    let mut rows = Vec::new();
    for (line, raw) in lines {
        let fields = record(file, line, raw)?;
        if fields.len() != layout.width {
            return Err(AppError::input(format!(
                "{file}:{line}: expected {} fields as in the header ({}), found {}",
                layout.width,
                header.join(", "),
                fields.len()
            )));
        }
        let stretch = number(file, line, "stretch", &fields[layout.stretch])?;
        if stretch <= 0.0 {
            return Err(AppError::input(format!(
                "{file}:{line}: column `stretch`: expected a stretch > 0 (1 = unloaded), got `{}`",
                fields[layout.stretch]
            )));
        }
        if stretch > MAX_STRETCH {
            return Err(AppError::input(format!(
                "{file}:{line}: column `stretch`: expected a stretch (deformed over original length, at most {MAX_STRETCH}), got `{}`; is the column a strain in per cent?",
                fields[layout.stretch]
            )));
        }
        let column = layout.unit.column();
        let stress = number(file, line, column, &fields[layout.stress])? * layout.unit.to_pa();
        let mode = match layout.mode {
            None => Deformation::Uniaxial,
            Some(i) => mode(file, line, &fields[i])?,
        };
        rows.push(DataRow { line, point: TestPoint { mode, stretch, nominal_stress: stress } });
    }
    if rows.is_empty() {
        return Err(AppError::input(format!(
            "{file}:{header_line}: no data rows after the header; expected one row per measured point"
        )));
    }
    Ok(rows)
}

/// The numbered lines of a CSV text that carry records: UTF-8 checked, a leading
/// byte-order mark dropped, blank lines and `#` comment lines skipped.
///
/// # Errors
/// [`AppError::Input`] naming `file:line` when the text is not UTF-8.
pub(crate) fn data_lines<'a>(file: &str, bytes: &'a [u8]) -> Result<Vec<(u64, &'a str)>, AppError> {
    let text = std::str::from_utf8(bytes).map_err(|e| {
        AppError::input(format!(
            "{file}:{}: the text is not valid UTF-8; expected a plain-text CSV file",
            line_at(bytes, e.valid_up_to())
        ))
    })?;
    let text = text.strip_prefix('\u{feff}').unwrap_or(text);
    Ok(text
        .lines()
        .enumerate()
        .map(|(i, l)| (i as u64 + 1, l))
        .filter(|(_, l)| !(l.trim().is_empty() || l.trim_start().starts_with('#')))
        .collect())
}

fn expected_columns() -> String {
    "`stretch` and `nominal_stress_kpa` (or `nominal_stress_mpa`), optionally `mode`".to_string()
}

/// The 1-based line holding byte `offset`.
fn line_at(bytes: &[u8], offset: usize) -> u64 {
    1 + bytes[..offset.min(bytes.len())].iter().filter(|&&b| b == b'\n').count() as u64
}

/// The trimmed fields of one line (CSV quoting rules).
pub(crate) fn record(file: &str, line: u64, text: &str) -> Result<Vec<String>, AppError> {
    let mut reader =
        csv::ReaderBuilder::new().has_headers(false).trim(csv::Trim::All).from_reader(text.as_bytes());
    match reader.records().next() {
        Some(Ok(r)) => Ok(r.iter().map(str::to_string).collect()),
        Some(Err(e)) => Err(AppError::input(format!("{file}:{line}: {e}"))),
        None => Ok(Vec::new()),
    }
}

fn layout(file: &str, line: u64, header: &[String]) -> Result<Layout, AppError> {
    let mut stretch = None;
    let mut kpa = None;
    let mut mpa = None;
    let mut mode = None;
    for (i, raw) in header.iter().enumerate() {
        let name = raw.trim_start_matches('\u{feff}').to_ascii_lowercase();
        let slot = match name.as_str() {
            "stretch" => &mut stretch,
            "nominal_stress_kpa" => &mut kpa,
            "nominal_stress_mpa" => &mut mpa,
            "mode" => &mut mode,
            _ => {
                let hint = if raw.contains(';') || raw.contains('\t') {
                    " (fields must be separated by commas)"
                } else {
                    ""
                };
                return Err(AppError::input(format!(
                    "{file}:{line}: unknown column `{raw}`{hint}; valid columns are {}",
                    COLUMNS.join(", ")
                )));
            }
        };
        if slot.replace(i).is_some() {
            return Err(AppError::input(format!("{file}:{line}: column `{name}` appears twice")));
        }
    }
    let Some(stretch) = stretch else {
        return Err(AppError::input(format!(
            "{file}:{line}: missing column `stretch`; expected {}",
            expected_columns()
        )));
    };
    let (stress, unit) = match (kpa, mpa) {
        (Some(i), None) => (i, StressUnit::KPa),
        (None, Some(i)) => (i, StressUnit::MPa),
        (Some(_), Some(_)) => {
            return Err(AppError::input(format!(
                "{file}:{line}: both `nominal_stress_kpa` and `nominal_stress_mpa` given; expected exactly one"
            )));
        }
        (None, None) => {
            return Err(AppError::input(format!(
                "{file}:{line}: missing column `nominal_stress_kpa` (or `nominal_stress_mpa`); expected {}",
                expected_columns()
            )));
        }
    };
    Ok(Layout { width: header.len(), stretch, stress, unit, mode })
}

pub(crate) fn number(file: &str, line: u64, column: &str, text: &str) -> Result<f64, AppError> {
    match text.parse::<f64>() {
        Ok(v) if v.is_finite() => Ok(v),
        Ok(_) => Err(AppError::input(format!(
            "{file}:{line}: column `{column}`: expected a finite number, got `{text}`"
        ))),
        Err(_) if text.is_empty() => Err(AppError::input(format!(
            "{file}:{line}: column `{column}`: expected a number, the field is empty"
        ))),
        Err(_) => {
            Err(AppError::input(format!("{file}:{line}: column `{column}`: expected a number, got `{text}`")))
        }
    }
}

fn mode(file: &str, line: u64, text: &str) -> Result<Deformation, AppError> {
    let lower = text.to_ascii_lowercase();
    Deformation::ALL.into_iter().find(|d| d.name() == lower).ok_or_else(|| {
        AppError::input(format!(
            "{file}:{line}: column `mode`: expected one of uniaxial, planar, equibiaxial, got `{text}`"
        ))
    })
}

#[cfg(test)]
mod tests {
    use super::*;

    fn err(text: &str) -> String {
        parse("t.csv", text.as_bytes()).unwrap_err().to_string()
    }

    #[test]
    fn reads_columns_in_any_order_with_units_and_modes() {
        let rows = parse(
            "t.csv",
            b"mode, nominal_stress_mpa ,stretch\nplanar,0.5,2\n# a comment\n\nEquibiaxial,1e-1,1.5\n",
        )
        .unwrap();
        assert_eq!(rows.len(), 2);
        assert_eq!(rows[0].line, 2);
        assert_eq!(
            rows[0].point,
            TestPoint { mode: Deformation::Planar, stretch: 2.0, nominal_stress: 0.5e6 }
        );
        assert_eq!(rows[1].line, 5);
        assert_eq!(rows[1].point.mode, Deformation::Equibiaxial);
        assert!((rows[1].point.nominal_stress - 1e5).abs() < 1e-6);
        let kpa = parse("t.csv", b"stretch,nominal_stress_kpa\n1.5,12.5\n").unwrap();
        assert_eq!(kpa[0].point.mode, Deformation::Uniaxial);
        assert!((kpa[0].point.nominal_stress - 12.5e3).abs() < 1e-9);
    }

    #[test]
    fn empty_file_and_header_only_are_refused() {
        assert!(err("").starts_with("t.csv: the file is empty"), "{}", err(""));
        assert!(err("\n\n").contains("the file is empty"));
        let e = err("stretch,nominal_stress_kpa\n");
        assert!(e.starts_with("t.csv:1: no data rows"), "{e}");
    }

    #[test]
    fn unknown_duplicate_and_missing_columns_are_named() {
        let e = err("stretch,stress_kpa\n1.5,3\n");
        assert!(e.starts_with("t.csv:1: unknown column `stress_kpa`"), "{e}");
        assert!(e.contains("stretch, nominal_stress_kpa, nominal_stress_mpa, mode"), "{e}");
        assert!(err("stretch;nominal_stress_kpa\n1.5;3\n").contains("separated by commas"));
        assert!(err("stretch,Stretch,nominal_stress_kpa\n").contains("column `stretch` appears twice"));
        let e = err("nominal_stress_kpa\n3\n");
        assert!(e.starts_with("t.csv:1: missing column `stretch`"), "{e}");
        let e = err("stretch,mode\n1.5,uniaxial\n");
        assert!(e.starts_with("t.csv:1: missing column `nominal_stress_kpa`"), "{e}");
        assert!(err("stretch,nominal_stress_kpa,nominal_stress_mpa\n").contains("expected exactly one"));
    }

    #[test]
    fn bad_values_name_line_column_and_expectation() {
        let h = "stretch,nominal_stress_kpa,mode\n1.2,3,uniaxial\n";
        let e = err(&format!("{h}abc,3,uniaxial\n"));
        assert_eq!(e, "t.csv:3: column `stretch`: expected a number, got `abc`");
        let e = err(&format!("{h}1.5,NaN,uniaxial\n"));
        assert_eq!(e, "t.csv:3: column `nominal_stress_kpa`: expected a finite number, got `NaN`");
        let e = err(&format!("{h}1.5,inf,uniaxial\n"));
        assert!(e.contains("expected a finite number, got `inf`"), "{e}");
        let e = err(&format!("{h}0,3,uniaxial\n"));
        assert_eq!(e, "t.csv:3: column `stretch`: expected a stretch > 0 (1 = unloaded), got `0`");
        let e = err(&format!("{h}-1.5,3,uniaxial\n"));
        assert!(e.starts_with("t.csv:3: column `stretch`: expected a stretch > 0"), "{e}");
        let e = err(&format!("{h}300,3,uniaxial\n"));
        assert!(e.starts_with("t.csv:3: column `stretch`: expected a stretch"), "{e}");
        assert!(e.contains("strain in per cent"), "{e}");
        let e = err(&format!("{h}1.5,3,shear\n"));
        assert_eq!(e, "t.csv:3: column `mode`: expected one of uniaxial, planar, equibiaxial, got `shear`");
        let e = err(&format!("{h}1.5,,uniaxial\n"));
        assert_eq!(e, "t.csv:3: column `nominal_stress_kpa`: expected a number, the field is empty");
        let e = err(&format!("{h}1.5,3\n"));
        assert!(e.starts_with("t.csv:3: expected 3 fields as in the header"), "{e}");
    }

    #[test]
    fn line_numbers_count_comments_and_blank_lines() {
        let e = err("# data\n\nstretch,nominal_stress_kpa\n# more\n1.2,3\n\nx,3\n");
        assert!(e.starts_with("t.csv:7: column `stretch`"), "{e}");
    }

    #[test]
    fn invalid_utf8_is_an_input_error() {
        let e = parse("t.csv", b"stretch,nominal_stress_kpa\n1.2,\xff\n").unwrap_err();
        assert_eq!(e.exit_code(), 2);
        assert!(e.to_string().starts_with("t.csv:2:"), "{e}");
    }

    #[test]
    fn a_missing_file_is_an_io_error_naming_it() {
        let e = read(Path::new("/nonexistent-arcfinger/data.csv")).unwrap_err();
        assert_eq!(e.exit_code(), 2);
        assert!(e.to_string().contains("/nonexistent-arcfinger/data.csv"));
    }
}

//! Messages for scene files that do not parse.
//!
//! A RON error becomes
//!
//! ```text
//! scenes/x.ron:21:26: unknown field `top_wal` in actuators."f100".section (Box); did you mean `top_wall_mm`?
//!    21 |                          top_wal: 3.0, floor_mm: 3.0, under_layer_mm: 1.0),
//!       |                          ^^^^^^^
//!       = fields of Box: chamber_width_mm, chamber_height_mm, side_wall_mm, top_wall_mm, floor_mm, under_layer_mm
//! ```
//!
//! The first line is `FILE:LINE:COL: message` (1-based, columns in characters, as RON
//! counts them), so editors and CI logs can jump to it. The block and field names come
//! from [`locate`](super::locate), the suggestion from [`suggest`](super::suggest).

use ron::error::{Error, SpannedError};

use super::locate::{Location, locate, tuple_element_names};
use crate::suggest::nearest;

/// The variants a field of enum type accepts, for messages where RON does not list them.
pub fn enum_variants_of_field(field: &str) -> Option<&'static [&'static str]> {
    match field {
        "model" => Some(&["NeoHookean", "MooneyRivlin", "Yeoh", "Ogden"]),
        "section" => Some(&["Box", "HalfRound"]),
        "palm" => Some(&["Disk"]),
        "shape" => Some(&["Sphere", "Box", "Cylinder", "Capsule", "Ellipsoid", "Mesh"]),
        "section_model" => Some(&["Baseline", "WallPressure"]),
        _ => None,
    }
}

/// The full message for a parse error of `text` (the contents of `file`).
pub fn parse_error_message(file: &str, text: &str, err: &SpannedError) -> String {
    let mut start = err.span.start;
    let mut end = err.span.end;
    // RON often reports the blank before a value; point at the value itself
    if let Some(l) = text.lines().nth(start.line.saturating_sub(1)) {
        let blanks =
            l.chars().skip(start.col.saturating_sub(1)).take_while(|c| *c == ' ' || *c == '\t').count();
        if blanks > 0 && l.chars().count() >= start.col + blanks {
            start.col += blanks;
            if end.line == start.line {
                end.col = end.col.max(start.col);
            }
        }
    }
    if err.code == Error::TrailingCharacters {
        // RON points at the end of the scene; the stray text starts further on
        let rest = text_from(text, start.line, start.col);
        let skipped = &rest[..rest.len() - rest.trim_start().len()];
        if !rest.trim_start().is_empty() {
            let newlines = skipped.matches('\n').count();
            start.line += newlines;
            start.col = if newlines > 0 {
                skipped.rsplit('\n').next().map_or(0, |l| l.chars().count()) + 1
            } else {
                start.col + skipped.chars().count()
            };
            end = start;
        }
    }
    let loc = locate(text, start.line, start.col);
    let found = found_at(text, start.line, start.col);
    let (headline, notes) = describe(&err.code, &loc, &found);
    let mut out = format!("{file}:{}:{}: {headline}", start.line, start.col);
    if let Some(line_text) = text.lines().nth(start.line.saturating_sub(1)) {
        let width = if end.line == start.line && end.col > start.col { end.col - start.col } else { 1 };
        out.push('\n');
        out.push_str(&excerpt(start.line, line_text, start.col, width));
    }
    for n in notes {
        out.push_str(&format!("\n{:>6} = {n}", ""));
    }
    out
}

/// Longest stretch of a source line shown in an excerpt (characters).
const EXCERPT_WIDTH: usize = 100;

/// The source line with a gutter, and a caret line under columns `col..col + width`.
/// Long lines are cut to a window around the column (marked with `...`); control
/// characters are shown as `?` so the terminal stays readable.
fn excerpt(line_no: usize, line_text: &str, col: usize, width: usize) -> String {
    let chars: Vec<char> = line_text
        .trim_end_matches('\r')
        .chars()
        .map(|c| if c.is_control() && c != '\t' { '?' } else { c })
        .collect();
    let col0 = col.saturating_sub(1).min(chars.len());
    let (from, to) = if chars.len() <= EXCERPT_WIDTH {
        (0, chars.len())
    } else {
        let from = col0.saturating_sub(EXCERPT_WIDTH / 2);
        (from, (from + EXCERPT_WIDTH).min(chars.len()))
    };
    let shown: String = chars[from..to].iter().collect();
    let lead = if from > 0 { "..." } else { "" };
    let tail = if to < chars.len() { "..." } else { "" };
    // keep tabs as tabs so the caret lines up in any tab width
    let pad: String = std::iter::repeat_n(' ', lead.len())
        .chain(chars[from..col0].iter().map(|&c| if c == '\t' { '\t' } else { ' ' }))
        .collect();
    let avail = to.saturating_sub(col0).max(1);
    let carets = "^".repeat(width.clamp(1, avail));
    format!("{line_no:>6} | {lead}{shown}{tail}\n{:>6} | {pad}{carets}", "")
}

/// A short description of the text found at a position, for "found ..." phrases.
fn found_at(text: &str, line: usize, col: usize) -> String {
    let rest = text_from(text, line, col).trim_start();
    let Some(first) = rest.chars().next() else {
        return "the end of the file".to_string();
    };
    let clip = |s: &str| s.chars().take(40).collect::<String>();
    if first == '"' {
        let inner: String = rest[1..].chars().take_while(|&c| c != '"' && c != '\n').collect();
        format!("the string \"{}\"", clip(&inner))
    } else if first.is_ascii_digit() || first == '-' || first == '+' || first == '.' {
        let num: String = rest.chars().take_while(|c| !c.is_whitespace() && !",)]}".contains(*c)).collect();
        format!("the number {}", clip(&num))
    } else if first == '_' || first.is_alphabetic() {
        let id: String = rest.chars().take_while(|c| *c == '_' || c.is_alphanumeric()).collect();
        format!("`{}`", clip(&id))
    } else if first.is_control() {
        format!("the control character U+{:04X}", u32::from(first))
    } else {
        format!("`{first}`")
    }
}

/// The text from 1-based `(line, col)` (columns in characters) to the end.
fn text_from(text: &str, line: usize, col: usize) -> &str {
    let mut offset = 0;
    for (i, l) in text.split_inclusive('\n').enumerate() {
        if i + 1 == line {
            let within = l.char_indices().nth(col.saturating_sub(1)).map_or(l.len(), |(b, _)| b);
            return &text[offset + within..];
        }
        offset += l.len();
    }
    ""
}

/// `in PATH (Name)` or `at the top level`.
fn place(path: &str, name: Option<&str>) -> String {
    match (path.is_empty(), name) {
        (true, Some(n)) => format!("in {n}(...)"),
        (true, None) => "at the top level".to_string(),
        (false, Some(n)) => format!("in {path} ({n})"),
        (false, None) => format!("in {path}"),
    }
}

fn for_path(path: &str) -> String {
    if path.is_empty() { String::new() } else { format!(" for {path}") }
}

fn list(names: &[&str]) -> String {
    names.join(", ")
}

/// Headline and notes for one RON error code.
fn describe(code: &Error, loc: &Location, found: &str) -> (String, Vec<String>) {
    let block_place = place(&loc.block, loc.block_name.as_deref());
    let value_for = for_path(&loc.value);
    let mut notes = Vec::new();
    if let Some(from) = loc.multiline_string_from {
        notes.push(format!(
            "the string that starts on line {from} runs over a line end: is its closing quote missing?"
        ));
    }
    let headline = match code {
        Error::NoSuchStructField { expected, found: name, .. } => {
            let what = loc.block_name.as_deref().unwrap_or("this block");
            notes.push(format!("fields of {what}: {}", list(expected)));
            let mut h = format!("unknown field `{name}` {block_place}");
            if let Some(s) = nearest(name, expected.iter().copied()) {
                h.push_str(&format!("; did you mean `{s}`?"));
                if unit_suffix_differs(name, s) {
                    notes.push(
                        "the unit is part of each field name: mm, kpa, g, n (newtons), deg, g_cm3"
                            .to_string(),
                    );
                }
            }
            h
        }
        Error::NoSuchEnumVariant { expected, found: name, .. } => {
            notes.push(format!("one of: {}", list(expected)));
            let mut h = format!("unknown variant `{name}`{value_for}");
            if let Some(s) = nearest(name, expected.iter().copied()) {
                h.push_str(&format!("; did you mean `{s}`?"));
            }
            h
        }
        Error::MissingStructField { field, .. } => {
            notes.push(format!("add `{field}: ...` to this block"));
            format!("missing field `{field}` {block_place}")
        }
        Error::DuplicateStructField { field, .. } => {
            format!("field `{field}` appears twice {block_place}")
        }
        Error::ExpectedDifferentLength { expected, found: n } => {
            let field = loc.block.rsplit('.').next().unwrap_or("");
            match tuple_element_names(field) {
                Some(names) => {
                    format!("{} needs {} values ({}), found {n}", loc.block, names.len(), list(names))
                }
                None => format!("expected {expected}{}, found {n} values", for_path(&loc.block)),
            }
        }
        Error::ExpectedFloat => format!("expected a number{value_for}, found {found}"),
        Error::ExpectedInteger => format!("expected a whole number{value_for}, found {found}"),
        Error::IntegerOutOfBounds => {
            format!("expected a whole number from 0 to 4294967295{value_for}, found {found}")
        }
        Error::ExpectedString => format!("expected a quoted string{value_for}, found {found}"),
        Error::ExpectedStringEnd => "a string is not closed: its closing quote is missing".to_string(),
        Error::ExpectedOption => format!("expected `Some(...)` or `None`{value_for}, found {found}"),
        Error::ExpectedBoolean => format!("expected `true` or `false`{value_for}, found {found}"),
        Error::ExpectedIdentifier => match loc.field.as_deref().and_then(enum_variants_of_field) {
            Some(vs) => {
                notes.push(format!("one of: {}", list(vs)));
                format!("expected a variant name such as `{}(...)`{value_for}, found {found}", vs[0])
            }
            None => format!("expected a field name {block_place}, found {found}"),
        },
        Error::ExpectedStructLike | Error::ExpectedNamedStructLike(_) => {
            format!("expected `(`{value_for}, found {found}")
        }
        Error::ExpectedStructLikeEnd | Error::ExpectedOptionEnd => {
            format!("expected `,` or `)` {block_place}, found {found}")
        }
        Error::ExpectedArray => format!("expected a list `[...]`{value_for}, found {found}"),
        Error::ExpectedArrayEnd => format!("expected `,` or `]` {block_place}, found {found}"),
        Error::ExpectedMap => {
            format!("expected a map `{{ \"name\": (...), ... }}`{value_for}, found {found}")
        }
        Error::ExpectedMapColon => format!("expected `:` after the name {block_place}, found {found}"),
        Error::ExpectedMapEnd => format!("expected `,` or `}}` {block_place}, found {found}"),
        Error::ExpectedComma => {
            format!("expected `,` before the next entry {block_place}, found {found}")
        }
        Error::ExpectedDifferentStructName { expected, found: name } => {
            format!("expected `{expected}(...)` here, found `{name}`")
        }
        Error::InvalidValueForType { expected, found: what } => {
            format!("expected {expected}{value_for}, found {what}")
        }
        Error::Eof => {
            let open =
                if loc.block.is_empty() { String::new() } else { format!(" ({} is still open)", loc.block) };
            format!("unexpected end of file: a bracket or parenthesis is not closed{open}")
        }
        Error::TrailingCharacters => "unexpected text after the end of the scene".to_string(),
        Error::UnexpectedChar(c) => format!("unexpected character `{c}` {block_place}"),
        Error::UnclosedBlockComment => "a `/*` comment is not closed".to_string(),
        Error::ExceededRecursionLimit => "the file nests brackets too deeply".to_string(),
        Error::Message(m) => {
            if loc.block.is_empty() {
                m.clone()
            } else {
                format!("{}: {m}", loc.block)
            }
        }
        other => {
            // Remaining codes read well enough as RON words them; keep them lower-case
            // like ours.
            let text = other.to_string();
            let mut cs = text.chars();
            match cs.next() {
                Some(f) => format!("{}{}{}", f.to_lowercase(), cs.as_str(), value_for),
                None => text,
            }
        }
    };
    (headline, notes)
}

/// `mass_kg` against `mass_g`: the same stem with another unit suffix.
fn unit_suffix_differs(given: &str, valid: &str) -> bool {
    let stem = |s: &str| s.rsplit_once('_').map(|(a, _)| a.to_string()).unwrap_or_else(|| s.to_string());
    given != valid && (stem(given) == stem(valid) || valid.starts_with(&format!("{given}_")))
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::scene_doc::SceneDoc;

    /// The enum table agrees with the schema: feeding each enum-valued field a wrong
    /// variant makes RON list exactly the table's variants.
    #[test]
    fn enum_table_matches_the_schema() {
        let base = include_str!("../../../tests/data/design-example.ron");
        for (from, to, field) in [
            ("model: Yeoh(", "model: Nope(", "model"),
            ("section: Box(", "section: Nope(", "section"),
            ("palm: Disk(", "palm: Nope(", "palm"),
            ("shape: Sphere(", "shape: Nope(", "shape"),
            ("max_pressure_kpa: 60.0,", "max_pressure_kpa: 60.0, section_model: Nope,", "section_model"),
        ] {
            let text = base.replacen(from, to, 1);
            let err = ron::from_str::<SceneDoc>(&text).unwrap_err();
            match err.code {
                Error::NoSuchEnumVariant { expected, .. } => {
                    assert_eq!(Some(expected), enum_variants_of_field(field), "{field}")
                }
                other => panic!("{field}: {other:?}"),
            }
        }
    }

    #[test]
    fn excerpt_puts_the_caret_under_the_column_and_keeps_tabs() {
        let e = excerpt(7, "\tmass_g: x,", 10, 1);
        assert_eq!(e, "     7 | \tmass_g: x,\n       | \t        ^");
        let e = excerpt(7, "ab", 1, 10);
        assert_eq!(e, "     7 | ab\n       | ^^");
        let e = excerpt(3, "a\u{0}b", 2, 1);
        assert_eq!(e, "     3 | a?b\n       |  ^");
    }

    #[test]
    fn long_lines_are_cut_around_the_column() {
        let line: String = (0..1000).map(|i| if i == 600 { 'X' } else { '[' }).collect();
        let e = excerpt(1, &line, 601, 1);
        let (src, caret) = e.split_once('\n').unwrap();
        assert!(src.len() < 130 && src.contains("...") && src.ends_with("..."), "{src}");
        // the caret sits under the X
        assert_eq!(src.find('X'), caret.find('^'));
    }

    #[test]
    fn found_text_is_described_by_kind() {
        let t = "a: \"60\", b: -2, c: xyz, d: (";
        assert_eq!(found_at(t, 1, 4), "the string \"60\"");
        assert_eq!(found_at(t, 1, 13), "the number -2");
        assert_eq!(found_at(t, 1, 20), "`xyz`");
        assert_eq!(found_at(t, 1, 28), "`(`");
        assert_eq!(found_at(t, 2, 1), "the end of the file");
        assert_eq!(found_at("\u{0}", 1, 1), "the control character U+0000");
    }

    #[test]
    fn unit_suffix_mismatch_is_recognised() {
        assert!(unit_suffix_differs("mass_kg", "mass_g"));
        assert!(unit_suffix_differs("top_wall", "top_wall_mm"));
        assert!(!unit_suffix_differs("flor_mm", "floor_mm"));
    }
}

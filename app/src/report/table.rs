//! The compact terminal table: a heading line, one row per object, the reasons under
//! each object that does not pass, and a verdict line with the recommendation.
//!
//! Colour marks the result words only, and only when the output is a terminal, `NO_COLOR`
//! is unset or empty, and `TERM` is not `dumb` ([`color_wanted`]). The scheme is safe for
//! the common colour-vision deficiencies: blue for PASS, vermillion for FAIL, reddish
//! purple for UNKNOWN (256-colour approximations of the Okabe–Ito palette), and the word
//! is always written, so colour is never the only cue.
//!
//! User text is passed through [`sanitize`]: a name can hold escape sequences, and a
//! report must not be able to drive the terminal.

use std::ffi::OsStr;
use std::fmt::Write as _;
use std::io;

use grasp_core::check::CheckReport;

use super::{Context, Status, fixed, object_status, overall_status, percent, window_kpa};

/// SGR sequences of the result words.
fn sgr(st: Status) -> &'static str {
    match st {
        Status::Pass => "\x1b[1;38;5;32m",
        Status::Fail => "\x1b[1;38;5;166m",
        Status::Unknown => "\x1b[1;38;5;133m",
    }
}

const RESET: &str = "\x1b[0m";

/// Whether to colour output going to a stream: only a terminal, only without a
/// non-empty `NO_COLOR`, and not on a `dumb` terminal.
pub fn color_wanted(is_terminal: bool, no_color: Option<&OsStr>, term: Option<&OsStr>) -> bool {
    is_terminal && no_color.is_none_or(OsStr::is_empty) && term != Some(OsStr::new("dumb"))
}

/// [`color_wanted`] for `stream` and this process's environment.
pub fn color_for(stream: &impl std::io::IsTerminal) -> bool {
    color_wanted(
        stream.is_terminal(),
        std::env::var_os("NO_COLOR").as_deref(),
        std::env::var_os("TERM").as_deref(),
    )
}

/// `s` with control characters and bidirectional-override characters shown as
/// escapes (`\u{1b}`, `\n`) instead of sent to the terminal.
pub fn sanitize(s: &str) -> String {
    let mut out = String::with_capacity(s.len());
    for c in s.chars() {
        if c.is_control() || matches!(c, '\u{202a}'..='\u{202e}' | '\u{2066}'..='\u{2069}') {
            out.extend(c.escape_default());
        } else {
            out.push(c);
        }
    }
    out
}

fn word(st: Status, width: usize, color: bool) -> String {
    let padded = format!("{:<width$}", st.word());
    if color { format!("{}{padded}{RESET}", sgr(st)) } else { padded }
}

/// The table as text; `color` adds the result words' colours.
pub fn to_string(r: &CheckReport, ctx: &Context, color: bool) -> String {
    let mut s = String::new();
    let _ = writeln!(
        s,
        "grasp check of \"{}\" at {} kPa ({})",
        sanitize(&r.scene),
        fixed(r.pressure / 1e3, 1),
        sanitize(&ctx.scene_file)
    );
    let names: Vec<String> = r.objects.iter().map(|o| sanitize(&o.name)).collect();
    let w = names.iter().map(|n| n.chars().count()).max().unwrap_or(0).max("object".len());
    let _ = writeln!(
        s,
        "  {:<w$}  {:<7}  {:>7}  {:>9}  {:>6}  {:>7}  {:>8}  window (kPa)",
        "object", "result", "fingers", "enclosure", "lift", "lateral", "peak (N)"
    );
    let statuses: Vec<Status> = r.objects.iter().map(object_status).collect();
    for ((o, name), &st) in r.objects.iter().zip(&names).zip(&statuses) {
        // pad by characters, not bytes, so accented names line up
        let pad = w - name.chars().count();
        let _ = writeln!(
            s,
            "  {name}{:pad$}  {}  {:>7}  {:>9}  {:>6}  {:>7}  {:>8}  {}",
            "",
            word(st, 7, color),
            o.fingers_in_contact,
            percent(o.enclosure),
            fixed(o.holding.lift, 2),
            fixed(o.holding.lateral_min, 2),
            fixed(o.peak_contact_force, 2),
            window_kpa(o.pressure_window, "-"),
        );
        for f in &o.failures {
            let _ = writeln!(s, "      - {}", sanitize(&f.to_string()));
        }
    }
    let count = |x: Status| statuses.iter().filter(|&&y| y == x).count();
    let overall = overall_status(r);
    let mut tally = format!("{} of {} objects pass", count(Status::Pass), r.objects.len());
    if count(Status::Fail) > 0 {
        let _ = write!(tally, ", {} fail", count(Status::Fail));
    }
    if count(Status::Unknown) > 0 {
        let _ = write!(tally, ", {} unknown (a solve did not converge)", count(Status::Unknown));
    }
    let _ = writeln!(s, "\n{}: {tally}", word(overall, 0, color));
    let _ = writeln!(s, "{}", sanitize(&super::recommendation(r, |n| format!("\"{n}\""))));
    if let Some(robust) = &ctx.robust {
        s.push_str(&super::robust::table(robust, sanitize));
    }
    s.push_str(
        "margins are load scales, passing at the safety factor; estimates for design, not a certification:\n\
         never exceed the rated pressure, and use a regulator, a relief valve and eye protection.\n",
    );
    s
}

/// Writes the table to `w`.
///
/// # Errors
/// Write failures of `w`.
pub fn write(r: &CheckReport, ctx: &Context, color: bool, mut w: impl io::Write) -> io::Result<()> {
    w.write_all(to_string(r, ctx, color).as_bytes())
}

#[cfg(test)]
mod tests {
    use super::super::test_support::{self, BAD};
    use super::*;

    #[test]
    fn no_color_under_no_color_on_a_pipe_or_a_dumb_terminal() {
        let os = |s: &'static str| Some(OsStr::new(s));
        assert!(color_wanted(true, None, os("xterm-256color")));
        assert!(color_wanted(true, os(""), None), "an empty NO_COLOR does not count");
        assert!(!color_wanted(true, os("1"), os("xterm-256color")));
        assert!(!color_wanted(false, None, os("xterm-256color")));
        assert!(!color_wanted(true, None, os("dumb")));
        let plain = to_string(&test_support::report(), &Context::new("a.ron"), false);
        assert!(!plain.contains('\x1b'), "{plain}");
    }

    #[test]
    fn colour_marks_the_words_and_the_words_stay() {
        let r = test_support::unconverged();
        let colored = to_string(&r, &Context::new("a.ron"), true);
        assert!(colored.contains("\x1b[1;38;5;32mPASS   \x1b[0m"), "{colored}");
        assert!(colored.contains("\x1b[1;38;5;133mUNKNOWN\x1b[0m"), "{colored}");
        // with the colour sequences removed, it is the plain table
        let stripped = colored
            .replace("\x1b[1;38;5;32m", "")
            .replace("\x1b[1;38;5;166m", "")
            .replace("\x1b[1;38;5;133m", "")
            .replace(RESET, "");
        assert_eq!(stripped, to_string(&r, &Context::new("a.ron"), false));
    }

    #[test]
    fn rows_line_up_and_reasons_follow_the_failing_object() {
        let text = to_string(&test_support::report(), &Context::new("scenes/a.ron"), false);
        let lines: Vec<&str> = text.lines().collect();
        assert_eq!(lines[0], "grasp check of \"co-op | line <3f> & \"trial\"\" at 40.0 kPa (scenes/a.ron)");
        let w = BAD.chars().count();
        assert_eq!(
            lines[1],
            format!(
                "  {:<w$}  result   fingers  enclosure    lift  lateral  peak (N)  window (kPa)",
                "object"
            )
        );
        assert_eq!(
            lines[2],
            format!("  {:<w$}  PASS           3       62 %    2.41     2.10      2.00  20.0-47.5", "peach")
        );
        assert_eq!(
            lines[3],
            format!("  {BAD}  FAIL           1       12 %    0.75     0.22     11.50  none")
        );
        assert_eq!(lines[4], "      - 1 finger(s) in contact, 2 required");
        assert_eq!(lines[8], "      - fingers interfere: 1-2");
        assert_eq!(lines[10], "FAIL: 1 of 2 objects pass, 1 fail");
        assert!(lines[11].contains(&format!("no swept pressure lets \"{BAD}\" pass")), "{text}");
    }

    #[test]
    fn control_characters_in_names_are_shown_not_sent() {
        assert_eq!(sanitize("pe\u{1b}[31mach\n\u{202e}x"), "pe\\u{1b}[31mach\\n\\u{202e}x");
        let mut r = test_support::report();
        r.objects[0].name = "pe\u{1b}]0;owned\u{7}ach".into();
        let text = to_string(&r, &Context::new("a.ron"), false);
        assert!(!text.contains('\x1b') && !text.contains('\x07'), "{text}");
    }

    #[test]
    fn writes_are_byte_identical_and_match_to_string() {
        let r = test_support::report();
        let ctx = Context::new("x.ron");
        let (mut a, mut b) = (Vec::new(), Vec::new());
        write(&r, &ctx, true, &mut a).unwrap();
        write(&r, &ctx, true, &mut b).unwrap();
        assert_eq!(a, b);
        assert_eq!(a, to_string(&r, &ctx, true).into_bytes());
    }
}

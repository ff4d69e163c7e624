//! A pull-request comment (GitHub-flavoured Markdown): a heading with the verdict, a
//! table with one row per object, the reasons of every object that does not pass, the
//! recommended pressure or the clash statement, and the cautions of DESIGN 3.6.
//!
//! Results are words (`pass`, `**FAIL**`, `**UNKNOWN**`), not colours or emoji, so the
//! comment reads the same to everyone and in plain text. Every user-supplied string
//! goes through [`escape`]: scene files arrive in pull requests, and a name must not be
//! able to break the table, open a link, render HTML or mention someone.

use std::fmt::Write as _;
use std::io;

use grasp_core::check::CheckReport;

use super::{CAUTIONS, Context, Status, fixed, object_status, overall_status, percent, window_kpa};

/// `s` as literal inline text, safe in a table cell and in running text.
///
/// * `&`, `<`, `>` become entities (no HTML, even where backslashes are not honoured);
/// * the ASCII punctuation that starts or ends inline syntax (code, emphasis, links and
///   images, strike-through), or that GitHub turns into references, maths or mentions, is
///   backslash-escaped: `` \ ` * _ [ ] # | ~ @ $ `` (`\|` also keeps a cell from
///   splitting); `(`, `)` and `!` are harmless once `[` and `]` are escaped;
/// * line breaks, tabs and other control characters become spaces (a table row is one
///   line).
///
/// Characters that only matter at the start of a line (`-`, `+`, `.`, `>`) are left as
/// they are: the writer never puts user text at the start of a line.
pub fn escape(s: &str) -> String {
    let mut out = String::with_capacity(s.len());
    for c in s.chars() {
        match c {
            '&' => out.push_str("&amp;"),
            '<' => out.push_str("&lt;"),
            '>' => out.push_str("&gt;"),
            '\\' | '`' | '*' | '_' | '[' | ']' | '#' | '|' | '~' | '@' | '$' => {
                out.push('\\');
                out.push(c);
            }
            c if c.is_control() => out.push(' '),
            c => out.push(c),
        }
    }
    out
}

fn result_cell(st: Status) -> String {
    match st {
        Status::Pass => "pass".to_string(),
        st => format!("**{}**", st.word()),
    }
}

/// The comment as text.
pub fn to_string(r: &CheckReport, ctx: &Context) -> String {
    let mut s = String::new();
    let overall = overall_status(r);
    let statuses: Vec<Status> = r.objects.iter().map(object_status).collect();
    let count = |st: Status| statuses.iter().filter(|&&x| x == st).count();
    let _ = writeln!(s, "### Grasp check of {}: {}", escape(&r.scene), result_cell(overall));
    s.push('\n');
    let mut tally = format!("{} of {} objects pass", count(Status::Pass), r.objects.len());
    if count(Status::Fail) > 0 {
        let _ = write!(tally, ", {} fail", count(Status::Fail));
    }
    if count(Status::Unknown) > 0 {
        let _ = write!(tally, ", {} unknown (a solve did not converge)", count(Status::Unknown));
    }
    let _ = writeln!(
        s,
        "{tally} at a supply pressure of {} kPa (scene file {}).",
        fixed(r.pressure / 1e3, 1),
        escape(&ctx.scene_file)
    );
    s.push('\n');
    s.push_str(
        "| object | result | fingers | enclosure | lift margin | lateral margin | peak force (N) | window (kPa) |\n",
    );
    s.push_str("| :--- | :--- | ---: | ---: | ---: | ---: | ---: | :--- |\n");
    for (o, &st) in r.objects.iter().zip(&statuses) {
        let _ = writeln!(
            s,
            "| {} | {} | {} | {} | {} | {} | {} | {} |",
            escape(&o.name),
            result_cell(st),
            o.fingers_in_contact,
            percent(o.enclosure),
            fixed(o.holding.lift, 2),
            fixed(o.holding.lateral_min, 2),
            fixed(o.peak_contact_force, 2),
            window_kpa(o.pressure_window, "–"),
        );
    }
    let failing: Vec<_> = r.objects.iter().filter(|o| !o.failures.is_empty()).collect();
    if !failing.is_empty() {
        s.push_str("\n**Reasons**\n\n");
        for o in failing {
            let _ = writeln!(s, "- **{}**", escape(&o.name));
            for f in &o.failures {
                let _ = writeln!(s, "  - {}", escape(&f.to_string()));
            }
        }
    }
    s.push('\n');
    s.push_str(&super::recommendation(r, |n| format!("**{}**", escape(n))));
    s.push('\n');
    s.push_str("\nMargins are load scales (pass at or above the scene's safety factor); the window is the widest range of swept supply pressures over which the object passes.\n");
    if let Some(robust) = &ctx.robust {
        s.push_str(&super::robust::markdown(robust, escape));
    }
    let _ = writeln!(s, "\n_{CAUTIONS}_");
    s
}

/// Writes the comment to `w`.
///
/// # Errors
/// Write failures of `w`.
pub fn write(r: &CheckReport, ctx: &Context, mut w: impl io::Write) -> io::Result<()> {
    w.write_all(to_string(r, ctx).as_bytes())
}

#[cfg(test)]
mod tests {
    use super::super::test_support::{self, BAD};
    use super::*;

    #[test]
    fn escaping_neutralises_tables_code_html_links_and_mentions() {
        assert_eq!(escape("egg | `large` <b>&amp;"), "egg \\| \\`large\\` &lt;b&gt;&amp;amp;");
        assert_eq!(
            escape("![x](javascript:y) @team #12 $a$ *b* _c_ ~d~ !e"),
            "!\\[x\\](javascript:y) \\@team \\#12 \\$a\\$ \\*b\\* \\_c\\_ \\~d\\~ !e"
        );
        assert_eq!(escape("two\nlines\r\tand\u{1b}esc"), "two lines  and esc");
        assert_eq!(escape("a\\|b"), "a\\\\\\|b");
        assert_eq!(escape("hen-egg 1.5 \"q\" ünï"), "hen-egg 1.5 \"q\" ünï");
    }

    /// Every row has as many unescaped `|` as the header, so no name splits a cell.
    #[test]
    fn table_rows_keep_their_columns_whatever_the_names() {
        let text = to_string(&test_support::report(), &Context::new("scenes/x|y.ron"));
        let cells = |line: &str| {
            let b = line.as_bytes();
            (0..b.len()).filter(|&i| b[i] == b'|' && (i == 0 || b[i - 1] != b'\\')).count()
        };
        let rows: Vec<&str> = text.lines().filter(|l| l.starts_with('|')).collect();
        assert_eq!(rows.len(), 4, "{text}");
        assert!(rows.iter().all(|r| cells(r) == 9), "{text}");
        assert!(
            rows[3].starts_with(&format!(
                "| {} | **FAIL** | 1 | 12 % | 0.75 | 0.22 | 11.50 | none |",
                escape(BAD)
            )),
            "{text}"
        );
        assert!(
            rows[2].starts_with("| peach | pass | 3 | 62 % | 2.41 | 2.10 | 2.00 | 20.0–47.5 |"),
            "{text}"
        );
        // no raw markup from a name survives anywhere in the comment
        assert!(!text.contains("<b>") && !text.contains("`large`"), "{text}");
        assert!(text.contains("scene file scenes/x\\|y.ron"), "{text}");
    }

    #[test]
    fn comment_has_verdict_reasons_recommendation_and_cautions() {
        let text = to_string(&test_support::report(), &Context::new("a.ron"));
        let first = text.lines().next().unwrap();
        assert_eq!(first, "### Grasp check of co-op \\| line &lt;3f&gt; &amp; \"trial\": **FAIL**");
        assert!(text.contains("1 of 2 objects pass, 1 fail at a supply pressure of 40.0 kPa"), "{text}");
        assert!(
            text.contains(&format!("- **{}**\n  - 1 finger(s) in contact, 2 required\n", escape(BAD))),
            "{text}"
        );
        assert!(
            text.contains("  - peak contact force 11.50 N exceeds the limit of 10.00 N by 1.50 N\n"),
            "{text}"
        );
        assert!(text.contains(&format!("no swept pressure lets **{}** pass", escape(BAD))), "{text}");
        assert!(text.contains("relief valve") && text.contains("not a certification"), "{text}");
        let text = to_string(&test_support::passing(), &Context::new("a.ron"));
        assert!(text.lines().next().unwrap().ends_with(": pass"));
        assert!(!text.contains("**Reasons**"));
        assert!(text.contains("Recommended supply pressure: 35.0 kPa"));
        let mut r = test_support::report();
        r.clashes = vec![("peach".into(), BAD.into())];
        let text = to_string(&r, &Context::new("a.ron"));
        assert!(
            text.contains(&format!("windows of **peach** and **{}** do not overlap", escape(BAD))),
            "{text}"
        );
        let text = to_string(&test_support::unconverged(), &Context::new("a.ron"));
        assert!(
            text.contains("**UNKNOWN**") && text.contains("1 unknown (a solve did not converge)"),
            "{text}"
        );
    }

    #[test]
    fn writes_are_byte_identical_and_match_to_string() {
        let r = test_support::report();
        let ctx = Context::new("x.ron");
        let (mut a, mut b) = (Vec::new(), Vec::new());
        write(&r, &ctx, &mut a).unwrap();
        write(&r, &ctx, &mut b).unwrap();
        assert_eq!(a, b);
        assert_eq!(a, to_string(&r, &ctx).into_bytes());
    }
}

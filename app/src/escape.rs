//! Escaping of user-supplied text for HTML output (scene, object, actuator and material
//! names, file paths: anything that comes from a scene file or the command line).
//!
//! Scene files arrive in pull requests, so a name is hostile until escaped: it must not
//! be able to open an element, close an attribute, start a script, or hide itself with
//! control characters. [`html`] is for text content and for attribute values in double
//! or single quotes (the OWASP rule for both: escape `& < > " '`). Never put user text
//! into an unquoted attribute, a `<script>` or `<style>` block, a URL or an event
//! handler; there is no safe escaping there.
//!
//! Markdown has its own rules and its own function (`report::markdown::escape`); the
//! terminal table shows control characters as escapes (`report::table::sanitize`).

/// `s` as HTML text: `& < > " '` become character references, control characters
/// (except tab, line feed and carriage return) and the bidirectional overrides and
/// isolates become U+FFFD, so a name cannot hide or reorder what follows it.
pub fn html(s: &str) -> String {
    let mut out = String::with_capacity(s.len() + s.len() / 8);
    for c in s.chars() {
        match c {
            '&' => out.push_str("&amp;"),
            '<' => out.push_str("&lt;"),
            '>' => out.push_str("&gt;"),
            '"' => out.push_str("&quot;"),
            '\'' => out.push_str("&#39;"),
            '\t' | '\n' | '\r' => out.push(c),
            c if c.is_control() || matches!(c, '\u{202a}'..='\u{202e}' | '\u{2066}'..='\u{2069}') => {
                out.push('\u{fffd}');
            }
            c => out.push(c),
        }
    }
    out
}

#[cfg(test)]
mod tests {
    use super::*;

    /// Hostile names come out as inert text: the only `<`, `>`, quotes and `&` left are
    /// the ones inside character references.
    #[test]
    fn markup_and_quotes_are_neutralised() {
        assert_eq!(
            html(r#"<script>alert("x")</script>"#),
            "&lt;script&gt;alert(&quot;x&quot;)&lt;/script&gt;"
        );
        assert_eq!(html("a' onmouseover='b"), "a&#39; onmouseover=&#39;b");
        assert_eq!(html("Tom & Jerry &amp;"), "Tom &amp; Jerry &amp;amp;");
        assert_eq!(html("peach \u{1b}[2J\u{0}x"), "peach \u{fffd}[2J\u{fffd}x");
        assert_eq!(html("abc\u{202e}fed"), "abc\u{fffd}fed");
        assert_eq!(html("line\none\ttab"), "line\none\ttab");
        // non-ASCII text is kept as it is
        assert_eq!(html("pêche, 桃"), "pêche, 桃");
    }

    /// Whatever the input, the output holds no raw markup character: every `&` starts
    /// one of the five references, and no `<`, `>`, `"` or `'` remains.
    #[test]
    fn no_raw_markup_survives_any_ascii_string() {
        // every pair of printable ASCII characters and a few control ones
        let chars: Vec<char> = (0x20u8..0x7f).map(char::from).chain(['\u{0}', '\u{7f}', '\u{1b}']).collect();
        for &a in &chars {
            for &b in &chars {
                let s: String = [a, b, '&', a].iter().collect();
                let e = html(&s);
                assert!(!e.contains(['<', '>', '"', '\'']), "{s:?} -> {e:?}");
                let mut rest = e.as_str();
                while let Some(i) = rest.find('&') {
                    rest = &rest[i..];
                    assert!(
                        ["&amp;", "&lt;", "&gt;", "&quot;", "&#39;"].iter().any(|r| rest.starts_with(r)),
                        "{s:?} -> {e:?}"
                    );
                    rest = &rest[1..];
                }
            }
        }
    }
}

//! From a line:column in a scene file to the field path of the value there.
//!
//! RON's errors carry a position but not the place in the document, and a message like
//! "missing field `floor_mm`" means little in a file with four actuators. This module
//! re-reads the text up to the error position with a small tokenizer (strings, raw
//! strings, characters, nested block comments, line comments, identifiers, brackets)
//! and keeps a stack of the open brackets, so it can say which block the position is in,
//! e.g. `actuators."f100".section`. It never fails: on text it does not understand it
//! simply knows less.
//!
//! Paths are written as the validator writes them: `.field` inside a struct, `."key"`
//! inside a map, `[i]` inside a list, and named elements (`.x`, `.from`) inside the few
//! tuples that have names ([`tuple_element_names`]). `Some(...)` adds nothing.

/// The names of the elements of a tuple-valued field, for paths and messages.
pub fn tuple_element_names(field: &str) -> Option<&'static [&'static str]> {
    match field {
        "position_mm" | "size_mm" | "semi_axes_mm" => Some(&["x", "y", "z"]),
        "sweep_kpa" => Some(&["from", "to", "step"]),
        _ => None,
    }
}

/// What is open at a position of the text.
#[derive(Debug, Clone, Default, PartialEq, Eq)]
pub struct Location {
    /// Path of the innermost open block (struct, list, map or tuple); empty at the top.
    pub block: String,
    /// The variant or struct name written before the innermost block's `(`, if any
    /// (`Box` in `section: Box(...)`).
    pub block_name: Option<String>,
    /// Path of the value being read at the position (the block plus the field, key or
    /// index in progress); equal to `block` when none is in progress.
    pub value: String,
    /// The field name of the value in progress, if it is a struct field.
    pub field: Option<String>,
    /// A string literal before the position that runs over a line end: the usual sign
    /// of a missing closing quote. Its 1-based start line.
    pub multiline_string_from: Option<usize>,
}

#[derive(Debug, Clone)]
enum Frame {
    /// `( ... )`: a struct, tuple, enum variant or `Some`.
    Paren {
        segment: Segment,
        /// The struct field this block is the value of, looking through `Some(...)`.
        field: Option<String>,
        name: Option<String>,
        key: Option<String>,
        /// A `field:` was seen: a struct, not a tuple.
        has_keys: bool,
        index: usize,
        transparent: bool,
    },
    /// `[ ... ]`.
    List { segment: Segment, index: usize },
    /// `{ ... }`.
    Map { segment: Segment, key: Option<String> },
}

/// How a frame was entered from its parent.
#[derive(Debug, Clone, Default)]
struct Segment(String);

impl Frame {
    fn segment(&self) -> &Segment {
        match self {
            Frame::Paren { segment, .. } | Frame::List { segment, .. } | Frame::Map { segment, .. } => {
                segment
            }
        }
    }
}

#[derive(Debug, Clone, PartialEq)]
enum Tok {
    Open(char),
    Close,
    Comma,
    Colon,
    Ident(String),
    Str(String),
    Other,
}

struct Lexer<'a> {
    chars: std::iter::Peekable<std::str::Chars<'a>>,
    line: usize,
    col: usize,
}

impl<'a> Lexer<'a> {
    fn new(text: &'a str) -> Self {
        Self { chars: text.chars().peekable(), line: 1, col: 1 }
    }

    fn bump(&mut self) -> Option<char> {
        let c = self.chars.next()?;
        if c == '\n' {
            self.line += 1;
            self.col = 1;
        } else {
            self.col += 1;
        }
        Some(c)
    }

    fn skip_trivia(&mut self) {
        loop {
            match self.chars.peek() {
                Some(c) if c.is_whitespace() => {
                    self.bump();
                }
                Some('/') => {
                    let mut ahead = self.chars.clone();
                    ahead.next();
                    match ahead.next() {
                        Some('/') => {
                            while let Some(c) = self.bump() {
                                if c == '\n' {
                                    break;
                                }
                            }
                        }
                        Some('*') => {
                            self.bump();
                            self.bump();
                            let mut depth = 1usize;
                            while depth > 0 {
                                match self.bump() {
                                    None => return,
                                    Some('*') if self.chars.peek() == Some(&'/') => {
                                        self.bump();
                                        depth -= 1;
                                    }
                                    Some('/') if self.chars.peek() == Some(&'*') => {
                                        self.bump();
                                        depth += 1;
                                    }
                                    Some(_) => {}
                                }
                            }
                        }
                        _ => return,
                    }
                }
                _ => return,
            }
        }
    }

    /// The next token with its start position, and whether it (a string) spans lines.
    fn next_token(&mut self) -> Option<((usize, usize), Tok, bool)> {
        self.skip_trivia();
        let start = (self.line, self.col);
        let c = *self.chars.peek()?;
        let tok = match c {
            '(' | '[' | '{' => {
                self.bump();
                Tok::Open(c)
            }
            ')' | ']' | '}' => {
                self.bump();
                Tok::Close
            }
            ',' => {
                self.bump();
                Tok::Comma
            }
            ':' => {
                self.bump();
                Tok::Colon
            }
            '"' => {
                self.bump();
                let s = self.quoted();
                let multiline = self.line != start.0;
                return Some((start, Tok::Str(s), multiline));
            }
            '\'' => {
                self.bump();
                while let Some(c) = self.bump() {
                    match c {
                        '\\' => {
                            self.bump();
                        }
                        '\'' => break,
                        _ => {}
                    }
                }
                Tok::Other
            }
            'r' if self.raw_string_ahead() => {
                self.bump();
                let mut hashes = 0;
                while self.chars.peek() == Some(&'#') {
                    self.bump();
                    hashes += 1;
                }
                self.bump(); // the opening quote
                let mut s = String::new();
                'outer: while let Some(c) = self.bump() {
                    if c == '"' {
                        let mut ahead = self.chars.clone();
                        if (0..hashes).all(|_| ahead.next() == Some('#')) {
                            for _ in 0..hashes {
                                self.bump();
                            }
                            break 'outer;
                        }
                    }
                    s.push(c);
                }
                let multiline = self.line != start.0;
                return Some((start, Tok::Str(s), multiline));
            }
            c if c == '_' || c.is_alphabetic() => {
                let mut s = String::new();
                while let Some(&c) = self.chars.peek() {
                    if c == '_' || c.is_alphanumeric() || (c == '#' && s == "r") {
                        s.push(c);
                        self.bump();
                    } else {
                        break;
                    }
                }
                Tok::Ident(s.trim_start_matches("r#").to_string())
            }
            _ => {
                // numbers and anything else: up to the next delimiter
                while let Some(&c) = self.chars.peek() {
                    if c.is_whitespace() || "()[]{},:\"'/".contains(c) {
                        break;
                    }
                    self.bump();
                }
                if (self.line, self.col) == start {
                    // a lone `/` that opens no comment
                    self.bump();
                }
                Tok::Other
            }
        };
        Some((start, tok, false))
    }

    fn raw_string_ahead(&self) -> bool {
        let mut ahead = self.chars.clone();
        ahead.next();
        loop {
            match ahead.next() {
                Some('#') => continue,
                Some('"') => return true,
                _ => return false,
            }
        }
    }

    /// Reads a quoted string after its opening quote, up to and including the closing one.
    fn quoted(&mut self) -> String {
        let mut s = String::new();
        while let Some(c) = self.bump() {
            match c {
                '\\' => {
                    if let Some(e) = self.bump() {
                        s.push(e);
                    }
                }
                '"' => break,
                c => s.push(c),
            }
        }
        s
    }
}

/// What is open at 1-based `(line, col)` of `text`: the tokens that start before the
/// position are read, the rest is not.
pub fn locate(text: &str, line: usize, col: usize) -> Location {
    let mut lexer = Lexer::new(text);
    let mut stack: Vec<Frame> = Vec::new();
    let mut pending_name: Option<String> = None;
    let mut multiline_string_from = None;
    // one token of look-ahead: an identifier is a field name if `:` follows it
    let mut tokens: Vec<((usize, usize), Tok, bool)> = Vec::new();
    while let Some(t) = lexer.next_token() {
        if t.0 >= (line, col) {
            break;
        }
        tokens.push(t);
    }
    let mut i = 0;
    while i < tokens.len() {
        let (start, tok, multiline) = tokens[i].clone();
        let next = tokens.get(i + 1).map(|t| &t.1);
        match tok {
            Tok::Open(c) => {
                let segment = stack.last().map(child_segment).unwrap_or_default();
                let field = match stack.last() {
                    Some(Frame::Paren { transparent: true, field, .. }) => field.clone(),
                    Some(Frame::Paren { key, .. }) => key.clone(),
                    _ => None,
                };
                let frame = match c {
                    '(' => {
                        let transparent = pending_name.as_deref() == Some("Some");
                        Frame::Paren {
                            segment,
                            field,
                            name: pending_name.take(),
                            key: None,
                            has_keys: false,
                            index: 0,
                            transparent,
                        }
                    }
                    '[' => Frame::List { segment, index: 0 },
                    _ => Frame::Map { segment, key: None },
                };
                pending_name = None;
                stack.push(frame);
            }
            Tok::Close => {
                stack.pop();
                pending_name = None;
            }
            Tok::Comma => {
                match stack.last_mut() {
                    Some(Frame::Paren { key, index, .. }) => {
                        *key = None;
                        *index += 1;
                    }
                    Some(Frame::List { index, .. }) => *index += 1,
                    Some(Frame::Map { key, .. }) => *key = None,
                    None => {}
                }
                pending_name = None;
            }
            Tok::Colon => {}
            Tok::Ident(name) => {
                if next == Some(&Tok::Colon) {
                    if let Some(Frame::Paren { key, has_keys, .. }) = stack.last_mut() {
                        *key = Some(name);
                        *has_keys = true;
                    }
                    i += 1;
                } else {
                    pending_name = Some(name);
                }
            }
            Tok::Str(s) => {
                if multiline {
                    multiline_string_from = Some(start.0);
                }
                if let Some(Frame::Map { key, .. }) = stack.last_mut()
                    && key.is_none()
                {
                    *key = Some(s);
                }
                pending_name = None;
            }
            Tok::Other => pending_name = None,
        }
        i += 1;
    }

    let block = path_of(&stack);
    let block_name = match stack.last() {
        Some(Frame::Paren { name, transparent: false, .. }) => name.clone(),
        _ => None,
    };
    let field = match stack.last() {
        Some(Frame::Paren { key, .. }) => key.clone(),
        _ => None,
    };
    let value = match stack.last() {
        Some(top) => {
            let seg = child_segment(top);
            if seg.0.is_empty() || matches!(top, Frame::Map { key: None, .. }) {
                block.clone()
            } else {
                join(&block, &seg.0)
            }
        }
        None => block.clone(),
    };
    Location { block, block_name, value, field, multiline_string_from }
}

/// The segment a child of `frame` gets, given where the frame currently is.
fn child_segment(frame: &Frame) -> Segment {
    match frame {
        Frame::Paren { transparent: true, .. } => Segment::default(),
        Frame::Paren { key: Some(k), .. } => Segment(format!(".{k}")),
        Frame::Paren { has_keys: true, .. } => Segment::default(),
        Frame::Paren { key: None, index, field, .. } => {
            // positional: a tuple; name the element when the tuple's field has names
            match field.as_deref().and_then(tuple_element_names).and_then(|n| n.get(*index)) {
                Some(n) => Segment(format!(".{n}")),
                None => Segment(format!("[{index}]")),
            }
        }
        Frame::List { index, .. } => Segment(format!("[{index}]")),
        Frame::Map { key: Some(k), .. } => Segment(format!(".\"{k}\"")),
        Frame::Map { key: None, .. } => Segment::default(),
    }
}

fn path_of(stack: &[Frame]) -> String {
    let mut out = String::new();
    for f in stack {
        out = join(&out, &f.segment().0);
    }
    out
}

fn join(base: &str, seg: &str) -> String {
    if base.is_empty() { seg.strip_prefix('.').unwrap_or(seg).to_string() } else { format!("{base}{seg}") }
}

#[cfg(test)]
mod tests {
    use super::*;

    const TEXT: &str = r##"// header comment with a ( bracket
Scene(
    name: "a (tricky) \"name\"",
    materials: { "m1": (model: Yeoh(c10_kpa: 1.0), density_g_cm3: 1.0) },
    /* block /* nested */ comment ( */
    objects: [
        (name: "x", position_mm: (0.0, 0.0, -70.0), max_contact_force_n: Some(8.0)),
        (name: r#"raw "q""#, shape: Box(size_mm: (1.0, 2.0, 3.0))),
    ],
    criteria: (sweep_kpa: Some((0.0, 60.0, 2.5))),
)"##;

    /// Position of the first occurrence of `needle` (1-based line, col).
    fn pos(needle: &str) -> (usize, usize) {
        let at = TEXT.find(needle).unwrap();
        let before = &TEXT[..at];
        let line = before.matches('\n').count() + 1;
        let col = before.rsplit('\n').next().unwrap().chars().count() + 1;
        (line, col)
    }

    fn at(needle: &str) -> Location {
        let (l, c) = pos(needle);
        locate(TEXT, l, c)
    }

    #[test]
    fn paths_follow_fields_keys_and_indices() {
        let l = at("1.0), density");
        assert_eq!(l.value, r#"materials."m1".model.c10_kpa"#);
        assert_eq!(l.block, r#"materials."m1".model"#);
        assert_eq!(l.block_name.as_deref(), Some("Yeoh"));
        assert_eq!(at("1.0) },").value, r#"materials."m1".density_g_cm3"#);
        assert_eq!(at("-70.0").value, "objects[0].position_mm.z");
        assert_eq!(at("8.0))").value, "objects[0].max_contact_force_n");
        assert_eq!(at("3.0)))").value, "objects[1].shape.size_mm.z");
        assert_eq!(at("2.5)))").value, "criteria.sweep_kpa.step");
    }

    #[test]
    fn comments_and_strings_do_not_open_blocks() {
        // after the nested comment with a `(` in it we are back in the top struct
        let l = at("objects: [");
        assert_eq!(l.block, "");
        assert_eq!(l.value, "");
        assert_eq!(at("\"x\", position").value, "objects[0].name");
        // after the raw string with a quote in it
        assert_eq!(at("shape: Box").block, "objects[1]");
    }

    #[test]
    fn block_at_a_closing_parenthesis_is_the_struct_being_closed() {
        // the position of `)` that closes the first object
        let l = at("),\n        (name: r#");
        assert_eq!(l.block, "objects[0]");
    }

    #[test]
    fn a_string_running_over_a_line_end_is_noticed() {
        let text = "Scene(\n  name: \"abc,\n  objects: [],\n)";
        let l = locate(text, 3, 11);
        assert_eq!(l.multiline_string_from, Some(2));
        let l = locate(TEXT, 10, 1);
        assert_eq!(l.multiline_string_from, None);
    }
}

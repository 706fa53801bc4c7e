//! The plain shape nearly every JSON sheet has, read in one pass without
//! serde_json: objects, arrays, strings without escapes, whole numbers that
//! are not negative, `true`, `false` and `null`, with the four whitespace
//! bytes of RFC 8259 between them.
//!
//! Anything else returns `None` and the text goes to serde_json: an escape or
//! a control byte in a string, a number with a sign, fraction or exponent (so
//! every fraction is rounded by serde_json's own float reader), a leading zero,
//! a repeated key, nesting past `MAX_DEPTH` or more than `MAX_KEYS` keys in
//! an object (both in `tree`), a top level that is not an
//! object, and every error. So a text read here is one serde_json reads to
//! the same tree, and every message about malformed JSON comes from
//! serde_json. `tree::json_readers_agree`, its tests and a fuzz target hold
//! the two readers to the same trees.

use std::borrow::Cow;

use super::tree::{Node, MAX_DEPTH, MAX_KEYS};
use crate::scan::Escapes;

/// The longest run of digits read here: any 18-digit number fits an `i64`,
/// which is what serde_json makes of it too (`visit_u64`, then `Node::Int`).
const MAX_DIGITS: usize = 18;

/// The tree of a plain JSON sheet, or `None` for serde_json to read it.
pub(super) fn read(text: &str) -> Option<Node<'_>> {
    let mut reader = Reader { text, at: 0 };
    reader.skip_space();
    if reader.peek() != Some(b'{') {
        return None;
    }
    let tree = reader.value(0)?;
    reader.skip_space();
    (reader.at == text.len()).then_some(tree)
}

/// The text and how far it has been read.
struct Reader<'t> {
    text: &'t str,
    at: usize,
}

impl<'t> Reader<'t> {
    fn rest(&self) -> &'t [u8] {
        &self.text.as_bytes()[self.at..]
    }

    fn peek(&self) -> Option<u8> {
        self.rest().first().copied()
    }

    /// Skips the whitespace of RFC 8259 section 2: space, tab, line feed and
    /// carriage return.
    fn skip_space(&mut self) {
        while let Some(b' ' | b'\t' | b'\n' | b'\r') = self.peek() {
            self.at += 1;
        }
    }

    /// Steps over `b` after any whitespace, if it is next.
    fn eat(&mut self, b: u8) -> bool {
        self.skip_space();
        let next = self.peek() == Some(b);
        if next {
            self.at += 1;
        }
        next
    }

    fn value(&mut self, depth: usize) -> Option<Node<'t>> {
        self.skip_space();
        match self.peek()? {
            b'{' => self.object(depth + 1),
            b'[' => self.array(depth + 1),
            b'"' => self.string().map(|s| Node::Str(Cow::Borrowed(s))),
            b'0'..=b'9' => self.whole_number(),
            b't' => self.word("true", Node::Bool(true)),
            b'f' => self.word("false", Node::Bool(false)),
            b'n' => self.word("null", Node::Other("null")),
            _ => None,
        }
    }

    fn object(&mut self, depth: usize) -> Option<Node<'t>> {
        if depth > MAX_DEPTH {
            return None;
        }
        self.at += 1;
        let mut entries: Vec<(Cow<'t, str>, Node<'t>)> = Vec::new();
        if self.eat(b'}') {
            return Some(Node::Table(entries));
        }
        // A sheet's objects hold a handful of keys: room for them at once.
        entries.reserve(8);
        loop {
            self.skip_space();
            if self.peek() != Some(b'"') {
                return None;
            }
            let key = self.string()?;
            if entries.len() >= MAX_KEYS || entries.iter().any(|(k, _)| *k == key) {
                return None;
            }
            if !self.eat(b':') {
                return None;
            }
            let value = self.value(depth)?;
            entries.push((Cow::Borrowed(key), value));
            if self.eat(b'}') {
                return Some(Node::Table(entries));
            }
            if !self.eat(b',') {
                return None;
            }
        }
    }

    fn array(&mut self, depth: usize) -> Option<Node<'t>> {
        if depth > MAX_DEPTH {
            return None;
        }
        self.at += 1;
        let mut items = Vec::new();
        if self.eat(b']') {
            return Some(Node::Array(items));
        }
        loop {
            items.push(self.value(depth)?);
            if self.eat(b']') {
                return Some(Node::Array(items));
            }
            if !self.eat(b',') {
                return None;
            }
        }
    }

    /// A string with no escape and no control byte, borrowed from the text.
    /// The text is a `str`, so the bytes between the quotes are UTF-8, and
    /// the quotes are ASCII, so the cut falls on character boundaries.
    fn string(&mut self) -> Option<&'t str> {
        let start = self.at + 1;
        // The bytes JSON escapes are the ones a string cannot hold as they
        // are: the run stops at the closing quote, a backslash or a control byte.
        let end = start + Escapes::Json.clean_run(&self.rest()[1..]);
        if self.text.as_bytes().get(end) != Some(&b'"') {
            return None;
        }
        self.at = end + 1;
        self.text.get(start..end)
    }

    /// Digits with no sign, fraction or exponent, and no leading zero but `0`
    /// itself.
    fn whole_number(&mut self) -> Option<Node<'t>> {
        let rest = self.rest();
        let digits = rest.iter().take_while(|b| b.is_ascii_digit()).count();
        let leading_zero = digits > 1 && rest[0] == b'0';
        if digits > MAX_DIGITS || leading_zero {
            return None;
        }
        if let Some(b'.' | b'e' | b'E') = rest.get(digits) {
            return None;
        }
        let n = rest[..digits]
            .iter()
            .fold(0i64, |n, &d| n * 10 + i64::from(d - b'0'));
        self.at += digits;
        Some(Node::Int(n))
    }

    fn word(&mut self, word: &str, node: Node<'t>) -> Option<Node<'t>> {
        if !self.rest().starts_with(word.as_bytes()) {
            return None;
        }
        self.at += word.len();
        Some(node)
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    fn agrees(text: &str) -> bool {
        super::super::tree::json_readers_agree(text) == Some(true)
    }

    #[test]
    fn a_plain_sheet_is_read_here_to_the_tree_serde_json_reads() {
        // serde_json, a general-purpose reference library, is the reference.
        for text in [
            r#"{"title": "Lamp", "rotors": {"count": 2, "spins": ["cw", "ccw"]}}"#,
            "{ }",
            " \t\r\n{\"a\":[],\"b\":{},\"c\":[1,[2,[3]]],\"d\":null}\n",
            r#"{"n": 0, "m": 123456789012345678, "t": true, "f": false}"#,
            r#"{"é": "→ 😀", "": ""}"#,
        ] {
            assert!(agrees(text), "{text}");
        }
    }

    #[test]
    fn anything_else_is_passed_on() {
        // Each of these serde_json reads its own way or refuses (RFC 8259).
        for text in [
            r#"{"a": -1}"#,
            r#"{"a": -0}"#,
            r#"{"a": 1.5}"#,
            r#"{"a": 1e3}"#,
            r#"{"a": 01}"#,
            r#"{"a": 1234567890123456789}"#,
            r#"{"a": "tab\there"}"#,
            "{\"a\": \"line\nbreak\"}",
            r#"{"a": 1, "a": 2}"#,
            r#"{"a": 1,}"#,
            r#"[1]"#,
            r#"{"a": 1} x"#,
            r#"{"a": tru}"#,
            r#"{"a" 1}"#,
            r#"{"a": [1 2]}"#,
            "\u{feff}{}",
            r#"{"a":{"b":{"c":{"d":{"e":{"f":{"g":{"h":{}}}}}}}}}"#,
            "",
            "{",
        ] {
            assert_eq!(read(text), None, "{text}");
        }
    }

    #[test]
    fn nesting_to_the_bound_is_read_and_past_it_passed_on() {
        let nested = |depth: usize| {
            format!("{}{}", "{\"a\":".repeat(depth), "}".repeat(depth))
                .replacen("{\"a\":}", "{}", 1)
        };
        assert!(agrees(&nested(MAX_DEPTH)));
        assert_eq!(read(&nested(MAX_DEPTH + 1)), None);
    }

    #[test]
    fn every_demo_sheet_as_json_is_read_here() {
        for d in crate::claim::demo::DEMOS {
            let value: serde_json::Value = toml::from_str(d.text).unwrap();
            assert!(
                agrees(&serde_json::to_string(&value).unwrap()),
                "{}",
                d.name
            );
        }
    }
}

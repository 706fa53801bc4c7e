//! The plain shape nearly every sheet has, read in one pass without the general
//! TOML parser: `[table]` and `[[array.of.tables]]` headers of bare keys,
//! `key = value` lines with a bare key, and values that are strings without
//! escapes, decimal numbers, booleans, arrays and inline tables.
//!
//! Anything else returns `None` and the text goes to the general parser: quoted
//! or dotted keys, escapes and multi-line strings, dates, hexadecimal or special
//! numbers, underscores in numbers, spaces inside a header, a repeated key or
//! table, and every error. So a text read here is one the general parser reads to
//! the same tree, and every message about a malformed sheet comes from that
//! parser. Each construct accepted is TOML 1.0 as written (toml.io/en/v1.0.0);
//! `tree::toml_readers_agree`, its tests and a fuzz target hold the two readers
//! to the same trees.

use std::borrow::Cow;

use super::tree::{Node, MAX_DEPTH, MAX_KEYS};
use crate::scan::Escapes;

/// The tree of a plain sheet, or `None` for the general parser to read it.
pub(super) fn read(text: &str) -> Option<Node<'_>> {
    let mut reader = Reader {
        text,
        bytes: text.as_bytes(),
        at: 0,
    };
    let mut root = Table::default();
    // Where key/value lines go: entry indices from the root, the last element of
    // an array of tables at each step.
    let mut current = Steps::default();
    loop {
        reader.skip_blank();
        match reader.peek() {
            None => break,
            Some(b'[') => current = reader.header(&mut root)?,
            Some(b'#' | b'\n' | b'\r') => {}
            Some(_) => reader.key_value(root.at(current.as_slice())?)?,
        }
        reader.line_end()?;
    }
    Some(root.into_node())
}

/// Where a header leads: entry indices from the root, at most
/// [`MAX_DEPTH`] (no allocation for a header).
#[derive(Default, Clone, Copy)]
struct Steps {
    indices: [usize; MAX_DEPTH + 1],
    len: usize,
}

impl Steps {
    fn push(&mut self, i: usize) -> Option<()> {
        *self.indices.get_mut(self.len)? = i;
        self.len += 1;
        Some(())
    }

    fn as_slice(&self) -> &[usize] {
        &self.indices[..self.len]
    }
}

/// A table being built: its entries in document order.
#[derive(Default)]
struct Table<'t> {
    entries: Vec<(&'t str, Slot<'t>)>,
    /// Named by a `[header]` of its own, not only made on the way to another.
    headed: bool,
}

/// What a key of a table being built holds.
enum Slot<'t> {
    /// Given on a key/value line: sealed, no header may add to it.
    Value(Node<'t>),
    /// Made by a header, named or on the way to a deeper one.
    Table(Table<'t>),
    /// Made by `[[headers]]`; later lines go to the last.
    Tables(Vec<Table<'t>>),
}

impl<'t> Slot<'t> {
    /// The table later lines and headers go into: a header's table, or the
    /// last of an array of tables; none in a value.
    fn table_mut(&mut self) -> Option<&mut Table<'t>> {
        match self {
            Slot::Table(t) => Some(t),
            Slot::Tables(ts) => ts.last_mut(),
            Slot::Value(_) => None,
        }
    }
}

impl<'t> Table<'t> {
    /// The table at `path`, entry indices from this one.
    fn at(&mut self, path: &[usize]) -> Option<&mut Table<'t>> {
        let mut table = self;
        for &i in path {
            table = table.entries.get_mut(i)?.1.table_mut()?;
        }
        Some(table)
    }

    fn find(&self, key: &str) -> Option<usize> {
        self.entries.iter().position(|(k, _)| *k == key)
    }

    /// Adds an entry, and says where it went; `None` past `MAX_KEYS`.
    fn push(&mut self, key: &'t str, slot: Slot<'t>) -> Option<usize> {
        if self.entries.len() >= MAX_KEYS {
            return None;
        }
        if self.entries.is_empty() {
            // A sheet's tables hold a handful of keys: room for them at once.
            self.entries.reserve(8);
        }
        self.entries.push((key, slot));
        Some(self.entries.len() - 1)
    }

    /// The tree node, entries sorted by key as the general parser gives them.
    fn into_node(self) -> Node<'t> {
        let entries = self
            .entries
            .into_iter()
            .map(|(key, slot)| {
                let node = match slot {
                    Slot::Value(node) => node,
                    Slot::Table(table) => table.into_node(),
                    Slot::Tables(tables) => {
                        Node::Array(tables.into_iter().map(Table::into_node).collect())
                    }
                };
                (Cow::Borrowed(key), node)
            })
            .collect();
        sorted(entries)
    }
}

/// The bytes of a bare key: ASCII letters, digits, `_` and `-`.
const KEY_BYTES: [bool; 256] = {
    let mut table = [false; 256];
    let mut b = 0;
    while b < 256 {
        let c = b as u8;
        table[b] = c.is_ascii_alphanumeric() || c == b'_' || c == b'-';
        b += 1;
    }
    table
};

/// The length of the run at the start of `bytes` up to the first control
/// byte other than tab, or (`in_comment` false, for a basic string) the
/// first `"` or `\`; `None` if the run holds a DEL, which TOML allows in
/// neither. The JSON escape class marks all of those bytes but tab, sixteen
/// at a time ([`Escapes::clean_run`]).
fn text_run(bytes: &[u8], in_comment: bool) -> Option<usize> {
    let mut at = 0;
    loop {
        at += Escapes::Json.clean_run(&bytes[at..]);
        match bytes.get(at) {
            Some(b'\t') => at += 1,
            Some(b'"' | b'\\') if in_comment => at += 1,
            _ => break,
        }
    }
    (!bytes[..at].contains(&0x7f)).then_some(at)
}

/// A table node with its entries in key order (keys are distinct).
fn sorted<'t>(mut entries: Vec<(Cow<'t, str>, Node<'t>)>) -> Node<'t> {
    entries.sort_unstable_by(|a, b| a.0.cmp(&b.0));
    Node::Table(entries)
}

/// The text and how far it has been read.
struct Reader<'t> {
    text: &'t str,
    bytes: &'t [u8],
    at: usize,
}

impl<'t> Reader<'t> {
    fn peek(&self) -> Option<u8> {
        self.bytes.get(self.at).copied()
    }

    /// Steps over `byte` if it is next.
    fn eat(&mut self, byte: u8) -> bool {
        let next = self.peek() == Some(byte);
        self.at += usize::from(next);
        next
    }

    fn expect(&mut self, byte: u8) -> Option<()> {
        self.eat(byte).then_some(())
    }

    /// Spaces and tabs, TOML's whitespace.
    fn skip_blank(&mut self) {
        while matches!(self.peek(), Some(b' ' | b'\t')) {
            self.at += 1;
        }
    }

    /// The end of a line: blanks, perhaps a comment, then a newline or the end.
    fn line_end(&mut self) -> Option<()> {
        self.skip_blank();
        if self.peek() == Some(b'#') {
            self.comment()?;
        }
        match self.peek() {
            None => Some(()),
            Some(b'\n') => {
                self.at += 1;
                Some(())
            }
            Some(b'\r') if self.bytes.get(self.at + 1) == Some(&b'\n') => {
                self.at += 2;
                Some(())
            }
            Some(_) => None,
        }
    }

    /// A comment up to its line's end; control characters other than tab are
    /// not allowed in one.
    fn comment(&mut self) -> Option<()> {
        let rest = &self.bytes[self.at + 1..];
        let end = text_run(rest, true)?;
        if !matches!(rest.get(end), None | Some(b'\n' | b'\r')) {
            return None;
        }
        self.at += 1 + end;
        Some(())
    }

    /// Blanks, newlines and comments, as an array may hold between its values.
    fn skip_blank_lines(&mut self) -> Option<()> {
        loop {
            self.skip_blank();
            match self.peek() {
                Some(b'#') => self.comment()?,
                Some(b'\n') => self.at += 1,
                Some(b'\r') => {
                    self.at += 1;
                    self.expect(b'\n')?;
                }
                _ => return Some(()),
            }
        }
    }

    /// A bare key: ASCII letters, digits, `_` and `-`, at least one.
    fn bare_key(&mut self) -> Option<&'t str> {
        let start = self.at;
        let len = self.bytes[start..]
            .iter()
            .position(|&b| !KEY_BYTES[usize::from(b)])
            .unwrap_or(self.bytes.len() - start);
        self.at += len;
        (len > 0).then(|| &self.text[start..self.at])
    }

    /// A `[table]` or `[[array.of.tables]]` header of bare keys; where the lines
    /// after it go.
    fn header(&mut self, root: &mut Table<'t>) -> Option<Steps> {
        self.at += 1;
        let many = self.eat(b'[');
        let mut path = Steps::default();
        let mut table = root;
        loop {
            let key = self.bare_key()?;
            let found = table.find(key);
            if self.eat(b'.') {
                if path.len >= MAX_DEPTH {
                    return None;
                }
                let i = match found {
                    Some(i) => i,
                    None => table.push(key, Slot::Table(Table::default()))?,
                };
                path.push(i)?;
                table = table.entries[i].1.table_mut()?;
                continue;
            }
            self.expect(b']')?;
            if many {
                self.expect(b']')?;
            }
            let i = match found {
                None if many => table.push(key, Slot::Tables(vec![Table::default()]))?,
                None => table.push(
                    key,
                    Slot::Table(Table {
                        headed: true,
                        ..Table::default()
                    }),
                )?,
                Some(i) => {
                    match (&mut table.entries[i].1, many) {
                        (Slot::Tables(ts), true) => ts.push(Table::default()),
                        // A table made on the way to a deeper one may be named once.
                        (Slot::Table(t), false) if !t.headed => t.headed = true,
                        _ => return None,
                    }
                    i
                }
            };
            path.push(i)?;
            return Some(path);
        }
    }

    /// `key = value` into `table`.
    fn key_value(&mut self, table: &mut Table<'t>) -> Option<()> {
        let key = self.bare_key()?;
        self.skip_blank();
        self.expect(b'=')?;
        self.skip_blank();
        let value = self.value(0)?;
        if table.find(key).is_some() {
            return None;
        }
        table.push(key, Slot::Value(value)).map(drop)
    }

    fn value(&mut self, depth: usize) -> Option<Node<'t>> {
        match self.peek()? {
            quote @ (b'"' | b'\'') => self.string(quote).map(|s| Node::Str(Cow::Borrowed(s))),
            b'[' if depth < MAX_DEPTH => self.array(depth + 1),
            b'{' if depth < MAX_DEPTH => self.inline_table(depth + 1),
            _ => self.word(),
        }
    }

    /// A one-line string without escapes, basic (`"`) or literal (`'`); its text
    /// is the sheet's own.
    fn string(&mut self, quote: u8) -> Option<&'t str> {
        let start = self.at + 1;
        let rest = &self.bytes[start..];
        if rest.starts_with(&[quote, quote]) {
            return None; // a multi-line string
        }
        let len = if quote == b'"' {
            text_run(rest, false)?
        } else {
            rest.iter()
                .position(|&b| b == quote || (b < 0x20 && b != b'\t') || b == 0x7f)?
        };
        if rest.get(len) != Some(&quote) {
            return None;
        }
        self.at = start + len + 1;
        Some(&self.text[start..start + len])
    }

    /// `true`, `false` or a decimal number: an integer `[+-](0|[1-9][0-9]*)`, or a
    /// float with a fraction `.[0-9]+` and/or an exponent `[eE][+-]?[0-9]+`.
    fn word(&mut self) -> Option<Node<'t>> {
        let start = self.at;
        while matches!(
            self.peek(),
            Some(b'A'..=b'Z' | b'a'..=b'z' | b'0'..=b'9' | b'_' | b'-' | b'+' | b'.' | b':')
        ) {
            self.at += 1;
        }
        let word = &self.text[start..self.at];
        match word {
            "true" => return Some(Node::Bool(true)),
            "false" => return Some(Node::Bool(false)),
            _ => {}
        }
        let digits = word.strip_prefix(['+', '-']).unwrap_or(word);
        let (whole, rest) = digits.split_at(digits.bytes().take_while(u8::is_ascii_digit).count());
        if whole.is_empty() || (whole.len() > 1 && whole.starts_with('0')) {
            return None;
        }
        let (fraction, exponent) = match rest.find(['e', 'E']) {
            Some(e) => (&rest[..e], Some(&rest[e + 1..])),
            None => (rest, None),
        };
        let fraction_ok = fraction.is_empty()
            || fraction
                .strip_prefix('.')
                .is_some_and(|f| !f.is_empty() && f.bytes().all(|b| b.is_ascii_digit()));
        let exponent_ok = exponent.is_none_or(|e| {
            let e = e.strip_prefix(['+', '-']).unwrap_or(e);
            !e.is_empty() && e.bytes().all(|b| b.is_ascii_digit())
        });
        if !fraction_ok || !exponent_ok {
            return None;
        }
        if fraction.is_empty() && exponent.is_none() {
            // Out of i64's range is the general parser's error to give.
            word.parse().ok().map(Node::Int)
        } else {
            // So is a float too large to be finite.
            word.parse::<f64>()
                .ok()
                .filter(|x| x.is_finite())
                .map(Node::Float)
        }
    }

    /// `[v, v, ...]`, over lines if need be, with comments and a trailing comma.
    fn array(&mut self, depth: usize) -> Option<Node<'t>> {
        self.at += 1;
        let mut items = Vec::new();
        loop {
            self.skip_blank_lines()?;
            if self.eat(b']') {
                return Some(Node::Array(items));
            }
            items.push(self.value(depth)?);
            self.skip_blank_lines()?;
            if !self.eat(b',') {
                self.expect(b']')?;
                return Some(Node::Array(items));
            }
        }
    }

    /// `{ k = v, ... }` on one line, without a trailing comma.
    fn inline_table(&mut self, depth: usize) -> Option<Node<'t>> {
        self.at += 1;
        let mut entries: Vec<(Cow<'t, str>, Node<'t>)> = Vec::new();
        self.skip_blank();
        if self.eat(b'}') {
            return Some(Node::Table(entries));
        }
        loop {
            let key = self.bare_key()?;
            self.skip_blank();
            self.expect(b'=')?;
            self.skip_blank();
            let value = self.value(depth)?;
            if entries.len() >= MAX_KEYS || entries.iter().any(|(k, _)| k == key) {
                return None;
            }
            entries.push((Cow::Borrowed(key), value));
            self.skip_blank();
            if !self.eat(b',') {
                self.expect(b'}')?;
                return Some(sorted(entries));
            }
            self.skip_blank();
        }
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    fn general(text: &str) -> Node<'_> {
        super::super::tree::from_toml_general(text).expect("the general parser reads it")
    }

    #[test]
    fn every_demo_sheet_is_read_here_as_the_general_parser_reads_it() {
        for demo in crate::claim::demo::DEMOS {
            let quick = read(demo.text).unwrap_or_else(|| panic!("{} is plain", demo.name));
            assert_eq!(quick, general(demo.text), "{}", demo.name);
        }
    }

    #[test]
    fn plain_constructs_give_the_general_parsers_tree() {
        // Each construct from TOML 1.0 (toml.io/en/v1.0.0) this reader takes.
        let texts = [
            "a = 1\nb = -2\nc = +3\nd = 0\ne = -0\n",
            "x = 1.5\ny = -0.25\nz = 1e3\nw = 6.02E+23\nv = 1.5e-3\nu = 3e05\n",
            "s = \"two words\"\nt = 'C:\\path'\nu = \"\"\nv = ''\nw = \"tab\there\"\n",
            "t = true\nf = false\n",
            "# comment\n\n  a = 1 # after\r\nb = 2\r\n",
            "list = [1, 2, 3]\nempty = []\nnested = [[1, 2], ['a']]\nmixed = [1, 'a', true]\n",
            "multi = [\n  1, # one\n  2,\n]\n",
            "point = { x = 1, y = 2 }\nnone = {}\ndeep = { a = { b = [1, { c = 'd' }] } }\n",
            "[b]\nz = 1\na = 2\n[a]\nk = 'v'\n",
            "[a.b.c]\nx = 1\n[a]\ny = 2\n[a.b]\nz = 3\n",
            "[rotors]\ncount = 2\n[[rotors.at]]\nx = '1 mm'\n[[rotors.at]]\nx = '2 mm'\n",
            "[[a]]\n[a.b]\nc = 1\n[[a]]\n[a.b]\nc = 2\n",
            "title = \"sheet \u{b0} \u{d7} \u{1f681}\"\n# \u{e9}t\u{e9}\n",
            "",
            "\n\n# only a comment",
            "key-with_dash = 1\n123 = 'digits as a key'\n",
        ];
        for text in texts {
            let quick = read(text).unwrap_or_else(|| panic!("plain: {text:?}"));
            assert_eq!(quick, general(text), "{text:?}");
        }
    }

    #[test]
    fn anything_else_goes_to_the_general_parser() {
        // Valid TOML 1.0 outside the plain shape, and malformed text.
        let texts = [
            "\"quoted\" = 1\n",
            "a.b = 1\n",
            "s = \"esc\\n\"\n",
            "s = \"\"\"multi\"\"\"\n",
            "s = '''multi'''\n",
            "d = 1979-05-27\n",
            "h = 0xff\n",
            "n = 1_000\n",
            "i = inf\n",
            "x = nan\n",
            "[ spaced ]\n",
            "a = 1\na = 2\n",
            "[a]\n[a]\n",
            "[a]\n[[a]]\n",
            "a = {}\n[a.b]\n",
            "a = [1]\n[[a]]\n",
            "a = 01\n",
            "a = 1.\n",
            "a = .5\n",
            "a = 1e\n",
            "a = 9223372036854775808\n",
            "a = 1e400\n",
            "a = 1 b = 2\n",
            "a = \"open\n",
            "a = \"ctl\u{1}\"\n",
            "# ctl \u{7f}\n",
            "a = 1\rb = 2\n",
            "a = { b = 1, }\n",
            "a = { b = 1, b = 2 }\n",
            "a = [1,,2]\n",
            "[a.b]\nb = 1\n[a]\nb = 2\n",
            "a =\n",
            "= 1\n",
        ];
        for text in texts {
            assert_eq!(read(text), None, "{text:?}");
        }
    }

    #[test]
    fn deep_or_wide_texts_go_to_the_general_parser() {
        let deep = format!("a = {}1{}\n", "[".repeat(20), "]".repeat(20));
        assert_eq!(read(&deep), None);
        let header = format!("[{}]\n", vec!["k"; 20].join("."));
        assert_eq!(read(&header), None);
        let wide: String = (0..100).map(|i| format!("k{i} = {i}\n")).collect();
        assert_eq!(read(&wide), None);
    }
}

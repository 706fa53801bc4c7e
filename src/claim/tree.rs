//! One document tree for both sheet formats, so TOML and JSON sheets are read
//! by the same code and give the same field paths and messages.

use std::borrow::Cow;
use std::collections::HashSet;
use std::fmt;
use std::ops::Range;

use serde::de::{self, Deserialize, Deserializer, MapAccess, SeqAccess, Visitor};
use toml::de::{DeTable, DeValue};
use toml::Spanned;

use super::{Error, Format};

/// A value of a parsed sheet, before any field is interpreted; its strings
/// borrow from the sheet's text where they need no unescaping.
#[derive(Debug, Clone, PartialEq)]
pub enum Node<'t> {
    Str(Cow<'t, str>),
    Int(i64),
    Float(f64),
    Bool(bool),
    Array(Vec<Node<'t>>),
    /// Entries as the parser gives them: sorted by key from TOML, in document order from JSON.
    Table(Vec<(Cow<'t, str>, Node<'t>)>),
    /// A value of a kind a sheet never holds (a TOML date, a JSON null).
    Other(&'static str),
}

impl Node<'_> {
    /// The word used in messages: "expected a string, got a table".
    pub fn kind(&self) -> &'static str {
        match self {
            Node::Str(_) => "a string",
            Node::Int(_) => "a whole number",
            Node::Float(_) => "a number",
            Node::Bool(_) => "true or false",
            Node::Array(_) => "a list",
            Node::Table(_) => "a table",
            Node::Other(kind) => kind,
        }
    }
}

/// Parses TOML text into a tree with toml's `DeTable`, which keeps each
/// value's span, so a syntax error or a number out of range carries line and column.
pub fn from_toml(text: &str) -> Result<Node<'_>, Error> {
    let table = DeTable::parse(text).map_err(|e| {
        // toml says "duplicate key" with the key's span: name the key, as
        // the JSON reader does.
        let key = e
            .span()
            .and_then(|span| text.get(span))
            .filter(|_| e.message().trim() == "duplicate key");
        match key {
            Some(key) => toml_error(text, &format!("duplicate key `{}`", key.trim()), e.span()),
            None => toml_error(text, e.message(), e.span()),
        }
    })?;
    toml_table(text, table.into_inner())
}

/// A TOML syntax error at a byte span of the text.
fn toml_error(text: &str, message: &str, span: Option<Range<usize>>) -> Error {
    let (line, column) = span
        .map(|span| line_column(text, span.start))
        .unwrap_or((1, 1));
    Error::Syntax {
        format: Format::Toml,
        line,
        column,
        message: message.trim().to_string(),
    }
}

/// Parses JSON text into a tree with serde_json; a syntax error carries line and column.
/// A UTF-8 byte-order mark before the text is skipped, as TOML's reader does.
pub fn from_json(text: &str) -> Result<Node<'_>, Error> {
    let text = text.strip_prefix('\u{feff}').unwrap_or(text);
    match serde_json::from_str::<Node>(text) {
        Ok(node @ Node::Table(_)) => Ok(node),
        Ok(other) => Err(Error::Syntax {
            format: Format::Json,
            line: 1,
            column: 1,
            message: format!("a claim sheet is a JSON object, got {}", other.kind()),
        }),
        Err(e) => {
            let message = e.to_string();
            // serde_json appends " at line L column C"; the fields say it already.
            let message = match message.rfind(" at line ") {
                Some(i) => message[..i].to_string(),
                None => message,
            };
            Err(Error::Syntax {
                format: Format::Json,
                line: e.line().max(1),
                column: e.column().max(1),
                message,
            })
        }
    }
}

/// Reads JSON straight into a tree, keys in document order.
impl<'de> Deserialize<'de> for Node<'de> {
    fn deserialize<D: Deserializer<'de>>(deserializer: D) -> Result<Node<'de>, D::Error> {
        deserializer.deserialize_any(NodeVisitor)
    }
}

/// Builds a [`Node`] from whatever value the JSON text holds.
struct NodeVisitor;

impl<'de> Visitor<'de> for NodeVisitor {
    type Value = Node<'de>;

    fn expecting(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        f.write_str("a JSON value")
    }

    fn visit_bool<E: de::Error>(self, b: bool) -> Result<Node<'de>, E> {
        Ok(Node::Bool(b))
    }

    fn visit_i64<E: de::Error>(self, i: i64) -> Result<Node<'de>, E> {
        Ok(Node::Int(i))
    }

    fn visit_u64<E: de::Error>(self, u: u64) -> Result<Node<'de>, E> {
        Ok(i64::try_from(u).map_or(Node::Float(u as f64), Node::Int))
    }

    fn visit_f64<E: de::Error>(self, f: f64) -> Result<Node<'de>, E> {
        Ok(Node::Float(f))
    }

    fn visit_borrowed_str<E: de::Error>(self, s: &'de str) -> Result<Node<'de>, E> {
        Ok(Node::Str(Cow::Borrowed(s)))
    }

    fn visit_str<E: de::Error>(self, s: &str) -> Result<Node<'de>, E> {
        Ok(Node::Str(Cow::Owned(s.to_string())))
    }

    fn visit_string<E: de::Error>(self, s: String) -> Result<Node<'de>, E> {
        Ok(Node::Str(Cow::Owned(s)))
    }

    fn visit_unit<E: de::Error>(self) -> Result<Node<'de>, E> {
        Ok(Node::Other("null"))
    }

    fn visit_seq<A: SeqAccess<'de>>(self, mut seq: A) -> Result<Node<'de>, A::Error> {
        let mut items = Vec::new();
        while let Some(item) = seq.next_element()? {
            items.push(item);
        }
        Ok(Node::Array(items))
    }

    fn visit_map<A: MapAccess<'de>>(self, mut map: A) -> Result<Node<'de>, A::Error> {
        let mut entries: Vec<(Cow<'de, str>, Node<'de>)> = Vec::new();
        // RFC 8259 leaves a repeated name to the reader; TOML refuses one, and
        // so does this reader, so that a key means one thing in both formats.
        let mut seen: HashSet<Cow<'de, str>> = HashSet::new();
        while let Some(Key(key)) = map.next_key()? {
            if !seen.insert(key.clone()) {
                return Err(de::Error::custom(format_args!("duplicate key `{key}`")));
            }
            entries.push((key, map.next_value()?));
        }
        Ok(Node::Table(entries))
    }
}

/// A JSON object key, borrowed from the text unless it has escapes.
struct Key<'de>(Cow<'de, str>);

impl<'de> Deserialize<'de> for Key<'de> {
    fn deserialize<D: Deserializer<'de>>(deserializer: D) -> Result<Key<'de>, D::Error> {
        match Node::deserialize(deserializer)? {
            Node::Str(s) => Ok(Key(s)),
            other => Err(de::Error::custom(format_args!(
                "expected a key, got {}",
                other.kind()
            ))),
        }
    }
}

/// A TOML table as a tree node; `text` places an error in a number.
fn toml_table<'t>(text: &str, table: DeTable<'t>) -> Result<Node<'t>, Error> {
    let mut entries = Vec::with_capacity(table.len());
    for (key, value) in table {
        entries.push((key.into_inner(), toml_value(text, value)?));
    }
    Ok(Node::Table(entries))
}

/// One TOML value as a tree node.
fn toml_value<'t>(text: &str, value: Spanned<DeValue<'t>>) -> Result<Node<'t>, Error> {
    let span = value.span();
    Ok(match value.into_inner() {
        DeValue::String(s) => Node::Str(s),
        DeValue::Integer(i) => match i64::from_str_radix(i.as_str(), i.radix()) {
            Ok(n) => Node::Int(n),
            // Named as written, not rounded: TOML integers are 64-bit.
            Err(e) => {
                let size = match e.kind() {
                    std::num::IntErrorKind::NegOverflow => "too small",
                    std::num::IntErrorKind::PosOverflow => "too large",
                    _ => "not a whole number",
                };
                let message = format!(
                    "the whole number {} is {size} (TOML whole numbers run from {} to {})",
                    i.as_str(),
                    i64::MIN,
                    i64::MAX
                );
                return Err(toml_error(text, &message, Some(span)));
            }
        },
        // A literal too large for f64 is refused; only `inf` itself is infinite.
        DeValue::Float(f) => match f.as_str().parse::<f64>() {
            Ok(x) if !x.is_infinite() || f.as_str().contains("inf") => Node::Float(x),
            _ => {
                return Err(toml_error(
                    text,
                    "invalid floating-point number",
                    Some(span),
                ))
            }
        },
        DeValue::Boolean(b) => Node::Bool(b),
        DeValue::Array(items) => Node::Array(
            items
                .into_iter()
                .map(|v| toml_value(text, v))
                .collect::<Result<_, Error>>()?,
        ),
        DeValue::Table(t) => toml_table(text, t)?,
        DeValue::Datetime(_) => Node::Other("a date"),
    })
}

/// One-based line and column (in characters) of a byte offset.
fn line_column(text: &str, offset: usize) -> (usize, usize) {
    let offset = offset.min(text.len());
    let before = text.get(..offset).unwrap_or(text);
    let line = before.matches('\n').count() + 1;
    let column = before
        .rsplit('\n')
        .next()
        .map(|l| l.chars().count())
        .unwrap_or(0)
        + 1;
    (line, column)
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn a_toml_syntax_error_gives_its_line_and_column() {
        let err = from_toml("title = \"x\"\n[craft\nmass = 1").unwrap_err();
        match err {
            Error::Syntax { line, column, .. } => {
                assert_eq!(line, 2);
                assert!(column >= 1);
            }
            other => panic!("expected a syntax error, got {other:?}"),
        }
    }

    #[test]
    fn a_json_syntax_error_gives_its_line_and_column() {
        let err = from_json("{\n  \"title\": \"x\",\n  oops\n}").unwrap_err();
        match err {
            Error::Syntax { line, column, .. } => assert_eq!((line, column), (3, 3)),
            other => panic!("expected a syntax error, got {other:?}"),
        }
    }

    #[test]
    fn a_json_sheet_must_be_an_object() {
        assert!(matches!(
            from_json("[1, 2]"),
            Err(Error::Syntax { message, .. }) if message == "a claim sheet is a JSON object, got a list"
        ));
    }

    #[test]
    fn a_repeated_json_key_is_a_syntax_error_at_the_key() {
        let err = from_json("{\n  \"title\": \"a\",\n  \"title\": \"b\"\n}").unwrap_err();
        match err {
            Error::Syntax {
                line,
                column,
                message,
                ..
            } => {
                assert_eq!((line, column), (3, 9));
                assert_eq!(message, "duplicate key `title`");
            }
            other => panic!("expected a syntax error, got {other:?}"),
        }
    }

    #[test]
    fn a_repeated_key_in_a_large_json_object_is_refused_too() {
        let keys: Vec<String> = (0..40).map(|i| format!("\"k{i}\": {i}")).collect();
        let text = format!("{{{}, \"k7\": 0}}", keys.join(", "));
        assert!(matches!(
            from_json(&text),
            Err(Error::Syntax { message, .. }) if message == "duplicate key `k7`"
        ));
        assert!(from_json(&format!("{{{}}}", keys.join(", "))).is_ok());
    }

    #[test]
    fn json_numbers_beyond_i64_are_floats() {
        let node = from_json(r#"{"a": 9223372036854775807, "b": 9223372036854775808, "c": 1.0}"#);
        assert_eq!(
            node.unwrap(),
            Node::Table(vec![
                ("a".into(), Node::Int(i64::MAX)),
                ("b".into(), Node::Float(9_223_372_036_854_775_808.0)),
                ("c".into(), Node::Float(1.0)),
            ])
        );
    }

    #[test]
    fn escaped_json_keys_and_strings_are_unescaped() {
        let node = from_json(r#"{"ti\u0074le": "a\nb", "plain": "c"}"#).unwrap();
        assert_eq!(
            node,
            Node::Table(vec![
                ("title".into(), Node::Str("a\nb".into())),
                ("plain".into(), Node::Str("c".into())),
            ])
        );
    }

    #[test]
    fn a_json_table_keeps_the_document_order() {
        let node = from_json(r#"{"z": 1, "a": 2}"#).unwrap();
        assert_eq!(
            node,
            Node::Table(vec![("z".into(), Node::Int(1)), ("a".into(), Node::Int(2))])
        );
    }

    #[test]
    fn both_formats_give_the_same_tree() {
        // TOML tables come sorted by key; JSON ones keep the document's order.
        let t = from_toml("title = \"a\"\n[rotors]\ncount = 2\n").unwrap();
        let j = from_json(r#"{"rotors": {"count": 2}, "title": "a"}"#).unwrap();
        assert_eq!(t, j);
    }
}

//! One document tree for both sheet formats, so TOML and JSON sheets are read
//! by the same code and give the same field paths and messages.

use super::{Error, Format};

/// A value of a parsed sheet, before any field is interpreted.
#[derive(Debug, Clone, PartialEq)]
pub enum Node {
    Str(String),
    Int(i64),
    Float(f64),
    Bool(bool),
    Array(Vec<Node>),
    Table(Vec<(String, Node)>),
    /// A value of a kind a sheet never holds (a TOML date, a JSON null).
    Other(&'static str),
}

impl Node {
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

/// Parses TOML text into a tree; a syntax error carries line and column.
pub fn from_toml(text: &str) -> Result<Node, Error> {
    match text.parse::<toml::Table>() {
        Ok(table) => Ok(toml_table(table)),
        Err(e) => {
            let (line, column) = e
                .span()
                .map(|span| line_column(text, span.start))
                .unwrap_or((1, 1));
            Err(Error::Syntax {
                format: Format::Toml,
                line,
                column,
                message: e.message().trim().to_string(),
            })
        }
    }
}

/// Parses JSON text into a tree; a syntax error carries line and column.
pub fn from_json(text: &str) -> Result<Node, Error> {
    match serde_json::from_str::<serde_json::Value>(text) {
        Ok(serde_json::Value::Object(map)) => Ok(json(serde_json::Value::Object(map))),
        Ok(other) => Err(Error::Syntax {
            format: Format::Json,
            line: 1,
            column: 1,
            message: format!("a claim sheet is a JSON object, got {}", json(other).kind()),
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

fn toml_table(table: toml::Table) -> Node {
    Node::Table(table.into_iter().map(|(k, v)| (k, toml_value(v))).collect())
}

fn toml_value(value: toml::Value) -> Node {
    match value {
        toml::Value::String(s) => Node::Str(s),
        toml::Value::Integer(i) => Node::Int(i),
        toml::Value::Float(f) => Node::Float(f),
        toml::Value::Boolean(b) => Node::Bool(b),
        toml::Value::Array(items) => Node::Array(items.into_iter().map(toml_value).collect()),
        toml::Value::Table(t) => toml_table(t),
        toml::Value::Datetime(_) => Node::Other("a date"),
    }
}

fn json(value: serde_json::Value) -> Node {
    match value {
        serde_json::Value::String(s) => Node::Str(s),
        serde_json::Value::Number(n) => match n.as_i64() {
            Some(i) => Node::Int(i),
            None => Node::Float(n.as_f64().unwrap_or(f64::NAN)),
        },
        serde_json::Value::Bool(b) => Node::Bool(b),
        serde_json::Value::Array(items) => Node::Array(items.into_iter().map(json).collect()),
        serde_json::Value::Object(map) => {
            Node::Table(map.into_iter().map(|(k, v)| (k, json(v))).collect())
        }
        serde_json::Value::Null => Node::Other("null"),
    }
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
        assert!(matches!(from_json("[1, 2]"), Err(Error::Syntax { .. })));
    }

    #[test]
    fn both_formats_give_the_same_tree() {
        let t = from_toml("title = \"a\"\n[rotors]\ncount = 2\n").unwrap();
        let j = from_json(r#"{"title": "a", "rotors": {"count": 2}}"#).unwrap();
        assert_eq!(t, j);
    }
}

//! The claim form: its fields, and the sheet they stand for.
//!
//! Each input is named by its path in the claim sheet (`craft.mass`,
//! `rotors.count`), so a field error from [`crate::claim::parse`] lands beside
//! the input it is about with no mapping table. The fields become a sheet
//! through the `toml` serializer, never by pasting strings together, so a
//! quote or newline in a title cannot change the sheet's structure.

use std::collections::HashMap;

use crate::catalog;
use crate::claim::{FieldError, Layout};

/// How an input is read into the sheet.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
enum Value {
    /// A string, quantities included ("310 g").
    Text,
    /// A whole number.
    Count,
    /// A checkbox: `true` when ticked, left out otherwise.
    Flag,
    /// Yes, no, or not stated.
    YesNo,
    /// One of a list of ids.
    Choice(Choices),
}

#[derive(Debug, Clone, Copy, PartialEq, Eq)]
enum Choices {
    Layout,
    Motor,
    Chemistry,
    Position,
}

struct Spec {
    name: &'static str,
    label: &'static str,
    hint: &'static str,
    value: Value,
}

const fn spec(name: &'static str, label: &'static str, hint: &'static str, value: Value) -> Spec {
    Spec {
        name,
        label,
        hint,
        value,
    }
}

/// The groups of the form and their fields, in page order.
const GROUPS: &[(&str, &[Spec])] = &[
    (
        "The craft",
        &[
            spec(
                "title",
                "Name of the claim",
                "what it is and where the claim comes from",
                Value::Text,
            ),
            spec(
                "craft.mass",
                "Take-off mass",
                "battery included, such as 310 g",
                Value::Text,
            ),
        ],
    ),
    (
        "Rotors",
        &[
            spec(
                "rotors.count",
                "Number of rotors",
                "such as 4",
                Value::Count,
            ),
            spec(
                "rotors.layout",
                "Arrangement",
                "",
                Value::Choice(Choices::Layout),
            ),
            spec(
                "rotors.diameter",
                "Propeller diameter",
                "such as 55 mm",
                Value::Text,
            ),
            spec(
                "rotors.arm",
                "Centre to rotor axis",
                "such as 70 mm",
                Value::Text,
            ),
            spec(
                "rotors.motor",
                "Motor class",
                "",
                Value::Choice(Choices::Motor),
            ),
            spec(
                "rotors.max_thrust",
                "Maximum thrust per rotor",
                "if stated, such as 30 g",
                Value::Text,
            ),
        ],
    ),
    (
        "Battery",
        &[
            spec(
                "battery.chemistry",
                "Chemistry",
                "",
                Value::Choice(Choices::Chemistry),
            ),
            spec(
                "battery.cells",
                "Cells in series",
                "such as 1",
                Value::Count,
            ),
            spec(
                "battery.capacity",
                "Capacity",
                "such as 600 mAh",
                Value::Text,
            ),
            spec("battery.mass", "Battery mass", "such as 15 g", Value::Text),
        ],
    ),
    (
        "What is claimed",
        &[
            spec(
                "claim.flight_time",
                "Flight time",
                "such as 15 min",
                Value::Text,
            ),
            spec(
                "claim.hover_tilt",
                "Tilt while hovering in place",
                "such as 30 deg",
                Value::Text,
            ),
            spec(
                "claim.hands_free",
                "Hovers with no pilot input",
                "",
                Value::Flag,
            ),
            spec(
                "claim.altitude_hold",
                "Holds its height by itself",
                "",
                Value::Flag,
            ),
            spec(
                "claim.position_hold",
                "Stays in place by itself",
                "",
                Value::Flag,
            ),
        ],
    ),
    (
        "Sensors on board",
        &[
            spec("sensing.gyroscope", "Rate gyroscope", "", Value::YesNo),
            spec("sensing.accelerometer", "Accelerometer", "", Value::YesNo),
            spec("sensing.barometer", "Barometer", "", Value::YesNo),
            spec(
                "sensing.position",
                "Position sensing",
                "",
                Value::Choice(Choices::Position),
            ),
        ],
    ),
];

fn choices(c: Choices) -> Vec<(&'static str, String)> {
    match c {
        Choices::Layout => Layout::ALL
            .iter()
            .filter(|(_, l)| *l != Layout::Custom)
            .map(|(id, _)| (*id, id.replace('-', " ")))
            .collect(),
        Choices::Motor => catalog::MOTORS
            .iter()
            .map(|m| (m.id, m.label.to_string()))
            .collect(),
        Choices::Chemistry => catalog::CHEMISTRIES
            .iter()
            .map(|c| (c.id, c.label.to_string()))
            .collect(),
        Choices::Position => [
            ("none", "none"),
            ("gnss", "satellite navigation (GNSS)"),
            ("optical-flow", "optical flow camera"),
            ("vision", "camera-based positioning"),
        ]
        .iter()
        .map(|(id, l)| (*id, l.to_string()))
        .collect(),
    }
}

/// One option of a select.
#[derive(Debug, Clone)]
pub struct Choice {
    pub value: &'static str,
    pub label: String,
    pub selected: bool,
}

/// One input as the template draws it.
#[derive(Debug, Clone)]
pub struct Field {
    pub name: &'static str,
    /// The element id: the name with dots as dashes.
    pub id: String,
    pub label: &'static str,
    pub hint: &'static str,
    /// "text", "select" or "checkbox".
    pub kind: &'static str,
    pub value: String,
    pub checked: bool,
    pub options: Vec<Choice>,
    pub error: Option<String>,
}

#[derive(Debug, Clone)]
pub struct FieldGroup {
    pub legend: &'static str,
    pub fields: Vec<Field>,
}

/// The whole form as the template draws it.
#[derive(Debug, Clone, Default)]
pub struct FormView {
    /// The pasted or uploaded sheet, kept as sent.
    pub sheet: String,
    /// Errors about the sheet, each with its field path or line and column.
    pub sheet_errors: Vec<String>,
    pub groups: Vec<FieldGroup>,
    /// Field errors with no input of their own (`rotors: is required`).
    pub other_errors: Vec<String>,
}

impl FormView {
    /// An empty form, or one holding a sheet.
    pub fn with_sheet(sheet: String) -> FormView {
        FormView {
            sheet,
            groups: groups(&HashMap::new(), &[]),
            ..FormView::default()
        }
    }

    /// The form sent back with the sheet kept and its errors listed beside it.
    pub fn sheet_refused(sheet: String, errors: Vec<String>) -> FormView {
        FormView {
            sheet_errors: errors,
            ..FormView::with_sheet(sheet)
        }
    }

    /// The form sent back with the fields kept and each error beside its input.
    pub fn fields_refused(values: &HashMap<String, String>, errors: &[FieldError]) -> FormView {
        let known = |f: &str| GROUPS.iter().flat_map(|g| g.1.iter()).any(|s| s.name == f);
        FormView {
            groups: groups(values, errors),
            other_errors: errors
                .iter()
                .filter(|e| !known(&e.field))
                .map(|e| e.to_string())
                .collect(),
            ..FormView::default()
        }
    }
}

fn groups(values: &HashMap<String, String>, errors: &[FieldError]) -> Vec<FieldGroup> {
    GROUPS
        .iter()
        .map(|(legend, specs)| FieldGroup {
            legend,
            fields: specs.iter().map(|s| field(s, values, errors)).collect(),
        })
        .collect()
}

fn field(s: &Spec, values: &HashMap<String, String>, errors: &[FieldError]) -> Field {
    let value = values.get(s.name).cloned().unwrap_or_default();
    let error = {
        let mine: Vec<&str> = errors
            .iter()
            .filter(|e| e.field == s.name || e.field.starts_with(&format!("{}[", s.name)))
            .map(|e| e.message.as_str())
            .collect();
        (!mine.is_empty()).then(|| mine.join("; "))
    };
    let options = |list: Vec<(&'static str, String)>| {
        let mut all = vec![Choice {
            value: "",
            label: "not stated".to_string(),
            selected: value.is_empty(),
        }];
        all.extend(list.into_iter().map(|(id, label)| Choice {
            value: id,
            label,
            selected: value == id,
        }));
        all
    };
    let (kind, options) = match s.value {
        Value::Text | Value::Count => ("text", Vec::new()),
        Value::Flag => ("checkbox", Vec::new()),
        Value::YesNo => (
            "select",
            options(vec![("yes", "yes".into()), ("no", "no".into())]),
        ),
        Value::Choice(c) => ("select", options(choices(c))),
    };
    Field {
        name: s.name,
        id: s.name.replace('.', "-"),
        label: s.label,
        hint: s.hint,
        kind,
        checked: s.value == Value::Flag && !value.is_empty(),
        value,
        options,
        error,
    }
}

/// The sheet the filled-in fields stand for, as TOML text. Inputs that
/// cannot be a sheet value at all (a count that is not a whole number, an
/// option not offered) are refused here with their field path; everything
/// else is left to the sheet reader, which knows units and ranges.
pub fn sheet_from_fields(values: &HashMap<String, String>) -> Result<String, Vec<FieldError>> {
    let mut root = toml::Table::new();
    let mut errors = Vec::new();
    for s in GROUPS.iter().flat_map(|g| g.1.iter()) {
        let raw = values.get(s.name).map(|v| v.trim()).unwrap_or("");
        if raw.is_empty() {
            continue;
        }
        let refuse = |message: String| FieldError {
            field: s.name.to_string(),
            message,
        };
        let value = match s.value {
            Value::Text => toml::Value::String(raw.to_string()),
            Value::Count => match raw.parse::<i64>() {
                Ok(n) => toml::Value::Integer(n),
                Err(_) => {
                    errors.push(refuse(format!("expected a whole number, got '{raw}'")));
                    continue;
                }
            },
            Value::Flag => toml::Value::Boolean(true),
            Value::YesNo => match raw {
                "yes" => toml::Value::Boolean(true),
                "no" => toml::Value::Boolean(false),
                other => {
                    errors.push(refuse(format!("expected yes or no, got '{other}'")));
                    continue;
                }
            },
            Value::Choice(c) => {
                if choices(c).iter().all(|(id, _)| *id != raw) {
                    errors.push(refuse(format!("'{raw}' is not one of the options")));
                    continue;
                }
                toml::Value::String(raw.to_string())
            }
        };
        insert(&mut root, s.name, value);
    }
    if !errors.is_empty() {
        return Err(errors);
    }
    toml::to_string(&root).map_err(|e| {
        vec![FieldError {
            field: "sheet".into(),
            message: format!("the fields do not make a sheet: {e}"),
        }]
    })
}

/// Puts a value at a dotted path, making the tables on the way.
fn insert(root: &mut toml::Table, path: &str, value: toml::Value) {
    let mut table = root;
    let mut parts = path.split('.').peekable();
    while let Some(part) = parts.next() {
        if parts.peek().is_none() {
            table.insert(part.to_string(), value);
            return;
        }
        let entry = table
            .entry(part.to_string())
            .or_insert_with(|| toml::Value::Table(toml::Table::new()));
        match entry {
            toml::Value::Table(t) => table = t,
            _ => return,
        }
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::claim::{self, Format};

    fn values(pairs: &[(&str, &str)]) -> HashMap<String, String> {
        pairs
            .iter()
            .map(|(k, v)| (k.to_string(), v.to_string()))
            .collect()
    }

    #[test]
    fn filled_fields_make_a_sheet_the_reader_accepts() {
        let v = values(&[
            ("title", "Desk \"lamp\"\n[craft]\nmass = \"1 g\""),
            ("craft.mass", "310 g"),
            ("rotors.count", "2"),
            ("rotors.layout", "side-by-side"),
            ("rotors.motor", "brushed-coreless-7x16"),
            ("claim.hands_free", "on"),
            ("sensing.gyroscope", "no"),
        ]);
        let sheet = sheet_from_fields(&v).unwrap();
        let claim = claim::parse(&sheet, Format::Toml).unwrap();
        // A hostile title stays a title: it cannot add a table to the sheet.
        assert!(claim.title.starts_with("Desk \"lamp\""));
        assert!((claim.craft.mass.get::<uom::si::mass::gram>() - 310.0).abs() < 1e-9);
        assert_eq!(claim.rotors.count, 2);
        assert!(claim.claim.hands_free);
        assert_eq!(claim.sensing.gyroscope, Some(false));
        assert_eq!(claim.sensing.accelerometer, None);
    }

    #[test]
    fn a_count_that_is_not_a_whole_number_is_refused_beside_its_input() {
        let v = values(&[("title", "t"), ("rotors.count", "two")]);
        let errors = sheet_from_fields(&v).unwrap_err();
        assert_eq!(errors[0].field, "rotors.count");
        let form = FormView::fields_refused(&v, &errors);
        let count = form
            .groups
            .iter()
            .flat_map(|g| &g.fields)
            .find(|f| f.name == "rotors.count")
            .unwrap();
        assert_eq!(count.value, "two");
        assert!(count.error.as_deref().unwrap().contains("whole number"));
        assert!(form.other_errors.is_empty());
    }

    #[test]
    fn reader_errors_without_an_input_are_listed_apart() {
        let errors = vec![
            FieldError {
                field: "rotors".into(),
                message: "is required".into(),
            },
            FieldError {
                field: "craft.mass".into(),
                message: "expected a mass".into(),
            },
        ];
        let form = FormView::fields_refused(&HashMap::new(), &errors);
        assert_eq!(form.other_errors, ["rotors: is required"]);
    }
}

//! No input makes the engine panic or print a non-finite number: every prefix
//! of every demo sheet (TOML and JSON), many byte-level mutations of them, and
//! random documents of both formats either parse and give a finite report or
//! are refused with a syntax error or field errors.

use liftaudit::claim::{self, demo, Format};
use liftaudit::rules;

fn run(text: &str) {
    if let Ok(claim) = claim::parse_any(text) {
        let report = rules::run_all(&claim);
        for f in &report.findings {
            assert!(!f.headline.is_empty());
            for fig in &f.figures {
                assert!(fig.value.is_finite(), "{} {} in\n{text}", f.rule, fig.key);
            }
        }
        assert!(report.to_json().contains("liftaudit.report/1"));
    }
}

/// A repeatable stream of pseudo-random numbers: Knuth's MMIX linear
/// congruential generator, its high bits.
fn numbers(seed: u64) -> impl FnMut() -> usize {
    let mut state = seed;
    move || {
        state = state
            .wrapping_mul(6364136223846793005)
            .wrapping_add(1442695040888963407);
        (state >> 33) as usize
    }
}

#[test]
fn every_prefix_of_every_demo_is_handled() {
    for d in demo::DEMOS {
        for (i, _) in d.text.char_indices() {
            run(&d.text[..i]);
        }
    }
}

#[test]
fn byte_mutations_of_the_demos_are_handled() {
    // Deterministic mutations: replace one byte with one from a set of troublesome ones.
    let troublesome = b"0-.e9x\"[]{}=\n #\\";
    let mut next = numbers(12345);
    for d in demo::DEMOS {
        for _ in 0..400 {
            let mut bytes = d.text.as_bytes().to_vec();
            for _ in 0..3 {
                let at = next() % bytes.len();
                bytes[at] = troublesome[next() % troublesome.len()];
            }
            run(&String::from_utf8_lossy(&bytes));
        }
    }
}

/// A random document from pieces of TOML: plain ones, quoted and dotted keys,
/// escapes, dates, repeated keys and tables, malformed values.
fn random_toml(next: &mut dyn FnMut() -> usize) -> String {
    const KEYS: &[&str] = &["a", "b", "mass", "count", "at", "k-1", "z_2", "0"];
    const VALUES: &[&str] = &[
        "1",
        "-2",
        "+3",
        "0",
        "-0",
        "1.5",
        "-0.25",
        "1e3",
        "6.02E+23",
        "3e05",
        "1_0",
        "01",
        "1.",
        ".5",
        "1e",
        "9223372036854775807",
        "9223372036854775808",
        "1e400",
        "inf",
        "nan",
        "0x1f",
        "true",
        "false",
        "truex",
        "\"s\"",
        "''",
        "'lit'",
        "\"e\\n\"",
        "\"\"\"m\"\"\"",
        "\"t\tab\"",
        "\"\u{b0}\"",
        "\"d\u{7f}l\"",
        "'d\u{7f}l'",
        "\"c\u{1}l\"",
        "1979-05-27",
        "07:32:00",
        "[]",
        "[1, 2]",
        "[1,]",
        "[1,,2]",
        "[\n1, # c\n2\n]",
        "{}",
        "{ x = 1 }",
        "{ x = 1, }",
        "{ x = 1, x = 2 }",
        "{ x = { y = [1] } }",
        "[[1], ['a']]",
        "\"open",
        "",
    ];
    const HEADS: &[&str] = &[
        "[{k}]",
        "[[{k}]]",
        "[{k}.{k}]",
        "[[{k}.{k}]]",
        "[ {k} ]",
        "[\"{k}\"]",
    ];
    const ENDS: &[&str] = &[
        "\n",
        "\r\n",
        " # note\n",
        " # a \"quoted\" \\ note\twith a tab\n",
        " # del \u{7f}\n",
        " # ctl \u{1}\n",
        "\t\n",
        "\r",
        " x\n",
        "\n\n",
    ];
    let mut text = String::new();
    for _ in 0..(1 + next() % 8) {
        let key = KEYS[next() % KEYS.len()];
        let other = KEYS[next() % KEYS.len()];
        let value = VALUES[next() % VALUES.len()];
        let line = match next() % 10 {
            0..=1 => HEADS[next() % HEADS.len()].replace("{k}", key),
            2 => format!("{key}.{other} = {value}"),
            3 => format!("\"{key}\" = {value}"),
            _ => format!("{key} = {value}"),
        };
        text.push_str(&line);
        // Half the lines end plainly, so that well-formed documents stay common.
        text.push_str(if next().is_multiple_of(2) {
            "\n"
        } else {
            ENDS[next() % ENDS.len()]
        });
    }
    text
}

/// Runs the whole check on 20,000 random documents of one format; the
/// generator must give both well-formed and malformed ones in numbers, or it
/// tests nothing.
fn random_documents_are_handled(
    what: &str,
    seed: u64,
    format: Format,
    mut document: impl FnMut(&mut dyn FnMut() -> usize) -> String,
) {
    let mut next = numbers(seed);
    let (mut well_formed, mut malformed) = (0, 0);
    for _ in 0..20_000 {
        let text = document(&mut next);
        match claim::parse(&text, format) {
            Err(claim::Error::Syntax { .. }) => malformed += 1,
            _ => well_formed += 1,
        }
        run(&text);
    }
    assert!(
        well_formed > 1000 && malformed > 1000,
        "{what}: {well_formed} well-formed, {malformed} malformed"
    );
}

#[test]
fn random_toml_documents_are_handled() {
    random_documents_are_handled("TOML", 2024, Format::Toml, |next| random_toml(next));
}

/// The demo sheets as JSON, compact and indented, as clients send them.
fn demos_as_json() -> Vec<String> {
    demo::DEMOS
        .iter()
        .flat_map(|d| {
            let value: serde_json::Value = toml::from_str(d.text).expect("a demo is TOML");
            [
                serde_json::to_string(&value).unwrap(),
                serde_json::to_string_pretty(&value).unwrap(),
            ]
        })
        .collect()
}

#[test]
fn every_prefix_and_byte_mutation_of_every_demo_as_json_is_handled() {
    let troublesome = b"0-.eE9x\"\\[]{},: \n\t\x01\x1f";
    let mut next = numbers(777);
    for text in demos_as_json() {
        assert!(claim::parse_any(&text).is_ok(), "{text}");
        for (i, _) in text.char_indices() {
            run(&text[..i]);
        }
        for _ in 0..400 {
            let mut bytes = text.as_bytes().to_vec();
            for _ in 0..1 + next() % 3 {
                let at = next() % bytes.len();
                bytes[at] = troublesome[next() % troublesome.len()];
            }
            run(&String::from_utf8_lossy(&bytes));
        }
    }
}

/// A random JSON document from pieces: plain ones, signs, fractions and
/// exponents, escapes and control bytes, repeated keys, deep nesting,
/// malformed ones.
fn random_json(next: &mut dyn FnMut() -> usize, depth: usize) -> String {
    const KEYS: &[&str] = &["a", "b", "mass", "", "é", "a\\n", "\\u0061", "k\"", "a"];
    const VALUES: &[&str] = &[
        "1",
        "0",
        "-0",
        "-2",
        "01",
        "1.5",
        "-0.25",
        "1e3",
        "6.02E+23",
        "1.",
        ".5",
        "1e",
        "123456789012345678",
        "1234567890123456789",
        "18446744073709551616",
        "1e400",
        "true",
        "false",
        "null",
        "truex",
        "nul",
        "\"s\"",
        "\"\"",
        "\"e\\n\"",
        "\"\\u00e9\"",
        "\"t\tab\"",
        "\"\u{1f}\"",
        "\"\u{b0}\"",
        "\"open",
        "[]",
        "{}",
        "[1,]",
        "{,}",
        "",
        "x",
    ];
    const SPACES: &[&str] = &["", "", " ", "\n", "\t", "\r\n", "\u{a0}"];
    let space = |next: &mut dyn FnMut() -> usize| SPACES[next() % SPACES.len()];
    let value = |next: &mut dyn FnMut() -> usize| VALUES[next() % VALUES.len()].to_string();
    let mut text = String::new();
    let n = next() % 5;
    let object = depth == 0 || !next().is_multiple_of(3);
    text.push(if object { '{' } else { '[' });
    for i in 0..n {
        if i > 0 {
            text.push_str(if next().is_multiple_of(30) { ",," } else { "," });
        }
        text.push_str(space(next));
        if object {
            text.push('"');
            text.push_str(KEYS[next() % KEYS.len()]);
            text.push('"');
            text.push_str(space(next));
            text.push_str(if next().is_multiple_of(40) { "=" } else { ":" });
            text.push_str(space(next));
        }
        if depth < 10 && next().is_multiple_of(4) {
            text.push_str(&random_json(next, depth + 1));
        } else {
            text.push_str(&value(next));
        }
        text.push_str(space(next));
    }
    text.push(if object { '}' } else { ']' });
    if depth == 0 && next().is_multiple_of(20) {
        text.push_str(" x");
    }
    text
}

#[test]
fn random_json_documents_are_handled() {
    random_documents_are_handled("JSON", 99, Format::Json, |next| random_json(next, 0));
}

#[test]
fn extreme_but_accepted_values_give_finite_reports() {
    let sheet = r#"
title = "edge"
[craft]
mass = "150 kg"
size = "5 m x 0.001 mm x 5 m"
[rotors]
count = 64
arm = "0.0001 mm"
diameter = "0.001 mm"
max_thrust = "0.000001 N"
max_power = "50 kW"
[battery]
cells = 24
capacity = "0.001 mAh"
mass = "149 kg"
max_discharge = "1000 C"
[claim]
flight_time = "48 h"
hover_tilt = "89 deg"
hands_free = true
position_hold = true
[sensing]
gyroscope = true
accelerometer = false
[conditions]
altitude = "11000 m"
temperature = "60 degC"
wind = "60 m/s"
"#;
    let claim = claim::parse_any(sheet).unwrap();
    run(sheet);
    assert_eq!(claim.rotors.count, 64);
}

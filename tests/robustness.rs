//! No input makes the engine panic or print a non-finite number: every prefix
//! of every demo sheet, and many byte-level mutations of them, either parse and
//! give a finite report or are refused with field errors.

use liftaudit::claim::{self, demo};
use liftaudit::rules;

fn run(text: &str) {
    assert_ne!(
        claim::toml_readers_agree(text),
        Some(false),
        "the TOML readers differ on\n{text}"
    );
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
    let mut state: u64 = 12345;
    let mut next = || {
        state = state.wrapping_mul(6364136223846793005).wrapping_add(1);
        (state >> 33) as usize
    };
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

/// A random document from pieces of TOML: plain ones the one-pass reader takes,
/// and ones it must hand to the general parser (quoted and dotted keys, escapes,
/// dates, repeated keys and tables, malformed values).
fn random_toml(next: &mut impl FnMut() -> usize) -> String {
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
    const ENDS: &[&str] = &["\n", "\r\n", " # note\n", "\t\n", "\r", " x\n", "\n\n"];
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
        text.push_str(ENDS[next() % ENDS.len()]);
    }
    text
}

#[test]
fn the_two_toml_readers_give_the_same_tree_for_random_documents() {
    let mut state: u64 = 2024;
    let mut next = || {
        state = state
            .wrapping_mul(6364136223846793005)
            .wrapping_add(1442695040888963407);
        (state >> 33) as usize
    };
    let (mut plain, mut passed_on) = (0, 0);
    for _ in 0..20_000 {
        let text = random_toml(&mut next);
        match claim::toml_readers_agree(&text) {
            Some(agree) => {
                assert!(agree, "the TOML readers differ on\n{text}");
                plain += 1;
            }
            None => passed_on += 1,
        }
    }
    // The generator must give both kinds in numbers, or it tests nothing.
    assert!(
        plain > 1000 && passed_on > 1000,
        "{plain} plain, {passed_on} passed on"
    );
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

//! No input makes the engine panic or print a non-finite number: every prefix
//! of every demo sheet, and many byte-level mutations of them, either parse and
//! give a finite report or are refused with field errors.

use liftaudit::claim::{self, demo};
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

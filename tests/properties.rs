//! Properties that hold for every valid sheet, over random sheets (proptest):
//! finite figures, the tier order, monotonic responses to more battery and
//! more thrust, a level hover never failing the tilt rule, and the same report
//! from a sheet's TOML and JSON forms.

use liftaudit::claim::{self, Format};
use liftaudit::report::{keys, Report, Tier, Verdict};
use liftaudit::rules;
use proptest::prelude::*;
use serde_json::{json, Value};

const MOTORS: [&str; 6] = [
    "brushed-coreless-7x16",
    "brushless-0802",
    "brushless-1404",
    "brushless-2204",
    "brushless-2814",
    "brushless-4114",
];

#[derive(Debug, Clone)]
struct Sheet {
    mass_g: f64,
    count: u32,
    diameter_mm: f64,
    motor: Option<usize>,
    thrust_g: Option<f64>,
    cells: u32,
    capacity_mah: f64,
    battery_share: f64,
    minutes: f64,
    tilt_deg: f64,
    wind: f64,
    altitude: f64,
    hands_free: bool,
    gyro: bool,
    size_mm: (f64, f64, f64),
    arm_mm: f64,
}

fn sheets() -> impl Strategy<Value = Sheet> {
    (
        (
            20.0..20_000.0f64,
            prop::sample::select(vec![1u32, 2, 3, 4, 6, 8]),
            30.0..500.0f64,
        ),
        (
            prop::option::of(0..MOTORS.len()),
            prop::option::of(5.0..5000.0f64),
        ),
        (1u32..=6, 50.0..20_000.0f64, 0.05..0.6f64, 0.5..90.0f64),
        (
            0.0..60.0f64,
            0.0..20.0f64,
            0.0..4000.0f64,
            any::<bool>(),
            any::<bool>(),
        ),
        (
            (50.0..1000.0f64, 50.0..1000.0f64, 10.0..300.0f64),
            20.0..600.0f64,
        ),
    )
        .prop_map(
            |(
                (mass_g, count, diameter_mm),
                (motor, thrust_g),
                (cells, capacity_mah, battery_share, minutes),
                (tilt_deg, wind, altitude, hands_free, gyro),
                (size_mm, arm_mm),
            )| Sheet {
                mass_g,
                count,
                diameter_mm,
                // A sheet needs some thrust figure for the thrust rule to run; keep both ways.
                motor: if thrust_g.is_none() && motor.is_none() {
                    Some(0)
                } else {
                    motor
                },
                thrust_g,
                cells,
                capacity_mah,
                battery_share,
                minutes,
                tilt_deg,
                wind,
                altitude,
                hands_free,
                gyro,
                size_mm,
                arm_mm,
            },
        )
}

impl Sheet {
    fn value(&self) -> Value {
        let mut rotors = json!({
            "count": self.count,
            "diameter": format!("{} mm", self.diameter_mm),
            "arm": format!("{} mm", self.arm_mm),
        });
        if let Some(m) = self.motor {
            rotors["motor"] = json!(MOTORS[m]);
        }
        if let Some(t) = self.thrust_g {
            rotors["max_thrust"] = json!(format!("{t} g"));
        }
        json!({
            "title": "property sheet",
            "craft": {
                "mass": format!("{} g", self.mass_g),
                "size": format!("{} mm x {} mm x {} mm", self.size_mm.0, self.size_mm.1, self.size_mm.2),
            },
            "rotors": rotors,
            "battery": {
                "chemistry": "lipo",
                "cells": self.cells,
                "capacity": format!("{} mAh", self.capacity_mah),
                "mass": format!("{} g", self.mass_g * self.battery_share),
            },
            "claim": {
                "flight_time": format!("{} min", self.minutes),
                "hover_tilt": format!("{} deg", self.tilt_deg),
                "hands_free": self.hands_free,
            },
            "sensing": { "gyroscope": self.gyro, "accelerometer": true },
            "conditions": {
                "wind": format!("{} m/s", self.wind),
                "altitude": format!("{} m", self.altitude),
            },
        })
    }

    fn report(&self) -> Report {
        report_of(&self.value())
    }
}

fn report_of(v: &Value) -> Report {
    let claim = claim::parse(&v.to_string(), Format::Json).expect("a valid sheet");
    rules::run_all(&claim)
}

fn figure(r: &Report, rule: &str, key: &str, tier: Tier) -> Option<f64> {
    r.finding(rule)?.figure(key, Some(tier)).map(|f| f.value)
}

proptest! {
    #![proptest_config(ProptestConfig { cases: 256, ..ProptestConfig::default() })]

    #[test]
    fn every_figure_is_finite(s in sheets()) {
        for f in &s.report().findings {
            for fig in &f.figures {
                prop_assert!(fig.value.is_finite(), "{} {}", f.rule, fig.key);
            }
        }
    }

    #[test]
    fn the_physical_limit_is_most_generous_for_endurance_and_thrust(s in sheets()) {
        let r = s.report();
        for (rule, key) in [("energy-budget", keys::ENDURANCE), ("thrust-margin", keys::THRUST_AVAILABLE), ("energy-budget", keys::ENDURANCE_CEILING)] {
            let v: Vec<Option<f64>> = Tier::ALL.iter().map(|&t| figure(&r, rule, key, t)).collect();
            if let [Some(a), Some(b), Some(c)] = v[..] {
                prop_assert!(a >= b * (1.0 - 1e-12) && b >= c * (1.0 - 1e-12), "{key}: {a} {b} {c}");
            }
        }
    }

    #[test]
    fn more_capacity_at_the_same_battery_mass_never_shortens_endurance(s in sheets(), more in 1.0..3.0f64) {
        let mut bigger = s.clone();
        bigger.capacity_mah *= more;
        let (a, b) = (s.report(), bigger.report());
        for t in Tier::ALL {
            let (x, y) = (figure(&a, "energy-budget", keys::ENDURANCE, t), figure(&b, "energy-budget", keys::ENDURANCE, t));
            prop_assert!(y >= x, "{t:?}: {x:?} -> {y:?}");
        }
    }

    #[test]
    fn more_thrust_never_worsens_the_thrust_margin(s in sheets(), more in 1.0..3.0f64) {
        let base = Sheet { thrust_g: Some(s.thrust_g.unwrap_or(100.0)), ..s.clone() };
        let stronger = Sheet { thrust_g: base.thrust_g.map(|t| t * more), ..base.clone() };
        let (a, b) = (base.report(), stronger.report());
        let fa = figure(&a, "thrust-margin", keys::HOVER_FRACTION, Tier::Typical).unwrap();
        let fb = figure(&b, "thrust-margin", keys::HOVER_FRACTION, Tier::Typical).unwrap();
        prop_assert!(fb <= fa);
        // The verdict may only change for the worse when a stated thrust passes a law's bound.
        let bound_broken = b.finding("thrust-margin").unwrap().headline.contains("stated");
        if !bound_broken {
            let sev = |r: &Report| r.finding("thrust-margin").unwrap().verdict.severity();
            prop_assert!(sev(&b) <= sev(&a));
        }
    }

    #[test]
    fn a_level_hover_in_still_air_never_fails_the_tilt_rule(s in sheets()) {
        // In a wind a level hover leaves the drag unbalanced (issue 15), so still air only.
        let level = Sheet { tilt_deg: 0.0, wind: 0.0, ..s };
        let f = level.report();
        prop_assert_eq!(f.finding("tilt-equilibrium").unwrap().verdict, Verdict::Consistent);
    }

    #[test]
    fn a_sheet_gives_the_same_report_from_toml_and_json(s in sheets()) {
        let v = s.value();
        let toml_text = toml::to_string(&v).expect("TOML form");
        let from_toml = rules::run_all(&claim::parse(&toml_text, Format::Toml).expect("TOML parses"));
        prop_assert_eq!(from_toml, report_of(&v));
    }
}

/// Fields that take a quantity, with the unit an extreme value is written in.
const QUANTITIES: [(&str, &str, &str); 12] = [
    ("craft", "mass", "g"),
    ("rotors", "diameter", "mm"),
    ("rotors", "arm", "mm"),
    ("rotors", "max_thrust", "g"),
    ("rotors", "max_power", "W"),
    ("battery", "capacity", "mAh"),
    ("battery", "mass", "g"),
    ("battery", "max_discharge", "C"),
    ("claim", "flight_time", "min"),
    ("conditions", "wind", "m/s"),
    ("sensing", "loop_rate", "Hz"),
    ("rotors", "height", "mm"),
];

proptest! {
    #![proptest_config(ProptestConfig { cases: 512, ..ProptestConfig::default() })]

    /// Issue 16: magnitudes from 1e-300 to 1e300 in any quantity field give
    /// field errors or a report of finite figures, never a panic (which the
    /// service would answer 500). `rotors.max_power = "1e-200 W"` was the crash.
    #[test]
    fn extreme_magnitudes_give_field_errors_or_finite_reports_never_a_panic(
        s in sheets(),
        picks in proptest::collection::vec((0..QUANTITIES.len(), 1.0..10.0f64, -300..=300i32), 1..4),
    ) {
        let mut v = s.value();
        for (field, mantissa, exponent) in picks {
            let (table, key, unit) = QUANTITIES[field];
            v[table][key] = json!(format!("{mantissa}e{exponent} {unit}"));
        }
        if let Ok(claim) = claim::parse(&v.to_string(), Format::Json) {
            let report = rules::run_all(&claim);
            for f in &report.findings {
                for fig in &f.figures {
                    prop_assert!(fig.value.is_finite(), "{} {} in {}", f.rule, fig.key, v);
                }
            }
            prop_assert!(serde_json::to_string(&report).is_ok());
        }
    }
}

/// Each demo sheet as a JSON value, to set extreme values in.
fn demo_values() -> Vec<Value> {
    liftaudit::claim::demo::DEMOS
        .iter()
        .map(|d| {
            let table: toml::Table = toml::from_str(d.text).expect("a demo is TOML");
            serde_json::to_value(table).expect("as JSON")
        })
        .collect()
}

proptest! {
    #![proptest_config(ProptestConfig { cases: 512, ..ProptestConfig::default() })]

    /// The same over the demo sheets, whose every rule runs (the control
    /// analysis among them): `rotors.max_power = "1e-200 W"` on
    /// classroom-quad panicked inside the linear algebra (issue 16).
    #[test]
    fn extreme_magnitudes_in_a_demo_give_field_errors_or_finite_reports_never_a_panic(
        demo in 0..liftaudit::claim::demo::DEMOS.len(),
        picks in proptest::collection::vec((0..QUANTITIES.len(), 1.0..10.0f64, -300..=300i32), 1..4),
    ) {
        let mut v = demo_values()[demo].clone();
        for (field, mantissa, exponent) in picks {
            let (table, key, unit) = QUANTITIES[field];
            if !v[table].is_object() {
                v[table] = json!({});
            }
            v[table][key] = json!(format!("{mantissa}e{exponent} {unit}"));
        }
        if let Ok(claim) = claim::parse(&v.to_string(), Format::Json) {
            let report = rules::run_all(&claim);
            for f in &report.findings {
                for fig in &f.figures {
                    prop_assert!(fig.value.is_finite(), "{} {} in {}", f.rule, fig.key, v);
                }
            }
        }
    }
}

proptest! {
    #![proptest_config(ProptestConfig { cases: 256, ..ProptestConfig::default() })]

    /// Issue 16: a number of a million or more is written in scientific
    /// notation, so no text holds a run of hundreds of digits, however far
    /// out the sheet's magnitudes are.
    #[test]
    fn extreme_magnitudes_never_print_a_long_run_of_digits(
        s in sheets(),
        picks in proptest::collection::vec((0..QUANTITIES.len(), 1.0..10.0f64, -300..=300i32), 1..4),
    ) {
        let mut v = s.value();
        for (field, mantissa, exponent) in picks {
            let (table, key, unit) = QUANTITIES[field];
            v[table][key] = json!(format!("{mantissa}e{exponent} {unit}"));
        }
        let claim = match claim::parse(&v.to_string(), Format::Json) {
            Ok(claim) => claim,
            Err(e) => {
                let words = e.to_string();
                prop_assert!(longest_digit_run(&words) < 20, "{words}");
                return Ok(());
            }
        };
        // Only sheets the rules can run on without the control analysis's
        // crash (issue 16) reach here in a branch without its fix.
        let report = match std::panic::catch_unwind(|| rules::run_all(&claim)) {
            Ok(report) => report,
            Err(_) => return Ok(()),
        };
        let text = liftaudit::report::render_text(&report, false);
        prop_assert!(longest_digit_run(&text) < 20, "{text}");
    }
}

/// The longest run of decimal digits in `text`.
fn longest_digit_run(text: &str) -> usize {
    text.split(|c: char| !c.is_ascii_digit())
        .map(str::len)
        .max()
        .unwrap_or(0)
}

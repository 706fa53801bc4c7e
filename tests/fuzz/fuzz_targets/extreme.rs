//! Extreme magnitudes (issue 16): a demo sheet with quantity fields set to
//! values from the fuzzer's bytes, anywhere from 1e-300 to 1e300. Field
//! errors or a report of finite figures, never a panic.
#![no_main]

use libfuzzer_sys::fuzz_target;
use liftaudit::claim::{self, demo, Format};
use liftaudit::rules;

/// Fields that take a quantity, with the unit a value is written in.
const QUANTITIES: [(&str, &str, &str); 11] = [
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
];

fuzz_target!(|data: &[u8]| {
    let Some((&pick, rest)) = data.split_first() else {
        return;
    };
    let d = &demo::DEMOS[pick as usize % demo::DEMOS.len()];
    let Ok(mut sheet) = toml::from_str::<toml::Table>(d.text) else {
        return;
    };
    // Three bytes a field: which field, the mantissa, the exponent (-300..=300).
    for chunk in rest.chunks_exact(3) {
        let (table, key, unit) = QUANTITIES[chunk[0] as usize % QUANTITIES.len()];
        let mantissa = 1.0 + f64::from(chunk[1]) / 256.0 * 9.0;
        let exponent = (i32::from(chunk[2]) * 601 / 256) - 300;
        let entry = sheet
            .entry(table)
            .or_insert_with(|| toml::Value::Table(toml::Table::new()));
        if let Some(t) = entry.as_table_mut() {
            t.insert(key.into(), format!("{mantissa}e{exponent} {unit}").into());
        }
    }
    let Ok(text) = toml::to_string(&sheet) else {
        return;
    };
    let Ok(claim) = claim::parse(&text, Format::Toml) else {
        return;
    };
    let report = rules::run_all(&claim);
    for finding in &report.findings {
        for figure in &finding.figures {
            assert!(figure.value.is_finite(), "{} {}", finding.rule, figure.key);
        }
    }
});

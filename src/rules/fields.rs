//! Which sheet fields each rule reads, so that the report can name the
//! fields a sheet gave that no rule used (`Report::unused`) instead of
//! dropping them silently.
//!
//! One list per rule id, kept beside the registry rather than in the rule
//! files; a list counts the fields a rule reads through the shared steps
//! too (the air, the weight, the per-rotor thrust estimate, the rotor
//! placements). A rule that starts reading a field adds it here: the tests
//! in `tests/demos.rs` take every field this module calls unused out of
//! each demo sheet and of a sheet that gives every field, and check that
//! no finding changes.

use super::{
    control_authority, energy_budget, sensing, sheet_consistency, thrust_margin, tilt_equilibrium,
};
use crate::claim::{Claim, Layout, Mount};

/// `common::air`: the station pressure, else the ISA pressure at the
/// (pressure) altitude; the temperature; gravity from the altitude.
const AIR: &[&str] = &[
    "conditions.altitude",
    "conditions.temperature",
    "conditions.pressure",
];

/// `common::weight`: the take-off mass, which is the parts' sum when no mass is given.
const WEIGHT: &[&str] = &["craft.mass", "craft.parts"];

/// `thrust_margin::estimate` (and `rotor_thrust`), with the coaxial pairs
/// of `common::paired_rotors` and the diameter of `common::rotor_diameter`.
const THRUST_ESTIMATE: &[&str] = &[
    "rotors.count",
    "rotors.layout",
    "rotors.at",
    "rotors.diameter",
    "rotors.motor",
    "rotors.drive",
    "rotors.max_thrust",
    "rotors.max_power",
    // The pack the motors run on: its voltage scales the class, its rating caps the power.
    "battery.chemistry",
    "battery.cells",
    "battery.capacity",
    "battery.max_discharge",
];

/// `geometry::placements`: where the rotors sit, how they spin and tilt.
const PLACEMENTS: &[&str] = &[
    "rotors.count",
    "rotors.layout",
    "rotors.arm",
    "rotors.mount",
    "rotors.tilt_range",
    "rotors.height",
    "rotors.spins",
    "rotors.at",
];

/// Read by the report itself: its title and the "claim from" line of the page.
pub const REPORT_READS: &[&str] = &["title", "source"];

/// The fields each rule reads, by rule id, as groups of dotted paths.
pub const READS: &[(&str, &[&[&str]])] = &[
    (thrust_margin::ID, &[AIR, WEIGHT, THRUST_ESTIMATE]),
    (
        tilt_equilibrium::ID,
        &[
            AIR,
            WEIGHT,
            THRUST_ESTIMATE,
            PLACEMENTS,
            &[
                "claim.hover_tilt",
                "conditions.wind",
                "craft.size",
                "rotors.mount",
                "rotors.tilt_range",
            ],
        ],
    ),
    (
        energy_budget::ID,
        &[
            AIR,
            WEIGHT,
            THRUST_ESTIMATE,
            &[
                "battery.chemistry",
                "battery.cells",
                "battery.capacity",
                "battery.mass",
                "battery.max_discharge",
                "claim.flight_time",
                "craft.size",
                "craft.avionics_power",
            ],
        ],
    ),
    (
        sensing::ID,
        &[
            AIR,
            WEIGHT,
            PLACEMENTS,
            THRUST_ESTIMATE,
            &[
                "craft.size",
                "sensing.loop_rate",
                "sensing.gyroscope",
                "sensing.accelerometer",
                "sensing.barometer",
                "sensing.position",
                "claim.hands_free",
                "claim.altitude_hold",
                "claim.position_hold",
                "claim.flight_time",
            ],
        ],
    ),
    (
        control_authority::ID,
        &[
            AIR,
            WEIGHT,
            PLACEMENTS,
            THRUST_ESTIMATE,
            &["claim.survives_rotor_failure"],
        ],
    ),
    (sheet_consistency::ID, &[sheet_consistency::READS]),
];

/// Fields the lists name that no rule reads on this sheet: the rotors'
/// tilt range outside a tilting mount or a tricopter's tail servo, and the
/// spins and arm of rotors placed by hand (each `[[rotors.at]]` has its own;
/// a coaxial pair sits on the centre line whatever its arm).
fn passed_over(claim: &Claim, field: &str) -> bool {
    let r = &claim.rotors;
    match field {
        "rotors.tilt_range" => r.mount != Mount::Tilting && r.layout != Some(Layout::Tri),
        "rotors.spins" => r.layout == Some(Layout::Custom),
        "rotors.arm" => matches!(r.layout, Some(Layout::Custom | Layout::Coaxial)),
        _ => false,
    }
}

/// Whether some rule (or the report) reads the field at this dotted path.
pub fn is_read(field: &str) -> bool {
    REPORT_READS.contains(&field)
        || READS
            .iter()
            .flat_map(|(_, groups)| groups.iter())
            .any(|group| group.contains(&field))
}

/// The fields the sheet gave that no rule reads, sorted by path.
pub fn unused(claim: &Claim) -> Vec<String> {
    claim
        .given
        .iter()
        .filter(|field| !is_read(field) || passed_over(claim, field))
        .cloned()
        .collect()
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::claim::{parse, Error, Format};

    #[test]
    fn every_rule_in_the_registry_declares_what_it_reads() {
        for rule in super::super::REGISTRY {
            assert!(
                READS.iter().any(|(id, _)| *id == rule.id),
                "{} has no list in rules::fields::READS",
                rule.id
            );
        }
    }

    #[test]
    fn every_field_a_rule_reads_is_a_field_the_sheet_takes() {
        // A misspelt path would never match a given field: the reader must
        // know each one (it refuses an unknown key with "unknown key").
        let all = READS
            .iter()
            .flat_map(|(_, groups)| groups.iter().flat_map(|g| g.iter()))
            .chain(REPORT_READS);
        for path in all {
            let mut sheet: toml::Table =
                toml::from_str("title = \"t\"\n[craft]\nmass = \"1 kg\"\n[rotors]\ncount = 4\n")
                    .unwrap();
            let value = toml::Value::Integer(0);
            match path.split_once('.') {
                Some((table, key)) => {
                    let t = sheet
                        .entry(table)
                        .or_insert_with(|| toml::Value::Table(toml::Table::new()));
                    t.as_table_mut().unwrap().insert(key.to_string(), value);
                }
                None => {
                    sheet.insert(path.to_string(), value);
                }
            }
            let text = toml::to_string(&sheet).unwrap();
            if let Err(Error::Invalid(errors)) = parse(&text, Format::Toml) {
                assert!(
                    !errors
                        .iter()
                        .any(|e| e.field == *path && e.message.starts_with("unknown key")),
                    "{path} is not a field of the sheet"
                );
            }
        }
    }

    #[test]
    fn the_sheet_records_its_fields_sorted_and_the_report_names_those_no_rule_reads() {
        let text = "title = \"t\"\nsource = \"s\"\n[craft]\nmass = \"1 kg\"\n[rotors]\ncount = 4\n[sensing]\ngyroscope = true\n";
        let mut claim = parse(text, Format::Toml).unwrap();
        assert_eq!(
            claim.given,
            [
                "craft.mass",
                "rotors.count",
                "sensing.gyroscope",
                "source",
                "title"
            ]
        );
        assert!(unused(&claim).is_empty());
        // A path that no list names (as a field added to the reader but to no rule would be).
        claim.given.insert(0, "craft.colour".to_string());
        assert_eq!(unused(&claim), ["craft.colour"]);
    }
}

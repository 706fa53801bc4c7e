//! Every demo claim gives the verdicts its second comment line states. The
//! expected verdicts were worked out by hand from the scenario (see each
//! sheet's first comment line) before the engine was run on it. A rule the
//! line does not name must find the sheet consistent (so the line names
//! `sheet-consistency` only where the sheet contradicts itself or gives
//! nothing to compare).
//!
//! And the report's `unused` list is true: taking out of a sheet every field
//! the report calls unused changes no finding.

use liftaudit::claim::{self, demo};
use liftaudit::rules;

/// Reads "# Verdict: overall (rule verdict, rule verdict, ...)".
fn expected(text: &str) -> (String, Vec<(String, String)>) {
    let line = text
        .lines()
        .find_map(|l| l.strip_prefix("# Verdict:"))
        .expect("a '# Verdict:' line");
    let (overall, rest) = line
        .trim()
        .split_once(' ')
        .expect("overall verdict then rules");
    let rules = rest
        .trim()
        .trim_start_matches('(')
        .trim_end_matches(')')
        .split(',')
        .map(|pair| {
            let (rule, verdict) = pair.trim().split_once(' ').expect("rule verdict");
            (rule.to_string(), verdict.to_string())
        })
        .collect();
    (overall.to_string(), rules)
}

#[test]
fn every_demo_claim_gives_the_verdicts_its_comment_states() {
    assert!(demo::DEMOS.len() >= 8);
    for d in demo::DEMOS {
        let claim = claim::parse_any(d.text).unwrap_or_else(|e| panic!("{}: {e}", d.name));
        let report = rules::run_all(&claim);
        let (overall, by_rule) = expected(d.text);
        assert_eq!(report.verdict.id(), overall, "{}", d.name);
        for (rule, verdict) in &by_rule {
            let finding = report
                .finding(rule)
                .unwrap_or_else(|| panic!("{}: no finding for {rule}", d.name));
            assert_eq!(finding.verdict.id(), verdict, "{}: {rule}", d.name);
        }
        for f in &report.findings {
            if !by_rule.iter().any(|(rule, _)| rule == f.rule) {
                assert_eq!(
                    f.verdict.id(),
                    "consistent",
                    "{}: {} is not on the Verdict line, so it must be consistent: {}",
                    d.name,
                    f.rule,
                    f.headline
                );
            }
        }
        assert!(!d.shows().is_empty(), "{} says what it shows", d.name);
        for f in &report.findings {
            for fig in &f.figures {
                assert!(fig.value.is_finite(), "{}: {} {}", d.name, f.rule, fig.key);
            }
        }
    }
}

#[test]
fn the_demos_cover_every_verdict_and_trip_every_rule() {
    let reports: Vec<_> = demo::DEMOS
        .iter()
        .map(|d| rules::run_all(&claim::parse_any(d.text).unwrap()))
        .collect();
    for v in liftaudit::report::Verdict::ALL {
        assert!(
            reports.iter().any(|r| r.verdict == v),
            "no demo is {}",
            v.id()
        );
    }
    for rule in rules::REGISTRY {
        assert!(
            reports.iter().any(|r| r
                .finding(rule.id)
                .is_some_and(|f| f.verdict.severity() >= 2)),
            "no demo trips {}",
            rule.id
        );
    }
}

#[test]
fn every_demo_file_on_disk_is_built_in() {
    let dir = std::path::Path::new(env!("CARGO_MANIFEST_DIR")).join("demo-claims");
    for entry in std::fs::read_dir(dir).unwrap() {
        let path = entry.unwrap().path();
        let stem = path.file_stem().unwrap().to_str().unwrap().to_string();
        let d = demo::find(&stem).unwrap_or_else(|| panic!("{stem} is not in demo::DEMOS"));
        assert_eq!(std::fs::read_to_string(&path).unwrap(), d.text);
    }
}

/// Two sheets that between them give every field of the sheet (a preset
/// layout, and rotors placed by hand), with figures that agree.
const EVERY_FIELD: [&str; 2] = [
    r#"title = "Every field, preset layout"
source = "test sheet"
[craft]
mass = "640 g"
size = "180 mm x 180 mm x 50 mm"
[[craft.parts]]
name = "frame and electronics"
mass = "600 g"
[rotors]
count = 4
layout = "quad-x"
arm = "110 mm"
diameter = "5 in"
mount = "tilting"
tilt_range = "10 deg"
height = "20 mm"
motor = "brushless-2204"
drive = "brushless"
max_thrust = "600 g"
max_power = "150 W"
spins = ["cw", "ccw", "cw", "ccw"]
[battery]
chemistry = "lipo"
cells = 4
capacity = "1500 mAh"
mass = "180 g"
max_discharge = "75 C"
[claim]
flight_time = "6 min"
hover_tilt = "5 deg"
hands_free = true
altitude_hold = true
position_hold = true
survives_rotor_failure = 0
[sensing]
gyroscope = true
accelerometer = true
barometer = true
position = "gnss"
loop_rate = "1 kHz"
[conditions]
altitude = "300 m"
temperature = "20 degC"
pressure = "975 hPa"
wind = "3 m/s"
"#,
    r#"title = "Every field, rotors by hand"
[craft]
mass = "600 g"
[rotors]
count = 4
layout = "custom"
diameter = "5 in"
motor = "brushless-2204"
arm = "113 mm"
spins = ["cw", "ccw", "cw", "ccw"]
tilt_range = "20 deg"
[[rotors.at]]
x = "80 mm"
y = "80 mm"
spin = "cw"
[[rotors.at]]
x = "80 mm"
y = "-80 mm"
spin = "ccw"
[[rotors.at]]
x = "-80 mm"
y = "-80 mm"
z = "10 mm"
spin = "cw"
tilt_axis = "y"
tilt_range = "15 deg"
[[rotors.at]]
x = "-80 mm"
y = "80 mm"
spin = "ccw"
"#,
];

#[test]
fn taking_out_the_fields_the_report_calls_unused_changes_no_finding() {
    let sheets = demo::DEMOS
        .iter()
        .map(|d| (d.name, d.text))
        .chain(EVERY_FIELD.iter().map(|t| ("every field", *t)));
    for (name, text) in sheets {
        let claim = claim::parse_any(text).unwrap_or_else(|e| panic!("{name}: {e}"));
        let report = rules::run_all(&claim);
        let mut sheet: toml::Table = toml::from_str(text).unwrap();
        for path in &report.unused {
            match path.split_once('.') {
                Some((table, key)) => {
                    sheet[table].as_table_mut().unwrap().remove(key);
                }
                None => {
                    sheet.remove(path);
                }
            }
        }
        let trimmed = toml::to_string(&sheet).unwrap();
        let without = claim::parse_any(&trimmed)
            .unwrap_or_else(|e| panic!("{name} without {:?}: {e}", report.unused));
        let again = rules::run_all(&without);
        assert_eq!(
            again.findings, report.findings,
            "{name}: taking out {:?} changed a finding",
            report.unused
        );
        assert!(again.unused.is_empty(), "{name}: {:?}", again.unused);
    }
}

#[test]
fn rotors_placed_by_hand_pass_over_the_presets_arm_spins_and_tilt_range() {
    // By hand: each [[rotors.at]] gives its own place and spin, and the mount is
    // fixed, so the sheet's rotors.arm, rotors.spins and rotors.tilt_range go unread.
    let claim = claim::parse_any(EVERY_FIELD[1]).unwrap();
    assert_eq!(
        rules::run_all(&claim).unused,
        ["rotors.arm", "rotors.spins", "rotors.tilt_range"]
    );
}

#[test]
fn a_sheet_that_gives_every_field_records_each_of_them() {
    // By hand: the two sheets above give 38 distinct fields between them.
    let mut given: Vec<String> = EVERY_FIELD
        .iter()
        .flat_map(|t| claim::parse_any(t).unwrap().given)
        .collect();
    given.sort();
    given.dedup();
    assert_eq!(given.len(), 38, "{given:?}");
    for f in ["conditions.pressure", "craft.parts", "rotors.at", "title"] {
        assert!(given.iter().any(|g| g == f), "{f}");
    }
}

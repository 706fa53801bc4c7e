//! The `liftaudit check` command as a user runs it: exit codes, JSON shape,
//! and a clear message naming the field for every kind of bad sheet.

use std::io::Write;
use std::process::{Command, Output, Stdio};

fn liftaudit(args: &[&str], stdin: Option<&str>) -> Output {
    let mut child = Command::new(env!("CARGO_BIN_EXE_liftaudit"))
        .args(args)
        .stdin(Stdio::piped())
        .stdout(Stdio::piped())
        .stderr(Stdio::piped())
        .spawn()
        .expect("the binary runs");
    if let Some(text) = stdin {
        child
            .stdin
            .take()
            .unwrap()
            .write_all(text.as_bytes())
            .unwrap();
    } else {
        drop(child.stdin.take());
    }
    child.wait_with_output().unwrap()
}

fn check_stdin(sheet: &str) -> (i32, String, String) {
    let out = liftaudit(&["check", "-"], Some(sheet));
    (
        out.status.code().unwrap_or(-1),
        String::from_utf8_lossy(&out.stdout).into_owned(),
        String::from_utf8_lossy(&out.stderr).into_owned(),
    )
}

const GOOD: &str = r#"
title = "Test quad"
[craft]
mass = "600 g"
[rotors]
count = 4
diameter = "5 in"
motor = "brushless-2204"
"#;

#[test]
fn exit_codes_follow_the_verdict() {
    // DESIGN: 0 consistent, 1 doubtful, 2 implausible, 3 impossible, 4 not assessed.
    for (demo, code) in [
        ("classroom-quad", 0),
        ("ridge-hover", 1),
        ("hallway-hold", 2),
        ("hover-lamp", 3),
        ("mystery-listing", 4),
    ] {
        let out = liftaudit(&["check", "--demo", demo], None);
        assert_eq!(out.status.code(), Some(code), "{demo}");
    }
}

#[test]
fn json_output_follows_the_report_contract() {
    let out = liftaudit(&["check", "--demo", "hover-lamp", "--format", "json"], None);
    let v: serde_json::Value = serde_json::from_slice(&out.stdout).unwrap();
    assert_eq!(v["schema"], "liftaudit.report/1");
    assert_eq!(v["verdict"], "impossible");
    let findings = v["findings"].as_array().unwrap();
    let rules: Vec<&str> = findings
        .iter()
        .map(|f| f["rule"].as_str().unwrap())
        .collect();
    for id in [
        "thrust-margin",
        "tilt-equilibrium",
        "energy-budget",
        "sensing",
    ] {
        assert!(rules.contains(&id), "{id}");
    }
    for f in findings {
        for key in [
            "verdict",
            "headline",
            "figures",
            "would_take",
            "assumptions",
            "sources",
        ] {
            assert!(f.get(key).is_some(), "{key}");
        }
        for fig in f["figures"].as_array().unwrap() {
            assert!(fig["value"].is_number(), "{fig}");
            if let Some(t) = fig.get("tier") {
                assert!(
                    ["physical-limit", "best-practice", "typical"].contains(&t.as_str().unwrap())
                );
            }
        }
    }
    let keys: Vec<&str> = findings
        .iter()
        .flat_map(|f| f["figures"].as_array().unwrap())
        .map(|f| f["key"].as_str().unwrap())
        .collect();
    for key in [
        "hover_fraction",
        "rotors_needed",
        "horizontal_accel",
        "headwind_needed",
        "endurance",
        "battery_specific_energy",
        "time_to_tip",
        "rank",
    ] {
        assert!(keys.contains(&key), "{key}");
    }
    assert_eq!(v["cautions"].as_array().unwrap().len(), 4);
}

#[test]
fn standard_input_and_json_sheets_are_read() {
    let (code, out, _) = check_stdin(GOOD);
    assert_eq!(code, 4, "{out}"); // no battery, no tilt, no sensors: not assessed
    assert!(out.contains("thrust-margin"));
    let json = r#"{"title": "Test quad", "craft": {"mass": "600 g"},
                   "rotors": {"count": 4, "diameter": "5 in", "motor": "brushless-2204"}}"#;
    let (code, out, _) = check_stdin(json);
    assert_eq!(code, 4, "{out}");
}

#[test]
fn plain_output_to_a_pipe_has_no_colour_codes() {
    let out = liftaudit(&["check", "--demo", "hover-lamp"], None);
    assert!(!String::from_utf8_lossy(&out.stdout).contains('\x1b'));
}

/// Each bad sheet exits 64 and names the field with a reason a newcomer reads.
#[test]
fn bad_sheets_exit_64_naming_the_field() {
    let cases: &[(&str, &str, &str)] = &[
        // (change to the good sheet, field, part of the message)
        (
            "mass = \"600 g\"",
            "mass = \"600 g\"\ncolour = \"red\"",
            "craft.colour: unknown key",
        ),
        (
            "diameter = \"5 in\"",
            "diameter = \"55 g\"",
            "rotors.diameter: expected a length, got '55 g'",
        ),
        (
            "mass = \"600 g\"",
            "mass = \"0 g\"",
            "craft.mass: must be more than zero, got '0 g'",
        ),
        (
            "mass = \"600 g\"",
            "mass = \"-5 g\"",
            "craft.mass: must be more than zero",
        ),
        (
            "mass = \"600 g\"",
            "mass = \"nan g\"",
            "craft.mass: expected a mass",
        ),
        ("mass = \"600 g\"", "mass = \"1e400 g\"", "craft.mass:"),
        (
            "mass = \"600 g\"",
            "mass = \"600\"",
            "craft.mass: '600' has no unit",
        ),
        (
            "mass = \"600 g\"",
            "mass = 600",
            "craft.mass: write the unit too",
        ),
        (
            "mass = \"600 g\"",
            "mass = \"200 kg\"",
            "craft.mass: must be at most 150 kg",
        ),
        (
            "diameter = \"5 in\"",
            "diameter = \"6 m\"",
            "rotors.diameter: must be at most 5 m",
        ),
        (
            "count = 4",
            "count = 0",
            "rotors.count: must be a whole number from 1 to 64, got 0",
        ),
        (
            "count = 4",
            "count = 100",
            "rotors.count: must be a whole number from 1 to 64",
        ),
        (
            "count = 4",
            "count = 2.5",
            "rotors.count: must be a whole number",
        ),
        (
            "motor = \"brushless-2204\"",
            "motor = \"warp-9\"",
            "rotors.motor: 'warp-9' is not a motor class",
        ),
        (
            "motor = \"brushless-2204\"",
            "motor = \"brushless-2204\"\nlayout = \"hex\"",
            "rotors.count: a hex layout has 6 rotors, got 4",
        ),
        ("title = \"Test quad\"", "", "title: is required"),
        ("mass = \"600 g\"", "", "craft.mass: is required"),
        (
            "diameter = \"5 in\"",
            "diameter = \"5 furlong\"",
            "rotors.diameter: unknown unit 'furlong'",
        ),
    ];
    for (from, to, message) in cases {
        assert!(GOOD.contains(from), "{from}");
        let sheet = GOOD.replacen(from, to, 1);
        let (code, _, err) = check_stdin(&sheet);
        assert_eq!(code, 64, "{to}: {err}");
        assert!(err.contains(message), "expected '{message}' in: {err}");
    }
}

#[test]
fn a_missing_section_and_a_wrong_type_name_their_place() {
    let (code, _, err) = check_stdin("title = \"x\"\n[craft]\nmass = \"1 kg\"\n");
    assert_eq!(code, 64);
    assert!(err.contains("rotors: is required"), "{err}");
    let (code, _, err) = check_stdin("title = \"x\"\ncraft = 5\n[rotors]\ncount = 4\n");
    assert_eq!(code, 64);
    assert!(
        err.contains("craft: expected a table, got a whole number"),
        "{err}"
    );
    let sheet = GOOD.replace(
        "count = 4",
        "count = 4\nspins = [\"cw\", \"up\", \"cw\", \"ccw\"]",
    );
    let (_, _, err) = check_stdin(&sheet);
    assert!(
        err.contains("rotors.spins[1]: 'up' is not one of: cw, ccw"),
        "{err}"
    );
}

#[test]
fn syntax_errors_give_line_and_column() {
    let (code, _, err) = check_stdin("title = \"x\"\n[craft\nmass = \"1 kg\"\n");
    assert_eq!(code, 64);
    assert!(err.contains("not valid TOML (line 2, column"), "{err}");
    let (code, _, err) =
        check_stdin("{\n  \"title\": \"x\",\n  \"craft\": {\"mass\": \"1 kg\",}\n}");
    assert_eq!(code, 64);
    assert!(err.contains("not valid JSON (line 3, column"), "{err}");
}

#[test]
fn several_errors_are_all_reported_at_once() {
    let sheet = GOOD
        .replace("mass = \"600 g\"", "mass = \"600 V\"")
        .replace("count = 4", "count = -1");
    let (code, _, err) = check_stdin(&sheet);
    assert_eq!(code, 64);
    assert!(
        err.contains("craft.mass: expected a mass, got '600 V'"),
        "{err}"
    );
    assert!(
        err.contains("rotors.count: must be a whole number from 1 to 64, got -1"),
        "{err}"
    );
}

#[test]
fn a_missing_file_and_no_arguments_are_bad_input() {
    assert_eq!(
        liftaudit(&["check", "/nonexistent/sheet.toml"], None)
            .status
            .code(),
        Some(64)
    );
    assert_eq!(liftaudit(&["check"], None).status.code(), Some(64));
    assert_eq!(
        liftaudit(&["check", "--demo", "no-such-demo"], None)
            .status
            .code(),
        Some(64)
    );
}

#[test]
fn a_gram_thrust_is_read_as_gram_force_and_the_report_says_so() {
    let sheet = GOOD.replace("motor = \"brushless-2204\"", "max_thrust = \"450 g\"");
    let (_, out, _) = check_stdin(&sheet);
    assert!(out.contains("read as gram-force"), "{out}");
}

#[test]
fn a_usage_error_exits_64_and_help_exits_0() {
    // DESIGN: 64 is bad input; 2 means implausible, so clap's 2 is not used.
    for args in [
        &["check", "--format", "yaml", "--demo", "hover-lamp"][..],
        &["check", "--demo"][..],
        &["frobnicate"][..],
        &[][..],
    ] {
        let out = liftaudit(args, None);
        assert_eq!(out.status.code(), Some(64), "{args:?}");
    }
    assert_eq!(liftaudit(&["--help"], None).status.code(), Some(0));
    assert_eq!(liftaudit(&["--version"], None).status.code(), Some(0));
}

#[test]
fn an_endless_input_ends_at_the_body_limit_with_exit_64() {
    let start = std::time::Instant::now();
    let out = liftaudit(&["check", "/dev/zero"], None);
    assert_eq!(out.status.code(), Some(64));
    assert_eq!(
        String::from_utf8_lossy(&out.stderr).trim(),
        "liftaudit check: /dev/zero: longer than 1024 KiB, the most a sheet may be"
    );
    // Reading 1 MiB and stopping; a bound in seconds with room to spare.
    assert!(start.elapsed() < std::time::Duration::from_secs(30));
    // As `yes |` does: more than the limit on standard input; the command
    // stops reading, so the writer may see a broken pipe.
    let mut child = Command::new(env!("CARGO_BIN_EXE_liftaudit"))
        .args(["check", "-"])
        .stdin(Stdio::piped())
        .stdout(Stdio::piped())
        .stderr(Stdio::piped())
        .spawn()
        .unwrap();
    let mut stdin = child.stdin.take().unwrap();
    let writer = std::thread::spawn(move || {
        let line = "y\n".repeat(4096);
        while stdin.write_all(line.as_bytes()).is_ok() {}
    });
    let out = child.wait_with_output().unwrap();
    writer.join().unwrap();
    let (code, err) = (out.status.code(), String::from_utf8_lossy(&out.stderr));
    assert_eq!(code, Some(64));
    assert_eq!(
        err.trim(),
        "liftaudit check: standard input: longer than 1024 KiB, the most a sheet may be"
    );
}

#[test]
fn several_inputs_as_json_are_an_array_in_order_with_a_bad_one_as_its_errors() {
    let dir = std::env::temp_dir().join(format!("liftaudit-cli-{}", std::process::id()));
    std::fs::create_dir_all(&dir).unwrap();
    let good = dir.join("good.toml");
    let bad = dir.join("bad.toml");
    std::fs::write(&good, GOOD).unwrap();
    std::fs::write(&bad, "title = \"x\"\n").unwrap();
    let (good, bad) = (good.to_str().unwrap(), bad.to_str().unwrap());
    let out = liftaudit(&["check", "--format", "json", good, bad, good], None);
    assert_eq!(out.status.code(), Some(64));
    let v: serde_json::Value = serde_json::from_slice(&out.stdout).unwrap();
    let all = v.as_array().unwrap();
    assert_eq!(all.len(), 3);
    assert_eq!(all[0]["schema"], "liftaudit.report/1");
    assert_eq!(all[1]["file"], bad);
    assert_eq!(all[1]["errors"][0]["field"], "craft");
    assert_eq!(all[2]["schema"], "liftaudit.report/1");
    // One input: the report object itself.
    let one = liftaudit(&["check", "--format", "json", good], None);
    let v: serde_json::Value = serde_json::from_slice(&one.stdout).unwrap();
    assert_eq!(v["schema"], "liftaudit.report/1");
    std::fs::remove_dir_all(&dir).ok();
}

//! Every demo claim gives the verdicts its second comment line states. The
//! expected verdicts were worked out by hand from the scenario (see each
//! sheet's first comment line) before the engine was run on it.

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
        for (rule, verdict) in by_rule {
            let finding = report
                .finding(&rule)
                .unwrap_or_else(|| panic!("{}: no finding for {rule}", d.name));
            assert_eq!(finding.verdict.id(), verdict, "{}: {rule}", d.name);
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

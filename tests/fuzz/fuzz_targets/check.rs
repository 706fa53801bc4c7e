//! The whole check: parse (either format), run every rule, render JSON and text.
//! No panic, no endless loop, and no report holds a NaN or an infinity.
#![no_main]

use libfuzzer_sys::fuzz_target;
use liftaudit::{claim, report, rules};

fuzz_target!(|data: &[u8]| {
    let Ok(text) = std::str::from_utf8(data) else {
        return;
    };
    let Ok(claim) = claim::parse_any(text) else {
        return;
    };
    let report = rules::run_all(&claim);
    for finding in &report.findings {
        for figure in &finding.figures {
            assert!(
                figure.value.is_finite(),
                "{} {} is {}",
                finding.rule,
                figure.key,
                figure.value
            );
        }
    }
    let json = report.to_json();
    assert!(!json.contains("null"), "a figure became null in JSON");
    let _ = report::render_text(&report, false);
});

//! Sheet parsing, JSON: any bytes give a claim or field errors, never a panic,
//! and the one-pass reader of plain sheets, where it takes a text, reads the
//! tree serde_json reads.
#![no_main]

use libfuzzer_sys::fuzz_target;
use liftaudit::claim::{self, Format};

fuzz_target!(|data: &[u8]| {
    if let Ok(text) = std::str::from_utf8(data) {
        assert_ne!(claim::json_readers_agree(text), Some(false), "the JSON readers differ");
        let _ = claim::parse(text, Format::Json);
    }
});

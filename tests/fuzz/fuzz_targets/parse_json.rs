//! Sheet parsing, JSON: any bytes give a claim, a syntax error or field
//! errors, never a panic.
#![no_main]

use libfuzzer_sys::fuzz_target;
use liftaudit::claim::{self, Format};

fuzz_target!(|data: &[u8]| {
    if let Ok(text) = std::str::from_utf8(data) {
        let _ = claim::parse(text, Format::Json);
    }
});

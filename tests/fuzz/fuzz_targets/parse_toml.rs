//! Sheet parsing, TOML: any bytes give a claim or field errors, never a panic,
//! and the one-pass reader of plain sheets, where it takes a text, reads the
//! tree the general parser reads.
#![no_main]

use libfuzzer_sys::fuzz_target;
use liftaudit::claim::{self, Format};

fuzz_target!(|data: &[u8]| {
    if let Ok(text) = std::str::from_utf8(data) {
        assert_ne!(claim::toml_readers_agree(text), Some(false), "the TOML readers differ");
        let _ = claim::parse(text, Format::Toml);
    }
});

//! Finding the next byte to escape in a text, sixteen bytes at a time.
//!
//! The report is mostly text, and both of its renderings escape it: JSON
//! (RFC 8259 section 7) and HTML. Looking at each byte on its own, as
//! serde_json and askama do, was the larger part of writing a report and of
//! rendering a verdict page (callgrind, `render-json-compact` and
//! `render-page`). On x86-64 the run before the next such byte is found
//! with SSE2 compares, sixteen bytes to an instruction; elsewhere byte by
//! byte. The same JSON class ends a string in the plain JSON sheet reader
//! (`claim::plain_json`): a string holds none of those bytes as they are.

use std::fmt;

/// The bytes a rendering must escape.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Escapes {
    /// Control bytes, `"` and `\` (RFC 8259 section 7).
    Json,
    /// `"`, `&`, `'`, `<` and `>`, the five askama escapes.
    Html,
}

impl Escapes {
    pub fn needs(self, b: u8) -> bool {
        match self {
            Escapes::Json => b < 0x20 || b == b'"' || b == b'\\',
            Escapes::Html => matches!(b, b'"' | b'&' | b'\'' | b'<' | b'>'),
        }
    }

    /// Writes `text` to `out` with each byte this class escapes replaced by
    /// `entity(byte)`, copying the runs between them whole. The bytes of
    /// both classes are ASCII, so every cut falls on a character boundary.
    pub fn write<W: fmt::Write + ?Sized>(
        self,
        out: &mut W,
        text: &str,
        entity: impl Fn(u8) -> &'static str,
    ) -> fmt::Result {
        let mut rest = text;
        loop {
            let run = self.clean_run(rest.as_bytes());
            out.write_str(&rest[..run])?;
            let Some(&b) = rest.as_bytes().get(run) else {
                return Ok(());
            };
            out.write_str(entity(b))?;
            rest = &rest[run + 1..];
        }
    }

    /// The length of the run at the start of `bytes` with nothing to escape.
    pub fn clean_run(self, bytes: &[u8]) -> usize {
        #[cfg(target_arch = "x86_64")]
        {
            // SAFETY: SSE2 is part of the x86-64 baseline; every x86-64 CPU has it.
            unsafe { self.clean_run_sse2(bytes) }
        }
        #[cfg(not(target_arch = "x86_64"))]
        {
            self.clean_run_bytes(bytes)
        }
    }

    /// Byte by byte: the run elsewhere, and the reference in the tests.
    #[cfg(any(test, not(target_arch = "x86_64")))]
    fn clean_run_bytes(self, bytes: &[u8]) -> usize {
        bytes
            .iter()
            .position(|&b| self.needs(b))
            .unwrap_or(bytes.len())
    }

    #[cfg(target_arch = "x86_64")]
    #[target_feature(enable = "sse2")]
    unsafe fn clean_run_sse2(self, bytes: &[u8]) -> usize {
        use std::arch::x86_64::{_mm_loadu_si128, _mm_movemask_epi8};
        let mut i = 0;
        while i + 16 <= bytes.len() {
            // SAFETY: i + 16 <= len, so all sixteen bytes read lie in the
            // slice; the unaligned load takes any address.
            let v = unsafe { _mm_loadu_si128(bytes.as_ptr().add(i).cast()) };
            let mask = _mm_movemask_epi8(self.marks(v)) as u32;
            if mask != 0 {
                return i + mask.trailing_zeros() as usize;
            }
            i += 16;
        }
        let left = bytes.len() - i;
        if left == 0 {
            return i;
        }
        if i == 0 {
            // Shorter than sixteen bytes: into a block padded with a letter,
            // which no rendering escapes, by two overlapping fixed-size
            // copies (a copy of variable length is a call to memcpy).
            // SAFETY: the padded block is sixteen bytes.
            let v = unsafe { _mm_loadu_si128(padded(bytes).as_ptr().cast()) };
            let mask = _mm_movemask_epi8(self.marks(v)) as u32;
            return if mask == 0 {
                bytes.len()
            } else {
                mask.trailing_zeros() as usize
            };
        }
        // The last few bytes: the sixteen that end the text, of which the
        // first 16 - left were clean above, so their lanes are dropped.
        // SAFETY: i >= 16 here, so len - 16 >= 0 and the sixteen bytes read
        // end at the end of the slice.
        let v = unsafe { _mm_loadu_si128(bytes.as_ptr().add(bytes.len() - 16).cast()) };
        let mask = (_mm_movemask_epi8(self.marks(v)) as u32) >> (16 - left);
        if mask == 0 {
            bytes.len()
        } else {
            i + mask.trailing_zeros() as usize
        }
    }

    /// 0xff in each lane holding a byte to escape.
    #[cfg(target_arch = "x86_64")]
    #[target_feature(enable = "sse2")]
    fn marks(self, v: std::arch::x86_64::__m128i) -> std::arch::x86_64::__m128i {
        use std::arch::x86_64::{_mm_cmpeq_epi8, _mm_max_epu8, _mm_or_si128, _mm_set1_epi8};
        let eq = |b: u8| _mm_cmpeq_epi8(v, _mm_set1_epi8(b as i8));
        match self {
            Escapes::Json => {
                // v <= 0x1f exactly where max(v, 0x1f) == 0x1f (unsigned).
                let low = _mm_set1_epi8(0x1f);
                let control = _mm_cmpeq_epi8(_mm_max_epu8(v, low), low);
                _mm_or_si128(control, _mm_or_si128(eq(b'"'), eq(b'\\')))
            }
            Escapes::Html => _mm_or_si128(
                _mm_or_si128(eq(b'"'), eq(b'&')),
                _mm_or_si128(eq(b'\''), _mm_or_si128(eq(b'<'), eq(b'>'))),
            ),
        }
    }
}

/// `bytes` (fewer than sixteen) at the start of sixteen, the rest `a`.
#[cfg(target_arch = "x86_64")]
fn padded(bytes: &[u8]) -> [u8; 16] {
    let mut block = [b'a'; 16];
    let n = bytes.len();
    // The first and the last k bytes cover all n when k <= n <= 2k.
    let mut copy = |k: usize| {
        block[..k].copy_from_slice(&bytes[..k]);
        block[n - k..n].copy_from_slice(&bytes[n - k..]);
    };
    match n {
        8.. => copy(8),
        4..=7 => copy(4),
        2..=3 => copy(2),
        1 => block[0] = bytes[0],
        0 => {}
    }
    block
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn the_run_ends_at_each_byte_to_escape_at_every_offset() {
        // Every length up to three sixteen-byte blocks (the short texts, the
        // whole blocks and the overlapping tail), every offset within it.
        for class in [Escapes::Json, Escapes::Html] {
            for b in 0..=255u8 {
                for len in 1..=48 {
                    for at in 0..len {
                        let mut text = vec![b'a'; len];
                        text[at] = b;
                        let expected = if class.needs(b) { at } else { len };
                        assert_eq!(
                            class.clean_run(&text),
                            expected,
                            "{class:?} {b:#04x} at {at} of {len}"
                        );
                        assert_eq!(class.clean_run_bytes(&text), expected);
                    }
                }
            }
            assert_eq!(class.clean_run(b""), 0);
        }
    }

    #[test]
    fn the_classes_are_the_escapes_of_their_standards() {
        // RFC 8259 section 7: U+0000 to U+001F, quotation mark, reverse solidus.
        let json: Vec<u8> = (0..=255u8).filter(|&b| Escapes::Json.needs(b)).collect();
        let mut expected: Vec<u8> = (0..0x20).collect();
        expected.extend([b'"', b'\\']);
        expected.sort_unstable();
        assert_eq!(json, expected);
        let html: Vec<u8> = (0..=255u8).filter(|&b| Escapes::Html.needs(b)).collect();
        assert_eq!(html, b"\"&'<>");
    }
}

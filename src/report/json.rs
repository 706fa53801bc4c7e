//! The report as the API's compact JSON, written by hand for speed: byte for
//! byte what `serde_json` writes from the derived `Serialize`, as the tests
//! check. The indented form, for the files people open, is serde_json's own
//! ([`Report::to_json`]).
//!
//! serde_json looks at every byte of a string on its own before copying it,
//! and the report is mostly text (hover-lamp: 250 strings, 8 kB of 12 kB).
//! Here the runs with nothing to escape are found sixteen bytes at a time
//! ([`crate::scan`]) and copied whole; the punctuation and member names,
//! whose places the contract fixes, are copied as whole constant pieces
//! (`,"label":"`), and our own words (ids, keys, units, fixed labels,
//! cautions) without a look; a string's quotes go with the pieces beside
//! it. Numbers are written by zmij, the writer serde_json's formatter calls,
//! so they keep its shortest round-trip form.

use std::borrow::Cow;
use std::mem::MaybeUninit;

use super::{Figure, Finding, Report};
use crate::scan::Escapes;

/// The report as one line of JSON, for clients that parse it.
pub fn compact(report: &Report) -> Vec<u8> {
    let mut out = Out::with_room(16 * 1024);
    out.report(report);
    out.finish()
}

impl Out {
    // The quotes around a string go with the constant pieces beside it
    // (`","headline":"`), so that a string costs its own bytes and no more.
    fn report(&mut self, report: &Report) {
        self.put(b"{\"schema\":\"");
        self.put(ours(report.schema));
        self.put(b"\",\"title\":\"");
        self.text(&report.title);
        self.put(b"\",\"verdict\":\"");
        self.put(ours(report.verdict.id()));
        self.put(b"\",\"findings\":");
        self.list(&report.findings, Out::finding);
        // The cautions are ours (report::CAUTIONS), held escape-free by a test.
        self.put(b",\"cautions\":");
        self.strings(report.cautions, |out, c| out.put(ours(c)));
        self.put(b",\"engine\":\"");
        self.put(ours(report.engine));
        self.put(b"\"}");
    }

    fn finding(&mut self, f: &Finding) {
        self.put(b"{\"rule\":\"");
        self.put(ours(f.rule));
        self.put(b"\",\"verdict\":\"");
        self.put(ours(f.verdict.id()));
        self.put(b"\",\"headline\":\"");
        self.text(&f.headline);
        self.put(b"\",\"figures\":");
        self.list(&f.figures, Out::figure);
        self.put(b",\"would_take\":\"");
        self.text(&f.would_take);
        self.put(b"\",\"assumptions\":");
        self.strings(&f.assumptions, |out, a| out.text(a));
        self.put(b",\"sources\":");
        self.strings(f.sources, |out, id| out.put(ours(id)));
        self.byte(b'}');
    }

    fn figure(&mut self, g: &Figure) {
        self.put(b"{\"key\":\"");
        self.put(ours(g.key));
        self.put(b"\",\"label\":\"");
        match &g.label {
            // A borrowed label is 'static: one of the rules' fixed words.
            Cow::Borrowed(label) => self.put(ours(label)),
            Cow::Owned(label) => self.text(label),
        }
        if let Some(t) = g.tier {
            self.put(b"\",\"tier\":\"");
            self.put(ours(t.id()));
        }
        self.put(b"\",\"value\":");
        self.number(g.value);
        self.put(b",\"unit\":\"");
        self.put(ours(g.unit));
        self.put(b"\"}");
    }

    /// A JSON array, `[a,b]`.
    fn list<T>(&mut self, items: &[T], mut each: impl FnMut(&mut Out, &T)) {
        self.byte(b'[');
        for (i, item) in items.iter().enumerate() {
            if i > 0 {
                self.byte(b',');
            }
            each(self, item);
        }
        self.byte(b']');
    }

    /// A JSON array of strings, `["a","b"]`, each string's inside written by
    /// `each` and the quotes with the punctuation between them.
    fn strings<T>(&mut self, items: &[T], mut each: impl FnMut(&mut Out, &T)) {
        let Some((first, rest)) = items.split_first() else {
            self.put(b"[]");
            return;
        };
        self.put(b"[\"");
        each(self, first);
        for item in rest {
            self.put(b"\",\"");
            each(self, item);
        }
        self.put(b"\"]");
    }

    /// A number as serde_json writes an f64: a finite one in the shortest
    /// form that reads back the same, by the same writer (zmij, whose
    /// `format_finite` serde_json's formatter calls), a non-finite one as null.
    fn number(&mut self, v: f64) {
        if v.is_finite() {
            self.put(zmij::Buffer::new().format_finite(v).as_bytes());
        } else {
            self.put(b"null");
        }
    }

    /// The inside of a JSON string (RFC 8259 section 7), its quotes left to
    /// the caller, with serde_json's escapes: the short forms for \b \t \n
    /// \f \r, `\u00XX` for other control bytes. The runs between them are
    /// found by [`Escapes::clean_run`] and copied whole.
    fn text(&mut self, s: &str) {
        let mut rest = s.as_bytes();
        loop {
            let run = Escapes::Json.clean_run(rest);
            self.put(&rest[..run]);
            let Some(&b) = rest.get(run) else { break };
            match escape(b) {
                Escape::Short(c) => self.put(&[b'\\', c]),
                Escape::Unicode => {
                    const HEX: &[u8; 16] = b"0123456789abcdef";
                    self.put(b"\\u00");
                    self.put(&[HEX[usize::from(b >> 4)], HEX[usize::from(b & 0xf)]]);
                }
            }
            rest = &rest[run + 1..];
        }
    }
}

/// One of our own words with nothing to escape: a verdict's or tier's id, the
/// schema, the engine, the cautions, and the rule ids, figure keys, fixed
/// labels, units and source ids the rules write. The tests hold each to that,
/// and the debug build asserts it of every one written.
#[inline(always)]
fn ours(s: &'static str) -> &'static [u8] {
    debug_assert!(s.bytes().all(|b| !Escapes::Json.needs(b)), "{s}");
    s.as_bytes()
}

/// The text being written: a buffer's capacity and a cursor into it. A
/// report is some 700 pieces, most under sixteen bytes (punctuation, names,
/// ids, numbers); pushed onto a `Vec` each would be a capacity check and a
/// call to memcpy. Here a short piece is two overlapping moves into room the
/// buffer already has, and only a long one calls memcpy.
///
/// The room is the `Vec`'s spare capacity, written as `MaybeUninit` bytes,
/// rather than a zeroed buffer: zeroing 16 KiB that the report then
/// overwrites took about a microsecond of each API request (perf under
/// `tests/load.sh`; callgrind, which counts each step of a string store,
/// put it at 16k of the route's 163k instructions). The invariant that makes
/// the two `set_len` below sound: every piece writes each of the bytes it
/// moves the cursor past, so the first `len` bytes of the capacity are always
/// written. The `Vec`'s own length stays 0 until then, so that its spare
/// capacity is the whole buffer.
struct Out {
    buf: Vec<u8>,
    len: usize,
}

impl Out {
    fn with_room(room: usize) -> Out {
        Out {
            buf: Vec::with_capacity(room),
            len: 0,
        }
    }

    fn capacity(&self) -> usize {
        self.buf.capacity()
    }

    /// The next `n` bytes of the buffer, which is grown if it lacks them;
    /// the cursor moves past them, and the caller writes every one.
    #[inline(always)]
    fn room(&mut self, n: usize) -> &mut [MaybeUninit<u8>] {
        if self.capacity() - self.len < n {
            self.grow(n);
        }
        let at = self.len;
        self.len += n;
        &mut self.buf.spare_capacity_mut()[at..at + n]
    }

    #[cold]
    #[inline(never)]
    fn grow(&mut self, n: usize) {
        let want = (self.len + n + SHORT).max(2 * self.capacity());
        // SAFETY: the first `len` bytes are written (see `Out`), so the `Vec`
        // may own them while it moves them to the larger buffer.
        unsafe { self.buf.set_len(self.len) };
        self.buf.reserve_exact(want - self.len);
        // Length 0 again, so that the spare capacity is the whole buffer;
        // the bytes written stay where they are.
        self.buf.clear();
    }

    #[inline(always)]
    fn byte(&mut self, b: u8) {
        self.room(1)[0].write(b);
    }

    /// Copies `s`; up to [`SHORT`] bytes as two moves of a power of two that
    /// overlap in the middle (where the buffer has `SHORT` bytes of room past
    /// the cursor for them), longer ones with memcpy. Either way every byte
    /// of `s` is written before the cursor passes it.
    #[inline(always)]
    fn put(&mut self, s: &[u8]) {
        let n = s.len();
        if n > SHORT || self.capacity() - self.len < SHORT {
            self.room(n).write_copy_of_slice(s);
            return;
        }
        let at = self.len;
        let dst = &mut self.buf.spare_capacity_mut()[at..at + SHORT];
        if n >= 16 {
            dst[..16].write_copy_of_slice(&s[..16]);
            dst[n - 16..n].write_copy_of_slice(&s[n - 16..]);
        } else if n >= 8 {
            dst[..8].write_copy_of_slice(&s[..8]);
            dst[n - 8..n].write_copy_of_slice(&s[n - 8..]);
        } else if n >= 4 {
            dst[..4].write_copy_of_slice(&s[..4]);
            dst[n - 4..n].write_copy_of_slice(&s[n - 4..]);
        } else {
            for (d, &b) in dst.iter_mut().zip(s) {
                d.write(b);
            }
        }
        self.len = at + n;
    }

    fn finish(mut self) -> Vec<u8> {
        // SAFETY: the first `len` bytes are written (see `Out`).
        unsafe { self.buf.set_len(self.len) };
        self.buf
    }
}

/// The longest piece [`Out::put`] copies without memcpy.
const SHORT: usize = 32;

enum Escape {
    Short(u8),
    Unicode,
}

/// How serde_json writes `b`, one of the bytes [`Escapes::Json`] escapes
/// (a control byte without a short form gets `\u00XX`).
fn escape(b: u8) -> Escape {
    match b {
        b'"' => Escape::Short(b'"'),
        b'\\' => Escape::Short(b'\\'),
        0x08 => Escape::Short(b'b'),
        b'\t' => Escape::Short(b't'),
        b'\n' => Escape::Short(b'n'),
        0x0c => Escape::Short(b'f'),
        b'\r' => Escape::Short(b'r'),
        _ => Escape::Unicode,
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::report::{Tier, Verdict};

    fn report_with(text: &str) -> Report {
        let figure = |tier| Figure {
            key: "k",
            label: text.to_string().into(),
            tier,
            value: 0.1 + 0.2,
            unit: "N",
        };
        let finding = Finding {
            rule: "r",
            verdict: Verdict::Doubtful,
            headline: text.to_string(),
            figures: vec![figure(Some(Tier::Typical)), figure(None)],
            would_take: String::new(),
            assumptions: vec![text.to_string(), String::new()],
            sources: &[],
        };
        Report::new(text.to_string(), vec![finding.clone(), finding])
    }

    #[test]
    fn numbers_and_lists_of_every_length_are_written_as_serde_json_writes_them() {
        // zmij is the float writer serde_json calls; serde_json's own output
        // is the reference for each value, including the ones a report never
        // holds (non-finite, written as null), and for string lists of none,
        // one and several items around them.
        let values = [
            0.0,
            -0.0,
            1.0,
            6.0,
            -13.0,
            0.1 + 0.2,
            1.0 / 3.0,
            2.5e-8,
            1e15,
            1e16,
            1.7976931348623157e308,
            5e-324,
            f64::NAN,
            f64::INFINITY,
            f64::NEG_INFINITY,
        ];
        let words = ["a", "b\"c", "d\ne"].map(String::from);
        let sources: [&'static [&'static str]; 3] = [&[], &["isa"], &["isa", "momentum-theory"]];
        let findings = (0..=3)
            .map(|n| Finding {
                rule: "r",
                verdict: Verdict::Consistent,
                headline: words[..n.min(3)].concat(),
                figures: values
                    .iter()
                    .enumerate()
                    .map(|(i, &value)| Figure {
                        key: "k",
                        label: if i % 2 == 0 {
                            Cow::Borrowed("fixed words")
                        } else {
                            Cow::Owned(words[i % 3].clone())
                        },
                        tier: [None, Some(Tier::BestPractice)][i % 2],
                        value,
                        unit: "m/s^2",
                    })
                    .take(n * 5)
                    .collect(),
                would_take: String::new(),
                assumptions: words[..n.min(3)].to_vec(),
                sources: sources[n % 3],
            })
            .collect();
        let r = Report::new("t".into(), findings);
        assert_eq!(
            String::from_utf8(compact(&r)).unwrap(),
            serde_json::to_string(&r).unwrap()
        );
    }

    #[test]
    fn the_strings_written_without_a_look_need_no_escape() {
        let plain = [super::super::SCHEMA, super::super::ENGINE]
            .into_iter()
            .chain(Verdict::ALL.map(Verdict::id))
            .chain(Tier::ALL.map(Tier::id))
            .chain(super::super::CAUTIONS);
        for s in plain {
            assert_eq!(Escapes::Json.clean_run(s.as_bytes()), s.len(), "{s}");
        }
    }

    #[test]
    fn the_ids_keys_and_units_of_every_report_need_no_escape() {
        // Figure keys follow the contract's pattern ^[a-z0-9]+(_[a-z0-9]+)*$
        // (DESIGN "Report v1"); units, ids and fixed labels are the rules' own words. The
        // debug build asserts the same of every report any test writes.
        let key_pattern = |k: &str| {
            !k.is_empty()
                && k.split('_').all(|part| {
                    !part.is_empty()
                        && part
                            .bytes()
                            .all(|b| b.is_ascii_lowercase() || b.is_ascii_digit())
                })
        };
        let sources: Vec<&str> = crate::sources::SOURCES.iter().map(|s| s.id).collect();
        for d in crate::claim::demo::DEMOS {
            let report = crate::rules::run_all(&crate::claim::parse_any(d.text).unwrap());
            for f in &report.findings {
                assert_eq!(Escapes::Json.clean_run(f.rule.as_bytes()), f.rule.len());
                for id in f.sources {
                    assert!(sources.contains(id), "{id}");
                    assert_eq!(Escapes::Json.clean_run(id.as_bytes()), id.len(), "{id}");
                }
                for g in &f.figures {
                    assert!(key_pattern(g.key), "{}", g.key);
                    assert_eq!(Escapes::Json.clean_run(g.unit.as_bytes()), g.unit.len());
                    if let Cow::Borrowed(label) = g.label {
                        assert_eq!(Escapes::Json.clean_run(label.as_bytes()), label.len());
                    }
                }
            }
        }
        for s in crate::sources::SOURCES {
            assert_eq!(
                Escapes::Json.clean_run(s.id.as_bytes()),
                s.id.len(),
                "{}",
                s.id
            );
        }
    }

    #[test]
    fn the_compact_form_is_what_serde_json_writes_for_every_escape() {
        // RFC 8259 section 7 escapes, at every offset within a word,
        // next to multi-byte UTF-8.
        let tricky = "\"\\\u{8}\t\n\u{c}\r\u{0}\u{1f}\u{7f}é→😀/";
        for pad in 0..=17 {
            for c in tricky.chars() {
                let text = format!("{}{c}{}", "a".repeat(pad), "b".repeat(18 - pad));
                let r = report_with(&text);
                assert_eq!(
                    String::from_utf8(compact(&r)).unwrap(),
                    serde_json::to_string(&r).unwrap(),
                    "{text:?}"
                );
            }
        }
    }

    #[test]
    fn a_buffer_that_starts_too_small_grows_to_the_same_text() {
        // Every text length from empty to past the short-copy bound, into a
        // buffer of one byte, so that each piece lands on the growing path;
        // serde_json's own rendering is the reference.
        for n in 0..=2 * SHORT + 3 {
            let r = report_with(&"x".repeat(n));
            let mut out = Out::with_room(1);
            out.report(&r);
            assert_eq!(
                String::from_utf8(out.finish()).unwrap(),
                serde_json::to_string(&r).unwrap()
            );
        }
    }
}

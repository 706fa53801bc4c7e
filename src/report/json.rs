//! The report as JSON text, written by hand for speed: byte for byte what
//! `serde_json` writes from the derived `Serialize` (compact, or with its
//! two-space indentation), as the tests check.
//!
//! serde_json looks at every byte of a string on its own before copying it,
//! and the report is mostly text (hover-lamp: 250 strings, 8 kB of 12 kB).
//! Here the runs with nothing to escape are found sixteen bytes at a time
//! ([`super::scan`]) and copied whole, and member names, which are ours, are
//! copied without a look. Numbers are still written by serde_json, so they
//! keep its shortest round-trip form.

use serde::Serialize;

use super::scan::Escapes;
use super::{Figure, Finding, Report};

/// The report as one line of JSON, for clients that parse it.
pub fn compact(report: &Report) -> Vec<u8> {
    write(report, false)
}

/// The report indented two spaces per level, for files people open.
pub fn indented(report: &Report) -> Vec<u8> {
    write(report, true)
}

fn write(report: &Report, pretty: bool) -> Vec<u8> {
    let mut w = Writer {
        out: Vec::with_capacity(if pretty { 24 * 1024 } else { 16 * 1024 }),
        pretty,
        depth: 0,
        first: true,
    };
    w.open(b'{');
    w.key("schema");
    w.plain(report.schema);
    w.key("title");
    w.str(&report.title);
    w.key("verdict");
    w.plain(report.verdict.id());
    w.key("findings");
    w.open(b'[');
    for f in &report.findings {
        w.item();
        finding(&mut w, f);
    }
    w.close(b']');
    w.key("cautions");
    w.strings(report.cautions.iter().copied());
    w.key("engine");
    w.plain(report.engine);
    w.close(b'}');
    w.out
}

fn finding(w: &mut Writer, f: &Finding) {
    w.open(b'{');
    w.key("rule");
    w.plain(f.rule);
    w.key("verdict");
    w.plain(f.verdict.id());
    w.key("headline");
    w.str(&f.headline);
    w.key("figures");
    w.open(b'[');
    for g in &f.figures {
        w.item();
        figure(w, g);
    }
    w.close(b']');
    w.key("would_take");
    w.str(&f.would_take);
    w.key("assumptions");
    w.strings(f.assumptions.iter().map(String::as_str));
    w.key("sources");
    w.open(b'[');
    for id in &f.sources {
        w.item();
        w.plain(id);
    }
    w.close(b']');
    w.close(b'}');
}

fn figure(w: &mut Writer, g: &Figure) {
    w.open(b'{');
    w.key("key");
    w.plain(g.key);
    w.key("label");
    w.str(&g.label);
    if let Some(t) = g.tier {
        w.key("tier");
        w.plain(t.id());
    }
    w.key("value");
    w.number(g.value);
    w.key("unit");
    w.plain(g.unit);
    w.close(b'}');
}

/// Punctuation and indentation as serde_json's compact and pretty
/// formatters place them.
struct Writer {
    out: Vec<u8>,
    pretty: bool,
    depth: usize,
    /// No member has been written since the last `{` or `[`.
    first: bool,
}

impl Writer {
    fn open(&mut self, bracket: u8) {
        self.out.push(bracket);
        self.depth += 1;
        self.first = true;
    }

    fn close(&mut self, bracket: u8) {
        self.depth -= 1;
        if !self.first {
            self.newline();
        }
        self.out.push(bracket);
        self.first = false;
    }

    /// Before an array element: the comma and line break.
    #[inline(always)]
    fn item(&mut self) {
        if !self.first {
            self.out.push(b',');
        }
        self.first = false;
        self.newline();
    }

    /// A member name: one of the contract's field names, which hold no
    /// character that needs escaping. Inlined, so that each name is a
    /// constant and its copy a few moves rather than a call to memcpy.
    #[inline(always)]
    fn key(&mut self, key: &'static str) {
        debug_assert!(key.bytes().all(|b| !Escapes::Json.needs(b)), "{key}");
        self.item();
        self.out.push(b'"');
        self.out.extend_from_slice(key.as_bytes());
        self.out
            .extend_from_slice(if self.pretty { b"\": " } else { b"\":" });
    }

    fn newline(&mut self) {
        if self.pretty {
            self.out.push(b'\n');
            self.out.resize(self.out.len() + 2 * self.depth, b' ');
        }
    }

    fn strings<'s>(&mut self, items: impl Iterator<Item = &'s str>) {
        self.open(b'[');
        for s in items {
            self.item();
            self.str(s);
        }
        self.close(b']');
    }

    fn number(&mut self, v: f64) {
        // serde_json writes a finite f64 in its shortest round-trip form and
        // a non-finite one as null; writing into a Vec cannot fail.
        let _ = v.serialize(&mut serde_json::Serializer::new(&mut self.out));
    }

    /// A string of ours with nothing to escape (a verdict's or tier's id,
    /// the schema, the engine, and the rule ids, figure keys, units and
    /// source ids the rules write: the tests hold each to that), copied
    /// without a look.
    #[inline(always)]
    fn plain(&mut self, s: &'static str) {
        debug_assert!(s.bytes().all(|b| !Escapes::Json.needs(b)), "{s}");
        self.out.push(b'"');
        self.out.extend_from_slice(s.as_bytes());
        self.out.push(b'"');
    }

    /// A JSON string (RFC 8259 section 7) with serde_json's escapes: the
    /// short forms for \b \t \n \f \r, `\u00XX` for other control bytes.
    /// The runs between them are found by [`Escapes::clean_run`] and copied whole.
    fn str(&mut self, s: &str) {
        let mut rest = s.as_bytes();
        self.out.reserve(rest.len() + 2);
        self.out.push(b'"');
        loop {
            let run = Escapes::Json.clean_run(rest);
            self.out.extend_from_slice(&rest[..run]);
            let Some(&b) = rest.get(run) else { break };
            self.escaped(escape(b), b);
            rest = &rest[run + 1..];
        }
        self.out.push(b'"');
    }

    fn escaped(&mut self, escape: Escape, b: u8) {
        match escape {
            Escape::Short(c) => self.out.extend_from_slice(&[b'\\', c]),
            Escape::Unicode => {
                const HEX: &[u8; 16] = b"0123456789abcdef";
                self.out.extend_from_slice(b"\\u00");
                self.out.push(HEX[usize::from(b >> 4)]);
                self.out.push(HEX[usize::from(b & 0xf)]);
            }
        }
    }
}

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
            sources: Vec::new(),
        };
        Report::new(text.to_string(), vec![finding.clone(), finding])
    }

    #[test]
    fn the_strings_written_without_a_look_need_no_escape() {
        let plain = [super::super::SCHEMA, super::super::ENGINE]
            .into_iter()
            .chain(Verdict::ALL.map(Verdict::id))
            .chain(Tier::ALL.map(Tier::id));
        for s in plain {
            assert_eq!(Escapes::Json.clean_run(s.as_bytes()), s.len(), "{s}");
        }
    }

    #[test]
    fn the_ids_keys_and_units_of_every_report_need_no_escape() {
        // Figure keys follow the contract's pattern ^[a-z0-9]+(_[a-z0-9]+)*$
        // (DESIGN "Report v1"); units and ids are the rules' own words. The
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
                for id in &f.sources {
                    assert!(sources.contains(id), "{id}");
                    assert_eq!(Escapes::Json.clean_run(id.as_bytes()), id.len(), "{id}");
                }
                for g in &f.figures {
                    assert!(key_pattern(g.key), "{}", g.key);
                    assert_eq!(Escapes::Json.clean_run(g.unit.as_bytes()), g.unit.len());
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
    fn both_forms_are_what_serde_json_writes_for_every_escape() {
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
                assert_eq!(
                    String::from_utf8(indented(&r)).unwrap(),
                    serde_json::to_string_pretty(&r).unwrap(),
                    "{text:?}"
                );
            }
        }
    }
}

//! Sentences for people, written straight into one buffer.
//!
//! `say!("It weighs ", Sig3(g), " g on ", n, " rotors.")` writes what
//! `format!("It weighs {} g on {n} rotors.", Sig3(g))` writes, byte for byte,
//! without going through `core::fmt`: the buffer is sized once from the
//! pieces, text is copied as it is, and numbers are written by the digit
//! writers below. A check writes about forty such sentences, and `format!`
//! was more than half of its instructions (callgrind on `cargo bench`).

use std::borrow::Cow;
use std::fmt::Write as _;

use super::numbers::{push_fixed, push_tenths, sig3_places, Fixed, Sig3, Tenths};
use crate::catalog::Basis;

/// One piece of a sentence: text as it is, or a number in its words.
pub trait Piece {
    /// The bytes it takes, or a generous guess for a number, to size the buffer.
    fn size(&self) -> usize;
    fn push_to(&self, out: &mut String);
}

/// The pieces of a sentence, nested as `(first, (second, ... ()))` by [`say!`].
pub trait Pieces {
    fn size(&self) -> usize;
    fn push_to(&self, out: &mut String);
}

impl Pieces for () {
    fn size(&self) -> usize {
        0
    }
    fn push_to(&self, _: &mut String) {}
}

// Inlined all the way down, so that each literal piece is a copy of known
// length (a few moves) rather than a call to memcpy.
impl<A: Piece, B: Pieces> Pieces for (A, B) {
    #[inline(always)]
    fn size(&self) -> usize {
        self.0.size() + self.1.size()
    }
    #[inline(always)]
    fn push_to(&self, out: &mut String) {
        self.0.push_to(out);
        self.1.push_to(out);
    }
}

/// The sentence of `pieces`, in a buffer allocated once.
pub fn text(pieces: impl Pieces) -> String {
    let mut out = String::with_capacity(pieces.size());
    pieces.push_to(&mut out);
    out
}

/// Appends `pieces` to `out`, growing it at most once.
#[inline(always)]
pub fn append(out: &mut String, pieces: impl Pieces) {
    out.reserve(pieces.size());
    pieces.push_to(out);
}

/// `say!(piece, ...)`: the pieces written one after the other into a new
/// `String`; see the module documentation.
macro_rules! say {
    ($($piece:expr),+ $(,)?) => {
        $crate::report::say::text($crate::report::say::say!(@nest $($piece),+))
    };
    (@nest $first:expr $(, $rest:expr)*) => {
        ($first, $crate::report::say::say!(@nest $($rest),*))
    };
    (@nest) => {
        ()
    };
}
pub(crate) use say;

/// `say_to!(out, piece, ...)`: [`say!`] appended to the `String` `out`.
macro_rules! say_to {
    ($out:expr, $($piece:expr),+ $(,)?) => {
        $crate::report::say::append($out, $crate::report::say::say!(@nest $($piece),+))
    };
}
pub(crate) use say_to;

macro_rules! text_piece {
    ($($t:ty),+) => {$(
        impl Piece for $t {
            #[inline(always)]
            fn size(&self) -> usize {
                self.len()
            }
            #[inline(always)]
            fn push_to(&self, out: &mut String) {
                out.push_str(self);
            }
        }
    )+};
}
text_piece!(str, String, Cow<'_, str>);

impl Piece for char {
    fn size(&self) -> usize {
        self.len_utf8()
    }
    fn push_to(&self, out: &mut String) {
        out.push(*self);
    }
}

impl<T: Piece + ?Sized> Piece for &T {
    #[inline(always)]
    fn size(&self) -> usize {
        (**self).size()
    }
    #[inline(always)]
    fn push_to(&self, out: &mut String) {
        (**self).push_to(out);
    }
}

/// As [`Basis::describe`] writes it.
impl Piece for Basis {
    fn size(&self) -> usize {
        let (kind, note) = self.parts();
        kind.len() + note.len()
    }
    fn push_to(&self, out: &mut String) {
        let (kind, note) = self.parts();
        out.push_str(kind);
        out.push_str(note);
    }
}

/// Nothing when there is none: an optional phrase.
impl<P: Piece> Piece for Option<P> {
    fn size(&self) -> usize {
        self.as_ref().map_or(0, Piece::size)
    }
    fn push_to(&self, out: &mut String) {
        if let Some(piece) = self {
            piece.push_to(out);
        }
    }
}

/// A phrase of three pieces, for an optional one (`Option<(A, B, C)>`).
impl<A: Piece, B: Piece, C: Piece> Piece for (A, B, C) {
    fn size(&self) -> usize {
        self.0.size() + self.1.size() + self.2.size()
    }
    fn push_to(&self, out: &mut String) {
        self.0.push_to(out);
        self.1.push_to(out);
        self.2.push_to(out);
    }
}

/// The items as a list in words: "a", "a and b", "a, b and c".
pub struct AndList<I>(pub I);

impl<I> Piece for AndList<I>
where
    I: Iterator + Clone,
    I::Item: Piece,
{
    fn size(&self) -> usize {
        self.0.clone().map(|item| item.size() + 2).sum::<usize>() + 3
    }
    fn push_to(&self, out: &mut String) {
        let count = self.0.clone().count();
        for (i, item) in self.0.clone().enumerate() {
            if i > 0 {
                out.push_str(if i + 1 == count { " and " } else { ", " });
            }
            item.push_to(out);
        }
    }
}

/// The values at the three tiers, most generous first, as the assumptions
/// list them: "1 / 0.75 / 0.45".
pub struct PerTier<P>(pub [P; 3]);

impl<P: Piece> Piece for PerTier<P> {
    fn size(&self) -> usize {
        self.0.iter().map(Piece::size).sum::<usize>() + 6
    }
    fn push_to(&self, out: &mut String) {
        let [a, b, c] = &self.0;
        say_to!(out, a, " / ", b, " / ", c);
    }
}

/// The piece, or the text in its place when there is none.
pub struct Or<P>(pub Option<P>, pub &'static str);

impl<P: Piece> Piece for Or<P> {
    fn size(&self) -> usize {
        self.0.as_ref().map_or(self.1.len(), Piece::size)
    }
    fn push_to(&self, out: &mut String) {
        match &self.0 {
            Some(piece) => piece.push_to(out),
            None => out.push_str(self.1),
        }
    }
}

/// Strings with a separator between them, as `items.join(sep)` writes them.
pub struct Joined<'a, T>(pub &'a [T], pub &'a str);

impl<T: Piece> Piece for Joined<'_, T> {
    fn size(&self) -> usize {
        let Joined(items, sep) = self;
        items.iter().map(Piece::size).sum::<usize>() + sep.len() * items.len().saturating_sub(1)
    }
    fn push_to(&self, out: &mut String) {
        let Joined(items, sep) = self;
        for (i, item) in items.iter().enumerate() {
            if i > 0 {
                out.push_str(sep);
            }
            item.push_to(out);
        }
    }
}

impl Piece for Sig3 {
    fn size(&self) -> usize {
        10
    }
    fn push_to(&self, out: &mut String) {
        push_sig3(out, self.0);
    }
}

impl Piece for Fixed {
    fn size(&self) -> usize {
        self.1 + 12
    }
    fn push_to(&self, out: &mut String) {
        push_fixed(out, self.0, self.1);
    }
}

impl Piece for Tenths {
    #[inline(always)]
    fn size(&self) -> usize {
        13
    }
    #[inline(always)]
    fn push_to(&self, out: &mut String) {
        push_tenths(out, self.0);
    }
}

/// A number as `{}` writes it: the shortest decimals that read back as the same value.
impl Piece for f64 {
    fn size(&self) -> usize {
        12
    }
    fn push_to(&self, out: &mut String) {
        push_shortest(out, *self);
    }
}

macro_rules! unsigned_piece {
    ($($t:ty),+) => {$(
        impl Piece for $t {
            fn size(&self) -> usize {
                20
            }
            fn push_to(&self, out: &mut String) {
                push_u64(out, *self as u64);
            }
        }
    )+};
}
unsigned_piece!(u8, u16, u32, u64, usize);

/// Appends `n` in decimal digits, as `{}` writes it.
pub fn push_u64(out: &mut String, mut n: u64) {
    let mut digits = [0u8; 20];
    let mut at = digits.len();
    loop {
        at -= 1;
        digits[at] = b'0' + (n % 10) as u8;
        n /= 10;
        if n == 0 {
            break;
        }
    }
    out.extend(digits[at..].iter().map(|&d| char::from(d)));
}

/// Appends [`Sig3`]`(v)`, byte for byte: `Fixed(v, max(0, 2 - floor(log10 |v|)))`,
/// "0" for zero, "n/a" for NaN, "unbounded" or "-unbounded" for an infinity.
/// The decade comes from comparing |v| with the powers of ten instead of
/// from `log10` (a libm call, most of `Sig3`'s cost); within a hair of a
/// power of ten, where `log10` may round onto the power, and outside the
/// table, `log10` decides as in `Sig3`.
pub fn push_sig3(out: &mut String, v: f64) {
    match Sig3(v).word() {
        Some(word) => out.push_str(word),
        None => push_fixed(out, v, sig3_places(v)),
    }
}

/// Appends `v` as `{}` writes an f64: the fewest decimals that read back as
/// `v` (the standard library's shortest round trip), without an exponent.
/// The nearest value with p decimals is n / 10^p; it reads back as `v`
/// exactly when the division, correctly rounded, gives `v` again (n and
/// 10^p are exact doubles), and it is what `push_fixed(v, p)` writes.
/// Values whose scaled digits pass 2^49, where the nearest integer could be
/// missed, go to the standard formatter.
pub fn push_shortest(out: &mut String, v: f64) {
    const POW10: [f64; 18] = [
        1e0, 1e1, 1e2, 1e3, 1e4, 1e5, 1e6, 1e7, 1e8, 1e9, 1e10, 1e11, 1e12, 1e13, 1e14, 1e15, 1e16,
        1e17,
    ];
    const LIMIT: f64 = (1u64 << 49) as f64;
    let a = v.abs();
    if a.is_finite() {
        for (places, &unit) in POW10.iter().enumerate() {
            let scaled = a * unit;
            if scaled >= LIMIT {
                break;
            }
            let n = (scaled + 0.5) as u64;
            if n as f64 / unit == a {
                return push_fixed(out, v, places);
            }
        }
    }
    let _ = write!(out, "{v}");
}

#[cfg(test)]
mod tests {
    use super::*;

    /// Values around every power of ten the reports can meet, a few ulps
    /// and a few parts in 1e9 either side, and a spread of ordinary ones.
    fn awkward_values() -> Vec<f64> {
        let mut values = vec![
            0.0,
            -0.0,
            0.05,
            0.15,
            0.25,
            2.5,
            99.95,
            999.5,
            0.1 + 0.2,
            1.28,
            0.735,
            3.7,
            1e-20,
            1e300,
            -1e300,
            123.456,
            f64::MIN_POSITIVE,
            f64::MAX,
        ];
        for k in -16..=22 {
            let p: f64 = format!("1e{k}").parse().unwrap();
            for base in [p, 10f64.powi(k), 9.995 * p, 9.9995 * p, 0.9995 * p] {
                let mut up = base;
                let mut down = base;
                for _ in 0..4 {
                    up = f64::from_bits(up.to_bits() + 1);
                    down = f64::from_bits(down.to_bits() - 1);
                    values.extend([up, down]);
                }
                for rel in [1e-12, 1e-10, 1e-9, 2e-9, 1e-7] {
                    values.extend([base * (1.0 + rel), base * (1.0 - rel)]);
                }
                values.push(base);
            }
        }
        let mut x: u64 = 0x2545_F491_4F6C_DD1D;
        for _ in 0..30_000 {
            x ^= x << 13;
            x ^= x >> 7;
            x ^= x << 17;
            let unit = (x >> 11) as f64 / (1u64 << 53) as f64;
            values.push(unit * 10f64.powi((x % 23) as i32 - 9));
            values.push((unit * 1000.0).round() / 100.0);
            values.push(f64::from_bits(x));
        }
        let negated: Vec<f64> = values.iter().map(|v| -v).collect();
        values.extend(negated);
        values
    }

    #[test]
    fn sig3_is_the_decimals_log10_gives_as_the_standard_formatter_writes_them() {
        // The definition, from std alone: max(0, 2 - floor(log10 |v|))
        // decimals, `{:.N}`. Both writers use the decade table, so both are
        // held to it here.
        for v in awkward_values() {
            let expected = if v.is_nan() {
                "n/a".to_string()
            } else if v.is_infinite() {
                (if v > 0.0 { "unbounded" } else { "-unbounded" }).to_string()
            } else if v == 0.0 {
                "0".to_string()
            } else {
                let places = (2 - v.abs().log10().floor() as i32).max(0) as usize;
                format!("{v:.places$}")
            };
            let mut pushed = String::new();
            push_sig3(&mut pushed, v);
            assert_eq!(pushed, expected, "{v:?}");
            assert_eq!(Sig3(v).to_string(), expected, "{v:?}");
        }
    }

    #[test]
    fn a_plain_number_is_written_as_the_standard_formatter_writes_it() {
        for v in awkward_values()
            .into_iter()
            .chain([f64::NAN, f64::INFINITY])
        {
            let mut pushed = String::from("x");
            push_shortest(&mut pushed, v);
            assert_eq!(pushed, format!("x{v}"), "{v:?}");
        }
    }

    #[test]
    fn integers_are_written_as_the_standard_formatter_writes_them() {
        for n in [0, 1, 9, 10, 99, 100, 12345, u64::from(u32::MAX), u64::MAX] {
            let mut pushed = String::new();
            push_u64(&mut pushed, n);
            assert_eq!(pushed, n.to_string());
        }
    }

    #[test]
    fn a_sentence_reads_as_format_writes_it() {
        let (g, n, name) = (1234.5678, 4u32, String::from("lamp"));
        let owned: Cow<str> = Cow::Owned("owned".into());
        let parts = [String::from("a"), String::from("b"), String::from("c")];
        assert_eq!(
            say!(
                "The ",
                &name,
                " weighs ",
                Sig3(g),
                " g on ",
                n,
                " rotors (",
                Fixed(g, 2),
                ", ",
                0.45,
                ", ",
                7usize,
                ") ",
                owned,
                '!',
                Joined(&parts, "; "),
                String::from("lamp")
            ),
            format!(
                "The lamp weighs {} g on {n} rotors ({}, {}, {}) {}!{}lamp",
                Sig3(g),
                Fixed(g, 2),
                0.45,
                7usize,
                "owned",
                parts.join("; ")
            )
        );
    }

    #[test]
    fn a_sentence_is_allocated_once_at_the_size_it_needs() {
        let s = say!("Hover at ", Sig3(70.0), " %");
        assert_eq!(s, "Hover at 70.0 %");
        assert!(s.capacity() >= s.len() && s.capacity() <= s.len() + 10);
    }
}

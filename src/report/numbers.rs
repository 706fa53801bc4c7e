//! How the report writes numbers for people: three significant figures,
//! through `std::fmt`. Fixed decimals need nothing of ours: `{:.4}`.

use std::fmt;

/// `v` to three significant figures, no exponent ("5.07", "1235",
/// "0.0123"): a reader compares figures of very different sizes, and three
/// figures is what the inputs of a plausibility screen support. "0" for
/// zero, "n/a" for NaN, "unbounded" or "-unbounded" for an infinity.
#[derive(Debug, Clone, Copy)]
pub struct Sig3(pub f64);

impl fmt::Display for Sig3 {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        let v = self.0;
        if v.is_nan() {
            f.write_str("n/a")
        } else if v.is_infinite() {
            f.write_str(if v > 0.0 { "unbounded" } else { "-unbounded" })
        } else if v == 0.0 {
            f.write_str("0")
        } else {
            write!(f, "{:.*}", sig3_places(v), v)
        }
    }
}

/// The decimals that give `v` three significant figures:
/// `max(0, 2 - floor(log10 |v|))`; none for zero or a value that is not finite.
pub fn sig3_places(v: f64) -> usize {
    let decade = v.abs().log10().floor();
    if decade.is_finite() {
        (2.0 - decade).max(0.0) as usize
    } else {
        0
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    fn sig3(v: f64) -> String {
        Sig3(v).to_string()
    }

    #[test]
    fn three_significant_figures_without_exponents() {
        assert_eq!(sig3(5.0667), "5.07");
        assert_eq!(sig3(3.0), "3.00");
        assert_eq!(sig3(1234.6), "1235");
        assert_eq!(sig3(0.012345), "0.0123");
        assert_eq!(sig3(-2.5), "-2.50");
        assert_eq!(sig3(1.23456e-14), "0.0000000000000123");
        assert_eq!(sig3(123456789.0), "123456789");
    }

    #[test]
    fn rounding_can_carry_into_a_fourth_figure() {
        // The places are chosen from the value before rounding, as `{:.N}` rounds it.
        assert_eq!(sig3(999.5), "1000");
        assert_eq!(sig3(99.96), "100.0");
        assert_eq!(sig3(0.09996), "0.1000");
    }

    #[test]
    fn values_without_digits_are_words() {
        assert_eq!(sig3(0.0), "0");
        assert_eq!(sig3(-0.0), "0");
        assert_eq!(sig3(f64::NAN), "n/a");
        assert_eq!(sig3(f64::INFINITY), "unbounded");
        assert_eq!(sig3(f64::NEG_INFINITY), "-unbounded");
        assert_eq!(sig3_places(0.0), 0);
    }
}

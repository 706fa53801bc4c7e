//! How the report writes numbers for people: three significant figures,
//! through `std::fmt`, in scientific notation for a magnitude of a million or
//! more or below a thousandth (`{:.2e}`), so that no figure is a run of
//! hundreds of digits. Fixed decimals need nothing of ours: `{:.4}`.

use std::fmt;

/// `v` to three significant figures ("5.07", "1235", "0.0123"), as
/// `{:.2e}` writes it ("1.23e6", "4.50e-7") when [`scientific`]: a reader
/// compares figures of very different sizes, and three figures is what the
/// inputs of a plausibility screen support. "0" for zero, "n/a" for NaN,
/// "unbounded" or "-unbounded" for an infinity.
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
        } else if scientific(v) {
            write!(f, "{v:.2e}")
        } else {
            write!(f, "{:.*}", sig3_places(v), v)
        }
    }
}

/// Whether `v` is written in scientific notation: a magnitude of 1e6 or
/// more, or below 1e-3 and not zero. Rounding is left to `{:.2e}`, so 999999.7
/// is "1000000" (its three figures fixed) and 9.9996e-4 "1.00e-3".
pub fn scientific(v: f64) -> bool {
    let m = v.abs();
    m >= 1e6 || (m < 1e-3 && m > 0.0)
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
    fn three_significant_figures_without_exponents_between_a_thousandth_and_a_million() {
        // Worked by hand: rounding to three significant figures.
        assert_eq!(sig3(5.0667), "5.07");
        assert_eq!(sig3(3.0), "3.00");
        assert_eq!(sig3(1234.6), "1235");
        assert_eq!(sig3(0.012345), "0.0123");
        assert_eq!(sig3(-2.5), "-2.50");
        assert_eq!(sig3(0.001), "0.00100");
        assert_eq!(sig3(999_999.0), "999999");
    }

    #[test]
    fn a_million_or_more_and_below_a_thousandth_are_in_scientific_notation() {
        // Worked by hand: 1.23456e-14 to three figures is 1.23 x 10^-14.
        assert_eq!(sig3(1.23456e-14), "1.23e-14");
        assert_eq!(sig3(123_456_789.0), "1.23e8");
        assert_eq!(sig3(1e6), "1.00e6");
        assert_eq!(sig3(-4.5e-7), "-4.50e-7");
        assert_eq!(sig3(0.000_999_9), "1.00e-3");
        assert_eq!(sig3(1e300), "1.00e300");
        assert_eq!(sig3(1e-300), "1.00e-300");
        assert_eq!(sig3(f64::MAX), "1.80e308");
        assert_eq!(sig3(5e-324), "4.94e-324");
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

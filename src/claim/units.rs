//! Quantity strings ("300 g", "3.7 V", "15 degC") read into SI values.
//!
//! A quantity is a finite decimal number, optional white space and a unit
//! symbol. The symbols are the SI ones (BIPM, *The International System of
//! Units*, 9th ed., 2019) plus the few the trade writes every day: `mAh`, `in`
//! for propeller diameters, `degC`, `km/h`, `C` for a discharge rate.

/// The kind of quantity a field holds; the parser checks a unit against it.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Dim {
    Mass,
    Length,
    Voltage,
    Charge,
    Power,
    Time,
    Angle,
    Temperature,
    Speed,
    Frequency,
    CRate,
    Force,
    Pressure,
}

impl Dim {
    /// The noun used in messages: "expected a length".
    pub fn noun(self) -> &'static str {
        match self {
            Dim::Mass => "a mass",
            Dim::Length => "a length",
            Dim::Voltage => "a voltage",
            Dim::Charge => "a charge (capacity)",
            Dim::Power => "a power",
            Dim::Time => "a time",
            Dim::Angle => "an angle",
            Dim::Temperature => "a temperature",
            Dim::Speed => "a speed",
            Dim::Frequency => "a frequency",
            Dim::CRate => "a discharge rate",
            Dim::Force => "a force",
            Dim::Pressure => "a pressure",
        }
    }

    /// Example spellings shown when a unit is missing or unknown.
    pub fn example(self) -> &'static str {
        match self {
            Dim::Mass => "'300 g' or '1.2 kg'",
            Dim::Length => "'55 mm', '5 in' or '0.3 m'",
            Dim::Voltage => "'3.7 V'",
            Dim::Charge => "'600 mAh' or '2.2 Ah'",
            Dim::Power => "'4 W'",
            Dim::Time => "'12 min' or '90 s'",
            Dim::Angle => "'30 deg'",
            Dim::Temperature => "'15 degC'",
            Dim::Speed => "'4 m/s' or '15 km/h'",
            Dim::Frequency => "'400 Hz'",
            Dim::CRate => "'20 C'",
            Dim::Force => "'3 N' or '30 g' (read as gram-force)",
            Dim::Pressure => "'950 hPa' or '95 kPa'",
        }
    }
}

/// A unit symbol: its dimension, the factor to the SI base unit and, for
/// temperatures, the offset added after scaling (kelvin = factor x v + offset).
struct Unit {
    dim: Dim,
    factor: f64,
    offset: f64,
}

/// Standard gravity, by definition (3rd CGPM, 1901; ISO 80000-3): 9.80665 m/s^2.
pub const STANDARD_GRAVITY: f64 = 9.806_65;

fn unit(symbol: &str) -> Option<Unit> {
    let u = |dim, factor| {
        Some(Unit {
            dim,
            factor,
            offset: 0.0,
        })
    };
    match symbol {
        "mg" => u(Dim::Mass, 1e-6),
        "g" | "gram" | "grams" => u(Dim::Mass, 1e-3),
        "kg" => u(Dim::Mass, 1.0),
        "oz" => u(Dim::Mass, 0.028_349_523_125),
        "lb" => u(Dim::Mass, 0.453_592_37),
        "mm" => u(Dim::Length, 1e-3),
        "cm" => u(Dim::Length, 1e-2),
        "m" => u(Dim::Length, 1.0),
        "km" => u(Dim::Length, 1e3),
        "in" | "inch" | "inches" | "\"" => u(Dim::Length, 0.0254),
        "ft" => u(Dim::Length, 0.3048),
        "V" | "v" => u(Dim::Voltage, 1.0),
        "mV" => u(Dim::Voltage, 1e-3),
        "mAh" | "mah" | "mA h" | "mA·h" => u(Dim::Charge, 3.6),
        "Ah" | "ah" | "A h" | "A·h" => u(Dim::Charge, 3600.0),
        "W" | "w" => u(Dim::Power, 1.0),
        "mW" => u(Dim::Power, 1e-3),
        "kW" => u(Dim::Power, 1e3),
        "ms" => u(Dim::Time, 1e-3),
        "s" | "sec" => u(Dim::Time, 1.0),
        "min" => u(Dim::Time, 60.0),
        "h" | "hr" => u(Dim::Time, 3600.0),
        "deg" | "°" | "degree" | "degrees" => u(Dim::Angle, std::f64::consts::PI / 180.0),
        "rad" => u(Dim::Angle, 1.0),
        "degC" | "°C" | "C°" => Some(Unit {
            dim: Dim::Temperature,
            factor: 1.0,
            offset: 273.15,
        }),
        "degF" | "°F" => Some(Unit {
            dim: Dim::Temperature,
            factor: 5.0 / 9.0,
            offset: 273.15 - 32.0 * 5.0 / 9.0,
        }),
        "K" => u(Dim::Temperature, 1.0),
        "m/s" => u(Dim::Speed, 1.0),
        "km/h" | "kph" => u(Dim::Speed, 1.0 / 3.6),
        "mph" => u(Dim::Speed, 0.447_04),
        "kn" | "kt" => u(Dim::Speed, 1852.0 / 3600.0),
        "Hz" | "hz" => u(Dim::Frequency, 1.0),
        "kHz" => u(Dim::Frequency, 1e3),
        "C" => u(Dim::CRate, 1.0),
        "N" => u(Dim::Force, 1.0),
        "mN" => u(Dim::Force, 1e-3),
        "kgf" => u(Dim::Force, STANDARD_GRAVITY),
        "gf" => u(Dim::Force, STANDARD_GRAVITY * 1e-3),
        "Pa" => u(Dim::Pressure, 1.0),
        "hPa" | "mbar" => u(Dim::Pressure, 100.0),
        "kPa" => u(Dim::Pressure, 1e3),
        // The conventional inch of mercury, 3386.389 Pa (NIST SP 811, B.8).
        "inHg" => u(Dim::Pressure, 3_386.389),
        _ => None,
    }
}

/// A quantity read from a string, in SI units (kelvin for temperatures,
/// coulomb for capacity; a C rate is a plain number per hour of capacity).
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Reading {
    pub si: f64,
    /// The dimension the unit belonged to; differs from the expected one only
    /// for a mass in a force field, which is then read as gram-force.
    pub dim: Dim,
}

/// Reads `text` as a quantity of dimension `expected`; `Err` holds the reason
/// (without the field path, which the caller adds).
pub fn read(text: &str, expected: Dim) -> Result<Reading, String> {
    let text = text.trim();
    let split = number_end(text);
    let (num, sym) = text.split_at(split);
    let sym = sym.trim();
    if num.is_empty() {
        return Err(format!(
            "expected {} such as {}, got '{}'",
            expected.noun(),
            expected.example(),
            text
        ));
    }
    let value: f64 = num
        .parse()
        .map_err(|_| format!("'{num}' is not a number in '{text}'"))?;
    if !value.is_finite() {
        return Err(format!("'{text}' is not a finite number"));
    }
    if sym.is_empty() {
        return Err(format!(
            "'{text}' has no unit; write {} such as {}",
            expected.noun(),
            expected.example()
        ));
    }
    let Some(unit) = unit(sym) else {
        return Err(format!(
            "unknown unit '{sym}' in '{text}'; expected {} such as {}",
            expected.noun(),
            expected.example()
        ));
    };
    let mass_as_force = expected == Dim::Force && unit.dim == Dim::Mass;
    if unit.dim != expected && !mass_as_force {
        return Err(format!("expected {}, got '{}'", expected.noun(), text));
    }
    let mut si = value * unit.factor + unit.offset;
    if mass_as_force {
        si *= STANDARD_GRAVITY;
    }
    if !si.is_finite() {
        return Err(format!("'{text}' is out of range"));
    }
    Ok(Reading { si, dim: unit.dim })
}

/// Byte index where the leading decimal number of `text` ends: a sign, digits
/// and points, then an exponent only when digits follow it, so "5 e" stays a
/// unit error. `str::parse::<f64>` reads the number; this only finds its end.
fn number_end(text: &str) -> usize {
    let digits = |c: char| c.is_ascii_digit();
    let unsigned = text.strip_prefix(['+', '-']).unwrap_or(text);
    let after_mantissa = unsigned.trim_start_matches(|c: char| digits(c) || c == '.');
    let exponent = after_mantissa
        .strip_prefix(['e', 'E'])
        .map(|e| e.strip_prefix(['+', '-']).unwrap_or(e));
    let rest = match exponent {
        Some(e) if e.starts_with(digits) => e.trim_start_matches(digits),
        _ => after_mantissa,
    };
    text.len() - rest.len()
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn grams_and_millimetres_read_in_si() {
        assert_eq!(read("300 g", Dim::Mass).unwrap().si, 0.3);
        assert!((read("55mm", Dim::Length).unwrap().si - 0.055).abs() < 1e-12);
    }

    #[test]
    fn an_inch_is_exactly_25_4_mm() {
        // International yard and pound agreement, 1959: 1 in = 25.4 mm.
        assert!((read("5 in", Dim::Length).unwrap().si - 0.127).abs() < 1e-12);
    }

    #[test]
    fn a_milliampere_hour_is_3_6_coulomb() {
        // 1 mA x 3600 s = 3.6 C (SI Brochure, derived units).
        assert!((read("600 mAh", Dim::Charge).unwrap().si - 2160.0).abs() < 1e-9);
    }

    #[test]
    fn celsius_and_fahrenheit_read_as_kelvin() {
        // ISO 80000-5: T/K = t/degC + 273.15; 59 degF = 15 degC.
        assert!((read("15 degC", Dim::Temperature).unwrap().si - 288.15).abs() < 1e-9);
        assert!((read("59 degF", Dim::Temperature).unwrap().si - 288.15).abs() < 1e-9);
    }

    #[test]
    fn a_mass_in_a_force_field_is_gram_force() {
        let r = read("30 g", Dim::Force).unwrap();
        assert_eq!(r.dim, Dim::Mass);
        // 1 gf = 9.80665e-3 N by the definition of standard gravity.
        assert!((r.si - 0.294_199_5).abs() < 1e-9);
    }

    #[test]
    fn a_hectopascal_is_a_millibar_and_29_92_inches_of_mercury_are_standard_pressure() {
        // SI Brochure: 1 hPa = 100 Pa = 1 mbar; the standard altimeter setting
        // 29.92 inHg is 1013.2 hPa (ICAO Doc 8400; NIST SP 811, B.8: 1 inHg = 3386.389 Pa).
        assert_eq!(read("950 hPa", Dim::Pressure).unwrap().si, 95_000.0);
        assert_eq!(read("950 mbar", Dim::Pressure).unwrap().si, 95_000.0);
        let std = read("29.92 inHg", Dim::Pressure).unwrap().si;
        assert!((std - 101_320.8).abs() < 0.1, "{std}");
    }

    #[test]
    fn a_wrong_dimension_names_what_was_expected() {
        assert_eq!(
            read("55 g", Dim::Length).unwrap_err(),
            "expected a length, got '55 g'"
        );
    }

    #[test]
    fn missing_units_unknown_units_and_non_numbers_are_refused() {
        assert!(read("55", Dim::Length).unwrap_err().contains("no unit"));
        assert!(read("55 furlong", Dim::Length)
            .unwrap_err()
            .contains("unknown unit 'furlong'"));
        assert!(read("abc g", Dim::Mass).is_err());
        assert!(read("1e999 g", Dim::Mass).is_err());
        assert!(read("", Dim::Mass).is_err());
        assert!(read("..5 g", Dim::Mass).is_err());
    }
}

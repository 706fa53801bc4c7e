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

/// A unit: its dimension, the factor to the SI base unit and, for
/// temperatures, the offset added after scaling (kelvin = factor x v + offset),
/// and its name for messages.
#[derive(Debug, Clone, Copy, PartialEq)]
struct Unit {
    dim: Dim,
    factor: f64,
    offset: f64,
    name: &'static str,
}

/// Standard gravity, by definition (3rd CGPM, 1901; ISO 80000-3): 9.80665 m/s^2.
pub const STANDARD_GRAVITY: f64 = 9.806_65;

const fn unit(dim: Dim, factor: f64, name: &'static str) -> Unit {
    Unit {
        dim,
        factor,
        offset: 0.0,
        name,
    }
}

const DEGREE: f64 = std::f64::consts::PI / 180.0;
/// The international pound, 0.45359237 kg exactly (1959 agreement).
const POUND: f64 = 0.453_592_37;
/// The avoirdupois ounce, a sixteenth of the pound.
const OUNCE: f64 = POUND / 16.0;
const CELSIUS: Unit = Unit {
    dim: Dim::Temperature,
    factor: 1.0,
    offset: 273.15,
    name: "degree Celsius",
};
const FAHRENHEIT: Unit = Unit {
    dim: Dim::Temperature,
    factor: 5.0 / 9.0,
    offset: 273.15 - 32.0 * 5.0 / 9.0,
    name: "degree Fahrenheit",
};

/// Every spelling read, each with its unit. A spelling is matched as
/// written first; failing that, without regard to case when every spelling
/// that differs from it by case alone is the same unit (so `KG` is kg and
/// `MPH` mph, but `mw` is refused, being mW or MW).
const UNITS: &[(&[&str], Unit)] = &[
    (
        &["mg", "milligram", "milligrams"],
        unit(Dim::Mass, 1e-6, "milligram"),
    ),
    (&["g", "gram", "grams"], unit(Dim::Mass, 1e-3, "gram")),
    (
        &["kg", "kilogram", "kilograms", "kilo", "kilos"],
        unit(Dim::Mass, 1.0, "kilogram"),
    ),
    (&["oz", "ounce", "ounces"], unit(Dim::Mass, OUNCE, "ounce")),
    (
        &["lb", "lbs", "pound", "pounds"],
        unit(Dim::Mass, POUND, "pound"),
    ),
    (
        &[
            "mm",
            "millimetre",
            "millimetres",
            "millimeter",
            "millimeters",
        ],
        unit(Dim::Length, 1e-3, "millimetre"),
    ),
    (
        &[
            "cm",
            "centimetre",
            "centimetres",
            "centimeter",
            "centimeters",
        ],
        unit(Dim::Length, 1e-2, "centimetre"),
    ),
    (
        &["m", "metre", "metres", "meter", "meters"],
        unit(Dim::Length, 1.0, "metre"),
    ),
    (
        &["km", "kilometre", "kilometres", "kilometer", "kilometers"],
        unit(Dim::Length, 1e3, "kilometre"),
    ),
    (
        &["in", "inch", "inches", "\""],
        unit(Dim::Length, 0.0254, "inch"),
    ),
    (&["ft", "foot", "feet"], unit(Dim::Length, 0.3048, "foot")),
    (&["V", "volt", "volts"], unit(Dim::Voltage, 1.0, "volt")),
    (
        &["mV", "millivolt", "millivolts"],
        unit(Dim::Voltage, 1e-3, "millivolt"),
    ),
    (
        &["MV", "megavolt", "megavolts"],
        unit(Dim::Voltage, 1e6, "megavolt"),
    ),
    (
        &["mAh", "mA h", "mA·h"],
        unit(Dim::Charge, 3.6, "milliampere hour"),
    ),
    (
        &["Ah", "A h", "A·h"],
        unit(Dim::Charge, 3600.0, "ampere hour"),
    ),
    (&["W", "watt", "watts"], unit(Dim::Power, 1.0, "watt")),
    (
        &["mW", "milliwatt", "milliwatts"],
        unit(Dim::Power, 1e-3, "milliwatt"),
    ),
    (
        &["kW", "kilowatt", "kilowatts"],
        unit(Dim::Power, 1e3, "kilowatt"),
    ),
    (
        &["MW", "megawatt", "megawatts"],
        unit(Dim::Power, 1e6, "megawatt"),
    ),
    (
        &["ms", "millisecond", "milliseconds"],
        unit(Dim::Time, 1e-3, "millisecond"),
    ),
    (
        &["s", "sec", "secs", "second", "seconds"],
        unit(Dim::Time, 1.0, "second"),
    ),
    (
        &["min", "mins", "minute", "minutes"],
        unit(Dim::Time, 60.0, "minute"),
    ),
    (
        &["h", "hr", "hrs", "hour", "hours"],
        unit(Dim::Time, 3600.0, "hour"),
    ),
    (
        &["deg", "°", "degree", "degrees"],
        unit(Dim::Angle, DEGREE, "degree"),
    ),
    (
        &["rad", "radian", "radians"],
        unit(Dim::Angle, 1.0, "radian"),
    ),
    (&["degC", "°C", "C°"], CELSIUS),
    (&["degF", "°F"], FAHRENHEIT),
    (&["K", "kelvin"], unit(Dim::Temperature, 1.0, "kelvin")),
    (&["m/s", "m/sec"], unit(Dim::Speed, 1.0, "metre per second")),
    (
        &["km/h", "kph", "kmh", "km/hr"],
        unit(Dim::Speed, 1.0 / 3.6, "kilometre per hour"),
    ),
    (&["mph"], unit(Dim::Speed, 0.447_04, "mile per hour")),
    (
        &["kn", "kt", "kts", "knot", "knots"],
        unit(Dim::Speed, 1852.0 / 3600.0, "knot"),
    ),
    (&["Hz", "hertz"], unit(Dim::Frequency, 1.0, "hertz")),
    (
        &["kHz", "kilohertz"],
        unit(Dim::Frequency, 1e3, "kilohertz"),
    ),
    (
        &["MHz", "megahertz"],
        unit(Dim::Frequency, 1e6, "megahertz"),
    ),
    (&["C"], unit(Dim::CRate, 1.0, "C rate")),
    (&["N", "newton", "newtons"], unit(Dim::Force, 1.0, "newton")),
    (
        &["mN", "millinewton", "millinewtons"],
        unit(Dim::Force, 1e-3, "millinewton"),
    ),
    (
        &["kgf"],
        unit(Dim::Force, STANDARD_GRAVITY, "kilogram-force"),
    ),
    (
        &["gf"],
        unit(Dim::Force, STANDARD_GRAVITY * 1e-3, "gram-force"),
    ),
    (
        &["lbf"],
        unit(Dim::Force, POUND * STANDARD_GRAVITY, "pound-force"),
    ),
    (
        &["ozf"],
        unit(Dim::Force, OUNCE * STANDARD_GRAVITY, "ounce-force"),
    ),
    (
        &["Pa", "pascal", "pascals"],
        unit(Dim::Pressure, 1.0, "pascal"),
    ),
    (
        &[
            "hPa",
            "hectopascal",
            "hectopascals",
            "mbar",
            "millibar",
            "millibars",
        ],
        unit(Dim::Pressure, 100.0, "hectopascal"),
    ),
    (
        &["kPa", "kilopascal", "kilopascals"],
        unit(Dim::Pressure, 1e3, "kilopascal"),
    ),
    // The conventional inch of mercury, 3386.389 Pa (NIST SP 811, B.8).
    (&["inHg"], unit(Dim::Pressure, 3_386.389, "inch of mercury")),
];

/// What a unit spelling reads as.
enum Lookup {
    Found(Unit),
    /// Spellings that differ from it by case alone name different units.
    Ambiguous(Vec<(&'static str, &'static str)>),
    Unknown,
}

fn lookup(symbol: &str) -> Lookup {
    let spellings = || {
        UNITS
            .iter()
            .flat_map(|(names, unit)| names.iter().map(move |name| (*name, unit)))
    };
    if let Some((_, unit)) = spellings().find(|(name, _)| *name == symbol) {
        return Lookup::Found(*unit);
    }
    let by_case: Vec<(&'static str, &Unit)> = spellings()
        .filter(|(name, _)| name.to_lowercase() == symbol.to_lowercase())
        .collect();
    match by_case.split_first() {
        None => Lookup::Unknown,
        Some(((_, first), rest)) if rest.iter().all(|(_, u)| u == first) => Lookup::Found(**first),
        Some(_) => Lookup::Ambiguous(by_case.iter().map(|(n, u)| (*n, u.name)).collect()),
    }
}

/// The unit a spelling stands for, trying it also without a hyphen before
/// it ("5-inch") and a full stop after it ("5 in.").
fn unit_of(symbol: &str) -> Lookup {
    let mut found = lookup(symbol);
    if matches!(found, Lookup::Unknown) {
        let bare = symbol.strip_prefix('-').unwrap_or(symbol);
        let bare = bare.strip_suffix('.').unwrap_or(bare).trim();
        if bare != symbol && !bare.is_empty() {
            found = lookup(bare);
        }
    }
    found
}

/// The text as a quantity is read: after Unicode compatibility
/// normalisation (NFKC, Unicode Standard Annex 15), so fullwidth digits and
/// letters are ASCII ones and `℃` is `°C`, and with the minus sign U+2212 as
/// a hyphen-minus.
pub fn normalize(text: &str) -> String {
    icu_normalizer::ComposingNormalizerBorrowed::new_nfkc()
        .normalize(text)
        .replace('\u{2212}', "-")
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
    let normal = normalize(text);
    let text = normal.trim();
    let split = number_end(text);
    let (num, sym) = text.split_at(split);
    if sym.starts_with(',') && sym[1..].starts_with(|c: char| c.is_ascii_digit()) {
        return Err(format!(
            "'{text}' has a comma in its number; use a decimal point (0.3, not 0,3) and no \
             thousands separator"
        ));
    }
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
    if expected == Dim::Temperature && sym.eq_ignore_ascii_case("c") {
        return Err(format!(
            "'{text}' could be a temperature ({num} degC) or a discharge rate ({num} C); \
             write a temperature as '{num} degC'"
        ));
    }
    let unit = match unit_of(sym) {
        Lookup::Found(unit) => unit,
        Lookup::Ambiguous(readings) => {
            let readings: Vec<String> = readings
                .iter()
                .map(|(spelling, name)| format!("{spelling} ({name})"))
                .collect();
            return Err(format!(
                "the unit '{sym}' in '{text}' could be {}; write it in the case of the unit meant",
                readings.join(" or ")
            ));
        }
        Lookup::Unknown => {
            return Err(format!(
                "unknown unit '{sym}' in '{text}'; expected {} such as {}",
                expected.noun(),
                expected.example()
            ))
        }
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

/// Every spelling of a unit the sheets take, with its unit's name and
/// dimension, for the documentation.
pub fn spellings() -> impl Iterator<Item = (Dim, &'static str, &'static [&'static str])> {
    UNITS
        .iter()
        .map(|(names, unit)| (unit.dim, unit.name, *names))
}

/// Byte index where the leading decimal number of `text` ends: a sign, digits
/// and points, then an exponent only when digits follow it, so "5 e" stays a
/// unit error. `str::parse::<f64>` reads the number; this only finds its end.
pub fn number_end(text: &str) -> usize {
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

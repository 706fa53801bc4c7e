//! Reads a sheet's tree into a [`Claim`], collecting every field error with its path.

use uom::si::f64::{
    Angle, ElectricCharge, Force, Frequency, Length, Mass, Power, ThermodynamicTemperature, Time,
    Velocity,
};
use uom::si::{
    angle::radian, electric_charge::coulomb, force::newton, frequency::hertz, length::meter,
    mass::kilogram, power::watt, pressure::pascal, thermodynamic_temperature::kelvin, time::second,
    velocity::meter_per_second,
};

use std::borrow::Cow;

use super::tree::Node;
use super::units::{self, Dim};
use super::*;
use crate::catalog;

/// Largest craft mass the screen takes: small craft only.
const MAX_MASS_KG: f64 = 150.0;
/// Largest rotor diameter, arm or body side.
const MAX_LENGTH_M: f64 = 5.0;
const MAX_ROTORS: i64 = 64;
const MAX_CELLS: i64 = 24;
const MAX_PARTS: usize = 500;
const MAX_TEXT: usize = 500;

/// The most field errors a refusal lists; the rest are counted in one
/// last entry, so that the answer to a sheet of many thousand bad keys stays small.
pub const MAX_ERRORS: usize = 50;

/// Collected field errors: the first [`MAX_ERRORS`], and how many more.
#[derive(Default)]
struct Errors(Vec<FieldError>, usize);

impl Errors {
    fn push(&mut self, field: impl fmt::Display, message: impl Into<String>) {
        if self.0.len() >= MAX_ERRORS {
            self.1 += 1;
            return;
        }
        self.0.push(FieldError {
            field: field.to_string(),
            message: message.into(),
        });
    }

    /// The errors listed, with "and N more errors" after the first [`MAX_ERRORS`].
    fn into_list(self) -> Vec<FieldError> {
        let Errors(mut list, more) = self;
        if more > 0 {
            let s = if more == 1 { "" } else { "s" };
            list.push(FieldError {
                field: "(sheet)".to_string(),
                message: format!("and {more} more error{s}"),
            });
        }
        list
    }
}

/// Where a value sits in the sheet; spelled out (`craft.parts[2].mass`) only
/// when an error names it.
#[derive(Clone, Copy)]
enum Path<'p> {
    Root,
    Key(&'p Path<'p>, &'p str),
    Item(&'p Path<'p>, usize),
}

impl fmt::Display for Path<'_> {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        match self {
            Path::Root => Ok(()),
            Path::Key(Path::Root, key) => f.write_str(key),
            Path::Key(table, key) => write!(f, "{table}.{key}"),
            Path::Item(list, i) => write!(f, "{list}[{i}]"),
        }
    }
}

/// A table being read: remembers which keys were taken, so that the rest
/// can be reported as unknown.
struct Table<'a, 'p> {
    path: Path<'p>,
    entries: &'a [(Cow<'a, str>, Node<'a>)],
    /// Keys asked for, found or not: the ones the table takes, which the
    /// unknown-key message lists.
    taken: Vec<&'static str>,
}

impl<'a, 'p> Table<'a, 'p> {
    fn new(path: Path<'p>, node: &'a Node<'a>, errors: &mut Errors) -> Option<Table<'a, 'p>> {
        match node {
            Node::Table(entries) => Some(Table {
                path,
                entries,
                taken: Vec::new(),
            }),
            other => {
                errors.push(path, format!("expected a table, got {}", other.kind()));
                None
            }
        }
    }

    /// The path of one of this table's keys.
    fn field<'k>(&'k self, key: &'k str) -> Path<'k> {
        Path::Key(&self.path, key)
    }

    fn get(&mut self, key: &'static str) -> Option<&'a Node<'a>> {
        if !self.taken.contains(&key) {
            self.taken.push(key);
        }
        self.entries
            .iter()
            .find(|(k, _)| k == key)
            .map(|(_, node)| node)
    }

    fn text(&mut self, key: &'static str, errors: &mut Errors) -> Option<&'a str> {
        match self.get(key)? {
            Node::Str(s) if s.chars().count() > MAX_TEXT => {
                errors.push(
                    self.field(key),
                    format!("is longer than {MAX_TEXT} characters"),
                );
                None
            }
            Node::Str(s) => Some(s),
            other => {
                errors.push(
                    self.field(key),
                    format!("expected a string, got {}", other.kind()),
                );
                None
            }
        }
    }

    fn flag(&mut self, key: &'static str, errors: &mut Errors) -> Option<bool> {
        match self.get(key)? {
            Node::Bool(b) => Some(*b),
            other => {
                errors.push(
                    self.field(key),
                    format!("expected true or false, got {}", other.kind()),
                );
                None
            }
        }
    }

    /// A whole number in `lo..=hi`; a number with a zero fraction (`4.0`) is one.
    fn count(&mut self, key: &'static str, lo: i64, hi: i64, errors: &mut Errors) -> Option<u32> {
        let range = format!("a whole number from {lo} to {hi}");
        match self.get(key)? {
            Node::Int(n) if (lo..=hi).contains(n) => u32::try_from(*n).ok(),
            Node::Int(n) => {
                errors.push(self.field(key), format!("must be {range}, got {n}"));
                None
            }
            Node::Float(f) if f.fract() == 0.0 && (lo as f64..=hi as f64).contains(f) => {
                u32::try_from(*f as i64).ok()
            }
            // Beyond the range a float's digits are not the ones written
            // (1e20 for 99999999999999999999), so none are printed.
            Node::Float(f) if f.fract() == 0.0 && *f > hi as f64 => {
                errors.push(self.field(key), format!("is too large: must be {range}"));
                None
            }
            Node::Float(f) if f.fract() == 0.0 && *f < lo as f64 => {
                errors.push(self.field(key), format!("is too small: must be {range}"));
                None
            }
            Node::Float(f) => {
                let shown = crate::report::numbers::Sig3(*f);
                errors.push(
                    self.field(key),
                    format!("must be a whole number, got {shown}, which is not whole"),
                );
                None
            }
            other => {
                errors.push(
                    self.field(key),
                    format!("expected a whole number, got {}", other.kind()),
                );
                None
            }
        }
    }

    /// A quantity string, in SI, checked against `range` (open at zero when `lo_open`).
    fn quantity(
        &mut self,
        key: &'static str,
        dim: Dim,
        range: Range,
        errors: &mut Errors,
    ) -> Option<units::Reading> {
        let text = match self.get(key)? {
            Node::Str(s) => s,
            Node::Int(_) | Node::Float(_) => {
                errors.push(
                    self.field(key),
                    format!(
                        "write the unit too: {} such as {}",
                        dim.noun(),
                        dim.example()
                    ),
                );
                return None;
            }
            other => {
                errors.push(
                    self.field(key),
                    format!(
                        "expected {} such as {}, got {}",
                        dim.noun(),
                        dim.example(),
                        other.kind()
                    ),
                );
                return None;
            }
        };
        match units::read(text, dim) {
            Ok(reading) => match range.check(reading.si, text) {
                Ok(()) => Some(reading),
                Err(message) => {
                    errors.push(self.field(key), message);
                    None
                }
            },
            Err(message) => {
                errors.push(self.field(key), message);
                None
            }
        }
    }

    fn si(
        &mut self,
        key: &'static str,
        dim: Dim,
        range: Range,
        errors: &mut Errors,
    ) -> Option<f64> {
        self.quantity(key, dim, range, errors).map(|r| r.si)
    }

    /// One of a fixed set of words.
    fn choice<T: Copy>(
        &mut self,
        key: &'static str,
        options: &[(&'static str, T)],
        errors: &mut Errors,
    ) -> Option<T> {
        let text = self.text(key, errors)?;
        match options.iter().find(|(id, _)| *id == text) {
            Some((_, v)) => Some(*v),
            None => {
                let names: Vec<&str> = options.iter().map(|(id, _)| *id).collect();
                errors.push(
                    self.field(key),
                    format!("'{text}' is not one of: {}", names.join(", ")),
                );
                None
            }
        }
    }

    fn subtable(&mut self, key: &'static str, errors: &mut Errors) -> Option<Table<'a, '_>> {
        let node = self.get(key)?;
        Table::new(self.field(key), node, errors)
    }

    /// Reports every key that no reader took, in sorted order.
    fn finish(self, errors: &mut Errors) {
        let mut unknown: Vec<&str> = self
            .entries
            .iter()
            .map(|(key, _)| key.as_ref())
            .filter(|key| !self.taken.contains(key))
            .collect();
        if unknown.is_empty() {
            return;
        }
        unknown.sort_unstable();
        let mut known = self.taken.clone();
        known.sort_unstable();
        let message = format!("unknown key; this table takes {}", known.join(", "));
        for key in unknown {
            errors.push(self.field(key), message.clone());
        }
    }
}

/// The accepted interval of a quantity, in SI units.
#[derive(Clone, Copy)]
struct Range {
    lo: f64,
    /// Whether `lo` itself is refused (zero is no mass).
    lo_open: bool,
    hi: f64,
    /// How to print a limit for the message, e.g. 150 kg.
    show: fn(f64) -> String,
}

impl Range {
    const fn positive(hi: f64, show: fn(f64) -> String) -> Range {
        Range {
            lo: 0.0,
            lo_open: true,
            hi,
            show,
        }
    }
    const fn closed(lo: f64, hi: f64, show: fn(f64) -> String) -> Range {
        Range {
            lo,
            lo_open: false,
            hi,
            show,
        }
    }

    fn check(&self, si: f64, text: &str) -> Result<(), String> {
        let too_low = if self.lo_open {
            si <= self.lo
        } else {
            si < self.lo
        };
        if too_low {
            if self.lo == 0.0 && self.lo_open {
                return Err(format!("must be more than zero, got '{text}'"));
            }
            return Err(format!(
                "must be at least {}, got '{text}'",
                (self.show)(self.lo)
            ));
        }
        if si > self.hi {
            return Err(format!(
                "must be at most {} for a small craft, got '{text}'",
                (self.show)(self.hi)
            ));
        }
        Ok(())
    }
}

fn kg(v: f64) -> String {
    format!("{v} kg")
}
fn m(v: f64) -> String {
    format!("{v} m")
}
fn watts(v: f64) -> String {
    format!("{v} W")
}
fn newtons(v: f64) -> String {
    format!("{v} N")
}
fn hours(v: f64) -> String {
    format!("{} h", v / 3600.0)
}
fn amp_hours(v: f64) -> String {
    format!("{} Ah", v / 3600.0)
}
fn degrees(v: f64) -> String {
    format!("{} deg", (v.to_degrees() * 1e6).round() / 1e6)
}
fn celsius(v: f64) -> String {
    format!("{} degC", ((v - 273.15) * 1e6).round() / 1e6)
}
fn speed(v: f64) -> String {
    format!("{v} m/s")
}
fn hertz_s(v: f64) -> String {
    format!("{v} Hz")
}
fn hectopascals(v: f64) -> String {
    format!("{} hPa", v / 100.0)
}
fn c_rate(v: f64) -> String {
    format!("{v} C")
}

const MASS: Range = Range::positive(MAX_MASS_KG, kg);
const LENGTH: Range = Range::positive(MAX_LENGTH_M, m);

/// Reads the whole sheet.
pub(super) fn claim(tree: &Node) -> Result<Claim, Error> {
    let mut errors = Errors::default();
    let claim = read_claim(tree, &mut errors);
    match claim {
        Some(claim) if errors.0.is_empty() => Ok(claim),
        _ => {
            if errors.0.is_empty() {
                errors.push("(sheet)", "could not be read");
            }
            Err(Error::Invalid(errors.into_list()))
        }
    }
}

fn read_claim(tree: &Node, errors: &mut Errors) -> Option<Claim> {
    let mut top = Table::new(Path::Root, tree, errors)?;
    let title = top.text("title", errors);
    if top.get("title").is_none() {
        errors.push("title", "is required: a short name for the claim");
    }
    let source = top.text("source", errors).map(str::to_string);
    let craft = match top.subtable("craft", errors) {
        Some(t) => read_craft(t, errors),
        None => {
            if top.get("craft").is_none() {
                errors.push("craft", "is required: give [craft] with mass (or parts)");
            }
            None
        }
    };
    let rotors = match top.subtable("rotors", errors) {
        Some(t) => read_rotors(t, errors),
        None => {
            if top.get("rotors").is_none() {
                errors.push(
                    "rotors",
                    "is required: give [rotors] with at least count and diameter",
                );
            }
            None
        }
    };
    let battery = top
        .subtable("battery", errors)
        .and_then(|t| read_battery(t, errors));
    let claimed = match top.subtable("claim", errors) {
        Some(t) => read_claimed(t, errors),
        None => Some(Claimed {
            flight_time: None,
            hover_tilt: None,
            hands_free: false,
            altitude_hold: false,
            position_hold: false,
            survives_rotor_failure: 0,
        }),
    };
    let sensing = match top.subtable("sensing", errors) {
        Some(t) => read_sensing(t, errors),
        None => Sensing {
            gyroscope: None,
            accelerometer: None,
            barometer: None,
            position: None,
            loop_rate: None,
        },
    };
    let conditions = match top.subtable("conditions", errors) {
        Some(t) => read_conditions(t, errors),
        None => Conditions {
            altitude: Length::new::<meter>(0.0),
            temperature: None,
            pressure: None,
            wind: Velocity::new::<meter_per_second>(0.0),
        },
    };
    top.finish(errors);

    // A battery that outweighs the craft is read, not refused: the
    // sheet-consistency rule calls it impossible in the report.
    let (craft, rotors, claimed) = (craft?, rotors?, claimed?);
    if claimed.survives_rotor_failure >= rotors.count {
        errors.push(
            "claim.survives_rotor_failure",
            format!(
                "must be less than rotors.count ({}): a craft cannot lose every rotor and fly",
                rotors.count
            ),
        );
    }
    Some(Claim {
        title: title?.to_string(),
        source,
        craft,
        rotors,
        battery,
        claim: claimed,
        sensing,
        conditions,
        given: Vec::new(),
    })
}

fn read_craft(mut t: Table<'_, '_>, errors: &mut Errors) -> Option<Craft> {
    let mass = t.si("mass", Dim::Mass, MASS, errors);
    let mass_given = t.get("mass").is_some();
    let size = t.text("size", errors).and_then(|s| match read_size(s) {
        Ok(size) => Some(size),
        Err(message) => {
            errors.push(t.field("size"), message);
            None
        }
    });
    let avionics_power = t.si(
        "avionics_power",
        Dim::Power,
        Range::closed(0.0, 1000.0, watts),
        errors,
    );
    let mut parts = Vec::new();
    let mut parts_ok = true;
    if let Some(node) = t.get("parts") {
        let field = t.field("parts");
        match node {
            Node::Array(items) if items.len() > MAX_PARTS => {
                errors.push(field, format!("at most {MAX_PARTS} parts"));
                parts_ok = false;
            }
            Node::Array(items) => {
                for (i, item) in items.iter().enumerate() {
                    match read_part(Path::Item(&field, i), item, errors) {
                        Some(p) => parts.push(p),
                        None => parts_ok = false,
                    }
                }
            }
            other => {
                errors.push(
                    field,
                    format!("expected a list of parts, got {}", other.kind()),
                );
                parts_ok = false;
            }
        }
    }
    t.finish(errors);
    let parts_total = (!parts.is_empty()).then(|| {
        parts
            .iter()
            .map(|p| p.mass * f64::from(p.count))
            .fold(Mass::new::<kilogram>(0.0), |a, b| a + b)
    });
    let mass = match (mass, parts_total) {
        (Some(m), _) => Mass::new::<kilogram>(m),
        (None, Some(total)) if !mass_given && parts_ok => {
            if total.get::<kilogram>() > MAX_MASS_KG {
                errors.push(
                    "craft.parts",
                    format!("add up to more than {MAX_MASS_KG} kg, beyond a small craft"),
                );
                return None;
            }
            total
        }
        (None, _) => {
            if !mass_given && parts_ok {
                errors.push(
                    "craft.mass",
                    "is required (or a parts list): the take-off mass, battery included, such as '300 g'",
                );
            }
            return None;
        }
    };
    Some(Craft {
        mass,
        parts_total,
        parts,
        size,
        avionics_power: avionics_power.map(Power::new::<watt>),
    })
}

fn read_part(path: Path<'_>, node: &Node, errors: &mut Errors) -> Option<Part> {
    let mut t = Table::new(path, node, errors)?;
    let name = t.text("name", errors).map(str::to_string);
    if t.get("name").is_none() {
        errors.push(t.field("name"), "is required");
    }
    let mass = t.si("mass", Dim::Mass, MASS, errors);
    if t.get("mass").is_none() {
        errors.push(t.field("mass"), "is required, such as '12 g'");
    }
    let count = match t.get("count") {
        Some(_) => t.count("count", 1, 1000, errors),
        None => Some(1),
    };
    t.finish(errors);
    Some(Part {
        name: name?,
        mass: Mass::new::<kilogram>(mass?),
        count: count?,
    })
}

/// "160 mm x 80 mm x 22 mm" (or "160 x 80 x 22 mm"), length by width by height.
fn read_size(text: &str) -> Result<BoxSize, String> {
    let normal = units::normalize(text);
    let text = normal.as_str();
    let pieces: Vec<&str> = text.split(['x', 'X', '×', '*']).map(str::trim).collect();
    if pieces.len() != 3 {
        return Err(format!(
            "expected length x width x height such as '160 mm x 80 mm x 22 mm', got '{text}'"
        ));
    }
    // A unit written only once, at the end, applies to all three.
    let tail_unit: String = pieces[2][units::number_end(pieces[2])..].trim().to_string();
    let mut sides = [0.0; 3];
    for (i, piece) in pieces.iter().enumerate() {
        let bare = piece.parse::<f64>().is_ok();
        let owned;
        let piece = if bare && !tail_unit.is_empty() {
            owned = format!("{piece} {tail_unit}");
            owned.as_str()
        } else {
            piece
        };
        let reading = units::read(piece, Dim::Length)?;
        LENGTH.check(reading.si, piece)?;
        sides[i] = reading.si;
    }
    Ok(BoxSize {
        length: Length::new::<meter>(sides[0]),
        width: Length::new::<meter>(sides[1]),
        height: Length::new::<meter>(sides[2]),
    })
}

const SPINS: [(&str, Spin); 2] = [("cw", Spin::Cw), ("ccw", Spin::Ccw)];

fn read_rotors(mut t: Table<'_, '_>, errors: &mut Errors) -> Option<Rotors> {
    let count = t.count("count", 1, MAX_ROTORS, errors);
    let count_given = t.get("count").is_some();
    let layout = t.choice("layout", &Layout::ALL, errors);
    let arm = t.si("arm", Dim::Length, LENGTH, errors);
    let diameter = t.si("diameter", Dim::Length, LENGTH, errors);
    let mount = t
        .choice(
            "mount",
            &[("fixed", Mount::Fixed), ("tilting", Mount::Tilting)],
            errors,
        )
        .unwrap_or(Mount::Fixed);
    let tilt_range = t.si(
        "tilt_range",
        Dim::Angle,
        Range::closed(0.0, std::f64::consts::FRAC_PI_2, degrees),
        errors,
    );
    let height = t
        .si(
            "height",
            Dim::Length,
            Range::closed(-MAX_LENGTH_M, MAX_LENGTH_M, m),
            errors,
        )
        .unwrap_or(0.0);
    let motor = t
        .text("motor", errors)
        .and_then(|id| match catalog::motor(id) {
            Some(class) => Some(class),
            None => {
                let known: Vec<&str> = catalog::MOTORS.iter().map(|m| m.id).collect();
                errors.push(
                    t.field("motor"),
                    format!(
                        "'{id}' is not a motor class in the catalog; known classes: {}",
                        known.join(", ")
                    ),
                );
                None
            }
        });
    let drive = t.choice(
        "drive",
        &[("brushed", Drive::Brushed), ("brushless", Drive::Brushless)],
        errors,
    );
    let thrust = t.quantity(
        "max_thrust",
        Dim::Force,
        Range::positive(3000.0, newtons),
        errors,
    );
    let max_power = t.si(
        "max_power",
        Dim::Power,
        Range::positive(50_000.0, watts),
        errors,
    );
    let spins = t
        .get("spins")
        .and_then(|node| read_spin_list(t.field("spins"), node, errors));
    let at = match t.get("at") {
        Some(node) => read_at_list(t.field("at"), node, errors),
        None => Some(Vec::new()),
    };
    t.finish(errors);

    if let (Some(d), Some(class)) = (drive, motor) {
        if d != class.drive {
            errors.push(
                "rotors.drive",
                format!("'{}' contradicts motor class '{}'", d.id(), class.id),
            );
        }
    }
    if mount == Mount::Tilting && tilt_range.is_none() {
        errors.push(
            "rotors.tilt_range",
            "is required for a tilting mount: how far the rotors tilt, such as '30 deg'",
        );
    }
    let at = at?;
    let count = match (count, layout) {
        (Some(n), _) => n,
        (None, Some(Layout::Custom)) if !count_given && !at.is_empty() => at.len() as u32,
        (None, Some(l)) if !count_given && l.rotor_count().is_some() => l.rotor_count()?,
        (None, _) => {
            if !count_given {
                errors.push("rotors.count", "is required: the number of rotors");
            }
            return None;
        }
    };
    let layout = layout.or_else(|| Layout::for_count(count));
    if let Some(l) = layout {
        if let Some(n) = l.rotor_count() {
            if n != count {
                errors.push(
                    "rotors.count",
                    format!("a {} layout has {n} rotors, got {count}", l.id()),
                );
            }
        }
        if l == Layout::Custom && at.len() != count as usize {
            errors.push(
                "rotors.at",
                format!(
                    "a custom layout places every rotor: {count} rotors but {} entries",
                    at.len()
                ),
            );
        }
    }
    if !at.is_empty() && layout != Some(Layout::Custom) {
        errors.push(
            "rotors.at",
            "places rotors by hand only with layout = \"custom\"",
        );
    }
    if let Some(s) = &spins {
        if s.len() != count as usize {
            errors.push(
                "rotors.spins",
                format!("lists {} spins for {count} rotors", s.len()),
            );
        }
    }
    Some(Rotors {
        count,
        layout,
        arm: arm.map(Length::new::<meter>),
        diameter: diameter.map(Length::new::<meter>),
        mount,
        tilt_range: tilt_range.map(Angle::new::<radian>),
        height: Length::new::<meter>(height),
        motor,
        drive,
        max_thrust: thrust.map(|r| Force::new::<newton>(r.si)),
        max_thrust_from_mass: thrust.is_some_and(|r| r.dim == Dim::Mass),
        max_power: max_power.map(Power::new::<watt>),
        spins,
        at,
    })
}

fn read_spin(field: Path<'_>, node: &Node, errors: &mut Errors) -> Option<Spin> {
    match node {
        Node::Str(s) => match SPINS.iter().find(|(id, _)| id == s) {
            Some((_, spin)) => Some(*spin),
            None => {
                errors.push(field, format!("'{s}' is not one of: cw, ccw"));
                None
            }
        },
        other => {
            errors.push(
                field,
                format!("expected \"cw\" or \"ccw\", got {}", other.kind()),
            );
            None
        }
    }
}

fn read_spin_list(field: Path<'_>, node: &Node, errors: &mut Errors) -> Option<Vec<Spin>> {
    let Node::Array(items) = node else {
        errors.push(
            field,
            format!(
                "expected a list such as [\"cw\", \"ccw\"], got {}",
                node.kind()
            ),
        );
        return None;
    };
    if items.len() > MAX_ROTORS as usize {
        errors.push(field, format!("at most {MAX_ROTORS} spins"));
        return None;
    }
    let spins: Vec<Option<Spin>> = items
        .iter()
        .enumerate()
        .map(|(i, n)| read_spin(Path::Item(&field, i), n, errors))
        .collect();
    spins.into_iter().collect()
}

fn read_at_list(field: Path<'_>, node: &Node, errors: &mut Errors) -> Option<Vec<RotorAt>> {
    let Node::Array(items) = node else {
        errors.push(
            field,
            format!(
                "expected a list of [[rotors.at]] tables, got {}",
                node.kind()
            ),
        );
        return None;
    };
    if items.len() > MAX_ROTORS as usize {
        errors.push(field, format!("at most {MAX_ROTORS} rotors"));
        return None;
    }
    let rotors: Vec<Option<RotorAt>> = items
        .iter()
        .enumerate()
        .map(|(i, n)| read_at(Path::Item(&field, i), n, errors))
        .collect();
    rotors.into_iter().collect()
}

fn read_at(path: Path<'_>, node: &Node, errors: &mut Errors) -> Option<RotorAt> {
    let mut t = Table::new(path, node, errors)?;
    let offset = Range::closed(-MAX_LENGTH_M, MAX_LENGTH_M, m);
    let coordinate = |t: &mut Table<'_, '_>, key: &'static str, errors: &mut Errors| {
        let v = t.si(key, Dim::Length, offset, errors);
        if t.get(key).is_none() {
            errors.push(t.field(key), "is required, such as '70 mm'");
        }
        v
    };
    let x = coordinate(&mut t, "x", errors);
    let y = coordinate(&mut t, "y", errors);
    let z = match t.get("z") {
        Some(_) => t.si("z", Dim::Length, offset, errors),
        None => Some(0.0),
    };
    let spin = match t.get("spin") {
        Some(node) => read_spin(t.field("spin"), node, errors),
        None => {
            errors.push(t.field("spin"), "is required: \"cw\" or \"ccw\"");
            None
        }
    };
    let tilt_axis = match t.get("tilt_axis") {
        Some(node) => Some(read_axis(t.field("tilt_axis"), node, errors)?),
        None => None,
    };
    let tilt_range = t.si(
        "tilt_range",
        Dim::Angle,
        Range::closed(0.0, std::f64::consts::FRAC_PI_2, degrees),
        errors,
    );
    if tilt_axis.is_some() && tilt_range.is_none() {
        errors.push(
            t.field("tilt_range"),
            "is required with a tilt_axis, such as '30 deg'",
        );
    }
    t.finish(errors);
    Some(RotorAt {
        x: Length::new::<meter>(x?),
        y: Length::new::<meter>(y?),
        z: Length::new::<meter>(z?),
        spin: spin?,
        tilt_axis,
        tilt_range: tilt_range.map(Angle::new::<radian>),
    })
}

/// A tilt hinge: "x", "y", or a list of three numbers, normalised.
fn read_axis(field: Path<'_>, node: &Node, errors: &mut Errors) -> Option<[f64; 3]> {
    let v = match node {
        Node::Str(s) if s == "x" => [1.0, 0.0, 0.0],
        Node::Str(s) if s == "y" => [0.0, 1.0, 0.0],
        Node::Array(items) if items.len() == 3 => {
            let mut v = [0.0; 3];
            for (i, item) in items.iter().enumerate() {
                v[i] = match item {
                    Node::Int(n) => *n as f64,
                    Node::Float(f) if f.is_finite() => *f,
                    _ => {
                        errors.push(field, "expected three finite numbers such as [0, 1, 0]");
                        return None;
                    }
                };
            }
            v
        }
        _ => {
            errors.push(
                field,
                "expected \"x\", \"y\" or three numbers such as [0, 1, 0]",
            );
            return None;
        }
    };
    let norm = (v[0] * v[0] + v[1] * v[1] + v[2] * v[2]).sqrt();
    if norm.is_nan() || norm <= 1e-9 || !norm.is_finite() {
        errors.push(field, "must not be the zero vector");
        return None;
    }
    Some([v[0] / norm, v[1] / norm, v[2] / norm])
}

fn read_battery(mut t: Table<'_, '_>, errors: &mut Errors) -> Option<Battery> {
    let chemistry = t
        .text("chemistry", errors)
        .and_then(|id| match catalog::chemistry(id) {
            Some(c) => Some(c),
            None => {
                let known: Vec<&str> = catalog::CHEMISTRIES.iter().map(|c| c.id).collect();
                errors.push(
                    t.field("chemistry"),
                    format!("'{id}' is not one of: {}", known.join(", ")),
                );
                None
            }
        });
    let cells = match t.get("cells") {
        Some(_) => t.count("cells", 1, MAX_CELLS, errors),
        None => Some(1),
    };
    let capacity = t.si(
        "capacity",
        Dim::Charge,
        Range::positive(1000.0 * 3600.0, amp_hours),
        errors,
    );
    let mass = t.si("mass", Dim::Mass, MASS, errors);
    let max_discharge = t.si(
        "max_discharge",
        Dim::CRate,
        Range::positive(1000.0, c_rate),
        errors,
    );
    t.finish(errors);
    Some(Battery {
        chemistry,
        cells: cells?,
        capacity: capacity.map(ElectricCharge::new::<coulomb>),
        mass: mass.map(Mass::new::<kilogram>),
        max_discharge,
    })
}

fn read_claimed(mut t: Table<'_, '_>, errors: &mut Errors) -> Option<Claimed> {
    let flight_time = t.si(
        "flight_time",
        Dim::Time,
        Range::positive(48.0 * 3600.0, hours),
        errors,
    );
    let hover_tilt = t.si(
        "hover_tilt",
        Dim::Angle,
        Range::closed(0.0, 89.0_f64.to_radians(), degrees),
        errors,
    );
    let hands_free = t.flag("hands_free", errors).unwrap_or(false);
    let altitude_hold = t.flag("altitude_hold", errors).unwrap_or(false);
    let position_hold = t.flag("position_hold", errors).unwrap_or(false);
    let survives = match t.get("survives_rotor_failure") {
        Some(_) => t.count("survives_rotor_failure", 0, MAX_ROTORS, errors),
        None => Some(0),
    };
    t.finish(errors);
    Some(Claimed {
        flight_time: flight_time.map(Time::new::<second>),
        hover_tilt: hover_tilt.map(Angle::new::<radian>),
        hands_free,
        altitude_hold,
        position_hold,
        survives_rotor_failure: survives?,
    })
}

fn read_sensing(mut t: Table<'_, '_>, errors: &mut Errors) -> Sensing {
    let gyroscope = t.flag("gyroscope", errors);
    let accelerometer = t.flag("accelerometer", errors);
    let barometer = t.flag("barometer", errors);
    let position = t.choice(
        "position",
        &[
            ("none", PositionSensor::None),
            ("gnss", PositionSensor::Gnss),
            ("optical-flow", PositionSensor::OpticalFlow),
            ("vision", PositionSensor::Vision),
        ],
        errors,
    );
    let loop_rate = t.si(
        "loop_rate",
        Dim::Frequency,
        Range::positive(100_000.0, hertz_s),
        errors,
    );
    t.finish(errors);
    Sensing {
        gyroscope,
        accelerometer,
        barometer,
        position,
        loop_rate: loop_rate.map(Frequency::new::<hertz>),
    }
}

fn read_conditions(mut t: Table<'_, '_>, errors: &mut Errors) -> Conditions {
    // The ISA troposphere model holds from below sea level to 11 km.
    let altitude = t
        .si(
            "altitude",
            Dim::Length,
            Range::closed(-500.0, 11_000.0, m),
            errors,
        )
        .unwrap_or(0.0);
    let temperature = t.si(
        "temperature",
        Dim::Temperature,
        Range::closed(273.15 - 60.0, 273.15 + 60.0, celsius),
        errors,
    );
    let wind = t
        .si("wind", Dim::Speed, Range::closed(0.0, 60.0, speed), errors)
        .unwrap_or(0.0);
    // Station pressure within the ISA troposphere: from 226.32 hPa (its top,
    // 11 km) to 1100 hPa (above the highest sea-level pressure recorded, 1084.8 hPa).
    let pressure = t.si(
        "pressure",
        Dim::Pressure,
        Range::closed(22_632.0, 110_000.0, hectopascals),
        errors,
    );
    t.finish(errors);
    Conditions {
        altitude: Length::new::<meter>(altitude),
        temperature: temperature.map(ThermodynamicTemperature::new::<kelvin>),
        pressure: pressure.map(Pressure::new::<pascal>),
        wind: Velocity::new::<meter_per_second>(wind),
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn unknown_keys_are_reported_in_sorted_order() {
        let text = r#"{"title": "t", "zeta": 1, "alpha": 2, "craft": {"zz": 1, "aa": 2}}"#;
        let Err(Error::Invalid(errors)) = parse(text, Format::Json) else {
            panic!("the sheet should be refused");
        };
        let unknown: Vec<&str> = errors
            .iter()
            .filter(|e| e.message.starts_with("unknown key"))
            .map(|e| e.field.as_str())
            .collect();
        assert_eq!(unknown, ["craft.aa", "craft.zz", "alpha", "zeta"]);
    }

    #[test]
    fn a_known_key_after_many_unknown_ones_is_still_taken() {
        let junk: Vec<String> = (0..40).map(|i| format!("\"x{i:02}\": 1")).collect();
        let text = format!(
            r#"{{"title": "t", "craft": {{{}, "mass": "1 kg"}}}}"#,
            junk.join(", ")
        );
        let Err(Error::Invalid(errors)) = parse(&text, Format::Json) else {
            panic!("the sheet should be refused");
        };
        let craft: Vec<&str> = errors
            .iter()
            .filter(|e| e.field.starts_with("craft."))
            .map(|e| e.field.as_str())
            .collect();
        assert_eq!(craft.len(), 40);
        assert!(!craft.contains(&"craft.mass"));
    }

    #[test]
    fn the_error_list_stops_at_fifty_and_counts_the_rest() {
        let junk: Vec<String> = (0..110_000).map(|i| format!("\"x{i}\": 1")).collect();
        let text = format!(r#"{{"title": "t", {}}}"#, junk.join(", "));
        let Err(Error::Invalid(errors)) = parse(&text, Format::Json) else {
            panic!("the sheet should be refused");
        };
        // 110,000 unknown keys and the three missing required tables: 50 listed.
        assert_eq!(errors.len(), MAX_ERRORS + 1);
        let last = errors.last().unwrap();
        assert_eq!(last.field, "(sheet)");
        assert_eq!(last.message, "and 109952 more errors");
    }
}

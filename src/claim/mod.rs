//! The claim sheet: what a maker says about a craft, read into typed quantities.
//!
//! "Parse, don't validate": [`parse`] turns sheet text into a [`Claim`] whose
//! every field is present where required, in range and in units, or into an
//! [`Error`] that names each offending field. Rules never see raw text.
//!
//! Body axes follow ROS REP 103 (x forward, y left, z up, right-handed); spin
//! senses are as seen from above.

pub mod demo;
mod read;
mod tree;
pub mod units;

use std::fmt;

use uom::si::f64::{
    Angle, ElectricCharge, Force, Frequency, Length, Mass, Power, Pressure,
    ThermodynamicTemperature, Time, Velocity,
};

use crate::catalog::{Chemistry, Drive, MotorClass};

/// The formats a sheet may come in; JSON has the same shape as TOML.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Format {
    Toml,
    Json,
}

impl fmt::Display for Format {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        f.write_str(match self {
            Format::Toml => "TOML",
            Format::Json => "JSON",
        })
    }
}

/// Reads a sheet in the given format.
pub fn parse(text: &str, format: Format) -> Result<Claim, Error> {
    let tree = match format {
        Format::Toml => tree::from_toml(text)?,
        Format::Json => tree::from_json(text)?,
    };
    let mut claim = read::claim(&tree)?;
    claim.given = fields_given(&tree);
    Ok(claim)
}

/// The dotted paths of the fields a sheet gives (`title`, `craft.mass`,
/// `rotors.at`), sorted, the same for TOML and JSON: a top-level key, or a key of one of
/// the top-level tables; a list of tables (`craft.parts`, `rotors.at`) counts
/// as one field. Called on a sheet that was read, so every key is a known one.
fn fields_given(tree: &tree::Node) -> Vec<String> {
    let tree::Node::Table(top) = tree else {
        return Vec::new();
    };
    let mut given = Vec::new();
    for (key, node) in top {
        match node {
            tree::Node::Table(entries) => {
                given.extend(entries.iter().map(|(field, _)| format!("{key}.{field}")))
            }
            _ => given.push(key.to_string()),
        }
    }
    given.sort_unstable();
    given
}

/// Reads a sheet whose format is told by its first non-blank character:
/// `{` is JSON, anything else TOML.
pub fn parse_any(text: &str) -> Result<Claim, Error> {
    parse(text, sniff(text))
}

/// The format a sheet's text looks like.
pub fn sniff(text: &str) -> Format {
    if text
        .trim_start_matches('\u{feff}')
        .trim_start()
        .starts_with('{')
    {
        Format::Json
    } else {
        Format::Toml
    }
}

/// Why a sheet was not accepted.
#[derive(Debug, Clone, PartialEq)]
pub enum Error {
    /// The text is not well-formed TOML or JSON.
    Syntax {
        format: Format,
        line: usize,
        column: usize,
        message: String,
    },
    /// Well-formed, but fields are missing, unknown, in the wrong unit or out of range.
    Invalid(Vec<FieldError>),
}

/// One rejected field, with its dotted path (`rotors.diameter`, `craft.parts[2].mass`).
#[derive(Debug, Clone, PartialEq, Eq, serde::Serialize)]
pub struct FieldError {
    pub field: String,
    pub message: String,
}

impl fmt::Display for FieldError {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        write!(f, "{}: {}", self.field, self.message)
    }
}

impl fmt::Display for Error {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        match self {
            Error::Syntax {
                format,
                line,
                column,
                message,
            } => write!(
                f,
                "the sheet is not valid {format} (line {line}, column {column}): {message}"
            ),
            Error::Invalid(errors) => {
                for (i, e) in errors.iter().enumerate() {
                    if i > 0 {
                        writeln!(f)?;
                    }
                    write!(f, "{e}")?;
                }
                Ok(())
            }
        }
    }
}

impl std::error::Error for Error {}

/// A claim sheet that has been read and checked.
#[derive(Debug, Clone, PartialEq)]
pub struct Claim {
    pub title: String,
    pub source: Option<String>,
    pub craft: Craft,
    pub rotors: Rotors,
    pub battery: Option<Battery>,
    pub claim: Claimed,
    pub sensing: Sensing,
    pub conditions: Conditions,
    /// The dotted paths of the fields the sheet gave, sorted, so that
    /// the report can name those that no rule reads.
    pub given: Vec<String>,
}

#[derive(Debug, Clone, PartialEq)]
pub struct Craft {
    /// Take-off mass, battery included: the stated one, else the parts' sum.
    pub mass: Mass,
    /// Sum of the parts list, when there is one.
    pub parts_total: Option<Mass>,
    pub parts: Vec<Part>,
    pub size: Option<BoxSize>,
    /// Electrical power drawn by everything but the motors (flight controller,
    /// receiver, camera, video link), when the sheet states it.
    pub avionics_power: Option<Power>,
}

#[derive(Debug, Clone, PartialEq)]
pub struct Part {
    pub name: String,
    pub mass: Mass,
    pub count: u32,
}

/// Overall length (x), width (y) and height (z) of the craft's body.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct BoxSize {
    pub length: Length,
    pub width: Length,
    pub height: Length,
}

#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Layout {
    Single,
    Coaxial,
    SideBySide,
    Tri,
    QuadX,
    QuadPlus,
    Hex,
    Octo,
    Custom,
}

impl Layout {
    pub const ALL: [(&'static str, Layout); 9] = [
        ("single", Layout::Single),
        ("coaxial", Layout::Coaxial),
        ("side-by-side", Layout::SideBySide),
        ("tri", Layout::Tri),
        ("quad-x", Layout::QuadX),
        ("quad-plus", Layout::QuadPlus),
        ("hex", Layout::Hex),
        ("octo", Layout::Octo),
        ("custom", Layout::Custom),
    ];

    pub fn id(self) -> &'static str {
        Self::ALL
            .iter()
            .find(|(_, l)| *l == self)
            .map(|(id, _)| *id)
            .unwrap_or("custom")
    }

    /// The number of rotors the layout has, where it fixes one.
    pub fn rotor_count(self) -> Option<u32> {
        match self {
            Layout::Single => Some(1),
            Layout::Coaxial | Layout::SideBySide => Some(2),
            Layout::Tri => Some(3),
            Layout::QuadX | Layout::QuadPlus => Some(4),
            Layout::Hex => Some(6),
            Layout::Octo => Some(8),
            Layout::Custom => None,
        }
    }

    /// The usual layout for a rotor count, when one is usual.
    pub fn for_count(count: u32) -> Option<Layout> {
        match count {
            1 => Some(Layout::Single),
            2 => Some(Layout::SideBySide),
            3 => Some(Layout::Tri),
            4 => Some(Layout::QuadX),
            6 => Some(Layout::Hex),
            8 => Some(Layout::Octo),
            _ => None,
        }
    }
}

#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Mount {
    Fixed,
    Tilting,
}

/// The sense a rotor turns, seen from above: plain geometry, defined beside the
/// control analysis that reads it.
pub use crate::physics::control::Spin;

/// A rotor placed by hand (`layout = "custom"`).
#[derive(Debug, Clone, PartialEq)]
pub struct RotorAt {
    pub x: Length,
    pub y: Length,
    pub z: Length,
    pub spin: Spin,
    /// Unit vector of the tilt hinge in body axes, for a tilting rotor.
    pub tilt_axis: Option<[f64; 3]>,
    pub tilt_range: Option<Angle>,
}

#[derive(Debug, Clone, PartialEq)]
pub struct Rotors {
    pub count: u32,
    /// The arrangement, stated or the usual one for the count.
    pub layout: Option<Layout>,
    pub arm: Option<Length>,
    pub diameter: Option<Length>,
    pub mount: Mount,
    pub tilt_range: Option<Angle>,
    /// Rotor plane above the centre of mass.
    pub height: Length,
    pub motor: Option<&'static MotorClass>,
    pub drive: Option<Drive>,
    pub max_thrust: Option<Force>,
    /// The max_thrust field was written as a mass and read as gram-force.
    pub max_thrust_from_mass: bool,
    pub max_power: Option<Power>,
    pub spins: Option<Vec<Spin>>,
    pub at: Vec<RotorAt>,
}

impl Rotors {
    /// The drive type: stated, else the motor class's.
    pub fn drive(&self) -> Option<Drive> {
        self.drive.or(self.motor.map(|m| m.drive))
    }
}

#[derive(Debug, Clone, PartialEq)]
pub struct Battery {
    pub chemistry: Option<&'static Chemistry>,
    pub cells: u32,
    pub capacity: Option<ElectricCharge>,
    pub mass: Option<Mass>,
    /// Continuous discharge rating, in multiples of capacity per hour.
    pub max_discharge: Option<f64>,
}

/// What the sheet says the craft does.
#[derive(Debug, Clone, PartialEq)]
pub struct Claimed {
    pub flight_time: Option<Time>,
    pub hover_tilt: Option<Angle>,
    pub hands_free: bool,
    pub altitude_hold: bool,
    pub position_hold: bool,
    pub survives_rotor_failure: u32,
}

#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum PositionSensor {
    None,
    Gnss,
    OpticalFlow,
    Vision,
}

/// The sensors on board; `None` where the sheet does not say.
#[derive(Debug, Clone, PartialEq)]
pub struct Sensing {
    pub gyroscope: Option<bool>,
    pub accelerometer: Option<bool>,
    pub barometer: Option<bool>,
    pub position: Option<PositionSensor>,
    pub loop_rate: Option<Frequency>,
}

#[derive(Debug, Clone, PartialEq)]
pub struct Conditions {
    /// The pressure altitude: the height whose ISA pressure the air is taken
    /// at (when no station pressure is given), and the height for gravity.
    pub altitude: Length,
    /// Outside air temperature; `None` means the ISA value at the pressure altitude.
    pub temperature: Option<ThermodynamicTemperature>,
    /// Station pressure, the air's pressure where the craft flies; when given
    /// it decides the density instead of the ISA pressure at `altitude`.
    pub pressure: Option<Pressure>,
    pub wind: Velocity,
}

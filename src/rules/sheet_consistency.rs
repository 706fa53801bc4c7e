//! Rule 9, sheet-consistency: does the sheet agree with itself?
//!
//! Givens: the masses (take-off, battery, parts, motors of the named class),
//! the rotors' size and places, the motor class's usual propellers, the
//! station pressure against the stated altitude. Each comparison that the
//! sheet gives the fields for is made; each contradiction is named with its
//! fields and its own verdict, and the finding takes the worst. A sheet that
//! contradicts itself is never called consistent; one that gives nothing to
//! compare is not assessed.
//!
//! The verdicts, and why:
//! - a battery as heavy as the whole craft (whose mass includes it) is impossible;
//! - motors of the named class and the pack outweighing the craft would need
//!   motors lighter than their class and a frame, propellers and wiring of
//!   no mass: implausible;
//! - parts adding up to more than the craft by over 5 % (more than rounding
//!   explains): implausible, since a craft weighs at least its parts unless
//!   the list names things that do not fly; parts short of the mass by over
//!   15 % (more than the wiring and screws lists leave out): doubtful;
//! - a propeller outside the motor class's usual range: doubtful, since the
//!   class's thrust and power figures are for its usual propellers;
//! - rotor disks that overlap in one plane: implausible where the sheet
//!   places them by hand at one height (blades of independently throttled
//!   motors would strike), doubtful for a preset layout (such rotors must sit
//!   at staggered heights, which the preset does not say);
//! - a station pressure that the stated altitude explains by no weather ever
//!   recorded: implausible; beyond ordinary weather: doubtful.
//!
//! The rotors reaching beyond the stated size is no contradiction: the size
//! is the body's (for drag and inertia), and arms carry rotors outside a body.
//! The finding gives the rotors' reach beside it for a reviewer to judge.

use uom::si::f64::{Length, Mass, Pressure};
use uom::si::{length::millimeter, mass::gram, pressure::hectopascal};

use super::common::fixed;
use super::geometry;
use crate::catalog::{Basis, MotorClass};
use crate::claim::{Claim, Layout};
use crate::physics::atmosphere;
use crate::physics::control::Placement;
use crate::report::{keys, Finding, Sig3, Verdict};

pub const ID: &str = "sheet-consistency";
pub const TITLE: &str = "The sheet against itself";
pub const METHOD: &str = "The sheet's own figures are compared with each other. The battery is part of the take-off mass, so a battery at least as heavy as the craft is impossible. The motors of the named class (the class's mass each) and the stated battery together heavier than the craft would need lighter motors than the class and a frame of no mass: implausible. The parts list against the stated mass: more than 5 % above it is implausible (a craft weighs at least its parts), more than 15 % below it doubtful (more than the wiring and screws a list leaves out). A stated propeller outside the motor class's usual range is doubtful (the class's figures are for its usual propellers). Rotor disks (the stated diameter at the rotors' places) that overlap in one plane: implausible when placed by hand at one height, doubtful for a preset layout (they would have to sit at staggered heights). A station pressure against the ISA pressure at the stated altitude, which is read as the pressure altitude when no pressure is given: beyond the highest and lowest sea-level pressures recorded (1084.8 and 870 hPa against 1013.25) implausible, beyond ordinary weather (plus or minus 5 %) doubtful. Rotors reaching beyond the stated size are not counted against the sheet: the size is the body's.";

/// The sheet fields this rule compares (`rules::fields`).
pub const READS: &[&str] = &[
    "craft.mass",
    "craft.parts",
    "craft.size",
    "battery.mass",
    "rotors.count",
    "rotors.layout",
    "rotors.arm",
    "rotors.height",
    "rotors.at",
    "rotors.diameter",
    "rotors.motor",
    "conditions.altitude",
    "conditions.pressure",
];

/// Parts above the stated mass that rounding of the listed masses explains.
const PARTS_OVER: f64 = 0.05;
const PARTS_OVER_BASIS: Basis = Basis::CommonPractice(
    "part masses are listed rounded to the gram or to a datasheet's figure; 5 % covers that",
);
/// Parts below the stated mass that the unlisted wiring, screws, glue and labels explain.
const PARTS_UNDER: f64 = 0.15;
const PARTS_UNDER_BASIS: Basis = Basis::FromMemory(
    "wiring, connectors, fasteners, glue and labels, which parts lists leave out, come to about a tenth of a small craft's mass",
);
/// A propeller diameter within this share of the class's range counts as in it (inch sizes rounded to millimetres).
const PROP_ROUNDING: f64 = 0.02;
/// Disks that overlap by no more than this (or share an axis within it) do not count.
const OVERLAP_TOLERANCE_MM: f64 = 1.0;
/// Station pressure over the ISA pressure at the stated altitude that ordinary weather gives.
const WEATHER_ORDINARY: (f64, f64) = (0.95, 1.05);
const WEATHER_ORDINARY_BASIS: Basis = Basis::FromMemory(
    "sea-level pressure stays within about 960 to 1060 hPa outside storms, within 5 % of 1013.25 hPa",
);
/// The lowest and highest sea-level pressures recorded, 870 and 1084.8 hPa, over 1013.25 hPa.
const WEATHER_RECORDS: (f64, f64) = (870.0 / 1013.25, 1084.8 / 1013.25);
const WEATHER_RECORDS_BASIS: Basis = Basis::FromMemory(
    "WMO world records: 870 hPa in Typhoon Tip (1979), 1084.8 hPa at Agata, Siberia (1968)",
);

/// One comparison the sheet gave the fields for.
#[derive(Debug, Clone, PartialEq)]
pub enum Check {
    /// `battery.mass` against `craft.mass`.
    Battery { battery: Mass, craft: Mass },
    /// The motors of the class (count x class mass) and the stated pack against `craft.mass`.
    MotorsAndPack {
        class: &'static MotorClass,
        count: u32,
        motors: Mass,
        pack: Option<Mass>,
        craft: Mass,
    },
    /// The parts list's sum against the stated mass.
    Parts { total: Mass, craft: Mass },
    /// The stated propeller against the class's usual range.
    Propeller {
        class: &'static MotorClass,
        diameter: Length,
    },
    /// The closest pair of rotor axes in top view against the stated diameter.
    Rotors {
        diameter: Length,
        spacing: Length,
        /// Placed by hand at one height (a custom layout), rather than by a preset.
        by_hand: bool,
    },
    /// The station pressure against the ISA pressure at the stated altitude.
    Pressure {
        stated: Pressure,
        isa: Pressure,
        altitude: Length,
    },
}

impl Check {
    /// The verdict of this comparison alone.
    pub fn verdict(&self) -> Verdict {
        match self {
            Check::Battery { battery, craft } if battery >= craft => Verdict::Impossible,
            Check::MotorsAndPack {
                motors,
                pack,
                craft,
                ..
            } if *motors + pack.unwrap_or_default() > *craft => Verdict::Implausible,
            Check::Parts { total, craft } => {
                let share = (*total / *craft).value;
                if share > 1.0 + PARTS_OVER {
                    Verdict::Implausible
                } else if share < 1.0 - PARTS_UNDER {
                    Verdict::Doubtful
                } else {
                    Verdict::Consistent
                }
            }
            Check::Propeller { class, diameter } => {
                let d = diameter.get::<millimeter>();
                let (lo, hi) = class.prop_mm;
                if d < lo * (1.0 - PROP_ROUNDING) || d > hi * (1.0 + PROP_ROUNDING) {
                    Verdict::Doubtful
                } else {
                    Verdict::Consistent
                }
            }
            Check::Rotors {
                diameter,
                spacing,
                by_hand,
            } if overlap_mm(*diameter, *spacing) > OVERLAP_TOLERANCE_MM => {
                if *by_hand {
                    Verdict::Implausible
                } else {
                    Verdict::Doubtful
                }
            }
            Check::Pressure { stated, isa, .. } => {
                let ratio = (*stated / *isa).value;
                if ratio < WEATHER_RECORDS.0 || ratio > WEATHER_RECORDS.1 {
                    Verdict::Implausible
                } else if ratio < WEATHER_ORDINARY.0 || ratio > WEATHER_ORDINARY.1 {
                    Verdict::Doubtful
                } else {
                    Verdict::Consistent
                }
            }
            _ => Verdict::Consistent,
        }
    }

    /// The sheet fields the comparison sets against each other.
    pub fn fields(&self) -> &'static str {
        match self {
            Check::Battery { .. } => "battery.mass, craft.mass",
            Check::MotorsAndPack { .. } => "rotors.motor, rotors.count, battery.mass, craft.mass",
            Check::Parts { .. } => "craft.parts, craft.mass",
            Check::Propeller { .. } => "rotors.diameter, rotors.motor",
            Check::Rotors { by_hand: true, .. } => "rotors.at, rotors.diameter",
            Check::Rotors { .. } => "rotors.layout, rotors.arm, rotors.diameter",
            Check::Pressure { .. } => "conditions.pressure, conditions.altitude",
        }
    }
}

/// How far two disks of diameter D whose axes stand `spacing` apart overlap, in mm.
fn overlap_mm(diameter: Length, spacing: Length) -> f64 {
    (diameter - spacing).get::<millimeter>()
}

/// The closest pair of rotor axes in top view, leaving out rotors that share
/// an axis (a coaxial pair), and whether every rotor was placed by hand at
/// one height. `None` with fewer than two rotors apart.
fn closest_axes(placed: &[Placement], by_hand: bool) -> Option<(Length, bool)> {
    let apart = Length::new::<millimeter>(OVERLAP_TOLERANCE_MM);
    let mut closest: Option<Length> = None;
    let mut one_plane = true;
    for (i, a) in placed.iter().enumerate() {
        for b in &placed[i + 1..] {
            let (dx, dy) = (a.x - b.x, a.y - b.y);
            let spacing: Length = (dx * dx + dy * dy).sqrt();
            if spacing <= apart {
                continue;
            }
            if (a.z - b.z).abs() > apart {
                // Rotors at different heights may overlap in top view without striking.
                one_plane = false;
                continue;
            }
            if closest.is_none_or(|c| spacing < c) {
                closest = Some(spacing);
            }
        }
    }
    closest.map(|c| (c, by_hand && one_plane))
}

/// The worked comparisons and the rotors' reach against the stated size.
#[derive(Debug, Clone)]
pub struct Solution {
    pub checks: Vec<Check>,
    /// Tip to tip along x and y, where the rotors are placed and their diameter stated.
    pub reach: Option<(Length, Length)>,
    pub verdict: Verdict,
}

/// Makes every comparison the sheet gives the fields for.
pub fn solve(claim: &Claim) -> Solution {
    let craft = claim.craft.mass;
    let r = &claim.rotors;
    let mass_given = claim.given.iter().any(|f| f == "craft.mass");
    let battery = claim.battery.as_ref().and_then(|b| b.mass);
    let mut checks = Vec::new();

    if let Some(battery) = battery {
        checks.push(Check::Battery { battery, craft });
    }
    if let Some(class) = r.motor {
        checks.push(Check::MotorsAndPack {
            class,
            count: r.count,
            motors: class.mass() * f64::from(r.count),
            pack: battery,
            craft,
        });
    }
    if let (Some(total), true) = (claim.craft.parts_total, mass_given) {
        checks.push(Check::Parts { total, craft });
    }
    if let (Some(class), Some(diameter)) = (r.motor, r.diameter) {
        checks.push(Check::Propeller { class, diameter });
    }
    let placed = geometry::placements(r);
    let mut reach = None;
    if let (Some(placed), Some(diameter)) = (&placed, r.diameter) {
        let by_hand = r.layout == Some(Layout::Custom);
        if let Some((spacing, by_hand)) = closest_axes(placed, by_hand) {
            checks.push(Check::Rotors {
                diameter,
                spacing,
                by_hand,
            });
        }
        let span = |f: fn(&Placement) -> Length| {
            let (lo, hi) = placed.iter().map(f).fold(
                (
                    Length::new::<millimeter>(f64::INFINITY),
                    Length::new::<millimeter>(f64::NEG_INFINITY),
                ),
                |(lo, hi), v| (lo.min(v), hi.max(v)),
            );
            hi - lo + diameter
        };
        if !placed.is_empty() {
            reach = Some((span(|p| p.x), span(|p| p.y)));
        }
    }
    let altitude_given = claim.given.iter().any(|f| f == "conditions.altitude");
    if let (Some(stated), true) = (claim.conditions.pressure, altitude_given) {
        let altitude = claim.conditions.altitude;
        checks.push(Check::Pressure {
            stated,
            isa: atmosphere::isa(altitude, None).pressure,
            altitude,
        });
    }
    let verdict = if checks.is_empty() {
        Verdict::NotAssessed
    } else {
        Verdict::worst(checks.iter().map(Check::verdict))
    };
    Solution {
        checks,
        reach,
        verdict,
    }
}

pub fn check(claim: &Claim) -> Finding {
    describe(claim, &solve(claim))
}

/// Whether the stated battery is at least as heavy as the whole craft, which
/// this rule calls impossible: a rule that would build on the battery mass
/// can ask, and leave the pack's share of the mass out.
pub fn battery_outweighs_craft(claim: &Claim) -> bool {
    claim
        .battery
        .as_ref()
        .and_then(|b| b.mass)
        .is_some_and(|m| m >= claim.craft.mass)
}

/// A mass for people: grams below a kilogram, else kilograms.
fn mass(m: Mass) -> String {
    let g = m.get::<gram>();
    if g.abs() >= 1000.0 {
        format!("{} kg", Sig3(g / 1000.0))
    } else {
        format!("{} g", Sig3(g))
    }
}

fn mm(l: Length) -> Sig3 {
    Sig3(l.get::<millimeter>())
}

/// The sentence for one comparison: what it found, and for a contradiction what would mend it.
fn say(check: &Check) -> (String, Option<String>) {
    let bad = check.verdict() != Verdict::Consistent;
    match check {
        Check::Battery { battery, craft } if bad => (
            format!(
                "The battery ({}) is at least as heavy as the whole craft ({}), whose mass includes it.",
                mass(*battery),
                mass(*craft)
            ),
            Some("Correct battery.mass or craft.mass: the take-off mass includes the battery.".into()),
        ),
        Check::Battery { battery, craft } => (
            format!(
                "The battery ({}) is {} % of the take-off mass ({}).",
                mass(*battery),
                Sig3(100.0 * (*battery / *craft).value),
                mass(*craft)
            ),
            None,
        ),
        Check::MotorsAndPack {
            class,
            count,
            motors,
            pack,
            craft,
        } => {
            let with_pack = pack.map_or(String::new(), |p| format!(" and the battery ({})", mass(p)));
            let what = format!(
                "The motors ({} of class {} at {} g each, {}){with_pack}",
                count,
                class.id,
                Sig3(class.mass_g),
                mass(*motors),
            );
            if bad {
                (
                    format!(
                        "{what} alone weigh more than the stated take-off mass ({}), leaving nothing for frame, propellers and wiring.",
                        mass(*craft)
                    ),
                    Some("Correct craft.mass, or name the motor class that is fitted (rotors.motor).".into()),
                )
            } else {
                (
                    format!(
                        "{what} leave {} of the take-off mass for the rest.",
                        mass(*craft - *motors - pack.unwrap_or_default())
                    ),
                    None,
                )
            }
        }
        Check::Parts { total, craft } => {
            let share = (*total / *craft).value;
            let off = Sig3(100.0 * (share - 1.0).abs());
            match check.verdict() {
                Verdict::Implausible => (
                    format!(
                        "The parts add up to {}, {off} % more than the stated take-off mass ({}): a craft weighs at least its parts.",
                        mass(*total),
                        mass(*craft)
                    ),
                    Some("Correct craft.mass or the parts list (craft.parts): list only what flies.".into()),
                ),
                Verdict::Doubtful => (
                    format!(
                        "The parts add up to {}, {off} % short of the stated take-off mass ({}): more is missing than wiring and screws.",
                        mass(*total),
                        mass(*craft)
                    ),
                    Some("Complete the parts list (craft.parts), or correct craft.mass.".into()),
                ),
                _ => (
                    format!(
                        "The parts add up to {}, within {} % above and {} % below the stated take-off mass ({}).",
                        mass(*total),
                        Sig3(100.0 * PARTS_OVER),
                        Sig3(100.0 * PARTS_UNDER),
                        mass(*craft)
                    ),
                    None,
                ),
            }
        }
        Check::Propeller { class, diameter } => {
            let (lo, hi) = class.prop_mm;
            let text = format!(
                "The {} mm propeller is {} the usual {}-{} mm of motor class {}",
                mm(*diameter),
                if bad { "outside" } else { "within" },
                Sig3(lo),
                Sig3(hi),
                class.id
            );
            if bad {
                (
                    format!("{text}, whose thrust and power figures are for its usual propellers."),
                    Some("A propeller in the class's usual range, or the motor class that turns this one (rotors.motor).".into()),
                )
            } else {
                (format!("{text}."), None)
            }
        }
        Check::Rotors {
            diameter,
            spacing,
            by_hand,
        } => {
            if bad {
                let how = if *by_hand {
                    "they are placed at one height, where their blades would strike"
                } else {
                    "they would have to sit at staggered heights, which the layout does not say"
                };
                (
                    format!(
                        "The {} mm rotors overlap by {} mm: the closest two axes stand {} mm apart; {how}.",
                        mm(*diameter),
                        Sig3(overlap_mm(*diameter, *spacing)),
                        mm(*spacing)
                    ),
                    Some(format!(
                        "Rotors of at most {} mm, or axes at least {} mm apart (rotors.arm or rotors.at).",
                        mm(*spacing),
                        mm(*diameter)
                    )),
                )
            } else {
                (
                    format!(
                        "The {} mm rotors clear each other: the closest two axes stand {} mm apart.",
                        mm(*diameter),
                        mm(*spacing)
                    ),
                    None,
                )
            }
        }
        Check::Pressure {
            stated,
            isa,
            altitude,
        } => {
            let text = format!(
                "The station pressure ({} hPa) is {} % of the ISA pressure at the stated altitude of {} m ({} hPa)",
                Sig3(stated.get::<hectopascal>()),
                Sig3(100.0 * (*stated / *isa).value),
                Sig3(altitude.value),
                Sig3(isa.get::<hectopascal>())
            );
            match check.verdict() {
                Verdict::Implausible => (
                    format!("{text}: no weather ever recorded gives that."),
                    Some("Correct conditions.pressure or conditions.altitude: the pressure is the station's, not a weather report's reduced to sea level (QNH), which at altitude is higher by about 12 hPa per 100 m.".into()),
                ),
                Verdict::Doubtful => (
                    format!("{text}: beyond ordinary weather."),
                    Some("Check conditions.pressure against conditions.altitude.".into()),
                ),
                _ => (format!("{text}."), None),
            }
        }
    }
}

/// The figures of one comparison (all tier-free: the sheet against itself).
fn figures(check: &Check, out: &mut Vec<crate::report::Figure>) {
    match check {
        Check::Battery { battery, craft } => out.push(fixed(
            keys::BATTERY_MASS_SHARE,
            "Battery mass over take-off mass (battery.mass / craft.mass)",
            (*battery / *craft).value,
            "1",
        )),
        Check::MotorsAndPack {
            motors,
            pack,
            craft,
            ..
        } => out.push(fixed(
            keys::MOTORS_AND_PACK_SHARE,
            "Motors of the class and battery over take-off mass",
            ((*motors + pack.unwrap_or_default()) / *craft).value,
            "1",
        )),
        Check::Parts { total, craft } => out.push(fixed(
            keys::PARTS_MASS_SHARE,
            "Parts list sum over stated take-off mass (craft.parts / craft.mass)",
            (*total / *craft).value,
            "1",
        )),
        Check::Propeller { class, diameter } => {
            out.push(fixed(
                keys::PROP_DIAMETER,
                "Stated propeller diameter (rotors.diameter)",
                diameter.get::<millimeter>(),
                "mm",
            ));
            out.push(fixed(
                keys::CLASS_PROP_SMALLEST,
                "Smallest usual propeller of the motor class",
                class.prop_mm.0,
                "mm",
            ));
            out.push(fixed(
                keys::CLASS_PROP_LARGEST,
                "Largest usual propeller of the motor class",
                class.prop_mm.1,
                "mm",
            ));
        }
        Check::Rotors {
            diameter, spacing, ..
        } => {
            out.push(fixed(
                keys::ROTOR_SPACING,
                "Closest rotor axes apart, in top view",
                spacing.get::<millimeter>(),
                "mm",
            ));
            out.push(fixed(
                keys::ROTOR_OVERLAP,
                "Rotor disk overlap (diameter less spacing; below zero they clear)",
                overlap_mm(*diameter, *spacing),
                "mm",
            ));
        }
        Check::Pressure { stated, .. } => out.push(fixed(
            keys::PRESSURE_ALTITUDE,
            "Pressure altitude of the station pressure (conditions.pressure)",
            atmosphere::pressure_altitude(*stated).value,
            "m",
        )),
    }
}

/// The finding: figures per comparison, the contradictions first in the headline.
pub fn describe(claim: &Claim, solved: &Solution) -> Finding {
    if solved.checks.is_empty() {
        return Finding::not_assessed(
            ID,
            "two figures to compare: battery.mass, craft.parts beside craft.mass, rotors.motor, rotors.diameter with the rotors' places, or conditions.pressure",
        );
    }
    let mut figures_out = Vec::with_capacity(2 * solved.checks.len() + 2);
    let mut found = Vec::new();
    let mut agrees = Vec::new();
    let mut mend = Vec::new();
    for c in &solved.checks {
        figures(c, &mut figures_out);
        let (sentence, fix) = say(c);
        if c.verdict() == Verdict::Consistent {
            agrees.push(sentence);
        } else {
            found.push(format!(
                "{} ({}: {})",
                sentence,
                c.verdict().label(),
                c.fields()
            ));
            mend.extend(fix);
        }
    }
    if let Some((x, y)) = solved.reach {
        figures_out.push(fixed(
            keys::ROTOR_REACH_LENGTH,
            "Rotors tip to tip along the length",
            x.get::<millimeter>(),
            "mm",
        ));
        figures_out.push(fixed(
            keys::ROTOR_REACH_WIDTH,
            "Rotors tip to tip across the width",
            y.get::<millimeter>(),
            "mm",
        ));
    }
    let headline = match found.len() {
        0 => format!(
            "The sheet agrees with itself in the {} comparison{} it allows.",
            solved.checks.len(),
            if solved.checks.len() == 1 { "" } else { "s" }
        ),
        // The finding's own sentence may hold a colon: it follows as a sentence of its own.
        1 => format!("The sheet contradicts itself. {}", found[0]),
        n => format!(
            "The sheet contradicts itself in {n} places: {}",
            found.join(" ")
        ),
    };
    let would_take = if mend.is_empty() {
        "Nothing: the figures the sheet gives agree with each other.".to_string()
    } else {
        mend.join(" ")
    };
    let mut assumptions = agrees;
    if let (Some((x, y)), Some(size)) = (solved.reach, claim.craft.size) {
        let beyond = x > size.length || y > size.width;
        assumptions.push(format!(
            "The rotors reach {} mm by {} mm tip to tip against a stated size of {} mm by {} mm; {}",
            mm(x),
            mm(y),
            mm(size.length),
            mm(size.width),
            if beyond {
                "the size is read as the body's, with the rotors on arms beyond it, and not counted against the sheet."
            } else {
                "they fit within it."
            }
        ));
    }
    if solved
        .checks
        .iter()
        .any(|c| matches!(c, Check::MotorsAndPack { .. }))
    {
        assumptions.push(
            "Motor mass from the motor class (from memory: classes as sold); a lighter motor of the class would leave more.".to_string(),
        );
    }
    if solved
        .checks
        .iter()
        .any(|c| matches!(c, Check::Parts { .. }))
    {
        assumptions.push(format!(
            "Parts tolerance above the mass: {PARTS_OVER_BASIS}."
        ));
        assumptions.push(format!(
            "Parts tolerance below the mass: {PARTS_UNDER_BASIS}."
        ));
    }
    let has_pressure = solved
        .checks
        .iter()
        .any(|c| matches!(c, Check::Pressure { .. }));
    if has_pressure {
        assumptions.push(format!(
            "The air for every rule: {}. Ordinary weather: {WEATHER_ORDINARY_BASIS}. Records: {WEATHER_RECORDS_BASIS}.",
            super::common::air_basis(claim, &super::common::air(claim))
        ));
    }
    Finding {
        rule: ID,
        verdict: solved.verdict,
        headline,
        figures: figures_out,
        would_take,
        assumptions,
        // Only the pressure check rests on a published model; the rest is the sheet's own arithmetic.
        sources: if has_pressure { &["isa"] } else { &[] },
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::claim::{parse, Format};

    fn sheet(text: &str) -> Claim {
        parse(&format!("title = \"t\"\n{text}"), Format::Toml).unwrap()
    }

    fn verdict(text: &str) -> Verdict {
        check(&sheet(text)).verdict
    }

    #[test]
    fn a_battery_as_heavy_as_the_craft_is_impossible() {
        // By hand: the take-off mass includes the battery (DESIGN, craft.mass), so
        // a 310 g pack in a 300 g craft leaves -10 g for everything else.
        let f = check(&sheet(
            "[craft]\nmass = \"300 g\"\n[rotors]\ncount = 4\n[battery]\nmass = \"310 g\"\n",
        ));
        assert_eq!(f.verdict, Verdict::Impossible);
        assert!(
            f.headline.contains("battery.mass, craft.mass"),
            "{}",
            f.headline
        );
        let share = f.figure(keys::BATTERY_MASS_SHARE, None).unwrap().value;
        assert!((share - 310.0 / 300.0).abs() < 1e-12);
        // A 75 g pack in a 250 g craft is 30 %, which is ordinary.
        assert_eq!(
            verdict("[craft]\nmass = \"250 g\"\n[rotors]\ncount = 4\n[battery]\nmass = \"75 g\"\n"),
            Verdict::Consistent
        );
    }

    #[test]
    fn motors_and_a_pack_that_outweigh_the_craft_are_implausible() {
        // By hand: four 2204 motors at the class's 28 g each are 112 g; with a 100 g pack
        // that is 212 g, more than a 200 g take-off mass.
        let class = crate::catalog::motor("brushless-2204").unwrap();
        let motors = 4.0 * class.mass_g;
        let text = |craft: f64| {
            format!("[craft]\nmass = \"{craft} g\"\n[rotors]\ncount = 4\nmotor = \"brushless-2204\"\n[battery]\nmass = \"100 g\"\n")
        };
        assert_eq!(verdict(&text(motors + 100.0 - 1.0)), Verdict::Implausible);
        assert_eq!(verdict(&text(motors + 100.0 + 1.0)), Verdict::Consistent);
    }

    #[test]
    fn parts_above_the_mass_are_implausible_and_parts_far_short_doubtful() {
        // By hand: parts of 106 g against 100 g are 6 % over (beyond 5 % rounding);
        // 104 g is within it; 84 g is 16 % short (beyond 15 %), 86 g within.
        let text = |parts: f64| {
            format!("[craft]\nmass = \"100 g\"\n[[craft.parts]]\nname = \"frame\"\nmass = \"{parts} g\"\n[rotors]\ncount = 4\n")
        };
        assert_eq!(verdict(&text(106.0)), Verdict::Implausible);
        assert_eq!(verdict(&text(104.0)), Verdict::Consistent);
        assert_eq!(verdict(&text(84.0)), Verdict::Doubtful);
        assert_eq!(verdict(&text(86.0)), Verdict::Consistent);
        // Without a stated mass the mass is the parts' sum: nothing to compare.
        assert_eq!(
            verdict("[craft]\n[[craft.parts]]\nname = \"frame\"\nmass = \"84 g\"\n[rotors]\ncount = 4\n"),
            Verdict::NotAssessed
        );
    }

    #[test]
    fn a_propeller_outside_the_motor_class_range_is_doubtful() {
        // The 2204 class's usual propellers are 127 to 152 mm (5 to 6 in); 7 in is 177.8 mm.
        let text = |d: &str| {
            format!("[craft]\nmass = \"600 g\"\n[rotors]\ncount = 4\nmotor = \"brushless-2204\"\ndiameter = \"{d}\"\n")
        };
        assert_eq!(verdict(&text("7 in")), Verdict::Doubtful);
        assert_eq!(verdict(&text("5 in")), Verdict::Consistent);
        assert_eq!(verdict(&text("6 in")), Verdict::Consistent);
    }

    #[test]
    fn overlapping_rotor_disks_are_doubtful_in_a_preset_and_implausible_by_hand() {
        // By hand, a symmetric X: neighbouring axes stand arm x sqrt 2 apart, 100 mm x 1.4142 =
        // 141.4 mm; 6 in (152.4 mm) rotors overlap by 11.0 mm, 5 in (127 mm) ones clear.
        let quad = |d: &str| {
            format!("[craft]\nmass = \"600 g\"\n[rotors]\ncount = 4\nlayout = \"quad-x\"\narm = \"100 mm\"\ndiameter = \"{d}\"\n")
        };
        let f = check(&sheet(&quad("6 in")));
        assert_eq!(f.verdict, Verdict::Doubtful);
        let overlap = f.figure(keys::ROTOR_OVERLAP, None).unwrap().value;
        assert!(
            (overlap - (152.4 - 100.0 * 2f64.sqrt())).abs() < 1e-6,
            "{overlap}"
        );
        assert_eq!(verdict(&quad("5 in")), Verdict::Consistent);
        // Two rotors placed by hand 100 mm apart at one height, 120 mm across: they strike.
        let by_hand = |z: &str| {
            format!("[craft]\nmass = \"300 g\"\n[rotors]\ncount = 2\nlayout = \"custom\"\ndiameter = \"120 mm\"\n[[rotors.at]]\nx = \"50 mm\"\ny = \"0 mm\"\nspin = \"cw\"\n[[rotors.at]]\nx = \"-50 mm\"\ny = \"0 mm\"\nz = \"{z}\"\nspin = \"ccw\"\n")
        };
        assert_eq!(verdict(&by_hand("0 mm")), Verdict::Implausible);
        // The same two, one 40 mm above the other, overlap in top view without striking.
        assert_eq!(verdict(&by_hand("40 mm")), Verdict::NotAssessed);
    }

    #[test]
    fn a_coaxial_pair_shares_an_axis_and_does_not_overlap_itself() {
        let f = check(&sheet(
            "[craft]\nmass = \"300 g\"\n[rotors]\nlayout = \"coaxial\"\ndiameter = \"200 mm\"\n",
        ));
        assert!(f.figure(keys::ROTOR_OVERLAP, None).is_none());
    }

    #[test]
    fn a_station_pressure_beyond_any_recorded_weather_is_implausible() {
        // ISA (ISO 2533): 1000 m has 898.75 hPa. 900 hPa there is ordinary weather;
        // 800 hPa is 89 % of it (beyond the 5 % of ordinary weather, within records);
        // 700 hPa is 78 %, below the lowest sea-level pressure recorded, 870 / 1013.25 = 86 %.
        let text = |p: &str| {
            format!("[craft]\nmass = \"1 kg\"\n[rotors]\ncount = 4\n[conditions]\naltitude = \"1000 m\"\npressure = \"{p}\"\n")
        };
        assert_eq!(verdict(&text("900 hPa")), Verdict::Consistent);
        assert_eq!(verdict(&text("800 hPa")), Verdict::Doubtful);
        assert_eq!(verdict(&text("700 hPa")), Verdict::Implausible);
        let f = check(&sheet(&text("898.75 hPa")));
        let hp = f.figure(keys::PRESSURE_ALTITUDE, None).unwrap().value;
        assert!((hp - 1000.0).abs() < 1.0, "{hp}");
        // A weather report's sea-level pressure written at 2000 m (ISA 795 hPa) is 127 %.
        let qnh = "[craft]\nmass = \"1 kg\"\n[rotors]\ncount = 4\n[conditions]\naltitude = \"2000 m\"\npressure = \"1013 hPa\"\n";
        assert_eq!(verdict(qnh), Verdict::Implausible);
        // Without a stated altitude there is nothing to set the pressure against.
        assert_eq!(
            verdict("[craft]\nmass = \"1 kg\"\n[rotors]\ncount = 4\n[conditions]\npressure = \"700 hPa\"\n"),
            Verdict::NotAssessed
        );
    }

    #[test]
    fn a_sheet_that_contradicts_itself_is_never_called_consistent() {
        // Each contradiction alone, and the worst decides when there are several.
        let f = check(&sheet(
            "[craft]\nmass = \"100 g\"\n[[craft.parts]]\nname = \"frame\"\nmass = \"200 g\"\n[rotors]\ncount = 4\nmotor = \"brushless-2204\"\ndiameter = \"9 in\"\n[battery]\nmass = \"120 g\"\n",
        ));
        assert_eq!(f.verdict, Verdict::Impossible);
        assert!(
            f.headline
                .starts_with("The sheet contradicts itself in 4 places"),
            "{}",
            f.headline
        );
        assert!(!f.would_take.starts_with("Nothing"));
        for fig in &f.figures {
            assert!(fig.value.is_finite(), "{}", fig.key);
        }
    }

    #[test]
    fn a_sheet_with_nothing_to_compare_is_not_assessed() {
        assert_eq!(
            verdict("[craft]\nmass = \"1 kg\"\n[rotors]\ncount = 4\ndiameter = \"10 in\"\n"),
            Verdict::NotAssessed
        );
    }
}

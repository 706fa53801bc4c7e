//! Steps shared by the rules: the air and weight of a claim, the tier walk,
//! and figure builders.

use std::borrow::Cow;

use uom::si::f64::{Area, Force, Length};
use uom::si::length::{meter, millimeter};
use uom::si::pressure::hectopascal;
use uom::si::thermodynamic_temperature::degree_celsius;

use crate::catalog::tiers::COAXIAL_INTERFERENCE;
use crate::claim::{Claim, Layout};
use crate::physics::atmosphere::{self, Air};
use crate::physics::rotor;
use crate::report::{Figure, Sig3, Verdict};
use crate::tier::Tier;

/// The air the claim flies in: at the stated station pressure when there is
/// one, else the ISA pressure at the stated (pressure) altitude; at the stated
/// temperature, else the ISA one; gravity at the stated altitude (`isa`).
pub fn air(claim: &Claim) -> Air {
    let c = &claim.conditions;
    match c.pressure {
        Some(p) => atmosphere::at_pressure(p, c.temperature, c.altitude),
        None => atmosphere::isa(c.altitude, c.temperature),
    }
}

/// Where the claim's air comes from, in words for a finding's assumptions:
/// the station pressure, or the ISA pressure at the stated pressure altitude;
/// the temperature, stated or the ISA one; the height gravity is taken at.
pub fn air_basis(claim: &Claim, air: &Air) -> String {
    let c = &claim.conditions;
    let celsius = air.temperature.get::<degree_celsius>();
    let temperature = match c.temperature {
        Some(_) => format!("{} degC as stated", Sig3(celsius)),
        None => format!("{} degC, the ISA temperature there", Sig3(celsius)),
    };
    let height = Sig3(c.altitude.get::<meter>());
    match c.pressure {
        Some(p) => format!(
            "station pressure {} hPa (pressure altitude {} m), {temperature}; gravity at {height} m",
            Sig3(p.get::<hectopascal>()),
            Sig3(atmosphere::pressure_altitude(p).get::<meter>()),
        ),
        None => format!(
            "ISA pressure at the pressure altitude of {height} m ({} hPa), {temperature}; gravity at {height} m",
            Sig3(air.pressure.get::<hectopascal>()),
        ),
    }
}

/// Weight W = m g with the local gravity (`isa`).
pub fn weight(claim: &Claim, air: &Air) -> Force {
    claim.craft.mass * air.gravity
}

/// The first tier, most generous first, at which `passes` is false.
pub fn first_failure(mut passes: impl FnMut(Tier) -> bool) -> Option<Tier> {
    Tier::ALL.into_iter().find(|&t| !passes(t))
}

/// The verdict from the first failing tier of `passes`.
pub fn verdict_of(passes: impl FnMut(Tier) -> bool) -> Verdict {
    Verdict::failing_at(first_failure(passes))
}

/// A figure at one tier.
pub fn tiered(
    key: &'static str,
    label: impl Into<Cow<'static, str>>,
    tier: Tier,
    value: f64,
    unit: &'static str,
) -> Figure {
    Figure {
        key,
        label: label.into(),
        tier: Some(tier),
        value,
        unit,
    }
}

/// A figure that does not depend on the tier.
pub fn fixed(
    key: &'static str,
    label: impl Into<Cow<'static, str>>,
    value: f64,
    unit: &'static str,
) -> Figure {
    Figure {
        key,
        label: label.into(),
        tier: None,
        value,
        unit,
    }
}

/// One figure per tier from `value(tier)`, for a finding's list of figures
/// (sized beforehand for all of them). A tier whose value is unbounded (a
/// perfect sensor never drifts) gets no figure: reports hold finite numbers only.
pub fn per_tier(
    key: &'static str,
    label: &'static str,
    unit: &'static str,
    mut value: impl FnMut(Tier) -> f64,
) -> impl Iterator<Item = Figure> {
    Tier::ALL
        .into_iter()
        .map(move |t| (t, value(t)))
        .filter(|(_, v)| v.is_finite())
        .map(move |(t, v)| tiered(key, label, t, v, unit))
}

/// The rotor diameter: stated, else the middle of the motor class's usual range.
pub fn rotor_diameter(claim: &Claim) -> Option<(Length, bool)> {
    match (claim.rotors.diameter, claim.rotors.motor) {
        (Some(d), _) => Some((d, true)),
        (None, Some(class)) => Some((class.usual_prop(), false)),
        (None, None) => None,
    }
}

/// Rotors that share their axis with another, as a coaxial pair does: both
/// rotors of a `coaxial` layout, and in a custom layout each rotor placed
/// within 1 mm of another's axis (`coaxial-rotor`).
pub fn paired_rotors(claim: &Claim) -> u32 {
    let r = &claim.rotors;
    match r.layout {
        Some(Layout::Coaxial) => r.count,
        Some(Layout::Custom) => {
            let near = Length::new::<millimeter>(1.0);
            let shares_axis = |i: usize| {
                let a = &r.at[i];
                r.at.iter()
                    .enumerate()
                    .any(|(j, b)| j != i && (a.x - b.x).abs() <= near && (a.y - b.y).abs() <= near)
            };
            (0..r.at.len()).filter(|&i| shares_axis(i)).count() as u32
        }
        _ => 0,
    }
}

/// The disk area of all rotors as the hover formulas take it at `tier`:
/// A per isolated rotor and A / kappa_int^2 per rotor of a coaxial pair, with
/// kappa_int from the tier table, so that every rule charges a pair the same
/// interference (`coaxial-rotor`).
pub fn effective_disk_area(claim: &Claim, diameter: Length, tier: Tier) -> Area {
    let one = rotor::disk_area(diameter);
    let paired = f64::from(paired_rotors(claim));
    let isolated = f64::from(claim.rotors.count) - paired;
    one * isolated + rotor::coaxial_effective_area(one, COAXIAL_INTERFERENCE.at(tier)) * paired
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn the_tier_walk_stops_at_the_first_failure() {
        assert_eq!(first_failure(|_| true), None);
        assert_eq!(
            first_failure(|t| t != Tier::BestPractice),
            Some(Tier::BestPractice)
        );
        assert_eq!(verdict_of(|_| false), Verdict::Impossible);
    }

    fn rotors(lines: &str) -> Claim {
        let text = format!("title = \"t\"\n[craft]\nmass = \"1 kg\"\n[rotors]\n{lines}\n");
        crate::claim::parse(&text, crate::claim::Format::Toml).unwrap()
    }

    #[test]
    fn rotors_that_share_an_axis_are_paired_in_presets_and_custom_layouts() {
        assert_eq!(paired_rotors(&rotors("layout = \"coaxial\"")), 2);
        assert_eq!(
            paired_rotors(&rotors("layout = \"quad-x\"\narm = \"0.2 m\"")),
            0
        );
        // An X8 placed by hand: four arms, two rotors on each, one above the other.
        let mut at = String::new();
        for (x, y) in [(1, 1), (1, -1), (-1, -1), (-1, 1)] {
            for (z, spin) in [(30, "cw"), (-30, "ccw")] {
                at += &format!(
                    "[[rotors.at]]\nx = \"{} mm\"\ny = \"{} mm\"\nz = \"{z} mm\"\nspin = \"{spin}\"\n",
                    x * 200,
                    y * 200
                );
            }
        }
        let x8 = rotors(&format!("count = 8\nlayout = \"custom\"\n{at}"));
        assert_eq!(paired_rotors(&x8), 8);
    }

    #[test]
    fn the_air_is_taken_at_the_station_pressure_when_the_sheet_gives_one() {
        // ISA (ISO 2533): 1000 m has 898.75 hPa and 8.5 degC (281.65 K), density 1.1117 kg/m^3.
        let isa = rotors("count = 4\n[conditions]\naltitude = \"1000 m\"");
        let a = air(&isa);
        assert!(
            (a.density
                .get::<uom::si::mass_density::kilogram_per_cubic_meter>()
                - 1.1117)
                .abs()
                < 5e-4
        );
        assert_eq!(
            air_basis(&isa, &a),
            "ISA pressure at the pressure altitude of 1000 m (899 hPa), 8.50 degC, the ISA temperature there; gravity at 1000 m"
        );
        // The same pressure stated at sea level gives the same air, and gravity at 0 m:
        // g0 = 9.80665 m/s^2 against 9.8036 at 1000 m (isa, inverse square).
        let station = rotors("count = 4\n[conditions]\npressure = \"898.75 hPa\"");
        let b = air(&station);
        assert!((b.density - a.density).abs().value < 1e-4);
        assert!(b.gravity > a.gravity);
        assert_eq!(
            air_basis(&station, &b),
            "station pressure 899 hPa (pressure altitude 1000 m), 8.50 degC, the ISA temperature there; gravity at 0 m"
        );
    }

    #[test]
    fn a_coaxial_pair_has_the_disk_area_of_its_interference() {
        // coaxial-rotor: each rotor of a pair counts as A / kappa^2; kappa at the typical
        // tier is the ideal pair's 1.2808 (Leishman 2006), so two rotors give
        // 2 A / 1.2808^2 = 1.2192 A.
        let d = Length::new::<millimeter>(254.0);
        let one = rotor::disk_area(d);
        let pair = effective_disk_area(&rotors("layout = \"coaxial\""), d, Tier::Typical);
        assert!(((pair / one).value - 2.0 / 1.2808f64.powi(2)).abs() < 1e-12);
        let quad = rotors("layout = \"quad-x\"\narm = \"0.2 m\"");
        assert!(((effective_disk_area(&quad, d, Tier::Typical) / one).value - 4.0).abs() < 1e-12);
    }
}

//! Rule 3, energy-budget: does the battery hold the energy for the stated flight time?
//!
//! Givens: total mass (battery included), rotor count and diameter, drive,
//! battery cells, capacity, mass and chemistry. Method: momentum theory gives
//! the ideal hover power P_ideal = W^(3/2) / sqrt(2 rho A); P_shaft = P_ideal / FM;
//! P_elec = P_shaft / (eta_motor eta_controller) + avionics. Usable energy
//! E = cells x V_nominal x capacity x depth of discharge; endurance t = E / P_elec.
//! Also: the pack's specific energy against its chemistry, the hover current
//! against its C rating, and the endurance ceiling of the airframe.

use uom::si::f64::{
    Area, ElectricCharge, ElectricPotential, Energy, Force, Length, Mass, Power, Time,
};
use uom::si::{
    electric_charge::milliampere_hour, electric_potential::volt, energy::watt_hour, mass::gram,
    mass::kilogram, power::watt, time::minute,
};

use super::common::{self, fixed, per_tier};
use super::thrust_margin::{self, Lift};
use crate::catalog::tiers::{self, AVIONICS_POWER, DEPTH_OF_DISCHARGE};
use crate::catalog::{self, Chemistry, Drive};
use crate::claim::{Claim, Layout};
use crate::physics::atmosphere::Air;
use crate::physics::{battery, rotor};
use crate::report::{keys, Finding, Sig3};
use crate::tier::{PerTier, Tier};

pub const ID: &str = "energy-budget";
pub const TITLE: &str = "Energy for the stated flight time";
pub const METHOD: &str = "Hover power from momentum theory at the take-off mass (battery included): P_ideal = W^(3/2) / sqrt(2 rho A) with A the total disk area; P_shaft = P_ideal / FM; P_elec = P_shaft / (eta_motor eta_controller) + avionics. Usable energy E = cells x nominal cell voltage x capacity x depth of discharge; hover time t = E / P_elec, compared with the claimed flight time per tier. The stated pack's specific energy (cells x V x capacity / mass) is compared with the chemistry's ordinary, best and ceiling values; the hover current P_elec / V_pack in C with the pack's rating. The endurance ceiling of the airframe: with a battery of fixed specific energy, t ~ m_b / (m_0 + m_b)^(3/2), greatest at m_b = 2 m_0.";

/// Everything the hover power depends on but the mass.
struct Airframe {
    air: Air,
    disk: Area,
    diameter: Length,
    drive: Drive,
}

impl Airframe {
    /// Electrical hover power at total mass `m`:
    /// P = (m g)^(3/2) / sqrt(2 rho A) / FM / eta + avionics (`momentum-theory`).
    fn hover_power(&self, m: Mass, tier: Tier) -> Power {
        let w: Force = m * self.air.gravity;
        let ideal = rotor::ideal_power(w, self.air.density, self.disk);
        let fm = tiers::figure_of_merit(tier, self.diameter);
        let eta = tiers::drive_efficiency(tier, self.drive, self.diameter);
        ideal / (fm * eta) + Power::new::<watt>(AVIONICS_POWER.at(tier))
    }

    /// Hover time on a battery of mass `mb` and specific energy `e` (Wh/kg) on an
    /// airframe of mass `m0`: t = e mb DoD / P(m0 + mb) (`endurance-ceiling`).
    fn endurance_on(&self, m0: Mass, mb: Mass, e_wh_kg: f64, tier: Tier) -> Time {
        let energy =
            Energy::new::<watt_hour>(e_wh_kg * mb.get::<kilogram>()) * DEPTH_OF_DISCHARGE.at(tier);
        battery::run_time(energy, self.hover_power(m0 + mb, tier))
    }
}

/// Specific energy of the chemistry at a tier: ordinary, best, ceiling.
fn specific_energy(chem: &Chemistry, tier: Tier) -> f64 {
    let (ordinary, best, ceiling) = chem.specific_energy_wh_kg;
    match tier {
        Tier::PhysicalLimit => ceiling,
        Tier::BestPractice => best,
        Tier::Typical => ordinary,
    }
}

pub fn check(claim: &Claim) -> Finding {
    let Some(bat) = &claim.battery else {
        return Finding::not_assessed(ID, "the battery (battery.capacity and battery.cells)");
    };
    let Some(capacity) = bat.capacity else {
        return Finding::not_assessed(ID, "the battery's capacity (battery.capacity)");
    };
    let Some((diameter, diameter_stated)) = common::rotor_diameter(claim) else {
        return Finding::not_assessed(ID, "the rotor diameter (rotors.diameter or rotors.motor)");
    };
    let r = &claim.rotors;
    let disks = match r.layout {
        Some(Layout::Coaxial) => f64::from(r.count) * 0.5,
        _ => f64::from(r.count),
    };
    let frame = Airframe {
        air: common::air(claim),
        disk: rotor::disk_area(diameter) * disks,
        diameter,
        drive: r.drive().unwrap_or(Drive::Brushless),
    };
    let chem = bat
        .chemistry
        .or_else(|| catalog::chemistry("lipo"))
        .unwrap_or(&catalog::CHEMISTRIES[0]);
    let cell_v = ElectricPotential::new::<volt>(chem.nominal_v);
    let pack_v = battery::pack_voltage(bat.cells, cell_v);
    let m = claim.craft.mass;

    let power = PerTier::from_fn(|t| frame.hover_power(m, t));
    let energy = PerTier::from_fn(|t| {
        battery::usable_energy(bat.cells, cell_v, capacity, DEPTH_OF_DISCHARGE.at(t))
    });
    let endurance = PerTier::from_fn(|t| battery::run_time(energy[t], power[t]));
    let c_rate = power.map(|p| battery::c_rate(battery::current(p, pack_v), capacity));
    let rating = bat.max_discharge.unwrap_or(chem.max_c.0);
    let stored: Energy = pack_v * capacity;
    let pack_specific = bat
        .mass
        .map(|mb| stored.get::<watt_hour>() / mb.get::<kilogram>());
    // Without a stated pack mass, the pack is taken at the chemistry's ordinary specific energy.
    let pack_mass = bat.mass.unwrap_or_else(|| {
        Mass::new::<kilogram>(stored.get::<watt_hour>() / chem.specific_energy_wh_kg.0)
    });
    let airframe = m - pack_mass;

    let time_ok = |t: Tier| {
        claim
            .claim
            .flight_time
            .is_none_or(|ft| endurance[t] >= ft * (1.0 - 1e-9))
    };
    let specific_ok =
        |t: Tier| pack_specific.is_none_or(|e| e <= specific_energy(chem, t) * (1.0 + 1e-9));
    let current_ok = |t: Tier| t == Tier::PhysicalLimit || c_rate[t] <= rating * (1.0 + 1e-9);
    let verdict = common::verdict_of(|t| time_ok(t) && specific_ok(t) && current_ok(t));

    let minutes = |t: Time| t.get::<minute>();
    // Five kinds of figure per tier and four fixed ones at most.
    let mut figures = Vec::with_capacity(19);
    figures.extend(per_tier(
        keys::HOVER_POWER,
        "Electrical power to hover",
        "W",
        |t| power[t].get::<watt>(),
    ));
    figures.extend(per_tier(
        keys::USABLE_ENERGY,
        "Usable battery energy",
        "Wh",
        |t| energy[t].get::<watt_hour>(),
    ));
    figures.extend(per_tier(
        keys::ENDURANCE,
        "Hover time on this battery",
        "min",
        |t| minutes(endurance[t]),
    ));
    if let Some(ft) = claim.claim.flight_time {
        figures.push(fixed(
            keys::CLAIMED_FLIGHT_TIME,
            "Claimed flight time",
            minutes(ft),
            "min",
        ));
    }
    if let Some(e) = pack_specific {
        figures.push(fixed(
            keys::BATTERY_SPECIFIC_ENERGY,
            "Energy per kilogram of the stated battery",
            e,
            "Wh/kg",
        ));
    }
    figures.extend(per_tier(
        keys::DISCHARGE_RATE,
        "Battery discharge rate in hover",
        "C",
        |t| c_rate[t],
    ));
    figures.push(fixed(
        keys::DISCHARGE_RATING,
        "Battery's continuous discharge rating",
        rating,
        "C",
    ));

    // The endurance ceiling: the best battery for this airframe weighs twice it.
    let ceiling = (airframe.get::<kilogram>() > 0.0).then(|| {
        let best_mass = airframe * 2.0;
        (
            best_mass,
            PerTier::from_fn(|t| {
                frame.endurance_on(airframe, best_mass, specific_energy(chem, t), t)
            }),
        )
    });
    if let Some((best_mass, times)) = ceiling {
        figures.extend(per_tier(
            keys::ENDURANCE_CEILING,
            "Longest hover any battery of this chemistry gives this airframe",
            "min",
            |t| minutes(times[t]),
        ));
        figures.push(fixed(
            keys::BEST_BATTERY_MASS,
            "Battery mass that gives the longest hover (twice the airframe)",
            best_mass.get::<gram>(),
            "g",
        ));
    }

    let failed_at = common::first_failure(|t| time_ok(t) && specific_ok(t) && current_ok(t));
    let headline = match failed_at {
        Some(t) if !specific_ok(t) => format!(
            "The battery is said to hold {} Wh/kg; {} cells reach at most about {} Wh/kg {}.",
            Sig3(pack_specific.unwrap_or(0.0)),
            chem.label,
            Sig3(specific_energy(chem, t)),
            match t {
                Tier::PhysicalLimit => "even in theory",
                Tier::BestPractice => "at the very best",
                Tier::Typical => "in ordinary packs",
            },
        ),
        Some(t) if !time_ok(t) => format!(
            "{} this battery lasts about {} min in hover; the claim is {} min.",
            match t {
                Tier::PhysicalLimit => "Even with perfect rotors and motors,",
                Tier::BestPractice => "With the best hardware of its class,",
                Tier::Typical => "With typical parts,",
            },
            Sig3(minutes(endurance[t])),
            Sig3(claim.claim.flight_time.map_or(0.0, minutes)),
        ),
        Some(t) => format!(
            "Hovering draws {} C from the battery, above its {} C rating ({}).",
            Sig3(c_rate[t]),
            Sig3(rating),
            t.label(),
        ),
        None => format!(
            "The battery gives about {} min of hover with typical parts{}.",
            Sig3(minutes(endurance[Tier::Typical])),
            claim.claim.flight_time.map_or(String::new(), |ft| format!(
                ", enough for the claimed {} min",
                Sig3(minutes(ft))
            )),
        ),
    };

    let would_take = would_take(
        claim, &frame, chem, airframe, pack_mass, pack_v, &time_ok, ceiling,
    );
    let mut assumptions = Vec::with_capacity(9);
    assumptions.push(format!(
        "{} cell(s) of {} at {} V nominal; {}.",
        bat.cells, chem.label, chem.nominal_v, chem.basis,
    ));
    assumptions.push(format!(
        "Figure of merit {} for a {} mm rotor; drive efficiency {} ({}); usable capacity {}; avionics {} W (physical limit / best practice / typical).",
        PerTier::from_fn(|t| tiers::figure_of_merit(t, diameter)),
        Sig3(diameter.get::<uom::si::length::millimeter>()),
        PerTier::from_fn(|t| Sig3(tiers::drive_efficiency(t, frame.drive, diameter))),
        frame.drive.id(),
        DEPTH_OF_DISCHARGE.values,
        AVIONICS_POWER.values,
    ));
    assumptions.push(
        "Hover only, in still air: climbing, manoeuvring and wind all cost more.".to_string(),
    );
    if bat.chemistry.is_none() {
        assumptions.push("Chemistry taken as LiPo (battery.chemistry not given).".to_string());
    }
    if !diameter_stated {
        assumptions.push("Rotor diameter taken as the motor class's usual propeller.".to_string());
    }
    if r.drive().is_none() {
        assumptions.push("Drive taken as brushless (rotors.drive not given).".to_string());
    }
    if bat.mass.is_none() {
        assumptions.push(format!(
            "Battery mass not given: taken as {} g from the chemistry's ordinary specific energy.",
            Sig3(pack_mass.get::<gram>()),
        ));
    }
    if bat.max_discharge.is_none() {
        assumptions.push(format!(
            "Discharge rating not given: {rating} C, ordinary for the chemistry."
        ));
    }
    if claim.claim.flight_time.is_none() {
        assumptions.push(
            "No flight time claimed (claim.flight_time): endurance shown, not compared."
                .to_string(),
        );
    }
    Finding {
        rule: ID,
        verdict,
        headline,
        figures,
        would_take,
        assumptions,
        sources: &[
            "momentum-theory",
            "battery-energy",
            "endurance-ceiling",
            "isa",
        ],
    }
}

/// The smallest change to the battery that makes the claimed time hold with typical parts.
#[allow(clippy::too_many_arguments)]
fn would_take(
    claim: &Claim,
    frame: &Airframe,
    chem: &Chemistry,
    airframe: Mass,
    pack_mass: Mass,
    pack_v: ElectricPotential,
    time_ok: &dyn Fn(Tier) -> bool,
    ceiling: Option<(Mass, PerTier<Time>)>,
) -> String {
    let Some(ft) = claim.claim.flight_time else {
        return "Nothing to meet: no flight time is claimed.".to_string();
    };
    if time_ok(Tier::Typical) {
        return "Nothing more for the flight time.".to_string();
    }
    let Some((best_mass, times)) = ceiling else {
        return "A lighter airframe: the battery mass is given as all of the craft's mass."
            .to_string();
    };
    let e = specific_energy(chem, Tier::Typical);
    if times[Tier::Typical] < ft {
        return format!(
            "No {} battery makes it with typical parts: the longest hover for this airframe is about {} min, with a {} g battery. Lighter parts or larger rotors are needed.",
            chem.id,
            Sig3(times[Tier::Typical].get::<minute>()),
            Sig3(best_mass.get::<gram>()),
        );
    }
    // Endurance rises with battery mass up to twice the airframe: bisect on [current, 2 m0].
    let lasts = |mb: Mass| frame.endurance_on(airframe, mb, e, Tier::Typical) >= ft;
    let (mut lo, mut hi) = (pack_mass.min(best_mass), best_mass);
    for _ in 0..60 {
        let mid = (lo + hi) * 0.5;
        if lasts(mid) {
            hi = mid;
        } else {
            lo = mid;
        }
    }
    let capacity: ElectricCharge = Energy::new::<watt_hour>(e * hi.get::<kilogram>()) / pack_v;
    let take_off = airframe + hi;
    // The heavier craft must still be lifted: say so when the rotors would fall short.
    let short_of_thrust = thrust_margin::estimate(claim, &frame.air)
        .map(|est| est.available[Tier::Typical] * (f64::from(claim.rotors.count) * 0.7))
        .filter(|hover_limit| take_off * frame.air.gravity > *hover_limit);
    let short_of_thrust = short_of_thrust.map_or(String::new(), |hover_limit| {
        format!(
            "; the rotors then need more thrust too: they hover at most {} at 70 % of typical thrust",
            Lift(hover_limit)
        )
    });
    format!(
        "A battery of about {} mAh at this voltage ({} g of ordinary {} cells, {} g take-off mass){short_of_thrust}.",
        Sig3(capacity.get::<milliampere_hour>()),
        Sig3(hi.get::<gram>()),
        chem.id,
        Sig3(take_off.get::<gram>()),
    )
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::claim::{parse, Format};
    use crate::report::Verdict;

    fn sheet(text: &str) -> Claim {
        parse(&format!("title = \"t\"\n{text}"), Format::Toml).unwrap()
    }

    const QUAD: &str = "[craft]\nmass = \"1 kg\"\n[rotors]\ncount = 4\ndiameter = \"254 mm\"\ndrive = \"brushless\"\n";

    #[test]
    fn hover_power_follows_momentum_theory_at_the_physical_limit() {
        // P_ideal = W^1.5 / sqrt(2 rho A): W = 9.80665 N, A = 4 x pi x 0.127^2 = 0.20268 m^2,
        // rho = 1.225 -> 30.710 / sqrt(0.49657) = 43.58 W; FM = eta = 1, no avionics.
        let c = sheet(&format!(
            "{QUAD}[battery]\ncells = 4\ncapacity = \"5000 mAh\"\nmass = \"450 g\""
        ));
        let f = check(&c);
        let p = f
            .figure(keys::HOVER_POWER, Some(Tier::PhysicalLimit))
            .unwrap()
            .value;
        assert!((p - 43.58).abs() < 0.05, "{p}");
        // Usable 4 x 3.7 x 5 Ah = 74 Wh -> 101.9 min at the physical limit.
        let t = f
            .figure(keys::ENDURANCE, Some(Tier::PhysicalLimit))
            .unwrap()
            .value;
        assert!((t - 74.0 / 43.58 * 60.0).abs() < 0.2, "{t}");
        // The same craft at typical values: FM 0.65 (254 mm), eta 0.76, 1 W avionics:
        // 43.58 / 0.494 + 1 = 89.2 W; 74 x 0.8 = 59.2 Wh -> 39.8 min.
        let t = f
            .figure(keys::ENDURANCE, Some(Tier::Typical))
            .unwrap()
            .value;
        assert!((t - 39.8).abs() < 0.2, "{t}");
    }

    #[test]
    fn the_claimed_time_sets_the_tier_that_fails() {
        let bat = "[battery]\ncells = 4\ncapacity = \"5000 mAh\"\nmass = \"450 g\"";
        let at = |mins: f64| {
            check(&sheet(&format!(
                "{QUAD}{bat}\n[claim]\nflight_time = \"{mins} min\""
            )))
            .verdict
        };
        assert_eq!(at(30.0), Verdict::Consistent);
        assert_eq!(at(50.0), Verdict::Doubtful);
        assert_eq!(at(90.0), Verdict::Implausible);
        assert_eq!(at(120.0), Verdict::Impossible);
    }

    #[test]
    fn a_pack_lighter_than_any_cell_could_be_is_impossible() {
        // 1 cell, 3.7 V x 2 Ah = 7.4 Wh in 15 g is 493 Wh/kg, above any lithium cell
        // (best cells 250-300 Wh/kg, handbook ranges, from memory).
        let c = sheet(&format!(
            "{QUAD}[battery]\ncapacity = \"2000 mAh\"\nmass = \"15 g\""
        ));
        let f = check(&c);
        assert_eq!(f.verdict, Verdict::Impossible);
        let e = f.figure(keys::BATTERY_SPECIFIC_ENERGY, None).unwrap().value;
        assert!((e - 493.3).abs() < 0.1);
    }

    #[test]
    fn the_endurance_ceiling_sits_at_a_battery_twice_the_airframe() {
        // t ~ mb / (m0 + mb)^(3/2) peaks at mb = 2 m0 (endurance-ceiling): check numerically
        // that neighbours on both sides give less.
        let c = sheet(&format!(
            "{QUAD}[battery]\ncells = 4\ncapacity = \"5000 mAh\"\nmass = \"450 g\""
        ));
        let air = common::air(&c);
        let frame = Airframe {
            air,
            disk: rotor::disk_area(Length::new::<uom::si::length::millimeter>(254.0)) * 4.0,
            diameter: Length::new::<uom::si::length::millimeter>(254.0),
            drive: Drive::Brushless,
        };
        let m0 = Mass::new::<gram>(550.0);
        let t = |mb: f64| frame.endurance_on(m0, Mass::new::<gram>(mb), 200.0, Tier::PhysicalLimit);
        assert!(t(1100.0) > t(1050.0) && t(1100.0) > t(1150.0));
    }

    #[test]
    fn a_hover_current_above_the_rating_is_flagged() {
        // Hover needs about 89 W typical from 1 cell (3.7 V): 24 A from 0.5 Ah = 48 C > 20 C.
        let c = sheet(&format!(
            "{QUAD}[battery]\ncells = 1\ncapacity = \"500 mAh\"\nmass = \"12 g\"\nmax_discharge = \"20 C\""
        ));
        let f = check(&c);
        assert!(
            f.figure(keys::DISCHARGE_RATE, Some(Tier::Typical))
                .unwrap()
                .value
                > 20.0
        );
        assert_ne!(f.verdict, Verdict::Consistent);
    }

    #[test]
    fn the_would_take_battery_makes_the_claim_hold() {
        // Inverse problem: the capacity it proposes, put back on the sheet with its mass,
        // must give a consistent endurance.
        let bat = "[battery]\ncells = 4\ncapacity = \"1500 mAh\"\nmass = \"180 g\"";
        let c = sheet(&format!("{QUAD}{bat}\n[claim]\nflight_time = \"15 min\""));
        let f = check(&c);
        assert_eq!(f.verdict, Verdict::Doubtful);
        let words: Vec<&str> = f.would_take.split_whitespace().collect();
        let mah: f64 = words[words.iter().position(|w| *w == "mAh").unwrap() - 1]
            .parse()
            .unwrap();
        let grams: f64 = words[words.iter().position(|w| *w == "g").unwrap() - 1]
            .trim_start_matches('(')
            .parse()
            .unwrap();
        // A pack 1 % larger and 2 % heavier than proposed stays within the ordinary
        // specific energy of the chemistry.
        let grams = grams * 1.02;
        let mass_g = 1000.0 - 180.0 + grams;
        let fixed = sheet(&format!(
            "[craft]\nmass = \"{mass_g} g\"\n[rotors]\ncount = 4\ndiameter = \"254 mm\"\ndrive = \"brushless\"\n[battery]\ncells = 4\ncapacity = \"{} mAh\"\nmass = \"{grams} g\"\n[claim]\nflight_time = \"15 min\"",
            mah * 1.01
        ));
        assert_eq!(
            check(&fixed).verdict,
            Verdict::Consistent,
            "{}",
            f.would_take
        );
    }

    #[test]
    fn no_battery_is_not_assessed() {
        assert_eq!(check(&sheet(QUAD)).verdict, Verdict::NotAssessed);
    }
}

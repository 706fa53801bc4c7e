//! Built-in data: motor classes, battery chemistries and the tier table.
//! Every value carries its basis: a published source, common practice, or a
//! value recalled without a document at hand ("from memory").

pub mod tiers;

use std::fmt;

use serde::Serialize;
use uom::si::f64::{ElectricCurrent, ElectricPotential, Force, Length, Mass, Power};
use uom::si::{
    electric_current::ampere, electric_potential::volt, force::gram_force, length::millimeter,
    mass::gram, power::watt,
};
use utoipa::ToSchema;

/// Where a value comes from.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Serialize, ToSchema)]
#[serde(tag = "kind", content = "note", rename_all = "kebab-case")]
pub enum Basis {
    /// A published source, by its id in [`crate::sources`].
    Source(&'static str),
    /// What practitioners of the trade do and say; no single document.
    CommonPractice(&'static str),
    /// Recalled without a document at hand; to be checked against one.
    FromMemory(&'static str),
}

impl Basis {
    /// A short line for reports and the methods page ([`Display`](fmt::Display)).
    pub fn describe(&self) -> String {
        self.to_string()
    }
}

/// "source: " and the source's title, or the kind of basis and its note:
/// the line a report's assumptions and the methods page print.
impl fmt::Display for Basis {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        match *self {
            Basis::Source(id) => {
                let title = crate::sources::get(id).map_or(id, |s| s.title);
                write!(f, "source: {title}")
            }
            Basis::CommonPractice(note) => write!(f, "common practice: {note}"),
            Basis::FromMemory(note) => write!(f, "from memory: {note}"),
        }
    }
}

#[derive(Debug, Clone, Copy, PartialEq, Eq, Serialize, ToSchema)]
#[serde(rename_all = "kebab-case")]
pub enum Drive {
    Brushed,
    Brushless,
}

impl Drive {
    pub fn id(self) -> &'static str {
        match self {
            Drive::Brushed => "brushed",
            Drive::Brushless => "brushless",
        }
    }
}

/// A motor class by the trade's size designation (can diameter x length in mm
/// for coreless motors, stator diameter and height for brushless ones), with
/// its usual propeller. Its power and thrust are for one motor at one stated
/// reference voltage, the nominal voltage of the LiPo cell count they are for;
/// on another pack they follow the propeller laws (`propeller-laws`).
#[derive(Debug, Clone, PartialEq, Serialize, ToSchema)]
pub struct MotorClass {
    pub id: &'static str,
    pub label: &'static str,
    pub drive: Drive,
    /// Mass of one motor, g.
    pub mass_g: f64,
    /// Electrical power at full throttle at the reference voltage, W.
    pub max_power_w: f64,
    /// Usual propeller diameters, mm (smallest, largest).
    pub prop_mm: (f64, f64),
    /// Static thrust at full throttle at sea level and the reference voltage,
    /// gram-force: what an ordinary motor of the class gives, and the best of the class.
    pub thrust_gf: (f64, f64),
    /// The voltage the power and thrust are for, V: the nominal voltage of
    /// `ref_cells` LiPo cells of 3.7 V.
    pub ref_voltage_v: f64,
    pub ref_cells: u32,
    /// LiPo cell counts the class is sold for (fewest, most).
    pub cells: (u32, u32),
    /// Largest current one motor may draw, A (its makers' peak rating).
    pub max_current_a: f64,
    pub basis: Basis,
}

/// Nominal voltage of one LiPo cell, V, the trade's unit for a motor's voltage range.
pub const LIPO_CELL_V: f64 = 3.7;

impl MotorClass {
    pub fn mass(&self) -> Mass {
        Mass::new::<gram>(self.mass_g)
    }
    /// Full-throttle electrical power at the reference voltage.
    pub fn max_power(&self) -> Power {
        Power::new::<watt>(self.max_power_w)
    }
    /// The middle of the usual propeller range: the diameter assumed when the sheet gives none.
    pub fn usual_prop(&self) -> Length {
        Length::new::<millimeter>(0.5 * (self.prop_mm.0 + self.prop_mm.1))
    }
    pub fn largest_prop(&self) -> Length {
        Length::new::<millimeter>(self.prop_mm.1)
    }
    pub fn typical_thrust(&self) -> Force {
        Force::new::<gram_force>(self.thrust_gf.0)
    }
    pub fn best_thrust(&self) -> Force {
        Force::new::<gram_force>(self.thrust_gf.1)
    }
    pub fn ref_voltage(&self) -> ElectricPotential {
        ElectricPotential::new::<volt>(self.ref_voltage_v)
    }
    pub fn current_limit(&self) -> ElectricCurrent {
        ElectricCurrent::new::<ampere>(self.max_current_a)
    }
    /// The nominal voltages of the fewest and most cells the class is sold for.
    pub fn voltage_range(&self) -> (ElectricPotential, ElectricPotential) {
        let v = |n: u32| ElectricPotential::new::<volt>(LIPO_CELL_V * f64::from(n));
        (v(self.cells.0), v(self.cells.1))
    }
}

const MOTORS_NOTE: &str = "hobby motor classes as sold with their usual propellers, at the \
     reference cell count; ranges and peak currents recalled, not measured";

/// The motor classes, smallest first.
pub const MOTORS: &[MotorClass] = &[
    MotorClass {
        id: "brushed-coreless-6x15",
        label: "6 x 15 mm brushed coreless, 31-40 mm propeller, 1 cell",
        drive: Drive::Brushed,
        mass_g: 2.0,
        max_power_w: 6.0,
        prop_mm: (31.0, 40.0),
        thrust_gf: (17.0, 23.0),
        ref_voltage_v: 3.7,
        ref_cells: 1,
        cells: (1, 1),
        max_current_a: 2.0,
        basis: Basis::FromMemory(MOTORS_NOTE),
    },
    MotorClass {
        id: "brushed-coreless-7x16",
        label: "7 x 16 mm brushed coreless, 45-55 mm propeller, 1 cell",
        drive: Drive::Brushed,
        mass_g: 3.0,
        max_power_w: 10.0,
        prop_mm: (45.0, 55.0),
        thrust_gf: (30.0, 36.0),
        ref_voltage_v: 3.7,
        ref_cells: 1,
        cells: (1, 1),
        max_current_a: 3.3,
        basis: Basis::CommonPractice(
            "a 7 mm coreless motor with its usual propeller lifts about 30 g",
        ),
    },
    MotorClass {
        id: "brushed-coreless-8x20",
        label: "8 x 20 mm brushed coreless, 55-65 mm propeller, 1 cell",
        drive: Drive::Brushed,
        mass_g: 5.0,
        max_power_w: 14.0,
        prop_mm: (55.0, 65.0),
        thrust_gf: (42.0, 52.0),
        ref_voltage_v: 3.7,
        ref_cells: 1,
        cells: (1, 1),
        max_current_a: 4.5,
        basis: Basis::FromMemory(MOTORS_NOTE),
    },
    MotorClass {
        id: "brushless-0802",
        label: "0802 brushless, 31-40 mm propeller, 1 cell",
        drive: Drive::Brushless,
        mass_g: 2.0,
        max_power_w: 15.0,
        prop_mm: (31.0, 40.0),
        thrust_gf: (30.0, 40.0),
        ref_voltage_v: 3.7,
        ref_cells: 1,
        cells: (1, 1),
        max_current_a: 5.0,
        basis: Basis::FromMemory(MOTORS_NOTE),
    },
    MotorClass {
        id: "brushless-1103",
        label: "1103 brushless, 40-65 mm propeller, 1-2 cells (figures at 2)",
        drive: Drive::Brushless,
        mass_g: 4.0,
        max_power_w: 35.0,
        prop_mm: (40.0, 65.0),
        thrust_gf: (70.0, 95.0),
        ref_voltage_v: 7.4,
        ref_cells: 2,
        cells: (1, 2),
        max_current_a: 6.0,
        basis: Basis::FromMemory(MOTORS_NOTE),
    },
    MotorClass {
        id: "brushless-1404",
        label: "1404 brushless, 3-3.5 in propeller, 3-4 cells (figures at 3)",
        drive: Drive::Brushless,
        mass_g: 9.0,
        max_power_w: 90.0,
        prop_mm: (76.0, 90.0),
        thrust_gf: (200.0, 280.0),
        ref_voltage_v: 11.1,
        ref_cells: 3,
        cells: (3, 4),
        max_current_a: 10.0,
        basis: Basis::FromMemory(MOTORS_NOTE),
    },
    MotorClass {
        id: "brushless-2204",
        label: "2204 brushless, 5-6 in propeller, 3-4 cells (figures at 3)",
        drive: Drive::Brushless,
        mass_g: 26.0,
        max_power_w: 160.0,
        prop_mm: (127.0, 152.0),
        thrust_gf: (450.0, 600.0),
        ref_voltage_v: 11.1,
        ref_cells: 3,
        cells: (3, 4),
        max_current_a: 18.0,
        basis: Basis::FromMemory(MOTORS_NOTE),
    },
    MotorClass {
        id: "brushless-2212",
        label: "2212 brushless, 9-10 in propeller, 3-4 cells (figures at 3)",
        drive: Drive::Brushless,
        mass_g: 55.0,
        max_power_w: 220.0,
        prop_mm: (229.0, 254.0),
        thrust_gf: (750.0, 950.0),
        ref_voltage_v: 11.1,
        ref_cells: 3,
        cells: (3, 4),
        max_current_a: 25.0,
        basis: Basis::FromMemory(MOTORS_NOTE),
    },
    MotorClass {
        id: "brushless-2306",
        label: "2306 brushless, 5 in propeller, 4-6 cells (figures at 6)",
        drive: Drive::Brushless,
        mass_g: 32.0,
        max_power_w: 600.0,
        prop_mm: (127.0, 130.0),
        thrust_gf: (1100.0, 1450.0),
        ref_voltage_v: 22.2,
        ref_cells: 6,
        cells: (4, 6),
        max_current_a: 35.0,
        basis: Basis::FromMemory(MOTORS_NOTE),
    },
    MotorClass {
        id: "brushless-2814",
        label: "2814 brushless, 10-12 in propeller, 4-6 cells (figures at 4)",
        drive: Drive::Brushless,
        mass_g: 90.0,
        max_power_w: 450.0,
        prop_mm: (254.0, 305.0),
        thrust_gf: (1500.0, 2000.0),
        ref_voltage_v: 14.8,
        ref_cells: 4,
        cells: (4, 6),
        max_current_a: 38.0,
        basis: Basis::FromMemory(MOTORS_NOTE),
    },
    MotorClass {
        id: "brushless-3508",
        label: "3508 brushless, 12-15 in propeller, 4-6 cells (figures at 6)",
        drive: Drive::Brushless,
        mass_g: 80.0,
        max_power_w: 380.0,
        prop_mm: (305.0, 381.0),
        thrust_gf: (1600.0, 2200.0),
        ref_voltage_v: 22.2,
        ref_cells: 6,
        cells: (4, 6),
        max_current_a: 22.0,
        basis: Basis::FromMemory(MOTORS_NOTE),
    },
    MotorClass {
        id: "brushless-4114",
        label: "4114 brushless, 15-17 in propeller, 6 cells",
        drive: Drive::Brushless,
        mass_g: 150.0,
        max_power_w: 750.0,
        prop_mm: (381.0, 432.0),
        thrust_gf: (3000.0, 3800.0),
        ref_voltage_v: 22.2,
        ref_cells: 6,
        cells: (6, 6),
        max_current_a: 42.0,
        basis: Basis::FromMemory(MOTORS_NOTE),
    },
];

pub fn motor(id: &str) -> Option<&'static MotorClass> {
    MOTORS.iter().find(|m| m.id == id)
}

/// A battery chemistry at the cell level.
#[derive(Debug, Clone, PartialEq, Serialize, ToSchema)]
pub struct Chemistry {
    pub id: &'static str,
    pub label: &'static str,
    /// Nominal (mid-discharge) cell voltage, V.
    pub nominal_v: f64,
    /// Cell voltage at full charge, V.
    pub full_v: f64,
    /// Specific energy, Wh/kg: the upper end of ordinary packs (typical tier),
    /// the best cells sold (best practice), and the highest theoretical specific
    /// energy of the active materials of any electrode pair the chemistry's name
    /// covers (physical limit; no whole cell reaches it).
    pub specific_energy_wh_kg: (f64, f64, f64),
    /// Continuous discharge rate, C: ordinary cells and the best high-rate ones.
    pub max_c: (f64, f64),
    pub basis: Basis,
}

impl Chemistry {
    /// The specific energy at a tier, Wh/kg: ordinary packs, the best cells
    /// sold, the theoretical ceiling of the electrode pairs.
    pub fn specific_energy(&self, tier: tiers::Tier) -> f64 {
        let (ordinary, best, ceiling) = self.specific_energy_wh_kg;
        match tier {
            tiers::Tier::PhysicalLimit => ceiling,
            tiers::Tier::BestPractice => best,
            tiers::Tier::Typical => ordinary,
        }
    }
}

pub const CHEMISTRIES: &[Chemistry] = &[
    Chemistry {
        id: "lipo",
        label: "lithium polymer (LiPo)",
        nominal_v: 3.7,
        full_v: 4.2,
        specific_energy_wh_kg: (150.0, 500.0, 1000.0),
        max_c: (25.0, 75.0),
        basis: Basis::FromMemory(concat_basis::LIPO),
    },
    Chemistry {
        id: "lihv",
        label: "high-voltage lithium polymer (LiHV)",
        nominal_v: 3.8,
        full_v: 4.35,
        specific_energy_wh_kg: (160.0, 500.0, 1000.0),
        max_c: (25.0, 75.0),
        basis: Basis::FromMemory(concat_basis::LIHV),
    },
    Chemistry {
        id: "li-ion",
        label: "lithium-ion",
        nominal_v: 3.6,
        full_v: 4.2,
        specific_energy_wh_kg: (265.0, 500.0, 1000.0),
        max_c: (3.0, 10.0),
        basis: Basis::FromMemory(concat_basis::LI_ION),
    },
    Chemistry {
        id: "lifepo4",
        label: "lithium iron phosphate (LiFePO4)",
        nominal_v: 3.2,
        full_v: 3.65,
        specific_energy_wh_kg: (130.0, 205.0, 560.0),
        max_c: (5.0, 25.0),
        basis: Basis::FromMemory(
            "nominal 3.2-3.3 V; ordinary cells 90-160 Wh/kg, the best prismatic cells about \
             205 Wh/kg; the ceiling, about 560 Wh/kg, is LiFePO4 (170 mAh/g) against a \
             lithium-metal anode at 3.4 V by Faraday's law",
        ),
    },
    Chemistry {
        id: "nimh",
        label: "nickel-metal hydride (NiMH)",
        nominal_v: 1.2,
        full_v: 1.4,
        specific_energy_wh_kg: (80.0, 110.0, 240.0),
        max_c: (5.0, 15.0),
        basis: Basis::FromMemory(
            "nominal 1.2 V; 60-110 Wh/kg (handbook ranges); the ceiling, about 240 Wh/kg, is \
             the theoretical specific energy of NiOOH against a metal hydride (Linden's \
             handbook gives about 240)",
        ),
    },
    Chemistry {
        id: "alkaline",
        label: "alkaline",
        nominal_v: 1.5,
        full_v: 1.6,
        specific_energy_wh_kg: (110.0, 160.0, 360.0),
        max_c: (0.2, 1.0),
        basis: Basis::FromMemory(
            "nominal 1.5 V; 100-150 Wh/kg at low drain, far less at the currents a rotor \
             draws; the ceiling, about 360 Wh/kg, is the theoretical specific energy of \
             zinc against manganese dioxide (Linden's handbook gives about 358)",
        ),
    },
];

/// The basis notes of the lithium-ion family, each with the shared limits.
mod concat_basis {
    macro_rules! with_limits {
        ($head:literal) => {
            concat!(
                $head,
                "; the best cells sold are silicon-anode lithium-ion cells of 400-500 Wh/kg; \
                 the ceiling, about 1000 Wh/kg, is the theoretical specific energy of the active \
                 materials of a silicon or lithium-metal anode against a nickel-rich layered \
                 oxide (Faraday's law: Li 3861, Si 3579, LiNiO2 275 mAh/g, at 3.5-3.8 V), above \
                 what any whole cell can store"
            )
        };
    }
    pub const LIPO: &str =
        with_limits!("nominal 3.6-3.7 V, 4.2 V full; ordinary hobby packs 120-160 Wh/kg");
    pub const LIHV: &str =
        with_limits!("nominal 3.8 V, 4.35 V full; ordinary packs a few percent above LiPo");
    pub const LI_ION: &str =
        with_limits!("nominal 3.6-3.7 V, 4.2 V full; ordinary 18650 and 21700 cells 240-265 Wh/kg");
}

pub fn chemistry(id: &str) -> Option<&'static Chemistry> {
    CHEMISTRIES.iter().find(|c| c.id == id)
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::physics::{atmosphere, rotor};
    use tiers::Tier;

    fn bound_at(class: &MotorClass, diameter: Length, tier: Tier) -> Force {
        let air = atmosphere::isa(Length::new::<millimeter>(0.0), None);
        let fm = tiers::figure_of_merit(tier, diameter);
        let eta = tiers::drive_efficiency(tier, class.drive, diameter);
        rotor::thrust_bound(
            air.density,
            rotor::disk_area(diameter),
            class.max_power() * (fm * eta),
        )
    }

    #[test]
    fn no_motor_class_claims_more_than_the_momentum_bound_allows() {
        // Momentum theory (Glauert): T <= (2 rho A)^(1/3) (FM eta P)^(2/3). The best of a
        // class must sit below the best-practice bound on its largest usual propeller.
        for class in MOTORS {
            let bound = bound_at(class, class.largest_prop(), Tier::BestPractice);
            assert!(
                class.best_thrust() < bound,
                "{}: best thrust {} gf above bound {} gf",
                class.id,
                class.thrust_gf.1,
                bound.get::<gram_force>()
            );
            assert!(class.thrust_gf.0 <= class.thrust_gf.1, "{}", class.id);
        }
    }

    #[test]
    fn each_motor_class_states_one_reference_voltage_inside_its_range_and_a_current_limit() {
        // Each class's figures are for one cell count: V0 = cells x 3.7 V (LiPo nominal,
        // Linden's Handbook of Batteries), inside the cell range it is sold for; its current
        // limit is at least the full-throttle current there, I0 = P0 / V0 (battery-energy).
        for class in MOTORS {
            let v0 = class.ref_voltage().get::<volt>();
            assert!(
                (v0 - LIPO_CELL_V * f64::from(class.ref_cells)).abs() < 1e-9,
                "{}",
                class.id
            );
            assert!(
                (class.cells.0..=class.cells.1).contains(&class.ref_cells),
                "{}",
                class.id
            );
            let i0 = class.max_power_w / v0;
            assert!(
                class.max_current_a >= i0 && class.max_current_a <= 1.5 * i0,
                "{}: {} A against {i0} A at the reference",
                class.id,
                class.max_current_a
            );
            assert!(
                class.label.contains(&format!("{} cell", class.ref_cells))
                    || class
                        .label
                        .contains(&format!("figures at {}", class.ref_cells)),
                "{}: the label names the reference cells",
                class.id
            );
        }
    }

    #[test]
    fn a_seven_millimetre_coreless_motor_lifts_about_thirty_grams() {
        // Common practice (DESIGN check values): a 7 mm brushed coreless motor with its
        // usual propeller lifts about 30 g at full throttle.
        let class = motor("brushed-coreless-7x16").unwrap();
        assert!((class.typical_thrust().get::<gram_force>() - 30.0).abs() < 3.0);
    }

    #[test]
    fn lithium_cells_sit_at_their_handbook_voltages() {
        // Handbook ranges (from memory; DESIGN check values): Li-ion and LiPo nominal
        // 3.6-3.7 V, 4.2 V full; LiHV 3.8 V nominal, 4.35 V full.
        for id in ["lipo", "li-ion"] {
            let c = chemistry(id).unwrap();
            assert!((3.6..=3.7).contains(&c.nominal_v), "{id}");
            assert_eq!(c.full_v, 4.2, "{id}");
        }
        let lihv = chemistry("lihv").unwrap();
        assert_eq!((lihv.nominal_v, lihv.full_v), (3.8, 4.35));
    }

    #[test]
    fn ordinary_lipo_packs_hold_about_150_wh_per_kg() {
        // DESIGN check values: ordinary hobby LiPo packs 120-160 Wh/kg (from memory).
        let ordinary = chemistry("lipo").unwrap().specific_energy(Tier::Typical);
        assert!((120.0..=160.0).contains(&ordinary), "{ordinary}");
    }

    #[test]
    fn sold_cells_pass_the_tiers_their_class_belongs_to() {
        // Cell datasheet classes (from memory): a Panasonic NCR18650B holds 3.4 Ah at
        // 3.6 V in 48.5 g (252 Wh/kg) and a Samsung INR21700-50E 5.0 Ah at 3.6 V in 69 g
        // (261 Wh/kg): ordinary li-ion cells, so the typical tier must admit them. Amprius's
        // silicon-anode pouch cells are sold at about 450-500 Wh/kg: the best-practice tier
        // of every lithium-ion chemistry must admit them.
        let li_ion = chemistry("li-ion").unwrap();
        for (ah, grams) in [(3.4, 48.5), (5.0, 69.0)] {
            let e = ah * 3.6 / (grams / 1000.0);
            assert!(e <= li_ion.specific_energy(Tier::Typical), "{e}");
        }
        for id in ["lipo", "lihv", "li-ion"] {
            assert!(
                chemistry(id).unwrap().specific_energy(Tier::BestPractice) >= 500.0,
                "{id}"
            );
        }
    }

    /// Theoretical specific energy of an electrode pair, Wh/kg of active material:
    /// V / (1/q_anode + 1/q_cathode), each capacity q = n F / M by Faraday's law.
    fn pair_wh_kg(volts: f64, anode: (f64, f64), cathode: (f64, f64)) -> f64 {
        const FARADAY: f64 = 96_485.332; // C/mol, CODATA
        let mah_per_g =
            |(electrons, molar_mass): (f64, f64)| electrons * FARADAY / molar_mass / 3.6;
        volts / (1.0 / mah_per_g(anode) + 1.0 / mah_per_g(cathode))
    }

    #[test]
    fn each_ceiling_is_the_theoretical_energy_of_the_best_pair_its_name_covers() {
        // Faraday's law with standard atomic weights (IUPAC): lithium metal 1 e / 6.94 g/mol
        // (3861 mAh/g), LiNiO2 1 e / 97.63 (275 mAh/g), LiFePO4 1 e / 157.76 (170 mAh/g),
        // Zn 2 e / 65.38 (820 mAh/g), MnO2 1 e / 86.94 (308 mAh/g), NiOOH 1 e / 91.70,
        // LaNi5H6 6 e / 438.5. The ceiling must not sit below the pair (else a cell that
        // chemistry could hold would be called impossible) nor far above it (within 15 %).
        let lithium = (1.0, 6.94);
        let pairs = [
            ("lipo", pair_wh_kg(3.8, lithium, (1.0, 97.63))),
            ("lihv", pair_wh_kg(3.8, lithium, (1.0, 97.63))),
            ("li-ion", pair_wh_kg(3.8, lithium, (1.0, 97.63))),
            ("lifepo4", pair_wh_kg(3.4, lithium, (1.0, 157.76))),
            ("alkaline", pair_wh_kg(1.5, (2.0, 65.38), (1.0, 86.94))),
            ("nimh", pair_wh_kg(1.35, (6.0, 438.5), (1.0, 91.70))),
        ];
        for (id, theory) in pairs {
            let ceiling = chemistry(id).unwrap().specific_energy(Tier::PhysicalLimit);
            assert!(
                ceiling >= theory && ceiling <= theory * 1.15,
                "{id}: ceiling {ceiling}, pair {theory:.0}"
            );
        }
        // Linden's Handbook of Batteries gives about 358 Wh/kg for Zn/MnO2 (from memory).
        let alkaline = pair_wh_kg(1.5, (2.0, 65.38), (1.0, 86.94));
        assert!((alkaline - 336.0).abs() < 2.0, "{alkaline}");
    }

    #[test]
    fn every_chemistry_is_ordered_ordinary_best_ceiling() {
        // Tier order (DESIGN): physical limit at least as generous as best practice, best
        // practice at least as generous as typical.
        for c in CHEMISTRIES {
            let (ordinary, best, ceiling) = c.specific_energy_wh_kg;
            assert!(ordinary <= best && best <= ceiling, "{}", c.id);
            assert!(c.max_c.0 <= c.max_c.1 && c.full_v > c.nominal_v, "{}", c.id);
        }
    }
}

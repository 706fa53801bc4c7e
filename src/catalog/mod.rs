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
    /// Specific energy of whole cells, Wh/kg: the upper end of ordinary cells,
    /// the best cells sold, and a ceiling no cell of the chemistry reaches.
    pub specific_energy_wh_kg: (f64, f64, f64),
    /// Continuous discharge rate, C: ordinary cells and the best high-rate ones.
    pub max_c: (f64, f64),
    pub basis: Basis,
}

pub const CHEMISTRIES: &[Chemistry] = &[
    Chemistry {
        id: "lipo",
        label: "lithium polymer (LiPo)",
        nominal_v: 3.7,
        full_v: 4.2,
        specific_energy_wh_kg: (180.0, 260.0, 400.0),
        max_c: (25.0, 75.0),
        basis: Basis::FromMemory(
            "nominal 3.6-3.7 V, 4.2 V full; hobby packs 130-180 Wh/kg, best lithium cells 250-300 Wh/kg; \
             about 400 Wh/kg is above any lithium-ion cell made (handbook ranges)",
        ),
    },
    Chemistry {
        id: "li-ion",
        label: "lithium-ion cylindrical or prismatic cells",
        nominal_v: 3.6,
        full_v: 4.2,
        specific_energy_wh_kg: (240.0, 300.0, 400.0),
        max_c: (3.0, 10.0),
        basis: Basis::FromMemory(
            "nominal 3.6-3.7 V, 4.2 V full; ordinary cells 200-250 Wh/kg, best 270-300 Wh/kg (handbook ranges)",
        ),
    },
    Chemistry {
        id: "lifepo4",
        label: "lithium iron phosphate (LiFePO4)",
        nominal_v: 3.2,
        full_v: 3.65,
        specific_energy_wh_kg: (130.0, 180.0, 250.0),
        max_c: (5.0, 25.0),
        basis: Basis::FromMemory("nominal 3.2-3.3 V; 90-160 Wh/kg for ordinary cells (handbook ranges)"),
    },
    Chemistry {
        id: "nimh",
        label: "nickel-metal hydride (NiMH)",
        nominal_v: 1.2,
        full_v: 1.4,
        specific_energy_wh_kg: (80.0, 110.0, 150.0),
        max_c: (5.0, 15.0),
        basis: Basis::FromMemory("nominal 1.2 V; 60-110 Wh/kg (handbook ranges)"),
    },
    Chemistry {
        id: "alkaline",
        label: "alkaline primary cells",
        nominal_v: 1.5,
        full_v: 1.6,
        specific_energy_wh_kg: (110.0, 160.0, 200.0),
        max_c: (0.2, 1.0),
        basis: Basis::FromMemory(
            "nominal 1.5 V; 100-150 Wh/kg at low drain, far less at the currents a rotor draws",
        ),
    },
];

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
    fn lithium_cells_sit_at_3_6_to_3_7_volts_nominal_and_4_2_full() {
        // Handbook ranges (from memory): Li-ion and LiPo nominal 3.6-3.7 V, 4.2 V full.
        for id in ["lipo", "li-ion"] {
            let c = chemistry(id).unwrap();
            assert!((3.6..=3.7).contains(&c.nominal_v), "{id}");
            assert_eq!(c.full_v, 4.2, "{id}");
            let (ordinary, best, ceiling) = c.specific_energy_wh_kg;
            assert!(ordinary < best && (250.0..=300.0).contains(&best) && ceiling > best);
        }
    }
}

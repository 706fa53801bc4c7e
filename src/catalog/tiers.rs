//! The one table of values for the assumption tiers ([`crate::tier`]).
//!
//! Each row below states its value at each tier and its basis; the methods
//! page prints this table as is.

use serde::Serialize;
use uom::si::f64::{Length, Mass};
use uom::si::{length::millimeter, mass::gram};
use utoipa::ToSchema;

use super::{Basis, Drive};
pub use crate::tier::{PerTier, Tier};

/// Which end of a row's range asks less of the claim: the physical-limit
/// value lies at that end, typical at the other (DESIGN "Assumption tiers").
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Generous {
    /// Efficiencies, figures of merit, allowances: more is kinder to the claim.
    Larger,
    /// Losses, errors, drift, interference: less is kinder to the claim.
    Smaller,
}

/// One row of the tier table.
#[derive(Debug, Clone, Serialize, ToSchema)]
pub struct Row {
    #[serde(skip)]
    pub generous: Generous,
    pub key: &'static str,
    pub label: &'static str,
    pub unit: &'static str,
    /// Values at physical limit, best practice, typical.
    #[schema(value_type = Vec<f64>, min_items = 3, max_items = 3)]
    pub values: PerTier<f64>,
    pub basis: Basis,
}

impl Row {
    pub fn at(&self, tier: Tier) -> f64 {
        self.values[tier]
    }
}

const fn row(
    generous: Generous,
    key: &'static str,
    label: &'static str,
    unit: &'static str,
    values: PerTier<f64>,
    basis: Basis,
) -> Row {
    Row {
        generous,
        key,
        label,
        unit,
        values,
        basis,
    }
}

// Figure of merit and drive efficiency, in the three size bands of the rotor
// ([`SizeBand`]) that every tier shares: the motor's size follows the rotor it swings.
pub const FM_SMALL: Row = row(
    Generous::Larger,
    "figure_of_merit_small",
    "Figure of merit, rotors under 100 mm",
    "1",
    PerTier::new(1.0, 0.65, 0.45),
    Basis::Source("deters-2014"),
);
pub const FM_MEDIUM: Row = row(
    Generous::Larger,
    "figure_of_merit_medium",
    "Figure of merit, rotors 100-250 mm",
    "1",
    PerTier::new(1.0, 0.70, 0.55),
    Basis::FromMemory(
        "between the micro rotors' 0.65 (Deters et al. 2014) and the 9-11 in propellers' 0.75 \
         (Brandt and Selig 2011); small hobby propellers typically 0.5-0.6",
    ),
);
pub const FM_LARGE: Row = row(
    Generous::Larger,
    "figure_of_merit_large",
    "Figure of merit, rotors over 250 mm",
    "1",
    PerTier::new(1.0, 0.75, 0.65),
    Basis::Source("brandt-selig-2011"),
);
pub const BRUSHLESS_MOTOR_SMALL: Row = row(
    Generous::Larger,
    "brushless_motor_efficiency_small",
    "Brushless motor efficiency in hover, motors for rotors under 100 mm",
    "1",
    PerTier::new(1.0, 0.78, 0.65),
    Basis::FromMemory(
        "micro outrunners (08xx-14xx) run about 0.6-0.75 at hover throttle; the typical value \
         lies inside that span, the best at its top",
    ),
);
pub const BRUSHLESS_MOTOR_MEDIUM: Row = row(
    Generous::Larger,
    "brushless_motor_efficiency_medium",
    "Brushless motor efficiency in hover, motors for rotors 100-250 mm",
    "1",
    PerTier::new(1.0, 0.85, 0.75),
    Basis::FromMemory("22xx-23xx outrunners about 0.7-0.85 at hover throttle"),
);
pub const BRUSHLESS_MOTOR_LARGE: Row = row(
    Generous::Larger,
    "brushless_motor_efficiency_large",
    "Brushless motor efficiency in hover, motors for rotors over 250 mm",
    "1",
    PerTier::new(1.0, 0.90, 0.80),
    Basis::FromMemory("outrunners of 28xx and up peak near 0.9; 0.75-0.85 at hover throttle"),
);
pub const BRUSHLESS_CONTROLLER: Row = row(
    Generous::Larger,
    "brushless_controller_efficiency",
    "Brushless speed controller efficiency",
    "1",
    PerTier::new(1.0, 0.97, 0.95),
    Basis::FromMemory("MOSFET controllers lose 3-5 % at hover current"),
);
pub const BRUSHED_MOTOR: Row = row(
    Generous::Larger,
    "brushed_motor_efficiency",
    "Brushed coreless motor efficiency (all are small motors)",
    "1",
    PerTier::new(1.0, 0.75, 0.55),
    Basis::FromMemory("coreless motors peak near 0.75; about 0.55 at the loads micro craft run"),
);
pub const BRUSHED_DRIVER: Row = row(
    Generous::Larger,
    "brushed_driver_efficiency",
    "Brushed motor driver (MOSFET) efficiency",
    "1",
    PerTier::new(1.0, 0.98, 0.95),
    Basis::FromMemory("a single low-side MOSFET loses a few percent"),
);
pub const DEPTH_OF_DISCHARGE: Row = row(
    Generous::Larger,
    "depth_of_discharge",
    "Usable fraction of the battery's capacity",
    "1",
    PerTier::new(1.0, 0.90, 0.80),
    Basis::CommonPractice("land with about 20 % left to spare lithium cells"),
);
pub const HOVER_FRACTION_MAX: Row = row(
    Generous::Larger,
    "hover_fraction_max",
    "Largest share of maximum thrust spent to hover",
    "1",
    PerTier::new(1.0, 1.0, 0.70),
    Basis::CommonPractice(
        "hover at no more than about 70 % of maximum thrust, leaving room to climb and steer",
    ),
);
pub const BODY_DRAG: Row = row(
    Generous::Larger,
    "body_drag_coefficient",
    "Drag coefficient of the body in a headwind",
    "1",
    PerTier::new(2.0, 1.28, 1.05),
    Basis::Source("hoerner-1965"),
);
pub const THRUST_MISMATCH: Row = row(
    Generous::Smaller,
    "thrust_mismatch",
    "Thrust mismatch between rotors at one command",
    "1",
    PerTier::new(0.01, 0.02, 0.05),
    Basis::CommonPractice("motors and propellers of one batch differ by a few percent"),
);
pub const GYRO_DRIFT: Row = row(
    Generous::Smaller,
    "gyro_drift",
    "Rate-gyro bias drift, uncorrected",
    "deg/h",
    PerTier::new(0.0, 10.0, 360.0),
    Basis::FromMemory(
        "calibrated MEMS gyros 1-10 deg/h; uncorrected consumer parts about 0.1 deg/s",
    ),
);
pub const ACCEL_BIAS: Row = row(
    Generous::Smaller,
    "accelerometer_bias",
    "Accelerometer bias, uncorrected",
    "m/s^2",
    PerTier::new(0.0, 0.005, 0.05),
    Basis::FromMemory("consumer MEMS accelerometers 0.5-5 mg after calibration"),
);
pub const LEVEL_ERROR: Row = row(
    Generous::Smaller,
    "level_error",
    "Error of the level reference an autopilot holds",
    "deg",
    PerTier::new(0.0, 0.2, 1.0),
    Basis::FromMemory(
        "accelerometer levelling to a fraction of a degree, mounting error about 1 deg",
    ),
);
pub const REACTIVE_TORQUE: Row = row(
    Generous::Larger,
    "reactive_torque_ratio",
    "Propeller drag torque per thrust, as a fraction of the rotor diameter (Q / (T D))",
    "1",
    PerTier::new(0.08, 0.08, 0.06),
    Basis::FromMemory(
        "static hobby propellers have C_P / C_T about 0.4-0.5, so Q / T = C_P D / (2 pi C_T) \
         is about 0.06-0.08 D; no law bounds it, so the generous tiers take the upper end",
    ),
);
pub const TRI_SERVO_RANGE: Row = row(
    Generous::Larger,
    "tri_servo_range",
    "Tilt either way of a tricopter's yaw servo, when the sheet gives none",
    "deg",
    PerTier::new(30.0, 30.0, 30.0),
    Basis::CommonPractice("tricopter tail servos swing the motor about 30 deg either way"),
);

pub const COAXIAL_INTERFERENCE: Row = row(
    Generous::Smaller,
    "coaxial_interference",
    "Induced power of a coaxial pair against two isolated rotors (kappa_int)",
    "1",
    // Measured pairs (Harrington) at the generous tiers: no more interference than
    // measurements show; the ideal pair of momentum theory (Leishman) as the usual value.
    PerTier::new(1.16, 1.16, 1.2808),
    Basis::Source("coaxial-rotor"),
);

// Energy budget: avionics by craft size, the forward-flight power terms, and
// the pack's losses at the typical tier.

pub const AVIONICS_SMALL: Row = row(
    Generous::Smaller,
    "avionics_power_small",
    "Power drawn by electronics other than motors, craft under 100 g without its battery",
    "W",
    PerTier::new(0.0, 0.3, 1.0),
    Basis::FromMemory("a micro flight controller and receiver draw 0.3-1 W"),
);
pub const AVIONICS_MEDIUM: Row = row(
    Generous::Smaller,
    "avionics_power_medium",
    "Power drawn by electronics other than motors, craft of 100 g to 1 kg without its battery",
    "W",
    PerTier::new(0.0, 1.0, 4.0),
    Basis::FromMemory(
        "a flight controller and receiver draw about 1 W; an analogue camera and video \
         transmitter add 2-5 W",
    ),
);
pub const AVIONICS_LARGE: Row = row(
    Generous::Smaller,
    "avionics_power_large",
    "Power drawn by electronics other than motors, craft over 1 kg without its battery",
    "W",
    PerTier::new(0.0, 3.0, 10.0),
    Basis::FromMemory("a camera and video link draw 5-15 W; GNSS, telemetry and a gimbal add more"),
);
pub const FORWARD_DRAG: Row = row(
    Generous::Smaller,
    "forward_drag_coefficient",
    "Drag coefficient of the body in forward flight, on its frontal area",
    "1",
    // Physical limit: a streamlined fairing of the body's box, never zero, so the
    // least power over airspeed is finite.
    PerTier::new(0.05, 0.5, 1.05),
    Basis::FromMemory(
        "Hoerner 1965: streamlined bodies of fineness 2-4 about 0.05 on frontal area, \
         boxes with well-rounded edges about 0.5, a cube face-on 1.05",
    ),
);
pub const PROFILE_POWER: Row = row(
    Generous::Smaller,
    "profile_power",
    "Blade profile power in hover, as a share of the ideal hover power",
    "1",
    // The rest of the hover loss, 1 / FM - 1 - profile, is induced (kappa - 1): it
    // falls with airspeed, where profile power does not.
    PerTier::new(0.0, 0.15, 0.40),
    Basis::FromMemory(
        "Leishman 2006: a good rotor with FM 0.75 has kappa about 1.15, so profile power \
         about 0.18 of the ideal; small propellers at low Reynolds number lose more to \
         profile drag",
    ),
);
pub const COLD_CAPACITY_LOSS: Row = row(
    Generous::Smaller,
    "cold_capacity_loss",
    "Capacity lost per kelvin of air below 15 degC",
    "1/K",
    PerTier::new(0.0, 0.0, 0.01),
    Basis::FromMemory(
        "lithium packs give about 80-85 % of their capacity near 0 degC at moderate drain",
    ),
);
pub const VOLTAGE_SAG: Row = row(
    Generous::Smaller,
    "voltage_sag",
    "Cell voltage sag at the pack's rated continuous current, as a share of nominal",
    "1",
    PerTier::new(0.0, 0.0, 0.10),
    Basis::FromMemory(
        "a lithium cell at its rated continuous current sags about 0.3-0.4 V below \
         nominal (internal resistance); the sag grows in proportion to the current",
    ),
);

/// The avionics power row for a craft of this mass without its battery.
pub fn avionics_row(mass: Mass) -> &'static Row {
    let g = mass.get::<gram>();
    if g < 100.0 {
        &AVIONICS_SMALL
    } else if g <= 1000.0 {
        &AVIONICS_MEDIUM
    } else {
        &AVIONICS_LARGE
    }
}

// Holding an attitude in wind, its moments, and the time to tip (tilt-equilibrium, sensing).
pub const BODY_DRAG_LEAST: Row = row(
    Generous::Smaller,
    "body_drag_coefficient_least",
    "Least drag coefficient of the body in a headwind, on the area it shows",
    "1",
    // The least drag asks least of a craft said to lean little in a wind; the band
    // runs from this row to BODY_DRAG, nested from the physical limit inward.
    PerTier::new(0.04, 0.5, 1.05),
    Basis::FromMemory(
        "Hoerner 1965: a streamlined body of revolution reaches about 0.04 on its frontal \
         area, the least a closed body can have; a faired, rounded shell about 0.5; an \
         ordinary craft body is a bluff box near a cube's 1.05",
    ),
);
pub const ROTOR_DRAG: Row = row(
    Generous::Larger,
    "rotor_drag_per_thrust",
    "Edgewise drag of a thrusting rotor per unit thrust and airspeed, D = k T V",
    "s/m",
    PerTier::new(0.06, 0.05, 0.03),
    Basis::FromMemory(
        "blade flapping and induced drag give a rotor in edgewise flow a drag linear in \
         thrust and airspeed (rotor-drag); identified small multirotors give about \
         0.03-0.05 s/m; no law bounds it, so the physical limit takes a little more",
    ),
);
pub const ROTOR_DRAG_LEAST: Row = row(
    Generous::Smaller,
    "rotor_drag_per_thrust_least",
    "Least edgewise drag of a thrusting rotor per unit thrust and airspeed",
    "s/m",
    // An ideal actuator disk (momentum theory) has no force in its plane.
    PerTier::new(0.0, 0.02, 0.03),
    Basis::FromMemory(
        "an ideal actuator disk carries no in-plane force (momentum-theory); stiff, light \
         rotors about 0.02 s/m, ordinary ones 0.03 and up (rotor-drag)",
    ),
);
pub const TILT_TOLERANCE: Row = row(
    Generous::Larger,
    "tilt_tolerance",
    "How far a claimed tilt may be from the one that holds station",
    "deg",
    PerTier::new(2.0, 2.0, 2.0),
    Basis::CommonPractice(
        "a tilt read off a photo, a clip or a drawing is good to a degree or two",
    ),
);
pub const THRUST_MISMATCH_BRUSHED: Row = row(
    Generous::Smaller,
    "thrust_mismatch_brushed",
    "Thrust mismatch between brushed motors at one command",
    "1",
    PerTier::new(0.02, 0.05, 0.10),
    Basis::FromMemory(
        "a brushed motor's thrust drifts with its heat and brush wear: 10 % or more \
         between two motors of a toy",
    ),
);
pub const ROTOR_MASS_SHARE: Row = row(
    Generous::Larger,
    "rotor_mass_share",
    "Share of take-off mass in the motors and propellers, when the parts list does not say",
    "1",
    // More mass out at the arms means more inertia and a slower tip: larger is kinder.
    PerTier::new(0.25, 0.20, 0.15),
    Basis::FromMemory(
        "motors and propellers make about 15-25 % of a small multirotor's take-off mass",
    ),
);
pub const LOOP_SAMPLES_PER_TIP: Row = row(
    Generous::Smaller,
    "loop_samples_per_tip",
    "Control loop periods needed within the time to tip",
    "1",
    PerTier::new(1.0, 5.0, 10.0),
    Basis::CommonPractice(
        "a sampled loop needs its period well inside the fastest motion it must stop, \
         about a tenth of it (digital-control); one period at least, or the craft tips \
         before the next correction",
    ),
);

/// The whole table, in the order the methods page prints it.
pub const TABLE: &[&Row] = &[
    &FM_SMALL,
    &FM_MEDIUM,
    &FM_LARGE,
    &BRUSHLESS_MOTOR_SMALL,
    &BRUSHLESS_MOTOR_MEDIUM,
    &BRUSHLESS_MOTOR_LARGE,
    &BRUSHLESS_CONTROLLER,
    &BRUSHED_MOTOR,
    &BRUSHED_DRIVER,
    &DEPTH_OF_DISCHARGE,
    &HOVER_FRACTION_MAX,
    &BODY_DRAG,
    &THRUST_MISMATCH,
    &GYRO_DRIFT,
    &ACCEL_BIAS,
    &LEVEL_ERROR,
    &REACTIVE_TORQUE,
    &TRI_SERVO_RANGE,
    &COAXIAL_INTERFERENCE,
    &AVIONICS_SMALL,
    &AVIONICS_MEDIUM,
    &AVIONICS_LARGE,
    &FORWARD_DRAG,
    &PROFILE_POWER,
    &COLD_CAPACITY_LOSS,
    &VOLTAGE_SAG,
    &BODY_DRAG_LEAST,
    &ROTOR_DRAG,
    &ROTOR_DRAG_LEAST,
    &TILT_TOLERANCE,
    &THRUST_MISMATCH_BRUSHED,
    &ROTOR_MASS_SHARE,
    &LOOP_SAMPLES_PER_TIP,
];

/// The size bands every tier shares, by rotor diameter: under 100 mm, 100 to
/// 250 mm, over 250 mm. A motor is banded by the rotor it swings.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum SizeBand {
    Small,
    Medium,
    Large,
}

impl SizeBand {
    pub const ALL: [SizeBand; 3] = [SizeBand::Small, SizeBand::Medium, SizeBand::Large];

    pub fn of(diameter: Length) -> SizeBand {
        let mm = diameter.get::<millimeter>();
        if mm < 100.0 {
            SizeBand::Small
        } else if mm <= 250.0 {
            SizeBand::Medium
        } else {
            SizeBand::Large
        }
    }
}

/// The figure of merit for a rotor of this diameter at this tier.
pub fn figure_of_merit(tier: Tier, diameter: Length) -> f64 {
    fm_row(diameter).at(tier)
}

/// The row the figure of merit of a rotor of this diameter is read from.
pub fn fm_row(diameter: Length) -> &'static Row {
    fm_band(SizeBand::of(diameter))
}

fn fm_band(band: SizeBand) -> &'static Row {
    match band {
        SizeBand::Small => &FM_SMALL,
        SizeBand::Medium => &FM_MEDIUM,
        SizeBand::Large => &FM_LARGE,
    }
}

/// The rows whose product is the drive efficiency of this drive in this band.
fn drive_rows(drive: Drive, band: SizeBand) -> [&'static Row; 2] {
    match (drive, band) {
        (Drive::Brushed, _) => [&BRUSHED_MOTOR, &BRUSHED_DRIVER],
        (Drive::Brushless, SizeBand::Small) => [&BRUSHLESS_MOTOR_SMALL, &BRUSHLESS_CONTROLLER],
        (Drive::Brushless, SizeBand::Medium) => [&BRUSHLESS_MOTOR_MEDIUM, &BRUSHLESS_CONTROLLER],
        (Drive::Brushless, SizeBand::Large) => [&BRUSHLESS_MOTOR_LARGE, &BRUSHLESS_CONTROLLER],
    }
}

/// Motor times controller efficiency, battery to shaft, for a motor that
/// swings a rotor of this diameter (its size band).
pub fn drive_efficiency(tier: Tier, drive: Drive, diameter: Length) -> f64 {
    let [motor, controller] = drive_rows(drive, SizeBand::of(diameter));
    motor.at(tier) * controller.at(tier)
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn every_row_is_most_generous_at_the_physical_limit() {
        // Tier order (DESIGN): physical limit at least as generous as best practice,
        // best practice at least as generous as typical, on the row's generous side.
        for r in TABLE {
            let v = r.values;
            let ordered = match r.generous {
                Generous::Larger => {
                    v.physical_limit >= v.best_practice && v.best_practice >= v.typical
                }
                Generous::Smaller => {
                    v.physical_limit <= v.best_practice && v.best_practice <= v.typical
                }
            };
            assert!(ordered, "{}: {}", r.key, v);
        }
    }

    #[test]
    fn typical_figure_of_merit_follows_rotor_size() {
        // DESIGN tier table: about 0.45 below 100 mm, 0.55 to 250 mm, 0.65 above.
        let fm = |mm| figure_of_merit(Tier::Typical, Length::new::<millimeter>(mm));
        assert_eq!((fm(55.0), fm(127.0), fm(300.0)), (0.45, 0.55, 0.65));
    }

    #[test]
    fn typical_brushless_drive_of_large_motors_is_point_eight_times_point_nine_five() {
        // DESIGN tier table: brushless 0.80 x ESC 0.95 (rotors over 250 mm); best practice
        // 0.90 x 0.97 (from memory).
        let d = Length::new::<millimeter>(300.0);
        assert!((drive_efficiency(Tier::Typical, Drive::Brushless, d) - 0.76).abs() < 1e-12);
        assert!((drive_efficiency(Tier::BestPractice, Drive::Brushless, d) - 0.873).abs() < 1e-12);
    }

    #[test]
    fn best_practice_figure_of_merit_is_point_six_five_small_and_point_seven_five_large() {
        // Deters, Ananda and Selig, AIAA 2014-2151 (2014): micro rotors in static tests
        // reach about 0.65; Brandt and Selig, AIAA 2011-1255 (2011): 9-11 in propellers
        // about 0.75.
        let fm = |mm| figure_of_merit(Tier::BestPractice, Length::new::<millimeter>(mm));
        assert_eq!((fm(55.0), fm(300.0)), (0.65, 0.75));
        assert!(fm(127.0) > 0.65 && fm(127.0) < 0.75);
    }

    #[test]
    fn small_motors_drive_at_most_the_hover_efficiency_they_are_measured_at() {
        // From memory: small motors run about 0.6-0.75 in hover; the typical drive
        // (motor x controller) of a small brushless motor lies inside that span, not above it.
        let small = Length::new::<millimeter>(65.0);
        let typical = drive_efficiency(Tier::Typical, Drive::Brushless, small);
        assert!((0.6..0.75).contains(&typical), "{typical}");
        let brushed = drive_efficiency(Tier::Typical, Drive::Brushed, small);
        assert!(brushed < typical, "{brushed}");
    }

    #[test]
    fn figure_of_merit_and_drive_efficiency_keep_tier_order_in_every_band() {
        // DESIGN tier order: physical limit >= best practice >= typical, in each size band,
        // row by row and for the products the rules use.
        for band in SizeBand::ALL {
            let d = Length::new::<millimeter>(match band {
                SizeBand::Small => 50.0,
                SizeBand::Medium => 150.0,
                SizeBand::Large => 300.0,
            });
            assert_eq!(SizeBand::of(d), band);
            for drive in [Drive::Brushed, Drive::Brushless] {
                let rows = drive_rows(drive, band);
                for r in rows.iter().chain([&fm_band(band)]) {
                    let v = r.values;
                    assert!(
                        v.physical_limit >= v.best_practice && v.best_practice >= v.typical,
                        "{}: {v}",
                        r.key
                    );
                    assert!(
                        TABLE.iter().any(|t| t.key == r.key),
                        "{} not printed",
                        r.key
                    );
                }
                let product = |t| figure_of_merit(t, d) * drive_efficiency(t, drive, d);
                assert!(product(Tier::PhysicalLimit) >= product(Tier::BestPractice));
                assert!(product(Tier::BestPractice) >= product(Tier::Typical));
                assert!(product(Tier::PhysicalLimit) <= 1.0);
            }
        }
        // Band edges: 100 mm is medium, 250 mm is medium, just above is large.
        assert_eq!(
            SizeBand::of(Length::new::<millimeter>(99.9)),
            SizeBand::Small
        );
        assert_eq!(
            SizeBand::of(Length::new::<millimeter>(250.0)),
            SizeBand::Medium
        );
        assert_eq!(
            SizeBand::of(Length::new::<millimeter>(250.1)),
            SizeBand::Large
        );
    }
}

//! The one table of values for the assumption tiers ([`crate::tier`]).
//!
//! Each row below states its value at each tier and its basis; the methods
//! page prints this table as is.

use serde::Serialize;
use uom::si::f64::Length;
use uom::si::length::millimeter;
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

pub const FM_SMALL: Row = row(
    Generous::Larger,
    "figure_of_merit_small",
    "Figure of merit, rotors under 100 mm",
    "1",
    PerTier::new(1.0, 0.75, 0.45),
    Basis::FromMemory("micro rotors reach 0.4-0.6; good full-scale rotors 0.7-0.8"),
);
pub const FM_MEDIUM: Row = row(
    Generous::Larger,
    "figure_of_merit_medium",
    "Figure of merit, rotors 100-250 mm",
    "1",
    PerTier::new(1.0, 0.75, 0.55),
    Basis::FromMemory("small hobby propellers 0.5-0.6; good full-scale rotors 0.7-0.8"),
);
pub const FM_LARGE: Row = row(
    Generous::Larger,
    "figure_of_merit_large",
    "Figure of merit, rotors over 250 mm",
    "1",
    PerTier::new(1.0, 0.80, 0.65),
    Basis::FromMemory("good full-scale rotors 0.7-0.8"),
);
pub const BRUSHLESS_MOTOR: Row = row(
    Generous::Larger,
    "brushless_motor_efficiency",
    "Brushless motor efficiency",
    "1",
    PerTier::new(1.0, 0.90, 0.80),
    Basis::FromMemory("outrunners peak near 0.9; 0.75-0.85 at hover throttle"),
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
    "Brushed coreless motor efficiency",
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
pub const AVIONICS_POWER: Row = row(
    Generous::Smaller,
    "avionics_power",
    "Power drawn by electronics other than motors",
    "W",
    PerTier::new(0.0, 0.5, 1.0),
    Basis::CommonPractice("a flight controller and receiver draw about 1 W"),
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
    &BRUSHLESS_MOTOR,
    &BRUSHLESS_CONTROLLER,
    &BRUSHED_MOTOR,
    &BRUSHED_DRIVER,
    &DEPTH_OF_DISCHARGE,
    &AVIONICS_POWER,
    &HOVER_FRACTION_MAX,
    &BODY_DRAG,
    &THRUST_MISMATCH,
    &GYRO_DRIFT,
    &ACCEL_BIAS,
    &LEVEL_ERROR,
    &REACTIVE_TORQUE,
    &TRI_SERVO_RANGE,
    &COAXIAL_INTERFERENCE,
    &BODY_DRAG_LEAST,
    &ROTOR_DRAG,
    &ROTOR_DRAG_LEAST,
    &TILT_TOLERANCE,
    &THRUST_MISMATCH_BRUSHED,
    &ROTOR_MASS_SHARE,
    &LOOP_SAMPLES_PER_TIP,
];

/// The figure of merit for a rotor of this diameter at this tier.
pub fn figure_of_merit(tier: Tier, diameter: Length) -> f64 {
    fm_row(diameter).at(tier)
}

/// The row the figure of merit of a rotor of this diameter is read from.
pub fn fm_row(diameter: Length) -> &'static Row {
    let mm = diameter.get::<millimeter>();
    if mm < 100.0 {
        &FM_SMALL
    } else if mm <= 250.0 {
        &FM_MEDIUM
    } else {
        &FM_LARGE
    }
}

/// Motor times controller efficiency, battery to shaft.
pub fn drive_efficiency(tier: Tier, drive: Drive) -> f64 {
    match drive {
        Drive::Brushless => BRUSHLESS_MOTOR.at(tier) * BRUSHLESS_CONTROLLER.at(tier),
        Drive::Brushed => BRUSHED_MOTOR.at(tier) * BRUSHED_DRIVER.at(tier),
    }
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
    fn typical_brushless_drive_is_point_eight_times_point_nine_five() {
        // DESIGN tier table: brushless 0.80 x ESC 0.95; best practice 0.90 x 0.97.
        assert!((drive_efficiency(Tier::Typical, Drive::Brushless) - 0.76).abs() < 1e-12);
        assert!((drive_efficiency(Tier::BestPractice, Drive::Brushless) - 0.873).abs() < 1e-12);
    }
}

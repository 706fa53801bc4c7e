//! Rule 4, sensing: can the sensors on board keep the craft the way it is said to fly?
//!
//! A hovering multirotor has no natural restoring moment: a thrust mismatch of a
//! few percent between rotors tips it. Givens: mass, size, arm, rotor count,
//! sensors. Method: moment M = delta (W / n) arm, inertia of the body as a box,
//! alpha = M / I, time to tip 30 deg t = sqrt(2 theta / alpha). Compared with
//! human reaction time for a pilot; for hands-free flight, attitude, height and
//! position holds, the drift of the sensors that are (or are not) there.

use std::borrow::Cow;

use uom::si::f64::{Acceleration, Angle, Length, MomentOfInertia, Time, Torque};
use uom::si::{
    acceleration::meter_per_second_squared, angle::degree, length::meter,
    moment_of_inertia::kilogram_square_meter, time::second,
};

use super::common::{self, fixed, per_tier};
use super::geometry;
use crate::catalog::tiers::{ACCEL_BIAS, GYRO_DRIFT, LEVEL_ERROR, THRUST_MISMATCH};
use crate::claim::{Claim, PositionSensor};
use crate::physics::body;
use crate::report::{keys, Figure, Finding, Sig3, Verdict};
use crate::tier::{PerTier, Tier};

pub const ID: &str = "sensing";
pub const TITLE: &str = "Sensing and stabilisation";
pub const METHOD: &str = "A hovering multirotor has no restoring moment. A thrust mismatch delta of one rotor makes a moment M = delta (W / n) arm; with the body's moment of inertia I (a box, I = m (a^2 + b^2) / 12) it tips at alpha = M / I and reaches 30 deg after t = sqrt(2 theta / alpha). A craft said to hover by itself without a rate gyroscope is impossible (an open-loop unstable system needs its rates fed back); a pilot flying without one is implausible when the time to tip is under three reaction times (0.25 s each). Hands-free level hover needs an accelerometer (a gyro alone drifts); a height hold needs a height sensor (else an accelerometer bias b drifts height by b t^2 / 2); staying in place needs a position sensor (else a level error e slides it by g tan(e) t^2 / 2). A hold is doubtful or implausible by how long its drift takes to reach 1 m (or 5 deg) against the claimed flight time.";

/// The tilt at which a hovering craft is past saving for a pilot.
const TIP_ANGLE_DEG: f64 = 30.0;
/// Human simple reaction time, 0.25 s (`reaction-time`, from memory).
const REACTION_S: f64 = 0.25;
/// A pilot needs several reaction times to catch a tip (common practice: three).
const REACTIONS_TO_CATCH: f64 = 3.0;
/// The attitude error that sets a hands-free craft sliding away: 5 deg (common practice).
const ATTITUDE_ERROR_DEG: f64 = 5.0;
/// A drift that matters indoors: 1 m (common practice).
const DRIFT_THAT_MATTERS_M: f64 = 1.0;
/// A hold is judged over the claimed flight time, else over one minute.
const DEFAULT_HOLD_S: f64 = 60.0;

/// One part of the judgement: a verdict and the sentence that explains it.
struct Part {
    verdict: Verdict,
    says: Cow<'static, str>,
    fix: Option<&'static str>,
}

/// How the craft tips fastest: the lever of the rotor farthest from a body axis
/// about that axis, the inertia about it, and what the inertia was worked from.
struct Tipping {
    lever: Length,
    inertia: MomentOfInertia,
    shape: &'static str,
}

/// The fastest-tipping axis. Rotor positions come from the layout (the same
/// placements the control-authority rule uses), else from `rotors.arm`, else from
/// the body's edge; the inertia is that of a box of the stated size, else of a
/// flat plate spanning the rotors.
fn tipping(claim: &Claim) -> Option<Tipping> {
    let m = claim.craft.mass;
    let zero = Length::new::<meter>(0.0);
    let placed = geometry::placements(&claim.rotors);
    // Largest lever about the roll (x) axis is the largest |y|, about pitch the largest |x|.
    let (roll_lever, pitch_lever) = match (&placed, claim.rotors.arm) {
        (Some(p), _) if p.len() >= 2 => (
            p.iter().map(|r| r.y.abs()).fold(zero, Length::max),
            p.iter().map(|r| r.x.abs()).fold(zero, Length::max),
        ),
        (_, Some(arm)) => (arm, arm),
        (_, None) if claim.rotors.count >= 2 => {
            let size = claim.craft.size?;
            (size.width * 0.5, size.length * 0.5)
        }
        _ => return None,
    };
    let (roll_inertia, pitch_inertia, shape) = match claim.craft.size {
        Some(size) => (
            body::box_inertia(m, size.width, size.height),
            body::box_inertia(m, size.length, size.height),
            "a solid box of the stated size",
        ),
        None => (
            body::box_inertia(m, roll_lever * 2.0, zero),
            body::box_inertia(m, pitch_lever * 2.0, zero),
            "a flat plate spanning the rotors (craft.size not given)",
        ),
    };
    // alpha = M / I with M proportional to the lever: the larger lever / I tips first.
    let roll_rate = roll_lever.value / roll_inertia.value.max(f64::MIN_POSITIVE);
    let pitch_rate = pitch_lever.value / pitch_inertia.value.max(f64::MIN_POSITIVE);
    let (lever, inertia) = if roll_rate >= pitch_rate {
        (roll_lever, roll_inertia)
    } else {
        (pitch_lever, pitch_inertia)
    };
    (lever.value > 0.0 && inertia.value > 0.0).then_some(Tipping {
        lever,
        inertia,
        shape,
    })
}

/// How long a constant error takes to build up a drift: x = a t^2 / 2 -> t = sqrt(2 x / a) (`inertial-drift`).
fn time_to_drift(accel: Acceleration) -> Time {
    let x = Length::new::<meter>(DRIFT_THAT_MATTERS_M);
    if accel.get::<meter_per_second_squared>() <= 0.0 {
        return Time::new::<second>(f64::INFINITY);
    }
    (x * 2.0 / accel).sqrt()
}

/// Judges a drift time per tier against the hold time: failing best practice is
/// implausible, typical doubtful; no law is broken, so never impossible.
fn judge_drift(drift: PerTier<Time>, hold: Time) -> Verdict {
    common::verdict_of(|t| t == Tier::PhysicalLimit || drift[t] >= hold)
}

pub fn check(claim: &Claim) -> Finding {
    let air = common::air(claim);
    let w = common::weight(claim, &air);
    let s = &claim.sensing;
    let c = &claim.claim;
    let n = f64::from(claim.rotors.count);
    let hold = c.flight_time.unwrap_or(Time::new::<second>(DEFAULT_HOLD_S));
    // At most: the inertia, three times to tip, the reaction time and three drifts of each kind.
    let mut figures: Vec<Figure> = Vec::with_capacity(14);
    let mut parts: Vec<Part> = Vec::with_capacity(4);
    let mut assumptions = Vec::with_capacity(7);
    assumptions.push(format!(
        "Thrust mismatch {} of one rotor's hover thrust (physical limit / best practice / typical); {}.",
        THRUST_MISMATCH.values,
        THRUST_MISMATCH.basis,
    ));

    // Time to tip from a thrust mismatch, from rest, at constant moment.
    let tip = tipping(claim).map(|g| {
        assumptions.push(format!(
            "Moment of inertia of {}; lever of the farthest rotor {} mm.",
            g.shape,
            Sig3(g.lever.get::<uom::si::length::millimeter>()),
        ));
        figures.push(fixed(
            keys::MOMENT_OF_INERTIA,
            "Moment of inertia about the tipping axis",
            g.inertia.get::<kilogram_square_meter>(),
            "kg m^2",
        ));
        PerTier::from_fn(|t| {
            let moment: Torque = (w / n * THRUST_MISMATCH.at(t) * g.lever).into();
            let alpha = body::angular_acceleration(moment, g.inertia);
            body::time_to_turn(Angle::new::<degree>(TIP_ANGLE_DEG), alpha)
        })
    });
    if let Some(tip) = tip {
        figures.extend(per_tier(
            keys::TIME_TO_TIP,
            "Time to tip 30 deg from a thrust mismatch",
            "s",
            |t| tip[t].get::<second>(),
        ));
        figures.push(fixed(
            keys::REACTION_TIME,
            "Human reaction time",
            REACTION_S,
            "s",
        ));
    }
    let hold_needs = "over the claimed flight time (or one minute)";

    // 1. Stabilising the attitude: a rate gyro, or a pilot fast enough.
    let catch = Time::new::<second>(REACTION_S * REACTIONS_TO_CATCH);
    match (c.hands_free, s.gyroscope) {
        (true, Some(false)) => parts.push(Part {
            verdict: Verdict::Impossible,
            says: "It is said to hover by itself with no gyroscope: an unstable craft cannot be held without measuring how fast it turns.".into(),
            fix: Some("a rate gyroscope and a flight controller closing the loop at a few hundred hertz"),
        }),
        (_, None) => parts.push(Part {
            verdict: Verdict::NotAssessed,
            says: "The sheet does not say whether it has a gyroscope (sensing.gyroscope).".into(),
            fix: Some("say whether it has a gyroscope (sensing.gyroscope)"),
        }),
        (false, Some(false)) => match tip {
            Some(tip) => {
                let v = common::verdict_of(|t| t == Tier::PhysicalLimit || tip[t] >= catch);
                parts.push(Part {
                    verdict: v,
                    says: format!(
                        "With no gyroscope the pilot must catch every tip by hand: it tips 30 deg in about {} s, against a reaction time of {REACTION_S} s.",
                        Sig3(tip[Tier::Typical].get::<second>()),
                    )
                    .into(),
                    fix: (v != Verdict::Consistent).then_some("a rate gyroscope in a stabilising loop"),
                });
            }
            None => parts.push(Part {
                verdict: Verdict::NotAssessed,
                says: "Flown by hand with no gyroscope; the time to tip needs the arm (rotors.arm) or the size (craft.size).".into(),
                fix: Some("give rotors.arm or craft.size"),
            }),
        },
        (_, Some(true)) => parts.push(Part {
            verdict: Verdict::Consistent,
            says: "A rate gyroscope senses the tipping that a thrust mismatch starts.".into(),
            fix: None,
        }),
    }

    // 2. Hands-free level hover needs a level reference: an accelerometer.
    if c.hands_free && s.gyroscope == Some(true) {
        match s.accelerometer {
            Some(false) => {
                let drift = PerTier::from_fn(|t| {
                    let rate = GYRO_DRIFT.at(t); // deg per hour
                    Time::new::<second>(if rate > 0.0 { ATTITUDE_ERROR_DEG / rate * 3600.0 } else { f64::INFINITY })
                });
                figures.extend(per_tier(keys::ATTITUDE_DRIFT_TIME, "Time for the gyro alone to drift 5 deg", "s", |t| {
                    drift[t].get::<second>()
                }));
                let v = judge_drift(drift, hold);
                parts.push(Part {
                    verdict: v,
                    says: format!(
                        "Hands-free with a gyroscope but no accelerometer, its idea of level drifts 5 deg in about {} s with typical parts.",
                        Sig3(drift[Tier::Typical].get::<second>()),
                    )
                    .into(),
                    fix: (v != Verdict::Consistent).then_some("an accelerometer to keep the level reference"),
                });
            }
            None => parts.push(Part {
                verdict: Verdict::NotAssessed,
                says: "Hands-free: the sheet does not say whether it has an accelerometer (sensing.accelerometer).".into(),
                fix: Some("say whether it has an accelerometer (sensing.accelerometer)"),
            }),
            Some(true) => {}
        }
    }

    // 3. Holding height needs a height sensor; else the accelerometer's bias integrates.
    let height_sensor = s.barometer == Some(true)
        || matches!(
            s.position,
            Some(PositionSensor::Gnss | PositionSensor::OpticalFlow | PositionSensor::Vision)
        );
    if (c.altitude_hold || c.position_hold) && !height_sensor {
        let v = if s.accelerometer == Some(true) {
            let drift = PerTier::from_fn(|t| {
                time_to_drift(Acceleration::new::<meter_per_second_squared>(
                    ACCEL_BIAS.at(t),
                ))
            });
            figures.extend(per_tier(
                keys::HEIGHT_DRIFT_TIME,
                "Time for height to drift 1 m without a height sensor",
                "s",
                |t| drift[t].get::<second>(),
            ));
            let v = judge_drift(drift, hold);
            parts.push(Part {
                verdict: v,
                says: format!(
                    "It is said to hold its height with no height sensor; the accelerometer alone lets height drift 1 m in about {} s.",
                    Sig3(drift[Tier::Typical].get::<second>()),
                )
                .into(),
                fix: None,
            });
            v
        } else {
            parts.push(Part {
                verdict: Verdict::Implausible,
                says: "It is said to hold its height with nothing on board that senses height or vertical motion.".into(),
                fix: None,
            });
            Verdict::Implausible
        };
        if let Some(last) = parts.last_mut() {
            last.fix =
                (v != Verdict::Consistent).then_some("a barometer or a range sensor for height");
        }
    }

    // 4. Staying in place needs a position sensor; else a level error slides it away.
    let position_sensor = matches!(
        s.position,
        Some(PositionSensor::Gnss | PositionSensor::OpticalFlow | PositionSensor::Vision)
    );
    if c.position_hold && !position_sensor {
        let drift = PerTier::from_fn(|t| {
            let err = Angle::new::<degree>(LEVEL_ERROR.at(t));
            time_to_drift(body::tilt_acceleration(air.gravity, err))
        });
        figures.extend(per_tier(
            keys::POSITION_DRIFT_TIME,
            "Time to drift 1 m sideways without a position sensor",
            "s",
            |t| drift[t].get::<second>(),
        ));
        let v = if s.accelerometer == Some(true) {
            judge_drift(drift, hold)
        } else {
            Verdict::Implausible
        };
        parts.push(Part {
            verdict: v,
            says: format!(
                "It is said to stay in place with no position sensor; a level error of {} deg slides it 1 m in about {} s.",
                LEVEL_ERROR.at(Tier::Typical),
                Sig3(drift[Tier::Typical].get::<second>()),
            )
            .into(),
            fix: (v != Verdict::Consistent).then_some("a position sensor: optical flow with a range sensor indoors, satellite navigation outdoors"),
        });
    }
    if c.altitude_hold || c.position_hold || c.hands_free {
        assumptions.push(format!(
            "Holds are judged {hold_needs}: {} s; a drift of {DRIFT_THAT_MATTERS_M} m or {ATTITUDE_ERROR_DEG} deg matters (common practice).",
            Sig3(hold.get::<second>()),
        ));
    }

    let verdict = Verdict::worst(parts.iter().map(|p| p.verdict));
    let mut fixes: Vec<&str> = parts.iter().filter_map(|p| p.fix).collect();
    fixes.dedup();
    let would_take = if fixes.is_empty() {
        "Nothing more for sensing.".to_string()
    } else {
        format!("Add {}.", fixes.join("; "))
    };
    // The worst part is the headline; the others go with the assumptions.
    let worst = parts.iter().position(|p| p.verdict == verdict);
    let mut headline = None;
    assumptions.reserve(parts.len());
    for (i, p) in parts.into_iter().enumerate() {
        if Some(i) == worst {
            headline = Some(p.says.into_owned());
        } else {
            assumptions.push(p.says.into_owned());
        }
    }
    let headline = headline.unwrap_or_else(|| "Nothing to judge.".to_string());
    Finding {
        rule: ID,
        verdict,
        headline,
        figures,
        would_take,
        assumptions,
        sources: &[
            "rigid-body",
            "feedback-stability",
            "reaction-time",
            "inertial-drift",
        ],
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::claim::{parse, Format};

    fn sheet(extra: &str) -> Claim {
        let text = format!(
            "title = \"t\"\n[craft]\nmass = \"310 g\"\nsize = \"160 mm x 80 mm x 22 mm\"\n[rotors]\ncount = 2\narm = \"70 mm\"\nmax_thrust = \"300 g\"\n{extra}"
        );
        parse(&text, Format::Toml).unwrap()
    }

    #[test]
    fn time_to_tip_follows_the_rigid_body_formula() {
        // I = m (W^2 + H^2) / 12 = 0.31 (0.08^2 + 0.022^2) / 12 = 1.7784e-4 kg m^2;
        // M = 0.05 x (0.31 x 9.80665 / 2) x 0.07 = 5.3206e-3 N m (typical 5 % mismatch);
        // alpha = 29.92 rad/s^2; t = sqrt(2 x 0.5236 / 29.92) = 0.187 s (rigid-body).
        let f = check(&sheet("[sensing]\ngyroscope = true"));
        let t = f
            .figure(keys::TIME_TO_TIP, Some(Tier::Typical))
            .unwrap()
            .value;
        assert!((t - 0.187).abs() < 0.002, "{t}");
    }

    #[test]
    fn a_quad_x_tips_on_the_arm_times_sine_45_degrees() {
        // Rotors of a quad-x sit at 45 deg to the body axes: lever = arm sin 45 deg.
        // Square body, so roll and pitch inertia agree: I = 0.31 (0.16^2 + 0.04^2) / 12.
        let c = parse(
            "title = \"t\"\n[craft]\nmass = \"310 g\"\nsize = \"160 mm x 160 mm x 40 mm\"\n[rotors]\ncount = 4\nlayout = \"quad-x\"\narm = \"100 mm\"\nmax_thrust = \"300 g\"\n[sensing]\ngyroscope = true",
            Format::Toml,
        )
        .unwrap();
        let f = check(&c);
        let inertia = 0.31 * (0.16f64.powi(2) + 0.04f64.powi(2)) / 12.0;
        let moment = 0.05 * 0.31 * 9.806_65 / 4.0 * 0.1 * std::f64::consts::FRAC_1_SQRT_2;
        let expected = (2.0 * 30f64.to_radians() * inertia / moment).sqrt();
        let t = f
            .figure(keys::TIME_TO_TIP, Some(Tier::Typical))
            .unwrap()
            .value;
        assert!((t - expected).abs() < 1e-9, "{t} vs {expected}");
    }

    #[test]
    fn a_hands_free_hover_without_a_gyroscope_is_impossible() {
        // Feedback stability: an open-loop unstable plant needs its rates measured.
        let f = check(&sheet(
            "[claim]\nhands_free = true\n[sensing]\ngyroscope = false",
        ));
        assert_eq!(f.verdict, Verdict::Impossible);
    }

    #[test]
    fn a_pilot_without_a_gyroscope_is_implausible_when_the_tip_beats_reaction() {
        // Tip in 0.19 s (typical) to 0.42 s (2 %), against 3 reaction times of 0.25 s.
        let f = check(&sheet("[sensing]\ngyroscope = false"));
        assert_eq!(f.verdict, Verdict::Implausible);
        // A big, slow craft (1 m box, 10 kg, 0.5 m arm) tips slowly enough for a pilot.
        let slow = parse(
            "title = \"t\"\n[craft]\nmass = \"10 kg\"\nsize = \"1 m x 1 m x 0.3 m\"\n[rotors]\ncount = 4\narm = \"0.1 m\"\nmax_thrust = \"5 kg\"\n[sensing]\ngyroscope = false",
            Format::Toml,
        )
        .unwrap();
        let f = check(&slow);
        assert!(
            f.figure(keys::TIME_TO_TIP, Some(Tier::Typical))
                .unwrap()
                .value
                > 0.75
        );
        assert_eq!(f.verdict, Verdict::Consistent);
    }

    #[test]
    fn holds_without_their_sensor_are_doubtful_to_implausible_never_impossible() {
        // Dead reckoning (inertial-drift): 1 m at 0.05 m/s^2 takes sqrt(2 / 0.05) = 6.3 s.
        let f = check(&sheet(
            "[claim]\nhands_free = true\naltitude_hold = true\nflight_time = \"10 s\"\n[sensing]\ngyroscope = true\naccelerometer = true",
        ));
        let t = f
            .figure(keys::HEIGHT_DRIFT_TIME, Some(Tier::Typical))
            .unwrap()
            .value;
        assert!((t - 6.32).abs() < 0.01);
        assert_eq!(f.verdict, Verdict::Doubtful);
        let f = check(&sheet(
            "[claim]\nhands_free = true\nposition_hold = true\nflight_time = \"5 min\"\n[sensing]\ngyroscope = true\naccelerometer = true\nbarometer = true",
        ));
        assert_eq!(f.verdict, Verdict::Implausible);
        let f = check(&sheet(
            "[claim]\nhands_free = true\nposition_hold = true\n[sensing]\ngyroscope = true\naccelerometer = true\nposition = \"optical-flow\"",
        ));
        assert_eq!(f.verdict, Verdict::Consistent);
    }

    #[test]
    fn unknown_sensors_are_not_assessed() {
        let f = check(&sheet("[claim]\nhands_free = true"));
        assert_eq!(f.verdict, Verdict::NotAssessed);
        assert!(f.headline.contains("sensing.gyroscope"));
    }
}

//! Rule 4, sensing: can the sensors on board keep the craft the way it is said to fly?
//!
//! A hovering multirotor has no natural restoring moment: a thrust mismatch of a
//! few percent on one rotor tips it. Givens: mass, size, where the rotors sit,
//! the motors' mass and drive, the sensors and the control loop rate. Method: a
//! mismatch delta on rotor i at (x, y) makes a moment delta (W / n) (y, -x), about
//! the axis normal to its arm with lever = its distance from the centre; the
//! inertia is the body as a box plus the motors and propellers as point masses
//! at the rotors; alpha = |I^-1 M|, time to tip 30 deg t = sqrt(2 theta / alpha).
//! Compared with human reaction time for a pilot, with the loop period for a
//! flight controller; for hands-free flight, attitude, height and position
//! holds, the drift of the sensors that are (or are not) there.

use std::borrow::Cow;

use uom::si::f64::{Acceleration, Angle, Length, Mass, MomentOfInertia, Time, Torque};
use uom::si::{
    acceleration::meter_per_second_squared, angle::degree, length::meter, length::millimeter,
    mass::kilogram, moment_of_inertia::kilogram_square_meter, time::second,
};

use super::common::{self, fixed, per_tier};
use super::geometry::placements;
use crate::catalog::tiers::{
    Row, ACCEL_BIAS, GYRO_DRIFT, LEVEL_ERROR, LOOP_SAMPLES_PER_TIP, ROTOR_MASS_SHARE,
    THRUST_MISMATCH, THRUST_MISMATCH_BRUSHED,
};
use crate::catalog::Drive;
use crate::claim::{Claim, PositionSensor};
use crate::physics::body;
use crate::report::{keys, Figure, Finding, Sig3, Verdict};
use crate::tier::{PerTier, Tier};

pub const ID: &str = "sensing";
pub const TITLE: &str = "Sensing and stabilisation";
pub const METHOD: &str = "A hovering multirotor has no restoring moment. A thrust mismatch delta on one rotor at (x, y) makes a moment M = delta (W / n) (y, -x): about the axis normal to that rotor's arm, with the arm as its lever (on an X layout the diagonal through its two neighbours). The inertia is the body as a box (I = m (a^2 + b^2) / 12) plus the motors and propellers as point masses at the rotors (I = m d^2), their mass from the parts list (parts named motor, propeller or rotor) or a share of the take-off mass; the craft tips at alpha = |I^-1 M| from the fastest rotor and reaches 30 deg after t = sqrt(2 theta / alpha). Brushed motors drift apart in thrust more than brushless ones. A craft said to hover by itself without a rate gyroscope is impossible (an open-loop unstable system needs its rates fed back); a pilot flying without one is implausible when the time to tip is under three reaction times (0.25 s each). A flight controller must correct well within the time to tip: a loop period longer than it cannot stabilise (impossible); fewer than about ten periods within it is doubtful. Hands-free level hover needs an accelerometer (a gyro alone drifts); a height hold needs a height sensor (else an accelerometer bias b drifts height by b t^2 / 2); staying in place needs a position sensor (else a level error e slides it by g tan(e) t^2 / 2). A hold is doubtful or implausible by how long its drift takes to reach 1 m (or 5 deg) against the claimed flight time.";

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

/// Where the motors' and propellers' mass comes from.
#[derive(Debug, Clone, Copy, PartialEq)]
enum RotorMass {
    /// Parts named motor, propeller or rotor in the parts list.
    Parts(Mass),
    /// A share of the take-off mass, per tier ([`ROTOR_MASS_SHARE`]).
    Share,
}

/// How the craft tips fastest: the lever of that rotor, the moment of inertia
/// about its tipping axis per tier, and what they were worked from.
#[derive(Debug, Clone, Copy)]
struct Tipping {
    lever: Length,
    /// Angular acceleration per newton of mismatch, per tier (rad/s^2 per N).
    alpha_per_newton: PerTier<f64>,
    /// The moment of inertia about the tipping axis (M / alpha), per tier.
    inertia: PerTier<MomentOfInertia>,
    rotor_mass: RotorMass,
    shape: &'static str,
}

/// The motors' and propellers' mass from the parts list, if it names them.
fn rotor_parts_mass(claim: &Claim) -> Option<Mass> {
    let named = |name: &str| {
        let n = name.to_lowercase();
        ["motor", "prop", "rotor"].iter().any(|w| n.contains(w))
    };
    let total: Mass = claim
        .craft
        .parts
        .iter()
        .filter(|p| named(&p.name))
        .map(|p| p.mass * f64::from(p.count))
        .sum();
    (total.value > 0.0).then_some(total)
}

/// The rotors' hubs (x, y, z) from the centre of mass: the layout's placements
/// (the same the control-authority rule uses), else a ring at `rotors.arm`,
/// else a ring at the body's half width.
fn hubs(claim: &Claim) -> Option<Vec<(Length, Length, Length)>> {
    let r = &claim.rotors;
    if let Some(p) = placements(r).filter(|p| p.len() >= 2) {
        return Some(p.iter().map(|p| (p.x, p.y, p.z)).collect());
    }
    if r.count < 2 {
        return None;
    }
    let radius = match (r.arm, claim.craft.size) {
        (Some(arm), _) => arm,
        (None, Some(size)) => size.width.min(size.length) * 0.5,
        (None, None) => return None,
    };
    let n = r.count as usize;
    Some(
        (0..n)
            .map(|i| {
                let az = (i as f64 * 360.0 / n as f64).to_radians();
                (radius * az.cos(), -(radius * az.sin()), r.height)
            })
            .collect(),
    )
}

/// The fastest-tipping rotor: for each rotor the moment of a unit mismatch,
/// (y, -x) per newton, against the inertia of the body box and the rotors'
/// point masses about the body axes; the body is a box of the stated size, else
/// a flat plate spanning the rotors.
fn tipping(claim: &Claim) -> Option<Tipping> {
    let m = claim.craft.mass;
    let zero = Length::new::<meter>(0.0);
    let hubs = hubs(claim)?;
    let n = hubs.len() as f64;
    let parts = rotor_parts_mass(claim).filter(|r| *r < m);
    let rotor_mass = parts.map_or(RotorMass::Share, RotorMass::Parts);
    let span_x = hubs.iter().map(|h| h.0.abs()).fold(zero, Length::max) * 2.0;
    let span_y = hubs.iter().map(|h| h.1.abs()).fold(zero, Length::max) * 2.0;
    let (sides, shape) = match claim.craft.size {
        Some(size) => (
            (size.length, size.width, size.height),
            "a solid box of the stated size",
        ),
        None => (
            (span_x, span_y, zero),
            "a flat plate spanning the rotors (craft.size not given)",
        ),
    };
    let mut best: Option<(f64, Length, MomentOfInertia)> = None;
    let per_tier = PerTier::from_fn(|t| {
        let rotors = match rotor_mass {
            RotorMass::Parts(mass) => mass,
            RotorMass::Share => m * ROTOR_MASS_SHARE.at(t),
        };
        let each = rotors / n;
        let body_mass = m - rotors;
        let (l, w, h) = sides;
        let mut roll = body::box_inertia(body_mass, w, h);
        let mut pitch = body::box_inertia(body_mass, l, h);
        for &(x, y, z) in &hubs {
            roll += body::point_inertia(each, (y * y + z * z).sqrt());
            pitch += body::point_inertia(each, (x * x + z * z).sqrt());
        }
        let mut fastest = (0.0, zero, roll);
        for &(x, y, _) in &hubs {
            let unit = uom::si::f64::Force::new::<uom::si::force::newton>(1.0);
            let alpha = body::tip_acceleration(
                Torque::from(unit * y),
                Torque::from(unit * -x),
                roll,
                pitch,
            )
            .value;
            if alpha > fastest.0 {
                let lever = (x * x + y * y).sqrt();
                let inertia = MomentOfInertia::new::<kilogram_square_meter>(lever.value / alpha);
                fastest = (alpha, lever, inertia);
            }
        }
        if t == Tier::Typical {
            best = Some(fastest);
        }
        fastest
    });
    let (alpha, lever, _) = best?;
    (alpha.is_finite() && alpha > 0.0 && lever.value > 0.0).then_some(Tipping {
        lever,
        alpha_per_newton: per_tier.map(|f| f.0),
        inertia: per_tier.map(|f| f.2),
        rotor_mass,
        shape,
    })
}

/// The thrust mismatch row for the craft's drive: brushed motors drift more.
fn mismatch_row(claim: &Claim) -> &'static Row {
    match claim.rotors.drive() {
        Some(Drive::Brushed) => &THRUST_MISMATCH_BRUSHED,
        _ => &THRUST_MISMATCH,
    }
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

/// What the sensing rule worked out: the tip and the drift of each hold, per tier.
struct Solution {
    hold: Time,
    mismatch: &'static Row,
    tipping: Option<Tipping>,
    tip: Option<PerTier<Time>>,
    loop_period: Option<Time>,
    parts: Vec<(Judgement, Verdict)>,
}

/// One thing the rule judges, with the numbers behind it.
#[derive(Debug, Clone, Copy)]
enum Judgement {
    NoGyroHandsFree,
    GyroUnknown,
    HandFlown(PerTier<Time>),
    HandFlownUnknown,
    Gyro,
    Loop(Time, PerTier<Time>),
    LevelDrift(PerTier<Time>),
    AccelerometerUnknown,
    HeightDrift(PerTier<Time>),
    NoHeightSensor,
    PositionDrift(PerTier<Time>),
}

fn solve(claim: &Claim) -> Solution {
    let air = common::air(claim);
    let w = common::weight(claim, &air);
    let s = &claim.sensing;
    let c = &claim.claim;
    let n = f64::from(claim.rotors.count);
    let hold = c.flight_time.unwrap_or(Time::new::<second>(DEFAULT_HOLD_S));
    let mismatch = mismatch_row(claim);
    let mut parts = Vec::with_capacity(5);

    // Time to tip 30 deg from a thrust mismatch on the fastest-tipping rotor, from rest.
    let tipping = tipping(claim);
    let tip = tipping.map(|g| {
        PerTier::from_fn(|t| {
            let error = (w / n * mismatch.at(t)).get::<uom::si::force::newton>();
            let alpha = uom::si::f64::AngularAcceleration::new::<
                uom::si::angular_acceleration::radian_per_second_squared,
            >(g.alpha_per_newton[t] * error);
            body::time_to_turn(Angle::new::<degree>(TIP_ANGLE_DEG), alpha)
        })
    });

    // 1. Stabilising the attitude: a rate gyro in a loop fast enough, or a pilot fast enough.
    let catch = Time::new::<second>(REACTION_S * REACTIONS_TO_CATCH);
    let loop_period = s.loop_rate.filter(|f| f.value > 0.0).map(|f| 1.0 / f);
    let stabilising = match (c.hands_free, s.gyroscope) {
        (true, Some(false)) => (Judgement::NoGyroHandsFree, Verdict::Impossible),
        (_, None) => (Judgement::GyroUnknown, Verdict::NotAssessed),
        (false, Some(false)) => match tip {
            Some(tip) => (
                Judgement::HandFlown(tip),
                common::verdict_of(|t| t == Tier::PhysicalLimit || tip[t] >= catch),
            ),
            None => (Judgement::HandFlownUnknown, Verdict::NotAssessed),
        },
        (_, Some(true)) => (Judgement::Gyro, Verdict::Consistent),
    };
    parts.push(stabilising);
    if let (Some(true), Some(period), Some(tip)) = (s.gyroscope, loop_period, tip) {
        let v = common::verdict_of(|t| tip[t] >= period * LOOP_SAMPLES_PER_TIP.at(t));
        parts.push((Judgement::Loop(period, tip), v));
    }

    // 2. Hands-free level hover needs a level reference: an accelerometer.
    if c.hands_free && s.gyroscope == Some(true) {
        match s.accelerometer {
            Some(false) => {
                let drift = PerTier::from_fn(|t| {
                    let rate = GYRO_DRIFT.at(t); // deg per hour
                    Time::new::<second>(if rate > 0.0 {
                        ATTITUDE_ERROR_DEG / rate * 3600.0
                    } else {
                        f64::INFINITY
                    })
                });
                parts.push((Judgement::LevelDrift(drift), judge_drift(drift, hold)));
            }
            None => parts.push((Judgement::AccelerometerUnknown, Verdict::NotAssessed)),
            Some(true) => {}
        }
    }

    // 3. Holding height needs a height sensor; else the accelerometer's bias integrates.
    let position_sensor = matches!(
        s.position,
        Some(PositionSensor::Gnss | PositionSensor::OpticalFlow | PositionSensor::Vision)
    );
    let height_sensor = s.barometer == Some(true) || position_sensor;
    if (c.altitude_hold || c.position_hold) && !height_sensor {
        if s.accelerometer == Some(true) {
            let drift = PerTier::from_fn(|t| {
                time_to_drift(Acceleration::new::<meter_per_second_squared>(
                    ACCEL_BIAS.at(t),
                ))
            });
            parts.push((Judgement::HeightDrift(drift), judge_drift(drift, hold)));
        } else {
            parts.push((Judgement::NoHeightSensor, Verdict::Implausible));
        }
    }

    // 4. Staying in place needs a position sensor; else a level error slides it away.
    if c.position_hold && !position_sensor {
        let drift = PerTier::from_fn(|t| {
            let err = Angle::new::<degree>(LEVEL_ERROR.at(t));
            time_to_drift(body::tilt_acceleration(air.gravity, err))
        });
        let v = if s.accelerometer == Some(true) {
            judge_drift(drift, hold)
        } else {
            Verdict::Implausible
        };
        parts.push((Judgement::PositionDrift(drift), v));
    }
    Solution {
        hold,
        mismatch,
        tipping,
        tip,
        loop_period,
        parts,
    }
}

pub fn check(claim: &Claim) -> Finding {
    describe(claim, &solve(claim))
}

fn typical_s(x: &PerTier<Time>) -> Sig3 {
    Sig3(x[Tier::Typical].get::<second>())
}

/// The sentence and the fix for each judgement.
fn part(j: Judgement, verdict: Verdict) -> Part {
    let failing = verdict != Verdict::Consistent;
    let (says, fix): (Cow<'static, str>, Option<&'static str>) = match j {
        Judgement::NoGyroHandsFree => (
            "It is said to hover by itself with no gyroscope: an unstable craft cannot be held without measuring how fast it turns.".into(),
            Some("a rate gyroscope and a flight controller closing the loop at a few hundred hertz"),
        ),
        Judgement::GyroUnknown => (
            "The sheet does not say whether it has a gyroscope (sensing.gyroscope).".into(),
            Some("say whether it has a gyroscope (sensing.gyroscope)"),
        ),
        Judgement::HandFlown(tip) => (
            format!(
                "With no gyroscope the pilot must catch every tip by hand: it tips 30 deg in about {} s, against a reaction time of {REACTION_S} s.",
                typical_s(&tip),
            )
            .into(),
            failing.then_some("a rate gyroscope in a stabilising loop"),
        ),
        Judgement::HandFlownUnknown => (
            "Flown by hand with no gyroscope; the time to tip needs the arm (rotors.arm) or the size (craft.size).".into(),
            Some("give rotors.arm or craft.size"),
        ),
        Judgement::Gyro => (
            "A rate gyroscope senses the tipping that a thrust mismatch starts.".into(),
            None,
        ),
        Judgement::Loop(period, tip) => (
            if verdict == Verdict::Impossible {
                format!(
                    "Its control loop corrects every {} s, slower than it tips 30 deg even with the best-matched motors ({} s): it cannot be stabilised.",
                    Sig3(period.get::<second>()),
                    Sig3(tip[Tier::PhysicalLimit].get::<second>()),
                )
            } else {
                format!(
                    "Its control loop corrects every {} s, {} times within the {} s it takes to tip 30 deg (typical).",
                    Sig3(period.get::<second>()),
                    Sig3((tip[Tier::Typical] / period).value),
                    typical_s(&tip),
                )
            }
            .into(),
            failing.then_some("a control loop of a few hundred hertz"),
        ),
        Judgement::LevelDrift(drift) => (
            format!(
                "Hands-free with a gyroscope but no accelerometer, its idea of level drifts 5 deg in about {} s with typical parts.",
                typical_s(&drift),
            )
            .into(),
            failing.then_some("an accelerometer to keep the level reference"),
        ),
        Judgement::AccelerometerUnknown => (
            "Hands-free: the sheet does not say whether it has an accelerometer (sensing.accelerometer).".into(),
            Some("say whether it has an accelerometer (sensing.accelerometer)"),
        ),
        Judgement::HeightDrift(drift) => (
            format!(
                "It is said to hold its height with no height sensor; the accelerometer alone lets height drift 1 m in about {} s.",
                typical_s(&drift),
            )
            .into(),
            failing.then_some("a barometer or a range sensor for height"),
        ),
        Judgement::NoHeightSensor => (
            "It is said to hold its height with nothing on board that senses height or vertical motion.".into(),
            Some("a barometer or a range sensor for height"),
        ),
        Judgement::PositionDrift(drift) => (
            format!(
                "It is said to stay in place with no position sensor; a level error of {} deg slides it 1 m in about {} s.",
                LEVEL_ERROR.at(Tier::Typical),
                typical_s(&drift),
            )
            .into(),
            failing.then_some("a position sensor: optical flow with a range sensor indoors, satellite navigation outdoors"),
        ),
    };
    Part { verdict, says, fix }
}

fn describe(claim: &Claim, s: &Solution) -> Finding {
    let c = &claim.claim;
    // At most: the inertia and rotor mass per tier, three times to tip, the reaction
    // time, the loop period and three drifts of each kind.
    let mut figures: Vec<Figure> = Vec::with_capacity(20);
    let mut assumptions = Vec::with_capacity(8);
    assumptions.push(format!(
        "Thrust mismatch {} of one rotor's hover thrust (physical limit / best practice / typical) for {} motors; {}.",
        s.mismatch.values,
        if s.mismatch.key == THRUST_MISMATCH_BRUSHED.key {
            "brushed"
        } else {
            "brushless"
        },
        s.mismatch.basis,
    ));
    if let (Some(g), Some(tip)) = (s.tipping, s.tip) {
        assumptions.push(format!(
            "Tipping fastest about the axis normal to the arm of the rotor {} mm out; moment of inertia of {} plus the motors and propellers as point masses at the rotors ({}).",
            Sig3(g.lever.get::<millimeter>()),
            g.shape,
            match g.rotor_mass {
                RotorMass::Parts(m) => format!("{} g from the parts list", Sig3(m.get::<uom::si::mass::gram>())),
                RotorMass::Share => format!(
                    "{} of the take-off mass; {}",
                    ROTOR_MASS_SHARE.values,
                    ROTOR_MASS_SHARE.basis,
                ),
            },
        ));
        match g.rotor_mass {
            RotorMass::Parts(m) => figures.push(fixed(
                keys::ROTOR_MASS,
                "Mass of motors and propellers",
                m.get::<kilogram>(),
                "kg",
            )),
            RotorMass::Share => figures.extend(per_tier(
                keys::ROTOR_MASS,
                "Mass of motors and propellers",
                "kg",
                |t| (claim.craft.mass * ROTOR_MASS_SHARE.at(t)).get::<kilogram>(),
            )),
        }
        let inertia = |t: Tier| g.inertia[t].get::<kilogram_square_meter>();
        if g.rotor_mass == RotorMass::Share {
            figures.extend(per_tier(
                keys::MOMENT_OF_INERTIA,
                "Moment of inertia about the tipping axis",
                "kg m^2",
                inertia,
            ));
        } else {
            figures.push(fixed(
                keys::MOMENT_OF_INERTIA,
                "Moment of inertia about the tipping axis",
                inertia(Tier::Typical),
                "kg m^2",
            ));
        }
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
    if let Some(period) = s.loop_period {
        figures.push(fixed(
            keys::LOOP_PERIOD,
            "Control loop period",
            period.get::<second>(),
            "s",
        ));
        if s.tip.is_some() && claim.sensing.gyroscope == Some(true) {
            assumptions.push(format!(
                "A loop needs {} periods within the time to tip (physical limit / best practice / typical); {}.",
                LOOP_SAMPLES_PER_TIP.values,
                LOOP_SAMPLES_PER_TIP.basis,
            ));
        }
    }
    for &(j, _) in &s.parts {
        let (key, label) = match j {
            Judgement::LevelDrift(_) => (
                keys::ATTITUDE_DRIFT_TIME,
                "Time for the gyro alone to drift 5 deg",
            ),
            Judgement::HeightDrift(_) => (
                keys::HEIGHT_DRIFT_TIME,
                "Time for height to drift 1 m without a height sensor",
            ),
            Judgement::PositionDrift(_) => (
                keys::POSITION_DRIFT_TIME,
                "Time to drift 1 m sideways without a position sensor",
            ),
            _ => continue,
        };
        if let Judgement::LevelDrift(d) | Judgement::HeightDrift(d) | Judgement::PositionDrift(d) =
            j
        {
            figures.extend(per_tier(key, label, "s", |t| d[t].get::<second>()));
        }
    }
    if c.altitude_hold || c.position_hold || c.hands_free {
        assumptions.push(format!(
            "Holds are judged over the claimed flight time (or one minute): {} s; a drift of {DRIFT_THAT_MATTERS_M} m or {ATTITUDE_ERROR_DEG} deg matters (common practice).",
            Sig3(s.hold.get::<second>()),
        ));
    }

    let parts: Vec<Part> = s.parts.iter().map(|&(j, v)| part(j, v)).collect();
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
            "digital-control",
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

    fn tip(f: &Finding, tier: Tier) -> f64 {
        f.figure(keys::TIME_TO_TIP, Some(tier)).unwrap().value
    }

    #[test]
    fn time_to_tip_follows_the_rigid_body_formula_with_the_motors_as_point_masses() {
        // Rigid body, worked by hand: motors and propellers 15 % of 0.31 kg (typical share) =
        // 0.0465 kg, half at each rotor 70 mm out on y; body 0.2635 kg as a box:
        // I_xx = 0.2635 (0.08^2 + 0.022^2) / 12 + 0.0465 x 0.07^2 = 1.5116e-4 + 2.2785e-4
        // = 3.7901e-4 kg m^2; M = 0.05 x (0.31 x 9.80665 / 2) x 0.07 = 5.3206e-3 N m;
        // alpha = 14.038 rad/s^2; t = sqrt(2 x 0.5236 / 14.038) = 0.2731 s.
        let f = check(&sheet("[sensing]\ngyroscope = true"));
        let t = tip(&f, Tier::Typical);
        assert!((t - 0.2731).abs() < 2e-4, "{t}");
        let i = f
            .figure(keys::MOMENT_OF_INERTIA, Some(Tier::Typical))
            .unwrap()
            .value;
        assert!((i - 3.7901e-4).abs() < 1e-8, "{i}");
    }

    #[test]
    fn the_parts_list_gives_the_motors_mass() {
        // Point masses by hand: 4 x 7 g motors and 4 x 2 g propellers = 36 g, 18 g at each rotor:
        // I_xx = 0.274 (0.08^2 + 0.022^2) / 12 + 0.036 x 0.07^2 = 1.5718e-4 + 1.764e-4 = 3.3358e-4.
        let c = parse(
            "title = \"t\"\n[craft]\nsize = \"160 mm x 80 mm x 22 mm\"\n[[craft.parts]]\nname = \"frame and battery\"\nmass = \"274 g\"\n[[craft.parts]]\nname = \"Motor 0720\"\nmass = \"7 g\"\ncount = 4\n[[craft.parts]]\nname = \"propeller\"\nmass = \"2 g\"\ncount = 4\n[rotors]\ncount = 2\narm = \"70 mm\"\nmax_thrust = \"300 g\"\n[sensing]\ngyroscope = true",
            Format::Toml,
        )
        .unwrap();
        let f = check(&c);
        let i = f.figure(keys::MOMENT_OF_INERTIA, None).unwrap().value;
        assert!((i - 3.3358e-4).abs() < 1e-8, "{i}");
        assert!((f.figure(keys::ROTOR_MASS, None).unwrap().value - 0.036).abs() < 1e-12);
    }

    #[test]
    fn a_symmetric_x_tips_about_the_diagonal_through_the_neighbours_with_the_whole_arm_as_lever() {
        // Worked by hand for a symmetric quad-x (arm 100 mm, square 160 x 160 x 40 mm body):
        // a mismatch on the front-right rotor at (70.7, -70.7) mm makes M = dT (y, -x), whose
        // axis is normal to that rotor's arm: the diagonal through rotors 2 and 4. With
        // I_xx = I_yy the lever is the whole arm, 0.1 m, not 0.1 sin 45 deg.
        // I = 0.2635 (0.16^2 + 0.04^2) / 12 + 0.0465 x 0.1^2 / 2 = 5.9727e-4 + 2.325e-4
        // = 8.2977e-4 kg m^2; dT = 0.05 x 0.31 x 9.80665 / 4 = 0.038001 N; M = 3.8001e-3 N m;
        // alpha = 4.5797 rad/s^2; t = sqrt(2 x 0.5236 / 4.5797) = 0.4782 s.
        let c = parse(
            "title = \"t\"\n[craft]\nmass = \"310 g\"\nsize = \"160 mm x 160 mm x 40 mm\"\n[rotors]\ncount = 4\nlayout = \"quad-x\"\narm = \"100 mm\"\nmax_thrust = \"300 g\"\n[sensing]\ngyroscope = true",
            Format::Toml,
        )
        .unwrap();
        let f = check(&c);
        let t = tip(&f, Tier::Typical);
        assert!((t - 0.4782).abs() < 2e-4, "{t}");
        assert!(f.assumptions.iter().any(|a| a.contains("rotor 100 mm out")));
    }

    #[test]
    fn brushed_motors_tip_faster_by_their_larger_mismatch() {
        // t = sqrt(2 theta I / M) with M proportional to the mismatch: 10 % (brushed, from
        // memory) against 5 % (brushless) tips sqrt 2 times faster, worked by hand.
        let brushless = check(&sheet("drive = \"brushless\"\n[sensing]\ngyroscope = true"));
        let brushed = check(&sheet("drive = \"brushed\"\n[sensing]\ngyroscope = true"));
        let ratio = tip(&brushless, Tier::Typical) / tip(&brushed, Tier::Typical);
        assert!((ratio - 2f64.sqrt()).abs() < 1e-9, "{ratio}");
    }

    #[test]
    fn a_control_loop_slower_than_the_tip_cannot_stabilise() {
        // digital-control: the loop must correct well inside the time to tip. Worked by hand,
        // the bicopter tips in 0.273 s (typical) and 0.711 s at the physical limit (1 % mismatch,
        // 25 % motor mass: I = 5.131e-4 kg m^2, M = 1.064e-3 N m); a 1 Hz loop corrects every
        // second. Hands-free, gyro and accelerometer on board: only the loop can fail.
        let base = "[claim]\nhands_free = true\n[sensing]\ngyroscope = true\naccelerometer = true\nloop_rate = ";
        let f = check(&sheet(&format!("{base}\"1 Hz\"")));
        assert_eq!(f.verdict, Verdict::Impossible, "{}", f.headline);
        assert!((f.figure(keys::LOOP_PERIOD, None).unwrap().value - 1.0).abs() < 1e-12);
        // 20 Hz: 0.05 s periods, 5.5 within the typical tip (ten needed), 9.4 within the
        // best-practice tip of 0.469 s (five needed): doubtful.
        let f = check(&sheet(&format!("{base}\"20 Hz\"")));
        assert_eq!(f.verdict, Verdict::Doubtful, "{}", f.headline);
        let f = check(&sheet(&format!("{base}\"400 Hz\"")));
        assert_eq!(f.verdict, Verdict::Consistent, "{}", f.headline);
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

//! Rule 2, tilt-equilibrium: can the craft hold the attitude it is said to hover at?
//!
//! Givens: the claimed body tilt theta, the weight W, the mount of the rotors.
//! Statics: rotors fixed to a tilted body tilt their thrust with it; holding the
//! weight leaves a sideways force W tan(theta), an acceleration g tan(theta).
//! Only a steady headwind v = sqrt(2 W tan(theta) / (rho Cd A)), a tether, or
//! rotors that tilt back relative to the body can balance it.

use uom::si::f64::{Angle, Area, Force};
use uom::si::{
    acceleration::meter_per_second_squared, angle::degree, area::square_meter, force::newton,
    velocity::meter_per_second,
};

use super::common::{self, fixed, per_tier};
use super::thrust_margin::{self, Lift};
use crate::catalog::tiers::BODY_DRAG;
use crate::claim::{BoxSize, Claim, Mount};
use crate::physics::{body, drag};
use std::fmt::Write as _;

use crate::report::{keys, Finding, Sig3, Verdict};
use crate::tier::{PerTier, Tier};

pub const ID: &str = "tilt-equilibrium";
pub const TITLE: &str = "Holding the claimed attitude";
pub const METHOD: &str = "A steady hover at body tilt theta with rotors fixed to the body tilts the thrust with it. Holding the weight W leaves a sideways force W tan(theta), an acceleration g tan(theta), and needs a thrust W / cos(theta). Rotors that tilt back relative to the body by up to their tilt range take out that much of the tilt. What remains can be held only by a steady headwind whose drag balances it, v = sqrt(2 W tan(theta) / (rho Cd A)), by a tether or a support. The drag coefficient Cd and the wind area A are taken per tier: the most a bluff body can have at the physical limit, a flat plate and a cube (Hoerner) at best practice and typical, on the pitched body's projected area.";

/// Area the body shows to a horizontal wind when pitched by `tilt`:
/// A = W H cos(theta) + L W sin(theta) for a box of length L, width W, height H.
fn pitched_area(size: &BoxSize, tilt: Angle) -> Area {
    size.width * size.height * tilt.cos().value + size.length * size.width * tilt.sin().value
}

/// The largest area a box can show to any wind: sqrt((LW)^2 + (LH)^2 + (WH)^2).
fn largest_area(size: &BoxSize) -> Area {
    let (l, w, h) = (size.length, size.width, size.height);
    let faces: [Area; 3] = [l * w, l * h, w * h];
    let sum: f64 = faces.iter().map(|a| a.get::<square_meter>().powi(2)).sum();
    Area::new::<square_meter>(sum.sqrt())
}

pub fn check(claim: &Claim) -> Finding {
    let Some(tilt) = claim.claim.hover_tilt else {
        return Finding::not_assessed(ID, "the attitude it hovers at (claim.hover_tilt)");
    };
    let air = common::air(claim);
    let w = common::weight(claim, &air);
    let r = &claim.rotors;

    // Rotors that tilt back relative to the body take out up to their range.
    let compensation = match (r.mount, r.tilt_range) {
        (Mount::Tilting, Some(range)) => range.min(tilt),
        _ => Angle::new::<degree>(0.0),
    };
    let residual = tilt - compensation;
    let sideways: Force = w * residual.tan().value;
    let thrust_needed: Force = w / residual.cos().value;
    let accel = body::tilt_acceleration(air.gravity, residual);

    // Five fixed figures at most and the headwind per tier.
    let mut figures = Vec::with_capacity(8);
    figures.extend([
        fixed(
            keys::HOVER_TILT,
            "Claimed body tilt in hover",
            tilt.get::<degree>(),
            "deg",
        ),
        fixed(
            keys::HORIZONTAL_ACCEL,
            "Sideways acceleration left by the tilted thrust",
            accel.get::<meter_per_second_squared>(),
            "m/s^2",
        ),
        fixed(
            keys::HORIZONTAL_FORCE,
            "Sideways force to be balanced",
            sideways.get::<newton>(),
            "N",
        ),
        fixed(
            keys::THRUST_NEEDED,
            "Thrust needed to hold the weight at this tilt",
            thrust_needed.get::<newton>(),
            "N",
        ),
    ]);
    if r.mount == Mount::Tilting {
        figures.push(fixed(
            keys::UNCOMPENSATED_TILT,
            "Tilt of the thrust left after the rotors tilt back",
            residual.get::<degree>(),
            "deg",
        ));
    }

    let est = thrust_margin::estimate(claim, &air);
    // A level hover needs only the weight held: that is the thrust rule's finding alone.
    let level = tilt.get::<degree>() <= 1e-9;
    let thrust_ok = |t: Tier| {
        level
            || est
                .as_ref()
                .is_none_or(|e| e.available[t] * f64::from(r.count) >= thrust_needed * (1.0 - 1e-9))
    };
    let still_air = claim.conditions.wind.get::<meter_per_second>() <= 0.0;
    let balanced = residual.get::<degree>() <= 1e-9;

    // The headwind that would hold it, where the body size is known.
    let headwind = claim.craft.size.map(|size| {
        PerTier::from_fn(|t| {
            let area = match t {
                Tier::PhysicalLimit => largest_area(&size),
                _ => pitched_area(&size, residual),
            };
            drag::speed_for_drag(sideways, air.density, BODY_DRAG.at(t), area)
        })
    });
    if let Some(v) = headwind {
        figures.extend(per_tier(
            keys::HEADWIND_NEEDED,
            "Steady headwind whose drag balances the sideways force",
            "m/s",
            |t| v[t].get::<meter_per_second>(),
        ));
    }
    let wind_ok = |t: Tier| match headwind {
        _ if balanced => true,
        _ if still_air => false,
        Some(v) => claim.conditions.wind >= v[t] * (1.0 - 1e-9),
        None => true,
    };
    let wind_unknown = !balanced && !still_air && headwind.is_none();
    let verdict = if wind_unknown && Tier::ALL.into_iter().all(thrust_ok) {
        Verdict::NotAssessed
    } else {
        common::verdict_of(|t| wind_ok(t) && thrust_ok(t))
    };

    let deg = Sig3(tilt.get::<degree>());
    let wind = Sig3(claim.conditions.wind.get::<meter_per_second>());
    let headline = match verdict {
        _ if wind_unknown && verdict == Verdict::NotAssessed => format!(
            "A {deg} deg tilt leaves {} m/s^2 sideways; whether the stated wind holds it needs the body size (craft.size).",
            Sig3(accel.get::<meter_per_second_squared>()),
        ),
        Verdict::Impossible if still_air && !balanced => format!(
            "Tilted {deg} deg with rotors fixed to the body, it would accelerate sideways at {} m/s^2: it cannot hover in still air.",
            Sig3(accel.get::<meter_per_second_squared>()),
        ),
        Verdict::Consistent if balanced && tilt.get::<degree>() > 0.0 => format!(
            "Rotors that tilt back {} deg keep the thrust upright, so a {deg} deg body tilt can be held.",
            Sig3(compensation.get::<degree>()),
        ),
        Verdict::Consistent if balanced => "A level hover leaves no sideways force.".to_string(),
        Verdict::Consistent => {
            format!("The stated {wind} m/s wind can hold a {deg} deg tilt with typical drag.")
        }
        _ if !Tier::ALL.into_iter().all(thrust_ok) => format!(
            "Holding the weight at {deg} deg takes {} of thrust, more than the rotors give at the {} tier.",
            Lift(thrust_needed),
            common::first_failure(thrust_ok).map_or("", |t| t.label()),
        ),
        _ => format!(
            "The stated wind of {wind} m/s is short of the {} m/s whose drag would hold a {deg} deg tilt.",
            headwind.map_or("?".to_string(), |v| {
                Sig3(v[Tier::Typical].get::<meter_per_second>()).to_string()
            }),
        ),
    };

    let would_take = if balanced {
        "Nothing more for the attitude.".to_string()
    } else {
        let mut ways = String::from("Any of: ");
        if let Some(v) = headwind {
            let _ = write!(
                ways,
                "a steady headwind of about {} m/s (typical drag; {} m/s with the most drag a body can have); ",
                Sig3(v[Tier::Typical].get::<meter_per_second>()),
                Sig3(v[Tier::PhysicalLimit].get::<meter_per_second>()),
            );
        }
        let _ = write!(
            ways,
            "a tether or support taking {} sideways; rotors that tilt back by {deg} deg relative to the body.",
            Lift(sideways),
        );
        ways
    };

    let mut assumptions = Vec::with_capacity(4);
    assumptions.push("Steady hover: no climb, no turn; thrust along the rotor axis.".to_string());
    assumptions.push(format!(
        "Drag coefficient {} (physical limit), {} (best practice), {} (typical); {}.",
        BODY_DRAG.at(Tier::PhysicalLimit),
        BODY_DRAG.at(Tier::BestPractice),
        BODY_DRAG.at(Tier::Typical),
        BODY_DRAG.basis,
    ));
    if claim.craft.size.is_some() {
        assumptions.push(
            "Wind area: the largest the body can show (physical limit), else the pitched body's projected area."
                .to_string(),
        );
    }
    if est.is_none() {
        assumptions
            .push("Thrust at tilt not compared: the sheet gives no thrust figure.".to_string());
    }
    Finding {
        rule: ID,
        verdict,
        headline,
        figures,
        would_take,
        assumptions,
        sources: &["statics", "hoerner-1965", "isa"],
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::claim::{parse, Format};

    fn sheet(extra: &str) -> Claim {
        let text = format!(
            "title = \"t\"\n[craft]\nmass = \"300 g\"\nsize = \"160 mm x 80 mm x 22 mm\"\n[rotors]\ncount = 4\nmax_thrust = \"200 g\"\n{extra}"
        );
        parse(&text, Format::Toml).unwrap()
    }

    #[test]
    fn a_tilted_fixed_rotor_hover_is_impossible_in_still_air() {
        // Statics: g tan(30 deg) = 5.66 m/s^2 sideways with nothing to balance it.
        let f = check(&sheet("[claim]\nhover_tilt = \"30 deg\""));
        assert_eq!(f.verdict, Verdict::Impossible);
        let a = f.figure(keys::HORIZONTAL_ACCEL, None).unwrap().value;
        assert!((a - 5.66).abs() < 0.01);
    }

    #[test]
    fn zero_tilt_always_holds() {
        let f = check(&sheet("[claim]\nhover_tilt = \"0 deg\""));
        assert_eq!(f.verdict, Verdict::Consistent);
    }

    #[test]
    fn the_headwind_needed_follows_the_drag_formula() {
        // v = sqrt(2 W tan(theta) / (rho Cd A)) (Hoerner drag, statics): W = 0.3 kg x 9.80665
        // = 2.942 N, theta = 10 deg -> F = 0.5188 N; A = 0.08 x 0.022 cos10 + 0.16 x 0.08 sin10
        // = 0.0017333 + 0.0022227 = 0.003956 m^2; typical Cd 1.05 -> v = sqrt(1.0376 / (1.225 x
        // 1.05 x 0.003956)) = 14.27 m/s.
        let f = check(&sheet(
            "[claim]\nhover_tilt = \"10 deg\"\n[conditions]\nwind = \"20 m/s\"",
        ));
        let v = f
            .figure(keys::HEADWIND_NEEDED, Some(Tier::Typical))
            .unwrap()
            .value;
        assert!((v - 14.27).abs() < 0.02, "{v}");
        assert_eq!(f.verdict, Verdict::Consistent);
        // A 14 m/s wind is a little short at typical drag but enough with a flat plate's.
        let f = check(&sheet(
            "[claim]\nhover_tilt = \"10 deg\"\n[conditions]\nwind = \"14 m/s\"",
        ));
        assert_eq!(f.verdict, Verdict::Doubtful);
    }

    #[test]
    fn rotors_that_tilt_back_far_enough_hold_the_body_tilt() {
        let f = check(&sheet(
            "mount = \"tilting\"\ntilt_range = \"40 deg\"\n[claim]\nhover_tilt = \"35 deg\"",
        ));
        assert_eq!(f.verdict, Verdict::Consistent);
        let f = check(&sheet(
            "mount = \"tilting\"\ntilt_range = \"20 deg\"\n[claim]\nhover_tilt = \"35 deg\"",
        ));
        assert_eq!(f.verdict, Verdict::Impossible);
    }

    #[test]
    fn the_thrust_needed_at_tilt_is_weight_over_cosine() {
        // Statics: T = W / cos(theta); at 60 deg, twice the weight. 4 x 200 g = 800 g of thrust
        // holds 300 g at 60 deg (needs 600 g) but the wind must still balance it.
        let f = check(&sheet(
            "[claim]\nhover_tilt = \"60 deg\"\n[conditions]\nwind = \"60 m/s\"",
        ));
        let t = f.figure(keys::THRUST_NEEDED, None).unwrap().value;
        assert!((t - 2.0 * 0.3 * 9.806_65).abs() < 1e-6);
    }
}

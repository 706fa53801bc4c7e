//! Rule 1, thrust-margin: is there thrust to lift the craft, with room to steer?
//!
//! Givens: the weight W = m g, the air density of the ISA at the stated
//! altitude, and per rotor a thrust: the sheet's, else the motor class's,
//! capped by the momentum-theory bound T <= (2 rho A)^(1/3) (FM eta P)^(2/3).
//! Comparison: W against the total thrust at each tier, with the common
//! practice of hovering at no more than 70 % of the maximum at the typical tier.

use uom::si::f64::{Force, Length, Power};
use uom::si::{
    force::{gram_force, newton},
    length::millimeter,
    mass::gram,
    mass_density::kilogram_per_cubic_meter,
    power::watt,
};

use super::common::{self, fixed, per_tier};
use crate::catalog::tiers::{self, HOVER_FRACTION_MAX};
use crate::catalog::{self, Drive, MotorClass};
use crate::claim::{Claim, Layout};
use crate::physics::atmosphere::{self, Air};
use crate::physics::rotor;
use crate::tier::{PerTier, Tier};
use std::fmt::{self, Write as _};

use crate::report::{keys, Finding, Sig3, Verdict};

pub const ID: &str = "thrust-margin";
pub const TITLE: &str = "Thrust and control margin";
pub const METHOD: &str = "Weight W = m g with g from the ISA at the stated altitude. Each rotor's maximum thrust is the stated one (a mass such as '30 g' read as gram-force), else the motor class's, in both cases scaled by air density rho / rho0. The momentum-theory bound for a rotor of disk area A on electrical power P is T <= (2 rho A)^(1/3) (FM eta P)^(2/3); it caps the class figures at each tier, and a stated thrust above it is impossible (FM = eta = 1) or implausible (best-practice FM and eta). The claim passes a tier when W <= n T_rotor, and at the typical tier when W <= 0.7 n T_rotor (common practice: hover at no more than about 70 % of maximum thrust). Rotors needed: ceil(W / (0.7 T_rotor)).";

/// The hover share of maximum thrust that sizes the rotor count (common practice).
const SIZING_FRACTION: f64 = 0.7;

/// Where a rotor's thrust figure comes from.
#[derive(Debug, Clone, Copy)]
enum Basis {
    /// `rotors.max_thrust`, taken at every tier.
    Stated(Force),
    /// The motor class's thrust range, capped by the momentum bound.
    Class(&'static MotorClass),
    /// Only power and diameter are known: the momentum bound at each tier.
    Power,
}

/// Per-rotor thrust at the three tiers, with what it was worked from.
#[derive(Debug, Clone)]
pub struct Estimate {
    basis: Basis,
    /// Available static thrust of one rotor at each tier, at the claim's air.
    pub available: PerTier<Force>,
    /// Momentum-theory bound for one rotor at each tier, at the claim's air.
    pub bound: Option<PerTier<Force>>,
    pub power: Option<(Power, bool)>,
    pub diameter: Option<(Length, bool)>,
    pub drive: Option<(Drive, bool)>,
}

/// One rotor's maximum thrust at `tier`, in the claim's air; the control
/// authority rule bounds each actuator by it.
pub fn rotor_thrust(claim: &Claim, tier: Tier) -> Option<Force> {
    estimate(claim, &common::air(claim)).map(|e| e.available[tier])
}

/// The momentum bound for one rotor, where disks are shared by coaxial pairs:
/// T_r = (2 rho A_r)^(1/3) (FM eta P)^(2/3) with A_r the rotor's share of disk area.
fn bound_per_rotor(
    claim: &Claim,
    air: &Air,
    diameter: Length,
    power: Power,
    fm: f64,
    eta: f64,
) -> Force {
    let share = if claim.rotors.layout == Some(Layout::Coaxial) {
        0.5
    } else {
        1.0
    };
    rotor::thrust_bound(
        air.density,
        rotor::disk_area(diameter) * share,
        power * (fm * eta),
    )
}

/// Works out the per-rotor thrust at every tier, or `None` when the sheet
/// gives neither a thrust, a motor class, nor power and diameter.
pub fn estimate(claim: &Claim, air: &Air) -> Option<Estimate> {
    let r = &claim.rotors;
    let class = r.motor;
    let density_ratio = (air.density / atmosphere::sea_level_density()).value;
    let power = r
        .max_power
        .map(|p| (p, true))
        .or(class.map(|c| (c.max_power(), false)));
    let diameter = r
        .diameter
        .map(|d| (d, true))
        .or(class.map(|c| (c.largest_prop(), false)));
    let drive = r
        .drive()
        .map(|d| (d, true))
        .or(power.map(|_| (Drive::Brushless, false)));
    let bound = match (power, diameter, drive) {
        (Some((p, _)), Some((d, _)), Some((drive, _))) => Some(PerTier::from_fn(|t| {
            let fm = tiers::figure_of_merit(t, d);
            bound_per_rotor(claim, air, d, p, fm, tiers::drive_efficiency(t, drive))
        })),
        _ => None,
    };
    let (basis, available) = match (r.max_thrust, class, bound) {
        (Some(t), _, _) => (Basis::Stated(t), PerTier::from_fn(|_| t * density_ratio)),
        (None, Some(c), _) => {
            let class_thrust = PerTier::new(c.best_thrust(), c.best_thrust(), c.typical_thrust());
            let available = PerTier::from_fn(|t| {
                let from_class = class_thrust[t] * density_ratio;
                match (t, bound) {
                    (Tier::PhysicalLimit, Some(b)) => b[t].max(from_class),
                    (_, Some(b)) => from_class.min(b[t]),
                    (_, None) => from_class,
                }
            });
            (Basis::Class(c), available)
        }
        (None, None, Some(b)) => (Basis::Power, b),
        (None, None, None) => return None,
    };
    Some(Estimate {
        basis,
        available,
        bound,
        power,
        diameter,
        drive,
    })
}

/// A force as a layperson reads it: grams or kilograms of lift ("850 g", "1.20 kg").
#[derive(Debug, Clone, Copy)]
pub struct Lift(pub Force);

impl fmt::Display for Lift {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        let g = self.0.get::<gram_force>();
        if g.abs() >= 1000.0 {
            write!(f, "{} kg", Sig3(g / 1000.0))
        } else {
            write!(f, "{} g", Sig3(g))
        }
    }
}

pub fn check(claim: &Claim) -> Finding {
    let air = common::air(claim);
    let Some(est) = estimate(claim, &air) else {
        return Finding::not_assessed(
            ID,
            "a per-rotor thrust (rotors.max_thrust), a motor class (rotors.motor), or power and diameter (rotors.max_power and rotors.diameter)",
        );
    };
    let n = f64::from(claim.rotors.count);
    let w = common::weight(claim, &air);
    let total = |t: Tier| est.available[t] * n;
    let fraction = |t: Tier| (w / total(t)).value;

    // A stated thrust is checked against the bound at sea level, where it was measured.
    let stated_bound = match (est.basis, est.power, est.diameter, est.drive) {
        (Basis::Stated(_), Some((p, _)), Some((d, _)), Some((drive, _))) => {
            let sea = atmosphere::isa(Length::new::<millimeter>(0.0), None);
            Some(PerTier::from_fn(|t| {
                let fm = tiers::figure_of_merit(t, d);
                bound_per_rotor(claim, &sea, d, p, fm, tiers::drive_efficiency(t, drive))
            }))
        }
        _ => None,
    };
    let stated_ok = |t: Tier| match (est.basis, stated_bound) {
        (Basis::Stated(s), Some(b)) if t != Tier::Typical => s <= b[t] * (1.0 + 1e-9),
        _ => true,
    };
    let stated_fails = common::first_failure(stated_ok);
    // A hair of tolerance so that exactly 70 % (or exactly 100 %) passes.
    let verdict = common::verdict_of(|t| {
        stated_ok(t) && fraction(t) <= HOVER_FRACTION_MAX.at(t) * (1.0 + 1e-9)
    });

    let rotors_needed = |t: Tier| (w / (est.available[t] * SIZING_FRACTION)).value.ceil();
    // Two fixed figures and five per tier.
    let mut figures = Vec::with_capacity(17);
    figures.push(fixed(
        keys::WEIGHT,
        "Weight of the craft",
        w.get::<newton>(),
        "N",
    ));
    figures.push(fixed(
        keys::AIR_DENSITY,
        "Air density (ISA at the stated altitude and temperature)",
        air.density.get::<kilogram_per_cubic_meter>(),
        "kg/m^3",
    ));
    figures.extend(per_tier(
        keys::THRUST_PER_ROTOR,
        "Maximum thrust of one rotor",
        "N",
        |t| est.available[t].get::<newton>(),
    ));
    figures.extend(per_tier(
        keys::THRUST_AVAILABLE,
        "Maximum thrust of all rotors",
        "N",
        |t| total(t).get::<newton>(),
    ));
    figures.extend(per_tier(
        keys::HOVER_FRACTION,
        "Share of maximum thrust needed to hover",
        "1",
        fraction,
    ));
    figures.extend(per_tier(
        keys::ROTORS_NEEDED,
        "Rotors of this kind needed to hover at 70 % of maximum thrust",
        "1",
        rotors_needed,
    ));
    if let Some(b) = est.bound {
        figures.extend(per_tier(
            keys::THRUST_BOUND,
            "Momentum-theory bound on the thrust of all rotors for their power",
            "N",
            |t| (b[t] * n).get::<newton>(),
        ));
    }

    let headline = headline(
        claim,
        &est,
        verdict,
        stated_fails,
        stated_bound,
        w,
        &total,
        &fraction,
    );
    Finding {
        rule: ID,
        verdict,
        headline,
        figures,
        would_take: would_take(claim, &est, w, &air),
        assumptions: assumptions(claim, &est, &air),
        sources: &["isa", "momentum-theory"],
    }
}

#[allow(clippy::too_many_arguments)]
fn headline(
    claim: &Claim,
    est: &Estimate,
    verdict: Verdict,
    stated_fails: Option<Tier>,
    stated_bound: Option<PerTier<Force>>,
    w: Force,
    total: &dyn Fn(Tier) -> Force,
    fraction: &dyn Fn(Tier) -> f64,
) -> String {
    let n = claim.rotors.count;
    let weighs = Lift(w);
    if let (Basis::Stated(s), Some(tier), Some(b), Some((p, _)), Some((d, _))) = (
        est.basis,
        stated_fails,
        stated_bound,
        est.power,
        est.diameter,
    ) {
        let what = match tier {
            Tier::PhysicalLimit => "more than momentum theory allows even for a perfect rotor",
            _ => "more than the best real rotors achieve",
        };
        return format!(
            "The stated {} per rotor is {what} on {} W and a {} mm rotor (at most {}).",
            Lift(s),
            Sig3(p.get::<watt>()),
            Sig3(d.get::<millimeter>()),
            Lift(b[tier]),
        );
    }
    let percent = Sig3(100.0 * fraction(Tier::Typical));
    match verdict {
        Verdict::Impossible => format!(
            "Even perfect rotors of this size and power lift at most {} in all; the craft weighs {weighs}.",
            Lift(total(Tier::PhysicalLimit)),
        ),
        Verdict::Implausible => format!(
            "Only better-than-best hardware would lift it: the best {n} rotors of this kind give {} against a weight of {weighs}.",
            Lift(total(Tier::BestPractice)),
        ),
        Verdict::Doubtful => format!(
            "It would hover at {percent} % of typical maximum thrust ({} in all for {weighs}); common practice keeps hover under 70 %.",
            Lift(total(Tier::Typical)),
        ),
        _ => format!(
            "Hovers at {percent} % of typical maximum thrust ({} in all for {weighs}), inside the 70 % of common practice.",
            Lift(total(Tier::Typical)),
        ),
    }
}

/// The typical thrust of one motor of a class on its usual propeller.
fn class_typical(claim: &Claim, class: &MotorClass, air: &Air) -> Force {
    let d = class.usual_prop();
    let fm = tiers::figure_of_merit(Tier::Typical, d);
    let eta = tiers::drive_efficiency(Tier::Typical, class.drive);
    let ratio = (air.density / atmosphere::sea_level_density()).value;
    (class.typical_thrust() * ratio).min(bound_per_rotor(claim, air, d, class.max_power(), fm, eta))
}

fn would_take(claim: &Claim, est: &Estimate, w: Force, air: &Air) -> String {
    let n = claim.rotors.count;
    let typical = est.available[Tier::Typical];
    let needed = (w / (typical * SIZING_FRACTION)).value.ceil() as u64;
    let lightest = typical * (f64::from(n) * SIZING_FRACTION);
    let hover_ok = w <= lightest;
    if hover_ok {
        return format!(
            "Nothing: {n} rotors of this kind hover it at 70 % of typical thrust up to a weight of {}.",
            Lift(lightest),
        );
    }
    let mut line = format!(
        "{needed} rotors of this kind instead of {n}, or a craft of at most {} on the {n} it has",
        Lift(lightest),
    );
    let class = catalog::MOTORS
        .iter()
        .map(|c| (c, class_typical(claim, c, air)))
        .find(|&(_, typical)| typical * (f64::from(n) * SIZING_FRACTION) >= w);
    if let Some((c, typical)) = class {
        let _ = write!(
            line,
            ", or {n} motors of class {} ({}), about {} of thrust in all",
            c.id,
            c.label,
            Lift(typical * f64::from(n)),
        );
    }
    line.push('.');
    line
}

fn assumptions(claim: &Claim, est: &Estimate, air: &Air) -> Vec<String> {
    let mut out = Vec::with_capacity(7);
    out.push(format!(
        "Air density {:.4} kg/m^3 and gravity {:.4} m/s^2 (ISA at {} m).",
        air.density.get::<kilogram_per_cubic_meter>(),
        air.gravity.value,
        Sig3(claim.conditions.altitude.value),
    ));
    match est.basis {
        Basis::Stated(t) => {
            const TAKEN: &str = "; a stated thrust is taken at every tier, as static thrust at sea level scaled by air density.";
            out.push(if claim.rotors.max_thrust_from_mass {
                format!(
                    "rotors.max_thrust was written as a mass and read as gram-force ({} N){TAKEN}",
                    Sig3(t.get::<newton>()),
                )
            } else {
                format!("rotors.max_thrust is taken as stated{TAKEN}")
            });
        }
        Basis::Class(c) => out.push(format!(
            "Thrust per rotor from motor class {} ({}): {}-{} g at sea level, capped by the momentum bound; {}.",
            c.id, c.label, c.thrust_gf.0, c.thrust_gf.1, c.basis,
        )),
        Basis::Power => out.push(
            "Thrust per rotor from the momentum bound for the stated power and diameter alone."
                .to_string(),
        ),
    }
    if let Some((d, stated)) = est.diameter {
        if !stated {
            out.push(format!(
                "Rotor diameter {} mm, the largest usual for the motor class (rotors.diameter not given).",
                Sig3(d.get::<millimeter>()),
            ));
        }
    }
    if let Some((p, stated)) = est.power {
        if !stated {
            out.push(format!(
                "Electrical power {} W per motor from the motor class (rotors.max_power not given).",
                Sig3(p.get::<watt>()),
            ));
        }
    }
    if let Some((_, false)) = est.drive {
        out.push("Drive taken as brushless (rotors.drive not given).".to_string());
    }
    if let Some(total) = claim.craft.parts_total {
        let off = (total / claim.craft.mass).value - 1.0;
        if off.abs() <= 0.05 {
            out.push(format!(
                "The parts list adds up to {} g, within 5 % of the mass used.",
                Sig3(total.get::<gram>()),
            ));
        } else {
            out.push(format!(
                "The parts list adds up to {} g, {} % {} the stated mass: the stated mass is used.",
                Sig3(total.get::<gram>()),
                Sig3(100.0 * off.abs()),
                if off > 0.0 { "above" } else { "below" },
            ));
        }
    }
    out.push(
        "Figure of merit and drive efficiency per tier from the tier table; static thrust, no forward flight."
            .to_string(),
    );
    out
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::claim::{parse, Format};

    fn sheet(mass: &str, rotors: &str) -> Claim {
        let text = format!("title = \"t\"\n[craft]\nmass = \"{mass}\"\n[rotors]\n{rotors}\n");
        parse(&text, Format::Toml).unwrap()
    }

    #[test]
    fn a_300_g_craft_on_30_g_motors_needs_15_of_them() {
        // Common practice (DESIGN check values): 30 g per 7 mm motor, hover at 70 %
        // -> ceil(300 / 21) = 15 motors.
        let c = sheet(
            "300 g",
            "count = 2\ndiameter = \"55 mm\"\nmax_thrust = \"30 g\"",
        );
        let f = check(&c);
        let needed = f
            .figure(keys::ROTORS_NEEDED, Some(Tier::Typical))
            .unwrap()
            .value;
        assert_eq!(needed, 15.0);
        assert!(f.assumptions.iter().any(|a| a.contains("gram-force")));
    }

    #[test]
    fn two_micro_motors_cannot_lift_a_300_g_craft_even_at_the_physical_limit() {
        // Momentum bound with FM = 1, eta = 1 for 10 W on a 55 mm rotor at 1.225 kg/m^3:
        // (2 x 1.225 x 2.376e-3)^(1/3) x 10^(2/3) = 0.1799 x 4.642 = 0.835 N = 85 gf per rotor.
        let c = sheet(
            "300 g",
            "count = 2\ndiameter = \"55 mm\"\nmotor = \"brushed-coreless-7x16\"",
        );
        let f = check(&c);
        assert_eq!(f.verdict, Verdict::Impossible);
        let limit = f
            .figure(keys::THRUST_PER_ROTOR, Some(Tier::PhysicalLimit))
            .unwrap()
            .value;
        assert!((limit - 0.835).abs() < 0.005, "{limit}");
    }

    #[test]
    fn a_300_g_pair_is_sized_by_a_motor_pair_lifting_about_850_g() {
        // Common practice (DESIGN check values): a properly sized pair of motors for a
        // 300 g craft lifts about 850 g (150 quarters of 5.670 g, U.S. Mint specification).
        let c = sheet(
            "300 g",
            "count = 2\ndiameter = \"55 mm\"\nmotor = \"brushed-coreless-7x16\"",
        );
        let f = check(&c);
        let class = catalog::MOTORS
            .iter()
            .find(|m| f.would_take.contains(m.id))
            .expect("a class is suggested");
        let air = common::air(&c);
        let pair = class_typical(&c, class, &air).get::<gram_force>() * 2.0;
        let quarters = 150.0 * 5.670;
        assert!(
            (pair - quarters).abs() / quarters < 0.15,
            "{} lifts {pair} g",
            class.id
        );
    }

    #[test]
    fn a_stated_thrust_above_the_momentum_bound_is_impossible() {
        // Bound for 4 W, FM 1, eta 1, 55 mm at sea level: 0.1799 x 4^(2/3) = 0.453 N = 46 gf.
        let c = sheet(
            "50 g",
            "count = 2\ndiameter = \"55 mm\"\nmax_thrust = \"60 g\"\nmax_power = \"4 W\"\ndrive = \"brushed\"",
        );
        assert_eq!(check(&c).verdict, Verdict::Impossible);
        // 40 gf is under the physical bound (46 gf) but over the best-practice one
        // (FM 0.75, eta 0.735: 46 x 0.551^(2/3) = 31 gf): implausible.
        let c = sheet(
            "20 g",
            "count = 2\ndiameter = \"55 mm\"\nmax_thrust = \"40 g\"\nmax_power = \"4 W\"\ndrive = \"brushed\"",
        );
        assert_eq!(check(&c).verdict, Verdict::Implausible);
    }

    #[test]
    fn the_seventy_percent_rule_separates_consistent_from_doubtful() {
        // Common practice: hover at no more than 70 % of maximum thrust. 4 x 100 g stated:
        // 280 g hovers at exactly 70 %, 300 g at 75 %.
        let rotors = "count = 4\nmax_thrust = \"100 g\"";
        assert_eq!(check(&sheet("280 g", rotors)).verdict, Verdict::Consistent);
        assert_eq!(check(&sheet("300 g", rotors)).verdict, Verdict::Doubtful);
        // At 400 g the craft still lifts off at the best-practice tier: doubtful, not worse.
        assert_eq!(check(&sheet("400 g", rotors)).verdict, Verdict::Doubtful);
        // Over the stated thrust with nothing to cap it: fails every tier.
        assert_eq!(check(&sheet("401 g", rotors)).verdict, Verdict::Impossible);
    }

    #[test]
    fn thin_air_lowers_the_thrust_of_a_motor_class() {
        // ISA: density at 3000 m is 0.9093 / 1.2250 = 74 % of sea level.
        let low = sheet("100 g", "count = 4\nmotor = \"brushless-1103\"");
        let mut high = low.clone();
        high.conditions.altitude = Length::new::<uom::si::length::meter>(3000.0);
        let t0 = rotor_thrust(&low, Tier::Typical).unwrap();
        let t3 = rotor_thrust(&high, Tier::Typical).unwrap();
        assert!(((t3 / t0).value - 0.9093 / 1.2250).abs() < 0.01);
    }

    #[test]
    fn a_parts_list_is_added_up_and_compared_with_the_stated_mass() {
        let text = "title = \"t\"\n[craft]\nmass = \"300 g\"\n[[craft.parts]]\nname = \"frame\"\nmass = \"100 g\"\n\
                    [[craft.parts]]\nname = \"motor\"\nmass = \"30 g\"\ncount = 4\n[rotors]\ncount = 4\nmax_thrust = \"200 g\"\n";
        let c = parse(text, Format::Toml).unwrap();
        let f = check(&c);
        // 100 g + 4 x 30 g = 220 g, 26.7 % below 300 g.
        assert!(
            f.assumptions
                .iter()
                .any(|a| a.contains("220 g, 26.7 % below")),
            "{:?}",
            f.assumptions
        );
        let only_parts = text.replace("mass = \"300 g\"\n[[", "[[");
        let c = parse(&only_parts, Format::Toml).unwrap();
        assert!((c.craft.mass.get::<gram>() - 220.0).abs() < 1e-9);
    }

    #[test]
    fn a_sheet_without_thrust_class_or_power_is_not_assessed() {
        let f = check(&sheet("100 g", "count = 4\ndiameter = \"127 mm\""));
        assert_eq!(f.verdict, Verdict::NotAssessed);
        assert!(f.headline.contains("rotors.motor"));
    }

    #[test]
    fn tier_figures_never_grow_from_the_physical_limit_to_typical() {
        for m in catalog::MOTORS {
            let c = sheet("100 g", &format!("count = 4\nmotor = \"{}\"", m.id));
            let t = PerTier::from_fn(|t| rotor_thrust(&c, t).unwrap());
            assert!(
                t.physical_limit >= t.best_practice && t.best_practice >= t.typical,
                "{}",
                m.id
            );
        }
    }
}

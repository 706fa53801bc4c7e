//! Steps shared by the rules: the air and weight of a claim, the tier walk,
//! and figure builders.

use std::borrow::Cow;

use uom::si::f64::{Force, Length};

use crate::claim::Claim;
use crate::physics::atmosphere::{self, Air};
use crate::report::{Figure, Verdict};
use crate::tier::Tier;

/// The air the claim flies in: ISA at the stated altitude and temperature.
pub fn air(claim: &Claim) -> Air {
    atmosphere::isa(claim.conditions.altitude, claim.conditions.temperature)
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
}

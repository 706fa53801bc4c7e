//! Which rotors the top views draw: the placements of the control analysis
//! that came with the report ([`rules::check`](crate::rules::check)), else,
//! for a sheet the rule could not analyse, the same geometry
//! ([`geometry::placements`]) with a stand-in arm when the sheet gives none,
//! so that a preset can still be drawn (marked as not to scale). Positions
//! stay `uom` lengths here; the drawing converts them where it draws.

use std::borrow::Cow;

use uom::si::f64::Length;
use uom::si::length::millimeter;

use crate::claim::Claim;
use crate::physics::control::{Axis, Placement};
use crate::rules::control_authority::Analysis;
use crate::rules::geometry;

/// The rotors of a claim as the top views draw them.
#[derive(Debug, Clone, PartialEq)]
pub struct Plan<'a> {
    /// In body axes (x forward, y left, z up), numbered as the report numbers them.
    pub rotors: Cow<'a, [Placement]>,
    /// Propeller diameter, when the sheet or its motor class gives one.
    pub diameter: Option<Length>,
    /// The arm was not stated: distances are drawn to [`STAND_IN_ARM_MM`].
    pub arm_assumed: bool,
    /// Axes the rotors cannot command at hover, when the rule could tell.
    pub lacking: &'a [Axis],
}

/// Arm used to draw a preset layout whose sheet gives no arm.
pub const STAND_IN_ARM_MM: f64 = 100.0;

/// The rotors to draw: the analysis's where there is one; `None` when the
/// sheet does not say how they are arranged (a rotor count with no usual
/// layout and no positions).
pub fn plan<'a>(claim: &Claim, control: Option<&'a Analysis>) -> Option<Plan<'a>> {
    let rotors = &claim.rotors;
    let diameter = rotors.diameter.or(rotors.motor.map(|m| m.usual_prop()));
    if let Some(an) = control {
        return Some(Plan {
            rotors: Cow::Borrowed(&an.givens.placements),
            diameter,
            arm_assumed: false,
            lacking: &an.authority.lacking,
        });
    }
    let mut stand_in = rotors.clone();
    let arm_assumed = stand_in.arm.is_none();
    if arm_assumed {
        stand_in.arm = Some(Length::new::<millimeter>(STAND_IN_ARM_MM));
    }
    Some(Plan {
        rotors: Cow::Owned(geometry::placements(&stand_in)?),
        diameter,
        arm_assumed: arm_assumed && stand_in.count > 1,
        lacking: &[],
    })
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::claim::{self, Format, Spin};
    use uom::si::length::meter;

    fn claim_of(sheet_rotors: &str) -> Claim {
        let text = format!("title = \"t\"\n[craft]\nmass = \"300 g\"\n[rotors]\n{sheet_rotors}\n");
        claim::parse(&text, Format::Toml).unwrap()
    }

    #[test]
    fn the_plan_is_the_analysis_that_came_with_the_report() {
        for d in crate::claim::demo::DEMOS {
            let claim = claim::parse_any(d.text).unwrap();
            let checked = crate::rules::check(&claim);
            // The finding kept with the analysis is the one each rule gives on its own.
            let alone: Vec<_> = crate::rules::REGISTRY
                .iter()
                .map(|r| (r.check)(&claim))
                .collect();
            assert_eq!(checked.report.findings, alone, "{}", d.name);
            let Some(an) = checked.control.as_ref() else {
                continue;
            };
            let plan = plan(&claim, Some(an)).unwrap();
            assert!(matches!(plan.rotors, Cow::Borrowed(_)), "{}", d.name);
            assert_eq!(plan.rotors.len(), an.givens.placements.len());
            assert_eq!(plan.lacking, an.authority.lacking.as_slice());
        }
    }

    #[test]
    fn a_preset_without_an_arm_is_drawn_to_the_stand_in_arm_and_flagged() {
        let claim = claim_of("layout = \"side-by-side\"\nspins = [\"ccw\", \"cw\"]");
        let plan = plan(&claim, None).unwrap();
        assert!(plan.arm_assumed);
        let y = |i: usize| plan.rotors[i].y.get::<meter>();
        assert!((y(0) + STAND_IN_ARM_MM / 1000.0).abs() < 1e-9);
        assert!(y(1) > 0.0);
        assert_eq!(plan.rotors[0].spin, Spin::Ccw);
    }

    #[test]
    fn a_count_with_no_usual_layout_is_not_placed() {
        assert!(plan(&claim_of("count = 5"), None).is_none());
    }

    #[test]
    fn custom_positions_are_kept() {
        let claim = claim_of(
            "layout = \"custom\"\ncount = 2\n\
             [[rotors.at]]\nx = \"30 mm\"\ny = \"0 mm\"\nz = \"0 mm\"\nspin = \"ccw\"\n\
             [[rotors.at]]\nx = \"-30 mm\"\ny = \"10 mm\"\nz = \"0 mm\"\nspin = \"ccw\"",
        );
        let plan = plan(&claim, None).unwrap();
        let r = plan.rotors[1];
        assert!(
            (r.x.get::<meter>() + 0.03).abs() < 1e-9 && (r.y.get::<meter>() - 0.01).abs() < 1e-9
        );
        assert!(plan.rotors.iter().all(|r| r.spin == Spin::Ccw));
    }
}

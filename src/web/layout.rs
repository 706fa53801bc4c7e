//! Where the rotors sit, seen from above, for the layout figure.
//!
//! The geometry is the control-authority rule's ([`physics::control::placements`]
//! and [`control_authority::layout_view`]): rotor i at azimuth clockwise from
//! the nose, as Du, Quan, Yang and Cai (2015) number their hexacopter, in body
//! axes of ROS REP 103 (x forward, y left, z up). This module only adapts it
//! for drawing: metres, a flag for tilting rotors, the axes the rotors cannot
//! command, and a stand-in arm when the sheet gives none so a preset can
//! still be drawn (marked as not to scale).

use uom::si::f64::Length;
use uom::si::length::{meter, millimeter};

use crate::claim::{Claim, Spin};
use crate::physics::control::{self, Axis};
use crate::rules::control_authority::{self, LayoutView};

/// One rotor in body axes, metres.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Placed {
    /// Forward of the centre of mass.
    pub x: f64,
    /// Left of the centre of mass.
    pub y: f64,
    /// Above the centre of mass (a coaxial pair differs only here).
    pub z: f64,
    pub spin: Spin,
    /// Has a tilt actuator (a tilting mount, a tricopter's tail servo).
    pub tilts: bool,
}

/// The rotors of a claim, placed.
#[derive(Debug, Clone, PartialEq)]
pub struct Plan {
    pub rotors: Vec<Placed>,
    /// Propeller diameter, metres, when the sheet or its motor class gives one.
    pub diameter: Option<f64>,
    /// The arm was not stated: distances are drawn to [`STAND_IN_ARM_MM`].
    pub arm_assumed: bool,
    /// Axes the rotors cannot command at hover, when the rule could tell.
    pub lacking: Vec<Axis>,
}

/// Arm used to draw a preset layout whose sheet gives no arm.
pub const STAND_IN_ARM_MM: f64 = 100.0;

/// Places the rotors of a claim; `None` when the sheet does not say how they
/// are arranged (a rotor count with no usual layout and no positions).
/// `checked` is the view the control-authority rule gave with the report
/// ([`rules::run_all_with_layout`](crate::rules::run_all_with_layout));
/// without it the rule's analysis runs here.
pub fn plan(claim: &Claim, checked: Option<&LayoutView>) -> Option<Plan> {
    let rotors = &claim.rotors;
    let diameter = rotors
        .diameter
        .or(rotors.motor.map(|m| m.usual_prop()))
        .map(|d| d.get::<meter>());
    let analysed;
    let view = match checked {
        Some(view) => Some(view),
        None => {
            analysed = control_authority::layout_view(claim, &[]);
            analysed.as_ref()
        }
    };
    if let Some(view) = view {
        return Some(Plan {
            rotors: view
                .rotors
                .iter()
                .map(|r| Placed {
                    x: r.x_mm / 1000.0,
                    y: r.y_mm / 1000.0,
                    z: r.z_mm / 1000.0,
                    spin: if r.spin == "ccw" { Spin::Ccw } else { Spin::Cw },
                    tilts: r.tilts,
                })
                .collect(),
            diameter,
            arm_assumed: false,
            lacking: view.lacking.clone(),
        });
    }
    let mut stand_in = rotors.clone();
    let arm_assumed = stand_in.arm.is_none();
    if arm_assumed {
        stand_in.arm = Some(Length::new::<millimeter>(STAND_IN_ARM_MM));
    }
    let placements = control::placements(&stand_in)?;
    Some(Plan {
        rotors: placements
            .iter()
            .map(|p| Placed {
                x: p.x.get::<meter>(),
                y: p.y.get::<meter>(),
                z: p.z.get::<meter>(),
                spin: p.spin,
                tilts: p.tilt.is_some(),
            })
            .collect(),
        diameter,
        arm_assumed: arm_assumed && stand_in.count > 1,
        lacking: Vec::new(),
    })
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::claim::{self, Format};

    fn plan_of(claim: &Claim) -> Option<Plan> {
        plan(claim, None)
    }

    #[test]
    fn the_view_the_rule_gives_with_the_report_plans_as_the_rule_run_here_does() {
        for d in crate::claim::demo::DEMOS {
            let claim = claim::parse_any(d.text).unwrap();
            let (report, view) = crate::rules::run_all_with_layout(&claim);
            assert_eq!(report, crate::rules::run_all(&claim), "{}", d.name);
            assert_eq!(
                view,
                control_authority::layout_view(&claim, &[]),
                "{}",
                d.name
            );
            assert_eq!(plan(&claim, view.as_ref()), plan_of(&claim), "{}", d.name);
        }
    }

    fn claim_of(sheet_rotors: &str) -> Claim {
        let text = format!("title = \"t\"\n[craft]\nmass = \"300 g\"\n[rotors]\n{sheet_rotors}\n");
        claim::parse(&text, Format::Toml).unwrap()
    }

    #[test]
    fn a_quad_x_puts_each_rotor_on_a_diagonal_at_arm_over_root_two() {
        // Plane geometry: a point at distance d and azimuth 45 deg has both
        // coordinates d / sqrt(2); rotor 1 is front right (y negative, REP 103).
        let plan = plan_of(&claim_of("layout = \"quad-x\"\narm = \"100 mm\"")).unwrap();
        let s = 0.1 / 2f64.sqrt();
        let expect = [(s, -s), (-s, -s), (-s, s), (s, s)];
        assert_eq!(plan.rotors.len(), 4);
        for (r, (x, y)) in plan.rotors.iter().zip(expect) {
            assert!((r.x - x).abs() < 1e-9 && (r.y - y).abs() < 1e-9, "{r:?}");
        }
        assert!(!plan.arm_assumed);
    }

    #[test]
    fn a_preset_without_an_arm_is_drawn_to_the_stand_in_arm_and_flagged() {
        let plan = plan_of(&claim_of(
            "layout = \"side-by-side\"\nspins = [\"ccw\", \"cw\"]",
        ))
        .unwrap();
        assert!(plan.arm_assumed);
        assert!((plan.rotors[0].y + STAND_IN_ARM_MM / 1000.0).abs() < 1e-9);
        assert!(plan.rotors[1].y > 0.0);
        assert_eq!(plan.rotors[0].spin, Spin::Ccw);
    }

    #[test]
    fn a_count_with_no_usual_layout_is_not_placed() {
        assert!(plan_of(&claim_of("count = 5")).is_none());
    }

    #[test]
    fn a_quad_that_loses_any_rotor_cannot_hold_hover() {
        // Du, Quan, Yang, Cai (2015): a quadrotor that loses any rotor has ACAI < 0.
        let claim = claim_of(
            "layout = \"quad-x\"\narm = \"225 mm\"\ndiameter = \"10 in\"\nmax_thrust = \"600 g\"",
        );
        let (rotor, acai) = control_authority::worst_single_loss(&claim).unwrap();
        assert!((1..=4).contains(&rotor));
        assert!(acai[2] < 0.0, "{acai:?}");
    }

    #[test]
    fn custom_positions_are_kept() {
        let plan = plan_of(&claim_of(
            "layout = \"custom\"\ncount = 2\n\
             [[rotors.at]]\nx = \"30 mm\"\ny = \"0 mm\"\nz = \"0 mm\"\nspin = \"ccw\"\n\
             [[rotors.at]]\nx = \"-30 mm\"\ny = \"10 mm\"\nz = \"0 mm\"\nspin = \"ccw\"",
        ))
        .unwrap();
        assert!((plan.rotors[1].x + 0.03).abs() < 1e-9 && (plan.rotors[1].y - 0.01).abs() < 1e-9);
        assert!(plan.rotors.iter().all(|r| r.spin == Spin::Ccw));
    }
}

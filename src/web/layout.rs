//! Where the rotors sit, seen from above, for the layout figure.
//!
//! Body axes follow ROS REP 103 (x forward, y left, z up); spins are as seen
//! from above. Preset layouts number their rotors the way Du, Quan, Yang and
//! Cai (2015) number their hexacopter: rotor i at azimuth
//! `offset + (i - 1) 360 deg / n`, azimuth measured from the nose turning
//! clockwise seen from above (towards the right side). A sheet's `spins` list
//! follows that order; without one, spins alternate cw, ccw, ... from rotor 1.
//!
//! This is drawing geometry only; the control-authority rule owns the
//! physics of rotor placement and may replace this module.

use uom::si::length::meter;

use crate::claim::{Layout, Rotors, Spin};

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
}

/// The rotors of a claim, placed.
#[derive(Debug, Clone, PartialEq)]
pub struct Plan {
    pub rotors: Vec<Placed>,
    /// Propeller diameter, metres, when the sheet or its motor class gives one.
    pub diameter: Option<f64>,
    /// The arm was not stated (presets only): distances are drawn to a unit arm.
    pub arm_assumed: bool,
}

/// Arm used to draw a preset layout whose sheet gives no arm, metres.
const UNIT_ARM: f64 = 0.1;

/// Azimuth of rotor 1 from the nose, degrees, by layout: quad-x puts rotor 1
/// front-right, a tri has two front arms and a tail, side-by-side starts on
/// the right.
fn first_azimuth(layout: Option<Layout>, count: u32) -> f64 {
    match layout {
        Some(Layout::QuadX) => 45.0,
        Some(Layout::Tri) => 60.0,
        Some(Layout::SideBySide) => 90.0,
        Some(Layout::Octo) => 22.5,
        _ if count == 2 => 90.0,
        _ => 0.0,
    }
}

/// The spin of rotor `i` (0-based) when the sheet gives none.
fn usual_spin(i: usize) -> Spin {
    if i.is_multiple_of(2) {
        Spin::Cw
    } else {
        Spin::Ccw
    }
}

/// Places the rotors of a claim.
pub fn plan(rotors: &Rotors) -> Plan {
    let diameter = rotors
        .diameter
        .or(rotors.motor.map(|m| m.usual_prop()))
        .map(|d| d.get::<meter>());
    let spin_of = |i: usize| {
        rotors
            .spins
            .as_ref()
            .and_then(|s| s.get(i).copied())
            .unwrap_or_else(|| usual_spin(i))
    };

    if rotors.layout == Some(Layout::Custom) && !rotors.at.is_empty() {
        let placed = rotors
            .at
            .iter()
            .map(|r| Placed {
                x: r.x.get::<meter>(),
                y: r.y.get::<meter>(),
                z: r.z.get::<meter>(),
                spin: r.spin,
            })
            .collect();
        return Plan {
            rotors: placed,
            diameter,
            arm_assumed: false,
        };
    }

    let arm = rotors.arm.map(|a| a.get::<meter>());
    let arm_assumed = arm.is_none() && rotors.count > 1;
    let arm = arm.unwrap_or(UNIT_ARM);
    let count = rotors.count.max(1) as usize;
    let placed = match rotors.layout {
        Some(Layout::Single) => vec![at_centre(0.0, spin_of(0))],
        Some(Layout::Coaxial) => {
            // The upper rotor first; the pair shares one axis.
            let gap = diameter.unwrap_or(UNIT_ARM) * 0.2;
            (0..count)
                .map(|i| at_centre(-(i as f64) * gap, spin_of(i)))
                .collect()
        }
        layout => {
            let start = first_azimuth(layout, count as u32);
            (0..count)
                .map(|i| {
                    let azimuth = (start + i as f64 * 360.0 / count as f64).to_radians();
                    Placed {
                        x: arm * azimuth.cos(),
                        // Clockwise from above turns toward the right, which is -y.
                        y: -arm * azimuth.sin(),
                        z: rotors.height.get::<meter>(),
                        spin: spin_of(i),
                    }
                })
                .collect()
        }
    };
    Plan {
        rotors: placed,
        diameter,
        arm_assumed,
    }
}

fn at_centre(z: f64, spin: Spin) -> Placed {
    Placed {
        x: 0.0,
        y: 0.0,
        z,
        spin,
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::claim::{self, Format};

    fn rotors_of(sheet_rotors: &str) -> Rotors {
        let text = format!("title = \"t\"\n[craft]\nmass = \"300 g\"\n[rotors]\n{sheet_rotors}\n");
        claim::parse(&text, Format::Toml).unwrap().rotors
    }

    #[test]
    fn a_quad_x_puts_each_rotor_on_a_diagonal_at_arm_over_root_two() {
        // Plane geometry: a point at distance d and azimuth 45 deg has both
        // coordinates d / sqrt(2).
        let plan = plan(&rotors_of("layout = \"quad-x\"\narm = \"100 mm\""));
        let s = 0.1 / 2f64.sqrt();
        let expect = [(s, -s), (-s, -s), (-s, s), (s, s)];
        assert_eq!(plan.rotors.len(), 4);
        for (r, (x, y)) in plan.rotors.iter().zip(expect) {
            assert!((r.x - x).abs() < 1e-12 && (r.y - y).abs() < 1e-12, "{r:?}");
        }
        let spins: Vec<Spin> = plan.rotors.iter().map(|r| r.spin).collect();
        assert_eq!(spins, [Spin::Cw, Spin::Ccw, Spin::Cw, Spin::Ccw]);
        assert!(!plan.arm_assumed);
    }

    #[test]
    fn the_hexacopter_follows_the_du_2015_azimuths_from_the_nose_clockwise() {
        // Du, Quan, Yang, Cai (2015): rotor i at azimuth (i-1) x 60 deg from the nose.
        let plan = plan(&rotors_of("layout = \"hex\"\narm = \"275 mm\""));
        assert!((plan.rotors[0].x - 0.275).abs() < 1e-12 && plan.rotors[0].y.abs() < 1e-12);
        // Rotor 2 is 60 deg clockwise from above: forward and to the right.
        assert!(plan.rotors[1].x > 0.0 && plan.rotors[1].y < 0.0);
        assert!((plan.rotors[3].x + 0.275).abs() < 1e-12);
    }

    #[test]
    fn stated_spins_and_custom_positions_are_kept() {
        let plan = plan(&rotors_of(
            "layout = \"custom\"\ncount = 2\n\
             [[rotors.at]]\nx = \"30 mm\"\ny = \"0 mm\"\nz = \"0 mm\"\nspin = \"ccw\"\n\
             [[rotors.at]]\nx = \"-30 mm\"\ny = \"10 mm\"\nz = \"0 mm\"\nspin = \"ccw\"",
        ));
        assert_eq!(plan.rotors.len(), 2);
        assert!((plan.rotors[1].x + 0.03).abs() < 1e-12 && (plan.rotors[1].y - 0.01).abs() < 1e-12);
        assert!(plan.rotors.iter().all(|r| r.spin == Spin::Ccw));
    }

    #[test]
    fn a_side_by_side_pair_sits_left_and_right_and_an_unstated_arm_is_flagged() {
        let plan = plan(&rotors_of(
            "layout = \"side-by-side\"\nspins = [\"ccw\", \"cw\"]",
        ));
        assert!(plan.arm_assumed);
        assert!(plan.rotors[0].y < 0.0 && plan.rotors[1].y > 0.0);
        assert!(plan.rotors.iter().all(|r| r.x.abs() < 1e-12));
        assert_eq!(plan.rotors[0].spin, Spin::Ccw);
    }
}

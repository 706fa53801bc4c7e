//! Where the rotors sit: the sheet's layout preset or its `[[rotors.at]]`
//! read into the plain geometry of [`physics::control`](crate::physics::control)
//! (hub positions, spins, tilt hinges), the one rotor geometry every rule and
//! drawing uses.
//!
//! Body axes follow ROS REP 103 (x forward, y left, z up) with the origin at
//! the centre of mass. Preset rotors are numbered clockwise seen from above,
//! starting at the nose or the first rotor clockwise from it: rotor i sits at
//! azimuth `az` measured clockwise from the nose, x = arm cos(az),
//! y = -arm sin(az), as Du, Quan, Yang and Cai (2015) number their hexacopter.

use uom::si::angle::degree;
use uom::si::f64::{Angle, Length};
use uom::si::length::meter;

use crate::catalog::tiers::TRI_SERVO_RANGE;
use crate::claim::{Claim, Layout, Mount, Rotors, Spin};
use crate::physics::control::{self, Placement, Tilt};
use crate::tier::Tier;

/// The tilt either way of a tricopter's yaw servo when the sheet gives no `tilt_range`.
pub fn tri_servo_range() -> Angle {
    Angle::new::<degree>(TRI_SERVO_RANGE.at(Tier::Typical))
}

/// Where each rotor sits, how it spins and how it tilts, from the layout preset
/// (with `arm`, `height` and the usual spins or the sheet's `spins`) or from
/// `[[rotors.at]]` for a custom layout (each `z` measured from the rotor plane
/// `height`). A tilting mount hinges each rotor about its arm (about body y for
/// a rotor on the centre, about x for the second of a coaxial pair); a
/// tricopter's tail rotor always has its yaw servo, hinged about its arm.
/// `None` when the layout is unknown or a preset needs the arm and has none.
pub fn placements(rotors: &Rotors) -> Option<Vec<Placement>> {
    use Spin::{Ccw, Cw};
    let layout = rotors.layout?;
    let tilting = rotors.mount == Mount::Tilting;
    let tilt = |hinge, range: Option<Angle>| Some(Tilt::new(hinge, range?));
    let h = rotors.height;
    if layout == Layout::Custom {
        if rotors.at.is_empty() {
            return None;
        }
        let placed = rotors.at.iter().map(|at| {
            let hinge = at
                .tilt_axis
                .or(tilting.then(|| arm_hinge(at.x, at.y, false)));
            Placement {
                x: at.x,
                y: at.y,
                z: at.z + h,
                spin: at.spin,
                tilt: hinge.and_then(|g| tilt(g, at.tilt_range.or(rotors.tilt_range))),
            }
        });
        return Some(placed.collect());
    }
    // Azimuths in degrees, clockwise from the nose seen from above.
    let ring = |n: usize, first: f64| -> Vec<f64> {
        (0..n)
            .map(|i| first + i as f64 * 360.0 / n as f64)
            .collect()
    };
    let centre = Length::new::<meter>(0.0);
    let (azimuths, arm) = match layout {
        Layout::Single => (vec![0.0], centre),
        Layout::Coaxial => (vec![0.0; 2], centre),
        Layout::SideBySide => (vec![90.0, 270.0], rotors.arm?),
        Layout::Tri => (ring(3, 60.0), rotors.arm?),
        Layout::QuadX => (ring(4, 45.0), rotors.arm?),
        Layout::QuadPlus => (ring(4, 0.0), rotors.arm?),
        Layout::Hex => (ring(6, 0.0), rotors.arm?),
        Layout::Octo => (ring(8, 0.0), rotors.arm?),
        Layout::Custom => return None,
    };
    let spins = match (&rotors.spins, layout) {
        (Some(s), _) => s.clone(),
        (None, Layout::Tri) => vec![Cw, Cw, Ccw],
        (None, _) => (0..azimuths.len()).map(|i| [Cw, Ccw][i % 2]).collect(),
    };
    if spins.len() != azimuths.len() {
        return None;
    }
    let placed = azimuths
        .iter()
        .zip(spins)
        .enumerate()
        .map(|(i, (az, spin))| {
            let (x, y) = (arm * az.to_radians().cos(), -arm * az.to_radians().sin());
            let hinge = arm_hinge(x, y, i == 1);
            let tri_tail = layout == Layout::Tri && i == 1;
            Placement {
                x,
                y,
                z: h,
                spin,
                tilt: match (tilting, tri_tail) {
                    (true, _) => tilt(hinge, rotors.tilt_range),
                    (false, true) => tilt(hinge, rotors.tilt_range.or(Some(tri_servo_range()))),
                    (false, false) => None,
                },
            }
        });
    Some(placed.collect())
}

/// The unit hinge along the arm from the centre to (x, y); on the centre, body y
/// (or x for the `second` rotor of a coaxial pair, making a two-axis gimbal).
fn arm_hinge(x: Length, y: Length, second: bool) -> [f64; 3] {
    let (x, y) = (x.get::<meter>(), y.get::<meter>());
    let r = x.hypot(y);
    match (r > 0.0, second) {
        (true, _) => [x / r, y / r, 0.0],
        (false, false) => [0.0, 1.0, 0.0],
        (false, true) => [1.0, 0.0, 0.0],
    }
}

/// The body tilt a tilting mount takes out by tilting its rotors back, as the
/// tilt-equilibrium rule counts it: the claimed hover tilt, up to the mount's
/// `tilt_range`; zero for a fixed mount or a level hover.
pub fn held_body_tilt(claim: &Claim) -> Angle {
    let r = &claim.rotors;
    match (r.mount, r.tilt_range, claim.claim.hover_tilt) {
        (Mount::Tilting, Some(range), Some(tilt)) => range.min(tilt),
        _ => Angle::new::<degree>(0.0),
    }
}

/// The placements with each tilting rotor holding its share of a body pitched
/// nose down by `pitch` ([`control::hold_angle`], within its own range), so that
/// only the rest of each range is left for control.
pub fn holding(placements: Vec<Placement>, pitch: Angle) -> Vec<Placement> {
    placements
        .into_iter()
        .map(|mut p| {
            if let Some(t) = p.tilt.as_mut() {
                t.held = control::hold_angle(t.hinge, pitch, t.range);
            }
            p
        })
        .collect()
}

#[cfg(test)]
mod tests {
    use super::*;
    use uom::si::f64::Force;
    use uom::si::force::newton;

    use crate::claim::RotorAt;
    use crate::physics::control::{authority, effectiveness, hover_acai, Axis, Hover};

    fn mm(v: f64) -> Length {
        Length::new::<uom::si::length::millimeter>(v)
    }

    fn rotors(layout: Layout, count: u32, arm: f64) -> Rotors {
        Rotors {
            count,
            layout: Some(layout),
            arm: Some(mm(arm)),
            diameter: Some(mm(127.0)),
            mount: Mount::Fixed,
            tilt_range: None,
            height: mm(0.0),
            motor: None,
            drive: None,
            max_thrust: None,
            max_thrust_from_mass: false,
            max_power: None,
            spins: None,
            at: Vec::new(),
        }
    }

    #[test]
    fn a_quad_x_puts_each_rotor_on_a_diagonal_at_arm_over_root_two() {
        // Plane geometry: a point at distance d and azimuth 45 deg has both
        // coordinates d / sqrt(2); rotor 1 is front right (y negative, REP 103).
        let p = placements(&rotors(Layout::QuadX, 4, 100.0)).unwrap();
        let s = 100.0 / 2f64.sqrt();
        let expect = [(s, -s), (-s, -s), (-s, s), (s, s)];
        for (r, (x, y)) in p.iter().zip(expect) {
            assert!((r.x - mm(x)).abs() < mm(1e-9) && (r.y - mm(y)).abs() < mm(1e-9));
        }
        assert_eq!(
            p.iter().map(|r| r.spin).collect::<Vec<_>>(),
            [Spin::Cw, Spin::Ccw, Spin::Cw, Spin::Ccw]
        );
    }

    #[test]
    fn du_2015_alternating_hexacopter_from_the_hex_preset_has_acai_1_4861() {
        // du-2015, example hexacopter: m = 1.535 kg, g = 9.80, arm 0.275 m, 0..6.125 N,
        // k = 0.1 m, spins P N P N P N: ACAI = 1.4861 intact, 0 with any one rotor lost.
        let hex = placements(&rotors(Layout::Hex, 6, 275.0)).unwrap();
        let hover = Hover {
            weight: Force::new::<newton>(1.535 * 9.80),
            rotor_thrust: Force::new::<newton>(6.125),
            torque_ratio: Length::new::<meter>(0.1),
        };
        let intact = hover_acai(&hex, &hover, &[]);
        assert!((intact - 1.4861).abs() < 1e-3, "{intact}");
        for lost in 0..6 {
            assert!(hover_acai(&hex, &hover, &[lost]).abs() < 1e-3);
        }
    }

    #[test]
    fn a_tilting_side_by_side_pair_hinges_about_body_y() {
        // DESIGN rule 5: a bicopter's rotors tilt fore and aft on hinges along their arms.
        let mut r = rotors(Layout::SideBySide, 2, 70.0);
        r.mount = Mount::Tilting;
        r.tilt_range = Some(Angle::new::<degree>(30.0));
        let p = placements(&r).unwrap();
        for rotor in &p {
            let hinge = rotor.tilt.unwrap().hinge;
            assert!(hinge[1].abs() > 1.0 - 1e-12, "{hinge:?}");
        }
        // Fixed: rank 2, roll and yaw on one input (DESIGN rule 5).
        let fixed = placements(&rotors(Layout::SideBySide, 2, 70.0)).unwrap();
        let a = authority(&effectiveness(&fixed, Force::new::<newton>(1.5), mm(3.0)).matrix);
        assert_eq!(
            (a.rank, a.tied.as_slice()),
            (2, [Axis::Roll, Axis::Yaw].as_slice())
        );
    }

    #[test]
    fn a_tricopter_has_its_yaw_servo_on_the_tail_by_default() {
        // Common practice: a tricopter's tail servo swings about 30 deg either way.
        let tri = placements(&rotors(Layout::Tri, 3, 250.0)).unwrap();
        assert!(tri[0].tilt.is_none() && tri[2].tilt.is_none());
        let servo = tri[1].tilt.unwrap();
        assert!((servo.range.get::<degree>() - 30.0).abs() < 1e-9);
        // The tail at azimuth 180 deg: x = -250 mm, hinge along -x.
        assert!((tri[1].x + mm(250.0)).abs() < mm(1e-9));
        assert!((servo.hinge[0] + 1.0).abs() < 1e-12);
    }

    #[test]
    fn a_custom_layout_places_rotors_from_the_sheet_above_the_rotor_plane() {
        let mut r = rotors(Layout::Custom, 2, 0.0);
        r.arm = None;
        r.height = mm(20.0);
        r.at = vec![
            RotorAt {
                x: mm(0.0),
                y: mm(80.0),
                z: mm(5.0),
                spin: Spin::Ccw,
                tilt_axis: Some([0.0, 1.0, 0.0]),
                tilt_range: Some(Angle::new::<degree>(20.0)),
            },
            RotorAt {
                x: mm(0.0),
                y: mm(-80.0),
                z: mm(5.0),
                spin: Spin::Cw,
                tilt_axis: None,
                tilt_range: None,
            },
        ];
        let p = placements(&r).unwrap();
        assert!((p[0].z - mm(25.0)).abs() < mm(1e-9));
        assert!(p[0].tilt.is_some() && p[1].tilt.is_none());
        // One tilting rotor of two: thrust, roll, pitch (through the height), yaw (tied): rank 3.
        let a = authority(&effectiveness(&p, Force::new::<newton>(1.0), mm(2.0)).matrix);
        assert_eq!(a.rank, 3);
    }

    #[test]
    fn a_preset_without_its_arm_or_an_unknown_layout_has_no_placements() {
        let mut r = rotors(Layout::QuadX, 4, 100.0);
        r.arm = None;
        assert!(placements(&r).is_none());
        r.layout = None;
        assert!(placements(&r).is_none());
        let mut single = rotors(Layout::Single, 1, 0.0);
        single.arm = None;
        assert_eq!(placements(&single).unwrap().len(), 1);
        let mut wrong_spins = rotors(Layout::QuadX, 4, 100.0);
        wrong_spins.spins = Some(vec![Spin::Cw; 3]);
        assert!(placements(&wrong_spins).is_none());
    }

    #[test]
    fn a_tilting_mount_holds_the_claimed_body_tilt_up_to_its_range() {
        // As the tilt-equilibrium rule counts it: rotors tilt back by the body tilt,
        // at most their range; a fixed mount holds none.
        let sheet = |mount: &str, tilt: &str| {
            let text = format!(
                "title = \"t\"\n[craft]\nmass = \"250 g\"\n[rotors]\ncount = 2\nlayout = \"side-by-side\"\narm = \"120 mm\"\n{mount}\n[claim]\nhover_tilt = \"{tilt}\""
            );
            crate::claim::parse(&text, crate::claim::Format::Toml).unwrap()
        };
        let tilting = "mount = \"tilting\"\ntilt_range = \"30 deg\"";
        let held = |c: &Claim| held_body_tilt(c).get::<degree>();
        assert!((held(&sheet(tilting, "20 deg")) - 20.0).abs() < 1e-9);
        assert!((held(&sheet(tilting, "40 deg")) - 30.0).abs() < 1e-9);
        assert_eq!(held(&sheet("mount = \"fixed\"", "20 deg")), 0.0);
        // Statics: a rotor hinged about -y (rotor 1, on the right) tilts +20 deg to hold it.
        let c = sheet(tilting, "20 deg");
        let p = holding(placements(&c.rotors).unwrap(), held_body_tilt(&c));
        let t = p[0].tilt.unwrap();
        assert!(t.hinge[1] < 0.0 && (t.held.get::<degree>() - 20.0).abs() < 1e-9);
    }
}

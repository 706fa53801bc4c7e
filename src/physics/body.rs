//! Rigid-body statics and rotation, sources `statics` and `rigid-body`.

use uom::si::f64::{
    Acceleration, Angle, AngularAcceleration, Force, Length, Mass, MomentOfInertia, Time, Torque,
};

/// Sideways acceleration of a tilted thrust that holds the weight, a = g tan(theta) (`statics`).
pub fn tilt_acceleration(gravity: Acceleration, tilt: Angle) -> Acceleration {
    gravity * tilt.tan()
}

/// Moment of inertia of a solid box about an axis through its centre,
/// I = m (a^2 + b^2) / 12 with a, b the sides across the axis (`rigid-body`).
pub fn box_inertia(mass: Mass, a: Length, b: Length) -> MomentOfInertia {
    mass * (a * a + b * b) / 12.0
}

/// Moment of inertia of a point mass at a distance d from the axis, I = m d^2 (`rigid-body`).
pub fn point_inertia(mass: Mass, distance: Length) -> MomentOfInertia {
    mass * distance * distance
}

/// Angular acceleration from rest of a body whose principal axes are the body
/// x and y axes, under a moment (M_x, M_y): alpha = |(M_x / I_xx, M_y / I_yy)|
/// (Euler's equations at zero rate, `rigid-body`).
pub fn tip_acceleration(
    roll_moment: Torque,
    pitch_moment: Torque,
    roll_inertia: MomentOfInertia,
    pitch_inertia: MomentOfInertia,
) -> AngularAcceleration {
    let ax: AngularAcceleration = (roll_moment / roll_inertia).into();
    let ay: AngularAcceleration = (pitch_moment / pitch_inertia).into();
    // The two components are at right angles: the magnitude is their hypotenuse (SI values).
    AngularAcceleration::new::<uom::si::angular_acceleration::radian_per_second_squared>(
        ax.value.hypot(ay.value),
    )
}

/// The thrust tilt from vertical whose sideways part balances a horizontal
/// force while its vertical part holds the weight, theta = atan(F / W) (`statics`).
pub fn tilt_to_balance(weight: Force, sideways: Force) -> Angle {
    Angle::new::<uom::si::angle::radian>(sideways.value.atan2(weight.value))
}

/// Pitch moment about the centre of mass (positive nose down) of a rotor
/// thrust T tilted back by beta relative to the body on a hinge line at height h
/// above the centre of mass, with the centre of mass c ahead of that line:
/// M = T (c cos(beta) - h sin(beta)), whatever the body's own tilt (`statics`).
pub fn tilted_rotor_pitch_moment(
    thrust: Force,
    height: Length,
    cg_ahead: Length,
    tilt_back: Angle,
) -> Torque {
    (thrust * (cg_ahead * tilt_back.cos() - height * tilt_back.sin())).into()
}

/// The centre-of-mass offset ahead of the hinge line that balances that
/// moment, c = h tan(beta): the thrust line then passes through the centre of mass (`statics`).
pub fn cg_offset_for_balance(height: Length, tilt_back: Angle) -> Length {
    height * tilt_back.tan()
}

/// Angular acceleration from a moment, alpha = M / I (`rigid-body`).
pub fn angular_acceleration(moment: Torque, inertia: MomentOfInertia) -> AngularAcceleration {
    (moment / inertia).into()
}

/// Time to turn through an angle from rest at constant alpha, t = sqrt(2 theta / alpha) (`rigid-body`).
pub fn time_to_turn(angle: Angle, alpha: AngularAcceleration) -> Time {
    (angle * 2.0 / alpha).sqrt()
}

#[cfg(test)]
mod tests {
    use super::*;
    use uom::si::{
        acceleration::meter_per_second_squared, angle::degree,
        angular_acceleration::radian_per_second_squared, length::meter, mass::kilogram,
        moment_of_inertia::kilogram_square_meter, time::second, torque::newton_meter,
    };

    #[test]
    fn a_thirty_degree_tilt_accelerates_at_5_66_metres_per_second_squared() {
        // Statics (DESIGN check values): g tan(30 deg) = 9.80665 x 0.57735 = 5.66 m/s^2.
        let a = tilt_acceleration(
            Acceleration::new::<meter_per_second_squared>(9.806_65),
            Angle::new::<degree>(30.0),
        );
        assert!((a.get::<meter_per_second_squared>() - 5.66).abs() < 0.005);
    }

    #[test]
    fn a_box_has_the_textbook_moment_of_inertia() {
        // I = m (a^2 + b^2) / 12: 12 kg, 1 m x 2 m -> 5 kg m^2.
        let i = box_inertia(
            Mass::new::<kilogram>(12.0),
            Length::new::<meter>(1.0),
            Length::new::<meter>(2.0),
        );
        assert!((i.get::<kilogram_square_meter>() - 5.0).abs() < 1e-12);
    }

    #[test]
    fn a_point_mass_has_the_textbook_moment_of_inertia() {
        // I = m d^2 (any mechanics text): 0.03 kg at 0.2 m -> 1.2e-3 kg m^2.
        let i = point_inertia(Mass::new::<kilogram>(0.03), Length::new::<meter>(0.2));
        assert!((i.get::<kilogram_square_meter>() - 1.2e-3).abs() < 1e-15);
    }

    #[test]
    fn a_moment_across_unequal_axes_tips_by_each_axis_inertia() {
        // Worked by hand: M = (3, 4) N m on I = (1, 2) kg m^2 -> alpha = (3, 2), |alpha| = sqrt 13.
        let a = tip_acceleration(
            Torque::new::<newton_meter>(3.0),
            Torque::new::<newton_meter>(4.0),
            MomentOfInertia::new::<kilogram_square_meter>(1.0),
            MomentOfInertia::new::<kilogram_square_meter>(2.0),
        );
        assert!((a.get::<radian_per_second_squared>() - 13f64.sqrt()).abs() < 1e-12);
    }

    #[test]
    fn the_tilt_that_balances_a_force_equal_to_the_weight_is_45_degrees() {
        // Statics: tan(theta) = F / W = 1 -> 45 deg.
        let w = Force::new::<uom::si::force::newton>(2.0);
        let theta = tilt_to_balance(w, w);
        assert!((theta.get::<degree>() - 45.0).abs() < 1e-12);
    }

    #[test]
    fn a_rotor_tilted_back_above_the_centre_of_mass_pitches_the_nose_up_unless_the_mass_sits_ahead()
    {
        // Statics, worked by hand: T = 2 N, h = 40 mm, beta = 20 deg, c = 0:
        // M = -2 x 0.04 x sin 20 deg = -0.02736 N m (nose up); c = h tan 20 deg = 14.56 mm balances it.
        let t = Force::new::<uom::si::force::newton>(2.0);
        let h = Length::new::<meter>(0.04);
        let beta = Angle::new::<degree>(20.0);
        let m = tilted_rotor_pitch_moment(t, h, Length::new::<meter>(0.0), beta);
        assert!((m.get::<newton_meter>() + 0.027_36).abs() < 1e-5);
        let c = cg_offset_for_balance(h, beta);
        assert!((c.get::<meter>() - 0.014_559).abs() < 1e-6);
        let balanced = tilted_rotor_pitch_moment(t, h, c, beta);
        assert!(balanced.get::<newton_meter>().abs() < 1e-15);
    }

    #[test]
    fn turning_half_a_radian_at_one_radian_per_second_squared_takes_one_second() {
        // theta = alpha t^2 / 2 -> t = sqrt(2 x 0.5 / 1) = 1 s.
        let alpha = angular_acceleration(
            Torque::new::<newton_meter>(2.0),
            MomentOfInertia::new::<kilogram_square_meter>(2.0),
        );
        assert!((alpha.get::<radian_per_second_squared>() - 1.0).abs() < 1e-12);
        let t = time_to_turn(Angle::new::<uom::si::angle::radian>(0.5), alpha);
        assert!((t.get::<second>() - 1.0).abs() < 1e-12);
    }
}

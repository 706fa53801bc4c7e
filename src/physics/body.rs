//! Rigid-body statics and rotation, sources `statics` and `rigid-body`.

use uom::si::f64::{
    Acceleration, Angle, AngularAcceleration, Length, Mass, MomentOfInertia, Time, Torque,
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

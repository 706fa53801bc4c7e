//! Aerodynamic drag of a bluff body, source `hoerner-1965`, and of a rotor
//! moving edgewise through the air, source `rotor-drag`.

use uom::si::f64::{Area, Force, MassDensity, Velocity};

/// Drag F = 1/2 rho v^2 Cd A (`hoerner-1965`).
pub fn drag_force(density: MassDensity, speed: Velocity, cd: f64, area: Area) -> Force {
    density * speed * speed * area * (0.5 * cd)
}

/// The airspeed whose drag equals a force, v = sqrt(2 F / (rho Cd A)) (`hoerner-1965`).
pub fn speed_for_drag(force: Force, density: MassDensity, cd: f64, area: Area) -> Velocity {
    (force * 2.0 / (density * area * cd)).sqrt()
}

/// Edgewise drag of a rotor that gives thrust T at airspeed V in its plane,
/// D = k T V with k in s/m (blade flapping and induced drag, `rotor-drag`).
pub fn rotor_drag(thrust: Force, speed: Velocity, per_thrust_s_per_m: f64) -> Force {
    thrust * (per_thrust_s_per_m * speed.get::<uom::si::velocity::meter_per_second>())
}

/// The airspeed at which the body's drag and the rotors' edgewise drag together
/// equal a force F: 1/2 rho V^2 Cd A + k T V = F, the positive root
/// V = 2 F / (k T + sqrt((k T)^2 + 2 rho Cd A F)) (`hoerner-1965`, `rotor-drag`).
pub fn speed_for_drag_with_rotors(
    force: Force,
    density: MassDensity,
    cd: f64,
    area: Area,
    per_thrust_s_per_m: f64,
    thrust: Force,
) -> Velocity {
    use uom::si::velocity::meter_per_second;
    let f = force.value;
    let a = 0.5 * (density * area).value * cd;
    let b = per_thrust_s_per_m * thrust.value;
    let root = (b * b + 4.0 * a * f).sqrt();
    let v = if f <= 0.0 { 0.0 } else { 2.0 * f / (b + root) };
    Velocity::new::<meter_per_second>(v)
}

#[cfg(test)]
mod tests {
    use super::*;
    use uom::si::{
        area::square_meter, force::newton, mass_density::kilogram_per_cubic_meter,
        velocity::meter_per_second,
    };

    #[test]
    fn a_square_metre_plate_at_ten_metres_per_second_feels_78_newtons() {
        // F = 0.5 x 1.225 x 10^2 x 1.28 x 1 = 78.4 N (Hoerner flat plate Cd 1.28).
        let f = drag_force(
            MassDensity::new::<kilogram_per_cubic_meter>(1.225),
            Velocity::new::<meter_per_second>(10.0),
            1.28,
            Area::new::<square_meter>(1.0),
        );
        assert!((f.get::<newton>() - 78.4).abs() < 1e-9);
    }

    #[test]
    fn rotor_drag_is_linear_in_thrust_and_airspeed() {
        // rotor-drag (Mahony, Kumar, Corke 2012): D = k T V; k = 0.04 s/m, T = 10 N,
        // V = 5 m/s -> 2 N, worked by hand; twice the airspeed, twice the drag.
        let t = Force::new::<newton>(10.0);
        let d = rotor_drag(t, Velocity::new::<meter_per_second>(5.0), 0.04);
        assert!((d.get::<newton>() - 2.0).abs() < 1e-12);
        let d2 = rotor_drag(t, Velocity::new::<meter_per_second>(10.0), 0.04);
        assert!((d2.get::<newton>() - 4.0).abs() < 1e-12);
    }

    #[test]
    fn the_speed_for_body_and_rotor_drag_solves_the_quadratic() {
        // Worked by hand: rho = 1.225, Cd A = 0.01 m^2 -> a = 0.006125; k T = 0.04 x 5 = 0.2;
        // F = 1 N: V = (-0.2 + sqrt(0.04 + 0.0245)) / 0.01225 = 0.053969 / 0.01225 = 4.4056 m/s,
        // and the two drags add to 1 N.
        let rho = MassDensity::new::<kilogram_per_cubic_meter>(1.225);
        let a = Area::new::<square_meter>(0.01);
        let t = Force::new::<newton>(5.0);
        let v = speed_for_drag_with_rotors(Force::new::<newton>(1.0), rho, 1.0, a, 0.04, t);
        assert!((v.get::<meter_per_second>() - 4.4056).abs() < 1e-4, "{v:?}");
        let total = drag_force(rho, v, 1.0, a) + rotor_drag(t, v, 0.04);
        assert!((total.get::<newton>() - 1.0).abs() < 1e-12);
        // With no body area it is the rotor drag alone: V = F / (k T) = 5 m/s.
        let v = speed_for_drag_with_rotors(
            Force::new::<newton>(1.0),
            rho,
            1.0,
            Area::new::<square_meter>(0.0),
            0.04,
            t,
        );
        assert!((v.get::<meter_per_second>() - 5.0).abs() < 1e-12);
    }

    #[test]
    fn speed_for_drag_inverts_drag_force() {
        let rho = MassDensity::new::<kilogram_per_cubic_meter>(1.1);
        let a = Area::new::<square_meter>(0.02);
        let v = speed_for_drag(Force::new::<newton>(3.0), rho, 1.05, a);
        assert!((drag_force(rho, v, 1.05, a).get::<newton>() - 3.0).abs() < 1e-12);
    }
}

//! Aerodynamic drag of a bluff body, source `hoerner-1965`.

use uom::si::f64::{Area, Force, MassDensity, Velocity};

/// Drag F = 1/2 rho v^2 Cd A (`hoerner-1965`).
pub fn drag_force(density: MassDensity, speed: Velocity, cd: f64, area: Area) -> Force {
    density * speed * speed * area * (0.5 * cd)
}

/// The airspeed whose drag equals a force, v = sqrt(2 F / (rho Cd A)) (`hoerner-1965`).
pub fn speed_for_drag(force: Force, density: MassDensity, cd: f64, area: Area) -> Velocity {
    (force * 2.0 / (density * area * cd)).sqrt()
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
    fn speed_for_drag_inverts_drag_force() {
        let rho = MassDensity::new::<kilogram_per_cubic_meter>(1.1);
        let a = Area::new::<square_meter>(0.02);
        let v = speed_for_drag(Force::new::<newton>(3.0), rho, 1.05, a);
        assert!((drag_force(rho, v, 1.05, a).get::<newton>() - 3.0).abs() < 1e-12);
    }
}

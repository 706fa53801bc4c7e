//! Momentum (actuator-disk) theory of a hovering rotor, source `momentum-theory`.

use std::f64::consts::PI;

use uom::si::f64::{Area, Force, Length, MassDensity, Power, Velocity};

/// Disk area A = pi D^2 / 4 (`momentum-theory`).
pub fn disk_area(diameter: Length) -> Area {
    diameter * diameter * (PI / 4.0)
}

/// Induced velocity in hover v_h = sqrt(T / (2 rho A)) (`momentum-theory`).
pub fn induced_velocity(thrust: Force, density: MassDensity, area: Area) -> Velocity {
    (thrust / (density * area * 2.0)).sqrt()
}

/// Ideal hover power P_ideal = T v_h = T^(3/2) / sqrt(2 rho A) (`momentum-theory`).
pub fn ideal_power(thrust: Force, density: MassDensity, area: Area) -> Power {
    thrust * induced_velocity(thrust, density, area)
}

/// Largest thrust a shaft power can hold in hover, T = (2 rho A)^(1/3) P^(2/3),
/// the ideal power formula solved for T; pass P = FM eta P_elec (`momentum-theory`).
pub fn thrust_bound(density: MassDensity, area: Area, shaft_power: Power) -> Force {
    (density * area * shaft_power * shaft_power * 2.0).cbrt()
}

/// Disk loading T / A, the pressure the rotor's wake carries (`momentum-theory`).
pub fn disk_loading(thrust: Force, area: Area) -> uom::si::f64::Pressure {
    thrust / area
}

/// Thrust of a rotor of a coaxial pair at a given power, relative to an
/// isolated rotor: kappa_int^(-2/3) (`coaxial-rotor`).
pub fn coaxial_thrust_factor(interference: f64) -> f64 {
    interference.powf(-2.0 / 3.0)
}

/// The disk area that stands for one rotor of a coaxial pair in the hover
/// formulas: P = kappa T^(3/2) / sqrt(2 rho A) = T^(3/2) / sqrt(2 rho A / kappa^2),
/// so A_eff = A / kappa_int^2 (`coaxial-rotor`).
pub fn coaxial_effective_area(area: Area, interference: f64) -> Area {
    area / (interference * interference)
}

#[cfg(test)]
mod tests {
    use super::*;
    use uom::si::{
        area::square_meter, force::newton, length::meter, mass_density::kilogram_per_cubic_meter,
        power::watt, velocity::meter_per_second,
    };

    #[test]
    fn a_coaxial_pair_holds_the_thrust_its_interference_allows() {
        // Leishman (2006), momentum theory of the coaxial rotor: thrust at a given power
        // scales as kappa_int^(-2/3): 0.848 for the ideal pair (1.2808), 0.794 for one
        // shared disk (sqrt 2); Harrington (NACA TN 2318, 1951) measured about 1.16: 0.906.
        assert!((coaxial_thrust_factor(1.2808) - 0.848).abs() < 5e-4);
        assert!((coaxial_thrust_factor(2f64.sqrt()) - 0.794).abs() < 5e-4);
        assert!((coaxial_thrust_factor(1.16) - 0.906).abs() < 5e-4);
    }

    #[test]
    fn the_effective_area_of_a_paired_rotor_gives_its_interference_in_power_and_thrust() {
        // P(A / kappa^2) = kappa P(A), and the thrust bound at fixed power falls by kappa^(-2/3).
        let a = Area::new::<square_meter>(0.03);
        let t = Force::new::<newton>(4.0);
        let k = 1.2808;
        let eff = coaxial_effective_area(a, k);
        let ratio = (ideal_power(t, rho0(), eff) / ideal_power(t, rho0(), a)).value;
        assert!((ratio - k).abs() < 1e-12);
        let p = Power::new::<watt>(20.0);
        let thrust = (thrust_bound(rho0(), eff, p) / thrust_bound(rho0(), a, p)).value;
        assert!((thrust - coaxial_thrust_factor(k)).abs() < 1e-12);
    }

    fn rho0() -> MassDensity {
        MassDensity::new::<kilogram_per_cubic_meter>(1.225)
    }

    #[test]
    fn disk_area_of_a_one_metre_rotor_is_a_quarter_pi() {
        let a = disk_area(Length::new::<meter>(1.0)).get::<square_meter>();
        assert!((a - PI / 4.0).abs() < 1e-12);
    }

    #[test]
    fn induced_velocity_and_ideal_power_match_a_hand_worked_rotor() {
        // Worked by hand from v_h = sqrt(T / (2 rho A)): T = 10 N, A = 0.1 m^2,
        // rho = 1.225 -> v_h = sqrt(10 / 0.245) = 6.3888 m/s, P = T v_h = 63.888 W.
        let a = Area::new::<square_meter>(0.1);
        let t = Force::new::<newton>(10.0);
        let v = induced_velocity(t, rho0(), a).get::<meter_per_second>();
        assert!((v - 6.3888).abs() < 1e-4);
        assert!((ideal_power(t, rho0(), a).get::<watt>() - 63.888).abs() < 1e-3);
    }

    #[test]
    fn the_thrust_bound_inverts_the_ideal_power() {
        // T = (2 rho A)^(1/3) P^(2/3) is P = T^(3/2) / sqrt(2 rho A) solved for T.
        let a = Area::new::<square_meter>(0.05);
        let t = Force::new::<newton>(7.5);
        let p = ideal_power(t, rho0(), a);
        assert!((thrust_bound(rho0(), a, p).get::<newton>() - 7.5).abs() < 1e-9);
    }

    #[test]
    fn a_full_scale_helicopter_rotor_gives_the_textbook_induced_velocity() {
        // Leishman (2006) style example: T = 50 kN on a 6 m radius rotor at sea level:
        // A = 113.1 m^2, v_h = sqrt(50000 / (2 x 1.225 x 113.1)) = 13.43 m/s.
        let a = disk_area(Length::new::<meter>(12.0));
        let v = induced_velocity(Force::new::<newton>(50_000.0), rho0(), a);
        assert!((v.get::<meter_per_second>() - 13.43).abs() < 0.01);
    }
}

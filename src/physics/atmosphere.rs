//! The ISA troposphere (ISO 2533:1975; U.S. Standard Atmosphere 1976), source `isa`.
//!
//! A sheet's `conditions.altitude` is read as a pressure altitude: the height
//! whose ISA pressure is taken. A stated station pressure replaces that
//! pressure ([`at_pressure`]); gravity always comes from the stated height.

use uom::si::f64::{Acceleration, Length, MassDensity, Pressure, ThermodynamicTemperature};
use uom::si::{
    acceleration::meter_per_second_squared, length::meter, mass_density::kilogram_per_cubic_meter,
    pressure::pascal, thermodynamic_temperature::kelvin,
};

/// Sea-level temperature, 288.15 K (`isa`).
pub const T0_K: f64 = 288.15;
/// Sea-level pressure, 101 325 Pa (`isa`).
pub const P0_PA: f64 = 101_325.0;
/// Temperature lapse rate in the troposphere, 6.5 K per km (`isa`).
pub const LAPSE_K_PER_M: f64 = 0.0065;
/// Specific gas constant of dry air, 287.053 J/(kg K) (`isa`).
pub const R_AIR: f64 = 287.053;
/// Standard gravity, 9.80665 m/s^2 (`isa`).
pub const G0: f64 = 9.806_65;
/// Mean Earth radius used for the fall of gravity with height, 6 356 766 m (`isa`, U.S. 1976).
pub const EARTH_RADIUS_M: f64 = 6_356_766.0;

/// The state of the air at one altitude.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Air {
    pub temperature: ThermodynamicTemperature,
    pub pressure: Pressure,
    pub density: MassDensity,
    pub gravity: Acceleration,
}

/// ISA temperature at height h: T = T0 - L h (`isa`).
pub fn isa_temperature(altitude: Length) -> ThermodynamicTemperature {
    ThermodynamicTemperature::new::<kelvin>(T0_K - LAPSE_K_PER_M * altitude.get::<meter>())
}

/// The air at `altitude`: pressure p = p0 (T_isa / T0)^(g0 / (R L)) from the ISA,
/// density rho = p / (R T) at the stated temperature, else the ISA one (`isa`).
pub fn isa(altitude: Length, temperature: Option<ThermodynamicTemperature>) -> Air {
    let h = altitude.get::<meter>();
    let t_isa = T0_K - LAPSE_K_PER_M * h;
    let p = P0_PA * (t_isa / T0_K).powf(G0 / (R_AIR * LAPSE_K_PER_M));
    let t = temperature.map_or(t_isa, |t| t.get::<kelvin>());
    let rho = p / (R_AIR * t);
    Air {
        temperature: ThermodynamicTemperature::new::<kelvin>(t),
        pressure: Pressure::new::<pascal>(p),
        density: MassDensity::new::<kilogram_per_cubic_meter>(rho),
        gravity: gravity(altitude),
    }
}

/// Pressure altitude, the ISA height of a pressure:
/// h = (T0 / L) (1 - (p / p0)^(R L / g0)) (`isa`).
pub fn pressure_altitude(pressure: Pressure) -> Length {
    let ratio = pressure.get::<pascal>() / P0_PA;
    Length::new::<meter>(T0_K / LAPSE_K_PER_M * (1.0 - ratio.powf(R_AIR * LAPSE_K_PER_M / G0)))
}

/// The air at a station pressure p: density rho = p / (R T) at the stated
/// temperature, else the ISA temperature at the pressure altitude of p;
/// gravity at the stated height (`isa`).
pub fn at_pressure(
    pressure: Pressure,
    temperature: Option<ThermodynamicTemperature>,
    height: Length,
) -> Air {
    let p = pressure.get::<pascal>();
    let t = temperature.map_or_else(
        || isa_temperature(pressure_altitude(pressure)).get::<kelvin>(),
        |t| t.get::<kelvin>(),
    );
    Air {
        temperature: ThermodynamicTemperature::new::<kelvin>(t),
        pressure,
        density: MassDensity::new::<kilogram_per_cubic_meter>(p / (R_AIR * t)),
        gravity: gravity(height),
    }
}

/// Gravity at height h: g = g0 (r / (r + h))^2 (`isa`).
pub fn gravity(altitude: Length) -> Acceleration {
    let ratio = EARTH_RADIUS_M / (EARTH_RADIUS_M + altitude.get::<meter>());
    Acceleration::new::<meter_per_second_squared>(G0 * ratio * ratio)
}

/// Sea-level ISA density, 1.2250 kg/m^3 (`isa`).
pub fn sea_level_density() -> MassDensity {
    isa(Length::new::<meter>(0.0), None).density
}

#[cfg(test)]
mod tests {
    use super::*;
    use uom::si::thermodynamic_temperature::degree_celsius;

    fn rho(h: f64) -> f64 {
        isa(Length::new::<meter>(h), None)
            .density
            .get::<kilogram_per_cubic_meter>()
    }

    #[test]
    fn density_matches_the_standard_atmosphere_table() {
        // ISO 2533:1975 / U.S. Standard Atmosphere 1976 table rows (geopotential altitude).
        for (h, expected) in [
            (0.0, 1.2250),
            (1000.0, 1.1117),
            (2000.0, 1.0066),
            (3000.0, 0.9093),
        ] {
            assert!(
                (rho(h) - expected).abs() < 5e-4,
                "{h} m: {} vs {expected}",
                rho(h)
            );
        }
    }

    #[test]
    fn pressure_and_temperature_match_the_table_at_two_kilometres() {
        // U.S. Standard Atmosphere 1976, 2000 m: 275.15 K, 79 495 Pa.
        let air = isa(Length::new::<meter>(2000.0), None);
        assert!((air.temperature.get::<kelvin>() - 275.15).abs() < 1e-9);
        assert!((air.pressure.get::<pascal>() - 79_495.0).abs() < 30.0);
    }

    #[test]
    fn the_lapse_rate_is_six_and_a_half_kelvin_per_kilometre() {
        // ISA troposphere lapse rate -6.5 K/km.
        let dt = isa_temperature(Length::new::<meter>(0.0)).get::<kelvin>()
            - isa_temperature(Length::new::<meter>(1000.0)).get::<kelvin>();
        assert!((dt - 6.5).abs() < 1e-9);
    }

    #[test]
    fn warm_air_is_thinner_at_the_same_pressure() {
        // Ideal gas law: at sea-level pressure and 35 degC, rho = 101325 / (287.053 x 308.15) = 1.1455.
        let hot = isa(
            Length::new::<meter>(0.0),
            Some(ThermodynamicTemperature::new::<degree_celsius>(35.0)),
        );
        assert!((hot.density.get::<kilogram_per_cubic_meter>() - 1.1455).abs() < 5e-4);
    }

    fn pa(v: f64) -> Pressure {
        Pressure::new::<pascal>(v)
    }

    #[test]
    fn a_station_pressure_from_the_table_gives_the_table_height_and_density() {
        // ISO 2533:1975 / U.S. Standard Atmosphere 1976: 1000 m -> 89 875 Pa, 1.1117 kg/m^3;
        // 2000 m -> 79 495 Pa, 1.0066 kg/m^3.
        for (p, h, rho) in [(89_875.0, 1000.0, 1.1117), (79_495.0, 2000.0, 1.0066)] {
            let hp = pressure_altitude(pa(p)).get::<meter>();
            assert!((hp - h).abs() < 1.0, "{p} Pa: {hp} m");
            let air = at_pressure(pa(p), None, Length::new::<meter>(h));
            let d = air.density.get::<kilogram_per_cubic_meter>();
            assert!((d - rho).abs() < 2e-4, "{p} Pa: {d}");
            assert!((air.temperature.get::<kelvin>() - (288.15 - 0.0065 * h)).abs() < 0.01);
        }
        assert!(pressure_altitude(pa(P0_PA)).get::<meter>().abs() < 1e-9);
    }

    #[test]
    fn a_stated_temperature_sets_the_density_at_a_station_pressure() {
        // Ideal gas law, worked by hand: 950 hPa at 30 degC gives
        // rho = 95000 / (287.053 x 303.15) = 1.0917 kg/m^3.
        let air = at_pressure(
            pa(95_000.0),
            Some(ThermodynamicTemperature::new::<degree_celsius>(30.0)),
            Length::new::<meter>(0.0),
        );
        assert!((air.density.get::<kilogram_per_cubic_meter>() - 1.0917).abs() < 1e-4);
    }

    #[test]
    fn gravity_at_a_station_pressure_comes_from_the_stated_height() {
        // isa: g = g0 (r / (r + h))^2, 9.7974 m/s^2 at 3000 m whatever the pressure.
        let air = at_pressure(pa(101_325.0), None, Length::new::<meter>(3000.0));
        assert!((air.gravity.get::<meter_per_second_squared>() - 9.7974).abs() < 1e-3);
    }

    #[test]
    fn gravity_is_standard_at_sea_level_and_falls_with_height() {
        // g0 = 9.80665 m/s^2 by definition; inverse-square fall with height.
        assert_eq!(
            gravity(Length::new::<meter>(0.0)).get::<meter_per_second_squared>(),
            G0
        );
        let g3 = gravity(Length::new::<meter>(3000.0)).get::<meter_per_second_squared>();
        assert!((g3 - 9.7974).abs() < 1e-3);
    }
}

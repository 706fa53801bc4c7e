//! Battery energy and current, source `battery-energy`.

use uom::si::f64::{
    ElectricCharge, ElectricCurrent, ElectricPotential, Energy, Power, TemperatureInterval,
    ThermodynamicTemperature, Time,
};
use uom::si::{temperature_interval, thermodynamic_temperature::kelvin, time::hour};

/// Pack voltage V = n V_cell (`battery-energy`).
pub fn pack_voltage(cells: u32, cell_voltage: ElectricPotential) -> ElectricPotential {
    cell_voltage * f64::from(cells)
}

/// Usable energy E = n V_cell Q DoD (`battery-energy`).
pub fn usable_energy(
    cells: u32,
    cell_voltage: ElectricPotential,
    capacity: ElectricCharge,
    depth_of_discharge: f64,
) -> Energy {
    pack_voltage(cells, cell_voltage) * capacity * depth_of_discharge
}

/// Current drawn at a power I = P / V (`battery-energy`).
pub fn current(power: Power, voltage: ElectricPotential) -> ElectricCurrent {
    power / voltage
}

/// Discharge rate in C, I / (Q per hour) (`battery-energy`).
pub fn c_rate(current: ElectricCurrent, capacity: ElectricCharge) -> f64 {
    (current * Time::new::<hour>(1.0) / capacity).value
}

/// Run time at a constant power t = E / P (`battery-energy`).
pub fn run_time(energy: Energy, power: Power) -> Time {
    energy / power
}

/// Share of the nominal voltage left under load by Ohm's law, V = V_nom - I R,
/// with R set by the sag s at the rated current: 1 - s C / C_rated, never
/// below zero (`battery-energy`).
pub fn sag_share(c_rate: f64, rating: f64, sag_at_rating: f64) -> f64 {
    if sag_at_rating <= 0.0 {
        return 1.0;
    }
    (1.0 - sag_at_rating * c_rate / rating).max(0.0)
}

/// Share of the capacity a pack gives in cold air, 1 - k max(0, T_ref - T),
/// with k the loss per kelvin, never below zero (`battery-energy`).
pub fn cold_share(
    air: ThermodynamicTemperature,
    reference: ThermodynamicTemperature,
    loss_per_kelvin: TemperatureInterval,
) -> f64 {
    let below = (reference.get::<kelvin>() - air.get::<kelvin>()).max(0.0);
    let k = loss_per_kelvin.get::<temperature_interval::kelvin>();
    if k <= 0.0 {
        return 1.0;
    }
    (1.0 - k * below).max(0.0)
}

#[cfg(test)]
mod tests {
    use super::*;
    use uom::si::{
        electric_charge::milliampere_hour, electric_current::ampere, electric_potential::volt,
        energy::watt_hour, power::watt, time::minute,
    };

    #[test]
    fn a_one_cell_600_mah_pack_holds_2_22_watt_hours() {
        // E = V Q: 3.7 V x 0.6 Ah = 2.22 Wh.
        let e = usable_energy(
            1,
            ElectricPotential::new::<volt>(3.7),
            ElectricCharge::new::<milliampere_hour>(600.0),
            1.0,
        );
        assert!((e.get::<watt_hour>() - 2.22).abs() < 1e-9);
    }

    #[test]
    fn a_four_cell_1500_mah_pack_at_80_percent_runs_a_100_watt_load_for_10_6_minutes() {
        // E = 4 x 3.7 V x 1.5 Ah x 0.8 = 17.76 Wh; t = 17.76 Wh / 100 W = 0.1776 h = 10.656 min.
        let e = usable_energy(
            4,
            ElectricPotential::new::<volt>(3.7),
            ElectricCharge::new::<milliampere_hour>(1500.0),
            0.8,
        );
        let t = run_time(e, Power::new::<watt>(100.0));
        assert!((t.get::<minute>() - 10.656).abs() < 1e-6);
    }

    #[test]
    fn thirty_amps_from_a_1500_mah_pack_is_20_c() {
        // C rate = I / capacity-per-hour: 30 A / 1.5 Ah = 20 C.
        let c = c_rate(
            ElectricCurrent::new::<ampere>(30.0),
            ElectricCharge::new::<milliampere_hour>(1500.0),
        );
        assert!((c - 20.0).abs() < 1e-9);
        let i = current(
            Power::new::<watt>(148.0),
            ElectricPotential::new::<volt>(14.8),
        );
        assert!((i.get::<ampere>() - 10.0).abs() < 1e-9);
    }

    #[test]
    fn a_cell_at_twice_its_rated_current_sags_twice_as_far() {
        // Ohm's law, V = V_nom - I R: a 10 % sag at the rated 20 C is 20 % at 40 C and
        // 5 % at 10 C; no sag row, no sag.
        assert!((sag_share(40.0, 20.0, 0.10) - 0.80).abs() < 1e-12);
        assert!((sag_share(10.0, 20.0, 0.10) - 0.95).abs() < 1e-12);
        assert_eq!(sag_share(1e300, 20.0, 0.0), 1.0);
        assert_eq!(sag_share(400.0, 20.0, 0.10), 0.0);
    }

    #[test]
    fn a_pack_in_freezing_air_loses_capacity_by_the_kelvin() {
        // 1 % a kelvin below 15 degC (a tier row, from memory): at -5 degC, 80 % is left;
        // at 25 degC all of it.
        use uom::si::thermodynamic_temperature::degree_celsius;
        let t = ThermodynamicTemperature::new::<degree_celsius>;
        let k = TemperatureInterval::new::<temperature_interval::kelvin>(0.01);
        assert!((cold_share(t(-5.0), t(15.0), k) - 0.80).abs() < 1e-9);
        assert_eq!(cold_share(t(25.0), t(15.0), k), 1.0);
    }
}

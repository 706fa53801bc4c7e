//! Battery energy and current, source `battery-energy`.

use uom::si::f64::{ElectricCharge, ElectricCurrent, ElectricPotential, Energy, Power, Time};
use uom::si::time::hour;

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
}

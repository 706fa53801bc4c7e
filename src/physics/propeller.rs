//! The propeller laws: a given propeller on a motor of fixed KV, run at
//! another voltage or power, source `propeller-laws`.
//!
//! With C_T and C_P constant, T = C_T rho n^2 D^4 and P = C_P rho n^3 D^5; the
//! motor turns at n = KV (V - I R), taken here as n proportional to V. The
//! resistive drop grows with the current, so above the reference voltage these
//! laws overstate the gain a little and below it they overstate the loss.

use uom::si::f64::{ElectricCurrent, ElectricPotential, Force, Power};

/// The voltage ratio V / V0 that sets the rpm ratio n / n0 at fixed KV (`propeller-laws`).
pub fn rpm_ratio(voltage: ElectricPotential, reference: ElectricPotential) -> f64 {
    (voltage / reference).value
}

/// Thrust at another voltage, T = T0 (V / V0)^2 (`propeller-laws`).
pub fn thrust_at_voltage(
    thrust: Force,
    voltage: ElectricPotential,
    reference: ElectricPotential,
) -> Force {
    thrust * rpm_ratio(voltage, reference).powi(2)
}

/// Power at another voltage, P = P0 (V / V0)^3 (`propeller-laws`).
pub fn power_at_voltage(
    power: Power,
    voltage: ElectricPotential,
    reference: ElectricPotential,
) -> Power {
    power * rpm_ratio(voltage, reference).powi(3)
}

/// Current at another voltage, I = P / V = I0 (V / V0)^2 (`propeller-laws`).
pub fn current_at_voltage(
    current: ElectricCurrent,
    voltage: ElectricPotential,
    reference: ElectricPotential,
) -> ElectricCurrent {
    current * rpm_ratio(voltage, reference).powi(2)
}

/// Thrust of the same propeller on another power, T = T0 (P / P0)^(2/3)
/// (rpm with P^(1/3), thrust with rpm^2) (`propeller-laws`).
pub fn thrust_at_power(thrust: Force, power: Power, reference: Power) -> Force {
    thrust * (power / reference).value.powf(2.0 / 3.0)
}

#[cfg(test)]
mod tests {
    use super::*;
    use uom::si::{electric_current::ampere, electric_potential::volt, force::newton, power::watt};

    fn v(x: f64) -> ElectricPotential {
        ElectricPotential::new::<volt>(x)
    }

    #[test]
    fn four_cells_on_a_three_cell_motor_give_the_propeller_law_ratios() {
        // Propeller laws at fixed KV and propeller: 14.8 V / 11.1 V = 4/3, so thrust
        // (4/3)^2 = 1.778, power (4/3)^3 = 2.370, current (4/3)^2 = 1.778 (worked by hand).
        let (hi, lo) = (v(14.8), v(11.1));
        let t = thrust_at_voltage(Force::new::<newton>(1.0), hi, lo).get::<newton>();
        let p = power_at_voltage(Power::new::<watt>(1.0), hi, lo).get::<watt>();
        let i = current_at_voltage(ElectricCurrent::new::<ampere>(1.0), hi, lo);
        assert!((t - 1.7778).abs() < 1e-4, "{t}");
        assert!((p - 2.3704).abs() < 1e-4, "{p}");
        assert!((i.get::<ampere>() - 1.7778).abs() < 1e-4);
    }

    #[test]
    fn current_is_power_over_voltage_at_every_voltage() {
        // I = P / V: (P0 r^3) / (V0 r) = I0 r^2, for a 160 W motor at 11.1 V run on 7.4 V.
        let (p0, v0, v1) = (Power::new::<watt>(160.0), v(11.1), v(7.4));
        let i0: ElectricCurrent = p0 / v0;
        let direct: ElectricCurrent = power_at_voltage(p0, v1, v0) / v1;
        let law = current_at_voltage(i0, v1, v0);
        assert!(((direct - law) / law).value.abs() < 1e-12);
    }

    #[test]
    fn thrust_follows_power_to_the_two_thirds_as_it_follows_voltage_squared() {
        // T ~ n^2, P ~ n^3: T / T0 = (P / P0)^(2/3). At 4/3 the voltage the power is 64/27,
        // and (64/27)^(2/3) = 16/9 = (4/3)^2.
        let t0 = Force::new::<newton>(4.4);
        let p0 = Power::new::<watt>(90.0);
        let by_power = thrust_at_power(t0, power_at_voltage(p0, v(14.8), v(11.1)), p0);
        let by_voltage = thrust_at_voltage(t0, v(14.8), v(11.1));
        assert!((by_power - by_voltage).get::<newton>().abs() < 1e-12);
        // Half the power: 0.5^(2/3) = 0.630 of the thrust (worked by hand).
        let half = thrust_at_power(t0, p0 * 0.5, p0) / t0;
        assert!((half.value - 0.62996).abs() < 1e-5);
    }
}

//! Momentum theory of a rotor in level forward flight (Glauert), and the
//! power of a craft over airspeed: induced, parasite and profile power,
//! source `glauert-forward`.
//!
//! A stated flight time need not be a hover time: a multirotor that cruises
//! needs less power than one that hovers, because the rotors then work on
//! more air. The least power over airspeed bounds the flight time from above.

use uom::si::f64::{Angle, Area, Force, MassDensity, Power, Velocity};
use uom::si::velocity::meter_per_second;

use super::{drag, rotor};

/// Induced velocity of a disk in forward flight at airspeed V with the disk
/// tilted forward by `a` (Glauert's momentum theory):
/// v_i = v_h^2 / sqrt((V cos a)^2 + (V sin a + v_i)^2) (`glauert-forward`).
/// The right side falls as v_i grows, so the one root lies in (0, v_h] and
/// bisection finds it.
pub fn induced_velocity(hover_induced: Velocity, speed: Velocity, disk_tilt: Angle) -> Velocity {
    let vh = hover_induced.get::<meter_per_second>();
    let v = speed.get::<meter_per_second>();
    let (sin, cos) = (disk_tilt.value.sin(), disk_tilt.value.cos());
    if vh.is_nan() || vh <= 0.0 {
        return Velocity::new::<meter_per_second>(0.0);
    }
    let excess = |vi: f64| vi - vh * vh / ((v * cos).powi(2) + (v * sin + vi).powi(2)).sqrt();
    let (mut lo, mut hi) = (0.0, vh);
    for _ in 0..60 {
        let mid = 0.5 * (lo + hi);
        if excess(mid) < 0.0 {
            lo = mid;
        } else {
            hi = mid;
        }
    }
    Velocity::new::<meter_per_second>(0.5 * (lo + hi))
}

/// What the power of a craft in level flight depends on, apart from airspeed.
#[derive(Debug, Clone, Copy)]
pub struct Cruise {
    pub weight: Force,
    pub density: MassDensity,
    /// Total disk area of the rotors (already reduced for shared disks).
    pub disk_area: Area,
    /// Equivalent flat-plate drag area f = Cd S of the body (`hoerner-1965`).
    pub drag_area: Area,
    /// Induced-power factor kappa over ideal momentum theory (1 at the physical limit).
    pub induced_factor: f64,
    /// Profile power of the blades, held at its hover value (it grows with
    /// advance ratio, so this errs toward less power, the generous side).
    pub profile_power: Power,
}

impl Cruise {
    /// Shaft power at airspeed V: P = kappa T v_i + D V + P_0, with the body
    /// drag D = 1/2 rho V^2 f, the thrust T = sqrt(W^2 + D^2) tilted forward by
    /// atan(D / W), and v_i from [`induced_velocity`] (`glauert-forward`).
    pub fn shaft_power(&self, speed: Velocity) -> Power {
        let d = drag::drag_force(self.density, speed, 1.0, self.drag_area);
        let t = (self.weight * self.weight + d * d).sqrt();
        let tilt = Angle::new::<uom::si::angle::radian>((d / self.weight).value.atan());
        let vh = rotor::induced_velocity(t, self.density, self.disk_area);
        let vi = induced_velocity(vh, speed, tilt);
        t * vi * self.induced_factor + d * speed + self.profile_power
    }

    /// The airspeed of least power and that power, by golden-section search
    /// between hover and the speed at which the body's drag alone takes the
    /// hover power (`glauert-forward`).
    pub fn least_power(&self) -> (Velocity, Power) {
        let hover = self.shaft_power(Velocity::new::<meter_per_second>(0.0));
        // D V = P_hover at V = (2 P / (rho f))^(1/3): beyond it, power only grows.
        let top = (hover * 2.0 / (self.density * self.drag_area)).cbrt();
        let top = top.get::<meter_per_second>();
        if !top.is_finite() || top <= 0.0 {
            return (Velocity::new::<meter_per_second>(0.0), hover);
        }
        let power = |v: f64| self.shaft_power(Velocity::new::<meter_per_second>(v));
        let phi = (5f64.sqrt() - 1.0) / 2.0;
        let (mut a, mut b) = (0.0, top);
        let (mut c, mut d) = (b - phi * (b - a), a + phi * (b - a));
        let (mut pc, mut pd) = (power(c), power(d));
        for _ in 0..60 {
            if pc < pd {
                b = d;
                d = c;
                pd = pc;
                c = b - phi * (b - a);
                pc = power(c);
            } else {
                a = c;
                c = d;
                pc = pd;
                d = a + phi * (b - a);
                pd = power(d);
            }
        }
        let v = 0.5 * (a + b);
        let best = (Velocity::new::<meter_per_second>(v), power(v));
        // The bucket may be flat: never report more than hover.
        if best.1 <= hover {
            best
        } else {
            (Velocity::new::<meter_per_second>(0.0), hover)
        }
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use uom::si::{
        angle::degree, area::square_meter, force::newton, mass_density::kilogram_per_cubic_meter,
        power::watt,
    };

    fn v(x: f64) -> Velocity {
        Velocity::new::<meter_per_second>(x)
    }

    #[test]
    fn in_hover_the_forward_flight_inflow_is_the_hover_inflow() {
        // Glauert's relation at V = 0 is v_i = v_h.
        let vi = induced_velocity(v(6.0), v(0.0), Angle::new::<degree>(0.0));
        assert!((vi.get::<meter_per_second>() - 6.0).abs() < 1e-9);
    }

    #[test]
    fn at_zero_disk_tilt_the_inflow_solves_the_quartic_of_level_flight() {
        // Glauert (Leishman 2006, ch. 2, forward flight) with the disk edgewise: v_i^4 + V^2 v_i^2 - v_h^4 = 0, so
        // v_i^2 = (-V^2 + sqrt(V^4 + 4 v_h^4)) / 2. v_h = 5, V = 10:
        // v_i^2 = (-100 + sqrt(10000 + 2500)) / 2 = 5.9017, v_i = 2.4293 m/s.
        let vi = induced_velocity(v(5.0), v(10.0), Angle::new::<degree>(0.0));
        assert!(
            (vi.get::<meter_per_second>() - 2.4293).abs() < 1e-4,
            "{vi:?}"
        );
    }

    #[test]
    fn at_high_speed_the_inflow_tends_to_the_wing_like_limit() {
        // Glauert: for V >> v_h, v_i -> v_h^2 / V. v_h = 2, V = 40: 0.1 m/s (to 0.1 %).
        let vi = induced_velocity(v(2.0), v(40.0), Angle::new::<degree>(0.0));
        assert!((vi.get::<meter_per_second>() - 0.1).abs() < 1e-4, "{vi:?}");
    }

    #[test]
    fn the_least_power_is_below_hover_and_finite() {
        let cruise = Cruise {
            weight: Force::new::<newton>(10.0),
            density: MassDensity::new::<kilogram_per_cubic_meter>(1.225),
            disk_area: Area::new::<square_meter>(0.05),
            drag_area: Area::new::<square_meter>(0.01),
            induced_factor: 1.0,
            profile_power: Power::new::<watt>(0.0),
        };
        let hover = cruise.shaft_power(v(0.0));
        let (speed, least) = cruise.least_power();
        assert!(least < hover && least.get::<watt>() > 0.0);
        assert!(speed.get::<meter_per_second>() > 0.0);
        // Around the minimum, power is higher either side.
        assert!(cruise.shaft_power(speed * 0.8) >= least);
        assert!(cruise.shaft_power(speed * 1.2) >= least);
    }
}

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
/// For a >= 0 the right side falls as v_i grows, so the one root lies in
/// (0, v_h]; Newton's method kept inside that bracket finds it.
pub fn induced_velocity(hover_induced: Velocity, speed: Velocity, disk_tilt: Angle) -> Velocity {
    let vh = hover_induced.get::<meter_per_second>();
    let v = speed.get::<meter_per_second>().abs();
    let (sin, cos) = (disk_tilt.value.sin().max(0.0), disk_tilt.value.cos());
    if vh.is_nan() || vh <= 0.0 || !vh.is_finite() || !v.is_finite() {
        return Velocity::new::<meter_per_second>(if vh.is_finite() { 0.0 } else { vh });
    }
    // In units of v_h, so that the tolerance is relative: x = v_i / v_h, u = V / v_h.
    let (uc, us) = (v * cos / vh, v * sin / vh);
    let (mut lo, mut hi, mut x) = (0.0_f64, 1.0_f64, 1.0_f64);
    for _ in 0..100 {
        let s = (uc * uc + (us + x) * (us + x)).sqrt();
        let f = x - 1.0 / s;
        if f > 0.0 {
            hi = x;
        } else {
            lo = x;
        }
        let slope = 1.0 + (us + x) / (s * s * s);
        let mut next = x - f / slope;
        if !(next > lo && next < hi) {
            next = 0.5 * (lo + hi);
        }
        let done = (next - x).abs() <= 1e-13;
        x = next;
        if done {
            break;
        }
    }
    Velocity::new::<meter_per_second>(x * vh)
}

/// What the power of a craft in level flight depends on, apart from airspeed.
#[derive(Debug, Clone, Copy)]
pub struct Cruise {
    pub weight: Force,
    pub density: MassDensity,
    /// Total disk area of the rotors, each counted whole; the interference of
    /// coaxial pairs is a factor in `induced_factor`.
    pub disk_area: Area,
    /// Equivalent flat-plate drag area f = Cd S of the body (`hoerner-1965`).
    pub drag_area: Area,
    /// Induced-power factor kappa over ideal momentum theory (1 at the physical
    /// limit for isolated rotors), held at its hover value at every airspeed (it
    /// grows with advance ratio, so this errs toward less power).
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
    /// hover power (`glauert-forward`); hover itself when no speed does better.
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
        // Each step keeps 0.618 of the bracket: 32 steps leave 2e-7 of it, far
        // below what the power notices near its minimum, where it is flat.
        for _ in 0..32 {
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
    #[test]
    fn a_forward_tilted_disk_takes_the_inflow_glauert_gives() {
        // Glauert's relation (Leishman 2006, ch. 2) with v_h = 5 m/s, V = 10 m/s and the
        // disk tilted 10 deg forward, solved by hand by damped fixed-point iteration
        // v <- (v + v_h^2 / sqrt((V cos a)^2 + (V sin a + v)^2)) / 2: v_i = 2.34513 m/s.
        let vi = induced_velocity(v(5.0), v(10.0), Angle::new::<degree>(10.0));
        assert!(
            (vi.get::<meter_per_second>() - 2.34513).abs() < 1e-5,
            "{vi:?}"
        );
    }

    #[test]
    fn the_speed_of_least_power_matches_the_wing_like_closed_form() {
        // Far above v_h, Glauert's inflow is v_i = T / (2 rho A V), so with no profile
        // power P = T^2 / (2 rho A V) + rho f V^3 / 2, least at V^4 = T^2 / (3 rho^2 A f)
        // (Leishman 2006, ch. 5, the minimum-power speed). T = 10 N, A = 0.05 m^2,
        // f = A / 300, rho = 1.225: V = 40.41 m/s, P = 26.94 W; the full Glauert relation
        // lies within 1 % of both (worked by hand by a fine sweep: 40.33 m/s, 26.90 W).
        let cruise = Cruise {
            weight: Force::new::<newton>(10.0),
            density: MassDensity::new::<kilogram_per_cubic_meter>(1.225),
            disk_area: Area::new::<square_meter>(0.05),
            drag_area: Area::new::<square_meter>(0.05 / 300.0),
            induced_factor: 1.0,
            profile_power: Power::new::<watt>(0.0),
        };
        let (speed, least) = cruise.least_power();
        assert!(
            (speed.get::<meter_per_second>() / 40.41 - 1.0).abs() < 0.01,
            "{speed:?}"
        );
        assert!(
            (least.get::<watt>() / 26.94 - 1.0).abs() < 0.01,
            "{least:?}"
        );
    }

    #[test]
    fn in_hover_the_cruise_power_is_the_hover_power_of_momentum_theory() {
        // V = 0: P = kappa T v_h + P_0 with v_h = sqrt(T / (2 rho A)) (momentum theory):
        // T = 10 N, A = 0.1 m^2, rho = 1.225 -> T v_h = 63.888 W; x 1.2 + 5 W = 81.666 W.
        let cruise = Cruise {
            weight: Force::new::<newton>(10.0),
            density: MassDensity::new::<kilogram_per_cubic_meter>(1.225),
            disk_area: Area::new::<square_meter>(0.1),
            drag_area: Area::new::<square_meter>(0.01),
            induced_factor: 1.2,
            profile_power: Power::new::<watt>(5.0),
        };
        let p = cruise.shaft_power(v(0.0)).get::<watt>();
        assert!((p - 81.666).abs() < 1e-3, "{p}");
    }
}

//! Rotor noise at a listener: the IEC 61672-1 A-weighting (`iec-61672`),
//! spherical spreading and the incoherent sum of sources
//! (`spherical-spreading`), and Gutin's steady-loading tones (`gutin-1936`).
//!
//! Levels in decibels are plain `f64`: a level is a logarithm of a ratio, not
//! a quantity `uom` carries. Gutin's formula keeps only the steady blade
//! loading and leaves out unsteady loading and broadband noise, so on its own
//! it errs quiet: a real rotor is at least as loud.

use std::f64::consts::PI;
use uom::si::angle::radian;
use uom::si::f64::{Angle, AngularVelocity, Force, Frequency, Length, Pressure, Torque, Velocity};
use uom::si::{
    angular_velocity::radian_per_second, force::newton, frequency::hertz, length::meter,
    pressure::pascal, torque::newton_meter, velocity::meter_per_second,
};

/// Reference pressure of sound pressure level in air, 20 uPa (`iec-61672`).
pub const REFERENCE_PRESSURE_PA: f64 = 20e-6;

/// A-weighting A(f) = 20 log10 R_A(f) + 2.00 dB, R_A = 12194^2 f^4 /
/// ((f^2 + 20.6^2) sqrt((f^2 + 107.7^2)(f^2 + 737.9^2)) (f^2 + 12194^2)) (`iec-61672`).
pub fn a_weighting_db(frequency: Frequency) -> f64 {
    let f2 = frequency.get::<hertz>().powi(2);
    let r = 12194.0_f64.powi(2) * f2 * f2
        / ((f2 + 20.6_f64.powi(2))
            * ((f2 + 107.7_f64.powi(2)) * (f2 + 737.9_f64.powi(2))).sqrt()
            * (f2 + 12194.0_f64.powi(2)));
    20.0 * r.log10() + 2.00
}

/// Sound pressure level L = 20 log10(p_rms / 20 uPa) (`iec-61672`).
pub fn level_db(rms_pressure: Pressure) -> f64 {
    20.0 * (rms_pressure.get::<pascal>() / REFERENCE_PRESSURE_PA).log10()
}

/// Level at another distance, L(r) = L(r0) - 20 log10(r / r0) (`spherical-spreading`).
pub fn level_at_distance(level: f64, from: Length, to: Length) -> f64 {
    level - 20.0 * (to / from).value.log10()
}

/// Incoherent sum L = 10 log10 sum 10^(L_i / 10) (`spherical-spreading`).
pub fn incoherent_sum_db(levels: &[f64]) -> f64 {
    10.0 * levels
        .iter()
        .map(|l| 10f64.powf(l / 10.0))
        .sum::<f64>()
        .log10()
}

/// N equal incoherent sources, L + 10 log10 N (`spherical-spreading`).
pub fn equal_sources_db(level: f64, count: u32) -> f64 {
    level + 10.0 * f64::from(count).log10()
}

/// Bessel function of the first kind J_n(x) = sum_k (-1)^k (x/2)^(2k+n) /
/// (k! (k+n)!), by its power series (Abramowitz and Stegun 9.1.10); the
/// series is summed while terms matter, which for the subsonic arguments
/// here (x < n) takes few terms.
pub fn bessel_j(n: u32, x: f64) -> f64 {
    let half = x / 2.0;
    let mut term = (1..=n).fold(1.0, |t, j| t * half / f64::from(j));
    let mut sum = term;
    for k in 1..200u32 {
        term *= -half * half / (f64::from(k) * f64::from(k + n));
        sum += term;
        if term.abs() <= 1e-17 * sum.abs() {
            break;
        }
    }
    sum
}

/// Blade-passing frequency f = B Omega / (2 pi) (`gutin-1936`).
pub fn blade_passing_frequency(blades: u32, rate: AngularVelocity) -> Frequency {
    Frequency::new::<hertz>(f64::from(blades) * rate.get::<radian_per_second>() / (2.0 * PI))
}

/// A rotor as Gutin's formula sees it: its blades, the thrust and torque it
/// makes, how fast it turns and its tip radius (`gutin-1936`).
#[derive(Debug, Clone, Copy)]
pub struct RotorTone {
    pub blades: u32,
    pub thrust: Force,
    pub torque: Torque,
    pub rate: AngularVelocity,
    pub radius: Length,
}

/// Where the sound is heard: the speed of sound, the distance from the rotor
/// and the angle from its thrust axis.
#[derive(Debug, Clone, Copy)]
pub struct Listener {
    pub sound_speed: Velocity,
    pub distance: Length,
    pub angle_from_axis: Angle,
}

impl RotorTone {
    /// One rotor's steady-loading tone at harmonic m, rms, by Gutin:
    /// p_m = m B Omega / (2 sqrt(2) pi c r) |-T cos(theta) + Q c / (Omega R_e^2)|
    /// J_mB(m B Omega R_e sin(theta) / c), R_e = 0.8 R, theta from the thrust axis
    /// (`gutin-1936`).
    pub fn harmonic(&self, harmonic: u32, at: &Listener) -> Pressure {
        let mb = f64::from(harmonic * self.blades);
        let omega = self.rate.get::<radian_per_second>();
        let c = at.sound_speed.get::<meter_per_second>();
        let re = 0.8 * self.radius.get::<meter>();
        let r = at.distance.get::<meter>();
        let th = at.angle_from_axis.get::<radian>();
        let loading = (-self.thrust.get::<newton>() * th.cos()
            + self.torque.get::<newton_meter>() * c / (omega * re * re))
            .abs();
        let bessel = bessel_j(harmonic * self.blades, mb * omega * re * th.sin() / c);
        Pressure::new::<pascal>(
            mb * omega / (2.0 * 2f64.sqrt() * PI * c * r) * loading * bessel.abs(),
        )
    }

    /// One rotor's A-weighted steady-loading tonal level: the harmonics of
    /// [`RotorTone::harmonic`], each A-weighted at m f_BPF, summed incoherently, from
    /// the first until a harmonic falls 30 dB below the running total or at 40
    /// (`gutin-1936`, `iec-61672`, `spherical-spreading`).
    pub fn a_weighted_db(&self, at: &Listener) -> f64 {
        let bpf = blade_passing_frequency(self.blades, self.rate);
        let mut energy = 0.0;
        for m in 1..=40u32 {
            let p = self.harmonic(m, at);
            let e = (p.get::<pascal>() / REFERENCE_PRESSURE_PA).powi(2)
                * 10f64.powf(a_weighting_db(bpf * f64::from(m)) / 10.0);
            energy += e;
            if m > 1 && e < 1e-3 * energy {
                break;
            }
        }
        if energy > 0.0 {
            10.0 * energy.log10()
        } else {
            f64::NEG_INFINITY
        }
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    fn hz(x: f64) -> Frequency {
        Frequency::new::<hertz>(x)
    }

    #[test]
    fn a_weighting_matches_the_iec_61672_table_at_its_base_ten_frequencies() {
        // IEC 61672-1:2013 table 3 (A-weighting at the exact frequencies 1000 x 10^(n/10) Hz),
        // values as recalled from memory: 10 Hz -70.4, 31.6 Hz -39.4, 100 Hz -19.1,
        // 316 Hz -6.6, 1 kHz 0.0, 3.16 kHz +1.2, 10 kHz -2.5.
        for (n, want) in [
            (-20, -70.4),
            (-15, -39.4),
            (-10, -19.1),
            (-5, -6.6),
            (0, 0.0),
            (5, 1.2),
            (10, -2.5),
        ] {
            let f = 1000.0 * 10f64.powf(f64::from(n) / 10.0);
            let got = a_weighting_db(hz(f));
            assert!((got - want).abs() <= 0.1, "{f} Hz: {got} against {want}");
        }
    }

    #[test]
    fn each_doubling_of_distance_takes_six_point_zero_two_decibels() {
        // Inverse-square law: 20 log10 2 = 6.0206 dB (Kinsler et al., ch. 5).
        let m = |x| Length::new::<meter>(x);
        let l = level_at_distance(60.0, m(1.0), m(2.0));
        assert!((60.0 - l - 6.0206).abs() < 1e-3);
        let l4 = level_at_distance(60.0, m(1.0), m(4.0));
        assert!((60.0 - l4 - 12.041).abs() < 1e-3);
    }

    #[test]
    fn two_equal_sources_add_three_decibels_and_fifteen_are_eight_point_seven_five_above_two() {
        // Incoherent sum: 10 log10 2 = 3.0103 dB; 10 log10(15/2) = 8.7506 dB (Kinsler et al.).
        assert!((incoherent_sum_db(&[50.0, 50.0]) - 53.0103).abs() < 1e-3);
        assert!((equal_sources_db(50.0, 2) - 53.0103).abs() < 1e-3);
        let d = equal_sources_db(50.0, 15) - equal_sources_db(50.0, 2);
        assert!((d - 8.7506).abs() < 1e-3);
    }

    #[test]
    fn bessel_functions_match_the_abramowitz_and_stegun_table() {
        // Abramowitz and Stegun table 9.1 (from memory): J0(1) = 0.7651976866,
        // J1(1) = 0.4400505857, J2(1) = 0.1149034849, J0(2) = 0.2238907791.
        assert!((bessel_j(0, 1.0) - 0.765_197_686_6).abs() < 1e-9);
        assert!((bessel_j(1, 1.0) - 0.440_050_585_7).abs() < 1e-9);
        assert!((bessel_j(2, 1.0) - 0.114_903_484_9).abs() < 1e-9);
        assert!((bessel_j(0, 2.0) - 0.223_890_779_1).abs() < 1e-9);
    }

    fn small_rotor(rpm: f64) -> RotorTone {
        RotorTone {
            blades: 2,
            thrust: Force::new::<newton>(5.0),
            torque: Torque::new::<newton_meter>(0.1),
            rate: AngularVelocity::new::<radian_per_second>(rpm * 2.0 * PI / 60.0),
            radius: Length::new::<meter>(0.127),
        }
    }

    /// One metre away, at `deg` from the thrust axis, in air at 343 m/s.
    fn listener(deg: f64) -> Listener {
        Listener {
            sound_speed: Velocity::new::<meter_per_second>(343.0),
            distance: Length::new::<meter>(1.0),
            angle_from_axis: Angle::new::<radian>(deg.to_radians()),
        }
    }

    fn first(rotor: &RotorTone, deg: f64) -> Pressure {
        rotor.harmonic(1, &listener(deg))
    }

    #[test]
    fn gutin_gives_no_tone_on_the_rotor_axis() {
        // Gutin 1936: the factor J_mB(mB M_e sin(theta)) vanishes at theta = 0 for mB >= 1.
        assert_eq!(first(&small_rotor(6000.0), 0.0).get::<pascal>(), 0.0);
        assert!(first(&small_rotor(6000.0), 90.0).get::<pascal>() > 0.0);
    }

    #[test]
    fn gutin_tone_rises_with_tip_mach_number() {
        // Gutin 1936 (as reviewed by Marte and Kurtz 1970): the tone grows steeply with tip
        // Mach number, through J_mB(mB M_e sin(theta)).
        let slow = level_db(first(&small_rotor(4000.0), 90.0));
        let fast = level_db(first(&small_rotor(8000.0), 90.0));
        assert!(fast > slow + 10.0, "{slow} then {fast}");
    }

    #[test]
    fn gutin_in_the_rotor_plane_matches_a_hand_worked_case() {
        // Worked by hand from Gutin's formula: theta = 90 deg (thrust term drops out),
        // B = 2, m = 1, Omega = 628.3 rad/s, R_e = 0.1016 m, c = 343 m/s, r = 1 m,
        // Q = 0.1 N m: x = 2 x 628.32 x 0.1016 / 343 = 0.37222, J2(x) = x^2/8 (1 - x^2/12)
        // = 0.017119; loading Q c / (Omega R_e^2) = 5.2884 N; prefactor 2 x 628.32 /
        // (2 sqrt2 pi 343) = 0.41230; p = 0.41230 x 5.2884 x 0.017119 = 0.037327 Pa.
        let p = first(&small_rotor(6000.0), 90.0).get::<pascal>();
        assert!((p - 0.037_327).abs() < 2e-5, "{p}");
    }

    #[test]
    fn a_weighted_tonal_level_falls_off_the_rotor_plane_toward_the_axis() {
        // Gutin 1936: the tone is loudest near the rotor plane and vanishes on the axis.
        let r = small_rotor(6000.0);
        let at = |deg: f64| r.a_weighted_db(&listener(deg));
        assert!(at(100.0) > at(150.0));
        assert!(at(150.0) > at(175.0));
    }
}

//! Every published source a figure may cite, by id. Reports carry the ids;
//! the methods page prints the whole list with anchors `#source-{id}`.

use serde::Serialize;

#[derive(Debug, Clone, Copy, PartialEq, Eq, Serialize)]
pub struct Source {
    pub id: &'static str,
    pub title: &'static str,
    /// Authors, publisher, year, and what is taken from it.
    pub detail: &'static str,
}

pub const SOURCES: &[Source] = &[
    Source {
        id: "isa",
        title: "ISO 2533:1975 Standard Atmosphere; U.S. Standard Atmosphere, 1976",
        detail: "International Organization for Standardization, 1975; NOAA/NASA/USAF, 1976. \
                 Troposphere: T = 288.15 K - 6.5 K/km x h, p = 101325 Pa (T/288.15)^5.2559, \
                 rho = p / (287.053 T); g0 = 9.80665 m/s^2.",
    },
    Source {
        id: "momentum-theory",
        title: "Momentum (actuator-disk) theory of the hovering rotor",
        detail: "Rankine and Froude; Glauert, The Elements of Aerofoil and Airscrew Theory, 1926; \
                 any rotorcraft aerodynamics text (e.g. Leishman, Principles of Helicopter \
                 Aerodynamics, 2006, ch. 2). v_h = sqrt(T / (2 rho A)), P_ideal = T v_h, \
                 figure of merit FM = P_ideal / P_shaft.",
    },
    Source {
        id: "statics",
        title: "Statics of a rigid body",
        detail: "Newton's laws, any first-year mechanics text: a thrust T tilted by theta from the \
                 vertical has components T cos(theta) up and T sin(theta) sideways; with T cos(theta) \
                 = W the sideways force is W tan(theta), the acceleration g tan(theta).",
    },
    Source {
        id: "hoerner-1965",
        title: "Hoerner, Fluid-Dynamic Drag, 1965",
        detail: "S. F. Hoerner, published by the author, 1965. Drag F = 1/2 rho v^2 Cd A; flat plate \
                 normal to the flow Cd about 1.17-1.28, cube about 1.05, two-dimensional plate \
                 about 2.",
    },
    Source {
        id: "battery-energy",
        title: "Electrical energy of a battery",
        detail: "E = n V_nominal Q (cells x nominal cell voltage x capacity), I = P / V; a C rate \
                 is current divided by capacity per hour. Linden's Handbook of Batteries \
                 (Reddy, 4th ed., 2011) for cell voltages and specific energies.",
    },
    Source {
        id: "endurance-ceiling",
        title: "Hover endurance against battery mass",
        detail: "From momentum theory with a battery of fixed specific energy e: t = e m_b / P(m_0 + m_b) \
                 with P ~ (m g)^(3/2) / sqrt(2 rho A), so t ~ m_b / (m_0 + m_b)^(3/2), greatest at \
                 m_b = 2 m_0 (set dt/dm_b = 0).",
    },
    Source {
        id: "rigid-body",
        title: "Rotational dynamics of a rigid body",
        detail: "Euler's equation about a principal axis, M = I alpha; moment of inertia of a solid \
                 box about its centre I = m (a^2 + b^2) / 12 (any mechanics text). From rest, \
                 theta = alpha t^2 / 2.",
    },
    Source {
        id: "feedback-stability",
        title: "Stabilisation of an open-loop unstable system",
        detail: "Any control text (e.g. Franklin, Powell, Emami-Naeini, Feedback Control of Dynamic \
                 Systems): a plant with a pole in the right half-plane is stabilised only by feedback \
                 of its states; a hovering multirotor's attitude has no restoring moment, so it \
                 needs its angular rate measured.",
    },
    Source {
        id: "reaction-time",
        title: "Human simple reaction time",
        detail: "About 0.2-0.25 s to a visual cue (from memory; ergonomics handbooks).",
    },
    Source {
        id: "inertial-drift",
        title: "Dead reckoning with inertial sensors",
        detail: "A constant gyro bias b gives an attitude error b t; a constant acceleration error a \
                 gives a position error a t^2 / 2 (Titterton and Weston, Strapdown Inertial \
                 Navigation Technology, 2004, ch. 12).",
    },
    Source {
        id: "du-2015",
        title: "Du, Quan, Yang, Cai, Controllability analysis for multirotor helicopter rotor \
                degradation and failure, 2015",
        detail: "G.-X. Du, Q. Quan, B. Yang, K.-Y. Cai, Journal of Guidance, Control, and Dynamics \
                 38(5), 2015. Available control authority index (ACAI): the distance from the hover \
                 point to the boundary of the attainable force and moment set.",
    },
    Source {
        id: "coaxial-rotor",
        title: "Momentum theory of the coaxial rotor; Harrington's coaxial rotor tests",
        detail: "Leishman, Principles of Helicopter Aerodynamics, 2nd ed., 2006, the coaxial \
                 rotor: induced power of a pair against two isolated rotors at the same total \
                 thrust, kappa_int = sqrt 2 when the rotors act as one disk, 1.2808 for the ideal \
                 pair with the lower rotor in the upper's contracted wake; thrust at a given power \
                 scales as kappa_int^(-2/3). Harrington, NACA TN 2318, 1951: measured pairs near 1.16.",
    },
    Source {
        id: "glauert-forward",
        title: "Momentum theory of the rotor in forward flight (Glauert)",
        detail: "Glauert, A General Theory of the Autogyro, ARC R&M 1111, 1926; Leishman, \
                 Principles of Helicopter Aerodynamics, 2nd ed., 2006, ch. 2 and 5: induced \
                 velocity v_i = v_h^2 / sqrt((V cos a)^2 + (V sin a + v_i)^2); power in level \
                 flight = induced + profile + parasite (1/2 rho V^3 f), least at the bucket speed.",
    },
    Source {
        id: "deters-2014",
        title: "Deters, Ananda, Selig, Reynolds number effects on the performance of small-scale \
                propellers, 2014",
        detail: "R. W. Deters, G. K. Ananda, M. S. Selig, AIAA 2014-2151, 32nd AIAA Applied \
                 Aerodynamics Conference, 2014: static and advancing-flow tests of 27 off-the-shelf \
                 and 4 printed propellers of 2.25-9 in (57-229 mm), performance falling with the \
                 Reynolds number; the small ones reach a static figure of merit of about 0.65 \
                 at best.",
    },
    Source {
        id: "brandt-selig-2011",
        title: "Brandt and Selig, Propeller performance data at low Reynolds numbers, 2011",
        detail: "J. B. Brandt, M. S. Selig, AIAA 2011-1255, 49th AIAA Aerospace Sciences Meeting, \
                 2011: static and wind-tunnel tests of 9-11 in (229-279 mm) hobby propellers; \
                 static thrust and power coefficients C_T = T / (rho n^2 D^4), C_P = P / (rho n^3 \
                 D^5), the best with a figure of merit of about 0.75.",
    },
    Source {
        id: "propeller-laws",
        title: "Propeller laws at fixed propeller and motor constant",
        detail: "For a given propeller in static operation C_T and C_P are nearly constant (Reynolds \
                 effects aside; Brandt and Selig 2011), so T = C_T rho n^2 D^4 and P = C_P rho n^3 \
                 D^5: thrust goes with rpm^2, power with rpm^3, thrust with power^(2/3). A DC \
                 motor turns at n = KV (V - I R), taken as n proportional to V at fixed KV, so \
                 thrust goes with V^2, power with V^3 and current P / V with V^2.",
    },
    Source {
        id: "electrode-pairs",
        title: "Theoretical specific energy of an electrode pair",
        detail: "Faraday's law: an electrode material of molar mass M taking n electrons stores \
                 q = n F / M (F = 96485 C/mol); a pair of capacities q_a and q_c at cell voltage V \
                 holds at most V / (1/q_a + 1/q_c) per mass of active material, which no whole cell \
                 reaches. Linden's Handbook of Batteries (Reddy, 4th ed., 2011), ch. 1, tabulates \
                 these theoretical values.",
    },
    Source {
        id: "rotor-drag",
        title: "Rotor drag of a multirotor in edgewise flow (blade flapping and induced drag)",
        detail: "Mahony, Kumar, Corke, Multirotor Aerial Vehicles: Modeling, Estimation, and \
                 Control of Quadrotor, IEEE Robotics & Automation Magazine 19(3), 2012: a \
                 rotor moving edgewise through the air feels a drag in its plane that grows \
                 with its thrust and the airspeed, D = k T V, from blade flapping and induced \
                 drag; k is identified per craft (values here from memory).",
    },
    Source {
        id: "digital-control",
        title: "Sampling rate of a digital control loop",
        detail: "Franklin, Powell, Workman, Digital Control of Dynamic Systems, 3rd ed., 1998: \
                 a sampled loop works well when it samples many times (about ten to twenty) \
                 within the fastest time constant it must control; slower, the motion gets away \
                 between corrections (rule of thumb, from memory).",
    },
    Source {
        id: "iec-61672",
        title: "IEC 61672-1:2013 Electroacoustics - Sound level meters - Part 1: Specifications",
        detail: "International Electrotechnical Commission, 2013, annex E. A-weighting \
                 A(f) = 20 log10 R_A(f) + 2.00 dB, R_A = 12194^2 f^4 / ((f^2 + 20.6^2) \
                 sqrt((f^2 + 107.7^2)(f^2 + 737.9^2)) (f^2 + 12194^2)); reference pressure \
                 20 uPa.",
    },
    Source {
        id: "spherical-spreading",
        title: "Free-field spreading from a point source and the incoherent sum of levels",
        detail: "Any acoustics text (e.g. Kinsler, Frey, Coppens and Sanders, Fundamentals of \
                 Acoustics, 4th ed., 2000, ch. 5 and 10). L(r) = L(r0) - 20 log10(r / r0); \
                 incoherent sources add as L = 10 log10 sum 10^(L_i / 10).",
    },
    Source {
        id: "gutin-1936",
        title: "Gutin, On the sound field of a rotating propeller (1936)",
        detail: "L. Gutin, Physikalische Zeitschrift der Sowjetunion 9 (1936), 57-71; NACA TM \
                 1195 (1948) in translation; as reviewed in Marte and Kurtz, A Review of \
                 Aerodynamic Noise from Propellers, Rotors, and Lift Fans, JPL TR 32-1462, 1970. \
                 Steady-loading far-field tone of harmonic m, rms: p_m = m B Omega / (2 sqrt(2) \
                 pi c r) |-T cos(theta) + Q c / (Omega R_e^2)| J_mB(m B Omega R_e sin(theta) / \
                 c), theta from the thrust axis, R_e = 0.8 R (the form as recalled from memory, \
                 not checked against the document here).",
    },
];

pub fn get(id: &str) -> Option<&'static Source> {
    SOURCES.iter().find(|s| s.id == id)
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn source_ids_are_unique() {
        for (i, a) in SOURCES.iter().enumerate() {
            assert!(SOURCES[i + 1..].iter().all(|b| b.id != a.id), "{}", a.id);
        }
    }
}

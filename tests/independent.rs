//! Sheets made up here, not in the repository, checked against an independent
//! computation written in plain numbers from the textbook formulas (ISA,
//! momentum theory, Glauert's forward flight, battery energy), not through the
//! crate's physics code.

use liftaudit::claim::{self, Format};
use liftaudit::report::{keys, Tier, Verdict};
use liftaudit::rules;

/// A small deterministic generator (Knuth's MMIX LCG), so the sheets are the same every run.
struct Lcg(u64);
impl Lcg {
    fn next(&mut self) -> f64 {
        self.0 = self
            .0
            .wrapping_mul(6364136223846793005)
            .wrapping_add(1442695040888963407);
        (self.0 >> 11) as f64 / (1u64 << 53) as f64
    }
    fn range(&mut self, lo: f64, hi: f64) -> f64 {
        lo + (hi - lo) * self.next()
    }
    fn pick<T: Copy>(&mut self, items: &[T]) -> T {
        items[((self.next() * items.len() as f64) as usize).min(items.len() - 1)]
    }
}

/// ISA troposphere, written out from ISO 2533: T = 288.15 - 0.0065 h,
/// p = 101325 (T / 288.15)^5.25588, rho = p / (287.05287 T).
fn isa_density(h: f64) -> f64 {
    let t = 288.15 - 0.0065 * h;
    let p = 101_325.0 * (t / 288.15).powf(5.255_88);
    p / (287.052_87 * t)
}

fn gravity(h: f64) -> f64 {
    let r = 6_356_766.0;
    9.806_65 * (r / (r + h)).powi(2)
}

struct Sheet {
    text: String,
    mass: f64,
    n: f64,
    diameter: f64,
    thrust_gf: f64,
    power: f64,
    cells: f64,
    capacity_ah: f64,
    altitude: f64,
    minutes: f64,
}

fn make(rng: &mut Lcg, i: usize) -> Sheet {
    let n = rng.pick(&[2u32, 3, 4, 6, 8]);
    let mass = rng.range(0.05, 8.0);
    let diameter = rng.range(0.03, 0.45);
    let thrust_gf = rng.range(0.1, 1.5) * mass * 1000.0 / f64::from(n);
    let power = rng.range(2.0, 800.0);
    let cells = rng.pick(&[1u32, 2, 3, 4, 6]);
    let capacity_ah = rng.range(0.1, 12.0);
    let battery_g = rng.range(0.05, 0.6) * mass * 1000.0;
    let altitude = rng.range(0.0, 3000.0);
    let minutes = rng.range(1.0, 60.0);
    let text = format!(
        "title = \"held-out {i}\"\n[craft]\nmass = \"{:.6} kg\"\n[rotors]\ncount = {n}\ndiameter = \"{:.6} m\"\n\
         max_thrust = \"{thrust_gf:.6} g\"\nmax_power = \"{power:.6} W\"\ndrive = \"brushless\"\n\
         [battery]\nchemistry = \"lipo\"\ncells = {cells}\ncapacity = \"{capacity_ah:.6} Ah\"\nmass = \"{battery_g:.6} g\"\n\
         [claim]\nflight_time = \"{minutes:.6} min\"\n[conditions]\naltitude = \"{altitude:.6} m\"\n",
        mass, diameter
    );
    // Re-read the rounded values the sheet carries.
    let round = |v: f64| format!("{v:.6}").parse::<f64>().unwrap();
    Sheet {
        text,
        mass: round(mass),
        n: f64::from(n),
        diameter: round(diameter),
        thrust_gf: round(thrust_gf),
        power: round(power),
        cells: f64::from(cells),
        capacity_ah: round(capacity_ah),
        altitude: round(altitude),
        minutes: round(minutes),
    }
}

/// Least power of level flight over airspeed V, P = T v_i + D V with
/// D = rho V^2 f / 2, T = sqrt(W^2 + D^2) tilted forward by atan(D / W), and
/// Glauert's v_i = v_h^2 / sqrt((V cos a)^2 + (V sin a + v_i)^2) solved by
/// damped fixed-point iteration; the least over V by a ternary search.
fn least_power(w: f64, rho: f64, area: f64, f: f64) -> f64 {
    let power = |v: f64| {
        let d = 0.5 * rho * v * v * f;
        let t = (w * w + d * d).sqrt();
        let a = (d / w).atan();
        let vh2 = t / (2.0 * rho * area);
        let mut vi = vh2.sqrt();
        for _ in 0..150 {
            let next = vh2 / ((v * a.cos()).powi(2) + (v * a.sin() + vi).powi(2)).sqrt();
            vi = 0.5 * (vi + next);
        }
        t * vi + d * v
    };
    let hover = power(0.0);
    let (mut lo, mut hi) = (0.0, (2.0 * hover / (rho * f)).cbrt());
    for _ in 0..100 {
        let (m1, m2) = (lo + (hi - lo) / 3.0, hi - (hi - lo) / 3.0);
        if power(m1) < power(m2) {
            hi = m2;
        } else {
            lo = m1;
        }
    }
    power(0.5 * (lo + hi)).min(hover)
}

fn close(a: f64, b: f64) -> bool {
    (a - b).abs() <= 1e-6 * b.abs().max(1e-9)
}

#[test]
fn held_out_sheets_give_the_physical_limit_figures_of_an_independent_computation() {
    let mut rng = Lcg(20_261_201);
    for i in 0..300 {
        let s = make(&mut rng, i);
        let claim =
            claim::parse(&s.text, Format::Toml).unwrap_or_else(|e| panic!("{e}\n{}", s.text));
        let report = rules::run_all(&claim);
        let rho = isa_density(s.altitude);
        let w = s.mass * gravity(s.altitude);
        let area = s.n * std::f64::consts::PI * s.diameter * s.diameter / 4.0;

        // Momentum theory at the physical limit (FM = eta = 1), measured at sea level:
        // T_max = (2 rho0 A_r)^(1/3) P^(2/3) per rotor.
        let a_r = area / s.n;
        let bound = (2.0 * 1.225 * a_r).cbrt() * s.power.powf(2.0 / 3.0);
        let stated = s.thrust_gf * 9.806_65e-3;

        // Thrust: stated static thrust at sea level, scaled by density; a stated thrust
        // above the bound is impossible, and the bound stands in for it.
        let thrust = s.n * stated.min(bound) * rho / 1.225_0;
        let tm = report.finding("thrust-margin").unwrap();
        let hf = tm
            .figure(keys::HOVER_FRACTION, Some(Tier::PhysicalLimit))
            .unwrap()
            .value;
        assert!(
            (hf - w / thrust).abs() < 2e-4 * (w / thrust),
            "{i}: {hf} vs {}",
            w / thrust
        );

        let breaks_law = stated > bound || w > thrust;
        assert_eq!(
            tm.verdict == Verdict::Impossible,
            breaks_law,
            "{i}: stated {stated} N, bound {bound} N, W {w}, T {thrust}"
        );

        // Energy: hover P = W^1.5 / sqrt(2 rho A), E = cells x 3.7 V x Q. A flight time
        // need not be a hover time: at the physical limit the craft flies at its speed of
        // least power (Glauert; Leishman 2006, ch. 5), here with no profile power and the
        // body's drag area f = 0.05 x D^2 / 30 (no craft.size, no arm: the slim body of the
        // rotor span the rule assumes, at the streamlined limit of Hoerner).
        let p = w.powf(1.5) / (2.0 * rho * area).sqrt();
        let e_j = s.cells * 3.7 * s.capacity_ah * 3600.0;
        let f = 0.05 * s.diameter * s.diameter / 30.0;
        let minutes = e_j / least_power(w, rho, area, f) / 60.0;
        let eb = report.finding("energy-budget").unwrap();
        let got = eb
            .figure(keys::ENDURANCE, Some(Tier::PhysicalLimit))
            .unwrap()
            .value;
        assert!(
            (got - minutes).abs() < 2e-4 * minutes,
            "{i}: {got} vs {minutes}"
        );
        assert!(
            got >= e_j / p / 60.0 * (1.0 - 1e-9),
            "{i}: cruise beats hover"
        );
        let power = eb
            .figure(keys::HOVER_POWER, Some(Tier::PhysicalLimit))
            .unwrap()
            .value;
        assert!((power - p).abs() < 2e-4 * p, "{i}");
        if minutes < s.minutes * (1.0 - 1e-6) {
            assert_eq!(eb.verdict, Verdict::Impossible, "{i}");
        }
        assert!(close(claim.craft.mass.value, s.mass));
    }
}

#[test]
fn a_heavier_craft_never_gets_a_better_thrust_verdict() {
    // Tier order: more weight on the same rotors can only move the verdict toward impossible.
    let mut rng = Lcg(7);
    for i in 0..100 {
        let s = make(&mut rng, i);
        let light = rules::run_all(&claim::parse(&s.text, Format::Toml).unwrap());
        let heavier = s.text.replacen(
            &format!("mass = \"{:.6} kg\"", s.mass),
            &format!("mass = \"{:.6} kg\"", s.mass * 1.3),
            1,
        );
        assert_ne!(heavier, s.text);
        let heavy = rules::run_all(&claim::parse(&heavier, Format::Toml).unwrap());
        let sev = |r: &liftaudit::report::Report, id| r.finding(id).unwrap().verdict.severity();
        assert!(
            sev(&heavy, "thrust-margin") >= sev(&light, "thrust-margin"),
            "{i}"
        );
    }
}

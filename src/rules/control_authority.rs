//! Rule 5, control-authority: can the actuators make the forces and moments a
//! hover needs, with margin, and after a rotor is lost?
//!
//! Givens: where the rotors sit and how they spin and tilt ([`control::placements`]),
//! the weight W, each rotor's maximum thrust per tier (the thrust-margin
//! estimate) and the propeller's drag torque per thrust k = ratio x D.
//! Method: the control-effectiveness matrix at hover, its rank (which axes can
//! be commanded at all), and the ACAI of Du, Quan, Yang, Cai 2015 (how far the
//! hover point lies inside the set of forces and moments the rotors can make),
//! intact and with rotors lost. Comparison: ACAI > 0 at the physical limit and
//! at best practice; at the typical tier, ACAI above the moment of a typical
//! thrust mismatch between rotors.

use std::borrow::Cow;
use std::cell::OnceCell;
use std::fmt;

use serde::Serialize;
use uom::si::f64::{Force, Length};
use uom::si::{length::millimeter, torque::newton_meter};

use super::common::{self, fixed, per_tier, tiered};
use super::thrust_margin;
use crate::catalog::tiers::{REACTIVE_TORQUE, THRUST_MISMATCH};
use crate::claim::{Claim, Layout, Mount, Spin};
use crate::physics::control::{self, Authority, Axis, Hover, Placement};
use crate::report::{keys, Figure, Finding, Sig3, Verdict};
use crate::tier::{PerTier, Tier};

pub const ID: &str = "control-authority";
pub const TITLE: &str = "Control authority";
pub const METHOD: &str = "Each actuator's effect on thrust, roll, pitch and yaw at hover makes one column of the control-effectiveness matrix: a rotor at (x, y, z) spinning s (+1 clockwise seen from above) gives [1, y, -x, s k] per newton, with k the propeller's drag torque per thrust; a tilt actuator with hinge h gives T_h [0, r x d + s k d] with d = h x z, linearised at the hover thrust T_h = W / n, so a tilting rotor pitches the craft only through its height above the centre of mass. The rank of the matrix (SVD, relative tolerance 1e-9) says which axes can be commanded; fewer than four is impossible. The available control authority index (ACAI, Du, Quan, Yang, Cai 2015) is the signed distance from the hover point (W, 0, 0, 0) to the boundary of the set of forces and moments the actuators can make with each rotor between 0 and its maximum thrust and each tilt within its range: for every three independent columns, the support of the set along the normal of their span, less the hover point's offset from the set's centre along it; the least of these. ACAI <= 0 at the physical limit is impossible, at best practice implausible; at the typical tier it must exceed the moment of a typical thrust mismatch (5 % of one rotor's hover thrust on its lever) or the claim is doubtful. A claimed rotor-failure tolerance of k is judged the same way on the ACAI with every set of up to k rotors stopped.";

/// The most work (ACAI evaluations x face normals x generators) the rule does for one
/// sheet: the intact ACAI for up to about 40 actuators, the failure table for fewer.
const SEARCH_BUDGET: f64 = 4e6;
/// Figure keys of the worst ACAI with one, two, ... rotors lost.
const LOST_KEYS: [&str; 4] = keys::ACAI_ROTORS_LOST;

/// What the rule works out from a claim; shared with [`layout_view`].
struct Analysis {
    placements: Vec<Placement>,
    weight: Force,
    diameter: Length,
    authority: Authority,
    /// Per-rotor maximum thrust per tier, when the sheet lets it be estimated.
    thrust: Option<PerTier<Force>>,
    /// The attainable set's face normals, worked out on first use: one set per
    /// distinct drag-torque ratio (the generous tiers share theirs), and the set of each tier.
    faces: OnceCell<(Vec<control::Faces>, PerTier<usize>)>,
}

/// Sets of lost rotors (0-based), with the ACAI at each tier.
type FailureTable = Vec<(Vec<usize>, PerTier<f64>)>;

impl Analysis {
    fn torque_ratio(&self, t: Tier) -> Length {
        self.diameter * REACTIVE_TORQUE.at(t)
    }

    fn acai(&self, t: Tier, lost: &[usize]) -> Option<f64> {
        let hover = Hover {
            weight: self.weight,
            rotor_thrust: self.thrust?[t],
            torque_ratio: self.torque_ratio(t),
        };
        let (faces, of_tier) = self.faces.get_or_init(|| {
            let mut ratios: Vec<Length> = Vec::with_capacity(3);
            let of_tier = PerTier::from_fn(|t| {
                let k = self.torque_ratio(t);
                ratios.iter().position(|&r| r == k).unwrap_or_else(|| {
                    ratios.push(k);
                    ratios.len() - 1
                })
            });
            let faces = ratios
                .into_iter()
                .map(|k| control::Faces::new(&self.placements, k))
                .collect();
            (faces, of_tier)
        });
        Some(faces[of_tier[t]].hover_acai(&self.placements, &hover, lost))
    }

    /// The margin the ACAI must clear: none at the generous tiers; at the typical
    /// tier the moment of a typical thrust mismatch on the rotor with the longest lever.
    fn margin(&self, t: Tier, lost: &[usize]) -> f64 {
        if t != Tier::Typical {
            return 0.0;
        }
        let alive = (self.placements.len() - lost.len()).max(1) as f64;
        let error = self.weight / alive * THRUST_MISMATCH.at(t);
        self.placements
            .iter()
            .enumerate()
            .filter(|(i, _)| !lost.contains(i))
            .map(|(_, p)| control::mismatch_moment(p, error, self.torque_ratio(t)))
            .map(|m| m.get::<newton_meter>())
            .fold(0.0, f64::max)
    }

    /// Whether `cases` ACAIs (each over every three of c columns) fit the budget.
    fn affordable(&self, cases: usize) -> bool {
        let c = (self.placements.len()
            + self.placements.iter().filter(|p| p.tilt.is_some()).count()) as f64;
        cases as f64 * c * c * c * c / 6.0 <= SEARCH_BUDGET
    }

    /// Every set of up to `size` lost rotors, if the search fits the budget.
    fn failures(&self, size: usize) -> Option<FailureTable> {
        let n = self.placements.len();
        let sets: Vec<Vec<usize>> = (1..=size.min(n.saturating_sub(1)))
            .flat_map(|k| control::combinations(n, k))
            .collect();
        if !self.affordable(3 * sets.len()) {
            return None;
        }
        sets.into_iter()
            .map(|s| {
                let v = PerTier::from_fn(|t| self.acai(t, &s));
                Some((
                    s,
                    PerTier::new(v.physical_limit?, v.best_practice?, v.typical?),
                ))
            })
            .collect()
    }
}

const SEARCH_LIMIT: &str = "A control-allocation study beyond this screen's search limit; the rank above holds regardless.";
const NEEDS_THRUST: &str = "a per-rotor thrust (rotors.max_thrust), a motor class (rotors.motor), or power and diameter (rotors.max_power and rotors.diameter)";

/// How many rotors lost at once the failure table goes up to: the claimed
/// tolerance, and at least one (two for six or more rotors), at most four.
fn failure_search(claim: &Claim, n: usize) -> usize {
    let usual = if n >= 6 { 2 } else { 1 };
    (claim.claim.survives_rotor_failure as usize)
        .max(usual)
        .min(LOST_KEYS.len())
}

/// The analysis, or the fields the sheet would need for it.
fn analyse(claim: &Claim) -> Result<Analysis, &'static str> {
    let r = &claim.rotors;
    let Some(placements) = control::placements(r) else {
        let needs = match r.layout {
            None | Some(Layout::Custom) => "the rotor layout (rotors.layout with rotors.arm, or layout = \"custom\" with [[rotors.at]] positions)",
            Some(_) => "the arm length (rotors.arm)",
        };
        return Err(needs);
    };
    let Some((diameter, _)) = common::rotor_diameter(claim) else {
        return Err("the rotor diameter (rotors.diameter) or a motor class (rotors.motor)");
    };
    let air = common::air(claim);
    let weight = common::weight(claim, &air);
    let share = weight / placements.len() as f64;
    let k = diameter * REACTIVE_TORQUE.at(Tier::Typical);
    let authority = control::authority(&control::effectiveness(&placements, share, k).matrix);
    let thrust = thrust_margin::estimate(claim, &air).map(|e| e.available);
    Ok(Analysis {
        placements,
        weight,
        diameter,
        authority,
        thrust,
        faces: OnceCell::new(),
    })
}

/// The tier as a headline says it.
fn tier_phrase(t: Tier) -> &'static str {
    match t {
        Tier::PhysicalLimit => "at the physical limit",
        Tier::BestPractice => "at best practice",
        Tier::Typical => "with typical rotors",
    }
}

/// The items as a list in words: "a", "a and b", "a, b and c".
fn and_list<T: fmt::Display>(items: impl IntoIterator<Item = T>) -> String {
    let items: Vec<String> = items.into_iter().map(|item| item.to_string()).collect();
    match items.split_last() {
        Some((last, rest)) if !rest.is_empty() => format!("{} and {last}", rest.join(", ")),
        Some((last, _)) => last.clone(),
        None => String::new(),
    }
}

/// Axes by their ids: "roll", "roll and yaw", "roll, pitch and yaw".
fn axes(list: &[Axis]) -> String {
    and_list(list.iter().map(|a| a.id()))
}

/// Rotor numbers as the report shows them, from 1: "rotor 2", "rotors 1 and 4".
struct RotorList<'a>(&'a [usize]);

impl fmt::Display for RotorList<'_> {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        let noun = if self.0.len() > 1 { "rotors" } else { "rotor" };
        write!(f, "{noun} {}", and_list(self.0.iter().map(|i| i + 1)))
    }
}

/// What would give a craft the axes it lacks.
fn fix_for_rank(claim: &Claim, a: &Authority) -> &'static str {
    let r = &claim.rotors;
    let lacks = |x: Axis| a.lacking.contains(&x);
    if lacks(Axis::Pitch) && r.mount == Mount::Tilting && r.height.get::<millimeter>() == 0.0 {
        "its tilting rotors mounted above the centre of mass (rotors.height), so that tilting them fore and aft pitches the craft"
    } else if lacks(Axis::Pitch) || lacks(Axis::Roll) {
        "rotors that tilt fore and aft on hinges along their arms, mounted above the centre of mass (as on a bicopter); or four rotors in an X with alternating spins"
    } else {
        "a yaw servo that tilts one rotor sideways (as on a tricopter); or rotors of both spin directions around the centre of mass"
    }
}

/// Why axes are missing, in words.
struct WhyRank<'a>(&'a Authority);

impl fmt::Display for WhyRank<'_> {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        let a = self.0;
        let unmoved = !a.unmoved.is_empty();
        if unmoved {
            write!(f, "nothing on it makes a {} moment", axes(&a.unmoved))?;
        }
        if a.tied.len() > 1 {
            if unmoved {
                f.write_str(", and ")?;
            }
            write!(f, "{} share the same inputs", axes(&a.tied))?;
        }
        Ok(())
    }
}

pub fn check(claim: &Claim) -> Finding {
    match analyse(claim) {
        Ok(an) => assess(claim, &an),
        Err(needs) => Finding::not_assessed(ID, needs),
    }
}

/// The finding and the intact top view ([`layout_view`] with no rotor lost)
/// from one analysis: the verdict page draws the rotors beside the report,
/// and the analysis (an SVD among it) need not run twice.
pub fn check_with_view(claim: &Claim) -> (Finding, Option<LayoutView>) {
    match analyse(claim) {
        Ok(an) => {
            let view = view_of(&an, &[], &an.authority);
            (assess(claim, &an), Some(view))
        }
        Err(needs) => (Finding::not_assessed(ID, needs), None),
    }
}

/// The finding of an analysis.
fn assess(claim: &Claim, an: &Analysis) -> Finding {
    let n = an.placements.len();
    let a = &an.authority;
    let rank = fixed(
        keys::RANK,
        "Axes the actuators can command independently (rank of the control-effectiveness matrix, of 4)",
        a.rank as f64,
        "1",
    );
    let mut assumptions = Vec::with_capacity(4);
    assumptions.push(format!(
        "Rotor positions from the {} layout; body axes x forward, y left, z up; rotors numbered clockwise from the nose seen from above.",
        claim.rotors.layout.map_or("stated", Layout::id),
    ));
    assumptions.push(format!(
        "Propeller drag torque per thrust {} of the rotor diameter ({} mm); {}.",
        REACTIVE_TORQUE.values,
        Sig3(an.diameter.get::<millimeter>()),
        REACTIVE_TORQUE.basis,
    ));
    assumptions.push(
        "Tilt actuators linearised at hover, each rotor carrying an equal share of the weight."
            .to_string(),
    );
    let sources: &[&str] = &["du-2015", "statics"];

    // 1. Rank: an axis no actuator can command cannot be held at any thrust.
    if a.rank < 4 {
        return Finding {
            rule: ID,
            verdict: Verdict::Impossible,
            headline: format!(
                "Its actuators cannot command {} independently: {}. Without control of every axis it cannot hold a hover.",
                axes(&a.lacking),
                WhyRank(a),
            ),
            figures: vec![rank],
            would_take: format!("It would take {}.", fix_for_rank(claim, a)),
            assumptions,
            sources,
        };
    }
    let Some(thrust) = an.thrust else {
        let mut f = Finding::not_assessed(ID, NEEDS_THRUST);
        f.headline = format!(
            "Its actuators can command all four axes, but the margin is not assessed: the sheet does not give {NEEDS_THRUST}."
        );
        f.figures.push(rank);
        return f;
    };

    if !an.affordable(3) {
        let mut f = Finding::not_assessed(
            ID,
            "fewer actuators (this screen searches up to about 40 rotor thrusts and tilts)",
        );
        f.headline = "Its actuators can command all four axes; the margin is not assessed: it has more actuators than this screen searches.".to_string();
        f.would_take = SEARCH_LIMIT.to_string();
        f.figures.push(rank);
        return f;
    }

    // 2. ACAI with rotors lost and intact, per tier.
    let claimed = claim.claim.survives_rotor_failure as usize;
    let searched = failure_search(claim, n);
    let table = an.failures(searched);
    if claimed > searched || (claimed > 0 && table.is_none()) {
        let mut f = Finding::not_assessed(ID, "a craft small enough to search every combination of lost rotors (up to four lost, about 16 rotors)");
        f.headline = format!(
            "Not assessed: the claim to survive {claimed} lost rotors needs more combinations searched than this screen does."
        );
        f.would_take = SEARCH_LIMIT.to_string();
        f.figures.push(rank);
        return f;
    }
    let searched = if table.is_some() { searched } else { 0 };
    let intact = PerTier::from_fn(|t| an.acai(t, &[]).unwrap_or(f64::NAN));
    let table = table.unwrap_or_default();
    let claimed_sets = || table.iter().filter(|(s, _)| s.len() <= claimed);
    let passes = |t: Tier| {
        intact[t] > an.margin(t, &[]) && claimed_sets().all(|(s, v)| v[t] > an.margin(t, s))
    };
    let fails_at = common::first_failure(passes);
    let verdict = Verdict::failing_at(fails_at);

    // The rank, the margin, and per tier the ACAI and the worst of each failure size.
    let mut figures = Vec::with_capacity(2 + 3 * (1 + LOST_KEYS.len()));
    figures.push(rank);
    figures.extend(per_tier(
        keys::ACAI,
        "Available control authority index, intact (N and N m)",
        "N, N m",
        |t| intact[t],
    ));
    figures.push(tiered(
        keys::MISMATCH_MOMENT,
        "Moment of a typical thrust mismatch, the margin the ACAI must clear",
        Tier::Typical,
        an.margin(Tier::Typical, &[]),
        "N m",
    ));
    let worst = |size: usize, t: Tier| {
        table
            .iter()
            .filter(|(s, _)| s.len() == size)
            .min_by(|a, b| a.1[t].total_cmp(&b.1[t]))
    };
    for (size, key) in LOST_KEYS.iter().enumerate().map(|(i, k)| (i + 1, *k)) {
        for t in Tier::ALL {
            if let Some((s, v)) = worst(size, t) {
                let label = match size {
                    1 => format!("ACAI with the worst rotor lost ({})", RotorList(s)),
                    _ => format!("ACAI with the worst {size} rotors lost ({})", RotorList(s)),
                };
                figures.push(tiered(key, label, t, v[t], "N, N m"));
            }
        }
    }
    figures.retain(|f: &Figure| f.value.is_finite());

    // 3. The words.
    let at = |t: Tier| Sig3(intact[t]);
    let lifts = |t: Tier| thrust[t] * n as f64 >= an.weight;
    let first_bad_set = |t: Tier| claimed_sets().find(|(s, v)| v[t] <= an.margin(t, s));
    let intact_fails = |t: Tier| intact[t] <= an.margin(t, &[]);
    let (headline, would_take) = match fails_at {
        Some(t) if intact_fails(t) && !lifts(t) => (
            format!(
                "Its rotors cannot lift it even at full thrust ({}), so nothing is left to steer with (see thrust-margin).",
                tier_phrase(t),
            ),
            "It would take more thrust per rotor or more rotors (see thrust-margin).".to_string(),
        ),
        Some(Tier::Typical) if intact[Tier::Typical] <= 0.0 => (
            format!(
                "With typical rotors it cannot make every moment a hover needs (ACAI {}); only better-than-typical ones give it control.",
                at(Tier::Typical),
            ),
            "It would take rotors with more thrust to spare (hovering well below full thrust), or longer arms.".to_string(),
        ),
        Some(Tier::Typical) if intact_fails(Tier::Typical) => (
            format!(
                "Its control margin in hover (ACAI {} with typical rotors) is smaller than the {} N m of a typical {} % thrust mismatch between rotors: a worn propeller or a gust could tip it.",
                at(Tier::Typical),
                Sig3(an.margin(Tier::Typical, &[])),
                (100.0 * THRUST_MISMATCH.at(Tier::Typical)).round(),
            ),
            "It would take rotors with more thrust to spare (hovering well below full thrust), or longer arms.".to_string(),
        ),
        Some(t) if intact_fails(t) => (
            format!(
                "Even at full thrust from {} rotors it cannot make every moment a hover needs (ACAI {} {}).",
                if t == Tier::PhysicalLimit { "perfect" } else { "the best" },
                at(t),
                tier_phrase(t),
            ),
            "It would take rotors with more thrust to spare, longer arms, or rotors of both spin directions spread around the centre of mass.".to_string(),
        ),
        Some(t) => {
            let (set, v) = first_bad_set(t).map_or((&[][..], 0.0), |(s, v)| (&s[..], v[t]));
            (
                format!(
                    "It is said to keep flying after losing {claimed} {}, but with {} lost the rest {} (ACAI {} {}).",
                    if claimed > 1 { "rotors" } else { "rotor" },
                    RotorList(set),
                    if v <= 0.0 { "cannot make every moment a hover needs" } else { "have too little control to spare" },
                    Sig3(v),
                    tier_phrase(t),
                ),
                "It would take six or more rotors with thrust to spare and a failure-tolerant spin pattern (for six, P P N N P N: Du et al. 2015), or no claim of rotor-failure tolerance.".to_string(),
            )
        }
        None => {
            let single = worst(1, Tier::Typical);
            let after: Cow<str> = match (claimed, single) {
                (0, Some((s, v))) if v[Tier::Typical] <= 0.0 => {
                    format!(" Losing {} would leave it without control.", RotorList(s)).into()
                }
                (0, Some(_)) => " It could keep flying after losing any one rotor.".into(),
                (k, _) if k > 0 => format!(" It keeps control after losing any {k}.").into(),
                _ => "".into(),
            };
            (
                format!(
                    "Its rotors can command thrust, roll, pitch and yaw with margin (ACAI {} with typical rotors, against {} N m of a typical thrust mismatch).{after}",
                    at(Tier::Typical),
                    Sig3(an.margin(Tier::Typical, &[])),
                ),
                "Nothing: its actuators hold a hover with control to spare.".to_string(),
            )
        }
    };
    assumptions.push(format!(
        "Rotor thrust between zero and the thrust-margin estimate at each tier; a lost rotor gives none. Failure sets searched: up to {searched} {} lost at once.",
        if searched == 1 { "rotor" } else { "rotors" },
    ));
    Finding {
        rule: ID,
        verdict,
        headline,
        figures,
        would_take,
        assumptions,
        sources,
    }
}

/// One rotor as the top view draws it.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct RotorView {
    /// As the report numbers it, from 1.
    pub number: usize,
    pub x_mm: f64,
    pub y_mm: f64,
    pub z_mm: f64,
    pub spin: &'static str,
    pub tilts: bool,
    pub lost: bool,
}

/// What the web layer draws: the rotors (with `lost` ones marked) and the
/// axes the remaining actuators cannot command.
#[derive(Debug, Clone, PartialEq, Serialize)]
pub struct LayoutView {
    pub rotors: Vec<RotorView>,
    pub rank: usize,
    pub lacking: Vec<Axis>,
}

/// The top view of the claim's rotors with the rotors numbered in `lost` (from 1) stopped.
pub fn layout_view(claim: &Claim, lost: &[usize]) -> Option<LayoutView> {
    let an = analyse(claim).ok()?;
    let lost: Vec<usize> = lost.iter().filter_map(|i| i.checked_sub(1)).collect();
    if lost.is_empty() {
        return Some(view_of(&an, &lost, &an.authority));
    }
    let share = an.weight / an.placements.len() as f64;
    let e = control::effectiveness(&an.placements, share, an.torque_ratio(Tier::Typical));
    Some(view_of(&an, &lost, &control::authority(&e.without(&lost))))
}

/// The top view of an analysis, `lost` (indices from 0) marked, with the
/// authority of the rotors left.
fn view_of(an: &Analysis, lost: &[usize], authority: &Authority) -> LayoutView {
    LayoutView {
        rotors: an
            .placements
            .iter()
            .enumerate()
            .map(|(i, p)| RotorView {
                number: i + 1,
                x_mm: p.x.get::<millimeter>(),
                y_mm: p.y.get::<millimeter>(),
                z_mm: p.z.get::<millimeter>(),
                spin: match p.spin {
                    Spin::Cw => "cw",
                    Spin::Ccw => "ccw",
                },
                tilts: p.tilt.is_some(),
                lost: lost.contains(&i),
            })
            .collect(),
        rank: authority.rank,
        lacking: authority.lacking.clone(),
    }
}

/// The single rotor (numbered from 1) whose loss leaves the least control
/// authority at the typical tier, with the ACAI at each tier after losing it
/// (Du, Quan, Yang, Cai 2015: below zero, hover cannot be held). `None` when
/// the rule could not search failures (no thrust estimate, too many actuators).
pub fn worst_single_loss(claim: &Claim) -> Option<(usize, [f64; 3])> {
    let an = analyse(claim).ok()?;
    an.thrust?;
    an.failures(1)?
        .into_iter()
        .filter(|(_, acai)| acai.iter().all(|a| a.is_finite()))
        .min_by(|a, b| a.1[Tier::Typical].total_cmp(&b.1[Tier::Typical]))
        // In tier order, as the drawings of the web layer read it.
        .map(|(lost, acai)| {
            (
                lost[0] + 1,
                [acai.physical_limit, acai.best_practice, acai.typical],
            )
        })
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::claim::{parse, Format};

    /// A 1 kg craft (weight 9.81 N) with the given `[rotors]` lines and extra tables.
    fn sheet(rotors: &str, extra: &str) -> Claim {
        let text = format!(
            "title = \"t\"\n[craft]\nmass = \"1 kg\"\n[rotors]\ndiameter = \"10 in\"\n{rotors}\n{extra}"
        );
        parse(&text, Format::Toml).unwrap_or_else(|e| panic!("{e}"))
    }

    fn acai(f: &Finding, t: Tier) -> f64 {
        f.figure(keys::ACAI, Some(t)).map_or(f64::NAN, |f| f.value)
    }

    #[test]
    fn an_ordinary_quad_x_commands_every_axis_with_margin() {
        let f = check(&sheet(
            "layout = \"quad-x\"\narm = \"225 mm\"\nmax_thrust = \"600 g\"",
            "",
        ));
        assert_eq!(f.verdict, Verdict::Consistent, "{}", f.headline);
        assert_eq!(f.figure(keys::RANK, None).unwrap().value, 4.0);
        assert!(Tier::ALL.into_iter().all(|t| acai(&f, t) > 0.0));
        // du-2015: a quadrotor that loses any rotor has ACAI < 0.
        let lost = f
            .figure(keys::ACAI_ONE_ROTOR_LOST, Some(Tier::Typical))
            .unwrap();
        assert!(lost.value < 0.0);
        assert!(f.headline.contains("Losing rotor"), "{}", f.headline);
    }

    #[test]
    fn two_fixed_rotors_side_by_side_are_impossible_with_rank_2() {
        // DESIGN rule 5: two fixed rotors give rank 2: roll and yaw share one input.
        let f = check(&sheet(
            "layout = \"side-by-side\"\narm = \"70 mm\"\nmax_thrust = \"900 g\"",
            "",
        ));
        assert_eq!(f.verdict, Verdict::Impossible);
        assert_eq!(f.figure(keys::RANK, None).unwrap().value, 2.0);
        assert!(f.headline.contains("pitch and yaw"), "{}", f.headline);
        assert!(f.headline.contains("roll and yaw share"), "{}", f.headline);
        assert!(f.would_take.contains("tilt"), "{}", f.would_take);
    }

    #[test]
    fn an_axis_no_actuator_commands_is_impossible_even_without_a_thrust_figure() {
        let f = check(&sheet("layout = \"side-by-side\"\narm = \"70 mm\"", ""));
        assert_eq!(f.verdict, Verdict::Impossible);
        let f = check(&sheet("layout = \"quad-x\"\narm = \"225 mm\"", ""));
        assert_eq!(f.verdict, Verdict::NotAssessed);
        assert_eq!(f.figure(keys::RANK, None).unwrap().value, 4.0);
        assert!(f.headline.contains("rotors.max_thrust"), "{}", f.headline);
    }

    #[test]
    fn two_tilting_rotors_need_a_height_above_the_centre_of_mass() {
        // DESIGN rule 5: a tilting rotor makes a pitch moment only through its height.
        let bicopter = "layout = \"side-by-side\"\narm = \"200 mm\"\nmax_thrust = \"900 g\"\nmount = \"tilting\"\ntilt_range = \"30 deg\"";
        let flat = check(&sheet(bicopter, ""));
        assert_eq!(flat.verdict, Verdict::Impossible);
        assert_eq!(flat.figure(keys::RANK, None).unwrap().value, 3.0);
        assert!(
            flat.would_take.contains("rotors.height"),
            "{}",
            flat.would_take
        );
        let raised = check(&sheet(&format!("{bicopter}\nheight = \"60 mm\""), ""));
        assert_eq!(raised.figure(keys::RANK, None).unwrap().value, 4.0);
        assert!(acai(&raised, Tier::Typical) > 0.0);
        assert_eq!(raised.verdict, Verdict::Consistent, "{}", raised.headline);
    }

    #[test]
    fn a_tricopter_holds_yaw_with_its_servo_and_not_without_it() {
        let tri = check(&sheet(
            "layout = \"tri\"\narm = \"250 mm\"\nmax_thrust = \"700 g\"",
            "",
        ));
        assert_eq!(tri.verdict, Verdict::Consistent, "{}", tri.headline);
        // A servo that cannot move leaves the reactive torques unbalanced.
        let stuck = check(&sheet(
            "layout = \"tri\"\narm = \"250 mm\"\nmax_thrust = \"700 g\"\ntilt_range = \"0 deg\"",
            "",
        ));
        assert_eq!(stuck.verdict, Verdict::Impossible, "{}", stuck.headline);
        assert!(acai(&stuck, Tier::PhysicalLimit) <= 0.0);
        // Three fixed rotors placed by hand: no servo, rank 3, yaw missing.
        let at = |x: i32, y: i32, spin: &str| {
            format!("[[rotors.at]]\nx = \"{x} mm\"\ny = \"{y} mm\"\nspin = \"{spin}\"\n")
        };
        let custom = format!(
            "layout = \"custom\"\ncount = 3\nmax_thrust = \"700 g\"\n{}{}{}",
            at(125, -217, "cw"),
            at(-250, 0, "cw"),
            at(125, 217, "ccw")
        );
        let f = check(&sheet(&custom, ""));
        assert_eq!(f.verdict, Verdict::Impossible);
        assert_eq!(f.figure(keys::RANK, None).unwrap().value, 3.0);
        assert!(f.headline.contains("yaw independently"), "{}", f.headline);
        assert!(f.would_take.contains("yaw servo"), "{}", f.would_take);
    }

    #[test]
    fn a_centre_of_mass_outside_the_rotors_is_impossible() {
        // Four rotors all ahead of the centre of mass: nothing can balance the nose-down moment.
        let at = |x: i32, y: i32, spin: &str| {
            format!("[[rotors.at]]\nx = \"{x} mm\"\ny = \"{y} mm\"\nspin = \"{spin}\"\n")
        };
        let custom = format!(
            "layout = \"custom\"\ncount = 4\nmax_thrust = \"700 g\"\n{}{}{}{}",
            at(400, -100, "cw"),
            at(200, -100, "ccw"),
            at(200, 100, "cw"),
            at(400, 100, "ccw")
        );
        let f = check(&sheet(&custom, ""));
        assert_eq!(f.figure(keys::RANK, None).unwrap().value, 4.0);
        assert_eq!(f.verdict, Verdict::Impossible, "{}", f.headline);
        assert!(acai(&f, Tier::PhysicalLimit) < 0.0);
    }

    #[test]
    fn moments_that_only_better_than_best_rotors_balance_are_implausible() {
        // Centre of mass 40 mm behind the middle of a quad-plus (custom): the rear rotor
        // must carry most of the weight. From power and diameter, the perfect rotor
        // (FM 1, eta 1) has thrust to spare, the best real one does not.
        let at = |x: i32, y: i32, spin: &str| {
            format!("[[rotors.at]]\nx = \"{x} mm\"\ny = \"{y} mm\"\nspin = \"{spin}\"\n")
        };
        let custom =
            format!(
            "layout = \"custom\"\ncount = 4\nmax_power = \"30 W\"\ndrive = \"brushless\"\n{}{}{}{}",
            at(260, 0, "cw"), at(60, -200, "ccw"), at(-140, 0, "cw"), at(60, 200, "ccw")
        );
        let f = check(&sheet(&custom, ""));
        assert_eq!(f.verdict, Verdict::Implausible, "{}", f.headline);
    }

    #[test]
    fn a_margin_below_a_typical_thrust_mismatch_is_doubtful() {
        // Hovering at 97 % of full thrust leaves too little for a 5 % mismatch.
        let f = check(&sheet(
            "layout = \"quad-x\"\narm = \"225 mm\"\nmax_thrust = \"258 g\"",
            "",
        ));
        assert_eq!(f.verdict, Verdict::Doubtful, "{}", f.headline);
        assert!(acai(&f, Tier::Typical) > 0.0);
        let margin = f
            .figure(keys::MISMATCH_MOMENT, Some(Tier::Typical))
            .unwrap()
            .value;
        assert!(acai(&f, Tier::Typical) < margin);
    }

    #[test]
    fn a_hexacopter_with_alternating_spins_does_not_survive_a_lost_rotor() {
        // du-2015: alternating spins, ACAI = 0 with any one rotor lost.
        let hex = "layout = \"hex\"\narm = \"275 mm\"\nmax_thrust = \"700 g\"";
        let claims = "[claim]\nsurvives_rotor_failure = 1";
        let f = check(&sheet(hex, claims));
        assert_eq!(f.verdict, Verdict::Impossible, "{}", f.headline);
        assert!(f.headline.contains("losing 1 rotor"), "{}", f.headline);
        assert!(f.would_take.contains("P P N N P N"));
        // Without the claim the same craft is fine, and the figures show the loss.
        let f = check(&sheet(hex, ""));
        assert_eq!(f.verdict, Verdict::Consistent, "{}", f.headline);
        let lost = f
            .figure(keys::ACAI_ONE_ROTOR_LOST, Some(Tier::PhysicalLimit))
            .unwrap();
        assert!(lost.value.abs() < 1e-9);
        assert!(f
            .figure(keys::ACAI_TWO_ROTORS_LOST, Some(Tier::Typical))
            .is_some());
    }

    #[test]
    fn a_ppnnpn_hexacopter_still_fails_a_claim_when_rotor_5_or_6_is_lost() {
        // du-2015: spins P P N N P N, ACAI < 0 when rotor 5 or 6 is lost.
        let hex = "layout = \"hex\"\narm = \"275 mm\"\nmax_thrust = \"700 g\"\nspins = [\"cw\", \"cw\", \"ccw\", \"ccw\", \"cw\", \"ccw\"]";
        let f = check(&sheet(hex, "[claim]\nsurvives_rotor_failure = 1"));
        assert_eq!(f.verdict, Verdict::Impossible, "{}", f.headline);
        assert!(
            f.headline.contains("rotor 5") || f.headline.contains("rotor 6"),
            "{}",
            f.headline
        );
    }

    #[test]
    fn an_octocopter_with_thrust_to_spare_survives_a_lost_rotor() {
        let octo = "layout = \"octo\"\narm = \"300 mm\"\nmax_thrust = \"600 g\"\nspins = [\"cw\", \"cw\", \"ccw\", \"ccw\", \"cw\", \"cw\", \"ccw\", \"ccw\"]";
        let f = check(&sheet(octo, "[claim]\nsurvives_rotor_failure = 1"));
        assert_eq!(f.verdict, Verdict::Consistent, "{}", f.headline);
        assert!(f.headline.contains("after losing any 1"), "{}", f.headline);
    }

    #[test]
    fn an_unknown_layout_or_a_missing_arm_is_not_assessed_by_name() {
        let f = check(&sheet("count = 5\nmax_thrust = \"700 g\"", ""));
        assert_eq!(f.verdict, Verdict::NotAssessed);
        assert!(
            f.headline.contains("rotors.layout") && f.headline.contains("rotors.at"),
            "{}",
            f.headline
        );
        let f = check(&sheet("layout = \"hex\"\nmax_thrust = \"700 g\"", ""));
        assert_eq!(f.verdict, Verdict::NotAssessed);
        assert!(f.headline.contains("rotors.arm"));
    }

    #[test]
    fn the_layout_view_marks_lost_rotors_and_the_axes_they_take_away() {
        let quad = sheet(
            "layout = \"quad-x\"\narm = \"225 mm\"\nmax_thrust = \"600 g\"",
            "",
        );
        let view = layout_view(&quad, &[]).unwrap();
        assert_eq!((view.rotors.len(), view.rank), (4, 4));
        assert!((view.rotors[0].x_mm - 159.1).abs() < 0.1 && view.rotors[0].y_mm < 0.0);
        let two_lost = layout_view(&quad, &[1, 3]).unwrap();
        assert!(two_lost.rotors[0].lost && !two_lost.rotors[1].lost);
        assert_eq!(two_lost.rank, 2);
        assert!(!two_lost.lacking.is_empty());
        let json = serde_json::to_value(&view).unwrap();
        assert_eq!(json["rotors"][0]["spin"], "cw");
    }

    #[test]
    fn the_rule_is_registered_last_and_every_figure_is_finite() {
        assert_eq!(crate::rules::REGISTRY.last().map(|r| r.id), Some(ID));
        let f = check(&sheet("layout = \"octo\"\narm = \"300 mm\"\nmax_thrust = \"600 g\"\nmount = \"tilting\"\ntilt_range = \"20 deg\"", "[claim]\nsurvives_rotor_failure = 2"));
        assert!(f.figures.iter().all(|g| g.value.is_finite()));
        assert_ne!(f.verdict, Verdict::NotAssessed, "{}", f.headline);
    }

    #[test]
    fn a_craft_beyond_the_search_limit_keeps_its_rank_but_is_not_assessed() {
        let ring: String = (0..64)
            .map(|i| {
                let a = f64::from(i) * std::f64::consts::TAU / 64.0;
                let spin = ["cw", "ccw"][i as usize % 2];
                format!(
                    "[[rotors.at]]\nx = \"{:.1} mm\"\ny = \"{:.1} mm\"\nspin = \"{spin}\"\n",
                    1000.0 * a.cos(),
                    1000.0 * a.sin()
                )
            })
            .collect();
        let f = check(&sheet(
            &format!("layout = \"custom\"\ncount = 64\nmax_thrust = \"100 g\"\n{ring}"),
            "",
        ));
        assert_eq!(f.verdict, Verdict::NotAssessed, "{}", f.headline);
        assert_eq!(f.figure(keys::RANK, None).unwrap().value, 4.0);
    }
}

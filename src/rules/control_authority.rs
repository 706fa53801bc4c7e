//! Rule 5, control-authority: can the actuators make the forces and moments a
//! hover needs, with margin, and after a rotor is lost?
//!
//! [`solve`] is the worked solution. Givens: where the rotors sit and how they
//! spin and tilt ([`geometry::placements`]), the tilt each tilting rotor spends
//! holding a claimed body tilt ([`geometry::held_body_tilt`]), the weight W,
//! each rotor's maximum thrust per tier (the thrust-margin estimate) and the
//! propeller's drag torque per thrust k = ratio x D. Method: the
//! control-effectiveness matrix at hover, its rank (which axes can be commanded
//! at all), and the ACAI of Du, Quan, Yang, Cai 2015 (how far the hover point
//! lies inside the set of forces and moments the rotors can make), intact and
//! with rotors lost. Comparison: ACAI > 0 at the physical limit and at best
//! practice; at the typical tier, ACAI above the moment of a typical thrust
//! mismatch between rotors. [`describe`] turns the [`Analysis`] into the
//! finding; the verdict page draws the rotors and the worst loss from the same
//! analysis ([`rules::check`](crate::rules::check)).

use std::borrow::Cow;
use std::fmt;

use uom::si::angle::degree;
use uom::si::f64::{Angle, Force, Length};
use uom::si::{force::newton, length::millimeter, torque::newton_meter};

use super::common::{self, fixed, per_tier, tiered};
use super::{geometry, thrust_margin};
use crate::catalog::tiers::{REACTIVE_TORQUE, THRUST_MISMATCH};
use crate::claim::{Claim, Layout, Mount};
use crate::physics::control::{self, Authority, Axis, Hover, Placement};
use crate::report::{keys, Figure, Finding, Sig3, Verdict};
use crate::tier::{PerTier, Tier};

pub const ID: &str = "control-authority";
pub const TITLE: &str = "Control authority";
pub const METHOD: &str = "Each actuator's effect on thrust, roll, pitch and yaw at hover makes one column of the control-effectiveness matrix: a rotor at (x, y, z) spinning s (+1 clockwise seen from above) gives [1, y, -x, s k] per newton, with k the propeller's drag torque per thrust; a tilt actuator with hinge h gives T_h [0, r x d + s k d] with d = h x z, linearised at the hover thrust T_h = W / n, so a tilting rotor pitches the craft only through its height above the centre of mass. The rank of the matrix (SVD of the matrix with each column scaled to unit length, relative tolerance 1e-9) says which axes can be commanded; fewer than four is impossible. The available control authority index (ACAI, Du, Quan, Yang, Cai 2015) is the signed distance from the hover point (W, 0, 0, 0) to the boundary of the set of forces and moments the actuators can make with each rotor between 0 and its maximum thrust and each tilt within its range: for every three independent columns, the support of the set along the normal of their span, less the hover point's offset from the set's centre along it; the least of these. Tilting rotors that hold a claimed body tilt (tilting back as far as the tilt-equilibrium rule counts) have only the rest of their range left for control: their deflections are counted from the held tilt. ACAI <= 0 at the physical limit is impossible, at best practice implausible; at the typical tier it must exceed the moment of a typical thrust mismatch (5 % of one rotor's hover thrust on its lever) or the claim is doubtful. A claimed rotor-failure tolerance of k is judged the same way on the ACAI with every set of up to k rotors stopped.";

/// The most work (ACAI evaluations x face normals x generators) the rule does for one
/// sheet: the intact ACAI for up to about 40 actuators, the failure table for fewer.
const SEARCH_BUDGET: f64 = 4e6;
/// Figure keys of the worst ACAI with one, two, ... rotors lost.
const LOST_KEYS: [&str; 4] = keys::ACAI_ROTORS_LOST;

/// One set of stopped rotors and the authority the rest keep.
#[derive(Debug, Clone, PartialEq)]
pub struct Failure {
    /// The rotors stopped, numbered from 0 in placement order.
    pub lost: Vec<usize>,
    /// The ACAI of the rotors left, per tier (N and N m).
    pub acai: PerTier<f64>,
    /// The margin it must clear per tier (N m): none at the generous tiers.
    pub margin: PerTier<f64>,
}

impl Failure {
    fn passes(&self, t: Tier) -> bool {
        self.acai[t] > self.margin[t]
    }
}

/// How far the rule could take the margin of control.
#[derive(Debug, Clone, PartialEq)]
pub enum Margins {
    /// Fewer than four axes can be commanded: no thrust makes up for that.
    AxesLacking,
    /// The sheet gives nothing to estimate a rotor's thrust from.
    NoThrust,
    /// More actuators than the search budget allows even for the intact ACAI.
    TooManyActuators,
    /// The claimed failure tolerance needs more lost sets than the search allows.
    FailuresBeyondSearch,
    /// The index could not be bounded in f64 for these numbers.
    Unbounded,
    /// The ACAI intact and with rotors lost, per tier.
    Searched {
        intact: Failure,
        /// Every set of up to `searched` rotors lost, in order of size.
        failures: Vec<Failure>,
        /// Up to this many rotors lost at once (0 when the table was beyond the search).
        searched: usize,
    },
}

/// What the rule reads from a sheet, in its own terms.
#[derive(Debug, Clone, PartialEq)]
pub struct Givens {
    /// The rotors in body axes ([`geometry::placements`]), tilts holding `held_tilt`.
    pub placements: Vec<Placement>,
    pub diameter: Length,
    pub weight: Force,
    /// Per-rotor maximum thrust per tier, when the sheet lets it be estimated.
    pub thrust: Option<PerTier<Force>>,
    /// The body tilt the tilting rotors hold (0 when none is claimed or the mount is fixed).
    pub held_tilt: Angle,
    /// Rotors the craft is said to survive losing.
    pub claimed: usize,
    /// Why the thrust is not the sheet's own figure, where thrust-margin replaced it.
    pub thrust_note: Option<&'static str>,
}

impl Givens {
    /// The givens of a sheet, or the fields it would need to give.
    pub fn of(claim: &Claim) -> Result<Givens, &'static str> {
        let r = &claim.rotors;
        let Some(placements) = geometry::placements(r) else {
            return Err(match r.layout {
                None | Some(Layout::Custom) => "the rotor layout (rotors.layout with rotors.arm, or layout = \"custom\" with [[rotors.at]] positions)",
                Some(_) => "the arm length (rotors.arm)",
            });
        };
        let Some((diameter, _)) = common::rotor_diameter(claim) else {
            return Err("the rotor diameter (rotors.diameter) or a motor class (rotors.motor)");
        };
        let air = common::air(claim);
        let held_tilt = geometry::held_body_tilt(claim);
        let estimate = thrust_margin::estimate(claim, &air);
        Ok(Givens {
            placements: geometry::holding(placements, held_tilt),
            diameter,
            weight: common::weight(claim, &air),
            thrust: estimate.as_ref().map(|e| e.available),
            held_tilt,
            claimed: claim.claim.survives_rotor_failure as usize,
            thrust_note: estimate.as_ref().and_then(|e| e.bound_used()),
        })
    }
}

/// The rule's worked solution, handed on with the report: the drawings of the
/// rotors and of the worst rotor loss read it rather than work it out again.
#[derive(Debug, Clone, PartialEq)]
pub struct Analysis {
    pub givens: Givens,
    /// Which axes the actuators command.
    pub authority: Authority,
    pub margins: Margins,
    /// The first tier, most generous first, at which the claim fails.
    pub fails_at: Option<Tier>,
    pub verdict: Verdict,
}

impl Analysis {
    /// The set of `size` lost rotors that leaves the least ACAI at tier `t`; of sets
    /// equal but for round-off (a symmetric craft), the first in rotor order.
    pub fn worst(&self, size: usize, t: Tier) -> Option<&Failure> {
        let Margins::Searched { failures, .. } = &self.margins else {
            return None;
        };
        let sets = || failures.iter().filter(|f| f.lost.len() == size);
        let least = sets().map(|f| f.acai[t]).fold(f64::INFINITY, f64::min);
        let scale = sets().map(|f| f.acai[t].abs()).fold(0.0, f64::max);
        sets().find(|f| f.acai[t] - least <= 1e-9 * scale)
    }

    /// The single rotor whose loss leaves the least authority with typical
    /// rotors (Du, Quan, Yang, Cai 2015: below zero, hover cannot be held);
    /// `None` when the rule could not search failures.
    pub fn worst_single_loss(&self) -> Option<&Failure> {
        self.worst(1, Tier::Typical)
    }
}

/// Sets of lost rotors (0-based) and the ACAI of each at every tier, worked out
/// on faces reused for every set: one set of faces per distinct drag-torque
/// ratio (the generous tiers share theirs).
struct Search<'a> {
    placements: &'a [Placement],
    weight: Force,
    diameter: Length,
    thrust: PerTier<Force>,
    faces: Vec<control::Faces>,
    of_tier: PerTier<usize>,
}

impl<'a> Search<'a> {
    fn new(
        placements: &'a [Placement],
        weight: Force,
        diameter: Length,
        thrust: PerTier<Force>,
    ) -> Self {
        let torque_ratio = |t: Tier| diameter * REACTIVE_TORQUE.at(t);
        let mut ratios: Vec<Length> = Vec::with_capacity(3);
        let of_tier = PerTier::from_fn(|t| {
            let k = torque_ratio(t);
            ratios.iter().position(|&r| r == k).unwrap_or_else(|| {
                ratios.push(k);
                ratios.len() - 1
            })
        });
        let faces = ratios
            .into_iter()
            .map(|k| control::Faces::new(placements, k))
            .collect();
        Search {
            placements,
            weight,
            diameter,
            thrust,
            faces,
            of_tier,
        }
    }

    fn torque_ratio(&self, t: Tier) -> Length {
        self.diameter * REACTIVE_TORQUE.at(t)
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

    /// The ACAI and margin of every tier with `lost` stopped.
    fn failure(&self, lost: Vec<usize>) -> Failure {
        let acai = PerTier::from_fn(|t| {
            let hover = Hover {
                weight: self.weight,
                rotor_thrust: self.thrust[t],
                torque_ratio: self.torque_ratio(t),
            };
            self.faces[self.of_tier[t]].hover_acai(self.placements, &hover, &lost)
        });
        let margin = PerTier::from_fn(|t| self.margin(t, &lost));
        Failure { lost, acai, margin }
    }
}

/// Whether `cases` ACAIs (each over every three of c columns) fit the budget.
fn affordable(placements: &[Placement], cases: usize) -> bool {
    let c = (placements.len() + placements.iter().filter(|p| p.tilt.is_some()).count()) as f64;
    cases as f64 * c * c * c * c / 6.0 <= SEARCH_BUDGET
}

/// How many rotors lost at once the failure table goes up to: the claimed
/// tolerance, and at least one (two for six or more rotors), at most four.
fn failure_search(claimed: usize, n: usize) -> usize {
    let usual = if n >= 6 { 2 } else { 1 };
    claimed.max(usual).min(LOST_KEYS.len())
}

/// Every set of up to `size` lost rotors (keeping one), if the search fits the budget.
fn lost_sets(placements: &[Placement], size: usize) -> Option<Vec<Vec<usize>>> {
    let n = placements.len();
    let sets: Vec<Vec<usize>> = (1..=size.min(n.saturating_sub(1)))
        .flat_map(|k| control::combinations(n, k))
        .collect();
    affordable(placements, 3 * sets.len()).then_some(sets)
}

/// The ACAI intact and with rotors lost, as far as the sheet and the search allow.
fn margins(g: &Givens, authority: &Authority) -> Margins {
    let placements = &g.placements[..];
    if authority.rank < 4 {
        return Margins::AxesLacking;
    }
    let Some(thrust) = g.thrust else {
        return Margins::NoThrust;
    };
    if !affordable(placements, 3) {
        return Margins::TooManyActuators;
    }
    let searched = failure_search(g.claimed, placements.len());
    let sets = lost_sets(placements, searched);
    if g.claimed > searched || (g.claimed > 0 && sets.is_none()) {
        return Margins::FailuresBeyondSearch;
    }
    let search = Search::new(placements, g.weight, g.diameter, thrust);
    let intact = search.failure(Vec::new());
    let searched = if sets.is_some() { searched } else { 0 };
    let failures: Vec<Failure> = sets
        .unwrap_or_default()
        .into_iter()
        .map(|s| search.failure(s))
        .collect();
    let finite = |f: &Failure| f.acai.iter().chain(f.margin.iter()).all(|v| v.is_finite());
    if !finite(&intact) || !failures.iter().all(finite) {
        return Margins::Unbounded;
    }
    Margins::Searched {
        intact,
        failures,
        searched,
    }
}

/// The worked solution, or the fields the sheet would need for it.
pub fn solve(claim: &Claim) -> Result<Analysis, &'static str> {
    let givens = Givens::of(claim)?;
    let g = &givens;

    // 1. Rank: which axes the actuators command at all (at any hover thrust: 1 N).
    let k = g.diameter * REACTIVE_TORQUE.at(Tier::Typical);
    let unit = Force::new::<newton>(1.0);
    let authority = control::authority(&control::effectiveness(&g.placements, unit, k).matrix);

    // 2. ACAI intact and with rotors lost, per tier, against the margin of each tier.
    let margins = margins(g, &authority);

    // 3. The verdict: the first tier at which the intact craft or a claimed loss fails.
    let (fails_at, verdict) = match &margins {
        Margins::AxesLacking => (Some(Tier::PhysicalLimit), Verdict::Impossible),
        Margins::Searched {
            intact, failures, ..
        } => {
            let claimed_sets = || failures.iter().filter(|f| f.lost.len() <= g.claimed);
            let fails_at =
                common::first_failure(|t| intact.passes(t) && claimed_sets().all(|f| f.passes(t)));
            (fails_at, Verdict::failing_at(fails_at))
        }
        _ => (None, Verdict::NotAssessed),
    };
    Ok(Analysis {
        givens,
        authority,
        margins,
        fails_at,
        verdict,
    })
}

/// The finding, and the analysis behind it when the sheet allowed one.
pub fn checked(claim: &Claim) -> (Finding, Option<Analysis>) {
    match solve(claim) {
        Ok(an) => (describe(claim, &an), Some(an)),
        Err(needs) => (Finding::not_assessed(ID, needs), None),
    }
}

pub fn check(claim: &Claim) -> Finding {
    checked(claim).0
}

const SEARCH_LIMIT: &str = "A control-allocation study beyond this screen's search limit; the rank above holds regardless.";
const NEEDS_THRUST: &str = "a per-rotor thrust (rotors.max_thrust), a motor class (rotors.motor), or power and diameter (rotors.max_power and rotors.diameter)";

/// The finding of an analysis: figures, headline, what it would take, assumptions.
pub fn describe(claim: &Claim, an: &Analysis) -> Finding {
    let n = an.givens.placements.len();
    let a = &an.authority;
    let rank = fixed(
        keys::RANK,
        "Axes the actuators can command independently (rank of the control-effectiveness matrix, of 4)",
        a.rank as f64,
        "1",
    );
    let mut assumptions = Vec::with_capacity(5);
    assumptions.push(format!(
        "Rotor positions from the {} layout; body axes x forward, y left, z up; rotors numbered clockwise from the nose seen from above.",
        claim.rotors.layout.map_or("stated", Layout::id),
    ));
    assumptions.push(format!(
        "Propeller drag torque per thrust {} of the rotor diameter ({} mm); {}.",
        REACTIVE_TORQUE.values,
        Sig3(an.givens.diameter.get::<millimeter>()),
        REACTIVE_TORQUE.basis,
    ));
    assumptions.push(
        "Tilt actuators linearised at hover, each rotor carrying an equal share of the weight."
            .to_string(),
    );
    let held = held_tilt_words(claim, an);
    if let Some(words) = &held {
        assumptions.push(words.assumption.clone());
    }
    if let Some(note) = an.givens.thrust_note {
        assumptions.push(format!("Rotor thrust: {note} (thrust-margin)."));
    }
    let sources: &[&str] = &["du-2015", "statics"];

    let (intact, failures, searched) = match &an.margins {
        // An axis no actuator can command cannot be held at any thrust.
        Margins::AxesLacking => {
            return Finding {
                rule: ID,
                verdict: an.verdict,
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
        Margins::NoThrust => {
            let mut f = Finding::not_assessed(ID, NEEDS_THRUST);
            f.headline = format!(
                "Its actuators can command all four axes, but the margin is not assessed: the sheet does not give {NEEDS_THRUST}."
            );
            f.figures.push(rank);
            return f;
        }
        Margins::TooManyActuators => {
            let mut f = Finding::not_assessed(
                ID,
                "fewer actuators (this screen searches up to about 40 rotor thrusts and tilts)",
            );
            f.headline = "Its actuators can command all four axes; the margin is not assessed: it has more actuators than this screen searches.".to_string();
            f.would_take = SEARCH_LIMIT.to_string();
            f.figures.push(rank);
            return f;
        }
        Margins::FailuresBeyondSearch => {
            let mut f = Finding::not_assessed(ID, "a craft small enough to search every combination of lost rotors (up to four lost, about 16 rotors)");
            f.headline = format!(
                "Not assessed: the claim to survive {} lost rotors needs more combinations searched than this screen does.",
                an.givens.claimed,
            );
            f.would_take = SEARCH_LIMIT.to_string();
            f.figures.push(rank);
            return f;
        }
        Margins::Unbounded => {
            let mut f = Finding::not_assessed(
                ID,
                "masses, lengths and thrusts within what this screen computes",
            );
            f.headline = "Its actuators can command all four axes; the margin is not assessed: its figures are beyond the range this screen computes in.".to_string();
            f.figures.push(rank);
            return f;
        }
        Margins::Searched {
            intact,
            failures,
            searched,
        } => (intact, failures, *searched),
    };
    let claimed = an.givens.claimed;
    let thrust = an.givens.thrust.unwrap_or_default();

    // The rank, the margin, and per tier the ACAI and the worst of each failure size.
    let mut figures = Vec::with_capacity(2 + 3 * (1 + LOST_KEYS.len()));
    figures.push(rank);
    figures.extend(per_tier(
        keys::ACAI,
        "Available control authority index, intact (N and N m)",
        "N, N m",
        |t| intact.acai[t],
    ));
    figures.push(tiered(
        keys::MISMATCH_MOMENT,
        "Moment of a typical thrust mismatch, the margin the ACAI must clear",
        Tier::Typical,
        intact.margin[Tier::Typical],
        "N m",
    ));
    for (size, key) in LOST_KEYS.iter().enumerate().map(|(i, k)| (i + 1, *k)) {
        for t in Tier::ALL {
            if let Some(f) = an.worst(size, t) {
                let label = match size {
                    1 => format!("ACAI with the worst rotor lost ({})", RotorList(&f.lost)),
                    _ => format!(
                        "ACAI with the worst {size} rotors lost ({})",
                        RotorList(&f.lost)
                    ),
                };
                figures.push(tiered(key, label, t, f.acai[t], "N, N m"));
            }
        }
    }
    figures.retain(|f: &Figure| f.value.is_finite());

    // The words.
    let at = |t: Tier| Sig3(intact.acai[t]);
    let lifts = |t: Tier| thrust[t] * n as f64 >= an.givens.weight;
    let claimed_sets = || failures.iter().filter(|f| f.lost.len() <= claimed);
    let first_bad_set = |t: Tier| claimed_sets().find(|f| !f.passes(t));
    let intact_fails = |t: Tier| !intact.passes(t);
    let spent = |t: Tier| match (&held, intact_fails(t)) {
        (Some(words), true) => format!(" {}", words.headline),
        _ => String::new(),
    };
    let wider = if held.is_some() {
        ", or a wider tilt range (rotors.tilt_range)"
    } else {
        ""
    };
    let (headline, would_take) = match an.fails_at {
        Some(t) if intact_fails(t) && !lifts(t) => (
            format!(
                "Its rotors cannot lift it even at full thrust ({}), so nothing is left to steer with (see thrust-margin).",
                tier_phrase(t),
            ),
            "It would take more thrust per rotor or more rotors (see thrust-margin).".to_string(),
        ),
        Some(Tier::Typical) if intact.acai[Tier::Typical] <= 0.0 => (
            format!(
                "With typical rotors it cannot make every moment a hover needs (ACAI {}); only better-than-typical ones give it control.{}",
                at(Tier::Typical),
                spent(Tier::Typical),
            ),
            format!("It would take rotors with more thrust to spare (hovering well below full thrust), or longer arms{wider}."),
        ),
        Some(Tier::Typical) if intact_fails(Tier::Typical) => (
            format!(
                "Its control margin in hover (ACAI {} with typical rotors) is smaller than the {} N m of a typical {} % thrust mismatch between rotors: a worn propeller or a gust could tip it.{}",
                at(Tier::Typical),
                Sig3(intact.margin[Tier::Typical]),
                (100.0 * THRUST_MISMATCH.at(Tier::Typical)).round(),
                spent(Tier::Typical),
            ),
            format!("It would take rotors with more thrust to spare (hovering well below full thrust), or longer arms{wider}."),
        ),
        Some(t) if intact_fails(t) => (
            format!(
                "Even at full thrust from {} rotors it cannot make every moment a hover needs (ACAI {} {}).{}",
                if t == Tier::PhysicalLimit { "perfect" } else { "the best" },
                at(t),
                tier_phrase(t),
                spent(t),
            ),
            format!("It would take rotors with more thrust to spare, longer arms, or rotors of both spin directions spread around the centre of mass{wider}."),
        ),
        Some(t) => {
            let (set, v) = first_bad_set(t).map_or((&[][..], 0.0), |f| (&f.lost[..], f.acai[t]));
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
            let single = an.worst(1, Tier::Typical);
            let after: Cow<str> = match (claimed, single) {
                (0, Some(f)) if f.acai[Tier::Typical] <= 0.0 => {
                    format!(" Losing {} would leave it without control.", RotorList(&f.lost)).into()
                }
                (0, Some(_)) => " It could keep flying after losing any one rotor.".into(),
                (k, _) if k > 0 => format!(" It keeps control after losing any {k}.").into(),
                _ => "".into(),
            };
            (
                format!(
                    "Its rotors can command thrust, roll, pitch and yaw with margin (ACAI {} with typical rotors, against {} N m of a typical thrust mismatch).{after}",
                    at(Tier::Typical),
                    Sig3(intact.margin[Tier::Typical]),
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
        verdict: an.verdict,
        headline,
        figures,
        would_take,
        assumptions,
        sources,
    }
}

/// What the finding says of the tilt spent holding a claimed body tilt.
struct HeldWords {
    assumption: String,
    headline: String,
}

/// The words for the tilt the tilting rotors spend holding the body tilt, if they spend any.
fn held_tilt_words(claim: &Claim, an: &Analysis) -> Option<HeldWords> {
    // Degrees as a person reads them: 30 deg less 20 deg is 10, not 9.999999.
    let deg = |a: Angle| Sig3((a.get::<degree>() * 1e6).round() / 1e6);
    let range = claim.rotors.tilt_range?;
    if an.givens.held_tilt.get::<degree>() <= 0.0
        || !an.givens.placements.iter().any(|p| p.tilt.is_some())
    {
        return None;
    }
    let body = claim.claim.hover_tilt.unwrap_or(an.givens.held_tilt);
    let back = (range - an.givens.held_tilt).max(Angle::new::<degree>(0.0));
    let forth = (range + an.givens.held_tilt).min(Angle::new::<degree>(90.0));
    Some(HeldWords {
        assumption: format!(
            "The tilting rotors hold the claimed {} deg body tilt by tilting back up to {} deg each (as the tilt-equilibrium rule counts it); control deflections are counted from there, so {} deg of the {} deg range is left one way ({} deg the other). Their thrust is taken as vertical and the tilt columns as at a level hover, which errs generous for large deflections.",
            deg(body),
            deg(an.givens.held_tilt),
            deg(back),
            deg(range),
            deg(forth),
        ),
        headline: format!(
            "Holding the {} deg body tilt takes {} deg of the rotors' {} deg tilt range, leaving {} deg for control one way.",
            deg(body),
            deg(an.givens.held_tilt),
            deg(range),
            deg(back),
        ),
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
    fn the_analysis_holds_the_placements_and_the_failure_table_the_finding_reports() {
        let quad = sheet(
            "layout = \"quad-x\"\narm = \"225 mm\"\nmax_thrust = \"600 g\"",
            "",
        );
        let (finding, an) = checked(&quad);
        let an = an.unwrap();
        // Plane geometry: rotor 1 at 45 deg, x = 225 / sqrt 2 = 159.1 mm, y negative (REP 103).
        assert!((an.givens.placements[0].x.get::<millimeter>() - 159.1).abs() < 0.1);
        assert!(an.givens.placements[0].y.get::<millimeter>() < 0.0);
        assert_eq!(an.authority.rank, 4);
        assert_eq!(an.verdict, finding.verdict);
        // du-2015: a quadrotor that loses any rotor has ACAI < 0; the drawing's worst
        // loss is the one the finding reports.
        let worst = an.worst_single_loss().unwrap();
        assert!(worst.acai[Tier::Typical] < 0.0);
        let reported = finding
            .figure(keys::ACAI_ONE_ROTOR_LOST, Some(Tier::Typical))
            .unwrap();
        assert_eq!(reported.value, worst.acai[Tier::Typical]);
        assert!(reported
            .label
            .contains(&format!("rotor {}", worst.lost[0] + 1)));
    }

    #[test]
    fn a_stated_power_of_1e_minus_200_w_is_judged_not_a_crash() {
        // issue 16, the crash sheet: no usable thrust column. Momentum theory
        // (T <= (2 rho A)^(1/3) P^(2/3)) gives about 1e-133 N per rotor, far below
        // the weight, so no tier can hold a hover: impossible, with finite figures.
        let f = check(&sheet(
            "layout = \"quad-x\"\narm = \"200 mm\"\nmax_power = \"1e-200 W\"",
            "[claim]\nsurvives_rotor_failure = 1",
        ));
        assert_eq!(f.verdict, Verdict::Impossible, "{}", f.headline);
        assert!(f.headline.contains("cannot lift it"), "{}", f.headline);
        assert!(f.figures.iter().all(|g| g.value.is_finite()));
    }

    #[test]
    fn extreme_magnitudes_never_panic_and_every_figure_is_finite() {
        // issue 16: 1e-300 to 1e300 (and the least subnormal) in the stated power,
        // thrust, arm, diameter and mass, on several layouts, through every rule.
        // A value the sheet reader refuses is a field error, which is fine.
        let layouts = [
            "layout = \"quad-x\"",
            "layout = \"hex\"\nspins = [\"cw\", \"cw\", \"ccw\", \"ccw\", \"cw\", \"ccw\"]",
            "layout = \"tri\"",
            "layout = \"side-by-side\"\nmount = \"tilting\"\ntilt_range = \"30 deg\"\nheight = \"40 mm\"",
            "layout = \"coaxial\"",
            "layout = \"custom\"\ncount = 2\n[[rotors.at]]\nx = \"0 mm\"\ny = \"80 mm\"\nspin = \"cw\"\ntilt_axis = [0.0, 1.0, 0.0]\ntilt_range = \"20 deg\"\n[[rotors.at]]\nx = \"0 mm\"\ny = \"-80 mm\"\nspin = \"ccw\"",
        ];
        let values = [
            "4.9e-324", "1e-300", "1e-200", "1e-100", "1e-30", "1e-9", "1e-3", "1", "1e3", "1e9",
            "1e30", "1e100", "1e200", "1e300",
        ];
        let fields = [
            ("max_power", "W"),
            ("max_thrust", "N"),
            ("arm", "m"),
            ("diameter", "m"),
            ("mass", "kg"),
        ];
        let mut checked_sheets = 0;
        for layout in layouts {
            for (field, unit) in fields {
                for v in values {
                    let value = |f: &str, usual: &str| {
                        if f == field {
                            format!("{v} {unit}")
                        } else {
                            usual.to_string()
                        }
                    };
                    let (head, tail) = layout.split_once("\n[[").unwrap_or((layout, ""));
                    let tail = if tail.is_empty() {
                        String::new()
                    } else {
                        format!("[[{tail}\n")
                    };
                    let text = format!(
                        "title = \"t\"\n[claim]\nsurvives_rotor_failure = 1\nhover_tilt = \"10 deg\"\n[craft]\nmass = \"{}\"\n[rotors]\n{head}\narm = \"{}\"\ndiameter = \"{}\"\nmax_power = \"{}\"\nmax_thrust = \"{}\"\n{tail}",
                        value("mass", "1 kg"),
                        value("arm", "0.2 m"),
                        value("diameter", "0.25 m"),
                        value("max_power", "100 W"),
                        value("max_thrust", "6 N"),
                    );
                    let Ok(claim) = parse(&text, Format::Toml) else {
                        continue;
                    };
                    checked_sheets += 1;
                    let report = crate::rules::run_all(&claim);
                    for f in &report.findings {
                        assert!(
                            f.figures.iter().all(|g| g.value.is_finite()),
                            "{field} = {v}: {} {:?}",
                            f.rule,
                            f.figures
                        );
                    }
                }
            }
        }
        // The tiny values all read (only the ones above each field's range are refused).
        assert!(
            checked_sheets > layouts.len() * fields.len() * 7,
            "{checked_sheets}"
        );
    }

    #[test]
    fn the_tilt_spent_holding_a_body_tilt_is_taken_out_of_the_control_range() {
        // issue 15: a tilting mount holding a claimed body tilt has only the rest of its
        // range for control. du-2015: with both rotors at their stop the hover point is
        // on the boundary of the attainable set (ACAI 0), so no tier can hold it.
        let bicopter = "layout = \"side-by-side\"\narm = \"200 mm\"\nmax_thrust = \"900 g\"\nmount = \"tilting\"\ntilt_range = \"30 deg\"\nheight = \"60 mm\"";
        let at = |tilt: f64| {
            check(&sheet(
                bicopter,
                &format!("[claim]\nhover_tilt = \"{tilt} deg\""),
            ))
        };
        let (level, some, all) = (at(0.0), at(20.0), at(30.0));
        assert!(acai(&level, Tier::PhysicalLimit) > acai(&some, Tier::PhysicalLimit));
        assert!(acai(&some, Tier::PhysicalLimit) > 0.0, "{}", some.headline);
        assert!(some
            .assumptions
            .iter()
            .any(|a| a.contains("10.0 deg of the 30.0 deg range is left")));
        assert_eq!(all.verdict, Verdict::Impossible, "{}", all.headline);
        assert!(acai(&all, Tier::PhysicalLimit) <= 0.0);
        assert!(
            all.headline.contains("Holding the 30.0 deg body tilt"),
            "{}",
            all.headline
        );
        assert!(
            all.would_take.contains("rotors.tilt_range"),
            "{}",
            all.would_take
        );
        // A fixed mount spends nothing on a body tilt (that is the tilt rule's to judge).
        let fixed_quad = "layout = \"quad-x\"\narm = \"225 mm\"\nmax_thrust = \"600 g\"";
        let tilted = check(&sheet(fixed_quad, "[claim]\nhover_tilt = \"20 deg\""));
        assert_eq!(
            acai(&tilted, Tier::Typical),
            acai(&check(&sheet(fixed_quad, "")), Tier::Typical)
        );
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

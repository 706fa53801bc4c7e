//! The physics rules. Each takes a [`Claim`] and returns a [`Finding`]; the
//! registry lists them in report order. Rules are pure: no I/O, no globals,
//! no panics.

pub mod common;
pub mod energy_budget;
pub mod sensing;
pub mod thrust_margin;
pub mod tilt_equilibrium;

use crate::claim::Claim;
use crate::report::{Finding, Report};

/// A rule's id (as in the report) and its function.
pub struct Rule {
    pub id: &'static str,
    pub title: &'static str,
    pub check: fn(&Claim) -> Finding,
}

pub const REGISTRY: &[Rule] = &[
    Rule {
        id: thrust_margin::ID,
        title: thrust_margin::TITLE,
        check: thrust_margin::check,
    },
    Rule {
        id: tilt_equilibrium::ID,
        title: tilt_equilibrium::TITLE,
        check: tilt_equilibrium::check,
    },
];

/// Runs every rule and gathers the report.
pub fn run_all(claim: &Claim) -> Report {
    Report::new(
        claim.title.clone(),
        REGISTRY.iter().map(|r| (r.check)(claim)).collect(),
    )
}

//! The physics rules. Each takes a [`Claim`] and returns a [`Finding`]; the
//! registry lists them in report order. Rules are pure: no I/O, no globals,
//! no panics. [`geometry`] reads the sheet's rotors into the plain geometry
//! the physics takes.

pub mod common;
pub mod control_authority;
pub mod energy_budget;
pub mod fields;
pub mod geometry;
pub mod sensing;
pub mod sheet_consistency;
pub mod thrust_margin;
pub mod tilt_equilibrium;

use crate::claim::Claim;
use crate::report::{Finding, Report};

/// A rule's id (as in the report), its title, its method in words and
/// formulas (printed on the methods page), and its function.
pub struct Rule {
    pub id: &'static str,
    pub title: &'static str,
    pub method: &'static str,
    pub check: fn(&Claim) -> Finding,
}

macro_rules! rule {
    ($m:ident) => {
        Rule {
            id: $m::ID,
            title: $m::TITLE,
            method: $m::METHOD,
            check: $m::check,
        }
    };
}

/// Every rule, in report order: the sheet against itself first, so that a
/// reviewer meets a careless or nonsense sheet before the physics built on it.
pub const REGISTRY: &[Rule] = &[
    rule!(sheet_consistency),
    rule!(thrust_margin),
    rule!(tilt_equilibrium),
    rule!(energy_budget),
    rule!(sensing),
    rule!(control_authority),
];

/// Runs every rule and gathers the report ([`check`] without the control
/// analysis it keeps for the drawings).
pub fn run_all(claim: &Claim) -> Report {
    check(claim).report
}

/// A checked claim: the report, and the control analysis the
/// control-authority rule worked out for it (when the sheet allowed one),
/// which the verdict page's rotor drawings read.
#[derive(Debug, Clone, PartialEq)]
pub struct Checked {
    pub report: Report,
    pub control: Option<control_authority::Analysis>,
}

/// Runs every rule and keeps the control analysis beside the report, so
/// that nothing works it out a second time.
pub fn check(claim: &Claim) -> Checked {
    let mut control = None;
    let findings = REGISTRY
        .iter()
        .map(|r| {
            if r.id == control_authority::ID {
                let (finding, analysis) = control_authority::checked(claim);
                control = analysis;
                finding
            } else {
                (r.check)(claim)
            }
        })
        .collect();
    Checked {
        report: Report::new(claim.title.clone(), findings).with_unused(fields::unused(claim)),
        control,
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::claim::{parse, Format};

    #[test]
    fn no_rule_builds_on_a_stated_thrust_that_thrust_margin_calls_impossible() {
        // Momentum theory: 4 W on a 55 mm rotor holds at most 0.4533 N (46 gf) at sea
        // level with FM = eta = 1; 60 g stated is impossible, and every rule that reads
        // the rotor thrust takes the bound instead and says so.
        let text = "title = \"t\"\n[craft]\nmass = \"50 g\"\nsize = \"100 mm x 100 mm x 30 mm\"\n\
                    [rotors]\ncount = 4\nlayout = \"quad-x\"\narm = \"60 mm\"\ndiameter = \"55 mm\"\n\
                    max_thrust = \"60 g\"\nmax_power = \"4 W\"\ndrive = \"brushed\"\n\
                    [claim]\nhover_tilt = \"10 deg\"\n[conditions]\nwind = \"3 m/s\"\n";
        let report = run_all(&parse(text, Format::Toml).unwrap());
        let thrust = report.finding(thrust_margin::ID).unwrap();
        assert_eq!(thrust.verdict, crate::report::Verdict::Impossible);
        for rule in [tilt_equilibrium::ID, control_authority::ID] {
            let f = report.finding(rule).unwrap();
            assert!(
                f.assumptions
                    .iter()
                    .any(|a| a.contains(thrust_margin::BOUND_USED)),
                "{rule}: {:?}",
                f.assumptions
            );
        }
    }
}

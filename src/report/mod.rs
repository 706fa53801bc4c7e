//! The verdict: findings with their figures per tier, and the renderings of it.
//!
//! The JSON shape is the contract `liftaudit.report/1` (DESIGN "Report v1"):
//! other tools read the figure keys and verdict ids, so they change only with
//! a new schema id.

pub mod keys;
pub mod numbers;
mod text;

use std::borrow::Cow;

use serde::Serialize;
use utoipa::ToSchema;

pub use crate::tier::{PerTier, Tier};
pub use numbers::Sig3;
pub use text::render_text;

pub const SCHEMA: &str = "liftaudit.report/1";

/// The verdict of one finding or of a whole report.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Hash, Serialize, ToSchema)]
#[serde(rename_all = "kebab-case")]
pub enum Verdict {
    Consistent,
    Doubtful,
    Implausible,
    Impossible,
    NotAssessed,
}

impl Verdict {
    pub const ALL: [Verdict; 5] = [
        Verdict::Impossible,
        Verdict::Implausible,
        Verdict::Doubtful,
        Verdict::NotAssessed,
        Verdict::Consistent,
    ];

    pub fn id(self) -> &'static str {
        match self {
            Verdict::Consistent => "consistent",
            Verdict::Doubtful => "doubtful",
            Verdict::Implausible => "implausible",
            Verdict::Impossible => "impossible",
            Verdict::NotAssessed => "not-assessed",
        }
    }

    /// The words a layperson reads.
    pub fn label(self) -> &'static str {
        match self {
            Verdict::Consistent => "consistent",
            Verdict::Doubtful => "doubtful",
            Verdict::Implausible => "implausible",
            Verdict::Impossible => "impossible",
            Verdict::NotAssessed => "not assessed",
        }
    }

    /// What the verdict means, in one sentence.
    pub fn meaning(self) -> &'static str {
        match self {
            Verdict::Consistent => "holds with typical hardware and a working margin",
            Verdict::Doubtful => {
                "holds only with better-than-typical hardware or without the usual margin"
            }
            Verdict::Implausible => "would need hardware better than the best of its class",
            Verdict::Impossible => "breaks a law of physics even with perfect hardware",
            Verdict::NotAssessed => "the sheet lacks what this check needs",
        }
    }

    /// Severity for "the worst finding": impossible is worst; a check that could
    /// not run keeps a report from being called consistent.
    pub fn severity(self) -> u8 {
        match self {
            Verdict::Consistent => 0,
            Verdict::NotAssessed => 1,
            Verdict::Doubtful => 2,
            Verdict::Implausible => 3,
            Verdict::Impossible => 4,
        }
    }

    /// The verdict a check earns when `tier` is the first (most generous) tier it fails at.
    pub fn failing_at(tier: Option<Tier>) -> Verdict {
        match tier {
            Some(Tier::PhysicalLimit) => Verdict::Impossible,
            Some(Tier::BestPractice) => Verdict::Implausible,
            Some(Tier::Typical) => Verdict::Doubtful,
            None => Verdict::Consistent,
        }
    }

    /// Exit code of `liftaudit check` (DESIGN: 0 consistent ... 4 not assessed).
    pub fn exit_code(self) -> u8 {
        match self {
            Verdict::Consistent => 0,
            Verdict::Doubtful => 1,
            Verdict::Implausible => 2,
            Verdict::Impossible => 3,
            Verdict::NotAssessed => 4,
        }
    }

    pub fn worst(verdicts: impl IntoIterator<Item = Verdict>) -> Verdict {
        verdicts
            .into_iter()
            .max_by_key(|v| v.severity())
            .unwrap_or(Verdict::NotAssessed)
    }
}

/// One number behind a finding.
#[derive(Debug, Clone, PartialEq, Serialize, ToSchema)]
pub struct Figure {
    /// The figure's id; DESIGN "Report v1" names the keys other tools rely on.
    #[schema(pattern = r"^[a-z0-9]+(_[a-z0-9]+)*$")]
    pub key: &'static str,
    /// Words for people; most are fixed, a few name rotors.
    #[schema(value_type = String)]
    pub label: Cow<'static, str>,
    /// Absent for a figure that does not depend on the assumptions; never null.
    #[serde(skip_serializing_if = "Option::is_none")]
    #[schema(value_type = Tier, required = false)]
    pub tier: Option<Tier>,
    /// Always finite: a tier value without a bound is left out instead.
    pub value: f64,
    pub unit: &'static str,
}

/// The result of one rule.
#[derive(Debug, Clone, PartialEq, Serialize, ToSchema)]
pub struct Finding {
    pub rule: &'static str,
    pub verdict: Verdict,
    pub headline: String,
    pub figures: Vec<Figure>,
    pub would_take: String,
    pub assumptions: Vec<String>,
    // Ids in `sources.rs`; each rule cites a fixed list.
    pub sources: &'static [&'static str],
}

impl Finding {
    /// A finding whose rule could not run; `needs` names the fields that would let it.
    pub fn not_assessed(rule: &'static str, needs: &str) -> Finding {
        Finding {
            rule,
            verdict: Verdict::NotAssessed,
            headline: format!("Not assessed: the sheet does not give {needs}."),
            figures: Vec::new(),
            would_take: format!("State {needs} on the sheet."),
            assumptions: Vec::new(),
            sources: &[],
        }
    }

    /// The figure with this key at this tier (None for a tier-free figure).
    pub fn figure(&self, key: &str, tier: Option<Tier>) -> Option<&Figure> {
        self.figures.iter().find(|f| f.key == key && f.tier == tier)
    }
}

/// The whole verdict on one claim sheet.
#[derive(Debug, Clone, PartialEq, Serialize, ToSchema)]
pub struct Report {
    pub schema: &'static str,
    pub title: String,
    pub verdict: Verdict,
    pub findings: Vec<Finding>,
    /// The dotted paths of the fields the sheet gave that no rule reads
    /// (`rules::fields`), sorted by path; always present, maybe empty.
    pub unused: Vec<String>,
    pub cautions: &'static [&'static str],
    pub engine: &'static str,
}

/// The cautions every report carries (DESIGN "Cautions every report carries").
pub const CAUTIONS: [&str; 4] = [
    "Spinning propellers cut: keep hands, faces and onlookers clear, and remove propellers while working on a powered craft.",
    "Lithium cells can burn when punctured, over-charged or over-discharged: charge on a non-flammable surface, never unattended, and retire swollen packs.",
    "Flying rules differ by country and often by mass class: check with the local aviation authority before flying.",
    "This is a plausibility screen, not a certificate of airworthiness or safety.",
];

pub const ENGINE: &str = concat!("liftaudit ", env!("CARGO_PKG_VERSION"));

impl Report {
    pub fn new(title: String, findings: Vec<Finding>) -> Report {
        Report {
            schema: SCHEMA,
            title,
            verdict: Verdict::worst(findings.iter().map(|f| f.verdict)),
            findings,
            unused: Vec::new(),
            cautions: &CAUTIONS,
            engine: ENGINE,
        }
    }

    /// The report with the list of sheet fields that no rule read.
    pub fn with_unused(mut self, unused: Vec<String>) -> Report {
        self.unused = unused;
        self
    }

    pub fn finding(&self, rule: &str) -> Option<&Finding> {
        self.findings.iter().find(|f| f.rule == rule)
    }

    /// The report as indented JSON, for the files people open, written by
    /// serde_json from the derived `Serialize` (the API answers with the
    /// compact form of the same).
    pub fn to_json(&self) -> String {
        // Every figure is finite and every field serializes, so this cannot fail.
        serde_json::to_string_pretty(self).unwrap_or_default()
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn the_worst_finding_decides_and_not_assessed_blocks_consistent() {
        use Verdict::*;
        assert_eq!(Verdict::worst([Consistent, Doubtful, Consistent]), Doubtful);
        assert_eq!(Verdict::worst([Consistent, NotAssessed]), NotAssessed);
        assert_eq!(Verdict::worst([NotAssessed, Impossible]), Impossible);
        assert_eq!(Verdict::worst([Consistent]), Consistent);
    }

    #[test]
    fn the_json_shape_follows_the_contract() {
        let finding = Finding {
            rule: "thrust-margin",
            verdict: Verdict::Impossible,
            headline: "h".into(),
            figures: vec![
                Figure {
                    key: keys::HOVER_FRACTION,
                    label: "l".into(),
                    tier: Some(Tier::Typical),
                    value: 5.1,
                    unit: "1",
                },
                Figure {
                    key: keys::WEIGHT,
                    label: "w".into(),
                    tier: None,
                    value: 3.0,
                    unit: "N",
                },
            ],
            would_take: "w".into(),
            assumptions: vec!["a".into()],
            sources: &["isa"],
        };
        let v: serde_json::Value =
            serde_json::from_str(&Report::new("t".into(), vec![finding]).to_json()).unwrap();
        assert_eq!(v["schema"], "liftaudit.report/1");
        assert_eq!(v["verdict"], "impossible");
        assert_eq!(v["findings"][0]["figures"][0]["tier"], "typical");
        assert!(v["findings"][0]["figures"][1].get("tier").is_none());
        assert_eq!(v["cautions"].as_array().unwrap().len(), 4);
        // `unused` is always there, an empty list when every field was read.
        assert_eq!(v["unused"], serde_json::json!([]));
        assert!(v["engine"].as_str().unwrap().starts_with("liftaudit "));
    }
}

//! View models: everything a template shows, already in words and rounded
//! numbers, so templates hold no logic beyond loops and conditions. The
//! models hold plain text and askama escapes every field for HTML; only the
//! server-built SVG in [`super::figures`] and the fixed icons below are
//! inserted unescaped (`|safe`).

use std::fmt::{self, Write};

use askama::Template;
use axum::http::StatusCode;

use crate::catalog::tiers::{self, Tier};
use crate::claim::Claim;
use crate::report::{Figure, Finding, Report, Sig3, Verdict};
use crate::rules::{self, control_authority::Analysis};
use crate::sources::{self, Source};

use super::figures::{self, Drawing};
use super::form::FormView;
use super::LoadedDemo;

/// A value in a finding's table: counts as whole numbers, everything else
/// to three significant figures ([`Sig3`]), "-" where a tier has none.
#[derive(Debug, Clone, Copy, PartialEq)]
pub enum Cell {
    Missing,
    Count(i64),
    Number(f64),
}

impl Cell {
    fn of(f: &Figure) -> Cell {
        if f.unit == "1" && f.value.is_finite() && f.value.fract() == 0.0 && f.value.abs() < 1e9 {
            Cell::Count(f.value as i64)
        } else {
            Cell::Number(f.value)
        }
    }
}

impl fmt::Display for Cell {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        match *self {
            Cell::Missing => f.write_str("-"),
            Cell::Count(n) => write!(f, "{n}"),
            Cell::Number(v) => write!(f, "{}", Sig3(v)),
        }
    }
}

/// A unit as the table prints it; a pure number is marked as a ratio.
fn unit_label(unit: &'static str) -> &'static str {
    match unit {
        "1" | "" => "no unit",
        u => u,
    }
}

/// A verdict in words, with its icon: shapes differ by verdict so that
/// nothing depends on telling colours apart.
#[derive(Debug, Clone)]
pub struct VerdictView {
    pub id: &'static str,
    pub label: &'static str,
    pub meaning: &'static str,
    pub icon: &'static str,
}

impl VerdictView {
    pub fn of(v: Verdict) -> VerdictView {
        VerdictView {
            id: v.id(),
            label: v.label(),
            meaning: v.meaning(),
            icon: icon(v),
        }
    }
}

/// Inline icons, `aria-hidden` because the label beside them says the same.
fn icon(v: Verdict) -> &'static str {
    match v {
        Verdict::Impossible => concat!(
            r##"<svg class="icon" viewBox="0 0 24 24" width="24" height="24" aria-hidden="true" focusable="false">"##,
            r##"<polygon points="7,1 17,1 23,7 23,17 17,23 7,23 1,17 1,7" fill="currentColor"/>"##,
            r##"<path d="M8 8 L16 16 M16 8 L8 16" stroke="#fff" stroke-width="2.6" stroke-linecap="round"/></svg>"##
        ),
        Verdict::Implausible => concat!(
            r##"<svg class="icon" viewBox="0 0 24 24" width="24" height="24" aria-hidden="true" focusable="false">"##,
            r##"<polygon points="12,1.5 23,22 1,22" fill="currentColor"/>"##,
            r##"<path d="M12 8.5 V15" stroke="#fff" stroke-width="2.6" stroke-linecap="round"/>"##,
            r##"<circle cx="12" cy="18.6" r="1.5" fill="#fff"/></svg>"##
        ),
        Verdict::Doubtful => concat!(
            r##"<svg class="icon" viewBox="0 0 24 24" width="24" height="24" aria-hidden="true" focusable="false">"##,
            r##"<rect x="2" y="2" width="20" height="20" rx="4" transform="rotate(45 12 12)" fill="currentColor"/>"##,
            r##"<path d="M9.2 9.3 a2.9 2.9 0 1 1 4 2.7 c-0.9 0.4 -1.2 1 -1.2 2" fill="none" stroke="#fff" stroke-width="2.2" stroke-linecap="round"/>"##,
            r##"<circle cx="12" cy="17.2" r="1.4" fill="#fff"/></svg>"##
        ),
        Verdict::Consistent => concat!(
            r##"<svg class="icon" viewBox="0 0 24 24" width="24" height="24" aria-hidden="true" focusable="false">"##,
            r##"<circle cx="12" cy="12" r="11" fill="currentColor"/>"##,
            r##"<path d="M6.5 12.5 L10.3 16.2 L17.5 8.3" fill="none" stroke="#fff" stroke-width="2.6" stroke-linecap="round" stroke-linejoin="round"/></svg>"##
        ),
        Verdict::NotAssessed => concat!(
            r##"<svg class="icon" viewBox="0 0 24 24" width="24" height="24" aria-hidden="true" focusable="false">"##,
            r##"<circle cx="12" cy="12" r="10" fill="none" stroke="currentColor" stroke-width="2.2" stroke-dasharray="3.2 2.4"/>"##,
            r##"<path d="M7.5 12 H16.5" stroke="currentColor" stroke-width="2.6" stroke-linecap="round"/></svg>"##
        ),
    }
}

/// The title of a rule by id, from the registry.
fn rule_title(id: &'static str) -> &'static str {
    rules::REGISTRY
        .iter()
        .find(|r| r.id == id)
        .map(|r| r.title)
        .unwrap_or(id)
}

/// One row of a finding's table: a quantity across the tiers, or one value
/// for a quantity that does not depend on them.
#[derive(Debug, Clone)]
pub struct FigureRow<'a> {
    pub key: &'static str,
    pub label: &'a str,
    pub unit: &'static str,
    /// Values at physical limit, best practice, typical.
    pub by_tier: [Cell; 3],
    /// The value of a tier-independent figure.
    pub fixed: Option<Cell>,
}

/// Groups a finding's figures by key, keeping the order the rule gave.
pub fn figure_rows(figures: &[Figure]) -> Vec<FigureRow<'_>> {
    let mut rows: Vec<FigureRow> = Vec::new();
    for f in figures {
        let at = rows.iter().position(|r| r.key == f.key);
        let row = match at {
            Some(i) => &mut rows[i],
            None => {
                rows.push(FigureRow {
                    key: f.key,
                    label: &f.label,
                    unit: unit_label(f.unit),
                    by_tier: [Cell::Missing; 3],
                    fixed: None,
                });
                rows.last_mut().expect("just pushed")
            }
        };
        match f.tier {
            Some(t) => row.by_tier[t as usize] = Cell::of(f),
            None => row.fixed = Some(Cell::of(f)),
        }
    }
    rows
}

#[derive(Debug, Clone)]
pub struct SourceLink {
    pub id: &'static str,
    pub title: &'static str,
}

#[derive(Debug, Clone)]
pub struct FindingView<'a> {
    pub rule: &'static str,
    pub rule_title: &'static str,
    pub verdict: VerdictView,
    pub headline: &'a str,
    pub rows: Vec<FigureRow<'a>>,
    pub would_take: &'a str,
    pub assumptions: Vec<&'a str>,
    pub sources: Vec<SourceLink>,
}

impl<'a> FindingView<'a> {
    pub fn of(f: &'a Finding) -> FindingView<'a> {
        FindingView {
            rule: f.rule,
            rule_title: rule_title(f.rule),
            verdict: VerdictView::of(f.verdict),
            headline: &f.headline,
            rows: figure_rows(&f.figures),
            would_take: &f.would_take,
            assumptions: f.assumptions.iter().map(String::as_str).collect(),
            sources: f
                .sources
                .iter()
                .map(|id| SourceLink {
                    id,
                    title: sources::get(id).map(|s| s.title).unwrap_or(id),
                })
                .collect(),
        }
    }
}

/// How the page offers its report and sheet for download: plain links for a
/// demo, small forms that post the sheet back for a submitted one (the
/// service keeps nothing between requests).
#[derive(Debug, Clone)]
pub struct Downloads {
    pub demo: Option<&'static str>,
    pub sheet: String,
    /// Which of the form's inputs was checked, when it held more than one.
    pub note: Option<String>,
}

/// The one-paragraph summary under the overall verdict.
pub fn summary(report: &Report) -> String {
    if report.findings.is_empty() {
        return "No checks ran on this sheet, so nothing can be said about it yet.".to_string();
    }
    let n = report.findings.len();
    // "2 impossible, 1 doubtful": each verdict that occurs with its count,
    // in the order of `Verdict::ALL`.
    let counts: Vec<String> = Verdict::ALL
        .iter()
        .filter_map(|&v| {
            let k = report.findings.iter().filter(|f| f.verdict == v).count();
            (k > 0).then(|| format!("{k} {}", v.label()))
        })
        .collect();
    let mut text = format!(
        "{n} {} ran on this sheet: {}. The overall verdict is the worst of them, {}: the claim {}.",
        if n == 1 { "check" } else { "checks" },
        counts.join(", "),
        report.verdict.label(),
        report.verdict.meaning(),
    );
    if report.verdict != Verdict::Consistent {
        let worst = report
            .findings
            .iter()
            .max_by_key(|f| f.verdict.severity())
            .expect("findings is not empty");
        let _ = write!(
            text,
            " The deciding check is {}: {}",
            rule_title(worst.rule).to_lowercase(),
            worst.headline
        );
    }
    text
}

#[derive(Template)]
#[template(path = "verdict.html", whitespace = "minimize")]
pub struct VerdictPage<'a> {
    pub title: &'a str,
    pub source: Option<&'a str>,
    pub verdict: VerdictView,
    pub summary: String,
    /// The sheet fields no check read, named under the verdict.
    pub unused: &'a [String],
    pub findings: Vec<FindingView<'a>>,
    pub drawings: Vec<Drawing>,
    pub tiers: [&'static str; 3],
    pub cautions: &'static [&'static str],
    pub engine: &'static str,
    pub downloads: Downloads,
}

impl<'a> VerdictPage<'a> {
    /// The page of a report; `control` is the control analysis the rules
    /// gave with it ([`rules::check`]), which the rotor drawings read.
    pub fn new(
        report: &'a Report,
        claim: &'a Claim,
        control: Option<&Analysis>,
        downloads: Downloads,
    ) -> VerdictPage<'a> {
        VerdictPage {
            title: &report.title,
            source: claim.source.as_deref(),
            verdict: VerdictView::of(report.verdict),
            summary: summary(report),
            unused: &report.unused,
            findings: report.findings.iter().map(FindingView::of).collect(),
            drawings: figures::all(report, claim, control),
            tiers: Tier::ALL.map(|t| t.label()),
            cautions: report.cautions,
            engine: report.engine,
            downloads,
        }
    }
}

/// A demo as the form lists it.
#[derive(Debug, Clone)]
pub struct DemoLink {
    pub name: &'static str,
    pub title: String,
    pub shows: &'static str,
    pub verdict: VerdictView,
}

impl DemoLink {
    pub fn of(d: &LoadedDemo) -> DemoLink {
        DemoLink {
            name: d.demo.name,
            title: d.claim.title.clone(),
            shows: without_verdict_word(d.demo.shows(), d.report.verdict),
            verdict: VerdictView::of(d.report.verdict),
        }
    }
}

/// A demo's "Shows:" line without a leading verdict word, which the badge
/// beside it already says ("consistent. An ordinary quad..." -> "An ordinary quad...").
fn without_verdict_word(shows: &'static str, verdict: Verdict) -> &'static str {
    [verdict.id(), verdict.label()]
        .iter()
        .find_map(|w| shows.strip_prefix(w).and_then(|r| r.strip_prefix('.')))
        .map(str::trim_start)
        .unwrap_or(shows)
}

#[derive(Template)]
#[template(path = "index.html")]
pub struct IndexPage {
    pub form: FormView,
    pub demos: Vec<DemoLink>,
    /// The demo loaded into the sheet box, if one was picked.
    pub picked: Option<&'static str>,
}

pub struct RuleView {
    pub id: &'static str,
    pub title: &'static str,
    /// The rule's method in words and formulas, as its module states it.
    pub method: &'static str,
}

pub struct TierRowView {
    pub key: &'static str,
    pub label: &'static str,
    pub unit: &'static str,
    pub values: Vec<String>,
    pub basis: String,
}

#[derive(Template)]
#[template(path = "methods.html")]
pub struct MethodsPage {
    pub rules: Vec<RuleView>,
    pub tiers: Vec<&'static str>,
    pub rows: Vec<TierRowView>,
    pub sources: &'static [Source],
    pub verdicts: Vec<VerdictView>,
    pub hover_share: String,
}

impl MethodsPage {
    pub fn new() -> MethodsPage {
        MethodsPage {
            rules: rules::REGISTRY
                .iter()
                .map(|r| RuleView {
                    id: r.id,
                    title: r.title,
                    method: r.method,
                })
                .collect(),
            tiers: Tier::ALL.iter().map(|t| t.label()).collect(),
            rows: tiers::TABLE
                .iter()
                .map(|r| TierRowView {
                    key: r.key,
                    label: r.label,
                    unit: unit_label(r.unit),
                    values: r.values.iter().map(|v| Sig3(*v).to_string()).collect(),
                    basis: r.basis.describe(),
                })
                .collect(),
            sources: sources::SOURCES,
            verdicts: Verdict::ALL.iter().map(|v| VerdictView::of(*v)).collect(),
            hover_share: Sig3(tiers::HOVER_FRACTION_MAX.at(Tier::Typical) * 100.0).to_string(),
        }
    }
}

impl Default for MethodsPage {
    fn default() -> Self {
        Self::new()
    }
}

#[derive(Template)]
#[template(path = "error.html")]
pub struct ErrorPage {
    pub status: u16,
    pub reason: &'static str,
    pub message: String,
}

impl ErrorPage {
    pub fn new(status: StatusCode, message: String) -> ErrorPage {
        ErrorPage {
            status: status.as_u16(),
            reason: status.canonical_reason().unwrap_or("Error"),
            message,
        }
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn figures_group_by_key_with_tier_free_values_apart() {
        let fig = |key, tier, value, unit| Figure {
            key,
            label: key.to_string().into(),
            tier,
            value,
            unit,
        };
        let figures = [
            fig("weight", None, 3.04, "N"),
            fig("rotors_needed", Some(Tier::Typical), 15.0, "1"),
            fig("rotors_needed", Some(Tier::PhysicalLimit), 4.0, "1"),
        ];
        let rows = figure_rows(&figures);
        assert_eq!(rows.len(), 2);
        assert_eq!(
            rows[0].fixed.map(|c| c.to_string()).as_deref(),
            Some("3.04")
        );
        assert_eq!(rows[1].by_tier.map(|c| c.to_string()), ["4", "-", "15"]);
        assert_eq!(rows[1].unit, "no unit");
    }

    #[test]
    fn a_demo_line_drops_the_verdict_word_its_badge_already_shows() {
        assert_eq!(
            without_verdict_word("consistent. An ordinary quad.", Verdict::Consistent),
            "An ordinary quad."
        );
        assert_eq!(
            without_verdict_word("impossible on every count", Verdict::Impossible),
            "impossible on every count"
        );
    }

    #[test]
    fn the_page_names_the_unused_fields_under_the_verdict_and_only_when_there_are_some() {
        let claim = crate::claim::demo::find("classroom-quad")
            .and_then(|d| crate::claim::parse_any(d.text).ok())
            .unwrap();
        let report = crate::rules::run_all(&claim);
        let downloads = || Downloads {
            demo: None,
            sheet: String::new(),
            note: None,
        };
        let unused = report
            .clone()
            .with_unused(vec!["craft.colour".into(), "rotors.blades".into()]);
        let page = VerdictPage::new(&unused, &claim, None, downloads())
            .render()
            .unwrap();
        let list = "used by no check, so they change nothing above: <code>craft.colour</code>, <code>rotors.blades</code>.</p>";
        assert!(page.contains(list), "the unused list is missing");
        // Under the verdict: after the summary, before the first finding.
        let at = page.find(list).unwrap();
        assert!(page.find("class=\"summary\"").unwrap() < at);
        assert!(at < page.find("class=\"panel finding").unwrap());
        let none = report.with_unused(Vec::new());
        let page = VerdictPage::new(&none, &claim, None, downloads())
            .render()
            .unwrap();
        assert!(!page.contains("id=\"unused\""));
    }

    #[test]
    fn every_verdict_has_its_own_icon_shape() {
        let icons: Vec<&str> = Verdict::ALL.iter().map(|v| icon(*v)).collect();
        for (i, a) in icons.iter().enumerate() {
            assert!(icons[i + 1..].iter().all(|b| b != a));
            assert!(a.contains("aria-hidden=\"true\""));
        }
    }
}

//! The terminal rendering: verdict words first, figures aligned by tier, the
//! would-take line, then the cautions. Colour only when asked for (a TTY).

use std::fmt::Write;

use super::{Figure, PerTier, Report, Tier, Verdict};

fn paint(text: &str, verdict: Verdict, color: bool) -> String {
    if !color {
        return text.to_string();
    }
    // Bold, plus an underline for the two failing verdicts: readable in monochrome too.
    let code = match verdict {
        Verdict::Impossible | Verdict::Implausible => "1;4",
        _ => "1",
    };
    format!("\x1b[{code}m{text}\x1b[0m")
}

/// A number for a table cell: four significant figures, no exponent for ordinary sizes.
fn number(v: f64) -> String {
    if !v.is_finite() {
        return if v > 0.0 {
            "unbounded".into()
        } else {
            "n/a".into()
        };
    }
    let a = v.abs();
    if a != 0.0 && !(1e-3..1e6).contains(&a) {
        return format!("{v:.3e}");
    }
    let digits = if a == 0.0 {
        0
    } else {
        (3 - a.log10().floor() as i32).max(0) as usize
    };
    format!("{v:.digits$}")
}

/// One line of a finding's table: a figure key with its value per tier, or its one value.
struct Row<'a> {
    figure: &'a Figure,
    by_tier: PerTier<Option<f64>>,
    fixed: Option<f64>,
}

/// Groups a finding's figures by key, keeping first-seen order.
fn rows(figures: &[Figure]) -> Vec<Row<'_>> {
    let mut out: Vec<Row<'_>> = Vec::new();
    for f in figures {
        let i = match out.iter().position(|r| r.figure.key == f.key) {
            Some(i) => i,
            None => {
                out.push(Row {
                    figure: f,
                    by_tier: PerTier::default(),
                    fixed: None,
                });
                out.len() - 1
            }
        };
        match f.tier {
            Some(t) => out[i].by_tier[t] = Some(f.value),
            None => out[i].fixed = Some(f.value),
        }
    }
    out
}

/// Renders a report for a terminal.
pub fn render_text(report: &Report, color: bool) -> String {
    let mut s = String::new();
    let _ = writeln!(s, "{}", report.title);
    let _ = writeln!(
        s,
        "Verdict: {} ({})",
        paint(
            &report.verdict.label().to_uppercase(),
            report.verdict,
            color
        ),
        report.verdict.meaning()
    );
    if !report.unused.is_empty() {
        let _ = writeln!(
            s,
            "Given but used by no check: {}",
            report.unused.join(", ")
        );
    }
    for f in &report.findings {
        let _ = writeln!(s);
        let _ = writeln!(
            s,
            "[{}] {}",
            paint(f.verdict.label(), f.verdict, color),
            f.rule
        );
        let _ = writeln!(s, "  {}", f.headline);
        let rows = rows(&f.figures);
        if !rows.is_empty() {
            let width = rows
                .iter()
                .map(|r| r.figure.label.chars().count())
                .max()
                .unwrap_or(0);
            let tiered = rows.iter().any(|r| r.by_tier.iter().any(Option::is_some));
            if tiered {
                let _ = writeln!(
                    s,
                    "  {:width$}  {:>14} {:>14} {:>14}",
                    "",
                    Tier::PhysicalLimit.label(),
                    Tier::BestPractice.label(),
                    Tier::Typical.label()
                );
            }
            for Row {
                figure: g,
                by_tier,
                fixed,
            } in rows
            {
                let unit = if g.unit == "1" {
                    String::new()
                } else {
                    format!(" {}", g.unit)
                };
                match fixed {
                    Some(v) => {
                        let _ = writeln!(s, "  {:width$}  {}{unit}", g.label, number(v));
                    }
                    None => {
                        let cells = by_tier.map(|v| v.map_or("-".to_string(), number));
                        let _ = writeln!(
                            s,
                            "  {:width$}  {:>14} {:>14} {:>14}{unit}",
                            g.label, cells.physical_limit, cells.best_practice, cells.typical
                        );
                    }
                }
            }
        }
        let _ = writeln!(s, "  What it would take: {}", f.would_take);
        for a in &f.assumptions {
            let _ = writeln!(s, "  - {a}");
        }
        if !f.sources.is_empty() {
            let _ = writeln!(s, "  Sources: {}", f.sources.join(", "));
        }
    }
    let _ = writeln!(s);
    let _ = writeln!(s, "Cautions:");
    for c in report.cautions {
        let _ = writeln!(s, "  ! {c}");
    }
    let _ = writeln!(s, "({})", report.engine);
    s
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::report::keys;
    use crate::report::Finding;

    #[test]
    fn numbers_keep_four_significant_figures() {
        assert_eq!(number(5.0667), "5.067");
        assert_eq!(number(1234.5), "1234");
        assert_eq!(number(0.0), "0");
        assert_eq!(number(f64::INFINITY), "unbounded");
        assert_eq!(number(1.5e-5), "1.500e-5");
    }

    #[test]
    fn plain_text_has_no_escape_codes_and_shows_every_tier() {
        let finding = Finding {
            rule: "thrust-margin",
            verdict: Verdict::Doubtful,
            headline: "h".into(),
            figures: Tier::ALL
                .iter()
                .map(|&t| Figure {
                    key: keys::HOVER_FRACTION,
                    label: "Share".into(),
                    tier: Some(t),
                    value: PerTier::new(0.5, 0.6, 0.7)[t],
                    unit: "1",
                })
                .collect(),
            would_take: "w".into(),
            assumptions: vec![],
            sources: &["isa"],
        };
        let text = render_text(&Report::new("T".into(), vec![finding]), false);
        assert!(!text.contains('\x1b'));
        assert!(text.contains("DOUBTFUL"));
        assert!(text.contains("0.5000") && text.contains("0.7000"));
        assert!(text.contains("Cautions:"));
        assert!(render_text(&Report::new("T".into(), vec![]), true).contains('\x1b'));
    }
}

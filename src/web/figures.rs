//! The verdict page's drawings, as inline SVG built on the server.
//!
//! Each builder reads the figures the rules put in the report (by the keys of
//! DESIGN "Report v1") and draws them to scale with every quantity labelled in
//! words, so that no drawing relies on colour. A figure the report lacks (a
//! rule not assessed, a rule not yet written) leaves the drawing out with a
//! note saying why, never a broken picture. Only numbers and fixed words go
//! into the SVG; any text is escaped all the same, by askama's HTML escaper.

use std::fmt::{self, Write};

use askama::filters::{escape, Html};
use uom::si::length::meter;

use crate::catalog::tiers::{self, Tier};
use crate::claim::{Claim, Spin};
use crate::report::{keys, Finding, Report, Sig3};

use crate::rules::control_authority::Analysis;
use crate::rules::{energy_budget, thrust_margin, tilt_equilibrium};

use super::layout;

/// One drawing for the page, or the reason it is not drawn.
#[derive(Debug, Clone)]
pub struct Drawing {
    /// Anchor and element id prefix.
    pub id: &'static str,
    pub title: &'static str,
    /// What the drawing shows and its scale, in one or two sentences.
    pub caption: String,
    /// The SVG markup; `None` with the reason in `caption` when not drawn.
    pub svg: Option<String>,
}

impl Drawing {
    fn omitted(id: &'static str, title: &'static str, reason: &str) -> Drawing {
        Drawing {
            id,
            title,
            caption: format!("Not drawn: {reason}"),
            svg: None,
        }
    }
}

/// Every drawing of a report, in page order. `control` is the control
/// analysis that came with the report ([`rules::check`](crate::rules::check)):
/// both top views read its rotors, and the failure view its failure table.
pub fn all(report: &Report, claim: &Claim, control: Option<&Analysis>) -> Vec<Drawing> {
    let plan = layout::plan(claim, control);
    [
        free_body(report, claim),
        thrust_bar(report),
        energy_bar(report),
        rotor_layout(claim, plan.as_ref()),
    ]
    .into_iter()
    .chain(rotor_failure(claim, plan.as_ref(), control))
    .collect()
}

const INK: &str = "#1f2430";
const THRUST: &str = "#0f5c63";
const FORCE: &str = "#8a1c2b";
const MUTED: &str = "#6b7080";
const PAPER: &str = "#fbfaf6";
const FILL_A: &str = "#9cc7c4";
const FILL_B: &str = "#e3c58d";
const DISC: &str = "#eef5f4";

/// A stroke: its width in page units (which also sizes an arrowhead) and
/// its colour (which fills the head).
#[derive(Debug, Clone, Copy)]
struct Pen {
    width: f64,
    colour: &'static str,
}

const fn pen(colour: &'static str, width: f64) -> Pen {
    Pen { width, colour }
}

/// How a text is set: its anchor (`start`, `middle` or `end`), type size
/// and colour.
#[derive(Debug, Clone, Copy)]
struct Face {
    anchor: &'static str,
    size: f64,
    colour: &'static str,
}

const fn face(anchor: &'static str, size: f64, colour: &'static str) -> Face {
    Face {
        anchor,
        size,
        colour,
    }
}

/// A coordinate, width or size of a drawing, to a tenth of a unit (enough for
/// a drawing a few hundred units across): rounded to tenths, then written in
/// the shortest form that reads back as that value ("12.5", "34"). The std
/// formatter's fixed-precision path (`{:.1}`) works out the exact binary
/// value, and a verdict page writes a few hundred coordinates: that path was
/// most of the page's cost (callgrind, `render-page`); the shortest form is not.
#[derive(Debug, Clone, Copy)]
struct Tenths(f64);

impl fmt::Display for Tenths {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        // Adding 0.0 turns a rounded -0.0 into 0.0.
        write!(f, "{}", (self.0 * 10.0).round() / 10.0 + 0.0)
    }
}

/// A tiny SVG writer: shapes with presentation attributes only (no `style`),
/// so the page's Content-Security-Policy holds and print keeps the colours.
/// Coordinates, widths and sizes are written as [`Tenths`]. Writing to a `String` cannot fail,
/// so the writes' results are not kept.
struct Svg {
    body: String,
}

impl Svg {
    /// A drawing `id` with its title and paper. It is described by the
    /// figure's caption (`aria-describedby`, the figcaption `{id}-c`).
    fn new(id: &str, title: &str, width: f64, height: f64) -> Svg {
        let mut svg = Svg {
            body: String::new(),
        };
        let _ = write!(
            svg.body,
            "<svg xmlns=\"http://www.w3.org/2000/svg\" class=\"drawing\" \
             viewBox=\"0 0 {width:.0} {height:.0}\" width=\"{width:.0}\" height=\"{height:.0}\" \
             role=\"img\" aria-labelledby=\"{id}-t\" aria-describedby=\"{id}-c\" \
             font-family=\"system-ui, sans-serif\"><title id=\"{id}-t\">",
        );
        svg.escaped(title);
        let _ = write!(
            svg.body,
            "</title><rect width=\"{width:.0}\" height=\"{height:.0}\" fill=\"{PAPER}\"/>"
        );
        svg
    }

    /// Writes `text` escaped for SVG text and attributes (XML 1.0 section
    /// 2.4), through askama's `escape` filter with its HTML escaper.
    fn escaped(&mut self, text: impl fmt::Display) {
        let Ok(text) = escape(text, Html);
        let _ = write!(self.body, "{text}");
    }

    fn line(&mut self, (x1, y1): (f64, f64), (x2, y2): (f64, f64), pen: Pen, dash: bool) {
        let _ = write!(
            self.body,
            "<line x1=\"{}\" y1=\"{}\" x2=\"{}\" y2=\"{}\" stroke-width=\"{}\" stroke=\"{}\"{}/>",
            Tenths(x1),
            Tenths(y1),
            Tenths(x2),
            Tenths(y2),
            Tenths(pen.width),
            pen.colour,
            if dash {
                " stroke-dasharray=\"5 4\""
            } else {
                ""
            },
        );
    }

    /// A line with a filled head at its end.
    fn arrow(&mut self, from: (f64, f64), to: (f64, f64), pen: Pen, dash: bool) {
        let (dx, dy) = (to.0 - from.0, to.1 - from.1);
        let len = dx.hypot(dy);
        if len < 1.0 {
            return;
        }
        let (ux, uy) = (dx / len, dy / len);
        let head = (3.5 * pen.width + 4.0).min(len * 0.6);
        let base = (to.0 - ux * head, to.1 - uy * head);
        self.line(from, base, pen, dash);
        let half = head * 0.45;
        let (left, right) = (
            (base.0 - uy * half, base.1 + ux * half),
            (base.0 + uy * half, base.1 - ux * half),
        );
        let _ = write!(
            self.body,
            "<polygon points=\"{},{} {},{} {},{}\" fill=\"{}\"/>",
            Tenths(to.0),
            Tenths(to.1),
            Tenths(left.0),
            Tenths(left.1),
            Tenths(right.0),
            Tenths(right.1),
            pen.colour,
        );
    }

    fn rect(&mut self, x: f64, y: f64, w: f64, h: f64, fill: &str, stroke: &str) {
        let _ = write!(
            self.body,
            "<rect x=\"{}\" y=\"{}\" width=\"{}\" height=\"{}\" \
             fill=\"{fill}\" stroke=\"{stroke}\"/>",
            Tenths(x),
            Tenths(y),
            Tenths(w.max(0.0)),
            Tenths(h.max(0.0)),
        );
    }

    fn circle(&mut self, (cx, cy): (f64, f64), r: f64, fill: &str, stroke: &str, dash: bool) {
        let _ = write!(
            self.body,
            "<circle cx=\"{}\" cy=\"{}\" r=\"{}\" fill=\"{fill}\" \
             stroke=\"{stroke}\" stroke-width=\"1.5\"{}/>",
            Tenths(cx),
            Tenths(cy),
            Tenths(r),
            if dash {
                " stroke-dasharray=\"4 3\""
            } else {
                ""
            },
        );
    }

    /// An unfilled arc of a circle of radius `r` from `from` to `to` (the
    /// SVG path `M from A r r 0 flags to`; `flags` are the large-arc and
    /// sweep flags).
    fn arc(&mut self, from: (f64, f64), r: f64, flags: &str, to: (f64, f64), pen: Pen) {
        let _ = write!(
            self.body,
            "<path stroke-width=\"{}\" d=\"M {} {} A {r} {r} 0 {flags} {} {}\" \
             fill=\"none\" stroke=\"{}\"/>",
            Tenths(pen.width),
            Tenths(from.0),
            Tenths(from.1),
            Tenths(to.0),
            Tenths(to.1),
            pen.colour,
            r = Tenths(r),
        );
    }

    /// Text at a point, set in `face`.
    fn text(&mut self, (x, y): (f64, f64), face: Face, text: impl fmt::Display) {
        let _ = write!(
            self.body,
            "<text x=\"{}\" y=\"{}\" font-size=\"{}\" text-anchor=\"{}\" fill=\"{}\">",
            Tenths(x),
            Tenths(y),
            Tenths(face.size),
            face.anchor,
            face.colour,
        );
        self.escaped(text);
        self.body.push_str("</text>");
    }

    fn finish(mut self) -> String {
        self.body.push_str("</svg>");
        self.body
    }
}

/// A positive, finite value of a figure.
fn value(finding: Option<&Finding>, key: &str, tier: Option<Tier>) -> Option<f64> {
    finding?
        .figure(key, tier)
        .map(|f| f.value)
        .filter(|v| v.is_finite() && *v >= 0.0)
}

/// A round step for a scale bar or axis ticks: 1, 2 or 5 times a power of ten,
/// about a fifth of `span`.
fn nice_step(span: f64) -> f64 {
    if !(span.is_finite() && span > 0.0) {
        return 1.0;
    }
    let raw = span / 5.0;
    let power = 10f64.powf(raw.log10().floor());
    let m = raw / power;
    let nice = if m < 1.5 {
        1.0
    } else if m < 3.5 {
        2.0
    } else if m < 7.5 {
        5.0
    } else {
        10.0
    };
    nice * power
}

/// The geometry of the free-body diagram, in newtons, before scaling.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Forces {
    pub tilt_deg: f64,
    pub weight: f64,
    pub thrust: f64,
    /// Horizontal component of thrust: the force no one balances in still air.
    pub unbalanced: f64,
}

impl Forces {
    /// The forces of a steady tilted hover from the report: thrust balances
    /// weight vertically, T cos(theta) = W, so T = W / cos(theta) and the
    /// horizontal remainder is W tan(theta) (statics).
    pub fn of(report: &Report, claim: &Claim) -> Option<Forces> {
        let tilt = report.finding(tilt_equilibrium::ID);
        let tilt_deg = value(tilt, keys::HOVER_TILT, None)
            .or_else(|| {
                claim
                    .claim
                    .hover_tilt
                    .map(|a| a.get::<uom::si::angle::degree>())
            })
            .unwrap_or(0.0);
        if tilt_deg >= 89.5 {
            return None;
        }
        let cos = tilt_deg.to_radians().cos();
        let weight = value(report.finding(thrust_margin::ID), keys::WEIGHT, None)
            .or_else(|| value(tilt, keys::THRUST_NEEDED, None).map(|t| t * cos))
            .filter(|w| *w > 0.0)?;
        let thrust = value(tilt, keys::THRUST_NEEDED, None).unwrap_or(weight / cos);
        let unbalanced = value(tilt, keys::HORIZONTAL_FORCE, None)
            .unwrap_or(weight * tilt_deg.to_radians().tan());
        Some(Forces {
            tilt_deg,
            weight,
            thrust,
            unbalanced,
        })
    }
}

/// Side view at the claimed attitude: weight, thrust along the tilted rotor
/// axis, its vertical and horizontal components, and the unbalanced force.
pub fn free_body(report: &Report, claim: &Claim) -> Drawing {
    const ID: &str = "fig-forces";
    const TITLE: &str = "Forces at the claimed attitude";
    let Some(f) = Forces::of(report, claim) else {
        return Drawing::omitted(ID, TITLE, "the report gives no weight for the craft.");
    };
    let (w, h) = (360.0, 300.0);
    let centre = (150.0, 150.0);
    let horizontal_room = 170.0;
    let scale = (105.0 / f.weight).min(if f.unbalanced > 0.0 {
        horizontal_room / f.unbalanced
    } else {
        f64::INFINITY
    });
    let theta = f.tilt_deg.to_radians();
    let mut svg = Svg::new(ID, TITLE, w, h);

    // Ground reference and the body, nose (forward, +x) to the right, pitched
    // nose down by the tilt so that thrust leans forward.
    svg.line((20.0, 285.0), (340.0, 285.0), pen(MUTED, 1.0), false);
    svg.text(
        (22.0, 279.0),
        face("start", 11.0, MUTED),
        "level ground; forward is to the right",
    );
    let half = 46.0;
    let (bx, by) = (half * theta.cos(), half * theta.sin());
    svg.line(
        (centre.0 - bx, centre.1 - by),
        (centre.0 + bx, centre.1 + by),
        pen(INK, 9.0),
        false,
    );
    svg.circle(centre, 3.5, PAPER, INK, false);

    let thrust_tip = (
        centre.0 + f.thrust * scale * theta.sin(),
        centre.1 - f.thrust * scale * theta.cos(),
    );
    let weight_tip = (centre.0, centre.1 + f.weight * scale);
    let vertical_tip = (centre.0, centre.1 - f.weight * scale);
    let horizontal_tip = (centre.0 + f.unbalanced * scale, centre.1);

    svg.arrow(centre, weight_tip, pen(INK, 2.5), false);
    svg.text(
        (centre.0 - 8.0, weight_tip.1 - 4.0),
        face("end", 12.0, INK),
        format_args!("weight {} N", Sig3(f.weight)),
    );
    if f.unbalanced > 0.0 {
        svg.line(vertical_tip, thrust_tip, pen(MUTED, 1.0), true);
        svg.line(horizontal_tip, thrust_tip, pen(MUTED, 1.0), true);
        svg.arrow(centre, vertical_tip, pen(MUTED, 1.5), true);
        svg.text(
            (centre.0 - 8.0, vertical_tip.1 + 12.0),
            face("end", 11.0, MUTED),
            format_args!("upward part {} N", Sig3(f.weight)),
        );
        svg.arrow(centre, horizontal_tip, pen(FORCE, 2.5), true);
        svg.text(
            (centre.0 + 46.0, centre.1 + 36.0),
            face("start", 12.0, FORCE),
            format_args!("unbalanced {} N", Sig3(f.unbalanced)),
        );
        // The tilt angle, between the vertical and the thrust.
        let r = 34.0;
        let end = (centre.0 + r * theta.sin(), centre.1 - r * theta.cos());
        svg.arc((centre.0, centre.1 - r), r, "0 1", end, pen(INK, 1.2));
        let mid = theta / 2.0;
        svg.text(
            (
                centre.0 + (r + 6.0) * mid.sin(),
                centre.1 - (r + 6.0) * mid.cos(),
            ),
            face("start", 11.0, INK),
            format_args!("tilt {} deg", Sig3(f.tilt_deg)),
        );
    }
    svg.arrow(centre, thrust_tip, pen(THRUST, 3.0), false);
    svg.text(
        (thrust_tip.0 + 6.0, (thrust_tip.1 + 4.0).max(14.0)),
        face("start", 12.0, THRUST),
        format_args!("thrust {} N", Sig3(f.thrust)),
    );

    // Scale bar, bottom right.
    let step = nice_step(f.weight * 1.5);
    let bar = step * scale;
    svg.line((330.0 - bar, 265.0), (330.0, 265.0), pen(INK, 2.0), false);
    svg.text(
        (330.0, 258.0),
        face("end", 11.0, INK),
        format_args!("{} N", Sig3(step)),
    );

    let caption = if f.unbalanced > 0.0 {
        format!(
            "Side view, to scale ({} N per bar). Tilted {} deg, the rotors must push {} N to carry \
             the {} N weight, and the forward part of that push, {} N, must be balanced by a \
             headwind, a support or rotors that tilt back; left unbalanced, the craft would \
             accelerate forward.",
            Sig3(step),
            Sig3(f.tilt_deg),
            Sig3(f.thrust),
            Sig3(f.weight),
            Sig3(f.unbalanced),
        )
    } else {
        format!(
            "Side view, to scale ({} N per bar). Level, the rotors carry the {} N weight straight \
             up; no force is left over.",
            Sig3(step),
            Sig3(f.weight),
        )
    };
    Drawing {
        id: ID,
        title: TITLE,
        svg: Some(svg.finish()),
        caption,
    }
}

/// Left edge and width of the bars in the bar charts.
const BAR_X: f64 = 118.0;
const BAR_W: f64 = 250.0;

fn axis(svg: &mut Svg, max: f64, y: f64, unit: &str) {
    let step = nice_step(max);
    let mut v = 0.0;
    while v <= max * 1.0001 {
        let x = BAR_X + v / max * BAR_W;
        svg.line((x, y), (x, y + 4.0), pen(MUTED, 1.0), false);
        svg.text((x, y + 15.0), face("middle", 10.0, MUTED), Sig3(v));
        v += step;
    }
    svg.line((BAR_X, y), (BAR_X + BAR_W, y), pen(MUTED, 1.0), false);
    svg.text((BAR_X + BAR_W, y + 28.0), face("end", 10.0, MUTED), unit);
}

/// A value label at the end of a bar: beside it when there is room, else
/// inside its end.
fn bar_label(svg: &mut Svg, end: f64, y: f64, text: &str) {
    if end + 6.0 + 6.0 * text.len() as f64 <= BAR_X + BAR_W + 20.0 {
        svg.text((end + 5.0, y), face("start", 10.5, INK), text);
    } else {
        svg.text((end - 5.0, y), face("end", 10.5, INK), text);
    }
}

/// Available thrust at each tier against the weight, with the line a craft
/// should hover below (common practice: 70 % of maximum thrust).
pub fn thrust_bar(report: &Report) -> Drawing {
    const ID: &str = "fig-thrust";
    const TITLE: &str = "Thrust available and needed";
    let finding = report.finding(thrust_margin::ID);
    let Some(weight) = value(finding, keys::WEIGHT, None).filter(|w| *w > 0.0) else {
        return Drawing::omitted(ID, TITLE, "the thrust check gives no weight.");
    };
    let rows: Vec<(Tier, f64)> = Tier::ALL
        .into_iter()
        .filter_map(|t| value(finding, keys::THRUST_AVAILABLE, Some(t)).map(|v| (t, v)))
        .collect();
    if rows.is_empty() {
        return Drawing::omitted(ID, TITLE, "the thrust check gives no available thrust.");
    }
    let hover_share = tiers::HOVER_FRACTION_MAX.at(Tier::Typical);
    let max = rows
        .iter()
        .map(|r| r.1)
        .fold(weight, f64::max)
        .max(weight / hover_share)
        * 1.08;
    let x_of = |v: f64| BAR_X + v / max * BAR_W;
    let row_h = 34.0;
    let top = 30.0;
    let bottom = top + row_h * rows.len() as f64;
    let mut svg = Svg::new(ID, TITLE, 390.0, bottom + 62.0);
    for (i, (tier, available)) in rows.iter().enumerate() {
        let y = top + i as f64 * row_h;
        svg.text(
            (BAR_X - 8.0, y + 15.0),
            face("end", 12.0, INK),
            tier.label(),
        );
        let end = x_of(*available);
        svg.rect(BAR_X, y + 2.0, end - BAR_X, 18.0, FILL_A, THRUST);
        let hover_x = x_of(available * hover_share);
        svg.line(
            (hover_x, y - 1.0),
            (hover_x, y + 23.0),
            pen(INK, 2.5),
            false,
        );
        bar_label(&mut svg, end, y + 15.0, &format!("{} N", Sig3(*available)));
    }
    let wx = x_of(weight);
    svg.line((wx, top - 8.0), (wx, bottom), pen(FORCE, 2.0), true);
    svg.text(
        (wx.clamp(BAR_X + 40.0, BAR_X + BAR_W - 40.0), top - 12.0),
        face("middle", 11.0, FORCE),
        format_args!("weight {} N", Sig3(weight)),
    );
    axis(&mut svg, max, bottom, "newtons");
    svg.text(
        (10.0, bottom + 52.0),
        face("start", 10.5, INK),
        format_args!(
            "bar: all rotors at full power; solid mark: {:.0} % of it, the most to hover on",
            hover_share * 100.0
        ),
    );
    let caption = format!(
        "Bars to scale: the thrust all rotors give at full power under each set of assumptions. \
         The dashed line is the weight, {} N; the solid mark on each bar is {:.0} % of that bar, \
         the most a craft should spend just to hover.",
        Sig3(weight),
        hover_share * 100.0,
    );
    Drawing {
        id: ID,
        title: TITLE,
        svg: Some(svg.finish()),
        caption,
    }
}

/// Energy the battery can give at each tier against the energy the claimed
/// flight time needs at the power of that tier's flight profile.
pub fn energy_bar(report: &Report) -> Drawing {
    const ID: &str = "fig-energy";
    const TITLE: &str = "Energy stored and needed";
    let finding = report.finding(energy_budget::ID);
    let claimed_min = value(finding, keys::CLAIMED_FLIGHT_TIME, None);
    let rows: Vec<(Tier, f64, Option<f64>)> = Tier::ALL
        .into_iter()
        .filter_map(|t| {
            let stored = value(finding, keys::USABLE_ENERGY, Some(t))?;
            let needed = claimed_min
                .zip(value(finding, keys::FLIGHT_POWER, Some(t)))
                .map(|(min, watts)| watts * min / 60.0);
            Some((t, stored, needed))
        })
        .collect();
    if rows.is_empty() {
        return Drawing::omitted(ID, TITLE, "the energy check gives no usable energy.");
    }
    let max = rows
        .iter()
        .flat_map(|r| [r.1, r.2.unwrap_or(0.0)])
        .fold(0.0, f64::max)
        * 1.08;
    if !(max > 0.0 && max.is_finite()) {
        return Drawing::omitted(ID, TITLE, "the energy figures are zero.");
    }
    let x_of = |v: f64| BAR_X + v / max * BAR_W;
    let row_h = 44.0;
    let top = 12.0;
    let bottom = top + row_h * rows.len() as f64;
    let mut svg = Svg::new(ID, TITLE, 390.0, bottom + 62.0);
    for (i, (tier, stored, needed)) in rows.iter().enumerate() {
        let y = top + i as f64 * row_h;
        svg.text(
            (BAR_X - 8.0, y + 20.0),
            face("end", 12.0, INK),
            tier.label(),
        );
        let end = x_of(*stored);
        svg.rect(BAR_X, y, end - BAR_X, 14.0, FILL_A, THRUST);
        bar_label(
            &mut svg,
            end,
            y + 11.0,
            &format!("stored {} Wh", Sig3(*stored)),
        );
        if let Some(needed) = needed {
            let end = x_of(*needed);
            svg.rect(BAR_X, y + 17.0, end - BAR_X, 14.0, FILL_B, FORCE);
            bar_label(
                &mut svg,
                end,
                y + 28.0,
                &format!("needed {} Wh", Sig3(*needed)),
            );
        }
    }
    axis(&mut svg, max, bottom - 4.0, "watt-hours");
    svg.text(
        (10.0, bottom + 48.0),
        face("start", 10.5, INK),
        "upper bar: usable energy stored; lower bar: energy the claim needs",
    );
    let caption = match claimed_min {
        Some(min) if rows.iter().any(|r| r.2.is_some()) => format!(
            "Bars to scale: the battery's usable energy under each set of assumptions, and the \
             energy the claimed {} min take at that set's flight power (least power over \
             airspeed at the physical limit and best practice, hover at typical).",
            Sig3(min),
        ),
        _ => "Bars to scale: the battery's usable energy under each set of assumptions. No flight time is claimed, so no energy needed is drawn.".to_string(),
    };
    Drawing {
        id: ID,
        title: TITLE,
        svg: Some(svg.finish()),
        caption,
    }
}

/// Top view of the rotors: positions, disc size, spin senses and numbers.
pub fn rotor_layout(claim: &Claim, plan: Option<&layout::Plan<'_>>) -> Drawing {
    const ID: &str = "fig-layout";
    const TITLE: &str = "Rotor layout, seen from above";
    let Some(plan) = plan.filter(|p| !p.rotors.is_empty()) else {
        return Drawing::omitted(
            ID,
            TITLE,
            &format!(
                "the sheet does not say how its {} rotors are arranged (give rotors.layout and \
                 rotors.arm, or layout = \"custom\" with [[rotors.at]]).",
                claim.rotors.count,
            ),
        );
    };
    let (svg, scale_note) = draw_plan(ID, TITLE, plan, None);
    let n = plan.rotors.len();
    let mut caption = format!(
        "Top view, to scale ({scale_note} per bar), front up: {n} {}, numbered from the nose \
         clockwise, each marked with its spin as seen from above.",
        if n == 1 { "rotor" } else { "rotors" },
    );
    if plan.arm_assumed {
        let _ = write!(
            caption,
            " The sheet gives no arm length, so positions are drawn to a {} mm arm.",
            layout::STAND_IN_ARM_MM
        );
    }
    if plan.diameter.is_none() {
        caption.push_str(" The sheet gives no rotor diameter; dashed discs are not to scale.");
    }
    if claim.rotors.spins.is_none() && claim.rotors.at.is_empty() {
        caption.push_str(" Spins are not stated; the usual alternating pattern is drawn.");
    }
    if plan.rotors.iter().any(|r| r.tilt.is_some()) {
        caption.push_str(" Rotors marked \"tilts\" have a tilt actuator.");
    }
    if !plan.lacking.is_empty() {
        let axes: Vec<&str> = plan.lacking.iter().map(|a| a.id()).collect();
        let _ = write!(
            caption,
            " At hover these rotors cannot command: {}.",
            axes.join(", ")
        );
    }
    Drawing {
        id: ID,
        title: TITLE,
        svg: Some(svg.finish()),
        caption,
    }
}

/// An available control authority index this close to zero counts as zero.
const ZERO_AUTHORITY: f64 = 1e-6;

/// For a claim that it survives a rotor failure: the layout with the worst
/// single loss stopped (from the failure table the control analysis searched),
/// and whether the rest can still hold a hover.
pub fn rotor_failure(
    claim: &Claim,
    plan: Option<&layout::Plan<'_>>,
    control: Option<&Analysis>,
) -> Option<Drawing> {
    const ID: &str = "fig-failure";
    const TITLE: &str = "If the worst rotor stops";
    if claim.claim.survives_rotor_failure == 0 {
        return None;
    }
    let plan = plan.filter(|p| p.rotors.len() > 1)?;
    let worst = control
        .and_then(Analysis::worst_single_loss)
        .filter(|f| f.acai.iter().all(|a| a.is_finite()));
    let Some((lost, typical)) = worst.map(|f| (f.lost[0] + 1, f.acai[Tier::Typical])) else {
        return Some(Drawing::omitted(
            ID,
            TITLE,
            "the control-authority check could not search rotor failures for this sheet.",
        ));
    };
    let (svg, scale_note) = draw_plan(ID, TITLE, plan, Some(lost));
    // An index within rounding of zero is zero: no margin at all for some moment.
    let caption = if typical > ZERO_AUTHORITY {
        format!(
            "Top view ({scale_note} per bar) with rotor {lost} stopped, the loss that hurts most. \
             The rest can still hold a hover: their available control authority index (Du et al. \
             2015) stays at {} with typical hardware.",
            Sig3(typical),
        )
    } else {
        let index = if typical.abs() > ZERO_AUTHORITY {
            format!("{}, below zero", Sig3(typical))
        } else {
            "zero".to_string()
        };
        format!(
            "Top view ({scale_note} per bar) with rotor {lost} stopped, the loss that hurts most. \
             The rest cannot hold a hover: their available control authority index (Du et al. \
             2015) is {index} with typical hardware, so some moment the craft needs is out of reach.",
        )
    };
    Some(Drawing {
        id: ID,
        title: TITLE,
        svg: Some(svg.finish()),
        caption,
    })
}

/// Draws a plan from above; `lost` (numbered from 1) is drawn stopped.
/// Returns the picture and the length its scale bar stands for.
fn draw_plan(id: &str, title: &str, plan: &layout::Plan<'_>, lost: Option<usize>) -> (Svg, String) {
    // Metres on the page's scale: the rotors' hubs seen from above.
    let hubs: Vec<(f64, f64)> = plan
        .rotors
        .iter()
        .map(|r| (r.x.get::<meter>(), r.y.get::<meter>()))
        .collect();
    let reach = hubs
        .iter()
        .map(|(x, y)| x.abs().max(y.abs()))
        .fold(0.0, f64::max);
    // Disc radius: the stated size, else a third of the largest arm.
    let radius_m = plan
        .diameter
        .map(|d| d.get::<meter>() / 2.0)
        .unwrap_or(if reach > 0.0 { reach / 3.0 } else { 0.05 });
    let extent = (reach + radius_m).max(1e-3);
    let (w, h) = (320.0, 320.0);
    let centre = (160.0, 165.0);
    let scale = 115.0 / extent;
    // Body x (forward) is up the page, body y (left) is left: a view from above.
    let to_page = |x: f64, y: f64| (centre.0 - y * scale, centre.1 - x * scale);
    let mut svg = Svg::new(id, title, w, h);

    svg.arrow(
        (centre.0, centre.1 - 14.0),
        (centre.0, 14.0),
        pen(MUTED, 1.0),
        true,
    );
    svg.text((centre.0 + 6.0, 16.0), face("start", 11.0, MUTED), "front");
    let coaxial = hubs.len() > 1 && hubs.iter().all(|(x, y)| x.abs() < 1e-9 && y.abs() < 1e-9);
    for &(x, y) in &hubs {
        svg.line(centre, to_page(x, y), pen(INK, 4.0), false);
    }
    svg.rect(centre.0 - 9.0, centre.1 - 9.0, 18.0, 18.0, INK, INK);
    for (i, (r, &(x, y))) in plan.rotors.iter().zip(&hubs).enumerate() {
        let c = to_page(x, y);
        let tilts = r.tilt.is_some();
        let stopped = lost == Some(i + 1);
        let shrink = if coaxial { 1.0 - 0.28 * i as f64 } else { 1.0 };
        let rad = (radius_m * scale * shrink).max(6.0);
        if stopped {
            svg.circle(c, rad, PAPER, FORCE, true);
            let d = rad * 0.6;
            svg.line(
                (c.0 - d, c.1 - d),
                (c.0 + d, c.1 + d),
                pen(FORCE, 2.5),
                false,
            );
            svg.line(
                (c.0 - d, c.1 + d),
                (c.0 + d, c.1 - d),
                pen(FORCE, 2.5),
                false,
            );
        } else {
            svg.circle(c, rad, DISC, THRUST, plan.diameter.is_none());
            spin_arrow(&mut svg, c, rad * 0.72, r.spin);
        }
        let spin = match (stopped, r.spin) {
            (true, _) => "stopped",
            (false, Spin::Cw) => "CW",
            (false, Spin::Ccw) => "CCW",
        };
        let tilt_word = if tilts && coaxial { " tilts" } else { "" };
        let label = if coaxial {
            let level = if i == 0 { "upper" } else { "lower" };
            format!("{} {level} {spin}{tilt_word}", i + 1)
        } else {
            format!("{} {spin}", i + 1)
        };
        if tilts && !coaxial {
            svg.text((c.0, c.1 + rad + 12.0), face("middle", 10.5, INK), "tilts");
        }
        let at = if coaxial {
            (centre.0 + rad + 4.0, c.1 - rad + 12.0 + 14.0 * i as f64)
        } else if stopped {
            (c.0, c.1 + rad + 13.0)
        } else {
            (c.0, c.1 + 4.0)
        };
        let face = match (coaxial, stopped) {
            (true, true) => face("start", 11.0, FORCE),
            (true, false) => face("start", 11.0, INK),
            (false, true) => face("middle", 11.0, FORCE),
            (false, false) => face("middle", 11.0, INK),
        };
        svg.text(at, face, &label);
    }
    let step_m = nice_step(extent * 2.0);
    let bar = step_m * scale;
    svg.line((300.0 - bar, 305.0), (300.0, 305.0), pen(INK, 2.0), false);
    let step_label = format!("{} mm", Sig3(step_m * 1000.0));
    svg.text((300.0, 298.0), face("end", 11.0, INK), &step_label);
    (svg, step_label)
}

/// A three-quarter arc with an arrowhead, turning the way the rotor spins on
/// the page (which is the view from above).
fn spin_arrow(svg: &mut Svg, (cx, cy): (f64, f64), r: f64, spin: Spin) {
    // Page y grows downward, so increasing page angle turns clockwise on screen.
    let sweep_cw = spin == Spin::Cw;
    let (a0, a1) = if sweep_cw {
        (200f64, 470f64)
    } else {
        (340f64, 70f64)
    };
    let point = |deg: f64| {
        let t = deg.to_radians();
        (cx + r * t.cos(), cy + r * t.sin())
    };
    let (s, e) = (point(a0), point(a1));
    let flags = if sweep_cw { "1 1" } else { "1 0" };
    svg.arc(s, r, flags, e, pen(THRUST, 1.5));
    // Head tangent to the arc at its end, pointing along the turn.
    let t = a1.to_radians();
    let dir = if sweep_cw { 1.0 } else { -1.0 };
    let tangent = (-t.sin() * dir, t.cos() * dir);
    svg.arrow(
        (e.0 - tangent.0 * 9.0, e.1 - tangent.1 * 9.0),
        (e.0 + tangent.0 * 4.0, e.1 + tangent.1 * 4.0),
        pen(THRUST, 2.0),
        false,
    );
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn coordinates_are_written_to_the_nearest_tenth_in_their_shortest_form() {
        // Rounded to tenths, then the shortest decimal that reads back as that value.
        let cases = [
            (12.34, "12.3"),
            (12.35, "12.4"),
            (34.0, "34"),
            (-0.04, "0"),
            (-2.26, "-2.3"),
            (639.96, "640"),
            (0.05, "0.1"),
        ];
        for (v, text) in cases {
            assert_eq!(Tenths(v).to_string(), text, "{v}");
        }
    }

    use crate::claim::{self, Format};
    use crate::report::{Figure, Finding, Verdict};

    fn sheet(extra: &str) -> Claim {
        let text = format!(
            "title = \"t\"\n[craft]\nmass = \"300 g\"\n[rotors]\nlayout = \"quad-x\"\narm = \"80 mm\"\ndiameter = \"76 mm\"\n{extra}"
        );
        claim::parse(&text, Format::Toml).unwrap()
    }

    fn finding(rule: &'static str, figures: Vec<Figure>) -> Finding {
        Finding {
            rule,
            verdict: Verdict::Consistent,
            headline: String::new(),
            figures,
            would_take: String::new(),
            assumptions: Vec::new(),
            sources: &[],
        }
    }

    fn fig(key: &'static str, tier: Option<Tier>, value: f64) -> Figure {
        Figure {
            key,
            label: key.into(),
            tier,
            value,
            unit: "N",
        }
    }

    #[test]
    fn a_thirty_degree_hover_leaves_weight_times_tan_thirty_unbalanced() {
        // Statics (DESIGN check values): a tilted rigid thrust vector gives a
        // horizontal force W tan(theta); at 30 deg, tan = 0.5774 (g tan = 5.66 m/s^2).
        let report = Report::new(
            "t".into(),
            vec![finding(
                "thrust-margin",
                vec![fig(keys::WEIGHT, None, 10.0)],
            )],
        );
        let claim = sheet("[claim]\nhover_tilt = \"30 deg\"");
        let f = Forces::of(&report, &claim).unwrap();
        assert!((f.unbalanced - 5.7735).abs() < 1e-3, "{f:?}");
        assert!((f.thrust - 11.547).abs() < 1e-3, "{f:?}");
        let drawing = free_body(&report, &claim);
        let svg = drawing.svg.unwrap();
        assert!(svg.contains("unbalanced 5.77 N"), "{svg}");
        assert!(svg.contains("thrust 11.5 N"));
    }

    #[test]
    fn every_drawing_is_left_out_with_a_reason_when_the_report_is_empty() {
        let report = Report::new("t".into(), Vec::new());
        let claim = sheet("");
        let drawings = all(&report, &claim, None);
        let missing: Vec<&str> = drawings
            .iter()
            .filter(|d| d.svg.is_none())
            .map(|d| d.id)
            .collect();
        assert_eq!(missing, ["fig-forces", "fig-thrust", "fig-energy"]);
        assert!(drawings.iter().all(|d| !d.caption.is_empty()));
        // The layout comes from the sheet alone.
        assert!(drawings[3].svg.as_ref().unwrap().contains("4 CCW"));
    }

    #[test]
    fn thrust_bars_are_drawn_to_one_scale() {
        let report = Report::new(
            "t".into(),
            vec![finding(
                "thrust-margin",
                vec![
                    fig(keys::WEIGHT, None, 3.0),
                    fig(keys::THRUST_AVAILABLE, Some(Tier::PhysicalLimit), 8.0),
                    fig(keys::THRUST_AVAILABLE, Some(Tier::Typical), 4.0),
                ],
            )],
        );
        let svg = thrust_bar(&report).svg.unwrap();
        let widths: Vec<f64> = svg
            .split("<rect ")
            .skip(2)
            .filter_map(|r| r.split("width=\"").nth(1)?.split('"').next()?.parse().ok())
            .collect();
        assert_eq!(widths.len(), 2, "{svg}");
        assert!((widths[0] / widths[1] - 2.0).abs() < 0.02, "{widths:?}");
        assert!(svg.contains("weight 3.00 N"));
    }

    #[test]
    fn energy_needed_is_flight_power_times_the_claimed_time() {
        // Energy = power x time: 6 W for 15 min is 1.5 Wh.
        let mut e = vec![fig(keys::CLAIMED_FLIGHT_TIME, None, 15.0)];
        for t in Tier::ALL {
            e.push(fig(keys::USABLE_ENERGY, Some(t), 2.0));
            e.push(fig(keys::FLIGHT_POWER, Some(t), 6.0));
        }
        let report = Report::new("t".into(), vec![finding("energy-budget", e)]);
        let svg = energy_bar(&report).svg.unwrap();
        assert!(svg.contains("needed 1.50 Wh"), "{svg}");
    }

    #[test]
    fn a_claimed_rotor_failure_on_a_quad_is_drawn_with_the_worst_rotor_stopped() {
        // Du, Quan, Yang, Cai (2015): a quadrotor that loses any rotor has ACAI < 0,
        // so the drawing must say the rest cannot hold a hover.
        let claim = sheet("max_thrust = \"600 g\"\n[claim]\nsurvives_rotor_failure = 1");
        let checked = crate::rules::check(&claim);
        let control = checked.control.as_ref();
        let d = rotor_failure(&claim, layout::plan(&claim, control).as_ref(), control)
            .expect("drawn for a claimed failure");
        assert!(
            d.svg.as_ref().unwrap().contains(" stopped</text>"),
            "{:?}",
            d.svg
        );
        assert!(d.caption.contains("cannot hold a hover"), "{}", d.caption);
        let unclaimed = sheet("max_thrust = \"600 g\"");
        let checked = crate::rules::check(&unclaimed);
        let control = checked.control.as_ref();
        assert!(control.is_some());
        assert!(rotor_failure(
            &unclaimed,
            layout::plan(&unclaimed, control).as_ref(),
            control
        )
        .is_none());
    }

    #[test]
    fn an_alternating_hexacopter_that_loses_a_rotor_has_zero_authority_left() {
        // Du, Quan, Yang, Cai (2015), their hexacopter (m = 1.535 kg, arm 0.275 m,
        // rotor thrust up to 6.125 N): with spins P N P N P N the ACAI is 0 once
        // any one rotor is lost.
        let text = "title = \"du\"\n[craft]\nmass = \"1.535 kg\"\n[rotors]\nlayout = \"hex\"\n\
                    arm = \"275 mm\"\ndiameter = \"10 in\"\nmax_thrust = \"6.125 N\"\n\
                    [claim]\nsurvives_rotor_failure = 1";
        let claim = claim::parse(text, Format::Toml).unwrap();
        let checked = crate::rules::check(&claim);
        let control = checked.control.as_ref();
        let d = rotor_failure(&claim, layout::plan(&claim, control).as_ref(), control).unwrap();
        assert!(
            d.caption.contains("index (Du et al. 2015) is zero"),
            "{}",
            d.caption
        );
    }

    #[test]
    fn svg_text_is_escaped() {
        let mut svg = Svg::new("fig-t", "a <title> & more", 10.0, 10.0);
        svg.text((1.0, 2.0), face("start", 11.0, INK), "<a href=\"x\">&'");
        let out = svg.finish();
        assert!(out.contains("<title id=\"fig-t-t\">a &#60;title&#62; &#38; more</title>"));
        assert!(
            out.contains(">&#60;a href=&#34;x&#34;&#62;&#38;&#39;</text>"),
            "{out}"
        );
    }
}

//! The report of `gonogo sweep`: for each candidate limit, the engines legal, conditional and
//! illegal, and the tightest candidate that keeps the chosen share legal. Text and JSON
//! (schema `gonogo.sweep/1`) give the numbers; HTML draws the field (each engine's value with
//! its ±U) against today's limit and the candidates as one inline SVG, with the same table.

use std::fmt::Write;

use super::format::quantity;
use crate::analyze::sweep::{Point, Side, Tally};
use crate::units::Unit;

/// Output formats of `sweep`.
#[derive(Clone, Copy, Debug, PartialEq, Eq, clap::ValueEnum)]
pub enum SweepFormat {
    /// Plain text.
    Text,
    /// One self-contained HTML page with the picture.
    Html,
    /// One JSON document (schema `gonogo.sweep/1`).
    Json,
}

/// Everything the report shows.
pub struct SweepView<'a> {
    /// The series.
    pub series: &'a str,
    /// The edition.
    pub edition: &'a str,
    /// The class.
    pub class: &'a str,
    /// The rule's section.
    pub section: &'a str,
    /// The decision rule in force.
    pub decision: &'static str,
    /// The unit of the rule's limit.
    pub unit: Option<&'static Unit>,
    /// Upper or lower limit.
    pub side: Side,
    /// Today's limit, SI.
    pub today: f64,
    /// The tightest candidate that keeps `share` legal, SI.
    pub chosen: Option<f64>,
    /// Decimal places to show candidates with.
    pub places: usize,
    /// The share asked for, 0 to 1.
    pub share: f64,
    /// Each engine's value.
    pub field: &'a [Point],
    /// The counts per candidate.
    pub tallies: &'a [Tally],
    /// Files left out, with why.
    pub unreadable: &'a [(String, String)],
}

/// Renders the sweep.
pub fn render(v: &SweepView, format: SweepFormat) -> String {
    match format {
        SweepFormat::Text => text(v),
        SweepFormat::Json => json(v),
        SweepFormat::Html => html(v),
    }
}

fn heading(v: &SweepView) -> String {
    format!(
        "{}: edition {}, class {}, rule {}, {} engines, today's limit {} ({})",
        v.series,
        v.edition,
        v.class,
        v.section,
        v.field.len(),
        quantity(v.today, v.unit),
        v.decision
    )
}

/// A candidate in the rule's unit with the sweep's decimal places.
fn candidate(v: &SweepView, si: f64) -> String {
    let scale = v.unit.map_or(1.0, |u| u.to_si);
    let symbol = v.unit.map(|u| format!(" {}", u.symbol)).unwrap_or_default();
    format!("{:.*}{symbol}", v.places, si / scale)
}

fn chosen_line(v: &SweepView) -> String {
    let share = format!("{:.0} %", v.share * 100.0);
    match v.chosen {
        Some(c) => format!(
            "the tightest candidate keeping {share} legal: {}",
            candidate(v, c)
        ),
        None => format!("no candidate keeps {share} legal"),
    }
}

fn rows(v: &SweepView) -> Vec<[String; 4]> {
    v.tallies
        .iter()
        .map(|t| {
            [
                candidate(v, t.limit),
                t.legal.to_string(),
                t.conditional.to_string(),
                t.illegal.to_string(),
            ]
        })
        .collect()
}

fn text(v: &SweepView) -> String {
    let mut out = heading(v) + "\n\n";
    let _ = writeln!(
        out,
        "  {:<12}  {:>5}  {:>11}  {:>7}",
        "limit", "legal", "conditional", "illegal"
    );
    for r in rows(v) {
        let _ = writeln!(
            out,
            "  {:<12}  {:>5}  {:>11}  {:>7}",
            r[0], r[1], r[2], r[3]
        );
    }
    let _ = writeln!(out, "\n{}", chosen_line(v));
    for (f, why) in v.unreadable {
        let _ = writeln!(out, "left out: {f}: {why}");
    }
    out
}

fn json(v: &SweepView) -> String {
    let scale = v.unit.map_or(1.0, |u| u.to_si);
    let doc = serde_json::json!({
        "schema": "gonogo.sweep/1",
        "series": v.series,
        "edition": v.edition,
        "class": v.class,
        "section": v.section,
        "decision": v.decision,
        "unit": v.unit.map(|u| u.symbol),
        "today": v.today / scale,
        "keep": v.share,
        "chosen": v.chosen.map(|c| c / scale),
        "candidates": v.tallies.iter().map(|t| serde_json::json!({
            "limit": t.limit / scale, "legal": t.legal,
            "conditional": t.conditional, "illegal": t.illegal,
        })).collect::<Vec<_>>(),
        "engines": v.field.iter().map(|p| serde_json::json!({
            "engine": p.engine, "value": p.value / scale, "expanded": p.expanded / scale,
        })).collect::<Vec<_>>(),
        "left_out": v.unreadable.iter().map(|(f, w)| [f, w]).collect::<Vec<_>>(),
    });
    serde_json::to_string_pretty(&doc).unwrap_or_default() + "\n"
}

fn escape(s: &str) -> String {
    s.replace('&', "&amp;")
        .replace('<', "&lt;")
        .replace('>', "&gt;")
}

/// The picture: engines sorted by value, one row each, a dot at the value and a bar of ±U;
/// today's limit a solid line, the candidates thin dashed lines, the chosen one marked.
pub fn svg(v: &SweepView) -> String {
    let (w, left, right, top, row) = (760.0, 40.0, 20.0, 30.0, 12.0);
    let mut lo = v.today.min(v.tallies.first().map_or(v.today, |t| t.limit));
    let mut hi = v.today.max(v.tallies.last().map_or(v.today, |t| t.limit));
    for p in v.field {
        lo = lo.min(p.value - p.expanded);
        hi = hi.max(p.value + p.expanded);
    }
    let pad = (hi - lo).max(f64::EPSILON) * 0.03;
    let (lo, hi) = (lo - pad, hi + pad);
    let x = |s: f64| left + (s - lo) / (hi - lo) * (w - left - right);
    let h = top + row * v.field.len() as f64 + 40.0;
    let mut out = format!(
        "<svg xmlns=\"http://www.w3.org/2000/svg\" width=\"{w}\" height=\"{h}\" viewBox=\"0 0 {w} {h}\" role=\"img\" aria-label=\"each engine's value with its uncertainty against today's limit and the candidates\">\n"
    );
    let bottom = h - 30.0;
    for t in v.tallies {
        let cx = x(t.limit);
        let _ = writeln!(
            out,
            "<line class=\"candidate\" x1=\"{cx:.1}\" y1=\"{top}\" x2=\"{cx:.1}\" y2=\"{bottom}\" stroke=\"#999\" stroke-dasharray=\"3 3\"/><text x=\"{cx:.1}\" y=\"{:.1}\" font-size=\"10\" text-anchor=\"middle\">{}</text>",
            bottom + 14.0,
            escape(&candidate(v, t.limit))
        );
    }
    let mut sorted: Vec<&Point> = v.field.iter().collect();
    sorted.sort_by(|a, b| a.value.total_cmp(&b.value));
    for (i, p) in sorted.iter().enumerate() {
        let y = top + row * (i as f64 + 0.5);
        let _ = writeln!(
            out,
            "<g class=\"engine\"><title>{}: {} ± {}</title><line x1=\"{:.1}\" y1=\"{y:.1}\" x2=\"{:.1}\" y2=\"{y:.1}\" stroke=\"#36c\" stroke-width=\"2\"/><circle cx=\"{:.1}\" cy=\"{y:.1}\" r=\"3\" fill=\"#036\"/></g>",
            escape(&p.engine),
            escape(&quantity(p.value, v.unit)),
            escape(&quantity(p.expanded, v.unit)),
            x(p.value - p.expanded),
            x(p.value + p.expanded),
            x(p.value)
        );
    }
    let tx = x(v.today);
    let _ = writeln!(
        out,
        "<line class=\"today\" x1=\"{tx:.1}\" y1=\"{:.1}\" x2=\"{tx:.1}\" y2=\"{bottom}\" stroke=\"#c00\" stroke-width=\"2\"/><text x=\"{tx:.1}\" y=\"{:.1}\" font-size=\"11\" fill=\"#c00\" text-anchor=\"middle\">today {}</text>",
        top - 12.0,
        top - 16.0,
        escape(&quantity(v.today, v.unit))
    );
    if let Some(c) = v.chosen {
        let cx = x(c);
        let _ = writeln!(
            out,
            "<line class=\"chosen\" x1=\"{cx:.1}\" y1=\"{top}\" x2=\"{cx:.1}\" y2=\"{bottom}\" stroke=\"#090\" stroke-width=\"2\"/><text x=\"{cx:.1}\" y=\"{:.1}\" font-size=\"11\" fill=\"#090\" text-anchor=\"middle\">keeps {:.0} %</text>",
            bottom + 26.0,
            v.share * 100.0
        );
    }
    out.push_str("</svg>\n");
    out
}

fn html(v: &SweepView) -> String {
    let mut table = String::from(
        "<table><tr><th>limit</th><th>legal</th><th>conditional</th><th>illegal</th></tr>\n",
    );
    for r in rows(v) {
        let _ = writeln!(
            table,
            "<tr>{}</tr>",
            r.iter()
                .map(|c| format!("<td>{}</td>", escape(c)))
                .collect::<String>()
        );
    }
    table.push_str("</table>\n");
    format!(
        "<!DOCTYPE html>\n<html lang=\"en\">\n<head>\n<meta charset=\"utf-8\">\n<title>{} rule {}: sweep</title>\n<style>\nbody {{ font-family: sans-serif; margin: 2em; }}\ntable {{ border-collapse: collapse; }}\nth, td {{ border: 1px solid #999; padding: 0.2em 0.6em; }}\n</style>\n</head>\n<body>\n<h1>{}</h1>\n{}<p>{}</p>\n{table}</body>\n</html>\n",
        escape(v.class),
        escape(v.section),
        escape(&heading(v)),
        svg(v),
        escape(&chosen_line(v))
    )
}

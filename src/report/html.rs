//! The printable tech sheet of `check --format html`: one self-contained page per run (no
//! external file, no network), with a print stylesheet that fits A4 and US Letter. Page one
//! is the record: the engine's identity, its result, a table of every rule that is illegal,
//! not proven or not checked with its penalty, the seals found and applied, and the
//! signature block. The full detail of every rule follows (two columns in print): its verdict
//! as a mark and words (never colour alone), its finding and numbers, an inline SVG scale with
//! the legal side shaded and named, the limit, the guard band of ±U around it and the value
//! with its uncertainty bar, and its trace. A layout of the [`EngineView`]; the words are the
//! view's.

use std::fmt::Write;

use super::view::{EngineView, Fact, Line, NumberView, RuleView, TraceLine};
use crate::evaluate::finding::Verdict;
use crate::evaluate::outcome::EngineReport;

/// HTML-escapes text.
pub fn escape(text: &str) -> String {
    let mut out = String::with_capacity(text.len());
    for c in text.chars() {
        match c {
            '&' => out.push_str("&amp;"),
            '<' => out.push_str("&lt;"),
            '>' => out.push_str("&gt;"),
            '"' => out.push_str("&quot;"),
            '\'' => out.push_str("&#39;"),
            c => out.push(c),
        }
    }
    out
}

const STYLE: &str = "
body { font-family: system-ui, sans-serif; font-size: 10.5pt; margin: 1.5em; color: #111; }
h1 { font-size: 14pt; margin: 0 0 .3em; }
h2.part { font-size: 11pt; margin: .8em 0 .3em; }
table.identity td { padding: 0 1em 0 0; }
table.identity td:first-child { color: #444; }
.summary { font-size: 12pt; font-weight: bold; padding: .3em .6em; border: 2px solid #333; margin: .6em 0 .3em; }
.summary .closest { font-weight: normal; font-size: 10pt; }
.key { font-size: 9pt; margin: .2em 0 .5em; }
table.calls, table.seals { border-collapse: collapse; width: 100%; margin: .3em 0; }
table.calls th, table.calls td, table.seals th, table.seals td { border: 1px solid #777; padding: .15em .4em; text-align: left; vertical-align: top; }
.blank { display: inline-block; min-width: 14em; border-bottom: 1px solid #111; }
.record { break-inside: avoid; page-break-inside: avoid; }
.detail { columns: 2; column-gap: 1.5em; column-rule: 1px solid #ccc; }
section.rule { border-top: 1px solid #999; padding: .3em 0; break-inside: avoid; page-break-inside: avoid; }
section.rule h3 { font-size: 10pt; margin: 0 0 .2em; }
.mark { display: inline-block; min-width: 1.8em; font-weight: bold; }
.legal .mark { color: #14632f; } .illegal .mark { color: #a11616; } .uncertain .mark { color: #8a5a00; }
.verdict { font-weight: bold; }
code { font-size: 9pt; }
section.rule p { margin: .05em 0; }
.label { color: #444; }
svg.scale { display: block; margin: .2em 0; max-width: 100%; height: auto; }
ul.trace { margin: .1em 0 .1em 1em; padding: 0; font-size: 8pt; }
.signatures { margin: 1.6em 0 .6em; display: flex; gap: 3em; }
.signatures div { flex: 1; border-top: 1px solid #111; padding-top: .3em; }
.provenance { margin-top: 1.5em; font-size: 7.5pt; color: #333; overflow-wrap: anywhere; }
@page { margin: 10mm; }
@media print { body { margin: 0; font-size: 8pt; } .summary { border-width: 1px; font-size: 11pt; }
  section.rule h3 { font-size: 8.5pt; } code { font-size: 7.5pt; } ul.trace { font-size: 6.5pt; } }
";

/// The whole page for one or more engines.
pub fn page(reports: &[EngineReport]) -> String {
    super::document::whole(super::document::Layout::Html, reports)
}

/// The page's title when `view` is its first engine.
pub fn title(view: &EngineView) -> String {
    format!("Tech sheet — {} — {}", view.series, view.class)
}

/// The page up to its first engine: the head with its title and style, and the body's start.
pub fn head(title: &str) -> String {
    format!(
        "<!doctype html>\n<html lang=\"en\">\n<head>\n<meta charset=\"utf-8\">\n<title>{}</title>\n<style>{STYLE}</style>\n</head>\n<body>\n",
        escape(title)
    )
}

/// What stands between two engines' sheets: a page break.
pub const PAGE_BREAK: &str =
    "<div style=\"break-before: page; page-break-before: always\"></div>\n";

/// The page after its last engine.
pub const FOOT: &str = "</body>\n</html>\n";

/// One engine's tech sheet: page one (identity, result, the calls, seals, signatures,
/// provenance) and every rule in detail.
pub fn engine(v: &EngineView) -> String {
    let mut out = String::new();
    engine_into(&mut out, v);
    out
}

fn engine_into(out: &mut String, v: &EngineView) {
    let _ = writeln!(out, "<h1>{}</h1>", escape(&v.heading));
    identity(out, v);
    let closest = v
        .closest_call
        .as_ref()
        .map(|c| {
            format!(
                "<br><span class=\"closest\">deciding rule: {}</span>",
                escape(&c.words())
            )
        })
        .unwrap_or_default();
    let _ = writeln!(
        out,
        "<p class=\"summary\">{} {}{closest}</p>",
        v.result.mark(),
        escape(&v.result_words())
    );
    let _ = writeln!(
        out,
        "<p class=\"key\">Marks: {}. The mark says what the measurement shows; the word, the call under the decision rule in force.</p>",
        escape(&v.marks())
    );
    calls(out, v);
    seals(out, v);
    out.push_str("<div class=\"signatures record\"><div>Inspector — name, signature, time</div><div>Competitor — name, signature, time</div></div>\n");
    provenance(out, v);
    out.push_str("<h2 class=\"part\">Every rule in detail</h2>\n<div class=\"detail\">\n");
    for rule in &v.rules {
        rule_section(out, rule, v);
    }
    out.push_str("</div>\n");
}

fn identity(out: &mut String, v: &EngineView) {
    out.push_str("<table class=\"identity\">\n");
    let mut rows = vec![
        ("Engine", v.engine.clone()),
        ("Car", v.car.clone()),
        ("Event", v.event.clone()),
        ("Date", v.date.clone()),
        ("Measured by", v.measured_by.clone()),
        ("Decision rule", Some(v.decision_words())),
        ("Rules in force", Some(v.rules_in_force())),
        ("Declaration", Some(v.file.clone())),
    ];
    if let Some(inspected) = v.inspected.words() {
        rows.push(("Inspected", Some(inspected)));
    }
    for pair in rows.chunks(2) {
        out.push_str("<tr>");
        for (label, value) in pair {
            let _ = write!(
                out,
                "<td>{label}</td><td>{}</td>",
                escape(value.as_deref().unwrap_or("—"))
            );
        }
        out.push_str("</tr>\n");
    }
    out.push_str("</table>\n");
}

/// Whether page one's table lists a rule: illegal, not proven, or not checked.
pub fn needs_attention(rule: &RuleView) -> bool {
    rule.verdict == Verdict::Illegal || rule.uncertain
}

/// Page one's table: every rule illegal, not proven or not checked, with its penalty.
fn calls(out: &mut String, v: &EngineView) {
    let _ = writeln!(
        out,
        "<h2 class=\"part\">Rules illegal, not proven or not checked</h2>"
    );
    let listed: Vec<&RuleView> = v.rules.iter().filter(|r| needs_attention(r)).collect();
    if listed.is_empty() {
        out.push_str("<p>None: every rule that applies is proven legal.</p>\n");
        return;
    }
    out.push_str("<table class=\"calls\">\n<tr><th></th><th>rule</th><th>call</th><th>value and limit</th><th>penalty</th></tr>\n");
    for rule in listed {
        let numbers = rule
            .numeric
            .as_ref()
            .filter(|_| rule.shows_finding)
            .map(|n| {
                format!(
                    "value {}, limit {}, U {}",
                    n.shown.value, n.shown.limit, n.shown.expanded_uncertainty
                )
            })
            .or_else(|| gauge_proof(rule))
            .or_else(|| rule.observed.clone())
            .unwrap_or_else(|| "—".to_string());
        let _ = writeln!(
            out,
            "<tr class=\"{}\"><td class=\"mark\">{}</td><td>{} {}</td><td>{}</td><td>{}</td><td>{}</td></tr>",
            class_of(rule),
            rule.mark,
            escape(&rule.section),
            escape(&rule.title),
            escape(&rule.verdict_words()),
            escape(&numbers),
            escape(rule.penalty.as_deref().unwrap_or("—"))
        );
    }
    out.push_str("</table>\n");
}

/// What the gauge results proved about each side of a gauge-decided rule, for page one's
/// "value and limit" column, or why the gauges could not decide it.
fn gauge_proof(rule: &RuleView) -> Option<String> {
    if let Some(call) = &rule.gauge {
        let sides: Vec<&str> = call.sides.iter().map(|s| s.words.as_str()).collect();
        return Some(sides.join("; "));
    }
    let reasons: Vec<&str> = rule.gauge_gaps.iter().map(|g| g.reason.as_str()).collect();
    (!reasons.is_empty()).then(|| reasons.join("; "))
}

/// The provenance footer of the printed sheet: who made it and when, and the fingerprints in
/// full, so a paper copy can be matched to its exact inputs.
fn provenance(out: &mut String, v: &EngineView) {
    let p = &v.provenance;
    let _ = writeln!(
        out,
        "<p class=\"provenance\">Made by {}. Rulebook SHA-256 <code>{}</code>. Declaration SHA-256 <code>{}</code>.</p>",
        escape(&p.made_by()),
        escape(&p.rulebook_sha256),
        escape(&p.declaration_sha256)
    );
}

/// Page one's seals: those the declaration records, and blanks to write them in where it
/// records none.
fn seals(out: &mut String, v: &EngineView) {
    out.push_str(
        "<table class=\"seals record\">\n<tr><th>seals</th><th>number</th><th>place</th></tr>\n",
    );
    for (label, list) in [("found", &v.seals.found), ("applied", &v.seals.applied)] {
        if list.is_empty() {
            let _ = writeln!(
                out,
                "<tr><td>{label}</td><td><span class=\"blank\"></span></td><td><span class=\"blank\"></span></td></tr>"
            );
        }
        for seal in list {
            let _ = writeln!(
                out,
                "<tr><td>{label}</td><td>{}</td><td>{}</td></tr>",
                escape(&seal.number),
                escape(seal.place.as_deref().unwrap_or("—"))
            );
        }
    }
    out.push_str("</table>\n");
}

fn class_of(rule: &RuleView) -> &'static str {
    match rule.verdict {
        Verdict::Legal if rule.uncertain => "uncertain",
        Verdict::Legal => "legal",
        Verdict::Illegal => "illegal",
        Verdict::NotChecked => "uncertain",
        Verdict::NotApplicable | Verdict::NotInScope => "na",
    }
}

fn rule_section(out: &mut String, rule: &RuleView, v: &EngineView) {
    let _ = writeln!(out, "<section class=\"rule {}\">", class_of(rule));
    let _ = writeln!(
        out,
        "<h3><span class=\"mark\">{}</span>{} {} — <span class=\"verdict\">{}</span></h3>",
        rule.mark,
        escape(&rule.section),
        escape(&rule.title),
        escape(&rule.verdict_words())
    );
    let mut numbers: Vec<String> = Vec::new();
    for line in rule.lines(v) {
        if let Line::Fact(f) = &line
            && NUMBERS.contains(&f.label)
        {
            numbers.push(fact_html(f));
            continue;
        }
        if !numbers.is_empty() {
            let _ = writeln!(out, "<p class=\"numbers\">{}</p>", numbers.join(" · "));
            numbers.clear();
        }
        match line {
            Line::Fact(f) => {
                let _ = writeln!(out, "<p>{}</p>", fact_html(&f));
            }
            Line::Scale(n) => out.push_str(&scale(n)),
            Line::Trace(trace) => trace_list(out, &trace),
        }
    }
    if !numbers.is_empty() {
        let _ = writeln!(out, "<p class=\"numbers\">{}</p>", numbers.join(" · "));
    }
    out.push_str("</section>\n");
}

fn trace_list(out: &mut String, trace: &[TraceLine]) {
    out.push_str("<ul class=\"trace\">\n");
    for t in trace {
        let result = t
            .result()
            .map(|r| format!("<br>{}", escape(&r)))
            .unwrap_or_default();
        let _ = writeln!(out, "<li>{}{result}</li>", escape(&t.words()));
    }
    out.push_str("</ul>\n");
}

/// The facts a sheet sets on one line, before the scale.
const NUMBERS: [&str; 5] = [
    "value",
    "limit",
    "limits",
    "margin",
    "conformance probability",
];

/// `<span class="label">requires</span> <code>bore &lt;= 4.030 in</code>`.
fn fact_html(f: &Fact) -> String {
    let mut html = format!("<span class=\"label\">{}</span>", escape(f.label));
    if let Some(code) = &f.code {
        let _ = write!(html, " <code>{}</code>", escape(code));
    }
    if !f.text.is_empty() {
        let _ = write!(html, " {}", escape(&f.text));
    }
    html
}

/// The scale's width in pixels, and its left and right ends.
const WIDTH: f64 = 360.0;
const LEFT: f64 = 8.0;
const RIGHT: f64 = 352.0;
/// A label's font size, and the width of one of its characters (an estimate, for keeping
/// labels apart and on the scale).
const FONT: f64 = 9.0;
const CHAR: f64 = 5.2;

/// Which side of its limit(s) is legal.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum LegalSide {
    /// At or below the limit.
    Below,
    /// At or above the limit.
    Above,
    /// Between the two limits.
    Between,
    /// Not known: the value sits exactly on a one-sided limit, so the margin's sign says
    /// nothing about the side.
    Unknown,
}

/// The legal side of a numeric limit: a `between` is legal between; a one-sided limit is
/// legal on the value's side when the margin is positive, on the other when it is negative.
pub fn legal_side(n: &NumberView) -> LegalSide {
    let offset = n.value - n.limit;
    if n.range.is_some() {
        LegalSide::Between
    } else if offset == 0.0 || n.margin == 0.0 {
        LegalSide::Unknown
    } else if (offset > 0.0) == (n.margin > 0.0) {
        LegalSide::Above
    } else {
        LegalSide::Below
    }
}

/// A label of the scale: where it is anchored and how.
#[derive(Clone, Debug, PartialEq)]
pub struct Label {
    /// The anchor's x.
    pub x: f64,
    /// `start`, `middle` or `end`.
    pub anchor: &'static str,
    /// The words.
    pub text: String,
}

impl Label {
    /// A label centred on `x`, moved inward where it would run off the scale.
    fn at(x: f64, text: String) -> Label {
        let half = text.chars().count() as f64 * CHAR / 2.0;
        let (x, anchor) = if x - half < 1.0 {
            (1.0, "start")
        } else if x + half > WIDTH - 1.0 {
            (WIDTH - 1.0, "end")
        } else {
            (x, "middle")
        };
        Label { x, anchor, text }
    }

    /// Its left and right ends.
    pub fn extent(&self) -> (f64, f64) {
        let w = self.text.chars().count() as f64 * CHAR;
        match self.anchor {
            "start" => (self.x, self.x + w),
            "end" => (self.x - w, self.x),
            _ => (self.x - w / 2.0, self.x + w / 2.0),
        }
    }
}

/// A scale laid out in pixels: the window of values it shows, each limit in view with its
/// guard band, the value with its ±U bar, the legal side shaded, and a limit outside the
/// window (a `between` zoomed on its nearer limit) named at the edge it lies beyond.
#[derive(Clone, Debug, PartialEq)]
pub struct Layout {
    /// Each limit in view: its x and its guard band (left, right), at least 3 px wide.
    pub limits: Vec<(f64, (f64, f64))>,
    /// The limits' labels, on the top row.
    pub limit_labels: Vec<Label>,
    /// The value's x and its ±U bar.
    pub value: (f64, (f64, f64)),
    /// The value's label, on the bottom row.
    pub value_label: Label,
    /// The legal side, shaded: from, to.
    pub legal: Option<(f64, f64)>,
    /// `legal →` beside a limit, on its legal side.
    pub legal_labels: Vec<Label>,
}

/// The fewest pixels a guard band, and the gap between a value and its nearer limit, may take
/// on a `between` scale before it is zoomed on that limit.
const READABLE: f64 = 6.0;
const READABLE_GAP: f64 = 24.0;

/// Lays out the scale of a numeric limit.
pub fn layout(n: &NumberView) -> Layout {
    let u = n.expanded_uncertainty;
    let side = legal_side(n);
    let all: Vec<(f64, String)> = match (n.range, &n.shown.range) {
        (Some([low, high]), Some([low_shown, high_shown])) => {
            vec![(low, low_shown.clone()), (high, high_shown.clone())]
        }
        _ => vec![(n.limit, n.shown.limit.clone())],
    };
    let (lo, hi) = window(&all, n.value, u);
    let px = (RIGHT - LEFT) / (hi - lo);
    let gap = (n.value - n.limit).abs() * px;
    let zoom = all.len() == 2 && (2.0 * u * px < READABLE || gap < READABLE_GAP);
    let shown: Vec<(f64, String)> = if zoom {
        vec![(n.limit, n.shown.limit.clone())]
    } else {
        all.clone()
    };
    let (lo, hi) = if zoom {
        let half = (3.0 * u)
            .max(2.0 * (n.value - n.limit).abs())
            .max(n.limit.abs() * 1e-6)
            .max(f64::MIN_POSITIVE);
        window(
            &[
                (n.limit - half, String::new()),
                (n.limit + half, String::new()),
            ],
            n.value,
            u,
        )
    } else {
        (lo, hi)
    };
    let x = |v: f64| LEFT + (v - lo) / (hi - lo) * (RIGHT - LEFT);
    let limits: Vec<(f64, (f64, f64))> = shown
        .iter()
        .map(|(l, _)| {
            let (a, b) = (x(l - u), x(l + u));
            let mid = (a + b) / 2.0;
            (x(*l), (a.min(mid - 1.5), b.max(mid + 1.5)))
        })
        .collect();
    let mut limit_labels: Vec<Label> = shown
        .iter()
        .map(|(l, text)| Label::at(x(*l), format!("limit {text}")))
        .collect();
    let (low_x, high_x) = (LEFT, RIGHT);
    let (legal, legal_labels) = match side {
        LegalSide::Below => (
            Some((low_x, x(n.limit))),
            vec![legal_label(x(n.limit), false)],
        ),
        LegalSide::Above => (
            Some((x(n.limit), high_x)),
            vec![legal_label(x(n.limit), true)],
        ),
        LegalSide::Between if zoom => {
            let other_above = all.iter().any(|(l, _)| *l > n.limit);
            let edge = if other_above { high_x } else { low_x };
            (
                Some((x(n.limit).min(edge), x(n.limit).max(edge))),
                vec![legal_label(x(n.limit), other_above)],
            )
        }
        LegalSide::Between => {
            let (a, b) = (x(all[0].0), x(all[1].0));
            (
                Some((a, b)),
                vec![legal_label(a, true), legal_label(b, false)],
            )
        }
        LegalSide::Unknown => (None, Vec::new()),
    };
    if zoom && let Some((other, text)) = all.iter().find(|(l, _)| *l != n.limit) {
        let label = if *other > n.limit {
            Label {
                x: WIDTH - 1.0,
                anchor: "end",
                text: format!("other limit {text} →"),
            }
        } else {
            Label {
                x: 1.0,
                anchor: "start",
                text: format!("← other limit {text}"),
            }
        };
        limit_labels.push(label);
    }
    let value_label = Label::at(x(n.value), format!("value {}", n.shown.value));
    Layout {
        limits,
        limit_labels,
        value: (x(n.value), (x(n.value - u), x(n.value + u))),
        value_label,
        legal,
        legal_labels,
    }
}

/// `legal →` just right of a limit (or `← legal` just left of it).
fn legal_label(x: f64, above: bool) -> Label {
    if above {
        Label {
            x: x + 3.0,
            anchor: "start",
            text: "legal →".to_string(),
        }
    } else {
        Label {
            x: x - 3.0,
            anchor: "end",
            text: "← legal".to_string(),
        }
    }
}

/// The window of values a scale shows: every limit ± U and the value ± U, padded 15 %.
fn window(limits: &[(f64, String)], value: f64, u: f64) -> (f64, f64) {
    let points: Vec<f64> = limits
        .iter()
        .flat_map(|(l, _)| [l - u, l + u])
        .chain([value - u, value + u, value])
        .collect();
    let lo = points.iter().copied().fold(f64::INFINITY, f64::min);
    let hi = points.iter().copied().fold(f64::NEG_INFINITY, f64::max);
    let pad = ((hi - lo) * 0.15)
        .max(value.abs() * 1e-6)
        .max(f64::MIN_POSITIVE);
    (lo - pad, hi + pad)
}

/// The SVG scale: an axis with the legal side shaded grey and named (`legal →`), each limit
/// as a tall tick with its guard band of ±U (hatched, so it reads in grey print), and the
/// value as a dot with its ±U bar; limit labels on the top row, the value's on the bottom, so
/// they never print over each other. A `between` whose guard band or value would crowd its
/// nearer limit is zoomed on that limit, the other named at the edge it lies beyond.
pub fn scale(n: &NumberView) -> String {
    let l = layout(n);
    let mut svg = format!(
        "<svg class=\"scale\" width=\"{WIDTH}\" height=\"50\" viewBox=\"0 0 {WIDTH} 50\" role=\"img\" aria-label=\"value against limit, legal side shaded\">"
    );
    if let Some((a, b)) = l.legal {
        let _ = write!(
            svg,
            "<rect x=\"{a:.1}\" y=\"22\" width=\"{:.1}\" height=\"10\" fill=\"#d4d4d4\"/>",
            (b - a).max(0.0)
        );
    }
    let _ = write!(
        svg,
        "<line x1=\"{LEFT}\" y1=\"27\" x2=\"{RIGHT}\" y2=\"27\" stroke=\"#555\" stroke-width=\"1\"/>"
    );
    for (x, (a, b)) in &l.limits {
        let _ = write!(
            svg,
            "<rect x=\"{a:.1}\" y=\"19\" width=\"{:.1}\" height=\"16\" fill=\"#e8c96a\" fill-opacity=\"0.6\" stroke=\"#6b5a1e\" stroke-width=\"0.6\" stroke-dasharray=\"2 1\"/>",
            b - a
        );
        let _ = write!(
            svg,
            "<line x1=\"{x:.1}\" y1=\"11\" x2=\"{x:.1}\" y2=\"39\" stroke=\"#111\" stroke-width=\"2.5\"/>"
        );
    }
    for label in l.limit_labels.iter() {
        text(&mut svg, label, 9.0);
    }
    for label in &l.legal_labels {
        text(&mut svg, label, 19.0);
    }
    let (v, (a, b)) = l.value;
    let _ = write!(
        svg,
        "<line x1=\"{a:.1}\" y1=\"27\" x2=\"{b:.1}\" y2=\"27\" stroke=\"#1f4e9c\" stroke-width=\"3\"/><line x1=\"{a:.1}\" y1=\"22\" x2=\"{a:.1}\" y2=\"32\" stroke=\"#1f4e9c\" stroke-width=\"2\"/><line x1=\"{b:.1}\" y1=\"22\" x2=\"{b:.1}\" y2=\"32\" stroke=\"#1f4e9c\" stroke-width=\"2\"/><circle cx=\"{v:.1}\" cy=\"27\" r=\"4\" fill=\"#1f4e9c\" stroke=\"#fff\" stroke-width=\"1\"/>"
    );
    text(&mut svg, &l.value_label, 48.0);
    svg.push_str("</svg>\n");
    svg
}

fn text(svg: &mut String, label: &Label, y: f64) {
    let _ = write!(
        svg,
        "<text x=\"{:.1}\" y=\"{y}\" font-size=\"{FONT}\" text-anchor=\"{}\">{}</text>",
        label.x,
        label.anchor,
        escape(&label.text)
    );
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::report::view::NumberShown;

    /// A numeric limit as the view gives it; `range` for a `between`.
    fn number(value: f64, limit: f64, margin: f64, u: f64, range: Option<[f64; 2]>) -> NumberView {
        NumberView {
            unit: Some("in"),
            value,
            limit,
            range,
            margin,
            expanded_uncertainty: u,
            coverage_factor: 2.0,
            effective_degrees_of_freedom: None,
            probability_of_conformance: 0.9,
            cylinder: None,
            all_cylinders: None,
            monte_carlo: None,
            shown: NumberShown {
                value: format!("{value:.4} in"),
                limit: format!("{limit:.4} in"),
                range: range.map(|[a, b]| [format!("{a:.4} in"), format!("{b:.4} in")]),
                margin: String::new(),
                expanded_uncertainty: format!("{u} in"),
                coverage: "k = 2".to_string(),
                probability_of_conformance: "90 %".to_string(),
            },
        }
    }

    fn apart(a: &Label, b: &Label) -> bool {
        let ((a0, a1), (b0, b1)) = (a.extent(), b.extent());
        a1 <= b0 || b1 <= a0
    }

    fn on_scale(l: &Label) -> bool {
        let (a, b) = l.extent();
        a >= 0.0 && b <= WIDTH
    }

    #[test]
    fn the_legal_side_follows_from_the_margin_and_the_value() {
        // `bore <= 4.035 in`: 4.0346 is inside, below the limit
        assert_eq!(
            legal_side(&number(4.0346, 4.035, 0.0004, 0.0006, None)),
            LegalSide::Below
        );
        // `scale_weight >= 3000 lb`, written here in the same shape: above
        assert_eq!(
            legal_side(&number(3080.0, 3000.0, 80.0, 4.0, None)),
            LegalSide::Above
        );
        // a value outside a `<=` limit: the legal side is the other one
        assert_eq!(
            legal_side(&number(4.036, 4.035, -0.001, 0.0006, None)),
            LegalSide::Below
        );
        let shaded = layout(&number(4.0346, 4.035, 0.0004, 0.0006, None));
        let (from, to) = shaded.legal.unwrap_or_default();
        assert!(
            from <= LEFT && to >= shaded.limits[0].0 - 0.01,
            "{shaded:?}"
        );
        assert_eq!(shaded.legal_labels[0].text, "← legal");
    }

    #[test]
    fn a_narrow_between_is_zoomed_on_its_nearer_limit_and_stays_readable() {
        // the shape of demo rule 4.8: between 1-1/2 in and 1-11/16 in allowing 0.001 in, a
        // caliper reading at the low end (U 0.00058 in)
        let n = number(1.500, 1.499, 0.001, 0.00058, Some([1.499, 1.688_5]));
        let l = layout(&n);
        assert_eq!(l.limits.len(), 1, "zoomed on the nearer limit: {l:?}");
        let (limit_x, (band_a, band_b)) = l.limits[0];
        assert!(band_b - band_a >= READABLE, "guard band {band_a}..{band_b}");
        assert!(
            (l.value.0 - limit_x).abs() >= READABLE_GAP,
            "value at {} and limit at {limit_x} crowd each other",
            l.value.0
        );
        assert!(
            l.limit_labels
                .iter()
                .any(|t| t.text == "other limit 1.6885 in →"),
            "{:?}",
            l.limit_labels
        );
        for (i, a) in l.limit_labels.iter().enumerate() {
            assert!(on_scale(a), "{a:?} runs off the scale");
            for b in &l.limit_labels[i + 1..] {
                assert!(apart(a, b), "{a:?} prints over {b:?}");
            }
        }
        assert!(on_scale(&l.value_label));
        // the legal side runs from the low limit toward the high one
        let (from, to) = l.legal.unwrap_or_default();
        assert!((from - limit_x).abs() < 0.01 && to >= RIGHT, "{l:?}");
    }

    #[test]
    fn a_wide_between_shows_both_limits_with_their_labels_apart() {
        // `stroke between 3.470 in and 3.490 in`, the close-bore engine's 3.480 in
        let l = layout(&number(3.480, 3.470, 0.010, 0.00058, Some([3.470, 3.490])));
        assert_eq!(l.limits.len(), 2);
        assert!(apart(&l.limit_labels[0], &l.limit_labels[1]));
        assert!(l.limit_labels.iter().all(on_scale));
        let (from, to) = l.legal.unwrap_or_default();
        assert!((from - l.limits[0].0).abs() < 0.01 && (to - l.limits[1].0).abs() < 0.01);
    }
}

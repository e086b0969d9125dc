//! The printable tech sheet of `check --format html`: one self-contained page per run (no
//! external file, no network), with a print stylesheet that fits A4 and US Letter. Each rule
//! shows its verdict as a symbol and a word (never colour alone), its finding and numbers, an
//! inline SVG scale with the limit, the guard band of ±U around it and the measured value with
//! its uncertainty bar, and its trace; the sheet ends with signature lines.

use std::fmt::Write;

use super::format::{probability, quantity, uncertainty_in};
use crate::evaluate::finding::Verdict;
use crate::evaluate::outcome::{EngineReport, Numeric, Outcome, Trace};

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
h1 { font-size: 15pt; margin: 0 0 .3em; }
table.identity td { padding: .1em 1em .1em 0; }
.summary { font-size: 12pt; font-weight: bold; padding: .4em .6em; border: 2px solid #333; margin: .8em 0; }
section.rule { border-top: 1px solid #999; padding: .5em 0; break-inside: avoid; page-break-inside: avoid; }
section.rule h2 { font-size: 11pt; margin: 0 0 .3em; }
.mark { display: inline-block; width: 1.4em; text-align: center; font-weight: bold; }
.legal .mark { color: #14632f; } .illegal .mark { color: #a11616; } .uncertain .mark { color: #8a5a00; }
.verdict { float: right; font-weight: bold; }
code { font-size: 9.5pt; }
table.numbers td { padding: 0 1.2em 0 0; }
svg.scale { display: block; margin: .3em 0; }
ul.trace { margin: .2em 0 .2em 1.2em; padding: 0; font-size: 9pt; }
.signatures { margin-top: 2.5em; display: flex; gap: 3em; }
.signatures div { flex: 1; border-top: 1px solid #111; padding-top: .3em; }
@page { margin: 12mm; }
@media print { body { margin: 0; font-size: 9.5pt; } .summary { border-width: 1px; } }
";

/// The whole page for one or more engines.
pub fn page(reports: &[EngineReport]) -> String {
    let mut out =
        String::from("<!doctype html>\n<html lang=\"en\">\n<head>\n<meta charset=\"utf-8\">\n");
    let title = reports
        .first()
        .map(|r| format!("Tech sheet — {} — {}", r.rulebook.series, r.class.name))
        .unwrap_or_default();
    let _ = writeln!(
        out,
        "<title>{}</title>\n<style>{STYLE}</style>\n</head>\n<body>",
        escape(&title)
    );
    for (i, r) in reports.iter().enumerate() {
        if i > 0 {
            out.push_str("<div style=\"break-before: page; page-break-before: always\"></div>\n");
        }
        engine(&mut out, r);
    }
    out.push_str("</body>\n</html>\n");
    out
}

fn engine(out: &mut String, r: &EngineReport) {
    let id = &r.declaration.identity;
    let _ = writeln!(out, "<h1>{}</h1>", escape(&r.heading()));
    out.push_str("<table class=\"identity\">\n");
    let rows = [
        ("Engine", id.engine.clone()),
        ("Car", id.car.clone()),
        ("Event", id.event.clone()),
        ("Date", id.date.map(|d| d.to_string())),
        ("Measured by", id.measured_by.clone()),
        ("Decision rule", Some(r.decision.words().to_string())),
        (
            "Bulletins applied",
            Some(if r.bulletins.is_empty() {
                "none".to_string()
            } else {
                r.bulletins.join(", ")
            }),
        ),
        (
            "Declaration",
            Some(r.declaration.path.display().to_string()),
        ),
    ];
    for (label, value) in rows {
        let _ = writeln!(
            out,
            "<tr><td>{label}</td><td>{}</td></tr>",
            escape(value.as_deref().unwrap_or("—"))
        );
    }
    out.push_str("</table>\n");
    let [legal, illegal, unchecked, not_applicable] = r.counts();
    let (mark, result) = r.result();
    let _ = writeln!(
        out,
        "<p class=\"summary\">{mark} {result} — {legal} legal, {illegal} illegal, {unchecked} not checked, {not_applicable} not applicable; {} conditional</p>",
        r.conditional_count()
    );
    for o in &r.outcomes {
        rule(out, o, r);
    }
    out.push_str("<div class=\"signatures\"><div>Inspector — name, signature, time</div><div>Competitor — name, signature, time</div></div>\n");
}

fn rule(out: &mut String, o: &Outcome, r: &EngineReport) {
    let class = match o.verdict {
        Verdict::Legal if o.is_uncertain() => "uncertain",
        Verdict::Legal => "legal",
        Verdict::Illegal => "illegal",
        Verdict::NotChecked => "uncertain",
        Verdict::NotApplicable => "na",
    };
    let mark = o.mark();
    let finding = o
        .checked
        .as_ref()
        .map(|c| format!(" · {}", c.finding.words()))
        .unwrap_or_default();
    let _ = writeln!(out, "<section class=\"rule {class}\">");
    let _ = writeln!(
        out,
        "<h2><span class=\"mark\">{mark}</span>{} {} <span class=\"verdict\">{}{}</span></h2>",
        escape(o.section()),
        escape(o.title()),
        o.verdict.words(),
        escape(&finding)
    );
    let _ = writeln!(
        out,
        "<p>requires <code>{}</code></p>",
        escape(&o.rule.requirement)
    );
    for c in &o.rule.condition_texts {
        let _ = writeln!(
            out,
            "<p>when <code>{}</code> ({})</p>",
            escape(c),
            applies_words(o)
        );
    }
    if !o.missing.is_empty() {
        let _ = writeln!(out, "<p>missing: {}</p>", escape(&o.missing.join(", ")));
    }
    if let Some(c) = o.checked.as_ref().filter(|c| c.is_finite()) {
        if let Some(observed) = &c.observed {
            let _ = writeln!(out, "<p>found <code>{}</code></p>", escape(observed));
        }
        if let Some(n) = &c.numeric {
            numbers(out, n);
        }
    }
    trace(out, o, r);
    if let Some(p) = o.penalty() {
        let _ = writeln!(out, "<p>penalty: {}</p>", escape(p));
    }
    out.push_str("</section>\n");
}

fn applies_words(o: &Outcome) -> &'static str {
    match o.applies {
        crate::evaluate::outcome::Applies::DoesNotHold => "does not hold",
        crate::evaluate::outcome::Applies::Uncertain => "uncertain: inside the uncertainty band",
        _ => "holds",
    }
}

fn numbers(out: &mut String, n: &Numeric) {
    let at = n
        .cylinder
        .map(|c| format!(" (cylinder {c})"))
        .unwrap_or_default();
    let side = if n.margin >= 0.0 { "inside" } else { "outside" };
    let _ = writeln!(
        out,
        "<table class=\"numbers\"><tr><td>value {}{at}</td><td>limit {}</td><td>margin {} {side}</td><td>U = {} (k = {})</td><td>conformance probability {}</td></tr></table>",
        escape(&quantity(n.value, n.unit)),
        escape(&quantity(n.limit, n.unit)),
        escape(&quantity(n.margin.abs(), n.unit)),
        escape(&uncertainty_in(n.expanded, n.unit)),
        n.k,
        escape(&probability(n.probability, n.expanded > 0.0))
    );
    out.push_str(&scale(n));
}

/// The SVG scale: an axis around the limit(s) and the value, the guard band of ±U around each
/// limit, each limit as a tall tick, and the value as a dot with its ±U bar, all labelled.
pub fn scale(n: &Numeric) -> String {
    let limits: Vec<f64> = match n.range {
        Some((low, high)) => vec![low, high],
        None => vec![n.limit],
    };
    let u = n.expanded;
    let points: Vec<f64> = limits
        .iter()
        .flat_map(|l| [l - u, l + u])
        .chain([n.value - u, n.value + u, n.value])
        .collect();
    let (mut lo, mut hi) = (
        points.iter().copied().fold(f64::INFINITY, f64::min),
        points.iter().copied().fold(f64::NEG_INFINITY, f64::max),
    );
    let pad = ((hi - lo) * 0.15)
        .max(n.limit.abs() * 1e-6)
        .max(f64::MIN_POSITIVE);
    lo -= pad;
    hi += pad;
    let (width, left, right) = (520.0, 20.0, 500.0);
    let x = |v: f64| left + (v - lo) / (hi - lo) * (right - left);
    let mut svg = format!(
        "<svg class=\"scale\" width=\"{width}\" height=\"56\" viewBox=\"0 0 {width} 56\" role=\"img\" aria-label=\"value against limit\">"
    );
    let _ = write!(
        svg,
        "<line x1=\"{left}\" y1=\"30\" x2=\"{right}\" y2=\"30\" stroke=\"#555\" stroke-width=\"1\"/>"
    );
    for l in &limits {
        let (a, b) = (x(l - u), x(l + u));
        let _ = write!(
            svg,
            "<rect x=\"{a:.1}\" y=\"22\" width=\"{:.1}\" height=\"16\" fill=\"#e8c96a\" fill-opacity=\"0.55\"/>",
            (b - a).max(0.5)
        );
        let _ = write!(
            svg,
            "<line x1=\"{0:.1}\" y1=\"14\" x2=\"{0:.1}\" y2=\"46\" stroke=\"#111\" stroke-width=\"2.5\"/>",
            x(*l)
        );
        let _ = write!(
            svg,
            "<text x=\"{:.1}\" y=\"11\" font-size=\"10\" text-anchor=\"middle\">limit {}</text>",
            x(*l),
            escape(&quantity(*l, n.unit))
        );
    }
    let (a, b, v) = (x(n.value - u), x(n.value + u), x(n.value));
    let _ = write!(
        svg,
        "<line x1=\"{a:.1}\" y1=\"30\" x2=\"{b:.1}\" y2=\"30\" stroke=\"#1f4e9c\" stroke-width=\"3\"/>"
    );
    let _ = write!(
        svg,
        "<line x1=\"{a:.1}\" y1=\"25\" x2=\"{a:.1}\" y2=\"35\" stroke=\"#1f4e9c\" stroke-width=\"2\"/><line x1=\"{b:.1}\" y1=\"25\" x2=\"{b:.1}\" y2=\"35\" stroke=\"#1f4e9c\" stroke-width=\"2\"/>"
    );
    let _ = write!(
        svg,
        "<circle cx=\"{v:.1}\" cy=\"30\" r=\"4.5\" fill=\"#1f4e9c\"/>"
    );
    let _ = write!(
        svg,
        "<text x=\"{v:.1}\" y=\"53\" font-size=\"10\" text-anchor=\"middle\">value {}</text>",
        escape(&quantity(n.value, n.unit))
    );
    svg.push_str("</svg>\n");
    svg
}

fn trace(out: &mut String, o: &Outcome, r: &EngineReport) {
    if o.trace.is_empty() {
        return;
    }
    out.push_str("<ul class=\"trace\">\n");
    for t in &o.trace {
        let _ = writeln!(out, "<li>{}</li>", escape(&trace_line(t, r)));
    }
    out.push_str("</ul>\n");
}

/// One line of a trace in words: an input with its uncertainty and origin, a text value, a
/// derived value with its formula and result, or a missing measurement.
pub fn trace_line(t: &Trace, r: &EngineReport) -> String {
    match t {
        Trace::Input(id) => {
            let i = r.input(*id);
            let unit = i.unit.and_then(crate::units::lookup);
            format!(
                "{} = {} (u {}) — {}",
                i.label(r.rulebook),
                quantity(i.value, unit),
                uncertainty_in(i.standard_uncertainty, unit),
                i.origin(r.rulebook)
            )
        }
        Trace::Text { name, value, place } => {
            format!("{name} = “{value}” — {}.{name}", place.key())
        }
        Trace::Derived {
            derived, values, ..
        } => {
            let unit = super::json::derived_unit(derived);
            let shown: Vec<String> = values.iter().map(|v| quantity(*v, unit)).collect();
            format!(
                "{} = {} = {}",
                derived.name,
                derived.formula,
                shown.join(", ")
            )
        }
        Trace::Missing { name } => format!("{name}: missing"),
    }
}

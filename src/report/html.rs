//! The printable tech sheet of `check --format html`: one self-contained page per run (no
//! external file, no network), with a print stylesheet that fits A4 and US Letter. Each rule
//! shows its verdict as a symbol and a word (never colour alone), its finding and numbers, an
//! inline SVG scale with the limit, the guard band of ±U around it and the measured value with
//! its uncertainty bar, and its trace; the sheet ends with signature lines. A layout of the
//! [`EngineView`]; the words are the view's.

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
h1 { font-size: 15pt; margin: 0 0 .3em; }
table.identity td { padding: .1em 1em .1em 0; }
.summary { font-size: 12pt; font-weight: bold; padding: .4em .6em; border: 2px solid #333; margin: .8em 0; }
section.rule { border-top: 1px solid #999; padding: .5em 0; break-inside: avoid; page-break-inside: avoid; }
section.rule h2 { font-size: 11pt; margin: 0 0 .3em; }
.mark { display: inline-block; width: 1.4em; text-align: center; font-weight: bold; }
.legal .mark { color: #14632f; } .illegal .mark { color: #a11616; } .uncertain .mark { color: #8a5a00; }
.verdict { float: right; font-weight: bold; }
code { font-size: 9.5pt; }
section.rule p { margin: .1em 0; }
.label { color: #444; }
svg.scale { display: block; margin: .3em 0; }
ul.trace { margin: .2em 0 .2em 1.2em; padding: 0; font-size: 9pt; }
.signatures { margin-top: 2.5em; display: flex; gap: 3em; }
.signatures div { flex: 1; border-top: 1px solid #111; padding-top: .3em; }
.provenance { margin-top: 1.5em; font-size: 7.5pt; color: #333; overflow-wrap: anywhere; }
@page { margin: 12mm; }
@media print { body { margin: 0; font-size: 9.5pt; } .summary { border-width: 1px; } }
";

/// The whole page for one or more engines.
pub fn page(reports: &[EngineReport]) -> String {
    let views: Vec<EngineView> = reports.iter().map(EngineView::new).collect();
    page_of(&views)
}

/// The whole page for one or more engines' views.
pub fn page_of(views: &[EngineView]) -> String {
    let mut out =
        String::from("<!doctype html>\n<html lang=\"en\">\n<head>\n<meta charset=\"utf-8\">\n");
    let title = views
        .first()
        .map(|v| format!("Tech sheet — {} — {}", v.series, v.class))
        .unwrap_or_default();
    let _ = writeln!(
        out,
        "<title>{}</title>\n<style>{STYLE}</style>\n</head>\n<body>",
        escape(&title)
    );
    for (i, v) in views.iter().enumerate() {
        if i > 0 {
            out.push_str("<div style=\"break-before: page; page-break-before: always\"></div>\n");
        }
        engine(&mut out, v);
    }
    out.push_str("</body>\n</html>\n");
    out
}

fn engine(out: &mut String, v: &EngineView) {
    let _ = writeln!(out, "<h1>{}</h1>", escape(&v.heading));
    out.push_str("<table class=\"identity\">\n");
    let rows = [
        ("Engine", v.engine.clone()),
        ("Car", v.car.clone()),
        ("Event", v.event.clone()),
        ("Date", v.date.clone()),
        ("Measured by", v.measured_by.clone()),
        ("Decision rule", Some(v.decision_words())),
        ("Rules in force", Some(v.rules_in_force())),
        ("Declaration", Some(v.file.clone())),
    ];
    for (label, value) in rows {
        let _ = writeln!(
            out,
            "<tr><td>{label}</td><td>{}</td></tr>",
            escape(value.as_deref().unwrap_or("—"))
        );
    }
    out.push_str("</table>\n");
    let _ = writeln!(
        out,
        "<p class=\"summary\">{} {}</p>",
        v.result.mark(),
        escape(&v.result_words())
    );
    for rule in &v.rules {
        rule_section(out, rule, v);
    }
    out.push_str("<div class=\"signatures\"><div>Inspector — name, signature, time</div><div>Competitor — name, signature, time</div></div>\n");
    provenance(out, v);
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

fn rule_section(out: &mut String, rule: &RuleView, v: &EngineView) {
    let class = match rule.verdict {
        Verdict::Legal if rule.uncertain => "uncertain",
        Verdict::Legal => "legal",
        Verdict::Illegal => "illegal",
        Verdict::NotChecked => "uncertain",
        Verdict::NotApplicable => "na",
    };
    let _ = writeln!(out, "<section class=\"rule {class}\">");
    let _ = writeln!(
        out,
        "<h2><span class=\"mark\">{}</span>{} {} <span class=\"verdict\">{}</span></h2>",
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

/// The SVG scale: an axis around the limit(s) and the value, the guard band of ±U around each
/// limit, each limit as a tall tick, and the value as a dot with its ±U bar, all labelled.
pub fn scale(n: &NumberView) -> String {
    let limits: Vec<(f64, &str)> = match (n.range, &n.shown.range) {
        (Some([low, high]), Some([low_shown, high_shown])) => {
            vec![(low, low_shown.as_str()), (high, high_shown.as_str())]
        }
        _ => vec![(n.limit, n.shown.limit.as_str())],
    };
    let u = n.expanded_uncertainty;
    let points: Vec<f64> = limits
        .iter()
        .flat_map(|(l, _)| [l - u, l + u])
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
    for (l, shown) in &limits {
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
            escape(shown)
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
        escape(&n.shown.value)
    );
    svg.push_str("</svg>\n");
    svg
}

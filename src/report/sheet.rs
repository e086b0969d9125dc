//! Measurement sheets for a class: what to measure before the engine is opened, with the unit,
//! the procedure, a box per cylinder where measured per cylinder (each cylinder's number and
//! its box one unbreakable piece in HTML, so no width puts a number beside the wrong box), the instrument used, and the
//! rules each measurement feeds. As Markdown to print, or as a declaration template in YAML
//! with every key present and every value left empty.

use std::fmt::Write;

use crate::check::model::{CheckedRulebook, Class, Measurement, ValueKind};
use crate::units;

/// One measurement of the sheet and the sections of the rules it feeds.
struct Line<'a> {
    measurement: &'a Measurement,
    feeds: Vec<&'a str>,
}

/// The measurements a class reads (directly or through derived values), in schema order.
fn lines<'a>(rulebook: &'a CheckedRulebook, class: &'a Class) -> Vec<Line<'a>> {
    rulebook
        .measurements
        .iter()
        .map(|m| Line {
            measurement: m,
            feeds: class
                .rules
                .iter()
                .chain(class.amended.iter().flat_map(|a| a.rules.iter()))
                .filter(|r| r.reads.iter().any(|n| reads(rulebook, n, &m.name, 0)))
                .map(|r| r.rule.section.text.as_str())
                .fold(Vec::new(), |mut acc, s| {
                    if !acc.contains(&s) {
                        acc.push(s);
                    }
                    acc
                }),
        })
        .filter(|l| !l.feeds.is_empty())
        .collect()
}

/// Whether `name` is the measurement or a derived value that reads it.
fn reads(rulebook: &CheckedRulebook, name: &str, measurement: &str, depth: usize) -> bool {
    name == measurement
        || (depth < 32
            && rulebook.derived_value(name).is_some_and(|d| {
                d.reads
                    .iter()
                    .any(|n| reads(rulebook, n, measurement, depth + 1))
            }))
}

/// The unit to write a measurement in: the rulebook's own (from its `range`), else the unit
/// of that dimension in the family of the units the rulebook's ranges are written in (a
/// metric rulebook asks for metric readings), else the one gonogo shows that dimension in.
fn unit_of(rulebook: &CheckedRulebook, m: &Measurement) -> &'static str {
    if let Some(u) = m.unit {
        return u;
    }
    match m.kind {
        ValueKind::Number(d) => {
            let written = rulebook.measurements.iter().filter_map(|m| m.unit);
            units::shown_unit(d, written, None).map_or("", |u| u.symbol)
        }
        ValueKind::Text => "text",
    }
}

/// Cylinders to draw boxes for: the top of the `cylinders` measurement's range, else 8.
fn cylinder_boxes(rulebook: &CheckedRulebook) -> usize {
    rulebook
        .measurement("cylinders")
        .and_then(|m| m.range)
        .map_or(8, |(_, high)| high.round().clamp(1.0, 16.0) as usize)
}

fn title(rulebook: &CheckedRulebook, class: &Class) -> String {
    let name = class
        .title
        .as_ref()
        .map(|t| format!(" \"{t}\""))
        .unwrap_or_default();
    format!(
        "{} — edition {} — class {}{name}",
        rulebook.series, rulebook.edition, class.name
    )
}

/// The printable sheet in Markdown.
pub fn markdown(rulebook: &CheckedRulebook, class: &Class) -> String {
    let mut out = String::new();
    let _ = writeln!(out, "# Measurement sheet: {}\n", title(rulebook, class));
    let _ = writeln!(
        out,
        "Engine ________  Car ________  Event ____________________  Date ____________\n"
    );
    let _ = writeln!(
        out,
        "| measurement | unit | procedure | value | instrument | feeds rules |"
    );
    let _ = writeln!(out, "|---|---|---|---|---|---|");
    let boxes = cylinder_boxes(rulebook);
    for line in lines(rulebook, class) {
        let m = line.measurement;
        let value = if m.per_cylinder {
            (1..=boxes)
                .map(|c| format!("{c}: ______"))
                .collect::<Vec<_>>()
                .join("<br>")
        } else {
            "______".to_string()
        };
        let required = if m.required { "" } else { " (optional)" };
        let _ = writeln!(
            out,
            "| `{}`{required} | {} | {} | {value} | ________ | {} |",
            m.name,
            unit_of(rulebook, m),
            m.procedure.as_deref().unwrap_or("").replace('|', "\\|"),
            line.feeds.join(", ")
        );
    }
    let _ = writeln!(out, "\nDecision rule: {}.\n", rulebook.decision.words());
    let _ = writeln!(
        out,
        "Seals found ____________ ____________  Seals applied ____________ ____________\n"
    );
    let _ = writeln!(
        out,
        "Inspector ______________________  signature ______________  time ______\n"
    );
    let _ = writeln!(
        out,
        "Competitor ______________________  signature ______________  time ______"
    );
    out
}

/// The printable sheet as a self-contained HTML page (no external file), for the browser's
/// print dialogue.
pub fn html(rulebook: &CheckedRulebook, class: &Class) -> String {
    use super::html::escape;
    let mut out =
        String::from("<!doctype html>\n<html lang=\"en\">\n<head>\n<meta charset=\"utf-8\">\n");
    let _ = writeln!(
        out,
        "<title>Measurement sheet — {}</title>",
        escape(&title(rulebook, class))
    );
    out.push_str("<style>body{font-family:system-ui,sans-serif;font-size:10pt;margin:1.5em}table{border-collapse:collapse;width:100%}td,th{border:1px solid #444;padding:.25em .4em;vertical-align:top;text-align:left}.box{display:inline-block;min-width:5em;border-bottom:1px solid #111;margin:0 .6em .2em 0}.sig{margin-top:2.5em;display:flex;gap:3em}.cyl{display:inline-block;white-space:nowrap}.sig div{flex:1;border-top:1px solid #111;padding-top:.3em}@page{margin:12mm}@media print{body{margin:0}}</style>\n</head>\n<body>\n");
    let _ = writeln!(
        out,
        "<h1>Measurement sheet: {}</h1>",
        escape(&title(rulebook, class))
    );
    out.push_str("<p>Engine <span class=\"box\"></span> Car <span class=\"box\"></span> Event <span class=\"box\"></span> Date <span class=\"box\"></span></p>\n");
    out.push_str("<table>\n<tr><th>measurement</th><th>unit</th><th>procedure</th><th>value</th><th>instrument</th><th>feeds rules</th></tr>\n");
    let boxes = cylinder_boxes(rulebook);
    for line in lines(rulebook, class) {
        let m = line.measurement;
        let value = if m.per_cylinder {
            (1..=boxes)
                .map(|c| format!("<span class=\"cyl\">{c} <span class=\"box\"></span></span>"))
                .collect::<Vec<_>>()
                .join(" ")
        } else {
            "<span class=\"box\"></span>".to_string()
        };
        let optional = if m.required { "" } else { " (optional)" };
        let _ = writeln!(
            out,
            "<tr><td><code>{}</code>{optional}</td><td>{}</td><td>{}</td><td>{value}</td><td></td><td>{}</td></tr>",
            escape(&m.name),
            escape(unit_of(rulebook, m)),
            escape(m.procedure.as_deref().unwrap_or("")),
            escape(&line.feeds.join(", "))
        );
    }
    out.push_str("</table>\n");
    let _ = writeln!(
        out,
        "<p>Decision rule: {}.</p>",
        escape(rulebook.decision.words())
    );
    out.push_str("<p>Seals found <span class=\"box\"></span> <span class=\"box\"></span> Seals applied <span class=\"box\"></span> <span class=\"box\"></span></p>\n");
    out.push_str("<div class=\"sig\"><div>Inspector — name, signature, time</div><div>Competitor — name, signature, time</div></div>\n</body>\n</html>\n");
    out
}

/// A declaration template: every key the class needs, every value empty. Checked as it is,
/// it gives "not checked" for every rule that needs a measurement.
pub fn yaml(rulebook: &CheckedRulebook, class: &Class) -> String {
    let mut out = String::new();
    let _ = writeln!(out, "# Declaration template: {}", title(rulebook, class));
    let _ = writeln!(
        out,
        "# Write each value as a quantity with its unit, like \"4.030 in\" or \"76.2 cc ± 0.2 cc\";"
    );
    let _ = writeln!(
        out,
        "# leave a value empty when it was not measured: its rules are then not checked.\n"
    );
    for key in ["engine", "car"] {
        let _ = writeln!(out, "{key}:");
    }
    let _ = writeln!(out, "class: {}", class.name);
    for key in ["event", "date", "measured_by"] {
        let _ = writeln!(out, "{key}:");
    }
    let _ = writeln!(
        out,
        "\n# name: {{resolution: \"0.0001 in\"}} or {{uncertainty: \"0.2 cc\", k: 2}}"
    );
    let _ = writeln!(out, "instruments: {{}}\n");
    let _ = writeln!(out, "measurements:");
    for line in lines(rulebook, class) {
        let m = line.measurement;
        let shape = if m.per_cylinder {
            ", per cylinder: a list, cylinder 1 first"
        } else {
            ""
        };
        let unit = match unit_of(rulebook, m) {
            "" => String::new(),
            u => format!(" in {u}"),
        };
        let procedure = m
            .procedure
            .as_deref()
            .map(|p| format!(" — {p}"))
            .unwrap_or_default();
        let _ = writeln!(
            out,
            "  # {}{unit}{shape}{procedure}; feeds {}",
            m.dimension_word,
            line.feeds.join(", ")
        );
        let _ = writeln!(out, "  {}:", m.name);
    }
    out
}

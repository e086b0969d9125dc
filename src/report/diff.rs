//! The report of `gonogo diff`: what changed between two editions, as text, Markdown or JSON
//! (schema `gonogo.diff/1`). Limits compared across units are shown in the old limit's unit.

use std::fmt::Write;

use serde::Serialize;

use super::format::quantity;
use crate::analyze::compare::{EditionDiff, Limits, RuleChange, RuleDiff};

/// Output formats of `diff`.
#[derive(Clone, Copy, Debug, PartialEq, Eq, clap::ValueEnum)]
pub enum DiffFormat {
    /// Plain text.
    Text,
    /// Markdown, for a bulletin or the officials' minutes.
    Markdown,
    /// One JSON document (schema `gonogo.diff/1`).
    Json,
}

/// Renders the comparison.
pub fn render(diff: &EditionDiff, format: DiffFormat) -> String {
    match format {
        DiffFormat::Json => json(diff),
        DiffFormat::Text => lines(diff, false),
        DiffFormat::Markdown => lines(diff, true),
    }
}

fn change_word(c: RuleChange) -> &'static str {
    match c {
        RuleChange::Added => "added",
        RuleChange::Dropped => "dropped",
        RuleChange::Tightened => "tightened",
        RuleChange::Loosened => "loosened",
        RuleChange::Changed => "changed",
    }
}

/// `365 ci → 362 ci`; a range as `3.47 in to 3.49 in → ...`.
fn limits_text(l: &Limits) -> String {
    let shown = |(a, b): (f64, Option<f64>)| match b {
        Some(b) => format!("{} to {}", quantity(a, l.unit), quantity(b, l.unit)),
        None => quantity(a, l.unit),
    };
    format!("{} → {}", shown(l.old), shown(l.new))
}

fn rule_line(r: &RuleDiff) -> String {
    let renumbered = r
        .renumbered_from
        .as_ref()
        .map(|f| format!(" (was {f})"))
        .unwrap_or_default();
    let mut text = format!(
        "{}{renumbered} {}: {}",
        r.section,
        r.title,
        change_word(r.change)
    );
    if let Some(l) = &r.limits {
        text.push_str(&format!(", limit {}", limits_text(l)));
    }
    if !r.notes.is_empty() {
        text.push_str(&format!(" ({} changed)", r.notes.join(", ")));
    }
    text
}

fn lines(d: &EditionDiff, markdown: bool) -> String {
    let mut out = String::new();
    let (h1, h2, item, sub) = if markdown {
        ("# ", "\n## ", "- ", "  - ")
    } else {
        ("", "\n", "  ", "      ")
    };
    let _ = writeln!(
        out,
        "{h1}{}: edition {} (from {}) → edition {} (from {})",
        d.series, d.old.0, d.old.1, d.new.0, d.new.1
    );
    if let Some((old, new)) = d.decision {
        let _ = writeln!(out, "{h2}decision rule: {old} → {new}");
    }
    if !d.measurements.is_empty() {
        let _ = writeln!(out, "{h2}measurements");
        for m in &d.measurements {
            let what = match (m.change, &m.old, &m.new) {
                ("added", _, Some(n)) => {
                    format!("added ({n}): inspectors must be ready to measure it")
                }
                ("dropped", Some(o), _) => format!("dropped (was {o})"),
                (_, Some(o), Some(n)) => format!("changed: {o} → {n}"),
                _ => m.change.to_string(),
            };
            let _ = writeln!(out, "{item}{}: {what}", code(&m.name, markdown));
        }
    }
    if !d.lists.is_empty() {
        let _ = writeln!(out, "{h2}parts lists");
        for l in &d.lists {
            let mut parts = Vec::new();
            if !l.added.is_empty() {
                parts.push(format!("added {}", l.added.join(", ")));
            }
            if !l.removed.is_empty() {
                parts.push(format!("removed {}", l.removed.join(", ")));
            }
            let _ = writeln!(
                out,
                "{item}{}: {}",
                code(&l.name, markdown),
                parts.join("; ")
            );
        }
    }
    let (old_b, new_b) = &d.bulletins;
    if !old_b.is_empty() || !new_b.is_empty() {
        let _ = writeln!(out, "{h2}bulletins");
        for b in old_b {
            let _ = writeln!(out, "{item}{b}: only in edition {}", d.old.0);
        }
        for b in new_b {
            let _ = writeln!(out, "{item}{b}: new in edition {}", d.new.0);
        }
    }
    let (gone, new) = &d.classes;
    for c in gone {
        let _ = writeln!(out, "{h2}class {}: dropped", code(c, markdown));
    }
    for c in new {
        let _ = writeln!(out, "{h2}class {}: added", code(c, markdown));
    }
    let mut class = "";
    for r in &d.rules {
        if r.class != class {
            class = &r.class;
            let _ = writeln!(out, "{h2}class {}", code(class, markdown));
        }
        let _ = writeln!(out, "{item}{}", rule_line(r));
        if let (Some(o), Some(n)) = (&r.old, &r.new)
            && r.change != RuleChange::Tightened
            && r.change != RuleChange::Loosened
        {
            let _ = writeln!(out, "{sub}was {}", code(o, markdown));
            let _ = writeln!(out, "{sub}now {}", code(n, markdown));
        } else if let Some(text) = r.new.as_ref().or(r.old.as_ref()) {
            let _ = writeln!(out, "{sub}{}", code(text, markdown));
        }
        if let Some((old, new)) = &r.decision {
            let _ = writeln!(out, "{sub}decided by {old} → {new}");
        }
    }
    if d.rules.is_empty() && d.measurements.is_empty() && d.lists.is_empty() && d.decision.is_none()
    {
        let _ = writeln!(out, "\nno change");
    }
    out
}

fn code(text: &str, markdown: bool) -> String {
    if markdown {
        format!("`{text}`")
    } else {
        text.to_string()
    }
}

#[derive(Serialize)]
struct Document<'a> {
    schema: &'static str,
    series: &'a str,
    old: Edition<'a>,
    new: Edition<'a>,
    decision: Option<[&'static str; 2]>,
    measurements: &'a [crate::analyze::compare::MeasurementDiff],
    lists: &'a [crate::analyze::compare::ListDiff],
    bulletins_dropped: &'a [String],
    bulletins_added: &'a [String],
    classes_dropped: &'a [String],
    classes_added: &'a [String],
    rules: Vec<Rule<'a>>,
}

#[derive(Serialize)]
struct Edition<'a> {
    edition: &'a str,
    effective: &'a str,
}

#[derive(Serialize)]
struct Rule<'a> {
    class: &'a str,
    section: &'a str,
    renumbered_from: Option<&'a str>,
    title: &'a str,
    change: RuleChange,
    old: Option<&'a str>,
    new: Option<&'a str>,
    unit: Option<&'static str>,
    old_limit: Option<[Option<f64>; 2]>,
    new_limit: Option<[Option<f64>; 2]>,
    also_changed: &'a [String],
    decision: Option<[&'a str; 2]>,
}

fn json(d: &EditionDiff) -> String {
    let scale = |l: &Limits, (a, b): (f64, Option<f64>)| {
        let s = l.unit.map_or(1.0, |u| u.to_si);
        [Some(a / s), b.map(|b| b / s)]
    };
    let doc = Document {
        schema: "gonogo.diff/1",
        series: &d.series,
        old: Edition {
            edition: &d.old.0,
            effective: &d.old.1,
        },
        new: Edition {
            edition: &d.new.0,
            effective: &d.new.1,
        },
        decision: d.decision.map(|(a, b)| [a, b]),
        measurements: &d.measurements,
        lists: &d.lists,
        bulletins_dropped: &d.bulletins.0,
        bulletins_added: &d.bulletins.1,
        classes_dropped: &d.classes.0,
        classes_added: &d.classes.1,
        rules: d
            .rules
            .iter()
            .map(|r| Rule {
                class: &r.class,
                section: &r.section,
                renumbered_from: r.renumbered_from.as_deref(),
                title: &r.title,
                change: r.change,
                old: r.old.as_deref(),
                new: r.new.as_deref(),
                unit: r.limits.as_ref().and_then(|l| l.unit.map(|u| u.symbol)),
                old_limit: r.limits.as_ref().map(|l| scale(l, l.old)),
                new_limit: r.limits.as_ref().map(|l| scale(l, l.new)),
                also_changed: &r.notes,
                decision: r.decision.as_ref().map(|(a, b)| [a.as_str(), b.as_str()]),
            })
            .collect(),
    };
    serde_json::to_string_pretty(&doc).unwrap_or_default() + "\n"
}

//! The report of `gonogo diff`: what changed between two editions, as text, Markdown or JSON
//! (schema `gonogo.diff/1`). Limits compared across units are shown in the old limit's unit.
//! A class whose bulletins changed it is set out step by step: each bulletin's changes under
//! its name and date, then the change of edition, with what lapses.

use std::fmt::Write;

use serde::Serialize;

use super::format::quantity;
use crate::analyze::compare::{BulletinStep, EditionDiff, Limits, RuleChange, RuleDiff, When};

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

/// Renders the comparison; `drafts` names the bulletins that are drafts, not yet issued.
pub fn render(diff: &EditionDiff, drafts: &[String], format: DiffFormat) -> String {
    match format {
        DiffFormat::Json => json(diff, drafts),
        DiffFormat::Text => lines(diff, drafts, false),
        DiffFormat::Markdown => lines(diff, drafts, true),
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

fn rule_line(r: &RuleDiff, new_edition: &str) -> String {
    if let (Some(b), RuleChange::Dropped) = (&r.lapses, r.change) {
        return format!(
            "{} {}: lapses (bulletin {b} brought it in; edition {new_edition} does not carry it forward)",
            r.section, r.title
        );
    }
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
    if let Some(b) = &r.lapses {
        text.push_str(&format!("; bulletin {b}'s version lapses"));
    }
    text
}

/// How a side's rules are taken, in brackets after its edition, when that is not as published.
fn side_words(when: When, has_steps: bool) -> String {
    match when {
        When::Published => String::new(),
        When::Latest if !has_steps => String::new(),
        When::Latest => ", with its bulletins".to_string(),
        When::On(d) => format!(", on {d}"),
    }
}

/// `bulletin TVB-27-04 of edition 2027, in force from 2027-06-14`.
fn step_heading(s: &BulletinStep, drafts: &[String]) -> String {
    let names: Vec<String> = s
        .bulletins
        .iter()
        .map(|b| {
            if drafts.contains(b) {
                format!("{b} (draft)")
            } else {
                b.clone()
            }
        })
        .collect();
    let word = if names.len() == 1 {
        "bulletin"
    } else {
        "bulletins"
    };
    format!(
        "{word} {} of edition {}, in force from {}",
        names.join(", "),
        s.edition,
        s.from
    )
}

/// The indents of one level of rule lines: the item and the line under it.
#[derive(Clone, Copy)]
struct Indent {
    item: &'static str,
    sub: &'static str,
}

fn rule_lines(out: &mut String, r: &RuleDiff, new_edition: &str, at: &Indent, markdown: bool) {
    let (item, sub) = (at.item, at.sub);
    let _ = writeln!(out, "{item}{}", rule_line(r, new_edition));
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

/// The classes named by a rule change or a bulletin step, each once, in order of appearance.
fn classes_in(d: &EditionDiff) -> Vec<&str> {
    let mut names: Vec<&str> = Vec::new();
    let all = d
        .old_steps
        .iter()
        .map(|s| s.class.as_str())
        .chain(d.rules.iter().map(|r| r.class.as_str()))
        .chain(d.new_steps.iter().map(|s| s.class.as_str()));
    for n in all {
        if !names.contains(&n) {
            names.push(n);
        }
    }
    names
}

/// One class: flat when no bulletin changed it, else step by step.
fn class_section(
    out: &mut String,
    d: &EditionDiff,
    class: &str,
    drafts: &[String],
    markdown: bool,
) {
    let (h2, h3) = if markdown {
        ("\n## ", "\n### ")
    } else {
        ("\n", "  ")
    };
    let _ = writeln!(out, "{h2}class {}", code(class, markdown));
    let of = |steps: &'_ [BulletinStep]| -> Vec<BulletinStep> {
        steps.iter().filter(|s| s.class == class).cloned().collect()
    };
    let (before, after) = (of(&d.old_steps), of(&d.new_steps));
    let rules: Vec<&RuleDiff> = d.rules.iter().filter(|r| r.class == class).collect();
    let flat = if markdown {
        Indent {
            item: "- ",
            sub: "  - ",
        }
    } else {
        Indent {
            item: "  ",
            sub: "      ",
        }
    };
    let nested = if markdown {
        flat
    } else {
        Indent {
            item: "    ",
            sub: "        ",
        }
    };
    let step = |out: &mut String, s: &BulletinStep| {
        let _ = writeln!(out, "{h3}{}", step_heading(s, drafts));
        if s.rules.is_empty() {
            let _ = writeln!(out, "{}no rule changes", nested.item);
        }
        for r in &s.rules {
            rule_lines(out, r, &d.new.0, &nested, markdown);
        }
    };
    if before.is_empty() && after.is_empty() {
        for r in rules {
            rule_lines(out, r, &d.new.0, &flat, markdown);
        }
        return;
    }
    before.iter().for_each(|s| step(out, s));
    if !rules.is_empty() {
        let bulletins: Vec<&str> = before
            .iter()
            .flat_map(|s| s.bulletins.iter().map(String::as_str))
            .collect();
        let with = if bulletins.is_empty() {
            String::new()
        } else {
            format!(" with {}", bulletins.join(", "))
        };
        let _ = writeln!(out, "{h3}edition {}{with} → edition {}", d.old.0, d.new.0);
        for r in rules {
            rule_lines(out, r, &d.new.0, &nested, markdown);
        }
    }
    after.iter().for_each(|s| step(out, s));
}

fn lines(d: &EditionDiff, drafts: &[String], markdown: bool) -> String {
    let mut out = String::new();
    let (h1, h2, item) = if markdown {
        ("# ", "\n## ", "- ")
    } else {
        ("", "\n", "  ")
    };
    let _ = writeln!(
        out,
        "{h1}{}: edition {} (from {}{}) → edition {} (from {}{})",
        d.series,
        d.old.0,
        d.old.1,
        side_words(d.sides.0, !d.old_steps.is_empty()),
        d.new.0,
        d.new.1,
        side_words(d.sides.1, !d.new_steps.is_empty())
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
            match l.ignoring_case {
                Some(c) if c.new => {
                    parts.push("now ignoring case: an entry in any case is on the list".to_string())
                }
                Some(_) => parts.push(
                    "no longer ignoring case: an entry must match the case written".to_string(),
                ),
                None => {}
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
    for class in classes_in(d) {
        class_section(&mut out, d, class, drafts, markdown);
    }
    if d.rules.is_empty()
        && d.old_steps.is_empty()
        && d.new_steps.is_empty()
        && d.measurements.is_empty()
        && d.lists.is_empty()
        && d.decision.is_none()
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
    old_side: String,
    new_side: String,
    bulletin_steps: Vec<Step<'a>>,
}

#[derive(Serialize)]
struct Step<'a> {
    class: &'a str,
    edition: &'a str,
    effective: &'a str,
    bulletins: &'a [String],
    draft: bool,
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
    lapses: Option<&'a str>,
}

fn scale(l: &Limits, (a, b): (f64, Option<f64>)) -> [Option<f64>; 2] {
    let s = l.unit.map_or(1.0, |u| u.to_si);
    [Some(a / s), b.map(|b| b / s)]
}

fn json_rule(r: &RuleDiff) -> Rule<'_> {
    Rule {
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
        lapses: r.lapses.as_deref(),
    }
}

fn side_name(w: When) -> String {
    match w {
        When::Published => "published".to_string(),
        When::Latest => "every bulletin".to_string(),
        When::On(d) => d.to_string(),
    }
}

fn json(d: &EditionDiff, drafts: &[String]) -> String {
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
        rules: d.rules.iter().map(json_rule).collect(),
        old_side: side_name(d.sides.0),
        new_side: side_name(d.sides.1),
        bulletin_steps: d
            .old_steps
            .iter()
            .chain(&d.new_steps)
            .map(|s| Step {
                class: &s.class,
                edition: &s.edition,
                effective: &s.from,
                bulletins: &s.bulletins,
                draft: s.bulletins.iter().any(|b| drafts.contains(b)),
                rules: s.rules.iter().map(json_rule).collect(),
            })
            .collect(),
    };
    serde_json::to_string_pretty(&doc).unwrap_or_default() + "\n"
}

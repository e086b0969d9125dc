//! The report of `gonogo impact`: the verdicts a change of edition changes, then counts per
//! rule and per class, the rules newly inside the uncertainty band, the engines whose overall
//! result changes, and the files that could not be compared. Text, Markdown or JSON
//! (schema `gonogo.impact/1`).

use std::collections::BTreeMap;
use std::fmt::Write;

use serde::Serialize;

use super::format::Digits;
use crate::analyze::impact::{Call, Changed, Impact};

/// Output formats of `impact`.
#[derive(Clone, Copy, Debug, PartialEq, Eq, clap::ValueEnum)]
pub enum ImpactFormat {
    /// Plain text.
    Text,
    /// Markdown tables.
    Markdown,
    /// One JSON document (schema `gonogo.impact/1`).
    Json,
}

/// What the report is about.
pub struct Heading<'a> {
    /// The series.
    pub series: &'a str,
    /// The old edition's name.
    pub old: &'a str,
    /// The new edition's name.
    pub new: &'a str,
    /// The decision rule applied.
    pub decision: &'static str,
}

/// Renders the impact; `unreadable` lists files that could not be compared, with why.
pub fn render(
    h: &Heading,
    impact: &Impact,
    unreadable: &[(String, String)],
    format: ImpactFormat,
) -> String {
    match format {
        ImpactFormat::Json => json(h, impact, unreadable),
        ImpactFormat::Text => text(h, impact, unreadable, false),
        ImpactFormat::Markdown => text(h, impact, unreadable, true),
    }
}

fn call_text(c: &Option<Call>) -> String {
    let Some(c) = c else {
        return "not in the edition".to_string();
    };
    let finding = c
        .finding
        .map(|f| format!(", {}", f.words()))
        .unwrap_or_default();
    let margin = c
        .margin
        .map(|(m, unit)| {
            let digits = Digits::supported_in(c.margin_uncertainty.unwrap_or(0.0), unit);
            format!(", margin {}", digits.quantity(m, unit))
        })
        .unwrap_or_default();
    format!("{}{finding}{margin}", c.verdict.words())
}

fn table(out: &mut String, header: &[&str], rows: &[Vec<String>], markdown: bool) {
    if markdown {
        let _ = writeln!(out, "| {} |", header.join(" | "));
        let _ = writeln!(out, "|{}|", vec!["---"; header.len()].join("|"));
        for r in rows {
            let _ = writeln!(out, "| {} |", r.join(" | "));
        }
        return;
    }
    let widths: Vec<usize> = (0..header.len())
        .map(|i| {
            rows.iter()
                .map(|r| r[i].chars().count())
                .chain([header[i].chars().count()])
                .max()
                .unwrap_or(0)
        })
        .collect();
    let line = |cells: Vec<&str>| {
        let padded: Vec<String> = cells
            .iter()
            .zip(&widths)
            .map(|(c, w)| format!("{c:<w$}"))
            .collect();
        format!("  {}", padded.join("  ").trim_end())
    };
    let _ = writeln!(out, "{}", line(header.to_vec()));
    for r in rows {
        let _ = writeln!(out, "{}", line(r.iter().map(String::as_str).collect()));
    }
}

fn rows_of(changes: &[Changed]) -> Vec<Vec<String>> {
    changes
        .iter()
        .map(|c| {
            vec![
                c.engine.clone(),
                c.class.clone(),
                format!("{} {}", c.section, c.title),
                call_text(&c.old),
                call_text(&c.new),
            ]
        })
        .collect()
}

fn text(h: &Heading, impact: &Impact, unreadable: &[(String, String)], markdown: bool) -> String {
    let mut out = String::new();
    let head = |title: &str| {
        if markdown {
            format!("\n## {title}\n")
        } else {
            format!("\n{title}")
        }
    };
    let top = if markdown { "# " } else { "" };
    let _ = writeln!(
        out,
        "{top}{}: edition {} → edition {}, on {} (each edition as published; decision rule {})",
        h.series,
        h.old,
        h.new,
        super::format::count(impact.engines, "engine", "engines"),
        h.decision
    );
    let old_label = format!("edition {}", h.old);
    let new_label = format!("edition {}", h.new);
    let _ = writeln!(out, "{}", head("verdicts that change"));
    if impact.changed.is_empty() {
        let _ = writeln!(out, "  none");
    } else {
        table(
            &mut out,
            &["engine", "class", "rule", &old_label, &new_label],
            &rows_of(&impact.changed),
            markdown,
        );
    }
    let mut by_rule: BTreeMap<(String, String), Vec<&str>> = BTreeMap::new();
    let mut by_class: BTreeMap<String, usize> = BTreeMap::new();
    for c in &impact.changed {
        by_rule
            .entry((c.class.clone(), format!("{} {}", c.section, c.title)))
            .or_default()
            .push(&c.engine);
        *by_class.entry(c.class.clone()).or_default() += 1;
    }
    if !by_rule.is_empty() {
        let _ = writeln!(out, "{}", head("by rule"));
        let rows: Vec<Vec<String>> = by_rule
            .iter()
            .map(|((class, rule), engines)| {
                vec![class.clone(), rule.clone(), engines.len().to_string()]
            })
            .collect();
        table(&mut out, &["class", "rule", "engines"], &rows, markdown);
        let _ = writeln!(out, "{}", head("by class"));
        let rows: Vec<Vec<String>> = by_class
            .iter()
            .map(|(class, n)| vec![class.clone(), n.to_string()])
            .collect();
        table(&mut out, &["class", "changed verdicts"], &rows, markdown);
    }
    if !impact.newly_uncertain.is_empty() {
        let _ = writeln!(out, "{}", head("newly inside the uncertainty band"));
        table(
            &mut out,
            &["engine", "class", "rule", &old_label, &new_label],
            &rows_of(&impact.newly_uncertain),
            markdown,
        );
    }
    if !impact.results.is_empty() {
        let _ = writeln!(out, "{}", head("engines whose result changes"));
        let rows: Vec<Vec<String>> = impact
            .results
            .iter()
            .map(|(e, c, a, b)| vec![e.clone(), c.clone(), a.to_string(), b.to_string()])
            .collect();
        table(
            &mut out,
            &["engine", "class", &old_label, &new_label],
            &rows,
            markdown,
        );
    }
    if !unreadable.is_empty() {
        let _ = writeln!(out, "{}", head("could not be compared"));
        for (file, why) in unreadable {
            let _ = writeln!(out, "  {file}: {why}");
        }
    }
    out
}

#[derive(Serialize)]
struct Document<'a> {
    schema: &'static str,
    series: &'a str,
    old_edition: &'a str,
    new_edition: &'a str,
    decision: &'static str,
    engines: usize,
    changed: Vec<Row<'a>>,
    newly_uncertain: Vec<Row<'a>>,
    results: Vec<[&'a str; 4]>,
    unreadable: Vec<[&'a str; 2]>,
}

#[derive(Serialize)]
struct Row<'a> {
    engine: &'a str,
    class: &'a str,
    section: &'a str,
    title: &'a str,
    old: Option<CallJson>,
    new: Option<CallJson>,
}

#[derive(Serialize)]
struct CallJson {
    verdict: crate::evaluate::finding::Verdict,
    finding: Option<crate::evaluate::finding::Finding>,
    margin: Option<f64>,
    unit: Option<&'static str>,
}

fn call_json(c: &Option<Call>) -> Option<CallJson> {
    c.as_ref().map(|c| CallJson {
        verdict: c.verdict,
        finding: c.finding,
        margin: c.margin.map(|(m, u)| m / u.map_or(1.0, |u| u.to_si)),
        unit: c.margin.and_then(|(_, u)| u.map(|u| u.symbol)),
    })
}

fn json_rows(v: &[Changed]) -> Vec<Row<'_>> {
    v.iter()
        .map(|c| Row {
            engine: &c.engine,
            class: &c.class,
            section: &c.section,
            title: &c.title,
            old: call_json(&c.old),
            new: call_json(&c.new),
        })
        .collect()
}

fn json(h: &Heading, impact: &Impact, unreadable: &[(String, String)]) -> String {
    let doc = Document {
        schema: "gonogo.impact/1",
        series: h.series,
        old_edition: h.old,
        new_edition: h.new,
        decision: h.decision,
        engines: impact.engines,
        changed: json_rows(&impact.changed),
        newly_uncertain: json_rows(&impact.newly_uncertain),
        results: impact
            .results
            .iter()
            .map(|(e, c, a, b)| [e.as_str(), c.as_str(), *a, *b])
            .collect(),
        unreadable: unreadable
            .iter()
            .map(|(f, w)| [f.as_str(), w.as_str()])
            .collect(),
    };
    serde_json::to_string_pretty(&doc).unwrap_or_default() + "\n"
}

//! The report of `gonogo impact`, leading with the answer: the counts first (verdicts that
//! change, newly illegal, newly inside the uncertainty band, results that change, then per
//! rule and per class), then the engines that became illegal or close to a limit, then the
//! other changed verdicts counted (every row with `--all`), and the files that could not be
//! compared. Text, Markdown, HTML (the same content, one self-contained page for a meeting)
//! or JSON (schema `gonogo.impact/1`, every row).

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
    /// One self-contained HTML page.
    Html,
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
    /// Every changed row, not only the engines that became illegal or close.
    pub all: bool,
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
        ImpactFormat::Text => text(h, impact, unreadable, Style::Text),
        ImpactFormat::Markdown => text(h, impact, unreadable, Style::Markdown),
        ImpactFormat::Html => page(h, &text(h, impact, unreadable, Style::Html)),
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

/// How the report's headings and tables are written.
#[derive(Clone, Copy, PartialEq, Eq)]
enum Style {
    Text,
    Markdown,
    Html,
}

fn escape(s: &str) -> String {
    s.replace('&', "&amp;")
        .replace('<', "&lt;")
        .replace('>', "&gt;")
}

fn table(out: &mut String, header: &[&str], rows: &[Vec<String>], style: Style) {
    if style == Style::Html {
        let cells = |tag: &str, r: Vec<&str>| {
            r.iter()
                .map(|c| format!("<{tag}>{}</{tag}>", escape(c)))
                .collect::<String>()
        };
        let _ = writeln!(out, "<table><tr>{}</tr>", cells("th", header.to_vec()));
        for r in rows {
            let _ = writeln!(
                out,
                "<tr>{}</tr>",
                cells("td", r.iter().map(String::as_str).collect())
            );
        }
        let _ = writeln!(out, "</table>");
        return;
    }
    if style == Style::Markdown {
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

/// Counts of one class or rule: changed verdicts, newly illegal, newly close.
#[derive(Default)]
struct Tally {
    changed: usize,
    illegal: usize,
    close: usize,
}

fn tallies(impact: &Impact) -> (BTreeMap<(String, String), Tally>, BTreeMap<String, Tally>) {
    let mut by_rule: BTreeMap<(String, String), Tally> = BTreeMap::new();
    let mut by_class: BTreeMap<String, Tally> = BTreeMap::new();
    let key = |c: &Changed| (c.class.clone(), format!("{} {}", c.section, c.title));
    for c in &impact.changed {
        for t in [
            by_rule.entry(key(c)).or_default(),
            by_class.entry(c.class.clone()).or_default(),
        ] {
            t.changed += 1;
            t.illegal += usize::from(c.newly_illegal());
        }
    }
    for c in &impact.newly_uncertain {
        by_rule.entry(key(c)).or_default().close += 1;
        by_class.entry(c.class.clone()).or_default().close += 1;
    }
    (by_rule, by_class)
}

fn text(h: &Heading, impact: &Impact, unreadable: &[(String, String)], style: Style) -> String {
    let mut out = String::new();
    let head = |title: &str| match style {
        Style::Markdown => format!("\n## {title}\n"),
        Style::Html => format!("<h2>{title}</h2>"),
        Style::Text => format!("\n{title}"),
    };
    let line = |out: &mut String, s: String| {
        let _ = match style {
            Style::Html => writeln!(out, "<p>{}</p>", escape(&s)),
            Style::Markdown => writeln!(out, "{}\n", s.trim_start()),
            Style::Text => writeln!(out, "{s}"),
        };
    };
    let title = format!(
        "{}: {} → {}, on {} (decision rule {})",
        h.series,
        h.old,
        h.new,
        super::format::count(impact.engines, "engine", "engines"),
        h.decision
    );
    let _ = match style {
        Style::Markdown => writeln!(out, "# {title}"),
        Style::Html => writeln!(out, "<h1>{}</h1>", escape(&title)),
        Style::Text => writeln!(out, "{title}"),
    };
    let illegal: Vec<Changed> = impact
        .changed
        .iter()
        .filter(|c| c.newly_illegal())
        .cloned()
        .collect();
    let illegal_engines = distinct(&illegal);
    let _ = writeln!(out, "{}", head("in short"));
    let counts = vec![
        vec![
            "verdicts that change".to_string(),
            impact.changed.len().to_string(),
        ],
        vec![
            "newly illegal".to_string(),
            format!(
                "{} on {}",
                super::format::count(illegal.len(), "rule", "rules"),
                super::format::count(illegal_engines, "engine", "engines")
            ),
        ],
        vec![
            "newly inside the uncertainty band".to_string(),
            impact.newly_uncertain.len().to_string(),
        ],
        vec![
            "results that change".to_string(),
            super::format::count(impact.results.len(), "engine", "engines"),
        ],
    ];
    table(&mut out, &["what", "how many"], &counts, style);
    let (by_rule, by_class) = tallies(impact);
    if !by_rule.is_empty() {
        let _ = writeln!(out, "{}", head("by rule"));
        let rows: Vec<Vec<String>> = by_rule
            .iter()
            .map(|((class, rule), t)| {
                vec![
                    class.clone(),
                    rule.clone(),
                    t.changed.to_string(),
                    t.illegal.to_string(),
                    t.close.to_string(),
                ]
            })
            .collect();
        table(
            &mut out,
            &["class", "rule", "changed", "newly illegal", "newly close"],
            &rows,
            style,
        );
        let _ = writeln!(out, "{}", head("by class"));
        let rows: Vec<Vec<String>> = by_class
            .iter()
            .map(|(class, t)| {
                vec![
                    class.clone(),
                    t.changed.to_string(),
                    t.illegal.to_string(),
                    t.close.to_string(),
                ]
            })
            .collect();
        table(
            &mut out,
            &["class", "changed", "newly illegal", "newly close"],
            &rows,
            style,
        );
    }
    let (old_label, new_label) = (h.old.to_string(), h.new.to_string());
    let header = [
        "engine",
        "class",
        "rule",
        old_label.as_str(),
        new_label.as_str(),
    ];
    if !illegal.is_empty() {
        let _ = writeln!(out, "{}", head("became illegal"));
        table(&mut out, &header, &rows_of(&illegal), style);
    }
    if !impact.newly_uncertain.is_empty() {
        let _ = writeln!(out, "{}", head("close: newly inside the uncertainty band"));
        table(&mut out, &header, &rows_of(&impact.newly_uncertain), style);
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
            style,
        );
    }
    let rest: Vec<Changed> = impact
        .changed
        .iter()
        .filter(|c| !c.newly_illegal())
        .cloned()
        .collect();
    if h.all && !rest.is_empty() {
        let _ = writeln!(out, "{}", head("every other verdict that changes"));
        table(&mut out, &header, &rows_of(&rest), style);
    } else if !rest.is_empty() {
        line(
            &mut out,
            format!(
                "\n{} other verdicts change, on {}; --all lists every one",
                rest.len(),
                super::format::count(distinct(&rest), "engine", "engines")
            ),
        );
    }
    if impact.changed.is_empty() && impact.newly_uncertain.is_empty() {
        line(&mut out, "\nno verdict changes".to_string());
    }
    if !unreadable.is_empty() {
        let _ = writeln!(out, "{}", head("could not be compared"));
        for (file, why) in unreadable {
            line(&mut out, format!("  {file}: {why}"));
        }
    }
    out
}

/// How many engines the rows name.
fn distinct(rows: &[Changed]) -> usize {
    let mut names: Vec<&str> = rows.iter().map(|c| c.engine.as_str()).collect();
    names.sort_unstable();
    names.dedup();
    names.len()
}

/// The HTML body in one self-contained page: no external file, no script.
fn page(h: &Heading, body: &str) -> String {
    format!(
        "<!DOCTYPE html>\n<html lang=\"en\">\n<head>\n<meta charset=\"utf-8\">\n<title>{}: impact</title>\n<style>\nbody {{ font-family: sans-serif; margin: 2em; }}\ntable {{ border-collapse: collapse; margin: 0.5em 0 1em; }}\nth, td {{ border: 1px solid #999; padding: 0.2em 0.6em; text-align: left; }}\nth {{ background: #eee; }}\n</style>\n</head>\n<body>\n{body}</body>\n</html>\n",
        escape(h.series)
    )
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

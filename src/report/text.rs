//! The text report of `gonogo check`: a header naming the series, edition, class, engine and
//! decision rule, a result line, then each rule with its verdict, finding, numbers and trace.
//! A layout of the [`EngineView`]; the words are the view's.

use std::fmt::Write;

use super::view::{EngineView, Line, RuleView};
use crate::evaluate::outcome::{EngineReport, EngineResult};

/// The whole report for one engine.
pub fn engine(report: &EngineReport) -> String {
    engine_view(&EngineView::new(report))
}

/// The whole report for one engine's view.
pub fn engine_view(view: &EngineView) -> String {
    let mut out = String::new();
    header(&mut out, view);
    for rule in &view.rules {
        out.push('\n');
        rule_lines(&mut out, rule, view);
    }
    out
}

fn header(out: &mut String, v: &EngineView) {
    let _ = writeln!(out, "{}", v.heading);
    let parts: Vec<String> = [
        v.engine.as_ref().map(|e| format!("engine {e}")),
        v.car.as_ref().map(|c| format!("car {c}")),
        v.event.clone(),
        v.date.clone(),
        v.measured_by.as_ref().map(|m| format!("measured by {m}")),
    ]
    .into_iter()
    .flatten()
    .collect();
    if !parts.is_empty() {
        let _ = writeln!(out, "{}", parts.join(" · "));
    }
    if let Some(inspected) = v.inspected.words() {
        let _ = writeln!(out, "inspected: {inspected}");
    }
    let _ = writeln!(out, "decision rule: {}", v.decision_words());
    let _ = writeln!(out, "rules in force: {}", v.rules_in_force());
    let _ = writeln!(out, "declaration: {}", v.file);
    provenance(out, v);
    let _ = writeln!(out, "\nresult: {}", v.result_words());
    let _ = writeln!(out, "marks: {}", v.marks());
}

/// The provenance block: who made the report and when, then the fingerprints in full, so a
/// call can be matched to its exact inputs.
fn provenance(out: &mut String, v: &EngineView) {
    let p = &v.provenance;
    let _ = writeln!(out, "made by: {}", p.made_by());
    let _ = writeln!(out, "rulebook sha256: {}", p.rulebook_sha256);
    let _ = writeln!(out, "declaration sha256: {}", p.declaration_sha256);
}

fn rule_lines(out: &mut String, rule: &RuleView, v: &EngineView) {
    let _ = writeln!(
        out,
        "{} {}  {} — {}",
        rule.mark,
        rule.section,
        rule.title,
        rule.verdict_words()
    );
    for line in rule.lines(v) {
        match line {
            Line::Fact(f) => {
                let code = f.code.unwrap_or_default();
                let gap = if code.is_empty() || f.text.is_empty() {
                    ""
                } else {
                    " "
                };
                let _ = writeln!(out, "    {:<10} {code}{gap}{}", f.label, f.text);
            }
            Line::Scale(_) => {}
            Line::Trace(trace) => {
                let _ = writeln!(out, "    trace");
                for t in trace {
                    let _ = writeln!(out, "      {}", t.words());
                    if let Some(result) = t.result() {
                        let _ = writeln!(out, "        {result}");
                    }
                }
            }
        }
    }
}

/// The closing table of a run over several engines: each engine's result and the rule that
/// decided it (the first illegal one, else the one with the least probability of conformance),
/// with the car number (a dash where the declaration gives none).
pub fn field_summary(reports: &[EngineReport]) -> String {
    let rows: Vec<[String; 5]> = reports.iter().map(summary_row).collect();
    let header = ["engine", "car", "class", "result", "closest call"].map(str::to_string);
    let widths: Vec<usize> = (0..5)
        .map(|c| {
            rows.iter()
                .chain([&header])
                .map(|r| r[c].chars().count())
                .max()
                .unwrap_or(0)
        })
        .collect();
    let line = |r: &[String; 5]| {
        let cells: Vec<String> = r
            .iter()
            .zip(&widths)
            .map(|(cell, w)| format!("{cell:<w$}"))
            .collect();
        format!("  {}\n", cells.join("  ").trim_end())
    };
    let mut out = String::from("field\n");
    out.push_str(&line(&header));
    rows.iter().for_each(|r| out.push_str(&line(r)));
    let count = |e: EngineResult| reports.iter().filter(|r| r.result() == e).count();
    out.push_str(&format!(
        "{}: {} legal, {} illegal, {} not all clear\n",
        super::format::count(reports.len(), "engine", "engines"),
        count(EngineResult::Legal),
        count(EngineResult::Illegal),
        count(EngineResult::NotAllClear)
    ));
    out
}

fn summary_row(r: &EngineReport) -> [String; 5] {
    let engine = r
        .declaration
        .identity
        .engine
        .clone()
        .unwrap_or_else(|| r.declaration.path.display().to_string());
    let car = r.declaration.identity.car.as_deref().unwrap_or("—");
    [
        engine,
        car.to_string(),
        r.class.name.clone(),
        r.result().short_words().to_string(),
        super::view::closest_call(r)
            .map(|c| c.words())
            .unwrap_or_default(),
    ]
}

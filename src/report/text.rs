//! The text report of `gonogo check`: a header naming the series, edition, class, engine and
//! decision rule, a result line, then each rule with its verdict, finding, numbers and trace.
//! A layout of the [`EngineView`]; the words are the view's.

use std::fmt::Write;

use super::view::{EngineView, Line, RuleView};
use crate::evaluate::outcome::EngineReport;

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

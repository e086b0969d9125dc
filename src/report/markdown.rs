//! The Markdown report of `check --format markdown`: the tech sheet's content for a wiki, a
//! bulletin or an email — identity, result, each rule with its verdict (word and symbol),
//! facts and trace, and the signature lines. A layout of the [`EngineView`]; the words are
//! the view's.

use std::fmt::Write;

use super::view::{EngineView, Fact, Line, RuleView};
use crate::evaluate::outcome::EngineReport;

/// The report for one or more engines.
pub fn document(reports: &[EngineReport]) -> String {
    super::document::whole(super::document::Layout::Markdown, reports)
}

/// One engine's report: identity, result, each rule, the signature lines and provenance.
pub fn engine(v: &EngineView) -> String {
    let mut out = String::new();
    let _ = writeln!(out, "# {}\n", v.heading);
    let _ = writeln!(
        out,
        "| engine | car | event | date | measured by | decision rule | rules in force | declaration |"
    );
    let _ = writeln!(out, "|---|---|---|---|---|---|---|---|");
    let dash = |v: &Option<String>| v.clone().unwrap_or_else(|| "—".to_string());
    let _ = writeln!(
        out,
        "| {} | {} | {} | {} | {} | {} | {} | {} |\n",
        dash(&v.engine),
        dash(&v.car),
        dash(&v.event),
        dash(&v.date),
        dash(&v.measured_by),
        v.decision_words(),
        v.rules_in_force(),
        v.file
    );
    let _ = writeln!(out, "**{} {}**\n", v.result.mark(), v.result_words());
    if let Some(inspected) = v.inspected.words() {
        let _ = writeln!(out, "Inspected: {inspected}\n");
    }
    let _ = writeln!(out, "Marks: {}\n", v.marks());
    for rule in &v.rules {
        rule_lines(&mut out, rule, v);
    }
    out.push_str("Inspector: ____________________  signature ____________  time ______\n\n");
    out.push_str("Competitor: ____________________  signature ____________  time ______\n");
    provenance(&mut out, v);
    out
}

/// The provenance block, last: who made the report and when, and the fingerprints in full.
fn provenance(out: &mut String, v: &EngineView) {
    let p = &v.provenance;
    let _ = writeln!(out, "\n*Made by {}.*  ", p.made_by());
    let _ = writeln!(out, "*Rulebook SHA-256 `{}`.*  ", p.rulebook_sha256);
    let _ = writeln!(out, "*Declaration SHA-256 `{}`.*", p.declaration_sha256);
}

fn rule_lines(out: &mut String, rule: &RuleView, v: &EngineView) {
    let _ = writeln!(
        out,
        "## {} {} {} — {}\n",
        rule.mark,
        rule.section,
        rule.title,
        rule.verdict_words()
    );
    for line in rule.lines(v) {
        match line {
            Line::Fact(f) => {
                let _ = writeln!(out, "- {}", fact(&f));
            }
            Line::Scale(_) => {}
            Line::Trace(trace) => {
                out.push_str("- trace\n");
                for t in trace {
                    let _ = writeln!(out, "  - {}", t.words());
                    if let Some(result) = t.result() {
                        let _ = writeln!(out, "    {result}");
                    }
                }
            }
        }
    }
    out.push('\n');
}

/// `requires `bore <= 4.030 in``, `value 4.0306 in (cylinder 4, ...)`.
fn fact(f: &Fact) -> String {
    let mut text = f.label.to_string();
    if let Some(code) = &f.code {
        let _ = write!(text, " `{code}`");
    }
    if !f.text.is_empty() {
        let _ = write!(text, " {}", f.text);
    }
    text
}

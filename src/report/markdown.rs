//! The Markdown report of `check --format markdown`: the tech sheet's content for a wiki, a
//! bulletin or an email — identity, result, each rule with its verdict (word and symbol),
//! numbers and trace, and the signature lines.

use std::fmt::Write;

use super::format::{probability, quantity, uncertainty_in};
use super::html::trace_line;
use crate::evaluate::outcome::{EngineReport, Outcome};

/// The report for one or more engines.
pub fn document(reports: &[EngineReport]) -> String {
    reports
        .iter()
        .map(engine)
        .collect::<Vec<_>>()
        .join("\n---\n\n")
}

fn engine(r: &EngineReport) -> String {
    let mut out = String::new();
    let id = &r.declaration.identity;
    let _ = writeln!(
        out,
        "# {}
",
        r.heading()
    );
    let _ = writeln!(
        out,
        "| engine | car | event | date | measured by | decision rule | bulletins |"
    );
    let _ = writeln!(out, "|---|---|---|---|---|---|---|");
    let dash = |v: Option<String>| v.unwrap_or_else(|| "—".to_string());
    let bulletins = if r.bulletins.is_empty() {
        "none".to_string()
    } else {
        r.bulletins.join(", ")
    };
    let _ = writeln!(
        out,
        "| {} | {} | {} | {} | {} | {} | {bulletins} |\n",
        dash(id.engine.clone()),
        dash(id.car.clone()),
        dash(id.event.clone()),
        dash(id.date.map(|d| d.to_string())),
        dash(id.measured_by.clone()),
        r.decision.words()
    );
    let [legal, illegal, unchecked, not_applicable] = r.counts();
    let (mark, words) = r.result();
    let result = format!("{mark} {words}");
    let _ = writeln!(
        out,
        "**{result}** — {legal} legal, {illegal} illegal, {unchecked} not checked, {not_applicable} not applicable; {} conditional\n",
        r.conditional_count()
    );
    for o in &r.outcomes {
        rule(&mut out, o, r);
    }
    out.push_str("Inspector: ____________________  signature ____________  time ______\n\n");
    out.push_str("Competitor: ____________________  signature ____________  time ______\n");
    out
}

fn rule(out: &mut String, o: &Outcome, r: &EngineReport) {
    let mark = o.mark();
    let finding = o
        .checked
        .as_ref()
        .map(|c| format!(" · {}", c.finding.words()))
        .unwrap_or_default();
    let _ = writeln!(
        out,
        "## {mark} {} {} — {}{finding}\n",
        o.section(),
        o.title(),
        o.verdict.words()
    );
    let _ = writeln!(out, "requires `{}`", o.rule.requirement);
    for c in &o.rule.condition_texts {
        let _ = writeln!(out, "\nwhen `{c}`");
    }
    if !o.missing.is_empty() {
        let _ = writeln!(out, "\nmissing: {}", o.missing.join(", "));
    }
    if let Some(c) = o.checked.as_ref().filter(|c| c.is_finite()) {
        if let Some(observed) = &c.observed {
            let _ = writeln!(out, "\nfound `{observed}`");
        }
        if let Some(n) = &c.numeric {
            let at = n
                .cylinder
                .map(|c| format!(" (cylinder {c})"))
                .unwrap_or_default();
            let side = if n.margin >= 0.0 { "inside" } else { "outside" };
            let _ = writeln!(
                out,
                "\nvalue {}{at} · limit {} · margin {} {side} · U = {} (k = {}) · conformance probability {}",
                quantity(n.value, n.unit),
                quantity(n.limit, n.unit),
                quantity(n.margin.abs(), n.unit),
                uncertainty_in(n.expanded, n.unit),
                n.k,
                probability(n.probability, n.expanded > 0.0)
            );
        }
    }
    if !o.trace.is_empty() {
        out.push('\n');
        for t in &o.trace {
            let _ = writeln!(out, "- {}", trace_line(t, r));
        }
    }
    out.push('\n');
}

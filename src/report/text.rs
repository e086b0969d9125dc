//! The text report of `gonogo check`: a header naming the series, edition, class, engine and
//! decision rule, a result line, then each rule with its verdict, finding, numbers and trace.

use std::fmt::Write;

use super::format::{probability, quantity, uncertainty_in};
use crate::check::model::Origin;
use crate::evaluate::finding::Verdict;
use crate::evaluate::outcome::{Applies, EngineReport, Outcome, Trace};
use crate::exit::Exit;
use crate::load::UncertaintySource;

/// The whole report for one engine.
pub fn engine(report: &EngineReport) -> String {
    let mut out = String::new();
    header(&mut out, report);
    for outcome in &report.outcomes {
        out.push('\n');
        rule(&mut out, outcome);
    }
    out
}

fn header(out: &mut String, r: &EngineReport) {
    let title = r
        .class_title
        .as_ref()
        .map(|t| format!(" \"{t}\""))
        .unwrap_or_default();
    let _ = writeln!(
        out,
        "{} — edition {} — class {}{title}",
        r.series, r.edition, r.class
    );
    let id = &r.identity;
    let parts: Vec<String> = [
        id.engine.as_ref().map(|e| format!("engine {e}")),
        id.car.as_ref().map(|c| format!("car {c}")),
        id.event.clone(),
        id.date.map(|d| d.to_string()),
        id.measured_by.as_ref().map(|m| format!("measured by {m}")),
    ]
    .into_iter()
    .flatten()
    .collect();
    if !parts.is_empty() {
        let _ = writeln!(out, "{}", parts.join(" · "));
    }
    let from = if r.decision_overridden {
        "from the command line"
    } else {
        "the rulebook's"
    };
    let _ = writeln!(out, "decision rule: {} ({from})", r.decision.words());
    let _ = writeln!(out, "declaration: {}", r.file);
    let [legal, illegal, unchecked, not_applicable] = r.counts();
    let result = match r.exit() {
        Exit::Illegal => "ILLEGAL",
        Exit::Uncertain => "NO PROVEN VIOLATION, BUT NOT ALL CLEAR",
        _ => "LEGAL",
    };
    let _ = writeln!(
        out,
        "\nresult: {result} — {legal} legal, {illegal} illegal, {unchecked} not checked, {not_applicable} not applicable; {} conditional",
        r.conditional_count()
    );
}

fn rule(out: &mut String, o: &Outcome) {
    let finding = o
        .checked
        .as_ref()
        .map(|c| format!(" · {}", c.finding.words()))
        .unwrap_or_default();
    let mark = match o.verdict {
        Verdict::Legal if o.is_uncertain() => "~",
        Verdict::Legal => "✓",
        Verdict::Illegal => "✗",
        Verdict::NotChecked => "?",
        Verdict::NotApplicable => "–",
    };
    let _ = writeln!(
        out,
        "{mark} {}  {} — {}{finding}",
        o.section,
        o.title,
        o.verdict.words()
    );
    let _ = writeln!(out, "    requires   {}", o.requirement);
    for c in &o.conditions {
        let state = match o.applies {
            Applies::DoesNotHold => "does not hold",
            Applies::Uncertain => "uncertain: inside the uncertainty band",
            _ => "holds",
        };
        let _ = writeln!(out, "    when       {c} ({state})");
    }
    if let Origin::Bulletin(b) = &o.origin {
        let _ = writeln!(out, "    from       bulletin {b}");
    }
    if !o.missing.is_empty() {
        let _ = writeln!(
            out,
            "    missing    {} (not in the declaration)",
            o.missing.join(", ")
        );
    }
    if let Some(c) = &o.checked {
        checked_lines(out, c);
        if o.applies == Applies::Uncertain {
            let doubt = if o.verdict == Verdict::Legal
                && !matches!(c.finding, crate::evaluate::finding::Finding::Pass)
            {
                "the rule is not met if its condition holds; an uncertain condition cannot prove a violation"
            } else {
                "judged as if the condition holds"
            };
            let _ = writeln!(out, "    doubt      {doubt}");
        }
    }
    if !o.trace.is_empty() {
        let _ = writeln!(out, "    trace");
        let mut rest = o.trace.as_slice();
        while let Some(first) = rest.first() {
            let run = cylinder_run(rest);
            if run > 1 {
                cylinder_line(out, &rest[..run]);
            } else {
                trace_line(out, first);
            }
            rest = &rest[run.max(1)..];
        }
    }
    if let Some(p) = &o.penalty {
        let _ = writeln!(out, "    penalty    {p}");
    }
    if let Some(n) = &o.note {
        let _ = writeln!(out, "    note       {n}");
    }
}

fn checked_lines(out: &mut String, c: &crate::evaluate::outcome::Checked) {
    if let Some(observed) = &c.observed {
        let _ = writeln!(out, "    found      {observed}");
    }
    let Some(n) = &c.numeric else { return };
    let at = n
        .cylinder
        .map(|i| format!(" (cylinder {i}, the closest to its limit)"))
        .unwrap_or_default();
    let _ = writeln!(out, "    value      {}{at}", quantity(n.value, n.unit));
    match n.range {
        Some((low, high)) => {
            let _ = writeln!(
                out,
                "    limits     {} to {}",
                quantity(low, n.unit),
                quantity(high, n.unit)
            );
        }
        None => {
            let _ = writeln!(out, "    limit      {}", quantity(n.limit, n.unit));
        }
    }
    let side = if n.margin >= 0.0 { "inside" } else { "outside" };
    let _ = writeln!(
        out,
        "    margin     {} {side}, expanded uncertainty U = {} (k = {})",
        quantity(n.margin.abs(), n.unit),
        uncertainty_in(n.expanded, n.unit),
        n.k
    );
    let _ = writeln!(
        out,
        "    conformance probability {}",
        probability(n.probability, n.expanded > 0.0)
    );
}

/// How many trace lines from the start are the cylinders of one measurement, all with the same
/// unit and uncertainty, so they can share one line.
fn cylinder_run(trace: &[Trace]) -> usize {
    let key = |t: &Trace| match t {
        Trace::Input {
            label,
            unit,
            standard_uncertainty,
            source,
            ..
        } => label.split_once('[').map(|(base, _)| {
            (
                base.to_string(),
                unit.map(|u| u.symbol),
                standard_uncertainty.to_bits(),
                format!("{source:?}"),
            )
        }),
        _ => None,
    };
    let Some(first) = trace.first().and_then(key) else {
        return 0;
    };
    trace
        .iter()
        .take_while(|t| key(t).as_ref() == Some(&first))
        .count()
}

/// `bore = 4.0302, 4.0305, ... in  u 0.000029 in (bore_gauge)  [measurements.bore]`
fn cylinder_line(out: &mut String, run: &[Trace]) {
    let Some(Trace::Input {
        label,
        standard_uncertainty,
        unit,
        source,
        origin,
        ..
    }) = run.first()
    else {
        return;
    };
    let values: Vec<String> = run
        .iter()
        .map(|t| match t {
            Trace::Input {
                value,
                unit,
                written,
                ..
            } => shown_value(*value, *unit, written.as_deref(), false),
            _ => String::new(),
        })
        .collect();
    let base = label.split_once('[').map_or(label.as_str(), |(b, _)| b);
    let origin = origin.split_once('[').map_or(origin.as_str(), |(o, _)| o);
    let symbol = unit.map(|u| format!(" {}", u.symbol)).unwrap_or_default();
    let _ = writeln!(
        out,
        "      {base} = {}{symbol}  {}  [{origin}]",
        values.join(", "),
        uncertainty_words(*standard_uncertainty, *unit, source)
    );
}

fn shown_value(
    value: f64,
    unit: Option<&'static crate::units::Unit>,
    written: Option<&str>,
    with_unit: bool,
) -> String {
    let bare = |text: &str| match unit {
        Some(u) if !with_unit => text
            .strip_suffix(u.symbol)
            .map_or(text.to_string(), |t| t.trim_end().to_string()),
        _ => text.to_string(),
    };
    match written {
        Some(w) if !w.contains('±') && !w.contains("+/-") => bare(w),
        _ if with_unit => quantity(value, unit),
        _ => bare(&quantity(value, unit)),
    }
}

fn uncertainty_words(
    u: f64,
    unit: Option<&'static crate::units::Unit>,
    source: &UncertaintySource,
) -> String {
    match source {
        UncertaintySource::None => "no uncertainty stated".to_string(),
        UncertaintySource::Instrument(i) => format!("u {} ({i})", uncertainty_in(u, unit)),
        UncertaintySource::Stated { k } => {
            format!("u {} (stated, k = {k})", uncertainty_in(u, unit))
        }
        UncertaintySource::Rulebook => format!("u {} (rulebook)", uncertainty_in(u, unit)),
    }
}

fn trace_line(out: &mut String, t: &Trace) {
    match t {
        Trace::Input {
            label,
            value,
            standard_uncertainty,
            unit,
            written,
            source,
            origin,
        } => {
            let u = uncertainty_words(*standard_uncertainty, *unit, source);
            let _ = writeln!(
                out,
                "      {label} = {}  {u}  [{origin}]",
                shown_value(*value, *unit, written.as_deref(), true)
            );
        }
        Trace::Text {
            label,
            value,
            origin,
        } => {
            let _ = writeln!(out, "      {label} = \"{value}\"  [{origin}]");
        }
        Trace::Missing { name } => {
            let _ = writeln!(out, "      {name}: missing");
        }
        Trace::Derived {
            name,
            formula,
            values,
            uncertainties,
            unit,
        } => {
            let shown: Vec<String> = values
                .iter()
                .zip(uncertainties)
                .map(|(v, u)| format!("{} (u {})", quantity(*v, *unit), uncertainty_in(*u, *unit)))
                .collect();
            let result = if shown.is_empty() {
                "not computed".to_string()
            } else {
                shown.join(", ")
            };
            let _ = writeln!(out, "      {name} = {formula}");
            let _ = writeln!(out, "        = {result}");
        }
    }
}

/// The closing line of a run over several engines.
pub fn field_line(reports: &[EngineReport]) -> String {
    let count = |e: Exit| reports.iter().filter(|r| r.exit() == e).count();
    format!(
        "{} engines: {} legal, {} illegal, {} not all clear\n",
        reports.len(),
        count(Exit::Clean),
        count(Exit::Illegal),
        count(Exit::Uncertain)
    )
}

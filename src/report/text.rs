//! The text report of `gonogo check`: a header naming the series, edition, class, engine and
//! decision rule, a result line, then each rule with its verdict, finding, numbers and trace.

use std::fmt::Write;

use super::format::{probability, quantity, uncertainty_in};
use super::json::derived_unit;
use crate::check::model::Origin;
use crate::evaluate::finding::{Finding, Verdict};
use crate::evaluate::outcome::{Applies, Checked, EngineReport, Outcome, Trace};
use crate::exit::Exit;
use crate::load::{Input, InputName, UncertaintySource};
use crate::units::{self, Unit};

/// The whole report for one engine.
pub fn engine(report: &EngineReport) -> String {
    let mut out = String::new();
    header(&mut out, report);
    for outcome in &report.outcomes {
        out.push('\n');
        rule(&mut out, outcome, report);
    }
    out
}

fn header(out: &mut String, r: &EngineReport) {
    let _ = writeln!(out, "{}", r.heading());
    let id = &r.declaration.identity;
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
    let _ = writeln!(out, "rules in force: {}", in_force(r));
    let _ = writeln!(out, "declaration: {}", r.declaration.path.display());
    let [legal, illegal, unchecked, not_applicable] = r.counts();
    let (_, result) = r.result();
    let _ = writeln!(
        out,
        "\nresult: {result} — {legal} legal, {illegal} illegal, {unchecked} not checked, {not_applicable} not applicable; {} conditional",
        r.conditional_count()
    );
}

/// `edition 2027 (from 2027-03-06) with bulletin TVB-27-04`.
fn in_force(r: &EngineReport) -> String {
    let edition = format!(
        "edition {} (from {})",
        r.rulebook.edition, r.rulebook.effective
    );
    let bulletins = match r.bulletins {
        [] => String::new(),
        [one] => format!(" with bulletin {one}"),
        many => format!(" with bulletins {}", many.join(", ")),
    };
    let undated = if r.declaration.identity.date.is_none() {
        "; the declaration has no date, so no bulletin is applied"
    } else {
        ""
    };
    format!("{edition}{bulletins}{undated}")
}

fn rule(out: &mut String, o: &Outcome, r: &EngineReport) {
    let finding = o
        .checked
        .as_ref()
        .map(|c| format!(" · {}", c.finding.words()))
        .unwrap_or_default();
    let mark = o.mark();
    let _ = writeln!(
        out,
        "{mark} {}  {} — {}{finding}",
        o.section(),
        o.title(),
        o.verdict.words()
    );
    let _ = writeln!(out, "    requires   {}", o.rule.requirement);
    for c in &o.rule.condition_texts {
        let state = match o.applies {
            Applies::DoesNotHold => "does not hold",
            Applies::Uncertain => "uncertain: inside the uncertainty band",
            _ => "holds",
        };
        let _ = writeln!(out, "    when       {c} ({state})");
    }
    if let Origin::Bulletin(b) = &o.rule.origin {
        let _ = writeln!(out, "    from       bulletin {b}");
    }
    if !o.missing.is_empty() {
        let _ = writeln!(
            out,
            "    missing    {} (not in the declaration)",
            o.missing.join(", ")
        );
    }
    if o.not_finite {
        let _ = writeln!(
            out,
            "    not computed  the value tested is not a finite number (a division by zero or the root of a negative number); check the inputs in the trace"
        );
    }
    if let Some(error) = &o.error {
        let _ = writeln!(
            out,
            "    not computed  {error} (a mistake in gonogo; please report it)"
        );
    }
    if let Some(c) = o.checked.as_ref().filter(|c| c.is_finite()) {
        checked_lines(out, c);
        if o.applies == Applies::Uncertain {
            let doubt = if o.verdict == Verdict::Legal && c.finding != Finding::Pass {
                "the rule is not met if its condition holds; an uncertain condition cannot prove a violation"
            } else {
                "judged as if the condition holds"
            };
            let _ = writeln!(out, "    doubt      {doubt}");
        }
    }
    if !o.trace.is_empty() {
        let _ = writeln!(out, "    trace");
        trace_lines(out, &o.trace, r);
    }
    if let Some(p) = o.penalty() {
        let _ = writeln!(out, "    penalty    {p}");
    }
    if let Some(n) = o.note() {
        let _ = writeln!(out, "    note       {n}");
    }
}

fn checked_lines(out: &mut String, c: &Checked) {
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

/// The trace, with the cylinders of one measurement sharing a line where their unit and
/// uncertainty agree.
fn trace_lines(out: &mut String, trace: &[Trace], r: &EngineReport) {
    let mut rest = trace;
    while let Some(first) = rest.first() {
        let run = cylinder_run(rest, r);
        if run > 1 {
            cylinder_line(out, &rest[..run], r);
        } else {
            trace_line(out, first, r);
        }
        rest = &rest[run.max(1)..];
    }
}

/// How many trace lines from the start are cylinders of one measurement, all with the same
/// unit and uncertainty.
fn cylinder_run(trace: &[Trace], r: &EngineReport) -> usize {
    let key = |t: &Trace| match t {
        Trace::Input(id) => {
            let i = r.input(*id);
            match i.name {
                InputName::Measured {
                    measurement,
                    cylinder: Some(_),
                    ..
                } => Some((
                    measurement,
                    i.unit,
                    i.standard_uncertainty.to_bits(),
                    i.source.clone(),
                )),
                _ => None,
            }
        }
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
fn cylinder_line(out: &mut String, run: &[Trace], r: &EngineReport) {
    let inputs: Vec<&Input> = run
        .iter()
        .filter_map(|t| match t {
            Trace::Input(id) => Some(r.input(*id)),
            _ => None,
        })
        .collect();
    let Some(first) = inputs.first() else { return };
    let unit = first.unit.and_then(units::lookup);
    let values: Vec<String> = inputs.iter().map(|i| shown_value(i, unit, false)).collect();
    let (label, origin) = (first.label(r.rulebook), first.origin(r.rulebook));
    let base = label.split_once('[').map_or(label.as_str(), |(b, _)| b);
    let origin = origin.split_once('[').map_or(origin.as_str(), |(o, _)| o);
    let symbol = unit.map(|u| format!(" {}", u.symbol)).unwrap_or_default();
    let u = uncertainty_words(first.standard_uncertainty, unit, &first.source);
    let _ = writeln!(
        out,
        "      {base} = {}{symbol}  {u}  [{origin}]",
        values.join(", ")
    );
}

/// A value as written (without its unit when `with_unit` is false), or formatted.
fn shown_value(input: &Input, unit: Option<&'static Unit>, with_unit: bool) -> String {
    let bare = |text: &str| match unit {
        Some(u) if !with_unit => text
            .strip_suffix(u.symbol)
            .map_or(text.to_string(), |t| t.trim_end().to_string()),
        _ => text.to_string(),
    };
    match input.written.as_deref() {
        Some(w) if !w.contains('±') && !w.contains("+/-") => bare(w),
        _ if with_unit => quantity(input.value, unit),
        _ => bare(&quantity(input.value, unit)),
    }
}

fn uncertainty_words(u: f64, unit: Option<&'static Unit>, source: &UncertaintySource) -> String {
    match source {
        UncertaintySource::None => "no uncertainty stated".to_string(),
        UncertaintySource::Instrument(i) => format!("u {} ({i})", uncertainty_in(u, unit)),
        UncertaintySource::Stated { k } => {
            format!("u {} (stated, k = {k})", uncertainty_in(u, unit))
        }
        UncertaintySource::Rulebook => format!("u {} (rulebook)", uncertainty_in(u, unit)),
    }
}

fn trace_line(out: &mut String, t: &Trace, r: &EngineReport) {
    match t {
        Trace::Input(id) => {
            let input = r.input(*id);
            let unit = input.unit.and_then(units::lookup);
            let u = uncertainty_words(input.standard_uncertainty, unit, &input.source);
            let _ = writeln!(
                out,
                "      {} = {}  {u}  [{}]",
                input.label(r.rulebook),
                shown_value(input, unit, true),
                input.origin(r.rulebook)
            );
        }
        Trace::Text { name, value, place } => {
            let _ = writeln!(out, "      {name} = \"{value}\"  [{}.{name}]", place.key());
        }
        Trace::Missing { name } => {
            let _ = writeln!(out, "      {name}: missing");
        }
        Trace::Derived {
            derived,
            values,
            uncertainties,
        } => {
            let unit = derived_unit(derived);
            let shown: Vec<String> = values
                .iter()
                .zip(uncertainties)
                .map(|(v, u)| format!("{} (u {})", quantity(*v, unit), uncertainty_in(*u, unit)))
                .collect();
            let result = if shown.is_empty() {
                "not computed".to_string()
            } else {
                shown.join(", ")
            };
            let _ = writeln!(out, "      {} = {}", derived.name, derived.formula);
            let _ = writeln!(out, "        = {result}");
        }
    }
}

/// The closing table of a run over several engines: each engine's result and the rule that
/// decided it (the first illegal one, else the one with the least probability of conformance).
pub fn field_summary(reports: &[EngineReport]) -> String {
    let rows: Vec<[String; 4]> = reports.iter().map(summary_row).collect();
    let header = ["engine", "class", "result", "closest call"].map(str::to_string);
    let widths: Vec<usize> = (0..4)
        .map(|c| {
            rows.iter()
                .chain([&header])
                .map(|r| r[c].chars().count())
                .max()
                .unwrap_or(0)
        })
        .collect();
    let line = |r: &[String; 4]| {
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
    let count = |e: Exit| reports.iter().filter(|r| r.exit() == e).count();
    out.push_str(&format!(
        "{} engines: {} legal, {} illegal, {} not all clear\n",
        reports.len(),
        count(Exit::Clean),
        count(Exit::Illegal),
        count(Exit::Uncertain)
    ));
    out
}

fn summary_row(r: &EngineReport) -> [String; 4] {
    let engine = r
        .declaration
        .identity
        .engine
        .clone()
        .unwrap_or_else(|| r.declaration.path.display().to_string());
    let result = match r.exit() {
        Exit::Illegal => "ILLEGAL",
        Exit::Uncertain => "not all clear",
        _ => "legal",
    };
    [
        engine,
        r.class.name.clone(),
        result.to_string(),
        closest_call(r),
    ]
}

fn closest_call(r: &EngineReport) -> String {
    let describe = |o: &Outcome| {
        format!(
            "{} {} ({})",
            o.section(),
            o.title(),
            o.checked
                .as_ref()
                .map_or(o.verdict.words(), |c| c.finding.words())
        )
    };
    if let Some(o) = r.outcomes.iter().find(|o| o.verdict == Verdict::Illegal) {
        return describe(o);
    }
    if let Some(o) = r.outcomes.iter().find(|o| o.verdict == Verdict::NotChecked) {
        return format!("{} {} (not checked)", o.section(), o.title());
    }
    // least probability of conformance first; among certain passes, least margin for the limit
    let closeness = |n: &crate::evaluate::outcome::Numeric| {
        (
            n.probability,
            n.margin / n.limit.abs().max(f64::MIN_POSITIVE),
        )
    };
    r.outcomes
        .iter()
        .filter_map(|o| {
            Some((
                o,
                o.checked.as_ref()?,
                o.checked.as_ref()?.numeric.as_ref()?,
            ))
        })
        .min_by(|a, b| {
            closeness(a.2)
                .partial_cmp(&closeness(b.2))
                .unwrap_or(std::cmp::Ordering::Equal)
        })
        .map(|(o, c, n)| {
            format!(
                "{} {} ({}, p {})",
                o.section(),
                o.title(),
                c.finding.words(),
                probability(n.probability, n.expanded > 0.0)
            )
        })
        .unwrap_or_default()
}

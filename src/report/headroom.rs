//! The report of `gonogo headroom`: for each numeric rule, the margin to its limit (with the
//! digits its U supports, as `check` shows it) and how far each input may move (in the unit it
//! was written in; an estimate without an uncertainty of its own, so to six significant
//! digits) before the limit is reached.

use std::fmt::Write;

use serde::Serialize;

use super::format::{Digits, margin_digits, quantity};
use crate::analyze::headroom::{Move, RuleHeadroom};
use crate::check::model::CheckedRulebook;
use crate::load::Declaration;
use crate::units::{self, Unit};

/// Output formats of `headroom`.
#[derive(Clone, Copy, Debug, PartialEq, Eq, clap::ValueEnum)]
pub enum HeadroomFormat {
    /// Plain text.
    Text,
    /// One JSON document (schema `gonogo.headroom/1`).
    Json,
}

fn input_unit(d: &Declaration, m: &Move) -> Option<&'static Unit> {
    d.inputs
        .get(m.input as usize)
        .and_then(|i| i.unit)
        .and_then(units::lookup)
}

/// The text report for one engine.
pub fn text(
    rulebook: &CheckedRulebook,
    class: &str,
    d: &Declaration,
    rules: &[RuleHeadroom],
) -> String {
    let mut out = String::new();
    let engine = d
        .identity
        .engine
        .clone()
        .unwrap_or_else(|| d.path.display().to_string());
    let _ = writeln!(
        out,
        "headroom of engine {engine}, class {class}, {} edition {}",
        rulebook.series, rulebook.edition
    );
    let _ = writeln!(
        out,
        "how far each input may move before its rule's limit is reached: estimated from the exact"
    );
    let _ = writeln!(
        out,
        "sensitivity coefficient, then confirmed by checking the rule again with the input moved"
    );
    for r in rules {
        let n = &r.numeric;
        let limit = quantity(n.limit, n.unit);
        let digits = margin_digits(n.expanded, n.unit, &quantity(n.value, n.unit), &limit);
        let side = if r.inside { "inside" } else { "outside" };
        // a value exactly on the limit is "on" it, as `check` says; the finding says which side
        let place = if n.margin == 0.0 {
            format!("on the limit of {limit}")
        } else {
            let margin = digits
                .showing(n.margin / n.unit.map_or(1.0, |u| u.to_si))
                .quantity(n.margin.abs(), n.unit);
            format!("{margin} {side} the limit of {limit}")
        };
        let _ = writeln!(
            out,
            "\n{} {} — {}, {place} (U = {})",
            r.rule.rule.section.text,
            r.rule.rule.title.value,
            r.finding,
            Digits::supported_in(n.expanded, n.unit).quantity(n.expanded, n.unit)
        );
        if r.moves.is_empty() {
            let _ = writeln!(
                out,
                "    no measured input moves it (it reads counts or rulebook values only)"
            );
        }
        for m in &r.moves {
            let _ = writeln!(out, "    {}", move_words(rulebook, d, m, r.inside));
        }
    }
    out
}

fn move_words(rulebook: &CheckedRulebook, d: &Declaration, m: &Move, inside: bool) -> String {
    let Some(input) = d.inputs.get(m.input as usize) else {
        return String::new();
    };
    let unit = input_unit(d, m);
    let label = input.label(rulebook);
    if let (None, Some(edge)) = (m.confirmed, m.domain_ends) {
        return domain_words(&label, input.value, (edge, m.estimate), unit, inside);
    }
    let Some(delta) = m.confirmed else {
        return format!(
            "{label}: the limit is not reached by moving it alone (first-order estimate {})",
            signed(m.estimate, unit)
        );
    };
    if delta == 0.0 {
        return on_the_limit(&label, unit, inside, m.sensitivity > 0.0);
    }
    let verb = match (inside, delta >= 0.0) {
        (true, true) => "may rise",
        (true, false) => "may fall",
        (false, true) => "must rise",
        (false, false) => "must fall",
    };
    let purpose = if inside {
        "before the limit"
    } else {
        "to come back to the limit"
    };
    let moved = input.value + delta;
    let caveat = if plausible(rulebook, input, moved) {
        ""
    } else {
        " (a value the rulebook's range for it does not allow)"
    };
    format!(
        "{label} {verb} {}, to {}, {purpose}{caveat}",
        quantity(delta.abs(), unit),
        quantity(moved, unit)
    )
}

/// The words for an input whose limit lies beyond the domain of the rule's formulas: it may
/// move as far as the domain goes (a gasket thickness to 0 in) and the limit is still not
/// reached; outside the limit, no value the formula is defined for brings it back alone.
fn domain_words(
    label: &str,
    value: f64,
    (edge, estimate): (f64, f64),
    unit: Option<&Unit>,
    inside: bool,
) -> String {
    let verb = if estimate >= 0.0 { "rise" } else { "fall" };
    let to = quantity(value + edge, unit);
    if edge == 0.0 {
        return format!(
            "{label} is where the formula's domain ends ({to}): it cannot {verb}, and no value \
             the formula is defined for reaches the limit by moving it alone"
        );
    }
    if inside {
        format!(
            "{label} may {verb} {}, to {to}, where the formula's domain ends, without reaching \
             the limit",
            quantity(edge.abs(), unit)
        )
    } else {
        format!(
            "{label}: moving it alone does not reach the limit before the formula's domain ends \
             (at {to}, a {verb} of {})",
            quantity(edge.abs(), unit)
        )
    }
}

/// The words for an input that is exactly on the limit: inside when the limit includes its
/// value (`<=`, `>=`), and otherwise to be moved, by any amount, the way that raises the margin.
fn on_the_limit(label: &str, unit: Option<&Unit>, inside: bool, rise: bool) -> String {
    if inside {
        format!(
            "{label} is on the limit: it needs to move {} and is inside",
            quantity(0.0, unit)
        )
    } else {
        let verb = if rise { "rise" } else { "fall" };
        format!(
            "{label} is on the limit, which the rule excludes: it must {verb}, by any amount, \
             to come inside"
        )
    }
}

/// Whether a measured value stays where the rulebook says such values lie: inside the
/// measurement's `range`, and not negative unless the range allows it.
fn plausible(rulebook: &CheckedRulebook, input: &crate::load::Input, value: f64) -> bool {
    let crate::load::InputName::Measured { measurement, .. } = input.name else {
        return true;
    };
    match rulebook.measurements.get(measurement).and_then(|m| m.range) {
        Some((low, high)) => value >= low && value <= high,
        None => value >= 0.0,
    }
}

fn signed(v: f64, unit: Option<&Unit>) -> String {
    let sign = if v >= 0.0 { "+" } else { "−" };
    format!("{sign}{}", quantity(v.abs(), unit))
}

#[derive(Serialize)]
struct Rule<'a> {
    section: &'a str,
    title: &'a str,
    finding: &'static str,
    unit: Option<&'static str>,
    value: f64,
    limit: f64,
    margin: f64,
    expanded_uncertainty: f64,
    moves: Vec<MoveJson>,
}

#[derive(Serialize)]
struct MoveJson {
    input: String,
    unit: Option<&'static str>,
    value: f64,
    estimate: f64,
    confirmed: Option<f64>,
    domain_ends_at: Option<f64>,
    value_at_limit: Option<f64>,
    limit_there: Option<f64>,
}

/// The JSON document for one engine (schema `gonogo.headroom/1`); values in the units named.
pub fn json(
    rulebook: &CheckedRulebook,
    class: &str,
    d: &Declaration,
    rules: &[RuleHeadroom],
) -> serde_json::Value {
    let scale = |u: Option<&Unit>| u.map_or(1.0, |u| u.to_si);
    let rules: Vec<Rule> = rules
        .iter()
        .map(|r| {
            let n = &r.numeric;
            let s = scale(n.unit);
            Rule {
                section: &r.rule.rule.section.text,
                title: &r.rule.rule.title.value,
                finding: r.finding,
                unit: n.unit.map(|u| u.symbol),
                value: n.value / s,
                limit: n.limit / s,
                margin: n.margin / s,
                expanded_uncertainty: n.expanded / s,
                moves: r
                    .moves
                    .iter()
                    .filter_map(|m| {
                        let input = d.inputs.get(m.input as usize)?;
                        let u = input_unit(d, m);
                        Some(MoveJson {
                            input: input.label(rulebook),
                            unit: u.map(|u| u.symbol),
                            value: input.value / scale(u),
                            estimate: m.estimate / scale(u),
                            confirmed: m.confirmed.map(|c| c / scale(u)),
                            domain_ends_at: m.domain_ends.map(|e| e / scale(u)),
                            value_at_limit: m.at_limit.map(|(v, _)| v / s),
                            limit_there: m.at_limit.map(|(_, l)| l / s),
                        })
                    })
                    .collect(),
            }
        })
        .collect();
    serde_json::json!({
        "file": d.path.display().to_string(),
        "engine": d.identity.engine,
        "class": class,
        "rules": rules,
    })
}

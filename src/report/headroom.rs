//! The report of `gonogo headroom`: for each numeric rule, the margin to its limit and to the
//! proven-pass line under the decision rule in force (with the digits its U supports, as
//! `check` shows it, in the unit family the declaration's readings were written in), how far
//! each input may move to reach each line, one cylinder alone and every cylinder together (in
//! the unit it was written in; an estimate without an uncertainty of its own, so to six
//! significant digits), and every rule with no headroom and why.

use std::fmt::Write;

use serde::Serialize;

use super::format::{Digits, margin_digits, number, quantity};
use crate::analyze::headroom::{Headroom, Move, Reach, RuleHeadroom};
use crate::check::model::CheckedRulebook;
use crate::load::{Declaration, Input, InputName};
use crate::parse::ast::DecisionRule;
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

/// The unit a rule's margin is shown in: the unit family of the readings it reads (a metric
/// engine's margins in mm and cc), the rule's own unit where they mix ([`units::shown_unit`]).
pub fn margin_unit(d: &Declaration, r: &RuleHeadroom) -> Option<&'static Unit> {
    let unit = r.numeric.unit?;
    let written = r
        .numeric
        .sensitivities
        .iter()
        .filter_map(|(id, _)| d.inputs.get(*id as usize))
        .filter(|i| matches!(i.name, InputName::Measured { .. }))
        .filter_map(|i| i.unit);
    units::shown_unit(unit.dimension, written, Some(unit))
}

/// The value of the proven-pass line, SI units: `guard` U inside the limit, on the side of
/// the limit the value is measured from.
pub fn pass_line(r: &RuleHeadroom) -> f64 {
    let n = &r.numeric;
    // the limit lies above the value when value + margin reaches it (an upper limit)
    let upper = (n.value + n.margin - n.limit).abs() <= (n.value - n.margin - n.limit).abs();
    let guard = r.guard * n.expanded;
    if upper {
        n.limit - guard
    } else {
        n.limit + guard
    }
}

fn decision_words(d: DecisionRule) -> &'static str {
    match d {
        DecisionRule::GuardedRejection => "guarded rejection",
        DecisionRule::GuardedAcceptance => "guarded acceptance",
        DecisionRule::SimpleAcceptance => "simple acceptance",
    }
}

/// The text report for one engine.
pub fn text(
    rulebook: &CheckedRulebook,
    class: &str,
    d: &Declaration,
    headroom: &Headroom,
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
        "how far each input may move before its rule's limit, and before the proven-pass line (U"
    );
    let _ = writeln!(
        out,
        "inside the limit; the limit itself under simple acceptance), is reached: one cylinder"
    );
    let _ = writeln!(
        out,
        "alone and every cylinder together, estimated from the exact sensitivity coefficient,"
    );
    let _ = writeln!(
        out,
        "then confirmed by checking the rule again with the input moved"
    );
    for r in &headroom.rules {
        rule_text(&mut out, rulebook, d, r);
    }
    if !headroom.not_computed.is_empty() {
        let _ = writeln!(
            out,
            "
no headroom computed"
        );
        for n in &headroom.not_computed {
            let _ = writeln!(
                out,
                "    {} {} — {}",
                n.rule.rule.section.text, n.rule.rule.title.value, n.reason
            );
        }
    }
    out
}

fn rule_text(out: &mut String, rulebook: &CheckedRulebook, d: &Declaration, r: &RuleHeadroom) {
    let n = &r.numeric;
    let unit = margin_unit(d, r);
    let limit = quantity(n.limit, unit);
    let digits = margin_digits(n.expanded, unit, &quantity(n.value, unit), &limit);
    let side = if r.inside { "inside" } else { "outside" };
    // a value exactly on the limit is "on" it, as `check` says; the finding says which side
    let place = if n.margin == 0.0 {
        format!("on the limit of {limit}")
    } else {
        let margin = digits
            .showing(n.margin / unit.map_or(1.0, |u| u.to_si))
            .quantity(n.margin.abs(), unit);
        format!("{margin} {side} the limit of {limit}")
    };
    let big_u = Digits::supported_in(n.expanded, unit).quantity(n.expanded, unit);
    let line = if r.guard > 0.0 {
        let line = digits.quantity(pass_line(r), unit);
        format!("proven-pass line {line} (U inside the limit)")
    } else if n.expanded > 0.0 {
        "proven-pass line: the limit itself".to_string()
    } else {
        "proven-pass line: the limit itself (no uncertainty)".to_string()
    };
    let _ = writeln!(
        out,
        "\n{} {} — {}, {place} (U = {big_u})",
        r.rule.rule.section.text, r.rule.rule.title.value, r.finding,
    );
    let _ = writeln!(out, "    {}: {line}", decision_words(r.decision));
    if r.moves.is_empty() {
        let _ = writeln!(
            out,
            "    no measured input moves it (it reads counts or rulebook values only)"
        );
    }
    for m in &r.moves {
        let _ = writeln!(out, "    {}", move_words(rulebook, d, m));
    }
}

/// One move in words: who moves, then how far to the limit and to the proven-pass line.
fn move_words(rulebook: &CheckedRulebook, d: &Declaration, m: &Move) -> String {
    let Some(input) = d.inputs.get(m.input as usize) else {
        return String::new();
    };
    let unit = input_unit(d, m);
    let moved: Vec<&Input> = m
        .moved
        .iter()
        .filter_map(|id| d.inputs.get(*id as usize))
        .collect();
    let who = if m.every_cylinder() {
        let name = match input.name {
            InputName::Measured { measurement, .. } => rulebook
                .measurements
                .get(measurement)
                .map_or("?", |s| s.name.as_str()),
            _ => "?",
        };
        format!("every {name}, {} cylinders together", moved.len())
    } else {
        format!("{} alone", input.label(rulebook))
    };
    let values: Vec<f64> = moved.iter().map(|i| i.value).collect();
    // the way that raises the margin, for a value on a limit that excludes it
    let rise = m.sensitivity > 0.0;
    let mut words = format!(
        "{who} — limit: {}",
        reach_words(rulebook, &moved, &values, &m.limit, unit, ("limit", rise))
    );
    if let Some(pass) = &m.pass {
        let _ = write!(
            words,
            "; proven-pass line: {}",
            reach_words(rulebook, &moved, &values, pass, unit, ("line", rise))
        );
    }
    words
}

/// The moved values: one, or the range of every cylinder's.
fn moved_to(values: &[f64], delta: f64, unit: Option<&Unit>) -> String {
    let low = values.iter().copied().fold(f64::INFINITY, f64::min) + delta;
    let high = values.iter().copied().fold(f64::NEG_INFINITY, f64::max) + delta;
    if low == high {
        quantity(low, unit)
    } else {
        let scale = unit.map_or(1.0, |u| u.to_si);
        format!("{} to {}", number(low / scale), quantity(high, unit))
    }
}

/// How far one move goes to one line (`what`: "limit" or "line"), in words.
fn reach_words(
    rulebook: &CheckedRulebook,
    moved: &[&Input],
    values: &[f64],
    reach: &Reach,
    unit: Option<&Unit>,
    (what, rise): (&str, bool),
) -> String {
    if let (None, Some(edge)) = (reach.confirmed, reach.domain_ends) {
        let verb = if reach.estimate >= 0.0 {
            "rise"
        } else {
            "fall"
        };
        let to = moved_to(values, edge, unit);
        return if edge == 0.0 {
            format!(
                "at the edge of the formula's domain ({to}): it cannot {verb}, and no value the \
                 formula is defined for reaches the {what}"
            )
        } else if reach.inside {
            format!(
                "may {verb} {}, to {to}, where the formula's domain ends, without reaching the {what}",
                quantity(edge.abs(), unit)
            )
        } else {
            format!(
                "the {what} is not reached before the formula's domain ends (at {to}, a {verb} \
                 of {})",
                quantity(edge.abs(), unit)
            )
        };
    }
    let Some(delta) = reach.confirmed else {
        return format!(
            "not reached by this move (first-order estimate {})",
            signed(reach.estimate, unit)
        );
    };
    if delta == 0.0 {
        return if reach.inside {
            format!("on the {what}, and inside it")
        } else {
            let verb = if rise { "rise" } else { "fall" };
            format!("on the {what}, which the rule excludes: it must {verb}, by any amount")
        };
    }
    let verb = match (reach.inside, delta >= 0.0) {
        (true, true) => "may rise",
        (true, false) => "may fall",
        (false, true) => "must rise",
        (false, false) => "must fall",
    };
    let caveat = if moved
        .iter()
        .all(|i| plausible(rulebook, i, i.value + delta))
    {
        ""
    } else {
        " (a value the rulebook's range for it does not allow)"
    };
    format!(
        "{verb} {}, to {}{caveat}",
        quantity(delta.abs(), unit),
        moved_to(values, delta, unit)
    )
}

/// Whether a measured value stays where the rulebook says such values lie: inside the
/// measurement's `range`, and not negative unless the range allows it.
fn plausible(rulebook: &CheckedRulebook, input: &Input, value: f64) -> bool {
    let InputName::Measured { measurement, .. } = input.name else {
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
    decision: &'static str,
    unit: Option<&'static str>,
    value: f64,
    limit: f64,
    proven_pass_line: f64,
    margin: f64,
    expanded_uncertainty: f64,
    moves: Vec<MoveJson>,
}

#[derive(Serialize)]
struct MoveJson {
    input: String,
    cylinders_moved: usize,
    unit: Option<&'static str>,
    value: f64,
    to_limit: ReachJson,
    to_proven_pass_line: Option<ReachJson>,
}

#[derive(Serialize)]
struct ReachJson {
    estimate: f64,
    confirmed: Option<f64>,
    domain_ends_at: Option<f64>,
    value_there: Option<f64>,
    limit_there: Option<f64>,
    expanded_uncertainty_there: Option<f64>,
}

#[derive(Serialize)]
struct NotComputedJson<'a> {
    section: &'a str,
    title: &'a str,
    reason: &'a str,
}

fn reach_json(reach: &Reach, s: f64, input_scale: f64) -> ReachJson {
    ReachJson {
        estimate: reach.estimate / input_scale,
        confirmed: reach.confirmed.map(|c| c / input_scale),
        domain_ends_at: reach.domain_ends.map(|e| e / input_scale),
        value_there: reach.landed.map(|l| l.value / s),
        limit_there: reach.landed.map(|l| l.limit / s),
        expanded_uncertainty_there: reach.landed.map(|l| l.expanded / s),
    }
}

/// The JSON document for one engine (schema `gonogo.headroom/1`); values in the units named.
pub fn json(
    rulebook: &CheckedRulebook,
    class: &str,
    d: &Declaration,
    headroom: &Headroom,
) -> serde_json::Value {
    let scale = |u: Option<&Unit>| u.map_or(1.0, |u| u.to_si);
    let rules: Vec<Rule> = headroom
        .rules
        .iter()
        .map(|r| {
            let n = &r.numeric;
            let unit = margin_unit(d, r);
            let s = scale(unit);
            Rule {
                section: &r.rule.rule.section.text,
                title: &r.rule.rule.title.value,
                finding: r.finding,
                decision: decision_words(r.decision),
                unit: unit.map(|u| u.symbol),
                value: n.value / s,
                limit: n.limit / s,
                proven_pass_line: pass_line(r) / s,
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
                            cylinders_moved: m.moved.len(),
                            unit: u.map(|u| u.symbol),
                            value: input.value / scale(u),
                            to_limit: reach_json(&m.limit, s, scale(u)),
                            to_proven_pass_line: m
                                .pass
                                .as_ref()
                                .map(|p| reach_json(p, s, scale(u))),
                        })
                    })
                    .collect(),
            }
        })
        .collect();
    let not_computed: Vec<NotComputedJson> = headroom
        .not_computed
        .iter()
        .map(|n| NotComputedJson {
            section: &n.rule.rule.section.text,
            title: &n.rule.rule.title.value,
            reason: &n.reason,
        })
        .collect();
    serde_json::json!({
        "file": d.path.display().to_string(),
        "engine": d.identity.engine,
        "class": class,
        "rules": rules,
        "not_computed": not_computed,
    })
}

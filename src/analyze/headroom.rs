//! Headroom: for each numeric rule, how far each input that feeds it may move before the rule's
//! limit is reached. The move is first estimated from the margin's exact sensitivity
//! coefficient (margin / ∂margin/∂input), then confirmed by re-evaluating the rule with the
//! input moved, refining by secant steps and, where those do not settle, by bisection.

use crate::check::model::{CheckedRulebook, Class, ClassRule};
use crate::evaluate::expr::Evaluator;
use crate::evaluate::finding::Finding;
use crate::evaluate::outcome::{Applies, Numeric};
use crate::load::InputId;
use crate::load::{Declaration, InputName};
use crate::parse::ast::DecisionRule;

/// How far one input may move.
#[derive(Clone, Debug)]
pub struct Move {
    /// The input.
    pub input: InputId,
    /// ∂margin/∂input, SI units.
    pub sensitivity: f64,
    /// The first-order estimate of the move to the limit, SI units of the input.
    pub estimate: f64,
    /// The move confirmed by re-evaluation, when one was found.
    pub confirmed: Option<f64>,
    /// The rule's tested value and its limit with the confirmed move made (they are equal; the
    /// limit moves too when it is computed from the engine, like an airflow demand).
    pub at_limit: Option<(f64, f64)>,
}

/// One numeric rule's headroom.
#[derive(Clone, Debug)]
pub struct RuleHeadroom<'a> {
    /// The rule.
    pub rule: &'a ClassRule,
    /// Its numeric finding as the engine stands.
    pub numeric: Numeric,
    /// The finding's words.
    pub finding: &'static str,
    /// Whether the value is inside the limit: a value exactly on it is inside a `<=` or `>=`
    /// limit and outside a `<` or `>` one (ISO 14253-1).
    pub inside: bool,
    /// How far each input may move.
    pub moves: Vec<Move>,
}

/// Iterations allowed to confirm one move.
const MAX_STEPS: usize = 80;

/// The headroom of every numeric rule of `class` that applies to the declaration.
pub fn headroom<'a>(
    rulebook: &'a CheckedRulebook,
    class: &'a Class,
    declaration: &Declaration,
    decision: Option<DecisionRule>,
) -> Vec<RuleHeadroom<'a>> {
    let (rules, _) = class.in_force(declaration.identity.date);
    let mut out = Vec::new();
    for r in rules {
        let outcome = Evaluator::new(rulebook, declaration).rule(r, decision);
        let Some(checked) = outcome.checked.filter(|c| c.is_finite()) else {
            continue;
        };
        let Some(numeric) = checked.numeric.clone() else {
            continue;
        };
        if outcome.applies == Applies::DoesNotHold {
            continue;
        }
        let moves = numeric
            .sensitivities
            .iter()
            .filter(|(id, c)| *c != 0.0 && movable(rulebook, declaration, *id))
            .map(|(id, c)| {
                confirm(
                    rulebook,
                    declaration,
                    r,
                    *id,
                    *c,
                    numeric.margin,
                    numeric.limit,
                )
            })
            .collect();
        out.push(RuleHeadroom {
            rule: r,
            numeric,
            finding: checked.finding.words(),
            inside: matches!(checked.finding, Finding::Pass | Finding::ConditionalPass),
            moves,
        });
    }
    out
}

/// Declared inputs other than counts can be moved; counts and rulebook literals cannot.
fn movable(rulebook: &CheckedRulebook, declaration: &Declaration, id: InputId) -> bool {
    match declaration.inputs.get(id as usize).map(|i| &i.name) {
        Some(InputName::Measured { measurement, .. }) => rulebook
            .measurements
            .get(*measurement)
            .is_some_and(|m| m.dimension_word != "count"),
        _ => false,
    }
}

/// The rule's margin, tested value and limit with input `id` moved by `delta` (SI units).
fn margin_after(
    rulebook: &CheckedRulebook,
    declaration: &Declaration,
    rule: &ClassRule,
    id: InputId,
    delta: f64,
) -> Option<(f64, f64, f64)> {
    let mut moved = declaration.clone();
    moved.inputs.get_mut(id as usize)?.value += delta;
    let checked = Evaluator::new(rulebook, &moved).test(&rule.test).ok()?;
    checked.numeric.map(|n| (n.margin, n.value, n.limit))
}

/// Finds the move that brings the margin to zero: secant steps from the linear estimate until
/// the limit is bracketed, then the Illinois variant of regula falsi, which cannot stall.
fn confirm(
    rulebook: &CheckedRulebook,
    declaration: &Declaration,
    rule: &ClassRule,
    id: InputId,
    sensitivity: f64,
    margin: f64,
    limit: f64,
) -> Move {
    let estimate = -margin / sensitivity;
    let mut result = Move {
        input: id,
        sensitivity,
        estimate,
        confirmed: None,
        at_limit: None,
    };
    let tolerance = 1e-13 * limit.abs().max(f64::MIN_POSITIVE);
    let g = |delta: f64| {
        margin_after(rulebook, declaration, rule, id, delta)
            .map(|(m, v, _)| (m, v))
            .filter(|(m, _)| m.is_finite())
    };
    let (mut a, mut ga) = (0.0, margin);
    let Some((mut gb, _)) = g(estimate) else {
        return result;
    };
    let mut b = estimate;
    let mut kept_a = false;
    for _ in 0..MAX_STEPS {
        if gb.abs() <= tolerance {
            result.confirmed = Some(b);
            result.at_limit = margin_after(rulebook, declaration, rule, id, b)
                .map(|(_, value, limit)| (value, limit));
            return result;
        }
        if gb == ga {
            return result;
        }
        let next = b - gb * (b - a) / (gb - ga);
        let Some((gn, _)) = g(next).filter(|_| next.is_finite()) else {
            return result;
        };
        if ga.signum() != gb.signum() {
            // bracketed: keep the end whose sign differs from the new point's
            if gn.signum() == gb.signum() {
                if kept_a {
                    ga *= 0.5; // Illinois: the same end kept twice counts for half
                }
                kept_a = true;
            } else {
                (a, ga) = (b, gb);
                kept_a = false;
            }
        } else {
            (a, ga) = (b, gb);
        }
        (b, gb) = (next, gn);
    }
    result
}

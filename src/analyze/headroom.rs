//! Headroom: for each numeric rule, how far each input that feeds it may move before the rule's
//! limit is reached. The move is first estimated from the margin's exact sensitivity
//! coefficient (margin / ∂margin/∂input), then confirmed by re-evaluating the rule with the
//! input moved, refining by secant steps and, where those do not settle, by bisection.
//!
//! Every step stays inside the domain of the rule's formulas: a step that leaves it (the
//! first-order estimate of a gasket thickness that overshoots below zero) is pulled back by
//! bisection toward the last point computed, so a limit that lies inside the domain is still
//! found, and a limit that lies beyond the domain's edge is reported as that edge: the input
//! may move that far, and no further, without reaching the limit.

use crate::check::model::{CheckedRulebook, Class, ClassRule};
use crate::evaluate::expr::Evaluator;
use crate::evaluate::finding::Finding;
use crate::evaluate::outcome::{Applies, Numeric};
use crate::evaluate::value::Unevaluated;
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
    /// When the limit lies beyond the domain of the rule's formulas: the move, SI units, at
    /// which the domain ends (a gasket thickness of zero), the input still inside the limit
    /// there (or still outside it).
    pub domain_ends: Option<f64>,
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

/// The rule evaluated with one input moved.
#[derive(Clone, Copy, Debug, PartialEq)]
enum Probe {
    /// Computed: the margin.
    At(f64),
    /// Not computed: the moved value is outside a formula's domain.
    Outside,
    /// Not computed for another reason, or not a finite number.
    Failed,
}

/// The rule's margin, tested value and limit with input `id` moved by `delta` (SI units);
/// `Err(true)` when the move leaves a formula's domain, `Err(false)` for any other failure.
fn margin_after(
    rulebook: &CheckedRulebook,
    declaration: &Declaration,
    rule: &ClassRule,
    id: InputId,
    delta: f64,
) -> Result<(f64, f64, f64), bool> {
    let mut moved = declaration.clone();
    moved.inputs.get_mut(id as usize).ok_or(false)?.value += delta;
    match Evaluator::new(rulebook, &moved).test(&rule.test) {
        Ok(checked) => checked
            .numeric
            .map(|n| (n.margin, n.value, n.limit))
            .filter(|(m, _, _)| m.is_finite())
            .ok_or(false),
        Err(Unevaluated::Domain(_)) => Err(true),
        Err(_) => Err(false),
    }
}

/// Whether margin `m` has reached or crossed the limit from the side of margin `from`.
fn crossed(from: f64, m: f64) -> bool {
    m == 0.0 || m.signum() != from.signum()
}

/// Where a step from a computed point `inside` toward `outside`, a move beyond the domain,
/// lands: the first point found by bisection that reaches the limit, or the domain's edge.
enum Landing {
    /// A computed point at or beyond the limit: the move and its margin.
    Crossed(f64, f64),
    /// The domain ends before the limit: the last move computed.
    Edge(f64),
    /// Nothing could be computed.
    Failed,
}

/// Bisection between a computed move `inside` (margin on the side of `from`) and a move
/// `outside` the domain, to within the float's resolution. A move that brings the input to
/// exactly zero is tried as the edge, where a formula needs a value of at least zero.
fn land(
    g: &dyn Fn(f64) -> Probe,
    (mut inside, mut outside): (f64, f64),
    from: f64,
    zero: f64,
) -> Landing {
    for _ in 0..MAX_BISECTIONS {
        let mid = 0.5 * (inside + outside);
        if mid == inside || mid == outside {
            break;
        }
        match g(mid) {
            Probe::At(m) if crossed(from, m) => return Landing::Crossed(mid, m),
            Probe::At(_) => inside = mid,
            Probe::Outside => outside = mid,
            Probe::Failed => return Landing::Failed,
        }
    }
    // the edge of an "at least zero" requirement is the input at zero, exactly
    let near = (zero - inside).abs() <= 1e-9 * zero.abs().max(f64::MIN_POSITIVE);
    match g(zero) {
        Probe::At(m) if near && !crossed(from, m) => Landing::Edge(zero),
        _ => Landing::Edge(inside),
    }
}

/// Bisections allowed to find the edge of a formula's domain: enough for a double's 53 bits
/// over any range a reading can have.
const MAX_BISECTIONS: usize = 200;

/// A step of the search: to a computed point, to the domain's edge, or nowhere.
enum Step {
    /// A computed move and its margin.
    To(f64, f64),
    /// The domain ends before the limit, at this move.
    Edge(f64),
    /// The search cannot go on.
    Stop,
}

/// One step of the search from the computed move `from` to `target`: the target itself when
/// it is computed, else, outside a bracket, where [`land`] lands between the two. Inside a
/// bracket both ends are computed, and a point between them outside the domain is a domain
/// this search does not follow.
fn advance(
    g: &dyn Fn(f64) -> Probe,
    (from, target): (f64, f64),
    margin: f64,
    zero: f64,
    bracketed: bool,
) -> Step {
    if !target.is_finite() {
        return Step::Stop;
    }
    match g(target) {
        Probe::At(m) => Step::To(target, m),
        Probe::Outside if !bracketed => match land(g, (from, target), margin, zero) {
            Landing::Crossed(x, m) => Step::To(x, m),
            Landing::Edge(edge) => Step::Edge(edge),
            Landing::Failed => Step::Stop,
        },
        Probe::Outside | Probe::Failed => Step::Stop,
    }
}

/// Finds the move that brings the margin to zero: secant steps from the linear estimate until
/// the limit is bracketed, then the Illinois variant of regula falsi, which cannot stall. A
/// step outside a formula's domain is pulled back inside it ([`advance`]); where the domain
/// ends before the limit, the move records where.
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
        domain_ends: None,
    };
    let tolerance = 1e-13 * limit.abs().max(f64::MIN_POSITIVE);
    let g = |delta: f64| match margin_after(rulebook, declaration, rule, id, delta) {
        Ok((m, _, _)) => Probe::At(m),
        Err(true) => Probe::Outside,
        Err(false) => Probe::Failed,
    };
    // the move that brings the input to zero, where many domains end
    let zero = declaration
        .inputs
        .get(id as usize)
        .map_or(f64::NAN, |i| -i.value);
    let mut stepped = |from: f64, target: f64, bracketed: bool| match advance(
        &g,
        (from, target),
        margin,
        zero,
        bracketed,
    ) {
        Step::To(x, m) => Some((x, m)),
        Step::Edge(edge) => {
            // an edge the way the estimate points is where the domain ends; the other way,
            // the secant has wandered, and nothing is said
            if edge.signum() == estimate.signum() {
                result.domain_ends = Some(edge);
            }
            None
        }
        Step::Stop => None,
    };
    let (mut a, mut ga) = (0.0, margin);
    let Some((mut b, mut gb)) = stepped(0.0, estimate, false) else {
        return result;
    };
    let mut kept_a = false;
    for _ in 0..MAX_STEPS {
        if gb.abs() <= tolerance {
            result.confirmed = Some(b);
            result.at_limit = margin_after(rulebook, declaration, rule, id, b)
                .ok()
                .map(|(_, value, limit)| (value, limit));
            return result;
        }
        if gb == ga {
            return result;
        }
        let next = b - gb * (b - a) / (gb - ga);
        let bracketed = ga.signum() != gb.signum();
        let Some((next, gn)) = stepped(b, next, bracketed) else {
            return result;
        };
        if bracketed {
            // keep the end whose sign differs from the new point's
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

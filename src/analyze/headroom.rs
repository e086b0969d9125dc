//! Headroom: for each numeric rule, how far each input that feeds it may move before the rule's
//! limit is reached, and before the proven-pass line under the decision rule in force (the
//! limit less U where a pass must be proven, the limit itself under simple acceptance; see
//! [`proven_pass_guard`]). A per-cylinder input moves one cylinder alone and, beside that,
//! every cylinder together by the same amount (an overbore, a milled head). The move is first
//! estimated from the margin's exact sensitivity coefficient (margin / ∂margin/∂input), then
//! confirmed by re-evaluating the rule with the input moved, refining by secant steps and,
//! where those do not settle, by bisection. Rules with nothing to move are listed with why.
//!
//! Every step stays inside the domain of the rule's formulas: a step that leaves it (the
//! first-order estimate of a gasket thickness that overshoots below zero) is pulled back by
//! bisection toward the last point computed, so a limit that lies inside the domain is still
//! found, and a limit that lies beyond the domain's edge is reported as that edge: the input
//! may move that far, and no further, without reaching the limit.

use crate::check::model::{CheckedRulebook, Class, ClassRule};
use crate::evaluate::expr::Evaluator;
use crate::evaluate::finding::{Finding, proven_pass_guard};
use crate::evaluate::outcome::{Applies, Numeric, Outcome};
use crate::evaluate::value::Unevaluated;
use crate::load::InputId;
use crate::load::{Declaration, InputName};
use crate::parse::ast::DecisionRule;

/// How far one line (the limit, or the proven-pass line) is reached by one move.
#[derive(Clone, Debug, Default)]
pub struct Reach {
    /// The first-order estimate of the move to the line, SI units of the input.
    pub estimate: f64,
    /// The move confirmed by re-evaluation, when one was found.
    pub confirmed: Option<f64>,
    /// The rule's numbers with the confirmed move made: the value tested lies on the line
    /// there (the limit moves too when it is computed from the engine, like an airflow
    /// demand, and U moves with the value).
    pub landed: Option<Landed>,
    /// When the line lies beyond the domain of the rule's formulas: the move, SI units, at
    /// which the domain ends (a gasket thickness of zero), the input still inside the line
    /// there (or still outside it).
    pub domain_ends: Option<f64>,
    /// Whether the engine as it stands is inside this line.
    pub inside: bool,
}

/// The rule's numbers where a move lands, SI units.
#[derive(Clone, Copy, Debug, PartialEq)]
pub struct Landed {
    /// The value tested.
    pub value: f64,
    /// The limit in force there.
    pub limit: f64,
    /// Its margin.
    pub margin: f64,
    /// The expanded uncertainty U of the margin there.
    pub expanded: f64,
}

/// How far one input, or every cylinder of a per-cylinder input together, may move.
#[derive(Clone, Debug)]
pub struct Move {
    /// The input (for a move of every cylinder, the first cylinder's).
    pub input: InputId,
    /// The inputs moved, by the same amount: `input` alone, or every cylinder of it.
    pub moved: Vec<InputId>,
    /// ∂margin/∂(the common move), SI units: the sum over the inputs moved.
    pub sensitivity: f64,
    /// The move to the limit.
    pub limit: Reach,
    /// The move to the proven-pass line, when it is not the limit itself (simple acceptance,
    /// or no uncertainty).
    pub pass: Option<Reach>,
}

impl Move {
    /// True for a move of every cylinder together.
    pub fn every_cylinder(&self) -> bool {
        self.moved.len() > 1
    }
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
    /// The decision rule in force for it (`--as`, else the rule's own, else the rulebook's).
    pub decision: DecisionRule,
    /// How far inside the limit the proven-pass line lies, in multiples of U.
    pub guard: f64,
    /// Whether the value is inside the limit: a value exactly on it is inside a `<=` or `>=`
    /// limit and outside a `<` or `>` one (ISO 14253-1).
    pub inside: bool,
    /// How far each input may move.
    pub moves: Vec<Move>,
}

/// A rule of the class whose headroom could not be computed, and why.
#[derive(Clone, Debug)]
pub struct NotComputed<'a> {
    /// The rule.
    pub rule: &'a ClassRule,
    /// Why, in words: what is missing, or why there is no margin to move.
    pub reason: String,
}

/// The headroom of an engine: every rule of its class, computed or said why not.
#[derive(Clone, Debug, Default)]
pub struct Headroom<'a> {
    /// The numeric rules, with their moves.
    pub rules: Vec<RuleHeadroom<'a>>,
    /// The rules with no headroom, in section order.
    pub not_computed: Vec<NotComputed<'a>>,
}

/// Iterations allowed to confirm one move.
const MAX_STEPS: usize = 80;

/// The headroom of every rule of `class` for the declaration: the numeric rules that apply,
/// with their moves, and every other rule with the reason it has none.
pub fn headroom<'a>(
    rulebook: &'a CheckedRulebook,
    class: &'a Class,
    declaration: &Declaration,
    decision: Option<DecisionRule>,
) -> Headroom<'a> {
    let (rules, _) = class.in_force(declaration.identity.date);
    let mut out = Headroom::default();
    for r in rules {
        let outcome = Evaluator::new(rulebook, declaration).rule(r, decision);
        match numeric_of(&outcome) {
            Ok((numeric, finding)) => {
                let (decision, found) = (outcome.decision, (numeric, finding));
                out.rules
                    .push(rule_headroom(rulebook, declaration, r, decision, found));
            }
            Err(reason) => out.not_computed.push(NotComputed { rule: r, reason }),
        }
    }
    out
}

/// The numeric finding of an outcome, or why it has none, in words.
fn numeric_of(outcome: &Outcome) -> Result<(Numeric, Finding), String> {
    if outcome.applies == Applies::DoesNotHold {
        return Err("not applicable: its condition does not hold".into());
    }
    if !outcome.missing.is_empty() {
        return Err(format!("missing {}", outcome.missing.join(", ")));
    }
    let gauged = outcome.checked.as_ref().is_some_and(|c| c.gauge.is_some());
    if gauged || !outcome.gauge_gaps.is_empty() {
        return Err(
            "read from go/no-go gauge results, which give bounds, not a value: no margin to move"
                .into(),
        );
    }
    if let Some(b) = outcome.outside_domain.first() {
        let cylinder = b
            .cylinder
            .map(|c| format!(" of cylinder {c}"))
            .unwrap_or_default();
        return Err(format!(
            "the {}{cylinder} is outside the domain of `{}`, which needs {}",
            b.quantity, b.by, b.needs
        ));
    }
    if let Some(e) = &outcome.error {
        return Err(format!("not evaluated: {e}"));
    }
    let Some(checked) = outcome.checked.as_ref().filter(|c| c.is_finite()) else {
        return Err(match outcome.applies {
            Applies::NotMeasured => {
                "not applicable: an optional measurement it reads is not given".into()
            }
            Applies::NotComputed => "its condition could not be computed".into(),
            _ => "its value is not a finite number".into(),
        });
    };
    match &checked.numeric {
        Some(n) => Ok((n.clone(), checked.finding)),
        None => {
            Err("not a numeric limit (a text, list or equality test): no margin to move".into())
        }
    }
}

/// The headroom of one numeric rule: each input alone, then each per-cylinder input with
/// every cylinder moved together.
fn rule_headroom<'a>(
    rulebook: &CheckedRulebook,
    declaration: &Declaration,
    rule: &'a ClassRule,
    decision: DecisionRule,
    (numeric, finding): (Numeric, Finding),
) -> RuleHeadroom<'a> {
    let guard = if numeric.expanded > 0.0 {
        proven_pass_guard(decision)
    } else {
        0.0
    };
    let search = Search {
        rulebook,
        declaration,
        rule,
        margin: numeric.margin,
        expanded: numeric.expanded,
        limit: numeric.limit,
        inside: matches!(finding, Finding::Pass | Finding::ConditionalPass),
    };
    let movable_inputs: Vec<(InputId, f64)> = numeric
        .sensitivities
        .iter()
        .filter(|(id, c)| *c != 0.0 && movable(rulebook, declaration, *id))
        .copied()
        .collect();
    let mut moves: Vec<Move> = movable_inputs
        .iter()
        .map(|&(id, c)| search.movement(vec![id], c, guard))
        .collect();
    let mut seen = Vec::new();
    for &(id, _) in &movable_inputs {
        let Some(measurement) = per_cylinder(declaration, id) else {
            continue;
        };
        if seen.contains(&measurement) {
            continue;
        }
        seen.push(measurement);
        let cylinders = cylinders_of(declaration, measurement);
        if cylinders.len() < 2 {
            continue;
        }
        let c: f64 = numeric
            .sensitivities
            .iter()
            .filter(|(i, _)| cylinders.contains(i))
            .map(|(_, c)| c)
            .sum();
        if c != 0.0 {
            moves.push(search.movement(cylinders, c, guard));
        }
    }
    RuleHeadroom {
        rule,
        numeric,
        finding: finding.words(),
        decision,
        guard,
        inside: matches!(finding, Finding::Pass | Finding::ConditionalPass),
        moves,
    }
}

/// The measurement of a per-cylinder input.
fn per_cylinder(declaration: &Declaration, id: InputId) -> Option<usize> {
    match declaration.inputs.get(id as usize).map(|i| &i.name) {
        Some(InputName::Measured {
            measurement,
            cylinder: Some(_),
            ..
        }) => Some(*measurement),
        _ => None,
    }
}

/// Every cylinder's input of a per-cylinder measurement, in cylinder order.
fn cylinders_of(declaration: &Declaration, measurement: usize) -> Vec<InputId> {
    (0..declaration.inputs.len())
        .filter(|&i| per_cylinder(declaration, i as InputId) == Some(measurement))
        .map(|i| i as InputId)
        .collect()
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
    /// Computed: the distance inside the line being sought.
    At(f64),
    /// Not computed: the moved value is outside a formula's domain.
    Outside,
    /// Not computed for another reason, or not a finite number.
    Failed,
}

/// One rule of one engine, searched for the moves that reach its lines.
struct Search<'r, 'd> {
    rulebook: &'r CheckedRulebook,
    declaration: &'d Declaration,
    rule: &'r ClassRule,
    margin: f64,
    expanded: f64,
    limit: f64,
    inside: bool,
}

impl Search<'_, '_> {
    /// The move of `moved` together to the limit and to the proven-pass line `guard` U
    /// inside it.
    fn movement(&self, moved: Vec<InputId>, sensitivity: f64, guard: f64) -> Move {
        let limit = self.reach(&moved, sensitivity, 0.0, self.inside);
        let pass = (guard > 0.0).then(|| {
            let proven = self.margin - guard * self.expanded >= 0.0;
            self.reach(&moved, sensitivity, guard, proven)
        });
        Move {
            input: moved.first().copied().unwrap_or_default(),
            moved,
            sensitivity,
            limit,
            pass,
        }
    }

    /// The rule's numbers with every input of `moved` moved by `delta` (SI units);
    /// `Err(true)` when the move leaves a formula's domain, `Err(false)` for any other
    /// failure.
    fn after(&self, moved: &[InputId], delta: f64) -> Result<Landed, bool> {
        let mut engine = self.declaration.clone();
        for id in moved {
            engine.inputs.get_mut(*id as usize).ok_or(false)?.value += delta;
        }
        match Evaluator::new(self.rulebook, &engine).test(&self.rule.test) {
            Ok(checked) => checked
                .numeric
                .map(|n| Landed {
                    value: n.value,
                    limit: n.limit,
                    margin: n.margin,
                    expanded: n.expanded,
                })
                .filter(|l| l.margin.is_finite() && l.expanded.is_finite())
                .ok_or(false),
            Err(Unevaluated::Domain(_)) => Err(true),
            Err(_) => Err(false),
        }
    }

    /// Finds the move that brings the distance inside the line (margin − guard·U) to zero.
    fn reach(&self, moved: &[InputId], sensitivity: f64, guard: f64, inside: bool) -> Reach {
        let start = self.margin - guard * self.expanded;
        let g = |delta: f64| match self.after(moved, delta) {
            Ok(l) => Probe::At(l.margin - guard * l.expanded),
            Err(true) => Probe::Outside,
            Err(false) => Probe::Failed,
        };
        // the move that brings the smallest of the inputs to zero, where many domains end
        let zero = moved
            .iter()
            .filter_map(|id| self.declaration.inputs.get(*id as usize))
            .map(|i| -i.value)
            .fold(f64::NAN, f64::max);
        let mut result = Reach {
            estimate: -start / sensitivity,
            inside,
            ..Reach::default()
        };
        let tolerance = 1e-13 * self.limit.abs().max(f64::MIN_POSITIVE);
        let found = confirm(&g, start, result.estimate, zero, tolerance);
        match found {
            Found::At(x) => {
                result.confirmed = Some(x);
                result.landed = self.after(moved, x).ok();
            }
            Found::Edge(edge) => result.domain_ends = Some(edge),
            Found::Nothing => {}
        }
        result
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

/// What the search for one line found.
enum Found {
    /// The move that reaches it.
    At(f64),
    /// The domain ends before the line, at this move.
    Edge(f64),
    /// Nothing: the line is not reached by this move.
    Nothing,
}

/// Finds the move that brings `g` (the distance inside a line, `start` before any move) to
/// zero: secant steps from the linear estimate until the line is bracketed, then the Illinois
/// variant of regula falsi, which cannot stall. A step outside a formula's domain is pulled
/// back inside it ([`advance`]); where the domain ends before the line, the edge is found.
fn confirm(
    g: &dyn Fn(f64) -> Probe,
    start: f64,
    estimate: f64,
    zero: f64,
    tolerance: f64,
) -> Found {
    let mut edge = None;
    let mut stepped = |from: f64, target: f64, bracketed: bool| match advance(
        g,
        (from, target),
        start,
        zero,
        bracketed,
    ) {
        Step::To(x, m) => Some((x, m)),
        Step::Edge(e) => {
            // an edge the way the estimate points is where the domain ends; the other way,
            // the secant has wandered, and nothing is said
            if e.signum() == estimate.signum() {
                edge = Some(e);
            }
            None
        }
        Step::Stop => None,
    };
    let (mut a, mut ga) = (0.0, start);
    let (mut b, mut gb) = if start.abs() <= tolerance {
        (0.0, start)
    } else {
        match stepped(0.0, estimate, false) {
            Some(p) => p,
            None => return edge.map_or(Found::Nothing, Found::Edge),
        }
    };
    let mut kept_a = false;
    for _ in 0..MAX_STEPS {
        if gb.abs() <= tolerance {
            return Found::At(b);
        }
        if gb == ga {
            break;
        }
        let next = b - gb * (b - a) / (gb - ga);
        let bracketed = ga.signum() != gb.signum();
        let Some((next, gn)) = stepped(b, next, bracketed) else {
            break;
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
    edge.map_or(Found::Nothing, Found::Edge)
}

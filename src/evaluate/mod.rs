//! Evaluation: a checked rulebook's class applied to a loaded declaration, rule by rule, as a
//! fold over the resolved tree the checker made ([`expr`]), with exact sensitivities
//! ([`dual`]), findings and verdicts ([`finding`]), the probability that every cylinder
//! conforms ([`joint`]), a Monte Carlo check of the propagation ([`montecarlo`]), and the data
//! a report renders ([`outcome`]). The built-in formulas are in the checker's one table, `check::builtins`.

pub mod coverage;
pub mod dual;
pub mod exact;
pub mod expr;
pub mod finding;
pub mod gauge;
pub mod joint;
pub mod montecarlo;
pub mod outcome;
mod rule;
pub mod value;

use crate::check::model::{CheckedRulebook, Class, ClassRule};
use crate::load::Declaration;
use crate::parse::ast::DecisionRule;
use expr::Evaluator;
use outcome::{EngineReport, Outcome, Scope};

/// Checks one declaration against one class, with the rules in force on the declaration's date
/// (the edition's when it has none). `decision` (`--as`) overrides the rulebook's rule and
/// every rule's own.
pub fn check_engine<'a>(
    rulebook: &'a CheckedRulebook,
    class: &'a Class,
    declaration: &'a Declaration,
    decision: Option<DecisionRule>,
) -> EngineReport<'a> {
    check_engine_scoped(rulebook, class, declaration, decision, None)
}

/// As [`check_engine`], with `sections` (`check --sections`) as the inspection's scope in
/// place of the declaration's; rules outside the scope in force are not evaluated.
pub fn check_engine_scoped<'a>(
    rulebook: &'a CheckedRulebook,
    class: &'a Class,
    declaration: &'a Declaration,
    decision: Option<DecisionRule>,
    sections: Option<&[String]>,
) -> EngineReport<'a> {
    let (rules, bulletins) = class.in_force(declaration.identity.date);
    let scope = Scope::chosen(sections, declaration);
    evaluate(
        rulebook,
        class,
        rules,
        bulletins,
        declaration,
        decision,
        scope,
    )
}

/// Checks one declaration against the given rules of a class, whatever its date, within the
/// declaration's own scope.
pub fn check_against<'a>(
    rulebook: &'a CheckedRulebook,
    class: &'a Class,
    rules: &'a [ClassRule],
    bulletins: &'a [String],
    declaration: &'a Declaration,
    decision: Option<DecisionRule>,
) -> EngineReport<'a> {
    let scope = Scope::chosen(None, declaration);
    evaluate(
        rulebook,
        class,
        rules,
        bulletins,
        declaration,
        decision,
        scope,
    )
}

/// Evaluates every rule in `scope` (all of them when `None`); the others are not in scope.
fn evaluate<'a>(
    rulebook: &'a CheckedRulebook,
    class: &'a Class,
    rules: &'a [ClassRule],
    bulletins: &'a [String],
    declaration: &'a Declaration,
    decision: Option<DecisionRule>,
    scope: Option<Scope>,
) -> EngineReport<'a> {
    let rule = decision.unwrap_or(rulebook.decision);
    let mut evaluator = Evaluator::new(rulebook, declaration);
    let outcomes = rules
        .iter()
        .map(|r| match &scope {
            Some(s) if !s.covers(&r.rule.section.text) => {
                Outcome::not_in_scope(r, r.decision_in_force(decision, rulebook.decision))
            }
            _ => evaluator.rule(r, decision),
        })
        .collect();
    EngineReport {
        rulebook,
        class,
        declaration,
        bulletins,
        rulebook_inputs: evaluator.rulebook_inputs,
        decision: rule,
        decision_overridden: decision.is_some(),
        outcomes,
        produced: None,
        scope,
    }
}

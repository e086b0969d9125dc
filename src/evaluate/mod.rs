//! Evaluation: a checked rulebook's class applied to a loaded declaration, rule by rule, with
//! exact sensitivities ([`dual`]), the built-in [`formulas`], findings and verdicts
//! ([`finding`]), and the data a report renders ([`outcome`]).

pub mod dual;
pub mod expr;
pub mod finding;
pub mod formulas;
pub mod outcome;
mod rule;
pub mod value;

pub use rule::COVERAGE;

use crate::check::model::{CheckedRulebook, Class};
use crate::load::Declaration;
use crate::parse::ast::DecisionRule;
use expr::Evaluator;
use outcome::EngineReport;

/// Checks one declaration against one class. `decision` overrides the rulebook's rule.
pub fn check_engine(
    rulebook: &CheckedRulebook,
    class: &Class,
    declaration: &Declaration,
    decision: Option<DecisionRule>,
) -> EngineReport {
    let rule = decision.unwrap_or(rulebook.decision);
    let mut evaluator = Evaluator::new(rulebook, declaration);
    let outcomes = class
        .rules
        .iter()
        .map(|r| evaluator.rule(r, rule))
        .collect();
    EngineReport {
        file: declaration.path.display().to_string(),
        identity: declaration.identity.clone(),
        series: rulebook.series.clone(),
        edition: rulebook.edition.clone(),
        class: class.name.clone(),
        class_title: class.title.clone(),
        decision: rule,
        decision_overridden: decision.is_some(),
        outcomes,
    }
}

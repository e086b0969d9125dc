//! What a change of rules does to a field of engines: every declaration checked under both
//! sides, each side an edition taken on a date ([`When`]: as published, with the bulletins in
//! force by a date, or with every bulletin), whatever date the declaration carries, since the
//! question is what the change does to these engines; and the rules whose verdict differs,
//! with the margin under each.

use crate::analyze::compare::When;
use crate::check::model::CheckedRulebook;
use crate::evaluate::check_against;
use crate::evaluate::finding::{Finding, Verdict};
use crate::evaluate::outcome::{EngineReport, EngineResult, Outcome};
use crate::load::Declaration;
use crate::parse::ast::DecisionRule;
use crate::units::Unit;

/// One rule's call under one edition.
#[derive(Clone, Debug)]
pub struct Call {
    /// The verdict.
    pub verdict: Verdict,
    /// The finding, when the rule was checked.
    pub finding: Option<Finding>,
    /// The margin to the limit (SI) and the unit to show it in.
    pub margin: Option<(f64, Option<&'static Unit>)>,
    /// The margin's expanded uncertainty U (SI), for the digits it is shown with.
    pub margin_uncertainty: Option<f64>,
}

/// A rule whose verdict differs between the editions, for one engine.
#[derive(Clone, Debug)]
pub struct Changed {
    /// The engine (or the file when the declaration names none).
    pub engine: String,
    /// The class.
    pub class: String,
    /// The rule's section number.
    pub section: String,
    /// The rule's title.
    pub title: String,
    /// Under the old edition (`None`: the rule is not in it).
    pub old: Option<Call>,
    /// Under the new edition.
    pub new: Option<Call>,
}

impl Changed {
    /// Illegal on the new side and not on the old.
    pub fn newly_illegal(&self) -> bool {
        let illegal = |c: &Option<Call>| c.as_ref().is_some_and(|c| c.verdict == Verdict::Illegal);
        illegal(&self.new) && !illegal(&self.old)
    }
}

/// The impact of a change of edition on a field.
#[derive(Clone, Debug, Default)]
pub struct Impact {
    /// Engines compared.
    pub engines: usize,
    /// Rules whose verdict differs.
    pub changed: Vec<Changed>,
    /// Rules that are conditional under the new edition and were not under the old.
    pub newly_uncertain: Vec<Changed>,
    /// Engines whose overall result differs: engine, class, old and new result words.
    pub results: Vec<(String, String, &'static str, &'static str)>,
}

fn call(o: &Outcome) -> Call {
    Call {
        verdict: o.verdict,
        finding: o.checked.as_ref().map(|c| c.finding),
        margin: o
            .checked
            .as_ref()
            .and_then(|c| c.numeric.as_ref())
            .map(|n| (n.margin, n.unit)),
        margin_uncertainty: o
            .checked
            .as_ref()
            .and_then(|c| c.numeric.as_ref())
            .map(|n| n.expanded),
    }
}

fn result_word(r: &EngineReport) -> &'static str {
    match r.result() {
        EngineResult::Illegal => "illegal",
        EngineResult::NotAllClear => "not all clear",
        EngineResult::Legal => "legal",
    }
}

/// Compares one engine's reports under the two editions into `impact`.
fn compare_engine(old: &EngineReport, new: &EngineReport, impact: &mut Impact) {
    let engine = new
        .declaration
        .identity
        .engine
        .clone()
        .unwrap_or_else(|| new.declaration.path.display().to_string());
    let class = new.class.name.clone();
    let row = |section: &str, title: &str, old: Option<Call>, new: Option<Call>| Changed {
        engine: engine.clone(),
        class: class.clone(),
        section: section.to_string(),
        title: title.to_string(),
        old,
        new,
    };
    for n in &new.outcomes {
        let o = old.outcomes.iter().find(|o| o.section() == n.section());
        let (old_call, new_call) = (o.map(call), call(n));
        if old_call.as_ref().map(|c| c.verdict) != Some(new_call.verdict) {
            impact.changed.push(row(
                n.section(),
                n.title(),
                old_call.clone(),
                Some(new_call.clone()),
            ));
        }
        let conditional = |c: &Call| c.finding.is_some_and(Finding::is_conditional);
        if conditional(&new_call) && !old_call.as_ref().is_some_and(conditional) {
            impact
                .newly_uncertain
                .push(row(n.section(), n.title(), old_call, Some(new_call)));
        }
    }
    for o in old
        .outcomes
        .iter()
        .filter(|o| !new.outcomes.iter().any(|n| n.section() == o.section()))
    {
        impact
            .changed
            .push(row(o.section(), o.title(), Some(call(o)), None));
    }
    let (was, is) = (result_word(old), result_word(new));
    if was != is {
        impact.results.push((engine, class, was, is));
    }
}

/// One engine to compare: its declaration as loaded under each edition, and its class.
pub struct Engine<'a> {
    /// Loaded against the old edition's schema.
    pub old: &'a Declaration,
    /// Loaded against the new edition's schema.
    pub new: &'a Declaration,
    /// The class name, which both editions have.
    pub class: &'a str,
}

/// Checks every engine under both sides (each edition taken as its [`When`] says) and
/// collects what differs.
pub fn impact(
    (old, old_when): (&CheckedRulebook, When),
    (new, new_when): (&CheckedRulebook, When),
    engines: &[Engine],
    decision: Option<DecisionRule>,
) -> Impact {
    let mut out = Impact::default();
    for e in engines {
        let (Some(old_class), Some(new_class)) = (old.class(e.class), new.class(e.class)) else {
            continue;
        };
        let (old_rules, old_bulletins) = old_when.rules(old_class);
        let (new_rules, new_bulletins) = new_when.rules(new_class);
        let was = check_against(old, old_class, old_rules, old_bulletins, e.old, decision);
        let is = check_against(new, new_class, new_rules, new_bulletins, e.new, decision);
        out.engines += 1;
        compare_engine(&was, &is, &mut out);
    }
    out
}

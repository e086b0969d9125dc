//! What evaluation found for each rule: the data every report renders. Numbers are in SI
//! units; each carries the unit it should be shown in.

use super::finding::{Finding, Verdict};
use crate::check::model::Origin;
use crate::load::UncertaintySource;
use crate::parse::ast::DecisionRule;
use crate::units::Unit;

/// Whether a rule's condition holds.
#[derive(Clone, Copy, Debug, PartialEq, Eq, serde::Serialize)]
#[serde(rename_all = "snake_case")]
pub enum Applies {
    /// The rule has no condition.
    Always,
    /// Its condition holds.
    Holds,
    /// Its condition lies inside the uncertainty band: it may or may not hold.
    Uncertain,
    /// Its condition does not hold.
    DoesNotHold,
}

/// A numeric limit checked.
#[derive(Clone, Debug, PartialEq)]
pub struct Numeric {
    /// The measured or derived value tested (at the deciding cylinder).
    pub value: f64,
    /// The limit in force, allowance included; for `between`, the nearer limit.
    pub limit: f64,
    /// Distance inside the limit (negative outside).
    pub margin: f64,
    /// Expanded uncertainty of the margin, U = k·u.
    pub expanded: f64,
    /// The coverage factor.
    pub k: f64,
    /// Probability of conformance.
    pub probability: f64,
    /// The unit to show these in (`None`: a plain number).
    pub unit: Option<&'static Unit>,
    /// The deciding cylinder (1-based), for per-cylinder values.
    pub cylinder: Option<usize>,
    /// Both limits of a `between`, allowance included.
    pub range: Option<(f64, f64)>,
}

/// What was found for one rule's test.
#[derive(Clone, Debug, PartialEq)]
pub struct Checked {
    /// The finding.
    pub finding: Finding,
    /// For numeric limits, the numbers behind it.
    pub numeric: Option<Numeric>,
    /// For text, membership and equality tests, the value seen.
    pub observed: Option<String>,
}

/// One line of a rule's trace.
#[derive(Clone, Debug, PartialEq)]
pub enum Trace {
    /// A measured input (or a rulebook literal with a stated uncertainty).
    Input {
        /// `bore[3]`, `stroke`, or the literal.
        label: String,
        /// Value in SI units.
        value: f64,
        /// Standard uncertainty in SI units.
        standard_uncertainty: f64,
        /// The unit it was written in.
        unit: Option<&'static Unit>,
        /// The value as written, when known.
        written: Option<String>,
        /// Where the uncertainty comes from.
        source: UncertaintySource,
        /// Where it was written.
        origin: String,
    },
    /// A text measurement.
    Text {
        /// The measurement.
        label: String,
        /// Its value.
        value: String,
        /// Where it was written.
        origin: String,
    },
    /// A derived value and how it is computed.
    Derived {
        /// Its name.
        name: String,
        /// The formula as the rulebook writes it.
        formula: String,
        /// Its value(s) in SI units, one per cylinder where per cylinder.
        values: Vec<f64>,
        /// The combined standard uncertainty of each.
        uncertainties: Vec<f64>,
        /// The unit to show it in.
        unit: Option<&'static Unit>,
    },
    /// A measurement the declaration does not give.
    Missing {
        /// The measurement.
        name: String,
    },
}

/// One rule's outcome.
#[derive(Clone, Debug, PartialEq)]
pub struct Outcome {
    /// Section number.
    pub section: String,
    /// Title.
    pub title: String,
    /// Penalty class.
    pub penalty: Option<String>,
    /// Note.
    pub note: Option<String>,
    /// Where the rule comes from.
    pub origin: Origin,
    /// The requirement, in the rulebook's canonical words.
    pub requirement: String,
    /// Its conditions, likewise.
    pub conditions: Vec<String>,
    /// Whether its conditions hold.
    pub applies: Applies,
    /// The verdict under the decision rule in force.
    pub verdict: Verdict,
    /// What was found, when the rule was checked.
    pub checked: Option<Checked>,
    /// Measurements it needs that are missing.
    pub missing: Vec<String>,
    /// Every input and derived value it reads.
    pub trace: Vec<Trace>,
}

impl Outcome {
    /// True when the call is not certain: a conditional finding, an uncertain condition, or a
    /// rule not checked.
    pub fn is_uncertain(&self) -> bool {
        self.verdict == Verdict::NotChecked
            || self.applies == Applies::Uncertain
            || self
                .checked
                .as_ref()
                .is_some_and(|c| c.finding.is_conditional())
    }
}

/// One engine checked against one class.
#[derive(Clone, Debug)]
pub struct EngineReport {
    /// The declaration's file.
    pub file: String,
    /// Who and what.
    pub identity: crate::load::Identity,
    /// Series, edition and class.
    pub series: String,
    /// The edition.
    pub edition: String,
    /// The class checked against.
    pub class: String,
    /// The class's title.
    pub class_title: Option<String>,
    /// The decision rule applied.
    pub decision: DecisionRule,
    /// Whether it came from the command line rather than the rulebook.
    pub decision_overridden: bool,
    /// Each rule, in rulebook order.
    pub outcomes: Vec<Outcome>,
}

impl EngineReport {
    /// How many rules got each verdict: legal, illegal, not checked, not applicable.
    pub fn counts(&self) -> [usize; 4] {
        let count = |v: Verdict| self.outcomes.iter().filter(|o| o.verdict == v).count();
        [
            count(Verdict::Legal),
            count(Verdict::Illegal),
            count(Verdict::NotChecked),
            count(Verdict::NotApplicable),
        ]
    }

    /// The exit status this report calls for.
    pub fn exit(&self) -> crate::exit::Exit {
        if self.outcomes.iter().any(|o| o.verdict == Verdict::Illegal) {
            crate::exit::Exit::Illegal
        } else if self.outcomes.iter().any(Outcome::is_uncertain) {
            crate::exit::Exit::Uncertain
        } else {
            crate::exit::Exit::Clean
        }
    }

    /// Conditional findings (any verdict).
    pub fn conditional_count(&self) -> usize {
        self.outcomes
            .iter()
            .filter(|o| {
                o.checked
                    .as_ref()
                    .is_some_and(|c| c.finding.is_conditional())
                    || o.applies == Applies::Uncertain
            })
            .count()
    }
}

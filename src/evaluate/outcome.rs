//! What evaluation found for each rule: the data every report renders. Numbers are in SI
//! units; each carries the unit it should be shown in.

use super::finding::{Finding, Verdict};
use super::gauge::SideFinding;
use super::joint::AllCylinders;
use super::montecarlo::MonteCarlo;
use super::value::{Breach, Evaluated, Unevaluated};
use crate::check::model::{CheckedRulebook, Class, ClassRule, Derived, NearMatch};
use crate::load::InputId;
use crate::load::gauge::GaugeResult;
use crate::load::{Declaration, Input, Place};
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
    /// It reads an `optional` measurement the declaration does not give, and no required
    /// one is missing: it does not apply to this engine.
    NotMeasured,
    /// Its condition could not be computed (a measurement it reads is missing, or a value
    /// outside its domain): whether the rule applies is not known.
    NotComputed,
    /// The rule's section lies outside the inspection's scope: its condition was not
    /// evaluated.
    NotInScope,
}

/// Where an inspection's scope came from.
#[derive(Clone, Copy, Debug, PartialEq, Eq, serde::Serialize)]
#[serde(rename_all = "snake_case")]
pub enum ScopeFrom {
    /// The declaration's `inspection.scope`.
    Declaration,
    /// `check --sections`, which wins over the declaration.
    CommandLine,
}

impl ScopeFrom {
    /// `from the declaration`, `from the command line`.
    pub fn words(self) -> &'static str {
        match self {
            ScopeFrom::Declaration => "from the declaration",
            ScopeFrom::CommandLine => "from the command line",
        }
    }
}

/// The sections an inspection covered; a rule outside them is not in scope.
#[derive(Clone, Debug, PartialEq, Eq)]
pub struct Scope {
    /// The section numbers, as written (`5`, `6.2`).
    pub sections: Vec<String>,
    /// Where they came from.
    pub from: ScopeFrom,
}

impl Scope {
    /// The scope in force: `command_line` (`--sections`) when given, else the declaration's;
    /// `None` is every rule of the class.
    pub fn chosen(command_line: Option<&[String]>, declaration: &Declaration) -> Option<Scope> {
        let from_declaration = || {
            let sections = declaration.inspection.scope.clone()?;
            Some(Scope {
                sections,
                from: ScopeFrom::Declaration,
            })
        };
        match command_line {
            Some(sections) => Some(Scope {
                sections: sections.to_vec(),
                from: ScopeFrom::CommandLine,
            }),
            None => from_declaration(),
        }
    }

    /// Whether a rule's section lies in the scope ([`crate::load::inspection::in_scope`]).
    pub fn covers(&self, section: &str) -> bool {
        crate::load::inspection::in_scope(&self.sections, section)
    }

    /// The scope's sections that cover none of `sections` (a rule's section numbers): a scope
    /// that names no rule inspects nothing there, which is a mistake in the input.
    pub fn unmatched(&self, sections: &[&str]) -> Vec<&str> {
        self.sections
            .iter()
            .filter(|s| {
                let one = std::slice::from_ref(*s);
                !sections
                    .iter()
                    .any(|section| crate::load::inspection::in_scope(one, section))
            })
            .map(String::as_str)
            .collect()
    }

    /// `5, 6.2`.
    pub fn words(&self) -> String {
        self.sections.join(", ")
    }
}

/// A numeric limit checked.
#[derive(Clone, Debug, PartialEq)]
pub struct Numeric {
    /// The measured or derived value tested (at the deciding cylinder).
    pub value: f64,
    /// The margin's sensitivity coefficients ∂margin/∂input, SI units.
    pub sensitivities: Vec<(InputId, f64)>,
    /// The limit in force, allowance included; for `between`, the nearer limit.
    pub limit: f64,
    /// Distance inside the limit (negative outside).
    pub margin: f64,
    /// Expanded uncertainty of the margin, U = k·u.
    pub expanded: f64,
    /// The coverage factor.
    pub k: f64,
    /// The effective degrees of freedom of the margin's uncertainty (Welch–Satterthwaite,
    /// GUM G.4); infinite when every component is of Type B.
    pub degrees_of_freedom: f64,
    /// Probability of conformance.
    pub probability: f64,
    /// The unit to show these in (`None`: a plain number).
    pub unit: Option<&'static Unit>,
    /// The deciding cylinder (1-based), for per-cylinder values.
    pub cylinder: Option<usize>,
    /// Both limits of a `between`, allowance included.
    pub range: Option<(f64, f64)>,
    /// For a limit on every cylinder, the probability that all cylinders conform (the finding
    /// and `probability` are the closest cylinder's).
    pub all_cylinders: Option<AllCylinders>,
    /// The Monte Carlo check of this rule, when one was asked for.
    pub monte_carlo: Option<MonteCarlo>,
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
    /// For a membership test, the exact entry of the list a value not on it nearly matches:
    /// the value is still not on the list, the finding stands, and the report asks for the
    /// tag to be read again.
    pub near_match: Option<NearMatch>,
    /// For a limit on a measurement recorded as go/no-go gauge results, what the results
    /// prove about each side of it.
    pub gauge: Option<GaugeCall>,
}

/// A limit decided from gauge results ([`super::gauge`]).
#[derive(Clone, Debug, PartialEq)]
pub struct GaugeCall {
    /// The measurement, by position in the schema.
    pub measurement: usize,
    /// Each side of the limit with its finding: one, or two for a range (low first).
    pub sides: Vec<SideFinding>,
    /// The unit to show the limit in: the gauge sizes' own.
    pub unit: Option<&'static Unit>,
}

/// Why a rule on a gauged measurement cannot be decided from its gauge results.
#[derive(Clone, Copy, Debug, PartialEq, Eq, serde::Serialize)]
#[serde(rename_all = "snake_case")]
pub enum GaugeWhy {
    /// The measurement is read inside an expression, or as a limit: that needs its value.
    NeedsAValue,
    /// `==` or `!=`: a bound never proves a value equal to another.
    Equality,
    /// The limit carries an uncertainty of its own, or differs by cylinder.
    UnsureLimit,
    /// The results leave the rule open, and simple acceptance decides on a measured value.
    OpenUnderSimpleAcceptance,
}

/// A gauged measurement a rule could not be decided from, and why.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub struct GaugeGap {
    /// The measurement, by position in the schema.
    pub measurement: usize,
    /// Why.
    pub why: GaugeWhy,
}

impl Checked {
    /// False when a number behind the finding is not finite (a division by zero, the root of
    /// a negative number): such a finding decides nothing.
    pub fn is_finite(&self) -> bool {
        self.numeric.as_ref().is_none_or(|n| {
            n.value.is_finite()
                && n.limit.is_finite()
                && n.margin.is_finite()
                && n.expanded.is_finite()
        })
    }

    /// The finding when every number behind it is finite; else why it decides nothing, as a
    /// value outside the domain of the test (an overflow, or a sensitivity without bound
    /// such as the root's at zero), naming the inputs the value tested is computed from.
    pub fn finite(self) -> Evaluated<Checked> {
        let Some(n) = self.numeric.as_ref().filter(|_| !self.is_finite()) else {
            return Ok(self);
        };
        let value_finite = n.value.is_finite() && n.limit.is_finite() && n.margin.is_finite();
        let (quantity, value) = if value_finite {
            ("uncertainty of the value tested", n.expanded)
        } else {
            ("value tested", n.value)
        };
        Err(Unevaluated::domain(Breach {
            by: "the test",
            needs: "a finite value and uncertainty",
            source: None,
            quantity,
            value,
            dimension: n.unit.map(|u| u.dimension),
            cylinder: n.cylinder,
            inputs: n.sensitivities.iter().map(|(id, _)| *id).collect(),
        }))
    }
}

/// One line of a rule's trace, borrowing from the rulebook and the declaration.
#[derive(Clone, Debug)]
pub enum Trace<'a> {
    /// A measured input, or a rulebook literal with a stated uncertainty (see
    /// [`EngineReport::input`]).
    Input(InputId),
    /// A text measurement.
    Text {
        /// The measurement.
        name: &'a str,
        /// Its value.
        value: &'a str,
        /// The text as written, when white space around it was removed at load.
        written: Option<&'a str>,
        /// Where it was written.
        place: Place,
    },
    /// A derived value, with its value(s) for this engine.
    Derived {
        /// The derived value.
        derived: &'a Derived,
        /// Its value(s) in SI units, one per cylinder where per cylinder.
        values: Vec<f64>,
        /// The combined standard uncertainty of each.
        uncertainties: Vec<f64>,
    },
    /// A measurement the declaration does not give.
    Missing {
        /// The measurement.
        name: &'a str,
    },
    /// One go/no-go gauge result of a gauged measurement.
    Gauge {
        /// The measurement.
        name: &'a str,
        /// The result.
        result: &'a GaugeResult,
    },
}

impl<'a> Outcome<'a> {
    /// A rule outside the inspection's scope: not evaluated at all, so no finding, no numbers
    /// and no trace.
    pub fn not_in_scope(rule: &'a ClassRule, decision: DecisionRule) -> Outcome<'a> {
        Outcome {
            rule,
            decision,
            applies: Applies::NotInScope,
            verdict: Verdict::NotInScope,
            checked: None,
            missing: Vec::new(),
            not_finite: false,
            outside_domain: Vec::new(),
            gauge_gaps: Vec::new(),
            error: None,
            trace: Vec::new(),
        }
    }
}

/// One rule's outcome.
#[derive(Clone, Debug)]
pub struct Outcome<'a> {
    /// The rule, with its texts.
    pub rule: &'a ClassRule,
    /// The decision rule that decided it (`--as`, else the rule's own, else the rulebook's).
    pub decision: DecisionRule,
    /// Whether its conditions hold.
    pub applies: Applies,
    /// The verdict under the decision rule in force.
    pub verdict: Verdict,
    /// What was found, when the rule was checked.
    pub checked: Option<Checked>,
    /// Measurements it needs that are missing.
    pub missing: Vec<String>,
    /// True when the value it tests could not be computed: a value outside the domain of a
    /// formula or operation, or not a finite number ([`Outcome::outside_domain`] says which).
    pub not_finite: bool,
    /// The values outside the domain of the formula or operation that needed them, each
    /// cylinder's own: the reason the rule is not checked.
    pub outside_domain: Vec<Breach>,
    /// The gauged measurements it could not be decided from, and why: a reason it is not
    /// checked.
    pub gauge_gaps: Vec<GaugeGap>,
    /// Why it could not be evaluated, when that is not a missing measurement: an internal
    /// error of gonogo, never a finding.
    pub error: Option<String>,
    /// Every input and derived value it reads.
    pub trace: Vec<Trace<'a>>,
}

impl Outcome<'_> {
    /// The rule's section number.
    pub fn section(&self) -> &str {
        &self.rule.rule.section.text
    }

    /// The rule's title.
    pub fn title(&self) -> &str {
        &self.rule.rule.title.value
    }

    /// The rule's penalty class.
    pub fn penalty(&self) -> Option<&str> {
        self.rule.rule.penalty.as_ref().map(|p| p.value.as_str())
    }

    /// The rule's note.
    pub fn note(&self) -> Option<&str> {
        self.rule.rule.note.as_ref().map(|n| n.value.as_str())
    }

    /// The symbol reports print beside the verdict, so it never rests on colour alone. It says
    /// what the measurement shows, whatever the decision rule makes of it (the verdict's word
    /// says that): ✓ proven pass, (✓) pass not proven, (✗) fail not proven, ✗ proven fail,
    /// ? not checked, – not applicable, ○ not in scope. A call is not proven when its finding is conditional
    /// or its condition uncertain; a rule without a finding, or with an open one, takes its side
    /// from its verdict.
    pub fn mark(&self) -> &'static str {
        match self.verdict {
            Verdict::NotChecked => return "?",
            Verdict::NotApplicable => return "–",
            Verdict::NotInScope => return "○",
            Verdict::Legal | Verdict::Illegal => {}
        }
        let legal = self.verdict == Verdict::Legal;
        let passes = self.checked.as_ref().map_or(legal, |c| match c.finding {
            Finding::Pass | Finding::ConditionalPass => true,
            // open gauge results show no side: the verdict gives it
            Finding::Open => legal,
            Finding::ConditionalFail | Finding::Fail => false,
        });
        match (passes, self.is_uncertain()) {
            (true, false) => "✓",
            (true, true) => "(✓)",
            (false, true) => "(✗)",
            (false, false) => "✗",
        }
    }

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

/// The result for one engine, from its verdicts; every report and the exit status read it.
#[derive(Clone, Copy, Debug, PartialEq, Eq, serde::Serialize)]
#[serde(rename_all = "snake_case")]
pub enum EngineResult {
    /// Every rule legal, no conditional finding or uncertain condition, nothing unchecked.
    Legal,
    /// At least one rule illegal under the decision rule in force.
    Illegal,
    /// Nothing illegal, but some call is not certain: a conditional finding, an uncertain
    /// condition, or a rule not checked.
    NotAllClear,
}

impl EngineResult {
    /// The symbol beside the result, so it never rests on colour alone.
    pub fn mark(self) -> &'static str {
        match self {
            EngineResult::Legal => "✓",
            EngineResult::Illegal => "✗",
            EngineResult::NotAllClear => "~",
        }
    }

    /// The result in words, as an engine's report states it.
    pub fn words(self) -> &'static str {
        match self {
            EngineResult::Legal => "LEGAL",
            EngineResult::Illegal => "ILLEGAL",
            EngineResult::NotAllClear => "NO PROVEN VIOLATION, BUT NOT ALL CLEAR",
        }
    }

    /// The result in a field summary's column.
    pub fn short_words(self) -> &'static str {
        match self {
            EngineResult::Legal => "legal",
            EngineResult::Illegal => "ILLEGAL",
            EngineResult::NotAllClear => "not all clear",
        }
    }
}

/// One engine checked against one class.
#[derive(Clone, Debug)]
pub struct EngineReport<'a> {
    /// The rulebook.
    pub rulebook: &'a CheckedRulebook,
    /// The class checked against.
    pub class: &'a Class,
    /// The declaration.
    pub declaration: &'a Declaration,
    /// The bulletins in force on the declaration's date, applied to the class.
    pub bulletins: &'a [String],
    /// Rulebook literals with a stated uncertainty, numbered after the declaration's inputs.
    pub rulebook_inputs: Vec<Input>,
    /// The decision rule applied to every rule that states none of its own (all of them when
    /// it came from the command line).
    pub decision: DecisionRule,
    /// Whether it came from the command line rather than the rulebook.
    pub decision_overridden: bool,
    /// Each rule, in rulebook order.
    pub outcomes: Vec<Outcome<'a>>,
    /// When the report was produced (RFC 3339, UTC), set by the command that makes it.
    pub produced: Option<String>,
    /// The sections inspected, when not every rule of the class: rules outside them are not
    /// in scope.
    pub scope: Option<Scope>,
}

impl EngineReport<'_> {
    /// An input by id: the declaration's, then the rulebook's literals.
    pub fn input(&self, id: InputId) -> &Input {
        let declared = self.declaration.inputs.len();
        match self.declaration.inputs.get(id as usize) {
            Some(input) => input,
            None => &self.rulebook_inputs[id as usize - declared],
        }
    }

    /// How many rules got each verdict: legal, illegal, not checked, not applicable, not in
    /// scope.
    pub fn counts(&self) -> [usize; 5] {
        let count = |v: Verdict| self.outcomes.iter().filter(|o| o.verdict == v).count();
        [
            count(Verdict::Legal),
            count(Verdict::Illegal),
            count(Verdict::NotChecked),
            count(Verdict::NotApplicable),
            count(Verdict::NotInScope),
        ]
    }

    /// The engine's result: illegal when any rule is, else not all clear when any call is
    /// uncertain, else legal. The exit status is derived from it.
    pub fn result(&self) -> EngineResult {
        if self.outcomes.iter().any(|o| o.verdict == Verdict::Illegal) {
            EngineResult::Illegal
        } else if self.outcomes.iter().any(Outcome::is_uncertain) {
            EngineResult::NotAllClear
        } else {
            EngineResult::Legal
        }
    }

    /// The exit status this report calls for, from its [`result`](Self::result).
    pub fn exit(&self) -> crate::exit::Exit {
        self.result().into()
    }

    /// `Series — edition 2027 — class limited2 “Limited Two-Barrel”`: every report's heading.
    pub fn heading(&self) -> String {
        let title = self
            .class
            .title
            .as_ref()
            .map(|t| format!(" “{t}”"))
            .unwrap_or_default();
        format!(
            "{} — edition {} — class {}{title}",
            self.rulebook.series, self.rulebook.edition, self.class.name
        )
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

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn a_scope_section_covering_no_rule_is_unmatched() {
        let scope = Scope {
            sections: vec!["5".to_string(), "6.2".to_string(), "4.21".to_string()],
            from: ScopeFrom::CommandLine,
        };
        let rules = ["4.2", "5.1", "5.3", "6.2", "6.21"];
        // 5 covers 5.1, 6.2 is a rule itself; 4.21 covers neither 4.2 nor 6.21
        assert_eq!(scope.unmatched(&rules), ["4.21"]);
        assert_eq!(scope.words(), "5, 6.2, 4.21");
    }
}

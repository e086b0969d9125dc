//! One view of an evaluated engine, in display units: everything a report says about it —
//! identity, heading, the rules in force, each rule's verdict, finding, numbers converted to
//! the unit shown with the digits to show, note, penalty, source and trace, the closest call,
//! the result and the counts — built once from an [`EngineReport`]. Text, Markdown and HTML
//! lay the view out ([`RuleView::lines`] gives every rule's facts in order and in words);
//! JSON serialises it. The wording of every fact lives in this file.
//!
//! Each engine lists the inputs its rules read once ([`EngineView::inputs`], with ids), and
//! each derived value once ([`EngineView::derived`]); a rule's trace refers to them by id.

use std::collections::HashMap;

use serde::Serialize;

use super::format::{Digits, margin_digits, probability, quantity, with_uncertainty};
use crate::check::builtins::Reduce;
use crate::check::model::{Derived, Origin, Slip, ValueKind};
use crate::check::resolved::{Expr, ExprKind, Term, TestKind};
use crate::evaluate::finding::{Finding, Verdict};
use crate::evaluate::gauge::{LimitSide, SideFinding};
use crate::evaluate::outcome::{Applies, EngineReport, EngineResult, Numeric, Outcome, Trace};
use crate::evaluate::outcome::{GaugeCall, GaugeGap, GaugeWhy};
use crate::evaluate::value::Breach;
use crate::load::InputId;
use crate::load::gauge::{Bound, GaugeKind, GaugeResult};
use crate::load::{Input, InputName, Supplied, UncertaintySource};
use crate::units::{self, Unit};

/// What each rule's mark means, for the key every report prints: the mark says what the
/// measurement shows, the verdict's word what the decision rule in force makes of it.
pub const MARKS: &str = "✓ proven pass · (✓) pass, not proven · (✗) fail, not proven · ✗ proven fail · ? not checked · – not applicable";

/// The mark of a rule not in scope, and its entry in the key (added only when a scope
/// applies, so a full inspection's key is unchanged).
pub const NOT_IN_SCOPE_MARK: &str = "○ not in scope";

/// Why the engine was inspected and what the inspection covered, from the declaration's
/// `inspection:` block and `check --sections`.
#[derive(Clone, Debug, Default, PartialEq, Eq, Serialize)]
pub struct InspectedView {
    /// Why (`after-feature`, `protest`, `claim`, `random-draw`, or the declaration's words).
    pub reason: Option<String>,
    /// The protest's, claim's or draw's reference.
    pub reference: Option<String>,
    /// The sections inspected; `null` is every rule of the class.
    pub scope: Option<Vec<String>>,
    /// Where the scope came from: `declaration` or `command_line`; `null` without a scope.
    pub scope_from: Option<crate::evaluate::outcome::ScopeFrom>,
}

impl InspectedView {
    fn of(r: &EngineReport) -> InspectedView {
        let inspection = &r.declaration.inspection;
        InspectedView {
            reason: inspection.reason.as_ref().map(|x| x.words().to_string()),
            reference: inspection.reference.clone(),
            scope: r.scope.as_ref().map(|s| s.sections.clone()),
            scope_from: r.scope.as_ref().map(|s| s.from),
        }
    }

    /// `protest PR-27-11 · scope 5, 6.2 (from the declaration)`; `None` for a full inspection
    /// with no stated reason.
    pub fn words(&self) -> Option<String> {
        let why = match (&self.reason, &self.reference) {
            (Some(reason), Some(reference)) => Some(format!("{reason} {reference}")),
            (Some(reason), None) => Some(reason.clone()),
            (None, Some(reference)) => Some(reference.clone()),
            (None, None) => None,
        };
        let scope = self.scope.as_ref().map(|sections| {
            let from = self.scope_from.map_or("", |f| f.words());
            format!("scope {} ({from})", sections.join(", "))
        });
        let parts: Vec<String> = [why, scope].into_iter().flatten().collect();
        (!parts.is_empty()).then(|| parts.join(" · "))
    }
}

/// One engine checked against one class, as every report shows it.
#[derive(Clone, Debug, Serialize)]
pub struct EngineView {
    /// The declaration file.
    pub file: String,
    /// Engine or seal number.
    pub engine: Option<String>,
    /// Car number.
    pub car: Option<String>,
    /// The event.
    pub event: Option<String>,
    /// The date of the inspection.
    pub date: Option<String>,
    /// Who measured.
    pub measured_by: Option<String>,
    /// The series.
    pub series: String,
    /// The edition.
    pub edition: String,
    /// The edition's effective date.
    pub effective: String,
    /// The class checked against.
    pub class: String,
    /// Its title.
    pub class_title: Option<String>,
    /// `Series — edition 2027 — class limited2 “Limited Two-Barrel”`.
    pub heading: String,
    /// The bulletins in force on the declaration's date, by id.
    pub bulletins: Vec<String>,
    /// Why the engine was inspected and the scope that applied.
    pub inspected: InspectedView,
    /// The decision rule applied, in the rulebook's words.
    pub decision: &'static str,
    /// Where the decision rule came from.
    pub decision_from: DecisionFrom,
    /// The engine's result.
    pub result: EngineResult,
    /// The exit status its result calls for.
    pub exit_status: u8,
    /// How many rules got each verdict, and how many calls are conditional.
    pub counts: Counts,
    /// The rule that decided the result, or the closest to its limit.
    pub closest_call: Option<ClosestCall>,
    /// Every input a rule reads, once.
    pub inputs: Vec<InputView>,
    /// Every derived value a rule reads, once.
    pub derived: Vec<DerivedView>,
    /// Every go/no-go gauge result a rule reads, once (left out of the JSON when none).
    #[serde(skip_serializing_if = "Vec::is_empty")]
    pub gauges: Vec<GaugeView>,
    /// Each rule, in rulebook order.
    pub rules: Vec<RuleView>,
    /// What produced the report: version, fingerprints of the inputs, time.
    pub provenance: super::provenance::Provenance,
    /// The seals found on the engine and applied to it, from the declaration's `inspection:`
    /// block (the tech sheet's record; the JSON leaves them to the declaration).
    #[serde(skip)]
    pub seals: Seals,
}

/// The seals a declaration records: found when the engine came in, applied when it left.
#[derive(Clone, Debug, Default, PartialEq, Eq)]
pub struct Seals {
    /// Found on the engine when it came in.
    pub found: Vec<crate::load::inspection::Seal>,
    /// Applied when it left.
    pub applied: Vec<crate::load::inspection::Seal>,
}

/// Where the decision rule came from.
#[derive(Clone, Copy, Debug, PartialEq, Eq, Serialize)]
pub enum DecisionFrom {
    /// The rulebook's `decision`.
    #[serde(rename = "rulebook")]
    Rulebook,
    /// `--as` on the command line.
    #[serde(rename = "command line")]
    CommandLine,
}

impl DecisionFrom {
    /// `the rulebook's`, `from the command line`.
    pub fn words(self) -> &'static str {
        match self {
            DecisionFrom::Rulebook => "the rulebook's",
            DecisionFrom::CommandLine => "from the command line",
        }
    }
}

/// How many rules got each verdict, and how many calls are conditional.
#[derive(Clone, Copy, Debug, PartialEq, Eq, Serialize)]
pub struct Counts {
    /// Legal.
    pub legal: usize,
    /// Illegal.
    pub illegal: usize,
    /// Not checked.
    pub not_checked: usize,
    /// Not applicable.
    pub not_applicable: usize,
    /// Outside the inspection's scope: not evaluated.
    pub not_in_scope: usize,
    /// Conditional findings or uncertain conditions, any verdict.
    pub conditional: usize,
}

impl Counts {
    /// `18 legal, 0 illegal, 0 not checked, 2 not applicable; 0 conditional`, with
    /// `, 4 not in scope` after the not applicable when any rule is outside the scope.
    pub fn words(&self) -> String {
        let scope = match self.not_in_scope {
            0 => String::new(),
            n => format!(", {n} not in scope"),
        };
        format!(
            "{} legal, {} illegal, {} not checked, {} not applicable{scope}; {} conditional",
            self.legal, self.illegal, self.not_checked, self.not_applicable, self.conditional
        )
    }
}

/// The rule that decided an engine's result: the first illegal one, else the first not
/// checked, else the one with the least probability of conformance.
#[derive(Clone, Debug, PartialEq, Serialize)]
pub struct ClosestCall {
    /// The rule's section.
    pub section: String,
    /// Its title.
    pub title: String,
    /// Its call in words: `fail`, `not checked`, `conditional pass, p 84.13 %`.
    pub call: String,
}

impl ClosestCall {
    /// `3.2 Bore, every cylinder (conditional pass, p 84.13 %)`.
    pub fn words(&self) -> String {
        format!("{} {} ({})", self.section, self.title, self.call)
    }
}

/// One input of an engine: a measured value (each cylinder its own), a text measurement, or a
/// rulebook literal with a stated uncertainty.
#[derive(Clone, Debug, PartialEq, Serialize)]
pub struct InputView {
    /// Its id within the engine: its position in [`EngineView::inputs`].
    pub id: usize,
    /// `bore[3]`, `stroke`, `carburetor.part`, or the literal as written.
    pub label: String,
    /// Where it was written: `measurements.bore[3]`, `components.carburetor.part`, `rulebook`.
    pub origin: String,
    /// The cylinder, counting from 1, for per-cylinder values (named in the label).
    #[serde(skip)]
    pub cylinder: Option<usize>,
    /// The measurement's position in the schema (cylinders of one measurement share it).
    #[serde(skip)]
    pub measurement: Option<usize>,
    /// The value.
    #[serde(flatten)]
    pub value: InputValue,
}

/// An input's value.
#[derive(Clone, Debug, PartialEq, Serialize)]
#[serde(tag = "kind", rename_all = "snake_case")]
pub enum InputValue {
    /// A number, in the unit it was written in.
    Number {
        /// The value as written, unit included (`4.100 in`), without a stated `± U`.
        written: String,
        /// The unit it was written in.
        unit: Option<&'static str>,
        /// The value in that unit.
        value: f64,
        /// Its standard uncertainty in that unit.
        standard_uncertainty: f64,
        /// Where the uncertainty comes from.
        uncertainty_from: UncertaintyFrom,
        /// The uncertainty in words: `u 0.000029 in (bore_gauge)`, `no uncertainty stated`
        /// (the reports' words; not in the JSON, which has the number and its source).
        #[serde(skip)]
        uncertainty_shown: String,
    },
    /// A text measurement.
    Text {
        /// The text, white space around it removed.
        value: String,
        /// The text as written, when white space around it was removed at load.
        #[serde(skip_serializing_if = "Option::is_none")]
        written: Option<String>,
    },
}

/// Where an input's uncertainty comes from: `"none"`, `"rulebook"`, `{"instrument": NAME}`
/// or `{"stated": {"k": K}}`.
#[derive(Clone, Debug, PartialEq, Serialize)]
#[serde(rename_all = "snake_case")]
pub enum UncertaintyFrom {
    /// None stated: the value is taken as exact.
    None,
    /// Written with the value, at coverage factor `k`.
    Stated {
        /// The coverage factor.
        k: f64,
    },
    /// A named instrument of the declaration.
    Instrument(String),
    /// A literal in the rulebook.
    Rulebook,
    /// The calibration of an instrument, shared by every reading taken with it.
    Calibration {
        /// The instrument.
        instrument: String,
        /// How many readings share it.
        readings: usize,
    },
    /// The mean of repeated readings (Type A).
    Repeated {
        /// How many readings, n.
        count: usize,
        /// Their experimental standard deviation s, in the input's unit.
        standard_deviation: f64,
        /// Degrees of freedom, n − 1.
        degrees_of_freedom: usize,
        /// The instrument they were taken with, if one is named.
        instrument: Option<String>,
    },
}

/// A derived value of the rulebook, with its value(s) for this engine.
#[derive(Clone, Debug, PartialEq, Serialize)]
pub struct DerivedView {
    /// Its id within the engine: its position in [`EngineView::derived`].
    pub id: usize,
    /// Its name.
    pub name: String,
    /// Its expression in the rulebook's canonical words.
    pub formula: String,
    /// The unit its values are given in.
    pub unit: Option<&'static str>,
    /// Its value(s) in that unit, one per cylinder where per cylinder.
    pub values: Vec<f64>,
    /// The combined standard uncertainty of each.
    pub standard_uncertainties: Vec<f64>,
    /// The values in words: `355.221 ci (u 0.03 ci)`, or `not computed` (the reports'
    /// words; not in the JSON).
    #[serde(skip)]
    pub shown: String,
}

/// Where a rule comes from.
#[derive(Clone, Debug, PartialEq, Eq, Serialize)]
#[serde(tag = "kind", content = "name", rename_all = "snake_case")]
pub enum Source {
    /// Written in this class or one it extends (the class named).
    Class(String),
    /// Added or replaced by a bulletin (its id).
    Bulletin(String),
}

impl Source {
    /// `class limited2`, `bulletin TVB-27-04`.
    pub fn words(&self) -> String {
        match self {
            Source::Class(c) => format!("class {c}"),
            Source::Bulletin(b) => format!("bulletin {b}"),
        }
    }
}

/// A numeric limit checked, in the unit the rulebook wrote the limit in.
#[derive(Clone, Debug, PartialEq, Serialize)]
pub struct NumberView {
    /// The unit (`None`: a plain number).
    pub unit: Option<&'static str>,
    /// The value tested (at the deciding cylinder).
    pub value: f64,
    /// The limit in force, allowance included; for `between`, the nearer limit.
    pub limit: f64,
    /// Both limits of a `between`, allowance included.
    pub range: Option<[f64; 2]>,
    /// Distance inside the limit (negative outside).
    pub margin: f64,
    /// Expanded uncertainty of the margin, U = k·u.
    pub expanded_uncertainty: f64,
    /// The coverage factor k.
    pub coverage_factor: f64,
    /// The effective degrees of freedom of the margin's uncertainty (Welch–Satterthwaite);
    /// `null` when infinite (every component of Type B).
    pub effective_degrees_of_freedom: Option<f64>,
    /// Probability of conformance, 0 to 1.
    pub probability_of_conformance: f64,
    /// The deciding cylinder (1-based), for per-cylinder values.
    pub cylinder: Option<usize>,
    /// For a limit on every cylinder, the probability that all conform.
    pub all_cylinders: Option<super::joint::AllCylindersView>,
    /// The Monte Carlo check, when one was asked for (`check --monte-carlo`).
    #[serde(skip_serializing_if = "Option::is_none")]
    pub monte_carlo: Option<super::montecarlo::MonteCarloView>,
    /// The same numbers with the digits to show (the reports' words; not in the JSON).
    #[serde(skip)]
    pub shown: NumberShown,
}

/// A numeric limit's numbers in words, with the digits to show.
#[derive(Clone, Debug, PartialEq, Serialize)]
pub struct NumberShown {
    /// `4.0306 in`.
    pub value: String,
    /// `4.035 in`.
    pub limit: String,
    /// `3.47 in`, `3.49 in` for a `between`.
    pub range: Option<[String; 2]>,
    /// `0.0044 in inside`.
    pub margin: String,
    /// `0.000058 in`.
    pub expanded_uncertainty: String,
    /// `k = 2`, `k = 2.06, ν_eff = 25.5`.
    pub coverage: String,
    /// `≥ 99.99 %`.
    pub probability_of_conformance: String,
}

/// One rule's outcome. `section`, `verdict`, `finding`, `applies`, `numeric` and `missing`
/// keep their names and places of schema `gonogo.check/1`.
#[derive(Clone, Debug, PartialEq, Serialize)]
pub struct RuleView {
    /// The section number.
    pub section: String,
    /// The title.
    pub title: String,
    /// The verdict under the decision rule in force.
    pub verdict: Verdict,
    /// The finding, when the rule was checked.
    pub finding: Option<Finding>,
    /// Whether its conditions hold.
    pub applies: Applies,
    /// True when the call is not certain: a conditional finding, an uncertain condition, or a
    /// rule not checked.
    pub uncertain: bool,
    /// The verdict's symbol.
    #[serde(skip)]
    pub mark: &'static str,
    /// The requirement in the rulebook's words.
    pub requirement: String,
    /// Each condition in the rulebook's words.
    pub conditions: Vec<String>,
    /// Where the rule comes from.
    pub source: Source,
    /// Its penalty class.
    pub penalty: Option<String>,
    /// Its note.
    pub note: Option<String>,
    /// For numeric limits, the numbers behind the finding.
    pub numeric: Option<NumberView>,
    /// For text, membership and equality tests, the value seen.
    pub observed: Option<String>,
    /// For a membership test, the exact entry a value not on the list nearly matches.
    #[serde(skip_serializing_if = "Option::is_none")]
    pub near_match: Option<NearMatchView>,
    /// Measurements it needs that are missing.
    pub missing: Vec<String>,
    /// True when the value it tests could not be computed: a value outside the domain of a
    /// formula or operation, or not a finite number (`outside_domain` says which).
    pub not_finite: bool,
    /// The values outside the domain of the formula or operation that needed them.
    #[serde(skip_serializing_if = "Vec::is_empty")]
    pub outside_domain: Vec<BreachView>,
    /// For a limit on a gauged measurement, what its gauge results prove about each side.
    #[serde(skip_serializing_if = "Option::is_none")]
    pub gauge: Option<GaugeCallView>,
    /// The gauged measurements the rule could not be decided from, and why.
    #[serde(skip_serializing_if = "Vec::is_empty")]
    pub gauge_gaps: Vec<GaugeGapView>,
    /// Why the rule could not be evaluated when that is gonogo's own mistake, not the input's.
    #[serde(skip_serializing_if = "Option::is_none")]
    pub internal_error: Option<String>,
    /// The rule's own decision rule, when it decided the rule instead of the engine's.
    #[serde(skip_serializing_if = "Option::is_none")]
    pub decision: Option<&'static str>,
    /// True when it was checked and every number behind the finding is finite, so the
    /// finding's numbers are shown.
    #[serde(skip)]
    pub shows_finding: bool,
    /// Every input and derived value it reads, by id.
    pub trace: Vec<TraceRef>,
}

/// The exact entry of a list a value not on it nearly matches: the finding stands, and the
/// inspector reads the tag again before anyone acts on it.
#[derive(Clone, Debug, PartialEq, Serialize)]
pub struct NearMatchView {
    /// The entry as the rulebook writes it.
    pub entry: String,
    /// How the value differs from it.
    pub slip: Slip,
    /// `TVH-2204 (differs only in case)`.
    #[serde(skip)]
    pub words: String,
}

/// A value outside the domain of the formula or operation that needed it, in the units of its
/// inputs: why a rule is not checked.
#[derive(Clone, Debug, PartialEq, Serialize)]
pub struct BreachView {
    /// The formula or operation: `compression_ratio`, `/`, `sqrt`, `^`, `the test`.
    pub by: &'static str,
    /// What it needs: `a positive clearance volume`.
    pub needs: &'static str,
    /// Where a formula and its domain come from; null for arithmetic.
    pub source: Option<&'static str>,
    /// The quantity tested: `clearance volume`, `divisor`.
    pub quantity: &'static str,
    /// Its value in `unit` (null when it is not a finite number).
    pub value: f64,
    /// The unit of `value` (null: a plain number, or a quantity whose unit is not known).
    pub unit: Option<&'static str>,
    /// The cylinder (1-based), for a per-cylinder value.
    pub cylinder: Option<usize>,
    /// The inputs it is computed from, by id in [`EngineView::inputs`].
    pub inputs: Vec<usize>,
    /// The reason in words: `compression_ratio needs a positive clearance volume (...); on
    /// cylinder 3, chamber[3] 40 cc, ... give a clearance volume of -2.2 cc`.
    pub reason: String,
}

/// One line of a rule's trace: `{"input": ID}`, `{"derived": ID}` or `{"missing": NAME}`.
#[derive(Clone, Debug, PartialEq, Eq, Serialize)]
#[serde(rename_all = "snake_case")]
pub enum TraceRef {
    /// [`EngineView::inputs`]`[id]`.
    Input(usize),
    /// [`EngineView::derived`]`[id]`.
    Derived(usize),
    /// A measurement the declaration does not give.
    Missing(String),
    /// [`EngineView::gauges`]`[id]`.
    Gauge(usize),
}

/// One fact of a rule as a report states it: a label, what it is about in the rulebook's or
/// declaration's own words (set as code where a format can), and words.
#[derive(Clone, Debug, PartialEq)]
pub struct Fact {
    /// `requires`, `when`, `value`, `note`...
    pub label: &'static str,
    /// Text written in the rulebook or declaration.
    pub code: Option<String>,
    /// Words.
    pub text: String,
}

/// One entry of a rule's report, in order.
#[derive(Clone, Debug, PartialEq)]
pub enum Line<'v> {
    /// A labelled fact.
    Fact(Fact),
    /// Where a graphic format draws the scale of value against limit.
    Scale(&'v NumberView),
    /// The trace.
    Trace(Vec<TraceLine<'v>>),
}

/// One line of a trace in words.
#[derive(Clone, Debug, PartialEq)]
pub enum TraceLine<'v> {
    /// An input, or the cylinders of one measurement that share a unit and uncertainty.
    Values {
        /// `bore`, `bore[3]`, `carburetor.part`.
        label: String,
        /// The values as written: `4.0302, 4.0305 in`, `"TVC-350-2"`.
        values: String,
        /// The uncertainty in words, for numbers.
        uncertainty: Option<String>,
        /// Where it was written.
        origin: String,
    },
    /// A derived value.
    Derived(&'v DerivedView),
    /// A measurement the declaration does not give.
    Missing(&'v str),
    /// A go/no-go gauge result and what it proves.
    Gauge(&'v GaugeView),
}

impl TraceLine<'_> {
    /// The line in words: `bore = 4.0302, 4.0305 in  u 0.000029 in (bore_gauge)
    /// [measurements.bore]`; for a derived value, its name and formula (its values are
    /// [`TraceLine::result`]).
    pub fn words(&self) -> String {
        match self {
            TraceLine::Values {
                label,
                values,
                uncertainty: Some(u),
                origin,
            } => format!("{label} = {values}  {u}  [{origin}]"),
            TraceLine::Values {
                label,
                values,
                uncertainty: None,
                origin,
            } => format!("{label} = {values}  [{origin}]"),
            TraceLine::Derived(d) => format!("{} = {}", d.name, d.formula),
            TraceLine::Missing(name) => format!("{name}: missing"),
            TraceLine::Gauge(g) => format!("{}  [{}]", g.words, g.origin),
        }
    }

    /// A derived value's values: `= 355.221 ci (u 0.03 ci)`.
    pub fn result(&self) -> Option<String> {
        match self {
            TraceLine::Derived(d) => Some(format!("= {}", d.shown)),
            _ => None,
        }
    }
}

impl EngineView {
    /// The view of one evaluated engine.
    pub fn new(r: &EngineReport) -> EngineView {
        let mut book = Book::default();
        let rules = r
            .outcomes
            .iter()
            .map(|o| RuleView::new(o, r, &mut book))
            .collect();
        let [legal, illegal, not_checked, not_applicable, not_in_scope] = r.counts();
        let id = &r.declaration.identity;
        let result = r.result();
        EngineView {
            file: r.declaration.path.display().to_string(),
            engine: id.engine.clone(),
            car: id.car.clone(),
            event: id.event.clone(),
            date: id.date.map(|d| d.to_string()),
            measured_by: id.measured_by.clone(),
            series: r.rulebook.series.clone(),
            edition: r.rulebook.edition.clone(),
            effective: r.rulebook.effective.to_string(),
            class: r.class.name.clone(),
            class_title: r.class.title.clone(),
            heading: r.heading(),
            bulletins: r.bulletins.to_vec(),
            inspected: InspectedView::of(r),
            decision: r.decision.words(),
            decision_from: if r.decision_overridden {
                DecisionFrom::CommandLine
            } else {
                DecisionFrom::Rulebook
            },
            result,
            exit_status: crate::exit::Exit::from(result) as u8,
            counts: Counts {
                legal,
                illegal,
                not_checked,
                not_applicable,
                not_in_scope,
                conditional: r.conditional_count(),
            },
            closest_call: closest_call(r),
            inputs: book.inputs,
            derived: book.derived,
            gauges: book.gauges,
            rules,
            provenance: super::provenance::Provenance::of(r),
            seals: Seals {
                found: r.declaration.inspection.seals_found.clone(),
                applied: r.declaration.inspection.seals_applied.clone(),
            },
        }
    }

    /// `edition 2027 (from 2027-03-06) with bulletin TVB-27-04`, and a word when the
    /// declaration has no date.
    pub fn rules_in_force(&self) -> String {
        let edition = format!("edition {} (from {})", self.edition, self.effective);
        let bulletins = match self.bulletins.as_slice() {
            [] => String::new(),
            [one] => format!(" with bulletin {one}"),
            many => format!(" with bulletins {}", many.join(", ")),
        };
        let undated = if self.date.is_none() {
            "; the declaration has no date, so no bulletin is applied"
        } else {
            ""
        };
        format!("{edition}{bulletins}{undated}")
    }

    /// The key of the marks: [`MARKS`], and the not-in-scope mark when a scope applies.
    pub fn marks(&self) -> String {
        match self.inspected.scope {
            Some(_) => format!("{MARKS} · {NOT_IN_SCOPE_MARK}"),
            None => MARKS.to_string(),
        }
    }

    /// `guarded rejection (the rulebook's)`.
    pub fn decision_words(&self) -> String {
        format!("{} ({})", self.decision, self.decision_from.words())
    }

    /// `LEGAL — 18 legal, 0 illegal, ...; 0 conditional`.
    pub fn result_words(&self) -> String {
        format!("{} — {}", self.result.words(), self.counts.words())
    }

    /// The engine or seal number, else the declaration file.
    pub fn name(&self) -> &str {
        self.engine.as_deref().unwrap_or(&self.file)
    }

    /// Where a rule comes from, when the report names it: a bulletin, or a class other than
    /// the one checked (the heading names that one).
    pub fn shown_source<'v>(&self, rule: &'v RuleView) -> Option<&'v Source> {
        match &rule.source {
            Source::Class(c) if *c == self.class => None,
            source => Some(source),
        }
    }

    /// A rule's trace in words, the cylinders of one measurement sharing a line where their
    /// unit and uncertainty agree.
    pub fn trace_lines<'v>(&'v self, rule: &'v RuleView) -> Vec<TraceLine<'v>> {
        let mut lines = Vec::new();
        let mut rest = rule.trace.as_slice();
        while let Some(first) = rest.first() {
            let run = self.cylinder_run(rest);
            if run > 1 {
                lines.extend(self.cylinder_line(&rest[..run]));
            } else {
                lines.extend(self.trace_line(first));
            }
            rest = &rest[run.max(1)..];
        }
        lines
    }

    fn input(&self, t: &TraceRef) -> Option<&InputView> {
        match t {
            TraceRef::Input(id) => self.inputs.get(*id),
            _ => None,
        }
    }

    /// How many trace lines from the start are cylinders of one measurement, all with the
    /// same unit and uncertainty.
    fn cylinder_run(&self, trace: &[TraceRef]) -> usize {
        let key = |t: &TraceRef| {
            let i = self.input(t)?;
            i.cylinder?;
            match &i.value {
                InputValue::Number {
                    unit,
                    standard_uncertainty,
                    uncertainty_from,
                    ..
                } if !matches!(uncertainty_from, UncertaintyFrom::Repeated { .. }) => Some((
                    i.measurement,
                    *unit,
                    standard_uncertainty.to_bits(),
                    uncertainty_from.clone(),
                )),
                _ => None,
            }
        };
        let Some(first) = trace.first().and_then(key) else {
            return 0;
        };
        trace
            .iter()
            .take_while(|t| key(t).as_ref() == Some(&first))
            .count()
    }

    /// `bore = 4.0302, 4.0305, ... in  u 0.000029 in (bore_gauge)  [measurements.bore]`
    fn cylinder_line(&self, run: &[TraceRef]) -> Option<TraceLine<'_>> {
        let inputs: Vec<&InputView> = run.iter().filter_map(|t| self.input(t)).collect();
        let first = inputs.first()?;
        let InputValue::Number {
            unit,
            uncertainty_shown,
            ..
        } = &first.value
        else {
            return None;
        };
        let values: Vec<&str> = inputs.iter().map(|i| i.bare_written()).collect();
        let symbol = unit.map(|u| format!(" {u}")).unwrap_or_default();
        let before_index = |s: &str| s.split_once('[').map_or(s, |(b, _)| b).to_string();
        Some(TraceLine::Values {
            label: before_index(&first.label),
            values: format!("{}{symbol}", values.join(", ")),
            uncertainty: Some(uncertainty_shown.clone()),
            origin: before_index(&first.origin),
        })
    }

    fn trace_line<'v>(&'v self, t: &'v TraceRef) -> Option<TraceLine<'v>> {
        match t {
            TraceRef::Input(id) => {
                let input = self.inputs.get(*id)?;
                let (values, uncertainty) = match &input.value {
                    InputValue::Number {
                        written,
                        uncertainty_shown,
                        ..
                    } => (written.clone(), Some(uncertainty_shown.clone())),
                    InputValue::Text {
                        value,
                        written: None,
                    } => (format!("\"{value}\""), None),
                    InputValue::Text {
                        value,
                        written: Some(w),
                    } => (
                        format!("\"{value}\" (written \"{w}\": white space around it removed)"),
                        None,
                    ),
                };
                Some(TraceLine::Values {
                    label: input.label.clone(),
                    values,
                    uncertainty,
                    origin: input.origin.clone(),
                })
            }
            TraceRef::Derived(id) => self.derived.get(*id).map(TraceLine::Derived),
            TraceRef::Missing(name) => Some(TraceLine::Missing(name)),
            TraceRef::Gauge(id) => self.gauges.get(*id).map(TraceLine::Gauge),
        }
    }
}

impl InputView {
    /// The value as written, unit included (`-0.050 in`); text in quotes.
    fn as_written(&self) -> String {
        match &self.value {
            InputValue::Number { written, .. } => written.clone(),
            InputValue::Text { value, .. } => format!("\"{value}\""),
        }
    }

    /// The value as written without its unit (`4.0302`), for a line of cylinders.
    fn bare_written(&self) -> &str {
        match &self.value {
            InputValue::Number {
                written,
                unit: Some(u),
                ..
            } => written
                .strip_suffix(u)
                .map_or(written.as_str(), str::trim_end),
            InputValue::Number { written, .. } => written,
            InputValue::Text { value, .. } => value,
        }
    }
}

impl RuleView {
    fn new(o: &Outcome, r: &EngineReport, book: &mut Book) -> RuleView {
        // a rule not checked has no finding and no numbers, whatever was computed on the way
        let checked = o
            .checked
            .as_ref()
            .filter(|_| o.verdict != Verdict::NotChecked);
        let mut view = RuleView {
            section: o.section().to_string(),
            title: o.title().to_string(),
            verdict: o.verdict,
            finding: checked.map(|c| c.finding),
            applies: o.applies,
            uncertain: o.is_uncertain(),
            mark: o.mark(),
            requirement: o.rule.requirement.clone(),
            conditions: o.rule.condition_texts.clone(),
            source: match &o.rule.origin {
                Origin::Class(c) => Source::Class(c.clone()),
                Origin::Bulletin(b) => Source::Bulletin(b.clone()),
            },
            penalty: o.penalty().map(str::to_string),
            note: o.note().map(str::to_string),
            numeric: checked
                .and_then(|c| c.numeric.as_ref())
                .map(|n| number_view(n, subject_reading(o, r, n), limits_written(o, n), r)),
            observed: checked.and_then(|c| c.observed.clone()),
            near_match: checked
                .and_then(|c| c.near_match.as_ref())
                .map(|n| NearMatchView {
                    entry: n.entry.clone(),
                    slip: n.slip,
                    words: format!("{} ({})", n.entry, n.slip.words()),
                }),
            missing: o.missing.clone(),
            not_finite: o.not_finite,
            outside_domain: o
                .outside_domain
                .iter()
                .map(|b| breach_view(b, r, book))
                .collect(),
            gauge: None,
            gauge_gaps: o.gauge_gaps.iter().map(|g| gauge_gap_view(g, r)).collect(),
            internal_error: o.error.clone(),
            decision: (o.decision != r.decision).then(|| o.decision.words()),
            shows_finding: checked.is_some_and(|c| c.is_finite()),
            trace: {
                let limit_unit = checked.and_then(|c| c.numeric.as_ref()?.unit);
                o.trace
                    .iter()
                    .map(|t| book.trace(t, r, limit_unit))
                    .collect()
            },
        };
        // after the trace, so gauge results are numbered in the order the trace reads them
        view.gauge = checked
            .and_then(|c| c.gauge.as_ref())
            .map(|call| gauge_call_view(call, r, book));
        view
    }

    /// `✓ 3.1  Displacement — LEGAL · pass` without the mark and layout: the title, the
    /// verdict and the finding in words.
    pub fn verdict_words(&self) -> String {
        let finding = self
            .finding
            .map(|f| format!(" · {}{}", f.words(), self.against_words()))
            .unwrap_or_default();
        let why = if self.applies == Applies::NotMeasured {
            " (optional, not measured)"
        } else {
            ""
        };
        format!("{}{why}{finding}", self.verdict.words())
    }

    /// What a verdict that goes against its conditional finding says about proof: under
    /// guarded acceptance a conditional pass is illegal because it is `not proven legal`;
    /// under guarded rejection a conditional fail is legal because it is `not proven illegal`.
    fn against_words(&self) -> &'static str {
        match (self.verdict, self.finding) {
            (Verdict::Illegal, Some(Finding::ConditionalPass)) => ": not proven legal",
            (Verdict::Legal, Some(Finding::ConditionalFail)) => ": not proven illegal",
            (Verdict::Illegal, Some(Finding::Open)) => ": not proven legal",
            (Verdict::Legal, Some(Finding::Open)) => ": not proven illegal",
            _ => "",
        }
    }

    /// The state of the rule's conditions: `holds`, `does not hold`, uncertain, not known
    /// (they could not be computed), or not judged (the rule reads an optional measurement
    /// that is not given, in its conditions or its test).
    pub fn condition_state(&self) -> &'static str {
        match self.applies {
            Applies::DoesNotHold => "does not hold",
            Applies::Uncertain => "uncertain: inside the uncertainty band",
            Applies::Holds => "holds",
            Applies::NotComputed => "not known: it could not be computed",
            Applies::NotMeasured => {
                "not judged: the rule reads an optional measurement that is not given"
            }
            Applies::NotInScope => "not evaluated: the rule is outside the inspection's scope",
            // a rule without conditions shows no condition
            Applies::Always => "no condition",
        }
    }

    /// What an uncertain condition means for the verdict, when it matters.
    pub fn doubt(&self) -> Option<&'static str> {
        if self.applies != Applies::Uncertain || !self.shows_finding {
            return None;
        }
        Some(
            if self.verdict == Verdict::Legal && self.finding != Some(Finding::Pass) {
                "the rule is not met if its condition holds; an uncertain condition cannot prove a violation"
            } else {
                "judged as if the condition holds"
            },
        )
    }

    /// Every fact of the rule in order and in words; the formats lay them out.
    pub fn lines<'v>(&'v self, engine: &'v EngineView) -> Vec<Line<'v>> {
        let fact = |label, code: Option<&str>, text: String| {
            Line::Fact(Fact {
                label,
                code: code.map(str::to_string),
                text,
            })
        };
        let mut lines = vec![fact("requires", Some(&self.requirement), String::new())];
        for c in &self.conditions {
            let state = format!("({})", self.condition_state());
            lines.push(fact("when", Some(c), state));
        }
        if let Some(source) = engine.shown_source(self) {
            lines.push(fact("from", None, source.words()));
        }
        if let Some(own) = self.decision {
            let text = format!(
                "{own}, this rule's own (the rulebook's is {})",
                engine.decision
            );
            lines.push(fact("decided by", None, text));
        }
        if !self.missing.is_empty() {
            let why = match self.applies {
                Applies::NotMeasured => "optional, not measured",
                _ => "not in the declaration",
            };
            let text = format!("{} ({why})", self.missing.join(", "));
            lines.push(fact("missing", None, text));
        }
        for breach in &self.outside_domain {
            lines.push(fact("not computed", None, breach.reason.clone()));
        }
        for gap in &self.gauge_gaps {
            lines.push(fact("undecided", None, gap.reason.clone()));
        }
        if let Some(error) = &self.internal_error {
            let text = format!("{error} (a mistake in gonogo; please report it)");
            lines.push(fact("not computed", None, text));
        }
        if self.shows_finding {
            self.finding_lines(&mut lines);
        }
        if let Some(doubt) = self.doubt() {
            lines.push(fact("doubt", None, doubt.to_string()));
        }
        let trace = engine.trace_lines(self);
        if !trace.is_empty() {
            lines.push(Line::Trace(trace));
        }
        if let Some(p) = &self.penalty {
            lines.push(fact("penalty", None, p.clone()));
        }
        if let Some(n) = &self.note {
            lines.push(fact("note", None, n.clone()));
        }
        lines
    }

    fn finding_lines<'v>(&'v self, lines: &mut Vec<Line<'v>>) {
        let fact = |label, text: String| {
            Line::Fact(Fact {
                label,
                code: None,
                text,
            })
        };
        if let Some(observed) = &self.observed {
            lines.push(Line::Fact(Fact {
                label: "found",
                code: Some(observed.clone()),
                text: String::new(),
            }));
        }
        if let Some(near) = &self.near_match {
            lines.push(fact(
                "nearly matches",
                format!(
                    "{}: not on the list as written; read the tag again",
                    near.words
                ),
            ));
        }
        if let Some(call) = &self.gauge {
            for side in &call.sides {
                lines.push(fact("gauge", side.words.clone()));
            }
        }
        let Some(n) = &self.numeric else { return };
        let s = &n.shown;
        let at = n
            .cylinder
            .map(|i| format!(" (cylinder {i}, the closest to its limit)"))
            .unwrap_or_default();
        lines.push(fact("value", format!("{}{at}", s.value)));
        lines.push(match &s.range {
            Some([low, high]) => fact("limits", format!("{low} to {high}")),
            None => fact("limit", s.limit.clone()),
        });
        lines.push(fact(
            "margin",
            format!(
                "{}, expanded uncertainty U = {} ({})",
                s.margin, s.expanded_uncertainty, s.coverage
            ),
        ));
        lines.push(fact(
            "conformance probability",
            s.probability_of_conformance.clone(),
        ));
        if let Some(all) = &n.all_cylinders {
            lines.push(fact("all cylinders", all.shown.clone()));
        }
        if let Some(mc) = &n.monte_carlo {
            lines.extend(mc.facts.iter().cloned().map(Line::Fact));
        }
        lines.push(Line::Scale(n));
    }
}

fn number_view(
    n: &Numeric,
    reading: Option<&Input>,
    limits: [Option<String>; 2],
    r: &EngineReport,
) -> NumberView {
    let s = n.unit.map_or(1.0, |u| u.to_si);
    NumberView {
        unit: n.unit.map(|u| u.symbol),
        value: n.value / s,
        limit: n.limit / s,
        range: n.range.map(|(a, b)| [a / s, b / s]),
        margin: n.margin / s,
        expanded_uncertainty: n.expanded / s,
        coverage_factor: n.k,
        effective_degrees_of_freedom: n
            .degrees_of_freedom
            .is_finite()
            .then_some(n.degrees_of_freedom),
        probability_of_conformance: n.probability,
        cylinder: n.cylinder,
        all_cylinders: n
            .all_cylinders
            .as_ref()
            .map(|a| super::joint::view(a, n.expanded > 0.0, r)),
        monte_carlo: n
            .monte_carlo
            .as_ref()
            .map(|m| super::montecarlo::view(m, n.unit)),
        shown: number_shown(n, reading, limits),
    }
}

/// A limit's numbers in words: a reading tested as it is as written (with its value in the
/// limit's unit beside it when it was written in another); a computed value, the margin and
/// U with the digits U supports (GUM 7.2.6); without an uncertainty the margin to the decimal
/// place of the finer of value and limit shown; a limit as written ([`limits_written`]), else
/// to six significant digits.
fn number_shown(n: &Numeric, reading: Option<&Input>, limits: [Option<String>; 2]) -> NumberShown {
    let digits = Digits::supported_in(n.expanded, n.unit);
    let computed = digits.quantity(n.value, n.unit);
    let [first, second] = limits;
    let limit = match (n.range, &first, &second) {
        (None, Some(written), _) => written.clone(),
        (Some((low, _)), Some(written), _) if low == n.limit => written.clone(),
        (Some((_, high)), _, Some(written)) if high == n.limit => written.clone(),
        _ => quantity(n.limit, n.unit),
    };
    let (value, margin_digits) = match reading {
        Some(
            input @ Input {
                source: UncertaintySource::Repeated { count, .. },
                ..
            },
        ) => {
            // the value tested is the readings' mean, not any one of them (they stay in the
            // trace): with the digits its uncertainty supports, or with those of the readings
            let digits = match digits {
                Digits::Significant => Digits::as_written(&written(input, None)),
                place => place,
            };
            let mean = digits.quantity(n.value, n.unit);
            let shown = format!("{mean} (the mean of {count} readings)");
            (shown, margin_digits(n.expanded, n.unit, &mean, &limit))
        }
        Some(input) => {
            let written = written(input, input.unit.and_then(units::lookup));
            if input.unit == n.unit.map(|u| u.symbol) {
                let digits = margin_digits(n.expanded, n.unit, &written, &limit);
                (written, digits)
            } else {
                let digits = margin_digits(n.expanded, n.unit, &computed, &limit);
                (format!("{written} ({computed})"), digits)
            }
        }
        None => {
            let digits = margin_digits(n.expanded, n.unit, &computed, &limit);
            (computed, digits)
        }
    };
    // a value exactly on the limit is inside or outside by the rule's strictness, which the
    // finding says
    let side = match n.margin {
        0.0 => "on the limit",
        m if m > 0.0 => "inside",
        _ => "outside",
    };
    NumberShown {
        value,
        limit,
        range: n.range.map(|(a, b)| {
            [
                first.unwrap_or_else(|| quantity(a, n.unit)),
                second.unwrap_or_else(|| quantity(b, n.unit)),
            ]
        }),
        margin: format!(
            "{} {side}",
            margin_digits
                .showing(n.margin / n.unit.map_or(1.0, |u| u.to_si))
                .quantity(n.margin.abs(), n.unit)
        ),
        expanded_uncertainty: digits.quantity(n.expanded, n.unit),
        coverage: coverage_of(n),
        probability_of_conformance: probability(n.probability, n.expanded > 0.0),
    }
}

/// Each limit of a rule as the rulebook wrote it, where it is a number in the unit its
/// numbers are shown in (`3.470 in`, `10.0`): without an allowance, its digits and unit; with
/// one, the limit and allowance together to the finer decimal place of the two (`4.030 in`
/// allowing `0.0050 in` is `4.0350 in`). `None` for a limit computed from anything else.
fn limits_written(o: &Outcome, n: &Numeric) -> [Option<String>; 2] {
    let TestKind::Limit { limit, .. } = &o.rule.test.kind else {
        return [None, None];
    };
    let allowance = match &limit.allowance {
        None => None,
        Some(a) => match literal_text(a, n.unit) {
            Some((text, _)) => Some(Digits::as_written(&text)),
            None => return [None, None],
        },
    };
    let shown = |e: &Expr, value: Option<f64>| {
        let (text, si) = literal_text(e, n.unit)?;
        match (allowance, value) {
            (None, Some(v)) if (v - si).abs() <= 1e-12 * si.abs() => Some(text),
            (Some(a), Some(v)) => Some(a.finer(Digits::as_written(&text)).quantity(v, n.unit)),
            _ => None,
        }
    };
    let (first, second) = limit.limits();
    match (n.range, second) {
        (Some((low, high)), Some(second)) => [shown(first, Some(low)), shown(second, Some(high))],
        _ => [shown(first, Some(n.limit)), None],
    }
}

/// A literal (or a negated one) written in `unit`, exactly as written, with its value (SI).
fn literal_text(e: &Expr, unit: Option<&Unit>) -> Option<(String, f64)> {
    let (negative, l) = match &e.kind {
        ExprKind::Literal(l) => (false, l),
        ExprKind::Negate(inner) => match &inner.kind {
            ExprKind::Literal(l) => (true, l),
            _ => return None,
        },
        _ => return None,
    };
    if l.uncertain.is_some() || l.unit.map(|u| u.symbol) != unit.map(|u| u.symbol) {
        return None;
    }
    let sign = if negative { "-" } else { "" };
    let text = match l.unit {
        Some(u) => format!("{sign}{} {}", l.written, u.symbol),
        None => format!("{sign}{}", l.written),
    };
    Some((text, if negative { -l.si } else { l.si }))
}

/// The reading a limit tests when its subject is a reading itself (`bore`, `max(bore)`):
/// the input at the deciding cylinder, or the one whose value the subject took.
fn subject_reading<'r>(o: &Outcome, r: &'r EngineReport, n: &Numeric) -> Option<&'r Input> {
    let TestKind::Limit { limit, .. } = &o.rule.test.kind else {
        return None;
    };
    let measurement = match &limit.subject.kind {
        ExprKind::Measurement(m) => *m,
        ExprKind::Reduce(Reduce::Max | Reduce::Min, inner) => match inner.kind {
            ExprKind::Measurement(m) => m,
            _ => return None,
        },
        _ => return None,
    };
    let ids: &[InputId] = match r.declaration.supplied(measurement.index())? {
        Supplied::Single(id) => std::slice::from_ref(id),
        Supplied::PerCylinder(ids) => ids,
        Supplied::Text(..) => return None,
    };
    let at = n.cylinder.and_then(|c| ids.get(c.checked_sub(1)?));
    at.into_iter()
        .chain(ids)
        .map(|id| r.input(*id))
        .find(|i| i.value.to_bits() == n.value.to_bits())
}

/// A value outside its domain in words, its inputs entered in the book: `compression_ratio
/// needs a positive clearance volume (source); on cylinder 3, chamber[3] 40 cc, ... give a
/// clearance volume of -2.2 cc`. The one place such a reason is worded.
fn breach_view(b: &Breach, r: &EngineReport, book: &mut Book) -> BreachView {
    let inputs: Vec<usize> = b.inputs.iter().map(|id| book.number(*id, r)).collect();
    let read: Vec<&InputView> = inputs.iter().filter_map(|i| book.inputs.get(*i)).collect();
    let unit = breach_unit(b, r);
    let shown = match unit {
        _ if !b.value.is_finite() => "that is not a finite number".to_string(),
        Some(u) => format!("of {}", quantity(b.value, u)),
        None if b.value == 0.0 => "of 0".to_string(),
        None if b.value < 0.0 => "below zero".to_string(),
        None => format!("of {} (SI units)", quantity(b.value, None)),
    };
    let article = if b.quantity.starts_with(['a', 'e', 'i', 'o', 'u']) {
        "an"
    } else {
        "a"
    };
    let source = b.source.map(|s| format!(" ({s})")).unwrap_or_default();
    let on = b
        .cylinder
        .map(|c| format!("on cylinder {c}, "))
        .unwrap_or_default();
    let values: Vec<String> = read
        .iter()
        .map(|i| format!("{} {}", i.label, i.as_written()))
        .collect();
    let given = match values.as_slice() {
        [] => format!("{on}the rulebook's constants give"),
        [one] => format!("{on}{one} gives"),
        many => format!("{on}{} give", many.join(", ")),
    };
    BreachView {
        by: b.by,
        needs: b.needs,
        source: b.source,
        quantity: b.quantity,
        value: b.value / unit.flatten().map_or(1.0, |u| u.to_si),
        unit: unit.flatten().map(|u| u.symbol),
        cylinder: b.cylinder,
        inputs,
        reason: format!(
            "{} needs {}{source}; {given} {article} {} {shown}",
            b.by, b.needs, b.quantity
        ),
    }
}

/// The unit a breaking value is shown in: that of its first input of the same dimension, else
/// the usual one for its dimension (`Some(None)` for a plain number); for an operand, whose
/// dimension is not known, the unit of its one input when it is that input (`None`: unknown).
fn breach_unit(b: &Breach, r: &EngineReport) -> Option<Option<&'static Unit>> {
    let unit_of = |id: &InputId| r.input(*id).unit.and_then(units::lookup);
    match b.dimension {
        Some(d) if d.is_dimensionless() => Some(None),
        Some(d) => Some(
            b.inputs
                .iter()
                .filter_map(unit_of)
                .find(|u| u.dimension == d)
                .or_else(|| units::display_unit(d)),
        ),
        None => match b.inputs.as_slice() {
            [one] if r.input(*one).value == b.value => Some(unit_of(one)),
            _ => None,
        },
    }
}

/// The coverage of a finding's numbers in words.
fn coverage_of(numbers: &Numeric) -> String {
    coverage_words(numbers.k, numbers.degrees_of_freedom)
}

/// `k = 2` for a factor as written, `k = 2.06, ν_eff = 25.5` with finite effective degrees of
/// freedom; a k from the t-distribution to two decimals.
fn coverage_words(k: f64, nu: f64) -> String {
    let trim = |t: String| t.trim_end_matches('0').trim_end_matches('.').to_string();
    let k = if (k * 1000.0).fract() == 0.0 {
        format!("{k}")
    } else {
        trim(format!("{k:.2}"))
    };
    if nu.is_finite() {
        format!("k = {k}, {}", degrees_of_freedom_words(nu))
    } else {
        format!("k = {k}")
    }
}

/// From this many effective degrees of freedom on, the t-distribution is the normal one to
/// the digits k is shown with (t₉₅(1000) = 1.962, GUM Table G.2 from memory): ν_eff is shown
/// as at least this.
const MANY_DEGREES_OF_FREEDOM: f64 = 1000.0;

/// `ν_eff = 25` for 25.5: truncated to the integer below, as the GUM takes it for Table G.2
/// (JCGM 100:2008, G.4.1 and G.6.4, from memory); `ν_eff ≥ 1000` for more.
fn degrees_of_freedom_words(nu: f64) -> String {
    if nu >= MANY_DEGREES_OF_FREEDOM {
        format!("ν_eff ≥ {MANY_DEGREES_OF_FREEDOM}")
    } else {
        format!("ν_eff = {}", nu.floor().max(0.0))
    }
}

/// The engine's inputs and derived values, each entered once as the rules are viewed.
#[derive(Default)]
struct Book {
    inputs: Vec<InputView>,
    numbers: HashMap<InputId, usize>,
    texts: HashMap<String, usize>,
    derived: Vec<DerivedView>,
    gauges: Vec<GaugeView>,
}

impl Book {
    fn trace(
        &mut self,
        t: &Trace,
        r: &EngineReport,
        limit_unit: Option<&'static Unit>,
    ) -> TraceRef {
        match t {
            Trace::Input(id) => TraceRef::Input(self.number(*id, r)),
            Trace::Text {
                name,
                value,
                written,
                place,
            } => {
                let origin = format!("{}.{name}", place.key());
                let next = self.inputs.len();
                let id = *self.texts.entry(origin.clone()).or_insert(next);
                if id == next {
                    self.inputs.push(InputView {
                        id,
                        label: name.to_string(),
                        origin,
                        cylinder: None,
                        measurement: None,
                        value: InputValue::Text {
                            value: value.to_string(),
                            written: written.map(str::to_string),
                        },
                    });
                }
                TraceRef::Input(id)
            }
            Trace::Derived {
                derived,
                values,
                uncertainties,
            } => {
                let unit = derived_unit(derived, r, limit_unit);
                TraceRef::Derived(self.derived(derived, values, uncertainties, unit))
            }
            Trace::Missing { name } => TraceRef::Missing(name.to_string()),
            Trace::Gauge { name, result } => TraceRef::Gauge(self.gauge(name, result)),
        }
    }

    /// A gauge result's id, each result once.
    fn gauge(&mut self, measurement: &str, result: &GaugeResult) -> usize {
        if let Some(g) = self.gauges.iter().find(|g| g.origin == result.origin) {
            return g.id;
        }
        let id = self.gauges.len();
        self.gauges.push(gauge_view(id, measurement, result));
        id
    }

    fn number(&mut self, input_id: InputId, r: &EngineReport) -> usize {
        if let Some(id) = self.numbers.get(&input_id) {
            return *id;
        }
        let id = self.inputs.len();
        self.inputs.push(input_view(id, r.input(input_id), r));
        self.numbers.insert(input_id, id);
        id
    }

    /// A derived value's id; one computed with other values elsewhere gets its own.
    fn derived(
        &mut self,
        d: &Derived,
        values: &[f64],
        uncertainties: &[f64],
        unit: Option<&'static Unit>,
    ) -> usize {
        let scale = unit.map_or(1.0, |u| u.to_si);
        let view = DerivedView {
            id: self.derived.len(),
            name: d.name.clone(),
            formula: d.formula.clone(),
            unit: unit.map(|u| u.symbol),
            values: values.iter().map(|v| v / scale).collect(),
            standard_uncertainties: uncertainties.iter().map(|u| u / scale).collect(),
            shown: derived_shown(values, uncertainties, unit),
        };
        let same = |e: &&DerivedView| {
            e.name == view.name
                && e.values == view.values
                && e.standard_uncertainties == view.standard_uncertainties
        };
        if let Some(e) = self.derived.iter().find(same) {
            return e.id;
        }
        self.derived.push(view);
        self.derived.len() - 1
    }
}

fn input_view(id: usize, input: &Input, r: &EngineReport) -> InputView {
    let unit = input.unit.and_then(units::lookup);
    let scale = unit.map_or(1.0, |u| u.to_si);
    let (measurement, cylinder) = match input.name {
        InputName::Measured {
            measurement,
            cylinder,
            ..
        } => (Some(measurement), cylinder),
        InputName::Literal(_) | InputName::Calibration { .. } => (None, None),
    };
    InputView {
        id,
        label: input.label(r.rulebook),
        origin: input.origin(r.rulebook),
        cylinder,
        measurement,
        value: InputValue::Number {
            written: written(input, unit),
            unit: unit.map(|u| u.symbol),
            value: input.value / scale,
            standard_uncertainty: input.standard_uncertainty / scale,
            uncertainty_from: uncertainty_from(&input.source, scale),
            uncertainty_shown: uncertainty_words(input, unit),
        },
    }
}

/// The value as written, without a stated `± U` (a rulebook literal's as the rulebook wrote
/// it); formatted when it was not written as text.
fn written(input: &Input, unit: Option<&Unit>) -> String {
    let text = match &input.name {
        InputName::Literal(text) => input.written.as_deref().or(Some(text.as_str())),
        InputName::Measured { .. } | InputName::Calibration { .. } => input.written.as_deref(),
    };
    let value = text.map(|w| {
        let end = w.find('±').or_else(|| w.find("+/-")).unwrap_or(w.len());
        w[..end].trim()
    });
    match value {
        Some(v) if !v.is_empty() => v.to_string(),
        _ => quantity(input.value, unit),
    }
}

fn uncertainty_from(source: &UncertaintySource, scale: f64) -> UncertaintyFrom {
    match source {
        UncertaintySource::None => UncertaintyFrom::None,
        UncertaintySource::Stated { k } => UncertaintyFrom::Stated { k: *k },
        UncertaintySource::Instrument(i) => UncertaintyFrom::Instrument(i.clone()),
        UncertaintySource::Rulebook => UncertaintyFrom::Rulebook,
        UncertaintySource::Calibration {
            instrument,
            readings,
        } => UncertaintyFrom::Calibration {
            instrument: instrument.clone(),
            readings: *readings,
        },
        UncertaintySource::Repeated {
            count,
            spread,
            instrument,
        } => UncertaintyFrom::Repeated {
            count: *count,
            standard_deviation: spread / scale,
            degrees_of_freedom: count.saturating_sub(1),
            instrument: instrument.clone(),
        },
    }
}

fn uncertainty_words(input: &Input, unit: Option<&Unit>) -> String {
    let u = Digits::supported_in(input.standard_uncertainty, unit)
        .quantity(input.standard_uncertainty, unit);
    match &input.source {
        UncertaintySource::None => "no uncertainty stated".to_string(),
        UncertaintySource::Instrument(i) => format!("u {u} ({i})"),
        UncertaintySource::Stated { k } => format!("u {u} (stated, k = {k})"),
        UncertaintySource::Rulebook => format!("u {u} (rulebook)"),
        UncertaintySource::Calibration { readings, .. } => {
            let readings = super::format::count(*readings, "reading", "readings");
            format!("u {u} (calibration, shared by {readings})")
        }
        UncertaintySource::Repeated {
            count,
            spread,
            instrument,
        } => {
            let with = instrument
                .as_ref()
                .map(|i| format!(" with {i}"))
                .unwrap_or_default();
            format!(
                "mean {}, s {}, n {count} (ν = {}): u {u}{with}",
                Digits::supported_in(input.standard_uncertainty, unit).quantity(input.value, unit),
                Digits::supported_in(*spread, unit).quantity(*spread, unit),
                count.saturating_sub(1)
            )
        }
    }
}

fn derived_shown(values: &[f64], uncertainties: &[f64], unit: Option<&Unit>) -> String {
    if values.is_empty() {
        return "not computed".to_string();
    }
    values
        .iter()
        .zip(uncertainties)
        .map(|(v, u)| {
            let scale = unit.map_or(1.0, |x| x.to_si);
            let symbol = unit.map(|x| format!(" {}", x.symbol)).unwrap_or_default();
            let (v, u) = with_uncertainty(v / scale, u / scale);
            format!("{v}{symbol} (u {u}{symbol})")
        })
        .collect::<Vec<_>>()
        .join(", ")
}

/// The unit a derived value is shown in: from the families of the units its readings and
/// the rulebook's numbers in its formula were written in, the limit's unit when they mix
/// (see [`units::shown_unit`]).
fn derived_unit(
    d: &Derived,
    r: &EngineReport,
    limit_unit: Option<&'static Unit>,
) -> Option<&'static Unit> {
    let ValueKind::Number(dim) = d.ty.kind else {
        return None;
    };
    let mut written = Vec::new();
    if let Term::Number(e) = &d.body {
        written_units(e, r, &mut written, 0);
    }
    units::shown_unit(dim, written, limit_unit)
}

/// The units the readings and rulebook numbers an expression reads were written in.
fn written_units(e: &Expr, r: &EngineReport, out: &mut Vec<&'static str>, depth: usize) {
    let mut each = |e: &Expr| written_units(e, r, out, depth + 1);
    match &e.kind {
        ExprKind::Literal(l) => out.extend(l.unit.map(|u| u.symbol)),
        ExprKind::Pi => {}
        ExprKind::Measurement(m) => {
            let ids: &[InputId] = match r.declaration.supplied(m.index()) {
                Some(Supplied::Single(id)) => std::slice::from_ref(id),
                Some(Supplied::PerCylinder(ids)) => ids,
                _ => &[],
            };
            out.extend(ids.iter().filter_map(|id| r.input(*id).unit));
        }
        ExprKind::Derived(d) if depth < 32 => {
            if let Some(Term::Number(body)) = r.rulebook.derived.get(d.index()).map(|d| &d.body) {
                each(body);
            }
        }
        ExprKind::Derived(_) => {}
        ExprKind::Negate(inner)
        | ExprKind::Reduce(_, inner)
        | ExprKind::Abs(inner)
        | ExprKind::Sqrt(inner) => each(inner),
        ExprKind::Binary { left, right, .. } => {
            each(left);
            each(right);
        }
        ExprKind::Formula(call) => call.args().iter().for_each(each),
        ExprKind::Extreme { args, .. } => args.iter().for_each(each),
    }
}

/// The rule that decided an engine's result: the first illegal one, else the first not
/// checked, else the one with the least probability of conformance (among certain passes,
/// the least margin for its limit).
pub fn closest_call(r: &EngineReport) -> Option<ClosestCall> {
    let call = |o: &Outcome, call: String| ClosestCall {
        section: o.section().to_string(),
        title: o.title().to_string(),
        call,
    };
    if let Some(o) = r.outcomes.iter().find(|o| o.verdict == Verdict::Illegal) {
        let words = o
            .checked
            .as_ref()
            .map_or(o.verdict.words(), |c| c.finding.words());
        return Some(call(o, words.to_string()));
    }
    if let Some(o) = r.outcomes.iter().find(|o| o.verdict == Verdict::NotChecked) {
        return Some(call(o, "not checked".to_string()));
    }
    // a call by gauge results that proves nothing has no probability to rank it by, and is
    // the least known
    let by_gauge = r.outcomes.iter().find_map(|o| {
        let c = o.checked.as_ref()?;
        (c.gauge.is_some() && c.finding.is_conditional()).then_some((o, c))
    });
    if let Some((o, c)) = by_gauge {
        return Some(call(o, format!("{}, by gauge", c.finding.words())));
    }
    let closeness = |n: &Numeric| {
        (
            n.probability,
            n.margin / n.limit.abs().max(f64::MIN_POSITIVE),
        )
    };
    r.outcomes
        .iter()
        .filter_map(|o| {
            let c = o.checked.as_ref()?;
            Some((o, c, c.numeric.as_ref()?))
        })
        .min_by(|a, b| {
            closeness(a.2)
                .partial_cmp(&closeness(b.2))
                .unwrap_or(std::cmp::Ordering::Equal)
        })
        .map(|(o, c, n)| {
            let p = probability(n.probability, n.expanded > 0.0);
            call(o, format!("{}, p {p}", c.finding.words()))
        })
}

/// One go/no-go gauge result, in the unit its size was written in.
#[derive(Clone, Debug, PartialEq, Serialize)]
pub struct GaugeView {
    /// Its id within the engine: its position in [`EngineView::gauges`].
    pub id: usize,
    /// The measurement it was tried on.
    pub measurement: String,
    /// Where it was written: `components.carburetor.throttle_bore.gauges[2]`.
    pub origin: String,
    /// `plug` or `ring`.
    pub kind: GaugeKind,
    /// The gauge's tag.
    pub tag: String,
    /// Its size as written, with its `± U`.
    pub size_written: String,
    /// The unit of `size`, `expanded_uncertainty` and `proves.value`.
    pub unit: Option<&'static str>,
    /// Its stated size.
    pub size: f64,
    /// The expanded uncertainty of its size, U.
    pub expanded_uncertainty: f64,
    /// The coverage factor of U.
    pub k: f64,
    /// The result as the declaration writes it: `entered`, `did not enter`, `went over`,
    /// `did not go over`.
    pub result: &'static str,
    /// The bound the result proves, its size's U counted.
    pub proves: BoundView,
    /// `plug TV-G-0412 1.6875 in (U = 0.0002 in, k = 2) entered: carburetor.throttle_bore is
    /// at least 1.6873 in`.
    #[serde(skip)]
    pub words: String,
}

/// A one-sided bound on a measurand.
#[derive(Clone, Debug, PartialEq, Serialize)]
pub struct BoundView {
    /// `at_least`, `more_than`, `at_most` or `less_than`.
    pub side: &'static str,
    /// Where it lies, in the gauge's unit.
    pub value: f64,
    /// `at least 1.6873 in`.
    #[serde(skip)]
    pub words: String,
}

/// A limit decided from gauge results: what they prove about each side of it.
#[derive(Clone, Debug, PartialEq, Serialize)]
pub struct GaugeCallView {
    /// The gauged measurement.
    pub measurement: String,
    /// The unit of each side's `limit`.
    pub unit: Option<&'static str>,
    /// Each side of the limit: one, or two for a range (low first).
    pub sides: Vec<GaugeSideView>,
}

/// One side of a limit against gauge results.
#[derive(Clone, Debug, PartialEq, Serialize)]
pub struct GaugeSideView {
    /// `at_most`, `less_than`, `at_least` or `more_than`.
    pub side: &'static str,
    /// The limit, allowance included, in the call's unit.
    pub limit: f64,
    /// What the results prove about it.
    pub finding: Finding,
    /// The result that decided it, by id in [`EngineView::gauges`]; null when open.
    pub decided_by: Option<usize>,
    /// The side in words, with the result that decided it and what it proves.
    #[serde(skip)]
    pub words: String,
}

/// A gauged measurement a rule could not be decided from.
#[derive(Clone, Debug, PartialEq, Serialize)]
pub struct GaugeGapView {
    /// The measurement.
    pub measurement: String,
    /// Its gauges: `plug TV-G-0411`.
    pub gauges: Vec<String>,
    /// Why, as data.
    pub why: GaugeWhy,
    /// Why, in words.
    pub reason: String,
}

/// The decimal places to show a gauge's numbers with: the most of its size's and its U's
/// as written (`1.6875 in ± 0.0002 in` has 4), so `s − U` reads at the same resolution.
fn gauge_places(written: &str) -> Option<usize> {
    let places = |part: &str| {
        let number = part.split_whitespace().next()?;
        let (_, decimals) = number.split_once('.')?;
        Some(decimals.chars().take_while(char::is_ascii_digit).count())
    };
    let (size, u) = match written.split_once('±') {
        Some((size, u)) => (size, Some(u)),
        None => match written.split_once("+/-") {
            Some((size, u)) => (size, Some(u)),
            None => (written, None),
        },
    };
    match (places(size), u.and_then(places)) {
        (Some(a), Some(b)) => Some(a.max(b)),
        (a, b) => a.or(b),
    }
}

/// `1.6873 in`: a value in a gauge's unit with its places, else six significant digits.
fn gauge_number(value: f64, places: Option<usize>, unit: Option<&str>) -> String {
    let number = match places {
        Some(p) => format!("{value:.p$}"),
        None => super::format::shortest(value),
    };
    match unit {
        Some(u) => format!("{number} {u}"),
        None => number,
    }
}

/// The side of a bound and its words: `at least`, `more than`, `at most`, `less than`.
fn bound_side(below: bool, strict: bool) -> (&'static str, &'static str) {
    match (below, strict) {
        (true, false) => ("at_least", "at least"),
        (true, true) => ("more_than", "more than"),
        (false, false) => ("at_most", "at most"),
        (false, true) => ("less_than", "less than"),
    }
}

/// A bound in the unit shown.
fn bound_view(b: Bound, scale: f64, places: Option<usize>, unit: Option<&str>) -> BoundView {
    let (side, words) = bound_side(b.below, b.strict);
    let value = b.at / scale;
    BoundView {
        side,
        value,
        words: format!("{words} {}", gauge_number(value, places, unit)),
    }
}

fn gauge_view(id: usize, measurement: &str, g: &GaugeResult) -> GaugeView {
    let scale = g.unit.and_then(units::lookup).map_or(1.0, |u| u.to_si);
    let places = gauge_places(&g.written);
    let size = gauge_number(g.size / scale, places, g.unit);
    let u = gauge_number(g.expanded / scale, places, g.unit);
    let proves = bound_view(g.proven(), scale, places, g.unit);
    let result = g.kind.result_words(g.went);
    let k = super::format::shortest(g.k);
    GaugeView {
        id,
        measurement: measurement.to_string(),
        origin: g.origin.clone(),
        kind: g.kind,
        tag: g.tag.clone(),
        size_written: g.written.clone(),
        unit: g.unit,
        size: g.size / scale,
        expanded_uncertainty: g.expanded / scale,
        k: g.k,
        result,
        words: format!(
            "{} {size} (U = {u}, k = {k}) {result}: {measurement} is {}",
            g.name(),
            proves.words
        ),
        proves,
    }
}

fn gauged_name(r: &EngineReport, measurement: usize) -> String {
    r.rulebook
        .measurements
        .get(measurement)
        .map_or_else(|| "?".to_string(), |m| m.name.clone())
}

fn gauge_results<'r>(r: &'r EngineReport, measurement: usize) -> &'r [GaugeResult] {
    r.declaration
        .gauged(measurement)
        .map(|g| g.results.as_slice())
        .unwrap_or_default()
}

fn gauge_call_view(call: &GaugeCall, r: &EngineReport, book: &mut Book) -> GaugeCallView {
    let name = gauged_name(r, call.measurement);
    let results = gauge_results(r, call.measurement);
    let places = results
        .iter()
        .filter_map(|g| gauge_places(&g.written))
        .max();
    let scale = call.unit.map_or(1.0, |u| u.to_si);
    let unit = call.unit.map(|u| u.symbol);
    let sides = call
        .sides
        .iter()
        .map(|side| {
            let decided = side.decided_by.and_then(|i| results.get(i));
            let decided_by = decided.map(|g| book.gauge(&name, g));
            GaugeSideView {
                side: bound_side(!side.limit.upper, side.limit.strict).0,
                limit: side.limit.at / scale,
                finding: side.finding,
                decided_by,
                words: side_words(side, decided, &name, (scale, places, unit)),
            }
        })
        .collect();
    GaugeCallView {
        measurement: name,
        unit,
        sides,
    }
}

/// One side of a limit against gauge results in words, ISO 14253-1's reading of each finding
/// ([`crate::evaluate::gauge`]).
fn side_words(
    side: &SideFinding,
    decided: Option<&GaugeResult>,
    name: &str,
    (scale, places, unit): (f64, Option<usize>, Option<&str>),
) -> String {
    let l: LimitSide = side.limit;
    let limit = format!(
        "{} {}",
        bound_side(!l.upper, l.strict).1,
        gauge_number(l.at / scale, places, unit)
    );
    let Some(g) = decided else {
        let from = if l.upper { "above" } else { "below" };
        return format!(
            "no gauge result bounds {name} from {from} closely enough to decide the limit \
             ({limit}): neither conformity nor nonconformity is proven"
        );
    };
    let size = gauge_number(g.size / scale, places, unit);
    let tried = format!("{} {size} {}", g.name(), g.kind.result_words(g.went));
    let proven = bound_view(g.proven(), scale, places, unit).words;
    let nominal = bound_view(g.nominal(), scale, places, unit).words;
    match side.finding {
        Finding::Pass => format!(
            "{tried}: {name} is {proven} with the gauge's U counted, inside the limit \
             ({limit}): conformity proven (ISO 14253-1)"
        ),
        Finding::Fail => format!(
            "{tried}: {name} is {proven} with the gauge's U counted, beyond the limit \
             ({limit}): nonconformity proven (ISO 14253-1)"
        ),
        Finding::ConditionalPass => format!(
            "{tried}: {name} is {nominal} at the gauge's stated size, inside the limit \
             ({limit}), but only {proven} with its U counted: conformity not proven"
        ),
        Finding::ConditionalFail => format!(
            "{tried}: {name} is {nominal} at the gauge's stated size, beyond the limit \
             ({limit}), but only {proven} with its U counted: nonconformity not proven"
        ),
        Finding::Open => format!("{tried}: neither conformity nor nonconformity is proven"),
    }
}

fn gauge_gap_view(gap: &GaugeGap, r: &EngineReport) -> GaugeGapView {
    let name = gauged_name(r, gap.measurement);
    let gauges: Vec<String> = r
        .declaration
        .gauged(gap.measurement)
        .map(|g| g.names())
        .unwrap_or_default();
    let gauged = format!("{name} was gauged ({})", gauges.join(", "));
    let reason = match gap.why {
        GaugeWhy::NeedsAValue => format!(
            "{gauged}, which gives bounds, not a value: the rule reads it inside an \
             expression or as a limit"
        ),
        GaugeWhy::Equality => format!("{gauged}: a bound never proves `==` or `!=`"),
        GaugeWhy::UnsureLimit => format!(
            "{gauged}: the limit carries an uncertainty of its own or differs by cylinder, \
             which gonogo does not decide from bounds"
        ),
        GaugeWhy::OpenUnderSimpleAcceptance => format!(
            "{gauged}, and the results leave the rule open: simple acceptance decides on a \
             measured value, which gauges do not give"
        ),
    };
    GaugeGapView {
        measurement: name,
        gauges,
        why: gap.why,
        reason,
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    fn input(written: Option<&str>, value: f64, source: UncertaintySource) -> Input {
        Input {
            name: InputName::Measured {
                measurement: 0,
                cylinder: None,
                place: crate::load::Place::Measurements,
            },
            value,
            standard_uncertainty: 0.0,
            components: Vec::new(),
            unit: Some("in"),
            written: written.map(str::to_string),
            source,
        }
    }

    #[test]
    fn a_value_is_shown_with_its_digits_as_written_and_without_its_stated_uncertainty() {
        let inch = units::lookup("in");
        let as_written = |w: &str| written(&input(Some(w), 0.0, UncertaintySource::None), inch);
        assert_eq!(as_written("4.100 in"), "4.100 in");
        assert_eq!(as_written("3.480 in ± 0.001 in"), "3.480 in");
        assert_eq!(as_written("3.480 in +/- 0.002 in (k = 2)"), "3.480 in");
        // 0.0254 m is 1 in exactly (NIST SP 811, B.8)
        assert_eq!(
            written(&input(None, 0.0254, UncertaintySource::None), inch),
            "1 in"
        );
    }

    #[test]
    fn a_rulebook_literal_is_shown_as_the_rulebook_wrote_it() {
        let mm = units::lookup("mm");
        let literal = Input {
            name: InputName::Literal("50.000623 mm ± 0.00004 mm (k = 2)".to_string()),
            ..input(None, 0.050_000_623, UncertaintySource::Rulebook)
        };
        assert_eq!(written(&literal, mm), "50.000623 mm");
    }

    #[test]
    fn k_is_shown_as_written_or_to_two_decimals_with_finite_degrees_of_freedom() {
        assert_eq!(coverage_words(2.0, f64::INFINITY), "k = 2");
        assert_eq!(coverage_words(1.959_963_985, f64::INFINITY), "k = 1.96");
        assert_eq!(
            coverage_words(2.057_451_959, 25.510_204),
            "k = 2.06, ν_eff = 25"
        );
        // GUM G.4.1, G.6.4 (from memory): a ν_eff that is not an integer is truncated
        assert_eq!(coverage_words(4.3, 2.0), "k = 4.3, ν_eff = 2");
        assert_eq!(coverage_words(2.01, 49.7), "k = 2.01, ν_eff = 49");
        assert_eq!(coverage_words(1.96, 999.9), "k = 1.96, ν_eff = 999");
        assert_eq!(coverage_words(1.96, 1_002_785.7), "k = 1.96, ν_eff ≥ 1000");
    }

    #[test]
    fn an_input_without_an_uncertainty_says_so() {
        let inch = units::lookup("in");
        let exact = input(Some("4.100 in"), 0.104_14, UncertaintySource::None);
        assert_eq!(uncertainty_words(&exact, inch), "no uncertainty stated");
        let gauged = input(
            Some("4.100 in"),
            0.104_14,
            UncertaintySource::Instrument("bore_gauge".to_string()),
        );
        assert_eq!(uncertainty_words(&gauged, inch), "u 0 in (bore_gauge)");
    }

    #[test]
    fn trace_lines_read_as_the_text_report_prints_them() {
        let number = TraceLine::Values {
            label: "gasket.bore".to_string(),
            values: "4.100 in".to_string(),
            uncertainty: Some("no uncertainty stated".to_string()),
            origin: "measurements.gasket.bore".to_string(),
        };
        assert_eq!(
            number.words(),
            "gasket.bore = 4.100 in  no uncertainty stated  [measurements.gasket.bore]"
        );
        let text = TraceLine::Values {
            label: "head.casting".to_string(),
            values: "\"TVH-2204\"".to_string(),
            uncertainty: None,
            origin: "components.head.casting".to_string(),
        };
        assert_eq!(
            text.words(),
            "head.casting = \"TVH-2204\"  [components.head.casting]"
        );
        assert_eq!(
            TraceLine::Missing("deck_clearance").words(),
            "deck_clearance: missing"
        );
    }
}

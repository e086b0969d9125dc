//! The checked rulebook: what the static checks hand on to evaluation. Every measurement has
//! its dimension, each class's rules are flattened through `extends`, `override`, `drop` and
//! bulletins, and every rule and derived value carries its [`resolved`](super::resolved) form
//! (names as ids, calls bound, patterns compiled) beside the form as written.

use regex::Regex;

use super::resolved::{self, Read, Term, UncertainLiteral};
use crate::parse::ast::{self, Condition, DecisionRule, Expr, ListKind, Rule};
use crate::source::Span;
use crate::units::Dimension;

/// What a quantity holds.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum ValueKind {
    /// A number of this dimension.
    Number(Dimension),
    /// An identifier or other text.
    Text,
}

impl std::fmt::Display for ValueKind {
    fn fmt(&self, f: &mut std::fmt::Formatter<'_>) -> std::fmt::Result {
        match self {
            ValueKind::Number(d) => d.fmt(f),
            ValueKind::Text => f.write_str("text"),
        }
    }
}

/// The type of an expression: what it holds and whether it has one value per cylinder.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub struct Type {
    /// Number or text.
    pub kind: ValueKind,
    /// One value per cylinder.
    pub per_cylinder: bool,
}

/// One measurement of the schema.
#[derive(Clone, Debug)]
pub struct Measurement {
    /// Its name in declarations.
    pub name: String,
    /// The dimension word as written (`count` and `ratio` differ only in wording).
    pub dimension_word: String,
    /// What it holds.
    pub kind: ValueKind,
    /// One value per cylinder.
    pub per_cylinder: bool,
    /// A declaration must supply it.
    pub required: bool,
    /// The plausible range, in SI units.
    pub range: Option<(f64, f64)>,
    /// The unit the rulebook writes this measurement in (from its `range`), if it writes one.
    pub unit: Option<&'static str>,
    /// The procedure text.
    pub procedure: Option<String>,
    /// Where it is declared.
    pub span: Span,
}

/// One derived value.
#[derive(Clone, Debug)]
pub struct Derived {
    /// Its name.
    pub name: String,
    /// Its expression.
    pub expr: Expr,
    /// The expression in the rulebook's canonical words.
    pub formula: String,
    /// The names it reads, each once, in the order first read.
    pub reads: Vec<String>,
    /// Its type.
    pub ty: Type,
    /// Its expression, resolved.
    pub body: Term,
    /// The measurements and derived values it reads, each once, in the order first read.
    pub read_ids: Vec<Read>,
    /// Where it is defined.
    pub span: Span,
}

/// One entry of a parts list, ready to match.
#[derive(Clone, Debug)]
pub enum PartEntry {
    /// An exact identifier.
    Exact(String),
    /// A compiled pattern, with its source text.
    Pattern(Regex, String),
}

/// A parts list with compiled patterns.
#[derive(Clone, Debug)]
pub struct PartsList {
    /// Its name.
    pub name: String,
    /// Approved or banned.
    pub kind: ListKind,
    /// Its title.
    pub title: Option<String>,
    /// Its entries.
    pub entries: Vec<PartEntry>,
    /// Where it is defined.
    pub span: Span,
}

impl PartsList {
    /// Whether an identifier is on the list.
    pub fn contains(&self, id: &str) -> bool {
        self.entries.iter().any(|e| match e {
            PartEntry::Exact(s) => s == id,
            PartEntry::Pattern(re, _) => re.is_match(id),
        })
    }
}

/// Where a rule of a flattened class comes from.
#[derive(Clone, Debug, PartialEq)]
pub enum Origin {
    /// Written in this class or one it extends (the class named).
    Class(String),
    /// Added or replaced by a bulletin (its id).
    Bulletin(String),
}

/// A rule as the flattening of classes places it: the rule as written and every condition
/// it sits under, before it is resolved into a [`ClassRule`].
#[derive(Clone, Debug)]
pub struct WrittenRule {
    /// The rule as written.
    pub rule: Rule,
    /// The conditions of enclosing `when` groups, outermost first, then the rule's own.
    pub conditions: Vec<Condition>,
    /// Where it was written.
    pub origin: Origin,
    /// The requirement in the rulebook's canonical words.
    pub requirement: String,
    /// Each condition in canonical words.
    pub condition_texts: Vec<String>,
    /// The names its conditions and requirement read, each once, in the order first read.
    pub reads: Vec<String>,
    /// The requirement's limit in normal form; `None` for a membership or pattern test.
    pub limit: Option<super::limit::Limit<Expr>>,
}

impl WrittenRule {
    /// A rule under its conditions, with its texts and the names it reads worked out once.
    pub fn new(rule: Rule, conditions: Vec<Condition>, origin: Origin) -> WrittenRule {
        let mut names = Vec::new();
        conditions.iter().for_each(|c| c.names(&mut names));
        rule.require.names(&mut names);
        WrittenRule {
            requirement: crate::parse::print::test_text(&rule.require),
            condition_texts: conditions
                .iter()
                .map(crate::parse::print::condition_text)
                .collect(),
            reads: unique(names),
            limit: super::limit::owned(&rule.require),
            rule,
            conditions,
            origin,
        }
    }
}

impl WrittenRule {
    /// The decision rule that decides this rule: the one given on the command line (`--as`)
    /// when there is one, else the rule's own `decision`, else the rulebook's.
    pub fn decision_in_force(
        &self,
        command_line: Option<DecisionRule>,
        rulebook: DecisionRule,
    ) -> DecisionRule {
        command_line
            .or(self.rule.decision.as_ref().map(|d| d.rule))
            .unwrap_or(rulebook)
    }
}

/// A rule as it stands in a class: the rule as written (every [`WrittenRule`] field reads
/// through, `rule.requirement`, `rule.limit` …) and the same rule resolved.
#[derive(Clone, Debug)]
pub struct ClassRule {
    /// The rule as written, with its texts and limit.
    pub written: WrittenRule,
    /// The requirement, resolved.
    pub test: resolved::Test,
    /// The conditions, resolved, in the order of `conditions`.
    pub when: Vec<resolved::Condition>,
    /// What its conditions and requirement read, each once, in the order first read.
    pub read_ids: Vec<Read>,
}

impl std::ops::Deref for ClassRule {
    type Target = WrittenRule;

    /// The rule as written: a resolved rule is the written one with more known about it.
    fn deref(&self) -> &WrittenRule {
        &self.written
    }
}

impl ClassRule {
    /// A written rule with its requirement and conditions resolved.
    pub fn resolved(
        written: WrittenRule,
        test: resolved::Test,
        when: Vec<resolved::Condition>,
    ) -> ClassRule {
        let mut read_ids = Vec::new();
        when.iter().for_each(|c| c.reads(&mut read_ids));
        test.reads(&mut read_ids);
        ClassRule {
            written,
            test,
            when,
            read_ids,
        }
    }
}

/// The names, each once, in the order first seen.
pub fn unique(names: Vec<&str>) -> Vec<String> {
    let mut out: Vec<String> = Vec::new();
    for n in names {
        if !out.iter().any(|o| o == n) {
            out.push(n.to_string());
        }
    }
    out
}

/// A class with its rules flattened at the edition's effective date.
#[derive(Clone, Debug)]
pub struct Class {
    /// Its name.
    pub name: String,
    /// Its title.
    pub title: Option<String>,
    /// The class it extends.
    pub extends: Option<String>,
    /// Its rules in force at the edition's effective date, in rulebook order.
    pub rules: Vec<ClassRule>,
    /// Bulletins already in force on the edition's effective date.
    pub edition_bulletins: Vec<String>,
    /// Its rules from each later bulletin date on (bulletins on the class or a class it
    /// extends), earliest first.
    pub amended: Vec<Amended>,
    /// Where it is defined.
    pub span: Span,
}

/// A class's rules as a bulletin left them.
#[derive(Clone, Debug)]
pub struct Amended {
    /// From when.
    pub from: ast::Date,
    /// Every bulletin in force by then, in order of date.
    pub bulletins: Vec<String>,
    /// The rules in force.
    pub rules: Vec<ClassRule>,
}

impl Class {
    /// The rules in force on `date` and the bulletins applied; the edition's rules when the
    /// date is not known.
    pub fn in_force(&self, date: Option<ast::Date>) -> (&[ClassRule], &[String]) {
        let latest = date.and_then(|d| self.amended.iter().rev().find(|a| a.from <= d));
        match latest {
            Some(a) => (&a.rules, &a.bulletins),
            None => (&self.rules, &self.edition_bulletins),
        }
    }
}

/// A bulletin, kept as written.
#[derive(Clone, Debug)]
pub struct Bulletin {
    /// Its id.
    pub id: String,
    /// The bulletin as written.
    pub source: ast::Bulletin,
}

/// How a rulebook takes the expanded uncertainty U = k·u its decisions are judged against.
#[derive(Clone, Copy, Debug, PartialEq)]
pub enum Coverage {
    /// A fixed coverage factor k (`coverage k = 2`).
    Factor(f64),
    /// A coverage probability p, 0 < p < 1 (`coverage 95 %`): k is the t-distribution's
    /// quantile at (1 + p)/2 for the effective degrees of freedom (GUM G.3, G.4).
    Probability(f64),
}

impl Default for Coverage {
    /// k = 2, for a rulebook without a `coverage` line.
    fn default() -> Coverage {
        Coverage::Factor(2.0)
    }
}

impl From<ast::CoverageSpec> for Coverage {
    fn from(spec: ast::CoverageSpec) -> Coverage {
        match spec {
            ast::CoverageSpec::Factor(k) => Coverage::Factor(k),
            ast::CoverageSpec::Percent(p) => Coverage::Probability(p / 100.0),
        }
    }
}

/// A rulebook that passed the static checks.
#[derive(Clone, Debug)]
pub struct CheckedRulebook {
    /// The series.
    pub series: String,
    /// The edition's name.
    pub edition: String,
    /// The edition's effective date.
    pub effective: ast::Date,
    /// The default decision rule.
    pub decision: DecisionRule,
    /// How expanded uncertainties are taken for every decision (`coverage`; k = 2 without).
    pub coverage: Coverage,
    /// The measurement schema, in the order written.
    pub measurements: Vec<Measurement>,
    /// Derived values, in the order written.
    pub derived: Vec<Derived>,
    /// Parts lists.
    pub lists: Vec<PartsList>,
    /// Classes, flattened.
    pub classes: Vec<Class>,
    /// Bulletins in order of their effective date.
    pub bulletins: Vec<Bulletin>,
    /// Where each measurement and derived value is, by name, for commands that look names up
    /// from what a user typed (evaluation reads ids, never names).
    pub index: std::collections::HashMap<String, Named>,
    /// Every literal with a stated uncertainty, by [`resolved::LiteralId`].
    pub literals: Vec<UncertainLiteral>,
}

/// What a name of the rulebook stands for.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum Named {
    /// The measurement at this position of `measurements`.
    Measurement(usize),
    /// The derived value at this position of `derived`.
    Derived(usize),
}

impl CheckedRulebook {
    /// The class with this name.
    pub fn class(&self, name: &str) -> Option<&Class> {
        self.classes.iter().find(|c| c.name == name)
    }

    /// The measurement with this name.
    pub fn measurement(&self, name: &str) -> Option<&Measurement> {
        match self.index.get(name) {
            Some(Named::Measurement(i)) => self.measurements.get(*i),
            _ => None,
        }
    }

    /// True when every name is a measurement the schema marks `optional` (and there is at
    /// least one): a rule that misses only these does not apply rather than go unchecked.
    pub fn all_optional(&self, names: &[String]) -> bool {
        !names.is_empty()
            && names
                .iter()
                .all(|n| self.measurement(n).is_some_and(|m| !m.required))
    }

    /// The position of the measurement with this name in `measurements`.
    pub fn measurement_index(&self, name: &str) -> Option<usize> {
        match self.index.get(name) {
            Some(Named::Measurement(i)) => Some(*i),
            _ => None,
        }
    }

    /// The derived value with this name.
    pub fn derived_value(&self, name: &str) -> Option<&Derived> {
        match self.index.get(name) {
            Some(Named::Derived(i)) => self.derived.get(*i),
            _ => None,
        }
    }

    /// The value in SI units of an expression as written that no engine affects: numbers
    /// without a stated uncertainty, `pi`, arithmetic, and derived values that are themselves
    /// such constants. For analyses of the rulebook as written, like `diff`.
    pub fn constant(&self, expr: &Expr) -> Option<f64> {
        let lookup = |name: &str| self.derived_value(name).map(|d| &d.expr);
        super::constants::fold(expr, &lookup, false)
    }
}

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
    /// Declared `ignoring case`: exact entries compare without case, patterns were compiled
    /// case-insensitive.
    pub ignore_case: bool,
    /// Its entries.
    pub entries: Vec<PartEntry>,
    /// Where it is defined.
    pub span: Span,
}

/// How a value not on a list differs from the exact entry it nearly matches.
#[derive(Clone, Copy, Debug, PartialEq, Eq, serde::Serialize)]
#[serde(rename_all = "snake_case")]
pub enum Slip {
    /// The same characters in another case (`tvh-2204` for `TVH-2204`).
    Case,
    /// One character added, removed, replaced, or two neighbours swapped (optimal string
    /// alignment distance 1).
    OneEdit,
    /// Another case and one edit besides.
    CaseAndOneEdit,
}

impl Slip {
    /// The difference in words: `differs only in case`.
    pub fn words(self) -> &'static str {
        match self {
            Slip::Case => "differs only in case",
            Slip::OneEdit => "one character different",
            Slip::CaseAndOneEdit => "differs in case and one character",
        }
    }
}

/// The exact entry of a list a value nearly matches, and how it differs.
#[derive(Clone, Debug, PartialEq)]
pub struct NearMatch {
    /// The entry as the rulebook writes it.
    pub entry: String,
    /// How the value differs from it.
    pub slip: Slip,
}

impl PartsList {
    /// Whether an identifier is on the list.
    pub fn contains(&self, id: &str) -> bool {
        self.entries.iter().any(|e| match e {
            PartEntry::Exact(s) if self.ignore_case => s.to_lowercase() == id.to_lowercase(),
            PartEntry::Exact(s) => s == id,
            PartEntry::Pattern(re, _) => re.is_match(id),
        })
    }

    /// For an identifier not on the list, the first exact entry it nearly matches (a case
    /// difference before an edit, in the list's order); `None` for one on the list. Patterns
    /// are not searched: a family has no single spelling to name.
    pub fn near_match(&self, id: &str) -> Option<NearMatch> {
        if self.contains(id) {
            return None;
        }
        let exact = || {
            self.entries.iter().filter_map(|e| match e {
                PartEntry::Exact(s) => Some(s.as_str()),
                PartEntry::Pattern(..) => None,
            })
        };
        let lower = id.to_lowercase();
        // one edit changes the length by at most one character: farther apart in length, the
        // distance is at least two and is not computed
        let one_edit = |a: &str, b: &str| {
            a.chars().count().abs_diff(b.chars().count()) <= 1 && strsim::osa_distance(a, b) == 1
        };
        let slip_of = |entry: &str| {
            let entry_lower = entry.to_lowercase();
            if entry_lower == lower {
                Some(Slip::Case)
            } else if one_edit(entry, id) {
                Some(Slip::OneEdit)
            } else if one_edit(&entry_lower, &lower) {
                Some(if self.ignore_case {
                    Slip::OneEdit
                } else {
                    Slip::CaseAndOneEdit
                })
            } else {
                None
            }
        };
        let found = exact()
            .find_map(|e| slip_of(e).filter(|s| *s == Slip::Case).map(|s| (e, s)))
            .or_else(|| exact().find_map(|e| slip_of(e).map(|s| (e, s))))?;
        Some(NearMatch {
            entry: found.0.to_string(),
            slip: found.1,
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
    /// The framed SHA-256 of every file it was read from ([`crate::digest::rulebook_sha256`]),
    /// set once its files are known; empty for a rulebook checked from a syntax tree alone.
    pub sha256: String,
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

#[cfg(test)]
mod tests {
    use super::*;

    fn list(ignore_case: bool, exact: &[&str], pattern: Option<&str>) -> PartsList {
        let mut entries: Vec<PartEntry> = exact
            .iter()
            .map(|e| PartEntry::Exact(e.to_string()))
            .collect();
        if let Some(p) = pattern {
            let re = regex::RegexBuilder::new(p)
                .case_insensitive(ignore_case)
                .build()
                .unwrap_or_else(|e| panic!("{e}"));
            entries.push(PartEntry::Pattern(re, p.to_string()));
        }
        PartsList {
            name: "heads".to_string(),
            kind: ListKind::Approved,
            title: None,
            ignore_case,
            entries,
            span: Span::default(),
        }
    }

    fn near(l: &PartsList, id: &str) -> Option<(String, Slip)> {
        l.near_match(id).map(|n| (n.entry, n.slip))
    }

    #[test]
    fn a_case_slip_is_not_on_the_list_but_names_its_entry() {
        let heads = list(false, &["TVH-2201", "TVH-2204"], Some("^TVH-23[0-9]{2}$"));
        assert!(!heads.contains("tvh-2204"));
        assert_eq!(
            near(&heads, "tvh-2204"),
            Some(("TVH-2204".to_string(), Slip::Case))
        );
        assert_eq!(
            near(&heads, "TVH-2204"),
            None,
            "on the list: nothing to name"
        );
    }

    // One edit is optimal string alignment distance 1 (Damerau, "A technique for computer
    // detection and correction of spelling errors", CACM 7(3), 1964: insertion, deletion,
    // substitution or transposition of adjacent characters), as strsim::osa_distance counts it.
    #[test]
    fn one_edit_of_each_kind_names_the_entry() {
        let heads = list(false, &["TVH-2201", "TVH-2204"], None);
        for (typed, entry) in [
            ("TVH-2240", "TVH-2204"),  // neighbours swapped
            ("TVH 2204", "TVH-2204"),  // one replaced
            ("TVH-22044", "TVH-2204"), // one added
            ("TVH-220", "TVH-2201"),   // one removed: the first entry in the list's order
        ] {
            assert_eq!(
                near(&heads, typed),
                Some((entry.to_string(), Slip::OneEdit)),
                "{typed}"
            );
        }
        assert_eq!(
            near(&heads, "tvh-2240"),
            Some(("TVH-2204".to_string(), Slip::CaseAndOneEdit))
        );
        assert_eq!(near(&heads, "TVH-2422"), None, "two edits are not a slip");
        assert_eq!(near(&heads, "TVH-220444"), None, "nor two added");
        assert_eq!(near(&heads, "TVH-22"), None, "nor two removed");
    }

    #[test]
    fn a_case_difference_is_preferred_over_an_earlier_edit() {
        // "tvh-2204" is one edit from "tvh-2201", which comes first, and only a case away
        // from "TVH-2204": the case difference is the more telling slip
        let heads = list(false, &["tvh-2201", "TVH-2204"], None);
        assert_eq!(
            near(&heads, "tvh-2204"),
            Some(("TVH-2204".to_string(), Slip::Case))
        );
    }

    #[test]
    fn a_list_ignoring_case_holds_every_case_and_its_patterns_too() {
        let heads = list(true, &["TVH-2204"], Some("^TVH-23[0-9]{2}$"));
        assert!(heads.contains("tvh-2204"));
        assert!(heads.contains("tvh-2310"));
        assert_eq!(
            near(&heads, "tvh-2240"),
            Some(("TVH-2204".to_string(), Slip::OneEdit)),
            "case does not count on such a list"
        );
    }
}

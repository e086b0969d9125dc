//! Static checks: everything that can be known about a rulebook before any engine is seen.
//! Names and units are resolved, every expression and comparison is checked for dimension,
//! classes are flattened through `extends` and bulletins, and the rulebook is searched for
//! contradictions, conditions that can never hold and measurements that are never used.
//!
//! The work is split by concern: [`symbols`] collects and de-duplicates the declarations,
//! [`types`] types expressions and resolves them into [`resolved`] trees, [`builtins`] is the
//! table of built-in functions, [`classes`] flattens classes, [`limit`] puts every limit in one
//! normal form, [`bounds`] reasons about limits and conditions, [`usage`] finds what is never
//! used.

mod bounds;
pub mod builtins;
mod chains;
mod classes;
mod constants;
pub mod error;
pub use constants::quantity_si;
pub mod interval;
pub mod limit;
pub mod model;
mod patterns;
mod ranges;
pub mod resolved;
mod symbols;
mod types;
mod usage;

use std::collections::{BTreeMap, HashMap, HashSet};

use crate::diagnostic::{Level, Problem};
use crate::parse::ast;
use crate::parse::includes::RulebookFiles;
use model::{CheckedRulebook, ClassRule, Measurement, PartsList, Type, WrittenRule};

/// Checks a parsed rulebook. Returns the checked rulebook when there is no error, and every
/// problem found (warnings too) either way.
pub fn check(files: &RulebookFiles) -> (Option<CheckedRulebook>, Vec<Problem>) {
    let mut checker = Checker::default();
    checker.collect(files);
    checker.resolve_measurements();
    checker.measure_define_chains();
    checker.type_defines();
    checker.compile_lists();
    checker.check_approved_against_banned();
    checker.check_class_graph();
    let classes = if checker.rules_within_cap() {
        checker.check_rules();
        let classes = checker.flatten_all();
        checker.check_bounds(&classes);
        checker.check_ranges(&classes);
        checker.report_unused();
        classes
    } else {
        Vec::new() // too many rules: reported, and nothing more is worth checking
    };
    let problems = dedupe(std::mem::take(&mut checker.problems));
    if problems.iter().any(|p| p.level == Level::Error) {
        return (None, problems);
    }
    match checker.into_model(classes) {
        Ok(model) => (Some(model), problems),
        Err(problem) => (None, problems.into_iter().chain([problem]).collect()),
    }
}

/// Problems found more than once (a class flattened at several dates) are shown once.
fn dedupe(problems: Vec<Problem>) -> Vec<Problem> {
    let mut seen = HashSet::new();
    problems
        .into_iter()
        .filter(|p| {
            let at = p.primary_span().map(|s| (s.file, s.start));
            seen.insert((p.code, at, p.message.clone()))
        })
        .collect()
}

/// The state of one run of the checks.
#[derive(Default)]
struct Checker<'a> {
    problems: Vec<Problem>,
    series: Option<&'a ast::Text>,
    edition: Option<&'a ast::Edition>,
    decision: Option<&'a ast::Decision>,
    coverage: Option<&'a ast::Coverage>,
    measures: BTreeMap<&'a str, &'a ast::Measure>,
    measure_order: Vec<&'a str>,
    defines: BTreeMap<&'a str, &'a ast::Define>,
    define_order: Vec<&'a str>,
    lists: BTreeMap<&'a str, &'a ast::PartsList>,
    classes: BTreeMap<&'a str, &'a ast::Class>,
    class_order: Vec<&'a str>,
    bulletins: Vec<&'a ast::Bulletin>,
    /// Measurements with their dimension resolved (absent when the dimension is unknown).
    measurements: BTreeMap<&'a str, Measurement>,
    /// Types of derived values (`None` when the expression has an error).
    define_types: HashMap<&'a str, Option<Type>>,
    /// Derived values being typed, to catch cycles.
    typing: Vec<&'a str>,
    /// Compiled parts lists.
    compiled_lists: BTreeMap<&'a str, PartsList>,
    /// Classes whose `extends` chain is sound.
    sound_classes: HashSet<&'a str>,
    /// Every measurement or derived value some rule, condition or definition reads.
    used: HashSet<String>,
    /// Resolved expressions of derived values.
    define_terms: HashMap<&'a str, resolved::Term>,
    /// Literals with a stated uncertainty, by [`resolved::LiteralId`].
    literals: Vec<resolved::UncertainLiteral>,
    /// While checking, the id of each literal with a stated uncertainty by where it is
    /// written, so that a literal resolved again (a rule flattened into several classes)
    /// keeps its one id.
    literal_ids: HashMap<(u32, usize), resolved::LiteralId>,
    /// While checking, the compiled pattern of every `matches` test by where it is written,
    /// so that each is compiled once.
    test_patterns: HashMap<(u32, usize), regex::Regex>,
    /// Patterns compiled so far, across every file (see [`patterns::MAX_PATTERNS`]).
    patterns_compiled: usize,
    /// Every pattern that compiled, by its text and whether it ignores case, so that the
    /// same pattern written in many places (a class copied under new names) is built once.
    regex_by_text: HashMap<(String, bool), regex::Regex>,
    /// How deep each derived value stands on others (see [`chains::MAX_DEFINE_DEPTH`]).
    define_depths: HashMap<&'a str, usize>,
    /// The position of each measurement in `measure_order`.
    measure_ids: HashMap<&'a str, usize>,
    /// The position of each derived value in `define_order`.
    define_ids: HashMap<&'a str, usize>,
}

impl<'a> Checker<'a> {
    fn error(&mut self, problem: Problem) {
        self.problems.push(problem);
    }

    /// Whether an error already reported points inside `span` (its primary label there): a
    /// lint warning about that code would only follow from the error, so none is given.
    fn error_within(&self, span: crate::source::Span) -> bool {
        self.problems.iter().any(|p| {
            p.level == Level::Error
                && p.labels.first().is_some_and(|(at, _)| {
                    at.file == span.file && at.start >= span.start && at.end <= span.end
                })
        })
    }

    /// The bodies of every class and bulletin, as written.
    fn bodies(&self) -> Vec<&'a [ast::ClassItem]> {
        self.classes
            .values()
            .map(|c| c.body.as_slice())
            .chain(self.bulletins.iter().map(|b| b.body.as_slice()))
            .collect()
    }
}

/// The problem raised when the checks passed but the model cannot be built: a mistake in
/// gonogo, never in the rulebook.
fn internal(what: &str, span: crate::source::Span) -> Problem {
    error::CheckError::Internal {
        what: what.to_string(),
        at: span,
    }
    .into()
}

impl<'a> Checker<'a> {
    /// The checked rulebook, once no error is left: every rule and derived value resolved.
    fn into_model(mut self, states: Vec<classes::ClassState>) -> Result<CheckedRulebook, Problem> {
        let span = crate::source::Span::default();
        let edition = self.edition.ok_or_else(|| internal("no edition", span))?;
        let series = self.series.ok_or_else(|| internal("no series", span))?;
        let decision = self
            .decision
            .ok_or_else(|| internal("no decision rule", span))?;
        let edition_date = Some(edition.effective.date);
        let mut classes = Vec::new();
        for name in self.class_order.clone() {
            let Some(class) = self.classes.get(name).copied() else {
                continue;
            };
            let Some(state) = states
                .iter()
                .find(|s| s.class == name && s.from == edition_date)
            else {
                continue;
            };
            let rules = self.resolve_rules(&state.rules)?;
            let mut amended = Vec::new();
            for s in states
                .iter()
                .filter(|s| s.class == name && s.from > edition_date)
            {
                let Some(from) = s.from else { continue };
                amended.push(model::Amended {
                    from,
                    bulletins: self.bulletins_in_force(name, from),
                    rules: self.resolve_rules(&s.rules)?,
                });
            }
            classes.push(model::Class {
                name: name.to_string(),
                title: class.title.as_ref().map(|t| t.value.clone()),
                extends: class.extends.as_ref().map(|e| e.text.clone()),
                rules,
                edition_bulletins: self.bulletins_in_force(name, edition.effective.date),
                amended,
                span: class.name.span,
            });
        }
        let derived = self.derived_values()?;
        let mut bulletins: Vec<model::Bulletin> = self
            .bulletins
            .iter()
            .map(|b| model::Bulletin {
                id: b.id.value.clone(),
                source: (*b).clone(),
            })
            .collect();
        bulletins.sort_by_key(|b| b.source.effective.date);
        let measurements: Vec<Measurement> = self
            .measure_order
            .iter()
            .map(|n| {
                let at = self.measures.get(n).map_or(span, |m| m.name.span);
                self.measurements
                    .get(n)
                    .cloned()
                    .ok_or_else(|| internal(&format!("`{n}` has no dimension"), at))
            })
            .collect::<Result<_, _>>()?;
        let index = measurements
            .iter()
            .enumerate()
            .map(|(i, m)| (m.name.clone(), model::Named::Measurement(i)))
            .chain(
                derived
                    .iter()
                    .enumerate()
                    .map(|(i, d)| (d.name.clone(), model::Named::Derived(i))),
            )
            .collect();
        Ok(CheckedRulebook {
            sha256: String::new(),
            series: series.value.clone(),
            edition: edition.name.value.clone(),
            effective: edition.effective.date,
            decision: decision.rule,
            coverage: self
                .coverage
                .map_or_else(model::Coverage::default, |c| c.spec.into()),
            measurements,
            derived,
            lists: std::mem::take(&mut self.compiled_lists)
                .into_values()
                .collect(),
            classes,
            bulletins,
            index,
            literals: std::mem::take(&mut self.literals),
        })
    }

    /// Every derived value, in the order written, with its resolved expression.
    fn derived_values(&self) -> Result<Vec<model::Derived>, Problem> {
        self.define_order
            .iter()
            .map(|name| {
                let define = self.defines.get(name).ok_or_else(|| {
                    internal(&format!("`{name}` is not defined"), Default::default())
                })?;
                let missing = || internal(&format!("`{name}` was not typed"), define.name.span);
                let ty = self
                    .define_types
                    .get(name)
                    .copied()
                    .flatten()
                    .ok_or_else(missing)?;
                let body = self.define_terms.get(name).cloned().ok_or_else(missing)?;
                let mut names = Vec::new();
                define.expr.names(&mut names);
                let mut read_ids = Vec::new();
                body.reads(&mut read_ids);
                Ok(model::Derived {
                    name: name.to_string(),
                    formula: crate::parse::print::expr_text(&define.expr),
                    reads: model::unique(names),
                    expr: define.expr.clone(),
                    ty,
                    body,
                    read_ids,
                    span: define.name.span,
                })
            })
            .collect()
    }

    /// The rules of a class as flattened, each with its requirement and conditions resolved.
    fn resolve_rules(&mut self, rules: &[WrittenRule]) -> Result<Vec<ClassRule>, Problem> {
        rules
            .iter()
            .map(|r| {
                let failed = || internal("a rule did not resolve", r.rule.require.span);
                let test = self
                    .resolve_test(&r.rule.require, types::Place::Require)
                    .ok_or_else(failed)?;
                let when = r
                    .conditions
                    .iter()
                    .map(|c| self.resolve_condition(c))
                    .collect::<Option<Vec<_>>>()
                    .ok_or_else(failed)?;
                Ok(ClassRule::resolved(r.clone(), test, when))
            })
            .collect()
    }
}

//! Static checks: everything that can be known about a rulebook before any engine is seen.
//! Names and units are resolved, every expression and comparison is checked for dimension,
//! classes are flattened through `extends` and bulletins, and the rulebook is searched for
//! contradictions, conditions that can never hold and measurements that are never used.
//!
//! The work is split by concern: [`symbols`] collects and de-duplicates the declarations,
//! [`types`] types expressions, [`classes`] flattens classes, [`limit`] puts every limit in one
//! normal form, [`bounds`] reasons about limits and conditions, [`usage`] finds what is never
//! used.

mod bounds;
pub mod builtins;
mod classes;
mod constants;
pub mod error;
pub use constants::quantity_si;
pub mod interval;
pub mod limit;
pub mod model;
mod patterns;
mod ranges;
mod symbols;
mod types;
mod usage;

use std::collections::{BTreeMap, HashMap, HashSet};

use crate::diagnostic::{Level, Problem};
use crate::parse::ast;
use crate::parse::includes::RulebookFiles;
use model::{CheckedRulebook, Measurement, PartsList, Type};

/// Checks a parsed rulebook. Returns the checked rulebook when there is no error, and every
/// problem found (warnings too) either way.
pub fn check(files: &RulebookFiles) -> (Option<CheckedRulebook>, Vec<Problem>) {
    let mut checker = Checker::default();
    checker.collect(files);
    checker.resolve_measurements();
    checker.type_defines();
    checker.compile_lists();
    checker.check_approved_against_banned();
    checker.check_class_graph();
    checker.check_rules();
    let classes = checker.flatten_all();
    checker.check_bounds(&classes);
    checker.check_ranges(&classes);
    checker.report_unused();
    let problems = dedupe(std::mem::take(&mut checker.problems));
    if problems.iter().any(|p| p.level == Level::Error) {
        return (None, problems);
    }
    (checker.into_model(classes), problems)
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
    /// The compiled pattern of every `matches` test, by where the pattern is written.
    test_patterns: HashMap<(u32, usize), regex::Regex>,
    /// Patterns compiled so far, across every file (see [`patterns::MAX_PATTERNS`]).
    patterns_compiled: usize,
}

impl<'a> Checker<'a> {
    fn error(&mut self, problem: Problem) {
        self.problems.push(problem);
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

impl<'a> Checker<'a> {
    /// The checked rulebook, once no error is left.
    fn into_model(self, states: Vec<classes::ClassState>) -> Option<CheckedRulebook> {
        let edition = self.edition?;
        let edition_date = Some(edition.effective.date);
        let classes = self
            .class_order
            .iter()
            .filter_map(|name| {
                let class = self.classes.get(name)?;
                let state = states
                    .iter()
                    .find(|s| s.class == *name && s.from == edition_date)?;
                let amended = states
                    .iter()
                    .filter(|s| s.class == *name && s.from > edition_date)
                    .filter_map(|s| {
                        let from = s.from?;
                        Some(model::Amended {
                            from,
                            bulletins: self.bulletins_in_force(name, from),
                            rules: s.rules.clone(),
                        })
                    })
                    .collect();
                Some(model::Class {
                    name: name.to_string(),
                    title: class.title.as_ref().map(|t| t.value.clone()),
                    extends: class.extends.as_ref().map(|e| e.text.clone()),
                    rules: state.rules.clone(),
                    edition_bulletins: self.bulletins_in_force(name, edition.effective.date),
                    amended,
                    span: class.name.span,
                })
            })
            .collect();
        let derived = self
            .define_order
            .iter()
            .filter_map(|name| {
                let define = self.defines.get(name)?;
                let ty = (*self.define_types.get(name)?)?;
                let mut names = Vec::new();
                define.expr.names(&mut names);
                Some(model::Derived {
                    name: name.to_string(),
                    formula: crate::parse::print::expr_text(&define.expr),
                    reads: model::unique(names),
                    expr: define.expr.clone(),
                    ty,
                    span: define.name.span,
                })
            })
            .collect();
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
            .filter_map(|n| self.measurements.get(n).cloned())
            .collect();
        let derived: Vec<model::Derived> = derived;
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
        Some(CheckedRulebook {
            series: self.series?.value.clone(),
            edition: edition.name.value.clone(),
            effective: edition.effective.date,
            decision: self.decision?.rule,
            measurements,
            derived,
            lists: self.compiled_lists.into_values().collect(),
            classes,
            bulletins,
            index,
            patterns: self.test_patterns,
        })
    }
}

//! Collecting the declarations of every file: the header, the measurement schema, derived
//! values, parts lists, classes and bulletins, with duplicates reported.

use std::collections::HashMap;

use super::Checker;
use super::error::{CheckError, Definition, HeaderLine};
use crate::diagnostic::Problem;
use crate::parse::ast::{Item, Name};
use crate::parse::includes::RulebookFiles;
use crate::source::Span;

impl<'a> Checker<'a> {
    /// Files every item of every file under its kind.
    pub(super) fn collect(&mut self, files: &'a RulebookFiles) {
        let mut bulletin_ids = HashMap::new();
        for (index, (file, book)) in files.files.iter().enumerate() {
            for item in &book.items {
                self.collect_item(item, index == 0, &mut bulletin_ids);
            }
            if index == 0 {
                self.require_header(*file);
            }
        }
    }

    fn collect_item(
        &mut self,
        item: &'a Item,
        in_root: bool,
        bulletin_ids: &mut HashMap<&'a str, Span>,
    ) {
        match item {
            Item::Series(_) | Item::Edition(_) | Item::Decision(_) | Item::Coverage(_)
                if !in_root =>
            {
                let at = header_span(item);
                self.error(CheckError::HeaderInInclude { at }.into());
            }
            Item::Series(text) => once(
                &mut self.series,
                text,
                text.span,
                HeaderLine::Series,
                &mut self.problems,
            ),
            Item::Edition(e) => once(
                &mut self.edition,
                e,
                e.name.span,
                HeaderLine::Edition,
                &mut self.problems,
            ),
            Item::Decision(d) => once(
                &mut self.decision,
                d,
                d.span,
                HeaderLine::Decision,
                &mut self.problems,
            ),
            Item::Coverage(c) => {
                once(
                    &mut self.coverage,
                    c,
                    c.span,
                    HeaderLine::Coverage,
                    &mut self.problems,
                );
                if let Some(error) = coverage_problem(c) {
                    self.error(error.into());
                }
            }
            Item::Include(_) => {}
            Item::Measure(m) => {
                if self.unique_value_name(&m.name) {
                    self.measures.insert(&m.name.text, m);
                    self.measure_ids
                        .insert(&m.name.text, self.measure_order.len());
                    self.measure_order.push(&m.name.text);
                }
            }
            Item::Define(d) => {
                if self.unique_value_name(&d.name) {
                    self.defines.insert(&d.name.text, d);
                    self.define_ids
                        .insert(&d.name.text, self.define_order.len());
                    self.define_order.push(&d.name.text);
                }
            }
            Item::List(l) => {
                let first = self.lists.get(l.name.text.as_str()).map(|o| o.name.span);
                if unique_in(first, &l.name, Definition::PartsList, &mut self.problems) {
                    self.lists.insert(&l.name.text, l);
                }
            }
            Item::Class(c) => {
                let first = self.classes.get(c.name.text.as_str()).map(|o| o.name.span);
                if unique_in(first, &c.name, Definition::Class, &mut self.problems) {
                    self.classes.insert(&c.name.text, c);
                    self.class_order.push(&c.name.text);
                }
            }
            Item::Bulletin(b) => self.collect_bulletin(b, bulletin_ids),
        }
    }

    /// Files a bulletin, or reports its id taken; `ids` holds where each id was first used.
    fn collect_bulletin(
        &mut self,
        b: &'a crate::parse::ast::Bulletin,
        ids: &mut HashMap<&'a str, Span>,
    ) {
        if let Some(&first) = ids.get(b.id.value.as_str()) {
            self.error(
                CheckError::DuplicateBulletin {
                    id: b.id.value.clone(),
                    at: b.id.span,
                    first,
                }
                .into(),
            );
            return;
        }
        ids.insert(&b.id.value, b.id.span);
        self.bulletins.push(b);
    }

    /// Measurements and derived values share one namespace.
    fn unique_value_name(&mut self, name: &Name) -> bool {
        let earlier = self
            .measures
            .get(name.text.as_str())
            .map(|m| m.name.span)
            .or_else(|| self.defines.get(name.text.as_str()).map(|d| d.name.span));
        let Some(first) = earlier else {
            return true;
        };
        self.error(
            CheckError::DuplicateValueName {
                name: name.text.clone(),
                at: name.span,
                first,
            }
            .into(),
        );
        false
    }

    fn require_header(&mut self, file: crate::source::FileId) {
        let at = Span::new(file, 0, 0);
        let missing = [
            (self.series.is_none(), HeaderLine::Series),
            (self.edition.is_none(), HeaderLine::Edition),
            (self.decision.is_none(), HeaderLine::Decision),
        ];
        for (absent, line) in missing {
            if absent {
                self.error(CheckError::MissingHeader { line, at }.into());
            }
        }
    }
}

fn header_span(item: &Item) -> Span {
    match item {
        Item::Series(t) => t.span,
        Item::Edition(e) => e.name.span,
        Item::Decision(d) => d.span,
        Item::Coverage(c) => c.span,
        _ => Span::default(),
    }
}

/// What is wrong with a `coverage` line, if anything: a factor not above zero, or a
/// probability not strictly between 0 % and 100 %.
fn coverage_problem(c: &crate::parse::ast::Coverage) -> Option<CheckError> {
    use crate::parse::ast::CoverageSpec;
    let (bad, probability) = match c.spec {
        CoverageSpec::Factor(k) => (!(k.is_finite() && k > 0.0), false),
        CoverageSpec::Percent(p) => (!(p > 0.0 && p < 100.0), true),
    };
    bad.then_some(CheckError::CoverageOutOfRange {
        probability,
        at: c.number,
    })
}

fn once<'a, T>(
    slot: &mut Option<&'a T>,
    value: &'a T,
    at: Span,
    line: HeaderLine,
    problems: &mut Vec<Problem>,
) {
    if slot.is_some() {
        problems.push(CheckError::DuplicateHeader { line, at }.into());
    } else {
        *slot = Some(value);
    }
}

/// Whether `name` is new; reports it defined twice when `first` is where it was already.
fn unique_in(
    first: Option<Span>,
    name: &Name,
    kind: Definition,
    problems: &mut Vec<Problem>,
) -> bool {
    let Some(first) = first else {
        return true;
    };
    problems.push(
        CheckError::DuplicateDefinition {
            kind,
            name: name.text.clone(),
            at: name.span,
            first,
        }
        .into(),
    );
    false
}

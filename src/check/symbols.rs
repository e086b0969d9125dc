//! Collecting the declarations of every file: the header, the measurement schema, derived
//! values, parts lists, classes and bulletins, with duplicates reported.

use std::collections::BTreeMap;

use super::Checker;
use crate::diagnostic::Problem;
use crate::parse::ast::{Item, Name};
use crate::parse::includes::RulebookFiles;
use crate::source::Span;

impl<'a> Checker<'a> {
    /// Files every item of every file under its kind.
    pub(super) fn collect(&mut self, files: &'a RulebookFiles) {
        for (index, (file, book)) in files.files.iter().enumerate() {
            for item in &book.items {
                self.collect_item(item, index == 0);
            }
            if index == 0 {
                self.require_header(*file);
            }
        }
    }

    fn collect_item(&mut self, item: &'a Item, in_root: bool) {
        match item {
            Item::Series(_) | Item::Edition(_) | Item::Decision(_) if !in_root => {
                let span = header_span(item);
                self.error(
                    Problem::error(
                        "gonogo::check::header-in-include",
                        "an included file cannot set the rulebook's header",
                        span,
                        "header line",
                    )
                    .with_help("move `series`, `edition` and `decision` to the main rulebook file"),
                );
            }
            Item::Series(text) => once(
                &mut self.series,
                text,
                text.span,
                "series",
                &mut self.problems,
            ),
            Item::Edition(e) => once(
                &mut self.edition,
                e,
                e.name.span,
                "edition",
                &mut self.problems,
            ),
            Item::Decision(d) => once(
                &mut self.decision,
                d,
                d.span,
                "decision",
                &mut self.problems,
            ),
            Item::Include(_) => {}
            Item::Measure(m) => {
                if self.unique_value_name(&m.name) {
                    self.measures.insert(&m.name.text, m);
                    self.measure_order.push(&m.name.text);
                }
            }
            Item::Define(d) => {
                if self.unique_value_name(&d.name) {
                    self.defines.insert(&d.name.text, d);
                    self.define_order.push(&d.name.text);
                }
            }
            Item::List(l) => {
                let spans: BTreeMap<&str, Span> =
                    self.lists.iter().map(|(k, v)| (*k, v.name.span)).collect();
                if unique_in(&spans, &l.name, "parts list", &mut self.problems) {
                    self.lists.insert(&l.name.text, l);
                }
            }
            Item::Class(c) => {
                let spans: BTreeMap<&str, Span> = self
                    .classes
                    .iter()
                    .map(|(k, v)| (*k, v.name.span))
                    .collect();
                if unique_in(&spans, &c.name, "class", &mut self.problems) {
                    self.classes.insert(&c.name.text, c);
                    self.class_order.push(&c.name.text);
                }
            }
            Item::Bulletin(b) => self.collect_bulletin(b),
        }
    }

    fn collect_bulletin(&mut self, b: &'a crate::parse::ast::Bulletin) {
        if let Some(first) = self.bulletins.iter().find(|o| o.id.value == b.id.value) {
            let first = first.id.span;
            self.error(
                Problem::error(
                    "gonogo::check::duplicate-bulletin",
                    format!("bulletin `{}` is issued twice", b.id.value),
                    b.id.span,
                    "second time",
                )
                .with_label(first, "first time")
                .with_help("give each bulletin its own identifier, or merge the two"),
            );
            return;
        }
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
            Problem::error(
                "gonogo::check::duplicate-name",
                format!("`{}` is declared twice", name.text),
                name.span,
                "declared again here",
            )
            .with_label(first, "first declared here")
            .with_help(
                "measurements and derived values share one set of names; rename or remove one",
            ),
        );
        false
    }

    fn require_header(&mut self, file: crate::source::FileId) {
        let start = Span::new(file, 0, 0);
        let missing = [
            (
                self.series.is_none(),
                "series",
                "series \"Tamsin Valley Stock Car Club\"",
            ),
            (
                self.edition.is_none(),
                "edition",
                "edition \"2027\" effective 2027-03-06",
            ),
            (
                self.decision.is_none(),
                "decision",
                "decision guarded rejection",
            ),
        ];
        for (absent, what, example) in missing {
            if absent {
                self.error(
                    Problem::error(
                        "gonogo::check::missing-header",
                        format!("the rulebook has no `{what}` line"),
                        start,
                        "",
                    )
                    .with_help(format!(
                        "add a line like `{example}` at the top of the file"
                    )),
                );
            }
        }
    }
}

fn header_span(item: &Item) -> Span {
    match item {
        Item::Series(t) => t.span,
        Item::Edition(e) => e.name.span,
        Item::Decision(d) => d.span,
        _ => Span::default(),
    }
}

fn once<'a, T>(
    slot: &mut Option<&'a T>,
    value: &'a T,
    span: Span,
    what: &str,
    problems: &mut Vec<Problem>,
) {
    if slot.is_some() {
        problems.push(
            Problem::error(
                "gonogo::check::duplicate-header",
                format!("the rulebook sets `{what}` twice"),
                span,
                "second time",
            )
            .with_help(format!("keep one `{what}` line")),
        );
    } else {
        *slot = Some(value);
    }
}

fn unique_in(
    existing: &BTreeMap<&str, Span>,
    name: &Name,
    what: &str,
    problems: &mut Vec<Problem>,
) -> bool {
    let Some(first) = existing.get(name.text.as_str()) else {
        return true;
    };
    problems.push(
        Problem::error(
            "gonogo::check::duplicate-name",
            format!("{what} `{}` is defined twice", name.text),
            name.span,
            "defined again here",
        )
        .with_label(*first, "first defined here")
        .with_help(format!(
            "rename or remove one of the two {what} definitions"
        )),
    );
    false
}

//! Every name of a rulebook's files where it is written: each definition (measurement, derived
//! value, list, class, rule section) and each use (in expressions, `in LIST`, `extends`,
//! `amends`, `drop`, units after numbers), with its span. Hover, definition, references and
//! completion look names up here.

use crate::parse::ast::{
    ClassItem, Condition, Expr, ExprKind, Item, Name, Quantity, Rulebook, Test, TestKind,
};
use crate::parse::includes::RulebookFiles;
use crate::source::{FileId, Span};

/// What a name stands for.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum Kind {
    /// A measurement or a derived value (they share one namespace).
    Value,
    /// A parts list.
    List,
    /// A class.
    Class,
    /// A rule, by its section within a class.
    Rule,
    /// A unit symbol after a number.
    Unit,
    /// A built-in function.
    Function,
}

/// One place a name is written.
#[derive(Clone, Debug)]
pub struct Occurrence {
    /// What it stands for.
    pub kind: Kind,
    /// The name as written (a rule's section number for [`Kind::Rule`]).
    pub name: String,
    /// The class a rule belongs to (or a bulletin amends), for [`Kind::Rule`].
    pub class: Option<String>,
    /// Where it is written.
    pub span: Span,
    /// Whether this is where the name is defined.
    pub definition: bool,
}

/// Every occurrence in a rulebook's files.
#[derive(Debug, Default)]
pub struct Index {
    /// In the order written, file by file.
    pub occurrences: Vec<Occurrence>,
}

impl Index {
    /// The index of every file read.
    pub fn build(files: &RulebookFiles) -> Index {
        let mut index = Index::default();
        for (_, book) in &files.files {
            index.book(book);
        }
        index
    }

    /// The occurrence at a byte offset of a file (the end of a name counts, so a cursor just
    /// after it finds it).
    pub fn at(&self, file: FileId, offset: usize) -> Option<&Occurrence> {
        self.occurrences
            .iter()
            .filter(|o| o.span.file == file && o.span.start <= offset && offset <= o.span.end)
            .min_by_key(|o| o.span.end - o.span.start)
    }

    /// Where `name` of this kind is defined (for a rule, in `class`).
    pub fn definition(&self, of: &Occurrence) -> Option<&Occurrence> {
        self.occurrences
            .iter()
            .find(|o| o.definition && same(o, of))
    }

    /// Every occurrence of the same name and kind, the definition included.
    pub fn references<'a>(&'a self, of: &'a Occurrence) -> impl Iterator<Item = &'a Occurrence> {
        self.occurrences.iter().filter(move |o| same(o, of))
    }

    /// The names defined with this kind, each once, in the order written.
    pub fn defined(&self, kind: Kind) -> Vec<&str> {
        let mut names: Vec<&str> = Vec::new();
        for o in self
            .occurrences
            .iter()
            .filter(|o| o.definition && o.kind == kind)
        {
            if !names.contains(&o.name.as_str()) {
                names.push(&o.name);
            }
        }
        names
    }

    fn push(&mut self, kind: Kind, name: &Name, definition: bool) {
        self.occurrences.push(Occurrence {
            kind,
            name: name.text.clone(),
            class: None,
            span: name.span,
            definition,
        });
    }

    fn book(&mut self, book: &Rulebook) {
        for item in &book.items {
            match item {
                Item::Measure(m) => {
                    self.push(Kind::Value, &m.name, true);
                    if let Some((low, high)) = &m.range {
                        self.expr(low);
                        self.expr(high);
                    }
                }
                Item::Define(d) => {
                    self.push(Kind::Value, &d.name, true);
                    self.expr(&d.expr);
                }
                Item::List(l) => self.push(Kind::List, &l.name, true),
                Item::Class(c) => {
                    self.push(Kind::Class, &c.name, true);
                    if let Some(parent) = &c.extends {
                        self.push(Kind::Class, parent, false);
                    }
                    self.body(&c.name.text, &c.body, true);
                }
                Item::Bulletin(b) => {
                    self.push(Kind::Class, &b.amends, false);
                    self.body(&b.amends.text, &b.body, false);
                }
                Item::Series(_)
                | Item::Edition(_)
                | Item::Decision(_)
                | Item::Coverage(_)
                | Item::Include(_) => {}
            }
        }
    }

    fn body(&mut self, class: &str, body: &[ClassItem], in_class: bool) {
        for item in body {
            match item {
                ClassItem::Rule(r) => {
                    self.occurrences.push(Occurrence {
                        kind: Kind::Rule,
                        name: r.section.text.clone(),
                        class: Some(class.to_string()),
                        span: r.section.span,
                        definition: in_class,
                    });
                    if let Some(c) = &r.condition {
                        self.condition(c);
                    }
                    self.test(&r.require);
                }
                ClassItem::When(w) => {
                    self.condition(&w.condition);
                    self.body(class, &w.body, in_class);
                }
                ClassItem::Drop(section) => self.occurrences.push(Occurrence {
                    kind: Kind::Rule,
                    name: section.text.clone(),
                    class: Some(class.to_string()),
                    span: section.span,
                    definition: false,
                }),
            }
        }
    }

    fn condition(&mut self, condition: &Condition) {
        match condition {
            Condition::Test(t) => self.test(t),
            Condition::And(a, b) | Condition::Or(a, b) => {
                self.condition(a);
                self.condition(b);
            }
            Condition::Not(inner, _) => self.condition(inner),
        }
    }

    fn test(&mut self, test: &Test) {
        match &test.kind {
            TestKind::Compare {
                left,
                right,
                allowance,
                ..
            } => {
                self.expr(left);
                self.expr(right);
                allowance.iter().for_each(|a| self.expr(a));
            }
            TestKind::Between {
                subject,
                low,
                high,
                allowance,
            } => {
                for e in [subject, low, high] {
                    self.expr(e);
                }
                allowance.iter().for_each(|a| self.expr(a));
            }
            TestKind::Member { subject, list, .. } => {
                self.expr(subject);
                self.push(Kind::List, list, false);
            }
            TestKind::Matches { subject, .. } => self.expr(subject),
        }
    }

    fn expr(&mut self, expr: &Expr) {
        match &expr.kind {
            ExprKind::Quantity(q) => self.quantity(q),
            ExprKind::Text(_) => {}
            ExprKind::Name(n) => self.push(Kind::Value, n, false),
            ExprKind::Call { function, args } => {
                self.push(Kind::Function, function, false);
                args.iter().for_each(|a| self.expr(&a.value));
            }
            ExprKind::Negate(inner) => self.expr(inner),
            ExprKind::Binary { left, right, .. } => {
                self.expr(left);
                self.expr(right);
            }
        }
    }

    fn quantity(&mut self, q: &Quantity) {
        let units = [
            q.unit.as_ref(),
            q.uncertainty.as_ref().and_then(|u| u.unit.as_ref()),
        ];
        for unit in units.into_iter().flatten() {
            self.occurrences.push(Occurrence {
                kind: Kind::Unit,
                name: unit.symbol.clone(),
                class: None,
                span: unit.span,
                definition: false,
            });
        }
    }
}

/// Whether two occurrences name the same thing (a rule within the same class).
fn same(a: &Occurrence, b: &Occurrence) -> bool {
    a.kind == b.kind && a.name == b.name && (a.kind != Kind::Rule || a.class == b.class)
}

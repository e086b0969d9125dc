//! The outline of one file: measurements, derived values and lists, then each class and each
//! bulletin with its rules by section (rules inside `when` groups among them).

use lsp_types::{DocumentSymbol, SymbolKind};

use super::position::range;
use crate::parse::ast::{ClassItem, Item, Rulebook};
use crate::source::{SourceFile, Span};

/// The symbols of one file's tree.
pub fn outline(file: &SourceFile, book: &Rulebook) -> Vec<DocumentSymbol> {
    book.items
        .iter()
        .filter_map(|item| match item {
            Item::Measure(m) => Some(symbol(
                file,
                &m.name.text,
                SymbolKind::FIELD,
                m.span,
                m.name.span,
                vec![],
            )),
            Item::Define(d) => Some(symbol(
                file,
                &d.name.text,
                SymbolKind::FUNCTION,
                d.span,
                d.name.span,
                vec![],
            )),
            Item::List(l) => Some(symbol(
                file,
                &l.name.text,
                SymbolKind::ENUM,
                l.span,
                l.name.span,
                vec![],
            )),
            Item::Class(c) => Some(symbol(
                file,
                &c.name.text,
                SymbolKind::CLASS,
                c.span,
                c.name.span,
                rules(file, &c.body),
            )),
            Item::Bulletin(b) => Some(symbol(
                file,
                &format!("{} (amends {})", b.id.value, b.amends.text),
                SymbolKind::EVENT,
                b.span,
                b.id.span,
                rules(file, &b.body),
            )),
            _ => None,
        })
        .collect()
}

fn rules(file: &SourceFile, body: &[ClassItem]) -> Vec<DocumentSymbol> {
    let mut out = Vec::new();
    for item in body {
        match item {
            ClassItem::Rule(r) => out.push(symbol(
                file,
                &format!("{} {}", r.section.text, r.title.value),
                SymbolKind::METHOD,
                r.span,
                r.section.span,
                vec![],
            )),
            ClassItem::When(w) => out.extend(rules(file, &w.body)),
            ClassItem::Drop(s) => out.push(symbol(
                file,
                &format!("drop {}", s.text),
                SymbolKind::METHOD,
                s.span,
                s.span,
                vec![],
            )),
        }
    }
    out
}

#[allow(
    deprecated,
    reason = "`deprecated` is a field lsp-types still requires; `tags` replaces it"
)]
fn symbol(
    file: &SourceFile,
    name: &str,
    kind: SymbolKind,
    whole: Span,
    named: Span,
    children: Vec<DocumentSymbol>,
) -> DocumentSymbol {
    DocumentSymbol {
        name: name.to_string(),
        detail: None,
        kind,
        tags: None,
        deprecated: None,
        range: range(file, whole),
        selection_range: range(file, named),
        children: (!children.is_empty()).then_some(children),
    }
}

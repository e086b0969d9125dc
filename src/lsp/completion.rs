//! Completion by what the line so far asks for: a list name after `in`, a class after
//! `extends` or `amends`, a unit after a number, else the measurements and derived values,
//! the built-in functions and the keywords. The client filters by the word typed.

use lsp_types::{CompletionItem, CompletionItemKind};

use super::index::Kind;
use super::workspace::Analysis;
use crate::check::builtins;
use crate::parse::KEYWORDS;
use crate::units;

/// What the text before the cursor, on its line, calls for.
#[derive(Debug, PartialEq, Eq)]
pub enum Wanted {
    /// A parts list.
    List,
    /// A class.
    Class,
    /// A unit symbol.
    Unit,
    /// Any name or keyword.
    Anything,
}

/// What `before` (the line up to the cursor) calls for.
pub fn wanted(before: &str) -> Wanted {
    let trimmed = before.trim_end_matches(|c: char| c.is_alphanumeric() || "_.%³²".contains(c));
    let words: Vec<&str> = trimmed.split_whitespace().collect();
    match words.last() {
        Some(&"in") => Wanted::List,
        Some(&"extends" | &"amends") => Wanted::Class,
        Some(w) if trimmed.ends_with(' ') && ends_in_number(w) && !is_section(&words) => {
            Wanted::Unit
        }
        _ => Wanted::Anything,
    }
}

/// Whether the last word is a rule's section number (`rule 3.1`, `drop 4.2`).
fn is_section(words: &[&str]) -> bool {
    words.len() >= 2 && matches!(words[words.len() - 2], "rule" | "drop" | "override")
}

fn ends_in_number(word: &str) -> bool {
    word.chars().last().is_some_and(|c| c.is_ascii_digit())
        && word
            .chars()
            .all(|c| c.is_ascii_digit() || ".-/+±".contains(c))
}

/// The completion items for the line before the cursor.
pub fn items(analysis: &Analysis, before: &str) -> Vec<CompletionItem> {
    let item = |label: &str, kind: CompletionItemKind, detail: &str| CompletionItem {
        label: label.to_string(),
        kind: Some(kind),
        detail: Some(detail.to_string()),
        ..CompletionItem::default()
    };
    let index = &analysis.index;
    match wanted(before) {
        Wanted::List => index
            .defined(Kind::List)
            .into_iter()
            .map(|n| item(n, CompletionItemKind::ENUM, "parts list"))
            .collect(),
        Wanted::Class => index
            .defined(Kind::Class)
            .into_iter()
            .map(|n| item(n, CompletionItemKind::CLASS, "class"))
            .collect(),
        Wanted::Unit => units::by_dimension()
            .iter()
            .flat_map(|g| {
                g.units
                    .iter()
                    .map(move |u| item(u.symbol, CompletionItemKind::UNIT, g.name))
            })
            .collect(),
        Wanted::Anything => {
            let mut all: Vec<CompletionItem> = index
                .defined(Kind::Value)
                .into_iter()
                .map(|n| {
                    item(
                        n,
                        CompletionItemKind::VARIABLE,
                        "measurement or derived value",
                    )
                })
                .collect();
            all.extend(
                builtins::FORMULAS
                    .iter()
                    .map(|f| item(f.name, CompletionItemKind::FUNCTION, f.summary)),
            );
            all.extend(
                builtins::GENERICS
                    .iter()
                    .map(|(n, g)| item(n, CompletionItemKind::FUNCTION, g.summary())),
            );
            all.extend(
                KEYWORDS
                    .iter()
                    .map(|k| item(k, CompletionItemKind::KEYWORD, "keyword")),
            );
            all
        }
    }
}

#[cfg(test)]
mod tests {
    use super::{Wanted, wanted};

    #[test]
    fn the_line_before_the_cursor_tells_what_is_wanted() {
        assert_eq!(wanted("    require intake.part in "), Wanted::List);
        assert_eq!(wanted("    require intake.part not in ban"), Wanted::List);
        assert_eq!(wanted("class open4 extends "), Wanted::Class);
        assert_eq!(wanted("    require gross_lift <= 0.450 "), Wanted::Unit);
        assert_eq!(wanted("    require gross_lift <= 0.450 i"), Wanted::Unit);
        assert_eq!(wanted("    require gro"), Wanted::Anything);
        assert_eq!(wanted("  rule 3.1 "), Wanted::Anything);
    }
}

//! Parsing: rulebook text to syntax tree. The parser never panics and never stops at the
//! first syntax error: after an error it skips to the next line that starts a top-level item
//! and goes on, so one run reports every broken item of a file.

pub mod ast;
mod error;
mod expr;
pub mod includes;
mod items;
mod lexical;
pub mod print;

pub use error::{Expected, ParseError, QuantityFault, ReadError, SyntaxError, SyntaxKind};
pub use lexical::{KEYWORDS, MAX_DEPTH, NumberPiece, Piece, QuantityParts, UncertaintyParts};

use ast::Rulebook;
use lexical::{Context, Input, ws};

use crate::diagnostic::Problem;
use crate::source::{FileId, Span};

/// Most syntax errors reported for one file; past this the rest is noise.
const MAX_SYNTAX_ERRORS: usize = 20;

/// The byte-order mark some editors write at the start of a UTF-8 file.
const BYTE_ORDER_MARK: char = '\u{feff}';

/// Parses one file as [`parse_rulebook`] does, and returns also the span of every comment
/// in it, in file order (for `gonogo fmt`, which prints them back).
pub fn parse_with_comments(file: FileId, text: &str) -> (Rulebook, Vec<Problem>, Vec<Span>) {
    let ((book, problems), comments) = lexical::with_comments(|| parse_rulebook(file, text));
    (book, problems, comments)
}

/// Parses one file. Returns the items that parsed and a problem for each that did not.
/// A byte-order mark at the start is skipped (spans still count its bytes).
pub fn parse_rulebook(file: FileId, text: &str) -> (Rulebook, Vec<Problem>) {
    let mut input = Input::new_extra(text, Context { file, depth: 0 });
    if text.starts_with(BYTE_ORDER_MARK) {
        input = lexical::advance(input, BYTE_ORDER_MARK.len_utf8());
    }
    let mut items = Vec::new();
    let mut problems = Vec::new();
    loop {
        input = match ws(input) {
            Ok((rest, ())) => rest,
            Err(_) => break,
        };
        if input.fragment().is_empty() {
            break;
        }
        match items::item(input) {
            Ok((rest, item)) => {
                items.push(item);
                input = rest;
            }
            Err(nom::Err::Error(e) | nom::Err::Failure(e)) => {
                problems.push(e.to_problem(text));
                if problems.len() >= MAX_SYNTAX_ERRORS {
                    break;
                }
                match resume_point(text, input.location_offset(), e.offset) {
                    Some(offset) => input = skip_to(input, offset),
                    None => break,
                }
            }
            Err(nom::Err::Incomplete(_)) => break,
        }
    }
    (Rulebook { items }, problems)
}

/// Where to go on after an item that started at `item_start` failed at `error_at`: the error
/// itself when it stands at an item keyword (the item before it was cut short), else the
/// first later line whose first word starts an item.
fn resume_point(text: &str, item_start: usize, error_at: usize) -> Option<usize> {
    if error_at > item_start && starts_item(text.get(error_at..)?) {
        return Some(error_at);
    }
    let from = error_at.max(item_start);
    let mut line_start = text.get(from..)?.find('\n')? + from + 1;
    while line_start < text.len() {
        let line = &text[line_start..];
        let trimmed = line.trim_start();
        if starts_item(trimmed) {
            return Some(line_start + (line.len() - trimmed.len()));
        }
        line_start += line.find('\n')? + 1;
    }
    None
}

/// Whether the text begins with a keyword that starts a top-level item.
fn starts_item(text: &str) -> bool {
    let first_word: String = text
        .chars()
        .take_while(|c| c.is_ascii_alphabetic())
        .collect();
    items::ITEM_KEYWORDS.contains(&first_word.as_str())
}

fn skip_to(input: Input, offset: usize) -> Input {
    lexical::advance(input, offset - input.location_offset())
}

#[cfg(test)]
mod tests;

/// Parses a whole string as one quantity literal, as a declaration writes it: an optional
/// leading `-`, a number, its unit, and an optional `± U [unit] [(k = K)]`. Returns whether
/// it was negated and the parts, borrowed from `text`, or what is wrong with it.
pub fn quantity_literal(text: &str) -> Result<(bool, lexical::QuantityParts<'_>), QuantityFault> {
    let input = Input::new_extra(text, Context::default());
    let fault = |e: nom::Err<SyntaxError>| match e {
        nom::Err::Error(e) | nom::Err::Failure(e) => QuantityFault::diagnose(text, &e),
        nom::Err::Incomplete(_) => QuantityFault::NotAQuantity,
    };
    let (input, _) = ws(input).map_err(fault)?;
    let negative = input.fragment().starts_with('-');
    let input = lexical::advance(input, usize::from(negative));
    let (rest, parts) = lexical::quantity_parts(input).map_err(fault)?;
    let (rest, _) = ws(rest).map_err(fault)?;
    if !rest.fragment().is_empty() {
        return Err(QuantityFault::Trailing {
            rest: rest.fragment().trim().to_string(),
        });
    }
    Ok((negative, parts))
}

/// Parses a date written `YYYY-MM-DD`, if it is one on the calendar.
pub fn date_literal(text: &str) -> Option<ast::Date> {
    let input = Input::new_extra(text.trim(), Context::default());
    match lexical::date(input) {
        Ok((rest, at)) if rest.fragment().is_empty() => Some(at.date),
        _ => None,
    }
}

//! Go to definition and find references, across every file of the rulebook: a measurement or
//! derived value, a list, a class (from `extends` and `amends`), a rule (from `drop`).

use lsp_types::Location;

use super::position::range;
use super::uri::from_path;
use super::workspace::Analysis;
use crate::source::{FileId, Span};

/// Where the name at `offset` is defined.
pub fn definition(analysis: &Analysis, file: FileId, offset: usize) -> Option<Location> {
    let at = analysis.index.at(file, offset)?;
    let defined = analysis.index.definition(at)?;
    location(analysis, defined.span)
}

/// Every place the name at `offset` is written, its definition only when asked.
pub fn references(
    analysis: &Analysis,
    file: FileId,
    offset: usize,
    with_definition: bool,
) -> Vec<Location> {
    let Some(at) = analysis.index.at(file, offset) else {
        return Vec::new();
    };
    analysis
        .index
        .references(at)
        .filter(|o| with_definition || !o.definition)
        .filter_map(|o| location(analysis, o.span))
        .collect()
}

fn location(analysis: &Analysis, span: Span) -> Option<Location> {
    let file = analysis.loaded.sources.file(span.file);
    Some(Location::new(from_path(&file.path)?, range(file, span)))
}

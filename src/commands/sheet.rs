//! `gonogo sheet`: the blank measurement sheet of a class, to print or to fill in.

use std::path::Path;

use super::{Failure, checked_rulebook};
use crate::report::sheet;
use crate::suggest::find_class;

/// Formats of `sheet`.
#[derive(Clone, Copy, Debug, PartialEq, Eq, clap::ValueEnum)]
pub enum SheetFormat {
    /// A printable sheet in Markdown.
    Markdown,
    /// A declaration template to fill in.
    Yaml,
    /// A printable sheet as a self-contained HTML page.
    Html,
}

/// The sheet, or the problems that prevent it.
pub fn run(rules: &Path, class: &str, format: SheetFormat) -> Result<String, Failure> {
    let rulebook = checked_rulebook(rules)?;
    let (_, found) = find_class(&rulebook, class).map_err(|e| Failure::one(e.problem(None)))?;
    Ok(match format {
        SheetFormat::Markdown => sheet::markdown(&rulebook, found),
        SheetFormat::Yaml => sheet::yaml(&rulebook, found),
        SheetFormat::Html => sheet::html(&rulebook, found),
    })
}

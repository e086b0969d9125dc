//! `gonogo fmt`: a rulebook printed in canonical form.

use std::path::Path;

use super::render_all;
use crate::diagnostic::RenderStyle;
use crate::exit::Exit;
use crate::parse::includes::read_problem;
use crate::parse::{parse_rulebook, print::canonical};
use crate::source::SourceMap;

/// The canonical text of one file, or its syntax errors and exit 2. Only the named file is
/// formatted, not the files it includes. Comments are not kept; `note` carries text that
/// must survive formatting.
pub fn run(path: &Path, style: RenderStyle) -> Result<String, (String, Exit)> {
    let mut sources = SourceMap::default();
    let id = sources.read(path).map_err(|f| {
        (
            render_all(&[read_problem(path, f)], &sources, style),
            Exit::BadInput,
        )
    })?;
    let text = sources.file(id).text.clone();
    let (book, problems) = parse_rulebook(id, &text);
    if !problems.is_empty() {
        return Err((render_all(&problems, &sources, style), Exit::BadInput));
    }
    Ok(canonical(&book))
}

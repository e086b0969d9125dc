//! `gonogo fmt`: a rulebook printed in canonical form.

use std::path::Path;

use super::Failure;
use crate::parse::includes::read_problem;
use crate::parse::{parse_rulebook, print::canonical};
use crate::source::SourceMap;

/// The canonical text of one file, or its syntax errors. Only the named file is formatted,
/// not the files it includes. Comments are not kept; `note` carries text that must survive
/// formatting.
pub fn run(path: &Path) -> Result<String, Failure> {
    let mut sources = SourceMap::default();
    let id = match sources.read(path) {
        Ok(id) => id,
        Err(f) => return Err(Failure::new(vec![read_problem(path, f)], sources)),
    };
    let text = sources.file(id).text.clone();
    let (book, problems) = parse_rulebook(id, &text);
    if !problems.is_empty() {
        return Err(Failure::new(problems, sources));
    }
    Ok(canonical(&book))
}

//! `gonogo headroom`: a builder's view of each numeric rule, and how far each input may move.

use std::path::PathBuf;

use super::check::{Role, class_of, declaration_files};
use super::{Failure, checked_rulebook};
use crate::analyze::headroom::headroom;
use crate::load::{LoadProblem, load_declaration};
use crate::report::headroom::{HeadroomFormat, json, text};
use crate::source::SourceMap;

/// The headroom of each declaration, or the problems that prevent it.
pub fn run(
    rules: &std::path::Path,
    class: Option<&str>,
    role: Option<Role>,
    named: &[PathBuf],
    format: HeadroomFormat,
) -> Result<String, Failure> {
    let rulebook = checked_rulebook(rules)?;
    let files = declaration_files(named).map_err(Failure::one)?;
    let mut sources = SourceMap::default();
    let mut texts = Vec::new();
    let mut docs = Vec::new();
    for path in &files {
        let d = match load_declaration(path, &rulebook, &mut sources) {
            Ok(d) => d,
            Err(problems) => return Err(Failure::new(problems, sources)),
        };
        let (_, found) = class_of(path, &d, &rulebook, class)
            .map_err(|e| Failure::one(LoadProblem::unlocated(e).problem()))?;
        let rules = headroom(&rulebook, found, &d, role.map(Role::decision));
        match format {
            HeadroomFormat::Text => texts.push(text(&rulebook, &found.name, &d, &rules)),
            HeadroomFormat::Json => docs.push(json(&rulebook, &found.name, &d, &rules)),
        }
    }
    Ok(match format {
        HeadroomFormat::Text => texts.join("\n"),
        HeadroomFormat::Json => {
            let doc = serde_json::json!({ "schema": "gonogo.headroom/1", "engines": docs });
            serde_json::to_string_pretty(&doc).unwrap_or_default() + "\n"
        }
    })
}

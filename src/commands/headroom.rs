//! `gonogo headroom`: a builder's view of each numeric rule, and how far each input may move.

use std::path::PathBuf;

use super::check::{Role, declaration_files, load_with_class};
use super::{Failure, checked_rulebook};
use crate::analyze::headroom::headroom;
use crate::report::headroom::{HeadroomFormat, json, text};
use crate::source::SourceMap;

/// The headroom of each declaration, or every problem of every declaration that prevents
/// it: each is loaded, dated and given its class as `check` does.
pub fn run(
    rules: &std::path::Path,
    class: Option<&str>,
    role: Option<Role>,
    named: &[PathBuf],
    format: HeadroomFormat,
) -> Result<String, Failure> {
    let rulebook = checked_rulebook(rules)?;
    let files = declaration_files(named).map_err(Failure::one)?;
    let mut engines = Vec::new();
    let mut failed = Failure::default();
    for path in &files {
        let mut sources = SourceMap::default();
        match load_with_class(path, &rulebook, class, &mut sources) {
            Ok(engine) => engines.push(engine),
            Err(problems) => failed.0.extend(Failure::new(problems, sources).0),
        }
    }
    if !failed.0.is_empty() {
        return Err(failed);
    }
    let mut texts = Vec::new();
    let mut docs = Vec::new();
    for (d, at) in &engines {
        let found = &rulebook.classes[*at];
        let rules = headroom(&rulebook, found, d, role.map(Role::decision));
        match format {
            HeadroomFormat::Text => texts.push(text(&rulebook, &found.name, d, &rules)),
            HeadroomFormat::Json => docs.push(json(&rulebook, &found.name, d, &rules)),
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

//! `gonogo headroom`: a builder's view of each numeric rule, and how far each input may move.

use std::path::PathBuf;

use super::check::{Role, declaration_files};
use super::{load_rulebook, render_all};
use crate::diagnostic::{Problem, RenderStyle};
use crate::evaluate::headroom::headroom;
use crate::load::load_declaration;
use crate::report::headroom::{HeadroomFormat, json, text};
use crate::source::SourceMap;

/// The headroom of each declaration, or the diagnostics that prevent it.
pub fn run(
    rules: &std::path::Path,
    class: Option<&str>,
    role: Option<Role>,
    named: &[PathBuf],
    format: HeadroomFormat,
    style: RenderStyle,
) -> Result<String, String> {
    let loaded = load_rulebook(rules);
    let Some(rulebook) = loaded.checked else {
        return Err(render_all(&loaded.problems, &loaded.sources, style));
    };
    let none = SourceMap::default();
    let files = declaration_files(named).map_err(|p| render_all(&[p], &none, style))?;
    let mut sources = SourceMap::default();
    let mut texts = Vec::new();
    let mut docs = Vec::new();
    for path in &files {
        let d = load_declaration(path, &rulebook, &mut sources)
            .map_err(|p| render_all(&[p], &sources, style))?;
        let name = class
            .map(str::to_string)
            .or_else(|| d.identity.class.clone());
        let Some(found) = name.as_deref().and_then(|n| rulebook.class(n)) else {
            let problem = Problem::unlocated(
                "gonogo::check::no-class",
                format!("`{}` names no class of this rulebook", path.display()),
            )
            .with_help("add `class: NAME` to the declaration, or pass `--class NAME`");
            return Err(render_all(&[problem], &none, style));
        };
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

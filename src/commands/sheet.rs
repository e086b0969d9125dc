//! `gonogo sheet`: the blank measurement sheet of a class, to print or to fill in.

use std::path::Path;

use super::{load_rulebook, render_all};
use crate::diagnostic::{Problem, RenderStyle};
use crate::report::sheet;

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

/// The sheet, or the diagnostics that prevent it.
pub fn run(
    rules: &Path,
    class: &str,
    format: SheetFormat,
    style: RenderStyle,
) -> Result<String, String> {
    let loaded = load_rulebook(rules);
    let Some(rulebook) = loaded.checked else {
        return Err(render_all(&loaded.problems, &loaded.sources, style));
    };
    let Some(found) = rulebook.class(class) else {
        let names: Vec<&str> = rulebook.classes.iter().map(|c| c.name.as_str()).collect();
        let problem = Problem::unlocated(
            "gonogo::check::unknown-class",
            format!("the rulebook has no class `{class}`"),
        )
        .with_help(format!("the classes are {}", names.join(", ")));
        return Err(render_all(&[problem], &loaded.sources, style));
    };
    Ok(match format {
        SheetFormat::Markdown => sheet::markdown(&rulebook, found),
        SheetFormat::Yaml => sheet::yaml(&rulebook, found),
        SheetFormat::Html => sheet::html(&rulebook, found),
    })
}

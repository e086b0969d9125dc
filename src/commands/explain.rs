//! `gonogo explain`: one rule of a rulebook in plain words.

use std::path::Path;

use super::{load_rulebook, render_all};
use crate::diagnostic::{Problem, RenderStyle};
use crate::report::explain;

/// The explanation of every version of `section` (in `class`, or in every class that has it),
/// or the diagnostics that prevent it.
pub fn run(
    rules: &Path,
    class: Option<&str>,
    section: &str,
    style: RenderStyle,
) -> Result<String, String> {
    let loaded = load_rulebook(rules);
    let Some(rulebook) = loaded.checked else {
        return Err(render_all(&loaded.problems, &loaded.sources, style));
    };
    if let Some(name) = class
        && rulebook.class(name).is_none()
    {
        let names: Vec<&str> = rulebook.classes.iter().map(|c| c.name.as_str()).collect();
        let problem = Problem::unlocated(
            "gonogo::check::unknown-class",
            format!("the rulebook has no class `{name}`"),
        )
        .with_help(format!("the classes are {}", names.join(", ")));
        return Err(render_all(&[problem], &loaded.sources, style));
    }
    let found = explain::find(&rulebook, class, section);
    if found.is_empty() {
        let place = class
            .map(|c| format!("class `{c}`"))
            .unwrap_or_else(|| "any class".to_string());
        let problem = Problem::unlocated(
            "gonogo::check::unknown-section",
            format!("{place} has no rule {section}"),
        )
        .with_help(
            "check the section number; `gonogo sheet` lists the rules each measurement feeds",
        );
        return Err(render_all(&[problem], &loaded.sources, style));
    }
    Ok(found
        .iter()
        .map(|f| explain::explain(&rulebook, &loaded.sources, f))
        .collect::<Vec<_>>()
        .join("\n"))
}

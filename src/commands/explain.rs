//! `gonogo explain`: one rule of a rulebook in plain words.

use crate::diagnostic::codes;
use std::path::Path;

use super::{Failure, load_rulebook};
use crate::diagnostic::Problem;
use crate::report::explain;
use crate::suggest::find_class;

/// The explanation of every version of `section` (in `class`, or in every class that has it),
/// or the problems that prevent it.
pub fn run(rules: &Path, class: Option<&str>, section: &str) -> Result<String, Failure> {
    let mut loaded = load_rulebook(rules);
    let Some(rulebook) = loaded.checked.take() else {
        return Err(loaded.into());
    };
    if let Some(name) = class {
        find_class(&rulebook, name).map_err(|e| Failure::one(e.problem(None)))?;
    }
    let found = explain::find(&rulebook, class, section);
    if found.is_empty() {
        let message = match class {
            Some(c) => format!("class `{c}` has no rule {section}"),
            None => format!("no class of this rulebook has a rule {section}"),
        };
        let problem = Problem::unlocated(codes::check::UNKNOWN_SECTION, message).with_help(
            "check the section number; `gonogo sheet` lists the rules each measurement feeds",
        );
        return Err(Failure::one(problem));
    }
    Ok(found
        .iter()
        .map(|f| explain::explain(&rulebook, &loaded.sources, f))
        .collect::<Vec<_>>()
        .join("\n"))
}

//! `gonogo diff`: two editions of a series compared rule by rule.

use std::path::Path;

use super::{load_rulebook, render_all};
use crate::compare::{Incomparable, compare};
use crate::diagnostic::{Problem, RenderStyle};
use crate::report::diff::{DiffFormat, render};
use crate::source::SourceMap;

/// The comparison of `old` and `new`, or the diagnostics that prevent it.
pub fn run(
    old: &Path,
    new: &Path,
    class: Option<&str>,
    format: DiffFormat,
    style: RenderStyle,
) -> Result<String, String> {
    let (a, b) = (load_rulebook(old), load_rulebook(new));
    let (Some(old_book), Some(new_book)) = (&a.checked, &b.checked) else {
        let mut out = render_all(&a.problems, &a.sources, style);
        out.push_str(&render_all(&b.problems, &b.sources, style));
        return Err(out);
    };
    if let Some(name) = class
        && old_book.class(name).is_none()
        && new_book.class(name).is_none()
    {
        let problem = Problem::unlocated(
            "gonogo::check::unknown-class",
            format!("neither edition has a class `{name}`"),
        )
        .with_help("name a class of either edition, or leave out `--class`");
        return Err(render_all(&[problem], &SourceMap::default(), style));
    }
    match compare(old_book, new_book, class) {
        Ok(diff) => Ok(render(&diff, format)),
        Err(Incomparable::DifferentSeries(x, y)) => {
            let problem = Problem::unlocated(
                "gonogo::diff::different-series",
                format!("these rulebooks belong to different series: `{x}` and `{y}`"),
            )
            .with_help("compare two editions of the same series");
            Err(render_all(&[problem], &SourceMap::default(), style))
        }
    }
}

//! `gonogo diff`: two editions of a series compared rule by rule.

use std::path::Path;

use super::{different_series, load_editions, render_all};
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
    let (old_book, new_book) = load_editions(old, new, style)?;
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
    match compare(&old_book, &new_book, class) {
        Ok(diff) => Ok(render(&diff, format)),
        Err(Incomparable::DifferentSeries(x, y)) => Err(render_all(
            &[different_series(&x, &y)],
            &SourceMap::default(),
            style,
        )),
    }
}

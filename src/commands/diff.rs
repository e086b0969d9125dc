//! `gonogo diff`: two editions of a series compared rule by rule.

use std::path::Path;

use super::{Failure, different_series, load_editions};
use crate::analyze::compare::{Incomparable, compare};
use crate::report::diff::{DiffFormat, render};
use crate::suggest::{ClassScope, UnknownClass, class_names};

/// The comparison of `old` and `new`, or the problems that prevent it.
pub fn run(
    old: &Path,
    new: &Path,
    class: Option<&str>,
    format: DiffFormat,
) -> Result<String, Failure> {
    let (old_book, new_book) = load_editions(old, new)?;
    if let Some(name) = class
        && old_book.class(name).is_none()
        && new_book.class(name).is_none()
    {
        let mut known = class_names(&old_book);
        known.extend(
            class_names(&new_book)
                .into_iter()
                .filter(|n| old_book.class(n).is_none()),
        );
        let unknown = UnknownClass::new(name, ClassScope::EitherEdition, known);
        return Err(Failure::one(unknown.problem(None)));
    }
    match compare(&old_book, &new_book, class) {
        Ok(diff) => Ok(render(&diff, format)),
        Err(Incomparable::DifferentSeries(x, y)) => Err(Failure::one(different_series(&x, &y))),
    }
}

//! `gonogo diff`: two editions of a series compared rule by rule.

use std::path::Path;

use super::Failure;
use super::different_series;
use super::sides::{SideRequest, load_sides};
use crate::analyze::compare::{Incomparable, compare_on};
use crate::report::diff::{DiffFormat, render};
use crate::suggest::{ClassScope, UnknownClass, class_names};

/// The comparison of `old` and `new`, each on its side's date (a draft bulletin added to
/// `new` when `sides` names one), or the problems that prevent it.
pub fn run(
    old: &Path,
    new: &Path,
    class: Option<&str>,
    sides: SideRequest,
    format: DiffFormat,
) -> Result<String, Failure> {
    let loaded = load_sides(old, new, sides)?;
    let whens = (loaded.old.when, loaded.new.when);
    let drafts = loaded.draft.map(|d| d.ids).unwrap_or_default();
    let (old_book, new_book) = (loaded.old.book, loaded.new.book);
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
    match compare_on(&old_book, &new_book, whens, class) {
        Ok(diff) => Ok(render(&diff, &drafts, format)),
        Err(Incomparable::DifferentSeries(x, y)) => Err(Failure::one(different_series(&x, &y))),
    }
}

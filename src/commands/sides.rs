//! The two sides a drafting comparison (`diff`, `impact`) sets against each other: an edition
//! on a date (the edition with every bulletin in force by then), and the same or another
//! edition on another date, perhaps with a draft bulletin added to it. A draft is a file of
//! `bulletin … end` items only, checked together with the edition it amends, so it meets
//! every static check a published bulletin meets.

use std::path::Path;

use super::{Failure, LoadedRulebook, load_rulebook};
use crate::analyze::compare::{When, same_edition};
use crate::check::model::CheckedRulebook;
use crate::diagnostic::{Level, Problem, codes};
use crate::parse::ast::{Date, Item};

/// What the user asked to compare, as typed.
#[derive(Clone, Copy, Debug, Default)]
pub struct SideRequest<'a> {
    /// The date the old edition is taken on (`--old-on`, or `--on`).
    pub old_on: Option<&'a str>,
    /// The date the new edition is taken on (`--new-on`, or `--on`).
    pub new_on: Option<&'a str>,
    /// A draft bulletin added to the new edition (`--with-bulletin`).
    pub draft: Option<&'a Path>,
}

/// One side: a checked edition and which of its rules are taken.
pub struct Side {
    /// The edition, with the draft bulletin checked into it on the new side.
    pub book: CheckedRulebook,
    /// Which rules: as published, on a date, or with every bulletin.
    pub when: When,
}

/// The draft bulletin's ids and the earliest date it takes effect, when one was added.
pub struct Draft {
    /// The ids of the bulletins in the draft file.
    pub ids: Vec<String>,
    /// When the last of them comes into force.
    pub effective: Date,
}

/// Both sides loaded and dated, and the draft when there is one.
pub struct Sides {
    /// The old side.
    pub old: Side,
    /// The new side.
    pub new: Side,
    /// The draft bulletin added to the new side.
    pub draft: Option<Draft>,
}

/// A date typed on the command line, or problem A04 naming the option.
pub fn parse_date(text: &str, option: &str) -> Result<Date, Problem> {
    crate::parse::date_literal(text).ok_or_else(|| {
        Problem::unlocated(
            codes::analyze::BAD_DATE_OPTION,
            format!("`{text}` given to {option} is not a date"),
        )
        .with_help("write the date as YYYY-MM-DD, for example 2027-07-01")
    })
}

/// Loads both editions and dates them. With a draft and no `--new-on`, the new side is taken
/// on the draft's effective date, so the draft is in force; a `--new-on` before it is refused
/// (A05), since the draft would then change nothing. Without `--old-on` the old side is: one
/// edition with a draft, that edition on the draft's date without the draft (so the draft's
/// change is all that differs); one edition, as published; two editions, the old with every
/// bulletin it has (the rules in force when the new edition replaces it).
pub fn load_sides(old: &Path, new: &Path, request: SideRequest) -> Result<Sides, Failure> {
    let old_on = request
        .old_on
        .map(|t| parse_date(t, "--old-on"))
        .transpose()
        .map_err(Failure::one)?;
    let new_on = request
        .new_on
        .map(|t| parse_date(t, "--new-on"))
        .transpose()
        .map_err(Failure::one)?;
    let a = load_rulebook(old);
    let b = match request.draft {
        Some(draft) => load_with_draft(new, draft),
        None => load_rulebook(new),
    };
    let draft = request.draft.and_then(|_| draft_of(&b));
    let (old_book, new_book) = super::checked_pair(a, b)?;
    let new_when = match (&draft, new_on) {
        (Some(d), None) => When::On(d.effective),
        (Some(d), Some(on)) if on < d.effective => {
            return Err(Failure::one(draft_not_in_force(d, on)));
        }
        (_, Some(on)) => When::On(on),
        (None, None) => When::Published,
    };
    let one = same_edition(&old_book, &new_book);
    let old_when = match (old_on, &draft) {
        (Some(on), _) => When::On(on),
        (None, Some(d)) if one => When::On(d.effective),
        (None, _) if one => When::Published,
        (None, _) => When::Latest,
    };
    Ok(Sides {
        old: Side {
            book: old_book,
            when: old_when,
        },
        new: Side {
            book: new_book,
            when: new_when,
        },
        draft,
    })
}

fn draft_not_in_force(d: &Draft, on: Date) -> Problem {
    Problem::unlocated(
        codes::analyze::DRAFT_NOT_IN_FORCE,
        format!(
            "the draft bulletin {} takes effect {}, after --new-on {on}, so it would change nothing",
            d.ids.join(", "),
            d.effective
        ),
    )
    .with_help(format!(
        "give --new-on {} or later, or leave --new-on out to take the draft's own date",
        d.effective
    ))
}

/// The draft's bulletins as the checked rulebook holds them (the draft file is the last read).
fn draft_of(loaded: &LoadedRulebook) -> Option<Draft> {
    let (_, book) = loaded.files.files.last()?;
    let bulletins: Vec<_> = book
        .items
        .iter()
        .filter_map(|i| match i {
            Item::Bulletin(b) => Some(b),
            _ => None,
        })
        .collect();
    let effective = bulletins.iter().map(|b| b.effective.date).max()?;
    Some(Draft {
        ids: bulletins.iter().map(|b| b.id.value.clone()).collect(),
        effective,
    })
}

/// The edition at `path` with the draft file's bulletins checked in as if it included them.
/// A draft that holds anything but bulletins is refused (A03), naming the first such item.
fn load_with_draft(path: &Path, draft: &Path) -> LoadedRulebook {
    let mut loaded = load_rulebook(path);
    if loaded.problems.iter().any(|p| p.level == Level::Error) || loaded.files.files.is_empty() {
        return loaded;
    }
    let id = match loaded.sources.read(draft) {
        Ok(id) => id,
        Err(failure) => {
            loaded.checked = None;
            loaded
                .problems
                .push(crate::parse::includes::read_problem(draft, failure));
            return loaded;
        }
    };
    let text = loaded.sources.file(id).text.clone();
    let (book, mut problems) = crate::parse::parse_rulebook(id, &text);
    if book.items.is_empty() && problems.is_empty() {
        problems.push(
            Problem::unlocated(
                codes::analyze::DRAFT_NOT_BULLETINS,
                format!("`{}` holds no bulletin", draft.display()),
            )
            .with_help("a draft holds one or more `bulletin \"ID\" … end` items"),
        );
    }
    problems.extend(book.items.iter().filter_map(not_a_bulletin).take(1));
    loaded.files.files.push((id, book));
    loaded.checked = None;
    if !problems.iter().any(|p| p.level == Level::Error) {
        let (model, found) = crate::check::check(&loaded.files);
        loaded.checked = model;
        problems.extend(found);
    }
    loaded.problems.extend(problems);
    loaded
}

fn not_a_bulletin(item: &Item) -> Option<Problem> {
    if matches!(item, Item::Bulletin(_)) {
        return None;
    }
    let problem = Problem::unlocated(
        codes::analyze::DRAFT_NOT_BULLETINS,
        "a draft bulletin file holds something other than bulletins",
    )
    .with_help(
        "keep only `bulletin \"ID\" … end` items in the draft; change the edition itself in the rulebook",
    );
    Some(match item_span(item) {
        Some(span) => Problem {
            labels: vec![(span, "not a bulletin".to_string())],
            ..problem
        },
        None => problem,
    })
}

fn item_span(item: &Item) -> Option<crate::source::Span> {
    match item {
        Item::Class(c) => Some(c.span),
        Item::Measure(m) => Some(m.span),
        Item::Define(d) => Some(d.span),
        Item::List(l) => Some(l.span),
        _ => None,
    }
}

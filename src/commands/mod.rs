//! The subcommands. Each takes its parsed arguments and returns its document, or a
//! [`Failure`]: every problem found, as data, with the files they point into. Nothing here
//! renders a diagnostic or prints; `main` does both, once. None of them gives half a report
//! on bad input. (`units` reads no file: it lists the unit table.)

pub mod check;
pub mod diff;
pub mod explain;
pub mod field;
pub mod fmt;
pub mod headroom;
pub mod impact;
pub mod lint;
pub mod season;
pub mod sheet;
pub mod sides;
pub mod sweep;
pub mod units;

use crate::check::model::CheckedRulebook;
use crate::diagnostic::codes;
use crate::diagnostic::{Level, Problem, RenderStyle, render};
use crate::parse::includes::{RulebookFiles, read_rulebook};
use crate::source::SourceMap;

/// A rulebook read, parsed and checked, with everything found on the way.
pub struct LoadedRulebook {
    /// Every file read.
    pub sources: SourceMap,
    /// The syntax trees.
    pub files: RulebookFiles,
    /// The checked rulebook, when there was no error.
    pub checked: Option<CheckedRulebook>,
    /// Every problem, errors and warnings.
    pub problems: Vec<Problem>,
}

/// Reads, parses and checks one rulebook. The static checks run only on files that parse.
pub fn load_rulebook(path: &std::path::Path) -> LoadedRulebook {
    load_rulebook_in(path, SourceMap::default())
}

/// [`load_rulebook`] reading through `sources`, which may hold texts that stand in for files
/// (see [`SourceMap::with_open`]).
pub fn load_rulebook_in(path: &std::path::Path, sources: SourceMap) -> LoadedRulebook {
    let mut loaded = lint_rulebook_in(path, sources);
    if let Some(book) = &mut loaded.checked {
        book.sha256 = crate::digest::rulebook_sha256(&loaded.files, &loaded.sources);
    }
    loaded
}

/// [`load_rulebook_in`] without the rulebook's fingerprint (its `sha256` left empty), for
/// what never shows it: `lint` and the language server. Hashing a large rulebook costs more
/// than a tenth of its checking.
pub fn lint_rulebook_in(path: &std::path::Path, mut sources: SourceMap) -> LoadedRulebook {
    let (files, mut problems) = read_rulebook(path, &mut sources);
    let mut checked = None;
    if !files.files.is_empty() && !problems.iter().any(|p| p.level == Level::Error) {
        let (model, found) = crate::check::check(&files);
        checked = model;
        problems.extend(found);
    }
    LoadedRulebook {
        sources,
        files,
        checked,
        problems,
    }
}

/// Renders problems, errors first, each as miette's report.
pub fn render_all(problems: &[Problem], sources: &SourceMap, style: RenderStyle) -> String {
    let mut ordered: Vec<&Problem> = problems.iter().collect();
    ordered.sort_by_key(|p| std::cmp::Reverse(p.level));
    ordered
        .iter()
        .map(|p| render(p, sources, style))
        .collect::<Vec<_>>()
        .join("\n")
}

/// Problems found together, and the files they point into.
#[derive(Debug, Default)]
pub struct ProblemSet {
    /// Every problem, errors and warnings.
    pub problems: Vec<Problem>,
    /// The files read.
    pub sources: SourceMap,
}

/// Why a command gives no document: its problems, in one or more sets (each declaration and
/// each rulebook is read with its own source map).
#[derive(Debug, Default)]
pub struct Failure(pub Vec<ProblemSet>);

impl Failure {
    /// A failure of these problems, found in `sources`.
    pub fn new(problems: Vec<Problem>, sources: SourceMap) -> Failure {
        Failure(vec![ProblemSet { problems, sources }])
    }

    /// A failure of one problem that points into no file.
    pub fn one(problem: Problem) -> Failure {
        Failure::new(vec![problem], SourceMap::default())
    }

    /// Every problem, in order.
    pub fn problems(&self) -> impl Iterator<Item = &Problem> {
        self.0.iter().flat_map(|set| set.problems.iter())
    }

    /// The problems rendered as miette's reports, errors first in each set.
    pub fn render(&self, style: RenderStyle) -> String {
        self.0
            .iter()
            .filter(|set| !set.problems.is_empty())
            .map(|set| render_all(&set.problems, &set.sources, style))
            .collect::<Vec<_>>()
            .join("\n")
    }
}

impl std::fmt::Display for Failure {
    /// The problems rendered without colour.
    fn fmt(&self, f: &mut std::fmt::Formatter<'_>) -> std::fmt::Result {
        f.write_str(&self.render(RenderStyle::PLAIN))
    }
}

impl From<LoadedRulebook> for Failure {
    fn from(loaded: LoadedRulebook) -> Failure {
        Failure::new(loaded.problems, loaded.sources)
    }
}

/// The checked rulebook at `path`, or every problem that prevents it.
pub fn checked_rulebook(path: &std::path::Path) -> Result<CheckedRulebook, Failure> {
    let mut loaded = load_rulebook(path);
    match loaded.checked.take() {
        Some(rulebook) => Ok(rulebook),
        None => Err(loaded.into()),
    }
}

/// Two editions of one series, both checked; or every problem of either, and a refusal when
/// they belong to different series (nothing can then be compared).
pub fn load_editions(
    old: &std::path::Path,
    new: &std::path::Path,
) -> Result<(CheckedRulebook, CheckedRulebook), Failure> {
    checked_pair(load_rulebook(old), load_rulebook(new))
}

/// Two loaded editions as checked rulebooks of one series, or every problem of both (and a
/// refusal when their series differ). Shared by `diff`, `impact` and their dated sides.
pub fn checked_pair(
    a: LoadedRulebook,
    b: LoadedRulebook,
) -> Result<(CheckedRulebook, CheckedRulebook), Failure> {
    let (Some(old_book), Some(new_book)) = (a.checked, b.checked) else {
        let mut failure = Failure::new(a.problems, a.sources);
        failure.0.push(ProblemSet {
            problems: b.problems,
            sources: b.sources,
        });
        return Err(failure);
    };
    if old_book.series != new_book.series {
        return Err(Failure::one(different_series(
            &old_book.series,
            &new_book.series,
        )));
    }
    Ok((old_book, new_book))
}

/// The refusal to compare rulebooks of two series.
pub fn different_series(a: &str, b: &str) -> Problem {
    Problem::unlocated(
        codes::analyze::DIFFERENT_SERIES,
        format!("these rulebooks belong to different series: `{a}` and `{b}`"),
    )
    .with_help("compare two editions of the same series")
}

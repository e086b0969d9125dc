//! The subcommands. Each takes its parsed arguments and writes its report to the given
//! output, returning the exit status; none of them prints half a report on bad input.

pub mod check;
pub mod diff;
pub mod explain;
pub mod fmt;
pub mod headroom;
pub mod impact;
pub mod lint;
pub mod sheet;

use crate::check::model::CheckedRulebook;
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
    let mut sources = SourceMap::default();
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

/// Two editions of one series, both checked; or every problem of either, and a refusal when
/// they belong to different series (nothing can then be compared).
pub fn load_editions(
    old: &std::path::Path,
    new: &std::path::Path,
    style: RenderStyle,
) -> Result<(CheckedRulebook, CheckedRulebook), String> {
    let (a, b) = (load_rulebook(old), load_rulebook(new));
    let (Some(old_book), Some(new_book)) = (a.checked, b.checked) else {
        let mut out = render_all(&a.problems, &a.sources, style);
        out.push_str(&render_all(&b.problems, &b.sources, style));
        return Err(out);
    };
    if old_book.series != new_book.series {
        return Err(render_all(
            &[different_series(&old_book.series, &new_book.series)],
            &SourceMap::default(),
            style,
        ));
    }
    Ok((old_book, new_book))
}

/// The refusal to compare rulebooks of two series.
pub fn different_series(a: &str, b: &str) -> Problem {
    Problem::unlocated(
        "gonogo::diff::different-series",
        format!("these rulebooks belong to different series: `{a}` and `{b}`"),
    )
    .with_help("compare two editions of the same series")
}

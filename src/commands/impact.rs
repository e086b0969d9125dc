//! `gonogo impact`: a field of engines checked under two editions; whose verdicts change.

use crate::diagnostic::codes;
use std::path::PathBuf;

use super::check::{Role, class_of, declaration_files};
use super::{Failure, load_editions};
use crate::analyze::impact::{Engine, impact};
use crate::check::model::CheckedRulebook;
use crate::diagnostic::Problem;
use crate::load::{Declaration, LoadProblem, load_declaration};
use crate::report::impact::{Heading, ImpactFormat, render};
use crate::source::SourceMap;

/// The impact report, or the problems when nothing could be compared (exit 2).
pub fn run(
    old: &std::path::Path,
    new: &std::path::Path,
    named: &[PathBuf],
    role: Option<Role>,
    format: ImpactFormat,
) -> Result<String, Failure> {
    let (old_book, new_book) = load_editions(old, new)?;
    let (old_book, new_book) = (&old_book, &new_book);
    let files = declaration_files(named).map_err(Failure::one)?;
    let mut loaded: Vec<(Declaration, Declaration, String)> = Vec::new();
    let mut unreadable: Vec<(String, String)> = Vec::new();
    for path in &files {
        match load_both(path, old_book, new_book) {
            Ok(both) => loaded.push(both),
            Err(why) => unreadable.push((path.display().to_string(), why)),
        }
    }
    if loaded.is_empty() {
        let list: Vec<String> = unreadable
            .iter()
            .map(|(f, w)| format!("{f}: {w}"))
            .collect();
        let problem = Problem::unlocated(
            codes::analyze::NOTHING_TO_COMPARE,
            "no declaration could be compared under both editions",
        )
        .with_help(if list.is_empty() {
            "name declaration files or folders that hold some".to_string()
        } else {
            list.join("\n")
        });
        return Err(Failure::one(problem));
    }
    let engines: Vec<Engine> = loaded
        .iter()
        .map(|(o, n, c)| Engine {
            old: o,
            new: n,
            class: c,
        })
        .collect();
    let decision = role.map(Role::decision);
    let result = impact(old_book, new_book, &engines, decision);
    let heading = Heading {
        series: &new_book.series,
        old: &old_book.edition,
        new: &new_book.edition,
        decision: decision.unwrap_or(new_book.decision).words(),
    };
    Ok(render(&heading, &result, &unreadable, format))
}

/// Every problem of a declaration on one line each, with its line and column and code:
/// `15:40 \`bore\` is a length, … (D22 wrong-dimension)`.
fn every_problem(problems: &[Problem], sources: &SourceMap) -> String {
    if problems.is_empty() {
        return "the declaration could not be read".to_string();
    }
    let lines: Vec<String> = problems
        .iter()
        .map(|p| {
            let at = p.primary_span().map(|span| {
                let (line, column) = sources.file(span.file).line_column(span.start);
                format!("{line}:{column} ")
            });
            format!("{}{} ({})", at.unwrap_or_default(), p.message, p.code)
        })
        .collect();
    lines.join("; ")
}

/// The declaration read against each edition's schema, and its class (in both editions),
/// found as `check` finds it. It is not dated against the editions: the field is checked
/// under each edition as published, whatever season its declarations were measured in.
fn load_both(
    path: &std::path::Path,
    old: &CheckedRulebook,
    new: &CheckedRulebook,
) -> Result<(Declaration, Declaration, String), String> {
    let mut sources = SourceMap::default();
    let o = load_declaration(path, old, &mut sources).map_err(|p| every_problem(&p, &sources))?;
    let n = load_declaration(path, new, &mut sources).map_err(|p| every_problem(&p, &sources))?;
    let (_, found) = class_of(path, &n, new, None)
        .map_err(|e| every_problem(&[LoadProblem::unlocated(e).problem()], &sources))?;
    let class = found.name.clone();
    if old.class(&class).is_none() {
        return Err(format!("class `{class}` is not in edition {}", old.edition));
    }
    Ok((o, n, class))
}

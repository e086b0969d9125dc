//! The lint command's problems as LSP diagnostics, each in the file its first label points
//! into (a problem that points into no file goes on the first line of the rulebook read).
//! The code is the lint code (`C56`), the source `gonogo`, the help line follows the message,
//! and the other labels are related information.

use std::collections::BTreeMap;

use lsp_types::{
    Diagnostic, DiagnosticRelatedInformation, DiagnosticSeverity, Location, NumberOrString, Range,
    Uri,
};

use super::position::range;
use super::uri::from_path;
use super::workspace::Analysis;
use crate::diagnostic::{Level, Problem};
use crate::source::FileId;

/// Every file read with its diagnostics (an empty list for a clean file, so the editor clears
/// what it showed before).
pub fn by_file(analysis: &Analysis) -> Vec<(Uri, Vec<Diagnostic>)> {
    let loaded = &analysis.loaded;
    let mut files: BTreeMap<FileId, Vec<Diagnostic>> = BTreeMap::new();
    for (id, _) in &loaded.files.files {
        files.entry(*id).or_default();
    }
    for problem in &loaded.problems {
        let file = problem.primary_span().map_or(0, |s| s.file);
        files
            .entry(file)
            .or_default()
            .push(diagnostic(problem, analysis));
    }
    files
        .into_iter()
        .filter(|(id, _)| (*id as usize) < file_count(analysis))
        .filter_map(|(id, list)| Some((from_path(&loaded.sources.file(id).path)?, list)))
        .collect()
}

fn file_count(analysis: &Analysis) -> usize {
    analysis
        .loaded
        .files
        .files
        .iter()
        .map(|(id, _)| *id as usize + 1)
        .max()
        .unwrap_or(0)
}

/// One problem as a diagnostic.
pub fn diagnostic(problem: &Problem, analysis: &Analysis) -> Diagnostic {
    let sources = &analysis.loaded.sources;
    let place = |span: crate::source::Span| range(sources.file(span.file), span);
    let at = problem.primary_span().map_or_else(Range::default, place);
    let mut message = problem.message.clone();
    if let Some((_, label)) = problem.labels.first()
        && !label.is_empty()
    {
        message.push_str(&format!(": {label}"));
    }
    if let Some(help) = &problem.help {
        message.push_str(&format!("\nhelp: {help}"));
    }
    let related: Vec<DiagnosticRelatedInformation> = problem
        .labels
        .iter()
        .skip(1)
        .filter_map(|(span, label)| {
            Some(DiagnosticRelatedInformation {
                location: Location::new(from_path(&sources.file(span.file).path)?, place(*span)),
                message: label.clone(),
            })
        })
        .collect();
    Diagnostic {
        range: at,
        severity: Some(match problem.level {
            Level::Error => DiagnosticSeverity::ERROR,
            Level::Warning => DiagnosticSeverity::WARNING,
        }),
        code: Some(NumberOrString::String(problem.code.tag())),
        source: Some("gonogo".to_string()),
        message,
        related_information: (!related.is_empty()).then_some(related),
        ..Diagnostic::default()
    }
}

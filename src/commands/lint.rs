//! `gonogo lint`: the static checks of each rulebook, as text or as JSON for editors.

use std::path::PathBuf;

use serde::Serialize;

use super::{load_rulebook, render_all};
use crate::diagnostic::{Level, Problem, RenderStyle, summary};
use crate::exit::Exit;
use crate::source::SourceMap;

/// Output formats of `lint`.
#[derive(Clone, Copy, Debug, PartialEq, Eq, clap::ValueEnum)]
pub enum LintFormat {
    /// Rendered diagnostics.
    Text,
    /// One JSON document (schema `gonogo.lint/1`).
    Json,
}

/// Lints every file and returns the report and the exit status: 0 when no file has an error
/// (warnings allowed), 2 otherwise.
pub fn run(paths: &[PathBuf], format: LintFormat, style: RenderStyle) -> (String, Exit) {
    let mut text = String::new();
    let mut report = LintReport {
        schema: "gonogo.lint/1",
        files: Vec::new(),
    };
    let mut failed = false;
    for path in paths {
        let loaded = load_rulebook(path);
        let errors = loaded
            .problems
            .iter()
            .filter(|p| p.level == Level::Error)
            .count();
        failed |= errors > 0;
        if !loaded.problems.is_empty() {
            text.push_str(&render_all(&loaded.problems, &loaded.sources, style));
            text.push('\n');
        }
        let verdict = if errors > 0 { "has errors" } else { "ok" };
        text.push_str(&format!(
            "{}: {verdict} ({})\n",
            path.display(),
            summary(&loaded.problems)
        ));
        report.files.push(FileReport {
            path: path.display().to_string(),
            errors,
            warnings: loaded.problems.len() - errors,
            problems: loaded
                .problems
                .iter()
                .map(|p| JsonProblem::new(p, &loaded.sources))
                .collect(),
        });
    }
    let out = match format {
        LintFormat::Text => text,
        LintFormat::Json => serde_json::to_string_pretty(&report).unwrap_or_default() + "\n",
    };
    (out, if failed { Exit::BadInput } else { Exit::Clean })
}

/// The JSON document `lint --format json` writes.
#[derive(Serialize)]
struct LintReport {
    /// Schema name and version.
    schema: &'static str,
    /// One entry per file named on the command line.
    files: Vec<FileReport>,
}

#[derive(Serialize)]
struct FileReport {
    path: String,
    errors: usize,
    warnings: usize,
    problems: Vec<JsonProblem>,
}

#[derive(Serialize)]
struct JsonProblem {
    code: &'static str,
    severity: &'static str,
    message: String,
    help: Option<String>,
    labels: Vec<JsonLabel>,
}

#[derive(Serialize)]
struct JsonLabel {
    file: String,
    line: usize,
    column: usize,
    end_line: usize,
    end_column: usize,
    label: String,
}

impl JsonProblem {
    fn new(p: &Problem, sources: &SourceMap) -> JsonProblem {
        let labels = p
            .labels
            .iter()
            .map(|(span, label)| {
                let file = sources.file(span.file);
                let (line, column) = file.line_column(span.start);
                let (end_line, end_column) = file.line_column(span.end);
                JsonLabel {
                    file: file.path.display().to_string(),
                    line,
                    column,
                    end_line,
                    end_column,
                    label: label.clone(),
                }
            })
            .collect();
        JsonProblem {
            code: p.code,
            severity: match p.level {
                Level::Error => "error",
                Level::Warning => "warning",
            },
            message: p.message.clone(),
            help: p.help.clone(),
            labels,
        }
    }
}

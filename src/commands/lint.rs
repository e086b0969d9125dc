//! `gonogo lint`: the static checks of each rulebook, as text or as JSON for editors.

use std::path::PathBuf;

use serde::Serialize;

use super::{ProblemSet, lint_rulebook_in, render_all};
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

/// One rulebook linted: its path and what was found in it.
pub struct LintedFile {
    /// The path as named.
    pub path: PathBuf,
    /// Every problem, with the files read.
    pub found: ProblemSet,
}

impl LintedFile {
    /// Whether the file named could not be had as text: the operating system refused it
    /// (missing, not permitted, a folder), it is over the size cap, or it is not UTF-8. Such
    /// a problem points into no file. The same failure of an included file is located at
    /// its `include`, a mistake in the rulebook: an error found, not this.
    fn unreadable(&self) -> bool {
        use crate::diagnostic::codes::read;
        self.found.problems.iter().any(|p| {
            p.labels.is_empty() && [read::IO, read::TOO_LARGE, read::NOT_UTF8].contains(&p.code)
        })
    }

    fn errors(&self) -> usize {
        self.found
            .problems
            .iter()
            .filter(|p| p.level == Level::Error)
            .count()
    }
}

/// Every rulebook linted, in the order named.
pub struct Linted(pub Vec<LintedFile>);

/// Lints every file.
pub fn run(paths: &[PathBuf]) -> Linted {
    Linted(
        paths
            .iter()
            .map(|path| {
                let loaded = lint_rulebook_in(path, SourceMap::default());
                LintedFile {
                    path: path.clone(),
                    found: ProblemSet {
                        problems: loaded.problems,
                        sources: loaded.sources,
                    },
                }
            })
            .collect(),
    )
}

impl Linted {
    /// 2 when a file could not be read at all (lint could not run on it), else 1 when a
    /// file has an error, else 0 (warnings allowed).
    pub fn exit(&self) -> Exit {
        if self.0.iter().any(LintedFile::unreadable) {
            Exit::BadInput
        } else if self.0.iter().any(|f| f.errors() > 0) {
            Exit::ERRORS_FOUND
        } else {
            Exit::Clean
        }
    }

    /// The report: each file's rendered problems and a closing line, or the JSON document.
    pub fn render(&self, format: LintFormat, style: RenderStyle) -> String {
        match format {
            LintFormat::Text => self.0.iter().map(|f| text(f, style)).collect(),
            LintFormat::Json => {
                let report = LintReport {
                    schema: "gonogo.lint/1",
                    files: self.0.iter().map(FileReport::new).collect(),
                };
                serde_json::to_string_pretty(&report).unwrap_or_default() + "\n"
            }
        }
    }
}

/// The most problems the text report renders for one file: errors first, so none hides
/// behind warnings; the rest are counted (and all are in `--format json`).
pub const MOST_SHOWN: usize = 100;

fn text(file: &LintedFile, style: RenderStyle) -> String {
    let found = &file.found;
    let mut out = String::new();
    if !found.problems.is_empty() {
        let mut shown: Vec<Problem> = found.problems.clone();
        shown.sort_by_key(|p| p.level != Level::Error);
        let hidden = shown.len().saturating_sub(MOST_SHOWN);
        shown.truncate(MOST_SHOWN);
        out.push_str(&render_all(&shown, &found.sources, style));
        out.push('\n');
        if hidden > 0 {
            out.push_str(&format!(
                "… and {} not shown; `gonogo lint --format json` lists every one\n",
                crate::report::format::count(hidden, "more problem", "more problems")
            ));
        }
    }
    let verdict = if file.errors() > 0 {
        "has errors"
    } else {
        "ok"
    };
    out.push_str(&format!(
        "{}: {verdict} ({})\n",
        file.path.display(),
        summary(&found.problems)
    ));
    out
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

impl FileReport {
    fn new(file: &LintedFile) -> FileReport {
        let found = &file.found;
        let errors = file.errors();
        FileReport {
            path: file.path.display().to_string(),
            errors,
            warnings: found.problems.len() - errors,
            problems: found
                .problems
                .iter()
                .map(|p| JsonProblem::new(p, &found.sources))
                .collect(),
        }
    }
}

#[derive(Serialize)]
struct JsonProblem {
    code: crate::diagnostic::Code,
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

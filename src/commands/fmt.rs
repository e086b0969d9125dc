//! `gonogo fmt`: rulebooks printed in canonical form, with their comments and blank lines
//! kept (see `parse::print`). Three ways to run it: print one file's canonical text, check
//! that files are already canonical (`--check`, for CI), or put the canonical text back in
//! each file (`--write`, through `output::rewrite_input`, which never loses an edit saved
//! meanwhile).

use std::path::{Path, PathBuf};

use super::{Failure, ProblemSet};
use crate::exit::Exit;
use crate::output::rewrite_input;
use crate::parse::includes::read_problem;
use crate::parse::{parse_with_comments, print::formatted};
use crate::source::SourceMap;

/// What `fmt` does with the canonical text.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum Mode {
    /// Print it (one file).
    Print,
    /// Say which files differ from it; exit 1 when one does.
    Check,
    /// Write it back to each file that differs.
    Write,
}

/// One file read and formatted.
struct Done {
    path: PathBuf,
    read: String,
    canonical: String,
}

/// Formats every file (only the files named, not those they include) and does what `mode`
/// says. Any file that cannot be read or parsed fails the run and then nothing is written.
pub fn run(files: &[PathBuf], mode: Mode) -> Result<(String, Exit), Failure> {
    let mut done = Vec::new();
    let mut failed = Vec::new();
    for path in files {
        match format_file(path) {
            Ok(file) => done.push(file),
            Err(set) => failed.push(set),
        }
    }
    if !failed.is_empty() {
        return Err(Failure(failed));
    }
    let changed = done.iter().filter(|f| f.read != f.canonical);
    match mode {
        Mode::Print => Ok((
            done.iter().map(|f| f.canonical.as_str()).collect(),
            Exit::Clean,
        )),
        Mode::Check => {
            let report: String = changed
                .map(|f| format!("not in canonical form: {}\n", f.path.display()))
                .collect();
            let exit = if report.is_empty() {
                Exit::Clean
            } else {
                Exit::ERRORS_FOUND
            };
            Ok((report, exit))
        }
        Mode::Write => {
            let mut report = String::new();
            for file in changed {
                rewrite_input(&file.path, &file.read, &file.canonical)
                    .map_err(|p| Failure::new(vec![p], SourceMap::default()))?;
                report.push_str(&format!("formatted {}\n", file.path.display()));
            }
            Ok((report, Exit::Clean))
        }
    }
}

/// The text of one file and its canonical form, or its read or syntax errors.
fn format_file(path: &Path) -> Result<Done, ProblemSet> {
    let mut sources = SourceMap::default();
    let id = match sources.read(path) {
        Ok(id) => id,
        Err(f) => {
            let problems = vec![read_problem(path, f)];
            return Err(ProblemSet { problems, sources });
        }
    };
    let read = sources.file(id).text.clone();
    let (book, problems, comments) = parse_with_comments(id, &read);
    if !problems.is_empty() {
        return Err(ProblemSet { problems, sources });
    }
    let canonical = formatted(&book, &read, &comments);
    Ok(Done {
        path: path.to_path_buf(),
        read: read.to_string(),
        canonical,
    })
}

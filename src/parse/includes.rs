//! Reading a rulebook from disk: the root file and every file it includes. An include names
//! a file in the including file's own folder or below it; absolute paths, `..` and links that
//! lead outside are refused, and so is a file that includes itself.

use std::path::{Component, Path, PathBuf};

use super::ast::{Item, Rulebook, Text};
use super::error::ReadError;
use super::parse_rulebook;
use crate::diagnostic::Problem;
use crate::source::{FileId, ReadFailure, SourceMap};

/// Every file of one rulebook, parsed; the root file first.
#[derive(Debug, Default)]
pub struct RulebookFiles {
    /// Each file with its syntax tree, in the order read.
    pub files: Vec<(FileId, Rulebook)>,
}

/// Reads and parses `path` and, when it parses cleanly, the files it includes.
/// Problems of every file are returned together.
pub fn read_rulebook(path: &Path, sources: &mut SourceMap) -> (RulebookFiles, Vec<Problem>) {
    let mut reader = Reader {
        sources,
        out: RulebookFiles::default(),
        problems: Vec::new(),
        stack: Vec::new(),
        seen: Vec::new(),
    };
    match reader.sources.read(path) {
        Ok(id) => reader.parse_file(id, path),
        Err(failure) => reader.problems.push(read_problem(path, failure)),
    }
    (reader.out, reader.problems)
}

/// The problem for a file that could not be read.
pub fn read_problem(path: &Path, failure: ReadFailure) -> Problem {
    ReadError::unreadable(path, failure, None).into()
}

struct Reader<'a> {
    sources: &'a mut SourceMap,
    out: RulebookFiles,
    problems: Vec<Problem>,
    /// Canonical paths of the files being read, outermost first.
    stack: Vec<PathBuf>,
    /// Canonical paths of every file read.
    seen: Vec<PathBuf>,
}

impl Reader<'_> {
    fn parse_file(&mut self, id: FileId, path: &Path) {
        let canonical = path.canonicalize().unwrap_or_else(|_| path.to_path_buf());
        self.stack.push(canonical.clone());
        self.seen.push(canonical);
        let text = self.sources.file(id).text.clone();
        let (book, problems) = parse_rulebook(id, &text);
        let clean = problems.is_empty();
        self.problems.extend(problems);
        let includes: Vec<Text> = book
            .items
            .iter()
            .filter_map(|item| match item {
                Item::Include(t) => Some(t.clone()),
                _ => None,
            })
            .collect();
        self.out.files.push((id, book));
        if clean {
            let folder = match path.parent() {
                Some(p) if !p.as_os_str().is_empty() => p.to_path_buf(),
                _ => PathBuf::from("."),
            };
            for include in includes {
                self.follow(&folder, &include);
            }
        }
        self.stack.pop();
    }

    fn follow(&mut self, folder: &Path, include: &Text) {
        let Some(relative) = safe_relative(&include.value) else {
            self.refuse(ReadError::IncludeOutside {
                include: include.value.clone(),
                at: include.span,
            });
            return;
        };
        let target = folder.join(relative);
        let (canonical, inside) = match (target.canonicalize(), folder.canonicalize()) {
            (Ok(t), Ok(f)) => (t.clone(), t.starts_with(f)),
            _ => {
                self.refuse(ReadError::IncludeMissing {
                    include: include.value.clone(),
                    at: include.span,
                });
                return;
            }
        };
        if !inside {
            self.refuse(ReadError::IncludeLeadsOutside {
                include: include.value.clone(),
                at: include.span,
            });
        } else if self.stack.contains(&canonical) {
            self.refuse(ReadError::IncludeCycle {
                include: include.value.clone(),
                at: include.span,
            });
        } else if !self.seen.contains(&canonical) {
            match self.sources.read(&target) {
                Ok(id) => self.parse_file(id, &target),
                Err(failure) => {
                    self.refuse(ReadError::unreadable(&target, failure, Some(include.span)))
                }
            }
        }
    }

    fn refuse(&mut self, error: ReadError) {
        self.problems.push(error.into());
    }
}

/// The path if it is relative and never climbs with `..`.
fn safe_relative(text: &str) -> Option<&Path> {
    let path = Path::new(text);
    let ok = !text.is_empty()
        && path
            .components()
            .all(|c| matches!(c, Component::Normal(_) | Component::CurDir));
    ok.then_some(path)
}

#[cfg(test)]
mod tests {
    use super::safe_relative;

    #[test]
    fn only_paths_below_the_folder_are_safe() {
        assert!(safe_relative("parts.rules").is_some());
        assert!(safe_relative("sub/parts.rules").is_some());
        assert!(safe_relative("../parts.rules").is_none());
        assert!(safe_relative("/etc/parts.rules").is_none());
        assert!(safe_relative("sub/../../x.rules").is_none());
    }
}

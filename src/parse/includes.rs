//! Reading a rulebook from disk: the root file and every file it includes. An include names
//! a file in the including file's own folder or below it; absolute paths, `..` and links that
//! lead outside are refused, and so is a file that includes itself. An include must name a
//! regular file: a FIFO, a device or a folder is refused without being opened, so reading
//! can never block, and a link that leads round in a loop is named as one.

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
            _ if is_link_loop(&target) => {
                self.refuse(ReadError::IncludeLinkLoop {
                    include: include.value.clone(),
                    at: include.span,
                });
                return;
            }
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
        } else if let Some(kind) = not_regular(&canonical) {
            self.refuse(ReadError::IncludeNotAFile {
                include: include.value.clone(),
                kind,
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

/// Most links followed one after another before a chain counts as a loop (as Linux does).
const MAX_LINK_HOPS: usize = 40;

/// Whether `path` is a symbolic link that, followed link by link, never reaches anything
/// but another link.
fn is_link_loop(path: &Path) -> bool {
    let mut current = path.to_path_buf();
    for _ in 0..MAX_LINK_HOPS {
        let Ok(next) = std::fs::read_link(&current) else {
            return false;
        };
        current = match current.parent() {
            Some(folder) => folder.join(next),
            None => next,
        };
    }
    std::fs::symlink_metadata(&current).is_ok_and(|m| m.file_type().is_symlink())
}

/// What `path` is when it is not a regular file: a folder, a FIFO, a device, a socket.
fn not_regular(path: &Path) -> Option<&'static str> {
    let kind = std::fs::metadata(path).ok()?.file_type();
    if kind.is_file() {
        return None;
    }
    if kind.is_dir() {
        return Some("a folder");
    }
    #[cfg(unix)]
    {
        use std::os::unix::fs::FileTypeExt;
        if kind.is_fifo() {
            return Some("a FIFO (named pipe)");
        }
        if kind.is_char_device() || kind.is_block_device() {
            return Some("a device");
        }
        if kind.is_socket() {
            return Some("a socket");
        }
    }
    Some("not a regular file")
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
    use super::{is_link_loop, not_regular, safe_relative};
    use std::path::Path;

    #[cfg(unix)]
    #[test]
    fn links_in_a_loop_are_told_from_missing_files() {
        let folder = std::env::temp_dir().join(format!("gonogo-link-loop-{}", std::process::id()));
        let _ = std::fs::remove_dir_all(&folder);
        std::fs::create_dir_all(&folder).unwrap_or_else(|e| panic!("{e}"));
        let (a, b) = (folder.join("a.rules"), folder.join("b.rules"));
        std::os::unix::fs::symlink(&b, &a).unwrap_or_else(|e| panic!("{e}"));
        std::os::unix::fs::symlink(&a, &b).unwrap_or_else(|e| panic!("{e}"));
        std::os::unix::fs::symlink("nowhere.rules", folder.join("dangling.rules"))
            .unwrap_or_else(|e| panic!("{e}"));
        assert!(is_link_loop(&a));
        assert!(!is_link_loop(&folder.join("dangling.rules")));
        assert!(!is_link_loop(&folder.join("absent.rules")));
        let _ = std::fs::remove_dir_all(&folder);
    }

    #[cfg(unix)]
    #[test]
    fn devices_and_folders_are_not_regular_files() {
        assert_eq!(not_regular(Path::new("/dev/null")), Some("a device"));
        assert_eq!(not_regular(Path::new("/")), Some("a folder"));
        assert_eq!(not_regular(Path::new(file!())), None);
    }

    #[test]
    fn only_paths_below_the_folder_are_safe() {
        assert!(safe_relative("parts.rules").is_some());
        assert!(safe_relative("sub/parts.rules").is_some());
        assert!(safe_relative("../parts.rules").is_none());
        assert!(safe_relative("/etc/parts.rules").is_none());
        assert!(safe_relative("sub/../../x.rules").is_none());
    }
}

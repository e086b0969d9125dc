//! The field: the declaration files a run names, with folders walked. A file named on the
//! command line is taken as it is; a folder is searched recursively for files whose name ends
//! in `.yaml` or `.yml` in any case (`B.YAML`, `c.Yml`), sorted by path so every machine
//! sees the same order. Each file is taken once however it is reached (by device and inode on
//! Unix, else by canonical path): a second name, a hard link or a link into a folder already
//! walked adds nothing, and a folder is never entered twice, so a link back into itself ends
//! the walk there. Inside a folder, a FIFO, a device or a socket is skipped with a note
//! instead of being opened, so a walk never blocks; so is a file that is not YAML.

use std::collections::{HashMap, HashSet};
use std::path::{Path, PathBuf};

use crate::diagnostic::Problem;
use crate::diagnostic::codes;
use crate::report::format::count;
use crate::source::{device_inode, is_stdin};

/// The declaration files of a run, and what the walk left out.
#[derive(Debug, Default)]
pub struct Field {
    /// Each declaration file once, in order: as named, folders' files sorted.
    pub files: Vec<PathBuf>,
    /// Names dropped because they reach a file already taken or a folder already walked.
    pub duplicates: usize,
    /// Files inside folders that are not YAML by their name.
    pub not_yaml: usize,
    /// Entries inside folders that are not regular files (FIFO, device, socket), with what
    /// they are.
    pub special: Vec<(PathBuf, &'static str)>,
}

impl Field {
    /// What the walk left out, one line each, for standard error; empty when nothing was.
    pub fn notes(&self) -> Vec<String> {
        let mut notes = Vec::new();
        if self.duplicates > 0 {
            notes.push(format!(
                "{} dropped: {} a declaration already taken or a folder already walked",
                count(self.duplicates, "name", "names"),
                if self.duplicates == 1 {
                    "it reaches"
                } else {
                    "each reaches"
                },
            ));
        }
        if self.not_yaml > 0 {
            notes.push(format!(
                "{} in the folders skipped: not `.yaml` or `.yml`",
                count(self.not_yaml, "file", "files"),
            ));
        }
        for (path, kind) in &self.special {
            notes.push(format!(
                "`{}` skipped: it is {kind}, not a file",
                path.display()
            ));
        }
        notes
    }
}

/// Walks the named paths into the field, or says which folder could not be read or held no
/// declaration.
pub fn walk(named: &[PathBuf]) -> Result<Field, Problem> {
    let mut walk = Walk::new(named);
    let files = walk.by_ref().collect::<Result<Vec<_>, _>>()?;
    let mut field = walk.into_field();
    field.files = files;
    Ok(field)
}

/// The field's files one at a time, in [`walk`]'s order, holding only the entries of the
/// folders being walked and the keys of the files taken: how `check` reads a field of any
/// size. A folder's entries are visited sorted by name, depth first, which is the order of
/// the full paths sorted. The walk ends after the first problem it gives.
pub struct Walk<'n> {
    named: std::slice::Iter<'n, PathBuf>,
    walker: Walker,
    /// Entries still to visit, the next one last.
    pending: Vec<Next>,
    /// The named folder being walked, which a problem inside it names.
    current: PathBuf,
    /// Files given so far.
    given: usize,
    stopped: bool,
}

/// An entry still to visit.
enum Next {
    /// A file (or a dangling link, whose read will say so).
    File(PathBuf),
    /// A folder to enter.
    Folder(PathBuf),
    /// The end of a named folder, and the files given and names dropped when it began.
    EndOfNamed(PathBuf, usize, usize),
}

impl<'n> Walk<'n> {
    /// A walk of the named files and folders, in their order.
    pub fn new(named: &'n [PathBuf]) -> Walk<'n> {
        Walk {
            named: named.iter(),
            walker: Walker::default(),
            pending: Vec::new(),
            current: PathBuf::new(),
            given: 0,
            stopped: false,
        }
    }

    /// What the walk found besides the files (the files themselves are not kept).
    pub fn into_field(self) -> Field {
        self.walker.field
    }

    /// What the walk has left out so far, one line each (see [`Field::notes`]).
    pub fn notes(&self) -> Vec<String> {
        self.walker.field.notes()
    }

    /// The next entry to visit, from the named paths when the current folder is done.
    fn next_entry(&mut self) -> Option<Next> {
        if let Some(next) = self.pending.pop() {
            return Some(next);
        }
        let path = self.named.next()?;
        if !path.is_dir() {
            return Some(Next::File(path.clone()));
        }
        self.current = path.clone();
        let end = Next::EndOfNamed(path.clone(), self.given, self.walker.field.duplicates);
        self.pending.push(end);
        Some(Next::Folder(path.clone()))
    }

    fn fail(&mut self, problem: Problem) -> Option<Result<PathBuf, Problem>> {
        self.stopped = true;
        Some(Err(problem))
    }
}

impl Iterator for Walk<'_> {
    type Item = Result<PathBuf, Problem>;

    fn next(&mut self) -> Option<Self::Item> {
        while !self.stopped {
            match self.next_entry()? {
                Next::File(path) => {
                    if self.walker.take(&path) {
                        self.given += 1;
                        return Some(Ok(path));
                    }
                }
                Next::Folder(folder) => {
                    let start = self.pending.len();
                    if let Err(e) = self.walker.enter(&folder, &mut self.pending) {
                        let problem = unreadable_folder(&self.current, &e);
                        return self.fail(problem);
                    }
                    self.pending[start..].reverse();
                }
                Next::EndOfNamed(folder, given, dropped) => {
                    if self.given == given && self.walker.field.duplicates == dropped {
                        return self.fail(empty_folder(&folder));
                    }
                }
            }
        }
        None
    }
}

#[derive(Default)]
struct Walker {
    field: Field,
    /// Files taken, by inode within each device (Unix): eight bytes a file, the one part
    /// of a walk that grows with the field.
    inodes: HashMap<u64, HashSet<u64>>,
    /// Files taken, by canonical path, where there is no inode to go by.
    canonical: HashSet<PathBuf>,
    /// Canonical paths of folders entered.
    folders: HashSet<PathBuf>,
}

impl Walker {
    /// Whether a file is new, not one already taken: the same file as
    /// [`crate::source::FileKey::same_file`] says, looked up in a set, so a field of a million
    /// files is walked in linear time. A file taken twice is counted as dropped.
    fn take(&mut self, path: &Path) -> bool {
        if is_stdin(path) {
            return true;
        }
        let Ok(metadata) = std::fs::metadata(path) else {
            return true;
        };
        let new = match device_inode(&metadata) {
            Some((device, inode)) => self.inodes.entry(device).or_default().insert(inode),
            None => match path.canonicalize() {
                Ok(canonical) => self.canonical.insert(canonical),
                Err(_) => true,
            },
        };
        if !new {
            self.field.duplicates += 1;
        }
        new
    }

    /// Adds the YAML files and the folders of `folder` to `pending`, sorted by name, unless
    /// the folder was entered before; counts what is left out.
    fn enter(&mut self, folder: &Path, pending: &mut Vec<Next>) -> std::io::Result<()> {
        let canonical = folder.canonicalize()?;
        if !self.folders.insert(canonical) {
            self.field.duplicates += 1;
            return Ok(());
        }
        let mut entries = Vec::new();
        for entry in std::fs::read_dir(folder)? {
            let path = entry?.path();
            match std::fs::metadata(&path) {
                Ok(m) if m.is_dir() => entries.push(Next::Folder(path)),
                _ if !is_yaml(&path) => self.field.not_yaml += 1,
                Ok(m) if !m.is_file() => self.field.special.push((path, kind_of(&m))),
                // a regular file, or a dangling link whose read will say so
                _ => entries.push(Next::File(path)),
            }
        }
        entries.sort_by(|a, b| name_of(a).cmp(&name_of(b)));
        pending.extend(entries);
        Ok(())
    }
}

/// The file or folder name of an entry, by which a folder's entries are sorted.
fn name_of(next: &Next) -> Option<&std::ffi::OsStr> {
    match next {
        Next::File(path) | Next::Folder(path) | Next::EndOfNamed(path, ..) => path.file_name(),
    }
}

/// Whether the name ends in `.yaml` or `.yml`, in any case.
fn is_yaml(path: &Path) -> bool {
    path.extension()
        .and_then(|e| e.to_str())
        .is_some_and(|e| e.eq_ignore_ascii_case("yaml") || e.eq_ignore_ascii_case("yml"))
}

/// What a thing that is neither a file nor a folder is.
fn kind_of(metadata: &std::fs::Metadata) -> &'static str {
    #[cfg(unix)]
    {
        use std::os::unix::fs::FileTypeExt;
        let kind = metadata.file_type();
        if kind.is_fifo() {
            return "a FIFO (named pipe)";
        }
        if kind.is_char_device() || kind.is_block_device() {
            return "a device";
        }
        if kind.is_socket() {
            return "a socket";
        }
    }
    let _ = metadata;
    "not a regular file"
}

fn unreadable_folder(path: &Path, e: &std::io::Error) -> Problem {
    Problem::unlocated(
        codes::read::IO,
        format!("cannot read the folder `{}`: {e}", path.display()),
    )
    .with_help("check the path and that the folder may be read")
}

fn empty_folder(path: &Path) -> Problem {
    Problem::unlocated(
        codes::check::EMPTY_FOLDER,
        format!(
            "`{}` holds no `.yaml` or `.yml` declaration",
            path.display()
        ),
    )
    .with_help("name the declaration files, or a folder that holds some")
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn extensions_match_in_any_case() {
        assert!(is_yaml(Path::new("a/B.YAML")));
        assert!(is_yaml(Path::new("c.Yml")));
        assert!(!is_yaml(Path::new("d.yaml.txt")));
        assert!(!is_yaml(Path::new("yaml")));
    }

    /// Every file under `dir`, collected whole and sorted as paths: the order the walk must
    /// give without collecting.
    fn sorted_whole(dir: &Path, out: &mut Vec<PathBuf>) {
        for entry in std::fs::read_dir(dir).into_iter().flatten().flatten() {
            let path = entry.path();
            if path.is_dir() {
                sorted_whole(&path, out);
            } else if is_yaml(&path) {
                out.push(path);
            }
        }
        out.sort();
    }

    #[test]
    fn the_lazy_walk_gives_the_files_in_sorted_path_order() {
        let root = std::env::temp_dir().join(format!("gonogo-walk-{}", std::process::id()));
        let _ = std::fs::remove_dir_all(&root);
        // '-' sorts before '.' and '/', so string order and path order differ here
        for file in [
            "a/x.yaml",
            "a-b/x.yaml",
            "a.yaml",
            "a/b/c.yml",
            "a/a.yaml",
            "B.YAML",
            "a-b.yaml",
        ] {
            let path = root.join(file);
            let _ = std::fs::create_dir_all(path.parent().unwrap_or(&root));
            let _ = std::fs::write(&path, "engine: x\n");
        }
        let mut expected = Vec::new();
        sorted_whole(&root, &mut expected);
        let walked = walk(std::slice::from_ref(&root)).map(|f| f.files);
        let _ = std::fs::remove_dir_all(&root);
        assert_eq!(walked.ok(), Some(expected));
    }

    #[test]
    fn notes_count_in_words() {
        let field = Field {
            duplicates: 1,
            not_yaml: 2,
            ..Field::default()
        };
        assert_eq!(
            field.notes(),
            [
                "1 name dropped: it reaches a declaration already taken or a folder already walked",
                "2 files in the folders skipped: not `.yaml` or `.yml`",
            ]
        );
    }
}

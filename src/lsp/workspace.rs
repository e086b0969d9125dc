//! The documents an editor has open and the rulebook each belongs to. An open file is read as
//! the editor holds it, saved or not; a file without a `series` line is a part of a rulebook,
//! so the rulebook that includes it (in its folder or the two above) is analysed instead,
//! and its problems land in the file that has them.

use std::collections::HashMap;
use std::path::{Path, PathBuf};

use crate::commands::{LoadedRulebook, lint_rulebook_in};
use crate::parse::ast::Item;
use crate::parse::includes::read_rulebook;
use crate::parse::parse_rulebook;
use crate::source::{FileId, SourceMap, canonical_or_same};

use super::index::Index;

/// Folders above a part's own that are searched for the rulebook including it.
const FOLDERS_UP: usize = 2;

/// The open documents, by canonical path.
#[derive(Debug, Default)]
pub struct Workspace {
    open: HashMap<PathBuf, String>,
}

/// One rulebook read through the open documents, and the index of its names.
pub struct Analysis {
    /// Everything the lint command finds, with the files read and their trees.
    pub loaded: LoadedRulebook,
    /// Every name where it is written.
    pub index: Index,
}

impl Analysis {
    /// The id of the file at `path` among those read.
    pub fn file_id(&self, path: &Path) -> Option<FileId> {
        let key = canonical_or_same(path);
        let sources = &self.loaded.sources;
        (0..self.loaded.files.files.len())
            .filter_map(|i| self.loaded.files.files.get(i).map(|(id, _)| *id))
            .find(|id| canonical_or_same(&sources.file(*id).path) == key)
    }
}

impl Workspace {
    /// Opens or replaces a document's text.
    pub fn set(&mut self, path: &Path, text: String) {
        self.open.insert(canonical_or_same(path), text);
    }

    /// Closes a document: the file on disk counts again.
    pub fn close(&mut self, path: &Path) {
        self.open.remove(&canonical_or_same(path));
    }

    /// The open text of a document.
    pub fn text(&self, path: &Path) -> Option<&str> {
        self.open.get(&canonical_or_same(path)).map(String::as_str)
    }

    fn sources(&self) -> SourceMap {
        SourceMap::with_open(
            self.open
                .iter()
                .map(|(p, t)| (p.clone(), t.clone()))
                .collect(),
        )
    }

    /// The rulebook `path` belongs to, read, checked and indexed.
    pub fn analyse(&self, path: &Path) -> Analysis {
        let root = self.root_of(path);
        let loaded = lint_rulebook_in(&root, self.sources());
        let index = Index::build(&loaded.files);
        Analysis { loaded, index }
    }

    /// The file itself when it has a `series` line (or nothing includes it), else the first
    /// `.rules` file nearby that includes it.
    fn root_of(&self, path: &Path) -> PathBuf {
        if self.has_series(path) {
            return path.to_path_buf();
        }
        let key = canonical_or_same(path);
        let mut folder = path.parent().map(Path::to_path_buf);
        for _ in 0..=FOLDERS_UP {
            let Some(dir) = folder else { break };
            for candidate in rules_files(&dir) {
                if canonical_or_same(&candidate) != key && self.includes(&candidate, &key) {
                    return candidate;
                }
            }
            folder = dir.parent().map(Path::to_path_buf);
        }
        path.to_path_buf()
    }

    fn has_series(&self, path: &Path) -> bool {
        let text = match self.text(path) {
            Some(t) => t.to_string(),
            None => std::fs::read_to_string(path).unwrap_or_default(),
        };
        let (book, _) = parse_rulebook(0, &text);
        book.items.iter().any(|i| matches!(i, Item::Series(_)))
    }

    fn includes(&self, root: &Path, target: &Path) -> bool {
        let mut sources = self.sources();
        let (files, _) = read_rulebook(root, &mut sources);
        files
            .files
            .iter()
            .any(|(id, _)| canonical_or_same(&sources.file(*id).path) == target)
    }
}

/// The `.rules` files of a folder, sorted by name.
fn rules_files(folder: &Path) -> Vec<PathBuf> {
    let Ok(entries) = std::fs::read_dir(folder) else {
        return Vec::new();
    };
    let mut found: Vec<PathBuf> = entries
        .filter_map(|e| e.ok().map(|e| e.path()))
        .filter(|p| p.extension().is_some_and(|e| e == "rules") && p.is_file())
        .collect();
    found.sort();
    found
}

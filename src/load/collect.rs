//! The side channel between the serde visitors and the loader.
//!
//! serde_yaml gives a line and column only to an error that a visitor returns, and reading
//! stops there. So a visitor that meets a problem records it here as data, with the node's
//! [`DeclPath`], and fails; the loader takes the record, locates it with serde_yaml's mark,
//! marks the node to be skipped and reads the file again. A problem that shows only once the
//! whole file is read (an instrument listed after its use) is *deferred*: on the next reading
//! the visitor at that node fails with it, so it too gets its line and column.

use std::cell::{Cell, RefCell};
use std::collections::{HashMap, HashSet};
use std::fmt::Display;

use serde::Deserialize;
use serde::de::{self, Deserializer, IgnoredAny};

use super::error::LoadError;
use super::path::DeclPath;

/// What made the last reading fail, as the innermost visitor saw it.
#[derive(Debug)]
pub struct Pending {
    /// The node.
    pub path: DeclPath,
    /// The problem, or `None` when serde_yaml refused the node itself (a syntax error or a
    /// value of the wrong shape).
    pub error: Option<LoadError>,
}

/// The record kept across the readings of one file.
#[derive(Debug, Default)]
pub struct Collector {
    /// Nodes read over without looking, each already reported.
    skip: HashSet<DeclPath>,
    /// Problems to raise at their node on the next reading.
    deferred: HashMap<DeclPath, LoadError>,
    /// The failure of the current reading.
    pending: RefCell<Option<Pending>>,
    /// How many nodes this reading skipped so far: a parent whose count grew while it was
    /// read is incomplete and is not used.
    skipped: Cell<usize>,
}

impl Collector {
    /// Readies the record for another reading.
    pub fn begin(&mut self) {
        self.pending.replace(None);
        self.skipped.set(0);
    }

    /// Marks `path` to be skipped from now on; false when it already was (no progress).
    pub fn skip(&mut self, path: DeclPath) -> bool {
        self.skip.insert(path)
    }

    /// Whether the node at `path` is to be read over.
    pub fn skips(&self, path: &DeclPath) -> bool {
        self.skip.contains(path)
    }

    /// Whether a problem is already deferred to `path`.
    pub fn is_deferred(&self, path: &DeclPath) -> bool {
        self.deferred.contains_key(path)
    }

    /// Raises `error` at `path` on the next reading.
    pub fn defer(&mut self, path: DeclPath, error: LoadError) {
        self.deferred.insert(path, error);
    }

    /// The failure of the reading just ended.
    pub fn take_pending(&self) -> Option<Pending> {
        self.pending.take()
    }

    /// A problem deferred to `path`, if any.
    pub fn deferred(&self, path: &DeclPath) -> Option<LoadError> {
        self.deferred.get(path).cloned()
    }

    /// The count of nodes skipped so far in this reading.
    pub fn skipped(&self) -> usize {
        self.skipped.get()
    }

    /// Counts a node left out of this reading (skipped, or not usable).
    pub fn note_skipped(&self) {
        self.skipped.set(self.skipped.get() + 1);
    }

    /// Records `error` at `path` and gives the serde error that stops the reading there.
    pub fn refuse<E: de::Error>(&self, path: &DeclPath, error: LoadError) -> E {
        let code = error.code();
        self.record(path, Some(error));
        E::custom(code)
    }

    /// Records serde_yaml's own refusal at the innermost node that saw it, and passes it on.
    pub fn foreign<E: Display>(&self, path: &DeclPath, error: E) -> E {
        self.record(path, None);
        error
    }

    fn record(&self, path: &DeclPath, error: Option<LoadError>) {
        let mut pending = self.pending.borrow_mut();
        if pending.is_none() {
            *pending = Some(Pending {
                path: path.clone(),
                error,
            });
        }
    }

    /// Reads the node at `path` with `read`, or reads over it when it is to be skipped
    /// (`None`). serde_yaml's own errors are recorded at this node.
    pub fn guard<'de, D, T>(
        &self,
        path: &DeclPath,
        d: D,
        read: impl FnOnce(D) -> Result<T, D::Error>,
    ) -> Result<Option<T>, D::Error>
    where
        D: Deserializer<'de>,
    {
        if self.skip.contains(path) {
            self.note_skipped();
            IgnoredAny::deserialize(d)?;
            return Ok(None);
        }
        read(d).map(Some).map_err(|e| self.foreign(path, e))
    }
}

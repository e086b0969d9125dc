//! The season log: one SQLite file that keeps every inspection recorded with
//! `check --record`, with the exact bytes of each declaration and rulebook file it was made
//! from, so any verdict can be shown and produced again on appeal.
//!
//! One job per file: [`schema`] opens a log and brings its tables to the current version (and
//! refuses files that are not ours), [`chain`] the canonical encoding and hash of an entry,
//! [`record`] appends one run's inspections in one transaction, [`query`] reads them back,
//! [`seals`] compares the seals and sealed measurements of an engine's inspections,
//! [`verify`] re-runs them and checks the chain, [`show`] renders listings, histories and
//! verifications, [`export`] writes the stored files back out,
//! [`clock`] the time an entry is stamped with, [`hook`] what `check --record` calls.
//!
//! Every reader and writer of the log goes through [`Log`]: it is the seam a shared server
//! database would sit behind (DEVELOPERS.md, "The season log").

pub mod chain;
pub mod clock;
pub mod export;
pub mod hook;
pub mod query;
pub mod record;
pub mod schema;
pub mod seals;
pub mod show;
pub mod verify;

pub use schema::Log;

use crate::diagnostic::{Problem, codes};
use std::path::Path;

/// `L04` for a run whose staged inspections could not be read back from their spool.
pub fn spool_unreadable(path: &Path, error: &std::io::Error) -> Problem {
    Problem::unlocated(
        codes::log::FAILED,
        format!(
            "the inspections staged for the season log `{}` could not be read back: {error}; \
             nothing was recorded",
            path.display()
        ),
    )
    .with_help("check that the temporary folder ($TMPDIR) has room, and run the check again")
}

/// The problem for an SQLite error while using the log at `path` (`L04`).
pub fn failed(path: &Path, error: &rusqlite::Error) -> Problem {
    Problem::unlocated(
        codes::log::FAILED,
        format!(
            "the season log `{}` could not be used: {error}",
            path.display()
        ),
    )
    .with_help("check the file can be read and written, and that the disk is not full")
}

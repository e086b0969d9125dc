//! Opening a season log: the file is checked to be an SQLite database of ours before it is
//! touched, brought to the current schema version (`PRAGMA user_version`) by the migrations
//! in order, and set to WAL with a busy timeout so that several processes may record at once.
//!
//! A file that is not SQLite, an SQLite database of another program, and a log from a newer
//! gonogo are refused and left exactly as they were.

use std::path::{Path, PathBuf};
use std::time::Duration;

use rusqlite::{Connection, OpenFlags};

use crate::diagnostic::{Problem, codes};

/// The schema version this gonogo writes and reads.
pub const SCHEMA_VERSION: i64 = 1;

/// `PRAGMA application_id` of a gonogo season log: the bytes `g n g L`.
pub const APPLICATION_ID: i64 = 0x676E_674C;

/// How long a writer waits for another process's transaction to end.
pub const BUSY_TIMEOUT: Duration = Duration::from_secs(30);

/// The first 16 bytes of every SQLite database file (SQLite file format, section 1.3).
const SQLITE_HEADER: &[u8; 16] = b"SQLite format 3\0";

/// Each migration brings the schema from version `index` to `index + 1`.
const MIGRATIONS: &[&str] = &[
    // 0 -> 1: blobs, rulebooks, inspections; append-only by triggers.
    "
    CREATE TABLE blob (
        hash TEXT PRIMARY KEY NOT NULL,
        bytes BLOB NOT NULL
    ) WITHOUT ROWID;
    CREATE TABLE rulebook_file (
        rulebook TEXT NOT NULL,
        position INTEGER NOT NULL,
        name TEXT NOT NULL,
        blob TEXT NOT NULL REFERENCES blob(hash),
        PRIMARY KEY (rulebook, position)
    ) WITHOUT ROWID;
    CREATE TABLE inspection (
        seq INTEGER PRIMARY KEY,
        engine TEXT,
        car TEXT,
        class TEXT NOT NULL,
        event TEXT,
        date TEXT,
        measured_by TEXT,
        reason TEXT,
        reference TEXT,
        scope TEXT,
        seals_found TEXT NOT NULL,
        seals_applied TEXT NOT NULL,
        file TEXT NOT NULL,
        class_given TEXT,
        role_given TEXT,
        gonogo_version TEXT NOT NULL,
        decision TEXT NOT NULL,
        result TEXT NOT NULL,
        report TEXT NOT NULL,
        recorded_at INTEGER NOT NULL,
        rulebook TEXT NOT NULL,
        declaration TEXT NOT NULL REFERENCES blob(hash),
        previous_hash TEXT NOT NULL,
        entry_hash TEXT NOT NULL UNIQUE
    );
    CREATE INDEX inspection_engine ON inspection (engine, seq);
    CREATE TRIGGER inspection_no_update BEFORE UPDATE ON inspection
        BEGIN SELECT RAISE(ABORT, 'the season log is append-only'); END;
    CREATE TRIGGER inspection_no_delete BEFORE DELETE ON inspection
        BEGIN SELECT RAISE(ABORT, 'the season log is append-only'); END;
    CREATE TRIGGER blob_no_update BEFORE UPDATE ON blob
        BEGIN SELECT RAISE(ABORT, 'the season log is append-only'); END;
    CREATE TRIGGER blob_no_delete BEFORE DELETE ON blob
        BEGIN SELECT RAISE(ABORT, 'the season log is append-only'); END;
    CREATE TRIGGER rulebook_file_no_update BEFORE UPDATE ON rulebook_file
        BEGIN SELECT RAISE(ABORT, 'the season log is append-only'); END;
    CREATE TRIGGER rulebook_file_no_delete BEFORE DELETE ON rulebook_file
        BEGIN SELECT RAISE(ABORT, 'the season log is append-only'); END;
    ",
];

/// An open season log.
pub struct Log {
    /// The connection.
    pub(crate) db: Connection,
    /// Where it is, for messages.
    pub(crate) path: PathBuf,
}

/// Whether opening may create the file.
#[derive(Clone, Copy, Debug, PartialEq, Eq)]
pub enum Mode {
    /// `check --record`: a missing file becomes a new log.
    Create,
    /// Reading commands: a missing file is refused (`L05 log-missing`).
    Existing,
}

impl Log {
    /// Opens the log at `path` (see the module documentation), migrating an older schema.
    pub fn open(path: &Path, mode: Mode) -> Result<Log, Problem> {
        let exists = path.exists();
        if !exists && mode == Mode::Existing {
            return Err(missing(path));
        }
        if exists {
            refuse_non_sqlite(path)?;
        }
        let flags = if exists {
            OpenFlags::SQLITE_OPEN_READ_WRITE | OpenFlags::SQLITE_OPEN_NO_MUTEX
        } else {
            OpenFlags::SQLITE_OPEN_READ_WRITE
                | OpenFlags::SQLITE_OPEN_CREATE
                | OpenFlags::SQLITE_OPEN_NO_MUTEX
        };
        let fail = |e: rusqlite::Error| super::failed(path, &e);
        let db = Connection::open_with_flags(path, flags).map_err(fail)?;
        db.busy_timeout(BUSY_TIMEOUT).map_err(fail)?;
        let log = Log {
            db,
            path: path.to_path_buf(),
        };
        log.refuse_foreign()?;
        log.db
            .pragma_update(None, "journal_mode", "WAL")
            .map_err(fail)?;
        log.migrate()?;
        Ok(log)
    }

    /// The schema version written in the file.
    pub fn version(&self) -> Result<i64, Problem> {
        self.db
            .pragma_query_value(None, "user_version", |row| row.get(0))
            .map_err(|e| self.failed(&e))
    }

    /// The problem for an SQLite error on this log.
    pub(crate) fn failed(&self, error: &rusqlite::Error) -> Problem {
        super::failed(&self.path, error)
    }

    /// Refuses an SQLite database that another program made: one with another application
    /// id, or with tables but no id of ours.
    fn refuse_foreign(&self) -> Result<(), Problem> {
        let id: i64 = self
            .db
            .pragma_query_value(None, "application_id", |row| row.get(0))
            .map_err(|e| not_sqlite(&self.path, &e.to_string()))?;
        let tables: i64 = self
            .db
            .query_row("SELECT count(*) FROM sqlite_schema", [], |row| row.get(0))
            .map_err(|e| self.failed(&e))?;
        if id == APPLICATION_ID || (id == 0 && tables == 0) {
            return Ok(());
        }
        Err(Problem::unlocated(
            codes::log::FOREIGN,
            format!(
                "`{}` is an SQLite database of another program, not a gonogo season log",
                self.path.display()
            ),
        )
        .with_help("name a new file or an existing season log; this file was left as it was"))
    }

    /// Applies every migration from the file's version to [`SCHEMA_VERSION`], in one
    /// transaction; refuses a newer version.
    fn migrate(&self) -> Result<(), Problem> {
        let version = self.version()?;
        if version > SCHEMA_VERSION {
            return Err(Problem::unlocated(
                codes::log::NEWER,
                format!(
                    "the season log `{}` has schema version {version}, written by a newer \
                     gonogo; this gonogo reads versions up to {SCHEMA_VERSION}",
                    self.path.display()
                ),
            )
            .with_help(
                "use the gonogo that wrote the log, or a newer one; the file was left as it was",
            ));
        }
        if version == SCHEMA_VERSION {
            return Ok(());
        }
        let fail = |e: rusqlite::Error| self.failed(&e);
        self.db.execute_batch("BEGIN IMMEDIATE").map_err(fail)?;
        let result = self.apply_from(version);
        let end = if result.is_ok() { "COMMIT" } else { "ROLLBACK" };
        self.db.execute_batch(end).map_err(fail)?;
        result
    }

    /// The migrations after `version`, inside the caller's transaction. The version is read
    /// again, since another process may have migrated the file meanwhile.
    fn apply_from(&self, _version: i64) -> Result<(), Problem> {
        let fail = |e: rusqlite::Error| self.failed(&e);
        let version = self.version()?;
        for (from, sql) in MIGRATIONS.iter().enumerate().skip(version.max(0) as usize) {
            self.db.execute_batch(sql).map_err(fail)?;
            let to = from as i64 + 1;
            self.db
                .pragma_update(None, "user_version", to)
                .map_err(fail)?;
        }
        self.db
            .pragma_update(None, "application_id", APPLICATION_ID)
            .map_err(fail)?;
        Ok(())
    }
}

/// Refuses a file whose first bytes are not SQLite's header, before SQLite opens it. An
/// empty file is a new log.
fn refuse_non_sqlite(path: &Path) -> Result<(), Problem> {
    use std::io::Read;
    let mut head = Vec::with_capacity(16);
    let read = std::fs::File::open(path).and_then(|f| f.take(16).read_to_end(&mut head));
    if let Err(e) = read {
        return Err(Problem::unlocated(
            codes::log::FAILED,
            format!("the season log `{}` could not be read: {e}", path.display()),
        )
        .with_help("check the path names a readable file"));
    }
    if head.is_empty() || head.as_slice() == SQLITE_HEADER {
        return Ok(());
    }
    Err(not_sqlite(path, "it does not begin with SQLite's header"))
}

fn not_sqlite(path: &Path, why: &str) -> Problem {
    Problem::unlocated(
        codes::log::NOT_SQLITE,
        format!("`{}` is not a season log: {why}", path.display()),
    )
    .with_help("name a new file or an existing season log; this file was left as it was")
}

fn missing(path: &Path) -> Problem {
    Problem::unlocated(
        codes::log::MISSING,
        format!("there is no season log at `{}`", path.display()),
    )
    .with_help("record one first with `gonogo check --record FILE …`")
}

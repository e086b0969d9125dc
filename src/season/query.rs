//! Reading inspections back: all of them in order, a filtered listing, one engine's history,
//! and the stored bytes of declarations and rulebooks.

use rusqlite::{Row, params_from_iter};

use super::chain::Entry;
use super::schema::Log;
use crate::diagnostic::{Problem, codes};

/// One stored inspection: its place in the log, the entry and the hash stored with it.
#[derive(Clone, Debug)]
pub struct Stored {
    /// The sequence number, from 1.
    pub seq: i64,
    /// The entry.
    pub entry: Entry,
    /// The hash stored beside it (verify recomputes it).
    pub entry_hash: String,
}

/// Which inspections a listing shows; every field narrows it.
#[derive(Clone, Debug, Default)]
pub struct Filter {
    /// The engine's identifier.
    pub engine: Option<String>,
    /// The car number.
    pub car: Option<String>,
    /// The class.
    pub class: Option<String>,
    /// The event, exactly as declared.
    pub event: Option<String>,
    /// The first date, `YYYY-MM-DD`, inclusive.
    pub from: Option<String>,
    /// The last date, inclusive.
    pub to: Option<String>,
    /// The result: `legal`, `illegal` or `not-all-clear`.
    pub result: Option<String>,
}

const COLUMNS: &str = "seq, engine, car, class, event, date, measured_by, reason, reference, \
    scope, seals_found, seals_applied, file, class_given, role_given, gonogo_version, \
    decision, result, report, recorded_at, rulebook, declaration, previous_hash, entry_hash";

impl Filter {
    /// Refuses a date bound that is not `YYYY-MM-DD`.
    pub fn validate(&self) -> Result<(), Problem> {
        for bound in [&self.from, &self.to].into_iter().flatten() {
            let ok = bound.len() == 10
                && bound.bytes().enumerate().all(|(i, b)| {
                    if i == 4 || i == 7 {
                        b == b'-'
                    } else {
                        b.is_ascii_digit()
                    }
                });
            if !ok {
                return Err(Problem::unlocated(
                    codes::log::BAD_DATE_FILTER,
                    format!("`{bound}` is not a date"),
                )
                .with_help("write dates as YYYY-MM-DD, e.g. 2027-05-22"));
            }
        }
        Ok(())
    }

    fn clauses(&self) -> (String, Vec<String>) {
        let mut wheres = Vec::new();
        let mut values = Vec::new();
        let mut add = |clause: &str, value: &Option<String>| {
            if let Some(v) = value {
                values.push(v.clone());
                wheres.push(format!("{clause} ?{}", values.len()));
            }
        };
        add("engine =", &self.engine);
        add("car =", &self.car);
        add("class =", &self.class);
        add("event =", &self.event);
        add("date >=", &self.from);
        add("date <=", &self.to);
        add("result =", &self.result);
        let sql = if wheres.is_empty() {
            String::new()
        } else {
            format!("WHERE {}", wheres.join(" AND "))
        };
        (sql, values)
    }
}

impl Log {
    /// The inspections the filter lets through, in the order recorded.
    pub fn list(&self, filter: &Filter) -> Result<Vec<Stored>, Problem> {
        filter.validate()?;
        let (clause, values) = filter.clauses();
        let sql = format!("SELECT {COLUMNS} FROM inspection {clause} ORDER BY seq");
        self.select(&sql, values)
    }

    /// Every inspection of one engine, in the order recorded.
    pub fn history(&self, engine: &str) -> Result<Vec<Stored>, Problem> {
        let sql = format!("SELECT {COLUMNS} FROM inspection WHERE engine = ?1 ORDER BY seq");
        self.select(&sql, vec![engine.to_string()])
    }

    /// The stored bytes under a hash.
    pub fn blob(&self, hash: &str) -> Result<Vec<u8>, Problem> {
        self.db
            .query_row("SELECT bytes FROM blob WHERE hash = ?1", [hash], |r| {
                r.get(0)
            })
            .map_err(|e| self.failed(&e))
    }

    /// Each stored blob's hash and bytes, for a check of the content addresses.
    pub fn blobs(&self) -> Result<Vec<(String, Vec<u8>)>, Problem> {
        let fail = |e: rusqlite::Error| self.failed(&e);
        let mut statement = self
            .db
            .prepare("SELECT hash, bytes FROM blob ORDER BY hash")
            .map_err(fail)?;
        let rows = statement
            .query_map([], |r| Ok((r.get(0)?, r.get(1)?)))
            .map_err(fail)?;
        rows.collect::<rusqlite::Result<_>>().map_err(fail)
    }

    /// The files of a recorded rulebook, in reading order: name (empty for the root) and
    /// bytes.
    pub fn rulebook_files(&self, fingerprint: &str) -> Result<Vec<(String, Vec<u8>)>, Problem> {
        let fail = |e: rusqlite::Error| self.failed(&e);
        let mut statement = self
            .db
            .prepare(
                "SELECT f.name, b.bytes FROM rulebook_file f JOIN blob b ON b.hash = f.blob \
                 WHERE f.rulebook = ?1 ORDER BY f.position",
            )
            .map_err(fail)?;
        let rows = statement
            .query_map([fingerprint], |r| Ok((r.get(0)?, r.get(1)?)))
            .map_err(fail)?;
        rows.collect::<rusqlite::Result<_>>().map_err(fail)
    }

    /// Every recorded rulebook's fingerprint, in the order first recorded.
    pub fn rulebooks(&self) -> Result<Vec<String>, Problem> {
        let fail = |e: rusqlite::Error| self.failed(&e);
        let mut statement = self
            .db
            .prepare("SELECT rulebook FROM inspection GROUP BY rulebook ORDER BY min(seq)")
            .map_err(fail)?;
        let rows = statement.query_map([], |r| r.get(0)).map_err(fail)?;
        rows.collect::<rusqlite::Result<_>>().map_err(fail)
    }

    fn select(&self, sql: &str, values: Vec<String>) -> Result<Vec<Stored>, Problem> {
        let fail = |e: rusqlite::Error| self.failed(&e);
        let mut statement = self.db.prepare(sql).map_err(fail)?;
        let rows = statement
            .query_map(params_from_iter(values), stored)
            .map_err(fail)?;
        rows.collect::<rusqlite::Result<_>>().map_err(fail)
    }
}

fn stored(row: &Row) -> rusqlite::Result<Stored> {
    Ok(Stored {
        seq: row.get(0)?,
        entry: Entry {
            engine: row.get(1)?,
            car: row.get(2)?,
            class: row.get(3)?,
            event: row.get(4)?,
            date: row.get(5)?,
            measured_by: row.get(6)?,
            reason: row.get(7)?,
            reference: row.get(8)?,
            scope: row.get(9)?,
            seals_found: row.get(10)?,
            seals_applied: row.get(11)?,
            file: row.get(12)?,
            class_given: row.get(13)?,
            role_given: row.get(14)?,
            gonogo_version: row.get(15)?,
            decision: row.get(16)?,
            result: row.get(17)?,
            report: row.get(18)?,
            recorded_at: row.get(19)?,
            rulebook: row.get(20)?,
            declaration: row.get(21)?,
            previous_hash: row.get(22)?,
        },
        entry_hash: row.get(23)?,
    })
}

impl Log {
    /// The latest inspection of each engine, in the order recorded; an inspection whose
    /// declaration names no engine counts as an engine of its own (`impact --log`'s field).
    pub fn latest_of_each_engine(&self) -> Result<Vec<Stored>, Problem> {
        let sql = format!(
            "SELECT {COLUMNS} FROM inspection WHERE seq IN (SELECT max(seq) FROM inspection \
             GROUP BY coalesce(engine, 'seq ' || seq)) ORDER BY seq"
        );
        self.select(&sql, Vec::new())
    }
}

//! Recording one run of `check`: every engine checked becomes one inspection, all in one
//! transaction (`BEGIN IMMEDIATE`, so the chain's last hash is read under the write lock and
//! two processes recording at once each extend the chain in turn). The declaration's and the
//! rulebook's files are stored once each, content-addressed by SHA-256.

use rusqlite::{OptionalExtension, params};

use super::chain::{Entry, GENESIS};
use super::schema::Log;
use crate::diagnostic::Problem;
use crate::digest::sha256_hex;
use crate::load::inspection::{Inspection, Reason, Seal};

/// A rulebook as recorded: its fingerprint and each file, in reading order, with its name
/// (empty for the root file).
#[derive(Default)]
pub struct RulebookBytes {
    /// [`crate::digest::rulebook_sha256`].
    pub fingerprint: String,
    /// Name and bytes of each file.
    pub files: Vec<(String, Vec<u8>)>,
}

/// One engine of the run, checked: all the log keeps of it, owned, so a run can gather its
/// engines while each one's declaration and report are let go.
pub struct Inspected {
    /// The declaration's exact text, as checked.
    pub text: std::sync::Arc<str>,
    /// Its file name as given.
    pub file: String,
    /// The identity it declares.
    pub identity: crate::load::declaration::Identity,
    /// Its inspection block.
    pub inspection: Inspection,
    /// The class it was checked against.
    pub class: String,
    /// The decision rule applied, in words.
    pub decision: String,
    /// `legal`, `illegal` or `not-all-clear`.
    pub result: String,
    /// The engine's JSON report.
    pub report: String,
}

/// What the run gave on the command line that changes a call: `--class` and `--as`.
#[derive(Clone, Debug, Default)]
pub struct Given {
    /// `--class`.
    pub class: Option<String>,
    /// `--as`, as its word (`inspector`, `builder`, `simple`).
    pub role: Option<String>,
}

/// Appends one inspection per engine, in one transaction; the sequence numbers given.
pub fn record(
    log: &mut Log,
    rulebook: &RulebookBytes,
    engines: &[Inspected],
    given: &Given,
) -> Result<Vec<i64>, Problem> {
    let staged = engines
        .iter()
        .map(|e| Ok((staged_entry(e, given), e.text.as_bytes().to_vec())));
    let (first, last) = record_staged(log, rulebook, staged)?;
    Ok(first
        .map(|a| (a..=last.unwrap_or(a)).collect())
        .unwrap_or_default())
}

/// Appends staged entries (each with its declaration's bytes) in one transaction, giving each
/// its time, rulebook and place in the chain; the first and last sequence numbers given.
/// Nothing is recorded when a staged entry cannot be read back.
pub fn record_staged(
    log: &mut Log,
    rulebook: &RulebookBytes,
    staged: impl Iterator<Item = std::io::Result<(Entry, Vec<u8>)>>,
) -> Result<(Option<i64>, Option<i64>), Problem> {
    let path = log.path.clone();
    let fail = |e: rusqlite::Error| super::failed(&path, &e);
    let recorded_at = super::clock::now();
    let tx = log
        .db
        .transaction_with_behavior(rusqlite::TransactionBehavior::Immediate)
        .map_err(fail)?;
    store_rulebook(&tx, rulebook).map_err(fail)?;
    let mut previous = last_hash(&tx).map_err(fail)?;
    let (mut first, mut last) = (None, None);
    for next in staged {
        let (mut entry, text) = next.map_err(|e| super::spool_unreadable(&path, &e))?;
        entry.declaration = store_blob(&tx, &text).map_err(fail)?;
        entry.recorded_at = recorded_at;
        entry.rulebook = rulebook.fingerprint.clone();
        entry.previous_hash = previous;
        let hash = entry.hash();
        insert(&tx, &entry, &hash).map_err(fail)?;
        let seq = tx.last_insert_rowid();
        first.get_or_insert(seq);
        last = Some(seq);
        previous = hash;
    }
    tx.commit().map_err(fail)?;
    Ok((first, last))
}

/// The entries of a run, staged one by one as its engines are checked and read back when it
/// records them: in memory, then an unlinked temporary file, so a field of any size is
/// recorded without holding its reports.
pub struct Staging {
    spool: tempfile::SpooledTempFile,
    given: Given,
    count: usize,
}

impl Staging {
    /// An empty staging for a run given `given` on its command line.
    pub fn new(given: Given) -> Staging {
        Staging {
            spool: tempfile::SpooledTempFile::new(1 << 20),
            given,
            count: 0,
        }
    }

    /// Stages one engine: its entry (as JSON) and its declaration's bytes, each framed by its
    /// length.
    pub fn add(&mut self, engine: &Inspected) -> std::io::Result<()> {
        let entry = serde_json::to_vec(&staged_entry(engine, &self.given))?;
        crate::spool::write_part(&mut self.spool, &entry)?;
        crate::spool::write_part(&mut self.spool, engine.text.as_bytes())?;
        self.count += 1;
        Ok(())
    }

    /// Every staged entry with its declaration's bytes, from the first.
    pub fn entries(
        &mut self,
    ) -> std::io::Result<impl Iterator<Item = std::io::Result<(Entry, Vec<u8>)>> + '_> {
        use std::io::Seek;
        self.spool.rewind()?;
        let spool = &mut self.spool;
        Ok((0..self.count).map(move |_| {
            let entry = serde_json::from_slice(&crate::spool::read_part(spool)?)?;
            Ok((entry, crate::spool::read_part(spool)?))
        }))
    }
}

/// An engine's entry as far as it is known before it is recorded: the time, the rulebook and
/// the chain's hashes are set by [`record_staged`].
fn staged_entry(engine: &Inspected, given: &Given) -> Entry {
    entry_of(
        engine,
        given,
        &RulebookBytes::default(),
        String::new(),
        0,
        String::new(),
    )
}

fn entry_of(
    engine: &Inspected,
    given: &Given,
    rulebook: &RulebookBytes,
    declaration: String,
    recorded_at: i64,
    previous_hash: String,
) -> Entry {
    let identity = &engine.identity;
    let inspection = &engine.inspection;
    Entry {
        engine: identity.engine.clone(),
        car: identity.car.clone(),
        class: engine.class.clone(),
        event: identity.event.clone(),
        date: identity.date.map(|d| d.to_string()),
        measured_by: identity.measured_by.clone(),
        reason: inspection.reason.as_ref().map(reason_words),
        reference: inspection.reference.clone(),
        scope: inspection.scope.as_ref().map(|s| s.join(", ")),
        seals_found: seals_json(&inspection.seals_found),
        seals_applied: seals_json(&inspection.seals_applied),
        file: engine.file.clone(),
        class_given: given.class.clone(),
        role_given: given.role.clone(),
        gonogo_version: env!("CARGO_PKG_VERSION").to_string(),
        decision: engine.decision.clone(),
        result: engine.result.clone(),
        report: engine.report.clone(),
        recorded_at,
        rulebook: rulebook.fingerprint.clone(),
        declaration,
        previous_hash,
    }
}

/// The words a reason is stored as.
pub fn reason_words(reason: &Reason) -> String {
    match reason {
        Reason::AfterFeature => "after the feature".to_string(),
        Reason::Protest => "protest".to_string(),
        Reason::Claim => "claim".to_string(),
        Reason::RandomDraw => "random draw".to_string(),
        Reason::Other(why) => why.clone(),
    }
}

/// Seals as a JSON list of `{"number", "place"}`.
pub fn seals_json(seals: &[Seal]) -> String {
    let list: Vec<serde_json::Value> = seals
        .iter()
        .map(|s| serde_json::json!({"number": s.number, "place": s.place}))
        .collect();
    serde_json::Value::Array(list).to_string()
}

/// The hash of the last entry, or [`GENESIS`] for an empty log.
pub(crate) fn last_hash(db: &rusqlite::Connection) -> rusqlite::Result<String> {
    let last: Option<String> = db
        .query_row(
            "SELECT entry_hash FROM inspection ORDER BY seq DESC LIMIT 1",
            [],
            |row| row.get(0),
        )
        .optional()?;
    Ok(last.unwrap_or_else(|| GENESIS.to_string()))
}

/// Stores bytes once under their SHA-256; the hash.
fn store_blob(db: &rusqlite::Connection, bytes: &[u8]) -> rusqlite::Result<String> {
    let hash = sha256_hex(bytes);
    db.execute(
        "INSERT INTO blob (hash, bytes) SELECT ?1, ?2 \
         WHERE NOT EXISTS (SELECT 1 FROM blob WHERE hash = ?1)",
        params![hash, bytes],
    )?;
    Ok(hash)
}

fn store_rulebook(db: &rusqlite::Connection, rulebook: &RulebookBytes) -> rusqlite::Result<()> {
    let known: bool = db.query_row(
        "SELECT EXISTS (SELECT 1 FROM rulebook_file WHERE rulebook = ?1)",
        [&rulebook.fingerprint],
        |row| row.get(0),
    )?;
    if known {
        return Ok(());
    }
    for (position, (name, bytes)) in rulebook.files.iter().enumerate() {
        let blob = store_blob(db, bytes)?;
        db.execute(
            "INSERT INTO rulebook_file (rulebook, position, name, blob) VALUES (?1, ?2, ?3, ?4)",
            params![rulebook.fingerprint, position as i64, name, blob],
        )?;
    }
    Ok(())
}

fn insert(db: &rusqlite::Connection, e: &Entry, hash: &str) -> rusqlite::Result<()> {
    let mut statement = db.prepare_cached(
        "INSERT INTO inspection (engine, car, class, event, date, measured_by, reason, \
         reference, scope, seals_found, seals_applied, file, class_given, role_given, \
         gonogo_version, decision, result, report, recorded_at, rulebook, declaration, \
         previous_hash, entry_hash) VALUES (?1, ?2, ?3, ?4, ?5, ?6, ?7, ?8, ?9, ?10, ?11, \
         ?12, ?13, ?14, ?15, ?16, ?17, ?18, ?19, ?20, ?21, ?22, ?23)",
    )?;
    statement.execute(params![
        e.engine,
        e.car,
        e.class,
        e.event,
        e.date,
        e.measured_by,
        e.reason,
        e.reference,
        e.scope,
        e.seals_found,
        e.seals_applied,
        e.file,
        e.class_given,
        e.role_given,
        e.gonogo_version,
        e.decision,
        e.result,
        e.report,
        e.recorded_at,
        e.rulebook,
        e.declaration,
        e.previous_hash,
        hash,
    ])?;
    Ok(())
}

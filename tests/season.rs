//! The season log: recording with `check --record`, the hash chain and verification, and the
//! refusals of files that are not ours (SQLite file format: "SQLite format 3\0" header,
//! `PRAGMA application_id`, `PRAGMA user_version`, per the SQLite documentation).

mod common;

use common::{OrPanic, gonogo};
use gonogo::season::schema::{Log, Mode, SCHEMA_VERSION};
use gonogo::season::verify::verify;
use std::path::PathBuf;

const RULES: &str = "rulebooks-demo/tamsin-2027.rules";

fn scratch(name: &str) -> PathBuf {
    let path = std::env::temp_dir().join(format!("gonogo-season-{}-{name}", std::process::id()));
    let _ = std::fs::remove_file(&path);
    path
}

fn record(log: &std::path::Path, files: &[&str]) -> common::Run {
    let mut args = vec![
        "check",
        "--rules",
        RULES,
        "--record",
        log.to_str().or_panic("season"),
    ];
    args.extend_from_slice(files);
    gonogo(&args)
}

#[test]
fn a_run_is_recorded_in_a_chain_that_verifies() {
    let log = scratch("chain.sqlite");
    let run = record(
        &log,
        &[
            "engines-demo/street-stock-legal.yaml",
            "engines-demo/open4-legal.yaml",
        ],
    );
    assert_eq!(run.code, 0, "{}", run.stderr);
    assert!(
        run.stdout.contains("inspections #1 to #2"),
        "{}",
        run.stdout
    );
    let again = record(&log, &["engines-demo/street-stock-legal.yaml"]);
    assert!(again.stdout.contains("inspection #3"), "{}", again.stdout);
    let opened = Log::open(&log, Mode::Existing).or_panic("season");
    assert_eq!(opened.version().or_panic("season"), SCHEMA_VERSION);
    let history = opened.history("TV-27-003").or_panic("season");
    assert_eq!(history.len(), 2);
    assert_eq!(
        history[1].entry.previous_hash,
        opened.list(&Default::default()).or_panic("season")[1].entry_hash
    );
    let verification = verify(&opened).or_panic("season");
    assert_eq!(verification.inspections, 3);
    assert!(verification.clean(), "{verification:?}");
}

#[test]
fn an_edited_entry_fails_verification() {
    let log = scratch("tamper.sqlite");
    assert_eq!(
        record(&log, &["engines-demo/street-stock-legal.yaml"]).code,
        0
    );
    let db = rusqlite::Connection::open(&log).or_panic("season");
    // the triggers refuse the edit first
    assert!(
        db.execute("UPDATE inspection SET result = 'illegal'", [])
            .is_err()
    );
    db.execute_batch(
        "DROP TRIGGER inspection_no_update; UPDATE inspection SET measured_by = 'someone else';",
    )
    .or_panic("season");
    drop(db);
    let opened = Log::open(&log, Mode::Existing).or_panic("season");
    let verification = verify(&opened).or_panic("season");
    assert!(!verification.clean());
    assert_eq!(verification.breaks.len(), 1, "{:?}", verification.breaks);
}

#[test]
fn nothing_is_recorded_when_a_declaration_is_unreadable() {
    let log = scratch("unreadable.sqlite");
    let run = record(
        &log,
        &["engines-demo/street-stock-legal.yaml", "no-such-file.yaml"],
    );
    assert_eq!(run.code, 2);
    assert!(
        !log.exists(),
        "a log was created for a run that could not be read"
    );
}

#[test]
fn a_file_that_is_not_sqlite_is_refused_and_left_unchanged() {
    let log = scratch("text.sqlite");
    std::fs::write(&log, b"not a database at all\n").or_panic("season");
    let run = record(&log, &["engines-demo/street-stock-legal.yaml"]);
    assert_eq!(run.code, 2);
    assert!(run.stderr.contains("L01"), "{}", run.stderr);
    assert_eq!(
        std::fs::read(&log).or_panic("season"),
        b"not a database at all\n"
    );
}

#[test]
fn a_foreign_database_is_refused_and_left_unchanged() {
    let log = scratch("foreign.sqlite");
    let db = rusqlite::Connection::open(&log).or_panic("season");
    db.execute_batch("CREATE TABLE laps (n INTEGER); INSERT INTO laps VALUES (1);")
        .or_panic("season");
    drop(db);
    let before = std::fs::read(&log).or_panic("season");
    let run = record(&log, &["engines-demo/street-stock-legal.yaml"]);
    assert_eq!(run.code, 2);
    assert!(run.stderr.contains("L02"), "{}", run.stderr);
    assert_eq!(std::fs::read(&log).or_panic("season"), before);
}

#[test]
fn a_log_from_a_newer_gonogo_is_refused() {
    let log = scratch("newer.sqlite");
    assert_eq!(
        record(&log, &["engines-demo/street-stock-legal.yaml"]).code,
        0
    );
    let db = rusqlite::Connection::open(&log).or_panic("season");
    db.pragma_update(None, "user_version", SCHEMA_VERSION + 1)
        .or_panic("season");
    drop(db);
    let run = record(&log, &["engines-demo/street-stock-legal.yaml"]);
    assert_eq!(run.code, 2);
    assert!(
        run.stderr.contains("L03") && run.stderr.contains("newer"),
        "{}",
        run.stderr
    );
}

#[test]
fn an_empty_file_is_migrated_to_the_current_schema() {
    let log = scratch("empty.sqlite");
    std::fs::write(&log, b"").or_panic("season");
    let opened = Log::open(&log, Mode::Existing).or_panic("season");
    assert_eq!(opened.version().or_panic("season"), SCHEMA_VERSION);
}

#[test]
fn two_processes_recording_at_once_lose_nothing() {
    let log = scratch("together.sqlite");
    let path = log.to_str().or_panic("season").to_string();
    let spawn = || {
        std::process::Command::new(env!("CARGO_BIN_EXE_gonogo"))
            .args(["check", "--rules", RULES, "--record", &path, "engines-demo"])
            .current_dir(env!("CARGO_MANIFEST_DIR"))
            .stdout(std::process::Stdio::null())
            .spawn()
            .or_panic("season")
    };
    let (mut a, mut b) = (spawn(), spawn());
    let (ra, rb) = (a.wait().or_panic("season"), b.wait().or_panic("season"));
    assert!(ra.code() != Some(2) && rb.code() != Some(2));
    let field = common::files_under("engines-demo", ".yaml").len();
    let opened = Log::open(&log, Mode::Existing).or_panic("season");
    let verification = verify(&opened).or_panic("season");
    assert_eq!(verification.inspections, 2 * field);
    assert!(verification.breaks.is_empty(), "{:?}", verification.breaks);
}

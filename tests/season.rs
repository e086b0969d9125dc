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

const NEW_RULES: &str = "rulebooks-demo/tamsin-2028.rules";

/// The demo season (`season-demo/`) recorded round by round into a fresh log; each round's
/// standard output.
fn demo_season(log: &std::path::Path) -> Vec<String> {
    (1..=3)
        .map(|round| {
            let run = record(log, &[&format!("season-demo/round{round}")]);
            assert_eq!(run.code, 0, "round {round}: {}", run.stderr);
            run.stdout
        })
        .collect()
}

/// The lines of a check report that flag a seal or a sealed measurement.
fn flags(stdout: &str) -> Vec<&str> {
    stdout.lines().filter(|l| l.starts_with("SEAL")).collect()
}

#[test]
fn the_demo_season_in_event_order_flags_the_seal_mismatch_and_the_grown_bore() {
    let log = scratch("demo-season.sqlite");
    let rounds = demo_season(&log);
    assert!(flags(&rounds[0]).is_empty(), "{}", rounds[0]);
    // round 2: car 3's seal TV-S-1001 is found as applied, its measurements unchanged
    assert!(flags(&rounds[1]).is_empty(), "{}", rounds[1]);
    assert!(rounds[2].contains("inspections #5 to #7"), "{}", rounds[2]);
    // Bore 1 of car 44 went from 4.0302 in (#1) to 4.0342 in under seal TV-S-1002. Each is read
    // with a 0.0001 in resolution, u = 0.0001/(2√3) in (GUM JCGM 100:2008, 4.3.7, rectangular
    // distribution); the difference's expanded uncertainty is 2·√2·u ≈ 0.00008 in (GUM 5.1.2,
    // k = 2), far below the 0.0040 in it grew. Car 3's intake seal was TV-S-1040 when it left
    // round 2 (#4) and TV-S-1099 when it came to round 3.
    let mut found = flags(&rounds[2]);
    found.sort_unstable();
    assert_eq!(
        found,
        [
            "SEAL MISMATCH TV-27-003 (intake to head, front left bolt): found TV-S-1099, \
             #4 applied TV-S-1040",
            "SEALED MEASUREMENT MOVED TV-27-044: bore[1] 4.0302 in at #1, now 4.0342 in",
        ],
        "{}",
        rounds[2]
    );
    let opened = Log::open(&log, Mode::Existing).or_panic("season");
    let history = opened.history("TV-27-014").or_panic("season");
    let reasons: Vec<_> = history.iter().map(|s| s.entry.reason.clone()).collect();
    assert_eq!(
        reasons,
        [
            Some("protest".to_string()),
            Some("after the feature".to_string())
        ]
    );
    assert_eq!(history[0].entry.reference.as_deref(), Some("PR-27-06"));
}

#[test]
fn impact_with_a_log_is_impact_on_each_engines_latest_recorded_declaration() {
    let log = scratch("impact.sqlite");
    demo_season(&log);
    let path = log.to_str().or_panic("season");
    let from_log = gonogo(&[
        "impact", RULES, NEW_RULES, "--log", path, "--all", "--format", "json",
    ]);
    assert_eq!(from_log.code, 0, "{}", from_log.stderr);
    // round 3 holds the latest inspection of every engine of the season
    let from_files = gonogo(&[
        "impact",
        RULES,
        NEW_RULES,
        "season-demo/round3",
        "--all",
        "--format",
        "json",
    ]);
    assert_eq!(from_files.code, 0, "{}", from_files.stderr);
    assert_eq!(from_log.stdout, from_files.stdout);
    // a log beside named files: both join the field
    let both = gonogo(&[
        "impact",
        RULES,
        NEW_RULES,
        "engines-demo/street-stock-legal.yaml",
        "--log",
        path,
        "--all",
    ]);
    assert!(both.stdout.contains("on 4 engines"), "{}", both.stdout);
    let missing = gonogo(&["impact", RULES, NEW_RULES, "--log", "no-such-log.sqlite"]);
    assert_eq!(missing.code, 2);
    assert!(missing.stderr.contains("L05"), "{}", missing.stderr);
}

/// A folder of `count` copies of the demo's legal Limited Two-Barrel engine, each its own
/// engine number.
fn big_field(name: &str, count: usize) -> PathBuf {
    let dir = std::env::temp_dir().join(format!("gonogo-season-{}-{name}", std::process::id()));
    let _ = std::fs::remove_dir_all(&dir);
    std::fs::create_dir_all(&dir).or_panic("season");
    let template = std::fs::read_to_string("engines-demo/limited2-legal.yaml").or_panic("season");
    for i in 0..count {
        let text = template.replace("TV-27-014", &format!("TV-27-{i:05}"));
        std::fs::write(dir.join(format!("engine-{i:05}.yaml")), text).or_panic("season");
    }
    dir
}

fn wal_size(log: &std::path::Path) -> u64 {
    let mut wal = log.as_os_str().to_owned();
    wal.push("-wal");
    std::fs::metadata(wal).map(|m| m.len()).unwrap_or(0)
}

#[test]
fn a_recording_killed_half_way_leaves_a_sound_log_and_every_committed_inspection() {
    const FIELD: usize = 3000;
    let log = scratch("killed.sqlite");
    assert_eq!(
        record(&log, &["season-demo/round1", "season-demo/round2"]).code,
        0
    );
    let field = big_field("killed-field", FIELD);
    let mut child = std::process::Command::new(env!("CARGO_BIN_EXE_gonogo"))
        .args(["check", "--rules", RULES, "--record"])
        .arg(&log)
        .arg(&field)
        .current_dir(env!("CARGO_MANIFEST_DIR"))
        .stdout(std::process::Stdio::null())
        .stderr(std::process::Stdio::null())
        .spawn()
        .or_panic("season");
    // Kill it once its transaction has begun writing pages to the write-ahead log (the WAL
    // file is gone while no connection is open, SQLite docs "Write-Ahead Logging"), or after
    // a minute at most.
    let start = std::time::Instant::now();
    let mut killed_writing = false;
    while start.elapsed() < std::time::Duration::from_secs(60) {
        if child.try_wait().or_panic("season").is_some() {
            break;
        }
        if wal_size(&log) > 0 {
            killed_writing = true;
            break;
        }
        std::thread::sleep(std::time::Duration::from_millis(1));
    }
    let _ = child.kill();
    let status = child.wait().or_panic("season");
    let db = rusqlite::Connection::open(&log).or_panic("season");
    let integrity: String = db
        .query_row("PRAGMA integrity_check", [], |r| r.get(0))
        .or_panic("season");
    assert_eq!(integrity, "ok");
    drop(db);
    let opened = Log::open(&log, Mode::Existing).or_panic("season");
    let verification = verify(&opened).or_panic("season");
    assert!(verification.breaks.is_empty(), "{:?}", verification.breaks);
    assert!(verification.clean());
    // one run is one transaction: all of it or none of it (SQLite docs, "Atomic Commit")
    let expected = if verification.inspections == 4 {
        4
    } else {
        4 + FIELD
    };
    assert_eq!(
        verification.inspections, expected,
        "killed while writing: {killed_writing}, {status:?}"
    );
    assert_eq!(opened.history("TV-27-003").or_panic("season").len(), 2);
    let _ = std::fs::remove_dir_all(&field);
}

/// What a log reads back: every inspection and every stored file; `None` when it cannot be read.
fn content(log: &std::path::Path) -> Option<String> {
    let opened = Log::open(log, Mode::Existing).ok()?;
    let all = opened.list(&Default::default()).ok()?;
    let blobs = opened.blobs().ok()?;
    Some(format!("{all:?}{blobs:?}"))
}

#[test]
fn an_edit_of_the_raw_bytes_of_a_log_is_never_silently_accepted() {
    let log = scratch("raw.sqlite");
    demo_season(&log);
    let bytes = std::fs::read(&log).or_panic("season");
    let original = content(&log).or_panic("season");
    // Every place the file holds round 3's grown bore, its mismatched seal or its track: the
    // stored declaration, the report, the seals column. Some places are dead bytes that SQLite
    // leaves in a page's free space after a split (SQLite docs, "Database File Format", 1.6
    // "Freeblocks"): editing them changes nothing the log reads back, so nothing is to detect.
    let (mut live, mut dead) = (0, 0);
    for needle in [&b"4.0342"[..], b"TV-S-1099", b"Larkmoor"] {
        for at in bytes
            .windows(needle.len())
            .enumerate()
            .filter(|(_, w)| *w == needle)
            .map(|(i, _)| i)
        {
            let copy = scratch(&format!("raw-{at}.sqlite"));
            let mut changed = bytes.clone();
            changed[at + 2] ^= 0x01;
            std::fs::write(&copy, &changed).or_panic("season");
            if content(&copy).as_ref() == Some(&original) {
                dead += 1;
            } else {
                live += 1;
                let accepted = Log::open(&copy, Mode::Existing)
                    .and_then(|opened| verify(&opened))
                    .is_ok_and(|v| v.clean());
                assert!(!accepted, "an edit at byte {at} went unnoticed");
            }
            let _ = std::fs::remove_file(&copy);
        }
    }
    assert!(
        live >= 3,
        "only {live} live places were edited ({dead} dead)"
    );
}

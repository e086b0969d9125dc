//! `gonogo season` on a log recorded from the demo with `check --record`: the listing as a
//! table, JSON (RFC 8259, parsed back with serde_json) and CSV (RFC 4180), a filter, one
//! engine's history with a seal mismatch, verify on a clean log and on a copy edited past its
//! append-only triggers (SQLite documentation: `DROP TRIGGER`, `UPDATE`), and export back to
//! files byte for byte.

mod common;

use std::path::{Path, PathBuf};

use common::{OrPanic, Run, files_under, gonogo};

const RULES: &str = "rulebooks-demo/tamsin-2027.rules";
const STREET: &str = "engines-demo/street-stock-legal.yaml";
const OPEN4: &str = "engines-demo/open4-legal.yaml";

/// A fresh path under the temporary folder, nothing there yet.
fn scratch(name: &str) -> PathBuf {
    let path = std::env::temp_dir().join(format!("gonogo-scli-{}-{name}", std::process::id()));
    let _ = std::fs::remove_file(&path);
    let _ = std::fs::remove_dir_all(&path);
    path
}

fn text(path: &str) -> String {
    std::fs::read_to_string(Path::new(env!("CARGO_MANIFEST_DIR")).join(path)).or_panic("season")
}

fn record(log: &Path, files: &[&str]) {
    let mut args = vec![
        "check",
        "--rules",
        RULES,
        "--record",
        log.to_str().or_panic("log"),
    ];
    args.extend_from_slice(files);
    let run = gonogo(&args);
    assert!(run.code == 0, "{}", run.stderr);
}

/// The street stock engine's second visit: a seal applied at round 4 comes back with another
/// number, bore 1 has grown 0.0010 in and the header primaries 0.060 in (invented demo data).
fn season_log(name: &str) -> PathBuf {
    let log = scratch(name);
    let first = text(STREET).replacen(
        "measured_by: \"Tobias Wrenfield\"\n",
        "measured_by: \"Tobias Wrenfield\"\ninspection:\n  seals:\n    applied: \
         [{number: \"TV-S-1001\", at: \"intake, front left bolt\"}]\n",
        1,
    );
    let second = text(STREET)
        .replacen(
            "measured_by: \"Tobias Wrenfield\"\n",
            "measured_by: \"Tobias Wrenfield\"\ninspection:\n  seals:\n    found: \
             [{number: \"TV-S-1077\", at: \"intake, front left bolt\"}]\n",
            1,
        )
        .replace("round 4", "round 5")
        .replace("2027-05-22", "2027-06-05")
        .replacen("\"4.0302 in\"", "\"4.0312 in\"", 1)
        .replacen(
            "primary_od:\n      value: \"1.500 in\"",
            "primary_od:\n      value: \"1.560 in\"",
            1,
        );
    let (a, b) = (
        scratch(&format!("{name}-r4.yaml")),
        scratch(&format!("{name}-r5.yaml")),
    );
    std::fs::write(&a, first).or_panic("write");
    std::fs::write(&b, second).or_panic("write");
    record(&log, &[a.to_str().or_panic("a"), OPEN4]);
    record(&log, &[b.to_str().or_panic("b")]);
    log
}

fn season(args: &[&str]) -> Run {
    let mut all = vec!["season"];
    all.extend_from_slice(args);
    gonogo(&all)
}

#[test]
fn the_listing_as_a_table_json_and_csv_and_filtered() {
    let log = season_log("list.sqlite");
    let log = log.to_str().or_panic("log");
    let table = season(&["list", log]);
    assert_eq!(table.code, 0, "{}", table.stderr);
    insta::assert_snapshot!("season_list_table", table.stdout);

    let json = season(&["list", log, "--format", "json"]);
    let items: serde_json::Value = serde_json::from_str(&json.stdout).or_panic("json");
    let engines: Vec<&str> = items
        .as_array()
        .or_panic("array")
        .iter()
        .map(|i| i["engine"].as_str().unwrap_or(""))
        .collect();
    assert_eq!(engines, ["TV-27-003", "TV-27-044", "TV-27-003"]);
    assert_eq!(items[2]["seq"], 3);

    let csv = season(&["list", log, "--format", "csv"]);
    let lines: Vec<&str> = csv.stdout.split("\r\n").collect();
    assert_eq!(
        lines.len(),
        5,
        "header, three rows, the empty rest: {lines:?}"
    );
    assert!(lines[0].starts_with("seq,date,event,engine,car,class,result"));
    // RFC 4180, 2.6: the event's comma puts it in quotes
    assert!(
        lines[2]
            .starts_with("2,2027-05-22,\"Pellridge Speedway, round 4\",TV-27-044,44,open4,legal,"),
        "{}",
        lines[2]
    );

    let filtered = season(&["list", log, "--engine", "TV-27-003", "--from", "2027-06-01"]);
    assert!(filtered.stdout.contains("round 5"), "{}", filtered.stdout);
    assert!(!filtered.stdout.contains("round 4"), "{}", filtered.stdout);
    assert!(
        filtered.stdout.ends_with("1 inspection(s)\n"),
        "{}",
        filtered.stdout
    );

    let illegal = season(&["list", log, "--result", "illegal"]);
    assert!(
        illegal.stdout.ends_with("0 inspection(s)\n"),
        "{}",
        illegal.stdout
    );
    let open4 = season(&["list", log, "--class", "open4", "--result", "legal"]);
    assert!(
        open4.stdout.ends_with("1 inspection(s)\n"),
        "{}",
        open4.stdout
    );

    let missing = season(&["verify", "no-such-season.sqlite"]);
    assert_eq!(missing.code, 2);
    assert!(missing.stderr.contains("L05"), "{}", missing.stderr);

    let bad = season(&["list", log, "--from", "22.05.2027"]);
    assert_eq!(bad.code, 2);
    assert!(bad.stderr.contains("L08"), "{}", bad.stderr);
}

#[test]
fn the_history_shows_the_change_and_flags_the_seal() {
    let log = season_log("history.sqlite");
    let log = log.to_str().or_panic("log");
    let run = season(&["history", log, "TV-27-003"]);
    assert_eq!(run.code, 0, "{}", run.stderr);
    insta::assert_snapshot!("season_history_text", run.stdout);

    let json = season(&["history", log, "TV-27-003", "--format", "json"]);
    let doc: serde_json::Value = serde_json::from_str(&json.stdout).or_panic("json");
    let second = &doc["inspections"][1];
    assert_eq!(second["flagged"], true);
    assert_eq!(second["seal_mismatches"][0]["applied"], "TV-S-1001");
    assert_eq!(second["seal_mismatches"][0]["found"], "TV-S-1077");
    assert_eq!(second["changed"][0]["after"], "4.0312 in");

    let html = season(&["history", log, "TV-27-003", "--format", "html"]);
    // one plot per changed measurement; rule 6.1 limits the primary tube alone (1.625 in)
    assert_eq!(html.stdout.matches("<svg").count(), 2, "{}", html.stdout);
    assert_eq!(html.stdout.matches("class=\"limit\"").count(), 1);
    assert!(
        html.stdout.contains("header.primary_od (limit 1.625)"),
        "{}",
        html.stdout
    );
    assert!(html.stdout.contains("class=\"flag\""), "{}", html.stdout);

    let none = season(&["history", log, "TV-27-999"]);
    assert_eq!(none.code, 2);
    assert!(none.stderr.contains("L07"), "{}", none.stderr);
}

#[test]
fn verify_is_clean_then_fails_on_an_edited_copy() {
    let log = season_log("verify.sqlite");
    let clean = season(&["verify", log.to_str().or_panic("log")]);
    assert_eq!(clean.code, 0, "{}{}", clean.stdout, clean.stderr);
    assert!(clean.stdout.contains("chain: intact"), "{}", clean.stdout);
    assert!(
        clean.stdout.contains("3, 0 would differ"),
        "{}",
        clean.stdout
    );

    let copy = scratch("verify-edited.sqlite");
    std::fs::copy(&log, &copy).or_panic("copy");
    {
        let db = rusqlite::Connection::open(&copy).or_panic("open");
        // JSON1's json_set (SQLite documentation, "JSON Functions") changes one stored
        // rule verdict inside the stored report
        db.execute_batch(
            "DROP TRIGGER inspection_no_update; \
             UPDATE inspection SET result = 'illegal', \
                 report = json_set(report, '$.engines[0].rules[0].verdict', 'illegal') \
             WHERE seq = 2;",
        )
        .or_panic("edit");
    }
    let edited = season(&["verify", copy.to_str().or_panic("copy")]);
    assert_eq!(edited.code, 1, "{}{}", edited.stdout, edited.stderr);
    let out = &edited.stdout;
    assert!(
        out.contains("inspection #2: its contents do not match its hash"),
        "{out}"
    );
    assert!(
        out.contains("inspection #2 (TV-27-044): recorded illegal, now legal"),
        "{out}"
    );
    assert!(
        out.contains("    rule 3.1: recorded illegal, now legal"),
        "{out}"
    );
    assert!(out.ends_with("verdict: NOT clean\n"), "{out}");
}

#[test]
fn export_writes_the_demo_files_back_and_refuses_a_second_time() {
    let log = scratch("export.sqlite");
    record(&log, &[STREET, OPEN4]);
    let folder = scratch("export-folder");
    let (log, dir) = (
        log.to_str().or_panic("log"),
        folder.to_str().or_panic("dir"),
    );
    let run = season(&["export", log, dir]);
    assert_eq!(run.code, 0, "{}", run.stderr);
    let written: Vec<Vec<u8>> = files_under(dir, "")
        .iter()
        .map(|p| std::fs::read(p).or_panic("read"))
        .collect();
    assert_eq!(
        written.len(),
        4,
        "two declarations, a rulebook and its include"
    );
    for demo in [
        STREET,
        OPEN4,
        RULES,
        "rulebooks-demo/parts/tamsin-parts.rules",
    ] {
        assert!(
            written.contains(&text(demo).into_bytes()),
            "{demo} not exported"
        );
    }
    let again = season(&["export", log, dir]);
    assert_eq!(again.code, 2);
    assert!(again.stderr.contains("L06"), "{}", again.stderr);
}

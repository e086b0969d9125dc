//! The scope of an inspection: the sections a declaration's `inspection.scope` or
//! `check --sections` names. Rules outside it are "not in scope" — not evaluated, counted
//! apart from "not checked", and never a reason for "not all clear" or another exit status.
//! The command line wins over the declaration, and the report says which applied.
//!
//! Which rule lies in a scope follows the section numbering of the demo rulebook
//! (`rulebooks-demo/tamsin-2027.rules`, class limited2: sections 3.1–3.4, 4.1–4.5, 5.1–5.3,
//! 6.1–6.3, 7.1–7.2, 8.1–8.2, 19 rules) and the rule that a section covers the sections under
//! it (`6.2` covers `6.2.1`, not `6.21`; common practice for numbered rulebooks, no source).
//! The exit statuses are those of DEVELOPERS.md: 0 legal, 1 illegal, 2 bad input, 3 not all
//! clear.

mod common;

use std::path::Path;

use common::{OrPanic, Scratch, gonogo};
use serde_json::Value;

const RULES: &str = "rulebooks-demo/tamsin-2027.rules";
/// Illegal on 5.1 alone (its heads are not approved).
const UNAPPROVED_HEAD: &str = "engines-demo/limited2-unapproved-head.yaml";
/// Not checked on 3.4 alone (no deck clearance, so no compression ratio).
const MISSING_DECK: &str = "engines-demo/limited2-missing-deck.yaml";

/// A demo engine's declaration with `block` after its identity, as a scratch file.
fn with_block(engine: &str, name: &str, block: &str) -> Scratch {
    let text = std::fs::read_to_string(Path::new(env!("CARGO_MANIFEST_DIR")).join(engine))
        .or_panic("the demo declaration");
    assert!(text.contains("measured_by: \"Oona Fennick\"\n"));
    let text = text.replacen(
        "measured_by: \"Oona Fennick\"\n",
        &format!("measured_by: \"Oona Fennick\"\n{block}"),
        1,
    );
    Scratch::new(name, text.as_bytes())
}

/// The protest of heads and cam on the unapproved-head engine, scoped to sections 3 and 4,
/// as a scratch file named after the test (tests run at once and each removes its own).
fn protest_of_3_and_4(name: &str) -> Scratch {
    with_block(
        UNAPPROVED_HEAD,
        &format!("{name}.yaml"),
        "inspection:\n  reason: protest\n  reference: \"PR-27-11\"\n  scope: [3, \"4\"]\n",
    )
}

/// The lines of a text report that start a rule, with their verdicts.
fn rule_lines(report: &str) -> Vec<&str> {
    report
        .lines()
        .filter(|l| !l.starts_with(' ') && l.contains(" — "))
        .filter(|l| {
            l.split_whitespace()
                .nth(1)
                .is_some_and(|s| s.bytes().all(|b| b.is_ascii_digit() || b == b'.'))
        })
        .collect()
}

#[test]
fn a_failing_rule_outside_the_declarations_scope_does_not_make_the_engine_illegal() {
    let unscoped = gonogo(&["check", "--rules", RULES, UNAPPROVED_HEAD]);
    assert_eq!(
        unscoped.code, 1,
        "without a scope 5.1 fails: {}",
        unscoped.stdout
    );

    let file = protest_of_3_and_4("illegal-outside");
    let run = gonogo(&["check", "--rules", RULES, file.path()]);
    assert_eq!(run.code, 0, "{}{}", run.stdout, run.stderr);
    assert!(
        run.stdout
            .contains("inspected: protest PR-27-11 · scope 3, 4 (from the declaration)\n"),
        "{}",
        run.stdout
    );
    // 3.1–3.4 and 4.1–4.5 are in scope: 9 rules; the other 10 are not
    assert!(
        run.stdout.contains(
            "result: LEGAL — 9 legal, 0 illegal, 0 not checked, 0 not applicable, 10 not in scope; 0 conditional"
        ),
        "{}",
        run.stdout
    );
    assert!(
        run.stdout
            .contains("○ 5.1  Approved heads — NOT IN SCOPE\n")
    );
    let out_of_scope = rule_lines(&run.stdout)
        .into_iter()
        .filter(|l| l.ends_with("NOT IN SCOPE"))
        .count();
    assert_eq!(out_of_scope, 10);
}

#[test]
fn the_command_line_scope_wins_over_the_declarations() {
    let file = protest_of_3_and_4("cli-wins");
    let run = gonogo(&["check", "--rules", RULES, "--sections", "5", file.path()]);
    assert_eq!(run.code, 1, "5.1 is in scope again: {}", run.stdout);
    assert!(
        run.stdout
            .contains("inspected: protest PR-27-11 · scope 5 (from the command line)\n"),
        "{}",
        run.stdout
    );
    assert!(
        run.stdout
            .contains("✗ 5.1  Approved heads — ILLEGAL · fail\n")
    );
    assert!(run.stdout.contains("○ 3.1  Displacement — NOT IN SCOPE\n"));
    // 5.1–5.3 in scope, 16 rules not
    assert!(run.stdout.contains(
        "result: ILLEGAL — 2 legal, 1 illegal, 0 not checked, 0 not applicable, 16 not in scope; 0 conditional"
    ));
}

#[test]
fn a_section_covers_its_subsections_but_not_a_longer_number() {
    // `8` covers 8.1 and 8.2; `4.2` covers 4.2 only, not 4.3 or 4.21
    let run = gonogo(&[
        "check",
        "--rules",
        RULES,
        "--sections",
        "8,4.2",
        UNAPPROVED_HEAD,
    ]);
    let lines = rule_lines(&run.stdout);
    let in_scope: Vec<&str> = lines
        .iter()
        .filter(|l| !l.ends_with("NOT IN SCOPE"))
        .filter_map(|l| l.split_whitespace().nth(1))
        .collect();
    assert_eq!(in_scope, ["4.2", "8.1", "8.2"], "{}", run.stdout);
}

#[test]
fn not_in_scope_is_not_not_checked() {
    let unscoped = gonogo(&["check", "--rules", RULES, MISSING_DECK]);
    assert_eq!(unscoped.code, 3, "3.4 is not checked: {}", unscoped.stdout);
    let run = gonogo(&[
        "check",
        "--rules",
        RULES,
        "--sections",
        "3.1,3.2,3.3",
        MISSING_DECK,
    ]);
    assert_eq!(run.code, 0, "3.4 is out of scope: {}", run.stdout);
    assert!(
        run.stdout
            .contains("○ 3.4  Compression ratio, every cylinder — NOT IN SCOPE\n")
    );
    assert!(run.stdout.contains("0 not checked"), "{}", run.stdout);
    let in_scope = gonogo(&["check", "--rules", RULES, "--sections", "3", MISSING_DECK]);
    assert_eq!(in_scope.code, 3, "3.4 is in scope and not checked");
}

#[test]
fn bad_sections_on_the_command_line_are_refused_with_exit_2() {
    let run = gonogo(&[
        "check",
        "--rules",
        RULES,
        "--sections",
        "5,heads",
        UNAPPROVED_HEAD,
    ]);
    assert_eq!(run.code, 2);
    assert!(run.stdout.is_empty());
    assert!(
        run.stderr.contains("`heads` is not a section number"),
        "{}",
        run.stderr
    );

    let run = gonogo(&[
        "check",
        "--rules",
        RULES,
        "--sections",
        "5,9",
        UNAPPROVED_HEAD,
    ]);
    assert_eq!(run.code, 2, "{}", run.stdout);
    assert!(run.stdout.is_empty(), "nothing written half-way");
    assert!(run.stderr.contains("C66 bad-sections"), "{}", run.stderr);
    assert!(
        run.stderr
            .contains("section 9 of the scope (from the command line) names no rule"),
        "{}",
        run.stderr
    );
}

#[test]
fn a_declarations_scope_naming_no_rule_is_refused() {
    let file = with_block(
        UNAPPROVED_HEAD,
        "scope-none.yaml",
        "inspection:\n  reason: random-draw\n  scope: [\"4.21\"]\n",
    );
    let run = gonogo(&["check", "--rules", RULES, file.path()]);
    assert_eq!(run.code, 2, "{}", run.stdout);
    assert!(run.stderr.contains("C66 bad-sections"), "{}", run.stderr);
    assert!(
        run.stderr.contains("(from the declaration)"),
        "{}",
        run.stderr
    );
}

#[test]
fn a_scoped_json_report_fits_its_schema_and_counts_apart() {
    let path = format!("{}/schemas/check.schema.json", env!("CARGO_MANIFEST_DIR"));
    let schema: Value = serde_json::from_str(&std::fs::read_to_string(&path).or_panic("schema"))
        .or_panic("schema JSON");
    let validator = jsonschema::options()
        .should_validate_formats(true)
        .build(&schema)
        .or_panic("a JSON Schema");
    let file = protest_of_3_and_4("json");
    let run = gonogo(&["check", "--rules", RULES, "--format", "json", file.path()]);
    assert_eq!(run.code, 0, "{}", run.stderr);
    let doc: Value = serde_json::from_str(&run.stdout).or_panic("JSON");
    let found: Vec<String> = validator.iter_errors(&doc).map(|e| e.to_string()).collect();
    assert!(found.is_empty(), "{found:?}");

    let engine = &doc["engines"][0];
    assert_eq!(engine["inspected"]["reason"], "protest");
    assert_eq!(engine["inspected"]["reference"], "PR-27-11");
    assert_eq!(engine["inspected"]["scope"], serde_json::json!(["3", "4"]));
    assert_eq!(engine["inspected"]["scope_from"], "declaration");
    assert_eq!(engine["counts"]["not_in_scope"], 10);
    assert_eq!(engine["counts"]["not_checked"], 0);
    assert_eq!(engine["result"], "legal");
    let rules = engine["rules"].as_array().or_panic("rules");
    let outside: Vec<&Value> = rules
        .iter()
        .filter(|r| r["verdict"] == "not_in_scope")
        .collect();
    assert_eq!(outside.len(), 10);
    assert!(outside.iter().all(|r| r["finding"].is_null()
        && r["applies"] == "not_in_scope"
        && r["trace"].as_array().is_some_and(Vec::is_empty)));

    // without a scope the object is still there, every field null
    let run = gonogo(&[
        "check",
        "--rules",
        RULES,
        "--format",
        "json",
        UNAPPROVED_HEAD,
    ]);
    let doc: Value = serde_json::from_str(&run.stdout).or_panic("JSON");
    assert!(validator.iter_errors(&doc).next().is_none());
    assert!(doc["engines"][0]["inspected"]["scope"].is_null());
    assert_eq!(doc["engines"][0]["counts"]["not_in_scope"], 0);
}

#[test]
fn markdown_and_html_say_which_scope_applied() {
    let file = protest_of_3_and_4("formats");
    let words = "protest PR-27-11 · scope 5 (from the command line)";
    for format in ["markdown", "html"] {
        let run = gonogo(&[
            "check",
            "--rules",
            RULES,
            "--format",
            format,
            "--sections",
            "5",
            file.path(),
        ]);
        assert_eq!(run.code, 1, "{format}: {}", run.stderr);
        assert!(run.stdout.contains(words), "{format}: {}", run.stdout);
        assert!(run.stdout.contains("NOT IN SCOPE"), "{format}");
        assert!(run.stdout.contains("○ not in scope"), "{format}: the key");
    }
}

#[test]
fn a_scoped_text_report() {
    let file = protest_of_3_and_4("snapshot");
    let run = gonogo(&["check", "--rules", RULES, file.path()]);
    let report = run.stdout.replace(file.path(), "<scratch>/snapshot.yaml");
    insta::assert_snapshot!(report);
}

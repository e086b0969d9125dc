//! Rulebooks at the size of the limits: a long `extends` chain, a class with many rules,
//! many patterns across includes, a very long line. Each is generated here; the tests check
//! the diagnostic of each cap and that what stays under a cap is checked right, at sizes
//! quick in a debug build. `write_large_rulebooks` (ignored) writes the full-size versions
//! for measuring the release binary:
//!
//! ```sh
//! GONOGO_LARGE_DIR=/tmp/large cargo test --test limits -- --ignored write_large_rulebooks
//! time target/release/gonogo lint /tmp/large/extends-10000.rules
//! ```

use std::fmt::Write as _;
use std::path::{Path, PathBuf};

use gonogo::diagnostic::RenderStyle;
use gonogo::exit::Exit;

const HEADER: &str = "series \"Tamsin Valley Stock Car Club\"\n\
edition \"2027\" effective 2027-04-01\n\
decision guarded rejection\n\
measure bore: length \"Bore gauge\"\n\
measure head.casting: text \"Casting number\"\n";

/// `n` classes, each extending the one before; the first holds the only rule.
fn extends_chain(n: usize) -> String {
    let mut text = HEADER.to_string();
    text.push_str("class c0 \"Class 0\"\n  rule 1 \"Bore\"\n    require bore <= 4.1 in\n  end\n  rule 2 \"Head\"\n    require head.casting matches /^TV-[0-9]+$/\n  end\nend\n");
    for i in 1..n {
        let _ = writeln!(text, "class c{i} \"Class {i}\" extends c{}\nend", i - 1);
    }
    text
}

/// One class of `n` rules, each with its own section number.
fn many_rules(n: usize) -> String {
    let mut text = HEADER.to_string();
    text.push_str("class big \"Big\"\n");
    text.push_str("  rule 0 \"Head\"\n    require head.casting matches /^TV-[0-9]+$/\n  end\n");
    for i in 1..=n {
        let _ = writeln!(
            text,
            "  rule {i} \"Bore {i}\"\n    require bore <= {}.1 in\n  end",
            4 + i % 3
        );
    }
    text.push_str("end\n");
    text
}

/// A root rulebook including `files` files of one approved list each, `per_file` patterns
/// per list. Returns the root's text and each included file's name and text.
fn many_patterns(files: usize, per_file: usize) -> (String, Vec<(String, String)>) {
    let mut root = HEADER.to_string();
    let mut included = Vec::new();
    for file in 0..files {
        let name = format!("parts{file}.rules");
        let _ = writeln!(root, "include \"{name}\"");
        let mut list = format!("approved list heads{file} \"Heads of file {file}\"\n");
        for i in 0..per_file {
            let _ = writeln!(list, "  /^TV-{file}-{i}[A-Z]?$/,");
        }
        list.push_str("  \"TV-1\"\nend\n");
        included.push((name, list));
    }
    root.push_str("class hobby \"Hobby\"\n  rule 1 \"Bore\"\n    require bore <= 4.1 in\n  end\n  rule 2 \"Head\"\n    require head.casting in heads0\n  end\nend\n");
    (root, included)
}

/// A rulebook whose one error, an unknown unit, stands at `column` of a line `width` long.
fn long_line(width: usize, column: usize) -> String {
    let mut text = HEADER.to_string();
    text.push_str("class hobby \"Hobby\"\n  rule 1 \"Bore\"\n    require bore <= 4.1 in\n  end\n");
    let before = "  rule 2 \"";
    let title_start = before.len();
    let pad = column.saturating_sub(title_start + 1);
    let mut line = format!("{before}{}\" require bore <= 4.1 furlongs", "x".repeat(pad));
    let rest = width.saturating_sub(line.chars().count() + " end".len());
    let _ = write!(line, " #{}", "y".repeat(rest.saturating_sub(2)));
    text.push_str(&line);
    text.push_str("\n  end\nend\n");
    text
}

/// A folder of its own for one test or one measurement.
fn folder(name: &str) -> PathBuf {
    let dir = std::env::temp_dir().join(format!("gonogo-limits-{name}-{}", std::process::id()));
    let _ = std::fs::remove_dir_all(&dir);
    std::fs::create_dir_all(&dir).unwrap_or_else(|e| panic!("{e}"));
    dir
}

fn write(path: &Path, text: &str) {
    std::fs::write(path, text).unwrap_or_else(|e| panic!("{}: {e}", path.display()));
}

/// Lints `text` written to a file of its own, with `includes` beside it.
fn lint_text(name: &str, text: &str, includes: &[(String, String)]) -> (String, Exit) {
    let dir = folder(name);
    let root = dir.join("book.rules");
    write(&root, text);
    for (file, body) in includes {
        write(&dir.join(file), body);
    }
    let out = lint_report(&[root]);
    let _ = std::fs::remove_dir_all(&dir);
    out
}

/// Writes the full-size rulebooks into `$GONOGO_LARGE_DIR`, for timing the release binary.
#[test]
#[ignore = "writes large files for measuring; run by hand"]
fn write_large_rulebooks() {
    let dir =
        PathBuf::from(std::env::var("GONOGO_LARGE_DIR").unwrap_or_else(|_| "/tmp/large".into()));
    std::fs::create_dir_all(&dir).unwrap_or_else(|e| panic!("{e}"));
    for n in [1_000, 10_000] {
        write(&dir.join(format!("extends-{n}.rules")), &extends_chain(n));
    }
    for n in [10_000, 100_000] {
        write(&dir.join(format!("rules-{n}.rules")), &many_rules(n));
    }
    let patterns = dir.join("patterns-400000");
    std::fs::create_dir_all(&patterns).unwrap_or_else(|e| panic!("{e}"));
    let (root, includes) = many_patterns(40, 10_000);
    write(&patterns.join("book.rules"), &root);
    for (file, body) in includes {
        write(&patterns.join(file), &body);
    }
    write(&dir.join("long-line.rules"), &long_line(100_000, 70_000));
}

/// `MAX_EXTENDS` of `gonogo::check` (64): a chain of classes one step longer is refused.
const MAX_EXTENDS: usize = 64;

#[test]
fn a_chain_of_extends_within_the_cap_is_flattened_whole() {
    let n = MAX_EXTENDS + 1; // c0 is the root; c64 stands 64 `extends` below it
    let (report, exit) = lint_text("extends-within", &extends_chain(n), &[]);
    assert_eq!(exit, Exit::Clean, "{report}");
    let dir = folder("extends-model");
    let path = dir.join("book.rules");
    write(&path, &extends_chain(n));
    let mut sources = gonogo::source::SourceMap::default();
    let (files, problems) = gonogo::parse::includes::read_rulebook(&path, &mut sources);
    let (model, _) = gonogo::check::check(&files);
    let _ = std::fs::remove_dir_all(&dir);
    assert!(problems.is_empty(), "{problems:?}");
    let model = model.unwrap_or_else(|| panic!("no model"));
    assert_eq!(model.classes.len(), n);
    // every class inherits both rules of the root
    assert!(model.classes.iter().all(|c| c.rules.len() == 2));
}

#[test]
fn a_chain_of_extends_past_the_cap_is_refused_once() {
    let (report, exit) = lint_text("extends-past", &extends_chain(2_000), &[]);
    assert_eq!(exit, Exit::ERRORS_FOUND, "{report}");
    assert_eq!(
        report.matches("C27 extends-too-long").count(),
        1,
        "{report}"
    );
    assert!(
        report.contains("`c65` stands more than 64 `extends` below its root class `c0`"),
        "{report}"
    );
}

#[test]
fn a_class_of_many_rules_keeps_every_rule_in_order() {
    let n = 20_000;
    let dir = folder("many-rules");
    let path = dir.join("book.rules");
    write(&path, &many_rules(n));
    let mut sources = gonogo::source::SourceMap::default();
    let (files, problems) = gonogo::parse::includes::read_rulebook(&path, &mut sources);
    let (model, check_problems) = gonogo::check::check(&files);
    let _ = std::fs::remove_dir_all(&dir);
    assert!(
        problems.is_empty() && check_problems.is_empty(),
        "{check_problems:?}"
    );
    let model = model.unwrap_or_else(|| panic!("no model"));
    let sections: Vec<String> = model.classes[0]
        .rules
        .iter()
        .map(|r| r.rule.section.text.clone())
        .collect();
    let expected: Vec<String> = (0..=n).map(|i| i.to_string()).collect();
    assert_eq!(sections, expected);
}

/// `MAX_PATTERNS` of `gonogo::check` (1,000), counted across the rulebook and its includes.
const MAX_PATTERNS: usize = 1000;

#[test]
fn patterns_up_to_the_cap_across_includes_are_compiled() {
    // 4 files of 249 patterns and one of `heads0`'s exact entries: 996 patterns
    let (root, includes) = many_patterns(4, 249);
    let (report, exit) = lint_text("patterns-within", &root, &includes);
    assert_eq!(exit, Exit::Clean, "{report}");
}

#[test]
fn patterns_past_the_cap_across_includes_are_refused_once() {
    let (root, includes) = many_patterns(4, MAX_PATTERNS / 4 + 1);
    let (report, exit) = lint_text("patterns-past", &root, &includes);
    assert_eq!(exit, Exit::ERRORS_FOUND, "{report}");
    assert_eq!(
        report.matches("C47 too-many-patterns").count(),
        1,
        "{report}"
    );
    // the first pattern past the limit is in the last included file
    assert!(report.contains("parts3.rules"), "{report}");
}

#[test]
fn an_error_at_column_70000_of_a_100k_line_prints_a_few_lines() {
    let (report, exit) = lint_text("long-line", &long_line(100_000, 70_000), &[]);
    assert_eq!(exit, Exit::ERRORS_FOUND, "{report}");
    assert!(report.contains("C56 unknown-unit"), "{report}");
    assert!(report.contains("furlongs"), "{report}");
    assert!(report.len() < 3_000, "{} bytes", report.len());
}

/// The text report and exit status of `lint` on these files.
fn lint_report(paths: &[std::path::PathBuf]) -> (String, gonogo::exit::Exit) {
    let linted = gonogo::commands::lint::run(paths);
    (
        linted.render(gonogo::commands::lint::LintFormat::Text, RenderStyle::PLAIN),
        linted.exit(),
    )
}

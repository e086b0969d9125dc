//! Every malformed rulebook in `tests/malformed/` gives the diagnostics in its snapshot and
//! the exit status its name implies: 2 for an error, 0 when only warnings are found.

use std::path::Path;

use gonogo::commands::lint::{self, LintFormat};
use gonogo::diagnostic::RenderStyle;
use gonogo::exit::Exit;

/// Files whose problems are only warnings.
const WARNINGS_ONLY: &[&str] = &[
    "unused-measurement.rules",
    "never-fails.rules",
    "never-fails-limit-first.rules",
    "never-met.rules",
    "approved-and-banned.rules",
    "override-changes-nothing.rules",
    "empty-bulletin.rules",
    "duplicate-list-entry.rules",
    "duplicate-entry-ignoring-case.rules",
    "entry-covered-by-pattern.rules",
    "unused-define.rules",
    "byte-order-mark.rules",
];

#[test]
fn malformed_rulebooks_give_their_diagnostics() {
    let root = Path::new(env!("CARGO_MANIFEST_DIR"));
    let mut count = 0;
    insta::glob!("malformed/*.rules", |path| {
        count += 1;
        let relative = path.strip_prefix(root).unwrap_or(path).to_path_buf();
        let linted = lint::run(&[relative]);
        let (report, exit) = (
            linted.render(LintFormat::Text, RenderStyle::PLAIN),
            linted.exit(),
        );
        let name = path
            .file_name()
            .and_then(|n| n.to_str())
            .unwrap_or_default();
        let expected = if WARNINGS_ONLY.contains(&name) {
            Exit::Clean
        } else {
            Exit::ERRORS_FOUND
        };
        assert_eq!(exit, expected, "{name}:\n{report}");
        insta::assert_snapshot!(report);
    });
    assert!(count >= 30, "only {count} malformed rulebooks");
}

/// A folder of its own for one test, holding `book.rules`: the include-missing rulebook
/// with its include pointed at `include`.
fn scratch_book(name: &str, include: &str) -> std::path::PathBuf {
    let folder = std::env::temp_dir().join(format!("gonogo-{name}-{}", std::process::id()));
    let _ = std::fs::remove_dir_all(&folder);
    std::fs::create_dir_all(&folder).unwrap_or_else(|e| panic!("{e}"));
    let root = Path::new(env!("CARGO_MANIFEST_DIR")).join("tests/malformed/include-missing.rules");
    let text = std::fs::read_to_string(root)
        .unwrap_or_else(|e| panic!("{e}"))
        .replace("sub/missing.rules", include);
    std::fs::write(folder.join("book.rules"), text).unwrap_or_else(|e| panic!("{e}"));
    folder
}

/// An include that names a FIFO is refused without being opened: opening it for reading
/// would wait for a writer for ever.
#[cfg(unix)]
#[test]
fn an_include_that_is_a_fifo_is_refused_without_blocking() {
    let folder = scratch_book("fifo-include", "pipe.rules");
    let made = std::process::Command::new("mkfifo")
        .arg(folder.join("pipe.rules"))
        .status();
    if !made.is_ok_and(|s| s.success()) {
        eprintln!("skipped: `mkfifo` is not available");
        return;
    }
    let (report, exit) = lint_text(&[folder.join("book.rules")]);
    let _ = std::fs::remove_dir_all(&folder);
    assert_eq!(exit, Exit::ERRORS_FOUND, "{report}");
    assert!(
        report.contains("F04 include-not-a-file")
            && report.contains("is a FIFO (named pipe), not a regular file"),
        "{report}"
    );
}

/// An include that is a link in a loop of links says so, not "does not exist". (The loop is
/// made here: one in `tests/malformed/` would trip every tool that walks the folder.)
#[cfg(unix)]
#[test]
fn an_include_that_is_a_link_loop_says_so() {
    let folder = scratch_book("loop-include", "loop-a.rules");
    let (a, b) = (folder.join("loop-a.rules"), folder.join("loop-b.rules"));
    std::os::unix::fs::symlink("loop-b.rules", &a).unwrap_or_else(|e| panic!("{e}"));
    std::os::unix::fs::symlink("loop-a.rules", &b).unwrap_or_else(|e| panic!("{e}"));
    let (report, exit) = lint_text(&[folder.join("book.rules")]);
    let _ = std::fs::remove_dir_all(&folder);
    assert_eq!(exit, Exit::ERRORS_FOUND, "{report}");
    assert!(
        report.contains("F02 include-link-loop")
            && report.contains("`loop-a.rules` is a link that leads round in a loop")
            && !report.contains("does not exist"),
        "{report}"
    );
}

/// The text report and exit status of `lint` on these files.
fn lint_text(paths: &[std::path::PathBuf]) -> (String, gonogo::exit::Exit) {
    let linted = gonogo::commands::lint::run(paths);
    (
        linted.render(gonogo::commands::lint::LintFormat::Text, RenderStyle::PLAIN),
        linted.exit(),
    )
}

/// After a dimension error in a rule's test or a condition, lint adds no warning that only
/// follows from it (never fails, never met, never holds); the same tests written without the
/// error still give theirs (`never-met.rules`, `condition-never-holds.rules`).
#[test]
fn a_dimension_error_brings_no_follow_on_warning() {
    let (report, _) =
        lint_text(&["tests/malformed/dimension-error-without-follow-on.rules".into()]);
    assert_eq!(
        report.matches("C17 dimension-mismatch").count(),
        4,
        "{report}"
    );
    for follow_on in ["C33", "C34", "C35"] {
        assert!(!report.contains(follow_on), "{follow_on} in:\n{report}");
    }
    let (genuine, _) = lint_text(&["tests/malformed/never-met.rules".into()]);
    assert!(genuine.contains("C35 never-met"), "{genuine}");
    let (genuine, _) = lint_text(&["tests/malformed/condition-never-holds.rules".into()]);
    assert!(genuine.contains("C34 never-holds"), "{genuine}");
}

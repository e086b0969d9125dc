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
    "unused-define.rules",
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
            Exit::BadInput
        };
        assert_eq!(exit, expected, "{name}:\n{report}");
        insta::assert_snapshot!(report);
    });
    assert!(count >= 30, "only {count} malformed rulebooks");
}

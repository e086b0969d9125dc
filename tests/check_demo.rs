//! `gonogo check` on the demo: a snapshot of the text and JSON report of every demo engine,
//! the exit statuses the demo is built to show, and every bad declaration's diagnostic.

mod common;

use std::path::{Path, PathBuf};

use gonogo::commands::check::{self, CheckFormat, CheckRequest, Role};
use gonogo::diagnostic::RenderStyle;
use gonogo::exit::Exit;

const RULES: &str = "rulebooks-demo/tamsin-2027.rules";

fn relative(path: &Path) -> PathBuf {
    path.strip_prefix(env!("CARGO_MANIFEST_DIR"))
        .unwrap_or(path)
        .to_path_buf()
}

fn run(
    declaration: &Path,
    format: CheckFormat,
    role: Option<Role>,
) -> Result<(String, Exit), String> {
    let declarations = [relative(declaration)];
    let request = CheckRequest {
        rules: Path::new(RULES),
        class: None,
        role,
        format,
        declarations: &declarations,
        jobs: None,
    };
    check::run(&request).map_err(|failure| failure.render(RenderStyle::PLAIN))
}

#[test]
fn every_demo_engine_reports_as_in_its_snapshots() {
    insta::glob!("../engines-demo", "*.yaml", |path| {
        let (text, exit) = run(path, CheckFormat::Text, None)
            .unwrap_or_else(|e| panic!("{}: {e}", path.display()));
        insta::assert_snapshot!("text", format!("exit {}\n{text}", exit as u8));
        let (json, _) = run(path, CheckFormat::Json, None).unwrap_or_else(|e| panic!("{e}"));
        insta::assert_snapshot!("json", json);
    });
}

#[test]
fn the_demo_shows_every_exit_status_and_a_disagreement() {
    let mut inspector = Vec::new();
    let mut disagreements = Vec::new();
    for path in common::files_under("engines-demo", ".yaml") {
        let (_, as_inspector) =
            run(&path, CheckFormat::Text, Some(Role::Inspector)).unwrap_or_else(|e| panic!("{e}"));
        let (_, as_builder) =
            run(&path, CheckFormat::Text, Some(Role::Builder)).unwrap_or_else(|e| panic!("{e}"));
        inspector.push(as_inspector);
        if as_inspector != as_builder {
            disagreements.push(path);
        }
    }
    assert!(
        inspector.len() >= 15,
        "only {} demo engines",
        inspector.len()
    );
    for exit in [Exit::Clean, Exit::Illegal, Exit::Uncertain] {
        assert!(inspector.contains(&exit), "no demo engine exits {exit:?}");
    }
    assert!(
        !disagreements.is_empty(),
        "inspector and builder agree on every demo engine"
    );
}

#[test]
fn json_reports_parse_and_carry_the_schema() {
    for path in common::files_under("engines-demo", ".yaml") {
        let (json, exit) = run(&path, CheckFormat::Json, None).unwrap_or_else(|e| panic!("{e}"));
        let doc: serde_json::Value =
            serde_json::from_str(&json).unwrap_or_else(|e| panic!("{}: {e}", path.display()));
        assert_eq!(doc["schema"], "gonogo.check/1");
        assert_eq!(doc["engines"][0]["exit_status"], exit as u8);
    }
}

#[test]
fn bad_declarations_give_their_diagnostics() {
    let mut count = 0;
    insta::glob!("bad-declarations/*.yaml", |path| {
        count += 1;
        let problem = run(path, CheckFormat::Text, None)
            .err()
            .unwrap_or_else(|| panic!("{} was accepted", path.display()));
        insta::assert_snapshot!(problem);
    });
    assert!(count >= 20, "only {count} bad declarations");
}

/// The demo's after-bulletin engine with its date moved.
fn after_bulletin_dated(date: &str) -> String {
    let text = std::fs::read_to_string(concat!(
        env!("CARGO_MANIFEST_DIR"),
        "/engines-demo/limited2-after-bulletin.yaml"
    ))
    .unwrap_or_default();
    text.replace("date: \"2027-07-10\"", &format!("date: \"{date}\""))
}

#[test]
fn a_declaration_gets_the_rules_in_force_on_its_date() {
    let loaded = gonogo::commands::load_rulebook(Path::new(RULES));
    let rulebook = loaded.checked.unwrap_or_else(|| panic!("demo rulebook"));
    let class = rulebook
        .class("limited2")
        .unwrap_or_else(|| panic!("limited2"));
    let verdict_of = |date: &str, section: &str| {
        let mut sources = gonogo::source::SourceMap::default();
        let d = gonogo::load::declaration_from_text(
            Path::new("dated.yaml"),
            after_bulletin_dated(date),
            &rulebook,
            &mut sources,
        )
        .unwrap_or_else(|p| panic!("{p:?}"));
        let report = gonogo::evaluate::check_engine(&rulebook, class, &d, None);
        let bulletins = report.bulletins.to_vec();
        (
            report
                .outcomes
                .iter()
                .find(|o| o.section() == section)
                .map(|o| o.verdict),
            bulletins,
        )
    };
    use gonogo::evaluate::finding::Verdict;
    // TVB-27-04 takes effect on 2027-06-14: the day before, 0.485 in is over the 0.480 in limit
    assert_eq!(
        verdict_of("2027-06-13", "5.3"),
        (Some(Verdict::Illegal), vec![])
    );
    assert_eq!(
        verdict_of("2027-06-13", "4.8").0,
        None,
        "the bulletin's new rule is not in force yet"
    );
    // from that day on the limit is 0.490 in and rule 4.8 exists
    assert_eq!(
        verdict_of("2027-06-14", "5.3"),
        (Some(Verdict::Legal), vec!["TVB-27-04".to_string()])
    );
    assert_eq!(
        verdict_of("2027-06-14", "4.8").0,
        Some(Verdict::NotApplicable)
    );
}

#[test]
fn a_declaration_dated_before_the_edition_is_refused() {
    let path = std::env::temp_dir().join(format!("gonogo-{}-early.yaml", std::process::id()));
    std::fs::write(&path, after_bulletin_dated("2027-01-10")).unwrap_or_else(|e| panic!("{e}"));
    let message = run(&path, CheckFormat::Text, None)
        .err()
        .unwrap_or_default();
    let _ = std::fs::remove_file(&path);
    assert!(
        message.contains("gonogo::check::before-edition"),
        "{message}"
    );
    assert!(
        message.contains("is dated 2027-01-10, before edition 2027 took effect"),
        "{message}"
    );
}

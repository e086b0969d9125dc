//! The `inspection:` block of a declaration: why the engine was inspected, the sections the
//! inspection covered, and the seals found and applied. Bad blocks are refused in
//! `tests/bad-declarations/inspection-*.yaml` (snapshotted by `check_demo.rs`); this file
//! checks what a good block loads to.

mod common;

use std::path::Path;

use gonogo::load::inspection::{Inspection, Reason, Seal};

const RULES: &str = "rulebooks-demo/tamsin-2027.rules";
const LEGAL: &str = "engines-demo/limited2-legal.yaml";

/// The demo's legal Limited Two-Barrel engine with `block` after its identity.
fn with_block(block: &str) -> String {
    let text = std::fs::read_to_string(Path::new(env!("CARGO_MANIFEST_DIR")).join(LEGAL))
        .unwrap_or_default();
    text.replacen(
        "measured_by: \"Oona Fennick\"\n",
        &format!("measured_by: \"Oona Fennick\"\n{block}"),
        1,
    )
}

/// Loads `text` against the demo rulebook.
fn load(text: String) -> Inspection {
    let loaded = gonogo::commands::load_rulebook(Path::new(RULES));
    let rulebook = loaded.checked.unwrap_or_else(|| panic!("demo rulebook"));
    let mut sources = gonogo::source::SourceMap::default();
    gonogo::load::declaration_from_text(Path::new("inspected.yaml"), text, &rulebook, &mut sources)
        .unwrap_or_else(|p| panic!("{p:?}"))
        .inspection
}

#[test]
fn a_protest_loads_with_its_reference_scope_and_seals() {
    let inspection = load(with_block(
        "inspection:\n  reason: protest\n  reference: \"PR-27-11\"\n  scope: [\"5\", 6, \"6.2\"]\n  \
         seals:\n    found: [{number: \"S-04417\", at: \"intake, front left bolt\"}, \"S-04418\"]\n    \
         applied:\n      - {number: \"S-05120\"}\n",
    ));
    assert_eq!(
        inspection,
        Inspection {
            reason: Some(Reason::Protest),
            reference: Some("PR-27-11".to_string()),
            scope: Some(vec!["5".to_string(), "6".to_string(), "6.2".to_string()]),
            seals_found: vec![
                Seal {
                    number: "S-04417".to_string(),
                    place: Some("intake, front left bolt".to_string()),
                },
                Seal {
                    number: "S-04418".to_string(),
                    place: None,
                },
            ],
            seals_applied: vec![Seal {
                number: "S-05120".to_string(),
                place: None,
            }],
        }
    );
}

#[test]
fn every_reason_word_and_other_text_load() {
    let reason_of = |written: &str| {
        load(with_block(&format!(
            "inspection:\n  reason: {written}\n  reference: \"R-1\"\n"
        )))
        .reason
    };
    assert_eq!(reason_of("after-feature"), Some(Reason::AfterFeature));
    assert_eq!(reason_of("protest"), Some(Reason::Protest));
    assert_eq!(reason_of("claim"), Some(Reason::Claim));
    assert_eq!(reason_of("random-draw"), Some(Reason::RandomDraw));
    assert_eq!(
        reason_of("{other: \"steward's request\"}"),
        Some(Reason::Other("steward's request".to_string()))
    );
}

#[test]
fn a_declaration_without_the_block_is_a_full_inspection() {
    let text = std::fs::read_to_string(Path::new(env!("CARGO_MANIFEST_DIR")).join(LEGAL))
        .unwrap_or_default();
    assert_eq!(load(text), Inspection::default());
    assert_eq!(load(with_block("inspection:\n")), Inspection::default());
}

#[test]
fn the_binary_accepts_an_inspected_declaration() {
    let scratch = common::Scratch::new(
        "inspected.yaml",
        with_block("inspection: {reason: random-draw, scope: [\"8\"]}\n").as_bytes(),
    );
    let run = common::gonogo(&["check", "--rules", RULES, scratch.path()]);
    assert_eq!(run.code, 0, "{}", run.stderr);
}

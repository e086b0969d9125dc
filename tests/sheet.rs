//! `gonogo sheet`: snapshots of the Markdown sheet and the YAML template of every demo class,
//! and the promise that an unfilled template checks to "not checked" (exit 3), never exit 2.

use std::path::Path;

use gonogo::commands::check::{self, CheckFormat, CheckRequest};
use gonogo::commands::sheet::{self, SheetFormat};
use gonogo::exit::Exit;

const RULES: &str = "rulebooks-demo/tamsin-2027.rules";
const CLASSES: &[&str] = &["street_stock", "limited2", "open4"];

fn sheet_of(class: &str, format: SheetFormat) -> String {
    sheet::run(Path::new(RULES), class, format).unwrap_or_else(|e| panic!("{e}"))
}

#[test]
fn every_demo_class_has_both_sheets() {
    for class in CLASSES {
        insta::assert_snapshot!(
            format!("markdown_{class}"),
            sheet_of(class, SheetFormat::Markdown)
        );
        insta::assert_snapshot!(format!("yaml_{class}"), sheet_of(class, SheetFormat::Yaml));
        let html = sheet_of(class, SheetFormat::Html);
        assert!(
            !html.contains("http") && !html.contains("src="),
            "{class}: the HTML sheet refers outside itself"
        );
        insta::assert_snapshot!(format!("html_{class}"), html);
    }
}

#[test]
fn an_unfilled_template_checks_to_not_checked() {
    for class in CLASSES {
        let path = std::env::temp_dir().join(format!(
            "gonogo-{}-{class}-template.yaml",
            std::process::id()
        ));
        std::fs::write(&path, sheet_of(class, SheetFormat::Yaml)).unwrap_or_else(|e| panic!("{e}"));
        let declarations = [path.clone()];
        let request = CheckRequest {
            notes: None,
            rules: Path::new(RULES),
            class: None,
            role: None,
            format: CheckFormat::Json,
            declarations: &declarations,
            jobs: None,
            monte_carlo: None,
            produced: "2027-05-11T01:46:40Z".to_string(),
            sort: gonogo::commands::check::CheckSort::File,
            sections: None,
        };
        let result = check::run(&request);
        let _ = std::fs::remove_file(&path);
        let (json, exit) =
            result.unwrap_or_else(|e| panic!("{class}: the template was refused:\n{e}"));
        assert_eq!(exit, Exit::Uncertain, "{class}");
        let doc: serde_json::Value = serde_json::from_str(&json).unwrap_or_else(|e| panic!("{e}"));
        let rules = doc["engines"][0]["rules"]
            .as_array()
            .cloned()
            .unwrap_or_default();
        assert!(!rules.is_empty());
        // a rule that misses only optional measurements does not apply; every other is not
        // checked, and none is judged on an empty template
        assert!(
            rules.iter().all(|r| r["verdict"] == "not_checked"
                || (r["verdict"] == "not_applicable" && r["applies"] == "not_measured")),
            "{class}: a rule was judged on an empty template"
        );
        assert!(
            rules.iter().any(|r| r["verdict"] == "not_checked"),
            "{class}"
        );
    }
}

#[test]
fn the_sheet_lists_the_rules_a_measurement_feeds_through_derived_values() {
    // bore feeds the displacement rule 3.1 only through `engine.displacement`
    let md = sheet_of("limited2", SheetFormat::Markdown);
    let bore = md
        .lines()
        .find(|l| l.starts_with("| `bore`"))
        .unwrap_or_default();
    assert!(bore.ends_with("| 3.1, 3.2, 3.4 |"), "{bore}");
    assert!(
        bore.contains("8: ______"),
        "one box per cylinder, up to the 8 the schema allows"
    );
}

#[test]
fn each_cylinder_number_and_its_box_are_one_unbreakable_piece() {
    // a narrow cell may wrap between cylinders, never between a number and its box
    let html = sheet_of("limited2", SheetFormat::Html);
    assert!(html.contains(".cyl{display:inline-block;white-space:nowrap}"));
    for c in 1..=8 {
        let piece = format!("<span class=\"cyl\">{c} <span class=\"box\"></span></span>");
        assert!(
            html.contains(&piece),
            "cylinder {c} is not bound to its box"
        );
    }
    assert!(html.contains("Seals found") && html.contains("Seals applied"));
    let md = sheet_of("limited2", SheetFormat::Markdown);
    assert!(md.contains("Seals found ____") && md.contains("Inspector ____"));
}

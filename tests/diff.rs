//! `gonogo diff` on the two demo editions in every format, and on inputs that are not changes
//! (the same rulebook reformatted) or cannot be compared (two series).

use std::path::Path;

use gonogo::commands::diff;
use gonogo::report::diff::DiffFormat;

const OLD: &str = "rulebooks-demo/tamsin-2027.rules";
const NEW: &str = "rulebooks-demo/tamsin-2028.rules";

fn demo(format: DiffFormat) -> String {
    diff::run(Path::new(OLD), Path::new(NEW), None, format).unwrap_or_else(|e| panic!("{e}"))
}

#[test]
fn the_demo_editions_in_every_format() {
    insta::assert_snapshot!("text", demo(DiffFormat::Text));
    insta::assert_snapshot!("markdown", demo(DiffFormat::Markdown));
    insta::assert_snapshot!("json", demo(DiffFormat::Json));
}

#[test]
fn the_json_reports_each_kind_of_change() {
    let doc: serde_json::Value =
        serde_json::from_str(&demo(DiffFormat::Json)).unwrap_or_else(|e| panic!("{e}"));
    assert_eq!(doc["schema"], "gonogo.diff/1");
    let rules = doc["rules"].as_array().cloned().unwrap_or_default();
    let kind = |class: &str, section: &str| {
        rules
            .iter()
            .find(|r| r["class"] == class && r["section"] == section)
            .map(|r| r["change"].as_str().unwrap_or_default().to_string())
    };
    assert_eq!(kind("limited2", "3.1").as_deref(), Some("tightened"));
    assert_eq!(kind("limited2", "8.1").as_deref(), Some("loosened"));
    assert_eq!(kind("limited2", "3.5").as_deref(), Some("added"));
    assert_eq!(kind("limited2", "8.2").as_deref(), Some("changed"));
    assert_eq!(doc["measurements"][0]["name"], "rod.length");
    assert_eq!(doc["lists"][0]["added"][0], "\"TVC-390-2\"");
    // the tightened limit, in the old limit's unit
    let displacement = rules
        .iter()
        .find(|r| r["class"] == "limited2" && r["section"] == "3.1")
        .cloned()
        .unwrap_or_default();
    assert_eq!(displacement["unit"], "ci");
    assert_eq!(
        displacement["old_limit"][0]
            .as_f64()
            .map(|v| (v * 1e6).round() / 1e6),
        Some(365.0)
    );
    assert_eq!(
        displacement["new_limit"][0]
            .as_f64()
            .map(|v| (v * 1e6).round() / 1e6),
        Some(362.0)
    );
}

#[test]
fn reformatting_is_no_change() {
    let original = concat!(
        env!("CARGO_MANIFEST_DIR"),
        "/grammar/examples/classes-and-bulletins.rules"
    );
    let text = std::fs::read_to_string(original).unwrap_or_default();
    let (book, _) = gonogo::parse::parse_rulebook(0, &text);
    let mut canonical = gonogo::parse::print::canonical(&book);
    // reorder: put the last item first
    if let Some(at) = canonical.rfind("\nbulletin ") {
        let tail = canonical.split_off(at + 1);
        canonical = format!("{tail}\n{canonical}");
    }
    let path =
        std::env::temp_dir().join(format!("gonogo-{}-reformatted.rules", std::process::id()));
    std::fs::write(&path, canonical).unwrap_or_else(|e| panic!("{e}"));
    let result = diff::run(Path::new(original), &path, None, DiffFormat::Text);
    let _ = std::fs::remove_file(&path);
    let out = result.unwrap_or_else(|e| panic!("{e}"));
    assert!(out.trim_end().ends_with("no change"), "{out}");
}

#[test]
fn two_series_cannot_be_compared() {
    let e = diff::run(
        Path::new(OLD),
        Path::new("grammar/examples/minimal.rules"),
        None,
        DiffFormat::Text,
    )
    .err()
    .map(|e| e.to_string())
    .unwrap_or_default();
    assert!(e.contains("gonogo::diff::different-series"), "{e}");
}

//! `gonogo impact` on the demo field in every format, and its handling of unreadable files, an
//! empty folder and two series.

use std::path::{Path, PathBuf};

use gonogo::commands::impact;
use gonogo::report::impact::ImpactFormat;

const OLD: &str = "rulebooks-demo/tamsin-2027.rules";
const NEW: &str = "rulebooks-demo/tamsin-2028.rules";

fn run(named: &[PathBuf], format: ImpactFormat) -> Result<String, String> {
    impact::run(Path::new(OLD), Path::new(NEW), named, None, format).map_err(|e| e.to_string())
}

fn demo(format: ImpactFormat) -> String {
    run(&[PathBuf::from("engines-demo")], format).unwrap_or_else(|e| panic!("{e}"))
}

#[test]
fn the_demo_field_in_every_format() {
    insta::assert_snapshot!("text", demo(ImpactFormat::Text));
    insta::assert_snapshot!("markdown", demo(ImpactFormat::Markdown));
    insta::assert_snapshot!("json", demo(ImpactFormat::Json));
}

#[test]
fn the_raised_valve_lift_limit_changes_one_verdict() {
    let doc: serde_json::Value =
        serde_json::from_str(&demo(ImpactFormat::Json)).unwrap_or_else(|e| panic!("{e}"));
    assert_eq!(doc["schema"], "gonogo.impact/1");
    let changed = doc["changed"].as_array().cloned().unwrap_or_default();
    let lift = changed
        .iter()
        .find(|r| r["section"] == "5.3")
        .cloned()
        .unwrap_or_default();
    assert_eq!(lift["engine"], "TV-27-058");
    assert_eq!(
        (
            lift["old"]["verdict"].as_str(),
            lift["new"]["verdict"].as_str()
        ),
        (Some("illegal"), Some("legal"))
    );
    // 0.48525 in against 0.480 in, then against 0.490 in
    assert!((lift["old"]["margin"].as_f64().unwrap_or_default() + 0.00525).abs() < 1e-9);
    assert!((lift["new"]["margin"].as_f64().unwrap_or_default() - 0.00475).abs() < 1e-9);
}

#[test]
fn an_unreadable_file_is_listed_and_does_not_stop_the_run() {
    let dir = std::env::temp_dir().join(format!("gonogo-{}-field", std::process::id()));
    std::fs::create_dir_all(&dir).unwrap_or_else(|e| panic!("{e}"));
    let good = std::fs::read_to_string("engines-demo/limited2-legal.yaml").unwrap_or_default();
    std::fs::write(dir.join("good.yaml"), good).unwrap_or_else(|e| panic!("{e}"));
    std::fs::write(
        dir.join("bad.yaml"),
        "class: limited2\nmeasurements:\n  bore: \"76 cc\"\n",
    )
    .unwrap_or_else(|e| panic!("{e}"));
    let out = run(std::slice::from_ref(&dir), ImpactFormat::Text);
    let _ = std::fs::remove_dir_all(&dir);
    let out = out.unwrap_or_else(|e| panic!("{e}"));
    assert!(out.contains("on 1 engine ("), "{out}");
    assert!(out.contains("could not be compared"), "{out}");
    assert!(out.contains("bad.yaml"), "{out}");
}

#[test]
fn nothing_to_compare_is_exit_2() {
    let empty = run(&[PathBuf::from("grammar")], ImpactFormat::Text)
        .err()
        .map(|e| e.to_string())
        .unwrap_or_default();
    assert!(
        empty.contains("holds no `.yaml` or `.yml` declaration"),
        "{empty}"
    );
    let series = impact::run(
        Path::new(OLD),
        Path::new("grammar/examples/minimal.rules"),
        &[PathBuf::from("engines-demo")],
        None,
        ImpactFormat::Text,
    )
    .err()
    .map(|e| e.to_string())
    .unwrap_or_default();
    assert!(series.contains("different series"), "{series}");
}

#[test]
fn a_declaration_it_cannot_compare_is_listed_with_every_problem_and_where_it_is() {
    // the file's four mistakes, at the lines and columns its own snapshot shows
    let out = run(
        &[
            PathBuf::from("engines-demo/limited2-legal.yaml"),
            PathBuf::from("tests/bad-declarations/several-mistakes.yaml"),
        ],
        ImpactFormat::Text,
    )
    .unwrap_or_else(|e| panic!("{e}"));
    for expected in [
        "15:40 measurements.bore[3]",
        "(D22 wrong-dimension)",
        "17:3 measurements: `strok`",
        "29:16 measurements.gasket.bore",
        "33:17 measurements.cam.lobe_lift.instrument",
        "(D18 unknown-instrument)",
    ] {
        assert!(out.contains(expected), "`{expected}` missing from:\n{out}");
    }
}

//! `gonogo impact` on the demo field in every format, and its handling of unreadable files, an
//! empty folder and two series.

mod common;

use std::path::{Path, PathBuf};

use common::{Scratch, gonogo};

use gonogo::commands::impact;
use gonogo::commands::sides::SideRequest;
use gonogo::report::impact::ImpactFormat;

const OLD: &str = "rulebooks-demo/tamsin-2027.rules";
const NEW: &str = "rulebooks-demo/tamsin-2028.rules";

fn run(named: &[PathBuf], format: ImpactFormat) -> Result<String, String> {
    run_with(NEW, named, SideRequest::default(), format)
}

/// `impact` of the 2027 edition against `new`, with these dates and draft.
fn run_with(
    new: &str,
    named: &[PathBuf],
    sides: SideRequest,
    format: ImpactFormat,
) -> Result<String, String> {
    let request = impact::ImpactRequest {
        old: Path::new(OLD),
        new: Path::new(new),
        declarations: named,
        log: None,
        role: None,
        sides,
        all: false,
        format,
    };
    impact::run(&request).map_err(|e| e.to_string())
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
fn the_raised_valve_lift_limit_changes_one_verdict_against_the_2027_edition_as_published() {
    let published = SideRequest {
        old_on: Some("2027-03-06"),
        ..SideRequest::default()
    };
    let json = run_with(
        NEW,
        &[PathBuf::from("engines-demo")],
        published,
        ImpactFormat::Json,
    )
    .unwrap_or_else(|e| panic!("{e}"));
    let doc: serde_json::Value = serde_json::from_str(&json).unwrap_or_else(|e| panic!("{e}"));
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
    let series = run_with(
        "grammar/examples/minimal.rules",
        &[PathBuf::from("engines-demo")],
        SideRequest::default(),
        ImpactFormat::Text,
    )
    .err()
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

#[test]
fn against_the_2027_rules_with_their_bulletin_the_valve_lift_verdict_does_not_change() {
    // TVB-27-04 raised 5.3 to 0.490 in in June 2027, so 2028 (also 0.490 in) changes nothing
    // there; its rule 4.8 lapses, so 4.8 verdicts change to "not in the edition"
    let doc: serde_json::Value =
        serde_json::from_str(&demo(ImpactFormat::Json)).unwrap_or_else(|e| panic!("{e}"));
    let changed = doc["changed"].as_array().cloned().unwrap_or_default();
    assert!(
        !changed.iter().any(|r| r["section"] == "5.3"),
        "{changed:?}"
    );
    assert!(
        changed
            .iter()
            .any(|r| r["section"] == "4.8" && r["new"].is_null())
    );
}

const DRAFT: &str = r#"bulletin "TVB-27-09" "Draft: valve lift back to 0.480 in"
  effective 2027-08-02 amends limited2
  override rule 5.3 "Net valve lift"
    require net_lift <= 0.480 in
  end
end
"#;

#[test]
fn a_draft_bulletin_is_tried_on_the_field_before_it_is_issued() {
    let draft = Scratch::new("impact-draft.rules", DRAFT.as_bytes());
    let run = gonogo(&[
        "impact",
        OLD,
        OLD,
        "engines-demo",
        "--with-bulletin",
        draft.path(),
    ]);
    assert_eq!(run.code, 0, "{}", run.stderr);
    // the June bulletin is in force on both sides (taken on the draft's date); only the draft
    // differs. TV-27-058's net lift of 0.48525 in passes 0.490 in and fails 0.480 in.
    assert!(run.stdout.starts_with(
        "Tamsin Valley Stock Car Club: edition 2027 on 2027-08-02 → edition 2027 on 2027-08-02 with draft TVB-27-09"
    ), "{}", run.stdout);
    assert!(
        run.stdout
            .contains("newly illegal                      1 rule on 1 engine"),
        "{}",
        run.stdout
    );
    let became = run
        .stdout
        .split("became illegal")
        .nth(1)
        .unwrap_or_default();
    assert!(
        became.contains("TV-27-058  limited2  5.3 Net valve lift"),
        "{}",
        run.stdout
    );
    insta::assert_snapshot!("draft", run.stdout);
    let html = gonogo(&[
        "impact",
        OLD,
        OLD,
        "engines-demo",
        "--with-bulletin",
        draft.path(),
        "--format",
        "html",
    ]);
    assert!(
        html.stdout.starts_with("<!DOCTYPE html>"),
        "{}",
        html.stdout
    );
    assert!(
        html.stdout.contains("<td>TV-27-058</td>"),
        "{}",
        html.stdout
    );
    assert!(!html.stdout.contains("src=") && !html.stdout.contains("<script"));
}

#[test]
fn a_draft_must_hold_only_bulletins_and_be_in_force_on_the_new_date() {
    let class = Scratch::new("impact-not-draft.rules", b"class extra\nend\n");
    let run = gonogo(&[
        "impact",
        OLD,
        OLD,
        "engines-demo",
        "--with-bulletin",
        class.path(),
    ]);
    assert_eq!(run.code, 2);
    assert!(
        run.stderr.contains("A03 draft-not-bulletins"),
        "{}",
        run.stderr
    );
    let draft = Scratch::new("impact-late-draft.rules", DRAFT.as_bytes());
    let run = gonogo(&[
        "impact",
        OLD,
        OLD,
        "engines-demo",
        "--with-bulletin",
        draft.path(),
        "--new-on",
        "2027-07-01",
    ]);
    assert_eq!(run.code, 2);
    assert!(
        run.stderr.contains("A05 draft-not-in-force"),
        "{}",
        run.stderr
    );
    let run = gonogo(&["impact", OLD, NEW, "engines-demo", "--on", "2027-13-01"]);
    assert_eq!(run.code, 2);
    assert!(run.stderr.contains("A04 bad-date-option"), "{}", run.stderr);
}

#[test]
fn all_lists_every_changed_verdict() {
    let short = gonogo(&["impact", OLD, NEW, "engines-demo"]);
    let all = gonogo(&["impact", OLD, NEW, "engines-demo", "--all"]);
    // 32 changed verdicts: 16 engines of limited2 and open4, each gaining 3.5 and losing 4.8
    assert!(
        short
            .stdout
            .contains("32 other verdicts change, on 16 engines; --all lists every one"),
        "{}",
        short.stdout
    );
    let rows = all
        .stdout
        .split("every other verdict that changes")
        .nth(1)
        .unwrap_or_default();
    assert_eq!(
        rows.lines()
            .filter(|l| l.contains("4.8 Carburetor spacer"))
            .count(),
        16,
        "{}",
        all.stdout
    );
}

//! `gonogo diff` on the two demo editions in every format, and on inputs that are not changes
//! (the same rulebook reformatted) or cannot be compared (two series).

use std::path::Path;

use gonogo::commands::diff;
use gonogo::commands::sides::SideRequest;
use gonogo::report::diff::DiffFormat;

const OLD: &str = "rulebooks-demo/tamsin-2027.rules";
const NEW: &str = "rulebooks-demo/tamsin-2028.rules";

fn demo(format: DiffFormat) -> String {
    diff::run(
        Path::new(OLD),
        Path::new(NEW),
        None,
        SideRequest::default(),
        format,
    )
    .unwrap_or_else(|e| panic!("{e}"))
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
    let result = diff::run(
        Path::new(original),
        &path,
        None,
        SideRequest::default(),
        DiffFormat::Text,
    );
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
        SideRequest::default(),
        DiffFormat::Text,
    )
    .err()
    .map(|e| e.to_string())
    .unwrap_or_default();
    assert!(e.contains("A01 different-series"), "{e}");
}

/// `gonogo diff` in text of two one-class rulebooks whose rules are given, in order.
fn diff_of(old_rules: &[&str], new_rules: &[&str]) -> String {
    let book = |edition: &str, rules: &[&str]| {
        let mut text = format!(
            "series \"Tamsin Valley Stock Car Club\"\nedition \"{edition}\" effective {edition}-03-01\n\
             decision guarded rejection\n\
             measure bore: length per cylinder range 3.5 in to 4.5 in \"Bore gauge\"\n\
             measure car.weight: mass range 2000 lb to 4000 lb \"Scale\"\n\
             class hobby \"Hobby\"\n"
        );
        for (i, r) in rules.iter().enumerate() {
            text.push_str(&format!(
                "  rule 1.{} \"Rule {}\"\n    require {r}\n  end\n",
                i + 1,
                i + 1
            ));
        }
        text.push_str("end\n");
        static NEXT: std::sync::atomic::AtomicUsize = std::sync::atomic::AtomicUsize::new(0);
        let n = NEXT.fetch_add(1, std::sync::atomic::Ordering::Relaxed);
        let path =
            std::env::temp_dir().join(format!("gonogo-{}-{edition}-{n}.rules", std::process::id()));
        std::fs::write(&path, text).unwrap_or_else(|e| panic!("{e}"));
        path
    };
    let (old, new) = (book("2027", old_rules), book("2028", new_rules));
    let result = diff::run(&old, &new, None, SideRequest::default(), DiffFormat::Text);
    let _ = std::fs::remove_file(&old);
    let _ = std::fs::remove_file(&new);
    result.unwrap_or_else(|e| panic!("{e}"))
}

#[test]
fn a_limit_written_the_other_way_round_is_tightened_or_loosened_by_value() {
    let out = diff_of(
        &[
            "4.030 in >= max(bore)",
            "4.030 in >= max(bore)",
            "max(bore) <= 4.030 in",
            "3000 lb <= car.weight",
        ],
        &[
            "4.020 in >= max(bore)",
            "4.040 in >= max(bore)",
            "4.020 in >= max(bore)",
            "2950 lb <= car.weight",
        ],
    );
    assert!(
        out.contains("1.1 Rule 1: tightened, limit 4.03 in → 4.02 in"),
        "{out}"
    );
    assert!(
        out.contains("1.2 Rule 2: loosened, limit 4.03 in → 4.04 in"),
        "{out}"
    );
    // one way of writing to the other
    assert!(
        out.contains("1.3 Rule 3: tightened, limit 4.03 in → 4.02 in"),
        "{out}"
    );
    assert!(
        out.contains("1.4 Rule 4: loosened, limit 3000 lb → 2950 lb"),
        "{out}"
    );
    assert!(!out.contains("requirement changed"), "{out}");
}

#[test]
fn the_same_limit_written_the_other_way_round_is_no_change() {
    let out = diff_of(
        &["max(bore) <= 4.030 in", "car.weight >= 3000 lb"],
        &["4.030 in >= max(bore)", "3000 lb <= car.weight"],
    );
    assert!(out.trim_end().ends_with("no change"), "{out}");
}

#[test]
fn a_limit_that_now_excludes_its_value_is_tightened() {
    let out = diff_of(&["max(bore) <= 4.030 in"], &["max(bore) < 4.030 in"]);
    assert!(out.contains("1.1 Rule 1: tightened"), "{out}");
}

#[test]
fn a_rule_whose_decision_rule_changed_is_reported() {
    // 1.1 drops its own simple acceptance (the rulebook's guarded rejection decides it now),
    // 1.2 takes one, 1.3 keeps its own and 1.4 writes out the rulebook's own: no change there
    let simple = "car.weight >= 3000 lb\n    decision simple acceptance";
    let guarded = "car.weight >= 3000 lb\n    decision guarded rejection";
    let plain = "car.weight >= 3000 lb";
    let out = diff_of(
        &[simple, plain, simple, plain],
        &[plain, simple, simple, guarded],
    );
    assert!(
        out.contains("1.1 Rule 1: changed (decision changed)"),
        "{out}"
    );
    assert!(
        out.contains(
            "decided by simple acceptance, this rule's own → guarded rejection, the rulebook's"
        ),
        "{out}"
    );
    assert!(
        out.contains("1.2 Rule 2: changed (decision changed)"),
        "{out}"
    );
    assert!(
        out.contains(
            "decided by guarded rejection, the rulebook's → simple acceptance, this rule's own"
        ),
        "{out}"
    );
    assert!(!out.contains("1.3 Rule 3"), "{out}");
    assert!(!out.contains("1.4 Rule 4"), "{out}");
}

#[test]
fn the_2027_to_2028_diff_names_what_tvb_27_04_did_and_what_lapses() {
    let doc: serde_json::Value =
        serde_json::from_str(&demo(DiffFormat::Json)).unwrap_or_else(|e| panic!("{e}"));
    assert_eq!(doc["old_side"], "every bulletin");
    let rules = doc["rules"].as_array().cloned().unwrap_or_default();
    let limited2 = |section: &str| {
        rules
            .iter()
            .find(|r| r["class"] == "limited2" && r["section"] == section)
            .cloned()
    };
    // 5.3 was already 0.490 in under TVB-27-04: not a change of edition in limited2
    assert!(limited2("5.3").is_none(), "{rules:?}");
    let lapsed = limited2("4.8").unwrap_or_default();
    assert_eq!(
        (lapsed["change"].as_str(), lapsed["lapses"].as_str()),
        (Some("dropped"), Some("TVB-27-04"))
    );
    let steps = doc["bulletin_steps"]
        .as_array()
        .cloned()
        .unwrap_or_default();
    let step = steps
        .iter()
        .find(|s| s["class"] == "limited2")
        .cloned()
        .unwrap_or_default();
    assert_eq!(step["bulletins"][0], "TVB-27-04");
    assert_eq!(step["effective"], "2027-06-14");
    let lift = step["rules"].as_array().cloned().unwrap_or_default();
    let lift = lift
        .iter()
        .find(|r| r["section"] == "5.3")
        .cloned()
        .unwrap_or_default();
    assert_eq!(lift["change"], "loosened");
    assert_eq!(
        (lift["old_limit"][0].as_f64(), lift["new_limit"][0].as_f64()),
        (Some(0.48), Some(0.49))
    );
}

#[test]
fn one_edition_on_two_dates_shows_the_bulletins_between() {
    let before_and_after = SideRequest {
        old_on: Some("2027-06-01"),
        new_on: Some("2027-07-01"),
        draft: None,
    };
    let out = diff::run(
        Path::new(OLD),
        Path::new(OLD),
        None,
        before_and_after,
        DiffFormat::Text,
    )
    .unwrap_or_else(|e| panic!("{e}"));
    assert!(
        out.contains("bulletin TVB-27-04 of edition 2027, in force from 2027-06-14"),
        "{out}"
    );
    assert!(
        out.contains("5.3 Net valve lift: loosened, limit 0.48 in → 0.49 in"),
        "{out}"
    );
    let same_day = SideRequest {
        old_on: Some("2027-07-01"),
        new_on: Some("2027-07-01"),
        draft: None,
    };
    let out = diff::run(
        Path::new(OLD),
        Path::new(OLD),
        None,
        same_day,
        DiffFormat::Text,
    )
    .unwrap_or_else(|e| panic!("{e}"));
    assert!(out.trim_end().ends_with("no change"), "{out}");
}

#[test]
fn a_draft_bulletin_is_shown_as_what_it_would_change() {
    let draft =
        std::env::temp_dir().join(format!("gonogo-{}-diff-draft.rules", std::process::id()));
    let text = "bulletin \"TVB-27-09\" \"Draft\"\n  effective 2027-08-02 amends limited2\n  override rule 5.3 \"Net valve lift\"\n    require net_lift <= 0.480 in\n  end\nend\n";
    std::fs::write(&draft, text).unwrap_or_else(|e| panic!("{e}"));
    let request = SideRequest {
        draft: Some(&draft),
        ..SideRequest::default()
    };
    let out = diff::run(
        Path::new(OLD),
        Path::new(OLD),
        None,
        request,
        DiffFormat::Text,
    );
    let _ = std::fs::remove_file(&draft);
    let out = out.unwrap_or_else(|e| panic!("{e}"));
    // only the draft differs: TVB-27-04 (June) is in force on both sides on the draft's date
    assert!(!out.contains("TVB-27-04 of edition"), "{out}");
    let limited2 = out.split("class limited2").nth(1).unwrap_or_default();
    assert!(limited2.contains(
        "bulletin TVB-27-09 (draft) of edition 2027, in force from 2027-08-02\n    5.3 Net valve lift: tightened, limit 0.49 in → 0.48 in"
    ), "{out}");
}

/// A small edition whose one parts list is written with `entries`, `ignoring case` or not.
fn heads_edition(folder: &Path, name: &str, ignoring: &str, entries: &str) -> std::path::PathBuf {
    let text = format!(
        "series \"Tamsin Valley\"\nedition \"{name}\" effective 2027-01-01\ndecision guarded rejection\n\
         measure head.casting: text \"Casting number between the centre ports\"\n\
         approved list heads \"Approved heads\"{ignoring}\n  {entries}\nend\n\
         class hobby \"Hobby\"\n  rule 5.1 \"Approved heads\"\n    require head.casting in heads\n  end\nend\n"
    );
    let path = folder.join(format!("{name}.rules"));
    std::fs::write(&path, text).unwrap_or_else(|e| panic!("{e}"));
    path
}

#[test]
fn a_list_that_starts_ignoring_case_is_a_change_and_case_variants_are_not_entries() {
    let folder = std::env::temp_dir().join(format!("gonogo-diff-case-{}", std::process::id()));
    std::fs::create_dir_all(&folder).unwrap_or_else(|e| panic!("{e}"));
    let strict = heads_edition(&folder, "a", "", "\"TVH-2204\"");
    let blind = heads_edition(&folder, "b", " ignoring case", "\"TVH-2204\"");
    let blind_lower = heads_edition(&folder, "c", " ignoring case", "\"tvh-2204\"");
    let run = |old: &Path, new: &Path, format| {
        diff::run(old, new, None, SideRequest::default(), format).unwrap_or_else(|e| panic!("{e}"))
    };
    let text = run(&strict, &blind, DiffFormat::Text);
    let json: serde_json::Value =
        serde_json::from_str(&run(&strict, &blind, DiffFormat::Json)).unwrap_or_default();
    let back: serde_json::Value =
        serde_json::from_str(&run(&blind, &strict, DiffFormat::Json)).unwrap_or_default();
    // both ignore case: the same entry written in another case is no change at all
    let same: serde_json::Value =
        serde_json::from_str(&run(&blind, &blind_lower, DiffFormat::Json)).unwrap_or_default();
    let _ = std::fs::remove_dir_all(&folder);
    assert!(text.contains("now ignoring case"), "{text}");
    assert_eq!(
        json["lists"][0]["ignoring_case"],
        serde_json::json!({"old": false, "new": true})
    );
    assert_eq!(json["lists"][0]["added"], serde_json::json!([]));
    assert_eq!(back["lists"][0]["ignoring_case"]["new"], false);
    assert_eq!(same["lists"], serde_json::json!([]));
}

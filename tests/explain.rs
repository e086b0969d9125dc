//! `gonogo explain`: every section number of both demo editions explains, and the 2027 demo's
//! explanations are snapshotted.

use std::path::Path;

use gonogo::commands::explain;
use gonogo::commands::load_rulebook;

fn sections(rules: &str) -> Vec<String> {
    let loaded = load_rulebook(Path::new(rules));
    let rulebook = loaded
        .checked
        .unwrap_or_else(|| panic!("{rules} does not check"));
    let mut all: Vec<String> = rulebook
        .classes
        .iter()
        .flat_map(|c| {
            c.rules
                .iter()
                .chain(c.amended.iter().flat_map(|a| a.rules.iter()))
        })
        .map(|r| r.rule.section.text.clone())
        .collect();
    all.sort();
    all.dedup();
    all
}

#[test]
fn every_section_of_both_editions_explains() {
    for rules in [
        "rulebooks-demo/tamsin-2027.rules",
        "rulebooks-demo/tamsin-2028.rules",
    ] {
        let all = sections(rules);
        assert!(all.len() >= 20, "{rules}: only {} sections", all.len());
        for section in all {
            let text = explain::run(Path::new(rules), None, &section)
                .unwrap_or_else(|e| panic!("{rules} {section}: {e}"));
            assert!(text.starts_with(&format!("{section} \"")), "{text}");
        }
    }
}

#[test]
fn explanations_of_the_2027_demo() {
    let rules = "rulebooks-demo/tamsin-2027.rules";
    let all: Vec<String> = sections(rules)
        .iter()
        .map(|s| explain::run(Path::new(rules), None, s).unwrap_or_default())
        .collect();
    insta::assert_snapshot!(all.join("\n----\n"));
}

#[test]
fn a_class_shows_the_rule_as_inherited_or_overridden() {
    let rules = Path::new("rulebooks-demo/tamsin-2027.rules");
    let inherited = explain::run(rules, Some("open4"), "3.4").unwrap_or_default();
    assert!(
        inherited.contains("inherited from class limited2"),
        "{inherited}"
    );
    let overridden = explain::run(rules, Some("open4"), "3.2").unwrap_or_default();
    assert!(
        overridden.contains("overridden in class open4"),
        "{overridden}"
    );
    assert!(overridden.contains("(so at most 4.065 in)"), "{overridden}");
}

#[test]
fn an_unknown_section_is_an_error() {
    let e = explain::run(
        Path::new("rulebooks-demo/tamsin-2027.rules"),
        Some("limited2"),
        "99.9",
    )
    .err()
    .map(|e| e.to_string())
    .unwrap_or_default();
    assert!(e.contains("class `limited2` has no rule 99.9"), "{e}");
}

/// The `requires` line of rule 2.1 of a one-rule rulebook with the requirement given.
fn requires_line(require: &str) -> String {
    static NEXT: std::sync::atomic::AtomicUsize = std::sync::atomic::AtomicUsize::new(0);
    let n = NEXT.fetch_add(1, std::sync::atomic::Ordering::Relaxed);
    let text = format!(
        "series \"Tamsin Valley Stock Car Club\"\nedition \"2027\" effective 2027-03-01\n\
         decision guarded rejection\n\
         measure bore: length per cylinder range 3.5 in to 4.5 in \"Bore gauge\"\n\
         measure car.weight: mass range 2000 lb to 4000 lb \"Scale\"\n\
         class hobby \"Hobby\"\n  rule 2.1 \"Rule\"\n    require {require}\n  end\nend\n"
    );
    let path =
        std::env::temp_dir().join(format!("gonogo-{}-explain-{n}.rules", std::process::id()));
    std::fs::write(&path, text).unwrap_or_else(|e| panic!("{e}"));
    let out = explain::run(&path, None, "2.1");
    let _ = std::fs::remove_file(&path);
    let out = out.unwrap_or_else(|e| panic!("{e}"));
    out.lines()
        .find(|l| l.trim_start().starts_with("requires"))
        .unwrap_or_default()
        .trim()
        .to_string()
}

#[test]
fn a_limit_written_first_reads_subject_first() {
    // written either way, the same words, with the per-cylinder note and the sum of the
    // allowance (4.030 in + 0.005 in)
    let expected = "requires   on every cylinder, bore at most 4.030 in, with a written allowance of 0.005 in (so at most 4.035 in)";
    assert_eq!(
        requires_line("bore <= 4.030 in allowing 0.005 in"),
        expected
    );
    assert_eq!(
        requires_line("4.030 in >= bore allowing 0.005 in"),
        expected
    );
    assert_eq!(
        requires_line("3000 lb < car.weight"),
        "requires   car.weight above 3000 lb"
    );
}

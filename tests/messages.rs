//! Messages in the user's terms (issue 10): each case the issue names, run through the binary,
//! says what was wrong in words a builder or an official uses, with plurals right.

mod common;

use common::{Scratch, gonogo};

const RULES: &str = "rulebooks-demo/tamsin-2027.rules";
const NEXT: &str = "rulebooks-demo/tamsin-2028.rules";
const LEGAL: &str = "engines-demo/limited2-legal.yaml";

#[test]
fn one_engine_is_counted_in_the_singular() {
    let run = gonogo(&["impact", RULES, NEXT, LEGAL]);
    assert_eq!(run.code, 0, "{}", run.stderr);
    assert!(run.stdout.contains("on 1 engine ("), "{}", run.stdout);
    let two = gonogo(&[
        "impact",
        RULES,
        NEXT,
        LEGAL,
        "engines-demo/open4-legal.yaml",
    ]);
    assert!(two.stdout.contains("on 2 engines ("), "{}", two.stdout);
}

#[test]
fn a_field_summary_counts_its_engines() {
    let run = gonogo(&[
        "check",
        "--rules",
        RULES,
        LEGAL,
        "engines-demo/open4-legal.yaml",
    ]);
    assert!(
        run.stdout
            .lines()
            .any(|l| l.starts_with("2 engines: 2 legal")),
        "{}",
        run.stdout
    );
}

#[test]
fn a_section_no_class_has_is_worded_as_a_sentence() {
    let run = gonogo(&["explain", "--rules", RULES, "99"]);
    assert_eq!(run.code, 2, "{}", run.stdout);
    assert!(
        run.stderr
            .contains("no class of this rulebook has a rule 99"),
        "{}",
        run.stderr
    );
    assert!(!run.stderr.contains("any class"), "{}", run.stderr);
}

#[test]
fn a_declaration_that_is_not_utf8_names_the_line_and_column_of_its_bad_byte() {
    let text = std::fs::read_to_string(LEGAL).unwrap_or_default();
    // "Oona Fennick" sits on line 8 of the demo declaration, after `measured_by: "`
    let bad = text.replacen("Oona", "O\u{1}ona", 1).into_bytes();
    let bad: Vec<u8> = bad
        .into_iter()
        .map(|b| if b == 1 { 0xe9 } else { b })
        .collect();
    let file = Scratch::new("latin1.yaml", &bad);
    let run = gonogo(&["check", "--rules", RULES, file.path()]);
    assert_eq!(run.code, 2, "{}", run.stdout);
    assert!(
        run.stderr
            .contains("is not UTF-8 text: line 8, column 16 holds the byte 0xE9"),
        "{}",
        run.stderr
    );
    assert!(!run.stderr.contains("offset"), "{}", run.stderr);
}

#[test]
fn a_value_of_a_hundred_thousand_characters_gives_a_short_message() {
    let text = std::fs::read_to_string(LEGAL).unwrap_or_default();
    let long_unit = format!("car.weight: \"3080 l{}\"", "b".repeat(100_000));
    let file = Scratch::new(
        "long-unit.yaml",
        text.replace("car.weight: \"3080 lb\"", &long_unit)
            .as_bytes(),
    );
    let run = gonogo(&["check", "--rules", RULES, file.path()]);
    assert_eq!(run.code, 2, "{}", run.stdout);
    assert!(run.stderr.contains("D20 unknown-unit"), "{}", run.stderr);
    assert!(run.stderr.len() < 2_000, "{} bytes", run.stderr.len());
}

#[test]
fn a_loop_of_ten_thousand_classes_is_named_by_its_first_few() {
    let mut text = String::from(
        "series \"Tamsin Valley Stock Car Club\"\nedition \"2027\" effective 2027-03-06\n\
         decision guarded rejection\nmeasure stroke: length \"Dial indicator\"\n",
    );
    for i in 0..10_000 {
        text.push_str(&format!(
            "class c{i} \"Loop\" extends c{}\nend\n",
            (i + 1) % 10_000
        ));
    }
    let file = Scratch::new("loop.rules", text.as_bytes());
    let run = gonogo(&["lint", file.path()]);
    // lint exits 1 when it found errors (2 only when it could not run)
    assert_eq!(run.code, 1, "{}", run.stdout);
    let all = format!("{}{}", run.stdout, run.stderr);
    assert!(all.contains("C26 extends-cycle"), "{all}");
    assert!(all.contains("… and 9989 more"), "{all}");
    assert!(all.len() < 3_000, "{} bytes", all.len());
}

#[test]
fn impact_finds_a_declarations_class_as_check_does() {
    let text = std::fs::read_to_string(LEGAL).unwrap_or_default();
    let no_class = Scratch::new(
        "no-class.yaml",
        text.replace("class: limited2\n", "").as_bytes(),
    );
    let check = gonogo(&["check", "--rules", RULES, no_class.path()]);
    assert!(check.stderr.contains("names no class"), "{}", check.stderr);
    let impact = gonogo(&["impact", RULES, NEXT, no_class.path(), LEGAL]);
    assert_eq!(impact.code, 0, "{}", impact.stderr);
    assert!(
        impact.stdout.contains("names no class (D25 no-class)"),
        "{}",
        impact.stdout
    );
}

#[test]
fn a_declaration_error_on_a_line_of_a_hundred_thousand_characters_echoes_a_window() {
    let text = std::fs::read_to_string(LEGAL).unwrap_or_default();
    // the bad value (a list for a single value) stands after 100,000 spaces
    let padded = format!("lifter.kind: {}[\"flat\"]", " ".repeat(100_000));
    let file = Scratch::new(
        "long-line.yaml",
        text.replace("lifter.kind: \"flat hydraulic\"", &padded)
            .as_bytes(),
    );
    let run = gonogo(&["check", "--rules", RULES, file.path()]);
    assert_eq!(run.code, 2, "{}", run.stdout);
    assert!(run.stderr.contains("D11 not-a-list"), "{}", run.stderr);
    assert!(run.stderr.contains(":42:100016]"), "{}", run.stderr);
    assert!(run.stderr.len() < 2_000, "{} bytes", run.stderr.len());
}

#[test]
fn lint_shows_at_most_a_hundred_problems_errors_first_and_counts_the_rest() {
    // issue 10: 2,000 errors printed 710 KB. 150 unused defines (warnings) come before one
    // error in the file; the error must still be shown, and the rest counted
    let mut text = String::from(
        "series \"Tamsin Valley Stock Car Club\"\nedition \"2027\" effective 2027-03-06\n\
         decision guarded rejection\nmeasure stroke: length \"Dial indicator\"\n",
    );
    for i in 0..150 {
        text.push_str(&format!("define d{i} = stroke * 2\n"));
    }
    text.push_str("class a \"A\"\n  rule 1 \"S\" require stroke <= 4 cc end\nend\n");
    let file = Scratch::new("many-warnings.rules", text.as_bytes());
    let run = gonogo(&["lint", file.path()]);
    assert_eq!(run.code, 1, "{}", run.stdout);
    let all = format!("{}{}", run.stdout, run.stderr);
    assert!(all.contains("C17 dimension-mismatch"), "{all}");
    assert!(all.contains("… and 51 more problems not shown"), "{all}");
    assert_eq!(all.matches("C57 unused-define").count(), 99, "{all}");
    assert!(all.contains("(1 error, 150 warnings)"), "{all}");
}

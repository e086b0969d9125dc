//! Inputs at the size of the limits that hold while reading, through the binary: each is
//! generated here, at full size where the refusal is cheap, and the test checks the
//! diagnostic (never the time: performance is measured by hand, see DEVELOPERS.md).

mod common;

use std::fmt::Write as _;
use std::path::PathBuf;

use common::gonogo;

/// `MAX_FLOW_DEPTH` of `gonogo::load::depth`.
const MAX_FLOW_DEPTH: usize = 64;

const RULES: &str = "rulebooks-demo/tamsin-2027.rules";

/// A file of its own under the system's temporary folder, removed when dropped.
struct Scratch(PathBuf);

impl Scratch {
    fn new(name: &str, text: &str) -> Scratch {
        let path =
            std::env::temp_dir().join(format!("gonogo-limits-input-{}-{name}", std::process::id()));
        std::fs::write(&path, text).unwrap_or_else(|e| panic!("{}: {e}", path.display()));
        Scratch(path)
    }

    fn path(&self) -> &str {
        self.0.to_str().unwrap_or_default()
    }
}

impl Drop for Scratch {
    fn drop(&mut self) {
        let _ = std::fs::remove_file(&self.0);
    }
}

/// A declaration of the demo's Limited class whose bore is `bore`, written on line 9.
fn declaration(bore: &str) -> String {
    format!(
        "engine: \"TV-27-091\"\ncar: \"91\"\nclass: limited2\nevent: \"Odenmoor Oval, round 2\"\n\
date: \"2027-06-12\"\nmeasured_by: \"Oona Fennick\"\nmeasurements:\n  cylinders: 8\n  bore: {bore}\n"
    )
}

#[test]
fn a_hundred_thousand_nested_brackets_are_refused_at_the_first_past_the_cap() {
    let n = 100_000;
    let text = declaration(&format!("{}{}", "[".repeat(n), "]".repeat(n)));
    let file = Scratch::new("nested.yaml", &text);
    let run = gonogo(&["check", "--rules", RULES, file.path()]);
    assert_eq!(run.code, 2, "{}{}", run.stdout, run.stderr);
    assert!(run.stderr.contains("D31 too-deep"), "{}", run.stderr);
    assert!(
        run.stderr.contains("brackets are nested more than 64 deep"),
        "{}",
        run.stderr
    );
    // `  bore: ` is 8 characters, so bracket 65 stands at column 8 + 65
    let at = format!("nested.yaml:9:{}]", 8 + MAX_FLOW_DEPTH + 1);
    assert!(run.stderr.contains(&at), "no `{at}` in {}", run.stderr);
    assert_eq!(run.stderr.matches("D31").count(), 1, "{}", run.stderr);
    assert!(run.stderr.len() < 3_000, "{} bytes", run.stderr.len());
}

#[test]
fn braces_nested_past_the_cap_are_refused_and_at_the_cap_are_read_by_the_parser() {
    let n = MAX_FLOW_DEPTH + 1;
    let deep = declaration(&format!(
        "{}\"4.030 in\"{}",
        "{a: ".repeat(n),
        "}".repeat(n)
    ));
    let file = Scratch::new("braces.yaml", &deep);
    let run = gonogo(&["check", "--rules", RULES, file.path()]);
    assert_eq!(run.code, 2, "{}", run.stderr);
    assert!(run.stderr.contains("D31 too-deep"), "{}", run.stderr);
    // one level less is the parser's to read: wrong for a bore, but not too deep
    let n = MAX_FLOW_DEPTH;
    let within = declaration(&format!("{}\"4.030 in\"{}", "[".repeat(n), "]".repeat(n)));
    let file = Scratch::new("within.yaml", &within);
    let run = gonogo(&["check", "--rules", RULES, file.path()]);
    assert_eq!(run.code, 2, "{}", run.stderr);
    assert!(!run.stderr.contains("D31"), "{}", run.stderr);
}

#[test]
fn brackets_inside_strings_and_comments_are_not_nesting() {
    let many = "[".repeat(1_000);
    let mut text = declaration(&format!(
        "{{values: [\"4.0302 in\", \"4.0305 in\", \"4.0301 in\", \"4.0306 in\", \"4.0303 in\", \"4.0304 in\", \"4.0302 in\", \"4.0305 in\"]}} # {many}"
    ));
    let _ = writeln!(text, "# {many}\n  head.casting: \"{many}\"");
    let file = Scratch::new("strings.yaml", &text);
    let run = gonogo(&["check", "--rules", RULES, file.path()]);
    assert!(!run.stderr.contains("D31"), "{}", run.stderr);
    // the declaration reads, and is checked (the measurements it lacks are not checked)
    assert!(
        run.stdout.contains("result: ILLEGAL"),
        "{}{}",
        run.stdout,
        run.stderr
    );
}

/// `MAX_DEFINE_DEPTH` of `gonogo::check`.
const MAX_DEFINE_DEPTH: usize = 64;

const HEADER: &str = "series \"Tamsin Valley Stock Car Club\"\n\
edition \"2027\" effective 2027-04-01\n\
decision guarded rejection\n\
measure bore: length per cylinder \"Bore gauge\"\n";

/// `n` derived values, `d(i)` read by `d(i + 1)` and the last by the one rule; written from
/// the first or, `reversed`, from the last.
fn define_chain(n: usize, reversed: bool) -> String {
    let mut lines: Vec<String> = (1..n)
        .map(|i| format!("define d{i} = d{} + 0.001 in", i - 1))
        .collect();
    lines.insert(0, "define d0 = max(bore)".to_string());
    if reversed {
        lines.reverse();
    }
    format!(
        "{HEADER}{}\nclass hobby \"Hobby\"\n  rule 1 \"Bore\"\n    require d{} <= 4.1 in\n  end\nend\n",
        lines.join("\n"),
        n - 1
    )
}

#[test]
fn a_long_chain_of_defines_is_refused_once_in_either_order() {
    for reversed in [false, true] {
        let file = Scratch::new("chain.rules", &define_chain(20_000, reversed));
        let run = gonogo(&["lint", file.path()]);
        assert_eq!(run.code, 1, "{}", run.stdout);
        assert_eq!(
            run.stdout.matches("C61 define-too-deep").count(),
            1,
            "{}",
            run.stdout
        );
        // d0 stands 1 deep, so d64 is the first past the cap
        let first = format!("`d{MAX_DEFINE_DEPTH}` is derived through a chain of 65 definitions");
        assert!(run.stdout.contains(&first), "{}", run.stdout);
        assert!(
            run.stdout.contains("(1 error, 0 warnings)"),
            "{}",
            run.stdout
        );
    }
}

#[test]
fn a_chain_of_defines_at_the_cap_is_checked_whole() {
    let file = Scratch::new("chain-within.rules", &define_chain(MAX_DEFINE_DEPTH, true));
    let run = gonogo(&["lint", file.path()]);
    assert_eq!(run.code, 0, "{}", run.stdout);
    assert!(
        run.stdout.contains("ok (0 errors, 0 warnings)"),
        "{}",
        run.stdout
    );
}

/// `MAX_RULES` of `gonogo::check`: rules in every class together, inherited ones counted.
const MAX_RULES: usize = 25_000;

/// A class `big` of `rules` rules and `siblings` classes that extend it and add none.
fn wide_classes(rules: usize, siblings: usize) -> String {
    let mut text = format!("{HEADER}class big \"Big\"\n");
    for i in 1..=rules {
        let _ = writeln!(
            text,
            "  rule {i} \"Bore {i}\"\n    require max(bore) <= {}.1 in\n  end",
            4 + i % 3
        );
    }
    text.push_str("end\n");
    for i in 1..=siblings {
        let _ = writeln!(text, "class s{i} \"Sibling {i}\" extends big\nend");
    }
    text
}

#[test]
fn rules_written_past_the_cap_are_refused_at_the_first_past_it() {
    let file = Scratch::new("many-rules.rules", &wide_classes(MAX_RULES + 1, 0));
    let run = gonogo(&["lint", file.path()]);
    assert_eq!(run.code, 1, "{}", run.stdout);
    assert_eq!(
        run.stdout.matches("C64 too-many-rules").count(),
        1,
        "{}",
        run.stdout
    );
    assert!(
        run.stdout
            .contains("the rulebook's classes and bulletins hold more than 25000 rules"),
        "{}",
        run.stdout
    );
    // each rule takes three lines after the header's four and the class line
    let at = format!("many-rules.rules:{}:", 4 + 1 + 3 * MAX_RULES + 1);
    assert!(run.stdout.contains(&at), "no `{at}` in {}", run.stdout);
    assert!(
        run.stdout.contains("(1 error, 0 warnings)"),
        "{}",
        run.stdout
    );
}

#[test]
fn classes_extending_a_large_one_are_counted_with_what_they_inherit() {
    // 1,000 rules and 24 classes inheriting them: 25,000 rules, at the cap
    let file = Scratch::new("wide-within.rules", &wide_classes(1_000, 24));
    let run = gonogo(&["lint", file.path()]);
    assert_eq!(run.code, 0, "{}", run.stdout);
    // one class more passes it, at that class
    let file = Scratch::new("wide-past.rules", &wide_classes(1_000, 25));
    let run = gonogo(&["lint", file.path()]);
    assert_eq!(run.code, 1, "{}", run.stdout);
    assert_eq!(
        run.stdout.matches("C64 too-many-rules").count(),
        1,
        "{}",
        run.stdout
    );
    assert!(
        run.stdout
            .contains("with `s25`, the classes hold more than 25000 rules"),
        "{}",
        run.stdout
    );
}

#[test]
fn a_declaration_with_a_byte_order_mark_reads_as_without_one() {
    let path = "engines-demo/limited2-legal.yaml";
    let text = std::fs::read_to_string(path).unwrap_or_else(|e| panic!("{path}: {e}"));
    let plain = gonogo(&["check", "--rules", RULES, path]);
    let file = Scratch::new("bom.yaml", &format!("\u{feff}{text}"));
    let marked = gonogo(&["check", "--rules", RULES, file.path()]);
    assert_eq!(marked.code, plain.code, "{}", marked.stderr);
    assert!(
        marked.stdout.contains("result: LEGAL"),
        "{}{}",
        marked.stdout,
        marked.stderr
    );
    // past the header, whose declaration fingerprint differs: the bytes differ by the mark
    let verdicts = |out: &str| out.lines().skip(8).map(str::to_string).collect::<Vec<_>>();
    assert_eq!(verdicts(&marked.stdout), verdicts(&plain.stdout));
}

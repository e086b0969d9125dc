//! The `gonogo` binary on the demo data and on bad input: exit statuses, what the output
//! quotes and underlines, and the JSON format.

mod common;

use common::{OrPanic, Scratch, gonogo};

fn demo_rulebooks() -> Vec<String> {
    let files: Vec<String> =
        std::fs::read_dir(concat!(env!("CARGO_MANIFEST_DIR"), "/rulebooks-demo"))
            .map(|dir| {
                dir.flatten()
                    .map(|e| e.path())
                    .filter(|p| p.extension().is_some_and(|x| x == "rules"))
                    .map(|p| p.display().to_string())
                    .collect()
            })
            .unwrap_or_default();
    assert!(files.len() >= 2, "demo rulebooks missing");
    files
}

#[test]
fn lint_passes_every_demo_rulebook() {
    let files = demo_rulebooks();
    let args: Vec<&str> = ["lint"]
        .into_iter()
        .chain(files.iter().map(String::as_str))
        .collect();
    let run = gonogo(&args);
    assert_eq!(run.code, 0, "{}{}", run.stdout, run.stderr);
    assert_eq!(
        run.stdout.matches(": ok (0 errors").count(),
        files.len(),
        "{}",
        run.stdout
    );
}

#[test]
fn an_unknown_unit_exits_1_and_underlines_the_unit() {
    let run = gonogo(&["lint", "tests/malformed/unknown-unit.rules"]);
    assert_eq!(run.code, 1, "lint found an error: exit 1");
    assert!(
        run.stdout.contains("`inch` is not a unit gonogo knows"),
        "{}",
        run.stdout
    );
    let lines: Vec<&str> = run.stdout.lines().collect();
    let source = lines
        .iter()
        .position(|l| l.contains("4.030 inch"))
        .unwrap_or_else(|| panic!("source line not shown"));
    let byte = lines[source].find("inch").unwrap_or_default();
    let column = lines[source][..byte].chars().count();
    let underline = lines[source + 1];
    let under: String = underline.chars().skip(column).take(4).collect();
    assert_eq!(
        under, "──┬─",
        "underline not under `inch`:\n{}\n{underline}",
        lines[source]
    );
    assert!(run.stdout.contains("did you mean `in`?"));
}

#[test]
fn json_output_parses_and_locates_the_problem() {
    let run = gonogo(&[
        "lint",
        "--format",
        "json",
        "tests/malformed/unknown-unit.rules",
    ]);
    assert_eq!(run.code, 1);
    let doc: serde_json::Value = serde_json::from_str(&run.stdout)
        .unwrap_or_else(|e| panic!("not JSON: {e}\n{}", run.stdout));
    assert_eq!(doc["schema"], "gonogo.lint/1");
    let problem = &doc["files"][0]["problems"][0];
    assert_eq!(problem["code"], "C56 unknown-unit");
    assert_eq!(problem["severity"], "error");
    assert_eq!(problem["labels"][0]["line"], 13);
    assert_eq!(problem["labels"][0]["column"], 32);
}

#[test]
fn warnings_alone_exit_0() {
    let run = gonogo(&["lint", "tests/malformed/unused-measurement.rules"]);
    assert_eq!(run.code, 0, "{}", run.stdout);
    assert!(run.stdout.contains("1 warning"));
}

#[test]
fn a_file_over_8_mib_is_refused() {
    let big = Scratch::new("big.rules", &vec![b'#'; 8 * 1024 * 1024 + 1]);
    let run = gonogo(&["lint", big.path()]);
    assert_eq!(run.code, 2);
    assert!(
        run.stdout.contains("over the limit of 8388608 bytes"),
        "{}",
        run.stdout
    );
}

#[test]
fn invalid_utf8_is_refused_with_its_line_and_column() {
    let bad = Scratch::new("latin1.rules", b"series \"Caf\xe9\"\n");
    let run = gonogo(&["lint", bad.path()]);
    assert_eq!(run.code, 2);
    assert!(
        run.stdout
            .contains("is not UTF-8 text: line 1, column 12 holds the byte 0xE9"),
        "{}",
        run.stdout
    );
}

#[test]
fn a_hundred_thousand_open_parentheses_do_not_crash() {
    let text = format!("define x = {}", "(".repeat(100_000));
    let deep = Scratch::new("deep.rules", text.as_bytes());
    let run = gonogo(&["lint", deep.path()]);
    assert_eq!(run.code, 1, "{}", run.stderr);
    assert!(run.stdout.contains("P10 too-deep"), "{}", run.stdout);
}

#[test]
fn deeply_nested_when_groups_do_not_crash() {
    let text = format!("class c\n{}", "when a == 1\n".repeat(100_000));
    let deep = Scratch::new("when.rules", text.as_bytes());
    let run = gonogo(&["lint", deep.path()]);
    assert_eq!(run.code, 1, "{}", run.stderr);
    assert!(run.stdout.contains("P10 too-deep"), "{}", run.stdout);
}

#[test]
fn a_missing_file_exits_2() {
    let run = gonogo(&["lint", "rulebooks-demo/no-such-file.rules"]);
    assert_eq!(run.code, 2);
    assert!(
        run.stdout
            .contains("cannot read `rulebooks-demo/no-such-file.rules`"),
        "{}",
        run.stdout
    );
}

#[test]
fn usage_errors_exit_2() {
    assert_eq!(gonogo(&["lint"]).code, 2);
    assert_eq!(gonogo(&["no-such-command"]).code, 2);
}

#[test]
fn no_colour_when_not_a_terminal() {
    let run = gonogo(&["lint", "tests/malformed/unknown-unit.rules"]);
    assert!(
        !run.stdout.contains('\u{1b}'),
        "ANSI escape in piped output"
    );
}

#[test]
fn fmt_prints_a_canonical_form_that_lints_the_same() {
    let run = gonogo(&["fmt", "grammar/examples/parts-and-conditions.rules"]);
    assert_eq!(run.code, 0, "{}", run.stderr);
    let formatted = Scratch::new("formatted.rules", run.stdout.as_bytes());
    let lint = gonogo(&["lint", formatted.path()]);
    assert_eq!(lint.code, 0, "{}", lint.stdout);
    assert!(
        run.stdout
            .contains("  rule 2.1 \"Approved head\"\n    require head.casting in heads\n  end\n"),
        "{}",
        run.stdout
    );
}

#[test]
fn fmt_of_a_broken_file_exits_2_and_writes_nothing_to_stdout() {
    let run = gonogo(&["fmt", "tests/malformed/missing-end.rules"]);
    assert_eq!(run.code, 2);
    assert!(run.stdout.is_empty());
    assert!(run.stderr.contains("found the end of the file"));
}

const RULES: &str = "rulebooks-demo/tamsin-2027.rules";

#[test]
fn check_exit_statuses_follow_the_decision_rule() {
    let close = "engines-demo/limited2-close-bore.yaml";
    assert_eq!(gonogo(&["check", "--rules", RULES, close]).code, 3);
    assert_eq!(
        gonogo(&["check", "--rules", RULES, "--as", "inspector", close]).code,
        3
    );
    assert_eq!(
        gonogo(&["check", "--rules", RULES, "--as", "builder", close]).code,
        1
    );
    assert_eq!(
        gonogo(&[
            "check",
            "--rules",
            RULES,
            "engines-demo/limited2-legal.yaml"
        ])
        .code,
        0
    );
    assert_eq!(
        gonogo(&[
            "check",
            "--rules",
            RULES,
            "engines-demo/limited2-valve-lift.yaml"
        ])
        .code,
        1
    );
}

#[test]
fn check_as_builder_says_so_in_the_report() {
    let run = gonogo(&[
        "check",
        "--rules",
        RULES,
        "--as",
        "builder",
        "engines-demo/limited2-close-bore.yaml",
    ]);
    assert!(
        run.stdout
            .contains("decision rule: guarded acceptance (from the command line)"),
        "{}",
        run.stdout
    );
    assert!(
        run.stdout
            .contains("3.2  Bore, every cylinder — ILLEGAL · conditional pass"),
        "{}",
        run.stdout
    );
}

#[test]
fn check_of_a_bad_declaration_exits_2_with_nothing_on_stdout() {
    let run = gonogo(&[
        "check",
        "--rules",
        RULES,
        "engines-demo/limited2-legal.yaml",
        "tests/bad-declarations/wrong-dimension.yaml",
    ]);
    assert_eq!(run.code, 2);
    assert!(
        run.stdout.is_empty(),
        "half a report was written:\n{}",
        run.stdout
    );
    assert!(
        run.stderr.contains("wrong-dimension.yaml:21:27"),
        "{}",
        run.stderr
    );
}

#[test]
fn check_with_a_broken_rulebook_exits_2() {
    let run = gonogo(&[
        "check",
        "--rules",
        "tests/malformed/unknown-unit.rules",
        "engines-demo/limited2-legal.yaml",
    ]);
    assert_eq!(run.code, 2);
    assert!(run.stderr.contains("`inch` is not a unit gonogo knows"));
}

#[test]
fn check_of_several_engines_ends_with_a_field_line_and_the_worst_status() {
    let run = gonogo(&[
        "check",
        "--rules",
        RULES,
        "engines-demo/limited2-legal.yaml",
        "engines-demo/limited2-close-bore.yaml",
        "engines-demo/open4-stroker.yaml",
    ]);
    assert_eq!(run.code, 1);
    assert!(
        run.stdout
            .ends_with("3 engines: 1 legal, 1 illegal, 1 not all clear\n"),
        "{}",
        run.stdout
    );
}

#[test]
fn check_json_is_one_document_for_several_engines() {
    let run = gonogo(&[
        "check",
        "--rules",
        RULES,
        "--format",
        "json",
        "engines-demo/limited2-legal.yaml",
        "engines-demo/open4-legal.yaml",
    ]);
    assert_eq!(run.code, 0);
    let doc: serde_json::Value =
        serde_json::from_str(&run.stdout).unwrap_or_else(|e| panic!("{e}"));
    assert_eq!(doc["engines"].as_array().map(Vec::len), Some(2));
}

#[test]
fn check_class_override_is_applied() {
    let run = gonogo(&[
        "check",
        "--rules",
        RULES,
        "--class",
        "open4",
        "engines-demo/limited2-legal.yaml",
    ]);
    assert!(
        run.stdout.contains("class open4 “Open Four-Barrel”"),
        "{}",
        run.stdout
    );
    assert_eq!(
        run.code, 1,
        "a two-barrel fails the open class's four-barrel rule"
    );
}

#[test]
fn check_reads_a_folder_recursively_and_refuses_an_empty_one() {
    let run = gonogo(&[
        "check",
        "--rules",
        RULES,
        "--format",
        "json",
        "engines-demo",
    ]);
    let doc: serde_json::Value =
        serde_json::from_str(&run.stdout).unwrap_or_else(|e| panic!("{e}\n{}", run.stderr));
    let count = std::fs::read_dir(concat!(env!("CARGO_MANIFEST_DIR"), "/engines-demo"))
        .map(|d| d.count())
        .unwrap_or(0);
    assert_eq!(doc["engines"].as_array().map(Vec::len), Some(count));
    let empty = gonogo(&["check", "--rules", RULES, "grammar"]);
    assert_eq!(empty.code, 2);
    assert!(
        empty
            .stderr
            .contains("holds no `.yaml` or `.yml` declaration"),
        "{}",
        empty.stderr
    );
}

#[test]
fn output_goes_to_the_file_whole_and_nothing_is_left_beside_it() {
    let dir = std::env::temp_dir().join(format!("gonogo-{}-out", std::process::id()));
    std::fs::create_dir_all(&dir).unwrap_or_else(|e| panic!("{e}"));
    let target = dir.join("report.json");
    let run = gonogo(&[
        "check",
        "--rules",
        RULES,
        "--format",
        "json",
        "--output",
        target.to_str().unwrap_or_default(),
        "engines-demo/limited2-legal.yaml",
    ]);
    assert_eq!(run.code, 0, "{}", run.stderr);
    assert!(
        run.stdout.is_empty(),
        "the report went to standard output too"
    );
    let text = std::fs::read_to_string(&target).unwrap_or_default();
    let doc: serde_json::Value = serde_json::from_str(&text).unwrap_or_else(|e| panic!("{e}"));
    assert_eq!(doc["schema"], "gonogo.check/2");
    let left: Vec<_> = std::fs::read_dir(&dir)
        .map(|d| d.flatten().map(|e| e.file_name()).collect())
        .unwrap_or_default();
    let _ = std::fs::remove_dir_all(&dir);
    assert_eq!(
        left.len(),
        1,
        "temporary files left beside the output: {left:?}"
    );
}

#[test]
fn bad_input_writes_no_output_file() {
    let target = std::env::temp_dir().join(format!("gonogo-{}-never.json", std::process::id()));
    let run = gonogo(&[
        "check",
        "--rules",
        RULES,
        "--output",
        target.to_str().unwrap_or_default(),
        "tests/bad-declarations/wrong-dimension.yaml",
    ]);
    assert_eq!(run.code, 2);
    assert!(!target.exists(), "a report was written for bad input");
}

#[test]
fn completions_and_the_manual_page_come_from_the_command_definitions() {
    let bash = gonogo(&["completions", "bash"]);
    assert_eq!(bash.code, 0);
    assert!(
        bash.stdout.contains("headroom") && bash.stdout.contains("impact"),
        "subcommands missing from the completions"
    );
    let man = gonogo(&["man"]);
    assert_eq!(man.code, 0);
    assert!(
        man.stdout.starts_with(".ie"),
        "not a roff page: {}",
        &man.stdout[..man.stdout.len().min(80)]
    );
    assert!(man.stdout.contains("gonogo"));
}

#[test]
fn two_threads_give_the_same_report_as_one() {
    // three copies of the demo field: enough declarations for the work to be split
    let dir = std::env::temp_dir().join(format!("gonogo-{}-threads", std::process::id()));
    for copy in 0..3 {
        let sub = dir.join(format!("copy{copy}"));
        std::fs::create_dir_all(&sub).unwrap_or_else(|e| panic!("{e}"));
        for entry in std::fs::read_dir(concat!(env!("CARGO_MANIFEST_DIR"), "/engines-demo"))
            .into_iter()
            .flatten()
            .flatten()
        {
            let _ = std::fs::copy(entry.path(), sub.join(entry.file_name()));
        }
    }
    let folder = dir.to_str().unwrap_or_default();
    let one = gonogo(&["check", "--rules", RULES, "--jobs", "1", folder]);
    let two = gonogo(&["check", "--rules", RULES, "--jobs", "2", folder]);
    let _ = std::fs::remove_dir_all(&dir);
    assert_eq!(one.code, two.code);
    let demo = std::fs::read_dir(concat!(env!("CARGO_MANIFEST_DIR"), "/engines-demo"))
        .into_iter()
        .flatten()
        .flatten()
        .filter(|e| e.path().extension().is_some_and(|x| x == "yaml"))
        .count();
    assert!(
        one.stdout.contains(&format!("{} engines", 3 * demo)),
        "{}",
        &one.stdout[one.stdout.len().saturating_sub(200)..]
    );
    assert!(
        one.stdout == two.stdout,
        "the reports differ between one and two threads"
    );
}

#[test]
fn every_mistake_of_a_declaration_is_reported_in_one_run_at_its_line_and_column() {
    let run = gonogo(&[
        "check",
        "--rules",
        RULES,
        "tests/bad-declarations/several-mistakes.yaml",
    ]);
    assert_eq!(run.code, 2, "{}", run.stderr);
    let file = "tests/bad-declarations/several-mistakes.yaml";
    for (code, place) in [
        ("D22 wrong-dimension", "15:40"),
        ("D19 unknown-key", "17:3"),
        ("D20 unknown-unit", "29:16"),
        ("D18 unknown-instrument", "33:17"),
    ] {
        assert!(run.stderr.contains(code), "no {code}:\n{}", run.stderr);
        assert!(
            run.stderr.contains(&format!("{file}:{place}]")),
            "{code} is not at {place}:\n{}",
            run.stderr
        );
    }
    assert!(
        run.stderr.contains("measurements.bore[3]:"),
        "the third cylinder is called 3, as in the reports:\n{}",
        run.stderr
    );
}

#[test]
fn a_misspelt_class_gets_the_same_did_you_mean_from_every_command() {
    let runs = [
        gonogo(&[
            "check",
            "--rules",
            RULES,
            "--class",
            "limited3",
            "engines-demo/limited2-legal.yaml",
        ]),
        gonogo(&["sheet", "--rules", RULES, "--class", "limited3"]),
        gonogo(&["explain", "--rules", RULES, "--class", "limited3", "3.1"]),
        gonogo(&[
            "headroom",
            "--rules",
            RULES,
            "--class",
            "limited3",
            "engines-demo/limited2-legal.yaml",
        ]),
        gonogo(&[
            "check",
            "--rules",
            RULES,
            "tests/bad-declarations/unknown-class.yaml",
        ]),
    ];
    for run in runs {
        assert_eq!(run.code, 2, "{}", run.stderr);
        assert!(run.stderr.contains("D17 unknown-class"), "{}", run.stderr);
        assert!(
            run.stderr.contains("the rulebook has no class `limited3`"),
            "{}",
            run.stderr
        );
        assert!(
            run.stderr.contains("help: did you mean `limited2`?"),
            "{}",
            run.stderr
        );
    }
}

#[test]
fn headroom_lists_every_bad_declaration_as_check_does() {
    let bad = [
        "tests/bad-declarations/wrong-dimension.yaml",
        "tests/bad-declarations/unknown-unit.yaml",
    ];
    let codes = |stderr: &str| -> Vec<String> {
        stderr
            .lines()
            .filter(|l| {
                l.len() > 4
                    && l.as_bytes()[0] == b'D'
                    && l[1..3].bytes().all(|b| b.is_ascii_digit())
            })
            .map(str::to_string)
            .collect()
    };
    let check = gonogo(&["check", "--rules", RULES, bad[0], bad[1]]);
    let headroom = gonogo(&["headroom", "--rules", RULES, bad[0], bad[1]]);
    assert_eq!(headroom.code, 2);
    assert_eq!(
        codes(&headroom.stderr),
        ["D22 wrong-dimension", "D20 unknown-unit"],
        "{}",
        headroom.stderr
    );
    assert_eq!(codes(&headroom.stderr), codes(&check.stderr));
}

#[test]
fn headroom_refuses_a_declaration_dated_before_the_edition_as_check_does() {
    let text = std::fs::read_to_string(concat!(
        env!("CARGO_MANIFEST_DIR"),
        "/engines-demo/limited2-legal.yaml"
    ))
    .unwrap_or_default()
    .replace("date: \"2027-05-22\"", "date: \"2019-05-22\"");
    assert!(
        text.contains("2019-05-22"),
        "the demo declaration's date moved"
    );
    let early = Scratch::new("early.yaml", text.as_bytes());
    let check = gonogo(&["check", "--rules", RULES, early.path()]);
    let headroom = gonogo(&["headroom", "--rules", RULES, early.path()]);
    assert_eq!(check.code, 2, "{}", check.stderr);
    assert_eq!(headroom.code, 2, "{}", headroom.stdout);
    assert!(
        headroom.stderr.contains("C12 before-edition"),
        "{}",
        headroom.stderr
    );
}

#[test]
fn a_count_that_is_not_a_whole_number_is_refused_at_its_place() {
    let text = std::fs::read_to_string(concat!(
        env!("CARGO_MANIFEST_DIR"),
        "/engines-demo/limited2-legal.yaml"
    ))
    .unwrap_or_default()
    .replace("  cylinders: 8\n", "  cylinders: 7.5\n");
    assert!(
        text.contains("cylinders: 7.5"),
        "the demo's cylinder line moved"
    );
    let half = Scratch::new("half-cylinder.yaml", text.as_bytes());
    let run = gonogo(&["check", "--rules", RULES, half.path()]);
    assert_eq!(run.code, 2, "{}", run.stdout);
    assert!(run.stderr.contains("D26 not-whole"), "{}", run.stderr);
    assert!(
        run.stderr.contains("7.5 is not a whole number"),
        "{}",
        run.stderr
    );
    assert!(run.stderr.contains(":19:14]"), "{}", run.stderr);
}

#[test]
fn fmt_check_names_each_file_not_canonical_and_exits_1() {
    let canonical = Scratch::new("canonical.rules", b"series \"S\"  # kept\n");
    let loose = Scratch::new("loose.rules", b"series   \"S\"\n");
    let run = gonogo(&["fmt", "--check", canonical.path(), loose.path()]);
    assert_eq!(run.code, 1, "{}", run.stderr);
    assert_eq!(
        run.stdout,
        format!("not in canonical form: {}\n", loose.path())
    );
    assert_eq!(gonogo(&["fmt", "--check", canonical.path()]).code, 0);
}

#[test]
fn fmt_write_puts_the_canonical_text_back_and_keeps_comments() {
    let file = Scratch::new("w.rules", b"# head\nseries   \"S\" # tail\n");
    let run = gonogo(&["fmt", "--write", file.path()]);
    assert_eq!(run.code, 0, "{}", run.stderr);
    let now = std::fs::read_to_string(file.path()).unwrap_or_default();
    assert_eq!(now, "# head\nseries \"S\"  # tail\n");
    assert_eq!(gonogo(&["fmt", "--check", file.path()]).code, 0);
}

#[test]
fn fmt_of_two_files_without_check_or_write_is_a_usage_error() {
    let run = gonogo(&[
        "fmt",
        "grammar/examples/minimal.rules",
        "grammar/examples/minimal.rules",
    ]);
    assert_eq!(run.code, 2);
    assert!(run.stdout.is_empty());
}

/// The field table of every demo engine, sorted by result: the car number column (a dash
/// where a declaration gives none) and illegal engines, then not all clear, then legal, each
/// group in file order.
#[test]
fn check_sort_result_puts_illegal_and_unclear_engines_first() {
    let run = gonogo(&[
        "check",
        "--rules",
        RULES,
        "--sort",
        "result",
        "engines-demo",
    ]);
    assert_eq!(run.code, 1, "{}", run.stderr);
    let field = &run.stdout[run.stdout.rfind("\nfield\n").unwrap_or(0)..];
    insta::assert_snapshot!("field_sorted_by_result", field);
}

#[test]
fn check_default_order_is_file_order() {
    let run = gonogo(&["check", "--rules", RULES, "engines-demo"]);
    let field = &run.stdout[run.stdout.rfind("\nfield\n").unwrap_or(0)..];
    let cars: Vec<&str> = field
        .lines()
        .skip(3)
        .filter_map(|l| l.split_whitespace().nth(1))
        .collect();
    // engines-demo in path order: limited2-after-bulletin (58), -aluminium-light (83), …
    assert_eq!(cars[..3], ["58", "83", "71"], "{field}");
}

#[test]
fn check_sort_result_is_the_same_bytes_on_one_thread_and_two() {
    for format in ["text", "json", "markdown", "html"] {
        let on = |jobs: &str| {
            gonogo(&[
                "check",
                "--rules",
                RULES,
                "--sort",
                "result",
                "--format",
                format,
                "--jobs",
                jobs,
                "engines-demo",
            ])
            .stdout
        };
        assert_eq!(on("1"), on("2"), "--format {format}");
    }
}

#[test]
fn check_sort_result_orders_every_format() {
    let run = gonogo(&[
        "check",
        "--rules",
        RULES,
        "--sort",
        "result",
        "--format",
        "json",
        "engines-demo/limited2-legal.yaml",
        "engines-demo/limited2-close-bore.yaml",
        "engines-demo/limited2-four-barrel.yaml",
    ]);
    let doc: serde_json::Value = serde_json::from_str(&run.stdout).or_panic("json");
    let cars: Vec<&str> = doc["engines"]
        .as_array()
        .or_panic("engines")
        .iter()
        .filter_map(|e| e["car"].as_str())
        .collect();
    // four-barrel is illegal, close-bore not all clear, legal last
    assert_eq!(cars, ["17", "71", "14"]);
}

#[test]
fn the_field_table_gives_a_dash_for_an_engine_without_a_car_number() {
    let legal = std::fs::read_to_string("engines-demo/limited2-legal.yaml").or_panic("demo");
    let no_car: String = legal
        .lines()
        .filter(|l| !l.starts_with("car:"))
        .map(|l| format!("{l}\n"))
        .collect();
    let scratch = Scratch::new("no-car.yaml", no_car.as_bytes());
    let run = gonogo(&[
        "check",
        "--rules",
        RULES,
        "engines-demo/limited2-close-bore.yaml",
        scratch.path(),
    ]);
    let row = run
        .stdout
        .lines()
        .rfind(|l| l.trim_start().starts_with("TV-27-014"))
        .or_panic("the car-less engine's row");
    assert_eq!(row.split_whitespace().nth(1), Some("—"), "{}", run.stdout);
}

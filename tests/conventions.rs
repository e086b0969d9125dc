//! The command-line conventions, through the binary: colour by `--color` and the
//! environment (no-color.org, bixense.com/clicolors), `lint`'s exit statuses, the manual
//! pages, and the units listing.

use std::path::PathBuf;
use std::process::{Command, Stdio};

/// What one run produced.
struct Run {
    code: i32,
    stdout: String,
    stderr: String,
}

/// Runs `gonogo` from the crate root with the colour variables cleared, then `env` set.
fn gonogo_env(args: &[&str], env: &[(&str, &str)]) -> Run {
    let mut command = Command::new(env!("CARGO_BIN_EXE_gonogo"));
    command
        .args(args)
        .current_dir(env!("CARGO_MANIFEST_DIR"))
        .env("SOURCE_DATE_EPOCH", "1810000000") // pins the provenance time: 2027-05-11T01:46:40Z
        .stdin(Stdio::null());
    for var in ["NO_COLOR", "CLICOLOR", "CLICOLOR_FORCE", "TERM"] {
        command.env_remove(var);
    }
    command.envs(env.iter().copied());
    let output = command
        .output()
        .unwrap_or_else(|e| panic!("cannot run gonogo: {e}"));
    Run {
        code: output.status.code().unwrap_or(-1),
        stdout: String::from_utf8_lossy(&output.stdout).into_owned(),
        stderr: String::from_utf8_lossy(&output.stderr).into_owned(),
    }
}

/// Whether text holds an ANSI escape.
fn coloured(text: &str) -> bool {
    text.contains('\u{1b}')
}

/// A rulebook with an error (an unknown unit): its report has colour to give.
const WITH_ERROR: &str = "tests/malformed/unknown-unit.rules";

/// A rulebook with a warning and no error: `lint` writes its report to `--output`.
const WITH_WARNING: &str = "tests/malformed/unused-measurement.rules";

/// A fresh path under the system's temporary folder, removed when dropped.
struct Scratch(PathBuf);

impl Scratch {
    fn new(name: &str) -> Scratch {
        let path = std::env::temp_dir().join(format!("gonogo-conv-{}-{name}", std::process::id()));
        let _ = std::fs::remove_file(&path);
        Scratch(path)
    }

    fn path(&self) -> &str {
        self.0.to_str().unwrap_or_default()
    }
}

impl Drop for Scratch {
    fn drop(&mut self) {
        let _ = std::fs::remove_file(&self.0);
        let _ = std::fs::remove_dir_all(&self.0);
    }
}

#[test]
fn color_always_colours_a_pipe() {
    let run = gonogo_env(&["--color", "always", "lint", WITH_ERROR], &[]);
    assert!(coloured(&run.stdout), "{}", run.stdout);
}

#[test]
fn color_always_wins_over_no_color() {
    // no-color.org: per-instance command-line arguments override NO_COLOR
    let run = gonogo_env(
        &["lint", "--color=always", WITH_ERROR],
        &[("NO_COLOR", "1")],
    );
    assert!(coloured(&run.stdout), "{}", run.stdout);
}

#[test]
fn no_color_turns_auto_off_even_when_forced() {
    // no-color.org: NO_COLOR present and not empty prevents colour
    let run = gonogo_env(
        &["--color", "auto", "lint", WITH_ERROR],
        &[("NO_COLOR", "1"), ("CLICOLOR_FORCE", "1")],
    );
    assert!(!coloured(&run.stdout), "{}", run.stdout);
}

#[test]
fn clicolor_force_colours_a_pipe_in_auto() {
    // bixense.com/clicolors: CLICOLOR_FORCE != 0 enables colour "no matter what"
    let run = gonogo_env(&["lint", WITH_ERROR], &[("CLICOLOR_FORCE", "1")]);
    assert!(coloured(&run.stdout), "{}", run.stdout);
    let zero = gonogo_env(&["lint", WITH_ERROR], &[("CLICOLOR_FORCE", "0")]);
    assert!(!coloured(&zero.stdout), "{}", zero.stdout);
}

#[test]
fn color_never_wins_over_clicolor_force() {
    let run = gonogo_env(
        &["--color", "never", "lint", WITH_ERROR],
        &[("CLICOLOR_FORCE", "1")],
    );
    assert!(!coloured(&run.stdout), "{}", run.stdout);
}

#[test]
fn diagnostics_on_standard_error_follow_the_same_rules() {
    let forced = gonogo_env(
        &["--color", "always", "explain", "--rules", WITH_ERROR, "1.1"],
        &[],
    );
    assert_eq!(forced.code, 2);
    assert!(coloured(&forced.stderr), "{}", forced.stderr);
    let auto = gonogo_env(&["explain", "--rules", WITH_ERROR, "1.1"], &[]);
    assert!(!coloured(&auto.stderr), "{}", auto.stderr);
}

#[test]
fn a_file_named_by_output_gets_no_colour_in_auto() {
    // bixense's CLICOLOR_FORCE is a session-wide setting; a saved file is no stream
    let target = Scratch::new("lint.txt");
    let run = gonogo_env(
        &["lint", "--output", target.path(), WITH_WARNING],
        &[("CLICOLOR_FORCE", "1")],
    );
    assert_eq!(run.code, 0, "{}", run.stderr);
    let written = std::fs::read_to_string(&target.0).unwrap_or_default();
    assert!(written.contains("warning"), "{written}");
    assert!(!coloured(&written), "{written}");
}

#[test]
fn a_usage_error_follows_the_color_flag() {
    let forced = gonogo_env(&["--color", "always", "lint"], &[]);
    assert_eq!(forced.code, 2);
    assert!(coloured(&forced.stderr), "{}", forced.stderr);
    let never = gonogo_env(&["--color=never", "lint"], &[("CLICOLOR_FORCE", "1")]);
    assert!(!coloured(&never.stderr), "{}", never.stderr);
}

/// Runs `gonogo` on a pseudo-terminal through util-linux `script`, standard output and
/// error both on the terminal; what the terminal showed.
#[cfg(target_os = "linux")]
fn on_a_terminal(args: &str, env: &[(&str, &str)]) -> String {
    let line = format!("{} {args}", env!("CARGO_BIN_EXE_gonogo"));
    let mut command = Command::new("script");
    command
        .args(["-qec", &line, "/dev/null"])
        .current_dir(env!("CARGO_MANIFEST_DIR"))
        .stdin(Stdio::null());
    for var in ["NO_COLOR", "CLICOLOR", "CLICOLOR_FORCE"] {
        command.env_remove(var);
    }
    command
        .env("TERM", "xterm-256color")
        .envs(env.iter().copied());
    let output = command.output().unwrap_or_else(|e| {
        panic!("this test needs util-linux `script` for a pseudo-terminal: {e}")
    });
    String::from_utf8_lossy(&output.stdout).into_owned()
}

#[cfg(target_os = "linux")]
#[test]
fn a_terminal_gets_colour_unless_term_is_dumb_or_clicolor_is_0() {
    let args = format!("lint {WITH_ERROR}");
    assert!(
        coloured(&on_a_terminal(&args, &[])),
        "no colour on a terminal"
    );
    // bixense.com/clicolors: CLICOLOR == 0 means no colour escapes
    assert!(!coloured(&on_a_terminal(&args, &[("CLICOLOR", "0")])));
    // TERM=dumb: a terminal without colour
    assert!(!coloured(&on_a_terminal(&args, &[("TERM", "dumb")])));
    assert!(!coloured(&on_a_terminal(&args, &[("NO_COLOR", "1")])));
}

#[cfg(target_os = "linux")]
#[test]
fn lint_output_on_a_terminal_writes_no_escape_into_the_file() {
    let target = Scratch::new("tty-lint.txt");
    let shown = on_a_terminal(
        &format!("lint --output {} {WITH_WARNING}", target.path()),
        &[],
    );
    let written = std::fs::read_to_string(&target.0).unwrap_or_default();
    assert!(written.contains("warning"), "{written}{shown}");
    assert!(!coloured(&written), "{written}");
}

#[test]
fn lint_exits_1_for_errors_found_and_2_when_it_could_not_run() {
    let found = gonogo_env(&["lint", WITH_ERROR], &[]);
    assert_eq!(found.code, 1, "errors found: {}", found.stdout);
    let missing = gonogo_env(&["lint", "rulebooks-demo/no-such-file.rules"], &[]);
    assert_eq!(missing.code, 2, "could not run: {}", missing.stdout);
    let folder = gonogo_env(&["lint", "rulebooks-demo"], &[]);
    assert_eq!(folder.code, 2, "a folder cannot be read: {}", folder.stdout);
    // a file that could not be read outweighs another file's errors
    let both = gonogo_env(&["lint", WITH_ERROR, "no-such-file.rules"], &[]);
    assert_eq!(both.code, 2, "{}", both.stdout);
    let clean = gonogo_env(&["lint", WITH_WARNING], &[]);
    assert_eq!(clean.code, 0, "{}", clean.stdout);
}

#[test]
fn lint_with_errors_writes_no_output_file_and_exits_1() {
    let target = Scratch::new("lint-errors.txt");
    let run = gonogo_env(&["lint", "--output", target.path(), WITH_ERROR], &[]);
    assert_eq!(run.code, 1, "{}", run.stderr);
    assert!(
        !target.0.exists(),
        "a report was written for a rulebook with errors"
    );
    assert!(run.stderr.contains("C56 unknown-unit"), "{}", run.stderr);
}

/// The pages `gonogo man` refers to (`gonogo-check(1)`, …), as subcommand names.
fn referenced_pages(page: &str) -> Vec<String> {
    let text = page.replace("\\-", "-");
    let mut found: Vec<String> = text
        .match_indices("gonogo-")
        .filter_map(|(at, _)| {
            let rest = &text[at + "gonogo-".len()..];
            let name: String = rest.chars().take_while(char::is_ascii_lowercase).collect();
            rest[name.len()..].starts_with("(1)").then_some(name)
        })
        .collect();
    found.sort();
    found.dedup();
    found
}

/// Whether a roff page has a section of this name (`.SH NAME` or `.SH "TWO WORDS"`).
fn has_section(page: &str, name: &str) -> bool {
    page.lines()
        .any(|l| l == format!(".SH {name}") || l == format!(".SH \"{name}\""))
}

#[test]
fn every_page_the_manual_refers_to_is_generated_with_its_sections() {
    let top = gonogo_env(&["man"], &[]);
    assert_eq!(top.code, 0, "{}", top.stderr);
    let pages = referenced_pages(&top.stdout);
    for expected in ["check", "lint", "units", "man", "fmt"] {
        assert!(
            pages.iter().any(|p| p == expected),
            "no gonogo-{expected}(1) in {pages:?}"
        );
    }
    for page in std::iter::once(("gonogo".to_string(), top)).chain(
        pages
            .iter()
            .map(|name| (format!("gonogo-{name}"), gonogo_env(&["man", name], &[]))),
    ) {
        let (title, run) = page;
        assert_eq!(run.code, 0, "{title}: {}", run.stderr);
        assert!(
            run.stdout.contains(&format!(".TH {title} 1")),
            "{title}: no title line"
        );
        for section in ["NAME", "SYNOPSIS", "EXIT STATUS", "ENVIRONMENT", "EXAMPLES"] {
            assert!(has_section(&run.stdout, section), "{title}: no {section}");
        }
        assert_eq!(
            run.stdout.matches(".ds Aq \\(aq").count(),
            1,
            "{title}: the roff preamble is repeated"
        );
    }
}

#[test]
fn a_subcommand_page_lists_its_own_exit_statuses_and_examples() {
    let lint = gonogo_env(&["man", "lint"], &[]).stdout.replace("\\-", "-");
    assert!(lint.contains("a rulebook has an error"), "{lint}");
    assert!(
        lint.contains("gonogo lint rulebooks-demo/*.rules"),
        "{lint}"
    );
    assert!(
        lint.contains("NO_COLOR") && lint.contains("CLICOLOR_FORCE"),
        "{lint}"
    );
    let check = gonogo_env(&["man", "check"], &[]).stdout;
    assert!(check.contains("\\fB3\\fR"), "check has exit status 3");
    assert!(!lint.contains("\\fB3\\fR"), "lint has no exit status 3");
}

#[test]
fn help_and_the_manual_page_show_the_same_examples() {
    let help = gonogo_env(&["sheet", "--help"], &[]);
    let page = gonogo_env(&["man", "sheet"], &[])
        .stdout
        .replace("\\-", "-");
    let examples: Vec<&str> = help
        .stdout
        .lines()
        .filter_map(|l| l.trim().strip_prefix("gonogo sheet "))
        .collect();
    assert_eq!(examples.len(), 2, "{}", help.stdout);
    for example in examples {
        assert!(page.contains(example), "`{example}` not on the page");
    }
}

#[test]
fn an_unknown_page_is_a_usage_error() {
    let run = gonogo_env(&["man", "furlongs"], &[]);
    assert_eq!(run.code, 2);
    assert!(run.stderr.contains("furlongs"), "{}", run.stderr);
}

#[test]
fn the_units_listing() {
    let text = gonogo_env(&["units"], &[]);
    assert_eq!(text.code, 0, "{}", text.stderr);
    insta::assert_snapshot!("units_text", text.stdout);
    let json = gonogo_env(&["units", "--format", "json"], &[]);
    assert_eq!(json.code, 0, "{}", json.stderr);
    insta::assert_snapshot!("units_json", json.stdout);
}

#[test]
fn the_units_listing_states_the_nist_factors_exactly() {
    let json = gonogo_env(&["units", "--format", "json"], &[]);
    let doc: serde_json::Value = serde_json::from_str(&json.stdout)
        .unwrap_or_else(|e| panic!("not JSON: {e}\n{}", json.stdout));
    let unit = |symbol: &str| {
        doc["dimensions"]
            .as_array()
            .into_iter()
            .flatten()
            .flat_map(|d| d["units"].as_array().into_iter().flatten())
            .find(|u| u["symbol"] == symbol)
            .cloned()
            .unwrap_or_else(|| panic!("`{symbol}` not listed"))
    };
    // NIST SP 811 (2008) B.8: 1 in = 2.54 × 10⁻² m exactly
    assert_eq!(unit("in")["exact_decimal"], "0.0254");
    assert_eq!(unit("in")["exact_fraction"], "127/5000");
    // NIST SP 811 B.8: 1 lbf = 0.453 592 37 kg × 9.806 65 m/s², a decimal that ends
    assert_eq!(unit("lbf")["exact_decimal"], "4.4482216152605");
    // 1 rpm = 1/60 rev/s (common practice, no source): a fraction with no ending decimal
    assert_eq!(unit("rpm")["exact_fraction"], "1/60");
    assert!(unit("rpm")["exact_decimal"].is_null());
    // the degree is π/180 rad: no fraction at all
    assert!(unit("deg")["exact_fraction"].is_null());
}

#[test]
fn the_units_json_fits_its_schema() {
    let path = concat!(env!("CARGO_MANIFEST_DIR"), "/schemas/units.schema.json");
    let schema: serde_json::Value =
        serde_json::from_str(&std::fs::read_to_string(path).unwrap_or_default())
            .unwrap_or_else(|e| panic!("{path}: {e}"));
    jsonschema::meta::validate(&schema).unwrap_or_else(|e| panic!("{path} is no JSON Schema: {e}"));
    let validator = jsonschema::options()
        .build(&schema)
        .unwrap_or_else(|e| panic!("{path}: {e}"));
    let json = gonogo_env(&["units", "--format", "json"], &[]);
    let doc: serde_json::Value =
        serde_json::from_str(&json.stdout).unwrap_or_else(|e| panic!("{e}"));
    let errors: Vec<String> = validator.iter_errors(&doc).map(|e| e.to_string()).collect();
    assert!(errors.is_empty(), "{errors:?}");
}

#[test]
fn an_unknown_unit_points_to_the_units_command() {
    for file in [
        WITH_ERROR,
        "tests/malformed/unknown-unit-no-suggestion.rules",
    ] {
        let run = gonogo_env(&["lint", file], &[]);
        assert!(
            run.stdout.contains("`gonogo units` lists"),
            "{}",
            run.stdout
        );
        assert!(!run.stdout.contains("README"), "{}", run.stdout);
    }
}

#[test]
fn an_unknown_unit_in_a_declaration_with_no_near_name_points_to_the_units_command() {
    let demo = std::fs::read_to_string(concat!(
        env!("CARGO_MANIFEST_DIR"),
        "/engines-demo/limited2-legal.yaml"
    ))
    .unwrap_or_default();
    assert!(demo.contains("0.0001 in\""), "the demo changed");
    let bad = Scratch::new("qqq.yaml");
    std::fs::write(&bad.0, demo.replacen("0.0001 in\"", "0.0001 qqqq\"", 1))
        .unwrap_or_else(|e| panic!("{e}"));
    let run = gonogo_env(
        &[
            "check",
            "--rules",
            "rulebooks-demo/tamsin-2027.rules",
            bad.path(),
        ],
        &[],
    );
    assert_eq!(run.code, 2, "{}", run.stdout);
    assert!(run.stderr.contains("D20"), "{}", run.stderr);
    assert!(
        run.stderr.contains("`gonogo units` lists"),
        "{}",
        run.stderr
    );
}

#[test]
fn an_unreadable_include_is_an_error_found_not_a_failure_to_run() {
    // the include is a statement of the rulebook; its file failing is the rulebook's mistake
    let run = gonogo_env(&["lint", "tests/malformed/include-not-utf8.rules"], &[]);
    assert_eq!(run.code, 1, "{}", run.stdout);
    let named = gonogo_env(&["lint", "tests/malformed/sub/latin1.rules"], &[]);
    assert_eq!(
        named.code, 2,
        "the named file is not text: {}",
        named.stdout
    );
}

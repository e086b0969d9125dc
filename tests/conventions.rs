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

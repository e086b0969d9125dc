//! Nothing the tool is asked to write costs the user a file, and nothing it writes is lost in
//! silence: `--output` against inputs, read-only files, links, FIFOs and `-`; standard output
//! and standard error on a full device; standard input as `-`; the field walk over links,
//! duplicates, letter case and FIFOs. Every case runs the real binary.

use std::path::{Path, PathBuf};
use std::process::{Command, Stdio};
use std::time::{Duration, Instant};

const RULES: &str = "rulebooks-demo/tamsin-2027.rules";
const LEGAL: &str = "engines-demo/limited2-legal.yaml";

/// What one run produced.
struct Run {
    code: i32,
    stdout: String,
    stderr: String,
}

/// How to run the binary: arguments, and what its standard streams are.
struct Gonogo {
    command: Command,
    input: Option<Vec<u8>>,
}

impl Gonogo {
    fn new(args: &[&str]) -> Gonogo {
        let mut command = Command::new(env!("CARGO_BIN_EXE_gonogo"));
        command
            .args(args)
            .current_dir(env!("CARGO_MANIFEST_DIR"))
            .env("NO_COLOR", "1")
            .env("SOURCE_DATE_EPOCH", "1810000000") // pins the provenance time: 2027-05-11T01:46:40Z
            .stdin(Stdio::null())
            .stdout(Stdio::piped())
            .stderr(Stdio::piped());
        Gonogo {
            command,
            input: None,
        }
    }

    fn in_folder(mut self, folder: &Path) -> Gonogo {
        self.command.current_dir(folder);
        self
    }

    fn stdin(mut self, bytes: Vec<u8>) -> Gonogo {
        self.command.stdin(Stdio::piped());
        self.input = Some(bytes);
        self
    }

    fn stdin_file(mut self, path: &Path) -> Gonogo {
        let file = std::fs::File::open(path).unwrap_or_else(|e| panic!("{e}"));
        self.command.stdin(file);
        self
    }

    fn stdout_full(mut self) -> Gonogo {
        self.command.stdout(full());
        self
    }

    fn stderr_full(mut self) -> Gonogo {
        self.command.stderr(full());
        self
    }

    /// Runs to the end, or fails the test after 60 s (a run that blocks is a failure).
    fn run(mut self) -> Run {
        let mut child = self
            .command
            .spawn()
            .unwrap_or_else(|e| panic!("cannot run gonogo: {e}"));
        if let (Some(bytes), Some(mut pipe)) = (self.input.take(), child.stdin.take()) {
            std::thread::spawn(move || {
                use std::io::Write;
                // gonogo may stop reading at its size cap; a broken pipe is expected then
                let _ = pipe.write_all(&bytes);
            });
        }
        let stdout = child.stdout.take().map(drain);
        let stderr = child.stderr.take().map(drain);
        let started = Instant::now();
        let status = loop {
            if let Ok(Some(status)) = child.try_wait() {
                break status;
            }
            if started.elapsed() > Duration::from_secs(60) {
                let _ = child.kill();
                panic!("gonogo did not finish in 60 s: it blocked");
            }
            std::thread::sleep(Duration::from_millis(20));
        };
        let text = |h: Option<std::thread::JoinHandle<String>>| {
            h.and_then(|h| h.join().ok()).unwrap_or_default()
        };
        Run {
            code: status.code().unwrap_or(-1),
            stdout: text(stdout),
            stderr: text(stderr),
        }
    }
}

fn drain(mut stream: impl std::io::Read + Send + 'static) -> std::thread::JoinHandle<String> {
    std::thread::spawn(move || {
        let mut bytes = Vec::new();
        let _ = stream.read_to_end(&mut bytes);
        String::from_utf8_lossy(&bytes).into_owned()
    })
}

/// `/dev/full`, where every write fails with "no space left on device" (Linux).
fn full() -> Stdio {
    std::fs::OpenOptions::new()
        .write(true)
        .open("/dev/full")
        .map(Stdio::from)
        .unwrap_or_else(|e| panic!("cannot open /dev/full: {e}"))
}

/// Whether `/dev/full` exists here; says why a test is skipped when it does not.
fn have_dev_full(test: &str) -> bool {
    let there = Path::new("/dev/full").exists();
    if !there {
        println!("{test}: skipped, this system has no /dev/full");
    }
    there
}

/// A scratch folder under the system's temporary folder, removed when dropped.
struct Scratch(PathBuf);

impl Scratch {
    fn new(name: &str) -> Scratch {
        let path =
            std::env::temp_dir().join(format!("gonogo-safety-{}-{name}", std::process::id()));
        let _ = std::fs::remove_dir_all(&path);
        std::fs::create_dir_all(&path).unwrap_or_else(|e| panic!("{e}"));
        Scratch(path)
    }

    fn join(&self, name: &str) -> PathBuf {
        self.0.join(name)
    }

    /// Copies a file of the crate into the scratch folder.
    fn copy(&self, from: &str, name: &str) -> PathBuf {
        let to = self.join(name);
        if let Some(folder) = to.parent() {
            std::fs::create_dir_all(folder).unwrap_or_else(|e| panic!("{e}"));
        }
        std::fs::copy(Path::new(env!("CARGO_MANIFEST_DIR")).join(from), &to)
            .unwrap_or_else(|e| panic!("cannot copy {from}: {e}"));
        to
    }
}

impl Drop for Scratch {
    fn drop(&mut self) {
        let _ = std::fs::remove_dir_all(&self.0);
    }
}

fn text(path: &Path) -> String {
    std::fs::read_to_string(path).unwrap_or_default()
}

fn s(path: &Path) -> &str {
    path.to_str().unwrap_or_default()
}

// ---- --output never destroys an input ----

#[test]
fn output_naming_the_declaration_is_refused_and_the_declaration_kept() {
    let dir = Scratch::new("decl");
    let declaration = dir.copy(LEGAL, "v.yaml");
    let before = text(&declaration);
    let dotted = dir.0.join(".").join("v.yaml");
    for target in [declaration.clone(), dotted] {
        let run = Gonogo::new(&[
            "check",
            "--rules",
            RULES,
            "--output",
            s(&target),
            s(&declaration),
        ])
        .run();
        assert_eq!(run.code, 2, "{}", run.stderr);
        assert!(run.stderr.contains("W01 output-is-input"), "{}", run.stderr);
        assert!(run.stderr.contains("help:"), "{}", run.stderr);
        assert_eq!(text(&declaration), before, "the declaration was replaced");
    }
}

#[cfg(unix)]
#[test]
fn output_naming_a_hard_link_to_an_input_is_refused() {
    let dir = Scratch::new("hard");
    let declaration = dir.copy(LEGAL, "v.yaml");
    let other_name = dir.join("same.yaml");
    std::fs::hard_link(&declaration, &other_name).unwrap_or_else(|e| panic!("{e}"));
    let before = text(&declaration);
    let run = Gonogo::new(&[
        "check",
        "--rules",
        RULES,
        "--output",
        s(&other_name),
        s(&declaration),
    ])
    .run();
    assert_eq!(run.code, 2, "{}", run.stderr);
    assert!(run.stderr.contains("W01 output-is-input"), "{}", run.stderr);
    assert_eq!(text(&declaration), before);
}

#[test]
fn output_naming_the_rulebook_or_an_include_is_refused() {
    let dir = Scratch::new("book");
    let rules = dir.copy(RULES, "book/tamsin-2027.rules");
    let include = dir.copy(
        "rulebooks-demo/parts/tamsin-parts.rules",
        "book/parts/tamsin-parts.rules",
    );
    for target in [&rules, &include] {
        let before = text(target);
        let run = Gonogo::new(&["check", "--rules", s(&rules), "--output", s(target), LEGAL]).run();
        assert_eq!(run.code, 2, "{}", run.stderr);
        assert!(run.stderr.contains("W01 output-is-input"), "{}", run.stderr);
        assert_eq!(&text(target), &before, "{} was replaced", target.display());
    }
}

#[test]
fn fmt_onto_its_own_file_is_refused_and_the_comments_kept() {
    let dir = Scratch::new("fmt");
    let file = dir.copy("grammar/examples/parts-and-conditions.rules", "x.rules");
    let before = text(&file);
    assert!(before.contains('#'), "the example has no comment to lose");
    let run = Gonogo::new(&["fmt", "--output", s(&file), s(&file)]).run();
    assert_eq!(run.code, 2, "{}", run.stderr);
    assert_eq!(text(&file), before, "fmt replaced its own input");
}

#[cfg(unix)]
#[test]
fn a_read_only_target_is_refused_and_keeps_its_text_and_mode() {
    use std::os::unix::fs::PermissionsExt;
    let dir = Scratch::new("ro");
    let target = dir.join("report.txt");
    std::fs::write(&target, "kept\n").unwrap_or_else(|e| panic!("{e}"));
    std::fs::set_permissions(&target, std::fs::Permissions::from_mode(0o444))
        .unwrap_or_else(|e| panic!("{e}"));
    let run = Gonogo::new(&["check", "--rules", RULES, "--output", s(&target), LEGAL]).run();
    assert_eq!(run.code, 2, "{}", run.stderr);
    assert!(
        run.stderr.contains("W02 output-read-only"),
        "{}",
        run.stderr
    );
    assert_eq!(text(&target), "kept\n");
    let mode = std::fs::metadata(&target).map(|m| m.permissions().mode() & 0o777);
    assert_eq!(mode.ok(), Some(0o444));
}

#[cfg(unix)]
#[test]
fn a_link_is_written_through_and_the_file_keeps_its_mode() {
    use std::os::unix::fs::PermissionsExt;
    let dir = Scratch::new("link");
    let real = dir.join("real.txt");
    std::fs::write(&real, "old\n").unwrap_or_else(|e| panic!("{e}"));
    std::fs::set_permissions(&real, std::fs::Permissions::from_mode(0o640))
        .unwrap_or_else(|e| panic!("{e}"));
    let link = dir.join("link.txt");
    std::os::unix::fs::symlink("real.txt", &link).unwrap_or_else(|e| panic!("{e}"));
    let run = Gonogo::new(&["check", "--rules", RULES, "--output", s(&link), LEGAL]).run();
    assert_eq!(run.code, 0, "{}", run.stderr);
    let still_link = std::fs::symlink_metadata(&link).is_ok_and(|m| m.file_type().is_symlink());
    assert!(still_link, "the link was replaced by a file");
    assert!(
        text(&real).contains("TV-27-014"),
        "the report did not reach the file"
    );
    let mode = std::fs::metadata(&real).map(|m| m.permissions().mode() & 0o777);
    assert_eq!(mode.ok(), Some(0o640), "the file's mode changed");
}

#[cfg(unix)]
#[test]
fn a_link_to_an_input_and_a_link_to_nothing_are_refused() {
    let dir = Scratch::new("links");
    let declaration = dir.copy(LEGAL, "v.yaml");
    let to_input = dir.join("to-input");
    std::os::unix::fs::symlink("v.yaml", &to_input).unwrap_or_else(|e| panic!("{e}"));
    let dangling = dir.join("dangling");
    std::os::unix::fs::symlink("nowhere", &dangling).unwrap_or_else(|e| panic!("{e}"));
    let before = text(&declaration);
    let run = Gonogo::new(&[
        "check",
        "--rules",
        RULES,
        "--output",
        s(&to_input),
        s(&declaration),
    ])
    .run();
    assert_eq!(run.code, 2, "{}", run.stderr);
    assert!(run.stderr.contains("W01 output-is-input"), "{}", run.stderr);
    assert_eq!(text(&declaration), before);
    let run = Gonogo::new(&["check", "--rules", RULES, "--output", s(&dangling), LEGAL]).run();
    assert_eq!(run.code, 2, "{}", run.stderr);
    assert!(
        run.stderr.contains("W04 output-dangling-link"),
        "{}",
        run.stderr
    );
    assert!(std::fs::symlink_metadata(&dangling).is_ok_and(|m| m.file_type().is_symlink()));
}

#[test]
fn output_dash_is_standard_output_and_makes_no_file() {
    let dir = Scratch::new("dash");
    let root = Path::new(env!("CARGO_MANIFEST_DIR"));
    let rules = root.join(RULES);
    let legal = root.join(LEGAL);
    let run = Gonogo::new(&["check", "--rules", s(&rules), "--output", "-", s(&legal)])
        .in_folder(&dir.0)
        .run();
    assert_eq!(run.code, 0, "{}", run.stderr);
    assert!(run.stdout.contains("TV-27-014"), "{}", run.stdout);
    assert!(!dir.join("-").exists(), "a file named `-` was made");
}

#[cfg(unix)]
#[test]
fn a_fifo_target_is_written_to_and_stays_a_fifo() {
    use std::os::unix::fs::FileTypeExt;
    let dir = Scratch::new("fifo-out");
    let fifo = dir.join("out.fifo");
    let made = Command::new("mkfifo").arg(&fifo).status();
    if !made.is_ok_and(|s| s.success()) {
        println!("a_fifo_target_is_written_to_and_stays_a_fifo: skipped, no mkfifo here");
        return;
    }
    let reading = fifo.clone();
    let reader = std::thread::spawn(move || std::fs::read_to_string(reading).unwrap_or_default());
    let run = Gonogo::new(&["check", "--rules", RULES, "--output", s(&fifo), LEGAL]).run();
    let is_fifo = std::fs::symlink_metadata(&fifo).is_ok_and(|m| m.file_type().is_fifo());
    // a FIFO renamed over leaves the reader waiting for ever: join only when it is still one
    assert!(
        is_fifo,
        "the FIFO was replaced by a file (exit {})",
        run.code
    );
    assert_eq!(run.code, 0, "{}", run.stderr);
    let got = reader.join().unwrap_or_default();
    assert!(got.contains("TV-27-014"), "the reader got: {got}");
}

// ---- reports never lost in silence ----

#[test]
fn a_full_standard_output_is_an_error_for_every_command() {
    if !have_dev_full("a_full_standard_output_is_an_error_for_every_command") {
        return;
    }
    let commands: [&[&str]; 5] = [
        &["check", "--rules", RULES, LEGAL],
        &["lint", RULES],
        &["fmt", "grammar/examples/parts-and-conditions.rules"],
        &["man"],
        &["--help"],
    ];
    for args in commands {
        let run = Gonogo::new(args).stdout_full().run();
        assert_eq!(run.code, 2, "{args:?}: {}", run.stderr);
        assert!(
            run.stderr.contains("W05 write-failed"),
            "{args:?}: {}",
            run.stderr
        );
        assert!(
            run.stderr.contains("standard output"),
            "{args:?}: {}",
            run.stderr
        );
    }
}

#[test]
fn full_standard_output_and_error_give_exit_2_not_a_panic() {
    if !have_dev_full("full_standard_output_and_error_give_exit_2_not_a_panic") {
        return;
    }
    let bad = "tests/bad-declarations/wrong-dimension.yaml";
    for args in [
        &["check", "--rules", RULES, LEGAL][..],
        &["check", "--rules", RULES, bad][..],
    ] {
        let run = Gonogo::new(args).stdout_full().stderr_full().run();
        assert_eq!(run.code, 2, "{args:?}");
    }
}

#[test]
fn lint_with_errors_writes_no_output_file() {
    let dir = Scratch::new("lint");
    let target = dir.join("lint.txt");
    let run = Gonogo::new(&[
        "lint",
        "--output",
        s(&target),
        "tests/malformed/unknown-unit.rules",
    ])
    .run();
    assert_eq!(run.code, 1, "lint found an error: exit 1");
    assert!(!target.exists(), "lint wrote its report for a failing run");
    assert!(run.stderr.contains("C56 unknown-unit"), "{}", run.stderr);
}

// ---- standard input as `-` ----

#[test]
fn a_declaration_and_a_rulebook_may_come_on_standard_input() {
    let legal =
        std::fs::read(Path::new(env!("CARGO_MANIFEST_DIR")).join(LEGAL)).unwrap_or_default();
    let run = Gonogo::new(&["check", "--rules", RULES, "-"])
        .stdin(legal)
        .run();
    assert_eq!(run.code, 0, "{}", run.stderr);
    assert!(run.stdout.contains("TV-27-014"), "{}", run.stdout);
    let book = std::fs::read(
        Path::new(env!("CARGO_MANIFEST_DIR")).join("grammar/examples/parts-and-conditions.rules"),
    )
    .unwrap_or_default();
    let run = Gonogo::new(&["lint", "-"]).stdin(book).run();
    assert_eq!(run.code, 0, "{}{}", run.stdout, run.stderr);
}

#[test]
fn standard_input_is_capped_on_the_bytes_read_and_named_once() {
    let run = Gonogo::new(&["lint", "-"])
        .stdin(vec![b'#'; 9 * 1024 * 1024])
        .run();
    assert_eq!(run.code, 2);
    assert!(
        run.stdout.contains("over the limit of 8388608 bytes"),
        "{}",
        run.stdout
    );
    let run = Gonogo::new(&["check", "--rules", "-", "-"]).run();
    assert_eq!(run.code, 2);
    assert!(run.stderr.contains("W06 stdin-twice"), "{}", run.stderr);
}

#[test]
fn output_onto_the_file_standard_input_comes_from_is_refused() {
    let dir = Scratch::new("stdin-file");
    let declaration = dir.copy(LEGAL, "v.yaml");
    let before = text(&declaration);
    let run = Gonogo::new(&["check", "--rules", RULES, "--output", s(&declaration), "-"])
        .stdin_file(&declaration)
        .run();
    assert_eq!(run.code, 2, "{}", run.stderr);
    assert!(run.stderr.contains("W01 output-is-input"), "{}", run.stderr);
    assert_eq!(text(&declaration), before);
}

// ---- the field walk ----

/// The field summary line of a text report: "N engines: …".
fn summary(stdout: &str) -> &str {
    stdout
        .lines()
        .rev()
        .find(|l| l.contains(" engines: "))
        .unwrap_or_default()
}

#[cfg(unix)]
#[test]
fn a_folder_linking_to_itself_counts_each_engine_once() {
    let dir = Scratch::new("self");
    dir.copy(LEGAL, "field/a.yaml");
    dir.copy("engines-demo/limited2-close-bore.yaml", "field/b.yaml");
    std::os::unix::fs::symlink(".", dir.join("field/again")).unwrap_or_else(|e| panic!("{e}"));
    let run = Gonogo::new(&["check", "--rules", RULES, s(&dir.join("field"))]).run();
    assert!(
        summary(&run.stdout).starts_with("2 engines:"),
        "{}\n{}",
        run.stdout,
        run.stderr
    );
    assert!(run.stderr.contains("1 name dropped"), "{}", run.stderr);
}

#[test]
fn a_file_named_twice_counts_once_and_says_so() {
    let dir = Scratch::new("twice");
    let a = dir.copy(LEGAL, "a.yaml");
    let b = dir.copy("engines-demo/limited2-close-bore.yaml", "b.yaml");
    let dotted = dir.0.join(".").join("a.yaml");
    let run = Gonogo::new(&["check", "--rules", RULES, s(&a), s(&b), s(&dotted)]).run();
    assert!(
        summary(&run.stdout).starts_with("2 engines:"),
        "{}\n{}",
        run.stdout,
        run.stderr
    );
    assert!(run.stderr.contains("1 name dropped"), "{}", run.stderr);
}

#[test]
fn extensions_in_any_case_are_taken_and_other_files_counted() {
    let dir = Scratch::new("case");
    dir.copy(LEGAL, "field/a.yaml");
    dir.copy(LEGAL, "field/B.YAML");
    dir.copy(LEGAL, "field/c.Yml");
    std::fs::write(dir.join("field/notes.txt"), "pit notes\n").unwrap_or_else(|e| panic!("{e}"));
    let run = Gonogo::new(&["check", "--rules", RULES, s(&dir.join("field"))]).run();
    assert!(
        summary(&run.stdout).starts_with("3 engines:"),
        "{}\n{}",
        run.stdout,
        run.stderr
    );
    assert!(
        run.stderr.contains("1 file in the folders skipped"),
        "{}",
        run.stderr
    );
}

#[cfg(unix)]
#[test]
fn a_fifo_in_a_folder_is_skipped_with_a_word() {
    let dir = Scratch::new("fifo-in");
    dir.copy(LEGAL, "field/a.yaml");
    let fifo = dir.join("field/pipe.yaml");
    let made = Command::new("mkfifo").arg(&fifo).status();
    if !made.is_ok_and(|s| s.success()) {
        println!("a_fifo_in_a_folder_is_skipped_with_a_word: skipped, no mkfifo here");
        return;
    }
    let run = Gonogo::new(&["check", "--rules", RULES, s(&dir.join("field"))]).run();
    assert_eq!(run.code, 0, "{}", run.stderr);
    assert!(
        run.stderr.contains("pipe.yaml` skipped: it is a FIFO"),
        "{}",
        run.stderr
    );
}

#[test]
fn fmt_write_leaves_a_file_changed_since_it_was_read() {
    let dir = Scratch::new("changed");
    let file = dir.join("r.rules");
    std::fs::write(&file, "series \"edited meanwhile\"\n").unwrap_or_else(|e| panic!("{e}"));
    let refused = gonogo::output::rewrite_input(&file, "series \"S\"\n", "series \"T\"\n");
    assert!(
        matches!(&refused, Err(p) if p.code.to_string().contains("W07")),
        "{refused:?}"
    );
    assert_eq!(text(&file), "series \"edited meanwhile\"\n");
}

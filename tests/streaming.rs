//! `check` over a field of several batches (it loads, checks and writes `BATCH` declarations
//! at a time): the report is the same at any thread count and in any order asked for, each
//! engine's part is what checking that engine alone gives, and a bad declaration in a later
//! batch leaves no output at all, the `--output` file untouched and no temporary file behind.

mod common;

use std::path::{Path, PathBuf};

use common::{Run, files_under, gonogo};
use gonogo::commands::check::BATCH;

const RULES: &str = "rulebooks-demo/tamsin-2027.rules";

/// Copies of every demo engine: this many of each, so the field spans at least three batches.
const COPIES: usize = 27;

/// A folder under the temporary folder, removed when dropped.
struct Folder(PathBuf);

impl Folder {
    fn new(name: &str) -> Folder {
        let path = std::env::temp_dir().join(format!("gonogo-{}-{name}", std::process::id()));
        let _ = std::fs::remove_dir_all(&path);
        std::fs::create_dir_all(&path).unwrap_or_else(|e| panic!("cannot make {name}: {e}"));
        Folder(path)
    }

    fn join(&self, name: &str) -> String {
        self.0.join(name).to_string_lossy().into_owned()
    }

    fn names(&self) -> Vec<String> {
        let mut names: Vec<String> = std::fs::read_dir(&self.0)
            .map(|entries| {
                entries
                    .flatten()
                    .map(|e| e.file_name().to_string_lossy().into_owned())
                    .collect()
            })
            .unwrap_or_default();
        names.sort();
        names
    }
}

impl Drop for Folder {
    fn drop(&mut self) {
        let _ = std::fs::remove_dir_all(&self.0);
    }
}

/// A field of `COPIES` copies of every demo engine, in a folder of its own.
fn field(name: &str) -> (Folder, usize) {
    let folder = Folder::new(name);
    let demo = files_under("engines-demo", ".yaml");
    for copy in 0..COPIES {
        for engine in &demo {
            let file = engine.file_name().map(Path::new).unwrap_or(Path::new("e"));
            let to = folder.0.join(format!("{copy:02}-{}", file.display()));
            std::fs::copy(engine, &to).unwrap_or_else(|e| panic!("cannot copy: {e}"));
        }
    }
    (folder, demo.len() * COPIES)
}

fn check(folder: &Folder, extra: &[&str]) -> Run {
    let path = folder.0.to_string_lossy().into_owned();
    let mut args = vec!["check", "--rules", RULES];
    args.extend(extra);
    args.push(&path);
    gonogo(&args)
}

fn json(run: &Run) -> serde_json::Value {
    serde_json::from_str(&run.stdout).unwrap_or_else(|e| panic!("not JSON: {e}"))
}

#[test]
fn a_field_of_several_batches_is_the_same_at_any_thread_count() {
    let (folder, engines) = field("batches");
    assert!(engines > 2 * BATCH, "the field must span three batches");
    for extra in [
        &["--format", "text"][..],
        &["--format", "json"],
        &["--sort", "result"],
    ] {
        let one = check(&folder, &[extra, &["--jobs", "1"]].concat());
        let two = check(&folder, &[extra, &["--jobs", "2"]].concat());
        assert_eq!(one.code, 1, "{}", one.stderr);
        assert!(one.stdout == two.stdout, "{extra:?}: --jobs 1 and 2 differ");
    }
}

#[test]
fn each_engine_of_a_streamed_field_is_what_checking_it_alone_gives() {
    let (folder, engines) = field("alone");
    let whole = json(&check(&folder, &["--format", "json", "--jobs", "2"]));
    let listed = whole["engines"].as_array().cloned().unwrap_or_default();
    assert_eq!(listed.len(), engines);
    let names = folder.names();
    // the first and last engine, and those either side of each batch's edge
    for at in [0, BATCH - 1, BATCH, 2 * BATCH - 1, 2 * BATCH, engines - 1] {
        let alone = gonogo(&[
            "check",
            "--rules",
            RULES,
            "--format",
            "json",
            &folder.join(&names[at]),
        ]);
        assert_eq!(
            listed[at],
            json(&alone)["engines"][0],
            "engine {at} ({})",
            names[at]
        );
    }
}

#[test]
fn the_field_table_of_a_streamed_field_counts_and_lists_every_engine() {
    let (folder, engines) = field("table");
    let run = check(&folder, &["--sort", "result"]);
    // the demo engines' own counts, each engine copied COPIES times
    let demo = gonogo(&["check", "--rules", RULES, "engines-demo"]);
    let counts: Vec<usize> = demo
        .stdout
        .lines()
        .last()
        .unwrap_or_default()
        .split(|c: char| !c.is_ascii_digit())
        .filter_map(|n| n.parse().ok())
        .collect();
    assert_eq!(counts.len(), 4, "{}", tail(&demo.stdout));
    let totals = format!(
        "{engines} engines: {} legal, {} illegal, {} not all clear",
        counts[1] * COPIES,
        counts[2] * COPIES,
        counts[3] * COPIES
    );
    assert!(run.stdout.contains(&totals), "{}", tail(&run.stdout));
    let table: Vec<&str> = run
        .stdout
        .rsplit("\nfield\n")
        .next()
        .unwrap_or_default()
        .lines()
        .skip(1)
        .take(engines)
        .collect();
    let rank = |row: &&str| match () {
        () if row.contains(" ILLEGAL ") => 0,
        () if row.contains(" not all clear ") => 1,
        () => 2,
    };
    let ranks: Vec<u8> = table.iter().map(rank).collect();
    assert_eq!(ranks.len(), engines);
    assert!(
        ranks.is_sorted(),
        "--sort result: illegal, then unclear, then legal"
    );
}

#[test]
fn a_bad_declaration_in_a_later_batch_leaves_no_report_and_the_output_file_as_it_was() {
    let (folder, _) = field("late-error");
    std::fs::write(folder.join("zz-broken.yaml"), "engine: [unclosed\n").unwrap_or_default();
    let out = Folder::new("late-error-out");
    let target = out.join("report.txt");
    std::fs::write(&target, "kept\n").unwrap_or_default();
    let to_file = check(&folder, &["--output", &target]);
    assert_eq!(to_file.code, 2, "{}", to_file.stderr);
    assert!(
        to_file.stderr.contains("zz-broken.yaml"),
        "{}",
        to_file.stderr
    );
    assert_eq!(
        std::fs::read_to_string(&target).unwrap_or_default(),
        "kept\n"
    );
    assert_eq!(
        out.names(),
        ["report.txt"],
        "no temporary file is left beside the target"
    );
    let to_stdout = check(&folder, &[]);
    assert_eq!(to_stdout.code, 2);
    assert_eq!(
        to_stdout.stdout, "",
        "nothing of the report reaches standard output"
    );
}

fn tail(text: &str) -> &str {
    &text[text.len().saturating_sub(600)..]
}

/// Whether a hidden `.NAME.XXXXXX.partial` twin is in `folder`.
fn has_twin(folder: &Folder) -> bool {
    folder.names().iter().any(|n| n.ends_with(".partial"))
}

#[test]
fn a_run_interrupted_while_writing_leaves_the_target_as_it_was_and_no_temporary_file() {
    let (field, _) = field("interrupt");
    let out = Folder::new("interrupt-out");
    let target = out.join("report.json");
    let field_path = field.0.to_string_lossy().into_owned();
    // the twin exists only while the finished report is copied into it: catch that moment
    let mut caught = 0;
    for _ in 0..8 {
        if caught == 2 {
            break;
        }
        std::fs::write(&target, "kept\n").unwrap_or_default();
        let mut child = std::process::Command::new(env!("CARGO_BIN_EXE_gonogo"))
            .args([
                "check", "--rules", RULES, "--format", "json", "--output", &target,
            ])
            .arg(&field_path)
            .current_dir(env!("CARGO_MANIFEST_DIR"))
            .stderr(std::process::Stdio::null())
            .spawn()
            .unwrap_or_else(|e| panic!("cannot run gonogo: {e}"));
        while child.try_wait().ok().flatten().is_none() && !has_twin(&out) {
            std::thread::sleep(std::time::Duration::from_micros(200));
        }
        if child.try_wait().ok().flatten().is_none() {
            let _ = std::process::Command::new("kill")
                .args(["-INT", &child.id().to_string()])
                .status();
            let status = child.wait().ok().and_then(|s| s.code());
            // killed before the twin was renamed (the target as it was) or just after (the
            // whole report): never a half-written target, and nothing left beside it
            if status == Some(130) {
                caught += 1;
                let now = std::fs::read_to_string(&target).unwrap_or_default();
                assert!(
                    now == "kept\n" || serde_json::from_str::<serde_json::Value>(&now).is_ok(),
                    "the target is neither as it was nor a whole report: {}",
                    tail(&now)
                );
            }
        }
        let _ = child.wait();
        assert!(
            !has_twin(&out),
            "a temporary file was left: {:?}",
            out.names()
        );
    }
    assert!(caught > 0, "no run was caught while writing its report");
}

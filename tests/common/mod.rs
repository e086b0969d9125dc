//! Shared helpers for integration tests: running the real binary, and listing files.

#![allow(dead_code)]

use std::path::{Path, PathBuf};
use std::process::{Command, Stdio};

/// What one run of the binary produced.
pub struct Run {
    /// Exit status.
    pub code: i32,
    /// Standard output.
    pub stdout: String,
    /// Standard error.
    pub stderr: String,
}

/// Runs `gonogo` with arguments from the crate root, without colour.
pub fn gonogo(args: &[&str]) -> Run {
    let output = Command::new(env!("CARGO_BIN_EXE_gonogo"))
        .args(args)
        .current_dir(env!("CARGO_MANIFEST_DIR"))
        .env("NO_COLOR", "1")
        .env("SOURCE_DATE_EPOCH", "1810000000") // pins the provenance time: 2027-05-11T01:46:40Z
        .stdin(Stdio::null())
        .output()
        .unwrap_or_else(|e| panic!("cannot run gonogo: {e}"));
    Run {
        code: output.status.code().unwrap_or(-1),
        stdout: String::from_utf8_lossy(&output.stdout).into_owned(),
        stderr: String::from_utf8_lossy(&output.stderr).into_owned(),
    }
}

/// Every file under `dir` (relative to the crate root) whose name ends in `ending`, sorted.
pub fn files_under(dir: &str, ending: &str) -> Vec<PathBuf> {
    let mut found = Vec::new();
    collect(
        &Path::new(env!("CARGO_MANIFEST_DIR")).join(dir),
        ending,
        &mut found,
    );
    found.sort();
    found
}

fn collect(dir: &Path, ending: &str, found: &mut Vec<PathBuf>) {
    let Ok(entries) = std::fs::read_dir(dir) else {
        return;
    };
    for entry in entries.flatten() {
        let path = entry.path();
        if path.is_dir() {
            collect(&path, ending, found);
        } else if path.to_string_lossy().ends_with(ending) {
            found.push(path);
        }
    }
}

/// A scratch file under the system's temporary folder, removed when dropped. Its name carries
/// the process id, so test binaries running at once do not share it; tests in one binary give
/// different names.
pub struct Scratch(PathBuf);

impl Scratch {
    /// Writes `bytes` to a new scratch file named after `name`.
    pub fn new(name: &str, bytes: &[u8]) -> Scratch {
        let path = std::env::temp_dir().join(format!("gonogo-{}-{name}", std::process::id()));
        std::fs::write(&path, bytes)
            .unwrap_or_else(|e| panic!("cannot write {}: {e}", path.display()));
        Scratch(path)
    }

    /// Its path, as an argument for the binary.
    pub fn path(&self) -> &str {
        self.0.to_str().unwrap_or_default()
    }
}

impl Drop for Scratch {
    fn drop(&mut self) {
        let _ = std::fs::remove_file(&self.0);
    }
}

/// `unwrap_or_else(panic!)` with a word on what was wanted, for options and results alike.
pub trait OrPanic<T> {
    /// The value, or a panic naming what was wanted.
    fn or_panic(self, what: &str) -> T;
}

impl<T> OrPanic<T> for Option<T> {
    fn or_panic(self, what: &str) -> T {
        self.unwrap_or_else(|| panic!("no {what}"))
    }
}

impl<T, E: std::fmt::Debug> OrPanic<T> for Result<T, E> {
    fn or_panic(self, what: &str) -> T {
        self.unwrap_or_else(|e| panic!("{what}: {e:?}"))
    }
}

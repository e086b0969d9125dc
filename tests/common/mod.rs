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

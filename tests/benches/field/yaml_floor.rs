//! The floor of the whole-process benchmark (`tests/benches/field/run.sh`): reads every
//! `.yaml` file under the named folders, sorted by path, and parses each into a serde_yaml
//! `Value` on one thread, doing nothing else. gonogo cannot check a field faster than this
//! with the same YAML reader, so its times are quoted as ratios to this program's.
//!
//! Run: `cargo run --release --example yaml-floor -- DIR...`

use std::path::{Path, PathBuf};

fn main() {
    let mut files = Vec::new();
    for dir in std::env::args().skip(1) {
        collect(Path::new(&dir), &mut files);
    }
    files.sort();
    let mut mappings = 0usize;
    for file in &files {
        let Ok(text) = std::fs::read_to_string(file) else {
            continue;
        };
        if let Ok(serde_yaml::Value::Mapping(_)) = serde_yaml::from_str::<serde_yaml::Value>(&text)
        {
            mappings += 1;
        }
    }
    std::process::exit(if mappings == files.len() { 0 } else { 1 });
}

fn collect(path: &Path, out: &mut Vec<PathBuf>) {
    if path.is_dir() {
        let Ok(entries) = std::fs::read_dir(path) else {
            return;
        };
        for entry in entries.flatten() {
            collect(&entry.path(), out);
        }
    } else if path.extension().is_some_and(|e| e == "yaml") {
        out.push(path.to_path_buf());
    }
}

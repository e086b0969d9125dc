//! Verifying a log: every entry's hash is recomputed and its link to the previous entry
//! checked, every stored file is checked against its content address, and every inspection
//! is checked again from its stored bytes with the running gonogo, so a tool upgrade that
//! changes a call, or an edit of the file, shows before it matters.

use std::path::{Component, Path, PathBuf};

use serde_json::Value;

use super::chain::GENESIS;
use super::query::{Filter, Stored};
use super::schema::Log;
use crate::commands::check::{CheckFormat, CheckRequest, Role};
use crate::diagnostic::Problem;
use crate::digest::{framed_sha256, sha256_hex};

/// A place the chain or a stored file does not hold together.
#[derive(Clone, Debug, PartialEq, Eq)]
pub struct Break {
    /// The inspection's sequence number, or 0 for a stored file.
    pub seq: i64,
    /// What is wrong.
    pub why: String,
}

/// One inspection checked again.
#[derive(Clone, Debug)]
pub struct Rerun {
    /// The sequence number.
    pub seq: i64,
    /// The engine.
    pub engine: String,
    /// The result recorded.
    pub recorded: String,
    /// The result now, or why it could not be had.
    pub now: Result<String, String>,
    /// Rules whose verdict differs: section, recorded, now.
    pub differing: Vec<(String, String, String)>,
}

impl Rerun {
    /// Whether the call would now differ (or cannot be made again).
    pub fn differs(&self) -> bool {
        match &self.now {
            Ok(now) => *now != self.recorded || !self.differing.is_empty(),
            Err(_) => true,
        }
    }
}

/// The outcome of verifying a log.
#[derive(Clone, Debug, Default)]
pub struct Verification {
    /// Inspections in the log.
    pub inspections: usize,
    /// Where the chain or a stored file is broken.
    pub breaks: Vec<Break>,
    /// Every inspection checked again.
    pub reruns: Vec<Rerun>,
}

impl Verification {
    /// Whether the log holds together and every call would be made again the same.
    pub fn clean(&self) -> bool {
        self.breaks.is_empty() && !self.reruns.iter().any(Rerun::differs)
    }
}

/// Verifies the whole log.
pub fn verify(log: &Log) -> Result<Verification, Problem> {
    let all = log.list(&Filter::default())?;
    let mut verification = Verification {
        inspections: all.len(),
        breaks: chain_breaks(&all),
        reruns: Vec::new(),
    };
    for (hash, bytes) in log.blobs()? {
        if sha256_hex(&bytes) != hash {
            verification.breaks.push(Break {
                seq: 0,
                why: format!(
                    "the stored file {} does not have that SHA-256",
                    short(&hash)
                ),
            });
        }
    }
    for fingerprint in log.rulebooks()? {
        let files = log.rulebook_files(&fingerprint)?;
        let parts: Vec<(&str, &[u8])> = files
            .iter()
            .map(|(n, b)| (n.as_str(), b.as_slice()))
            .collect();
        if framed_sha256(&parts) != fingerprint {
            verification.breaks.push(Break {
                seq: 0,
                why: format!(
                    "the stored rulebook {} does not match its fingerprint",
                    short(&fingerprint)
                ),
            });
        }
    }
    for stored in &all {
        verification.reruns.push(rerun(log, stored));
    }
    Ok(verification)
}

/// Each entry whose hash is not its own or whose link does not name the entry before it.
pub fn chain_breaks(all: &[Stored]) -> Vec<Break> {
    let mut breaks = Vec::new();
    let mut previous = GENESIS.to_string();
    for stored in all {
        if stored.entry.previous_hash != previous {
            breaks.push(Break {
                seq: stored.seq,
                why: "its link does not name the entry before it".to_string(),
            });
        }
        if stored.entry.hash() != stored.entry_hash {
            breaks.push(Break {
                seq: stored.seq,
                why: "its contents do not match its hash: the entry was edited".to_string(),
            });
        }
        previous = stored.entry_hash.clone();
    }
    breaks
}

fn short(hash: &str) -> &str {
    hash.get(..12).unwrap_or(hash)
}

/// One inspection checked again from its stored bytes.
fn rerun(log: &Log, stored: &Stored) -> Rerun {
    let now = check_again(log, stored);
    let recorded = &stored.entry.result;
    let differing = match &now {
        Ok(report) => differing_verdicts(&stored.entry.report, report),
        Err(_) => Vec::new(),
    };
    Rerun {
        seq: stored.seq,
        engine: stored.entry.engine.clone().unwrap_or_default(),
        recorded: recorded.clone(),
        now: now.map(|report| result_of(&report)),
        differing,
    }
}

/// The stored rulebook and declaration written to a scratch folder and checked there as
/// recorded (same `--class` and `--as`); the engine's JSON report.
fn check_again(log: &Log, stored: &Stored) -> Result<String, String> {
    let folder = scratch_folder(stored.seq);
    let result = check_in(log, stored, &folder);
    let _ = std::fs::remove_dir_all(&folder);
    result
}

fn check_in(log: &Log, stored: &Stored, folder: &Path) -> Result<String, String> {
    let entry = &stored.entry;
    let files = log.rulebook_files(&entry.rulebook).map_err(|p| p.message)?;
    let root = write_rulebook(folder, &files)?;
    let declaration = log.blob(&entry.declaration).map_err(|p| p.message)?;
    let name = folder.join("declaration.yaml");
    std::fs::write(&name, declaration).map_err(|e| e.to_string())?;
    let role = entry.role_given.as_deref().and_then(role_of);
    let declarations = [name];
    let request = CheckRequest {
        notes: None,
        rules: &root,
        class: entry.class_given.as_deref(),
        role,
        format: CheckFormat::Json,
        declarations: &declarations,
        jobs: Some(1),
        monte_carlo: None,
        produced: crate::report::provenance::produced_now(),
        sort: crate::commands::check::CheckSort::File,
        sections: None,
    };
    let (report, _) =
        crate::commands::check::run(&request).map_err(|f| first_line(&f.to_string()))?;
    Ok(report)
}

/// Writes a stored rulebook's files under `folder`; the root file's path. A stored name that
/// would leave the folder is refused.
pub fn write_rulebook(folder: &Path, files: &[(String, Vec<u8>)]) -> Result<PathBuf, String> {
    let root = folder.join("rulebook.rules");
    for (index, (name, bytes)) in files.iter().enumerate() {
        let path = if index == 0 {
            root.clone()
        } else {
            folder.join(safe_name(name)?)
        };
        if let Some(parent) = path.parent() {
            std::fs::create_dir_all(parent).map_err(|e| e.to_string())?;
        }
        std::fs::write(&path, bytes).map_err(|e| e.to_string())?;
    }
    Ok(root)
}

/// A stored relative name as a path, refused if any part is not a plain name.
pub fn safe_name(name: &str) -> Result<PathBuf, String> {
    let path = PathBuf::from(name);
    let plain = !name.is_empty() && path.components().all(|c| matches!(c, Component::Normal(_)));
    if plain {
        Ok(path)
    } else {
        Err(format!(
            "the stored file name `{name}` is not a plain relative path"
        ))
    }
}

fn scratch_folder(seq: i64) -> PathBuf {
    std::env::temp_dir().join(format!("gonogo-verify-{}-{seq}", std::process::id()))
}

fn role_of(word: &str) -> Option<Role> {
    match word {
        "inspector" => Some(Role::Inspector),
        "builder" => Some(Role::Builder),
        "simple" => Some(Role::Simple),
        _ => None,
    }
}

fn first_line(text: &str) -> String {
    text.lines()
        .find(|l| !l.trim().is_empty())
        .unwrap_or("the inspection could not be checked again")
        .trim()
        .to_string()
}

fn engine_of(report: &str) -> Value {
    let doc: Value = serde_json::from_str(report).unwrap_or(Value::Null);
    doc.get("engines")
        .and_then(|e| e.get(0))
        .cloned()
        .unwrap_or(Value::Null)
}

/// The result word of a stored or fresh report (`legal`, `illegal`, `not-all-clear`).
pub fn result_of(report: &str) -> String {
    engine_of(report)
        .get("result")
        .and_then(Value::as_str)
        .unwrap_or("")
        .to_string()
}

/// Rules whose verdict differs between two reports: section, before, after.
pub fn differing_verdicts(before: &str, after: &str) -> Vec<(String, String, String)> {
    let verdicts = |report: &str| -> Vec<(String, String)> {
        engine_of(report)
            .get("rules")
            .and_then(Value::as_array)
            .into_iter()
            .flatten()
            .map(|r| {
                let get = |k: &str| r.get(k).and_then(Value::as_str).unwrap_or("").to_string();
                (get("section"), get("verdict"))
            })
            .collect()
    };
    let (old, new) = (verdicts(before), verdicts(after));
    let mut out = Vec::new();
    for (section, verdict) in &new {
        let was = old
            .iter()
            .find(|(s, _)| s == section)
            .map_or("absent".to_string(), |(_, v)| v.clone());
        if was != *verdict {
            out.push((section.clone(), was, verdict.clone()));
        }
    }
    for (section, verdict) in &old {
        if !new.iter().any(|(s, _)| s == section) {
            out.push((section.clone(), verdict.clone(), "absent".to_string()));
        }
    }
    out
}

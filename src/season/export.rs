//! Exporting a log: every stored declaration and rulebook written back out as files into a
//! folder, so nothing is locked in the log. Declarations go to `declarations/` named by the
//! first 16 hexadecimal digits of their SHA-256, rulebooks to `rulebooks/<fingerprint>/` with
//! their included files at their relative names. Nothing that already exists is overwritten:
//! the whole export is refused before anything is written.

use std::path::{Path, PathBuf};

use super::query::Filter;
use super::schema::Log;
use super::verify::safe_name;
use crate::diagnostic::{Problem, codes};

/// The files written: path and bytes.
pub type Files = Vec<(PathBuf, Vec<u8>)>;

/// The files an export of the log into `folder` writes.
pub fn plan(log: &Log, folder: &Path) -> Result<Files, Problem> {
    let mut files: Files = Vec::new();
    let mut seen = std::collections::HashSet::new();
    for stored in log.list(&Filter::default())? {
        let hash = stored.entry.declaration;
        if seen.insert(hash.clone()) {
            let name = format!("{}.yaml", &hash[..16.min(hash.len())]);
            files.push((folder.join("declarations").join(name), log.blob(&hash)?));
        }
    }
    for fingerprint in log.rulebooks()? {
        let base = folder
            .join("rulebooks")
            .join(&fingerprint[..16.min(fingerprint.len())]);
        for (index, (name, bytes)) in log.rulebook_files(&fingerprint)?.into_iter().enumerate() {
            let path = if index == 0 {
                base.join("rulebook.rules")
            } else {
                base.join(safe_name(&name).map_err(|why| unusable(&why))?)
            };
            files.push((path, bytes));
        }
    }
    Ok(files)
}

/// Writes the export; refuses, writing nothing, when any file to be written exists.
pub fn export(log: &Log, folder: &Path) -> Result<Files, Problem> {
    let files = plan(log, folder)?;
    if let Some((path, _)) = files.iter().find(|(p, _)| p.exists()) {
        return Err(Problem::unlocated(
            codes::log::EXPORT_EXISTS,
            format!("`{}` already exists; nothing was exported", path.display()),
        )
        .with_help("export into a new or empty folder"));
    }
    for (path, bytes) in &files {
        let written = path
            .parent()
            .map_or(Ok(()), std::fs::create_dir_all)
            .and_then(|()| {
                std::fs::OpenOptions::new()
                    .write(true)
                    .create_new(true)
                    .open(path)
            })
            .and_then(|mut f| std::io::Write::write_all(&mut f, bytes));
        if let Err(e) = written {
            return Err(Problem::unlocated(
                codes::write::WRITE_FAILED,
                format!("`{}` could not be written: {e}", path.display()),
            )
            .with_help("check the folder is writable and the disk is not full"));
        }
    }
    Ok(files)
}

fn unusable(why: &str) -> Problem {
    Problem::unlocated(codes::log::STORED_INPUT_UNUSABLE, why.to_string())
        .with_help("the log was edited by hand; run `gonogo season verify` on it")
}

//! SHA-256 fingerprints of a check's inputs: a declaration's bytes, and a rulebook with every
//! file it includes, so a report, and the season log, can name exactly what produced a call.
//!
//! A rulebook's fingerprint is taken over its files in the order they are read (the root file
//! first, then each include depth-first, in the order written; a file included twice counts
//! once). Each file contributes its name, a NUL byte, its length in bytes as decimal digits, a
//! NUL byte, then its bytes. The root file's name is empty, so renaming the root file keeps the
//! fingerprint; an included file's name is its path relative to the root file's folder with
//! `/` between parts, as the include statements name it. The length makes the framing
//! unambiguous: no two different sets of files give the same stream of bytes.

use std::path::Path;

use sha2::{Digest, Sha256};

use crate::parse::includes::RulebookFiles;
use crate::source::SourceMap;

/// The SHA-256 of `bytes`, as 64 lowercase hexadecimal digits (FIPS 180-4).
pub fn sha256_hex(bytes: &[u8]) -> String {
    hex(&Sha256::digest(bytes))
}

/// The fingerprint of a rulebook: SHA-256 over every file it was read from, framed as the
/// module documentation says.
pub fn rulebook_sha256(files: &RulebookFiles, sources: &SourceMap) -> String {
    let named: Vec<(String, &[u8])> = rulebook_parts(files, sources);
    let borrowed: Vec<(&str, &[u8])> = named.iter().map(|(n, b)| (n.as_str(), *b)).collect();
    framed_sha256(&borrowed)
}

/// Each file of a rulebook as the fingerprint frames it, in reading order: its name (empty for
/// the root file) and its bytes.
pub fn rulebook_parts<'a>(
    files: &RulebookFiles,
    sources: &'a SourceMap,
) -> Vec<(String, &'a [u8])> {
    let Some((root_id, _)) = files.files.first() else {
        return Vec::new();
    };
    let root_folder = sources.file(*root_id).path.parent().map(Path::to_path_buf);
    files
        .files
        .iter()
        .enumerate()
        .map(|(index, (id, _))| {
            let file = sources.file(*id);
            let name = if index == 0 {
                String::new()
            } else {
                relative_name(&file.path, root_folder.as_deref())
            };
            (name, file.text.as_bytes())
        })
        .collect()
}

/// SHA-256 over named parts, each framed as `name NUL length NUL bytes`.
pub fn framed_sha256(parts: &[(&str, &[u8])]) -> String {
    let mut hasher = Sha256::new();
    for (name, bytes) in parts {
        hasher.update(name.as_bytes());
        hasher.update([0]);
        hasher.update(bytes.len().to_string().as_bytes());
        hasher.update([0]);
        hasher.update(bytes);
    }
    hex(&hasher.finalize())
}

fn relative_name(path: &Path, root_folder: Option<&Path>) -> String {
    let relative = root_folder
        .and_then(|folder| path.strip_prefix(folder).ok())
        .unwrap_or(path);
    relative
        .components()
        .filter_map(|c| match c {
            std::path::Component::Normal(part) => Some(part.to_string_lossy().into_owned()),
            _ => None,
        })
        .collect::<Vec<_>>()
        .join("/")
}

fn hex(bytes: &[u8]) -> String {
    use std::fmt::Write;
    bytes.iter().fold(String::with_capacity(64), |mut out, b| {
        let _ = write!(out, "{b:02x}");
        out
    })
}

#[cfg(test)]
mod tests {
    use super::*;

    /// FIPS 180-4 / NIST CSRC "SHA256.pdf" example values: "abc" and the empty message.
    #[test]
    fn sha256_matches_the_published_examples() {
        assert_eq!(
            sha256_hex(b"abc"),
            "ba7816bf8f01cfea414140de5dae2223b00361a396177a9cb410ff61f20015ad"
        );
        assert_eq!(
            sha256_hex(b""),
            "e3b0c44298fc1c149afbf4c8996fb92427ae41e4649b934ca495991b7852b855"
        );
    }

    #[test]
    fn framing_tells_apart_files_that_concatenate_alike() {
        let one = framed_sha256(&[("", b"ab"), ("x.rules", b"c")]);
        let other = framed_sha256(&[("", b"a"), ("x.rules", b"bc")]);
        assert_ne!(one, other);
    }

    #[test]
    fn a_single_file_is_hashed_with_its_frame() {
        // "" NUL "3" NUL "abc", hashed by hand with `printf '\0003\000abc' | sha256sum`.
        let framed = framed_sha256(&[("", b"abc")]);
        assert_eq!(framed, sha256_hex(b"\x003\x00abc"));
    }
}

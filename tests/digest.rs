//! The fingerprints provenance will carry, checked against Python's hashlib (FIPS 180-4):
//! `tests/vectors/digest.json`, made once by `tests/vectors/make_digest_vectors.py`, holds the
//! SHA-256 of every demo declaration's bytes (what `sha256sum` prints) and of each demo
//! rulebook framed as `src/digest.rs` documents (name NUL length NUL bytes, per file, in
//! reading order).

use std::path::Path;

fn vectors() -> serde_json::Value {
    let text = std::fs::read_to_string(
        Path::new(env!("CARGO_MANIFEST_DIR")).join("tests/vectors/digest.json"),
    )
    .unwrap_or_default();
    serde_json::from_str(&text).unwrap_or(serde_json::Value::Null)
}

#[test]
fn every_demo_declaration_hashes_as_sha256sum_does() {
    let vectors = vectors();
    let declarations = vectors["declarations"]
        .as_object()
        .cloned()
        .unwrap_or_default();
    assert!(
        declarations.len() >= 21,
        "only {} vectors",
        declarations.len()
    );
    for (path, expected) in declarations {
        let bytes = std::fs::read(Path::new(env!("CARGO_MANIFEST_DIR")).join(&path))
            .unwrap_or_else(|e| panic!("{path}: {e}"));
        assert_eq!(
            gonogo::digest::sha256_hex(&bytes),
            expected.as_str().unwrap_or(""),
            "{path}"
        );
    }
}

#[test]
fn each_demo_rulebook_hashes_over_its_files_in_reading_order() {
    let vectors = vectors();
    let rulebooks = vectors["rulebooks"]
        .as_object()
        .cloned()
        .unwrap_or_default();
    assert_eq!(rulebooks.len(), 2);
    for (path, expected) in rulebooks {
        let loaded =
            gonogo::commands::load_rulebook(&Path::new(env!("CARGO_MANIFEST_DIR")).join(&path));
        assert_eq!(
            gonogo::digest::rulebook_sha256(&loaded.files, &loaded.sources),
            expected.as_str().unwrap_or(""),
            "{path}"
        );
    }
}

mod common;

/// Every format of `check` carries the provenance: the version, the same fingerprints as the
/// hashlib vectors above, and the time `SOURCE_DATE_EPOCH` pins (tests/common sets it to
/// 1810000000, which GNU `date -u -d @1810000000` prints as 2027-05-11T01:46:40Z).
#[test]
fn every_check_report_carries_its_provenance() {
    let vectors = vectors();
    let rulebook = vectors["rulebooks"]["rulebooks-demo/tamsin-2027.rules"]
        .as_str()
        .unwrap_or("missing");
    let declaration = vectors["declarations"]["engines-demo/limited2-legal.yaml"]
        .as_str()
        .unwrap_or("missing");
    for format in ["text", "markdown", "html", "json"] {
        let run = common::gonogo(&[
            "check",
            "--format",
            format,
            "--rules",
            "rulebooks-demo/tamsin-2027.rules",
            "engines-demo/limited2-legal.yaml",
        ]);
        assert_eq!(run.code, 0, "{format}: {}", run.stderr);
        for fact in [
            rulebook,
            declaration,
            "2027-05-11T01:46:40Z",
            env!("CARGO_PKG_VERSION"),
        ] {
            assert!(run.stdout.contains(fact), "{format} lacks {fact}");
        }
    }
}

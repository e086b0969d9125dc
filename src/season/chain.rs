//! The hash chain: every entry's hash is SHA-256 (FIPS 180-4) over a canonical encoding of
//! the entry that includes the previous entry's hash, so changing, removing or reordering any
//! entry changes every hash after it.
//!
//! The encoding is the framing of [`crate::digest::framed_sha256`]: for each field, in the
//! order of [`Entry::parts`], its name, a NUL byte, its length in bytes as decimal digits, a
//! NUL byte and its UTF-8 bytes. A field without a value is left out, so an absent field and
//! an empty one encode differently. The first entry's previous hash is [`GENESIS`].

use crate::digest::framed_sha256;

/// The previous hash of the first entry: 64 zeros.
pub const GENESIS: &str = "0000000000000000000000000000000000000000000000000000000000000000";

/// One inspection as the chain covers it: every stored column but the sequence number and
/// the entry's own hash. Serialisable so a run can stage its entries in a spool
/// ([`super::record::Staging`]) until it records them.
#[derive(Clone, Debug, Default, PartialEq, Eq, serde::Serialize, serde::Deserialize)]
pub struct Entry {
    /// The engine's identifier.
    pub engine: Option<String>,
    /// The car number.
    pub car: Option<String>,
    /// The class checked against.
    pub class: String,
    /// The event.
    pub event: Option<String>,
    /// The declaration's date, `YYYY-MM-DD`.
    pub date: Option<String>,
    /// Who measured.
    pub measured_by: Option<String>,
    /// Why the engine was inspected.
    pub reason: Option<String>,
    /// The protest's, claim's or draw's reference.
    pub reference: Option<String>,
    /// The sections inspected, comma-separated; `None` is every rule.
    pub scope: Option<String>,
    /// The seals found, as JSON (`[{"number": …, "place": …}]`).
    pub seals_found: String,
    /// The seals applied, as JSON.
    pub seals_applied: String,
    /// The declaration's file name as given to `check`.
    pub file: String,
    /// `--class` when given.
    pub class_given: Option<String>,
    /// `--as` when given.
    pub role_given: Option<String>,
    /// The gonogo version that made the call.
    pub gonogo_version: String,
    /// The decision rule applied.
    pub decision: String,
    /// The engine's result (`legal`, `illegal`, `not-all-clear`).
    pub result: String,
    /// The full JSON report of the engine.
    pub report: String,
    /// Seconds since 1970-01-01 UTC.
    pub recorded_at: i64,
    /// The rulebook's fingerprint ([`crate::digest::rulebook_sha256`]).
    pub rulebook: String,
    /// The SHA-256 of the declaration's bytes.
    pub declaration: String,
    /// The previous entry's hash, or [`GENESIS`].
    pub previous_hash: String,
}

impl Entry {
    /// The fields in their canonical order, named; absent fields left out.
    pub fn parts(&self) -> Vec<(&'static str, String)> {
        let required = [
            ("previous_hash", self.previous_hash.clone()),
            ("class", self.class.clone()),
            ("seals_found", self.seals_found.clone()),
            ("seals_applied", self.seals_applied.clone()),
            ("file", self.file.clone()),
            ("gonogo_version", self.gonogo_version.clone()),
            ("decision", self.decision.clone()),
            ("result", self.result.clone()),
            ("report", self.report.clone()),
            ("recorded_at", self.recorded_at.to_string()),
            ("rulebook", self.rulebook.clone()),
            ("declaration", self.declaration.clone()),
        ];
        let optional = [
            ("engine", &self.engine),
            ("car", &self.car),
            ("event", &self.event),
            ("date", &self.date),
            ("measured_by", &self.measured_by),
            ("reason", &self.reason),
            ("reference", &self.reference),
            ("scope", &self.scope),
            ("class_given", &self.class_given),
            ("role_given", &self.role_given),
        ];
        let mut parts: Vec<(&'static str, String)> = required.into_iter().collect();
        parts.extend(
            optional
                .into_iter()
                .filter_map(|(name, value)| value.clone().map(|v| (name, v))),
        );
        parts
    }

    /// The entry's hash: SHA-256 over its canonical encoding.
    pub fn hash(&self) -> String {
        let parts = self.parts();
        let framed: Vec<(&str, &[u8])> = parts
            .iter()
            .map(|(name, value)| (*name, value.as_bytes()))
            .collect();
        framed_sha256(&framed)
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::digest::sha256_hex;

    #[test]
    fn the_hash_is_sha256_of_the_framed_fields() {
        let entry = Entry {
            class: "c".into(),
            previous_hash: GENESIS.into(),
            ..Entry::default()
        };
        // Built by hand from the module's definition: each required field in order,
        // `name NUL length NUL bytes`; recorded_at 0 is "0".
        let mut bytes = Vec::new();
        for (name, value) in [
            ("previous_hash", GENESIS),
            ("class", "c"),
            ("seals_found", ""),
            ("seals_applied", ""),
            ("file", ""),
            ("gonogo_version", ""),
            ("decision", ""),
            ("result", ""),
            ("report", ""),
            ("recorded_at", "0"),
            ("rulebook", ""),
            ("declaration", ""),
        ] {
            bytes.extend_from_slice(format!("{name}\0{}\0{value}", value.len()).as_bytes());
        }
        assert_eq!(entry.hash(), sha256_hex(&bytes));
    }

    #[test]
    fn an_absent_field_and_an_empty_one_hash_apart() {
        let absent = Entry::default();
        let empty = Entry {
            engine: Some(String::new()),
            ..Entry::default()
        };
        assert_ne!(absent.hash(), empty.hash());
    }

    #[test]
    fn the_previous_hash_is_covered() {
        let a = Entry::default();
        let b = Entry {
            previous_hash: GENESIS.into(),
            ..Entry::default()
        };
        assert_ne!(a.hash(), b.hash());
    }
}

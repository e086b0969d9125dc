//! The time an inspection is stamped with: `SOURCE_DATE_EPOCH` when set (the reproducible
//! builds convention, so tests and snapshots are stable), else the system clock; the same
//! time and the same RFC 3339 rendering as a report's provenance
//! ([`crate::report::provenance`]).

use crate::report::provenance::{SOURCE_DATE_EPOCH, epoch_seconds};

/// Seconds since 1970-01-01 00:00 UTC: `SOURCE_DATE_EPOCH` when it is a whole number, else
/// now.
pub fn now() -> i64 {
    epoch_seconds(std::env::var(SOURCE_DATE_EPOCH).ok().as_deref())
}

pub use crate::report::provenance::rfc3339_utc as utc;

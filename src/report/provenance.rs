//! What produced a report: the gonogo version, the fingerprints of its inputs and when. Every
//! `check` report carries them as one compact block (text, Markdown, HTML, JSON), beside the
//! decision rule and where it came from, so a call can be traced to its exact inputs on appeal.

use std::time::{SystemTime, UNIX_EPOCH};

use serde::Serialize;

use crate::evaluate::outcome::EngineReport;

/// The environment variable that pins the time a report was produced (seconds since
/// 1970-01-01T00:00:00Z), so that reports, and their snapshots, repeat exactly.
pub const SOURCE_DATE_EPOCH: &str = "SOURCE_DATE_EPOCH";

/// What produced one engine's report, as every format shows it: gonogo's version, the
/// fingerprints of the rulebook (every file, see [`crate::digest`]) and of the declaration's
/// bytes, and when the report was produced. The decision rule and where it came from are the
/// view's own facts ([`super::view::EngineView::decision_words`]), shown beside these.
#[derive(Clone, Debug, PartialEq, Eq, Serialize)]
pub struct Provenance {
    /// gonogo's version (`CARGO_PKG_VERSION`).
    pub gonogo_version: &'static str,
    /// The rulebook's framed SHA-256 (`digest::rulebook_sha256`).
    pub rulebook_sha256: String,
    /// The SHA-256 of the declaration's bytes, as `sha256sum` gives it.
    pub declaration_sha256: String,
    /// When the report was produced, RFC 3339 in UTC; `None` for a report built in process
    /// without a time (a library caller's), never for a command's.
    pub produced: Option<String>,
}

impl Provenance {
    /// The provenance of one evaluated engine.
    pub fn of(report: &EngineReport) -> Provenance {
        Provenance {
            gonogo_version: env!("CARGO_PKG_VERSION"),
            rulebook_sha256: report.rulebook.sha256.clone(),
            declaration_sha256: report.declaration.sha256.clone(),
            produced: report.produced.clone(),
        }
    }

    /// `gonogo 0.1.0 · produced 2027-05-22T18:04:00Z`, the first line of the block.
    pub fn made_by(&self) -> String {
        match &self.produced {
            Some(when) => format!("gonogo {} · produced {when}", self.gonogo_version),
            None => format!("gonogo {}", self.gonogo_version),
        }
    }
}

/// When a command's report is produced: [`produced_at`] of the environment's
/// `SOURCE_DATE_EPOCH`, taken once per process so every engine of a run carries one time.
pub fn produced_now() -> String {
    static NOW: std::sync::OnceLock<String> = std::sync::OnceLock::new();
    NOW.get_or_init(|| produced_at(std::env::var(SOURCE_DATE_EPOCH).ok().as_deref()))
        .clone()
}

/// When a report is produced: `SOURCE_DATE_EPOCH` when it is set to a whole number of
/// seconds, else the clock; as RFC 3339 in UTC (`2027-05-22T18:04:00Z`).
pub fn produced_at(source_date_epoch: Option<&str>) -> String {
    rfc3339_utc(epoch_seconds(source_date_epoch))
}

/// Seconds since 1970-01-01T00:00:00Z: `source_date_epoch` when it is a whole number, else
/// the clock (the season log stamps its entries with this too).
pub fn epoch_seconds(source_date_epoch: Option<&str>) -> i64 {
    let pinned = source_date_epoch.and_then(|text| text.trim().parse::<i64>().ok());
    pinned.unwrap_or_else(|| {
        SystemTime::now()
            .duration_since(UNIX_EPOCH)
            .map(|d| i64::try_from(d.as_secs()).unwrap_or(i64::MAX))
            .unwrap_or(0)
    })
}

/// Seconds since the Unix epoch as RFC 3339 in UTC, by the proleptic Gregorian calendar.
pub fn rfc3339_utc(seconds: i64) -> String {
    let (days, in_day) = (seconds.div_euclid(86_400), seconds.rem_euclid(86_400));
    let (year, month, day) = civil_from_days(days);
    format!(
        "{year:04}-{month:02}-{day:02}T{:02}:{:02}:{:02}Z",
        in_day / 3600,
        in_day % 3600 / 60,
        in_day % 60
    )
}

/// The calendar date `days` after 1970-01-01: H. Hinnant's `civil_from_days`, from "chrono-
/// Compatible Low-Level Date Algorithms" (eras of 400 years, March-based years).
fn civil_from_days(days: i64) -> (i64, i64, i64) {
    let z = days + 719_468;
    let era = z.div_euclid(146_097);
    let doe = z.rem_euclid(146_097);
    let yoe = (doe - doe / 1460 + doe / 36_524 - doe / 146_096) / 365;
    let doy = doe - (365 * yoe + yoe / 4 - yoe / 100);
    let mp = (5 * doy + 2) / 153;
    let day = doy - (153 * mp + 2) / 5 + 1;
    let month = if mp < 10 { mp + 3 } else { mp - 9 };
    let year = yoe + era * 400 + i64::from(month <= 2);
    (year, month, day)
}

#[cfg(test)]
mod tests {
    use super::*;

    /// Expected values printed by GNU coreutils `date -u -d @SECONDS +%FT%TZ`.
    #[test]
    fn seconds_become_the_dates_gnu_date_gives() {
        assert_eq!(rfc3339_utc(0), "1970-01-01T00:00:00Z");
        assert_eq!(rfc3339_utc(1_700_000_000), "2023-11-14T22:13:20Z");
        assert_eq!(rfc3339_utc(951_782_400), "2000-02-29T00:00:00Z");
        assert_eq!(rfc3339_utc(4_102_444_799), "2099-12-31T23:59:59Z");
    }

    #[test]
    fn source_date_epoch_pins_the_time_and_garbage_falls_back_to_the_clock() {
        assert_eq!(produced_at(Some("1700000000")), "2023-11-14T22:13:20Z");
        let clock = produced_at(Some("yesterday"));
        assert_eq!(clock.len(), "2023-11-14T22:13:20Z".len());
        assert!(clock.as_str() > "2023-11-14T22:13:20Z", "{clock}");
    }
}

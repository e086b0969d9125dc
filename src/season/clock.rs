//! The time an inspection is stamped with: `SOURCE_DATE_EPOCH` when set (the reproducible
//! builds convention, so tests and snapshots are stable), else the system clock; and its
//! rendering as a UTC date and time.

/// Seconds since 1970-01-01 00:00 UTC: `SOURCE_DATE_EPOCH` when it is a whole number, else
/// now.
pub fn now() -> i64 {
    if let Some(pinned) = std::env::var("SOURCE_DATE_EPOCH")
        .ok()
        .and_then(|v| v.trim().parse::<i64>().ok())
    {
        return pinned;
    }
    std::time::SystemTime::now()
        .duration_since(std::time::UNIX_EPOCH)
        .map(|d| d.as_secs() as i64)
        .unwrap_or(0)
}

/// `YYYY-MM-DDTHH:MM:SSZ` (RFC 3339) for seconds since the epoch.
pub fn utc(seconds: i64) -> String {
    let days = seconds.div_euclid(86_400);
    let second_of_day = seconds.rem_euclid(86_400);
    let (y, m, d) = civil_from_days(days);
    format!(
        "{y:04}-{m:02}-{d:02}T{:02}:{:02}:{:02}Z",
        second_of_day / 3600,
        second_of_day % 3600 / 60,
        second_of_day % 60
    )
}

/// Year, month and day of a count of days since 1970-01-01 in the proleptic Gregorian
/// calendar (H. Hinnant, "chrono-Compatible Low-Level Date Algorithms", `civil_from_days`;
/// from memory).
fn civil_from_days(days: i64) -> (i64, i64, i64) {
    let z = days + 719_468;
    let era = z.div_euclid(146_097);
    let doe = z.rem_euclid(146_097);
    let yoe = (doe - doe / 1460 + doe / 36_524 - doe / 146_096) / 365;
    let doy = doe - (365 * yoe + yoe / 4 - yoe / 100);
    let mp = (5 * doy + 2) / 153;
    let d = doy - (153 * mp + 2) / 5 + 1;
    let m = if mp < 10 { mp + 3 } else { mp - 9 };
    let y = yoe + era * 400 + i64::from(m <= 2);
    (y, m, d)
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn known_instants_render_as_published() {
        // `date -u -d @0` and `date -u -d @951782400` (GNU coreutils): the epoch and the
        // leap day 2000-02-29.
        assert_eq!(utc(0), "1970-01-01T00:00:00Z");
        assert_eq!(utc(951_782_400), "2000-02-29T00:00:00Z");
        // 2027-05-22 13:30:05 UTC: `date -u -d @1810992605`
        assert_eq!(utc(1_810_992_605), "2027-05-22T13:30:05Z");
        assert_eq!(utc(-1), "1969-12-31T23:59:59Z");
    }
}

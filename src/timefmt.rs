//! Time parsing and formatting at the edges: RFC 3339 UTC in, RFC 3339 UTC with milliseconds out.

use chrono::{DateTime, SecondsFormat, TimeZone, Utc};

/// Parse an RFC 3339 time (`2026-12-02T00:00:00Z`, any offset accepted and converted to UTC).
pub fn parse_utc(text: &str) -> Result<DateTime<Utc>, String> {
    DateTime::parse_from_rfc3339(text.trim())
        .map(|t| t.with_timezone(&Utc))
        .map_err(|e| format!("'{text}' is not an RFC 3339 time such as 2026-12-02T00:00:00Z ({e})"))
}

/// Format as RFC 3339 UTC with milliseconds: `2026-12-02T01:23:45.678Z`.
pub fn format_ms(t: &DateTime<Utc>) -> String {
    t.to_rfc3339_opts(SecondsFormat::Millis, true)
}

/// Compact UTC stamp for file names: `20261202T0123Z`.
pub fn file_stamp(t: &DateTime<Utc>) -> String {
    t.format("%Y%m%dT%H%MZ").to_string()
}

/// Seconds (f64) between two times, `b - a`.
pub fn seconds_between(a: &DateTime<Utc>, b: &DateTime<Utc>) -> f64 {
    (*b - *a)
        .num_microseconds()
        .map(|us| us as f64 * 1e-6)
        .unwrap_or_else(|| (*b - *a).num_milliseconds() as f64 * 1e-3)
}

/// `t + seconds` (rounded to the nearest microsecond).
pub fn add_seconds(t: &DateTime<Utc>, seconds: f64) -> DateTime<Utc> {
    *t + chrono::Duration::microseconds((seconds * 1e6).round() as i64)
}

/// Unix epoch helper for tests and examples.
pub fn utc(y: i32, mo: u32, d: u32, h: u32, mi: u32, s: u32) -> DateTime<Utc> {
    Utc.with_ymd_and_hms(y, mo, d, h, mi, s)
        .single()
        .expect("valid date")
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn round_trip_ms() {
        let t = parse_utc("2026-12-02T01:23:45.678Z").unwrap();
        assert_eq!(format_ms(&t), "2026-12-02T01:23:45.678Z");
        assert!(parse_utc("yesterday").is_err());
        assert_eq!(file_stamp(&t), "20261202T0123Z");
    }
}

//! Time parsing and formatting at the edges: RFC 3339 UTC in, RFC 3339 UTC with milliseconds out.

use chrono::{DateTime, Datelike, SecondsFormat, TimeZone, Timelike, Utc};

/// Parse an RFC 3339 time (`2026-12-02T00:00:00Z`, any offset accepted and converted to UTC).
///
/// A leap second (`:60`) is refused: chrono accepts one on any date, and the planner's time scale
/// has none (SGP4 and the Sun and Moon run on seconds of a day of 86400 s), so `23:59:60` read as
/// the next day's `00:00:00` or as a second that repeats, by function.
pub fn parse_utc(text: &str) -> Result<DateTime<Utc>, String> {
    let t = DateTime::parse_from_rfc3339(text.trim())
        .map(|t| t.with_timezone(&Utc))
        .map_err(|e| {
            format!("'{text}' is not an RFC 3339 time such as 2026-12-02T00:00:00Z ({e})")
        })?;
    if t.timestamp_subsec_nanos() >= 1_000_000_000 {
        return Err(format!(
            "'{text}' is a leap second (:60), which passbudget does not take (its time scale has none): give :59 or the next minute"
        ));
    }
    Ok(t)
}

/// Format as RFC 3339 UTC with milliseconds: `2026-12-02T01:23:45.678Z`.
pub fn format_ms(t: &DateTime<Utc>) -> String {
    // The digits written directly (chrono's formatter costs ~1 us a call, a visible share of a
    // year's `passes`); chrono's own for what the fixed layout cannot hold. The same bytes as
    // `to_rfc3339_opts(SecondsFormat::Millis, true)` (checked in the tests).
    write_in(t, *b"0000-00-00T00:00:00.000Z", &DATE_TIME_MS, || {
        t.to_rfc3339_opts(SecondsFormat::Millis, true)
    })
}

/// The calendar fields of a UTC time whose year has four digits and that is not in a leap
/// second (`None` otherwise: the callers fall back to chrono's formatter).
struct Fields {
    year: u32,
    month: u32,
    day: u32,
    hour: u32,
    minute: u32,
    second: u32,
    millis: u32,
}

impl Fields {
    fn of(t: &DateTime<Utc>) -> Option<Fields> {
        // The naive time's fields (those of `DateTime<Utc>` convert through the offset first).
        let t = t.naive_utc();
        let year = u32::try_from(t.year()).ok().filter(|y| *y <= 9999)?;
        let nanos = t.nanosecond();
        if nanos >= 1_000_000_000 {
            return None;
        }
        Some(Fields {
            year,
            month: t.month(),
            day: t.day(),
            hour: t.hour(),
            minute: t.minute(),
            second: t.second(),
            millis: nanos / 1_000_000,
        })
    }
}

/// The ASCII bytes of a formatted time as a `String` (one copy; collecting `char`s costs
/// several times that).
fn ascii(b: &[u8]) -> String {
    String::from_utf8(b.to_vec()).expect("the digits and separators are ASCII")
}

/// A calendar field of [`Fields`], for [`write_in`].
#[derive(Clone, Copy)]
enum Field {
    Year,
    Month,
    Day,
    Hour,
    Minute,
    Second,
    Millis,
}

/// The places of an RFC 3339 date, time of day and milliseconds (`2026-12-02T01:23:45.678Z`);
/// the first six are those of a table's date and time (`2026-12-02 01:23:45`).
const DATE_TIME_MS: [(Field, usize, usize); 7] = [
    (Field::Year, 0, 4),
    (Field::Month, 5, 7),
    (Field::Day, 8, 10),
    (Field::Hour, 11, 13),
    (Field::Minute, 14, 16),
    (Field::Second, 17, 19),
    (Field::Millis, 20, 23),
];

/// `t`'s fields written into the ASCII template `b` at `places` (each field zero-padded to its
/// place's width); `fallback` (chrono's formatter) where the fixed layout cannot hold `t`.
fn write_in<const N: usize>(
    t: &DateTime<Utc>,
    mut b: [u8; N],
    places: &[(Field, usize, usize)],
    fallback: impl FnOnce() -> String,
) -> String {
    let Some(f) = Fields::of(t) else {
        return fallback();
    };
    for &(field, start, end) in places {
        let value = match field {
            Field::Year => f.year,
            Field::Month => f.month,
            Field::Day => f.day,
            Field::Hour => f.hour,
            Field::Minute => f.minute,
            Field::Second => f.second,
            Field::Millis => f.millis,
        };
        put_digits(&mut b[start..end], value);
    }
    ascii(&b)
}

/// `value` in decimal, zero-padded to the width of `out` (ASCII digits).
fn put_digits(out: &mut [u8], mut value: u32) {
    for d in out.iter_mut().rev() {
        *d = b'0' + (value % 10) as u8;
        value /= 10;
    }
}

/// Compact UTC stamp for file names: `20261202T0123Z`.
pub fn file_stamp(t: &DateTime<Utc>) -> String {
    use Field::*;
    let places = [
        (Year, 0, 4),
        (Month, 4, 6),
        (Day, 6, 8),
        (Hour, 9, 11),
        (Minute, 11, 13),
    ];
    write_in(t, *b"00000000T0000Z", &places, || {
        t.format("%Y%m%dT%H%MZ").to_string()
    })
}

/// The time of day for a table: `01:23:45` (chrono's `%H:%M:%S`, seconds truncated).
pub fn clock(t: &DateTime<Utc>) -> String {
    use Field::*;
    let places = [(Hour, 0, 2), (Minute, 3, 5), (Second, 6, 8)];
    write_in(t, *b"00:00:00", &places, || {
        t.format("%H:%M:%S").to_string()
    })
}

/// Whether a table of times from `start` up to (not including) `end` shows their year: when
/// they fall in two years. A window of a year or more would otherwise show the same month and
/// day for two dates a year apart.
pub fn needs_year(start: &DateTime<Utc>, end: &DateTime<Utc>) -> bool {
    let last = (*end - chrono::Duration::microseconds(1)).max(*start);
    start.year() != last.year()
}

/// A time later in a table row than `first` (a pass's TCA or LOS after its AOS): the time of day
/// on `first`'s UTC day, with the date (as [`table_time`]) on a later day (a pass across midnight,
/// a satellite that never sets).
pub fn clock_after(first: &DateTime<Utc>, t: &DateTime<Utc>, with_year: bool) -> String {
    match t.date_naive() == first.date_naive() {
        true => clock(t),
        false => table_time(t, with_year),
    }
}

/// A table's date and time of day: `12-02 01:23:45`, or with `with_year` (see [`needs_year`])
/// `2026-12-02 01:23:45`.
pub fn table_time(t: &DateTime<Utc>, with_year: bool) -> String {
    if !with_year {
        return day_clock(t);
    }
    write_in(t, *b"0000-00-00 00:00:00", &DATE_TIME_MS[..6], || {
        t.format("%Y-%m-%d %H:%M:%S").to_string()
    })
}

/// Month, day and time of day for a table: `12-02 01:23:45` (chrono's `%m-%d %H:%M:%S`).
pub fn day_clock(t: &DateTime<Utc>) -> String {
    use Field::*;
    let places = [
        (Month, 0, 2),
        (Day, 3, 5),
        (Hour, 6, 8),
        (Minute, 9, 11),
        (Second, 12, 14),
    ];
    write_in(t, *b"00-00 00:00:00", &places, || {
        t.format("%m-%d %H:%M:%S").to_string()
    })
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

    /// A later time in a pass's row keeps its date on a later day: a pass across midnight, a
    /// satellite that never sets (its LOS read 12:00:00, the same as its AOS two days before).
    #[test]
    fn a_later_day_shows_its_date() {
        let aos = utc(2026, 12, 1, 23, 58, 0);
        assert_eq!(
            clock_after(&aos, &utc(2026, 12, 1, 23, 59, 30), false),
            "23:59:30"
        );
        assert_eq!(
            clock_after(&aos, &utc(2026, 12, 2, 0, 4, 12), false),
            "12-02 00:04:12"
        );
        let geo = utc(2026, 12, 1, 12, 0, 0);
        let los = utc(2026, 12, 3, 12, 0, 0);
        assert_eq!(clock_after(&geo, &los, true), "2026-12-03 12:00:00");
    }

    /// A window ending in another year shows the year (the same month and day would otherwise
    /// stand for two dates); one inside a year does not.
    #[test]
    fn tables_show_the_year_across_years() {
        let (a, b) = (utc(2026, 12, 1, 12, 0, 0), utc(2027, 12, 1, 12, 0, 0));
        assert!(needs_year(&a, &b));
        assert!(!needs_year(&a, &utc(2026, 12, 8, 12, 0, 0)));
        // A window that ends exactly at the New Year holds no time of the new year.
        assert!(!needs_year(&a, &utc(2027, 1, 1, 0, 0, 0)));
        assert!(needs_year(&a, &utc(2027, 1, 1, 0, 0, 1)));
        assert_eq!(table_time(&a, true), "2026-12-01 12:00:00");
        assert_eq!(table_time(&b, false), "12-01 12:00:00");
    }

    #[test]
    fn round_trip_ms() {
        let t = parse_utc("2026-12-02T01:23:45.678Z").unwrap();
        assert_eq!(format_ms(&t), "2026-12-02T01:23:45.678Z");
        assert!(parse_utc("yesterday").is_err());
        // a leap second: refused on any date (chrono takes one on any date)
        for t in ["2026-12-01T23:59:60Z", "2016-12-31T23:59:60.5Z"] {
            let e = parse_utc(t).unwrap_err();
            assert!(e.contains("leap second"), "{e}");
        }
        assert!(parse_utc("2026-12-01T23:59:59.999Z").is_ok());
        assert_eq!(file_stamp(&t), "20261202T0123Z");
    }

    /// The direct formatters write chrono's bytes: `to_rfc3339_opts(SecondsFormat::Millis,
    /// true)` and `format("%Y%m%dT%H%MZ")`, over times spread from year 0 to 9999 with every
    /// kind of sub-second part, plus the cases they hand to chrono (years outside 0..=9999, a
    /// leap second).
    #[test]
    fn direct_formatters_match_chrono() {
        let check = |t: DateTime<Utc>| {
            assert_eq!(
                format_ms(&t),
                t.to_rfc3339_opts(SecondsFormat::Millis, true),
                "{t:?}"
            );
            assert_eq!(
                file_stamp(&t),
                t.format("%Y%m%dT%H%MZ").to_string(),
                "{t:?}"
            );
            assert_eq!(clock(&t), t.format("%H:%M:%S").to_string(), "{t:?}");
            assert_eq!(
                table_time(&t, true),
                t.format("%Y-%m-%d %H:%M:%S").to_string(),
                "{t:?}"
            );
            assert_eq!(
                day_clock(&t),
                t.format("%m-%d %H:%M:%S").to_string(),
                "{t:?}"
            );
        };
        let first = utc(0, 1, 1, 0, 0, 0).timestamp();
        let last = utc(9999, 12, 31, 23, 59, 59).timestamp();
        let mut x = 0x9e37_79b9_7f4a_7c15u64;
        for i in 0..20_000i64 {
            x ^= x << 13;
            x ^= x >> 7;
            x ^= x << 17;
            let secs = first + (x % (last - first + 1) as u64) as i64;
            let nanos = [
                0,
                999_999_999,
                1_000_000,
                999_999,
                (x >> 20) as u32 % 1_000_000_000,
            ][(i % 5) as usize];
            check(DateTime::from_timestamp(secs, nanos).unwrap());
        }
        check(utc(-1, 12, 31, 23, 59, 59));
        check(utc(10_000, 1, 1, 0, 0, 0));
        let leap = chrono::NaiveDate::from_ymd_opt(2016, 12, 31)
            .unwrap()
            .and_hms_milli_opt(23, 59, 59, 1_500)
            .unwrap()
            .and_utc();
        check(leap);
    }
}

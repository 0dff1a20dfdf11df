//! What the contact plan needs beyond the link: each satellite's data on board (storage,
//! generation, the fill at the window start) and the booking rules of a station's antennas
//! (turnaround, minimum contact, minimum peak elevation, blocked periods).
//!
//! ```yaml
//! # in a satellite item of the mission file (satellite: or satellites:)
//! onboard:
//!   storage_bits: 1.0e12          # capacity of the store
//!   initial_fill_bits: 2.0e11     # fill at the window start (default 0)
//!   generation_bps: 8.0e6         # average rate the payload makes, or:
//!   generation_file: gen.csv      # start,end,rate_bps rows (RFC 3339 UTC), in time order
//! # in a station file (or, with `station: NAME`, in the mission file's booking: list)
//! antennas: 2                     # identical antennas at the site (default 1)
//! booking:
//!   turnaround_s: 60              # slew and set-up before each contact
//!   min_contact_s: 120            # shorter contacts are not booked
//!   min_peak_elevation_deg: 10    # contacts peaking lower are not booked
//!   blocked:                      # maintenance, other users: UTC intervals
//!     - { start: 2026-12-03T08:00:00Z, end: 2026-12-03T12:00:00Z }
//! ```

use super::defaults as dflt;
use super::limits;
use super::{read_text, Checker, ConfigError};
use chrono::{DateTime, Utc};
use serde::Deserialize;
use std::path::{Path, PathBuf};

#[derive(Debug, Clone, Deserialize)]
#[serde(deny_unknown_fields)]
pub(super) struct OnboardFile {
    storage_bits: f64,
    initial_fill_bits: Option<f64>,
    generation_bps: Option<f64>,
    generation_file: Option<String>,
}

#[derive(Debug, Clone, Default, Deserialize)]
#[serde(deny_unknown_fields)]
pub(super) struct BookingFile {
    turnaround_s: Option<f64>,
    min_contact_s: Option<f64>,
    min_peak_elevation_deg: Option<f64>,
    blocked: Option<Vec<BlockedFile>>,
}

/// A mission-level booking rule: the station it applies to, then the keys of a station's
/// `booking:` block (each replaces the station file's; blocked periods add to its own).
#[derive(Debug, Clone, Deserialize)]
#[serde(deny_unknown_fields)]
pub(super) struct BookingRuleFile {
    pub station: String,
    turnaround_s: Option<f64>,
    min_contact_s: Option<f64>,
    min_peak_elevation_deg: Option<f64>,
    blocked: Option<Vec<BlockedFile>>,
}

#[derive(Debug, Clone, Deserialize)]
#[serde(deny_unknown_fields)]
struct BlockedFile {
    start: String,
    end: String,
}

/// A UTC interval: start, end.
pub type Period = (DateTime<Utc>, DateTime<Utc>);

/// The payload's data generation.
#[derive(Debug, Clone, PartialEq)]
pub enum Generation {
    /// A constant average rate, bit/s.
    Average { rate_bps: f64 },
    /// Generation windows (in time order, not overlapping), from a CSV file.
    Windows {
        source: PathBuf,
        windows: Vec<GenerationWindow>,
    },
}

/// One generation window: the payload makes `rate_bps` from `start` to `end`.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct GenerationWindow {
    pub start: DateTime<Utc>,
    pub end: DateTime<Utc>,
    pub rate_bps: f64,
}

/// A satellite's data on board, validated.
#[derive(Debug, Clone, PartialEq)]
pub struct Onboard {
    pub storage_bits: f64,
    pub initial_fill_bits: f64,
    pub generation: Generation,
}

/// The booking rules of a station's antennas, validated.
#[derive(Debug, Clone, PartialEq)]
pub struct Booking {
    /// Slew and set-up time before each contact, s.
    pub turnaround_s: f64,
    /// Contacts shorter than this are not booked, s (0: no rule).
    pub min_contact_s: f64,
    /// Contacts peaking lower than this are not booked, deg (0: no rule).
    pub min_peak_elevation_deg: f64,
    /// Periods the antennas are not available (maintenance, other users), in time order.
    pub blocked: Vec<Period>,
}

/// The `onboard:` block of a satellite (`key` is its dotted key, for messages; `base` the mission
/// file's folder for `generation_file`).
pub(super) fn onboard(
    c: &mut Checker,
    key: &str,
    o: &OnboardFile,
    base: &Path,
) -> Result<Onboard, ConfigError> {
    let k = |name: &str| format!("{key}.{name}");
    let storage_bits = check(c, &k("storage_bits"), &limits::STORAGE_BITS, o.storage_bits)?;
    let initial_fill_bits = match o.initial_fill_bits {
        Some(v) => check(c, &k("initial_fill_bits"), &limits::STORAGE_BITS, v)?,
        None => c.default(&dflt::INITIAL_FILL_BITS),
    };
    if initial_fill_bits > storage_bits {
        let msg = format!(
            "{} bit is more than storage_bits ({} bit)",
            limits::short_number(initial_fill_bits),
            limits::short_number(storage_bits)
        );
        return Err(c.err(&k("initial_fill_bits"), msg));
    }
    let generation = match (o.generation_bps, &o.generation_file) {
        (Some(r), None) => Generation::Average {
            rate_bps: check(c, &k("generation_bps"), &limits::GENERATION_BPS, r)?,
        },
        (None, Some(f)) => {
            let path = super::mission::resolve(base, f);
            let text = read_text(&path).map_err(|e| c.err(&k("generation_file"), e.message))?;
            Generation::Windows {
                windows: generation_windows(&path, &text)?,
                source: path,
            }
        }
        (Some(_), Some(_)) => {
            return Err(c.err(key, "give generation_bps or generation_file, not both"))
        }
        (None, None) => return Err(c.err(key, "needs generation_bps or generation_file")),
    };
    Ok(Onboard {
        storage_bits,
        initial_fill_bits,
        generation,
    })
}

/// A value within its range, the message naming `key` (a range's own key may differ in a list).
fn check(c: &Checker, key: &str, r: &limits::Range, v: f64) -> Result<f64, ConfigError> {
    r.check(v).map_err(|e| c.err(key, e))
}

/// Generation windows from CSV text: a header `start,end,rate_bps`, then one window per row in
/// time order, none overlapping the one before. Errors name the file and the line.
pub fn generation_windows(path: &Path, text: &str) -> Result<Vec<GenerationWindow>, ConfigError> {
    let mut reader = csv::ReaderBuilder::new()
        .trim(csv::Trim::All)
        .comment(Some(b'#'))
        .from_reader(text.as_bytes());
    let header_error = |m: &str| ConfigError::new(path, Some(1), None, m.to_string());
    let headers = reader
        .headers()
        .map_err(|e| header_error(&format!("cannot read the header: {e}")))?
        .clone();
    if headers.iter().collect::<Vec<_>>() != ["start", "end", "rate_bps"] {
        return Err(header_error("the header must be start,end,rate_bps"));
    }
    let mut windows: Vec<GenerationWindow> = Vec::new();
    for record in reader.records() {
        let line = |r: &Result<csv::StringRecord, csv::Error>| match r {
            Ok(r) => r.position().map(|p| p.line() as usize),
            Err(e) => e.position().map(|p| p.line() as usize),
        };
        let at = line(&record);
        let bad = |m: String| ConfigError::new(path, at, None, m);
        let r = record.map_err(|e| bad(e.to_string()))?;
        let field = |i: usize| r.get(i).unwrap_or("");
        let start = crate::timefmt::parse_utc(field(0)).map_err(|m| bad(format!("start: {m}")))?;
        let end = crate::timefmt::parse_utc(field(1)).map_err(|m| bad(format!("end: {m}")))?;
        let rate_bps = field(2)
            .parse::<f64>()
            .map_err(|_| bad(format!("rate_bps: '{}' is not a number", field(2))))?;
        limits::GENERATION_BPS
            .check(rate_bps)
            .map_err(|e| bad(format!("rate_bps: {e}")))?;
        if end <= start {
            return Err(bad("end: the end is not after the start".into()));
        }
        if let Some(prev) = windows.last() {
            if start < prev.end {
                return Err(bad(
                    "start: before the end of the window above (windows in time order, not overlapping)"
                        .into(),
                ));
            }
        }
        windows.push(GenerationWindow {
            start,
            end,
            rate_bps,
        });
    }
    Ok(windows)
}

/// A station file's `booking:` block (or its defaults when the file has none).
pub(super) fn booking(c: &mut Checker, b: &BookingFile) -> Result<Booking, ConfigError> {
    let turnaround_s = c.or_default(&limits::TURNAROUND_S, b.turnaround_s, &dflt::TURNAROUND_S)?;
    let min_contact_s = c.optional(&limits::MIN_CONTACT_S, b.min_contact_s)?;
    let min_peak = c.optional(&limits::MIN_PEAK_ELEVATION_DEG, b.min_peak_elevation_deg)?;
    let blocked = blocked(
        c,
        "booking.blocked",
        b.blocked.as_deref().unwrap_or_default(),
    )?;
    Ok(Booking {
        turnaround_s,
        min_contact_s: min_contact_s.unwrap_or(0.0),
        min_peak_elevation_deg: min_peak.unwrap_or(0.0),
        blocked,
    })
}

/// Apply mission-level rule `index` to a station's booking (`c` reads the mission file).
pub(super) fn apply_rule(
    c: &Checker,
    index: usize,
    r: &BookingRuleFile,
    to: &mut Booking,
) -> Result<(), ConfigError> {
    const KEY: &str = "booking";
    let line = c.item_line(KEY, index);
    let at = |key: &str| line.and_then(|l| c.item_key_line(l, key)).or(line);
    let range = |key: &str, range: &limits::Range, v: Option<f64>| {
        v.map(|x| {
            range.check(x).map_err(|e| {
                c.err_at(
                    at(key),
                    &format!("{KEY}.{key}"),
                    format!("station {}: {e}", r.station),
                )
            })
        })
        .transpose()
    };
    if let Some(v) = range("turnaround_s", &limits::TURNAROUND_S, r.turnaround_s)? {
        to.turnaround_s = v;
    }
    if let Some(v) = range("min_contact_s", &limits::MIN_CONTACT_S, r.min_contact_s)? {
        to.min_contact_s = v;
    }
    let peak = r.min_peak_elevation_deg;
    if let Some(v) = range(
        "min_peak_elevation_deg",
        &limits::MIN_PEAK_ELEVATION_DEG,
        peak,
    )? {
        to.min_peak_elevation_deg = v;
    }
    if let Some(b) = &r.blocked {
        let periods = blocked_at(c, at("blocked"), &format!("{KEY}.blocked"), b)?;
        to.blocked.extend(periods);
        to.blocked.sort();
    }
    Ok(())
}

/// Blocked periods under `key`, each parsed and not empty, returned in time order.
fn blocked(c: &Checker, key: &str, items: &[BlockedFile]) -> Result<Vec<Period>, ConfigError> {
    let mut out = Vec::new();
    for (i, b) in items.iter().enumerate() {
        let bad = |m: String| c.item_err(key, i, m);
        out.push(period(b).map_err(bad)?);
    }
    out.sort();
    Ok(out)
}

/// [`blocked`] in a mission-level rule, whose items have no line of their own: `line` is the rule's.
fn blocked_at(
    c: &Checker,
    line: Option<usize>,
    key: &str,
    items: &[BlockedFile],
) -> Result<Vec<Period>, ConfigError> {
    let mut out = Vec::new();
    for (i, b) in items.iter().enumerate() {
        let msg = |m: String| format!("period {}: {m}", i + 1);
        out.push(period(b).map_err(|m| c.err_at(line, key, msg(m)))?);
    }
    Ok(out)
}

fn period(b: &BlockedFile) -> Result<Period, String> {
    let start = crate::timefmt::parse_utc(&b.start).map_err(|m| format!("start: {m}"))?;
    let end = crate::timefmt::parse_utc(&b.end).map_err(|m| format!("end: {m}"))?;
    if end <= start {
        return Err("the end is not after the start".into());
    }
    Ok((start, end))
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn generation_windows_are_read_in_order() {
        let text = "start,end,rate_bps\n2026-12-01T00:00:00Z,2026-12-01T01:00:00Z,1e6\n# a comment\n2026-12-01T02:00:00Z,2026-12-01T03:00:00Z,2e6\n";
        let w = generation_windows(Path::new("g.csv"), text).unwrap();
        assert_eq!(w.len(), 2);
        assert_eq!(w[1].rate_bps, 2e6);
    }

    #[test]
    fn overlapping_windows_name_the_line() {
        let text = "start,end,rate_bps\n2026-12-01T00:00:00Z,2026-12-01T01:00:00Z,1e6\n2026-12-01T00:30:00Z,2026-12-01T03:00:00Z,2e6\n";
        let e = generation_windows(Path::new("g.csv"), text).unwrap_err();
        assert_eq!(e.line, Some(3));
        assert!(e.to_string().contains("overlapping"), "{e}");
        let neg = "start,end,rate_bps\n2026-12-01T00:00:00Z,2026-12-01T01:00:00Z,-1\n";
        let e = generation_windows(Path::new("g.csv"), neg).unwrap_err();
        assert_eq!(e.line, Some(2));
    }
}

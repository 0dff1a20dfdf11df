//! The booked contacts as iCalendar (RFC 5545), one calendar per station, so operations staff see
//! them in their own calendars. Written with the `icalendar` crate.
//!
//! Each contact is one event (VEVENT, RFC 5545 section 3.6.1) from the antenna's set-up start to
//! the contact's end: the antenna is busy for all of it. The summary names the satellite, the
//! antenna and the rate; the description gives the contact's start, the elevations, the scheme,
//! the expected volume and the planning caution. The UID is stable from run to run for the same
//! contact (satellite, antenna, pass); DTSTAMP is the window start and there is no SEQUENCE, so
//! the same inputs give the same file, and a newer plan's events do not look newer (the README
//! tells users to replace or subscribe rather than import over).

use super::contacts::ContactRow;
use chrono::{DateTime, Timelike, Utc};
use icalendar::{Calendar, Component, Event, EventLike};

/// The calendar of one station's booked contacts (`rows` may hold other stations': they are
/// left out). `stamp` is the DTSTAMP of every event: `plan` gives the window start, not the
/// time of the run, so that the same inputs write the same files.
pub fn station_calendar(
    station: &str,
    rows: &[ContactRow],
    stamp: DateTime<Utc>,
) -> Result<String, String> {
    // RFC 5545 section 3.6: VERSION and PRODID (this program as the product), Gregorian scale.
    let mut cal = Calendar::empty();
    for (k, v) in [
        ("VERSION", "2.0"),
        ("PRODID", "-//passbudget//contact plan//EN"),
        ("CALSCALE", "GREGORIAN"),
    ] {
        cal.append_property(icalendar::Property::new(k, v));
    }
    cal.name(&format!("passbudget contacts: {station}"));
    for r in rows.iter().filter(|r| r.station == station) {
        cal.push(event(r, stamp)?);
    }
    Ok(cal.done().to_string())
}

fn event(r: &ContactRow, stamp: DateTime<Utc>) -> Result<Event, String> {
    let time = |s: &str| crate::timefmt::parse_utc(s);
    // The event covers the whole contact: DATE-TIME has whole seconds (RFC 5545 section 3.3.5),
    // so the set-up start is rounded down and the end up.
    let (setup, end) = (time(&r.setup_start)?, time(&r.end)?);
    let setup = setup.with_nanosecond(0).unwrap_or(setup);
    let end = match end.nanosecond() {
        0 => end,
        _ => end.with_nanosecond(0).unwrap_or(end) + chrono::Duration::seconds(1),
    };
    let uid = format!(
        "{}-{}-{}@passbudget",
        super::slug(&r.satellite),
        super::slug(&r.antenna),
        r.pass_id
    );
    let description = format!(
        "Set-up from {}; contact {} to {} ({:.0} s), elevation {:.1} deg at the start, {:.1} deg at the highest, {:.1} deg at the end.\nRate {} ({}), expected {}{}.\n{}",
        r.setup_start,
        r.start,
        r.end,
        r.duration_s,
        r.start_elevation_deg,
        r.max_elevation_deg,
        r.end_elevation_deg,
        crate::engfmt::rate(r.rate_bps),
        r.scheme,
        crate::engfmt::volume(r.volume_bits),
        if r.shortened { ", shortened to fit the schedule" } else { "" },
        super::plan::CAUTION
    );
    Ok(Event::new()
        .uid(&uid)
        .timestamp(stamp)
        .summary(&format!(
            "{} downlink, {} ({})",
            r.satellite,
            r.antenna,
            crate::engfmt::rate(r.rate_bps)
        ))
        .description(&description)
        .location(&r.antenna)
        .starts(setup)
        .ends(end)
        .done())
}

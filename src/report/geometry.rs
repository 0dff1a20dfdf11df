//! Wire format of `passes` and `track` (public interface: field names are stable).

use crate::geometry::{doppler_hz, Look, Pass};
use crate::orbit::ElementSet;
use crate::plan::inputs::satellite_name;
use crate::report::round;
use crate::timefmt::format_ms;
use chrono::{DateTime, Utc};
use serde::Serialize;

/// One row of the `passes` output.
#[derive(Debug, Clone, Serialize, Default)]
pub struct PassRow {
    pub satellite: String,
    pub norad_id: u64,
    pub station: String,
    /// The pass's identifier, the same whatever the window ([`crate::report::pass_id`]).
    pub pass_id: String,
    pub aos: String,
    pub tca: String,
    pub los: String,
    pub duration_s: f64,
    pub max_elevation_deg: f64,
    pub aos_azimuth_deg: f64,
    pub tca_azimuth_deg: f64,
    pub los_azimuth_deg: f64,
    pub min_range_km: f64,
    pub starts_before_window: bool,
    pub ends_after_window: bool,
}

impl PassRow {
    pub fn new(set: &ElementSet, station: &str, p: &Pass) -> Self {
        Self::with_slug(set, station, &crate::report::slug(station), p)
    }

    /// [`PassRow::new`] with the station's [`crate::report::slug`] made once for its passes.
    pub fn with_slug(set: &ElementSet, station: &str, station_slug: &str, p: &Pass) -> Self {
        PassRow {
            satellite: satellite_name(set),
            norad_id: set.norad_id,
            station: station.to_string(),
            pass_id: crate::report::pass_id_slugged(station_slug, &p.full_tca),
            aos: format_ms(&p.aos),
            tca: format_ms(&p.tca),
            los: format_ms(&p.los),
            duration_s: round(p.duration_s(), 3),
            max_elevation_deg: round(p.max_elevation_deg, 3),
            aos_azimuth_deg: super::round_azimuth(p.aos_azimuth_deg, 3),
            tca_azimuth_deg: super::round_azimuth(p.tca_azimuth_deg, 3),
            los_azimuth_deg: super::round_azimuth(p.los_azimuth_deg, 3),
            min_range_km: round(p.min_range_km, 3),
            starts_before_window: p.starts_before_window,
            ends_after_window: p.ends_after_window,
        }
    }
}

/// The header row of [`passes_csv`], in the field order of [`PassRow`].
const PASS_HEADER: &str = "satellite,norad_id,station,pass_id,aos,tca,los,duration_s,max_elevation_deg,aos_azimuth_deg,tca_azimuth_deg,los_azimuth_deg,min_range_km,starts_before_window,ends_after_window";

/// The `passes` CSV written straight into one buffer: byte for byte what [`super::to_csv`] gives
/// for the same rows (checked in the tests), without the `csv` crate's per-field serializer
/// (the numbers through the fixed-decimal writer of [`super::step_csv`]: [`PassRow::new`] rounds
/// the floats to 3 decimals; any other float is written by `ryu`, as the `csv` crate does).
pub fn passes_csv(rows: &[PassRow], warnings: &[String]) -> String {
    use super::step_csv::{
        push_bool, push_comment_lines, push_rounded, push_ryu, push_text, push_u64,
    };
    let mut buf = Vec::with_capacity(1024 + rows.len() * 200);
    push_comment_lines(&mut buf, warnings);
    // the header even without rows, as `to_csv` writes it
    buf.extend_from_slice(PASS_HEADER.as_bytes());
    buf.push(b'\n');
    for r in rows {
        push_text(&mut buf, &r.satellite);
        buf.push(b',');
        push_u64(&mut buf, r.norad_id);
        for t in [&r.station, &r.pass_id] {
            buf.push(b',');
            push_text(&mut buf, t);
        }
        buf.push(b',');
        for t in [&r.aos, &r.tca, &r.los] {
            push_text(&mut buf, t);
            buf.push(b',');
        }
        for x in [
            r.duration_s,
            r.max_elevation_deg,
            r.aos_azimuth_deg,
            r.tca_azimuth_deg,
            r.los_azimuth_deg,
            r.min_range_km,
        ] {
            if super::round(x, 3).to_bits() == x.to_bits() {
                push_rounded(&mut buf, x, 3);
            } else {
                // a row not made by `PassRow::new`: the float as the `csv` crate writes it
                push_ryu(&mut buf, x);
            }
            buf.push(b',');
        }
        push_bool(&mut buf, r.starts_before_window);
        buf.push(b',');
        push_bool(&mut buf, r.ends_after_window);
        buf.push(b'\n');
    }
    String::from_utf8(buf).expect("CSV text is UTF-8")
}

/// One row of the `track` output.
#[derive(Debug, Clone, Serialize, Default)]
pub struct TrackRow {
    pub time: String,
    pub azimuth_deg: f64,
    pub elevation_deg: f64,
    pub range_km: f64,
    pub range_rate_km_s: f64,
    pub doppler_hz: Option<f64>,
    /// Angle between the satellite's direction and the Sun's centre, deg.
    pub sun_separation_deg: f64,
}

impl TrackRow {
    pub fn new(
        t: &DateTime<Utc>,
        look: &Look,
        frequency_hz: Option<f64>,
        sun_separation_deg: f64,
    ) -> Self {
        TrackRow {
            time: format_ms(t),
            azimuth_deg: super::round_azimuth(look.azimuth_deg, 4),
            elevation_deg: round(look.elevation_deg, 4),
            range_km: round(look.range_km, 4),
            range_rate_km_s: round(look.range_rate_km_s, 6),
            doppler_hz: frequency_hz.map(|f| round(doppler_hz(look.range_rate_km_s, f), 1)),
            sun_separation_deg: round(sun_separation_deg, 3),
        }
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    /// Rows of every kind of field: names that need quoting, negative and tiny values, zeros,
    /// both flags.
    fn rows() -> Vec<PassRow> {
        let names = [
            "WRENLET-1",
            "a,b",
            "say \"hi\"",
            "two\nlines",
            "",
            "Ñu 東京",
        ];
        let values = [
            0.0, -0.0, 1e-7, -2.5e-6, 1.5e-5, 0.001, 12.5, 359.999, -123.456, 9.99e14, 1e15, 1e20,
        ];
        let mut rng = crate::test_rng::Lcg::new();
        (0..3000)
            .map(|i| {
                let mut v = [0.0; 6];
                for f in &mut v {
                    let r = rng.next_u64();
                    *f = if r.is_multiple_of(4) {
                        values[(r >> 8) as usize % values.len()]
                    } else {
                        let unit = crate::test_rng::Lcg::unit_of(r);
                        crate::report::round((unit - 0.3) * 10f64.powi((r % 9) as i32 - 2), 3)
                    };
                }
                let r = rng.next_u64();
                PassRow {
                    satellite: names[i % names.len()].into(),
                    norad_id: r >> (r % 64),
                    station: names[(i / 6) % names.len()].into(),
                    pass_id: format!("st-{i}"),
                    aos: "2026-12-01T18:52:50.280Z".into(),
                    tca: "2026-12-01T18:54:16.404Z".into(),
                    los: names[(i / 36) % names.len()].into(),
                    duration_s: v[0],
                    max_elevation_deg: v[1],
                    aos_azimuth_deg: v[2],
                    tca_azimuth_deg: v[3],
                    los_azimuth_deg: v[4],
                    min_range_km: v[5],
                    starts_before_window: r & 1 == 0,
                    ends_after_window: r & 2 == 0,
                }
            })
            .collect()
    }

    /// The direct writer gives the `csv` crate's bytes (`to_csv`), with and without warnings,
    /// and for no rows at all.
    #[test]
    fn passes_csv_matches_the_csv_crate() {
        let rows = rows();
        let warnings = [
            "first".to_string(),
            "with\nbreak, and \"quotes\"".to_string(),
        ];
        for w in [&[][..], &warnings[..]] {
            assert_eq!(
                passes_csv(&rows, w),
                crate::report::to_csv(&rows, w).unwrap()
            );
            assert_eq!(
                passes_csv(&[], w),
                crate::report::to_csv::<PassRow>(&[], w).unwrap()
            );
        }
    }
}

//! Wire format of `passes` and `track` (public interface: field names are stable).

use crate::geometry::{doppler_hz, Look, Pass};
use crate::orbit::ElementSet;
use crate::plan::inputs::satellite_name;
use crate::report::round;
use crate::timefmt::format_ms;
use chrono::{DateTime, Utc};
use serde::Serialize;

/// One row of the `passes` output.
#[derive(Debug, Clone, Serialize)]
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
        PassRow {
            satellite: satellite_name(set),
            norad_id: set.norad_id,
            station: station.to_string(),
            pass_id: crate::report::pass_id(station, p),
            aos: format_ms(&p.aos),
            tca: format_ms(&p.tca),
            los: format_ms(&p.los),
            duration_s: round(p.duration_s(), 3),
            max_elevation_deg: round(p.max_elevation_deg, 3),
            aos_azimuth_deg: round(p.aos_azimuth_deg, 3),
            tca_azimuth_deg: round(p.tca_azimuth_deg, 3),
            los_azimuth_deg: round(p.los_azimuth_deg, 3),
            min_range_km: round(p.min_range_km, 3),
            starts_before_window: p.starts_before_window,
            ends_after_window: p.ends_after_window,
        }
    }
}

/// One row of the `track` output.
#[derive(Debug, Clone, Serialize)]
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
            azimuth_deg: round(look.azimuth_deg, 4),
            elevation_deg: round(look.elevation_deg, 4),
            range_km: round(look.range_km, 4),
            range_rate_km_s: round(look.range_rate_km_s, 6),
            doppler_hz: frequency_hz.map(|f| round(doppler_hz(look.range_rate_km_s, f), 1)),
            sun_separation_deg: round(sun_separation_deg, 3),
        }
    }
}

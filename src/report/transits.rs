//! Wire format of `sun-transits` (public interface: field names are stable).

use crate::plan::prepare::StationModel;
use crate::plan::transits::{OutageSeason, SunTransit};
use crate::report::round;
use crate::timefmt::format_ms;
use serde::Serialize;

/// One Sun transit through a station's beam.
#[derive(Debug, Clone, Serialize, Default)]
pub struct TransitRow {
    pub station: String,
    pub pass: usize,
    /// The pass's identifier ([`crate::report::pass_id`]).
    pub pass_id: String,
    pub start: String,
    pub end: String,
    pub closest: String,
    pub closest_azimuth_deg: f64,
    pub closest_elevation_deg: f64,
    pub min_separation_deg: f64,
    pub max_sun_noise_k: f64,
    pub max_rise_db: f64,
    pub degraded_s: f64,
}

impl TransitRow {
    pub fn new(stations: &[StationModel], t: &SunTransit) -> Self {
        let station = &stations[t.station_index].station.name;
        TransitRow {
            station: station.clone(),
            pass: t.pass_number,
            pass_id: crate::report::pass_id_at(station, &t.pass_tca),
            start: format_ms(&t.start),
            end: format_ms(&t.end),
            closest: format_ms(&t.closest),
            closest_azimuth_deg: super::round_azimuth(t.closest_azimuth_deg, 3),
            closest_elevation_deg: round(t.closest_elevation_deg, 3),
            min_separation_deg: round(t.min_separation_deg, 3),
            max_sun_noise_k: round(t.max_sun_noise_k, 3),
            max_rise_db: round(t.max_rise_db, 3),
            degraded_s: round(t.degraded_s, 3),
        }
    }
}

/// A Sun-outage season: consecutive days with a transit at one station.
#[derive(Debug, Clone, Serialize)]
pub struct SeasonRow {
    pub station: String,
    pub first_day: String,
    pub last_day: String,
    pub days: usize,
    pub degraded_days: usize,
    pub max_sun_noise_k: f64,
    pub max_rise_db: f64,
    pub cut_by_window: bool,
}

impl SeasonRow {
    pub fn new(stations: &[StationModel], s: &OutageSeason) -> Self {
        SeasonRow {
            station: stations[s.station_index].station.name.clone(),
            first_day: s.first_day.to_string(),
            last_day: s.last_day.to_string(),
            days: s.days,
            degraded_days: s.degraded_days,
            max_sun_noise_k: round(s.max_sun_noise_k, 3),
            max_rise_db: round(s.max_rise_db, 3),
            cut_by_window: s.cut_by_window,
        }
    }
}

//! Sun transits: the stretches of each pass in which the Sun, seen through the station's antenna
//! pattern, raises the system noise temperature by at least [`TRANSIT_RISE_DB`], with what it
//! costs there; and, for a satellite near the geostationary arc, the seasons these transits make
//! (a transit a day over consecutive days: the Sun-outage seasons around the equinoxes).
//!
//! The rule is the noise, not a geometric cone: how far from boresight the Sun matters depends on
//! the beam, the frequency, the Sun's activity and the receiver, all of which the noise includes.
//!
//! [`TransitSink`] is a [`PassSink`]: run a [`super::Planner`] with it and take
//! [`TransitSink::transits`]. The figures come from the plan's own steps (clear sky), so they
//! agree with its per-step CSV.

use super::results::{sun_degrades, sun_rise_db as rise_db, PassSeries};
use super::series::Step;
use super::sink::PassSink;
use crate::orbit::ElementSet;
use crate::timefmt::add_seconds;
use chrono::{DateTime, NaiveDate, Utc};
use std::sync::Mutex;

/// One passage of the Sun through a station's beam during a pass.
#[derive(Debug, Clone, PartialEq)]
pub struct SunTransit {
    pub station_index: usize,
    pub pass_number: usize,
    /// The pass's highest elevation over the whole pass ([`crate::geometry::Pass::full_tca`]),
    /// which identifies it.
    pub pass_tca: DateTime<Utc>,
    /// First and last step with the Sun's disk in the half-power beam.
    pub start: DateTime<Utc>,
    pub end: DateTime<Utc>,
    /// The step closest to the Sun: its time, the pointing there, and the separation, deg.
    pub closest: DateTime<Utc>,
    pub closest_azimuth_deg: f64,
    pub closest_elevation_deg: f64,
    pub min_separation_deg: f64,
    /// Largest antenna temperature the Sun adds, K.
    pub max_sun_noise_k: f64,
    /// Largest rise of the system noise temperature, 10 log10(Tsys / (Tsys - T_sun)), dB.
    pub max_rise_db: f64,
    /// Seconds with a rise above [`SUN_DEGRADED_RISE_DB`](super::results::SUN_DEGRADED_RISE_DB).
    pub degraded_s: f64,
}

/// The rise of the system noise temperature from which the Sun counts as in the beam, dB (our
/// choice: about the smallest rise a Y-factor measurement shows).
pub const TRANSIT_RISE_DB: f64 = 0.1;

/// Consecutive days with a transit at one station (satellites near the geostationary arc only).
#[derive(Debug, Clone, PartialEq)]
pub struct OutageSeason {
    pub station_index: usize,
    pub first_day: NaiveDate,
    pub last_day: NaiveDate,
    /// Days with a transit (a rise of at least [`TRANSIT_RISE_DB`]).
    pub days: usize,
    /// Days with a rise above [`SUN_DEGRADED_RISE_DB`](super::results::SUN_DEGRADED_RISE_DB).
    pub degraded_days: usize,
    pub max_sun_noise_k: f64,
    pub max_rise_db: f64,
    /// The season touches the window's first or last day: it may begin earlier or end later.
    pub cut_by_window: bool,
}

/// Collects the Sun transits of a plan's passes.
#[derive(Default)]
pub struct TransitSink {
    found: Mutex<Vec<SunTransit>>,
}

impl TransitSink {
    pub fn new() -> Self {
        Self::default()
    }

    /// The transits found, in time order.
    pub fn transits(self) -> Vec<SunTransit> {
        let mut v = self.found.into_inner().unwrap_or_else(|e| e.into_inner());
        v.sort_by(|a, b| {
            a.start
                .cmp(&b.start)
                .then(a.station_index.cmp(&b.station_index))
        });
        v
    }
}

impl PassSink for TransitSink {
    type Error = std::convert::Infallible;
    fn pass(&self, series: &PassSeries<'_>) -> Result<(), Self::Error> {
        let p = series.plan;
        let inside = |s: &Step| rise_db(s) >= TRANSIT_RISE_DB;
        let mut found = Vec::new();
        let steps = series.steps;
        let mut i = 0;
        while i < steps.len() {
            if !inside(&steps[i]) {
                i += 1;
                continue;
            }
            let j = (i..steps.len())
                .find(|&k| !inside(&steps[k]))
                .unwrap_or(steps.len());
            found.push(transit(p, &steps[i..j]));
            i = j;
        }
        if !found.is_empty() {
            let mut all = self.found.lock().unwrap_or_else(|e| e.into_inner());
            all.extend(found);
        }
        Ok(())
    }
}

/// The transit made of `run` (steps of one pass, all in the beam, at least one).
fn transit(p: &super::PassPlan, run: &[Step]) -> SunTransit {
    let aos = &p.pass.aos;
    let sep = |s: &Step| s.sun_separation_deg.unwrap_or(f64::INFINITY);
    let closest = run
        .iter()
        .min_by(|a, b| sep(a).total_cmp(&sep(b)))
        .unwrap_or(&run[0]);
    SunTransit {
        station_index: p.station_index,
        pass_number: p.number,
        pass_tca: p.pass.full_tca,
        start: add_seconds(aos, run[0].t_s),
        end: add_seconds(aos, run[run.len() - 1].t_s),
        closest: add_seconds(aos, closest.t_s),
        closest_azimuth_deg: closest.azimuth_deg,
        closest_elevation_deg: closest.elevation_deg,
        min_separation_deg: sep(closest),
        max_sun_noise_k: run.iter().map(|s| s.sun_noise_k).fold(0.0, f64::max),
        max_rise_db: run.iter().map(rise_db).fold(0.0, f64::max),
        degraded_s: run
            .iter()
            .filter(|s| sun_degrades(s))
            // from +0 (an empty f64 sum is -0)
            .fold(0.0, |a, s| a + s.weight_s),
    }
}

/// Mean motion range, rev/day, taken as "near the geostationary arc" (common practice: a
/// geosynchronous orbit makes one revolution per sidereal day, 1.0027 rev/day).
pub const NEAR_GEOSTATIONARY_REV_PER_DAY: (f64, f64) = (0.9, 1.1);

/// Whether `elements` describe a satellite near the geostationary arc (mean motion within
/// [`NEAR_GEOSTATIONARY_REV_PER_DAY`], eccentricity below 0.1, inclination below 15 deg).
pub fn near_geostationary(elements: &ElementSet) -> bool {
    let e = &elements.elements;
    let (lo, hi) = NEAR_GEOSTATIONARY_REV_PER_DAY;
    (lo..=hi).contains(&e.mean_motion) && e.eccentricity < 0.1 && e.inclination < 15.0
}

/// Group `transits` (in time order) into runs of consecutive UTC days per station; `window` is the
/// first and last UTC day of the planned window.
pub fn outage_seasons(
    transits: &[SunTransit],
    stations: usize,
    window: (NaiveDate, NaiveDate),
) -> Vec<OutageSeason> {
    let mut seasons: Vec<OutageSeason> = Vec::new();
    for station_index in 0..stations {
        let mut current: Option<Open> = None;
        for t in transits.iter().filter(|t| t.station_index == station_index) {
            let day = t.start.date_naive();
            match current.as_mut() {
                Some(s) if day <= s.last_day + chrono::Duration::days(1) => {
                    if day > s.last_day {
                        s.days += 1;
                        s.last_day = day;
                        s.degraded_today = false;
                    }
                    if t.degraded_s > 0.0 && !s.degraded_today {
                        s.degraded_days += 1;
                        s.degraded_today = true;
                    }
                    s.max_sun_noise_k = s.max_sun_noise_k.max(t.max_sun_noise_k);
                    s.max_rise_db = s.max_rise_db.max(t.max_rise_db);
                }
                _ => {
                    seasons.extend(current.take().map(|o| o.close(window)));
                    current = Some(Open {
                        station_index,
                        first_day: day,
                        last_day: day,
                        days: 1,
                        degraded_days: usize::from(t.degraded_s > 0.0),
                        degraded_today: t.degraded_s > 0.0,
                        max_sun_noise_k: t.max_sun_noise_k,
                        max_rise_db: t.max_rise_db,
                    });
                }
            }
        }
        seasons.extend(current.map(|o| o.close(window)));
    }
    seasons.sort_by_key(|s| s.first_day);
    seasons
}

/// A season being gathered.
struct Open {
    station_index: usize,
    first_day: NaiveDate,
    last_day: NaiveDate,
    days: usize,
    degraded_days: usize,
    /// A transit of `last_day` already counted in `degraded_days`.
    degraded_today: bool,
    max_sun_noise_k: f64,
    max_rise_db: f64,
}

impl Open {
    fn close(self, window: (NaiveDate, NaiveDate)) -> OutageSeason {
        OutageSeason {
            station_index: self.station_index,
            first_day: self.first_day,
            last_day: self.last_day,
            days: self.days,
            degraded_days: self.degraded_days,
            max_sun_noise_k: self.max_sun_noise_k,
            max_rise_db: self.max_rise_db,
            cut_by_window: self.first_day <= window.0 || self.last_day >= window.1,
        }
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use chrono::TimeZone;

    fn transit(station_index: usize, day: u32, sun_k: f64) -> SunTransit {
        let t = Utc.with_ymd_and_hms(2027, 3, day, 12, 0, 0).unwrap();
        SunTransit {
            station_index,
            pass_number: 1,
            pass_tca: t,
            start: t,
            end: t,
            closest: t,
            closest_azimuth_deg: 180.0,
            closest_elevation_deg: 40.0,
            min_separation_deg: 0.1,
            max_sun_noise_k: sun_k,
            max_rise_db: sun_k / 100.0,
            degraded_s: if sun_k >= 30.0 { 5.0 } else { 0.0 },
        }
    }

    /// Consecutive days make one season per station; a gap of a day starts another.
    #[test]
    fn seasons_group_consecutive_days_per_station() {
        let transits = [
            transit(0, 1, 10.0),
            transit(1, 1, 5.0),
            transit(0, 2, 30.0),
            transit(0, 2, 40.0),
            transit(0, 3, 20.0),
            transit(0, 5, 1.0),
        ];
        let day = |d| NaiveDate::from_ymd_opt(2027, 3, d).unwrap();
        let s = outage_seasons(&transits, 2, (day(1), day(31)));
        assert_eq!(s.len(), 3);
        let first = s
            .iter()
            .find(|x| x.station_index == 0 && x.days == 3)
            .unwrap();
        assert_eq!(first.first_day.to_string(), "2027-03-01");
        assert_eq!(first.last_day.to_string(), "2027-03-03");
        assert_eq!(first.max_sun_noise_k, 40.0);
        // day 2 has two transits above 1 dB: one degraded day
        assert_eq!(first.degraded_days, 1);
        assert!(first.cut_by_window, "it starts on the window's first day");
        let late = s.iter().find(|x| x.first_day == day(5)).unwrap();
        assert!(!late.cut_by_window && late.degraded_days == 0);
        assert!(s.iter().any(|x| x.station_index == 0
            && x.days == 1
            && x.first_day.to_string() == "2027-03-05"));
        assert!(s.iter().any(|x| x.station_index == 1 && x.days == 1));
    }
}

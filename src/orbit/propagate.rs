//! SGP4/SDP4 propagation of mean elements.
//!
//! Model: SGP4 (near-Earth, period < 225 min) and SDP4 (deep space, lunar-solar terms and 12 h /
//! 24 h resonance), as revised in Vallado, Crawford, Hujsak, Kelso, "Revisiting Spacetrack
//! Report #3", AIAA 2006-6753, implemented by the `sgp4` crate (2.4). We call it with WGS-72
//! constants (the constants the element sets are fitted with; the same as the published
//! verification run) and the IAU sidereal-time expression for the deep-space epoch terms
//! (Vallado's "improved" operation mode). Output: TEME position (km) and velocity (km/s).
//!
//! Validity: SGP4 mean elements are fitted to observations; accuracy is ~1 km at epoch and
//! degrades by a few km per day away from it. Propagation errors (eccentricity driven out of
//! [0, 1), negative semi-latus rectum, radius below one Earth radius = decayed, as in the
//! published code's error codes 1, 3, 4, 6) are returned as [`PropagationError`].
//!
//! Deep-space resonant orbits integrate in 720 min steps from epoch; the integrator state is
//! kept between calls (interior `Cell`), so a forward sweep does not restart from epoch each time.

use std::cell::Cell;

use chrono::{DateTime, Utc};

use super::elements::ElementSet;
use super::frames::{teme_to_ecef, EcefState, TemeState};

/// WGS-72 equatorial radius, km (as in the `sgp4` crate's `WGS72` and AIAA 2006-6753 `getgravconst`).
pub const WGS72_RADIUS_KM: f64 = 6378.135;

/// WGS-72 gravitational parameter, km³/s² (AIAA 2006-6753 `getgravconst`, wgs72).
pub const WGS72_MU_KM3_S2: f64 = 398_600.8;

/// Why SGP4 could not give a state.
#[derive(Debug, Clone, PartialEq, thiserror::Error)]
pub enum PropagationError {
    #[error("catalog number {norad_id}: elements cannot be propagated: {reason}")]
    InvalidElements { norad_id: u64, reason: String },
    #[error("catalog number {norad_id}: propagated eccentricity {eccentricity} outside [0, 1) at {} ({minutes:.3} min from epoch): elements diverged or orbit decayed", crate::timefmt::format_ms(.time))]
    Eccentricity {
        norad_id: u64,
        eccentricity: f64,
        minutes: f64,
        time: DateTime<Utc>,
    },
    #[error("catalog number {norad_id}: negative semi-latus rectum at {} ({minutes:.3} min from epoch): orbit decayed", crate::timefmt::format_ms(.time))]
    SemiLatusRectum {
        norad_id: u64,
        minutes: f64,
        time: DateTime<Utc>,
    },
    #[error("catalog number {norad_id}: orbit radius {radius_km:.1} km is below the Earth's radius at {} ({minutes:.3} min from epoch): decayed", crate::timefmt::format_ms(.time))]
    Decayed {
        norad_id: u64,
        radius_km: f64,
        minutes: f64,
        time: DateTime<Utc>,
    },
    #[error("catalog number {norad_id}: time {minutes} min from epoch is not representable")]
    TimeOutOfRange { norad_id: u64, minutes: f64 },
}

impl PropagationError {
    /// Minutes from epoch at which propagation failed (None for invalid elements).
    pub fn minutes(&self) -> Option<f64> {
        match self {
            PropagationError::InvalidElements { .. } => None,
            PropagationError::Eccentricity { minutes, .. }
            | PropagationError::SemiLatusRectum { minutes, .. }
            | PropagationError::Decayed { minutes, .. }
            | PropagationError::TimeOutOfRange { minutes, .. } => Some(*minutes),
        }
    }
}

/// SGP4 propagator for one element set. Not `Sync` (it keeps a resonance state and a counter
/// in `Cell`s); give each thread its own.
#[derive(Clone)]
pub struct Propagator {
    norad_id: u64,
    name: Option<String>,
    epoch: DateTime<Utc>,
    constants: sgp4::Constants,
    initial_resonance: Option<sgp4::ResonanceState>,
    resonance: Cell<Option<sgp4::ResonanceState>>,
    count: Cell<u64>,
    /// Mean elements at epoch, for bounds used by the pass search.
    semi_major_axis_km: f64,
    eccentricity: f64,
    period_minutes: f64,
    /// Microseconds from the epoch to the first and the last representable date.
    representable_us: (i64, i64),
    /// SDP4 (deep-space) branch.
    deep_space: bool,
}

impl std::fmt::Debug for Propagator {
    fn fmt(&self, f: &mut std::fmt::Formatter<'_>) -> std::fmt::Result {
        f.debug_struct("Propagator")
            .field("norad_id", &self.norad_id)
            .field("name", &self.name)
            .field("epoch", &self.epoch)
            .field("deep_space_resonant", &self.initial_resonance.is_some())
            .field("propagations", &self.count.get())
            .finish()
    }
}

impl Propagator {
    /// Initialise SGP4 for `set` (WGS-72, IAU sidereal time for the deep-space epoch terms).
    pub fn new(set: &ElementSet) -> Result<Propagator, PropagationError> {
        let e = &set.elements;
        let invalid = |reason: String| PropagationError::InvalidElements {
            norad_id: set.norad_id,
            reason,
        };
        let deg = std::f64::consts::PI / 180.0;
        let orbit = sgp4::Orbit::from_kozai_elements(
            &sgp4::WGS72,
            e.inclination * deg,
            e.right_ascension * deg,
            e.eccentricity,
            e.argument_of_perigee * deg,
            e.mean_anomaly * deg,
            // rev/day -> rad/min: n · 2π / 1440
            e.mean_motion * (std::f64::consts::PI / 720.0),
        )
        .map_err(|err| invalid(err.to_string()))?;
        // The crate's own branch test (Brouwer mean motion, rad/min, against 2π / 225 min).
        let deep_space = orbit.mean_motion <= std::f64::consts::TAU / 225.0;
        let constants = sgp4::Constants::new(
            sgp4::WGS72,
            sgp4::iau_epoch_to_sidereal_time,
            e.epoch(),
            e.drag_term,
            orbit,
        )
        .map_err(|err| invalid(err.to_string()))?;
        let initial_resonance = constants.initial_state();
        let semi_major_axis_km = set.semi_major_axis_km();
        Ok(Propagator {
            norad_id: set.norad_id,
            name: set.name.clone(),
            epoch: set.epoch,
            constants,
            initial_resonance,
            resonance: Cell::new(initial_resonance),
            count: Cell::new(0),
            semi_major_axis_km,
            eccentricity: e.eccentricity,
            period_minutes: 1440.0 / e.mean_motion,
            representable_us: representable_us(set.epoch),
            deep_space,
        })
    }

    /// The SDP4 branch (period of 225 min or more): lunar-solar terms; its velocity is not the
    /// time derivative of its position (AIAA 2006-6753 leaves the long-period rates out of it).
    pub fn is_deep_space(&self) -> bool {
        self.deep_space
    }

    pub fn norad_id(&self) -> u64 {
        self.norad_id
    }

    pub fn name(&self) -> Option<&str> {
        self.name.as_deref()
    }

    pub fn epoch(&self) -> DateTime<Utc> {
        self.epoch
    }

    /// Mean semi-major axis at epoch from the mean motion, km (two-body, WGS-72 μ).
    pub fn semi_major_axis_km(&self) -> f64 {
        self.semi_major_axis_km
    }

    /// Eccentricity at epoch.
    pub fn eccentricity(&self) -> f64 {
        self.eccentricity
    }

    /// Orbital period at epoch, minutes (1440 / mean motion in rev/day).
    pub fn period_minutes(&self) -> f64 {
        self.period_minutes
    }

    /// Whether SGP4 runs its near-Earth branch (period below 225 min); `false` for SDP4, whose
    /// velocity is not exactly the derivative of its position (the lunar-solar terms).
    pub fn is_near_earth(&self) -> bool {
        !self.deep_space
    }

    /// Number of SGP4 evaluations made so far.
    pub fn propagations(&self) -> u64 {
        self.count.get()
    }

    /// Reset the evaluation counter to zero.
    pub fn reset_count(&self) {
        self.count.set(0);
    }

    /// Minutes from the element epoch to `t`.
    pub fn minutes_since_epoch(&self, t: &DateTime<Utc>) -> f64 {
        crate::timefmt::seconds_between(&self.epoch, t) / 60.0
    }

    /// TEME state `minutes` after epoch (negative = before).
    pub fn propagate_minutes(&self, minutes: f64) -> Result<TemeState, PropagationError> {
        self.count.set(self.count.get() + 1);
        // The UTC time of `minutes` must be a representable date (an OMM epoch may lie near the
        // end of the calendar range, where adding minutes would overflow). The range is kept in
        // whole microseconds from the epoch, so the check needs no date arithmetic; the date
        // itself is made only for an error message.
        let us = (minutes * 60.0 * 1e6).round();
        if !(minutes.is_finite()
            && minutes.abs() <= 1.0e9
            && us >= self.representable_us.0 as f64
            && us <= self.representable_us.1 as f64)
        {
            return Err(PropagationError::TimeOutOfRange {
                norad_id: self.norad_id,
                minutes,
            });
        }
        let time = || self.epoch + chrono::Duration::microseconds(us as i64);
        let result = match self.initial_resonance {
            None => {
                self.constants
                    .propagate_from_state(sgp4::MinutesSinceEpoch(minutes), None, false)
            }
            Some(initial) => {
                // The crate's integrator only runs away from epoch: reuse the kept state if
                // `minutes` is on the same side and not closer to epoch, else restart.
                let mut state = self.resonance.get().unwrap_or(initial);
                let st = state.t();
                if (st != 0.0 && (st > 0.0) != (minutes > 0.0)) || minutes.abs() < st.abs() {
                    state = initial;
                }
                let r = self.constants.propagate_from_state(
                    sgp4::MinutesSinceEpoch(minutes),
                    Some(&mut state),
                    false,
                );
                self.resonance.set(Some(state));
                r
            }
        };
        let p = result.map_err(|err| match err {
            sgp4::Error::OutOfRangeEccentricity { eccentricity, t }
            | sgp4::Error::OutOfRangePerturbedEccentricity { eccentricity, t } => {
                PropagationError::Eccentricity {
                    norad_id: self.norad_id,
                    eccentricity,
                    minutes: t,
                    time: time(),
                }
            }
            sgp4::Error::NegativeSemiLatusRectum { t } => PropagationError::SemiLatusRectum {
                norad_id: self.norad_id,
                minutes: t,
                time: time(),
            },
        })?;
        let [x, y, z] = p.position;
        let radius_km = (x * x + y * y + z * z).sqrt();
        // Decay test of AIAA 2006-6753 (error 6): radius below one Earth radius.
        if radius_km < WGS72_RADIUS_KM {
            return Err(PropagationError::Decayed {
                norad_id: self.norad_id,
                radius_km,
                minutes,
                time: time(),
            });
        }
        Ok(TemeState {
            position_km: p.position,
            velocity_km_s: p.velocity,
        })
    }

    /// TEME state at UTC time `t`.
    pub fn state_at(&self, t: &DateTime<Utc>) -> Result<TemeState, PropagationError> {
        self.propagate_minutes(self.minutes_since_epoch(t))
    }

    /// Earth-fixed (pseudo-Earth-fixed, see [`super::frames`]) state at UTC time `t`.
    pub fn ecef_at(&self, t: &DateTime<Utc>) -> Result<EcefState, PropagationError> {
        Ok(teme_to_ecef(&self.state_at(t)?, t))
    }
}

/// Microseconds from `epoch` to the first and the last date chrono can represent (saturated at
/// the i64 range: the propagation itself refuses |minutes| > 1e9 first).
fn representable_us(epoch: DateTime<Utc>) -> (i64, i64) {
    let before = (DateTime::<Utc>::MIN_UTC - epoch)
        .num_microseconds()
        .unwrap_or(i64::MIN);
    let after = (DateTime::<Utc>::MAX_UTC - epoch)
        .num_microseconds()
        .unwrap_or(i64::MAX);
    (before, after)
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn time_past_the_calendar_end_is_an_error_not_a_panic() {
        let text = "1 99901U          26335.50000000  .00001200  00000-0  12000-3 0   127\n\
                    2 99901  97.5950 215.3000 0011500  90.0000 270.0000 15.05472000  1231\n";
        let mut set = crate::orbit::tle::parse_tle(text).unwrap().remove(0);
        set.epoch = DateTime::<Utc>::MAX_UTC - chrono::Duration::days(1);
        let p = Propagator::new(&set).unwrap();
        assert!(p.propagate_minutes(0.0).is_ok());
        assert!(matches!(
            p.propagate_minutes(2.0 * 1440.0),
            Err(PropagationError::TimeOutOfRange { .. })
        ));
        assert!(matches!(
            p.propagate_minutes(f64::NAN),
            Err(PropagationError::TimeOutOfRange { .. })
        ));
    }
}

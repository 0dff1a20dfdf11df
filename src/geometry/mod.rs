//! Station-relative geometry: look angles ([`look`]), azimuth-dependent elevation masks
//! ([`horizon`]) and pass search ([`passes`]).
//!
//! Frames: the satellite state comes Earth-fixed from [`crate::orbit::frames`] (UT1 = UTC, no
//! polar motion); the station is on the WGS-84 ellipsoid (NIMA TR8350.2). Angles are geometric
//! (no refraction).

pub mod body_track;
pub(crate) mod bounded_trig;
pub mod horizon;
pub mod look;
pub mod moon;
pub mod mount;
pub mod passes;
pub mod slant;
pub mod sun;

/// `x` wrapped to [0, 360): `x.rem_euclid(360.0)` bit for bit, without its fmod where
/// |x| < 360 (fmod is exact there, so the result is `x` or `x + 360`): the per-step azimuths.
#[inline]
pub fn wrap360_deg(x: f64) -> f64 {
    if (0.0..360.0).contains(&x) {
        x
    } else if x < 0.0 && x > -360.0 {
        x + 360.0
    } else {
        x.rem_euclid(360.0)
    }
}

pub use horizon::{HorizonError, HorizonMask};
pub use look::{doppler_hz, LineOfSight, Look, Observer, ObserverError};
pub use mount::{AxisRates, Mount, MountKind};
pub use passes::{find_passes, track, Pass, PassSearch, Track};

#[cfg(test)]
mod tests {
    /// The fast path gives `rem_euclid`'s own bits (the per-step azimuths depend on it).
    #[test]
    fn wrap360_equals_rem_euclid() {
        let edges = [
            0.0, -0.0, 180.0, -180.0, 360.0, -360.0, 1e-300, -1e-300, 540.0, -719.9, 359.999,
            -1e-17,
        ];
        let sweep = (-4000..4000).map(|k| k as f64 * 0.2371);
        for x in edges.into_iter().chain(sweep) {
            assert_eq!(
                super::wrap360_deg(x).to_bits(),
                x.rem_euclid(360.0).to_bits(),
                "{x}"
            );
        }
    }
}

//! The one rule for the 5 deg switch of the ITU-R models: ITU-R P.618-14 rain (eq (1) at or above
//! 5 deg, eq (2) below), the P.676-12 Annex 2 slant-path gas forms and the P.840-9 and P.618-14
//! §2.4.1 ranges all change form at 5 deg elevation. An elevation within
//! [`LOW_ELEVATION_TOLERANCE_DEG`] below 5 deg counts as 5 deg, so that a pass that opens on a
//! 5 deg mask (its AOS found to about 1e-3 deg) takes the same branch at every model and on
//! every run, instead of one picked by rounding.

/// Elevations within this margin below 5 deg count as 5 deg for the choice of the >= 5 deg forms, deg.
pub const LOW_ELEVATION_TOLERANCE_DEG: f64 = 1e-3;

/// Elevations within this margin below 0 deg count as 0 deg without a warning: a pass searched
/// on a 0 deg mask has its AOS and LOS found to about 1e-3 deg, either side of the horizon.
pub const HORIZON_TOLERANCE_DEG: f64 = 1e-3;

/// Whether `elevation_deg` is below the geometric horizon by more than the rounding of a pass
/// search ([`HORIZON_TOLERANCE_DEG`]).
#[inline]
pub fn below_horizon(elevation_deg: f64) -> bool {
    elevation_deg < -HORIZON_TOLERANCE_DEG
}

/// Whether the below-5-deg forms apply at `elevation_deg`.
#[inline]
pub fn low_elevation_form(elevation_deg: f64) -> bool {
    elevation_deg < 5.0 - LOW_ELEVATION_TOLERANCE_DEG
}

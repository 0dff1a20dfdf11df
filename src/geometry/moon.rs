//! The Moon's direction, distance, angular size and phase from a station.
//!
//! Source: J. Meeus, *Astronomical Algorithms*, 2nd ed. (1998), ch. 47 "Position of the Moon":
//! the mean arguments L', D, M, M', F (eqs 47.1-47.5), the eccentricity factor E (47.6), the
//! periodic terms of Tables 47.A (longitude and distance, 60 terms) and 47.B (latitude, 60
//! terms) with the additive terms in A1, A2, A3, giving the geocentric ecliptic longitude and
//! latitude referred to the mean equinox of date and the Earth-Moon distance. Meeus states the
//! result to about 10" in longitude and 4" in latitude (an abridgement of ELP-2000/82; from
//! memory). Table values as carried in a general-purpose implementation (docs/REFERENCES.md §12,
//! status [C-code]) and checked against Meeus's Example 47.a in the unit tests.
//!
//! To the station: mean obliquity of Meeus eq. 22.2 (no nutation: both the coordinates and the
//! Earth's rotation are taken to the mean equinox, so nutation in longitude cancels and what is
//! left is below 10"), the GMST rotation of [`crate::orbit::frames`] (UT1 = UTC, as for the
//! satellite and the Sun), and the station's [`Observer`], which makes the direction
//! topocentric: the lunar parallax (up to 1 deg at the horizon) is included exactly. Time
//! scale: the series takes Terrestrial Time; TT − UT1 is taken as the constant
//! [`TT_MINUS_UT_S`] = 69.184 s (TT − UTC from 2017 on: 32.184 s + 37 leap seconds, IERS
//! Bulletin C, from memory). Over 1990-2045 the true value stays within about 15 s of it, which
//! moves the Moon by less than 0.003 deg (it moves 0.55"/s).
//!
//! Checked against an independent general-purpose astronomy library in the tests (within
//! 0.01 deg over 1990-2045). Validity: [`VALID_YEARS`], 1950-2050 (outside, the ΔT rule drifts;
//! the function still answers). Geometric direction (no refraction, no aberration).
//!
//! Phase: the phase angle i at the Moon between the directions to the Sun and to the station
//! (from [`super::sun::sun_ecef`]), and the illuminated fraction k = (1 + cos i)/2 (Meeus
//! eq. 48.1).

use super::look::Observer;
use super::sun::sun_ecef;
use crate::noise::moon::moon_angular_radius_deg;
use crate::orbit::frames::{
    days_since_j2000, gmst_rad, teme_to_ecef_at_angle, EcefState, TemeState,
};
use chrono::{DateTime, Utc};

/// Years over which the model is offered (the tests cover 1990-2045); outside, the model still
/// answers and a plan warns (`plan::bodies::position_years_warning`).
pub const VALID_YEARS: (i32, i32) = (1950, 2050);

/// TT − UT1 taken by the model, s (TT − UTC since 2017-01-01).
pub const TT_MINUS_UT_S: f64 = 69.184;

/// Meeus Table 47.A: multiples of D, M, M', F; Σl coefficient (1e-6 deg, sine); Σr coefficient
/// (m, cosine).
const TABLE_47A: [(i8, i8, i8, i8, i32, i32); 60] = [
    (0, 0, 1, 0, 6_288_774, -20_905_355),
    (2, 0, -1, 0, 1_274_027, -3_699_111),
    (2, 0, 0, 0, 658_314, -2_955_968),
    (0, 0, 2, 0, 213_618, -569_925),
    (0, 1, 0, 0, -185_116, 48_888),
    (0, 0, 0, 2, -114_332, -3_149),
    (2, 0, -2, 0, 58_793, 246_158),
    (2, -1, -1, 0, 57_066, -152_138),
    (2, 0, 1, 0, 53_322, -170_733),
    (2, -1, 0, 0, 45_758, -204_586),
    (0, 1, -1, 0, -40_923, -129_620),
    (1, 0, 0, 0, -34_720, 108_743),
    (0, 1, 1, 0, -30_383, 104_755),
    (2, 0, 0, -2, 15_327, 10_321),
    (0, 0, 1, 2, -12_528, 0),
    (0, 0, 1, -2, 10_980, 79_661),
    (4, 0, -1, 0, 10_675, -34_782),
    (0, 0, 3, 0, 10_034, -23_210),
    (4, 0, -2, 0, 8_548, -21_636),
    (2, 1, -1, 0, -7_888, 24_208),
    (2, 1, 0, 0, -6_766, 30_824),
    (1, 0, -1, 0, -5_163, -8_379),
    (1, 1, 0, 0, 4_987, -16_675),
    (2, -1, 1, 0, 4_036, -12_831),
    (2, 0, 2, 0, 3_994, -10_445),
    (4, 0, 0, 0, 3_861, -11_650),
    (2, 0, -3, 0, 3_665, 14_403),
    (0, 1, -2, 0, -2_689, -7_003),
    (2, 0, -1, 2, -2_602, 0),
    (2, -1, -2, 0, 2_390, 10_056),
    (1, 0, 1, 0, -2_348, 6_322),
    (2, -2, 0, 0, 2_236, -9_884),
    (0, 1, 2, 0, -2_120, 5_751),
    (0, 2, 0, 0, -2_069, 0),
    (2, -2, -1, 0, 2_048, -4_950),
    (2, 0, 1, -2, -1_773, 4_130),
    (2, 0, 0, 2, -1_595, 0),
    (4, -1, -1, 0, 1_215, -3_958),
    (0, 0, 2, 2, -1_110, 0),
    (3, 0, -1, 0, -892, 3_258),
    (2, 1, 1, 0, -810, 2_616),
    (4, -1, -2, 0, 759, -1_897),
    (0, 2, -1, 0, -713, -2_117),
    (2, 2, -1, 0, -700, 2_354),
    (2, 1, -2, 0, 691, 0),
    (2, -1, 0, -2, 596, 0),
    (4, 0, 1, 0, 549, -1_423),
    (0, 0, 4, 0, 537, -1_117),
    (4, -1, 0, 0, 520, -1_571),
    (1, 0, -2, 0, -487, -1_739),
    (2, 1, 0, -2, -399, 0),
    (0, 0, 2, -2, -381, -4_421),
    (1, 1, 1, 0, 351, 0),
    (3, 0, -2, 0, -340, 0),
    (4, 0, -3, 0, 330, 0),
    (2, -1, 2, 0, 327, 0),
    (0, 2, 1, 0, -323, 1_165),
    (1, 1, -1, 0, 299, 0),
    (2, 0, 3, 0, 294, 0),
    (2, 0, -1, -2, 0, 8_752),
];

/// Meeus Table 47.B: multiples of D, M, M', F; Σb coefficient (1e-6 deg, sine).
const TABLE_47B: [(i8, i8, i8, i8, i32); 60] = [
    (0, 0, 0, 1, 5_128_122),
    (0, 0, 1, 1, 280_602),
    (0, 0, 1, -1, 277_693),
    (2, 0, 0, -1, 173_237),
    (2, 0, -1, 1, 55_413),
    (2, 0, -1, -1, 46_271),
    (2, 0, 0, 1, 32_573),
    (0, 0, 2, 1, 17_198),
    (2, 0, 1, -1, 9_266),
    (0, 0, 2, -1, 8_822),
    (2, -1, 0, -1, 8_216),
    (2, 0, -2, -1, 4_324),
    (2, 0, 1, 1, 4_200),
    (2, 1, 0, -1, -3_359),
    (2, -1, -1, 1, 2_463),
    (2, -1, 0, 1, 2_211),
    (2, -1, -1, -1, 2_065),
    (0, 1, -1, -1, -1_870),
    (4, 0, -1, -1, 1_828),
    (0, 1, 0, 1, -1_794),
    (0, 0, 0, 3, -1_749),
    (0, 1, -1, 1, -1_565),
    (1, 0, 0, 1, -1_491),
    (0, 1, 1, 1, -1_475),
    (0, 1, 1, -1, -1_410),
    (0, 1, 0, -1, -1_344),
    (1, 0, 0, -1, -1_335),
    (0, 0, 3, 1, 1_107),
    (4, 0, 0, -1, 1_021),
    (4, 0, -1, 1, 833),
    (0, 0, 1, -3, 777),
    (4, 0, -2, 1, 671),
    (2, 0, 0, -3, 607),
    (2, 0, 2, -1, 596),
    (2, -1, 1, -1, 491),
    (2, 0, -2, 1, -451),
    (0, 0, 3, -1, 439),
    (2, 0, 2, 1, 422),
    (2, 0, -3, -1, 421),
    (2, 1, -1, 1, -366),
    (2, 1, 0, 1, -351),
    (4, 0, 0, 1, 331),
    (2, -1, 1, 1, 315),
    (2, -2, 0, -1, 302),
    (0, 0, 1, 3, -283),
    (2, 1, 1, -1, -229),
    (1, 1, 0, -1, 223),
    (1, 1, 0, 1, 223),
    (0, 1, -2, -1, -220),
    (2, 1, -1, -1, -220),
    (1, 0, 1, 1, -185),
    (2, -1, -2, -1, 181),
    (0, 1, 2, 1, -177),
    (4, 0, -2, -1, 176),
    (4, -1, -1, -1, 166),
    (1, 0, 1, -1, -164),
    (4, 0, 1, -1, 132),
    (1, 0, -1, -1, -119),
    (4, -1, 0, -1, 115),
    (2, -2, 0, 1, 107),
];

/// Geocentric ecliptic coordinates of the Moon, mean equinox of date.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct MoonEcliptic {
    pub longitude_deg: f64,
    pub latitude_deg: f64,
    pub distance_km: f64,
}

/// Meeus ch. 47 at `t_tt_centuries`, Julian centuries of TT from J2000.0.
pub fn moon_ecliptic(t_tt_centuries: f64) -> MoonEcliptic {
    let t = t_tt_centuries;
    let (t2, t3, t4) = (t * t, t * t * t, t * t * t * t);
    // Mean arguments, deg (Meeus 47.1-47.5)
    let lp = 218.316_447_7 + 481_267.881_234_21 * t - 0.001_578_6 * t2 + t3 / 538_841.0
        - t4 / 65_194_000.0;
    let d = 297.850_192_1 + 445_267.111_403_4 * t - 0.001_881_9 * t2 + t3 / 545_868.0
        - t4 / 113_065_000.0;
    let m = 357.529_109_2 + 35_999.050_290_9 * t - 0.000_153_6 * t2 + t3 / 24_490_000.0;
    let mp = 134.963_396_4 + 477_198.867_505_5 * t + 0.008_741_4 * t2 + t3 / 69_699.0
        - t4 / 14_712_000.0;
    let f = 93.272_095_0 + 483_202.017_523_3 * t - 0.003_653_9 * t2 - t3 / 3_526_000.0
        + t4 / 863_310_000.0;
    let a1 = (119.75 + 131.849 * t).to_radians();
    let a2 = (53.09 + 479_264.290 * t).to_radians();
    let a3 = (313.45 + 481_266.484 * t).to_radians();
    // E = 1 − 0.002516 T − 0.0000074 T² (47.6)
    let e = 1.0 - 0.002_516 * t - 0.000_007_4 * t2;
    let rad = |x: f64| x.rem_euclid(360.0).to_radians();
    let (d, m, mp, f, lp_r) = (rad(d), rad(m), rad(mp), rad(f), rad(lp));
    let e_factor = |k: i8| match k.abs() {
        1 => e,
        2 => e * e,
        _ => 1.0,
    };
    let arg = |a: i8, b: i8, c: i8, g: i8| {
        f64::from(a) * d + f64::from(b) * m + f64::from(c) * mp + f64::from(g) * f
    };
    let (mut sl, mut sr, mut sb) = (0.0, 0.0, 0.0);
    for &(a, b, c, g, l, r) in &TABLE_47A {
        let x = arg(a, b, c, g);
        sl += e_factor(b) * f64::from(l) * x.sin();
        sr += e_factor(b) * f64::from(r) * x.cos();
    }
    for &(a, b, c, g, coef) in &TABLE_47B {
        sb += e_factor(b) * f64::from(coef) * arg(a, b, c, g).sin();
    }
    // Additive terms (Venus, Jupiter, the Earth's flattening)
    sl += 3958.0 * a1.sin() + 1962.0 * (lp_r - f).sin() + 318.0 * a2.sin();
    sb += -2235.0 * lp_r.sin()
        + 382.0 * a3.sin()
        + 175.0 * (a1 - f).sin()
        + 175.0 * (a1 + f).sin()
        + 127.0 * (lp_r - mp).sin()
        - 115.0 * (lp_r + mp).sin();
    MoonEcliptic {
        longitude_deg: (lp + sl / 1e6).rem_euclid(360.0),
        latitude_deg: sb / 1e6,
        distance_km: 385_000.56 + sr / 1000.0,
    }
}

/// Mean obliquity of the ecliptic, deg (Meeus eq. 22.2), T in Julian centuries from J2000.0.
pub fn mean_obliquity_deg(t_centuries: f64) -> f64 {
    let t = t_centuries;
    // ε0 = 23°26'21.448" − 46.8150" T − 0.00059" T² + 0.001813" T³
    23.0 + 26.0 / 60.0 + (21.448 - 46.815 * t - 0.000_59 * t * t + 0.001_813 * t * t * t) / 3600.0
}

/// The Moon's centre as an Earth-fixed position (km) at `t`.
pub fn moon_ecef(t: &DateTime<Utc>) -> EcefState {
    let days_ut = days_since_j2000(t);
    let t_tt = (days_ut + TT_MINUS_UT_S / 86_400.0) / 36_525.0;
    let ecl = moon_ecliptic(t_tt);
    let (sl, cl) = ecl.longitude_deg.to_radians().sin_cos();
    let (sb, cb) = ecl.latitude_deg.to_radians().sin_cos();
    let (se, ce) = mean_obliquity_deg(t_tt).to_radians().sin_cos();
    // Ecliptic -> equator of date: rotation about x by −ε.
    let (xe, ye, ze) = (cb * cl, cb * sl, sb);
    let d = ecl.distance_km;
    let of_date = TemeState {
        position_km: [d * xe, d * (ye * ce - ze * se), d * (ye * se + ze * ce)],
        velocity_km_s: [0.0; 3],
    };
    teme_to_ecef_at_angle(&of_date, gmst_rad(days_ut))
}

/// The Moon seen from a station at one instant.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct MoonView {
    /// Topocentric azimuth and elevation of the Moon's centre, deg (geometric).
    pub azimuth_deg: f64,
    pub elevation_deg: f64,
    /// Station-Moon distance, km.
    pub distance_km: f64,
    /// Topocentric angular radius of the disk, deg.
    pub angular_radius_deg: f64,
    /// Phase angle at the Moon between the Sun and the station, deg (0 full, 180 new).
    pub phase_angle_deg: f64,
    /// Illuminated fraction of the disk, (1 + cos i)/2.
    pub illuminated_fraction: f64,
}

fn angle_between(a: &[f64; 3], b: &[f64; 3]) -> f64 {
    let dot = a[0] * b[0] + a[1] * b[1] + a[2] * b[2];
    let cross = [
        a[1] * b[2] - a[2] * b[1],
        a[2] * b[0] - a[0] * b[2],
        a[0] * b[1] - a[1] * b[0],
    ];
    let c = (cross[0] * cross[0] + cross[1] * cross[1] + cross[2] * cross[2]).sqrt();
    c.atan2(dot)
}

/// The Moon from `observer` at `t`: direction, distance, size and phase.
pub fn moon_view(observer: &Observer, t: &DateTime<Utc>) -> MoonView {
    let moon = moon_ecef(t);
    let look = observer.look(&moon);
    let sun = sun_ecef(t).position_km;
    let obs = observer.position_km();
    let m = moon.position_km;
    let to_sun = [sun[0] - m[0], sun[1] - m[1], sun[2] - m[2]];
    let to_obs = [obs[0] - m[0], obs[1] - m[1], obs[2] - m[2]];
    let i = angle_between(&to_sun, &to_obs);
    MoonView {
        azimuth_deg: look.azimuth_deg,
        elevation_deg: look.elevation_deg,
        distance_km: look.range_km,
        angular_radius_deg: moon_angular_radius_deg(look.range_km),
        phase_angle_deg: i.to_degrees(),
        illuminated_fraction: (1.0 + i.cos()) / 2.0,
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn meeus_example_47a() {
        // Meeus, Astronomical Algorithms 2nd ed., Example 47.a: 1992 April 12, 0h TD
        // (JDE 2448724.5): λ = 133.162655 deg, β = −3.229126 deg, Δ = 368409.7 km (values as
        // reproduced by a general-purpose implementation's doctest, docs/REFERENCES.md §12).
        let t = (2_448_724.5 - 2_451_545.0) / 36_525.0;
        let m = moon_ecliptic(t);
        assert!((m.longitude_deg - 133.162_655).abs() < 2e-6, "{m:?}");
        assert!((m.latitude_deg + 3.229_126).abs() < 2e-6, "{m:?}");
        assert!((m.distance_km - 368_409.7).abs() < 0.1, "{m:?}");
        // Meeus Example 22.a (1987 April 10, 0h TD): ε0 = 23°26'27.407" (from memory).
        let t22 = (2_446_895.5 - 2_451_545.0) / 36_525.0;
        let eps = 23.0 + 26.0 / 60.0 + 27.407 / 3600.0;
        assert!((mean_obliquity_deg(t22) - eps).abs() < 1e-6);
    }
}

//! The Moon's position from a station against an independent numerical ephemeris (JPL DE421 via
//! jplephem, frames by astropy 8.0.2; values stored in `tests/data/geometry/moon_de421.csv` with
//! the exact calls), over 1990-2045 and four stations.

use crate::common::data::read_csv;
use passbudget::geometry::moon::moon_view;
use passbudget::geometry::sun::separation_deg;
use passbudget::geometry::Observer;

/// Meeus ch. 47 is stated to about 10" in longitude and 4" in latitude (from memory); with the
/// neglected nutation (below 10") and the constant TT − UT1 (below 0.003 deg over 1990-2045) the
/// direction is well within 0.01 deg, the tolerance of the Sun's check. Azimuth is compared through
/// the angle on the sky.
const MOON_DIRECTION_DEG: f64 = 0.01;
/// 0.01 deg at 400 000 km is 70 km along the sky; the distance is better than that (the distance
/// terms of Table 47.A are given to 1 m); 20 km is 5e-5 relative (0.00001 deg of angular radius).
const MOON_DISTANCE_KM: f64 = 20.0;
/// The phase angle inherits the Sun's 0.01 deg and the Moon's direction error.
const PHASE_ANGLE_DEG: f64 = 0.02;

#[test]
fn moon_matches_the_numerical_ephemeris() {
    let rows = read_csv("geometry/moon_de421.csv");
    assert!(rows.len() >= 12);
    let mut worst = (0.0f64, 0.0f64, 0.0f64);
    for r in rows {
        let observer = Observer::new(
            r.num("latitude_deg"),
            r.num("longitude_deg"),
            r.num("altitude_m"),
        )
        .unwrap();
        let t = passbudget::timefmt::parse_utc(r.text("time")).unwrap();
        let v = moon_view(&observer, &t);
        let d = separation_deg(
            v.azimuth_deg,
            v.elevation_deg,
            r.num("azimuth_deg"),
            r.num("elevation_deg"),
        );
        let dd = (v.distance_km - r.num("distance_km")).abs();
        let dp = (v.phase_angle_deg - r.num("phase_angle_deg")).abs();
        worst = (worst.0.max(d), worst.1.max(dd), worst.2.max(dp));
        assert!(
            d < MOON_DIRECTION_DEG && dd < MOON_DISTANCE_KM && dp < PHASE_ANGLE_DEG,
            "{}: ours az {:.4} el {:.4} {:.1} km phase {:.3}; reference az {} el {} {} km phase {}",
            r.text("time"),
            v.azimuth_deg,
            v.elevation_deg,
            v.distance_km,
            v.phase_angle_deg,
            r.num("azimuth_deg"),
            r.num("elevation_deg"),
            r.num("distance_km"),
            r.num("phase_angle_deg")
        );
        // The illuminated fraction follows from the phase angle (Meeus eq. 48.1).
        let k = (1.0 + v.phase_angle_deg.to_radians().cos()) / 2.0;
        assert!((v.illuminated_fraction - k).abs() < 1e-12);
    }
    eprintln!(
        "moon vs DE421: worst direction {:.5} deg, distance {:.2} km, phase angle {:.4} deg",
        worst.0, worst.1, worst.2
    );
}

#[test]
fn parallax_is_included() {
    // The geocentric and topocentric directions of the Moon differ by the parallax in altitude,
    // sin p = (ρ/Δ) cos h (ρ: geocentric radius of the station, about 6370 km at 38.5 deg N;
    // Δ: geocentric distance; h: geocentric elevation; spherical approximation, e.g. Meeus ch. 40)
    // [COMP]: for a station where the Moon is low, about 1 deg.
    let rows = read_csv("geometry/moon_de421.csv");
    let r = rows
        .iter()
        .find(|r| r.text("time") == "2024-04-08T18:17:00Z")
        .expect("the low-Moon row");
    let observer = Observer::new(
        r.num("latitude_deg"),
        r.num("longitude_deg"),
        r.num("altitude_m"),
    )
    .unwrap();
    let t = passbudget::timefmt::parse_utc(r.text("time")).unwrap();
    let v = moon_view(&observer, &t);
    // Geocentric elevation: the direction of the Moon's geocentric vector in the station's frame.
    let m = passbudget::geometry::moon::moon_ecef(&t).position_km;
    let up = observer.up();
    let norm = (m[0] * m[0] + m[1] * m[1] + m[2] * m[2]).sqrt();
    let geo_el = ((m[0] * up[0] + m[1] * up[1] + m[2] * up[2]) / norm)
        .asin()
        .to_degrees();
    let drop = geo_el - v.elevation_deg;
    let expected = (6370.0 / norm * geo_el.to_radians().cos())
        .asin()
        .to_degrees();
    assert!(expected > 0.9);
    assert!(
        (drop - expected).abs() < 0.01,
        "parallax in elevation {drop:.4} deg, spherical {expected:.4}"
    );
    assert!((v.elevation_deg - r.num("elevation_deg")).abs() < MOON_DIRECTION_DEG);
}

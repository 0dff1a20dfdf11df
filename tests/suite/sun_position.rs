//! The Sun's position from a station against an independent general-purpose astronomy library
//! (astropy 8.0.2 with its bundled ERFA ephemeris, values stored in
//! `tests/data/geometry/sun_astropy.csv` with the exact call), over 1950-2050.

use crate::common::data::read_csv;
use passbudget::geometry::sun::{separation_deg, sun_az_el_deg};
use passbudget::geometry::Observer;

/// The low-precision formulae are stated to 0.01 deg (Astronomical Almanac, from memory); the
/// observed difference is below that. Azimuth is compared through the angle on the sky.
const SUN_DIRECTION_DEG: f64 = 0.01;

#[test]
fn sun_direction_matches_the_reference_library() {
    let observer = Observer::new(38.52, -2.31, 780.0).unwrap();
    let rows = read_csv("geometry/sun_astropy.csv");
    assert!(rows.len() >= 8);
    for r in rows {
        let t = passbudget::timefmt::parse_utc(r.text("time")).unwrap();
        let (az, el) = sun_az_el_deg(&observer, &t);
        let d = separation_deg(az, el, r.num("azimuth_deg"), r.num("elevation_deg"));
        assert!(
            d < SUN_DIRECTION_DEG,
            "{}: ours az {az:.4} el {el:.4}, reference az {} el {}, {d:.4} deg apart",
            r.text("time"),
            r.num("azimuth_deg"),
            r.num("elevation_deg")
        );
    }
}

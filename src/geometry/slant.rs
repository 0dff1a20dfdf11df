//! Slant range and off-nadir angle for a chosen elevation, from a spherical-Earth triangle:
//! station at geocentric radius R, satellite at radius r (a circular orbit at the semi-major axis).
//!
//! Law of cosines in the triangle centre-station-satellite, with the angle at the station equal
//! to 90 deg + elevation:
//!
//! ```text
//! r^2 = R^2 + d^2 + 2 R d sin(el)   =>   d = sqrt(r^2 - R^2 cos^2(el)) - R sin(el)
//! sin(eta) = (R / r) cos(el)          (law of sines; eta = off-nadir angle at the satellite)
//! ```
//! Valid for -90 < el <= 90 deg and r > R. Used by `budget --elevation-deg`; the pass planner uses
//! the full ellipsoidal geometry of [`crate::geometry::look`] instead.

/// Error for an impossible triangle.
#[derive(Debug, Clone, Copy, PartialEq, thiserror::Error)]
pub enum SlantError {
    #[error("elevation {elevation_deg} deg is outside -90 to 90 deg")]
    Elevation { elevation_deg: f64 },
    #[error(
        "orbit radius {orbit_radius_km} km is not above the station radius {station_radius_km} km"
    )]
    Radius {
        orbit_radius_km: f64,
        station_radius_km: f64,
    },
}

/// `(range_km, off_nadir_deg)` for a satellite at `orbit_radius_km` seen at `elevation_deg` from a
/// station at `station_radius_km` from the geocentre.
pub fn slant_range_km(
    station_radius_km: f64,
    orbit_radius_km: f64,
    elevation_deg: f64,
) -> Result<(f64, f64), SlantError> {
    if !(elevation_deg.is_finite() && (-90.0..=90.0).contains(&elevation_deg)) {
        return Err(SlantError::Elevation { elevation_deg });
    }
    if !(orbit_radius_km > station_radius_km && station_radius_km > 0.0) {
        return Err(SlantError::Radius {
            orbit_radius_km,
            station_radius_km,
        });
    }
    let (r0, r) = (station_radius_km, orbit_radius_km);
    let el = elevation_deg.to_radians();
    let d = (r * r - (r0 * el.cos()).powi(2)).sqrt() - r0 * el.sin();
    let eta = (r0 / r * el.cos()).asin().to_degrees();
    Ok((d, eta))
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn zenith_and_horizon() {
        // Zenith: range = altitude, off-nadir 0.
        let (d, eta) = slant_range_km(6378.0, 6928.0, 90.0).unwrap();
        assert!((d - 550.0).abs() < 1e-9 && eta.abs() < 1e-9);
        // Horizon: range = sqrt(r^2 - R^2) (tangent line); off-nadir = asin(R/r).
        let (d, eta) = slant_range_km(6378.0, 6928.0, 0.0).unwrap();
        assert!((d - (6928.0f64.powi(2) - 6378.0f64.powi(2)).sqrt()).abs() < 1e-9);
        assert!((eta - (6378.0f64 / 6928.0).asin().to_degrees()).abs() < 1e-12);
        assert!(slant_range_km(6378.0, 6000.0, 10.0).is_err());
    }
}

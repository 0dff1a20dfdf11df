//! Topocentric look angles from a WGS-84 station to a satellite.
//!
//! With ρ = r_sat - r_station (Earth-fixed, km) and ρ̇ = v_sat (the station is fixed in that
//! frame), and the local east/north/up unit vectors of the geodetic station (latitude φ,
//! longitude λ; e.g. Vallado, "Fundamentals of Astrodynamics and Applications", SEZ/ENU
//! rotation, from memory):
//!
//! ```text
//! Ê = (-sinλ, cosλ, 0)
//! N̂ = (-sinφ cosλ, -sinφ sinλ, cosφ)
//! Û = ( cosφ cosλ,  cosφ sinλ, sinφ)
//! e = Ê·ρ, n = N̂·ρ, u = Û·ρ, |ρ| = range
//! azimuth   = atan2(e, n)            (0..360 deg, from north, clockwise/eastward)
//! elevation = atan2(u, sqrt(e²+n²))  (geometric, no refraction)
//! range rate ρ̇ = ρ·v / |ρ|           (positive = receding)
//! elevation rate = (u̇ h - u ḣ) / |ρ|², h = sqrt(e²+n²), ḣ = (e ė + n ṅ)/h
//! azimuth rate   = (ė n - e ṅ) / h²
//! off-nadir angle = angle at the satellite between -r_sat (nadir) and -ρ (towards the station)
//!                 = acos( r_sat·ρ / (|r_sat| |ρ|) )
//! ```
//!
//! Valid anywhere outside the Earth; azimuth and its rate are undefined at the zenith (h -> 0),
//! where they are reported as 0.

use crate::orbit::frames::{geodetic_to_ecef_km, EcefState};
use crate::units::SPEED_OF_LIGHT_M_S;

/// An invalid station position.
#[derive(Debug, Clone, PartialEq, thiserror::Error)]
pub enum ObserverError {
    #[error("latitude {latitude_deg} deg is outside [-90, 90]")]
    Latitude { latitude_deg: f64 },
    #[error("longitude {longitude_deg} deg is outside [-180, 360]")]
    Longitude { longitude_deg: f64 },
    #[error("altitude {altitude_m} m is outside [-500, 100000] m above the WGS-84 ellipsoid")]
    Altitude { altitude_m: f64 },
}

/// A ground station on the WGS-84 ellipsoid with its precomputed Earth-fixed position and
/// east/north/up axes.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Observer {
    latitude_deg: f64,
    longitude_deg: f64,
    altitude_m: f64,
    position_km: [f64; 3],
    east: [f64; 3],
    north: [f64; 3],
    up: [f64; 3],
}

/// Look angles and rates from a station to a satellite at one instant.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Look {
    /// Azimuth, degrees in [0, 360), from north towards east.
    pub azimuth_deg: f64,
    /// Geometric elevation above the local (geodetic) horizontal, degrees.
    pub elevation_deg: f64,
    /// Slant range, km.
    pub range_km: f64,
    /// Range rate, km/s, positive when the satellite recedes.
    pub range_rate_km_s: f64,
    /// Angle at the satellite between nadir (towards the geocentre) and the station, degrees.
    pub off_nadir_deg: f64,
    /// Elevation rate, deg/s.
    pub elevation_rate_deg_s: f64,
    /// Azimuth rate, deg/s (0 at the zenith).
    pub azimuth_rate_deg_s: f64,
}

/// The station-to-satellite line at one instant in east/north/up components, with its az-el
/// angles before the azimuth is wrapped: what [`Observer::look_and_line`] gives a mount besides
/// the [`Look`], so that an az-el mount's follower takes the look's own angles.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct LineOfSight {
    /// (e, n, u), km.
    pub enu_km: [f64; 3],
    /// (ė, ṅ, u̇), km/s.
    pub enu_rate_km_s: [f64; 3],
    /// [atan2(e, n), atan2(u, sqrt(e² + n²))], deg: the azimuth in (-180, 180] (also at the
    /// zenith, where the look's azimuth is 0) and the elevation, the same values (to the bit) as
    /// an az-el gimbal's axis angles ([`crate::geometry::mount`]).
    pub az_el_deg: [f64; 2],
}

#[inline]
fn dot(a: &[f64; 3], b: &[f64; 3]) -> f64 {
    a[0] * b[0] + a[1] * b[1] + a[2] * b[2]
}

impl Observer {
    /// Station at geodetic latitude/longitude (deg) and height above the WGS-84 ellipsoid (m).
    pub fn new(
        latitude_deg: f64,
        longitude_deg: f64,
        altitude_m: f64,
    ) -> Result<Observer, ObserverError> {
        if !(-90.0..=90.0).contains(&latitude_deg) {
            return Err(ObserverError::Latitude { latitude_deg });
        }
        if !(-180.0..=360.0).contains(&longitude_deg) {
            return Err(ObserverError::Longitude { longitude_deg });
        }
        if !(-500.0..=100_000.0).contains(&altitude_m) {
            return Err(ObserverError::Altitude { altitude_m });
        }
        let (sp, cp) = latitude_deg.to_radians().sin_cos();
        let (sl, cl) = longitude_deg.to_radians().sin_cos();
        Ok(Observer {
            latitude_deg,
            longitude_deg,
            altitude_m,
            position_km: geodetic_to_ecef_km(latitude_deg, longitude_deg, altitude_m),
            east: [-sl, cl, 0.0],
            north: [-sp * cl, -sp * sl, cp],
            up: [cp * cl, cp * sl, sp],
        })
    }

    pub fn latitude_deg(&self) -> f64 {
        self.latitude_deg
    }

    pub fn longitude_deg(&self) -> f64 {
        self.longitude_deg
    }

    pub fn altitude_m(&self) -> f64 {
        self.altitude_m
    }

    /// Earth-fixed position, km.
    pub fn position_km(&self) -> [f64; 3] {
        self.position_km
    }

    /// Local geodetic up unit vector (Earth-fixed).
    pub fn up(&self) -> [f64; 3] {
        self.up
    }

    /// The station-to-satellite vector and its rate in east/north/up components (km, km/s),
    /// for the mount's axes ([`crate::geometry::mount`]).
    pub fn enu(&self, sat: &EcefState) -> ([f64; 3], [f64; 3]) {
        let r = &sat.position_km;
        let v = &sat.velocity_km_s;
        let rho = [
            r[0] - self.position_km[0],
            r[1] - self.position_km[1],
            r[2] - self.position_km[2],
        ];
        (
            [
                dot(&self.east, &rho),
                dot(&self.north, &rho),
                dot(&self.up, &rho),
            ],
            [dot(&self.east, v), dot(&self.north, v), dot(&self.up, v)],
        )
    }

    /// Look angles, range, rates and off-nadir angle to an Earth-fixed satellite state.
    #[inline]
    pub fn look(&self, sat: &EcefState) -> Look {
        self.look_and_line(sat).0
    }

    /// [`Observer::look`] and the line of sight it was made from ([`LineOfSight`]).
    pub fn look_and_line(&self, sat: &EcefState) -> (Look, LineOfSight) {
        let r = &sat.position_km;
        let v = &sat.velocity_km_s;
        let rho = [
            r[0] - self.position_km[0],
            r[1] - self.position_km[1],
            r[2] - self.position_km[2],
        ];
        let e = dot(&self.east, &rho);
        let n = dot(&self.north, &rho);
        let u = dot(&self.up, &rho);
        let ed = dot(&self.east, v);
        let nd = dot(&self.north, v);
        let ud = dot(&self.up, v);
        let h2 = e * e + n * n;
        let h = h2.sqrt();
        let range_km = (h2 + u * u).sqrt();
        // range rate = ρ·ρ̇ / |ρ|
        let range_rate_km_s = (e * ed + n * nd + u * ud) / range_km;
        let elevation_deg = u.atan2(h).to_degrees();
        let azimuth_signed_deg = e.atan2(n).to_degrees();
        let (azimuth_deg, azimuth_rate_deg_s, elevation_rate_deg_s) = if h > 1e-9 {
            let hd = (e * ed + n * nd) / h;
            (
                super::wrap360_deg(azimuth_signed_deg),
                ((ed * n - e * nd) / h2).to_degrees(),
                ((ud * h - u * hd) / (range_km * range_km)).to_degrees(),
            )
        } else {
            (0.0, 0.0, 0.0)
        };
        let r_norm = dot(r, r).sqrt();
        // off-nadir = acos(r·ρ / (|r| |ρ|))
        let c = (dot(r, &rho) / (r_norm * range_km)).clamp(-1.0, 1.0);
        let look = Look {
            azimuth_deg: if azimuth_deg >= 360.0 {
                0.0
            } else {
                azimuth_deg
            },
            elevation_deg,
            range_km,
            range_rate_km_s,
            off_nadir_deg: c.acos().to_degrees(),
            elevation_rate_deg_s,
            azimuth_rate_deg_s,
        };
        let line = LineOfSight {
            enu_km: [e, n, u],
            enu_rate_km_s: [ed, nd, ud],
            az_el_deg: [azimuth_signed_deg, elevation_deg],
        };
        (look, line)
    }
}

/// First-order Doppler shift, Hz: Δf = -f ρ̇ / c (non-relativistic; the neglected terms are of
/// order (ρ̇/c)² ~ 1e-9 relative for LEO). Positive when the satellite approaches.
pub fn doppler_hz(range_rate_km_s: f64, frequency_hz: f64) -> f64 {
    -frequency_hz * range_rate_km_s * 1000.0 / SPEED_OF_LIGHT_M_S
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn zenith_and_horizon() {
        let obs = Observer::new(30.0, 40.0, 0.0).unwrap();
        let up = obs.up();
        let p = obs.position_km();
        let sat = EcefState {
            position_km: [
                p[0] + 500.0 * up[0],
                p[1] + 500.0 * up[1],
                p[2] + 500.0 * up[2],
            ],
            velocity_km_s: [0.0; 3],
        };
        let l = obs.look(&sat);
        assert!((l.elevation_deg - 90.0).abs() < 1e-9);
        assert!((l.range_km - 500.0).abs() < 1e-9);
        // Straight above: the station is at nadir, but the geodetic up is not geocentric;
        // the angle equals the geodetic-geocentric vertical difference (< 0.2 deg).
        assert!(l.off_nadir_deg < 0.2);
        // Doppler: 1 km/s receding at 1 GHz -> -3335.64 Hz (f v / c).
        assert!((doppler_hz(1.0, 1e9) + 3_335.640_951_981_52).abs() < 1e-6);
    }
}

//! The Sun's or the Moon's direction from a station over a pass, interpolated instead of
//! recomputed at every step.
//!
//! The direction (a unit vector in the station's east/north/up frame) is computed by
//! [`super::sun`] or [`super::moon`] at nodes [`NODE_SPACING_S`] apart over the span and
//! interpolated per step by the quadratic through three consecutive nodes, then renormalized.
//!
//! Error bound (our derivation): seen from the rotating Earth, a distant body's direction turns
//! about the polar axis at about ω = 7.29e-5 rad/s (sidereal rate; the Sun's own motion adds
//! 0.3 %, the Moon's parallax and motion a few per cent). Each component of the unit vector is
//! then a sinusoid of amplitude at most 1 and rate ω, whose third derivative is at most ω³, and
//! the quadratic Lagrange interpolation through nodes h apart errs by at most
//! `max|f'''| · max|(t − t0)(t − t1)(t − t2)| / 6 = ω³ · (2 h³ / (3√3)) / 6` per component,
//! so by at most `√2 ω³ h³ / (9√3)` in direction (two components turn). With h = 300 s and
//! ω = 7.5e-5 rad/s (margin for the Moon) this is 1.0e-6 rad = 6e-5 deg ([`error_bound_deg`]),
//! far below the Sun's 0.27 deg radius and the ephemerides' own 0.01 deg. Tested against
//! direct computation.
//!
//! The disk's angular radius and (Moon) illuminated fraction are taken once, at the middle of
//! the span: over a pass of up to an hour they change by less than 0.2 % (the Moon's distance)
//! and 0.01 (its phase).
//!
//! A track is built once per pass ([`BodyTrack::reset`] reuses its buffer); a lookup allocates
//! nothing.

use super::look::Observer;
use super::moon::{moon_ecef, moon_view};
use super::sun::sun_ecef;
use crate::noise::sun::sun_angular_radius_deg;
use crate::orbit::frames::EcefState;
use chrono::{DateTime, Utc};

/// Spacing of the computed directions, s.
pub const NODE_SPACING_S: f64 = 300.0;

/// Rate used for the error bound, rad/s (sidereal rate 7.292e-5 rad/s plus a margin for the
/// bodies' own motion and the Moon's parallax).
pub const TURN_RATE_BOUND_RAD_S: f64 = 7.5e-5;

/// Longest span a track covers, s (10 days).
pub const MAX_SPAN_S: f64 = 864_000.0;

/// Which body a track follows.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Body {
    Sun,
    Moon,
}

/// A span that cannot be tracked.
#[derive(Debug, Clone, PartialEq, thiserror::Error)]
pub enum TrackError {
    #[error("the span ends ({end}) before it starts ({start})")]
    Reversed { start: String, end: String },
    #[error("the span of {span_s} s is longer than {MAX_SPAN_S} s")]
    TooLong { span_s: f64 },
}

/// Bound on the interpolation error of the direction, deg, for node spacing `h_s`:
/// √2 ω³ h³ / (9√3) with ω = [`TURN_RATE_BOUND_RAD_S`].
pub fn error_bound_deg(h_s: f64) -> f64 {
    let wh = TURN_RATE_BOUND_RAD_S * h_s;
    (2f64.sqrt() * wh * wh * wh / (9.0 * 3f64.sqrt())).to_degrees()
}

fn unix_s(t: &DateTime<Utc>) -> f64 {
    t.timestamp() as f64 + f64::from(t.timestamp_subsec_nanos()) * 1e-9
}

/// East/north/up unit vector of an azimuth and elevation (deg).
pub fn enu_from_az_el(azimuth_deg: f64, elevation_deg: f64) -> [f64; 3] {
    let (sa, ca) = azimuth_deg.to_radians().sin_cos();
    let (se, ce) = elevation_deg.to_radians().sin_cos();
    [sa * ce, ca * ce, se]
}

/// Angle between two unit vectors, deg: 2 asin(|u - p| / 2), accurate at small angles.
#[inline]
pub fn chord_separation_deg(u: &[f64; 3], p: &[f64; 3]) -> f64 {
    let d = ((u[0] - p[0]).powi(2) + (u[1] - p[1]).powi(2) + (u[2] - p[2]).powi(2)).sqrt();
    (2.0 * (d / 2.0).min(1.0).asin()).to_degrees()
}

/// The direction of the Sun or the Moon from one station over a span of time.
#[derive(Debug, Clone)]
pub struct BodyTrack {
    body: Body,
    observer: Observer,
    start_unix_s: f64,
    /// Unit vectors (east, north, up) at the nodes, `NODE_SPACING_S` apart from the start.
    nodes: Vec<[f64; 3]>,
    angular_radius_deg: f64,
    illuminated_fraction: f64,
}

impl BodyTrack {
    /// A track of `body` from `observer` over [`start`, `end`].
    pub fn new(
        body: Body,
        observer: &Observer,
        start: &DateTime<Utc>,
        end: &DateTime<Utc>,
    ) -> Result<BodyTrack, TrackError> {
        let mut track = BodyTrack {
            body,
            observer: *observer,
            start_unix_s: 0.0,
            nodes: Vec::new(),
            angular_radius_deg: 0.0,
            illuminated_fraction: 1.0,
        };
        track.reset(start, end)?;
        Ok(track)
    }

    /// Recomputes the track for a new span (same body and station), reusing its buffer.
    pub fn reset(&mut self, start: &DateTime<Utc>, end: &DateTime<Utc>) -> Result<(), TrackError> {
        let (t0, t1) = (unix_s(start), unix_s(end));
        if t1 < t0 {
            return Err(TrackError::Reversed {
                start: start.to_rfc3339(),
                end: end.to_rfc3339(),
            });
        }
        if t1 - t0 > MAX_SPAN_S {
            return Err(TrackError::TooLong { span_s: t1 - t0 });
        }
        // An even number of intervals (whole quadratic pieces), at least one piece.
        let pieces = (((t1 - t0) / (2.0 * NODE_SPACING_S)).ceil() as usize).max(1);
        self.start_unix_s = t0;
        self.nodes.clear();
        for i in 0..=2 * pieces {
            let t =
                *start + chrono::Duration::milliseconds((i as f64 * NODE_SPACING_S * 1e3) as i64);
            self.nodes.push(self.direct_enu(&t));
        }
        let mid = *start + chrono::Duration::milliseconds(((t1 - t0) * 500.0) as i64);
        match self.body {
            Body::Sun => {
                let r = sun_ecef(&mid).position_km;
                let d = (r[0] * r[0] + r[1] * r[1] + r[2] * r[2]).sqrt();
                self.angular_radius_deg = sun_angular_radius_deg(d);
                self.illuminated_fraction = 1.0;
            }
            Body::Moon => {
                let v = moon_view(&self.observer, &mid);
                self.angular_radius_deg = v.angular_radius_deg;
                self.illuminated_fraction = v.illuminated_fraction;
            }
        }
        Ok(())
    }

    fn body_ecef(&self, t: &DateTime<Utc>) -> EcefState {
        match self.body {
            Body::Sun => sun_ecef(t),
            Body::Moon => moon_ecef(t),
        }
    }

    /// The body's unit vector (east, north, up) at `t`, computed directly (no interpolation).
    pub fn direct_enu(&self, t: &DateTime<Utc>) -> [f64; 3] {
        let look = self.observer.look(&self.body_ecef(t));
        enu_from_az_el(look.azimuth_deg, look.elevation_deg)
    }

    /// The body's unit vector (east, north, up) at `t`, interpolated. Times outside the span are
    /// extrapolated from the nearest piece (the error grows as the cube of the distance).
    pub fn direction_enu(&self, t: &DateTime<Utc>) -> [f64; 3] {
        let x = (unix_s(t) - self.start_unix_s) / NODE_SPACING_S;
        let pieces = (self.nodes.len() - 1) / 2;
        // truncation after max(0) is the floor clamped at 0, without a libm call per step
        let k = ((x / 2.0).max(0.0) as usize).min(pieces - 1);
        // local coordinate in node spacings from the piece's middle node: nodes at -1, 0, +1
        let u = x - (2 * k + 1) as f64;
        let (a, b, c) = (
            self.nodes[2 * k],
            self.nodes[2 * k + 1],
            self.nodes[2 * k + 2],
        );
        // Lagrange: L-1 = u(u-1)/2, L0 = 1 - u², L+1 = u(u+1)/2
        let (la, lb, lc) = (u * (u - 1.0) / 2.0, 1.0 - u * u, u * (u + 1.0) / 2.0);
        let v = [
            la * a[0] + lb * b[0] + lc * c[0],
            la * a[1] + lb * b[1] + lc * c[1],
            la * a[2] + lb * b[2] + lc * c[2],
        ];
        let n = (v[0] * v[0] + v[1] * v[1] + v[2] * v[2]).sqrt();
        [v[0] / n, v[1] / n, v[2] / n]
    }

    /// Azimuth and elevation of the body at `t`, deg (interpolated).
    pub fn az_el_deg(&self, t: &DateTime<Utc>) -> (f64, f64) {
        let [e, n, u] = self.direction_enu(t);
        let az = super::wrap360_deg(e.atan2(n).to_degrees());
        (az, u.clamp(-1.0, 1.0).asin().to_degrees())
    }

    /// Angle between the body's centre and the pointing direction (azimuth, elevation in deg)
    /// at `t`, deg: 2 asin(|u − p| / 2), accurate at small angles.
    pub fn separation_deg(&self, t: &DateTime<Utc>, azimuth_deg: f64, elevation_deg: f64) -> f64 {
        chord_separation_deg(
            &self.direction_enu(t),
            &enu_from_az_el(azimuth_deg, elevation_deg),
        )
    }

    /// Angular radius of the body's disk at the middle of the span, deg.
    pub fn angular_radius_deg(&self) -> f64 {
        self.angular_radius_deg
    }

    /// Illuminated fraction at the middle of the span (1 for the Sun).
    pub fn illuminated_fraction(&self) -> f64 {
        self.illuminated_fraction
    }

    /// The body the track follows.
    pub fn body(&self) -> Body {
        self.body
    }
}

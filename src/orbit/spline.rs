//! Earth-fixed states over a stretch of time, interpolated between SGP4 knots.
//!
//! A pass is followed at 1 s steps, but SGP4 plus the TEME -> Earth-fixed rotation costs about
//! as much as the whole rest of a step's geometry. Over a pass the Earth-fixed position and
//! velocity are smooth functions of time, so [`EcefSpline`] propagates equally spaced knots at
//! most [`KNOT_SPACING_S`] apart, the first at the start and the last at the end of the stretch
//! (at least four), and interpolates the position and the velocity each by the cubic through the
//! four knots around the time (Lagrange form, knots at x = 0, 1, 2, 3 in units of the spacing h):
//!
//! ```text
//! f(x) = -(x-1)(x-2)(x-3)/6 f0 + x(x-2)(x-3)/2 f1 - x(x-1)(x-3)/2 f2 + x(x-1)(x-2)/6 f3
//! ```
//!
//! The velocity is interpolated from SGP4's velocities, not differentiated from the positions:
//! SGP4's velocity is not exactly the derivative of its position (its short-period terms are
//! applied to each separately; 0.5-2 m/s apart on the eccentric verification orbit 00005), so a
//! Hermite cubic built from both would miss by metres, while each interpolated on its own stays
//! within a few centimetres of what SGP4 gives at that time.
//!
//! Error: `|f(x) - f| <= h⁴ max|f⁗| max|x(x-1)(x-2)(x-3)| / 24` (Lagrange remainder), the product at
//! most 1 in an end interval and 9/16 inside; for a 90-minute orbit `|r⁗| ≈ n⁴ r ≈ 1.3e-8 km/s⁴`,
//! so 20 s knots give at most 9 cm. The suite checks the interpolant against direct SGP4 every
//! second over 20-minute stretches of near-Earth orbits (`tests/suite/interpolation_bounds.rs`;
//! the README gives the measured errors): position within 1 m, velocity within 1 mm/s. At the
//! knots the interpolant returns SGP4's state.
//!
//! Deep-space orbits (SDP4, period of 225 min or more) are not interpolated (their lunar-solar
//! and resonance terms are not checked here): they are propagated directly at every step, as are
//! times outside the stretch and stretches shorter than [`MIN_SPAN_S`].

use chrono::{DateTime, Utc};

use super::frames::EcefState;
use super::propagate::{PropagationError, Propagator};
use crate::timefmt::{add_seconds, seconds_between};

/// Largest spacing of the SGP4 knots, s.
pub const KNOT_SPACING_S: f64 = 20.0;

/// Shortest stretch that is interpolated, s (shorter ones are propagated directly).
pub const MIN_SPAN_S: f64 = 1.0;

/// Earth-fixed states of one satellite over one stretch of time (a pass). Reuse one value for
/// every pass: [`EcefSpline::reset`] allocates nothing once its buffers have grown to the
/// longest stretch.
#[derive(Debug, Clone, Default)]
pub struct EcefSpline {
    start: Option<DateTime<Utc>>,
    /// Knot spacing, s (the knots are at `j h` from `start`).
    h_s: f64,
    states: Vec<EcefState>,
    /// Direct SGP4 at every time (deep space, a stretch too short).
    direct: bool,
}

impl EcefSpline {
    pub fn new() -> Self {
        Self::default()
    }

    /// Propagate the knots of [`start`, `end`] (or, for a deep-space orbit or a stretch shorter
    /// than [`MIN_SPAN_S`], only remember `start`).
    pub fn reset(
        &mut self,
        prop: &Propagator,
        start: &DateTime<Utc>,
        end: &DateTime<Utc>,
    ) -> Result<(), PropagationError> {
        self.start = Some(*start);
        self.states.clear();
        let span_s = seconds_between(start, end);
        // (a NaN span is not interpolated either)
        self.direct = !prop.is_near_earth() || span_s.is_nan() || span_s < MIN_SPAN_S;
        if self.direct {
            return Ok(());
        }
        let m = ((span_s / KNOT_SPACING_S).ceil() as usize).max(3);
        self.h_s = span_s / m as f64;
        for j in 0..=m {
            let t_s = if j == m { span_s } else { j as f64 * self.h_s };
            self.states.push(prop.ecef_at(&add_seconds(start, t_s))?);
        }
        Ok(())
    }

    /// The Earth-fixed state `t_s` seconds after the start of the stretch: interpolated between
    /// the knots around it, or direct SGP4 (deep space, outside the stretch, before any
    /// [`EcefSpline::reset`]). Allocates nothing.
    #[inline]
    pub fn at(&self, prop: &Propagator, t_s: f64) -> Result<EcefState, PropagationError> {
        let n = self.states.len();
        let end_s = self.h_s * (n.max(1) - 1) as f64;
        let inside = !self.direct && n >= 4 && t_s >= 0.0 && t_s <= end_s * (1.0 + 1e-12);
        if !inside {
            let start = self.start.unwrap_or_else(|| prop.epoch());
            return prop.ecef_at(&add_seconds(&start, t_s));
        }
        let u = t_s / self.h_s;
        // the interval [i, i + 1] and the four knots around it, first..first + 3
        let i = (u as usize).min(n - 2);
        let first = i.saturating_sub(1).min(n - 4);
        Ok(cubic(&self.states[first..first + 4], u - first as f64))
    }
}

/// The cubic through four equally spaced states (knots at x = 0, 1, 2, 3), at `x`, position and
/// velocity each on its own (module doc).
#[inline]
fn cubic(k: &[EcefState], x: f64) -> EcefState {
    let (a, b, c) = (x - 1.0, x - 2.0, x - 3.0);
    let w = [
        -a * b * c / 6.0,
        x * b * c / 2.0,
        -x * a * c / 2.0,
        x * a * b / 6.0,
    ];
    let mut out = EcefState {
        position_km: [0.0; 3],
        velocity_km_s: [0.0; 3],
    };
    for d in 0..3 {
        out.position_km[d] = w[0] * k[0].position_km[d]
            + w[1] * k[1].position_km[d]
            + w[2] * k[2].position_km[d]
            + w[3] * k[3].position_km[d];
        out.velocity_km_s[d] = w[0] * k[0].velocity_km_s[d]
            + w[1] * k[1].velocity_km_s[d]
            + w[2] * k[2].velocity_km_s[d]
            + w[3] * k[3].velocity_km_s[d];
    }
    out
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn a_cubic_is_reproduced_exactly() {
        // The four-point cubic is exact for cubics: f = 2 x^3 - x^2 + 3 x + 1.
        let f = |x: f64| 2.0 * x * x * x - x * x + 3.0 * x + 1.0;
        let knot = |x: f64| EcefState {
            position_km: [f(x), -f(x), 0.5 * f(x)],
            velocity_km_s: [f(x + 1.0), 0.0, -f(x)],
        };
        let k = [knot(0.0), knot(1.0), knot(2.0), knot(3.0)];
        for x in [0.0, 0.3, 1.0, 1.5, 2.9, 3.0] {
            let s = cubic(&k, x);
            assert!((s.position_km[0] - f(x)).abs() < 1e-12 * f(3.0), "{x}");
            assert!(
                (s.position_km[2] - 0.5 * f(x)).abs() < 1e-12 * f(3.0),
                "{x}"
            );
            assert!(
                (s.velocity_km_s[0] - f(x + 1.0)).abs() < 1e-12 * f(4.0),
                "{x}"
            );
        }
    }
}

//! Pass search: AOS, TCA and LOS of a satellite over one station and mask.
//!
//! A pass is an interval where g(t) = elevation(t) - mask(azimuth(t)) > 0 (geometric
//! elevation, [`super::horizon::HorizonMask::limit_deg`]). AOS and LOS are the roots of g,
//! TCA is the time of maximum elevation inside the pass; all three are refined to
//! [`TIME_TOLERANCE_S`] (0.02 s). Passes cut by the window are kept with AOS = start or
//! LOS = end and flagged. A satellite that never sets gives one pass spanning the window,
//! flagged at both ends; one that never rises gives an empty list.
//!
//! # Method (original; the bounds below are elementary geometry)
//! 1. **Skip ahead outside the visibility cone** (two skips, the longer one is taken).
//!    Let γ be the geocentric angle between the satellite and the station (Earth-fixed). For
//!    a station at geocentric radius R and a satellite at radius r, the elevation above the
//!    station's *geocentric* horizontal is ≥ ε iff γ ≤ γc(ε, r) = acos(R cos ε / r) - ε (law of
//!    sines in the station-satellite-geocentre triangle). The geodetic vertical differs from
//!    the geocentric one by δ (< 0.2°), so any point above the mask has
//!    γ ≤ γc(ε_low - δ - 0.2°, r_max), with ε_low the lowest mask elevation and
//!    r_max = 1.01 a (1 + e) + 20 km a bound on the orbit radius.
//!    * Rate bound (strict): the satellite's direction turns at most
//!      ω_max = 1.02 h / r_p,min² + ω⊕ with h = sqrt(μ a_max (1 - e²)), a_max = 1.005 a + 10 km,
//!      r_p,min = a (1 - e) - 30 km (angular momentum / radius² plus Earth rotation), so γ
//!      cannot reach γc for (γ - γc) / ω_max seconds.
//!    * Predicted skip (e < 0.05 only; an error model, not a strict bound): γ is predicted
//!      over the next 1.5 periods from the sample's state with a circular orbit under the
//!      turning Earth, less a margin growing as 0.5° + (4e + 0.01) × (angle travelled) plus
//!      ω_max × Δτ between grid points (Δτ = 3 s; the grid points that cannot trigger are
//!      jumped over by a strict bound on γ - θ, so the test costs a few evaluations of the
//!      prediction, not one per grid point). The cone of this test is γc for the largest
//!      radius the satellite can reach within the horizon, the sample's radius plus 2 a (e + 0.002) + 5 km
//!      (perigee to apogee, a change of e from long-period terms and drag, SGP4's short-period
//!      radial term of amplitude k2 / 2p ≈ 1.6 km in LEO), at most r_max (see `local_cone`,
//!      `predicted_skip`). Its safety is checked in tests/passes_search.rs against 1 s scans over
//!      varied LEO orbits and stations. Inside the cone (after a LOS, past a near miss) the
//!      prediction is tested from the end of the strict bounds below; when it keeps the
//!      satellite out of the cone past them, that is the step.
//!    * Elevation bound (strict): the line of sight turns at most at |v|/ρ, |v| <= v_max (vis-viva
//!      at the lowest perigee plus ω⊕ r_max) and ρ(τ) >= ρ0 - v_max τ, so the elevation cannot
//!      rise by Δ before (ρ0 / v_max)(1 - e^-Δ) (`elevation_bound_s`; any step below the mask is
//!      at least that).
//!    * Curvature bound (strict): sin ε = l·û for the unit line of sight l, and
//!      |l''| <= (2 a_max + 3 v_max²/ρ)/ρ (a_max bounds the Earth-fixed acceleration), so
//!      sin ε(τ) <= sin ε0 + (sin ε)'(0) τ + |l''|max τ²/2: a satellite going down or away
//!      cannot reach the mask before that bound does (`curvature_bound_s`; any step below the
//!      mask is at least that too).
//!
//!    Every skip is at least [`FLOOR_STEP_S`].
//! 2. **Sample inside the cone** at [`FLOOR_STEP_S`] (19 s) while g ≤ 0: any pass lasting
//!    ≥ [`GUARANTEED_PASS_S`] (20 s) contains a sample, so none is missed (shorter ones may be).
//!    With a mask that does not depend on azimuth, a step while g rises ends 5 % + 0.2 s past
//!    the Newton-predicted AOS when that comes sooner, so the AOS bracket has a near end.
//! 3. **Refine** roots of g by Newton steps from the latest sample (ġ from the analytic
//!    elevation rate, plus the mask slope times the azimuth rate), kept inside the sign-change
//!    bracket. With a mask that does not depend on azimuth (g smooth) a Newton estimate is
//!    accepted without a further evaluation when its Taylor error bound, twice
//!    |g''| δ² / (2|ġ|) + 1e-3 δ (δ the Newton step, g'' from the two latest samples), is at
//!    most a quarter of the tolerance (`newton_accepted`); a mask with azimuth corners closes
//!    the bracket to the tolerance. TCA: evaluations at the maximum of the cubic Hermite
//!    interpolant (elevation and rate at both ends) of the shrinking bracket, until the next
//!    predicted maximum lies within half the tolerance of the last sample. On deep-space (SDP4)
//!    orbits SGP4's velocity is not the derivative of its position (~1e-3 km/s apart on an
//!    e = 0.7 orbit, seconds of TCA), so TCA there is refined by Newton steps on central
//!    differences of the elevation of positions (±1 s).
//!    Inside a pass the search walks towards the next event: with a mask that does not depend
//!    on azimuth on a near-Earth orbit with e < 0.05 (one elevation maximum per pass), first to
//!    10 % past the closest approach of a straight line at the AOS velocity, then to 3 % + 1 s
//!    past the AOS mirrored about the TCA; otherwise with Newton predictions capped at 1/32 of
//!    a period.
//!
//! Each evaluation works in plain seconds from the window start and computes no azimuth (unless
//! the mask needs it) and no off-nadir angle; the pass's azimuths are computed once at the end.
//!
//! Cost (tests/passes_search.rs, `propagation_budget_over_the_station_and_mask_grid`): about
//! 83 propagations per LEO satellite-day averaged over stations at 0, 45 and 61° latitude and
//! masks of 0, 5 and 10° (four LEO orbits, 7 days; 98 before the predicted skip's grid, about
//! 120 before the curvature bound, 170 before this method), from about 43 at the equator with a
//! 10° mask to about 145 at 61° with a 0° mask. Completeness is checked there against a
//! brute-force 1 s scan. A propagation error
//! stops the search; passes found before are kept.

use chrono::{DateTime, Utc};

use super::bounded_trig;
use super::horizon::HorizonMask;
use super::look::{Look, Observer};
use crate::orbit::frames::{
    days_since_j2000, gmst_rad, teme_to_ecef_sin_cos, EcefState, EARTH_ROTATION_RAD_S,
};
use crate::orbit::propagate::{PropagationError, Propagator, WGS72_MU_KM3_S2};
use crate::timefmt::{add_seconds, seconds_between};

/// Passes at least this long (s above the mask) are never missed.
pub const GUARANTEED_PASS_S: f64 = 20.0;
/// Sampling step inside the visibility cone, s (< [`GUARANTEED_PASS_S`]).
pub const FLOOR_STEP_S: f64 = 19.0;
/// Time tolerance of AOS/TCA/LOS refinement, s.
pub const TIME_TOLERANCE_S: f64 = 0.02;

/// One contact of a satellite with a station.
#[derive(Debug, Clone, PartialEq)]
pub struct Pass {
    /// Acquisition of signal: the satellite rises above the mask (or the window start).
    pub aos: DateTime<Utc>,
    /// Time of maximum elevation within the pass.
    pub tca: DateTime<Utc>,
    /// Time of maximum elevation of the whole pass: `tca`, except for a pass the window cuts
    /// after (or before) its highest point, whose maximum is searched outside the window (up to
    /// one orbital period; a satellite that stays in view that long keeps `tca`). It does not
    /// change with the window, so it identifies the pass.
    pub full_tca: DateTime<Utc>,
    /// Loss of signal: the satellite sets below the mask (or the window end).
    pub los: DateTime<Utc>,
    pub max_elevation_deg: f64,
    pub aos_azimuth_deg: f64,
    pub tca_azimuth_deg: f64,
    pub los_azimuth_deg: f64,
    /// Smallest slant range during the pass, km (at TCA for a LEO; see `Search::min_range_km`).
    pub min_range_km: f64,
    /// The satellite was already above the mask at the window start (AOS = start).
    pub starts_before_window: bool,
    /// The satellite was still above the mask at the window end (LOS = end).
    pub ends_after_window: bool,
}

impl Pass {
    /// Duration LOS - AOS, s.
    pub fn duration_s(&self) -> f64 {
        seconds_between(&self.aos, &self.los)
    }
}

/// Result of [`find_passes`].
#[derive(Debug, Clone, PartialEq)]
pub struct PassSearch {
    /// Passes in time order.
    pub passes: Vec<Pass>,
    /// Set if propagation failed; the search covers the window only up to that time.
    pub stopped: Option<PropagationError>,
    /// SGP4 evaluations used.
    pub propagations: u64,
}

#[derive(Debug, Clone, Copy)]
struct Sample {
    /// Seconds since the window start.
    t: f64,
    /// g = elevation - mask, deg.
    g: f64,
    /// ġ, deg/s.
    gdot: f64,
    /// cos γ, γ the geocentric angle satellite-station.
    cos_gamma: f64,
    /// Geometric elevation (deg) and its rate (deg/s, from SGP4's velocity).
    elevation_deg: f64,
    elevation_rate_deg_s: f64,
    /// Slant range (km) and its rate (km/s).
    range_km: f64,
    range_rate_km_s: f64,
    /// Earth-fixed position (km) and velocity (km/s).
    r: [f64; 3],
    v: [f64; 3],
}

impl Sample {
    /// Geocentric angle satellite-station, rad.
    fn gamma(&self) -> f64 {
        self.cos_gamma.clamp(-1.0, 1.0).acos()
    }

    /// Full look angles (azimuth, off-nadir angle) of the sample, for the reported pass.
    fn look(&self, obs: &Observer) -> Look {
        obs.look(&EcefState {
            position_km: self.r,
            velocity_km_s: self.v,
        })
    }
}

struct Search<'a> {
    prop: &'a Propagator,
    obs: &'a Observer,
    mask: &'a HorizonMask,
    start: DateTime<Utc>,
    obs_unit: [f64; 3],
    /// Minutes from the element epoch to the window start.
    epoch_offset_min: f64,
    /// Days of UT1 (= UTC) since J2000.0 at the window start.
    start_days_j2000: f64,
    /// The mask depends on azimuth (else g is smooth: elevation minus a constant).
    azimuth_mask: bool,
    /// Mask elevation when it does not depend on azimuth, deg.
    flat_limit_deg: f64,
    /// Position-consistent TCA refinement (SDP4: its velocity is not the derivative of its
    /// position, so an elevation rate built from it misplaces the maximum).
    positions_for_tca: bool,
    /// The walk through a pass may use predicted steps (see `walk_step`).
    predicted_walk: bool,
}

/// Grid step of the predicted skip (`Search::predicted_skip`), s.
const PREDICTED_GRID_S: f64 = 3.0;

/// Time step of the central differences of elevation used for TCA on deep-space orbits, s.
/// Truncation error of the derivative ~ h² |ε'''| / 6, i.e. a TCA error ~ h² |ε'''| / (6 |ε''|)
/// < 0.002 s for elevation curves with a time scale |ε''/ε'''| above 100 s (orbits with a period
/// of 225 min or more); rounding ~ 1e-12 rad / (h |ε''|), below 1e-4 s for |ε''| > 1e-8 rad/s².
const TCA_DIFFERENCE_STEP_S: f64 = 1.0;

impl Search<'_> {
    /// One SGP4 evaluation at `t` s after the window start, with the quantities the search needs
    /// (no azimuth unless the mask depends on it; no off-nadir angle).
    fn eval(&self, t: f64) -> Result<Sample, PropagationError> {
        let teme = self
            .prop
            .propagate_minutes(self.epoch_offset_min + t / 60.0)?;
        // The sidereal angle lies in 0..2π: the bounded sine and cosine are within
        // `bounded_trig::MAX_ERROR` (1e-15 rad, 1e-11 km of position) of the library's.
        let gmst = gmst_rad(self.start_days_j2000 + t / 86_400.0);
        let s = teme_to_ecef_sin_cos(&teme, bounded_trig::sin_cos(gmst));
        // The formulas of `Observer::look`, without azimuth and off-nadir angle.
        let ([e, n, u], [ed, nd, ud]) = self.obs.enu(&s);
        let h2 = e * e + n * n;
        let h = h2.sqrt();
        let range_km = (h2 + u * u).sqrt();
        let elevation_deg = u.atan2(h).to_degrees();
        let elevation_rate_deg_s = if h > 1e-9 {
            let hd = (e * ed + n * nd) / h;
            ((ud * h - u * hd) / (range_km * range_km)).to_degrees()
        } else {
            0.0
        };
        let (g, gdot) = if !self.azimuth_mask {
            (elevation_deg - self.flat_limit_deg, elevation_rate_deg_s)
        } else if h > 1e-9 {
            let az = e.atan2(n).to_degrees().rem_euclid(360.0);
            let az = if az >= 360.0 { 0.0 } else { az };
            let az_rate = ((ed * n - e * nd) / h2).to_degrees();
            (
                elevation_deg - self.mask.limit_deg(az),
                // ġ = d(el)/dt - (d mask / d az) d(az)/dt
                elevation_rate_deg_s - self.mask.slope_deg_per_deg(az) * az_rate,
            )
        } else {
            (elevation_deg - self.mask.limit_deg(0.0), 0.0)
        };
        let r = s.position_km;
        let rn = (r[0] * r[0] + r[1] * r[1] + r[2] * r[2]).sqrt();
        Ok(Sample {
            t,
            g,
            gdot,
            cos_gamma: (r[0] * self.obs_unit[0]
                + r[1] * self.obs_unit[1]
                + r[2] * self.obs_unit[2])
                / rn,
            elevation_deg,
            elevation_rate_deg_s,
            range_km,
            range_rate_km_s: (e * ed + n * nd + u * ud) / range_km,
            r,
            v: s.velocity_km_s,
        })
    }

    /// Time (s) the satellite cannot enter the cone γ <= `gamma_cone`, predicted from the
    /// sample's state by a circular two-body orbit with the Earth turning beneath it:
    ///
    /// ```text
    /// u(τ) = cos(wτ) P + sin(wτ) Q   (P = r̂, Q = ĥ × P, w = |h| / r², h = r × (v + ω⊕ × r))
    /// s(τ) = R3(-ω⊕ τ) ŝ             (station direction in the frame of the sample)
    /// γ(τ) = acos(u(τ)·s(τ))
    /// ```
    ///
    /// The prediction error is allowed to grow as m(τ) = 0.5° + (4e + 0.01) w τ (eccentricity,
    /// J2 short-period and drag effects on the along-track angle are ~1e-3 of it for LEO), and
    /// between grid points ([`PREDICTED_GRID_S`], 3 s) the satellite can move by ω_max · 3 s.
    /// Only used for e < 0.05.
    fn predicted_skip(
        &self,
        s: &Sample,
        gamma_cone: f64,
        omega_max: f64,
        e: f64,
        horizon: f64,
        strict_s: f64,
    ) -> f64 {
        let w_e = EARTH_ROTATION_RAD_S;
        let r = s.r;
        let vi = [s.v[0] - w_e * r[1], s.v[1] + w_e * r[0], s.v[2]];
        let rn = (r[0] * r[0] + r[1] * r[1] + r[2] * r[2]).sqrt();
        let p = [r[0] / rn, r[1] / rn, r[2] / rn];
        let h = [
            r[1] * vi[2] - r[2] * vi[1],
            r[2] * vi[0] - r[0] * vi[2],
            r[0] * vi[1] - r[1] * vi[0],
        ];
        let hn = (h[0] * h[0] + h[1] * h[1] + h[2] * h[2]).sqrt();
        if hn <= 0.0 || hn.is_nan() {
            return 0.0;
        }
        let hu = [h[0] / hn, h[1] / hn, h[2] / hn];
        let q = [
            hu[1] * p[2] - hu[2] * p[1],
            hu[2] * p[0] - hu[0] * p[2],
            hu[0] * p[1] - hu[1] * p[0],
        ];
        let w = hn / (rn * rn);
        let cone = PredictedCone {
            p_station: station_terms(&p, &self.obs_unit),
            q_station: station_terms(&q, &self.obs_unit),
            w,
            gamma_cone,
            m0: 0.5f64.to_radians(),
            k: (4.0 * e + 0.01) * w,
            omega_max,
        };
        // One grid of 3 s: its slack ω_max Δτ is 0.2 deg for a LEO, and the jumps over the
        // grid points that cannot pass (see `PredictedCone::first_entry`) make a fine grid
        // cost about what a coarse one would. Point i covers [τ_i - Δτ, τ_i + Δτ], so the
        // satellite stays out of the cone until the first point that fails. The strict bounds
        // keep it below the mask until `strict_s`, so the test starts at the grid point at or
        // just before that.
        let dtau = PREDICTED_GRID_S;
        let steps = (horizon / dtau).ceil() as usize;
        let first = grid_start(strict_s, dtau, steps);
        cone.first_entry(first as f64 * dtau, dtau, steps - first)
            .map_or(horizon, |j| (first + j) as f64 * dtau)
    }

    /// Root of g (azimuth-dependent mask: g has corners) between `a` and `b` (g of opposite signs, g(a) <= 0 < g(b) or the reverse).
    /// Returns (root estimate s, sample with g <= 0, sample with g > 0).
    fn refine_root_corners(
        &self,
        a: Sample,
        b: Sample,
    ) -> Result<(f64, Sample, Sample), PropagationError> {
        let (mut neg, mut pos) = if a.g <= 0.0 { (a, b) } else { (b, a) };
        for _ in 0..40 {
            let lo = neg.t.min(pos.t);
            let hi = neg.t.max(pos.t);
            if hi - lo <= TIME_TOLERANCE_S {
                break;
            }
            let c = if neg.g.abs() < pos.g.abs() { neg } else { pos };
            let other = if c.t == neg.t { pos } else { neg };
            // Newton: t = t_c - g_c / ġ_c
            let mut tn = if c.gdot != 0.0 {
                c.t - c.g / c.gdot
            } else {
                f64::NAN
            };
            if !(tn > lo && tn < hi) {
                // Secant through the bracket ends.
                tn = neg.t - neg.g * (pos.t - neg.t) / (pos.g - neg.g);
            }
            if !(tn > lo && tn < hi) {
                tn = 0.5 * (lo + hi);
            }
            // Step slightly past a converged Newton point to close the bracket.
            let toward = (other.t - c.t).signum();
            if (tn - c.t).abs() < 0.5 * TIME_TOLERANCE_S {
                tn = c.t + toward * 0.5 * TIME_TOLERANCE_S;
            }
            let s = self.eval(tn)?;
            if s.g <= 0.0 {
                neg = s;
            } else {
                pos = s;
            }
        }
        Ok((secant_root(&neg, &pos), neg, pos))
    }

    /// Root of g between `a` and `b` (opposite signs): (root, sample with g <= 0, sample with
    /// g > 0).
    fn refine_root(&self, a: Sample, b: Sample) -> Result<(f64, Sample, Sample), PropagationError> {
        if self.azimuth_mask {
            self.refine_root_corners(a, b)
        } else {
            self.refine_root_smooth(a, b)
        }
    }

    /// Root of a smooth g (no azimuth-dependent mask) between `a` and `b` (opposite signs).
    /// Newton steps from the latest sample, kept inside the sign-change bracket (cubic Hermite
    /// interpolation of the bracket when Newton leaves it, bisection as the last resort). A Newton
    /// estimate t - g/ġ from a sample at distance δ = |g/ġ| from the root is off by
    /// |g''| δ² / (2 |ġ|) (Taylor remainder) plus δ times the relative error of ġ (SGP4's velocity
    /// against the derivative of its position: ~3e-6 for SGP4, ~1e-3 for SDP4): it is accepted
    /// without a further evaluation when twice that bound, with g'' from the change of ġ between
    /// the two latest samples, is at most a quarter of [`TIME_TOLERANCE_S`] and δ is below it.
    /// Returns (root, sample with g <= 0, sample with g > 0).
    fn refine_root_smooth(
        &self,
        a: Sample,
        b: Sample,
    ) -> Result<(f64, Sample, Sample), PropagationError> {
        let (mut neg, mut pos) = if a.g <= 0.0 { (a, b) } else { (b, a) };
        // The latest sample and the one before (for g''): start from the end nearer the root.
        let (mut cur, mut other) = if neg.g.abs() < pos.g.abs() {
            (neg, pos)
        } else {
            (pos, neg)
        };
        for _ in 0..40 {
            let lo = neg.t.min(pos.t);
            let hi = neg.t.max(pos.t);
            let newton = if cur.gdot != 0.0 {
                cur.t - cur.g / cur.gdot
            } else {
                f64::NAN
            };
            if newton >= lo && newton <= hi && newton_accepted(&cur, &other) {
                return Ok((newton, neg, pos));
            }
            if hi - lo <= TIME_TOLERANCE_S {
                break;
            }
            let mut tn = newton;
            if !(tn > lo && tn < hi) {
                tn = hermite_root(&neg, &pos).unwrap_or(0.5 * (lo + hi));
            }
            // Keep away from the bracket ends so that it shrinks.
            let eps = 0.25 * TIME_TOLERANCE_S;
            tn = tn.clamp(lo + eps.min(0.5 * (hi - lo)), hi - eps.min(0.5 * (hi - lo)));
            let s = self.eval(tn)?;
            if s.g <= 0.0 {
                neg = s;
            } else {
                pos = s;
            }
            other = cur;
            cur = s;
        }
        Ok((secant_root(&neg, &pos), neg, pos))
    }

    /// The smallest slant range of a pass: the ranges at AOS, TCA and LOS and, where the range
    /// rate changes sign inside the pass away from TCA (eccentric orbits), the range at that zero,
    /// found by regula falsi on the range rate. For a LEO the range rate at TCA is nearly zero and
    /// no propagation is spent: skipping a zero of |rr| < 0.05 km/s misses at most rr^2 / (2 r'')
    /// ~ 0.02 km of range.
    fn min_range_km(&self, aos: Sample, tca: Sample, los: Sample) -> Result<f64, PropagationError> {
        let rr = |s: &Sample| s.range_rate_km_s;
        let mut best = aos.range_km.min(tca.range_km).min(los.range_km);
        if rr(&tca).abs() < 0.05 {
            return Ok(best);
        }
        let (mut a, mut b) = if rr(&aos) < 0.0 && rr(&tca) > 0.0 {
            (aos, tca)
        } else if rr(&tca) < 0.0 && rr(&los) > 0.0 {
            (tca, los)
        } else {
            return Ok(best);
        };
        for _ in 0..8 {
            // Regula falsi: t = t_a - rr_a (t_b - t_a) / (rr_b - rr_a)
            let t = a.t - rr(&a) * (b.t - a.t) / (rr(&b) - rr(&a));
            let s = self.eval(t.clamp(a.t, b.t))?;
            best = best.min(s.range_km);
            if rr(&s).abs() < 1e-4 {
                break;
            }
            if rr(&s) < 0.0 {
                a = s;
            } else {
                b = s;
            }
        }
        Ok(best)
    }

    /// The local maximum of elevation between `a` (rate > 0) and `b` (rate <= 0).
    fn refine_tca(&self, a: Sample, b: Sample) -> Result<Sample, PropagationError> {
        if self.positions_for_tca {
            self.refine_tca_positions(a, b)
        } else {
            self.refine_tca_rates(a, b)
        }
    }

    /// TCA from SGP4's elevation rate (near-Earth: its velocity is the derivative of its position
    /// within ~2e-5 km/s, an elevation-rate error that moves TCA by < 1e-3 s for the elevation
    /// curvatures of LEO passes). Each step evaluates at the maximum of the cubic Hermite
    /// interpolant of the bracket (elevation and rate at both ends), the bracket shrinking to the
    /// sign change of the rate; the sample is the TCA when the next predicted maximum lies within
    /// half of [`TIME_TOLERANCE_S`] of it.
    fn refine_tca_rates(&self, a: Sample, b: Sample) -> Result<Sample, PropagationError> {
        let rate = |s: &Sample| s.elevation_rate_deg_s;
        let (mut up, mut down) = (a, b);
        let mut last: Option<Sample> = None;
        for _ in 0..40 {
            let lo = up.t.min(down.t);
            let hi = up.t.max(down.t);
            let predicted = hermite_max(&up, &down)
                .unwrap_or_else(|| up.t - rate(&up) * (down.t - up.t) / (rate(&down) - rate(&up)));
            if let Some(l) = last {
                if (predicted - l.t).abs() <= 0.5 * TIME_TOLERANCE_S {
                    return Ok(l);
                }
            }
            if hi - lo <= TIME_TOLERANCE_S {
                break;
            }
            let mut tn = if predicted > lo && predicted < hi {
                predicted
            } else {
                0.5 * (lo + hi)
            };
            // Keep away from the ends so the bracket shrinks on both sides.
            let eps = 0.25 * TIME_TOLERANCE_S;
            tn = tn.clamp(lo + eps, hi - eps);
            let s = self.eval(tn)?;
            if rate(&s) > 0.0 {
                up = s;
            } else {
                down = s;
            }
            last = Some(s);
        }
        Ok(better(up, down))
    }

    /// TCA from positions only (deep space): Newton steps on the elevation with its first and
    /// second derivatives taken by central differences over ±[`TCA_DIFFERENCE_STEP_S`], from
    /// the maximum of the Hermite interpolant of the bracket (SGP4's rates there only start
    /// the iteration). The middle sample is the TCA once the Newton step is below half of
    /// [`TIME_TOLERANCE_S`]. The iteration may leave the bracket by a tenth of its width plus
    /// 60 s, since the bracket's rates are SDP4's (off by up to several seconds of TCA).
    fn refine_tca_positions(&self, a: Sample, b: Sample) -> Result<Sample, PropagationError> {
        let h = TCA_DIFFERENCE_STEP_S;
        let lo = a.t.min(b.t);
        let hi = a.t.max(b.t);
        let widen = 0.1 * (hi - lo) + 60.0;
        let mut t = hermite_max(&a, &b).unwrap_or(0.5 * (lo + hi));
        let mut best = better(a, b);
        for _ in 0..20 {
            let m = self.eval(t - h)?;
            let c = self.eval(t)?;
            let p = self.eval(t + h)?;
            best = better(best, c);
            let d1 = (p.elevation_deg - m.elevation_deg) / (2.0 * h);
            let d2 = (p.elevation_deg - 2.0 * c.elevation_deg + m.elevation_deg) / (h * h);
            let step = if d2 < 0.0 {
                -d1 / d2
            } else {
                // Not concave here: move uphill by a tenth of the bracket.
                d1.signum() * 0.1 * (hi - lo).max(10.0 * h)
            };
            if d2 < 0.0 && step.abs() <= 0.5 * TIME_TOLERANCE_S {
                return Ok(c);
            }
            t = (t + step).clamp(lo - widen, hi + widen);
        }
        Ok(best)
    }
}

/// The circular-orbit prediction of `Search::predicted_skip`: satellite direction
/// u(τ) = cos(wτ) P + sin(wτ) Q, station direction s(τ) = R3(-ω⊕ τ) ŝ, visibility cone γc,
/// error margin m0 + k τ and the rate bound ω_max.
struct PredictedCone {
    /// P·s(τ) = cos(ω⊕τ) a0 + sin(ω⊕τ) a1 + a2 for these [a0, a1, a2] (`station_terms`); the
    /// same for Q.
    p_station: [f64; 3],
    q_station: [f64; 3],
    w: f64,
    gamma_cone: f64,
    m0: f64,
    k: f64,
    omega_max: f64,
}

impl PredictedCone {
    /// Index i of the first grid point τ_i = `from` + i `dtau` (i <= `steps`) from which the
    /// satellite may enter the cone before τ_i + `dtau`: γ(τ_i) <= θ = γc + ω_max dtau + m0 +
    /// k (τ_i + dtau), i.e. cos γ(τ_i) >= cos θ (θ < π); `None` if there is none.
    ///
    /// Grid points that cannot pass the test are jumped over instead of evaluated: the angle γ
    /// changes at most at w + ω⊕ (u turns at w, s at ω⊕ cos φ) and θ grows at k, so from a
    /// point with γ - θ = Δ > 0 no grid point within Δ / (w + ω⊕ + k) passes. Δ is bounded
    /// below without an arc cosine: cos θ - cos γ = ∫ sin x dx over [θ, γ] <= Δ max sin, and
    /// the largest sine on [θ, γ] is sin γ = √(1 - cos²γ) when γ <= π/2 (cos γ >= 0), else at
    /// most 1, so Δ >= m / sin γ (or >= m) for the margin m = cos θ - u·s > 0. Near the cone,
    /// where sin γ is small, this jumps several times farther than the margin m itself would.
    /// The result is that of testing every grid point (the jump is shortened by 1e-6 of itself
    /// for rounding; a test checks it against the exhaustive scan); a far satellite costs a few
    /// evaluations instead of one per grid point.
    ///
    /// The sines and cosines come from [`bounded_trig`] (absolute error at most
    /// `bounded_trig::MAX_ERROR`); the margin is lowered by [`TRIG_SLACK`], more than the error
    /// they can make in it, so the test passes wherever the exact one would.
    fn first_entry(&self, from: f64, dtau: f64, steps: usize) -> Option<usize> {
        let theta0 = self.theta0(dtau);
        // Grid steps per unit of angle margin, with a little to spare for rounding.
        let per_margin = 1.0 / ((self.w + EARTH_ROTATION_RAD_S + self.k) * dtau * (1.0 + 1e-6));
        let mut i = 0usize;
        while i <= steps {
            let (margin, dot) = self.margin_at(from + i as f64 * dtau, theta0);
            // (a NaN margin proves nothing: the cone may be entered here)
            if margin <= 0.0 || margin.is_nan() {
                return Some(i);
            }
            // sin γ from a lower bound of cos γ (|u·s - cos γ| < TRIG_SLACK): an upper bound.
            let cos_gamma_low = dot - TRIG_SLACK;
            let sin_gamma_max = if cos_gamma_low > 0.0 {
                (1.0 - cos_gamma_low * cos_gamma_low).sqrt()
            } else {
                1.0
            };
            // Grid points i + 1 .. i + n - 1 are excluded, n = ceil(Δ / (rate dtau)) with Δ >=
            // margin / sin γ (the ceiling by hand: `f64::ceil` is a library call on the
            // baseline x86-64 target).
            let x = margin / sin_gamma_max * per_margin;
            let n = x as usize;
            i += (n + usize::from((n as f64) < x)).max(1);
        }
        None
    }

    /// θ at τ = 0 for a grid of step `dtau`: γc + ω_max dtau + m0 + k dtau.
    fn theta0(&self, dtau: f64) -> f64 {
        self.gamma_cone + self.omega_max * dtau + self.m0 + self.k * dtau
    }

    /// The test of one grid point τ: the margin cos θ(τ) - u(τ)·s(τ) - [`TRIG_SLACK`] (minus
    /// infinity once θ >= π), and u·s. The cone may be entered from τ unless the margin is > 0.
    #[inline]
    fn margin_at(&self, tau: f64, theta0: f64) -> (f64, f64) {
        let theta = theta0 + self.k * tau;
        if theta >= std::f64::consts::PI {
            return (f64::NEG_INFINITY, f64::NAN);
        }
        let (pa, qa) = (&self.p_station, &self.q_station);
        let (sn, c) = bounded_trig::sin_cos(self.w * tau);
        let (se, ce) = bounded_trig::sin_cos(EARTH_ROTATION_RAD_S * tau);
        // u·s = cos(wτ) P·s(τ) + sin(wτ) Q·s(τ)
        let dot = c * (ce * pa[0] + se * pa[1] + pa[2]) + sn * (ce * qa[0] + se * qa[1] + qa[2]);
        (bounded_trig::cos(theta) - dot - TRIG_SLACK, dot)
    }
}

/// Index of the grid point (step `dtau`) at or just before `strict_s`, at most `steps` (0 for a
/// NaN or negative `strict_s`): the point whose test covers `strict_s` from Δτ before it.
fn grid_start(strict_s: f64, dtau: f64, steps: usize) -> usize {
    ((strict_s / dtau) as usize).min(steps)
}

/// The terms [a0, a1, a2] of v·s(τ) = cos(ω⊕τ) a0 + sin(ω⊕τ) a1 + a2 for a vector v and the
/// station direction s(τ) = R3(-ω⊕ τ) ŝ (R3(-α): x' = cos α x - sin α y, y' = sin α x + cos α y).
fn station_terms(v: &[f64; 3], s: &[f64; 3]) -> [f64; 3] {
    [
        v[0] * s[0] + v[1] * s[1],
        v[1] * s[0] - v[0] * s[1],
        v[2] * s[2],
    ]
}

/// What the margin of `PredictedCone::first_entry` is lowered by for the error of
/// [`bounded_trig`]: the dot product u·s is a sum of products of unit-vector components with
/// two sines/cosines each, off by at most 6 `MAX_ERROR` (|p|, |q| and the station direction are
/// unit vectors), and cos θ by `MAX_ERROR`; 10 `MAX_ERROR` covers both and the rounding of the
/// sum (a few 1e-16).
const TRIG_SLACK: f64 = 10.0 * bounded_trig::MAX_ERROR;

/// Root of the secant of g through `neg` and `pos` (their midpoint when g is equal at both).
fn secant_root(neg: &Sample, pos: &Sample) -> f64 {
    if pos.g - neg.g != 0.0 {
        neg.t - neg.g * (pos.t - neg.t) / (pos.g - neg.g)
    } else {
        0.5 * (neg.t + pos.t)
    }
}

/// Acceptance test of the Newton estimate from `cur` (see `Search::refine_root_smooth`): with
/// δ = |g/ġ| and g'' estimated from the change of ġ between `other` and `cur`, the bound
/// 2 (|g''| δ² / (2 |ġ|) + 1e-3 δ) must be at most [`TIME_TOLERANCE_S`] / 4.
fn newton_accepted(cur: &Sample, other: &Sample) -> bool {
    let dt = cur.t - other.t;
    if cur.gdot == 0.0 || dt.abs() < 1e-3 {
        return false;
    }
    let delta = (cur.g / cur.gdot).abs();
    let g2 = ((cur.gdot - other.gdot) / dt).abs();
    let bound = 2.0 * (g2 * delta * delta / (2.0 * cur.gdot.abs()) + 1e-3 * delta);
    delta <= TIME_TOLERANCE_S && bound <= 0.25 * TIME_TOLERANCE_S
}

/// The visibility cone for the predicted skip from sample `s` (e < 0.05): γc for the largest
/// radius the satellite can reach within the skip's horizon (1.5 periods), the sample's radius
/// plus the swing 2 a (e + 0.002) + 5 km (perigee to apogee, plus a change of e of 0.002 from
/// the long-period terms and drag and 5 km for SGP4's short-period radial term, whose amplitude
/// k2 / (2p) is ~1.6 km for a LEO), never above the global r_max.
fn local_cone(s: &Sample, lim: &SearchLimits) -> f64 {
    let rn = (s.r[0] * s.r[0] + s.r[1] * s.r[1] + s.r[2] * s.r[2]).sqrt();
    let r = (rn + lim.radius_swing_km).min(lim.r_max_km);
    if lim.cone_eps <= -89.9f64.to_radians() {
        std::f64::consts::PI
    } else {
        ((lim.station_r_cos_eps_km / r).clamp(-1.0, 1.0)).acos() - lim.cone_eps
    }
}

/// Time (s) before which the elevation cannot reach the lowest mask elevation from the sample:
/// the line of sight turns at most at |v|/ρ, with |v| <= v_max and ρ(τ) >= ρ0 - v_max τ, so
/// in τ it turns by at most ln(ρ0 / (ρ0 - v_max τ)) rad, and the elevation changes by no more
/// than that angle. Reaching a rise Δ takes τ >= (ρ0 / v_max)(1 - e^-Δ). 0 when Δ <= 0.
fn elevation_bound_s(s: &Sample, lim: &SearchLimits) -> f64 {
    let rise_rad = (lim.lowest_mask_deg - s.elevation_deg).to_radians();
    if rise_rad <= 0.0 {
        return 0.0;
    }
    s.range_km / lim.v_max_km_s * (1.0 - (-rise_rad).exp())
}

/// Bound on the difference between SGP4's velocity and the derivative of its positions, km/s
/// (~2e-5 for near-Earth orbits, ~1.5e-3 for SDP4 on an e = 0.7 orbit; see `refine_tca`).
const VELOCITY_ERROR_KM_S: f64 = 2e-3;

/// Time (s) before which the elevation cannot reach the lowest mask elevation, from the sample's
/// elevation and its rate (a second-order bound: it lets a satellite going down or away move on
/// in long steps, where [`elevation_bound_s`] assumes the line of sight may turn up at once).
///
/// With l the unit line of sight and û the station's up, sin ε = l·û, so (sin ε)'' = l''·û. From
/// ρ⃗ = ρ l: l'' = (ρ⃗'' - ρ'' l - 2 ρ' l') / ρ, with |ρ⃗''| <= a_max (the Earth-fixed acceleration),
/// |ρ''| <= v²/ρ + a_max, |ρ'| <= v and |l'| <= v/ρ (v <= v_max), so
/// |l''| <= L(ρ) = (2 a_max + 3 v_max² / ρ) / ρ. Then
/// sin ε(τ) <= sin ε0 + d τ + L τ² / 2 while ρ >= ρ_min, where d = cos ε0 ε'0 + δv / ρ0 (the rate
/// from SGP4's velocity, plus its difference δv from the derivative of the positions,
/// [`VELOCITY_ERROR_KM_S`]). The first τ at which that bound reaches sin ε_low is solved with L at
/// ρ0, then again with L at ρ0 - v_max τ of that first root: that L is larger, so the second root
/// is smaller and the range stays above ρ0 - v_max τ until it. 0 when ε0 >= ε_low.
fn curvature_bound_s(s: &Sample, lim: &SearchLimits) -> f64 {
    let (sin_e, cos_e) = bounded_trig::sin_cos(s.elevation_deg.to_radians());
    // (the error of the bounded sine, 1e-15, is far below the 2e-3 km/s velocity allowance)
    let rise = lim.sin_lowest_mask - sin_e;
    if rise <= 0.0 {
        return 0.0;
    }
    let rho0 = s.range_km;
    let d = cos_e * s.elevation_rate_deg_s.to_radians() + VELOCITY_ERROR_KM_S / rho0;
    let v = lim.v_max_km_s;
    let curvature = |rho: f64| (2.0 * lim.a_max_km_s2 + 3.0 * v * v / rho) / rho;
    let root = |l: f64| parabola_root_s(d, l, rise);
    let first = root(curvature(rho0));
    let rho_min = rho0 - v * first;
    if rho_min.is_nan() || rho_min <= 0.0 {
        return 0.0;
    }
    root(curvature(rho_min))
}

/// The positive root τ of d τ + l τ² / 2 = rise (l > 0, rise > 0), for each sign of d in its
/// form without cancellation: for d < 0 the form 2 rise / (d + √(d² + 2 l rise)) divides by a
/// difference of nearly equal terms and returns a root up to several times too late when
/// 2 l rise << d².
fn parabola_root_s(d: f64, l: f64, rise: f64) -> f64 {
    let s = (d * d + 2.0 * l * rise).sqrt();
    if d >= 0.0 {
        2.0 * rise / (d + s)
    } else {
        (s - d) / l
    }
}

/// Cubic Hermite interpolation on [t0, t1] of values y and slopes m: the polynomial's
/// coefficients in s = (t - t0) / (t1 - t0): p(s) = c0 + c1 s + c2 s² + c3 s³.
fn hermite(t0: f64, y0: f64, m0: f64, t1: f64, y1: f64, m1: f64) -> [f64; 4] {
    let h = t1 - t0;
    let (d0, d1) = (h * m0, h * m1);
    [
        y0,
        d0,
        3.0 * (y1 - y0) - 2.0 * d0 - d1,
        2.0 * (y0 - y1) + d0 + d1,
    ]
}

/// Root of the cubic Hermite interpolant of g through `a` and `b` (g of opposite signs): Newton
/// on the polynomial from the secant root, inside the bracket; `None` if it does not converge.
fn hermite_root(a: &Sample, b: &Sample) -> Option<f64> {
    let c = hermite(a.t, a.g, a.gdot, b.t, b.g, b.gdot);
    let mut s = if b.g != a.g { a.g / (a.g - b.g) } else { 0.5 };
    for _ in 0..12 {
        let p = c[0] + s * (c[1] + s * (c[2] + s * c[3]));
        let dp = c[1] + s * (2.0 * c[2] + s * 3.0 * c[3]);
        if dp == 0.0 {
            return None;
        }
        let next = s - p / dp;
        if !(0.0..=1.0).contains(&next) {
            return None;
        }
        if (next - s).abs() < 1e-12 {
            return Some(a.t + next * (b.t - a.t));
        }
        s = next;
    }
    Some(a.t + s * (b.t - a.t))
}

/// Maximum of the cubic Hermite interpolant of elevation (values and rates) through `up`
/// (rate > 0) and `down` (rate <= 0): the zero of its derivative where the second derivative
/// is negative, inside the bracket; `None` if there is none.
fn hermite_max(up: &Sample, down: &Sample) -> Option<f64> {
    let c = hermite(
        up.t,
        up.elevation_deg,
        up.elevation_rate_deg_s,
        down.t,
        down.elevation_deg,
        down.elevation_rate_deg_s,
    );
    // p'(s) = c1 + 2 c2 s + 3 c3 s²
    let (qa, qb, qc) = (3.0 * c[3], 2.0 * c[2], c[1]);
    let s = if qa.abs() < 1e-14 * (qb.abs() + qc.abs()) {
        (qb != 0.0).then(|| -qc / qb)?
    } else {
        let disc = qb * qb - 4.0 * qa * qc;
        if disc < 0.0 {
            return None;
        }
        let sq = disc.sqrt();
        // Of the two roots, the one where p'' = 2 qa s + qb is negative (a maximum).
        let r1 = (-qb + sq) / (2.0 * qa);
        let r2 = (-qb - sq) / (2.0 * qa);
        if 2.0 * qa * r1 + qb < 0.0 {
            r1
        } else {
            r2
        }
    };
    (0.0..=1.0)
        .contains(&s)
        .then_some(up.t + s * (down.t - up.t))
}

fn better(a: Sample, b: Sample) -> Sample {
    if b.elevation_deg > a.elevation_deg {
        b
    } else {
        a
    }
}

/// Find the passes of `prop` over `obs` above `mask` between `start` and `end`.
pub fn find_passes(
    prop: &Propagator,
    obs: &Observer,
    mask: &HorizonMask,
    start: DateTime<Utc>,
    end: DateTime<Utc>,
) -> PassSearch {
    let before = prop.propagations();
    let mut passes = Vec::new();
    let stopped = search(prop, obs, mask, start, end, &mut passes).err();
    PassSearch {
        passes,
        stopped,
        propagations: prop.propagations() - before,
    }
}

/// Constants of one search: the window length and the bounds of method steps 1 and 3.
#[derive(Debug, Clone, Copy)]
struct SearchLimits {
    /// Window length, s.
    total_s: f64,
    /// γc: no point above the mask lies outside this geocentric angle, rad.
    gamma_cone: f64,
    /// ω_max: bound on the turning rate of the satellite direction, rad/s.
    omega_max: f64,
    /// Eccentricity, clamped into 0..0.999.
    e: f64,
    /// Largest step of the walk inside a pass, s.
    cap_s: f64,
    /// Horizon of the predicted skip, s.
    horizon_s: f64,
    /// Largest predicted step of the walk inside a pass (`Search::walk_step`), s.
    predicted_cap_s: f64,
    /// Bound on the satellite's Earth-fixed speed, km/s: vis-viva at the lowest perigee for the
    /// largest semi-major axis, plus ω⊕ r_max.
    v_max_km_s: f64,
    /// Lowest mask elevation, deg, and its sine.
    lowest_mask_deg: f64,
    sin_lowest_mask: f64,
    /// Bound on the satellite's Earth-fixed acceleration, km/s²: 1.05 times gravity at the
    /// lowest perigee (the 5 % covers J2, about 0.2 %, and SGP4's other terms) plus the Coriolis
    /// (2 ω⊕ v_max) and centrifugal (ω⊕² r_max) terms.
    a_max_km_s2: f64,
    /// The cone's elevation ε (rad) and R cos ε, R the station's geocentric radius (km).
    cone_eps: f64,
    station_r_cos_eps_km: f64,
    /// r_max (km) and the bound on the radius swing over the predicted skip's horizon,
    /// 2 a (e + 0.002) + 5 km (see `Search::local_cone`).
    r_max_km: f64,
    radius_swing_km: f64,
}

/// Unit vector of the station's geocentric direction, its geocentric radius (km) and δ, the
/// angle between geodetic up and that direction (rad).
fn station_direction(obs: &Observer) -> ([f64; 3], f64, f64) {
    let p = obs.position_km();
    let station_r = (p[0] * p[0] + p[1] * p[1] + p[2] * p[2]).sqrt();
    let obs_unit = [p[0] / station_r, p[1] / station_r, p[2] / station_r];
    let up = obs.up();
    // δ: angle between geodetic up and the geocentric direction of the station.
    let delta = (up[0] * obs_unit[0] + up[1] * obs_unit[1] + up[2] * obs_unit[2])
        .clamp(-1.0, 1.0)
        .acos();
    (obs_unit, station_r, delta)
}

/// The visibility cone γc, the rate bound ω_max and the step limits (method step 1) for a
/// station at geocentric radius `station_r` (km) whose vertical is off by `delta` (rad).
fn search_limits(
    prop: &Propagator,
    mask: &HorizonMask,
    station_r: f64,
    delta: f64,
    total_s: f64,
) -> SearchLimits {
    let a = prop.semi_major_axis_km();
    let e = prop.eccentricity().clamp(0.0, 0.999);
    let r_max = a * (1.0 + e) * 1.01 + 20.0;
    let a_max = a * 1.005 + 10.0;
    // The limits take the epoch's orbit: they hold while the perigee stays within 30 km of the
    // epoch's (ω_max's 2 % margin covers about 70 km of a LEO's decay, a_max's 5 % about 140 km);
    // a window far from the epoch, where drag may lower it further, is refused unless
    // `--allow-stale-elements` (`plan::inputs`), and is then the user's stated risk.
    let r_p_min = (a * (1.0 - e) - 30.0).max(6000.0);
    // ω_max = 1.02 h / r_p² + ω⊕, h = sqrt(μ a (1 - e²))
    let omega_max = 1.02 * (WGS72_MU_KM3_S2 * a_max * (1.0 - e * e)).sqrt() / (r_p_min * r_p_min)
        + EARTH_ROTATION_RAD_S;
    // γc = acos(R cos ε / r_max) - ε for ε = lowest mask - δ - 0.2°
    let eps = mask.lowest_limit_deg().to_radians() - delta - 0.2f64.to_radians();
    let gamma_cone = if eps <= -89.9f64.to_radians() {
        std::f64::consts::PI
    } else {
        ((station_r * eps.cos() / r_max).clamp(-1.0, 1.0)).acos() - eps
    };
    // v² = μ (2 / r_p - 1 / a) at the lowest perigee and the largest semi-major axis
    let v_max_km_s =
        (WGS72_MU_KM3_S2 * (2.0 / r_p_min - 1.0 / a_max)).sqrt() + EARTH_ROTATION_RAD_S * r_max;
    SearchLimits {
        total_s,
        gamma_cone,
        omega_max,
        e,
        cap_s: (prop.period_minutes() * 60.0 / 32.0).clamp(60.0, 3600.0),
        horizon_s: 1.5 * prop.period_minutes() * 60.0,
        predicted_cap_s: prop.period_minutes() * 60.0 / 6.0,
        v_max_km_s,
        lowest_mask_deg: mask.lowest_limit_deg(),
        sin_lowest_mask: mask.lowest_limit_deg().to_radians().sin(),
        a_max_km_s2: 1.05 * WGS72_MU_KM3_S2 / (r_p_min * r_p_min)
            + 2.0 * EARTH_ROTATION_RAD_S * v_max_km_s
            + EARTH_ROTATION_RAD_S * EARTH_ROTATION_RAD_S * r_max,
        cone_eps: eps,
        station_r_cos_eps_km: station_r * eps.cos(),
        r_max_km: r_max,
        radius_swing_km: 2.0 * a * (e + 0.002) + 5.0,
    }
}

/// Of the two bracket samples `neg`, `pos`, the one nearer in time to `root`.
fn nearer(root: f64, neg: Sample, pos: Sample) -> Sample {
    if (root - neg.t).abs() < (root - pos.t).abs() {
        neg
    } else {
        pos
    }
}

/// How the walk from AOS ended.
struct LosWalk {
    /// LOS, s since the window start (the window end if the pass is cut).
    los_t: f64,
    /// Sample nearest the LOS.
    los_s: Sample,
    /// First sample below the mask after the LOS (the end sample if the pass is cut).
    after_los: Sample,
    /// The pass is still on at the window end.
    ends_after: bool,
    /// Highest sample seen during the walk.
    best: Sample,
}

impl Search<'_> {
    /// Step below the mask (method steps 1 and 2): skip ahead outside the visibility cone, else
    /// sample at [`FLOOR_STEP_S`] (shortened to land just past the AOS that a Newton step on a
    /// rising smooth g predicts, so that the AOS is refined from a near sample). Both are
    /// lengthened to the time the elevation needs to reach the lowest mask elevation at the
    /// largest angular rate of the line of sight (see `elevation_bound_s`). Inside the cone the
    /// predicted skip is tested from where those strict bounds end, and taken when it reaches
    /// past them (a satellite going down after its LOS or past a near miss).
    fn step_below_mask(&self, s: &Sample, lim: &SearchLimits) -> f64 {
        let gamma = s.gamma();
        let local = if lim.e < 0.05 {
            local_cone(s, lim)
        } else {
            lim.gamma_cone
        };
        let strict = elevation_bound_s(s, lim).max(curvature_bound_s(s, lim));
        let predicted = if lim.e < 0.05 {
            self.predicted_skip(s, local, lim.omega_max, lim.e, lim.horizon_s, strict)
        } else {
            0.0
        };
        let step = if gamma > local {
            let linear = ((gamma - lim.gamma_cone) / lim.omega_max).max(0.0);
            linear.max(predicted).max(FLOOR_STEP_S)
        } else if predicted > strict {
            // Inside the cone, but out of it (predicted) before the strict bounds run out: a
            // satellite going down after a LOS or past a near miss.
            predicted.max(FLOOR_STEP_S)
        } else if !self.azimuth_mask && s.gdot > 0.0 {
            // Newton: t - g/ġ; 5 % + 0.2 s past it.
            FLOOR_STEP_S.min(-s.g / s.gdot * 1.05 + 0.2)
        } else {
            FLOOR_STEP_S
        };
        step.max(strict).max(TIME_TOLERANCE_S)
    }

    /// AOS of the pass entered at sample `s` (g > 0) from `prev` (g <= 0): (AOS time, sample
    /// nearest the AOS, first sample above the mask). Without `prev` the pass began before the
    /// window: AOS = window start.
    fn refine_aos(
        &self,
        prev: Option<Sample>,
        s: Sample,
    ) -> Result<(f64, Sample, Sample), PropagationError> {
        Ok(match prev {
            Some(pr) => {
                let (root, neg, pos) = self.refine_root(pr, s)?;
                (root, nearer(root, neg, pos), pos)
            }
            None => (0.0, s, s),
        })
    }

    /// Step of the walk inside a pass from `cur` (`last` is the sample before, `aos_t` the AOS,
    /// `tca` the refined maximum once passed). Predicted steps (`predicted_walk`: near-Earth,
    /// e < 0.05, mask without azimuth dependence, where the elevation has one maximum per
    /// pass): the first step after the AOS aims 10 % past the closest approach of a straight
    /// line at the sample's velocity (τ = -ρ ρ̇ / |v|²), the step after the maximum 3 % + 1 s past
    /// the AOS mirrored about it; both at most a sixth of the period. Otherwise, or after those:
    /// the cap, cut to a Newton prediction of the LOS when g falls and to a prediction of the
    /// elevation maximum when the elevation rate slows.
    #[inline]
    fn walk_step(
        &self,
        cur: &Sample,
        last: Option<Sample>,
        aos_t: Option<f64>,
        tca: Option<Sample>,
        lim: &SearchLimits,
    ) -> f64 {
        if self.predicted_walk {
            match (aos_t, tca, last) {
                (Some(aos_t), Some(tca), _) => {
                    let target = tca.t + (tca.t - aos_t) * 1.03 + 1.0;
                    if target > cur.t + TIME_TOLERANCE_S {
                        return (target - cur.t).min(lim.predicted_cap_s);
                    }
                }
                (Some(_), None, None) if cur.elevation_rate_deg_s > 0.0 => {
                    let v = cur.v;
                    let v2 = v[0] * v[0] + v[1] * v[1] + v[2] * v[2];
                    let tau = -cur.range_km * cur.range_rate_km_s / v2;
                    if tau > 0.0 {
                        return (tau * 1.1 + 1.0).clamp(TIME_TOLERANCE_S, lim.predicted_cap_s);
                    }
                }
                _ => {}
            }
        }
        let mut dt = lim.cap_s;
        if cur.gdot < 0.0 {
            dt = dt.min(-cur.g / cur.gdot * 1.05 + TIME_TOLERANCE_S);
        }
        let rate = cur.elevation_rate_deg_s;
        if rate > 0.0 {
            if let Some(l) = last {
                let acc = (rate - l.elevation_rate_deg_s) / (cur.t - l.t);
                if acc < 0.0 {
                    dt = dt.min(-rate / acc * 1.2 + TIME_TOLERANCE_S);
                }
            }
        }
        if last.is_none() && aos_t.is_some() {
            // First step after AOS: the time to TCA is unknown; a quarter of the cap
            // starts the curvature estimate of the elevation rate early.
            dt = dt.min(0.25 * lim.cap_s);
        }
        dt.max(TIME_TOLERANCE_S)
    }

    /// Walk from `first_in` to the LOS (or the window end), refining elevation maxima on
    /// the way.
    fn walk_to_los(
        &self,
        first_in: Sample,
        aos_t: Option<f64>,
        lim: &SearchLimits,
    ) -> Result<LosWalk, PropagationError> {
        let mut best = first_in;
        let mut cur = first_in;
        let mut last: Option<Sample> = None;
        let mut tca: Option<Sample> = None;
        let rising = |s: &Sample| s.elevation_rate_deg_s > 0.0;
        let (los_t, los_s, after_los, ends_after) = loop {
            let dt = self.walk_step(&cur, last, aos_t, tca, lim);
            let tn = (cur.t + dt).min(lim.total_s);
            let nxt = self.eval(tn)?;
            if nxt.g <= 0.0 {
                let (root, neg, pos) = self.refine_root(cur, nxt)?;
                // A maximum between cur and the LOS bracket end.
                if rising(&cur) && !rising(&pos) && pos.t > cur.t {
                    best = better(best, self.refine_tca(cur, pos)?);
                }
                best = better(best, pos);
                break (root, nearer(root, neg, pos), neg, false);
            }
            if rising(&cur) && !rising(&nxt) {
                let m = self.refine_tca(cur, nxt)?;
                tca = Some(tca.map_or(m, |t| better(t, m)));
                best = better(best, m);
            }
            best = better(best, nxt);
            if tn >= lim.total_s {
                break (lim.total_s, nxt, nxt, true);
            }
            last = Some(cur);
            cur = nxt;
        };
        Ok(LosWalk {
            los_t,
            los_s,
            after_los,
            ends_after,
            best: better(best, cur),
        })
    }

    /// The elevation maximum outside the window of a pass whose highest point inside lies at a
    /// window edge (`edge`: elevation falling there at the start, rising at the end): walk away
    /// from the window in steps of the cap until the elevation rate changes sign, then refine.
    /// `None` after one orbital period or a propagation error (the pass keeps its in-window TCA;
    /// an error outside the window does not stop the search inside it).
    fn tca_beyond(&self, edge: Sample, lim: &SearchLimits) -> Option<Sample> {
        let dir = if edge.elevation_rate_deg_s < 0.0 {
            -1.0
        } else {
            1.0
        };
        let steps = (lim.horizon_s / 1.5 / lim.cap_s).ceil() as usize + 1;
        let mut cur = edge;
        for _ in 0..steps {
            let nxt = self.eval(cur.t + dir * lim.cap_s).ok()?;
            if dir * nxt.elevation_rate_deg_s <= 0.0 {
                let (up, down) = if dir > 0.0 { (cur, nxt) } else { (nxt, cur) };
                return self.refine_tca(up, down).ok();
            }
            cur = nxt;
        }
        None
    }

    /// The pass entered at sample `s` (g > 0) from `prev`: AOS, walk to LOS, TCA, smallest
    /// range. Returns the pass and the sample to resume the search from.
    fn assemble_pass(
        &self,
        prev: Option<Sample>,
        s: Sample,
        lim: &SearchLimits,
    ) -> Result<(Pass, Sample), PropagationError> {
        let (aos_t, aos_s, first_in) = self.refine_aos(prev, s)?;
        let starts_before = prev.is_none();
        let walk = self.walk_to_los(first_in, (!starts_before).then_some(aos_t), lim)?;
        let tca = if starts_before {
            better(walk.best, s)
        } else {
            walk.best
        };
        let min_range_km = self.min_range_km(aos_s, tca, walk.los_s)?;
        let rate = tca.elevation_rate_deg_s;
        let beyond = if (starts_before && rate < 0.0) || (walk.ends_after && rate > 0.0) {
            self.tca_beyond(tca, lim)
        } else {
            None
        };
        let pass = Pass {
            aos: add_seconds(&self.start, aos_t),
            tca: add_seconds(&self.start, tca.t),
            full_tca: add_seconds(&self.start, beyond.map_or(tca.t, |b| b.t)),
            los: add_seconds(&self.start, walk.los_t),
            max_elevation_deg: tca.elevation_deg,
            aos_azimuth_deg: aos_s.look(self.obs).azimuth_deg,
            tca_azimuth_deg: tca.look(self.obs).azimuth_deg,
            los_azimuth_deg: walk.los_s.look(self.obs).azimuth_deg,
            min_range_km,
            starts_before_window: starts_before,
            ends_after_window: walk.ends_after,
        };
        Ok((pass, walk.after_los))
    }
}

/// The pass search loop: below the mask, skip or sample (method steps 1-2); on entering a
/// pass, assemble it (step 3) and resume after its LOS. Passes found are pushed to `passes`.
fn search(
    prop: &Propagator,
    obs: &Observer,
    mask: &HorizonMask,
    start: DateTime<Utc>,
    end: DateTime<Utc>,
    passes: &mut Vec<Pass>,
) -> Result<(), PropagationError> {
    let total = seconds_between(&start, &end);
    if total <= 0.0 {
        return Ok(());
    }
    let (obs_unit, station_r, delta) = station_direction(obs);
    let lim = search_limits(prop, mask, station_r, delta, total);
    let azimuth_mask = mask.needs_azimuth();
    let srch = Search {
        prop,
        obs,
        mask,
        start,
        obs_unit,
        epoch_offset_min: seconds_between(&prop.epoch(), &start) / 60.0,
        start_days_j2000: days_since_j2000(&start),
        azimuth_mask,
        flat_limit_deg: mask.lowest_limit_deg(),
        positions_for_tca: prop.is_deep_space(),
        predicted_walk: !azimuth_mask && !prop.is_deep_space() && lim.e < 0.05,
    };
    let mut s = srch.eval(0.0)?;
    let mut prev: Option<Sample> = None;
    loop {
        if s.g > 0.0 {
            let (pass, after_los) = srch.assemble_pass(prev, s, &lim)?;
            let ends_after = pass.ends_after_window;
            passes.push(pass);
            if ends_after {
                return Ok(());
            }
            s = after_los;
            prev = None;
            continue;
        }
        // ---- below the mask ----
        if s.t >= total {
            return Ok(());
        }
        let tn = (s.t + srch.step_below_mask(&s, &lim)).min(total);
        prev = Some(s);
        s = srch.eval(tn)?;
    }
}

/// Look angles at a fixed step: an iterator over `(time, Look)` from `start` to `end`
/// inclusive (the last point is `end` even off the step grid). Stops after the first error.
pub fn track<'a>(
    prop: &'a Propagator,
    obs: &'a Observer,
    start: DateTime<Utc>,
    end: DateTime<Utc>,
    step_s: f64,
) -> Track<'a> {
    let total = seconds_between(&start, &end).max(0.0);
    let step_s = if step_s.is_finite() && step_s > 0.0 {
        step_s
    } else {
        total.max(1.0)
    };
    Track {
        prop,
        obs,
        start,
        total,
        step_s,
        index: 0,
        done: false,
    }
}

/// Iterator returned by [`track`]; allocates nothing per step.
#[derive(Debug)]
pub struct Track<'a> {
    prop: &'a Propagator,
    obs: &'a Observer,
    start: DateTime<Utc>,
    total: f64,
    step_s: f64,
    index: u64,
    done: bool,
}

impl Iterator for Track<'_> {
    type Item = Result<(DateTime<Utc>, Look), PropagationError>;

    fn next(&mut self) -> Option<Self::Item> {
        if self.done {
            return None;
        }
        let mut t = self.index as f64 * self.step_s;
        if t >= self.total - 1e-6 {
            t = self.total;
            self.done = true;
        }
        self.index += 1;
        let time = add_seconds(&self.start, t);
        Some(match self.prop.ecef_at(&time) {
            Ok(s) => Ok((time, self.obs.look(&s))),
            Err(e) => {
                self.done = true;
                Err(e)
            }
        })
    }
}

#[cfg(test)]
mod tests {
    use super::{grid_start, parabola_root_s, station_terms, PredictedCone, EARTH_ROTATION_RAD_S};

    /// The predicted skip's grid starts at the point at or just before the end of the strict
    /// bounds, so no time is left between them (first principles): τ_first <= strict_s <
    /// τ_first + Δτ, clamped to the horizon's last point, and 0 for NaN, zero or negative.
    #[test]
    fn predicted_grid_starts_where_the_strict_bounds_end() {
        let (dtau, steps) = (3.0, 100);
        for strict_s in [0.0, 1e-9, 2.999, 3.0, 3.001, 41.7, 60.0, 299.9] {
            let first = grid_start(strict_s, dtau, steps);
            assert!(first as f64 * dtau <= strict_s, "{strict_s}: {first}");
            assert!((first + 1) as f64 * dtau > strict_s, "{strict_s}: {first}");
        }
        assert_eq!(grid_start(300.0, dtau, steps), steps);
        assert_eq!(grid_start(1e9, dtau, steps), steps);
        assert_eq!(grid_start(f64::INFINITY, dtau, steps), steps);
        assert_eq!(grid_start(f64::NAN, dtau, steps), 0);
        assert_eq!(grid_start(-5.0, dtau, steps), 0);
    }

    /// The jumps of `PredictedCone::first_entry` skip only grid points that would fail to
    /// trigger: its answer is the first grid point whose own test triggers, found by testing
    /// every point (the exhaustive scan is the reference; first principles). Random circular
    /// LEO-like orbits (w 0.8-1.2e-3 rad/s), station directions, cones of 10-45 deg, margins
    /// growing as for e up to 0.05, on the search's 3 s grid and on coarser ones.
    #[test]
    fn predicted_cone_jumps_equal_the_exhaustive_scan() {
        let mut x = 0x2545_f491_4f6c_dd1du64;
        let mut unit = move || {
            x ^= x << 13;
            x ^= x >> 7;
            x ^= x << 17;
            (x >> 11) as f64 / (1u64 << 53) as f64
        };
        let normalize = |v: [f64; 3]| {
            let n = (v[0] * v[0] + v[1] * v[1] + v[2] * v[2]).sqrt();
            [v[0] / n, v[1] / n, v[2] / n]
        };
        let (mut triggered, mut jumped) = (0, 0);
        for case in 0..3000 {
            let mut vec3 =
                || normalize([2.0 * unit() - 1.0, 2.0 * unit() - 1.0, 2.0 * unit() - 1.0]);
            let (p, a, station) = (vec3(), vec3(), vec3());
            // h ⟂ p, q = h × p
            let d = a[0] * p[0] + a[1] * p[1] + a[2] * p[2];
            let h = normalize([a[0] - d * p[0], a[1] - d * p[1], a[2] - d * p[2]]);
            let q = [
                h[1] * p[2] - h[2] * p[1],
                h[2] * p[0] - h[0] * p[2],
                h[0] * p[1] - h[1] * p[0],
            ];
            let w = 0.8e-3 + 0.4e-3 * unit();
            let e = 0.05 * unit();
            let cone = PredictedCone {
                p_station: station_terms(&p, &station),
                q_station: station_terms(&q, &station),
                w,
                gamma_cone: (10.0 + 35.0 * unit()).to_radians(),
                m0: 0.5f64.to_radians(),
                k: (4.0 * e + 0.01) * w,
                omega_max: w + EARTH_ROTATION_RAD_S,
            };
            let dtau = [3.0, 3.0, 10.0, 30.0][case % 4];
            let steps = (9000.0 / dtau) as usize;
            let theta0 = cone.theta0(dtau);
            let fires = |i: usize| {
                let (margin, _) = cone.margin_at(i as f64 * dtau, theta0);
                margin <= 0.0 || margin.is_nan()
            };
            let scan = (0..=steps).find(|&i| fires(i));
            assert_eq!(cone.first_entry(0.0, dtau, steps), scan, "case {case}");
            // and from a later grid point, as after the strict bounds
            let first = case % 97;
            let later = (first..=steps).find(|&i| fires(i));
            assert_eq!(
                cone.first_entry(first as f64 * dtau, dtau, steps - first)
                    .map(|j| first + j),
                later,
                "case {case} from {first}"
            );
            triggered += usize::from(scan.is_some_and(|i| i > 0));
            jumped += usize::from(scan.is_none());
        }
        // the cases reach both ends: an entry after a jump, and no entry over the horizon
        assert!(triggered > 300 && jumped > 30, "{triggered} {jumped}");
    }

    /// The root satisfies its parabola to rounding, whatever the sign and size of d (the
    /// curvature bound's time is only a bound if it is the parabola's own root): first
    /// principles, with cases near the cancellation of the other form (a sample a few ulp below
    /// the mask while the satellite goes down).
    #[test]
    fn parabola_root_solves_its_parabola() {
        // L of a LEO at 1250 and 2300 km (v_max 8.232 km/s, a_max 0.01044 km/s^2)
        let l = |rho: f64| (2.0 * 0.01044 + 3.0 * 8.232 * 8.232 / rho) / rho;
        let cases = [
            (-1.67e-3, l(1250.0), 3.3e-18),
            (-1.08e-3, l(2300.0), 1.39e-17),
            (-2e-2, l(1250.0), 1e-16),
            (-1.67e-3, l(1250.0), 0.05),
            (0.0, l(1250.0), 1e-3),
            (1.67e-3, l(1250.0), 3.3e-18),
            (1.67e-3, l(1250.0), 0.05),
        ];
        for (d, l, rise) in cases {
            let t = parabola_root_s(d, l, rise);
            assert!(t > 0.0 && t.is_finite(), "{d} {l} {rise}: {t}");
            let residual = d * t + l * t * t / 2.0 - rise;
            let scale = (d * t).abs() + l * t * t / 2.0 + rise;
            assert!(
                residual.abs() <= 1e-12 * scale,
                "{d} {l} {rise}: {t} ({residual})"
            );
        }
    }
}

//! Antenna noise at a boresight elevation AND azimuth for a station whose terrain rises above the
//! geometric horizon (a horizon mask with points above 0 deg): the direct integral.
//!
//! Model. The terrain is the station's horizon profile `H(az)` (the `horizon_mask` points,
//! interpolated in azimuth by [`crate::geometry::HorizonMask`]'s rule, taken as 0 where it lies
//! below the geometric horizon: a depressed horizon keeps the ground at 0 deg, as the 1-D table
//! does). Every direction below `H(az)` sees terrain; above it, sky. The antenna temperature is
//!
//! `Ta(e0, a0) = Ta_flat(e0) + (1 / 4 pi) ∫_R G(psi) [Tt - Tsky(el)] dOmega`,
//!
//! `Ta_flat` the integral of [`super::antenna_table`] (ground below 0 deg, sky above), R the
//! directions `0 <= el < H(az)` and psi their angle from the boresight
//! (`cos psi = sin el sin e0 + cos el cos e0 cos(az - a0)`). The terrain's brightness is that of
//! the flat ground seen at grazing incidence, `Tt = e Tg + (1 - e) Tsky(0 deg)` (the same
//! emissivity model as the ground, [`super::antenna_table::GroundSpec`], with the reflected sky
//! taken at the horizon; e = 1 makes the terrain a blackbody at Tg), so the brightness is continuous
//! across 0 deg where the terrain stands. The Tt part adds to the ground term, the hidden sky is
//! taken off the sky term.
//!
//! Quadrature over R in the station's (el, az): Gauss-Legendre on azimuth intervals cut at every
//! profile vertex, where the profile crosses 0 deg, on a geometric ladder around the
//! boresight's azimuth (rungs [`LADDER_RATIO`] apart, starting at a quarter of the half-power
//! beamwidth, or at half the distance from the boresight to the terrain band when that is
//! larger), and where the column's integrand changes form in azimuth: the azimuths where the
//! circle psi = join angle (the reference pattern's step from the Gaussian to the scaled
//! envelope) is tangent to a meridian, crosses 0 deg or crosses the terrain's edge. At each
//! azimuth node, on elevation intervals of `[0, H(az)]` cut on the same kind of ladder around the
//! elevation closest to the boresight and where the join circle crosses the column. The terrain
//! edge `el = H(az)` is so met exactly at every azimuth node. 8-point rules within
//! [`NEAR_RUNGS`] ladder starts of the boresight's azimuth or elevation, 4-point ones further out.
//!
//! Without the azimuth cuts at the join circle, the column integral's jump at the join made the
//! azimuth rule converge slowly: the quadrature used before 2026-12-04 (rungs twice apart,
//! 8-point rules within eight ladder starts, no such cuts) was 0.07-0.09 K off a converged
//! integral (3.7 m dish at X band, beside the profile's peak); today's rungs without the cuts
//! would be 0.36 K off. With them, the integral is within 0.03 K of the same quadrature refined
//! (rungs sqrt(2) apart, 8-point rules throughout; unit test
//! `refining_the_quadrature_moves_the_integral_little`, which checks all three).
//!
//! Use: this is the direct integral (0.05-0.08 ms, `benches/noise.rs`), the reference of the
//! table over elevation and azimuth the plan's steps read ([`super::terrain_table`]). A first
//! table over (elevation above the terrain, azimuth) alone, 36 azimuth columns, needed
//! 8,000-22,000 of these integrals per station and weather case and missed a 0.25 K bound by up
//! to 5 K next to the profile's highest vertex; the table now carries the main beam's crossing of
//! the edge in raised-horizon tables and takes the direct integral only for the far terrain.

use super::antenna_table::{integrate_many, AntennaNoise, Brightness, ProfileNode, Rings};
use super::pattern::{NoisePattern, GL4, GL8};
use crate::geometry::bounded_trig as trig;
use crate::geometry::HorizonMask;

/// Ratio of successive rungs of the quadrature's ladders around the boresight.
pub(crate) const LADDER_RATIO: f64 = 3.0;

/// Intervals within this many ladder starts of the boresight take the 8-point rule.
pub(crate) const NEAR_RUNGS: f64 = 2.0;

/// Samples per azimuth interval in the search for the join circle's crossings of the terrain edge.
const EDGE_CROSSING_SAMPLES: usize = 8;

/// Most profile kinks taken as azimuth cuts; a denser profile is cut every 360/MAX_KINKS deg.
pub(crate) const MAX_KINKS: usize = 72;

/// The terrain profile of a station for noise: `H(az) = max(0, profile)`, or `None` when the
/// profile never rises above the geometric horizon (the 1-D table is then exact).
pub fn terrain_profile(points: &[[f64; 2]]) -> Option<HorizonMask> {
    if !points.iter().any(|p| p[1] > 0.0) {
        return None;
    }
    HorizonMask::new(0.0, points.to_vec()).ok()
}

/// What the quadrature needs of the pattern and the terrain, prepared once.
pub(crate) struct TerrainIntegrator<'a> {
    pattern: &'a NoisePattern,
    rings: Rings,
    terrain: &'a HorizonMask,
    /// Base of the ladders, deg: a quarter of the half-power beamwidth.
    scale_deg: f64,
    /// The join angle of the reference pattern (a step in the gain), rad, and its cosine.
    join_rad: Option<f64>,
    cos_join: f64,
    /// Azimuths where the profile has a kink (vertices and zero crossings), deg.
    pub(crate) kinks_deg: Vec<f64>,
    highest_deg: f64,
    /// [`LADDER_RATIO`] and [`NEAR_RUNGS`]; the tests refine them.
    ladder_ratio: f64,
    near_rungs: f64,
    /// Cut azimuth at the join circle (off only in the test that shows why it is needed).
    join_cuts: bool,
}

impl<'a> TerrainIntegrator<'a> {
    pub(crate) fn new(pattern: &'a NoisePattern, terrain: &'a HorizonMask) -> Self {
        let pts = terrain.points();
        let mut kinks_deg: Vec<f64> = pts.iter().map(|p| p[0]).collect();
        for (i, a) in pts.iter().enumerate() {
            let b = pts[(i + 1) % pts.len()];
            let span = (b[0] - a[0]).rem_euclid(360.0);
            if a[1] * b[1] < 0.0 && span > 0.0 {
                kinks_deg.push(a[0] + span * a[1] / (a[1] - b[1]));
            }
        }
        if kinks_deg.len() > MAX_KINKS {
            // A dense profile: uniform azimuth intervals instead of one per vertex.
            kinks_deg = (0..MAX_KINKS)
                .map(|i| 360.0 * i as f64 / MAX_KINKS as f64)
                .collect();
        }
        let highest_deg = pts.iter().map(|p| p[1]).fold(0.0, f64::max);
        Self {
            pattern,
            rings: Rings::of(pattern),
            terrain,
            scale_deg: (0.5 * half_power_half_width_deg(pattern)).max(1e-3),
            join_rad: pattern.join_deg().map(f64::to_radians),
            cos_join: pattern.join_deg().map_or(1.0, |j| j.to_radians().cos()),
            kinks_deg,
            highest_deg,
            ladder_ratio: LADDER_RATIO,
            near_rungs: NEAR_RUNGS,
            join_cuts: true,
        }
    }

    /// The antenna noise at boresight (`e0`, `a0`) deg: the flat integral plus the terrain's.
    pub(crate) fn at(&self, b: &Brightness, e0: f64, a0: f64) -> AntennaNoise {
        let mut out = [AntennaNoise::default()];
        self.at_many(std::slice::from_ref(&b), e0, a0, &mut out);
        out[0]
    }

    /// [`Self::at`] for several brightnesses (weather cases) at once, `out[j]` for `bs[j]`, each
    /// value for value what [`Self::at`] gives it: the quadrature's nodes, directions and gains
    /// are worked out once.
    pub(crate) fn at_many(&self, bs: &[&Brightness], e0: f64, a0: f64, out: &mut [AntennaNoise]) {
        integrate_many(&self.rings, bs, e0, out);
        let mut hidden = vec![0.0; bs.len()];
        let g_sum = self.terrain_part(bs, e0, a0, &mut hidden);
        let f = 1.0 / (4.0 * std::f64::consts::PI);
        for ((b, o), s_sum) in bs.iter().zip(out.iter_mut()).zip(&hidden) {
            let tt = b.side_at(0.0, true);
            let (terrain, hidden_sky) = (f * tt * g_sum, f * s_sum);
            o.sky_k = (o.sky_k - hidden_sky).max(0.0);
            o.ground_k += terrain;
        }
    }

    /// `∫_R G dOmega`, and `∫_R G Tsky(el) dOmega` for each of `bs` into `s_sums`.
    fn terrain_part(&self, bs: &[&Brightness], e0: f64, a0: f64, s_sums: &mut [f64]) -> f64 {
        // Distance from the boresight to the terrain band 0..highest, deg.
        let gap = (e0 - self.highest_deg).max(-e0).max(0.0);
        let start = self.scale_deg.max(0.5 * gap);
        let mut cuts = vec![-180.0, 180.0, 0.0];
        let mut d = start;
        while d < 180.0 {
            cuts.extend([d, -d]);
            d *= self.ladder_ratio;
        }
        cuts.extend(
            self.kinks_deg
                .iter()
                .map(|k| (k - a0 + 180.0).rem_euclid(360.0) - 180.0),
        );
        cuts.sort_by(f64::total_cmp);
        let (se0, ce0) = e0.to_radians().sin_cos();
        if self.join_cuts {
            self.join_azimuth_cuts((se0, ce0), a0, &mut cuts);
        }
        let mut t_sum = 0.0;
        let mut column_s = vec![0.0; bs.len()];
        let mut el_cuts = Vec::with_capacity(64);
        for w in cuts.windows(2) {
            let (lo, hi) = (w[0], w[1]);
            if hi - lo < 1e-9 {
                continue;
            }
            let near = lo.abs().min(hi.abs()) < self.near_rungs * start || lo * hi < 0.0;
            let nodes: &[(f64, f64)] = if near { &GL8 } else { &GL4 };
            let half = 0.5 * (hi - lo);
            for &(x, wx) in nodes {
                let delta = lo + half * (1.0 + x);
                let h = self.terrain.limit_deg(a0 + delta);
                if h <= 0.0 {
                    continue;
                }
                let w_az = wx * half.to_radians();
                let boresight = (se0, ce0, e0);
                let t = self.column(bs, boresight, delta, h, &mut column_s, &mut el_cuts);
                t_sum += w_az * t;
                for (acc, s) in s_sums.iter_mut().zip(&column_s) {
                    *acc += w_az * s;
                }
            }
        }
        t_sum
    }

    /// Adds to the sorted azimuth cuts `cuts` (deg from the boresight's azimuth `a0`) the
    /// azimuths where the join circle (module doc) is tangent to a meridian, crosses 0 deg and
    /// crosses the terrain's edge, and sorts them again; `(se0, ce0)` the sine and cosine of the
    /// boresight's elevation. The edge crossings are found by sampling each interval of `cuts`
    /// that the circle reaches and bisecting each change of side.
    fn join_azimuth_cuts(&self, (se0, ce0): (f64, f64), a0: f64, cuts: &mut Vec<f64>) {
        let Some(join) = self.join_rad else {
            return;
        };
        let cos_join = self.cos_join;
        let mut extra = Vec::new();
        // Tangent to a meridian where sin(delta) = sin(join) / cos(e0); beyond that azimuth the
        // circle is not met (unless it holds the zenith: then every azimuth is searched).
        let reach_deg = match join.sin() / ce0 {
            s if s < 1.0 => {
                let d = s.asin().to_degrees();
                extra.extend([d, -d]);
                d
            }
            _ => 180.0,
        };
        // Crosses el = 0 where cos(delta) = cos(join) / cos(e0).
        let c = cos_join / ce0;
        if c.abs() <= 1.0 {
            let d = c.acos().to_degrees();
            extra.extend([d, -d]);
        }
        // cos(psi) - cos(join) at the terrain's edge: its sign tells inside or outside the circle.
        let side = |delta: f64| {
            let (sh, ch) = trig::sin_cos(self.terrain.limit_deg(a0 + delta).max(0.0).to_radians());
            sh * se0 + ch * ce0 * trig::cos(delta.to_radians()) - cos_join
        };
        for w in cuts.windows(2) {
            let (lo, hi) = (w[0].max(-reach_deg), w[1].min(reach_deg));
            if hi - lo < 1e-9 {
                continue;
            }
            let step = (hi - lo) / EDGE_CROSSING_SAMPLES as f64;
            let mut prev = (lo, side(lo));
            for i in 1..=EDGE_CROSSING_SAMPLES {
                let x = if i == EDGE_CROSSING_SAMPLES {
                    hi
                } else {
                    lo + step * i as f64
                };
                let next = (x, side(x));
                if (next.1 > 0.0) != (prev.1 > 0.0) {
                    let (mut a, mut b) = (prev.0, next.0);
                    while b - a > 1e-9 {
                        let m = 0.5 * (a + b);
                        if (side(m) > 0.0) == (prev.1 > 0.0) {
                            a = m;
                        } else {
                            b = m;
                        }
                    }
                    extra.push(0.5 * (a + b));
                }
                prev = next;
            }
        }
        cuts.extend(extra);
        cuts.sort_by(f64::total_cmp);
    }

    /// At one azimuth node (`delta` deg from the boresight's azimuth, terrain up to `h` deg):
    /// `∫_0^h G cos el d el`, and `∫_0^h G Tsky(el) cos el d el` for each of `bs` into
    /// `s_sums`; el in rad. `cuts` is scratch space (its contents are replaced).
    fn column(
        &self,
        bs: &[&Brightness],
        (se0, ce0, e0): (f64, f64, f64),
        delta: f64,
        h: f64,
        s_sums: &mut [f64],
        cuts: &mut Vec<f64>,
    ) -> f64 {
        let cd = trig::cos(delta.to_radians());
        // The elevation of this azimuth's line closest to the boresight, and its distance.
        let el_c = e0.clamp(0.0, h);
        let (se, ce) = trig::sin_cos(el_c.to_radians());
        let dist = angle_of_cos(se * se0 + ce * ce0 * cd).to_degrees();
        let start = self.scale_deg.max(0.5 * dist);
        self.column_cuts(el_c, h, start, (se0, ce0 * cd), cuts);
        let mut g_sum = 0.0;
        s_sums.fill(0.0);
        for w in cuts.windows(2) {
            let (lo, hi) = (w[0], w[1]);
            if hi - lo < 1e-12 {
                continue;
            }
            let near = dist < self.near_rungs * self.scale_deg
                && (lo - el_c).abs().min((hi - el_c).abs()) < self.near_rungs * self.scale_deg;
            let nodes: &[(f64, f64)] = if near { &GL8[4..] } else { &GL4[2..] };
            let half = 0.5 * (hi - lo);
            // The nodes in pairs mid ± half x: sin and cos by angle addition from the midpoint's.
            let (sm, cm) = trig::sin_cos((lo + half).to_radians());
            let half_rad = half.to_radians();
            for &(x, wx) in nodes {
                let (sd, cdd) = trig::sin_cos(half_rad * x);
                let w = wx * half_rad;
                for (se, ce) in [
                    (sm * cdd - cm * sd, cm * cdd + sm * sd),
                    (sm * cdd + cm * sd, cm * cdd - sm * sd),
                ] {
                    let psi = angle_of_cos(se * se0 + ce * ce0 * cd);
                    let g = self.pattern.gain(psi) * ce * w;
                    g_sum += g;
                    let node = ProfileNode::of(se, false);
                    for (b, s) in bs.iter().zip(s_sums.iter_mut()) {
                        *s += g * b.side_node(node, false);
                    }
                }
            }
        }
        g_sum
    }

    /// The elevation cuts of a column `[0, h]` (deg), ascending into `cuts` (its contents are
    /// replaced): its ends, the ladder around `el_c` from `start`, and where the join circle
    /// crosses the column, `(a, bb)` = (sin e0, cos e0 cos delta). Made in order rather than
    /// sorted: the ladder below `el_c` farthest first, then above it, the join's crossings put
    /// in their places.
    fn column_cuts(&self, el_c: f64, h: f64, start: f64, (a, bb): (f64, f64), cuts: &mut Vec<f64>) {
        let mut rungs = [0.0; MAX_RUNGS];
        let mut n = 0;
        let mut d = start;
        while d < h && n < MAX_RUNGS {
            rungs[n] = d;
            n += 1;
            d *= self.ladder_ratio;
        }
        debug_assert!(d >= h, "a ladder of more than {MAX_RUNGS} rungs");
        cuts.clear();
        cuts.push(0.0);
        cuts.extend(
            rungs[..n]
                .iter()
                .rev()
                .map(|d| el_c - d)
                .filter(|v| *v >= 0.0),
        );
        cuts.push(el_c);
        cuts.extend(rungs[..n].iter().map(|d| el_c + d).filter(|v| *v <= h));
        cuts.push(h);
        if self.join_rad.is_some() {
            // sin el sin e0 + cos el cos e0 cos delta = cos psi_j: R cos(el - phi) = cos psi_j
            let c = self.cos_join / (a * a + bb * bb).sqrt();
            if c.abs() <= 1.0 {
                let phi = a.atan2(bb);
                let off = c.acos();
                for v in [(phi + off).to_degrees(), (phi - off).to_degrees()] {
                    if (0.0..=h).contains(&v) {
                        let at = cuts.partition_point(|x| x.total_cmp(&v).is_le());
                        cuts.insert(at, v);
                    }
                }
            }
        }
    }
}

/// Most rungs of a column's ladder (a ladder from 0.001 deg at ratio sqrt(2) reaches 90 deg in
/// 33).
const MAX_RUNGS: usize = 48;

/// Terms of the arcsine's series `asin z = z Σ a_n z^(2n)` [`angle_of_cos`] takes at most:
/// a_n = (2n)! / (4^n (n!)^2 (2n + 1)) (Abramowitz & Stegun 4.4.40).
const ASIN_TERMS: usize = 14;

/// The series' coefficients a_0..a_13, a_n = a_(n-1) (2n - 1)^2 / (2n (2n + 1)).
const ASIN_COEFFS: [f64; ASIN_TERMS] = {
    let mut a = [1.0; ASIN_TERMS];
    let mut n = 1;
    while n < ASIN_TERMS {
        let k = n as f64;
        a[n] = a[n - 1] * (2.0 * k - 1.0) * (2.0 * k - 1.0) / (2.0 * k * (2.0 * k + 1.0));
        n += 1;
    }
    a
};

/// `Σ_(n < N) a_n z2^n`, Horner.
#[inline]
fn asin_series<const N: usize>(z2: f64) -> f64 {
    let mut p = ASIN_COEFFS[N - 1];
    let mut n = N - 1;
    while n > 0 {
        n -= 1;
        p = p * z2 + ASIN_COEFFS[n];
    }
    p
}

/// The angle (rad, 0..pi) whose cosine is `c` (clamped to [-1, 1]), as `acos` gives it:
/// psi = 2 asin(z) with z^2 = sin^2(psi / 2) = (1 - c) / 2 from the arcsine's series for psi up
/// to 30 deg (the quadrature's nodes near the boresight, most of them), else `acos`. The series
/// is cut where the first term left out, a_N z^(2N), is below 1e-17 of the sum: 6 terms up to
/// z^2 = 2.8e-3 (psi 6.1 deg), 9 up to 0.0216 (16.9 deg), 14 up to sin^2(15 deg) (30 deg).
#[inline]
fn angle_of_cos(c: f64) -> f64 {
    let z2 = (0.5 * (1.0 - c)).max(0.0);
    let p = if z2 <= 2.8e-3 {
        asin_series::<6>(z2)
    } else if z2 <= 0.0216 {
        asin_series::<9>(z2)
    } else if z2 <= 0.066_987_298_107_780_68 {
        // sin^2(15 deg)
        asin_series::<14>(z2)
    } else {
        return c.clamp(-1.0, 1.0).acos();
    };
    2.0 * z2.sqrt() * p
}

/// Half the half-power beamwidth of the pattern, deg (first angle where the gain falls to half
/// its on-axis value; bisection).
pub(crate) fn half_power_half_width_deg(pattern: &NoisePattern) -> f64 {
    let g0 = pattern.gain(0.0);
    let below = |deg: f64| pattern.gain(deg.to_radians()) <= 0.5 * g0;
    let mut hi = 1e-3;
    while hi < 180.0 && !below(hi) {
        hi *= 1.5;
    }
    let mut lo = (hi / 1.5).min(hi);
    for _ in 0..50 {
        let mid = 0.5 * (lo + hi);
        if below(mid) {
            hi = mid;
        } else {
            lo = mid;
        }
    }
    hi.min(180.0)
}

/// The antenna noise at boresight elevation `elevation_deg` and azimuth `azimuth_deg` under the
/// terrain `terrain` ([`terrain_profile`]), integrated directly (module doc). 0.05-0.08 ms for a
/// 3.7 m dish at X band (`benches/noise.rs`): not for a per-step call.
pub fn terrain_antenna_noise(
    pattern: &NoisePattern,
    brightness: &Brightness,
    terrain: &HorizonMask,
    elevation_deg: f64,
    azimuth_deg: f64,
) -> AntennaNoise {
    TerrainIntegrator::new(pattern, terrain).at(brightness, elevation_deg, azimuth_deg)
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn the_series_give_the_library_arccosine() {
        // The quadrature's own arccosine against the standard library's, over the ranges where
        // each series is taken and past them (where the library is called).
        for i in 0..=20000 {
            let psi = std::f64::consts::PI * i as f64 / 20000.0;
            let c = psi.cos();
            let want = c.acos();
            let got = angle_of_cos(c);
            assert!(
                (got - want).abs() <= 1e-15 * want.max(1e-3),
                "psi {psi}: {got} vs {want}"
            );
        }
        assert_eq!(angle_of_cos(1.0 + 1e-16), 0.0);
        assert_eq!(angle_of_cos(-1.0 - 1e-16), std::f64::consts::PI);
    }

    /// The largest change of the total antenna noise, K, when the quadrature's ladders are
    /// refined (rungs sqrt(2) apart, 8-point rules everywhere), over pointings beside, over and
    /// inside the profile's vertices, and the number of pointings.
    fn largest_change_on_refining(
        (ladder_ratio, near_rungs, join_cuts): (f64, f64, bool),
    ) -> (f64, usize) {
        // A 3.7 m dish at 8.2 GHz (theta_3dB 0.69 deg) on a profile of the example's shape
        // (2-12 deg), under a smooth invented sky (0.06 dB zenith absorption, cosecant law).
        let dl = 3.7 * 8.2e9 / 299_792_458.0;
        let gain_dbi = 10.0 * (0.6 * (std::f64::consts::PI * dl).powi(2)).log10();
        let pattern = NoisePattern::reference(gain_dbi, 70.0 / dl, dl, 8.2e9).unwrap();
        let sky = |el: f64| {
            let a_db = 0.06 / el.max(2.0).to_radians().sin();
            crate::noise::sky::sky_temperature_p618_k(a_db, 275.0, 2.73).unwrap()
        };
        let ground = super::super::antenna_table::GroundSpec {
            temperature_k: 290.0,
            emissivity: 0.9,
        };
        let b = Brightness::new(sky, ground);
        let profile = [
            [0.0, 2.0],
            [60.0, 4.0],
            [110.0, 9.0],
            [150.0, 12.0],
            [200.0, 6.0],
            [270.0, 3.0],
            [330.0, 2.0],
        ];
        let terrain = terrain_profile(&profile).unwrap();
        let mut coarse = TerrainIntegrator::new(&pattern, &terrain);
        (coarse.ladder_ratio, coarse.near_rungs) = (ladder_ratio, near_rungs);
        coarse.join_cuts = join_cuts;
        let mut fine = TerrainIntegrator::new(&pattern, &terrain);
        fine.ladder_ratio = std::f64::consts::SQRT_2;
        fine.near_rungs = f64::INFINITY;
        let mut pointings = Vec::new();
        for vertex in profile {
            for offset in [-2.0, -0.4, 0.0, 0.3, 1.0, 5.0] {
                let az = vertex[0] + offset;
                for du in [-1.0, -0.2, 0.0, 0.3, 1.0, 4.0] {
                    pointings.push((terrain.limit_deg(az) + du, az));
                }
            }
            // below the geometric horizon, and near the zenith
            pointings.extend([(-3.0, vertex[0]), (85.0, vertex[0]), (89.5, vertex[0])]);
        }
        let mut worst = 0.0f64;
        for &(el, az) in &pointings {
            let d = coarse.at(&b, el, az).total_k() - fine.at(&b, el, az).total_k();
            worst = worst.max(d.abs());
        }
        (worst, pointings.len())
    }

    #[test]
    fn refining_the_quadrature_moves_the_integral_little() {
        // The direct integral's own quadrature error, estimated by refining it (numerical check,
        // no published value): within 0.03 K. Without the azimuth cuts at the join circle the
        // same rungs are more than 0.1 K off (the bound would fail), and so was the quadrature
        // used before the cuts (rungs twice apart, 8-point rules within eight ladder starts).
        let (with_cuts, n) = largest_change_on_refining((LADDER_RATIO, NEAR_RUNGS, true));
        assert!(with_cuts < 0.03, "{with_cuts} K over {n} pointings");
        let (without, _) = largest_change_on_refining((LADDER_RATIO, NEAR_RUNGS, false));
        assert!(without > 0.1, "{without} K");
        let (before, _) = largest_change_on_refining((2.0, 8.0, false));
        assert!(before > 0.05, "{before} K");
    }
}

//! Antenna noise temperature over boresight elevation, built once per station and weather case by
//! integrating the sky and ground brightness over the antenna's pattern ([`super::pattern`]).
//!
//! `Ta(e0) = (1 / 4 pi) ∫ G(psi) Tb(el(psi, phi; e0)) dOmega`, psi the off-axis angle and phi the
//! angle around the boresight; the direction's elevation is
//! `sin el = sin e0 cos psi + cos e0 sin psi cos phi` (spherical triangle; the pattern is taken
//! symmetric about its axis and the brightness depends on elevation only, so Ta depends on e0
//! only; the station's horizon mask is not used here: terrain is taken at the geometric horizon, and
//! [`super::terrain_table`] adds it by azimuth).
//!
//! Brightness per direction:
//! * sky (el >= 0): ITU-R P.618-14 eq. (69), `Tsky = Tmr (1 - 10^(-A/10)) + Tbg 10^(-A/10)` with
//!   A the absorptive attenuation of the station's atmosphere at that elevation and weather case
//!   (given by the caller as a function) and Tbg the cosmic + galactic background
//!   ([`super::sky::background_temperature_k`]). In the availability case the rain of that
//!   exceedance is taken to fill the whole sky (conservative: the rain cell of that probability
//!   is usually smaller than the sky the sidelobes see).
//! * ground (el < 0), a flat specular surface (common practice for noise estimates):
//!   `Tb = e Tg + (1 - e) Tsky(-el)`, with e the ground emissivity and Tg its physical temperature
//!   (station keys); the reflected sky is counted in the ground term.
//!
//! Quadrature: off-axis, the pattern's own Gauss-Legendre rule ([`super::pattern::NoisePattern::rule`]);
//! around the axis, each ring is split where it crosses the horizon,
//! `cos phi_c = -tan e0 / tan psi`, and each part integrated by 8-point Gauss-Legendre, so the
//! sky/ground edge is exact. The sky brightness is tabulated once over `s = sqrt(|sin el|)`
//! (513 nodes, dense at the horizon where the brightness changes fastest).
//!
//! The table over boresight elevation ([`TABLE_RANGE_DEG`], -10 to 90 deg; the end rows are held
//! beyond) starts at [`START_STEP_DEG`] spacing and halves each interval whose quarter points
//! differ from the linear interpolation of their neighbours by more than [`REFINE_TOLERANCE_K`]
//! in either term; the rows are then kept at the quarter points too, so linear interpolation
//! between rows stays well within that (the suite checks < 0.1 K against the direct integral at
//! random elevations, near the horizon where the main beam meets the ground and elsewhere).

use super::pattern::{NoisePattern, GL4, GL8};
use crate::geometry::bounded_trig as trig;

/// Largest midpoint difference (K) accepted at twice the table's final spacing.
pub const REFINE_TOLERANCE_K: f64 = 0.08;

/// Boresight elevations the table covers, deg: the lowest accepted minimum elevation
/// (`config::limits::MIN_ELEVATION_DEG`, -5 deg) with room; below, the end row is held.
pub const TABLE_RANGE_DEG: (f64, f64) = (-10.0, 90.0);

/// Spacing the refinement starts from, deg.
const START_STEP_DEG: f64 = 5.0;

/// Deepest refinement: 5 deg / 2^16, about 1e-4 deg.
const MAX_DEPTH: u32 = 16;

/// Nodes of the sky-brightness profile over s = sqrt(sin el).
const PROFILE_NODES: usize = 512;

/// The noise an antenna picks up at one boresight elevation, split by where it comes from.
#[derive(Debug, Clone, Copy, Default, PartialEq)]
pub struct AntennaNoise {
    /// From directions above the horizon (sky, atmosphere and background), K.
    pub sky_k: f64,
    /// From directions below the horizon (ground emission and the sky it reflects), K.
    pub ground_k: f64,
}

impl AntennaNoise {
    pub fn total_k(&self) -> f64 {
        self.sky_k + self.ground_k
    }
}

/// Brightness of the surroundings for one weather case.
#[derive(Debug, Clone, PartialEq)]
pub struct Brightness {
    /// Sky brightness at s_i = i / N (sin el = s^2), K.
    sky: Profile,
    /// Ground brightness at the mirror elevations, K.
    ground: Profile,
}

/// A brightness profile over s = sqrt(|sin el|), nodes 0..=[`PROFILE_NODES`] (a fixed length, so
/// the lookups of [`ProfileNode`], whose node is below [`PROFILE_NODES`], need no bounds check).
type Profile = Box<[f64; PROFILE_NODES + 1]>;

/// The profile of `f(i)` at nodes i = 0..=[`PROFILE_NODES`].
fn profile(mut f: impl FnMut(usize) -> f64) -> Profile {
    let mut p = Box::new([0.0; PROFILE_NODES + 1]);
    for (i, v) in p.iter_mut().enumerate() {
        *v = f(i);
    }
    p
}

/// What the ground looks like to the antenna.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct GroundSpec {
    /// Physical temperature, K.
    pub temperature_k: f64,
    /// Emissivity e in [0, 1]; 1 - e of the mirror sky is reflected.
    pub emissivity: f64,
}

impl Brightness {
    /// Tabulate the sky brightness from `sky_k(elevation_deg)` (0-90 deg) and the ground.
    pub fn new(sky_k: impl Fn(f64) -> f64, ground: GroundSpec) -> Self {
        let n = PROFILE_NODES;
        let sky = profile(|i| {
            let s = i as f64 / n as f64;
            sky_k((s * s).clamp(0.0, 1.0).asin().to_degrees())
        });
        let e = ground.emissivity;
        // Tb = e Tg + (1 - e) Tsky(-el)
        let ground = profile(|i| e * ground.temperature_k + (1.0 - e) * sky[i]);
        Self { sky, ground }
    }

    /// A sky of one brightness everywhere above the horizon (for checks).
    pub fn uniform(sky_k: f64, ground: GroundSpec) -> Self {
        Self::new(|_| sky_k, ground)
    }

    /// Brightness of the sky (`ground` false, at elevation max(el, 0)) or of the ground (at
    /// the mirror of min(el, 0)) toward sin el = `u`.
    #[inline]
    pub fn side_at(&self, u: f64, ground: bool) -> f64 {
        self.side_node(ProfileNode::of(u, ground), ground)
    }

    /// [`Self::side_at`] at a direction whose place in the profile is already worked out (the
    /// same for every brightness: a direction looked up in several weather cases or raised
    /// horizons finds it once); value for value the same.
    #[inline]
    pub(crate) fn side_node(&self, n: ProfileNode, ground: bool) -> f64 {
        let table = if ground { &self.ground } else { &self.sky };
        let (a, b) = (table[n.i], table[n.i + 1]);
        a + n.f * (b - a)
    }

    /// The same surroundings seen from a frame whose horizon is raised by `h_deg`: toward an
    /// elevation e' above that horizon the sky of true elevation e' + h; below it, down to
    /// e' = -h, terrain radiating as the ground at grazing (`e Tg + (1 - e) Tsky(0)`, the
    /// brightness [`super::terrain`] gives the terrain), and further down the flat ground at the
    /// mirror of the true elevation. `raised(0.0)` is `self`, value for value.
    pub fn raised(&self, h_deg: f64) -> Self {
        let n = PROFILE_NODES;
        let h = h_deg.max(0.0);
        if h == 0.0 {
            return self.clone();
        }
        let terrain_k = self.ground[0];
        let elevation_deg = |i: usize| {
            let s = i as f64 / n as f64;
            (s * s).clamp(0.0, 1.0).asin().to_degrees()
        };
        let sky = profile(|i| {
            let e = elevation_deg(i);
            self.side_at((e + h).min(90.0).to_radians().sin(), false)
        });
        let ground = profile(|i| {
            let e = elevation_deg(i);
            if e <= h {
                terrain_k
            } else {
                self.side_at(-(e - h).to_radians().sin(), true)
            }
        });
        Self { sky, ground }
    }

    /// Brightness toward sin el = `u`: `(kelvin, is_ground)`.
    #[inline]
    pub fn at(&self, u: f64) -> (f64, bool) {
        let n = PROFILE_NODES as f64;
        let x = u.abs().min(1.0).sqrt() * n;
        let i = (x as usize).min(PROFILE_NODES - 1);
        let f = x - i as f64;
        let table = if u < 0.0 { &self.ground } else { &self.sky };
        (table[i] + f * (table[i + 1] - table[i]), u < 0.0)
    }
}

/// Where a direction (sin el = `u`) falls in a [`Brightness`]'s profile of the sky or the ground
/// side: node `i` and the fraction `f` toward node `i + 1`. It depends on `u` only, not on the
/// brightness.
#[derive(Debug, Clone, Copy, Default)]
pub(crate) struct ProfileNode {
    i: usize,
    f: f64,
}

impl ProfileNode {
    /// The place of sin el = `u` on the sky side (`ground` false: elevation max(el, 0)) or the
    /// ground side (the mirror of min(el, 0)).
    #[inline]
    pub(crate) fn of(u: f64, ground: bool) -> Self {
        let v = if ground { -u.min(0.0) } else { u.max(0.0) };
        let x = v.min(1.0).sqrt() * PROFILE_NODES as f64;
        let i = (x as usize).min(PROFILE_NODES - 1);
        Self { i, f: x - i as f64 }
    }
}

/// Antenna noise over boresight elevation: rows (elevation, sky, ground), linear interpolation.
#[derive(Debug, Clone, PartialEq)]
pub struct AntennaNoiseTable {
    elevation_deg: Vec<f64>,
    noise: Vec<AntennaNoise>,
}

/// The pattern's rule, with the gain folded into the weights, and the band of off-axis angles each
/// ring stands for (its share of the Gauss-Legendre interval), for the horizon cut.
pub(crate) struct Rings {
    cos_psi: Vec<f64>,
    sin_psi: Vec<f64>,
    weight: Vec<f64>,
    band: Vec<[f64; 2]>,
    /// `(w sin t, cos t)` at the 4-point Gauss-Legendre nodes t = (pi/2)(1 + x) of [0, pi].
    band_nodes: [(f64, f64); 4],
    /// cos phi at the 8 Gauss-Legendre nodes of [0, pi] (whole rings).
    cos_phi: [f64; 8],
}

impl Rings {
    pub(crate) fn of(pattern: &NoisePattern) -> Self {
        let rule = pattern.rule();
        Self {
            cos_psi: rule.psi_rad.iter().map(|p| p.cos()).collect(),
            sin_psi: rule.psi_rad.iter().map(|p| p.sin()).collect(),
            weight: rule
                .psi_rad
                .iter()
                .zip(&rule.weight)
                .map(|(&p, &w)| w * pattern.gain(p))
                .collect(),
            band: rule.band_rad.clone(),
            band_nodes: GL4.map(|(x, w)| {
                let t = std::f64::consts::FRAC_PI_2 * (1.0 + x);
                (w * t.sin(), t.cos())
            }),
            cos_phi: GL8.map(|(x, _)| (std::f64::consts::FRAC_PI_2 * (1.0 + x)).cos()),
        }
    }
}

/// `(1/pi) ∫ Tb dphi` over `[lo, hi]` of one ring, 8-point Gauss-Legendre, from the sky table
/// (`ground` false) or the ground table, for each brightness of `bs` (added to `out` times `w`;
/// `sky` picks the term). The nodes' directions are worked out once for all of them.
#[inline]
#[allow(clippy::too_many_arguments)]
fn ring_part(
    bs: &[&Brightness],
    ground: bool,
    (a0, b0): (f64, f64),
    lo: f64,
    hi: f64,
    w: f64,
    out: &mut [AntennaNoise],
) {
    let half = 0.5 * (hi - lo);
    let mut nodes = [ProfileNode::default(); 8];
    // GL8's nodes in ± pairs about the midpoint: cos(mid ± half x) by angle addition.
    let (sm, cm) = trig::sin_cos(lo + half);
    for k in 0..4 {
        let (sd, cd) = trig::sin_cos(half * GL8[7 - k].0);
        nodes[k] = ProfileNode::of(a0 + b0 * (cm * cd + sm * sd), ground);
        nodes[7 - k] = ProfileNode::of(a0 + b0 * (cm * cd - sm * sd), ground);
    }
    for (b, o) in bs.iter().zip(out.iter_mut()) {
        let mut acc = 0.0;
        for (k, (_, wk)) in GL8.iter().enumerate() {
            acc += wk * b.side_node(nodes[k], ground);
        }
        let t = acc * half / std::f64::consts::PI;
        if ground {
            o.ground_k += w * t;
        } else {
            o.sky_k += w * t;
        }
    }
}

/// The sky's share of the rings of off-axis angles `[lo, hi]`, averaged over that band: a ring
/// at psi is all sky for psi <= |e0| (e0 > 0; all ground for e0 < 0), all ground (sky) for
/// psi >= pi - |e0|, and in between the horizon cuts it at phi_c with
/// share = phi_c / pi = acos(-tan e0 / tan psi) / pi, which grows like a square root from the
/// ends of that range. Integrated with psi = m - r cos(t), t in [0, pi] (the sin t of dpsi takes
/// the square root away), 4-point Gauss-Legendre in t.
#[inline]
fn band_sky_share(
    lo: f64,
    hi: f64,
    elevation_rad: f64,
    tan_e: f64,
    nodes: &[(f64, f64); 4],
) -> f64 {
    let pi = std::f64::consts::PI;
    let e = elevation_rad.abs();
    let (whole_near, whole_far) = if elevation_rad >= 0.0 {
        (1.0, 0.0)
    } else {
        (0.0, 1.0)
    };
    // whole rings below |e0| and above pi - |e0|
    let near = (e.min(hi) - lo).max(0.0);
    let far = (hi - (pi - e).max(lo)).max(0.0);
    let (l, h) = (lo.max(e), hi.min(pi - e));
    let mut split = 0.0;
    if h > l {
        let (m, r) = (0.5 * (l + h), 0.5 * (h - l));
        for &(w_sin_t, cos_t) in nodes {
            let psi = m - r * cos_t;
            // -tan(e0) / tan(psi), psi strictly inside (0, pi)
            let (sin_psi, cos_psi) = trig::sin_cos(psi);
            let share = ((-tan_e * cos_psi / sin_psi).clamp(-1.0, 1.0)).acos() / pi;
            // dpsi = r sin t dt, dt = (pi/2) dx
            split += w_sin_t * share * r * 0.5 * pi;
        }
    }
    (near * whole_near + far * whole_far + split) / (hi - lo)
}

/// The integral at one boresight elevation. A ring wholly above (below) the horizon adds to the
/// sky (ground) term. A ring the horizon crosses is cut at phi_c = pi * (the sky's share averaged
/// over the ring's band of off-axis angles, [`band_sky_share`]): a single ring's share grows like
/// a square root where it starts to touch the horizon, the band's average smoothly, which keeps
/// the table over elevation smooth.
pub(crate) fn integrate(rings: &Rings, b: &Brightness, elevation_deg: f64) -> AntennaNoise {
    let mut out = [AntennaNoise::default()];
    integrate_many(rings, std::slice::from_ref(&b), elevation_deg, &mut out);
    out[0]
}

/// [`integrate`] for several brightnesses at once, `out[j]` for `bs[j]` (each value for value
/// what [`integrate`] gives it): the rings' horizon cuts and directions are worked out once, the
/// brightness is looked up per case.
pub(crate) fn integrate_many(
    rings: &Rings,
    bs: &[&Brightness],
    elevation_deg: f64,
    out: &mut [AntennaNoise],
) {
    let pi = std::f64::consts::PI;
    let e_rad = elevation_deg.to_radians();
    let (se, ce) = e_rad.sin_cos();
    let tan_e = se / ce.max(1e-300);
    out.fill(AntennaNoise::default());
    for i in 0..rings.weight.len() {
        let w = rings.weight[i];
        // sin el = a + c cos phi
        let (a, c) = (se * rings.cos_psi[i], ce * rings.sin_psi[i]);
        let [lo, hi] = rings.band[i];
        let sky_share = band_sky_share(lo, hi, e_rad, tan_e, &rings.band_nodes);
        if sky_share >= 1.0 || sky_share <= 0.0 {
            let ground = sky_share <= 0.0;
            let mut nodes = [ProfileNode::default(); 8];
            for (n, cos_phi) in nodes.iter_mut().zip(rings.cos_phi) {
                *n = ProfileNode::of(a + c * cos_phi, ground);
            }
            for (b, o) in bs.iter().zip(out.iter_mut()) {
                let mut acc = 0.0;
                for (k, (_, wk)) in GL8.iter().enumerate() {
                    acc += wk * b.side_node(nodes[k], ground);
                }
                // (1/pi) ∫_0^pi = (1/2) Σ w_k Tb(phi_k)
                let t = 0.5 * acc;
                if ground {
                    o.ground_k += w * t;
                } else {
                    o.sky_k += w * t;
                }
            }
            continue;
        }
        let phi_c = pi * sky_share;
        ring_part(bs, false, (a, c), 0.0, phi_c, w, out);
        ring_part(bs, true, (a, c), phi_c, pi, w, out);
    }
}

impl AntennaNoiseTable {
    /// Build the table for `pattern` under `brightness` (see the module doc).
    pub fn build(pattern: &NoisePattern, brightness: &Brightness) -> Self {
        Self::build_cases(pattern, &[brightness]).remove(0)
    }

    /// Tables for several brightnesses on one grid of elevations, refined by the rule of
    /// [`Self::build`] wherever any of them needs it: `(rows, values)` with `values[j]` the rows of
    /// `brightnesses[j]`. The rings' geometry is shared (`integrate_many`), and the 5 deg
    /// intervals the refinement starts from are refined in parallel. For the raised-horizon tables
    /// of [`super::terrain_table`], whose fast change is at the same elevation (their horizon).
    pub fn build_many(
        pattern: &NoisePattern,
        brightnesses: &[&Brightness],
    ) -> (Vec<f64>, Vec<Vec<AntennaNoise>>) {
        use rayon::prelude::*;
        let rings = Rings::of(pattern);
        let f = |e: f64| integrate_cases(&rings, brightnesses, e);
        let ends = starting_rows(&f);
        let parts: Vec<Vec<(f64, Vec<AntennaNoise>)>> = ends
            .par_windows(2)
            .map(|w| {
                let m = 0.5 * (w[0].0 + w[1].0);
                let mut rows = Vec::new();
                refine(
                    &f,
                    [w[0].clone(), (m, f(m)), w[1].clone()],
                    0,
                    &off_many,
                    &mut |e, v| rows.push((e, v)),
                );
                rows
            })
            .collect();
        let rows_iter = || std::iter::once(&ends[0]).chain(parts.iter().flatten());
        let rows = rows_iter().map(|r| r.0).collect();
        let values = (0..brightnesses.len())
            .map(|j| rows_iter().map(|r| r.1[j]).collect())
            .collect();
        (rows, values)
    }

    /// The tables of several weather cases (`brightnesses`, one table each, in order), each row
    /// for row and value for value the table [`Self::build`] gives it alone: every case is
    /// refined by its own test, while the evaluations (the rings' geometry, `integrate_many`) are
    /// shared as long as any case still refines an interval. The 5 deg intervals the refinement
    /// starts from are refined in parallel.
    pub fn build_cases(pattern: &NoisePattern, brightnesses: &[&Brightness]) -> Vec<Self> {
        use rayon::prelude::*;
        let rings = Rings::of(pattern);
        let cases = brightnesses.len();
        let f = |e: f64| integrate_cases(&rings, brightnesses, e);
        let ends = starting_rows(&f);
        let all: Vec<usize> = (0..cases).collect();
        let parts: Vec<Vec<Vec<(f64, AntennaNoise)>>> = ends
            .par_windows(2)
            .map(|w| {
                let m = 0.5 * (w[0].0 + w[1].0);
                let mut rows = vec![Vec::new(); cases];
                refine_cases(
                    &f,
                    [w[0].clone(), (m, f(m)), w[1].clone()],
                    0,
                    &all,
                    &mut rows,
                );
                rows
            })
            .collect();
        (0..cases)
            .map(|j| {
                let rows = std::iter::once((ends[0].0, ends[0].1[j]))
                    .chain(parts.iter().flat_map(|p| p[j].iter().copied()));
                let (elevation_deg, noise) = rows.unzip();
                Self {
                    elevation_deg,
                    noise,
                }
            })
            .collect()
    }

    /// The directly integrated value at one elevation (no table; for checks).
    pub fn integrate_at(
        pattern: &NoisePattern,
        brightness: &Brightness,
        elevation_deg: f64,
    ) -> AntennaNoise {
        integrate(&Rings::of(pattern), brightness, elevation_deg)
    }

    /// Number of rows.
    pub fn len(&self) -> usize {
        self.elevation_deg.len()
    }

    pub fn is_empty(&self) -> bool {
        self.elevation_deg.is_empty()
    }

    /// Rows `(elevation_deg, noise)`.
    pub fn rows(&self) -> impl Iterator<Item = (f64, AntennaNoise)> + '_ {
        self.elevation_deg
            .iter()
            .copied()
            .zip(self.noise.iter().copied())
    }

    /// The antenna noise at `elevation_deg` (held at the ends of the table): linear interpolation.
    /// Allocates nothing.
    #[inline]
    pub fn at(&self, elevation_deg: f64) -> AntennaNoise {
        let x = &self.elevation_deg;
        let e = if elevation_deg.is_nan() {
            0.0
        } else {
            elevation_deg.clamp(x[0], x[x.len() - 1])
        };
        let i = x.partition_point(|&v| v <= e).clamp(1, x.len() - 1);
        let t = (e - x[i - 1]) / (x[i] - x[i - 1]);
        let (a, b) = (self.noise[i - 1], self.noise[i]);
        AntennaNoise {
            sky_k: a.sky_k + t * (b.sky_k - a.sky_k),
            ground_k: a.ground_k + t * (b.ground_k - a.ground_k),
        }
    }

    /// A table from rows already known (e.g. a measurement), elevations strictly increasing.
    pub fn from_rows(rows: &[(f64, AntennaNoise)]) -> Self {
        Self {
            elevation_deg: rows.iter().map(|r| r.0).collect(),
            noise: rows.iter().map(|r| r.1).collect(),
        }
    }
}

/// How far `q` is off the line through `a` and `b`, K: the larger of the two terms.
fn off_one(a: &AntennaNoise, q: &AntennaNoise, b: &AntennaNoise) -> f64 {
    let d = |g: fn(&AntennaNoise) -> f64| (g(q) - 0.5 * (g(a) + g(b))).abs();
    d(|n| n.sky_k).max(d(|n| n.ground_k))
}

/// [`off_one`] over several brightnesses: the largest. (`&Vec`: the value type `refine` works on.)
#[allow(clippy::ptr_arg)]
fn off_many(a: &Vec<AntennaNoise>, q: &Vec<AntennaNoise>, b: &Vec<AntennaNoise>) -> f64 {
    (0..q.len())
        .map(|j| off_one(&a[j], &q[j], &b[j]))
        .fold(0.0, f64::max)
}

/// Every case's value at `elevation_deg` ([`integrate_many`] into a new vector).
fn integrate_cases(rings: &Rings, bs: &[&Brightness], elevation_deg: f64) -> Vec<AntennaNoise> {
    let mut out = vec![AntennaNoise::default(); bs.len()];
    integrate_many(rings, bs, elevation_deg, &mut out);
    out
}

/// The rows the refinement starts from: `f` at [`TABLE_RANGE_DEG`] every [`START_STEP_DEG`]
/// (evaluated in parallel).
fn starting_rows(f: &(impl Fn(f64) -> Vec<AntennaNoise> + Sync)) -> Vec<(f64, Vec<AntennaNoise>)> {
    use rayon::prelude::*;
    let (lo, hi) = TABLE_RANGE_DEG;
    let n = ((hi - lo) / START_STEP_DEG).round() as usize;
    let at = |i: usize| lo + (hi - lo) * i as f64 / n as f64;
    (0..=n).into_par_iter().map(|i| (at(i), f(at(i)))).collect()
}

/// [`refine`] for several cases at once (`f` gives every case's value): each case in `active`
/// is tested on its own ([`off_one`]); a case that passes pushes its rows into `out[case]` here, as
/// [`refine`] would, and the cases that fail go on into both halves together, so each case gets
/// the rows of its own refinement and the evaluations are shared.
fn refine_cases(
    f: &impl Fn(f64) -> Vec<AntennaNoise>,
    [lo, mid, hi]: [(f64, Vec<AntennaNoise>); 3],
    depth: u32,
    active: &[usize],
    out: &mut [Vec<(f64, AntennaNoise)>],
) {
    let q1 = 0.5 * (lo.0 + mid.0);
    let q3 = 0.5 * (mid.0 + hi.0);
    let (q1, q3) = ((q1, f(q1)), (q3, f(q3)));
    let mut still = Vec::with_capacity(active.len());
    for &j in active {
        let off =
            off_one(&lo.1[j], &q1.1[j], &mid.1[j]).max(off_one(&mid.1[j], &q3.1[j], &hi.1[j]));
        if off > REFINE_TOLERANCE_K && depth < MAX_DEPTH {
            still.push(j);
        } else {
            for (e, v) in [&q1, &mid, &q3, &hi] {
                out[j].push((*e, v[j]));
            }
        }
    }
    if !still.is_empty() {
        refine_cases(f, [lo, q1, mid.clone()], depth + 1, &still, out);
        refine_cases(f, [mid, q3, hi], depth + 1, &still, out);
    }
}

/// Refine `[lo, mid, hi]` (mid known): evaluate the quarter points; while either is off the line
/// through its neighbours (by `off`) by more than the tolerance, recurse into both halves (each
/// with its quarter point as its known midpoint). Pushes the rows after `lo` up to and including
/// `hi`; the table so ends twice as dense as the spacing the test was made at.
fn refine<T: Clone>(
    f: &impl Fn(f64) -> T,
    [lo, mid, hi]: [(f64, T); 3],
    depth: u32,
    off: &impl Fn(&T, &T, &T) -> f64,
    push: &mut impl FnMut(f64, T),
) {
    let q1 = 0.5 * (lo.0 + mid.0);
    let q3 = 0.5 * (mid.0 + hi.0);
    let (q1, q3) = ((q1, f(q1)), (q3, f(q3)));
    let bad = off(&lo.1, &q1.1, &mid.1).max(off(&mid.1, &q3.1, &hi.1)) > REFINE_TOLERANCE_K;
    if bad && depth < MAX_DEPTH {
        refine(f, [lo, q1, mid.clone()], depth + 1, off, push);
        refine(f, [mid, q3, hi], depth + 1, off, push);
    } else {
        for (e, n) in [q1, mid, q3, hi] {
            push(e, n);
        }
    }
}

//! The antenna noise of a station whose terrain rises above the geometric horizon, as a table
//! over boresight elevation and azimuth: built once per station and weather case from the direct
//! integral of [`super::terrain`], looked up per step without allocation.
//!
//! Design. The fast part of the integral is the main beam crossing the terrain's edge; it depends
//! on the beam's height above the edge, not on where along the profile the edge is. So
//!
//! `Ta(e0, a0) = Ta_raised(e0 - h(a0); h(a0)) + R(e0 - h(a0), a0)`, where
//!
//! * `h(a0)` is the profile height under the beam: `H(az)` averaged over the main beam's
//!   Gaussian in azimuth (sigma = theta_3dB / 2.355), so a beam beside a profile peak sees the
//!   peak's shoulders lowered as it does (a 1-D table over azimuth, [`EDGE_STEP_DEG`] or finer);
//! * `Ta_raised(u; h)` is the 1-D antenna-noise table ([`super::antenna_table`]) of surroundings
//!   whose horizon is raised to `h` everywhere ([`Brightness::raised`]: the sky of true
//!   elevation e' + h above it, the terrain's grazing brightness for h below it, the flat ground
//!   further down), at the elevation u above that horizon; built at the heights of [`LEVELS_DEG`]
//!   that span the profile and keep the sky's brightness just above the edge within
//!   [`LEVEL_TOLERANCE_K`] of linear between them, and interpolated linearly between them at the
//!   same u;
//! * `R` is the rest: the direct integral minus the raised-horizon term, on a grid of azimuth
//!   columns (every profile kink, rungs around each kink at [`RUNGS_DEG`], and at most
//!   [`MAX_GAP_DEG`] apart; for a profile of 72 kinks or more, every 5 deg without rungs) and
//!   rows of u ([`ROWS_DEG`]), bilinear. It holds the far terrain (the
//!   profile elsewhere than at the beam's azimuth), smooth over degrees.
//!
//! The bound of the lookup against the direct integral is checked in
//! `tests/suite/terrain_noise.rs` over a grid of directions including beside the profile's peaks
//! (README, "Noise temperature").

use super::antenna_table::{AntennaNoise, AntennaNoiseTable, Brightness};
use super::pattern::NoisePattern;
use super::terrain::{half_power_half_width_deg, TerrainIntegrator, MAX_KINKS};
use crate::geometry::HorizonMask;
use rayon::prelude::*;

/// Heights of the raised-horizon tables, deg (those spanning the profile are built).
pub const LEVELS_DEG: [f64; 45] = [
    0.0, 0.25, 0.5, 0.75, 1.0, 1.25, 1.5, 2.0, 2.5, 3.0, 3.5, 4.0, 4.5, 5.0, 5.5, 6.0, 6.5, 7.0,
    7.5, 8.0, 8.5, 9.0, 9.5, 10.0, 11.0, 12.0, 13.0, 14.0, 15.0, 16.0, 18.0, 20.0, 22.0, 25.0,
    28.0, 32.0, 36.0, 40.0, 45.0, 50.0, 55.0, 60.0, 70.0, 80.0, 90.0,
];

/// Largest departure of Tsky(h) from its linear interpolation between raised-horizon tables, K.
pub const LEVEL_TOLERANCE_K: f64 = 0.25;

/// Rows of the correction grid: the boresight's height above the beam's profile height, deg.
pub const ROWS_DEG: [f64; 13] = [
    -12.0, -5.0, -2.0, -1.0, 0.0, 1.0, 2.0, 4.0, 8.0, 15.0, 25.0, 45.0, 90.0,
];

/// Columns added on both sides of every profile kink, deg of azimuth.
pub const RUNGS_DEG: [f64; 2] = [2.0, 6.0];

/// Largest azimuth gap between correction columns, deg.
pub const MAX_GAP_DEG: f64 = 20.0;

/// Spacing of the beam-averaged profile height, deg (finer for a beam narrower than 0.2 deg).
pub const EDGE_STEP_DEG: f64 = 0.05;

/// The table of one station and weather case.
#[derive(Debug, Clone, PartialEq)]
pub struct TerrainNoiseTable {
    /// Beam-averaged profile height at azimuths `i * edge_step_deg`, i = 0..=n (the last at 360).
    edge_deg: Vec<f64>,
    edge_step_deg: f64,
    /// Heights of the raised-horizon tables.
    levels_deg: Vec<f64>,
    /// The raised-horizon tables on one grid of u (refined wherever any of them, of any case
    /// built together, needs it; [`AntennaNoiseTable::build_many`]): `raised[level * n + row]`.
    raised_rows_deg: Vec<f64>,
    raised: Vec<AntennaNoise>,
    /// First row at or below each [`BUCKET_DEG`] bucket of u from the first row (O(1) lookup).
    bucket: Vec<u32>,
    /// Correction columns (azimuth, sorted in [0, 360)) x rows, `correction[column * n + row]`.
    columns_deg: Vec<f64>,
    rows_deg: Vec<f64>,
    correction: Vec<AntennaNoise>,
}

/// Bucket width of the u index, deg.
const BUCKET_DEG: f64 = 0.05;

/// The correction grid: rows of u and the columns' rungs and gap. [`TerrainGrid::default`] is
/// the grid whose bound the suite checks.
#[derive(Debug, Clone, PartialEq)]
pub struct TerrainGrid {
    pub rows_deg: Vec<f64>,
    pub rungs_deg: Vec<f64>,
    pub max_gap_deg: f64,
}

impl Default for TerrainGrid {
    fn default() -> Self {
        Self {
            rows_deg: ROWS_DEG.to_vec(),
            rungs_deg: RUNGS_DEG.to_vec(),
            max_gap_deg: MAX_GAP_DEG,
        }
    }
}

impl TerrainNoiseTable {
    /// Build the table for `pattern` under `brightness` and the terrain `terrain`
    /// ([`super::terrain::terrain_profile`]). The correction columns are integrated in parallel.
    pub fn build(pattern: &NoisePattern, brightness: &Brightness, terrain: &HorizonMask) -> Self {
        Self::build_on(pattern, brightness, terrain, &TerrainGrid::default())
    }

    /// [`Self::build`] on another correction grid (rows sorted ascending).
    pub fn build_on(
        pattern: &NoisePattern,
        brightness: &Brightness,
        terrain: &HorizonMask,
        grid: &TerrainGrid,
    ) -> Self {
        let mut one = Self::build_cases(pattern, &[brightness], terrain, grid);
        one.remove(0)
    }

    /// The tables of several weather cases (`brightnesses`, one table each, in order), built
    /// together: the beam-averaged profile and the correction columns are the same for all, the
    /// raised-horizon tables of all cases share one grid of elevations
    /// ([`AntennaNoiseTable::build_many`]) and each direct integral of the correction grid gives
    /// every case from one quadrature (`TerrainIntegrator::at_many`). A case's table is value for
    /// value the one built alone, but for its raised-horizon rows: the shared grid is the union of
    /// what each case needs, so a case gets exact values at a few more rows.
    pub fn build_cases(
        pattern: &NoisePattern,
        brightnesses: &[&Brightness],
        terrain: &HorizonMask,
        grid: &TerrainGrid,
    ) -> Vec<Self> {
        let sigma_deg = 2.0 * half_power_half_width_deg(pattern) / 2.355;
        let edge_step_deg = EDGE_STEP_DEG.min(0.25 * sigma_deg).max(1e-3);
        let n = (360.0 / edge_step_deg).ceil() as usize;
        let edge_step_deg = 360.0 / n as f64;
        let weights = beam_weights();
        let edge_deg: Vec<f64> = (0..=n)
            .map(|i| beam_height_deg(terrain, i as f64 * edge_step_deg, sigma_deg, &weights))
            .collect();
        let lowest = edge_deg.iter().copied().fold(f64::INFINITY, f64::min);
        let highest = edge_deg.iter().copied().fold(0.0, f64::max);
        let first = LEVELS_DEG
            .partition_point(|&l| l <= lowest)
            .saturating_sub(1);
        let last = LEVELS_DEG
            .partition_point(|&l| l < highest)
            .min(LEVELS_DEG.len() - 1);
        let case_levels: Vec<Vec<f64>> = brightnesses
            .iter()
            .map(|b| levels(&LEVELS_DEG[first..=last], b))
            .collect();
        let raised_brightness: Vec<Brightness> = brightnesses
            .iter()
            .zip(&case_levels)
            .flat_map(|(b, l)| l.iter().map(|&h| b.raised(h)))
            .collect();
        let refs: Vec<&Brightness> = raised_brightness.iter().collect();
        let (raised_rows_deg, mut per_level) = AntennaNoiseTable::build_many(pattern, &refs);
        let bucket = buckets(&raised_rows_deg);
        let integrator = TerrainIntegrator::new(pattern, terrain);
        let columns_deg = columns(&integrator.kinks_deg, grid);
        let mut tables: Vec<Self> = case_levels
            .into_iter()
            .map(|levels_deg| {
                let raised = per_level.drain(..levels_deg.len()).collect::<Vec<_>>();
                Self {
                    edge_deg: edge_deg.clone(),
                    edge_step_deg,
                    levels_deg,
                    raised_rows_deg: raised_rows_deg.clone(),
                    raised: raised.concat(),
                    bucket: bucket.clone(),
                    columns_deg: columns_deg.clone(),
                    rows_deg: grid.rows_deg.clone(),
                    correction: Vec::new(),
                }
            })
            .collect();
        let h_of = |a0: f64| tables[0].edge_at(a0);
        // per column, per row, per case
        let direct: Vec<Vec<AntennaNoise>> = columns_deg
            .par_iter()
            .map(|&a0| {
                let h = h_of(a0);
                let mut out = vec![AntennaNoise::default(); brightnesses.len()];
                let mut cells = Vec::with_capacity(grid.rows_deg.len() * brightnesses.len());
                for &u in &grid.rows_deg {
                    let e0 = (u + h).clamp(-10.0, 90.0);
                    integrator.at_many(brightnesses, e0, a0, &mut out);
                    cells.extend_from_slice(&out);
                }
                cells
            })
            .collect();
        let cases = brightnesses.len();
        for (k, table) in tables.iter_mut().enumerate() {
            let mut correction = Vec::with_capacity(columns_deg.len() * grid.rows_deg.len());
            for (&a0, cells) in columns_deg.iter().zip(&direct) {
                let h = table.edge_at(a0);
                for (i, &u) in grid.rows_deg.iter().enumerate() {
                    let e0 = (u + h).clamp(-10.0, 90.0);
                    let d = cells[i * cases + k];
                    let raised = table.raised_at(e0 - h, h);
                    correction.push(AntennaNoise {
                        sky_k: d.sky_k - raised.sky_k,
                        ground_k: d.ground_k - raised.ground_k,
                    });
                }
            }
            table.correction = correction;
        }
        tables
    }

    /// Number of direct integrals the correction grid took.
    pub fn direct_integrals(&self) -> usize {
        self.correction.len()
    }

    /// Number of raised-horizon tables.
    pub fn levels(&self) -> usize {
        self.levels_deg.len()
    }

    /// The beam-averaged profile height at `azimuth_deg`, deg.
    #[inline]
    pub fn edge_at(&self, azimuth_deg: f64) -> f64 {
        let x = crate::geometry::wrap360_deg(azimuth_deg) / self.edge_step_deg;
        let i = (x as usize).min(self.edge_deg.len() - 2);
        let f = x - i as f64;
        self.edge_deg[i] + f * (self.edge_deg[i + 1] - self.edge_deg[i])
    }

    /// The raised-horizon term at `u` deg above a horizon at `h` deg.
    #[inline]
    fn raised_at(&self, u: f64, h: f64) -> AntennaNoise {
        let x = &self.raised_rows_deg;
        let n = x.len();
        let u = u.clamp(x[0], x[n - 1]);
        let b = (((u - x[0]) / BUCKET_DEG) as usize).min(self.bucket.len() - 1);
        // (a bucket starting at the top row: the last interval)
        let mut i = (self.bucket[b] as usize).min(n - 2);
        while i + 2 < n && x[i + 1] <= u {
            i += 1;
        }
        let t = ((u - x[i]) / (x[i + 1] - x[i])).clamp(0.0, 1.0);
        let row = |k: usize| lerp(self.raised[k * n + i], self.raised[k * n + i + 1], t);
        let l = &self.levels_deg;
        if l.len() == 1 {
            return row(0);
        }
        let k = l.partition_point(|&v| v <= h).clamp(1, l.len() - 1);
        let s = ((h - l[k - 1]) / (l[k] - l[k - 1])).clamp(0.0, 1.0);
        lerp(row(k - 1), row(k), s)
    }

    /// The correction at `u` deg above the beam's profile height, azimuth `a0` (bilinear;
    /// azimuth wraps, rows held at the ends).
    #[inline]
    fn correction_at(&self, u: f64, a0: f64) -> AntennaNoise {
        let c = &self.columns_deg;
        let a = crate::geometry::wrap360_deg(a0);
        let j = c.partition_point(|&v| v <= a);
        let (j0, j1, lo, hi) = if j == 0 {
            (c.len() - 1, 0, c[c.len() - 1] - 360.0, c[0])
        } else if j == c.len() {
            (j - 1, 0, c[j - 1], c[0] + 360.0)
        } else {
            (j - 1, j, c[j - 1], c[j])
        };
        let s = if hi > lo { (a - lo) / (hi - lo) } else { 0.0 };
        let r = &self.rows_deg;
        let u = u.clamp(r[0], r[r.len() - 1]);
        let i = r.partition_point(|&v| v <= u).clamp(1, r.len() - 1);
        let t = (u - r[i - 1]) / (r[i] - r[i - 1]);
        let n = r.len();
        let col = |jj: usize| {
            lerp(
                self.correction[jj * n + i - 1],
                self.correction[jj * n + i],
                t,
            )
        };
        lerp(col(j0), col(j1), s)
    }

    /// The antenna noise at boresight elevation `elevation_deg` and azimuth `azimuth_deg`.
    /// Interpolation only; allocates nothing.
    #[inline]
    pub fn at(&self, elevation_deg: f64, azimuth_deg: f64) -> AntennaNoise {
        let e = if elevation_deg.is_nan() {
            0.0
        } else {
            elevation_deg
        };
        let a = if azimuth_deg.is_finite() {
            azimuth_deg
        } else {
            0.0
        };
        let h = self.edge_at(a);
        let u = e - h;
        let base = self.raised_at(u, h);
        let c = self.correction_at(u, a);
        AntennaNoise {
            sky_k: (base.sky_k + c.sky_k).max(0.0),
            ground_k: (base.ground_k + c.ground_k).max(0.0),
        }
    }
}

#[inline]
fn lerp(a: AntennaNoise, b: AntennaNoise, t: f64) -> AntennaNoise {
    AntennaNoise {
        sky_k: a.sky_k + t * (b.sky_k - a.sky_k),
        ground_k: a.ground_k + t * (b.ground_k - a.ground_k),
    }
}

/// The Gaussian's weights at x = -3, -2.5, ..., 3 sigma for [`beam_height_deg`].
fn beam_weights() -> [(f64, f64); 13] {
    std::array::from_fn(|i| {
        let x = 0.5 * (i as i32 - 6) as f64;
        (x, (-0.5 * x * x).exp())
    })
}

/// `H(az)` averaged over a Gaussian of `sigma_deg` in azimuth around `azimuth_deg` (13 points
/// at sigma / 2 spacing, weights normalized; `weights` from [`beam_weights`]).
fn beam_height_deg(
    terrain: &HorizonMask,
    azimuth_deg: f64,
    sigma_deg: f64,
    weights: &[(f64, f64); 13],
) -> f64 {
    let (mut sum, mut norm) = (0.0, 0.0);
    for &(x, w) in weights {
        sum += w * terrain.limit_deg((azimuth_deg + x * sigma_deg).rem_euclid(360.0));
        norm += w;
    }
    sum / norm
}

/// The heights of `candidates` (ascending) that keep the sky's brightness just above the edge,
/// Tsky(h), within [`LEVEL_TOLERANCE_K`] of its linear interpolation between kept heights
/// (checked at 4 points of each gap): the main beam half over the edge sees about that
/// brightness, the quantity that changes fastest with h at a fixed height above the edge.
fn levels(candidates: &[f64], brightness: &Brightness) -> Vec<f64> {
    let sky = |h: f64| brightness.side_at(h.to_radians().sin(), false);
    let straight = |a: f64, b: f64| {
        (1..=4).all(|i| {
            let x = a + (b - a) * i as f64 / 5.0;
            let line = sky(a) + (sky(b) - sky(a)) * (x - a) / (b - a);
            (sky(x) - line).abs() <= LEVEL_TOLERANCE_K
        })
    };
    let mut kept = vec![candidates[0]];
    for k in 1..candidates.len() {
        let last = kept[kept.len() - 1];
        let next = candidates.get(k + 1).copied();
        if next.is_none_or(|n| !straight(last, n)) {
            kept.push(candidates[k]);
        }
    }
    kept
}

/// For each bucket of [`BUCKET_DEG`] from the first row, the last row at or below its start.
fn buckets(rows: &[f64]) -> Vec<u32> {
    let span = rows[rows.len() - 1] - rows[0];
    let n = (span / BUCKET_DEG).ceil() as usize + 1;
    (0..n)
        .map(|b| {
            let u = rows[0] + b as f64 * BUCKET_DEG;
            rows.partition_point(|&v| v <= u).saturating_sub(1) as u32
        })
        .collect()
}

/// The correction columns: every kink, rungs on both sides, gaps filled to the grid's largest.
/// A dense profile (more than [`MAX_KINKS`] kinks: the integrator then cuts azimuth every
/// 5 deg instead) gets those cuts as columns and no rungs, so its build stays bounded.
fn columns(kinks_deg: &[f64], grid: &TerrainGrid) -> Vec<f64> {
    let rungs: &[f64] = if kinks_deg.len() >= MAX_KINKS {
        &[]
    } else {
        &grid.rungs_deg
    };
    let mut c: Vec<f64> = Vec::new();
    for &k in kinks_deg {
        c.push(k.rem_euclid(360.0));
        for &r in rungs {
            c.push((k + r).rem_euclid(360.0));
            c.push((k - r).rem_euclid(360.0));
        }
    }
    if c.is_empty() {
        c.push(0.0);
    }
    c.sort_by(f64::total_cmp);
    c.dedup_by(|a, b| (*a - *b).abs() < 0.05);
    let mut filled = Vec::with_capacity(2 * c.len());
    for (i, &a) in c.iter().enumerate() {
        filled.push(a);
        let next = if i + 1 < c.len() {
            c[i + 1]
        } else {
            c[0] + 360.0
        };
        let gap = next - a;
        let parts = (gap / grid.max_gap_deg).ceil() as usize;
        for p in 1..parts {
            filled.push((a + gap * p as f64 / parts as f64).rem_euclid(360.0));
        }
    }
    filled.sort_by(f64::total_cmp);
    filled
}

//! The terms of a station's budget that depend only on the elevation, for one weather case,
//! tabulated once per station and weather so that a plan's step interpolates instead of running
//! the ITU-R models: the total and the absorptive attenuation of the path
//! ([`crate::atmosphere::PreparedAtmosphere::at`]), the boresight sky brightness (ITU-R P.618-14
//! eq. 69) and the path transmissivity `10^(-A_abs/10)` that dims the Sun and the Moon. (The
//! antenna's sky and ground noise is already a table over elevation, [`crate::noise::antenna_table`];
//! terms that depend on the azimuth, the off-nadir angle, the range or the Sun's and the Moon's
//! directions stay direct.)
//!
//! Layout: two grids, one each side of the 5 deg switch of the models
//! ([`crate::atmosphere::low_elevation_form`], the one rule; the models jump there, so no interval
//! straddles it), from 0 to 90 deg, with linear interpolation. Each grid is cut into cells of
//! [`CELL_DEG`]; each cell's intervals are halved until, at the quarter, middle and three-quarter
//! point of every interval, the interpolated value is within a quarter of [`TABLE_TOLERANCE_DB`]
//! of the direct computation, for every term (kelvin and the transmissivity as ratios in dB:
//! `|10 log10(table / direct)|`), so the grid is fine only where a model bends or has a kink (the
//! rain model's branches). A lookup is two index computations, no search. A cell that does not
//! reach the target by [`MAX_INTERVALS_PER_CELL`] intervals holds a jump of the model (P.618-14
//! step 7 below 5 deg: where ζ passes θ, `L_G r/cos θ` and `(h_R - h_s)/sin θ` differ because
//! `L_s` is then eq (2), not eq (1)) or a slope without bound (the `sqrt(sin θ)` of step 7 at
//! 0 deg); such a cell is computed directly. Elevations outside
//! 0-90 deg (a negative mask) are computed directly too, with the model's own clamping and
//! warnings. The warnings of an elevation inside a grid are the grid's: inside 0-90 deg they depend
//! on the elevation only through the 5 deg switch.
//!
//! Stated bound (README, "Accuracy and assumptions"): every term within [`TABLE_TOLERANCE_DB`]
//! (0.005 dB; for kelvin 0.115 %); `tests/suite/interpolation_bounds.rs` checks it against the
//! direct computation every 0.001 deg for the shipped stations and for extreme sites.

use crate::atmosphere::{low_elevation_form, Attenuation, ModelWarnings, PreparedAtmosphere};
use crate::atmosphere::{Weather, LOW_ELEVATION_TOLERANCE_DEG};
use crate::noise::sky::sky_temperature_unchecked;

/// Largest error of an interpolated term against the direct computation, dB (for kelvin and the
/// transmissivity: the ratio in dB).
pub const TABLE_TOLERANCE_DB: f64 = 0.005;

/// Width of a grid's cells, deg: each cell is refined on its own.
pub const CELL_DEG: f64 = 0.25;

/// Most intervals of one cell (1/512 of a cell, 5e-4 deg): a cell that needs more (a jump of the
/// model inside it) is computed directly.
pub const MAX_INTERVALS_PER_CELL: usize = 1 << 9;

/// The elevation-only terms of one weather case at one elevation.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct PathTerms {
    /// Total attenuation of the path, dB.
    pub total_db: f64,
    /// Absorptive attenuation (without scintillation), dB.
    pub absorptive_db: f64,
    /// Sky brightness along the boresight (ITU-R P.618-14 eq. 69), K.
    pub sky_temperature_k: f64,
    /// Path transmissivity `10^(-A_abs/10)`.
    pub transmissivity: f64,
    /// The atmosphere models' warnings at this elevation.
    pub warnings: ModelWarnings,
}

impl PathTerms {
    /// The terms of one evaluation of the atmosphere, with the mean radiating temperature `tmr_k`
    /// and the background behind the atmosphere `background_k`.
    #[inline]
    pub fn of(att: &Attenuation, tmr_k: f64, background_k: f64) -> PathTerms {
        PathTerms {
            total_db: att.total_db,
            absorptive_db: att.absorptive_db,
            // Tsky = Tmr (1 - 10^(-A/10)) + Tbg 10^(-A/10)   (P.618-14 eq. 69)
            sky_temperature_k: sky_temperature_unchecked(att.absorptive_db, tmr_k, background_k),
            // tau = 10^(-A_abs/10)
            transmissivity: 10f64.powf(-att.absorptive_db / 10.0),
            warnings: att.warnings,
        }
    }

    fn row(&self) -> [f64; 4] {
        [
            self.total_db,
            self.absorptive_db,
            self.sky_temperature_k,
            self.transmissivity,
        ]
    }
}

/// One weather case's terms over elevation.
#[derive(Debug, Clone)]
pub struct PathTable {
    weather: Weather,
    atmosphere: PreparedAtmosphere,
    tmr_k: f64,
    background_k: f64,
    /// Below the 5 deg switch.
    low: Grid,
    /// From the 5 deg switch.
    high: Grid,
}

/// Cells of [`CELL_DEG`] over [`lo_deg`, `hi_deg`], each cut into its own number of equal
/// intervals (a power of two), linear interpolation inside each.
#[derive(Debug, Clone, PartialEq)]
struct Grid {
    lo_deg: f64,
    hi_deg: f64,
    cells_per_deg: f64,
    /// Per cell: index of its first row and its number of intervals.
    cells: Vec<(u32, u32)>,
    rows: Vec<[f64; 4]>,
    warnings: ModelWarnings,
}

impl Grid {
    /// The interpolated row, `None` in a cell left to the direct computation.
    #[inline]
    fn at(&self, elevation_deg: f64) -> Option<[f64; 4]> {
        let x = ((elevation_deg - self.lo_deg) * self.cells_per_deg).max(0.0);
        let c = (x as usize).min(self.cells.len() - 1);
        let (first, n) = self.cells[c];
        if n == 0 {
            return None;
        }
        let y = (x - c as f64).min(1.0) * n as f64;
        let i = (y as usize).min(n as usize - 1);
        let t = y - i as f64;
        let k = first as usize + i;
        let (a, b) = (&self.rows[k], &self.rows[k + 1]);
        Some([
            a[0] + t * (b[0] - a[0]),
            a[1] + t * (b[1] - a[1]),
            a[2] + t * (b[2] - a[2]),
            a[3] + t * (b[3] - a[3]),
        ])
    }

    /// The grid of [`lo`, `hi`] (module doc).
    fn build(f: &impl Fn(f64) -> PathTerms, lo: f64, hi: f64) -> Grid {
        let n_cells = ((hi - lo) / CELL_DEG).ceil().max(1.0) as usize;
        let width = (hi - lo) / n_cells as f64;
        let mut grid = Grid {
            lo_deg: lo,
            hi_deg: hi,
            cells_per_deg: 1.0 / width,
            cells: Vec::with_capacity(n_cells),
            rows: Vec::new(),
            warnings: f(0.5 * (lo + hi)).warnings,
        };
        for c in 0..n_cells {
            let a = lo + width * c as f64;
            let b = if c + 1 == n_cells { hi } else { a + width };
            // A cell that does not converge (a jump of the model inside it) stays direct.
            let rows = refine_cell(f, a, b).unwrap_or_default();
            let n = rows.len().saturating_sub(1) as u32;
            grid.cells.push((grid.rows.len() as u32, n));
            grid.rows.extend(rows);
        }
        grid
    }
}

/// The rows of one cell [`a`, `b`]: halve its intervals until, at the quarter, middle and
/// three-quarter point of each, linear interpolation is within a quarter of the tolerance of the
/// direct value. Each halving reuses the values already computed (the old midpoints become nodes,
/// the old quarter points midpoints).
fn refine_cell(f: &impl Fn(f64) -> PathTerms, a: f64, b: f64) -> Option<Vec<[f64; 4]>> {
    let at = |n: usize, j: f64| a + (b - a) * j / n as f64;
    let mut n = 1;
    let mut nodes = vec![f(a).row(), f(b).row()];
    let mut mids = vec![f(at(2, 1.0)).row()];
    loop {
        let mut ok = true;
        let mut quarters = Vec::with_capacity(2 * n);
        for i in 0..n {
            let (x0, x1) = (&nodes[i], &nodes[i + 1]);
            let lin = |t: f64| std::array::from_fn::<f64, 4, _>(|k| x0[k] + t * (x1[k] - x0[k]));
            let q1 = f(at(4 * n, 4.0 * i as f64 + 1.0)).row();
            let q3 = f(at(4 * n, 4.0 * i as f64 + 3.0)).row();
            let target = 0.25 * TABLE_TOLERANCE_DB;
            ok &= row_error_db(&lin(0.25), &q1) <= target
                && row_error_db(&lin(0.5), &mids[i]) <= target
                && row_error_db(&lin(0.75), &q3) <= target;
            quarters.push(q1);
            quarters.push(q3);
        }
        if ok {
            return Some(nodes);
        }
        if 2 * n > MAX_INTERVALS_PER_CELL {
            return None;
        }
        let mut next = Vec::with_capacity(2 * n + 1);
        for i in 0..n {
            next.push(nodes[i]);
            next.push(mids[i]);
        }
        next.push(nodes[n]);
        nodes = next;
        mids = quarters;
        n *= 2;
    }
}

/// The largest error of a row against the direct one, dB: attenuation as a difference, the sky
/// temperature and the transmissivity as a ratio.
pub fn row_error_db(table: &[f64; 4], direct: &[f64; 4]) -> f64 {
    let ratio_db = |a: f64, b: f64| {
        if a == b {
            0.0
        } else if a > 0.0 && b > 0.0 {
            (10.0 * (a / b).log10()).abs()
        } else {
            f64::INFINITY
        }
    };
    (table[0] - direct[0])
        .abs()
        .max((table[1] - direct[1]).abs())
        .max(ratio_db(table[2], direct[2]))
        .max(ratio_db(table[3], direct[3]))
}

/// Upper end of the low grid: just below the 5 deg switch (an elevation from
/// `5 - LOW_ELEVATION_TOLERANCE_DEG` on takes the >= 5 deg forms).
const LOW_END_DEG: f64 = 5.0 - LOW_ELEVATION_TOLERANCE_DEG - 1e-9;

impl PathTable {
    /// Tabulate `weather` for the station's atmosphere, mean radiating temperature `tmr_k` and
    /// background `background_k` (see the module doc).
    pub fn build(
        atmosphere: &PreparedAtmosphere,
        weather: Weather,
        tmr_k: f64,
        background_k: f64,
    ) -> PathTable {
        let f = |el: f64| PathTerms::of(&atmosphere.at(el, weather), tmr_k, background_k);
        let switch_deg = 5.0 - LOW_ELEVATION_TOLERANCE_DEG;
        PathTable {
            weather,
            atmosphere: *atmosphere,
            tmr_k,
            background_k,
            low: Grid::build(&f, 0.0, LOW_END_DEG),
            high: Grid::build(&f, switch_deg, 90.0),
        }
    }

    pub fn weather(&self) -> Weather {
        self.weather
    }

    /// Rows of the grids below and from the 5 deg switch.
    pub fn rows(&self) -> (usize, usize) {
        (self.low.rows.len(), self.high.rows.len())
    }

    /// Cells left to the direct computation (a jump of the model inside them), deg each
    /// [`CELL_DEG`] wide.
    pub fn direct_cells(&self) -> usize {
        [&self.low, &self.high]
            .iter()
            .map(|g| g.cells.iter().filter(|c| c.1 == 0).count())
            .sum()
    }

    /// The terms computed directly (no table; what the table approximates).
    pub fn direct(&self, elevation_deg: f64) -> PathTerms {
        PathTerms::of(
            &self.atmosphere.at(elevation_deg, self.weather),
            self.tmr_k,
            self.background_k,
        )
    }

    /// The terms at `elevation_deg`: interpolated inside 0-90 deg, direct outside and in a
    /// direct cell. Allocates nothing.
    #[inline]
    pub fn at(&self, elevation_deg: f64) -> PathTerms {
        if !(0.0..=90.0).contains(&elevation_deg) {
            return self.direct(elevation_deg);
        }
        let grid = if low_elevation_form(elevation_deg) {
            &self.low
        } else {
            &self.high
        };
        let e = elevation_deg.clamp(grid.lo_deg, grid.hi_deg);
        let Some([total_db, absorptive_db, sky_temperature_k, transmissivity]) = grid.at(e) else {
            return self.direct(elevation_deg);
        };
        PathTerms {
            total_db,
            absorptive_db,
            sky_temperature_k,
            transmissivity,
            warnings: grid.warnings,
        }
    }
}

/// A station's path tables: clear sky and, once prepared, the availability case.
#[derive(Debug, Clone)]
pub struct PathTables {
    clear: PathTable,
    availability: Option<PathTable>,
}

impl PathTables {
    /// The clear-sky table.
    pub fn new(atmosphere: &PreparedAtmosphere, tmr_k: f64, background_k: f64) -> Self {
        Self {
            clear: PathTable::build(atmosphere, Weather::ClearSky, tmr_k, background_k),
            availability: None,
        }
    }

    /// Build the table of `weather` (the availability case), replacing any other.
    pub fn prepare_weather(&mut self, weather: Weather) {
        let done = self.availability.as_ref().map(|t| t.weather) == Some(weather);
        if weather != Weather::ClearSky && !done {
            let c = &self.clear;
            self.availability = Some(PathTable::build(
                &c.atmosphere,
                weather,
                c.tmr_k,
                c.background_k,
            ));
        }
    }

    /// The table of `weather`; `None` when it was not prepared.
    #[inline]
    pub fn table(&self, weather: Weather) -> Option<&PathTable> {
        match (weather, &self.availability) {
            (Weather::ClearSky, _) => Some(&self.clear),
            (w, Some(t)) if t.weather == w => Some(t),
            _ => None,
        }
    }
}

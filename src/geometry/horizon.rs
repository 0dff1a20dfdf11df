//! Azimuth-dependent elevation mask (terrain/obstruction profile plus a minimum elevation).
//!
//! limit(az) = max(min_elevation, piecewise-linear interpolation of the (azimuth, elevation)
//! points in azimuth, wrapping from the last point back to the first through 360 deg).
//! With no points the mask is flat at the minimum elevation. Common practice (no standard).

/// An invalid mask.
#[derive(Debug, Clone, PartialEq, thiserror::Error)]
pub enum HorizonError {
    #[error("minimum elevation {value} deg is outside [-90, 90]")]
    MinElevation { value: f64 },
    #[error("mask point {index}: azimuth {azimuth_deg} deg is outside [0, 360)")]
    Azimuth { index: usize, azimuth_deg: f64 },
    #[error("mask point {index}: elevation {elevation_deg} deg is outside [-90, 90]")]
    Elevation { index: usize, elevation_deg: f64 },
    #[error("mask points {first} and {second} have the same azimuth {azimuth_deg} deg")]
    DuplicateAzimuth {
        first: usize,
        second: usize,
        azimuth_deg: f64,
    },
}

/// Elevation mask: a minimum elevation and an optional azimuth profile.
#[derive(Debug, Clone, PartialEq)]
pub struct HorizonMask {
    min_elevation_deg: f64,
    /// (azimuth deg, elevation deg), sorted by azimuth, unique azimuths.
    points: Vec<[f64; 2]>,
    /// Lowest profile elevation (a vertex), kept so that no call per search scans the points.
    lowest_point_deg: Option<f64>,
    /// Highest profile elevation, kept for the same reason.
    highest_point_deg: Option<f64>,
}

impl HorizonMask {
    /// Build a mask; points are `[azimuth_deg, elevation_deg]` in any order (sorted here).
    pub fn new(min_elevation_deg: f64, points: Vec<[f64; 2]>) -> Result<HorizonMask, HorizonError> {
        if !(-90.0..=90.0).contains(&min_elevation_deg) {
            return Err(HorizonError::MinElevation {
                value: min_elevation_deg,
            });
        }
        for (index, p) in points.iter().enumerate() {
            if !(0.0..360.0).contains(&p[0]) {
                return Err(HorizonError::Azimuth {
                    index,
                    azimuth_deg: p[0],
                });
            }
            if !(-90.0..=90.0).contains(&p[1]) {
                return Err(HorizonError::Elevation {
                    index,
                    elevation_deg: p[1],
                });
            }
        }
        let mut indexed: Vec<(usize, [f64; 2])> = points.into_iter().enumerate().collect();
        indexed.sort_by(|a, b| a.1[0].total_cmp(&b.1[0]));
        for w in indexed.windows(2) {
            if w[0].1[0] == w[1].1[0] {
                return Err(HorizonError::DuplicateAzimuth {
                    first: w[0].0.min(w[1].0),
                    second: w[0].0.max(w[1].0),
                    azimuth_deg: w[0].1[0],
                });
            }
        }
        let points: Vec<[f64; 2]> = indexed.into_iter().map(|(_, p)| p).collect();
        let lowest_point_deg = points.iter().map(|p| p[1]).reduce(f64::min);
        let highest_point_deg = points.iter().map(|p| p[1]).reduce(f64::max);
        Ok(HorizonMask {
            min_elevation_deg,
            points,
            lowest_point_deg,
            highest_point_deg,
        })
    }

    /// A flat mask at `min_elevation_deg`.
    pub fn flat(min_elevation_deg: f64) -> Result<HorizonMask, HorizonError> {
        HorizonMask::new(min_elevation_deg, Vec::new())
    }

    pub fn min_elevation_deg(&self) -> f64 {
        self.min_elevation_deg
    }

    /// The profile points, sorted by azimuth.
    pub fn points(&self) -> &[[f64; 2]] {
        // Whoever takes the slice is counted as visiting every point.
        #[cfg(test)]
        work::add(self.points.len());
        &self.points
    }

    /// Interpolated profile at `azimuth_deg` and the slope (deg per deg of azimuth) there:
    /// O(log n) in the number of points (binary search for the segment holding the azimuth).
    fn profile(&self, azimuth_deg: f64) -> Option<(f64, f64)> {
        let pts = &self.points;
        match pts.len() {
            0 => None,
            1 => Some((pts[0][1], 0.0)),
            len => {
                // One evaluation: the binary search visits about log2(len) points, then the
                // segment's two.
                #[cfg(test)]
                {
                    work::evaluation();
                    work::add((usize::BITS - len.leading_zeros()) as usize + 2);
                }
                let az = super::wrap360_deg(azimuth_deg);
                // First point with azimuth > az.
                let i = pts.partition_point(|p| p[0] <= az);
                let (a, b) = if i == 0 || i == len {
                    // Wrap segment from the last point to the first (+360).
                    let a = pts[len - 1];
                    let b = [pts[0][0] + 360.0, pts[0][1]];
                    let az = if az < a[0] { az + 360.0 } else { az };
                    let slope = (b[1] - a[1]) / (b[0] - a[0]);
                    return Some((a[1] + slope * (az - a[0]), slope));
                } else {
                    (pts[i - 1], pts[i])
                };
                let slope = (b[1] - a[1]) / (b[0] - a[0]);
                Some((a[1] + slope * (az - a[0]), slope))
            }
        }
    }

    /// Mask elevation at `azimuth_deg`: max(min elevation, interpolated profile).
    pub fn limit_deg(&self, azimuth_deg: f64) -> f64 {
        match self.profile(azimuth_deg) {
            Some((el, _)) => el.max(self.min_elevation_deg),
            None => self.min_elevation_deg,
        }
    }

    /// Slope of [`Self::limit_deg`] in deg per deg of azimuth (0 where the minimum governs).
    pub fn slope_deg_per_deg(&self, azimuth_deg: f64) -> f64 {
        match self.profile(azimuth_deg) {
            Some((el, s)) if el > self.min_elevation_deg => s,
            _ => 0.0,
        }
    }

    /// The limit depends on azimuth (some profile point lies above the minimum elevation); a
    /// pass search needs the azimuth of each sample only then. O(1).
    pub fn needs_azimuth(&self) -> bool {
        self.highest_point_deg
            .is_some_and(|highest| highest > self.min_elevation_deg)
    }

    /// Lowest mask elevation over all azimuths (the profile's minimum is at a vertex; kept from
    /// construction, O(1)).
    pub fn lowest_limit_deg(&self) -> f64 {
        #[cfg(test)]
        work::add(1);
        match self.lowest_point_deg {
            Some(lowest) => lowest.max(self.min_elevation_deg),
            None => self.min_elevation_deg,
        }
    }
}

/// Unit tests only: how many profile points the mask visits (per thread), to check that a pass
/// search's work grows with the log of the number of points, not with it. Compiled out of every
/// other build.
#[cfg(test)]
pub(crate) mod work {
    use std::cell::Cell;

    thread_local! {
        static POINTS_VISITED: Cell<usize> = const { Cell::new(0) };
        static EVALUATIONS: Cell<usize> = const { Cell::new(0) };
    }

    pub(crate) fn add(n: usize) {
        POINTS_VISITED.with(|c| c.set(c.get() + n));
    }

    pub(crate) fn evaluation() {
        EVALUATIONS.with(|c| c.set(c.get() + 1));
    }

    /// (profile evaluations, points visited) since the last call, and reset both.
    pub(crate) fn take() -> (usize, usize) {
        (
            EVALUATIONS.with(|c| c.replace(0)),
            POINTS_VISITED.with(|c| c.replace(0)),
        )
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    /// (profile evaluations, points visited, passes found) of a pass search of the shipped
    /// satellite over `days` from 2026-12-01 12:00 UTC with a rough terrain profile of `n` points.
    fn search_work(n: usize, days: i64) -> (usize, usize, usize) {
        let sets = crate::orbit::load_elements(std::path::Path::new("examples/sat.tle")).unwrap();
        let prop = crate::orbit::Propagator::new(&sets[0]).unwrap();
        let obs = crate::geometry::Observer::new(45.5, -120.3, 600.0).unwrap();
        let points = (0..n)
            .map(|i| {
                let az = 360.0 * i as f64 / n as f64;
                // A rough ridge: a 0-4 deg ripple (deterministic hash of the index) on a 2-8 deg
                // wave, so that more points also make the profile rougher.
                let ripple = ((i as u64).wrapping_mul(0x9e37_79b9_7f4a_7c15) >> 40) as f64
                    / (1u64 << 24) as f64;
                [az, 5.0 + 3.0 * (az.to_radians() * 7.0).sin() + 4.0 * ripple]
            })
            .collect();
        let mask = HorizonMask::new(0.0, points).unwrap();
        let start = crate::timefmt::utc(2026, 12, 1, 12, 0, 0);
        work::take();
        let found = crate::geometry::find_passes(
            &prop,
            &obs,
            &mask,
            start,
            start + chrono::Duration::days(days),
        );
        let (evaluations, points) = work::take();
        (evaluations, points, found.passes.len())
    }

    /// Item 9 of the hardening issue (a 10,000-point terrain profile made the pass search grow
    /// faster than linearly): the search's work is counted, not timed. With 10,000 points it
    /// evaluates the mask about as often as with 360 (the step does not shrink with the number of
    /// points), each evaluation visits about log2 n points (binary search, no scan), and the work
    /// grows linearly with the window. A scan of the points per evaluation would multiply the
    /// points visited by about 600; per search, add 10,000.
    #[test]
    fn pass_search_work_grows_with_log_points_and_linearly_with_days() {
        let (e360, w360, p360) = search_work(360, 3);
        let (e10k, w10k, p10k) = search_work(10_000, 3);
        assert!(p360 > 5 && p10k > 5, "{p360} {p10k}");
        assert!(
            (e10k as f64) < 1.5 * e360 as f64,
            "{e360} -> {e10k} evaluations"
        );
        // log2(10000)+2 over log2(360)+2, times the evaluations' ratio.
        let per_evaluation = (w10k as f64 / e10k as f64) / (w360 as f64 / e360 as f64);
        assert!(
            per_evaluation < 16.0 / 11.0 + 0.01,
            "{w360} -> {w10k} points"
        );
        assert!(w10k < 12_000 + 2 * w360, "{w360} -> {w10k} points visited");
        let (_, w10k_6, _) = search_work(10_000, 6);
        let per_day = w10k_6 as f64 / w10k as f64;
        assert!((1.6..2.4).contains(&per_day), "{w10k} -> {w10k_6}");
    }

    #[test]
    fn interpolates_and_wraps() {
        let m = HorizonMask::new(5.0, vec![[90.0, 20.0], [350.0, 10.0], [10.0, 10.0]]).unwrap();
        assert_eq!(m.points()[0], [10.0, 10.0]);
        assert!((m.limit_deg(50.0) - 15.0).abs() < 1e-12);
        assert!((m.limit_deg(0.0) - 10.0).abs() < 1e-12);
        assert!((m.limit_deg(355.0) - 10.0).abs() < 1e-12);
        // 90 -> 350 (260 deg), 20 -> 10: at 220, 20 - 10*130/260 = 15.
        assert!((m.limit_deg(220.0) - 15.0).abs() < 1e-12);
        assert_eq!(m.lowest_limit_deg(), 10.0);
        assert!(HorizonMask::new(0.0, vec![[360.0, 1.0]]).is_err());
        assert!(HorizonMask::new(0.0, vec![[10.0, 1.0], [10.0, 2.0]]).is_err());
        assert!(HorizonMask::flat(95.0).is_err());
    }
}

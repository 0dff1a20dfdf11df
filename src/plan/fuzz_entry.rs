//! Fuzz entry point for the planner: the body of the cargo-fuzz target `plan` in `fuzz/` and of
//! the stable-toolchain corpus replay test (`tests/suite/fuzz_replay.rs`), so both run the same
//! code; [`plan_violations`] is also what the property tests check every random plan against.
//!
//! The input is UTF-8 text cut into parts at each [`SEPARATOR`] line: the first part is a mission
//! file, the last (when there are two parts or more) an element file (TLE, OMM JSON or KVN), and
//! any parts between are station files (at most [`MAX_STATIONS`], replacing the mission's own).
//! The mission is read as if it were a file of the shipped example's `examples/` folder
//! ([`crate::config::fuzz_entry::fixture_dir`]), so `../stations/nordkam.yaml` and `sat.tle`
//! resolve. Each run is kept short: the window is cut to one day from the mission's start, the
//! step is at least 1 s, and inputs whose window holds more than [`MAX_PASSES`] passes are skipped.
//!
//! Errors are expected and ignored. The properties under test: no input panics, and every plan
//! that comes out passes [`plan_violations`] (every number finite; fixed and adaptive <= Shannon,
//! fixed <= adaptive where the adaptive mode dominates).

use super::results::{ModeResult, PassSeries, Plan};
use super::sink::PassSink;
use super::window::{Window, WindowRequest};
use super::{PlanRequest, Planner};
use crate::config::fuzz_entry::{fixture_dir, mission_path};
use crate::config::mission::Mission;
use crate::config::station::Station;
use crate::geometry::find_passes;
use crate::orbit::Propagator;
use std::sync::atomic::{AtomicU64, Ordering};
use std::sync::Mutex;

/// The line that separates the parts of an input (a YAML comment, so a part stays valid YAML).
pub const SEPARATOR: &str = "\n#%%\n";

/// Most stations taken from an input.
pub const MAX_STATIONS: usize = 3;

/// Inputs whose one-day window holds more passes than this (over all stations) are skipped.
pub const MAX_PASSES: usize = 50;

/// Longest window planned, days.
pub const MAX_DAYS: f64 = 1.0;

/// Shortest step planned, s.
pub const MIN_STEP_S: f64 = 1.0;

/// Relative slack of the volume ordering checks (sums of the same seconds in another order).
const VOLUME_RELATIVE_SLACK: f64 = 1e-9;

/// Fuzz target `plan`: the input's mission, stations and elements through a one-day plan.
pub fn plan(data: &[u8]) {
    let _ = planned(data);
}

/// The body of [`plan`]: the plan of an input, checked (a violation of [`plan_violations`] or a
/// step that is not finite panics), or `None` when the input is refused or skipped.
pub fn planned(data: &[u8]) -> Option<Plan> {
    let text = std::str::from_utf8(data).ok()?;
    let (mission, written) = mission_from_parts(text)?;
    let request = short_request(&mission, data.len() % 2 == 1)?;
    // The planner reads the element file here and not again.
    let planner = Planner::new(&mission, &request);
    drop(written);
    let planner = planner.ok()?;
    if count_passes(&planner) > MAX_PASSES {
        return None;
    }
    let sink = CheckSteps::default();
    let plan = planner.run(&sink).ok()?;
    let mut problems = sink.problems.into_inner().unwrap_or_default();
    problems.extend(plan_violations(&plan));
    assert!(problems.is_empty(), "{}", problems.join("\n"));
    Some(plan)
}

/// A file written for one input, removed when dropped.
struct Written(Option<std::path::PathBuf>);

impl Drop for Written {
    fn drop(&mut self) {
        if let Some(p) = &self.0 {
            let _ = std::fs::remove_file(p);
        }
    }
}

/// The mission of an input, with its stations and element file replaced by the input's parts
/// (and the element file written for it).
fn mission_from_parts(text: &str) -> Option<(Mission, Written)> {
    let mut parts: Vec<&str> = text.split(SEPARATOR).collect();
    let elements = if parts.len() > 1 { parts.pop() } else { None };
    let dir = fixture_dir()?;
    let mut mission = Mission::from_yaml(&mission_path()?, parts[0]).ok()?;
    let mut stations: Vec<Station> = Vec::new();
    for (i, part) in parts[1..].iter().take(MAX_STATIONS).enumerate() {
        let path = dir.join(format!("fuzz-station-{i}.yaml"));
        if let Ok(s) = Station::from_yaml(&path, part) {
            // The mission file refuses two stations of one name; so do we.
            if stations.iter().all(|b| b.name != s.name) {
                stations.push(s);
            }
        }
    }
    if !stations.is_empty() {
        mission.stations = stations;
    }
    mission.stations.truncate(MAX_STATIONS);
    let mut written = Written(None);
    if let Some(elements) = elements {
        // One file per call: replay tests call this from several threads at once, and processes
        // share the fixture folder.
        static CALLS: AtomicU64 = AtomicU64::new(0);
        let n = CALLS.fetch_add(1, Ordering::Relaxed);
        let path = dir.join(format!("fuzz-elements-{}-{n}.txt", std::process::id()));
        written.0 = Some(path.clone());
        std::fs::write(&path, elements).ok()?;
        mission.elements_path = path;
    }
    Some((mission, written))
}

/// The mission's own window cut to [`MAX_DAYS`], its step raised to [`MIN_STEP_S`].
fn short_request(mission: &Mission, tradeoff: bool) -> Option<PlanRequest> {
    let window = Window::resolve(&WindowRequest::default(), Some(mission)).ok()?;
    Some(PlanRequest {
        window: WindowRequest {
            start: Some(window.start()),
            end: None,
            days: Some(window.days().min(MAX_DAYS)),
        },
        step_s: Some(mission.step_s.max(MIN_STEP_S)),
        search_floor_deg: tradeoff.then_some(0.0),
        // the fuzzer's windows may lie anywhere: plan them all
        allow_stale_elements: true,
        ..Default::default()
    })
}

/// Passes over all stations in the planner's window (the same search the planner runs).
fn count_passes(planner: &Planner) -> usize {
    let Ok(propagator) = Propagator::new(planner.elements()) else {
        return 0;
    };
    let w = planner.window();
    planner
        .stations()
        .iter()
        .map(|s| find_passes(&propagator, &s.observer, &s.mask, w.start(), w.end()))
        .map(|s| s.passes.len())
        .sum()
}

/// A sink that checks every step of every pass is finite, and keeps what it found.
#[derive(Default)]
pub struct CheckSteps {
    pub problems: Mutex<Vec<String>>,
}

impl PassSink for CheckSteps {
    type Error = std::convert::Infallible;
    fn pass(&self, series: &PassSeries<'_>) -> Result<(), Self::Error> {
        let mut found = Vec::new();
        for (i, s) in series.steps.iter().enumerate() {
            let rain = s.rain.map_or([0.0; 8], |r| {
                [
                    r.atmospheric_loss_db,
                    r.sky_noise_k,
                    r.ground_noise_k,
                    r.sun_noise_k,
                    r.moon_noise_k,
                    r.antenna_temperature_k,
                    r.system_temperature_k,
                    r.cn0_dbhz,
                ]
            });
            let values = [
                s.t_s,
                s.weight_s,
                s.azimuth_deg,
                s.elevation_deg,
                s.range_km,
                s.range_rate_km_s,
                s.doppler_hz,
                s.off_nadir_deg,
                s.eirp_dbw,
                s.free_space_loss_db,
                s.atmospheric_loss_db,
                s.sky_temperature_k,
                s.sky_noise_k,
                s.ground_noise_k,
                s.man_made_noise_k,
                s.sun_noise_k,
                s.moon_noise_k,
                s.sun_separation_deg.unwrap_or(0.0),
                s.moon_separation_deg.unwrap_or(0.0),
                s.receiver_noise_k,
                s.antenna_temperature_k,
                s.system_temperature_k,
                s.g_over_t_db_k,
                s.cn0_dbhz,
            ];
            if values.iter().chain(rain.iter()).any(|v| !v.is_finite()) {
                found.push(format!("pass {} step {i}: {s:?}", series.plan.number));
            }
        }
        if !found.is_empty() {
            if let Ok(mut p) = self.problems.lock() {
                p.extend(found);
            }
        }
        Ok(())
    }
}

/// Everything wrong with a plan: numbers that are not finite (in passes, totals, days, usable
/// masks and mask accumulators), and passes where fixed and adaptive <= Shannon (and fixed <=
/// adaptive where [`Plan::adaptive_dominates`]) do not hold.
/// Empty for a sound plan.
pub fn plan_violations(plan: &Plan) -> Vec<String> {
    let mut out = Vec::new();
    for p in &plan.passes {
        let g = &p.pass;
        let geometry = [
            g.max_elevation_deg,
            g.aos_azimuth_deg,
            g.tca_azimuth_deg,
            g.los_azimuth_deg,
            g.min_range_km,
        ];
        finite(&mut out, &format!("pass {} geometry", p.number), &geometry);
        let d = plan.adaptive_dominates;
        mode(&mut out, &format!("pass {} clear", p.number), &p.clear, d);
        if let Some(rain) = &p.rain {
            mode(&mut out, &format!("pass {} rain", p.number), rain, d);
        }
        for s in &p.segments {
            let what = format!("pass {} segment", p.number);
            finite(&mut out, &what, &[s.start_s, s.end_s, s.rate_bps]);
        }
    }
    totals(&mut out, plan);
    for m in plan
        .station_masks
        .iter()
        .chain(plan.tradeoff_masks.iter().flatten())
    {
        mask(&mut out, "station mask", m);
    }
    for u in &plan.usable_masks {
        let what = format!("usable mask of station {}", u.station_index);
        finite(&mut out, &what, &[u.station_mask_deg]);
        finite(&mut out, &what, u.usable_mask_deg.as_slice());
        for f in &u.failures {
            let what = format!("pass {} highest open step", f.pass_number);
            finite(&mut out, &what, &[f.step.elevation_deg, f.step.t_s]);
        }
    }
    out
}

/// The window totals and the per-day totals.
fn totals(out: &mut Vec<String>, plan: &Plan) {
    let t = &plan.totals;
    let values = [
        t.contact_s,
        t.closed_s,
        t.volume_bits,
        t.adaptive_volume_bits,
        t.shannon_volume_bits,
        t.network.volume_bits,
        t.network.contact_s,
        t.days,
        t.single_rate.map_or(0.0, |s| s.1),
        t.fixed_efficiency(),
        t.adaptive_efficiency(),
    ];
    finite(out, "totals", &values);
    ordered(
        out,
        "totals",
        plan.adaptive_dominates,
        t.volume_bits,
        t.adaptive_volume_bits,
        t.shannon_volume_bits,
    );
    if let Some(r) = &t.rain {
        finite(
            out,
            "rain totals",
            &[r.volume_bits, r.adaptive_volume_bits, r.shannon_volume_bits],
        );
    }
    for d in &plan.days {
        let what = format!("day {}", d.date);
        let values = [
            d.contact_s,
            d.volume_bits,
            d.adaptive_volume_bits,
            d.shannon_volume_bits,
            d.rain_volume_bits.unwrap_or(0.0),
        ];
        finite(out, &what, &values);
    }
}

/// One mode result: finite numbers, and the volumes in order ([`ordered`]).
fn mode(out: &mut Vec<String>, what: &str, m: &ModeResult, dominates: bool) {
    let values = [
        m.min_margin_db.unwrap_or(0.0),
        m.max_ebn0_db,
        m.closed_s,
        m.volume_bits,
        m.adaptive_volume_bits,
        m.shannon_volume_bits,
    ];
    finite(out, what, &values);
    if let Some(c) = &m.closing {
        let angles = [
            c.from.elevation_deg,
            c.from.azimuth_deg,
            c.until.elevation_deg,
            c.until.azimuth_deg,
        ];
        finite(out, &format!("{what} closing"), &angles);
    }
    ordered(
        out,
        what,
        dominates,
        m.volume_bits,
        m.adaptive_volume_bits,
        m.shannon_volume_bits,
    );
}

/// Contact and volume bins finite; the highest open elevation finite or -inf (never closed open).
fn mask(out: &mut Vec<String>, what: &str, m: &super::mask::MaskAccumulator) {
    finite(out, &format!("{what} contact"), &m.contact_bins_s);
    for bins in &m.volume_bins_bits {
        finite(out, &format!("{what} volume"), bins);
    }
    let open = m.highest_open_elevation_deg.iter();
    if open.clone().any(|v| v.is_nan() || *v == f64::INFINITY) {
        out.push(format!(
            "{what}: highest open elevation {:?}",
            m.highest_open_elevation_deg
        ));
    }
}

fn finite(out: &mut Vec<String>, what: &str, values: &[f64]) {
    if values.iter().any(|v| !v.is_finite()) {
        out.push(format!("{what}: not finite in {values:?}"));
    }
}

/// fixed <= Shannon and adaptive <= Shannon, up to rounding of the sums; and fixed <= adaptive
/// where the adaptive mode `dominates` (every ladder rate, switching at no cost).
fn ordered(
    out: &mut Vec<String>,
    what: &str,
    dominates: bool,
    fixed: f64,
    adaptive: f64,
    shannon: f64,
) {
    let slack = |v: f64| VOLUME_RELATIVE_SLACK * v.abs() + 1e-6;
    if dominates && fixed > adaptive + slack(adaptive) {
        out.push(format!(
            "{what}: fixed {fixed} <= adaptive {adaptive} does not hold"
        ));
    }
    if fixed > shannon + slack(shannon) || adaptive > shannon + slack(shannon) {
        out.push(format!(
            "{what}: fixed {fixed} and adaptive {adaptive} <= Shannon {shannon} does not hold"
        ));
    }
}

//! Pass-by-pass planning: the budget over every pass, rate choice, usable mask, volumes.
//!
//! [`run`] finds the passes of every station, then follows each pass step by step
//! ([`series::fill_pass`]), chooses the fixed rate ([`rate::choose_fixed`]) and the adaptive
//! schedule ([`rate::adaptive_schedule`]), integrates Shannon's bound, and accumulates the mask
//! trade-off ([`mask`]). Passes are independent, so they run in parallel (rayon); each pass's
//! time series lives only while its pass is evaluated and is handed to a caller's sink (which
//! writes the CSV and the charts), so memory does not grow with the window.

pub mod mask;
pub mod network;
pub mod prepare;
pub mod rate;
pub mod series;

use crate::atmosphere::Weather;
use crate::geometry::{find_passes, Pass};
use crate::link::budget::RateSpec;
use crate::orbit::{ElementSet, PropagationError, Propagator};
use crate::timefmt::{add_seconds, seconds_between};
use chrono::{DateTime, Utc};
use mask::MaskAccumulator;
use network::Segment;
use prepare::{RateSet, StationModel};
use rate::{adaptive_schedule, choose_fixed, kept_runs, switch_count, RateOption};
use rayon::prelude::*;
use series::{fill_pass, PassWarnings, SeriesError, Step};

/// What to plan.
pub struct PlanInput<'a> {
    pub elements: &'a ElementSet,
    pub stations: &'a [StationModel],
    pub rates: &'a RateSet,
    pub start: DateTime<Utc>,
    pub end: DateTime<Utc>,
    pub step_s: f64,
    /// Availability case: rain exceeded this percentage of an average year.
    pub rain: Option<Weather>,
    pub frequency_hz: f64,
}

/// Results of one mode (fixed-rate choice, adaptive, Shannon) for one weather case of a pass.
#[derive(Debug, Clone, PartialEq)]
pub struct ModeResult {
    /// Chosen ladder option, or `None` when no rate closes for the dwell time.
    pub option: Option<usize>,
    pub rate_bps: Option<f64>,
    pub scheme: Option<String>,
    pub closes_from: Option<DateTime<Utc>>,
    pub closes_until: Option<DateTime<Utc>>,
    pub closes_from_elevation_deg: Option<f64>,
    pub closes_until_elevation_deg: Option<f64>,
    pub closes_from_azimuth_deg: Option<f64>,
    pub closes_until_azimuth_deg: Option<f64>,
    /// Lowest margin over the counted seconds of the chosen rate, dB.
    pub min_margin_db: Option<f64>,
    /// Highest Eb/N0 of the pass at the chosen rate (at the lowest ladder rate if none closes), dB.
    pub max_ebn0_db: f64,
    pub closed_s: f64,
    pub volume_bits: f64,
    pub adaptive_volume_bits: f64,
    pub adaptive_switches: usize,
    pub shannon_volume_bits: f64,
    /// Volume each ladder rate would bring in this pass, bits.
    pub volume_by_rate_bits: Vec<f64>,
}

/// The plan of one pass.
#[derive(Debug, Clone)]
pub struct PassPlan {
    /// 1-based number in AOS order over all stations.
    pub number: usize,
    pub station_index: usize,
    pub pass: Pass,
    pub clear: ModeResult,
    pub rain: Option<ModeResult>,
    /// Fixed-rate closed intervals (clear sky), seconds from the window start, for the network total.
    pub segments: Vec<Segment>,
    pub mask: MaskAccumulator,
    pub warnings: PassWarnings,
    pub steps: usize,
}

/// The callback that receives each pass with its time series (writes files, draws charts).
pub type PassSink<'a> = dyn Fn(&PassSeries) -> Result<(), String> + Sync + 'a;

/// Everything the sink gets for one pass: the plan and its time series.
pub struct PassSeries<'a> {
    pub plan: &'a PassPlan,
    pub steps: &'a [Step],
    /// Adaptive option index per step (clear sky), into `RateSet::adaptive`.
    pub adaptive: &'a [Option<u16>],
    /// Counted runs (step indices, inclusive) of the chosen fixed rate; empty when none closes.
    pub chosen_runs: &'a [(usize, usize)],
}

/// Error of a plan run.
#[derive(Debug, Clone, PartialEq, thiserror::Error)]
pub enum PlanError {
    #[error("pass {number} at {station}: {source}")]
    Pass {
        number: usize,
        station: String,
        source: SeriesError,
    },
    #[error("{0}")]
    Sink(String),
    #[error("{0}")]
    Setup(String),
}

/// The plan of a window.
#[derive(Debug, Clone)]
pub struct Plan {
    pub passes: Vec<PassPlan>,
    /// Per station: the pass search stopped early (propagation error), with the error.
    pub stopped: Vec<Option<PropagationError>>,
    pub propagations_search: u64,
    /// Mask accumulators per station (merged over its passes).
    pub station_masks: Vec<MaskAccumulator>,
    pub network_volume_bits: f64,
    pub network_contact_s: f64,
    /// The availability (rain) case was planned.
    pub rain_planned: bool,
    /// The planning window.
    pub start: DateTime<Utc>,
    pub end: DateTime<Utc>,
}

/// Per-thread scratch buffers: reused across passes so the per-step loop allocates nothing.
struct Scratch {
    /// Each worker builds its own propagator (it keeps mutable state and is not `Sync`).
    prop: Result<Propagator, PropagationError>,
    steps: Vec<Step>,
    cn0: Vec<f64>,
    weights: Vec<f64>,
    schedule: Vec<Option<u16>>,
    runs: Vec<(usize, usize)>,
}

/// Plan every pass of every station. `sink` receives each pass and its time series as soon as it is
/// computed (from worker threads, in no particular order); `progress` is called once per pass
/// with the number of passes to plan.
pub fn run(
    input: &PlanInput,
    sink: &(dyn Fn(&PassSeries) -> Result<(), String> + Sync),
    progress: &(dyn Fn(usize) + Sync),
) -> Result<Plan, PlanError> {
    let propagator =
        Propagator::new(input.elements).map_err(|e| PlanError::Setup(e.to_string()))?;
    let mut found: Vec<(usize, Pass)> = Vec::new();
    let mut stopped = Vec::new();
    let mut propagations_search = 0;
    for (i, st) in input.stations.iter().enumerate() {
        let s = find_passes(&propagator, &st.observer, &st.mask, input.start, input.end);
        propagations_search += s.propagations;
        stopped.push(s.stopped);
        found.extend(s.passes.into_iter().map(|p| (i, p)));
    }
    found.sort_by(|a, b| a.1.aos.cmp(&b.1.aos).then(a.0.cmp(&b.0)));
    let reference = *input
        .rates
        .ladder_specs
        .first()
        .ok_or_else(|| PlanError::Setup("the rate ladder is empty".into()))?;
    if input.rates.adaptive.is_empty() || !(input.step_s.is_finite() && input.step_s > 0.0) {
        return Err(PlanError::Setup(
            "the plan needs at least one rate and a step above zero".into(),
        ));
    }
    let total = found.len();
    let results: Vec<Result<PassPlan, PlanError>> = found
        .par_iter()
        .enumerate()
        .map_init(
            || Scratch {
                prop: Propagator::new(input.elements),
                steps: Vec::new(),
                cn0: Vec::new(),
                weights: Vec::new(),
                schedule: Vec::new(),
                runs: Vec::new(),
            },
            |scratch, (k, (si, pass))| {
                let r = plan_pass(input, k + 1, *si, pass, reference, scratch, sink);
                progress(total);
                r
            },
        )
        .collect();
    let passes = results.into_iter().collect::<Result<Vec<_>, _>>()?;
    let mut station_masks: Vec<MaskAccumulator> = input
        .stations
        .iter()
        .map(|_| MaskAccumulator::new(input.rates.ladder.len()))
        .collect();
    let mut segments = Vec::new();
    for p in &passes {
        station_masks[p.station_index].merge(&p.mask);
        segments.extend_from_slice(&p.segments);
    }
    let (network_volume_bits, network_contact_s) = network::union_volume(&segments);
    Ok(Plan {
        passes,
        stopped,
        propagations_search,
        station_masks,
        network_volume_bits,
        network_contact_s,
        rain_planned: input.rain.is_some(),
        start: input.start,
        end: input.end,
    })
}

fn plan_pass(
    input: &PlanInput,
    number: usize,
    station_index: usize,
    pass: &Pass,
    reference: RateSpec,
    s: &mut Scratch,
    sink: &PassSink,
) -> Result<PassPlan, PlanError> {
    let model = &input.stations[station_index];
    let err = |source| PlanError::Pass {
        number,
        station: model.station.name.clone(),
        source,
    };
    let prop = s
        .prop
        .as_ref()
        .map_err(|e| PlanError::Setup(e.to_string()))?;
    let how = series::StepPlan {
        step_s: input.step_s,
        frequency_hz: input.frequency_hz,
        rain: input.rain,
        reference,
    };
    let mut warnings = fill_pass(prop, model, pass, &how, &mut s.steps).map_err(err)?;
    warnings.atmosphere = warnings
        .atmosphere
        .union(&model.atmosphere.static_warnings());
    let rates = input.rates;
    s.weights.clear();
    s.weights.extend(s.steps.iter().map(|x| x.weight_s));
    s.cn0.clear();
    s.cn0.extend(s.steps.iter().map(|x| x.cn0_dbhz));
    let clear = mode_result(input, pass, &s.steps, &s.cn0, &s.weights, &mut s.schedule);
    // Mask trade-off and usable mask per ladder rate (clear sky).
    let mut acc = MaskAccumulator::new(rates.ladder.len());
    acc.passes = 1;
    for st in s.steps.iter() {
        acc.add_contact(st.elevation_deg, st.weight_s);
    }
    for (k, o) in rates.ladder.iter().enumerate() {
        kept_runs(
            &s.cn0,
            &s.weights,
            o.threshold_cn0_dbhz,
            rates.min_dwell_s,
            &mut s.runs,
        );
        if !s.runs.is_empty() {
            acc.passes_closing[k] = 1;
        }
        let mut r = 0;
        for (i, st) in s.steps.iter().enumerate() {
            while r < s.runs.len() && s.runs[r].1 < i {
                r += 1;
            }
            let closed = r < s.runs.len() && s.runs[r].0 <= i;
            acc.add_option(k, o.rate_bps, st.elevation_deg, st.weight_s, closed);
        }
    }
    let offset_s = seconds_between(&input.start, &pass.aos);
    let mut segments = Vec::new();
    s.runs.clear();
    if let Some(k) = clear.option {
        kept_runs(
            &s.cn0,
            &s.weights,
            rates.ladder[k].threshold_cn0_dbhz,
            rates.min_dwell_s,
            &mut s.runs,
        );
        for &(a, b) in &s.runs {
            segments.push(Segment {
                start_s: offset_s + s.steps[a].t_s,
                end_s: offset_s + s.steps[b].t_s + s.steps[b].weight_s,
                rate_bps: rates.ladder[k].rate_bps,
            });
        }
    }
    // Keep the clear-sky adaptive schedule for the sink before the rain case reuses the buffer.
    let rain = if input.rain.is_some() {
        let mut rain_cn0: Vec<f64> = Vec::with_capacity(s.steps.len());
        rain_cn0.extend(s.steps.iter().map(|x| x.rain_cn0_dbhz));
        let mut sched = Vec::new();
        Some(mode_result(
            input, pass, &s.steps, &rain_cn0, &s.weights, &mut sched,
        ))
    } else {
        None
    };
    let plan = PassPlan {
        number,
        station_index,
        pass: pass.clone(),
        clear,
        rain,
        segments,
        mask: acc,
        warnings,
        steps: s.steps.len(),
    };
    sink(&PassSeries {
        plan: &plan,
        steps: &s.steps,
        adaptive: &s.schedule,
        chosen_runs: &s.runs,
    })
    .map_err(PlanError::Sink)?;
    Ok(plan)
}

/// Shannon capacity integrated over the pass: sum of w B log2(1 + (C/N0) / B), bits.
fn shannon_volume_bits(cn0_dbhz: &[f64], weights_s: &[f64], bandwidth_hz: f64) -> f64 {
    cn0_dbhz
        .iter()
        .zip(weights_s)
        .map(|(c, w)| {
            w * bandwidth_hz * (1.0 + crate::units::db_to_ratio(*c) / bandwidth_hz).log2()
        })
        .sum()
}

fn interpolate_crossing(
    steps: &[Step],
    cn0: &[f64],
    threshold: f64,
    i0: usize,
    i1: usize,
) -> (f64, f64, f64) {
    // Linear interpolation of the C/N0 crossing between steps i0 and i1: time, elevation, azimuth.
    let (a, b) = (&steps[i0], &steps[i1]);
    let d = cn0[i1] - cn0[i0];
    let f = if d.abs() > 1e-12 {
        ((threshold - cn0[i0]) / d).clamp(0.0, 1.0)
    } else {
        0.0
    };
    let mut daz = b.azimuth_deg - a.azimuth_deg;
    if daz > 180.0 {
        daz -= 360.0;
    } else if daz < -180.0 {
        daz += 360.0;
    }
    (
        a.t_s + f * (b.t_s - a.t_s),
        a.elevation_deg + f * (b.elevation_deg - a.elevation_deg),
        (a.azimuth_deg + f * daz).rem_euclid(360.0),
    )
}

fn mode_result(
    input: &PlanInput,
    pass: &Pass,
    steps: &[Step],
    cn0: &[f64],
    weights: &[f64],
    schedule: &mut Vec<Option<u16>>,
) -> ModeResult {
    let rates = input.rates;
    let fixed = choose_fixed(cn0, weights, &rates.ladder, rates.min_dwell_s);
    let adaptive_volume_bits =
        adaptive_schedule(cn0, weights, &rates.adaptive, rates.min_dwell_s, schedule);
    let shannon = shannon_volume_bits(cn0, weights, rates.shannon_bandwidth_hz);
    let ebn0 = |o: &RateOption, c: f64| c - crate::units::ratio_to_db(o.rate_bps);
    let lowest = rates
        .ladder
        .iter()
        .min_by(|a, b| a.threshold_cn0_dbhz.total_cmp(&b.threshold_cn0_dbhz))
        .expect("ladder is not empty");
    let mut r = ModeResult {
        option: fixed.option,
        rate_bps: None,
        scheme: None,
        closes_from: None,
        closes_until: None,
        closes_from_elevation_deg: None,
        closes_until_elevation_deg: None,
        closes_from_azimuth_deg: None,
        closes_until_azimuth_deg: None,
        min_margin_db: None,
        max_ebn0_db: cn0
            .iter()
            .map(|c| ebn0(lowest, *c))
            .fold(f64::NEG_INFINITY, f64::max),
        closed_s: fixed.closed_s,
        volume_bits: fixed.volume_bits,
        adaptive_volume_bits,
        adaptive_switches: switch_count(schedule),
        shannon_volume_bits: shannon,
        volume_by_rate_bits: fixed.volume_by_option_bits.clone(),
    };
    if let Some(k) = fixed.option {
        let o = &rates.ladder[k];
        r.rate_bps = Some(o.rate_bps);
        r.scheme = Some(o.scheme.clone());
        r.max_ebn0_db = cn0
            .iter()
            .map(|c| ebn0(o, *c))
            .fold(f64::NEG_INFINITY, f64::max);
        let margin = |c: f64| ebn0(o, c) - o.required_ebn0_db - rates.implementation_loss_db;
        r.min_margin_db = fixed
            .runs
            .iter()
            .flat_map(|&(a, b)| cn0[a..=b].iter())
            .map(|c| margin(*c))
            .reduce(f64::min);
        let (a, _) = fixed.runs[0];
        let (_, b) = *fixed.runs.last().expect("a chosen rate has a run");
        let (t0, e0, z0) = if a == 0 {
            (0.0, steps[0].elevation_deg, steps[0].azimuth_deg)
        } else {
            interpolate_crossing(steps, cn0, o.threshold_cn0_dbhz, a - 1, a)
        };
        let last = steps.len() - 1;
        let (t1, e1, z1) = if b == last {
            (
                steps[last].t_s,
                steps[last].elevation_deg,
                steps[last].azimuth_deg,
            )
        } else {
            interpolate_crossing(steps, cn0, o.threshold_cn0_dbhz, b, b + 1)
        };
        r.closes_from = Some(add_seconds(&pass.aos, t0));
        r.closes_until = Some(add_seconds(&pass.aos, t1));
        r.closes_from_elevation_deg = Some(e0);
        r.closes_until_elevation_deg = Some(e1);
        r.closes_from_azimuth_deg = Some(z0);
        r.closes_until_azimuth_deg = Some(z1);
    }
    r
}

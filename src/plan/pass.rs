//! One pass: its budget time series, the fixed rate, the adaptive schedule, Shannon's bound, the
//! mask accumulators and the network segments.

use super::bodies::PassBodies;
use super::mask::MaskAccumulator;
use super::network::Segment;
use super::prepare::{RateSet, StationModel};
use super::rate::OptionId;
use super::rate::{adaptive_schedule, choose_fixed, kept_runs, switch_count};
use super::results::{
    BodyExposure, Closing, Crossing, ModeResult, MountTracking, PassPlan, PassSeries, PlanError,
};
use super::series::{fill_pass, PassWarnings, StepPlan};
use super::sink::PassSink;
use crate::atmosphere::Weather;
use crate::geometry::Pass;
use crate::orbit::{EcefSpline, ElementSet, PropagationError, Propagator};
use crate::plan::series::Step;
use crate::timefmt::{add_seconds, seconds_between};
use chrono::{DateTime, Utc};

/// What planning one pass needs from the planner.
pub(super) struct PassContext<'a> {
    pub stations: &'a [StationModel],
    pub rates: &'a RateSet,
    pub step_s: f64,
    pub frequency_hz: f64,
    pub rain: Option<Weather>,
    pub window_start: DateTime<Utc>,
    /// The window's length, s (`seconds_between` its start and end).
    pub window_s: f64,
    /// The band's Article 21 limit, when passbudget has a row for it.
    pub pfd_band: Option<crate::link::pfd::BandLimit>,
    pub pfd_spectrum: crate::link::pfd::Spectrum,
}

impl PassContext<'_> {
    fn stations(&self) -> &[StationModel] {
        self.stations
    }
    fn rates(&self) -> &RateSet {
        self.rates
    }
    fn step_s(&self) -> f64 {
        self.step_s
    }
    fn frequency_hz(&self) -> f64 {
        self.frequency_hz
    }
    fn rain(&self) -> Option<Weather> {
        self.rain
    }
}

/// Per-thread scratch buffers: reused across passes so the per-step loop allocates nothing.
pub(super) struct Scratch {
    /// Each worker builds its own propagator (it keeps mutable state and is not `Sync`).
    prop: Result<Propagator, PropagationError>,
    /// The orbit over the current pass, interpolated between SGP4 knots.
    orbit: EcefSpline,
    steps: Vec<Step>,
    cn0: Vec<f64>,
    rain_cn0: Vec<f64>,
    weights: Vec<f64>,
    schedule: Vec<Option<u16>>,
    rain_schedule: Vec<Option<u16>>,
    runs: Vec<(usize, usize)>,
    /// The Sun's and the Moon's tracks, one per station (built at its first pass, then reset).
    bodies: Vec<Option<PassBodies>>,
}

impl Scratch {
    pub(super) fn new(elements: &ElementSet) -> Scratch {
        Scratch {
            prop: Propagator::new(elements),
            orbit: EcefSpline::new(),
            steps: Vec::new(),
            cn0: Vec::new(),
            rain_cn0: Vec::new(),
            weights: Vec::new(),
            schedule: Vec::new(),
            rain_schedule: Vec::new(),
            runs: Vec::new(),
            bodies: Vec::new(),
        }
    }

    /// Follow `pass` and fill the step, C/N0 and weight buffers.
    fn fill(
        &mut self,
        planner: &PassContext,
        station_index: usize,
        pass: &Pass,
    ) -> Result<PassWarnings, super::series::SeriesError> {
        let model = &planner.stations()[station_index];
        let prop = self.prop.as_ref().map_err(|e| e.clone())?;
        let how = StepPlan {
            step_s: planner.step_s(),
            frequency_hz: planner.frequency_hz(),
            rain: planner.rain(),
        };
        if self.bodies.len() < planner.stations().len() {
            self.bodies.resize_with(planner.stations().len(), || None);
        }
        let bodies = match &mut self.bodies[station_index] {
            Some(b) => b,
            slot => slot.insert(PassBodies::new(&model.observer, &pass.aos, &pass.aos)?),
        };
        let mut warnings = fill_pass(
            (prop, &mut self.orbit),
            model,
            pass,
            &how,
            &mut self.steps,
            bodies,
        )?;
        warnings.atmosphere = warnings
            .atmosphere
            .union(&model.atmosphere.static_warnings());
        lose_short_stretches(&mut self.steps, planner.rates().min_dwell_s);
        self.weights.clear();
        self.weights.extend(self.steps.iter().map(|x| x.weight_s));
        self.cn0.clear();
        self.cn0.extend(self.steps.iter().map(tracked_cn0));
        Ok(warnings)
    }

    /// Mask accumulators of the pass in the buffers: contact and, per ladder rate, its counted runs.
    fn mask_accumulator(&mut self, planner: &PassContext) -> MaskAccumulator {
        let rates = planner.rates();
        let mut acc = MaskAccumulator::new(rates.ladder.len());
        acc.passes = 1;
        // Steps the mount cannot follow are left out of the bins altogether.
        for st in self.steps.iter().filter(|x| !x.untracked) {
            acc.add_contact(st.elevation_deg, st.weight_s);
        }
        for (k, o) in rates.ladder.iter().enumerate() {
            let margin_db = o.margin_at();
            kept_runs(
                &self.cn0,
                &self.weights,
                o.threshold_cn0_dbhz,
                rates.min_dwell_s,
                &mut self.runs,
            );
            if !self.runs.is_empty() {
                acc.passes_closing[k] = 1;
            }
            let mut r = 0;
            for (i, st) in self.steps.iter().enumerate() {
                while r < self.runs.len() && self.runs[r].1 < i {
                    r += 1;
                }
                if st.untracked {
                    continue;
                }
                let closed = r < self.runs.len() && self.runs[r].0 <= i;
                let cn0 = self.cn0[i];
                acc.add_option(k, o.rate_bps, st.elevation_deg, st.weight_s, closed, || {
                    (st.t_s, margin_db(cn0))
                });
            }
        }
        acc
    }
}

/// The mask accumulators of a pass searched from 0 deg, for the trade-off only.
pub(super) fn tradeoff_pass(
    planner: &PassContext,
    station_index: usize,
    pass: &Pass,
    s: &mut Scratch,
) -> Result<MaskAccumulator, PlanError> {
    s.fill(planner, station_index, pass)
        .map_err(|source| PlanError::Pass {
            number: 0,
            station: planner.stations()[station_index].station.name.clone(),
            source,
        })?;
    Ok(s.mask_accumulator(planner))
}

/// Plan one pass and hand it with its time series to the sink.
pub(super) fn plan_pass<S: PassSink>(
    planner: &PassContext,
    (number, pass_count): (usize, usize),
    station_index: usize,
    pass: &Pass,
    s: &mut Scratch,
    sink: &S,
) -> Result<Planned, PlanError> {
    let mut warnings = s
        .fill(planner, station_index, pass)
        .map_err(|source| PlanError::Pass {
            number,
            station: planner.stations()[station_index].station.name.clone(),
            source,
        })?;
    let (clear, volume_by_rate_bits) = mode_result(
        planner,
        pass,
        (&s.steps, &s.cn0, &s.weights),
        |x| x.cn0_dbhz,
        &mut s.schedule,
    );
    let mask = s.mask_accumulator(planner);
    let segments = chosen_segments(planner, pass, &clear, s);
    let rain = if planner.rain().is_some() {
        s.rain_cn0.clear();
        s.rain_cn0.extend(s.steps.iter().map(|x| match x.rain {
            Some(r) if !x.untracked => r.cn0_dbhz,
            Some(_) => f64::NEG_INFINITY,
            None => f64::NAN,
        }));
        Some(
            mode_result(
                planner,
                pass,
                (&s.steps, &s.rain_cn0, &s.weights),
                |x| x.rain.map_or(f64::NAN, |r| r.cn0_dbhz),
                &mut s.rain_schedule,
            )
            .0,
        )
    } else {
        None
    };
    // The pfd at the station for the carrier of the chosen rate (the lowest-threshold one when
    // none closes).
    let pfd = planner.pfd_band.as_ref().and_then(|b| {
        let (_, o) = planner.rates().display_option(clear.option);
        super::pfd::pass_margin(b, &s.steps, (o.occupied_bandwidth_hz, planner.pfd_spectrum))
    });
    warnings.pfd_exceeded = pfd.is_some_and(|(m, _)| m < 0.0);
    let plan = PassPlan {
        pfd_margin_db: pfd.map(|p| p.0),
        number,
        station_index,
        pass: pass.clone(),
        clear,
        rain,
        segments,
        warnings,
        steps: s.steps.len(),
        bodies: BodyExposure::over(&s.steps),
        mount: planner.stations()[station_index]
            .station
            .mount
            .map(|_| MountTracking::over(&s.steps)),
    };
    sink.pass(&PassSeries {
        plan: &plan,
        steps: &s.steps,
        adaptive: &s.schedule,
        chosen_runs: &s.runs,
        pass_count,
    })
    .map_err(|e| PlanError::Sink(Box::new(e)))?;
    Ok(Planned {
        plan,
        mask,
        volume_by_rate_bits,
    })
}

/// A planned pass with what the run merges and then drops: its elevation bins (into the
/// station's [`MaskAccumulator`]; its highest open steps into [`super::mask::OpenSteps`]) and
/// the volume each ladder rate would bring in it (into the per-rate sums that choose
/// [`super::Totals::single_rate`]), so that a pass keeps none of them.
pub(super) struct Planned {
    pub plan: PassPlan,
    pub mask: MaskAccumulator,
    /// Per ladder rate, clear sky, bits.
    pub volume_by_rate_bits: Vec<f64>,
}

/// The counted runs of the chosen fixed rate (left in `s.runs` for the sink) as network segments,
/// seconds from the window start.
fn chosen_segments(
    planner: &PassContext,
    pass: &Pass,
    clear: &ModeResult,
    s: &mut Scratch,
) -> Vec<Segment> {
    let rates = planner.rates();
    let offset_s = seconds_between(&planner.window_start, &pass.aos);
    s.runs.clear();
    let Some(OptionId(k)) = clear.option else {
        return Vec::new();
    };
    kept_runs(
        &s.cn0,
        &s.weights,
        rates.ladder[k].threshold_cn0_dbhz,
        rates.min_dwell_s,
        &mut s.runs,
    );
    // Collected from an exact-size iterator, so allocated to the runs' count (a pushed vector
    // starts at four segments, and most passes have one: the pass keeps these to the end).
    s.runs
        .iter()
        .map(|&(a, b)| Segment {
            start_s: offset_s + s.steps[a].t_s,
            // A pass cut by the window ends at its end; the sum can lie an ulp beyond it.
            end_s: (offset_s + s.steps[b].t_s + s.steps[b].weight_s).min(planner.window_s),
            rate_bps: rates.ladder[k].rate_bps,
        })
        .collect()
}

/// Where the mount loses the satellite, a stretch of tracked steps shorter than the dwell time
/// (between two losses, or between a loss and AOS or LOS) is lost too: the modem cannot lock in
/// it, and the mask would otherwise take it for the link failing there.
fn lose_short_stretches(steps: &mut [Step], min_dwell_s: f64) {
    if !steps.iter().any(|s| s.untracked) {
        return;
    }
    let mut i = 0;
    while i < steps.len() {
        if steps[i].untracked {
            i += 1;
            continue;
        }
        let start = i;
        let mut held_s = 0.0;
        while i < steps.len() && !steps[i].untracked {
            held_s += steps[i].weight_s;
            i += 1;
        }
        if held_s + 1e-9 < min_dwell_s {
            steps[start..i].iter_mut().for_each(|s| s.untracked = true);
        }
    }
}

/// The C/N0 the rate decisions see: the step's own, or -inf where the mount cannot follow, so no
/// option closes there (fixed-rate runs, the adaptive schedule, Shannon's bound and the network
/// segments all skip the step) without a second buffer.
#[inline]
fn tracked_cn0(s: &Step) -> f64 {
    if s.untracked {
        f64::NEG_INFINITY
    } else {
        s.cn0_dbhz
    }
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

/// Linear interpolation of the C/N0 crossing between steps i0 and i1: seconds from AOS,
/// elevation and azimuth.
fn interpolate_crossing(
    steps: &[Step],
    cn0: &[f64],
    threshold: f64,
    i0: usize,
    i1: usize,
) -> (f64, f64, f64) {
    let (a, b) = (&steps[i0], &steps[i1]);
    let d = cn0[i1] - cn0[i0];
    // A neighbour the mount cannot follow (C/N0 -inf): the run begins or ends at the tracked step.
    let f = if !cn0[i0].is_finite() {
        1.0
    } else if !cn0[i1].is_finite() {
        0.0
    } else if d.abs() > 1e-12 {
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

/// Where the chosen option's counted runs begin and end: at AOS/LOS, or at the interpolated
/// threshold crossing.
fn closing(
    pass: &Pass,
    steps: &[Step],
    cn0: &[f64],
    threshold: f64,
    runs: &[(usize, usize)],
) -> Option<Closing> {
    let (a, _) = *runs.first()?;
    let (_, b) = *runs.last()?;
    let (t0, e0, z0) = if a == 0 {
        (0.0, steps[0].elevation_deg, steps[0].azimuth_deg)
    } else {
        interpolate_crossing(steps, cn0, threshold, a - 1, a)
    };
    let last = steps.len() - 1;
    let (t1, e1, z1) = if b == last {
        let s = &steps[last];
        (s.t_s, s.elevation_deg, s.azimuth_deg)
    } else {
        interpolate_crossing(steps, cn0, threshold, b, b + 1)
    };
    let at = |t: f64, elevation_deg: f64, azimuth_deg: f64| Crossing {
        time: add_seconds(&pass.aos, t),
        elevation_deg,
        azimuth_deg,
    };
    Some(Closing {
        from: at(t0, e0, z0),
        until: at(t1, e1, z1),
    })
}

/// The rate choice of one weather case: `cn0` is what the rate decisions see (-inf where the
/// mount cannot follow), `own_cn0` the step's own C/N0 of this case. With it, the volume each
/// ladder rate would bring in the pass, bits.
fn mode_result(
    planner: &PassContext,
    pass: &Pass,
    (steps, cn0, weights): (&[Step], &[f64], &[f64]),
    own_cn0: impl Fn(&Step) -> f64,
    schedule: &mut Vec<Option<u16>>,
) -> (ModeResult, Vec<f64>) {
    let rates = planner.rates();
    let fixed = choose_fixed(cn0, weights, &rates.ladder, rates.min_dwell_s);
    let adaptive_volume_bits = adaptive_schedule(
        cn0,
        weights,
        &rates.adaptive,
        rates.min_dwell_s,
        rates.switching(),
        schedule,
    );
    let shown = fixed.option.unwrap_or_else(|| rates.lowest_threshold().0);
    let o = &rates.ladder[shown];
    // Over the steps the mount can follow; over every step when it follows none. Subtracting a
    // constant is monotone in IEEE arithmetic (rounding keeps order), so the largest Eb/N0 is the
    // largest C/N0's, and the smallest margin below the smallest C/N0's: one conversion each.
    let max_of = |c: &mut dyn Iterator<Item = f64>| {
        o.ebn0_db(
            c.filter(|c| c.is_finite())
                .fold(f64::NEG_INFINITY, f64::max),
        )
    };
    let mut max_ebn0_db = max_of(&mut cn0.iter().copied());
    if max_ebn0_db == f64::NEG_INFINITY {
        max_ebn0_db = max_of(&mut steps.iter().map(own_cn0));
    }
    let (closing, min_margin_db) = match fixed.option {
        Some(_) => (
            closing(pass, steps, cn0, o.threshold_cn0_dbhz, &fixed.runs),
            fixed
                .runs
                .iter()
                .flat_map(|&(a, b)| cn0[a..=b].iter().copied())
                .reduce(f64::min)
                .map(|c| o.margin_db(c)),
        ),
        None => (None, None),
    };
    // The margin at the highest step (closest approach for one station): what the pass offers
    // at its best, of the chosen rate, or of the easiest rate when none closes (then negative).
    let tca_margin_db = steps
        .iter()
        .zip(cn0)
        .filter(|(_, c)| **c > f64::NEG_INFINITY)
        .max_by(|a, b| a.0.elevation_deg.total_cmp(&b.0.elevation_deg))
        .map(|(_, c)| o.margin_db(*c));
    let mode = ModeResult {
        option: fixed.option.map(OptionId),
        closing,
        min_margin_db,
        tca_margin_db,
        max_ebn0_db,
        closed_s: fixed.closed_s,
        volume_bits: fixed.volume_bits,
        adaptive_volume_bits,
        adaptive_switches: switch_count(schedule),
        shannon_volume_bits: shannon_volume_bits(cn0, weights, rates.shannon_bandwidth_hz),
    };
    (mode, fixed.volume_by_option_bits)
}

#[cfg(test)]
mod tests {
    use super::*;

    /// Between two losses, 5 tracked seconds are lost too under a 10 s dwell; 10 are kept; a pass
    /// without a loss is left alone.
    #[test]
    fn short_tracked_stretches_next_to_a_loss_are_lost() {
        let pattern = |lost: &[usize], n: usize| -> Vec<Step> {
            (0..n)
                .map(|i| Step {
                    t_s: i as f64,
                    weight_s: 1.0,
                    untracked: lost.contains(&i),
                    ..Default::default()
                })
                .collect()
        };
        let mut s = pattern(&[20, 26], 60);
        lose_short_stretches(&mut s, 10.0);
        assert!((20..=26).all(|i| s[i].untracked));
        assert!(!s[19].untracked && !s[27].untracked);
        let mut s = pattern(&[20, 31], 60);
        lose_short_stretches(&mut s, 10.0);
        assert!((21..=30).all(|i| !s[i].untracked));
        let mut s = pattern(&[], 5);
        lose_short_stretches(&mut s, 10.0);
        assert!(s.iter().all(|x| !x.untracked));
    }
}

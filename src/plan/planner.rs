//! The planner: a validated request over a prepared mission, run with a pass sink.

use super::inputs::{
    element_age_warning, element_notes, load_satellite, propagation_stop, PropagationStop,
};
use super::mask::{MaskAccumulator, OpenSteps};
use super::pass::{plan_pass, tradeoff_pass, PassContext, Planned, Scratch};
use super::prepare::{
    availability_weather_for, rate_set, station_model_for, RateSet, StationModel,
};
use super::results::{NetworkTotal, Note, NoteKind, PassPlan, Plan, PlanError};
use super::series::PassWarnings;
use super::sink::{Collect, PassSink};
use super::window::{Window, WindowRequest};
use super::{network, summary};
use crate::atmosphere::Weather;
use crate::config::limits::{EXCEEDANCE_PERCENT, MIN_ELEVATION_DEG, STEP_S};
use crate::config::mission::Mission;
use crate::geometry::{find_passes, HorizonMask, Pass};
use crate::orbit::{ElementSet, PropagationError, Propagator, Selection};
use rayon::prelude::*;

/// What to plan, beyond the mission file. Every field left `None` falls back to the file.
#[derive(Debug, Clone, Default, PartialEq)]
pub struct PlanRequest {
    pub window: WindowRequest,
    /// Budget time step along each pass, s (file: `planning.step_s`, default 1).
    pub step_s: Option<f64>,
    /// Availability case: rain exceeded this percentage of an average year (file: `planning.exceedance_percent`).
    pub exceedance_percent: Option<f64>,
    /// Minimum elevation for every station, deg (file: `planning.mask_deg`, else each station's).
    pub mask_deg: Option<f64>,
    /// Also gather the mask trade-off, in the same run, over the passes searched down to this
    /// elevation, deg (each station's horizon mask still applies; a station whose own minimum is
    /// lower keeps it). `Some(0.0)` shows what lowering any mask to the horizon would bring.
    pub search_floor_deg: Option<f64>,
    /// Plan even when the window lies more than
    /// [`MAX_ELEMENT_AGE_DAYS`](super::inputs::MAX_ELEMENT_AGE_DAYS) from the element epoch
    /// (the outputs then say the numbers are not meaningful).
    pub allow_stale_elements: bool,
}

/// A mission prepared for planning one window.
pub struct Planner {
    mission: Mission,
    elements: ElementSet,
    /// Which set of the element file was chosen, and why.
    selection: Selection,
    stations: Vec<StationModel>,
    /// Per station, the horizon searched for the mask trade-off (from 0 deg), when asked.
    tradeoff_masks: Option<Vec<HorizonMask>>,
    rates: RateSet,
    window: Window,
    step_s: f64,
    exceedance_percent: Option<f64>,
    rain: Option<Weather>,
    frequency_hz: f64,
    /// The pfd check of every rate option against the band's Article 21 limit.
    pfd: super::pfd::PfdCheck,
}

fn request_error(key: &'static str, message: impl Into<String>) -> PlanError {
    PlanError::Request {
        key,
        message: message.into(),
    }
}

impl Planner {
    /// Check the request against the mission and prepare every model.
    pub fn new(mission: &Mission, request: &PlanRequest) -> Result<Planner, PlanError> {
        Self::new_reusing(mission, request, None)
    }

    /// [`Planner::new`], reusing the station tables `other` prepared where they are the same
    /// (the same station at the same frequency: another satellite of a fleet).
    pub fn new_reusing(
        mission: &Mission,
        request: &PlanRequest,
        other: Option<&Planner>,
    ) -> Result<Planner, PlanError> {
        if mission.stations.is_empty() {
            return Err(PlanError::NoStations {
                mission: mission.source.display().to_string(),
            });
        }
        // The window first: an element-set history is resolved against its start.
        let window = Window::resolve(&request.window, Some(mission))?;
        let (elements, _, selection) = load_satellite(
            &mission.elements_path,
            mission.select.as_deref(),
            window.start(),
        )?;
        super::inputs::check_element_age(
            &elements,
            window.start(),
            window.end(),
            request.allow_stale_elements,
        )?;
        let mask = request.mask_deg.or(mission.mask_deg);
        if let Some(m) = mask {
            in_range(&MIN_ELEVATION_DEG, m, "mask_deg")?;
        }
        let exceedance_percent = request.exceedance_percent.or(mission.exceedance_percent);
        if let Some(p) = exceedance_percent {
            in_range(&EXCEEDANCE_PERCENT, p, "exceedance_percent")?;
        }
        // The availability case first, so each station's noise tables of both cases are built
        // together.
        let rain = availability_weather_for(exceedance_percent, &mission.stations)?;
        // The stations' models (their noise tables) are independent: built in parallel, the
        // first failing station in file order reported.
        let mut stations = mission
            .stations
            .par_iter()
            .enumerate()
            .map(|(i, s)| {
                let reuse = other.and_then(|o| o.stations.get(i));
                station_model_for(mission, s, mask, reuse, rain)
            })
            .collect::<Vec<_>>()
            .into_iter()
            .collect::<Result<Vec<_>, _>>()?;
        let tradeoff_masks = if let Some(floor_deg) = request.search_floor_deg {
            in_range(&MIN_ELEVATION_DEG, floor_deg, "search_floor_deg")?;
            let floors = stations.iter().map(|s| {
                let floor = s.configured_min_elevation_deg.min(floor_deg);
                HorizonMask::new(floor, s.station.horizon_mask.clone())
            });
            Some(
                floors
                    .collect::<Result<Vec<_>, _>>()
                    .map_err(|e| request_error("horizon_mask", e.to_string()))?,
            )
        } else {
            None
        };
        let rates = rate_set(mission, &stations[0].link)?;
        let step_s = Self::check_step(request.step_s.unwrap_or(mission.step_s), &rates)?;
        if let Some(w) = rain {
            // One antenna-noise table per station for the availability case.
            stations.iter_mut().for_each(|s| s.prepare_weather(w));
        }
        let frequency_hz = stations[0].link.frequency_hz();
        let pfd =
            super::pfd::PfdCheck::new(&stations[0].link, &rates, &elements, mission.pfd_spectrum());
        Ok(Planner {
            pfd,
            frequency_hz,
            mission: mission.clone(),
            elements,
            selection,
            stations,
            tradeoff_masks,
            rates,
            window,
            step_s,
            exceedance_percent,
            rain,
        })
    }

    /// The step must be within [`STEP_S`] and at most half the dwell (for a dwell of 2 s or more),
    /// or the dwell rule and the closing edges are miscounted.
    fn check_step(step_s: f64, rates: &RateSet) -> Result<f64, PlanError> {
        in_range(&STEP_S, step_s, "step_s")?;
        if rates.min_dwell_s >= 2.0 && step_s > rates.min_dwell_s / 2.0 {
            return Err(request_error(
                "step_s",
                format!(
                    "{step_s} s is more than half of modem.min_dwell_s ({} s): the dwell rule and the closing edges would be miscounted",
                    rates.min_dwell_s
                ),
            ));
        }
        Ok(step_s)
    }

    pub fn mission(&self) -> &Mission {
        &self.mission
    }
    pub fn elements(&self) -> &ElementSet {
        &self.elements
    }
    /// Which set of the element file was chosen for the window, and why.
    pub fn selection(&self) -> &Selection {
        &self.selection
    }
    pub fn stations(&self) -> &[StationModel] {
        &self.stations
    }
    pub fn rates(&self) -> &RateSet {
        &self.rates
    }
    pub fn window(&self) -> Window {
        self.window
    }
    pub fn step_s(&self) -> f64 {
        self.step_s
    }
    pub fn exceedance_percent(&self) -> Option<f64> {
        self.exceedance_percent
    }
    pub fn rain(&self) -> Option<Weather> {
        self.rain
    }
    /// The pfd check of the rate options ([`super::pfd`]).
    pub fn pfd(&self) -> &super::pfd::PfdCheck {
        &self.pfd
    }
    /// Downlink carrier frequency, Hz.
    pub fn frequency_hz(&self) -> f64 {
        self.frequency_hz
    }

    /// The passes a run plans, in its order (the 1-based pass number is the index + 1), with
    /// their station index: the same search and the same propagation stop as [`Planner::run`],
    /// without the budgets.
    pub fn passes(&self) -> Result<Vec<(usize, Pass)>, PlanError> {
        let propagator = Propagator::new(&self.elements).map_err(PlanError::Propagator)?;
        let (mut found, stopped, _) = self.search(&propagator, None);
        if let Some(s) = propagation_stop(&propagator, self.window.start(), &stopped) {
            found.retain(|(_, p)| p.aos < s.time);
        }
        Ok(found)
    }

    /// Plan every pass without a sink.
    pub fn collect(&self) -> Result<Plan, PlanError> {
        self.run(&Collect)
    }

    /// Plan every pass of every station, handing each to `sink`.
    pub fn run<S: PassSink>(&self, sink: &S) -> Result<Plan, PlanError> {
        let propagator = Propagator::new(&self.elements).map_err(PlanError::Propagator)?;
        let (main_search, floor_search) = (propagator.clone(), propagator.clone());
        let ((mut found, stopped, propagations_search), mut floor_passes) = rayon::join(
            move || self.search(&main_search, None),
            move || match &self.tradeoff_masks {
                Some(masks) => self.search(&floor_search, Some(masks)).0,
                None => Vec::new(),
            },
        );
        let stop = propagation_stop(&propagator, self.window.start(), &stopped);
        if let Some(s) = &stop {
            // One stop for the satellite: no pass from it on, whichever station's search saw it.
            found.retain(|(_, p)| p.aos < s.time);
            floor_passes.retain(|(_, p)| p.aos < s.time);
        }
        let total = found.len();
        let ctx = PassContext {
            stations: &self.stations,
            rates: &self.rates,
            step_s: self.step_s,
            frequency_hz: self.frequency_hz,
            rain: self.rain,
            window_start: self.window.start(),
            window_s: crate::timefmt::seconds_between(&self.window.start(), &self.window.end()),
            pfd_band: self.pfd.band,
            pfd_spectrum: self.pfd.spectrum,
        };
        let mut queue = WorkQueue::new(found, floor_passes);
        let mut passes = Vec::with_capacity(total);
        let mut station_masks = self.empty_masks();
        let mut tradeoff = self.tradeoff_masks.as_ref().map(|_| self.empty_masks());
        // Per ladder rate, the clear-sky volume over the passes (an empty sum is -0.0, as `sum`'s).
        let mut by_rate = vec![-0.0; self.rates.ladder.len()];
        let mut open = OpenSteps::with_capacity(self.rates.ladder.len(), total);
        // In chunks: a chunk's passes are planned in parallel, then merged in pass order (the
        // same order, so the same sums, as merging them all at the end), so that what a pass
        // holds only until it is merged (its elevation bins) does not pile up with the window.
        while let Some(chunk) = queue.next_chunk() {
            let results: Vec<Result<Item, PlanError>> = chunk
                .par_iter()
                .map_init(
                    || Scratch::new(&self.elements),
                    |scratch, (number, si, pass)| match *number {
                        Some(n) => {
                            let r = plan_pass(&ctx, (n, total), *si, pass, scratch, sink)
                                .map(|p| Item::Planned(Box::new(p)));
                            sink.progress(total);
                            r
                        }
                        None => tradeoff_pass(&ctx, *si, pass, scratch)
                            .map(|m| Item::Tradeoff(*si, Box::new(m))),
                    },
                )
                .collect();
            for r in results {
                match r? {
                    Item::Planned(p) => {
                        let Planned {
                            plan,
                            mask,
                            volume_by_rate_bits,
                        } = *p;
                        station_masks[plan.station_index].merge(&mask);
                        open.push(&mask);
                        // In pass order: the same sums as summing over the passes at the end.
                        for (sum, v) in by_rate.iter_mut().zip(volume_by_rate_bits) {
                            *sum += v;
                        }
                        passes.push(plan);
                    }
                    Item::Tradeoff(si, m) => {
                        if let Some(t) = tradeoff.as_mut() {
                            t[si].merge(&m);
                        }
                    }
                }
            }
        }
        let masks = (station_masks, tradeoff);
        let found = (passes, &by_rate[..], open);
        Ok(self.finish(found, stopped, stop, propagations_search, masks))
    }

    fn empty_masks(&self) -> Vec<MaskAccumulator> {
        self.stations
            .iter()
            .map(|_| MaskAccumulator::new(self.rates.ladder.len()))
            .collect()
    }

    /// Passes of every station in AOS order (then station order), with the per-station stops.
    #[allow(clippy::type_complexity)]
    fn search(
        &self,
        propagator: &Propagator,
        masks: Option<&[HorizonMask]>,
    ) -> (Vec<(usize, Pass)>, Vec<Option<PropagationError>>, u64) {
        let mut found = Vec::new();
        let mut stopped = Vec::new();
        let mut propagations = 0;
        // The stations' searches are independent: in parallel, then taken in station order.
        // Each search has its own propagator: the SGP4 resonance state is path-independent
        // (fixed integration steps from the epoch), so the passes are the same as one shared.
        let searches: Vec<_> = (self.stations.iter().map(|_| propagator.clone()))
            .collect::<Vec<_>>()
            .into_par_iter()
            .zip(self.stations.par_iter().enumerate())
            .map(|(propagator, (i, st))| {
                let mask = masks.map_or(&st.mask, |m| &m[i]);
                find_passes(
                    &propagator,
                    &st.observer,
                    mask,
                    self.window.start(),
                    self.window.end(),
                )
            })
            .collect();
        for (i, s) in searches.into_iter().enumerate() {
            propagations += s.propagations;
            stopped.push(s.stopped);
            found.extend(s.passes.into_iter().map(|p| (i, p)));
        }
        found.sort_by(|a, b| a.1.aos.cmp(&b.1.aos).then(a.0.cmp(&b.0)));
        (found, stopped, propagations)
    }

    fn finish(
        &self,
        (passes, by_rate, open): (Vec<PassPlan>, &[f64], OpenSteps),
        stopped: Vec<Option<PropagationError>>,
        stop: Option<PropagationStop>,
        propagations_search: u64,
        (station_masks, tradeoff_masks): (Vec<MaskAccumulator>, Option<Vec<MaskAccumulator>>),
    ) -> Plan {
        // Sized once: a year's segments grown by doubling would leave holes of their size.
        let mut segments = Vec::with_capacity(passes.iter().map(|p| p.segments.len()).sum());
        for p in &passes {
            segments.extend_from_slice(&p.segments);
        }
        let (volume_bits, contact_s) = network::union_volume(&segments);
        let network = NetworkTotal {
            volume_bits,
            contact_s,
        };
        let totals = summary::totals(
            &passes,
            by_rate,
            self.rain.is_some(),
            network,
            self.window.days(),
        );
        let days = summary::days(&passes, &self.window, self.rain.is_some());
        let usable_masks = summary::usable_masks(
            &station_masks,
            (&passes, &open),
            &self.stations,
            &self.rates,
            self.mission.mask_share_percent,
        );
        let warnings = self.warnings(&passes, &stopped, stop.as_ref());
        let of = |kind| move |text| Note::new(kind, text);
        let label = self.elements.label();
        let notes = (element_notes(&self.elements, &self.selection)
            .into_iter()
            .map(of(NoteKind::ElementSet)))
        .chain(
            summary::no_pass_notes(&label, &passes, &self.stations, &stopped)
                .into_iter()
                .map(of(NoteKind::NoPass)),
        )
        .chain(summary::sun_note(&passes, &self.stations).map(of(NoteKind::Sun)))
        .chain(
            summary::adaptive_note(&passes, &self.stations, &self.rates)
                .map(of(NoteKind::Adaptive)),
        )
        .chain(super::pfd::unconfirmed_notes(&self.rates, &self.pfd))
        .collect();
        Plan {
            notes,
            passes,
            stopped,
            propagation_stop: stop,
            propagations_search,
            station_masks,
            tradeoff_masks,
            network,
            totals,
            days,
            usable_masks,
            warnings,
            rain_planned: self.rain.is_some(),
            adaptive_dominates: self.rates.adaptive_dominates(),
            window: self.window,
        }
    }

    /// Every warning of a plan: per station, the static model notes and the union over its passes;
    /// the rate options' notes; the element set chosen from a history; the element age; the one
    /// propagation stop, then which stations' searches it cut.
    fn warnings(
        &self,
        passes: &[PassPlan],
        stopped: &[Option<PropagationError>],
        stop: Option<&PropagationStop>,
    ) -> Vec<String> {
        let mut out = Vec::new();
        for (i, s) in self.stations.iter().enumerate() {
            let fixed = Self::station_warnings(s);
            // A pass's lines depend on its warnings alone: they are made once per distinct
            // value (a handful in a year of thousands of passes), each with its pass count.
            let (mut distinct, mut n) = (Vec::<(PassWarnings, usize)>::new(), 0);
            for x in passes.iter().filter(|x| x.station_index == i) {
                n += 1;
                match distinct.iter_mut().find(|d| d.0 == x.warnings) {
                    Some(d) => d.1 += 1,
                    None => distinct.push((x.warnings, 1)),
                }
            }
            let own: Vec<(Vec<String>, usize)> = distinct
                .iter()
                .map(|&(w, k)| (w.lines(self.frequency_hz), k))
                .collect();
            let always = fixed.lines(self.frequency_hz);
            let union = distinct.iter().fold(fixed, |w, x| w.union(&x.0));
            // One line per model and station; a warning raised by some passes only says how many.
            for m in union.lines(self.frequency_hz) {
                let k: usize = own
                    .iter()
                    .filter(|(l, _)| l.contains(&m))
                    .map(|(_, k)| k)
                    .sum();
                let count = if always.contains(&m) || k == n {
                    String::new()
                } else {
                    format!(" ({k} of {n} passes)")
                };
                out.push(format!("{}: {m}{count}", s.station.name));
            }
        }
        out.extend(self.plan_wide_warnings());
        if let Some(s) = stop {
            out.push(s.message(&self.elements.label(), STOP_CONSEQUENCE));
            for (i, _) in stopped.iter().enumerate().filter(|(_, e)| e.is_some()) {
                out.push(format!(
                    "{}: passes cut by the propagation stop",
                    self.stations[i].station.name
                ));
            }
        }
        out
    }
}

impl Planner {
    /// What a station's models warn of whatever the pass (frequency and climate out of range).
    fn station_warnings(s: &StationModel) -> PassWarnings {
        PassWarnings {
            atmosphere: s.atmosphere.static_warnings(),
            noise: s.noise.warnings(),
            ..Default::default()
        }
    }

    /// The warnings of no one station: the rate options', the pfd limit's, the element age.
    fn plan_wide_warnings(&self) -> Vec<String> {
        let mut out = self.rates.warnings.clone();
        out.extend(self.pfd.warnings(self.frequency_hz));
        out.extend(element_age_warning(
            &self.elements,
            self.window.start(),
            self.window.end(),
        ));
        out.extend(super::bodies::position_years_warning(
            &self.window.start(),
            &self.window.end(),
        ));
        out
    }

    /// The warnings that concern one pass of `plan` (`chart --pass`): its station's model
    /// warnings as this pass raised them, then the plan-wide ones and the propagation stop (the
    /// elements fail later in the window). Other stations' warnings are not among them, nor the
    /// counts over the station's passes, nor which stations' searches the stop cut.
    pub fn pass_warnings(&self, plan: &Plan, pass: &PassPlan) -> Vec<String> {
        let s = &self.stations[pass.station_index];
        let models = Self::station_warnings(s).union(&pass.warnings);
        let name = &s.station.name;
        let label = self.elements.label();
        (models.lines(self.frequency_hz).into_iter())
            .map(|m| format!("{name}: {m}"))
            .chain(self.plan_wide_warnings())
            .chain((plan.propagation_stop.iter()).map(|s| s.message(&label, STOP_CONSEQUENCE)))
            .collect()
    }

    /// The notes that concern one pass of `plan`: the element set chosen, the Sun and the
    /// adaptive mode in this pass alone, the values recalled from memory. Notes on other
    /// stations (one without passes) are not among them.
    pub fn pass_notes(&self, plan: &Plan, pass: &PassPlan) -> Vec<String> {
        let one = std::slice::from_ref(pass);
        (plan.note_lines(|k| k == NoteKind::ElementSet).into_iter())
            .chain(summary::sun_note(one, &self.stations))
            .chain(summary::adaptive_note(one, &self.stations, &self.rates))
            .chain(
                plan.note_lines(|k| {
                    matches!(k, NoteKind::RecalledThreshold | NoteKind::RecalledPfd)
                }),
            )
            .collect()
    }
}

/// What a propagation stop means for a plan, in its warning line.
const STOP_CONSEQUENCE: &str = "no passes after it are planned";

/// `value` if it lies within `range`, else the request's error naming its field `key`.
fn in_range(
    range: &crate::config::limits::Range,
    value: f64,
    key: &'static str,
) -> Result<f64, PlanError> {
    range
        .check(value)
        .map_err(|source| PlanError::Range { key, source })
}

/// Passes (and trade-off passes) planned in parallel between two merges: bounds what is held at
/// once (a pass's elevation bins, about 3 kB with 7 ladder rates, made on the worker threads,
/// whose allocator keeps the room of the largest chunk for the rest of the process) whatever the
/// window; large enough to keep both cores busy (a chunk waits for its slowest pass).
const WORK_CHUNK: usize = 64;

/// The passes still to plan (numbered ones, then the trade-off's), last first: each chunk is
/// taken off the end, and the list gives its room back as it empties, so a planned pass is not
/// held twice, in the search's list and in the plan.
struct WorkQueue {
    rest: Vec<(Option<usize>, usize, Pass)>,
}

impl WorkQueue {
    fn new(found: Vec<(usize, Pass)>, floor_passes: Vec<(usize, Pass)>) -> WorkQueue {
        let mut rest: Vec<_> = floor_passes
            .into_iter()
            .rev()
            .map(|(si, p)| (None, si, p))
            .collect();
        let numbered = found.len();
        rest.reserve_exact(numbered);
        rest.extend(
            found
                .into_iter()
                .enumerate()
                .rev()
                .map(|(k, (si, p))| (Some(k + 1), si, p)),
        );
        WorkQueue { rest }
    }

    /// The next [`WORK_CHUNK`] passes in planning order; `None` once all are taken.
    fn next_chunk(&mut self) -> Option<Vec<(Option<usize>, usize, Pass)>> {
        if self.rest.is_empty() {
            return None;
        }
        let mut chunk = self
            .rest
            .split_off(self.rest.len().saturating_sub(WORK_CHUNK));
        chunk.reverse();
        // Give back the room of the taken passes now and then (each shrink copies what is left,
        // so halving keeps the copies to the list's size in all).
        if self.rest.capacity() > 2 * self.rest.len() + WORK_CHUNK {
            self.rest.shrink_to_fit();
        }
        Some(chunk)
    }
}

enum Item {
    Planned(Box<Planned>),
    Tradeoff(usize, Box<MaskAccumulator>),
}

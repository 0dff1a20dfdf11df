//! The contact plan: every satellite of the mission planned over the shared stations, then the
//! schedule ([`crate::schedule`]) choosing which antenna takes which contact, for how long, with
//! the data each satellite has on board.
//!
//! A contact candidate is a pass whose fixed rate closes: its span runs from the first to the
//! last closed second of that rate (the pass's `segments`), its volume is the rate times the
//! closed seconds, spread evenly over the span when the span is shortened. A station with
//! several antennas gives one candidate per antenna. A satellite with no `onboard:` block always
//! has data to send: its store is taken as full from the start and as large as everything it
//! could deliver in the window, so the store never limits it.
//!
//! ```no_run
//! use passbudget::config::mission::Mission;
//! use passbudget::plan::{fleet::FleetPlanner, PlanRequest};
//!
//! let mission = Mission::load("examples/fleet/kestrel-fleet.yaml".as_ref())?;
//! let fleet = FleetPlanner::new(&mission, &PlanRequest::default())?;
//! let (plans, contacts) = fleet.run()?;
//! println!("{} passes, {} contacts booked", plans.iter().map(|p| p.passes.len()).sum::<usize>(), contacts.contact_count());
//! # Ok::<(), Box<dyn std::error::Error>>(())
//! ```

use super::inputs::satellite_name;
use super::{Plan, PlanError, PlanRequest, Planner};
use crate::config::fleet::{Generation as GenerationConfig, Onboard};
use crate::config::mission::{Mission, SatelliteConfig};
use crate::orbit::Propagator;
use crate::schedule::{self, Antenna, BookingRules, Candidate, Generation, Satellite, Schedule};
use crate::timefmt::{add_seconds, seconds_between};
use chrono::{DateTime, Utc};

/// Every satellite of a mission, prepared for one window.
pub struct FleetPlanner {
    planners: Vec<Planner>,
    names: Vec<String>,
}

impl FleetPlanner {
    /// One planner per satellite (the same request for all; each checks its own elements).
    pub fn new(mission: &Mission, request: &PlanRequest) -> Result<FleetPlanner, PlanError> {
        let mut planners: Vec<Planner> = Vec::with_capacity(mission.satellites.len());
        for i in 0..mission.satellites.len() {
            let m = mission.for_satellite(i);
            let f = m.transmitter.as_ref().map(|t| t.frequency_hz);
            // The station tables of an earlier satellite on the same frequency are the same.
            let same = planners.iter().find(|p| Some(p.frequency_hz()) == f);
            planners.push(Planner::new_reusing(&m, request, same)?);
        }
        let names = planners.iter().map(name_of).collect();
        Ok(FleetPlanner { planners, names })
    }

    pub fn planners(&self) -> &[Planner] {
        &self.planners
    }

    /// The satellites' names: given in the mission file, else the element set's.
    pub fn names(&self) -> &[String] {
        &self.names
    }

    /// Plan every satellite, then schedule the contacts.
    pub fn run(&self) -> Result<(Vec<Plan>, ContactPlan), PlanError> {
        let plans = self
            .planners
            .iter()
            .map(Planner::collect)
            .collect::<Result<Vec<_>, _>>()?;
        let refs: Vec<&Planner> = self.planners.iter().collect();
        let contacts = contact_plan(&refs, &plans)?;
        Ok((plans, contacts))
    }
}

/// A satellite's name for the contact plan: the mission file's, else its element set's.
pub fn name_of(p: &Planner) -> String {
    p.mission().satellites[0]
        .name
        .clone()
        .unwrap_or_else(|| satellite_name(p.elements()))
}

/// One booked contact, as an operator books it.
#[derive(Debug, Clone, PartialEq)]
pub struct BookedContact {
    pub satellite: usize,
    pub station: usize,
    /// 0-based index among the station's antennas.
    pub antenna: usize,
    /// The planned pass (index into that satellite's `Plan::passes`).
    pub pass: usize,
    pub start: DateTime<Utc>,
    pub end: DateTime<Utc>,
    /// When the antenna starts slewing and setting up (start - turnaround).
    pub setup_start: DateTime<Utc>,
    pub rate_bps: f64,
    pub scheme: String,
    /// What the contact delivers: the link's volume, or less when the store runs out, bits.
    pub volume_bits: f64,
    /// Lowest margin of the chosen rate over the pass's closed seconds, dB (a shortened contact's
    /// own lowest margin is at least this).
    pub min_margin_db: Option<f64>,
    pub start_elevation_deg: f64,
    pub end_elevation_deg: f64,
    /// The highest elevation within the contact: the pass's own highest when the contact spans
    /// it, else the higher of its two ends (a pass's elevation rises to its highest point and
    /// falls after it, so a contact on one side of it is highest at an end), deg.
    pub max_elevation_deg: f64,
    /// Shortened to make room for another contact (or by a blocked period).
    pub shortened: bool,
}

/// The schedule of a window, with what it was built from.
#[derive(Debug, Clone)]
pub struct ContactPlan {
    pub satellites: Vec<String>,
    /// Whether each satellite has an `onboard:` block (otherwise its store is not followed).
    pub followed: Vec<bool>,
    /// Each satellite's priority weight.
    pub priority: Vec<f64>,
    /// Each satellite's store capacity as scheduled, bits.
    pub capacity_bits: Vec<f64>,
    /// Each satellite's store fill at the window start, bits (0 for a store not followed).
    pub initial_fill_bits: Vec<f64>,
    /// Each antenna's blocked periods.
    pub antenna_blocked: Vec<Vec<(DateTime<Utc>, DateTime<Utc>)>>,
    /// Every antenna: (station index, index among the station's antennas).
    pub antennas: Vec<(usize, usize)>,
    pub candidates: Vec<Candidate>,
    /// The scheduler's answer: `schedule.contacts` are the booked contacts in seconds from the
    /// window start; [`ContactPlan::contact`] gives each in operator terms.
    pub schedule: Schedule,
    /// Per booked contact (`schedule.contacts`' order), what the schedule does not hold.
    booked: Vec<BookedExtra>,
    /// Per satellite, the scheme of each ladder option.
    schemes: Vec<Vec<String>>,
    /// Wall time of the scheduler itself, s.
    pub scheduler_s: f64,
    pub window_start: DateTime<Utc>,
    pub window_s: f64,
}

/// What a booked contact adds to the schedule's own record (48 bytes, against 152 and a string
/// for a whole [`BookedContact`], which is made when asked for: a year's plan books thousands).
#[derive(Debug, Clone, Copy, PartialEq)]
struct BookedExtra {
    start_elevation_deg: f64,
    end_elevation_deg: f64,
    max_elevation_deg: f64,
    min_margin_db: Option<f64>,
    /// The pass's fixed-rate option (an index into the satellite's ladder).
    option: Option<u32>,
}

impl ContactPlan {
    /// The number of booked contacts.
    pub fn contact_count(&self) -> usize {
        self.schedule.contacts.len()
    }

    /// The `k`-th booked contact (in `schedule.contacts`' order: by start, then antenna).
    ///
    /// # Panics
    /// When `k >= self.contact_count()` (a caller's indexing error, not bad input).
    pub fn contact(&self, k: usize) -> BookedContact {
        let b = &self.schedule.contacts[k];
        let extra = &self.booked[k];
        let c = &self.candidates[b.candidate];
        let (station, antenna) = self.antennas[c.antenna];
        let at = |s: f64| add_seconds(&self.window_start, s);
        BookedContact {
            satellite: c.satellite,
            station,
            antenna,
            pass: c.pass_ref,
            start: at(b.start_s),
            end: at(b.end_s),
            setup_start: at(b.setup_start_s),
            rate_bps: c.rate_bps,
            scheme: extra
                .option
                .map(|o| self.schemes[c.satellite][o as usize].clone())
                .unwrap_or_default(),
            volume_bits: b.volume_bits,
            min_margin_db: extra.min_margin_db,
            start_elevation_deg: extra.start_elevation_deg,
            end_elevation_deg: extra.end_elevation_deg,
            max_elevation_deg: extra.max_elevation_deg,
            shortened: b.shortened,
        }
    }

    /// Every booked contact, made one at a time.
    pub fn contacts(&self) -> impl ExactSizeIterator<Item = BookedContact> + '_ {
        (0..self.contact_count()).map(|k| self.contact(k))
    }
}

/// Build the contact candidates of planned satellites (all planned over the same stations and
/// window) and schedule them.
pub fn contact_plan(planners: &[&Planner], plans: &[Plan]) -> Result<ContactPlan, PlanError> {
    contact_plan_with(planners, plans, &schedule::ScheduleOptions::default())
}

/// [`contact_plan`] with the scheduler's tuning (the size of the linear program solved for the
/// bound).
pub fn contact_plan_with(
    planners: &[&Planner],
    plans: &[Plan],
    options: &schedule::ScheduleOptions,
) -> Result<ContactPlan, PlanError> {
    let first = planners[0];
    let window = first.window();
    let window_s = seconds_between(&window.start(), &window.end());
    let stations = first.stations();
    // A contact shorter than the modem's dwell brings nothing a modem can lock on.
    let dwell_s = planners
        .iter()
        .map(|p| p.rates().min_dwell_s)
        .fold(0.0, f64::max);
    let mut antennas = Vec::new();
    let mut resources = Vec::new();
    for (si, st) in stations.iter().enumerate() {
        for k in 0..st.station.antennas {
            antennas.push((si, k));
            resources.push(antenna(&st.station, k, window.start(), dwell_s));
        }
    }
    // Sized once (counted first): grown by doubling, a year's candidates would be held twice
    // while they move, and leave a hole of their size behind.
    let per_station = |si: usize| antennas.iter().filter(|a| a.0 == si).count();
    let count: usize = plans
        .iter()
        .enumerate()
        .flat_map(|(sat, plan)| plan.passes.iter().enumerate().map(move |p| (sat, p)))
        .filter(|&(sat, (pi, p))| candidate(sat, pi, p, planners[sat]).is_some())
        .map(|(_, (_, p))| per_station(p.station_index))
        .sum();
    let mut candidates = Vec::with_capacity(count);
    for (sat, plan) in plans.iter().enumerate() {
        for (pi, p) in plan.passes.iter().enumerate() {
            let Some(c) = candidate(sat, pi, p, planners[sat]) else {
                continue;
            };
            for (ai, _) in antennas
                .iter()
                .enumerate()
                .filter(|(_, a)| a.0 == p.station_index)
            {
                candidates.push(Candidate { antenna: ai, ..c });
            }
        }
    }
    let satellites: Vec<Satellite> = planners
        .iter()
        .enumerate()
        .map(|(i, p)| satellite(i, p, &candidates, window.start()))
        .collect();
    let capacity_bits = satellites.iter().map(|s| s.capacity_bits).collect();
    let initial_fill_bits = satellites.iter().map(|s| s.initial_fill_bits).collect();
    let antenna_blocked = antennas
        .iter()
        .map(|&(si, _)| stations[si].station.booking.blocked.clone())
        .collect();
    let problem = schedule::Problem {
        window_s,
        satellites,
        antennas: resources,
        // Moved in and back out: one copy of the candidates, which grow with the window.
        candidates,
    };
    let clock = std::time::Instant::now();
    let sched = schedule::schedule_with(&problem, options).map_err(PlanError::Schedule)?;
    let scheduler_s = clock.elapsed().as_secs_f64();
    let candidates = problem.candidates;
    let booked = booked(&sched, &candidates, planners, plans)?;
    Ok(ContactPlan {
        satellites: planners.iter().map(|p| name_of(p)).collect(),
        followed: planners
            .iter()
            .map(|p| p.mission().satellites[0].onboard.is_some())
            .collect(),
        priority: planners
            .iter()
            .map(|p| p.mission().satellites[0].priority_weight)
            .collect(),
        capacity_bits,
        initial_fill_bits,
        antenna_blocked,
        antennas,
        candidates,
        schedule: sched,
        booked,
        schemes: planners
            .iter()
            .map(|p| p.rates().ladder.iter().map(|o| o.scheme.clone()).collect())
            .collect(),
        scheduler_s,
        window_start: window.start(),
        window_s,
    })
}

/// Antenna `k` of a station, its blocked periods in seconds from the window start; no contact
/// shorter than the station's `min_contact_s` or the modem's dwell `dwell_s`.
fn antenna(
    st: &crate::config::station::Station,
    k: usize,
    start: DateTime<Utc>,
    dwell_s: f64,
) -> Antenna {
    let b = &st.booking;
    Antenna {
        name: antenna_name(&st.name, st.antennas, k),
        station: st.name.clone(),
        turnaround_s: b.turnaround_s,
        rules: BookingRules {
            min_contact_s: b.min_contact_s.max(dwell_s),
            min_peak_elevation_deg: b.min_peak_elevation_deg,
            blocked: b
                .blocked
                .iter()
                .map(|(s, e)| (seconds_between(&start, s), seconds_between(&start, e)))
                .collect(),
        },
    }
}

/// An antenna's name: the station's, numbered when the station has several.
pub fn antenna_name(station: &str, antennas: usize, k: usize) -> String {
    if antennas > 1 {
        format!("{station} #{}", k + 1)
    } else {
        station.to_string()
    }
}

/// The candidate of a planned pass (antenna 0; the caller sets it), when its fixed rate closes.
fn candidate(sat: usize, pi: usize, p: &super::PassPlan, planner: &Planner) -> Option<Candidate> {
    let option = p.clear.option?;
    let (first, last) = (p.segments.first()?, p.segments.last()?);
    let span_s = last.end_s - first.start_s;
    if span_s <= 0.0 || p.clear.closed_s <= 0.0 {
        return None;
    }
    Some(Candidate {
        satellite: sat,
        antenna: 0,
        start_s: first.start_s,
        end_s: last.end_s,
        rate_bps: planner.rates().ladder[option.0].rate_bps,
        duty: (p.clear.volume_bits / (planner.rates().ladder[option.0].rate_bps * span_s))
            .clamp(1e-9, 1.0),
        peak_elevation_deg: p.pass.max_elevation_deg,
        pass_ref: pi,
    })
}

/// A satellite of the schedule: its `onboard:` block, or an always-full store as large as all it
/// could deliver.
fn satellite(i: usize, p: &Planner, candidates: &[Candidate], start: DateTime<Utc>) -> Satellite {
    let cfg: &SatelliteConfig = &p.mission().satellites[0];
    let (capacity_bits, initial_fill_bits, generation) = match &cfg.onboard {
        Some(o) => onboard(o, start),
        None => {
            let all: f64 = candidates
                .iter()
                .filter(|c| c.satellite == i)
                .map(|c| c.rate_bps * c.duty * (c.end_s - c.start_s))
                .sum();
            (all, all, Generation::AverageBps(0.0))
        }
    };
    Satellite {
        name: name_of(p),
        priority_weight: cfg.priority_weight,
        capacity_bits,
        initial_fill_bits,
        generation,
        max_downlinks: cfg.max_downlinks,
    }
}

/// The store and the payload of an `onboard:` block over the window from `start`: the file's
/// generation windows in seconds from `start`, cut at it (imaging before the window start is not
/// followed: what it left on board is the block's `initial_fill_bits`).
fn onboard(o: &Onboard, start: DateTime<Utc>) -> (f64, f64, Generation) {
    let generation = match &o.generation {
        GenerationConfig::Average { rate_bps } => Generation::AverageBps(*rate_bps),
        GenerationConfig::Windows { windows, .. } => Generation::Windows(
            windows
                .iter()
                .map(|w| schedule::GenerationWindow {
                    start_s: seconds_between(&start, &w.start).max(0.0),
                    end_s: seconds_between(&start, &w.end),
                    rate_bps: w.rate_bps,
                })
                .filter(|w| w.end_s > 0.0)
                .collect(),
        ),
    };
    (o.storage_bits, o.initial_fill_bits, generation)
}

/// What each booked contact adds to the schedule: the elevations at start and end, the pass's
/// lowest margin and fixed-rate option.
fn booked(
    s: &Schedule,
    candidates: &[Candidate],
    planners: &[&Planner],
    plans: &[Plan],
) -> Result<Vec<BookedExtra>, PlanError> {
    let props = planners
        .iter()
        .map(|p| Propagator::new(p.elements()).map_err(PlanError::Propagator))
        .collect::<Result<Vec<_>, _>>()?;
    let start = planners[0].window().start();
    let mut out = Vec::with_capacity(s.contacts.len());
    for b in &s.contacts {
        let c = &candidates[b.candidate];
        let planner = planners[c.satellite];
        let pass = &plans[c.satellite].passes[c.pass_ref];
        let observer = &planner.stations()[pass.station_index].observer;
        let elevation = |t: DateTime<Utc>| -> Result<f64, PlanError> {
            let ecef = props[c.satellite]
                .ecef_at(&t)
                .map_err(PlanError::Propagator)?;
            Ok(observer.look(&ecef).elevation_deg)
        };
        let (t0, t1) = (add_seconds(&start, b.start_s), add_seconds(&start, b.end_s));
        let (e0, e1) = (elevation(t0)?, elevation(t1)?);
        let highest = &pass.pass;
        out.push(BookedExtra {
            start_elevation_deg: e0,
            end_elevation_deg: e1,
            max_elevation_deg: if (t0..=t1).contains(&highest.tca) {
                highest.max_elevation_deg
            } else {
                e0.max(e1)
            },
            min_margin_db: pass.clear.min_margin_db,
            option: pass.clear.option.map(|o| o.0 as u32),
        });
    }
    Ok(out)
}

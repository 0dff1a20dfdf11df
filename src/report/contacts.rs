//! Wire format of the contact plan: the booked contacts, each satellite's data, each station's
//! booked time and the schedule's bound (public interface; fields documented in the README).

use crate::plan::fleet::{antenna_name, BookedContact, ContactPlan};
use crate::plan::prepare::StationModel;
use crate::plan::Plan;
use crate::report::round;
use crate::timefmt::{format_ms, parse_utc};
use serde::Serialize;

/// One booked contact.
#[derive(Debug, Clone, Serialize, Default)]
pub struct ContactRow {
    pub satellite: String,
    pub station: String,
    /// The antenna: the station's name, numbered (`Nordkam #2`) when it has several.
    pub antenna: String,
    pub start: String,
    pub end: String,
    /// When the antenna starts slewing and setting up for this contact.
    pub setup_start: String,
    pub duration_s: f64,
    #[serde(serialize_with = "crate::report::whole")]
    pub rate_bps: f64,
    pub scheme: String,
    /// What the contact delivers (limited by the data on board), bits.
    #[serde(serialize_with = "crate::report::whole")]
    pub volume_bits: f64,
    pub min_margin_db: Option<f64>,
    pub start_elevation_deg: f64,
    pub end_elevation_deg: f64,
    /// The highest elevation within the contact ([`crate::plan::BookedContact`]).
    pub max_elevation_deg: f64,
    /// Shortened to make room for another contact or a blocked period.
    pub shortened: bool,
    /// The pass it books ([`crate::report::pass_id`]).
    pub pass_id: String,
}

/// One satellite's data over the window.
#[derive(Debug, Clone, Serialize, Default)]
pub struct SatelliteRow {
    pub name: String,
    pub priority: f64,
    /// Whether its store is followed (an `onboard:` block); when not, the generation, loss,
    /// storage and latency fields are null.
    pub onboard_followed: bool,
    /// On board at the window start (the mission's `initial_fill_bits`), bits: with the
    /// generated bits, what is delivered, lost or left on board.
    #[serde(serialize_with = "crate::report::whole_opt")]
    pub initial_fill_bits: Option<f64>,
    #[serde(serialize_with = "crate::report::whole_opt")]
    pub generated_bits: Option<f64>,
    #[serde(serialize_with = "crate::report::whole")]
    pub delivered_bits: f64,
    #[serde(serialize_with = "crate::report::whole_opt")]
    pub lost_bits: Option<f64>,
    #[serde(serialize_with = "crate::report::whole_opt")]
    pub storage_peak_bits: Option<f64>,
    #[serde(serialize_with = "crate::report::whole_opt")]
    pub final_fill_bits: Option<f64>,
    /// Age of the oldest data on board at the start of each downlink: the largest and the median, s.
    pub max_latency_s: Option<f64>,
    pub median_latency_s: Option<f64>,
    pub contacts: usize,
    /// The sum over its passes at the fixed rate, with no antenna, store or turnaround limit.
    #[serde(serialize_with = "crate::report::whole")]
    pub unconstrained_volume_bits: f64,
    /// Its passes with a closing rate that no antenna booked: all of them, then by the reason
    /// (of the first antenna that had the pass): below the minimum peak elevation, blocked,
    /// shorter than the minimum contact, lost to overlap (other contacts with their set-up, or
    /// the satellite's downlinks, took the time), no gain (free, but booking it adds nothing:
    /// nothing on board by then), nothing on board.
    pub not_booked: usize,
    pub not_booked_below_min_peak_elevation: usize,
    pub not_booked_blocked: usize,
    pub not_booked_shorter_than_min_contact: usize,
    pub not_booked_lost_to_overlap: usize,
    pub not_booked_no_gain: usize,
    pub not_booked_nothing_on_board: usize,
}

/// One station's booked time.
#[derive(Debug, Clone, Serialize, Default)]
pub struct StationRow {
    pub name: String,
    pub antennas: usize,
    pub contacts: usize,
    /// Contact time booked over all its antennas (set-up not included), s.
    pub booked_s: f64,
    /// Booked time over (window length x antennas).
    pub utilization: f64,
}

/// The schedule's upper bound on the delivered data, and how the schedule was found.
#[derive(Debug, Clone, Serialize)]
pub struct ScheduleBoundRow {
    #[serde(serialize_with = "crate::report::whole")]
    pub delivered_upper_bits: f64,
    /// (bound - delivered) / bound.
    pub gap: f64,
    /// The bound on what the scheduler maximizes, the delivered bits weighted by priority.
    pub weighted_upper: f64,
    /// (weighted bound - weighted delivered) / weighted bound.
    pub weighted_gap: f64,
    /// `exact`, `exact search cut short (not proved optimal)` or `heuristic (antenna rounds)`.
    pub method: &'static str,
}

/// Passes of a satellite that no antenna booked, by the reason of the first antenna that had it
/// (the `not_booked_*` fields of [`SatelliteRow`]).
#[derive(Debug, Clone, Default)]
struct NotBookedCounts {
    below_min_peak_elevation: usize,
    blocked: usize,
    shorter_than_min_contact: usize,
    lost_to_overlap: usize,
    no_gain: usize,
    nothing_on_board: usize,
}

/// The contact plan's part of a summary.
#[derive(Debug, Clone, Serialize)]
pub struct ContactDoc {
    pub contacts: Vec<ContactRow>,
    pub satellites: Vec<SatelliteRow>,
    pub stations: Vec<StationRow>,
    pub schedule_bound: ScheduleBoundRow,
    /// Wall time of the scheduler, s: shown in the table, kept out of the files (it changes from
    /// run to run, and the same inputs write the same files).
    #[serde(skip)]
    pub scheduler_s: f64,
    /// Figures over every booked contact, gathered from the rows as they were made: the same
    /// whether `contacts` keeps the rows ([`ContactDoc::new`]) or not
    /// ([`ContactDoc::without_contact_rows`]).
    #[serde(skip)]
    pub booked: BookedSummary,
}

/// What the rest of a summary needs from the booked contacts' rows (the count, the sums per
/// window and per day), gathered one row at a time so that the rows need not be kept.
#[derive(Debug, Clone)]
pub struct BookedSummary {
    pub contacts: usize,
    /// The sum of the rows' (rounded) volumes, in contact order, bits.
    pub delivered_bits: f64,
    /// Per UTC day, the rows' volumes spread evenly over their (millisecond) times, bits.
    pub delivered_by_day: std::collections::BTreeMap<chrono::NaiveDate, f64>,
    /// A contact was shortened to make room for another one, a set-up or a blocked period.
    pub any_shortened: bool,
}

impl Default for BookedSummary {
    fn default() -> Self {
        BookedSummary {
            contacts: 0,
            // The neutral element of `Iterator::sum` (the sum was taken over the kept rows
            // before), so that even an empty plan's total keeps its sign bit.
            delivered_bits: std::iter::empty::<f64>().sum(),
            delivered_by_day: Default::default(),
            any_shortened: false,
        }
    }
}

impl BookedSummary {
    /// Add one contact's row.
    pub fn add(&mut self, c: &ContactRow) {
        self.contacts += 1;
        self.delivered_bits += c.volume_bits;
        self.any_shortened |= c.shortened;
        let (Ok(s), Ok(e)) = (parse_utc(&c.start), parse_utc(&c.end)) else {
            return;
        };
        let whole = (e - s).as_seconds_f64();
        let mut day = s.date_naive();
        while whole > 0.0 && day <= e.date_naive() {
            let d0 = day.and_time(chrono::NaiveTime::MIN).and_utc();
            let d1 = d0 + chrono::Duration::days(1);
            let part = (e.min(d1) - s.max(d0)).as_seconds_f64();
            if part > 0.0 {
                *self.delivered_by_day.entry(day).or_insert(0.0) += c.volume_bits * part / whole;
            }
            day = day.succ_opt().unwrap_or(day);
            if d1 >= e {
                break;
            }
        }
    }
}

/// Makes the row of any booked contact of a contact plan when it is needed (a table writes the
/// rows one at a time; the rows of a year are a few MB).
pub struct ContactRows<'a> {
    cp: &'a ContactPlan,
    plans: &'a [Plan],
    stations: Vec<(String, usize)>,
}

impl<'a> ContactRows<'a> {
    /// Whether a table of these contacts shows the year ([`crate::timefmt::needs_year`]): from
    /// the earliest set-up (a set-up can begin before the window) to the window's end.
    pub fn needs_year(&self) -> bool {
        let start = self.cp.window_start;
        let first_s = (self.cp.schedule.contacts.iter())
            .map(|c| c.setup_start_s)
            .fold(0.0, f64::min);
        crate::timefmt::needs_year(
            &crate::timefmt::add_seconds(&start, first_s),
            &crate::timefmt::add_seconds(&start, self.cp.window_s),
        )
    }

    /// The rows of `cp` over `stations` (the planners' stations, shared by the fleet).
    pub fn new(cp: &'a ContactPlan, plans: &'a [Plan], stations: &[StationModel]) -> Self {
        let stations = stations
            .iter()
            .map(|s| (s.station.name.clone(), s.station.antennas))
            .collect();
        ContactRows {
            cp,
            plans,
            stations,
        }
    }

    /// The number of booked contacts.
    pub fn len(&self) -> usize {
        self.cp.contact_count()
    }

    pub fn is_empty(&self) -> bool {
        self.cp.contact_count() == 0
    }

    /// The row of the `k`-th booked contact.
    pub fn row(&self, k: usize) -> ContactRow {
        contact_row(self.cp, self.plans, &self.stations, &self.cp.contact(k))
    }
}

impl ContactDoc {
    /// The rows of a contact plan over `stations` (the planners' stations, shared by the fleet).
    pub fn new(cp: &ContactPlan, plans: &[Plan], stations: &[StationModel]) -> Self {
        Self::build(cp, plans, stations, true)
    }

    /// Every part but the booked contacts' rows (`contacts` is empty; `booked` holds their
    /// count and sums), for a reader that makes each row when it needs it ([`ContactRows`]:
    /// the `plan` table).
    pub fn without_contact_rows(
        cp: &ContactPlan,
        plans: &[Plan],
        stations: &[StationModel],
    ) -> Self {
        Self::build(cp, plans, stations, false)
    }

    fn build(cp: &ContactPlan, plans: &[Plan], stations: &[StationModel], keep: bool) -> Self {
        let rows = ContactRows::new(cp, plans, stations);
        let mut booked = BookedSummary::default();
        let mut contacts = Vec::with_capacity(if keep { rows.len() } else { 0 });
        for k in 0..rows.len() {
            let row = rows.row(k);
            booked.add(&row);
            if keep {
                contacts.push(row);
            }
        }
        let tally = Tally::of(cp, rows.stations.len());
        let satellites = (0..cp.satellites.len())
            .map(|i| satellite_row(cp, plans, &tally, i))
            .collect();
        let station_rows = rows
            .stations
            .iter()
            .zip(&tally.stations)
            .map(|((name, n), &(contacts, booked_s))| StationRow {
                name: name.clone(),
                antennas: *n,
                contacts,
                booked_s: round(booked_s, 1),
                utilization: round(booked_s / (cp.window_s * *n as f64), 4),
            })
            .collect();
        ContactDoc {
            contacts,
            satellites,
            stations: station_rows,
            schedule_bound: bound_row(&cp.schedule),
            scheduler_s: round(cp.scheduler_s, 4),
            booked,
        }
    }

    /// The sum over the booked contacts, bits.
    pub fn delivered_bits(&self) -> f64 {
        self.booked.delivered_bits
    }

    /// What the contacts deliver on each UTC day, each contact's volume spread evenly over its
    /// time (a contact across midnight split by its time), bits: one pass over the contacts.
    pub fn delivered_by_day(&self) -> &std::collections::BTreeMap<chrono::NaiveDate, f64> {
        &self.booked.delivered_by_day
    }
}

/// Per station and per satellite sums over the booked contacts, made in one pass over them (in
/// their order, so the same sums as a pass per station or satellite).
struct Tally {
    /// (contacts, booked seconds) per station.
    stations: Vec<(usize, f64)>,
    /// (contacts, delivered bits, booked passes) per satellite.
    satellites: Vec<(usize, f64, std::collections::HashSet<usize>)>,
}

impl Tally {
    fn of(cp: &ContactPlan, n_stations: usize) -> Self {
        let mut t = Tally {
            stations: vec![(0, 0.0); n_stations],
            // (the delivered sum from `Iterator::sum`'s neutral element, as the sum over a
            // satellite's contacts was taken before: a satellite without contacts keeps its sign)
            satellites: vec![
                (0, std::iter::empty::<f64>().sum(), Default::default());
                cp.satellites.len()
            ],
        };
        for c in cp.contacts() {
            let st = &mut t.stations[c.station];
            st.0 += 1;
            st.1 += (c.end - c.start).as_seconds_f64();
            let sat = &mut t.satellites[c.satellite];
            sat.0 += 1;
            sat.1 += c.volume_bits.round();
            sat.2.insert(c.pass);
        }
        t
    }
}

fn bound_row(s: &crate::schedule::Schedule) -> ScheduleBoundRow {
    use crate::schedule::Method;
    ScheduleBoundRow {
        delivered_upper_bits: s.bound.delivered_upper_bits.round(),
        gap: round(s.bound.gap, 4),
        weighted_upper: s.bound.weighted_upper.round(),
        weighted_gap: round(s.bound.weighted_gap, 4),
        method: match s.method {
            Method::Sequential => "exact",
            Method::SequentialCapped => "exact search cut short (not proved optimal)",
            Method::AntennaRounds { .. } => "heuristic (antenna rounds)",
        },
    }
}

/// Satellite `i`'s passes no antenna booked, each counted once with the reason of its first
/// candidate (a pass at a station of several antennas has one candidate per antenna).
fn not_booked(
    cp: &ContactPlan,
    i: usize,
    booked: &std::collections::HashSet<usize>,
) -> NotBookedCounts {
    use crate::schedule::NotBooked as N;
    let mut seen = std::collections::HashSet::new();
    let mut row = NotBookedCounts::default();
    for r in &cp.schedule.not_booked {
        let c = &cp.candidates[r.candidate];
        if c.satellite != i || booked.contains(&c.pass_ref) || !seen.insert(c.pass_ref) {
            continue;
        }
        *match r.reason {
            N::BelowMinPeakElevation => &mut row.below_min_peak_elevation,
            N::Blocked => &mut row.blocked,
            N::ShorterThanMinContact => &mut row.shorter_than_min_contact,
            N::LostToOverlap => &mut row.lost_to_overlap,
            N::NoGain => &mut row.no_gain,
            N::NothingOnBoard => &mut row.nothing_on_board,
        } += 1;
    }
    row
}

fn contact_row(
    cp: &ContactPlan,
    plans: &[Plan],
    stations: &[(String, usize)],
    c: &BookedContact,
) -> ContactRow {
    let (name, n) = &stations[c.station];
    let pass = &plans[c.satellite].passes[c.pass].pass;
    ContactRow {
        satellite: cp.satellites[c.satellite].clone(),
        station: name.clone(),
        antenna: antenna_name(name, *n, c.antenna),
        start: format_ms(&c.start),
        end: format_ms(&c.end),
        setup_start: format_ms(&c.setup_start),
        duration_s: round((c.end - c.start).as_seconds_f64(), 1),
        rate_bps: c.rate_bps,
        scheme: c.scheme.clone(),
        volume_bits: c.volume_bits.round(),
        min_margin_db: c.min_margin_db.map(|m| round(m, 2)),
        start_elevation_deg: round(c.start_elevation_deg, 2),
        end_elevation_deg: round(c.end_elevation_deg, 2),
        max_elevation_deg: round(c.max_elevation_deg, 2),
        shortened: c.shortened,
        pass_id: crate::report::pass_id(name, pass),
    }
}

fn satellite_row(cp: &ContactPlan, plans: &[Plan], tally: &Tally, i: usize) -> SatelliteRow {
    let (contacts, delivered_bits, booked) = &tally.satellites[i];
    let s = &cp.schedule.satellites[i];
    let followed = cp.followed[i];
    let when = |x: f64| followed.then_some(x.round());
    let latency = followed && !s.latencies_s.is_empty();
    let n = not_booked(cp, i, booked);
    SatelliteRow {
        name: cp.satellites[i].clone(),
        priority: cp.priority[i],
        onboard_followed: followed,
        initial_fill_bits: when(cp.initial_fill_bits[i]),
        generated_bits: when(s.generated_bits),
        delivered_bits: *delivered_bits,
        lost_bits: when(s.lost_bits),
        storage_peak_bits: when(s.storage_peak_bits),
        final_fill_bits: when(s.final_fill_bits),
        max_latency_s: latency.then_some(round(s.max_latency_s, 1)),
        median_latency_s: latency.then_some(round(s.median_latency_s, 1)),
        contacts: *contacts,
        unconstrained_volume_bits: plans[i].totals.volume_bits.round(),
        not_booked: n.below_min_peak_elevation
            + n.blocked
            + n.shorter_than_min_contact
            + n.lost_to_overlap
            + n.no_gain
            + n.nothing_on_board,
        not_booked_below_min_peak_elevation: n.below_min_peak_elevation,
        not_booked_blocked: n.blocked,
        not_booked_shorter_than_min_contact: n.shorter_than_min_contact,
        not_booked_lost_to_overlap: n.lost_to_overlap,
        not_booked_no_gain: n.no_gain,
        not_booked_nothing_on_board: n.nothing_on_board,
    }
}

/// The whole fleet's summary (`plan --format json` and `summary.json` for a mission with several
/// satellites): the contact plan, the totals, every satellite's passes and every warning.
#[derive(Debug, Clone, Serialize)]
pub struct FleetDoc {
    pub mission: String,
    pub window_start: String,
    pub window_end: String,
    pub totals: FleetTotalsRow,
    #[serde(flatten)]
    pub contact: ContactDoc,
    /// What the contact plan delivers each UTC day of the window (days without contacts
    /// included; a contact across midnight split by its time).
    pub days: Vec<FleetDayRow>,
    /// Every satellite's passes (the `satellite` field says whose), in AOS order per satellite.
    pub passes: Vec<super::plan::PlanPassRow>,
    /// Each warning once, prefixed with the satellite it concerns.
    pub warnings: Vec<String>,
    /// Those of `warnings` that are notes (values recalled from memory, the adaptive mode's note):
    /// the command line prints them as `note:` lines.
    #[serde(skip)]
    pub notes: Vec<String>,
    pub caution: &'static str,
}

/// One UTC day of a fleet's contact plan.
#[derive(Debug, Clone, Serialize, Default)]
pub struct FleetDayRow {
    pub date: String,
    #[serde(serialize_with = "crate::report::whole")]
    pub delivered_bits: f64,
}

/// The fleet's totals: the delivered data first.
#[derive(Debug, Clone, Serialize)]
pub struct FleetTotalsRow {
    /// The sum over the booked contacts.
    #[serde(serialize_with = "crate::report::whole")]
    pub delivered_bits: f64,
    pub contacts: usize,
    pub passes: usize,
    pub passes_closing: usize,
    /// The sum over every satellite's passes at its fixed rate, with no antenna, store or
    /// turnaround limit (two satellites over one antenna both count).
    #[serde(serialize_with = "crate::report::whole")]
    pub unconstrained_volume_bits: f64,
    pub days: f64,
}

impl FleetDoc {
    /// `planners[i]` planned `plans[i]`; `pass_rows`: also every pass's row (for JSON, CSV and
    /// files; a table does without them, and they are most of the document's memory).
    pub fn new(
        planners: &[&crate::plan::Planner],
        plans: &[Plan],
        contact: ContactDoc,
        pass_rows: bool,
    ) -> FleetDoc {
        let w = planners[0].window();
        let mut passes = Vec::new();
        for (p, plan) in planners.iter().zip(plans).filter(|_| pass_rows) {
            passes.extend(
                plan.passes
                    .iter()
                    .map(|x| super::plan::PlanPassRow::new(p, x)),
            );
        }
        let (warnings, notes) = fleet_warnings(planners, plans);
        let by_day = contact.delivered_by_day();
        let days = w
            .utc_dates()
            .into_iter()
            .map(|d| FleetDayRow {
                date: d.to_string(),
                delivered_bits: by_day.get(&d).copied().unwrap_or(0.0).round(),
            })
            .collect();
        FleetDoc {
            mission: planners[0].mission().name.clone(),
            window_start: format_ms(&w.start()),
            window_end: format_ms(&w.end()),
            totals: FleetTotalsRow {
                delivered_bits: contact.delivered_bits(),
                contacts: contact.booked.contacts,
                passes: plans.iter().map(|p| p.totals.passes).sum(),
                passes_closing: plans.iter().map(|p| p.totals.passes_closing).sum(),
                unconstrained_volume_bits: plans.iter().map(|p| p.totals.volume_bits.round()).sum(),
                days: round(w.days(), 4),
            },
            contact,
            days,
            passes,
            warnings,
            notes,
            caution: super::plan::CAUTION,
        }
    }
}

/// Each warning once, prefixed with the satellites that raised it (`every satellite` when all did);
/// with them each plan's notes of values recalled from memory (the built-in thresholds and the
/// pfd row its figures rest on, [`crate::plan::pfd::unconfirmed_notes`]) and its adaptive note
/// ([`crate::plan::summary::adaptive_note`]) and its element-set notes (the set chosen from a
/// history, the keywords of its OMM ignored: [`crate::plan::inputs::element_notes`]), so a
/// fleet's outputs carry them as a single satellite's do.
/// Also returns which of the lines came from notes (printed as `note:`, as a single satellite's
/// plan prints them).
fn fleet_warnings(
    planners: &[&crate::plan::Planner],
    plans: &[Plan],
) -> (Vec<String>, Vec<String>) {
    // (text, satellites that raised it, a note)
    let mut by_text: Vec<(String, Vec<String>, bool)> = Vec::new();
    for (p, plan) in planners.iter().zip(plans) {
        let name = crate::plan::fleet::name_of(p);
        use crate::plan::NoteKind as K;
        let recalled = (plan.notes.iter())
            .filter(|n| {
                matches!(
                    n.kind,
                    K::RecalledThreshold | K::RecalledPfd | K::Adaptive | K::ElementSet
                )
            })
            .map(|n| &n.text);
        let lines = (plan.warnings.iter().map(|w| (w, false))).chain(recalled.map(|n| (n, true)));
        for (m, is_note) in lines {
            match by_text.iter_mut().find(|(t, _, _)| t == m) {
                Some((_, who, _)) if !who.contains(&name) => who.push(name.clone()),
                Some(_) => {}
                None => by_text.push((m.clone(), vec![name.clone()], is_note)),
            }
        }
    }
    let mut notes = Vec::new();
    let all = by_text
        .into_iter()
        .map(|(text, who, is_note)| {
            let line = match who.len() == planners.len() && who.len() > 1 {
                true => format!("every satellite: {text}"),
                false => format!("{}: {text}", who.join(", ")),
            };
            if is_note {
                notes.push(line.clone());
            }
            line
        })
        .collect();
    (all, notes)
}

/// Write the contact plan's files into `dir` in `mode` (a staging folder: not flushed one by one,
/// its commit flushes the set): `contacts.csv`, `satellites.csv`, `stations.csv` and one
/// iCalendar file per station, `calendar-<station>.ics` (`stamp`: the events' DTSTAMP; see
/// [`super::calendar::station_calendar`]).
pub fn write_contact_files(
    dir: &std::path::Path,
    doc: &ContactDoc,
    warnings: &[String],
    (stamp, mode): (chrono::DateTime<chrono::Utc>, super::WriteMode),
) -> Result<(), super::files::FileError> {
    use super::files::{file_error, io_error};
    let files: [(&str, Result<String, csv::Error>); 3] = [
        ("contacts.csv", super::to_csv(&doc.contacts, warnings)),
        ("satellites.csv", super::to_csv(&doc.satellites, warnings)),
        ("stations.csv", super::to_csv(&doc.stations, warnings)),
    ];
    for (name, text) in files {
        let path = dir.join(name);
        let text = text.map_err(|e| file_error(&path, e))?;
        super::write_output(&path, text.as_bytes(), mode).map_err(|e| io_error(&path, e))?;
    }
    for s in &doc.stations {
        let path = dir.join(format!("calendar-{}.ics", super::slug(&s.name)));
        let text = super::calendar::station_calendar(&s.name, &doc.contacts, stamp)
            .map_err(|e| io_error(&path, std::io::Error::other(e)))?;
        super::write_output(&path, text.as_bytes(), mode).map_err(|e| io_error(&path, e))?;
    }
    Ok(())
}

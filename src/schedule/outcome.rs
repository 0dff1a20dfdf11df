//! The final evaluation of a set of bookings: volumes, store timelines, latencies, antenna
//! use.

use super::model::Problem;
use super::store::{advance, generated_until, oldest_age_s, slope_changes, SatState, Trace};
use super::sweep::Opt;

/// One booked contact.
#[derive(Debug, Clone, PartialEq)]
pub struct Contact {
    /// Index into [`Problem::candidates`].
    pub candidate: usize,
    pub satellite: usize,
    pub antenna: usize,
    pub start_s: f64,
    pub end_s: f64,
    /// `start_s - turnaround_s`: the antenna is ours from here.
    pub setup_start_s: f64,
    /// Delivered by this contact: at most `rate * duty * (end - start)`, less when the store
    /// runs empty.
    pub volume_bits: f64,
    /// Booked shorter than the candidate's span (by a blocked period or an overlap).
    pub shortened: bool,
}

/// One satellite over the window. `initial + generated = delivered + lost + final_fill`.
#[derive(Debug, Clone, PartialEq)]
pub struct SatelliteOutcome {
    /// Generated during the window (the initial fill not included).
    pub generated_bits: f64,
    pub delivered_bits: f64,
    /// Generation that found the store full (the newest data is the data lost).
    pub lost_bits: f64,
    pub storage_peak_bits: f64,
    pub final_fill_bits: f64,
    /// Per booked contact of this satellite, in start order: the age of the oldest data on
    /// board at the contact start (FIFO; 0 when the store is empty; the initial fill counts as
    /// born at the window start).
    pub latencies_s: Vec<f64>,
    /// Maximum of `latencies_s` (0 with no contact).
    pub max_latency_s: f64,
    /// Median of `latencies_s` (mean of the two middle values for an even count; 0 with no
    /// contact).
    pub median_latency_s: f64,
    /// Fill `(t_s, fill_bits)` at the window start, the end and every change of slope.
    pub storage_timeline: Vec<(f64, f64)>,
    /// Intervals `(start_s, end_s)` when generation found the store full.
    pub lost_intervals: Vec<(f64, f64)>,
}

/// One antenna over the window.
#[derive(Debug, Clone, PartialEq)]
pub struct AntennaOutcome {
    /// Sum of booked contact lengths (set-up not included).
    pub booked_s: f64,
    /// `booked_s / window_s`.
    pub utilization: f64,
}

fn median(values: &[f64]) -> f64 {
    let mut v = values.to_vec();
    v.sort_by(f64::total_cmp);
    match v.len() {
        0 => 0.0,
        n if n % 2 == 1 => v[n / 2],
        n => 0.5 * (v[n / 2 - 1] + v[n / 2]),
    }
}

/// Simulates one satellite with its booked contacts (indices into `opts`), returning the
/// volume of each of those contacts (same order) and the satellite's outcome.
fn simulate_satellite(
    problem: &Problem,
    s: usize,
    opts: &[Opt],
    mine: &[usize],
) -> (Vec<f64>, SatelliteOutcome) {
    let sat = &problem.satellites[s];
    let n = mine.len();
    let mut st = SatState::start(sat);
    // The start, one point per event and the end: more only where the store fills or empties
    // within a piece, or at generation windows.
    let mut trace = Trace::begin(&st, 2 * n + 2);
    let mut running: Vec<usize> = Vec::new();
    let mut volumes = vec![0.0; mine.len()];
    let mut latencies = vec![0.0; mine.len()];
    for (t_s, is_start, k) in events(opts, mine) {
        step(
            problem,
            sat,
            &mut st,
            &mut trace,
            t_s,
            &running,
            mine,
            opts,
            &mut volumes,
        );
        if is_start {
            latencies[k] = oldest_age_s(&trace.kept, t_s, st.delivered_bits, st.fill_bits);
            running.push(k);
        } else {
            running.retain(|&r| r != k);
        }
    }
    step(
        problem,
        sat,
        &mut st,
        &mut trace,
        problem.window_s,
        &running,
        mine,
        opts,
        &mut volumes,
    );
    let Trace { fill, kept, lost } = trace;
    drop(kept);
    let outcome = SatelliteOutcome {
        generated_bits: generated_until(sat, problem.window_s),
        delivered_bits: st.delivered_bits,
        lost_bits: st.lost_bits,
        storage_peak_bits: fill.iter().map(|p| p.1).fold(0.0, f64::max),
        final_fill_bits: st.fill_bits,
        max_latency_s: latencies.iter().copied().fold(0.0, f64::max),
        median_latency_s: median(&latencies),
        latencies_s: latencies,
        storage_timeline: slope_changes(fill),
        lost_intervals: lost,
    };
    (volumes, outcome)
}

/// The starts and ends of the contacts `mine` (sorted by start), in time order: ends before
/// starts at the same instant, then by contact order; `(t_s, is_start, k)` for `mine[k]`.
/// Merged from the starts in order and the ends sorted by index (4 bytes a contact, where a
/// sorted list of the events would take 48).
fn events<'a>(opts: &'a [Opt], mine: &'a [usize]) -> impl Iterator<Item = (f64, bool, usize)> + 'a {
    let n = mine.len();
    let end = |k: usize| opts[mine[k]].y_s;
    let mut ends: Vec<u32> = (0..n as u32).collect();
    ends.sort_unstable_by(|&a, &b| end(a as usize).total_cmp(&end(b as usize)).then(a.cmp(&b)));
    let (mut s, mut e) = (0, 0);
    std::iter::from_fn(move || {
        let x = (s < n).then(|| opts[mine[s]].x_s);
        let y = (e < n).then(|| end(ends[e] as usize));
        match (x, y) {
            (Some(x), Some(y)) if x.total_cmp(&y) == std::cmp::Ordering::Less => {
                s += 1;
                Some((x, true, s - 1))
            }
            (_, Some(y)) => {
                e += 1;
                Some((y, false, ends[e - 1] as usize))
            }
            (Some(x), None) => {
                s += 1;
                Some((x, true, s - 1))
            }
            (None, None) => None,
        }
    })
}

/// Advances to `t_s` with the running contacts, sharing what is delivered in proportion to
/// their drains.
#[allow(clippy::too_many_arguments)]
fn step(
    problem: &Problem,
    sat: &super::model::Satellite,
    st: &mut SatState,
    trace: &mut Trace,
    t_s: f64,
    running: &[usize],
    mine: &[usize],
    opts: &[Opt],
    volumes: &mut [f64],
) {
    let q: f64 = running.iter().map(|&k| opts[mine[k]].q_bps(problem)).sum();
    let before = st.delivered_bits;
    advance(sat, st, t_s, q, Some(trace));
    let delivered = st.delivered_bits - before;
    if q > 0.0 {
        for &k in running {
            volumes[k] += delivered * opts[mine[k]].q_bps(problem) / q;
        }
    }
}

/// Evaluates the booked trims `opts`: contacts sorted by start then antenna, satellite
/// outcomes, antenna outcomes.
pub(crate) fn evaluate(
    problem: &Problem,
    opts: &[Opt],
) -> (Vec<Contact>, Vec<SatelliteOutcome>, Vec<AntennaOutcome>) {
    let mut contacts = Vec::with_capacity(opts.len());
    let mut sat_outcomes = Vec::with_capacity(problem.satellites.len());
    for s in 0..problem.satellites.len() {
        let mut mine: Vec<usize> = (0..opts.len()).filter(|&i| opts[i].sat() == s).collect();
        mine.sort_by(|&i, &j| {
            opts[i]
                .x_s
                .total_cmp(&opts[j].x_s)
                .then(opts[i].antenna().cmp(&opts[j].antenna()))
        });
        let (volumes, outcome) = simulate_satellite(problem, s, opts, &mine);
        for (k, &i) in mine.iter().enumerate() {
            let o = &opts[i];
            let c = &problem.candidates[o.cand()];
            let (s0, e0) = (c.start_s, c.end_s);
            contacts.push(Contact {
                candidate: o.cand(),
                satellite: s,
                antenna: o.antenna(),
                start_s: o.x_s,
                end_s: o.y_s,
                setup_start_s: o.x_s - problem.antennas[o.antenna()].turnaround_s,
                volume_bits: volumes[k],
                shortened: o.x_s > s0 || o.y_s < e0,
            });
        }
        sat_outcomes.push(outcome);
    }
    contacts.sort_by(|a, b| {
        a.start_s
            .total_cmp(&b.start_s)
            .then(a.antenna.cmp(&b.antenna))
            .then(a.candidate.cmp(&b.candidate))
    });
    let mut antennas = vec![
        AntennaOutcome {
            booked_s: 0.0,
            utilization: 0.0
        };
        problem.antennas.len()
    ];
    for c in &contacts {
        antennas[c.antenna].booked_s += c.end_s - c.start_s;
    }
    for a in &mut antennas {
        a.utilization = a.booked_s / problem.window_s;
    }
    (contacts, sat_outcomes, antennas)
}

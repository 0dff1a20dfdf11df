//! The scheduler's inputs and outputs, and the validation of the inputs.
//!
//! Times are seconds from the window start (`0.0`), data in bits, rates in bit/s.

use thiserror::Error;

/// How a satellite's payload fills its store.
#[derive(Debug, Clone, PartialEq)]
pub enum Generation {
    /// A constant rate over the whole window, bit/s.
    AverageBps(f64),
    /// Generation windows, sorted by start and not overlapping; nothing is generated outside
    /// them.
    Windows(Vec<GenerationWindow>),
}

/// One generation window: `rate_bps` from `start_s` to `end_s`.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct GenerationWindow {
    pub start_s: f64,
    pub end_s: f64,
    pub rate_bps: f64,
}

/// A satellite as the scheduler sees it: a weight, a store and a payload.
#[derive(Debug, Clone, PartialEq)]
pub struct Satellite {
    pub name: String,
    /// Weight of one delivered bit in the objective (> 0).
    pub priority_weight: f64,
    pub capacity_bits: f64,
    /// Fill at the window start; counted as data born at `t = 0` for latencies.
    pub initial_fill_bits: f64,
    pub generation: Generation,
    /// Contacts the satellite can run at once (>= 1).
    pub max_downlinks: usize,
}

/// Booking rules of one antenna, applied before scheduling.
#[derive(Debug, Clone, Default, PartialEq)]
pub struct BookingRules {
    /// A booked contact (after clipping and shortening) lasts at least this long.
    pub min_contact_s: f64,
    /// A candidate whose pass peaks lower is not bookable.
    pub min_peak_elevation_deg: f64,
    /// Periods `(start_s, end_s)` when the antenna is not ours; neither a contact nor its
    /// set-up may overlap one. Any order; overlapping periods are merged.
    pub blocked: Vec<(f64, f64)>,
}

/// One antenna: a resource that serves one contact at a time.
#[derive(Debug, Clone, PartialEq)]
pub struct Antenna {
    pub name: String,
    pub station: String,
    /// Slew and set-up before each contact: a contact starting at `t` needs the antenna free
    /// from `t - turnaround_s`.
    pub turnaround_s: f64,
    pub rules: BookingRules,
}

/// A contact that could be booked: one pass of one satellite over one antenna at a fixed rate.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Candidate {
    pub satellite: usize,
    pub antenna: usize,
    /// The span where the chosen fixed rate closes.
    pub start_s: f64,
    pub end_s: f64,
    pub rate_bps: f64,
    /// Closed seconds / span, in (0, 1]: the volume over a sub-interval of length `l` is
    /// `rate_bps * duty * l`.
    pub duty: f64,
    pub peak_elevation_deg: f64,
    /// The caller's index of the pass: candidates of one satellite with the same `pass_ref` on
    /// antennas of the same station are one pass offered to each antenna (the antenna rounds
    /// move such a pass whole onto one antenna where it was split).
    pub pass_ref: usize,
}

/// Everything the scheduler needs.
#[derive(Debug, Clone, PartialEq)]
pub struct Problem {
    /// Length of the window `[0, window_s]`.
    pub window_s: f64,
    pub satellites: Vec<Satellite>,
    pub antennas: Vec<Antenna>,
    pub candidates: Vec<Candidate>,
}

/// Why the input cannot be scheduled. `field` names the offending value the way a caller
/// indexes it, e.g. `satellites[2].capacity_bits`.
#[derive(Debug, Clone, PartialEq, Error)]
pub enum ScheduleError {
    #[error("{field}: {value} is not a finite number")]
    NotFinite { field: String, value: f64 },
    #[error("{field}: {value} is negative")]
    Negative { field: String, value: f64 },
    #[error("{field}: {value} must be greater than zero")]
    NotPositive { field: String, value: f64 },
    #[error("{field}: the duty {value} is outside (0, 1]")]
    Duty { field: String, value: f64 },
    #[error("satellites[{satellite}]: the initial fill {fill_bits} bit is above the capacity {capacity_bits} bit")]
    FillAboveCapacity {
        satellite: usize,
        fill_bits: f64,
        capacity_bits: f64,
    },
    #[error("satellites[{satellite}].max_downlinks: must be at least 1")]
    ZeroDownlinks { satellite: usize },
    #[error("satellites[{satellite}].generation[{window}]: the window ends before it starts, or starts before the previous one ends")]
    GenerationWindows { satellite: usize, window: usize },
    #[error("antennas[{antenna}].rules.blocked[{period}]: the period ends before it starts")]
    BlockedPeriod { antenna: usize, period: usize },
    #[error("candidates[{candidate}].{field}: index {index} names no such entry")]
    BadIndex {
        candidate: usize,
        field: &'static str,
        index: usize,
    },
    /// More entries than the scheduler's compact indices hold (65,535 satellites or antennas,
    /// 4,294,967,295 candidates).
    #[error("{what}: {count} entries, more than the scheduler handles ({max})")]
    TooMany {
        what: &'static str,
        count: usize,
        max: usize,
    },
    #[error("candidates[{candidate}]: the span {start_s} s to {end_s} s is empty or outside the window [0, {window_s}] s")]
    Span {
        candidate: usize,
        start_s: f64,
        end_s: f64,
        window_s: f64,
    },
}

fn finite(field: impl Fn() -> String, value: f64) -> Result<f64, ScheduleError> {
    if value.is_finite() {
        Ok(value)
    } else {
        Err(ScheduleError::NotFinite {
            field: field(),
            value,
        })
    }
}

fn non_negative(field: impl Fn() -> String, value: f64) -> Result<f64, ScheduleError> {
    if finite(&field, value)? < 0.0 {
        return Err(ScheduleError::Negative {
            field: field(),
            value,
        });
    }
    Ok(value)
}

fn positive(field: impl Fn() -> String, value: f64) -> Result<f64, ScheduleError> {
    if finite(&field, value)? <= 0.0 {
        return Err(ScheduleError::NotPositive {
            field: field(),
            value,
        });
    }
    Ok(value)
}

fn validate_satellite(i: usize, sat: &Satellite) -> Result<(), ScheduleError> {
    let f = |name: &'static str| move || format!("satellites[{i}].{name}");
    positive(f("priority_weight"), sat.priority_weight)?;
    non_negative(f("capacity_bits"), sat.capacity_bits)?;
    non_negative(f("initial_fill_bits"), sat.initial_fill_bits)?;
    if sat.initial_fill_bits > sat.capacity_bits {
        return Err(ScheduleError::FillAboveCapacity {
            satellite: i,
            fill_bits: sat.initial_fill_bits,
            capacity_bits: sat.capacity_bits,
        });
    }
    if sat.max_downlinks == 0 {
        return Err(ScheduleError::ZeroDownlinks { satellite: i });
    }
    match &sat.generation {
        Generation::AverageBps(rate) => {
            non_negative(f("generation"), *rate)?;
        }
        Generation::Windows(windows) => {
            let mut previous_end = f64::NEG_INFINITY;
            for (k, w) in windows.iter().enumerate() {
                let g =
                    |name: &'static str| move || format!("satellites[{i}].generation[{k}].{name}");
                non_negative(g("start_s"), w.start_s)?;
                non_negative(g("end_s"), w.end_s)?;
                non_negative(g("rate_bps"), w.rate_bps)?;
                if w.end_s < w.start_s || w.start_s < previous_end {
                    return Err(ScheduleError::GenerationWindows {
                        satellite: i,
                        window: k,
                    });
                }
                previous_end = w.end_s;
            }
        }
    }
    Ok(())
}

fn validate_antenna(i: usize, antenna: &Antenna) -> Result<(), ScheduleError> {
    let f = |name: &'static str| move || format!("antennas[{i}].{name}");
    non_negative(f("turnaround_s"), antenna.turnaround_s)?;
    non_negative(f("rules.min_contact_s"), antenna.rules.min_contact_s)?;
    finite(
        f("rules.min_peak_elevation_deg"),
        antenna.rules.min_peak_elevation_deg,
    )?;
    for (k, &(start, end)) in antenna.rules.blocked.iter().enumerate() {
        finite(
            || format!("antennas[{i}].rules.blocked[{k}].start_s"),
            start,
        )?;
        finite(|| format!("antennas[{i}].rules.blocked[{k}].end_s"), end)?;
        if end < start {
            return Err(ScheduleError::BlockedPeriod {
                antenna: i,
                period: k,
            });
        }
    }
    Ok(())
}

fn validate_candidate(i: usize, c: &Candidate, problem: &Problem) -> Result<(), ScheduleError> {
    if c.satellite >= problem.satellites.len() {
        return Err(ScheduleError::BadIndex {
            candidate: i,
            field: "satellite",
            index: c.satellite,
        });
    }
    if c.antenna >= problem.antennas.len() {
        return Err(ScheduleError::BadIndex {
            candidate: i,
            field: "antenna",
            index: c.antenna,
        });
    }
    let f = |name: &'static str| move || format!("candidates[{i}].{name}");
    finite(f("start_s"), c.start_s)?;
    finite(f("end_s"), c.end_s)?;
    non_negative(f("rate_bps"), c.rate_bps)?;
    finite(f("peak_elevation_deg"), c.peak_elevation_deg)?;
    if !(c.duty > 0.0 && c.duty <= 1.0) {
        return Err(ScheduleError::Duty {
            field: f("duty")(),
            value: c.duty,
        });
    }
    if !(c.start_s >= 0.0 && c.start_s < c.end_s && c.end_s <= problem.window_s) {
        return Err(ScheduleError::Span {
            candidate: i,
            start_s: c.start_s,
            end_s: c.end_s,
            window_s: problem.window_s,
        });
    }
    Ok(())
}

/// Checks every rule of the input model; the first broken rule is the error.
pub fn validate(problem: &Problem) -> Result<(), ScheduleError> {
    positive(|| "window_s".to_string(), problem.window_s)?;
    let counts = [
        ("satellites", problem.satellites.len(), u16::MAX as usize),
        ("antennas", problem.antennas.len(), u16::MAX as usize),
        ("candidates", problem.candidates.len(), u32::MAX as usize),
    ];
    if let Some(&(what, count, max)) = counts.iter().find(|c| c.1 > c.2) {
        return Err(ScheduleError::TooMany { what, count, max });
    }
    for (i, sat) in problem.satellites.iter().enumerate() {
        validate_satellite(i, sat)?;
    }
    for (i, antenna) in problem.antennas.iter().enumerate() {
        validate_antenna(i, antenna)?;
    }
    for (i, c) in problem.candidates.iter().enumerate() {
        validate_candidate(i, c, problem)?;
    }
    Ok(())
}

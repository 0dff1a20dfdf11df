//! Pass-by-pass planning: the budget over every pass, rate choice, usable mask, volumes.
//!
//! The library owns the whole pipeline. A [`Planner`] is built from a loaded
//! [`Mission`](crate::config::mission::Mission) and a [`PlanRequest`]; every rule that protects the
//! numbers (the window, the step against the dwell, the weather case, the mask) is checked there.
//! [`Planner::run`] finds the passes of every station, follows each pass step by step
//! ([`series::fill_pass`]), chooses the fixed rate ([`rate::choose_fixed`]) and the adaptive
//! schedule ([`rate::adaptive_schedule`]), integrates Shannon's bound, accumulates the usable mask and
//! (when asked) the mask trade-off in the same run, and hands each pass with its time series to a
//! [`PassSink`]. Passes are independent, so they run in parallel (rayon); each pass's time series
//! lives only while its pass is evaluated, so memory does not grow with the window.
//!
//! ```no_run
//! use passbudget::config::mission::Mission;
//! use passbudget::plan::{PlanRequest, Planner};
//!
//! let mission = Mission::load("examples/wrenlet-1.yaml".as_ref())?;
//! let planner = Planner::new(&mission, &PlanRequest::default())?;
//! let plan = planner.collect()?;
//! println!("{} passes, {:.1} Gbit at a fixed rate per pass", plan.totals.passes, plan.totals.volume_bits / 1e9);
//! # Ok::<(), Box<dyn std::error::Error>>(())
//! ```

pub mod inputs;
pub mod instant;
pub mod mask;
pub mod network;
mod pass;
mod planner;
pub mod prepare;
pub mod rate;
pub mod series;
pub mod summary;
pub mod window;

pub use planner::{Collect, FnSink, PassSink, PlanRequest, Planner};
pub use summary::{DayTotals, Scope, Totals, TradeoffPoint, UsableMask};
pub use window::{Window, WindowRequest};

use crate::geometry::Pass;
use crate::orbit::PropagationError;
use chrono::{DateTime, Utc};
use mask::MaskAccumulator;
use network::Segment;
use series::{PassWarnings, SeriesError, Step};

/// Index of an option of the fixed-rate ladder ([`prepare::RateSet::ladder`]).
#[derive(Debug, Clone, Copy, PartialEq, Eq, PartialOrd, Ord, Hash)]
pub struct OptionId(pub usize);

/// One crossing of a rate's threshold: when, and where the satellite was.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Crossing {
    pub time: DateTime<Utc>,
    pub elevation_deg: f64,
    pub azimuth_deg: f64,
}

/// Where the chosen rate starts and stops counting in a pass (its first and last counted run).
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Closing {
    pub from: Crossing,
    pub until: Crossing,
}

/// Results of one mode (fixed-rate choice, adaptive, Shannon) for one weather case of a pass.
#[derive(Debug, Clone, PartialEq)]
pub struct ModeResult {
    /// Chosen ladder option, or `None` when no rate closes for the dwell time.
    pub option: Option<OptionId>,
    /// Where the chosen rate closes; `None` when no rate closes.
    pub closing: Option<Closing>,
    /// Lowest margin over the counted seconds of the chosen rate, dB.
    pub min_margin_db: Option<f64>,
    /// Highest Eb/N0 of the pass at the chosen rate (at the lowest-threshold ladder rate if none closes), dB.
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

/// Everything a sink gets for one pass: the plan and its time series.
pub struct PassSeries<'a> {
    pub plan: &'a PassPlan,
    pub steps: &'a [Step],
    /// Adaptive option index per step (clear sky), into `RateSet::adaptive`.
    pub adaptive: &'a [Option<u16>],
    /// Counted runs (step indices, inclusive) of the chosen fixed rate; empty when none closes.
    pub chosen_runs: &'a [(usize, usize)],
}

impl PassSeries<'_> {
    /// Whether the chosen fixed rate counts step `i`.
    pub fn counted(&self, i: usize) -> bool {
        self.chosen_runs.iter().any(|&(a, b)| a <= i && i <= b)
    }
}

/// Error of planning.
#[derive(Debug, thiserror::Error)]
pub enum PlanError {
    #[error(transparent)]
    Prepare(#[from] prepare::PrepareError),
    #[error(transparent)]
    Satellite(#[from] inputs::SatelliteError),
    #[error(transparent)]
    Window(#[from] window::WindowError),
    /// A request value out of its range or against another rule.
    #[error("{key}: {message}")]
    Request { key: &'static str, message: String },
    #[error("{mission}: the mission lists no stations (stations: [station files])")]
    NoStations { mission: String },
    #[error("pass {number} at {station}: {source}")]
    Pass {
        number: usize,
        station: String,
        #[source]
        source: SeriesError,
    },
    #[error("satellite: {0}")]
    Propagator(#[source] PropagationError),
    /// A pass sink failed (writing a file, drawing a chart).
    #[error("{0}")]
    Sink(#[source] Box<dyn std::error::Error + Send + Sync>),
}

/// The network total: each second counted once, at the station with the highest fixed rate.
#[derive(Debug, Clone, Copy, PartialEq, Default)]
pub struct NetworkTotal {
    pub volume_bits: f64,
    pub contact_s: f64,
}

/// The plan of a window: typed and unrounded (rounding belongs to [`crate::report`]).
#[derive(Debug, Clone)]
pub struct Plan {
    pub passes: Vec<PassPlan>,
    /// Per station: the pass search stopped early (propagation error), with the error.
    pub stopped: Vec<Option<PropagationError>>,
    pub propagations_search: u64,
    /// Mask accumulators per station (merged over its passes above the configured mask).
    pub station_masks: Vec<MaskAccumulator>,
    /// Mask accumulators per station over the passes searched from 0 deg, when the trade-off was asked.
    pub tradeoff_masks: Option<Vec<MaskAccumulator>>,
    pub network: NetworkTotal,
    pub totals: Totals,
    pub days: Vec<DayTotals>,
    pub usable_masks: Vec<UsableMask>,
    /// Every warning of the plan: models out of range, element age, stopped searches, thresholds.
    pub warnings: Vec<String>,
    /// The availability (rain) case was planned.
    pub rain_planned: bool,
    pub window: Window,
}

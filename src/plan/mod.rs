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

pub mod bodies;
pub mod fleet;
pub mod fuzz_entry;
pub mod inputs;
pub mod instant;
pub mod mask;
pub mod network;
pub mod noise;
mod pass;
pub mod path_table;
pub mod pfd;
mod planner;
pub mod prepare;
pub mod rate;
pub mod results;
pub mod series;
mod sink;
pub mod summary;
pub mod transits;
pub mod window;

pub use planner::{PlanRequest, Planner};
pub use rate::OptionId;
pub use results::{
    Closing, Crossing, DayTotals, ModeResult, MountTracking, NetworkTotal, Note, NoteKind,
    OptionSeries, PassPlan, PassSeries, Plan, PlanError, RainTotals, Scope, Totals, TradeoffSeries,
    UsableMask, NETWORK_LABEL,
};
pub use sink::{Collect, FnSink, PassSink};
pub use window::{Window, WindowRequest};

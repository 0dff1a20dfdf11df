//! Command-line interface: argument definitions (clap derive), one file per command. Each command
//! maps its flags to a library request, calls the library and renders the result; no rule that
//! protects the numbers lives here.

mod budget;
mod chart;
mod common;
mod compare;
mod contacts;
mod fleet;
mod geometry;
mod output;
mod plan;
mod table;
mod transits;
mod window;

use clap::{Parser, Subcommand};
use std::io::Write;

/// Exit code for bad input, unreadable files and failed runs (usage errors exit with clap's 2).
pub const EXIT_ERROR: i32 = 1;

#[derive(Debug, Parser)]
#[command(name = "passbudget", version, about = "Plan satellite downlinks pass by pass: geometry, atmosphere, noise, Eb/N0, rate and data volume.", long_about = None)]
pub struct Args {
    #[command(subcommand)]
    pub command: Command,
    /// Print no warnings or notes on stderr (they stay in the JSON and CSV outputs; the charts
    /// carry the caution and the element age; errors are still printed).
    #[arg(long, global = true)]
    pub quiet: bool,
}

#[derive(Debug, Subcommand)]
pub enum Command {
    /// List the passes of a satellite over one or more stations.
    Passes(geometry::PassesArgs),
    /// Look angles, range, range rate and Doppler at a fixed step.
    Track(geometry::TrackArgs),
    /// The atmospheric losses and sky temperature at one elevation.
    Atmosphere(budget::AtmosphereArgs),
    /// The itemized downlink budget at one elevation or one instant.
    Budget(budget::BudgetArgs),
    /// Plan every pass (rate per pass, fixed and adaptive; usable mask; data volume) and book the
    /// contacts: which antenna takes which pass, for one satellite or a fleet.
    Plan(plan::PlanArgs),
    /// Pass charts, sky tracks, mask trade-off and plan summary (PNG or SVG).
    Chart(chart::ChartArgs),
    /// The elevation-mask trade-off: contact time and volume per day against the mask, per rate.
    Mask(plan::MaskArgs),
    /// Every passage of the Sun through a station's beam during a pass (and, near the
    /// geostationary arc, the Sun-outage seasons).
    SunTransits(transits::TransitsArgs),
    /// Two plans of one window side by side (two missions, or one mission and --set-b
    /// overrides): per-pass and total differences, passes matched by their identifier.
    Compare(compare::CompareArgs),
}

/// Run the parsed command, writing to `out`.
pub fn run(args: Args, out: &mut dyn Write) -> anyhow::Result<()> {
    common::set_quiet(args.quiet);
    match args.command {
        Command::Passes(a) => geometry::passes(a, out),
        Command::Track(a) => geometry::track(a, out),
        Command::Atmosphere(a) => budget::atmosphere(a, out),
        Command::Budget(a) => budget::budget(a, out),
        Command::Plan(a) => plan::plan(a, out),
        Command::Mask(a) => plan::mask(a, out),
        Command::Chart(a) => chart::chart(a, out),
        Command::SunTransits(a) => transits::sun_transits(a, out),
        Command::Compare(a) => compare::compare(a, out),
    }
}

/// Entry point used by `main.rs`; returns the process exit code. A broken pipe (`| head`) is not an error.
pub fn main_entry() -> i32 {
    let args = Args::parse();
    let stdout = std::io::stdout();
    let mut lock = stdout.lock();
    match run(args, &mut lock).and_then(|()| lock.flush().map_err(anyhow::Error::from)) {
        Ok(()) => 0,
        Err(e) => {
            if e.chain().any(|c| {
                c.downcast_ref::<std::io::Error>()
                    .is_some_and(|io| io.kind() == std::io::ErrorKind::BrokenPipe)
            }) {
                return 0;
            }
            let _ = writeln!(std::io::stderr(), "error: {}", one_line(&e));
            EXIT_ERROR
        }
    }
}

/// The error chain on one line; a cause already quoted by the message before it is not repeated
/// (library errors include their source in their own text).
pub fn one_line(e: &anyhow::Error) -> String {
    let mut text = String::new();
    for cause in e.chain() {
        let c = cause.to_string();
        if !text.contains(&c) {
            if !text.is_empty() {
                text.push_str(": ");
            }
            text.push_str(&c);
        }
    }
    text.replace('\n', " ")
}

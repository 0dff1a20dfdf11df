//! Flags shared by `plan`, `mask` and `chart`, and their mapping to a library [`PlanRequest`].

use anyhow::{anyhow, Result};
use passbudget::config::mission::Mission;
use passbudget::plan::{PlanError, PlanRequest, Planner, WindowRequest};
use passbudget::timefmt::parse_utc;
use std::path::PathBuf;

/// Options shared by `plan`, `mask` and `chart`.
#[derive(Debug, Clone, clap::Args)]
pub struct WindowArgs {
    /// Mission file.
    #[arg(value_name = "MISSION")]
    pub mission: PathBuf,
    /// Start of the window, RFC 3339 UTC (default: the mission's window.start).
    #[arg(long, value_name = "TIME")]
    pub start: Option<String>,
    /// End of the window, RFC 3339 UTC (default: --days, else the mission's window.end or window.days, else 1 day).
    #[arg(long, value_name = "TIME", conflicts_with = "days")]
    pub end: Option<String>,
    /// Length of the window in days (default: the mission's window.end or window.days, else 1).
    #[arg(long, value_name = "N", allow_hyphen_values = true)]
    pub days: Option<f64>,
    /// Budget time step along each pass, s (default: the mission's planning.step_s, else 1).
    #[arg(long, value_name = "SECONDS", allow_hyphen_values = true)]
    pub step: Option<f64>,
    /// Availability case: rain exceeded P % of an average year (default: the mission's planning.exceedance_percent).
    #[arg(long, value_name = "P", allow_hyphen_values = true)]
    pub exceedance_percent: Option<f64>,
    /// Minimum elevation, deg, overriding every station's min_elevation_deg.
    #[arg(long, value_name = "DEG", allow_hyphen_values = true)]
    pub mask: Option<f64>,
    /// Plan even when the window lies more than 90 days from the element epoch (refused
    /// otherwise: the positions are off by hundreds to thousands of km).
    #[arg(long)]
    pub allow_stale_elements: bool,
}

/// Parse an optional RFC 3339 flag value, naming the flag in the message.
pub fn parse_time_flag(
    flag: &str,
    value: Option<&str>,
) -> Result<Option<chrono::DateTime<chrono::Utc>>> {
    value
        .map(|s| parse_utc(s).map_err(|e| anyhow!("{flag}: {e}")))
        .transpose()
}

impl WindowArgs {
    /// The library request these flags ask for.
    pub fn request(&self, tradeoff: bool) -> Result<PlanRequest> {
        Ok(PlanRequest {
            window: WindowRequest {
                start: parse_time_flag("--start", self.start.as_deref())?,
                end: parse_time_flag("--end", self.end.as_deref())?,
                days: self.days,
            },
            step_s: self.step,
            exceedance_percent: self.exceedance_percent,
            mask_deg: self.mask,
            search_floor_deg: tradeoff.then_some(0.0),
            allow_stale_elements: self.allow_stale_elements,
        })
    }

    /// Load the mission and prepare the planner.
    pub fn planner(&self, tradeoff: bool) -> Result<Planner> {
        let mission = Mission::load(&self.mission)?;
        let request = self.request(tradeoff)?;
        Planner::new(&mission, &request).map_err(|e| name_flag(e, &request, &self.mission))
    }
}

/// A request error names the flag when the value came from one, else the file's key.
fn name_flag(e: PlanError, r: &PlanRequest, mission: &std::path::Path) -> anyhow::Error {
    let flag = |key: &str| -> Option<&'static str> {
        match key {
            "step_s" if r.step_s.is_some() => Some("--step"),
            "exceedance_percent" if r.exceedance_percent.is_some() => Some("--exceedance-percent"),
            "mask_deg" if r.mask_deg.is_some() => Some("--mask"),
            _ => None,
        }
    };
    match &e {
        PlanError::Range { key, source } => match flag(key) {
            Some(f) => anyhow!("{f}: {source}"),
            None => anyhow!("{}: {key}: {source}", mission.display()),
        },
        PlanError::Request { key, message } => match flag(key) {
            Some(f) => anyhow!("{f}: {message}"),
            None => anyhow!("{}: {key}: {message}", mission.display()),
        },
        PlanError::Window(w)
            if r.window.days.is_some() || r.window.start.is_some() || r.window.end.is_some() =>
        {
            anyhow!("--start/--end/--days: {w}")
        }
        PlanError::Window(w) => anyhow!("{}: {w}", mission.display()),
        PlanError::StaleElements(s) => anyhow!("{s}; --allow-stale-elements plans anyway"),
        _ => anyhow::Error::new(e),
    }
}

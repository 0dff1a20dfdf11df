//! The mission file and its `--set` overrides (every command that reads one), the flags shared by
//! `plan`, `mask`, `chart`, `sun-transits` and `compare`, and their mapping to a library [`PlanRequest`].

use anyhow::{anyhow, bail, Result};
use passbudget::config::mission::Mission;
use passbudget::config::overrides::Overrides;
use passbudget::config::station::{same_station, Station};
use passbudget::plan::{PlanError, PlanRequest, Planner, Window, WindowRequest};
use passbudget::timefmt::parse_utc;
use std::path::{Path, PathBuf};

/// Help of `--set`, shared by every command that reads a mission file.
const SET_HELP: &str = "Override a key of the mission file (transmitter.power_w=5, planning.step_s=2) or of a station's file (station.NAME.antenna.diameter_m=3.7, station.*.receiver.lna_gain_db=40); the value is YAML, checked as in the file; repeatable";

/// The mission file, given the one way every command takes it: the first positional argument
/// (`--mission FILE`, the older spelling of `passes` and `track`, still works, hidden); and the
/// `--set` overrides of its keys.
#[derive(Debug, Clone, clap::Args)]
pub struct MissionArgs {
    /// Mission file (YAML), required.
    #[arg(value_name = "MISSION", required_unless_present = "mission_flag")]
    pub mission: Option<PathBuf>,
    #[arg(
        long = "mission",
        value_name = "FILE",
        hide = true,
        conflicts_with = "mission"
    )]
    pub mission_flag: Option<PathBuf>,
    #[arg(long = "set", value_name = "KEY=VALUE", help = SET_HELP)]
    pub set: Vec<String>,
}

/// [`MissionArgs`] where the mission file is optional (`passes`, `track`: the inputs may all come
/// from flags).
#[derive(Debug, Clone, clap::Args)]
pub struct OptionalMissionArgs {
    /// Mission file (YAML) supplying any input not given by a flag.
    #[arg(value_name = "MISSION")]
    pub mission: Option<PathBuf>,
    #[arg(
        long = "mission",
        value_name = "FILE",
        hide = true,
        conflicts_with = "mission"
    )]
    pub mission_flag: Option<PathBuf>,
    #[arg(long = "set", value_name = "KEY=VALUE", help = SET_HELP)]
    pub set: Vec<String>,
}

impl MissionArgs {
    /// The mission file, by either spelling.
    pub fn path(&self) -> &Path {
        self.mission
            .as_deref()
            .or(self.mission_flag.as_deref())
            .expect("clap requires one of the two")
    }

    pub fn overrides(&self) -> Result<Overrides> {
        Ok(Overrides::parse(&self.set)?)
    }
}

impl OptionalMissionArgs {
    pub fn path(&self) -> Option<&Path> {
        self.mission.as_deref().or(self.mission_flag.as_deref())
    }

    pub fn overrides(&self) -> Result<Overrides> {
        Ok(Overrides::parse(&self.set)?)
    }
}

/// Options shared by `plan`, `mask`, `chart` and `sun-transits`.
#[derive(Debug, Clone, clap::Args)]
pub struct WindowArgs {
    #[command(flatten)]
    pub mission: MissionArgs,
    /// Start of the window, RFC 3339 UTC (default: the mission's window.start).
    #[arg(long, value_name = "TIME")]
    pub start: Option<String>,
    /// End of the window, RFC 3339 UTC (default: --days, else the mission's window.end or window.days, else 1 day).
    #[arg(long, value_name = "TIME", conflicts_with = "days")]
    pub end: Option<String>,
    /// Length of the window in days (default: the mission's window.end or window.days, else 1).
    #[arg(long, value_name = "DAYS", allow_hyphen_values = true)]
    pub days: Option<f64>,
    /// Budget time step along each pass, s (default: the mission's planning.step_s, else 1).
    #[arg(
        long = "step-s",
        alias = "step",
        value_name = "SECONDS",
        allow_hyphen_values = true
    )]
    pub step_s: Option<f64>,
    /// Availability case: rain exceeded P % of an average year (default: the mission's planning.exceedance_percent).
    #[arg(long, value_name = "P", allow_hyphen_values = true)]
    pub exceedance_percent: Option<f64>,
    /// Minimum elevation, deg, overriding every station's min_elevation_deg (the horizon mask still applies).
    #[arg(
        long = "mask-deg",
        alias = "mask",
        value_name = "DEG",
        allow_hyphen_values = true
    )]
    pub mask_deg: Option<f64>,
    /// Plan even when the window lies more than 90 days from the element epoch (refused
    /// otherwise: the positions are off by hundreds to thousands of km).
    #[arg(long)]
    pub allow_stale_elements: bool,
    /// One satellite of a fleet mission (its name in the mission file); `plan` without it
    /// plans the whole fleet, the other commands need it for a fleet. On a mission of one
    /// satellite it must name that one (or give its catalog number).
    #[arg(long, value_name = "NAME")]
    pub satellite: Option<String>,
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
            step_s: self.step_s,
            exceedance_percent: self.exceedance_percent,
            mask_deg: self.mask_deg,
            search_floor_deg: tradeoff.then_some(0.0),
            allow_stale_elements: self.allow_stale_elements,
        })
    }

    /// Load the mission (with the `--set` overrides) and prepare the planner.
    pub fn planner(&self, tradeoff: bool) -> Result<Planner> {
        let overrides = self.mission.overrides()?;
        let mission = Mission::load_with(self.mission.path(), &overrides)?;
        self.planner_of(tradeoff, mission, self.mission.path(), &overrides, None)
    }

    /// The planner of a mission already loaded from `path` with `overrides` (a mission file given
    /// as a pipe can be read only once), with the same flags; `window`, when given, replaces the
    /// window flags (`compare` plans B over A's resolved window).
    pub fn planner_of(
        &self,
        tradeoff: bool,
        mission: Mission,
        path: &Path,
        overrides: &Overrides,
        window: Option<&Window>,
    ) -> Result<Planner> {
        let mission = self.one_satellite(mission)?;
        let mut request = self.request(tradeoff)?;
        if let Some(w) = window {
            request.window = WindowRequest {
                start: Some(w.start()),
                end: Some(w.end()),
                days: None,
            };
        }
        let planner = Planner::new(&mission, &request)
            .map_err(|e| name_flag(e, &request, path, overrides))?;
        named_the_one_satellite(self.satellite.as_deref(), &mission, planner.elements())?;
        Ok(planner)
    }
}

impl WindowArgs {
    /// The mission as the satellite of `--satellite` sees it; a fleet mission needs the flag.
    pub fn one_satellite(&self, mission: Mission) -> Result<Mission> {
        one_satellite(mission, self.satellite.as_deref())
    }
}

/// The mission as its satellite `satellite` (`--satellite NAME`) sees it. A fleet mission needs
/// the name: every command but `plan` works on one satellite, and none picks one silently. On a
/// mission of one satellite the name is checked once the element set is known
/// ([`named_the_one_satellite`]).
pub fn one_satellite(mission: Mission, satellite: Option<&str>) -> Result<Mission> {
    let names = || {
        mission
            .satellites
            .iter()
            .filter_map(|s| s.name.clone())
            .collect::<Vec<_>>()
            .join(", ")
    };
    match satellite {
        Some(n) => {
            let i = mission
                .satellites
                .iter()
                .position(|s| s.name.as_deref().is_some_and(|m| same_station(n, m)));
            match i {
                Some(i) => Ok(mission.for_satellite(i)),
                None if mission.satellites.len() == 1 => Ok(mission),
                None => bail!(
                    "--satellite {n}: not a satellite of the mission ({})",
                    names()
                ),
            }
        }
        None if mission.satellites.len() > 1 => bail!(
            "{}: the mission has {} satellites ({}): choose one with --satellite NAME",
            mission.source.display(),
            mission.satellites.len(),
            names()
        ),
        None => Ok(mission),
    }
}

/// `--satellite` on a mission of one satellite must name it: by the mission file's name, the
/// element set's name or its catalog number (a mistyped name is not silently planned).
pub fn named_the_one_satellite(
    satellite: Option<&str>,
    mission: &Mission,
    elements: &passbudget::orbit::ElementSet,
) -> Result<()> {
    let (Some(n), [s]) = (satellite, mission.satellites.as_slice()) else {
        return Ok(());
    };
    let names = [s.name.as_deref(), elements.name.as_deref()];
    let named = names.iter().flatten().any(|m| same_station(n, m))
        || n.trim() == elements.norad_id.to_string();
    if !named {
        bail!(
            "--satellite {n}: the mission's one satellite is {}",
            s.name.clone().unwrap_or_else(|| elements.label())
        );
    }
    Ok(())
}

/// A request error names the flag when the value came from one, else the `--set` argument that
/// gave the file's key (`planning.KEY`), else the file's key.
pub fn name_flag(
    e: PlanError,
    r: &PlanRequest,
    mission: &std::path::Path,
    overrides: &Overrides,
) -> anyhow::Error {
    let flag = |key: &str| -> Option<String> {
        let set = || {
            let k = format!("planning.{key}");
            let o = overrides.mission().into_iter().rev().find(|o| o.key == k)?;
            Some(format!("{}: {}: {k}", mission.display(), o.given()))
        };
        match key {
            "step_s" if r.step_s.is_some() => Some("--step-s".into()),
            "exceedance_percent" if r.exceedance_percent.is_some() => {
                Some("--exceedance-percent".into())
            }
            "mask_deg" if r.mask_deg.is_some() => Some("--mask-deg".into()),
            _ => set(),
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

/// The stations of `--station` values, each a station file (a value naming an existing file, read
/// with the `--set` overrides that name its station) or the name of one of the mission's stations
/// (case and punctuation ignored, as in `--set station.NAME...`); and the mission (if any), read
/// with the overrides not meant for those files' stations.
pub fn stations_and_mission(
    values: &[String],
    mission: Option<&Path>,
    overrides: &Overrides,
) -> Result<(Vec<Station>, Option<Mission>)> {
    let mut from_files = Vec::new();
    // A station file, or a pipe (`<(...)`): anything there but a folder.
    for v in values
        .iter()
        .filter(|v| Path::new(v).exists() && !Path::new(v).is_dir())
    {
        from_files.push((v, Station::load_with(Path::new(v), overrides)?));
    }
    let names: Vec<&str> = from_files.iter().map(|(_, s)| s.name.as_str()).collect();
    let mission = mission
        .map(|p| Mission::load_with(p, &overrides.except_stations(&names)))
        .transpose()?;
    if mission.is_none() {
        overrides.check_stations(Path::new("command line"), &names)?;
    }
    let known = mission
        .as_ref()
        .map(|m| m.stations.as_slice())
        .unwrap_or_default();
    let mut stations = Vec::new();
    for v in values {
        if let Some((_, st)) = from_files.iter().find(|(f, _)| *f == v) {
            stations.push(st.clone());
        } else if let Some(st) = known.iter().find(|s| same_station(v, &s.name)) {
            stations.push(st.clone());
        } else if mission.is_none() {
            bail!("--station {v}: no such station file (a station's name needs a mission file)");
        } else {
            let names: Vec<&str> = known.iter().map(|s| s.name.as_str()).collect();
            bail!(
                "--station {v}: neither a station file nor a station of the mission ({})",
                names.join(", ")
            );
        }
    }
    Ok((stations, mission))
}

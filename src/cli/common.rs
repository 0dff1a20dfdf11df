//! Shared CLI pieces (inputs from flags or a mission file, windows, element age) and the `passes`
//! and `track` commands.

use crate::config::mission::Mission;
use crate::config::station::Station;
use crate::geometry::{doppler_hz, find_passes, track as track_iter, HorizonMask, Observer, Pass};
use crate::orbit::{load_elements, select, ElementSet, Propagator};
use crate::report::table::{Align, Table};
use crate::report::{round, to_csv, Format};
use crate::timefmt::{format_ms, parse_utc};
use anyhow::{anyhow, bail, Result};
use chrono::{DateTime, Utc};
use serde::Serialize;
use std::io::Write;
use std::path::{Path, PathBuf};

/// Orbit, stations and window, from flags or a mission file (flags win).
#[derive(Debug, Clone, clap::Args)]
pub struct InputArgs {
    /// Mission file supplying any input not given by a flag.
    #[arg(long, value_name = "FILE")]
    pub mission: Option<PathBuf>,
    /// Element file: TLE (2- or 3-line), CCSDS OMM JSON or OMM KVN.
    #[arg(long, value_name = "FILE")]
    pub tle: Option<PathBuf>,
    /// Satellite by catalog number or name (needed when the file holds several).
    #[arg(long, value_name = "ID|NAME")]
    pub sat: Option<String>,
    /// Start of the window, RFC 3339 UTC (2026-12-02T00:00:00Z).
    #[arg(long, value_name = "TIME")]
    pub start: Option<String>,
    /// End of the window, RFC 3339 UTC.
    #[arg(long, value_name = "TIME", conflicts_with = "days")]
    pub end: Option<String>,
    /// Length of the window in days.
    #[arg(long, value_name = "N", allow_hyphen_values = true)]
    pub days: Option<f64>,
}

#[derive(Debug, Clone, clap::Args)]
pub struct PassesArgs {
    #[command(flatten)]
    pub input: InputArgs,
    /// Station file (repeat for several stations).
    #[arg(long, value_name = "FILE")]
    pub station: Vec<PathBuf>,
    /// Minimum elevation, deg: overrides each station's min_elevation_deg (the horizon mask still applies).
    #[arg(long, value_name = "DEG", allow_hyphen_values = true)]
    pub mask: Option<f64>,
    #[arg(long, value_enum, default_value = "table")]
    pub format: Format,
}

#[derive(Debug, Clone, clap::Args)]
pub struct TrackArgs {
    #[command(flatten)]
    pub input: InputArgs,
    /// Station file.
    #[arg(long, value_name = "FILE")]
    pub station: Option<PathBuf>,
    /// Step between points, s.
    #[arg(
        long,
        value_name = "SECONDS",
        default_value_t = 10.0,
        allow_hyphen_values = true
    )]
    pub step: f64,
    /// Downlink frequency, MHz, for the Doppler shift.
    #[arg(long, value_name = "F", allow_hyphen_values = true)]
    pub frequency_mhz: Option<f64>,
    /// Only points where the satellite is above the station's mask.
    #[arg(long)]
    pub above_mask: bool,
    #[arg(long, value_enum, default_value = "csv")]
    pub format: Format,
}

/// Everything the geometry needs, resolved.
pub struct Resolved {
    pub elements: ElementSet,
    pub propagator: Propagator,
    pub stations: Vec<Station>,
    pub start: DateTime<Utc>,
    pub end: DateTime<Utc>,
    pub mission: Option<Mission>,
}

/// Load the element file and choose one satellite.
pub fn load_satellite(path: &Path, sat: Option<&str>) -> Result<(ElementSet, Propagator)> {
    let sets = load_elements(path)?;
    if sets.is_empty() {
        bail!("{}: no element sets in the file", path.display());
    }
    let set = select(&sets, sat)
        .map_err(|e| anyhow!("{}: {e}", path.display()))?
        .clone();
    let prop =
        Propagator::new(&set).map_err(|e| anyhow!("{}: {}: {e}", path.display(), set.label()))?;
    Ok((set, prop))
}

/// Resolve the window: `--start` (or the mission's), then `--end`, `--days`, the mission's end/days, or 1 day.
pub fn resolve_window(
    input: &InputArgs,
    mission: Option<&Mission>,
) -> Result<(DateTime<Utc>, DateTime<Utc>)> {
    let start = match &input.start {
        Some(s) => parse_utc(s).map_err(|e| anyhow!("--start: {e}"))?,
        None => mission.and_then(|m| m.start).ok_or_else(|| anyhow!("no start time: give --start TIME (RFC 3339 UTC) or window.start in the mission file"))?,
    };
    let end = if let Some(e) = &input.end {
        parse_utc(e).map_err(|e| anyhow!("--end: {e}"))?
    } else if let Some(d) = input.days {
        days_after(start, d, "--days")?
    } else if input.start.is_none() && mission.and_then(|m| m.end).is_some() {
        mission.and_then(|m| m.end).unwrap()
    } else if let Some(d) = mission.and_then(|m| m.days) {
        days_after(start, d, "window.days")?
    } else if let Some(e) = mission.and_then(|m| m.end) {
        e
    } else {
        days_after(start, 1.0, "default")?
    };
    if end <= start {
        bail!(
            "the end of the window ({}) is not after its start ({})",
            format_ms(&end),
            format_ms(&start)
        );
    }
    Ok((start, end))
}

fn days_after(start: DateTime<Utc>, days: f64, what: &str) -> Result<DateTime<Utc>> {
    if !(days.is_finite() && days > 0.0 && days <= 3660.0) {
        bail!("{what}: {days} days is not a window length (0 to 3660 days)");
    }
    Ok(crate::timefmt::add_seconds(&start, days * 86400.0))
}

/// Load everything `passes`/`track` need.
pub fn resolve(input: &InputArgs, station_files: &[PathBuf]) -> Result<Resolved> {
    let mission = input.mission.as_deref().map(Mission::load).transpose()?;
    let tle = input
        .tle
        .clone()
        .or_else(|| mission.as_ref().map(|m| m.elements_path.clone()))
        .ok_or_else(|| anyhow!("no element file: give --tle FILE or a --mission file"))?;
    let sat = input.sat.clone().or_else(|| {
        if input.tle.is_none() {
            mission.as_ref().and_then(|m| m.select.clone())
        } else {
            None
        }
    });
    let (elements, propagator) = load_satellite(&tle, sat.as_deref())?;
    let stations = if !station_files.is_empty() {
        station_files
            .iter()
            .map(|p| Station::load(p))
            .collect::<Result<Vec<_>, _>>()?
    } else {
        mission
            .as_ref()
            .map(|m| m.stations.clone())
            .unwrap_or_default()
    };
    if stations.is_empty() {
        bail!("no station: give --station FILE or a --mission file with stations");
    }
    let (start, end) = resolve_window(input, mission.as_ref())?;
    Ok(Resolved {
        elements,
        propagator,
        stations,
        start,
        end,
        mission,
    })
}

/// Observer and horizon for a station, with an optional minimum-elevation override.
pub fn station_geometry(
    st: &Station,
    mask_override: Option<f64>,
) -> Result<(Observer, HorizonMask)> {
    let obs = Observer::new(st.latitude_deg, st.longitude_deg, st.altitude_m)
        .map_err(|e| anyhow!("{}: {e}", st.source.display()))?;
    let min = mask_override.unwrap_or(st.min_elevation_deg);
    if !(-5.0..=90.0).contains(&min) {
        bail!("--mask {min}: out of range (-5 to 90 deg)");
    }
    let mask = HorizonMask::new(min, st.horizon_mask.clone())
        .map_err(|e| anyhow!("{}: horizon_mask: {e}", st.source.display()))?;
    Ok((obs, mask))
}

/// Warn on stderr when the window lies far from the element epoch. Along-track error of a LEO
/// element set grows by roughly 1-3 km a day (common practice).
pub fn warn_element_age(set: &ElementSet, start: DateTime<Utc>, end: DateTime<Utc>) {
    if let Some(w) = element_age_warning(set, start, end) {
        eprintln!("{w}");
    }
}

/// The element-age warning text, if any: more than 7 days from the epoch warns, more than 30 warns strongly.
pub fn element_age_warning(
    set: &ElementSet,
    start: DateTime<Utc>,
    end: DateTime<Utc>,
) -> Option<String> {
    let days = |t: DateTime<Utc>| ((t - set.epoch).num_seconds() as f64 / 86400.0).abs();
    let worst = days(start).max(days(end));
    if worst > 30.0 {
        Some(format!(
            "warning: STALE ELEMENTS: the window reaches {worst:.1} days from the epoch of {} ({}); along-track errors of several tens of km or more are likely: get fresh elements before relying on these times",
            set.label(),
            format_ms(&set.epoch)
        ))
    } else if worst > 7.0 {
        Some(format!(
            "warning: the window reaches {worst:.1} days from the epoch of {} ({}); a LEO element set drifts by roughly 1-3 km a day along track (common practice)",
            set.label(),
            format_ms(&set.epoch)
        ))
    } else {
        None
    }
}

/// One row of the `passes` output (public interface: field names are stable).
#[derive(Debug, Clone, Serialize)]
pub struct PassRow {
    pub satellite: String,
    pub norad_id: u64,
    pub station: String,
    pub aos: String,
    pub tca: String,
    pub los: String,
    pub duration_s: f64,
    pub max_elevation_deg: f64,
    pub aos_azimuth_deg: f64,
    pub tca_azimuth_deg: f64,
    pub los_azimuth_deg: f64,
    pub min_range_km: f64,
    pub starts_before_window: bool,
    pub ends_after_window: bool,
}

impl PassRow {
    pub fn new(set: &ElementSet, station: &str, p: &Pass) -> Self {
        PassRow {
            satellite: satellite_name(set),
            norad_id: set.norad_id,
            station: station.to_string(),
            aos: format_ms(&p.aos),
            tca: format_ms(&p.tca),
            los: format_ms(&p.los),
            duration_s: round(p.duration_s(), 3),
            max_elevation_deg: round(p.max_elevation_deg, 3),
            aos_azimuth_deg: round(p.aos_azimuth_deg, 3),
            tca_azimuth_deg: round(p.tca_azimuth_deg, 3),
            los_azimuth_deg: round(p.los_azimuth_deg, 3),
            min_range_km: round(p.min_range_km, 3),
            starts_before_window: p.starts_before_window,
            ends_after_window: p.ends_after_window,
        }
    }
}

/// The satellite's name for outputs: its name, or its catalog number.
pub fn satellite_name(set: &ElementSet) -> String {
    set.name.clone().unwrap_or_else(|| set.norad_id.to_string())
}

/// Passes of the satellite over every station, sorted by AOS; warnings and notes go to stderr.
pub fn all_passes(r: &Resolved, mask_override: Option<f64>) -> Result<Vec<(usize, Pass)>> {
    let mut all = Vec::new();
    for (i, st) in r.stations.iter().enumerate() {
        let (obs, mask) = station_geometry(st, mask_override)?;
        let found = find_passes(&r.propagator, &obs, &mask, r.start, r.end);
        if let Some(e) = &found.stopped {
            eprintln!(
                "warning: {}: propagation stopped: {e}; passes after that time are not listed",
                r.elements.label()
            );
        }
        if found.passes.is_empty() && found.stopped.is_some() {
            eprintln!(
                "note: {} has no pass over {} before the propagation stopped",
                r.elements.label(),
                st.name
            );
        } else if found.passes.is_empty() {
            eprintln!(
                "note: {} does not rise above the mask of {} in the window",
                r.elements.label(),
                st.name
            );
        }
        all.extend(found.passes.into_iter().map(|p| (i, p)));
    }
    all.sort_by(|a, b| a.1.aos.cmp(&b.1.aos).then(a.0.cmp(&b.0)));
    Ok(all)
}

/// `passbudget passes`.
pub fn passes(a: PassesArgs, out: &mut dyn Write) -> Result<()> {
    let r = resolve(&a.input, &a.station)?;
    let mask = a
        .mask
        .or_else(|| r.mission.as_ref().and_then(|m| m.mask_deg));
    warn_element_age(&r.elements, r.start, r.end);
    let all = all_passes(&r, mask)?;
    let rows: Vec<PassRow> = all
        .iter()
        .map(|(i, p)| PassRow::new(&r.elements, &r.stations[*i].name, p))
        .collect();
    match a.format {
        Format::Json => {
            #[derive(Serialize)]
            struct Doc<'a> {
                passes: &'a [PassRow],
            }
            writeln!(
                out,
                "{}",
                serde_json::to_string_pretty(&Doc { passes: &rows })?
            )?;
        }
        Format::Csv => write!(out, "{}", to_csv(&rows)?)?,
        Format::Table => {
            let mut t = Table::new(&[
                ("station", Align::Left),
                ("AOS (UTC)", Align::Left),
                ("TCA (UTC)", Align::Left),
                ("LOS (UTC)", Align::Left),
                ("duration", Align::Right),
                ("max el", Align::Right),
                ("AOS az", Align::Right),
                ("LOS az", Align::Right),
                ("min range km", Align::Right),
                ("", Align::Left),
            ]);
            for (i, p) in &all {
                let flags = match (p.starts_before_window, p.ends_after_window) {
                    (true, true) => "cut at both ends",
                    (true, false) => "cut at window start",
                    (false, true) => "cut at window end",
                    _ => "",
                };
                t.row(vec![
                    r.stations[*i].name.clone(),
                    p.aos.format("%Y-%m-%d %H:%M:%S").to_string(),
                    p.tca.format("%H:%M:%S").to_string(),
                    p.los.format("%H:%M:%S").to_string(),
                    crate::report::mm_ss(p.duration_s()),
                    format!("{:.1}", p.max_elevation_deg),
                    whole_azimuth(p.aos_azimuth_deg),
                    whole_azimuth(p.los_azimuth_deg),
                    format!("{:.0}", p.min_range_km),
                    flags.to_string(),
                ]);
            }
            writeln!(
                out,
                "{} passes of {} from {} to {}",
                rows.len(),
                r.elements.label(),
                format_ms(&r.start),
                format_ms(&r.end)
            )?;
            write!(out, "{}", t.render())?;
            writeln!(
                out,
                "Planning estimates only; see the README for accuracy and cautions."
            )?;
        }
    }
    Ok(())
}

/// One row of the `track` output (public interface).
#[derive(Debug, Clone, Serialize)]
pub struct TrackRow {
    pub time: String,
    pub azimuth_deg: f64,
    pub elevation_deg: f64,
    pub range_km: f64,
    pub range_rate_km_s: f64,
    pub doppler_hz: Option<f64>,
}

/// `passbudget track`.
pub fn track(a: TrackArgs, out: &mut dyn Write) -> Result<()> {
    if !(a.step.is_finite() && a.step > 0.0) {
        bail!(
            "--step {}: the step must be a finite number of seconds above zero",
            a.step
        );
    }
    if let Some(f) = a.frequency_mhz {
        if !(f.is_finite() && f > 0.0) {
            bail!("--frequency-mhz {f}: must be a finite number above zero");
        }
    }
    let stations: Vec<PathBuf> = a.station.iter().cloned().collect();
    let r = resolve(&a.input, &stations)?;
    if r.stations.len() > 1 {
        bail!(
            "track follows one station: give --station FILE (the mission file lists {})",
            r.stations.len()
        );
    }
    let frequency_hz = a.frequency_mhz.map(|f| f * 1e6).or_else(|| {
        r.mission
            .as_ref()
            .and_then(|m| m.transmitter.as_ref().map(|t| t.frequency_hz))
    });
    let n = crate::timefmt::seconds_between(&r.start, &r.end) / a.step;
    if n > 5e6 {
        bail!(
            "--step {} over this window gives {:.0} points; use a longer step or a shorter window",
            a.step,
            n
        );
    }
    warn_element_age(&r.elements, r.start, r.end);
    let st = &r.stations[0];
    let (obs, mask) = station_geometry(st, None)?;
    let mut rows = Vec::new();
    for item in track_iter(&r.propagator, &obs, r.start, r.end, a.step) {
        match item {
            Ok((t, look)) => {
                if a.above_mask && look.elevation_deg < mask.limit_deg(look.azimuth_deg) {
                    continue;
                }
                rows.push(TrackRow {
                    time: format_ms(&t),
                    azimuth_deg: round(look.azimuth_deg, 4),
                    elevation_deg: round(look.elevation_deg, 4),
                    range_km: round(look.range_km, 4),
                    range_rate_km_s: round(look.range_rate_km_s, 6),
                    doppler_hz: frequency_hz.map(|f| round(doppler_hz(look.range_rate_km_s, f), 1)),
                });
            }
            Err(e) => {
                eprintln!(
                    "warning: {}: propagation stopped: {e}; the track ends there",
                    r.elements.label()
                );
                break;
            }
        }
    }
    match a.format {
        Format::Json => {
            #[derive(Serialize)]
            struct Doc<'a> {
                track: &'a [TrackRow],
            }
            writeln!(
                out,
                "{}",
                serde_json::to_string_pretty(&Doc { track: &rows })?
            )?;
        }
        Format::Csv => write!(out, "{}", to_csv(&rows)?)?,
        Format::Table => {
            let mut t = Table::new(&[
                ("time (UTC)", Align::Left),
                ("az deg", Align::Right),
                ("el deg", Align::Right),
                ("range km", Align::Right),
                ("rate km/s", Align::Right),
                ("Doppler Hz", Align::Right),
            ]);
            for r in &rows {
                t.row(vec![
                    r.time.clone(),
                    format!("{:.2}", r.azimuth_deg),
                    format!("{:.2}", r.elevation_deg),
                    format!("{:.1}", r.range_km),
                    format!("{:.4}", r.range_rate_km_s),
                    r.doppler_hz
                        .map(|d| format!("{d:.0}"))
                        .unwrap_or_else(|| "-".into()),
                ]);
            }
            write!(out, "{}", t.render())?;
        }
    }
    Ok(())
}

/// Azimuth rounded to whole degrees for tables, 0..359 (359.7 shows as 0, not 360).
pub fn whole_azimuth(azimuth_deg: f64) -> String {
    format!("{}", (azimuth_deg.round() as i64).rem_euclid(360))
}

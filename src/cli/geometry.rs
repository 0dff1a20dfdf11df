//! The geometry commands `passes` and `track`, and their inputs from flags or a mission file.

use crate::cli::common::{note, warn, Format};
use crate::cli::table::{Align, Table};
use crate::cli::window::{
    named_the_one_satellite, one_satellite, parse_time_flag, stations_and_mission,
    OptionalMissionArgs,
};
use anyhow::{anyhow, bail, Result};
use passbudget::config::limits::{FREQUENCY_MHZ, MIN_ELEVATION_DEG, TRACK_STEP_S};
use passbudget::config::mission::Mission;
use passbudget::config::station::{same_station, Station};
use passbudget::engfmt;
use passbudget::geometry::sun::{separation_deg, sun_az_el_deg};
use passbudget::geometry::{find_passes, track as track_iter, HorizonMask, Observer, Pass};
use passbudget::orbit::{ElementSet, Propagator};
use passbudget::plan::inputs::{
    check_element_age, element_age_warning, element_notes, load_satellite, propagation_stop,
};
use passbudget::plan::{Window, WindowRequest};
use passbudget::report::geometry::{passes_csv, PassRow, TrackRow};
use passbudget::report::{slug, to_csv};
use passbudget::timefmt::{clock_after, format_ms};
use serde::Serialize;
use std::io::Write;
use std::path::{Path, PathBuf};

/// Orbit, stations and window, from flags or a mission file (flags win).
#[derive(Debug, Clone, clap::Args)]
pub struct InputArgs {
    #[command(flatten)]
    pub mission: OptionalMissionArgs,
    /// Element file: TLE (2- or 3-line), CCSDS OMM JSON or OMM KVN.
    #[arg(long, value_name = "FILE")]
    pub tle: Option<PathBuf>,
    /// Satellite by catalog number or name (needed when the file holds several).
    #[arg(long, value_name = "ID|NAME", conflicts_with = "satellite")]
    pub sat: Option<String>,
    /// One satellite of a fleet mission (its name in the mission file): its element file and
    /// transmitter; a fleet mission needs it unless --tle is given.
    #[arg(long, value_name = "NAME", conflicts_with = "tle")]
    pub satellite: Option<String>,
    /// Start of the window, RFC 3339 UTC (2026-12-02T00:00:00Z).
    #[arg(long, value_name = "TIME")]
    pub start: Option<String>,
    /// End of the window, RFC 3339 UTC.
    #[arg(long, value_name = "TIME", conflicts_with = "days")]
    pub end: Option<String>,
    /// Length of the window in days.
    #[arg(long, value_name = "DAYS", allow_hyphen_values = true)]
    pub days: Option<f64>,
    /// Go ahead even when the window lies more than 90 days from the element epoch (refused
    /// otherwise, as `plan` refuses it: the positions are off by hundreds to thousands of km).
    #[arg(long)]
    pub allow_stale_elements: bool,
}

#[derive(Debug, Clone, clap::Args)]
pub struct PassesArgs {
    #[command(flatten)]
    pub input: InputArgs,
    /// Station: a station file, or the name of one of the mission's stations (repeat for
    /// several; the same station twice is refused; default: the mission's stations).
    #[arg(long, value_name = "FILE|NAME")]
    pub station: Vec<String>,
    /// Minimum elevation, deg: overrides each station's min_elevation_deg (the horizon mask still applies).
    #[arg(
        long = "mask-deg",
        alias = "mask",
        value_name = "DEG",
        allow_hyphen_values = true
    )]
    pub mask_deg: Option<f64>,
    /// Output on stdout: a table for people, or CSV (one row per pass) or JSON.
    #[arg(long, value_enum, default_value = "table")]
    pub format: Format,
}

#[derive(Debug, Clone, clap::Args)]
pub struct TrackArgs {
    #[command(flatten)]
    pub input: InputArgs,
    /// Station: a station file, or the name of one of the mission's stations (default: the
    /// mission's only station).
    #[arg(long, value_name = "FILE|NAME")]
    pub station: Option<String>,
    /// Step between points, s.
    #[arg(
        long = "step-s",
        alias = "step",
        value_name = "SECONDS",
        default_value_t = passbudget::config::defaults::TRACK_STEP_S.value,
        allow_hyphen_values = true
    )]
    pub step_s: f64,
    /// Downlink frequency, MHz, for the Doppler shift (default: the mission's transmitter.frequency_mhz).
    #[arg(long, value_name = "MHZ", allow_hyphen_values = true)]
    pub frequency_mhz: Option<f64>,
    /// Only points where the satellite is above the station's mask.
    #[arg(long)]
    pub above_mask: bool,
    /// Output on stdout: CSV (one row per point), JSON or a table.
    #[arg(long, value_enum, default_value = "csv")]
    pub format: Format,
}

/// Everything the geometry needs, resolved.
pub struct Resolved {
    pub elements: ElementSet,
    pub propagator: Propagator,
    pub stations: Vec<Station>,
    pub window: Window,
    pub mission: Option<Mission>,
    /// The warnings and notes printed so far, kept for the JSON and CSV outputs (as `plan`
    /// keeps them, so that `--quiet` loses none).
    pub said: Said,
}

/// Warnings and notes printed on stderr and kept, in order, for the outputs.
#[derive(Default)]
pub struct Said(Vec<String>);

impl Said {
    fn warn(&mut self, lines: Vec<String>) {
        warn(&lines);
        self.0.extend(lines);
    }

    fn note(&mut self, lines: Vec<String>) {
        note(&lines);
        self.0.extend(lines);
    }

    pub fn lines(&self) -> &[String] {
        &self.0
    }
}

/// Load everything `passes`/`track` need; the window follows the library's one rule.
pub fn resolve(input: &InputArgs, station_args: &[String]) -> Result<Resolved> {
    let overrides = input.mission.overrides()?;
    check_distinct_files(station_args)?;
    let (chosen, mission) = stations_and_mission(station_args, input.mission.path(), &overrides)?;
    // With --tle the mission's satellites are not used; else a fleet's is named by --satellite.
    let mission = match mission {
        Some(m) if input.tle.is_none() => Some(one_satellite(m, input.satellite.as_deref())?),
        m => m,
    };
    let tle = input
        .tle
        .clone()
        .or_else(|| mission.as_ref().map(|m| m.elements_path.clone()))
        .ok_or_else(|| anyhow!("no element file: give --tle FILE or a mission file"))?;
    let sat = input.sat.clone().or_else(|| {
        if input.tle.is_none() {
            mission.as_ref().and_then(|m| m.select.clone())
        } else {
            None
        }
    });
    // The window first: an element-set history is resolved against its start.
    let request = WindowRequest {
        start: parse_time_flag("--start", input.start.as_deref())?,
        end: parse_time_flag("--end", input.end.as_deref())?,
        days: input.days,
    };
    let window = Window::resolve(&request, mission.as_ref()).map_err(|e| {
        let flag = if input.days.is_some() {
            "--days"
        } else if input.end.is_some() {
            "--end"
        } else if input.start.is_some() {
            "--start"
        } else {
            return anyhow!("{e}");
        };
        anyhow!("{flag}: {e}")
    })?;
    let (elements, propagator, selection) = load_satellite(&tle, sat.as_deref(), window.start())?;
    if let Some(m) = &mission {
        named_the_one_satellite(input.satellite.as_deref(), m, &elements)?;
    }
    check_element_age(
        &elements,
        window.start(),
        window.end(),
        input.allow_stale_elements,
    )
    .map_err(|s| anyhow!("{s}; --allow-stale-elements goes ahead anyway"))?;
    let mut said = Said::default();
    said.note(element_notes(&elements, &selection));
    let stations = if !station_args.is_empty() {
        check_distinct_stations(station_args, chosen)?
    } else {
        mission
            .as_ref()
            .map(|m| m.stations.clone())
            .unwrap_or_default()
    };
    if stations.is_empty() {
        bail!("no station: give --station FILE or a mission file with stations");
    }
    Ok(Resolved {
        elements,
        propagator,
        stations,
        window,
        mission,
        said,
    })
}

/// The same station file given twice (by any path to it) is refused: every pass would be listed
/// twice.
fn check_distinct_files(values: &[String]) -> Result<()> {
    let mut seen: Vec<(PathBuf, &String)> = Vec::new();
    for f in values.iter().filter(|v| Path::new(v).is_file()) {
        let key = std::fs::canonicalize(f).unwrap_or_else(|_| PathBuf::from(f));
        if let Some((_, first)) = seen.iter().find(|(k, _)| *k == key) {
            bail!(
                "--station {f}: the same station file is given twice ({first} and {f}); give each station once"
            );
        }
        seen.push((key, f));
    }
    Ok(())
}

/// Two `--station` values naming the same station (two files of one station, or a name given
/// twice) are refused.
fn check_distinct_stations(values: &[String], stations: Vec<Station>) -> Result<Vec<Station>> {
    for (i, st) in stations.iter().enumerate() {
        if let Some(b) = stations[..i]
            .iter()
            .find(|b| same_station(&b.name, &st.name))
        {
            bail!(
                "--station {}: two --station values name the station '{}' ({} and {}); give each station once",
                values[i],
                st.name,
                b.source.display(),
                st.source.display()
            );
        }
    }
    Ok(stations)
}

/// Observer and horizon for a station, with an optional minimum-elevation override.
pub fn station_geometry(
    st: &Station,
    mask_override: Option<f64>,
) -> Result<(Observer, HorizonMask)> {
    let obs = Observer::new(st.latitude_deg, st.longitude_deg, st.altitude_m)
        .map_err(|e| anyhow!("{}: {e}", st.source.display()))?;
    let min = mask_override.unwrap_or(st.min_elevation_deg);
    MIN_ELEVATION_DEG
        .check(min)
        .map_err(|e| anyhow!("--mask-deg: {e}"))?;
    let mask = HorizonMask::new(min, st.horizon_mask.clone())
        .map_err(|e| anyhow!("{}: horizon_mask: {e}", st.source.display()))?;
    Ok((obs, mask))
}

/// Print (and keep) the element-age warning, if any.
fn warn_element_age(r: &mut Resolved) {
    let w = element_age_warning(&r.elements, r.window.start(), r.window.end());
    r.said.warn(w.into_iter().collect());
}

/// Passes of the satellite over every station, sorted by AOS; warnings and notes go to stderr
/// and into `r.said`. A propagation failure is reported once, at the first failing second of the
/// window (the library's [`propagation_stop`]); no pass from then on is listed.
pub fn all_passes(r: &mut Resolved, mask_override: Option<f64>) -> Result<Vec<(usize, Pass)>> {
    let mut all = Vec::new();
    let mut stopped = Vec::new();
    let mut empty = Vec::new();
    for (i, st) in r.stations.iter().enumerate() {
        let (obs, mask) = station_geometry(st, mask_override)?;
        let found = find_passes(&r.propagator, &obs, &mask, r.window.start(), r.window.end());
        if found.passes.is_empty() {
            empty.push((i, found.stopped.is_some()));
        }
        stopped.push(found.stopped);
        all.extend(found.passes.into_iter().map(|p| (i, p)));
    }
    if let Some(s) = propagation_stop(&r.propagator, r.window.start(), &stopped) {
        let line = s.message(&r.elements.label(), "passes after it are not listed");
        r.said.warn(vec![line]);
        all.retain(|(_, p)| p.aos < s.time);
    }
    for (i, cut) in empty {
        let (label, name) = (r.elements.label(), &r.stations[i].name);
        let line = passbudget::plan::summary::no_pass_note(&label, name, cut);
        r.said.note(vec![line]);
    }
    all.sort_by(|a, b| a.1.aos.cmp(&b.1.aos).then(a.0.cmp(&b.0)));
    Ok(all)
}

/// `passbudget passes`.
pub fn passes(a: PassesArgs, out: &mut dyn Write) -> Result<()> {
    let mut r = resolve(&a.input, &a.station)?;
    let mask = a
        .mask_deg
        .or_else(|| r.mission.as_ref().and_then(|m| m.mask_deg));
    warn_element_age(&mut r);
    let all = all_passes(&mut r, mask)?;
    let slugs: Vec<String> = r.stations.iter().map(|s| slug(&s.name)).collect();
    let rows: Vec<PassRow> = all
        .iter()
        .map(|(i, p)| PassRow::with_slug(&r.elements, &r.stations[*i].name, &slugs[*i], p))
        .collect();
    match a.format {
        Format::Json => {
            #[derive(Serialize)]
            struct Doc<'a> {
                passes: &'a [PassRow],
                warnings: &'a [String],
                caution: &'static str,
            }
            let doc = Doc {
                passes: &rows,
                warnings: r.said.lines(),
                caution: passbudget::report::plan::CAUTION,
            };
            writeln!(out, "{}", serde_json::to_string_pretty(&doc)?)?;
        }
        Format::Csv => write!(out, "{}", passes_csv(&rows, r.said.lines()))?,
        Format::Table => {
            let mut t = Table::new(&[
                ("pass id", Align::Left),
                ("station", Align::Left),
                ("AOS (UTC)", Align::Left),
                ("TCA (UTC)", Align::Left),
                ("LOS (UTC)", Align::Left),
                ("duration", Align::Right),
                ("max el deg", Align::Right),
                ("AOS az deg", Align::Right),
                ("LOS az deg", Align::Right),
                ("min range km", Align::Right),
                ("window", Align::Left),
            ]);
            for ((i, p), row) in all.iter().zip(&rows) {
                let flags = match (p.starts_before_window, p.ends_after_window) {
                    (true, true) => "cut at both ends",
                    (true, false) => "cut at window start",
                    (false, true) => "cut at window end",
                    _ => "",
                };
                t.row(vec![
                    row.pass_id.clone(),
                    r.stations[*i].name.clone(),
                    p.aos.format("%Y-%m-%d %H:%M:%S").to_string(),
                    clock_after(&p.aos, &p.tca, false),
                    clock_after(&p.aos, &p.los, false),
                    // from the times as shown (cut to the second), so that LOS - AOS reads as
                    // the duration (rounded, it was a second off in a third of the rows)
                    passbudget::report::mm_ss((p.los.timestamp() - p.aos.timestamp()) as f64),
                    // from the row's value, as `plan`'s table does (one figure for one pass)
                    engfmt::fixed(passbudget::report::round(row.max_elevation_deg, 1), 1),
                    engfmt::azimuth(p.aos_azimuth_deg, 0),
                    engfmt::azimuth(p.los_azimuth_deg, 0),
                    format!("{:.0}", p.min_range_km),
                    flags.to_string(),
                ]);
            }
            writeln!(
                out,
                "{} passes of {} from {} to {}",
                rows.len(),
                r.elements.label(),
                format_ms(&r.window.start()),
                format_ms(&r.window.end())
            )?;
            write!(out, "{}", t.render())?;
            writeln!(out, "{}", passbudget::report::plan::CAUTION)?;
        }
    }
    Ok(())
}

/// `passbudget track`.
pub fn track(a: TrackArgs, out: &mut dyn Write) -> Result<()> {
    // The ranges of the one table (config::limits).
    TRACK_STEP_S
        .check(a.step_s)
        .map_err(|e| anyhow!("--step-s: {e}"))?;
    if let Some(f) = a.frequency_mhz {
        FREQUENCY_MHZ
            .check(f)
            .map_err(|e| anyhow!("--frequency-mhz: {e}"))?;
    }
    let stations: Vec<String> = a.station.iter().cloned().collect();
    let mut r = resolve(&a.input, &stations)?;
    if r.stations.len() > 1 {
        bail!(
            "track follows one station: give --station FILE|NAME (the mission file lists {})",
            r.stations.len()
        );
    }
    let frequency_hz = a
        .frequency_mhz
        .map(|f| f * 1e6)
        .or_else(|| r.mission.as_ref().and_then(mission_frequency_hz));
    let n = r.window.days() * 86400.0 / a.step_s;
    if n > 5e6 {
        bail!(
            "--step-s {} over this window gives {:.0} points; use a longer step or a shorter window",
            a.step_s,
            n
        );
    }
    warn_element_age(&mut r);
    let st = &r.stations[0];
    let (obs, mask) = station_geometry(st, None)?;
    let mut rows = Vec::new();
    for item in track_iter(
        &r.propagator,
        &obs,
        r.window.start(),
        r.window.end(),
        a.step_s,
    ) {
        match item {
            Ok((t, look)) => {
                if a.above_mask && look.elevation_deg < mask.limit_deg(look.azimuth_deg) {
                    continue;
                }
                let (sun_az, sun_el) = sun_az_el_deg(&obs, &t);
                let sun_sep = separation_deg(look.azimuth_deg, look.elevation_deg, sun_az, sun_el);
                rows.push(TrackRow::new(&t, &look, frequency_hz, sun_sep));
            }
            Err(e) => {
                // The same first failing second as `plan` and `passes`, not this step's time.
                if let Some(s) = propagation_stop(&r.propagator, r.window.start(), &[Some(e)]) {
                    r.said
                        .warn(vec![s.message(&r.elements.label(), "the track ends there")]);
                }
                break;
            }
        }
    }
    if a.above_mask && rows.is_empty() {
        r.said.note(vec![format!(
            "{} is never above the mask of {} in this window (--above-mask)",
            r.elements.label(),
            st.name
        )]);
    }
    match a.format {
        Format::Json => {
            #[derive(Serialize)]
            struct Doc<'a> {
                track: &'a [TrackRow],
                warnings: &'a [String],
                caution: &'static str,
            }
            let doc = Doc {
                track: &rows,
                warnings: r.said.lines(),
                caution: passbudget::report::plan::CAUTION,
            };
            writeln!(out, "{}", serde_json::to_string_pretty(&doc)?)?;
        }
        Format::Csv => write!(out, "{}", to_csv(&rows, r.said.lines())?)?,
        Format::Table => {
            let doppler = match frequency_hz {
                Some(f) => format!("Doppler at {}", engfmt::frequency_mhz(f)),
                None => "no Doppler (no frequency: --frequency-mhz)".into(),
            };
            writeln!(
                out,
                "{} from {}, every {} s; {doppler}",
                r.elements.label(),
                st.name,
                a.step_s
            )?;
            print_track(&rows, out)?
        }
    }
    Ok(())
}

/// The downlink frequency of the mission's satellites for the Doppler shift: theirs when they
/// share one (a fleet with `--tle` is not narrowed to one satellite), else none, with a note.
fn mission_frequency_hz(m: &Mission) -> Option<f64> {
    let mut f: Vec<f64> = (m.satellites.iter())
        .filter_map(|s| s.transmitter.as_ref().map(|t| t.frequency_hz))
        .collect();
    f.dedup();
    match f.as_slice() {
        [one] => Some(*one),
        [] => None,
        _ => {
            note(&["no Doppler shift: the mission's satellites transmit on different frequencies; give --frequency-mhz".to_string()]);
            None
        }
    }
}

/// The track as a table, with the caution under it.
fn print_track(rows: &[TrackRow], out: &mut dyn Write) -> Result<()> {
    let mut t = Table::new(&[
        ("time (UTC)", Align::Left),
        ("az deg", Align::Right),
        ("el deg", Align::Right),
        ("range km", Align::Right),
        ("range rate km/s", Align::Right),
        ("Doppler Hz", Align::Right),
        ("Sun sep deg", Align::Right),
    ]);
    for r in rows {
        t.row(vec![
            r.time.clone(),
            engfmt::azimuth(r.azimuth_deg, 2),
            format!("{:.2}", r.elevation_deg),
            format!("{:.1}", r.range_km),
            format!("{:.4}", r.range_rate_km_s),
            r.doppler_hz
                .map(|d| format!("{d:.0}"))
                .unwrap_or_else(|| "-".into()),
            format!("{:.1}", r.sun_separation_deg),
        ]);
    }
    write!(out, "{}", t.render())?;
    writeln!(out, "{}", passbudget::report::plan::CAUTION)?;
    Ok(())
}

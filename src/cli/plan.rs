//! `passbudget plan` and `passbudget mask`.

use crate::cli::common::{load_satellite, satellite_name, warn_element_age};
use crate::config::mission::Mission;
use crate::orbit::{ElementSet, Propagator};
use crate::plan::prepare::{availability_weather, rate_set, station_model, RateSet, StationModel};
use crate::plan::{PassSeries, Plan, PlanInput};
use crate::report::plan::{step_rows, totals, tradeoff, usable_masks, PlanPassRow};
use crate::report::table::{Align, Table};
use crate::report::{round, to_csv, write_atomic, Format};
use crate::timefmt::{file_stamp, format_ms, parse_utc, seconds_between};
use anyhow::{anyhow, bail, Context, Result};
use chrono::{DateTime, Utc};
use serde::Serialize;
use std::io::Write;
use std::path::{Path, PathBuf};

/// Longest budget step along a pass, s.
pub const MAX_STEP_S: f64 = 10.0;

/// Options shared by `plan`, `mask` and `chart`.
#[derive(Debug, Clone, clap::Args)]
pub struct WindowArgs {
    /// Mission file.
    #[arg(value_name = "MISSION")]
    pub mission: PathBuf,
    /// Start of the window, RFC 3339 UTC (default: the mission's window.start).
    #[arg(long, value_name = "TIME")]
    pub start: Option<String>,
    /// Length of the window in days (default: the mission's window.days, else 1).
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
}

#[derive(Debug, Clone, clap::Args)]
pub struct PlanArgs {
    #[command(flatten)]
    pub window: WindowArgs,
    #[arg(long, value_enum, default_value = "table")]
    pub format: Format,
    /// Folder for the per-pass CSV time series and the summary (CSV and JSON).
    #[arg(long, value_name = "DIR")]
    pub out: Option<PathBuf>,
    /// Also draw the charts into the --out folder.
    #[arg(long, requires = "out")]
    pub charts: bool,
    /// Chart file format (with --charts).
    #[arg(long, value_enum, default_value = "png", requires = "charts")]
    pub chart_format: crate::cli::chart::ChartFormatArg,
}

#[derive(Debug, Clone, clap::Args)]
pub struct MaskArgs {
    #[command(flatten)]
    pub window: WindowArgs,
    #[arg(long, value_enum, default_value = "table")]
    pub format: Format,
    /// Mask elevation step of the trade-off table, deg.
    #[arg(long, value_name = "DEG", default_value_t = 5)]
    pub mask_step: usize,
}

/// A mission loaded and prepared for planning.
pub struct Prepared {
    pub mission: Mission,
    pub elements: ElementSet,
    pub stations: Vec<StationModel>,
    pub rates: RateSet,
    pub start: DateTime<Utc>,
    pub end: DateTime<Utc>,
    pub step_s: f64,
    pub exceedance_percent: Option<f64>,
    pub rain: Option<crate::atmosphere::Weather>,
}

/// Load the mission and prepare every model; CLI flags win over the file.
pub fn prepare(w: &WindowArgs) -> Result<Prepared> {
    prepare_with_floor(w, None)
}

/// Like [`prepare`], but the pass search runs down to `search_floor_deg` (the horizon mask still
/// applies) while the configured minimum elevation is kept for reporting: used for the mask
/// trade-off, which must show what masks below the configured one would bring.
pub fn prepare_with_floor(w: &WindowArgs, search_floor_deg: Option<f64>) -> Result<Prepared> {
    let mission = Mission::load(&w.mission)?;
    if mission.stations.is_empty() {
        bail!(
            "{}: the mission lists no stations (stations: [station files])",
            w.mission.display()
        );
    }
    let (elements, _prop): (ElementSet, Propagator) =
        load_satellite(&mission.elements_path, mission.select.as_deref())?;
    let mask = w.mask.or(mission.mask_deg);
    if let Some(m) = mask {
        if !(-5.0..=90.0).contains(&m) {
            bail!("--mask {m}: out of range (-5 to 90 deg)");
        }
    }
    let stations = mission
        .stations
        .iter()
        .map(|s| {
            let configured = mask.unwrap_or(s.min_elevation_deg);
            let mut m = station_model(
                &mission,
                s,
                Some(search_floor_deg.map_or(configured, |f| f.min(configured))),
            )?;
            m.configured_min_elevation_deg = configured;
            Ok::<_, crate::plan::prepare::PrepareError>(m)
        })
        .collect::<Result<Vec<_>, _>>()?;
    let rates = rate_set(&mission, &stations[0].link)?;
    let start = match &w.start {
        Some(s) => parse_utc(s).map_err(|e| anyhow!("--start: {e}"))?,
        None => mission.start.ok_or_else(|| {
            anyhow!(
                "no start time: give --start TIME or window.start in {}",
                w.mission.display()
            )
        })?,
    };
    let days = w.days.or(mission.days);
    let end = match (days, mission.end) {
        (Some(d), _) => {
            if !(d.is_finite() && d > 0.0 && d <= 3660.0) {
                bail!("--days {d}: not a window length (0 to 3660 days)");
            }
            crate::timefmt::add_seconds(&start, d * 86400.0)
        }
        (None, Some(e)) if w.start.is_none() => e,
        _ => crate::timefmt::add_seconds(&start, 86400.0),
    };
    if end <= start {
        bail!("the end of the window is not after its start");
    }
    let step_s = w.step.unwrap_or(mission.step_s);
    if !(step_s.is_finite() && step_s > 0.0) {
        bail!("--step {step_s}: the step must be a finite number of seconds above zero");
    }
    if step_s > MAX_STEP_S
        || (mission
            .modem
            .as_ref()
            .is_some_and(|m| m.min_dwell_s >= 2.0 && step_s > m.min_dwell_s / 2.0))
    {
        bail!("--step {step_s}: the step must be at most {MAX_STEP_S} s and at most half of modem.min_dwell_s, or the dwell rule and the closing edges are miscounted");
    }
    let exceedance_percent = w.exceedance_percent.or(mission.exceedance_percent);
    let rain = availability_weather(exceedance_percent, &stations)?;
    warn_element_age(&elements, start, end);
    Ok(Prepared {
        mission,
        elements,
        stations,
        rates,
        start,
        end,
        step_s,
        exceedance_percent,
        rain,
    })
}

/// Check that `dir` can be written before any work is done.
pub fn check_out_dir(dir: &Path) -> Result<()> {
    std::fs::create_dir_all(dir)
        .with_context(|| format!("--out {}: cannot create the folder", dir.display()))?;
    let probe = dir.join(".passbudget-write-check");
    std::fs::write(&probe, b"ok")
        .with_context(|| format!("--out {}: the folder cannot be written", dir.display()))?;
    let _ = std::fs::remove_file(&probe);
    Ok(())
}

/// File name of a pass's time series.
pub fn pass_csv_name(number: usize, station: &str, aos: &DateTime<Utc>) -> String {
    format!(
        "pass-{number:03}-{}-{}.csv",
        crate::report::slug(station),
        file_stamp(aos)
    )
}

/// Run the plan, streaming per-pass files to `out` if given.
pub fn run_plan(
    p: &Prepared,
    out: Option<&Path>,
    pass_hook: Option<&crate::plan::PassSink>,
) -> Result<Plan> {
    run_plan_quietly(p, out, pass_hook, false)
}

/// [`run_plan`], optionally without repeating the warnings on stderr (for a second run of the same window).
pub fn run_plan_quietly(
    p: &Prepared,
    out: Option<&Path>,
    pass_hook: Option<&crate::plan::PassSink>,
    quiet: bool,
) -> Result<Plan> {
    let input = PlanInput {
        elements: &p.elements,
        stations: &p.stations,
        rates: &p.rates,
        start: p.start,
        end: p.end,
        step_s: p.step_s,
        rain: p.rain,
        frequency_hz: p
            .mission
            .transmitter
            .as_ref()
            .map(|t| t.frequency_hz)
            .unwrap_or(0.0),
    };
    let sink = |s: &PassSeries| -> Result<(), String> {
        if let Some(dir) = out {
            let st = &p.stations[s.plan.station_index].station.name;
            let path = dir.join(pass_csv_name(s.plan.number, st, &s.plan.pass.aos));
            let rows = step_rows(s, &p.rates);
            let text = to_csv(&rows).map_err(|e| format!("{}: {e}", path.display()))?;
            write_atomic(&path, text.as_bytes())
                .map_err(|e| format!("{}: cannot write: {e}", path.display()))?;
        }
        if let Some(h) = pass_hook {
            h(s)?;
        }
        Ok(())
    };
    let days = seconds_between(&p.start, &p.end) / 86400.0;
    let bar = if days * p.stations.len() as f64 >= 3.0 {
        let b =
            indicatif::ProgressBar::with_draw_target(None, indicatif::ProgressDrawTarget::stderr());
        b.set_style(
            indicatif::ProgressStyle::with_template(
                "planning passes [{bar:40}] {pos}/{len} {elapsed} (about {eta} left)",
            )
            .unwrap_or_else(|_| indicatif::ProgressStyle::default_bar()),
        );
        Some(b)
    } else {
        None
    };
    let progress = |total: usize| {
        if let Some(b) = &bar {
            if b.length() != Some(total as u64) {
                b.set_length(total as u64);
            }
            b.inc(1);
        }
    };
    let plan = crate::plan::run(&input, &sink, &progress).map_err(|e| anyhow!("{e}"))?;
    if let Some(b) = bar {
        b.finish_and_clear();
    }
    if quiet {
        return Ok(plan);
    }
    for w in plan_warnings(p, &plan) {
        eprintln!("warning: {w}");
    }
    for (i, s) in plan.stopped.iter().enumerate() {
        if let Some(e) = s {
            eprintln!("warning: {}: propagation stopped during the pass search for {}: {e}; later passes are not planned", p.elements.label(), p.stations[i].station.name);
        }
    }
    Ok(plan)
}

/// Every model warning of the plan, per station: the static ones and the union over its passes.
pub fn plan_warnings(p: &Prepared, plan: &Plan) -> Vec<String> {
    let mut out = Vec::new();
    for (i, s) in p.stations.iter().enumerate() {
        let mut w = crate::plan::series::PassWarnings {
            atmosphere: s.atmosphere.static_warnings(),
            ..Default::default()
        };
        for x in plan.passes.iter().filter(|x| x.station_index == i) {
            w = w.union(&x.warnings);
        }
        out.extend(
            w.messages()
                .into_iter()
                .map(|m| format!("{}: {m}", s.station.name)),
        );
    }
    out.extend(p.rates.warnings.iter().cloned());
    out
}

/// The `assumptions` block of the JSON summary.
pub fn assumptions(p: &Prepared, plan: &Plan) -> serde_json::Value {
    let warnings = plan_warnings(p, plan);
    let mut defaults: Vec<serde_json::Value> = p.mission.defaults.iter().map(|d| serde_json::json!({"file": p.mission.source.display().to_string(), "key": d.key, "value": d.value, "source": d.source})).collect();
    for s in &p.stations {
        defaults.extend(s.station.defaults.iter().map(|d| serde_json::json!({"file": s.station.source.display().to_string(), "key": d.key, "value": d.value, "source": d.source})));
    }
    let tx = p.mission.transmitter.as_ref();
    let option_json = |mode: &str,
                       o: &crate::plan::rate::RateOption,
                       spec: &crate::link::budget::RateSpec| {
        let op = spec.operating();
        let (status, source) = match op.provenance {
            crate::link::modcod::Provenance::Computed(s) => ("computed", s),
            crate::link::modcod::Provenance::Published(s) => ("published", s),
            crate::link::modcod::Provenance::FromMemory(s) => ("from memory", s),
        };
        serde_json::json!({
            "mode": mode, "rate_bps": o.rate_bps, "scheme": o.scheme, "required_ebn0_db": o.required_ebn0_db,
            "error_rate": op.error_rate, "error_measure": format!("{:?}", op.measure).to_uppercase(),
            "threshold_status": status, "threshold_source": source,
            "threshold_cn0_dbhz": crate::report::round(o.threshold_cn0_dbhz, 4),
            "occupied_bandwidth_hz": o.occupied_bandwidth_hz.round(),
        })
    };
    let mut rate_options: Vec<serde_json::Value> = p
        .rates
        .ladder
        .iter()
        .zip(&p.rates.ladder_specs)
        .map(|(o, s)| option_json("fixed", o, s))
        .collect();
    rate_options.extend(
        p.rates
            .adaptive
            .iter()
            .zip(&p.rates.adaptive_specs)
            .map(|(o, s)| option_json("adaptive", o, s)),
    );
    serde_json::json!({
        "rate_options": rate_options,
        "window_start": format_ms(&p.start),
        "window_end": format_ms(&p.end),
        "step_s": p.step_s,
        "frequency_hz": tx.map(|t| t.frequency_hz),
        "exceedance_percent": p.exceedance_percent,
        "availability_case": p.exceedance_percent.map(|x| format!("rain attenuation exceeded {x} % of an average year applied to every pass (P.618-14); planning figure for {:.3} % availability", 100.0 - x)),
        "clear_sky": "gases (ITU-R P.676-12) and clouds (ITU-R P.840-9); no rain, no scintillation fade",
        "required_margin_db": p.rates.required_margin_db,
        "implementation_loss_db": p.rates.implementation_loss_db,
        "min_dwell_s": p.rates.min_dwell_s,
        "shannon_bandwidth_hz": p.rates.shannon_bandwidth_hz,
        "fixed_rate": "per pass, the ladder rate that brings home the most data, counting only runs of at least min_dwell_s with margin >= required_margin_db",
        "adaptive": "at each step the highest-rate option (ladder rates and adaptive schemes) whose run of at least min_dwell_s covers the step",
        "network_total": "each second counted once, at the station with the highest fixed rate at that second",
        "propagator": "SGP4 (sgp4 crate) with WGS-72 constants",
        "frames": "TEME to Earth-fixed by GMST (IAU-82); UT1 taken as UTC; polar motion neglected",
        "element_epoch": format_ms(&p.elements.epoch),
        "defaults": defaults,
        "warnings": warnings,
        "caution": "Planning estimates only, not for safety-of-life decisions. Frequency use needs a licence and coordination by the national administration.",
    })
}

fn hh_mm_ss(seconds: f64) -> String {
    let s = seconds.max(0.0).round() as i64;
    format!("{}:{:02}:{:02}", s / 3600, (s / 60) % 60, s % 60)
}

fn gbit(bits: f64) -> String {
    format!("{:.2}", bits / 1e9)
}

fn mbps(r: Option<f64>) -> String {
    r.map(|x| format!("{:.0}", x / 1e6))
        .unwrap_or_else(|| "-".into())
}

/// `passbudget plan`.
pub fn plan(a: PlanArgs, out: &mut dyn Write) -> Result<()> {
    let staging = match &a.out {
        Some(d) => {
            check_out_dir(d)?;
            Some(crate::report::Staging::new(d).with_context(|| {
                format!("--out {}: cannot create a staging folder", d.display())
            })?)
        }
        None => None,
    };
    let staged: Option<PathBuf> = staging.as_ref().map(|s| s.path().to_path_buf());
    let a = PlanArgs { out: staged, ..a };
    let p = prepare(&a.window)?;
    let collector = crate::cli::chart::ChartCollector::default();
    let chart_dir = a.out.clone().unwrap_or_default();
    let chart_hook = crate::cli::chart::pass_hook(
        &p,
        &chart_dir,
        a.chart_format.into(),
        &collector,
        true,
        None,
    );
    let hook: Option<&crate::plan::PassSink> = if a.charts { Some(&chart_hook) } else { None };
    let plan = run_plan(&p, a.out.as_deref(), hook)?;
    let days = seconds_between(&p.start, &p.end) / 86400.0;
    let rows: Vec<PlanPassRow> = plan
        .passes
        .iter()
        .map(|x| PlanPassRow::new(&p.elements, &p.stations, x))
        .collect();
    let (tot, day_rows) = totals(&plan, &p.rates, days);
    let masks = usable_masks(&plan, &p.stations, &p.rates);
    #[derive(Serialize)]
    struct Doc<'a> {
        satellite: String,
        passes: &'a [PlanPassRow],
        totals: &'a crate::report::plan::Totals,
        days: &'a [crate::report::plan::DayRow],
        usable_masks: &'a [crate::report::plan::UsableMaskRow],
        assumptions: serde_json::Value,
    }
    let doc = Doc {
        satellite: satellite_name(&p.elements),
        passes: &rows,
        totals: &tot,
        days: &day_rows,
        usable_masks: &masks,
        assumptions: assumptions(&p, &plan),
    };
    let json = serde_json::to_string_pretty(&doc)? + "\n";
    if let Some(dir) = &a.out {
        write_atomic(&dir.join("summary.json"), json.as_bytes())
            .with_context(|| format!("{}: cannot write summary.json", dir.display()))?;
        write_atomic(&dir.join("summary.csv"), to_csv(&rows)?.as_bytes())
            .with_context(|| format!("{}: cannot write summary.csv", dir.display()))?;
        write_atomic(&dir.join("days.csv"), to_csv(&day_rows)?.as_bytes())
            .with_context(|| format!("{}: cannot write days.csv", dir.display()))?;
        write_atomic(&dir.join("masks.csv"), to_csv(&masks)?.as_bytes())
            .with_context(|| format!("{}: cannot write masks.csv", dir.display()))?;
        if a.charts {
            crate::cli::chart::window_charts(
                &p,
                &plan,
                dir,
                a.chart_format.into(),
                &collector,
                (true, false, true),
            )?;
            // The mask trade-off needs the passes down to 0 deg: plan the window once more from there.
            let p0 = prepare_with_floor(&a.window, Some(0.0))?;
            let plan0 = run_plan_quietly(&p0, None, None, true)?;
            let none = crate::cli::chart::ChartCollector::default();
            crate::cli::chart::window_charts(
                &p0,
                &plan0,
                dir,
                a.chart_format.into(),
                &none,
                (false, true, false),
            )?;
        }
    }
    if let Some(st) = staging {
        let target = st
            .path()
            .parent()
            .map(Path::to_path_buf)
            .unwrap_or_default();
        st.commit(crate::report::is_output_name).with_context(|| {
            format!(
                "--out {}: cannot move the results into place",
                target.display()
            )
        })?;
    }
    match a.format {
        Format::Json => write!(out, "{json}")?,
        Format::Csv => write!(out, "{}", to_csv(&rows)?)?,
        Format::Table => print_plan_table(&p, &plan, &rows, &tot, &day_rows, &masks, out)?,
    }
    Ok(())
}

fn print_plan_table(
    p: &Prepared,
    plan: &Plan,
    rows: &[PlanPassRow],
    tot: &crate::report::plan::Totals,
    days: &[crate::report::plan::DayRow],
    masks: &[crate::report::plan::UsableMaskRow],
    out: &mut dyn Write,
) -> Result<()> {
    writeln!(
        out,
        "{} over {} station(s), {} to {}, step {} s",
        p.mission.name,
        p.stations.len(),
        format_ms(&p.start),
        format_ms(&p.end),
        p.step_s
    )?;
    let rain_label = p.exceedance_percent.map(|x| format!("rain {x}%"));
    let mut cols = vec![
        ("#", Align::Right),
        ("station", Align::Left),
        ("AOS (UTC)", Align::Left),
        ("LOS", Align::Left),
        ("max el", Align::Right),
        ("rate Mb/s", Align::Right),
        ("scheme", Align::Left),
        ("closes from", Align::Left),
        ("until", Align::Left),
        ("min margin", Align::Right),
        ("fixed Gb", Align::Right),
        ("adapt Gb", Align::Right),
        ("Shannon Gb", Align::Right),
    ];
    if rain_label.is_some() {
        cols.push(("rain Mb/s", Align::Right));
        cols.push(("rain Gb", Align::Right));
    }
    let mut t = Table::new(&cols);
    for (r, x) in rows.iter().zip(&plan.passes) {
        let c = &x.clear;
        let closes = |t: &Option<DateTime<Utc>>, e: Option<f64>| match (t, e) {
            (Some(t), Some(e)) => format!("{} @{:.1}", t.format("%H:%M:%S"), e),
            _ => "-".into(),
        };
        let mut cells = vec![
            r.number.to_string(),
            r.station.clone(),
            x.pass.aos.format("%m-%d %H:%M:%S").to_string(),
            x.pass.los.format("%H:%M:%S").to_string(),
            format!("{:.1}", r.max_elevation_deg),
            mbps(r.rate_bps),
            r.scheme.clone().unwrap_or_else(|| "no rate closes".into()),
            closes(&c.closes_from, c.closes_from_elevation_deg),
            closes(&c.closes_until, c.closes_until_elevation_deg),
            r.min_margin_db
                .map(|m| format!("{m:.1}"))
                .unwrap_or_else(|| "-".into()),
            gbit(r.volume_bits),
            gbit(r.adaptive_volume_bits),
            gbit(r.shannon_volume_bits),
        ];
        if rain_label.is_some() {
            cells.push(mbps(r.rain_rate_bps));
            cells.push(gbit(r.rain_volume_bits.unwrap_or(0.0)));
        }
        t.row(cells);
    }
    write!(out, "{}", t.render())?;
    writeln!(out)?;
    let mut d = Table::new(&[
        ("day (UTC)", Align::Left),
        ("passes", Align::Right),
        ("contact h:mm:ss", Align::Right),
        ("fixed Gb", Align::Right),
        ("adapt Gb", Align::Right),
        ("Shannon Gb", Align::Right),
        ("rain Gb", Align::Right),
    ]);
    for r in days {
        d.row(vec![
            r.date.clone(),
            r.passes.to_string(),
            hh_mm_ss(r.contact_s),
            gbit(r.volume_bits),
            gbit(r.adaptive_volume_bits),
            gbit(r.shannon_volume_bits),
            r.rain_volume_bits.map(gbit).unwrap_or_else(|| "-".into()),
        ]);
    }
    write!(out, "{}", d.render())?;
    writeln!(out)?;
    writeln!(
        out,
        "Window totals ({:.2} days, {} passes, {} with a closing rate):",
        tot.days, tot.passes, tot.passes_closing
    )?;
    writeln!(
        out,
        "  fixed rate per pass     {:>9} Gbit   ({:.0} % of Shannon)",
        gbit(tot.volume_bits),
        tot.fixed_efficiency * 100.0
    )?;
    writeln!(
        out,
        "  adaptive                {:>9} Gbit   ({:.0} % of Shannon)",
        gbit(tot.adaptive_volume_bits),
        tot.adaptive_efficiency * 100.0
    )?;
    writeln!(
        out,
        "  Shannon bound           {:>9} Gbit   (over {:.0} MHz)",
        gbit(tot.shannon_volume_bits),
        p.rates.shannon_bandwidth_hz / 1e6
    )?;
    if let (Some(r), Some(s)) = (tot.single_rate_bps, &tot.single_rate_scheme) {
        writeln!(
            out,
            "  one rate for all passes {:>9} Gbit   (best single rate {:.0} Mbit/s {s})",
            gbit(tot.single_rate_volume_bits),
            r / 1e6
        )?;
    }
    writeln!(
        out,
        "  network (each second once, best station) {} Gbit",
        gbit(tot.network_volume_bits)
    )?;
    if let (Some(v), Some(x)) = (tot.rain_volume_bits, p.exceedance_percent) {
        writeln!(out, "  availability case, rain exceeded {x} % of the year: fixed {} Gbit, adaptive {} Gbit, {} passes closing", gbit(v), gbit(tot.rain_adaptive_volume_bits.unwrap_or(0.0)), tot.rain_passes_closing.unwrap_or(0))?;
    }
    writeln!(out)?;
    let mut m = Table::new(&[
        ("station", Align::Left),
        ("rate Mb/s", Align::Right),
        ("scheme", Align::Left),
        ("usable mask", Align::Right),
        ("passes closing", Align::Right),
    ]);
    for r in masks {
        m.row(vec![
            r.station.clone(),
            format!("{:.0}", r.rate_bps / 1e6),
            r.scheme.clone(),
            r.usable_mask_deg
                .map(|v| format!("{v:.1} deg"))
                .unwrap_or_else(|| "never closes".into()),
            format!("{} of {}", r.passes_closing, r.passes),
        ]);
    }
    writeln!(out, "Usable elevation mask per rate (the rate closes on every pass whenever the satellite is above it):")?;
    write!(out, "{}", m.render())?;
    writeln!(out, "Planning estimates only; frequency use needs a licence and coordination by the national administration. See the README.")?;
    Ok(())
}

/// `passbudget mask`.
pub fn mask(a: MaskArgs, out: &mut dyn Write) -> Result<()> {
    if a.mask_step == 0 {
        bail!("--mask-step 0: the step must be at least 1 deg");
    }
    // Search from 0 deg so the trade-off shows what masks below the configured one would bring.
    let p = prepare_with_floor(&a.window, Some(0.0))?;
    let plan = run_plan(&p, None, None)?;
    let days = seconds_between(&p.start, &p.end) / 86400.0;
    let rows = tradeoff(&plan, &p.stations, &p.rates, days, a.mask_step);
    let masks = usable_masks(&plan, &p.stations, &p.rates);
    match a.format {
        Format::Json => {
            #[derive(Serialize)]
            struct Doc<'a> {
                usable_masks: &'a [crate::report::plan::UsableMaskRow],
                tradeoff: &'a [crate::report::plan::TradeoffRow],
            }
            writeln!(
                out,
                "{}",
                serde_json::to_string_pretty(&Doc {
                    usable_masks: &masks,
                    tradeoff: &rows
                })?
            )?;
        }
        Format::Csv => write!(out, "{}", to_csv(&rows)?)?,
        Format::Table => {
            let mut scopes: Vec<String> =
                p.stations.iter().map(|s| s.station.name.clone()).collect();
            scopes.push("all stations".into());
            for scope in scopes {
                writeln!(
                    out,
                    "{scope}: contact and fixed-rate volume per day against the elevation mask"
                )?;
                let mut cols: Vec<(String, Align)> = vec![
                    ("mask deg".into(), Align::Right),
                    ("contact min/day".into(), Align::Right),
                ];
                for o in &p.rates.ladder {
                    cols.push((format!("{:.0} Mb/s Gb/day", o.rate_bps / 1e6), Align::Right));
                }
                let colrefs: Vec<(&str, Align)> =
                    cols.iter().map(|(s, a)| (s.as_str(), *a)).collect();
                let mut t = Table::new(&colrefs);
                let mine: Vec<&crate::report::plan::TradeoffRow> =
                    rows.iter().filter(|r| r.scope == scope).collect();
                for chunk in mine.chunks(p.rates.ladder.len()) {
                    let mut cells = vec![
                        format!("{:.0}", chunk[0].mask_deg),
                        format!("{:.1}", chunk[0].contact_s_per_day / 60.0),
                    ];
                    cells.extend(
                        chunk
                            .iter()
                            .map(|r| format!("{:.2}", r.volume_bits_per_day / 1e9)),
                    );
                    t.row(cells);
                }
                writeln!(out, "{}", t.render())?;
            }
            let mut m = Table::new(&[
                ("station", Align::Left),
                ("rate Mb/s", Align::Right),
                ("scheme", Align::Left),
                ("usable mask", Align::Right),
            ]);
            for r in &masks {
                m.row(vec![
                    r.station.clone(),
                    format!("{:.0}", r.rate_bps / 1e6),
                    r.scheme.clone(),
                    r.usable_mask_deg
                        .map(|v| format!("{:.1} deg", round(v, 1)))
                        .unwrap_or_else(|| "never closes".into()),
                ]);
            }
            write!(out, "{}", m.render())?;
        }
    }
    Ok(())
}

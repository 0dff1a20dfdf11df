//! `passbudget plan` and `passbudget mask`.

use crate::cli::common::{note, warn, Format};
use crate::cli::output::{
    check_names, check_size, commit, in_out_folder, progress_bar, stage, RunSink,
};
use crate::cli::table::{Align, Table};
use crate::cli::window::WindowArgs;
use anyhow::Result;
use passbudget::chart::plan::{window_charts, ChartSink, WindowCharts};
use passbudget::chart::ChartFormat;
use passbudget::plan::summary::{tradeoff, usable_masks};
use passbudget::plan::{Plan, Planner};
use passbudget::report::files::{
    summary_json, write_summaries, ChartBytes, CsvSink, OutputRequest,
};
use passbudget::report::plan::{PlanDoc, TradeoffRow, UsableMaskRow};
use passbudget::report::{round, to_csv, CommitMode};
use passbudget::timefmt::format_ms;
use serde::Serialize;
use std::io::Write;
use std::path::{Path, PathBuf};

#[derive(Debug, Clone, clap::Args)]
pub struct PlanArgs {
    #[command(flatten)]
    pub window: WindowArgs,
    /// Output on stdout: a table for people, or CSV (one row per pass) or JSON (the summary).
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
    /// Write the --out folder even when the estimate of its size passes the limits (1 GB or
    /// 5000 files).
    #[arg(long, requires = "out")]
    pub allow_large_output: bool,
}

#[derive(Debug, Clone, clap::Args)]
pub struct MaskArgs {
    #[command(flatten)]
    pub window: WindowArgs,
    /// Output on stdout: a table for people, or CSV (one row per mask, rate and station) or JSON.
    #[arg(long, value_enum, default_value = "table")]
    pub format: Format,
    /// Mask elevation step of the trade-off table, deg (whole degrees).
    #[arg(
        long = "mask-step-deg",
        alias = "mask-step",
        value_name = "DEG",
        default_value_t = 5
    )]
    pub mask_step_deg: usize,
}

/// `passbudget plan`.
pub fn plan(a: PlanArgs, out: &mut dyn Write) -> Result<()> {
    let staging = a.out.as_deref().map(stage).transpose()?;
    // The charts' mask trade-off needs the passes below the configured mask: the same run gathers it.
    let planner = a.window.planner(a.charts)?;
    let target = a.out.clone().unwrap_or_default();
    let format: ChartFormat = a.chart_format.into();
    if staging.is_some() {
        check_names(&planner)?;
        let request = OutputRequest {
            csv: true,
            pass_charts: a.charts,
            sky_charts: a.charts,
            chart_bytes: ChartBytes::of(format),
        };
        check_size(&planner, &request, a.allow_large_output, &target)?;
    }
    let dir = staging.as_ref().map(|s| s.path().to_path_buf());
    let chart_dir = dir.clone().unwrap_or_default();
    let charts = ChartSink::new(&planner, &chart_dir, format, true, None);
    let sink = RunSink {
        csv: dir.as_deref().map(|d| CsvSink {
            planner: &planner,
            dir: d,
        }),
        charts: a.charts.then_some(&charts),
        bar: progress_bar(&planner),
    };
    let run = planner.run(&sink);
    drop(sink);
    let in_out = |e: anyhow::Error| match &staging {
        Some(st) => in_out_folder(e, st, &target),
        None => e,
    };
    let plan = run.map_err(|e| in_out(e.into()))?;
    warn(&plan.warnings);
    note(&plan.notes);
    let doc = PlanDoc::new(&planner, &plan);
    if let (Some(dir), Some(st)) = (&dir, staging.as_ref()) {
        write_files(&planner, &plan, &doc, &charts, dir, a.charts)
            .map_err(|e| in_out_folder(e, st, &target))?;
    }
    if let Some(st) = staging {
        commit(st, CommitMode::Replace, &target)?;
    }
    match a.format {
        Format::Json => write!(out, "{}", summary_json(&doc))?,
        Format::Csv => write!(out, "{}", to_csv(&doc.passes)?)?,
        Format::Table => print_plan(&planner, &plan, &doc, out)?,
    }
    Ok(())
}

/// The summaries and (with `charts`) the window charts, into the staging folder `dir`.
fn write_files(
    planner: &Planner,
    plan: &Plan,
    doc: &PlanDoc,
    sink: &ChartSink,
    dir: &Path,
    charts: bool,
) -> Result<()> {
    write_summaries(dir, doc)?;
    if charts {
        let all = WindowCharts {
            sky: true,
            mask: true,
            summary: true,
        };
        window_charts(planner, plan, sink, dir, all)?;
    }
    Ok(())
}

fn gbit(bits: f64) -> String {
    format!("{:.2}", bits / 1e9)
}

fn mbps(r: Option<f64>) -> String {
    r.map(|x| format!("{:.0}", x / 1e6))
        .unwrap_or_else(|| "-".into())
}

fn hh_mm_ss(seconds: f64) -> String {
    let s = seconds.max(0.0).round() as i64;
    format!("{}:{:02}:{:02}", s / 3600, (s / 60) % 60, s % 60)
}

fn print_plan(planner: &Planner, plan: &Plan, doc: &PlanDoc, out: &mut dyn Write) -> Result<()> {
    writeln!(
        out,
        "{} over {} station(s), {} to {}, step {} s",
        planner.mission().name,
        planner.stations().len(),
        format_ms(&plan.window.start()),
        format_ms(&plan.window.end()),
        planner.step_s()
    )?;
    print_passes(planner, plan, doc, out)?;
    print_days(doc, out)?;
    print_totals(planner, doc, out)?;
    print_usable_masks(&doc.usable_masks, true, out)?;
    writeln!(out, "Planning estimates only; frequency use needs a licence and coordination by the national administration. See the README.")?;
    Ok(())
}

fn print_passes(planner: &Planner, plan: &Plan, doc: &PlanDoc, out: &mut dyn Write) -> Result<()> {
    let rain = planner.exceedance_percent().is_some();
    let mut cols = vec![
        ("#", Align::Right),
        ("pass id", Align::Left),
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
    if rain {
        cols.push(("rain Mb/s", Align::Right));
        cols.push(("rain Gb", Align::Right));
    }
    let mut t = Table::new(&cols);
    for (r, x) in doc.passes.iter().zip(&plan.passes) {
        let closes = |c: Option<passbudget::plan::Crossing>| match c {
            Some(c) => format!("{} @{:.1}", c.time.format("%H:%M:%S"), c.elevation_deg),
            None => "-".into(),
        };
        let closing = x.clear.closing;
        let mut cells = vec![
            r.number.to_string(),
            r.pass_id.clone(),
            r.station.clone(),
            x.pass.aos.format("%m-%d %H:%M:%S").to_string(),
            x.pass.los.format("%H:%M:%S").to_string(),
            format!("{:.1}", r.max_elevation_deg),
            mbps(r.rate_bps),
            r.scheme.clone().unwrap_or_else(|| "no rate closes".into()),
            closes(closing.map(|c| c.from)),
            closes(closing.map(|c| c.until)),
            r.min_margin_db
                .map(|m| format!("{m:.1}"))
                .unwrap_or_else(|| "-".into()),
            gbit(r.volume_bits),
            gbit(r.adaptive_volume_bits),
            gbit(r.shannon_volume_bits),
        ];
        if rain {
            cells.push(mbps(r.rain_rate_bps));
            cells.push(gbit(r.rain_volume_bits.unwrap_or(0.0)));
        }
        t.row(cells);
    }
    write!(out, "{}", t.render())?;
    writeln!(out)?;
    Ok(())
}

fn print_days(doc: &PlanDoc, out: &mut dyn Write) -> Result<()> {
    let mut d = Table::new(&[
        ("day (UTC)", Align::Left),
        ("passes", Align::Right),
        ("contact h:mm:ss", Align::Right),
        ("fixed Gb", Align::Right),
        ("adapt Gb", Align::Right),
        ("Shannon Gb", Align::Right),
        ("rain Gb", Align::Right),
    ]);
    for r in &doc.days {
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
    Ok(())
}

fn print_totals(planner: &Planner, doc: &PlanDoc, out: &mut dyn Write) -> Result<()> {
    let tot = &doc.totals;
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
        planner.rates().shannon_bandwidth_hz / 1e6
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
    if let (Some(v), Some(x)) = (tot.rain_volume_bits, planner.exceedance_percent()) {
        writeln!(out, "  availability case, rain exceeded {x} % of the year: fixed {} Gbit, adaptive {} Gbit, {} passes closing", gbit(v), gbit(tot.rain_adaptive_volume_bits.unwrap_or(0.0)), tot.rain_passes_closing.unwrap_or(0))?;
    }
    writeln!(out)?;
    Ok(())
}

/// The usable-mask table (`plan` with the passes-closing column, `mask` without).
fn print_usable_masks(masks: &[UsableMaskRow], plan: bool, out: &mut dyn Write) -> Result<()> {
    let mut cols = vec![
        ("station", Align::Left),
        ("rate Mb/s", Align::Right),
        ("scheme", Align::Left),
        ("usable mask", Align::Right),
    ];
    if plan {
        cols.push(("passes closing", Align::Right));
    }
    let mut m = Table::new(&cols);
    for r in masks {
        let mut cells = vec![
            r.station.clone(),
            format!("{:.0}", r.rate_bps / 1e6),
            r.scheme.clone(),
            r.usable_mask_deg
                .map(|v| format!("{:.1} deg", round(v, 1)))
                .unwrap_or_else(|| "never closes".into()),
        ];
        if plan {
            cells.push(format!("{} of {}", r.passes_closing, r.passes));
        }
        m.row(cells);
    }
    if plan {
        writeln!(out, "Usable elevation mask per rate (the rate closes on every pass whenever the satellite is above it):")?;
    }
    write!(out, "{}", m.render())?;
    Ok(())
}

/// `passbudget mask`.
pub fn mask(a: MaskArgs, out: &mut dyn Write) -> Result<()> {
    if a.mask_step_deg == 0 {
        anyhow::bail!("--mask-step-deg 0: the step must be at least 1 deg");
    }
    let planner = a.window.planner(true)?;
    let plan = planner.collect()?;
    warn(&plan.warnings);
    note(&plan.notes);
    let masks_acc = plan
        .tradeoff_masks
        .as_deref()
        .expect("the planner was asked for the trade-off");
    let series = tradeoff(
        masks_acc,
        planner.rates(),
        plan.window.days(),
        a.mask_step_deg,
    );
    let rows = TradeoffRow::rows(&planner, &series);
    let masks: Vec<UsableMaskRow> = usable_masks(masks_acc, planner.stations(), planner.rates())
        .iter()
        .map(|m| UsableMaskRow::new(&planner, m))
        .collect();
    match a.format {
        Format::Json => {
            #[derive(Serialize)]
            struct Doc<'a> {
                usable_masks: &'a [UsableMaskRow],
                tradeoff: &'a [TradeoffRow],
            }
            let doc = Doc {
                usable_masks: &masks,
                tradeoff: &rows,
            };
            writeln!(out, "{}", serde_json::to_string_pretty(&doc)?)?;
        }
        Format::Csv => write!(out, "{}", to_csv(&rows)?)?,
        Format::Table => {
            print_tradeoff(&planner, &series, out)?;
            print_usable_masks(&masks, false, out)?;
        }
    }
    Ok(())
}

fn print_tradeoff(
    planner: &Planner,
    series: &[passbudget::plan::TradeoffSeries],
    out: &mut dyn Write,
) -> Result<()> {
    let ladder = &planner.rates().ladder;
    for t in series {
        let scope = t.scope.label(planner.stations());
        writeln!(
            out,
            "{scope}: contact and fixed-rate volume per day against the elevation mask"
        )?;
        let mut cols: Vec<(String, Align)> = vec![
            ("mask deg".into(), Align::Right),
            ("contact min/day".into(), Align::Right),
        ];
        for o in &t.volume_bits_per_day {
            let rate = ladder[o.option.0].rate_bps;
            cols.push((format!("{:.0} Mb/s Gb/day", rate / 1e6), Align::Right));
        }
        let colrefs: Vec<(&str, Align)> = cols.iter().map(|(s, a)| (s.as_str(), *a)).collect();
        let mut table = Table::new(&colrefs);
        for (i, mask) in t.masks_deg.iter().enumerate() {
            let mut cells = vec![
                mask.to_string(),
                format!("{:.1}", round(t.contact_s_per_day[i], 1) / 60.0),
            ];
            cells.extend(
                t.volume_bits_per_day
                    .iter()
                    .map(|o| format!("{:.2}", o.values[i].round() / 1e9)),
            );
            table.row(cells);
        }
        writeln!(out, "{}", table.render())?;
    }
    Ok(())
}

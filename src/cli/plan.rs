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
use passbudget::config::mission::Mission;
use passbudget::engfmt;
use passbudget::engfmt::counted;
use passbudget::plan::fleet::{contact_plan, ContactPlan};
use passbudget::plan::summary::tradeoff;
use passbudget::plan::{PassPlan, Plan, Planner};
use passbudget::report::contacts::{write_contact_files, ContactDoc, ContactRows};
use passbudget::report::files::{
    summary_json, write_summaries, ChartBytes, CsvSink, OutputRequest,
};
use passbudget::report::plan::{
    MaskFailureRow, PfdBlock, PlanDoc, PlanPassRow, TradeoffRow, UsableMaskRow,
};
use passbudget::report::{round, to_csv, CommitMode, WriteMode};
use passbudget::timefmt::{self, format_ms};
use serde::Serialize;
use std::io::Write;
use std::path::{Path, PathBuf};

#[derive(Debug, Clone, clap::Args)]
pub struct PlanArgs {
    #[command(flatten)]
    pub window: WindowArgs,
    /// Output on stdout: a table for people, or CSV (one row per pass; one per booked contact for
    /// a fleet) or JSON (the summary with the contact plan).
    #[arg(long, value_enum, default_value = "table")]
    pub format: Format,
    /// Folder for the per-pass CSV time series, the summary (CSV and JSON) and the contact plan
    /// (contacts, satellites and stations CSV, one iCalendar file per station).
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
    /// Mask elevation step of the trade-off table, deg (whole degrees, 1 to 40: the table spans
    /// 0-40 deg).
    #[arg(
        long = "mask-step-deg",
        alias = "mask-step",
        value_name = "DEG",
        default_value_t = 5,
        value_parser = whole_step_deg
    )]
    pub mask_step_deg: usize,
}

/// `passbudget plan`.
pub fn plan(a: PlanArgs, out: &mut dyn Write) -> Result<()> {
    let (path, overrides) = (a.window.mission.path(), a.window.mission.overrides()?);
    let mission = Mission::load_with(path, &overrides)?;
    if mission.satellites.len() > 1 && a.window.satellite.is_none() {
        return crate::cli::fleet::plan_fleet(&a, &mission, out);
    }
    let staging = a.out.as_deref().map(stage).transpose()?;
    // The charts' mask trade-off needs the passes below the configured mask: the same run gathers it.
    let planner = a
        .window
        .planner_of(a.charts, mission, path, &overrides, None)?;
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
    let charts = ChartSink::new(&planner, &chart_dir, format, true, None).staged();
    let sink = RunSink {
        csv: dir.as_deref().map(|d| CsvSink {
            planner: &planner,
            dir: d,
            mode: WriteMode::Staged,
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
    // the table prints the unconfirmed values in its own notes: not twice on the terminal
    use passbudget::plan::NoteKind as K;
    let table = a.format == Format::Table;
    note(&plan.note_lines(|k| !(table && matches!(k, K::RecalledThreshold | K::RecalledPfd))));
    let cp =
        contact_plan(&[&planner], std::slice::from_ref(&plan)).map_err(|e| in_out(e.into()))?;
    // The pass rows only for a document that is written (JSON, CSV, the --out files); the
    // table makes each row as it prints it.
    // Likewise the booked contacts' rows.
    let plans = std::slice::from_ref(&plan);
    let doc = if a.format == Format::Table && staging.is_none() {
        let mut doc = PlanDoc::without_pass_rows(&planner, &plan);
        doc.attach(ContactDoc::without_contact_rows(
            &cp,
            plans,
            planner.stations(),
        ));
        doc
    } else {
        let mut doc = PlanDoc::new(&planner, &plan);
        doc.attach(ContactDoc::new(&cp, plans, planner.stations()));
        doc
    };
    if let (Some(dir), Some(st)) = (&dir, staging.as_ref()) {
        write_files(&planner, &plan, &doc, &charts, dir, a.charts)
            .and_then(|()| write_contacts(&planner, &cp, &doc, dir, &a))
            .map_err(|e| in_out_folder(e, st, &target))?;
    }
    if let Some(st) = staging {
        commit(st, CommitMode::Replace, &target)?;
    }
    match a.format {
        Format::Json => write!(out, "{}", summary_json(&doc))?,
        Format::Csv => write!(out, "{}", to_csv(&doc.passes, &doc.assumptions.warnings)?)?,
        Format::Table => print_plan(&planner, &plan, &doc, &cp, out)?,
    }
    Ok(())
}

/// The contact plan's files (and charts with `--charts`) into the staging folder `dir`.
fn write_contacts(
    planner: &Planner,
    cp: &ContactPlan,
    doc: &PlanDoc,
    dir: &Path,
    a: &PlanArgs,
) -> Result<()> {
    let Some(c) = &doc.contact else {
        return Ok(());
    };
    let warnings = &doc.assumptions.warnings;
    write_contact_files(dir, c, warnings, (cp.window_start, WriteMode::Staged))?;
    if a.charts {
        // under the charts, as under every chart of the plan: the element age only
        let footer = passbudget::chart::plan::chart_warnings(planner);
        contact_charts(cp, c, (&planner.mission().name, &footer), dir, a)?;
    }
    Ok(())
}

/// The antenna timeline and storage charts of a contact plan, into the staging folder `dir`.
pub fn contact_charts(
    cp: &ContactPlan,
    doc: &ContactDoc,
    (mission, warnings): (&str, &[String]),
    dir: &Path,
    a: &PlanArgs,
) -> Result<()> {
    let format: ChartFormat = a.chart_format.into();
    let how = (format, WriteMode::Staged);
    passbudget::chart::contacts::draw_contact_charts(cp, doc, mission, warnings, dir, how)?;
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
    write_summaries(dir, doc, WriteMode::Staged)?;
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

/// A column of volumes in one unit chosen from its largest value (`Gbit`, `Mbit`, ...), each
/// number with about three significant digits.
struct VolumeColumn {
    div: f64,
    unit: &'static str,
    /// The largest finite magnitude among the values, bits.
    largest_bits: f64,
}

impl VolumeColumn {
    fn over(values: impl IntoIterator<Item = f64>) -> Self {
        let max = values
            .into_iter()
            .filter(|v| v.is_finite())
            .fold(0.0f64, |m, v| m.max(v.abs()));
        let (div, unit) = engfmt::volume_unit(max);
        VolumeColumn {
            div,
            unit,
            largest_bits: max,
        }
    }

    fn cell(&self, bits: f64) -> String {
        engfmt::three_digits(bits / self.div)
    }

    fn header(&self, what: &str) -> String {
        format!("{what} {}", self.unit)
    }
}

fn rate_cell(r: Option<f64>) -> String {
    r.map(engfmt::rate).unwrap_or_else(|| "-".into())
}

/// An elevation for a table: one decimal, never `-0.0`.
fn deg1(x: f64) -> String {
    engfmt::fixed(round(x, 1), 1)
}

fn print_plan(
    planner: &Planner,
    plan: &Plan,
    doc: &PlanDoc,
    cp: &ContactPlan,
    out: &mut dyn Write,
) -> Result<()> {
    writeln!(
        out,
        "{}: {} over {}, {} to {}, step {} s",
        planner.mission().name,
        doc.satellite,
        counted(planner.stations().len(), "station"),
        format_ms(&plan.window.start()),
        format_ms(&plan.window.end()),
        planner.step_s()
    )?;
    if let Some(c) = &doc.contact {
        crate::cli::contacts::print_headline(c, doc.totals.volume_bits, out)?;
        writeln!(out)?;
    }
    print_passes(planner, plan, out)?;
    if let Some(c) = &doc.contact {
        let rows = ContactRows::new(cp, std::slice::from_ref(plan), planner.stations());
        crate::cli::contacts::print_contact_plan(c, &rows, out)?;
    }
    print_days(doc, out)?;
    print_totals(planner, doc, out)?;
    print_usable_masks(&doc.usable_masks, &doc.mask_failures, out)?;
    print_pfd(&doc.pfd, out)?;
    for n in passbudget::plan::pfd::unconfirmed_notes(planner.rates(), planner.pfd()) {
        writeln!(out, "note: {}", n.text)?;
    }
    writeln!(out, "{}", passbudget::report::plan::CAUTION)?;
    Ok(())
}

/// The pfd block: every rate option's worst margin over the angles of arrival against the
/// band's Article 21 limit (the JSON's `pfd.options`).
fn print_pfd(pfd: &PfdBlock, out: &mut dyn Write) -> Result<()> {
    let (Some(band), Some(bref)) = (&pfd.band, pfd.reference_bandwidth_hz) else {
        writeln!(out, "pfd: {}", pfd.limit_status)?;
        writeln!(out)?;
        return Ok(());
    };
    // `from memory`, or where the row was read (`read in 47 CFR 25.208(p)`)
    let status = if pfd.limit_status.starts_with("from memory") {
        "from memory"
    } else {
        pfd.limit_status
            .split(" (")
            .next()
            .unwrap_or(pfd.limit_status)
    };
    writeln!(
        out,
        "pfd: worst margin per rate option over every angle of arrival, against the Article 21 limit of {band} (in {}; a negative margin is over the limit):",
        passbudget::plan::pfd::reference_label(bref)
    )?;
    let mut t = Table::new(&[
        ("mode", Align::Left),
        ("rate", Align::Right),
        ("scheme", Align::Left),
        ("worst margin dB", Align::Right),
        ("angle of arrival", Align::Right),
        ("limit status", Align::Left),
    ]);
    for o in &pfd.options {
        t.row(vec![
            o.mode.to_string(),
            engfmt::rate(o.rate_bps),
            o.scheme.clone(),
            format!(
                "{:.1}{}",
                round(o.worst_margin_db, 1),
                if o.worst_margin_db < 0.0 { " !" } else { "" }
            ),
            format!("{} deg", deg1(o.worst_arrival_deg)),
            status.to_string(),
        ]);
    }
    write!(out, "{}", t.render())?;
    writeln!(out)?;
    Ok(())
}

fn print_passes(planner: &Planner, plan: &Plan, out: &mut dyn Write) -> Result<()> {
    let rain = planner.exceedance_percent().is_some();
    let row = |x: &PassPlan| PlanPassRow::new(planner, x);
    // One look at every row for the volume unit and the optional columns.
    let (mut largest_bits, mut mount, mut pfd_over) = (0.0f64, false, false);
    for x in &plan.passes {
        let r = row(x);
        let most = [
            r.volume_bits,
            r.adaptive_volume_bits,
            r.shannon_volume_bits,
            r.rain_volume_bits.unwrap_or(0.0),
        ];
        largest_bits = largest_bits.max(VolumeColumn::over(most).largest_bits);
        mount |= r.mount_lost_s.is_some();
        pfd_over |= r.pfd_margin_db.is_some_and(|m| m < 0.0);
    }
    let vol = VolumeColumn::over([largest_bits]);
    let mut cols: Vec<(String, Align)> = vec![
        ("#".into(), Align::Right),
        ("pass id".into(), Align::Left),
        ("station".into(), Align::Left),
        ("AOS (UTC)".into(), Align::Left),
        ("LOS".into(), Align::Left),
        ("max el deg".into(), Align::Right),
        ("rate".into(), Align::Right),
        ("scheme".into(), Align::Left),
        ("closes from".into(), Align::Left),
        ("until".into(), Align::Left),
        ("margin@TCA dB".into(), Align::Right),
        (vol.header("fixed"), Align::Right),
        (vol.header("adapt"), Align::Right),
        (vol.header("Shannon"), Align::Right),
    ];
    if rain {
        cols.push(("rain rate".into(), Align::Right));
        cols.push((vol.header("rain"), Align::Right));
    }
    let (mount, pfd_over) = mount_and_pfd_columns((mount, pfd_over), &mut cols);
    let t = Table::new(&columns(&cols));
    let with_year = timefmt::needs_year(&plan.window.start(), &plan.window.end());
    let cut = plan
        .passes
        .iter()
        .any(|x| x.pass.starts_before_window || x.pass.ends_after_window);
    let cells = |k: usize| {
        let x = &plan.passes[k];
        let r = row(x);
        let closes = |c: Option<passbudget::plan::Crossing>| match c {
            Some(c) => format!("{} @{}", timefmt::clock(&c.time), deg1(c.elevation_deg)),
            None => "-".into(),
        };
        let closing = x.clear.closing;
        let mark = |on: bool, m: &str| if on { m } else { "" }.to_string();
        let mut cells = vec![
            r.number.to_string(),
            r.pass_id.clone(),
            r.station.clone(),
            mark(x.pass.starts_before_window, "<") + &timefmt::table_time(&x.pass.aos, with_year),
            timefmt::clock_after(&x.pass.aos, &x.pass.los, with_year)
                + &mark(x.pass.ends_after_window, ">"),
            deg1(r.max_elevation_deg),
            rate_cell(r.rate_bps),
            r.scheme.clone().unwrap_or_else(|| "no rate closes".into()),
            closes(closing.map(|c| c.from)),
            closes(closing.map(|c| c.until)),
            r.tca_margin_db
                .map(|m| engfmt::fixed(m, 1))
                .unwrap_or_else(|| "-".into()),
            vol.cell(r.volume_bits),
            vol.cell(r.adaptive_volume_bits),
            vol.cell(r.shannon_volume_bits),
        ];
        if rain {
            cells.push(rate_cell(r.rain_rate_bps));
            cells.push(vol.cell(r.rain_volume_bits.unwrap_or(0.0)));
        }
        mount_and_pfd_cells(&r, (mount, pfd_over), &mut cells);
        cells
    };
    t.write_rows(plan.passes.len(), cells, out)?;
    writeln!(out, "closes from, until: where the chosen rate starts and stops counting, UTC @ elevation in deg.")?;
    writeln!(out, "margin@TCA: Eb/N0 above the scheme's threshold and implementation loss at the pass's highest step the mount can follow, dB, for the chosen rate (the easiest rate when none closes); a rate counts where this is at least the required margin ({} dB).", planner.rates().required_margin_db)?;
    mount_and_pfd_legend((mount, pfd_over), out)?;
    if cut {
        writeln!(out, "<AOS: the pass began before the window (the time shown is the window start); LOS>: it ends after the window.")?;
    }
    writeln!(out)?;
    Ok(())
}

/// The mount's lost seconds when a station gives its mount; the pfd margin when a pass is over.
fn mount_and_pfd_columns(
    (mount, pfd_over): (bool, bool),
    cols: &mut Vec<(String, Align)>,
) -> (bool, bool) {
    if mount {
        cols.push(("mount lost s".into(), Align::Right));
    }
    if pfd_over {
        cols.push(("pfd margin".into(), Align::Right));
    }
    (mount, pfd_over)
}

fn mount_and_pfd_cells(r: &PlanPassRow, (mount, pfd_over): (bool, bool), cells: &mut Vec<String>) {
    if mount {
        cells.push(match r.mount_lost_s {
            Some(s) => engfmt::fixed(s, 0),
            None => "-".into(),
        });
    }
    if pfd_over {
        cells.push(
            r.pfd_margin_db
                .map(|m| engfmt::fixed(m, 1) + if m < 0.0 { " !" } else { "" })
                .unwrap_or_else(|| "-".into()),
        );
    }
}

fn mount_and_pfd_legend((mount, pfd_over): (bool, bool), out: &mut dyn Write) -> Result<()> {
    if mount {
        writeln!(out, "mount lost: seconds the station's mount cannot follow (its axes lag the satellite by more than a quarter beamwidth, the zenith keyhole of an az-el mount); they count for no rate or volume.")?;
    }
    if pfd_over {
        writeln!(out, "pfd margin: the Article 21 limit minus the power flux-density at the station, worst over the pass, dB; '!' over the limit (a warning; compliance is for the administration to decide).")?;
    }
    Ok(())
}

fn columns(cols: &[(String, Align)]) -> Vec<(&str, Align)> {
    cols.iter().map(|(s, a)| (s.as_str(), *a)).collect()
}

fn print_days(doc: &PlanDoc, out: &mut dyn Write) -> Result<()> {
    let vol = VolumeColumn::over(doc.days.iter().flat_map(|r| {
        [
            r.volume_bits,
            r.adaptive_volume_bits,
            r.shannon_volume_bits,
            r.rain_volume_bits.unwrap_or(0.0),
            r.delivered_bits.unwrap_or(0.0),
        ]
    }));
    let cols: Vec<(String, Align)> = vec![
        ("day (UTC)".into(), Align::Left),
        (vol.header("delivered"), Align::Right),
        ("passes".into(), Align::Right),
        ("in view h:mm:ss".into(), Align::Right),
        (vol.header("fixed"), Align::Right),
        (vol.header("adapt"), Align::Right),
        (vol.header("Shannon"), Align::Right),
        (vol.header("rain"), Align::Right),
    ];
    let mut d = Table::new(&columns(&cols));
    for r in &doc.days {
        d.row(vec![
            r.date.clone(),
            r.delivered_bits
                .map(|v| vol.cell(v))
                .unwrap_or_else(|| "-".into()),
            r.passes.to_string(),
            passbudget::report::hh_mm_ss(r.contact_s),
            vol.cell(r.volume_bits),
            vol.cell(r.adaptive_volume_bits),
            vol.cell(r.shannon_volume_bits),
            r.rain_volume_bits
                .map(|v| vol.cell(v))
                .unwrap_or_else(|| "-".into()),
        ]);
    }
    write!(out, "{}", d.render())?;
    writeln!(out, "delivered: the contact plan's data of the day; in view: the passes' AOS to LOS, summed over the stations (not the booked time); fixed, adapt, Shannon, rain: every pass counted, unconstrained (passes counted on the day of their AOS).")?;
    writeln!(out)?;
    Ok(())
}

fn print_totals(planner: &Planner, doc: &PlanDoc, out: &mut dyn Write) -> Result<()> {
    let tot = &doc.totals;
    writeln!(
        out,
        "Window totals per pass, unconstrained (every pass counted, no antenna or store limit; {:.2} days, {} passes, {} with a closing rate):",
        tot.days, tot.passes, tot.passes_closing
    )?;
    let line = |label: &str, bits: f64, note: String| {
        format!("  {label:<24}{:>12}   {note}", engfmt::volume(bits))
    };
    writeln!(
        out,
        "{}",
        line(
            "fixed rate per pass",
            tot.volume_bits,
            format!("({:.0} % of Shannon)", tot.fixed_efficiency * 100.0)
        )
    )?;
    writeln!(
        out,
        "{}",
        line(
            "adaptive",
            tot.adaptive_volume_bits,
            format!("({:.0} % of Shannon)", tot.adaptive_efficiency * 100.0)
        )
    )?;
    writeln!(
        out,
        "{}",
        line(
            "Shannon bound",
            tot.shannon_volume_bits,
            format!(
                "(over {})",
                engfmt::hertz(planner.rates().shannon_bandwidth_hz)
            )
        )
    )?;
    if let (Some(r), Some(s)) = (tot.single_rate_bps, &tot.single_rate_scheme) {
        writeln!(
            out,
            "{}",
            line(
                "one rate for all passes",
                tot.single_rate_volume_bits,
                format!("(best single rate {} {s})", engfmt::rate(r))
            )
        )?;
    }
    writeln!(
        out,
        "{}",
        line(
            "network",
            tot.network_volume_bits,
            "(each second once, best station)".into()
        )
    )?;
    if let (Some(v), Some(x)) = (tot.rain_volume_bits, planner.exceedance_percent()) {
        writeln!(out, "  availability case, rain exceeded {x} % of the year: fixed {}, adaptive {}, {} passes closing", engfmt::volume(v), engfmt::volume(tot.rain_adaptive_volume_bits.unwrap_or(0.0)), tot.rain_passes_closing.unwrap_or(0))?;
    }
    writeln!(out)?;
    Ok(())
}

/// The usable-mask table: per station and rate, the robust mask (closes on the configured share
/// of passes above it), the strict one (every pass) and the passes closing at all; then the
/// passes that fail above the robust mask, where and by how much.
fn print_usable_masks(
    masks: &[UsableMaskRow],
    failures: &[MaskFailureRow],
    out: &mut dyn Write,
) -> Result<()> {
    let share = masks.first().map_or(95.0, |m| m.mask_share_percent);
    let robust_header = format!("on {share} % of passes");
    let mut m = Table::new(&[
        ("station", Align::Left),
        ("rate", Align::Right),
        ("scheme", Align::Left),
        (robust_header.as_str(), Align::Right),
        ("on every pass", Align::Right),
        ("passes closing", Align::Right),
    ]);
    let deg = |v: Option<f64>| {
        v.map(|v| format!("{} deg", deg1(v)))
            .unwrap_or_else(|| "never closes".into())
    };
    for r in masks {
        // a station without a pass has no mask to speak of (the note on stderr says why)
        let deg = |v: Option<f64>| {
            if r.passes == 0 {
                "no pass".to_string()
            } else {
                deg(v)
            }
        };
        m.row(vec![
            r.station.clone(),
            engfmt::rate(r.rate_bps),
            r.scheme.clone(),
            deg(r.robust_mask_deg),
            deg(r.usable_mask_deg),
            if r.passes == 0 {
                "-".into()
            } else {
                format!("{} of {}", r.passes_closing, r.passes)
            },
        ]);
    }
    writeln!(out, "Usable elevation mask per rate: the rate closes whenever the satellite is above it, on {share} % of the passes and on every pass:")?;
    write!(out, "{}", m.render())?;
    writeln!(out, "(as fields of the usable-mask rows: robust_mask_deg on {share} % of passes, usable_mask_deg on every pass)")?;
    if !failures.is_empty() {
        writeln!(out, "Passes that fail above the {share} % mask (their highest step where the rate does not count):")?;
        for f in failures {
            let how = if f.margin_db < f.required_margin_db {
                misses_by(f.required_margin_db - f.margin_db)
            } else {
                "closes, but for less than the dwell time".into()
            };
            let sun = if f.sun_degraded_s > 0.0 {
                format!(
                    " (the Sun raises the noise by more than {} dB for {:.0} s of this pass)",
                    passbudget::plan::results::SUN_DEGRADED_RISE_DB,
                    f.sun_degraded_s
                )
            } else {
                String::new()
            };
            writeln!(
                out,
                "  {} {} {}: pass {} ({}) at {} el {:.2} deg: {how}{sun}",
                f.station,
                engfmt::rate(f.rate_bps),
                f.scheme,
                f.pass,
                f.pass_id,
                &f.time[11..19],
                // two decimals: above a mask rounded up to 0.1 deg, one decimal could read as equal
                round(f.elevation_deg, 2)
            )?;
        }
    }
    Ok(())
}

/// How far a failing step misses its margin: `misses by 0.12 dB`, or `misses by <0.01 dB` for a
/// shortfall that two decimals would show as 0.00.
fn misses_by(shortfall_db: f64) -> String {
    if shortfall_db < 0.005 {
        "misses by <0.01 dB".into()
    } else {
        format!("misses by {shortfall_db:.2} dB")
    }
}

/// `--mask-step-deg`: whole degrees from 1 to 40 (the trade-off spans 0-40 deg: a longer step
/// gave its 0 deg row alone).
fn whole_step_deg(s: &str) -> std::result::Result<usize, String> {
    use passbudget::plan::mask::MAX_MASK_DEG as MAX;
    match s.trim().parse::<usize>() {
        Ok(v) if (1..=MAX).contains(&v) => Ok(v),
        _ => Err(format!(
            "a whole number of degrees from 1 to {MAX} (the trade-off spans 0-{MAX} deg)"
        )),
    }
}

/// `passbudget mask`.
pub fn mask(a: MaskArgs, out: &mut dyn Write) -> Result<()> {
    let planner = a.window.planner(true)?;
    let plan = planner.collect()?;
    warn(&plan.warnings);
    // the adaptive mode and the pfd: not in the trade-off (the thresholds are)
    use passbudget::plan::NoteKind as K;
    note(&plan.note_lines(|k| !matches!(k, K::Adaptive | K::RecalledPfd)));
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
    // The same usable masks as `plan` (the planned passes, each with its own record).
    let masks: Vec<UsableMaskRow> = plan
        .usable_masks
        .iter()
        .map(|m| UsableMaskRow::new(&planner, m))
        .collect();
    let failures = MaskFailureRow::rows(&planner, &plan, &plan.usable_masks);
    match a.format {
        Format::Json => {
            #[derive(Serialize)]
            struct Doc<'a> {
                usable_masks: &'a [UsableMaskRow],
                mask_failures: &'a [MaskFailureRow],
                tradeoff: &'a [TradeoffRow],
                warnings: Vec<String>,
                caution: &'static str,
            }
            let doc = Doc {
                usable_masks: &masks,
                mask_failures: &failures,
                tradeoff: &rows,
                warnings: plan.warnings_with(&[K::RecalledThreshold, K::ElementSet]),
                caution: passbudget::report::plan::CAUTION,
            };
            writeln!(out, "{}", serde_json::to_string_pretty(&doc)?)?;
        }
        Format::Csv => {
            let warnings = plan.warnings_with(&[K::RecalledThreshold, K::ElementSet]);
            write!(out, "{}", to_csv(&rows, &warnings)?)?
        }
        Format::Table => {
            print_tradeoff(&planner, &series, out)?;
            print_usable_masks(&masks, &failures, out)?;
            writeln!(out, "{}", passbudget::report::plan::CAUTION)?;
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
        let vol = VolumeColumn::over(
            t.volume_bits_per_day
                .iter()
                .flat_map(|o| o.values.iter().copied()),
        );
        for o in &t.volume_bits_per_day {
            let r = &ladder[o.option.0];
            cols.push((
                format!("{} {} {}/day", engfmt::rate(r.rate_bps), r.scheme, vol.unit),
                Align::Right,
            ));
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
                    .map(|o| vol.cell(o.values[i].round())),
            );
            table.row(cells);
        }
        writeln!(out, "{}", table.render())?;
    }
    Ok(())
}

//! `passbudget sun-transits`: every passage of the Sun through a station's beam during a pass.

use crate::cli::common::{note, warn, Format};
use crate::cli::table::{Align, Table};
use crate::cli::window::WindowArgs;
use anyhow::{bail, Result};
use passbudget::plan::transits::{near_geostationary, outage_seasons, TransitSink};
use passbudget::report::to_csv;
use passbudget::report::transits::{SeasonRow, TransitRow};
use serde::Serialize;
use std::io::Write;

#[derive(Debug, Clone, clap::Args)]
pub struct TransitsArgs {
    #[command(flatten)]
    pub window: WindowArgs,
    /// Output on stdout: a table for people, or CSV (one row per transit) or JSON.
    #[arg(long, value_enum, default_value = "table")]
    pub format: Format,
}

/// `passbudget sun-transits`.
pub fn sun_transits(a: TransitsArgs, out: &mut dyn Write) -> Result<()> {
    let planner = a.window.planner(false)?;
    let unmodelled: Vec<&str> = planner
        .stations()
        .iter()
        .filter(|s| s.bodies.warnings().sun_not_modelled)
        .map(|s| s.station.name.as_str())
        .collect();
    if unmodelled.len() == planner.stations().len() {
        bail!(
            "sun-transits: the Sun's noise is not modelled at {} at any station (the quiet-Sun figure, ITU-R P.372-14 Fig. 12, covers 0.05-100 GHz; a station's solar_flux_sfu gives it at any frequency), so no transit can be found",
            passbudget::engfmt::frequency_mhz(planner.frequency_hz())
        );
    }
    let sink = TransitSink::new();
    let plan = planner.run(&sink)?;
    warn(&plan.warnings);
    // the notes about rates (the adaptive mode, recalled thresholds, the pfd row): this command
    // shows no rate
    use passbudget::plan::NoteKind as K;
    note(&plan.note_lines(|k| !matches!(k, K::Adaptive | K::RecalledThreshold | K::RecalledPfd)));
    let transits = sink.transits();
    let stations = planner.stations();
    let rows: Vec<TransitRow> = transits
        .iter()
        .map(|t| TransitRow::new(stations, t))
        .collect();
    // Seasons only mean something for a satellite that stays near the geostationary arc.
    let seasons: Option<Vec<SeasonRow>> = near_geostationary(planner.elements()).then(|| {
        let w = &plan.window;
        let last = w.end() - chrono::Duration::nanoseconds(1);
        outage_seasons(
            &transits,
            stations.len(),
            (w.start().date_naive(), last.date_naive()),
        )
        .iter()
        .map(|s| SeasonRow::new(stations, s))
        .collect()
    });
    // the warnings and the element-set notes, as `plan`'s outputs keep them
    let warnings = plan.warnings_with(&[K::ElementSet]);
    match a.format {
        Format::Json => {
            // the warnings and the caution, as every JSON output (the CSV's `#` lines carry them)
            #[derive(Serialize)]
            struct Doc<'a> {
                transits: &'a [TransitRow],
                outage_seasons: Option<&'a [SeasonRow]>,
                warnings: &'a [String],
                caution: &'static str,
            }
            let doc = Doc {
                transits: &rows,
                outage_seasons: seasons.as_deref(),
                warnings: &warnings,
                caution: passbudget::report::plan::CAUTION,
            };
            writeln!(out, "{}", serde_json::to_string_pretty(&doc)?)?;
        }
        Format::Csv => write!(out, "{}", to_csv(&rows, &warnings)?)?,
        Format::Table => {
            print_table(&rows, seasons.as_deref(), out)?;
            if !unmodelled.is_empty() {
                writeln!(
                    out,
                    "The Sun's noise is not modelled at {} (frequency outside 0.05-100 GHz): no transit is looked for there.",
                    unmodelled.join(", ")
                )?;
            }
            writeln!(out, "{}", passbudget::report::plan::CAUTION)?;
        }
    }
    Ok(())
}

/// Which numbering the transit table's pass columns are.
const PASS_NUMBERING: &str = "pass: plan's pass number for the same window (its pass-NNN-*.csv file, passes numbered by AOS); pass id: the station and the minute of the pass's highest elevation (UTC), as in plan's and passes' pass_id";

fn print_table(
    rows: &[TransitRow],
    seasons: Option<&[SeasonRow]>,
    out: &mut dyn Write,
) -> Result<()> {
    if rows.is_empty() {
        writeln!(
            out,
            "No Sun transit: the Sun raises no station's system noise temperature by 0.1 dB or more during a pass in this window."
        )?;
    } else {
        let mut t = Table::new(&[
            ("station", Align::Left),
            ("pass", Align::Right),
            ("pass id", Align::Left),
            ("in beam from (UTC)", Align::Left),
            ("until", Align::Left),
            ("closest", Align::Left),
            ("az deg", Align::Right),
            ("el deg", Align::Right),
            ("sep deg", Align::Right),
            ("Sun K", Align::Right),
            ("Tsys rise dB", Align::Right),
            ("s > 1 dB", Align::Right),
        ]);
        for r in rows {
            t.row(vec![
                r.station.clone(),
                r.pass.to_string(),
                r.pass_id.clone(),
                r.start.clone(),
                r.end[11..].to_string(),
                r.closest[11..].to_string(),
                passbudget::engfmt::azimuth(r.closest_azimuth_deg, 1),
                format!("{:.1}", r.closest_elevation_deg),
                format!("{:.2}", r.min_separation_deg),
                format!("{:.1}", r.max_sun_noise_k),
                format!("{:.2}", r.max_rise_db),
                format!("{:.0}", r.degraded_s),
            ]);
        }
        write!(out, "{}", t.render())?;
        writeln!(out, "{PASS_NUMBERING}")?;
        writeln!(
            out,
            "in beam: the seconds the Sun raises the clear-sky system noise temperature by {} dB or more; Sun K, Tsys rise and s > 1 dB are clear-sky figures",
            passbudget::plan::transits::TRANSIT_RISE_DB
        )?;
    }
    if let Some([]) = seasons {
        writeln!(
            out,
            "\nSun-outage seasons (consecutive days with a transit): none in this window."
        )?;
    } else if let Some(seasons) = seasons {
        writeln!(
            out,
            "\nSun-outage seasons (consecutive days with a transit):"
        )?;
        let mut t = Table::new(&[
            ("station", Align::Left),
            ("first day", Align::Left),
            ("last day", Align::Left),
            ("days", Align::Right),
            ("days > 1 dB", Align::Right),
            ("Sun K", Align::Right),
            ("Tsys rise dB", Align::Right),
            ("note", Align::Left),
        ]);
        for s in seasons {
            t.row(vec![
                s.station.clone(),
                s.first_day.clone(),
                s.last_day.clone(),
                s.days.to_string(),
                s.degraded_days.to_string(),
                format!("{:.1}", s.max_sun_noise_k),
                format!("{:.2}", s.max_rise_db),
                if s.cut_by_window {
                    "cut by the window".into()
                } else {
                    String::new()
                },
            ]);
        }
        write!(out, "{}", t.render())?;
    }
    Ok(())
}

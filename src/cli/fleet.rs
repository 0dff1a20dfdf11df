//! `passbudget plan` on a mission with several satellites: every satellite planned over the
//! shared stations, then one contact plan for the fleet.

use crate::cli::common::{note, warn, Format};
use crate::cli::output::{commit, in_out_folder, stage};
use crate::cli::plan::PlanArgs;
use anyhow::Result;
use passbudget::config::mission::Mission;
use passbudget::engfmt::counted;
use passbudget::plan::fleet::{ContactPlan, FleetPlanner};
use passbudget::plan::Planner;
use passbudget::report::contacts::{write_contact_files, ContactDoc, ContactRows, FleetDoc};
use passbudget::report::{to_csv, write_output, CommitMode, WriteMode};
use std::io::Write;
use std::path::Path;

/// Plan the whole fleet of `mission` and print (and with `--out`, write) its contact plan.
pub fn plan_fleet(a: &PlanArgs, mission: &Mission, out: &mut dyn Write) -> Result<()> {
    let staging = a.out.as_deref().map(stage).transpose()?;
    let request = a.window.request(false)?;
    let fleet = FleetPlanner::new(mission, &request).map_err(|e| {
        crate::cli::window::name_flag(
            e,
            &request,
            &mission.source,
            &a.window.mission.overrides().unwrap_or_default(),
        )
    })?;
    let target = a.out.clone().unwrap_or_default();
    let in_out = |e: anyhow::Error| match &staging {
        Some(st) => in_out_folder(e, st, &target),
        None => e,
    };
    let (plans, cp) = fleet.run().map_err(|e| in_out(e.into()))?;
    let planners: Vec<_> = fleet.planners().iter().collect();
    // The pass and contact rows only for a document that is written (JSON, CSV, the --out
    // files); the table makes each contact's row as it prints it.
    let rows = a.format != Format::Table || staging.is_some();
    let stations = fleet.planners()[0].stations();
    let cdoc = match rows {
        true => ContactDoc::new(&cp, &plans, stations),
        false => ContactDoc::without_contact_rows(&cp, &plans, stations),
    };
    let doc = FleetDoc::new(&planners, &plans, cdoc, rows);
    let (notes, warnings): (Vec<String>, Vec<String>) =
        (doc.warnings.iter().cloned()).partition(|w| doc.notes.contains(w));
    warn(&warnings);
    note(&notes);
    if let Some(st) = staging {
        write_fleet_files((&doc, &planners), &cp, a, st.path())
            .map_err(|e| in_out_folder(e, &st, &target))?;
        commit(st, CommitMode::Replace, &target)?;
    }
    match a.format {
        Format::Json => writeln!(out, "{}", serde_json::to_string_pretty(&doc)?)?,
        Format::Csv => write!(out, "{}", to_csv(&doc.contact.contacts, &doc.warnings)?)?,
        Format::Table => print_fleet(&doc, &ContactRows::new(&cp, &plans, stations), out)?,
    }
    Ok(())
}

/// `summary.json`, the contact plan's CSV and calendar files, each satellite's pass list and
/// (with `--charts`) the timeline and storage charts, into the staging folder `dir` (its commit
/// flushes them all at once).
fn write_fleet_files(
    (doc, planners): (&FleetDoc, &[&Planner]),
    cp: &ContactPlan,
    a: &PlanArgs,
    dir: &Path,
) -> Result<()> {
    let json = serde_json::to_string_pretty(doc)? + "\n";
    write_output(
        &dir.join("summary.json"),
        json.as_bytes(),
        WriteMode::Staged,
    )?;
    let passes = to_csv(&doc.passes, &doc.warnings)?;
    write_output(
        &dir.join("passes.csv"),
        passes.as_bytes(),
        WriteMode::Staged,
    )?;
    let days = to_csv(&doc.days, &doc.warnings)?;
    write_output(&dir.join("days.csv"), days.as_bytes(), WriteMode::Staged)?;
    let how = (cp.window_start, WriteMode::Staged);
    write_contact_files(dir, &doc.contact, &doc.warnings, how)?;
    if a.charts {
        // under the charts: each satellite's element age only (the files carry every warning)
        let footer = passbudget::chart::plan::fleet_chart_warnings(planners);
        crate::cli::plan::contact_charts(cp, &doc.contact, (&doc.mission, &footer), dir, a)?;
    }
    Ok(())
}

fn print_fleet(doc: &FleetDoc, rows: &ContactRows, out: &mut dyn Write) -> Result<()> {
    writeln!(
        out,
        "{}: {} over {}, {} to {}",
        doc.mission,
        counted(doc.contact.satellites.len(), "satellite"),
        counted(doc.contact.stations.len(), "station"),
        doc.window_start,
        doc.window_end
    )?;
    crate::cli::contacts::print_headline(&doc.contact, doc.totals.unconstrained_volume_bits, out)?;
    writeln!(out)?;
    crate::cli::contacts::print_contact_plan(&doc.contact, rows, out)?;
    writeln!(
        out,
        "{} passes, {} with a closing rate; per-pass detail: plan --satellite NAME (or passes.csv with --out).",
        doc.totals.passes, doc.totals.passes_closing
    )?;
    writeln!(out, "{}", passbudget::report::plan::CAUTION)?;
    Ok(())
}

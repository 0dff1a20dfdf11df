//! The contact plan on stdout (`plan`): booked contacts, each satellite's data, each station's
//! booked time and the headline figure, the delivered data.

use crate::cli::table::{Align, Table};
use anyhow::Result;
use passbudget::engfmt;
use passbudget::report::contacts::{ContactDoc, ContactRows};
use passbudget::report::hh_mm_ss;
use std::io::Write;

fn cell_or_dash(x: Option<String>) -> String {
    x.unwrap_or_else(|| "-".into())
}

/// A contact's time for the table: `12-02 01:23:45`, with its year when `with_year`
/// ([`passbudget::timefmt::needs_year`]).
fn short_time(rfc3339: &str, with_year: bool) -> String {
    rfc3339
        .get(if with_year { 0 } else { 5 }..19)
        .map(|s| s.replace('T', " "))
        .unwrap_or_else(|| rfc3339.to_string())
}

/// The headline: what the schedule delivers, with its bound, before anything else.
pub fn print_headline(
    doc: &ContactDoc,
    unconstrained_bits: f64,
    out: &mut dyn Write,
) -> Result<()> {
    let b = &doc.schedule_bound;
    let weighted = doc.satellites.iter().any(|s| s.priority != 1.0);
    let gap = if weighted {
        format!(
            "gap {:.1} %, {:.1} % on the priority-weighted total the schedule maximizes",
            b.gap * 100.0,
            b.weighted_gap * 100.0
        )
    } else {
        format!("gap {:.1} %", b.gap * 100.0)
    };
    writeln!(
        out,
        "Delivered (contact plan): {} in {} contacts; schedule bound {} ({gap}; {}, scheduled in {:.0} ms); unconstrained sum over passes {} (no antenna, store or turnaround limit)",
        engfmt::volume(doc.delivered_bits()),
        doc.booked.contacts,
        engfmt::volume(b.delivered_upper_bits),
        b.method,
        doc.scheduler_s * 1e3,
        engfmt::volume(unconstrained_bits)
    )?;
    Ok(())
}

/// The booked contacts (each row made as it is written: `rows`), then the satellites and the
/// stations.
pub fn print_contact_plan(doc: &ContactDoc, rows: &ContactRows, out: &mut dyn Write) -> Result<()> {
    writeln!(out, "Contact plan (booked contacts):")?;
    let t = Table::new(&[
        ("satellite", Align::Left),
        ("antenna", Align::Left),
        ("set-up (UTC)", Align::Left),
        ("start", Align::Left),
        ("end", Align::Left),
        ("el start/max/end deg", Align::Right),
        ("rate", Align::Right),
        ("scheme", Align::Left),
        ("min margin", Align::Right),
        ("delivered", Align::Right),
    ]);
    let with_year = rows.needs_year();
    let cells = |k: usize| {
        let c = rows.row(k);
        vec![
            c.satellite,
            c.antenna,
            short_time(&c.setup_start, with_year),
            c.start.get(11..19).unwrap_or("").to_string(),
            c.end.get(11..19).unwrap_or("").to_string() + if c.shortened { " *" } else { "" },
            [
                c.start_elevation_deg,
                c.max_elevation_deg,
                c.end_elevation_deg,
            ]
            .map(|e| engfmt::fixed(e, 1))
            .join("/"),
            engfmt::rate(c.rate_bps),
            c.scheme,
            cell_or_dash(c.min_margin_db.map(|m| engfmt::fixed(m, 1) + " dB")),
            engfmt::volume(c.volume_bits),
        ]
    };
    t.write_rows(rows.len(), cells, out)?;
    if doc.booked.any_shortened {
        writeln!(
            out,
            "*: shortened to make room for another contact, its set-up or a blocked period."
        )?;
    }
    writeln!(
        out,
        "A contact spans the budget steps its rate counts on (each to the next step), so its start \
         and end can lie up to one step from the pass table's interpolated closing times. Within it, \
         seconds the mount cannot follow or below the required margin count for nothing, and the \
         on-board store (when modelled) can run empty: delivered can be less than rate x duration."
    )?;
    writeln!(out)?;
    print_satellites(doc, out)?;
    print_stations(doc, out)
}

fn print_satellites(doc: &ContactDoc, out: &mut dyn Write) -> Result<()> {
    let mut t = Table::new(&[
        ("satellite", Align::Left),
        ("priority", Align::Right),
        ("contacts", Align::Right),
        ("at start", Align::Right),
        ("generated", Align::Right),
        ("delivered", Align::Right),
        ("lost (full)", Align::Right),
        ("store peak", Align::Right),
        ("left on board", Align::Right),
        ("latency max/median", Align::Right),
        ("passes not booked", Align::Right),
    ]);
    let vol = |x: Option<f64>| cell_or_dash(x.map(engfmt::volume));
    for s in &doc.satellites {
        let latency = match (s.max_latency_s, s.median_latency_s) {
            (Some(m), Some(d)) => format!("{}/{}", hh_mm_ss(m), hh_mm_ss(d)),
            _ => "-".into(),
        };
        t.row(vec![
            s.name.clone(),
            engfmt::three_digits(s.priority),
            s.contacts.to_string(),
            vol(s.initial_fill_bits),
            vol(s.generated_bits),
            engfmt::volume(s.delivered_bits),
            vol(s.lost_bits),
            vol(s.storage_peak_bits),
            vol(s.final_fill_bits),
            latency,
            s.not_booked.to_string(),
        ]);
    }
    write!(out, "{}", t.render())?;
    if doc.satellites.iter().any(|s| !s.onboard_followed) {
        writeln!(out, "-: no onboard block: the satellite always has data to send, its store is not followed.")?;
    }
    if doc.satellites.iter().any(|s| s.onboard_followed) {
        writeln!(
            out,
            "at start + generated = delivered + lost + left on board."
        )?;
    }
    writeln!(out, "latency: age of the oldest data on board at the start of each downlink (h:mm:ss), the largest and the median.")?;
    writeln!(out, "passes not booked: passes with a closing rate no antenna took (the reasons are in satellites.csv and the JSON: rules, blocked periods, overlap, nothing on board).")?;
    writeln!(out)?;
    Ok(())
}

fn print_stations(doc: &ContactDoc, out: &mut dyn Write) -> Result<()> {
    let mut t = Table::new(&[
        ("station", Align::Left),
        ("antennas", Align::Right),
        ("contacts", Align::Right),
        ("booked h:mm:ss", Align::Right),
        ("utilization", Align::Right),
    ]);
    for s in &doc.stations {
        t.row(vec![
            s.name.clone(),
            s.antennas.to_string(),
            s.contacts.to_string(),
            hh_mm_ss(s.booked_s),
            format!("{:.1} %", s.utilization * 100.0),
        ]);
    }
    write!(out, "{}", t.render())?;
    writeln!(out)?;
    Ok(())
}

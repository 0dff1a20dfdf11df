//! Contact-plan charts: an antenna timeline per UTC day (one row per antenna: booked contacts
//! coloured by satellite with their set-up before them, candidates not booked in grey, blocked
//! periods hatched) and the storage fill of each satellite over the window, with the data lost
//! to a full store marked.

use chrono::{DateTime, Duration, NaiveTime, Utc};
use plotters::coord::Shift;
use plotters::prelude::*;
use plotters::style::text_anchor::{HPos, Pos, VPos};
use std::path::Path;

use super::style::{self, Key, Stroke};
use super::types::{ChartError, Plot};
use super::ChartFormat;
use crate::plan::fleet::{antenna_name, ContactPlan};
use crate::report::contacts::ContactDoc;
use crate::report::WriteMode;
use crate::timefmt::{add_seconds, seconds_between};

/// Timeline chart size, pixels.
pub const TIMELINE_SIZE: (u32, u32) = (1600, 900);
/// Storage chart size, pixels.
pub const STORAGE_SIZE: (u32, u32) = (1600, 900);

const LEGEND_W: u32 = 280;

/// One bar of the timeline.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct TimelineBar {
    pub antenna: usize,
    pub satellite: usize,
    /// The satellite's pass (one pass at a station of several antennas has a bar on each).
    pub pass: usize,
    pub setup_start: DateTime<Utc>,
    pub start: DateTime<Utc>,
    pub end: DateTime<Utc>,
}

/// The antennas over one UTC day (or part of one).
#[derive(Debug, Clone, PartialEq)]
pub struct TimelineChartData {
    pub mission: String,
    pub start: DateTime<Utc>,
    pub end: DateTime<Utc>,
    pub antennas: Vec<String>,
    pub satellites: Vec<String>,
    pub booked: Vec<TimelineBar>,
    /// Candidates that were not booked (their set-up start is their start).
    pub unbooked: Vec<TimelineBar>,
    /// Blocked periods: (antenna, start, end).
    pub blocked: Vec<(usize, DateTime<Utc>, DateTime<Utc>)>,
    pub warnings: Vec<String>,
}

/// One satellite's store over the window.
#[derive(Debug, Clone, PartialEq)]
pub struct StorageSeries {
    pub name: String,
    pub capacity_bits: f64,
    pub points: Vec<(DateTime<Utc>, f64)>,
    pub lost: Vec<(DateTime<Utc>, DateTime<Utc>)>,
    pub lost_bits: f64,
}

/// Every followed store over the window.
#[derive(Debug, Clone, PartialEq)]
pub struct StorageChartData {
    pub mission: String,
    pub start: DateTime<Utc>,
    pub end: DateTime<Utc>,
    pub series: Vec<StorageSeries>,
    pub warnings: Vec<String>,
}

impl Plot for TimelineChartData {
    const NAME: &'static str = "timeline";
    fn size(&self) -> (u32, u32) {
        TIMELINE_SIZE
    }
    fn warnings(&self) -> &[String] {
        &self.warnings
    }
    fn plot<DB: DrawingBackend>(&self, root: &DrawingArea<DB, Shift>) -> Result<(), ChartError>
    where
        DB::ErrorType: 'static,
    {
        plot_timeline(self, root)
    }
}

impl Plot for StorageChartData {
    const NAME: &'static str = "storage";
    fn size(&self) -> (u32, u32) {
        STORAGE_SIZE
    }
    fn warnings(&self) -> &[String] {
        &self.warnings
    }
    fn plot<DB: DrawingBackend>(&self, root: &DrawingArea<DB, Shift>) -> Result<(), ChartError>
    where
        DB::ErrorType: 'static,
    {
        plot_storage(self, root)
    }
}

fn satellite_color(i: usize) -> RGBColor {
    style::SERIES[i % style::SERIES.len()]
}

fn plot_timeline<DB: DrawingBackend>(
    d: &TimelineChartData,
    root: &DrawingArea<DB, Shift>,
) -> Result<(), ChartError>
where
    DB::ErrorType: 'static,
{
    let (w, _) = root.dim_in_pixel();
    let (title, body) = root.split_vertically(90);
    title.draw(&Text::new(
        format!(
            "Antenna timeline · {} · {} to {}",
            d.mission,
            d.start.format("%Y-%m-%d %H:%MZ"),
            d.end.format("%Y-%m-%d %H:%MZ")
        ),
        (30, 18),
        style::title_font(),
    ))?;
    // a pass at a station of several antennas has a grey bar on each, and counts once
    let unbooked: std::collections::HashSet<(usize, usize)> =
        d.unbooked.iter().map(|b| (b.satellite, b.pass)).collect();
    title.draw(&Text::new(
        format!(
            "{} in the plan · {} booked · {} with a closing rate left unbooked",
            crate::engfmt::counted(d.antennas.len(), "antenna"),
            crate::engfmt::counted(d.booked.len(), "contact"),
            crate::engfmt::counted(unbooked.len(), "pass"),
        ),
        (30, 58),
        style::label_font(),
    ))?;
    let (plot, legend) = body.split_horizontally(w - LEGEND_W);
    let span = seconds_between(&d.start, &d.end).max(60.0);
    let (step, ticks) = style::time_ticks(&d.start, 0.0, span, 12);
    let start = d.start;
    let fmt = move |v: &f64| style::time_label(&start, *v, step, false);
    let n = d.antennas.len().max(1);
    let rows: Vec<f64> = (0..n).map(|i| i as f64 + 0.5).collect();
    // Antenna 0 is the top row: the row at y in [i, i + 1) is antenna n - 1 - i.
    let names = d.antennas.clone();
    let row_label = move |v: &f64| {
        let i = v.floor() as usize;
        names.get(n - 1 - i.min(n - 1)).cloned().unwrap_or_default()
    };
    let mut chart = ChartBuilder::on(&plot)
        .margin_top(10)
        .margin_left(10)
        .margin_right(24)
        .x_label_area_size(58)
        .y_label_area_size(190)
        .build_cartesian_2d(
            style::TickAxis::new(0.0, span, ticks),
            style::TickAxis::new(0.0, n as f64, rows),
        )?;
    chart
        .configure_mesh()
        .bold_line_style(style::GRID)
        .light_line_style(TRANSPARENT)
        .x_label_formatter(&fmt)
        .y_label_formatter(&row_label)
        .x_desc("time (UTC)")
        .axis_desc_style(style::label_font())
        .label_style(style::tick_font())
        .draw()?;
    let x = |t: &DateTime<Utc>| seconds_between(&d.start, t).clamp(0.0, span);
    // Row `a` is drawn top-down: antenna 0 at the top.
    let y = |a: usize, f: f64| (n - 1 - a) as f64 + f;
    for &(a, s, e) in &d.blocked {
        let (x0, x1) = (x(&s), x(&e));
        if x1 > x0 {
            chart.draw_series([Rectangle::new(
                [(x0, y(a, 0.05)), (x1, y(a, 0.95))],
                style::TERRAIN.filled(),
            )])?;
            chart.draw_series([Rectangle::new(
                [(x0, y(a, 0.05)), (x1, y(a, 0.95))],
                style::TERRAIN_EDGE.stroke_width(1),
            )])?;
        }
    }
    for b in &d.unbooked {
        chart.draw_series([Rectangle::new(
            [
                (x(&b.start), y(b.antenna, 0.3)),
                (x(&b.end), y(b.antenna, 0.7)),
            ],
            style::GRID.filled(),
        )])?;
    }
    // A contact is at least 1/400 of the day wide (about 3 px), so a short one reads as a contact
    // in its satellite's colour, not as a set-up mark; its outline only where it is wider.
    let min_w = span / 400.0;
    for b in &d.booked {
        let c = satellite_color(b.satellite);
        let (x0, x1) = (x(&b.start), x(&b.end));
        let (lo, hi) = (y(b.antenna, 0.15), y(b.antenna, 0.85));
        let setup = [
            (x(&b.setup_start), y(b.antenna, 0.42)),
            (x0, y(b.antenna, 0.58)),
        ];
        chart.draw_series([
            Rectangle::new(setup, style::INK.filled()),
            Rectangle::new([(x0, lo), (x1.max(x0 + min_w), hi)], c.filled()),
        ])?;
        if x1 - x0 > 2.0 * min_w {
            let edge = style::INK.stroke_width(1);
            chart.draw_series([Rectangle::new([(x0, lo), (x1, hi)], edge)])?;
        }
    }
    if d.booked.is_empty() && d.unbooked.is_empty() {
        chart.draw_series(std::iter::once(Text::new(
            "no contact in this period".to_string(),
            (span / 2.0, n as f64 / 2.0),
            style::title_font().pos(Pos::new(HPos::Center, VPos::Center)),
        )))?;
    }
    let mut keys: Vec<(Key, String)> = d
        .satellites
        .iter()
        .enumerate()
        .map(|(i, s)| (Key::Band(satellite_color(i), 1.0), s.clone()))
        .collect();
    // The legend names only what the day's chart draws (a key for no mark reads as one missed).
    if d.booked.iter().any(|b| x(&b.start) > x(&b.setup_start)) {
        keys.push((
            Key::Line(Stroke::solid(style::INK, 6)),
            "set-up (turnaround)".into(),
        ));
    }
    if !d.unbooked.is_empty() {
        keys.push((Key::Band(style::GRID, 1.0), "pass left unbooked".into()));
    }
    if d.blocked.iter().any(|(_, s, e)| x(e) > x(s)) {
        keys.push((Key::Band(style::TERRAIN, 1.0), "antenna blocked".into()));
    }
    style::draw_legend(&legend, Some("Satellite"), &keys)
}

fn plot_storage<DB: DrawingBackend>(
    d: &StorageChartData,
    root: &DrawingArea<DB, Shift>,
) -> Result<(), ChartError>
where
    DB::ErrorType: 'static,
{
    let (w, _) = root.dim_in_pixel();
    let (title, body) = root.split_vertically(90);
    let lost: f64 = d.series.iter().map(|s| s.lost_bits).sum();
    title.draw(&Text::new(
        format!("Data on board · {}", d.mission),
        (30, 18),
        style::title_font(),
    ))?;
    title.draw(&Text::new(
        format!(
            "fill as a share of each store's capacity; {} lost to full stores in the window",
            style::format_volume(lost)
        ),
        (30, 58),
        style::label_font(),
    ))?;
    let (plot, legend) = body.split_horizontally(w - LEGEND_W);
    let span = seconds_between(&d.start, &d.end).max(60.0);
    let (step, ticks) = style::time_ticks(&d.start, 0.0, span, 10);
    let start = d.start;
    let fmt = move |v: &f64| style::time_label(&start, *v, step, span > 86400.0);
    let mut chart = ChartBuilder::on(&plot)
        .margin_top(10)
        .margin_left(10)
        .margin_right(24)
        .x_label_area_size(58)
        .y_label_area_size(90)
        .build_cartesian_2d(style::TickAxis::new(0.0, span, ticks), 0.0..112.0)?;
    chart
        .configure_mesh()
        .bold_line_style(style::GRID)
        .light_line_style(TRANSPARENT)
        .x_label_formatter(&fmt)
        .y_label_formatter(&style::num_label)
        .x_desc("time (UTC)")
        .y_desc("store fill (% of capacity)")
        .axis_desc_style(style::label_font())
        .label_style(style::tick_font())
        .draw()?;
    let x = |t: &DateTime<Utc>| seconds_between(&d.start, t);
    let mut keys = Vec::new();
    for (i, s) in d.series.iter().enumerate() {
        let cap = s.capacity_bits.max(1.0);
        let pts: Vec<(f64, f64)> = s
            .points
            .iter()
            .map(|(t, b)| (x(t), 100.0 * b / cap))
            .collect();
        let stroke = Stroke::series(i, 2);
        style::stroke_line!(chart, draw_series, pts, stroke);
        // Lost data: a thick band above the 100 % line in the satellite's colour, at least
        // about 3 px wide and edged, so that a store full for a minute (an imaging strip) and a
        // light colour still show.
        let band = 102.0 + 2.0 * (i % 4) as f64;
        for (a, b) in &s.lost {
            let corners = [(x(a), band), (x(b).max(x(a) + span / 300.0), band + 1.5)];
            chart.draw_series([
                Rectangle::new(corners, satellite_color(i).filled()),
                Rectangle::new(corners, style::MUTED.stroke_width(1)),
            ])?;
        }
        let lost = if s.lost_bits > 0.0 {
            format!("\nlost {}", style::format_volume(s.lost_bits))
        } else {
            String::new()
        };
        keys.push((
            Key::Line(stroke),
            format!(
                "{} ({}){lost}",
                s.name,
                style::format_volume(s.capacity_bits)
            ),
        ));
    }
    keys.push((
        Key::Blank,
        "bars above 100 %:\ndata lost (store full)".into(),
    ));
    style::draw_legend(&legend, Some("Satellite (capacity)"), &keys)
}

/// The UTC days of a window, as (start, end) clipped to it.
fn days(start: DateTime<Utc>, end: DateTime<Utc>) -> Vec<(DateTime<Utc>, DateTime<Utc>)> {
    let mut out = Vec::new();
    let mut day0 = start.date_naive().and_time(NaiveTime::MIN).and_utc();
    while day0 < end {
        let day1 = day0 + Duration::days(1);
        out.push((day0.max(start), day1.min(end)));
        day0 = day1;
    }
    out
}

/// Each followed store over the window of a contact plan.
fn storage_series(cp: &ContactPlan) -> Vec<StorageSeries> {
    let at = |s: f64| add_seconds(&cp.window_start, s);
    (0..cp.satellites.len())
        .filter(|&i| cp.followed[i])
        .map(|i| {
            let o = &cp.schedule.satellites[i];
            StorageSeries {
                name: cp.satellites[i].clone(),
                capacity_bits: cp.capacity_bits[i],
                points: (o.storage_timeline.iter())
                    .map(|&(t, b)| (at(t), b))
                    .collect(),
                lost: (o.lost_intervals.iter())
                    .map(|&(a, b)| (at(a), at(b)))
                    .collect(),
                lost_bits: o.lost_bits,
            }
        })
        .collect()
}

/// The timeline of each UTC day and the storage chart of a contact plan.
pub fn contact_chart_data(
    cp: &ContactPlan,
    doc: &ContactDoc,
    mission: &str,
    warnings: &[String],
) -> (Vec<TimelineChartData>, Option<StorageChartData>) {
    let start = cp.window_start;
    let end = add_seconds(&start, cp.window_s);
    let names: Vec<String> = cp
        .antennas
        .iter()
        .map(|&(si, k)| antenna_name(&doc.stations[si].name, doc.stations[si].antennas, k))
        .collect();
    let at = |s: f64| add_seconds(&start, s);
    let booked: Vec<TimelineBar> = cp
        .schedule
        .contacts
        .iter()
        .map(|c| TimelineBar {
            antenna: cp.candidates[c.candidate].antenna,
            satellite: c.satellite,
            pass: cp.candidates[c.candidate].pass_ref,
            setup_start: at(c.setup_start_s),
            start: at(c.start_s),
            end: at(c.end_s),
        })
        .collect();
    // A pass booked on any antenna is not a lost candidate on the station's other antennas.
    let taken: std::collections::HashSet<(usize, usize)> = cp
        .schedule
        .contacts
        .iter()
        .map(|c| (c.satellite, cp.candidates[c.candidate].pass_ref))
        .collect();
    let unbooked: Vec<TimelineBar> = cp
        .candidates
        .iter()
        .filter(|c| !taken.contains(&(c.satellite, c.pass_ref)))
        .map(|c| TimelineBar {
            antenna: c.antenna,
            satellite: c.satellite,
            pass: c.pass_ref,
            setup_start: at(c.start_s),
            start: at(c.start_s),
            end: at(c.end_s),
        })
        .collect();
    let blocked: Vec<(usize, DateTime<Utc>, DateTime<Utc>)> = cp
        .antenna_blocked
        .iter()
        .enumerate()
        .flat_map(|(a, v)| v.iter().map(move |&(s, e)| (a, s, e)))
        .collect();
    let in_day =
        |s: DateTime<Utc>, e: DateTime<Utc>, b: &TimelineBar| b.end > s && b.setup_start < e;
    let timelines = days(start, end)
        .into_iter()
        .map(|(s, e)| TimelineChartData {
            mission: mission.to_string(),
            start: s,
            end: e,
            antennas: names.clone(),
            satellites: cp.satellites.clone(),
            booked: booked.iter().filter(|b| in_day(s, e, b)).copied().collect(),
            unbooked: unbooked
                .iter()
                .filter(|b| in_day(s, e, b))
                .copied()
                .collect(),
            blocked: blocked
                .iter()
                .filter(|(_, a, b)| *b > s && *a < e)
                .copied()
                .collect(),
            warnings: warnings.to_vec(),
        })
        .collect();
    let series = storage_series(cp);
    let storage = (!series.is_empty()).then(|| StorageChartData {
        mission: mission.to_string(),
        start,
        end,
        series,
        warnings: warnings.to_vec(),
    });
    (timelines, storage)
}

/// Draw the contact plan's charts into `dir`: `timeline-YYYYMMDD.EXT` per UTC day and
/// `storage.EXT` when a store is followed; drawn in parallel, written in `mode`
/// ([`WriteMode::Staged`] into a staging folder, whose commit flushes them).
pub fn draw_contact_charts(
    cp: &ContactPlan,
    doc: &ContactDoc,
    mission: &str,
    warnings: &[String],
    dir: &Path,
    (format, mode): (ChartFormat, WriteMode),
) -> Result<(), ChartError> {
    use rayon::prelude::*;
    let (timelines, storage) = contact_chart_data(cp, doc, mission, warnings);
    let ext = format.extension();
    let storage_job = storage.map(|s| (dir.join(format!("storage.{ext}")), s));
    let (timelines, storage) = rayon::join(
        || {
            timelines.par_iter().try_for_each(|t| {
                let path = dir.join(format!("timeline-{}.{ext}", t.start.format("%Y%m%d")));
                super::save_in(&path, &super::render(t, format)?, mode)
            })
        },
        || match &storage_job {
            Some((path, s)) => super::save_in(path, &super::render(s, format)?, mode),
            None => Ok(()),
        },
    );
    timelines.and(storage)
}

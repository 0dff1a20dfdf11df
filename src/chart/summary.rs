//! Plan summary chart: a timeline of the planning window with one bar per pass (x = AOS,
//! height = fixed-rate volume, colour and marker shape = station, adaptive volume as a marker
//! above the bar); the daily totals as grouped bars (fixed rate summed over the stations,
//! adaptive, the network total that counts each second once, and the rain case when planned),
//! with the days the window covers only in part shaded and labelled with their hours; and, on
//! its own axis, what share of Shannon's bound over the whole band the fixed and adaptive totals
//! reach each day (the bound itself would dwarf the real volumes on a shared axis).
//!
//! A long window keeps what is shown and changes how: passes too many for bars are dots, days
//! too narrow for grouped bars have each total as a line (a partial day as a lone dot), and the
//! Shannon shares lose their markers ([`dense_passes`], [`MIN_DAY_PX_FOR_BARS`]).

use plotters::coord::Shift;
use plotters::prelude::*;
use plotters::style::text_anchor::{HPos, Pos, VPos};

use super::data::{DayTotals, SummaryChartData};
use super::style::{self, Key, MarkerShape};
use super::types::{ChartError, Plot, SUMMARY_SIZE};
use crate::timefmt::seconds_between;

const TITLE_H: u32 = 100;
const LEGEND_W: u32 = 300;
const Y_AXIS_W: u32 = 95;
/// Every panel's plot area has these margins left and right of its y axis and plot.
const MARGIN_LEFT: u32 = 10;
const MARGIN_RIGHT: u32 = 24;

/// The width of every panel's plotting area in a chart `w` pixels wide: the three panels share
/// their time axis pixel for pixel.
fn plot_width_px(w: u32) -> f64 {
    w.saturating_sub(LEGEND_W + MARGIN_LEFT + MARGIN_RIGHT + Y_AXIS_W)
        .max(1) as f64
}

impl Plot for SummaryChartData {
    const NAME: &'static str = "summary";

    fn warnings(&self) -> &[String] {
        &self.warnings
    }
    fn size(&self) -> (u32, u32) {
        SUMMARY_SIZE
    }

    fn plot<DB: DrawingBackend>(&self, root: &DrawingArea<DB, Shift>) -> Result<(), ChartError>
    where
        DB::ErrorType: 'static,
    {
        plot_summary(self, root)
    }
}

fn finite_sum(v: impl Iterator<Item = f64>) -> f64 {
    v.filter(|x| x.is_finite()).sum()
}

/// A bar narrower than this many pixels is drawn without its edge: the edge's two pixels would
/// hide its colour (a year's daily bars, a week's passes read as black).
const MIN_EDGED_BAR_PX: f64 = 5.0;

/// A bar from `x0` to `x1` up to `v`, filled, with its edge where it is wide enough
/// ([`MIN_EDGED_BAR_PX`] at `px_per_x` pixels per unit of x).
fn bar(
    (x0, x1, v): (f64, f64, f64),
    color: RGBColor,
    px_per_x: f64,
) -> impl Iterator<Item = Rectangle<(f64, f64)>> {
    let corners = [(x0, 0.0), (x1, v)];
    let edged = (x1 - x0) * px_per_x >= MIN_EDGED_BAR_PX;
    std::iter::once(Rectangle::new(corners, color.filled()))
        .chain(edged.then(|| Rectangle::new(corners, bar_edge())))
}

fn bar_edge() -> ShapeStyle {
    ShapeStyle {
        color: style::INK.to_rgba(),
        filled: false,
        stroke_width: 1,
    }
}

fn plot_summary<DB: DrawingBackend>(
    d: &SummaryChartData,
    root: &DrawingArea<DB, Shift>,
) -> Result<(), ChartError>
where
    DB::ErrorType: 'static,
{
    root.fill(&WHITE)?;
    let (w, h) = root.dim_in_pixel();
    let (title, body) = root.split_vertically(TITLE_H);
    title.draw(&Text::new(
        format!(
            "Plan summary · {} · {} to {}",
            d.satellite,
            d.start.format("%Y-%m-%d %H:%MZ"),
            d.end.format("%Y-%m-%d %H:%MZ")
        ),
        (30, 18),
        style::title_font(),
    ))?;
    title.draw(&Text::new(
        format!(
            "{}{} passes at {} station{} · every pass: fixed rate {} · adaptive {}{} · Shannon bound {}",
            d.delivered_bits
                .map(|b| format!("delivered {} (contact plan) · ", style::format_volume(b)))
                .unwrap_or_default(),
            d.passes.len(),
            d.stations.len(),
            if d.stations.len() == 1 { "" } else { "s" },
            style::format_volume(finite_sum(d.passes.iter().map(|p| p.volume_bits))),
            style::format_volume(finite_sum(d.passes.iter().map(|p| p.adaptive_volume_bits))),
            if d.days.iter().any(|t| t.network_bits.is_some()) {
                format!(
                    " · network {}",
                    style::format_volume(finite_sum(d.days.iter().filter_map(|t| t.network_bits)))
                )
            } else {
                String::new()
            },
            style::format_volume(finite_sum(d.days.iter().map(|p| p.shannon_bits))),
        ),
        (30, 60),
        style::label_font(),
    ))?;

    let x_axis_h = 62;
    let panels_h = (h - TITLE_H - x_axis_h) as f64;
    let (top, rest) = body.split_vertically((0.42 * panels_h) as u32);
    let (middle, bottom) = rest.split_vertically((0.36 * panels_h) as u32);
    timeline(d, &top, w)?;
    let days = DayAxis::new(d, plot_width_px(w), root);
    daily(d, &days, &middle, w)?;
    shannon_share(d, &days, &bottom, w, x_axis_h)
}

/// The window's length on the time axis that all three panels share, seconds from its start:
/// the window itself, or (for a window with no length) up to the last LOS.
fn window_span_s(d: &SummaryChartData) -> f64 {
    let span = seconds_between(&d.start, &d.end);
    if span.is_finite() && span > 0.0 {
        span
    } else {
        let (_, hi) = style::finite_range(
            d.passes.iter().map(|p| seconds_between(&d.start, &p.los)),
            0.0,
            3600.0,
            (0.0, 86400.0),
        );
        hi.max(3600.0)
    }
}

/// The day axis of the daily panels: each UTC day's part of the window on the same time axis as
/// the passes above (seconds from the window start), so a day's bars stand under that day's
/// passes and a day the window covers in part is as narrow as its hours.
struct DayAxis {
    span_s: f64,
    /// Each day's part of the window, seconds from its start.
    slots: Vec<(f64, f64)>,
    /// The slots' middles, where the day labels go.
    ticks: Vec<f64>,
    /// Hours of the window in each day (24 for a whole day).
    window_h: Vec<f64>,
    /// Which days are labelled ([`DayAxis::labelled`]); only they have a tick.
    placed: Vec<bool>,
    /// The labels give the year: the window's days fall in two years.
    with_year: bool,
    /// Pixels per second of the panels' plotting area.
    px_per_s: f64,
    /// The widest day is wide enough for a day's bars and markers ([`MIN_DAY_PX_FOR_BARS`]);
    /// else each total is a line.
    bars: bool,
}

/// The daily panels draw their bars and markers only where a day is at least this wide (four
/// bars of 3 px and their gaps; a marker is 11 px across); in a longer window (a quarter or a
/// year on one chart) each series is a line through the days.
const MIN_DAY_PX_FOR_BARS: f64 = 16.0;

impl DayAxis {
    /// The day axis of `d` over a plotting area `plot_px` wide, its labels measured in `area`'s
    /// tick font.
    fn new<DB: DrawingBackend>(
        d: &SummaryChartData,
        plot_px: f64,
        area: &DrawingArea<DB, Shift>,
    ) -> Self {
        let span_s = window_span_s(d);
        let mut slots: Vec<(f64, f64)> = d
            .days
            .iter()
            .map(|t| {
                let day0 = t.date.and_time(chrono::NaiveTime::MIN).and_utc();
                let day1 = day0 + chrono::Duration::days(1);
                (
                    seconds_between(&d.start, &day0.max(d.start)),
                    seconds_between(&d.start, &day1.min(d.end)),
                )
            })
            .collect();
        let window_h = slots
            .iter()
            .map(|(a, b)| ((b - a) / 3600.0).clamp(0.0, 24.0))
            .collect();
        // Days that do not lie in the window in order (no window length; only a library caller's
        // data, as a plan's days lie in its window): equal slots instead, which then no longer
        // stand under the timeline's days.
        let ordered = slots
            .iter()
            .all(|&(a, b)| a.is_finite() && b > a && a >= 0.0 && b <= span_s);
        if !ordered {
            let n = slots.len().max(1) as f64;
            for (i, slot) in slots.iter_mut().enumerate() {
                *slot = (i as f64 * span_s / n, (i + 1) as f64 * span_s / n);
            }
        }
        let with_year = crate::timefmt::needs_year(&d.start, &d.end);
        let px_per_s = plot_px / span_s;
        let widest_s = (slots.iter()).fold(0.0f64, |w, (a, b)| w.max(b - a));
        let mut axis = DayAxis {
            span_s,
            ticks: slots.iter().map(|(a, b)| (a + b) / 2.0).collect(),
            slots,
            window_h,
            placed: Vec::new(),
            with_year,
            px_per_s,
            bars: widest_s * px_per_s >= MIN_DAY_PX_FOR_BARS,
        };
        // Every label as wide as the widest possible one.
        let widest = match (with_year, axis.bars) {
            (false, _) => "Wed 12-31",
            (true, true) => "Wed 2026-12-31",
            (true, false) => "2026-12-31",
        };
        let label_px = area
            .estimate_text_size(widest, &style::tick_font())
            .map_or(80.0, |(w, _)| w as f64);
        axis.placed = axis.labelled(label_px / axis.px_per_s, 12.0 / axis.px_per_s);
        axis
    }

    /// The axis with a tick at each labelled day (a tick per day was a comb in a long window).
    fn axis(&self) -> style::TickAxis {
        let ticks = (self.ticks.iter().zip(&self.placed))
            .filter(|(_, &p)| p)
            .map(|(t, _)| *t)
            .collect();
        style::TickAxis::new(0.0, self.span_s, ticks)
    }

    /// Which days get a label: from the left, each whose label (`label_s` wide, centred on its
    /// day) starts after the last one placed ends, `gap_s` later, and stays on the axis. Whole
    /// days in a long window are so labelled every few days, and a sliver of a day at the
    /// window's edge, whose label would print over its neighbour's, is left unlabelled.
    fn labelled(&self, label_s: f64, gap_s: f64) -> Vec<bool> {
        let mut free_from = -gap_s;
        self.ticks
            .iter()
            .map(|&t| {
                let (from, to) = (t - label_s / 2.0, t + label_s / 2.0);
                let fits = from >= free_from + gap_s && from >= 0.0 && to <= self.span_s;
                if fits {
                    free_from = to;
                }
                fits
            })
            .collect()
    }

    /// The label of the day whose middle is `v`, if [`DayAxis::labelled`] placed it: weekday and
    /// date; in a window of two years with the year, and without the weekday where the days are
    /// too narrow for bars (labels every few weeks).
    fn label(&self, d: &SummaryChartData, v: f64) -> String {
        let form = match (self.with_year, self.bars) {
            (false, _) => "%a %m-%d",
            (true, true) => "%a %Y-%m-%d",
            (true, false) => "%Y-%m-%d",
        };
        match self.ticks.iter().position(|t| *t == v) {
            Some(i) if self.placed.get(i) == Some(&true) => d.days[i].date.format(form).to_string(),
            _ => String::new(),
        }
    }

    /// Whether day `i` is only partly inside the window (by more than a minute).
    fn partial(&self, i: usize) -> bool {
        self.window_h.get(i).is_some_and(|h| *h < 24.0 - 1.0 / 60.0)
    }
}

/// A pass bar is at least 1/400 of the window wide ([`timeline`]), so past about 400 passes
/// (a month of a polar orbiter at three stations) the bars overlap into one block under their
/// markers: then each pass is a dot at its fixed-rate volume, which shows each station's spread.
fn dense_passes(d: &SummaryChartData, w: u32) -> bool {
    d.passes.len() as f64 > plot_width_px(w) / 3.0
}

fn timeline<DB: DrawingBackend>(
    d: &SummaryChartData,
    area: &DrawingArea<DB, Shift>,
    w: u32,
) -> Result<(), ChartError>
where
    DB::ErrorType: 'static,
{
    let (plot, legend) = area.split_horizontally(w - LEGEND_W);
    let span = window_span_s(d);
    let (step, ticks) = style::time_ticks(&d.start, 0.0, span, 10);
    let start = d.start;
    let multi_day = span > 86400.0;
    let fmt = move |v: &f64| style::time_label(&start, *v, step, multi_day);
    let max_bits = d
        .passes
        .iter()
        .flat_map(|p| [p.volume_bits, p.adaptive_volume_bits])
        .filter(|v| v.is_finite())
        .fold(0.0f64, f64::max);
    let (div, unit) = style::volume_unit(max_bits);
    let y_hi = style::zero_based_max([max_bits / div], 0.12, 1.0);
    let mut chart = ChartBuilder::on(&plot)
        .margin_top(14)
        .margin_left(MARGIN_LEFT)
        .margin_right(MARGIN_RIGHT)
        .x_label_area_size(58)
        .y_label_area_size(Y_AXIS_W)
        .build_cartesian_2d(style::TickAxis::new(0.0, span, ticks), 0.0..y_hi)?;
    chart
        .configure_mesh()
        .bold_line_style(style::GRID)
        .light_line_style(TRANSPARENT)
        .x_label_formatter(&fmt)
        .y_label_formatter(&style::num_label)
        .x_desc("AOS time (UTC)")
        .y_desc(format!("Volume per pass ({unit})"))
        .y_labels(6)
        .axis_desc_style(style::label_font())
        .label_style(style::tick_font())
        .draw()?;

    // A bar is as wide as the pass, but at least 1/400 of the window so it stays visible.
    let min_w = span / 400.0;
    let area_px = chart.plotting_area().strip_coord_spec();
    let px_per_s = chart.plotting_area().dim_in_pixel().0 as f64 / span;
    let dense = dense_passes(d, w);
    let mut markers = Vec::with_capacity(d.passes.len());
    let mut dots = Vec::new();
    for p in &d.passes {
        let x0 = seconds_between(&d.start, &p.aos);
        let x1 = seconds_between(&d.start, &p.los).max(x0 + min_w);
        let v = p.volume_bits / div;
        if !(x0.is_finite() && x1.is_finite()) {
            continue;
        }
        let color = style::SERIES[p.station_index % style::SERIES.len()];
        if dense {
            // at its AOS, as the axis says, in its station's shape
            if v.is_finite() {
                dots.push((p.station_index, (x0, v)));
            }
            continue;
        }
        if v.is_finite() && v > 0.0 {
            chart.draw_series(bar((x0, x1, v), color, px_per_s))?;
        }
        let a = p.adaptive_volume_bits / div;
        if a.is_finite() {
            markers.push((p.station_index, ((x0 + x1) / 2.0, a)));
        }
    }
    for (i, at) in dots {
        let px = style::rel(&area_px, chart.backend_coord(&at));
        let color = style::SERIES[i % style::SERIES.len()];
        style::draw_dot(&area_px, MarkerShape::series(i), px, color)?;
    }
    for (i, at) in markers {
        let px = style::rel(&area_px, chart.backend_coord(&at));
        let color = style::SERIES[i % style::SERIES.len()];
        style::draw_marker(&area_px, MarkerShape::series(i), px, 4, color)?;
    }
    if d.passes.is_empty() {
        chart.draw_series(std::iter::once(Text::new(
            "no passes in the window".to_string(),
            (span / 2.0, y_hi / 2.0),
            style::title_font().pos(Pos::new(HPos::Center, VPos::Center)),
        )))?;
    }

    let mut keys: Vec<(Key, String)> = d
        .stations
        .iter()
        .enumerate()
        .map(|(i, s)| {
            let c = style::SERIES[i % style::SERIES.len()];
            (Key::BandMarker(c, MarkerShape::series(i)), s.clone())
        })
        .collect();
    let how = match dense {
        true => {
            "dot: fixed-rate volume\nat AOS, in the station's\nshape (too many passes\nfor bars; adaptive\nvolume not drawn)"
        }
        false => "bar: fixed-rate volume\nmarker: adaptive volume",
    };
    keys.push((Key::Blank, how.into()));
    style::draw_legend(&legend, Some("Station"), &keys)
}

fn daily<DB: DrawingBackend>(
    d: &SummaryChartData,
    axis: &DayAxis,
    area: &DrawingArea<DB, Shift>,
    w: u32,
) -> Result<(), ChartError>
where
    DB::ErrorType: 'static,
{
    let (plot, legend) = area.split_horizontally(w - LEGEND_W);
    let has_network = d.days.iter().any(|t| t.network_bits.is_some());
    let has_rain = d.days.iter().any(|t| t.rain_bits.is_some());
    type Pick = fn(&DayTotals) -> Option<f64>;
    let mut kinds: Vec<(RGBColor, String, Pick)> = vec![
        (style::NAVY, "fixed rate (sum\nover stations)".into(), |t| {
            Some(t.fixed_bits)
        }),
        (style::AMBER, "adaptive rate".into(), |t| {
            Some(t.adaptive_bits)
        }),
    ];
    if has_network {
        kinds.push((
            style::SKY,
            "network: each second\nonce, best station".into(),
            |t| t.network_bits,
        ));
    }
    if has_rain {
        let pct = d
            .rain_exceedance_percent
            .map(|p| format!(" ({p} %)"))
            .unwrap_or_default();
        kinds.push((style::PLUM, format!("fixed rate, rain\ncase{pct}"), |t| {
            t.rain_bits
        }));
    }
    let max_bits = d
        .days
        .iter()
        .flat_map(|t| kinds.iter().filter_map(|k| (k.2)(t)))
        .filter(|v| v.is_finite())
        .fold(0.0f64, f64::max);
    let (div, unit) = style::volume_unit(max_bits);
    let y_hi = style::zero_based_max([max_bits / div], 0.18, 1.0);
    let mut chart = ChartBuilder::on(&plot)
        .margin_top(20)
        .margin_left(MARGIN_LEFT)
        .margin_right(MARGIN_RIGHT)
        .x_label_area_size(8)
        .y_label_area_size(Y_AXIS_W)
        .build_cartesian_2d(axis.axis(), 0.0..y_hi)?;
    chart
        .configure_mesh()
        .bold_line_style(style::GRID)
        .light_line_style(TRANSPARENT)
        .disable_x_mesh()
        .x_label_formatter(&|_| String::new())
        .y_label_formatter(&style::num_label)
        .y_desc(format!("Volume per day ({unit})"))
        .y_labels(5)
        .axis_desc_style(style::label_font())
        .label_style(style::tick_font())
        .draw()?;
    // Days the window covers only in part: shaded, with their hours, so a short day does not
    // read as a drop.
    let mut any_partial = false;
    let px_per_s = chart.plotting_area().dim_in_pixel().0 as f64 / axis.span_s;
    let note = style::note_font(style::INK);
    for i in (0..d.days.len()).filter(|&i| axis.partial(i)) {
        any_partial = true;
        let (a, b) = axis.slots[i];
        chart.draw_series(std::iter::once(Rectangle::new(
            [(a, 0.0), (b, y_hi)],
            style::TERRAIN.mix(0.45).filled(),
        )))?;
        let slot_px = (b - a) * px_per_s;
        // The longest text that fits the day's slot (the legend explains the shading).
        let hours = axis.window_h[i];
        let texts = [
            format!("partial day: {hours:.1} h"),
            format!("{hours:.0} h"),
        ];
        let fits = |t: &String| {
            plot.estimate_text_size(t, &note)
                .map(|(tw, _)| (tw as f64) < slot_px - 4.0)
                .unwrap_or(false)
        };
        if let Some(text) = texts.into_iter().find(fits) {
            chart.draw_series(std::iter::once(Text::new(
                text,
                ((a + b) / 2.0, y_hi),
                note.clone().pos(Pos::new(HPos::Center, VPos::Top)),
            )))?;
        }
    }
    let day_lines = !axis.bars;
    if day_lines {
        // Days too narrow for grouped bars: a line per kind through the days' middles, broken
        // at a day without the total, and a day the window covers in part as a lone dot (joined
        // to its whole neighbours it read as a drop).
        let gap = (f64::NAN, f64::NAN);
        for (color, _, pick) in &kinds {
            let pts: Vec<(f64, f64)> = (0..d.days.len())
                .flat_map(|i| {
                    let p = (
                        axis.ticks[i],
                        pick(&d.days[i]).map_or(f64::NAN, |v| v / div),
                    );
                    match axis.partial(i) {
                        true => vec![gap, p, gap],
                        false => vec![p],
                    }
                })
                .collect();
            style::stroke_line!(chart, draw_series, pts, day_stroke(*color));
        }
    }
    for (t, &(a, b)) in d.days.iter().zip(&axis.slots).filter(|_| !day_lines) {
        let bar_w = 0.76 * (b - a) / kinds.len() as f64;
        for (k, (color, _, pick)) in kinds.iter().enumerate() {
            let Some(v) = pick(t).map(|v| v / div) else {
                continue;
            };
            if !v.is_finite() || v <= 0.0 {
                continue;
            }
            let x0 = a + 0.12 * (b - a) + k as f64 * bar_w;
            chart.draw_series(bar((x0, x0 + bar_w, v), *color, px_per_s))?;
        }
    }
    if d.days.is_empty() {
        chart.draw_series(std::iter::once(Text::new(
            "no daily totals".to_string(),
            (axis.span_s / 2.0, y_hi / 2.0),
            style::title_font().pos(Pos::new(HPos::Center, VPos::Center)),
        )))?;
    }
    let key = |c: RGBColor| match day_lines {
        true => Key::Line(day_stroke(c)),
        false => Key::Band(c, 1.0),
    };
    let mut keys: Vec<(Key, String)> = kinds.iter().map(|(c, l, _)| (key(*c), l.clone())).collect();
    if any_partial {
        keys.push((
            Key::Band(style::TERRAIN, 0.45),
            "day the window\ncovers in part".into(),
        ));
    }
    style::draw_legend_spaced(&legend, Some("Daily total"), &keys, 4)
}

/// The line of a daily kind drawn in `color` where the days are too narrow for bars: the dash
/// pattern of that colour's series, so the lines differ in more than their colour.
fn day_stroke(color: RGBColor) -> style::Stroke {
    let i = style::SERIES.iter().position(|c| *c == color).unwrap_or(0);
    style::Stroke::series(i, 2)
}

/// Each day's fixed and adaptive totals as a share of Shannon's bound over the whole band
/// (a percentage, so the bound does not dwarf the volumes above).
fn shannon_share<DB: DrawingBackend>(
    d: &SummaryChartData,
    axis: &DayAxis,
    area: &DrawingArea<DB, Shift>,
    w: u32,
    x_axis_h: u32,
) -> Result<(), ChartError>
where
    DB::ErrorType: 'static,
{
    let (plot, legend) = area.split_horizontally(w - LEGEND_W);
    let share = |v: f64, b: f64| {
        if b > 0.0 && v.is_finite() && b.is_finite() {
            100.0 * v / b
        } else {
            f64::NAN
        }
    };
    let fixed: Vec<(f64, f64)> = d
        .days
        .iter()
        .zip(&axis.ticks)
        .map(|(t, x)| (*x, share(t.fixed_bits, t.shannon_bits)))
        .collect();
    let adaptive: Vec<(f64, f64)> = d
        .days
        .iter()
        .zip(&axis.ticks)
        .map(|(t, x)| (*x, share(t.adaptive_bits, t.shannon_bits)))
        .collect();
    let y_hi = style::zero_based_max(fixed.iter().chain(&adaptive).map(|p| p.1), 0.25, 5.0);
    let mut chart = ChartBuilder::on(&plot)
        .margin_top(10)
        .margin_left(MARGIN_LEFT)
        .margin_right(MARGIN_RIGHT)
        .x_label_area_size(x_axis_h)
        .y_label_area_size(Y_AXIS_W)
        .build_cartesian_2d(axis.axis(), 0.0..y_hi)?;
    let fmt = |v: &f64| axis.label(d, *v);
    chart
        .configure_mesh()
        .bold_line_style(style::GRID)
        .light_line_style(TRANSPARENT)
        .disable_x_mesh()
        .x_label_formatter(&fmt)
        .y_label_formatter(&style::num_label)
        .x_desc("UTC day")
        .y_desc("% of Shannon")
        .y_labels(4)
        .axis_desc_style(style::label_font())
        .label_style(style::tick_font())
        .draw()?;
    let area_px = chart.plotting_area().strip_coord_spec();
    let mut keys = Vec::new();
    for (k, (pts, label)) in [(fixed, "fixed rate"), (adaptive, "adaptive rate")]
        .into_iter()
        .enumerate()
    {
        let s = style::Stroke::series(k, 3);
        style::stroke_line!(chart, draw_series, pts.clone(), s);
        // a marker per day where the days are wide enough to tell them apart
        if !axis.bars {
            keys.push((Key::Line(s), label.to_string()));
            continue;
        }
        for p in pts.iter().filter(|p| p.1.is_finite()) {
            let px = style::rel(&area_px, chart.backend_coord(p));
            style::draw_marker(&area_px, MarkerShape::series(k), px, 5, s.color)?;
        }
        keys.push((
            Key::LineMarker(s, MarkerShape::series(k)),
            label.to_string(),
        ));
    }
    style::draw_legend_spaced(&legend, Some("Share of Shannon's bound"), &keys, 4)
}

//! Plan summary chart: a timeline of the planning window with one bar per pass (x = AOS,
//! height = fixed-rate volume, colour and marker shape = station, adaptive volume as a marker
//! above the bar), and a second panel with daily totals (fixed, adaptive, Shannon bound) as
//! grouped bars.

use plotters::coord::Shift;
use plotters::prelude::*;
use plotters::style::text_anchor::{HPos, Pos, VPos};

use super::data::SummaryChartData;
use super::style::{self, Key, MarkerShape};
use super::types::{ChartError, Plot, SUMMARY_SIZE};
use crate::timefmt::seconds_between;

const TITLE_H: u32 = 100;
const LEGEND_W: u32 = 300;
const Y_AXIS_W: u32 = 95;

impl Plot for SummaryChartData {
    const NAME: &'static str = "summary";

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
            "{} passes at {} station{} · fixed rate {} · adaptive {} · Shannon bound {}",
            d.passes.len(),
            d.stations.len(),
            if d.stations.len() == 1 { "" } else { "s" },
            style::format_volume(finite_sum(d.passes.iter().map(|p| p.volume_bits))),
            style::format_volume(finite_sum(d.passes.iter().map(|p| p.adaptive_volume_bits))),
            style::format_volume(finite_sum(d.days.iter().map(|p| p.shannon_bits))),
        ),
        (30, 60),
        style::label_font(),
    ))?;

    let x_axis_h = 62;
    let panel_h = (h - TITLE_H - x_axis_h) / 2 + 40;
    let (top, bottom) = body.split_vertically(panel_h);
    timeline(d, &top, w)?;
    daily(d, &bottom, w, x_axis_h)
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
    let span = seconds_between(&d.start, &d.end);
    let span = if span.is_finite() && span > 0.0 {
        span
    } else {
        // fall back to the passes themselves
        let (_, hi) = style::finite_range(
            d.passes.iter().map(|p| seconds_between(&d.start, &p.los)),
            0.0,
            3600.0,
            (0.0, 86400.0),
        );
        hi.max(3600.0)
    };
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
        .margin_left(10)
        .margin_right(24)
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
    let mut markers = Vec::with_capacity(d.passes.len());
    for p in &d.passes {
        let x0 = seconds_between(&d.start, &p.aos);
        let x1 = seconds_between(&d.start, &p.los).max(x0 + min_w);
        let v = p.volume_bits / div;
        if !(x0.is_finite() && x1.is_finite()) {
            continue;
        }
        let color = style::SERIES[p.station_index % style::SERIES.len()];
        if v.is_finite() && v > 0.0 {
            chart.draw_series([
                Rectangle::new([(x0, 0.0), (x1, v)], color.filled()),
                Rectangle::new([(x0, 0.0), (x1, v)], bar_edge()),
            ])?;
        }
        let a = p.adaptive_volume_bits / div;
        if a.is_finite() {
            markers.push((p.station_index, ((x0 + x1) / 2.0, a)));
        }
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
            (
                Key::BandMarker(
                    style::SERIES[i % style::SERIES.len()],
                    MarkerShape::series(i),
                ),
                s.clone(),
            )
        })
        .collect();
    keys.push((
        Key::Blank,
        "bar: fixed-rate volume\nmarker: adaptive volume".into(),
    ));
    style::draw_legend(&legend, Some("Station"), &keys)
}

fn daily<DB: DrawingBackend>(
    d: &SummaryChartData,
    area: &DrawingArea<DB, Shift>,
    w: u32,
    x_axis_h: u32,
) -> Result<(), ChartError>
where
    DB::ErrorType: 'static,
{
    let (plot, legend) = area.split_horizontally(w - LEGEND_W);
    let n = d.days.len().max(1);
    let max_bits = d
        .days
        .iter()
        .flat_map(|t| [t.fixed_bits, t.adaptive_bits, t.shannon_bits])
        .filter(|v| v.is_finite())
        .fold(0.0f64, f64::max);
    let (div, unit) = style::volume_unit(max_bits);
    let y_hi = style::zero_based_max([max_bits / div], 0.12, 1.0);
    let ticks: Vec<f64> = (0..d.days.len()).map(|i| i as f64 + 0.5).collect();
    let days = &d.days;
    // Label only as many days as fit (about 14).
    let every = d.days.len().div_ceil(14).max(1);
    let fmt = move |v: &f64| {
        let i = v.floor();
        if i < 0.0 || (i as usize) >= days.len() || (i as usize) % every != 0 {
            String::new()
        } else {
            days[i as usize].date.format("%a %m-%d").to_string()
        }
    };
    let mut chart = ChartBuilder::on(&plot)
        .margin_top(20)
        .margin_left(10)
        .margin_right(24)
        .x_label_area_size(x_axis_h)
        .y_label_area_size(Y_AXIS_W)
        .build_cartesian_2d(style::TickAxis::new(0.0, n as f64, ticks), 0.0..y_hi)?;
    chart
        .configure_mesh()
        .bold_line_style(style::GRID)
        .light_line_style(TRANSPARENT)
        .disable_x_mesh()
        .x_label_formatter(&fmt)
        .y_label_formatter(&style::num_label)
        .x_desc("UTC day")
        .y_desc(format!("Volume per day ({unit})"))
        .y_labels(6)
        .axis_desc_style(style::label_font())
        .label_style(style::tick_font())
        .draw()?;
    let kinds = [
        (style::NAVY, "fixed rate"),
        (style::AMBER, "adaptive rate"),
        (style::SKY, "Shannon bound"),
    ];
    for (i, t) in d.days.iter().enumerate() {
        for (k, v) in [t.fixed_bits, t.adaptive_bits, t.shannon_bits]
            .into_iter()
            .enumerate()
        {
            let v = v / div;
            if !v.is_finite() || v <= 0.0 {
                continue;
            }
            let x0 = i as f64 + 0.12 + k as f64 * 0.25;
            let x1 = x0 + 0.25;
            chart.draw_series([
                Rectangle::new([(x0, 0.0), (x1, v)], kinds[k].0.filled()),
                Rectangle::new([(x0, 0.0), (x1, v)], bar_edge()),
            ])?;
        }
    }
    if d.days.is_empty() {
        chart.draw_series(std::iter::once(Text::new(
            "no daily totals".to_string(),
            (0.5, y_hi / 2.0),
            style::title_font().pos(Pos::new(HPos::Center, VPos::Center)),
        )))?;
    }
    let keys: Vec<(Key, String)> = kinds
        .iter()
        .map(|(c, l)| (Key::Band(*c, 1.0), l.to_string()))
        .collect();
    style::draw_legend(&legend, Some("Daily total"), &keys)
}

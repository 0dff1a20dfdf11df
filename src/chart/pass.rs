//! Pass chart: three stacked panels on a shared UTC time axis from AOS to LOS.
//!
//! (a) elevation (deg) and slant range (km, right axis); (b) Eb/N0 (dB) against the level where
//! the margin is 0 and the required-margin band above it, the adaptive rate as a step line (right
//! axis), and the instants the chosen rate starts and stops closing; (c) system noise temperature
//! (K) and atmospheric loss (dB, right axis). Each panel has its legend in a column to its right.

use plotters::coord::Shift;
use plotters::prelude::*;
use plotters::style::text_anchor::{HPos, Pos, VPos};

use super::data::{PassChartData, PassChartSample};
use super::style::{self, stroke_line, Key, Stroke};
use super::types::{ChartError, Plot, PASS_SIZE};
use crate::timefmt::seconds_between;

const TITLE_H: u32 = 100;
const LEGEND_W: u32 = 300;
const Y_AXIS_W: u32 = 95;

impl Plot for PassChartData {
    const NAME: &'static str = "pass";

    fn size(&self) -> (u32, u32) {
        PASS_SIZE
    }

    fn plot<DB: DrawingBackend>(&self, root: &DrawingArea<DB, Shift>) -> Result<(), ChartError>
    where
        DB::ErrorType: 'static,
    {
        plot_pass(self, root)
    }
}

fn title_lines(d: &PassChartData) -> (String, String) {
    let line1 = format!(
        "{} over {} · pass {} · {}",
        d.satellite,
        d.station,
        d.pass_number,
        d.aos.format("%Y-%m-%d")
    );
    let rate = match (d.rate_bps, &d.scheme) {
        (Some(r), Some(s)) => format!("{} {s}", style::format_rate(r)),
        (Some(r), None) => style::format_rate(r),
        (None, _) => "no rate closes".to_string(),
    };
    let line2 = format!(
        "max elevation {} · {rate} · volume {} (adaptive {})",
        style::deg_or_na(d.max_elevation_deg),
        style::format_volume(d.volume_bits),
        style::format_volume(d.adaptive_volume_bits),
    );
    (line1, line2)
}

fn plot_pass<DB: DrawingBackend>(
    d: &PassChartData,
    root: &DrawingArea<DB, Shift>,
) -> Result<(), ChartError>
where
    DB::ErrorType: 'static,
{
    root.fill(&WHITE)?;
    let (w, h) = root.dim_in_pixel();
    let (title, body) = root.split_vertically(TITLE_H);
    let (l1, l2) = title_lines(d);
    title.draw(&Text::new(l1, (30, 18), style::title_font()))?;
    title.draw(&Text::new(l2, (30, 60), style::label_font()))?;

    if d.samples.is_empty() {
        body.draw(&Text::new(
            "no samples for this pass – nothing to plot".to_string(),
            (w as i32 / 2, (h - TITLE_H) as i32 / 2),
            style::title_font().pos(Pos::new(HPos::Center, VPos::Center)),
        ))?;
        return Ok(());
    }

    // Shared time axis, seconds since AOS.
    let dur_s = seconds_between(&d.aos, &d.los);
    let (t_lo, t_hi) = {
        let (lo, hi) = style::finite_range(d.samples.iter().map(|s| s.t_s), 0.0, 0.0, (0.0, 0.0));
        let lo = lo.min(0.0);
        let hi = if dur_s.is_finite() { hi.max(dur_s) } else { hi };
        if hi - lo < 60.0 {
            (lo, lo + 60.0)
        } else {
            (lo, hi)
        }
    };
    let (step_s, ticks) = style::time_ticks(&d.aos, t_lo, t_hi, 12);
    let aos = d.aos;
    let fmt_t = move |v: &f64| style::time_label(&aos, *v, step_s, false);

    let body_h = h - TITLE_H;
    let bottom_axis_h = 62;
    let panel_h = (body_h - bottom_axis_h) / 3;
    let (pa, rest) = body.split_vertically(panel_h);
    let (pb, pc) = rest.split_vertically(panel_h);

    let tca_s = seconds_between(&d.aos, &d.tca);
    let ctx = Ctx {
        t_lo,
        t_hi,
        ticks: &ticks,
        fmt_t: &fmt_t,
        tca_s,
    };
    panel_geometry(d, &pa, &ctx)?;
    panel_link(d, &pb, &ctx)?;
    panel_noise(d, &pc, &ctx, bottom_axis_h)?;
    Ok(())
}

struct Ctx<'a> {
    t_lo: f64,
    t_hi: f64,
    ticks: &'a [f64],
    fmt_t: &'a dyn Fn(&f64) -> String,
    tca_s: f64,
}

/// Split a panel into chart and legend column.
fn split_legend<DB: DrawingBackend>(
    area: &DrawingArea<DB, Shift>,
) -> (DrawingArea<DB, Shift>, DrawingArea<DB, Shift>) {
    let (w, _) = area.dim_in_pixel();
    area.split_horizontally(w - LEGEND_W)
}

/// A vertical marker line over the full height of a chart, in primary coordinates.
fn vline(t: f64, y: (f64, f64)) -> Vec<(f64, f64)> {
    vec![(t, y.0), (t, y.1)]
}

const TCA_STROKE: Stroke = Stroke::dashed(style::SLATE, 1, 4, 4);

fn panel_geometry<DB: DrawingBackend>(
    d: &PassChartData,
    area: &DrawingArea<DB, Shift>,
    c: &Ctx,
) -> Result<(), ChartError>
where
    DB::ErrorType: 'static,
{
    let (plot, legend) = split_legend(area);
    let el_max =
        style::zero_based_max(d.samples.iter().map(|s| s.elevation_deg), 0.08, 10.0).min(95.0);
    let el_min = d
        .samples
        .iter()
        .map(|s| s.elevation_deg)
        .filter(|v| v.is_finite())
        .fold(0.0f64, f64::min);
    let (r_lo, r_hi) = style::finite_range(
        d.samples.iter().map(|s| s.range_km),
        0.08,
        100.0,
        (0.0, 3000.0),
    );
    let mut chart = ChartBuilder::on(&plot)
        .margin_top(14)
        .margin_left(10)
        .x_label_area_size(8)
        .y_label_area_size(Y_AXIS_W)
        .right_y_label_area_size(Y_AXIS_W)
        .build_cartesian_2d(
            style::TickAxis::new(c.t_lo, c.t_hi, c.ticks.to_vec()),
            el_min..el_max,
        )?
        .set_secondary_coord(c.t_lo..c.t_hi, r_lo.max(0.0)..r_hi);
    chart
        .configure_mesh()
        .bold_line_style(style::GRID)
        .light_line_style(TRANSPARENT)
        .y_label_formatter(&style::num_label)
        .x_label_formatter(&|_| String::new())
        .y_desc("Elevation (deg)")
        .y_labels(6)
        .axis_desc_style(style::label_font())
        .label_style(style::tick_font())
        .draw()?;
    chart
        .configure_secondary_axes()
        .y_label_formatter(&style::num_label)
        .y_desc("Slant range (km)")
        .y_labels(6)
        .axis_desc_style(style::label_font())
        .label_style(style::tick_font())
        .draw()?;

    let tca = TCA_STROKE;
    stroke_line!(chart, draw_series, vline(c.tca_s, (el_min, el_max)), tca);
    let el = Stroke::series(0, 3);
    stroke_line!(
        chart,
        draw_series,
        d.samples.iter().map(|s| (s.t_s, s.elevation_deg)).collect(),
        el
    );
    let rg = Stroke::series(1, 3);
    stroke_line!(
        chart,
        draw_secondary_series,
        d.samples.iter().map(|s| (s.t_s, s.range_km)).collect(),
        rg
    );
    // AOS / TCA / LOS labels along the top of the panel.
    let top = el_max;
    let aos_t = 0.0f64.max(c.t_lo);
    let los_t = seconds_between(&d.aos, &d.los).min(c.t_hi);
    let f = style::note_font(style::INK);
    let span = c.t_hi - c.t_lo;
    if los_t - aos_t < 0.3 * span {
        // too short to label both ends apart
        chart.draw_series(std::iter::once(Text::new(
            format!(
                " AOS {} · LOS {}",
                d.aos.format("%H:%M:%S"),
                d.los.format("%H:%M:%S")
            ),
            (aos_t, top),
            f.clone().pos(Pos::new(HPos::Left, VPos::Top)),
        )))?;
    } else {
        chart.draw_series([
            Text::new(
                format!(" AOS {}", d.aos.format("%H:%M:%S")),
                (aos_t, top),
                f.clone().pos(Pos::new(HPos::Left, VPos::Top)),
            ),
            Text::new(
                format!("LOS {} ", d.los.format("%H:%M:%S")),
                (los_t, top),
                f.clone().pos(Pos::new(HPos::Right, VPos::Top)),
            ),
        ])?;
    }
    if (c.t_lo..=c.t_hi).contains(&c.tca_s) {
        chart.draw_series(std::iter::once(Text::new(
            format!("TCA {}", d.tca.format("%H:%M:%S")),
            (c.tca_s.max(c.t_lo + 0.08 * span), top),
            f.pos(Pos::new(HPos::Center, VPos::Bottom)),
        )))?;
    }

    style::draw_legend(
        &legend,
        None,
        &[
            (Key::Line(el), "elevation (left)".into()),
            (Key::Line(rg), "slant range (right)".into()),
            (Key::Line(tca), "closest approach".into()),
        ],
    )
}

fn panel_link<DB: DrawingBackend>(
    d: &PassChartData,
    area: &DrawingArea<DB, Shift>,
    c: &Ctx,
) -> Result<(), ChartError>
where
    DB::ErrorType: 'static,
{
    let (plot, legend) = split_legend(area);
    let req = d.required_ebn0_db.filter(|v| v.is_finite());
    let margin = if d.required_margin_db.is_finite() {
        d.required_margin_db
    } else {
        0.0
    };
    let (y_lo, y_hi) = style::finite_range(
        d.samples
            .iter()
            .map(|s| s.ebn0_db)
            .chain(req)
            .chain(req.map(|r| r + margin)),
        0.10,
        3.0,
        (0.0, 10.0),
    );
    let max_rate = d
        .samples
        .iter()
        .filter_map(|s| s.adaptive_rate_bps)
        .filter(|v| v.is_finite())
        .fold(0.0f64, f64::max);
    let (rate_div, rate_unit) = if max_rate >= 1e6 {
        (1e6, "Mbit/s")
    } else {
        (1e3, "kbit/s")
    };
    let rate_hi = style::zero_based_max([max_rate / rate_div], 0.12, 1.0);

    let mut chart = ChartBuilder::on(&plot)
        .margin_top(30)
        .margin_left(10)
        .x_label_area_size(8)
        .y_label_area_size(Y_AXIS_W)
        .right_y_label_area_size(Y_AXIS_W)
        .build_cartesian_2d(
            style::TickAxis::new(c.t_lo, c.t_hi, c.ticks.to_vec()),
            y_lo..y_hi,
        )?
        .set_secondary_coord(c.t_lo..c.t_hi, 0.0..rate_hi);
    chart
        .configure_mesh()
        .bold_line_style(style::GRID)
        .light_line_style(TRANSPARENT)
        .y_label_formatter(&style::num_label)
        .x_label_formatter(&|_| String::new())
        .y_desc("Eb/N0 (dB)")
        .y_labels(6)
        .axis_desc_style(style::label_font())
        .label_style(style::tick_font())
        .draw()?;
    chart
        .configure_secondary_axes()
        .y_label_formatter(&style::num_label)
        .y_desc(format!("Adaptive rate ({rate_unit})"))
        .y_labels(6)
        .axis_desc_style(style::label_font())
        .label_style(style::tick_font())
        .draw()?;

    let mut keys: Vec<(Key, String)> = Vec::new();
    let band_color = style::SKY;
    let req_stroke = Stroke::solid(style::PLUM, 2);
    if let Some(r) = req {
        if margin > 0.0 {
            chart.draw_series(std::iter::once(Rectangle::new(
                [(c.t_lo, r), (c.t_hi, r + margin)],
                band_color.mix(0.35).filled(),
            )))?;
            keys.push((
                Key::Band(band_color, 0.35),
                format!("required margin\n({margin:.1} dB above margin 0)"),
            ));
        }
        stroke_line!(
            chart,
            draw_series,
            vec![(c.t_lo, r), (c.t_hi, r)],
            req_stroke
        );
        keys.push((Key::Line(req_stroke), format!("margin 0: Eb/N0 {r:.1} dB")));
    }

    if (c.t_lo..=c.t_hi).contains(&c.tca_s) {
        stroke_line!(chart, draw_series, vline(c.tca_s, (y_lo, y_hi)), TCA_STROKE);
    }
    let eb = Stroke::series(0, 3);
    stroke_line!(
        chart,
        draw_series,
        d.samples.iter().map(|s| (s.t_s, s.ebn0_db)).collect(),
        eb
    );
    let eb_label = match d.rate_bps {
        Some(r) => format!("Eb/N0 at {}", style::format_rate(r)),
        None => "Eb/N0 at lowest rate".to_string(),
    };
    keys.insert(0, (Key::Line(eb), eb_label));

    // Adaptive rate as a step line: each sample's rate holds until the next sample.
    let mut steps = Vec::with_capacity(2 * d.samples.len());
    for (i, s) in d.samples.iter().enumerate() {
        let r = s.adaptive_rate_bps.filter(|v| v.is_finite()).unwrap_or(0.0) / rate_div;
        let t_next = d.samples.get(i + 1).map(|n| n.t_s).unwrap_or(s.t_s);
        steps.push((s.t_s, r));
        if t_next != s.t_s {
            steps.push((t_next, r));
        }
    }
    let ad = Stroke::dashed(style::AMBER, 3, 12, 5);
    stroke_line!(chart, draw_secondary_series, steps, ad);
    keys.push((Key::Line(ad), "adaptive rate (right)".into()));

    // Instants where the chosen rate starts and stops closing.
    let mark = Stroke::solid(style::INK, 2);
    let f = style::note_font(style::INK);
    let mut marked = false;
    let span = c.t_hi - c.t_lo;
    let in_range = |t: f64| t.is_finite() && t >= c.t_lo && t <= c.t_hi;
    let from_s = d
        .closes_from
        .map(|t| seconds_between(&d.aos, &t))
        .filter(|t| in_range(*t));
    let until_s = d
        .closes_until
        .map(|t| seconds_between(&d.aos, &t))
        .filter(|t| in_range(*t));
    // Label beside its line: "from" prefers the right side, "until" the left, each flipping
    // near the panel edge so it is never cut off. When the two lines are close, the "until"
    // label moves to a second row inside the panel.
    let label_pos = |ts: f64, prefer_right: bool, inside: bool| {
        let right = if prefer_right {
            ts < c.t_lo + 0.7 * span
        } else {
            ts < c.t_lo + 0.3 * span
        };
        let v = if inside { VPos::Top } else { VPos::Bottom };
        (
            right,
            Pos::new(if right { HPos::Left } else { HPos::Right }, v),
        )
    };
    let crowded = matches!((from_s, until_s), (Some(a), Some(b)) if (b - a).abs() < 0.35 * span);
    for (ts, t, what, prefer_right, inside) in [
        (from_s, d.closes_from, "closes from", true, false),
        (until_s, d.closes_until, "closes until", crowded, crowded),
    ] {
        let (Some(ts), Some(t)) = (ts, t) else {
            continue;
        };
        stroke_line!(chart, draw_series, vec![(ts, y_lo), (ts, y_hi)], mark);
        let (right, pos) = label_pos(ts, prefer_right, inside);
        let text = if right {
            format!(" {what} {}", t.format("%H:%M:%S"))
        } else {
            format!("{what} {} ", t.format("%H:%M:%S"))
        };
        chart.draw_series(std::iter::once(Text::new(
            text,
            (ts, y_hi),
            f.clone().pos(pos),
        )))?;
        marked = true;
    }
    if marked {
        keys.push((
            Key::Line(mark),
            "chosen rate starts /\nstops closing".into(),
        ));
    } else {
        let msg = if d.rate_bps.is_none() {
            "no ladder rate closes on this pass"
        } else if d.closes_from.is_some() || d.closes_until.is_some() {
            "closing instants fall outside AOS–LOS"
        } else {
            "chosen rate: no closing instants given"
        };
        chart.draw_series(std::iter::once(Text::new(
            msg.to_string(),
            ((c.t_lo + c.t_hi) / 2.0, y_hi),
            style::label_font()
                .color(&style::PLUM)
                .pos(Pos::new(HPos::Center, VPos::Bottom)),
        )))?;
    }

    style::draw_legend(&legend, None, &keys)
}

fn panel_noise<DB: DrawingBackend>(
    d: &PassChartData,
    area: &DrawingArea<DB, Shift>,
    c: &Ctx,
    x_axis_h: u32,
) -> Result<(), ChartError>
where
    DB::ErrorType: 'static,
{
    let (plot, legend) = split_legend(area);
    // From 0 K, so the terms below Tsys show on the same axis.
    let (_, k_hi) = style::finite_range(
        d.samples.iter().map(|s| s.system_temperature_k),
        0.10,
        10.0,
        (0.0, 300.0),
    );
    let k_lo = 0.0f64;
    let (a_lo, a_hi) = style::finite_range(
        d.samples.iter().map(|s| s.atmospheric_loss_db),
        0.10,
        0.5,
        (0.0, 1.0),
    );
    let mut chart = ChartBuilder::on(&plot)
        .margin_top(14)
        .margin_left(10)
        .x_label_area_size(x_axis_h)
        .y_label_area_size(Y_AXIS_W)
        .right_y_label_area_size(Y_AXIS_W)
        .build_cartesian_2d(
            style::TickAxis::new(c.t_lo, c.t_hi, c.ticks.to_vec()),
            k_lo.max(0.0)..k_hi,
        )?
        .set_secondary_coord(c.t_lo..c.t_hi, a_lo.max(0.0)..a_hi);
    chart
        .configure_mesh()
        .bold_line_style(style::GRID)
        .light_line_style(TRANSPARENT)
        .y_label_formatter(&style::num_label)
        .x_label_formatter(c.fmt_t)
        .x_desc("Time (UTC)")
        .y_desc("System noise temp. (K)")
        .y_labels(6)
        .axis_desc_style(style::label_font())
        .label_style(style::tick_font())
        .draw()?;
    chart
        .configure_secondary_axes()
        .y_label_formatter(&style::num_label)
        .y_desc("Atmospheric loss (dB)")
        .y_labels(6)
        .axis_desc_style(style::label_font())
        .label_style(style::tick_font())
        .draw()?;
    if (c.t_lo..=c.t_hi).contains(&c.tca_s) {
        stroke_line!(
            chart,
            draw_series,
            vline(c.tca_s, (k_lo.max(0.0), k_hi)),
            TCA_STROKE
        );
    }
    // Tsys and its terms, each its own line (series 0, 2-5, 8, 10; 1 is the atmospheric loss).
    type Term = fn(&PassChartSample) -> f64;
    let terms: [(usize, u32, Term, &str); 7] = [
        (
            0,
            3,
            |s| s.system_temperature_k,
            "system noise\ntemperature (left)",
        ),
        (2, 2, |s| s.receiver_noise_k, "receiver (left)"),
        (3, 2, |s| s.sky_noise_k, "sky through the\npattern (left)"),
        (
            4,
            2,
            |s| s.ground_noise_k,
            "ground through the\npattern (left)",
        ),
        (5, 2, |s| s.man_made_noise_k, "man-made (left)"),
        // 8 and 10: a colour and dash unlike the amber atmospheric loss (series 1)
        (8, 2, |s| s.sun_noise_k, "Sun (left)"),
        (10, 2, |s| s.moon_noise_k, "Moon (left)"),
    ];
    let mut keys = Vec::with_capacity(8);
    for (i, width, term, label) in terms {
        // A term below 0.05 K over the whole pass (no man-made noise given, the Sun and the Moon
        // far from the beam) is left out.
        if i != 0 && d.samples.iter().all(|s| term(s) < 0.05) {
            continue;
        }
        let stroke = Stroke::series(i, width);
        stroke_line!(
            chart,
            draw_series,
            d.samples.iter().map(|s| (s.t_s, term(s))).collect(),
            stroke
        );
        keys.push((Key::Line(stroke), label.to_string()));
    }
    let al = Stroke::series(1, 3);
    stroke_line!(
        chart,
        draw_secondary_series,
        d.samples
            .iter()
            .map(|s| (s.t_s, s.atmospheric_loss_db))
            .collect(),
        al
    );
    keys.push((Key::Line(al), "atmospheric loss (right)".into()));
    style::draw_legend(&legend, None, &keys)
}

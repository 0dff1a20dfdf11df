//! Pass chart: four stacked panels on a shared UTC time axis from AOS to LOS, each with one
//! y axis per quantity and its legend in a column to its right.
//!
//! (a) elevation (deg) with the station's mask at the satellite's azimuth filled below it, and
//! slant range (km, right axis); (b) Eb/N0 (dB) at the chosen rate, clear sky and, when planned,
//! the rain case, against the level where the margin is 0 and the required-margin band above it,
//! with the instants the chosen rate starts and stops closing and the atmospheric loss of both
//! cases in the legend; (c) the data rate (engineering units): the adaptive rate as a step line
//! and the fixed rate over the seconds it counts; (d) the system noise temperature (K) and its
//! terms (receiver, sky, ground, man-made, the Sun, the Moon), and the rain case's total.

use plotters::coord::ranged1d::Ranged;
use plotters::coord::Shift;
use plotters::prelude::*;
use plotters::style::text_anchor::{HPos, Pos, VPos};

use super::data::{PassChartData, PassChartSample};
use super::style::{self, stroke_line, Key, Stroke};
use super::types::{ChartError, Plot, PASS_SIZE};
use crate::timefmt::seconds_between;

const TITLE_H: u32 = 100;
const LEGEND_W: u32 = 330;
const Y_AXIS_W: u32 = 95;

impl Plot for PassChartData {
    const NAME: &'static str = "pass";

    fn warnings(&self) -> &[String] {
        &self.warnings
    }
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
    let id = if d.pass_id.is_empty() {
        String::new()
    } else {
        format!(" ({})", d.pass_id)
    };
    let cut = match (d.starts_before_window, d.ends_after_window) {
        (true, true) => " · cut by the window at both ends",
        (true, false) => " · cut by the window's start",
        (false, true) => " · cut by the window's end",
        (false, false) => "",
    };
    let line1 = format!(
        "{} over {} · pass {}{id} · {}{cut}",
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
    let rain = match (d.rain_exceedance_percent, d.rain_volume_bits) {
        (Some(p), Some(v)) => format!(
            " · rain ({p} %): {}, {}",
            d.rain_rate_bps
                .map(style::format_rate)
                .unwrap_or_else(|| "no rate closes".into()),
            style::format_volume(v)
        ),
        _ => String::new(),
    };
    let line2 = format!(
        "max elevation {} · {rate} · volume {} (adaptive {}){rain}",
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
    // Shares of the height: geometry 24 %, Eb/N0 29 %, rate 19 %, noise the rest (with the axis).
    let panels_h = (body_h - bottom_axis_h) as f64;
    let (pa, rest) = body.split_vertically((0.24 * panels_h) as u32);
    let (pb, rest) = rest.split_vertically((0.29 * panels_h) as u32);
    let (pr, pc) = rest.split_vertically((0.19 * panels_h) as u32);

    // A highest point at an edge the window cuts is not a closest approach: no TCA line or label
    // (NaN lies in no panel's range).
    let tca_s = match tca_at_cut(d) {
        true => f64::NAN,
        false => seconds_between(&d.aos, &d.tca),
    };
    let ctx = Ctx {
        t_lo,
        t_hi,
        ticks: &ticks,
        fmt_t: &fmt_t,
        tca_s,
    };
    panel_geometry(d, &pa, &ctx)?;
    panel_link(d, &pb, &ctx)?;
    panel_rate(d, &pr, &ctx)?;
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

/// A panel's legend, its entries close together (the panels are short).
fn legend_in<DB: DrawingBackend>(
    area: &DrawingArea<DB, Shift>,
    title: Option<&str>,
    entries: &[(Key, String)],
) -> Result<(), ChartError>
where
    DB::ErrorType: 'static,
{
    style::draw_legend_spaced(area, title, entries, 3)
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
/// The rain case, the same look in every panel (amber: no other series of those panels uses it).
const RAIN_STROKE: Stroke = Stroke::dashed(style::AMBER, 3, 12, 5);

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

    // The station's mask at the satellite's azimuth, filled from the axis' floor up to it.
    let mask: Vec<(f64, f64)> = d
        .samples
        .iter()
        .filter(|s| s.t_s.is_finite() && s.mask_elevation_deg.is_finite())
        .map(|s| (s.t_s, s.mask_elevation_deg.clamp(el_min, el_max)))
        .collect();
    let mask_edge = Stroke::solid(style::TERRAIN_EDGE, 2);
    if let (Some(a), Some(b)) = (mask.first(), mask.last()) {
        let mut poly = mask.clone();
        poly.push((b.0, el_min));
        poly.push((a.0, el_min));
        chart.draw_series(std::iter::once(Polygon::new(poly, style::TERRAIN.filled())))?;
        stroke_line!(chart, draw_series, mask.clone(), mask_edge);
    }
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
    // AOS / TCA / LOS labels along the top of the panel; a pass the window cuts is labelled with
    // the window's edge (its AOS or LOS lies outside), and its highest point in the window is
    // not labelled TCA when it is that edge.
    let (aos_word, los_word) = (
        if d.starts_before_window {
            "window start"
        } else {
            "AOS"
        },
        if d.ends_after_window {
            "window end"
        } else {
            "LOS"
        },
    );
    let top = el_max;
    let aos_t = 0.0f64.max(c.t_lo);
    let los_t = seconds_between(&d.aos, &d.los).min(c.t_hi);
    let f = style::note_font(style::INK);
    let span = c.t_hi - c.t_lo;
    if los_t - aos_t < 0.3 * span {
        // too short to label both ends apart
        chart.draw_series(std::iter::once(Text::new(
            format!(
                " {aos_word} {} · {los_word} {}",
                d.aos.format("%H:%M:%S"),
                d.los.format("%H:%M:%S")
            ),
            (aos_t, top),
            f.clone().pos(Pos::new(HPos::Left, VPos::Top)),
        )))?;
    } else {
        chart.draw_series([
            Text::new(
                format!(" {aos_word} {}", d.aos.format("%H:%M:%S")),
                (aos_t, top),
                f.clone().pos(Pos::new(HPos::Left, VPos::Top)),
            ),
            Text::new(
                format!("{los_word} {} ", d.los.format("%H:%M:%S")),
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

    let mut keys = vec![
        (Key::Line(el), "elevation (left)".into()),
        (Key::Line(rg), "slant range (right)".into()),
    ];
    if c.tca_s.is_finite() {
        keys.push((Key::Line(tca), "closest approach".into()));
    }
    keys.push((
        Key::Band(style::TERRAIN, 1.0),
        "station mask at the\nsatellite's azimuth".into(),
    ));
    legend_in(&legend, None, &keys)
}

/// The pass's highest point in the window lies at an edge the window cuts (within 1 s): it is
/// the window's edge, not a closest approach.
fn tca_at_cut(d: &PassChartData) -> bool {
    (d.starts_before_window && (d.tca - d.aos).num_milliseconds() < 1000)
        || (d.ends_after_window && (d.los - d.tca).num_milliseconds() < 1000)
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
    let rain_eb = |s: &PassChartSample| s.rain.map(|r| r.ebn0_db).unwrap_or(f64::NAN);
    let (y_lo, y_hi) = style::finite_range(
        d.samples
            .iter()
            .flat_map(|s| [s.ebn0_db, rain_eb(s)])
            .chain(req)
            .chain(req.map(|r| r + margin)),
        0.10,
        3.0,
        (0.0, 10.0),
    );

    let mut chart = ChartBuilder::on(&plot)
        .margin_top(30)
        .margin_left(10)
        .x_label_area_size(8)
        .y_label_area_size(Y_AXIS_W)
        .right_y_label_area_size(Y_AXIS_W)
        .build_cartesian_2d(
            style::TickAxis::new(c.t_lo, c.t_hi, c.ticks.to_vec()),
            y_lo..y_hi,
        )?;
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
                format!("required margin {margin:.1} dB"),
            ));
        }
        stroke_line!(
            chart,
            draw_series,
            vec![(c.t_lo, r), (c.t_hi, r)],
            req_stroke
        );
        keys.push((Key::Line(req_stroke), format!("margin 0 (Eb/N0 {r:.1} dB)")));
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
    let at_rate = match d.rate_bps {
        Some(r) => style::format_rate(r),
        None => "lowest rate".to_string(),
    };
    let loss = |f: &dyn Fn(&PassChartSample) -> f64| {
        let (lo, hi) = d
            .samples
            .iter()
            .map(f)
            .filter(|v| v.is_finite())
            .fold((f64::INFINITY, f64::NEG_INFINITY), |(a, b), v| {
                (a.min(v), b.max(v))
            });
        if lo.is_finite() && format!("{lo:.1}") == format!("{hi:.1}") {
            format!("{lo:.1} dB")
        } else if lo.is_finite() {
            format!("{lo:.1}–{hi:.1} dB")
        } else {
            "n/a".into()
        }
    };
    keys.insert(
        0,
        (
            Key::Line(eb),
            format!(
                "Eb/N0 at {at_rate}\nclear sky, atm. loss {}",
                loss(&|s| s.atmospheric_loss_db)
            ),
        ),
    );
    if d.samples.iter().any(|s| s.rain.is_some()) {
        let rs = RAIN_STROKE;
        stroke_line!(
            chart,
            draw_series,
            d.samples.iter().map(|s| (s.t_s, rain_eb(s))).collect(),
            rs
        );
        let pct = d
            .rain_exceedance_percent
            .map(|p| format!(" ({p} %)"))
            .unwrap_or_default();
        keys.insert(
            1,
            (
                Key::Line(rs),
                format!(
                    "rain case{pct},\natm. loss {}",
                    loss(&|s| s.rain.map(|r| r.atmospheric_loss_db).unwrap_or(f64::NAN))
                ),
            ),
        );
    }
    closing_marks(d, &mut chart, c, (y_lo, y_hi), &mut keys)?;
    legend_in(&legend, None, &keys)
}

/// The instants where the chosen rate starts and stops closing, labelled; or a note saying why
/// there are none.
fn closing_marks<DB: DrawingBackend, X, Y>(
    d: &PassChartData,
    chart: &mut ChartContext<DB, Cartesian2d<X, Y>>,
    c: &Ctx,
    (y_lo, y_hi): (f64, f64),
    keys: &mut Vec<(Key, String)>,
) -> Result<(), ChartError>
where
    DB::ErrorType: 'static,
    X: Ranged<ValueType = f64>,
    Y: Ranged<ValueType = f64>,
{
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
        keys.push((Key::Line(mark), "fixed rate closes from/until".into()));
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
    Ok(())
}

/// The data rate on its own axis: the adaptive rate as a step line (each sample's rate holds
/// until the next sample) and the chosen fixed rate over the samples it counts.
fn panel_rate<DB: DrawingBackend>(
    d: &PassChartData,
    area: &DrawingArea<DB, Shift>,
    c: &Ctx,
) -> Result<(), ChartError>
where
    DB::ErrorType: 'static,
{
    let (plot, legend) = split_legend(area);
    let max_rate = d
        .samples
        .iter()
        .filter_map(|s| s.adaptive_rate_bps)
        .chain(d.rate_bps)
        .filter(|v| v.is_finite())
        .fold(0.0f64, f64::max);
    let (rate_div, rate_unit) = crate::engfmt::rate_unit(max_rate);
    let rate_hi = style::zero_based_max([max_rate / rate_div], 0.15, 1.0);
    let mut chart = ChartBuilder::on(&plot)
        .margin_top(14)
        .margin_left(10)
        .x_label_area_size(8)
        .y_label_area_size(Y_AXIS_W)
        .right_y_label_area_size(Y_AXIS_W)
        .build_cartesian_2d(
            style::TickAxis::new(c.t_lo, c.t_hi, c.ticks.to_vec()),
            0.0..rate_hi,
        )?;
    chart
        .configure_mesh()
        .bold_line_style(style::GRID)
        .light_line_style(TRANSPARENT)
        .y_label_formatter(&style::num_label)
        .x_label_formatter(&|_| String::new())
        .y_desc(format!("Rate ({rate_unit})"))
        .y_labels(5)
        .axis_desc_style(style::label_font())
        .label_style(style::tick_font())
        .draw()?;
    // Where the antenna cannot follow the satellite nothing counts, whatever the margin above:
    // shaded, so that the gap in the rates has its reason beside it.
    let untracked = untracked_spans(d);
    let (shade, opacity) = UNTRACKED_BAND;
    for &(a, b) in &untracked {
        chart.draw_series(std::iter::once(Rectangle::new(
            [(a, 0.0), (b, rate_hi)],
            shade.mix(opacity).filled(),
        )))?;
    }
    if (c.t_lo..=c.t_hi).contains(&c.tca_s) {
        stroke_line!(
            chart,
            draw_series,
            vline(c.tca_s, (0.0, rate_hi)),
            TCA_STROKE
        );
    }
    let mut steps = Vec::with_capacity(2 * d.samples.len());
    let mut fixed = Vec::with_capacity(2 * d.samples.len());
    for (i, s) in d.samples.iter().enumerate() {
        let r = s.adaptive_rate_bps.filter(|v| v.is_finite()).unwrap_or(0.0) / rate_div;
        let t_next = d.samples.get(i + 1).map(|n| n.t_s).unwrap_or(s.t_s);
        let f = match d.rate_bps {
            Some(x) if s.closed => x / rate_div,
            _ => f64::NAN,
        };
        steps.push((s.t_s, r));
        fixed.push((s.t_s, f));
        if t_next != s.t_s {
            steps.push((t_next, r));
            // a counted sample's rate holds until the next sample only if that one counts too
            let next_closed = d.samples.get(i + 1).is_some_and(|n| n.closed);
            fixed.push((t_next, if next_closed { f } else { f64::NAN }));
        }
    }
    let fx = Stroke::solid(style::NAVY, 5);
    stroke_line!(chart, draw_series, fixed, fx);
    let ad = Stroke::dashed(style::PLUM, 3, 12, 5);
    stroke_line!(chart, draw_series, steps, ad);
    let fixed_label = match d.rate_bps {
        Some(r) => format!("fixed rate {}\n(seconds it counts)", style::format_rate(r)),
        None => "fixed rate: none closes".into(),
    };
    let mut keys = vec![
        (
            Key::Line(ad),
            "adaptive rate\n(one modem, hysteresis)".into(),
        ),
        (Key::Line(fx), fixed_label),
    ];
    if !untracked.is_empty() {
        keys.push((
            Key::Band(shade, opacity),
            "antenna cannot follow,\nor too short to lock".into(),
        ));
    }
    legend_in(&legend, None, &keys)
}

/// The shade of the stretches the antenna cannot follow (colour, opacity).
const UNTRACKED_BAND: (RGBColor, f64) = (style::SLATE, 0.22);

/// The stretches where the antenna cannot follow the satellite (mount limits), or a followed
/// stretch between two of them too short for the modem to lock (`PassChartSample::tracked`),
/// from and to in seconds since AOS; a sample's state holds until the next sample, as the rates
/// drawn.
fn untracked_spans(d: &PassChartData) -> Vec<(f64, f64)> {
    let mut out: Vec<(f64, f64)> = Vec::new();
    for (i, s) in d.samples.iter().enumerate() {
        let t_next = d.samples.get(i + 1).map_or(s.t_s, |n| n.t_s);
        // (a lone last sample, or one without a finite time, spans nothing)
        if s.tracked || !s.t_s.is_finite() || t_next.is_nan() || t_next <= s.t_s {
            continue;
        }
        match out.last_mut() {
            Some(last) if last.1 == s.t_s => last.1 = t_next,
            _ => out.push((s.t_s, t_next)),
        }
    }
    out
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
    let rain_t = |s: &PassChartSample| s.rain.map(|r| r.system_temperature_k).unwrap_or(f64::NAN);
    // From 0 K, so the terms below Tsys show on the same axis.
    let (_, k_hi) = style::finite_range(
        d.samples
            .iter()
            .flat_map(|s| [s.system_temperature_k, rain_t(s)]),
        0.10,
        10.0,
        (0.0, 300.0),
    );
    let k_lo = 0.0f64;
    let mut chart = ChartBuilder::on(&plot)
        .margin_top(14)
        .margin_left(10)
        .x_label_area_size(x_axis_h)
        .y_label_area_size(Y_AXIS_W)
        .right_y_label_area_size(Y_AXIS_W)
        .build_cartesian_2d(
            style::TickAxis::new(c.t_lo, c.t_hi, c.ticks.to_vec()),
            k_lo..k_hi,
        )?;
    chart
        .configure_mesh()
        .bold_line_style(style::GRID)
        .light_line_style(TRANSPARENT)
        .y_label_formatter(&style::num_label)
        .x_label_formatter(c.fmt_t)
        .x_desc("Time (UTC)")
        .y_desc("Noise temp. (K)")
        .y_labels(5)
        .axis_desc_style(style::label_font())
        .label_style(style::tick_font())
        .draw()?;
    if (c.t_lo..=c.t_hi).contains(&c.tca_s) {
        stroke_line!(chart, draw_series, vline(c.tca_s, (k_lo, k_hi)), TCA_STROKE);
    }
    // Tsys and its terms, each its own line and each in its own colour (the Sun and the sky
    // term shared plum, man-made noise and the Moon Tsys's navy, told apart by dashes alone).
    type Term = fn(&PassChartSample) -> f64;
    let terms: [(Stroke, Term, &str); 7] = [
        (
            Stroke::series(0, 3),
            |s| s.system_temperature_k,
            "Tsys, clear sky",
        ),
        (Stroke::series(2, 2), |s| s.receiver_noise_k, "receiver"),
        (
            Stroke::series(3, 2),
            |s| s.sky_noise_k,
            "sky through the pattern",
        ),
        (
            Stroke::series(4, 2),
            |s| s.ground_noise_k,
            "ground through the pattern",
        ),
        (
            Stroke::dashed(style::GREEN, 2, 16, 7),
            |s| s.man_made_noise_k,
            "man-made",
        ),
        (Stroke::solid(style::VERMILION, 2), |s| s.sun_noise_k, "Sun"),
        (
            Stroke::dashed(style::INK, 2, 7, 6),
            |s| s.moon_noise_k,
            "Moon",
        ),
    ];
    let mut keys = Vec::with_capacity(8);
    for (k, (stroke, term, label)) in terms.into_iter().enumerate() {
        // A term below 0.05 K over the whole pass (no man-made noise given, the Sun and the Moon
        // far from the beam) is left out.
        if k != 0 && d.samples.iter().all(|s| term(s) < 0.05) {
            continue;
        }
        stroke_line!(
            chart,
            draw_series,
            d.samples.iter().map(|s| (s.t_s, term(s))).collect(),
            stroke
        );
        keys.push((Key::Line(stroke), label.to_string()));
    }
    if d.samples.iter().any(|s| s.rain.is_some()) {
        let rs = RAIN_STROKE;
        stroke_line!(
            chart,
            draw_series,
            d.samples.iter().map(|s| (s.t_s, rain_t(s))).collect(),
            rs
        );
        let pct = d
            .rain_exceedance_percent
            .map(|p| format!(" ({p} %)"))
            .unwrap_or_default();
        keys.insert(1, (Key::Line(rs), format!("Tsys, rain case{pct}")));
    }
    legend_in(&legend, None, &keys)
}

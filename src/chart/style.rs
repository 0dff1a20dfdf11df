//! Shared look of all charts: the bundled font, the colour scheme, line styles, markers, and small
//! helpers for axis ranges, time ticks and unit formatting.
//!
//! # Colour scheme
//!
//! Our own five-colour scheme. The colours spread over lightness (dark, mid, light) and not only
//! over hue, and the main hues sit on the blue–orange axis, which stays distinct for the common
//! red–green colour-vision deficiencies (common practice in chart design):
//!
//! | name    | sRGB      | approx. CIE L* | use                                  |
//! |---------|-----------|----------------|--------------------------------------|
//! | NAVY    | `#1c3d72` | 26             | first series, "margin met"           |
//! | AMBER   | `#e69520` | 68             | second series, "marginal"            |
//! | SKY     | `#7fc3ea` | 76             | third series, fills                  |
//! | PLUM    | `#86306f` | 35             | fourth series, "link fails"          |
//! | SLATE   | `#5d6670` | 43             | fifth series, reference lines        |
//!
//! (L* computed from the sRGB values with the CIE 1976 formula, D65 white.) The horizon-mask
//! fill TERRAIN `#d6cfc2` (L* 83) is lighter than every line colour.
//!
//! Because NAVY/PLUM and AMBER/SKY are close in lightness, series never rely on colour alone: each
//! series index also gets its own line pattern ([`Stroke::series`]: solid, long dash, short dash,
//! dots, very long dash) and its own marker shape ([`MarkerShape`]: circle, triangle, square,
//! cross, diamond), so the charts read in greyscale print as well. Bars carry a dark outline.
//! Text is near-black on white; grid lines are light grey.

use std::sync::OnceLock;

use plotters::coord::ranged1d::{DefaultFormatting, KeyPointHint, Ranged};
use plotters::prelude::*;
use plotters::style::{FontStyle, RGBColor};

use chrono::{DateTime, Utc};

use super::types::ChartError;

/// Font family name the charts use; the bundled DejaVu Sans is registered under it, so SVG
/// viewers fall back to their own sans-serif face.
pub const FONT: &str = "sans-serif";

/// DejaVu Sans (Bitstream Vera licence, see `fonts/LICENSE-DejaVu.txt`).
pub(super) static DEJAVU_SANS: &[u8] = include_bytes!("fonts/DejaVuSans.ttf");

static FONT_READY: OnceLock<bool> = OnceLock::new();

/// Register the bundled font with plotters exactly once (thread-safe).
pub fn ensure_font() -> Result<(), ChartError> {
    let ok = *FONT_READY.get_or_init(|| {
        plotters::style::register_font(FONT, FontStyle::Normal, DEJAVU_SANS).is_ok()
    });
    if ok {
        Ok(())
    } else {
        Err(ChartError::Font)
    }
}

pub const INK: RGBColor = RGBColor(0x20, 0x20, 0x20);
pub const MUTED: RGBColor = RGBColor(0x55, 0x55, 0x55);
pub const GRID: RGBColor = RGBColor(0xdc, 0xdc, 0xdc);
pub const NAVY: RGBColor = RGBColor(0x1c, 0x3d, 0x72);
pub const AMBER: RGBColor = RGBColor(0xe6, 0x95, 0x20);
pub const SKY: RGBColor = RGBColor(0x7f, 0xc3, 0xea);
pub const PLUM: RGBColor = RGBColor(0x86, 0x30, 0x6f);
pub const SLATE: RGBColor = RGBColor(0x5d, 0x66, 0x70);
/// Fill of the terrain/horizon mask and other "not usable" regions.
pub const TERRAIN: RGBColor = RGBColor(0xd6, 0xcf, 0xc2);
pub const TERRAIN_EDGE: RGBColor = RGBColor(0x8a, 0x80, 0x70);

/// Two more line colours, for lines that must not share a series colour with a neighbour (the
/// pass chart's man-made and Sun noise terms): a bluish green and a vermilion, apart in hue from
/// the series colours and from each other for the common colour-vision deficiencies (the
/// Okabe-Ito colour set, from memory).
pub const GREEN: RGBColor = RGBColor(0x00, 0x9e, 0x73);
pub const VERMILION: RGBColor = RGBColor(0xd5, 0x5e, 0x00);

/// Series colours in order of use.
pub const SERIES: [RGBColor; 5] = [NAVY, AMBER, SKY, PLUM, SLATE];

pub const TITLE_PX: f64 = 30.0;
pub const LABEL_PX: f64 = 22.0;
pub const TICK_PX: f64 = 18.0;
pub const NOTE_PX: f64 = 17.0;

pub fn title_font() -> TextStyle<'static> {
    (FONT, TITLE_PX).into_font().color(&INK)
}
pub fn label_font() -> TextStyle<'static> {
    (FONT, LABEL_PX).into_font().color(&INK)
}
pub fn tick_font() -> TextStyle<'static> {
    (FONT, TICK_PX).into_font().color(&INK)
}
pub fn note_font(color: RGBColor) -> TextStyle<'static> {
    (FONT, NOTE_PX).into_font().color(&color)
}

/// Height of one footer line (the caution under every chart), pixels.
pub const FOOTER_LINE_PX: u32 = 22;

/// Break `text` at spaces into lines no wider than `max_px` in `font` (a word longer than a line
/// stands alone).
pub fn wrap_text<DB: DrawingBackend>(
    area: &DrawingArea<DB, plotters::coord::Shift>,
    text: &str,
    font: &TextStyle,
    max_px: u32,
) -> Result<Vec<String>, ChartError>
where
    DB::ErrorType: 'static,
{
    let mut lines: Vec<String> = Vec::new();
    let mut cur = String::new();
    for word in text.split_whitespace() {
        let candidate = if cur.is_empty() {
            word.to_string()
        } else {
            format!("{cur} {word}")
        };
        if !cur.is_empty() && area.estimate_text_size(&candidate, font)?.0 > max_px {
            lines.push(std::mem::replace(&mut cur, word.to_string()));
        } else {
            cur = candidate;
        }
    }
    if !cur.is_empty() {
        lines.push(cur);
    }
    Ok(lines)
}

/// A line look: colour, width and an optional dash pattern (dash, gap) in pixels.
#[derive(Debug, Clone, Copy)]
pub struct Stroke {
    pub color: RGBColor,
    pub width: u32,
    pub dash: Option<(u32, u32)>,
}

impl Stroke {
    pub const fn solid(color: RGBColor, width: u32) -> Self {
        Stroke {
            color,
            width,
            dash: None,
        }
    }
    pub const fn dashed(color: RGBColor, width: u32, on: u32, off: u32) -> Self {
        Stroke {
            color,
            width,
            dash: Some((on, off)),
        }
    }
    /// The look of series number `i`: colour and dash pattern both change with `i`.
    pub fn series(i: usize, width: u32) -> Self {
        let color = SERIES[i % SERIES.len()];
        let dash = match (i / SERIES.len() + i) % 5 {
            0 => None,
            1 => Some((16, 7)),
            2 => Some((7, 6)),
            3 => Some((3, 5)),
            _ => Some((24, 5)),
        };
        Stroke { color, width, dash }
    }
    pub fn style(&self) -> ShapeStyle {
        ShapeStyle {
            color: self.color.to_rgba(),
            filled: false,
            stroke_width: self.width,
        }
    }
}

/// Marker shapes, varied per series so series stay apart in greyscale.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum MarkerShape {
    Circle,
    Triangle,
    Square,
    Cross,
    Diamond,
}

impl MarkerShape {
    pub fn series(i: usize) -> Self {
        // Shifted by two shapes per round of colours, so the sixth series and later differ from
        // the first ones in colour, dash and marker together.
        match (i + 2 * (i / SERIES.len())) % 5 {
            0 => MarkerShape::Circle,
            1 => MarkerShape::Triangle,
            2 => MarkerShape::Square,
            3 => MarkerShape::Cross,
            _ => MarkerShape::Diamond,
        }
    }
}

/// Draw a marker centred at `at`, in pixels relative to `area`.
pub fn draw_marker<DB: DrawingBackend>(
    area: &DrawingArea<DB, plotters::coord::Shift>,
    shape: MarkerShape,
    at: (i32, i32),
    size: i32,
    color: RGBColor,
) -> Result<(), ChartError>
where
    DB::ErrorType: 'static,
{
    draw_shape(area, shape, at, size, color, true)
}

/// A small marker without its dark edge, which at this size would hide its colour (a dense
/// plot's one mark per item).
pub fn draw_dot<DB: DrawingBackend>(
    area: &DrawingArea<DB, plotters::coord::Shift>,
    shape: MarkerShape,
    at: (i32, i32),
    color: RGBColor,
) -> Result<(), ChartError>
where
    DB::ErrorType: 'static,
{
    draw_shape(area, shape, at, 2, color, false)
}

fn draw_shape<DB: DrawingBackend>(
    area: &DrawingArea<DB, plotters::coord::Shift>,
    shape: MarkerShape,
    at: (i32, i32),
    size: i32,
    color: RGBColor,
    edged: bool,
) -> Result<(), ChartError>
where
    DB::ErrorType: 'static,
{
    let (x, y) = at;
    let fill = color.filled();
    let edge = ShapeStyle {
        color: INK.to_rgba(),
        filled: false,
        stroke_width: 1,
    };
    let outline = |pts: Vec<(i32, i32)>| -> Result<(), ChartError> {
        let mut closed = pts.clone();
        closed.push(pts[0]);
        area.draw(&Polygon::new(pts, fill))?;
        if edged {
            area.draw(&PathElement::new(closed, edge))?;
        }
        Ok(())
    };
    match shape {
        MarkerShape::Circle => {
            area.draw(&Circle::new((x, y), size, fill))?;
            if edged {
                area.draw(&Circle::new((x, y), size, edge))?;
            }
        }
        MarkerShape::Triangle => {
            let s = size + 1;
            outline(vec![(x, y - s - 1), (x + s, y + s - 1), (x - s, y + s - 1)])?;
        }
        MarkerShape::Square => {
            outline(vec![
                (x - size, y - size),
                (x + size, y - size),
                (x + size, y + size),
                (x - size, y + size),
            ])?;
        }
        MarkerShape::Cross => {
            let s = size + 1;
            let st = ShapeStyle {
                color: color.to_rgba(),
                filled: false,
                stroke_width: 3,
            };
            area.draw(&PathElement::new(vec![(x - s, y - s), (x + s, y + s)], st))?;
            area.draw(&PathElement::new(vec![(x - s, y + s), (x + s, y - s)], st))?;
        }
        MarkerShape::Diamond => {
            let s = size + 2;
            outline(vec![(x, y - s), (x + s, y), (x, y + s), (x - s, y)])?;
        }
    }
    Ok(())
}

/// Convert an absolute backend pixel to one relative to `area`.
pub fn rel<DB: DrawingBackend>(
    area: &DrawingArea<DB, plotters::coord::Shift>,
    abs: (i32, i32),
) -> (i32, i32) {
    let (bx, by) = area.get_base_pixel();
    (abs.0 - bx, abs.1 - by)
}

/// Draw a line (split into finite runs; a lone finite point becomes a dot; each run drawn as a
/// [`crate::chart::path::PixelPath`]) with a [`Stroke`]. Works for primary (`draw_series`) and
/// secondary (`draw_secondary_series`) coordinates.
macro_rules! stroke_line {
    ($chart:expr, $method:ident, $points:expr, $stroke:expr) => {{
        let stroke: $crate::chart::style::Stroke = $stroke;
        for run in $crate::chart::style::finite_runs($points).into_iter() {
            if run.len() == 1 {
                // a lone point draws no line: show it as a dot
                $chart.$method(std::iter::once(plotters::element::Circle::new(
                    run[0],
                    stroke.width as i32 + 3,
                    plotters::style::Color::filled(&stroke.color),
                )))?;
                continue;
            }
            // through the pixels that shape it ([`crate::chart::path`]: no dented edges)
            $chart.$method(std::iter::once($crate::chart::path::PixelPath::new(
                run, stroke,
            )))?;
        }
    }};
}
pub(crate) use stroke_line;

/// What a legend entry shows beside its text.
#[derive(Debug, Clone, Copy)]
pub enum Key {
    Line(Stroke),
    LineMarker(Stroke, MarkerShape),
    /// A filled box (colour, opacity).
    Band(RGBColor, f64),
    /// A filled box and a marker of the same colour.
    BandMarker(RGBColor, MarkerShape),
    /// Text only.
    Blank,
}

/// Draw a legend as a column of entries in its own drawing area (never over the data). A label
/// may hold several lines separated by `\n`.
pub fn draw_legend<DB: DrawingBackend>(
    area: &DrawingArea<DB, plotters::coord::Shift>,
    title: Option<&str>,
    entries: &[(Key, String)],
) -> Result<(), ChartError>
where
    DB::ErrorType: 'static,
{
    draw_legend_spaced(area, title, entries, 10)
}

/// [`draw_legend`] with `gap` pixels between entries (a short panel takes 3).
pub fn draw_legend_spaced<DB: DrawingBackend>(
    area: &DrawingArea<DB, plotters::coord::Shift>,
    title: Option<&str>,
    entries: &[(Key, String)],
    gap: i32,
) -> Result<(), ChartError>
where
    DB::ErrorType: 'static,
{
    let line_h = 22;
    let mut y = 8;
    if let Some(t) = title {
        area.draw(&Text::new(t.to_string(), (8, y), label_font()))?;
        y += 34;
    }
    for (key, label) in entries {
        let cy = y + line_h / 2;
        let x0 = 8;
        let x1 = 52;
        match *key {
            Key::Line(s) => draw_key_line(area, s, x0, x1, cy)?,
            Key::LineMarker(s, m) => {
                draw_key_line(area, s, x0, x1, cy)?;
                draw_marker(area, m, ((x0 + x1) / 2, cy), 6, s.color)?;
            }
            Key::Blank => {}
            Key::BandMarker(c, m) => {
                let edge = ShapeStyle {
                    color: INK.to_rgba(),
                    filled: false,
                    stroke_width: 1,
                };
                area.draw(&Rectangle::new(
                    [(x0, cy - 9), (x0 + 18, cy + 9)],
                    c.filled(),
                ))?;
                area.draw(&Rectangle::new([(x0, cy - 9), (x0 + 18, cy + 9)], edge))?;
                draw_marker(area, m, (x1 - 10, cy), 6, c)?;
            }
            Key::Band(c, a) => {
                area.draw(&Rectangle::new(
                    [(x0, cy - 8), (x1, cy + 8)],
                    c.mix(a).filled(),
                ))?;
                area.draw(&Rectangle::new(
                    [(x0, cy - 8), (x1, cy + 8)],
                    ShapeStyle {
                        color: MUTED.to_rgba(),
                        filled: false,
                        stroke_width: 1,
                    },
                ))?;
            }
        }
        for (i, part) in label.split('\n').enumerate() {
            let ty = cy + i as i32 * line_h;
            area.draw(&Text::new(
                part.to_string(),
                (x1 + 10, ty),
                note_font(INK).pos(plotters::style::text_anchor::Pos::new(
                    plotters::style::text_anchor::HPos::Left,
                    plotters::style::text_anchor::VPos::Center,
                )),
            ))?;
        }
        y += line_h * label.split('\n').count() as i32 + gap;
    }
    Ok(())
}

fn draw_key_line<DB: DrawingBackend>(
    area: &DrawingArea<DB, plotters::coord::Shift>,
    s: Stroke,
    x0: i32,
    x1: i32,
    y: i32,
) -> Result<(), ChartError>
where
    DB::ErrorType: 'static,
{
    // A horizontal key line is a filled band `width` rows high: one rectangle fill per dash,
    // where a wide path went through the polygon filler (a quarter of a chart's legend cost).
    let w = s.width.max(1) as i32;
    // (the lower right corner is excluded, as plotters' fast rectangle fill)
    let (top, bottom) = (y - w / 2, y - w / 2 + w);
    let dashes = match s.dash {
        None => vec![(x0, x1)],
        Some((on, off)) => key_dashes(x0, x1, on, off),
    };
    for (a, e) in dashes {
        area.draw(&Rectangle::new([(a, top), (e, bottom)], s.color.filled()))?;
    }
    Ok(())
}

/// The dashes of a legend key from `x0` to `x1`: one dash centred on the key, so that a marker
/// there leaves the gaps beside it in sight (from the left end, a long dash's one gap fell under
/// the marker and the key read as a solid line).
fn key_dashes(x0: i32, x1: i32, on: u32, off: u32) -> Vec<(i32, i32)> {
    let (on, off) = (on.max(2) as i32, off.max(2) as i32);
    let period = on + off;
    let centred = (x0 + x1) / 2 - on / 2;
    let mut x = centred - (centred - x0 + period - 1) / period * period;
    let mut out = Vec::new();
    while x < x1 {
        let (a, e) = (x.max(x0), (x + on).min(x1));
        if e > a {
            out.push((a, e));
        }
        x += period;
    }
    out
}

/// A linear f64 axis with tick positions chosen by the caller (e.g. round UTC times).
#[derive(Debug, Clone)]
pub struct TickAxis {
    lo: f64,
    hi: f64,
    ticks: Vec<f64>,
}

impl TickAxis {
    pub fn new(lo: f64, hi: f64, ticks: Vec<f64>) -> Self {
        TickAxis { lo, hi, ticks }
    }
}

impl Ranged for TickAxis {
    type ValueType = f64;
    type FormatOption = DefaultFormatting;

    fn range(&self) -> std::ops::Range<f64> {
        self.lo..self.hi
    }

    fn map(&self, v: &f64, limit: (i32, i32)) -> i32 {
        let span = self.hi - self.lo;
        if span == 0.0 || !span.is_finite() {
            return (limit.0 + limit.1) / 2;
        }
        let frac = (v - self.lo) / span;
        let px = (limit.1 - limit.0) as f64 * frac;
        if !px.is_finite() {
            return if px > 0.0 { limit.1 } else { limit.0 };
        }
        limit.0 + (px + 1e-3).floor().clamp(-1e6, 1e6) as i32
    }

    fn key_points<H: KeyPointHint>(&self, hint: H) -> Vec<f64> {
        if hint.weight().allow_light_points() {
            Vec::new()
        } else {
            self.ticks.clone()
        }
    }
}

/// Split a polyline into runs of finite points (a non-finite value breaks the line).
pub fn finite_runs(points: Vec<(f64, f64)>) -> Vec<Vec<(f64, f64)>> {
    let mut runs = Vec::new();
    let mut cur = Vec::new();
    for p in points {
        if p.0.is_finite() && p.1.is_finite() {
            cur.push(p);
        } else if !cur.is_empty() {
            runs.push(std::mem::take(&mut cur));
        }
    }
    if !cur.is_empty() {
        runs.push(cur);
    }
    runs
}

/// Axis range over the finite values, padded by `pad` of the span on each side, at least
/// `min_span` wide; `fallback` when there is no finite value.
pub fn finite_range(
    values: impl IntoIterator<Item = f64>,
    pad: f64,
    min_span: f64,
    fallback: (f64, f64),
) -> (f64, f64) {
    let mut lo = f64::INFINITY;
    let mut hi = f64::NEG_INFINITY;
    for v in values {
        if v.is_finite() {
            lo = lo.min(v);
            hi = hi.max(v);
        }
    }
    if !lo.is_finite() {
        return fallback;
    }
    let span = hi - lo;
    if span < min_span {
        let mid = 0.5 * (lo + hi);
        lo = mid - 0.5 * min_span;
        hi = mid + 0.5 * min_span;
    }
    let span = hi - lo;
    (lo - pad * span, hi + pad * span)
}

/// Upper end of a zero-based axis: the largest finite value plus `pad`, at least `min`.
pub fn zero_based_max(values: impl IntoIterator<Item = f64>, pad: f64, min: f64) -> f64 {
    let m = values
        .into_iter()
        .filter(|v| v.is_finite())
        .fold(0.0f64, f64::max);
    (m * (1.0 + pad)).max(min)
}

pub use crate::engfmt::{rate as format_rate, volume as format_volume, volume_unit};

/// Axis number label: at most two decimals, trailing zeros removed (`60`, `2.5`, `0.25`).
pub fn num_label(v: &f64) -> String {
    if !v.is_finite() {
        return String::new();
    }
    let s = format!("{v:.2}");
    let s = s.trim_end_matches('0').trim_end_matches('.');
    if s == "-0" {
        "0".into()
    } else {
        s.to_string()
    }
}

/// An angle for titles, `56.1°`, or `n/a` when not finite.
pub fn deg_or_na(v: f64) -> String {
    if v.is_finite() {
        format!("{v:.1}°")
    } else {
        "n/a".into()
    }
}

/// Tick step choices for UTC time axes, seconds (up to 4, 7, 14, 28, 56, 112, 224 and 448 days,
/// so a month, a year or the longest window of 3660 days keeps its date labels apart).
const TIME_STEPS_S: [i64; 24] = [
    10, 15, 30, 60, 120, 300, 600, 900, 1800, 3600, 7200, 10800, 21600, 43200, 86400, 172800,
    345600, 604800, 1209600, 2419200, 4838400, 9676800, 19353600, 38707200,
];

/// Ticks for a UTC time axis whose coordinate is seconds since `origin` over `[lo_s, hi_s]`:
/// whole multiples of a round step in UTC (minutes, hours, days), at most `max_ticks` of them.
/// Returns the step (s) and tick positions (s since `origin`).
pub fn time_ticks(
    origin: &DateTime<Utc>,
    lo_s: f64,
    hi_s: f64,
    max_ticks: usize,
) -> (i64, Vec<f64>) {
    let span = (hi_s - lo_s).max(1.0);
    let step = TIME_STEPS_S
        .iter()
        .copied()
        .find(|&s| span / s as f64 <= max_ticks.max(2) as f64)
        .unwrap_or(*TIME_STEPS_S.last().unwrap_or(&86400));
    let origin_us = origin.timestamp_micros();
    let step_us = step * 1_000_000;
    let lo_us = origin_us + (lo_s * 1e6).ceil() as i64;
    let hi_us = origin_us + (hi_s * 1e6).floor() as i64;
    let mut t = lo_us.div_euclid(step_us) * step_us;
    if t < lo_us {
        t += step_us;
    }
    let mut ticks = Vec::new();
    while t <= hi_us && ticks.len() <= 4 * max_ticks.max(2) {
        ticks.push((t - origin_us) as f64 * 1e-6);
        t += step_us;
    }
    (step, ticks)
}

/// Label of a time tick (seconds since `origin`), `HH:MM` or `HH:MM:SS` for sub-minute steps,
/// `MM-DD HH:MM` or `YYYY-MM-DD` for multi-day axes.
pub fn time_label(origin: &DateTime<Utc>, t_s: f64, step_s: i64, multi_day: bool) -> String {
    let t = crate::timefmt::add_seconds(origin, t_s);
    if step_s >= 86400 {
        t.format("%Y-%m-%d").to_string()
    } else if multi_day {
        t.format("%m-%d %H:%M").to_string()
    } else if step_s < 60 {
        t.format("%H:%M:%S").to_string()
    } else {
        t.format("%H:%M").to_string()
    }
}

pub(crate) use crate::report::slug;

#[cfg(test)]
mod tests {
    use super::*;

    /// Every dashed series key shows a gap on each side of the marker drawn at its centre (a
    /// marker of size 6 covers 7 px each side): with the pattern started at the left end, the
    /// 16/7 and 24/5 keys hid their one gap under the marker.
    #[test]
    fn dashed_keys_show_gaps_beside_the_marker() {
        let (x0, x1) = (8, 52);
        let c = (x0 + x1) / 2;
        for i in 0..15 {
            let Some((on, off)) = Stroke::series(i, 2).dash else {
                continue;
            };
            let d = key_dashes(x0, x1, on, off);
            let drawn = |x: i32| d.iter().any(|&(a, e)| a <= x && x < e);
            assert!(drawn(c), "series {i}: a dash at the centre");
            assert!((x0..c - 7).any(|x| !drawn(x)), "series {i}: {d:?}");
            assert!((c + 7..x1).any(|x| !drawn(x)), "series {i}: {d:?}");
            assert!(d.iter().all(|&(a, e)| x0 <= a && a < e && e <= x1), "{d:?}");
        }
    }

    #[test]
    fn slug_cleans_names() {
        assert_eq!(slug("Sierra Baja"), "sierra-baja");
        assert_eq!(slug("  Ñu / Station 2 "), "ñu-station-2");
        assert_eq!(slug("***"), "unnamed");
    }

    #[test]
    fn time_ticks_are_round_utc() {
        let aos = crate::timefmt::utc(2026, 12, 2, 1, 23, 17);
        let (step, ticks) = time_ticks(&aos, 0.0, 600.0, 12);
        assert_eq!(step, 60);
        // first whole minute after 01:23:17 is 01:24:00, 43 s after AOS
        assert_eq!(ticks[0], 43.0);
        assert_eq!(ticks.len(), 10);
        assert_eq!(time_label(&aos, ticks[0], step, false), "01:24");
    }

    #[test]
    fn long_windows_get_few_date_ticks() {
        let start = crate::timefmt::utc(2026, 12, 1, 12, 0, 0);
        for days in [30.0, 365.0, 3660.0] {
            let (step, ticks) = time_ticks(&start, 0.0, days * 86400.0, 10);
            assert!(
                step >= 86400 && ticks.len() <= 12,
                "{days} d: {step} s, {ticks:?}"
            );
        }
        // 30 days: a tick every 4 days
        assert_eq!(time_ticks(&start, 0.0, 30.0 * 86400.0, 10).0, 345600);
    }

    #[test]
    fn ranges_survive_nan_and_single_values() {
        assert_eq!(finite_range([f64::NAN], 0.0, 1.0, (0.0, 1.0)), (0.0, 1.0));
        let (lo, hi) = finite_range([5.0, f64::INFINITY], 0.0, 2.0, (0.0, 1.0));
        assert_eq!((lo, hi), (4.0, 6.0));
    }
}

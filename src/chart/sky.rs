//! Sky chart: a polar plot of the station's sky. Azimuth runs clockwise with north at the top and
//! east to the right (the view of an observer looking up, drawn as a map); elevation is 90° at the
//! centre and 0° at the rim, linear in elevation. The horizon mask (the larger of the station's
//! minimum elevation and its azimuth-dependent mask) is filled from the rim inward. Each pass
//! track is drawn in segments whose look follows the clear-sky margin bin, at the pass's fixed
//! rate, of the segment's first point: margin at least the required margin – NAVY, solid; between
//! 0 and the required margin – AMBER, long dashes; below 0 – PLUM, short dashes; no budget –
//! SLATE, thin dots (in the legend only when a track has such a point). AOS, TCA and LOS carry a
//! circle, a diamond and a square; each track carries its pass number in a box placed clear of
//! every track and marker, and the table beside the sky lists each number with its AOS, TCA,
//! maximum elevation, LOS and rate (no time labels on the sky, so none collide or get clipped at
//! the rim).

use plotters::coord::{CoordTranslate, Shift};
use plotters::prelude::*;
use plotters::style::text_anchor::{HPos, Pos, VPos};

use super::data::{SkyChartData, SkyPoint};
use super::style::{self, stroke_line, Key, MarkerShape, Stroke};
use super::types::{ChartError, Plot, SKY_SIZE};

const TITLE_H: u32 = 96;
/// Width of the column beside the sky: the pass table and the legend.
const TABLE_W: u32 = 500;
/// Plot extent in units of the rim radius (room for azimuth labels).
const EXTENT: f64 = 1.13;

/// Margin bins of a track point.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
enum Bin {
    Fails,
    Marginal,
    Met,
    NoData,
    /// The antenna cannot follow the satellite here (mount limits), or the followed stretch is
    /// too short to lock: nothing counts, whatever the margin.
    Untracked,
}

fn bin(q: &SkyPoint, required_db: f64) -> Bin {
    if !q.tracked {
        return Bin::Untracked;
    }
    match q.margin_db {
        Some(m) if m.is_finite() => {
            if m < 0.0 {
                Bin::Fails
            } else if m < required_db {
                Bin::Marginal
            } else {
                Bin::Met
            }
        }
        _ => Bin::NoData,
    }
}

fn bin_stroke(b: Bin) -> Stroke {
    match b {
        Bin::Met => Stroke::solid(style::NAVY, 4),
        Bin::Marginal => Stroke::dashed(style::AMBER, 4, 14, 6),
        Bin::Fails => Stroke::dashed(style::PLUM, 4, 4, 5),
        Bin::NoData => Stroke::dashed(style::SLATE, 2, 2, 6),
        Bin::Untracked => Stroke::dashed(style::GREEN, 6, 6, 3),
    }
}

/// The pieces of a track to draw, each in one look: split where a point has no position (the
/// track breaks there instead of joining its neighbours across the sky), then where the look
/// changes (a run ends on the first point of the next, so the track stays whole).
fn track_runs(points: &[SkyPoint], req: f64) -> Vec<(Bin, Vec<(f64, f64)>)> {
    let placed = |q: &SkyPoint| q.azimuth_deg.is_finite() && q.elevation_deg.is_finite();
    let mut out = Vec::new();
    for piece in points.split(|q| !placed(q)) {
        let mut i = 0;
        while i + 1 < piece.len() {
            let b = bin(&piece[i], req);
            let mut j = i + 1;
            while j + 1 < piece.len() && bin(&piece[j], req) == b {
                j += 1;
            }
            let run = piece[i..=j]
                .iter()
                .map(|q| xy(q.azimuth_deg, q.elevation_deg))
                .collect();
            out.push((b, run));
            i = j;
        }
    }
    out
}

/// Plot position of a look direction: radius (90 - el) / 90, north up, east right.
fn xy(azimuth_deg: f64, elevation_deg: f64) -> (f64, f64) {
    let r = ((90.0 - elevation_deg) / 90.0).clamp(0.0, 1.0);
    let a = azimuth_deg.to_radians();
    (r * a.sin(), r * a.cos())
}

/// Horizon mask elevation at `azimuth_deg`: linear between points, wrapping at 360, at least
/// `min_deg`. Non-finite points are ignored.
fn mask_at(points: &[[f64; 2]], min_deg: f64, azimuth_deg: f64) -> f64 {
    let floor = if min_deg.is_finite() { min_deg } else { 0.0 };
    let mut pts: Vec<(f64, f64)> = points
        .iter()
        .filter(|p| p[0].is_finite() && p[1].is_finite())
        .map(|p| (p[0].rem_euclid(360.0), p[1]))
        .collect();
    if pts.is_empty() {
        return floor;
    }
    pts.sort_by(|a, b| a.0.total_cmp(&b.0));
    let az = azimuth_deg.rem_euclid(360.0);
    let n = pts.len();
    // neighbour below (wrapping) and above (wrapping)
    let idx = pts.partition_point(|p| p.0 <= az);
    let (lo, hi) = if idx == 0 {
        ((pts[n - 1].0 - 360.0, pts[n - 1].1), pts[0])
    } else if idx == n {
        (pts[n - 1], (pts[0].0 + 360.0, pts[0].1))
    } else {
        (pts[idx - 1], pts[idx])
    };
    let span = hi.0 - lo.0;
    let el = if span <= 0.0 {
        lo.1
    } else {
        lo.1 + (hi.1 - lo.1) * (az - lo.0) / span
    };
    el.max(floor)
}

impl Plot for SkyChartData {
    const NAME: &'static str = "sky";

    fn warnings(&self) -> &[String] {
        &self.warnings
    }
    fn size(&self) -> (u32, u32) {
        SKY_SIZE
    }

    fn plot<DB: DrawingBackend>(&self, root: &DrawingArea<DB, Shift>) -> Result<(), ChartError>
    where
        DB::ErrorType: 'static,
    {
        plot_sky(self, root)
    }
}

/// A label's box in pixels: (x0, y0, x1, y1).
type PxBox = (i32, i32, i32, i32);

fn overlaps(a: PxBox, b: PxBox) -> bool {
    a.0 < b.2 && b.0 < a.2 && a.1 < b.3 && b.1 < a.3
}

/// Place a `tw` x `th` label near `at`: the first of the candidate positions around it (nearest
/// first, in rings of growing distance) that stays inside `bounds` and covers no track point, no
/// marker and no label already placed; else the candidate that covers the fewest.
fn place_label(
    at: (i32, i32),
    (tw, th): (i32, i32),
    bounds: PxBox,
    track_px: &[(i32, i32)],
    placed: &[PxBox],
) -> PxBox {
    let mut best: Option<(usize, PxBox)> = None;
    for dist in [14, 26, 40, 56, 76] {
        for k in 0..16 {
            let a = std::f64::consts::PI * k as f64 / 8.0;
            let (cx, cy) = (
                at.0 + (dist as f64 * a.cos()) as i32,
                at.1 - (dist as f64 * a.sin()) as i32,
            );
            // the box's nearest corner or edge sits at the candidate point
            let x0 = if a.cos() > 0.3 {
                cx
            } else if a.cos() < -0.3 {
                cx - tw
            } else {
                cx - tw / 2
            };
            let y0 = if a.sin() > 0.3 {
                cy - th
            } else if a.sin() < -0.3 {
                cy
            } else {
                cy - th / 2
            };
            let b = (x0, y0, x0 + tw, y0 + th);
            if b.0 < bounds.0 || b.1 < bounds.1 || b.2 > bounds.2 || b.3 > bounds.3 {
                continue;
            }
            let grown = (b.0 - 3, b.1 - 3, b.2 + 3, b.3 + 3);
            let hits = track_px
                .iter()
                .filter(|p| p.0 >= grown.0 && p.0 <= grown.2 && p.1 >= grown.1 && p.1 <= grown.3)
                .count()
                + 1000 * placed.iter().filter(|p| overlaps(grown, **p)).count();
            if hits == 0 {
                return b;
            }
            if best.is_none_or(|(h, _)| hits < h) {
                best = Some((hits, b));
            }
        }
    }
    best.map(|(_, b)| b)
        .unwrap_or((at.0 + 10, at.1 - th / 2, at.0 + 10 + tw, at.1 + th / 2))
}

/// Elevations of the sky chart's rings, deg (the last, 0°, is the rim).
const RING_ELEVATIONS_DEG: [f64; 6] = [75.0, 60.0, 45.0, 30.0, 15.0, 0.0];

/// Where a ring's label hangs from its point on the ring at azimuth `az_deg`: always on the
/// outer side of the ring (right and up in the north-east quarter, left and down in the
/// south-west), so that it reads as that ring's label.
fn ring_label_anchor(az_deg: f64) -> (HPos, VPos) {
    let a = az_deg.to_radians();
    let h = if a.sin() >= 0.0 {
        HPos::Left
    } else {
        HPos::Right
    };
    let v = if a.cos() >= 0.0 {
        VPos::Bottom
    } else {
        VPos::Top
    };
    (h, v)
}

/// Gap (pixels, in x and in y) between a ring's point and its label's corner, so that the label
/// clears the ring's line (the rim is 2 px wide).
const RING_LABEL_GAP_PX: i32 = 3;

/// The anchor point (pixels) of a label hung from `at` as [`ring_label_anchor`] says, moved away
/// from the ring by [`RING_LABEL_GAP_PX`].
fn label_anchor_px(at: (i32, i32), (h, v): (HPos, VPos)) -> (i32, i32) {
    let gx = if matches!(h, HPos::Left) { 1 } else { -1 };
    let gy = if matches!(v, VPos::Bottom) { -1 } else { 1 };
    (at.0 + gx * RING_LABEL_GAP_PX, at.1 + gy * RING_LABEL_GAP_PX)
}

/// The box (pixels) of a `tw` x `th` label hung from `at` ([`label_anchor_px`]).
fn anchored_box(at: (i32, i32), (tw, th): (i32, i32), (h, v): (HPos, VPos)) -> PxBox {
    let p = label_anchor_px(at, (h, v));
    let x0 = if matches!(h, HPos::Left) {
        p.0
    } else {
        p.0 - tw
    };
    let y0 = if matches!(v, VPos::Bottom) {
        p.1 - th
    } else {
        p.1
    };
    (x0, y0, x0 + tw, y0 + th)
}

/// The azimuth (deg) along which to label the elevation rings: of the azimuths halfway between
/// two spokes (15°, 45°, ... 345°), the first whose label boxes (`boxes_at`, grown by 3 px) cover
/// the fewest track pixels and markers, a marker counting as 1,000 track pixels (as
/// [`place_label`] counts them).
fn ring_label_azimuth_deg(
    boxes_at: &dyn Fn(f64) -> Vec<PxBox>,
    track_px: &[(i32, i32)],
    placed: &[PxBox],
) -> f64 {
    let cost = |az: f64| {
        boxes_at(az)
            .iter()
            .map(|b| {
                let grown = (b.0 - 3, b.1 - 3, b.2 + 3, b.3 + 3);
                let on_tracks = track_px
                    .iter()
                    .filter(|p| {
                        p.0 >= grown.0 && p.0 <= grown.2 && p.1 >= grown.1 && p.1 <= grown.3
                    })
                    .count();
                on_tracks + 1000 * placed.iter().filter(|p| overlaps(grown, **p)).count()
            })
            .sum::<usize>()
    };
    (0..12)
        .map(|k| 15.0 + 30.0 * k as f64)
        .min_by_key(|&az| cost(az))
        .unwrap_or(15.0)
}

/// Points every few pixels along a polyline (pixels), so a label box between two samples of a
/// track still sees the track.
fn densify(px: &[(i32, i32)], out: &mut Vec<(i32, i32)>) {
    for w in px.windows(2) {
        let (a, b) = (w[0], w[1]);
        let n = ((b.0 - a.0).abs().max((b.1 - a.1).abs()) / 3).max(1);
        for k in 0..n {
            out.push((a.0 + (b.0 - a.0) * k / n, a.1 + (b.1 - a.1) * k / n));
        }
    }
    out.extend(px.last());
}

fn plot_sky<DB: DrawingBackend>(
    d: &SkyChartData,
    root: &DrawingArea<DB, Shift>,
) -> Result<(), ChartError>
where
    DB::ErrorType: 'static,
{
    root.fill(&WHITE)?;
    let (w, h) = root.dim_in_pixel();
    let (title, rest) = root.split_vertically(TITLE_H);
    let polar_side = (h - TITLE_H).min(w.saturating_sub(TABLE_W));
    let (polar, side) = rest.split_horizontally(polar_side);
    title.draw(&Text::new(
        format!("{} over {} · {}", d.satellite, d.station, d.title_date),
        (24, 16),
        style::title_font(),
    ))?;
    let req = if d.required_margin_db.is_finite() {
        d.required_margin_db
    } else {
        0.0
    };
    title.draw(&Text::new(
        format!(
            "Sky track · {} pass{} · required margin {req:.1} dB · minimum elevation {}",
            d.passes.len(),
            if d.passes.len() == 1 { "" } else { "es" },
            style::deg_or_na(d.min_elevation_deg),
        ),
        (24, 56),
        style::label_font(),
    ))?;

    let mut chart = ChartBuilder::on(&polar)
        .margin(4)
        .build_cartesian_2d(-EXTENT..EXTENT, -EXTENT..EXTENT)?;

    // Horizon mask: one polygon from the rim (r = 1) around, then back along the mask line.
    let mask_line: Vec<(f64, f64)> = (0..=360)
        .map(|a| {
            let az = a as f64;
            xy(az, mask_at(&d.horizon_mask, d.min_elevation_deg, az))
        })
        .collect();
    let mut poly: Vec<(f64, f64)> = (0..=360).map(|a| xy(a as f64, 0.0)).collect();
    poly.extend(mask_line.iter().rev().copied());
    chart.draw_series(std::iter::once(Polygon::new(poly, style::TERRAIN.filled())))?;
    stroke_line!(
        chart,
        draw_series,
        mask_line,
        Stroke::solid(style::TERRAIN_EDGE, 2)
    );

    // Elevation rings every 15° (labelled once the tracks are drawn); the rim is the 0° horizon.
    for el in RING_ELEVATIONS_DEG {
        let ring: Vec<(f64, f64)> = (0..=360).map(|a| xy(a as f64, el)).collect();
        let s = if el == 0.0 {
            Stroke::solid(style::INK, 2)
        } else {
            Stroke::solid(style::GRID, 1)
        };
        stroke_line!(chart, draw_series, ring, s);
    }
    // Azimuth spokes every 30°, labelled outside the rim.
    for k in 0..12 {
        let az = k as f64 * 30.0;
        stroke_line!(
            chart,
            draw_series,
            vec![(0.0, 0.0), xy(az, 0.0)],
            Stroke::solid(style::GRID, 1)
        );
        let (label, font) = match k {
            0 => ("N".to_string(), style::label_font()),
            3 => ("E".to_string(), style::label_font()),
            6 => ("S".to_string(), style::label_font()),
            9 => ("W".to_string(), style::label_font()),
            _ => (format!("{az:.0}°"), style::tick_font()),
        };
        let a = az.to_radians();
        let r = 1.065;
        chart.draw_series(std::iter::once(Text::new(
            label,
            (r * a.sin(), r * a.cos()),
            font.pos(Pos::new(HPos::Center, VPos::Center)),
        )))?;
    }
    chart.draw_series(std::iter::once(Text::new(
        "elevation rings every 15°".to_string(),
        (-EXTENT + 0.01, -EXTENT + 0.01),
        style::note_font(style::MUTED).pos(Pos::new(HPos::Left, VPos::Bottom)),
    )))?;

    if d.passes.is_empty() {
        chart.draw_series(std::iter::once(Text::new(
            "no passes to show".to_string(),
            (0.0, 0.0),
            style::title_font().pos(Pos::new(HPos::Center, VPos::Center)),
        )))?;
    }

    // Tracks, in runs of equal margin bin, then their markers; the pixels of both are kept so
    // that the labels placed afterwards avoid every track.
    let plot_area = chart.plotting_area().strip_coord_spec();
    let spec = chart.as_coord_spec().clone();
    let mut track_px: Vec<(i32, i32)> = Vec::new();
    let mut placed: Vec<PxBox> = Vec::new();
    let mut tops: Vec<(usize, (i32, i32))> = Vec::new();
    let (mut no_budget, mut untracked) = (false, false);
    for (n, p) in d.passes.iter().enumerate() {
        let pts: Vec<_> = p
            .points
            .iter()
            .filter(|q| q.azimuth_deg.is_finite() && q.elevation_deg.is_finite())
            .collect();
        no_budget |= pts.iter().any(|q| bin(q, req) == Bin::NoData);
        untracked |= pts.iter().any(|q| bin(q, req) == Bin::Untracked);
        let px_of = |q: &SkyPoint| {
            style::rel(
                &plot_area,
                spec.translate(&xy(q.azimuth_deg, q.elevation_deg)),
            )
        };
        let px: Vec<(i32, i32)> = pts.iter().map(|q| px_of(q)).collect();
        densify(&px, &mut track_px);
        for (b, run) in track_runs(&p.points, req) {
            stroke_line!(chart, draw_series, run, bin_stroke(b));
        }
        let Some(&first) = pts.first() else { continue };
        let last = pts[pts.len() - 1];
        let top = pts
            .iter()
            .copied()
            .max_by(|a, b| a.elevation_deg.total_cmp(&b.elevation_deg))
            .unwrap_or(first);
        let marks = [
            (first, MarkerShape::Circle),
            (top, MarkerShape::Diamond),
            (last, MarkerShape::Square),
        ];
        for (k, (q, shape)) in marks.into_iter().enumerate() {
            if k == 2 && pts.len() == 1 {
                break;
            }
            let at = px_of(q);
            let color = bin_stroke(bin(q, req)).color;
            style::draw_marker(&plot_area, shape, at, 7, color)?;
            placed.push((at.0 - 9, at.1 - 9, at.0 + 9, at.1 + 9));
        }
        tops.push((n, px_of(top)));
    }

    // The rings' labels, along the azimuth between two spokes where they cover the fewest track
    // pixels and markers (15° when that is clear, as before), each outside its ring.
    let f = style::note_font(style::MUTED);
    let mut ring_labels = Vec::with_capacity(RING_ELEVATIONS_DEG.len());
    for el in RING_ELEVATIONS_DEG {
        let text = format!("{el:.0}°");
        let (tw, th) = plot_area.estimate_text_size(&text, &f)?;
        ring_labels.push((el, text, (tw as i32, th as i32)));
    }
    let boxes_at = |az: f64| -> Vec<PxBox> {
        ring_labels
            .iter()
            .map(|(el, _, size)| {
                let at = style::rel(&plot_area, spec.translate(&xy(az, *el)));
                anchored_box(at, *size, ring_label_anchor(az))
            })
            .collect()
    };
    let az = ring_label_azimuth_deg(&boxes_at, &track_px, &placed);
    let (h, v) = ring_label_anchor(az);
    for ((el, text, _), b) in ring_labels.iter().zip(boxes_at(az)) {
        let at = style::rel(&plot_area, spec.translate(&xy(az, *el)));
        plot_area.draw(&Text::new(
            text.clone(),
            label_anchor_px(at, (h, v)),
            f.clone().pos(Pos::new(h, v)),
        ))?;
        placed.push(b);
    }

    // Track labels (the pass number), beside the highest point, clear of every track.
    let (aw, ah) = plot_area.dim_in_pixel();
    let bounds = (0, 0, aw as i32, ah as i32);
    let font = style::label_font();
    for (n, at) in tops {
        let text = d.passes[n].label.clone();
        let (tw, th) = plot_area.estimate_text_size(&text, &font)?;
        let b = place_label(
            at,
            (tw as i32 + 8, th as i32 + 4),
            bounds,
            &track_px,
            &placed,
        );
        placed.push(b);
        plot_area.draw(&Rectangle::new([(b.0, b.1), (b.2, b.3)], WHITE.filled()))?;
        plot_area.draw(&Rectangle::new(
            [(b.0, b.1), (b.2, b.3)],
            ShapeStyle {
                color: style::INK.to_rgba(),
                filled: false,
                stroke_width: 1,
            },
        ))?;
        plot_area.draw(&Text::new(
            text,
            ((b.0 + b.2) / 2, (b.1 + b.3) / 2),
            font.clone().pos(Pos::new(HPos::Center, VPos::Center)),
        ))?;
    }

    let table_h = pass_table(d, &side.margin(20, 0, 10, 10))?;
    let mut entries: Vec<(Key, String)> = vec![
        (
            Key::Line(bin_stroke(Bin::Met)),
            format!("margin ≥ {req:.1} dB"),
        ),
        (
            Key::Line(bin_stroke(Bin::Marginal)),
            format!("margin 0 to {req:.1} dB"),
        ),
        (Key::Line(bin_stroke(Bin::Fails)), "margin < 0 dB".into()),
    ];
    if no_budget {
        entries.push((Key::Line(bin_stroke(Bin::NoData)), "no budget".into()));
    }
    if untracked {
        entries.push((
            Key::Line(bin_stroke(Bin::Untracked)),
            "antenna cannot follow,\nor too short to lock".into(),
        ));
    }
    if d.passes.iter().any(|p| p.rate_bps.is_none()) {
        entries.push((
            Key::Blank,
            "\"none closes\": margin at the\nlowest-threshold rate".into(),
        ));
    }
    entries.extend([
        (Key::Band(style::TERRAIN, 1.0), "below horizon mask".into()),
        (Key::Blank, "AOS ●   TCA ◆   LOS ■".into()),
    ]);
    let legend = side.margin(table_h as u32 + 40, 0, 10, 10);
    style::draw_legend(
        &legend,
        Some("Clear-sky margin at the pass's rate"),
        &entries,
    )
}

/// The table beside the sky: one row per pass (label, AOS, TCA with the maximum elevation, LOS,
/// the fixed rate whose margin colours the track). Returns the height it took, pixels.
fn pass_table<DB: DrawingBackend>(
    d: &SkyChartData,
    area: &DrawingArea<DB, Shift>,
) -> Result<i32, ChartError>
where
    DB::ErrorType: 'static,
{
    // columns: x offset of each column's left edge (pixels)
    const COLS: [i32; 6] = [0, 44, 134, 224, 292, 382];
    let row_h = 24;
    let font = style::note_font(style::INK);
    let head = style::note_font(style::MUTED);
    area.draw(&Text::new("Passes (UTC)", (0, 0), style::label_font()))?;
    let mut y = 34;
    for (x, t) in COLS
        .iter()
        .zip(["#", "AOS", "TCA", "max el", "LOS", "rate"])
    {
        area.draw(&Text::new(t.to_string(), (*x, y), head.clone()))?;
    }
    y += row_h;
    let (_, ah) = area.dim_in_pixel();
    // room for the legend below (about 8 entries)
    let max_rows = ((ah as i32 - y - 260) / row_h).max(1) as usize;
    let shown = if d.passes.len() > max_rows {
        max_rows - 1
    } else {
        d.passes.len()
    };
    for p in &d.passes[..shown] {
        let rate = p
            .rate_bps
            .map(style::format_rate)
            .unwrap_or_else(|| "none closes".into());
        let cells = [
            p.label.clone(),
            p.aos.format("%H:%M:%S").to_string(),
            p.tca.format("%H:%M:%S").to_string(),
            style::deg_or_na(p.max_elevation_deg),
            p.los.format("%H:%M:%S").to_string(),
            rate,
        ];
        for (x, t) in COLS.iter().zip(cells) {
            area.draw(&Text::new(t, (*x, y), font.clone()))?;
        }
        y += row_h;
    }
    if shown < d.passes.len() {
        area.draw(&Text::new(
            format!("… and {} more (see summary.csv)", d.passes.len() - shown),
            (0, y),
            head,
        ))?;
        y += row_h;
    }
    Ok(y)
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn ring_labels_move_off_the_tracks() {
        // boxes 30 px wide at 100 px from the centre along the azimuth (north up, east right)
        let boxes_at = |az: f64| -> Vec<PxBox> {
            let a = az.to_radians();
            let (x, y) = (
                500 + (100.0 * a.sin()) as i32,
                500 - (100.0 * a.cos()) as i32,
            );
            vec![(x, y - 12, x + 30, y)]
        };
        // nothing in the way: 15°, as before
        assert_eq!(ring_label_azimuth_deg(&boxes_at, &[], &[]), 15.0);
        // a track through the 15° box: the next clear one, 45°
        let (x, y) = (500 + 26, 500 - 97);
        let track: Vec<(i32, i32)> = (0..30).map(|i| (x + i, y - 6)).collect();
        assert_eq!(ring_label_azimuth_deg(&boxes_at, &track, &[]), 45.0);
        // a track through 15° and a marker at 45°: 75°
        // (the boxes here hang right and up, as the chart's do in the north-east quarter)
        let a = 45f64.to_radians();
        let (mx, my) = (
            500 + (100.0 * a.sin()) as i32,
            500 - (100.0 * a.cos()) as i32,
        );
        let marker = [(mx, my - 10, mx + 10, my)];
        assert_eq!(ring_label_azimuth_deg(&boxes_at, &track, &marker), 75.0);
    }

    #[test]
    fn ring_labels_hang_outside_their_ring() {
        // pixel y grows downwards; the chart's centre is up-left of a north-east point
        let size = (30, 12);
        // (3 px clear of the ring's point in x and in y)
        let ne = anchored_box((600, 400), size, ring_label_anchor(15.0));
        assert_eq!(ne, (603, 385, 633, 397));
        let sw = anchored_box((400, 600), size, ring_label_anchor(195.0));
        assert_eq!(sw, (367, 603, 397, 615));
        let se = anchored_box((600, 600), size, ring_label_anchor(135.0));
        assert_eq!(se, (603, 603, 633, 615));
        let nw = anchored_box((400, 400), size, ring_label_anchor(315.0));
        assert_eq!(nw, (367, 385, 397, 397));
    }

    #[test]
    fn mask_interpolates_and_wraps() {
        let m = [[350.0, 10.0], [10.0, 20.0], [90.0, 4.0]];
        assert!((mask_at(&m, 0.0, 0.0) - 15.0).abs() < 1e-9);
        assert!((mask_at(&m, 0.0, 50.0) - 12.0).abs() < 1e-9);
        assert!((mask_at(&m, 5.0, 90.0) - 5.0).abs() < 1e-9);
        assert_eq!(mask_at(&[], 3.0, 123.0), 3.0);
    }

    #[test]
    fn polar_orientation() {
        let (x, y) = xy(90.0, 0.0); // east on the rim, right
        assert!((x - 1.0).abs() < 1e-12 && y.abs() < 1e-12);
        let (x, y) = xy(0.0, 45.0); // north, half-way, up
        assert!(x.abs() < 1e-12 && (y - 0.5).abs() < 1e-12);
    }

    #[test]
    fn bins() {
        let at = |margin_db: Option<f64>, tracked: bool| SkyPoint {
            azimuth_deg: 0.0,
            elevation_deg: 45.0,
            margin_db,
            tracked,
        };
        assert_eq!(bin(&at(Some(-0.1), true), 3.0), Bin::Fails);
        assert_eq!(bin(&at(Some(1.0), true), 3.0), Bin::Marginal);
        assert_eq!(bin(&at(Some(3.0), true), 3.0), Bin::Met);
        assert_eq!(bin(&at(None, true), 3.0), Bin::NoData);
        assert_eq!(bin(&at(Some(f64::NAN), true), 3.0), Bin::NoData);
        assert_eq!(bin(&at(Some(9.0), false), 3.0), Bin::Untracked);
    }

    /// A track breaks at a point of no position and a lone point between two such draws
    /// nothing; a change of look starts a run on the point where the last one ends.
    #[test]
    fn track_runs_break_at_points_of_no_position() {
        let at = |az: f64, margin_db: f64| SkyPoint {
            azimuth_deg: az,
            elevation_deg: 30.0,
            margin_db: Some(margin_db),
            tracked: true,
        };
        let pts = [
            at(10.0, 5.0),
            at(20.0, 5.0),
            at(30.0, 1.0),
            at(f64::NAN, 5.0),
            at(50.0, 5.0),
            at(f64::NAN, 5.0),
            at(70.0, 5.0),
            at(80.0, 5.0),
        ];
        let runs = track_runs(&pts, 3.0);
        let looks: Vec<(Bin, usize)> = runs.iter().map(|(b, r)| (*b, r.len())).collect();
        assert_eq!(
            looks,
            [(Bin::Met, 3), (Bin::Met, 2)],
            "10-30 deg (the marginal end shares the run), then 70-80"
        );
        assert!(runs.iter().flat_map(|(_, r)| r).all(|p| p.0.is_finite()));
        assert_eq!(runs[0].1[0], xy(10.0, 30.0));
        assert_eq!(runs[1].1[0], xy(70.0, 30.0));
    }
}

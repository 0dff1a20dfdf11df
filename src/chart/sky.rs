//! Sky chart: a polar plot of the station's sky. Azimuth runs clockwise with north at the top and
//! east to the right (the view of an observer looking up, drawn as a map); elevation is 90° at the
//! centre and 0° at the rim, linear in elevation. The horizon mask (the larger of the station's
//! minimum elevation and its azimuth-dependent mask) is filled from the rim inward. Each pass
//! track is drawn in segments whose look follows the margin bin of the segment's first point:
//! margin at least the required margin – NAVY, solid; between 0 and the required margin – AMBER,
//! long dashes; below 0 – PLUM, short dashes; no budget – SLATE, thin dots. AOS, TCA and LOS carry
//! a circle, a diamond and a square.

use plotters::coord::Shift;
use plotters::prelude::*;
use plotters::style::text_anchor::{HPos, Pos, VPos};

use super::data::SkyChartData;
use super::style::{self, stroke_line, Key, MarkerShape, Stroke};
use super::types::{ChartError, Plot, SKY_SIZE};

const TITLE_H: u32 = 96;
const LEGEND_H: u32 = 120;
/// Plot extent in units of the rim radius (room for azimuth labels).
const EXTENT: f64 = 1.13;

/// Margin bins of a track point.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
enum Bin {
    Fails,
    Marginal,
    Met,
    NoData,
}

fn bin(margin_db: Option<f64>, required_db: f64) -> Bin {
    match margin_db {
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
    }
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
    let (polar, legend) = rest.split_vertically(h - TITLE_H - LEGEND_H);
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

    let side = (h - TITLE_H - LEGEND_H).min(w);
    let pad = (w - side) / 2;
    let mut chart = ChartBuilder::on(&polar)
        .margin_left(pad)
        .margin_right(pad)
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

    // Elevation rings every 15°, labelled; the rim is the 0° horizon.
    let f = style::note_font(style::MUTED);
    for el in [75.0, 60.0, 45.0, 30.0, 15.0, 0.0] {
        let ring: Vec<(f64, f64)> = (0..=360).map(|a| xy(a as f64, el)).collect();
        let s = if el == 0.0 {
            Stroke::solid(style::INK, 2)
        } else {
            Stroke::solid(style::GRID, 1)
        };
        stroke_line!(chart, draw_series, ring, s);
        chart.draw_series(std::iter::once(Text::new(
            format!("{el:.0}°"),
            xy(15.0, el),
            f.clone().pos(Pos::new(HPos::Left, VPos::Bottom)),
        )))?;
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

    // Tracks, in runs of equal margin bin.
    let mut placed: Vec<(i32, i32, i32, i32)> = Vec::new();
    for p in &d.passes {
        let pts: Vec<_> = p
            .points
            .iter()
            .filter(|q| q.azimuth_deg.is_finite() && q.elevation_deg.is_finite())
            .collect();
        let mut i = 0;
        while i + 1 < pts.len() {
            let b = bin(pts[i].margin_db, req);
            let mut j = i + 1;
            while j + 1 < pts.len() && bin(pts[j].margin_db, req) == b {
                j += 1;
            }
            let run: Vec<(f64, f64)> = pts[i..=j]
                .iter()
                .map(|q| xy(q.azimuth_deg, q.elevation_deg))
                .collect();
            stroke_line!(chart, draw_series, run, bin_stroke(b));
            i = j;
        }
        let Some(&first) = pts.first() else { continue };
        let last = pts[pts.len() - 1];
        let top = pts
            .iter()
            .copied()
            .max_by(|a, b| a.elevation_deg.total_cmp(&b.elevation_deg))
            .unwrap_or(first);
        let plot_area = chart.plotting_area().strip_coord_spec();
        let marks = [
            (
                first,
                MarkerShape::Circle,
                format!("AOS {}", p.aos.format("%H:%M")),
            ),
            (
                top,
                MarkerShape::Diamond,
                format!("{} TCA {}", p.label, p.tca.format("%H:%M")),
            ),
            (
                last,
                MarkerShape::Square,
                format!("LOS {}", p.los.format("%H:%M")),
            ),
        ];
        for (k, (q, shape, text)) in marks.into_iter().enumerate() {
            if k == 2 && pts.len() == 1 {
                break;
            }
            let c = xy(q.azimuth_deg, q.elevation_deg);
            let px = style::rel(&plot_area, chart.backend_coord(&c));
            let color = bin_stroke(bin(q.margin_db, req)).color;
            style::draw_marker(&plot_area, shape, px, 7, color)?;
            // Text on the side towards the centre so it stays inside the rim; moved up or down
            // when it would cover a label already placed.
            let (dx, hpos) = if c.0 > 0.0 {
                (-12, HPos::Right)
            } else {
                (12, HPos::Left)
            };
            let base_dy: i32 = if c.1 > 0.0 { 12 } else { -12 };
            let tw = (text.chars().count() as f64 * style::NOTE_PX * 0.56) as i32;
            let th = style::NOTE_PX as i32 + 2;
            let boxes_at = |dy: i32| {
                let x0 = if dx < 0 { px.0 + dx - tw } else { px.0 + dx };
                let y0 = px.1 + dy - th / 2;
                (x0, y0, x0 + tw, y0 + th)
            };
            let free = |b: (i32, i32, i32, i32), placed: &[(i32, i32, i32, i32)]| {
                placed
                    .iter()
                    .all(|p| b.2 <= p.0 || p.2 <= b.0 || b.3 <= p.1 || p.3 <= b.1)
            };
            let dy = [0, 20, 40, 60, 80, -20]
                .iter()
                .map(|k| base_dy + k * base_dy.signum())
                .find(|&dy| free(boxes_at(dy), &placed))
                .unwrap_or(base_dy);
            let b = boxes_at(dy);
            placed.push(b);
            plot_area.draw(&Rectangle::new(
                [(b.0 - 2, b.1), (b.2 + 2, b.3)],
                WHITE.mix(0.8).filled(),
            ))?;
            let font = style::note_font(style::INK).pos(Pos::new(hpos, VPos::Center));
            plot_area.draw(&Text::new(text, (px.0 + dx, px.1 + dy), font))?;
        }
    }

    let cols = legend.split_evenly((1, 3));
    let entries: [Vec<(Key, String)>; 3] = [
        vec![
            (
                Key::Line(bin_stroke(Bin::Met)),
                format!("margin ≥ {req:.1} dB"),
            ),
            (
                Key::Line(bin_stroke(Bin::Marginal)),
                format!("margin 0 to {req:.1} dB"),
            ),
        ],
        vec![
            (Key::Line(bin_stroke(Bin::Fails)), "margin < 0 dB".into()),
            (Key::Line(bin_stroke(Bin::NoData)), "no budget".into()),
        ],
        vec![
            (Key::Band(style::TERRAIN, 1.0), "below horizon mask".into()),
            (Key::Blank, "AOS ●   TCA ◆   LOS ■".into()),
        ],
    ];
    for (col, e) in cols.iter().zip(entries.iter()) {
        let inner = col.margin(10, 0, 40, 0);
        style::draw_legend(&inner, None, e)?;
    }
    Ok(())
}

#[cfg(test)]
mod tests {
    use super::*;

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
        assert_eq!(bin(Some(-0.1), 3.0), Bin::Fails);
        assert_eq!(bin(Some(1.0), 3.0), Bin::Marginal);
        assert_eq!(bin(Some(3.0), 3.0), Bin::Met);
        assert_eq!(bin(None, 3.0), Bin::NoData);
        assert_eq!(bin(Some(f64::NAN), 3.0), Bin::NoData);
    }
}

//! Mask trade-off chart: contact time per day (top) and volume per day for each ladder rate
//! (bottom) against the elevation mask, with each station's configured mask marked in both panels
//! (one line per distinct value, named by its stations when they differ). A rate that never
//! closes lies on the zero line, and one whose volume stays below 3 % of the axis nearly so: their
//! legend entries say so (with the largest volume per day of the second kind).

use plotters::coord::Shift;
use plotters::prelude::*;
use plotters::style::text_anchor::{HPos, Pos, VPos};

use super::data::MaskChartData;
use super::style::{self, stroke_line, Key, MarkerShape, Stroke};
use super::types::{ChartError, Plot, MASK_SIZE};

const TITLE_H: u32 = 100;
const LEGEND_W: u32 = 330;
const Y_AXIS_W: u32 = 95;

/// Every series must have one value per mask.
pub(super) fn check(d: &MaskChartData) -> Result<(), ChartError> {
    let n = d.masks_deg.len();
    if d.contact_s_per_day.len() != n {
        return Err(ChartError::LengthMismatch {
            what: "contact_s_per_day".into(),
            expected: n,
            got: d.contact_s_per_day.len(),
        });
    }
    for r in &d.rates {
        if r.volume_bits_per_day.len() != n {
            return Err(ChartError::LengthMismatch {
                what: format!("volume_bits_per_day of '{}'", r.label),
                expected: n,
                got: r.volume_bits_per_day.len(),
            });
        }
    }
    Ok(())
}

impl Plot for MaskChartData {
    const NAME: &'static str = "mask";

    fn warnings(&self) -> &[String] {
        &self.warnings
    }
    fn size(&self) -> (u32, u32) {
        MASK_SIZE
    }

    fn plot<DB: DrawingBackend>(&self, root: &DrawingArea<DB, Shift>) -> Result<(), ChartError>
    where
        DB::ErrorType: 'static,
    {
        plot_mask(self, root)
    }
}

/// The distinct finite configured masks, rising.
fn mask_groups(masks: &[(String, f64)]) -> Vec<f64> {
    let mut v: Vec<f64> = masks
        .iter()
        .map(|(_, m)| *m)
        .filter(|m| m.is_finite())
        .collect();
    v.sort_by(f64::total_cmp);
    v.dedup();
    v
}

/// Indices of the points that get a marker: about every 5° (at most ~10 markers per line).
fn marker_indices(masks: &[f64]) -> Vec<usize> {
    let n = masks.len();
    if n <= 10 {
        return (0..n).collect();
    }
    let every = n.div_ceil(9);
    (0..n).filter(|i| i % every == 0).collect()
}

fn plot_mask<DB: DrawingBackend>(
    d: &MaskChartData,
    root: &DrawingArea<DB, Shift>,
) -> Result<(), ChartError>
where
    DB::ErrorType: 'static,
{
    root.fill(&WHITE)?;
    let (w, h) = root.dim_in_pixel();
    let (title, body) = root.split_vertically(TITLE_H);
    title.draw(&Text::new(
        format!("Elevation mask trade-off · {}", d.scope),
        (30, 18),
        style::title_font(),
    ))?;
    let groups = mask_groups(&d.configured_masks_deg);
    let configured = match groups.as_slice() {
        [] => "no configured mask".to_string(),
        [m] if d.configured_masks_deg.len() == 1 => {
            format!("configured mask {}", style::deg_or_na(*m))
        }
        [m] => format!("configured mask {} at every station", style::deg_or_na(*m)),
        _ => format!(
            "configured mask per station: {}",
            d.configured_masks_deg
                .iter()
                .map(|(s, m)| format!("{s} {}", style::deg_or_na(*m)))
                .collect::<Vec<_>>()
                .join(", ")
        ),
    };
    title.draw(&Text::new(
        format!("contact time and data volume per day above each mask · {configured}"),
        (30, 60),
        style::label_font(),
    ))?;
    if d.masks_deg.iter().all(|m| !m.is_finite()) {
        body.draw(&Text::new(
            "no mask values to plot".to_string(),
            (w as i32 / 2, (h - TITLE_H) as i32 / 2),
            style::title_font().pos(Pos::new(HPos::Center, VPos::Center)),
        ))?;
        return Ok(());
    }

    let (m_lo, m_hi) = {
        let (lo, hi) = style::finite_range(d.masks_deg.iter().copied(), 0.0, 1.0, (0.0, 40.0));
        (lo.min(0.0), hi)
    };
    let ticks: Vec<f64> = {
        let step = if m_hi - m_lo > 50.0 { 10.0 } else { 5.0 };
        let mut t = (m_lo / step).ceil() * step;
        let mut v = Vec::new();
        while t <= m_hi + 1e-9 {
            v.push(t);
            t += step;
        }
        v
    };
    let x_axis_h = 62;
    let panel_h = (h - TITLE_H - x_axis_h) / 2;
    let (top, bottom) = body.split_vertically(panel_h);
    let marks = marker_indices(&d.masks_deg);
    let cfg_stroke = Stroke::dashed(style::INK, 2, 10, 6);

    // Top: contact time.
    let max_s = style::zero_based_max(d.contact_s_per_day.iter().copied(), 0.0, 0.0);
    let (div, unit) = if max_s >= 2.0 * 3600.0 {
        (3600.0, "h")
    } else {
        (60.0, "min")
    };
    let y_hi = style::zero_based_max([max_s / div], 0.1, 1.0);
    {
        let (plot, legend) = top.split_horizontally(w - LEGEND_W);
        let mut chart = ChartBuilder::on(&plot)
            .margin_top(14)
            .margin_left(10)
            .x_label_area_size(8)
            .y_label_area_size(Y_AXIS_W)
            .margin_right(24)
            .build_cartesian_2d(style::TickAxis::new(m_lo, m_hi, ticks.clone()), 0.0..y_hi)?;
        chart
            .configure_mesh()
            .bold_line_style(style::GRID)
            .light_line_style(TRANSPARENT)
            .x_label_formatter(&|_| String::new())
            .y_label_formatter(&style::num_label)
            .y_desc(format!("Contact per day ({unit})"))
            .y_labels(6)
            .axis_desc_style(style::label_font())
            .label_style(style::tick_font())
            .draw()?;
        let s = Stroke::solid(style::SLATE, 3);
        let pts: Vec<(f64, f64)> = d
            .masks_deg
            .iter()
            .zip(&d.contact_s_per_day)
            .map(|(m, c)| (*m, c / div))
            .collect();
        stroke_line!(chart, draw_series, pts.clone(), s);
        let area = chart.plotting_area().strip_coord_spec();
        for &i in &marks {
            let p = pts[i];
            if p.0.is_finite() && p.1.is_finite() {
                let px = style::rel(&area, chart.backend_coord(&p));
                style::draw_marker(&area, MarkerShape::Circle, px, 5, style::SLATE)?;
            }
        }
        // One line per configured value, labelled with its stations when they differ; labels of
        // nearby lines step down so they do not overlap.
        for (k, m) in groups.iter().enumerate() {
            stroke_line!(chart, draw_series, vec![(*m, 0.0), (*m, y_hi)], cfg_stroke);
            // with several values, the subtitle names the stations of each
            let text = if groups.len() > 1 {
                format!(" {m:.1}°")
            } else {
                format!(" configured mask {m:.1}°")
            };
            chart.draw_series(std::iter::once(Text::new(
                text,
                (*m, y_hi * (1.0 - 0.09 * k as f64)),
                style::note_font(style::INK).pos(Pos::new(HPos::Left, VPos::Top)),
            )))?;
        }
        style::draw_legend(
            &legend,
            None,
            &[
                (
                    Key::LineMarker(s, MarkerShape::Circle),
                    "contact time above mask".into(),
                ),
                (Key::Line(cfg_stroke), "configured mask".into()),
            ],
        )?;
    }

    // Bottom: volume per day, one line per rate.
    let max_bits = d
        .rates
        .iter()
        .flat_map(|r| r.volume_bits_per_day.iter().copied())
        .filter(|v| v.is_finite())
        .fold(0.0f64, f64::max);
    let (vdiv, vunit) = style::volume_unit(max_bits);
    let v_hi = style::zero_based_max([max_bits / vdiv], 0.1, 1.0);
    let (plot, legend) = bottom.split_horizontally(w - LEGEND_W);
    let mut chart = ChartBuilder::on(&plot)
        .margin_top(14)
        .margin_left(10)
        .x_label_area_size(x_axis_h)
        .y_label_area_size(Y_AXIS_W)
        .margin_right(24)
        .build_cartesian_2d(style::TickAxis::new(m_lo, m_hi, ticks), 0.0..v_hi)?;
    chart
        .configure_mesh()
        .bold_line_style(style::GRID)
        .light_line_style(TRANSPARENT)
        .x_label_formatter(&|v| format!("{v:.0}°"))
        .y_label_formatter(&style::num_label)
        .x_desc("Elevation mask (deg)")
        .y_desc(format!("Volume per day ({vunit})"))
        .y_labels(6)
        .axis_desc_style(style::label_font())
        .label_style(style::tick_font())
        .draw()?;
    let mut keys = Vec::new();
    let area = chart.plotting_area().strip_coord_spec();
    for (i, r) in d.rates.iter().enumerate() {
        let s = Stroke::series(i, 3);
        let shape = MarkerShape::series(i);
        let pts: Vec<(f64, f64)> = d
            .masks_deg
            .iter()
            .zip(&r.volume_bits_per_day)
            .map(|(m, v)| (*m, v / vdiv))
            .collect();
        stroke_line!(chart, draw_series, pts.clone(), s);
        for &k in &marks {
            let p = pts[k];
            if p.0.is_finite() && p.1.is_finite() {
                let px = style::rel(&area, chart.backend_coord(&p));
                style::draw_marker(&area, shape, px, 5, s.color)?;
            }
        }
        // A rate that never closes, or brings too little to show at this scale, says so.
        let most = r
            .volume_bits_per_day
            .iter()
            .filter(|v| v.is_finite())
            .fold(0.0f64, |a, v| a.max(*v));
        let label = if most <= 0.0 {
            format!("{}\nnever closes (on the 0 line)", r.label)
        } else if most < 0.03 * max_bits {
            format!(
                "{}\n≤ {}/day, near the 0 line",
                r.label,
                style::format_volume(most)
            )
        } else {
            r.label.clone()
        };
        keys.push((Key::LineMarker(s, shape), label));
    }
    if d.rates.is_empty() {
        chart.draw_series(std::iter::once(Text::new(
            "no ladder rates".to_string(),
            ((m_lo + m_hi) / 2.0, v_hi / 2.0),
            style::label_font().pos(Pos::new(HPos::Center, VPos::Center)),
        )))?;
    }
    for m in &groups {
        stroke_line!(chart, draw_series, vec![(*m, 0.0), (*m, v_hi)], cfg_stroke);
    }
    keys.push((Key::Line(cfg_stroke), "configured mask".into()));
    style::draw_legend(&legend, Some("Fixed rate"), &keys)
}

//! Charts for operators, drawn with `plotters` into memory as PNG or SVG.
//!
//! * [`draw_pass`] – one pass: elevation and range, Eb/N0 against the required level with the
//!   adaptive rate, system noise temperature and atmospheric loss, on a shared UTC time axis.
//! * [`draw_sky`] – polar sky track of one station's passes over its horizon mask, coloured by
//!   margin.
//! * [`draw_mask`] – contact time and volume per day against the elevation mask.
//! * [`draw_summary`] – plan timeline (one bar per pass) and daily totals.
//!
//! Each `draw_*` returns the file bytes; each `save_*` writes them atomically with
//! [`crate::report::write_atomic`]. The module depends on chrono and std types only (see
//! [`data`]). Output is deterministic: the same input gives the same bytes. Drawing holds no
//! global state apart from the one-time, thread-safe registration of the bundled font, so charts
//! may be drawn in parallel.
//!
//! # Look
//!
//! Our own colour scheme (navy `#1c3d72`, amber `#e69520`, sky `#7fc3ea`, plum `#86306f`, slate
//! `#5d6670`) spreads over lightness as well as hue and keeps to the blue–orange axis, so it stays
//! readable for the common red–green colour-vision deficiencies; on top of colour, every series
//! has its own line pattern and marker shape, and bars have dark outlines, so the charts also work
//! in greyscale print. Titles are 30 px, axis labels 22 px, tick labels 18 px, notes 17 px.
//!
//! Text uses the bundled DejaVu Sans (`fonts/`, Bitstream Vera licence) through plotters'
//! `ab_glyph` renderer, so no system font library is needed; on PNG charts each glyph is
//! rasterised once per size and thread (`glyphs`: plotters' coverage, each glyph placed at its
//! side bearing, which plotters' own text path drops). PNG charts are drawn
//! straight into colour indices (`indexed`, with the pixels of plotters' RGB bitmap backend) and
//! stored as palette PNGs of their 256 most frequent colours.

pub mod contacts;
pub mod data;
mod glyphs;
mod indexed;
mod mask;
pub mod palette;
mod pass;
mod path;
pub mod plan;
mod scanline;
mod sky;
mod style;
mod summary;
mod types;

use std::path::Path;

use chrono::{DateTime, NaiveDate, Utc};
use plotters::prelude::*;

pub use data::*;
use types::Plot;
pub use types::{ChartError, MASK_SIZE, PASS_SIZE, SKY_SIZE, SUMMARY_SIZE};

/// Name the chart in a drawing error.
fn in_chart(chart: &'static str) -> impl Fn(ChartError) -> ChartError {
    move |e| match e {
        ChartError::Draw { message, .. } => ChartError::Draw { chart, message },
        other => other,
    }
}

thread_local! {
    /// Per drawing thread: the colour indices charts are drawn into, the palette indices encoded
    /// from them and the chart's colours, reused from chart to chart (a fresh buffer per chart
    /// costs its page faults on top of the fills).
    static BUFFERS: std::cell::RefCell<(Vec<u16>, Vec<u8>, indexed::Colours)> =
        std::cell::RefCell::new((Vec::new(), Vec::new(), indexed::Colours::new()));
}

/// Draw `chart` into memory and return the PNG or SVG bytes.
fn render<P: Plot>(chart: &P, format: ChartFormat) -> Result<Vec<u8>, ChartError> {
    style::ensure_font()?;
    let (w, h) = chart.size();
    match format {
        ChartFormat::Png => BUFFERS.with(|b| {
            // A chart drawn inside another's drawing (never done) would find the buffers taken.
            let mut own = (Vec::new(), Vec::new(), indexed::Colours::new());
            let mut taken = b.try_borrow_mut().ok();
            let (pixels, indices, colours) = match taken.as_deref_mut() {
                Some((p, i, c)) => (p, i, c),
                None => (&mut own.0, &mut own.1, &mut own.2),
            };
            pixels.resize(w as usize * h as usize, 0);
            colours.clear();
            {
                let bitmap = indexed::IndexedBitmap::new(pixels, colours, (w, h), (255, 255, 255));
                let root = glyphs::CachedText(bitmap).into_drawing_area();
                plot_with_caution(chart, &root).map_err(in_chart(P::NAME))?;
                root.present()
                    .map_err(ChartError::from)
                    .map_err(in_chart(P::NAME))?;
            }
            let palette = colours.build_palette(pixels, indices);
            encode_png(palette, indices, w, h)
        }),
        ChartFormat::Svg => {
            let mut svg = String::new();
            {
                let root = SVGBackend::with_string(&mut svg, (w, h)).into_drawing_area();
                plot_with_caution(chart, &root).map_err(in_chart(P::NAME))?;
                root.present()
                    .map_err(ChartError::from)
                    .map_err(in_chart(P::NAME))?;
            }
            Ok(svg.into_bytes())
        }
    }
}

/// A chart for [`draw_reference_png`].
#[doc(hidden)]
pub enum ReferenceChart<'a> {
    Pass(&'a PassChartData),
    Sky(&'a SkyChartData),
    Mask(&'a MaskChartData),
    Summary(&'a SummaryChartData),
}

/// The PNG of `chart` drawn the way the indexed backend ([`indexed`]) replaces: plotters' RGB
/// bitmap backend, then [`palette::quantize_into`]. The tests check that both give the same
/// bytes; not for use otherwise (twice the memory and time).
#[doc(hidden)]
pub fn draw_reference_png(chart: ReferenceChart<'_>) -> Result<Vec<u8>, ChartError> {
    match chart {
        ReferenceChart::Pass(c) => render_reference(c),
        ReferenceChart::Sky(c) => render_reference(c),
        ReferenceChart::Mask(c) => render_reference(c),
        ReferenceChart::Summary(c) => render_reference(c),
    }
}

fn render_reference<P: Plot>(chart: &P) -> Result<Vec<u8>, ChartError> {
    style::ensure_font()?;
    let (w, h) = chart.size();
    let mut rgb = vec![255u8; w as usize * h as usize * 3];
    {
        let root =
            glyphs::CachedText(BitMapBackend::with_buffer(&mut rgb, (w, h))).into_drawing_area();
        plot_with_caution(chart, &root).map_err(in_chart(P::NAME))?;
        root.present()
            .map_err(ChartError::from)
            .map_err(in_chart(P::NAME))?;
    }
    let mut indices = Vec::new();
    let palette = palette::quantize_into(&rgb, &mut indices);
    encode_png(palette, &indices, w, h)
}

/// Draw `chart` above a footer that carries the outputs' one caution
/// ([`crate::report::plan::CAUTION`]), wrapped to the chart's width.
fn plot_with_caution<P: Plot, DB: DrawingBackend>(
    chart: &P,
    root: &DrawingArea<DB, plotters::coord::Shift>,
) -> Result<(), ChartError>
where
    DB::ErrorType: 'static,
{
    root.fill(&WHITE)?;
    let (w, h) = root.dim_in_pixel();
    let font = style::note_font(style::MUTED);
    let mut lines = style::wrap_text(
        root,
        crate::report::plan::CAUTION,
        &font,
        w.saturating_sub(60),
    )?;
    for warning in chart.warnings() {
        lines.extend(style::wrap_text(
            root,
            &format!("warning: {warning}"),
            &font,
            w.saturating_sub(60),
        )?);
    }
    let footer_h = (lines.len() as u32 * style::FOOTER_LINE_PX + 14).min(h / 4);
    let (body, footer) = root.split_vertically(h - footer_h);
    chart.plot(&body)?;
    for (i, line) in lines.into_iter().enumerate() {
        footer.draw(&Text::new(
            line,
            (30, 4 + i as i32 * style::FOOTER_LINE_PX as i32),
            font.clone(),
        ))?;
    }
    Ok(())
}

/// Encode a chart's palette and one-byte indices ([`indexed::Colours::build_palette`]: the 256 most
/// frequent colours, exact for a chart of 256 colours or fewer) as a palette PNG, unfiltered, at
/// deflate level 2 (`flate2` on its zlib-rs backend). One byte per pixel instead of three. On the
/// example week's 169 charts (264 million pixels, one thread, 2026-12-04; 12.7 MB since the
/// straight line edges of `chart::path`): 12.9 MB in 0.46 s,
/// against 20.2 MB in 0.31 s for the crate's fast deflate after the Paeth filter (which that
/// deflate needs: it codes runs of zeros) and 16.6 MB in 0.34 s at level 1. A chart's index rows
/// repeat the row above and themselves in long runs, which the level's matches take whole, so
/// filtering gains nothing here (Paeth then level 2: 13.2 MB), as the PNG specification (W3C /
/// ISO/IEC 15948, the encoders' recommendation "Filter selection") advises for indexed colour.
/// miniz_oxide, `flate2`'s default backend, took 1.3 s at level 2.
fn encode_png(palette: Vec<u8>, indices: &[u8], w: u32, h: u32) -> Result<Vec<u8>, ChartError> {
    let mut out = Vec::with_capacity(indices.len() / 12);
    {
        let mut enc = png::Encoder::new(&mut out, w, h);
        enc.set_color(png::ColorType::Indexed);
        enc.set_depth(png::BitDepth::Eight);
        enc.set_palette(palette);
        enc.set_deflate_compression(png::DeflateCompression::Level(2));
        enc.set_filter(png::Filter::NoFilter);
        let mut writer = enc
            .write_header()
            .map_err(|e| ChartError::Encode(e.to_string()))?;
        writer
            .write_image_data(indices)
            .map_err(|e| ChartError::Encode(e.to_string()))?;
        writer
            .finish()
            .map_err(|e| ChartError::Encode(e.to_string()))?;
    }
    Ok(out)
}

fn save(path: &Path, bytes: &[u8]) -> Result<(), ChartError> {
    save_in(path, bytes, crate::report::WriteMode::Atomic)
}

/// Write chart bytes in `mode` (staged when the folder is a staging folder).
fn save_in(path: &Path, bytes: &[u8], mode: crate::report::WriteMode) -> Result<(), ChartError> {
    crate::report::write_output(path, bytes, mode).map_err(|source| ChartError::Io {
        path: path.to_path_buf(),
        source,
    })
}

/// Draw the pass chart (1600x1000).
pub fn draw_pass(data: &PassChartData, format: ChartFormat) -> Result<Vec<u8>, ChartError> {
    render(data, format)
}

/// Draw the pass chart and write it atomically to `path`.
pub fn save_pass(data: &PassChartData, path: &Path, format: ChartFormat) -> Result<(), ChartError> {
    save(path, &draw_pass(data, format)?)
}

/// Draw the sky track chart (1400x1000).
pub fn draw_sky(data: &SkyChartData, format: ChartFormat) -> Result<Vec<u8>, ChartError> {
    render(data, format)
}

/// Draw the sky track chart and write it atomically to `path`.
pub fn save_sky(data: &SkyChartData, path: &Path, format: ChartFormat) -> Result<(), ChartError> {
    save(path, &draw_sky(data, format)?)
}

/// Draw the mask trade-off chart (1600x1000). Every series must have one value per mask.
pub fn draw_mask(data: &MaskChartData, format: ChartFormat) -> Result<Vec<u8>, ChartError> {
    mask::check(data)?;
    render(data, format)
}

/// Draw the mask trade-off chart and write it atomically to `path`.
pub fn save_mask(data: &MaskChartData, path: &Path, format: ChartFormat) -> Result<(), ChartError> {
    save(path, &draw_mask(data, format)?)
}

/// Draw the plan summary chart (1600x1000).
pub fn draw_summary(data: &SummaryChartData, format: ChartFormat) -> Result<Vec<u8>, ChartError> {
    render(data, format)
}

/// Draw the plan summary chart and write it atomically to `path`.
pub fn save_summary(
    data: &SummaryChartData,
    path: &Path,
    format: ChartFormat,
) -> Result<(), ChartError> {
    save(path, &draw_summary(data, format)?)
}

/// `pass-003-sierra-baja-20261202T0128Z.png`: named as the pass's time series is
/// ([`crate::report::files::pass_file_stem`]: its number and identifier).
pub fn pass_file_name(
    pass_number: usize,
    pass_count: usize,
    pass_id: &str,
    format: ChartFormat,
) -> String {
    format!(
        "{}.{}",
        crate::report::files::pass_file_stem(pass_number, pass_count, pass_id),
        format.extension()
    )
}

/// `sky-sierra-baja-20261202.png`
pub fn sky_file_name(station: &str, day: NaiveDate, format: ChartFormat) -> String {
    format!(
        "sky-{}-{}.{}",
        style::slug(station),
        day.format("%Y%m%d"),
        format.extension()
    )
}

/// The sky chart of one pass (`chart --pass ID`), named by the pass's identifier
/// ([`crate::report::pass_id`], which does not change with the window):
/// `sky-sierra-baja-20261202T0854Z.png`, so it never replaces the day's chart of every pass
/// ([`sky_file_name`]).
pub fn sky_pass_file_name(pass_id: &str, format: ChartFormat) -> String {
    format!("sky-{pass_id}.{}", format.extension())
}

/// `mask-sierra-baja.png`, `mask-network.png`
pub fn mask_file_name(scope: &str, format: ChartFormat) -> String {
    format!("mask-{}.{}", style::slug(scope), format.extension())
}

/// `summary-sat-1-20261202-20261209.png`
pub fn summary_file_name(
    satellite: &str,
    start: &DateTime<Utc>,
    end: &DateTime<Utc>,
    format: ChartFormat,
) -> String {
    format!(
        "summary-{}-{}-{}.{}",
        style::slug(satellite),
        start.format("%Y%m%d"),
        end.format("%Y%m%d"),
        format.extension()
    )
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::timefmt::utc;

    #[test]
    fn file_names() {
        assert_eq!(
            pass_file_name(3, 132, "sierra-baja-20261202T0128Z", ChartFormat::Png),
            "pass-003-sierra-baja-20261202T0128Z.png"
        );
        assert_eq!(pass_file_name(3, 9, "", ChartFormat::Svg), "pass-003.svg");
        // wider plans pad to their last number's width, so that names sort in pass order
        assert_eq!(
            pass_file_name(16, 1500, "", ChartFormat::Png),
            "pass-0016.png"
        );
        assert_eq!(
            pass_file_name(1000, 1000, "x", ChartFormat::Png),
            "pass-1000-x.png"
        );
        assert_eq!(
            pass_file_name(999, 1000, "x", ChartFormat::Png),
            "pass-0999-x.png"
        );
        assert_eq!(pass_file_name(1, 0, "", ChartFormat::Png), "pass-001.png");
        let day = NaiveDate::from_ymd_opt(2026, 12, 2).unwrap();
        assert_eq!(
            sky_file_name("Sierra Baja", day, ChartFormat::Svg),
            "sky-sierra-baja-20261202.svg"
        );
        assert_eq!(
            sky_pass_file_name("sierra-baja-20261202T0854Z", ChartFormat::Png),
            "sky-sierra-baja-20261202T0854Z.png"
        );
        assert_eq!(
            mask_file_name("network", ChartFormat::Png),
            "mask-network.png"
        );
        assert_eq!(
            summary_file_name(
                "SAT-1",
                &utc(2026, 12, 2, 1, 23, 45),
                &utc(2026, 12, 9, 0, 0, 0),
                ChartFormat::Png
            ),
            "summary-sat-1-20261202-20261209.png"
        );
    }
}

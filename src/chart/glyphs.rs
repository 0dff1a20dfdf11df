//! Text on the PNG charts with a glyph cache: [`CachedText`] wraps the bitmap backend and draws
//! each glyph of the bundled font from a coverage list made once per (size, character), where
//! plotters' `ab_glyph` path outlines and rasterises every glyph each time it is drawn (a week's
//! charts draw some 90 000 glyphs of a few hundred distinct ones).
//!
//! The coverage is plotters': plotters rasterises each glyph at the origin and places it at a whole
//! pixel (`x_shift as i32`, `y = size / 2 + top of the glyph's bounds`), so its coverage does not
//! depend on where it is drawn; [`CachedText::draw_text`] repeats the layout of the backend's
//! default `draw_text` (anchor, transform, clipping) and of plotters' glyph loop (kerning,
//! advances), and hands the same coverage with the same colours to the same `draw_pixel`.
//!
//! One difference, on purpose: each glyph is placed at its left side bearing (the left edge of
//! its pixel bounds), where plotters (`plotters` 0.3.7, `style::font::ab_glyph`) draws the bounds'
//! corner at the pen position and so drops the bearing. The font's narrow glyphs sit in the
//! middle of their advance (the tabular digit 1 most of all), so plotters' text read
//! `8.51  Tbit` and `1 32 passes`. The tests check the placement against the font's own side
//! bearing and the coverage against plotters glyph by glyph. Any other font family or style goes
//! through plotters unchanged.

use ab_glyph::{Font, FontRef, GlyphId, ScaleFont};
use plotters::style::text_anchor::{HPos, VPos};
use plotters::style::FontStyle;
use plotters_backend::{
    BackendColor, BackendCoord, BackendStyle, BackendTextStyle, DrawingBackend, DrawingErrorKind,
};
use std::cell::RefCell;
use std::collections::HashMap;
use std::rc::Rc;
use std::sync::OnceLock;

/// One glyph at one size, as plotters draws it at the origin.
struct Glyph {
    id: GlyphId,
    h_advance: f32,
    /// `(size / 2 + top of the pixel bounds) as i32`, plotters' vertical placement.
    y_shift: i32,
    /// Left edge of the pixel bounds from the pen position (the left side bearing, in whole
    /// pixels as the bounds are).
    x_bearing: i32,
    /// Covered pixels relative to the bounds' corner, with their coverage; empty for a glyph
    /// without an outline (a space).
    pixels: Vec<(i32, i32, f32)>,
}

thread_local! {
    /// Per drawing thread: (size bits, character) -> glyph.
    static GLYPHS: RefCell<HashMap<(u64, char), Rc<Glyph>>> = RefCell::new(HashMap::new());
}

#[cfg(test)]
thread_local! {
    /// Tests only: place glyphs as plotters does (no bearing), to compare whole texts with it.
    static PLOTTERS_PLACEMENT: std::cell::Cell<bool> = const { std::cell::Cell::new(false) };
}

/// The glyph's left side bearing as drawn (see the module note).
#[inline]
fn bearing(g: &Glyph) -> i32 {
    #[cfg(test)]
    if PLOTTERS_PLACEMENT.with(|p| p.get()) {
        return 0;
    }
    g.x_bearing
}

fn font() -> Option<&'static FontRef<'static>> {
    static FONT: OnceLock<Option<FontRef<'static>>> = OnceLock::new();
    FONT.get_or_init(|| FontRef::try_from_slice(super::style::DEJAVU_SANS).ok())
        .as_ref()
}

fn glyph(font: &FontRef<'static>, size: f64, c: char) -> Rc<Glyph> {
    GLYPHS.with(|cache| {
        cache
            .borrow_mut()
            .entry((size.to_bits(), c))
            .or_insert_with(|| {
                let scaled = font.as_scaled(size as f32);
                let id = scaled.glyph_id(c);
                let (y_shift, x_bearing, pixels) =
                    match scaled.outline_glyph(scaled.scaled_glyph(c)) {
                        Some(q) => {
                            let rect = q.px_bounds();
                            let mut pixels = Vec::new();
                            q.draw(|x, y, v| pixels.push((x as i32, y as i32, v)));
                            let y_shift = ((size as f32) / 2.0 + rect.min.y) as i32;
                            (y_shift, rect.min.x as i32, pixels)
                        }
                        None => (0, 0, Vec::new()),
                    };
                Rc::new(Glyph {
                    id,
                    h_advance: scaled.h_advance(id),
                    y_shift,
                    x_bearing,
                    pixels,
                })
            })
            .clone()
    })
}

/// A bitmap backend with cached glyphs for the bundled font (see the module note).
pub struct CachedText<B>(pub B);

type Error<B> = DrawingErrorKind<<B as DrawingBackend>::ErrorType>;

impl<B: DrawingBackend> DrawingBackend for CachedText<B> {
    type ErrorType = B::ErrorType;

    fn get_size(&self) -> (u32, u32) {
        self.0.get_size()
    }
    fn ensure_prepared(&mut self) -> Result<(), Error<B>> {
        self.0.ensure_prepared()
    }
    fn present(&mut self) -> Result<(), Error<B>> {
        self.0.present()
    }
    fn draw_pixel(&mut self, point: BackendCoord, color: BackendColor) -> Result<(), Error<B>> {
        self.0.draw_pixel(point, color)
    }
    fn draw_line<S: BackendStyle>(
        &mut self,
        from: BackendCoord,
        to: BackendCoord,
        style: &S,
    ) -> Result<(), Error<B>> {
        self.0.draw_line(from, to, style)
    }
    fn draw_rect<S: BackendStyle>(
        &mut self,
        upper_left: BackendCoord,
        bottom_right: BackendCoord,
        style: &S,
        fill: bool,
    ) -> Result<(), Error<B>> {
        self.0.draw_rect(upper_left, bottom_right, style, fill)
    }
    fn draw_path<S: BackendStyle, I: IntoIterator<Item = BackendCoord>>(
        &mut self,
        path: I,
        style: &S,
    ) -> Result<(), Error<B>> {
        self.0.draw_path(path, style)
    }
    fn draw_circle<S: BackendStyle>(
        &mut self,
        center: BackendCoord,
        radius: u32,
        style: &S,
        fill: bool,
    ) -> Result<(), Error<B>> {
        self.0.draw_circle(center, radius, style, fill)
    }
    fn fill_polygon<S: BackendStyle, I: IntoIterator<Item = BackendCoord>>(
        &mut self,
        vert: I,
        style: &S,
    ) -> Result<(), Error<B>> {
        self.0.fill_polygon(vert, style)
    }
    fn estimate_text_size<TStyle: BackendTextStyle>(
        &self,
        text: &str,
        style: &TStyle,
    ) -> Result<(u32, u32), Error<B>> {
        self.0.estimate_text_size(text, style)
    }
    fn blit_bitmap(
        &mut self,
        pos: BackendCoord,
        (iw, ih): (u32, u32),
        src: &[u8],
    ) -> Result<(), Error<B>> {
        self.0.blit_bitmap(pos, (iw, ih), src)
    }

    fn draw_text<TStyle: BackendTextStyle>(
        &mut self,
        text: &str,
        style: &TStyle,
        pos: BackendCoord,
    ) -> Result<(), Error<B>> {
        let ours = style.family().as_str() == super::style::FONT
            && matches!(style.style(), FontStyle::Normal);
        let font = match font() {
            Some(f) if ours => f,
            _ => return self.0.draw_text(text, style, pos),
        };
        let color = style.color();
        if color.alpha == 0.0 {
            return Ok(());
        }
        // The layout of the backend's default draw_text.
        let ((min_x, min_y), (max_x, max_y)) = style
            .layout_box(text)
            .map_err(|e| DrawingErrorKind::FontError(Box::new(e)))?;
        let (width, height) = (max_x - min_x, max_y - min_y);
        let dx = match style.anchor().h_pos {
            HPos::Left => 0,
            HPos::Right => -width,
            HPos::Center => -width / 2,
        };
        let dy = match style.anchor().v_pos {
            VPos::Top => 0,
            VPos::Center => -height / 2,
            VPos::Bottom => -height,
        };
        let trans = style.transform();
        let (w, h) = self.0.get_size();
        // plotters' glyph loop (ab_glyph FontDataInternal::draw), the bearing added.
        let size = style.size();
        let scaled = font.as_scaled(size as f32);
        let mut x_shift = 0f32;
        let mut prev: Option<GlyphId> = None;
        for c in text.chars() {
            let g = glyph(font, size, c);
            if let Some(p) = prev {
                x_shift += scaled.kern(p, g.id);
            }
            prev = Some(g.id);
            // plotters' whole-pixel pen position, plus the glyph's bearing (see the module note)
            let xs = x_shift as i32 + bearing(&g);
            for &(x, y, v) in &g.pixels {
                let (x, y) = trans.transform(x + xs + dx - min_x, y + g.y_shift + dy - min_y);
                let (x, y) = (pos.0 + x, pos.1 + y);
                if x >= 0 && x < w as i32 && y >= 0 && y < h as i32 {
                    self.0.draw_pixel((x, y), color.mix(f64::from(v)))?;
                }
            }
            x_shift += g.h_advance;
        }
        Ok(())
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use plotters::prelude::*;
    use plotters::style::text_anchor::Pos;
    use plotters::style::FontTransform;

    fn draw_texts<DB: DrawingBackend>(root: &DrawingArea<DB, plotters::coord::Shift>) {
        root.fill(&WHITE).unwrap();
        let font = super::super::style::FONT;
        let left = |v| Pos::new(HPos::Left, v);
        type Item<'a> = (&'a str, f64, (i32, i32), Pos, FontTransform);
        let items: [Item; 6] = [
            (
                "AVATAR To WAVE · 36.8°",
                30.0,
                (5, 5),
                left(VPos::Top),
                FontTransform::None,
            ),
            (
                "Elevation (deg)",
                22.0,
                (20, 290),
                Pos::new(HPos::Center, VPos::Center),
                FontTransform::Rotate270,
            ),
            (
                "08:54:59 ±0.5 dB",
                18.0,
                (410, 80),
                Pos::new(HPos::Right, VPos::Bottom),
                FontTransform::None,
            ),
            (
                "cut by the edge",
                17.0,
                (380, 120),
                left(VPos::Center),
                FontTransform::None,
            ),
            (
                "Noise temp. (K)",
                22.0,
                (400, 150),
                Pos::new(HPos::Center, VPos::Center),
                FontTransform::Rotate90,
            ),
            (
                "ñ 東 km/s",
                17.5,
                (60, 250),
                left(VPos::Top),
                FontTransform::None,
            ),
        ];
        for (i, (t, size, at, anchor, tr)) in items.into_iter().enumerate() {
            let colour = [RGBColor(0x1c, 0x3d, 0x72), RGBColor(0xe6, 0x95, 0x20)][i % 2];
            let style = TextStyle::from((font, size).into_font())
                .color(&colour)
                .pos(anchor)
                .transform(tr);
            root.draw(&Text::new(t, at, style)).unwrap();
        }
    }

    fn rgb_canvas(w: u32, h: u32, f: impl FnOnce(&mut Vec<u8>)) -> Vec<u8> {
        let mut buf = vec![255u8; (w * h * 3) as usize];
        f(&mut buf);
        buf
    }

    fn bearing_px(c: char, size: f64) -> i32 {
        let scaled = font().unwrap().as_scaled(size as f32);
        scaled
            .outline_glyph(scaled.scaled_glyph(c))
            .map_or(0, |q| q.px_bounds().min.x as i32)
    }

    /// One glyph drawn alone through the cache is plotters' glyph (its coverage, colour and
    /// vertical place) moved right by its bearing: plotters drawn at the pen plus the bearing
    /// gives the same pixels.
    #[test]
    fn each_glyph_is_plotters_coverage_at_its_bearing() {
        super::super::style::ensure_font().unwrap();
        let font = super::super::style::FONT;
        let (w, h) = (120u32, 90u32);
        let mut moved = 0;
        for size in [30.0, 17.5] {
            for c in "1TWijy°·東A".chars() {
                let text = c.to_string();
                let style = || {
                    TextStyle::from((font, size).into_font())
                        .color(&RGBColor(0x1c, 0x3d, 0x72))
                        .pos(Pos::new(HPos::Left, VPos::Top))
                };
                let b = bearing_px(c, size);
                moved += usize::from(b != 0);
                let plain = rgb_canvas(w, h, |buf| {
                    let root = BitMapBackend::with_buffer(buf, (w, h)).into_drawing_area();
                    root.draw(&Text::new(text.as_str(), (40 + b, 20), style()))
                        .unwrap();
                    root.present().unwrap();
                });
                let cached = rgb_canvas(w, h, |buf| {
                    let root =
                        CachedText(BitMapBackend::with_buffer(buf, (w, h))).into_drawing_area();
                    root.draw(&Text::new(text.as_str(), (40, 20), style()))
                        .unwrap();
                    root.present().unwrap();
                });
                assert!(
                    plain.iter().any(|&v| v != 255),
                    "{c} at {size} drew nothing"
                );
                assert!(
                    plain == cached,
                    "{c} at {size}: not plotters' glyph at its bearing"
                );
            }
        }
        assert!(moved >= 10, "most glyphs have a bearing ({moved})");
    }

    /// The glyph's ink starts at the pen position plus the font's left side bearing (the `hmtx`
    /// table's, through `ab_glyph`), within a pixel: the tabular digit 1 (a bearing of 2.8 px, a
    /// sixth of its advance), the 0 (1.7 px) and the T (-0.08 px). plotters alone puts the 1's
    /// ink at the pen.
    #[test]
    fn a_glyphs_ink_starts_at_its_side_bearing() {
        super::super::style::ensure_font().unwrap();
        let (w, h) = (200u32, 80u32);
        let size = 30.0;
        let scaled = font().unwrap().as_scaled(size as f32);
        for c in ['1', 'T', '0'] {
            let lsb = scaled.h_side_bearing(scaled.glyph_id(c));
            let buf = rgb_canvas(w, h, |buf| {
                let root = CachedText(BitMapBackend::with_buffer(buf, (w, h))).into_drawing_area();
                let style = TextStyle::from((super::super::style::FONT, size).into_font())
                    .color(&BLACK)
                    .pos(Pos::new(HPos::Left, VPos::Top));
                root.draw(&Text::new(c.to_string(), (100, 20), style))
                    .unwrap();
                root.present().unwrap();
            });
            let first = (0..w as usize)
                .find(|&x| (0..h as usize).any(|y| buf[(y * w as usize + x) * 3] != 255))
                .unwrap() as f32;
            assert!(
                (first - (100.0 + lsb)).abs() <= 1.0,
                "{c}: ink from x = {first}, pen 100 + bearing {lsb}"
            );
        }
        // the 1's bearing is 2.8 px of its 16.4 px advance: plotters' placement is 2 px off
        assert!(
            scaled.h_side_bearing(scaled.glyph_id('1')) > 2.5,
            "the 1 sits inside its cell"
        );
    }

    /// Text of every kind the charts draw (sizes, anchors, rotated axis labels, kerning pairs,
    /// degree signs and middle dots, text cut by the edge), drawn through plotters and through the
    /// cache with plotters' placement (no bearing), twice (the second time from the cache): the
    /// same pixels. So the bearing is the only difference from plotters' text.
    #[test]
    fn cached_text_with_plotters_placement_draws_plotters_pixels() {
        super::super::style::ensure_font().unwrap();
        let (w, h) = (420u32, 300u32);
        let plain = rgb_canvas(w, h, |buf| {
            let root = BitMapBackend::with_buffer(buf, (w, h)).into_drawing_area();
            draw_texts(&root);
            draw_texts(&root);
            root.present().unwrap();
        });
        PLOTTERS_PLACEMENT.with(|p| p.set(true));
        let cached = rgb_canvas(w, h, |buf| {
            let root = CachedText(BitMapBackend::with_buffer(buf, (w, h))).into_drawing_area();
            draw_texts(&root);
            draw_texts(&root);
            root.present().unwrap();
        });
        PLOTTERS_PLACEMENT.with(|p| p.set(false));
        assert!(
            plain.iter().filter(|&&b| b != 255).count() > 5_000,
            "text was drawn"
        );
        assert!(plain == cached, "the cached glyphs changed pixels");
        // and with the bearing, the same texts differ (the narrow glyphs move)
        let placed = rgb_canvas(w, h, |buf| {
            let root = CachedText(BitMapBackend::with_buffer(buf, (w, h))).into_drawing_area();
            draw_texts(&root);
            draw_texts(&root);
            root.present().unwrap();
        });
        assert!(placed != plain, "the bearing moves glyphs");
    }
}

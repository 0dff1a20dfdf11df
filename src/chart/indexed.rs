//! A drawing backend that draws PNG charts straight into colour indices: [`IndexedBitmap`] keeps
//! one 16-bit index per pixel into a table of the chart's colours ([`Colours`]), so there is no
//! RGB buffer to draw into and no pass over one to find its colours.
//!
//! The pixels are those of plotters' RGB bitmap backend: every operation that backend overrides
//! (a pixel, a horizontal or vertical line, a filled rectangle, opaque or blended) is repeated
//! here with the same clipping and the same blend arithmetic on the colours the indices stand
//! for, and everything else (polygons, wide lines, circles, text) goes through the same
//! rasterizers of `plotters_backend`, which call these. A blend is worked out once per (colour
//! under it, colour drawn, blend level) and then found in a small cache. [`Colours::build_palette`]
//! then chooses the 256 most frequent colours exactly as [`super::palette::quantize`] does from
//! an RGB buffer, so the PNG bytes are the same (`tests`: every chart drawn both ways).

use super::palette::{by_frequency, nearest, triples, write_runs, PALETTE_MAX};
use super::scanline::{self, Scratch};
use plotters_backend::{
    BackendColor, BackendCoord, BackendStyle, DrawingBackend, DrawingErrorKind,
};
use std::convert::Infallible;

/// Most colours one chart may hold; a colour past them is drawn with the nearest of the first
/// [`PALETTE_MAX`] (never reached by our charts, which hold a few thousand blend levels).
const COLOURS_MAX: usize = u16::MAX as usize;

/// Entries of the blend cache (a power of two).
const BLEND_CACHE: usize = 1 << 12;

/// How a blend rounds: plotters' per-pixel blend moves each channel towards the new colour and
/// rounds towards the old one; its fast rectangle blend computes `(old (256 - a) + new a) >> 8`,
/// which rounds down.
#[derive(Clone, Copy)]
enum Rounding {
    TowardOld = 0,
    Down = 1,
}

/// The colours of one chart, each with its index, and a cache of blends between them.
pub struct Colours {
    /// Index -> 0xRRGGBB.
    rgb: Vec<u32>,
    /// Open addressing: colour + 1 (0 marks a free slot) and its index.
    keys: Vec<u32>,
    values: Vec<u16>,
    /// Direct-mapped: (index under, colour drawn, level, rounding) -> index, `u64::MAX` free.
    blend_keys: Vec<u64>,
    blend_values: Vec<u16>,
    /// The last colour looked up and the last blend, with their indices (a run of pixels of one
    /// colour, a translucent rectangle over one background).
    last_index: (u32, u16),
    last_blend: (u64, u16),
    /// The runs of the last image [`Colours::build_palette`] read, kept for the next (a chart holds
    /// some 10^5 runs).
    runs: Vec<(u16, u32)>,
}

impl Default for Colours {
    fn default() -> Self {
        Colours::new()
    }
}

impl Colours {
    /// An empty table.
    pub fn new() -> Self {
        Colours {
            rgb: Vec::new(),
            keys: vec![0; 1 << 10],
            values: vec![0; 1 << 10],
            blend_keys: vec![u64::MAX; BLEND_CACHE],
            blend_values: vec![0; BLEND_CACHE],
            last_index: (u32::MAX, 0),
            last_blend: (u64::MAX, 0),
            runs: Vec::new(),
        }
    }

    /// Empty the table, keeping its room.
    pub fn clear(&mut self) {
        self.rgb.clear();
        self.keys.fill(0);
        self.blend_keys.fill(u64::MAX);
        self.last_index = (u32::MAX, 0);
        self.last_blend = (u64::MAX, 0);
    }

    /// The index of colour `c` (0xRRGGBB), added if it is new.
    pub fn index(&mut self, c: u32) -> u16 {
        if c == self.last_index.0 {
            return self.last_index.1;
        }
        let idx = self.lookup(c);
        self.last_index = (c, idx);
        idx
    }

    fn lookup(&mut self, c: u32) -> u16 {
        let k = c + 1;
        let mask = self.keys.len() - 1;
        let mut i = (k.wrapping_mul(0x9e37_79b1) >> 16) as usize & mask;
        loop {
            match self.keys[i] {
                0 => break,
                x if x == k => return self.values[i],
                _ => i = (i + 1) & mask,
            }
        }
        if self.rgb.len() >= COLOURS_MAX {
            return u16::from(nearest(&self.rgb[..PALETTE_MAX], c));
        }
        if 2 * (self.rgb.len() + 1) > self.keys.len() {
            self.grow();
            return self.lookup(c);
        }
        let idx = self.rgb.len() as u16;
        self.rgb.push(c);
        self.keys[i] = k;
        self.values[i] = idx;
        idx
    }

    fn grow(&mut self) {
        let n = 2 * self.keys.len();
        self.keys = vec![0; n];
        self.values = vec![0; n];
        let colours = std::mem::take(&mut self.rgb);
        for c in colours {
            self.lookup(c);
        }
    }

    /// The index of colour `c` drawn at level `a` (1..=255 of 256) over the colour of index `under`.
    fn blend(&mut self, under: u16, c: u32, a: u64, rounding: Rounding) -> u16 {
        let key = u64::from(under) | (u64::from(c) << 16) | (a << 40) | ((rounding as u64) << 49);
        if key == self.last_blend.0 {
            return self.last_blend.1;
        }
        let slot = (key.wrapping_mul(0x9e37_79b9_7f4a_7c15) >> 52) as usize & (BLEND_CACHE - 1);
        if self.blend_keys[slot] == key {
            self.last_blend = (key, self.blend_values[slot]);
            return self.blend_values[slot];
        }
        let old = self
            .rgb
            .get(usize::from(under))
            .copied()
            .unwrap_or(0xff_ff_ff);
        let channel = |s: u32| {
            let (o, n) = (u64::from((old >> s) & 0xff), u64::from((c >> s) & 0xff));
            let v = match rounding {
                Rounding::TowardOld if n > o => o + (n - o) * a / 256,
                Rounding::TowardOld => o - (o - n) * a / 256,
                Rounding::Down => (o * (256 - a) + n * a) >> 8,
            };
            (v as u32) << s
        };
        let idx = self.index(channel(16) | channel(8) | channel(0));
        self.blend_keys[slot] = key;
        self.blend_values[slot] = idx;
        self.last_blend = (key, idx);
        idx
    }

    /// The palette of an image drawn with these colours and its one-byte indices, exactly as
    /// [`super::palette::quantize_into`] makes them from the same image in RGB: the
    /// [`PALETTE_MAX`] most frequent colours (equal counts by colour), every other colour drawn
    /// with the nearest of them. Returns the palette as RGB triples.
    pub fn build_palette(&mut self, pixels: &[u16], out: &mut Vec<u8>) -> Vec<u8> {
        // An index past the table (pixels not drawn with these colours) counts for nothing and is
        // stored as 0.
        let mut counts = vec![0u32; self.rgb.len()];
        // The image is read once: its runs are kept for the indexed image.
        let mut all_runs = std::mem::take(&mut self.runs);
        all_runs.clear();
        runs(pixels, |p, n| {
            if let Some(c) = counts.get_mut(usize::from(p)) {
                *c += n;
            }
            all_runs.push((p, n));
        });
        let mut by_count: Vec<(u32, u32, u16)> = counts
            .iter()
            .enumerate()
            .filter(|(_, &n)| n > 0)
            .map(|(i, &n)| (n, self.rgb[i], i as u16))
            .collect();
        by_count.sort_unstable_by(|a, b| by_frequency((a.0, a.1), (b.0, b.1)));
        let kept: Vec<u32> = by_count.iter().take(PALETTE_MAX).map(|x| x.1).collect();
        let mut map = vec![0u8; counts.len()];
        for (rank, &(_, c, i)) in by_count.iter().enumerate() {
            map[usize::from(i)] = if rank < PALETTE_MAX {
                rank as u8
            } else {
                nearest(&kept, c)
            };
        }
        let runs = all_runs.iter().map(|&(p, n)| {
            let v = map.get(usize::from(p)).copied().unwrap_or(0);
            (v, n as usize)
        });
        write_runs(runs, pixels.len(), out);
        self.runs = all_runs;
        triples(&kept)
    }
}

/// Calls `f(index, run length)` for each run of equal pixels; eight pixels at a time where they
/// repeat the one before them (most of a chart is long runs).
fn runs(pixels: &[u16], mut f: impl FnMut(u16, u32)) {
    let n = pixels.len();
    let mut i = 0;
    while i < n {
        let p = pixels[i];
        let mut j = i + 1;
        while let Some(chunk) = pixels.get(j..j + 8) {
            // A fixed-size comparison, inlined rather than a call.
            let chunk: &[u16; 8] = chunk.try_into().expect("8 pixels");
            if *chunk != [p; 8] {
                break;
            }
            j += 8;
        }
        while j < n && pixels[j] == p {
            j += 1;
        }
        f(p, (j - i) as u32);
        i = j;
    }
}

fn rgb_of(c: BackendColor) -> u32 {
    (u32::from(c.rgb.0) << 16) | (u32::from(c.rgb.1) << 8) | u32::from(c.rgb.2)
}

/// A chart's pixels as colour indices (see the module note).
pub struct IndexedBitmap<'a> {
    pixels: &'a mut [u16],
    colours: &'a mut Colours,
    w: u32,
    h: u32,
    /// Buffers of the polygon filler, kept from polygon to polygon.
    vertices: Vec<BackendCoord>,
    scratch: Scratch,
    pixel_memo: PixelMemo,
}

/// The blended pixels of one colour over one colour under them, by level (a glyph's or an edge's
/// pixels lie mostly over one background): a blend is a pure function of (colour under, colour
/// drawn, level) for the whole chart, so a remembered one stays right. A level is valid while its
/// stamp equals `generation`; a new (colour, under) pair starts a new generation.
struct PixelMemo {
    colour: u32,
    under: u16,
    generation: u32,
    stamp: [u32; 256],
    index: [u16; 256],
}

impl Default for PixelMemo {
    fn default() -> Self {
        PixelMemo {
            colour: u32::MAX,
            under: 0,
            generation: 1,
            stamp: [0; 256],
            index: [0; 256],
        }
    }
}

type Error = DrawingErrorKind<Infallible>;

impl<'a> IndexedBitmap<'a> {
    /// A `w` x `h` image in `pixels` (at least `w * h` of them; a shorter buffer draws only the
    /// rows it holds) filled with `background`.
    pub fn new(
        pixels: &'a mut [u16],
        colours: &'a mut Colours,
        (w, h): (u32, u32),
        background: (u8, u8, u8),
    ) -> Self {
        let rows = (pixels.len() / (w.max(1) as usize)).min(h as usize) as u32;
        let bg = colours.index(rgb_of(BackendColor {
            alpha: 1.0,
            rgb: background,
        }));
        pixels.fill(bg);
        IndexedBitmap {
            pixels,
            colours,
            w,
            h: rows,
            vertices: Vec::new(),
            scratch: Scratch::default(),
            pixel_memo: PixelMemo::default(),
        }
    }

    /// Fill columns `x0..x1` of rows `y0..y1` (clipped) with index `idx`.
    fn fill(&mut self, (x0, y0): (i32, i32), (x1, y1): (i32, i32), idx: u16) {
        let (x0, x1) = (x0.max(0) as usize, x1.clamp(0, self.w as i32) as usize);
        let (y0, y1) = (y0.max(0) as usize, y1.clamp(0, self.h as i32) as usize);
        let w = self.w as usize;
        for y in y0..y1 {
            if x0 < x1 {
                self.pixels[y * w + x0..y * w + x1].fill(idx);
            }
        }
    }

    /// plotters' `fill_rect_fast`: the corners in any order, the lower right one excluded.
    fn fill_rect(&mut self, a: BackendCoord, b: BackendCoord, c: BackendColor) {
        let idx = self.colours.index(rgb_of(c));
        self.fill(
            (a.0.min(b.0), a.1.min(b.1)),
            (a.0.max(b.0), a.1.max(b.1)),
            idx,
        );
    }

    /// [`Colours::blend`] rounding towards the old colour, from [`PixelMemo`] where it holds it.
    #[inline]
    fn memo_blend(&mut self, under: u16, colour: u32, level: usize) -> u16 {
        let m = &mut self.pixel_memo;
        if m.colour != colour || m.under != under {
            (m.colour, m.under) = (colour, under);
            m.generation = m.generation.wrapping_add(1);
            if m.generation == 0 {
                m.stamp = [0; 256];
                m.generation = 1;
            }
        }
        if m.stamp[level] == m.generation {
            return m.index[level];
        }
        let idx = self
            .colours
            .blend(under, colour, level as u64, Rounding::TowardOld);
        (m.stamp[level], m.index[level]) = (m.generation, idx);
        idx
    }

    /// plotters' `blend_rect_fast`: per row, the pixels in whole groups of eight before the
    /// last one round down, the others towards the old colour.
    fn blend_rect(&mut self, a: BackendCoord, b: BackendCoord, c: BackendColor) {
        let alpha = c.alpha.clamp(0.0, 1.0);
        if alpha == 0.0 || alpha.is_nan() {
            return;
        }
        let (x0, y0) = (a.0.min(b.0).max(0), a.1.min(b.1).max(0));
        let (x1, y1) = (
            a.0.max(b.0).min(self.w as i32),
            a.1.max(b.1).min(self.h as i32),
        );
        if x0 >= x1 || y0 >= y1 {
            return;
        }
        // floor(256 alpha) as plotters, for alpha in (0, 1]: a cast truncates (no call to floor).
        let level = (256.0 * alpha) as u64;
        let colour = rgb_of(c);
        let (w, count) = (self.w as usize, (x1 - x0) as usize);
        let down = (count - 1) / 8 * 8;
        for y in y0 as usize..y1 as usize {
            let row = y * w + x0 as usize;
            for k in 0..count {
                let rounding = if k < down {
                    Rounding::Down
                } else {
                    Rounding::TowardOld
                };
                let under = self.pixels[row + k];
                self.pixels[row + k] = self.colours.blend(under, colour, level, rounding);
            }
        }
    }
}

impl DrawingBackend for IndexedBitmap<'_> {
    type ErrorType = Infallible;

    fn get_size(&self) -> (u32, u32) {
        (self.w, self.h)
    }
    fn ensure_prepared(&mut self) -> Result<(), Error> {
        Ok(())
    }
    fn present(&mut self) -> Result<(), Error> {
        Ok(())
    }

    /// plotters' bitmap `draw_pixel`: opaque from 255/256 on, blended at `floor(256 alpha)`.
    #[inline]
    fn draw_pixel(&mut self, point: BackendCoord, color: BackendColor) -> Result<(), Error> {
        if point.0 < 0 || point.1 < 0 || point.0 as u32 >= self.w || point.1 as u32 >= self.h {
            return Ok(());
        }
        let at = point.1 as usize * self.w as usize + point.0 as usize;
        let alpha = color.alpha;
        if alpha >= 1.0 - 1.0 / 256.0 {
            self.pixels[at] = self.colours.index(rgb_of(color));
        } else if alpha > 0.0 {
            // floor(256 alpha) < 255 here: a cast through i32 truncates the same (and costs less
            // than one to an unsigned 64-bit integer, which x86-64 has no instruction for).
            let level = (alpha * 256.0) as i32 as usize;
            let under = self.pixels[at];
            self.pixels[at] = self.memo_blend(under, rgb_of(color), level);
        }
        Ok(())
    }

    /// plotters' bitmap `draw_line`: one-pixel horizontal and vertical lines filled as spans.
    fn draw_line<S: BackendStyle>(
        &mut self,
        from: BackendCoord,
        to: BackendCoord,
        style: &S,
    ) -> Result<(), Error> {
        let c = style.color();
        if (from.0 == to.0 || from.1 == to.1) && style.stroke_width() == 1 {
            let end = (to.0 + 1, to.1 + 1);
            if c.alpha < 1.0 {
                self.blend_rect(from, end, c);
            } else if from.1 == to.1 {
                self.fill_rect(from, end, c);
            } else if from.0 >= 0 && from.0 < self.w as i32 {
                // plotters' fill_vertical_line_fast: both ends drawn, in either order.
                let (y0, y1) = (from.1.min(to.1), from.1.max(to.1));
                let idx = self.colours.index(rgb_of(c));
                self.fill((from.0, y0), (from.0 + 1, y1.saturating_add(1)), idx);
            }
            return Ok(());
        }
        plotters_backend::rasterizer::draw_line(self, from, to, style)
    }

    /// plotters' bitmap `draw_rect`: a filled rectangle as spans, an outline as four lines.
    fn draw_rect<S: BackendStyle>(
        &mut self,
        upper_left: BackendCoord,
        bottom_right: BackendCoord,
        style: &S,
        fill: bool,
    ) -> Result<(), Error> {
        let c = style.color();
        if !fill {
            return plotters_backend::rasterizer::draw_rect(
                self,
                upper_left,
                bottom_right,
                style,
                fill,
            );
        }
        if c.alpha >= 1.0 {
            self.fill_rect(upper_left, bottom_right, c);
        } else {
            self.blend_rect(upper_left, bottom_right, c);
        }
        Ok(())
    }

    /// plotters' polygon rasterizer, without its allocations ([`scanline`]).
    fn fill_polygon<S: BackendStyle, I: IntoIterator<Item = BackendCoord>>(
        &mut self,
        vert: I,
        style: &S,
    ) -> Result<(), Error> {
        let mut vertices = std::mem::take(&mut self.vertices);
        let mut scratch = std::mem::take(&mut self.scratch);
        vertices.clear();
        vertices.extend(vert);
        let done = scanline::fill_polygon(self, &mut scratch, &vertices, style);
        self.vertices = vertices;
        self.scratch = scratch;
        done
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use plotters::prelude::*;

    /// Pixels (text's coverages too), one-pixel lines, rectangles and polygons (plotters' rasterizer against
    /// [`scanline`]), opaque and blended at many levels, over one another and cut by the edges
    /// (the blended rectangles at every width across the eight-pixel groups of plotters' fast
    /// blend): the colours of the indices are plotters' RGB pixels.
    #[test]
    fn draws_the_rgb_backends_pixels() {
        let (w, h) = (97u32, 61u32);
        let colours_of = [
            RGBColor(0x1c, 0x3d, 0x72),
            RGBColor(0xe6, 0x95, 0x20),
            RGBColor(0x7f, 0xc3, 0xea),
            RGBColor(0x86, 0x30, 0x6f),
        ];
        let draw = |b: &mut dyn FnMut(Op)| {
            for (k, &c) in colours_of.iter().cycle().take(40).enumerate() {
                let k = k as i32;
                let alpha = [1.0, 0.35, 0.45, 0.999, 0.004, 0.5][k as usize % 6];
                let c = c.mix(alpha).to_backend_color();
                let (x, y) = ((k * 13) % 110 - 8, (k * 7) % 70 - 5);
                b(Op::Rect((x, y), (x + k % 19 + 1, y + k % 5 + 2), c));
                b(Op::Line((x, y + 3), (x - k, y + 3), c));
                b(Op::Line((x + 2, y + 9), (x + 2, y - k), c));
                b(Op::Line((x, y), (x + 17, y + k % 11 + 3), c));
                b(Op::Pixel((x + 1, y + 1), c));
                // Pixels at coverages across the blend levels (none, opaque, NaN too), as text
                // draws them, over what is already drawn: the memo of blends.
                for (j, v) in [
                    0.0,
                    0.003,
                    0.2,
                    0.5,
                    0.77,
                    0.995,
                    0.9961,
                    1.0,
                    f32::NAN,
                    0.31,
                ]
                .into_iter()
                .enumerate()
                {
                    let j = j as i32;
                    b(Op::Glyph((x + j, y + 2 + j % 3), c, v));
                    b(Op::Glyph((x + j, y + 2 + j % 3), c, 0.5 * v));
                }
                // Polygons: a triangle, a concave and a self-crossing one, a wide line (one
                // sweeping columns, one rows), cut by the edges.
                b(Op::Polygon(
                    vec![(x, y), (x + 23, y + k % 9), (x + 5, y + 31)],
                    c,
                ));
                let m = k % 7;
                b(Op::Polygon(
                    vec![
                        (x - 3, y),
                        (x + 9, y + 2 + m),
                        (x + 4, y + 6),
                        (x + 12, y + 14 - m),
                        (x, y + 11),
                    ],
                    c,
                ));
                b(Op::Polygon(
                    vec![(x, y), (x + 15, y + 8), (x + 15, y), (x, y + 8 + m)],
                    c,
                ));
                b(Op::Wide(
                    (x, y + 20),
                    (x + 30, y + 20 + m),
                    c,
                    2 + (k % 3) as u32,
                ));
                b(Op::Wide((x + 4, y - 10), (x + 4 + m, y + 40), c, 3));
            }
            b(Op::Polygon(
                vec![(5, 5), (5, 30)],
                colours_of[0].to_backend_color(),
            ));
            b(Op::Polygon(Vec::new(), colours_of[0].to_backend_color()));
        };
        let mut rgb = vec![255u8; (w * h * 3) as usize];
        {
            let mut back = BitMapBackend::with_buffer(&mut rgb, (w, h));
            draw(&mut |op| op.apply(&mut back));
        }
        let mut pixels = vec![0u16; (w * h) as usize];
        let mut colours = Colours::new();
        {
            let mut back = IndexedBitmap::new(&mut pixels, &mut colours, (w, h), (255, 255, 255));
            draw(&mut |op| op.apply(&mut back));
        }
        let drawn: Vec<u8> = pixels
            .iter()
            .flat_map(|&i| {
                let c = colours.rgb[usize::from(i)];
                [(c >> 16) as u8, (c >> 8) as u8, c as u8]
            })
            .collect();
        assert!(rgb.iter().filter(|&&b| b != 255).count() > 3000);
        assert!(drawn == rgb, "the indexed backend changed pixels");
        let (mut ours, mut theirs) = (Vec::new(), Vec::new());
        let palette = colours.build_palette(&pixels, &mut ours);
        assert_eq!(
            palette,
            super::super::palette::quantize_into(&rgb, &mut theirs)
        );
        assert_eq!(ours, theirs);
    }

    enum Op {
        Rect(BackendCoord, BackendCoord, BackendColor),
        Line(BackendCoord, BackendCoord, BackendColor),
        Pixel(BackendCoord, BackendColor),
        Polygon(Vec<BackendCoord>, BackendColor),
        Wide(BackendCoord, BackendCoord, BackendColor, u32),
        Glyph(BackendCoord, BackendColor, f32),
    }

    impl Op {
        fn apply<B: DrawingBackend>(&self, b: &mut B) {
            let style = |c: &BackendColor| ShapeStyle {
                color: RGBColor(c.rgb.0, c.rgb.1, c.rgb.2).mix(c.alpha),
                filled: true,
                stroke_width: 1,
            };
            let done = match self {
                Op::Rect(a, z, c) => b.draw_rect(*a, *z, &style(c), true),
                Op::Line(a, z, c) => b.draw_line(*a, *z, &style(c)),
                Op::Pixel(a, c) => b.draw_pixel(*a, *c),
                Op::Glyph(a, c, v) => b.draw_pixel(*a, c.mix(f64::from(*v))),
                Op::Polygon(v, c) => b.fill_polygon(v.iter().copied(), &style(c)),
                Op::Wide(a, z, c, width) => {
                    b.draw_path([*a, *z, (z.0 + 9, z.1 - 4)], &style(c).stroke_width(*width))
                }
            };
            assert!(done.is_ok());
        }
    }

    /// A blank image of no height, a colour table past its size, indices past the table: no
    /// panic.
    #[test]
    fn degenerate_sizes_and_many_colours() {
        let mut colours = Colours::new();
        let mut none: Vec<u16> = Vec::new();
        let mut back = IndexedBitmap::new(&mut none, &mut colours, (10, 10), (255, 255, 255));
        assert_eq!(back.get_size(), (10, 0));
        assert!(back.draw_pixel((3, 3), BLACK.to_backend_color()).is_ok());
        let mut colours = Colours::new();
        for c in 0..70_000u32 {
            colours.index(c * 97);
        }
        assert_eq!(colours.rgb.len(), COLOURS_MAX);
        // Pixels of indices the table does not hold (a table cleared after drawing).
        let mut colours = Colours::new();
        let mut out = Vec::new();
        assert!(colours.build_palette(&[3, 3, 0], &mut out).is_empty());
        assert_eq!(out, vec![0, 0, 0]);
        colours.clear();
        colours.index(0x12_34_56);
        assert_eq!(
            colours.build_palette(&[0, 7, 0], &mut out),
            vec![0x12, 0x34, 0x56]
        );
        assert_eq!(out, vec![0, 0, 0]);
    }
}

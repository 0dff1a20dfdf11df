//! Series lines stroked through their pixels without the pixels that change nothing:
//! [`PixelPath`] maps a series to pixels and, for a line wider than one pixel, drops repeated
//! pixels and every pixel that lies on the straight segment between its neighbours (exactly, in
//! integer arithmetic, and only where the line goes on in the same direction) before the backend
//! strokes it. The path drawn is the same line (a dash's end, rounded to a pixel, can land
//! collinear with its neighbours: rare). A wide line is stroked in pieces split where it turns
//! back ([`sharp_turn_pieces`]); a dashed line's dashes are laid along the whole line
//! ([`dashes`]) and each dash is stroked in such pieces.
//!
//! Why: plotters turns a line wider than one pixel into a polygon, offsetting each vertex by
//! half the width. At a vertex whose neighbours are exactly collinear with it, it truncates the
//! offset vertex towards zero, where everywhere else it rounds (`plotters_backend`
//! 0.3.7, `rasterizer::path::compute_polygon_vertex`). A pass's series puts a point every 2-3
//! pixels, so such vertices are frequent, and each one dents the stroke's edge by a pixel: the
//! wide lines of every chart had a regular saw edge. Without those vertices the edge is straight.

use super::style::Stroke;
use plotters::element::{Drawable, PointCollection};
use plotters_backend::{BackendCoord, DrawingBackend, DrawingErrorKind};

/// Keeps the pixels of `pixels` that shape the line: the first and the last, and every one where
/// the line turns (or turns back). Repeated pixels and those on the straight segment between
/// their kept neighbours, in the same direction, are dropped.
pub fn shaping_pixels(pixels: impl IntoIterator<Item = BackendCoord>, out: &mut Vec<BackendCoord>) {
    out.clear();
    for p in pixels {
        if out.last() == Some(&p) {
            continue;
        }
        if let [.., a, b] = out[..] {
            let (u, v) = (sub(b, a), sub(p, b));
            let cross = u.0 * v.1 - u.1 * v.0;
            let dot = u.0 * v.0 + u.1 * v.1;
            if cross == 0 && dot > 0 {
                // b lies on the segment a-p: the line goes straight on through it
                out.pop();
            }
        }
        out.push(p);
    }
}

fn sub(a: BackendCoord, b: BackendCoord) -> (i64, i64) {
    (
        i64::from(a.0) - i64::from(b.0),
        i64::from(a.1) - i64::from(b.1),
    )
}

/// The pieces of a line split where it turns back, each turning point ending one piece and
/// starting the next: at a vertex that turns by more than 90°, and where a segment heads more
/// than 90° away from its piece's first segment (a U-turn made of two right angles, a spike with
/// a flat top). plotters polygonizes a wide line (and each dash of one) as one polygon, filled by
/// the even-odd rule, with a miter at each vertex: where the line turned back (a store's fill
/// rising and then drained, the storage chart's saw teeth) the polygon crossed itself, leaving a
/// hole in the line, and its miter stuck out as a spike beyond the data. Every segment of a piece
/// heads within 90° of the piece's first, so the piece never comes back on itself.
fn sharp_turn_pieces(pixels: &[BackendCoord]) -> Vec<&[BackendCoord]> {
    let mut pieces = Vec::new();
    let mut start = 0;
    for i in 1..pixels.len().saturating_sub(1) {
        let (u, v) = (sub(pixels[i], pixels[i - 1]), sub(pixels[i + 1], pixels[i]));
        let first = sub(pixels[start + 1], pixels[start]);
        let back = |a: (i64, i64)| a.0 * v.0 + a.1 * v.1 < 0;
        if back(u) || back(first) {
            pieces.push(&pixels[start..=i]);
            start = i;
        }
    }
    if !pixels.is_empty() {
        pieces.push(&pixels[start..]);
    }
    pieces
}

/// A series stroked through its shaping pixels ([`shaping_pixels`]), solid or dashed as its
/// [`Stroke`] says; for primary and secondary coordinates alike (plotters hands it the pixels).
pub struct PixelPath<C> {
    points: Vec<C>,
    stroke: Stroke,
}

impl<C> PixelPath<C> {
    pub fn new(points: Vec<C>, stroke: Stroke) -> Self {
        PixelPath { points, stroke }
    }
}

impl<'a, C> PointCollection<'a, C> for &'a PixelPath<C> {
    type Point = &'a C;
    type IntoIter = &'a [C];
    fn point_iter(self) -> &'a [C] {
        &self.points
    }
}

/// A wide line (or dash) stroked in the pieces of [`sharp_turn_pieces`], with a dot about the
/// line's width where two pieces meet to fill the outer corner (plotters draws small radii as a
/// plus or a diamond).
fn draw_in_pieces<DB: DrawingBackend>(
    backend: &mut DB,
    pixels: &[BackendCoord],
    style: &plotters::style::ShapeStyle,
) -> Result<(), DrawingErrorKind<DB::ErrorType>> {
    let dot = ((style.stroke_width / 2).max(1), style.filled());
    for (k, piece) in sharp_turn_pieces(pixels).into_iter().enumerate() {
        if k > 0 {
            backend.draw_circle(piece[0], dot.0, &dot.1, true)?;
        }
        backend.draw_path(piece.iter().copied(), style)?;
    }
    Ok(())
}

/// The dashes of a line: `on` pixels of ink, `off` of gap, along the line's length, each dash the
/// pixels it passes through. The arithmetic of plotters' `DashedPathElement` (f32 lengths, ends
/// rounded to the nearest pixel), so a line without sharp turns has plotters' dashes; but the
/// dashes are handed back instead of stroked, so that each can be drawn in pieces.
fn dashes(pixels: &[BackendCoord], on: u32, off: u32) -> Vec<Vec<BackendCoord>> {
    let to_f = |c: BackendCoord| (c.0 as f32, c.1 as f32);
    let to_i = |(x, y): (f32, f32)| (x.round() as i32, y.round() as i32);
    let mut out = Vec::new();
    let Some(&first) = pixels.first() else {
        return out;
    };
    if on == 0 {
        return out;
    }
    let (mut start, mut dist, mut solid) = (to_f(first), 0f32, true);
    let mut queue = vec![first];
    for &p in &pixels[1..] {
        let end = to_f(p);
        while start != end {
            let (dx, dy) = (end.0 - start.0, end.1 - start.1);
            let d = dx.hypot(dy);
            let size = if solid { on } else { off } as f32;
            let left = size - dist;
            if left < d {
                let t = left / d;
                start = (start.0 + dx * t, start.1 + dy * t);
                dist += left;
            } else {
                start = end;
                dist += d;
            }
            if solid {
                queue.push(to_i(start));
            }
            if size <= dist {
                if solid {
                    out.push(std::mem::take(&mut queue));
                } else {
                    queue.push(to_i(start));
                }
                dist = 0.0;
                solid = !solid;
            }
        }
    }
    if queue.len() > 1 {
        out.push(queue);
    }
    out
}

impl<C, DB: DrawingBackend> Drawable<DB> for PixelPath<C> {
    fn draw<I: Iterator<Item = BackendCoord>>(
        &self,
        pos: I,
        backend: &mut DB,
        _: (u32, u32),
    ) -> Result<(), DrawingErrorKind<DB::ErrorType>> {
        // One-pixel lines are drawn segment by segment, not polygonized: through every pixel, in
        // one piece, as plotters draws them.
        let wide = self.stroke.width > 1;
        let mut kept = Vec::with_capacity(self.points.len());
        if wide {
            shaping_pixels(pos, &mut kept);
        } else {
            kept.extend(pos);
        }
        let style = self.stroke.style();
        let mut stroke = |line: &[BackendCoord]| {
            if wide {
                draw_in_pieces(backend, line, &style)
            } else {
                backend.draw_path(line.iter().copied(), &style)
            }
        };
        match self.stroke.dash {
            None => stroke(&kept),
            // the dashes are laid along the whole line (their phase runs on through its turns),
            // then each dash is stroked
            Some((on, off)) => dashes(&kept, on, off)
                .iter()
                .try_for_each(|dash| stroke(dash)),
        }
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    /// `points` stroked on a white RGB bitmap of `size`, as a [`PixelPath`] (`shaped`) or as one
    /// plotters path: the bitmap's bytes.
    fn stroked(points: &[BackendCoord], stroke: Stroke, shaped: bool, size: (u32, u32)) -> Vec<u8> {
        use plotters::prelude::*;
        bitmap(size, |root| {
            if shaped {
                root.draw(&PixelPath::new(points.to_vec(), stroke))
            } else {
                root.draw(&PathElement::new(points.to_vec(), stroke.style()))
            }
            .unwrap()
        })
    }

    /// The bytes of a white RGB bitmap of `size` after `draw`.
    fn bitmap(
        size: (u32, u32),
        draw: impl FnOnce(
            &plotters::drawing::DrawingArea<
                plotters::prelude::BitMapBackend<'_>,
                plotters::coord::Shift,
            >,
        ),
    ) -> Vec<u8> {
        use plotters::prelude::*;
        let mut buf = vec![255u8; (size.0 * size.1 * 3) as usize];
        {
            let root = BitMapBackend::with_buffer(&mut buf, size).into_drawing_area();
            draw(&root);
            root.present().unwrap();
        }
        buf
    }

    fn shaped(pixels: &[BackendCoord]) -> Vec<BackendCoord> {
        let mut out = Vec::new();
        shaping_pixels(pixels.iter().copied(), &mut out);
        out
    }

    #[test]
    fn straight_runs_lose_their_inner_pixels_and_turns_stay() {
        // a straight run, with a repeated pixel: its ends only
        assert_eq!(
            shaped(&[(0, 0), (2, 1), (2, 1), (4, 2), (6, 3)]),
            [(0, 0), (6, 3)]
        );
        // a pixel staircase is not straight: every turn stays
        let stair = [(0, 0), (2, 1), (5, 2), (7, 3)];
        assert_eq!(shaped(&stair), stair);
        // a line that turns back on itself keeps its turning point
        assert_eq!(
            shaped(&[(0, 0), (3, 0), (6, 0), (2, 0)]),
            [(0, 0), (6, 0), (2, 0)]
        );
        // a corner, and short inputs as they are
        assert_eq!(
            shaped(&[(0, 0), (1, 0), (2, 0), (2, 1), (2, 2)]),
            [(0, 0), (2, 0), (2, 2)]
        );
        assert_eq!(shaped(&[(1, 1)]), [(1, 1)]);
        assert_eq!(shaped(&[(1, 1), (1, 1)]), [(1, 1)]);
        assert!(shaped(&[]).is_empty());
    }

    #[test]
    fn no_collinear_vertex_is_left_for_the_polygonizer() {
        // A pass's elevation curve at 2.6 px a step: after shaping, no three consecutive pixels are
        // collinear (the case plotters truncates), and every dropped pixel lies on the kept line.
        let pixels: Vec<BackendCoord> = (0..600)
            .map(|i| {
                let x = f64::from(i) * 2.6;
                (x as i32, (800.0 - 0.002 * (x - 780.0).powi(2)) as i32)
            })
            .collect();
        let kept = shaped(&pixels);
        assert!(kept.len() < pixels.len());
        for w in kept.windows(3) {
            let (u, v) = (sub(w[1], w[0]), sub(w[2], w[1]));
            assert!(u.0 * v.1 - u.1 * v.0 != 0, "{w:?}");
        }
        for p in &pixels {
            let on_line = kept.windows(2).any(|w| {
                let (u, v) = (sub(w[1], w[0]), sub(*p, w[0]));
                u.0 * v.1 - u.1 * v.0 == 0
                    && (0..=u.0 * u.0 + u.1 * u.1).contains(&(u.0 * v.0 + u.1 * v.1))
            });
            assert!(on_line, "{p:?}");
        }
    }

    #[test]
    fn a_straight_series_draws_as_its_two_ends_and_plotters_alone_dents_it() {
        use plotters::prelude::*;
        // A wide straight line given by 60 collinear points, drawn on plotters' RGB bitmap three
        // ways: as a PixelPath, as a plain path of its two ends, and as a plain path of all its
        // points. The first two are the same pixels; the third differs (the dented edge).
        let points: Vec<(i32, i32)> = (0..60).map(|i| (10 + 3 * i, 100 - i)).collect();
        let stroke = Stroke::solid(BLUE, 3);
        let shaped = stroked(&points, stroke, true, (200, 120));
        let ends = stroked(&[points[0], points[59]], stroke, false, (200, 120));
        let all = stroked(&points, stroke, false, (200, 120));
        assert!(shaped == ends, "PixelPath draws the line of its ends");
        assert!(
            all != ends,
            "plotters' polygon of every point differs (the control)"
        );
    }

    #[test]
    fn a_dashed_straight_series_dashes_as_its_two_ends() {
        use plotters::element::DashedPathElement;
        use plotters::prelude::*;
        // The dashed branch: 60 collinear points as a dashed PixelPath, and plotters' dashes
        // along the two ends alone: the same dashes (the dash phase runs along the same length).
        let points: Vec<(i32, i32)> = (0..60).map(|i| (10 + 3 * i, 100 - i)).collect();
        let stroke = Stroke::dashed(BLUE, 3, 16, 7);
        let shaped = stroked(&points, stroke, true, (200, 120));
        let ends = bitmap((200, 120), |root| {
            let ends = [points[0], points[59]];
            root.draw(&DashedPathElement::new(ends, 16, 7, stroke.style()))
                .unwrap()
        });
        assert!(shaped.iter().any(|&v| v != 255), "dashes were drawn");
        assert!(shaped == ends, "the dashes of the line's two ends");
    }

    #[test]
    fn a_line_splits_at_its_sharp_turns_only() {
        let none: [BackendCoord; 0] = [];
        assert!(sharp_turn_pieces(&none).is_empty());
        assert_eq!(sharp_turn_pieces(&[(1, 1)]), [&[(1, 1)][..]]);
        // a right angle and a gentle bend: one piece
        let bends = [(0, 0), (10, 0), (10, 10), (15, 20)];
        assert_eq!(sharp_turn_pieces(&bends), [&bends[..]]);
        // saw teeth (up slowly, straight down): split at every tooth's top and foot
        let saw = [(0, 50), (30, 10), (32, 50), (62, 10), (64, 50)];
        assert_eq!(
            sharp_turn_pieces(&saw),
            [&saw[0..=1], &saw[1..=2], &saw[2..=3], &saw[3..=4]]
        );
        // a U-turn of two right angles, and a spike with a flat top: split where the line heads
        // back against its piece's first segment
        let u_turn = [(10, 20), (40, 20), (40, 21), (10, 21)];
        assert_eq!(sharp_turn_pieces(&u_turn), [&u_turn[0..=2], &u_turn[2..=3]]);
        let flat_top = [(10, 40), (13, 10), (14, 10), (17, 40)];
        assert_eq!(
            sharp_turn_pieces(&flat_top),
            [&flat_top[0..=2], &flat_top[2..=3]]
        );
    }

    #[test]
    fn a_sharp_tooth_has_no_hole_and_no_spike() {
        use plotters::prelude::*;
        // A wide saw tooth drawn as a PixelPath: every pixel on the centre line is inked (no hole
        // where the even-odd fill of a self-crossing polygon cancels) and nothing is inked more
        // than 2 px above the data's top at y = 20 (the line's half-width is 1.5 px and the dot
        // at the turn has a radius of 1: no miter spike). As a control, the same tooth as one
        // plotters path has a hole or a spike.
        let tooth = vec![(20, 100), (60, 20), (64, 100), (104, 20), (108, 100)];
        let draw = |shaped| stroked(&tooth, Stroke::solid(BLUE, 3), shaped, (140, 130));
        let inked =
            |buf: &[u8], (x, y): (i32, i32)| buf[(y as usize * 140 + x as usize) * 3] != 255;
        // the centre line, each segment from its start (the path's last pixel, on the flat end's
        // edge, is not filled by plotters either way)
        let on_line = |buf: &[u8]| {
            tooth.windows(2).all(|w| {
                (0..20).all(|k| {
                    let x = w[0].0 + (w[1].0 - w[0].0) * k / 20;
                    let y = w[0].1 + (w[1].1 - w[0].1) * k / 20;
                    inked(buf, (x, y))
                })
            })
        };
        let above_top = |buf: &[u8]| (0..140).any(|x| (0..18).any(|y| inked(buf, (x, y))));
        let (shaped, plain) = (draw(true), draw(false));
        assert!(on_line(&shaped) && !above_top(&shaped));
        assert!(
            !on_line(&plain) || above_top(&plain),
            "the control shows the defect"
        );
    }

    #[test]
    fn a_u_turn_of_two_right_angles_has_no_slit() {
        use plotters::prelude::*;
        // A wide line out and back 2 px apart (a U-turn of two right angles, as a vertical jump,
        // a one-pixel step and a drop): every pixel between the two runs is inked. As a control,
        // one plotters path leaves a slit there (the even-odd fill of its self-crossing polygon).
        let u_turn = vec![(10, 20), (60, 20), (60, 22), (10, 22)];
        let draw = |shaped| stroked(&u_turn, Stroke::solid(BLUE, 4), shaped, (80, 40));
        let filled = |buf: &[u8]| (14..56).all(|x| (20..=22).all(|y| buf[(y * 80 + x) * 3] != 255));
        assert!(filled(&draw(true)), "no slit between the runs");
        assert!(
            !filled(&draw(false)),
            "the control: plotters alone leaves a slit"
        );
    }

    #[test]
    fn dashes_keep_their_phase_through_a_sharp_turn() {
        // A line 10 px up and 10 px back down, dashes of 6 on and 2 off: the second dash runs
        // through the turn (from 8 to 14 px along the line) instead of a new dash starting there,
        // and the third starts 2 px after it.
        let line = [(0, 20), (0, 10), (0, 20)];
        let d = dashes(&line, 6, 2);
        assert_eq!(
            d,
            [
                vec![(0, 20), (0, 14)],
                vec![(0, 12), (0, 10), (0, 14)],
                vec![(0, 16), (0, 20)]
            ]
        );
        // plotters' arithmetic on a straight line: 16 on, 7 off along 50 px
        let d = dashes(&[(0, 0), (50, 0)], 16, 7);
        assert_eq!(
            d,
            [
                vec![(0, 0), (16, 0)],
                vec![(23, 0), (39, 0)],
                vec![(46, 0), (50, 0)]
            ]
        );
        assert!(dashes(&[], 16, 7).is_empty());
        assert!(dashes(&[(0, 0), (50, 0)], 0, 7).is_empty());
    }
}

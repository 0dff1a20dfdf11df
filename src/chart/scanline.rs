//! Polygon filling for [`super::indexed::IndexedBitmap`] with the pixels of `plotters_backend`'s
//! `rasterizer::fill_polygon` (the filled areas of the charts and every line wider than one
//! pixel), without its work per sweep line: that rasterizer builds a new list of active edges on
//! each line and sorts it with a comparison that divides twice per call; here the list is kept
//! (retained in place), each edge's crossing is worked out once per line, and the buffers live
//! from polygon to polygon.
//!
//! The rule is plotters': sweep along the polygon's longer side, one line at a time; the edges
//! crossing a line, in the order of their crossings (a stable sort, so equal crossings keep the
//! order in which the edges arrived), are taken in pairs; the span between a pair is drawn as a
//! one-pixel line and its two end pixels blended by the fraction covered. An edge that ends on
//! the line is paired only with another that ends there, when they are at most a pixel apart.

use plotters_backend::{
    BackendColor, BackendCoord, BackendStyle, DrawingBackend, DrawingErrorKind,
};

/// One edge crossing the sweep lines, in sweep coordinates (`master` along the sweep).
#[derive(Clone, Copy)]
struct Active {
    epoch: u32,
    total: u32,
    begin: i32,
    end: i32,
    /// Where it crosses the current line (plotters' `get_slave_pos`).
    at: f64,
}

impl Active {
    /// An edge from `a` to `b` (sweep coordinate first); none when it lies along one line.
    fn new(a: BackendCoord, b: BackendCoord) -> Option<Active> {
        if a.0 == b.0 {
            return None;
        }
        let (a, b) = if a.0 > b.0 { (b, a) } else { (a, b) };
        let mut e = Active {
            epoch: 0,
            total: b.0.wrapping_sub(a.0) as u32,
            begin: a.1,
            end: b.1,
            at: 0.0,
        };
        e.locate();
        Some(e)
    }

    fn locate(&mut self) {
        self.at = f64::from(self.begin)
            + ((i64::from(self.end) - i64::from(self.begin)) * i64::from(self.epoch)) as f64
                / f64::from(self.total);
    }

    /// Lines left before it ends (0: it ends on this one).
    fn left(&self) -> u32 {
        self.total - self.epoch
    }
}

/// The buffers of [`fill_polygon`], kept from polygon to polygon.
#[derive(Default)]
pub struct Scratch {
    /// Edges in sweep coordinates, the lower end first.
    edges: Vec<(BackendCoord, BackendCoord)>,
    active: Vec<Active>,
}

/// Fill the polygon `vertices` on `back` as plotters' rasterizer does (see the module note).
pub fn fill_polygon<B: DrawingBackend, S: BackendStyle>(
    back: &mut B,
    scratch: &mut Scratch,
    vertices: &[BackendCoord],
    style: &S,
) -> Result<(), DrawingErrorKind<B::ErrorType>> {
    let Some(&first) = vertices.first() else {
        return Ok(());
    };
    let (mut lo, mut hi) = (first, first);
    for &(x, y) in vertices {
        lo = (lo.0.min(x), lo.1.min(y));
        hi = (hi.0.max(x), hi.1.max(y));
    }
    if lo.0 == hi.0 || lo.1 == hi.1 {
        return back.draw_line(lo, hi, style);
    }
    // Sweep along x (columns) when the polygon is wider than it is tall.
    let along_x = i64::from(hi.0) - i64::from(lo.0) > i64::from(hi.1) - i64::from(lo.1);
    let swap = |p: BackendCoord| if along_x { p } else { (p.1, p.0) };
    let Scratch { edges, active } = scratch;
    edges.clear();
    active.clear();
    let next = vertices.iter().skip(1).chain(std::iter::once(&first));
    for (&a, &b) in vertices.iter().zip(next) {
        let (a, b) = (swap(a), swap(b));
        edges.push(if a.0 > b.0 { (b, a) } else { (a, b) });
    }
    edges.sort_by_key(|e| e.0 .0);
    let (low, high) = if along_x { (lo.0, hi.0) } else { (lo.1, hi.1) };
    let colour = style.color();
    let mut next_edge = 0;
    for line in low..=high {
        active.retain(|e| e.left() > 0);
        for e in active.iter_mut() {
            e.epoch += 1;
            e.locate();
        }
        while let Some(&(a, b)) = edges.get(next_edge) {
            if a.0 > line {
                break;
            }
            active.extend(Active::new(a, b));
            next_edge += 1;
        }
        active.sort_by(|a, b| a.at.partial_cmp(&b.at).unwrap_or(std::cmp::Ordering::Equal));
        draw_line_spans(back, active, line, along_x, colour)?;
    }
    Ok(())
}

/// Pair the crossings of one sweep line and draw each pair's span.
fn draw_line_spans<B: DrawingBackend>(
    back: &mut B,
    active: &[Active],
    line: i32,
    along_x: bool,
    colour: BackendColor,
) -> Result<(), DrawingErrorKind<B::ErrorType>> {
    let mut first: Option<&Active> = None;
    for e in active {
        let Some(a) = first else {
            first = Some(e);
            continue;
        };
        let b = e;
        if a.left() == 0 && b.left() != 0 {
            first = Some(b);
            continue;
        }
        if a.left() != 0 && b.left() == 0 {
            continue;
        }
        first = None;
        let (from, to) = (a.at, b.at);
        if a.left() == 0 && b.left() == 0 && to - from > 1.0 {
            continue;
        }
        let (start, stop) = (from.ceil() as i32, to.floor() as i32);
        if along_x {
            back.draw_line((line, start), (line, stop), &colour)?;
            back.draw_pixel((line, from.floor() as i32), colour.mix(from.ceil() - from))?;
            back.draw_pixel((line, to.ceil() as i32), colour.mix(to - to.floor()))?;
        } else {
            back.draw_line((start, line), (stop, line), &colour)?;
            back.draw_pixel((from.floor() as i32, line), colour.mix(from.ceil() - from))?;
            // `to.floor() - to` (at most 0: the pixel is never drawn) is plotters-backend
            // 0.3.7's own expression on this path, kept so the pixels stay plotters' (the
            // backends' byte-equality test); the column path above has `to - to.floor()`.
            back.draw_pixel((to.ceil() as i32, line), colour.mix(to.floor() - to))?;
        }
    }
    Ok(())
}

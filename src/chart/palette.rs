//! Palette (indexed-colour) PNG from a drawn RGB buffer: one byte per pixel instead of three, so a
//! third of the bytes to filter and compress, and files several times smaller.
//!
//! A chart is mostly flat colour (background, series, text) with anti-aliased edges blending two
//! of them. The palette keeps the 256 most frequent colours exactly; a chart with 256 colours or
//! fewer is stored losslessly. Every other colour (a rare blend level of an edge) is drawn with
//! the palette colour nearest to it (squared RGB distance), which moves an edge pixel by a few
//! levels of one blend ramp: the chart looks the same. Colours are counted run by run (a row of
//! one colour is one count) in an open-addressing table.
//!
//! The charts themselves are drawn into colour indices (`super::indexed`), whose
//! `Colours::build_palette` applies this rule to the index image; [`quantize`] is the rule on an RGB
//! buffer, the reference the tests compare with.

/// Most colours a palette PNG holds.
pub const PALETTE_MAX: usize = 256;

/// Colours of one image with a number each (a count, then an index): open addressing over a
/// power-of-two table, keys stored as RGB + 1 so that 0 marks a free slot.
struct ColourTable {
    keys: Vec<u32>,
    values: Vec<u32>,
    shift: u32,
    len: usize,
}

impl ColourTable {
    fn new() -> Self {
        let bits = 14;
        ColourTable {
            keys: vec![0; 1 << bits],
            values: vec![0; 1 << bits],
            shift: 32 - bits,
            len: 0,
        }
    }

    /// The slot of colour `c`, claimed if it is new.
    fn slot(&mut self, c: u32) -> usize {
        let k = c + 1;
        let mask = self.keys.len() - 1;
        let mut i = (k.wrapping_mul(0x9e37_79b1) >> self.shift) as usize;
        loop {
            match self.keys[i] {
                0 => {
                    if 2 * (self.len + 1) > self.keys.len() {
                        self.grow();
                        return self.slot(c);
                    }
                    self.keys[i] = k;
                    self.len += 1;
                    return i;
                }
                x if x == k => return i,
                _ => i = (i + 1) & mask,
            }
        }
    }

    fn grow(&mut self) {
        let old: Vec<(u32, u32)> = self.entries().collect();
        let bits = 33 - self.shift;
        *self = ColourTable {
            keys: vec![0; 1 << bits],
            values: vec![0; 1 << bits],
            shift: 32 - bits,
            len: 0,
        };
        for (c, v) in old {
            let i = self.slot(c);
            self.values[i] = v;
        }
    }

    /// (colour, value) of every colour.
    fn entries(&self) -> impl Iterator<Item = (u32, u32)> + '_ {
        self.keys
            .iter()
            .zip(&self.values)
            .filter(|(k, _)| **k != 0)
            .map(|(k, v)| (k - 1, *v))
    }
}

/// Calls `f(colour, run length)` for each run of equal pixels of an RGB buffer.
fn runs(rgb: &[u8], mut f: impl FnMut(u32, usize)) {
    let n = rgb.len() / 3;
    if n == 0 {
        return;
    }
    let key = |i: usize| {
        (u32::from(rgb[3 * i]) << 16) | (u32::from(rgb[3 * i + 1]) << 8) | u32::from(rgb[3 * i + 2])
    };
    let (mut current, mut start) = (key(0), 0usize);
    let mut i = 1;
    while i < n {
        // Eight pixels that each equal the one before them continue the run: one comparison of
        // 24 bytes with the same bytes shifted by a pixel (most of a chart is long runs). Fixed-
        // size arrays, so the comparison is inlined rather than a call.
        if i + 8 <= n {
            let (a, b) = (&rgb[3 * i..3 * i + 24], &rgb[3 * i - 3..3 * i + 21]);
            let a: &[u8; 24] = a.try_into().expect("24 bytes");
            let b: &[u8; 24] = b.try_into().expect("24 bytes");
            if a == b {
                i += 8;
                continue;
            }
        }
        let k = key(i);
        if k != current {
            f(current, i - start);
            current = k;
            start = i;
        }
        i += 1;
    }
    f(current, n - start);
}

/// The palette of an RGB buffer and its indexed image: (palette as RGB triples, one index per
/// pixel).
pub fn quantize(rgb: &[u8]) -> (Vec<u8>, Vec<u8>) {
    let mut indices = Vec::new();
    let palette = quantize_into(rgb, &mut indices);
    (palette, indices)
}

/// [`quantize`] into a caller's index buffer (reused from chart to chart: no fresh pages to
/// fault in); returns the palette.
pub fn quantize_into(rgb: &[u8], indices: &mut Vec<u8>) -> Vec<u8> {
    let mut table = ColourTable::new();
    // The buffer is read once: its runs are kept for the indexed image.
    let mut all_runs: Vec<(u32, u32)> = Vec::with_capacity(rgb.len() / 64);
    runs(rgb, |c, n| {
        let i = table.slot(c);
        table.values[i] += n as u32;
        all_runs.push((c, n as u32));
    });
    let mut by_count: Vec<(u32, u32)> = table.entries().map(|(c, n)| (n, c)).collect();
    by_count.sort_unstable_by(|a, b| by_frequency((a.0, a.1), (b.0, b.1)));
    let kept: Vec<u32> = by_count.iter().take(PALETTE_MAX).map(|x| x.1).collect();
    for (i, &c) in kept.iter().enumerate() {
        let s = table.slot(c);
        table.values[s] = i as u32;
    }
    for &(_, c) in by_count.iter().skip(PALETTE_MAX) {
        let s = table.slot(c);
        table.values[s] = u32::from(nearest(&kept, c));
    }
    // Runs alternate between few colours: remember the last lookup.
    let mut last = (u32::MAX, 0u8);
    let runs = all_runs.into_iter().map(|(c, n)| {
        if c != last.0 {
            let s = table.slot(c);
            last = (c, table.values[s] as u8);
        }
        (last.1, n as usize)
    });
    write_runs(runs, rgb.len() / 3, indices);
    triples(&kept)
}

/// The palette's order: most frequent first, equal counts by colour (so that the palette does not
/// depend on the order colours were met), for `(count, colour)`. The one rule of both
/// [`quantize_into`] and the indexed charts' `Colours::build_palette`.
pub(super) fn by_frequency(a: (u32, u32), b: (u32, u32)) -> std::cmp::Ordering {
    b.0.cmp(&a.0).then(a.1.cmp(&b.1))
}

/// The index image of `len` pixels from its runs `(index, length)`, into `out`.
pub(super) fn write_runs(
    runs: impl IntoIterator<Item = (u8, usize)>,
    len: usize,
    out: &mut Vec<u8>,
) {
    out.clear();
    out.resize(len, 0);
    let mut at = 0;
    for (v, n) in runs {
        if n <= 16 && at + 16 <= out.len() {
            // A short run (edges, text): one 16-byte store, the bytes past the run overwritten by
            // the runs after it; no call to memset.
            let block: &mut [u8; 16] = (&mut out[at..at + 16]).try_into().expect("16 bytes");
            *block = [v; 16];
        } else {
            out[at..at + n].fill(v);
        }
        at += n;
    }
}

/// The palette's colours (0xRRGGBB) as the PNG's RGB triples.
pub(super) fn triples(kept: &[u32]) -> Vec<u8> {
    kept.iter()
        .flat_map(|&c| [(c >> 16) as u8, (c >> 8) as u8, c as u8])
        .collect()
}

/// The index of the palette colour nearest to `c` (squared RGB distance; the first on a tie).
pub(super) fn nearest(palette: &[u32], c: u32) -> u8 {
    let d = |p: u32| {
        let ch = |s: u32| ((p >> s) & 0xff) as i32 - ((c >> s) & 0xff) as i32;
        ch(16).pow(2) + ch(8).pow(2) + ch(0).pow(2)
    };
    let mut best = (i32::MAX, 0usize);
    for (i, &p) in palette.iter().enumerate() {
        let dist = d(p);
        if dist < best.0 {
            best = (dist, i);
        }
    }
    best.1 as u8
}

#[cfg(test)]
mod tests {
    use super::*;

    /// Runs over long and short stretches, at every offset of the eight-pixel skip.
    #[test]
    fn runs_are_found_whatever_their_length() {
        let colours: Vec<[u8; 3]> = (0..40)
            .flat_map(|k: u8| std::iter::repeat_n([k, 0, 255 - k], 1 + (k as usize * 7) % 19))
            .collect();
        let rgb: Vec<u8> = colours.iter().flatten().copied().collect();
        let mut got = Vec::new();
        runs(&rgb, |c, n| got.push((c, n)));
        let want: Vec<(u32, usize)> = (0..40u32)
            .map(|k| ((k << 16) | (255 - k), 1 + (k as usize * 7) % 19))
            .collect();
        assert_eq!(got, want);
    }

    /// Few colours: stored exactly, most frequent first.
    #[test]
    fn few_colours_are_kept_exactly() {
        let rgb = [255, 255, 255, 255, 255, 255, 10, 20, 30, 255, 255, 255];
        let (palette, idx) = quantize(&rgb);
        assert_eq!(palette, vec![255, 255, 255, 10, 20, 30]);
        assert_eq!(idx, vec![0, 0, 1, 0]);
    }

    /// More than 256 colours: the 256 most frequent kept, each rare one drawn with its nearest.
    #[test]
    fn rare_colours_take_the_nearest_kept_one() {
        let mut rgb = Vec::new();
        // 256 grey levels twice each (frequent), then one pixel of a near-white blue.
        for g in 0..=255u8 {
            rgb.extend_from_slice(&[g, g, g, g, g, g]);
        }
        rgb.extend_from_slice(&[250, 250, 254]);
        let (palette, idx) = quantize(&rgb);
        assert_eq!(palette.len(), 3 * PALETTE_MAX);
        let last = *idx.last().unwrap() as usize;
        assert_eq!(&palette[3 * last..3 * last + 3], &[251, 251, 251]);
        // every grey is its own entry
        for (p, &i) in idx.iter().take(512).enumerate() {
            let g = (p / 2) as u8;
            assert_eq!(&palette[3 * i as usize..3 * i as usize + 3], &[g, g, g]);
        }
    }
}

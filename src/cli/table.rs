//! Aligned plain-text tables for people.

use std::io::Write;

/// Column alignment.
#[derive(Clone, Copy, PartialEq, Eq)]
pub enum Align {
    Left,
    Right,
}

/// A simple text table: a header row, then rows; columns padded to their widest cell.
pub struct Table {
    headers: Vec<String>,
    align: Vec<Align>,
    rows: Vec<Vec<String>>,
}

impl Table {
    pub fn new(columns: &[(&str, Align)]) -> Self {
        Table {
            headers: columns.iter().map(|c| c.0.to_string()).collect(),
            align: columns.iter().map(|c| c.1).collect(),
            rows: Vec::new(),
        }
    }

    pub fn row(&mut self, cells: Vec<String>) {
        debug_assert_eq!(cells.len(), self.headers.len());
        self.rows.push(cells);
    }

    pub fn render(&self) -> String {
        let mut out = String::new();
        self.render_rows(self.rows.len(), |i| self.rows[i].clone(), &mut |s| {
            out.push_str(s);
            Ok::<(), std::convert::Infallible>(())
        })
        .expect("writing into a String");
        out
    }

    /// [`Table::render_rows`] into `out`, through a buffer: stdout writes every line it is handed
    /// at once, which for a year's table (13,000 lines with the contacts) was 13,000 system calls
    /// in the one thread that prints (about 40 ms into a file on ext4, 2026-12-05).
    pub fn write_rows(
        &self,
        n: usize,
        row: impl Fn(usize) -> Vec<String>,
        out: &mut dyn std::io::Write,
    ) -> std::io::Result<()> {
        let mut buffered = std::io::BufWriter::with_capacity(1 << 16, out);
        self.render_rows(n, row, &mut |line| buffered.write_all(line.as_bytes()))?;
        buffered.flush()
    }

    /// Render the header and `n` rows made by `row` (called twice per row: once for the column
    /// widths, once to write it), handing each line to `emit`: the same text as [`Table::row`]
    /// and [`Table::render`] without holding every row.
    pub fn render_rows<E>(
        &self,
        n: usize,
        row: impl Fn(usize) -> Vec<String>,
        emit: &mut dyn FnMut(&str) -> Result<(), E>,
    ) -> Result<(), E> {
        let mut width: Vec<usize> = self.headers.iter().map(|h| display_width(h)).collect();
        let columns = width.len();
        for k in 0..n {
            for (i, c) in row(k).iter().enumerate().take(columns) {
                width[i] = width[i].max(display_width(c));
            }
        }
        let line = |cells: &[String], emit: &mut dyn FnMut(&str) -> Result<(), E>| {
            let mut s = String::new();
            for (i, c) in cells.iter().enumerate() {
                let pad = width[i].saturating_sub(display_width(c));
                if i > 0 {
                    s.push_str("  ");
                }
                match self.align[i] {
                    Align::Left => {
                        s.push_str(c);
                        s.extend(std::iter::repeat_n(' ', pad));
                    }
                    Align::Right => {
                        s.extend(std::iter::repeat_n(' ', pad));
                        s.push_str(c);
                    }
                }
            }
            let end = s.trim_end().len();
            s.truncate(end);
            s.push('\n');
            emit(&s)
        };
        line(&self.headers, emit)?;
        let rule: Vec<String> = width.iter().map(|w| "-".repeat(*w)).collect();
        line(&rule, emit)?;
        for k in 0..n {
            line(&row(k), emit)?;
        }
        Ok(())
    }
}

/// The terminal cells a text takes (a CJK character two, a combining mark none).
fn display_width(s: &str) -> usize {
    unicode_width::UnicodeWidthStr::width(s)
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn aligns_columns() {
        let mut t = Table::new(&[("name", Align::Left), ("value", Align::Right)]);
        t.row(vec!["a".into(), "1.5".into()]);
        t.row(vec!["longer".into(), "10.25".into()]);
        let s = t.render();
        let lines: Vec<&str> = s.lines().collect();
        assert_eq!(lines[0], "name    value");
        assert_eq!(lines[2], "a         1.5");
        assert_eq!(lines[3], "longer  10.25");
        // The same text streamed row by row.
        let rows = [["a", "1.5"], ["longer", "10.25"]];
        let mut streamed = String::new();
        Table::new(&[("name", Align::Left), ("value", Align::Right)])
            .render_rows(2, |i| rows[i].map(String::from).to_vec(), &mut |l| {
                streamed.push_str(l);
                Ok::<(), ()>(())
            })
            .unwrap();
        assert_eq!(streamed, s);
    }

    /// Column widths count terminal cells (Unicode Standard Annex #11, East Asian Width): a CJK
    /// character takes two, so `東京局` is six cells wide and the column after it lines up.
    #[test]
    fn wide_characters_take_two_cells() {
        let mut t = Table::new(&[("station", Align::Left), ("passes", Align::Right)]);
        t.row(vec!["東京局".into(), "12".into()]);
        t.row(vec!["Nordkam".into(), "7".into()]);
        let s = t.render();
        let lines: Vec<&str> = s.lines().collect();
        assert_eq!(lines[2], "東京局       12");
        assert_eq!(lines[3], "Nordkam       7");
        assert_eq!(display_width(lines[2]), display_width(lines[3]));
    }
}

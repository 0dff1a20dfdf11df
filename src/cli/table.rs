//! Aligned plain-text tables for people.

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
        let n = self.headers.len();
        let mut width: Vec<usize> = self.headers.iter().map(|h| h.chars().count()).collect();
        for r in &self.rows {
            for (i, c) in r.iter().enumerate().take(n) {
                width[i] = width[i].max(c.chars().count());
            }
        }
        let mut out = String::new();
        let line = |cells: &[String], out: &mut String| {
            let mut s = String::new();
            for (i, c) in cells.iter().enumerate() {
                let pad = width[i].saturating_sub(c.chars().count());
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
            out.push_str(s.trim_end());
            out.push('\n');
        };
        line(&self.headers, &mut out);
        let rule: Vec<String> = width.iter().map(|w| "-".repeat(*w)).collect();
        line(&rule, &mut out);
        for r in &self.rows {
            line(r, &mut out);
        }
        out
    }
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
    }
}

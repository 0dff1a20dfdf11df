//! Reader of the reference data in `tests/data/`: CSV files that open with `#` comment lines
//! naming their source (document, table, edition, or library, version and exact call), then a
//! header row and the values.

use std::collections::HashMap;

/// One data row: column name -> text of the cell.
pub struct Row {
    file: String,
    cells: HashMap<String, String>,
}

impl Row {
    /// The cell of `column` as text.
    pub fn text(&self, column: &str) -> &str {
        self.cells
            .get(column)
            .unwrap_or_else(|| panic!("{}: no column {column}", self.file))
    }

    /// The cell of `column` as a number.
    pub fn num(&self, column: &str) -> f64 {
        let t = self.text(column).trim();
        t.parse()
            .unwrap_or_else(|e| panic!("{}: {column} = {t:?}: {e}", self.file))
    }
}

/// Reads `tests/data/<rel>`. The file must open with at least one `#` line (its source) and
/// hold at least one data row.
pub fn read_csv(rel: &str) -> Vec<Row> {
    let path = format!("{}/tests/data/{rel}", env!("CARGO_MANIFEST_DIR"));
    let text = std::fs::read_to_string(&path).unwrap_or_else(|e| panic!("{path}: {e}"));
    assert!(text.starts_with('#'), "{path} must open with its source");
    let mut rdr = csv::ReaderBuilder::new()
        .comment(Some(b'#'))
        .from_reader(text.as_bytes());
    let headers = rdr.headers().unwrap().clone();
    let rows: Vec<Row> = rdr
        .records()
        .map(|r| {
            let r = r.unwrap_or_else(|e| panic!("{path}: {e}"));
            Row {
                file: rel.to_string(),
                cells: headers
                    .iter()
                    .zip(r.iter())
                    .map(|(h, v)| (h.to_string(), v.to_string()))
                    .collect(),
            }
        })
        .collect();
    assert!(!rows.is_empty(), "{path} has no rows");
    rows
}

/// Reads `tests/data/<rel>` whose cells are all numbers: column name -> value, per row.
pub fn read_csv_numbers(rel: &str) -> Vec<HashMap<String, f64>> {
    read_csv(rel)
        .iter()
        .map(|r| r.cells.keys().map(|k| (k.clone(), r.num(k))).collect())
        .collect()
}

//! The files of a plan's output folder: one CSV time series per pass (written by [`CsvSink`] as
//! each pass is planned) and the summaries (`summary.json`, `summary.csv`, `days.csv`,
//! `masks.csv`). Files are written atomically; the folder as a whole is staged by
//! [`super::Staging`].

use super::plan::{step_rows, DayRow, PlanDoc};
use super::{slug, to_csv, write_atomic};
use crate::plan::{PassSeries, PassSink, Planner};
use crate::timefmt::file_stamp;
use chrono::{DateTime, Utc};
use std::path::{Path, PathBuf};

/// Error writing an output file: the file and what went wrong.
#[derive(Debug, thiserror::Error)]
#[error("{}: cannot write: {message}", path.display())]
pub struct FileError {
    pub path: PathBuf,
    pub message: String,
}

fn file_error(path: &Path, e: impl std::fmt::Display) -> FileError {
    FileError {
        path: path.to_path_buf(),
        message: e.to_string(),
    }
}

/// File name of a pass's time series: `pass-NNN-<station>-<AOS>.csv`.
pub fn pass_csv_name(number: usize, station: &str, aos: &DateTime<Utc>) -> String {
    format!("pass-{number:03}-{}-{}.csv", slug(station), file_stamp(aos))
}

/// Writes each pass's time series CSV into a folder.
pub struct CsvSink<'a> {
    pub planner: &'a Planner,
    pub dir: &'a Path,
}

impl PassSink for CsvSink<'_> {
    type Error = FileError;
    fn pass(&self, s: &PassSeries<'_>) -> Result<(), FileError> {
        let st = &self.planner.stations()[s.plan.station_index].station.name;
        let path = self
            .dir
            .join(pass_csv_name(s.plan.number, st, &s.plan.pass.aos));
        let rows = step_rows(s, self.planner.rates());
        let text = to_csv(&rows).map_err(|e| file_error(&path, e))?;
        write_atomic(&path, text.as_bytes()).map_err(|e| file_error(&path, e))
    }
}

/// The plan summary as JSON text (the `plan --format json` output and `summary.json`).
pub fn summary_json(doc: &PlanDoc) -> String {
    serde_json::to_string_pretty(doc).expect("the plan summary serializes") + "\n"
}

/// Write `summary.json`, `summary.csv`, `days.csv` and `masks.csv` into `dir`.
pub fn write_summaries(dir: &Path, doc: &PlanDoc) -> Result<(), FileError> {
    let days: Vec<&DayRow> = doc.days.iter().collect();
    let files: [(&str, Result<String, csv::Error>); 4] = [
        ("summary.json", Ok(summary_json(doc))),
        ("summary.csv", to_csv(&doc.passes)),
        ("days.csv", to_csv(&days)),
        ("masks.csv", to_csv(&doc.usable_masks)),
    ];
    for (name, text) in files {
        let path = dir.join(name);
        let text = text.map_err(|e| file_error(&path, e))?;
        write_atomic(&path, text.as_bytes()).map_err(|e| file_error(&path, e))?;
    }
    Ok(())
}

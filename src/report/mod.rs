//! Output: the serialized row types (the public wire format, kept apart from the domain types so it
//! stays stable when internals change), CSV and JSON, the files of a plan's output folder, and
//! atomic file writing.

pub mod budget;
pub mod files;
pub mod geometry;
pub mod plan;

use std::io::Write;
use std::path::Path;

/// Write `bytes` to `path` atomically: write a temporary file in the same folder, flush it to disk,
/// then rename it over the target. A reader never sees a half-written file.
pub fn write_atomic(path: &Path, bytes: &[u8]) -> std::io::Result<()> {
    let dir = path
        .parent()
        .filter(|p| !p.as_os_str().is_empty())
        .unwrap_or(Path::new("."));
    let name = path
        .file_name()
        .map(|n| n.to_string_lossy().into_owned())
        .unwrap_or_else(|| "out".into());
    let tmp = dir.join(format!(".{name}.tmp-{}", std::process::id()));
    let result = (|| {
        let mut f = std::fs::File::create(&tmp)?;
        f.write_all(bytes)?;
        f.sync_all()?;
        std::fs::rename(&tmp, path)
    })();
    if result.is_err() {
        let _ = std::fs::remove_file(&tmp);
    }
    result
}

/// An output folder filled in a hidden staging folder beside its files and moved into place only
/// when the whole run has succeeded: a failed run changes nothing in the folder, and files of our
/// naming scheme left by an earlier run are replaced rather than mixed with the new ones.
pub struct Staging {
    final_dir: std::path::PathBuf,
    dir: std::path::PathBuf,
    committed: bool,
}

impl Staging {
    /// Create `final_dir` if needed and a staging folder inside it.
    pub fn new(final_dir: &Path) -> std::io::Result<Staging> {
        std::fs::create_dir_all(final_dir)?;
        let dir = final_dir.join(format!(".passbudget-staging-{}", std::process::id()));
        if dir.exists() {
            std::fs::remove_dir_all(&dir)?;
        }
        std::fs::create_dir(&dir)?;
        Ok(Staging {
            final_dir: final_dir.to_path_buf(),
            dir,
            committed: false,
        })
    }

    /// Where the files are written during the run.
    pub fn path(&self) -> &Path {
        &self.dir
    }

    /// Names of the files staged so far.
    pub fn staged_names(&self) -> std::io::Result<Vec<String>> {
        std::fs::read_dir(&self.dir)?
            .map(|e| e.map(|e| e.file_name().to_string_lossy().into_owned()))
            .collect()
    }

    /// Move every staged file into place, replacing the earlier files for which `ours` holds.
    /// Nothing is removed before everything has been checked: every destination must be absent or
    /// a plain file. Earlier files are first moved into a backup folder and restored if a move
    /// fails, so the folder holds either the old results or the new ones.
    pub fn commit(mut self, ours: impl Fn(&str) -> bool) -> std::io::Result<()> {
        let staged = self.staged_names()?;
        for n in &staged {
            let dest = self.final_dir.join(n);
            if let Ok(m) = std::fs::symlink_metadata(&dest) {
                if !m.file_type().is_file() {
                    return Err(std::io::Error::other(format!(
                        "{} exists and is not a plain file",
                        dest.display()
                    )));
                }
            }
        }
        let mut old = Vec::new();
        for e in std::fs::read_dir(&self.final_dir)? {
            let e = e?;
            let name = e.file_name().to_string_lossy().into_owned();
            if e.file_type()?.is_file() && (ours(&name) || staged.contains(&name)) {
                old.push(name);
            }
        }
        let backup = self
            .final_dir
            .join(format!(".passbudget-previous-{}", std::process::id()));
        std::fs::create_dir_all(&backup)?;
        let result = (|| -> std::io::Result<()> {
            for n in &old {
                std::fs::rename(self.final_dir.join(n), backup.join(n))?;
            }
            for n in &staged {
                std::fs::rename(self.dir.join(n), self.final_dir.join(n))?;
            }
            Ok(())
        })();
        if let Err(e) = result {
            // Put the earlier results back: new files out, old files in.
            for n in &staged {
                let p = self.final_dir.join(n);
                if !backup.join(n).exists() && !old.contains(n) {
                    let _ = std::fs::rename(&p, self.dir.join(n));
                }
            }
            for n in &old {
                let _ = std::fs::rename(backup.join(n), self.final_dir.join(n));
            }
            let _ = std::fs::remove_dir_all(&backup);
            return Err(e);
        }
        std::fs::remove_dir_all(&backup)?;
        std::fs::remove_dir(&self.dir)?;
        self.committed = true;
        Ok(())
    }
}

impl Drop for Staging {
    fn drop(&mut self) {
        if !self.committed {
            let _ = std::fs::remove_dir_all(&self.dir);
        }
    }
}

/// File names passbudget writes into an output folder (pass series and charts, summaries).
pub fn is_output_name(name: &str) -> bool {
    let chart = name.ends_with(".png") || name.ends_with(".svg");
    // pass-NNN-... (.csv or a chart)
    let pass = name.strip_prefix("pass-").is_some_and(|r| {
        r.len() > 4 && r.as_bytes()[..3].iter().all(u8::is_ascii_digit) && r.as_bytes()[3] == b'-'
    }) && (chart || name.ends_with(".csv"));
    let window_chart = chart
        && ["sky-", "mask-", "summary-"]
            .iter()
            .any(|p| name.starts_with(p));
    pass || window_chart || ["summary.json", "summary.csv", "days.csv", "masks.csv"].contains(&name)
}

/// Serialize rows to CSV text with one header row.
pub fn to_csv<T: serde::Serialize>(rows: &[T]) -> Result<String, csv::Error> {
    let mut w = csv::Writer::from_writer(Vec::new());
    for r in rows {
        w.serialize(r)?;
    }
    let bytes = w
        .into_inner()
        .map_err(|e| csv::Error::from(e.into_error()))?;
    Ok(String::from_utf8(bytes).expect("csv writes UTF-8"))
}

/// File-name-safe lower-case slug: `Sierra Baja` -> `sierra-baja`.
pub fn slug(name: &str) -> String {
    let mut out = String::with_capacity(name.len());
    let mut dash = false;
    for c in name.chars() {
        if c.is_ascii_alphanumeric() {
            out.push(c.to_ascii_lowercase());
            dash = false;
        } else if !out.is_empty() && !dash {
            out.push('-');
            dash = true;
        }
    }
    while out.ends_with('-') {
        out.pop();
    }
    if out.is_empty() {
        "unnamed".into()
    } else {
        out
    }
}

/// Round to `digits` decimals for stable, readable output (JSON/CSV are deterministic anyway).
pub fn round(x: f64, digits: i32) -> f64 {
    let s = 10f64.powi(digits);
    (x * s).round() / s
}

/// Minutes:seconds for durations in tables.
pub fn mm_ss(seconds: f64) -> String {
    let s = seconds.max(0.0).round() as i64;
    format!("{}:{:02}", s / 60, s % 60)
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn atomic_write_replaces_whole_file() {
        let dir = tempfile::tempdir().unwrap();
        let p = dir.path().join("a.txt");
        write_atomic(&p, b"first").unwrap();
        write_atomic(&p, b"second").unwrap();
        assert_eq!(std::fs::read_to_string(&p).unwrap(), "second");
        assert_eq!(std::fs::read_dir(dir.path()).unwrap().count(), 1);
        assert!(write_atomic(&dir.path().join("missing/x.txt"), b"x").is_err());
    }

    #[test]
    fn staging_replaces_all_or_nothing() {
        let dir = tempfile::tempdir().unwrap();
        let out = dir.path();
        std::fs::write(out.join("summary.json"), "old").unwrap();
        std::fs::write(out.join("pass-001-a-x.csv"), "old pass").unwrap();
        std::fs::write(out.join("notes.txt"), "mine").unwrap();
        // A successful run: our old files are replaced, other files kept.
        let s = Staging::new(out).unwrap();
        std::fs::write(s.path().join("summary.json"), "new").unwrap();
        s.commit(is_output_name).unwrap();
        assert_eq!(
            std::fs::read_to_string(out.join("summary.json")).unwrap(),
            "new"
        );
        assert!(!out.join("pass-001-a-x.csv").exists());
        assert_eq!(
            std::fs::read_to_string(out.join("notes.txt")).unwrap(),
            "mine"
        );
        // A destination that is a folder: nothing changes, the error names it.
        std::fs::create_dir(out.join("days.csv")).unwrap();
        let s = Staging::new(out).unwrap();
        std::fs::write(s.path().join("summary.json"), "newer").unwrap();
        std::fs::write(s.path().join("days.csv"), "d").unwrap();
        let e = s.commit(is_output_name).unwrap_err();
        assert!(e.to_string().contains("days.csv"), "{e}");
        assert_eq!(
            std::fs::read_to_string(out.join("summary.json")).unwrap(),
            "new"
        );
        let hidden = std::fs::read_dir(out)
            .unwrap()
            .filter(|e| {
                e.as_ref()
                    .unwrap()
                    .file_name()
                    .to_string_lossy()
                    .starts_with('.')
            })
            .count();
        assert_eq!(hidden, 0, "staging and backup folders removed");
        assert!(
            is_output_name("pass-003-sierra-baja-20261202T0123Z.png")
                && !is_output_name("pass-notes.csv")
                && !is_output_name("summary-notes.txt")
        );
    }

    #[test]
    fn durations() {
        assert_eq!(mm_ss(605.4), "10:05");
        assert_eq!(mm_ss(59.6), "1:00");
    }
}

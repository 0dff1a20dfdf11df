//! The output folder of a run: results are staged in a hidden folder, then moved into place under
//! a journal, and a manifest records which files passbudget wrote.
//!
//! Files inside the output folder `DIR` that belong to passbudget (all hidden):
//!
//! * `.passbudget-manifest`: the names of the result files the last committed runs wrote, one a
//!   line. Only these files are ever replaced or removed; nothing is deleted by name pattern.
//! * `.passbudget-staging-<pid>-<n>/`: the results of a run in progress (process `<pid>`).
//! * `.passbudget-journal`: written (atomically, by a hard link that fails if one exists) once
//!   the complete new set is on disk in the staging folder; it names the staging folder, the files
//!   to move in, the files of the previous set to remove, and the next manifest.
//!
//! A commit then moves the staged files into place (one `rename` each, replacing the previous
//! file of that name), removes the previous files the journal lists, writes the manifest, removes
//! the staging folder and finally the journal. Every step can be repeated, so a journal left by an
//! interrupted process is completed ("rolled forward") by the next [`Staging::new`] in that folder
//! ([`recover`]) before it does anything else; staging folders and temporary files of processes
//! that are no longer running are removed there too.
//!
//! What this guarantees: no file of the previous set is removed or replaced before the complete
//! new set is on disk; an interruption before the journal exists leaves the previous set
//! untouched; an interruption after it leaves a change that the next run in that folder completes
//! before it does anything else. Between the first move and the end of the commit (or, after a
//! kill in that phase, until the next run) the folder holds the new files beside the previous
//! files not yet removed.

use std::collections::BTreeSet;
use std::io::Write;
use std::ops::ControlFlow;
use std::path::{Path, PathBuf};

/// The manifest file: names of the result files passbudget wrote into the folder.
pub const MANIFEST: &str = ".passbudget-manifest";
/// The journal of a commit in progress.
pub const JOURNAL: &str = ".passbudget-journal";
const PREFIX: &str = ".passbudget-";
const JOURNAL_HEADER: &str = "passbudget-journal 1";

/// What can go wrong with the output folder.
#[derive(Debug, thiserror::Error)]
pub enum FolderError {
    #[error("{}: {source}", path.display())]
    Io {
        path: PathBuf,
        #[source]
        source: std::io::Error,
    },
    #[error("{} exists and is not a plain file", path.display())]
    NotAFile { path: PathBuf },
    #[error("{} exists and was not written by passbudget (it is not in {MANIFEST}): move it away or choose another folder", path.display())]
    NotOurs { path: PathBuf },
    #[error("another passbudget run (process {pid}) is moving its results into this folder; run again when it has finished")]
    Busy { pid: u32 },
    #[error("{}: unreadable journal of an interrupted run: {reason}", path.display())]
    BadJournal { path: PathBuf, reason: String },
    #[error("the commit was stopped by its hook (test of an interruption)")]
    Stopped,
}

fn io_at(path: &Path) -> impl Fn(std::io::Error) -> FolderError + '_ {
    move |source| FolderError::Io {
        path: path.to_path_buf(),
        source,
    }
}

/// How a commit treats the files of the previous runs (those in the manifest).
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum CommitMode {
    /// The new set replaces the whole previous set (`plan --out`): previous files that the new
    /// run did not write are removed.
    Replace,
    /// The new files are added; previous files of the same names are replaced, others kept
    /// (`chart`).
    Add,
}

/// What [`recover`] found and did.
#[derive(Debug, Clone, Default, PartialEq, Eq)]
pub struct Recovery {
    /// An interrupted commit was completed.
    pub completed_commit: bool,
    /// Staging folders and temporary files of processes no longer running that were removed.
    pub removed_leftovers: usize,
}

/// An output folder being filled: the files go into a hidden staging folder inside it, and
/// [`Staging::commit`] moves them into place. Dropped without a commit, it removes its staging
/// folder, so a failed run changes nothing in the folder.
pub struct Staging {
    final_dir: PathBuf,
    dir: PathBuf,
    committed: bool,
    recovery: Recovery,
}

impl Staging {
    /// Create `final_dir` if needed, complete or clear what interrupted runs left there
    /// ([`recover`]), and create a staging folder inside it.
    pub fn new(final_dir: &Path) -> Result<Staging, FolderError> {
        std::fs::create_dir_all(final_dir).map_err(io_at(final_dir))?;
        let recovery = recover(final_dir)?;
        let dir = final_dir.join(format!(
            "{PREFIX}staging-{}-{}",
            std::process::id(),
            super::atomic::next_serial()
        ));
        std::fs::create_dir(&dir).map_err(io_at(&dir))?;
        Ok(Staging {
            final_dir: final_dir.to_path_buf(),
            dir,
            committed: false,
            recovery,
        })
    }

    /// Where the files are written during the run.
    pub fn path(&self) -> &Path {
        &self.dir
    }

    /// What the recovery at [`Staging::new`] did.
    pub fn recovery(&self) -> &Recovery {
        &self.recovery
    }

    /// Names of the files staged so far, sorted.
    pub fn staged_names(&self) -> Result<Vec<String>, FolderError> {
        let mut names = list_names(&self.dir)?;
        names.sort();
        Ok(names)
    }

    /// Move the staged files into place (see the module documentation for the steps and what is
    /// guaranteed). Before anything changes, every destination must be absent or a plain file
    /// that the manifest lists.
    pub fn commit(self, mode: CommitMode) -> Result<(), FolderError> {
        self.commit_with(mode, |_| ControlFlow::Continue(()))
    }

    /// [`Staging::commit`] calling `after_move(n)` after the n-th file moved into place; a
    /// `Break` stops the commit there as if the process had been killed (the journal and the
    /// staging folder stay for [`recover`]). For tests of interruptions.
    pub fn commit_with(
        mut self,
        mode: CommitMode,
        after_move: impl FnMut(usize) -> ControlFlow<()>,
    ) -> Result<(), FolderError> {
        let staged = self.staged_names()?;
        let old = read_manifest(&self.final_dir)?;
        for n in &staged {
            let dest = self.final_dir.join(n);
            if let Ok(m) = std::fs::symlink_metadata(&dest) {
                if !m.file_type().is_file() {
                    return Err(FolderError::NotAFile { path: dest });
                }
                if !old.contains(n) {
                    return Err(FolderError::NotOurs { path: dest });
                }
            }
        }
        let remove: Vec<String> = match mode {
            CommitMode::Replace => old
                .iter()
                .filter(|n| !staged.contains(n))
                .cloned()
                .collect(),
            CommitMode::Add => Vec::new(),
        };
        let mut keep: BTreeSet<String> = staged.iter().cloned().collect();
        if mode == CommitMode::Add {
            keep.extend(old);
        }
        let journal = Journal {
            pid: std::process::id(),
            staging: file_name(&self.dir),
            moves: staged,
            removes: remove,
            manifest: keep.into_iter().collect(),
        };
        sync_dir(&self.dir)?;
        write_journal(&self.final_dir, &journal)?;
        // From here on the journal owns the staging folder.
        self.committed = true;
        roll_forward(&self.final_dir, &journal, after_move)
    }
}

impl Drop for Staging {
    fn drop(&mut self) {
        if !self.committed {
            let _ = std::fs::remove_dir_all(&self.dir);
        }
    }
}

/// Complete what interrupted runs left in `dir`: a journal whose process is no longer running is
/// rolled forward; staging folders and temporary files of processes no longer running are
/// removed. A journal of a running process is an error ([`FolderError::Busy`]).
pub fn recover(dir: &Path) -> Result<Recovery, FolderError> {
    recover_with(dir, &process_alive)
}

fn recover_with(dir: &Path, alive: &dyn Fn(u32) -> bool) -> Result<Recovery, FolderError> {
    let mut r = Recovery::default();
    let jpath = dir.join(JOURNAL);
    if jpath.exists() {
        let j = read_journal(&jpath)?;
        if alive(j.pid) {
            return Err(FolderError::Busy { pid: j.pid });
        }
        roll_forward(dir, &j, |_| ControlFlow::Continue(()))?;
        r.completed_commit = true;
    }
    for name in list_names(dir)? {
        let Some(pid) = leftover_pid(&name) else {
            continue;
        };
        if alive(pid) {
            continue;
        }
        let p = dir.join(&name);
        let removed = if p.is_dir() {
            std::fs::remove_dir_all(&p)
        } else {
            std::fs::remove_file(&p)
        };
        removed.map_err(io_at(&p))?;
        r.removed_leftovers += 1;
    }
    Ok(r)
}

/// The process that owns a hidden entry of ours (`.passbudget-staging-<pid>-<n>`, the
/// `.passbudget-previous-<pid>` backup of earlier versions, `.passbudget-*.tmp-<pid>-<n>`
/// temporary files, `.passbudget-write-check-<pid>`); `None` for the manifest, the journal and
/// anything else.
fn leftover_pid(name: &str) -> Option<u32> {
    let rest = name.strip_prefix(PREFIX)?;
    let tail = ["staging-", "previous-", "write-check-"]
        .iter()
        .find_map(|k| rest.strip_prefix(k))
        .or_else(|| rest.split_once(".tmp-").map(|(_, t)| t))?;
    let digits: String = tail.chars().take_while(char::is_ascii_digit).collect();
    let after = &tail[digits.len()..];
    if !(after.is_empty() || after.starts_with('-')) {
        return None;
    }
    digits.parse().ok()
}

/// Whether process `pid` is running. Linux: `/proc/<pid>` exists. Where there is no `/proc`,
/// every process counts as running, so nothing of another process is ever removed.
fn process_alive(pid: u32) -> bool {
    if pid == std::process::id() {
        return true;
    }
    let proc_fs = Path::new("/proc");
    !proc_fs.join("self").exists() || proc_fs.join(pid.to_string()).exists()
}

/// The steps of a commit after the journal; each can be repeated.
fn roll_forward(
    dir: &Path,
    j: &Journal,
    mut after_move: impl FnMut(usize) -> ControlFlow<()>,
) -> Result<(), FolderError> {
    let staging = dir.join(&j.staging);
    for (i, n) in j.moves.iter().enumerate() {
        let from = staging.join(n);
        if from.exists() {
            let to = dir.join(n);
            std::fs::rename(&from, &to).map_err(io_at(&to))?;
        }
        if after_move(i + 1).is_break() {
            return Err(FolderError::Stopped);
        }
    }
    for n in &j.removes {
        let p = dir.join(n);
        if std::fs::symlink_metadata(&p).is_ok_and(|m| m.file_type().is_file()) {
            std::fs::remove_file(&p).map_err(io_at(&p))?;
        }
    }
    let mut text = String::new();
    for n in &j.manifest {
        text.push_str(n);
        text.push('\n');
    }
    let mpath = dir.join(MANIFEST);
    super::atomic::write_atomic(&mpath, text.as_bytes()).map_err(io_at(&mpath))?;
    if staging.exists() {
        std::fs::remove_dir_all(&staging).map_err(io_at(&staging))?;
    }
    sync_dir(dir)?;
    let jpath = dir.join(JOURNAL);
    std::fs::remove_file(&jpath).map_err(io_at(&jpath))?;
    sync_dir(dir)
}

/// The names in the folder's manifest (empty when there is none).
pub fn read_manifest(dir: &Path) -> Result<BTreeSet<String>, FolderError> {
    let p = dir.join(MANIFEST);
    match std::fs::read_to_string(&p) {
        Ok(t) => Ok(t
            .lines()
            .filter(|l| !l.is_empty())
            .map(String::from)
            .collect()),
        Err(e) if e.kind() == std::io::ErrorKind::NotFound => Ok(BTreeSet::new()),
        Err(e) => Err(io_at(&p)(e)),
    }
}

#[derive(Debug, Clone, PartialEq, Eq)]
struct Journal {
    pid: u32,
    staging: String,
    moves: Vec<String>,
    removes: Vec<String>,
    manifest: Vec<String>,
}

impl Journal {
    fn to_text(&self) -> String {
        let mut t = format!(
            "{JOURNAL_HEADER}\npid {}\nstaging {}\n",
            self.pid, self.staging
        );
        for (key, names) in [
            ("move", &self.moves),
            ("remove", &self.removes),
            ("keep", &self.manifest),
        ] {
            for n in names {
                t.push_str(&format!("{key} {n}\n"));
            }
        }
        t.push_str("end\n");
        t
    }

    fn parse(text: &str) -> Result<Journal, String> {
        let mut lines = text.lines();
        if lines.next() != Some(JOURNAL_HEADER) || !text.ends_with("end\n") {
            return Err("not a complete journal".into());
        }
        let mut j = Journal {
            pid: 0,
            staging: String::new(),
            moves: Vec::new(),
            removes: Vec::new(),
            manifest: Vec::new(),
        };
        for l in lines.filter(|l| *l != "end") {
            let (key, value) = l.split_once(' ').ok_or(format!("line '{l}'"))?;
            let value = value.to_string();
            if value.contains('/') || value.starts_with("..") {
                return Err(format!("name '{value}' is not a plain file name"));
            }
            match key {
                "pid" => j.pid = value.parse().map_err(|_| format!("pid '{value}'"))?,
                "staging" => j.staging = value,
                "move" => j.moves.push(value),
                "remove" => j.removes.push(value),
                "keep" => j.manifest.push(value),
                _ => return Err(format!("line '{l}'")),
            }
        }
        if !j.staging.starts_with(PREFIX) {
            return Err("no staging folder".into());
        }
        Ok(j)
    }
}

fn read_journal(path: &Path) -> Result<Journal, FolderError> {
    let text = std::fs::read_to_string(path).map_err(io_at(path))?;
    Journal::parse(&text).map_err(|reason| FolderError::BadJournal {
        path: path.to_path_buf(),
        reason,
    })
}

/// Write the journal atomically and exclusively: a synced temporary file is hard-linked to the
/// journal's name, which fails if a journal exists. A journal of a process no longer running is
/// completed first.
fn write_journal(dir: &Path, j: &Journal) -> Result<(), FolderError> {
    let jpath = dir.join(JOURNAL);
    let tmp = dir.join(format!(
        "{JOURNAL}.tmp-{}-{}",
        std::process::id(),
        super::atomic::next_serial()
    ));
    let written = (|| {
        let mut f = std::fs::File::create(&tmp)?;
        f.write_all(j.to_text().as_bytes())?;
        f.sync_all()
    })();
    written.map_err(io_at(&tmp))?;
    let mut linked = std::fs::hard_link(&tmp, &jpath);
    if linked
        .as_ref()
        .is_err_and(|e| e.kind() == std::io::ErrorKind::AlreadyExists)
    {
        if let Err(e) = recover(dir) {
            let _ = std::fs::remove_file(&tmp);
            return Err(e);
        }
        linked = std::fs::hard_link(&tmp, &jpath);
    }
    let _ = std::fs::remove_file(&tmp);
    linked.map_err(io_at(&jpath))?;
    sync_dir(dir)
}

fn list_names(dir: &Path) -> Result<Vec<String>, FolderError> {
    std::fs::read_dir(dir)
        .and_then(|it| {
            it.map(|e| e.map(|e| e.file_name().to_string_lossy().into_owned()))
                .collect()
        })
        .map_err(io_at(dir))
}

fn file_name(p: &Path) -> String {
    p.file_name()
        .map(|n| n.to_string_lossy().into_owned())
        .unwrap_or_default()
}

/// Flush a folder's entries (renames, new files) to disk. Folders cannot be opened for syncing
/// everywhere; where opening fails this is a no-op.
fn sync_dir(dir: &Path) -> Result<(), FolderError> {
    match std::fs::File::open(dir) {
        Ok(f) => match f.sync_all() {
            Ok(()) => Ok(()),
            // Some systems refuse fsync on a folder handle; the renames are still done.
            Err(e) if e.kind() == std::io::ErrorKind::InvalidInput => Ok(()),
            Err(e) => Err(io_at(dir)(e)),
        },
        Err(_) => Ok(()),
    }
}

#[cfg(test)]
mod tests;

//! The output folder of a run: results are staged beside it and swapped in as one folder, or
//! (where that cannot be done) staged inside it and moved in under a journal; a manifest records
//! which files passbudget wrote.
//!
//! Swap (Linux, [`swap`]): the new set is written into a sibling folder
//! `PARENT/.NAME.passbudget-swap-<pid>-<n>/` of the output folder `PARENT/NAME`. At the commit the
//! files the new set keeps (the user's own files, and with [`CommitMode::Add`] the earlier results
//! it does not replace) are hard-linked into it, its manifest is written, and the two folders are
//! exchanged with one `renameat2(RENAME_EXCHANGE)`; the previous folder, now at the sibling's
//! path, is removed after any file of the user changed in it meanwhile is moved back. A kill at
//! any moment leaves at `PARENT/NAME` either the complete previous folder or the complete new
//! one; the next run removes or completes what is left beside it.
//!
//! Journal (the fallback where the folders cannot be exchanged: not Linux, the folder is a mount
//! point, belongs to another user or holds a folder, the file system refuses the exchange;
//! [`journal`]): the files are staged in `DIR/.passbudget-staging-<pid>-<n>/`, and a journal
//! `DIR/.passbudget-journal` (created exclusively once the set is on disk) lists the moves; the
//! files are renamed into place one by one and the next run completes an interrupted journal.
//! Between the first move and the end (or the next run) the folder holds new files beside
//! previous ones.
//!
//! Both: `DIR/.passbudget-manifest` lists the result files passbudget wrote; only these are ever
//! replaced or removed, nothing by name pattern. The folder's lock ([`lock`]) is held while a run
//! reads the manifest and commits, and while it completes what interrupted runs left
//! ([`recover`]), which every [`Staging::new`] does first.

use std::collections::BTreeSet;
use std::ops::ControlFlow;
use std::path::{Path, PathBuf};

mod journal;
mod lock;
#[cfg(target_os = "linux")]
mod swap;

/// The manifest file: names of the result files passbudget wrote into the folder.
pub const MANIFEST: &str = ".passbudget-manifest";
/// The journal of a journaled commit in progress.
pub const JOURNAL: &str = ".passbudget-journal";
const PREFIX: &str = ".passbudget-";

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
    #[error("another passbudget run{} is moving its results into this folder; run again when it has finished", pid.map(|p| format!(" (process {p})")).unwrap_or_default())]
    Busy { pid: Option<u32> },
    #[error("{}: unreadable journal of an interrupted run: {reason}", path.display())]
    BadJournal { path: PathBuf, reason: String },
    #[error("the commit was stopped by its hook (test of an interruption)")]
    Stopped,
    /// The folder is the file system's root (`--out /`, or `--out "$DIR/"` with `DIR` unset):
    /// results go in a folder of their own.
    #[error("{} is the root of the file system: give a folder of its own for the results", path.display())]
    Root { path: PathBuf },
}

/// Whether `dir` is the file system's root (`/`, `/tmp/..`): it has no parent to stage beside.
fn is_file_system_root(dir: &Path) -> bool {
    std::fs::canonicalize(dir).is_ok_and(|p| p.parent().is_none())
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

/// A point of a commit at which [`Staging::commit_with`] calls its hook (for tests of
/// interruptions). Its text form (`locked`, `linked-2`, `moved-3`, ...) names it.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Step {
    /// The folder is locked; nothing has changed yet.
    Locked,
    /// Swap: the n-th entry the new set keeps is linked into the new folder.
    Linked(usize),
    /// Swap: the new folder is complete with its manifest, just before the exchange.
    Complete,
    /// Swap: the folders are exchanged; the previous one is at the sibling's path.
    Swapped,
    /// Swap: files of the user changed meanwhile are back; the previous folder is not yet removed.
    Restored,
    /// Journal: the journal is on disk; nothing has moved yet.
    Journaled,
    /// Journal: the n-th file has moved into place.
    Moved(usize),
}

impl std::fmt::Display for Step {
    fn fmt(&self, f: &mut std::fmt::Formatter<'_>) -> std::fmt::Result {
        match self {
            Step::Locked => write!(f, "locked"),
            Step::Linked(n) => write!(f, "linked-{n}"),
            Step::Complete => write!(f, "complete"),
            Step::Swapped => write!(f, "swapped"),
            Step::Restored => write!(f, "restored"),
            Step::Journaled => write!(f, "journaled"),
            Step::Moved(n) => write!(f, "moved-{n}"),
        }
    }
}

/// How a commit was done.
#[derive(Debug, Clone, PartialEq, Eq)]
pub enum CommitMethod {
    /// The new folder was swapped in as a whole.
    Swapped,
    /// The files were moved in one by one under a journal, for this reason (the folder's
    /// description: "it is a mount point", ...).
    Journaled { reason: String },
}

/// What [`recover`] found and did.
#[derive(Debug, Clone, Default, PartialEq, Eq)]
pub struct Recovery {
    /// An interrupted commit was completed.
    pub completed_commit: bool,
    /// Staging folders and temporary files of processes no longer running that were removed.
    pub removed_leftovers: usize,
    /// Files of the user moved back from a previous folder left by an interrupted swap.
    pub restored_files: usize,
}

enum Method {
    #[cfg(target_os = "linux")]
    Swap(swap::Sibling),
    Journal {
        reason: String,
    },
}

/// An output folder being filled: the files go into a hidden staging folder (beside it or inside
/// it), and [`Staging::commit`] puts them in place. Dropped without a commit, it removes its
/// staging folder, so a failed run changes nothing in the folder.
pub struct Staging {
    final_dir: PathBuf,
    dir: PathBuf,
    method: Method,
    committed: bool,
    recovery: Recovery,
    /// This run created `final_dir`: a run that fails removes it again (if still empty).
    created: bool,
}

impl Staging {
    /// Create `final_dir` if needed, complete or clear what interrupted runs left there
    /// ([`recover`]), and create a staging folder: a sibling to swap in where the folders can be
    /// exchanged, else a folder inside it.
    pub fn new(final_dir: &Path) -> Result<Staging, FolderError> {
        if is_file_system_root(final_dir) {
            return Err(FolderError::Root {
                path: final_dir.to_path_buf(),
            });
        }
        let created = !final_dir.exists();
        std::fs::create_dir_all(final_dir).map_err(io_at(final_dir))?;
        let st = Self::open(final_dir);
        if st.is_err() && created {
            let _ = std::fs::remove_dir(final_dir);
        }
        st.map(|mut st| {
            st.created = created;
            st
        })
    }

    /// [`Staging::new`] once `final_dir` exists.
    fn open(final_dir: &Path) -> Result<Staging, FolderError> {
        let recovery = recover(final_dir)?;
        #[cfg(target_os = "linux")]
        let reason = match swap::open(final_dir) {
            Ok(s) => {
                return Ok(Staging {
                    final_dir: final_dir.to_path_buf(),
                    dir: s.path.clone(),
                    method: Method::Swap(s),
                    committed: false,
                    recovery,
                    created: false,
                })
            }
            Err(reason) => reason,
        };
        #[cfg(not(target_os = "linux"))]
        let reason = String::from("this system cannot exchange two folders atomically");
        let mut st = Staging::journaled(final_dir, reason)?;
        st.recovery = recovery;
        Ok(st)
    }

    /// A staging folder inside `final_dir`, committed under a journal (`reason`: why).
    fn journaled(final_dir: &Path, reason: String) -> Result<Staging, FolderError> {
        let dir = final_dir.join(format!(
            "{PREFIX}staging-{}-{}",
            std::process::id(),
            super::atomic::next_serial()
        ));
        std::fs::create_dir(&dir).map_err(io_at(&dir))?;
        Ok(Staging {
            final_dir: final_dir.to_path_buf(),
            dir,
            method: Method::Journal { reason },
            committed: false,
            recovery: Recovery::default(),
            created: false,
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
        let mut names: Vec<String> = list_names(&self.dir)?
            .into_iter()
            .filter(|n| n != MANIFEST)
            .collect();
        names.sort();
        Ok(names)
    }

    /// Put the staged files in place (see the module documentation for the steps and what is
    /// guaranteed). Before anything changes, every destination must be absent or a plain file
    /// that the manifest lists.
    pub fn commit(self, mode: CommitMode) -> Result<CommitMethod, FolderError> {
        self.commit_with(mode, |_| ControlFlow::Continue(()))
    }

    /// [`Staging::commit`] calling `hook` at each [`Step`]; a `Break` stops the commit there as
    /// if the process had been killed (what is on disk stays for [`recover`]). For tests.
    pub fn commit_with(
        mut self,
        mode: CommitMode,
        mut hook: impl FnMut(Step) -> ControlFlow<()>,
    ) -> Result<CommitMethod, FolderError> {
        let _lock = lock::lock(&self.final_dir)?;
        if hook(Step::Locked).is_break() {
            self.committed = true;
            return Err(FolderError::Stopped);
        }
        let staged = self.staged_names()?;
        sync_staged(&self.dir, &staged)?;
        #[cfg(target_os = "linux")]
        if let Method::Swap(s) = &self.method {
            let outcome = swap::commit(s, &staged, mode, &mut hook);
            // A sibling never exchanged still names itself; after an exchange (or a simulated
            // kill) what is at its path belongs to recover().
            let exchanged = manifest_token(&s.path).ok().flatten().as_deref() != Some(s.token());
            self.committed = matches!(outcome, Err(FolderError::Stopped)) || exchanged;
            match outcome? {
                swap::Outcome::Swapped => return Ok(CommitMethod::Swapped),
                swap::Outcome::Fallback(reason) => self.move_inside(reason)?,
            }
        }
        let reason = match &self.method {
            Method::Journal { reason } => reason.clone(),
            #[cfg(target_os = "linux")]
            Method::Swap(_) => unreachable!("moved inside above"),
        };
        // From the journal on, the journal owns the staging folder.
        self.committed = true;
        journal::commit(&self.final_dir, &self.dir, staged, mode, &mut hook)?;
        Ok(CommitMethod::Journaled { reason })
    }

    /// Move the staged files from the sibling into a staging folder inside the output folder, for
    /// a journaled commit: one rename of the folder, or where that fails (another mount of the
    /// same file system) a copy of each file.
    #[cfg(target_os = "linux")]
    fn move_inside(&mut self, reason: String) -> Result<(), FolderError> {
        let inside = Staging::journaled(&self.final_dir, reason)?;
        let manifest = self.dir.join(MANIFEST);
        std::fs::remove_file(&manifest).map_err(io_at(&manifest))?;
        let renamed =
            std::fs::remove_dir(&inside.dir).and_then(|()| std::fs::rename(&self.dir, &inside.dir));
        if renamed.is_err() {
            let _ = std::fs::create_dir(&inside.dir);
            for n in self.staged_names()? {
                let to = inside.dir.join(&n);
                std::fs::copy(self.dir.join(&n), &to).map_err(io_at(&to))?;
            }
            remove_tree(&self.dir)?;
        }
        let mut inside = inside;
        self.dir = std::mem::take(&mut inside.dir);
        inside.committed = true;
        self.method = std::mem::replace(
            &mut inside.method,
            Method::Journal {
                reason: String::new(),
            },
        );
        Ok(())
    }
}

impl Drop for Staging {
    fn drop(&mut self) {
        if !self.committed && !self.dir.as_os_str().is_empty() {
            let _ = remove_tree(&self.dir);
            if self.created {
                // only an empty folder: never anything the user put there meanwhile
                let _ = std::fs::remove_dir(&self.final_dir);
            }
        }
    }
}

/// Remove a sibling folder, its manifest last: a removal cut short by a kill leaves a folder
/// whose manifest still tells a later run which of its entries are passbudget's.
fn remove_tree(path: &Path) -> Result<(), FolderError> {
    for n in list_names(path)? {
        if n == MANIFEST {
            continue;
        }
        let p = path.join(&n);
        let is_dir = std::fs::symlink_metadata(&p).is_ok_and(|m| m.is_dir());
        let removed = if is_dir {
            std::fs::remove_dir_all(&p)
        } else {
            std::fs::remove_file(&p)
        };
        removed.map_err(io_at(&p))?;
    }
    let m = path.join(MANIFEST);
    if m.exists() {
        std::fs::remove_file(&m).map_err(io_at(&m))?;
    }
    std::fs::remove_dir(path).map_err(io_at(path))
}

/// Every destination of a staged file is absent or a plain file the manifest `old` lists.
fn check_destinations(
    dir: &Path,
    staged: &[String],
    old: &BTreeSet<String>,
) -> Result<(), FolderError> {
    for n in staged {
        let dest = dir.join(n);
        if let Ok(m) = std::fs::symlink_metadata(&dest) {
            if !m.file_type().is_file() {
                return Err(FolderError::NotAFile { path: dest });
            }
            if !old.contains(n) {
                return Err(FolderError::NotOurs { path: dest });
            }
        }
    }
    Ok(())
}

/// Complete what interrupted runs left in and beside `dir`, under the folder's lock: a journal
/// whose process is no longer running is rolled forward; a previous folder left by an interrupted
/// swap gives back the user's files changed meanwhile and is removed; staging folders and
/// temporary files of processes no longer running are removed. A journal of a running process,
/// or the lock held by another run, is an error ([`FolderError::Busy`]).
pub fn recover(dir: &Path) -> Result<Recovery, FolderError> {
    recover_with(dir, &process_alive)
}

fn recover_with(dir: &Path, alive: &dyn Fn(u32) -> bool) -> Result<Recovery, FolderError> {
    let _lock = lock::lock(dir)?;
    let mut r = Recovery {
        completed_commit: journal::recover(dir, alive)?,
        ..Recovery::default()
    };
    #[cfg(target_os = "linux")]
    {
        let found = swap::recover(dir, alive)?;
        r.completed_commit |= found.completed > 0;
        r.removed_leftovers += found.removed;
        r.restored_files += found.restored;
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

/// The names in the folder's manifest (empty when there is none).
pub fn read_manifest(dir: &Path) -> Result<BTreeSet<String>, FolderError> {
    Ok(read_manifest_text(dir)?
        .lines()
        .filter(|l| !l.is_empty() && !l.starts_with('#'))
        .map(String::from)
        .collect())
}

/// The `#tree` line of a folder's manifest (the sibling it was built in), if any.
#[cfg_attr(not(target_os = "linux"), allow(dead_code))]
fn manifest_token(dir: &Path) -> Result<Option<String>, FolderError> {
    Ok(read_manifest_text(dir)?
        .lines()
        .find_map(|l| l.strip_prefix("#tree "))
        .map(String::from))
}

fn read_manifest_text(dir: &Path) -> Result<String, FolderError> {
    let p = dir.join(MANIFEST);
    match std::fs::read_to_string(&p) {
        Ok(t) => Ok(t),
        Err(e) if e.kind() == std::io::ErrorKind::NotFound => Ok(String::new()),
        Err(e) => Err(io_at(&p)(e)),
    }
}

/// Write a folder's manifest atomically: the `#tree <token>` line (swap), then one name a line.
fn write_manifest(dir: &Path, names: &[String], token: Option<&str>) -> Result<(), FolderError> {
    let mut text = token.map(|t| format!("#tree {t}\n")).unwrap_or_default();
    for n in names {
        text.push_str(n);
        text.push('\n');
    }
    let p = dir.join(MANIFEST);
    super::atomic::write_atomic(&p, text.as_bytes()).map_err(io_at(&p))
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

/// Flush the staged files to disk before any of them is put in place. They were written without a
/// flush each ([`super::write_staged`]); Linux: one `syncfs(2)` of the file system that holds the
/// staging folder (every staged file's data and metadata with one call); elsewhere one `fsync`
/// per file. After this the commit's own steps (manifest, exchange or journal) make the set
/// visible, each flushed as before, so a power cut leaves the previous set or the complete new
/// one, never a new file with lost contents.
fn sync_staged(dir: &Path, staged: &[String]) -> Result<(), FolderError> {
    #[cfg(target_os = "linux")]
    {
        let _ = staged;
        let f = std::fs::File::open(dir).map_err(io_at(dir))?;
        rustix::fs::syncfs(&f).map_err(|e| io_at(dir)(e.into()))
    }
    #[cfg(not(target_os = "linux"))]
    {
        for n in staged {
            let p = dir.join(n);
            std::fs::File::open(&p)
                .and_then(|f| f.sync_all())
                .map_err(io_at(&p))?;
        }
        Ok(())
    }
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

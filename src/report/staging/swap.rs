//! The swapped commit (Linux): the new set is built in a sibling folder of the output folder,
//! next to it in the same parent, together with hard links of the files the new set keeps (the
//! user's own files; with [`CommitMode::Add`] the earlier results it does not replace); then the
//! two folders are exchanged in one `renameat2(RENAME_EXCHANGE)` and the previous folder, now at
//! the sibling's path, is removed.
//!
//! The sibling of `PARENT/NAME` is `PARENT/.NAME.passbudget-swap-<pid>-<n>`. Its manifest starts
//! with the line `#tree <pid>-<n>` from its creation on, so that a later run tells a sibling that
//! was never exchanged (its manifest names itself: remove it) from a previous folder left by a
//! kill after the exchange (its manifest is the previous set's: first move back into the output
//! folder every entry that is not in that manifest and not the same file as the entry of that
//! name in the output folder, i.e. files of the user replaced or created during the run, then
//! remove it).

use super::{
    io_at, list_names, read_manifest, sync_dir, write_manifest, CommitMode, FolderError, Step,
    MANIFEST,
};
use std::collections::BTreeSet;
use std::ops::ControlFlow;
use std::os::unix::fs::{MetadataExt, PermissionsExt};
use std::path::{Path, PathBuf};

const TAG: &str = ".passbudget-swap-";

/// The sibling folder of a run in swap mode.
pub(super) struct Sibling {
    /// The output folder (canonical).
    dir: PathBuf,
    /// The sibling folder: where the files are staged.
    pub(super) path: PathBuf,
    token: String,
}

impl Sibling {
    /// The name of the sibling's own `#tree` line.
    pub(super) fn token(&self) -> &str {
        &self.token
    }
}

/// What a swapped commit did.
pub(super) enum Outcome {
    Swapped,
    /// Nothing changed in the output folder; the staged files are still in the sibling (and only
    /// they): commit under a journal instead, for this reason.
    Fallback(String),
}

fn prefix(name: &std::ffi::OsStr) -> String {
    format!(".{}{TAG}", name.to_string_lossy())
}

/// Open a sibling folder for `final_dir`, or say why the folders cannot be swapped.
pub(super) fn open(final_dir: &Path) -> Result<Sibling, String> {
    let dir = std::fs::canonicalize(final_dir).map_err(|e| format!("cannot resolve it: {e}"))?;
    let (Some(parent), Some(name)) = (dir.parent(), dir.file_name()) else {
        return Err("it has no parent folder".into());
    };
    let meta = std::fs::metadata(&dir).map_err(|e| e.to_string())?;
    let pmeta = std::fs::metadata(parent).map_err(|e| e.to_string())?;
    if meta.dev() != pmeta.dev() {
        return Err("it is a mount point".into());
    }
    if meta.uid() != rustix::process::geteuid().as_raw() {
        return Err("it belongs to another user".into());
    }
    let token = format!(
        "{}-{}",
        std::process::id(),
        crate::report::atomic::next_serial()
    );
    let path = parent.join(format!("{}{token}", prefix(name)));
    std::fs::create_dir(&path).map_err(|e| format!("cannot create {}: {e}", path.display()))?;
    let s = Sibling { dir, path, token };
    if let Err(e) = set_up(&s, &meta) {
        let _ = super::remove_tree(&s.path);
        return Err(e);
    }
    Ok(s)
}

/// Give the sibling the folder's permissions and group, check that the file system exchanges
/// folders (with a second empty folder, exchanged there and back), and write its manifest.
fn set_up(s: &Sibling, meta: &std::fs::Metadata) -> Result<(), String> {
    let mode = std::fs::Permissions::from_mode(meta.mode() & 0o7777);
    std::fs::set_permissions(&s.path, mode).map_err(|e| e.to_string())?;
    let own = std::fs::metadata(&s.path).map_err(|e| e.to_string())?;
    if own.gid() != meta.gid() {
        let gid = rustix::fs::Gid::from_raw(meta.gid());
        rustix::fs::chown(&s.path, None, Some(gid))
            .map_err(|e| format!("cannot give the new folder the group of the folder: {e}"))?;
    }
    let probe = s
        .path
        .with_file_name(format!("{}-probe", super::file_name(&s.path)));
    std::fs::create_dir(&probe).map_err(|e| e.to_string())?;
    let exchanged = exchange(&s.path, &probe).and_then(|()| exchange(&s.path, &probe));
    let _ = std::fs::remove_dir(&probe);
    exchanged.map_err(|e| format!("the file system does not exchange folders ({e})"))?;
    write_manifest(&s.path, &[], Some(&s.token)).map_err(|e| e.to_string())
}

fn exchange(a: &Path, b: &Path) -> std::io::Result<()> {
    use rustix::fs::{renameat_with, RenameFlags, CWD};
    renameat_with(CWD, a, CWD, b, RenameFlags::EXCHANGE).map_err(std::io::Error::from)
}

/// Commit the files staged in the sibling by exchanging it with the output folder. The caller
/// holds the output folder's lock.
pub(super) fn commit(
    s: &Sibling,
    staged: &[String],
    mode: CommitMode,
    hook: &mut dyn FnMut(Step) -> ControlFlow<()>,
) -> Result<Outcome, FolderError> {
    let dir = &s.dir;
    let old = read_manifest(dir)?;
    super::check_destinations(dir, staged, &old)?;
    let mut carry = Vec::new();
    for n in list_names(dir)? {
        // Temporary entries of passbudget runs (a write check, a temporary file) are not kept.
        let transient = super::leftover_pid(&n).is_some() || is_temporary(&n);
        if n == MANIFEST
            || transient
            || staged.contains(&n)
            || (mode == CommitMode::Replace && old.contains(&n))
        {
            continue;
        }
        let p = dir.join(&n);
        let m = std::fs::symlink_metadata(&p).map_err(io_at(&p))?;
        if m.is_dir() {
            return Ok(Outcome::Fallback(format!("it holds a folder ({n})")));
        }
        carry.push(n);
    }
    let _sibling_lock = super::lock::lock(&s.path)?;
    for (i, n) in carry.iter().enumerate() {
        if let Err(e) = keep_in(dir, &s.path, n) {
            undo(s, &carry[..i])?;
            return Ok(Outcome::Fallback(format!(
                "{n} cannot be linked or copied ({e})"
            )));
        }
        if hook(Step::Linked(i + 1)).is_break() {
            return Err(FolderError::Stopped);
        }
    }
    let mut manifest: BTreeSet<String> = staged.iter().cloned().collect();
    if mode == CommitMode::Add {
        manifest.extend(carry.iter().filter(|n| old.contains(*n)).cloned());
    }
    let manifest: Vec<String> = manifest.into_iter().collect();
    write_manifest(&s.path, &manifest, Some(&s.token))?;
    sync_dir(&s.path)?;
    if hook(Step::Complete).is_break() {
        return Err(FolderError::Stopped);
    }
    if let Err(e) = exchange(&s.path, dir) {
        undo(s, &carry)?;
        return Ok(Outcome::Fallback(format!(
            "the folders cannot be exchanged ({e})"
        )));
    }
    sync_dir(dir.parent().unwrap_or(dir))?;
    if hook(Step::Swapped).is_break() {
        return Err(FolderError::Stopped);
    }
    restore(&s.path, dir, &old)?;
    if hook(Step::Restored).is_break() {
        return Err(FolderError::Stopped);
    }
    super::remove_tree(&s.path)?;
    Ok(Outcome::Swapped)
}

/// Put the folder's entry `name` into the new folder: a hard link (the same file, so that a
/// change made to it until the exchange is kept), else a copy of a plain file or of a symbolic
/// link. A copy is replaced by the original after the exchange ([`restore`]).
fn keep_in(dir: &Path, new: &Path, name: &str) -> std::io::Result<()> {
    let (from, to) = (dir.join(name), new.join(name));
    if std::fs::hard_link(&from, &to).is_ok() {
        return Ok(());
    }
    let m = std::fs::symlink_metadata(&from)?;
    if m.file_type().is_symlink() {
        std::os::unix::fs::symlink(std::fs::read_link(&from)?, &to)
    } else if m.is_file() {
        std::fs::copy(&from, &to).map(|_| ())
    } else {
        Err(std::io::Error::other("not a plain file"))
    }
}

/// Take the kept entries out of the sibling again, so that it holds only the staged files.
fn undo(s: &Sibling, kept: &[String]) -> Result<(), FolderError> {
    for n in kept {
        let p = s.path.join(n);
        std::fs::remove_file(&p).map_err(io_at(&p))?;
    }
    write_manifest(&s.path, &[], Some(&s.token))
}

/// After an exchange: move back into `dir` every entry of the previous folder `previous` that is
/// not passbudget's (`ours`: its manifest) and not the same file as the entry of that name in
/// `dir`: files of the user replaced or created in the folder while the new one was built, and
/// originals of which the new folder holds copies. An entry whose name is now a new result is
/// moved back as `<name>.kept` (the result stays). Returns how many entries moved back.
fn restore(previous: &Path, dir: &Path, ours: &BTreeSet<String>) -> Result<usize, FolderError> {
    let results = read_manifest(dir)?;
    let mut moved = 0;
    for n in list_names(previous)? {
        if n == MANIFEST || ours.contains(&n) {
            continue;
        }
        let from = previous.join(&n);
        let Ok(m) = std::fs::symlink_metadata(&from) else {
            continue;
        };
        // Temporary files of passbudget runs are not given back (a staging folder of a journaled
        // run still going on is).
        let transient = is_temporary(&n) || super::leftover_pid(&n).is_some();
        if transient && !m.is_dir() {
            continue;
        }
        let to = if results.contains(&n) {
            dir.join(format!("{n}.kept"))
        } else {
            dir.join(&n)
        };
        if let Ok(now) = std::fs::symlink_metadata(&to) {
            if (now.dev(), now.ino()) == (m.dev(), m.ino()) {
                continue;
            }
        }
        std::fs::rename(&from, &to).map_err(io_at(&to))?;
        moved += 1;
    }
    if moved > 0 {
        sync_dir(dir)?;
    }
    Ok(moved)
}

/// A temporary file of an atomic write (`.<name>.tmp-<pid>-<n>`), left by a kill.
pub(super) fn is_temporary(name: &str) -> bool {
    name.starts_with('.')
        && name.rsplit_once(".tmp-").is_some_and(|(_, t)| {
            t.split_once('-').is_some_and(|(a, b)| {
                !a.is_empty()
                    && !b.is_empty()
                    && a.chars().chain(b.chars()).all(|c| c.is_ascii_digit())
            })
        })
}

/// What [`recover`] found next to a folder.
#[derive(Debug, Default)]
pub(super) struct Found {
    /// Siblings removed (never exchanged, or the previous folder after an exchange).
    pub removed: usize,
    /// Previous folders after an exchange (a commit completed).
    pub completed: usize,
    /// Entries moved back from those into the folder.
    pub restored: usize,
}

/// Remove what runs no longer running left next to `final_dir`: siblings never exchanged are
/// removed; a previous folder left after an exchange first gives back the user's files
/// ([`restore`]). The caller holds the folder's lock.
pub(super) fn recover(final_dir: &Path, alive: &dyn Fn(u32) -> bool) -> Result<Found, FolderError> {
    let mut found = Found::default();
    let Ok(dir) = std::fs::canonicalize(final_dir) else {
        return Ok(found);
    };
    let (Some(parent), Some(name)) = (dir.parent(), dir.file_name()) else {
        return Ok(found);
    };
    let prefix = prefix(name);
    let Ok(entries) = list_names(parent) else {
        return Ok(found);
    };
    for entry in entries {
        let Some(token) = entry.strip_prefix(&prefix) else {
            continue;
        };
        let pid: String = token.chars().take_while(char::is_ascii_digit).collect();
        match pid.parse() {
            Ok(pid) if !alive(pid) => {}
            _ => continue,
        }
        let p = parent.join(&entry);
        if !std::fs::symlink_metadata(&p).is_ok_and(|m| m.is_dir()) {
            continue;
        }
        // A sibling never exchanged names itself in its manifest from its set-up on (before,
        // it is empty but for a temporary file; the probe folder is always empty); the previous
        // folder after an exchange has the previous set's manifest, or none.
        let swapped =
            !token.ends_with("-probe") && super::manifest_token(&p)?.as_deref() != Some(token);
        if swapped {
            found.restored += restore(&p, &dir, &read_manifest(&p)?)?;
            found.completed += usize::from(p.join(MANIFEST).exists());
        }
        super::remove_tree(&p)?;
        found.removed += 1;
    }
    Ok(found)
}

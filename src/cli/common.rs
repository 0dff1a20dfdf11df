//! What every command shares: the output format flag and the one way to print warnings and
//! notes on stderr (a leaf module: the commands and `mod.rs` do not import each other).

use std::io::Write;
use std::sync::atomic::{AtomicBool, Ordering};

/// `--quiet`: warnings and notes are not printed on stderr (they stay in the JSON and CSV outputs;
/// README, "Exit codes").
static QUIET: AtomicBool = AtomicBool::new(false);

/// Set by `--quiet` before the command runs.
pub fn set_quiet(quiet: bool) {
    QUIET.store(quiet, Ordering::Relaxed);
}

/// Output format chosen on the command line.
#[derive(Debug, Clone, Copy, PartialEq, Eq, clap::ValueEnum)]
pub enum Format {
    Table,
    Csv,
    Json,
}

/// Print warnings on stderr, one line each (a closed stderr is ignored).
pub fn warn(warnings: &[String]) {
    to_stderr("warning", warnings);
}

/// Print notes (what the program chose, not a problem) on stderr, one line each (a closed
/// stderr is ignored).
pub fn note(notes: &[String]) {
    to_stderr("note", notes);
}

/// The one writer of stderr lines: `kind: text`. Write errors (a closed or full stderr, a broken
/// pipe) are ignored, so a lost diagnostic never costs the result on stdout. Nothing else in the
/// binary prints to stderr except the final error line and the progress bar.
fn to_stderr(kind: &str, lines: &[String]) {
    if QUIET.load(Ordering::Relaxed) {
        return;
    }
    let mut err = std::io::stderr().lock();
    for l in lines {
        let _ = writeln!(err, "{kind}: {l}");
    }
}

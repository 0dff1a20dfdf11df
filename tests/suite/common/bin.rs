//! Running the `passbudget` binary in the crate root and checking its output.

use std::path::PathBuf;
use std::process::{Command, Output};

/// The crate root (where `examples/`, `stations/` and `tests/` are).
pub fn root() -> PathBuf {
    PathBuf::from(env!("CARGO_MANIFEST_DIR"))
}

/// The binary as a command, to be given arguments, a folder and pipes.
pub fn command() -> Command {
    Command::new(env!("CARGO_BIN_EXE_passbudget"))
}

/// Runs the binary with `args` in the crate root and returns its output.
pub fn run<S: AsRef<std::ffi::OsStr>>(args: &[S]) -> Output {
    command()
        .current_dir(root())
        .args(args)
        .output()
        .expect("binary runs")
}

/// The run succeeded (else the assertion shows its stderr); returns its stdout as text.
pub fn success(o: &Output) -> String {
    assert!(o.status.success(), "{}", String::from_utf8_lossy(&o.stderr));
    String::from_utf8(o.stdout.clone()).expect("UTF-8 on stdout")
}

/// The run succeeded and its stdout is one JSON document.
pub fn json(o: &Output) -> serde_json::Value {
    serde_json::from_str(&success(o)).expect("JSON on stdout")
}

/// The run failed cleanly: exit code 1, no panic, and exactly one stderr line other than
/// warnings and notes; it starts with "error: " and contains every one of `needles`.
pub fn clean_error(o: &Output, needles: &[&str]) {
    let e = String::from_utf8_lossy(&o.stderr);
    assert_eq!(o.status.code(), Some(1), "stderr: {e}");
    assert!(!e.contains("panicked"), "{e}");
    let lines: Vec<&str> = e
        .lines()
        .filter(|l| !l.starts_with("warning") && !l.starts_with("note"))
        .collect();
    assert_eq!(lines.len(), 1, "one line expected, got: {e}");
    assert!(lines[0].starts_with("error: "), "{e}");
    for n in needles {
        assert!(lines[0].contains(n), "'{n}' not in: {e}");
    }
}

/// Writes `text` to `dir/name` and returns the path as a string (for command lines).
pub fn write(dir: &std::path::Path, name: &str, text: &str) -> String {
    let p = dir.join(name);
    std::fs::write(&p, text).unwrap();
    p.to_string_lossy().into_owned()
}

/// The first file of `dir` whose name starts with `prefix` (an output folder's `pass-016-...`).
pub fn file_starting(dir: &std::path::Path, prefix: &str) -> PathBuf {
    std::fs::read_dir(dir)
        .unwrap()
        .map(|e| e.unwrap().path())
        .find(|p| p.file_name().unwrap().to_string_lossy().starts_with(prefix))
        .unwrap_or_else(|| panic!("no {prefix}* in {}", dir.display()))
}

//! Golden-output check: the shipped example's `summary.json` and two pass CSVs, stored in
//! `tests/golden/`, must come out byte-identical. These files are not a reference for the physics
//! (the physics is checked against published sources elsewhere); they pin the behaviour so that a
//! restructuring cannot change a number unnoticed.
//!
//! The stored files change only by an explicit command, after the change that moves them has been
//! explained in its commit message:
//!
//! ```text
//! PASSBUDGET_BLESS=1 cargo test --release golden
//! ```

use std::path::{Path, PathBuf};
use std::process::Command;

const GOLDEN: [&str; 3] = [
    "summary.json",
    "pass-002-pulau-reka-20261201T1555Z.csv",
    "pass-016-sierra-baja-20261202T0851Z.csv",
];

fn root() -> PathBuf {
    PathBuf::from(env!("CARGO_MANIFEST_DIR"))
}

#[test]
fn golden_example_outputs() {
    let tmp = tempfile::tempdir().unwrap();
    let out = tmp.path().join("out");
    let o = Command::new(env!("CARGO_BIN_EXE_passbudget"))
        .current_dir(root())
        .args([
            "plan",
            "examples/wrenlet-1.yaml",
            "--format",
            "json",
            "--out",
        ])
        .arg(&out)
        .output()
        .expect("binary runs");
    assert!(o.status.success(), "{}", String::from_utf8_lossy(&o.stderr));
    let bless = std::env::var_os("PASSBUDGET_BLESS").is_some();
    let golden_dir = root().join("tests/golden");
    let mut differ = Vec::new();
    for name in GOLDEN {
        let new = std::fs::read(out.join(name)).unwrap_or_else(|e| panic!("{name}: {e}"));
        let stored = golden_dir.join(name);
        if bless {
            std::fs::write(&stored, &new).unwrap();
        } else if std::fs::read(&stored).unwrap() != new {
            differ.push(first_difference(name, &stored, &new));
        }
    }
    // The JSON on stdout is the same document as summary.json.
    let summary = std::fs::read(out.join("summary.json")).unwrap();
    assert_eq!(o.stdout, summary, "stdout JSON and summary.json differ");
    assert!(
        differ.is_empty(),
        "golden outputs changed (PASSBUDGET_BLESS=1 cargo test --release golden updates them):\n{}",
        differ.join("\n")
    );
}

fn first_difference(name: &str, stored: &Path, new: &[u8]) -> String {
    let old = std::fs::read_to_string(stored).unwrap_or_default();
    let new = String::from_utf8_lossy(new);
    for (i, (a, b)) in old.lines().zip(new.lines()).enumerate() {
        if a != b {
            return format!("{name}:{}:\n  stored: {a}\n  now:    {b}", i + 1);
        }
    }
    format!(
        "{name}: {} lines stored, {} now",
        old.lines().count(),
        new.lines().count()
    )
}

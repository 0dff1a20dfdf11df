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

use crate::common::bin::{root, run, success};
use std::path::Path;

const GOLDEN: [&str; 3] = [
    "summary.json",
    "pass-002-pulau-reka-20261201T1557Z.csv",
    "pass-016-sierra-baja-20261202T0854Z.csv",
];

#[test]
fn golden_example_outputs() {
    let tmp = tempfile::tempdir().unwrap();
    let out = tmp.path().join("out");
    let mut args = vec![
        "plan".into(),
        "examples/wrenlet-1.yaml".into(),
        "--format".into(),
        "json".into(),
        "--out".into(),
    ];
    args.push(out.clone().into_os_string());
    let o = run::<std::ffi::OsString>(&args);
    success(&o);
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

/// The fast per-pass CSV writer (`report::step_csv`) against the `csv` crate serializing the
/// `StepRow`s, on every pass of the example week (rain case on, adaptive schedule, a mount):
/// byte-identical.
#[test]
fn fast_pass_csv_matches_serde_rows() {
    use passbudget::config::mission::Mission;
    use passbudget::plan::{FnSink, PassSeries, PlanRequest, Planner};
    use passbudget::report::plan::step_rows;
    use passbudget::report::{step_csv::pass_csv, to_csv};
    let mission = Mission::load(&root().join("examples/wrenlet-1.yaml")).unwrap();
    let planner = Planner::new(&mission, &PlanRequest::default()).unwrap();
    let warnings = vec!["a warning, with a comma".to_string()];
    let checked = std::sync::atomic::AtomicUsize::new(0);
    let sink = FnSink(|s: &PassSeries<'_>| {
        let want = to_csv(&step_rows(s, planner.rates()), &warnings).unwrap();
        let got = pass_csv(s, planner.rates(), &warnings);
        assert_eq!(
            String::from_utf8(got).unwrap(),
            want,
            "pass {}",
            s.plan.number
        );
        checked.fetch_add(1, std::sync::atomic::Ordering::Relaxed);
        Ok::<(), std::io::Error>(())
    });
    let plan = planner.run(&sink).unwrap();
    assert!(plan.passes.len() > 100);
    assert_eq!(checked.into_inner(), plan.passes.len());
}

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
/// `StepRow`s, on every pass of the example week (rain case on, adaptive schedule, a mount), and
/// of a day of it with no rain case and an own adaptive scheme whose name the CSV must quote
/// and whose rate is not whole (the writer formats a pass's fixed fields once): byte-identical.
#[test]
fn fast_pass_csv_matches_serde_rows() {
    use passbudget::config::{mission::Mission, overrides::Overrides};
    let path = root().join("examples/wrenlet-1.yaml");
    let week = fast_csv_checked(&Mission::load(&path).unwrap(), None);
    assert!(week > 100);
    let own = r#"modem.schemes=[{name: 'qpsk "own", r1/2', bits_per_symbol: 2, code_rate: 0.5, required_ebn0_db: 1.0, error_rate: 1.0e-6, error_measure: ber, overhead: {efficiency: 0.9371234567}}]"#;
    let sets = Overrides::parse(&[
        own,
        r#"modem.adaptive.schemes=[dvbs2-qpsk-1/4, 'qpsk "own", r1/2']"#,
        "planning.exceedance_percent=~",
    ])
    .unwrap();
    let text = std::fs::read_to_string(&path).unwrap();
    let variant = Mission::from_yaml_with(&path, &text, &sets).unwrap();
    assert!(variant.exceedance_percent.is_none());
    assert!(fast_csv_checked(&variant, Some(1.0)) > 10);
}

/// Checks every pass's fast CSV against the serde rows; returns the number of passes.
fn fast_csv_checked(mission: &passbudget::config::mission::Mission, days: Option<f64>) -> usize {
    use passbudget::plan::{FnSink, PassSeries, PlanRequest, Planner, WindowRequest};
    use passbudget::report::plan::step_rows;
    use passbudget::report::{step_csv::pass_csv, to_csv};
    let request = PlanRequest {
        window: WindowRequest {
            days,
            ..Default::default()
        },
        ..Default::default()
    };
    let planner = Planner::new(mission, &request).unwrap();
    let warnings = vec!["a warning, with a comma".to_string()];
    let checked = std::sync::atomic::AtomicUsize::new(0);
    let quoted = std::sync::atomic::AtomicUsize::new(0);
    let sink = FnSink(|s: &PassSeries<'_>| {
        let want = to_csv(&step_rows(s, planner.rates()), &warnings).unwrap();
        let got = String::from_utf8(pass_csv(s, planner.rates(), &warnings)).unwrap();
        assert_eq!(got, want, "pass {}", s.plan.number);
        if got.contains(r#""qpsk ""own"", r1/2",56227407.4,"#) {
            quoted.fetch_add(1, std::sync::atomic::Ordering::Relaxed);
        }
        checked.fetch_add(1, std::sync::atomic::Ordering::Relaxed);
        Ok::<(), std::io::Error>(())
    });
    let plan = planner.run(&sink).unwrap();
    assert_eq!(checked.into_inner(), plan.passes.len());
    // the variant's own scheme is chosen somewhere, quoted, with its fractional rate
    if mission.exceedance_percent.is_none() {
        assert!(quoted.into_inner() > 0, "the own scheme never chosen");
    }
    plan.passes.len()
}

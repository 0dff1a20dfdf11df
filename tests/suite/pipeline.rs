//! The library pipeline against the command line: one answer per rule wherever it is asked.
//! These check the project's own consistency (no outside source is involved): the library and the
//! binary must agree, and a rule written once must give one answer in every command.

use crate::common::bin::{clean_error, json, root, run};
use passbudget::config::mission::Mission;
use passbudget::plan::fleet::contact_plan;
use passbudget::plan::{PlanRequest, Planner, WindowRequest};
use passbudget::report::plan::PlanDoc;

const MISSION: &str = "examples/wrenlet-1.yaml";

/// The shipped example with absolute paths, written into `dir` with `edit` applied.
fn example_copy(dir: &std::path::Path, edit: impl Fn(String) -> String) -> std::path::PathBuf {
    let text = std::fs::read_to_string(root().join(MISSION)).unwrap();
    let text = text
        .replace(
            "sat.tle",
            &root().join("examples/sat.tle").to_string_lossy(),
        )
        .replace("../stations/", &format!("{}/stations/", root().display()));
    let path = dir.join("mission.yaml");
    std::fs::write(&path, edit(text)).unwrap();
    path
}

/// What `examples/plan_week.rs` prints (the library's totals) equals the `totals` of
/// `passbudget plan --format json`.
#[test]
fn library_totals_equal_the_command_line_totals() {
    let mission = Mission::load(&root().join(MISSION)).unwrap();
    let planner = Planner::new(&mission, &PlanRequest::default()).unwrap();
    let plan = planner.collect().unwrap();
    let contacts = contact_plan(&[&planner], std::slice::from_ref(&plan)).unwrap();
    let doc = PlanDoc::with_contacts(&planner, &plan, &contacts);
    let lib = serde_json::to_value(&doc.totals).unwrap();
    let cli = json(&run(&["plan", MISSION, "--format", "json"]));
    assert_eq!(lib, cli["totals"]);
    assert!(lib["passes"].as_u64().unwrap() > 100);
}

/// A mission with `window.end` and a `--start` from the command line: `passes` and `plan` plan the
/// same window (from the given start to the mission's end). Before the rule had one owner, `plan`
/// ignored `window.end` and planned one day.
#[test]
fn one_window_rule_for_every_command() {
    let dir = tempfile::tempdir().unwrap();
    let path = example_copy(dir.path(), |t| {
        t.replace("  days: 7\n", "  end: 2026-12-04T12:00:00Z\n")
    });
    let p = path.to_string_lossy().to_string();
    let start = "2026-12-01T13:00:00Z";
    let passes = json(&run(&[
        "passes",
        "--mission",
        &p,
        "--start",
        start,
        "--format",
        "json",
    ]));
    let plan = json(&run(&["plan", &p, "--start", start, "--format", "json"]));
    let a = &plan["assumptions"];
    assert_eq!(a["window_start"], "2026-12-01T13:00:00.000Z");
    assert_eq!(a["window_end"], "2026-12-04T12:00:00.000Z");
    let last_los = |rows: &serde_json::Value| {
        rows.as_array()
            .unwrap()
            .iter()
            .map(|r| r["los"].as_str().unwrap().to_string())
            .max()
            .unwrap()
    };
    assert_eq!(
        passes["passes"].as_array().unwrap().len(),
        plan["passes"].as_array().unwrap().len()
    );
    assert_eq!(last_los(&passes["passes"]), last_los(&plan["passes"]));
    assert!(last_los(&plan["passes"]).as_str() > "2026-12-04T00:00:00");
    // The library gives the same window.
    let mission = Mission::load(&path).unwrap();
    let request = PlanRequest {
        window: WindowRequest {
            start: Some(passbudget::timefmt::parse_utc(start).unwrap()),
            ..Default::default()
        },
        ..Default::default()
    };
    let w = Planner::new(&mission, &request).unwrap().window();
    assert_eq!(
        passbudget::timefmt::format_ms(&w.end()),
        "2026-12-04T12:00:00.000Z"
    );
}

/// A station that gives its gain but no diameter: `atmosphere` and `budget` use the same antenna
/// for scintillation (the equivalent aperture at the default efficiency), so they report the same
/// scintillation. Before the rule had one owner, `atmosphere` assumed 1 m at 0.5 (0.5320 dB) while
/// `budget` estimated the diameter (0.5146 dB).
#[test]
fn one_scintillation_antenna_for_atmosphere_and_budget() {
    let dir = tempfile::tempdir().unwrap();
    let station = std::fs::read_to_string(root().join("stations/sierra-baja.yaml"))
        .unwrap()
        .replace(
            "  diameter_m: 3.7\n  efficiency: 0.58\n",
            "  gain_dbi: 43.5\n",
        );
    let st_path = dir.path().join("gain-only.yaml");
    std::fs::write(&st_path, &station).unwrap();
    let mission = example_copy(dir.path(), |t| {
        let stations = format!("stations:\n  - {}\n", st_path.to_string_lossy());
        let a = t.find("stations:").unwrap();
        let b = t.find("window:").unwrap();
        format!("{}{stations}{}", &t[..a], &t[b..])
    });
    let m = mission.to_string_lossy().to_string();
    let s = st_path.to_string_lossy().to_string();
    let budget = json(&run(&[
        "budget",
        &m,
        "--station",
        "Sierra Baja",
        "--elevation-deg",
        "5",
        "--exceedance-percent",
        "1",
        "--format",
        "json",
    ]));
    let atmosphere = json(&run(&[
        "atmosphere",
        "--station",
        &s,
        "--frequency-ghz",
        "8.2125",
        "--elevation-deg",
        "5",
        "--exceedance-percent",
        "1",
        "--format",
        "json",
    ]));
    let (b, a) = (
        budget["scintillation_db"].as_f64().unwrap(),
        atmosphere["scintillation_db"].as_f64().unwrap(),
    );
    assert!(b > 0.1, "scintillation {b} dB at 5 deg");
    assert!((a - b).abs() < 1e-4, "atmosphere {a} dB, budget {b} dB");
    // And `plan`: a step of the rain case carries the same atmosphere as `budget --at` its time,
    // to within the path table's stated bound (a plan interpolates it; `budget --at` computes it
    // directly) and the CSV's rounding to 1e-4 dB.
    let out = dir.path().join("out");
    let o = run(&[
        "plan",
        &m,
        "--days",
        "1",
        "--format",
        "json",
        "--out",
        &out.to_string_lossy(),
    ]);
    crate::common::bin::success(&o);
    let csv = std::fs::read_dir(&out)
        .unwrap()
        .map(|e| e.unwrap().path())
        .find(|p| {
            p.extension().is_some_and(|x| x == "csv") && p.to_string_lossy().contains("pass-")
        })
        .expect("a pass CSV");
    let text = std::fs::read_to_string(&csv).unwrap();
    let mut lines = text.lines().filter(|l| !l.starts_with('#'));
    let head: Vec<&str> = lines.next().unwrap().split(',').collect();
    let rows: Vec<Vec<&str>> = lines.map(|l| l.split(',').collect()).collect();
    let row = &rows[rows.len() / 2];
    let col = |name: &str| head.iter().position(|h| *h == name).unwrap();
    let at = row[col("time")];
    let plan_loss: f64 = row[col("rain_atmospheric_loss_db")].parse().unwrap();
    let budget = json(&run(&[
        "budget",
        &m,
        "--station",
        "Sierra Baja",
        "--at",
        at,
        "--exceedance-percent",
        "1",
        "--format",
        "json",
    ]));
    let budget_loss = budget["atmospheric_loss_db"].as_f64().unwrap();
    let tol_db = passbudget::plan::path_table::TABLE_TOLERANCE_DB + 2e-4;
    assert!(
        (plan_loss - budget_loss).abs() < tol_db,
        "plan {plan_loss} dB, budget {budget_loss} dB at {at}"
    );
}

/// Rules that protect the numbers are checked by the library, not only by the command line: a
/// 30 s step (the dwell is 10 s) and a zero-length window are refused by `Planner::new`.
#[test]
fn the_library_refuses_what_the_command_line_refuses() {
    let mission = Mission::load(&root().join(MISSION)).unwrap();
    let step = PlanRequest {
        step_s: Some(30.0),
        ..Default::default()
    };
    let e = Planner::new(&mission, &step).err().expect("30 s refused");
    assert!(e.to_string().contains("step_s"), "{e}");
    let days = PlanRequest {
        window: WindowRequest {
            days: Some(0.0),
            ..Default::default()
        },
        ..Default::default()
    };
    let e = Planner::new(&mission, &days).err().expect("0 days refused");
    assert!(e.to_string().contains("window length"), "{e}");
    clean_error(&run(&["plan", MISSION, "--step", "30"]), &["--step"]);
    clean_error(
        &run(&["plan", MISSION, "--step", "1e-6"]),
        &["--step", "0.01"],
    );
    clean_error(
        &run(&["plan", MISSION, "--exceedance-percent", "20"]),
        &["--exceedance-percent", "5"],
    );
    // The budget at one instant takes the same ranges: the exceedance (it once allowed up to
    // 50 %) and a data rate (the range of the ladder's rate_bps in the file).
    let budget_cases: [(&str, &str, &str); 3] = [
        ("--exceedance-percent", "20", "0.001 to 5"),
        ("--rate-bps", "1e-300", "1 to 100000000000 bit/s"),
        ("--rate-bps", "0.5", "1 to 100000000000 bit/s"),
    ];
    for (flag, value, range) in budget_cases {
        let args = [
            "budget",
            MISSION,
            "--station",
            "Nordkam",
            "--elevation-deg",
            "10",
            flag,
            value,
        ];
        clean_error(&run(&args), &[flag, range]);
    }
}

/// The mask trade-off is gathered in the same run as the plan: asking for it changes none of the
/// plan's own results.
#[test]
fn the_tradeoff_does_not_change_the_plan() {
    let mission = Mission::load(&root().join(MISSION)).unwrap();
    let day = |tradeoff: bool| PlanRequest {
        window: WindowRequest {
            days: Some(1.0),
            ..Default::default()
        },
        search_floor_deg: tradeoff.then_some(0.0),
        ..Default::default()
    };
    let plain = Planner::new(&mission, &day(false)).unwrap();
    let with = Planner::new(&mission, &day(true)).unwrap();
    let (a, b) = (plain.collect().unwrap(), with.collect().unwrap());
    assert!(a.tradeoff_masks.is_none());
    let t = b.tradeoff_masks.as_ref().expect("trade-off gathered");
    assert_eq!(a.totals, b.totals);
    assert_eq!(a.usable_masks, b.usable_masks);
    // The trade-off searched below the configured masks (3 and 5 deg): more contact at 0 deg than
    // the plan's passes have.
    let contact_0: f64 = t.iter().map(|m| m.contact_above_s(0)).sum();
    assert!(
        contact_0 > a.totals.contact_s,
        "{contact_0} vs {}",
        a.totals.contact_s
    );
}

/// `plan`, `mask` and `chart` take `--end` like `passes` and `track` (one window rule, one set of
/// window flags).
#[test]
fn plan_takes_an_end_time() {
    let doc = json(&run(&[
        "plan",
        MISSION,
        "--end",
        "2026-12-02T00:00:00Z",
        "--format",
        "json",
    ]));
    assert_eq!(doc["assumptions"]["window_end"], "2026-12-02T00:00:00.000Z");
    clean_error(
        &run(&["plan", MISSION, "--end", "2026-11-30T00:00:00Z"]),
        &["--end", "not after its start"],
    );
}

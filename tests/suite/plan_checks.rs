//! Checks of the pass-by-pass plan on the shipped example (invented satellite and stations) and
//! on bad input: the invariants the planner must keep, agreement with `budget --at`, and clean
//! errors with nothing half-written.

use crate::common::bin::{json, root, run as run_bin, success, write};
use crate::common::plan::load_plan_setup;
use passbudget::plan::rate::kept_runs;
use passbudget::plan::{FnSink, PassSeries};
use std::path::PathBuf;
use std::sync::Mutex;

const MISSION: &str = "examples/wrenlet-1.yaml";

#[test]
fn plan_json_contract_and_invariants() {
    // The adaptive modem given every ladder rate and free switching: then adaptive >= fixed on
    // every pass by construction (DEVELOPERS.md); the example's own adaptive mode is checked
    // against Shannon only (it is another waveform, with hysteresis and re-lock time).
    let doc = json(&run_bin(&[
        "plan",
        MISSION,
        "--days",
        "2",
        "--format",
        "json",
        "--set",
        "modem.adaptive.with_ladder=true",
        "--set",
        "modem.adaptive.hysteresis_db=0",
        "--set",
        "modem.adaptive.relock_s=0",
    ]));
    let passes = doc["passes"].as_array().unwrap();
    assert!(passes.len() > 20);
    let keys = [
        "satellite",
        "station",
        "aos",
        "tca",
        "los",
        "max_elevation_deg",
        "rate_bps",
        "scheme",
        "closes_from",
        "closes_until",
        "closes_from_elevation_deg",
        "closes_until_elevation_deg",
        "min_margin_db",
        "max_ebn0_db",
        "volume_bits",
        "adaptive_volume_bits",
        "shannon_volume_bits",
    ];
    let mut no_rate = 0;
    for p in passes {
        for k in keys {
            assert!(p.get(k).is_some(), "pass lacks {k}");
        }
        let f = p["volume_bits"].as_f64().unwrap();
        let a = p["adaptive_volume_bits"].as_f64().unwrap();
        let s = p["shannon_volume_bits"].as_f64().unwrap();
        assert!(
            f <= a + 1.0 && a <= s + 1.0,
            "fixed {f} <= adaptive {a} <= Shannon {s}"
        );
        if let (Some(rf), Some(ra)) = (
            p["rain_volume_bits"].as_f64(),
            p["rain_adaptive_volume_bits"].as_f64(),
        ) {
            assert!(rf <= ra + 1.0 && ra <= p["rain_shannon_volume_bits"].as_f64().unwrap() + 1.0);
            assert!(rf <= f + 1.0, "rain never brings more than clear sky");
        }
        if p["rate_bps"].is_null() {
            no_rate += 1;
            assert_eq!(f, 0.0);
        } else {
            let from = p["closes_from"].as_str().unwrap();
            let until = p["closes_until"].as_str().unwrap();
            assert!(
                p["aos"].as_str().unwrap() <= from
                    && from < until
                    && until <= p["los"].as_str().unwrap()
            );
        }
    }
    let _ = no_rate;
    let t = &doc["totals"];
    for k in [
        "contact_s",
        "volume_bits",
        "adaptive_volume_bits",
        "shannon_volume_bits",
        "network_volume_bits",
    ] {
        assert!(t[k].as_f64().is_some(), "totals lack {k}");
    }
    // The network total counts each second once: never more than the sum over stations.
    assert!(t["network_volume_bits"].as_f64().unwrap() <= t["volume_bits"].as_f64().unwrap() + 1.0);
    assert!(doc["assumptions"].is_object());
    // Usable mask of every rate is at least the station mask, and a higher rate's usable mask is
    // never lower than a lower rate's at the same station (it never closes earlier).
    let masks = doc["usable_masks"].as_array().unwrap();
    for m in masks {
        if let Some(u) = m["usable_mask_deg"].as_f64() {
            assert!(u >= m["station_mask_deg"].as_f64().unwrap() - 1e-9, "{m}");
        }
    }
    for a in masks {
        for b in masks {
            if a["station"] == b["station"] && b["rate_bps"].as_f64() > a["rate_bps"].as_f64() {
                if let (Some(ua), Some(ub)) =
                    (a["usable_mask_deg"].as_f64(), b["usable_mask_deg"].as_f64())
                {
                    assert!(ub >= ua - 1e-9, "{a} vs {b}");
                }
                assert!(b["passes_closing"].as_u64() <= a["passes_closing"].as_u64());
            }
        }
    }
    // The example shows the trade-offs: a small dish in a wet climate loses passes in rain.
    assert!(t["rain_passes_closing"].as_u64().unwrap() < t["passes_closing"].as_u64().unwrap());
}

#[test]
fn plan_is_deterministic() {
    let a = run_bin(&["plan", MISSION, "--days", "1", "--format", "json"]);
    let b = run_bin(&["plan", MISSION, "--days", "1", "--format", "json"]);
    assert_eq!(a.stdout, b.stdout);
    // No progress bar when stderr is not a terminal.
    assert!(!String::from_utf8_lossy(&a.stderr).contains("planning passes"));
}

#[test]
fn time_series_step_equals_budget_at_and_rate_doubling_costs_3_01_db() {
    let dir = tempfile::tempdir().unwrap();
    let out = dir.path().to_string_lossy().into_owned();
    let doc = json(&run_bin(&[
        "plan", MISSION, "--days", "1", "--format", "json", "--out", &out,
    ]));
    let pass = doc["passes"]
        .as_array()
        .unwrap()
        .iter()
        .find(|p| p["station"] == "Sierra Baja" && !p["rate_bps"].is_null())
        .unwrap()
        .clone();
    let files: Vec<PathBuf> = std::fs::read_dir(dir.path())
        .unwrap()
        .map(|e| e.unwrap().path())
        .collect();
    for name in ["summary.json", "summary.csv", "days.csv", "masks.csv"] {
        assert!(
            files.iter().any(|f| f.file_name().unwrap() == name),
            "{name} written"
        );
    }
    let number = pass["number"].as_u64().unwrap();
    let csv_path = files
        .iter()
        .find(|f| {
            f.file_name()
                .unwrap()
                .to_string_lossy()
                .starts_with(&format!("pass-{number:03}-sierra-baja-"))
        })
        .unwrap();
    let mut rdr = csv::ReaderBuilder::new()
        .comment(Some(b'#'))
        .from_path(csv_path)
        .unwrap();
    let headers = rdr.headers().unwrap().clone();
    let rows: Vec<csv::StringRecord> = rdr.records().map(|r| r.unwrap()).collect();
    let col = |name: &str| headers.iter().position(|h| h == name).unwrap();
    let row = &rows[rows.len() / 2];
    let time = row[col("time")].to_string();
    let rate = row[col("rate_bps")].to_string();
    // `budget --at` the series row's time at Sierra Baja, at `rate_bps`, with `more` options.
    let budget_at_row = |rate_bps: &str, more: &[&str]| {
        let mut args = vec!["budget", MISSION, "--station", "Sierra Baja"];
        args.extend(["--at", &time, "--rate-bps", rate_bps]);
        args.extend(more);
        args.extend(["--format", "json"]);
        json(&run_bin(&args))
    };
    let b = budget_at_row(&rate, &[]);
    for (csv_name, json_name, tol) in [
        ("cn0_dbhz", "cn0_dbhz", 1e-3),
        ("ebn0_db", "ebn0_db", 1e-3),
        ("margin_db", "margin_db", 1e-3),
        ("system_temperature_k", "system_temperature_k", 1e-2),
        ("elevation_deg", "elevation_deg", 1e-3),
        ("free_space_loss_db", "free_space_loss_db", 1e-3),
    ] {
        let a: f64 = row[col(csv_name)].parse().unwrap();
        let c = b[json_name].as_f64().unwrap();
        assert!(
            (a - c).abs() <= tol,
            "{csv_name}: series {a} vs budget --at {c}"
        );
    }
    // Doubling the rate (same scheme) lowers Eb/N0 by 10 log10(2) = 3.0103 dB exactly.
    let scheme = b["scheme"].as_str().unwrap().to_string();
    let r: f64 = rate.parse().unwrap();
    let half = format!("{}", r / 2.0);
    let b2 = budget_at_row(&half, &["--scheme", &scheme]);
    let d = b2["ebn0_db"].as_f64().unwrap() - b["ebn0_db"].as_f64().unwrap();
    assert!((d - 3.0103).abs() < 2e-4, "{d}");
    assert!(
        (b2["cn0_dbhz"].as_f64().unwrap() - b["cn0_dbhz"].as_f64().unwrap()).abs() < 1e-9,
        "C/N0 does not depend on the rate"
    );
}

#[test]
fn a_higher_rate_never_closes_earlier() {
    let setup = load_plan_setup(&root().join(MISSION));
    let start = setup.mission.start.unwrap();
    let planner = setup.planner(start, passbudget::timefmt::add_seconds(&start, 86400.0));
    let rates = planner.rates();
    let violations = Mutex::new(Vec::new());
    let checked = Mutex::new(0usize);
    // Every pass handed to the sink knows how many the plan numbers (its file names' width).
    let pass_counts = Mutex::new(std::collections::BTreeSet::new());
    // Ladder options in order of rate. The C/N0 a rate needs must rise with the rate for the shipped
    // ladder (10 log10 R grows faster than the better codes of the higher rates save).
    let mut order: Vec<usize> = (0..rates.ladder.len()).collect();
    order.sort_by(|a, b| {
        rates.ladder[*a]
            .rate_bps
            .total_cmp(&rates.ladder[*b].rate_bps)
    });
    for w in order.windows(2) {
        assert!(rates.ladder[w[1]].threshold_cn0_dbhz > rates.ladder[w[0]].threshold_cn0_dbhz);
    }
    let sink = FnSink(|s: &PassSeries| -> Result<(), std::convert::Infallible> {
        pass_counts.lock().unwrap().insert(s.pass_count);
        let cn0: Vec<f64> = s.steps.iter().map(|x| x.cn0_dbhz).collect();
        let w: Vec<f64> = s.steps.iter().map(|x| x.weight_s).collect();
        let mut prev: Option<(usize, usize)> = None;
        let mut runs = Vec::new();
        for &k in &order {
            kept_runs(
                &cn0,
                &w,
                rates.ladder[k].threshold_cn0_dbhz,
                rates.min_dwell_s,
                &mut runs,
            );
            let Some(&(first, _)) = runs.first() else {
                break;
            };
            let last = runs.last().unwrap().1;
            if let Some((pf, pl)) = prev {
                if first < pf || last > pl {
                    violations.lock().unwrap().push((s.plan.number, k));
                }
            }
            prev = Some((first, last));
            *checked.lock().unwrap() += 1;
        }
        Ok(())
    });
    let plan = planner.run(&sink).unwrap();
    assert!(plan.passes.len() > 10);
    assert!(*checked.lock().unwrap() > 30);
    let pass_counts = pass_counts.into_inner().unwrap();
    assert_eq!(
        pass_counts.into_iter().collect::<Vec<_>>(),
        [plan.passes.len()]
    );
    assert!(
        violations.lock().unwrap().is_empty(),
        "{:?}",
        violations.lock().unwrap()
    );
    // Fixed and adaptive <= Shannon for every pass, through the library as well (the example's
    // adaptive mode is another waveform with hysteresis: no order against the fixed rate).
    assert!(!plan.adaptive_dominates);
    for p in &plan.passes {
        assert!(
            p.clear.volume_bits <= p.clear.shannon_volume_bits
                && p.clear.adaptive_volume_bits <= p.clear.shannon_volume_bits
        );
    }
}

#[test]
fn bad_plan_input_gives_one_clear_line_and_writes_nothing() {
    let dir = tempfile::tempdir().unwrap();
    let d = dir.path();
    let example = std::fs::read_to_string(root().join(MISSION)).unwrap();
    let abs = |t: &str| {
        t.replace(
            "sat.tle",
            &root().join("examples/sat.tle").to_string_lossy(),
        )
        .replace("../stations/", &format!("{}/stations/", root().display()))
    };
    let good = abs(&example);
    let no_stations = write(d, "nost.yaml", &good.replace(&format!("  - {}/stations/nordkam.yaml\n  - {}/stations/sierra-baja.yaml\n  - {}/stations/pulau-reka.yaml\n", root().display(), root().display(), root().display()), ""));
    let mut no_rates = String::new();
    let mut skip = false;
    for line in good.lines() {
        if line.starts_with("  ladder:") {
            no_rates.push_str("  ladder: []\n");
            skip = true;
            continue;
        }
        if skip && line.starts_with("    - {") {
            continue;
        }
        skip = false;
        no_rates.push_str(line);
        no_rates.push('\n');
    }
    let no_rates = write(d, "norates.yaml", &no_rates);
    let too_wide = write(
        d,
        "wide.yaml",
        &good.replace("rate_bps: 300.0e6", "rate_bps: 900.0e6"),
    );
    let bad_scheme = write(
        d,
        "scheme.yaml",
        &good.replace(
            "rate_bps: 25.0e6, scheme: ccsds-rs-cc",
            "rate_bps: 25.0e6, scheme: ccsds-rs-ccc",
        ),
    );
    let not_a_dir = write(d, "file.txt", "x");
    let out_dir = d.join("out");
    let out = out_dir.to_string_lossy().into_owned();
    let cases: Vec<(Vec<String>, Vec<&str>)> = vec![
        (vec![no_stations.clone()], vec!["nost.yaml", "no stations"]),
        (vec![no_rates.clone()], vec!["norates.yaml", "ladder"]),
        (
            vec![too_wide.clone(), "--out".into(), out.clone()],
            vec!["wide.yaml", "occupies"],
        ),
        (
            vec![bad_scheme.clone()],
            vec!["scheme.yaml", "ccsds-rs-ccc"],
        ),
        (
            vec![MISSION.into(), "--out".into(), format!("{not_a_dir}/sub")],
            vec!["--out", "cannot create"],
        ),
        (
            vec![MISSION.into(), "--step".into(), "0".into()],
            vec!["--step"],
        ),
        (
            vec![MISSION.into(), "--exceedance-percent".into(), "70".into()],
            vec!["exceedance"],
        ),
    ];
    for (extra, needles) in cases {
        let mut args = vec!["plan".to_string()];
        args.extend(extra);
        let argv: Vec<&str> = args.iter().map(String::as_str).collect();
        let o = run_bin(&argv);
        let stderr = String::from_utf8_lossy(&o.stderr);
        assert_eq!(o.status.code(), Some(1), "{argv:?}: {stderr}");
        let lines: Vec<&str> = stderr.lines().filter(|l| l.starts_with("error")).collect();
        assert_eq!(lines.len(), 1, "{stderr}");
        for n in needles {
            assert!(lines[0].contains(n), "'{n}' not in {stderr}");
        }
        assert!(!stderr.contains("panicked"));
    }
    // Nothing half-written: the failed --out run left no files (the folder may exist, empty).
    if out_dir.exists() {
        assert_eq!(std::fs::read_dir(&out_dir).unwrap().count(), 0);
    }
}

/// The README's main-job command on the shipped example writes the plan, every pass's time series
/// and every chart, and leaves no staging folder behind; a second run replaces the first.
#[test]
fn readme_main_command_writes_plan_series_and_charts() {
    let dir = tempfile::tempdir().unwrap();
    let out = dir.path().join("out");
    let o = out.to_string_lossy().into_owned();
    let r = run_bin(&["plan", MISSION, "--out", &o, "--charts"]);
    let table = success(&r);
    assert!(
        table.contains("Window totals") && table.contains("licence"),
        "{table}"
    );
    let names: Vec<String> = std::fs::read_dir(&out)
        .unwrap()
        .map(|e| e.unwrap().file_name().to_string_lossy().into_owned())
        .collect();
    let summary: serde_json::Value =
        serde_json::from_str(&std::fs::read_to_string(out.join("summary.json")).unwrap()).unwrap();
    let n = summary["passes"].as_array().unwrap().len();
    let count = |pre: &str, ext: &str| {
        names
            .iter()
            .filter(|x| x.starts_with(pre) && x.ends_with(ext))
            .count()
    };
    assert_eq!(count("pass-", ".csv"), n);
    assert_eq!(count("pass-", ".png"), n);
    assert!(count("sky-", ".png") >= 3 * 7);
    assert_eq!(count("mask-", ".png"), 4);
    assert_eq!(count("summary-", ".png"), 1);
    assert!(
        !names
            .iter()
            .any(|x| x.starts_with('.') && x != passbudget::report::MANIFEST),
        "no staging folder or temporary file left: {names:?}"
    );
    // A shorter second run replaces the files of the first rather than mixing with them.
    success(&run_bin(&["plan", MISSION, "--days", "0.5", "--out", &o]));
    let after = std::fs::read_dir(&out).unwrap().count();
    assert!(
        after < names.len() / 4,
        "{after} files after the second run"
    );
}

//! Property tests of the planner over random valid missions: one invented station (position,
//! mask, dish, LNA, climate), an invented transmitter (power, 2-30 GHz), a random ladder, a
//! window of 0.25-2 days starting within three days of the element epoch, a step of 1-5 s.
//!
//! Library: no panic, every number of the plan finite, and per pass fixed <= adaptive <= Shannon
//! (the random missions give the adaptive modem every ladder rate and free switching,
//! `with_ladder`, no hysteresis or re-lock time, DEVELOPERS.md; no coded rate beats Shannon's
//! capacity, C. E. Shannon, "A Mathematical Theory of Communication", 1948, theorem 17). The
//! checks are `passbudget::plan::fuzz_entry::plan_violations`, the ones the `plan` fuzz target
//! asserts; `plan_violations_flags_a_broken_plan` shows they can fail.
//!
//! Binary: `plan --out` into a folder that already holds an older result and a file of the
//! user's either completes the folder (summary.json, summary.csv, days.csv, masks.csv and one
//! CSV per pass, the user's file kept) or, when the command fails, leaves it byte for byte as it
//! was. Some cases fail on purpose: a step over half the minimum dwell is refused.

use crate::common::bin::{command, root};
use passbudget::config::mission::Mission;
use passbudget::plan::fuzz_entry::plan_violations;
use passbudget::plan::{PlanRequest, Planner};
use proptest::prelude::*;
use std::collections::BTreeMap;
use std::path::Path;

/// Invented station parameters (not a real site).
#[derive(Debug, Clone)]
struct StationParams {
    latitude_deg: f64,
    longitude_deg: f64,
    altitude_m: f64,
    min_elevation_deg: f64,
    diameter_m: f64,
    lna_noise_temperature_k: f64,
    rain_rate_001_mm_h: f64,
    /// The noise keys: man-made category, an observed solar flux (sfu), ground emissivity.
    man_made_noise: Option<&'static str>,
    solar_flux_sfu: Option<f64>,
    ground_emissivity: f64,
}

/// Invented mission parameters; the element file is the shipped example's (epoch
/// 2026-12-01T12:00:00Z).
#[derive(Debug, Clone)]
struct MissionParams {
    power_w: f64,
    frequency_mhz: f64,
    tx_gain_dbi: f64,
    ladder_bps: Vec<f64>,
    adaptive: bool,
    start_offset_h: f64,
    days: f64,
    step_s: u32,
    min_dwell_s: u32,
    exceedance_percent: Option<f64>,
}

fn station_params() -> impl Strategy<Value = StationParams> {
    (
        -80.0f64..80.0,
        -180.0f64..180.0,
        0.0f64..3000.0,
        0.0f64..15.0,
        1.0f64..12.0,
        30.0f64..300.0,
        0.0f64..120.0,
        (
            prop::option::of(prop::sample::select(vec![
                "city",
                "residential",
                "rural",
                "quiet_rural",
            ])),
            prop::option::of(1.0f64..1e6),
            0.0f64..=1.0,
        ),
    )
        .prop_map(
            |(la, lo, alt, mask, d, lna, rain, (mm, flux, e))| StationParams {
                latitude_deg: la,
                longitude_deg: lo,
                altitude_m: alt,
                min_elevation_deg: mask,
                diameter_m: d,
                lna_noise_temperature_k: lna,
                rain_rate_001_mm_h: rain,
                man_made_noise: mm,
                solar_flux_sfu: flux,
                ground_emissivity: e,
            },
        )
}

/// `dwell` is the strategy of `modem.min_dwell_s`.
fn mission_params(dwell: impl Strategy<Value = u32>) -> impl Strategy<Value = MissionParams> {
    (
        (0.2f64..20.0, 2000.0f64..30000.0, -3.0f64..10.0),
        prop::collection::vec(1e5f64..4e8, 1..5),
        any::<bool>(),
        (0.0f64..72.0, 0.25f64..2.0, 1u32..=5, dwell),
        prop::option::of(0.1f64..5.0),
    )
        .prop_map(
            |((p, f, g), ladder, adaptive, (off, days, step, dwell), exc)| MissionParams {
                power_w: p,
                frequency_mhz: f,
                tx_gain_dbi: g,
                ladder_bps: ladder,
                adaptive,
                start_offset_h: off,
                days,
                step_s: step,
                min_dwell_s: dwell,
                exceedance_percent: exc,
            },
        )
}

fn station_yaml(s: &StationParams) -> String {
    let mut y = format!(
        "name: Proptest Station\nlatitude_deg: {}\nlongitude_deg: {}\naltitude_m: {}\n\
         min_elevation_deg: {}\nantenna:\n  diameter_m: {}\n  efficiency: 0.6\n  polarization: rhcp\n\
         \x20 ground_emissivity: {}\n\
         receiver:\n  lna_noise_temperature_k: {}\n  lna_gain_db: 30\nclimate:\n  pressure_hpa: 1000\n\
         \x20 temperature_k: 288\n  water_vapour_density_g_m3: 7.5\n  rain_rate_001_mm_h: {}\n",
        s.latitude_deg,
        s.longitude_deg,
        s.altitude_m,
        s.min_elevation_deg,
        s.diameter_m,
        s.ground_emissivity,
        s.lna_noise_temperature_k,
        s.rain_rate_001_mm_h
    );
    if let Some(m) = s.man_made_noise {
        y.push_str(&format!("man_made_noise: {m}\n"));
    }
    if let Some(f) = s.solar_flux_sfu {
        y.push_str(&format!("solar_flux_sfu: {f}\n"));
    }
    y
}

/// A mission YAML naming `station.yaml` beside it and the shipped example's elements.
fn mission_yaml(m: &MissionParams) -> String {
    let start = passbudget::timefmt::utc(2026, 12, 1, 12, 0, 0)
        + chrono::Duration::milliseconds((m.start_offset_h * 3.6e6) as i64);
    let elements = root().join("examples/sat.tle");
    let schemes = ["ccsds-rs-cc", "ccsds-ldpc-r7/8", "qpsk"];
    let ladder: String = m
        .ladder_bps
        .iter()
        .enumerate()
        .map(|(i, r)| format!("    - {{ rate_bps: {r}, scheme: {} }}\n", schemes[i % 3]))
        .collect();
    let adaptive = if m.adaptive {
        "  adaptive:\n    symbol_rate_baud: 20.0e6\n    schemes: [dvbs2-qpsk-1/4, dvbs2-qpsk-1/2, dvbs2-8psk-2/3, dvbs2-16apsk-3/4]\n    with_ladder: true\n    hysteresis_db: 0\n    relock_s: 0\n"
    } else {
        ""
    };
    let exceedance = m
        .exceedance_percent
        .map(|p| format!("  exceedance_percent: {p}\n"))
        .unwrap_or_default();
    format!(
        "name: Proptest mission\nsatellite:\n  elements: {}\nstations:\n  - station.yaml\n\
         window:\n  start: {}\n  days: {}\nplanning:\n  step_s: {}\n{exceedance}\
         transmitter:\n  frequency_mhz: {}\n  power_w: {}\n  line_loss_db: 1.0\n\
         \x20 antenna:\n    pattern: fixed\n    gain_dbi: {}\n    polarization: rhcp\n\
         modem:\n  roll_off: 0.35\n  implementation_loss_db: 1.5\n  required_margin_db: 3.0\n\
         \x20 target_ber: 1.0e-6\n  min_dwell_s: {}\n  ladder:\n{ladder}{adaptive}",
        elements.display(),
        start.format("%Y-%m-%dT%H:%M:%SZ"),
        m.days,
        m.step_s,
        m.frequency_mhz,
        m.power_w,
        m.tx_gain_dbi,
        m.min_dwell_s
    )
}

fn write_mission(dir: &Path, s: &StationParams, m: &MissionParams) -> std::path::PathBuf {
    std::fs::write(dir.join("station.yaml"), station_yaml(s)).unwrap();
    let path = dir.join("mission.yaml");
    std::fs::write(&path, mission_yaml(m)).unwrap();
    path
}

/// Every file of a folder (not recursing) with its bytes, and the names of its sub-folders.
fn snapshot(dir: &Path) -> BTreeMap<String, Option<Vec<u8>>> {
    std::fs::read_dir(dir)
        .unwrap()
        .map(|e| {
            let e = e.unwrap();
            let name = e.file_name().to_string_lossy().into_owned();
            let bytes = e
                .file_type()
                .unwrap()
                .is_file()
                .then(|| std::fs::read(e.path()).unwrap());
            (name, bytes)
        })
        .collect()
}

proptest! {
    #![proptest_config(ProptestConfig::with_cases(96))]

    /// Random valid missions plan without panic, every number finite, fixed <= adaptive <= Shannon.
    #[test]
    fn random_plans_are_finite_and_ordered(s in station_params(), m in mission_params(Just(10u32))) {
        let dir = tempfile::tempdir().unwrap();
        let path = write_mission(dir.path(), &s, &m);
        let mission = Mission::load(&path).unwrap();
        let planner = Planner::new(&mission, &PlanRequest::default()).unwrap();
        let plan = planner.collect().unwrap();
        let problems = plan_violations(&plan);
        prop_assert!(problems.is_empty(), "{}", problems.join("\n"));
        prop_assert!((plan.window.days() - m.days).abs() < 1e-6);
        prop_assert_eq!(plan.totals.passes, plan.passes.len());
        prop_assert_eq!(plan.rain_planned, m.exceedance_percent.is_some());
    }
}

proptest! {
    #![proptest_config(ProptestConfig::with_cases(16))]

    /// `plan --out` completes the folder or, on failure, leaves it as it was.
    #[test]
    fn out_folder_is_complete_or_unchanged(s in station_params(), m in mission_params(2u32..=12)) {
        let dir = tempfile::tempdir().unwrap();
        let path = write_mission(dir.path(), &s, &m);
        let out = dir.path().join("out");
        std::fs::create_dir(&out).unwrap();
        // An earlier result set in the folder (a shorter plan at 1 s steps), and a user's file.
        let earlier = command()
            .arg("plan").arg(&path).args(["--days", "0.1", "--step", "1", "--out"]).arg(&out)
            .output().unwrap();
        prop_assert!(earlier.status.success(), "{}", String::from_utf8_lossy(&earlier.stderr));
        std::fs::write(out.join("notes.txt"), b"the user's own file").unwrap();
        let before = snapshot(&out);
        let o = command().arg("plan").arg(&path).arg("--out").arg(&out).output().unwrap();
        let stderr = String::from_utf8_lossy(&o.stderr);
        prop_assert!(!stderr.contains("panicked"), "{}", stderr);
        let after = snapshot(&out);
        // A step over half the dwell (when the dwell is 2 s or more) is the one refusal here.
        let refused = f64::from(m.step_s) > f64::from(m.min_dwell_s) / 2.0;
        prop_assert_eq!(o.status.success(), !refused, "{}", stderr);
        if !o.status.success() {
            prop_assert_eq!(&after, &before);
            return Ok(());
        }
        let mission = Mission::load(&path).unwrap();
        let passes = Planner::new(&mission, &PlanRequest::default()).unwrap().collect().unwrap().passes.len();
        for name in ["summary.json", "summary.csv", "days.csv", "masks.csv", "contacts.csv", "satellites.csv", "stations.csv", "calendar-proptest-station.ics"] {
            prop_assert!(matches!(after.get(name), Some(Some(_))), "{} missing", name);
        }
        prop_assert_ne!(&after["summary.json"], &before["summary.json"]);
        prop_assert_eq!(&after["notes.txt"], &before["notes.txt"]);
        let pass_csvs = after.keys().filter(|n| n.starts_with("pass-") && n.ends_with(".csv")).count();
        prop_assert_eq!(pass_csvs, passes);
        // Nothing else: the manifest, and no staging folder, journal or file of the earlier set left behind.
        prop_assert!(after.contains_key(".passbudget-manifest"));
        prop_assert_eq!(after.len(), 10 + passes, "{:?}", after.keys().collect::<Vec<_>>());
        let doc: serde_json::Value = serde_json::from_slice(after["summary.json"].as_ref().unwrap()).unwrap();
        prop_assert_eq!(doc["passes"].as_array().map(Vec::len), Some(passes));
    }
}

/// The property checks fail on a plan with a pass whose fixed-rate volume exceeds its adaptive
/// volume, on a Shannon volume below the adaptive one, and on a number that is not finite.
#[test]
fn plan_violations_flags_a_broken_plan() {
    let s = StationParams {
        latitude_deg: 68.4,
        longitude_deg: 17.95,
        altitude_m: 210.0,
        min_elevation_deg: 5.0,
        diameter_m: 7.3,
        lna_noise_temperature_k: 45.0,
        rain_rate_001_mm_h: 22.0,
        man_made_noise: None,
        solar_flux_sfu: None,
        ground_emissivity: 0.9,
    };
    let m = MissionParams {
        power_w: 2.0,
        frequency_mhz: 8212.5,
        tx_gain_dbi: 3.0,
        ladder_bps: vec![10e6, 50e6],
        adaptive: true,
        start_offset_h: 0.0,
        days: 1.0,
        step_s: 1,
        min_dwell_s: 10,
        exceedance_percent: None,
    };
    let dir = tempfile::tempdir().unwrap();
    let mission = Mission::load(&write_mission(dir.path(), &s, &m)).unwrap();
    let plan = Planner::new(&mission, &PlanRequest::default())
        .unwrap()
        .collect()
        .unwrap();
    assert!(plan_violations(&plan).is_empty());
    let k = plan
        .passes
        .iter()
        .position(|p| p.clear.volume_bits > 0.0)
        .unwrap_or_else(|| panic!("no pass closes: {:?}", plan.totals));
    let mut broken = plan.clone();
    broken.passes[k].clear.volume_bits = broken.passes[k].clear.adaptive_volume_bits * 1.01;
    assert_eq!(plan_violations(&broken).len(), 1);
    let mut broken = plan.clone();
    broken.passes[k].clear.shannon_volume_bits = broken.passes[k].clear.adaptive_volume_bits * 0.99;
    assert_eq!(plan_violations(&broken).len(), 1);
    let mut broken = plan.clone();
    broken.totals.contact_s = f64::NAN;
    assert_eq!(plan_violations(&broken).len(), 1);
    let mut broken = plan.clone();
    broken.station_masks[0].contact_bins_s[3] = f64::INFINITY;
    assert_eq!(plan_violations(&broken).len(), 1);
    let mut broken = plan;
    let failure = passbudget::plan::results::MaskFailure {
        pass_number: broken.passes[k].number,
        station_index: broken.passes[k].station_index,
        time: broken.passes[k].pass.aos,
        step: passbudget::plan::mask::OpenStep {
            elevation_deg: 12.0,
            t_s: f64::NAN,
            margin_db: -1.0,
        },
    };
    broken.usable_masks[0].failures.push(failure);
    assert_eq!(plan_violations(&broken).len(), 1);
}

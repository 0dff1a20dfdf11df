//! End-to-end checks of `atmosphere` and `budget` on the shipped example files, and their
//! bad-input behaviour (one clear line, exit code 1, model range warnings named).

use crate::common::bin::{clean_error, json, root, run};
use std::process::Output;

/// The shipped example mission.
const EXAMPLE: &str = "examples/wrenlet-1.yaml";

/// `budget` of `mission` at `station` and `elevation_deg`, with `more` options.
fn budget(mission: &str, station: &str, elevation_deg: &str, more: &[&str]) -> Output {
    let mut args = vec!["budget", mission, "--station", station];
    args.extend(["--elevation-deg", elevation_deg]);
    args.extend(more);
    run(&args)
}

/// `atmosphere --format json` at `station` (a file), frequency and elevation, with `more` options.
fn atmosphere_json(
    station: &str,
    frequency_ghz: &str,
    elevation_deg: &str,
    more: &[&str],
) -> serde_json::Value {
    let mut args = vec!["atmosphere", "--station", station];
    args.extend([
        "--frequency-ghz",
        frequency_ghz,
        "--elevation-deg",
        elevation_deg,
    ]);
    args.extend(more);
    args.extend(["--format", "json"]);
    json(&run(&args))
}

#[test]
fn atmosphere_json_keys_and_physics() {
    let clear = atmosphere_json("stations/pulau-reka.yaml", "8.2", "20", &[]);
    for k in [
        "gas_db",
        "cloud_db",
        "rain_db",
        "scintillation_db",
        "total_db",
        "rain_height_km",
        "specific_rain_attenuation_db_km",
        "sky_temperature_k",
    ] {
        assert!(clear[k].as_f64().is_some(), "{k}");
    }
    // Clear sky: no rain, no scintillation fade (ITU-R P.618-14 §2.5 as implemented; README).
    assert_eq!(clear["rain_db"].as_f64().unwrap(), 0.0);
    assert_eq!(clear["scintillation_db"].as_f64().unwrap(), 0.0);
    let wet = atmosphere_json(
        "stations/pulau-reka.yaml",
        "8.2",
        "20",
        &["--exceedance-percent", "0.1"],
    );
    assert!(wet["rain_db"].as_f64().unwrap() > 1.0);
    // Sky temperature rises with the absorptive attenuation (P.618-14 eq (69)) and stays below Tmr.
    let (tc, tw) = (
        clear["sky_temperature_k"].as_f64().unwrap(),
        wet["sky_temperature_k"].as_f64().unwrap(),
    );
    assert!(tw > tc && tw < wet["mean_radiating_temperature_k"].as_f64().unwrap());
    // Station rain height given in the file: 4.9 km.
    assert_eq!(wet["rain_height_km"].as_f64().unwrap(), 4.9);
}

#[test]
fn out_of_range_models_are_named_in_warnings() {
    let o = atmosphere_json(
        "stations/nordkam.yaml",
        "0.4",
        "3",
        &["--exceedance-percent", "1"],
    );
    let w: Vec<String> = o["warnings"]
        .as_array()
        .unwrap()
        .iter()
        .map(|x| x.as_str().unwrap().to_string())
        .collect();
    assert!(
        w.iter()
            .any(|m| m.contains("P.618") && m.contains("4-55 GHz")),
        "{w:?}"
    );
    assert!(
        w.iter()
            .any(|m| m.contains("P.676") && m.contains("1-350 GHz")),
        "{w:?}"
    );
    assert!(w.iter().any(|m| m.contains("below 5 deg")), "{w:?}");
}

#[test]
fn budget_json_keys_and_rate_behaviour() {
    let b = json(&budget(
        EXAMPLE,
        "Nordkam",
        "30",
        &["--rate-bps", "100e6", "--format", "json"],
    ));
    for k in [
        "frequency_hz",
        "elevation_deg",
        "range_km",
        "eirp_dbw",
        "free_space_loss_db",
        "atmospheric_loss_db",
        "polarization_loss_db",
        "pointing_loss_db",
        "antenna_gain_dbi",
        "sky_noise_k",
        "ground_noise_k",
        "man_made_noise_k",
        "receiver_noise_k",
        "antenna_temperature_k",
        "system_temperature_k",
        "g_over_t_db_k",
        "cn0_dbhz",
        "rate_bps",
        "ebn0_db",
        "required_ebn0_db",
        "margin_db",
        "shannon_capacity_bps",
    ] {
        assert!(b[k].as_f64().is_some(), "{k}");
    }
    // The itemized lines add up: C/N0 = EIRP - L_fs - L_atm - L_pol - L_point + G/T - 10 log10 k.
    let g = |k: &str| b[k].as_f64().unwrap();
    let cn0 = g("eirp_dbw")
        - g("free_space_loss_db")
        - g("atmospheric_loss_db")
        - g("polarization_loss_db")
        - g("pointing_loss_db")
        + g("g_over_t_db_k")
        + 228.5991672;
    assert!(
        (cn0 - g("cn0_dbhz")).abs() < 2e-3,
        "{cn0} vs {}",
        g("cn0_dbhz")
    );
    // The noise terms add up: Ta = sky + ground + man-made, Tsys = Ta + receiver (rounded to mK).
    let ta = g("sky_noise_k") + g("ground_noise_k") + g("man_made_noise_k");
    assert!((ta - g("antenna_temperature_k")).abs() < 2e-3);
    assert!((ta + g("receiver_noise_k") - g("system_temperature_k")).abs() < 3e-3);
    assert_eq!(g("man_made_noise_k"), 0.0);
    // Slant range at 30 deg for a ~545 km orbit (spherical triangle): about 1000 km.
    assert!((g("range_km") - 1000.0).abs() < 60.0, "{}", g("range_km"));
    // Antenna temperature rises as elevation falls.
    let low = json(&budget(
        EXAMPLE,
        "Nordkam",
        "5",
        &["--rate-bps", "100e6", "--format", "json"],
    ));
    assert!(low["antenna_temperature_k"].as_f64().unwrap() > g("antenna_temperature_k"));
    assert!(low["system_temperature_k"].as_f64().unwrap() > g("system_temperature_k"));
    let table = String::from_utf8(budget(EXAMPLE, "Nordkam", "30", &[]).stdout).unwrap();
    assert!(
        table.contains("margin")
            && table.contains("Shannon gap")
            && table.contains("Planning estimate")
    );
}

#[test]
fn budget_bad_input() {
    let dir = tempfile::tempdir().unwrap();
    let text = std::fs::read_to_string(root().join("examples/wrenlet-1.yaml")).unwrap();
    let fix = |t: String| {
        t.replace(
            "sat.tle",
            &root().join("examples/sat.tle").to_string_lossy(),
        )
        .replace("../stations/", &format!("{}/stations/", root().display()))
    };
    let neg = dir.path().join("neg.yaml");
    std::fs::write(&neg, fix(text.replace("power_w: 2.0", "power_w: -2.0"))).unwrap();
    let st = std::fs::read_to_string(root().join("stations/nordkam.yaml")).unwrap();
    let eff_station = dir.path().join("eff.yaml");
    std::fs::write(
        &eff_station,
        st.replace("efficiency: 0.60", "efficiency: 1.3"),
    )
    .unwrap();
    let eff_mission = dir.path().join("effm.yaml");
    std::fs::write(
        &eff_mission,
        fix(text.clone()).replace(
            &format!("{}/stations/nordkam.yaml", root().display()),
            &eff_station.to_string_lossy(),
        ),
    )
    .unwrap();
    let m = EXAMPLE;
    let (neg, eff) = (neg.to_string_lossy(), eff_mission.to_string_lossy());
    let nk = "Nordkam";
    clean_error(&budget(&neg, nk, "20", &[]), &["neg.yaml", "power"]);
    clean_error(
        &budget(&eff, nk, "20", &[]),
        &["eff.yaml", "antenna.efficiency"],
    );
    let warp = ["--scheme", "ccsds-warp-drive"];
    clean_error(
        &budget(m, nk, "20", &warp),
        &["--scheme ccsds-warp-drive: ", "ccsds-warp-drive"],
    );
    let fast = ["--rate-bps", "2e9"];
    clean_error(
        &budget(m, nk, "20", &fast),
        &[
            "--rate-bps 2000000000: ",
            "occupies",
            "more than the allowed 375 MHz (modem.max_bandwidth_hz)",
        ],
    );
    clean_error(&budget(m, "Nowhere", "20", &[]), &["Nowhere"]);
    clean_error(&budget(m, nk, "95", &[]), &["--elevation-deg"]);
    // atmosphere: (frequency, further options, needles)
    let cases: [(&str, &[&str], &[&str]); 2] = [
        ("-1", &[], &["--frequency-ghz"]),
        ("8", &["--exceedance-percent", "80"], &["exceedance"]),
    ];
    for (frequency_ghz, more, needles) in cases {
        let mut args = vec!["atmosphere", "--station", "stations/nordkam.yaml"];
        args.extend(["--frequency-ghz", frequency_ghz, "--elevation-deg", "20"]);
        args.extend(more);
        clean_error(&run(&args), needles);
    }
}

/// The shipped example with Sierra Baja's station file replaced by `station` (written to `dir`);
/// returns the mission's path.
pub(crate) fn example_with_sierra_baja(dir: &std::path::Path, station: &str) -> String {
    let st = crate::common::bin::write(dir, "station.yaml", station);
    let text = std::fs::read_to_string(root().join(EXAMPLE)).unwrap();
    let text = text
        .replace(
            "sat.tle",
            &root().join("examples/sat.tle").to_string_lossy(),
        )
        .replace("../stations/sierra-baja.yaml", &st)
        .replace("../stations/", &format!("{}/stations/", root().display()));
    crate::common::bin::write(dir, "mission.yaml", &text)
}

/// Audit reproducer (issue 10): one cloud liquid water L served both weather cases, so an L
/// exceeded 1 % of the year (1.15 kg/m2) loaded the clear-sky budget too (at 5 deg, 8.34 dB of
/// margin against 10.29 dB without it in the audit's case). Each case now has its own key: an L
/// given only for the availability case leaves the clear-sky cloud loss at 0, and the availability
/// case carries A = L K_L(f) / sin(5 deg) (ITU-R P.840-9 Annex 1 §3.1).
#[test]
fn clear_sky_budget_does_not_carry_the_exceedance_cloud() {
    let dir = tempfile::tempdir().unwrap();
    let shipped = std::fs::read_to_string(root().join("stations/sierra-baja.yaml")).unwrap();
    let without_cloud: String = shipped
        .lines()
        .filter(|l| !l.trim_start().starts_with("cloud_liquid_"))
        .map(|l| format!("{l}\n"))
        .collect();
    let with = |extra: &str, name: &str| {
        let d = dir.path().join(name);
        std::fs::create_dir(&d).unwrap();
        example_with_sierra_baja(&d, &format!("{without_cloud}{extra}"))
    };
    let exceedance_only = with("  cloud_liquid_exceedance_kg_m2: 1.15\n", "exceedance");
    let none = with("", "none");
    let both = with(
        "  cloud_liquid_clear_kg_m2: 1.15\n  cloud_liquid_exceedance_kg_m2: 1.15\n",
        "both",
    );
    let sb = "Sierra Baja";
    // Sierra Baja's terrain rises above the horizon, so its noise depends on the azimuth: the
    // budgets face its low side (2 deg at azimuth 330, 3 deg below the beam), where the cloud's
    // sky noise is seen much as without terrain.
    let json_of = |m: &str, more: &[&str]| {
        let mut args = vec!["--format", "json", "--azimuth-deg", "330"];
        args.extend(more);
        json(&budget(m, sb, "5", &args))
    };
    let num = |v: &serde_json::Value, k: &str| v[k].as_f64().unwrap();
    let clear = json_of(&exceedance_only, &[]);
    assert_eq!(num(&clear, "cloud_db"), 0.0);
    // The clear-sky margin is the one of a station without any cloud.
    let bare = json_of(&none, &[]);
    assert_eq!(num(&clear, "margin_db"), num(&bare, "margin_db"));
    // The availability case carries the cloud loss of its own L (rounded to 1e-4 dB in JSON).
    let f_ghz = 8.2125;
    let k_l = passbudget::atmosphere::cloud::mass_absorption_coefficient_p840_9(f_ghz);
    let want = 1.15 * k_l / 5f64.to_radians().sin();
    let wet = json_of(&exceedance_only, &["--exceedance-percent", "1"]);
    assert!((num(&wet, "cloud_db") - want).abs() < 1e-4, "{wet}");
    assert!(want > 0.7, "{want}");
    // What was fixed: the same L in clear sky costs well over a dB of margin at 5 deg.
    let loaded = json_of(&both, &[]);
    assert!(num(&bare, "margin_db") - num(&loaded, "margin_db") > 1.0);
    // Each case names what it lacks.
    let warnings = |v: &serde_json::Value| v["warnings"].to_string();
    assert!(warnings(&clear).contains("cloud_liquid_clear_kg_m2"));
    assert!(!warnings(&wet).contains("cloud_liquid_exceedance_kg_m2"));
    let wet_bare = json_of(&none, &["--exceedance-percent", "1"]);
    assert!(warnings(&wet_bare).contains("cloud_liquid_exceedance_kg_m2"));
}

/// The retired single key is refused in one line naming its file, line and both successors.
#[test]
fn the_retired_cloud_key_names_its_successors() {
    let dir = tempfile::tempdir().unwrap();
    let shipped = std::fs::read_to_string(root().join("stations/sierra-baja.yaml")).unwrap();
    let old: String = shipped
        .lines()
        .filter(|l| !l.trim_start().starts_with("cloud_liquid_exceedance"))
        .map(|l| {
            if l.trim_start().starts_with("cloud_liquid_clear_kg_m2") {
                "  cloud_liquid_kg_m2: 0.4\n".to_string()
            } else {
                format!("{l}\n")
            }
        })
        .collect();
    let line = old
        .lines()
        .position(|l| l.contains("cloud_liquid_kg_m2"))
        .unwrap()
        + 1;
    let m = example_with_sierra_baja(dir.path(), &old);
    clean_error(
        &budget(&m, "Sierra Baja", "20", &[]),
        &[
            &format!("station.yaml:{line}: climate.cloud_liquid_kg_m2"),
            "climate.cloud_liquid_clear_kg_m2",
            "climate.cloud_liquid_exceedance_kg_m2",
        ],
    );
}

/// Audit reproducer (issue 10): `atmosphere --elevation-deg 4.9999999` gave 2.861 dB of rain
/// against 2.926 dB at 5 deg (ITU-R P.618-14 eq (2) against eq (1) picked by rounding); the one
/// rule of `atmosphere::elevation` makes both the same on the command line too.
#[test]
fn atmosphere_has_no_step_just_below_five_degrees() {
    for st in ["stations/pulau-reka.yaml", "stations/sierra-baja.yaml"] {
        let p = ["--exceedance-percent", "0.01"];
        let a = atmosphere_json(st, "8.2", "4.9999999", &p);
        let b = atmosphere_json(st, "8.2", "5", &p);
        for k in [
            "rain_db",
            "gas_db",
            "cloud_db",
            "scintillation_db",
            "total_db",
        ] {
            let (x, y) = (a[k].as_f64().unwrap(), b[k].as_f64().unwrap());
            assert!((x - y).abs() <= 1e-4, "{st} {k}: {x} vs {y}");
        }
        assert!(b["rain_db"].as_f64().unwrap() > 1.0);
    }
}

/// No output shows a negative zero (a loss of "-0 dB" reads as a gain): the clear-sky budget's
/// rain and scintillation lines are 0 in JSON and CSV.
#[test]
fn budget_outputs_carry_no_negative_zero() {
    for format in ["json", "csv"] {
        let text =
            crate::common::bin::success(&budget(EXAMPLE, "Nordkam", "20", &["--format", format]));
        assert!(
            !text.contains("-0.0,") && !text.contains("-0.0\n") && !text.contains(",-0,"),
            "{format}: {text}"
        );
    }
}

/// The source column uses one symbol for one quantity: "eta" is the spectral efficiency Rb / B
/// (the README's "Conventions"), never the aperture efficiency or the bits per symbol.
#[test]
fn budget_table_uses_eta_for_one_quantity() {
    let out = budget(EXAMPLE, "Nordkam", "30", &[]);
    let table = crate::common::bin::success(&out);
    // "eta" as a word (not inside "theta" or "theta_3dB").
    let has_eta = |l: &str| {
        l.split(|c: char| !c.is_ascii_alphanumeric() && c != '_')
            .any(|w| w == "eta")
    };
    let with_eta: Vec<&str> = table.lines().filter(|l| has_eta(l)).collect();
    assert!(!with_eta.is_empty(), "{table}");
    for l in &with_eta {
        assert!(l.contains("eta = Rb / B"), "eta with another meaning: {l}");
    }
    let gain = table
        .lines()
        .find(|l| l.starts_with("ground antenna gain"))
        .unwrap();
    assert!(gain.contains("aperture efficiency"), "{gain}");
    let symbol = table
        .lines()
        .find(|l| l.starts_with("symbol rate"))
        .unwrap();
    assert!(symbol.contains("information bits per symbol"), "{symbol}");
}

/// The source of an item of `budget --format json` (its `items` list).
fn item_source(b: &serde_json::Value, name: &str) -> String {
    b["items"]
        .as_array()
        .unwrap()
        .iter()
        .find(|i| i["name"] == name)
        .unwrap_or_else(|| panic!("no item {name}"))["source"]
        .as_str()
        .unwrap()
        .to_string()
}

/// The noise items name the pattern and table the station actually gives: the reference
/// pattern (S.465-6 envelope) by default, the station's `antenna.noise_pattern`, or its measured
/// `antenna.measured_noise_temperature_k`.
#[test]
fn budget_noise_sources_name_what_was_used() {
    let run_with = |set: &[&str]| {
        let mut more = vec!["--format", "json"];
        for s in set {
            more.extend(["--set", s]);
        }
        json(&budget(EXAMPLE, "Nordkam", "20", &more))
    };
    let reference = run_with(&[]);
    for name in ["sky_noise", "ground_noise"] {
        let s = item_source(&reference, name);
        assert!(s.contains("S.465-6"), "{name}: {s}");
    }
    let pattern_set =
        "station.Nordkam.antenna.noise_pattern=[[0, 47], [1, 20], [10, 0], [90, -10], [180, -10]]";
    let pattern = run_with(&[pattern_set]);
    for name in ["sky_noise", "ground_noise"] {
        let s = item_source(&pattern, name);
        assert!(
            s.contains("antenna.noise_pattern") && !s.contains("S.465"),
            "{name}: {s}"
        );
    }
    let measured =
        run_with(&["station.Nordkam.antenna.measured_noise_temperature_k=[[0, 90], [90, 20]]"]);
    for name in ["sky_noise", "ground_noise"] {
        let s = item_source(&measured, name);
        assert!(
            s.contains("antenna.measured_noise_temperature_k"),
            "{name}: {s}"
        );
    }
    // The Sun and the Moon (evaluated with a time) go through the pattern actually used.
    let at = |set: &[&str]| {
        let mut args = vec!["budget", EXAMPLE, "--station", "Nordkam"];
        args.extend(["--at", "2026-12-01T20:28:19Z"]);
        for s in set {
            args.extend(["--set", s]);
        }
        args.extend(["--format", "json"]);
        json(&run(&args))
    };
    for (set, want) in [
        (vec![], "S.465-6"),
        (vec![pattern_set], "antenna.noise_pattern"),
    ] {
        let b = at(&set);
        for name in ["sun_noise", "moon_noise"] {
            let s = item_source(&b, name);
            assert!(s.contains(want), "{name}: {s}");
        }
    }
}

/// Without a time (`--elevation-deg`) the Sun and the Moon are not evaluated: the table says so
/// instead of printing 0 K, the JSON gives null (as for their separations) and the CSV an empty
/// value; the antenna temperature's source says they are left out. With `--at` they are numbers.
#[test]
fn budget_without_a_time_does_not_evaluate_the_sun_and_moon() {
    let table = crate::common::bin::success(&budget(EXAMPLE, "Nordkam", "30", &[]));
    for name in ["sun noise", "moon noise"] {
        let l = table.lines().find(|l| l.starts_with(name)).unwrap();
        assert!(
            l.contains("not evaluated: no time given (--at)") && !l.contains("0.00"),
            "{l}"
        );
    }
    let ta = table
        .lines()
        .find(|l| l.starts_with("antenna temperature"))
        .unwrap();
    assert!(ta.contains("Sun and Moon not evaluated"), "{ta}");
    let b = json(&budget(EXAMPLE, "Nordkam", "30", &["--format", "json"]));
    for k in [
        "sun_noise_k",
        "moon_noise_k",
        "sun_separation_deg",
        "moon_separation_deg",
    ] {
        assert!(b[k].is_null(), "{k}: {}", b[k]);
    }
    let item = |b: &serde_json::Value, n: &str| {
        b["items"]
            .as_array()
            .unwrap()
            .iter()
            .find(|i| i["name"] == n)
            .unwrap()
            .clone()
    };
    assert!(item(&b, "sun_noise")["value"].is_null());
    assert!(item(&b, "moon_noise")["value"].is_null());
    let csv = crate::common::bin::success(&budget(EXAMPLE, "Nordkam", "30", &["--format", "csv"]));
    let sun = csv.lines().find(|l| l.starts_with("sun_noise,")).unwrap();
    assert!(sun.starts_with("sun_noise,,K,"), "{sun}");
    // With a time both are numbers (here the satellite's position in the example's window).
    let at = json(&run(&[
        "budget",
        EXAMPLE,
        "--station",
        "Sierra Baja",
        "--at",
        "2026-12-02T08:51:00Z",
        "--format",
        "json",
    ]));
    assert!(at["sun_noise_k"].as_f64().is_some() && at["moon_noise_k"].as_f64().is_some());
    assert!(item(&at, "sun_noise")["value"].as_f64().is_some());
    // a field and its item give one figure (deg to 4 decimals both: the field had 3)
    for (field, name) in [
        ("sun_separation_deg", "sun_separation"),
        ("moon_separation_deg", "moon_separation"),
    ] {
        assert_eq!(at[field], item(&at, name)["value"], "{field}");
    }
}

/// The galactic background's extrapolation above 1 GHz (ITU-R P.372's galactic curve is stated
/// to 1 GHz) is warned by one rule in `plan` and `budget` alike: where the continued term is 1 K or
/// more (1700 MHz: 290 x 10^5.2 x 1700^-2.3 = 1.7 K, first principles from the curve's
/// Fa = 52 - 23 log10 f_MHz), and in neither at 8212.5 MHz (0.05 K, stated in the README).
#[test]
fn galactic_extrapolation_is_warned_alike_by_plan_and_budget() {
    let galactic = |args: &[&str]| {
        let o = run(args);
        assert!(o.status.success(), "{}", String::from_utf8_lossy(&o.stderr));
        String::from_utf8_lossy(&o.stderr)
            .lines()
            .filter(|l| l.starts_with("warning") && l.contains("galactic"))
            .count()
    };
    let budget = |more: &[&str]| {
        let mut args = vec![
            "budget",
            EXAMPLE,
            "--station",
            "Nordkam",
            "--elevation-deg",
            "20",
        ];
        args.extend(more);
        galactic(&args)
    };
    let l_band = "transmitter.frequency_mhz=1700";
    let budget_l = budget(&["--set", l_band]);
    let plan_l = galactic(&["plan", EXAMPLE, "--set", l_band]);
    assert_eq!(budget_l, 1);
    assert!(plan_l >= 1, "plan does not warn where budget does");
    let budget_x = budget(&[]);
    let plan_x = galactic(&["plan", EXAMPLE]);
    assert_eq!((budget_x, plan_x), (0, 0));
}

/// `budget --azimuth-deg` at Sierra Baja (its horizon_mask rises to 12 deg at 150 deg): the
/// azimuth is used as given (normalized to 0-360) without a note, and the terrain's noise follows
/// it; without it the budget names the azimuth it took (a note on stderr, `azimuth_deg` in the
/// JSON), and that azimuth's antenna temperature is the highest of a 10 deg sweep of given
/// azimuths (the rule: the worst azimuth whose terrain is not above the elevation; at 20 deg every
/// azimuth qualifies). First principles: warm terrain in the sidelobes adds noise, so the
/// direction toward the highest terrain is the worst.
#[test]
fn budget_azimuth_and_the_worst_azimuth_note_at_sierra_baja() {
    let at = |more: &[&str]| {
        let mut args = vec!["--format", "json"];
        args.extend(more);
        let o = budget(EXAMPLE, "Sierra Baja", "20", &args);
        let note = String::from_utf8_lossy(&o.stderr)
            .lines()
            .any(|l| l.contains("no azimuth given"));
        (json(&o), note)
    };
    let (worst, note) = at(&[]);
    assert!(
        note,
        "the worst-azimuth note is printed without --azimuth-deg"
    );
    let worst_az = worst["azimuth_deg"].as_f64().unwrap();
    let worst_ta = worst["antenna_temperature_k"].as_f64().unwrap();
    let table = crate::common::bin::success(&budget(EXAMPLE, "Sierra Baja", "20", &[]));
    assert!(
        table
            .lines()
            .next()
            .unwrap()
            .contains(&format!("azimuth {worst_az:.1} deg")),
        "{table}"
    );
    let mut highest = (f64::NEG_INFINITY, 0.0);
    for k in 0..36 {
        let az = format!("{}", 10 * k);
        let (b, note) = at(&["--azimuth-deg", &az]);
        assert!(!note, "no note with --azimuth-deg {az}");
        assert_eq!(b["azimuth_deg"].as_f64().unwrap(), (10 * k) as f64);
        let ta = b["antenna_temperature_k"].as_f64().unwrap();
        assert!(ta <= worst_ta + 2e-3, "azimuth {az}: {ta} K > {worst_ta} K");
        if ta > highest.0 {
            highest = (ta, (10 * k) as f64);
        }
    }
    // The sweep's highest is near the worst azimuth, toward the highest terrain (150 deg).
    assert!(
        (highest.1 - worst_az).abs() <= 10.0,
        "{highest:?} vs {worst_az}"
    );
    assert!((worst_az - 150.0).abs() <= 30.0, "{worst_az}");
    // A negative azimuth is taken modulo 360, and the open sky to the north is quieter.
    let (north, _) = at(&["--azimuth-deg", "-30"]);
    assert_eq!(north["azimuth_deg"].as_f64().unwrap(), 330.0);
    assert!(north["ground_noise_k"].as_f64().unwrap() < worst["ground_noise_k"].as_f64().unwrap());
    // An azimuth that rounds up to 360 is written as 0, the same direction (the convention is
    // [0, 360) deg): in the JSON and in the table's heading.
    let (just_below, _) = at(&["--azimuth-deg", "359.99996"]);
    assert_eq!(just_below["azimuth_deg"].as_f64().unwrap(), 0.0);
    let args = ["--azimuth-deg", "359.99996"];
    let table = crate::common::bin::success(&budget(EXAMPLE, "Sierra Baja", "20", &args));
    assert!(
        table.lines().next().unwrap().contains("azimuth 0.0 deg"),
        "{table}"
    );
}

/// The items (the table's and the CSV's lines, the JSON's `items`) carry the fields' own values,
/// signed as they enter C/N0: a loss field of the JSON (positive) is its item's value negated, at
/// the same rounding (4 decimals for dB, 3 for K), and no item carries more digits than the field
/// of its unit (the CSV gave 15-17 significant digits). A project-consistency check.
#[test]
fn budget_items_are_the_fields_signed_and_rounded_alike() {
    let b = json(&budget(EXAMPLE, "Nordkam", "10", &["--format", "json"]));
    let item = |name: &str| -> f64 {
        b["items"]
            .as_array()
            .unwrap()
            .iter()
            .find(|i| i["name"] == name)
            .and_then(|i| i["value"].as_f64())
            .unwrap_or_else(|| panic!("no item {name}"))
    };
    let field = |k: &str| b[k].as_f64().unwrap();
    assert_eq!(item("free_space_loss"), -field("free_space_loss_db"));
    assert_eq!(item("atmospheric_loss"), -field("atmospheric_loss_db"));
    assert_eq!(item("gas_loss"), -field("gas_db"));
    assert_eq!(item("eirp"), field("eirp_dbw"));
    assert_eq!(item("cn0"), field("cn0_dbhz"));
    assert_eq!(item("margin"), field("margin_db"));
    assert_eq!(item("system_temperature"), field("system_temperature_k"));
    for i in b["items"].as_array().unwrap() {
        let (Some(v), Some(unit)) = (i["value"].as_f64(), i["unit"].as_str()) else {
            continue;
        };
        let digits = match unit {
            "K" => 3,
            "Hz" | "bit/s" | "baud" => 1,
            "" => continue,
            _ => 4,
        };
        let scaled = v * 10f64.powi(digits);
        assert!((scaled - scaled.round()).abs() < 1e-6, "{i}");
    }
}

/// A budget along a line of sight below the station's terrain (stations/sierra-baja.yaml: 2 deg
/// at 0 deg azimuth, 12 deg at 150 deg) says the path is blocked; above it, nothing is said.
#[test]
fn a_budget_below_the_terrain_says_the_path_is_blocked() {
    let get = |elevation: &str, azimuth: Option<&str>| -> String {
        let mut more = vec!["--format", "json"];
        if let Some(a) = azimuth {
            more.extend(["--azimuth-deg", a]);
        }
        json(&budget(EXAMPLE, "Sierra Baja", elevation, &more))["warnings"].to_string()
    };
    let at_horizon = get("0", None);
    assert!(at_horizon.contains("the path is blocked"), "{at_horizon}");
    assert!(
        at_horizon.contains("terrain is above this elevation at every azimuth"),
        "{at_horizon}"
    );
    let facing_peak = get("5", Some("150"));
    assert!(
        facing_peak.contains("below the terrain of horizon_mask there (12.0 deg)"),
        "{facing_peak}"
    );
    for (e, a) in [("10", None), ("13", Some("150")), ("5", Some("0"))] {
        let w = get(e, a);
        assert!(!w.contains("blocked"), "{e} {a:?}: {w}");
    }
    // A station with a measured antenna temperature has no terrain noise (no azimuth to choose):
    // for an elevation alone its path is blocked only below the lowest terrain (1 deg at 180).
    let measured = |e: &str| -> String {
        let set = [
            "--set",
            "station.Sierra Baja.horizon_mask=[[0, 5], [180, 1]]",
            "--set",
            "station.Sierra Baja.antenna.measured_noise_temperature_k=[[0, 150], [90, 30]]",
            "--format",
            "json",
        ];
        json(&budget(EXAMPLE, "Sierra Baja", e, &set))["warnings"].to_string()
    };
    assert!(!measured("2.5").contains("blocked"));
    let low = measured("0.5");
    assert!(
        low.contains("azimuth 180.0 deg) is below the terrain"),
        "{low}"
    );
}

/// `budget` says when a plan would count nothing at its geometry: where the station's mount
/// cannot keep up (pass 6 over Sierra Baja crosses 86.5 deg near its az-el mount's keyhole; the
/// plan's series of that pass marks 22:11:45 to 22:11:55 untracked and counts 11 s lost), and
/// below the station's `min_elevation_deg`; neither where the plan counts the second. The budget
/// printed "the link closes" there without a word. `--azimuth-deg` with `--at` (ignored before)
/// is a usage error.
#[test]
fn budget_says_where_a_plan_counts_nothing() {
    let warnings = |o: Output| json(&o)["warnings"].to_string();
    let at = |t: &str| {
        let args = ["--station", "sierra-baja", "--at", t, "--format", "json"];
        warnings(run(&[&["budget", EXAMPLE][..], &args].concat()))
    };
    let keyhole = "mount cannot keep up";
    assert!(at("2026-12-01T22:11:47.072Z").contains(keyhole));
    assert!(!at("2026-12-01T22:10:30Z").contains(keyhole));
    let below = "below the station's min_elevation_deg (5 deg)";
    let el = |e: &str| warnings(budget(EXAMPLE, "nordkam", e, &["--format", "json"]));
    assert!(el("2").contains(below));
    assert!(!el("6").contains(below));
    // the mission's planning.mask_deg, which a plan applies to every station, rules over it
    let mask = |e: &str, deg: &str| {
        let set = format!("planning.mask_deg={deg}");
        warnings(budget(
            EXAMPLE,
            "nordkam",
            e,
            &["--set", &set, "--format", "json"],
        ))
    };
    assert!(mask("7", "10").contains("below the mission's planning.mask_deg (10 deg)"));
    assert!(!mask("4", "0").contains("a plan counts no second here"));
    let o = run(&[
        "budget",
        EXAMPLE,
        "--station",
        "nordkam",
        "--azimuth-deg",
        "10",
        "--at",
        "2026-12-01T20:28:19Z",
    ]);
    let err = String::from_utf8_lossy(&o.stderr);
    assert_eq!(o.status.code(), Some(2), "a usage error: {err}");
    assert!(err.contains("cannot be used with"), "{err}");
}

/// `budget --azimuth-deg` beyond a turn either way is refused (1e300 deg was taken and wrapped to
/// 0 deg, its digits lost); a value within it is taken modulo 360.
/// Basis: a behaviour check (no published reference applies).
#[test]
fn budget_azimuth_beyond_a_turn_is_refused() {
    let budget = |az: &str| {
        run(&[
            "budget",
            EXAMPLE,
            "--station",
            "nordkam",
            "--elevation-deg",
            "20",
            "--azimuth-deg",
            az,
            "--format",
            "json",
        ])
    };
    clean_error(
        &budget("1e300"),
        &["--azimuth-deg 1.000000e300", "-360 to 720 deg"],
    );
    clean_error(&budget("-400"), &["azimuth", "-400", "-360 to 720 deg"]);
    assert_eq!(json(&budget("-30"))["azimuth_deg"].as_f64(), Some(330.0));
}

/// `atmosphere --format csv` has the JSON's fields, in its order (but the warnings, the defaults
/// and the caution, which are the CSV's `#` lines and not columns): it lacked the polarization
/// tilt and the mean radiating temperature.
#[test]
fn atmosphere_csv_has_the_json_fields() {
    let args = [
        "atmosphere",
        "--station",
        "stations/nordkam.yaml",
        "--frequency-mhz",
        "8200",
        "--elevation-deg",
        "20",
        "--format",
    ];
    // the JSON's top-level keys in their printed order (pretty-printed: two spaces, a quote)
    let doc = crate::common::bin::success(&run(&[&args[..], &["json"]].concat()));
    let want: Vec<&str> = (doc.lines())
        .filter_map(|l| l.strip_prefix("  \""))
        .filter_map(|l| l.split_once('"').map(|(k, _)| k))
        .filter(|k| !matches!(*k, "warnings" | "defaults" | "caution"))
        .collect();
    let csv = crate::common::bin::success(&run(&[&args[..], &["csv"]].concat()));
    let header = csv.lines().find(|l| !l.starts_with('#')).unwrap();
    assert_eq!(header.split(',').collect::<Vec<_>>(), want);
}

/// The flag of a threshold recalled from memory sits on the threshold (`required_ebn0`), not on
/// the error rate it is for: the table read the error rate as the unconfirmed value.
///
/// Basis: a behaviour check of what the output says (no published reference applies).
#[test]
fn the_recalled_flag_sits_on_the_threshold() {
    let b = json(&budget(EXAMPLE, "Nordkam", "30", &["--format", "json"]));
    assert!(item_source(&b, "required_ebn0").contains("from memory"));
    assert!(!item_source(&b, "required_error_rate").contains("from memory"));
}

/// Without a time the Sun and the Moon are not evaluated, so their models' range is not warned of
/// (at 437.5 MHz the Moon's model, stated for 1-100 GHz in the code's lunar disk source (README "Models and sources"), was warned of in a budget that never placed it); with
/// `--at` it is.
///
/// Basis: a behaviour check of what the output says (no published reference applies).
#[test]
fn bodies_are_warned_of_only_where_they_are_evaluated() {
    let uhf = [
        "--set",
        "transmitter.frequency_mhz=437.5",
        "--set",
        "modem.max_bandwidth_hz=1e9",
        "--format",
        "json",
    ];
    let moon = |o: Output| json(&o)["warnings"].to_string().contains("Moon noise:");
    assert!(!moon(budget(EXAMPLE, "nordkam", "20", &uhf)));
    let at = [
        "budget",
        EXAMPLE,
        "--station",
        "nordkam",
        "--at",
        "2026-12-01T20:28:19Z",
    ];
    assert!(moon(run(&[&at[..], &uhf].concat())));
}

/// `atmosphere` gives one line for every model whose frequency range the frequency lies outside,
/// in the form `budget` and `plan` use (`series::frequency_range_line`) (it gave one line per model: four at 437.5 MHz).
///
/// Basis: a behaviour check of what the output says (no published reference applies).
#[test]
fn atmosphere_groups_its_frequency_range_lines() {
    let doc = atmosphere_json_mhz("stations/nordkam.yaml", "437.5", "20");
    let lines: Vec<&str> = (doc["warnings"].as_array().unwrap().iter())
        .filter_map(|w| w.as_str())
        .filter(|w| w.contains("frequency range") || w.contains("GHz)"))
        .collect();
    assert_eq!(lines.len(), 1, "{lines:?}");
    for model in ["gas", "rain", "cloud", "scintillation"] {
        assert!(lines[0].contains(model), "{model}: {}", lines[0]);
    }
}

/// `atmosphere --format json` at a frequency given in MHz.
fn atmosphere_json_mhz(
    station: &str,
    frequency_mhz: &str,
    elevation_deg: &str,
) -> serde_json::Value {
    json(&run(&[
        "atmosphere",
        "--station",
        station,
        "--frequency-mhz",
        frequency_mhz,
        "--elevation-deg",
        elevation_deg,
        "--format",
        "json",
    ]))
}

/// `atmosphere`'s heading gives a tiny elevation in exponent form, not 300 digits.
/// Basis: a behaviour check (no published reference applies).
#[test]
fn atmosphere_heading_keeps_tiny_numbers_short() {
    let o = run(&[
        "atmosphere",
        "--station",
        "stations/nordkam.yaml",
        "--frequency-ghz",
        "8.2",
        "--elevation-deg",
        "1e-300",
    ]);
    let out = String::from_utf8_lossy(&o.stdout).to_string();
    let heading = out.lines().next().unwrap_or_default();
    assert!(heading.contains("elevation 1.000000e-300 deg"), "{heading}");
    assert!(heading.len() < 120, "{heading}");
}

/// A mission of the example's stations and radio flying the element set `tle` (name first).
fn mission_with_elements(dir: &std::path::Path, tle: &str, name: &str) -> String {
    std::fs::write(dir.join("sat.tle"), tle).unwrap();
    let text = std::fs::read_to_string(root().join(EXAMPLE))
        .unwrap()
        .replace("select: \"99901\"", &format!("select: {name}"))
        .replace(
            "../stations/",
            &format!("{}/", root().join("stations").display()),
        );
    let path = dir.join("m.yaml");
    std::fs::write(&path, text).unwrap();
    path.to_string_lossy().into_owned()
}

/// `budget --elevation-deg` takes the range at the orbit's semi-major axis: on an eccentric orbit
/// it says how far the range and the free-space loss run from perigee to apogee at that elevation
/// (the invented 12 h, e = 0.72 orbit of the eccentric-TCA reference), on the near-circular
/// example it says nothing, and elements whose perigee lies inside the Earth are refused with
/// one line (before: a budget at a 170 km "altitude" of an orbit SGP4 cannot follow). Basis: a
/// behaviour check; the slant range itself is checked in `geometry::slant`'s tests.
#[test]
fn budget_at_an_elevation_says_what_the_semi_major_axis_hides() {
    let dir = tempfile::tempdir().unwrap();
    let reference =
        std::fs::read_to_string(root().join("tests/data/geometry/eccentric_tca_skyfield.csv"))
            .unwrap();
    let (l1, l2) = reference
        .lines()
        .nth(1)
        .unwrap()
        .trim_start_matches("# Invented MOLNIYA-DEMO (99904): ")
        .split_once(" / ")
        .unwrap();
    let m = mission_with_elements(
        dir.path(),
        &format!("MOLNIYA-DEMO\n{l1}\n{l2}\n"),
        "MOLNIYA-DEMO",
    );
    let o = json(&budget(&m, "Nordkam", "10", &["--format", "json"]));
    let w = o["warnings"].to_string();
    let range_km = o["range_km"].as_f64().unwrap();
    let at = w
        .find("eccentric orbit (e = 0.7200): at 10.00 deg elevation the range would be ")
        .expect(&w);
    let numbers: Vec<f64> = w[at..]
        .split(|c: char| !(c.is_ascii_digit() || c == '.' || c == '-' || c == '+'))
        .filter_map(|t| t.parse().ok())
        .collect();
    // e, elevation, perigee range, apogee range, loss from, loss to
    let (lo, hi, lo_db, hi_db) = (numbers[2], numbers[3], numbers[4], numbers[5]);
    assert!(lo < range_km && range_km < hi, "{lo} {range_km} {hi}");
    assert!((lo_db - 20.0 * (lo / range_km).log10()).abs() < 0.01, "{w}");
    assert!((hi_db - 20.0 * (hi / range_km).log10()).abs() < 0.01, "{w}");
    let example = json(&budget(EXAMPLE, "Nordkam", "10", &["--format", "json"]));
    assert!(!example["warnings"].to_string().contains("eccentric"));
    let decayed = "LOWSAT\n1 99950U          26335.50000000  .00001100  00000-0  11000-3 0  1007\n2 99950  97.4500 215.3000 1500000  80.0000  10.0000 16.50000000  1008\n";
    let m = mission_with_elements(dir.path(), decayed, "LOWSAT");
    clean_error(
        &budget(&m, "Nordkam", "10", &[]),
        &["perigee is 5540 km from the Earth's centre, not above both the Earth's equatorial radius"],
    );
    // A perigee above the Earth's equatorial radius but below a station 5 km up on the equator.
    let skim = "SKIMSAT\n1 99970U          26335.50000000  .00000000  00000-0  00000-0 0  1002\n2 99970  10.0000 215.3000 0247000  80.0000  10.0000 16.40000000  1002\n";
    let m = mission_with_elements(dir.path(), skim, "SKIMSAT");
    let peak = std::fs::read_to_string(root().join("stations/pulau-reka.yaml"))
        .unwrap()
        .replace("latitude_deg: 2.35", "latitude_deg: 0.0")
        .replace("altitude_m: 40", "altitude_m: 5000");
    let peak_path = dir.path().join("peak.yaml");
    std::fs::write(&peak_path, peak).unwrap();
    clean_error(
        &budget(&m, &peak_path.to_string_lossy(), "10", &[]),
        &["perigee is 6382 km", "and the station's radius (6383 km)"],
    );
}

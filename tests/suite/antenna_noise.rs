//! The antenna noise temperature integrated over the ground antenna's pattern
//! (`noise::pattern`, `noise::antenna_table`): the ITU-R S.465-6 envelope against its formula, the
//! integral's analytic limits, an independent brute-force integration, the table's interpolation
//! bound, and the station wiring (man-made noise, measured tables, the removed spillover key).
//!
//! No published worked example of a pattern-integrated antenna temperature with every input
//! stated (pattern, atmosphere, ground) was found; the integral is checked against its analytic
//! limits, against a brute-force integration over the local sky by a different route, and against
//! one manufacturer's measured curve (which shows the reference pattern to be optimistic).

use crate::common::fixtures::{atmosphere_path, atmosphere_site};
use crate::common::tolerance::*;
use passbudget::atmosphere::{PreparedAtmosphere, Weather};
use passbudget::noise::antenna_table::{AntennaNoiseTable, Brightness, GroundSpec};
use passbudget::noise::pattern::{s465_envelope_dbi, s465_psi_min_deg, NoisePattern};
use passbudget::noise::sky::sky_temperature_p618_k;

const C: f64 = 299_792_458.0;

/// A 3.7 m dish at 8.2 GHz, efficiency 0.6, 70 lambda/D (the invented fixture station).
fn dish(diameter_m: f64, frequency_hz: f64, efficiency: f64) -> NoisePattern {
    let dl = diameter_m * frequency_hz / C;
    let g = 10.0 * (efficiency * (std::f64::consts::PI * dl).powi(2)).log10();
    NoisePattern::reference(g, 70.0 / dl, dl, frequency_hz).unwrap()
}

/// The fixture site's clear-sky brightness at 8.2 GHz (P.618-14 eq. 69 over its own atmosphere).
fn fixture_sky(weather: Weather, ground: GroundSpec) -> Brightness {
    let atm = PreparedAtmosphere::new(&atmosphere_site(), &atmosphere_path(8.2)).unwrap();
    Brightness::new(
        |el| sky_temperature_p618_k(atm.at(el, weather).absorptive_db, 275.0, 2.73).unwrap(),
        ground,
    )
}

const GROUND: GroundSpec = GroundSpec {
    temperature_k: 290.0,
    emissivity: 0.9,
};

#[test]
fn s465_envelope_against_its_formula() {
    // ITU-R S.465-6 (01/2010) recommends 2: G = 32 - 25 log10(psi) dBi for psi_min <= psi < 48 deg,
    // -10 dBi for 48 <= psi <= 180 deg; worked by hand at the stated angles.
    for (psi, want) in [
        (1.0, 32.0),
        (10.0, 7.0),
        (20.0, 32.0 - 25.0 * 20f64.log10()), // -0.5257 dBi
        (47.999, 32.0 - 25.0 * 47.999f64.log10()),
        (48.0, -10.0),
        (120.0, -10.0),
        (180.0, -10.0),
    ] {
        assert!((s465_envelope_dbi(psi) - want).abs() < 1e-12, "psi {psi}");
    }
    // psi_min = max(1, 100 lambda/D) for D/lambda >= 50; max(2, 114 (D/lambda)^-1.09) below.
    assert_eq!(s465_psi_min_deg(1000.0), 1.0);
    assert_eq!(s465_psi_min_deg(100.0), 1.0);
    assert!((s465_psi_min_deg(50.0) - 2.0).abs() < 1e-12); // 100/50 = 2
    assert!((s465_psi_min_deg(40.0) - 114.0 * 40f64.powf(-1.09)).abs() < 1e-12); // 2.044 deg
    assert!((s465_psi_min_deg(20.0) - 4.3527).abs() < 1e-3);
    assert_eq!(s465_psi_min_deg(49.0).max(2.0), s465_psi_min_deg(49.0));
    // The normalized pattern: the main beam keeps the peak gain; beyond the join the envelope is
    // scaled by one factor k.
    let p = dish(3.7, 8.2e9, 0.6);
    let dl = 3.7 * 8.2e9 / C;
    let g0 = 10.0 * (0.6 * (std::f64::consts::PI * dl).powi(2)).log10();
    assert!((p.gain_dbi(0.0) - g0).abs() < 1e-9);
    let k_db = 10.0 * p.scale().log10();
    for psi in [5.0, 20.0, 60.0, 150.0] {
        assert!(psi > p.join_deg().unwrap());
        assert!((p.gain_dbi(psi) - (s465_envelope_dbi(psi) + k_db)).abs() < 1e-9);
    }
    // The envelope bounds the sidelobe peaks, so it is scaled down to fit 4 pi.
    assert!(p.scale() < 1.0 && p.scale() > 0.05, "k = {}", p.scale());
    // Gaussian main beam: 3 dB down at theta_3dB / 2 = 35 lambda/D (common practice).
    assert!((p.gain_dbi(35.0 / dl) - (g0 - 3.0103)).abs() < 1e-3);
}

#[test]
fn isotropic_surroundings_give_their_temperature() {
    // First principles: Ta = (1/4 pi) ∫ G T dOmega = T when T is the same everywhere and the
    // pattern integrates to 4 pi.
    for pattern in [
        dish(3.7, 8.2e9, 0.6),
        dish(13.0, 8.2e9, 0.65),
        dish(0.9, 2.2e9, 0.5),
        dish(1.2, 0.4375e9, 0.55),
    ] {
        for emissivity in [1.0, 0.0, 0.6] {
            let b = Brightness::uniform(
                150.0,
                GroundSpec {
                    temperature_k: 150.0,
                    emissivity,
                },
            );
            for el in [-90.0, -3.0, 0.0, 0.1, 7.0, 45.0, 90.0] {
                let t = AntennaNoiseTable::integrate_at(&pattern, &b, el).total_k();
                assert!((t / 150.0 - 1.0).abs() < NOISE_LIMIT_REL, "el {el}: {t}");
            }
        }
    }
}

/// A pencil beam: all the power within 0.2 deg of the axis (a measured table).
fn pencil() -> NoisePattern {
    NoisePattern::measured(&[[0.0, 60.0], [0.1, 57.0], [0.2, -200.0], [180.0, -200.0]]).unwrap()
}

#[test]
fn pencil_beam_sees_the_sky_along_its_axis() {
    let b = fixture_sky(Weather::ClearSky, GROUND);
    let atm = PreparedAtmosphere::new(&atmosphere_site(), &atmosphere_path(8.2)).unwrap();
    // At zenith: the zenith sky temperature, P.618-14 eq. (69).
    let zenith =
        sky_temperature_p618_k(atm.at(90.0, Weather::ClearSky).absorptive_db, 275.0, 2.73).unwrap();
    let a = AntennaNoiseTable::integrate_at(&pencil(), &b, 90.0);
    assert!(
        (a.sky_k / zenith - 1.0).abs() < 1e-6,
        "{} vs {zenith}",
        a.sky_k
    );
    assert!(a.ground_k < 1e-9);
    // Pointed straight down: the ground's brightness, e Tg + (1 - e) Tsky(zenith) (specular).
    let down = AntennaNoiseTable::integrate_at(&pencil(), &b, -90.0);
    let want = 0.9 * 290.0 + 0.1 * zenith;
    assert!((down.ground_k / want - 1.0).abs() < 1e-6 && down.sky_k < 1e-9);
    // At 30 deg the beam is far inside the sky: the boresight sky within the beam's spread.
    let t30 =
        sky_temperature_p618_k(atm.at(30.0, Weather::ClearSky).absorptive_db, 275.0, 2.73).unwrap();
    let a30 = AntennaNoiseTable::integrate_at(&pencil(), &b, 30.0);
    assert!((a30.sky_k - t30).abs() < 0.01, "{} vs {t30}", a30.sky_k);
}

/// Brute force over the local sky: a uniform grid in elevation and azimuth, the off-axis angle of
/// each direction from the dot product with the boresight (a different route from the rings).
fn brute_force(pattern: &NoisePattern, b: &Brightness, boresight_el_deg: f64) -> (f64, f64) {
    let (n_el, n_az) = (3600, 720);
    let e0 = boresight_el_deg.to_radians();
    let axis = [e0.cos(), 0.0, e0.sin()];
    let (mut sky, mut ground, mut norm) = (0.0, 0.0, 0.0);
    for i in 0..n_el {
        let el =
            -std::f64::consts::FRAC_PI_2 + (i as f64 + 0.5) * std::f64::consts::PI / n_el as f64;
        let (se, ce) = el.sin_cos();
        let d_omega =
            ce * (std::f64::consts::PI / n_el as f64) * (std::f64::consts::TAU / n_az as f64);
        let (t, is_ground) = b.at(se);
        for j in 0..n_az {
            let az = (j as f64 + 0.5) * std::f64::consts::TAU / n_az as f64;
            let dir = [ce * az.cos(), ce * az.sin(), se];
            let c = (dir[0] * axis[0] + dir[1] * axis[1] + dir[2] * axis[2]).clamp(-1.0, 1.0);
            let w = pattern.gain(c.acos()) * d_omega;
            norm += w;
            if is_ground {
                ground += w * t;
            } else {
                sky += w * t;
            }
        }
    }
    (sky / norm, ground / norm)
}

#[test]
fn ring_integral_agrees_with_a_brute_force_over_the_sky() {
    // A wide beam (1.2 m at 2.2 GHz, theta_3dB = 8 deg) so the 0.05 deg grid resolves it.
    let p = dish(1.2, 2.2e9, 0.55);
    let b = fixture_sky(Weather::ClearSky, GROUND);
    for el in [90.0, 30.0, 10.0, 3.0, 0.0] {
        let a = AntennaNoiseTable::integrate_at(&p, &b, el);
        let (s, g) = brute_force(&p, &b, el);
        assert!(
            (a.sky_k - s).abs() < NOISE_BRUTE_FORCE_K
                && (a.ground_k - g).abs() < NOISE_BRUTE_FORCE_K,
            "el {el}: rings {a:?}, brute force sky {s} ground {g}"
        );
    }
}

#[test]
fn table_interpolates_within_a_tenth_of_a_kelvin() {
    // Random elevations (fixed pseudo-random sequence), clear sky and the 0.1 % rain case, a
    // narrow (13 m at X band, 0.2 deg), a medium and a wide beam.
    let mut x = 0.123_456_789f64;
    let mut next = || {
        x = (x * 9301.0 + 0.211_327).fract();
        x
    };
    for pattern in [
        dish(13.0, 8.2e9, 0.65),
        dish(3.7, 8.2e9, 0.6),
        dish(1.2, 2.2e9, 0.55),
    ] {
        for weather in [Weather::ClearSky, Weather::Exceedance { percent: 0.1 }] {
            let b = fixture_sky(weather, GROUND);
            let table = AntennaNoiseTable::build(&pattern, &b);
            let mut worst = 0.0f64;
            let mut at = 0.0;
            for k in 0..400 {
                // half of the points within 3 deg of the horizon, where the table is steepest
                let el = if k % 2 == 0 {
                    -5.0 + 95.0 * next()
                } else {
                    -3.0 + 6.0 * next()
                };
                let direct = AntennaNoiseTable::integrate_at(&pattern, &b, el);
                let t = table.at(el);
                let d = (t.sky_k - direct.sky_k)
                    .abs()
                    .max((t.ground_k - direct.ground_k).abs());
                if d > worst {
                    worst = d;
                    at = el;
                }
            }
            assert!(
                worst < NOISE_TABLE_K,
                "{worst} K at {at} deg, {} rows",
                table.len()
            );
        }
    }
}

#[test]
fn antenna_temperature_rises_as_the_beam_nears_the_ground_and_in_rain() {
    let p = dish(3.7, 8.2e9, 0.6);
    let clear = AntennaNoiseTable::build(&p, &fixture_sky(Weather::ClearSky, GROUND));
    let rain = AntennaNoiseTable::build(
        &p,
        &fixture_sky(Weather::Exceedance { percent: 0.1 }, GROUND),
    );
    let mut prev = 0.0;
    for el in [90.0, 60.0, 30.0, 10.0, 5.0, 2.0, 1.0, 0.5, 0.0] {
        let t = clear.at(el).total_k();
        assert!(t > prev, "el {el}: {t} <= {prev}");
        prev = t;
        assert!(
            rain.at(el).sky_k > clear.at(el).sky_k + 10.0,
            "rain at el {el}"
        );
    }
    // With the beam at the horizon about half of the main beam sees the ground.
    let (h, z) = (clear.at(0.0), clear.at(90.0));
    let mb = p.main_beam_efficiency();
    assert!(
        h.ground_k - z.ground_k > 0.4 * mb * (0.9 * 290.0 - 200.0),
        "{h:?}"
    );
}

/// A small UHF station (invented) for the wiring checks.
const UHF_STATION: &str = "name: Test Uhf
latitude_deg: 45.5
longitude_deg: -120.3
altitude_m: 600
antenna:
  gain_dbi: 14
  polarization: rhcp
man_made_noise: rural
receiver:
  lna_noise_temperature_k: 100
climate:
  rain_rate_001_mm_h: 20
";

fn uhf_mission(frequency_mhz: f64) -> String {
    let elements = crate::common::bin::root().join("examples/sat.tle");
    format!(
        "name: uhf
satellite:
  elements: {}
stations: [station.yaml]
transmitter:
  frequency_mhz: {frequency_mhz}
  power_w: 1.0
  antenna:
    pattern: fixed
    gain_dbi: 0
    polarization: rhcp
modem:
  max_bandwidth_hz: 100000
  ladder:
    - {{ rate_bps: 9600, scheme: bpsk }}
",
        elements.to_string_lossy()
    )
}

fn uhf_budget(frequency_mhz: f64) -> passbudget::plan::instant::InstantBudget {
    use passbudget::plan::instant::{instant_budget, InstantGeometry, InstantRequest};
    let dir = tempfile::tempdir().unwrap();
    std::fs::write(dir.path().join("station.yaml"), UHF_STATION).unwrap();
    let path = dir.path().join("mission.yaml");
    std::fs::write(&path, uhf_mission(frequency_mhz)).unwrap();
    let mission = passbudget::config::mission::Mission::load(&path).unwrap();
    let req = InstantRequest {
        // named as `--station NAME` names it (case and punctuation set aside)
        station: "test-UHF".into(),
        geometry: InstantGeometry::Elevation(30.0),
        rate_bps: None,
        scheme: None,
        exceedance_percent: Some(1.0),
        allow_stale_elements: false,
    };
    instant_budget(&mission, &req).unwrap()
}

#[test]
fn man_made_noise_is_added_and_warned_outside_its_range() {
    // ITU-R P.372 Table 1, rural: Fam = 67.2 - 27.7 log10(f_MHz) dB above k T0 b,
    // Ta = 290 K 10^(Fam/10) (docs/REFERENCES.md §8). At 145.8 MHz: Fam = 7.264 dB, Ta = 1545 K.
    let b = uhf_budget(145.8);
    let want = 290.0 * 10f64.powf((67.2 - 27.7 * 145.8f64.log10()) / 10.0);
    assert!((want - 1545.0).abs() < 1.0);
    let v = &b.values;
    assert!(
        (v.man_made_noise_k - want).abs() < 1e-9,
        "{}",
        v.man_made_noise_k
    );
    let sum = v.sky_noise_k + v.ground_noise_k + v.man_made_noise_k;
    assert!((v.antenna_temperature_k - sum).abs() < 1e-9);
    assert!((v.system_temperature_k - sum - v.receiver_noise_k).abs() < 1e-9);
    assert!(b.items.iter().any(|i| i.name == "man_made_noise"));
    let man_made_warning = |b: &passbudget::plan::instant::InstantBudget| {
        b.warnings
            .iter()
            .any(|w| w.contains("man-made noise (ITU-R P.372 Table 1, 0.3-250 MHz)"))
    };
    assert!(!man_made_warning(&b));
    // Below 2 GHz the S.465-6 envelope is out of its range: said so.
    assert!(b.warnings.iter().any(|w| w.contains("S.465-6")));
    // 437.5 MHz is above the 250 MHz of the curves: extrapolated, with a warning.
    let b = uhf_budget(437.5);
    assert!(man_made_warning(&b), "{:?}", b.warnings);
}

#[test]
fn plan_warnings_carry_the_noise_model_ranges() {
    let dir = tempfile::tempdir().unwrap();
    let setup = crate::common::plan::write_and_load(dir.path(), UHF_STATION, &uhf_mission(437.5));
    let start = passbudget::timefmt::utc(2026, 12, 1, 12, 0, 0);
    let plan = setup.plan_between(start, passbudget::timefmt::add_seconds(&start, 3600.0));
    assert!(
        plan.warnings
            .iter()
            .any(|w| w.starts_with("Test Uhf: 437.5 MHz is outside")
                && w.contains("man-made noise (ITU-R P.372 Table 1, 0.3-250 MHz)")),
        "{:?}",
        plan.warnings
    );
}

#[test]
fn station_noise_keys_are_checked_with_their_line() {
    use passbudget::config::station::Station;
    let path = std::path::Path::new("station.yaml");
    // The removed key answers with the keys that replace it.
    let old = UHF_STATION.replace(
        "  polarization: rhcp\n",
        "  polarization: rhcp\n  spillover_fraction: 0.05\n",
    );
    let e = Station::from_yaml(path, &old).unwrap_err().to_string();
    assert!(e.starts_with("station.yaml:8:"), "{e}");
    assert!(e.contains("antenna.ground_emissivity"), "{e}");
    // Measured tables: rising first column, values within their range (config::limits).
    for (table, want) in [
        (
            "  measured_noise_temperature_k: [[10, 60], [5, 80]]\n",
            "measured_noise_temperature_k[1]",
        ),
        (
            "  measured_noise_temperature_k: [[0, 60], [90, 6000]]\n",
            "temperature 6000 is out of range",
        ),
        (
            "  noise_pattern: [[0, 14], [90, -10]]\n",
            "the last at 180 deg",
        ),
        ("  ground_emissivity: 1.5\n", "1.5 is out of range (0 to 1)"),
    ] {
        let text = UHF_STATION.replace(
            "  polarization: rhcp\n",
            &format!("  polarization: rhcp\n{table}"),
        );
        let e = Station::from_yaml(path, &text).unwrap_err().to_string();
        assert!(e.starts_with("station.yaml:8:"), "{e}");
        assert!(e.contains(want), "{e}");
    }
    // A measured pattern and table are accepted and reach the budget.
    let text = UHF_STATION.replace(
        "  polarization: rhcp\n",
        "  polarization: rhcp\n  noise_pattern: [[0, 14], [30, 11], [60, 0], [90, -10], [180, -15]]\n  measured_noise_temperature_k: [[0, 300], [10, 150], [90, 60]]\n",
    );
    let s = Station::from_yaml(path, &text).unwrap();
    let a = s.antenna.unwrap();
    assert_eq!(a.noise_pattern.unwrap().len(), 5);
    assert_eq!(a.measured_noise_temperature_k.unwrap()[1], [10.0, 150.0]);
}

#[test]
fn measured_antenna_temperature_takes_the_weather_excess_of_the_model() {
    use passbudget::plan::instant::{instant_budget, InstantGeometry, InstantRequest};
    // X band, so the rain case has a clear excess; the measured clear-sky table (invented) is
    // linear between its points: at 30 deg, 150 + (60 - 150) (30 - 10) / 80 = 127.5 K.
    let station = UHF_STATION
        .replace("  gain_dbi: 14\n", "  diameter_m: 3.7\n")
        .replace(
            "  polarization: rhcp\n",
            "  polarization: rhcp\n  measured_noise_temperature_k: [[0, 300], [10, 150], [90, 60]]\n",
        )
        .replace("man_made_noise: rural\n", "");
    let dir = tempfile::tempdir().unwrap();
    std::fs::write(dir.path().join("station.yaml"), &station).unwrap();
    let path = dir.path().join("mission.yaml");
    std::fs::write(
        &path,
        uhf_mission(8212.5).replace("max_bandwidth_hz: 100000", "max_bandwidth_hz: 1.0e6"),
    )
    .unwrap();
    let mission = passbudget::config::mission::Mission::load(&path).unwrap();
    let at = |exceedance_percent| {
        let req = InstantRequest {
            station: "Test Uhf".into(),
            geometry: InstantGeometry::Elevation(30.0),
            rate_bps: None,
            scheme: None,
            exceedance_percent,
            allow_stale_elements: false,
        };
        instant_budget(&mission, &req).unwrap().values
    };
    let clear = at(None);
    assert!((clear.antenna_temperature_k - 127.5).abs() < 1e-9);
    assert!(clear.ground_noise_k > 0.0 && clear.sky_noise_k > clear.ground_noise_k);
    // The rain case adds the model's excess: the sky term rises, the total with it.
    let rain = at(Some(0.01));
    assert!(rain.sky_noise_k > clear.sky_noise_k + 20.0, "{rain:?}");
    assert!(rain.antenna_temperature_k > 127.5 + 20.0);
}

/// The published C-band curves of tests/data/noise/c_band_antenna_temperature.csv (satsig.net,
/// "Satellite antenna noise temperature and elevation angle": a manufacturer's 10 m, 18 m and 6 m
/// antennas, before the feed's own few kelvin). The reference pattern (S.465-6 envelope scaled to
/// 4 pi, ground emissivity 0.9) over a P.835 mean atmosphere at 4 GHz with an aperture
/// efficiency of 0.6 (assumed: the page gives none) comes out LOWER at every tabulated elevation
/// of every curve: a real reflector's spillover and blockage put more power on the ground than the
/// scaled envelope does, and the 18 m curve's flat 25 K at 30-40 deg is more than sky and sidelobes
/// give. This test records that known optimism (README, "Noise temperature"): the model must stay
/// below each curve and within the offsets measured here; a station that knows its antenna gives
/// `antenna.measured_noise_temperature_k`.
#[test]
fn reference_pattern_against_published_c_band_curves() {
    let site = passbudget::atmosphere::AtmosphereSite {
        latitude_deg: 40.0,
        altitude_km: 0.1,
        pressure_hpa: 1013.25,
        temperature_k: 288.15,
        water_vapour_density_g_m3: 7.5,
        rain_rate_001_mm_h: 0.0,
        rain_height_km: Some(3.0),
        cloud_liquid_clear_kg_m2: None,
        cloud_liquid_exceedance_kg_m2: None,
        wet_refractivity: None,
    };
    let text = std::fs::read_to_string(
        crate::common::bin::root().join("tests/data/noise/c_band_antenna_temperature.csv"),
    )
    .unwrap();
    let rows: Vec<[f64; 3]> = text
        .lines()
        .filter(|l| !l.starts_with('#') && !l.starts_with("diameter_m"))
        .map(|l| {
            let v: Vec<f64> = l.split(',').map(|x| x.trim().parse().unwrap()).collect();
            [v[0], v[1], v[2]]
        })
        .collect();
    assert_eq!(rows.len(), 14);
    let mut report = String::new();
    for diameter_m in [10.0, 18.0, 6.0] {
        let mut path = atmosphere_path(4.0);
        path.antenna_diameter_m = diameter_m;
        path.antenna_efficiency = 0.6;
        let atm = PreparedAtmosphere::new(&site, &path).unwrap();
        // Tmr = 37.34 + 0.81 x 288.15 K (P.618-14 eq. 70)
        let b = Brightness::new(
            |el| {
                sky_temperature_p618_k(atm.at(el, Weather::ClearSky).absorptive_db, 270.74, 2.73)
                    .unwrap()
            },
            GROUND,
        );
        let table = AntennaNoiseTable::build(&dish(diameter_m, 4.0e9, 0.6), &b);
        for [_, el, t_pub] in rows.iter().filter(|r| r[0] == diameter_m) {
            let ours = table.at(*el).total_k();
            report.push_str(&format!(
                "{diameter_m} m {el} deg: model {ours:.1} K, published {t_pub} K, short {:.1} K\n",
                t_pub - ours
            ));
            let (lo, hi) = C_BAND_SHORTFALL_K;
            assert!(
                t_pub - ours > lo && t_pub - ours < hi,
                "{diameter_m} m, {el} deg: model {ours:.1} K, published {t_pub} K"
            );
        }
    }
    eprint!("{report}");
}

/// How far below the published C-band curves the model lies, K: measured 2.8 to 15.6 K (10 m:
/// 11.3, 13.0, 11.8, 9.3, 4.6, 2.8 K at 5-40 deg; 18 m: 10.0, 13.6, 14.7, 13.1, 14.2 K; 6 m:
/// 15.6, 14.1, 10.7 K), with a margin of about 0.5 K for a change of quadrature.
const C_BAND_SHORTFALL_K: (f64, f64) = (2.3, 16.1);

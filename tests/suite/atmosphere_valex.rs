//! Atmosphere models against the ITU-R SG3 validation examples and other published values.
//! Each check names its source; the data files in tests/data/atmosphere/ open with theirs.

use crate::common::data::read_csv_numbers;
use crate::common::tolerance::*;
use passbudget::atmosphere::{
    cloud, combine, gas, mean_radiating_temperature_k, rain_height, rain_specific, AtmosphereSite,
    PathSpec, PreparedAtmosphere, Weather,
};
use std::collections::HashMap;

fn load(name: &str) -> Vec<HashMap<String, f64>> {
    read_csv_numbers(&format!("atmosphere/{name}"))
}

fn assert_rel(got: f64, want: f64, rel: f64, what: &str) {
    assert!(
        atmo_rel_close(got, want, rel),
        "{what}: got {got:.12}, want {want:.12} (rel err {:.3e}, tol {rel:e})",
        (got - want).abs() / want.abs()
    );
}

/// A site whose only relevant parts are set by the caller; the rest are plausible values.
fn site() -> AtmosphereSite {
    AtmosphereSite {
        latitude_deg: 0.0,
        altitude_km: 0.0,
        pressure_hpa: 1013.25,
        temperature_k: 288.15,
        water_vapour_density_g_m3: 7.5,
        rain_rate_001_mm_h: 0.0,
        rain_height_km: Some(3.0),
        cloud_liquid_clear_kg_m2: None,
        cloud_liquid_exceedance_kg_m2: None,
        wet_refractivity: None,
    }
}

fn path(f: f64) -> PathSpec {
    PathSpec {
        frequency_ghz: f,
        polarization_tilt_deg: 45.0,
        antenna_diameter_m: 1.0,
        antenna_efficiency: 0.65,
    }
}

// ITU-R P.676-12 Annex 1 γo, γw: ValEx "SpAtt" rows (ITU-Rpy ITURP676-12_gamma.csv).
#[test]
fn p676_specific_attenuation_matches_valex() {
    for r in load("p676_12_gamma_valex.csv") {
        let (go, gw) = gas::specific_attenuation_p676(r["f"], r["P"], r["rho"], r["T"]);
        // The file prints γ to 9 decimal places (the 1 GHz γw as 5.09E-05).
        let abs_w = if r["f"] == 1.0 {
            5e-8
        } else {
            ATMO_VALEX_GAMMA_ABS_DB_KM
        };
        for (got, want, abs, what) in [
            (go, r["gamma0"], ATMO_VALEX_GAMMA_ABS_DB_KM, "γo"),
            (gw, r["gammaw"], abs_w, "γw"),
        ] {
            assert!(
                (got - want).abs() <= abs.max(ATMO_VALEX_REL * want),
                "{what} at {} GHz: got {got:.12}, want {want}",
                r["f"]
            );
        }
    }
}

// ITU-R P.676-12 Annex 2 slant path with the V_t form of §2.3: ValEx A_gas rows
// (ITU-Rpy ITURP676-12_A_gas.csv): A = (γo·ho + A_w(V_t))/sin θ.
#[test]
fn p676_slant_path_vt_form_matches_valex() {
    for r in load("p676_12_slant_valex.csv") {
        let (f, p, rho, t) = (r["f"], r["P"], r["rho"], r["T"]);
        let (go, _) = gas::specific_attenuation_p676(f, p, rho, t);
        let (ho, _) = gas::equivalent_heights_p676_12(f, p, rho, t);
        let aw = gas::zenith_water_vapour_attenuation_from_vt_db(f, r["V_t"], r["h"]);
        let a = (go * ho + aw) / r["el"].to_radians().sin();
        assert_rel(a, r["A_gas"], ATMO_VALEX_REL, &format!("A_gas {r:?}"));
    }
}

// The same ValEx rows through the public PreparedAtmosphere with the V_t option
// (site pressure = total pressure P + e, so that the dry pressure is the file's P).
#[test]
fn prepared_gas_with_vt_matches_valex() {
    for r in load("p676_12_slant_valex.csv") {
        let e = gas::water_vapour_pressure_hpa(r["rho"], r["T"]);
        let s = AtmosphereSite {
            altitude_km: r["h"],
            pressure_hpa: r["P"] + e,
            temperature_k: r["T"],
            water_vapour_density_g_m3: r["rho"],
            ..site()
        };
        let prep = PreparedAtmosphere::new(&s, &path(r["f"]))
            .unwrap()
            .with_integrated_water_vapour(r["V_t"])
            .unwrap();
        let a = prep.at(r["el"], Weather::ClearSky);
        assert_rel(
            a.gas_db,
            r["A_gas"],
            ATMO_VALEX_REL,
            &format!("A_gas {r:?}"),
        );
        assert_eq!(a.total_db, a.gas_db);
    }
}

// ITU-R P.838-3: ValEx rows (ITU-Rpy ITURP838-3_rain_specific_attenuation.csv).
#[test]
fn p838_matches_valex() {
    for r in load("p838_3_valex.csv") {
        let c = rain_specific::RainCoefficients::p838_3(r["f"]);
        let (k, alpha) = c.for_path(r["el"], r["tau"]);
        assert_rel(k, r["k"], ATMO_P838_REL, "k");
        assert_rel(alpha, r["alpha"], ATMO_P838_REL, "alpha");
        let g = rain_specific::specific_attenuation_db_km(k, alpha, r["R"]);
        assert_rel(g, r["gamma_r"], ATMO_VALEX_REL, "gamma_r");
    }
}

// Horizontal-path coefficients from the P.838-3 fit (docs/REFERENCES.md §3 [COMP], agreeing with
// P.838-3 Table 5 from memory): f, kH, αH, kV, αV.
#[test]
fn p838_horizontal_coefficients() {
    let table = [
        (2.2, 1.0535e-4, 1.0854, 1.1821e-4, 0.9725),
        (8.2, 0.004697, 1.3742, 0.003997, 1.3611),
        (12.0, 0.02386, 1.1825, 0.02455, 1.1216),
        (20.0, 0.09164, 1.0568, 0.09611, 0.9847),
        (30.0, 0.2403, 0.9485, 0.2291, 0.9129),
    ];
    for (f, kh, ah, kv, av) in table {
        let c = rain_specific::RainCoefficients::p838_3(f);
        assert_rel(c.k_h, kh, ATMO_TABLE5_REL, &format!("kH {f}"));
        assert_rel(c.alpha_h, ah, ATMO_TABLE5_REL, &format!("αH {f}"));
        assert_rel(c.k_v, kv, ATMO_TABLE5_REL, &format!("kV {f}"));
        assert_rel(c.alpha_v, av, ATMO_TABLE5_REL, &format!("αV {f}"));
        // Circular polarization on a horizontal path is the mean of H and V (eq (4), τ = 45°).
        let (k45, _) = c.for_path(0.0, 45.0);
        assert!((k45 - (kh + kv) / 2.0).abs() <= ATMO_TABLE5_REL * k45);
    }
}

// ITU-R P.618-13/-14 §2.2.1.1: ValEx rain rows (ITU-Rpy ITURP618-13_A_rain.csv), all
// 16 site/frequency cases at 1, 0.1, 0.01, 0.001 %, through the public PreparedAtmosphere
// with hR = hs + Ls·sin θ.
#[test]
fn p618_rain_matches_valex_through_prepared_atmosphere() {
    let rows = load("p618_rain_valex.csv");
    assert_eq!(rows.len(), 64);
    for r in rows {
        let el = r["el"];
        let s = AtmosphereSite {
            latitude_deg: r["lat"],
            altitude_km: r["hs"],
            rain_rate_001_mm_h: r["R001"],
            rain_height_km: Some(r["hs"] + r["Ls"] * el.to_radians().sin()),
            ..site()
        };
        let p = PathSpec {
            polarization_tilt_deg: r["tau"],
            ..path(r["f"])
        };
        let prep = PreparedAtmosphere::new(&s, &p).unwrap();
        let a = prep.at(el, Weather::exceedance(r["p"]).unwrap());
        assert_rel(
            a.rain_db,
            r["A_rain"],
            ATMO_VALEX_REL,
            &format!("A_rain {r:?}"),
        );
        assert!(!a.warnings.rain_height_defaulted);
    }
}

// ITU-R P.618-13 §2.4.1: ValEx scintillation rows (ITU-Rpy ITURP618-13_A_sci.csv).
#[test]
fn p618_scintillation_matches_valex() {
    let rows = load("p618_scintillation_valex.csv");
    assert_eq!(rows.len(), 64);
    for r in rows {
        let s = AtmosphereSite {
            wet_refractivity: Some(r["N_wet"]),
            ..site()
        };
        let p = PathSpec {
            antenna_diameter_m: r["D"],
            antenna_efficiency: r["eta"],
            ..path(r["f"])
        };
        let prep = PreparedAtmosphere::new(&s, &p).unwrap();
        let a = prep.at(r["el"], Weather::exceedance(r["p"]).unwrap());
        assert_rel(
            a.scintillation_db,
            r["A_scin"],
            ATMO_VALEX_REL,
            &format!("A_scin {r:?}"),
        );
    }
}

// ITU-R P.618 §2.5 eq (65) (same form in -13 for p ≤ 5 %): ValEx total rows
// (ITU-Rpy ITURP618-13_A_total.csv, docs/REFERENCES.md §4c) given AG, AC, AR, AS.
#[test]
fn p618_combination_matches_valex() {
    let cases = [
        // p, AG, AC, AR, AS, AT
        (
            0.1,
            0.226874038,
            0.455169824,
            2.185843298,
            0.422845379,
            2.901523272,
        ),
        (
            1.0,
            0.226874038,
            0.455169824,
            0.495316047,
            0.261931889,
            1.212790721,
        ),
        (
            0.01,
            1.627537069,
            2.109942403,
            59.62591066,
            2.214953485,
            63.40311131,
        ),
    ];
    for (p, ag, ac, ar, as_, at) in cases {
        let got = combine::total_attenuation_p618_14_db(p, ag, ac, ar, as_);
        assert_rel(got, at, ATMO_VALEX_REL, &format!("AT at {p} %"));
    }
    // P.618-14 eq (66): above 5 % rain no longer enters.
    let got = combine::total_attenuation_p618_14_db(10.0, 0.2, 0.3, 5.0, 0.4);
    assert!((got - (0.2 + 0.5)).abs() < 1e-12);
}

// ITU-R P.840-9: K_L derived from ValEx Rev8.3.0 (L, A) pairs (docs/REFERENCES.md §7 [C-repro]) and
// the pairs themselves (ITU-Rpy ITU_validation_test.py, ITUR840_9TestCase).
#[test]
fn p840_9_matches_valex() {
    for (f, kl) in [
        (6.0, 0.0311277819),
        (15.0, 0.1901133491),
        (30.0, 0.7078539584),
    ] {
        assert_rel(
            cloud::mass_absorption_coefficient_p840_9(f),
            kl,
            ATMO_CLOUD_KL_REL,
            &format!("K_L {f}"),
        );
    }
    let pairs = [
        (0.82359246235649, 15.0, 6.0, 0.09905224128740467),
        (0.618180437395432, 45.0, 15.0, 0.16620453432852675),
        (0.152463592389544, 75.0, 30.0, 0.1117290318216181),
    ];
    for (l, el, f, a) in pairs {
        let s = AtmosphereSite {
            cloud_liquid_clear_kg_m2: Some(l),
            ..site()
        };
        let prep = PreparedAtmosphere::new(&s, &path(f)).unwrap();
        let got = prep.at(el, Weather::ClearSky).cloud_db;
        assert_rel(got, a, ATMO_CLOUD_KL_REL, &format!("A_cloud {f} GHz"));
    }
}

// Double-Debye Kl at 273.15 K (P.840-6..-8 form): docs/REFERENCES.md §7 values computed by the
// reference compiler from the same formula [COMP] — a check of our copy of the formula,
// printed to 6 significant digits.
#[test]
fn p840_double_debye_kl() {
    for (f, kl) in [
        (10.0, 0.092550),
        (20.0, 0.359272),
        (30.0, 0.770834),
        (50.0, 1.870778),
    ] {
        assert_rel(
            cloud::kl_double_debye(f, 273.15),
            kl,
            1e-5,
            &format!("Kl {f}"),
        );
    }
}

// P.839-2 latitude rule: its own breakpoints (docs/REFERENCES.md §5; rule as written there).
#[test]
fn p839_2_latitude_rule_values() {
    let cases = [
        (0.0, 5.0),
        (23.0, 5.0),
        (-21.0, 5.0),
        (51.5, 5.0 - 0.075 * 28.5),
        (-30.0, 5.0 + 0.1 * (-9.0)),
        (-71.0, 0.0),
        (-80.0, 0.0),
    ];
    for (lat, h) in cases {
        let got = rain_height::rain_height_p839_2_km(lat);
        assert!(
            (got - h).abs() <= ATMO_EXACT_REL * h.max(1.0),
            "lat {lat}: {got} vs {h}"
        );
    }
    // The rule is clipped at 0 km toward the pole.
    assert_eq!(rain_height::rain_height_p839_2_km(90.0), 0.0);
}

// P.618-14 eq (70): Tmr = 37.34 + 0.81 Ts (docs/REFERENCES.md §4d: Ts = 288.15 K → 270.7415 K).
#[test]
fn mean_radiating_temperature_eq70() {
    assert_rel(
        mean_radiating_temperature_k(288.15),
        270.7415,
        ATMO_EXACT_REL,
        "Tmr",
    );
}

// P.618-14 §2.2.1.1 step-level values for the first ValEx row (51.5° N, 14.25 GHz, 0.01 %),
// docs/REFERENCES.md §4a [COMP]: intermediate values computed there while reproducing the ValEx
// final value, printed to 6-7 significant digits.
#[test]
fn p618_rain_intermediate_steps_first_valex_row() {
    use passbudget::atmosphere::rain;
    let el: f64 = 31.07699124;
    let hs = 0.031382984;
    let hr = hs + 4.690817392 * el.to_radians().sin();
    assert_rel(hr, 2.452733, 1e-6, "hR");
    let c = rain_specific::RainCoefficients::p838_3(14.25);
    let (k, alpha) = c.for_path(el, 0.0);
    let r = rain::attenuation_001_p618(
        &rain::RainPath {
            rain_height_km: hr,
            station_height_km: hs,
            elevation_deg: el,
            latitude_deg: 51.5,
            frequency_ghz: 14.25,
        },
        k,
        alpha,
        26.48052,
    );
    assert_rel(
        r.slant_length_km * el.to_radians().cos(),
        4.017565,
        1e-6,
        "LG",
    );
    assert_rel(r.specific_attenuation_db_km, 1.581308, 1e-6, "γR");
    assert_rel(r.horizontal_reduction, 0.876478, 1e-6, "r0.01");
    assert_rel(r.vertical_adjustment, 1.045634, 1e-6, "v0.01");
    assert_rel(r.effective_path_km, 4.299017, 1e-6, "LE");
    assert_rel(r.attenuation_001_db, 6.798072267, ATMO_VALEX_REL, "A0.01");
}

// P.676-12 Annex 2 ρ form (the library default) against itur 0.4.0 values stored with the
// exact calls in the data file.
#[test]
fn p676_slant_path_rho_form_matches_itur_library() {
    for r in load("p676_12_slant_rho_itur.csv") {
        let (f, p, rho, t) = (r["f"], r["P"], r["rho"], r["T"]);
        let (ho, hw) = gas::equivalent_heights_p676_12(f, p, rho, t);
        assert_rel(ho, r["h0"], ATMO_LIBRARY_REL, &format!("ho {r:?}"));
        assert_rel(hw, r["hw"], ATMO_LIBRARY_REL, &format!("hw {r:?}"));
        let e = gas::water_vapour_pressure_hpa(rho, t);
        let s = AtmosphereSite {
            pressure_hpa: p + e,
            temperature_k: t,
            water_vapour_density_g_m3: rho,
            ..site()
        };
        let a = PreparedAtmosphere::new(&s, &path(f))
            .unwrap()
            .at(r["el"], Weather::ClearSky);
        assert_rel(
            a.gas_db,
            r["A_gas"],
            ATMO_LIBRARY_REL,
            &format!("A_gas {r:?}"),
        );
    }
}

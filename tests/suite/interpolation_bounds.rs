//! The two approximations of a plan's step against the direct computation they replace, with the
//! bounds the README states ("Accuracy and assumptions"):
//! * the orbit between SGP4 knots (`orbit::spline`, a cubic through four knots, position and velocity each on its own, knots at most `KNOT_SPACING_S` apart): position within
//!   1 m and velocity within 1 mm/s of direct SGP4, every second, for near-Earth element sets of
//!   the published SGP4 verification set (Vallado, Crawford, Hujsak, Kelso, AIAA 2006-6753,
//!   SGP4-VER.TLE: 00005, e = 0.19, and 06251, high drag) and the shipped WRENLET-1; deep-space
//!   sets (11801, 28129) propagated directly, equal bit for bit;
//! * the elevation-only terms of the path (`plan::path_table`): attenuation, boresight sky
//!   brightness and transmissivity within 0.005 dB (kelvin and transmissivity as a ratio in dB)
//!   every 0.001 deg from 0 to 90 deg, for the shipped stations (clear sky and their 1 % case)
//!   and for extreme sites (tropical rain at 0.001 %, Ka band; a dry high site at 2 GHz). The
//!   direct computation is the project's ITU-R implementation, itself checked against the ITU-R
//!   validation examples (`atmosphere_valex.rs`).

use passbudget::atmosphere::{AtmosphereSite, PathSpec, PreparedAtmosphere, Weather};
use passbudget::orbit::{parse_elements, select, EcefSpline, Propagator};
use passbudget::plan::path_table::{PathTable, PathTerms, TABLE_TOLERANCE_DB};
use passbudget::timefmt::add_seconds;
use std::path::Path;

/// SGP4-VER.TLE (AIAA 2006-6753), the four sets of `orbit_sgp4_verification.rs`.
const VER_TLE: &str = "\
1 00005U 58002B   00179.78495062  .00000023  00000-0  28098-4 0  4753
2 00005  34.2682 348.7242 1859667 331.7664  19.3264 10.82419157413667
1 06251U 62025E   06176.82412014  .00008885  00000-0  12808-3 0  3985
2 06251  58.0579  54.0425 0030035 139.1568 221.1854 15.56387291  6774
1 11801U          80230.29629788  .01431103  00000-0  14311-1      13
2 11801  46.7916 230.4354 7318036  47.4722  10.4117  2.28537848    13
1 28129U 03058A   06175.57071136 -.00000104  00000-0  10000-3 0   459
2 28129  54.7298 324.8098 0048506 266.2640  93.1663  2.00562768 18443
";

fn propagator(text: &str, catalog: u64) -> Propagator {
    let sets = parse_elements(text).unwrap();
    Propagator::new(select(&sets, Some(&catalog.to_string())).unwrap()).unwrap()
}

/// Largest position (km) and velocity (km/s) error of the spline against direct SGP4, every
/// second over 20-minute stretches starting every 97 minutes for two days from epoch.
fn spline_errors(prop: &Propagator) -> (f64, f64) {
    let mut spline = EcefSpline::new();
    let (mut dr, mut dv) = (0.0f64, 0.0f64);
    for k in 0..30 {
        let start = add_seconds(&prop.epoch(), k as f64 * 97.0 * 60.0);
        let end = add_seconds(&start, 1200.3);
        spline.reset(prop, &start, &end).unwrap();
        for s in 0..=1200 {
            let t_s = s as f64 + if s % 7 == 0 { 0.5 } else { 0.0 };
            let a = spline.at(prop, t_s).unwrap();
            let d = prop.ecef_at(&add_seconds(&start, t_s)).unwrap();
            let dist = |x: [f64; 3], y: [f64; 3]| {
                ((x[0] - y[0]).powi(2) + (x[1] - y[1]).powi(2) + (x[2] - y[2]).powi(2)).sqrt()
            };
            dr = dr.max(dist(a.position_km, d.position_km));
            dv = dv.max(dist(a.velocity_km_s, d.velocity_km_s));
        }
    }
    (dr, dv)
}

#[test]
fn orbit_spline_within_1_m_of_direct_sgp4_for_near_earth_orbits() {
    let shipped =
        std::fs::read_to_string(Path::new(env!("CARGO_MANIFEST_DIR")).join("examples/sat.tle"))
            .unwrap();
    for (text, catalog) in [(VER_TLE, 5), (VER_TLE, 6251), (shipped.as_str(), 99901)] {
        let prop = propagator(text, catalog);
        assert!(prop.is_near_earth(), "{catalog}");
        let (dr_km, dv_km_s) = spline_errors(&prop);
        eprintln!(
            "spline {catalog}: max position error {:.3} mm, velocity {:.4} mm/s",
            dr_km * 1e6,
            dv_km_s * 1e6
        );
        assert!(dr_km <= 1e-3, "{catalog}: {dr_km} km");
        assert!(dv_km_s <= 1e-6, "{catalog}: {dv_km_s} km/s");
    }
}

#[test]
fn deep_space_orbits_are_propagated_directly() {
    for catalog in [11801, 28129] {
        let prop = propagator(VER_TLE, catalog);
        assert!(!prop.is_near_earth(), "{catalog}");
        let mut spline = EcefSpline::new();
        let start = add_seconds(&prop.epoch(), 3600.0);
        spline
            .reset(&prop, &start, &add_seconds(&start, 900.0))
            .unwrap();
        for t_s in [0.0, 1.0, 17.5, 450.0, 900.0] {
            let direct = prop.ecef_at(&add_seconds(&start, t_s)).unwrap();
            assert_eq!(spline.at(&prop, t_s).unwrap(), direct, "{catalog} at {t_s}");
        }
    }
}

/// The largest error of `table` against its direct computation every 0.001 deg over 0-90 deg,
/// per term: (total, absorptive, sky temperature, transmissivity), dB.
fn table_errors(table: &PathTable) -> [f64; 4] {
    let mut worst = [0.0f64; 4];
    let ratio_db = |a: f64, b: f64| (10.0 * (a / b).log10()).abs();
    for i in 0..=90_000 {
        let e = i as f64 * 0.001;
        let (t, d): (PathTerms, PathTerms) = (table.at(e), table.direct(e));
        assert_eq!(t.warnings, d.warnings, "warnings at {e} deg");
        let err = [
            (t.total_db - d.total_db).abs(),
            (t.absorptive_db - d.absorptive_db).abs(),
            ratio_db(t.sky_temperature_k, d.sky_temperature_k),
            ratio_db(t.transmissivity, d.transmissivity),
        ];
        for k in 0..4 {
            worst[k] = worst[k].max(err[k]);
        }
    }
    // Below the horizon (a negative mask) the table hands over to the direct computation.
    for e in [-0.0005, -2.0, -5.0] {
        assert_eq!(table.at(e), table.direct(e), "{e} deg");
    }
    worst
}

fn check_table(label: &str, table: &PathTable) {
    let worst = table_errors(table);
    eprintln!(
        "path table {label}: direct cells {}, rows {:?}; max error total {:.2e} dB, absorptive {:.2e} dB, sky temperature {:.2e} dB, transmissivity {:.2e} dB",
        table.direct_cells(),
        table.rows(),
        worst[0],
        worst[1],
        worst[2],
        worst[3]
    );
    for (k, w) in worst.iter().enumerate() {
        assert!(*w <= TABLE_TOLERANCE_DB, "{label}: term {k}: {w} dB");
    }
}

#[test]
fn path_tables_of_the_shipped_stations_within_0_005_db() {
    let setup = crate::common::plan::load_plan_setup(
        &Path::new(env!("CARGO_MANIFEST_DIR")).join("examples/wrenlet-1.yaml"),
    );
    for model in &setup.stations {
        let name = &model.station.name;
        check_table(
            &format!("{name} clear"),
            model.path.table(Weather::ClearSky).unwrap(),
        );
        // The example plans the 1 % case (mission file `exceedance_percent: 1`).
        let rain = Weather::exceedance(1.0).unwrap();
        check_table(&format!("{name} 1 %"), model.path.table(rain).unwrap());
        // Only a few 0.25 deg cells are left direct: the rain model's jump below 5 deg and its
        // sqrt(sin θ) at the horizon (P.618-14 step 7, infinite slope at 0 deg).
        assert!(
            model.path.table(rain).unwrap().direct_cells() <= 3,
            "{name}"
        );
    }
}

#[test]
fn path_tables_of_extreme_sites_within_0_005_db() {
    // Tropical lowland, 150 mm/h at 0.01 %, Ka band: rain of tens of dB at low elevation.
    let tropical = AtmosphereSite {
        latitude_deg: 3.0,
        altitude_km: 0.05,
        pressure_hpa: 1010.0,
        temperature_k: 300.0,
        water_vapour_density_g_m3: 22.0,
        rain_rate_001_mm_h: 150.0,
        rain_height_km: None,
        cloud_liquid_clear_kg_m2: Some(0.8),
        cloud_liquid_exceedance_kg_m2: Some(2.5),
        wet_refractivity: None,
    };
    // Dry high site at 2 GHz, no cloud values given.
    let dry = AtmosphereSite {
        latitude_deg: -23.0,
        altitude_km: 4.8,
        pressure_hpa: 560.0,
        temperature_k: 265.0,
        water_vapour_density_g_m3: 1.0,
        rain_rate_001_mm_h: 2.0,
        rain_height_km: Some(5.2),
        cloud_liquid_clear_kg_m2: None,
        cloud_liquid_exceedance_kg_m2: None,
        wet_refractivity: None,
    };
    let path = |f_ghz: f64| PathSpec {
        frequency_ghz: f_ghz,
        polarization_tilt_deg: 45.0,
        antenna_diameter_m: 2.4,
        antenna_efficiency: 0.6,
    };
    for (label, site, f_ghz) in [
        ("tropical Ka", &tropical, 27.0),
        ("tropical X", &tropical, 8.2),
        ("dry high S", &dry, 2.2),
    ] {
        let atm = PreparedAtmosphere::new(site, &path(f_ghz)).unwrap();
        let tmr_k = passbudget::atmosphere::mean_radiating_temperature_k(site.temperature_k);
        for p in [None, Some(0.001), Some(0.01), Some(1.0), Some(20.0)] {
            let weather = p.map_or(Weather::ClearSky, |p| Weather::exceedance(p).unwrap());
            let table = PathTable::build(&atm, weather, tmr_k, 2.76);
            check_table(&format!("{label} {p:?} %"), &table);
        }
    }
}

//! The antenna noise over elevation and azimuth where the terrain rises above the geometric
//! horizon (`noise::terrain`, the direct integral): its analytic limits (a profile at or below
//! 0 deg gives the 1-D integral; an isotropic antenna under a horizon raised everywhere to h sees
//! the ground's solid-angle share (1 + sin h) / 2), an independent brute-force integration over
//! the local sky, and the pointing that faces the raised terrain.

use crate::common::fixtures::{atmosphere_path, atmosphere_site, SIERRA_BAJA_PROFILE};
use crate::common::tolerance::*;
use passbudget::atmosphere::{PreparedAtmosphere, Weather};
use passbudget::geometry::HorizonMask;
use passbudget::noise::antenna_table::{AntennaNoiseTable, Brightness, GroundSpec};
use passbudget::noise::pattern::NoisePattern;
use passbudget::noise::sky::sky_temperature_p618_k;
use passbudget::noise::terrain::{terrain_antenna_noise, terrain_profile};
use passbudget::noise::terrain_table::TerrainNoiseTable;
use passbudget::plan::noise::{NoiseInputs, StationNoise};

const C: f64 = 299_792_458.0;

fn dish(diameter_m: f64, frequency_hz: f64, efficiency: f64) -> NoisePattern {
    let dl = diameter_m * frequency_hz / C;
    let g = 10.0 * (efficiency * (std::f64::consts::PI * dl).powi(2)).log10();
    NoisePattern::reference(g, 70.0 / dl, dl, frequency_hz).unwrap()
}

const GROUND: GroundSpec = GroundSpec {
    temperature_k: 290.0,
    emissivity: 0.9,
};

fn fixture_sky(frequency_ghz: f64, weather: Weather) -> Brightness {
    let atm = PreparedAtmosphere::new(&atmosphere_site(), &atmosphere_path(frequency_ghz)).unwrap();
    Brightness::new(
        |el| sky_temperature_p618_k(atm.at(el, weather).absorptive_db, 275.0, 2.73).unwrap(),
        GROUND,
    )
}

/// A station's noise inputs at 8.2 GHz: `pattern` over [`GROUND`], Tmr 275 K, background 2.73 K.
fn inputs(pattern: NoisePattern, terrain: Option<HorizonMask>) -> NoiseInputs {
    NoiseInputs {
        pattern,
        ground: GROUND,
        mean_radiating_temperature_k: 275.0,
        background_k: 2.73,
        frequency_hz: 8.2e9,
        man_made: None,
        measured: None,
        terrain,
    }
}

/// The shipped example's Sierra Baja profile (invented terrain, 2-12 deg).
fn sierra() -> HorizonMask {
    terrain_profile(&SIERRA_BAJA_PROFILE).unwrap()
}

#[test]
fn a_profile_at_or_below_the_horizon_gives_the_flat_integral() {
    // No profile, or every point at or below 0 deg: no terrain above the geometric horizon, and
    // the 1-D table stays exact (the plan keeps it).
    assert!(terrain_profile(&[]).is_none());
    assert!(terrain_profile(&[[0.0, 0.0], [90.0, -1.0], [200.0, 0.0]]).is_none());
    // The integral over a profile at 0 deg in every azimuth equals the flat one exactly.
    let zero = HorizonMask::new(0.0, vec![[0.0, 0.0], [180.0, 0.0]]).unwrap();
    let p = dish(3.7, 8.2e9, 0.6);
    let b = fixture_sky(8.2, Weather::ClearSky);
    for (el, az) in [
        (-3.0, 10.0),
        (0.0, 0.0),
        (0.3, 200.0),
        (5.0, 90.0),
        (45.0, 300.0),
    ] {
        let t = terrain_antenna_noise(&p, &b, &zero, el, az);
        assert_eq!(t, AntennaNoiseTable::integrate_at(&p, &b, el), "el {el}");
    }
}

#[test]
fn isotropic_antenna_under_a_raised_horizon_sees_its_solid_angle() {
    // Closed form: an isotropic antenna (G = 1) sees (1/4 pi) of every direction; the directions
    // below elevation h fill 2 pi (1 + sin h) sr, a share (1 + sin h) / 2. With a uniform sky Ts
    // and ground e Tg + (1 - e) Ts (below 0 deg, and the terrain above it, the same brightness),
    // Ta = Tb (1 + sin h) / 2 + Ts (1 - sin h) / 2 at every pointing.
    let iso = NoisePattern::measured(&[[0.0, 0.0], [180.0, 0.0]]).unwrap();
    let (ts, ground) = (
        20.0,
        GroundSpec {
            temperature_k: 290.0,
            emissivity: 0.9,
        },
    );
    let b = Brightness::uniform(ts, ground);
    let tb = 0.9 * 290.0 + 0.1 * ts;
    for h in [1.0f64, 5.0, 12.0, 30.0] {
        let terrain = terrain_profile(&[[0.0, h], [120.0, h], [240.0, h]]).unwrap();
        let share = (1.0 + h.to_radians().sin()) / 2.0;
        for (el, az) in [(h + 0.5, 17.0), (60.0, 150.0), (2.0, 300.0), (-4.0, 0.0)] {
            let t = terrain_antenna_noise(&iso, &b, &terrain, el, az);
            let flat = AntennaNoiseTable::integrate_at(&iso, &b, el);
            // The terrain's own part, (1/4 pi) 2 pi sin h (Tb - Ts): the quadrature of this module.
            let added = t.ground_k - flat.ground_k;
            let want = tb * h.to_radians().sin() / 2.0;
            assert!(
                (added / want - 1.0).abs() < 1e-9,
                "h {h}, el {el}: {added} vs {want}"
            );
            let hidden = flat.sky_k - t.sky_k;
            let want = ts * h.to_radians().sin() / 2.0;
            assert!(
                (hidden / want - 1.0).abs() < 1e-9,
                "h {h}, el {el}: {hidden} vs {want}"
            );
            // The whole: the flat integral's horizon cut (band-averaged, antenna_table) adds its
            // own quadrature error, about 1e-5 relative.
            assert!(
                (t.ground_k / (tb * share) - 1.0).abs() < 1e-4,
                "h {h}, el {el}: ground {} vs {}",
                t.ground_k,
                tb * share
            );
            assert!(
                (t.sky_k / (ts * (1.0 - share)) - 1.0).abs() < 1e-4,
                "h {h}, el {el}: sky {}",
                t.sky_k
            );
        }
    }
}

/// Brute force over the local sky with the terrain: a uniform grid in elevation and azimuth
/// (0.05 deg x 0.5 deg), each direction's brightness that of the ground below 0 deg, of the
/// terrain (the ground at grazing, e Tg + (1 - e) Tsky(0)) below H(az), else of the sky; its
/// off-axis angle from the dot product with the boresight.
fn brute_force(
    pattern: &NoisePattern,
    b: &Brightness,
    terrain: &HorizonMask,
    e0_deg: f64,
    a0_deg: f64,
) -> (f64, f64) {
    let (n_el, n_az) = (3600, 720);
    let (e0, a0) = (e0_deg.to_radians(), a0_deg.to_radians());
    let axis = [e0.cos() * a0.sin(), e0.cos() * a0.cos(), e0.sin()];
    let tt = b.side_at(0.0, true);
    let heights: Vec<f64> = (0..n_az)
        .map(|j| {
            terrain
                .limit_deg((j as f64 + 0.5) * 360.0 / n_az as f64)
                .to_radians()
        })
        .collect();
    let (mut sky, mut ground, mut norm) = (0.0, 0.0, 0.0);
    for i in 0..n_el {
        let el =
            -std::f64::consts::FRAC_PI_2 + (i as f64 + 0.5) * std::f64::consts::PI / n_el as f64;
        let (se, ce) = el.sin_cos();
        let d_omega =
            ce * (std::f64::consts::PI / n_el as f64) * (std::f64::consts::TAU / n_az as f64);
        let (t_open, is_ground) = b.at(se);
        for (j, &h) in heights.iter().enumerate() {
            let az = (j as f64 + 0.5) * std::f64::consts::TAU / n_az as f64;
            let dir = [ce * az.sin(), ce * az.cos(), se];
            let c = (dir[0] * axis[0] + dir[1] * axis[1] + dir[2] * axis[2]).clamp(-1.0, 1.0);
            let w = pattern.gain(c.acos()) * d_omega;
            norm += w;
            if is_ground {
                ground += w * t_open;
            } else if el < h {
                ground += w * tt;
            } else {
                sky += w * t_open;
            }
        }
    }
    (sky / norm, ground / norm)
}

#[test]
fn terrain_integral_agrees_with_a_brute_force_over_the_sky() {
    // A wide beam (1.2 m at 2.2 GHz, theta_3dB = 8 deg) so the grid resolves it; boresights
    // facing the profile's 12 deg peak, just above it, inside it, and away from it.
    let p = dish(1.2, 2.2e9, 0.55);
    let b = fixture_sky(2.2, Weather::ClearSky);
    let terrain = sierra();
    for (el, az) in [
        (13.0, 150.0),
        (6.0, 150.0),
        (20.0, 110.0),
        (3.0, 300.0),
        (45.0, 180.0),
    ] {
        let a = terrain_antenna_noise(&p, &b, &terrain, el, az);
        let (s, g) = brute_force(&p, &b, &terrain, el, az);
        assert!(
            (a.sky_k - s).abs() < NOISE_BRUTE_FORCE_K
                && (a.ground_k - g).abs() < NOISE_BRUTE_FORCE_K,
            "el {el} az {az}: direct {a:?}, brute force sky {s} ground {g}"
        );
    }
}

#[test]
fn the_pointing_that_faces_the_raised_terrain_gets_more_noise() {
    // The example's profile rises to 12 deg at azimuth 150 and lies at 2 deg at 330. A 3.7 m dish
    // at X band 1 deg above the peak sees the terrain in its main beam's skirt and near sidelobes:
    // more ground noise than the same elevation facing the low side, and more than the flat
    // (geometric-horizon) integral; at 30 deg the difference shrinks to the sidelobes' share.
    let p = dish(3.7, 8.2e9, 0.6);
    let b = fixture_sky(8.2, Weather::ClearSky);
    let terrain = sierra();
    for (el, at_least_k) in [(13.0, 5.0), (30.0, 0.1)] {
        let facing = terrain_antenna_noise(&p, &b, &terrain, el, 150.0).total_k();
        let away = terrain_antenna_noise(&p, &b, &terrain, el, 330.0).total_k();
        let flat = AntennaNoiseTable::integrate_at(&p, &b, el).total_k();
        assert!(
            facing > away + at_least_k && away > flat,
            "el {el}: facing {facing:.2} K, away {away:.2} K, flat {flat:.2} K"
        );
    }
    // Pointed into the terrain, the beam sees it: close to the terrain's brightness times the
    // main-beam share, far above the flat value at that elevation.
    let inside = terrain_antenna_noise(&p, &b, &terrain, 5.0, 150.0);
    let flat = AntennaNoiseTable::integrate_at(&p, &b, 5.0);
    assert!(inside.ground_k > flat.ground_k + 0.8 * p.main_beam_efficiency() * 200.0);
}

/// Directions beside and over every vertex of the example's profile and between them: azimuths
/// at the vertices and 0.2-5 deg from them, elevations from 1 deg inside the terrain to 60 deg
/// above it.
fn probe_directions(terrain: &HorizonMask) -> Vec<(f64, f64)> {
    let vertices = [0.0, 60.0, 110.0, 150.0, 200.0, 270.0, 330.0];
    let mut azimuths = vec![30.0, 85.0, 130.0, 175.0, 235.0, 300.0, 345.0];
    for v in vertices {
        for o in [0.0, 0.2, 0.5, 1.0, 2.0, 5.0] {
            azimuths.extend([v + o, v - o]);
        }
    }
    let mut out = Vec::new();
    for a in azimuths {
        let a = f64::rem_euclid(a, 360.0);
        let h = terrain.limit_deg(a);
        for du in [
            -1.0, -0.3, 0.0, 0.1, 0.3, 0.5, 1.0, 2.0, 5.0, 12.0, 30.0, 60.0,
        ] {
            out.push(((h + du).min(90.0), a));
        }
    }
    out
}

#[test]
fn terrain_table_stays_within_its_bound_of_the_direct_integral() {
    // The table of noise::terrain_table against the direct integral of noise::terrain, whose own
    // checks are above: a 3.7 m X-band dish (theta_3dB 0.7 deg) in clear sky and 0.1 % rain,
    // and a 1.2 m S-band dish (8 deg), on the example's profile, beside and over its peaks.
    let terrain = sierra();
    let directions = probe_directions(&terrain);
    for (d, f_ghz, weather) in [
        (3.7, 8.2, Weather::ClearSky),
        (3.7, 8.2, Weather::Exceedance { percent: 0.1 }),
        (1.2, 2.2, Weather::ClearSky),
    ] {
        let p = dish(d, f_ghz * 1e9, 0.6);
        let b = fixture_sky(f_ghz, weather);
        let table = TerrainNoiseTable::build(&p, &b, &terrain);
        let mut worst = (0.0f64, 0.0, 0.0);
        for &(el, az) in &directions {
            let direct = terrain_antenna_noise(&p, &b, &terrain, el, az);
            let t = table.at(el, az);
            let err = (t.total_k() - direct.total_k()).abs();
            if err > worst.0 {
                worst = (err, el, az);
            }
        }
        assert!(
            worst.0 < TERRAIN_TABLE_K,
            "{d} m at {f_ghz} GHz, {weather:?}: {:.3} K at el {:.2} az {:.2}",
            worst.0,
            worst.1,
            worst.2
        );
    }
}

/// A profile that comes down to 0 deg in one sector (the example's with its 0 deg and 330 deg
/// points lowered from 2 deg to 0): the table reached past its last row where the profile is at
/// the horizon, and every command that budgets at that station panicked (found by an edge-case
/// probe). Its lookups now stay within the table's bound of the direct integral on the bound's
/// directions, as the example's do.
#[test]
fn a_profile_down_to_the_horizon_in_one_sector_keeps_the_bound() {
    let mut profile = SIERRA_BAJA_PROFILE;
    profile[0][1] = 0.0;
    profile[profile.len() - 1][1] = 0.0;
    let terrain = terrain_profile(&profile).unwrap();
    let p = dish(3.7, 8.2e9, 0.6);
    let b = fixture_sky(8.2, Weather::ClearSky);
    let table = TerrainNoiseTable::build(&p, &b, &terrain);
    // the bound's directions (1 deg inside the terrain to 60 deg above it), and the zenith
    let mut worst = 0.0f64;
    let directions = probe_directions(&terrain);
    for &(el, az) in directions.iter().chain(&[(90.0, 0.0), (89.0, 345.0)]) {
        let direct = terrain_antenna_noise(&p, &b, &terrain, el, az);
        worst = worst.max((table.at(el, az).total_k() - direct.total_k()).abs());
    }
    assert!(worst < TERRAIN_TABLE_K, "{worst} K");
}

#[test]
fn a_profile_at_the_horizon_keeps_the_elevation_table_at_every_azimuth() {
    // Raising the horizon by 0 deg leaves the brightness as it is, value for value; a station whose
    // mask never rises above 0 deg has no terrain table and gets the 1-D table at every azimuth.
    let b = fixture_sky(8.2, Weather::ClearSky);
    assert_eq!(b.raised(0.0), b);
    let atm = PreparedAtmosphere::new(&atmosphere_site(), &atmosphere_path(8.2)).unwrap();
    let noise = |mask: &[[f64; 2]]| {
        StationNoise::new(
            inputs(dish(3.7, 8.2e9, 0.6), terrain_profile(mask)),
            &atm,
            None,
        )
    };
    let flat = noise(&[[0.0, 0.0], [120.0, -1.0], [240.0, 0.0]]);
    assert!(!flat.has_terrain());
    for e in [-3.0, 0.0, 0.4, 5.0, 13.0, 45.0, 90.0] {
        let want = flat.clear_table().expect("a table over elevation").at(e);
        for az in [0.0, 90.0, 150.0, 271.5] {
            let got = flat.external_at(e, az, Weather::ClearSky).unwrap();
            assert_eq!((got.sky_k, got.ground_k), (want.sky_k, want.ground_k));
        }
    }
    // With the example's profile the same station has a table, and azimuth matters.
    let hilly = noise(&SIERRA_BAJA_PROFILE);
    assert!(hilly.has_terrain());
    // Its table over elevation alone would go unused, so it is not built.
    assert!(hilly.clear_table().is_none());
    let at = |az| {
        hilly
            .external_at(13.0, az, Weather::ClearSky)
            .unwrap()
            .total_k()
    };
    assert!(at(150.0) > at(330.0) + 5.0);
    // A budget given an elevation alone takes the azimuth where the noise is highest among those
    // whose terrain is not above it: at 13 deg, facing the 12 deg peak; at 5 deg, somewhere the
    // terrain is at most 5 deg; at 1 deg, below the terrain everywhere, where it is lowest (2 deg).
    let worst = hilly.worst_azimuth_deg(13.0, Weather::ClearSky).unwrap();
    assert!((worst - 150.0).abs() <= 2.0, "{worst}");
    let worst = hilly.worst_azimuth_deg(5.0, Weather::ClearSky).unwrap();
    assert!(sierra().limit_deg(worst) <= 5.0, "{worst}");
    let worst = hilly.worst_azimuth_deg(1.0, Weather::ClearSky).unwrap();
    assert_eq!(sierra().limit_deg(worst), 2.0, "{worst}");
}

#[test]
fn a_pass_low_over_the_terrain_has_a_higher_system_temperature_than_one_over_the_low_side() {
    // The plan's steps take the azimuth: the example's Sierra Baja passes at 12-16 deg facing the
    // 9-12 deg terrain to the south-east (azimuth 120-180) see more ground noise and a higher
    // system temperature than its steps at the same elevations over the 2-3 deg side (270-30).
    use passbudget::config::mission::Mission;
    use passbudget::plan::{FnSink, PassSeries, PlanRequest, Planner};
    let root = std::path::Path::new(env!("CARGO_MANIFEST_DIR"));
    let mission = Mission::load(&root.join("examples/wrenlet-1.yaml")).unwrap();
    let sierra_index = mission
        .stations
        .iter()
        .position(|s| s.name == "Sierra Baja")
        .unwrap();
    let planner = Planner::new(&mission, &PlanRequest::default()).unwrap();
    let steps = std::sync::Mutex::new(Vec::new());
    let sink = FnSink(|s: &PassSeries<'_>| {
        if s.plan.station_index == sierra_index {
            let mut v = steps.lock().unwrap();
            for st in s
                .steps
                .iter()
                .filter(|st| (12.0..16.0).contains(&st.elevation_deg))
            {
                v.push((st.azimuth_deg, st.ground_noise_k, st.system_temperature_k));
            }
        }
        Ok::<(), std::io::Error>(())
    });
    planner.run(&sink).unwrap();
    let steps = steps.into_inner().unwrap();
    let mean = |f: &dyn Fn(f64) -> bool, pick: fn(&(f64, f64, f64)) -> f64| {
        let v: Vec<f64> = steps.iter().filter(|s| f(s.0)).map(pick).collect();
        assert!(v.len() >= 5, "{} steps", v.len());
        v.iter().sum::<f64>() / v.len() as f64
    };
    let facing = |az: f64| (120.0..180.0).contains(&az);
    let low = |az: f64| !(30.0..270.0).contains(&az);
    let (g_facing, g_low) = (mean(&facing, |s| s.1), mean(&low, |s| s.1));
    let (t_facing, t_low) = (mean(&facing, |s| s.2), mean(&low, |s| s.2));
    assert!(
        g_facing > g_low + 2.0 && t_facing > t_low + 2.0,
        "ground {g_facing:.2} vs {g_low:.2} K, Tsys {t_facing:.2} vs {t_low:.2} K"
    );
}

#[test]
fn terrain_lookups_allocate_nothing() {
    // The plan's step reads the terrain table through StationNoise::external_at: no allocation
    // (the hot path's rule; counted per thread by common::alloc).
    use crate::common::alloc::thread_allocations;
    let p = dish(3.7, 8.2e9, 0.6);
    let b = fixture_sky(8.2, Weather::ClearSky);
    let table = TerrainNoiseTable::build(&p, &b, &sierra());
    let atm = PreparedAtmosphere::new(&atmosphere_site(), &atmosphere_path(8.2)).unwrap();
    let noise = StationNoise::new(inputs(p, Some(sierra())), &atm, None);
    let before = thread_allocations();
    let mut acc = 0.0;
    for i in 0..2000 {
        let (e, a) = (-2.0 + (i % 90) as f64, (i as f64 * 7.3) % 360.0);
        acc += table.at(e, a).total_k();
        acc += noise
            .external_at(e, a, Weather::ClearSky)
            .unwrap()
            .total_k();
    }
    let after = thread_allocations();
    assert!(acc.is_finite());
    assert_eq!(after - before, 0, "terrain lookups allocated");
}

#[test]
fn a_dense_profile_keeps_the_terrain_table_build_bounded() {
    // A profile of 1,000 vertices (a terrain model's horizon): the integrator cuts azimuth every
    // 5 deg, and the table takes those 72 cuts as its columns, without rungs: 72 x 13 direct
    // integrals, not thousands.
    let points: Vec<[f64; 2]> = (0..1000)
        .map(|i| {
            let az = i as f64 * 0.36;
            [az, 4.0 + 3.0 * (az.to_radians() * 7.0).sin()]
        })
        .collect();
    let terrain = terrain_profile(&points).unwrap();
    let p = dish(3.7, 8.2e9, 0.6);
    let b = fixture_sky(8.2, Weather::ClearSky);
    let table = TerrainNoiseTable::build(&p, &b, &terrain);
    assert_eq!(
        table.direct_integrals(),
        72 * passbudget::noise::terrain_table::ROWS_DEG.len()
    );
    let t = table.at(12.0, 10.0).total_k();
    assert!(t.is_finite() && t > 0.0);
}

#[test]
fn tables_built_together_for_two_weather_cases_keep_the_bound() {
    // The plan builds the clear-sky and availability tables of a station together
    // (TerrainNoiseTable::build_cases: one quadrature per direction for both, one grid for the
    // raised-horizon tables). Each must keep the bound against the direct integral, and stay
    // within 0.05 K of the table built alone (only its raised-horizon rows differ).
    let terrain = sierra();
    let directions = probe_directions(&terrain);
    let p = dish(3.7, 8.2e9, 0.6);
    let clear = fixture_sky(8.2, Weather::ClearSky);
    let rain = fixture_sky(8.2, Weather::Exceedance { percent: 0.1 });
    let together = TerrainNoiseTable::build_cases(
        &p,
        &[&clear, &rain],
        &terrain,
        &passbudget::noise::terrain_table::TerrainGrid::default(),
    );
    assert_eq!(together.len(), 2);
    for (table, b) in together.iter().zip([&clear, &rain]) {
        let alone = TerrainNoiseTable::build(&p, b, &terrain);
        assert_eq!(table.direct_integrals(), alone.direct_integrals());
        for &(el, az) in &directions {
            let direct = terrain_antenna_noise(&p, b, &terrain, el, az).total_k();
            let t = table.at(el, az).total_k();
            assert!(
                (t - direct).abs() < TERRAIN_TABLE_K,
                "el {el} az {az}: {t} vs {direct}"
            );
            let a = alone.at(el, az).total_k();
            assert!((t - a).abs() < 0.05, "el {el} az {az}: {t} vs alone {a}");
        }
    }
}

//! The antenna noise over elevation and azimuth where the terrain rises above the geometric
//! horizon (`noise::terrain`, the direct integral): its analytic limits (a profile at or below
//! 0 deg gives the 1-D integral; an isotropic antenna under a horizon raised everywhere to h sees
//! the ground's solid-angle share (1 + sin h) / 2), an independent brute-force integration over
//! the local sky, and the pointing that faces the raised terrain.

use crate::common::fixtures::{atmosphere_path, atmosphere_site};
use crate::common::tolerance::*;
use passbudget::atmosphere::{PreparedAtmosphere, Weather};
use passbudget::geometry::HorizonMask;
use passbudget::noise::antenna_table::{AntennaNoiseTable, Brightness, GroundSpec};
use passbudget::noise::pattern::NoisePattern;
use passbudget::noise::sky::sky_temperature_p618_k;
use passbudget::noise::terrain::{terrain_antenna_noise, terrain_profile};

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

/// The shipped example's Sierra Baja profile (invented terrain, 2-12 deg).
fn sierra() -> HorizonMask {
    terrain_profile(&[
        [0.0, 2.0],
        [60.0, 4.0],
        [110.0, 9.0],
        [150.0, 12.0],
        [200.0, 6.0],
        [270.0, 3.0],
        [330.0, 2.0],
    ])
    .unwrap()
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

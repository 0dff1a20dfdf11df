//! Criterion benchmarks of the antenna-noise model: building one station's table (the pattern
//! integral over boresight elevation, clear sky and the rain case) and one interpolation (the
//! per-step cost), one direct terrain integral (`noise::terrain`, the example's Sierra Baja
//! profile: 1 deg above its 12 deg peak, and at 30 deg facing its low side), and the terrain
//! table over elevation and azimuth (`noise::terrain_table`: its build, clear sky, the rain
//! case and both built together, and one lookup). Invented X-band station of the shared fixtures (3.7 m dish).

use criterion::{criterion_group, criterion_main, Criterion};
use passbudget::atmosphere::{PreparedAtmosphere, Weather};
use passbudget::noise::antenna_table::{AntennaNoiseTable, Brightness, GroundSpec};
use passbudget::noise::pattern::NoisePattern;
use passbudget::noise::sky::sky_temperature_p618_k;
use passbudget::noise::terrain::{terrain_antenna_noise, terrain_profile};
use passbudget::noise::terrain_table::TerrainNoiseTable;
use std::hint::black_box;

#[allow(dead_code)] // each bench uses part of the shared fixtures
#[path = "../tests/suite/common/fixtures.rs"]
mod fixtures;

fn bench_noise(c: &mut Criterion) {
    let atm = PreparedAtmosphere::new(
        &fixtures::atmosphere_site(),
        &fixtures::atmosphere_path(8.2),
    )
    .unwrap();
    let dl = 3.7 * 8.2e9 / 299_792_458.0;
    let g = 10.0 * (0.6 * (std::f64::consts::PI * dl).powi(2)).log10();
    let pattern = NoisePattern::reference(g, 70.0 / dl, dl, 8.2e9).unwrap();
    let ground = GroundSpec {
        temperature_k: 290.0,
        emissivity: 0.9,
    };
    let brightness = |w: Weather| {
        Brightness::new(
            |el| sky_temperature_p618_k(atm.at(el, w).absorptive_db, 275.0, 2.73).unwrap(),
            ground,
        )
    };
    let mut g = c.benchmark_group("antenna_noise");
    g.sample_size(20);
    g.bench_function("table_build_clear_sky", |b| {
        b.iter(|| AntennaNoiseTable::build(&pattern, &brightness(Weather::ClearSky)).len())
    });
    g.bench_function("table_build_rain_0_1_percent", |b| {
        b.iter(|| {
            AntennaNoiseTable::build(&pattern, &brightness(Weather::Exceedance { percent: 0.1 }))
                .len()
        })
    });
    let table = AntennaNoiseTable::build(&pattern, &brightness(Weather::ClearSky));
    g.bench_function("table_lookup", |b| b.iter(|| table.at(black_box(7.3))));
    let terrain = terrain_profile(&fixtures::SIERRA_BAJA_PROFILE).unwrap();
    let clear = brightness(Weather::ClearSky);
    for (name, el, az) in [
        ("terrain_direct_13_deg_facing_peak", 13.0, 150.0),
        ("terrain_direct_30_deg_low_side", 30.0, 330.0),
    ] {
        g.bench_function(name, |b| {
            b.iter(|| {
                terrain_antenna_noise(&pattern, &clear, &terrain, black_box(el), black_box(az))
            })
        });
    }
    g.bench_function("terrain_table_build_clear_sky", |b| {
        b.iter(|| TerrainNoiseTable::build(&pattern, &clear, &terrain).direct_integrals())
    });
    let rain = brightness(Weather::Exceedance { percent: 0.1 });
    g.bench_function("terrain_table_build_rain_0_1_percent", |b| {
        b.iter(|| TerrainNoiseTable::build(&pattern, &rain, &terrain).direct_integrals())
    });
    g.bench_function("terrain_tables_build_clear_and_rain_together", |b| {
        b.iter(|| {
            TerrainNoiseTable::build_cases(
                &pattern,
                &[&clear, &rain],
                &terrain,
                &Default::default(),
            )
            .len()
        })
    });
    let table = TerrainNoiseTable::build(&pattern, &clear, &terrain);
    g.bench_function("terrain_table_lookup", |b| {
        b.iter(|| table.at(black_box(12.4), black_box(151.3)))
    });
    g.finish();
}

criterion_group!(benches, bench_noise);
criterion_main!(benches);

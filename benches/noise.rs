//! Criterion benchmarks of the antenna-noise model: building one station's table (the pattern
//! integral over boresight elevation, clear sky and the rain case) and one interpolation (the
//! per-step cost). Invented X-band station of the shared fixtures (3.7 m dish).

use criterion::{criterion_group, criterion_main, Criterion};
use passbudget::atmosphere::{PreparedAtmosphere, Weather};
use passbudget::noise::antenna_table::{AntennaNoiseTable, Brightness, GroundSpec};
use passbudget::noise::pattern::NoisePattern;
use passbudget::noise::sky::sky_temperature_p618_k;
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
    g.finish();
}

criterion_group!(benches, bench_noise);
criterion_main!(benches);

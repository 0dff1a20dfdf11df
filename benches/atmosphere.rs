//! Cost of one `PreparedAtmosphere::at` call (the per-second hot path of a pass) and of
//! building a `PreparedAtmosphere` (once per station and frequency).

use criterion::{criterion_group, criterion_main, Criterion};
use passbudget::atmosphere::{AtmosphereSite, PathSpec, PreparedAtmosphere, Weather};
use std::hint::black_box;
use std::time::Duration;

fn site() -> AtmosphereSite {
    // Invented station.
    AtmosphereSite {
        latitude_deg: 47.3,
        altitude_km: 0.42,
        pressure_hpa: 965.0,
        temperature_k: 284.0,
        water_vapour_density_g_m3: 8.1,
        rain_rate_001_mm_h: 32.0,
        rain_height_km: None,
        cloud_liquid_kg_m2: Some(0.4),
        wet_refractivity: None,
    }
}

fn path() -> PathSpec {
    PathSpec {
        frequency_ghz: 8.2,
        polarization_tilt_deg: 45.0,
        antenna_diameter_m: 3.7,
        antenna_efficiency: 0.6,
    }
}

fn bench(c: &mut Criterion) {
    let prep = PreparedAtmosphere::new(&site(), &path()).unwrap();
    let mut g = c.benchmark_group("atmosphere");
    g.sample_size(20)
        .warm_up_time(Duration::from_millis(300))
        .measurement_time(Duration::from_secs(1));
    g.bench_function("at_clear_sky_30deg", |b| {
        b.iter(|| prep.at(black_box(30.0), black_box(Weather::ClearSky)))
    });
    g.bench_function("at_clear_sky_3deg", |b| {
        b.iter(|| prep.at(black_box(3.0), black_box(Weather::ClearSky)))
    });
    g.bench_function("at_exceedance_0.1pct_30deg", |b| {
        b.iter(|| {
            prep.at(
                black_box(30.0),
                black_box(Weather::Exceedance { percent: 0.1 }),
            )
        })
    });
    g.bench_function("prepare", |b| {
        b.iter(|| PreparedAtmosphere::new(black_box(&site()), black_box(&path())))
    });
    g.finish();
}

criterion_group!(benches, bench);
criterion_main!(benches);

//! Cost of one `PreparedAtmosphere::at` call (the per-second hot path of a pass) and of
//! building a `PreparedAtmosphere` (once per station and frequency).

use criterion::{criterion_group, criterion_main, Criterion};
use passbudget::atmosphere::{PreparedAtmosphere, Weather};
use std::hint::black_box;
use std::time::Duration;

#[allow(dead_code)] // each bench uses part of the shared fixtures
#[path = "../tests/suite/common/fixtures.rs"]
mod fixtures;

fn site() -> passbudget::atmosphere::AtmosphereSite {
    fixtures::atmosphere_site()
}

fn path() -> passbudget::atmosphere::PathSpec {
    fixtures::atmosphere_path(8.2)
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

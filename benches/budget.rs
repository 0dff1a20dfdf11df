//! Criterion benchmark of one prepared-budget evaluation (invented X-band link).

use criterion::{criterion_group, criterion_main, Criterion};
use passbudget::link::budget::{AtmosphereLoss, BudgetGeometry, LinkModel};
use passbudget::link::modcod::scheme;
use passbudget::noise::ExternalNoise;
use std::hint::black_box;

#[allow(dead_code)] // each bench uses part of the shared fixtures
#[path = "../tests/suite/common/fixtures.rs"]
mod fixtures;

fn bench_evaluate(c: &mut Criterion) {
    let spec = fixtures::link_spec(375e6);
    let model = LinkModel::new(&spec).unwrap();
    let op = scheme("dvbs2-8psk-3/4")
        .unwrap()
        .operating_point(None)
        .unwrap();
    let rate = model.rate_spec(50e6, op, 0.2, 1.0).unwrap();
    let atm = AtmosphereLoss {
        total_db: 0.4,
        absorptive_db: 0.35,
        mean_radiating_temperature_k: 275.0,
    };
    let geometry = BudgetGeometry {
        elevation_deg: 12.0,
        range_km: 1800.0,
        off_nadir_deg: 58.0,
    };
    // Invented antenna noise terms (as a station's table gives them).
    let ext = ExternalNoise {
        sky_k: 30.0,
        ground_k: 9.0,
        man_made_k: 0.0,
        sun_k: 0.0,
        moon_k: 0.0,
    };
    c.bench_function("link_model_evaluate", |b| {
        b.iter(|| {
            model.evaluate(
                black_box(geometry),
                black_box(atm),
                black_box(ext),
                black_box(rate),
            )
        })
    });
    let low = BudgetGeometry {
        elevation_deg: 0.8,
        range_km: 3200.0,
        off_nadir_deg: 64.0,
    };
    c.bench_function("link_model_evaluate_low_elevation", |b| {
        b.iter(|| {
            model.evaluate(
                black_box(low),
                black_box(atm),
                black_box(ext),
                black_box(rate),
            )
        })
    });
}

criterion_group!(benches, bench_evaluate);
criterion_main!(benches);

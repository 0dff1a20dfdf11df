//! Criterion benchmark of one prepared-budget evaluation (invented X-band link).

use criterion::{criterion_group, criterion_main, Criterion};
use passbudget::link::antenna::{GroundAntennaSpec, TransmitterSpec, TxPattern, TxPower};
use passbudget::link::budget::{
    AtmosphereLoss, BudgetGeometry, LinkModel, LinkModelSpec, PolarizationSpec,
};
use passbudget::link::modcod::scheme;
use passbudget::link::polarization::{EllipseOrientation, Polarization, PolarizationSense};
use passbudget::noise::system::{GroundPickupSpec, LnaNoise, ReceiverSpec};
use std::hint::black_box;

fn bench_evaluate(c: &mut Criterion) {
    let spec = LinkModelSpec {
        frequency_hz: 8.2e9,
        transmitter: TransmitterSpec {
            power: TxPower::Watts(2.0),
            line_loss_db: 1.0,
            pattern: TxPattern::CosN {
                boresight_gain_dbi: 6.0,
                n: None,
            },
        },
        ground_antenna: GroundAntennaSpec::Dish {
            diameter_m: 3.7,
            efficiency: 0.6,
            pointing_error_deg: 0.05,
        },
        receiver: ReceiverSpec {
            feed_loss_db: 0.3,
            feed_temperature_k: 290.0,
            lna_noise: LnaNoise::TemperatureK(60.0),
            lna_gain_db: 30.0,
            later_noise_figure_db: 6.0,
        },
        ground_pickup: GroundPickupSpec::default(),
        polarization: PolarizationSpec {
            spacecraft: Polarization {
                sense: PolarizationSense::Rhcp,
                axial_ratio_db: 2.0,
            },
            ground: Polarization {
                sense: PolarizationSense::Rhcp,
                axial_ratio_db: 1.0,
            },
            orientation: EllipseOrientation::WorstCase,
            extra_loss_db: 0.2,
        },
        max_occupied_bandwidth_hz: Some(375e6),
    };
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
    c.bench_function("link_model_evaluate", |b| {
        b.iter(|| model.evaluate(black_box(geometry), black_box(atm), black_box(rate)))
    });
    // near the horizon the ground pick-up term needs erfc (continued fraction)
    let low = BudgetGeometry {
        elevation_deg: 0.8,
        range_km: 3200.0,
        off_nadir_deg: 64.0,
    };
    c.bench_function("link_model_evaluate_low_elevation", |b| {
        b.iter(|| model.evaluate(black_box(low), black_box(atm), black_box(rate)))
    });
}

criterion_group!(benches, bench_evaluate);
criterion_main!(benches);

//! Chart drawing speed on SYNTHETIC data: one pass chart (400 samples, about a 13-minute pass at
//! 2 s steps) as PNG and as SVG.

use chrono::{Duration, TimeZone, Utc};
use criterion::{criterion_group, criterion_main, Criterion};
use passbudget::chart::*;

fn synthetic_pass() -> PassChartData {
    let aos = Utc.with_ymd_and_hms(2026, 12, 2, 1, 23, 17).unwrap();
    let n = 400;
    let dur = 800.0;
    let samples: Vec<PassChartSample> = (0..n)
        .map(|i| {
            let t = dur * i as f64 / (n - 1) as f64;
            let x = (t - dur / 2.0) / (dur / 2.0); // -1..1
            let el = 60.0 * (1.0 - x * x);
            let ebn0 = 2.0 + 18.0 * (1.0 - x * x);
            PassChartSample {
                t_s: t,
                elevation_deg: el,
                azimuth_deg: 160.0 - 140.0 * (x + 1.0) / 2.0,
                range_km: 600.0 + 2000.0 * x * x,
                ebn0_db: ebn0,
                margin_db: ebn0 - 4.4,
                closed: ebn0 - 4.4 >= 3.0,
                adaptive_rate_bps: if ebn0 > 15.0 {
                    Some(100e6)
                } else if ebn0 > 8.0 {
                    Some(25e6)
                } else {
                    None
                },
                system_temperature_k: 95.0 + 150.0 * x * x * x * x,
                atmospheric_loss_db: 0.3 + 6.0 * x.powi(8),
            }
        })
        .collect();
    PassChartData {
        satellite: "KESTREL-7 (synthetic)".into(),
        station: "Sierra Baja".into(),
        pass_number: 3,
        aos,
        tca: aos + Duration::seconds(400),
        los: aos + Duration::seconds(800),
        max_elevation_deg: 60.0,
        rate_bps: Some(25e6),
        scheme: Some("ccsds-rs-cc".into()),
        volume_bits: 25e6 * 500.0,
        adaptive_volume_bits: 40e9,
        required_ebn0_db: Some(4.4),
        required_margin_db: 3.0,
        closes_from: Some(aos + Duration::seconds(150)),
        closes_until: Some(aos + Duration::seconds(650)),
        samples,
    }
}

fn bench(c: &mut Criterion) {
    let d = synthetic_pass();
    let mut g = c.benchmark_group("pass_chart");
    g.sample_size(10);
    g.bench_function("png_1600x1000", |b| {
        b.iter(|| draw_pass(&d, ChartFormat::Png).unwrap())
    });
    g.bench_function("svg_1600x1000", |b| {
        b.iter(|| draw_pass(&d, ChartFormat::Svg).unwrap())
    });
    g.finish();
}

criterion_group!(benches, bench);
criterion_main!(benches);

//! Chart drawing speed on SYNTHETIC data: one pass chart (400 samples, about a 13-minute pass at
//! 2 s steps) as PNG and as SVG; for scale also a sky chart with four passes, a mask chart with
//! four rates and a 7-day summary with 150 passes, as PNG.

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
                tracked: true,
                adaptive_rate_bps: if ebn0 > 15.0 {
                    Some(100e6)
                } else if ebn0 > 8.0 {
                    Some(25e6)
                } else {
                    None
                },
                system_temperature_k: 95.0 + 150.0 * x * x * x * x,
                sky_noise_k: 20.0 + 120.0 * x * x * x * x,
                ground_noise_k: 5.0 + 30.0 * x * x * x * x,
                man_made_noise_k: 0.0,
                sun_noise_k: 0.0,
                moon_noise_k: 0.0,
                receiver_noise_k: 70.0,
                atmospheric_loss_db: 0.3 + 6.0 * x.powi(8),
                mask_elevation_deg: 5.0,
                rain: Some(PassChartRain {
                    ebn0_db: ebn0 - 1.5,
                    system_temperature_k: 125.0 + 150.0 * x * x * x * x,
                    atmospheric_loss_db: 1.3 + 6.0 * x.powi(8),
                }),
            }
        })
        .collect();
    PassChartData {
        warnings: Vec::new(),
        starts_before_window: false,
        ends_after_window: false,
        satellite: "KESTREL-7 (synthetic)".into(),
        station: "Sierra Baja".into(),
        pass_number: 3,
        pass_id: "sierra-baja-20261202T0129Z".into(),
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
        rain_exceedance_percent: Some(1.0),
        rain_rate_bps: Some(25e6),
        rain_volume_bits: Some(25e6 * 400.0),
        samples,
    }
}

fn synthetic_sky(p: &PassChartData) -> SkyChartData {
    let passes = (0..4)
        .map(|k| SkyPass {
            label: format!("{}", k + 1),
            points: p
                .samples
                .iter()
                .map(|s| SkyPoint {
                    azimuth_deg: (s.azimuth_deg + 90.0 * k as f64).rem_euclid(360.0),
                    elevation_deg: s.elevation_deg / (k + 1) as f64,
                    margin_db: Some(s.margin_db - 3.0 * k as f64),
                    tracked: true,
                })
                .collect(),
            aos: p.aos,
            tca: p.tca,
            los: p.los,
            max_elevation_deg: 60.0 / (k + 1) as f64,
            rate_bps: Some(25e6),
        })
        .collect();
    SkyChartData {
        warnings: Vec::new(),
        station: "Sierra Baja".into(),
        satellite: "KESTREL-7 (synthetic)".into(),
        title_date: "2026-12-02".into(),
        min_elevation_deg: 5.0,
        horizon_mask: vec![[0.0, 3.0], [60.0, 14.0], [200.0, 2.0]],
        required_margin_db: 3.0,
        passes,
    }
}

fn synthetic_mask() -> MaskChartData {
    let masks: Vec<f64> = (0..=40).map(f64::from).collect();
    let contact = |m: f64| 4.0 * 3600.0 * ((90.0 - m) / 90.0).powi(3);
    MaskChartData {
        warnings: Vec::new(),
        scope: "network".into(),
        contact_s_per_day: masks.iter().map(|&m| contact(m)).collect(),
        rates: [10e6, 25e6, 50e6, 100e6]
            .iter()
            .enumerate()
            .map(|(i, &r)| MaskRateSeries {
                label: format!("{} Mbit/s", r / 1e6),
                volume_bits_per_day: masks
                    .iter()
                    .map(|&m| r * contact(m.max(8.0 * i as f64)))
                    .collect(),
            })
            .collect(),
        masks_deg: masks,
        configured_masks_deg: vec![("Sierra Baja".into(), 10.0), ("Punta Lenga".into(), 5.0)],
    }
}

fn synthetic_summary(p: &PassChartData) -> SummaryChartData {
    let start = p.aos;
    let passes = (0..150)
        .map(|i| SummaryBar {
            aos: start + Duration::minutes(67 * i),
            los: start + Duration::minutes(67 * i + 9),
            station_index: (i % 3) as usize,
            volume_bits: 1e9 * (i % 29) as f64,
            adaptive_volume_bits: 1.4e9 * (i % 29) as f64,
        })
        .collect();
    let days = (0..7)
        .map(|i| DayTotals {
            date: (start + Duration::days(i)).date_naive(),
            fixed_bits: 300e9,
            adaptive_bits: 420e9,
            shannon_bits: 700e9,
            network_bits: Some(280e9),
            rain_bits: Some(250e9),
        })
        .collect();
    SummaryChartData {
        delivered_bits: None,
        warnings: Vec::new(),
        satellite: "KESTREL-7 (synthetic)".into(),
        start,
        end: start + Duration::days(7),
        stations: vec![
            "Sierra Baja".into(),
            "Punta Lenga".into(),
            "Isla Corva".into(),
        ],
        passes,
        days,
        rain_exceedance_percent: Some(1.0),
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

    let sky = synthetic_sky(&d);
    let mask = synthetic_mask();
    let summary = synthetic_summary(&d);
    let mut g = c.benchmark_group("other_charts_png");
    g.sample_size(10);
    g.bench_function("sky_1400x1000", |b| {
        b.iter(|| draw_sky(&sky, ChartFormat::Png).unwrap())
    });
    g.bench_function("mask_1600x1000", |b| {
        b.iter(|| draw_mask(&mask, ChartFormat::Png).unwrap())
    });
    g.bench_function("summary_150_passes_1600x1000", |b| {
        b.iter(|| draw_summary(&summary, ChartFormat::Png).unwrap())
    });
    g.finish();
}

criterion_group!(benches, bench);
criterion_main!(benches);

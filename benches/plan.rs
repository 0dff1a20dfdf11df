//! Criterion benchmarks of the pass-by-pass plan on the shipped example (invented satellite
//! WRENLET-1 over three invented stations, 1 s steps, clear sky plus the 1 % rain case):
//! a 7-day plan on one core and on every core, the same with the mask trade-off, the same writing
//! every pass's CSV time series (as `plan --out` does, into a staging folder), and a 365-day
//! plan. Everything goes through the library's `Planner`, as a library user would.

use criterion::{criterion_group, criterion_main, Criterion};
use passbudget::config::mission::Mission;
use passbudget::plan::{PlanRequest, Planner, WindowRequest};
use std::hint::black_box;
use std::path::PathBuf;
use std::time::Duration;

fn planner(mission: &Mission, days: f64, tradeoff: bool) -> Planner {
    let request = PlanRequest {
        window: WindowRequest {
            days: Some(days),
            ..Default::default()
        },
        search_floor_deg: tradeoff.then_some(0.0),
        // the 365-day plan reaches far past the example's element epoch (volume statistics)
        allow_stale_elements: days > 90.0,
        ..Default::default()
    };
    Planner::new(mission, &request).unwrap()
}

fn bench_plan(c: &mut Criterion) {
    let path = PathBuf::from(env!("CARGO_MANIFEST_DIR")).join("examples/wrenlet-1.yaml");
    let mission = Mission::load(&path).unwrap();
    let week = planner(&mission, 7.0, false);
    let week_tradeoff = planner(&mission, 7.0, true);
    let year = planner(&mission, 365.0, false);
    let one = rayon::ThreadPoolBuilder::new()
        .num_threads(1)
        .build()
        .unwrap();
    let mut g = c.benchmark_group("plan");
    g.sample_size(10).measurement_time(Duration::from_secs(8));
    g.bench_function("7_days_3_stations_1_thread", |b| {
        b.iter(|| one.install(|| black_box(week.collect().unwrap().passes.len())))
    });
    g.bench_function("7_days_3_stations_all_threads", |b| {
        b.iter(|| black_box(week.collect().unwrap().passes.len()))
    });
    let dir = tempfile::tempdir().unwrap();
    let csv = passbudget::report::files::CsvSink {
        planner: &week,
        dir: dir.path(),
        mode: passbudget::report::WriteMode::Staged,
    };
    g.bench_function("7_days_3_stations_with_csv_files_all_threads", |b| {
        b.iter(|| black_box(week.run(&csv).unwrap().passes.len()))
    });
    g.bench_function("7_days_3_stations_with_tradeoff_all_threads", |b| {
        b.iter(|| black_box(week_tradeoff.collect().unwrap().passes.len()))
    });
    g.measurement_time(Duration::from_secs(30));
    g.bench_function("365_days_3_stations_all_threads", |b| {
        b.iter(|| black_box(year.collect().unwrap().passes.len()))
    });
    g.finish();
}

criterion_group!(benches, bench_plan);
criterion_main!(benches);

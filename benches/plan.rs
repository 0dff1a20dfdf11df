//! Criterion benchmarks of the pass-by-pass plan on the shipped example (invented satellite
//! WRENLET-1 over three invented stations, 1 s steps, clear sky plus the 1 % rain case):
//! a 7-day plan on one core and on every core, and a 365-day plan.

use criterion::{criterion_group, criterion_main, Criterion};
use passbudget::config::mission::Mission;
use passbudget::plan::prepare::{
    availability_weather, rate_set, station_model, RateSet, StationModel,
};
use passbudget::plan::{run, PassSeries, PlanInput};
use std::hint::black_box;
use std::path::PathBuf;
use std::time::Duration;

struct Setup {
    mission: Mission,
    elements: passbudget::orbit::ElementSet,
    stations: Vec<StationModel>,
    rates: RateSet,
}

fn setup() -> Setup {
    let path = PathBuf::from(env!("CARGO_MANIFEST_DIR")).join("examples/wrenlet-1.yaml");
    let mission = Mission::load(&path).unwrap();
    let stations: Vec<StationModel> = mission
        .stations
        .iter()
        .map(|s| station_model(&mission, s, None).unwrap())
        .collect();
    let rates = rate_set(&mission, &stations[0].link).unwrap();
    let elements = passbudget::orbit::load_elements(&mission.elements_path)
        .unwrap()
        .remove(0);
    Setup {
        mission,
        elements,
        stations,
        rates,
    }
}

fn plan_days(s: &Setup, days: f64) -> usize {
    let start = s.mission.start.unwrap();
    let rain = availability_weather(s.mission.exceedance_percent, &s.stations).unwrap();
    let input = PlanInput {
        elements: &s.elements,
        stations: &s.stations,
        rates: &s.rates,
        start,
        end: passbudget::timefmt::add_seconds(&start, days * 86400.0),
        step_s: 1.0,
        rain,
        frequency_hz: 8212.5e6,
    };
    let sink = |_: &PassSeries| -> Result<(), String> { Ok(()) };
    run(&input, &sink, &|_| {}).unwrap().passes.len()
}

fn bench_plan(c: &mut Criterion) {
    let s = setup();
    let one = rayon::ThreadPoolBuilder::new()
        .num_threads(1)
        .build()
        .unwrap();
    let mut g = c.benchmark_group("plan");
    g.sample_size(10).measurement_time(Duration::from_secs(8));
    g.bench_function("7_days_3_stations_1_thread", |b| {
        b.iter(|| one.install(|| black_box(plan_days(&s, 7.0))))
    });
    g.bench_function("7_days_3_stations_all_threads", |b| {
        b.iter(|| black_box(plan_days(&s, 7.0)))
    });
    g.measurement_time(Duration::from_secs(30));
    g.bench_function("365_days_3_stations_all_threads", |b| {
        b.iter(|| black_box(plan_days(&s, 365.0)))
    });
    g.finish();
}

criterion_group!(benches, bench_plan);
criterion_main!(benches);

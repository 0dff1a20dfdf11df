//! Pass-search benchmarks: one LEO over one station for 30 days, the same at 61.2 N for 365 days
//! (the side-by-side case of README "Performance"), and 100 LEO satellites (the invented
//! WRENLET-1 elements with RAAN and mean anomaly varied) over 3 invented stations for 7 days.
//! Small sample sizes so the run stays under a minute.

use std::hint::black_box;
use std::path::Path;
use std::time::Duration;

use criterion::{criterion_group, criterion_main, Criterion};
use passbudget::geometry::{find_passes, HorizonMask, Observer};
use passbudget::orbit::{load_elements, ElementSet, Propagator};
use passbudget::timefmt::{add_seconds, utc};

fn base() -> ElementSet {
    load_elements(Path::new("examples/sat.tle"))
        .unwrap()
        .remove(0)
}

fn bench(c: &mut Criterion) {
    let t0 = utc(2026, 12, 1, 12, 0, 0);
    let mask = HorizonMask::flat(5.0).unwrap();
    let stations = [
        Observer::new(45.5, -120.3, 600.0).unwrap(),
        Observer::new(-33.7, 18.9, 150.0).unwrap(),
        Observer::new(67.2, 20.1, 400.0).unwrap(),
    ];
    let prop = Propagator::new(&base()).unwrap();
    let mut g = c.benchmark_group("passes");
    g.sample_size(10)
        .warm_up_time(Duration::from_millis(500))
        .measurement_time(Duration::from_secs(3));
    g.bench_function("1 LEO x 1 station x 30 days", |b| {
        b.iter(|| {
            let r = find_passes(
                &prop,
                &stations[0],
                &mask,
                t0,
                add_seconds(&t0, 30.0 * 86400.0),
            );
            black_box(r.passes.len())
        })
    });
    // A 10,000-point terrain profile (invented: a smooth ridge line plus a 0-2 deg ripple); the
    // mask lookup is a binary search, so this row should stay near the flat-mask row above.
    let dense = HorizonMask::new(
        5.0,
        (0..10_000)
            .map(|i| {
                let az = i as f64 * 0.036;
                let el = 3.0 + 4.0 * (az.to_radians() * 3.0).sin() + (i % 7) as f64 * 0.3;
                [az, el.clamp(0.0, 90.0)]
            })
            .collect(),
    )
    .unwrap();
    g.bench_function("1 LEO x 1 station x 30 days, 10,000-point mask", |b| {
        b.iter(|| {
            let r = find_passes(
                &prop,
                &stations[0],
                &dense,
                t0,
                add_seconds(&t0, 30.0 * 86400.0),
            );
            black_box(r.passes.len())
        })
    });
    // The invented station Nordkam moved to 61.2 N (as in benches/skyfield_find_events.py).
    let north = Observer::new(61.2, 17.95, 210.0).unwrap();
    g.bench_function("1 LEO x 1 station (61.2 N, mask 5 deg) x 365 days", |b| {
        b.iter(|| {
            let r = find_passes(&prop, &north, &mask, t0, add_seconds(&t0, 365.0 * 86400.0));
            black_box(r.passes.len())
        })
    });
    let props: Vec<Propagator> = (0..100)
        .map(|i| {
            let mut set = base();
            set.elements.right_ascension = (set.elements.right_ascension + 3.6 * i as f64) % 360.0;
            set.elements.mean_anomaly = (set.elements.mean_anomaly + 37.0 * i as f64) % 360.0;
            Propagator::new(&set).unwrap()
        })
        .collect();
    g.sample_size(10).measurement_time(Duration::from_secs(8));
    g.bench_function("100 LEO x 3 stations x 7 days", |b| {
        b.iter(|| {
            let mut n = 0;
            for p in &props {
                for s in &stations {
                    n += find_passes(p, s, &mask, t0, add_seconds(&t0, 7.0 * 86400.0))
                        .passes
                        .len();
                }
            }
            black_box(n)
        })
    });
    g.finish();
    // Propagations per satellite-day for the report.
    let year = find_passes(&prop, &north, &mask, t0, add_seconds(&t0, 365.0 * 86400.0));
    println!(
        "1 LEO x 1 station (61.2 N, mask 5 deg) x 365 days: {} passes, {:.0} propagations per satellite-day",
        year.passes.len(),
        year.propagations as f64 / 365.0
    );
    let mut total = 0u64;
    for p in &props {
        for s in &stations {
            total += find_passes(p, s, &mask, t0, add_seconds(&t0, 7.0 * 86400.0)).propagations;
        }
    }
    println!(
        "100 LEO x 3 stations x 7 days: {:.0} propagations per satellite-station-day",
        total as f64 / (100.0 * 3.0 * 7.0)
    );
}

criterion_group!(benches, bench);
criterion_main!(benches);

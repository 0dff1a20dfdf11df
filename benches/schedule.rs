//! Scheduler benchmark: an invented fleet of 20 low-orbit satellites over 10 antennas for
//! 7 days (about 7,000 candidate contacts of 5 to 12 min, overlapping on antennas and
//! satellites; generator in tests/suite/common/schedule_gen.rs). Prints the instance size,
//! the achieved delivery and the bound's gap once, then times `schedule`.

use std::hint::black_box;
use std::time::Duration;

use criterion::{criterion_group, criterion_main, Criterion};
use passbudget::schedule::{schedule, schedule_with, ScheduleOptions};

#[path = "../tests/suite/common/schedule_gen.rs"]
#[allow(dead_code)]
mod schedule_gen;

fn bench(c: &mut Criterion) {
    let problem = schedule_gen::fleet_instance(2026, 20, 10, 7.0);
    let s = schedule(&problem).unwrap();
    println!(
        "schedule: {} candidates, {} contacts, method {:?}, delivered {:.4e} bit, weighted {:.4e}, bound {:.4e} bit (gap {:.2} %, {:?}), weighted bound {:.4e} (gap {:.2} %, {:?})",
        problem.candidates.len(),
        s.contacts.len(),
        s.method,
        s.delivered_bits,
        s.weighted_delivered,
        s.bound.delivered_upper_bits,
        100.0 * s.bound.gap,
        s.bound.delivered_method,
        s.bound.weighted_upper,
        100.0 * s.bound.weighted_gap,
        s.bound.weighted_method,
    );
    if std::env::var_os("SCHEDULE_BENCH_LP").is_some() {
        let t = std::time::Instant::now();
        let full = schedule_with(
            &problem,
            &ScheduleOptions {
                lp_max_variables: usize::MAX,
            },
        )
        .unwrap();
        println!("with the LP bound ({:.1} s): bound {:.4e} bit (gap {:.2} %, {:?}), weighted gap {:.2} %", t.elapsed().as_secs_f64(), full.bound.delivered_upper_bits, 100.0 * full.bound.gap, full.bound.delivered_method, 100.0 * full.bound.weighted_gap);
    }
    let mut g = c.benchmark_group("schedule");
    g.sample_size(10)
        .warm_up_time(Duration::from_millis(500))
        .measurement_time(Duration::from_secs(5));
    g.bench_function("20 satellites x 10 antennas x 7 days", |b| {
        b.iter(|| black_box(schedule(black_box(&problem)).unwrap()))
    });
    g.finish();
}

criterion_group!(benches, bench);
criterion_main!(benches);

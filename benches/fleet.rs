//! Criterion benchmark of the contact plan at fleet scale: 20 invented LEO satellites over 10
//! invented stations for 7 days (about 7,000 candidate passes), planned and scheduled through
//! the library's `FleetPlanner`, as `passbudget plan` does for a fleet mission.
//!
//! The scenario is written to `target/fleet-scale/` (`fleet.yaml`, its TLE and station files), so
//! the same run can be timed as a whole process:
//!
//! ```text
//! cargo bench --bench fleet
//! /usr/bin/time -v target/release/passbudget plan target/fleet-scale/fleet.yaml --quiet > /dev/null
//! ```

use criterion::{criterion_group, criterion_main, Criterion};
use passbudget::config::mission::Mission;
use passbudget::plan::fleet::FleetPlanner;
use passbudget::plan::PlanRequest;
use std::fmt::Write as _;
use std::hint::black_box;
use std::path::{Path, PathBuf};
use std::time::Duration;

/// Modulo-10 checksum of a TLE line's first 68 columns (digits count their value, '-' counts 1).
fn checksum(line: &str) -> u32 {
    line.chars()
        .take(68)
        .map(|c| match c {
            '-' => 1,
            c => c.to_digit(10).unwrap_or(0),
        })
        .sum::<u32>()
        % 10
}

/// 20 invented satellites: five sun-synchronous planes of four, 500-600 km.
fn tle() -> String {
    let mut out = String::new();
    for i in 0..20u32 {
        let plane = i / 4;
        let raan = 30.0 + 36.0 * plane as f64;
        let anomaly = 90.0 * (i % 4) as f64 + 11.0 * plane as f64;
        let mean_motion = 15.05 + 0.04 * plane as f64;
        let l1 = format!(
            "1 {:05}U          26335.50000000  .00001100  00000-0  11000-3 0   10",
            99800 + i
        );
        let l2 = format!(
            "2 {:05}  97.5000 {raan:8.4} 0010000  90.0000 {anomaly:8.4} {mean_motion:11.8}  100",
            99800 + i
        );
        let (l1, l2) = (format!("{l1:<68}"), format!("{l2:<68}"));
        let _ = writeln!(
            out,
            "SCALE-{:02}\n{l1}{}\n{l2}{}",
            i + 1,
            checksum(&l1),
            checksum(&l2)
        );
    }
    out
}

/// Ten invented stations around the globe with the radio and climate of the shipped Nordkam.
fn stations(dir: &Path, root: &Path) -> Vec<String> {
    let template = std::fs::read_to_string(root.join("stations/nordkam.yaml")).unwrap();
    let sites = [
        (68.4, 17.9),
        (64.8, -147.7),
        (52.2, 4.4),
        (38.5, -2.3),
        (19.8, -155.5),
        (2.3, 103.0),
        (-25.9, 27.7),
        (-33.1, -70.7),
        (-46.8, -67.9),
        (-77.8, 166.7),
    ];
    let mut names = Vec::new();
    for (k, (lat, lon)) in sites.iter().enumerate() {
        let text = template
            .replace("name: Nordkam", &format!("name: Scale Station {}", k + 1))
            .replace("latitude_deg: 68.40", &format!("latitude_deg: {lat}"))
            .replace("longitude_deg: 17.95", &format!("longitude_deg: {lon}"));
        let file = format!("station-{}.yaml", k + 1);
        std::fs::write(dir.join(&file), text).unwrap();
        names.push(file);
    }
    names
}

/// The mission: the shipped example's radio for every satellite, each with a store.
fn write_scenario(root: &Path) -> PathBuf {
    let dir = root.join("target/fleet-scale");
    std::fs::create_dir_all(&dir).unwrap();
    std::fs::write(dir.join("scale.tle"), tle()).unwrap();
    let example = std::fs::read_to_string(root.join("examples/wrenlet-1.yaml")).unwrap();
    let radio = &example[example.find("transmitter:").unwrap()..];
    let mut m = String::from("name: Fleet scale benchmark (invented)\nsatellites:\n");
    for i in 1..=20 {
        let _ = write!(
            m,
            "  - name: SCALE-{i:02}\n    elements: scale.tle\n    select: SCALE-{i:02}\n    onboard: {{ storage_bits: 1.0e12, generation_bps: 8.0e6 }}\n"
        );
    }
    m.push_str("stations:\n");
    for s in stations(&dir, root) {
        let _ = writeln!(m, "  - {s}");
    }
    m.push_str("window:\n  start: 2026-12-01T12:00:00Z\n  days: 7\nplanning:\n  step_s: 1\n");
    m.push_str(radio);
    let path = dir.join("fleet.yaml");
    std::fs::write(&path, m).unwrap();
    path
}

fn bench_fleet(c: &mut Criterion) {
    let root = PathBuf::from(env!("CARGO_MANIFEST_DIR"));
    let mission = Mission::load(&write_scenario(&root)).unwrap();
    let fleet = FleetPlanner::new(&mission, &PlanRequest::default()).unwrap();
    let (plans, contacts) = fleet.run().unwrap();
    let passes: usize = plans.iter().map(|p| p.passes.len()).sum();
    eprintln!(
        "fleet scale: {passes} passes, {} candidates, {} contacts booked, scheduler {:.3} s, gap {:.4}",
        contacts.candidates.len(),
        contacts.contact_count(),
        contacts.scheduler_s,
        contacts.schedule.bound.gap
    );
    let mut g = c.benchmark_group("fleet");
    g.sample_size(10).measurement_time(Duration::from_secs(40));
    g.bench_function("20_satellites_10_stations_7_days_plan_and_schedule", |b| {
        b.iter(|| black_box(fleet.run().unwrap().1.contact_count()))
    });
    g.finish();
}

criterion_group!(benches, bench_fleet);
criterion_main!(benches);

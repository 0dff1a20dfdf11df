//! Invented scheduling instances shared by the tests and the schedule benchmark (which
//! includes this file with `#[path]`): a seeded generator (SplitMix64, Steele, Lea & Flood,
//! "Fast splittable pseudorandom number generators", OOPSLA 2014; constants from memory) so
//! every run sees the same instances. Invented data, for exercising the code only.

use passbudget::schedule::{
    Antenna, BookingRules, Candidate, Generation, GenerationWindow, Problem, Satellite,
};

/// SplitMix64.
pub struct Rng(pub u64);

impl Rng {
    pub fn next_u64(&mut self) -> u64 {
        self.0 = self.0.wrapping_add(0x9E37_79B9_7F4A_7C15);
        let mut z = self.0;
        z = (z ^ (z >> 30)).wrapping_mul(0xBF58_476D_1CE4_E5B9);
        z = (z ^ (z >> 27)).wrapping_mul(0x94D0_49BB_1331_11EB);
        z ^ (z >> 31)
    }

    /// Uniform in `[a, b)`.
    pub fn uniform(&mut self, a: f64, b: f64) -> f64 {
        a + (b - a) * ((self.next_u64() >> 11) as f64 / (1u64 << 53) as f64)
    }

    /// Uniform in `0..n`.
    pub fn below(&mut self, n: usize) -> usize {
        (self.next_u64() % n as u64) as usize
    }

    pub fn chance(&mut self, p: f64) -> bool {
        self.uniform(0.0, 1.0) < p
    }
}

fn generation(rng: &mut Rng, window_s: f64, mean_bps: f64) -> Generation {
    if rng.chance(0.5) {
        return Generation::AverageBps(mean_bps);
    }
    // Imaging windows: a burst every "orbit" of window/6 at 4x the mean over a quarter of it.
    let period = window_s / 6.0;
    let windows = (0..6)
        .map(|k| {
            let start_s = k as f64 * period + rng.uniform(0.0, 0.5 * period);
            GenerationWindow {
                start_s,
                end_s: start_s + 0.25 * period,
                rate_bps: 4.0 * mean_bps,
            }
        })
        .collect();
    Generation::Windows(windows)
}

/// A small instance for exhaustive search: `n_cands` candidates over a 4000 s window, 1 to 3
/// antennas and satellites (or exactly the counts given), turnarounds, rules, tight stores.
pub fn small_instance(rng: &mut Rng, n_cands: usize, n_sats: usize, n_antennas: usize) -> Problem {
    let window_s = 4000.0;
    let satellites = (0..n_sats)
        .map(|s| {
            let capacity_bits = rng.uniform(1.0e8, 2.0e9);
            Satellite {
                name: format!("sat-{s}"),
                priority_weight: rng.uniform(0.5, 3.0),
                capacity_bits,
                initial_fill_bits: rng.uniform(0.0, capacity_bits),
                generation: {
                    let mean_bps = rng.uniform(0.0, 1.0e6);
                    generation(rng, window_s, mean_bps)
                },
                max_downlinks: 1 + rng.below(2),
            }
        })
        .collect();
    let antennas = (0..n_antennas)
        .map(|a| Antenna {
            name: format!("ant-{a}"),
            station: format!("st-{}", a / 2),
            turnaround_s: rng.uniform(0.0, 90.0),
            rules: BookingRules {
                min_contact_s: if rng.chance(0.5) {
                    rng.uniform(0.0, 150.0)
                } else {
                    0.0
                },
                min_peak_elevation_deg: rng.uniform(0.0, 12.0),
                blocked: if rng.chance(0.3) {
                    let s = rng.uniform(0.0, 3600.0);
                    vec![(s, s + rng.uniform(50.0, 400.0))]
                } else {
                    Vec::new()
                },
            },
        })
        .collect();
    let candidates = (0..n_cands)
        .map(|i| {
            let start_s = rng.uniform(0.0, 3500.0);
            Candidate {
                satellite: rng.below(n_sats),
                antenna: rng.below(n_antennas),
                start_s,
                end_s: (start_s + rng.uniform(120.0, 700.0)).min(window_s),
                rate_bps: rng.uniform(1.0e6, 8.0e6),
                duty: rng.uniform(0.5, 1.0),
                peak_elevation_deg: rng.uniform(3.0, 90.0),
                pass_ref: 1000 + i,
            }
        })
        .collect();
    Problem {
        window_s,
        satellites,
        antennas,
        candidates,
    }
}

/// A fleet instance: `n_sats` low-orbit satellites over `n_antennas` antennas for `days`
/// days. Each satellite circles every ~96 min; on each orbit an antenna sees it with
/// probability 1/3, for 5 to 12 min; X-band rates of 50 to 300 Mbit/s; stores of 200 to
/// 800 Gbit filled by 10 to 40 Mbit/s on average; turnarounds of 1 to 3 min; one 2-hour
/// maintenance block per antenna and day; 60 s minimum contacts; 5 to 10 deg minimum peaks.
pub fn fleet_instance(seed: u64, n_sats: usize, n_antennas: usize, days: f64) -> Problem {
    let mut rng = Rng(seed);
    let window_s = days * 86_400.0;
    let satellites: Vec<Satellite> = (0..n_sats)
        .map(|s| {
            let capacity_bits = rng.uniform(2.0e11, 8.0e11);
            Satellite {
                name: format!("fleet-{s:02}"),
                priority_weight: [1.0, 1.0, 2.0, 0.5][s % 4],
                capacity_bits,
                initial_fill_bits: rng.uniform(0.0, 0.5) * capacity_bits,
                generation: {
                    let mean_bps = rng.uniform(1.0e7, 4.0e7);
                    generation(&mut rng, window_s, mean_bps)
                },
                max_downlinks: 1 + usize::from(s % 5 == 0),
            }
        })
        .collect();
    let antennas: Vec<Antenna> = (0..n_antennas)
        .map(|a| Antenna {
            name: format!("dish-{a:02}"),
            station: format!("site-{:02}", a / 2),
            turnaround_s: rng.uniform(60.0, 180.0),
            rules: BookingRules {
                min_contact_s: 60.0,
                min_peak_elevation_deg: rng.uniform(5.0, 10.0),
                blocked: (0..days.ceil() as usize)
                    .map(|d| {
                        let s = d as f64 * 86_400.0 + rng.uniform(0.0, 79_200.0);
                        (s, s + 7200.0)
                    })
                    .collect(),
            },
        })
        .collect();
    let mut candidates = Vec::new();
    for s in 0..n_sats {
        let period_s = rng.uniform(5600.0, 5900.0);
        for a in 0..n_antennas {
            let mut t = rng.uniform(0.0, period_s);
            while t < window_s {
                if rng.chance(1.0 / 3.0) {
                    let len = rng.uniform(300.0, 720.0);
                    let start_s = t + rng.uniform(0.0, 600.0);
                    if start_s + len <= window_s {
                        candidates.push(Candidate {
                            satellite: s,
                            antenna: a,
                            start_s,
                            end_s: start_s + len,
                            rate_bps: rng.uniform(5.0e7, 3.0e8),
                            duty: rng.uniform(0.7, 1.0),
                            peak_elevation_deg: rng.uniform(2.0, 89.0),
                            pass_ref: candidates.len(),
                        });
                    }
                }
                t += period_s;
            }
        }
    }
    Problem {
        window_s,
        satellites,
        antennas,
        candidates,
    }
}

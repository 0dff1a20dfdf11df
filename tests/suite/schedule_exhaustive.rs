//! The contact scheduler against exhaustive search on small random instances, independent
//! constraint checks on large ones, determinism, and bad input.
//!
//! The store is re-simulated here by separate code (a fluid queue in closed form between
//! events: the textbook fluid model of a finite buffer, common practice), so a flaw in the
//! library's own simulation shows as a mismatch.

use passbudget::schedule::{
    bookable_spans, decision_space, schedule, Candidate, Generation, GenerationWindow, Method,
    NotBooked, Problem, Schedule, ScheduleError, Trim,
};

use crate::common::schedule_gen::{fleet_instance, small_instance, Rng};

/// A booked contact as the checks see it.
#[derive(Debug, Clone, Copy)]
struct Booking {
    cand: usize,
    x: f64,
    y: f64,
}

/// Independent simulation result.
struct Sim {
    volumes: Vec<f64>,
    delivered: Vec<f64>,
    lost: Vec<f64>,
    final_fill: Vec<f64>,
    min_fill: f64,
    max_over_capacity: f64,
}

fn gen_rate(g: &Generation, t: f64) -> f64 {
    match g {
        Generation::AverageBps(r) => *r,
        Generation::Windows(ws) => ws
            .iter()
            .find(|w| w.start_s <= t && t < w.end_s)
            .map_or(0.0, |w| w.rate_bps),
    }
}

fn simulate(p: &Problem, books: &[Booking]) -> Sim {
    let n = p.satellites.len();
    let mut sim = Sim {
        volumes: vec![0.0; books.len()],
        delivered: vec![0.0; n],
        lost: vec![0.0; n],
        final_fill: vec![0.0; n],
        min_fill: 0.0,
        max_over_capacity: f64::NEG_INFINITY,
    };
    for (s, sat) in p.satellites.iter().enumerate() {
        let mine: Vec<usize> = (0..books.len())
            .filter(|&k| p.candidates[books[k].cand].satellite == s)
            .collect();
        let mut cuts: Vec<f64> = vec![0.0, p.window_s];
        cuts.extend(mine.iter().flat_map(|&k| [books[k].x, books[k].y]));
        if let Generation::Windows(ws) = &sat.generation {
            cuts.extend(ws.iter().flat_map(|w| [w.start_s, w.end_s]));
        }
        cuts.retain(|&t| (0.0..=p.window_s).contains(&t));
        cuts.sort_by(f64::total_cmp);
        cuts.dedup();
        let mut fill = sat.initial_fill_bits;
        for w in cuts.windows(2) {
            let (t0, t1) = (w[0], w[1]);
            let mid = 0.5 * (t0 + t1);
            let running: Vec<usize> = mine
                .iter()
                .copied()
                .filter(|&k| books[k].x <= mid && mid < books[k].y)
                .collect();
            let drain: f64 = running.iter().map(|&k| q(p, books[k].cand)).sum();
            let g = gen_rate(&sat.generation, mid);
            let dt = t1 - t0;
            // Fill without limits, then the limits: loss at the top, starvation at zero.
            let (out, lost, end_fill) = if g >= drain {
                let free_fill = fill + (g - drain) * dt;
                let lost = (free_fill - sat.capacity_bits).max(0.0);
                (drain * dt, lost, free_fill - lost)
            } else {
                let t_empty = fill / (drain - g);
                if t_empty >= dt {
                    (drain * dt, 0.0, fill - (drain - g) * dt)
                } else {
                    (drain * t_empty + g * (dt - t_empty), 0.0, 0.0)
                }
            };
            for &k in &running {
                sim.volumes[k] += out * q(p, books[k].cand) / drain;
            }
            sim.delivered[s] += out;
            sim.lost[s] += lost;
            fill = end_fill;
            sim.min_fill = sim.min_fill.min(fill);
            sim.max_over_capacity = sim.max_over_capacity.max(fill - sat.capacity_bits);
        }
        sim.final_fill[s] = fill;
    }
    sim
}

fn generated(g: &Generation, until_s: f64) -> f64 {
    match g {
        Generation::AverageBps(r) => r * until_s,
        Generation::Windows(ws) => ws
            .iter()
            .map(|w| w.rate_bps * (w.end_s.min(until_s) - w.start_s).max(0.0))
            .sum(),
    }
}

fn q(p: &Problem, c: usize) -> f64 {
    p.candidates[c].rate_bps * p.candidates[c].duty
}

fn weighted(p: &Problem, sim: &Sim) -> f64 {
    p.satellites
        .iter()
        .zip(&sim.delivered)
        .map(|(s, d)| s.priority_weight * d)
        .sum()
}

fn overlaps_open(a: (f64, f64), b: (f64, f64), tol: f64) -> bool {
    a.0 < b.1 - tol && b.0 < a.1 - tol
}

/// Every constraint of the model, checked from the definitions (not from the library's
/// decision space).
fn check_feasible(p: &Problem, books: &[Booking]) -> Result<(), String> {
    let tol = 1e-6;
    let mut used = vec![false; p.candidates.len()];
    for b in books {
        let c = &p.candidates[b.cand];
        let a = &p.antennas[c.antenna];
        if std::mem::replace(&mut used[b.cand], true) {
            return Err(format!("candidate {} booked twice", b.cand));
        }
        if b.x < c.start_s - tol
            || b.y > c.end_s + tol
            || b.y - b.x < a.rules.min_contact_s - tol
            || b.y <= b.x
        {
            return Err(format!(
                "candidate {} booked {}..{} outside its span or too short",
                b.cand, b.x, b.y
            ));
        }
        if c.peak_elevation_deg < a.rules.min_peak_elevation_deg {
            return Err(format!(
                "candidate {} peaks below the antenna minimum",
                b.cand
            ));
        }
        if a.rules
            .blocked
            .iter()
            .any(|&blk| overlaps_open((b.x - a.turnaround_s, b.y), blk, tol))
        {
            return Err(format!(
                "candidate {} or its set-up overlaps a blocked period",
                b.cand
            ));
        }
    }
    for (i, bi) in books.iter().enumerate() {
        let (ci, ai) = (
            &p.candidates[bi.cand],
            &p.antennas[p.candidates[bi.cand].antenna],
        );
        for bj in &books[i + 1..] {
            let cj = &p.candidates[bj.cand];
            if ci.antenna == cj.antenna {
                let (first, second) = if bi.x <= bj.x { (bi, bj) } else { (bj, bi) };
                if second.x - ai.turnaround_s < first.y - tol {
                    return Err(format!(
                        "antenna {}: {}..{} and {}..{} closer than the turnaround",
                        ci.antenna, first.x, first.y, second.x, second.y
                    ));
                }
            }
        }
        // Concurrency at each contact start (the count only rises at starts).
        let running = books
            .iter()
            .filter(|bj| {
                p.candidates[bj.cand].satellite == ci.satellite
                    && bj.x <= bi.x + tol
                    && bi.x < bj.y - tol
            })
            .count();
        if running > p.satellites[ci.satellite].max_downlinks {
            return Err(format!(
                "satellite {}: {running} downlinks at {}",
                ci.satellite, bi.x
            ));
        }
    }
    Ok(())
}

/// Exhaustive search over the decision space: each candidate unbooked or booked on one of its
/// trims, infeasible partial choices pruned, and branch and bound: a branch is cut when its
/// value so far plus the full-rate volume of every candidate still open cannot beat `start`
/// (a feasible value found elsewhere). The cut is safe because one more contact raises the
/// total delivered by at most its own full-rate volume (a fluid buffer is non-expansive in
/// its service, common practice). Returns the best weighted value (at least `start`), or
/// `None` when the search visits more than `NODE_LIMIT` nodes (the instance is then skipped).
fn exhaustive(p: &Problem, start: f64) -> Option<f64> {
    let spans = bookable_spans(p);
    let mut trims: Vec<Vec<Trim>> = decision_space(p, &spans)
        .into_iter()
        .filter(|t| !t.is_empty())
        .collect();
    let sat_of = |t: &[Trim]| p.candidates[t[0].cand].satellite;
    let potential = |t: &[Trim]| -> f64 {
        t.iter()
            .map(|t| q(p, t.cand) * (t.y_s - t.x_s))
            .fold(0.0, f64::max)
    };
    let weight = |t: &[Trim]| p.satellites[sat_of(t)].priority_weight;
    trims.sort_by(|a, b| {
        (weight(b) * potential(b))
            .total_cmp(&(weight(a) * potential(a)))
            .then(a[0].cand.cmp(&b[0].cand))
    });
    let n_sats = p.satellites.len();
    let mut tail: Vec<Vec<f64>> = vec![vec![0.0; n_sats]; trims.len() + 1];
    for i in (0..trims.len()).rev() {
        tail[i] = tail[i + 1].clone();
        tail[i][sat_of(&trims[i])] += potential(&trims[i]);
    }
    // All the data a satellite could ever deliver: initial fill plus generation.
    let data: Vec<f64> = p
        .satellites
        .iter()
        .map(|s| s.initial_fill_bits + generated(&s.generation, p.window_s))
        .collect();
    let mut state = Search {
        p,
        trims: &trims,
        tail: &tail,
        data: &data,
        chosen: Vec::new(),
        best: start,
        nodes: 0,
    };
    state.go(0, &vec![0.0; n_sats]);
    (state.nodes <= NODE_LIMIT).then_some(state.best)
}

const NODE_LIMIT: u64 = 250_000;

struct Search<'a> {
    p: &'a Problem,
    trims: &'a [Vec<Trim>],
    tail: &'a [Vec<f64>],
    data: &'a [f64],
    chosen: Vec<Booking>,
    best: f64,
    nodes: u64,
}

impl Search<'_> {
    fn go(&mut self, i: usize, delivered: &[f64]) {
        self.nodes += 1;
        let sats = &self.p.satellites;
        let value: f64 = sats
            .iter()
            .zip(delivered)
            .map(|(s, d)| s.priority_weight * d)
            .sum();
        self.best = self.best.max(value);
        let optimistic: f64 = (0..sats.len())
            .map(|s| {
                sats[s].priority_weight
                    * (delivered[s] + self.tail[i][s]).min(self.data[s].max(delivered[s]))
            })
            .sum();
        if i == self.trims.len()
            || self.nodes > NODE_LIMIT
            || optimistic <= self.best * (1.0 + 1e-12)
        {
            return;
        }
        for k in 0..self.trims[i].len() {
            let t = self.trims[i][k];
            self.chosen.push(Booking {
                cand: t.cand,
                x: t.x_s,
                y: t.y_s,
            });
            if check_feasible(self.p, &self.chosen).is_ok() {
                let sim = simulate(self.p, &self.chosen);
                self.go(i + 1, &sim.delivered);
            }
            self.chosen.pop();
        }
        self.go(i + 1, delivered);
    }
}

fn bookings(s: &Schedule) -> Vec<Booking> {
    s.contacts
        .iter()
        .map(|c| Booking {
            cand: c.candidate,
            x: c.start_s,
            y: c.end_s,
        })
        .collect()
}

fn is_sequential(p: &Problem) -> bool {
    let spans = bookable_spans(p);
    let ok: Vec<&Candidate> = p
        .candidates
        .iter()
        .zip(&spans)
        .filter(|(_, s)| s.is_ok())
        .map(|(c, _)| c)
        .collect();
    ok.windows(2).all(|w| w[0].antenna == w[1].antenna)
        || (ok.windows(2).all(|w| w[0].satellite == w[1].satellite)
            && ok
                .first()
                .is_none_or(|c| p.satellites[c.satellite].max_downlinks == 1))
}

fn close(a: f64, b: f64, rel: f64) -> bool {
    (a - b).abs() <= rel * a.abs().max(b.abs()).max(1.0)
}

/// Schedule value <= exhaustive optimum <= bound; equality on sequential instances (exact
/// weighted interval scheduling, Kleinberg & Tardos, Algorithm Design, section 6.1, from
/// memory, extended with the store state in the labels).
/// Returns `None` when the instance is too large for the search, else whether it was
/// sequential.
fn compare_one(p: &Problem) -> Option<bool> {
    let s = schedule(p).unwrap();
    let books = bookings(&s);
    check_feasible(p, &books).unwrap();
    let sim = simulate(p, &books);
    assert!(
        close(weighted(p, &sim), s.weighted_delivered, 1e-9),
        "reported value {} vs re-simulated {}",
        s.weighted_delivered,
        weighted(p, &sim)
    );
    let opt = exhaustive(p, weighted(p, &sim))?;
    assert!(
        s.weighted_delivered <= opt * (1.0 + 1e-6) + 1e-6,
        "schedule {} above the exhaustive optimum {opt}",
        s.weighted_delivered
    );
    assert!(
        opt <= s.bound.weighted_upper * (1.0 + 1e-9) + 1e-6,
        "optimum {opt} above the bound {:?}",
        s.bound
    );
    assert!(s.delivered_bits <= s.bound.delivered_upper_bits * (1.0 + 1e-9) + 1e-6);
    let sequential = is_sequential(p);
    if sequential {
        assert_eq!(s.method, Method::Sequential);
        assert!(
            close(s.weighted_delivered, opt, 1e-6),
            "sequential instance: schedule {} vs optimum {opt}\n{p:#?}",
            s.weighted_delivered
        );
    }
    Some(sequential)
}

#[test]
fn small_instances_match_exhaustive_search() {
    let mut rng = Rng(0x5EED_0009);
    let (mut sequential, mut compared, mut with_twelve) = (0, 0, 0);
    for k in 0..200 {
        let (n_sats, n_antennas) = match k % 4 {
            0 => (1 + rng.below(3), 1),
            1 => (1, 1 + rng.below(3)),
            _ => (1 + rng.below(3), 1 + rng.below(3)),
        };
        let n_cands = 4 + rng.below(9);
        let mut p = small_instance(&mut rng, n_cands, n_sats, n_antennas);
        if k % 4 == 1 {
            p.satellites[0].max_downlinks = 1;
        }
        if let Some(seq) = compare_one(&p) {
            compared += 1;
            sequential += usize::from(seq);
            with_twelve += usize::from(n_cands == 12);
        }
    }
    assert!(
        compared >= 120 && sequential >= 60 && with_twelve >= 5,
        "compared {compared}, sequential {sequential}, with 12 candidates {with_twelve}"
    );
}

/// Large instance: every constraint checked independently of the scheduler's own accounting.
fn check_large(p: &Problem, s: &Schedule) {
    let books = bookings(s);
    check_feasible(p, &books).unwrap();
    let sim = simulate(p, &books);
    assert!(sim.min_fill >= -1e-3 && sim.max_over_capacity <= 1e-3);
    for (c, v) in s.contacts.iter().zip(&sim.volumes) {
        let a = &p.antennas[c.antenna];
        assert!((c.setup_start_s - (c.start_s - a.turnaround_s)).abs() < 1e-9);
        assert!(c.volume_bits <= q(p, c.candidate) * (c.end_s - c.start_s) * (1.0 + 1e-9));
        assert!(
            close(c.volume_bits, *v, 1e-6),
            "contact volume {} vs re-simulated {v}",
            c.volume_bits
        );
        assert!(c.volume_bits > 0.0);
    }
    for (k, (sat, o)) in p.satellites.iter().zip(&s.satellites).enumerate() {
        let inflow = sat.initial_fill_bits + o.generated_bits;
        assert!(
            close(
                inflow,
                o.delivered_bits + o.lost_bits + o.final_fill_bits,
                1e-9
            ),
            "satellite {k}: conservation"
        );
        assert!(
            close(o.delivered_bits, sim.delivered[k], 1e-6)
                && close(o.lost_bits, sim.lost[k], 1e-6)
                && close(o.final_fill_bits, sim.final_fill[k], 1e-6)
        );
        assert!(o
            .storage_timeline
            .iter()
            .all(|&(_, f)| f >= -1e-3 && f <= sat.capacity_bits + 1e-3));
        assert!(o.storage_peak_bits <= sat.capacity_bits + 1e-3);
        assert_eq!(
            o.latencies_s.len(),
            s.contacts.iter().filter(|c| c.satellite == k).count()
        );
    }
    let total: f64 = s.contacts.iter().map(|c| c.volume_bits).sum();
    assert!(close(total, s.delivered_bits, 1e-9));
    assert!(
        s.delivered_bits <= s.bound.delivered_upper_bits * (1.0 + 1e-12)
            && s.weighted_delivered <= s.bound.weighted_upper * (1.0 + 1e-12),
        "achieved {} (weighted {}) above the bound {:?}",
        s.delivered_bits,
        s.weighted_delivered,
        s.bound
    );
    let mut seen = vec![0; p.candidates.len()];
    s.contacts.iter().for_each(|c| seen[c.candidate] += 1);
    s.not_booked.iter().for_each(|r| seen[r.candidate] += 1);
    assert!(
        seen.iter().all(|&n| n == 1),
        "every candidate is booked or explained exactly once"
    );
    for r in &s.not_booked {
        let (c, a) = (
            &p.candidates[r.candidate],
            &p.antennas[p.candidates[r.candidate].antenna],
        );
        if r.reason == NotBooked::BelowMinPeakElevation {
            assert!(c.peak_elevation_deg < a.rules.min_peak_elevation_deg);
        }
    }
}

#[test]
fn large_instances_respect_every_constraint() {
    for (seed, sats, antennas, days) in [
        (1u64, 20, 10, 2.0),
        (2, 6, 3, 3.0),
        (3, 1, 8, 4.0),
        (4, 12, 1, 2.0),
    ] {
        let p = fleet_instance(seed, sats, antennas, days);
        assert!(
            p.candidates.len() >= 100,
            "{} candidates",
            p.candidates.len()
        );
        let s = schedule(&p).unwrap();
        check_large(&p, &s);
        assert!(s.contacts.len() > 10);
    }
}

#[test]
fn same_input_same_schedule_and_permutation_maps_back() {
    let p = fleet_instance(7, 8, 4, 1.0);
    let a = schedule(&p).unwrap();
    assert_eq!(a, schedule(&p).unwrap());
    let mut rng = Rng(77);
    let mut order: Vec<usize> = (0..p.candidates.len()).collect();
    for i in (1..order.len()).rev() {
        order.swap(i, rng.below(i + 1));
    }
    let mut permuted = p.clone();
    permuted.candidates = order.iter().map(|&i| p.candidates[i]).collect();
    let b = schedule(&permuted).unwrap();
    let mut mapped: Vec<(usize, f64, f64, f64)> = b
        .contacts
        .iter()
        .map(|c| (order[c.candidate], c.start_s, c.end_s, c.volume_bits))
        .collect();
    mapped.sort_by_key(|x| x.0);
    let mut original: Vec<(usize, f64, f64, f64)> = a
        .contacts
        .iter()
        .map(|c| (c.candidate, c.start_s, c.end_s, c.volume_bits))
        .collect();
    original.sort_by_key(|x| x.0);
    assert_eq!(mapped, original);
    assert_eq!(a.weighted_delivered, b.weighted_delivered);
}

fn bad(p: &Problem) -> ScheduleError {
    schedule(p).unwrap_err()
}

#[test]
fn bad_input_is_a_typed_error() {
    let mut rng = Rng(9);
    let base = small_instance(&mut rng, 6, 2, 2);
    let mut p = base.clone();
    p.satellites[1].capacity_bits = -1.0;
    assert!(
        matches!(bad(&p), ScheduleError::Negative { ref field, .. } if field == "satellites[1].capacity_bits")
    );
    let mut p = base.clone();
    p.satellites[0].initial_fill_bits = p.satellites[0].capacity_bits * 2.0;
    assert!(matches!(
        bad(&p),
        ScheduleError::FillAboveCapacity { satellite: 0, .. }
    ));
    let mut p = base.clone();
    p.satellites[0].max_downlinks = 0;
    assert_eq!(bad(&p), ScheduleError::ZeroDownlinks { satellite: 0 });
    let mut p = base.clone();
    let w = |s, e| GenerationWindow {
        start_s: s,
        end_s: e,
        rate_bps: 1.0,
    };
    p.satellites[0].generation = Generation::Windows(vec![w(0.0, 100.0), w(50.0, 200.0)]);
    assert_eq!(
        bad(&p),
        ScheduleError::GenerationWindows {
            satellite: 0,
            window: 1
        }
    );
    p.satellites[0].generation = Generation::Windows(vec![w(300.0, 100.0)]);
    assert_eq!(
        bad(&p),
        ScheduleError::GenerationWindows {
            satellite: 0,
            window: 0
        }
    );
    p.satellites[0].generation = Generation::AverageBps(f64::NAN);
    assert!(matches!(bad(&p), ScheduleError::NotFinite { .. }));
    let mut p = base.clone();
    p.satellites[0].priority_weight = 0.0;
    assert!(matches!(bad(&p), ScheduleError::NotPositive { .. }));
    let mut p = base.clone();
    p.candidates[3].antenna = 9;
    assert_eq!(
        bad(&p),
        ScheduleError::BadIndex {
            candidate: 3,
            field: "antenna",
            index: 9
        }
    );
    let mut p = base.clone();
    p.candidates[2].end_s = p.candidates[2].start_s;
    assert!(matches!(bad(&p), ScheduleError::Span { candidate: 2, .. }));
    let mut p = base.clone();
    p.candidates[2].duty = 0.0;
    assert!(matches!(bad(&p), ScheduleError::Duty { .. }));
    let mut p = base.clone();
    p.antennas[1].rules.blocked = vec![(10.0, 5.0)];
    assert_eq!(
        bad(&p),
        ScheduleError::BlockedPeriod {
            antenna: 1,
            period: 0
        }
    );
    let mut p = base;
    p.antennas[0].turnaround_s = f64::INFINITY;
    assert!(matches!(bad(&p), ScheduleError::NotFinite { .. }));
}

//! The contact schedule: which antenna takes which contact, for how long, to maximize the
//! priority-weighted data delivered, with the data on board followed through the window.
//!
//! Pure library code: no configuration, no I/O, no clock (the caller times [`schedule`]).
//!
//! # Model
//!
//! Time is seconds from the window start `0` to [`Problem::window_s`]. A [`Candidate`] is a
//! pass of one satellite over one antenna at a fixed rate; booking it from `x` to `y` inside
//! its span delivers up to `rate_bps * duty * (y - x)` bits (the duty spreads the closed
//! seconds evenly, a fluid approximation). Constraints:
//!
//! * **Booking rules** (applied first, [`bookable_spans`]): a candidate peaking below the
//!   antenna's minimum peak elevation is not bookable; blocked periods clip candidates, and
//!   neither a contact nor its set-up (`turnaround_s` before it) may overlap a block; a
//!   candidate split by a block keeps its **longest** part (the earliest on a tie), which must
//!   last `min_contact_s`. A booked contact, shortened or not, lasts at least `min_contact_s`.
//! * **Antenna**: one contact at a time, and `start >= previous end + turnaround_s` on that
//!   antenna (the set-up start is never before the previous end).
//! * **Satellite**: at most `max_downlinks` contacts at once; each candidate booked at most
//!   once.
//! * **Store** (a fluid FIFO queue, `store.rs`): the fill follows generation minus the
//!   running downlinks' drains; a contact never delivers more than is on board (when the store
//!   is empty the contacts deliver what is generated, shared in proportion to their drains);
//!   generation into a full store is lost, so the data lost is the newest; downlinks send the
//!   oldest data first, which gives the latencies (age of the oldest data on board at each
//!   contact start; the initial fill counts as born at `t = 0`).
//!
//! Objective: maximize `sum_s priority_weight_s * delivered_bits_s`. Ties are broken by index
//! order everywhere; no hash map is iterated, so the result depends only on the input (and
//! not on the order of the candidates except through those ties).
//!
//! # Decision space
//!
//! Contacts start and end at a finite set of trim points ([`decision_space`]): for candidate
//! `c` on antenna `a` with clipped span `[lo, hi]`, starts `X = {lo} ∪ {hi' + turn_a}` and ends
//! `Y = {hi} ∪ {lo' - turn_a}` over the other candidates `c'` on antenna `a`, plus `{hi'}` in
//! `X` and `{lo'}` in `Y` over the candidates of the same satellite on other antennas; then one
//! level of minimum-length chains, `Y += X + min_contact_s` and `X += Y - min_contact_s`
//! (computed from the first sets); all clipped to `[lo, hi]`. A trim is a pair `x < y` from
//! `X x Y` with `y - x >= min_contact_s`.
//!
//! **Why these points suffice (no store limit binding).** Fix which contacts are booked and
//! their order on each antenna and satellite. The starts and ends then solve a linear program
//! whose constraints are differences (`x_d - y_c >= turn`, `y - x >= min`, `lo <= x`,
//! `y <= hi`) and whose objective `sum w q (y - x)` is linear, so an optimum sits at a vertex:
//! each cut is an original span end or is tied to one by a chain of tight constraints. On a
//! single resource (contacts in sequence) the exchange argument is direct: between two
//! consecutive contacts `c`, `d`, if the gap exceeds the turnaround one of them can grow unless
//! both are at their span ends; if it is tight, moving the cut changes the value by
//! `w_c q_c - w_d q_d` per second, so it moves to the better side until `c` reaches its end
//! (`x_d = hi_c + turn`, in `X`), `d` reaches its start (`y_c = lo_d - turn`, in `Y`), or one
//! of them shrinks to the minimum length (one chain level, in the sets). A cut that stops
//! against a contact itself squeezed to minimum length between two others (chain depth two or
//! more) is outside the space; so is a cut at the instant a store empties or fills, which can
//! matter when the store limit binds. Across antennas with several downlinks, cuts can chain
//! through several resources; the space then does not contain every continuous optimum.
//!
//! # Method
//!
//! * **Sequential problems** — every bookable candidate on one antenna, or every one of them
//!   of one satellite with one downlink — are solved by the label sweep (`sweep.rs`), a
//!   dynamic program over the trims sorted by start, as in weighted interval scheduling
//!   (Kleinberg & Tardos, *Algorithm Design*, section 6.1, from memory) but with the store
//!   state carried in the labels. Labels at the same time are compared by a dominance rule:
//!   label `A` dominates `B` if `A`'s antennas are free no later, `A` has used no live
//!   candidate that `B` has not, and `sum_s w_s m_s >= 0`, where `m_s = d_A - d_B` when
//!   `f_A >= f_B` and `m_s = l_B - l_A` otherwise (`d` delivered, `f` fill, `l` lost so far).
//!   Proof: for a fixed continuation, the future delivery `F(f)` of a store is non-decreasing
//!   in its fill and grows by at most the extra fill (`F(f') - F(f) <= f' - f`: extra data is
//!   delivered at most once; a fluid queue is monotone and non-expansive). If `f_A >= f_B`,
//!   `d_A + F(f_A) >= d_B + F(f_B)` when `d_A >= d_B`; otherwise
//!   `d_A + F(f_A) - d_B - F(f_B) >= (d_A + f_A) - (d_B + f_B) = l_B - l_A`, because
//!   `d + f + l` (initial + generated so far) is the same for both. Summing with the weights
//!   gives the rule. So the sweep is **exact over the decision space, store limits
//!   included**, as long as the pool of undominated labels stays under [`SEQUENTIAL_CAP`]
//!   ([`Method::Sequential`]); when the cap drops labels the result is reported as
//!   [`Method::SequentialCapped`] (best-first truncation, not proved optimal).
//! * **Everything else** ([`Method::AntennaRounds`]): block-coordinate ascent over antennas.
//!   In antenna order, the sweep re-plans one antenna with every other antenna's contacts held
//!   fixed (their drains enter the stores, their downlinks count against `max_downlinks`),
//!   keeping at most [`ROUND_CAP`] labels; the new plan replaces the old only if the total
//!   objective grows, so it never decreases. Rounds repeat until one brings no gain (at most
//!   [`MAX_ROUNDS`]). It is a local optimum for single-antenna moves, not a proved optimum.
//!
//! Contacts that end up delivering nothing (empty store, no generation) are dropped and
//! reported as [`NotBooked::NothingOnBoard`]; a bookable candidate left out is reported as
//! [`NotBooked::LostToOverlap`] when booked contacts take its antenna or its downlinks during
//! its span, else as [`NotBooked::NoGain`].
//!
//! # Bound
//!
//! [`ScheduleBound`] holds two bounds over **all** feasible schedules (continuous trims, not
//! only the decision space): `weighted_upper` on `sum_s w_s delivered_s` (the objective), and
//! `delivered_upper_bits` on `sum_s delivered_s` (the same relaxation with every weight 1);
//! each gap is `(bound - achieved) / bound`. The delivered gap mixes two things when the
//! weights differ (the schedule maximizes the weighted sum); the weighted gap is the
//! optimality gap proper. Each bound is the smaller of:
//!
//! * **LP relaxation** (`bound.rs`, solved by the `clarabel` interior-point solver) when it has
//!   at most [`LP_MAX_VARIABLES`] variables: a variable `u` in `[0, 1]` per candidate
//!   and elementary interval between consecutive span ends of all bookable candidates (the
//!   fraction of the interval delivered at full drain), per antenna and interval
//!   `sum u <= 1`, per satellite and interval `sum u <= max_downlinks`, and per satellite a
//!   storage balance over its own span ends `F_k = F_{k-1} + generated_k - out_k - lost_k`,
//!   `0 <= F_k <= capacity`, `lost_k >= 0`. Validity: any feasible schedule gives a feasible
//!   point with the same objective (`u` = delivered / (drain * length) is at most the booked
//!   fraction; the fill and loss of the fluid store at the breakpoints satisfy the balance);
//!   turnarounds, minimum lengths and the "once per candidate" rule are dropped. A relative
//!   margin [`LP_MARGIN`] covers the solver's tolerance.
//! * **Combinatorial** (always): the smaller of the satellite side (each satellite alone with
//!   every bookable candidate booked whole, at most `max_downlinks` at once, its store
//!   simulated: a fluid store delivers at least as much under a larger drain at every instant,
//!   because its fill, hence its loss, is then never higher) and the antenna side
//!   (`sum_a ∫ max over candidates of w_s * drain`), each a relaxation of one family of
//!   constraints; plus a relative margin [`COMBINATORIAL_MARGIN`] for rounding (the
//!   bound is tight when a satellite delivers all its data).
//!
//! # Testing
//!
//! `tests/suite/schedule_exhaustive.rs`: exhaustive search over the decision space on random
//! small instances (schedule <= optimum <= bound, equality on sequential ones), independent
//! constraint checks on large instances, determinism, bad input.

mod bound;
mod model;
mod outcome;
mod space;
mod store;
mod sweep;

pub use bound::{BoundMethod, COMBINATORIAL_MARGIN, LP_MARGIN, LP_MAX_VARIABLES};
pub use model::{
    Antenna, BookingRules, Candidate, Generation, GenerationWindow, Problem, Satellite,
    ScheduleError,
};
pub use outcome::{AntennaOutcome, Contact, SatelliteOutcome};
pub use space::{bookable_spans, decision_space, visit_trims, NotBooked, Trim};

use sweep::{Opt, Sweep};

/// Pool cap of the sequential (exact) sweep.
pub const SEQUENTIAL_CAP: usize = 512;
/// Pool cap of each antenna re-plan in [`Method::AntennaRounds`].
pub const ROUND_CAP: usize = 3;
/// Most rounds over the antennas (on the benchmark fleet a third round adds under 0.1 %).
pub const MAX_ROUNDS: usize = 2;

/// How the schedule was found.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Method {
    /// The label sweep, exact over the decision space.
    Sequential,
    /// The label sweep with the pool cap reached: not proved optimal.
    SequentialCapped,
    /// Antenna-by-antenna re-planning (a heuristic), with the number of rounds run.
    AntennaRounds { rounds: usize },
}

/// A candidate that is not in the schedule, and why.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub struct Rejection {
    pub candidate: usize,
    pub reason: NotBooked,
}

/// Upper bounds and gaps (see the module documentation).
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct ScheduleBound {
    /// Bound on `sum_s priority_weight_s * delivered_bits_s` (weighted bits).
    pub weighted_upper: f64,
    /// `(weighted_upper - weighted achieved) / weighted_upper` (0 when the bound is 0).
    pub weighted_gap: f64,
    pub weighted_method: BoundMethod,
    /// Bound on `sum_s delivered_bits_s`, bits.
    pub delivered_upper_bits: f64,
    /// `(delivered_upper_bits - delivered) / delivered_upper_bits` (0 when the bound is 0).
    pub gap: f64,
    pub delivered_method: BoundMethod,
}

/// The scheduler's answer.
#[derive(Debug, Clone, PartialEq)]
pub struct Schedule {
    /// Booked contacts, sorted by start, then antenna, then candidate.
    pub contacts: Vec<Contact>,
    /// Every candidate not booked, by candidate index.
    pub not_booked: Vec<Rejection>,
    /// Per satellite, in input order.
    pub satellites: Vec<SatelliteOutcome>,
    /// Per antenna, in input order.
    pub antennas: Vec<AntennaOutcome>,
    /// The objective: `sum_s priority_weight_s * delivered_bits_s`.
    pub weighted_delivered: f64,
    /// `sum_s delivered_bits_s` (= the sum of the contacts' volumes).
    pub delivered_bits: f64,
    pub bound: ScheduleBound,
    pub method: Method,
}

fn build_opts(problem: &Problem, spans: &[Result<(f64, f64), NotBooked>]) -> Vec<Opt> {
    // Sized once, from a first pass that only counts: neither the trims in their own form nor
    // a vector grown by doubling is held beside the options (the options are the largest
    // vector of the contact plan, about 20,000 of them in a year's plan).
    let mut count = 0;
    visit_trims(problem, spans, |_| count += 1);
    let mut opts: Vec<Opt> = Vec::with_capacity(count);
    visit_trims(problem, spans, |t| {
        let c = &problem.candidates[t.cand];
        opts.push(Opt::new(
            (t.cand, c.satellite, c.antenna),
            (t.x_s, t.y_s),
            spans[t.cand].map_or(c.end_s, |s| s.1),
        ));
    });
    // Unstable, so no scratch copy: the key (start, end, candidate) is unique (a candidate's
    // trims are distinct pairs, and an option is a function of its candidate and pair), so the
    // order is the stable sort's.
    opts.sort_unstable_by(|a, b| {
        a.x_s
            .total_cmp(&b.x_s)
            .then(a.y_s.total_cmp(&b.y_s))
            .then(a.cand().cmp(&b.cand()))
    });
    opts
}

fn is_sequential(problem: &Problem, opts: &[Opt]) -> bool {
    let one_antenna = opts.windows(2).all(|w| w[0].antenna() == w[1].antenna());
    let one_sat = opts.windows(2).all(|w| w[0].sat() == w[1].sat());
    one_antenna
        || (one_sat
            && opts
                .first()
                .is_none_or(|o| problem.satellites[o.sat()].max_downlinks == 1))
}

/// Steps `(from_s, downlinks running)` of one satellite's fixed contacts.
type CountSteps = Vec<(f64, usize)>;

/// Per satellite, the drain profile and the downlink count profile of `fixed` contacts.
fn fixed_profiles(
    problem: &Problem,
    opts: &[Opt],
    fixed: &[usize],
) -> (Vec<Vec<(f64, f64)>>, Vec<CountSteps>) {
    let n = problem.satellites.len();
    let mut events: Vec<Vec<(f64, i8, f64)>> = vec![Vec::new(); n];
    for &i in fixed {
        let o = &opts[i];
        let q_bps = o.q_bps(problem);
        events[o.sat()].push((o.x_s, 1, q_bps));
        events[o.sat()].push((o.y_s, -1, q_bps));
    }
    let (mut drains, mut counts) = (vec![Vec::new(); n], vec![Vec::new(); n]);
    for s in 0..n {
        events[s].sort_by(|a, b| a.0.total_cmp(&b.0).then(a.1.cmp(&b.1)));
        let (mut q, mut k) = (0.0f64, 0i64);
        for &(t, sign, dq) in &events[s] {
            q = (q + f64::from(sign) * dq).max(0.0);
            k += i64::from(sign);
            let drain: &mut Vec<(f64, f64)> = &mut drains[s];
            let count: &mut Vec<(f64, usize)> = &mut counts[s];
            if drain.last().is_some_and(|p| p.0 == t) {
                drain.pop();
                count.pop();
            }
            drain.push((t, if k == 0 { 0.0 } else { q }));
            count.push((t, k.max(0) as usize));
        }
    }
    (drains, counts)
}

/// Most fixed downlinks of the satellite running at once during `[x, y)`.
fn busiest(count: &[(f64, usize)], x: f64, y: f64) -> usize {
    let first = count.partition_point(|p| p.0 <= x);
    let at_x = if first == 0 { 0 } else { count[first - 1].1 };
    count[first..]
        .iter()
        .take_while(|p| p.0 < y)
        .map(|p| p.1)
        .fold(at_x, usize::max)
}

/// Whether two options book the same pass of one satellite at one station (on two of its
/// antennas): the same satellite and `pass_ref`, antennas of the same station.
fn same_pass(problem: &Problem, opts: &[Opt], i: usize, j: usize) -> bool {
    let (ci, cj) = (
        &problem.candidates[opts[i].cand()],
        &problem.candidates[opts[j].cand()],
    );
    ci.satellite == cj.satellite
        && ci.pass_ref == cj.pass_ref
        && problem.antennas[ci.antenna].station == problem.antennas[cj.antenna].station
}

/// The best selection on antenna `a` with every other antenna's selection held, except the
/// pieces in `released` (other antennas' contacts of a pass antenna `a` also offers): the
/// objective and the chosen options.
fn plan_antenna(
    problem: &Problem,
    opts: &[Opt],
    sel: &[Vec<usize>],
    mine: &[usize],
    a: usize,
    released: &[usize],
) -> (f64, Vec<usize>) {
    let fixed: Vec<usize> = sel
        .iter()
        .enumerate()
        .filter(|(b, _)| *b != a)
        .flat_map(|(_, v)| v.iter().copied())
        .filter(|i| !released.contains(i))
        .collect();
    let (drains, counts) = fixed_profiles(problem, opts, &fixed);
    let local: Vec<usize> = mine
        .iter()
        .copied()
        .filter(|&i| {
            busiest(&counts[opts[i].sat()], opts[i].x_s, opts[i].y_s)
                < problem.satellites[opts[i].sat()].max_downlinks
        })
        .collect();
    let local_opts: Vec<Opt> = local.iter().map(|&i| opts[i]).collect();
    let r = Sweep {
        problem,
        opts: &local_opts,
        profiles: &drains,
        cap: ROUND_CAP,
    }
    .run();
    (r.value, r.chosen.iter().map(|&k| local[k]).collect())
}

/// Re-plans one antenna at a time with the others held, for up to [`MAX_ROUNDS`] rounds. Where a
/// pass is split over two antennas of one station (a piece booked on each), the antenna is also
/// re-planned with the other antennas' pieces of its passes released, so the pass can move whole
/// onto it; the better of the two is kept (as much data in fewer contacts counts as better), and
/// the objective never decreases.
fn antenna_rounds(problem: &Problem, opts: &[Opt]) -> (Vec<usize>, usize) {
    let mut by_antenna: Vec<Vec<usize>> = vec![Vec::new(); problem.antennas.len()];
    for (i, o) in opts.iter().enumerate() {
        by_antenna[o.antenna()].push(i);
    }
    let mut sel: Vec<Vec<usize>> = vec![Vec::new(); problem.antennas.len()];
    let mut best = 0.0f64;
    for round in 1..=MAX_ROUNDS {
        let mut improved = false;
        for a in (0..by_antenna.len()).filter(|&a| !by_antenna[a].is_empty()) {
            let (mut value, mut chosen) = plan_antenna(problem, opts, &sel, &by_antenna[a], a, &[]);
            let released: Vec<usize> = sel
                .iter()
                .enumerate()
                .filter(|(b, _)| *b != a)
                .flat_map(|(_, v)| v.iter().copied())
                .filter(|&j| sel[a].iter().any(|&i| same_pass(problem, opts, i, j)))
                .collect();
            let eps = |x: f64| 1e-12 * x.max(1.0);
            let booked = |chosen: &[usize], dropped: usize| {
                sel.iter().map(Vec::len).sum::<usize>() - sel[a].len() - dropped + chosen.len()
            };
            let mut drop: &[usize] = &[];
            if !released.is_empty() {
                let (v, c) = plan_antenna(problem, opts, &sel, &by_antenna[a], a, &released);
                // More delivered, or as much in fewer contacts (one pass on one antenna, not
                // split over two with two set-ups).
                let fewer = booked(&c, released.len()) < booked(&chosen, 0);
                if v > value + eps(value) || (v >= value - eps(value) && fewer) {
                    (value, chosen, drop) = (v, c, &released);
                }
            }
            let fewer = booked(&chosen, drop.len()) < booked(&sel[a], 0);
            if value > best + eps(best) || (value >= best - eps(best) && fewer) {
                for v in sel.iter_mut() {
                    v.retain(|i| !drop.contains(i));
                }
                sel[a] = chosen;
                best = value;
                improved = true;
            }
        }
        if !improved {
            return (sel.concat(), round);
        }
    }
    (sel.concat(), MAX_ROUNDS)
}

fn gap(upper: f64, achieved: f64) -> f64 {
    if upper > 0.0 {
        ((upper - achieved) / upper).max(0.0)
    } else {
        0.0
    }
}

fn bounds(
    problem: &Problem,
    spans: Vec<Result<(f64, f64), NotBooked>>,
    weighted: f64,
    delivered: f64,
    lp_max: usize,
) -> ScheduleBound {
    let ok: Vec<(usize, (f64, f64))> = spans
        .iter()
        .enumerate()
        .filter_map(|(i, s)| s.ok().map(|s| (i, s)))
        .collect();
    drop(spans);
    let weights: Vec<f64> = problem
        .satellites
        .iter()
        .map(|s| s.priority_weight)
        .collect();
    let (weighted_upper, weighted_method) = bound::upper_bound(problem, &ok, &weights, lp_max);
    let (delivered_upper_bits, delivered_method) = if weights.iter().all(|&w| w == 1.0) {
        (weighted_upper, weighted_method)
    } else {
        bound::upper_bound(problem, &ok, &vec![1.0; weights.len()], lp_max)
    };
    ScheduleBound {
        weighted_upper,
        weighted_gap: gap(weighted_upper, weighted),
        weighted_method,
        delivered_upper_bits,
        gap: gap(delivered_upper_bits, delivered),
        delivered_method,
    }
}

/// Tuning of [`schedule_with`].
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub struct ScheduleOptions {
    /// Largest LP relaxation (in variables) solved for the bound; larger ones use only the
    /// combinatorial bound. Default [`LP_MAX_VARIABLES`].
    pub lp_max_variables: usize,
}

impl Default for ScheduleOptions {
    fn default() -> Self {
        ScheduleOptions {
            lp_max_variables: LP_MAX_VARIABLES,
        }
    }
}

/// Chooses the contacts with the default options. See the module documentation for the
/// model, the method and what is exact.
pub fn schedule(problem: &Problem) -> Result<Schedule, ScheduleError> {
    schedule_with(problem, &ScheduleOptions::default())
}

/// Chooses the contacts.
pub fn schedule_with(
    problem: &Problem,
    options: &ScheduleOptions,
) -> Result<Schedule, ScheduleError> {
    model::validate(problem)?;
    let spans = bookable_spans(problem);
    let opts = build_opts(problem, &spans);
    // Made again for the rejections and the bound (one pass over the candidates): not held
    // through the sweep and the evaluation (24 bytes a candidate).
    drop(spans);
    let (chosen, method) = if is_sequential(problem, &opts) {
        let r = Sweep {
            problem,
            opts: &opts,
            profiles: &vec![Vec::new(); problem.satellites.len()],
            cap: SEQUENTIAL_CAP,
        }
        .run();
        (
            r.chosen,
            if r.capped {
                Method::SequentialCapped
            } else {
                Method::Sequential
            },
        )
    } else {
        let (chosen, rounds) = antenna_rounds(problem, &opts);
        (chosen, Method::AntennaRounds { rounds })
    };
    // Only the booked trims, in the order chosen: the others are done with before the
    // evaluation allocates its own (a year's plan books a third of its trims).
    let mut booked: Vec<Opt> = chosen.iter().map(|&i| opts[i]).collect();
    drop((opts, chosen));
    let (mut contacts, mut sats, mut antennas) = outcome::evaluate(problem, &booked);
    let empty: Vec<usize> = contacts
        .iter()
        .filter(|c| {
            c.volume_bits <= 1e-9 * problem.candidates[c.candidate].rate_bps * (c.end_s - c.start_s)
        })
        .map(|c| c.candidate)
        .collect();
    let mut is_empty = vec![false; problem.candidates.len()];
    for &c in &empty {
        is_empty[c] = true;
    }
    if !empty.is_empty() {
        booked.retain(|o| !is_empty[o.cand()]);
        (contacts, sats, antennas) = outcome::evaluate(problem, &booked);
    }
    drop(booked);
    let spans = bookable_spans(problem);
    let not_booked = rejections(problem, &spans, &contacts, &is_empty);
    let weighted_delivered = problem
        .satellites
        .iter()
        .zip(&sats)
        .map(|(s, o)| s.priority_weight * o.delivered_bits)
        .sum();
    let delivered_bits = sats.iter().map(|o| o.delivered_bits).sum();
    let bound = bounds(
        problem,
        spans,
        weighted_delivered,
        delivered_bits,
        options.lp_max_variables,
    );
    Ok(Schedule {
        contacts,
        not_booked,
        satellites: sats,
        antennas,
        weighted_delivered,
        delivered_bits,
        bound,
        method,
    })
}

/// Whether candidate `i`'s whole clipped span `(lo, hi)` is free of the booked contacts.
fn span_is_free(problem: &Problem, i: usize, (lo, hi): (f64, f64), contacts: &[Contact]) -> bool {
    let c = &problem.candidates[i];
    let turn = problem.antennas[c.antenna].turnaround_s;
    let antenna_free = contacts
        .iter()
        .filter(|b| b.antenna == c.antenna)
        .all(|b| b.end_s <= lo - turn || b.setup_start_s >= hi);
    let running = contacts
        .iter()
        .filter(|b| b.satellite == c.satellite && b.start_s < hi && b.end_s > lo)
        .count();
    antenna_free && running < problem.satellites[c.satellite].max_downlinks
}

fn rejections(
    problem: &Problem,
    spans: &[Result<(f64, f64), NotBooked>],
    contacts: &[Contact],
    empty: &[bool],
) -> Vec<Rejection> {
    let n = problem.candidates.len();
    let mut booked = vec![false; n];
    for c in contacts {
        booked[c.candidate] = true;
    }
    (0..n)
        .filter(|&i| !booked[i])
        .map(|i| Rejection {
            candidate: i,
            reason: match spans[i] {
                Err(reason) => reason,
                Ok(_) if empty[i] => NotBooked::NothingOnBoard,
                Ok(span) if span_is_free(problem, i, span, contacts) => NotBooked::NoGain,
                Ok(_) => NotBooked::LostToOverlap,
            },
        })
        .collect()
}

#[cfg(test)]
mod tests {
    use super::*;

    fn one_antenna(turnaround_s: f64, blocked: Vec<(f64, f64)>) -> Antenna {
        Antenna {
            name: "a".into(),
            station: "s".into(),
            turnaround_s,
            rules: BookingRules {
                blocked,
                ..Default::default()
            },
        }
    }

    fn sat(capacity_bits: f64, initial_fill_bits: f64) -> Satellite {
        Satellite {
            name: "s".into(),
            priority_weight: 1.0,
            capacity_bits,
            initial_fill_bits,
            generation: Generation::AverageBps(0.0),
            max_downlinks: 1,
        }
    }

    fn cand(satellite: usize, start_s: f64, end_s: f64, rate_bps: f64) -> Candidate {
        Candidate {
            satellite,
            antenna: 0,
            start_s,
            end_s,
            rate_bps,
            duty: 1.0,
            peak_elevation_deg: 45.0,
            pass_ref: 0,
        }
    }

    // Two overlapping passes on one antenna, 10 s turnaround: 0..100 at 1 bit/s and
    // 80..200 at 2 bit/s. Whole first pass: 100 + 2 * 90 = 280; cut the first at 70 so the
    // second runs whole: 70 + 2 * 120 = 310 (hand-computed; the cut is at the other
    // candidate's start minus the turnaround).
    #[test]
    fn an_overlap_is_resolved_by_shortening_the_cheaper_contact() {
        let p = Problem {
            window_s: 300.0,
            satellites: vec![sat(1e6, 1e6), sat(1e6, 1e6)],
            antennas: vec![one_antenna(10.0, Vec::new())],
            candidates: vec![cand(0, 0.0, 100.0, 1.0), cand(1, 80.0, 200.0, 2.0)],
        };
        let s = schedule(&p).unwrap();
        assert_eq!(s.method, Method::Sequential);
        assert_eq!(s.weighted_delivered, 310.0);
        assert_eq!(
            (
                s.contacts[0].start_s,
                s.contacts[0].end_s,
                s.contacts[0].shortened
            ),
            (0.0, 70.0, true)
        );
        assert_eq!(
            (s.contacts[1].setup_start_s, s.contacts[1].shortened),
            (70.0, false)
        );
        assert_eq!(s.antennas[0].booked_s, 190.0);
        assert_eq!(s.not_booked, Vec::new());
    }

    // 50 bit on board and nothing generated: two passes that could take 100 bit each deliver
    // 50 bit in all; the second finds the store empty and is dropped.
    #[test]
    fn a_contact_never_delivers_more_than_is_on_board() {
        let p = Problem {
            window_s: 300.0,
            satellites: vec![sat(100.0, 50.0)],
            antennas: vec![one_antenna(0.0, Vec::new())],
            candidates: vec![cand(0, 0.0, 100.0, 1.0), cand(0, 150.0, 250.0, 1.0)],
        };
        let s = schedule(&p).unwrap();
        assert_eq!(s.delivered_bits, 50.0);
        assert_eq!(s.contacts.len(), 1);
        assert_eq!(
            s.not_booked,
            vec![Rejection {
                candidate: 1,
                reason: NotBooked::NoGain
            }]
        );
        assert_eq!(s.satellites[0].final_fill_bits, 0.0);
    }

    // A block from 40 to 50 s with a 5 s turnaround forbids 40..55: the candidate 0..100
    // keeps 55..100 (45 s) over 0..40 (40 s).
    #[test]
    fn a_blocked_period_clips_to_the_longest_part() {
        let mut p = Problem {
            window_s: 300.0,
            satellites: vec![sat(1e6, 1e6)],
            antennas: vec![one_antenna(5.0, vec![(40.0, 50.0)])],
            candidates: vec![cand(0, 0.0, 100.0, 1.0)],
        };
        assert_eq!(bookable_spans(&p), vec![Ok((55.0, 100.0))]);
        p.antennas[0].rules.min_contact_s = 50.0;
        assert_eq!(
            bookable_spans(&p),
            vec![Err(NotBooked::ShorterThanMinContact)]
        );
        p.antennas[0].rules.blocked = vec![(0.0, 100.0)];
        assert_eq!(bookable_spans(&p), vec![Err(NotBooked::Blocked)]);
        p.antennas[0].rules.min_peak_elevation_deg = 50.0;
        assert_eq!(
            bookable_spans(&p),
            vec![Err(NotBooked::BelowMinPeakElevation)]
        );
    }
}

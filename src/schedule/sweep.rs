//! The label sweep: a dynamic program over trims sorted by start, for contacts that follow one
//! another in time (one antenna, or one satellite with one downlink; or one antenna at a time
//! with the other antennas' contacts held fixed).
//!
//! A label is one partial schedule: its last booking (a node in an arena of back-pointers),
//! the store state of every satellite, the antennas still in turnaround, and the candidates
//! already used whose span is not over. Labels wait ("pending") until the end of their last
//! contact, then join the pool of labels that can take the next trim. In the pool, a label
//! that another dominates is dropped (the dominance rule is proved in the module
//! documentation of [`super`]); the sweep is exhaustive over the trims otherwise.

use std::cmp::Ordering;
use std::collections::BinaryHeap;

use super::model::Problem;
use super::store::{advance_with, SatState};

/// A trim ready for the sweep: candidate, satellite, antenna and span; its drain
/// `q = rate * duty` is its candidate's ([`Opt::q_bps`]). The indices are kept compact (32 bytes
/// a trim; a year's plan holds about 20,000 trims); [`super::model::validate`] refuses a
/// problem they cannot hold.
#[derive(Debug, Clone, Copy)]
pub(crate) struct Opt {
    cand: u32,
    sat: u16,
    antenna: u16,
    pub x_s: f64,
    pub y_s: f64,
    /// End of the candidate's clipped span: the candidate stays "live" until then.
    pub span_end_s: f64,
}

impl Opt {
    /// A trim of candidate `cand` (of satellite `sat`, on `antenna`), indices within the limits
    /// [`super::model::validate`] checks.
    pub fn new(
        (cand, sat, antenna): (usize, usize, usize),
        (x_s, y_s): (f64, f64),
        span_end_s: f64,
    ) -> Opt {
        Opt {
            cand: cand as u32,
            sat: sat as u16,
            antenna: antenna as u16,
            x_s,
            y_s,
            span_end_s,
        }
    }
    pub fn cand(&self) -> usize {
        self.cand as usize
    }
    pub fn sat(&self) -> usize {
        self.sat as usize
    }
    pub fn antenna(&self) -> usize {
        self.antenna as usize
    }
    /// The drain `rate * duty` of the trim's candidate, bit/s.
    pub fn q_bps(&self, problem: &Problem) -> f64 {
        let c = &problem.candidates[self.cand()];
        c.rate_bps * c.duty
    }
}

#[derive(Debug, Clone)]
struct Label {
    node: u32,
    /// Per satellite, each at its own time (advanced lazily).
    sats: Vec<SatState>,
    /// Per satellite, the arena node of its last contact in this label: two labels with the
    /// same touch have the same store trajectory, so they need no comparison there.
    touch: Vec<u32>,
    ready: Vec<(usize, f64)>,
    live: Vec<(usize, f64)>,
    seq: u64,
}

const ROOT: u32 = u32::MAX;

struct Pending(f64, Label);

impl PartialEq for Pending {
    fn eq(&self, other: &Self) -> bool {
        self.cmp(other) == Ordering::Equal
    }
}
impl Eq for Pending {}
impl PartialOrd for Pending {
    fn partial_cmp(&self, other: &Self) -> Option<Ordering> {
        Some(self.cmp(other))
    }
}
impl Ord for Pending {
    // A min-heap on (end time, creation order).
    fn cmp(&self, other: &Self) -> Ordering {
        other
            .0
            .total_cmp(&self.0)
            .then(other.1.seq.cmp(&self.1.seq))
    }
}

/// What the sweep returns: the chosen trims (indices into its input), the objective
/// (priority-weighted delivered bits over the whole window, fixed contacts included) and
/// whether the pool cap ever dropped an undominated label (then the result may not be optimal).
#[derive(Debug, Clone)]
pub(crate) struct SweepResult {
    pub chosen: Vec<usize>,
    pub value: f64,
    pub capped: bool,
}

pub(crate) struct Sweep<'a> {
    pub problem: &'a Problem,
    /// Sorted by start, then end, then candidate.
    pub opts: &'a [Opt],
    /// Per satellite, the drain of contacts held fixed (empty: none).
    pub profiles: &'a [Vec<(f64, f64)>],
    pub cap: usize,
}

fn weighted(problem: &Problem, sats: &[SatState]) -> f64 {
    problem
        .satellites
        .iter()
        .zip(sats)
        .map(|(s, st)| s.priority_weight * st.delivered_bits)
        .sum()
}

impl Sweep<'_> {
    fn advance_sat(&self, st: &mut SatState, s: usize, t_s: f64) {
        advance_with(&self.problem.satellites[s], st, t_s, 0.0, &self.profiles[s]);
    }

    /// Moves the label to `t_s`: only its bookkeeping; the stores follow lazily.
    fn bring_to(label: &mut Label, t_s: f64) {
        label.ready.retain(|r| r.1 > t_s);
        label.live.retain(|l| l.1 > t_s);
    }

    /// `a` is at least as good as `b` for every continuation from `t_s`.
    fn dominates(&self, a: &mut Label, b: &mut Label, t_s: f64) -> bool {
        let ready_ok = a
            .ready
            .iter()
            .all(|ra| b.ready.iter().any(|rb| rb.0 == ra.0 && rb.1 >= ra.1));
        let live_ok = a.live.iter().all(|la| b.live.iter().any(|lb| lb.0 == la.0));
        if !(ready_ok && live_ok) {
            return false;
        }
        let mut margin = 0.0;
        let mut scale = 0.0;
        for s in 0..a.sats.len() {
            if a.touch[s] == b.touch[s] {
                continue;
            }
            self.advance_sat(&mut a.sats[s], s, t_s);
            self.advance_sat(&mut b.sats[s], s, t_s);
            let (sa, sb) = (&a.sats[s], &b.sats[s]);
            let w = self.problem.satellites[s].priority_weight;
            let lb = if sa.fill_bits >= sb.fill_bits {
                sa.delivered_bits - sb.delivered_bits
            } else {
                sb.lost_bits - sa.lost_bits
            };
            margin += w * lb;
            scale += w * (sa.delivered_bits + sa.fill_bits + sa.lost_bits);
        }
        margin >= -1e-12 * scale.max(1.0)
    }

    fn insert(&self, pool: &mut Vec<Label>, mut label: Label, t_s: f64) {
        for p in pool.iter_mut() {
            if self.dominates(p, &mut label, t_s) {
                return;
            }
        }
        let mut keep = Vec::with_capacity(pool.len() + 1);
        for mut p in pool.drain(..) {
            if !self.dominates(&mut label, &mut p, t_s) {
                keep.push(p);
            }
        }
        keep.push(label);
        *pool = keep;
    }

    /// Keeps the `cap` labels with the most weighted delivery by `t_s` (comparing only the
    /// satellites where the labels differ; the others add the same to every label).
    fn cap_pool(&self, pool: &mut Vec<Label>, t_s: f64) -> bool {
        if pool.len() <= self.cap {
            return false;
        }
        let n = self.problem.satellites.len();
        let differ: Vec<usize> = (0..n)
            .filter(|&s| pool.iter().any(|l| l.touch[s] != pool[0].touch[s]))
            .collect();
        let mut scored: Vec<(f64, Label)> = pool
            .drain(..)
            .map(|mut l| {
                let mut v = 0.0;
                for &s in &differ {
                    self.advance_sat(&mut l.sats[s], s, t_s);
                    v += self.problem.satellites[s].priority_weight * l.sats[s].delivered_bits;
                }
                (v, l)
            })
            .collect();
        scored.sort_by(|a, b| b.0.total_cmp(&a.0).then(a.1.seq.cmp(&b.1.seq)));
        scored.truncate(self.cap);
        scored.sort_by_key(|l| l.1.seq);
        pool.extend(scored.into_iter().map(|l| l.1));
        true
    }

    fn child(&self, parent: &Label, o: &Opt, node: u32, seq: u64) -> Label {
        let mut child = parent.clone();
        child.node = node;
        child.seq = seq;
        child.touch[o.sat()] = node;
        let st = &mut child.sats[o.sat()];
        advance_with(
            &self.problem.satellites[o.sat()],
            st,
            o.x_s,
            0.0,
            &self.profiles[o.sat()],
        );
        advance_with(
            &self.problem.satellites[o.sat()],
            st,
            o.y_s,
            o.q_bps(self.problem),
            &self.profiles[o.sat()],
        );
        let turn = self.problem.antennas[o.antenna()].turnaround_s;
        child.ready.retain(|r| r.0 != o.antenna());
        child.ready.push((o.antenna(), o.y_s + turn));
        child.live.push((o.cand(), o.span_end_s));
        child
    }

    fn can_take(label: &Label, o: &Opt) -> bool {
        label
            .ready
            .iter()
            .all(|r| r.0 != o.antenna() || r.1 <= o.x_s + 1e-9)
            && label.live.iter().all(|l| l.0 != o.cand())
    }

    /// Runs the sweep.
    pub fn run(&self) -> SweepResult {
        let start: Vec<SatState> = self
            .problem
            .satellites
            .iter()
            .map(SatState::start)
            .collect();
        let touch = vec![ROOT; start.len()];
        let mut pool = vec![Label {
            node: ROOT,
            sats: start,
            touch,
            ready: Vec::new(),
            live: Vec::new(),
            seq: 0,
        }];
        let mut pending: BinaryHeap<Pending> = BinaryHeap::new();
        let mut arena: Vec<(u32, u32)> = Vec::new();
        let mut seq = 1u64;
        let mut capped = false;
        for (oi, o) in self.opts.iter().enumerate() {
            self.admit(&mut pool, &mut pending, o.x_s);
            capped |= self.cap_pool(&mut pool, o.x_s);
            for parent in pool.iter().filter(|l| Self::can_take(l, o)) {
                arena.push((parent.node, oi as u32));
                let child = self.child(parent, o, (arena.len() - 1) as u32, seq);
                seq += 1;
                pending.push(Pending(o.y_s, child));
            }
        }
        let end = self.problem.window_s;
        let mut finals: Vec<Label> = pool;
        finals.extend(pending.into_sorted_vec().into_iter().rev().map(|p| p.1));
        let mut best: Option<(f64, u64, u32)> = None;
        for mut label in finals {
            for s in 0..label.sats.len() {
                self.advance_sat(&mut label.sats[s], s, end);
            }
            let v = weighted(self.problem, &label.sats);
            if best.is_none_or(|b| v > b.0 || (v == b.0 && label.seq < b.1)) {
                best = Some((v, label.seq, label.node));
            }
        }
        let (value, _, mut node) = best.unwrap_or((0.0, 0, ROOT));
        let mut chosen = Vec::new();
        while node != ROOT {
            let (parent, oi) = arena[node as usize];
            chosen.push(oi as usize);
            node = parent;
        }
        chosen.reverse();
        SweepResult {
            chosen,
            value,
            capped,
        }
    }

    fn admit(&self, pool: &mut Vec<Label>, pending: &mut BinaryHeap<Pending>, t_s: f64) {
        for label in pool.iter_mut() {
            Self::bring_to(label, t_s);
        }
        while pending.peek().is_some_and(|p| p.0 <= t_s) {
            let Some(Pending(_, mut label)) = pending.pop() else {
                break;
            };
            Self::bring_to(&mut label, t_s);
            self.insert(pool, label, t_s);
        }
    }
}

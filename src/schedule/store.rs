//! The onboard store as a fluid queue: generation flows in, downlinks drain it, what arrives
//! into a full store is lost (the newest data), downlinks take the oldest data first (FIFO).
//!
//! Between two events every rate is constant, so the fill is piecewise linear and each piece
//! is solved in closed form: it may reach the capacity (then the excess generation is lost) or
//! zero (then the downlinks deliver only what is generated, shared in proportion to their
//! rates).

#[cfg(test)]
use super::model::GenerationWindow;
use super::model::{Generation, Satellite};

/// The state of one store at time `t_s`. `delivered_bits` and `lost_bits` count from the
/// window start.
#[derive(Debug, Clone, Copy, PartialEq)]
pub(crate) struct SatState {
    pub t_s: f64,
    pub fill_bits: f64,
    pub delivered_bits: f64,
    pub lost_bits: f64,
}

impl SatState {
    pub fn start(sat: &Satellite) -> Self {
        SatState {
            t_s: 0.0,
            fill_bits: sat.initial_fill_bits,
            delivered_bits: 0.0,
            lost_bits: 0.0,
        }
    }
}

/// What the final evaluation records: the fill at each piece boundary, the kept-data curve
/// (delivered + fill, non-decreasing) for FIFO ages, and the intervals where data was lost.
#[derive(Debug, Clone, Default)]
pub(crate) struct Trace {
    pub fill: Vec<(f64, f64)>,
    pub kept: Vec<(f64, f64)>,
    pub lost: Vec<(f64, f64)>,
}

impl Trace {
    fn point(&mut self, st: &SatState) {
        self.fill.push((st.t_s, st.fill_bits));
        self.kept.push((st.t_s, st.delivered_bits + st.fill_bits));
    }

    fn lost_interval(&mut self, t0: f64, t1: f64) {
        match self.lost.last_mut() {
            Some(last) if (last.1 - t0).abs() <= 1e-9 * t0.abs().max(1.0) => last.1 = t1,
            _ => self.lost.push((t0, t1)),
        }
    }

    /// Start of the trace: the state at the window start, with room for `points` points
    /// (one per event is the usual count: sized once, the two curves are not grown by
    /// doubling side by side, which leaves the allocator holes of the size of a year's trace).
    pub fn begin(st: &SatState, points: usize) -> Self {
        let mut trace = Trace {
            fill: Vec::with_capacity(points),
            kept: Vec::with_capacity(points),
            lost: Vec::new(),
        };
        trace.point(st);
        trace
    }
}

/// One piece with constant generation `g` and drain `q` for `dur_s` seconds.
fn piece(st: &mut SatState, cap: f64, g: f64, q: f64, dur_s: f64, rec: &mut Option<&mut Trace>) {
    let net = g - q;
    let t0 = st.t_s;
    if net > 0.0 {
        let t_full = (cap - st.fill_bits).max(0.0) / net;
        st.delivered_bits += q * dur_s;
        if t_full >= dur_s {
            st.fill_bits = (st.fill_bits + net * dur_s).min(cap);
        } else {
            st.fill_bits = cap;
            st.lost_bits += net * (dur_s - t_full);
            if let Some(trace) = rec.as_deref_mut() {
                if t_full > 0.0 {
                    st.t_s = t0 + t_full;
                    let mid = SatState {
                        delivered_bits: st.delivered_bits - q * (dur_s - t_full),
                        ..*st
                    };
                    trace.point(&mid);
                }
                trace.lost_interval(t0 + t_full, t0 + dur_s);
            }
        }
    } else if net < 0.0 {
        let t_empty = st.fill_bits / -net;
        if t_empty >= dur_s {
            st.delivered_bits += q * dur_s;
            st.fill_bits = (st.fill_bits + net * dur_s).max(0.0);
        } else {
            st.delivered_bits += q * t_empty + g * (dur_s - t_empty);
            st.fill_bits = 0.0;
            if let Some(trace) = rec.as_deref_mut() {
                if t_empty > 0.0 {
                    st.t_s = t0 + t_empty;
                    let mid = SatState {
                        delivered_bits: st.delivered_bits - g * (dur_s - t_empty),
                        ..*st
                    };
                    trace.point(&mid);
                }
            }
        }
    } else {
        st.delivered_bits += q * dur_s;
    }
    st.t_s = t0 + dur_s;
    if let Some(trace) = rec.as_deref_mut() {
        trace.point(st);
    }
}

/// Advances `st` to `t1_s` under a constant drain `q_bps` (sum of the running downlinks'
/// `rate * duty`), splitting at the generation windows.
pub(crate) fn advance(
    sat: &Satellite,
    st: &mut SatState,
    t1_s: f64,
    q_bps: f64,
    mut rec: Option<&mut Trace>,
) {
    if t1_s <= st.t_s {
        return;
    }
    let cap = sat.capacity_bits;
    match &sat.generation {
        Generation::AverageBps(g) => piece(st, cap, *g, q_bps, t1_s - st.t_s, &mut rec),
        Generation::Windows(windows) => {
            let mut k = windows.partition_point(|w| w.end_s <= st.t_s);
            while st.t_s < t1_s {
                let (g, until) = match windows.get(k) {
                    Some(w) if w.start_s <= st.t_s => (w.rate_bps, w.end_s.min(t1_s)),
                    Some(w) => (0.0, w.start_s.min(t1_s)),
                    None => (0.0, t1_s),
                };
                if until > st.t_s {
                    piece(st, cap, g, q_bps, until - st.t_s, &mut rec);
                }
                st.t_s = until;
                if windows.get(k).is_some_and(|w| w.end_s <= st.t_s) {
                    k += 1;
                }
            }
        }
    }
}

/// A piecewise-constant drain from contacts held fixed: `(from_s, q_bps)` steps, sorted.
pub(crate) type Profile = [(f64, f64)];

/// Like [`advance`] with an extra drain `profile` (contacts on other antennas).
pub(crate) fn advance_with(
    sat: &Satellite,
    st: &mut SatState,
    t1_s: f64,
    q_bps: f64,
    profile: &Profile,
) {
    if profile.is_empty() {
        advance(sat, st, t1_s, q_bps, None);
        return;
    }
    let mut k = profile.partition_point(|&(t, _)| t <= st.t_s);
    while st.t_s < t1_s {
        let q_fixed = if k == 0 { 0.0 } else { profile[k - 1].1 };
        let until = profile.get(k).map_or(t1_s, |&(t, _)| t.min(t1_s));
        advance(sat, st, until, q_bps + q_fixed, None);
        st.t_s = until;
        k += 1;
    }
}

/// Generation over `[0, t_s]` without any store limit.
pub(crate) fn generated_until(sat: &Satellite, t_s: f64) -> f64 {
    match &sat.generation {
        Generation::AverageBps(g) => g * t_s,
        Generation::Windows(windows) => windows
            .iter()
            .map(|w| w.rate_bps * (w.end_s.min(t_s) - w.start_s).max(0.0))
            .sum(),
    }
}

/// FIFO age at time `t_s` of the oldest data on board, given the kept-data curve and the
/// delivered total at `t_s`: the data delivered next was born when the kept curve passed the
/// delivered total. Zero when the store is empty.
pub(crate) fn oldest_age_s(
    kept: &[(f64, f64)],
    t_s: f64,
    delivered_bits: f64,
    fill_bits: f64,
) -> f64 {
    let tol = 1e-9 * delivered_bits.abs().max(1.0);
    if fill_bits <= tol {
        return 0.0;
    }
    let j = kept.partition_point(|&(_, k)| k <= delivered_bits + tol);
    let born = match j {
        0 => kept.first().map_or(0.0, |p| p.0),
        _ if j >= kept.len() => t_s,
        _ => {
            let (ta, ka) = kept[j - 1];
            let (tb, kb) = kept[j];
            ta + (delivered_bits - ka).max(0.0) / (kb - ka) * (tb - ta)
        }
    };
    (t_s - born).max(0.0)
}

/// Keeps only the points where the slope changes (and the two ends).
pub(crate) fn slope_changes(mut points: Vec<(f64, f64)>) -> Vec<(f64, f64)> {
    // In place: a year's trace is the largest vector of the schedule's evaluation.
    points.dedup_by(|p, last| {
        let same = (p.0 - last.0).abs() <= 1e-9;
        if same {
            last.1 = p.1;
        }
        same
    });
    // Compacted in place too: the point kept last is at `w - 1`, and the next point read lies
    // beyond every point written.
    let n = points.len();
    let mut w = 0;
    for i in 0..n {
        let p = points[i];
        let keep = i == 0 || i + 1 == n || {
            let a = points[w - 1];
            let b = points[i + 1];
            let s1 = (p.1 - a.1) / (p.0 - a.0);
            let s2 = (b.1 - p.1) / (b.0 - p.0);
            (s1 - s2).abs() > 1e-9 * s1.abs().max(s2.abs()).max(1e-6)
        };
        if keep {
            points[w] = p;
            w += 1;
        }
    }
    points.truncate(w);
    points.shrink_to_fit();
    points
}

#[cfg(test)]
mod tests {
    use super::*;

    fn sat(capacity_bits: f64, initial_fill_bits: f64, g_bps: f64) -> Satellite {
        Satellite {
            name: "t".into(),
            priority_weight: 1.0,
            capacity_bits,
            initial_fill_bits,
            generation: Generation::AverageBps(g_bps),
            max_downlinks: 1,
        }
    }

    // Hand-computed fluid buffer (common practice): 90 of 100 bit, +10 bit/s for 5 s: full
    // after 1 s, then 40 bit lost.
    #[test]
    fn overflow_loses_the_excess() {
        let s = sat(100.0, 90.0, 10.0);
        let mut st = SatState::start(&s);
        let mut trace = Trace::begin(&st, 0);
        advance(&s, &mut st, 5.0, 0.0, Some(&mut trace));
        assert_eq!(
            (st.fill_bits, st.lost_bits, st.delivered_bits),
            (100.0, 40.0, 0.0)
        );
        assert_eq!(trace.lost, vec![(1.0, 5.0)]);
        assert_eq!(
            slope_changes(trace.fill.clone()),
            vec![(0.0, 90.0), (1.0, 100.0), (5.0, 100.0)]
        );
    }

    // 10 bit on board, 1 bit/s in, 6 bit/s out for 10 s: empty at 2 s, then only the
    // generation goes down: 6 * 2 + 1 * 8 = 20 bit.
    #[test]
    fn an_empty_store_delivers_only_the_generation() {
        let s = sat(100.0, 10.0, 1.0);
        let mut st = SatState::start(&s);
        advance(&s, &mut st, 10.0, 6.0, None);
        assert_eq!(
            (st.fill_bits, st.delivered_bits, st.lost_bits),
            (0.0, 20.0, 0.0)
        );
    }

    // FIFO: 100 bit at t = 0, then 10 bit/s; after 150 bit delivered the next bit was born at
    // t = 5 s, so at t = 12 s it is 7 s old.
    #[test]
    fn fifo_age_follows_the_kept_curve() {
        let kept = [(0.0, 100.0), (10.0, 200.0), (12.0, 220.0)];
        assert!((oldest_age_s(&kept, 12.0, 150.0, 70.0) - 7.0).abs() < 1e-12);
        assert_eq!(oldest_age_s(&kept, 12.0, 50.0, 170.0), 12.0);
        assert_eq!(oldest_age_s(&kept, 12.0, 220.0, 0.0), 0.0);
    }

    #[test]
    fn generation_windows_are_integrated_piecewise() {
        let mut s = sat(1e9, 0.0, 0.0);
        s.generation = Generation::Windows(vec![
            GenerationWindow {
                start_s: 10.0,
                end_s: 20.0,
                rate_bps: 3.0,
            },
            GenerationWindow {
                start_s: 30.0,
                end_s: 40.0,
                rate_bps: 5.0,
            },
        ]);
        let mut st = SatState::start(&s);
        advance(&s, &mut st, 35.0, 0.0, None);
        assert_eq!(st.fill_bits, 30.0 + 25.0);
        assert_eq!(generated_until(&s, 35.0), 55.0);
    }
}

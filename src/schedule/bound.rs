//! Upper bounds on `sum_s w_s * delivered_s` over every feasible schedule (not only those in
//! the decision space): a linear-programming relaxation when it is small enough, and a
//! combinatorial bound always; the reported bound is the smaller of those computed.

use clarabel::algebra::CscMatrix;
use clarabel::solver::{
    DefaultSettingsBuilder, DefaultSolver, IPSolver, NonnegativeConeT, SolverStatus,
    SupportedConeT, ZeroConeT,
};

use super::model::Problem;
use super::store::{advance_with, generated_until, SatState};

/// Largest relaxation (variables) solved as an LP; above it only the combinatorial bound.
pub const LP_MAX_VARIABLES: usize = 12_000;

/// Relative margin added to the LP optimum for the interior-point solver's tolerances.
pub const LP_MARGIN: f64 = 1e-6;

/// Relative margin on the combinatorial bound for floating-point rounding (the bound can be
/// tight: a satellite that delivers all its data).
pub const COMBINATORIAL_MARGIN: f64 = 1e-9;

/// Which bound was the smaller.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum BoundMethod {
    LinearProgram,
    Combinatorial,
}

/// Bookable candidates: (candidate index, clipped span).
pub(crate) type Spans<'a> = &'a [(usize, (f64, f64))];

fn q_of(problem: &Problem, c: usize) -> f64 {
    let cand = &problem.candidates[c];
    cand.rate_bps * cand.duty
}

/// Steps `(from_s, f(values of the intervals active))` over time; `items` are
/// `(lo, hi, value)`. The last step (value 0) starts at the last end.
fn steps(items: &[(f64, f64, f64)], f: impl Fn(&mut Vec<f64>) -> f64) -> Vec<(f64, f64)> {
    // Sized once (a flattened iterator would grow it by doubling; a year's candidates are the
    // scheduler's peak here).
    let mut points: Vec<f64> = Vec::with_capacity(2 * items.len());
    points.extend(items.iter().flat_map(|i| [i.0, i.1]));
    // Unstable sorts, so no scratch copies: equal points are the same number, and the order
    // breaks ties by index as the stable sort did.
    points.sort_unstable_by(f64::total_cmp);
    points.dedup();
    let mut order: Vec<usize> = (0..items.len()).collect();
    order.sort_unstable_by(|&a, &b| items[a].0.total_cmp(&items[b].0).then(a.cmp(&b)));
    let (mut out, mut next, mut active) = (
        Vec::with_capacity(points.len()),
        0usize,
        Vec::<usize>::new(),
    );
    let mut values = Vec::new();
    for &t in &points {
        while next < order.len() && items[order[next]].0 <= t {
            active.push(order[next]);
            next += 1;
        }
        active.retain(|&i| items[i].1 > t);
        values.clear();
        values.extend(active.iter().map(|&i| items[i].2));
        out.push((t, f(&mut values)));
    }
    out
}

fn integral(steps: &[(f64, f64)]) -> f64 {
    steps.windows(2).map(|w| w[0].1 * (w[1].0 - w[0].0)).sum()
}

/// `min(satellite side, antenna side)`. Satellite side: each satellite alone, every bookable
/// candidate booked whole (its `max_downlinks` best drains at each instant), simulated through
/// its store; a fluid store delivers at least as much under a larger drain at every instant
/// (the fill is then lower or equal everywhere, so is the loss), so no schedule delivers more
/// for that satellite. Antenna side: the integral of the best weighted drain on each antenna.
pub(crate) fn combinatorial(problem: &Problem, spans: Spans, weights: &[f64]) -> f64 {
    // Sized once (counted first): grown by doubling, a year's candidates would leave holes.
    let (mut sat_n, mut antenna_n) = (
        vec![0; problem.satellites.len()],
        vec![0; problem.antennas.len()],
    );
    for &(c, _) in spans {
        sat_n[problem.candidates[c].satellite] += 1;
        antenna_n[problem.candidates[c].antenna] += 1;
    }
    let mut by_sat: Vec<Vec<_>> = sat_n.into_iter().map(Vec::with_capacity).collect();
    let mut by_antenna: Vec<Vec<_>> = antenna_n.into_iter().map(Vec::with_capacity).collect();
    for &(c, (lo, hi)) in spans {
        let cand = &problem.candidates[c];
        by_sat[cand.satellite].push((lo, hi, q_of(problem, c)));
        by_antenna[cand.antenna].push((lo, hi, weights[cand.satellite] * q_of(problem, c)));
    }
    let sat_side: f64 = problem
        .satellites
        .iter()
        .enumerate()
        .map(|(s, sat)| {
            let k = sat.max_downlinks;
            let drain = steps(&by_sat[s], |v| {
                v.sort_by(|a, b| b.total_cmp(a));
                v.iter().take(k).sum()
            });
            let mut st = SatState::start(sat);
            advance_with(sat, &mut st, problem.window_s, 0.0, &drain);
            weights[s] * st.delivered_bits
        })
        .sum();
    drop(by_sat);
    let antenna_side: f64 = by_antenna
        .iter()
        .map(|items| integral(&steps(items, |v| v.iter().copied().fold(0.0, f64::max))))
        .sum();
    sat_side.min(antenna_side) * (1.0 + COMBINATORIAL_MARGIN)
}

/// Rows of a sparse LP in clarabel's form `A x + s = b`.
#[derive(Default)]
struct Rows {
    eq: Vec<(Vec<(usize, f64)>, f64)>,
    le: Vec<(Vec<(usize, f64)>, f64)>,
}

/// The relaxation's columns: one per (candidate, elementary interval) plus per satellite a fill
/// and a loss per interval of its own breakpoints.
struct Layout {
    /// Global breakpoints.
    points: Vec<f64>,
    /// Per bookable candidate (same order as spans): first column and first interval index.
    first: Vec<(usize, usize, usize)>,
    n: usize,
}

fn layout(problem: &Problem, spans: Spans) -> Layout {
    let mut points: Vec<f64> = spans
        .iter()
        .flat_map(|s| [s.1 .0, s.1 .1])
        .chain([0.0, problem.window_s])
        .collect();
    points.sort_by(f64::total_cmp);
    points.dedup();
    let mut n = 0;
    let mut first = Vec::with_capacity(spans.len());
    for &(_, (lo, hi)) in spans {
        let j0 = points.partition_point(|&p| p < lo);
        let j1 = points.partition_point(|&p| p < hi);
        first.push((n, j0, j1));
        n += j1 - j0;
    }
    Layout { points, first, n }
}

/// Size of the relaxation in variables (decides whether it is solved).
pub(crate) fn lp_size(problem: &Problem, spans: Spans) -> usize {
    let l = layout(problem, spans);
    let sat_points: usize = spans.len() * 2 + 2 * problem.satellites.len();
    l.n + 2 * sat_points
}

fn resource_rows(problem: &Problem, spans: Spans, l: &Layout, rows: &mut Rows) {
    let intervals = l.points.len().saturating_sub(1);
    let mut by_antenna = vec![vec![Vec::new(); intervals]; problem.antennas.len()];
    let mut by_sat = vec![vec![Vec::new(); intervals]; problem.satellites.len()];
    for (i, &(c, _)) in spans.iter().enumerate() {
        let (col, j0, j1) = l.first[i];
        let cand = &problem.candidates[c];
        for j in j0..j1 {
            by_antenna[cand.antenna][j].push((col + j - j0, 1.0));
            by_sat[cand.satellite][j].push((col + j - j0, 1.0));
            rows.le.push((vec![(col + j - j0, 1.0)], 1.0));
            rows.le.push((vec![(col + j - j0, -1.0)], 0.0));
        }
    }
    for per_j in by_antenna {
        rows.le
            .extend(per_j.into_iter().filter(|r| r.len() > 1).map(|r| (r, 1.0)));
    }
    for (s, per_j) in by_sat.into_iter().enumerate() {
        let k = problem.satellites[s].max_downlinks;
        rows.le.extend(
            per_j
                .into_iter()
                .filter(|r| r.len() > k)
                .map(|r| (r, k as f64)),
        );
    }
}

/// Storage balance per satellite over the intervals of its own breakpoints:
/// `F_k - F_{k-1} + out_k + lost_k = generated_k`, `0 <= F_k <= capacity`, `lost_k >= 0`.
fn storage_rows(problem: &Problem, spans: Spans, l: &Layout, scale: f64, rows: &mut Rows) -> usize {
    let mut col = l.n;
    for (s, sat) in problem.satellites.iter().enumerate() {
        let mine: Vec<usize> = (0..spans.len())
            .filter(|&i| problem.candidates[spans[i].0].satellite == s)
            .collect();
        let mut pts: Vec<f64> = mine
            .iter()
            .flat_map(|&i| [spans[i].1 .0, spans[i].1 .1])
            .chain([0.0, problem.window_s])
            .collect();
        pts.sort_by(f64::total_cmp);
        pts.dedup();
        let mut outs: Vec<Vec<(usize, f64)>> = vec![Vec::new(); pts.len().saturating_sub(1)];
        for &i in &mine {
            let (c0, j0, j1) = l.first[i];
            let q = q_of(problem, spans[i].0) / scale;
            for j in j0..j1 {
                let k = pts.partition_point(|&p| p <= l.points[j]).saturating_sub(1);
                outs[k].push((c0 + j - j0, q * (l.points[j + 1] - l.points[j])));
            }
        }
        let mut prev_fill: Option<usize> = None;
        for (k, (w, out)) in pts.windows(2).zip(outs).enumerate() {
            let (fill, lost) = (col, col + 1);
            col += 2;
            let mut row = vec![(fill, 1.0), (lost, 1.0)];
            if let Some(p) = prev_fill {
                row.push((p, -1.0));
            }
            row.extend(out);
            let generated = (generated_until(sat, w[1]) - generated_until(sat, w[0])) / scale;
            let initial = if k == 0 {
                sat.initial_fill_bits / scale
            } else {
                0.0
            };
            rows.eq.push((row, generated + initial));
            rows.le.push((vec![(fill, 1.0)], sat.capacity_bits / scale));
            rows.le.push((vec![(fill, -1.0)], 0.0));
            rows.le.push((vec![(lost, -1.0)], 0.0));
            prev_fill = Some(fill);
        }
    }
    col
}

/// The rows (equalities first) as clarabel's `A` with `n` columns, and the right-hand side.
/// The rows are consumed and the triplets sized once: this and the solver's copies are the
/// largest memory of a plan that solves its LP (with clarabel's own, about 10 MB at
/// `LP_MAX_VARIABLES`).
fn constraint_matrix(rows: Rows, n: usize) -> (CscMatrix<f64>, Vec<f64>) {
    let all = || rows.eq.iter().chain(&rows.le);
    let entries: usize = all().map(|r| r.0.len()).sum();
    let (mut ii, mut jj, mut vv) = (
        Vec::with_capacity(entries),
        Vec::with_capacity(entries),
        Vec::with_capacity(entries),
    );
    let mut b = Vec::with_capacity(rows.eq.len() + rows.le.len());
    for (r, (row, rhs)) in all().enumerate() {
        for &(col, v) in row {
            ii.push(r);
            jj.push(col);
            vv.push(v);
        }
        b.push(*rhs);
    }
    drop(rows);
    (CscMatrix::new_from_triplets(b.len(), n, ii, jj, vv), b)
}

/// The LP relaxation's optimum (plus [`LP_MARGIN`]), or `None` if the solver does not
/// report a solution.
pub(crate) fn linear_program(problem: &Problem, spans: Spans, weights: &[f64]) -> Option<f64> {
    let l = layout(problem, spans);
    let scale = spans
        .iter()
        .map(|&(c, (lo, hi))| q_of(problem, c) * (hi - lo))
        .fold(0.0, f64::max);
    if spans.is_empty() || scale <= 0.0 {
        return Some(0.0);
    }
    let mut rows = Rows::default();
    resource_rows(problem, spans, &l, &mut rows);
    let n = storage_rows(problem, spans, &l, scale, &mut rows);
    let mut q = vec![0.0; n];
    for (i, &(c, _)) in spans.iter().enumerate() {
        let (col, j0, j1) = l.first[i];
        let w = weights[problem.candidates[c].satellite] * q_of(problem, c) / scale;
        for j in j0..j1 {
            q[col + j - j0] = -w * (l.points[j + 1] - l.points[j]);
        }
    }
    let (eq_rows, le_rows) = (rows.eq.len(), rows.le.len());
    let (a, b) = constraint_matrix(rows, n);
    let p = CscMatrix::<f64>::zeros((n, n));
    let cones: Vec<SupportedConeT<f64>> = vec![ZeroConeT(eq_rows), NonnegativeConeT(le_rows)];
    let settings = DefaultSettingsBuilder::default()
        .verbose(false)
        .build()
        .ok()?;
    let mut solver = DefaultSolver::new(&p, &q, &a, &b, &cones, settings).ok()?;
    // The solver keeps its own (scaled) copies: ours go before it factors.
    drop((a, b, p, q));
    solver.solve();
    let sol = &solver.solution;
    if !matches!(
        sol.status,
        SolverStatus::Solved | SolverStatus::AlmostSolved
    ) {
        return None;
    }
    let best = (-sol.obj_val).max(-sol.obj_val_dual).max(0.0) * scale;
    Some(best * (1.0 + LP_MARGIN) + LP_MARGIN)
}

/// The bound and which method gave it.
pub(crate) fn upper_bound(
    problem: &Problem,
    spans: Spans,
    weights: &[f64],
    lp_max: usize,
) -> (f64, BoundMethod) {
    let comb = combinatorial(problem, spans, weights);
    if lp_size(problem, spans) <= lp_max {
        if let Some(lp) = linear_program(problem, spans, weights) {
            if lp < comb {
                return (lp, BoundMethod::LinearProgram);
            }
        }
    }
    (comb, BoundMethod::Combinatorial)
}

//! Booking rules and the decision space: which candidates are bookable, over which clipped
//! span, and the finite set of (start, end) trims the scheduler chooses from.

use super::model::{Candidate, Problem};

/// Why a candidate is not in the schedule.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Hash, PartialOrd, Ord)]
pub enum NotBooked {
    /// Its pass peaks below the antenna's `min_peak_elevation_deg`.
    BelowMinPeakElevation,
    /// Blocked periods (with the turnaround before the contact) cover all of it.
    Blocked,
    /// Its longest part outside blocked periods is shorter than `min_contact_s`.
    ShorterThanMinContact,
    /// Bookable, but booked contacts take the antenna (with the turnarounds) or all the
    /// satellite's downlinks during part of its span.
    LostToOverlap,
    /// Bookable and its whole span was free, but booking it would not have raised the
    /// objective (typically: nothing on board by then). Proved only for
    /// [`super::Method::Sequential`].
    NoGain,
    /// The scheduler booked it but the store had nothing for it: dropped.
    NothingOnBoard,
}

/// One bookable trim of one candidate: book `cand` from `x_s` to `y_s`.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Trim {
    pub cand: usize,
    pub x_s: f64,
    pub y_s: f64,
}

/// Merged blocked periods of one antenna, widened by the turnaround (the set-up before a
/// contact may not overlap a block either), sorted.
fn forbidden(problem: &Problem, antenna: usize) -> Vec<(f64, f64)> {
    let a = &problem.antennas[antenna];
    let mut periods: Vec<(f64, f64)> = a
        .rules
        .blocked
        .iter()
        .map(|&(s, e)| (s, e + a.turnaround_s))
        .filter(|p| p.1 > p.0)
        .collect();
    periods.sort_by(|p, q| p.0.total_cmp(&q.0).then(p.1.total_cmp(&q.1)));
    let mut merged: Vec<(f64, f64)> = Vec::with_capacity(periods.len());
    for p in periods {
        match merged.last_mut() {
            Some(last) if p.0 <= last.1 => last.1 = last.1.max(p.1),
            _ => merged.push(p),
        }
    }
    merged
}

/// The longest part of `[s, e]` outside the `forbidden` periods (the earliest on a tie).
fn longest_free(s: f64, e: f64, forbidden: &[(f64, f64)]) -> Option<(f64, f64)> {
    let mut best: Option<(f64, f64)> = None;
    let mut from = s;
    for &(b0, b1) in forbidden
        .iter()
        .chain(std::iter::once(&(f64::INFINITY, f64::INFINITY)))
    {
        let to = b0.min(e);
        if to > from && best.is_none_or(|b| to - from > b.1 - b.0) {
            best = Some((from, to));
        }
        from = from.max(b1);
        if from >= e {
            break;
        }
    }
    best
}

/// Applies the booking rules: for each candidate, its clipped span or why it is not bookable.
pub fn bookable_spans(problem: &Problem) -> Vec<Result<(f64, f64), NotBooked>> {
    let forbidden: Vec<Vec<(f64, f64)>> = (0..problem.antennas.len())
        .map(|a| forbidden(problem, a))
        .collect();
    problem
        .candidates
        .iter()
        .map(|c| {
            let rules = &problem.antennas[c.antenna].rules;
            if c.peak_elevation_deg < rules.min_peak_elevation_deg {
                return Err(NotBooked::BelowMinPeakElevation);
            }
            let (lo, hi) = longest_free(c.start_s, c.end_s, &forbidden[c.antenna])
                .ok_or(NotBooked::Blocked)?;
            if hi - lo < rules.min_contact_s || hi <= lo {
                return Err(NotBooked::ShorterThanMinContact);
            }
            Ok((lo, hi))
        })
        .collect()
}

/// Bookable candidates grouped by a key (antenna or satellite), each group sorted by start.
fn groups(
    cands: &[Candidate],
    spans: &[Result<(f64, f64), NotBooked>],
    key: impl Fn(&Candidate) -> usize,
    n: usize,
) -> Vec<Vec<usize>> {
    let mut out = vec![Vec::new(); n];
    for (i, c) in cands.iter().enumerate() {
        if spans[i].is_ok() {
            out[key(c)].push(i);
        }
    }
    for g in &mut out {
        g.sort_by(|&i, &j| {
            span(spans, i)
                .0
                .total_cmp(&span(spans, j).0)
                .then(i.cmp(&j))
        });
    }
    out
}

fn span(spans: &[Result<(f64, f64), NotBooked>], i: usize) -> (f64, f64) {
    spans[i].unwrap_or((0.0, 0.0))
}

/// Members of a start-sorted `group` whose span meets `[lo - pad, hi + pad]`.
fn near<'a>(
    group: &'a [usize],
    spans: &'a [Result<(f64, f64), NotBooked>],
    lo: f64,
    hi: f64,
    pad: f64,
    longest: f64,
) -> impl Iterator<Item = usize> + 'a {
    let first = group.partition_point(|&j| span(spans, j).0 < lo - pad - longest);
    group[first..]
        .iter()
        .copied()
        .take_while(move |&j| span(spans, j).0 <= hi + pad)
        .filter(move |&j| span(spans, j).1 >= lo - pad)
}

fn sorted_points(mut v: Vec<f64>, lo: f64, hi: f64) -> Vec<f64> {
    v.retain(|&t| t >= lo && t <= hi);
    v.sort_by(f64::total_cmp);
    v.dedup_by(|a, b| (*a - *b).abs() <= 1e-9 * b.abs().max(1.0));
    v
}

/// The start and end points of one candidate's trims (see the module documentation for why
/// these suffice).
fn trim_points(
    problem: &Problem,
    spans: &[Result<(f64, f64), NotBooked>],
    i: usize,
    by_antenna: &[usize],
    by_sat: &[usize],
    longest: f64,
) -> (Vec<f64>, Vec<f64>) {
    let c = &problem.candidates[i];
    let (lo, hi) = span(spans, i);
    let antenna = &problem.antennas[c.antenna];
    let (turn, min_len) = (antenna.turnaround_s, antenna.rules.min_contact_s);
    let (mut xs, mut ys) = (vec![lo], vec![hi]);
    for j in near(by_antenna, spans, lo, hi, turn, longest).filter(|&j| j != i) {
        let (lo_j, hi_j) = span(spans, j);
        xs.push(hi_j + turn);
        ys.push(lo_j - turn);
    }
    for j in near(by_sat, spans, lo, hi, 0.0, longest)
        .filter(|&j| problem.candidates[j].antenna != c.antenna)
    {
        let (lo_j, hi_j) = span(spans, j);
        xs.push(hi_j);
        ys.push(lo_j);
    }
    let (base_x, base_y) = (xs.clone(), ys.clone());
    xs.extend(base_y.iter().map(|y| y - min_len));
    ys.extend(base_x.iter().map(|x| x + min_len));
    (sorted_points(xs, lo, hi), sorted_points(ys, lo, hi))
}

/// The decision space: every bookable trim of every candidate, grouped by candidate
/// (an empty list for a candidate the rules exclude). Any schedule the scheduler returns books
/// each candidate at most once, on one of these trims.
pub fn decision_space(
    problem: &Problem,
    spans: &[Result<(f64, f64), NotBooked>],
) -> Vec<Vec<Trim>> {
    let mut space = vec![Vec::new(); problem.candidates.len()];
    visit_trims(problem, spans, |t| space[t.cand].push(t));
    space
}

/// Hands every trim of [`decision_space`] to `visit`, in the same order (by candidate, then
/// start, then end), without holding them: a caller that keeps them in its own form need not
/// hold both.
pub fn visit_trims(
    problem: &Problem,
    spans: &[Result<(f64, f64), NotBooked>],
    mut visit: impl FnMut(Trim),
) {
    let cands = &problem.candidates;
    let by_antenna = groups(cands, spans, |c| c.antenna, problem.antennas.len());
    let by_sat = groups(cands, spans, |c| c.satellite, problem.satellites.len());
    let longest = spans
        .iter()
        .flatten()
        .map(|s| s.1 - s.0)
        .fold(0.0, f64::max);
    for (i, c) in cands.iter().enumerate() {
        if spans[i].is_err() {
            continue;
        }
        let min_len = problem.antennas[c.antenna].rules.min_contact_s;
        let (xs, ys) = trim_points(
            problem,
            spans,
            i,
            &by_antenna[c.antenna],
            &by_sat[c.satellite],
            longest,
        );
        for &x_s in &xs {
            for &y_s in ys.iter().filter(|&&y| y > x_s && y - x_s >= min_len - 1e-9) {
                visit(Trim { cand: i, x_s, y_s });
            }
        }
    }
}

//! Network total over several stations: each second of downlink is counted once, at the station
//! that brings the highest rate at that second.

/// A closed interval of the fixed-rate link at one station, seconds from the window start.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Segment {
    pub start_s: f64,
    pub end_s: f64,
    pub rate_bps: f64,
}

/// Volume (bits) and contact time (s) of the union of segments, each instant counted once at the
/// highest rate active then. Sweep over sorted end points: O(n log n).
pub fn union_volume(segments: &[Segment]) -> (f64, f64) {
    let mut events: Vec<(f64, bool, f64)> = Vec::with_capacity(segments.len() * 2);
    for s in segments.iter().filter(|s| s.end_s > s.start_s) {
        events.push((s.start_s, true, s.rate_bps));
        events.push((s.end_s, false, s.rate_bps));
    }
    // Unstable, so no scratch copy of the events: the order among events of the same time and
    // kind does not matter (they add nothing, dt = 0, and the active set ends the same).
    events.sort_unstable_by(|a, b| a.0.total_cmp(&b.0).then(a.1.cmp(&b.1)));
    let mut active: Vec<f64> = Vec::new();
    let (mut volume, mut contact) = (0.0, 0.0);
    let mut last_t = f64::NAN;
    for (t, is_start, rate) in events {
        if !active.is_empty() {
            let dt = t - last_t;
            let best = active.iter().cloned().fold(0.0, f64::max);
            volume += best * dt;
            contact += dt;
        }
        if is_start {
            active.push(rate);
        } else if let Some(i) = active.iter().position(|r| *r == rate) {
            active.swap_remove(i);
        }
        last_t = t;
    }
    (volume, contact)
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn overlap_counts_once_at_the_best_rate() {
        let s = [
            Segment {
                start_s: 0.0,
                end_s: 100.0,
                rate_bps: 10.0,
            },
            Segment {
                start_s: 50.0,
                end_s: 150.0,
                rate_bps: 20.0,
            },
            Segment {
                start_s: 200.0,
                end_s: 210.0,
                rate_bps: 5.0,
            },
        ];
        let (v, c) = union_volume(&s);
        assert_eq!(c, 160.0);
        assert_eq!(v, 50.0 * 10.0 + 100.0 * 20.0 + 10.0 * 5.0);
        // Never more than the plain sum, never less than the best single segment.
        let sum: f64 = s.iter().map(|x| (x.end_s - x.start_s) * x.rate_bps).sum();
        assert!(v <= sum);
    }
}

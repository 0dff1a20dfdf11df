//! Rate choice over one pass: the fixed rate that brings home the most data, and the adaptive
//! schedule across a set of options.
//!
//! Everything here works on the C/N0 time series of a pass, because the link's geometry, atmosphere
//! and noise do not depend on the data rate: for an option with data rate R, required Eb/N0 `req`,
//! implementation loss `L` and required margin `M`, the link closes at a step when
//!
//! ```text
//! C/N0 [dBHz] >= 10 log10(R) + req + L + M          (Eb/N0 = C/N0 - 10 log10 R)
//! ```
//!
//! so each option reduces to one C/N0 threshold.
//!
//! ## The guard against switching back and forth
//! A link that opens for a few seconds is worth nothing in practice: the modem must acquire and the
//! frame sync must lock. Both modes therefore count only *runs* of closed steps at least
//! `min_dwell_s` long (default 10 s, common practice for acquisition plus frame lock). The adaptive
//! schedule at each step uses the highest-rate option whose kept run covers that step. So an option
//! is only ever used inside a run of its own that lasts at least the dwell time, and a brief
//! threshold crossing cannot make the schedule flip to an option and back. The steps of the
//! staircase itself can still be shorter than the dwell where the runs of two options overlap (for
//! example 50 Mbit/s for a few seconds before a 59 Mbit/s option's run begins); `switch_count`
//! reports how many changes a pass needs. Because a fixed rate counts exactly the kept runs of its
//! option, the adaptive volume is at least the fixed-rate volume of every option it contains, step
//! by step.

/// Index of an option of the fixed-rate ladder (`RateSet::ladder`).
#[derive(Debug, Clone, Copy, PartialEq, Eq, PartialOrd, Ord, Hash)]
pub struct OptionId(pub usize);

/// One rate option: a data rate with its scheme's threshold, as seen by the planner.
#[derive(Debug, Clone, PartialEq)]
pub struct RateOption {
    pub rate_bps: f64,
    pub scheme: String,
    /// Required Eb/N0 of the scheme at its target error rate, dB (without implementation loss).
    pub required_ebn0_db: f64,
    /// C/N0 needed to close with the required margin: 10 log10 R + req + impl. loss + margin, dBHz.
    pub threshold_cn0_dbhz: f64,
    /// Occupied bandwidth Rs (1 + roll-off), Hz.
    pub occupied_bandwidth_hz: f64,
    /// The modem's implementation loss, dB.
    pub implementation_loss_db: f64,
}

impl RateOption {
    /// Eb/N0 at this option's data rate: C/N0 - 10 log10 R, dB.
    #[inline]
    pub fn ebn0_db(&self, cn0_dbhz: f64) -> f64 {
        ebn0_at_rate(cn0_dbhz, self.rate_db())
    }

    /// The data rate in dB, 10 log10 R.
    #[inline]
    fn rate_db(&self) -> f64 {
        crate::units::ratio_to_db(self.rate_bps)
    }

    /// Margin over the scheme's threshold at this C/N0, dB ([`crate::link::budget::margin_db`]).
    /// The option closes where C/N0 reaches `threshold_cn0_dbhz`
    /// ([`crate::link::budget::threshold_cn0_dbhz`]).
    #[inline]
    pub fn margin_db(&self, cn0_dbhz: f64) -> f64 {
        self.margin_at()(cn0_dbhz)
    }

    /// [`RateOption::ebn0_db`] for many C/N0 values: the rate's 10 log10 R worked out once.
    #[inline]
    pub fn ebn0_at(&self) -> impl Fn(f64) -> f64 + '_ {
        let rate_db = self.rate_db();
        move |cn0_dbhz| ebn0_at_rate(cn0_dbhz, rate_db)
    }

    /// [`RateOption::margin_db`] for many C/N0 values: the rate's 10 log10 R worked out once.
    #[inline]
    pub fn margin_at(&self) -> impl Fn(f64) -> f64 + '_ {
        let rate_db = self.rate_db();
        move |cn0_dbhz| {
            crate::link::budget::margin_db(
                ebn0_at_rate(cn0_dbhz, rate_db),
                self.required_ebn0_db,
                self.implementation_loss_db,
            )
        }
    }
}

/// Eb/N0 = C/N0 - 10 log10 R, dB, with the rate in dB: the one place the planner's options
/// write it.
#[inline]
fn ebn0_at_rate(cn0_dbhz: f64, rate_db: f64) -> f64 {
    cn0_dbhz - rate_db
}

/// Closed runs of one option over a pass, after the dwell rule: `(first_step, last_step)` inclusive.
pub fn kept_runs(
    cn0_dbhz: &[f64],
    weights_s: &[f64],
    threshold_cn0_dbhz: f64,
    min_dwell_s: f64,
    runs: &mut Vec<(usize, usize)>,
) {
    runs.clear();
    let mut start: Option<usize> = None;
    let mut dur = 0.0;
    for (i, (&c, &w)) in cn0_dbhz.iter().zip(weights_s).enumerate() {
        if c >= threshold_cn0_dbhz {
            if start.is_none() {
                start = Some(i);
                dur = 0.0;
            }
            dur += w;
        } else if let Some(s) = start.take() {
            if dur + 1e-9 >= min_dwell_s {
                runs.push((s, i - 1));
            }
        }
    }
    if let Some(s) = start {
        if dur + 1e-9 >= min_dwell_s {
            runs.push((s, cn0_dbhz.len() - 1));
        }
    }
}

/// Result of the fixed-rate choice for one pass.
#[derive(Debug, Clone, PartialEq)]
pub struct FixedChoice {
    /// Index into the options, or `None` when no option closes for at least the dwell time.
    pub option: Option<usize>,
    pub volume_bits: f64,
    pub closed_s: f64,
    /// Kept runs of the chosen option (step indices, inclusive).
    pub runs: Vec<(usize, usize)>,
    /// Volume each option would bring in this pass (same order as the options).
    pub volume_by_option_bits: Vec<f64>,
}

/// Choose the fixed rate that brings home the most data in this pass. Ties go to the lower rate
/// (more margin for the same volume).
pub fn choose_fixed(
    cn0_dbhz: &[f64],
    weights_s: &[f64],
    options: &[RateOption],
    min_dwell_s: f64,
) -> FixedChoice {
    let mut runs = Vec::new();
    type Best = (usize, f64, f64, Vec<(usize, usize)>);
    let mut best: Option<Best> = None;
    let mut by_option = Vec::with_capacity(options.len());
    for (k, o) in options.iter().enumerate() {
        kept_runs(
            cn0_dbhz,
            weights_s,
            o.threshold_cn0_dbhz,
            min_dwell_s,
            &mut runs,
        );
        let closed_s: f64 = runs
            .iter()
            .map(|&(a, b)| weights_s[a..=b].iter().sum::<f64>())
            .sum();
        let volume = closed_s * o.rate_bps;
        by_option.push(volume);
        let better = match &best {
            None => volume > 0.0,
            Some((bk, bv, _, _)) => {
                volume > *bv * (1.0 + 1e-12)
                    || (volume > 0.0
                        && (volume - *bv).abs() <= *bv * 1e-12
                        && o.rate_bps < options[*bk].rate_bps)
            }
        };
        if better {
            best = Some((k, volume, closed_s, runs.clone()));
        }
    }
    match best {
        Some((k, v, c, r)) => FixedChoice {
            option: Some(k),
            volume_bits: v,
            closed_s: c,
            runs: r,
            volume_by_option_bits: by_option,
        },
        None => FixedChoice {
            option: None,
            volume_bits: 0.0,
            closed_s: 0.0,
            runs: Vec::new(),
            volume_by_option_bits: by_option,
        },
    }
}

/// How the adaptive modem switches: the extra margin a switch up needs, and the data lost at
/// each change of scheme.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Switching {
    /// A higher-rate option is taken only where C/N0 passes its threshold by this much, dB.
    pub hysteresis_db: f64,
    /// After each change of scheme (not the first lock of a run), this many seconds carry no data.
    pub relock_s: f64,
}

/// Adaptive schedule, as a modem with hysteresis would run it. The link is up on the kept runs
/// (at least `min_dwell_s`) of the option with the lowest threshold; within a run the modem starts
/// on the highest-rate option that closes with `hysteresis_db` to spare (else the lowest), steps
/// down at once to the highest-rate option that still closes when the current one stops closing,
/// and steps up to the highest-rate option that closes with `hysteresis_db` to spare. Each change
/// costs `relock_s` of data. With no hysteresis and no re-lock time this is, at every step, the
/// highest-rate option that closes, so the volume is at least every option's fixed-rate volume.
/// `schedule` receives one entry per step (`None` where the link is down); returns the volume in
/// bits.
pub fn adaptive_schedule(
    cn0_dbhz: &[f64],
    weights_s: &[f64],
    options: &[RateOption],
    min_dwell_s: f64,
    switching: Switching,
    schedule: &mut Vec<Option<u16>>,
) -> f64 {
    schedule.clear();
    schedule.resize(cn0_dbhz.len(), None);
    let Some(lowest) = (0..options.len()).min_by(|&a, &b| {
        options[a]
            .threshold_cn0_dbhz
            .total_cmp(&options[b].threshold_cn0_dbhz)
    }) else {
        return 0.0;
    };
    // The options from the highest rate down, and among equal rates the later one first: the
    // first that closes is the one `max_by` over the rates of all closing options would give.
    let mut by_rate: Vec<usize> = (0..options.len()).collect();
    by_rate.sort_by(|&a, &b| {
        options[b]
            .rate_bps
            .total_cmp(&options[a].rate_bps)
            .then(b.cmp(&a))
    });
    // the highest-rate option closing at `cn0` with `spare` dB to spare
    let best = |cn0: f64, spare: f64| {
        by_rate
            .iter()
            .copied()
            .find(|&k| cn0 >= options[k].threshold_cn0_dbhz + spare)
    };
    let mut runs = Vec::new();
    kept_runs(
        cn0_dbhz,
        weights_s,
        options[lowest].threshold_cn0_dbhz,
        min_dwell_s,
        &mut runs,
    );
    let mut volume = 0.0;
    for &(a, b) in &runs {
        let mut current = best(cn0_dbhz[a], switching.hysteresis_db).unwrap_or(lowest);
        let mut relock_left_s = 0.0;
        for i in a..=b {
            let c = cn0_dbhz[i];
            let next = if c < options[current].threshold_cn0_dbhz {
                best(c, 0.0).unwrap_or(lowest)
            } else {
                match best(c, switching.hysteresis_db) {
                    Some(k) if options[k].rate_bps > options[current].rate_bps => k,
                    _ => current,
                }
            };
            if next != current {
                current = next;
                relock_left_s = switching.relock_s;
            }
            let w = weights_s[i];
            let counted_s = (w - relock_left_s).max(0.0);
            relock_left_s = (relock_left_s - w).max(0.0);
            volume += options[current].rate_bps * counted_s;
            schedule[i] = Some(current as u16);
        }
    }
    volume
}

/// Number of scheme changes in an adaptive schedule (entering or leaving "no link" not counted).
pub fn switch_count(schedule: &[Option<u16>]) -> usize {
    schedule
        .windows(2)
        .filter(|w| matches!((w[0], w[1]), (Some(a), Some(b)) if a != b))
        .count()
}

#[cfg(test)]
mod tests {
    use super::*;

    fn opt(rate: f64, thr: f64) -> RateOption {
        RateOption {
            rate_bps: rate,
            scheme: "x".into(),
            required_ebn0_db: 0.0,
            threshold_cn0_dbhz: thr,
            occupied_bandwidth_hz: rate,
            implementation_loss_db: 0.0,
        }
    }

    /// A symmetric pass-like C/N0 profile peaking at 90 dBHz.
    fn profile(n: usize) -> Vec<f64> {
        (0..n)
            .map(|i| 90.0 - 20.0 * ((i as f64 - n as f64 / 2.0) / (n as f64 / 2.0)).powi(2))
            .collect()
    }

    #[test]
    fn fixed_choice_is_an_optimization_not_the_highest_closing_rate() {
        let cn0 = profile(600);
        let w = vec![1.0; 600];
        // The highest rate closes only for a short time around the peak; the middle rate wins.
        let options = [opt(1e6, 72.0), opt(10e6, 82.0), opt(40e6, 89.8)];
        let c = choose_fixed(&cn0, &w, &options, 10.0);
        assert_eq!(c.option, Some(1));
        assert!(c.volume_by_option_bits[2] < c.volume_bits);
        assert!(c.volume_by_option_bits[2] > 0.0);
    }

    /// The highest-rate closing option as the schedule first defined it (every option scanned,
    /// `max_by` over the closing ones' rates): the reference for the ordered search.
    fn best_by_scan(options: &[RateOption], cn0: f64, spare: f64) -> Option<usize> {
        (0..options.len())
            .filter(|&k| cn0 >= options[k].threshold_cn0_dbhz + spare)
            .max_by(|&a, &b| options[a].rate_bps.total_cmp(&options[b].rate_bps))
    }

    /// The schedule's choice, step by step, against [`best_by_scan`] over option sets with equal
    /// rates, thresholds out of rate order and hysteresis: the same scheme at every step.
    #[test]
    fn ordered_search_picks_what_the_scan_picked() {
        let sets = [
            vec![
                opt(1e6, 70.0),
                opt(2e6, 74.0),
                opt(2e6, 73.0),
                opt(4e6, 80.0),
            ],
            vec![
                opt(4e6, 80.0),
                opt(1e6, 70.0),
                opt(4e6, 79.0),
                opt(3e6, 85.0),
            ],
            vec![opt(5e6, 75.0), opt(5e6, 75.0), opt(1e6, 71.0)],
        ];
        let cn0: Vec<f64> = (0..400)
            .map(|i| 68.0 + 20.0 * (i as f64 * 0.05).sin().abs())
            .collect();
        let w = vec![1.0; cn0.len()];
        for options in &sets {
            for hysteresis_db in [0.0, 0.5, 2.0] {
                let sw = Switching {
                    hysteresis_db,
                    relock_s: 0.0,
                };
                let mut sched = Vec::new();
                adaptive_schedule(&cn0, &w, options, 1.0, sw, &mut sched);
                // Replay the switching rule with the scan.
                let lowest = (0..options.len())
                    .min_by(|&a, &b| {
                        options[a]
                            .threshold_cn0_dbhz
                            .total_cmp(&options[b].threshold_cn0_dbhz)
                    })
                    .unwrap();
                let mut current: Option<usize> = None;
                for (i, &c) in cn0.iter().enumerate() {
                    if c < options[lowest].threshold_cn0_dbhz {
                        current = None;
                        assert_eq!(sched[i], None, "step {i}");
                        continue;
                    }
                    let next = match current {
                        None => best_by_scan(options, c, hysteresis_db).unwrap_or(lowest),
                        Some(k) if c < options[k].threshold_cn0_dbhz => {
                            best_by_scan(options, c, 0.0).unwrap_or(lowest)
                        }
                        Some(k) => match best_by_scan(options, c, hysteresis_db) {
                            Some(b) if options[b].rate_bps > options[k].rate_bps => b,
                            _ => k,
                        },
                    };
                    current = Some(next);
                    assert_eq!(sched[i], Some(next as u16), "step {i}");
                }
            }
        }
    }

    #[test]
    fn adaptive_is_at_least_every_fixed_option() {
        let cn0 = profile(500);
        let w = vec![1.0; 500];
        let options = [opt(1e6, 72.0), opt(10e6, 82.0), opt(40e6, 89.5)];
        let fixed = choose_fixed(&cn0, &w, &options, 10.0);
        let mut sched = Vec::new();
        let free = Switching {
            hysteresis_db: 0.0,
            relock_s: 0.0,
        };
        let adaptive = adaptive_schedule(&cn0, &w, &options, 10.0, free, &mut sched);
        for v in &fixed.volume_by_option_bits {
            assert!(adaptive >= *v);
        }
        assert_eq!(switch_count(&sched), 4);
    }

    /// A C/N0 that wobbles by 0.2 dB around a threshold: without hysteresis the modem switches
    /// at every wobble; with 0.5 dB it stays on the lower option; each switch costs the re-lock
    /// time (the volume drops by exactly relock x the rate switched to, per switch).
    #[test]
    fn hysteresis_stops_switching_on_a_wobble_and_relock_costs_data() {
        let cn0: Vec<f64> = (0..200)
            .map(|i| if i % 20 < 10 { 82.1 } else { 81.9 })
            .collect();
        let w = vec![1.0; 200];
        let options = [opt(1e6, 72.0), opt(10e6, 82.0)];
        let mut sched = Vec::new();
        let free = Switching {
            hysteresis_db: 0.0,
            relock_s: 0.0,
        };
        let v0 = adaptive_schedule(&cn0, &w, &options, 10.0, free, &mut sched);
        let switches = switch_count(&sched);
        assert_eq!(switches, 19);
        let costly = Switching {
            hysteresis_db: 0.0,
            relock_s: 2.0,
        };
        let v1 = adaptive_schedule(&cn0, &w, &options, 10.0, costly, &mut sched);
        // 10 switches down (1 Mbit/s) and 9 up (10 Mbit/s), 2 s each
        assert!(
            (v0 - v1 - 2.0 * (10.0 * 1e6 + 9.0 * 10e6)).abs() < 1e-3,
            "{v0} {v1}"
        );
        let steady = Switching {
            hysteresis_db: 0.5,
            relock_s: 2.0,
        };
        let v2 = adaptive_schedule(&cn0, &w, &options, 10.0, steady, &mut sched);
        assert_eq!(switch_count(&sched), 0);
        assert_eq!(v2, 200.0 * 1e6);
    }

    #[test]
    fn short_openings_are_not_counted() {
        // Closes for 5 steps only: below a 10 s dwell.
        let mut cn0 = vec![60.0; 100];
        for c in &mut cn0[40..45] {
            *c = 80.0;
        }
        let w = vec![1.0; 100];
        let c = choose_fixed(&cn0, &w, &[opt(1e6, 70.0)], 10.0);
        assert_eq!(c.option, None);
        assert_eq!(c.volume_bits, 0.0);
        let c = choose_fixed(&cn0, &w, &[opt(1e6, 70.0)], 5.0);
        assert_eq!(c.volume_bits, 5e6);
    }
}

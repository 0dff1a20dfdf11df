//! Usable elevation mask and the mask trade-off (contact time and volume against mask elevation).
//!
//! Per pass, samples are binned by whole degrees of elevation (0..=40, the top bin holding
//! everything at or above 40 deg), so the trade-off for every integer mask is a cumulative sum: a
//! sample at elevation `e` counts for every mask `m <= e`. The trade-off counts the seconds above the
//! mask as planned without the mask, i.e. it does not re-apply the dwell rule to runs the mask cuts.

/// Highest mask elevation in the trade-off, deg.
pub const MAX_MASK_DEG: usize = 40;
const BINS: usize = MAX_MASK_DEG + 1;

/// The highest step of a pass at which a rate did not count: where the pass fails the rate.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct OpenStep {
    pub elevation_deg: f64,
    /// Seconds from the pass's AOS.
    pub t_s: f64,
    /// The rate's margin at that step, dB (at or above the required margin when the step closed
    /// but its run was shorter than the dwell time).
    pub margin_db: f64,
}

/// Accumulators for the mask trade-off and the usable mask, one set per station.
#[derive(Debug, Clone, PartialEq)]
pub struct MaskAccumulator {
    /// Seconds of contact with elevation in bin b (b = floor(el), clamped to 0..=40).
    pub contact_bins_s: [f64; BINS],
    /// Bits of fixed-rate volume per option and bin (option k closed at that step).
    pub volume_bins_bits: Vec<[f64; BINS]>,
    /// Per option: highest elevation seen where the option did not close (deg), or -inf.
    pub highest_open_elevation_deg: Vec<f64>,
    /// Per option: that step (of the pass; merged accumulators keep the highest).
    pub highest_open_step: Vec<Option<OpenStep>>,
    /// Per option: number of passes in which it closed at all.
    pub passes_closing: Vec<usize>,
    pub passes: usize,
}

/// What the run keeps of each planned pass's [`MaskAccumulator`] once it has merged the pass's
/// bins into its station's ([`super::Plan::station_masks`]): per pass and ladder option, the
/// highest step where the rate does not count, which the robust mask and its failures need
/// ([`super::summary::usable_masks`]). One flat array, pass-major, made during the run and
/// dropped once the usable masks are made, so the plan does not carry it into the schedule.
#[derive(Debug, Clone, Default)]
pub struct OpenSteps {
    options: usize,
    /// `options` entries per pass; a NaN elevation where the rate counts on every step of the
    /// pass. The accumulator never keeps a NaN elevation (no comparison lets one in), so NaN
    /// is free to mark "none": 24 bytes an entry instead of an `Option`'s 32.
    open: Vec<OpenStep>,
}

/// The mark of "no open step" in [`OpenSteps`].
const NO_STEP: OpenStep = OpenStep {
    elevation_deg: f64::NAN,
    t_s: f64::NAN,
    margin_db: f64::NAN,
};

impl OpenSteps {
    /// Room for `passes` passes of `options` ladder options.
    pub fn with_capacity(options: usize, passes: usize) -> OpenSteps {
        OpenSteps {
            options,
            open: Vec::with_capacity(options * passes),
        }
    }

    /// Add the next pass, from its accumulator.
    pub fn push(&mut self, acc: &MaskAccumulator) {
        debug_assert_eq!(acc.highest_open_step.len(), self.options);
        self.open
            .extend(acc.highest_open_step.iter().map(|s| s.unwrap_or(NO_STEP)));
    }

    /// The highest step of pass `pass` (0-based, in the plan's order) where option `k` does not
    /// count; `None` when it counts on every step.
    pub fn step(&self, pass: usize, k: usize) -> Option<OpenStep> {
        let s = self.open[pass * self.options + k];
        (!s.elevation_deg.is_nan()).then_some(s)
    }

    /// The elevation of that step, deg; -inf when the option counts on every step (as
    /// [`MaskAccumulator::highest_open_elevation_deg`]).
    pub fn highest_open_elevation_deg(&self, pass: usize, k: usize) -> f64 {
        self.step(pass, k)
            .map_or(f64::NEG_INFINITY, |s| s.elevation_deg)
    }
}

impl MaskAccumulator {
    pub fn new(options: usize) -> Self {
        MaskAccumulator {
            contact_bins_s: [0.0; BINS],
            volume_bins_bits: vec![[0.0; BINS]; options],
            highest_open_elevation_deg: vec![f64::NEG_INFINITY; options],
            highest_open_step: vec![None; options],
            passes_closing: vec![0; options],
            passes: 0,
        }
    }

    #[inline]
    fn bin(elevation_deg: f64) -> Option<usize> {
        if elevation_deg < 0.0 {
            None
        } else {
            // truncation is the floor here (elevation_deg >= 0) without a libm call per step
            Some((elevation_deg as usize).min(MAX_MASK_DEG))
        }
    }

    /// Add one step's contact: its elevation and weight.
    #[inline]
    pub fn add_contact(&mut self, elevation_deg: f64, weight_s: f64) {
        if let Some(b) = Self::bin(elevation_deg) {
            self.contact_bins_s[b] += weight_s;
        }
    }

    /// Add one step of one option: whether it counted (a kept run); `open` gives the step's time
    /// from AOS and the option's margin, asked only for a step higher than any open one before.
    #[inline]
    pub fn add_option(
        &mut self,
        option: usize,
        rate_bps: f64,
        elevation_deg: f64,
        weight_s: f64,
        closed: bool,
        open: impl FnOnce() -> (f64, f64),
    ) {
        if closed {
            if let Some(b) = Self::bin(elevation_deg) {
                self.volume_bins_bits[option][b] += rate_bps * weight_s;
            }
        } else if elevation_deg > self.highest_open_elevation_deg[option] {
            self.highest_open_elevation_deg[option] = elevation_deg;
            let (t_s, margin_db) = open();
            self.highest_open_step[option] = Some(OpenStep {
                elevation_deg,
                t_s,
                margin_db,
            });
        }
    }

    pub fn merge(&mut self, other: &MaskAccumulator) {
        for (mine, theirs) in self.contact_bins_s.iter_mut().zip(other.contact_bins_s) {
            *mine += theirs;
        }
        for (k, v) in other.volume_bins_bits.iter().enumerate() {
            for (mine, theirs) in self.volume_bins_bits[k].iter_mut().zip(v) {
                *mine += theirs;
            }
            if other.highest_open_elevation_deg[k] > self.highest_open_elevation_deg[k] {
                self.highest_open_elevation_deg[k] = other.highest_open_elevation_deg[k];
                self.highest_open_step[k] = other.highest_open_step[k];
            }
            self.passes_closing[k] += other.passes_closing[k];
        }
        self.passes += other.passes;
    }

    /// Contact seconds with elevation >= `mask_deg` (integer degrees 0..=40).
    pub fn contact_above_s(&self, mask_deg: usize) -> f64 {
        self.contact_bins_s[mask_deg.min(MAX_MASK_DEG)..]
            .iter()
            .sum()
    }

    /// Volume of option `k` with elevation >= `mask_deg`.
    pub fn volume_above_bits(&self, option: usize, mask_deg: usize) -> f64 {
        self.volume_bins_bits[option][mask_deg.min(MAX_MASK_DEG)..]
            .iter()
            .sum()
    }

    /// The lowest elevation mask at which option `k` closes whenever the satellite is above it, on every
    /// pass; never below `station_mask_deg`. `None` when the option never closes.
    pub fn usable_mask_deg(&self, option: usize, station_mask_deg: f64) -> Option<f64> {
        if self.passes_closing[option] == 0 {
            return None;
        }
        Some(self.highest_open_elevation_deg[option].max(station_mask_deg))
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn cumulative_bins() {
        let mut m = MaskAccumulator::new(1);
        for (el, closed) in [(2.5, false), (10.2, true), (45.0, true), (12.0, true)] {
            m.add_contact(el, 1.0);
            m.add_option(0, 100.0, el, 1.0, closed, || (0.0, -1.0));
        }
        m.passes_closing[0] = 1;
        assert_eq!(m.contact_above_s(0), 4.0);
        assert_eq!(m.contact_above_s(11), 2.0);
        assert_eq!(m.contact_above_s(40), 1.0);
        assert_eq!(m.volume_above_bits(0, 0), 300.0);
        assert_eq!(m.volume_above_bits(0, 11), 200.0);
        assert_eq!(m.usable_mask_deg(0, 5.0), Some(5.0));
        assert_eq!(m.usable_mask_deg(0, 1.0), Some(2.5));
    }
}

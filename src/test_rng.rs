//! A deterministic pseudo-random sequence for the unit tests' sweeps (tests only): a 64-bit
//! linear congruential generator with Knuth's MMIX constants (D. E. Knuth, *The Art of Computer
//! Programming*, vol. 2, §3.3.4; from memory), so every run draws the same cases.

/// The generator; [`Lcg::new`] starts every test's sweep from the same seed.
pub(crate) struct Lcg(u64);

impl Lcg {
    pub(crate) fn new() -> Self {
        Lcg(0x2545_f491_4f6c_dd1d)
    }

    /// The next state.
    pub(crate) fn next_u64(&mut self) -> u64 {
        self.0 = self
            .0
            .wrapping_mul(6_364_136_223_846_793_005)
            .wrapping_add(1_442_695_040_888_963_407);
        self.0
    }

    /// A state's top 53 bits as a number in [0, 1).
    pub(crate) fn unit_of(state: u64) -> f64 {
        (state >> 11) as f64 / (1u64 << 53) as f64
    }

    /// The next number in [0, 1).
    pub(crate) fn unit(&mut self) -> f64 {
        Self::unit_of(self.next_u64())
    }
}

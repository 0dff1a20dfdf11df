//! Receiving-system noise: sky brightness temperature ([`sky`]), the ground antenna's reference
//! pattern for noise ([`pattern`]), the antenna noise over elevation integrated over that pattern
//! ([`antenna_table`]), the same with terrain above the geometric horizon by azimuth
//! ([`terrain`], direct integral) and its table over elevation and azimuth ([`terrain_table`]),
//! man-made noise of the surroundings (ITU-R P.372 Table 1, [`man_made`]),
//! the Sun's and the Moon's disk brightness ([`sun`], [`moon`]) and the antenna temperature a
//! bright disk adds near the beam ([`disk`]), and the Friis receiver cascade and system noise
//! temperature ([`system`]).
//!
//! The terms of the system noise temperature at one instant are gathered in [`ExternalNoise`]
//! (everything the antenna picks up) plus the receiver's own noise (`system::Receiver`).

pub mod antenna_table;
pub mod disk;
pub mod man_made;
pub mod moon;
pub mod pattern;
pub mod sky;
pub mod sun;
pub mod system;
pub mod terrain;
pub mod terrain_table;

/// The noise the antenna delivers at its terminals at one instant, by source, K. Each term is a
/// noise temperature at the antenna terminals (the pattern-weighted brightness of its source); the
/// antenna temperature is their sum. A new source (the Sun, the Moon) is one more field here, one
/// more line in [`ExternalNoise::total_k`] and in the budget's items.
#[derive(Debug, Clone, Copy, Default, PartialEq)]
pub struct ExternalNoise {
    /// Sky above the horizon, through every lobe (atmosphere, cosmic and galactic background).
    pub sky_k: f64,
    /// Ground below the horizon, through every lobe (emission and the reflected sky).
    pub ground_k: f64,
    /// Man-made noise of the surroundings (ITU-R P.372 Table 1); 0 when not given.
    pub man_made_k: f64,
    /// The Sun's disk near the beam ([`disk`], [`sun`]); 0 when set, far, or not known (no time).
    pub sun_k: f64,
    /// The Moon's disk near the beam ([`disk`], [`moon`]); 0 below 1 GHz or when not known.
    pub moon_k: f64,
}

impl ExternalNoise {
    /// The antenna noise temperature: the sum of the terms, K.
    #[inline]
    pub fn total_k(&self) -> f64 {
        self.sky_k + self.ground_k + self.man_made_k + self.sun_k + self.moon_k
    }

    /// Every term is a finite temperature >= 0.
    pub fn is_valid(&self) -> bool {
        [
            self.sky_k,
            self.ground_k,
            self.man_made_k,
            self.sun_k,
            self.moon_k,
        ]
        .iter()
        .all(|t| t.is_finite() && *t >= 0.0)
    }
}
